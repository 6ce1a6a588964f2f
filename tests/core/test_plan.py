"""Pass plans: the published constant chip-area plan, carried rounding, replan, pass view."""

from __future__ import annotations

import math
from fractions import Fraction

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from shopterm.cutting.infeed import infeed_method
from shopterm.cutting.plan import (bore_to_prepare, constant_area_depths, equal_depths,
                                   make_plan, pass_view, passes_for_first, replan)
from shopterm.errors import InvalidEntry
from shopterm.lathe.machine import Dial, Lathe, Leadscrew

FINE = Dial("mm", 0.0001, 1000)


def lathe(cross=Dial("mm", 0.02, 100), compound=Dial("mm", 0.02, 100)):
    return Lathe("test", Leadscrew(Fraction(3)), cross, compound)


def test_published_constant_area_plan():
    # threading-tool handbooks (constant chip area), computed: ap 0.6 mm, 5 passes → 0.164, 0.300, 0.424, 0.520, 0.600
    cums = constant_area_depths(0.6, 5)
    assert [round(c, 3) for c in cums] == [0.164, 0.300, 0.424, 0.520, 0.600]
    # re-derived: Δap_x = ap/√(nap−1)·√φ, φ = 0.3, 1, x−1 (threading-tool handbooks)
    for x, c in enumerate(cums, 1):
        phi = 0.3 if x == 1 else 1 if x == 2 else x - 1
        assert c == pytest.approx(0.6 / math.sqrt(4) * math.sqrt(phi))


def test_published_plan_through_make_plan():
    plan = make_plan(0.6, infeed_method("radial", 60), passes=5, feed_dial=FINE, spring=2)
    assert [round(p.radial_cum, 3) for p in plan.passes] == [0.164, 0.300, 0.424, 0.520, 0.600]
    assert len(plan.spring_passes) == 2
    assert all(s.radial_inc == 0 and s.radial_cum == plan.passes[-1].radial_cum
               for s in plan.spring_passes)


def test_equal_plan():
    assert equal_depths(0.6, 4) == pytest.approx((0.15, 0.3, 0.45, 0.6))  # arithmetic


@pytest.mark.parametrize("total, first, kind, n", [
    (0.6, 0.165, "constant-area", 5),  # inverse of the published 5-pass plan (threading-tool handbooks: 0.164)
    (0.6, 0.164, "constant-area", 6),  # 0.164 is rounded down from 0.16432: one more pass
    (0.6, 0.15, "equal", 4),           # arithmetic
    (0.1, 0.2, "constant-area", 1),
])
def test_passes_for_first(total, first, kind, n):
    assert passes_for_first(total, first, kind) == n
    got = (constant_area_depths if kind == "constant-area" else equal_depths)(total, n)[0]
    assert got <= first + 1e-9


@settings(max_examples=60, deadline=None)
@given(total=st.floats(0.2, 3.0), n=st.integers(2, 15), div=st.sampled_from([0.01, 0.02, 0.0254]),
       step=st.sampled_from([1.0, 0.5]), diameter=st.booleans(),
       method=st.sampled_from(["radial", "modified", "flank"]))
def test_carried_rounding(total, n, div, step, diameter, method):
    dial = Dial("mm", div, 100, reads_diameter=diameter)
    m = infeed_method(method, 60)
    plan = make_plan(total, m, passes=n, lathe=lathe(dial, dial), dial_step=step, min_pass=0)
    tpd = dial.travel_per_division
    incs = sum(p.dial_inc for p in plan.passes)
    assert incs == pytest.approx(plan.passes[-1].dial_divisions, abs=1e-9)
    assert sum(p.radial_inc for p in plan.passes) == pytest.approx(plan.passes[-1].radial_cum)
    for p in plan.passes:
        # never more than half a step off on the feeding slide, at every pass
        exact_div = m.feed_travel(p.exact_radial_cum) / tpd
        assert abs(p.dial_divisions - exact_div) <= step / 2 + 1e-9
        assert abs(p.rounding_error) <= step * tpd / 2 / m.factor + 1e-12


def test_compound_columns():
    m = infeed_method("modified", 60)
    plan = make_plan(0.6, m, passes=5, feed_dial=FINE)
    for p in plan.passes:
        assert p.compound_cum == pytest.approx(p.radial_cum * 1.14896, abs=1e-4)  # computed factor, 1/cos 29.5°
    assert plan.compound_total == pytest.approx(0.6 * 1.14896, abs=1e-4)


def test_minimum_pass_and_finish():
    plan = make_plan(0.3, infeed_method("radial", 60), passes=20, min_pass=0.02, feed_dial=FINE)
    incs = [p.radial_inc for p in plan.passes]
    assert min(incs) >= 0.02 - 1e-4 and len(plan.passes) < 20
    assert any("minimum pass" in n for n in plan.notes)
    fin = make_plan(0.6, infeed_method("radial", 60), passes=6, finish=0.03, feed_dial=FINE)
    assert fin.passes[-1].kind == "finish"
    assert fin.passes[-1].radial_inc == pytest.approx(0.03, abs=1e-4)
    assert fin.passes[-2].radial_cum == pytest.approx(0.57, abs=1e-4)


def test_alternating_sides_alternate():
    plan = make_plan(1.0, infeed_method("alternating", 60), passes=6, feed_dial=FINE,
                     lathe=lathe(FINE, FINE))
    sides = [p.side for p in plan.passes]
    assert sides == ["right", "left"] * 3
    # side shift re-derived: Σ ±Δ tan 29.5°
    t = math.tan(math.radians(29.5))
    s, prev = 0.0, 0.0
    for i, p in enumerate(plan.passes):
        s += (1 if i % 2 == 0 else -1) * (p.exact_radial_cum - prev) * t
        prev = p.exact_radial_cum
        assert p.compound_cum == pytest.approx(s, abs=1e-4)


@pytest.mark.parametrize("kwargs, msg", [
    (dict(total_radial=0), "greater than zero"),
    (dict(total_radial=0.5, kind="zigzag"), "not a pass plan"),
    (dict(total_radial=0.5, passes=0), "whole number"),
    (dict(total_radial=0.5, finish=0.6), "finishing pass"),
    (dict(total_radial=0.5, finish=0.01), "under the minimum"),
    (dict(total_radial=0.5, dial_step=0), "rounding step"),
    (dict(total_radial=0.5, passes=1, finish=0.03), "at least 2"),
])
def test_plan_errors(kwargs, msg):
    with pytest.raises(InvalidEntry, match=msg):
        make_plan(method=infeed_method("radial", 60), **kwargs)


def test_replan_from_measured_pd():
    m = infeed_method("modified", 60)
    plan = make_plan(0.9, m, passes=8, feed_dial=FINE)
    done = plan.passes[4].radial_cum
    # measured 8.990 for an aim of 8.928: (8.990 − 8.928)/2 = 0.031 mm left on radius
    new = replan(plan, 8.990, 8.928, done)
    assert new.start_radial == pytest.approx(done)
    assert new.passes[-1].radial_cum - done == pytest.approx(0.031, abs=1e-4)
    assert new.passes[0].radial_inc > 0
    # internal: PD rises as the cut deepens
    inner = make_plan(0.7, m, passes=6, feed_dial=FINE, internal=True)
    new = replan(inner, 9.05, 9.116, inner.passes[3].radial_cum)
    assert new.passes[-1].radial_cum - inner.passes[3].radial_cum == pytest.approx(0.033, abs=1e-4)


def test_pass_view_after_a_replan_counts_on_and_shows_the_whole_depth():
    m = infeed_method("modified", 60)
    plan = make_plan(0.9, m, passes=8, feed_dial=FINE)
    done = plan.passes[6].radial_cum                  # 7 passes cut under the first plan
    new = replan(plan, 8.990, 8.928, done)            # (8.990 − 8.928)/2 = 0.031 mm left
    v = pass_view(new, 0, passes_before=7)
    assert f"pass 8 of {7 + len(new.passes)}" in v.next_step
    assert "Read the cautions" not in v.next_step      # they were read before pass 1
    # progress is the depth done over the whole depth, not over the replanned part alone
    assert v.progress == pytest.approx(done / new.set_total_radial)
    assert v.depth_done == pytest.approx(done)


def test_replan_at_or_past_aim():
    plan = make_plan(0.9, infeed_method("radial", 60), passes=8, feed_dial=FINE)
    done = plan.passes[-1].radial_cum
    new = replan(plan, 8.90, 8.928, done, pd_min=8.862, pd_max=8.994)
    assert new.passes == () and new.spring_passes
    new = replan(plan, 8.80, 8.928, done, pd_min=8.862, pd_max=8.994)
    assert any("undersize" in c for c in new.cautions)
    with pytest.raises(InvalidEntry):
        replan(plan, -1, 8.928, done)


def test_pass_view():
    plan = make_plan(0.6, infeed_method("modified", 60), passes=5, lathe=lathe(), spring=1)
    first = pass_view(plan, 0)
    assert (first.n, first.of, first.kind) == (1, 5, "infeed")
    assert first.cautions and "Read the cautions" in first.next_step
    assert first.dial_divisions == plan.passes[0].dial_divisions
    # compound feeding: the cross-slide goes back to its zero mark every pass
    assert (first.return_turns, first.return_mark) == (0, 0.0) and first.feeds_with == "compound"
    mid = pass_view(plan, 2)
    assert mid.n == 3 and mid.depth_done == pytest.approx(plan.passes[1].radial_cum)
    assert mid.depth_left == pytest.approx(plan.set_total_radial - plan.passes[1].radial_cum)
    assert 0 < mid.progress < 1 and not mid.cautions
    spring = pass_view(plan, 5)
    assert spring.kind == "spring" and spring.n == 1
    done = pass_view(plan, 6)
    assert done.kind == "done" and done.progress == 1.0 and done.depth_left == 0
    # the dial reading wraps into turns: 150 divisions on a 100-division dial = 1 turn + 50
    big = make_plan(3.0, infeed_method("radial", 60), passes=1, lathe=lathe())
    v = pass_view(big, 0)
    assert (v.dial_turns, v.dial_mark) == (1, 50.0) and v.dial_text == "1 turn + 50"
    with pytest.raises(InvalidEntry):
        pass_view(plan, -1)


def test_bore_to_prepare():
    from shopterm.standards import limits, parse
    lim = limits(parse("M10x1.5-6H"))
    b = bore_to_prepare(lim)
    assert (b.minor_min, b.minor_max) == (8.376, 8.676)  # ISO 68-1 and ISO 965-1/-2, D1 6H [P]
    assert b.suggested == pytest.approx(8.526)
    with pytest.raises(InvalidEntry):
        bore_to_prepare(limits(parse("M10x1.5-6g")))
    inner = make_plan(0.7, infeed_method("modified", 60), passes=6, internal=True)
    assert any("boring bar" in c for c in inner.cautions)


@settings(max_examples=100, deadline=None)
@given(total=st.floats(0.05, 3.0), start_frac=st.sampled_from([0.0, 0.0, 0.3, 0.7]),
       min_pass=st.floats(0.005, 0.1), max_first=st.floats(0.1, 0.4),
       kind=st.sampled_from(["constant-area", "equal"]))
def test_pass_count_is_the_most_that_keeps_every_pass_over_the_minimum(
        total, start_frac, min_pass, max_first, kind):
    # reference: drop one pass at a time until the smallest pass is at least the minimum
    # (the rule the docstring states; computed here independently of make_plan)
    start = total * start_frac
    method = infeed_method("radial", 60)
    plan = make_plan(total, method, kind=kind, min_pass=min_pass, max_first=max_first,
                     start_radial=start, feed_dial=FINE, spring=0)
    main = total - start
    n = (passes_for_first(main, max_first, kind) if start <= 0 else
         max(1, math.ceil(main / max_first - 1e-9)))
    while n > 1:
        if start <= 0:
            cums = (constant_area_depths if kind == "constant-area" else equal_depths)(main, n)
        elif kind == "equal":
            cums = tuple(start + main * i / n for i in range(1, n + 1))
        else:
            cums = tuple(math.sqrt(start ** 2 + (total ** 2 - start ** 2) * i / n)
                         for i in range(1, n + 1))
        if min(b - a for a, b in zip((start,) + cums, cums)) >= min_pass - 1e-12:
            break
        n -= 1
    assert len(plan.passes) == n
