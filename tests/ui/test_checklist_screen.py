"""The checklist screen at 80x24: the items for this job, ticked with Enter only, one undone."""

from __future__ import annotations

import re
import sys
from dataclasses import replace
from pathlib import Path

import pytest

from shopterm.standards import parse
from tests.ui.conftest import screen_lines, screen_text

sys.path.insert(0, str(Path(__file__).resolve().parents[2]))
from tests.glyphs import missing_glyphs  # noqa: E402

HELD = {"chuck": "1", "centres": "2"}       # answers on the set-up screen
RUNOUT = {"relief": "1", "mark": "2"}


async def set_up(app, pilot, designation="M10x1.5-6g", held="chuck", runout="mark",
                 starts=1, extra=()):
    """Choose the thread, answer the set-up questions with digits, record, go to the checklist."""
    spec = parse(designation)
    if starts != 1:
        spec = spec.with_(starts=starts)
    assert app.thread_chosen(spec)
    app.goto("setup")
    await pilot.pause()
    await app.workers.wait_for_complete()
    await pilot.pause()
    await pilot.press("1", HELD[held], RUNOUT[runout], *extra, "enter")
    assert app.state.setup is not None
    await pilot.press("plus")
    await pilot.pause()
    assert app.current_name == "checklist"


def item_lines(app) -> list[str]:
    return [ln for ln in screen_lines(app) if re.match(r"^ [▸ ] \[[■ ]\]", ln)]


def unchecked(app) -> list[str]:
    return [ln for ln in item_lines(app) if "[ ]" in ln]


async def test_chuck_job_walked_with_enter_one_undone(make_app):
    app = make_app()
    async with app.run_test(size=(80, 24)) as pilot:
        await set_up(app, pilot, held="chuck", runout="mark")
        text = screen_text(app)
        assert "Carrier" not in text                       # work in a chuck: no carrier item
        # 29.5° from the cross-slide for a 60° thread # (US Navy manual);
        # the sample lathe's scale reads 0 along the cross-slide (sample_config.toml angle_zero)
        assert "Compound set to 29.5 deg on its scale" in text
        # metric lead on an 8 tpi leadscrew # Jones, Turning and Boring (1914) (the factor 127)
        assert "Half nut: Keep the half nut closed" in text
        assert "Stopping point marked" in text and "Thread relief cut" not in text
        for safety in ("Chuck key out, guards on, eye protection on", "No gloves"):
            line = next(ln for ln in item_lines(app) if safety in ln)
            assert " ! " in line                           # marked as a safety item
        assert missing_glyphs(text) == set()               # drawable on the console
        items = len(item_lines(app))
        assert items == len(unchecked(app)) and f"0 of {items} checked" in text
        await pilot.press("plus")                          # not all checked: refused
        assert app.current_name == "checklist" and f"{items} still to check" in screen_text(app)
        for n in range(items):
            assert item_lines(app)[n].startswith(" ▸ [ ]")  # the next one is highlighted
            await pilot.press("enter")
        assert unchecked(app) == []
        assert "Every item is checked" in screen_text(app)
        done = app.state.checklist_done()
        assert len(done) == items and not any("Carrier" in d for d in done)
        last_key = app.state.checklist[-1].text
        await pilot.press("slash")
        await pilot.pause()
        await pilot.press("enter")                         # yes, take it back
        await pilot.pause()
        assert app.state.checklist_done() == done - {last_key}
        left = unchecked(app)
        assert len(left) == 1 and left[0].startswith(" ▸ [ ]") and "No gloves" in left[0]
        assert f"{items - 1} of {items} checked" in screen_text(app)
        await pilot.press("enter")
        await pilot.press("plus")
        assert app.current_name == "prepare"          # the cut comes next: prepare it first


async def test_between_centres_job_has_carrier_and_relief(make_app):
    app = make_app()
    async with app.run_test(size=(80, 24)) as pilot:
        await set_up(app, pilot, held="centres", runout="relief")
        text = screen_text(app)
        assert "Carrier tied to its driving peg" in text
        assert "Thread relief cut" in text and "Stopping point" not in text
        await pilot.press("enter", "enter", "enter", "enter")  # the fourth is the carrier
        assert "Carrier tied to its driving peg so the work cannot slip" in \
            app.state.checklist_done()


async def test_compound_as_a_bed_zeroed_scale_reads(make_app):
    app = make_app()
    app.lathe = replace(app.lathe, compound_zero="bed")
    async with app.run_test(size=(80, 24)) as pilot:
        await set_up(app, pilot)
        # 90 − 29.5 # US Navy machinery training manual (scales read 0 parallel to the bed: set 60.5°)
        assert "Compound set to 60.5 deg on its scale" in screen_text(app)


async def test_compound_from_the_counter_values_when_recorded(make_app):
    app = make_app()
    async with app.run_test(size=(80, 24)) as pilot:
        await set_up(app, pilot)
        # as the counter records a flank set-up (DEVELOPERS.md set-up keys); 30 = 60/2
        # # US Navy machinery training manual (half the included angle in some texts)
        app.record_setup({"method": "flank", "compound_angle_deg": 30.0,
                          "compound_angle_set": 30.0})
        app.screen.redraw()
        assert "Compound set to 30 deg on its scale" in screen_text(app)


async def test_tick_comes_back_when_the_set_up_changes_what_the_item_says(make_app):
    app = make_app()
    async with app.run_test(size=(80, 24)) as pilot:
        await set_up(app, pilot)
        await pilot.press("enter", "enter", "enter")       # centre height, tool, compound 29.5
        assert "3 of" in screen_text(app)
        app.record_setup({"method": "flank", "compound_angle_deg": 30.0,
                          "compound_angle_set": 30.0})     # the counter changes the compound
        app.screen.redraw()
        line = next(ln for ln in item_lines(app) if "Compound set to 30 deg" in ln)
        assert line.startswith(" ▸ [ ]") and "2 of" in screen_text(app)


async def test_whitworth_compound_and_left_hand_item(make_app):
    app = make_app()
    async with app.run_test(size=(80, 24)) as pilot:
        await set_up(app, pilot, designation="5/8 BSW LH")
        text = screen_text(app)
        # 27.5 − 0.5 … the modified flank for 55°: 27° # US Navy machinery training manual (27–27.5°)
        assert "Compound set to 27 deg on its scale" in text
        assert "Leadscrew reversed for a left-hand thread" in text
        # 11 tpi on an 8 tpi leadscrew with 16 teeth and 8 lines: lines 1 and 5
        # # computed from Jones, Turning and Boring (1914) (see test_setup_screen)
        assert "Half nut: Close the half nut on lines 1 or 5." in text


async def test_internal_thread_boring_tool_item(make_app):
    app = make_app()
    async with app.run_test(size=(80, 24)) as pilot:
        await set_up(app, pilot, designation="M10x1.5-6H")
        assert "Boring tool square to the work" in screen_text(app)


async def test_two_start_job_has_indexing_item(make_app):
    app = make_app()
    async with app.run_test(size=(80, 24)) as pilot:
        # best train, centres, relief, then the whole-number method listed first
        await set_up(app, pilot, held="centres", runout="relief", starts=2, extra=("1",))
        text = screen_text(app)
        # sample_config.toml driving_plate_slots = 4: 4 / 2 starts
        assert "2 starts: index by driving plate, 2 slots per start" in text
        assert missing_glyphs(text) == set()


async def test_no_set_up_yet_says_what_to_do(make_app):
    app = make_app()
    async with app.run_test(size=(80, 24)) as pilot:
        app.thread_chosen(parse("M10x1.5-6g"))
        app.goto("checklist")
        await pilot.pause()
        assert "Record the lathe set-up first" in screen_text(app)
        await pilot.press("enter")
        assert app.state.checklist == ()                   # nothing recorded
        await pilot.press("plus")
        assert app.current_name == "checklist"
        await pilot.press("minus")
        assert app.current_name == "setup"


async def test_set_up_for_another_thread_is_not_used(make_app):
    app = make_app()
    async with app.run_test(size=(80, 24)) as pilot:
        await set_up(app, pilot)
        app.thread_chosen(parse("M12x1.75-6g"))
        app.goto("setup")
        await pilot.pause()
        app.goto("checklist")
        await pilot.pause()
        text = screen_text(app)
        assert "was for M10x1.5-6g" in text and "M12x1.75-6g" in text
        await pilot.press("enter")
        assert app.state.checklist == ()


@pytest.mark.parametrize("size", [(80, 24), (100, 30)])
async def test_every_item_fits(make_app, size):
    app = make_app()
    async with app.run_test(size=size) as pilot:
        await set_up(app, pilot, designation="5/8 BSW LH", held="centres", runout="mark",
                     starts=2, extra=("1",))
        lines = item_lines(app)
        assert len(lines) == len(app.screen.items())       # every item of this job shown
        for words in ("Carrier", "2 starts: index by", "Leadscrew reversed", "Stopping point"):
            assert any(words in ln for ln in lines)
        assert all("…" not in ln for ln in lines)
        assert screen_lines(app)[-1].strip().startswith("Enter")   # key bar still there
