"""Three-wire measurement: constants, wire sizes, the relation both ways, readings, slips.

Sources: NBS Handbook H28, three-wire method (tags [P] printed, [C] computed there);
NBS Handbook H28; Jones, *Turning and Boring* (1914); ASME B1.1 basic PD formula.
"""

from __future__ import annotations

import math

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from shopterm.cutting import wires as w
from shopterm.errors import InvalidEntry
from shopterm.lathe.machine import WireSize
from shopterm.standards.forms import (ACME_29, BA_47_5, FORMS, ISO_60, TRAPEZOIDAL_30,
                                      UNIFIED_60, WHITWORTH_55)

IN = 25.4  # exact, NIST SP 811


# ---- published constants -------------------------------------------------------------------

@pytest.mark.parametrize("form, c_w, c_p, best", [
    (ISO_60, 3.000000, 0.866025, 0.577350),          # NBS Handbook H28, three-wire method, 60°
    (UNIFIED_60, 3.000000, 0.866025, 0.577350),      # NBS Handbook H28, three-wire method, 60°
    (WHITWORTH_55, 3.165681, 0.960491, 0.563691),    # NBS Handbook H28, three-wire method, 55°
    (BA_47_5, 3.482950, 1.136336, 0.546262),         # NBS Handbook H28, three-wire method, 47.5°
    (ACME_29, 4.993929, 1.933357, 0.516450),         # NBS Handbook H28, three-wire method, 29°
    # (computed) 30° trapezoidal; best computed from P/(2 cos 15°), H28
    (TRAPEZOIDAL_30, 4.863703, 1.866025, 1 / (2 * math.cos(math.radians(15)))),
])
def test_published_constants(form, c_w, c_p, best):
    k = w.wire_constants(form)
    assert k.c_w == pytest.approx(c_w, abs=1e-6)
    assert k.c_p == pytest.approx(c_p, abs=1e-6)
    assert k.best == pytest.approx(best, abs=1e-6)


def test_every_form_has_constants_that_satisfy_the_general_formula():
    # computed from M = E + W(1 + cosec a) − (P/2) cot a, NBS H28, for each form in forms.py
    for form in FORMS.values():
        a = math.radians(form.angle_deg / 2)
        e, wire, p = 20.0, 1.3, 2.0
        m = w.over_wires_simple(e, wire, form, p)
        assert m == pytest.approx(e + wire * (1 + 1 / math.sin(a)) - p / 2 / math.tan(a), abs=1e-12)


def test_wire_range_60_degrees():
    k = w.wire_constants(ISO_60)
    assert k.smallest == pytest.approx(0.505182, abs=1e-6)   # NBS Handbook H28, three-wire method, 60° min
    assert k.largest == pytest.approx(1.010363, abs=1e-6)    # NBS Handbook H28, three-wire method, 60° max


def _arc_tangent_depth(radius: float, half_angle: float) -> float:
    """Depth below the sharp apex where a tangent arc meets a flank, by vector projection."""
    # apex at the origin, centreline along −y; the arc centre sits radius/sin(a) below the apex.
    centre = (0.0, -radius / math.sin(half_angle))
    flank = (math.sin(half_angle), -math.cos(half_angle))     # unit vector down the flank
    t = centre[0] * flank[0] + centre[1] * flank[1]           # projection of the centre on it
    return -(t * flank[1])


@pytest.mark.parametrize("form", [WHITWORTH_55, BA_47_5])
def test_wire_range_of_rounded_forms_rederived(form):
    # computed from the BS 84 / BS 93 crest radius (BS 93 [P]) by placing the
    # wire in the sharp V: centre at r/sin a above the root apex, contact at r cos²a / sin a.
    a = math.radians(form.angle_deg / 2)
    k = w.wire_constants(form)
    p = 1.0
    # smallest: the wire's top is level with the crest (basic major)
    r = k.smallest * p / 2
    assert r / math.sin(a) + r == pytest.approx(form.height - form.crest_trunc, abs=1e-12)
    # largest: the contact point is where the crest rounding starts
    r = k.largest * p / 2
    contact = r / math.sin(a) - (r / math.sin(a)) * math.sin(a) ** 2
    assert contact == pytest.approx(form.height - _arc_tangent_depth(form.crest_radius, a),
                                    abs=1e-9)
    assert k.smallest < k.best < k.largest


def test_whitworth_range_values():
    # computed from BS 84 r = 0.137329P, H = 0.960491P as above
    k = w.wire_constants(WHITWORTH_55)
    a = math.radians(27.5)
    assert k.smallest == pytest.approx(2 * (0.960491 * 5 / 6) / (1 + 1 / math.sin(a)), abs=1e-6)
    tangent = 0.137329 * math.cos(a) ** 2 / math.sin(a)
    assert k.largest == pytest.approx((0.960491 - tangent) * 2 * math.sin(a) / math.cos(a) ** 2,
                                      abs=1e-6)


# ---- choosing and refusing wires ----------------------------------------------------------------

COMMON_INCH = tuple(WireSize(v * IN) for v in
                    (.018, .024, .029, .032, .040, .045, .055, .063, .072, .081, .092, .108))
# NBS Handbook H28, three-wire method: common inch wire sizes


@pytest.mark.parametrize("form", [WHITWORTH_55, UNIFIED_60])
def test_quarter_inch_40_tpi_is_checked_with_0_018_wires(form):
    # common practice, no source: 1/4 in x 40 tpi is checked with 0.018 in wires
    choice = w.choose_wire(form, IN / 40, COMMON_INCH, "in")
    assert choice.owned is not None
    assert choice.size == pytest.approx(0.018 * IN)
    assert "0.0180 in" in choice.note


def test_measured_size_wins_over_marked():
    wire = WireSize(0.040 * IN, measured=0.0401 * IN, label="box B")
    assert wire.size == pytest.approx(0.0401 * IN)
    choice = w.choose_wire(UNIFIED_60, IN / 13, (wire,), "in")   # 1/2-13: best 0.0444 in
    assert choice.size == pytest.approx(0.0401 * IN)
    assert "box B" in choice.note


def test_no_owned_wire_falls_back_to_best_size():
    choice = w.choose_wire(ISO_60, 1.5, ())
    assert choice.owned is None
    assert choice.size == pytest.approx(0.577350 * 1.5, abs=1e-6)   # NBS Handbook H28, three-wire method
    assert "No wire sets" in choice.note


@pytest.mark.parametrize("wire, why", [(0.70, "too small"), (1.60, "too large")])
def test_refused_wire_names_owned_sizes_that_work(wire, why):
    owned = (WireSize(0.577), WireSize(0.866, label="for 1.5"), WireSize(1.2))
    chk = w.check_wire(ISO_60, 1.5, wire, owned)
    assert not chk.ok and why in chk.message
    # 60° range for P 1.5: 0.758..1.516 (NBS Handbook H28, three-wire method factors): 0.866 and 1.2 fit
    assert [o.marked for o in chk.would_work] == [0.866, 1.2]       # best first
    assert "0.866 mm (for 1.5) or 1.200 mm" in chk.message
    with pytest.raises(InvalidEntry, match="from your sets"):
        w.require_wire(ISO_60, 1.5, wire, owned)


def test_refused_wire_with_nothing_owned_that_fits():
    chk = w.check_wire(ISO_60, 1.5, 0.3, (WireSize(0.3),))
    assert not chk.ok and "None of your sets fits" in chk.message


def test_wire_that_fits_passes():
    assert w.require_wire(ISO_60, 1.5, 0.866).ok


@pytest.mark.parametrize("bad", [0, -1.0, float("nan"), "0.8"])
def test_bad_wire_diameter(bad):
    with pytest.raises(InvalidEntry):
        w.check_wire(ISO_60, 1.5, bad)


def test_bad_pitch():
    with pytest.raises(InvalidEntry, match="pitch"):
        w.wire_range(ISO_60, 0)


# ---- the relation: worked examples --------------------------------------------------------------

def test_jones_worked_example():
    # Jones, Turning and Boring (1914), 1-1/2 in x 6 tpi, W = 0.140 in: M = 1.6674 in [P]
    d, p, wire = 1.5, 1 / 6, 0.140
    e = d - 0.649519 * p          # ASME B1.1 basic PD
    m = w.over_wires_simple(e * IN, wire * IN, UNIFIED_60, p * IN) / IN
    assert round(m, 4) == 1.6674
    assert m == pytest.approx(d - 1.5155 * p + 3 * wire, abs=1e-5)   # Jones's own formula


def test_quarter_20_lead_angle_correction():
    # NBS Handbook H28, three-wire method (computed): 1/4-20, E 0.2175, W 0.0289: lead angle 4.185°, correction 0.000116
    e, wire, p = 0.2175 * IN, 0.0289 * IN, IN / 20
    assert math.degrees(math.atan(p / (math.pi * e))) == pytest.approx(4.185, abs=5e-4)
    corr = w.h28_correction(e, wire, UNIFIED_60, p) / IN
    assert corr == pytest.approx(0.000116, abs=5e-7)
    # 60° form of the H28 formula, E = M + 0.866025P − W(3 + 0.75 tan²λ)
    m = w.over_wires_h28(e, wire, UNIFIED_60, p) / IN
    tl = (1 / 20) / (math.pi * 0.2175)
    assert 0.2175 == pytest.approx(m + 0.866025 / 20 - 0.0289 * (3 + 0.75 * tl ** 2), abs=2e-7)


def test_exact_agrees_with_h28_for_a_single_start_quarter_20():
    # NBS H28 correction is the small-angle form; the exact model must agree to well under a
    # 0.0001 in micrometer step (NBS Handbook H28, three-wire method: simplified formulas hold up to about 5°)
    e, wire, p = 0.2175 * IN, 0.0289 * IN, IN / 20
    exact = w.over_wires_exact(e, wire, UNIFIED_60, p)
    h28 = w.over_wires_h28(e, wire, UNIFIED_60, p)
    assert abs(exact - h28) / IN < 1e-5


def test_exact_reduces_to_simple_without_lead():
    # computed: with no helix the groove is a plain V and the simple formula is exact (H28)
    for form in FORMS.values():
        wire = w.wire_constants(form).best * 2.0
        m = w.over_wires_exact(20.0, wire, form, 2.0, 1e-9)
        assert m == pytest.approx(w.over_wires_simple(20.0, wire, form, 2.0), abs=1e-9)


@pytest.mark.parametrize("starts", [1, 2, 4, 8])
def test_exact_lies_between_simple_and_h28(starts):
    # the lead only lifts the wire (M above simple), and by less than the H28 term; this is what
    # plausible_readings relies on. Computed by the exact model; bounds from NBS H28.
    e, wire, p = 0.2175 * IN, 0.0289 * IN, IN / 20
    lead = starts * p
    simple = w.over_wires_simple(e, wire, UNIFIED_60, p)
    assert simple < w.over_wires_exact(e, wire, UNIFIED_60, p, lead) \
        < w.over_wires_h28(e, wire, UNIFIED_60, p, lead)


def test_simple_formula_reads_a_multi_start_screw_larger():
    # NBS Handbook H28, three-wire method: the simplified formula reads the screw larger than it is
    e, wire, p = 0.2175 * IN, 0.0289 * IN, IN / 20
    m = w.over_wires_exact(e, wire, UNIFIED_60, p, 6 * p)
    assert w.pd_simple(m, wire, UNIFIED_60, p) > e + 0.003 * IN


def _min_distance(e, r, form, p, lead, x, theta, phi0, rho0, span_phi=0.06, span_rho=0.25):
    """Brute force: the smallest distance from a wire axis to the + flank, on a local grid."""
    tan_a = math.tan(form.half_angle_rad)
    k = lead / (2 * math.pi)
    best = math.inf
    for i in range(-60, 61):
        phi = phi0 + span_phi * i / 60
        for j in range(-60, 61):
            rho = rho0 + span_rho * p * j / 60
            z = k * phi + p / 4 + (rho - e / 2) * tan_a
            px, py = rho * math.cos(phi), rho * math.sin(phi)
            v = py * math.sin(theta) - z * math.cos(theta)
            best = min(best, math.hypot(px - x, v))
    return best


@pytest.mark.parametrize("form, e, p, starts", [
    (UNIFIED_60, 0.2175 * IN, IN / 20, 4),     # a 4-start 1/4-20 form: lead angle 16°
    (ACME_29, 20.0, 4.0, 3),
    (BA_47_5, 4.214, 0.81, 1),                 # 2BA basic E (BS 93 (computed))
])
def test_exact_contact_checked_by_brute_force(form, e, p, starts):
    # independent check of the method: at the settled position the wire just touches the flank,
    # and tilted either way at the same height it would cut into it
    wire = w.wire_constants(form).best * p
    c = w.wire_contact(e, wire, form, p, starts * p)
    theta = math.radians(c.tilt_deg)
    phi0, rho0 = math.radians(c.contact_angle_deg), c.contact_diameter / 2
    d = _min_distance(e, wire / 2, form, p, starts * p, c.axis_distance, theta, phi0, rho0)
    assert d == pytest.approx(wire / 2, abs=2e-5 * wire)
    assert d >= wire / 2 - 1e-9
    for dt in (-0.01, 0.01):
        assert _min_distance(e, wire / 2, form, p, starts * p, c.axis_distance, theta + dt,
                             phi0, rho0, 0.2, 0.5) < wire / 2 - 1e-6
    assert c.over_wires == pytest.approx(2 * c.axis_distance + wire)


# ---- both directions ----------------------------------------------------------------------------

@pytest.mark.parametrize("method", w.METHODS)
@pytest.mark.parametrize("form", list(FORMS.values()))
def test_both_directions(method, form):
    p, e = 2.0, 30.0
    wire = w.wire_constants(form).best * p
    m = w.over_wires(e, wire, form, p, 3 * p, method)
    assert w.pitch_diameter(m, wire, form, p, 3 * p, method) == pytest.approx(e, abs=1e-8)


def test_read_pitch_diameter_gives_all_three():
    e, wire, p = 0.2175 * IN, 0.0289 * IN, IN / 20
    m = w.over_wires_exact(e, wire, UNIFIED_60, p)
    r = w.read_pitch_diameter(m, wire, UNIFIED_60, p)
    assert r.pd == pytest.approx(e, abs=1e-9)
    assert r.pd_simple - r.pd == pytest.approx(m - w.over_wires_simple(e, wire, UNIFIED_60, p))
    assert r.pd_h28 < r.pd < r.pd_simple
    assert r.lead_angle_deg == pytest.approx(4.185, abs=5e-4)   # NBS Handbook H28, three-wire method (computed)


@settings(max_examples=40, deadline=None)
@given(form=st.sampled_from(list(FORMS.values())), p=st.floats(0.3, 6.0),
       ratio=st.floats(3.0, 40.0), starts=st.integers(1, 6), frac=st.floats(0.05, 0.95))
def test_exact_round_trip_property(form, p, ratio, starts, frac):
    e = ratio * p
    rng = w.wire_range(form, p)
    wire = rng.smallest + frac * (rng.largest - rng.smallest)
    m = w.over_wires_exact(e, wire, form, p, starts * p)
    assert m >= w.over_wires_simple(e, wire, form, p) - 1e-9
    assert w.pd_exact(m, wire, form, p, starts * p) == pytest.approx(e, abs=1e-7)


def test_bad_method():
    with pytest.raises(InvalidEntry, match="exact, h28 or simple"):
        w.over_wires(10, 0.8, ISO_60, 1.5, method="guess")
    with pytest.raises(InvalidEntry, match="exact, h28 or simple"):
        w.pitch_diameter(10, 0.8, ISO_60, 1.5, method="guess")


def test_reading_too_small_for_the_wire():
    with pytest.raises(InvalidEntry, match="too small"):
        w.pd_h28(0.5, 0.866, ISO_60, 1.5)


# ---- readings and slips -------------------------------------------------------------------------

def test_mean_and_spread():
    r = w.summarise_readings([10.351, 10.352, 10.350], 0.001)
    assert r.mean == pytest.approx(10.351)
    assert r.spread == pytest.approx(0.002)
    assert r.steady and r.warning == ""


def test_spread_warning():
    r = w.summarise_readings([10.351, 10.356], 0.001)
    assert not r.steady
    assert "burr" in r.warning and "taper" in r.warning


@pytest.mark.parametrize("values", [[], [0.0], [-1.0], [float("inf")]])
def test_bad_readings(values):
    with pytest.raises(InvalidEntry):
        w.summarise_readings(values, 0.001)


def test_bad_resolution():
    with pytest.raises(InvalidEntry, match="resolution"):
        w.summarise_readings([10.0], 0)


# M10x1.5: basic major 10, d3 = d − 1.226869P (ISO 68-1)
M10 = dict(form=ISO_60, pitch=1.5, lead=1.5, major=10.0, minor=10 - 1.226869 * 1.5, wire=0.866)


def test_good_reading_passes():
    assert w.check_reading(10.23, **M10) == 10.23


def test_inch_reading_taken_as_mm_is_questioned():
    with pytest.raises(w.ReadingSlip, match="inches taken as mm") as exc:
        w.check_reading(0.4030, **M10)         # 10.236 mm typed in inches
    assert exc.value.likely == pytest.approx(0.4030 * IN)


def test_mm_reading_taken_as_inches_is_questioned():
    q = dict(M10, form=UNIFIED_60, pitch=IN / 20, lead=IN / 20, major=0.25 * IN,
             minor=(0.25 - 1.226869 / 20) * IN, wire=0.029 * IN)
    with pytest.raises(w.ReadingSlip, match="mm taken as inches") as exc:
        w.check_reading(6.5 * IN, unit="in", **q)   # 6.5 mm read, taken as 6.5 in
    assert exc.value.likely == pytest.approx(6.5)


@pytest.mark.parametrize("m", [5.0, 30.0, 0.0, -3.0, float("nan")])
def test_impossible_reading(m):
    with pytest.raises(w.ReadingSlip):
        w.check_reading(m, **M10)


def test_slip_is_an_invalid_entry():
    assert issubclass(w.ReadingSlip, InvalidEntry)
