"""Trapezoidal and Acme threads for the cutting-core tests.

``power_limits(designation)`` gives the catalogue's own limits. ``tr(...)`` and ``acme(...)``
build a ``Limits`` by hand from the basic-profile formulas of ISO 2904 and ASME B1.5 (computed
here, not looked up), with a pitch-diameter band given by the caller, for tests that need a
thread the catalogue does not hold.

The module also works as a stand-in thread family (``parse``/``limits``/``format``/
``catalogue``/``classes``) so that the identify tests can put these threads through the real
registry: ``register(monkeypatch)``.
"""

from __future__ import annotations

import math

from shopterm.standards.forms import ACME_29, TRAPEZOIDAL_30, ThreadForm
from shopterm.standards.spec import Limits, ThreadSpec

INCH = 25.4          # ISO 31-1: 1 in = 25.4 mm exactly
FAMILY = "handmade-power"


def tr_ac(pitch: float) -> float:
    """ISO 2904 crest clearance ac [mm] by pitch band (from memory: 1.5 → 0.15; 2–5 → 0.25;
    6–12 → 0.5; 14–44 → 1)."""
    return 0.15 if pitch <= 1.5 else 0.25 if pitch <= 5 else 0.5 if pitch <= 12 else 1.0


def tr(d: float, pitch: float, starts: int = 1, kind: str = "external",
       es_d2: float = 0.0, td2: float = 0.0, tol_class: str | None = None) -> Limits:
    """Return the limits of ``Tr d x (starts·P)(P P)`` from the ISO 2904 basic profile.

    es_d2, td2 [mm]: the pitch-diameter deviation and tolerance to apply (0: basic size).
    ISO 2904: H1 = 0.5P, h3 = H4 = 0.5P + ac, d2 = D2 = d − 0.5P, d3 = d − 2h3, D1 = d − P,
    D4 = d + 2ac; root width of the external thread at d3 = 0.366P − 0.536ac (computed from
    the 30° flanks: the groove is P/2 wide at d2 and narrows by 2·tan 15° per unit depth).
    """
    ac = tr_ac(pitch)
    d2 = d - 0.5 * pitch
    d3 = d - 2 * (0.5 * pitch + ac)
    d1 = d - pitch
    size = f"Tr{d:g}x{starts * pitch:g}" + (f"(P{pitch:g})" if starts > 1 else "")
    spec = ThreadSpec(FAMILY, "Tr", size, d, pitch, TRAPEZOIDAL_30, kind=kind,
                      tol_class=tol_class, starts=starts)
    flat = pitch / 2 - 2 * (d2 - d3) / 2 * math.tan(math.radians(15))
    if kind == "external":
        return Limits(spec, d, d2, d3, d, d - 0.1 * pitch, d2 + es_d2, d2 + es_d2 - td2, d3,
                      d3 - 0.1 * pitch, 0.5 * pitch + ac, clearance=ac, tip_flat=flat)
    d4 = d + 2 * ac
    nut_flat = pitch / 2 - 2 * (d4 - d2) / 2 * math.tan(math.radians(15))
    return Limits(spec, d4, d2, d1, None, d4, d2 + td2, d2, d1 + 0.1 * pitch, d1,
                  0.5 * pitch + ac, clearance=ac, tip_flat=nut_flat)


_H29 = 0.5 / math.tan(math.radians(14.5))
#: ASME B1.8 stub Acme basic profile (29°, basic height 0.3p), for the tests only.
STUB_29 = ThreadForm("stub-handmade", "Stub Acme 29°", 29.0, _H29, (_H29 - 0.3) / 2,
                     (_H29 - 0.3) / 2)


def acme(d_in: float, tpi: float, starts: int = 1, kind: str = "external",
         allowance_in: float = 0.0, td2_in: float = 0.0, tol_class: str | None = None,
         stub: bool = False) -> Limits:
    """Return the limits of a general-purpose (or stub) Acme thread from the basic form.

    d_in [in]; tpi (threads per inch of the pitch); allowance_in, td2_in [in] on the PD.
    ASME B1.5: basic depth 0.5p, basic PD = D − 0.5p; minor diameter clearance (on diameter)
    0.020 in for 10 tpi and coarser, 0.010 in finer (from memory); flat at the root of the
    screw 0.3707p − 0.259 × clearance. ASME B1.8 stub: depth 0.3p, flat 0.4224p − 0.259 ×
    clearance (from memory).
    """
    p = 1 / tpi
    h = 0.3 if stub else 0.5
    clear = 0.020 if tpi <= 10 else 0.010
    pd = d_in - h * p
    minor = d_in - 2 * h * p - clear
    flat = (0.4224 if stub else 0.3707) * p - 0.259 * clear
    size = f"{d_in:.3f}" + (f"-{p:.4g}P-{starts * p:.4g}L" if starts > 1 else f"-{tpi:g}")
    spec = ThreadSpec(FAMILY, "STUB ACME" if stub else "ACME", size, d_in * INCH, p * INCH,
                      STUB_29 if stub else ACME_29, kind=kind, tol_class=tol_class, tpi=tpi,
                      starts=starts, native_unit="in")
    pd_max = (pd - allowance_in) * INCH
    return Limits(spec, d_in * INCH, pd * INCH, minor * INCH, d_in * INCH, (d_in - 0.05 * p) * INCH,
                  pd_max, pd_max - td2_in * INCH, minor * INCH, (minor - 0.05 * p) * INCH,
                  (h * p + clear / 2) * INCH, clearance=clear * INCH, tip_flat=flat * INCH)


def power_limits(designation: str) -> Limits:
    """Return the catalogue's limits for ``designation``."""
    from shopterm.standards import limits, parse
    return limits(parse(designation))


# ---- a stand-in family for the registry -------------------------------------------------------

#: What this family's catalogue holds: name → limits builder.
_CATALOGUE = {
    "Tr24x5": lambda kind="external": tr(24, 5, kind=kind),
    "Tr20x4": lambda kind="external": tr(20, 4, kind=kind),
    "Tr24x3": lambda kind="external": tr(24, 3, kind=kind),
    "Tr24x10(P5)": lambda kind="external": tr(24, 5, starts=2, kind=kind),
    "Tr40x7": lambda kind="external": tr(40, 7, kind=kind),
    "1.000-5 ACME": lambda kind="external": acme(1.0, 5, kind=kind),
    "1.000-5 STUB ACME": lambda kind="external": acme(1.0, 5, kind=kind, stub=True),
    "1.000-0.4P-0.8L ACME": lambda kind="external": acme(1.0, 2.5, starts=2, kind=kind),
    "0.750-6 ACME": lambda kind="external": acme(0.75, 6, kind=kind),
}


def _key(spec: ThreadSpec) -> str:
    return spec.size + (f" {spec.series}" if "ACME" in spec.series else "")


def parse(text: str):
    """Return the stand-in thread named exactly as its catalogue key, else None."""
    make = _CATALOGUE.get(text.strip())
    return make().spec if make else None


def limits(spec: ThreadSpec) -> Limits:
    return _CATALOGUE[_key(spec)](spec.kind)


def format(spec: ThreadSpec) -> str:   # noqa: A001 - the family contract's name
    return _key(spec)


def catalogue() -> list[ThreadSpec]:
    return [make().spec for make in _CATALOGUE.values()]


def classes(spec: ThreadSpec) -> list[str]:
    return []


def register(monkeypatch) -> None:
    """Put this stand-in family into the registry for one test."""
    from shopterm import standards
    monkeypatch.setitem(standards.FAMILIES, FAMILY, __name__)
