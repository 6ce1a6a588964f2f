"""BA threads (British Association, 47.5°, BS 93): 0BA to 10BA.

Designations read and written here: ``2BA``, ``0 BA``, ``2BA close``, ``2BA normal``;
an internal thread is written with a trailing ``internal`` (``2BA normal internal``).

Classes (BS 93): external ``close`` and ``normal``, internal ``normal``. Without a class the
limits are basic sizes. BS 93 has no allowance: the external maximum and internal minimum sit on
the basic sizes.

Tolerances used, as multiples of the pitch P [mm]:
- internal effective diameter, normal: 0.12P + 0.03 mm [published, BS 93:2008]
- external major diameter: close 0.15P, normal 0.20P [published, BS 93:2008]
- external effective diameter: close 0.08P + 0.02 mm, normal 0.10P + 0.025 mm [from memory,
  provisional; the Limits notes say so]
No limit is built in for the external minor minimum or the internal minor maximum (None).

References: BS 93:2008 (BA threads).
"""

from __future__ import annotations

import re

from shopterm.errors import InvalidEntry, UnknownThread, UnsupportedClass
from shopterm.standards.forms import BA_47_5
from shopterm.standards.spec import Limits, ThreadSpec
from shopterm.units import round_to

FAMILY = "ba"

#: BS 93 basic-form factors, multiples of P (BS 93).
PD_FACTOR = 0.6          # D − E
CORE_FACTOR = 1.2        # D − core
DEPTH_FACTOR = 0.6       # thread depth on radius
RADIUS_FACTOR = 0.180835  # crest and root radius (exact tangent radius)

#: n → (major [mm], pitch [mm]). BS 93 table as printed.
BA: dict[int, tuple[float, float]] = {
    0: (6.0, 1.00),
    1: (5.3, 0.90),
    2: (4.7, 0.81),
    3: (4.1, 0.73),
    4: (3.6, 0.66),
    5: (3.2, 0.59),
    6: (2.8, 0.53),
    7: (2.5, 0.48),
    8: (2.2, 0.43),
    9: (1.9, 0.39),
    10: (1.7, 0.35),
}

#: Classes by kind: close and normal external, normal internal (BS 93; the md gives close and
#: normal major tolerances and the internal effective tolerance).
CLASSES: dict[str, tuple[str, ...]] = {"external": ("close", "normal"), "internal": ("normal",)}

#: External effective-diameter tolerance a·P + b [mm], by class. From memory (provisional).
_EXT_PD_TOL: dict[str, tuple[float, float]] = {"close": (0.08, 0.02), "normal": (0.10, 0.025)}
#: Internal effective-diameter tolerance 0.12P + 0.03 mm. BS 93:2008 [P].
_INT_PD_TOL = (0.12, 0.03)
#: External major-diameter tolerance, × P. BS 93:2008 [P].
_EXT_MAJOR_TOL: dict[str, float] = {"close": 0.15, "normal": 0.20}
#: Tolerances are applied rounded to 0.001 mm, the resolution of the metric tables (from memory).
_ROUND_MM = 0.001

_DESIGNATION = re.compile(
    r"^(?P<n>\d+)\s*BA\b(?:\s*[-\s]\s*(?P<cls>(?!internal\b|external\b)[A-Za-z]+))?"
    r"(?:\s+(?P<kind>internal|external))?\s*$", re.IGNORECASE)


def _make(n: int, kind: str = "external", tol_class: str | None = None) -> ThreadSpec:
    major, pitch = BA[n]
    return ThreadSpec(family=FAMILY, series="BA", size=f"{n}BA", major=major, pitch=pitch,
                      form=BA_47_5, kind=kind, tol_class=tol_class, native_unit="mm")


def _check_class(spec: ThreadSpec) -> None:
    if spec.tol_class is None:
        return
    valid = CLASSES[spec.kind]
    if spec.tol_class not in valid:
        other = "internal" if spec.kind == "external" else "external"
        also = (f" ({spec.tol_class} is for {other} threads)"
                if spec.tol_class in CLASSES[other] else "")
        raise UnsupportedClass(
            f"BS 93 has no class {spec.tol_class!r} for an {spec.kind} thread{also}: use "
            f"{' or '.join(valid)}, or no class for basic sizes.",
            tuple(format(spec.with_(tol_class=c)) for c in valid) + (spec.size,))


def parse(text: str) -> ThreadSpec | None:
    """Return the BA thread ``text`` names, or None if it is not written that way.

    text: e.g. ``2BA``, ``0 BA``, ``2BA close``, ``4BA normal internal``.
    Raises ``UnknownThread`` for a number outside 0–10, ``UnsupportedClass`` for a class BS 93
    does not give for the kind.
    References: BS 93.
    """
    if not isinstance(text, str):
        return None
    s = " ".join(text.strip().split())
    m = _DESIGNATION.match(s)
    if m is None:
        return None
    n = int(m["n"])
    if n not in BA:
        raise UnknownThread(f"{text.strip()!r}: shopterm knows 0BA to 10BA. For a smaller BA "
                            "size enter a special thread with a 47.5 degree form, e.g. "
                            "SPECIAL <diameter>x<pitch> 47.5.", (f"{min(max(n, 0), 10)}BA",))
    kind = m["kind"].lower() if m["kind"] else "external"
    cls = m["cls"].lower() if m["cls"] else None
    if cls is not None and cls not in CLASSES["external"] + CLASSES["internal"]:
        raise UnsupportedClass(f"{cls!r} is not a BS 93 class: use close or normal (external), "
                               "normal (internal), or no class for basic sizes.",
                               (f"{n}BA close", f"{n}BA normal", f"{n}BA"))
    spec = _make(n, kind, cls)
    _check_class(spec)
    return spec


def format(spec: ThreadSpec) -> str:
    """Return the designation of ``spec`` as BS 93 writes it, e.g. ``2BA`` or ``2BA close``.

    ``internal`` is added for an internal thread.
    References: BS 93.
    """
    text = spec.size + (f" {spec.tol_class}" if spec.tol_class else "")
    return text + " internal" if spec.kind == "internal" else text


def effective_tolerance(pitch: float, kind: str, tol_class: str) -> float:
    """Return the effective-diameter tolerance [mm], rounded to 0.001 mm.

    pitch [mm]; kind 'external'/'internal'; tol_class 'close'/'normal'.
    References: BS 93:2008 (internal 0.12P + 0.03 mm); external values from memory.
    """
    a, b = _INT_PD_TOL if kind == "internal" else _EXT_PD_TOL[tol_class]
    return round_to(a * pitch + b, _ROUND_MM)


def major_tolerance(pitch: float, tol_class: str) -> float:
    """Return the external major-diameter tolerance [mm], rounded to 0.001 mm.

    pitch [mm]; tol_class 'close' (0.15P) or 'normal' (0.20P).
    References: BS 93:2008.
    """
    return round_to(_EXT_MAJOR_TOL[tol_class] * pitch, _ROUND_MM)


def limits(spec: ThreadSpec) -> Limits:
    """Return the limits of size of a BA thread, all in mm.

    spec: a BA thread; ``tol_class`` None (basic sizes), 'close' or 'normal'.
    References: BS 93:2008.
    """
    if spec.family != FAMILY:
        raise InvalidEntry(f"{spec.size} is not a BA thread.")
    _check_class(spec)
    d, p = spec.major, spec.pitch
    e = d - PD_FACTOR * p
    core = d - CORE_FACTOR * p
    r = RADIUS_FACTOR * p
    notes: list[str] = []
    if spec.tol_class is None:
        notes.append("Basic sizes (BS 93, no class given): the pitch-diameter band is the basic "
                     "effective diameter.")
        if spec.is_external:
            bounds = (d, d, e, e, core, None)
        else:
            bounds = (None, d, e, e, None, core)
    elif spec.is_external:
        td2 = effective_tolerance(p, "external", spec.tol_class)
        td = major_tolerance(p, spec.tol_class)
        bounds = (d, d - td, e, e - td2, core, None)
        notes.append(f"Provisional: the {spec.tol_class} effective-diameter tolerance is from "
                     "memory, not from the BS 93 table; check it before relying on it.")
    else:
        td2 = effective_tolerance(p, "internal", spec.tol_class)
        bounds = (None, d, e + td2, e, None, core)
        notes.append("No upper limit for the nut's minor diameter is built in: bore to at least "
                     "the minor minimum and check with a plug gauge or the mating screw.")
    major_max, major_min, pd_max, pd_min, minor_max, minor_min = bounds
    return Limits(spec=spec, basic_major=d, basic_pd=e, basic_minor=core,
                  major_max=major_max, major_min=major_min, pd_max=pd_max, pd_min=pd_min,
                  minor_max=minor_max, minor_min=minor_min, depth=DEPTH_FACTOR * p,
                  notes=tuple(notes), root_radius_min=r, root_radius_max=r)


def catalogue() -> list[ThreadSpec]:
    """Return 0BA to 10BA, external, class normal.

    References: BS 93.
    """
    return [_make(n, "external", "normal") for n in BA]


def classes(spec: ThreadSpec) -> list[str]:
    """Return the BS 93 classes for this thread's kind: close and normal external, normal
    internal.

    References: BS 93.
    """
    return list(CLASSES[spec.kind])
