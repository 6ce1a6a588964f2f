"""'Shut the Pi down' from the menu: offered only with ``[pi] shutdown_command``, asks first,
closes the job record (lock released, WAL folded in) before the command runs, and puts the
record back if the command fails. The command here is a harmless stand-in that writes down
what it found."""

from __future__ import annotations

import dataclasses
import sys
from pathlib import Path

import pytest

from shopterm.job.state import fold
from shopterm.job.store import DB_NAME, LOCK_NAME, Store
from shopterm.standards import parse
from tests.fakes import FailingConnection
from tests.ui.conftest import screen_text

pytestmark = pytest.mark.asyncio

# Run in place of `systemctl poweroff`: records whether shopterm's lock was free and whether
# the WAL file was still there at the moment it ran.
PROBE = f"""
import fcntl, os, sys
d = sys.argv[1]
fd = os.open(os.path.join(d, {LOCK_NAME!r}), os.O_RDWR)
try:
    fcntl.flock(fd, fcntl.LOCK_EX | fcntl.LOCK_NB)
    lock = "free"
except OSError:
    lock = "held"
wal = os.path.exists(os.path.join(d, {DB_NAME!r} + "-wal"))
open(os.path.join(d, "ran.txt"), "w").write(f"lock {{lock}} wal {{wal}}")
sys.exit(int(sys.argv[2]))
"""


def probe(data: Path, status: int = 0) -> tuple[str, ...]:
    return (sys.executable, "-c", PROBE, str(data), str(status))


@pytest.fixture
def data(tmp_path, monkeypatch):
    monkeypatch.setenv("XDG_CONFIG_HOME", str(tmp_path / "cfg"))
    return tmp_path / "data"


def app_with(sample_config, data: Path, command: tuple[str, ...]):
    """Return the app with ``command`` as its shutdown command; ``app.said`` collects what
    it notifies (messages, in order)."""
    from shopterm.ui.app import ShoptermApp
    app = ShoptermApp(dataclasses.replace(sample_config, shutdown_command=command),
                      data_dir=data)
    app.said, real = [], app.notify

    def notify(message, *args, **kw):
        app.said.append(message)
        return real(message, *args, **kw)

    app.notify = notify
    return app


async def open_job_and_menu(app, pilot) -> int:
    await pilot.pause()
    assert app.thread_chosen(parse("M10x1.5-6g"))
    app.record("note", {"text": "before shutdown"})
    await pilot.press("asterisk")
    await pilot.pause()
    return app.job.job_id


async def pick_shutdown(pilot) -> str:
    """Turn to the menu's second page (0) and pick its first entry; return the question."""
    await pilot.press("0")
    await pilot.pause()
    assert "Shut the Pi down" in screen_text(pilot.app)
    await pilot.press("1")
    await pilot.pause()
    return screen_text(pilot.app)


async def test_not_offered_without_the_config_key(make_app):
    app = make_app()
    async with app.run_test(size=(80, 24)) as pilot:
        await pilot.pause()
        await pilot.press("asterisk")
        await pilot.pause()
        await pilot.press("0")                  # the menu has one page: nothing more
        await pilot.pause()
        assert "Quit" in screen_text(app)
        assert "Shut" not in screen_text(app)


async def test_yes_closes_the_record_then_runs_the_command(sample_config, data):
    app = app_with(sample_config, data, probe(data))
    async with app.run_test(size=(80, 24)) as pilot:
        job_id = await open_job_and_menu(app, pilot)
        question = await pick_shutdown(pilot)
        assert "Shut the Pi down?" in question and "record is closed first" in question
        assert "Enter" in question and "-" in question
        await pilot.press("enter")
        await pilot.pause()
    assert (data / "ran.txt").read_text() == "lock free wal False"
    assert app.return_code == 0 and app.store is None
    with Store.open_read_only(data) as store:         # everything confirmed is on disk
        assert fold(store.events(job_id)).notes[-1].text == "before shutdown"


async def test_minus_answers_no(sample_config, data):
    app = app_with(sample_config, data, probe(data))
    async with app.run_test(size=(80, 24)) as pilot:
        job_id = await open_job_and_menu(app, pilot)
        await pick_shutdown(pilot)
        await pilot.press("minus")
        await pilot.pause()
        assert not (data / "ran.txt").exists()
        assert app.job.job_id == job_id and app.record("note", {"text": "still here"})


async def test_a_failing_command_puts_the_record_back(sample_config, data):
    app = app_with(sample_config, data, probe(data, status=1))
    async with app.run_test(size=(80, 24)) as pilot:
        job_id = await open_job_and_menu(app, pilot)
        await pick_shutdown(pilot)
        await pilot.press("enter")
        await pilot.pause()
        assert (data / "ran.txt").read_text() == "lock free wal False"   # it did run
        assert app.is_running and "did not shut down" in app.said[-1]
        assert app.job is not None and app.job.job_id == job_id
        assert app.record("note", {"text": "after"}) is not None          # written again
    with Store.open_read_only(data) as store:
        assert fold(store.events(job_id)).notes[-1].text == "after"


async def test_a_command_that_is_not_there_is_reported(sample_config, data):
    app = app_with(sample_config, data, (str(data / "no-such-command"),))
    async with app.run_test(size=(80, 24)) as pilot:
        await open_job_and_menu(app, pilot)
        await pick_shutdown(pilot)
        await pilot.press("enter")
        await pilot.pause()
        assert app.is_running and "did not shut down" in app.said[-1]
        assert app.store is not None and app.store.health is None


async def test_refused_while_entries_wait_to_be_written(sample_config, data):
    app = app_with(sample_config, data, probe(data))
    async with app.run_test(size=(80, 24)) as pilot:
        await open_job_and_menu(app, pilot)
        conn = FailingConnection(app.store._conn)
        app.store._conn = conn
        conn.error = "database or disk is full"
        assert app.record("note", {"text": "kept in memory"}) is not None
        assert app.store.pending == 1
        await pick_shutdown(pilot)
        await pilot.press("enter")
        await pilot.pause()
        assert not (data / "ran.txt").exists()
        assert app.store is not None and app.store.pending >= 1     # nothing lost
        assert app.said[-1].startswith("Not shutting down: Entries are NOT being saved")
