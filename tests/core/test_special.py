"""Special threads: make(), the SPECIAL designation, limits from a user-given fit, errors.

Check values are from the standards named beside them unless marked.
"""


import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

import shopterm.standards as standards
from shopterm.errors import InvalidEntry, ShoptermError
from shopterm.standards import special as sp
from shopterm.standards.forms import BA_47_5, ISO_60, WHITWORTH_55

IN = 25.4  # exact, NIST SP 811


# --- basic proportions of each form ------------------------------------------------------------

def test_sixty_degree_basic_profile():
    lim = sp.limits(sp.make(10, pitch_mm=1.5))
    assert lim.spec.form is ISO_60
    assert lim.basic_pd == pytest.approx(10 - 0.649519 * 1.5, abs=1e-6)     # ISO 68-1 d2 [P]
    assert lim.basic_minor == pytest.approx(10 - 1.082532 * 1.5, abs=1e-6)  # ISO 68-1 D1 [P]
    assert lim.minor_max == pytest.approx(10 - 1.226869 * 1.5, abs=1e-6)    # ISO 68-1 d3 [P]
    assert lim.depth == pytest.approx(0.613435 * 1.5, abs=1e-6)             # ISO 68-1 h3 [P]
    assert lim.root_radius_min == pytest.approx(0.125 * 1.5)  # ISO 965-1 6g min root r [P]


def test_sixty_degree_internal_depth():
    lim = sp.limits(sp.make(10, pitch_mm=1.5, kind="internal"))
    assert lim.depth == pytest.approx(0.541266 * 1.5, abs=1e-6)            # ISO 68-1 H1 [P]
    assert lim.minor_min == pytest.approx(10 - 1.082532 * 1.5, abs=1e-6)   # ISO 68-1 D1 [P]


def test_iso_6g_fit_given_as_a_special_gives_the_iso_965_2_limits():
    # es, Td2, Td taken from the ISO 965-2 M10x1.5-6g limits:
    # es = 9.968 − 10, Td = 9.968 − 9.732, Td2 = 8.994 − 8.862
    es, td, td2 = 10 - 9.968, 9.968 - 9.732, 8.994 - 8.862
    lim = sp.limits(sp.make(10, pitch_mm=1.5, allowance_mm=es, pd_tolerance_mm=td2,
                            major_tolerance_mm=td))
    assert round(lim.major_max, 3) == 9.968  # ISO 965-2 M10x1.5-6g d max [P]
    assert round(lim.major_min, 3) == 9.732  # ISO 965-2 d min [P]
    assert round(lim.pd_max, 3) == 8.994     # ISO 965-2 d2 max [P]
    assert round(lim.pd_min, 3) == 8.862     # ISO 965-2 d2 min [P]
    assert round(lim.minor_max, 3) == 8.128  # ISO 965-2 d3 max [P]


def test_iso_6h_fit_given_as_a_special_gives_the_iso_965_2_limits():
    # TD2 = 9.206 − 9.026, EI = 0, from ISO 965-2 M10x1.5-6H
    lim = sp.limits(sp.make(10, pitch_mm=1.5, kind="internal", pd_tolerance_mm=9.206 - 9.026))
    assert round(lim.pd_min, 3) == 9.026     # ISO 965-2 D2 min [P]
    assert round(lim.pd_max, 3) == 9.206     # ISO 965-2 D2 max [P]
    assert round(lim.minor_min, 3) == 8.376  # ISO 965-2 D1 min [P]
    assert lim.major_min == 10 and lim.major_max is None


def test_fifty_five_degree_special_matches_bsw_basic():
    lim = sp.limits(sp.parse("SPECIAL 1/2x12TPI 55"))
    assert lim.spec.form is WHITWORTH_55 and lim.spec.native_unit == "in"
    assert round(lim.basic_pd / IN, 4) == 0.4466     # BS 84 BSW 1/2-12 E [P]
    assert round(lim.basic_minor / IN, 4) == 0.3933  # BS 84 BSW 1/2-12 core [P]
    assert lim.root_radius_min == pytest.approx(0.137329 * IN / 12, rel=1e-6)  # BS 84 r [P]


def test_forty_seven_and_a_half_degree_special_matches_ba():
    lim = sp.limits(sp.parse("SPECIAL 4.7x0.81 47.5"))
    assert lim.spec.form is BA_47_5
    assert lim.basic_pd == pytest.approx(4.214, abs=1e-9)  # 2BA effective, BS 93 [C] (D − 0.6P)
    assert lim.basic_minor == pytest.approx(4.7 - 1.2 * 0.81, abs=1e-9)  # BS 93 core [P]
    assert lim.depth == pytest.approx(0.6 * 0.81)                        # BS 93 depth [P]


# --- the fit: allowance and tolerances ---------------------------------------------------------

def test_no_tolerance_gives_a_zero_width_band_and_says_so():
    lim = sp.limits(sp.make(20, pitch_mm=1.25, allowance_mm=0.05))
    # computed from d2 = d − 0.649519P (ISO 68-1 [P]) minus the allowance
    assert lim.pd_max == lim.pd_min == pytest.approx(20 - 0.649519 * 1.25 - 0.05, abs=1e-6)
    assert lim.pd_tolerance == 0
    assert any("no width" in n for n in lim.notes)


@pytest.mark.parametrize("kind, sign", [("external", -1), ("internal", +1)])
def test_allowance_goes_towards_less_metal(kind, sign):
    base = sp.limits(sp.make(12, pitch_mm=1.5, kind=kind, pd_tolerance_mm=0.1))
    fit = sp.limits(sp.make(12, pitch_mm=1.5, kind=kind, pd_tolerance_mm=0.1, allowance_mm=0.04))
    assert fit.pd_max - base.pd_max == pytest.approx(sign * 0.04)
    assert fit.pd_min - base.pd_min == pytest.approx(sign * 0.04)
    assert fit.pd_tolerance == pytest.approx(0.1)
    assert fit.spec.allowance == pytest.approx(sign * 0.04)  # signed as spec.py documents


def test_major_tolerance():
    lim = sp.limits(sp.make(12, pitch_mm=1.5, allowance_mm=0.03, major_tolerance_mm=0.2))
    assert (lim.major_max, lim.major_min) == (pytest.approx(11.97), pytest.approx(11.77))
    nut = sp.limits(sp.make(12, pitch_mm=1.5, kind="internal", major_tolerance_mm=0.2))
    assert (nut.major_min, nut.major_max) == (12, pytest.approx(12.2))


def test_inch_values_in_the_designation_are_inches():
    spec = sp.parse("SPECIAL 0.4375x28TPI 55 A0.002 T0.004")
    assert spec.major == pytest.approx(0.4375 * IN)
    assert spec.pitch == pytest.approx(IN / 28) and spec.tpi == 28
    lim = sp.limits(spec)
    # computed from E = D − 0.640327P (BS 84 [P]) − 0.002 in, band 0.004 in
    assert lim.pd_max / IN == pytest.approx(0.4375 - 0.640327 / 28 - 0.002, abs=1e-6)
    assert lim.pd_tolerance / IN == pytest.approx(0.004)


def test_registry_kind_word_flips_the_allowance_direction(registry):
    spec = registry.parse("SPECIAL 12x1.5 60 A0.05 T0.1 internal")
    assert spec.kind == "internal"
    lim = registry.limits(spec)
    assert lim.pd_min == pytest.approx(12 - 0.649519 * 1.5 + 0.05, abs=1e-6)  # ISO 68-1 d2 [P]
    flipped = registry.parse("SPECIAL 12x1.5 60 A0.05 T0.1", kind="internal")
    assert registry.limits(flipped).pd_min == pytest.approx(lim.pd_min)


def test_multi_start():
    spec = sp.parse("SPECIAL 20x2 60 S3")
    assert spec.starts == 3 and spec.lead == pytest.approx(6.0)  # lead = starts × pitch
    assert sp.format(spec) == "SPECIAL 20x2 60 S3"


# --- the designation ---------------------------------------------------------------------------

@pytest.mark.parametrize("text, expected", [
    ("SPECIAL 20x1.25 60", "SPECIAL 20x1.25 60"),
    ("special 20 x 1.25", "SPECIAL 20x1.25 60"),
    ("SPECIAL 0.4375x28TPI 55 A-0.002 T0.004", "SPECIAL 0.4375x28TPI 55 A0.002 T0.004"),
    ("SPECIAL 7/16x28tpi 55", "SPECIAL 0.4375x28TPI 55"),
    ("SPECIAL 1-1/2x6TPI 60", "SPECIAL 1.5x6TPI 60"),
    ("SPECIAL 10mmx26TPI 55", "SPECIAL 10mmx26TPI 55"),
    ("SPECIAL 0.5inx1.5 60", "SPECIAL 0.5inx1.5 60"),
    ("SPECIAL 12x1.5 S2 T0.15 60 internal", "SPECIAL 12x1.5 60 T0.15 S2 internal"),
    ("SPECIAL 6x1 47.5 TD0.15 A0.02 T0.1", "SPECIAL 6x1 47.5 A0.02 T0.1 TD0.15"),
])
def test_designation_reads_and_writes(text, expected):
    spec = sp.parse(text)
    assert sp.format(spec) == expected
    assert sp.parse(expected) == spec


@pytest.mark.parametrize("text", ["M20x1.25", "2BA", "3/8 BSW", "SPECIALS 20x1", "20x1.25 60", ""])
def test_not_special(text):
    assert sp.parse(text) is None


def test_catalogue_and_classes_are_empty():
    assert sp.catalogue() == []
    assert sp.classes(sp.make(20, pitch_mm=1.25)) == []


@settings(max_examples=80, deadline=None)
@given(d=st.floats(3, 200), ratio=st.floats(0.02, 0.3), angle=st.sampled_from([60, 55, 47.5]),
       use_tpi=st.booleans(), unit=st.sampled_from(["mm", "in"]), kind=st.sampled_from(
           ["external", "internal"]), allowance=st.floats(0, 0.01), tol=st.one_of(
           st.none(), st.floats(0.001, 0.05)), starts=st.integers(1, 6))
def test_make_format_parse_round_trip(d, ratio, angle, use_tpi, unit, kind, allowance, tol, starts):
    pitch = d * ratio
    spec = sp.make(d, pitch_mm=None if use_tpi else pitch, tpi=IN / pitch if use_tpi else None,
                   angle_deg=angle, kind=kind, allowance_mm=allowance * pitch,
                   pd_tolerance_mm=None if tol is None else tol * pitch, starts=starts, unit=unit)
    text = sp.format(spec)
    back = sp.parse(text)
    assert sp.format(back) == text
    assert back.major == pytest.approx(spec.major, rel=1e-9)
    assert back.pitch == pytest.approx(spec.pitch, rel=1e-9)
    assert (back.form, back.kind, back.starts, back.native_unit) == (
        spec.form, spec.kind, spec.starts, spec.native_unit)
    a, b = sp.limits(spec), sp.limits(back)
    assert (b.pd_max, b.pd_min) == (pytest.approx(a.pd_max, abs=1e-6),
                                    pytest.approx(a.pd_min, abs=1e-6))


@settings(max_examples=80, deadline=None)
@given(st.text(alphabet="SPECIALspecial 0123456789./-xXTPIADS", max_size=30))
def test_parse_never_raises_anything_but_shopterm_errors(text):
    try:
        sp.parse(text)
    except ShoptermError:
        pass


# --- impossible threads and bad entries -------------------------------------------------------

@pytest.mark.parametrize("kwargs, words", [
    (dict(major_mm=2, pitch_mm=2), "smaller than the diameter"),
    (dict(major_mm=2, pitch_mm=3), "smaller than the diameter"),
    # 60° external: d3 = d − 1.226869P (ISO 68-1 [P]) ≤ 0 at P = 1.9 on d = 2
    (dict(major_mm=2, pitch_mm=1.9), "finer pitch or a larger diameter"),
    (dict(major_mm=0, pitch_mm=1), "diameter must be greater than zero"),
    (dict(major_mm=-5, pitch_mm=1), "diameter must be greater than zero"),
    (dict(major_mm=10, pitch_mm=0), "pitch must be greater than zero"),
    (dict(major_mm=10, pitch_mm=-1), "pitch must be greater than zero"),
    (dict(major_mm=10, tpi=0), "threads per inch must be greater than zero"),
    (dict(major_mm=10), "not both and not neither"),
    (dict(major_mm=10, pitch_mm=1, tpi=20), "not both and not neither"),
    (dict(major_mm=10, pitch_mm=1, angle_deg=30), "60, 55 or 47.5"),
    (dict(major_mm=10, pitch_mm=1, angle_deg=29), "60, 55 or 47.5"),
    (dict(major_mm=10, pitch_mm=1, angle_deg=45), "60, 55 or 47.5"),
    (dict(major_mm=10, pitch_mm=1, allowance_mm=-0.1), "positive amount"),
    (dict(major_mm=10, pitch_mm=1, pd_tolerance_mm=0), "greater than zero"),
    (dict(major_mm=10, pitch_mm=1, major_tolerance_mm=-0.1), "greater than zero"),
    (dict(major_mm=10, pitch_mm=1, starts=0), "whole number, 1 or more"),
    (dict(major_mm=10, pitch_mm=1, starts=1.5), "whole number, 1 or more"),
    (dict(major_mm=10, pitch_mm=1, kind="inside"), "external or internal"),
    (dict(major_mm=10, pitch_mm=1, unit="cm"), "use mm or in"),
    (dict(major_mm=10, pitch_mm=1, allowance_mm=0.5, pd_tolerance_mm=0.5), "below the root"),
    (dict(major_mm=10, pitch_mm=1, major_tolerance_mm=0.7), "below the pitch diameter"),
    (dict(major_mm=float("nan"), pitch_mm=1), "must be a number"),
])
def test_make_refuses_impossible_threads(kwargs, words):
    with pytest.raises(InvalidEntry) as info:
        sp.make(**kwargs)
    assert words in str(info.value)


def test_deep_form_refused_on_the_radius_for_55_degrees():
    # BS 84: core = D − 1.280654P [P] ≤ 0 when P ≥ D/1.280654; P = 0.9D is still below D
    with pytest.raises(InvalidEntry, match="deep"):
        sp.make(10, pitch_mm=9, angle_deg=55)
    assert sp.make(10, pitch_mm=7, angle_deg=55).form is WHITWORTH_55  # 10 − 8.96 > 0


@pytest.mark.parametrize("text, words", [
    ("SPECIAL 20", "write a special thread as"),
    ("SPECIAL 20x1.25 60 Q3", "'Q3' is not understood"),
    ("SPECIAL 20x1.25 60 A0.1 A0.2", "allowance is given twice"),
    ("SPECIAL 20x1.25 60 55", "form angle is given twice"),
    ("SPECIAL 20x1.25 30", "60, 55 or 47.5"),
    ("SPECIAL 20x1.25 60 T0", "greater than zero"),
    ("SPECIAL 20x1.25 60 S0", "1 or more"),
    ("SPECIAL 1/0x1", "0 below the line"),
    ("SPECIAL 2x2", "smaller than the diameter"),
])
def test_parse_errors(text, words):
    with pytest.raises(InvalidEntry) as info:
        sp.parse(text)
    assert words in str(info.value)


def test_limits_of_another_family_refused():
    from shopterm.standards import ba
    with pytest.raises(InvalidEntry):
        sp.limits(ba.parse("2BA"))


# --- registry ----------------------------------------------------------------------------------

def test_registry_parse_and_designation(registry):
    spec = registry.parse("SPECIAL 20x1.25 60 LH")
    assert (spec.family, spec.series, spec.hand) == ("special", "special", "LH")
    assert spec.designation == "SPECIAL 20x1.25 60 LH"
    assert registry.parse(spec.designation) == spec
