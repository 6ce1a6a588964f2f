"""Acme (ASME B1.5, 29°, general purpose) and stub Acme (ASME B1.8) threads.

Designations read and written::

    1-5 ACME-2G             size-tpi, series, class (2G, 3G, 4G)
    3/4-6 ACME-2G-LH        left hand, written with a hyphen as B1.5 does
    1/2-10 ACME-3G internal B1.5 uses the same class for screw and nut (no A/B letters); the
                            kind is said in words
    1.000-0.4P-0.8L-ACME-2G multi-start: pitch 0.4, lead 0.8, so two starts
    1/2-10 STUB ACME-2G     stub Acme, class 2G only

A designation without a class gets 2G, the usual general-purpose class, and the notes say so.
The centralizing classes (2C to 6C) are refused: their tables are not built in.
A tpi off the B1.5 series (``1-6 ACME``) is accepted from 1 to 20 tpi, since B1.5 gives its
allowances and tolerances as formulas; the notes say it is not a series size.

Everything is computed and rounded in inches (0.0001 in, as the B1.5 tables print), then
converted once. D is the nominal (basic major) diameter, p the pitch [in]:

- basic height 0.5p (stub 0.3p); basic pitch diameter D − 0.5p (stub D − 0.3p);
  basic minor D − p (stub D − 0.6p)
- clearance c: 0.020 in for 10 tpi and coarser, 0.010 in finer (external minor diameter below
  basic, internal major above basic)
- external: major max D, tolerance 0.05p (at least 0.005 in); PD max = basic − allowance
  (2G 0.008√D, 3G 0.006√D, 4G 0.004√D); minor max = basic minor − c, tolerance 1.5 × the PD
  tolerance
- internal: minor min = basic minor, tolerance 0.05p (at least 0.005 in); PD min = basic;
  major min = D + c, tolerance c
- PD tolerance: 2G 0.006√D + 0.030√p, 3G 0.0028√D + 0.014√p, 4G 0.002√D + 0.010√p; a
  multi-start thread's widened 10 % for 2 starts, 20 % for 3, 30 % for 4 or more
- flat at the root of the screw (the tool tip flat): 0.3707p − 0.259c (stub 0.4224p − 0.259c)

The printed B1.5/B1.8 tables were not at hand: the formulas and the series above are FROM
MEMORY and the tests say so value by value.

References: ASME B1.5 (Acme screw threads), ASME B1.8 (stub Acme screw threads).
"""

from __future__ import annotations

import math
import re
from fractions import Fraction

from shopterm.errors import InvalidEntry, UnknownThread, UnsupportedClass
from shopterm.standards.forms import ACME_29, STUB_ACME_29
from shopterm.standards.spec import Limits, ThreadSpec, inch
from shopterm.units import MM_PER_INCH, round_to

__all__ = ["parse", "limits", "format", "catalogue", "classes", "clearance_in",
           "pd_allowance_in", "pd_tolerance_in", "SERIES_TPI", "DEFAULT_CLASS"]

FAMILY = "acme"
ACME, STUB = "ACME", "STUB ACME"
#: The registry leaves the hand to this family: B1.5 writes ``-LH``.
WRITES_HAND = True

#: ASME B1.5 Acme thread series: nominal size → tpi (from memory). B1.8 stub Acme uses the same.
SERIES_TPI: dict[str, float] = {
    "1/4": 16, "5/16": 14, "3/8": 12, "7/16": 12, "1/2": 10, "5/8": 8, "3/4": 6, "7/8": 6,
    "1": 5, "1-1/8": 5, "1-1/4": 5, "1-3/8": 4, "1-1/2": 4, "1-3/4": 4, "2": 4, "2-1/4": 3,
    "2-1/2": 3, "2-3/4": 3, "3": 2, "3-1/2": 2, "4": 2, "4-1/2": 2, "5": 2,
}
_TPI_RANGE = (1.0, 20.0)

#: Classes offered per series, usual first. B1.8 stub Acme: 2G only (from memory).
CLASSES: dict[str, tuple[str, ...]] = {ACME: ("2G", "3G", "4G"), STUB: ("2G",)}
DEFAULT_CLASS = "2G"
_CENTRALIZING = ("2C", "3C", "4C", "5C", "6C")

#: B1.5 PD allowance (external) factor on √D, and PD tolerance factors on √D and √p [in].
_ALLOWANCE = {"2G": 0.008, "3G": 0.006, "4G": 0.004}                      # from memory
_TOL = {"2G": (0.006, 0.030), "3G": (0.0028, 0.014), "4G": (0.002, 0.010)}  # from memory
_START_WIDEN = {1: 1.0, 2: 1.1, 3: 1.2}   # B1.5 multi-start PD tolerance (from memory)
_START_WIDEN_MANY = 1.3

_HEIGHT = {ACME: 0.5, STUB: 0.3}
_CREST_FLAT = {ACME: 0.3707, STUB: 0.4224}   # basic flat at crest and root, × p
_FLAT_PER_CLEARANCE = 0.259                  # 2·tan 14.5°, on half the diametral clearance
_R = 0.0001                                  # B1.5 tables print to 0.0001 in

_SIZE = r"\d+-\d+/\d+|\d+/\d+|\d*\.\d+|\d+"
_NUM = r"\d*\.?\d+"
_SINGLE = re.compile(
    rf"^(?P<size>{_SIZE})\s*-\s*(?P<tpi>{_NUM})\s*(?P<stub>STUB\s*)?ACME"
    r"(?:\s*-\s*(?P<cls>\w+))?$", re.IGNORECASE)
_MULTI = re.compile(
    rf"^(?P<size>{_SIZE})\s*-\s*(?P<p>{_NUM})\s*P\s*-\s*(?P<l>{_NUM})\s*L\s*-\s*"
    r"(?P<stub>STUB\s*)?ACME(?:\s*-\s*(?P<cls>\w+))?$", re.IGNORECASE)


def _size_value(size: str) -> Fraction:
    if m := re.fullmatch(r"(\d+)-(\d+)/(\d+)", size):
        return int(m[1]) + Fraction(int(m[2]), max(int(m[3]), 1))
    if m := re.fullmatch(r"(\d+)/(\d+)", size):
        if int(m[2]) == 0:
            raise InvalidEntry(f"{size!r}: a fraction cannot have 0 below the line.")
        return Fraction(int(m[1]), int(m[2]))
    return Fraction(size).limit_denominator(10000)


def _size_name(value: Fraction) -> str:
    for name in SERIES_TPI:
        if _size_value(name) == value:
            return name
    return f"{float(value):.4f}".rstrip("0").rstrip(".")


def _g(x: float) -> str:
    return f"{x:.4f}".rstrip("0").rstrip(".")


def clearance_in(tpi: float) -> float:
    """Return the minor/major diameter clearance [in]: 0.020 for 10 tpi and coarser, else 0.010.

    References: ASME B1.5 (from memory)."""
    return 0.020 if tpi <= 10 else 0.010


def pd_allowance_in(cls: str, d_in: float) -> float:
    """Return the external PD allowance [in] of class 2G/3G/4G for nominal size ``d_in`` [in]."""
    return round_to(_ALLOWANCE[cls] * math.sqrt(d_in), _R)


def pd_tolerance_in(cls: str, d_in: float, pitch_in: float, starts: int = 1) -> float:
    """Return the PD tolerance [in]: diameter increment + pitch increment, × multi-start widening.

    References: ASME B1.5 PD tolerance formula (from memory)."""
    fd, fp = _TOL[cls]
    tol = round_to(fd * math.sqrt(d_in), _R) + round_to(fp * math.sqrt(pitch_in), _R)
    return round_to(tol * _START_WIDEN.get(starts, _START_WIDEN_MANY), _R)


def _check_class(cls: str | None, series: str, text: str) -> None:
    if cls is None or cls in CLASSES[series]:
        return
    offered = ", ".join(CLASSES[series])
    if cls in _CENTRALIZING and series == ACME:
        raise UnsupportedClass(
            f"{text!r}: the centralizing classes 2C to 6C are not built into shopterm; it "
            f"offers the general-purpose classes {offered}.")
    raise UnsupportedClass(f"{text!r}: {series} class {cls!r} is not offered; use {offered}.")


def parse(text: str) -> ThreadSpec | None:
    """Return the Acme or stub Acme thread ``text`` designates, or None if it is not written so.

    Reads ``1-5 ACME-2G``, ``3/4-6 ACME-2G-LH`` (the registry takes the hand off),
    ``1.000-0.4P-0.8L-ACME-2G``, ``1/2-10 STUB ACME-2G``. Raises ``UnsupportedClass`` for
    another class, ``UnknownThread`` for a tpi outside 1 to 20 or a size outside 1/4 to 5 in,
    ``InvalidEntry`` for a lead that is not a whole number of pitches.
    References: ASME B1.5 and B1.8 designation (from memory).
    """
    if not isinstance(text, str):
        return None
    s = " ".join(text.strip().split())
    shown = text.strip()
    if m := _MULTI.match(s):
        p_in, lead_in = float(m["p"]), float(m["l"])
        if p_in <= 0:
            raise InvalidEntry(f"{shown!r}: the pitch before P must be greater than zero.")
        starts = round(lead_in / p_in)
        if starts < 1 or abs(lead_in / p_in - starts) > 1e-6:
            raise InvalidEntry(f"{shown!r}: the lead {m['l']}L must be a whole number of "
                               f"pitches {m['p']}P, e.g. {m['size']}-{m['p']}P-"
                               f"{_g(2 * p_in)}L-ACME-2G for two starts.")
        tpi = 1 / p_in
    elif m := _SINGLE.match(s):
        tpi, starts = float(m["tpi"]), 1
    else:
        return None
    series = STUB if m["stub"] else ACME
    value = _size_value(m["size"])
    name = _size_name(value)
    cls = m["cls"].upper() if m["cls"] else None
    if not 0.25 <= value <= 5:
        raise UnknownThread(f"{shown!r}: ASME B1.5 sizes run from 1/4 to 5 in.",
                            (f"1/4-16 {series}-2G", f"5-2 {series}-2G"))
    if not _TPI_RANGE[0] <= round(tpi, 4) <= _TPI_RANGE[1]:
        near = f"{name}-{SERIES_TPI[name]:g} {series}" if name in SERIES_TPI else None
        raise UnknownThread(
            f"{shown!r}: {tpi:.4g} tpi is outside the {_TPI_RANGE[0]:g} to {_TPI_RANGE[1]:g} tpi "
            f"shopterm takes for {series}; for another pitch enter a special thread.",
            (near,) if near else ())
    _check_class(cls, series, shown)
    return ThreadSpec(family=FAMILY, series=series, size=name, major=float(value) * MM_PER_INCH,
                      pitch=MM_PER_INCH / tpi, form=STUB_ACME_29 if series == STUB else ACME_29,
                      tol_class=cls, tpi=round(tpi, 4), starts=starts, native_unit="in")


def format(spec: ThreadSpec) -> str:  # noqa: A001 - the family contract's name
    """Return the designation as B1.5/B1.8 write it: ``1-5 ACME-2G``, ``3/4-6 ACME-2G-LH``,
    ``1.000-0.4P-0.8L-ACME-2G``, ``1/2-10 STUB ACME-2G``; `` internal`` added for a nut."""
    cls = f"-{spec.tol_class}" if spec.tol_class else ""
    if spec.starts > 1:
        p_in = 1 / spec.tpi
        head = (f"{spec.major / MM_PER_INCH:.3f}-{_g(p_in)}P-{_g(p_in * spec.starts)}L-"
                f"{spec.series}")
    else:
        head = f"{spec.size}-{spec.tpi:g} {spec.series}"
    text = head + cls + ("-LH" if spec.hand == "LH" else "")
    return text + " internal" if spec.kind == "internal" else text


def limits(spec: ThreadSpec) -> Limits:
    """Return the limits of size of an Acme or stub Acme thread (class 2G when none is given).

    Computed in inches, rounded to 0.0001 in, then converted to mm (formulas in the module
    notes). ``clearance`` is the diametral clearance c; ``tip_flat`` the flat at the root of the
    screw; ``depth`` the thread height including the clearance, 0.5p + c/2 (stub 0.3p + c/2).
    References: ASME B1.5, ASME B1.8 (from memory).
    """
    if spec.family != FAMILY:
        raise InvalidEntry(f"{spec.size} is not an Acme thread.")
    series = spec.series
    _check_class(spec.tol_class, series, format(spec))
    notes: list[str] = []
    cls = spec.tol_class
    if cls is None:
        cls = DEFAULT_CLASS
        notes.append(f"No class given: limits are for {cls}, the usual general-purpose class.")
    d, p = spec.major / MM_PER_INCH, 1 / spec.tpi
    if spec.size not in SERIES_TPI:
        notes.append("Not a B1.5 series size: computed from the B1.5 formulas.")
    elif SERIES_TPI[spec.size] != spec.tpi and spec.starts == 1:
        notes.append(f"The B1.5 series gives {spec.size} in with {SERIES_TPI[spec.size]:g} tpi: "
                     "this pitch is computed from the B1.5 formulas.")
    if spec.starts > 1:
        notes.append(f"{spec.starts} starts: PD tolerance widened as B1.5 gives for multi-start "
                     "threads; allowances and tolerances go by the pitch.")
    notes.append("B1.5/B1.8 values computed from the formulas as remembered (no printed table "
                 "checked): confirm a close fit against your table or the mating part.")
    c = clearance_in(spec.tpi)
    h = _HEIGHT[series] * p
    pd, minor = d - h, d - 2 * h
    tol = pd_tolerance_in(cls, d, p, spec.starts)
    crest_tol = max(round_to(0.05 * p, _R), 0.005)
    flat = _CREST_FLAT[series] * p - _FLAT_PER_CLEARANCE * c
    common = dict(spec=spec, basic_major=inch(d), basic_pd=inch(pd), basic_minor=inch(minor),
                  depth=inch(h + c / 2), clearance=inch(c), tip_flat=inch(flat))

    def r(x: float) -> float:
        return inch(round_to(x, _R))

    if spec.is_external:
        pd_max = pd - pd_allowance_in(cls, d)
        minor_max = minor - c
        return Limits(major_max=r(d), major_min=r(d - crest_tol), pd_max=r(pd_max),
                      pd_min=r(pd_max - tol), minor_max=r(minor_max),
                      minor_min=r(minor_max - 1.5 * tol), notes=tuple(notes), **common)
    return Limits(major_max=r(d + 2 * c), major_min=r(d + c), pd_max=r(pd + tol), pd_min=r(pd),
                  minor_max=r(minor + crest_tol), minor_min=r(minor), notes=tuple(notes),
                  **common)


def catalogue() -> list[ThreadSpec]:
    """Return the B1.5 Acme series in class 2G, then the same sizes in stub Acme (B1.8), external.

    References: ASME B1.5, ASME B1.8 (series from memory).
    """
    return [parse(f"{size}-{tpi:g} {series}-2G") for series in (ACME, STUB)
            for size, tpi in SERIES_TPI.items()]


def classes(spec: ThreadSpec) -> list[str]:
    """Return the classes offered: 2G, 3G, 4G for Acme (both kinds), 2G for stub Acme."""
    return list(CLASSES[spec.series])
