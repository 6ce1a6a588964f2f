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
from shopterm.errors import InvalidEntry, UnknownThread
from shopterm.lathe.machine import ToolTip, WireSize
from shopterm.standards.forms import ACME_29, ISO_60, TRAPEZOIDAL_30, ThreadForm
from test_wires import _min_distance

IN = 25.4                      # ISO 31-1: 1 in = 25.4 mm exactly

#: A square thread form for the refusals (no standard; flanks parallel).
SQUARE = ThreadForm("square-test", "Square", 0.0, 0.5, 0.0, 0.0)


def tr24x5():
    return pt.power_limits("Tr24x5", pt.tr(24, 5))


def tr24x10_p5():
    return pt.power_limits("Tr24x10(P5)", pt.tr(24, 5, starts=2))


def acme_1_5():
    return pt.power_limits("1-5 ACME", pt.acme(1.0, 5))


def acme_1_04p_08l():
    return pt.power_limits("1.000-0.4P-0.8L-ACME", pt.acme(1.0, 2.5, starts=2))


# ---- wires ---------------------------------------------------------------------------------------

@pytest.mark.parametrize("form, c_w, c_p, best", [
    (ACME_29, 4.993929, 1.933357, 0.516450),         # published-values §5 [C], 29°
    (TRAPEZOIDAL_30, 4.863703, 1.866025, 0.517638),  # published-values §5 [C], 30°; best
                                                     # computed from P/(2 cos 15°)
])
def test_power_wire_constants(form, c_w, c_p, best):
    k = w.wire_constants(form)
    assert k.c_w == pytest.approx(c_w, abs=1e-6)
    assert k.c_p == pytest.approx(c_p, abs=1e-6)
    assert k.best == pytest.approx(best, abs=1e-6)


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
    # published-values §5: M = E + 4.993929W − 1.933357P; 1-5 ACME basic E = 0.9 in
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
    # published-values §5 [P]: the simple formulas hold up to about 5° and read the screw
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
    # NBS H28 form is good for lead angles up to about 5° (published-values §5 [P]); Tr24x5
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
    # computed: atan(L / (π d)), L = 10, d3 = 18.5, d = 24 (ISO 2904: d3 = d − P − 2ac)
    assert tool.helix_minor_deg == pytest.approx(math.degrees(math.atan(10 / (math.pi * 18.5))))
    assert tool.helix_major_deg == pytest.approx(math.degrees(math.atan(10 / (math.pi * 24))))
    assert tool.helix_minor_deg == pytest.approx(9.763, abs=1e-3)   # computed
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
    # computed: minor 1 − 0.4 − 0.02 = 0.58 in, helix atan(0.8 / (π 0.58)) = 23.7°
    assert helix_angle_deg(lim.spec.lead, lim.basic_minor) == pytest.approx(23.71, abs=0.01)
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
