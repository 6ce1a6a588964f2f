"""The "Cut to fit a sample" screen at 80x24, keypad keys only: handed a candidate from "What
thread is this?" (tests/ui/test_identify_screen.py drives the whole way there), or opened on
the job's thread; ``-`` on its first question goes back where it came from."""

import pytest

from shopterm.standards import limits, parse
from tests.glyphs import missing_glyphs
from tests.ui.conftest import screen_text
from tests.ui.test_identify_screen import measure_bolt, pick, type_in

pytestmark = pytest.mark.asyncio


async def test_back_from_the_first_question_returns_to_the_candidate(make_app):
    app = make_app(start_screen="thread")
    async with app.run_test(size=(80, 24)) as pilot:
        app.goto("identify")
        await pilot.pause()
        await measure_bolt(pilot, app, "9.95", "gauge in mm", "1.5", angle="60°")
        await pick(pilot, app, "show the candidates")
        await pilot.press("1")
        await pick(pilot, app, "a nut to fit the sample bolt")
        assert app.current_name == "fitsample"
        text = screen_text(app)
        assert "sample: M10x1.5 · cutting a nut to fit the sample bolt" in text
        assert "The sample bolt's pitch diameter" in text
        await pilot.press("minus")
        assert app.current_name == "identify"
        assert "M10x1.5: what now?" in screen_text(app)      # where it was left
        await pick(pilot, app, "a bolt to fit the nut")        # begun again, the other way
        assert "cutting a bolt to fit the nut the sample bolt fits" in screen_text(app)


async def test_on_the_jobs_thread_without_a_candidate(make_app):
    app = make_app(start_screen="thread")
    async with app.run_test(size=(80, 24)) as pilot:
        app.goto("fitsample")
        await pilot.pause()
        assert "No thread to fit yet" in screen_text(app)
        assert app.thread_chosen(parse("M10x1.5-6g"))
        app.goto("thread")
        app.goto("fitsample")                                 # shown again: the job's thread
        await pilot.pause()
        assert "M10x1.5: what is cut to fit the sample?" in screen_text(app)
        await pick(pilot, app, "a bolt to fit the nut")
        await pick(pilot, app, "I know it")
        # in the display unit (inches in the sample config): 0.3524 in = 8.951 mm, inside
        # ISO 965-2 M10x1.5-6g d2 8.862–8.994 (1 in = 25.4 mm)
        assert "pitch diameter [in]" in screen_text(app)
        await type_in(pilot, "0.3524")
        await type_in(pilot, "0")                             # as snug as the sample
        text = screen_text(app)
        assert "Target from the sample" in text and missing_glyphs(text) == set()
        await pilot.press("enter")                            # use it
        assert app.current_name == "setup" and app.spec.family == "special"
        # fit_sample: a bolt's band ends the clearance (0) below the sample's pitch diameter
        assert limits(app.spec).pd_max == pytest.approx(0.3524 * 25.4, abs=1e-6)
        assert app.state.thread.values["target_source"] == "sample"


async def test_the_clearance_in_the_display_unit_or_with_a_unit_typed(make_app):
    app = make_app(start_screen="thread")
    async with app.run_test(size=(80, 24)) as pilot:
        assert app.thread_chosen(parse("M10x1.5-6g"))
        app.goto("fitsample")
        await pilot.pause()
        await pick(pilot, app, "a nut to fit the sample bolt")
        await pick(pilot, app, "I know it")
        await type_in(pilot, "0.3524")
        await type_in(pilot, "0.05mm")                         # a unit typed after the number
        assert app.screen.target.clearance == pytest.approx(0.05)
        await pick(pilot, app, "change the clearance")
        await pilot.press("backspace", "backspace", "backspace", "backspace", "backspace",
                          "backspace", "full_stop", "0", "0", "2", "enter")
        # 0.002 in = 0.0508 mm (1 in = 25.4 mm): the display unit when none is typed
        assert app.screen.target.clearance == pytest.approx(0.002 * 25.4)
