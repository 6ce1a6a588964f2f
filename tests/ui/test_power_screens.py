"""Power threads on the cut's screens at 80x24, keypad keys only: the preparation starts from
the standard's flat tip and shows the helix and side clearances (or why the tool is refused),
the counter shows the compound's side shift of an alternating-flank pass, and a thread no owned
wire fits is measured with a gear-tooth caliper.

The sample config's demo lathe: display in inches, dials 0.001 in a division on radius, 100
divisions; tool: nose radius 0.004 in, side clearance 15°; no wire set fits 5 mm or 5 tpi
power threads.
"""

import dataclasses
import math

import pytest

from shopterm.standards import parse
from tests.glyphs import missing_glyphs
from tests.ui.conftest import screen_lines, screen_text
from tests.ui.test_snapshots import scrolled_out

pytestmark = pytest.mark.asyncio

IN = 25.4                           # NIST SP 811: 1 in = 25.4 mm exactly


def fits(app) -> None:
    """The screen fits 80x24 with nothing to scroll and only console glyphs."""
    lines = screen_lines(app)
    assert len(lines) == 24 and all(len(ln) <= 80 for ln in lines)
    assert scrolled_out(app) == []
    assert missing_glyphs("\n".join(lines)) == set()


async def to_prepare(app, pilot, designation):
    app.thread_chosen(parse(designation))
    app.goto("counter")                 # routes to the preparation until it is confirmed
    await pilot.pause()


async def typed(pilot, text):
    await pilot.press(*[("full_stop" if c == "." else c) for c in text])


def with_shop(sample_config, **changes):
    return dataclasses.replace(sample_config,
                               shop=dataclasses.replace(sample_config.shop, **changes))


async def test_prepare_defaults_to_the_standard_flat_and_shows_the_helix(make_app, sample_config):
    app = make_app(start_screen="thread")
    async with app.run_test(size=(80, 24)) as pilot:
        await to_prepare(app, pilot, "Tr24x10(P5)-7e")
        text = screen_text(app)
        # ISO 2904 root width at d3 for P 5 (ac 0.25): P/2 − 2(h3 − P/4)·tan 15°
        # = 2.5 − 2 × 1.5 × 0.267949 = 1.696 mm = 0.0668 in (computed from the ISO 2904 profile)
        flat = 2.5 - 2 * 1.5 * math.tan(math.radians(15))
        assert f"2 tip flat  3 flat width {flat / IN:.4f} in (standard for Tr24x10(P5)-7e)" \
            in text
        # helix at d3 = d − 2h3 = 18.5 mm: atan(10/(π·18.5)) = 9.8°; the leading side needs it
        # plus 3° working clearance (side clearance rule, Machinery's Handbook, from memory)
        root = math.degrees(math.atan(10 / (math.pi * 18.5)))
        assert f"Helix {root:.1f}° minor" in text and f"leading {root + 3:.1f}°" in text
        fits(app)
        await typed(pilot, ".941")
        await pilot.press("enter")
        text = screen_text(app)
        # the plan sized by the groove's area: about 20 passes, not the 145 of a sharp V
        passes = int(text.split("6 passes ")[1].split()[0])
        assert 12 <= passes <= 30, text
        assert app.state.setups == ()           # nothing recorded before Enter
        await pilot.press("enter")
        values = app.setup_values()
        assert values["tool_kind"] == "flat"
        assert values["tool_size_mm"] == pytest.approx(flat, abs=1e-3)


async def test_a_nose_radius_on_a_power_thread_is_refused_with_the_key_to_press(make_app):
    app = make_app(start_screen="thread")
    async with app.run_test(size=(80, 24)) as pilot:
        await to_prepare(app, pilot, "1-5 ACME-2G")
        await typed(pilot, ".995")
        await pilot.press("enter")                   # the OD (its entry has the digits first)
        await pilot.press("2")                       # to the config's nose radius
        text = screen_text(app)
        assert "2 tip radius" in text and "Tool refused" in text
        assert "press 2 for a flat tip" in text
        await pilot.press("2")                       # back to a flat: the standard's again
        text = screen_text(app)
        assert "Tool refused" not in text and "(standard for 1-5 ACME-2G)" in text


async def test_a_lead_too_steep_for_the_tool_says_why(make_app, sample_config, tmp_path):
    from shopterm.ui.app import ShoptermApp
    config = with_shop(sample_config, tool_side_clearance_deg=10.0)
    app = ShoptermApp(config, data_dir=tmp_path / "data", start_screen="thread")
    async with app.run_test(size=(80, 24)) as pilot:
        await to_prepare(app, pilot, "Tr24x10(P5)-7e")
        text = screen_text(app)
        # 9.8° helix at d3 + 3° working clearance > the 10° the tool has
        assert "Tool refused: The lead is too steep for this tool" in text


async def test_alternating_flank_passes_show_the_side_shift(make_app):
    app = make_app(start_screen="thread")
    async with app.run_test(size=(80, 24)) as pilot:
        await to_prepare(app, pilot, "Tr24x10(P5)-7e")
        await typed(pilot, ".941")
        await pilot.press("enter", "4")
        await pilot.pause()
        text = screen_text(app)
        digit = next(ln.split("alternating")[0].split()[-1] for ln in text.splitlines()
                     if "alternating" in ln)
        await pilot.press(digit)                     # the alternating-flank method
        await pilot.press("enter")                   # confirm: the counter shows pass 1
        await pilot.pause()
        sides = []
        for n in (1, 2, 3):
            text = screen_text(app)
            line = next(ln for ln in text.splitlines() if "COMPOUND: shift" in ln)
            side = "right" if "shift right" in line else "left"
            mark = float(line.split("to mark ")[1].split()[0])
            # the mark on a 100-division dial; 0.001 in a division (sample config)
            count = mark if mark < 50 else mark - 100
            offset = line.split("(")[1].split(" in ")[0]
            assert float(offset) == pytest.approx(abs(count) * 0.001, abs=5e-5), line
            assert f"shift the compound {side} to {mark:g}" in " ".join(text.split())
            fits(app)
            sides.append(side)
            await pilot.press("enter")
            await pilot.pause()
        # the shifts alternate, pass by pass (the plan starts to the right)
        assert sides == ["right", "left", "right"]
        assert len(app.state.passes) == 3
        assert {p.payload["side"] for p in app.state.passes} == {"left", "right"}
        # measured now (no owned wire fits 5 mm pitch: the caliper): the alternating cut feeds
        # on the cross-slide; its compound, parallel to the bed, is no feed angle
        await pilot.press("plus")
        await pilot.pause()
        await typed(pilot, ".1")
        await pilot.press("enter")
        text = screen_text(app)
        assert len(app.state.readings) == 1, text
        assert "divisions more on the cross-slide" in text and "Oversize by" in text
        fits(app)


async def test_no_wire_fits_so_the_caliper_takes_the_reading(make_app):
    app = make_app(start_screen="thread")
    async with app.run_test(size=(80, 24)) as pilot:
        await to_prepare(app, pilot, "1-5 ACME-2G")
        await typed(pilot, ".995")
        await pilot.press("enter", "enter")          # the OD; confirm the preparation
        await pilot.press("plus")                    # to measure: no wire fits 5 tpi Acme
        await pilot.pause()
        text = screen_text(app)
        assert app.screen.SCREEN_NAME == "caliper", text
        # depth slide from the measured crest to the basic pitch line: (0.995 − 0.9)/2
        # (ASME B1.5: basic PD = D − P/2 = 0.9 in, from memory)
        assert "Depth slide 0.0475 in from the crest (blank 0.9950 in)" in text
        await typed(pilot, ".5")                     # a slip: half an inch thick
        await pilot.press("enter")
        text = screen_text(app)
        assert "check the reading" in text and app.state.readings == ()
        await pilot.press("backspace", "backspace")
        await typed(pilot, ".095")
        await pilot.press("enter")
        text = screen_text(app)
        assert "In the band: stop." in text, text
        fits(app)
        r = app.state.readings[-1]
        assert r.payload["method"] == "caliper" and r.wire_mm is None
        assert r.measured_mm == pytest.approx(0.095 * IN)
        # thickness t square to the thread at the basic pitch line: E = 0.9 − (P/2 − t/cos λ)
        # / tan 14.5°, λ = atan(L/(π E)) (Machinery's Handbook, Acme thread thickness, from
        # memory; solved here by repeated substitution)
        e = 0.9
        for _ in range(20):
            lam = math.atan(0.2 / (math.pi * e))
            e = 0.9 - (0.1 - 0.095 / math.cos(lam)) / math.tan(math.radians(14.5))
        assert r.pd_mm == pytest.approx(e * IN, abs=1e-6)
        # ASME B1.5 1-5 ACME-2G PD 0.8726 to 0.8920 in (from memory)
        assert 0.8726 * IN <= r.pd_mm <= 0.8920 * IN
        await pilot.press("enter")                   # an empty entry: choose wires instead
        await pilot.pause()
        text = screen_text(app)
        assert app.screen.SCREEN_NAME == "wirechoice"
        assert "gear-tooth caliper (thickness at the pitch line)" in text
