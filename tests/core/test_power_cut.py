"""Power threads through the cut state and the caliper: the preparation's default tip, the plan
sized by the flat (kept through a replan), the side shift of an alternating pass, the PowerTool
of a preparation, and a gear-tooth caliper's thickness turned into what is left to feed.

Sources: ISO 2904 basic profile (h3 = 0.5P + ac, d3 = d − 2h3, ac 0.25 mm for P 2–5, the
groove P/2 wide at the pitch line, flanks at 15°), from memory; ASME B1.5 Acme basic profile
(basic PD = D − P/2, flanks at 14.5°), from memory; Machinery's Handbook, Acme thread
thickness at the pitch line P/2, normal thickness = axial × cos λ, from memory.
"""

import math
from fractions import Fraction

import pytest

from shopterm.cutting.cut_state import (cut_from_record, default_draft, flat_bottom,
                                        power_tool_for, prepare, prepared_setup)
from shopterm.cutting.remaining import measure_by_caliper
from shopterm.errors import InvalidEntry
from shopterm.job.events import make_event
from shopterm.job.state import JobState, apply
from shopterm.lathe.machine import Dial, Lathe, Leadscrew, ToolTip
from shopterm.standards import limits, parse, usual_class

AT = "2024-05-01T10:00:00+01:00"
LATHE = Lathe("test", Leadscrew(Fraction(3)), Dial("mm", 0.02, 100), Dial("mm", 0.02, 100))
TR = parse("Tr24x10(P5)-7e")
ACME = parse("1-5 ACME-2G")
IN = 25.4                         # NIST SP 811
RADIUS = ToolTip("radius", 0.1)   # a shop's usual V-thread tool (common practice, no source)
# ISO 2904, P 5: root width at d3 = P/2 − 2(h3 − P/4)·tan 15° (computed from the profile)
TR_FLAT = 2.5 - 2 * (2.75 - 1.25) * math.tan(math.radians(15))


def test_a_power_thread_starts_from_the_standard_flat():
    d = default_draft(RADIUS, {}, limits(TR))
    assert d["tool_kind"] == "flat" and d["tip_from"] == "standard"
    assert d["tool_size_mm"] == pytest.approx(TR_FLAT, abs=1e-6)
    # a V thread keeps the config's tip; a tip in the set-up wins over the standard's
    assert default_draft(RADIUS, {}, limits(parse("M10x1.5-6g")))["tool_kind"] == "radius"
    d = default_draft(RADIUS, {"tool_kind": "flat", "tool_size_mm": 1.5}, limits(TR))
    assert (d["tool_size_mm"], d["tip_from"]) == (1.5, "set-up")
    assert default_draft(RADIUS, {})["tip_from"] == "config"       # no thread given


def _values(**over):
    v = {**default_draft(RADIUS, {}, limits(TR)), "blank_od_mm": 23.9}
    v.update(over)
    return v


def test_the_plan_is_sized_by_the_flat_groove():
    _l, depth, _m, plan, _c = prepare(TR, LATHE, _values())
    assert plan.flat_bottom == pytest.approx(TR_FLAT, abs=1e-6)
    # constant chip area with a flat of 1.7 mm: the passes nearly equal, no step over the
    # largest first pass (0.2 mm, common practice, no source), some 14–30 of them; a sharp V
    # of the same depth by the published law takes ⌈0.3 (ap/0.2)²⌉ + 1 (threading-tool
    # handbooks, computed)
    steps = [p.radial_inc for p in plan.passes]
    assert max(steps) <= 0.2 + 0.02 and 14 <= plan.count <= 30
    v_count = math.ceil(0.3 * (depth.total_radial / 0.2) ** 2) + 1
    assert plan.count < v_count / 2
    assert flat_bottom(limits(TR), RADIUS) == 0.0
    assert flat_bottom(limits(parse("M10x1.5-6g")), ToolTip("flat", 0.2)) == 0.0


class Record:
    """A Tr24x10(P5) job's events folded as a session folds them."""

    def __init__(self, setup: dict):
        self.state, self.seq = JobState(), 0
        self.add("job_created", designation=TR.designation, thread_kind="external", units="mm")
        self.add("setup_confirmed", **setup)

    def add(self, event_kind, /, **payload):
        self.seq += 1
        self.state = apply(self.state, make_event(self.seq, 1, event_kind, payload, at=AT))

    def cut(self):
        return cut_from_record(TR, LATHE, self.state)

    def pass_cut(self):
        c = self.cut()
        self.add("pass_cut", **c.pass_entry(self.state.next_pass, c.view().dial_text))


def test_a_replan_after_a_reading_keeps_the_flat():
    r = Record(prepared_setup(TR, LATHE, _values()))
    for _ in range(10):
        r.pass_cut()
    done = r.state.passes[-1].radial_cum_mm
    # a reading 0.6 mm over the aim on PD: 0.3 mm left on radius (PD falls by twice the
    # radial infeed)
    r.add("wire_reading", measured_mm=24.9, pd_mm=limits(TR).pd_mid + 0.6, state="oversize")
    cut = r.cut()
    assert cut.replanned_from and cut.plan.flat_bottom == pytest.approx(TR_FLAT, abs=1e-6)
    assert cut.plan.set_total_radial == pytest.approx(done + 0.3, abs=0.02)


def test_an_alternating_pass_carries_its_side_shift():
    r = Record(prepared_setup(TR, LATHE, _values(method="alternating")))
    views = []
    for _ in range(3):
        views.append(r.cut().view())
        r.pass_cut()
    assert [v.side for v in views] == ["right", "left", "right"]
    for v, p in zip(views, r.state.passes):
        # the mark is the recorded count on the 100-division dial; the shift that count of
        # 0.02 mm divisions (the test lathe's compound)
        assert v.side_mark == p.payload["side_divisions"] % 100
        assert v.side_shift == pytest.approx(p.payload["side_divisions"] * 0.02, abs=1e-9)
        assert f"shift the compound {v.side} to" in v.next_step
    modified = Record(prepared_setup(TR, LATHE, _values())).cut().view()
    assert modified.side is None and modified.side_mark is None and modified.side_shift == 0.0


def test_the_power_tool_of_a_preparation():
    lim = limits(TR)
    tool = power_tool_for(lim, _values(), 15.0)
    # helix at d3 max 18.394 mm (ISO 2903 7e, as this project's limits give it): atan(L/πd)
    assert tool.helix_minor_deg == pytest.approx(
        math.degrees(math.atan(10 / (math.pi * lim.minor_max))), abs=1e-9)
    with pytest.raises(InvalidEntry, match="nose radius"):
        power_tool_for(lim, _values(tool_kind="radius", tool_size_mm=0.1), 15.0)
    with pytest.raises(InvalidEntry, match="too steep"):
        power_tool_for(lim, _values(), 10.0)
    assert power_tool_for(limits(parse("M10x1.5-6g")), _values(), 15.0) is None


def _thickness(pd_in, level_in=0.9, p_in=0.2, lead_in=0.2):
    """Acme thickness square to the thread at ``level_in`` (Machinery's Handbook, from memory)."""
    axial = p_in / 2 - (level_in - pd_in) * math.tan(math.radians(14.5))
    return axial * math.cos(math.atan(lead_in / (math.pi * pd_in)))


@pytest.mark.parametrize("pd_in, state", [(0.9050, "oversize"), (0.8823, "in_band"),
                                          (0.8700, "undersize")])
def test_a_caliper_thickness_becomes_the_pd_and_its_state(pd_in, state):
    lim = limits(ACME)
    # ASME B1.5, 1-5 ACME-2G PD 0.8726 to 0.8920 in (from memory); the crest 0.995 in
    t = _thickness(pd_in) * IN
    cm = measure_by_caliper(lim, t, 0.995 * IN, lathe=LATHE, unit="in")
    assert cm.pitch_diameter == pytest.approx(pd_in * IN, abs=1e-6)
    assert cm.measurement.state == state
    # depth slide from the crest down to the basic PD 0.9 in: (0.995 − 0.9)/2
    assert cm.band.depth_setting == pytest.approx(0.0475 * IN, abs=1e-9)
    assert cm.thickness_at(pd_in * IN) == pytest.approx(t, abs=1e-9)
    if state == "oversize":
        aim = cm.measurement.feed_aim
        assert aim.to_remove == pytest.approx(pd_in * IN - lim.pd_mid, abs=1e-9)


def test_caliper_refusals():
    lim = limits(ACME)
    with pytest.raises(InvalidEntry, match="check the reading"):
        measure_by_caliper(lim, 0.5 * IN, 0.995 * IN)          # half an inch thick
    with pytest.raises(InvalidEntry):
        measure_by_caliper(limits(parse("SQUARE 25x5")), 2.5, 25.0)
    with pytest.raises(InvalidEntry):
        measure_by_caliper(limits(parse("M10x1.5-6g")), 0.75, 9.95)
    with pytest.raises(InvalidEntry):
        measure_by_caliper(limits(parse("Tr24x5-7H")), 2.5, 24.0)   # a nut


def test_usual_class_of_each_family():
    # ISO 2903 7e / 7H, ASME B1.5 2G, ISO 965-1 6g (all from memory); BSW has none built in
    assert usual_class(parse("Tr24x5")) == "7e"
    assert usual_class(parse("Tr24x5 internal")) == "7H"
    assert usual_class(parse("1-5 ACME")) == "2G"
    assert usual_class(parse("M10x1.5")) == "6g"
    assert usual_class(parse("1/4 BSW")) is None
