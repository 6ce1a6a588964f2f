"""The SQLite job record: where it lives, how it is written, versions (shopterm.job.store)."""

import fcntl
import os
import sqlite3
from pathlib import Path

import pytest

from shopterm.errors import InvalidEntry
from shopterm.job.state import fold
from shopterm.job.store import DB_NAME, SCHEMA_VERSION, Store, StoreError, data_dir


@pytest.fixture
def store(tmp_path):
    s = Store.open(tmp_path)
    yield s
    s.close()


# ---- where the record lives ------------------------------------------------------------------

def test_data_dir_order(monkeypatch, tmp_path):
    # XDG Base Directory Specification 0.8: $XDG_DATA_HOME, default $HOME/.local/share
    monkeypatch.delenv("SHOPTERM_DATA", raising=False)
    monkeypatch.delenv("XDG_DATA_HOME", raising=False)
    monkeypatch.setenv("HOME", str(tmp_path / "home"))
    assert data_dir() == tmp_path / "home" / ".local" / "share" / "shopterm"
    monkeypatch.setenv("XDG_DATA_HOME", "relative/ignored")   # the spec: relative paths ignored
    assert data_dir() == tmp_path / "home" / ".local" / "share" / "shopterm"
    monkeypatch.setenv("XDG_DATA_HOME", str(tmp_path / "xdg"))
    assert data_dir() == tmp_path / "xdg" / "shopterm"
    monkeypatch.setenv("SHOPTERM_DATA", str(tmp_path / "env"))
    assert data_dir() == tmp_path / "env"
    assert data_dir(tmp_path / "flag") == tmp_path / "flag"


def test_wal_and_full_sync(store):
    # SQLite docs, "PRAGMA synchronous": FULL is 2; "PRAGMA journal_mode": 'wal'
    assert store._conn.execute("PRAGMA journal_mode").fetchone()[0] == "wal"
    assert store._conn.execute("PRAGMA synchronous").fetchone()[0] == 2
    assert store._conn.execute("PRAGMA user_version").fetchone()[0] == SCHEMA_VERSION


def test_append_is_committed_before_it_returns(store, tmp_path):
    job = store.new_job("M10x1.5-6g")
    e = job.append("pass_cut", {"radial_cum_mm": 0.1, "dial": 10})
    assert e.payload["n"] == 1                     # filled in by the session
    # A separate connection sees it at once: it is committed, not waiting in a transaction.
    other = sqlite3.connect(tmp_path / DB_NAME)
    rows = other.execute("SELECT seq, kind FROM events WHERE job_id = ?", (job.job_id,)).fetchall()
    other.close()
    assert rows == [(1, "job_created"), (2, "pass_cut")]
    assert job.saved(e.seq) and store.health is None


def test_refused_entry_writes_nothing_and_keeps_state(store):
    job = store.new_job("M10x1.5-6g")
    job.append("pass_cut", {"radial_cum_mm": 0.1})
    before = job.state
    with pytest.raises(InvalidEntry):
        job.append("pass_cut", {"radial_cum_mm": -1})
    with pytest.raises(InvalidEntry):
        job.undo(1)
    assert job.state is before
    assert fold(store.events(job.job_id)) == job.state


def test_reopen_resumes_the_same_state(tmp_path):
    with Store.open(tmp_path) as s:
        job = s.new_job("3/8 BSW", units="in", title="tailstock screw")
        job.append("setup_confirmed", {"gears": [20, 38, 40], "compound_angle_deg": 27.5})
        for i in range(1, 4):
            job.append("pass_cut", {"radial_cum_mm": 0.1 * i})
        job.undo()
        job.append("screen", {"name": "passes"})
        expected = job.state
    with Store.open(tmp_path) as s:
        info = s.last_unfinished()
        assert info.title == "tailstock screw" and info.units == "in"
        again = s.open_job(info.id)
        assert again.state == expected
        assert again.state.next_pass == 3 and again.state.last_screen == "passes"
        assert s.open_job(info.id) is again      # one session per job


def test_job_list_finish_archive(store):
    a = store.new_job("M6x1-6g")
    b = store.new_job("M8x1.25-6g")
    c = store.new_job("2BA")
    assert [j.id for j in store.jobs()] == [c.job_id, b.job_id, a.job_id]
    store.finish(c.job_id)
    assert store.last_unfinished().id == b.job_id
    store.archive(b.job_id)
    assert [j.id for j in store.jobs()] == [c.job_id, a.job_id]
    assert {j.id: j.status for j in store.jobs(include_archived=True)} == {
        a.job_id: "open", b.job_id: "archived", c.job_id: "finished"}
    row = store._conn.execute("SELECT status FROM jobs WHERE id = ?", (b.job_id,)).fetchone()
    assert row == ("archived",)
    with pytest.raises(InvalidEntry, match="no job 99"):
        store.open_job(99)


def test_undo_of_finish_reopens_in_the_table_too(store):
    job = store.new_job("M6x1-6g")
    job.finish()
    job.undo()
    assert store._conn.execute("SELECT status FROM jobs").fetchone() == ("open",)
    assert store.last_unfinished().id == job.job_id


# ---- schema versions -------------------------------------------------------------------------

V1 = """
CREATE TABLE jobs (id INTEGER PRIMARY KEY, title TEXT, created TEXT, finished INTEGER,
                   designation TEXT);
CREATE TABLE events (id INTEGER PRIMARY KEY AUTOINCREMENT, job_id INTEGER, seq INTEGER,
                     kind TEXT, payload TEXT, at TEXT);
INSERT INTO jobs VALUES (1, 'old job', '2023-01-02T08:00:00+00:00', 0, 'M6x1-6g');
INSERT INTO jobs VALUES (2, 'done job', '2023-01-03T08:00:00+00:00', 1, 'M8x1.25-6g');
INSERT INTO events (job_id, seq, kind, payload, at) VALUES
 (1, 1, 'job_created', '{"designation": "M6x1-6g", "thread_kind": "external", "units": "mm"}',
  '2023-01-02T08:00:00+00:00'),
 (1, 2, 'pass_cut', '{"n": 1, "radial_cum_mm": 0.1}', '2023-01-02T08:05:00+00:00'),
 (2, 1, 'job_created', '{"designation": "M8x1.25-6g", "thread_kind": "external", "units": "mm"}',
  '2023-01-03T08:00:00+00:00'),
 (2, 2, 'job_finished', '{}', '2023-01-03T09:00:00+00:00');
PRAGMA user_version = 1;
"""


def test_version_1_record_is_backed_up_then_migrated(tmp_path):
    db = sqlite3.connect(tmp_path / DB_NAME)
    db.executescript(V1)
    db.close()
    with Store.open(tmp_path) as s:
        assert "updated to version 2" in s.message
        assert [(j.id, j.status) for j in s.jobs()] == [(2, "finished"), (1, "open")]
        assert s.open_job(1).state.next_pass == 2
        s.open_job(1).append("pass_cut", {"radial_cum_mm": 0.2})
    backups = list(tmp_path.glob(f"{DB_NAME}.v1-backup-*"))
    assert len(backups) == 1
    old = sqlite3.connect(backups[0])
    assert old.execute("PRAGMA user_version").fetchone()[0] == 1
    assert old.execute("SELECT count(*) FROM events").fetchone()[0] == 4
    old.close()
    with Store.open(tmp_path) as s:          # second start: nothing to migrate, no message
        assert s.message is None
        assert len(s.events(1)) == 3


def test_newer_record_is_refused_and_left_untouched(tmp_path):
    db = sqlite3.connect(tmp_path / DB_NAME)
    db.executescript("CREATE TABLE jobs (id INTEGER PRIMARY KEY, x TEXT); "
                     "CREATE TABLE events (y TEXT); PRAGMA user_version = 7;")
    db.close()
    before = (tmp_path / DB_NAME).read_bytes()
    with pytest.raises(StoreError, match="newer shopterm.*left untouched"):
        Store.open(tmp_path)
    assert (tmp_path / DB_NAME).read_bytes() == before
    assert sorted(p.name for p in tmp_path.iterdir()) == [DB_NAME, "shopterm.lock"]
    # The refusal released the lock: another process could take it now.
    fd = os.open(tmp_path / "shopterm.lock", os.O_RDWR)
    try:
        fcntl.flock(fd, fcntl.LOCK_EX | fcntl.LOCK_NB)
    finally:
        os.close(fd)


def test_read_only_open_of_a_missing_record_says_what_to_do(tmp_path):
    with pytest.raises(StoreError, match="no job record"):
        Store.open_read_only(tmp_path / "nowhere")
    assert not (tmp_path / "nowhere").exists()


def test_data_folder_that_cannot_be_made(tmp_path):
    blocker = tmp_path / "file"
    blocker.write_text("x")
    with pytest.raises(StoreError, match="--data-dir"):
        Store.open(blocker / "sub")
