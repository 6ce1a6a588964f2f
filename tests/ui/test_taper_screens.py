"""Tapered pipe threads on the screens at 80x24, keypad keys only: the set-up's taper question,
the checklist items it adds, the blank on the preparation, readings at a stated plane on the
wire screen, and the hand-tight check.

The demo lathe (sample_config.toml, invented): tailstock set-over scale 1 mm a line, at most
12 mm; taper attachment graduated in in/ft up to 3; compound and cross-slide 0.001 in a division.
Check values are worked out here from the 1:16 taper and the ISO 7-1 sizes, not from the core.
"""

from __future__ import annotations

import math

import pytest

from shopterm.standards import parse
from tests.glyphs import missing_glyphs
from tests.ui.conftest import screen_lines, screen_text

pytestmark = pytest.mark.asyncio

IN = 25.4                  # NIST SP 811: 1 in = 25.4 mm exactly
K = 1 / 16                 # ISO 7-1: taper 1 in 16 on diameter (from memory)
P14 = IN / 14              # ISO 7-1 size 1/2: 14 threads per inch (from memory)
R12_GAUGE_LENGTH = 8.2     # ISO 7-1 table 1, size 1/2: gauge length [mm] (from memory)
R12_GAUGE_D = 20.955       # ISO 7-1 table 1, size 1/2: gauge diameter [mm] (from memory)


def glyphs_ok(app) -> None:
    bad = missing_glyphs("\n".join(screen_lines(app)))
    assert not bad, bad


async def open_setup(app, pilot, designation: str):
    assert app.thread_chosen(parse(designation))
    app.goto("setup")
    await pilot.pause()
    await app.workers.wait_for_complete()
    await pilot.pause()


async def set_up_between_centres(app, pilot, length_typed: str) -> None:
    """Gears 1, between centres (2), relief (1), set-over (1), the work's length, Enter."""
    await open_setup(app, pilot, "R1/2")
    await pilot.press("1", "2", "1")
    assert "how is the taper made?" in screen_text(app)
    await pilot.press("1")
    assert "the work's overall length between centres" in screen_text(app)
    await pilot.press(*length_typed, "enter")


async def test_setup_asks_how_the_taper_is_made_and_records_the_set_over(make_app):
    app = make_app()
    async with app.run_test(size=(80, 24)) as pilot:
        await set_up_between_centres(app, pilot, "6")          # 6 in between centres
        text = screen_text(app)
        # set-over = k/2 × work length = 152.4 / 32 = 4.7625 mm, 4.76 lines of 1 mm
        # (computed from the tailstock set-over formula, Machinery's Handbook, from memory)
        assert "tailstock set over 4.76 mm toward the tool" in text
        glyphs_ok(app)
        await pilot.press("enter")
        taper = app.setup_values()["taper"]
        assert taper["method"] == "set_over" and taper["toward_tool"] is True
        assert taper["work_length_mm"] == pytest.approx(6 * IN)
        assert taper["set_over_mm"] == pytest.approx(6 * IN / 32)     # computed, as above
        assert max(len(line.rstrip()) for line in screen_lines(app)) <= 80
        # the checklist: the set-over item and the tool square to the axis
        await pilot.press("plus")
        text = screen_text(app)
        assert "Tailstock set over 4.76 mm toward the tool (dial indicator)" in text
        assert "Tool set square to the work's axis, not to the taper" in text
        assert "Carrier tied to its driving peg" in text
        glyphs_ok(app)


async def test_setup_refuses_set_over_in_a_chuck(make_app):
    app = make_app()
    async with app.run_test(size=(80, 24)) as pilot:
        await open_setup(app, pilot, "R1/2")
        await pilot.press("1", "1", "1")                      # in a chuck
        text = screen_text(app)
        assert "set-over between centres: not with the work in a chuck" in text
        # the attachment at 12/16 = 0.75 in/ft (computed: taper per foot = 12 k)
        assert "taper attachment: 0.75 in/ft" in text
        await pilot.press("1")                                # refused in place, kept here
        assert "needs the work between centres" in screen_text(app)
        assert "how is the taper made?" in screen_text(app)
        await pilot.press("3")                                # the compound: the blank only
        text = screen_text(app)
        # half-angle atan(1/32) = 1.7899° (computed); the thread needs 1 or 2
        assert "1.7899°" in text and "how is the taper made?" in text
        await pilot.press("2", "enter")                       # the attachment: recorded
        taper = app.setup_values()["taper"]
        assert taper["method"] == "attachment" and taper["setting"] == pytest.approx(0.75)
        await pilot.press("plus")
        assert "Taper attachment set to 0.75 in/ft" in screen_text(app)


async def test_setup_refuses_a_set_over_beyond_the_tailstock(make_app):
    app = make_app()
    async with app.run_test(size=(80, 24)) as pilot:
        # 20 in between centres wants 508/32 = 15.9 mm, more than the tailstock's 12 mm
        await set_up_between_centres(app, pilot, "20")
        text = screen_text(app)
        assert "more than this tailstock's 12.00 mm" in text
        assert "the work's overall length between centres" in text   # stays to correct
        await pilot.press("enter")
        assert "taper" not in app.setup_values()


async def test_prepare_says_where_to_measure_the_blank(make_app):
    app = make_app()
    async with app.run_test(size=(80, 24)) as pilot:
        await set_up_between_centres(app, pilot, "6")
        await pilot.press("enter")
        app.goto("prepare")
        await pilot.pause()
        text = screen_text(app)
        # at the small end: 20.955 − 8.2/16 = 20.4425 mm = 0.8048 in (computed from the taper)
        assert "OD at small end [in]" in text and "should read 0.8048 in" in text
        assert "Turn the blank to the taper first" in text
        await pilot.press(*"0.8048", "enter", "enter")
        values = app.setup_values()
        assert values["blank_at_mm"] == 0.0 and values["passes"] >= 1
        assert app.screen.SCREEN_NAME == "counter"
        glyphs_ok(app)


async def prepared_r_half(app, pilot) -> None:
    await set_up_between_centres(app, pilot, "6")
    await pilot.press("enter")
    app.goto("prepare")
    await pilot.pause()
    await pilot.press(*"0.8048", "enter", "enter")
    await pilot.press("enter", "enter")                       # two passes cut
    app.goto("wires")
    await pilot.pause()


async def test_wire_reading_at_a_stated_plane(make_app):
    app = make_app()
    async with app.run_test(size=(80, 24)) as pilot:
        await prepared_r_half(app, pilot)
        text = screen_text(app)
        # the gauge plane, 8.2 mm = 0.3228 in from the small end, is where readings start
        assert "measured at 0.3228 in from the small end (the gauge plane)" in text
        await pilot.press("enter")                            # empty entry: the options
        assert "distance of the measuring plane" in screen_text(app)
        await pilot.press("1", *"0.2", "enter")
        text = screen_text(app)
        assert "measured at 0.2000 in from the small end" in text
        glyphs_ok(app)
        await pilot.press(*"0.8600", "enter")
        r = app.state.readings[-1].payload
        assert r["distance_mm"] == pytest.approx(0.2 * IN)
        # the PD recorded is carried along the 1:16 taper to the gauge plane
        # (computed: + k × (8.2 − 5.08) mm)
        assert r["pd_mm"] - r["pd_at_plane_mm"] == pytest.approx(K * (R12_GAUGE_LENGTH
                                                                     - 0.2 * IN))
        assert r["state"] == "oversize" and r["divisions"] > 0
        text = screen_text(app)
        assert "at gauge plane" in text and "divisions more on the compound" in text
        assert max(len(line.rstrip()) for line in screen_lines(app)) <= 80
        # the plane is kept for the next reading, and off the thread is refused in place
        await pilot.press("enter", "1", *"2", "enter")
        assert "beyond the thread" in screen_text(app)
        await pilot.press("minus")
        assert "measured at 0.2000 in from the small end" in screen_text(app)


async def test_hand_tight_check_by_turns_is_recorded(make_app):
    app = make_app()
    async with app.run_test(size=(80, 24)) as pilot:
        await prepared_r_half(app, pilot)
        await pilot.press("enter", "2")                       # hand-tight check
        assert app.screen.SCREEN_NAME == "handtight"
        text = screen_text(app)
        # gauge length 8.2 mm / pitch 1.814 mm = 4.5 turns (computed)
        assert "4.5 turns expected" in text
        await pilot.press("1", "1", *"2.5", "enter")          # ring gauge, turns, 2.5
        note = app.state.notes[-1]
        assert note.text.startswith("Hand-tight check with a ring gauge")
        hand = app.state.events[-1].payload["hand_tight"]
        short = (R12_GAUGE_LENGTH / P14 - 2.5) * P14          # computed: turns short × pitch
        assert hand["stand_off_mm"] == pytest.approx(short)
        assert hand["to_remove_mm"] == pytest.approx(K * short)   # computed from the taper
        assert hand["state"] == "feed_on" and hand["slide"] == "compound"
        # radial k·s/2 on the compound at 27°: travel / cos 27°, 0.001 in a division
        # (US Navy machinery training manual: compound travel = radial / cos angle)
        divs = K * short / 2 / math.cos(math.radians(hand["compound_angle_deg"])) / (0.001 * IN)
        assert hand["compound_divisions"] == round(divs)
        text = screen_text(app)
        assert "divisions more on the compound" in text and "turns short of flush" in text
        glyphs_ok(app)
        # a stand-off longer than the gauge is refused, nothing recorded, the entry kept
        n = len(app.state.notes)
        await pilot.press("minus", "3", *"0.5", "enter")      # past flush by 0.5 in
        assert "more than the whole gauge length" in screen_text(app)
        assert len(app.state.notes) == n


async def test_internal_taper_fit_check_offers_the_plug_gauge(make_app):
    app = make_app()
    async with app.run_test(size=(80, 24)) as pilot:
        assert app.thread_chosen(parse("Rc1/2"))
        app.goto("fitcheck")
        await pilot.pause()
        text = screen_text(app)
        assert "Plug gauge stand-off (hand-tight check of the taper)" in text
        await pilot.press("3")
        assert app.screen.SCREEN_NAME == "handtight"
        await pilot.press("1", "2", *"0.15", "enter")         # plug gauge, short by 0.15 in
        hand = app.state.events[-1].payload["hand_tight"]
        assert hand["against"] == "plug_gauge"
        # 3.81 mm short, over the Rc's ±2.3 mm (ISO 7-1, from memory): feed on k × 3.81
        assert hand["state"] == "feed_on"
        assert hand["to_remove_mm"] == pytest.approx(K * 0.15 * IN)
        glyphs_ok(app)
