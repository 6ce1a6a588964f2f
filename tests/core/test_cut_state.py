"""The cut in force from the record (shopterm.cutting.cut_state): preparation, count, replan,
pick-up zeros — what the prepare, counter and pick-up screens share."""

import math
from fractions import Fraction

import pytest

from shopterm.cutting.cut_state import (Cut, check_pickup_mark, cut_from_record, default_draft,
                                        is_prepared, pickup_readings, pickup_text, prepare,
                                        prepared_setup)
from shopterm.errors import InvalidEntry
from shopterm.job.events import make_event
from shopterm.job.state import JobState, apply
from shopterm.lathe.machine import Dial, Lathe, Leadscrew, ToolTip
from shopterm.standards import parse

AT = "2024-05-01T10:00:00+01:00"
DIV = 0.02                    # test lathe: 0.02 mm per division on radius, 100 divisions
LATHE = Lathe("test", Leadscrew(Fraction(3)), Dial("mm", DIV, 100), Dial("mm", DIV, 100))
M10 = parse("M10x1.5-6g")
PD_MAX, PD_MIN = 8.994, 8.862  # ISO 965-2, M10x1.5-6g d2 max / min
ANGLE = 29.5                  # US Navy machinery training manual: compound 29.5° for 60° threads
TIP = ToolTip("radius", 0.2)  # ≥ 0.125P = 0.1875 mm # ISO 965-1, 6g root radius minimum
BLANK = 9.95                  # inside d 9.732..9.968 # ISO 965-2, M10x1.5-6g major limits


def values(method="modified", **over):
    v = {**default_draft(TIP, {}), "blank_od_mm": BLANK, "method": method}
    v.update(over)
    return v


class Record:
    """A job's events folded as a session folds them (seq in order)."""

    def __init__(self):
        self.state = JobState()
        self.seq = 0
        self.add("job_created", designation=M10.designation, thread_kind="external", units="mm")

    def add(self, event_kind, payload=None, **more):
        self.seq += 1
        self.state = apply(self.state, make_event(self.seq, 1, event_kind,
                                                  {**(payload or {}), **more}, at=AT))

    def cut(self) -> Cut:
        return cut_from_record(M10, LATHE, self.state)

    def pass_cut(self):
        c = self.cut()
        self.add("pass_cut", c.pass_entry(self.state.next_pass, c.view().dial_text))


def prepared(method="modified", **over) -> Record:
    r = Record()
    r.add("setup_confirmed", prepared_setup(M10, LATHE, values(method, **over)))
    return r


def test_preparation_recorded_has_what_the_counter_needs():
    v = prepared_setup(M10, LATHE, values())
    assert v["compound_angle_deg"] == ANGLE and v["method"] == "modified"
    assert v["blank_od_mm"] == BLANK and v["tool_kind"] == "radius"
    assert is_prepared(v)
    assert not is_prepared({k: x for k, x in v.items() if k != "blank_od_mm"})
    # the plan's last pass reaches the total radial depth the tool needs # computed from the
    # ISO 68-1 basic profile: (OD − aim PD)/2 + (P/4)·cot 30° − r·(1/sin 30° − 1)
    aim = (PD_MAX + PD_MIN) / 2
    total = (BLANK - aim) / 2 + 1.5 / 4 / math.tan(math.radians(30)) - 0.2 * (2 - 1)
    _lim, depth, _m, plan, _check = prepare(M10, LATHE, values())
    assert depth.total_radial == pytest.approx(total, abs=1e-3)
    assert v["passes"] == plan.count and v["spring_passes"] == 1


def test_no_turned_size_says_what_to_measure():
    with pytest.raises(InvalidEntry, match="blank's OD"):
        prepare(M10, LATHE, values(blank_od_mm=None))
    with pytest.raises(InvalidEntry, match="bore"):
        prepare(parse("M10x1.5-6H"), LATHE, values(blank_od_mm=None))


def test_draft_takes_the_set_up_over_the_defaults():
    d = default_draft(TIP, {})
    assert (d["tool_kind"], d["tool_size_mm"], d["tip_from"]) == ("radius", 0.2, "config")
    assert d["method"] == "modified" and d["passes"] is None and d["blank_od_mm"] is None
    d = default_draft(TIP, {"tool_kind": "flat", "tool_size_mm": 0.1, "method": "no-such",
                            "plan": "no-such", "passes": 7})
    assert (d["tool_kind"], d["tool_size_mm"], d["tip_from"]) == ("flat", 0.1, "set-up")
    assert d["method"] == "modified" and d["plan"] == "constant-area" and d["passes"] == 7


def test_pickup_text_round_trips_and_marks_must_be_on_the_dial():
    readings = {"compound": 37.0, "cross-slide": 12.5}
    assert pickup_text(readings) == "compound 37; cross-slide 12.5"
    assert pickup_readings(pickup_text(readings)) == readings
    assert pickup_readings(None) == {}
    dial = Dial("mm", DIV, 100)
    assert check_pickup_mark("99.5", dial) == 99.5 and check_pickup_mark("0", dial) == 0
    with pytest.raises(InvalidEntry, match="from 0 to under 100"):
        check_pickup_mark("120", dial)


def test_count_goes_on_from_the_record_and_compound_travel_is_radial_over_cos():
    r = prepared()
    r.pass_cut()
    r.pass_cut()
    c = r.cut()
    assert c.done_in_plan == 2 and c.view().n == 3 and c.last_setting()[1] == \
        c.plan.passes[1].dial_divisions
    p = r.state.passes[-1].payload
    assert p["n"] == 2 and p["feeds_with"] == "compound" and p["cross_mm"] == 0.0
    # compound travel = radial / cos 29.5° (US Navy training manual, compound feeding)
    assert p["compound_mm"] * math.cos(math.radians(ANGLE)) == pytest.approx(p["radial_cum_mm"])
    counts = c.plan_counts()
    assert counts.startswith("Plan, compound divisions from the zero: (")
    assert f">{c.plan.passes[2].dial_divisions:g}<" in counts


def test_every_pass_cut_leaves_no_pass_entry():
    r = prepared(passes=2)
    r.pass_cut()
    r.pass_cut()
    with pytest.raises(InvalidEntry, match="spring pass"):
        r.cut().pass_entry(3, "0")
    assert r.cut().view().kind == "spring"


def test_pickup_zero_is_reading_less_count_and_the_last_mark_is_the_reading():
    r = prepared()
    r.pass_cut()
    r.pass_cut()
    done = r.cut().plan.passes[1].dial_divisions
    r.add("tool_pickup", reason="reground", radial_cum_mm=r.state.radial_cum_mm,
          dial=pickup_text({"compound": 50.0, "cross-slide": 20.0}))
    c = r.cut()
    # new zero = reading now − count done, modulo one turn (arithmetic of a graduated dial)
    assert c.zeros["compound"].offset == pytest.approx((50 - done) % 100)
    assert c.zeros["cross-slide"].offset == pytest.approx(20.0)
    assert c.last_setting()[1] == pytest.approx(50.0)      # inverse: the groove reads as typed
    assert c.view().dial_mark == pytest.approx((50 - done + c.plan.passes[2].dial_divisions)
                                               % 100)


def test_dials_read_at_a_pickup_follow_the_method():
    # common practice, no source: the feeding dial first, then the other slide in use
    assert [n for n, _ in prepared("modified").cut().pickup_dials()] == ["compound",
                                                                         "cross-slide"]
    assert [n for n, _ in prepared("radial").cut().pickup_dials()] == ["cross-slide"]
    assert [n for n, _ in prepared("alternating").cut().pickup_dials()] == ["cross-slide",
                                                                            "compound"]


def test_wire_reading_replans_the_rest_to_the_aim():
    r = prepared()
    for _ in range(3):
        r.pass_cut()
    done = r.state.radial_cum_mm
    pd_now = 9.100                                   # above the 6g band
    r.add("wire_reading", measured_mm=10.4, pd_mm=pd_now, state="oversize")
    c = r.cut()
    assert c.replanned_from.startswith("wire reading: PD 9.1000 mm")
    # radial left = (PD now − aim)/2, aim = mid band # computed from ISO 965-2 d2 limits
    left = (pd_now - (PD_MAX + PD_MIN) / 2) / 2
    # the last pass is a whole compound division: within half a division × cos 29.5°
    assert abs(c.plan.set_total_radial - (done + left)) <= DIV / 2 * math.cos(
        math.radians(ANGLE)) + 1e-9
    assert c.passes_before == 3 and c.done_in_plan == 0


def test_a_tapered_blank_is_planned_at_the_gauge_plane():
    r12 = parse("R1/2")
    # the blank measured at the small end, 8.2/16 under the gauge diameter 20.955 (ISO 7-1
    # size 1/2, from memory; computed along the 1:16 taper), plans the same infeed as one
    # measured at the gauge plane
    at_end = prepared_setup(r12, LATHE, values(blank_od_mm=20.955 - 8.2 / 16))
    at_gauge = prepared_setup(r12, LATHE, values(blank_od_mm=20.955, blank_at_mm=8.2))
    assert at_end["blank_at_mm"] == 0.0 and at_gauge["blank_at_mm"] == 8.2
    from shopterm.cutting.cut_state import prepare
    d_end = prepare(r12, LATHE, at_end)[1]
    d_gauge = prepare(r12, LATHE, at_gauge)[1]
    assert d_end.total_radial == pytest.approx(d_gauge.total_radial)
    assert d_end.turned_diameter == pytest.approx(20.955)
    # a parallel thread records no blank_at_mm
    assert "blank_at_mm" not in prepared_setup(M10, LATHE, values())
    with pytest.raises(InvalidEntry, match="beyond the thread"):
        prepared_setup(r12, LATHE, values(blank_od_mm=20.5, blank_at_mm=40.0))
