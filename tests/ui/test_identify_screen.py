"""The "What thread is this?" screen at 80x24, driven with keypad keys only.

Measurements go in one question at a time; the ranked candidates come from
``shopterm.cutting.identify`` and the sample target from ``shopterm.cutting.fit_sample``; these
tests check what the screen shows and what reaches the app and the job record.
"""

import math

import pytest

from shopterm.standards import limits
from tests.glyphs import missing_glyphs
from tests.ui.conftest import screen_lines, screen_text

pytestmark = pytest.mark.asyncio

#: Keypad keys for what a person types.
KEY = {".": "full_stop", "-": "minus"}


def keys_for(text: str) -> list[str]:
    return [KEY.get(ch, ch) for ch in text] + ["enter"]


async def pick(pilot, app, words: str) -> None:
    """Press the digit of the choice whose label contains ``words`` (it must be on the page)."""
    picks = app.screen.query_one("#choices")
    labels = [label for label, _ in picks.page_items()]
    hits = [i for i, label in enumerate(labels) if words in label]
    assert hits, f"{words!r} not among {labels}"
    await pilot.press(str(hits[0] + 1))


async def type_in(pilot, text: str) -> None:
    await pilot.press(*keys_for(text))


async def open_screen(app, pilot):
    app.goto("identify")
    await pilot.pause()
    assert app.current_name == "identify"


async def measure_bolt(pilot, app, major: str, pitch_way: str, *pitch: str, angle: str):
    """Answer: a bolt in mm, its major, the pitch (one or two entries), the angle, no wires."""
    await pick(pilot, app, "bolt (external), diameters in mm")
    await type_in(pilot, major)
    await pick(pilot, app, pitch_way)
    for text in pitch:
        await type_in(pilot, text)
    await pick(pilot, app, angle)


async def test_worn_m10_ranks_m10x1_5_first_and_becomes_the_job_thread(make_app):
    app = make_app(start_screen="thread")
    async with app.run_test(size=(80, 24)) as pilot:
        await open_screen(app, pilot)
        # A worn M10x1.5 bolt: major 9.95 (ISO 261 M10 coarse P 1.5; 0.05 of crest wear,
        # common practice, no source), pitch from a 1.5 mm gauge leaf, angle not gauged.
        await measure_bolt(pilot, app, "9.95", "gauge in mm", "1.5", angle="not gauged")
        await pick(pilot, app, "show the candidates")
        lines = screen_lines(app)
        text = "\n".join(lines)
        assert len(lines) == 24
        first = app.screen.query_one("#choices").items[0][0]
        assert first.startswith("M10x1.5 ")                  # ISO 261: M10 coarse, P 1.5
        assert "1 M10x1.5: pitch matches 1.5 mm exactly" in text
        assert "major 9.950 mm · pitch 1.500 mm" in text     # what was typed, kept on screen
        assert missing_glyphs(text) == set()
        await pilot.press("1")
        assert "M10x1.5: what now?" in screen_text(app)
        await pilot.press("enter")                           # use it
        assert app.spec is not None
        assert app.spec.designation == "M10x1.5-6g"          # ISO 965-1: 6g the usual bolt class
        assert app.current_name == "setup"
        chosen = app.state.thread.values
        assert chosen["designation"] == "M10x1.5-6g" and "target_source" not in chosen


async def test_quarter_20_against_m6x1_shows_the_telling_pitch_check(make_app):
    app = make_app(start_screen="thread")
    async with app.run_test(size=(80, 24)) as pilot:
        await open_screen(app, pilot)
        # Calipers only: 5.98 sits near both M6 (ISO 261, d = 6) and a worn 1/4 in (6.35 mm)
        await measure_bolt(pilot, app, "5.98", "not measured", angle="60°")
        await pick(pilot, app, "show the candidates")
        picks = app.screen.query_one("#choices")
        names = [label.split()[0] for label, _ in picks.items]
        assert "M6x1" in names and "1/4-20" in names
        assert "Could be any of these" in screen_text(app)   # ambiguous: said so
        await pick(pilot, app, "M6x1 ")
        text = " ".join(screen_text(app).split())            # lines joined (wrapping)
        assert "What tells it from the others" in text
        # computed from 10 × P: ISO 261 M6 coarse P = 1 mm; ASME B1.1 1/4-20 P = 25.4/20 mm
        m6 = f"{10 * 1.0:.2f}"
        unc = f"{10 * 25.4 / 20:.2f}"
        assert (f"measure over 10 pitches (11 crests, first to last): M6x1 {m6} mm, "
                f"1/4-20 UNC {unc} mm") in text
        assert missing_glyphs(screen_text(app)) == set()
        await pilot.press("minus")                            # back to the candidates
        assert app.screen.query_one("#choices").items == picks.items


async def test_count_over_a_length_and_back_key_keeps_what_was_typed(make_app):
    app = make_app(start_screen="thread")
    async with app.run_test(size=(80, 24)) as pilot:
        await open_screen(app, pilot)
        await pick(pilot, app, "bolt (external), diameters in mm")
        await type_in(pilot, "9.95")
        await pick(pilot, app, "count crests")
        entry = app.screen.query_one("#number")
        await type_in(pilot, "1")                  # 1 crest spans no pitch: refused in place
        assert "Count at least 2 crests" in screen_text(app)
        assert entry.value == "1"                  # nothing typed is lost
        await pilot.press("backspace", "1", "1", "enter")
        await type_in(pilot, "15")                 # 11 crests over 15 mm
        assert "11 crests over 15.000 mm" in screen_text(app)
        await pilot.press("minus")                 # step back: the length comes back typed
        assert "Length from the first to the last crest" in screen_text(app)
        assert entry.value == "15"
        await pilot.press("enter")
        await pick(pilot, app, "60°")
        await pick(pilot, app, "show the candidates")
        first = app.screen.query_one("#choices").items[0][0]
        # computed from pitch = length / (count − 1) = 15 / 10 = 1.5 mm: ISO 261 M10 coarse
        assert 15 / (11 - 1) == 1.5 and first.startswith("M10x1.5 ")


@pytest.mark.parametrize("typed, says", [
    ("0", "must be greater than zero"),        # units.parse_positive_length's message
    ("9..5", "a number such as"),              # units.EXPECTED, what a number looks like
])
async def test_bad_diameter_is_refused_in_place(make_app, typed, says):
    app = make_app(start_screen="thread")
    async with app.run_test(size=(80, 24)) as pilot:
        await open_screen(app, pilot)
        await pick(pilot, app, "bolt (external), diameters in mm")
        await type_in(pilot, typed)
        text = screen_text(app)
        assert says in text
        assert "Major diameter of the bolt" in text          # still asking the same question
        assert app.screen.query_one("#number").value == typed


async def test_nothing_measured_is_refused_and_an_answer_can_be_changed(make_app):
    app = make_app(start_screen="thread")
    async with app.run_test(size=(80, 24)) as pilot:
        await open_screen(app, pilot)
        await pick(pilot, app, "bolt (external), diameters in mm")
        await pilot.press("enter")                           # diameter not measured
        await pick(pilot, app, "not measured")
        await pick(pilot, app, "not gauged")
        await pick(pilot, app, "show the candidates")
        text = screen_text(app)
        assert "Measure something first" in text             # identify.measured's message
        assert "Readings over wires" in text                 # stayed on the last question
        assert app.spec is None


async def test_a_worn_nut_by_its_minor_diameter(make_app):
    app = make_app(start_screen="thread")
    async with app.run_test(size=(80, 24)) as pilot:
        await open_screen(app, pilot)
        await pick(pilot, app, "nut (internal), diameters in mm")
        # ISO 965-2, M10x1.5-6H D1 8.376–8.676: a bore of 8.5 sits inside it
        await type_in(pilot, "8.5")
        await pick(pilot, app, "gauge in mm")
        await type_in(pilot, "1.5")
        await pick(pilot, app, "60°")                        # no wires question for a nut
        first = app.screen.query_one("#choices").items[0][0]
        assert first.startswith("M10x1.5 ")
        await pilot.press("1", "enter")
        assert app.spec.designation == "M10x1.5-6H"          # ISO 965-1: 6H the usual nut class
        assert app.spec.kind == "internal"


async def test_cut_a_nut_to_fit_a_sample_bolt_measured_over_wires(make_app):
    app = make_app(start_screen="thread")
    async with app.run_test(size=(80, 24)) as pilot:
        await open_screen(app, pilot)
        # The sample bolt: M10x1.5, pitch diameter E = 8.94 (inside ISO 965-2 6g d2
        # 8.862–8.994), read over 0.866 mm wires (the sample config's metric set for 1.5 mm).
        e, w, p = 8.94, 0.866, 1.5
        # computed from M = E + 3W − 0.866025 P, the 60° three-wire relation with the lead
        # angle neglected (NBS H28); the screen's exact model differs by the lead-angle term
        m = round(e + 3 * w - 0.866025 * p, 3)
        await measure_bolt(pilot, app, "9.95", "gauge in mm", "1.5", angle="60°")
        await pick(pilot, app, "add a reading over wires")
        await pick(pilot, app, "0.866 mm")
        await type_in(pilot, f"{m}")
        assert f"{m:.3f} mm over 0.866 mm" in screen_text(app)
        await pick(pilot, app, "show the candidates")
        await pilot.press("1")                               # M10x1.5
        await pick(pilot, app, "a nut to fit the sample bolt")
        await pick(pilot, app, "measure it over wires")
        await pick(pilot, app, "0.866 mm")
        entry = app.screen.query_one("#number")
        assert entry.value == f"{m}"                         # the reading already taken is offered
        await pilot.press("enter")
        await pilot.press("enter")                           # the usual clearance
        text = screen_text(app)
        assert "Target from the sample" in text
        target = app.screen.target
        # H28 lead-angle term for 60°, W 0.866, λ ≈ 3°: about 0.002 mm (NBS H28) — within 0.005
        assert abs(target.sample_pd - e) < 0.005
        # fit_sample: D2 min = E + clearance, D2 max = D2 min + band; defaults 0.05 and 0.05
        # (common practice, no source)
        assert target.pd_min == pytest.approx(target.sample_pd + 0.05, abs=1e-6)
        assert target.pd_max == pytest.approx(target.pd_min + 0.05, abs=1e-6)
        assert f"{target.pd_min:.3f} mm to {target.pd_max:.3f} mm" in text
        assert missing_glyphs(text) == set()
        await pilot.press("1")                               # use this target
        assert app.current_name == "setup"
        assert app.spec.kind == "internal" and app.spec.family == "special"
        lim = limits(app.spec)
        assert lim.pd_min == pytest.approx(target.pd_min, abs=1e-6)
        chosen = app.state.thread.values
        assert chosen["target_source"] == "sample"
        assert chosen["sample_pd_mm"] == pytest.approx(target.sample_pd)
        assert chosen["sample_wire_mm"] == pytest.approx(w)
        assert chosen["reference"].startswith("M10x1.5")


async def test_bolt_to_fit_a_nut_from_a_known_pitch_diameter_and_clearance_errors(make_app):
    app = make_app(start_screen="thread")
    async with app.run_test(size=(80, 24)) as pilot:
        await open_screen(app, pilot)
        await measure_bolt(pilot, app, "9.95", "gauge in mm", "1.5", angle="60°")
        await pick(pilot, app, "show the candidates")
        await pilot.press("1")
        await pick(pilot, app, "a bolt to fit the nut")
        await pick(pilot, app, "I know it")
        await type_in(pilot, "8.95")
        assert "Fit clearance" in screen_text(app)
        await pilot.press("minus")                           # `-` steps back …
        assert "The sample bolt's pitch diameter" in screen_text(app)
        assert app.screen.query_one("#number").value == "8.95"      # … and keeps the text
        await pilot.press("enter")
        await type_in(pilot, ".02")                          # clearance 0.02 mm
        target = app.screen.target
        # fit_sample: d2 max = E − clearance, d2 min = d2 max − band (0.05, common practice)
        assert target.pd_max == pytest.approx(8.95 - 0.02, abs=1e-9)
        assert target.pd_min == pytest.approx(8.95 - 0.02 - 0.05, abs=1e-9)
        await pick(pilot, app, "change the clearance")
        assert app.screen.query_one("#number").value == ".02"
        await pilot.press("backspace", "backspace", "backspace", "enter")
        target = app.screen.target
        assert target.pd_max == pytest.approx(8.95)          # bolt default clearance 0 (fit_sample)
        await pilot.press("plus")                            # + uses the target too
        assert app.spec.kind == "external" and app.current_name == "setup"
        assert math.isclose(limits(app.spec).pd_max, 8.95, abs_tol=1e-6)


async def test_fits_at_100x30_with_more_room_for_reasons(make_app):
    app = make_app(start_screen="thread")
    async with app.run_test(size=(100, 30)) as pilot:
        await open_screen(app, pilot)
        await measure_bolt(pilot, app, "5.98", "not measured", angle="60°")
        await pick(pilot, app, "show the candidates")
        lines = screen_lines(app)
        assert len(lines) == 30
        text = "\n".join(lines)
        assert "To tell" in text and "menu" in lines[-1]     # key bar still on the last line


async def test_sample_wire_and_reading_mistakes_are_refused_in_place(make_app):
    app = make_app(start_screen="thread")
    async with app.run_test(size=(80, 24)) as pilot:
        await open_screen(app, pilot)
        await measure_bolt(pilot, app, "9.95", "gauge in mm", "1.5", angle="60°")
        await pick(pilot, app, "show the candidates")
        await pilot.press("1")
        await pick(pilot, app, "a nut to fit the sample bolt")
        await pick(pilot, app, "measure it over wires")
        await pick(pilot, app, "another size: type it")
        entry = app.screen.query_one("#number")
        await type_in(pilot, ".3")
        # NBS H28 / the smallest wire for 60°, P 1.5 is 0.505 P = 0.758 mm
        assert "too small" in screen_text(app) and entry.value == ".3"
        await pilot.press("backspace", "8", "6", "6", "enter")      # ".866"
        assert "Reading over the 0.866 mm wires on the sample bolt" in screen_text(app)
        await type_in(pilot, "0.403")                        # an inch reading typed as mm
        text = " ".join(screen_text(app).split())
        assert "inches taken as mm" in text and "converted to mm" in text
        assert entry.value == "0.403"
        await pilot.press("i", "n", "enter")                 # the unit typed after it
        assert "Fit clearance" in screen_text(app)
        await pilot.press("enter")
        # 0.403 in = 10.2362 mm exactly (1 in = 25.4 mm); the sample's reading as recorded
        assert app.screen.target.reading.over_wires == pytest.approx(0.403 * 25.4)


# ---- the measurements added for power and pipe threads -------------------------------------------

async def pipe_fitting(pilot, app) -> None:
    """A 1/2 in pipe fitting: 21 mm over the crests, 14 tpi from a gauge, angle not gauged."""
    # 1/2 in pipe is 14 tpi at about 21 mm (common practice, no source); ISO 7-1 R1/2 and
    # ISO 228-1 G1/2 major 20.955 mm, ASME B1.20.1 1/2-14 NPT OD 0.840 in (from memory)
    await measure_bolt(pilot, app, "21", "gauge in tpi", "14", angle="not gauged")
    await pick(pilot, app, "show the candidates")


async def test_a_pipe_fitting_offers_r_npt_and_g_with_the_taper_as_the_telling_measurement(
        make_app):
    app = make_app(start_screen="thread")
    async with app.run_test(size=(80, 24)) as pilot:
        await open_screen(app, pilot)
        await pipe_fitting(pilot, app)
        picks = app.screen.query_one("#choices")
        labels = [label for label, _ in picks.items]
        names = [label.split()[0] for label in labels]
        assert names[:3] == ["R1/2", "1/2-14", "G1/2"]
        # the first measurement offered is the taper, and its how is shown in full
        asks = [label for label in labels if label.startswith("→")]
        assert asks[0] == "→ measure the taper (tapered or parallel?)"
        text = " ".join(screen_text(app).split())
        assert "To tell them apart: • measure the crest diameter with calipers at two places" \
            in text
        # ISO 7-1 / ASME B1.20.1: taper 1 in 16 on diameter; over 10 mm: 10/16 = 0.625
        # (computed from the standards' taper)
        assert f"they differ by {10 / 16:.3f} mm" in text
        lines = screen_lines(app)
        assert len(lines) == 24 and max(len(ln) for ln in lines) <= 80
        assert missing_glyphs("\n".join(lines)) == set()


@pytest.mark.parametrize("second, first_two", [
    # tapered: 1 in 16 over 10 mm = 0.625 mm smaller (ISO 7-1, ASME B1.20.1; computed)
    ("20.375", {"R1/2", "1/2-14 NPT"}),
    # parallel: the same diameter 10 mm along (ISO 228-1 G is a parallel thread)
    ("21", {"G1/2 external"}),
])
async def test_the_taper_entered_from_the_candidates_puts_the_right_pipe_thread_first(
        make_app, second, first_two):
    app = make_app(start_screen="thread")
    async with app.run_test(size=(80, 24)) as pilot:
        await open_screen(app, pilot)
        await pipe_fitting(pilot, app)
        await pick(pilot, app, "measure the taper")
        assert "Taper: the crest diameter at one place" in screen_text(app)
        await type_in(pilot, "21")
        await type_in(pilot, second)
        assert "how far apart the two places are" in screen_text(app)
        await pilot.press("minus")                            # back: the second is kept
        assert app.screen.query_one("#number").value == second
        await pilot.press("enter")
        await type_in(pilot, "10")
        text = screen_text(app)
        assert f"taper 21.000 to {float(second):.3f} mm over 10.000 mm" in " ".join(text.split())
        items = app.screen.query_one("#choices").items
        top = {app.screen.result.candidates[i].designation for _, i in items[:len(first_two)]}
        assert top == first_two
        assert not any("measure the taper" in label for label, _ in items)   # taken now
        assert missing_glyphs(text) == set()


async def test_a_worn_leadscrew_gets_its_note_and_the_power_thread_gauges(make_app):
    app = make_app(start_screen="thread")
    async with app.run_test(size=(80, 24)) as pilot:
        await open_screen(app, pilot)
        await measure_bolt(pilot, app, "23.3", "gauge in mm", "5", angle="30° (trapezoidal)")
        await pilot.press("minus")                            # back to the angle: all gauges
        labels = [label for label, _ in app.screen.query_one("#choices").items]
        assert [label.split()[0] for label in labels] == \
            ["60°", "55°", "47.5°", "not", "30°", "29°", "0°:"]
        await pick(pilot, app, "30° (trapezoidal)")
        await pick(pilot, app, "show the candidates")
        # ISO 2904 Tr24x5: d = 24, 7e major min 23.665 (from memory): 23.3 is 0.365 under it,
        # worn crests with an exact pitch: a worn leadscrew
        first = app.screen.query_one("#choices").items[0][0]
        assert first.startswith("Tr24x5 ")
        text = " ".join(screen_text(app).split())
        assert "Tr24x5 looks like a worn leadscrew or screw" in text
        assert "before cutting its mate." in text                # the whole note on screen
        assert len(screen_lines(app)) == 24


async def test_the_crest_flat_tells_a_trapezoidal_thread_from_a_metric_one(make_app):
    app = make_app(start_screen="thread")
    async with app.run_test(size=(80, 24)) as pilot:
        await open_screen(app, pilot)
        # 23.95 over the crests, 3 mm pitch: M24x3 (ISO 261) and Tr24x3 (ISO 2902) both fit
        await measure_bolt(pilot, app, "23.95", "gauge in mm", "3", angle="not gauged")
        await pick(pilot, app, "show the candidates")
        names = [label.split()[0] for label, _ in app.screen.query_one("#choices").items]
        assert {"M24x3", "Tr24x3"} <= set(names[:2])
        await pick(pilot, app, "measure the crest flat")
        assert "Width of the flat on a crest" in screen_text(app)
        await type_in(pilot, ".")                             # a keypad slip: refused in place
        assert "a number such as" in screen_text(app)          # units.EXPECTED
        assert "Width of the flat on a crest" in screen_text(app)
        await pilot.press("backspace")
        # ISO 2904: crest flat 0.366 P = 1.098 mm at P 3; ISO 68-1: P/8 = 0.375 (computed)
        await type_in(pilot, "1.1")
        first = app.screen.query_one("#choices").items[0][0]
        assert first.startswith("Tr24x3 ")
        assert "crest flat 1.100 mm" in " ".join(screen_text(app).split())


async def test_crest_flat_and_taper_from_the_more_measurements_question(make_app):
    app = make_app(start_screen="thread")
    async with app.run_test(size=(80, 24)) as pilot:
        await open_screen(app, pilot)
        await measure_bolt(pilot, app, "21", "gauge in tpi", "14", angle="55°")
        await pick(pilot, app, "the crest flat")
        await type_in(pilot, "0")                             # a rounded crest
        assert "Readings over wires, crest flat, taper" in screen_text(app)   # back to it
        await pick(pilot, app, "the taper")
        await type_in(pilot, "20.9")
        await type_in(pilot, "20.9")
        await type_in(pilot, "12")
        await pick(pilot, app, "show the candidates")
        # parallel, 55°, rounded crest: ISO 228-1 G1/2 (BS 84 Whitworth form, rounded crests)
        first = app.screen.query_one("#choices").items[0][0]
        assert first.startswith("G1/2")
        values = app.screen.measurements()
        assert values["taper"] == (20.9, 20.9, 12.0) and values["crest_flat"] == 0.0
