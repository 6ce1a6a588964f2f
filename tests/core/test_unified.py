"""Unified inch threads (ASME B1.1): series tables, designations, limits of size.

Check values come from ASME B1.1 (tagged there [P] printed,
[C] computed from the published formula, [M] recalled); each assert names its source.
"""

from __future__ import annotations

import math
from fractions import Fraction

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

import shopterm.standards as registry
from shopterm.errors import InvalidEntry, ShoptermError, UnknownThread, UnsupportedClass
from shopterm.standards import unified
from shopterm.standards.forms import UNIFIED_60

IN = 25.4
TOL = 5e-9  # in; the module converts once to mm, we divide back


def lim(text: str):
    return unified.limits(unified.parse(text))


def inches(mm: float | None) -> float | None:
    return None if mm is None else mm / IN


# ---------------------------------------------------------------------------------------------
# Independent re-derivation of the ASME B1.1 formulas, in Fractions.
# ---------------------------------------------------------------------------------------------

def half_up(x: Fraction, places: int) -> Fraction:
    scale = 10 ** places
    return Fraction(math.floor(x * scale + Fraction(1, 2)), scale)


def td2_2a_increments(d: float, le: float, n: float) -> Fraction:
    # computed from Td2(2A) = 0.0015 D^(1/3) + 0.0015 sqrt(LE) + 0.015 P^(2/3),
    # ASME B1.1, each increment to 6 decimals as ASME B1.1 tabulates them (from memory)
    p = 1 / n
    return sum((half_up(Fraction(v), 6) for v in
                (0.0015 * d ** (1 / 3), 0.0015 * math.sqrt(le), 0.015 * p ** (2 / 3))),
               Fraction(0))


def derive(d: float, n: float, cls: str, le: float) -> dict[str, Fraction]:
    """Limits in inches from the ASME B1.1 formulas, written again without the module's code."""
    base = td2_2a_increments(d, le, n)
    factor = {"1A": Fraction(3, 2), "2A": Fraction(1), "3A": Fraction(3, 4),
              "1B": Fraction(39, 20), "2B": Fraction(13, 10), "3B": Fraction(39, 40)}[cls]
    td2 = half_up(base * factor, 4)
    pd = half_up(Fraction(d) - Fraction(0.649519) / Fraction(n), 4)
    if cls.endswith("B"):
        return {"pd_min": pd, "pd_max": pd + td2}
    es = half_up(Fraction(3, 10) * base, 4) if cls != "3A" else Fraction(0)
    td = half_up(Fraction((0.090 if cls == "1A" else 0.060) * (1 / n) ** (2 / 3)), 4)
    return {"pd_max": pd - es, "pd_min": pd - es - td2, "major_max": Fraction(d) - es,
            "major_min": Fraction(d) - es - td, "allowance": es}


# ---------------------------------------------------------------------------------------------
# Series tables
# ---------------------------------------------------------------------------------------------

ALL_ROWS = [(key, row) for key, rows in unified.SERIES.items() for row in rows]


@pytest.mark.parametrize("key,row", ALL_ROWS, ids=[f"{k} {r[0]}-{r[2]:g}" for k, r in ALL_ROWS])
def test_table_label_matches_major(key, row):
    label, major, _ = row
    if label.startswith("#"):
        # ASME B1.1 numbered sizes: #n = 0.060 + 0.013 n in
        expected = Fraction(60 + 13 * int(label[1:]), 1000)
    else:
        whole, _, frac = label.rpartition("-") if "/" in label else (label, "", "0/1")
        expected = Fraction(int(whole or 0)) + Fraction(frac)  # computed with fractions.Fraction
    assert Fraction(str(major)) == expected


@pytest.mark.parametrize("n,major", [(0, 0.060), (1, 0.073), (2, 0.086), (4, 0.112), (6, 0.138),
                                     (8, 0.164), (10, 0.190), (12, 0.216)])
def test_numbered_sizes(n, major):
    # ASME B1.1: #0 = 0.060 in, each number adds 0.013 in (values from memory)
    assert unified.numbered_major_in(n) == pytest.approx(major, abs=1e-12)


@pytest.mark.parametrize("key", ["UNC", "UNF", "UNEF"])
def test_graded_series_get_finer_as_size_falls(key):
    # a graded series never has more tpi at a bigger size (ASME B1.1 Table 1, from memory)
    rows = unified.SERIES[key]
    majors = [r[1] for r in rows]
    assert majors == sorted(majors)
    assert all(a[2] >= b[2] for a, b in zip(rows, rows[1:]))


@pytest.mark.parametrize("key,tpi", [("8-UN", 8), ("12-UN", 12), ("16-UN", 16)])
def test_constant_pitch_series_reach_4_in_and_skip_graded_sizes(key, tpi):
    rows = unified.SERIES[key]
    assert all(r[2] == tpi for r in rows)
    assert rows[-1][1] == 4.0  # the brief: constant-pitch series up to 4 in
    graded = {(r[1], r[2]) for k in ("UNC", "UNF", "UNEF") for r in unified.SERIES[k]}
    assert not graded & {(r[1], r[2]) for r in rows}


@pytest.mark.parametrize("size,tpi,series", [
    ("1/4", 20, "UNC"), ("3/8", 16, "UNC"), ("3/8", 24, "UNF"), ("1/2", 13, "UNC"),
    ("1/2", 20, "UNF"), ("1", 8, "UNC"),   # ASME B1.1 table rows
    ("#10", 32, "UNF"), ("#10", 24, "UNC"), ("2", 4.5, "UNC"), ("4", 4, "UNC"),  # from memory
    ("1-1/2", 12, "UNF"), ("1-11/16", 18, "UNEF"), ("1-1/8", 8, "8-UN"),  # from memory
])
def test_known_series_rows(size, tpi, series):
    assert any(r[0] == size and r[2] == tpi for r in unified.SERIES[series])


# ---------------------------------------------------------------------------------------------
# ASME B1.1 table, every row and column
# ---------------------------------------------------------------------------------------------

# thread, 2A allowance, 2A major max/min, 2A PD max/min, 3A PD max/min, 2B minor min/max,
# 2B PD min/max; None where the md row is blank.
MD_TABLE = [
    ("1/4-20 UNC", 0.0011, (0.2489, 0.2408), (0.2164, 0.2127), (0.2175, 0.2147),
     (0.196, 0.207), (0.2175, 0.2224)),
    ("3/8-16 UNC", 0.0013, (0.3737, 0.3643), (0.3331, 0.3287), (0.3344, 0.3311),
     (0.307, 0.321), (0.3344, 0.3401)),
    ("3/8-24 UNF", 0.0011, (0.3739, 0.3667), (0.3468, 0.3430), None, None, (0.3479, 0.3528)),
    ("1/2-13 UNC", 0.0015, (0.4985, 0.4876), (0.4485, 0.4435), None,
     (0.417, 0.434), (0.4500, 0.4565)),
    ("1/2-20 UNF", 0.0013, (0.4987, 0.4906), (0.4662, 0.4619), None, None, (0.4675, 0.4731)),
    ("1-8 UNC", 0.0020, (0.9980, 0.9830), (0.9168, 0.9100), None,
     (0.865, 0.890), (0.9188, 0.9276)),
]
IDS = [r[0] for r in MD_TABLE]


@pytest.mark.parametrize("thread,allowance,major,pd,_3a,_m,_pd", MD_TABLE, ids=IDS)
def test_md_table_external_2a(thread, allowance, major, pd, _3a, _m, _pd):
    # 2A columns [C], agreeing with the ASME B1.1 table [M]
    L = lim(thread + "-2A")
    assert inches(L.basic_pd - L.pd_max) == pytest.approx(allowance, abs=TOL)
    assert inches(L.basic_major - L.major_max) == pytest.approx(allowance, abs=TOL)
    assert inches(L.major_max) == pytest.approx(major[0], abs=TOL)
    assert inches(L.major_min) == pytest.approx(major[1], abs=TOL)
    assert inches(L.pd_max) == pytest.approx(pd[0], abs=TOL)
    assert inches(L.pd_min) == pytest.approx(pd[1], abs=TOL)


@pytest.mark.parametrize("thread,pd3a", [(r[0], r[4]) for r in MD_TABLE if r[4]],
                         ids=[r[0] for r in MD_TABLE if r[4]])
def test_md_table_external_3a(thread, pd3a):
    # ASME B1.1, 3A PD columns [C]: 3A = 0.75 x Td2(2A), no allowance
    L = lim(thread + "-3A")
    assert inches(L.pd_max) == pytest.approx(pd3a[0], abs=TOL)
    assert inches(L.pd_min) == pytest.approx(pd3a[1], abs=TOL)
    assert L.pd_max == L.basic_pd
    assert L.major_max == L.basic_major


@pytest.mark.parametrize("thread,minor,pd", [(r[0], r[5], r[6]) for r in MD_TABLE], ids=IDS)
def test_md_table_internal_2b(thread, minor, pd):
    # ASME B1.1, 2B columns [P]
    L = lim(thread + "-2B")
    assert inches(L.pd_min) == pytest.approx(pd[0], abs=TOL)
    assert inches(L.pd_max) == pytest.approx(pd[1], abs=TOL)
    if minor:
        assert inches(L.minor_min) == pytest.approx(minor[0], abs=TOL)
        assert inches(L.minor_max) == pytest.approx(minor[1], abs=TOL)
    assert L.major_min == L.basic_major  # ASME B1.1: internal major min = basic major
    assert L.major_max is None


@pytest.mark.parametrize("thread", IDS)
def test_md_table_2a_3a_re_derived(thread):
    # the [C] columns re-derived from the ASME B1.1 formulas with LE = D (UNC/UNF)
    spec = unified.parse(thread + "-2A")
    d, n = spec.major / IN, spec.tpi
    for cls in ("2A", "3A"):
        L = unified.limits(spec.with_(tol_class=cls))
        want = derive(d, n, cls, le=d)
        assert inches(L.pd_max) == pytest.approx(float(want["pd_max"]), abs=TOL)
        assert inches(L.pd_min) == pytest.approx(float(want["pd_min"]), abs=TOL)
        assert inches(L.major_min) == pytest.approx(float(want["major_min"]), abs=TOL)


def test_internal_minor_2b_rule_re_derived():
    # 2B minor, 1/4 in and up: min = basic minor, tolerance 0.25P - 0.40P^2
    # (ASME B1.1, from memory), printed to 0.001 in; recomputed here for 1/2-13 (ASME B1.1 table row 0.417 / 0.434)
    p = Fraction(1, 13)
    basic = half_up(Fraction(0.5) - Fraction(1.082532) * p, 4)
    tol = half_up(Fraction(0.25 * (1 / 13) - 0.40 * (1 / 13) ** 2), 4)
    L = lim("1/2-13 UNC-2B")
    assert inches(L.minor_max) == pytest.approx(float(half_up(basic + tol, 3)), abs=TOL)
    assert float(half_up(basic + tol, 3)) == pytest.approx(0.434, abs=1e-12)  # ASME B1.1 [P]


# ---------------------------------------------------------------------------------------------
# The rounding knife edge
# ---------------------------------------------------------------------------------------------

def test_quarter_20_2b_knife_edge():
    # ASME B1.1: 1.3 x Td2 = 0.00484998 must give 0.0049 and PD max 0.2224 [P]
    raw = 1.3 * (0.0015 * 0.25 ** (1 / 3) + 0.0015 * math.sqrt(0.25) + 0.015 * 0.05 ** (2 / 3))
    assert raw == pytest.approx(0.00484998, abs=5e-9)  # ASME B1.1 figure
    assert raw < 0.00485  # plain rounding would give 0.0048
    assert unified.pd_tolerance_in(0.25, 20, "2B") == pytest.approx(0.0049, abs=1e-12)
    assert inches(lim("1/4-20 UNC-2B").pd_max) == pytest.approx(0.2224, abs=TOL)  # ASME B1.1 [P]


def test_class_tolerances_round_from_unrounded_value():
    # ASME B1.1: 2B is 1.3 x the unrounded 2A value, not 1.3 x the rounded 0.0037
    t2a = unified.pd_tolerance_in(0.25, 20, "2A")
    assert t2a == pytest.approx(0.0037, abs=1e-12)  # ASME B1.1: 0.2164 - 0.2127
    assert round(1.3 * t2a, 4) == pytest.approx(0.0048, abs=1e-12)  # the wrong road
    assert unified.pd_tolerance_in(0.25, 20, "2B") != pytest.approx(round(1.3 * t2a, 4))


@pytest.mark.parametrize("cls,factor", [("1A", 1.5), ("3A", 0.75), ("1B", 1.95), ("3B", 0.975)])
def test_class_factors(cls, factor):
    # ASME B1.1 (from memory): class tolerances as multiples of 2A, 1/2-13 UNC (LE = D)
    base = td2_2a_increments(0.5, 0.5, 13)
    want = float(half_up(base * Fraction(factor), 4))
    assert unified.pd_tolerance_in(0.5, 13, cls) == pytest.approx(want, abs=1e-12)


def test_bad_class_for_tolerance():
    with pytest.raises(UnsupportedClass, match="1A, 2A, 3A"):
        unified.pd_tolerance_in(0.5, 13, "4A")


# ---------------------------------------------------------------------------------------------
# Basic dimensions, depth, root
# ---------------------------------------------------------------------------------------------

CAT = unified.catalogue()
CAT_IDS = [s.designation for s in CAT]


@pytest.mark.parametrize("spec", CAT, ids=CAT_IDS)
def test_basic_pd_and_minor_from_formulas(spec):
    # basic PD = D - 0.649519/n, basic internal minor = D - 1.082532/n (ASME B1.1),
    # tabulated to 0.0001 in
    L = unified.limits(spec)
    d, n = spec.major / IN, spec.tpi
    assert inches(L.basic_pd) == pytest.approx(float(half_up(Fraction(d - 0.649519 / n), 4)),
                                               abs=TOL)
    assert abs(inches(L.basic_pd) - (d - 0.649519 / n)) <= 0.00005 + TOL
    assert inches(L.basic_minor) == pytest.approx(
        float(half_up(Fraction(d - 1.082532 / n), 4)), abs=TOL)
    assert spec.pitch == pytest.approx(25.4 / n, rel=1e-15)  # exact inch, 25.4 mm


@pytest.mark.parametrize("text,kind,factor", [
    ("1/4-20 UNC-2A", "external", 0.613435),  # ISO 68-1 and ISO 965-1/-2: h3 = 17/24 H = 0.613435P
    ("1/4-20 UNC-2B", "internal", 0.541266),  # ISO 68-1 and ISO 965-1/-2: H1 = 5/8 H = 0.541266P
    ("1-8 UNC-2A", "external", 0.613435),
])
def test_depth(text, kind, factor):
    L = lim(text)
    assert L.spec.kind == kind
    assert L.depth == pytest.approx(factor * L.spec.pitch, rel=1e-6)
    # the same proportions from the form (ASME B1.1 basic profile = ISO 68-1, forms.py)
    h = UNIFIED_60.height * (17 / 24 if kind == "external" else 5 / 8)
    assert L.depth == pytest.approx(h * L.spec.pitch, rel=1e-6)


def test_unr_minor_and_root_radius():
    L = lim("1/4-20 UNRC-2A")
    # UNR minor max = D - allowance - 1.226869P (ASME B1.1, from memory): 0.25-0.0011-0.06134345
    assert inches(L.minor_max) == pytest.approx(0.1876, abs=TOL)  # from memory, ASME B1.1 table
    assert L.root_radius_min == pytest.approx(0.108 * L.spec.pitch, rel=1e-12)  # from memory
    assert L.root_radius_max == pytest.approx(0.144 * L.spec.pitch, rel=1e-12)  # from memory
    assert L.minor_min is None
    flat = lim("1/4-20 UNC-2A")
    # UN flat root: basic minor 0.1959 less allowance 0.0011 (the brief's rule, ASME B1.1 values)
    assert inches(flat.minor_max) == pytest.approx(0.1948, abs=TOL)
    assert flat.root_radius_min is None and flat.root_radius_max is None
    # UNR and UN share every other limit (ASME B1.1: same PD and major tolerances)
    assert (L.pd_max, L.pd_min, L.major_max) == (flat.pd_max, flat.pd_min, flat.major_max)


@pytest.mark.parametrize("text,le", [
    ("1/4-20 UNC-2A", 0.25), ("3/8-24 UNF-2A", 0.375), ("1-1/8-8 UN-2A", 1.125),  # ASME B1.1: LE = D
    ("1-1/16-12 UN-2A", 9 / 12), ("7/16-16 UN-2A", 9 / 16),  # ASME B1.1: LE = 9P for 12-, 16-UN
    ("1/2-28 UNEF-2A", 9 / 28),  # our choice for UNEF, see unified.length_of_engagement
])
def test_length_of_engagement(text, le):
    spec = unified.parse(text)
    assert unified.length_of_engagement(spec.series, spec.major / IN, spec.tpi) == \
        pytest.approx(le, rel=1e-12)
    L = unified.limits(spec)
    want = derive(spec.major / IN, spec.tpi, "2A", le)
    assert inches(L.pd_min) == pytest.approx(float(want["pd_min"]), abs=TOL)


# ---------------------------------------------------------------------------------------------
# Whole catalogue: the formulas again, and invariants
# ---------------------------------------------------------------------------------------------

@pytest.mark.parametrize("spec", CAT, ids=CAT_IDS)
def test_catalogue_limits_re_derived_and_ordered(spec):
    d, n = spec.major / IN, spec.tpi
    le = unified.length_of_engagement(spec.series, d, n)
    widths = {}
    for cls in ("1A", "2A", "3A", "1B", "2B", "3B"):
        kind = "external" if cls.endswith("A") else "internal"
        L = unified.limits(spec.with_(tol_class=cls, kind=kind))
        want = derive(d, n, cls, le)
        assert inches(L.pd_max) == pytest.approx(float(want["pd_max"]), abs=TOL)
        assert inches(L.pd_min) == pytest.approx(float(want["pd_min"]), abs=TOL)
        assert L.pd_min < L.pd_max
        widths[cls] = L.pd_tolerance
        if kind == "external":
            assert L.major_min < L.major_max <= L.basic_major
            assert L.pd_max <= L.basic_pd
            assert L.minor_max < L.pd_min
        else:
            assert L.pd_min == L.basic_pd
            assert L.minor_min < L.minor_max < L.pd_min
    assert widths["3A"] < widths["2A"] < widths["1A"]
    assert widths["3B"] < widths["2B"] < widths["1B"]


def test_limits_are_mm():
    # conversion once at the end, 25.4 mm/in exactly (NIST SP 811); ASME B1.1 1/4-20 2A PD max
    assert lim("1/4-20 UNC-2A").pd_max == pytest.approx(0.2164 * 25.4, abs=1e-9)


def test_limits_without_class_use_class_2():
    L = lim("1/4-20 UNC")
    assert L.pd_max == lim("1/4-20 UNC-2A").pd_max
    assert any("2A" in note for note in L.notes)
    internal = unified.limits(unified.parse("1/4-20 UNC").with_(kind="internal"))
    assert internal.pd_max == lim("1/4-20 UNC-2B").pd_max


def test_limits_refuse_class_of_other_kind():
    spec = unified.parse("1/4-20 UNC-2A").with_(kind="internal")
    with pytest.raises(UnsupportedClass, match="1B, 2B, 3B"):
        unified.limits(spec)


# ---------------------------------------------------------------------------------------------
# Designations
# ---------------------------------------------------------------------------------------------

@pytest.mark.parametrize("text,series,size,major_in,tpi,kind,cls", [
    ("1/4-20 UNC-2A", "UNC", "1/4", 0.25, 20, "external", "2A"),
    ("#10-32 UNF-3B", "UNF", "#10", 0.19, 32, "internal", "3B"),
    ("1/2-13 UNC-2A", "UNC", "1/2", 0.5, 13, "external", "2A"),
    ("1-8 UNC-2A", "UNC", "1", 1.0, 8, "external", "2A"),
    ("1-1/8-8 UN-2A", "8-UN", "1-1/8", 1.125, 8, "external", "2A"),
    ("0.250-20 UNC-2A", "UNC", "0.250", 0.25, 20, "external", "2A"),
    ("10-32 UNF-2A", "UNF", "#10", 0.19, 32, "external", "2A"),     # bare number is #10
    ("1-64 UNC-2A", "UNC", "#1", 0.073, 64, "external", "2A"),      # only #1 has 64 tpi
    ("No. 6-32 UNC-2B", "UNC", "#6", 0.138, 32, "internal", "2B"),
    ("1 1/8-12 UNF-1A", "UNF", "1-1/8", 1.125, 12, "external", "1A"),
    ("2-4.5 UNC-2A", "UNC", "2", 2.0, 4.5, "external", "2A"),
    ("1/4-20unc-2a", "UNC", "1/4", 0.25, 20, "external", "2A"),
    ("1/4-20 UNC 2A", "UNC", "1/4", 0.25, 20, "external", "2A"),
    ("1/4-20 UNC", "UNC", "1/4", 0.25, 20, "external", None),
])
def test_parse(text, series, size, major_in, tpi, kind, cls):
    # sizes and tpi: ASME B1.1 Table 1 series, from memory
    s = unified.parse(text)
    assert (s.family, s.series, s.size, s.kind, s.tol_class) == ("unified", series, size, kind,
                                                                 cls)
    assert s.major == pytest.approx(major_in * 25.4, abs=1e-12)
    assert s.tpi == tpi and s.pitch == pytest.approx(25.4 / tpi, rel=1e-15)
    assert s.native_unit == "in" and s.form is UNIFIED_60 and s.starts == 1


def test_multi_start():
    s = unified.parse("0.750-0.0625P-0.1875L (3 STARTS) UNF-2A")
    assert (s.size, s.series, s.starts, s.tpi) == ("0.750", "UNF", 3, 16)
    assert s.pitch == pytest.approx(0.0625 * 25.4, rel=1e-12)
    assert s.lead == pytest.approx(0.1875 * 25.4, rel=1e-12)
    assert unified.format(s) == "0.750-0.0625P-0.1875L (3 STARTS) UNF-2A"
    assert unified.parse(unified.format(s)) == s
    # starts derived when the count is left out; spacing and a hyphen before the series are fine
    assert unified.parse("0.750-0.0625P-0.125L UNF-2A").starts == 2
    assert unified.parse("3/4-.0625P-.1875L(3 STARTS)-UNF-2A").starts == 3
    # PD tolerance widened for 3 starts by 15 % (ASME B1.1, from memory), allowance unchanged
    single = lim("3/4-16 UNF-2A")
    triple = unified.limits(s)
    base = td2_2a_increments(0.75, 0.75, 16)
    assert inches(triple.pd_tolerance) == pytest.approx(float(half_up(base * Fraction(115, 100),
                                                                      4)), abs=TOL)
    assert triple.pd_max == single.pd_max
    assert triple.pd_tolerance > single.pd_tolerance


@pytest.mark.parametrize("text,match", [
    ("0.750-0.0625P-0.1875L (2 STARTS) UNF-2A", "3 starts but 2"),
    ("0.750-0.0625P-0.2L UNF-2A", "whole number"),
    ("0.750-0.0625P-0.03125L UNF-2A", "whole number"),
    ("0.750-0P-0L UNF-2A", "greater than zero"),
    ("0.750-0.0625P (0 STARTS) UNF-2A", "at least 1"),
])
def test_multi_start_errors(text, match):
    with pytest.raises(InvalidEntry, match=match):
        unified.parse(text)


def test_multi_start_pitch_not_in_series():
    with pytest.raises(UnknownThread) as err:
        unified.parse("0.750-0.05P-0.15L (3 STARTS) UNF-2A")
    assert err.value.suggestions[0] == "0.750-16 UNF-2A"  # ASME B1.1 3/4-16 UNF, from memory


@pytest.mark.parametrize("text,first", [
    ("1/4-21 UNC-2A", "1/4-20 UNC-2A"),     # the brief's example; 1/4-20 UNC, ASME B1.1
    ("1/2-12 UNC-2B", "1/2-13 UNC-2B"),     # ASME B1.1 row 1/2-13 UNC
    ("3/8-20 UNF-2A", "3/8-24 UNF-2A"),     # ASME B1.1 row 3/8-24 UNF
    ("#10-30 UNF", "#10-32 UNF"),           # ASME B1.1 #10-32 UNF, from memory
    ("1/4-20 UNF-2A", "1/4-28 UNF-2A"),     # ASME B1.1 1/4-28 UNF, from memory
    ("5/32-32 UNC-2A", "#8-32 UNC-2A"),     # no 5/32 UNC: the nearest size (#8 = 0.164 in)
])
def test_suggestions(text, first):
    with pytest.raises(UnknownThread) as err:
        unified.parse(text)
    assert err.value.suggestions[0] == first
    assert first in str(err.value)
    for s in err.value.suggestions:  # every suggestion is itself a valid thread
        assert isinstance(unified.parse(s), registry.ThreadSpec)


@pytest.mark.parametrize("text,exc,match", [
    ("1/4-20 UNC-2", InvalidEntry, "2A .*2B"),
    ("1/4-20 UNC-4A", UnsupportedClass, "1A, 2A, 3A"),
    ("1/4-20 UNC-5B", UnsupportedClass, "1B, 2B, 3B"),
    ("1/4-20 UNC-2C", InvalidEntry, "not a Unified class"),
    ("1/4-20 UNRC-2B", InvalidEntry, "screws only"),
    ("1/0-20 UNC-2A", InvalidEntry, "0 below the line"),
    ("1/4-0 UNC-2A", InvalidEntry, "greater than zero"),
])
def test_class_and_entry_errors(text, exc, match):
    with pytest.raises(exc, match=match):
        unified.parse(text)


@pytest.mark.parametrize("text", ["M10x1.5-6g", "1/4 BSW", "2BA", "1/4x40 ME", "1/4-20",
                                  "1/4-20 UNS-2A", "1/4-20 UNJC-3A", "", "UNC", "hello"])
def test_not_unified(text):
    assert unified.parse(text) is None


@pytest.mark.parametrize("text", ["1/4-20 UNRC-2A", "#10-32 UNRF-3A", "1/2-28 UNREF-2A",
                                  "1-1/8-8 UNR-2A", "1/4-20 UN-2B", "1-8 UN-2A", "0.250-20 UNC-1B",
                                  "0.750-0.0625P-0.1875L (3 STARTS) UNF-2A", "1/4-20 UNC"])
def test_format_round_trip_variants(text):
    s = unified.parse(text)
    assert unified.format(s) == text
    assert unified.parse(unified.format(s)) == s


def test_plain_un_keeps_series_and_limits():
    un, unc = unified.parse("1/4-20 UN-2A"), unified.parse("1/4-20 UNC-2A")
    assert un.series == "UNC"
    assert unified.limits(un).pd_min == unified.limits(unc).pd_min


@pytest.mark.parametrize("spec", CAT, ids=CAT_IDS)
def test_catalogue_round_trip(spec):
    assert spec.tol_class == "2A" and spec.kind == "external"
    assert spec.family == "unified" and spec.native_unit == "in"
    assert unified.parse(unified.format(spec)) == spec
    assert "LH" not in unified.format(spec)


def test_catalogue_covers_series():
    keys = {(s.series, s.size) for s in CAT}
    assert ("UNF", "#0") in keys and ("UNC", "4") in keys and ("UNEF", "1-1/2") in keys
    assert len(CAT) == sum(len(rows) for rows in unified.SERIES.values())
    assert len({s.designation for s in CAT}) == len(CAT)


def test_classes():
    assert unified.classes(unified.parse("1/4-20 UNC-2A")) == ["1A", "2A", "3A"]
    assert unified.classes(unified.parse("1/4-20 UNC-2B")) == ["1B", "2B", "3B"]


# ---------------------------------------------------------------------------------------------
# Property tests
# ---------------------------------------------------------------------------------------------

@settings(max_examples=300, deadline=None)
@given(st.text(alphabet="0123456789/#.-() PLUNCFERSTABNOlx", max_size=40))
def test_parse_never_tracebacks(text):
    try:
        out = unified.parse(text)
    except ShoptermError:
        return
    assert out is None or isinstance(out, registry.ThreadSpec)


@settings(max_examples=200, deadline=None)
@given(st.sampled_from(CAT), st.sampled_from(["1A", "2A", "3A", "1B", "2B", "3B"]),
       st.booleans())
def test_round_trip_any_class_and_case(spec, cls, lower):
    spec = spec.with_(tol_class=cls, kind="external" if cls.endswith("A") else "internal")
    text = unified.format(spec)
    assert unified.parse(text.lower() if lower else text) == spec


# ---------------------------------------------------------------------------------------------
# Through the registry
# ---------------------------------------------------------------------------------------------

def test_registry_parse_and_limits():
    s = registry.parse("#10-32 UNF-3B")
    assert (s.family, s.kind, s.tol_class, s.tpi) == ("unified", "internal", "3B", 32)
    assert s.major == pytest.approx(0.190 * 25.4)  # ASME B1.1 #10 = 0.190 in
    L = registry.limits(s)
    base = td2_2a_increments(0.19, 0.19, 32)
    assert inches(L.pd_tolerance) == pytest.approx(float(half_up(base * Fraction(39, 40), 4)),
                                                   abs=TOL)  # computed from ASME B1.1, 3B = 0.975 x 2A
    assert registry.classes(s) == ["1B", "2B", "3B"]


def test_registry_hand_and_kind():
    s = registry.parse("1/4-20 UNC-2A LH")
    assert s.hand == "LH" and s.designation == "1/4-20 UNC-2A LH"
    assert unified.format(s) == "1/4-20 UNC-2A"
    assert registry.parse("1/4-20 UNC internal").kind == "internal"
    with pytest.raises(InvalidEntry, match="B for internal"):
        registry.parse("1/4-20 UNC-2A", kind="internal")


def test_registry_suggests_and_lists():
    with pytest.raises(UnknownThread) as err:
        registry.parse("1/4-21 UNC-2A")
    assert "1/4-20 UNC-2A" in err.value.suggestions
    assert "1/4-20 UNC-2A" in {s.designation for s in registry.catalogue()}


@settings(max_examples=300, deadline=None)
@given(st.sampled_from(["1/4", "#10", "10", "1", "1-1/8", "1 1/8", "0.250", ".75", "5/32", "#7",
                        "3/0", "9/16", "4", "No. 2"]),
       st.one_of(st.integers(0, 90).map(str), st.sampled_from(["4.5", "0.0625P-0.1875L",
                                                                "0.05P (2 STARTS)"])),
       st.sampled_from(["UNC", "UNF", "UNEF", "UN", "UNRC", "UNR", "unf", "UNS"]),
       st.sampled_from(["", "-2A", "-3B", "-2", "-4A", " 1b", "-XX"]))
def test_designation_like_text_is_answered(size, tpi, word, cls):
    # any designation-shaped text gives a thread or a ShoptermError whose message says what to do
    text = f"{size}-{tpi} {word}{cls}"
    try:
        spec = unified.parse(text)
    except ShoptermError as exc:
        assert str(exc)
        return
    if spec is not None:
        assert unified.parse(unified.format(spec)) == spec


# ---------------------------------------------------------------------------------------------
# Internal minor diameter minimum: the basic minor as the table prints it (0.0001 in), then
# rounded to the class's step (0.001 in for 1B/2B from 1/4 in up, else 0.0001 in).
# ---------------------------------------------------------------------------------------------

@pytest.mark.parametrize("thread,minor_min", [
    ("1-3/4-5 UNC-2B", 1.534),   # ASME B1.1 table, 1-3/4-5 UNC-2B minor dia min
    ("1-3/4-5 UNC-1B", 1.534),   # ASME B1.1 table, 1-3/4-5 UNC-1B minor dia min
    ("3/8-16 UNC-2B", 0.307),    # ASME B1.1 table, minor min
    ("1/4-20 UNC-2B", 0.196),    # ASME B1.1 table, minor min
    ("1-8 UNC-2B", 0.865),       # ASME B1.1 table, minor min
])
def test_internal_minor_min_printed(thread, minor_min):
    assert inches(lim(thread).minor_min) == pytest.approx(minor_min, abs=TOL)


@pytest.mark.parametrize("spec", [s for s in registry.catalogue()
                                  if s.family == "unified" and s.starts == 1],
                         ids=lambda s: s.designation)
def test_internal_minor_min_rule_whole_catalogue(spec):
    # Computed from the ASME B1.1 formula D - 1.082532/n, rounded half up first to 0.0001 in
    # (the printed basic minor), then to the class's step; rounding the unrounded value once
    # gives 1.533 for 1-3/4-5, where the ASME B1.1 table prints 1.534.
    d = Fraction(str(round(spec.major / IN, 4)))
    basic = half_up(d - Fraction("1.082532") / Fraction(str(spec.tpi)), 4)
    for cls in ("1B", "2B", "3B"):
        L = unified.limits(spec.with_(kind="internal", tol_class=cls))
        places = 3 if cls in ("1B", "2B") and d >= Fraction(1, 4) else 4
        assert inches(L.minor_min) == pytest.approx(float(half_up(basic, places)), abs=TOL)
        assert inches(L.basic_minor) == pytest.approx(float(basic), abs=TOL)
