"""Pass plans: how the total infeed is split into passes, in radial, compound and dial terms.

- constant chip-area plan as published: cumulative radial infeed after pass x is
  ap/√(nap − 1)·√φ with φ = 0.3 for pass 1, 1 for pass 2, x − 1 from pass 3 on;
- equal-depth plan: ap/nap each pass;
- a last (finishing) pass of a chosen depth, and spring passes (no feed) listed apart;
- a minimum pass no plan goes below (the pass count is reduced until it holds).

Every pass is set on the dial as a count from the zero, rounded to a settable step of
divisions. The *cumulative* count is rounded, and the increments are the differences, so the
rounding error is carried and never builds up (it stays within half a step).

After a wire reading the rest of the plan is recomputed from the measured pitch diameter
(``replan``), not from the dial count: radial left = (PD now − PD aim)/2 external, (PD aim − PD
now)/2 internal. A replanned constant-area plan keeps the chip area constant from the depth
reached (for a V groove the area goes as depth², so cum_i = √(d0² + (d1² − d0²)·i/k)).

References: threading-tool handbooks (constant chip-area infeed;
ap 0.6 mm, 5 passes → 0.164, 0.300, 0.424, 0.520, 0.600; a last pass of 0.025–0.05 mm and
spring passes are usual).
"""

from __future__ import annotations

import math
from dataclasses import dataclass, replace

from shopterm.cutting.infeed import InfeedMethod
from shopterm.errors import InvalidEntry
from shopterm.lathe.machine import Dial
from shopterm.standards.spec import Limits
from shopterm.units import decimals_for, round_to

PLAN_KINDS: tuple[str, ...] = ("constant-area", "equal")
#: Largest first pass when the pass count is derived [mm radial]. Our default for a light
#: lathe (common practice, no source); the user sets it.
DEFAULT_MAX_FIRST = 0.2
#: No infeed pass below this [mm radial] (common practice, no source).
DEFAULT_MIN_PASS = 0.02
#: No plan sized from the largest pass has more passes than this (a guard, our own).
MAX_PASSES = 400
#: The dial assumed when no lathe is configured: 0.02 mm per division on radius, 100 divisions.
DEFAULT_DIAL = Dial("mm", 0.02, 100, reads_diameter=False)

SETUP_CAUTIONS: tuple[str, ...] = (
    "Guards in place; eye protection on; no gloves, loose sleeves, rings or long hair near the "
    "turning work.",
    "Chuck key out of the chuck before the spindle starts.",
    "Set the slowest speed you can stop at the end of the thread; stop and withdraw in time.",
    "Keep the half nut closed unless the thread dial says you may re-engage (metric on an inch "
    "leadscrew, or the reverse: never open it, reverse the spindle to run back).",
    "Withdraw the tool before the carriage runs back.",
    "Follow your local rules and the lathe maker's instructions.",
)

BORING_CAUTIONS: tuple[str, ...] = (
    "Use the shortest, stiffest boring bar that reaches; check the bar clears the bore under the "
    "tip and its heel does not rub the crests.",
    "The infeed goes outward: the cross-slide turns the other way, and you withdraw toward the "
    "bore's centre.",
    "Mark where each pass must stop short of the bore bottom or the chuck; in a blind bore cut a "
    "relief groove first so the tool has room to stop.",
    "Chatter means a bar too long or a pass too heavy: shorten the bar, take lighter passes, "
    "slow the spindle.",
)


def constant_area_depths(total: float, passes: int) -> tuple[float, ...]:
    """Return the cumulative radial infeed after each pass [mm], constant chip area.

    total: ap, the total radial depth [mm]; passes: nap ≥ 1.
    Δap_x = ap/√(nap − 1)·√φ, φ = 0.3 (x = 1), 1 (x = 2), x − 1 (x ≥ 3).
    References: threading-tool handbooks.
    """
    _check_depth_and_passes(total, passes)
    if passes == 1:
        return (float(total),)
    out = []
    for x in range(1, passes + 1):
        phi = 0.3 if x == 1 else 1.0 if x == 2 else x - 1.0
        out.append(total / math.sqrt(passes - 1) * math.sqrt(phi))
    out[-1] = float(total)
    return tuple(out)


def equal_depths(total: float, passes: int) -> tuple[float, ...]:
    """Return the cumulative radial infeed after each pass [mm], equal depths.

    total [mm]; passes ≥ 1. References: arithmetic.
    """
    _check_depth_and_passes(total, passes)
    out = [total * x / passes for x in range(1, passes + 1)]
    out[-1] = float(total)
    return tuple(out)


def groove_area(depth: float, flat: float, tan_half: float) -> float:
    """Return the cross-section [mm²] a flat-nosed tool has cut at radial ``depth`` [mm].

    flat [mm]: the tool's tip width; tan_half: tangent of half the form angle (0 square).
    A = flat·h + tan(a)·h² (the flat's strip and the two flank triangles).
    References: plane geometry.
    """
    return flat * depth + tan_half * depth * depth


def _depth_for_area(area: float, flat: float, tan_half: float) -> float:
    """Return the radial depth [mm] at which ``groove_area`` reaches ``area`` (its inverse)."""
    if tan_half <= 0:
        return area / flat
    return 2 * area / (flat + math.sqrt(flat * flat + 4 * tan_half * area))


def groove_area_depths(total: float, passes: int, flat: float, tan_half: float,
                       start: float = 0.0) -> tuple[float, ...]:
    """Return cumulative radial depths [mm] that keep the chip area of a flat-bottomed groove
    as the published constant chip-area plan does.

    total [mm]; passes ≥ 1; flat [mm] > 0: the tool's tip width; tan_half: tan(half the form
    angle); start [mm]: depth already cut. From the surface the area after pass x is
    A(ap)·φ_x/(nap − 1) with the published φ (0.3, 1, 2, … nap − 1); continuing from a depth
    already cut, equal areas. With no flat this is the published depth law (area ∝ depth²);
    with a wide flat the area is nearly ∝ depth and the passes nearly equal.
    References: threading-tool handbooks (constant chip-area infeed), generalised to the true
    groove area (computed, ``groove_area``).
    """
    _check_depth_and_passes(total, passes)
    if not (flat > 0) or tan_half < 0:
        raise InvalidEntry("A flat-bottomed groove needs a tip flat greater than zero.")
    a_end = groove_area(total, flat, tan_half)
    if start > 0:
        a0 = groove_area(start, flat, tan_half)
        fractions = [a0 + (a_end - a0) * i / passes for i in range(1, passes + 1)]
    elif passes == 1:
        fractions = [a_end]
    else:
        fractions = [a_end * (0.3 if x == 1 else 1.0 if x == 2 else x - 1.0) / (passes - 1)
                     for x in range(1, passes + 1)]
    out = [_depth_for_area(a, flat, tan_half) for a in fractions]
    out[-1] = float(total)
    return tuple(out)


def _continued_depths(start: float, end: float, passes: int, kind: str,
                      flat: float = 0.0, tan_half: float = 0.0) -> tuple[float, ...]:
    """Return cumulative depths from ``start`` to ``end`` [mm] for the rest of a cut."""
    if flat > 0 and kind == "constant-area":
        return groove_area_depths(end, passes, flat, tan_half, start)
    if start <= 0:
        base = (constant_area_depths if kind == "constant-area" else equal_depths)(end, passes)
        return base
    if kind == "equal":
        return tuple(start + (end - start) * i / passes for i in range(1, passes + 1))
    return tuple(math.sqrt(start ** 2 + (end ** 2 - start ** 2) * i / passes)
                 for i in range(1, passes + 1))


def passes_for_first(total: float, max_first: float, kind: str = "constant-area") -> int:
    """Return the fewest passes whose first pass is no deeper than ``max_first``.

    total [mm]; max_first [mm]. Constant area: first = ap·√(0.3/(n − 1)) → n = ⌈0.3(ap/max)²⌉ + 1;
    equal: n = ⌈ap/max⌉.
    References: threading-tool handbooks (inverted).
    """
    if not (max_first > 0):
        raise InvalidEntry("The largest first pass must be greater than zero.")
    if total <= max_first:
        return 1
    if kind == "equal":
        return math.ceil(total / max_first - 1e-9)
    _check_kind(kind)
    return math.ceil(0.3 * (total / max_first) ** 2 - 1e-9) + 1


def _check_depth_and_passes(total: float, passes: int) -> None:
    if not (total > 0) or not math.isfinite(total):
        raise InvalidEntry("The total infeed must be greater than zero.")
    if not isinstance(passes, int) or passes < 1:
        raise InvalidEntry("The number of passes must be a whole number, 1 or more.")


def _check_kind(kind: str) -> None:
    if kind not in PLAN_KINDS:
        raise InvalidEntry(f"{kind!r} is not a pass plan: use {' or '.join(PLAN_KINDS)}.")


@dataclass(frozen=True)
class PlannedPass:
    """One pass as set on the lathe. Lengths [mm]; dial counts in divisions from the zero."""

    n: int
    kind: str                 # 'infeed', 'finish' or 'spring'
    radial_cum: float         # radial depth after this pass, as the rounded dial sets it
    radial_inc: float
    exact_radial_cum: float   # what the plan asked for before rounding
    compound_cum: float       # compound travel from its zero (alternating: side shift, signed)
    compound_inc: float
    dial_divisions: float     # feeding slide's count from its zero, rounded to the step
    dial_inc: float
    side: str | None = None   # alternating: 'left' or 'right' of the compound's zero
    side_divisions: float | None = None  # alternating: the compound's count from its zero

    @property
    def rounding_error(self) -> float:
        """Return radial_cum − exact_radial_cum [mm] (carried to the next pass, not added)."""
        return self.radial_cum - self.exact_radial_cum


@dataclass(frozen=True)
class Plan:
    """A pass plan for one thread on one lathe."""

    total_radial: float           # [mm] the radial depth the plan ends at (from the zero)
    start_radial: float           # [mm] where this plan starts (0, or the depth cut before)
    method: InfeedMethod
    kind: str
    internal: bool
    feed_dial: Dial
    cross_dial: Dial
    side_dial: Dial | None
    dial_step: float              # rounding step [divisions]
    min_pass: float
    max_first: float
    finish: float
    passes: tuple[PlannedPass, ...]
    spring_passes: tuple[PlannedPass, ...]
    notes: tuple[str, ...] = ()
    cautions: tuple[str, ...] = ()
    first_side: int = 1           # alternating: +1 pass 1 shifts right, −1 left
    flat_bottom: float = 0.0      # [mm] a power thread's flat-nosed tool: the plan's chip area

    @property
    def count(self) -> int:
        """Return how many infeed passes (finishing pass included, spring passes not)."""
        return len(self.passes)

    @property
    def set_total_radial(self) -> float:
        """Return the radial depth the last pass sets on the dial, after rounding [mm]."""
        return self.passes[-1].radial_cum if self.passes else self.start_radial

    @property
    def compound_total(self) -> float:
        """Return the compound travel at the last pass [mm] (0 when the compound does not feed;
        alternating: the last side shift)."""
        return self.passes[-1].compound_cum if self.passes else 0.0


def _round_div(value: float, step: float) -> float:
    r = round_to(value, step)
    return float(round(r, 9))


def make_plan(total_radial: float, method: InfeedMethod, *, lathe=None,
              kind: str = "constant-area", passes: int | None = None,
              max_first: float = DEFAULT_MAX_FIRST, min_pass: float = DEFAULT_MIN_PASS,
              finish: float = 0.0, spring: int = 1, dial_step: float = 1.0,
              internal: bool = False, start_radial: float = 0.0, start_side: float = 0.0,
              first_side: int = 1, feed_dial: Dial | None = None,
              notes: tuple[str, ...] = (), flat_bottom: float = 0.0) -> Plan:
    """Return the pass plan that takes the radial infeed from ``start_radial`` to ``total_radial``.

    total_radial [mm]; method: from ``infeed_method``; lathe: its dials (None: DEFAULT_DIAL);
    kind: constant-area | equal; passes: infeed passes including the finishing pass (None:
    derived from ``max_first`` [mm]); min_pass [mm]: no infeed pass below it; finish [mm]: a
    last pass of this depth (0: none); spring: spring passes after the last; dial_step: rounding
    step [divisions]; start_radial [mm], start_side [mm], first_side: where a replanned cut
    starts; feed_dial: overrides the feeding slide's dial; flat_bottom [mm]: for a power
    thread cut with a flat-nosed tool, the tip's width: a constant-area plan then keeps the
    groove's true chip area (``groove_area_depths``) and, the pass count not given, takes the
    fewest passes whose largest radial step is at most ``max_first``.
    References: threading-tool handbooks (constant chip-area infeed).
    """
    _check_kind(kind)
    notes_out = list(notes)
    if not (math.isfinite(total_radial) and total_radial > 0):
        raise InvalidEntry("The total infeed must be greater than zero.")
    if not (min_pass >= 0) or not (finish >= 0) or not math.isfinite(finish):
        raise InvalidEntry("The minimum pass and the finishing pass cannot be negative.")
    if not isinstance(spring, int) or spring < 0:
        raise InvalidEntry("The spring passes must be a whole number, 0 or more.")
    if not (dial_step > 0) or not math.isfinite(dial_step):
        raise InvalidEntry("The dial rounding step must be greater than zero (1 = whole "
                           "divisions, 0.5 = half divisions).")
    depth = total_radial - start_radial
    if depth <= 0:
        raise InvalidEntry("Nothing is left to cut: the depth already reached is at or beyond "
                           "the total infeed.")
    if finish > 0 and finish >= depth:
        raise InvalidEntry(f"The finishing pass ({finish:.3f} mm) must be less than the depth "
                           f"to cut ({depth:.3f} mm): make it smaller or set it to 0.")
    if 0 < finish < min_pass:
        raise InvalidEntry(f"The finishing pass ({finish:.3f} mm) is under the minimum pass "
                           f"({min_pass:.3f} mm): make it at least that, or set it to 0.")
    main = depth - finish
    if not (flat_bottom >= 0) or not math.isfinite(flat_bottom):
        raise InvalidEntry("The tool's tip flat cannot be negative.")
    tan_half = math.tan(math.radians(method.form_angle_deg / 2))
    flat = flat_bottom if kind == "constant-area" else 0.0

    def depths(n: int) -> tuple[float, ...]:
        return _continued_depths(start_radial, start_radial + main, n, kind, flat, tan_half)

    def largest_step(n: int) -> float:
        cums = depths(n)
        return max(b - a for a, b in zip((start_radial,) + cums, cums))

    if passes is None and flat > 0:
        n_main = max(1, math.ceil(main / max_first - 1e-9))
        while largest_step(n_main) > max_first + 1e-12 and n_main < MAX_PASSES:
            n_main += 1
    elif passes is None:
        n_main = passes_for_first(main, max_first, kind) if start_radial <= 0 else \
            max(1, math.ceil(main / max_first - 1e-9))
    else:
        if not isinstance(passes, int) or passes < 1:
            raise InvalidEntry("The number of passes must be a whole number, 1 or more.")
        n_main = passes - (1 if finish > 0 else 0)
        if n_main < 1:
            raise InvalidEntry("With a finishing pass the plan needs at least 2 passes.")
    asked = n_main

    def deep_enough(n: int) -> bool:
        cums = depths(n)
        return n == 1 or min(b - a for a, b in zip((start_radial,) + cums, cums)) \
            >= min_pass - 1e-12

    # The smallest pass shrinks as passes are added (every plan kind here), so the most
    # passes that keep every pass at or over the minimum is found by halving, not one by one.
    if not deep_enough(n_main):
        low, high = 1, n_main            # deep_enough(low) holds, deep_enough(high) does not
        while high - low > 1:
            mid = (low + high) // 2
            low, high = (mid, high) if deep_enough(mid) else (low, mid)
        n_main = low
    cums = depths(n_main)
    if n_main < asked:
        notes_out.append(f"{asked} passes would cut less than the minimum pass "
                         f"({min_pass:.3f} mm): planned {n_main}" +
                         (" plus the finishing pass." if finish > 0 else "."))
    if n_main == 1 and main < min_pass:
        notes_out.append(f"The whole depth ({main:.3f} mm) is under the minimum pass: one pass.")
    exact = list(cums) + ([total_radial] if finish > 0 else [])

    if lathe is None and feed_dial is None:
        notes_out.append("No lathe configured: dial counts are for "
                         f"{DEFAULT_DIAL.describe()}.")
    cross_dial = lathe.cross_dial if lathe is not None else DEFAULT_DIAL
    compound_dial = lathe.compound_dial if lathe is not None else DEFAULT_DIAL
    if feed_dial is None:
        feed_dial = compound_dial if method.feeds_with == "compound" else cross_dial
    side_dial = compound_dial if method.method == "alternating" else None
    tpd = feed_dial.travel_per_division

    def setting(radial: float) -> tuple[float, float]:
        div = _round_div(method.feed_travel(radial) / tpd, dial_step)
        return div, method.radial_for(div * tpd)

    prev_div, prev_radial = setting(start_radial)
    prev_comp = method.feed_travel(prev_radial) if method.feeds_with == "compound" else start_side
    prev_exact = start_radial
    side_exact = start_side
    out: list[PlannedPass] = []
    for i, cum in enumerate(exact):
        div, radial = setting(cum)
        side = side_div = None
        if method.method == "alternating":
            sign = first_side * (1 if i % 2 == 0 else -1)
            side_exact += sign * (cum - prev_exact) * method.side_shift_per_depth
            side_div = _round_div(side_exact / side_dial.travel_per_division, dial_step)
            comp = side_div * side_dial.travel_per_division
            side = "right" if sign > 0 else "left"
        elif method.feeds_with == "compound":
            comp = div * tpd
        else:
            comp = 0.0
        kind_i = "finish" if (finish > 0 and i == len(exact) - 1) else "infeed"
        out.append(PlannedPass(i + 1, kind_i, radial, radial - prev_radial, cum, comp,
                               comp - prev_comp, div, div - prev_div, side, side_div))
        if div - prev_div <= 0:
            notes_out.append(f"Pass {i + 1} moves less than the rounding step on the dial: "
                             "take it as a spring pass or use a finer step.")
        prev_div, prev_radial, prev_comp, prev_exact = div, radial, comp, cum
    last = out[-1]
    springs = tuple(PlannedPass(k + 1, "spring", last.radial_cum, 0.0, last.exact_radial_cum,
                                last.compound_cum, 0.0, last.dial_divisions, 0.0, last.side,
                                last.side_divisions) for k in range(spring))
    if method.method == "alternating":
        notes_out.append("Alternating: the compound column is the side shift of the compound "
                         "(parallel to the bed) from its zero, + toward the right.")
    cautions = SETUP_CAUTIONS + (BORING_CAUTIONS if internal else ())
    return Plan(float(total_radial), float(start_radial), method, kind, internal, feed_dial,
                cross_dial, side_dial, float(dial_step), float(min_pass), float(max_first),
                float(finish), tuple(out), springs, tuple(notes_out) + method.notes, cautions,
                first_side, float(flat_bottom))


def replan(plan: Plan, measured_pd: float, aim_pd: float, done_cum_radial: float, *,
           pd_min: float | None = None, pd_max: float | None = None) -> Plan:
    """Return the rest of the plan, recomputed from a measured pitch diameter.

    plan: the plan being cut; measured_pd [mm]: from the wires; aim_pd [mm]; done_cum_radial
    [mm]: the radial depth set on the dial for the last pass cut; pd_min, pd_max [mm]: the band,
    for the cautions. Radial left = (PD now − aim)/2 (external), (aim − PD now)/2 (internal).
    References: threading-tool handbooks; a PD changes by twice the radial infeed (both flanks).
    """
    for name, v in (("measured pitch diameter", measured_pd), ("aim pitch diameter", aim_pd)):
        if not (math.isfinite(v) and v > 0):
            raise InvalidEntry(f"The {name} must be a size greater than zero.")
    if not (math.isfinite(done_cum_radial) and done_cum_radial >= 0):
        raise InvalidEntry("The depth already cut cannot be negative.")
    left = (aim_pd - measured_pd) / 2 if plan.internal else (measured_pd - aim_pd) / 2
    notes: list[str] = [f"Replanned from a measured pitch diameter of {measured_pd:.4f} mm: "
                        f"{max(left, 0):.4f} mm left on radius."]
    cautions: list[str] = []
    if pd_min is not None and pd_max is not None:
        over = measured_pd < pd_min if not plan.internal else measured_pd > pd_max
        if over:
            cautions.append("The thread is already past its limit "
                            f"({'undersize' if not plan.internal else 'oversize'}): do not feed "
                            "deeper; check the reading and the wires before anything else.")
    half_div = plan.feed_dial.travel_per_division * plan.dial_step / 2 / plan.method.factor
    done = [p for p in plan.passes if p.radial_cum <= done_cum_radial + 1e-9]
    last_side = done[-1].compound_cum if (done and plan.method.method == "alternating") else 0.0
    first_side = plan.first_side
    if done and plan.method.method == "alternating":
        first_side = -1 if done[-1].side == "right" else 1
    if left <= half_div:
        notes.append("At the aim already (within half a division): no more infeed; take a "
                     "spring pass and measure again.")
        springs = tuple(replace(s, radial_cum=done_cum_radial, exact_radial_cum=done_cum_radial)
                        for s in plan.spring_passes) or (
            PlannedPass(1, "spring", done_cum_radial, 0.0, done_cum_radial, 0.0, 0.0,
                        _round_div(plan.method.feed_travel(done_cum_radial)
                                   / plan.feed_dial.travel_per_division, plan.dial_step), 0.0),)
        return replace(plan, total_radial=done_cum_radial, start_radial=done_cum_radial,
                       passes=(), spring_passes=springs, notes=tuple(notes),
                       cautions=tuple(cautions) + plan.cautions)
    remaining = max(1, len([p for p in plan.passes if p.radial_cum > done_cum_radial + 1e-9]))
    finish = plan.finish if left > plan.finish + plan.min_pass and remaining > 1 else 0.0
    new = make_plan(done_cum_radial + left, plan.method, kind=plan.kind, passes=remaining,
                    max_first=plan.max_first, min_pass=plan.min_pass, finish=finish,
                    spring=len(plan.spring_passes), dial_step=plan.dial_step,
                    internal=plan.internal, start_radial=done_cum_radial, start_side=last_side,
                    first_side=first_side, feed_dial=plan.feed_dial, notes=tuple(notes),
                    lathe=_DialsOnly(plan.cross_dial, plan.side_dial or plan.feed_dial),
                    flat_bottom=plan.flat_bottom)
    return replace(new, cautions=tuple(cautions) + new.cautions)


@dataclass(frozen=True)
class _DialsOnly:
    """The two dials a plan needs, standing in for a Lathe when replanning."""

    cross_dial: Dial
    compound_dial: Dial


# ---------------------------------------------------------------------------------------------
# What the pass-counter screen shows


@dataclass(frozen=True)
class PassView:
    """Everything the pass counter shows for the next pass (lengths [mm])."""

    n: int                     # this pass's number (spring passes count on from 1 again)
    of: int                    # infeed passes in the plan
    kind: str                  # 'infeed', 'finish', 'spring' or 'done'
    feeds_with: str            # 'compound' or 'cross-slide'
    dial_divisions: float      # count from the zero for this pass
    dial_turns: int            # whole turns of the dial from its zero mark
    dial_mark: float           # the mark to set (0 … divisions)
    dial_text: str
    side_text: str | None      # alternating: where to set the compound
    return_turns: int          # the cross-slide's return mark
    return_mark: float
    return_text: str
    depth_done: float
    depth_left: float
    depth_total: float
    progress: float            # 0 … 1
    next_step: str
    cautions: tuple[str, ...]
    side: str | None = None    # alternating: the way the compound moves for this pass
    side_mark: float | None = None  # alternating: the compound's mark to set
    side_shift: float = 0.0    # alternating: the compound's offset from its zero [mm], + right


def dial_reading(count: float, dial: Dial, zero: float = 0.0) -> tuple[int, float]:
    """Return (whole turns, mark) a dial shows for a count [divisions] from a zero mark.

    count, zero [divisions]. References: arithmetic (turns = ⌊(zero + count)/divisions⌋).
    """
    pos = zero + count
    turns = math.floor(pos / dial.divisions + 1e-12)
    mark = round(pos - turns * dial.divisions, 9)
    if mark >= dial.divisions:
        turns, mark = turns + 1, mark - dial.divisions
    return turns, mark


def _reading_text(turns: int, mark: float, step: float) -> str:
    m = f"{mark:.{decimals_for(step) if step < 1 else 0}f}"
    if turns == 0:
        return m
    return f"{turns} turn{'s' if abs(turns) != 1 else ''} + {m}"


def pass_view(plan: Plan, done: int, *, feed_zero: float = 0.0, cross_zero: float = 0.0,
              side_zero: float = 0.0, passes_before: int = 0) -> PassView:
    """Return what the pass counter shows after ``done`` passes have been confirmed.

    plan: the plan; done: passes confirmed (infeed, then spring); feed_zero, cross_zero,
    side_zero [divisions]: the dial marks that stand for count 0 (see ``pickup``);
    passes_before: passes cut under earlier plans (a replanned job counts on from them, and
    its progress is the whole depth, not just this plan's part of it).
    References: none (presentation of the plan).
    """
    total_n, spring_n = len(plan.passes), len(plan.spring_passes)
    if not isinstance(done, int) or done < 0:
        raise InvalidEntry("The passes done must be a whole number, 0 or more.")
    done = min(done, total_n + spring_n)
    before_first = done == 0 and passes_before == 0
    method = plan.method
    depth_total = plan.set_total_radial
    depth_done = plan.passes[done - 1].radial_cum if 0 < done <= total_n else (
        depth_total if done > total_n else plan.start_radial)
    progress = 1.0 if depth_total <= 0 else min(max(depth_done / depth_total, 0.0), 1.0)
    if done < total_n:
        p, kind, n = plan.passes[done], plan.passes[done].kind, done + 1
    elif done < total_n + spring_n:
        p, kind, n = plan.spring_passes[done - total_n], "spring", done - total_n + 1
    else:
        p, kind, n = (plan.passes[-1] if plan.passes else None), "done", total_n
    slide = method.feeds_with
    count = p.dial_divisions if p else 0.0
    turns, mark = dial_reading(count, plan.feed_dial, feed_zero)
    text = _reading_text(turns, mark, plan.dial_step)
    side_text = sm = None
    if method.method == "alternating" and p is not None and plan.side_dial is not None:
        _st, sm = dial_reading(p.side_divisions or 0.0, plan.side_dial, side_zero)
        side_text = f"shift the compound {p.side} to {_reading_text(0, sm, plan.dial_step)}"
    if slide == "compound":
        rt, rm = dial_reading(0.0, plan.cross_dial, cross_zero)
        return_text = f"cross-slide back to {_reading_text(rt, rm, plan.dial_step)} every pass"
    else:
        rt, rm = turns, mark
        return_text = f"cross-slide back in to {text} for this pass"
    if kind == "done":
        next_step = ("All passes cut: measure over the wires, then follow the replanned "
                     "passes if any are left.")
    elif kind == "spring":
        next_step = (f"Spring pass {n}: leave the {slide} at {text} and cut again with no "
                     "feed.")
    else:
        what = ("the finishing pass" if kind == "finish"
                else f"pass {passes_before + n} of {passes_before + total_n}")
        first = "Read the cautions; then " if before_first else ""
        next_step = (f"{first}set the {slide} to {text}"
                     + (f", {side_text}" if side_text else "") + f", cut {what}.")
    cautions = plan.cautions if before_first else tuple(c for c in plan.cautions
                                                        if "past its limit" in c)
    return PassView(n, total_n, kind, slide, count, turns, mark, text, side_text, rt, rm,
                    return_text, depth_done, max(depth_total - depth_done, 0.0), depth_total,
                    progress, next_step, cautions, p.side if sm is not None else None, sm,
                    p.compound_cum if sm is not None else 0.0)


# ---------------------------------------------------------------------------------------------
# Internal threads: the bore


@dataclass(frozen=True)
class BoreSize:
    """The bore to prepare for an internal thread [mm]."""

    minor_min: float
    minor_max: float | None
    suggested: float
    text: str


def bore_to_prepare(limits: Limits) -> BoreSize:
    """Return the bore size to prepare: the internal minor-diameter limits and a size to aim at.

    limits: an internal thread's limits. Suggested: the middle of the minor band (the basic
    minor when the standard sets no maximum).
    References: ISO 965-1 (D1 limits); ASME B1.1 (internal minor limits).
    """
    if limits.spec.is_external:
        raise InvalidEntry("A bore size is for internal threads: give the nut's designation "
                           "(e.g. M10x1.5-6H).")
    lo = limits.minor_min if limits.minor_min is not None else limits.basic_minor
    hi = limits.minor_max
    aim = (lo + hi) / 2 if hi is not None else lo
    band = f"{lo:.3f} to {hi:.3f} mm" if hi is not None else f"at least {lo:.3f} mm"
    return BoreSize(lo, hi, aim, f"Bore to {aim:.3f} mm (minor diameter {band}); measure it and "
                                 "enter what you measured.")
