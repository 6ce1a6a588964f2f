"""Pipe threads for the taper tests: hand-made Limits now, the standards' own once they exist.

``pipe_limits(name)`` is what the tests use. Until ``standards.parse("R1/2")`` knows the pipe
families it returns the hand-made limits below; ``real_limits(name)`` gives the standards'
own and skips (saying why) while the family is missing. To switch the taper tests over, make
``pipe_limits`` return ``real_limits(name)``.

The hand-made threads are family "special" (so a designation can be printed) with the pipe
thread's form, pitch and Taper; their pitch-diameter band at the gauge plane is the gauge
plane's ± position times the taper (k × T on diameter).
"""

from __future__ import annotations

import pytest

from shopterm.errors import UnknownThread
from shopterm.standards.forms import UNIFIED_60, WHITWORTH_55
from shopterm.standards.spec import Limits, Taper, ThreadSpec

IN = 25.4                     # NIST SP 811: 1 in = 25.4 mm exactly
K = 1 / 16                    # ISO 7-1 and ASME B1.20.1: taper 1 in 16 on diameter (from memory)
P14 = IN / 14                 # 14 threads per inch

# ISO 7-1 table 1, size 1/2 (from memory): 14 tpi; gauge diameter (major at the gauge plane)
# 20.955, pitch diameter 19.793, minor 18.631; gauge length 8.2 ± 1.8 (one turn); useful
# thread length 13.2 for the basic gauge length. Thread height h = 0.640327P (ISO 7-1, from
# memory; the BS 84 Whitworth form).
R12_GAUGE_D, R12_D2, R12_D1 = 20.955, 19.793, 18.631
R12_GAUGE_LENGTH, R12_TOL, R12_USEFUL = 8.2, 1.8, 13.2

# ASME B1.20.1 table 2, 1/2-14 NPT (from memory): E0 0.75843 in, E1 0.77843 in, L1 0.320 in,
# L2 0.5337 in; thread height h = 0.8p; gauge plane tolerance ±1 turn.
NPT12_E0, NPT12_E1, NPT12_L1, NPT12_L2 = 0.75843, 0.77843, 0.320, 0.5337

# ISO 228-1 table 1, G1/2 (from memory): major 20.955, pitch diameter 19.793, minor 18.631;
# external class A pitch diameter tolerance 0.142, major diameter tolerance 0.284.
G12_TD2_A, G12_TD = 0.142, 0.284


def _tapered(spec: ThreadSpec, major: float, pd: float, minor: float, depth: float,
             taper: Taper) -> Limits:
    band = K * taper.gauge_plane_tolerance
    return Limits(spec, basic_major=major, basic_pd=pd, basic_minor=minor,
                  major_max=major + band, major_min=major - band,
                  pd_max=pd + band, pd_min=pd - band,
                  minor_max=minor + band, minor_min=minor - band,
                  depth=depth, taper=taper)


def r_half(kind: str = "external") -> Limits:
    """Return hand-made limits of R1/2 (Rc1/2 for internal), ISO 7-1, at the gauge plane."""
    spec = ThreadSpec("special", "special", "R1/2", R12_GAUGE_D, P14, WHITWORTH_55, kind=kind,
                      tpi=14, native_unit="mm")
    taper = Taper(K, R12_GAUGE_LENGTH, R12_TOL, gauge_diameter=R12_GAUGE_D, L2=R12_USEFUL)
    return _tapered(spec, R12_GAUGE_D, R12_D2, R12_D1, (R12_GAUGE_D - R12_D1) / 2, taper)


def npt_half(kind: str = "external") -> Limits:
    """Return hand-made limits of 1/2-14 NPT, ASME B1.20.1, at the gauge plane (L1)."""
    p_in = 1 / 14
    spec = ThreadSpec("special", "special", "1/2-14 NPT", 0.840 * IN, P14, UNIFIED_60,
                      kind=kind, tpi=14, native_unit="in")
    taper = Taper(K, NPT12_L1 * IN, P14, E0=NPT12_E0 * IN, E1=NPT12_E1 * IN,
                  L1=NPT12_L1 * IN, L2=NPT12_L2 * IN)
    e1 = NPT12_E1 * IN
    h = 0.8 * p_in * IN
    return _tapered(spec, e1 + h, e1, e1 - h, h / 2, taper)


def g_half(kind: str = "external") -> Limits:
    """Return hand-made limits of G1/2 class A (ISO 228-1): parallel, no taper."""
    spec = ThreadSpec("special", "special", "G1/2", R12_GAUGE_D, P14, WHITWORTH_55, kind=kind,
                      tol_class="A", tpi=14, native_unit="mm")
    return Limits(spec, basic_major=R12_GAUGE_D, basic_pd=R12_D2, basic_minor=R12_D1,
                  major_max=R12_GAUGE_D, major_min=R12_GAUGE_D - G12_TD,
                  pd_max=R12_D2, pd_min=R12_D2 - G12_TD2_A,
                  minor_max=R12_D1, minor_min=None, depth=(R12_GAUGE_D - R12_D1) / 2)


HAND_MADE = {"R1/2": r_half, "1/2-14 NPT": npt_half, "G1/2": g_half}


def real_limits(name: str, kind: str | None = None) -> Limits:
    """Return the standards' own limits of ``name``; skip while the pipe families are missing."""
    from shopterm import standards
    try:
        spec = standards.parse(name, kind=kind)
    except UnknownThread:
        pytest.skip(f"{name} is not in the standards yet (the pipe-thread families ISO 228-1, "
                    "ISO 7-1 and ASME B1.20.1 are being added): this test runs once they are.")
    return standards.limits(spec)


def pipe_limits(name: str, kind: str = "external") -> Limits:
    """Return the limits the taper tests use for ``name``: the catalogue's own."""
    return real_limits(name, kind)
