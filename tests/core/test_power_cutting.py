"""Power threads (trapezoidal 30°, Acme 29°, square) through the cutting core: wires, tool,
infeed and passes, multi-start, identify.

The threads are built by hand from the ISO 2904 / ASME B1.5 basic-profile formulas
(``power_threads``) until the standards families are in the catalogue; ``power_limits`` then
takes the catalogue's own.
"""

from __future__ import annotations

import dataclasses
import math
from fractions import Fraction

import pytest

import power_threads as pt
from shopterm.cutting import wires as w
from shopterm.cutting.tool import (WORKING_CLEARANCE_DEG, check_tool, form_tip_flat,
                                   helix_angle_deg, power_tool, standard_tip)
from shopterm.errors import InvalidEntry
from shopterm.lathe.machine import ToolTip, WireSize
from shopterm.standards.forms import ACME_29, ISO_60, TRAPEZOIDAL_30, ThreadForm
from test_wires import _min_distance

IN = 25.4                      # ISO 31-1: 1 in = 25.4 mm exactly

#: A square thread form for the refusals (no standard; flanks parallel).
SQUARE = ThreadForm("square-test", "Square", 0.0, 0.5, 0.0, 0.0)


def tr24x5():
    return pt.power_limits("Tr24x5")


def tr24x10_p5():
    return pt.power_limits("Tr24x10(P5)")


def acme_1_5():
    return pt.power_limits("1-5 ACME")


def acme_1_04p_08l():
    return pt.power_limits("1.000-0.4P-0.8L-ACME")


# ---- wires ---------------------------------------------------------------------------------------

# the 29° and 30° three-wire constants are checked in test_wires.test_published_constants


def test_acme_wire_range_touches_flanks_and_stands_proud():
    # from memory (Machinery's Handbook, Acme three-wire table): smallest 0.487P, largest 0.650P
    k = w.wire_constants(ACME_29)
    assert k.smallest == pytest.approx(0.487, abs=5e-4)
    assert k.largest == pytest.approx(0.650, abs=5e-4)


def test_trapezoidal_wire_range_from_the_flat_crest():
    # computed from the ISO 2904 basic profile (crest flat 0.25P above the pitch line, sharp-V
    # height 1.866025P): the wire's top (W/2)(1 + cosec 15°) must clear the crest at
    # 1.183013P above the root apex, and it touches the flank (W/2)cos²15°/sin 15° above that
    # apex, which must lie below the crest flat's start at 1.183013P
    a = math.radians(15)
    crest = (1.866025 + 0.5) / 2
    smallest = 2 * crest / (1 + 1 / math.sin(a))
    largest = 2 * crest * math.sin(a) / math.cos(a) ** 2
    rng = w.wire_range(TRAPEZOIDAL_30, 5.0)
    assert rng.smallest == pytest.approx(smallest * 5, abs=1e-5)
    assert rng.largest == pytest.approx(largest * 5, abs=1e-5)
    assert rng.fits(rng.best) and not rng.fits(0.48 * 5) and not rng.fits(0.66 * 5)


def test_acme_simple_formula_against_published_constants():
    # three-wire relation, NBS Handbook H28 constants for 29°: M = E + 4.993929W − 1.933357P; 1-5 ACME basic E = 0.9 in
    # (ASME B1.5: E = D − 0.5p), best wire 0.516450 × 0.2 in
    wire = 0.516450 * 0.2 * IN
    m = w.over_wires_simple(0.9 * IN, wire, ACME_29, 0.2 * IN)
    assert m / IN == pytest.approx(0.9 + 4.993929 * 0.103290 - 1.933357 * 0.2, abs=2e-6)


@pytest.mark.parametrize("form, e, p, lead", [
    (TRAPEZOIDAL_30, 36.5, 7.0, 14.0),                # Tr40x14(P7): d2 = d − 0.5P (ISO 2904)
    (ACME_29, 0.95 * IN, 0.1 * IN, 0.8 * IN),         # a 1-10 Acme form, 8 starts: 15°
    (ACME_29, 0.8 * IN, 0.4 * IN, 0.8 * IN),          # 1.000-0.4P-0.8L ACME: E = D − 0.5p
])
def test_exact_model_on_flat_crested_coarse_leads(form, e, p, lead):
    # independent brute-force check (as test_wires) at large lead angles on the flat-crested
    # forms: the settled wire just touches the flank, would cut it tilted either way, and
    # touches it on the straight part between the root and crest flats (0.25P either side of
    # the pitch line, ISO 2904 / ASME B1.5 basic profile)
    wire = w.wire_range(form, p).best
    c = w.wire_contact(e, wire, form, p, lead)
    theta = math.radians(c.tilt_deg)
    phi0, rho0 = math.radians(c.contact_angle_deg), c.contact_diameter / 2
    d = _min_distance(e, wire / 2, form, p, lead, c.axis_distance, theta, phi0, rho0)
    assert d == pytest.approx(wire / 2, abs=2e-5 * wire)
    for dt in (-0.01, 0.01):
        assert _min_distance(e, wire / 2, form, p, lead, c.axis_distance, theta + dt,
                             phi0, rho0, 0.2, 0.5) < wire / 2 - 1e-6
    assert e / 2 - 0.25 * p < rho0 < e / 2 + 0.25 * p


def test_simple_formula_errs_on_a_coarse_acme_lead_and_exact_is_acted_on():
    # NBS Handbook H28 (three-wire method): the simple formulas hold up to about 5° and read the screw
    # larger than it is. 1.000-0.4P-0.8L ACME at its basic E: lead angle about 17.7°
    lim = acme_1_04p_08l()
    p, lead, e = lim.spec.pitch, lim.spec.lead, lim.basic_pd
    wire = w.choose_wire(ACME_29, p).size
    m = w.over_wires_exact(e, wire, ACME_29, p, lead)
    r = w.read_pitch_diameter(m, wire, ACME_29, p, lead)
    assert r.pd == pytest.approx(e, abs=1e-7)
    assert r.lead_angle_deg > 15
    assert r.pd_simple - e > 0.4          # computed: the simple formula is far off here
    assert abs(r.pd_h28 - e) < r.pd_simple - e


def test_exact_agrees_with_h28_on_a_single_start_tr24x5():
    # NBS H28 form is good for lead angles up to about 5° (NBS Handbook H28 (three-wire method)); Tr24x5
    # has 4.2° at d2 = 21.5 (ISO 2904): agreement to well under a 0.001 mm step
    e, p = 21.5, 5.0
    wire = w.wire_range(TRAPEZOIDAL_30, p).best
    assert abs(w.over_wires_exact(e, wire, TRAPEZOIDAL_30, p)
               - w.over_wires_h28(e, wire, TRAPEZOIDAL_30, p)) < 1e-3


def test_no_fitting_wire_offers_one_wire_or_the_caliper():
    owned = (WireSize(marked=0.029 * IN, label="29 thou"),)
    with pytest.raises(InvalidEntry, match="gear-tooth vernier caliper") as info:
        w.require_wire(TRAPEZOIDAL_30, 5.0, 0.029 * IN, owned)
    assert "one wire" in str(info.value) and "None of your sets fits" in str(info.value)
    chk = w.check_wire(ISO_60, 5.0, 0.029 * IN, owned)
    assert not chk.ok and "caliper" not in chk.message      # a V-thread gets no such offer


def test_square_thread_has_no_wire():
    with pytest.raises(InvalidEntry, match="square thread"):
        w.wire_range(SQUARE, 5.0)


def test_single_wire_reads_as_three_wires():
    # computed: the micrometer spans the crest radius and the wire's top, major/2 + X + W/2,
    # while three wires read 2X + W
    e, p, major = 21.5, 5.0, 23.9
    wire = w.wire_range(TRAPEZOIDAL_30, p).best
    m3 = w.over_wires_exact(e, wire, TRAPEZOIDAL_30, p)
    assert w.pd_single_wire((m3 + major) / 2, wire, TRAPEZOIDAL_30, p, major) == \
        pytest.approx(e, abs=1e-8)
    with pytest.raises(InvalidEntry, match="half the major"):
        w.pd_single_wire(10.0, wire, TRAPEZOIDAL_30, p, major)


def test_thread_thickness_at_the_pitch_line_is_half_the_pitch():
    # ISO 2904 / ASME B1.5 basic profile: thread thickness P/2 at the pitch line
    assert w.thread_thickness(21.5, TRAPEZOIDAL_30, 5.0, 21.5) == pytest.approx(2.5)
    # computed: 0.1 mm under on the PD leaves the tooth thinner by 0.1 × tan 15° at that level
    t = w.thread_thickness(21.4, TRAPEZOIDAL_30, 5.0, 21.5)
    assert t == pytest.approx(2.5 - 0.1 * math.tan(math.radians(15)), abs=1e-12)
    assert w.pd_from_thickness(t, TRAPEZOIDAL_30, 5.0, 21.5) == pytest.approx(21.4, abs=1e-12)


def test_normal_thickness_round_trip_on_a_coarse_lead():
    # computed: normal thickness = axial × cos λ, tan λ = L/(π E)
    e, p, lead = 0.8 * IN, 0.4 * IN, 0.8 * IN
    t = w.thread_thickness(e, ACME_29, p, e, lead, normal=True)
    assert t == pytest.approx(p / 2 * math.cos(math.atan(lead / (math.pi * e))), abs=1e-12)
    assert w.pd_from_thickness(t * 0.99, ACME_29, p, e, lead, normal=True) < e
    e2 = e - 0.2
    t2 = w.thread_thickness(e2, ACME_29, p, e, lead, normal=True)
    assert w.pd_from_thickness(t2, ACME_29, p, e, lead, normal=True) == pytest.approx(e2,
                                                                                       abs=1e-9)


def test_caliper_band_for_tr24x5():
    lim = pt.tr(24, 5, es_d2=-0.118, td2=0.335)     # from memory: ISO 2903 7e, P 5: es −118 µm,
    band = w.caliper_band(TRAPEZOIDAL_30, 5.0, 5.0, lim.pd_max, lim.pd_min, 23.9,  # Td2 335 µm
                          lim.basic_pd, normal=False)
    assert band.depth_setting == pytest.approx((23.9 - 21.5) / 2)
    # computed: thinner by (basic − PD) × tan 15° at the basic pitch line
    assert band.at_pd_max == pytest.approx(2.5 - 0.118 * math.tan(math.radians(15)), abs=1e-9)
    assert band.at_pd_min < band.at_pd_max


def test_thickness_refusals():
    with pytest.raises(InvalidEntry, match="square thread"):
        w.thread_thickness(21.5, SQUARE, 5.0, 21.5)
    with pytest.raises(InvalidEntry, match="whole pitch"):
        w.pd_from_thickness(6.0, TRAPEZOIDAL_30, 5.0, 21.5)
    with pytest.raises(InvalidEntry, match="no thickness left"):
        w.thread_thickness(21.5, TRAPEZOIDAL_30, 5.0, 40.0)


# ---- the tool ------------------------------------------------------------------------------------

def test_standard_flats():
    # ISO 2904: root width at d3 = 0.366P − 0.536ac (computed from the 30° flanks); ac 0.25
    assert form_tip_flat(tr24x5()) == pytest.approx(0.366 * 5 - 0.536 * 0.25, abs=2e-3)
    # ASME B1.5: flat at the root of the screw 0.3707p − 0.259 × clearance (0.020 in, from memory)
    assert form_tip_flat(acme_1_5()) / IN == pytest.approx(0.3707 * 0.2 - 0.259 * 0.020,
                                                           abs=1e-6)
    assert standard_tip(tr24x5()) == ToolTip("flat", form_tip_flat(tr24x5()))


def test_flat_from_the_form_when_the_standard_gives_none():
    # ISO 2904 basic profile: crest and root flats 0.366P; a square thread: groove P/2
    # (common practice, no source)
    lim = tr24x5()
    assert form_tip_flat(dataclasses.replace(lim, tip_flat=None)) == pytest.approx(0.366 * 5,
                                                                                    abs=1e-3)


def test_helix_and_side_clearance_of_a_two_start_tr24x10():
    lim = tr24x10_p5()
    tool = power_tool(lim)
    # computed: atan(L / (π d)), L = 10, at the screw's root (d3 max) and crest (d max);
    # ISO 2904: d3 = d − P − 2ac = 18.5 basic, d = 24
    d3, d = lim.minor_max, lim.major_max
    assert 18.0 < d3 <= 18.5 and d == 24
    assert tool.helix_minor_deg == pytest.approx(math.degrees(math.atan(10 / (math.pi * d3))))
    assert tool.helix_major_deg == pytest.approx(math.degrees(math.atan(10 / (math.pi * 24))))
    assert tool.helix_minor_deg == pytest.approx(9.76, abs=0.1)   # computed at d3 = 18.5
    # leading = helix at minor + working clearance; trailing = working − helix at major
    # (Machinery's Handbook rule, from memory)
    assert tool.leading_deg == pytest.approx(tool.helix_minor_deg + WORKING_CLEARANCE_DEG)
    assert tool.trailing_deg == pytest.approx(WORKING_CLEARANCE_DEG - tool.helix_major_deg)
    assert tool.leading_side == "headstock"
    assert all(len(line) <= 38 for line in tool.lines())
    assert any("past square" in n for n in tool.notes)
    lh = power_tool(dataclasses.replace(lim, spec=lim.spec.with_(hand="LH")))
    assert lh.leading_side == "tailstock"


def test_lead_too_steep_for_the_tool_is_refused():
    lim = acme_1_04p_08l()
    # computed: the screw's root, ASME B1.5 minor max D − p − c = 1 − 0.4 − 0.02 = 0.58 in
    # (c = 0.020 in, from memory), helix atan(0.8 / (π 0.58)) = 23.71°
    assert lim.minor_max / IN == pytest.approx(0.58, abs=1e-9)
    assert helix_angle_deg(lim.spec.lead, lim.minor_max) == pytest.approx(23.71, abs=0.01)
    with pytest.raises(InvalidEntry, match="too steep") as info:
        power_tool(lim, max_side_clearance_deg=15)
    assert "26.7°" in str(info.value) and "tilted to the helix" in str(info.value)
    assert power_tool(lim, max_side_clearance_deg=30).leading_deg == pytest.approx(26.71,
                                                                                  abs=0.01)


def test_undercutting_tip_is_refused():
    lim = tr24x5()
    with pytest.raises(InvalidEntry, match="wider than the groove at the root") as info:
        power_tool(lim, ToolTip("flat", 2.0))
    assert "1.696" in str(info.value)      # the ISO 2904 root width, computed above


def test_power_tool_refusals():
    with pytest.raises(InvalidEntry, match="flat root"):
        power_tool(tr24x5(), ToolTip("radius", 0.2))
    from test_tool import iso_limits
    with pytest.raises(InvalidEntry, match="not a 60° form"):
        power_tool(iso_limits())
    with pytest.raises(InvalidEntry, match="degrees"):
        power_tool(tr24x5(), max_side_clearance_deg=0)


def test_narrow_flat_is_allowed_with_a_note():
    tool = power_tool(tr24x5(), ToolTip("flat", 1.2))
    assert any("narrower than the standard" in n for n in tool.notes)


def test_tool_form_check_against_the_mating_nut():
    # a standard flat clears the nut (ISO 2904: the external root at d3 lies ac under D1)
    ok = check_tool(tr24x5(), standard_tip(tr24x5()))
    assert ok.ok and ok.picture.cut == "external"
    # a nut tool with too wide a flat leaves its root short of the screw's crest
    nut = pt.tr(24, 5, kind="internal")
    bad = check_tool(nut, ToolTip("flat", 2.2))
    assert not bad.ok and bad.interference > 0
    assert any("Grind the flat to the standard 1.696" in m for m in bad.messages)


def test_square_thread_form_check_refused_with_reason():
    lim = pt.tr(24, 5)
    sq = dataclasses.replace(lim, spec=lim.spec.with_(form=SQUARE), tip_flat=None)
    assert form_tip_flat(sq) == 2.5          # common practice, no source: groove P/2
    with pytest.raises(InvalidEntry, match="square-nosed"):
        check_tool(sq, ToolTip("flat", 2.5))


# ---- infeed and the pass plan --------------------------------------------------------------------

@pytest.mark.parametrize("form, flank, modified", [
    (TRAPEZOIDAL_30, 15.0, 14.5),     # half the 30° form angle (ISO 2904); offset 0.5° (§6)
    (ACME_29, 14.5, 14.0),            # half the 29° form angle (ASME B1.5)
])
def test_flank_and_modified_at_half_the_form_angle(form, flank, modified):
    from shopterm.cutting.infeed import infeed_method
    from shopterm.lathe.machine import Dial, Lathe, Leadscrew
    dial = Dial("mm", 0.02, 100, reads_diameter=False)
    bed_lathe = Lathe("bed-zeroed", Leadscrew.from_mm(3), dial, dial, compound_zero="bed")
    f = infeed_method("flank", form.angle_deg)
    m = infeed_method("modified", form.angle_deg)
    assert (f.true_angle_deg, m.true_angle_deg) == (flank, modified)
    # threading-tool handbooks, computed: compound travel = radial / cos(angle)
    assert f.factor == pytest.approx(1 / math.cos(math.radians(flank)))
    # a compound scale zeroed along the bed reads 90° − the true angle (§6 [M])
    assert infeed_method("flank", form.angle_deg, lathe=bed_lathe).scale_reading_deg == \
        pytest.approx(90 - flank)


def test_square_thread_is_fed_radially_only():
    from shopterm.cutting.infeed import infeed_method
    assert infeed_method("radial", 0.0).factor == 1.0
    for method in ("flank", "modified", "alternating"):
        with pytest.raises(InvalidEntry, match="parallel flanks"):
            infeed_method(method, 0.0)


def test_groove_area_plan_reduces_to_the_published_law_without_a_flat():
    from shopterm.cutting.plan import constant_area_depths, groove_area_depths
    # threading-tool handbooks, computed: ap 0.6, 5 passes -> 0.164, 0.300, 0.424, 0.520, 0.600; a vanishing
    # flat leaves the area ∝ depth², the published law
    got = groove_area_depths(0.6, 5, 1e-12, math.tan(math.radians(30)))
    assert got == pytest.approx((0.164, 0.300, 0.424, 0.520, 0.600), abs=1e-3)
    assert got == pytest.approx(constant_area_depths(0.6, 5), abs=1e-9)


def test_groove_area_plan_keeps_equal_chip_areas():
    from shopterm.cutting.plan import groove_area, groove_area_depths
    flat, t = 1.696, math.tan(math.radians(15))
    cums = groove_area_depths(2.75, 12, flat, t)
    areas = [groove_area(b, flat, t) - groove_area(a, flat, t)
             for a, b in zip((0.0,) + cums, cums)]
    # published φ: pass 1 is 0.3 of a unit, pass 2 0.7, the rest 1 each (computed, §6)
    unit = groove_area(2.75, flat, t) / 11
    assert areas[0] == pytest.approx(0.3 * unit) and areas[1] == pytest.approx(0.7 * unit)
    assert areas[2:] == pytest.approx([unit] * 10)
    # square thread (tan 0): equal depths after the first two
    sq = groove_area_depths(2.5, 6, 2.5, 0.0)
    assert sq[2] - sq[1] == pytest.approx(0.5) and sq[-1] == 2.5
    with pytest.raises(InvalidEntry, match="tip flat"):
        groove_area_depths(2.75, 12, 0.0, t)


@pytest.mark.parametrize("limits, lo, hi", [
    (tr24x10_p5, 15, 40),      # the task's sane count for a Tr24x10(P5) (common practice)
    (acme_1_5, 15, 40),        # and a 1-5 ACME
])
def test_power_thread_plan_has_a_sane_count(limits, lo, hi):
    from shopterm.cutting.infeed import infeed_method
    from shopterm.cutting.plan import DEFAULT_MAX_FIRST, make_plan
    from shopterm.cutting.tool import tool_depth
    lim = limits()
    tip = standard_tip(lim)
    total = tool_depth(lim, lim.basic_major, tip).total_radial
    for method in ("modified", "radial", "alternating"):
        im = infeed_method(method, lim.spec.form.angle_deg)
        plan = make_plan(total, im, flat_bottom=tip.size, finish=0.04)
        assert lo <= plan.count <= hi
        assert max(p.exact_radial_cum - q for p, q in
                   zip(plan.passes, (0.0,) + tuple(p.exact_radial_cum for p in plan.passes))) \
            <= DEFAULT_MAX_FIRST + 1e-9
        assert plan.flat_bottom == tip.size
        # the V-thread law would plan the same depth in far more passes
        assert make_plan(total, im).count > 2 * plan.count


def test_power_plan_replans_with_its_flat():
    from shopterm.cutting.infeed import infeed_method
    from shopterm.cutting.plan import make_plan, replan
    lim = tr24x5()
    plan = make_plan(2.75, infeed_method("radial", 30.0), flat_bottom=1.696)
    done = plan.passes[9].radial_cum
    new = replan(plan, measured_pd=lim.basic_pd + 2 * (2.75 - done), aim_pd=lim.basic_pd,
                 done_cum_radial=done)
    assert new.flat_bottom == 1.696
    assert new.passes[-1].radial_cum == pytest.approx(2.75, abs=0.02)   # one 0.02 mm division


def test_alternating_never_cuts_past_the_final_flanks_of_a_flat_groove():
    # computed: each pass's flat tool (flanks at 15°) puts its right flank at x + h·tan and its
    # left at x − h·tan (extended to the surface); the groove's flanks must only move outward
    # and end where the last pass leaves them, so nothing is cut past the final form
    from shopterm.cutting.infeed import infeed_method
    from shopterm.cutting.plan import make_plan
    im = infeed_method("alternating", 30.0)
    plan = make_plan(2.75, im, flat_bottom=1.696, dial_step=0.5)
    t = math.tan(math.radians(15))
    right = [p.compound_cum + 1.696 / 2 + p.radial_cum * t for p in plan.passes]
    left = [p.compound_cum - 1.696 / 2 - p.radial_cum * t for p in plan.passes]
    slack = plan.feed_dial.travel_per_division        # rounding of the dials, one division
    assert max(right) <= right[-1] + slack and min(left) >= left[-1] - slack
    # the final groove is the form's width at the surface: flat + 2·depth·tan 15°
    assert right[-1] - left[-1] == pytest.approx(1.696 + 2 * 2.75 * t, abs=2 * slack)
    assert {p.side for p in plan.passes} == {"left", "right"}


# ---- multi-start ---------------------------------------------------------------------------------

@pytest.mark.parametrize("ls, teeth, lines", [
    ("8tpi", 32, 8),
    ("6mm", 12, 6),      # 72 mm a dial turn, 7.2 leads: no line repeats the groove
    ("6mm", 20, 4),
    ("6mm", 10, 5),
])
def test_two_start_tr24x10_dial_against_simulation(ls, teeth, lines):
    from shopterm.lathe.machine import Leadscrew, ThreadDial
    from shopterm.lathe.thread_dial import dial_plan
    from test_thread_dial import simulate
    screw = Leadscrew.from_tpi(8) if ls == "8tpi" else Leadscrew.from_mm(6)
    lim = tr24x10_p5()
    lead = Fraction(lim.spec.lead).limit_denominator(1000)     # 10 mm: 2 starts × 5 mm
    assert lead == 10
    plan = dial_plan(screw, ThreadDial(teeth, lines, ()), lead, lim.spec.starts)
    per_line, _ = simulate(screw.pitch_exact, lead, teeth, lines, 2)
    if plan.keep_half_nut_closed:
        # Jones, Turning and Boring (thread dial): a metric lead on an inch leadscrew: keep the half nut closed
        assert all(len(seen) > 1 for seen in per_line.values())
        assert ls == "8tpi" or teeth == 12
        return
    sim = {s: tuple(k for k, seen in per_line.items() if seen == {s - 1}) for s in (1, 2)}
    assert dict(plan.start_lines) == sim and plan.lines == sim[1]


def test_two_start_acme_on_an_inch_leadscrew_against_simulation():
    from shopterm.lathe.machine import Leadscrew, ThreadDial
    from shopterm.lathe.thread_dial import dial_plan
    from test_thread_dial import simulate
    lead = Fraction(254, 10) * Fraction(8, 10)      # 0.8 in lead, 0.4 in pitch
    plan = dial_plan(Leadscrew.from_tpi(8), ThreadDial(32, 8, ()), lead, 2)
    per_line, _ = simulate(Fraction(254, 80), lead, 32, 8, 2)
    sim = {s: tuple(k for k, seen in per_line.items() if seen == {s - 1}) for s in (1, 2)}
    assert not plan.keep_half_nut_closed and dict(plan.start_lines) == sim


def test_indexing_a_two_start_tr24x10_moves_one_pitch():
    from shopterm.lathe.indexing import indexing_methods
    from shopterm.lathe.machine import Dial
    lim = tr24x10_p5()
    plan = indexing_methods(lim.spec.lead, lim.spec.starts,
                            compound_dial=Dial("mm", 0.05, 100, reads_diameter=False),
                            spindle_gear=40, faceplate_slots=4)
    assert plan.pitch_mm == pytest.approx(5.0)       # ISO 2904 Tr24x10(P5): pitch 5, lead 10
    by_key = {m.key: m for m in plan.methods}
    assert by_key["compound"].amount == pytest.approx(100)    # 5 mm / 0.05 mm per division
    assert by_key["spindle_gear"].amount == 20 and by_key["plate"].amount == 2
    assert by_key["chuck4"].works and not by_key["chuck3"].works


# ---- identify ------------------------------------------------------------------------------------

@pytest.fixture
def power_family(monkeypatch):
    """The hand-made Tr/Acme threads as a family in the registry, next to the real ones."""
    pt.register(monkeypatch)
    from shopterm import standards
    from shopterm.cutting import identify as ident
    caches = (ident._limits, standards.catalogue, standards._designations)
    for c in caches:
        c.cache_clear()
    yield [s for f in ("iso", "unified", pt.FAMILY)
           for s in standards.family_module(f).catalogue()]
    for c in caches:
        c.cache_clear()


def test_gauge_angle_tells_a_trapezoidal_screw_from_metric(power_family):
    from shopterm.cutting.identify import identify
    # Tr24x5 basic major 24 (ISO 2904), crests a little worn; pitch 5 mm by gauge, 30° gauge
    got = identify(major=23.9, pitch=5.0, angle=30, threads=power_family)
    assert got.candidates[0].designation == "Tr24x5"
    assert "30° form as gauged" in got.candidates[0].why


def test_crest_flat_tells_power_forms_from_60(power_family):
    from shopterm.cutting.identify import crest_flat_of, identify
    # ISO 2904: crest flat 0.366P; ISO 68-1: P/8; ASME B1.5: 0.3707P
    assert crest_flat_of(TRAPEZOIDAL_30, 5.0) == pytest.approx(0.366 * 5, abs=1e-3)
    assert crest_flat_of(ISO_60, 5.0) == pytest.approx(5 / 8, abs=1e-9)
    assert crest_flat_of(ACME_29, 0.2 * IN) / IN == pytest.approx(0.3707 * 0.2, abs=1e-5)
    assert crest_flat_of(SQUARE, 5.0) == 2.5       # common practice, no source
    # a 24 mm bolt with a 3 mm pitch: M24x3 (ISO 261 coarse) or Tr24x3 (ISO 2902); the flat of
    # 1.1 mm is the trapezoidal's 0.366 × 3 (ISO 2904), not the 60° P/8 = 0.375 (ISO 68-1)
    both = identify(major=23.95, pitch=3.0, threads=power_family)
    assert {"M24x3", "Tr24x3"} <= {c.designation for c in both.candidates[:2]}
    assert both.ambiguous
    assert "crest flat" in {t.measure for t in both.to_tell_apart}
    got = identify(major=23.95, pitch=3.0, crest_flat=1.1, threads=power_family)
    assert got.candidates[0].designation == "Tr24x3"
    metric = identify(major=23.95, pitch=3.0, crest_flat=0.4, threads=power_family)
    assert metric.candidates[0].designation == "M24x3"


def test_worn_leadscrew_is_still_offered_with_a_note(power_family):
    from shopterm.cutting.identify import identify
    # a 1-5 ACME leadscrew (ASME B1.5 major 1.000 in) worn 0.025 in on the crests, pitch exact
    got = identify(major=0.975 * IN, tpi=5, angle=29, threads=power_family)
    top = got.candidates[0]
    assert top.designation == "1.000-5 ACME"
    assert "worn leadscrew" in got.note and "pitch is exact" in got.note
    # a 60° bolt worn as much is not excused the same way: the note is for power threads only
    plain = identify(major=0.975 * IN, tpi=5, angle=60, threads=power_family)
    assert "worn leadscrew" not in plain.note


def test_tell_apart_one_start_from_two(power_family):
    from shopterm.cutting.identify import identify
    # Tr24x5 and Tr24x10(P5) share pitch, form and sizes (ISO 2904): only the lead differs
    got = identify(major=23.9, pitch=5.0, angle=30, threads=power_family)
    tells = [t for t in got.to_tell_apart if t.measure == "starts"]
    assert got.ambiguous and tells
    assert {e.low for e in tells[0].expected} == {5.0, 10.0}


def test_acme_and_stub_acme_told_apart_by_the_depth(power_family):
    from shopterm.cutting.identify import identify
    # same major, pitch and angle (ASME B1.5 / B1.8): basic depth 0.5p against 0.3p, so the
    # screw's minor differs by 0.4p = 0.08 in (computed)
    got = identify(major=0.99 * IN, tpi=5, angle=29, threads=power_family)
    tells = [t for t in got.to_tell_apart if t.measure == "depth"]
    assert got.ambiguous and tells
    lows = sorted(e.high for e in tells[0].expected)
    assert (lows[1] - lows[0]) / IN == pytest.approx(0.4 * 0.2, abs=1e-9)
    assert "diameter" not in {t.measure for t in got.to_tell_apart
                              if set(t.between) == {"1.000-5 ACME", "1.000-5 STUB ACME"}}


def test_identify_refusals_for_power_measurements():
    from shopterm.cutting.identify import measured
    with pytest.raises(InvalidEntry, match="crest flat"):
        measured(major=24, crest_flat=-1)
    with pytest.raises(InvalidEntry, match="bolt"):
        measured(minor=19, crest_flat=1.0, kind="internal")
    assert measured(major=24, pitch=5, angle=0).angle == 0.0     # a square thread's gauge
    with pytest.raises(InvalidEntry, match="29 \\(Acme\\)"):
        measured(major=24, angle=10)


def test_catalogue_offers_power_threads():
    from shopterm.cutting.identify import identify
    got = identify(major=23.9, pitch=5.0, angle=30)
    assert got.candidates[0].spec.form.angle_deg == 30
    assert got.candidates[0].designation.startswith("Tr24x5")


# ---- the calc commands ---------------------------------------------------------------------------

def _calc(capsys, *argv):
    import json
    from shopterm.cli import main
    code = main(["calc", *argv, "--json"])
    out = capsys.readouterr()
    assert code == 0, out.err
    return json.loads(out.out)


def test_calc_passes_for_a_two_start_trapezoidal(power_family, capsys):
    data = _calc(capsys, "passes", "Tr24x10(P5)", "--od", "24", "--method", "alternating")
    tool = data["power_tool"]
    assert tool["flat"] == pytest.approx(1.696, abs=1e-3)     # ISO 2904 root width, computed
    lim = tr24x10_p5()       # computed: atan(10 / (π d3)) at the root (d3 max)
    assert tool["helix_minor_deg"] == pytest.approx(
        math.degrees(math.atan(10 / (math.pi * lim.minor_max))), abs=1e-3)
    assert 15 <= len(data["passes"]) <= 40
    # computed: from the 24 mm blank to the aim PD (mid band), then the standard flat's tip lies
    # (d2 − d3)/2 = 0.25P + ac = 1.5 beyond the pitch line (ISO 2904); 2.75 = h3 at basic size
    assert data["total_radial"] == pytest.approx((24 - lim.pd_mid) / 2 + 1.5, abs=1e-3)


def test_calc_passes_refuses_a_too_steep_lead(power_family, capsys):
    from shopterm.cli import main
    code = main(["calc", "passes", "1.000-0.4P-0.8L ACME", "--od", "1in"])
    err = capsys.readouterr().err
    assert code != 0 and "too steep" in err


def test_calc_wires_shows_simple_and_caliper_for_acme(power_family, capsys):
    data = _calc(capsys, "wires", "1.000-5 ACME")
    ow = data["over_wires"]
    assert ow["at_pd_max_simple"] < ow["at_pd_max"]      # §5 [P]: simple reads low over wires
    assert data["caliper"]["normal_thickness_at_pd_max"] > 0
    assert data["wire_min"] == pytest.approx(0.4873 * 0.2, abs=1e-4)  # in: 0.487P (from memory)


def test_calc_identify_offers_the_power_thread(power_family, capsys):
    data = _calc(capsys, "identify", "--major", "23.9", "--pitch", "5", "--angle", "30")
    assert data["candidates"][0]["designation"] == "Tr24x5"


def test_mating_nut_root_clears_the_crest_by_ac():
    # ISO 2904: the nut's root is at D4 = d + 2ac, so a screw turned to d touches the nut only
    # on its flanks: the least gap is the flank gap on radius, (D2 − d2 aimed)/2 (computed);
    # ISO 2903 7e for P 5, from memory: es −118 µm, Td2 335 µm
    lim = pt.tr(24, 5, es_d2=-0.118, td2=0.335)
    check = check_tool(lim, standard_tip(lim), turned_diameter=24.0)
    assert check.ok
    assert check.clearance == pytest.approx((21.5 - lim.pd_mid) / 2, abs=1e-6)


# ---- stub Acme (form built here until forms.py has STUB_ACME_29) ---------------------------------

_H29 = 0.5 / math.tan(math.radians(14.5))    # sharp-V height of a 29° form, computed
#: ASME B1.8 stub Acme basic height 0.3p: equal flats at crest and root of the basic form
STUB = ThreadForm("stub-test", "Stub Acme 29°", 29.0, _H29, (_H29 - 0.3) / 2, (_H29 - 0.3) / 2)


def test_stub_acme_flats_and_wires():
    # ASME B1.8 basic crest flat 0.4224p (from memory) = 2·crest_trunc·tan 14.5° (computed)
    from shopterm.cutting.identify import crest_flat_of
    assert crest_flat_of(STUB, 1.0) == pytest.approx(0.4224, abs=1e-4)
    k, full = w.wire_constants(STUB), w.wire_constants(ACME_29)
    assert k.best == pytest.approx(0.516450, abs=1e-6)    # §5: best wire depends on angle only
    # computed: the crest stands 0.15P above the pitch line, so the wire's top must clear
    # 0.15P + H/2 above the root apex: W > 2(H/2 + 0.15)/(1 + cosec 14.5°)
    assert k.smallest == pytest.approx(2 * (_H29 / 2 + 0.15) / (1 + 1 / math.sin(
        math.radians(14.5))), abs=1e-9)
    assert k.largest < full.largest and k.smallest < k.best < k.largest


def test_stub_acme_tool_takes_the_form_flat():
    lim = pt.acme(1.0, 5)
    stub = dataclasses.replace(lim, spec=lim.spec.with_(form=STUB), tip_flat=None,
                               basic_minor=lim.basic_major - 0.6 * lim.spec.pitch,
                               minor_max=lim.basic_major - 0.6 * lim.spec.pitch,
                               basic_pd=lim.basic_major - 0.3 * lim.spec.pitch,
                               pd_max=lim.basic_major - 0.3 * lim.spec.pitch,
                               pd_min=lim.basic_major - 0.3 * lim.spec.pitch)
    tool = power_tool(stub)
    # ASME B1.8 basic: the root flat of the basic form is 0.4224p (from memory), d = D − 0.6p
    assert tool.standard_flat / IN == pytest.approx(0.4224 * 0.2, abs=1e-5)
    assert tool.groove_at_root == pytest.approx(tool.standard_flat, abs=1e-9)
