"""Fixtures for the tmux tests: a fresh private tmux server per app, killed afterwards.

Every capture a test took is printed at teardown, so ``pytest -s`` (or a failure report)
shows what the screen looked like.
"""

from __future__ import annotations

import pytest

from tests.e2e import tmux


@pytest.fixture
def installed_shopterm():
    """Return the path of the installed ``shopterm`` command, or skip saying why it is missing."""
    cmd = tmux.shopterm_command()
    if not cmd.is_file():
        pytest.skip(f"no installed shopterm command at {cmd}: install the project into this "
                    f"Python's venv (pip install -e '.[test]', as .ci/run does)")
    return cmd


@pytest.fixture
def tmux_shopterm(tmp_path):
    """Return ``launch(*args, term=, env=, ready=, keep_open=)`` starting the app in tmux.

    ``ready`` is text to wait for before the Pane is handed over (None: do not wait).
    Skips with the reason if tmux or the installed command is missing.
    """
    reason = tmux.missing_tools()
    if reason:
        pytest.skip(reason)
    panes: list[tmux.Pane] = []

    def launch(*args: str, term: str = "xterm-256color", env: dict[str, str] | None = None,
               ready: str | None = "Thread family", keep_open: bool = False) -> tmux.Pane:
        pane = tmux.start(tmp_path / f"run{len(panes)}", args, term=term, env=env,
                          keep_open=keep_open)
        panes.append(pane)
        if ready is not None:
            pane.wait_for(ready)
        return pane

    yield launch
    for n, pane in enumerate(panes):
        if pane.captures:
            print(tmux.framed(pane.captures[-1], f" run {n} (TERM as started), last screen "))
        pane.kill()
