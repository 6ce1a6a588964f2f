"""Theme files (TOML in ``themes/`` and the user's theme folder) made into Textual themes.

A theme file holds the fields of ``textual.theme.Theme`` at the top level, an optional
``description``, and a ``[variables]`` table whose values are literal colours (or text styles
for ``*-style`` variables). ``themes/shop-bright.toml`` documents the fields.

References: Textual 8.2.8 ``Theme`` / ``App.register_theme`` / ``InvalidThemeError``
(Textual has no theme-file loader: ``Theme(**tomllib.load(f))``; verified on that version).
"""

from __future__ import annotations

import os
import re
import tomllib
from dataclasses import fields
from pathlib import Path
from typing import Any, Iterable

from textual.app import App, InvalidThemeError
from textual.color import Color, ColorParseError
from textual.scrollbar import ScrollBar, ScrollBarRender
from textual.theme import Theme

from shopterm.config import dotted, key_lines, line_of, user_themes_dir
from shopterm.errors import ConfigError
from shopterm.resources import bundled_themes_dir

DEFAULT_THEME = "shop-bright"
CONSOLE_THEME = "shop-console"
#: Used only when even the fallback theme is missing (a broken install); ships with Textual.
LAST_RESORT = "textual-light"

#: CSS to add to the app's own: on the console theme, borders drawn only with glyphs the Linux
#: console fonts have (the default "tall" Input border and the toast's "outer" edge are not).
CONSOLE_CSS = """
App.-theme-shop-console Input { border: round $border-blurred; }
App.-theme-shop-console Input:focus { border: round $border; }
App.-theme-shop-console Toast { border-left: none; padding: 0 1; }
App.-theme-shop-console Toast.-information { border-left: thick $success; }
App.-theme-shop-console Toast.-warning { border-left: thick $warning; }
App.-theme-shop-console Toast.-error { border-left: thick $error; }
"""

_FIELDS = {f.name: f for f in fields(Theme)}
_COLOUR_FIELDS = ("primary", "secondary", "warning", "error", "success", "accent", "foreground",
                  "background", "surface", "panel", "boost")
_ALLOWED = tuple(_FIELDS) + ("description",)
_STYLE_WORDS = {"none", "not", "bold", "b", "dim", "d", "italic", "i", "underline", "u",
                "underline2", "uu", "reverse", "r", "strike", "s", "blink", "overline", "o"}
_ALPHA = re.compile(r"^(?P<colour>.+?)\s+\d{1,3}%$")


def theme_dirs(extra_dirs: Iterable[str | os.PathLike] = ()) -> list[Path]:
    """Return the theme folders in the order they are read: shipped, the user's, then extras."""
    return [bundled_themes_dir(), user_themes_dir(), *(Path(d) for d in extra_dirs)]


def _colour_ok(value: str) -> bool:
    m = _ALPHA.match(value.strip())
    try:
        Color.parse(m["colour"] if m else value.strip())
    except ColorParseError:
        return False
    return True


def load_theme_file(path: Path, *, try_colours: bool = True) -> Theme:
    """Return the Theme in the TOML file ``path``; raise ConfigError naming key and line.

    try_colours: also have Textual derive the theme's whole colour system, so a theme it
    cannot use is refused here; ``load_themes`` leaves that out for the shipped themes (the
    tests try each of them; the theme in use is derived anyway when the app starts).
    """
    try:
        text = path.read_text(encoding="utf-8")
    except (OSError, UnicodeDecodeError) as exc:
        raise ConfigError(f"cannot read this theme file ({exc}).", path=str(path)) from None
    try:
        data: dict[str, Any] = tomllib.loads(text)
    except tomllib.TOMLDecodeError as exc:
        m = re.search(r"at line (\d+)", str(exc))
        raise ConfigError(f"this theme file is not valid TOML ({exc}). Correct the line.",
                          path=str(path), line=int(m[1]) if m else None) from None
    def bad(where: tuple, message: str) -> ConfigError:
        # the key -> line map is made only for a message (it costs as much as the parse)
        return ConfigError(message, path=str(path), key=dotted(where),
                           line=line_of(key_lines(text), where))

    for key in data:
        if key not in _ALLOWED:
            raise bad((key,), f"unknown key '{key}' in a theme. Allowed: {', '.join(_ALLOWED)}.")
    data.setdefault("name", path.stem)
    data.pop("description", None)
    if not isinstance(data["name"], str) or not data["name"].strip():
        raise bad(("name",), "the theme's name must be text in quotes, e.g. name = \"my-theme\".")
    if "primary" not in data:
        raise bad((), "a theme needs a primary colour, e.g. primary = \"#003d99\".")
    for key in _COLOUR_FIELDS:
        value = data.get(key)
        if value is None:
            continue
        if not isinstance(value, str) or not _colour_ok(value):
            raise bad((key,), f"{value!r} is not a colour. Write \"#rrggbb\", a colour name such "
                              f"as \"red\", or an ANSI name such as \"ansi_blue\".")
    for key in ("dark", "ansi"):
        if key in data and not isinstance(data[key], bool):
            raise bad((key,), f"'{key}' must be true or false, without quotes.")
    for key in ("luminosity_spread", "text_alpha"):
        if key in data and (isinstance(data[key], bool)
                            or not isinstance(data[key], (int, float))):
            raise bad((key,), f"'{key}' must be a number, e.g. {key} = 0.15.")
    variables = data.get("variables", {})
    if not isinstance(variables, dict):
        raise bad(("variables",), "variables must be a [variables] table of name = \"colour\".")
    for name, value in variables.items():
        w = ("variables", name)
        if not isinstance(value, str):
            raise bad(w, f"the value of variable '{name}' must be text in quotes.")
        if name.endswith("style"):
            if not all(word in _STYLE_WORDS for word in value.lower().split()):
                raise bad(w, f"{value!r} is not a text style. Use words such as bold, "
                             f"reverse, underline or none.")
        elif not _colour_ok(value):
            raise bad(w, f"{value!r} is not a literal colour (a variable such as $accent is "
                         f"not allowed here). Write \"#rrggbb\" or \"ansi_blue\".")
    try:
        theme = Theme(**data)
        if try_colours:
            theme.to_color_system().generate()
    except Exception as exc:  # noqa: BLE001 - a user's file must never stop the app
        raise ConfigError(f"Textual cannot use this theme ({exc}).", path=str(path)) from None
    return theme


def load_themes(extra_dirs: Iterable[str | os.PathLike] = ()) -> tuple[list[Theme], list[str]]:
    """Return (themes that loaded, one problem message per file that did not).

    Reads ``*.toml`` in ``theme_dirs(extra_dirs)`` in order; a later theme with the same name
    replaces an earlier one (so a user can restyle a shipped theme). Broken files are skipped.
    extra_dirs: more folders, e.g. ``Config.theme_dirs``; a missing extra folder is a problem,
    a missing user folder is not.
    """
    found: dict[str, Theme] = {}
    problems: list[str] = []
    dirs = theme_dirs(extra_dirs)
    for n, folder in enumerate(dirs):
        if not folder.is_dir():
            if n >= 2:
                problems.append(f"{folder}: no such theme folder (display.theme_dir). "
                                f"Create it or correct the config.")
            continue
        for path in sorted(folder.glob("*.toml")):
            try:
                theme = load_theme_file(path, try_colours=n > 0)
            except ConfigError as exc:
                problems.append(f"{exc} The theme is skipped.")
                continue
            found[theme.name] = theme
    return list(found.values()), problems


def apply_theme(app: App, name: str, fallback: str = DEFAULT_THEME,
                themes: Iterable[Theme] | None = None) -> str | None:
    """Return None after switching ``app`` to theme ``name``, or a message saying what went wrong.

    ``name`` "auto" picks by terminal (``theme_for_terminal``).
    Registers ``themes`` (default: ``load_themes()``, whose problems join the message) and sets
    ``app.theme``. An unknown name falls back to ``fallback`` (and, if that is missing too, to
    Textual's ``textual-light``); the message names the theme used instead. An ANSI theme
    (``ansi = true``, meant for the Linux console) also switches scrollbars to whole cells
    (``use_console_glyphs``); add ``CONSOLE_CSS`` to the app's CSS for the borders.
    """
    problems: list[str] = []
    name = theme_for_terminal(name)
    if themes is None:
        themes, problems = load_themes()
    for theme in themes:
        app.register_theme(theme)
    try:
        app.theme = name
    except InvalidThemeError:
        used = fallback
        try:
            app.theme = fallback
        except InvalidThemeError:
            used = LAST_RESORT
            app.theme = LAST_RESORT
        problems.append(_missing_words(name, used))
    use_console_glyphs(bool(app.current_theme.ansi))
    return " ".join(problems) or None


def _missing_words(name: str, used: str) -> str:
    return (f"No theme named '{name}' could be loaded; using '{used}'. Put the theme file in "
            f"{user_themes_dir()} or choose another theme (display.theme).")


def set_start_theme(app: App, name: str, fallback: str = DEFAULT_THEME,
                    themes: Iterable[Theme] | None = None) -> str | None:
    """Return None after giving a not yet running ``app`` theme ``name``, or what went wrong.

    The same choice and messages as ``apply_theme``, for ``App.__init__``: the theme is set
    without Textual's theme watcher, so the stylesheet is parsed once, with this theme's
    variables, instead of once with Textual's default theme and again after the switch.
    References: Textual 8.2.8 ``App._watch_theme`` (what is done here, less the queued
    ``refresh_css``), ``DOMNode.set_reactive``.
    """
    problems: list[str] = []
    name = theme_for_terminal(name)
    if themes is None:
        themes, problems = load_themes()
    for theme in themes:
        app.register_theme(theme)
    available = app.available_themes
    used = next(n for n in (name, fallback, LAST_RESORT) if n in available)
    if used != name:
        problems.append(_missing_words(name, used))
    app.set_reactive(App.theme, used)
    theme = app.current_theme
    classes = {c: False for c in app.classes if c.startswith("-theme-")}
    classes.update({f"-theme-{theme.name}": True, "-dark-mode": theme.dark,
                    "-light-mode": not theme.dark})
    app.update_classes(classes, update=False)
    app._refresh_truecolor_filter(app.ansi_theme)
    app.stylesheet.set_variables(app.get_css_variables())
    use_console_glyphs(bool(theme.ansi))
    return " ".join(problems) or None


def theme_for_terminal(chosen: str | None = None, term: str | None = None) -> str:
    """Return the theme to start with: ``chosen``, or for "auto"/None shop-console on TERM=linux."""
    if chosen and chosen.strip().lower() != "auto":
        return chosen
    term = os.environ.get("TERM", "") if term is None else term
    return CONSOLE_THEME if term == "linux" else DEFAULT_THEME


class ConsoleScrollBarRender(ScrollBarRender):
    """Scrollbars in whole cells only: the console fonts lack the eighth-block thumb ends."""

    VERTICAL_BARS = [" "] * 8
    HORIZONTAL_BARS = [" "] * 8


def use_console_glyphs(on: bool) -> None:
    """Return nothing; draw every scrollbar in whole cells when ``on`` (call on a theme switch)."""
    ScrollBar.renderer = ConsoleScrollBarRender if on else ScrollBarRender
