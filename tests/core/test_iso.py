"""ISO metric family: limits of size against ISO 965-2 values, ISO 965-1 table cells, designations.

Check values come from (ISO 965-2 limits as printed in
published fastener and tap tables) and ISO 965-1 (its tables as transcribed in two independent
published copies compared cell by cell, cross-checked against FED-STD-H28/21B where that document quotes a value).
"""

from __future__ import annotations

import math

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

import shopterm.standards as standards
from shopterm.errors import InvalidEntry, ShoptermError, UnknownThread, UnsupportedClass
from shopterm.standards import iso
from shopterm.standards.forms import ISO_60

# ----------------------------------------------------------------------------- ISO 965-2 limits

# (designation, d max, d min, d2 max, d2 min, d3 max or None)
EXTERNAL_6G = [
    ("M3x0.5-6g", 2.980, 2.874, 2.655, 2.580, None),    # ISO 965-2, M3x0.5-6g
    ("M5x0.8-6g", 4.976, 4.826, 4.456, 4.361, None),    # ISO 965-2, M5x0.8-6g
    ("M6x1-6g", 5.974, 5.794, 5.324, 5.212, None),      # ISO 965-2, M6x1-6g
    ("M10x1.5-6g", 9.968, 9.732, 8.994, 8.862, 8.128),  # ISO 965-2, M10x1.5-6g
    ("M8x1-6g", 7.974, 7.794, 7.324, 7.212, None),      # ISO 965-2, M8x1-6g
    ("M10x1.25-6g", 9.972, 9.760, 9.160, 9.042, None),  # ISO 965-2, M10x1.25-6g
    ("M12x1.5-6g", 11.968, 11.732, 10.994, 10.854, None),  # ISO 965-2, M12x1.5-6g
    ("M16x1.5-6g", 15.968, 15.732, 14.994, 14.854, None),  # ISO 965-2, M16x1.5-6g
]

# (designation, D1 min, D1 max or None, D2 min, D2 max)
INTERNAL_6H = [
    ("M3x0.5-6H", None, None, 2.675, 2.775),           # ISO 965-2, M3x0.5-6H
    ("M5x0.8-6H", None, None, 4.480, 4.605),           # ISO 965-2, M5x0.8-6H
    ("M6x1-6H", None, None, 5.350, 5.500),             # ISO 965-2, M6x1-6H
    ("M10x1.5-6H", 8.376, 8.676, 9.026, 9.206),        # ISO 965-2, M10x1.5-6H
    ("M12x1.75-6H", 10.106, 10.441, 10.863, 11.063),   # ISO 965-2, M12x1.75-6H
    ("M10x1.25-6H", 8.647, 8.912, 9.188, 9.348),       # ISO 965-2, M10x1.25-6H
    ("M12x1.5-6H", 10.376, 10.676, 11.026, 11.216),    # ISO 965-2, M12x1.5-6H
]


@pytest.mark.parametrize("text,dmax,dmin,d2max,d2min,d3max", EXTERNAL_6G)
def test_external_limits_match_iso965_2(text, dmax, dmin, d2max, d2min, d3max):
    lim = iso.limits(iso.parse(text))
    assert lim.major_max == pytest.approx(dmax, abs=1e-9)
    assert lim.major_min == pytest.approx(dmin, abs=1e-9)
    assert lim.pd_max == pytest.approx(d2max, abs=1e-9)
    assert lim.pd_min == pytest.approx(d2min, abs=1e-9)
    if d3max is not None:
        assert lim.minor_max == pytest.approx(d3max, abs=1e-9)
    assert lim.minor_min is None
    assert lim.notes == ()


@pytest.mark.parametrize("text,d1min,d1max,d2min,d2max", INTERNAL_6H)
def test_internal_limits_match_iso965_2(text, d1min, d1max, d2min, d2max):
    spec = iso.parse(text)
    assert spec.kind == "internal"
    lim = iso.limits(spec)
    assert lim.pd_min == pytest.approx(d2min, abs=1e-9)
    assert lim.pd_max == pytest.approx(d2max, abs=1e-9)
    if d1min is not None:
        assert lim.minor_min == pytest.approx(d1min, abs=1e-9)
        assert lim.minor_max == pytest.approx(d1max, abs=1e-9)
    assert lim.major_min == pytest.approx(spec.major, abs=1e-9)  # H: EI = 0, ISO 965-1 Table 1
    assert lim.major_max is None
    assert lim.root_radius_min is None


def _round3(x):
    """Half-away-from-zero to 0.001 mm, done independently of shopterm.units."""
    from decimal import ROUND_HALF_UP, Decimal
    return float(Decimal(repr(x)).quantize(Decimal("0.001"), rounding=ROUND_HALF_UP))


# [C] rows: re-derive from ISO 68-1 basic dimensions and ISO 965-1 table cells.
# (designation, d, P, es [µm], Td [µm], Td2 [µm], d max, d min, d2 max, d2 min as listed)
DERIVED_6G = [
    # M12x1.75-6g: es g(1.75) = -34 (Table 1), Td6(1.75) = 265 (Td table), Td2 grade 6
    # (11.2-22.4, P1.75) = 150 (Td2 table), ISO 965-1 tables (two published copies compared)
    ("M12-6g", 12.0, 1.75, -34, 265, 150, 11.966, 11.701, 10.829, 10.679),  # ISO 68-1 and ISO 965-1/-2 (computed)
    # M24x3-6g: es g(3) = -48, Td6(3) = 375, Td2 grade 6 (22.4-45, P3) = 200, ISO 965-1 tables (two published copies compared)
    ("M24-6g", 24.0, 3.0, -48, 375, 200, 23.952, 23.577, 22.003, 21.803),   # ISO 68-1 and ISO 965-1/-2 (computed)
]


@pytest.mark.parametrize("text,d,p,es,td,td2,dmax,dmin,d2max,d2min", DERIVED_6G)
def test_computed_rows_rederived(text, d, p, es, td, td2, dmax, dmin, d2max, d2min):
    # computed from d max = d + es, d min = d max - Td, d2 = d - 0.649519P (ISO 68-1),
    # d2 max = d2 + es, d2 min = d2 max - Td2 (ISO 965-1)
    d2 = d - 0.649519 * p
    mine = (_round3(d + es / 1000), _round3(d + es / 1000 - td / 1000),
            _round3(d2 + es / 1000), _round3(d2 + es / 1000 - td2 / 1000))
    assert mine == pytest.approx((dmax, dmin, d2max, d2min), abs=1e-9)
    lim = iso.limits(iso.parse(text))
    assert (lim.major_max, lim.major_min, lim.pd_max, lim.pd_min) == pytest.approx(mine, abs=1e-9)
    # the table cells the derivation used are the ones the module reads
    assert iso.fundamental_deviation("g", p) == pytest.approx(es / 1000)
    assert iso.major_tolerance(6, p) == pytest.approx(td / 1000)
    assert iso.pd_tolerance(6, d, p) == pytest.approx(td2 / 1000)


def test_minor_max_is_d3_plus_es():
    # computed from d3 = d - 1.226869P (ISO 68-1), d3 max = d3 + es with
    # es g(1.75) = -34 µm (ISO 965-1 Table 1): 12 - 2.14702075 - 0.034 = 9.81897925
    lim = iso.limits(iso.parse("M12-6g"))
    assert lim.minor_max == pytest.approx(_round3(12 - 1.226869 * 1.75 - 0.034), abs=1e-9)
    assert lim.minor_max == pytest.approx(9.819, abs=1e-9)
    assert lim.basic_minor == pytest.approx(12 - 1.226869 * 1.75)


# ----------------------------------------------------------------------------- basic profile

@pytest.mark.parametrize("text,h3", [
    ("M3", 0.307),    # tap maker's table of ISO 68 values
    ("M6", 0.613),    # tap maker's table of ISO 68 values
    ("M10", 0.920),   # tap maker's table of ISO 68 values
    ("M12", 1.074),   # tap maker's table of ISO 68 values
])
def test_external_thread_depth_h3(text, h3):
    lim = iso.limits(iso.parse(text))
    assert _round3(lim.depth) == pytest.approx(h3, abs=1e-9)
    # computed from h3 = 17/24 H, H = sqrt(3)/2 P (ISO 68-1)
    assert lim.depth == pytest.approx(17 / 24 * math.sqrt(3) / 2 * lim.spec.pitch, abs=1e-6)


@pytest.mark.parametrize("text", ["M3-6H", "M10-6H", "M24x2-6H"])
def test_internal_depth_h1_and_basic_minor(text):
    lim = iso.limits(iso.parse(text))
    p = lim.spec.pitch
    # computed from H1 = 5/8 H, H = sqrt(3)/2 P (ISO 68-1)
    assert lim.depth == pytest.approx(5 / 8 * math.sqrt(3) / 2 * p, abs=1e-6)
    # computed from D1 = D - 2 H1 = D - 1.082532P (ISO 68-1)
    assert lim.basic_minor == pytest.approx(lim.spec.major - 2 * 5 / 8 * math.sqrt(3) / 2 * p,
                                            abs=1e-6)


def test_form_and_root_radius():
    lim = iso.limits(iso.parse("M10x1.5-6g"))
    assert lim.spec.form is ISO_60
    assert lim.root_radius_min == pytest.approx(0.125 * 1.5)  # ISO 965-1 min root radius 0.125P
    # computed from d2 = d - 3/8 sqrt(3) P (ISO 68-1; 0.649519P as printed)
    assert lim.basic_pd == pytest.approx(10 - 3 / 8 * math.sqrt(3) * 1.5, abs=1e-6)


def test_lead_angle_m10():
    lim = iso.limits(iso.parse("M10x1.5-6g"))
    # computed from atan(P / (pi d2)) with d2 = 9.026 (ISO 724 basic pitch diameter of M10x1.5)
    expected = math.degrees(math.atan(1.5 / (math.pi * 9.026)))
    assert lim.lead_angle_deg == pytest.approx(expected, abs=1e-4)
    assert lim.lead_angle_deg == pytest.approx(3.028, abs=1e-3)  # computed from the same formula, 3.028057°


# ----------------------------------------------------------------------------- table cells

@pytest.mark.parametrize("position,pitch,um", [
    ("g", 1.25, -28),   # FED-STD-H28/21B, es g for P1.25
    ("g", 1.5, -32),    # FED-STD-H28/21B, es g for P1.5
    ("e", 1.5, -67),    # FED-STD-H28/21B, es e for P1.5
    ("h", 1.5, 0),      # ISO 965-1 Table 1, es h = 0
    ("H", 2.0, 0),      # ISO 965-1 Table 1, EI H = 0
    ("G", 1.5, 32),     # ISO 965-1 Table 1, EI G(1.5) = +32
    ("f", 0.35, -34),   # ISO 965-1 Table 1
])
def test_fundamental_deviations(position, pitch, um):
    assert iso.fundamental_deviation(position, pitch) == pytest.approx(um / 1000)


def test_tolerances_cross_checked_with_fed_std():
    assert iso.major_tolerance(6, 1.25) == pytest.approx(0.212)           # FED-STD-H28/21B, Td6(1.25)
    assert iso.major_tolerance(6, 1.5) == pytest.approx(0.236)            # FED-STD-H28/21B, Td6(1.5)
    assert iso.pd_tolerance(4, 30, 1.5) == pytest.approx(0.095)           # FED-STD-H28/21B, Td2 grade 4, 22.4-45, P1.5
    assert iso.pd_tolerance(6, 30, 1.5, "internal") == pytest.approx(0.200)  # FED-STD-H28/21B, TD2 grade 6, 22.4-45, P1.5
    assert iso.minor_tolerance(6, 1.5) == pytest.approx(0.300)            # FED-STD-H28/21B, TD1 grade 6, P1.5
    # the same cells reached through limits(): band widths
    assert iso.limits(iso.parse("M30x1.5-4h")).pd_tolerance == pytest.approx(0.095, abs=1e-9)  # FED-STD-H28/21B
    lim = iso.limits(iso.parse("M30x1.5-6H"))
    assert lim.pd_tolerance == pytest.approx(0.200, abs=1e-9)          # FED-STD-H28/21B
    assert lim.minor_max - lim.minor_min == pytest.approx(0.300, abs=1e-9)  # FED-STD-H28/21B


def test_stored_table_not_clause13_formula():
    # ISO 965-1 tables (two published copies compared): M3x0.5 Td2 grade 6 is 75 in the table (formula 90 P^0.4 d^0.1 gives 80),
    # M10x1.5 TD2 grade 6 is 180 (formula 170)
    assert iso.pd_tolerance(6, 3, 0.5) == pytest.approx(0.075)
    assert iso.pd_tolerance(6, 10, 1.5, "internal") == pytest.approx(0.180)


@pytest.mark.parametrize("d,pitch,um", [
    (1.4, 0.3, 56),    # ISO 965-1 tables (two published copies compared) Td2 grade 6: 1.4 is 'up to and including' of 0.99-1.4
    (45, 1.5, 150),    # ISO 965-1 tables (two published copies compared) Td2 grade 6, row 22.4-45 (45 included)
    (48, 1.5, 160),    # ISO 965-1 tables (two published copies compared) Td2 grade 6, row 45-90 (over 45)
    (5.6, 0.8, 95),    # ISO 965-1 tables (two published copies compared) Td2 grade 6, row 2.8-5.6
])
def test_diameter_range_edges(d, pitch, um):
    assert iso.pd_tolerance(6, d, pitch) == pytest.approx(um / 1000)


@pytest.mark.parametrize("call", [
    lambda: iso.fundamental_deviation("e", 0.4),      # ISO 965-1 tables (two published copies compared): e '-' for P < 0.5
    lambda: iso.fundamental_deviation("f", 0.3),      # ISO 965-1 tables (two published copies compared): f '-' for P < 0.35
    lambda: iso.major_tolerance(8, 0.5),              # ISO 965-1 tables (two published copies compared): Td8 '-' at P0.5
    lambda: iso.minor_tolerance(6, 0.25),             # ISO 965-1 tables (two published copies compared): TD1_6 '-' at P0.25
    lambda: iso.pd_tolerance(8, 3, 0.5),              # ISO 965-1 tables (two published copies compared): Td2_8 '-' 2.8-5.6 P0.5
    lambda: iso.pd_tolerance(8, 30, 1, "internal"),   # ISO 965-1 tables (two published copies compared): TD2_8 '-' 22.4-45 P1
    lambda: iso.fundamental_deviation("d", 1.0),      # ISO 965-1 Table 1 has no position d
])
def test_missing_cells_are_refused(call):
    with pytest.raises(UnsupportedClass):
        call()


def test_data_files_name_their_source():
    from importlib.resources import files
    names = ["iso965-1_table1_fundamental_deviations.csv", "iso965-1_td_major_external.csv",
             "iso965-1_td1_minor_internal.csv", "iso965-1_td2_pitch_external.csv",
             "iso965-1_TD2_pitch_internal.csv", "iso965-1_table2_engagement.csv",
             "iso261_series.csv"]
    for name in names:
        text = files("shopterm.data").joinpath(name).read_text(encoding="utf-8")
        assert text.startswith("# Source: ISO"), name
        assert "rovisional" in text or "FED-STD" in text, name


# ----------------------------------------------------------------------------- classes

def test_refused_e_below_half_mm():
    # ISO 965-1 tables (two published copies compared): Table 1 has no e for P < 0.5
    with pytest.raises(UnsupportedClass) as err:
        iso.parse("M2x0.4-6e")
    msg = str(err.value)
    assert "6g" in msg and "6h" in msg and "6e," not in msg
    assert err.value.suggestions[0] == "M2-6g"


def test_refused_6e_at_p035_and_8g_at_p05():
    with pytest.raises(UnsupportedClass, match="6g"):
        iso.parse("M3x0.35-6e")      # ISO 965-1 tables (two published copies compared): e '-' at P0.35
    with pytest.raises(UnsupportedClass, match="grade 8"):
        iso.parse("M3-8g")           # ISO 965-1 tables (two published copies compared): Td2_8 and Td8 '-' at P0.5


@pytest.mark.parametrize("text,exc", [
    ("M1x0.2-6H", UnsupportedClass),    # ISO 965-1 tables (two published copies compared): TD2_6/TD1_6 '-' at P0.2
    ("M1x0.2-6f", UnsupportedClass),    # ISO 965-1 tables (two published copies compared): f '-' for P < 0.35
    ("M10-6d", UnsupportedClass),       # ISO 965-1 Table 1: positions e f g h, G H
    ("M10-6E", UnsupportedClass),       # ISO 965-1 tables (two published copies compared) holds internal G and H only
    ("M10-2g", UnsupportedClass),       # ISO 965-1: Td2 grades 3..9, Td 4, 6, 8
    ("M10-3g", UnsupportedClass),       # ISO 965-1: no Td (crest) grade 3
    ("M10-9H", UnsupportedClass),       # ISO 965-1: TD2 grades 4..8
    ("M10-6gg", InvalidEntry),          # not written grade-letter
    ("M10-5g6h", InvalidEntry),         # halves of a combined class differ in letter
    ("M10-5g6G", InvalidEntry),         # one class cannot be both external and internal
])
def test_bad_classes(text, exc):
    with pytest.raises(exc) as err:
        iso.parse(text)
    assert str(err.value)


def test_classes_lists_only_cells_that_exist():
    ext = iso.classes(iso.parse("M10"))
    assert ext[:7] == ["4h", "6e", "6f", "6g", "6h", "8g", "8e"]   # from memory, ISO 965-1 classes
    assert {"4h", "6e", "6f", "6g", "6h", "8g", "5g6g", "7g6g"} <= set(ext)
    small = iso.classes(iso.parse("M2x0.4"))
    assert "6e" not in small and "8g" not in small and "6g" in small  # ISO 965-1 tables (two published copies compared): e, Td8 '-'
    internal = iso.classes(iso.parse("M10-6H"))
    assert internal[:6] == ["4H", "5H", "6G", "6H", "7G", "7H"]   # from memory, ISO 965-1 classes
    assert all(c[-1].isupper() for c in internal)
    assert iso.classes(iso.parse("M1x0.2").with_(kind="internal")) == ["4H"]  # ISO 965-1 tables (two published copies compared)
    for c in ext + internal:      # every listed class gives limits
        assert iso.limits(iso.parse(f"M10-{c}")).pd_tolerance > 0


@pytest.mark.parametrize("text,d2_band_um,crest_band_um", [
    ("M10-4h6h", 85, 236),     # ISO 965-1 tables (two published copies compared): Td2 grade 4 (5.6-11.2, P1.5) = 85, Td6(1.5) = 236
    ("M10-5g6g", 106, 236),    # ISO 965-1 tables (two published copies compared): Td2 grade 5 = 106, Td6 = 236
    ("M10-7g6g", 170, 236),    # ISO 965-1 tables (two published copies compared): Td2 grade 7 = 170, Td6 = 236
    ("M10-5H6H", 140, 300),    # ISO 965-1 tables (two published copies compared): TD2 grade 5 (5.6-11.2, P1.5) = 140, TD1_6(1.5) = 300
])
def test_combined_classes_pitch_grade_then_crest_grade(text, d2_band_um, crest_band_um):
    spec = iso.parse(text)
    assert iso.format(spec) == text
    lim = iso.limits(spec)
    assert lim.pd_tolerance == pytest.approx(d2_band_um / 1000, abs=1e-9)
    if spec.is_external:
        assert lim.major_max - lim.major_min == pytest.approx(crest_band_um / 1000, abs=1e-9)
    else:
        assert lim.minor_max - lim.minor_min == pytest.approx(crest_band_um / 1000, abs=1e-9)


def test_equal_grades_written_once():
    assert iso.parse("M10-6g6g") == iso.parse("M10-6g")   # ISO 965-1 writes 6g, not 6g6g


def test_no_class_uses_6g_or_6h_with_note():
    # from memory: ISO 965-1 takes the medium class 6H/6g when none is stated
    spec = iso.parse("M10x1.5")
    assert spec.tol_class is None and spec.kind == "external"
    lim = iso.limits(spec)
    assert (lim.pd_max, lim.pd_min) == pytest.approx((8.994, 8.862), abs=1e-9)  # ISO 965-2, M10x1.5-6g
    assert any("6g" in n for n in lim.notes)
    lim = iso.limits(spec.with_(kind="internal"))
    assert (lim.pd_min, lim.pd_max) == pytest.approx((9.026, 9.206), abs=1e-9)  # ISO 965-2, M10x1.5-6H
    assert any("6H" in n for n in lim.notes)


def test_provisional_cells_are_noted():
    # ISO 965-1 tables (two published copies compared) lists these as resting on one copy only
    assert any("Provisional" in n for n in iso.limits(iso.parse("M10-6f")).notes)      # f for P >= 0.5
    assert any("Provisional" in n for n in iso.limits(iso.parse("M30x1.5-3h4h")).notes)  # Td2 grade 3
    assert any("Provisional" in n for n in iso.limits(iso.parse("M26x1.5-6g")).notes)  # ISO 261 pair
    assert any("Provisional" in n for n in iso.limits(iso.parse("M30x1.5-8g")).notes)  # Td2 (22.4-45, P1.5) grade 8
    assert not any("Provisional" in n for n in iso.limits(iso.parse("M10x1-6g")).notes)


def test_limits_refuses_a_spec_whose_class_the_tables_lack():
    spec = iso.parse("M3-6g").with_(tol_class="8g")
    with pytest.raises(UnsupportedClass):
        iso.limits(spec)
    with pytest.raises(InvalidEntry):
        iso.limits(iso.parse("M3-6g").with_(kind="internal"))


# ----------------------------------------------------------------------------- designations

def test_coarse_pitch_implied_and_printed_back_without_it():
    spec = iso.parse("M10-6H")
    assert spec.pitch == 1.5 and spec.pitch_implied          # ISO 261: M10 coarse 1.5
    assert spec.kind == "internal" and spec.tol_class == "6H"
    assert iso.format(spec) == "M10-6H"
    explicit = iso.parse("M10x1.5-6g")
    assert not explicit.pitch_implied and iso.format(explicit) == "M10x1.5-6g"


@pytest.mark.parametrize("text,printed", [
    ("m10X1.5-6G", "M10x1.5-6G"),
    ("M10 × 1.25 - 6g", "M10x1.25-6g"),
    ("M 10 x 1,25 6h", "M10x1.25-6h"),
    ("M1.6", "M1.6"),
    ("M1,6x0.2-4h", "M1.6x0.2-4h"),
    ("m16xph3p1.5-6g", "M16xPh3P1.5-6g"),
])
def test_lenient_reading(text, printed):
    assert iso.format(iso.parse(text)) == printed


def test_class_letter_case_gives_kind():
    assert iso.parse("M10x1.5-6g").kind == "external"
    assert iso.parse("M10x1.5-6G").kind == "internal"
    assert iso.parse("M10x1.5-6G").tol_class == "6G"


def test_multi_start():
    spec = iso.parse("M16xPh3P1.5-6g")
    assert (spec.starts, spec.pitch, spec.lead) == (2, 1.5, 3.0)   # ISO 965-1: Ph lead, P pitch
    assert iso.format(spec) == "M16xPh3P1.5-6g"
    lim = iso.limits(spec)
    single = iso.limits(iso.parse("M16x1.5-6g"))
    assert (lim.pd_max, lim.pd_min) == (single.pd_max, single.pd_min)
    assert any("starts" in n for n in lim.notes)
    # computed from atan(L / (pi d2)), L = 3, d2 = 16 - 0.649519 * 1.5 (ISO 68-1)
    assert lim.lead_angle_deg == pytest.approx(
        math.degrees(math.atan(3 / (math.pi * (16 - 0.649519 * 1.5)))), abs=1e-9)


@pytest.mark.parametrize("text", ["M16xPh3P1.25-6g", "M16xPh1P1.5", "M16xPh0P1.5"])
def test_lead_not_a_multiple_of_pitch(text):
    with pytest.raises(InvalidEntry, match="whole number of pitches"):
        iso.parse(text)


def test_unknown_pitch_names_the_iso261_pitches():
    with pytest.raises(UnknownThread) as err:
        iso.parse("M10x1.6-6g")
    msg = str(err.value)
    for p in ("1.5", "1.25", "1", "0.75"):     # ISO 261: M10 coarse 1.5, fine 1.25 1 0.75
        assert p in msg
    assert "special" in msg
    assert err.value.suggestions == ("M10x1.5-6g", "M10x1.25-6g", "M10x1-6g", "M10x0.75-6g")
    assert not isinstance(err.value, UnsupportedClass)


def test_unknown_diameter_names_neighbours():
    with pytest.raises(UnknownThread) as err:
        iso.parse("M13x1.5-6g")
    assert "M12" in str(err.value) and "M14" in str(err.value)   # ISO 261 sizes either side


def test_disputed_and_missing_coarse():
    with pytest.raises(UnknownThread, match="One published copy"):
        iso.parse("M30x1")            # ISO 965-1 tables (two published copies compared): M30x1 disputed between copies
    with pytest.raises(UnknownThread, match=r"M5\.5x0\.5"):
        iso.parse("M5.5-6g")          # ISO 261: M5.5 has no coarse pitch


@pytest.mark.parametrize("text", ["1/4-20 UNC-2A", "2BA", "3/8 BSW", "", "M", "Mx1.5", "M10x",
                                  "MF10x1", "M10x1.5-", "M10 bolt thing"])
def test_not_iso_returns_none(text):
    assert iso.parse(text) is None


_NEAR_DESIGNATION = st.from_regex(
    r"[Mm] ?[0-9]{1,2}([.,][0-9]{1,2})?( ?[xX×] ?(Ph?[0-9.]{1,3}P)?[0-9.,]{1,4})?"
    r"( ?- ?[0-9][a-zA-Z]([0-9][a-zA-Z])?)?", fullmatch=True)


@given(st.one_of(st.text(max_size=20), _NEAR_DESIGNATION))
@settings(max_examples=200, deadline=None)
def test_parse_never_leaks_other_errors(text):
    try:
        spec = iso.parse(text)
    except ShoptermError:
        return
    if spec is not None:
        assert iso.parse(iso.format(spec)) == spec


# ----------------------------------------------------------------------------- catalogue

def test_catalogue_round_trips():
    cat = iso.catalogue()
    assert len(cat) == len({iso.format(s) for s in cat})
    for spec in cat:
        assert spec.tol_class == "6g" and spec.kind == "external" and spec.family == "iso"
        assert iso.parse(iso.format(spec)) == spec


def test_catalogue_covers_iso261():
    cat = iso.catalogue()
    names = {iso.format(s) for s in cat}
    # ISO 261 table: first and last sizes, coarse and fine
    assert {"M1-6g", "M1x0.2-6g", "M10-6g", "M10x0.75-6g", "M5.5x0.5-6g", "M68-6g",
            "M68x1.5-6g"} <= names
    # computed: the sum of the pitch counts in iso261_series (coarse where not '-', plus fines)
    expected = sum(len(iso.pitches(d)) for d in iso.sizes())
    assert len(cat) == expected
    assert iso.sizes()[0] == 1 and iso.sizes()[-1] == 68
    assert iso.coarse_pitch(12) == 1.75 and iso.coarse_pitch(15) is None   # ISO 261


@given(st.sampled_from(iso.catalogue()), st.sampled_from(["x", "X", "×", " x "]),
       st.booleans(), st.booleans())
@settings(max_examples=150, deadline=None)
def test_written_variants_read_the_same(spec, sep, lower_m, space_dash):
    text = iso.format(spec)
    if not spec.pitch_implied:
        text = text.replace("x", sep, 1)
    if lower_m:
        text = "m" + text[1:]
    if space_dash:
        text = text.replace("-", " - ")
    assert iso.parse(text) == spec


def test_every_listed_class_gives_a_consistent_band():
    # invariants of ISO 965-1 limits: external bands sit at or below the basic size (es <= 0),
    # internal ones at or above it (EI >= 0); every band has positive width
    for spec in iso.catalogue():
        for kind in ("external", "internal"):
            base = spec.with_(kind=kind, tol_class=None)
            for cls in iso.classes(base):
                lim = iso.limits(base.with_(tol_class=cls))
                assert lim.pd_min < lim.pd_max
                if kind == "external":
                    assert lim.pd_max <= round(lim.basic_pd, 3) + 1e-9
                    assert lim.major_min < lim.major_max <= spec.major
                    assert lim.minor_max < lim.pd_min
                else:
                    assert lim.pd_min >= round(lim.basic_pd, 3) - 1e-9
                    assert lim.minor_min < lim.minor_max < lim.pd_min
                    assert lim.major_min >= spec.major


def test_engagement_lengths():
    e = iso.engagement_lengths(iso.parse("M10"))
    assert (e.short_upto, e.long_over) == (5, 15)   # ISO 965-1 tables (two published copies compared) Table 2, 5.6-11.2 P1.5 (provisional)
    assert e.provisional
    assert (e.group(5), e.group(10), e.group(15.1)) == ("S", "N", "L")


# ----------------------------------------------------------------------------- registry

def test_registry_left_hand():
    spec = standards.parse("M12x1.25-6g LH")
    assert spec.family == "iso" and spec.hand == "LH" and spec.pitch == 1.25
    assert standards.format_designation(spec) == "M12x1.25-6g LH"
    assert iso.format(spec) == "M12x1.25-6g"
    lim = standards.limits(spec)
    # computed from d2 = 12 - 0.649519 * 1.25 (ISO 68-1), es g(1.25) = -28 µm,
    # Td2 grade 6 (11.2-22.4, P1.25) = 132 µm
    assert lim.pd_max == pytest.approx(_round3(12 - 0.649519 * 1.25 - 0.028), abs=1e-9)
    assert lim.pd_min == pytest.approx(_round3(12 - 0.649519 * 1.25 - 0.028 - 0.132), abs=1e-9)


def test_registry_internal():
    spec = standards.parse("M10-6H")
    assert spec.kind == "internal" and spec.pitch_implied
    assert standards.limits(spec).pd_min == pytest.approx(9.026, abs=1e-9)  # ISO 965-2, M10x1.5-6H
    spec = standards.parse("M10x1.5 internal")
    assert spec.kind == "internal" and spec.tol_class is None
    with pytest.raises(InvalidEntry):
        standards.parse("M10x1.5-6g", kind="internal")
