"""Pipe threads: ISO 228-1 parallel (G), ISO 7-1 tapered (R, Rc, Rp) and ASME B1.20.1 NPT.

Designations read and written here:

``G1/2A``, ``G1/2B`` (external, classes A and B), ``G1/2`` (internal: one class, no letter),
``G1 1/2A`` (``G1-1/2A`` is read too); ``R1/2`` (external taper), ``Rc1/2`` (internal taper),
``Rp1/2`` (internal parallel, to mate with an R); ``1/2-14 NPT`` and ``1/2 NPT`` (external;
``1/2-14 NPT internal`` for the fitting). ISO 7-1 sizes 1/8 … 4, ISO 228-1 sizes 1/8 … 4,
NPT sizes 1/16 … 4. NPSM, NPTF and the old BSP words are refused with a message saying what to
type instead.

Series keys: ``G``, ``R`` (an internal ``R`` is the ``Rc`` thread: the key stays ``R`` so a
change of kind keeps the series), ``Rp`` (internal only) and ``NPT``.

Tapered threads (R, Rc, NPT): every diameter in ``Limits`` is the one at the **gauge plane**,
and ``Limits.taper`` says where that plane is. External: ``gauge_plane_from_end`` from the
small end (ISO 7-1 gauge length; NPT: L1, where E1 lies). Internal: the gauge plane is the face
of the fitting (``gauge_plane_from_end`` 0, measured from the opening). The band on the pitch
diameter there is the standard's axial tolerance of the gauge plane times the taper (1/16 on
diameter): ISO 7-1 ±T1/2 (external) or ±T2/2 (internal), NPT ±1 turn (±p). The major and
minor diameters at the gauge plane move with it by the same amount.

The 55° form of ISO 228-1 and ISO 7-1 is ``forms.WHITWORTH_55`` (H 0.960491P, h 0.640327P,
r 0.137329P). ISO 7-1 draws its taper form square to the axis with H 0.960237P and r 0.137278P;
the depth h 0.640327P is the same, and the difference is far below what a lathe hand can see.
NPT is a 60° form with flat crests and roots, basic height h = 0.800p (``forms.NPT_60``); the
crest and root truncation tolerances of ASME B1.20.1 are not built in.

References: ISO 228-1 (dimensions, tolerances); ISO 7-1 (dimensions, gauge length and its
tolerances, useful thread); ASME B1.20.1 (NPT: E0, E1, L1, L2, L3 and the formulas for E0 and
L2). Table values are from memory unless the tests say otherwise (see each table's comment).
"""

from __future__ import annotations

import re
from decimal import ROUND_HALF_EVEN, Decimal
from fractions import Fraction

from shopterm.errors import InvalidEntry, UnknownThread, UnsupportedClass
from shopterm.standards.forms import NPT_60, WHITWORTH_55
from shopterm.standards.spec import Limits, Taper, ThreadSpec, inch
from shopterm.standards.whitworth import _size_value   # inch sizes as written, exactly
from shopterm.units import MM_PER_INCH

FAMILY = "pipe"

#: Taper of ISO 7-1 and ASME B1.20.1 threads: 1 in 16 on diameter.
TAPER = 1 / 16

#: ISO 228-1 / ISO 7-1 thread depth h = 0.640327P, printed rounded to 0.001 mm, by tpi; the
#: table's pitch and minor diameters are d − h and d − 2h from the rounded h (ISO 228-1 table,
#: from memory; the rule reproduces every printed d2 and d1 we know of).
ISO_H: dict[int, float] = {28: 0.581, 19: 0.856, 14: 1.162, 11: 1.479}

#: Size → (tpi, major diameter d [mm]) shared by ISO 228-1 and ISO 7-1 (gauge diameter).
#: The majors are the old BSP inch majors × 25.4 rounded to 0.001 mm (ISO 228-1 table,
#: from memory; 1/2: 0.825 in = 20.955 mm).
ISO_SIZES: dict[str, tuple[int, float]] = {
    "1/8": (28, 9.728), "1/4": (19, 13.157), "3/8": (19, 16.662), "1/2": (14, 20.955),
    "5/8": (14, 22.911), "3/4": (14, 26.441), "7/8": (14, 30.201), "1": (11, 33.249),
    "1 1/8": (11, 37.897), "1 1/4": (11, 41.910), "1 1/2": (11, 47.803),
    "1 3/4": (11, 53.746), "2": (11, 59.614), "2 1/4": (11, 65.710), "2 1/2": (11, 75.184),
    "2 3/4": (11, 81.534), "3": (11, 87.884), "3 1/2": (11, 100.330), "4": (11, 113.030),
}

#: ISO 228-1 tolerances [µm], from memory: size group → (internal minor TD1, internal pitch
#: TD2 = external class A Td2, external major Td). Class B Td2 = 2 × class A. The external
#: upper deviation and the internal lower deviation are 0 (no allowance).
_G_TOL_GROUPS: tuple[tuple[tuple[str, ...], tuple[int, int, int]], ...] = (
    (("1/8",), (282, 107, 214)),
    (("1/4", "3/8"), (445, 125, 250)),
    (("1/2", "5/8", "3/4", "7/8"), (541, 142, 284)),
    (("1", "1 1/8", "1 1/4", "1 1/2", "1 3/4", "2"), (640, 180, 360)),
    (("2 1/4", "2 1/2", "2 3/4", "3", "3 1/2", "4"), (640, 217, 434)),
)
G_TOL: dict[str, tuple[int, int, int]] = {s: t for sizes, t in _G_TOL_GROUPS for s in sizes}

#: ISO 7-1, from memory: size → (gauge length a [mm], ±T1/2 [mm], T1/2 [turns],
#: ±T2/2 [mm] (internal, at the face), T2/2 [turns], minimum useful thread of an external
#: thread at the basic gauge length [mm], ± diameter tolerance of Rp [mm]).
#: Cross-checks the tests make: T1/2 ≈ turns × P, useful − a ≈ a whole number of quarter
#: turns, Rp tolerance ≈ T2/2 × 1/16.
ISO7: dict[str, tuple[float, float, float, float, float, float, float]] = {
    "1/8": (4.0, 0.9, 1, 1.1, 1.25, 6.5, 0.071),
    "1/4": (6.0, 1.3, 1, 1.7, 1.25, 9.7, 0.104),
    "3/8": (6.4, 1.3, 1, 1.7, 1.25, 10.1, 0.104),
    "1/2": (8.2, 1.8, 1, 2.3, 1.25, 13.2, 0.142),
    "3/4": (9.5, 1.8, 1, 2.3, 1.25, 14.5, 0.142),
    "1": (10.4, 2.3, 1, 2.9, 1.25, 16.8, 0.180),
    "1 1/4": (12.7, 2.3, 1, 2.9, 1.25, 19.1, 0.180),
    "1 1/2": (12.7, 2.3, 1, 2.9, 1.25, 19.1, 0.180),
    "2": (15.9, 2.3, 1, 2.9, 1.25, 23.4, 0.180),
    "2 1/2": (17.5, 3.5, 1.5, 3.5, 1.5, 26.7, 0.217),
    "3": (20.6, 3.5, 1.5, 3.5, 1.5, 29.8, 0.217),
    "4": (25.4, 3.5, 1.5, 3.5, 1.5, 35.8, 0.217),
}

#: ASME B1.20.1 NPT, from memory: size → (pipe OD D [in], tpi, hand-tight engagement L1 [in],
#: wrench make-up L3 [in]). E0, E1 and L2 are computed from the standard's formulas.
NPT: dict[str, tuple[str, str, str, str]] = {
    "1/16": ("0.3125", "27", "0.160", "0.1111"),
    "1/8": ("0.405", "27", "0.1615", "0.1111"),
    "1/4": ("0.540", "18", "0.2278", "0.1667"),
    "3/8": ("0.675", "18", "0.240", "0.1667"),
    "1/2": ("0.840", "14", "0.320", "0.2143"),
    "3/4": ("1.050", "14", "0.339", "0.2143"),
    "1": ("1.315", "11.5", "0.400", "0.2609"),
    "1-1/4": ("1.660", "11.5", "0.420", "0.2609"),
    "1-1/2": ("1.900", "11.5", "0.420", "0.2609"),
    "2": ("2.375", "11.5", "0.436", "0.2609"),
    "2-1/2": ("2.875", "8", "0.682", "0.2500"),
    "3": ("3.500", "8", "0.766", "0.2500"),
    "3-1/2": ("4.000", "8", "0.821", "0.2500"),
    "4": ("4.500", "8", "0.844", "0.2500"),
}

#: NPT basic thread height h = 0.800p (ASME B1.20.1, from memory).
NPT_H = 0.8

_G_NOTE = ("ISO 228-1 fastening thread: it does not seal on the thread (use a washer, seal ring "
           "or face).")

#: Shown on every pipe thread (thread screen, calc limits).
PRESSURE_CAUTION = ("A pressure fitting's fitness for service is not settled by its dimensions: "
                    "follow the applicable code and the fitting maker.")

_SIZE = r"\d+[-\s]\d+/\d+|\d+/\d+|\d+"
_ISO_RE = re.compile(rf"^(?P<series>G|Rc|Rp|R)\s*(?P<size>{_SIZE})(?:\s*-?\s*(?P<cls>[A-Za-z]))?$",
                     re.IGNORECASE)
_NPT_RE = re.compile(rf"^(?P<size>{_SIZE})\s*(?:\"|in)?\s*(?:-\s*(?P<tpi>\d+(?:\.\d+)?)\s*)?"
                     r"(?P<series>NPT|NPSM|NPTF|NPS|NPSC|NPSF|NPSI|NPSL|BSPP|BSPT|BSP)$",
                     re.IGNORECASE)
_ISO_SERIES = {"G": "G", "R": "R", "RC": "Rc", "RP": "Rp"}


def _find_size(size: str, names) -> str | None:
    value = _size_value(size)
    return next((n for n in names if _size_value(n) == value), None)


def _nearest(size: str, names, fmt, n: int = 2) -> tuple[str, ...]:
    value = _size_value(size)
    return tuple(fmt(s) for s in sorted(names, key=lambda s: abs(_size_value(s) - value))[:n])


def _iso_spec(series: str, size: str, kind: str, cls: str | None) -> ThreadSpec:
    tpi, d = ISO_SIZES[size]
    return ThreadSpec(family=FAMILY, series=series, size=size, major=d, pitch=MM_PER_INCH / tpi,
                      form=WHITWORTH_55, kind=kind, tol_class=cls, tpi=float(tpi),
                      native_unit="mm")


def _npt_spec(size: str, kind: str = "external") -> ThreadSpec:
    d_in, tpi, _, _ = NPT[size]
    return ThreadSpec(family=FAMILY, series="NPT", size=size, major=float(d_in) * MM_PER_INCH,
                      pitch=MM_PER_INCH / float(tpi), form=NPT_60, kind=kind, tol_class=None,
                      tpi=float(tpi), native_unit="in")


def _iso_names(series: str):
    return ISO7 if series in ("R", "Rc", "Rp") else ISO_SIZES


def parse(text: str) -> ThreadSpec | None:
    """Return the pipe thread ``text`` names, or None if it is not written as a pipe thread.

    text: ``G1/2A``, ``G1/2B``, ``G1/2`` (internal), ``R1/2``, ``Rc1/2``, ``Rp1/2``,
    ``1/2-14 NPT``, ``1/2 NPT``. Raises ``UnknownThread`` for a size the series lacks (naming
    the nearest), ``UnsupportedClass`` for a class the standard lacks, NPSM/NPTF and BSP words.
    References: ISO 228-1 and ISO 7-1 designations; ASME B1.20.1.
    """
    if not isinstance(text, str):
        return None
    s = " ".join(text.strip().split())
    if m := _ISO_RE.match(s):
        return _parse_iso(s, m)
    if m := _NPT_RE.match(s):
        return _parse_npt(s, m)
    return None


def _parse_iso(text: str, m: re.Match) -> ThreadSpec:
    series = _ISO_SERIES[m["series"].upper()]
    names = _iso_names(series)
    size = _find_size(m["size"], names)
    cls = m["cls"].upper() if m["cls"] else None
    if size is None:
        std = "ISO 228-1" if series == "G" else "ISO 7-1"
        suffix = (cls or "") if series == "G" else ""
        raise UnknownThread(
            f"{text!r}: {std} has no {m['size']} size for {series}; sizes are "
            f"{', '.join(names)}.", _nearest(m["size"], names, lambda n: f"{series}{n}{suffix}"))
    if series == "G":
        if cls is not None and cls not in ("A", "B"):
            raise UnsupportedClass(f"{text!r}: ISO 228-1 classes are A and B (external): "
                                   f"type G{size}A or G{size}B, or G{size} for the internal "
                                   "thread.", (f"G{size}A", f"G{size}B", f"G{size}"))
        return _iso_spec("G", size, "external" if cls else "internal", cls)
    if cls is not None:
        raise UnsupportedClass(f"{text!r}: ISO 7-1 threads have no class letter: type "
                               f"{series}{size}.", (f"{series}{size}",))
    if series == "Rc":
        return _iso_spec("R", size, "internal", None)
    return _iso_spec(series, size, "internal" if series == "Rp" else "external", None)


def _parse_npt(text: str, m: re.Match) -> ThreadSpec:
    word = m["series"].upper()
    size_text = m["size"]
    if word.startswith("BSP"):
        guess = _find_size(size_text, ISO7) or size_text
        raise UnknownThread(
            f"{text!r}: British pipe threads are written the ISO way: G{guess} (parallel, "
            f"ISO 228-1; G{guess}A for the external), R{guess} (taper external), Rc{guess} "
            f"(taper internal) or Rp{guess} (parallel internal for an R).",
            (f"G{guess}A", f"R{guess}", f"Rc{guess}"))
    if word != "NPT":
        npt = _find_size(size_text, NPT)
        raise UnknownThread(
            f"{text!r}: {word} limits are not built into shopterm (no table at hand). For the "
            f"tapered pipe thread type {npt or size_text} NPT; for a parallel 60° thread enter a "
            "special thread with your own fit.", (f"{npt}-{NPT[npt][1]} NPT",) if npt else ())
    size = _find_size(size_text, NPT)
    if size is None:
        raise UnknownThread(f"{text!r}: ASME B1.20.1 has no {size_text} NPT in shopterm's table "
                            f"(sizes {', '.join(NPT)}).",
                            _nearest(size_text, NPT, lambda n: f"{n}-{NPT[n][1]} NPT"))
    if m["tpi"] is not None and float(m["tpi"]) != float(NPT[size][1]):
        raise UnknownThread(f"{text!r}: {size} NPT has {NPT[size][1]} threads per inch, not "
                            f"{m['tpi']}.", (f"{size}-{NPT[size][1]} NPT",))
    return _npt_spec(size)


def format(spec: ThreadSpec) -> str:
    """Return the designation as ISO 228-1, ISO 7-1 or ASME B1.20.1 writes it.

    ``G1/2A``, ``G1/2`` (internal), ``R1/2``, ``Rc1/2``, ``Rp1/2``, ``1/2-14 NPT``; a kind the
    letters do not say (an external G with no class, an NPT fitting) gets a trailing word.
    """
    if spec.series == "NPT":
        text = f"{spec.size}-{NPT[spec.size][1]} NPT"
        return text + " internal" if not spec.is_external else text
    if spec.series == "G":
        if spec.is_external:
            return f"G{spec.size}{spec.tol_class}" if spec.tol_class else f"G{spec.size} external"
        return f"G{spec.size}"
    if spec.series == "R":
        return f"R{spec.size}" if spec.is_external else f"Rc{spec.size}"
    return f"Rp{spec.size}" if not spec.is_external else f"Rp{spec.size} external"


def _check(spec: ThreadSpec) -> None:
    if spec.family != FAMILY:
        raise InvalidEntry(f"{spec.size} is not a pipe thread.")
    if spec.series == "Rp" and spec.is_external:
        raise InvalidEntry(f"Rp{spec.size} is an internal thread only: its external mate is "
                           f"the taper R{spec.size}.")
    if spec.tol_class is not None and (spec.series != "G" or not spec.is_external
                                       or spec.tol_class not in ("A", "B")):
        if spec.series == "G":
            raise UnsupportedClass(f"ISO 228-1 classes A and B are for external threads; the "
                                   f"internal thread has one class: type G{spec.size}.",
                                   (f"G{spec.size}",))
        raise UnsupportedClass(f"{format(spec.with_(tol_class=None))} has no classes: its "
                               "standard gives one tolerance.", (format(spec.with_(tol_class=None)),))


def limits(spec: ThreadSpec) -> Limits:
    """Return the limits of size of a pipe thread [mm].

    G: ISO 228-1 (external class A or B on the pitch diameter, no allowance; internal one
    class). R, Rc, NPT: diameters at the gauge plane, with ``taper`` set. Rp: ISO 7-1 parallel
    internal, ± its diameter tolerance.
    References: ISO 228-1; ISO 7-1; ASME B1.20.1.
    """
    _check(spec)
    if spec.series == "NPT":
        return _npt_limits(spec)
    tpi = int(spec.tpi)
    h = ISO_H[tpi]
    d = ISO_SIZES[spec.size][1]
    d2, d1 = round(d - h, 3), round(d - 2 * h, 3)
    r = WHITWORTH_55.root_radius * spec.pitch
    common = dict(spec=spec, basic_major=d, basic_pd=d2, basic_minor=d1, depth=h,
                  root_radius_min=r, root_radius_max=r)
    if spec.series == "G":
        td1, td2, td = (v / 1000 for v in G_TOL[spec.size])
        if spec.is_external:
            cls = spec.tol_class or "A"
            notes = [_G_NOTE]
            if spec.tol_class is None:
                notes.append("No class given: limits for class A.")
            return Limits(major_max=d, major_min=d - td, pd_max=d2,
                          pd_min=d2 - (td2 if cls == "A" else 2 * td2),
                          minor_max=d1, minor_min=None, notes=tuple(notes), **common)
        return Limits(major_max=None, major_min=d, pd_max=d2 + td2, pd_min=d2,
                      minor_max=d1 + td1, minor_min=d1,
                      notes=(_G_NOTE, "Major diameter max is not set by ISO 228-1."), **common)
    a, t1, t1_turns, t2, t2_turns, useful, rp_tol = ISO7[spec.size]
    if spec.series == "Rp":
        return Limits(major_max=None, major_min=d - rp_tol, pd_max=d2 + rp_tol,
                      pd_min=d2 - rp_tol, minor_max=d1 + rp_tol, minor_min=d1 - rp_tol,
                      notes=(f"ISO 7-1 parallel internal thread for an R{spec.size}: "
                             f"± {rp_tol:.3f} mm on diameter.",
                             "Pressure-tight on the thread only with a taper R and a jointing "
                             "compound."),
                      **common)
    if spec.is_external:
        band = t1 * TAPER
        taper = Taper(per_unit_on_diameter=TAPER, gauge_plane_from_end=a,
                      gauge_plane_tolerance=t1, gauge_diameter=d, L1=a, L2=useful)
        notes = (f"Diameters at the gauge plane, {a:g} mm from the small end "
                 f"(± {t1:g} mm, {t1_turns:g} turn{'s' if t1_turns != 1 else ''}).",
                 f"Useful thread at least {useful:g} mm; taper 1:16 on diameter.")
        return Limits(major_max=d + band, major_min=d - band, pd_max=d2 + band,
                      pd_min=d2 - band, minor_max=d1 + band, minor_min=None, notes=notes,
                      taper=taper, **common)
    band = t2 * TAPER
    taper = Taper(per_unit_on_diameter=TAPER, gauge_plane_from_end=0.0, gauge_plane_tolerance=t2,
                  gauge_diameter=d, L1=a, L2=None)
    notes = (f"Diameters at the gauge plane, the face of the fitting (± {t2:g} mm, "
             f"{t2_turns:g} turns); an R{spec.size} enters {a:g} mm by hand.",
             "Taper 1:16 on diameter; the useful length of an internal thread is not built in.")
    return Limits(major_max=None, major_min=d - band, pd_max=d2 + band, pd_min=d2 - band,
                  minor_max=d1 + band, minor_min=d1 - band, notes=notes, taper=taper, **common)


def _quantize(x: Fraction, places: int) -> Decimal:
    # ASME B1.20.1 prints E0 and E1 to 0.00001 in and L2 to 0.0001 in. Half-even: the exact
    # half 3 NPT E0 = 3.340625 is printed 3.34062 (from memory).
    exact = Decimal(x.numerator) / Decimal(x.denominator)
    # Decimal division keeps 28 digits: enough to see an exact half at 5 places.
    return exact.quantize(Decimal(1).scaleb(-places), rounding=ROUND_HALF_EVEN)


def npt_inches(size: str) -> dict[str, float]:
    """Return the NPT basic dimensions [in] of ``size``: D, p, E0, E1, L1, L2, L3.

    E0 = D − (0.05D + 1.1)p; E1 = E0 + 0.0625·L1; L2 = (0.80D + 6.8)p (ASME B1.20.1
    formulas); L1 and L3 from the table.
    """
    d_text, tpi_text, l1_text, l3_text = NPT[size]
    d, p, l1 = Fraction(d_text), 1 / Fraction(tpi_text), Fraction(l1_text)
    # E1 from the unrounded E0: 4 NPT E0 4.334375 + 0.05275 = 4.387125, printed 4.38712
    # (from memory); from the printed E0 4.33438 it would be 4.38713.
    e0_exact = d - (Fraction("0.05") * d + Fraction("1.1")) * p
    e0 = Fraction(_quantize(e0_exact, 5))
    e1 = Fraction(_quantize(e0_exact + Fraction("0.0625") * l1, 5))
    l2 = Fraction(_quantize((Fraction("0.80") * d + Fraction("6.8")) * p, 4))
    return {"D": float(d), "p": float(p), "E0": float(e0), "E1": float(e1), "L1": float(l1),
            "L2": float(l2), "L3": float(Fraction(l3_text))}


def _npt_limits(spec: ThreadSpec) -> Limits:
    v = npt_inches(spec.size)
    p, e1 = v["p"], v["E1"]
    h = NPT_H * p
    band = p * TAPER            # ±1 turn at the gauge plane, on diameter
    taper = Taper(per_unit_on_diameter=TAPER,
                  gauge_plane_from_end=inch(v["L1"]) if spec.is_external else 0.0,
                  gauge_plane_tolerance=inch(p), gauge_diameter=None, E0=inch(v["E0"]),
                  E1=inch(e1), L1=inch(v["L1"]), L2=inch(v["L2"]), L3=inch(v["L3"]))
    if spec.is_external:
        where = f"L1 = {v['L1']:.4f} in from the small end"
        minor_min = None
    else:
        where = "the face of the fitting"
        minor_min = inch(e1 - h - band)
    notes = (f"Diameters at the hand-tight plane ({where}), pitch diameter E1 ± 1 turn; "
             "taper 1:16 on diameter.",
             f"Effective thread L2 {v['L2']:.4f} in; wrench make-up {v['L3']:.4f} in beyond "
             "hand-tight. Crest and root truncation tolerances are not built in.")
    return Limits(spec=spec, basic_major=inch(e1 + h), basic_pd=inch(e1), basic_minor=inch(e1 - h),
                  major_max=inch(e1 + h + band) if spec.is_external else None,
                  major_min=inch(e1 + h - band), pd_max=inch(e1 + band), pd_min=inch(e1 - band),
                  minor_max=inch(e1 - h + band), minor_min=minor_min, depth=inch(h),
                  notes=notes, taper=taper)


def cautions(spec: ThreadSpec) -> tuple[str, ...]:
    """Return the cautions to show with this pipe thread (every one: the pressure caution)."""
    return (PRESSURE_CAUTION,)


def catalogue() -> list[ThreadSpec]:
    """Return every G (external, class A), R (external) and NPT (external) thread."""
    out = [_iso_spec("G", s, "external", "A") for s in ISO_SIZES]
    out += [_iso_spec("R", s, "external", None) for s in ISO7]
    out += [_npt_spec(s) for s in NPT]
    return out


def classes(spec: ThreadSpec) -> list[str]:
    """Return A and B for an external G; none otherwise (one tolerance in the standard)."""
    return ["A", "B"] if spec.series == "G" and spec.is_external else []
