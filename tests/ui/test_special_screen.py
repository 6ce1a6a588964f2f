"""The special thread's entry, a screen of its own reached from the "Special thread" family of
the thread screen, at 80x24 with keypad keys only; the thread made goes back to the thread
screen ("This thread": use it, kind, class, hand, starts)."""

import pytest

from shopterm.standards import limits
from tests.glyphs import missing_glyphs
from tests.ui.conftest import screen_text
from tests.ui.test_identify_screen import pick, type_in

pytestmark = pytest.mark.asyncio

H60 = 0.8660254037844386          # ISO 68-1: H = (√3 / 2) P for the 60° form (computed)


async def open_special(pilot, app) -> None:
    """Turn the thread families' pages (0) until "Special thread" shows, and pick it."""
    for _ in range(4):
        labels = [lbl for lbl, _ in app.screen.query_one("#choices").page_items()]
        if "Special thread" in labels:
            await pilot.press(str(labels.index("Special thread") + 1))
            await pilot.pause()
            assert app.current_name == "special"
            return
        await pilot.press("0")
    raise AssertionError("no 'Special thread' family")


async def test_a_metric_special_made_and_used(make_app):
    app = make_app(start_screen="thread")
    async with app.run_test(size=(80, 24)) as pilot:
        await open_special(pilot, app)
        assert "Special thread: diameters in" in screen_text(app)
        await pick(pilot, app, "mm")
        await type_in(pilot, "0")                               # refused in place
        assert "greater than zero" in screen_text(app)
        assert app.screen.query_one("#number").value == "0"
        await pilot.press("backspace", "1", "0", "enter")
        await pick(pilot, app, "pitch in mm")
        await type_in(pilot, "1.5")
        await pick(pilot, app, "60°")
        await type_in(pilot, "0")                               # allowance
        await type_in(pilot, "0")                               # basic only
        text = screen_text(app)
        assert "major 10 mm · pitch 1.5 mm · angle 60° · allowance 0 mm" in text
        assert missing_glyphs(text) == set()
        await pick(pilot, app, "external (screw)")
        assert app.current_name == "thread"
        # ISO 68-1: basic d2 = d − 2·(3/8)H = d − 0.649519 P = 10 − 0.974279 (computed)
        pd = 10 - 0.75 * H60 * 1.5
        text = screen_text(app)
        assert "This thread" in text and f"{pd:.3f}" in text
        await pilot.press("enter")                              # use it →
        assert app.spec.family == "special" and app.spec.kind == "external"
        assert limits(app.spec).pd_max == pytest.approx(pd, abs=1e-6)
        assert app.current_name == "setup"


async def test_inch_tpi_internal_and_back_keeps_what_was_typed(make_app):
    app = make_app(start_screen="thread")
    async with app.run_test(size=(80, 24)) as pilot:
        await open_special(pilot, app)
        await pick(pilot, app, "inch")
        await type_in(pilot, ".5")
        await pick(pilot, app, "threads per inch")
        assert "Threads per inch" in screen_text(app)
        await type_in(pilot, "13")
        await pilot.press("minus")                              # back to the tpi: kept
        assert app.screen.query_one("#number").value == "13"
        await pilot.press("enter")
        await pick(pilot, app, "55°")
        await type_in(pilot, ".002")
        await type_in(pilot, ".003")
        await pick(pilot, app, "internal (nut)")
        assert app.current_name == "thread"
        spec = app.screen.walk.spec
        assert spec.kind == "internal" and spec.tpi == 13 and spec.form.angle_deg == 55
        # the special's major typed in inches: 0.5 in = 12.7 mm (1 in = 25.4 mm)
        assert spec.major == pytest.approx(12.7)
        await pilot.press("minus")                              # back: the thread families
        assert "Thread family" in screen_text(app)
        await open_special(pilot, app)                          # begun again, first question
        assert "Special thread: diameters in" in screen_text(app)
        await pilot.press("minus")
        assert app.current_name == "thread" and "Thread family" in screen_text(app)
