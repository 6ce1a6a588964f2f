"""Tool tip geometry and the tool-form check against the thread."""

from __future__ import annotations

import math

import pytest

from shopterm.cutting.tool import (check_tool, largest_tip, standard_tip, tip_beyond_pitch_line,
                                   tip_setback, tool_depth)
from shopterm.errors import InvalidEntry
from shopterm.lathe.machine import ToolTip
from shopterm.standards.forms import ISO_60, WHITWORTH_55
from shopterm.standards.spec import Limits, ThreadSpec

P = 1.5
H = math.sqrt(3) / 2 * P        # ISO 68-1: H = 0.866025P (sharp V of 60°)


def iso_limits(kind="external", pd_min=None, pd_max=None, minor_max=None, minor_min=None,
               root_min=None):
    """M10x1.5 limits built by hand from ISO 68-1 basic numbers (band as given)."""
    d = 10.0
    d2 = d - 0.649519 * P        # ISO 68-1 / ISO 724: d2 = d − 0.649519P
    d1 = d - 1.082532 * P        # ISO 68-1: D1 = d − 1.082532P
    d3 = d - 1.226869 * P        # ISO 68-1: d3 = d − 1.226869P
    spec = ThreadSpec("iso", "M", "M10", d, P, ISO_60, kind=kind)
    ext = kind == "external"
    return Limits(spec, d, d2, d3 if ext else d1, d if ext else None, d,
                  pd_max if pd_max is not None else d2, pd_min if pd_min is not None else d2,
                  minor_max, minor_min, (0.613435 if ext else 0.541266) * P,
                  root_radius_min=root_min)


def test_root_radius_tip_gives_h3_from_basic_major():
    # ISO 68-1: nominal external root radius H/6; h3 = 17/24 H = 0.613435P from the major.
    lim = iso_limits()
    depth = tool_depth(lim, 10.0, ToolTip("radius", H / 6), aim_pd=lim.basic_pd)
    assert depth.total_radial == pytest.approx(17 / 24 * H, abs=2e-6)  # ISO 68-1, h3 = 17/24 H
    assert depth.total_radial == pytest.approx(0.613435 * P, abs=2e-6)  # ISO 68-1 h3 factor
    assert depth.basic_depth == pytest.approx(depth.total_radial, abs=2e-6)
    # root left at d3 = d − 1.226869P (ISO 68-1)
    assert depth.root_diameter == pytest.approx(10 - 1.226869 * P, abs=5e-6)


def test_h3_against_the_iso_module():
    from shopterm.standards import limits, parse
    lim = limits(parse("M10x1.5-6g"))
    depth = tool_depth(lim, lim.basic_major, ToolTip("radius", H / 6), aim_pd=lim.basic_pd)
    assert depth.total_radial == pytest.approx(lim.depth, abs=2e-6)
    assert lim.depth == pytest.approx(0.920, abs=0.0005)  # tap maker's table, M10 h3 0.920


def test_sharp_and_flat_setbacks():
    # computed from plane geometry: flat f sits (f/2)cot a back; sharp apex (P/4)cot a
    a = math.radians(30)
    assert tip_setback(ToolTip("flat", 0.2), 60) == pytest.approx(0.1 / math.tan(a))
    assert tip_setback(ToolTip("radius", 0.0), 60) == 0.0
    # a flat of P/4 reaches exactly the basic minor, H/4 below the pitch line (ISO 68-1)
    assert tip_beyond_pitch_line(ToolTip("flat", P / 4), P, 60) == pytest.approx(H / 4)
    # a radius r on 60°: 1/sin 30° − 1 = 1
    assert tip_setback(ToolTip("radius", 0.3), 60) == pytest.approx(0.3)


def test_whitworth_radius_gives_bs84_depth():
    # BS 84: h = 0.640327P with r = 0.137329P at crest and root, H = 0.960491P
    p = 25.4 / 16
    spec = ThreadSpec("whitworth", "BSW", "3/8", 9.525, p, WHITWORTH_55)
    e = 9.525 - 0.640327 * p     # BS 84: E = D − 0.640327P
    lim = Limits(spec, 9.525, e, 9.525 - 1.280654 * p, 9.525, 9.525, e, e, None, None,
                 0.640327 * p)
    d = tool_depth(lim, 9.525, ToolTip("radius", 0.137329 * p), aim_pd=e)
    assert d.total_radial == pytest.approx(0.640327 * p, abs=2e-6)  # BS 84 depth


def test_internal_feeds_outward():
    lim = iso_limits("internal", minor_min=8.376, minor_max=8.676)
    tip = ToolTip("flat", P / 8)
    d = tool_depth(lim, 8.376, tip, aim_pd=lim.basic_pd)
    # computed from (PD − ID)/2 + (P/4 − f/2)cot 30°, ISO 68-1 geometry
    expect = (lim.basic_pd - 8.376) / 2 + (P / 4 - P / 16) * math.sqrt(3)
    assert d.total_radial == pytest.approx(expect)
    assert d.root_diameter == pytest.approx(10.0, abs=5e-6)   # basic major, flat P/8 (ISO 68-1)


@pytest.mark.parametrize("od, tip, msg", [
    (8.0, ToolTip("radius", 0.2), "not larger than the pitch diameter"),
    (0.0, ToolTip("radius", 0.2), "greater than 0"),
    (10.0, ToolTip("flat", 0.8), "too big"),
    (254.0, ToolTip("radius", 0.2), "check the number and its unit"),  # 10 in typed for 10 mm
])
def test_tool_depth_errors(od, tip, msg):
    with pytest.raises(InvalidEntry, match=msg):
        tool_depth(iso_limits(), od, tip)


def test_largest_tip_is_inverse_of_setback():
    for kind in ("flat", "radius"):
        big = largest_tip(kind, P, 60)
        assert tip_setback(ToolTip(kind, big), 60) == pytest.approx(P / 4 * math.sqrt(3))


def test_root_radius_rules():
    rule = 0.125 * P   # ISO 965-1 minimum external root radius 0.125P
    lim = iso_limits(root_min=rule, minor_max=10 - 1.226869 * P)
    assert check_tool(lim, ToolTip("radius", H / 6), aim_pd=lim.basic_pd).ok
    small = check_tool(lim, ToolTip("radius", 0.1), aim_pd=lim.basic_pd)
    assert not small.ok and any("root radius rule" in m for m in small.messages)
    flat = check_tool(lim, ToolTip("flat", 0.2), aim_pd=lim.basic_pd)
    assert not flat.ok and any("rounded root" in m for m in flat.messages)


def test_unr_range_from_the_unified_module():
    from shopterm.standards import limits, parse
    lim = limits(parse("1/4-20 UNRC-2A"))
    p = 25.4 / 20
    assert lim.root_radius_min == pytest.approx(0.108 * p)  # ASME B1.1 UNR, from memory
    assert not check_tool(lim, ToolTip("radius", 0.10 * p)).ok
    assert check_tool(lim, ToolTip("radius", 0.125 * p)).ok
    assert not check_tool(lim, ToolTip("radius", 0.16 * p)).ok


def _nut_root_overlap_by_sampling(r, pitch, pd_nut, major, pd_bolt):
    """Independent check: sample the tool's circle as points and the bolt crest as a flat."""
    a = math.radians(30)
    apex = pd_nut / 2 + pitch / 4 / math.tan(a)
    # find the circle centre on the axis of symmetry by bisection on distance to the flank
    # line through the apex (flank direction at 30° from the radial), not by formula
    lo, hi = apex - 10 * r, apex

    def dist(yc):   # distance from (0, yc) to the line through (0, apex) at angle a
        return (apex - yc) * math.sin(a)
    for _ in range(80):
        mid = (lo + hi) / 2
        if dist(mid) > r:
            lo = mid
        else:
            hi = mid
    yc = (lo + hi) / 2
    tangent_x = r * math.cos(a)
    crest_half = pitch / 4 - (major / 2 - pd_bolt / 2) * math.tan(a)   # bolt crest flat half
    worst = 0.0
    for i in range(20001):
        x = crest_half * i / 20000
        if x <= tangent_x:
            y_nut = yc + math.sqrt(r * r - x * x)
        else:
            y_nut = pd_nut / 2 + (pitch / 4 - x) / math.tan(a)
        worst = max(worst, major / 2 - y_nut)
    return worst


@pytest.mark.parametrize("r", [0.15, 0.2, 0.3])
def test_worn_tip_interference_internal(r):
    # Nut M10x1.5 at basic PD (6H D2 min = basic, ISO 965-1 EI = 0); mating screw at its
    # maximum material with no allowance: basic major 10, basic PD (ISO 68-1).
    lim = iso_limits("internal", minor_min=8.376, minor_max=8.676)
    chk = check_tool(lim, ToolTip("radius", r), aim_pd=lim.basic_pd)
    expect = _nut_root_overlap_by_sampling(r, P, lim.basic_pd, 10.0, lim.basic_pd)
    assert expect > 0.01
    assert not chk.ok
    assert chk.interference == pytest.approx(expect, abs=2e-5)
    assert any("fouls" in m and f"{expect:.3f}" in m for m in chk.messages)
    assert chk.picture.interference   # the picture marks where
    # the largest radius that clears: circle tangent where the flank meets the basic crest
    # corner, r cos 30° = P/16 (computed from ISO 68-1 crest flat P/8); the check counts an
    # overlap under 1 µm as touching, which lets the radius run a little past it
    assert chk.largest_clear_radius == pytest.approx(P / 16 / math.cos(math.radians(30)),
                                                     abs=5e-4)


def test_sharp_internal_tip_clears():
    lim = iso_limits("internal", minor_min=8.376, minor_max=8.676)
    chk = check_tool(lim, ToolTip("radius", 0.05), aim_pd=lim.basic_pd)
    assert chk.ok and chk.interference == 0.0
    assert _nut_root_overlap_by_sampling(0.05, P, lim.basic_pd, 10.0, lim.basic_pd) < 1e-9


def test_profiles_and_render():
    lim = iso_limits("internal", minor_min=8.376, minor_max=8.676)
    chk = check_tool(lim, ToolTip("radius", 0.3), aim_pd=lim.basic_pd)
    pic = chk.picture
    xs = [x for x, _ in pic.external]
    assert xs[0] == pytest.approx(-P / 2) and xs[-1] == pytest.approx(P / 2)
    lines = pic.render_profiles(40, 12)
    assert len(lines) == 12 and all(len(s) == 40 for s in lines)
    assert set("".join(lines)) <= set("─│┼·█░▒• ")
    assert "█" in "".join(lines)
    with pytest.raises(InvalidEntry):
        pic.render_profiles(2, 2)


def test_standard_tip_matches_standard_depth():
    from shopterm.standards import limits, parse
    lim = limits(parse("M10x1.5-6g"))
    tip = standard_tip(lim)
    assert tip.kind == "radius" and tip.size == pytest.approx(H / 6)  # ISO 68-1 H/6
