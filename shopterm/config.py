"""The config file: where it is, and a strict reading of it into a frozen ``Lathe`` and ``Shop``.

Search order (``find_config``): ``--config PATH``, ``$SHOPTERM_CONFIG``,
``$XDG_CONFIG_HOME/shopterm/config.toml`` (``~/.config/shopterm/config.toml`` when that variable
is unset), else the sample shipped with shopterm. ``sample_config.toml`` documents every key.

Lengths are quoted strings with a unit (``"0.001 in"``, ``"0.02 mm"``), read with
``shopterm.units``; counts are whole numbers. Every problem raises one ``ConfigError`` naming the
file, the dotted key and its line. tomllib gives no positions, so the line is found by scanning
the text for the key inside its table.

References: TOML v1.0.0 (tables, arrays of tables, dotted and quoted keys); the XDG Base
Directory Specification 0.8 ($XDG_CONFIG_HOME, default ~/.config).
"""

from __future__ import annotations

import os
import re
import sys
import tomllib
from dataclasses import dataclass
from fractions import Fraction
from functools import cached_property
from pathlib import Path
from typing import Any

from shopterm.errors import ConfigError, InvalidEntry, ShoptermError
from shopterm.lathe.machine import (ATTACHMENT_SCALES, Dial, GearboxPosition, Lathe, Leadscrew,
                                    Shop, Tailstock, TaperAttachment, ThreadDial, ToolTip,
                                    WireSize)
from shopterm.resources import sample_config_path
from shopterm.units import parse_number, parse_unit, split_unit, to_mm

ENV_VAR = "SHOPTERM_CONFIG"

#: How a config was found, as ``find_config`` reports it (the app shows it beside the path).
HOW_EXPLICIT = "given with --config"
HOW_ENV = f"from ${ENV_VAR}"
HOW_USER = "your config file"
HOW_SAMPLE = "the sample shipped with shopterm (no config of your own found)"

#: The same, short enough for one line of the start-up message at 80 columns.
HOW_BRIEF = {HOW_SAMPLE: "the shipped sample: none of your own"}

Where = tuple[str | int, ...]      # a key's path: table names, keys, array-of-tables indexes


@dataclass(frozen=True)
class Config:
    """A config read and checked: the lathe, the rest of the shop, and where it came from."""

    lathe: Lathe
    shop: Shop
    path: Path
    how_found: str
    theme_dirs: tuple[Path, ...] = ()     # extra theme folders the config names (display.theme_dir)
    #: [favourites] threads as written, each with its line: checked against the standards only
    #: when ``favourites`` or ``problems`` is first asked for (not on the start-up path)
    favourites_written: tuple[tuple[str, int | None], ...] = ()
    #: [pi] shutdown_command, split into words: the menu offers "Shut the Pi down" when set
    shutdown_command: tuple[str, ...] = ()

    @cached_property
    def _favourites_checked(self) -> tuple[tuple[str, ...], tuple[str, ...]]:
        return check_favourites(self.favourites_written, self.path)

    @property
    def favourites(self) -> tuple[str, ...]:
        """Return the favourite threads the standards know, as they print them, each once."""
        return self._favourites_checked[0]

    @property
    def problems(self) -> tuple[str, ...]:
        """Return the mistakes that cost one entry only (a favourite the standards refuse)."""
        return self._favourites_checked[1]


# ---------------------------------------------------------------------------------------------
# Where the files are


def config_home() -> Path:
    """Return the user's config folder for shopterm ($XDG_CONFIG_HOME/shopterm or ~/.config/shopterm).

    References: XDG Base Directory Specification 0.8 (a relative $XDG_CONFIG_HOME is ignored).
    """
    xdg = os.environ.get("XDG_CONFIG_HOME", "")
    base = Path(xdg) if xdg and os.path.isabs(xdg) else Path.home() / ".config"
    return base / "shopterm"


def user_config_path() -> Path:
    """Return where the user's own config would be: ``config_home()/config.toml``."""
    return config_home() / "config.toml"


def user_themes_dir() -> Path:
    """Return the folder where a user adds theme files: ``config_home()/themes``."""
    return config_home() / "themes"


def short_path(path: str | os.PathLike) -> str:
    """Return ``path`` as a person reads it in one line: the folder shopterm's own files are in
    as ``<shopterm>``, the home folder as ``~``, else as given."""
    path = Path(path)
    for folder, name in ((sample_config_path().parent, "<shopterm>"), (Path.home(), "~")):
        try:
            return f"{name}/{path.relative_to(folder).as_posix()}"
        except ValueError:
            continue
    return str(path)


def start_message(config: "Config") -> str:
    """Return what the app says at start about its config: where it is, how it was found."""
    return f"Config: {short_path(config.path)}\n{HOW_BRIEF.get(config.how_found, config.how_found)}"


def find_config(explicit: str | os.PathLike | None = None) -> tuple[Path, str]:
    """Return (path of the config to use, how it was found: one of the ``HOW_*`` phrases).

    explicit: the ``--config`` path, or None. A path given explicitly or in ``$SHOPTERM_CONFIG``
    must exist; a missing user config falls through to the shipped sample.
    """
    if explicit not in (None, ""):
        path = Path(explicit).expanduser()
        if not path.is_file():
            raise ConfigError(f"no such config file. Check the path given with --config, or "
                              f"leave --config out to use {user_config_path()}.", path=str(path))
        return path, HOW_EXPLICIT
    env = os.environ.get(ENV_VAR, "")
    if env:
        path = Path(env).expanduser()
        if not path.is_file():
            raise ConfigError(f"no such config file, named by ${ENV_VAR}. Correct the variable "
                              f"or unset it.", path=str(path))
        return path, HOW_ENV
    user = user_config_path()
    if user.is_file():
        return user, HOW_USER
    return sample_config_path(), HOW_SAMPLE


# ---------------------------------------------------------------------------------------------
# Finding a key's line in the text

_BARE = re.compile(r"[A-Za-z0-9_-]+")


def _key_parts(text: str) -> list[str] | None:
    """Return the parts of a TOML key (``a.b``, ``"x y".c``, ``'lit'``), or None if not a key."""
    parts: list[str] = []
    s = text.strip()
    while s:
        if s[0] == '"':
            m = re.match(r'"((?:[^"\\]|\\.)*)"', s)
            if not m:
                return None
            parts.append(m[1].encode("utf-8").decode("unicode_escape") if "\\" in m[1] else m[1])
        elif s[0] == "'":
            m = re.match(r"'([^']*)'", s)
            if not m:
                return None
            parts.append(m[1])
        else:
            m = _BARE.match(s)
            if not m:
                return None
            parts.append(m[0])
        s = s[m.end():].lstrip()
        if s.startswith("."):
            s = s[1:].lstrip()
        elif s:
            return None
    return parts or None


def _split_outside_strings(line: str) -> tuple[str, int]:
    """Return (line without its comment, net count of open brackets) outside quoted strings."""
    depth = 0
    quote = None
    i = 0
    while i < len(line):
        c = line[i]
        if quote:
            if c == "\\" and quote == '"':
                i += 2
                continue
            if c == quote:
                quote = None
        elif c in "\"'":
            quote = c
        elif c == "#":
            return line[:i], depth
        elif c in "[{":
            depth += 1
        elif c in "]}":
            depth -= 1
        i += 1
    return line, depth


def _find_equals(line: str) -> int:
    """Return the index of the first ``=`` outside quotes, or -1."""
    quote = None
    for i, c in enumerate(line):
        if quote:
            if c == quote:
                quote = None
        elif c in "\"'":
            quote = c
        elif c == "=":
            return i
    return -1


def key_lines(text: str) -> dict[Where, int]:
    """Return the line (from 1) of every table header and key in a TOML text, by its path.

    Array-of-tables entries get their index (from 0) in the path: ``("wires", 2, "marked")``.
    """
    lines: dict[Where, int] = {}
    table: Where = ()
    counts: dict[tuple, int] = {}
    depth = 0
    in_string: str | None = None
    for n, raw in enumerate(text.splitlines(), start=1):
        if in_string:
            if in_string in raw:
                in_string = None
            continue
        code, opened = _split_outside_strings(raw)
        if depth > 0:
            depth += opened
            continue
        s = code.strip()
        if not s:
            continue
        if s.startswith("[["):
            parts = _key_parts(s[2:s.rfind("]]")]) or []
            key = tuple(parts)
            counts[key] = counts.get(key, -1) + 1
            table = key + (counts[key],)
            lines.setdefault(key, n)
            lines.setdefault(table, n)
            continue
        if s.startswith("["):
            parts = _key_parts(s[1:s.rfind("]")]) or []
            table = _resolve_table(tuple(parts), counts)
            lines.setdefault(table, n)
            continue
        eq = _find_equals(s)
        if eq <= 0:
            continue
        parts = _key_parts(s[:eq])
        if parts:
            lines.setdefault(table + tuple(parts), n)
        value = s[eq + 1:].strip()
        for q in ('"""', "'''"):
            if value.startswith(q) and value.count(q) == 1:
                in_string = q
        depth = max(opened, 0)
    return lines


def _resolve_table(parts: tuple[str, ...], counts: dict[tuple, int]) -> Where:
    """Return a header's path with the index of any array of tables it sits under."""
    out: list[str | int] = []
    for i, p in enumerate(parts):
        out.append(p)
        prefix = parts[:i + 1]
        if prefix in counts and i + 1 < len(parts):
            out.append(counts[prefix])
    return tuple(out)


def line_of(lines: dict[Where, int], where: Where) -> int | None:
    """Return the line of ``where``, or of the nearest enclosing table or key that has one."""
    for cut in range(len(where), 0, -1):
        if where[:cut] in lines:
            return lines[where[:cut]]
    return None


def dotted(where: Where) -> str:
    """Return a key path as the user reads it: ``cross_slide.division``, ``wires[3].marked``.

    Array-of-tables indexes are shown counting from 1, as the blocks stand in the file.
    """
    out = ""
    for p in where:
        if isinstance(p, int):
            out += f"[{p + 1}]"
        else:
            shown = p if _BARE.fullmatch(p) else f'"{p}"'
            out += f".{shown}" if out else shown
    return out


# ---------------------------------------------------------------------------------------------
# Reading values strictly

class _Reader:
    """Reads values out of the parsed TOML and raises one ConfigError naming key and line."""

    def __init__(self, path: Path, text: str):
        self.path = path
        self.lines = key_lines(text)
        self.text_lines = text.splitlines()

    def line_of_text(self, where: Where, item: str) -> int | None:
        """Return the line of the quoted ``item`` in the value of the key at ``where``."""
        start = line_of(self.lines, where)
        if start is None:
            return None
        for n, line in enumerate(self.text_lines[start - 1:], start=start):
            if f'"{item}"' in line or f"'{item}'" in line:
                return n
        return start

    def error(self, where: Where, message: str) -> ConfigError:
        return ConfigError(message, path=str(self.path), key=dotted(where) or None,
                           line=line_of(self.lines, where))

    # -- tables ---------------------------------------------------------------------------
    def keys(self, where: Where, table: dict, allowed: tuple[str, ...]) -> None:
        for key in table:
            if key not in allowed:
                name = dotted(where) or "the top level"
                raise self.error(where + (key,),
                                 f"unknown key '{key}' in [{name}]. The keys allowed there are: "
                                 f"{', '.join(allowed)}. Correct the spelling or delete the line.")

    def table(self, where: Where, parent: dict, key: str, required: bool = False) -> dict | None:
        if key not in parent:
            if required:
                raise self.error(where, f"the [{dotted(where + (key,))}] section is missing. "
                                        f"Add it: the sample config shows what goes in it.")
            return None
        value = parent[key]
        if not isinstance(value, dict):
            raise self.error(where + (key,), f"'{key}' must be a section [{dotted(where + (key,))}] "
                                             f"with keys under it, not a single value.")
        return value

    # -- scalars --------------------------------------------------------------------------
    def _missing(self, where: Where, key: str, example: str) -> ConfigError:
        return self.error(where, f"'{key}' is missing from [{dotted(where)}]. Add a line such as "
                                 f"{key} = {example}.")

    def integer(self, where: Where, table: dict, key: str, *, minimum: int = 1,
                default: Any = None, required: bool = False, what: str = "number",
                example: str = "100") -> int | None:
        if key not in table:
            if required:
                raise self._missing(where, key, example)
            return default
        value = table[key]
        w = where + (key,)
        if isinstance(value, bool) or not isinstance(value, int):
            raise self.error(w, f"{what} must be a whole number without quotes, e.g. "
                                f"{key} = {example}.")
        if value < minimum:
            floor = "greater than zero" if minimum == 1 else f"at least {minimum}"
            raise self.error(w, f"{what} must be {floor}, not {value}. Correct it.")
        return value

    def string(self, where: Where, table: dict, key: str, *, default: Any = None,
               required: bool = False, choices: tuple[str, ...] | None = None,
               example: str = '"..."') -> str | None:
        if key not in table:
            if required:
                raise self._missing(where, key, example)
            return default
        value = table[key]
        w = where + (key,)
        if not isinstance(value, str):
            raise self.error(w, f"'{key}' must be text in quotes, e.g. {key} = {example}.")
        if choices is not None:
            norm = value.strip().lower().replace("-", "_").replace(" ", "_")
            if norm not in choices:
                raise self.error(w, f"'{value}' is not one of the choices for '{key}': "
                                    f"{' or '.join(repr(c) for c in choices)}. Use one of them.")
            return norm
        if not value.strip():
            raise self.error(w, f"'{key}' is empty. Write a value, e.g. {key} = {example}.")
        return value

    def length(self, where: Where, table: dict, key: str, *, required: bool = False,
               allow_zero: bool = False, what: str = "length",
               example: str = '"0.001 in"') -> tuple[float, str] | None:
        """Return (number as written, unit) of a length written with its unit."""
        if key not in table:
            if required:
                raise self._missing(where, key, example)
            return None
        value = table[key]
        w = where + (key,)
        if isinstance(value, bool) or not isinstance(value, (str, int, float)):
            raise self.error(w, f"the {what} must be a length in quotes with its unit, "
                                f"e.g. {key} = {example}.")
        if not isinstance(value, str):
            raise self.error(w, f"{value} has no unit. Write the {what} in quotes with mm or in, "
                                f"e.g. {key} = \"{value} mm\" or \"{value} in\".")
        try:
            number_text, unit = split_unit(value)
            if unit is None:
                raise InvalidEntry(f"'{value}' has no unit. Write it with mm or in, e.g. "
                                   f"{key} = {example}.")
            number = parse_number(number_text)
        except InvalidEntry as exc:
            raise self.error(w, str(exc)) from None
        if number < 0 or (number == 0 and not allow_zero):
            floor = "zero or more" if allow_zero else "greater than zero"
            raise self.error(w, f"the {what} must be {floor}, not {value!r}. Correct it.")
        return number, unit

    def length_mm(self, where: Where, table: dict, key: str, **kw) -> float | None:
        got = self.length(where, table, key, **kw)
        return None if got is None else to_mm(got[0], got[1])

    def ratio(self, where: Where, table: dict, key: str, *, default: Fraction | None = None,
              what: str = "ratio") -> Fraction | None:
        if key not in table:
            return default
        value = table[key]
        w = where + (key,)
        try:
            if isinstance(value, bool):
                raise ValueError
            if isinstance(value, (int, float)):
                result = Fraction(value).limit_denominator(100000)
            elif isinstance(value, str):
                m = re.fullmatch(r"\s*(\d+(?:\.\d+)?)\s*[/:]\s*(\d+(?:\.\d+)?)\s*", value)
                if m:
                    result = Fraction(m[1]) / Fraction(m[2])
                else:
                    result = Fraction(value.strip())
            else:
                raise ValueError
        except (ValueError, ZeroDivisionError):
            raise self.error(w, f"the {what} must be a ratio such as \"1/2\", \"40:127\" or 1.5; "
                                f"{value!r} is not. Correct it.") from None
        if result <= 0:
            raise self.error(w, f"the {what} must be greater than zero, not {value!r}.")
        return result


# ---------------------------------------------------------------------------------------------
# The sections

_TOP = ("display", "lathe", "leadscrew", "gear_train", "change_gears", "gearbox", "cross_slide",
        "compound", "thread_dial", "wires", "micrometer", "tool", "indexing", "favourites", "pi")
_TOP += ("tailstock", "taper_attachment")     # the taper set-up (``_taper_kit``)


def _read(r: _Reader, data: dict, path: Path, how_found: str) -> Config:
    r.keys((), data, _TOP)

    display = r.table((), data, "display") or {}
    w = ("display",)
    r.keys(w, display, ("units", "theme", "theme_dir"))
    units = r.string(w, display, "units", default="mm", example='"mm"')
    try:
        units = parse_unit(units)
    except InvalidEntry as exc:
        raise r.error(w + ("units",), str(exc)) from None
    theme = r.string(w, display, "theme", default="shop-bright", example='"shop-bright"')
    theme_dir = r.string(w, display, "theme_dir", example='"~/my-themes"')
    theme_dirs: tuple[Path, ...] = ()
    if theme_dir:
        d = Path(theme_dir).expanduser()
        theme_dirs = (d if d.is_absolute() else path.parent / d,)

    lathe_t = r.table((), data, "lathe") or {}
    r.keys(("lathe",), lathe_t, ("name",))
    name = r.string(("lathe",), lathe_t, "name", default="my lathe", example='"My lathe"')

    leadscrew = _leadscrew(r, r.table((), data, "leadscrew", required=True))

    train = r.table((), data, "gear_train") or {}
    w = ("gear_train",)
    r.keys(w, train, ("fixed_ratio", "clearance"))
    fixed_ratio = r.ratio(w, train, "fixed_ratio", default=Fraction(1), what="fixed ratio")
    clearance = r.integer(w, train, "clearance", minimum=0, default=15,
                          what="the clearance margin [teeth]", example="15")

    gears = _gears(r, r.table((), data, "change_gears"))
    gearbox = _gearbox(r, r.table((), data, "gearbox"))
    if not gears and not gearbox:
        raise r.error(("change_gears",) if "change_gears" in data else (),
                      "no change gears and no gearbox positions are given. Add a [change_gears] "
                      "section (teeth = how many) or a [gearbox] section (label = ratio).")

    cross = _dial(r, ("cross_slide",), r.table((), data, "cross_slide", required=True),
                  cross_slide=True)
    compound_t = r.table((), data, "compound", required=True)
    compound = _dial(r, ("compound",), compound_t, cross_slide=False)
    zero = r.string(("compound",), compound_t, "angle_zero", required=True,
                    choices=("cross_slide", "bed"), example='"cross_slide"')

    thread_dial = _thread_dial(r, r.table((), data, "thread_dial"))
    wires = _wires(r, data)

    micro = r.table((), data, "micrometer") or {}
    r.keys(("micrometer",), micro, ("resolution",))
    resolution = r.length_mm(("micrometer",), micro, "resolution",
                             what="micrometer resolution", example='"0.001 mm"')

    tool, side_clearance = _tool(r, r.table((), data, "tool"))

    idx = r.table((), data, "indexing") or {}
    w = ("indexing",)
    r.keys(w, idx, ("spindle_gear", "driving_plate_slots"))
    spindle_gear = r.integer(w, idx, "spindle_gear", what="the spindle gear's teeth",
                             example="60")
    slots = r.integer(w, idx, "driving_plate_slots", what="the driving plate's slots",
                      example="4")

    favourites = _favourites(r, r.table((), data, "favourites"))

    lathe = Lathe(name=name, leadscrew=leadscrew, cross_dial=cross, compound_dial=compound,
                  compound_zero=zero, gears=gears, fixed_ratio=fixed_ratio, gearbox=gearbox,
                  thread_dial=thread_dial, clearance_margin=clearance,
                  spindle_gear=spindle_gear, faceplate_slots=slots,
                  **_taper_kit(r, data, compound_t))
    shop_kw: dict[str, Any] = {"display_units": units, "theme": theme, "wires": wires}
    if resolution is not None:
        shop_kw["micrometer_resolution"] = resolution
    if tool is not None:
        shop_kw["tool"] = tool
    if side_clearance is not None:
        shop_kw["tool_side_clearance_deg"] = side_clearance
    return Config(lathe=lathe, shop=Shop(**shop_kw), path=path, how_found=how_found,
                  theme_dirs=theme_dirs, favourites_written=favourites,
                  shutdown_command=_pi(r, r.table((), data, "pi")))


def _favourites(r: _Reader, t: dict | None) -> tuple[tuple[str, int | None], ...]:
    """Return the favourite threads as written, each with its line (shape checked here; what
    each names is checked by ``check_favourites`` when first needed)."""
    if t is None:
        return ()
    w = ("favourites",)
    r.keys(w, t, ("threads",))
    value = t.get("threads", [])
    example = '["M10x1.5-6g", "3/8-16 UNC-2A"]'
    if not isinstance(value, list):
        raise r.error(w + ("threads",), f"'threads' must be a list of designations in quotes, "
                                        f"e.g. threads = {example}.")
    out = []
    for i, item in enumerate(value):
        if not isinstance(item, str) or not item.strip():
            raise r.error(w + ("threads",), f"favourite {i + 1} ({item!r}) is not a designation "
                                            f"in quotes, e.g. threads = {example}.")
        out.append((item.strip(), r.line_of_text(w + ("threads",), item)))
    return tuple(out)


def check_favourites(written, path) -> tuple[tuple[str, ...], tuple[str, ...]]:
    """Return (the favourite threads as the standards print them, each once; one problem
    message per favourite the standards refuse, naming key and line).

    written: (designation, line) pairs as read; path: the config file. A refused favourite is
    reported and left out; the others are kept.
    """
    from shopterm.standards import limits, parse
    good: list[str] = []
    problems: list[str] = []
    for item, line in written:
        try:
            spec = parse(item)
            limits(spec)
        except ShoptermError as exc:
            problems.append(str(ConfigError(f"favourite '{item}' left out: {exc}",
                                            path=str(path), key="favourites.threads",
                                            line=line)))
            continue
        if spec.designation not in good:
            good.append(spec.designation)
    return tuple(good), tuple(problems)


def _leadscrew(r: _Reader, t: dict) -> Leadscrew:
    w = ("leadscrew",)
    r.keys(w, t, ("tpi", "pitch"))
    if ("tpi" in t) == ("pitch" in t):
        raise r.error(w, "give the leadscrew as either tpi (e.g. tpi = 8) or pitch "
                         "(e.g. pitch = \"3 mm\"), one of the two.")
    if "tpi" in t:
        tpi = t["tpi"]
        if isinstance(tpi, bool) or not isinstance(tpi, (int, float)):
            raise r.error(w + ("tpi",), "tpi must be a number without quotes, e.g. tpi = 8.")
        if tpi <= 0:
            raise r.error(w + ("tpi",), f"the leadscrew's tpi must be greater than zero, "
                                        f"not {tpi}. Correct it.")
        return Leadscrew.from_tpi(tpi)
    number, unit = r.length(w, t, "pitch", what="leadscrew pitch", example='"3 mm"')
    if unit == "in":       # an inch pitch: keep it exact as threads per inch
        return Leadscrew.from_tpi(float(1 / Fraction(str(number))))
    return Leadscrew.from_mm(number)


def _gears(r: _Reader, t: dict | None) -> tuple[tuple[int, int], ...]:
    if not t:
        return ()
    w = ("change_gears",)
    out = []
    for key, count in t.items():
        kw = w + (key,)
        if not re.fullmatch(r"\d+", key):
            raise r.error(kw, f"'{key}' is not a number of teeth. In [change_gears] each line "
                              f"is teeth = how many, e.g. 40 = 2.")
        teeth = int(key)
        if teeth == 0:
            raise r.error(kw, "a gear cannot have 0 teeth. Write its number of teeth as the key, "
                              "e.g. 40 = 2.")
        if isinstance(count, bool) or not isinstance(count, int):
            raise r.error(kw, f"how many {teeth}-tooth gears you own must be a whole number "
                              f"without quotes, e.g. {teeth} = 1.")
        if count < 1:
            raise r.error(kw, f"the count of {teeth}-tooth gears must be at least 1; delete the "
                              f"line if you have none.")
        out.append((teeth, count))
    return tuple(sorted(out))


def _gearbox(r: _Reader, t: dict | None) -> tuple[GearboxPosition, ...]:
    if not t:
        return ()
    out = []
    for label, value in t.items():
        if isinstance(value, dict):
            raise r.error(("gearbox", label), f"'{label}' must be label = ratio, "
                                              f"e.g. \"{label}\" = \"1/2\".")
        ratio = r.ratio(("gearbox",), t, label, what=f"ratio of gearbox position '{label}'")
        out.append(GearboxPosition(label, ratio))
    return tuple(out)


def _dial(r: _Reader, w: Where, t: dict, cross_slide: bool) -> Dial:
    allowed = ("division", "divisions", "reads") if cross_slide else \
        ("division", "divisions", "angle_zero", "travel")
    r.keys(w, t, allowed)
    value, unit = r.length(w, t, "division", required=True, what="value of one division",
                           example='"0.001 in"')
    divisions = r.integer(w, t, "divisions", required=True, what="the divisions in one turn",
                          example="100")
    reads_diameter = False
    if cross_slide:
        reads = r.string(w, t, "reads", required=True, choices=("radius", "diameter"),
                         example='"radius"')
        reads_diameter = reads == "diameter"
    return Dial(unit=unit, division=value, divisions=divisions, reads_diameter=reads_diameter)


def _thread_dial(r: _Reader, t: dict | None) -> ThreadDial | None:
    if t is None:
        return None
    w = ("thread_dial",)
    r.keys(w, t, ("teeth", "lines", "numbered"))
    teeth = r.integer(w, t, "teeth", required=True, what="the thread dial gear's teeth",
                      example="16")
    lines = r.integer(w, t, "lines", required=True, what="the lines on the thread dial",
                      example="8")
    numbered = t.get("numbered", [])
    nw = w + ("numbered",)
    if not isinstance(numbered, list) or any(
            isinstance(n, bool) or not isinstance(n, int) for n in numbered):
        raise r.error(nw, "numbered must be a list of line numbers, e.g. numbered = [1, 3, 5, 7].")
    for n in numbered:
        if not 1 <= n <= lines:
            raise r.error(nw, f"line {n} is not on a dial of {lines} lines: use numbers from 1 "
                              f"to {lines}.")
    if len(set(numbered)) != len(numbered):
        raise r.error(nw, "a line is listed twice in numbered. List each line once.")
    return ThreadDial(teeth=teeth, lines=lines, numbered=tuple(numbered))


def _wires(r: _Reader, data: dict) -> tuple[WireSize, ...]:
    sets = data.get("wires", [])
    if not isinstance(sets, list) or any(not isinstance(s, dict) for s in sets):
        raise r.error(("wires",), "each set of wires is a [[wires]] block with marked = "
                                  "\"0.029 in\" under it.")
    out = []
    for i, s in enumerate(sets):
        w = ("wires", i)
        r.keys(w, s, ("marked", "measured", "label"))
        marked = r.length(w, s, "marked", required=True, what="wire size", example='"0.029 in"')
        measured = r.length_mm(w, s, "measured", what="measured wire size",
                               example='"0.0291 in"')
        label = r.string(w, s, "label", default=str(s["marked"]).strip(), example='"29 thou"')
        out.append(WireSize(marked=to_mm(*marked), measured=measured, label=label))
    return tuple(out)


def _taper_kit(r: _Reader, data: dict, compound_t: dict) -> dict[str, Any]:
    """Return the Lathe's taper fields: [tailstock], [taper_attachment], compound.travel."""
    out: dict[str, Any] = {"compound_travel": r.length_mm(
        ("compound",), compound_t, "travel", what="compound travel", example='"2.5 in"')}
    tail = r.table((), data, "tailstock")
    if tail is not None:
        w = ("tailstock",)
        r.keys(w, tail, ("set_over_division", "max_set_over"))
        division = r.length(w, tail, "set_over_division", what="set-over scale's division",
                            example='"1 mm"')
        most = r.length(w, tail, "max_set_over", what="largest set-over", example='"10 mm"')
        unit = (division or most or (0, "mm"))[1]
        out["tailstock"] = Tailstock(division and to_mm(*division), unit,
                                     most and to_mm(*most))
    att = r.table((), data, "taper_attachment")
    if att is not None:
        w = ("taper_attachment",)
        r.keys(w, att, ("scale", "max_setting", "max_travel"))
        scale = r.string(w, att, "scale", required=True, choices=ATTACHMENT_SCALES,
                         example='"in_per_ft"')
        most = att.get("max_setting")
        if most is None:
            raise r._missing(w, "max_setting", "3")
        if isinstance(most, bool) or not isinstance(most, (int, float)) or not most > 0:
            raise r.error(w + ("max_setting",), f"max_setting is the largest setting on the "
                                                f"guide bar's graduation ({scale}), a number "
                                                f"greater than zero without quotes, e.g. "
                                                f"max_setting = 3.")
        travel = r.length_mm(w, att, "max_travel", what="taper attachment's travel",
                             example='"10 in"')
        out["taper_attachment"] = TaperAttachment(scale, float(most), travel)
    return out


def _tool(r: _Reader, t: dict | None) -> tuple[ToolTip | None, float | None]:
    """Return the [tool] tip (None when not given) and its side clearance [deg] (None)."""
    if t is None:
        return None, None
    w = ("tool",)
    r.keys(w, t, ("nose_radius", "flat", "side_clearance"))
    side = None
    if "side_clearance" in t:
        value = t["side_clearance"]
        if isinstance(value, bool) or not isinstance(value, (int, float)) \
                or not 0 < value < 45:
            raise r.error(w + ("side_clearance",),
                          "side_clearance is the most side clearance ground on the tool, in "
                          "degrees without quotes, more than 0 and under 45, e.g. "
                          "side_clearance = 12.")
        side = float(value)
    if "nose_radius" in t and "flat" in t or (side is None and not t):
        raise r.error(w, "give the tool tip as either nose_radius = \"0.1 mm\" or "
                         "flat = \"0.2 mm\", one of the two.")
    if "nose_radius" not in t and "flat" not in t:
        return None, side
    kind, key = ("radius", "nose_radius") if "nose_radius" in t else ("flat", "flat")
    size = r.length_mm(w, t, key, allow_zero=True, what="tool tip size", example='"0.1 mm"')
    return ToolTip(kind, size), side


def _pi(r: _Reader, t: dict | None) -> tuple[str, ...]:
    if not t:
        return ()
    w = ("pi",)
    r.keys(w, t, ("shutdown_command",))
    text = r.string(w, t, "shutdown_command", example='"systemctl poweroff"')
    if text is None:
        return ()
    import shlex      # here: only a config with [pi] pays for it at start-up
    try:
        words = tuple(shlex.split(text))
    except ValueError as exc:
        raise r.error(w + ("shutdown_command",), f"the shutdown command cannot be read ({exc}); "
                      "write it as on a command line, e.g. \"systemctl poweroff\".") from None
    return words


# ---------------------------------------------------------------------------------------------
# Public entry points


def read_config_text(text: str, path: Path, how_found: str = HOW_EXPLICIT) -> Config:
    """Return the Config described by TOML ``text`` (``path`` is named in messages)."""
    try:
        data = tomllib.loads(text)
    except tomllib.TOMLDecodeError as exc:
        m = re.search(r"at line (\d+)", str(exc))
        detail = re.sub(r"\s*\(at line \d+, column \d+\)", "", str(exc))
        raise ConfigError(f"this is not valid TOML ({detail}). Correct that line; the sample "
                          f"config shows the form.", path=str(path),
                          line=int(m[1]) if m else None) from None
    reader = _Reader(path, text)
    try:
        return _read(reader, data, path, how_found)
    except InvalidEntry as exc:     # a value the lathe types themselves refused
        raise ConfigError(f"{exc} Correct the config.", path=str(path)) from None


def load_config(path: str | os.PathLike | None = None, how_found: str | None = None) -> Config:
    """Return the Config in ``path``, or in the file ``find_config`` picks when path is None.

    Raises ``ConfigError`` (file, key, line, what to do) for anything that is not right.
    """
    if path in (None, ""):
        found, how = find_config(None)
    else:
        found, how = find_config(path)
    how = how_found or how
    try:
        raw = found.read_bytes()
    except OSError as exc:
        raise ConfigError(f"cannot read the file ({exc.strerror}). Check the path and that you "
                          f"may read it.", path=str(found)) from None
    try:
        text = raw.decode("utf-8")
    except UnicodeDecodeError as exc:
        line = raw[:exc.start].count(b"\n") + 1
        raise ConfigError("the file is not UTF-8 text. Save it as UTF-8.", path=str(found),
                          line=line) from None
    return read_config_text(text, found, how)


def check_config_command(path: str | os.PathLike | None = None) -> int:
    """Return 0 after printing ``OK: <path> (<lathe name>)``, or 2 after printing the problems.

    path: the file to check; None or "" checks the one ``find_config`` would use.
    """
    try:
        config = load_config(path or None)
    except ConfigError as exc:
        print(f"shopterm: {exc}", file=sys.stderr)
        return 2
    for problem in config.problems:
        print(f"shopterm: {problem}", file=sys.stderr)
    if config.problems:
        return 2
    print(f"OK: {config.path} ({config.lathe.name})")
    return 0
