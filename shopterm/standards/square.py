"""Square threads: no standard, the usual practical proportions.

Designation (shopterm's own, round-trips through ``parse``/``format``)::

    SQUARE <diameter>x<pitch> [A<allowance>] [T<pd tolerance>] [S<starts>]   mm, e.g. SQUARE 25x5
    SQUARE <diameter>-<tpi>   [A<allowance>] [T<pd tolerance>] [S<starts>]   inch, e.g. SQUARE 1-5

``A`` and ``T`` are in the diameter's unit and give the fit, as for a special thread: the
allowance goes towards less metal (screw smaller, nut larger); with no ``T`` the pitch-diameter
band has no width. A nut is said with a trailing ``internal``.

Proportions (common practice, no source): depth 0.5P, groove and land each 0.5P wide, pitch
line at half depth (d2 = d − 0.5P), minor d − P. The nut is cut a little deeper and its groove
a little wider than the screw's land by a clearance of 0.1 mm (0.004 in for an inch thread):
so the nut's tool is 0.5P + clearance wide and the nut's major diameter d + 2 × clearance.
"""

from __future__ import annotations

import re

from shopterm.errors import InvalidEntry
from shopterm.standards.forms import SQUARE_0
from shopterm.standards.special import fit_words
from shopterm.standards.spec import Limits, ThreadSpec
from shopterm.units import MM_PER_INCH, Unit, from_mm, parse_number, to_mm

FAMILY = "square"
SERIES = "SQUARE"
#: Nut clearance on depth and groove width [mm] by the designation's unit.
CLEARANCE = {"mm": 0.1, "in": 0.004 * MM_PER_INCH}  # common practice, no source

GRAMMAR = "SQUARE <diameter>x<pitch mm> or SQUARE <diameter in>-<tpi>, then A<allowance> " \
          "T<tolerance> S<starts> if wanted, e.g. SQUARE 25x5 or SQUARE 1-5 A0.005 T0.01"

_NUM = r"\d+-\d+/\d+|\d+/\d+|\d*\.\d+|\d+(?:\.\d*)?"
_HEAD = re.compile(rf"^SQUARE\s+(?P<d>{_NUM})\s*(?:(?P<x>[x×*])|-)\s*(?P<p>\d*\.?\d+)"
                   r"(?P<rest>(?:\s+.*)?)$", re.IGNORECASE)
_TOKEN = re.compile(r"^(?:A(?P<a>[+-]?\d*\.?\d+)|T(?P<t>\d*\.?\d+)|S(?P<s>\d+)|"
                    r"(?P<kind>internal|external))$", re.IGNORECASE)


def _g(x: float) -> str:
    return f"{x:.6f}".rstrip("0").rstrip(".")


def parse(text: str) -> ThreadSpec | None:
    """Return the square thread ``text`` names, or None if it does not start ``SQUARE``.

    Raises ``InvalidEntry`` saying what is wrong with a ``SQUARE`` designation.
    """
    if not isinstance(text, str):
        return None
    s = " ".join(text.strip().split())
    if not re.match(r"^SQUARE\b", s, re.IGNORECASE):
        return None
    m = _HEAD.match(s)
    if m is None:
        raise InvalidEntry(f"{text.strip()!r}: write a square thread as {GRAMMAR}.")
    unit: Unit = "mm" if m["x"] else "in"
    fields: dict[str, str] = {}
    for token in m["rest"].split():
        t = _TOKEN.match(token)
        if t is None or any(k in fields for k, v in t.groupdict().items() if v is not None):
            raise InvalidEntry(f"{text.strip()!r}: {token!r} is not understood or given twice; "
                               f"write {GRAMMAR}.")
        fields.update({k: v for k, v in t.groupdict().items() if v is not None})
    d = to_mm(parse_number(m["d"]), unit)
    p_value = float(m["p"])
    if d <= 0 or p_value <= 0:
        raise InvalidEntry(f"{text.strip()!r}: diameter and pitch must be greater than zero.")
    pitch = p_value if unit == "mm" else MM_PER_INCH / p_value
    if pitch >= d / 2:
        raise InvalidEntry(f"{text.strip()!r}: a pitch of half the diameter or more leaves no "
                           "core: use a finer pitch or a larger diameter.")
    allowance = to_mm(abs(float(fields.get("a", 0))), unit)
    tol = to_mm(float(fields["t"]), unit) if "t" in fields else None
    if tol is not None and tol <= 0:
        raise InvalidEntry("The pitch-diameter tolerance T must be greater than zero.")
    kind = fields.get("kind", "external").lower()
    return ThreadSpec(family=FAMILY, series=SERIES, size=m["d"], major=d, pitch=pitch,
                      form=SQUARE_0, kind=kind, tpi=None if unit == "mm" else p_value,
                      starts=int(fields.get("s", 1)), native_unit=unit,
                      allowance=-allowance if kind == "external" else allowance,
                      pd_tolerance=tol)


def format(spec: ThreadSpec) -> str:  # noqa: A001 - the family contract's name
    """Return ``SQUARE 25x5`` / ``SQUARE 1-5`` with the fit and starts given."""
    head = (f"SQUARE {spec.size}x{_g(spec.pitch)}" if spec.native_unit == "mm"
            else f"SQUARE {spec.size}-{_g(spec.tpi)}")
    return " ".join([head, *fit_words(spec)])


def limits(spec: ThreadSpec) -> Limits:
    """Return the limits of a square thread from the practical proportions and the fit given.

    External: major d − a (no tolerance), d2 max = d − 0.5P − a, d2 min = d2 max − T, minor
    max d − P − a; tool tip 0.5P wide, depth 0.5P. Internal: minor D1 = d − P + a, D2 min =
    d − 0.5P + a, D2 max = D2 min + T, major min d + 2c + a; tool 0.5P + c wide, depth 0.5P + c.
    """
    if spec.family != FAMILY:
        raise InvalidEntry(f"{spec.size} is not a square thread.")
    d, p = spec.major, spec.pitch
    a, t = abs(spec.allowance or 0.0), spec.pd_tolerance
    c = CLEARANCE[spec.native_unit]
    notes = ["Square thread: no standard; proportions are common practice (depth 0.5P, groove "
             "0.5P, nut clearance " + f"{_g(from_mm(c, spec.native_unit))} {spec.native_unit})."]
    if t is None:
        notes.append("No pitch-diameter tolerance given: the band has no width. Give one (T) "
                     "for a band to cut to, or fit the screw to its nut.")
    pd = d - 0.5 * p
    common = dict(spec=spec, basic_major=d, basic_pd=pd, basic_minor=d - p, clearance=c,
                  notes=tuple(notes))
    if spec.is_external:
        return Limits(major_max=d - a, major_min=d - a, pd_max=pd - a,
                      pd_min=pd - a - (t or 0.0), minor_max=d - p - a, minor_min=None,
                      depth=0.5 * p, tip_flat=0.5 * p, **common)
    return Limits(major_max=None, major_min=d + 2 * c + a, pd_max=pd + a + (t or 0.0),
                  pd_min=pd + a, minor_max=None, minor_min=d - p + a, depth=0.5 * p + c,
                  tip_flat=0.5 * p + c, **common)


def catalogue() -> list[ThreadSpec]:
    """Return no threads: square threads have no standard sizes."""
    return []


def classes(spec: ThreadSpec) -> list[str]:
    """Return no classes: a square thread's fit is the allowance and tolerance given."""
    return []
