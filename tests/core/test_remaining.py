"""From a reading over wires to what to feed: states, remainders, dials, slips, fit checks.

Sources: ISO 965-2 limits [P]; ISO 965-1 tables (two published copies compared cell by cell);
the compound factor 1/cos A [C]; ASME B1.1 table values [P]. [P] printed in the named standard,
[C] computed.
"""

from __future__ import annotations

import math

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from shopterm.cutting import remaining as rem
from shopterm.cutting.wires import ReadingSlip, over_wires_exact
from shopterm.errors import InvalidEntry
from shopterm.lathe.machine import Dial, Lathe, Leadscrew
from shopterm.standards.forms import ISO_60, WHITWORTH_55
from shopterm.standards.spec import Limits, ThreadSpec

SPEC = ThreadSpec("iso", "M", "M10", 10.0, 1.5, ISO_60, tol_class="6g")
LIM = Limits(
    SPEC, basic_major=10.0,
    basic_pd=10 - 0.649519 * 1.5,        # ISO 68-1 d2 = d − 0.649519P
    basic_minor=10 - 1.226869 * 1.5,     # ISO 68-1 d3 = d − 1.226869P
    major_max=9.968, major_min=9.732,    # ISO 965-2, M10x1.5-6g d
    pd_max=8.994, pd_min=8.862,          # ISO 965-2, M10x1.5-6g d2
    minor_max=8.128, minor_min=None,     # ISO 965-2, M10x1.5-6g d3 max
    depth=0.920)                         # tap maker's h3 table, M10 (ISO 68-1 and ISO 965-1/-2)
WIRE = 0.866      # best wire 0.577350P for P 1.5 (NBS Handbook H28, three-wire method), rounded as marked

# demo dials, invented for the test: cross-slide reads on diameter, compound on radius
LATHE = Lathe("test", Leadscrew.from_tpi(8), Dial("mm", 0.02, 100, reads_diameter=True),
              Dial("mm", 0.02, 75))


def reading_at(pd: float, lim: Limits = LIM, wire: float = WIRE) -> float:
    """Simulated thread: what the micrometer reads over ``wire`` at pitch diameter ``pd``."""
    s = lim.spec
    return over_wires_exact(pd, wire, s.form, s.pitch, s.lead)


def test_oversize_remainders_and_feed():
    pd = 9.050
    r = rem.measure(LIM, WIRE, [reading_at(pd)], lathe=LATHE)
    assert r.state == "oversize"
    assert r.pitch_diameter == pytest.approx(pd, abs=1e-8)
    assert "feed on" in r.headline
    # computed from the ISO 965-2 band above: to_x = PD now − limit, on diameter
    assert r.to_max == pytest.approx(pd - 8.994, abs=1e-8)
    assert r.to_mid == pytest.approx(pd - 8.928, abs=1e-8)
    assert r.to_min == pytest.approx(pd - 8.862, abs=1e-8)
    # external thread: PD falls by 2 × radial infeed; compound at 29.5°: × 1.14896
    # (computed: travel = radial / cos A)
    assert r.radial_to_mid == pytest.approx((pd - 8.928) / 2, abs=1e-8)
    assert r.compound_to_mid == pytest.approx(r.radial_to_mid * 1.14896, rel=1e-5)
    assert r.compound_angle_deg == 29.5       # US Navy training manual
    assert "clockwise" in r.direction and "backlash" in r.backlash


def test_dial_divisions_rounded_with_predicted_pd():
    pd = 9.050
    r = rem.measure(LIM, WIRE, [reading_at(pd)], lathe=LATHE)
    cross = r.feed_aim.cross
    # diameter-reading 0.02 mm dial: the slide moves 0.01 mm a division
    assert cross.divisions_exact == pytest.approx((pd - 8.928) / 2 / 0.01, abs=1e-6)
    assert cross.divisions == round(cross.divisions_exact)      # 6.1 → 6, nearest the aim
    assert cross.predicted_pd == pytest.approx(pd - 2 * 0.01 * cross.divisions, abs=1e-9)
    assert cross.in_band
    comp = r.feed_aim.on_compound
    assert comp.divisions_exact == pytest.approx((pd - 8.928) / 2 / math.cos(math.radians(29.5))
                                                 / 0.02, abs=1e-6)
    assert isinstance(comp.divisions, int)
    assert comp.predicted_pd == pytest.approx(
        pd - 2 * comp.divisions * 0.02 * math.cos(math.radians(29.5)), abs=1e-9)
    assert comp.predicted_over_wires == pytest.approx(reading_at(comp.predicted_pd), abs=1e-9)
    # to the top: at least far enough to enter the band; to the bottom: never past it
    assert r.feed_top.cross.predicted_pd <= 8.994 + 1e-9
    assert r.feed_bottom.cross.predicted_pd >= 8.862 - 1e-9


def test_in_band_says_stop_and_where():
    pd = 8.930
    r = rem.measure(LIM, WIRE, [reading_at(pd)], lathe=LATHE)
    assert r.state == "in_band"
    assert "stop" in r.headline
    assert r.band_position == pytest.approx((8.994 - pd) / 0.132, abs=1e-6)  # computed, band above
    assert r.feed_top.radial == 0 and r.feed_top.cross is None   # already past the top
    assert r.feed_bottom.to_remove == pytest.approx(pd - 8.862, abs=1e-8)


def test_undersize_says_by_how_much_and_what_it_still_fits():
    pd = 8.850
    # ISO 965-1 tables: es e(1.5) −67, g(1.5) −32; Td2 grade 6 = 132,
    # grade 8 = 212 for 5.6–11.2 P1.5; basic d2 9.026 → computed bands below
    bands = [("6e", 9.026 - 0.067, 9.026 - 0.067 - 0.132), ("8g", 9.026 - 0.032, 8.994 - 0.212),
             ("6h", 9.026, 9.026 - 0.132)]
    r = rem.measure(LIM, WIRE, [reading_at(pd)], class_bands=bands)
    assert r.state == "undersize"
    assert r.undersize_by == pytest.approx(8.862 - pd, abs=1e-8)
    assert r.still_fits == ("6e", "8g")
    assert "6g" in r.headline and "0.012 mm" in r.headline
    text = (r.headline + r.detail).lower()
    assert "continue" not in text and "feed on" not in text
    assert r.caution == rem.UNDERSIZE_CAUTION
    assert r.radial_to_mid == 0


def test_undersize_with_no_class_that_fits():
    r = rem.measure(LIM, WIRE, [reading_at(8.70)], class_bands=[("6h", 9.026, 8.894)])
    assert r.still_fits == ()
    assert "no other class" in r.detail


def test_aim_point():
    pd = 9.050
    r = rem.measure(LIM, WIRE, [reading_at(pd)], aim_pd=8.970)
    assert r.to_aim == pytest.approx(pd - 8.970, abs=1e-8)
    assert r.feed_aim.radial == pytest.approx((pd - 8.970) / 2, abs=1e-8)
    with pytest.raises(InvalidEntry, match="aim point"):
        rem.measure(LIM, WIRE, [reading_at(pd)], aim_pd=9.10)


def test_spread_warning_reaches_the_advice():
    m = reading_at(9.0)
    r = rem.measure(LIM, WIRE, [m, m + 0.006], resolution=0.001)
    assert not r.readings.steady
    assert "burr" in r.detail


def test_slip_is_questioned_before_anything_is_computed(monkeypatch):
    def boom(*a, **k):
        raise AssertionError("computed from a slip")
    monkeypatch.setattr(rem, "read_pitch_diameter", boom)
    with pytest.raises(ReadingSlip, match="inches taken as mm"):
        rem.measure(LIM, WIRE, [reading_at(9.0), reading_at(9.0) / 25.4])


@pytest.mark.parametrize("kwargs, match", [
    (dict(readings=[]), "at least one reading"),
    (dict(wire=0.3), "too small"),
    (dict(compound_angle_deg=95), "compound angle"),
    (dict(compound_angle_deg=float("nan")), "compound angle"),
])
def test_error_paths(kwargs, match):
    args = dict(limits=LIM, wire=WIRE, readings=[reading_at(9.0)])
    args.update(kwargs)
    with pytest.raises(InvalidEntry, match=match):
        rem.measure(**args)


def test_band_upside_down_is_refused():
    bad = Limits(SPEC, 10.0, 9.026, 8.16, None, None, 8.862, 8.994, None, None, 0.92)
    with pytest.raises(InvalidEntry, match="below its bottom"):
        rem.measure(bad, WIRE, [reading_at(9.0)])


def test_basic_size_band_counts_within_half_a_step():
    # 1-5/8 BSW: E = D − 0.640327P, 5 tpi (BS 84; 5 tpi from memory)
    p = 25.4 / 5
    e = 1.625 * 25.4 - 0.640327 * p
    spec = ThreadSpec("whitworth", "BSW", "1-5/8", 1.625 * 25.4, p, WHITWORTH_55, tpi=5,
                      native_unit="in")
    lim = Limits(spec, 1.625 * 25.4, e, 1.625 * 25.4 - 1.280654 * p, None, None, e, e, None,
                 None, 0.640327 * p)
    wire = 0.563691 * p          # best wire for 55° (NBS Handbook H28, three-wire method)
    r = rem.measure(lim, wire, [reading_at(e + 0.0004, lim, wire)], resolution=0.00254)
    assert r.state == "in_band" and r.band_position is None
    assert "0.0000 in over" in r.headline    # an inch thread gets its message in inches
    r = rem.measure(lim, wire, [reading_at(e + 0.01, lim, wire)], resolution=0.00254)
    assert r.state == "oversize"
    assert r.compound_angle_deg == 27.5   # from memory: 27–27.5° for 55°


def test_internal_thread_offers_a_fit_check():
    internal = Limits(SPEC.with_(kind="internal", tol_class="6H"), 10.0, 9.026, 8.376, None,
                      10.0, 9.206, 9.026, 8.676, 8.376, 0.812)   # ISO 965-2 6H
    with pytest.raises(InvalidEntry, match="mating part or a plug gauge"):
        rem.measure(internal, WIRE, [10.0])
    offer = rem.fit_check_offer(internal.spec)
    assert "cannot be measured over wires" in offer.message
    assert [k for k, _ in offer.checks] == ["mating_part", "plug_gauge"]
    assert "outward" in rem.feed_direction("internal")


@pytest.mark.parametrize("against, outcome, state", [
    ("plug_gauge", "go_does_not_enter", "feed_on"),
    ("plug_gauge", "go_enters_nogo_not", "done"),
    ("plug_gauge", "nogo_enters", "past"),
    ("mating_part", "does_not_start", "feed_on"),
    ("mating_part", "tight", "feed_on"),
    ("mating_part", "good", "done"),
    ("mating_part", "loose", "past"),
])
def test_fit_check_records(against, outcome, state):
    # common practice, no source: go / no-go plug gauges; a mating part screwed on by hand
    rec = rem.record_fit_check(against, outcome, note="by hand")
    assert rec.state == state and rec.note == "by hand" and rec.message


@pytest.mark.parametrize("against, outcome, match", [
    ("ring", "good", "mating part or a plug gauge"),
    ("plug_gauge", "good", "result is one of"),
])
def test_fit_check_errors(against, outcome, match):
    with pytest.raises(InvalidEntry, match=match):
        rem.record_fit_check(against, outcome)


def test_feed_direction_refuses_other_kinds():
    with pytest.raises(InvalidEntry):
        rem.feed_direction("sideways")


def test_compound_travel_factor():
    # computed, travel = radial / cos A: 29.5° → 1.14896, 27.5° → 1.12738
    assert rem.compound_travel(1.0, 29.5) == pytest.approx(1.14896, abs=1e-5)
    assert rem.compound_travel(1.0, 27.5) == pytest.approx(1.12738, abs=1e-5)


def test_with_the_standards_tables():
    from shopterm.standards import limits, parse
    lim = limits(parse("M10x1.5-6g"))
    assert (lim.pd_max, lim.pd_min) == pytest.approx((8.994, 8.862), abs=5e-4)  # ISO 965-2 [P]
    r = rem.measure(lim, WIRE, [reading_at(8.850, lim)])
    assert r.state == "undersize"
    # ISO 965-1 tables: 6e 8.959..8.827 and 8g 8.994..8.782 hold 8.850 (computed as above)
    assert {"6e", "8g"} <= set(r.still_fits) and "6h" not in r.still_fits
    lim = limits(parse("1/4-20 UNC-2A"))
    assert lim.pd_max / 25.4 == pytest.approx(0.2164, abs=5e-5)   # ASME B1.1 2A PD max
    wire = 0.029 * 25.4
    r = rem.measure(lim, wire, [reading_at(0.2150 * 25.4, lim, wire)], unit="in")
    assert r.state == "in_band"


@settings(max_examples=20, deadline=None)
@given(over=st.floats(0.0005, 0.6), aim_frac=st.floats(0.0, 1.0))
def test_feeding_the_remainder_lands_in_the_band(over, aim_frac):
    # the property: PD_new = PD_now − 2·radial puts the next reading in the band
    pd_now = LIM.pd_max + over
    aim = LIM.pd_min + aim_frac * (LIM.pd_max - LIM.pd_min)
    r = rem.measure(LIM, WIRE, [reading_at(pd_now)], aim_pd=aim, lathe=LATHE)
    assert r.state == "oversize"
    after = rem.measure(LIM, WIRE, [reading_at(pd_now - 2 * r.feed_aim.radial)])
    assert after.state == "in_band"
    # and the dial setting, rounded to whole divisions, too: the band (0.132) is wider than one
    # division on either dial (0.02 on diameter; 0.02·cos 29.5° × 2 on the compound)
    for s in (r.feed_aim.cross, r.feed_aim.on_compound):
        assert rem.measure(LIM, WIRE, [reading_at(pd_now - 2 * s.radial_set)]).state == "in_band"
