"""Special threads: any diameter and pitch (or tpi) on a 60°, 55° or 47.5° form, with the fit the
user gives (allowance and tolerances) instead of a standard's class.

Designation (shopterm's own, round-trips through ``parse``/``format``)::

    SPECIAL <diameter>x<pitch> <angle> [A<allowance>] [T<pd tolerance>] [TD<major tolerance>]
            [S<starts>] [internal]

- ``<pitch>`` is in mm (``20x1.25``) or threads per inch with ``TPI`` (``0.4375x28TPI``).
- ``<diameter>`` is in inches when the pitch is in TPI and in mm otherwise; a suffix ``mm`` or
  ``in`` says otherwise (``SPECIAL 10mmx26TPI 55``). Fractions are read (``7/16x28TPI``).
- ``<angle>`` is the included flank angle: 60, 55 or 47.5 (60 when left out). The basic
  proportions are those of the form with that angle (ISO 68-1, BS 84 Whitworth, BS 93 BA).
- ``A``, ``T`` and ``TD`` are in the diameter's unit. The allowance always goes towards less
  metal (a screw smaller, a nut larger), so it is written without a sign (a leading ``-`` is
  read as the same amount). ``T`` is the pitch-diameter tolerance, ``TD`` the major-diameter
  tolerance. ``S2`` is a two-start thread (lead = 2 × pitch).
- Examples: ``SPECIAL 20x1.25 60``, ``SPECIAL 0.4375x28TPI 55 A0.002 T0.004``,
  ``SPECIAL 12x1.5 60 T0.15 S2 internal``.

Limits: with no ``T`` the pitch-diameter band is the basic pitch diameter moved by the allowance,
with no width (the notes say so). ``ThreadSpec.allowance`` holds the allowance signed as a
deviation (negative for external, positive for internal, as ``spec.py`` documents); ``limits``
applies its size towards less metal for the spec's kind.

References: ISO 68-1 (60° basic profile, h3 = 17/24 H, d3 = d − 1.226869P); BS 84 (55°);
BS 93 (47.5°); ISO 68-1 and ISO 965-1/-2, BS 84, BS 93.
"""

from __future__ import annotations

import math
import re
from decimal import Decimal
from fractions import Fraction

from shopterm.errors import InvalidEntry
from shopterm.standards.forms import ISO_60, form_for_angle
from shopterm.standards.spec import Limits, ThreadSpec
from shopterm.units import MM_PER_INCH, Unit, from_mm, to_mm

FAMILY = "special"
SERIES = "special"

#: Included angles a special thread may have [deg]: the forms whose proportions shopterm has.
ANGLES: tuple[float, ...] = (60.0, 55.0, 47.5)

#: ISO 68-1 external thread depth h3 = 17/24 H and d − d3 = 2·h3.
_ISO_H3 = 17 / 24 * ISO_60.height          # 0.613435
#: ISO 965-1 minimum external root radius 0.125P for 6g.
_ISO_ROOT_R_MIN = 0.125

GRAMMAR = ("SPECIAL <diameter>x<pitch> <angle> [A<allowance>] [T<pd tolerance>] "
           "[TD<major tolerance>] [S<starts>], e.g. SPECIAL 20x1.25 60 or "
           "SPECIAL 0.4375x28TPI 55 A0.002 T0.004")

_NUM = r"(?:\d+-\d+/\d+|\d+/\d+|\d+(?:\.\d*)?|\.\d+)"
_HEAD = re.compile(
    rf"^SPECIAL\s+(?P<d>{_NUM})\s*(?P<du>mm|in)?\s*[x×*]\s*(?P<p>{_NUM})\s*(?P<pu>TPI|mm)?"
    r"(?P<rest>(?:\s+.*)?)$", re.IGNORECASE)
_TOKEN = re.compile(r"^(?:(?P<angle>\d+(?:\.\d+)?)|A(?P<a>[+-]?\d*\.?\d+)|TD(?P<td>\d*\.?\d+)|"
                    r"T(?P<t>\d*\.?\d+)|S(?P<s>\d+)|(?P<kind>internal|external))$",
                    re.IGNORECASE)


def _num(text: str) -> float:
    s = text.strip()
    if m := re.fullmatch(r"(\d+)-(\d+)/(\d+)", s):
        den = int(m[3])
        if den == 0:
            raise InvalidEntry(f"{text!r}: a fraction cannot have 0 below the line.")
        return float(int(m[1]) + Fraction(int(m[2]), den))
    if m := re.fullmatch(r"(\d+)/(\d+)", s):
        if int(m[2]) == 0:
            raise InvalidEntry(f"{text!r}: a fraction cannot have 0 below the line.")
        return float(Fraction(int(m[1]), int(m[2])))
    return float(s)


def _g(value: float) -> str:
    """Return a number written short and exact enough to read back (10 significant figures),
    never in exponent form (the designation grammar has none)."""
    return "{:f}".format(Decimal(f"{value:.10g}"))


def _positive(value: float | None, what: str, how: str) -> None:
    if value is None:
        return
    if isinstance(value, bool) or not isinstance(value, (int, float)) or not math.isfinite(value):
        raise InvalidEntry(f"The {what} must be a number: {how}.")
    if value <= 0:
        raise InvalidEntry(f"The {what} must be greater than zero: {how}.")


def _external_root_offset(angle: float) -> float:
    """Return (d − external minor)/P for the form: d3 for 60° (ISO 68-1), 2·depth otherwise."""
    form = form_for_angle(angle)
    return 2 * _ISO_H3 if angle == 60.0 else form.minor_offset


def make(major_mm: float, *, pitch_mm: float | None = None, tpi: float | None = None,
         angle_deg: float = 60, kind: str = "external", allowance_mm: float = 0.0,
         pd_tolerance_mm: float | None = None, major_tolerance_mm: float | None = None,
         starts: int = 1, unit: Unit = "mm") -> ThreadSpec:
    """Return a special thread spec, checked to be a thread that can be cut.

    major_mm [mm] basic major diameter; pitch_mm [mm] or tpi [1/in] (exactly one);
    angle_deg [deg] 60, 55 or 47.5; kind 'external'/'internal'; allowance_mm [mm] ≥ 0, applied
    towards less metal on major and pitch diameter; pd_tolerance_mm [mm] and
    major_tolerance_mm [mm] > 0 or None; starts ≥ 1; unit: the unit the designation shows.
    Raises ``InvalidEntry`` saying what is wrong.
    References: ISO 68-1, BS 84, BS 93 basic forms.
    """
    if unit not in ("mm", "in"):
        raise InvalidEntry(f"Unknown unit {unit!r}: use mm or in.")
    if kind not in ("external", "internal"):
        raise InvalidEntry(f"{kind!r} is not a kind of thread: use external or internal.")
    _positive(major_mm, "diameter", "type the major diameter")
    if (pitch_mm is None) == (tpi is None):
        raise InvalidEntry("Give the pitch in mm or the threads per inch, not both and not "
                           "neither.")
    _positive(pitch_mm, "pitch", "type the pitch in mm")
    _positive(tpi, "threads per inch", "type the threads per inch")
    pitch = pitch_mm if pitch_mm is not None else MM_PER_INCH / tpi
    try:
        angle = float(angle_deg)
    except (TypeError, ValueError):
        raise InvalidEntry("The form angle must be 60, 55 or 47.5 degrees.") from None
    if angle not in ANGLES:
        raise InvalidEntry(f"A special thread can have a 60, 55 or 47.5 degree form, not "
                           f"{angle:g}: shopterm has the basic proportions of those three.")
    form = form_for_angle(angle)
    if isinstance(starts, bool) or not isinstance(starts, int) or starts < 1:
        raise InvalidEntry("The number of starts must be a whole number, 1 or more.")
    if isinstance(allowance_mm, bool) or not isinstance(allowance_mm, (int, float)) \
            or not math.isfinite(allowance_mm):
        raise InvalidEntry("The allowance must be a number (0 for none).")
    if allowance_mm < 0:
        raise InvalidEntry("Give the allowance as a positive amount (or 0): shopterm always "
                           "applies it towards less metal, smaller for a screw, larger for a nut.")
    _positive(pd_tolerance_mm, "pitch-diameter tolerance",
              "leave it out for a band with no width")
    _positive(major_tolerance_mm, "major-diameter tolerance", "leave it out to have none")

    d_txt = f"{_g(from_mm(major_mm, unit))} {unit}"
    p_txt = f"{_g(tpi)} tpi" if tpi is not None else f"{_g(pitch)} mm pitch"
    if pitch >= major_mm:
        raise InvalidEntry(f"A {p_txt} is too coarse for a {d_txt} diameter: the pitch must be "
                           "smaller than the diameter.")
    root = _external_root_offset(angle) if kind == "external" else form.minor_offset
    if root * pitch >= major_mm:
        raise InvalidEntry(
            f"A {angle:g} degree thread of {p_txt} is {from_mm(root * pitch / 2, unit):.4g} "
            f"{unit} deep, as deep as the {d_txt} diameter's radius or more: use a finer pitch "
            "or a larger diameter.")
    basic_pd = major_mm - form.pd_offset * pitch
    pd_least = basic_pd - allowance_mm - (pd_tolerance_mm or 0.0)
    if kind == "external" and pd_least <= major_mm - root * pitch:
        raise InvalidEntry("The allowance and pitch-diameter tolerance take the pitch diameter "
                           "below the root of the thread: make them smaller.")
    if kind == "external" and major_mm - allowance_mm - (major_tolerance_mm or 0.0) <= basic_pd:
        raise InvalidEntry("The allowance and major-diameter tolerance take the major diameter "
                           "below the pitch diameter: make them smaller.")
    signed = -allowance_mm if kind == "external" else allowance_mm
    return ThreadSpec(family=FAMILY, series=SERIES, size=d_txt.replace(" ", ""),
                      major=float(major_mm), pitch=float(pitch), form=form, kind=kind,
                      tol_class=None, tpi=float(tpi) if tpi is not None else None,
                      starts=starts, native_unit=unit, allowance=float(signed),
                      pd_tolerance=None if pd_tolerance_mm is None else float(pd_tolerance_mm),
                      major_tolerance=(None if major_tolerance_mm is None
                                       else float(major_tolerance_mm)))


def parse(text: str) -> ThreadSpec | None:
    """Return the special thread ``text`` designates, or None if it does not start ``SPECIAL``.

    text: e.g. ``SPECIAL 20x1.25 60`` or ``SPECIAL 0.4375x28TPI 55 A0.002 T0.004 S2``.
    Raises ``InvalidEntry`` saying what is wrong with a ``SPECIAL`` designation.
    References: shopterm's own designation (this module's docstring).
    """
    if not isinstance(text, str):
        return None
    s = " ".join(text.strip().split())
    if not re.match(r"^SPECIAL\b", s, re.IGNORECASE):
        return None
    m = _HEAD.match(s)
    if m is None:
        raise InvalidEntry(f"{text.strip()!r}: write a special thread as {GRAMMAR}.")
    pitch_tpi = (m["pu"] or "").upper() == "TPI"
    unit: Unit = (m["du"].lower() if m["du"] else ("in" if pitch_tpi else "mm"))  # type: ignore
    fields: dict[str, str] = {}
    for token in m["rest"].split():
        t = _TOKEN.match(token)
        if t is None:
            raise InvalidEntry(f"{text.strip()!r}: {token!r} is not understood; write a special "
                               f"thread as {GRAMMAR}.")
        key, value = next((k, v) for k, v in t.groupdict().items() if v is not None)
        if key in fields:
            raise InvalidEntry(f"{text.strip()!r}: the {_FIELD_NAMES[key]} is given twice.")
        fields[key] = value
    major = to_mm(_num(m["d"]), unit)
    pitch_value = _num(m["p"])

    def length(key: str) -> float | None:
        return to_mm(abs(float(fields[key])), unit) if key in fields else None

    return make(major,
                pitch_mm=None if pitch_tpi else pitch_value,
                tpi=pitch_value if pitch_tpi else None,
                angle_deg=float(fields.get("angle", 60)),
                kind=fields.get("kind", "external").lower(),
                allowance_mm=length("a") or 0.0,
                pd_tolerance_mm=length("t"),
                major_tolerance_mm=length("td"),
                starts=int(fields.get("s", 1)),
                unit=unit)


_FIELD_NAMES = {"angle": "form angle", "a": "allowance", "t": "pitch-diameter tolerance",
                "td": "major-diameter tolerance", "s": "number of starts", "kind": "kind"}


def format(spec: ThreadSpec) -> str:
    """Return the special designation of ``spec``; ``parse`` reads it back to the same thread.

    References: shopterm's own designation (this module's docstring).
    """
    unit = spec.native_unit
    default_unit = "in" if spec.tpi is not None else "mm"
    d = _g(from_mm(spec.major, unit)) + ("" if unit == default_unit else unit)
    p = f"{_g(spec.tpi)}TPI" if spec.tpi is not None else _g(spec.pitch)
    return " ".join([f"SPECIAL {d}x{p}", f"{spec.form.angle_deg:g}", *fit_words(spec)])


def fit_words(spec: ThreadSpec) -> list[str]:
    """Return the fit written after a user-fitted thread's size: ``A…``, ``T…``, ``TD…``
    (in the spec's own unit), ``S<starts>`` and ``internal``, each only when it says something.
    """
    unit, parts = spec.native_unit, []
    if spec.allowance and float(a := _g(from_mm(abs(spec.allowance), unit))) != 0:
        parts.append(f"A{a}")
    if spec.pd_tolerance is not None:
        parts.append(f"T{_g(from_mm(spec.pd_tolerance, unit))}")
    if spec.major_tolerance is not None:
        parts.append(f"TD{_g(from_mm(spec.major_tolerance, unit))}")
    if spec.starts != 1:
        parts.append(f"S{spec.starts}")
    if spec.kind == "internal":
        parts.append("internal")
    return parts


def limits(spec: ThreadSpec) -> Limits:
    """Return the limits of size of a special thread from its form, allowance and tolerances [mm].

    spec: a special thread (from ``make`` or ``parse``).
    External: d max = d − a, d min = d max − Td; d2 max = d2 − a, d2 min = d2 max − Td2;
    minor max = d − root·P − a. Internal: D min = D + a, D2 min = D2 + a, D2 max = D2 min + TD2,
    D1 min = D1 + a. a = allowance, d2 = basic pitch diameter of the form.
    References: ISO 68-1 (60°: d2 = d − 0.649519P, D1 = d − 1.082532P, d3 = d − 1.226869P,
    h3 = 0.613435P, H1 = 0.541266P); BS 84 (55°); BS 93 (47.5°).
    """
    if spec.family != FAMILY:
        raise InvalidEntry(f"{spec.size} is not a special thread.")
    form, p, d = spec.form, spec.pitch, spec.major
    a = abs(spec.allowance or 0.0)
    td2, td = spec.pd_tolerance, spec.major_tolerance
    basic_pd = d - form.pd_offset * p
    basic_minor = d - form.minor_offset * p
    is60 = form.angle_deg == 60.0
    notes = ["Special thread: these limits come from the allowance and tolerances given, not "
             "from a standard."]
    if td2 is None:
        side = "minus" if spec.is_external else "plus"
        notes.append(f"No pitch-diameter tolerance given: the band is the basic pitch diameter "
                     f"{side} the allowance, with no width. Give a tolerance (T) for a band to "
                     "cut to.")
    if spec.is_external:
        major_max = d - a
        major_min = major_max - td if td is not None else major_max
        pd_max = basic_pd - a
        pd_min = pd_max - td2 if td2 is not None else pd_max
        minor_max = d - _external_root_offset(form.angle_deg) * p - a
        minor_min = None
        depth = (_ISO_H3 if is60 else form.depth) * p
        if is60:
            r_min, r_max = _ISO_ROOT_R_MIN * p, None
        else:
            r_min = r_max = form.root_radius * p
        if td is None:
            notes.append("No major-diameter tolerance given: turn the blank to the major "
                         "maximum.")
    else:
        major_min = d + a
        major_max = major_min + td if td is not None else None
        pd_min = basic_pd + a
        pd_max = pd_min + td2 if td2 is not None else pd_min
        minor_min = basic_minor + a
        minor_max = None
        depth = form.depth * p
        r_min = r_max = (None if is60 else form.root_radius * p)
        notes.append("No upper limit for the nut's minor diameter: bore to at least the minor "
                     "minimum.")
    return Limits(spec=spec, basic_major=d, basic_pd=basic_pd, basic_minor=basic_minor,
                  major_max=major_max, major_min=major_min, pd_max=pd_max, pd_min=pd_min,
                  minor_max=minor_max, minor_min=minor_min, depth=depth, notes=tuple(notes),
                  root_radius_min=r_min, root_radius_max=r_max)


def catalogue() -> list[ThreadSpec]:
    """Return no threads: special threads are made to order, not listed.

    References: none (no standard sizes).
    """
    return []


def classes(spec: ThreadSpec) -> list[str]:
    """Return no classes: a special thread's fit is the allowance and tolerances given.

    References: none.
    """
    return []
