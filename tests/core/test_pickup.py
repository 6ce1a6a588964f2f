"""Picking the thread up again: the new zeros carry the count on."""

from __future__ import annotations

from fractions import Fraction

import pytest
from hypothesis import given
from hypothesis import strategies as st

from shopterm.cutting.infeed import infeed_method
from shopterm.cutting.pickup import continued_reading, new_zero, pick_up, pickup_steps
from shopterm.cutting.plan import make_plan
from shopterm.errors import InvalidEntry
from shopterm.lathe.machine import Dial, Lathe, Leadscrew

DIAL = Dial("mm", 0.02, 100)
LATHE = Lathe("test", Leadscrew(Fraction(3)), DIAL, DIAL)


def test_new_zero_arithmetic():
    # arithmetic: reading now 37, 24 divisions done → the zero sits at mark 13
    z = new_zero(37, 24, DIAL)
    assert z.offset == 13
    assert z.reading_for(24) == 37 and z.reading_for(30) == 43
    # wraps round the dial: reading 10 with 24 done → zero at 86 (10 − 24 + 100)
    z = new_zero(10, 24, DIAL)
    assert z.offset == 86 and z.reading_for(24) == 10 and z.reading_for(20) == 6


@given(reading=st.floats(0, 99.5), done=st.floats(0, 450), more=st.floats(0, 99))
def test_new_zero_inverse(reading, done, more):
    z = new_zero(reading, done, DIAL)
    assert _same_mark(z.reading_for(done), reading)
    target = done + more
    assert _same_mark(z.count_for(z.reading_for(target)), target)


def _same_mark(a, b, divisions=100):
    """Return True when two counts land on the same dial mark (modulo one turn)."""
    d = (a - b) % divisions
    return min(d, divisions - d) < 1e-6


def test_pick_up_compound_feed():
    plan = make_plan(0.6, infeed_method("modified", 60), passes=5, lathe=LATHE)
    done = 3
    up = pick_up(plan, done, feed_reading=70, cross_reading=55)
    done_div = plan.passes[2].dial_divisions
    # computed: new zero = reading now − count done, modulo one turn (the pick-up rule)
    assert up.feed_zero.offset == pytest.approx((70 - done_div) % 100)
    assert up.cross_zero.offset == 55          # the cross-slide's return mark is where it is
    # the next pass is set done_div + its increment beyond the reading taken now
    turns, mark = continued_reading(plan, up, 4)
    inc = plan.passes[3].dial_divisions - done_div
    assert mark == pytest.approx((70 + inc) % 100)
    assert any("half nut" in s for s in up.steps) and any("both flanks" in s for s in up.steps)


def test_pick_up_radial_and_alternating():
    plan = make_plan(0.6, infeed_method("radial", 60), passes=5, lathe=LATHE)
    up = pick_up(plan, 2, feed_reading=5, cross_reading=5)
    assert up.cross_zero.reading_for(plan.passes[1].dial_divisions) == 5
    alt = make_plan(1.0, infeed_method("alternating", 60), passes=6, lathe=LATHE)
    with pytest.raises(InvalidEntry, match="compound"):
        pick_up(alt, 2, 10, 10)
    up = pick_up(alt, 2, 10, 10, side_reading=40)
    assert up.side_zero.reading_for(alt.passes[1].side_divisions) == 40


@pytest.mark.parametrize("reading, done", [(100, 3), (-1, 3), (5, -2)])
def test_new_zero_errors(reading, done):
    with pytest.raises(InvalidEntry):
        new_zero(reading, done, DIAL)


def test_pick_up_errors():
    plan = make_plan(0.6, infeed_method("radial", 60), passes=5, lathe=LATHE)
    with pytest.raises(InvalidEntry):
        pick_up(plan, 9, 0, 0)
    with pytest.raises(InvalidEntry):
        continued_reading(plan, pick_up(plan, 1, 0, 0), 0)


def test_internal_steps():
    steps = pickup_steps(infeed_method("modified", 60), internal=True)
    assert any("bore" in s for s in steps)
    assert steps[0].startswith("Stop the spindle")
