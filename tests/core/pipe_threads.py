"""Pipe threads for the taper tests: the published values they check against, and the
standards' own limits (``pipe_limits(name)``)."""

from __future__ import annotations


from shopterm.standards.spec import Limits

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


def real_limits(name: str, kind: str | None = None) -> Limits:
    """Return the standards' own limits of ``name`` (a missing family fails, it is not skipped)."""
    from shopterm import standards
    return standards.limits(standards.parse(name, kind=kind))


def pipe_limits(name: str, kind: str = "external") -> Limits:
    """Return the limits the taper tests use for ``name``: the catalogue's own."""
    return real_limits(name, kind)
