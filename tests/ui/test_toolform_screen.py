"""The tool-form screen at 80x24: profiles, interference, root rule, changing the tip."""

import re

import pytest

from shopterm.cutting.tool import BOLT, NUT
from shopterm.standards import parse
from tests.glyphs import missing_glyphs
from tests.ui.conftest import screen_lines, screen_text

pytestmark = pytest.mark.asyncio


async def open_toolform(app, pilot, designation="M10x1.5-6g"):
    app.thread_chosen(parse(designation))
    app.goto("toolform")
    await pilot.pause()


async def test_profiles_and_root_rule_then_change_tip(make_app):
    app = make_app(start_screen="thread")
    async with app.run_test(size=(80, 24)) as pilot:
        await open_toolform(app, pilot)
        text = screen_text(app)
        assert BOLT in text and NUT in text
        # ISO 965-1: 6g root radius at least 0.125P = 0.1875 mm; the config tip is 0.004 in
        assert "at least 0.0074 in" in text and "verdict: FAILS" in text
        assert "0.102 mm" in text                        # 0.004 in × 25.4 (NIST SP 811)
        lines = screen_lines(app)
        assert len(lines) == 24 and "help" in lines[-1]  # key bar on the last line
        await pilot.press("1", "0", "full_stop", "0", "0", "8", "enter")   # 0.008 in
        text = screen_text(app)
        assert "0.203 mm" in text and "verdict: OK" in text
        assert app.setup_values()["tool_size_mm"] == pytest.approx(0.008 * 25.4)
        await pilot.press("minus")
        # back to the cut: nothing is prepared yet, so the counter sends it to the preparation
        assert app.current_name == "prepare"


async def test_bad_size_kept_and_flat_toggle(make_app):
    app = make_app(start_screen="thread")
    async with app.run_test(size=(80, 24)) as pilot:
        await open_toolform(app, pilot)
        await pilot.press("1", "1", "enter")             # a 1 in radius cannot reach the PD
        text = screen_text(app)
        assert "too big" in text
        assert app.screen.query_one("#tf-size").value == "1"
        await pilot.press("minus")                       # cancel: nothing changed
        assert "Not changed" in screen_text(app)
        await pilot.press("2")                           # flat tip: 6g needs a rounded root
        assert app.setup_values()["tool_kind"] == "flat"
        assert "needs a rounded root" in screen_text(app)


async def test_interference_marked_for_a_big_radius(make_app):
    app = make_app(start_screen="thread")
    async with app.run_test(size=(100, 30)) as pilot:
        await open_toolform(app, pilot)
        # 0.016 in = 0.406 mm radius on 1.5 mm pitch, far above H/6 = 0.2165 mm (ISO 68-1):
        # the root climbs into the nut's crest at its minimum minor
        await pilot.press("1", "0", "full_stop", "0", "1", "6", "enter")
        text = screen_text(app)
        assert "Interference" in text and "█" in text
        assert not missing_glyphs(text)                  # console fonts draw every glyph
        shown = re.search(r"largest clearing radius ([0-9.]+) in", text).group(1)
        # inverse path: a tip a little under the largest clearing radius shown must clear
        smaller = f"{float(shown) - 0.0001:.4f}"
        await pilot.press("1", *[("full_stop" if c == "." else c) for c in smaller], "enter")
        text = screen_text(app)
        assert "Interference" not in text and "Clear by" in text


@pytest.fixture
def power_family(monkeypatch):
    """Hand-made trapezoidal/Acme threads in the registry until their families land."""
    from tests.core import power_threads
    power_threads.register(monkeypatch)
    return power_threads


async def test_power_thread_side_clearances_beside_the_picture(make_app, power_family):
    app = make_app(start_screen="thread")
    async with app.run_test(size=(80, 24)) as pilot:
        spec = power_family.tr(24, 5, starts=2).spec            # Tr24x10(P5)
        app.thread_chosen(spec)
        app.goto("toolform")
        await pilot.pause()
        # the config's tip is a radius: refused with the reason and the keys to change it
        assert "flat root" in screen_text(app) and "Press 2 for a flat tip" in screen_text(app)
        await pilot.press("2")
        # 0.0667 in = 1.694 mm (the display is in inches), just under the ISO 2904 root width
        await pilot.press("1", "0", "full_stop", "0", "6", "6", "7", "enter")
        text = screen_text(app)
        lines = screen_lines(app)
        assert len(lines) == 24 and not missing_glyphs(text)
        # computed: helix atan(10 / (π·18.5)) = 9.76° at d3 (ISO 2904), + 3° working clearance
        assert "minor 9.76°" in text and "clearance 12.8°" in text
        assert "Root flat: standard" in text and "verdict: OK" in text
        assert "flat 0.0667 in" in text
        # a flat wider than the groove at d3 is refused with the reason, the entry kept
        await pilot.press("1", "0", "full_stop", "0", "9", "8", "4", "enter")   # 2.5 mm
        assert "wider than the groove" in screen_text(app)
        assert app.screen.query_one("#tf-size").value == "0.0984"
