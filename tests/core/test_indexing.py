"""Multi-start indexing: each method's numbers, re-derived here from the pitch and the kit."""

from __future__ import annotations

from fractions import Fraction

import pytest

from shopterm.errors import InvalidEntry
from shopterm.lathe.gears import find_trains
from shopterm.lathe.indexing import indexing_for_lathe, indexing_methods
from shopterm.lathe.machine import Dial, Lathe, Leadscrew, ThreadDial

INCH = Fraction(254, 10)  # ISO 31-1: 1 in = 25.4 mm exactly


def by_key(plan):
    return {m.key: m for m in plan.methods}


@pytest.mark.parametrize("lead, starts, dial, divisions, whole", [
    # computed: divisions = (lead / starts) / travel per division
    (Fraction(3), 2, Dial("mm", 0.02, 100), 75, True),            # 1.5 / 0.02
    (INCH, 2, Dial("in", 0.001, 100), 500, True),                  # 0.5 in / 0.001 in
    (Fraction(9, 2), 3, Dial("in", 0.001, 100), 1.5 / 0.0254, False),
    (Fraction(4), 2, Dial("mm", 0.04, 50, reads_diameter=True), 100, True),  # 0.02 mm/div moved
])
def test_compound_one_pitch_in_divisions(lead, starts, dial, divisions, whole):
    m = by_key(indexing_methods(lead, starts, compound_dial=dial,
                                compound_parallel_reading_deg=90))["compound"]
    assert m.works and m.amount == pytest.approx(divisions, rel=1e-12) and m.whole == whole
    assert ("not whole" in m.text) == (not whole)
    assert len(m.text) <= 76


@pytest.mark.parametrize("starts, works3, works4", [(2, False, True), (3, True, False),
                                                    (4, False, True), (6, False, False)])
def test_chuck_jaws(starts, works3, works4):
    # issue 6: 4 starts from a four-jaw chuck, 3 from a three-jaw (jaws divisible by starts)
    m = by_key(indexing_methods(Fraction(6), starts))
    assert m["chuck3"].works == works3 and m["chuck4"].works == works4
    if works4:
        assert m["chuck4"].amount == 4 // starts


@pytest.mark.parametrize("slots, starts, step", [(8, 2, 4), (6, 3, 2), (12, 4, 3), (6, 4, None)])
def test_driving_plate_slots(slots, starts, step):
    m = by_key(indexing_methods(Fraction(6), starts, faceplate_slots=slots))["plate"]
    assert m.works == (step is not None)
    assert m.amount == step


def test_spindle_and_stud_gear():
    m = by_key(indexing_methods(Fraction(6), 3, spindle_gear=60, stud_gear=45))
    assert m["spindle_gear"].works and m["spindle_gear"].amount == 20
    assert m["stud_gear"].works and m["stud_gear"].amount == 15
    assert "1:1" in m["stud_gear"].title
    # a stud at 1:2 does not turn with the spindle: not usable
    half = by_key(indexing_methods(Fraction(6), 3, stud_gear=45, fixed_ratio=Fraction(1, 2)))
    assert not half["stud_gear"].works
    odd = by_key(indexing_methods(Fraction(6), 2, spindle_gear=45))
    assert not odd["spindle_gear"].works


def test_dial_lines_for_two_starts():
    # 1 in lead, 2 starts on an 8 tpi leadscrew, 32-tooth dial, 8 lines 0.5 in apart:
    # each line is half a lead on, so odd lines give start 1 and even lines start 2 (computed)
    plan = indexing_methods(INCH, 2, leadscrew=Leadscrew.from_tpi(8),
                            thread_dial=ThreadDial(32, 8, (1, 3, 5, 7)))
    m = by_key(plan)["dial"]
    assert m.works and "start 1: 1,3,5,7; start 2: 2,4,6,8" in m.detail
    metric = by_key(indexing_methods(6, 2, leadscrew=Leadscrew.from_tpi(8),
                                     thread_dial=ThreadDial(32, 8, ())))["dial"]
    assert not metric.works and "half nut must stay closed" in metric.text


def test_plan_lists_working_methods_and_pitch():
    plan = indexing_methods(Fraction(3), 2, compound_dial=Dial("mm", 0.02, 100))
    assert plan.pitch_mm == 1.5 and plan.lead_mm == 3.0
    assert all(m.works for m in plan.working)
    assert {m.key for m in plan.working} == {"compound", "chuck4"}


def test_for_lathe_uses_its_kit_and_train():
    lathe = Lathe("demo", Leadscrew.from_tpi(8), Dial("in", 0.001, 200, True),
                  Dial("in", 0.001, 100), compound_zero="bed",
                  gears=tuple((t, 1) for t in (20, 30, 40, 60, 120, 127)),
                  thread_dial=ThreadDial(32, 8, (1, 3, 5, 7)), spindle_gear=40,
                  faceplate_slots=4)
    train = find_trains(lathe.leadscrew, 3.0, lathe.gears)[0]     # 120 > idler > 127
    plan = indexing_for_lathe(lathe, 6.0, 2, train=train)
    m = by_key(plan)
    assert m["stud_gear"].amount == 60 and m["spindle_gear"].amount == 20
    assert m["plate"].amount == 2
    # compound zero parallel to the bed: the scale reads 0 when parallel to the bed
    assert "reads 0 deg" in m["compound"].detail


@pytest.mark.parametrize("starts", [1, 0, -2, 2.5])
def test_bad_starts(starts):
    with pytest.raises(InvalidEntry):
        indexing_methods(Fraction(3), starts)


def test_bad_lead():
    with pytest.raises(InvalidEntry):
        indexing_methods(0, 2)
