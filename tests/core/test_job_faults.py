"""Faults the job record must survive: kill, corrupt file, full disk, two copies."""

import json
import os
import random
import signal
import sqlite3
import subprocess
import sys
import time
from pathlib import Path

import pytest

import shopterm
from shopterm.errors import InvalidEntry
from shopterm.job.state import fold
from shopterm.job.store import DB_NAME, Store, StoreError
from tests.fakes import FailingConnection

REPO = Path(shopterm.__file__).resolve().parent.parent

# A writer that resumes the last open job and cuts passes as fast as it can, printing
# "job seq" only after append() has returned (= the entry is shown as done).
WRITER = r"""
import sys
from shopterm.job import Store
store = Store.open(sys.argv[1])
info = store.last_unfinished()
job = store.open_job(info.id) if info else store.new_job("M10x1.5-6g")
print("ready", job.job_id, job.state.next_pass, flush=True)
while True:
    n = job.state.next_pass
    e = job.append("pass_cut", {"radial_cum_mm": round(0.01 * n, 4), "dial": n})
    print(e.job_id, e.seq, flush=True)
    if n % 7 == 0:
        job.append("note", {"text": "x" * (n % 50 + 1)})
    if n % 11 == 0:
        job.undo()
"""


def test_sigkill_at_random_moments_loses_nothing_that_was_shown_done(tmp_path):
    rng = random.Random(20240501)   # seeded: the same kill points every run
    env = dict(os.environ, PYTHONPATH=str(REPO))
    shown: set[tuple[int, int]] = set()
    last_next_pass = None
    for _ in range(6):
        proc = subprocess.Popen([sys.executable, "-c", WRITER, str(tmp_path)],
                                stdout=subprocess.PIPE, text=True, env=env)
        ready = proc.stdout.readline().split()
        assert ready[0] == "ready"
        if last_next_pass is not None:
            # Resumed at exactly the pass after the last one in force.
            assert int(ready[2]) == last_next_pass
        for _ in range(rng.randint(3, 40)):
            job_id, seq = map(int, proc.stdout.readline().split())
            shown.add((job_id, seq))
        time.sleep(rng.random() * 0.01)          # kill somewhere inside the next writes
        proc.send_signal(signal.SIGKILL)
        rest, _ = proc.communicate()
        # Lines printed whole before the kill landed; a line cut off by the kill (no newline
        # yet) was never shown done.
        for line in rest.split("\n")[:-1]:
            job_id, seq = map(int, line.split())
            shown.add((job_id, seq))
        assert proc.returncode == -signal.SIGKILL
        with Store.open(tmp_path) as s:
            (info,) = s.jobs()
            events = s.events(info.id)
            on_disk = {(e.job_id, e.seq) for e in events}
            assert shown <= on_disk
            assert [e.seq for e in events] == list(range(1, len(events) + 1))
            state = fold(events)                  # the history still adds up
            last_next_pass = state.next_pass
    assert len(shown) > 20


def _make_record(tmp_path, notes=12):
    with Store.open(tmp_path) as s:
        job = s.new_job("M10x1.5-6g")
        for i in range(notes):
            job.append("note", {"text": f"note {i} " + "x" * 400})
    return (tmp_path / DB_NAME).stat().st_size


@pytest.mark.parametrize("damage", ["garbage", "truncated", "empty_with_log"])
def test_corrupt_or_truncated_record_is_kept_aside_and_a_fresh_one_started(tmp_path, damage):
    size = _make_record(tmp_path)
    db = tmp_path / DB_NAME
    if damage == "garbage":
        db.write_bytes(b"this is not a database\n" * 200)
    elif damage == "truncated":
        with open(db, "r+b") as f:
            f.truncate(size // 2)
    else:
        db.write_bytes(b"")
        (tmp_path / (DB_NAME + "-wal")).write_bytes(b"\0" * 100)
    damaged = db.read_bytes()
    with Store.open(tmp_path) as s:
        message = s.message
        assert "kept as" in message and "fresh record" in message
        assert s.jobs() == []
        s.new_job("M6x1-6g").append("pass_cut", {"radial_cum_mm": 0.05})
    (kept,) = tmp_path.glob(DB_NAME + ".corrupt-*[0-9]")
    assert kept.read_bytes() == damaged           # kept exactly as found
    assert kept.name in message                   # and the user is told where
    with Store.open(tmp_path) as s:               # the fresh record works and is kept
        assert s.message is None and len(s.jobs()) == 1


@pytest.mark.parametrize("error, words", [
    ("database or disk is full", "the disk is full"),
    ("attempt to write a readonly database", "read-only"),
])
def test_full_or_read_only_disk_keeps_entries_in_order_and_tells_the_user(tmp_path, error, words):
    store = Store.open(tmp_path)
    job = store.new_job("M10x1.5-6g")
    job.append("pass_cut", {"radial_cum_mm": 0.1})
    conn = FailingConnection(store._conn)
    store._conn = conn
    conn.error = error
    e3 = job.append("pass_cut", {"radial_cum_mm": 0.2})
    assert store.health is not None and "NOT being saved" in store.health and words in store.health
    assert "1 entry is kept" in store.health
    e4 = job.append("note", {"text": "disk warning seen"})
    job.undo(e4.seq)
    assert "3 entries are kept" in job.health
    assert not job.saved(e3.seq) and job.state.next_pass == 3     # the screen carries on
    assert not store.retry()                                        # still failing
    assert len(store.events(job.job_id)) == 2
    conn.error = None                                               # space freed
    assert store.retry() and store.health is None
    on_disk = store.events(job.job_id)
    assert [e.seq for e in on_disk] == [1, 2, 3, 4, 5]              # in order, none lost
    assert fold(on_disk) == job.state
    # Entries kept while failing are also written by the next append, without retry().
    conn.error = error
    job.append("pass_cut", {"radial_cum_mm": 0.3})
    conn.error = None
    job.append("note", {"text": "back"})
    assert store.health is None and fold(store.events(job.job_id)) == job.state
    store.close()


def test_new_job_while_the_disk_is_full_is_written_later(tmp_path):
    store = Store.open(tmp_path)
    conn = FailingConnection(store._conn)
    store._conn = conn
    conn.error = "database or disk is full"
    job = store.new_job("1/4-20 UNC-2A", units="in")
    job.append("pass_cut", {"radial_cum_mm": 0.05})
    assert [j.id for j in store.jobs()] == [job.job_id]   # listed from memory meanwhile
    conn.error = None
    assert store.close()                                   # close writes what is pending
    with Store.open(tmp_path) as s:
        assert fold(s.events(job.job_id)) == job.state
        assert s.jobs()[0].units == "in"


def test_second_copy_is_told_and_opens_read_only(tmp_path):
    first = Store.open(tmp_path)
    job = first.new_job("M10x1.5-6g")
    job.append("pass_cut", {"radial_cum_mm": 0.1})
    second = Store.open(tmp_path)
    assert second.read_only and "Another shopterm" in second.message
    assert "NOT saved" in second.health and first.health is None
    assert second.open_job(job.job_id).state == job.state    # it can look
    with pytest.raises(StoreError, match="read-only"):
        second.open_job(job.job_id).append("note", {"text": "x"})
    with pytest.raises(StoreError, match="read-only"):
        second.new_job("M6")
    with pytest.raises(StoreError, match="already using"):
        Store.open(tmp_path, if_locked="refuse")
    job.append("pass_cut", {"radial_cum_mm": 0.2})           # the first is not disturbed
    second.close()
    job.append("pass_cut", {"radial_cum_mm": 0.3})
    assert fold(first.events(job.job_id)) == job.state
    first.close()
    third = Store.open(tmp_path)                              # once the first is gone
    assert not third.read_only and third.message is None
    third.close()


def test_lock_is_held_across_processes(tmp_path):
    holder = subprocess.Popen(
        [sys.executable, "-c", "import sys, time\nfrom shopterm.job import Store\n"
         "s = Store.open(sys.argv[1]); print('held', flush=True); time.sleep(30)", str(tmp_path)],
        stdout=subprocess.PIPE, text=True, env=dict(os.environ, PYTHONPATH=str(REPO)))
    try:
        assert holder.stdout.readline().strip() == "held"
        s = Store.open(tmp_path)
        assert s.read_only
        s.close()
    finally:
        holder.kill()
        holder.wait()
    with Store.open(tmp_path) as s:      # a killed holder's lock goes with it
        assert not s.read_only
