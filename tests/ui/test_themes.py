"""Theme files: the shipped ones load and read well, broken files are reported and skipped,
and a tiny app falls back to the default theme."""

from __future__ import annotations

import html
import re
import sys
from pathlib import Path

import pytest
from textual.app import App, ComposeResult
from textual.containers import VerticalScroll
from textual.widgets import Footer, Input, Label, Static

from shopterm.resources import bundled_themes_dir
from shopterm.ui.themes import (CONSOLE_CSS, CONSOLE_THEME, DEFAULT_THEME, apply_theme,
                                load_theme_file, load_themes, theme_dirs, theme_for_terminal,
                                use_console_glyphs)

sys.path.insert(0, str(Path(__file__).resolve().parents[2]))
from tests.glyphs import missing_glyphs  # noqa: E402

SHIPPED = ("shop-bright", "shop-dark", "shop-console")


@pytest.fixture(autouse=True)
def no_user_themes(monkeypatch, tmp_path):
    """Keep the tester's own ~/.config themes out of these tests."""
    monkeypatch.setenv("XDG_CONFIG_HOME", str(tmp_path / "xdg"))


def _luminance(hex_colour: str) -> float:
    """Relative luminance. # computed from WCAG 2.1, definition of relative luminance"""
    def channel(c: int) -> float:
        s = c / 255
        return s / 12.92 if s <= 0.04045 else ((s + 0.055) / 1.055) ** 2.4
    r, g, b = (int(hex_colour[i:i + 2], 16) for i in (1, 3, 5))
    return 0.2126 * channel(r) + 0.7152 * channel(g) + 0.0722 * channel(b)


def _contrast(a: str, b: str) -> float:
    """Contrast ratio. # computed from WCAG 2.1, definition of contrast ratio"""
    la, lb = sorted((_luminance(a), _luminance(b)), reverse=True)
    return (la + 0.05) / (lb + 0.05)


def test_contrast_formula_on_known_pair():
    # black on white is 21:1 # WCAG 2.1, contrast ratio range 1:1 to 21:1
    assert _contrast("#000000", "#ffffff") == pytest.approx(21.0)


def test_shipped_themes_load_without_problems():
    themes, problems = load_themes()
    assert problems == []
    assert {t.name for t in themes} >= set(SHIPPED)


@pytest.mark.parametrize("name,minimum", [("shop-bright", 7.0), ("shop-dark", 7.0)])
def test_text_contrast_meets_aaa(name, minimum):
    # 7:1 for normal text # WCAG 2.1 success criterion 1.4.6 (contrast, enhanced)
    theme = load_theme_file(bundled_themes_dir() / f"{name}.toml")
    assert _contrast(theme.foreground, theme.background) >= minimum
    for role in ("primary", "error"):
        # 4.5:1 for coloured text on the background # WCAG 2.1 success criterion 1.4.3
        assert _contrast(getattr(theme, role), theme.background) >= 4.5, role


def test_bright_is_light_and_dark_is_dark():
    assert not load_theme_file(bundled_themes_dir() / "shop-bright.toml").dark
    assert load_theme_file(bundled_themes_dir() / "shop-dark.toml").dark


def test_console_theme_uses_only_ansi_names_and_distinct_roles():
    theme = load_theme_file(bundled_themes_dir() / "shop-console.toml")
    assert theme.ansi
    colours = [getattr(theme, f) for f in ("primary", "secondary", "warning", "error",
                                            "success", "accent", "foreground", "background",
                                            "surface", "panel", "boost")]
    colours += [v for k, v in theme.variables.items() if not k.endswith("style")]
    assert all(c.startswith("ansi_") for c in colours), colours
    # The Linux console has 8 background colours: ansi 0-7 # console_codes(4), SGR 40-47
    eight = {"ansi_black", "ansi_red", "ansi_green", "ansi_yellow", "ansi_blue", "ansi_magenta",
             "ansi_cyan", "ansi_white"}
    backgrounds = [theme.background, theme.surface, theme.panel, theme.boost] + [
        v for k, v in theme.variables.items() if "background" in k]
    assert set(backgrounds) <= eight
    roles = [theme.primary, theme.accent, theme.warning, theme.error, theme.success]
    assert len(set(roles)) == len(roles)


BROKEN = [
    ("not TOML", 'name = "x"\nprimary = \n', "line 2"),
    ("unknown key", 'name = "x"\nprimary = "#112233"\nprimray = "#000000"\n', "line 3"),
    ("bad colour", 'name = "x"\nprimary = "blurple"\n', "key 'primary'"),
    ("variable not literal", 'name = "x"\nprimary = "#112233"\n[variables]\nborder = "$accent"\n',
     "key 'variables.border'"),
    ("no primary", 'name = "x"\n', "primary colour"),
    ("dark not bool", 'name = "x"\nprimary = "#112233"\ndark = "yes"\n', "key 'dark'"),
]


@pytest.mark.parametrize("what,text,expect", BROKEN, ids=[b[0] for b in BROKEN])
def test_broken_theme_file_is_reported_and_skipped(tmp_path, what, text, expect):
    folder = tmp_path / "mine"
    folder.mkdir()
    (folder / "broken.toml").write_text(text, encoding="utf-8")
    (folder / "fine.toml").write_text('primary = "#224466"\n', encoding="utf-8")
    themes, problems = load_themes([folder])
    names = {t.name for t in themes}
    assert "fine" in names and "x" not in names and set(SHIPPED) <= names
    assert len(problems) == 1
    assert "broken.toml" in problems[0] and expect in problems[0]


def test_user_theme_folder_is_read_and_can_override(tmp_path):
    user = tmp_path / "xdg" / "shopterm" / "themes"
    user.mkdir(parents=True)
    (user / "dark.toml").write_text('name = "shop-dark"\nprimary = "#ff0000"\n', encoding="utf-8")
    assert theme_dirs()[1] == user
    themes, problems = load_themes()
    assert problems == []
    assert {t.name: t for t in themes}["shop-dark"].primary == "#ff0000"


def test_missing_extra_folder_is_a_problem(tmp_path):
    themes, problems = load_themes([tmp_path / "absent"])
    assert len(problems) == 1 and "no such theme folder" in problems[0]
    assert {t.name for t in themes} >= set(SHIPPED)


@pytest.mark.parametrize("chosen,term,expected", [
    ("shop-dark", "linux", "shop-dark"),
    ("auto", "linux", CONSOLE_THEME),
    (None, "xterm-256color", DEFAULT_THEME),
    ("auto", "tmux-256color", DEFAULT_THEME),
])
def test_theme_for_terminal(chosen, term, expected):
    assert theme_for_terminal(chosen, term) == expected


class TinyApp(App):
    ENABLE_COMMAND_PALETTE = False
    CSS = CONSOLE_CSS

    def __init__(self, want: str, extra_dirs=()):
        super().__init__()
        self.want, self.extra_dirs, self.message = want, extra_dirs, None

    def compose(self) -> ComposeResult:
        yield Label("Pitch diameter 0.2175 in", id="label")
        yield Static("┌──┐\n│OK│\n└──┘")
        yield Input(value="0.0123", id="entry")
        with VerticalScroll(id="list"):
            for n in range(40):
                yield Label(f"M{n + 1} x 1")
        yield Footer()

    def on_mount(self) -> None:
        themes, problems = load_themes(self.extra_dirs)
        msg = apply_theme(self, self.want, themes=themes)
        self.message = " ".join(problems + ([msg] if msg else [])) or None


class PlainApp(TinyApp):
    """The same app without CONSOLE_CSS, to show what it fixes."""

    CSS = ""


@pytest.fixture(autouse=True)
def default_scrollbars():
    yield
    use_console_glyphs(False)


async def test_app_applies_a_shipped_theme():
    app = TinyApp("shop-dark")
    async with app.run_test(size=(80, 24)):
        assert app.theme == "shop-dark" and app.message is None


async def test_broken_chosen_theme_falls_back_with_message(tmp_path):
    folder = tmp_path / "mine"
    folder.mkdir()
    (folder / "garage.toml").write_text('name = "garage"\nprimary = "not-a-colour"\n',
                                        encoding="utf-8")
    app = TinyApp("garage", [folder])
    async with app.run_test(size=(80, 24)):
        assert app.theme == DEFAULT_THEME
        assert "garage.toml" in app.message and "using 'shop-bright'" in app.message


async def test_apply_theme_loads_by_itself_and_reports_unknown_name(monkeypatch):
    app = TinyApp("shop-bright")
    async with app.run_test(size=(80, 24)):
        msg = apply_theme(app, "no-such-theme")
        assert app.theme == DEFAULT_THEME and "no-such-theme" in msg
        assert apply_theme(app, "shop-console") is None and app.theme == "shop-console"
        monkeypatch.setenv("TERM", "linux")
        assert apply_theme(app, "auto") is None and app.theme == CONSOLE_THEME
        msg = apply_theme(app, "nope", fallback="also-missing", themes=[])
        assert app.theme == "textual-light" and "using 'textual-light'" in msg


async def test_console_theme_renders_with_console_glyphs_only():
    app = TinyApp("shop-console")
    async with app.run_test(size=(80, 24), notifications=True) as pilot:
        app.query_one("#list").scroll_to(y=7, animate=False)
        app.notify("Chuck key out?", severity="warning")
        await pilot.pause(0.1)
        assert app.theme == "shop-console"
        text = _screen_text(app)
        assert "Pitch diameter" in text and "Chuck key out?" in text
        assert missing_glyphs(text) == set()


async def test_glyph_check_catches_what_console_css_and_scrollbars_fix():
    app = PlainApp("shop-console")
    async with app.run_test(size=(80, 24), notifications=True) as pilot:
        use_console_glyphs(False)
        app.query_one("#list").scroll_to(y=7, animate=False)
        app.notify("Chuck key out?", severity="warning")
        await pilot.pause(0.1)
        missing = missing_glyphs(_screen_text(app))
        # Input's default "tall" border draws ▊ ▎ ▔ ▁, a toast's "outer" edge ▌, scrollbar
        # thumb ends eighth blocks # console-setup-linux fonts lack them
        assert {"▊", "▎", "▌"} <= missing
        assert missing & set("▁▂▃▄▅▆▇")


async def test_switching_away_from_console_restores_scrollbars():
    app = TinyApp("shop-console")
    async with app.run_test(size=(80, 24)):
        from textual.scrollbar import ScrollBar, ScrollBarRender
        assert ScrollBar.renderer is not ScrollBarRender
        assert apply_theme(app, "shop-dark") is None
        assert ScrollBar.renderer is ScrollBarRender


def _screen_text(app: App) -> str:
    """Return the characters on the screen, from the app's own screenshot (SVG text)."""
    svg = app.export_screenshot()
    return html.unescape("".join(re.findall(r">([^<>]*)</text>", svg))).replace("\xa0", " ")
