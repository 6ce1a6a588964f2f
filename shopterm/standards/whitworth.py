"""Whitworth-form threads (55°): BSW, BSF and the model-engineer 32 and 40 tpi series.

Designations read and written here:

``3/8 BSW``, ``1-1/2 BSW``, ``3/8-16 BSW`` (the tpi may be given; it must be the series' own),
``1/4 BSF``, ``1/4x40 ME``, ``3/8-32 ME`` (the tpi is required for ME).
An internal thread is written with a trailing ``internal`` (``3/8 BSW internal``).

Limits are basic sizes only. BS 84 names classes (external close, medium, free; internal medium,
normal), but their tolerance tables are not built into shopterm, so a class word is refused with
a message that says how to get basic sizes or how to give your own fit as a special thread.
Model-engineer threads have no published tolerance table at all.

Basic sizes are computed and rounded in inches as BS 84 prints them (0.0001 in), then converted
to mm once: E = D − 0.640327P, core = D − 1.280654P, depth 0.640327P, crest and root radius
0.137329P.

References: BS 84 (Whitworth form, BSW and BSF series); model-engineer series as printed in published model-engineering
thread tables (sizes in use at 32 and 40 tpi).
"""

from __future__ import annotations

import difflib
import re
from fractions import Fraction

from shopterm.errors import InvalidEntry, UnknownThread, UnsupportedClass
from shopterm.standards.forms import WHITWORTH_55
from shopterm.standards.spec import Limits, ThreadSpec, inch
from shopterm.units import MM_PER_INCH, round_to

FAMILY = "whitworth"

#: BS 84 basic-form factors, as multiples of the pitch P (BS 84, as printed by gauge makers).
PD_FACTOR = 0.640327      # D − E
CORE_FACTOR = 1.280654    # D − core
DEPTH_FACTOR = 0.640327   # thread depth on radius, 2/3 H
RADIUS_FACTOR = 0.137329  # crest and root radius

#: Basic sizes are printed to this resolution [in] (BS 84 tables).
_ROUND_IN = 0.0001

#: BSW: nominal size → tpi. BS 84 table. Sizes marked [P] were read in print
#: (1/8-40, 1/4-20, 3/8-16, 1/2-12, 3/4-10, 1-8); the rest from memory.
BSW: dict[str, float] = {
    "1/8": 40,     # BS 84 [P]
    "3/16": 24,    # from memory
    "1/4": 20,     # BS 84 [P]
    "5/16": 18,    # from memory
    "3/8": 16,     # BS 84 [P]
    "7/16": 14,    # from memory
    "1/2": 12,     # BS 84 [P]
    "9/16": 12,    # from memory
    "5/8": 11,     # from memory
    "11/16": 11,   # from memory
    "3/4": 10,     # BS 84 [P]
    "7/8": 9,      # from memory
    "1": 8,        # BS 84 [P]
    "1-1/8": 7,    # from memory
    "1-1/4": 7,    # from memory
    "1-3/8": 6,    # from memory
    "1-1/2": 6,    # from memory
    "1-5/8": 5,    # from memory
    "1-3/4": 5,    # from memory
    "1-7/8": 4.5,  # from memory
    "2": 4.5,      # from memory
}

#: BSF: nominal size → tpi. BS 84 table. [P] read in print: 1/4-26, 5/16-22,
#: 3/8-20, 7/16-18, 1/2-16; the rest from memory.
BSF: dict[str, float] = {
    "3/16": 32,    # from memory
    "7/32": 28,    # from memory
    "1/4": 26,     # BS 84 [P]
    "9/32": 26,    # from memory
    "5/16": 22,    # BS 84 [P]
    "3/8": 20,     # BS 84 [P]
    "7/16": 18,    # BS 84 [P]
    "1/2": 16,     # BS 84 [P]
    "9/16": 16,    # from memory
    "5/8": 14,     # from memory
    "11/16": 14,   # from memory
    "3/4": 12,     # from memory
    "7/8": 11,     # from memory
    "1": 10,       # from memory
}

#: Model-engineer series: Whitworth form at a constant 40 or 32 tpi. Sizes in use printed in
#: published model-engineering tables [P]: 5/32, 3/16, 7/32, 1/4 x 40; 5/16, 3/8 x 32; 3/8 x 40.
#: The others are from memory.
ME: dict[int, tuple[str, ...]] = {
    40: ("1/8",        # from memory
         "5/32",       # [P]
         "3/16",       # [P]
         "7/32",       # [P]
         "1/4",        # [P]
         "9/32",       # from memory
         "5/16",       # from memory
         "3/8",        # [P]
         "7/16",       # from memory
         "1/2"),       # from memory
    32: ("1/4",        # from memory
         "9/32",       # from memory
         "5/16",       # [P]
         "3/8",        # [P]
         "7/16",       # from memory
         "1/2",        # from memory
         "9/16",       # from memory
         "5/8",        # from memory
         "11/16",      # from memory
         "3/4",        # from memory
         "7/8",        # from memory
         "1"),         # from memory
}

#: BS 84 classes by kind [P]. Named so a class word gets a clear answer.
BS84_CLASSES: dict[str, tuple[str, ...]] = {
    "external": ("close", "medium", "free"),
    "internal": ("medium", "normal"),
}

_SERIES_WORDS = {"BSW": "BSW", "WHITWORTH": "BSW", "WHIT": "BSW", "BSF": "BSF", "ME": "ME"}
_KIND_WORDS = {"internal": "internal", "external": "external"}

_SIZE = r"\d+[-\s]\d+/\d+|\d+/\d+|\d*\.\d+|\d+"
_DESIGNATION = re.compile(
    rf"^(?P<size>{_SIZE})\s*(?:\"|in)?\s*(?:(?:-|x|X|×)\s*(?P<tpi>\d+(?:\.\d+)?)\s*(?:TPI)?)?"
    r"\s*(?P<series>BSW|BSF|ME|WHITWORTH|WHIT)\b"
    r"(?:\s*[-\s]\s*(?P<cls>(?!internal\b|external\b)[A-Za-z]+))?"
    r"(?:\s+(?P<kind>internal|external))?\s*$",
    re.IGNORECASE,
)


def _size_value(size: str) -> Fraction:
    """Return a size as written (``3/8``, ``1-1/2``, ``1 1/2``, ``.375``, ``1``) as an exact
    Fraction of an inch."""
    s = size.strip()
    if m := re.fullmatch(r"(\d+)[-\s](\d+)/(\d+)", s):
        return int(m[1]) + Fraction(int(m[2]), int(m[3]))
    if m := re.fullmatch(r"(\d+)/(\d+)", s):
        if int(m[2]) == 0:
            raise InvalidEntry(f"{size!r}: a fraction cannot have 0 below the line.")
        return Fraction(int(m[1]), int(m[2]))
    return Fraction(s).limit_denominator(10000)


def _canonical_size(value: Fraction, sizes) -> str | None:
    for name in sizes:
        if _size_value(name) == value:
            return name
    return None


def _series_tpi(series: str) -> dict[str, float]:
    return BSW if series == "BSW" else BSF


def _make(series: str, size: str, tpi: float, kind: str = "external") -> ThreadSpec:
    return ThreadSpec(family=FAMILY, series=series, size=size,
                      major=float(_size_value(size)) * MM_PER_INCH, pitch=MM_PER_INCH / tpi,
                      form=WHITWORTH_55, kind=kind, tol_class=None, tpi=float(tpi),
                      native_unit="in")


def _fmt_tpi(tpi: float) -> str:
    return f"{tpi:g}"


def _other_series_with(value: Fraction, tpi: float) -> list[str]:
    """Return designations of other Whitworth-form series that have this size at this tpi."""
    out = []
    for series in ("BSW", "BSF"):
        name = _canonical_size(value, _series_tpi(series))
        if name is not None and _series_tpi(series)[name] == tpi:
            out.append(f"{name} {series}")
    for me_tpi, sizes in ME.items():
        name = _canonical_size(value, sizes)
        if name is not None and me_tpi == tpi:
            out.append(f"{name}x{me_tpi} ME")
    return out


def _near_sizes(size: str, sizes, fmt) -> tuple[str, ...]:
    hits = difflib.get_close_matches(size, list(sizes), n=3, cutoff=0.4)
    return tuple(fmt(h) for h in hits)


def _refuse_class(spec: ThreadSpec, word: str) -> None:
    base = format(spec)
    inch_d = spec.major / MM_PER_INCH
    special = f"SPECIAL {inch_d:.10g}x{_fmt_tpi(spec.tpi)}TPI 55 A<allowance> T<tolerance>"
    if spec.series == "ME":
        raise UnsupportedClass(
            f"Model-engineer threads have no published tolerance table, so there is no class "
            f"{word!r}: type {base!r} for basic sizes, or give your own allowance and "
            f"pitch-diameter tolerance (in inches) as a special thread: {special!r}.",
            (base,))
    all_words = sorted({w for ws in BS84_CLASSES.values() for w in ws})
    if word.lower() not in all_words:
        raise UnsupportedClass(
            f"{word!r} is not a BS 84 class (external: close, medium, free; internal: medium, "
            f"normal). shopterm gives BSW and BSF as basic sizes: type {base!r}.", (base,))
    raise UnsupportedClass(
        f"The BS 84 {word} class tolerances are not built into shopterm (no printed BS 84 table "
        f"was at hand to build them from): type {base!r} for basic sizes, or give the fit from your BS 84 table as a special thread (allowance and "
        f"tolerance in inches): {special!r}.", (base,))


def parse(text: str) -> ThreadSpec | None:
    """Return the BSW, BSF or ME thread ``text`` names, or None if it is not written that way.

    text: e.g. ``3/8 BSW``, ``1/4 BSF``, ``1/4x40 ME``, ``3/8-32 ME``.
    Raises ``UnknownThread`` for a size or tpi the series does not have, ``UnsupportedClass``
    for a class word (tolerance classes are not built in).
    References: BS 84; published model-engineering tables (model-engineer series).
    """
    if not isinstance(text, str):
        return None
    s = " ".join(text.strip().split())
    m = _DESIGNATION.match(s)
    if m is None:
        return None
    series = _SERIES_WORDS[m["series"].upper()]
    kind = _KIND_WORDS[m["kind"].lower()] if m["kind"] else "external"
    value = _size_value(m["size"])
    given_tpi = float(m["tpi"]) if m["tpi"] else None
    if value <= 0:
        raise InvalidEntry(f"{text.strip()!r}: the size must be greater than zero.")

    if series == "ME":
        if given_tpi is None:
            raise InvalidEntry(f"{text.strip()!r}: say the threads per inch of a model-engineer "
                               f"thread, e.g. {m['size']}x40 ME or {m['size']}x32 ME.")
        if given_tpi not in ME:
            raise UnknownThread(
                f"{text.strip()!r}: the model-engineer series is 32 or 40 tpi. For another "
                f"pitch enter a special thread, e.g. SPECIAL {float(value):.10g}x"
                f"{given_tpi:g}TPI 55.", tuple(f"{m['size']}x{t} ME" for t in ME))
        tpi = int(given_tpi)
        name = _canonical_size(value, ME[tpi])
        if name is None:
            others = [f"{n}x{t} ME" for t, ns in ME.items() for n in ns
                      if _size_value(n) == value]
            near = tuple(others) or _near_sizes(m["size"], ME[tpi], lambda n: f"{n}x{tpi} ME")
            raise UnknownThread(
                f"{text.strip()!r} is not in the model-engineer {tpi} tpi list shopterm knows. "
                f"For another size enter a special thread, e.g. SPECIAL {float(value):.10g}x"
                f"{tpi}TPI 55.", near)
        spec = _make("ME", name, tpi, kind)
    else:
        table = _series_tpi(series)
        name = _canonical_size(value, table)
        if name is None:
            others = tuple(_other_series_with(value, given_tpi)) if given_tpi else ()
            sizes = ", ".join(table)
            raise UnknownThread(
                f"{text.strip()!r}: {series} has no {m['size']} in size. {series} sizes are "
                f"{sizes}.", others or _near_sizes(m["size"], table, lambda n: f"{n} {series}"))
        tpi = table[name]
        if given_tpi is not None and given_tpi != tpi:
            others = tuple(_other_series_with(value, given_tpi))
            raise UnknownThread(
                f"{text.strip()!r}: {name} {series} has {_fmt_tpi(tpi)} tpi, not "
                f"{given_tpi:g}. Type {name} {series}"
                + (f", or {others[0]} for {given_tpi:g} tpi." if others else "."),
                others + (f"{name} {series}",))
        spec = _make(series, name, tpi, kind)

    if m["cls"]:
        _refuse_class(spec, m["cls"])
    return spec


def format(spec: ThreadSpec) -> str:
    """Return the designation of ``spec`` as written in BS 84 / model-engineer use.

    e.g. ``3/8 BSW``, ``1/4x40 ME``; ``internal`` is added for an internal thread.
    References: BS 84.
    """
    if spec.series == "ME":
        text = f"{spec.size}x{_fmt_tpi(spec.tpi)} ME"
    else:
        text = f"{spec.size} {spec.series}"
    return text + " internal" if spec.kind == "internal" else text


def basic_inches(spec: ThreadSpec) -> tuple[float, float, float]:
    """Return the basic (major, effective, core) diameters [in], rounded as BS 84 prints them.

    spec: a Whitworth-form thread with ``tpi`` set.
    References: BS 84 basic form (E = D − 0.640327P, core = D − 1.280654P).
    """
    d = spec.major / MM_PER_INCH
    p = 1.0 / spec.tpi
    return (d, round_to(d - PD_FACTOR * p, _ROUND_IN), round_to(d - CORE_FACTOR * p, _ROUND_IN))


def limits(spec: ThreadSpec) -> Limits:
    """Return the basic limits of size of a Whitworth-form thread, all in mm.

    spec: a BSW, BSF or ME thread (``tol_class`` must be None).
    References: BS 84 basic form.
    """
    if spec.family != FAMILY:
        raise InvalidEntry(f"{spec.size} is not a Whitworth-form thread.")
    if spec.tol_class is not None:
        _refuse_class(spec, spec.tol_class)
    d_in, e_in, core_in = basic_inches(spec)
    d, e, core = inch(d_in), inch(e_in), inch(core_in)
    p = spec.pitch
    if spec.series == "ME":
        notes = ("Basic sizes: model-engineer threads have no published tolerance table. To cut "
                 "to a fit, enter it as a special thread with your own allowance and tolerance.",)
    else:
        notes = ("Basic sizes (BS 84, no class given): the pitch-diameter band is the basic "
                 "effective diameter. BS 84 class tolerances are not built in.",)
    if spec.is_external:
        major_max, major_min, minor_max, minor_min = d, d, core, None
    else:
        major_max, major_min, minor_max, minor_min = None, d, None, core
    r = RADIUS_FACTOR * p
    return Limits(spec=spec, basic_major=d, basic_pd=e, basic_minor=core,
                  major_max=major_max, major_min=major_min, pd_max=e, pd_min=e,
                  minor_max=minor_max, minor_min=minor_min, depth=DEPTH_FACTOR * p,
                  notes=notes, root_radius_min=r, root_radius_max=r)


def catalogue() -> list[ThreadSpec]:
    """Return every BSW, BSF and model-engineer thread in the tables, external, basic size.

    References: BS 84; published model-engineering tables.
    """
    out = [_make("BSW", size, tpi) for size, tpi in BSW.items()]
    out += [_make("BSF", size, tpi) for size, tpi in BSF.items()]
    for tpi in sorted(ME, reverse=True):
        out += [_make("ME", size, tpi) for size in ME[tpi]]
    return out


def classes(spec: ThreadSpec) -> list[str]:
    """Return the classes shopterm can give limits for: none (basic sizes only).

    References: BS 84 (classes named, tables not built in).
    """
    return []
