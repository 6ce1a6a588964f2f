"""The jobs screen at 80x24, keypad only: list, open, finish, archive, export, saving health."""

from __future__ import annotations

import csv
import io
import json
import sqlite3
import sys
from pathlib import Path

import pytest

from shopterm.job.export import export
from shopterm.job.state import fold
from shopterm.job.store import Store
from tests.ui.conftest import screen_lines, screen_text

sys.path.insert(0, str(Path(__file__).resolve().parents[2]))
from tests.glyphs import missing_glyphs  # noqa: E402
from tests.fakes import FailingConnection

pytestmark = pytest.mark.asyncio


def seed(data_dir: Path, jobs: list[tuple[str, int]], last_screen: str = "thread") -> list[int]:
    """Write jobs (designation, passes cut) to a fresh record; return their ids."""
    ids = []
    with Store.open(data_dir) as store:
        for designation, passes in jobs:
            job = store.new_job(designation)
            job.append("thread_chosen", {"designation": designation, "thread_kind": "external"})
            for n in range(1, passes + 1):
                job.append("pass_cut", {"radial_cum_mm": 0.05 * n, "dial": n})
            job.append("screen", {"name": last_screen})
            ids.append(job.job_id)
    return ids


def on_disk(data_dir: Path, job_id: int):
    """Return the job's state as the database has it (read-only copy, no lock)."""
    with Store.open_read_only(data_dir) as store:
        return fold(store.events(job_id))


def picks(app):
    return app.screen.query_one("#jobs-list")


def pick_number(app, job_id: int) -> str:
    """Return the digit that picks job ``job_id`` on the page shown."""
    for i, (_, value) in enumerate(picks(app).page_items()):
        if value == ("job", job_id):
            return str(i + 1)
    raise AssertionError(f"job {job_id} not on the page: {picks(app).page_items()}")


def pick_option(app, option: str) -> str:
    for i, (_, value) in enumerate(picks(app).page_items()):
        if value == option:
            return str(i + 1)
    raise AssertionError(f"{option} not offered: {picks(app).page_items()}")


async def test_list_shows_each_job_with_thread_status_passes_and_time(make_app, tmp_path):
    data = tmp_path / "data"
    ids = seed(data, [("M10x1.5-6g", 3), ("1/4-20 UNC-2A", 0)])
    app = make_app(start_screen="jobs")
    async with app.run_test(size=(80, 24)) as pilot:
        await pilot.pause()
        lines = screen_lines(app)
        assert len(lines) == 24 and all(len(line) <= 80 for line in lines)
        text = screen_text(app)
        row_m10 = next(line for line in lines[1:] if "M10x1.5-6g" in line)
        row_unc = next(line for line in lines[1:] if "1/4-20 UNC-2A" in line)
        # passes: 3 written by seed() for the first job, 0 for the second
        assert row_m10.split()[1:5] == [str(ids[0]), "M10x1.5-6g", "open", "3"]
        assert row_unc.split()[1:6] == [str(ids[1]), "1/4-20", "UNC-2A", "open", "0"]
        last_at = on_disk(data, ids[0]).events[-1].at
        assert last_at[:10] in row_m10 and last_at[11:16] in row_m10
        # newest first, "start a new job" at 1
        assert lines.index(row_unc) < lines.index(row_m10)
        assert "1 start a new job" in text
        assert "job" in lines[0] or "Jobs and export" in lines[0]
        assert "help" in lines[-1]                     # the key bar is on the last line
        assert missing_glyphs(text) == set()           # drawable on the Linux console


async def test_open_picks_the_job_and_shows_its_screen(make_app, tmp_path):
    data = tmp_path / "data"
    ids = seed(data, [("M10x1.5-6g", 2), ("M8x1.25-6g", 1)])
    app = make_app(start_screen="jobs")
    async with app.run_test(size=(80, 24)) as pilot:
        await pilot.press(pick_number(app, ids[0]))
        assert f"Job {ids[0]}: what to do" in screen_text(app)
        assert "2 passes" in screen_text(app)
        await pilot.press(pick_option(app, "open"))
        await pilot.pause()
        assert app.job.job_id == ids[0]
        assert app.spec.designation == "M10x1.5-6g"
        assert app.current_name == "thread"            # where it stopped (seed's screen entry)
        assert app.state.next_pass == 3                # resumes after pass 2
        app.goto("jobs")
        await pilot.pause()
        rows = screen_lines(app)[1:]                   # below the status line
        row = next(line for line in rows if "M10x1.5-6g" in line)
        assert row.rstrip().endswith("(open now)") and len(row) <= 80
        assert "(open now)" not in next(line for line in rows if "M8x1.25" in line)


async def test_finish_then_carry_on_is_recorded_and_undone(make_app, tmp_path):
    data = tmp_path / "data"
    (jid,) = seed(data, [("M10x1.5-6g", 2)])
    app = make_app(start_screen="jobs")
    async with app.run_test(size=(80, 24)) as pilot:
        await pilot.press(pick_number(app, jid))
        await pilot.press(pick_option(app, "finish"))
        assert f"Job {jid} finished" in screen_text(app)
        assert on_disk(data, jid).finished
        await pilot.press("minus")                     # back to the list
        row = next(line for line in screen_lines(app)[1:] if "M10x1.5-6g" in line)
        assert "finished" in row
        await pilot.press(pick_number(app, jid))
        await pilot.press(pick_option(app, "unfinish"))
        st = on_disk(data, jid)
        assert not st.finished and st.status == "open"
        assert [e.kind for e in st.events[-2:]] == ["job_finished", "undo"]   # history kept
        assert len(st.passes) == 2                     # nothing confirmed went away
        assert "open again" in screen_text(app)


async def test_archive_hides_the_job_and_it_can_be_brought_back(make_app, tmp_path):
    data = tmp_path / "data"
    ids = seed(data, [("M10x1.5-6g", 1), ("M6x1-6g", 0)])
    app = make_app(start_screen="jobs")
    async with app.run_test(size=(80, 24)) as pilot:
        await pilot.press(pick_number(app, ids[0]))
        await pilot.press(pick_option(app, "archive"))
        assert on_disk(data, ids[0]).archived
        assert "M10x1.5-6g" not in screen_text(app)    # back on the list, hidden
        assert "archived" in screen_text(app)
        await pilot.press(pick_option_list(app, "archived"))   # show archived jobs too
        assert "M10x1.5-6g" in screen_text(app)
        await pilot.press(pick_number(app, ids[0]))
        await pilot.press(pick_option(app, "open"))
        assert "is archived" in screen_text(app)       # refused, in place
        assert app.job is None
        await pilot.press(pick_option(app, "unarchive"))
        assert not on_disk(data, ids[0]).archived
        assert "back in the list" in screen_text(app)


def pick_option_list(app, what: str) -> str:
    for i, (_, value) in enumerate(picks(app).page_items()):
        if value[0] == what:
            return str(i + 1)
    raise AssertionError(f"{what} not on the list page")


@pytest.mark.parametrize("fmt, suffix", [("card", "txt"), ("csv", "csv"), ("json", "json")])
async def test_export_writes_the_file_and_shows_the_path(make_app, tmp_path, fmt, suffix):
    data = tmp_path / "data"
    (jid,) = seed(data, [("M10x1.5-6g", 3)])
    app = make_app(start_screen="jobs")
    async with app.run_test(size=(110, 24)) as pilot:   # wide enough to read the whole path
        await pilot.press(pick_number(app, jid))
        await pilot.press(pick_option(app, fmt))
        path = data / "exports" / f"job-{jid}.{suffix}"
        assert path.exists()
        assert f"Written: {path}" in screen_text(app)
        with Store.open_read_only(data) as store:
            events = store.events(jid)
            expected = export(events, fmt, store.job(jid).status)
        written = path.read_bytes().decode("utf-8")      # as written: CSV keeps its CRLF
        assert written == expected                       # the job export module's own output
        if fmt == "csv":
            rows = list(csv.DictReader(io.StringIO(written, newline="")))
            assert len(rows) == len(events)              # one row per event (RFC 4180 reader)
            passes = [r for r in rows if r["kind"] == "pass_cut"]
            # radial 0.05 * n written by seed() above
            assert [float(r["radial_cum_mm"]) for r in passes] == pytest.approx([0.05, 0.10, 0.15])  # the passes entered above, computed in the test
        elif fmt == "json":
            doc = json.loads(written)
            assert json.dumps(doc)                       # parses as RFC 8259 JSON
            assert "M10x1.5-6g" in written
        else:
            assert "M10x1.5-6g" in written and all(len(x) <= 78 for x in written.splitlines())


async def test_export_that_cannot_be_written_says_so_and_keeps_the_screen(make_app, tmp_path):
    data = tmp_path / "data"
    (jid,) = seed(data, [("M10x1.5-6g", 1)])
    (data / "exports").write_text("a file where the folder should be")
    app = make_app(start_screen="jobs")
    async with app.run_test(size=(80, 24)) as pilot:
        await pilot.press(pick_number(app, jid))
        await pilot.press(pick_option(app, "csv"))
        text = screen_text(app)
        assert "Could not write the CSV" in text and "try again" in text
        assert f"Job {jid}: what to do" in text         # still on the job's options
        (data / "exports").unlink()
        await pilot.press(pick_option(app, "csv"))
        assert (data / "exports" / f"job-{jid}.csv").exists()


async def test_not_saving_is_shown_and_retry_writes_what_was_kept(make_app, tmp_path):
    data = tmp_path / "data"
    (jid,) = seed(data, [("M10x1.5-6g", 1)])
    app = make_app(start_screen="jobs")
    async with app.run_test(size=(80, 24)) as pilot:
        await pilot.press(pick_number(app, jid))
        await pilot.press(pick_option(app, "open"))
        conn = FailingConnection(app.store._conn)
        app.store._conn = conn
        conn.error = "database or disk is full"
        assert app.record("pass_cut", {"radial_cum_mm": 0.1}) is not None   # kept in memory
        app.goto("jobs")
        await pilot.pause()                              # back on the list of jobs
        text = screen_text(app)
        assert "NOT being saved" in text and "the disk is full" in text
        assert app.screen.query_one("#status").has_class("unsaved")   # the red status line
        assert all(len(line) <= 80 for line in screen_lines(app))
        assert len(on_disk(data, jid).passes) == 1       # the second pass waits in memory
        await pilot.press(pick_option_list(app, "retry"))
        assert "Still NOT saving" in screen_text(app)
        conn.error = None                                 # space freed
        await pilot.press(pick_option_list(app, "retry"))
        text = screen_text(app)
        assert "Everything is saved now" in text and "NOT being saved" not in text
        assert on_disk(data, jid) == app.state            # the record equals the screen's state
        assert len(app.state.passes) == 2


async def test_new_job_and_back_keys(make_app, tmp_path):
    data = tmp_path / "data"
    (jid,) = seed(data, [("M10x1.5-6g", 1)])
    app = make_app(start_screen="jobs")
    async with app.run_test(size=(80, 24)) as pilot:
        # NumLock off: down moves, Enter picks
        await pilot.press("down", "enter")
        assert f"Job {jid}: what to do" in screen_text(app)
        await pilot.press("subtract")                     # kitty-protocol minus: back to list
        assert "start a new job" in screen_text(app)
        await pilot.press("1")
        await pilot.pause()
        assert app.job is None and app.current_name == "thread"


async def test_many_jobs_page_nine_at_a_time(make_app, tmp_path):
    data = tmp_path / "data"
    ids = seed(data, [(f"M{d}x1-6g", 0) for d in (5, 6, 7, 8, 9, 10, 11, 12, 14, 16, 18)])
    app = make_app(start_screen="jobs")
    async with app.run_test(size=(80, 24)) as pilot:
        await pilot.pause()
        # 11 jobs + "new job" + "show archived" = 13 items: 2 pages of 9 (PickList.PAGE)
        assert "page 1/2" in screen_text(app)
        assert all(len(line) <= 80 for line in screen_lines(app))
        await pilot.press("0")
        assert "page 2/2" in screen_text(app)
        await pilot.press(pick_number(app, ids[0]))       # the oldest job is on page 2
        assert f"Job {ids[0]}: what to do" in screen_text(app)


async def test_screen_without_a_record_says_nothing_is_saved(make_app, tmp_path):
    blocker = tmp_path / "not-a-folder"
    blocker.write_text("x")
    app = make_app(start_screen="jobs", data_dir=blocker / "data")
    async with app.run_test(size=(80, 24)) as pilot:
        await pilot.pause()
        assert app.store is None
        text = screen_text(app)
        assert "NOT being saved" in text and "--data-dir" in text
        assert [v for _, v in picks(app).items] == [("new", None)]
