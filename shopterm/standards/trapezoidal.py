"""ISO metric trapezoidal threads (30°): ISO 2904 profile, ISO 2902 series, ISO 2903 tolerances.

Designations read and written (ISO 2903 style, no spaces)::

    Tr20x4          basic designation: limits for the usual class, 7e (external) / 7H (internal)
    Tr20x4-7e       external, class 7e (also 8e, 7c, 8c)
    Tr20x4-7H       internal, class 7H (also 8H); the letter's case says the kind
    Tr40x14(P7)     multi-start: lead 14, pitch 7, so two starts
    Tr20x4LH        left hand; with a class the hand follows it: Tr20x4-7e LH

A ``Tr20x4`` with no class gets 7e/7H, the medium class ISO 2903 gives for general use, and
the limits' notes say so: at the lathe a nut or screw is cut to a class, never to the basic
profile itself (whose pitch diameters would have no play at all).

Profile (ISO 2904): H1 = 0.5P, clearance ac by pitch (0.15 for P 1.5; 0.25 for P 2 to 5; 0.5 for
P 6 to 12; 1 for P 14 to 44), h3 = H4 = H1 + ac, d2 = D2 = d − 0.5P, d3 = d − 2h3,
D1 = d − P, D4 = d + 2ac. The external root flat (the tool's tip flat) is the basic crest
flat 0.366P less 2·ac·tan 15°.

Tolerances (ISO 2903): d: grade 4, position h; d2: es by pitch (e or c), grade 7 or 8;
d3: es as d2, tolerance 1.25·Td2 below d3 + es; D1: grade 4, EI 0; D2: grade 7 or 8, EI 0;
D4 min = D4. The pitch-only tables (deviations, Td4, TD1) are stored in
``shopterm/data/iso2903_pitch_tables.csv``; Td2/TD2 are computed from the ISO 965-1 style
formula ISO 2903 is built on (Td2 grade 6 = 90·P^0.4·d^0.1 with d the range's geometric mean,
grade factors 1.25 (7), 1.6 (8), internal × 1.32, rounded to the R40 series). The printed
ISO 2903 tables were not at hand: both the stored tables and the formula are FROM MEMORY, and
a Td2 cell may differ by one R40 step from print. Multi-start: Td2 and TD2 × 1.12 (2 starts),
1.25 (3), 1.4 (4), 1.6 (5 or more), also from memory.

References: ISO 2901 (basic profile), ISO 2902 (general plan), ISO 2903 (tolerances),
ISO 2904 (basic dimensions), ISO 965-1 (the tolerance formulas).
"""

from __future__ import annotations

import csv
import math
import re
from dataclasses import dataclass
from functools import cache
from importlib.resources import files

from shopterm.errors import InvalidEntry, UnknownThread, UnsupportedClass
from shopterm.standards.forms import TRAPEZOIDAL_30
from shopterm.standards.spec import Limits, ThreadSpec
from shopterm.units import round_to

__all__ = ["parse", "limits", "format", "catalogue", "classes", "clearance", "root_flat",
           "pitches", "sizes", "pd_tolerance", "DEFAULT_CLASS", "CLASSES"]

FAMILY = "trapezoidal"
SERIES = "Tr"
#: The registry leaves the hand to this family: ISO 2903 writes ``Tr20x4LH`` without a space.
WRITES_HAND = True

#: ISO 2903 tolerance classes offered, usual one first (from memory).
CLASSES: dict[str, tuple[str, ...]] = {"external": ("7e", "8e", "7c", "8c"),
                                       "internal": ("7H", "8H")}
#: The class used when a designation gives none: ISO 2903's medium class.
DEFAULT_CLASS: dict[str, str] = {"external": "7e", "internal": "7H"}  # from memory

#: ISO 2904 clearance ac [mm] by pitch band (P up to and including the first value).
_AC_BANDS: tuple[tuple[float, float], ...] = ((1.5, 0.15), (5.0, 0.25), (12.0, 0.5),
                                              (44.0, 1.0))  # from memory (ISO 2904)
#: ISO 2903 pitch-diameter tolerance diameter ranges [mm], "over, up to and including".
_D_RANGES: tuple[float, ...] = (5.6, 11.2, 22.4, 45.0, 90.0, 180.0)  # from memory
_GRADE_FACTOR = {7: 1.25, 8: 1.6}   # ISO 965-1 grade factors on grade 6 (from memory)
_INTERNAL_FACTOR = 1.32             # ISO 965-1 TD2 = 1.32 Td2 (from memory)
_START_FACTOR = {1: 1.0, 2: 1.12, 3: 1.25, 4: 1.4}  # ISO 2903 multi-start factors (from memory)
_START_FACTOR_MANY = 1.6
_TAN15 = math.tan(math.radians(15.0))

_R40 = (100, 106, 112, 118, 125, 132, 140, 150, 160, 170, 180, 190, 200, 212, 224, 236, 250,
        265, 280, 300, 315, 335, 355, 375, 400, 425, 450, 475, 500, 530, 560, 600, 630, 670,
        710, 750, 800, 850, 900, 950)  # ISO 3 R40 preferred numbers, rounded


@dataclass(frozen=True)
class _Size:
    d: float
    choice: int
    pitches: tuple[float, ...]   # preferred first


def _rows(name: str) -> list[dict[str, str]]:
    text = files("shopterm.data").joinpath(name).read_text(encoding="utf-8")
    lines = [ln for ln in text.splitlines() if ln.strip() and not ln.lstrip().startswith("#")]
    return list(csv.DictReader(lines))


@cache
def _series() -> tuple[_Size, ...]:
    """ISO 2902 sizes: diameter, choice, pitches with the preferred one first."""
    return tuple(_Size(float(r["d"]), int(r["choice"]),
                       (float(r["preferred"]),) + tuple(float(p) for p in r["others"].split()))
                 for r in _rows("iso2902_series.csv"))


@cache
def _pitch_table() -> dict[float, dict[str, int]]:
    """ISO 2903 pitch-only tables [µm]: {P: {c_es, e_es, Td4, TD1_4}}."""
    return {float(r["P_mm"]): {k: int(v) for k, v in r.items() if k != "P_mm"}
            for r in _rows("iso2903_pitch_tables.csv")}


def _fmt(x: float) -> str:
    return f"{x:g}"


def sizes() -> tuple[float, ...]:
    """Return the ISO 2902 nominal diameters [mm] in the table."""
    return tuple(s.d for s in _series())


def pitches(d: float) -> tuple[float, ...]:
    """Return the ISO 2902 pitches of diameter ``d`` [mm], preferred first (empty if none)."""
    for s in _series():
        if abs(s.d - d) < 1e-9:
            return s.pitches
    return ()


def clearance(pitch: float) -> float:
    """Return the ISO 2904 crest clearance ac [mm] for ``pitch`` [mm]."""
    for upto, ac in _AC_BANDS:
        if pitch <= upto + 1e-9:
            return ac
    raise InvalidEntry(f"ISO 2904 gives trapezoidal pitches up to 44 mm, not {_fmt(pitch)}.")


def root_flat(pitch: float) -> float:
    """Return the flat at the external root (at d3) [mm]: 0.366P − 2·ac·tan 15°.

    It is the tip flat of the tool that cuts the screw. References: ISO 2904 profile.
    """
    basic_flat = 0.5 * pitch - 2 * 0.25 * pitch * _TAN15     # 0.366025P at the basic D1 line
    return basic_flat - 2 * clearance(pitch) * _TAN15


def _r40(x: float) -> int:
    decade = 10 ** math.floor(math.log10(x) - 2)
    return round(min((v * decade for v in _R40 + (1000,)), key=lambda v: abs(v - x)))


def pd_tolerance(grade: int, d: float, pitch: float, kind: str = "external",
                 starts: int = 1) -> float:
    """Return Td2 (external) or TD2 (internal) [mm] of ISO 2903 grade 7 or 8.

    Computed: Td2(6) = 90·P^0.4·d^0.1 µm (d the geometric mean of the ISO 2903 diameter range),
    × 1.25 (grade 7) or 1.6 (grade 8), × 1.32 for internal, rounded to R40, then × the
    multi-start factor. References: ISO 2903 / ISO 965-1 formula (from memory).
    """
    if grade not in _GRADE_FACTOR:
        raise UnsupportedClass(f"Grade {grade} is not offered; use 7 or 8.")
    for lo, hi in zip(_D_RANGES, _D_RANGES[1:]):
        if lo < d <= hi:
            break
    else:
        raise UnknownThread(f"Tr{_fmt(d)}: ISO 2903 tolerances go from 5.6 to 180 mm.")
    base = 90 * pitch ** 0.4 * math.sqrt(lo * hi) ** 0.1
    um = _r40(base * _GRADE_FACTOR[grade] * (_INTERNAL_FACTOR if kind == "internal" else 1.0))
    return um * 0.001 * _START_FACTOR.get(starts, _START_FACTOR_MANY)


def _write(d: float, pitch: float, starts: int) -> str:
    if starts > 1:
        return f"Tr{_fmt(d)}x{_fmt(round(starts * pitch, 6))}(P{_fmt(pitch)})"
    return f"Tr{_fmt(d)}x{_fmt(pitch)}"


_NUM = r"\d+(?:[.,]\d+)?"
_DESIGNATION = re.compile(
    rf"^Tr\s*(?P<d>{_NUM})\s*[xX×*]\s*(?P<l>{_NUM})\s*(?:\(\s*P\s*(?P<p>{_NUM})\s*\))?"
    r"\s*(?P<lh1>LH)?\s*(?:-\s*(?P<cls>\w+))?\s*(?P<lh2>LH)?$", re.IGNORECASE)


def _num(text: str) -> float:
    return float(text.replace(",", "."))


def _check_pair(d: float, pitch: float, text: str) -> None:
    ps = pitches(d)
    if not ps:
        near = sorted(sizes(), key=lambda x: abs(x - d))[:2]
        raise UnknownThread(
            f"{text!r}: ISO 2902 has no Tr{_fmt(d)} in shopterm's table (Tr8 to Tr100).",
            tuple(_write(n, pitches(n)[0], 1) for n in near))
    if not any(abs(p - pitch) < 1e-9 for p in ps):
        near = sorted(ps, key=lambda p: abs(p - pitch))[:2]
        others = f" (and {', '.join(_fmt(p) for p in ps[1:])})" if len(ps) > 1 else ""
        raise UnknownThread(f"ISO 2902 gives Tr{_fmt(d)} with P {_fmt(ps[0])}{others}, not "
                            f"P {_fmt(pitch)}.", tuple(_write(d, p, 1) for p in near))


def _class_kind(cls: str, text: str) -> str:
    for kind, valid in CLASSES.items():
        if cls in valid:
            return kind
    raise UnsupportedClass(
        f"{text!r}: ISO 2903 class {cls!r} is not offered. External: "
        f"{', '.join(CLASSES['external'])}; internal: {', '.join(CLASSES['internal'])}.")


def parse(text: str) -> ThreadSpec | None:
    """Return the trapezoidal thread ``text`` designates, or None if it is not written so.

    Reads ``Tr20x4``, ``Tr20x4-7e``, ``Tr20x4-7H``, ``Tr40x14(P7)``, ``Tr20x4LH``,
    ``Tr20x4-7e LH`` (spaces and a decimal comma allowed). Raises ``UnknownThread`` for a size
    or pitch ISO 2902 lacks (naming the nearest), ``UnsupportedClass`` for another class,
    ``InvalidEntry`` for a lead that is not a whole number of pitches.
    References: ISO 2903 (designation), ISO 2902.
    """
    if not isinstance(text, str):
        return None
    m = _DESIGNATION.match(" ".join(text.strip().split()))
    if not m:
        return None
    shown = text.strip()
    d, lead = _num(m["d"]), _num(m["l"])
    pitch = _num(m["p"]) if m["p"] else lead
    if pitch <= 0 or d <= 0:
        raise InvalidEntry(f"{shown!r}: diameter and pitch must be greater than zero.")
    starts = round(lead / pitch)
    if starts < 1 or abs(lead / pitch - starts) > 1e-9:
        raise InvalidEntry(f"{shown!r}: the lead {_fmt(lead)} must be a whole number of pitches "
                           f"P{_fmt(pitch)}, e.g. {_write(d, pitch, 2)} for two starts.")
    _check_pair(d, pitch, shown)
    cls = m["cls"]
    kind = _class_kind(cls, shown) if cls else "external"
    return ThreadSpec(family=FAMILY, series=SERIES, size=f"Tr{_fmt(d)}", major=d, pitch=pitch,
                      form=TRAPEZOIDAL_30, kind=kind, tol_class=cls, starts=starts,
                      hand="LH" if (m["lh1"] or m["lh2"]) else "RH", native_unit="mm")


def format(spec: ThreadSpec) -> str:  # noqa: A001 - the family contract's name
    """Return the designation as ISO 2903 writes it: ``Tr40x14(P7)-7e``, ``Tr20x4LH``,
    ``Tr20x4-7e LH``. References: ISO 2903 designation clause (from memory)."""
    head = _write(spec.major, spec.pitch, spec.starts)
    lh = spec.hand == "LH"
    if spec.tol_class:
        return f"{head}-{spec.tol_class}" + (" LH" if lh else "")
    return head + ("LH" if lh else "")


def _mm3(x: float) -> float:
    return round(round_to(x, 0.001), 3)


def limits(spec: ThreadSpec) -> Limits:
    """Return the limits of size of a trapezoidal thread (class 7e/7H when none is given).

    External: d max = d, d min = d − Td4; d2 max = d2 + es, d2 min = d2 max − Td2;
    d3 max = d3 + es, d3 min = d3 max − 1.25·Td2. Internal: D4 min = d + 2ac;
    D2 min = D2, D2 max = D2 + TD2; D1 min = D1, D1 max = D1 + TD1. ``depth`` is h3 (external)
    or H4 (internal), ``clearance`` ac, ``tip_flat`` the root flat at d3.
    References: ISO 2904 (profile), ISO 2903 (tolerances; from memory, see module notes).
    """
    if spec.family != FAMILY:
        raise InvalidEntry(f"{spec.size} is not a trapezoidal thread.")
    d, p = spec.major, spec.pitch
    _check_pair(d, p, format(spec))
    notes: list[str] = []
    cls = spec.tol_class
    if cls is None:
        cls = DEFAULT_CLASS[spec.kind]
        notes.append(f"No class given: limits are for {cls}, the ISO 2903 medium class for "
                     "general use.")
    elif cls not in CLASSES[spec.kind]:
        _class_kind(cls, format(spec))      # refuses a class ISO 2903 does not have
        raise InvalidEntry(f"Class {cls} is not for an {spec.kind} thread: use "
                           f"{', '.join(CLASSES[spec.kind])}.")
    if spec.starts > 1:
        notes.append(f"{spec.starts} starts: pitch-diameter tolerance widened by the ISO 2903 "
                     "multi-start factor; tolerances go by the pitch, not the lead.")
    notes.append("ISO 2903 tolerances as remembered (no printed copy checked): confirm a close "
                 "fit against your table or the mating part.")
    ac = clearance(p)
    h3 = 0.5 * p + ac
    d2, d3, d1 = d - 0.5 * p, d - 2 * h3, d - p
    grade = int(cls[0])
    td2 = pd_tolerance(grade, d, p, spec.kind, spec.starts)
    row = _pitch_table().get(p)
    if row is None:
        raise UnknownThread(f"Tr P{_fmt(p)}: the ISO 2903 pitch table in shopterm has no row.")
    common = dict(spec=spec, basic_major=d, basic_pd=d2, depth=h3, clearance=ac,
                  tip_flat=root_flat(p))
    if spec.kind == "external":
        es = row[f"{cls[1]}_es"] * 0.001
        d3_max = d3 + es
        return Limits(basic_minor=d3, major_max=_mm3(d), major_min=_mm3(d - row["Td4"] * 0.001),
                      pd_max=_mm3(d2 + es), pd_min=_mm3(d2 + es - td2),
                      minor_max=_mm3(d3_max), minor_min=_mm3(d3_max - 1.25 * td2),
                      notes=tuple(notes), **common)
    return Limits(basic_minor=d1, major_max=None, major_min=_mm3(d + 2 * ac),
                  pd_max=_mm3(d2 + td2), pd_min=_mm3(d2),
                  minor_max=_mm3(d1 + row["TD1_4"] * 0.001), minor_min=_mm3(d1),
                  notes=tuple(notes), **common)


@cache
def _catalogue() -> tuple[ThreadSpec, ...]:
    return tuple(ThreadSpec(family=FAMILY, series=SERIES, size=f"Tr{_fmt(s.d)}", major=s.d,
                            pitch=p, form=TRAPEZOIDAL_30, tol_class=DEFAULT_CLASS["external"],
                            native_unit="mm")
                 for s in _series() for p in s.pitches)


def catalogue() -> list[ThreadSpec]:
    """Return every ISO 2902 size and pitch (Tr8 to Tr100), external, class 7e.

    References: ISO 2902, ISO 2903.
    """
    return list(_catalogue())


def classes(spec: ThreadSpec) -> list[str]:
    """Return the ISO 2903 classes offered for the spec's kind, the usual one (7e/7H) first."""
    return list(CLASSES[spec.kind])
