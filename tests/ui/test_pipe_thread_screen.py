"""Pipe threads on the thread-choice screen at 80x24: the walk by keypad digits, the taper
notes and the pressure caution every pipe thread shows."""

import pytest

from shopterm.standards import walk
from tests.ui.conftest import screen_text

pytestmark = pytest.mark.asyncio

CAUTION = "fitness for service is not settled"


async def pick(pilot, picks, label: str) -> None:
    """Press the digit of ``label``, turning pages with 0 (nine entries a page)."""
    for _ in range(4):
        labels = [lbl for lbl, _ in picks.page_items()]
        assert len(labels) <= 9                       # each entry picked by one digit
        if label in labels:
            await pilot.press(str(labels.index(label) + 1))
            return
        await pilot.press("0")
    raise AssertionError(f"{label!r} not in the list")


async def test_walk_to_r_half_shows_gauge_plane_and_caution(make_app):
    app = make_app()
    async with app.run_test(size=(80, 24)) as pilot:
        picks = app.screen.query_one("#choices")
        await pick(pilot, picks, walk.group("pipe").title)
        await pick(pilot, picks, "more sizes and pitches")  # past the common sizes
        await pick(pilot, picks, "R")
        await pick(pilot, picks, "1/2")
        text = screen_text(app)
        assert "standard tolerance" in text
        assert "R1/2" in text and "gauge plane" in text and CAUTION in text
        assert "19.906" in text and "19.681" in text   # ISO 7-1: 19.793 ± 1.8/16 (from memory)


async def test_common_pipe_sizes_come_first(make_app):
    app = make_app()
    async with app.run_test(size=(80, 24)) as pilot:
        picks = app.screen.query_one("#choices")
        await pick(pilot, picks, walk.group("pipe").title)
        assert "Common sizes" in screen_text(app)
        await pick(pilot, picks, "R1/2")                   # family and size: two digits
        text = screen_text(app)
        assert "R1/2" in text and "gauge plane" in text and CAUTION in text


@pytest.mark.parametrize("typed", ["G3/4", "1/2-14 NPT", "Rp1/2", "G1/2A"])
async def test_every_pipe_thread_shows_the_caution(make_app, typed):
    app = make_app()
    async with app.run_test(size=(80, 24)) as pilot:
        # Tab opens the designation field (a leading digit would pick from the list)
        await pilot.press("tab", *("space" if c == " " else c for c in typed))
        await pilot.press("enter")
        assert CAUTION in screen_text(app)


async def test_no_caution_on_a_bolt_thread(make_app):
    app = make_app()
    async with app.run_test(size=(80, 24)) as pilot:
        await pilot.press(*"M10x1.5-6g")
        await pilot.press("enter")
        assert CAUTION not in screen_text(app)
