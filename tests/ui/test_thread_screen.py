"""The thread-choice screen at 80x24, driven with keypad keys only."""

import pytest

from tests.ui.conftest import screen_text

pytestmark = pytest.mark.asyncio


async def test_walk_iso_metric_by_keypad(make_app):
    app = make_app()
    async with app.run_test(size=(80, 24)) as pilot:
        # 1 ISO metric, 0 next page of sizes ... pick M10 by its number on the page
        await pilot.press("1")
        text = screen_text(app)
        assert "Size" in text and "M10" in text
        # find M10's number on the visible page
        picks = app.screen.query_one("#choices")
        labels = [lbl for lbl, _ in picks.page_items()]
        while "M10" not in labels:
            await pilot.press("0")
            labels = [lbl for lbl, _ in picks.page_items()]
        await pilot.press(str(labels.index("M10") + 1))
        await pilot.press("1")      # pitch 1.5 coarse (coarsest first)
        await pilot.press("1")      # external
        labels = [lbl for lbl, _ in picks.page_items()]
        await pilot.press(str(labels.index("6g") + 1))
        text = screen_text(app)
        assert "M10x1.5-6g" in text
        assert "8.994" in text and "8.862" in text   # ISO 965-2, M10x1.5-6g d2 max/min
        assert "9.968" in text and "9.732" in text   # ISO 965-2, M10x1.5-6g d max/min
        await pilot.press("enter")  # use it
        assert app.spec is not None and app.spec.designation == "M10x1.5-6g"


async def test_typed_designation_and_bad_one_keeps_text(make_app):
    app = make_app()
    async with app.run_test(size=(80, 24)) as pilot:
        await pilot.press(*"M10x1.6-6g")
        await pilot.press("enter")
        text = screen_text(app)
        assert "not in ISO 261" in text
        entry = app.screen.query_one("#designation")
        assert entry.value == "M10x1.6-6g"          # nothing typed is lost
        await pilot.press("backspace", "backspace", "backspace", "backspace", "5", "-", "6", "g")
        await pilot.press("ctrl+j")                 # keypad Enter as tmux sends it
        text = screen_text(app)
        assert "8.994" in text                      # ISO 965-2, M10x1.5-6g d2 max


async def test_back_key_steps_back_in_walk(make_app):
    app = make_app()
    async with app.run_test(size=(80, 24)) as pilot:
        await pilot.press("1")
        assert "Size" in screen_text(app)
        await pilot.press("minus")
        assert "Thread family" in screen_text(app)
        await pilot.press("plus")                   # forward refused without a thread
        assert "Choose a thread first" in screen_text(app)


async def test_enter_after_a_typed_designation_uses_it(make_app):
    app = make_app()
    async with app.run_test(size=(80, 24)) as pilot:
        await pilot.press(*"M6x1-6g")
        await pilot.press("enter")            # look it up
        assert "5.324" in screen_text(app)    # ISO 965-2, M6x1-6g d2 max
        await pilot.press("enter")            # use it
        assert app.spec is not None and app.spec.designation == "M6x1-6g"
        assert app.state.current_designation == "M6x1-6g"
