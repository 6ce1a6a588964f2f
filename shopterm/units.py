"""Lengths, units and what people type.

Every length inside the core is a float in millimetres; the inch is exactly 25.4 mm.

References: ISO 31-1 / NIST SP 811 (1 in = 25.4 mm exactly, since 1959).
"""

from __future__ import annotations

import math
import re
from fractions import Fraction
from typing import Literal

from shopterm.errors import InvalidEntry

Unit = Literal["mm", "in"]
MM_PER_INCH = 25.4
UNITS: tuple[Unit, ...] = ("mm", "in")

_SUFFIXES: dict[str, Unit] = {
    "mm": "mm", "millimetre": "mm", "millimeter": "mm", "millimetres": "mm", "millimeters": "mm",
    "in": "in", "inch": "in", "inches": "in", '"': "in", "''": "in", "″": "in",
}

_NUMBER = r"(?:\d+(?:[.,]\d*)?|[.,]\d+)"
_MIXED = re.compile(r"^(?P<whole>\d+)(?:\s+|-)(?P<num>\d+)\s*/\s*(?P<den>\d+)$")
_FRACTION = re.compile(r"^(?P<num>\d+)\s*/\s*(?P<den>\d+)$")
_DECIMAL = re.compile(rf"^[+-]?{_NUMBER}(?:[eE][+-]?\d+)?$")
_SPLIT_SUFFIX = re.compile(r"^(?P<value>.*?)\s*(?P<suffix>[a-zA-Z]+|\"|''|″)$")

EXPECTED = ("a number such as 0.2453, .2453, 6,23 or 6.23mm, a fraction such as 3/8 or 1-1/2, "
            "optionally followed by mm or in")


def to_mm(value: float, unit: Unit) -> float:
    """Return ``value`` in millimetres. value [unit]"""
    if unit == "mm":
        return float(value)
    if unit == "in":
        return float(value) * MM_PER_INCH
    raise InvalidEntry(f"Unknown unit {unit!r}: use mm or in.")


def from_mm(mm: float, unit: Unit) -> float:
    """Return a length given in millimetres in ``unit``. mm [mm]"""
    if unit == "mm":
        return float(mm)
    if unit == "in":
        return float(mm) / MM_PER_INCH
    raise InvalidEntry(f"Unknown unit {unit!r}: use mm or in.")


def parse_unit(text: str) -> Unit:
    """Return the unit a person named (``mm``, ``in``, ``inch``, ``"``)."""
    unit = _SUFFIXES.get(text.strip().lower())
    if unit is None:
        raise InvalidEntry(f"{text!r} is not a unit: use mm or in.")
    return unit


def parse_number(text: str) -> float:
    """Return the plain number in ``text`` (decimal point or comma, fractions, mixed numbers)."""
    if not isinstance(text, str):
        raise InvalidEntry(f"Expected {EXPECTED}.")
    s = text.strip()
    if not s:
        raise InvalidEntry(f"Nothing entered: type {EXPECTED}.")
    if m := _MIXED.match(s):
        den = int(m["den"])
        if den == 0:
            raise InvalidEntry(f"{text!r}: a fraction cannot have 0 below the line.")
        return float(int(m["whole"]) + Fraction(int(m["num"]), den))
    if m := _FRACTION.match(s):
        den = int(m["den"])
        if den == 0:
            raise InvalidEntry(f"{text!r}: a fraction cannot have 0 below the line.")
        return float(Fraction(int(m["num"]), den))
    if _DECIMAL.match(s) and s.count(",") + s.count(".") <= 1:
        value = float(s.replace(",", "."))
        if not math.isfinite(value):
            raise InvalidEntry(f"{text!r} is too large a number.")
        return value
    raise InvalidEntry(f"{text!r} is not a number: type {EXPECTED}.")


def split_unit(text: str) -> tuple[str, Unit | None]:
    """Return (number text, unit or None) from an entry such as ``6.23 mm`` or ``.2453"``."""
    if not isinstance(text, str):
        raise InvalidEntry(f"Expected {EXPECTED}.")
    s = text.strip()
    m = _SPLIT_SUFFIX.match(s)
    if m and m["value"] and not m["suffix"].lower() in ("e",):
        suffix = m["suffix"].lower()
        if suffix in _SUFFIXES:
            return m["value"], _SUFFIXES[suffix]
        raise InvalidEntry(f"{text!r}: {m['suffix']!r} is not a unit; use mm or in.")
    return s, None


def parse_length(text: str, default_unit: Unit = "mm") -> float:
    """Return the length typed in ``text`` in millimetres.

    A unit suffix (``mm``, ``in``, ``"``) wins over ``default_unit``.
    """
    number, unit = split_unit(text)
    value = parse_number(number)
    return to_mm(value, unit or default_unit)


def parse_positive_length(text: str, default_unit: Unit = "mm", what: str = "length") -> float:
    """Return a length [mm] that must be greater than zero."""
    mm = parse_length(text, default_unit)
    if mm <= 0:
        raise InvalidEntry(f"The {what} must be greater than zero.")
    return mm


def decimals_for(resolution: float) -> int:
    """Return how many decimals show a value of the given resolution (0.001 → 3, 0.0005 → 4)."""
    if resolution <= 0:
        raise InvalidEntry("A resolution must be greater than zero.")
    d = 0
    while d < 9 and abs(round(resolution, d) - resolution) > resolution * 1e-6:
        d += 1
    return d


def round_to(value: float, step: float) -> float:
    """Return ``value`` rounded to the nearest multiple of ``step`` (half away from zero)."""
    if step <= 0:
        raise InvalidEntry("A rounding step must be greater than zero.")
    q = abs(value) / step
    n = math.floor(q + 0.5 + 1e-9)
    return math.copysign(n * step, value) if n else 0.0


DEFAULT_RESOLUTION: dict[Unit, float] = {"mm": 0.001, "in": 0.0001}


def format_length(mm: float, unit: Unit, resolution: float | None = None, *,
                  suffix: bool = True) -> str:
    """Return ``mm`` shown in ``unit`` rounded to ``resolution`` (given in ``unit``)."""
    res = resolution if resolution is not None else DEFAULT_RESOLUTION[unit]
    value = round_to(from_mm(mm, unit), res)
    text = f"{value:.{decimals_for(res)}f}"
    if text.startswith("-") and float(text) == 0:
        text = text[1:]
    return f"{text} {unit}" if suffix else text
