"""Opening the job record on a thread (``Store.open_in_background``), as ``run_app`` does.

The store it hands over must be the same store ``Store.open`` gives, usable from the thread
that waits for it; what ``Store.open`` raises or reports must reach that thread unchanged.
Check values are the store's own behaviour (its docstring): no published source applies.
"""

from __future__ import annotations

import sqlite3
import threading

import pytest

from shopterm.job.state import fold
from shopterm.job.store import DB_NAME, Store, StoreError, StoreOpening


def test_store_opened_on_a_thread_works_from_this_one(tmp_path):
    opening = Store.open_in_background(tmp_path)
    assert isinstance(opening, StoreOpening)
    store = opening.result()
    try:
        assert store.message is None and not store.read_only and store.health is None
        job = store.new_job("M10x1.5-6g")             # written from the waiting thread
        job.append("pass_cut", {"radial_cum_mm": 0.1})
        assert store.last_unfinished().id == job.job_id
    finally:
        assert store.close()
    with Store.open(tmp_path) as again:                # and it is on disk, whole
        assert fold(again.events(job.job_id)) == job.state


def test_opening_thread_is_not_this_thread(tmp_path, monkeypatch):
    seen: list[str] = []
    real = Store.open.__func__

    def spy(cls, directory=None, **kw):
        seen.append(threading.current_thread().name)
        return real(cls, directory, **kw)

    monkeypatch.setattr(Store, "open", classmethod(spy))
    Store.open_in_background(tmp_path).result().close()
    assert seen == ["shopterm-store-open"]


def test_refusal_is_raised_by_result(tmp_path):
    blocker = tmp_path / "file-not-folder"
    blocker.write_text("x")
    opening = Store.open_in_background(blocker / "data")   # cannot make a folder in a file
    with pytest.raises(StoreError, match="--data-dir"):
        opening.result()
    opening.discard()                                      # nothing to close; no error


def test_second_copy_on_a_thread_opens_read_only_and_says_so(tmp_path):
    first = Store.open(tmp_path)
    try:
        second = Store.open_in_background(tmp_path).result()
        assert second.read_only and "Another shopterm" in second.message
        second.close()
    finally:
        first.close()


def test_corrupt_record_is_set_aside_on_the_thread_too(tmp_path):
    (tmp_path / DB_NAME).write_bytes(b"this is not an SQLite file" * 200)
    store = Store.open_in_background(tmp_path).result()
    try:
        assert "could not be read" in store.message
        assert list(tmp_path.glob(f"{DB_NAME}.corrupt-*"))
        assert store.jobs() == []
    finally:
        store.close()


def test_discard_closes_the_store_and_frees_the_lock(tmp_path):
    opening = Store.open_in_background(tmp_path)
    opening.discard()
    with Store.open(tmp_path) as s:                        # not told another copy has it
        assert not s.read_only and s.message is None


def test_connection_is_usable_from_another_thread_only_when_handed_over(tmp_path):
    # The plain sqlite3 rule the store relies on: a default connection refuses another thread.
    conn = sqlite3.connect(tmp_path / "plain.sqlite3")
    errors: list[BaseException] = []

    def use() -> None:
        try:
            conn.execute("SELECT 1")
        except sqlite3.ProgrammingError as exc:
            errors.append(exc)

    t = threading.Thread(target=use)
    t.start()
    t.join()
    conn.close()
    assert errors, "sqlite3 let another thread use a check_same_thread connection"
