"""With the console theme every screen at 80x24 draws only glyphs the Linux console fonts have.

Every screen in ``shopterm.ui.screens.REGISTRY`` that imports is rendered (a screen still being
written is skipped with the reason), plus the menu, help and yes/no modals and the toasts. The
screen text includes borders, the status line and the key bar. The font lists are derived from
the Debian console fonts (tests/glyphs.py; Lat15-Fixed16 and Uni2-Fixed16, their intersection).

References: the Unicode tables of Debian console-setup-linux's Lat15-Fixed16 and Uni2-Fixed16
(tests/data/console_glyphs_*.txt).
"""

from __future__ import annotations

import dataclasses
import importlib

import pytest

from shopterm.cutting.cut_state import default_draft, prepared_setup
from shopterm.standards import limits, parse
from shopterm.ui.screens import REGISTRY
from shopterm.ui.themes import CONSOLE_CSS, CONSOLE_THEME
from tests.glyphs import console_glyphs, missing_glyphs
from tests.ui.conftest import screen_lines

#: Threads a screen is shown with: one metric, one inch (their limits print differently).
THREADS = ("M10x1.5-6g", "1/4-20 UNC-2A")
INTERNAL = {"M10x1.5-6g": "M10x1.5-6H", "1/4-20 UNC-2A": "1/4-20 UNC-2B"}


@pytest.fixture
def sample_config(sample_config):
    """The sample config with the console theme (overrides tests/ui/conftest.py's fixture)."""
    return dataclasses.replace(sample_config,
                               shop=dataclasses.replace(sample_config.shop, theme=CONSOLE_THEME))


def _screen_or_skip(name: str):
    module, cls_name, _title = REGISTRY[name]
    try:
        return getattr(importlib.import_module(module), cls_name)
    except ModuleNotFoundError as exc:
        if exc.name == module:
            pytest.skip(f"screen '{name}' ({module}) is not written yet")
        raise
    except AttributeError:
        pytest.skip(f"screen '{name}': {module} has no class {cls_name} yet")


def _report(where: str, lines: list[str]) -> str:
    bad = missing_glyphs("\n".join(lines))
    rows = [f"{i:2} {ln}" for i, ln in enumerate(lines) if set(ln) & bad]
    return (f"{where}: glyphs the console fonts lack: "
            + ", ".join(f"U+{ord(c):04X} {c!r}" for c in sorted(bad)) + "\n" + "\n".join(rows))


def test_the_glyph_check_itself_flags_a_known_missing_glyph():
    # the console fonts (tests/data/console_glyphs_*.txt) lack U+258C (left half block), have the box drawing set
    assert missing_glyphs("│─╭╮▌") == {"▌"}   # console-setup-linux fonts lack ▌
    assert "│" in console_glyphs() and "█" in console_glyphs()   # same source


@pytest.mark.parametrize("thread", THREADS)
@pytest.mark.parametrize("name", list(REGISTRY))
async def test_every_screen_draws_console_glyphs_only(make_app, name, thread):
    _screen_or_skip(name)
    app = make_app(start_screen="thread")
    async with app.run_test(size=(80, 24)) as pilot:
        assert app.theme == CONSOLE_THEME
        assert app.thread_chosen(parse(thread))
        if app.route(name) != name:
            # a screen of a later stage (the counter, the pick-up): prepare the cut first, on
            # a blank at the largest major diameter # ISO 965-2 / ASME B1.1 d max via limits()
            spec = parse(thread)
            values = {**default_draft(app.shop.tool, {}), "blank_od_mm": limits(spec).major_max}
            assert app.record_setup(prepared_setup(spec, app.lathe, values)) is not None
        if app.route(name) != name:
            # a screen for internal threads (the fit check): the nut of the same size
            assert app.thread_chosen(parse(INTERNAL[thread]))
        app.goto(name)
        await pilot.pause()
        assert app.current_name == name, f"screen '{name}' did not open"
        lines = screen_lines(app)
        assert len(lines) == 24
        print("\n".join(lines))
        assert missing_glyphs("\n".join(lines)) == set(), _report(f"{name} with {thread}", lines)


@pytest.mark.parametrize("typed", ["M10x1.5-6g", "1/4-20 UNC-2A", "2BA", "1/4 BSW"])
async def test_thread_result_with_limits_table_draws_console_glyphs_only(make_app, typed):
    app = make_app(start_screen="thread")
    async with app.run_test(size=(80, 24)) as pilot:
        await pilot.press("tab")                  # the designation field (a letter also works)
        await pilot.press(*("space" if ch == " " else ch for ch in typed), "ctrl+j")
        await pilot.pause()
        lines = screen_lines(app)
        text = "\n".join(lines)
        print(text)
        assert "pitch diameter" in text, text    # the limits table is on screen
        assert missing_glyphs(text) == set(), _report(f"thread result {typed}", lines)


async def test_menu_help_and_question_draw_console_glyphs_only(make_app):
    from shopterm.ui.screens.help import help_text
    from shopterm.ui.screens.menu import ConfirmScreen

    app = make_app(start_screen="thread")
    async with app.run_test(size=(80, 24)) as pilot:
        await pilot.press("asterisk")
        lines = screen_lines(app)
        assert "Go to" in "\n".join(lines)
        assert missing_glyphs("\n".join(lines)) == set(), _report("menu", lines)
        await pilot.press("minus")
        await pilot.press("f1")
        lines = screen_lines(app)
        assert "Keys everywhere" in "\n".join(lines)
        assert missing_glyphs("\n".join(lines)) == set(), _report("help", lines)
        # the whole help, not just the part on screen
        assert missing_glyphs(help_text().plain) == set(), _report("help text",
                                                                   help_text().plain.split("\n"))
        await pilot.press("minus")
        app.push_screen(ConfirmScreen("Undo pass 3 (radial 0.120 mm in all)?"))
        await pilot.pause()
        lines = screen_lines(app)
        assert "Undo pass 3" in "\n".join(lines)
        assert missing_glyphs("\n".join(lines)) == set(), _report("question", lines)


@pytest.mark.parametrize("severity", ["information", "warning", "error"])
async def test_toasts_draw_console_glyphs_only(make_app, severity):
    app = make_app(start_screen="thread")
    async with app.run_test(size=(80, 24), notifications=True) as pilot:
        app.notify("Chuck key out before starting the spindle.", severity=severity, timeout=30)
        await pilot.pause(0.2)
        lines = screen_lines(app)
        text = "\n".join(lines)
        print(text)
        assert "Chuck key out" in text
        assert missing_glyphs(text) == set(), _report(f"toast ({severity})", lines)


async def test_toast_check_sees_textuals_own_toast_edge():
    """Without CONSOLE_CSS a toast has Textual's 'outer' left edge: the check must catch it."""
    from textual.app import App

    from shopterm.ui.themes import apply_theme

    class Plain(App):
        pass

    app = Plain()
    async with app.run_test(size=(80, 24), notifications=True) as pilot:
        assert apply_theme(app, CONSOLE_THEME) is None
        app.notify("Chuck key out before starting the spindle.", severity="warning", timeout=30)
        await pilot.pause(0.2)
        text = "\n".join(screen_lines(app))
        assert "Chuck key out" in text
        # U+258C is the 'outer' border's left edge # textual 8.2.8 _border.py BORDER_CHARS
        assert "\u258c" in missing_glyphs(text)
