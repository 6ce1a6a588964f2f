"""The wire-reading screen at 80x24, keypad keys only: readings, feed, states, slips, undo.

The sample config is the DEMO lathe (invented): cross-slide and compound dials 0.001 in a
division on radius, micrometer 0.0001 in, wire sets 0.029 / 0.032 / 0.040 (measured 0.0401) /
0.045 in and 0.577 / 0.866 mm. Check values are re-derived here from the published three-wire
relation, not taken from the core.
"""

from __future__ import annotations

import math
import re
import sys
from dataclasses import replace
from pathlib import Path

import pytest
from textual.widgets import Digits

from shopterm.standards import parse
from shopterm.ui.screens.wires import ReadingSet, band_picture, chart_rows, reading_sets
from tests.ui.conftest import screen_lines, screen_text

sys.path.insert(0, str(Path(__file__).resolve().parents[2]))
from tests.glyphs import missing_glyphs  # noqa: E402

MM_PER_INCH = 25.4                      # NIST SP 811: 1 in = 25.4 mm exactly
COS_29_5 = math.cos(math.radians(29.5))  # compound at 29.5° from the cross-slide, US Navy
#                                          machinery training manual (US Navy machinery training manual)
DIAL_MM = 0.001 * MM_PER_INCH           # demo config: 0.001 in per division, on radius

# ISO 965-2, M10x1.5-6g pitch diameter max / min [mm]
M10_PD_MAX, M10_PD_MIN = 8.994, 8.862
# ASME B1.1 table, 1/4-20 UNC-2A pitch diameter max / min [in]
Q20_PD_MAX, Q20_PD_MIN = 0.2164, 0.2127


def pd_from_wires_60(m: float, wire: float, pitch: float) -> float:
    """PD from M over wires, 60° form, one start, by the NBS H28 / ASME B1.2 lead-angle formula
    E = M + 0.866025P − W(3 + 0.75·tan²λ), tan λ = L/(πE) (NBS Handbook H28, three-wire method), iterated."""
    e = m + 0.8660254037844386 * pitch - 3 * wire
    for _ in range(60):
        tan_l = pitch / (math.pi * e)
        e = m + 0.8660254037844386 * pitch - wire * (3 + 0.75 * tan_l ** 2)
    return e


def over_wires_60(e: float, wire: float, pitch: float) -> float:
    """M over wires for PD ``e``, same published relation solved for M."""
    tan_l = pitch / (math.pi * e)
    return e - 0.8660254037844386 * pitch + wire * (3 + 0.75 * tan_l ** 2)


def compound_divisions(e: float, pd_max: float, pd_min: float, dial_mm: float) -> int:
    """Whole compound divisions from PD ``e`` to the middle of the band: of the two whole numbers
    either side of the exact count, the one that lands in the band nearest the middle.
    Computed from PD falls by 2 × radial, compound travel = radial / cos 29.5° (US Navy machinery training manual)."""
    aim = (pd_max + pd_min) / 2
    exact = (e - aim) / 2 / COS_29_5 / dial_mm
    after = lambda n: e - 2 * n * dial_mm * COS_29_5   # noqa: E731
    inside = [n for n in {math.floor(exact), math.ceil(exact)} if pd_min <= after(n) <= pd_max]
    return min(inside, key=lambda n: abs(after(n) - aim))


def mm_app(make_app):
    """The demo config with lengths shown in mm (the sample shows inches)."""
    app = make_app()
    app.shop = replace(app.shop, display_units="mm")
    return app


async def open_wires(app, pilot, designation: str) -> None:
    await pilot.pause()
    assert app.thread_chosen(parse(designation))
    app.goto("wires")
    await pilot.pause()


def shown_number(text: str, label: str) -> float:
    """Return the number printed after ``label`` on the screen."""
    found = re.search(re.escape(label) + r"\s*([0-9]+\.[0-9]+)", text)
    assert found, f"{label!r} not on screen:\n{text}"
    return float(found.group(1))


def digits(app) -> str:
    return app.screen.query_one("#feed-digits", Digits).value


# ---- M10x1.5-6g, mm --------------------------------------------------------------------------

async def test_m10_reading_shows_feed_on_compound_and_records_it(make_app):
    app = mm_app(make_app)
    async with app.run_test(size=(80, 24)) as pilot:
        await open_wires(app, pilot, "M10x1.5-6g")
        text = screen_text(app)
        assert "0.866 mm" in text                       # best owned wire: 0.866 = 0.57735 × 1.5
        #                                                 (best wire P/(2 cos 30°), NBS Handbook H28)
        # band over the 0.866 wire, re-derived: M at PD max and PD min
        assert f"{over_wires_60(M10_PD_MAX, 0.866, 1.5):.3f} (PD max 8.994)" in text
        assert f"{over_wires_60(M10_PD_MIN, 0.866, 1.5):.3f} (PD min 8.862)" in text
        assert "No reading yet" in text

        await pilot.press(*"10.320", "enter")
        text = screen_text(app)
        e = pd_from_wires_60(10.320, 0.866, 1.5)        # computed from H28 formula, NBS Handbook H28
        assert abs(shown_number(text, "→ PD") - e) <= 0.0006   # shown to 0.001 mm
        n = compound_divisions(e, M10_PD_MAX, M10_PD_MIN, DIAL_MM)
        assert n == 2                                    # computed above: 2.07 → 2 in the band
        assert digits(app) == str(n)
        assert "divisions more on the compound at 29.5°" in text
        # the band in divisions: at least enough to reach PD max, no more than PD min allows
        top = math.ceil((e - M10_PD_MAX) / 2 / COS_29_5 / DIAL_MM)
        bottom = math.floor((e - M10_PD_MIN) / 2 / COS_29_5 / DIAL_MM)
        assert f"in the band from {top} to {bottom} div" in text
        assert "Oversize by" in text and "continue" not in text.lower()
        assert "clockwise" in text and "backlash" in text
        assert "Reading 10.320 mm taken" in text

        reading = app.state.last_reading
        assert reading.measured_mm == pytest.approx(10.320)
        assert reading.state == "oversize"
        assert reading.wire_mm == pytest.approx(0.866)
        assert reading.pd_mm == pytest.approx(e, abs=2e-4)   # exact model vs H28: < 0.2 µm here
        assert reading.pd_max_mm == pytest.approx(M10_PD_MAX)
        assert reading.pd_min_mm == pytest.approx(M10_PD_MIN)
        assert reading.payload["divisions"] == n
        assert reading.payload["typed"] == "10.320"
        assert reading.payload["remaining_mm"] == pytest.approx(e - (M10_PD_MAX + M10_PD_MIN) / 2,
                                                                abs=2e-4)
        assert not missing_glyphs(text)


async def test_several_readings_mean_spread_and_warning(make_app):
    app = mm_app(make_app)
    async with app.run_test(size=(80, 24)) as pilot:
        await open_wires(app, pilot, "M10x1.5-6g")
        await pilot.press(*"10.32", "enter", *"10.322", "enter")
        text = screen_text(app)
        assert "2 readings: mean 10.321, spread 0.002 mm" in text   # arithmetic mean
        assert "TOO WIDE" not in text        # 0.002 mm < 2 steps of 0.0001 in (0.00508 mm)
        await pilot.press(*"10.33", "enter")
        text = screen_text(app)
        assert "3 readings: mean 10.324, spread 0.010 mm" in text   # (10.32+10.322+10.33)/3
        assert "TOO WIDE" in text and "burr" in text
        readings = app.state.readings
        assert [r.measured_mm for r in readings] == pytest.approx([10.32, 10.322, 10.33])
        # the last entry acts on the mean of the set
        assert readings[-1].pd_mm == pytest.approx(
            pd_from_wires_60((10.32 + 10.322 + 10.33) / 3, 0.866, 1.5), abs=2e-4)
        assert readings[-1].payload["set_mm"] == pytest.approx([10.32, 10.322, 10.33])


async def test_unit_slip_question_before_recording(make_app):
    app = mm_app(make_app)
    async with app.run_test(size=(80, 24)) as pilot:
        await open_wires(app, pilot, "M10x1.5-6g")
        await pilot.press(*"0.4063", "enter")     # 0.4063 in is 10.320 mm: typed in inches
        text = screen_text(app)
        assert "inches taken as mm" in text and "0.4063 in" in text
        assert app.state.readings == ()           # nothing recorded while the question is open
        await pilot.press("minus")                # no: change what was typed
        assert app.state.readings == ()
        assert app.screen.query_one("#reading").value == "0.4063"   # nothing typed is lost
        await pilot.press("enter")                # ask again, and this time yes
        await pilot.press("enter")
        assert len(app.state.readings) == 1
        assert app.state.last_reading.measured_mm == pytest.approx(0.4063 * MM_PER_INCH)
        assert "taken as 0.4063 in" in app.state.last_reading.payload["typed"]
        assert app.screen.query_one("#reading").value == ""


async def test_bad_and_impossible_readings_keep_the_entry(make_app):
    app = mm_app(make_app)
    async with app.run_test(size=(80, 24)) as pilot:
        await open_wires(app, pilot, "M10x1.5-6g")
        await pilot.press(*"1.2.3", "enter")
        assert "not a number" in screen_text(app)
        assert app.screen.query_one("#reading").value == "1.2.3"
        await pilot.press(*["backspace"] * 5, *"50", "enter")   # no unit slip explains 50 mm
        text = screen_text(app)
        assert "cannot be right" in text and "Traceback" not in text
        assert app.state.readings == ()
        assert app.screen.query_one("#reading").value == "50"


async def test_reading_shown_as_taken_only_when_recorded(make_app, monkeypatch):
    app = mm_app(make_app)
    async with app.run_test(size=(80, 24)) as pilot:
        await open_wires(app, pilot, "M10x1.5-6g")
        monkeypatch.setattr(app, "record", lambda kind, payload=None: None)   # record refuses
        await pilot.press(*"10.32", "enter")
        text = screen_text(app)
        assert "not recorded" in text and "taken" not in text
        assert app.screen.query_one("#reading").value == "10.32"
        assert digits(app) == ""                   # no feed shown for a reading not taken


async def test_undersize_says_what_it_still_fits(make_app):
    app = mm_app(make_app)
    async with app.run_test(size=(80, 24)) as pilot:
        await open_wires(app, pilot, "M10x1.5-6g")
        await pilot.press(*"10.1", "enter")
        text = screen_text(app)
        e = pd_from_wires_60(10.1, 0.866, 1.5)     # ≈ 8.799, below 8.862
        assert e < M10_PD_MIN
        assert f"Undersize by {M10_PD_MIN - e:.3f} mm" in text
        # ISO 965-1: 8g = es −32 µm, Td2 grade 8 (5.6–11.2, P1.5) 212 µm → 8.994 to 8.782
        assert 8.782 <= e <= 8.994 and "8g" in text
        assert digits(app) == "0" and "Do not feed any further" in text
        assert "continue" not in text.lower()
        assert app.state.last_reading.state == "undersize"


async def test_in_band_says_where(make_app):
    app = mm_app(make_app)
    async with app.run_test(size=(80, 24)) as pilot:
        await open_wires(app, pilot, "M10x1.5-6g")
        await pilot.press(*"10.23", "enter")
        text = screen_text(app)
        e = pd_from_wires_60(10.23, 0.866, 1.5)
        assert M10_PD_MIN < e < M10_PD_MAX
        assert "In the band: stop." in text
        assert f"{e - M10_PD_MIN:.3f} mm above the bottom" in text
        assert digits(app) == "0"
        # the picture: the reading (█) between the band's ends
        line = next(x for x in screen_lines(app) if x.strip().startswith("big "))
        assert line.index("[") < line.index("█") < line.index("]")


# ---- 1/4-20 UNC-2A, inch ---------------------------------------------------------------------

async def test_quarter_20_unc_2a_in_inches(make_app):
    app = make_app()                               # the sample shows inches
    async with app.run_test(size=(80, 24)) as pilot:
        await open_wires(app, pilot, "1/4-20 UNC-2A")
        text = screen_text(app)
        w = 0.029                                   # owned set nearest the best 0.57735/20 =
        #                                             0.0289 in (NBS Handbook H28)
        assert "wire 0.0290 in" in text
        p = 1 / 20
        assert f"{over_wires_60(Q20_PD_MAX, w, p):.4f} (PD max 0.2164)" in text
        assert f"{over_wires_60(Q20_PD_MIN, w, p):.4f} (PD min 0.2127)" in text
        await pilot.press(*".265", "enter")
        text = screen_text(app)
        e = pd_from_wires_60(0.265, w, p)          # [in]
        assert abs(shown_number(text, "→ PD") - e) <= 0.00006
        n = compound_divisions(e * MM_PER_INCH, Q20_PD_MAX * MM_PER_INCH,
                               Q20_PD_MIN * MM_PER_INCH, DIAL_MM)
        assert n == 4                               # computed: 3.82 → 3 or 4, 4 nearer the middle
        assert digits(app) == "4"
        assert "Reading 0.2650 in taken" in text
        reading = app.state.last_reading
        assert reading.measured_mm == pytest.approx(0.265 * MM_PER_INCH)   # stored in mm
        assert reading.pd_mm == pytest.approx(e * MM_PER_INCH, abs=5e-4)
        assert reading.wire_mm == pytest.approx(w * MM_PER_INCH)


async def test_cross_slide_when_set_up_feeds_radially(make_app):
    app = make_app()
    async with app.run_test(size=(80, 24)) as pilot:
        await open_wires(app, pilot, "1/4-20 UNC-2A")
        assert app.record_setup({"method": "radial"}) is not None
        app.screen.redraw()
        await pilot.press(*".265", "enter")
        e = pd_from_wires_60(0.265, 0.029, 0.05) * MM_PER_INCH
        aim = (Q20_PD_MAX + Q20_PD_MIN) / 2 * MM_PER_INCH
        exact = (e - aim) / 2 / DIAL_MM              # cross-slide on radius: travel = radial
        after = lambda n: e - 2 * n * DIAL_MM        # noqa: E731
        cands = [n for n in (math.floor(exact), math.ceil(exact))
                 if Q20_PD_MIN * MM_PER_INCH <= after(n) <= Q20_PD_MAX * MM_PER_INCH]
        n = min(cands, key=lambda k: abs(after(k) - aim))
        assert digits(app) == str(n)
        assert "divisions more on the cross-slide" in screen_text(app)


# ---- undo, wires, history ----------------------------------------------------------------------

async def test_undo_takes_back_the_last_reading(make_app):
    app = mm_app(make_app)
    async with app.run_test(size=(80, 24)) as pilot:
        await open_wires(app, pilot, "M10x1.5-6g")
        await pilot.press(*"10.32", "enter", *"10.33", "enter")
        assert "2 readings" in screen_text(app)
        await pilot.press("slash")
        assert "Undo the wire reading 10.33" in screen_text(app)
        await pilot.press("enter")
        await pilot.pause()
        text = screen_text(app)
        assert [r.measured_mm for r in app.state.readings] == pytest.approx([10.32])
        assert "1 reading 10.320 mm" in text
        await pilot.press("divide", "ctrl+j")        # keypad / and tmux keypad Enter
        await pilot.pause()
        assert app.state.readings == ()
        assert "No reading yet" in screen_text(app)


async def test_choose_another_wire_and_a_measured_size(make_app):
    app = mm_app(make_app)
    async with app.run_test(size=(80, 24)) as pilot:
        await open_wires(app, pilot, "M10x1.5-6g")
        await pilot.press("enter")                   # empty entry: the wire list
        picks = app.screen.query_one("#wire-list")
        labels = [lbl for lbl, _ in picks.page_items()]
        assert labels[0].startswith("0.866 mm")      # best first
        # 60° wire range 0.505182P–1.010363P (NBS Handbook H28) = 0.758–1.516 mm: 0.577 is too small
        assert not any(lbl.startswith("0.577") for lbl in labels)
        assert 0.505182 * 1.5 > 0.577
        await pilot.press(str(labels.index("type a measured size") + 1))
        await pilot.press(*"2", "enter")             # 2 mm: too large for 1.5 mm pitch
        assert "too large" in screen_text(app)
        assert not app.setup_values().get("wire_mm")
        await pilot.press("backspace", *"0.87", "enter")
        assert app.setup_values()["wire_mm"] == pytest.approx(0.87)
        text = screen_text(app)
        assert f"{over_wires_60(M10_PD_MAX, 0.87, 1.5):.3f} (PD max 8.994)" in text
        await pilot.press(*"10.33", "enter")
        assert app.state.last_reading.wire_mm == pytest.approx(0.87)
        assert app.state.last_reading.pd_mm == pytest.approx(
            pd_from_wires_60(10.33, 0.87, 1.5), abs=2e-4)


async def test_chart_closes_in_pass_by_pass(make_app):
    app = mm_app(make_app)
    async with app.run_test(size=(80, 24)) as pilot:
        await open_wires(app, pilot, "M10x1.5-6g")
        for n, reading in enumerate(("10.52", "10.41", "10.3"), 1):
            assert app.record("pass_cut", {"n": n, "radial_cum_mm": 0.1 * n}) is not None
            app.screen.job_changed()
            await pilot.press(*reading, "enter")
        lines = screen_lines(app)
        rows = [x for x in lines if re.match(r"^ pass \d", x)]
        assert [" ".join(r.split()[:2]) for r in rows] == ["pass 1", "pass 2", "pass 3"]
        cols = [r.index("█") for r in rows]
        assert cols == sorted(cols) and cols[0] < cols[-1]       # moving towards the band
        # after another pass, the old reading no longer counts as now
        app.record("pass_cut", {"n": 4, "radial_cum_mm": 0.4})
        app.screen.job_changed()
        await pilot.pause()
        assert "Cut since the last reading (pass 4)" in screen_text(app)
        assert not missing_glyphs(screen_text(app))


async def test_back_and_forward_go_to_the_counter(make_app):
    app = mm_app(make_app)
    async with app.run_test(size=(80, 24)) as pilot:
        await open_wires(app, pilot, "M10x1.5-6g")
        await pilot.press(*"10.3")
        await pilot.press("minus")
        await pilot.pause()
        # the counter; with nothing prepared yet it sends the user to the preparation
        assert app.current_name == "prepare"
        app.goto("wires")
        await pilot.pause()
        assert app.screen.query_one("#reading").value == "10.3"   # the entry kept its text
        await pilot.press("plus")
        await pilot.pause()
        assert app.current_name == "prepare"


# ---- internal thread: a fit check instead ---------------------------------------------------

async def test_internal_thread_offers_a_fit_check(make_app):
    app = mm_app(make_app)
    async with app.run_test(size=(80, 24)) as pilot:
        await open_wires(app, pilot, "M10x1.5-6H")
        text = screen_text(app)
        assert "cannot be measured over wires" in text
        assert "mating part" in text and "plug gauge" in text
        await pilot.press("2")                      # plug gauge
        assert "What happened?" in screen_text(app)
        await pilot.press("minus")                  # back to the first question
        assert "Record a fit check" in screen_text(app)
        await pilot.press("1", "2")                 # mating part: goes on tight
        notes = app.state.notes
        assert len(notes) == 1 and "mating part" in notes[0].text and "tight" in notes[0].text
        assert app.state.readings == ()
        assert "tight" in screen_text(app)
        assert not missing_glyphs(screen_text(app))


# ---- fit on screen ---------------------------------------------------------------------------

@pytest.mark.parametrize("size", [(80, 24), (100, 30)])
async def test_nothing_important_cut_off(make_app, size):
    app = mm_app(make_app)
    async with app.run_test(size=size) as pilot:
        await open_wires(app, pilot, "M10x1.5-6g")
        await pilot.press(*"10.32", "enter", *"10.34", "enter")   # oversize, wide spread
        lines = screen_lines(app)
        text = " ".join(x.strip() for x in lines)    # phrases may wrap at any width
        assert len(lines) == size[1] and all(len(x) <= size[0] for x in lines)
        assert lines[-1].strip().startswith("Enter")  # the key bar is on the last line
        for must in ("M10x1.5-6g", "over wires:", "Reading over wires", "TOO WIDE",
                     "divisions more on the compound", "clockwise", "come up again",
                     "Oversize by", "big ", "closing in", "hands clear", "Enter", "undo"):
            assert must in text, must
        assert not missing_glyphs(text)
        assert "▁" not in text and "▂" not in text


# ---- the pure helpers -------------------------------------------------------------------------

def test_reading_sets_split_at_cuts_and_wire_changes():
    from shopterm.job.events import make_event
    from shopterm.job.state import fold
    events = [make_event(1, 1, "job_created", {"designation": "M10x1.5-6g",
                                               "thread_kind": "external", "units": "mm"})]

    def add(kind, payload):
        events.append(make_event(len(events) + 1, 1, kind, payload))

    reading = lambda m, w=0.866: {"measured_mm": m, "pd_mm": 9.0, "state": "oversize",  # noqa
                                  "wire_mm": w}
    add("wire_reading", reading(10.3))
    add("pass_cut", {"n": 1, "radial_cum_mm": 0.1})
    add("wire_reading", reading(10.2))
    add("wire_reading", reading(10.21))
    add("wire_reading", reading(10.2, 0.87))
    add("spring_pass", {})
    add("wire_reading", reading(10.19, 0.87))
    sets = reading_sets(fold(events))
    assert [(s.label, len(s.readings)) for s in sets] == [
        ("start", 1), ("pass 1", 2), ("pass 1", 1), ("spring", 1)]
    assert isinstance(sets[0], ReadingSet) and sets[2].wire_mm == 0.87
    assert reading_sets(None) == []
    # a tapered thread's readings at another plane start a new set (DEVELOPERS.md)
    add("wire_reading", {**reading(10.19, 0.87), "distance_mm": 5.0})
    add("wire_reading", {**reading(10.18, 0.87), "distance_mm": 5.0})
    add("wire_reading", {**reading(10.25, 0.87), "distance_mm": 8.2})
    from shopterm.cutting.reading_sets import current_set
    sets = reading_sets(fold(events))
    assert [len(s.readings) for s in sets[3:]] == [1, 2, 1]
    assert len(current_set(fold(events), 0.87, 8.2).readings) == 1
    assert current_set(fold(events), 0.87, 5.0) is None


@pytest.mark.parametrize("pd, mark", [(9.5, "<"), (8.0, ">"), (8.93, "█")])
def test_band_picture_marks_the_reading(pd, mark):
    line = band_picture(pd, 8.994, 8.862)
    assert line.startswith("big ") and line.endswith(" small")
    assert line.count(mark) == 1 and "[" in line and "]" in line
    if mark == "█":
        assert line.index("[") < line.index("█") < line.index("]")
    assert not missing_glyphs(line)


def test_chart_rows_move_right_as_pd_falls():
    rows = chart_rows([("pass 1", 9.2, 1), ("pass 2", 9.05, 2), ("pass 3", 8.95, 1)],
                      8.994, 8.862, "mm")
    cols = [r.index("█") for r in rows]
    assert cols[0] < cols[1] < cols[2]
    assert "×2" in rows[1] and rows[0].startswith("pass 1")
    assert chart_rows([], 8.994, 8.862, "mm") == []


async def test_changing_from_internal_to_external_brings_the_entry_back(make_app):
    app = mm_app(make_app)
    async with app.run_test(size=(80, 24)) as pilot:
        await open_wires(app, pilot, "M10x1.5-6H")
        assert app.current_name == "fitcheck"       # no reading entry for an internal thread
        app.thread_chosen(parse("M10x1.5-6g"))
        app.screen.job_changed()
        await pilot.pause()
        assert app.screen.query_one("#reading").display
        assert "Reading over wires [mm]" in screen_text(app)
