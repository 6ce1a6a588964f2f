"""The cut in force, read from the job record: the preparation, the plan, the count, the dial zeros.

Three screens share this (prepare the cut, count the passes, pick the thread up again); none of
them keeps a count of its own. Everything here is pure: the record's state in, frozen results
out. The record's objects are read by attribute only (``state.passes``, ``state.setups``,
``state.readings``, ``state.spring_passes``, ``state.pickups``), so this module needs nothing
from ``shopterm.job``.

References: see the modules it calls (``tool``, ``infeed``, ``plan``, ``pickup``); the replanning
from a wire reading is ``plan.replan``; dial zeros are the arithmetic of a graduated dial.
"""

from __future__ import annotations

import re
from dataclasses import dataclass

from shopterm.cutting.infeed import METHODS, infeed_method
from shopterm.cutting.pickup import DialZero, new_zero
from shopterm.cutting.plan import (PLAN_KINDS, Plan, dial_reading, make_plan, pass_view,
                                   replan)
from shopterm.cutting.taper_thread import tapered_tool_depth
from shopterm.cutting.tool import (ToolCheck, ToolDepth, check_tool, power_tool, standard_tip,
                                   tool_depth)
from shopterm.cutting.wires import is_power_form
from shopterm.errors import InvalidEntry
from shopterm.lathe.machine import Dial, ToolTip
from shopterm.standards import limits as thread_limits
from shopterm.units import parse_number

#: Set-up keys that change the plan; a change to one of them after passes were cut replans
#: the rest of the cut from the depth reached.
CUT_KEYS = ("method", "compound_angle_deg", "tool_kind", "tool_size_mm", "blank_od_mm", "plan",
            "passes", "spring_passes", "aim_pd_mm", "blank_at_mm")
#: What the preparation must have before the first pass.
PREPARED_KEYS = ("blank_od_mm", "method", "plan", "passes", "tool_kind", "tool_size_mm")
#: Why the thread is picked up again: (record's reason, what it means).
PICKUP_REASONS = (("reground", "tool reground"),
                  ("picked_up", "thread picked up again (tool re-set, work remounted)"))


@dataclass(frozen=True)
class Cut:
    """The cut as the record has it now: the plan in force and where the count stands."""

    plan: Plan
    limits: object
    depth: ToolDepth
    check: ToolCheck
    tip: ToolTip
    passes_before: int        # passes cut before the plan in force began (earlier plans)
    done_in_plan: int         # infeed passes of this plan already cut
    springs_done: int         # spring passes after the last infeed pass of this plan
    zeros: dict               # dial name ('compound', 'cross-slide') -> DialZero
    replanned_from: str | None  # what the plan in force was recomputed from, if anything

    @property
    def feed_name(self) -> str:
        """Return the dial the cut feeds with: 'compound' or 'cross-slide'."""
        return "compound" if self.plan.method.feeds_with == "compound" else "cross-slide"

    def view(self):
        """Return the ``PassView`` of the next pass, with the dial zeros in force."""
        p = self.plan
        n = len(p.passes)
        done = self.done_in_plan if self.done_in_plan < n else n + self.springs_done
        z = {k: v.offset for k, v in self.zeros.items()}
        return pass_view(p, done, passes_before=self.passes_before,
                         feed_zero=z.get(self.feed_name, 0.0),
                         cross_zero=z.get("cross-slide", 0.0),
                         side_zero=z.get("compound", 0.0) if p.method.method == "alternating"
                         else 0.0)

    def pass_entry(self, n: int, dial_text: str) -> dict:
        """Return the record's ``pass_cut`` payload for the next infeed pass, numbered ``n``.

        dial_text: the setting as the counter showed it. Raises InvalidEntry when the next pass
        is a spring pass or every pass is cut.
        """
        if self.done_in_plan >= len(self.plan.passes):
            raise InvalidEntry("No infeed pass is left in the plan: take a spring pass (0) or "
                               "measure over the wires (+).")
        p = self.plan.passes[self.done_in_plan]
        m = self.plan.method
        payload = {"n": n, "radial_cum_mm": p.radial_cum, "dial": dial_text,
                   "infeed_mm": max(p.radial_inc, 0.0),
                   "compound_mm": abs(p.compound_cum) if m.method != "radial" else 0.0,
                   "cross_mm": 0.0 if m.feeds_with == "compound" else p.radial_cum,
                   "dial_divisions": p.dial_divisions, "feeds_with": m.feeds_with,
                   "kind": p.kind}
        if p.side is not None:
            payload.update(side=p.side, side_divisions=p.side_divisions)
        return payload

    def last_setting(self) -> tuple[int, float, float] | None:
        """Return (whole turns, mark, count from the zero [divisions]) the feeding dial was set
        to for the last infeed pass of the plan in force, with the zeros in force; None before
        the plan's first pass."""
        if self.done_in_plan == 0:
            return None
        count = self.plan.passes[min(self.done_in_plan, len(self.plan.passes)) - 1].dial_divisions
        zero = self.zeros.get(self.feed_name)
        turns, mark = dial_reading(count, self.plan.feed_dial, zero.offset if zero else 0.0)
        return turns, mark, count

    def pickup_dials(self) -> list[tuple[str, Dial]]:
        """Return the dials to read when the thread is picked up, in the order to read them:
        (name, Dial); the feeding dial first."""
        plan, m = self.plan, self.plan.method
        if m.feeds_with == "compound":
            return [("compound", plan.feed_dial), ("cross-slide", plan.cross_dial)]
        if m.method == "alternating":
            return [("cross-slide", plan.cross_dial), ("compound", plan.side_dial)]
        return [("cross-slide", plan.cross_dial)]

    def plan_counts(self) -> str:
        """Return the plan's dial counts from the zero: done ones in brackets, the next marked."""
        parts = []
        for i, p in enumerate(self.plan.passes):
            c = f"{p.dial_divisions:g}"
            parts.append(f"({c})" if i < self.done_in_plan else
                         f">{c}<" if i == self.done_in_plan else c)
        return (f"Plan, {self.feed_name} divisions from the zero: " + " ".join(parts)
                + f" · then {len(self.plan.spring_passes)} spring")


def default_draft(shop_tool: ToolTip, setup: dict, limits=None) -> dict:
    """Return the preparation values to start from: the set-up in force over the defaults.

    shop_tool: the config's tool tip; setup: the set-up in force (``app.setup_values()``);
    limits: the thread's, when known: a power thread (trapezoidal, Acme, square) starts from
    the standard's flat tip (``tool.standard_tip``), not the config's tip.
    ``tip_from`` says where the tip came from ('config', 'standard' or 'set-up').
    """
    tip, tip_from = shop_tool, "config"
    if limits is not None and is_power_form(limits.spec.form):
        tip, tip_from = standard_tip(limits), "standard"
    d = {"blank_od_mm": None, "tool_kind": tip.kind, "tool_size_mm": tip.size,
         "tip_from": tip_from, "method": "modified", "plan": "constant-area", "passes": None,
         "spring_passes": 1}
    for k in ("blank_od_mm", "tool_kind", "tool_size_mm", "method", "plan", "passes",
              "spring_passes"):
        if setup.get(k) is not None:
            d[k] = setup[k]
            if k in ("tool_kind", "tool_size_mm"):
                d["tip_from"] = "set-up"
    if d["method"] not in METHODS:
        d["method"] = "modified"
    if d["plan"] not in PLAN_KINDS:
        d["plan"] = "constant-area"
    return d


def prepare(spec, lathe, values: dict):
    """Return (limits, ToolDepth, InfeedMethod, Plan, ToolCheck) for preparation values.

    values: blank_od_mm [mm], tool_kind, tool_size_mm [mm], method, plan, passes (None:
    derived from the largest first pass), spring_passes, aim_pd_mm [mm] (None: mid band).
    Raises ShoptermError with what to change. References: see shopterm.cutting.
    """
    lim = thread_limits(spec)
    if values.get("blank_od_mm") is None:
        what = "bore" if not spec.is_external else "blank's OD"
        raise InvalidEntry(f"Measure the {what} and enter it (1).")
    tip = ToolTip(values["tool_kind"], float(values["tool_size_mm"]))
    depth = turned_depth(lim, values, float(values["blank_od_mm"]), tip)
    method = infeed_method(values["method"], spec.form.angle_deg, lathe=lathe,
                           internal=not spec.is_external, hand=spec.hand)
    plan = make_plan(depth.total_radial, method, lathe=lathe, kind=values["plan"],
                     passes=values.get("passes"), spring=int(values.get("spring_passes", 1)),
                     internal=not spec.is_external, flat_bottom=flat_bottom(lim, tip))
    check = check_tool(lim, tip, depth.aim_pd, turned_diameter=depth.turned_diameter)
    return lim, depth, method, plan, check


def flat_bottom(limits, tip: ToolTip) -> float:
    """Return the flat [mm] a power thread's groove is cut with (its plan keeps the groove's
    true chip area: ``plan.make_plan(flat_bottom=)``), 0 for any other thread or tip."""
    return tip.size if tip.kind == "flat" and is_power_form(limits.spec.form) else 0.0


def power_tool_for(limits, values: dict, max_side_clearance_deg: float, aim_pd=None):
    """Return the ``PowerTool`` for a power thread's preparation values, None for another form.

    values: ``tool_kind``, ``tool_size_mm`` [mm]; max_side_clearance_deg: the config's
    ``[tool] side_clearance``. Raises InvalidEntry as ``tool.power_tool`` (a nose radius, a flat
    too wide, a lead too steep for the tool).
    """
    if not is_power_form(limits.spec.form):
        return None
    return power_tool(limits, ToolTip(values["tool_kind"], float(values["tool_size_mm"])),
                      aim_pd=aim_pd, max_side_clearance_deg=max_side_clearance_deg)


def turned_depth(lim, values: dict, measured: float, tip: ToolTip) -> ToolDepth:
    """Return the total infeed from a ``measured`` [mm] turned size, with the preparation's
    ``aim_pd_mm``; a tapered thread's blank is measured ``blank_at_mm`` [mm] from the small end
    (internal: in from the face; default 0) and planned at the gauge plane."""
    aim = values.get("aim_pd_mm")
    if lim.taper is not None:
        return tapered_tool_depth(lim, measured, float(values.get("blank_at_mm") or 0.0), tip, aim)
    return tool_depth(lim, measured, tip, aim)


def prepared_setup(spec, lathe, values: dict) -> dict:
    """Return the set-up values to record for a confirmed preparation (see DEVELOPERS.md,
    set-up keys): the method with its compound angles, the tip, the turned size, the plan.

    Raises ShoptermError as ``prepare`` does.
    """
    _lim, _depth, method, plan, _check = prepare(spec, lathe, values)
    return {"method": method.method, "compound_angle_deg": method.true_angle_deg,
            "compound_angle_set": method.scale_reading_deg, "tool_kind": values["tool_kind"],
            "tool_size_mm": float(values["tool_size_mm"]),
            "blank_od_mm": float(values["blank_od_mm"]), "plan": plan.kind,
            "passes": plan.count, "spring_passes": len(plan.spring_passes),
            **({"blank_at_mm": float(values.get("blank_at_mm") or 0.0)}
               if _lim.taper is not None else {})}


def is_prepared(values: dict) -> bool:
    """Return whether the set-up in force has what the counter needs to cut."""
    return all(values.get(k) is not None for k in PREPARED_KEYS)


_READING = re.compile(r"(compound|cross-slide)\s+([0-9.]+)")


def pickup_text(readings: dict) -> str:
    """Return the record's text for pick-up readings, e.g. 'compound 37; cross-slide 12'."""
    return "; ".join(f"{k} {v:g}" for k, v in readings.items())


def pickup_readings(text) -> dict:
    """Return {dial name: mark} from a pick-up's recorded text (inverse of ``pickup_text``)."""
    if not isinstance(text, str):
        return {}
    return {k: float(v) for k, v in _READING.findall(text)}


def check_pickup_mark(text_or_mark, dial: Dial) -> float:
    """Return the mark read on ``dial`` at a pick-up; raise InvalidEntry if it is not on it."""
    mark = parse_number(text_or_mark) if isinstance(text_or_mark, str) else float(text_or_mark)
    new_zero(mark, 0.0, dial)           # checks the mark is on the dial
    return mark


def cut_from_record(spec, lathe, state) -> Cut:
    """Return the cut in force from the job record: plan, replans, count, dial zeros.

    Raises ShoptermError if the set-up in force cannot make a plan.
    """
    passes = sorted(state.passes, key=lambda p: p.seq)
    setups = sorted(state.setups, key=lambda s: s.seq)
    first_seq = passes[0].seq if passes else None

    def setup_at(seq):
        chosen = [s for s in setups if seq is None or s.seq < seq]
        return dict(chosen[-1].values) if chosen else {}

    base = setup_at(first_seq)
    if not is_prepared(base) and setups:
        # passes recorded before the counter's set-up: plan from the first full set-up
        full = [s for s in setups if is_prepared(s.values)]
        base = dict(full[0].values) if full else base
        first_seq = full[0].seq if full else first_seq
    lim, depth, method, plan, check = prepare(spec, lathe, base)
    tip = ToolTip(base["tool_kind"], float(base["tool_size_mm"]))
    markers = []
    if first_seq is not None:
        markers += [("setup", s.seq, s) for s in setups if s.seq > first_seq]
        markers += [("reading", r.seq, r) for r in state.readings if r.seq > first_seq]
    markers.sort(key=lambda m: m[1])
    offset, start_seq, replanned = 0, 0, None
    current = base
    for what, seq, m in markers:
        before = [p for p in passes if p.seq < seq]
        done_radial = before[-1].radial_cum_mm if before else 0.0
        in_plan = len(before) - offset
        if what == "reading":
            aim = current.get("aim_pd_mm") or lim.pd_mid
            plan = replan(plan, m.pd_mm, aim, done_radial, pd_min=lim.pd_min, pd_max=lim.pd_max)
            replanned = f"wire reading: PD {m.pd_mm:.4f} mm = {m.pd_mm / 25.4:.4f} in"
        else:
            values = dict(m.values)
            if all(values.get(k) == current.get(k) for k in CUT_KEYS):
                continue
            lim, depth, method, _plan, check = prepare(spec, lathe, values)
            tip = ToolTip(values["tool_kind"], float(values["tool_size_mm"]))
            left_in_old = max(1, len(plan.passes) - in_plan)
            n = (max(1, int(values["passes"]) - len(before))
                 if values.get("passes") != current.get("passes") else left_in_old)
            current = values
            if depth.total_radial <= done_radial:
                plan = replan(plan, 1.0, 1.0, done_radial)      # nothing left: spring passes
            else:
                plan = make_plan(depth.total_radial, method, lathe=lathe, kind=values["plan"],
                                 passes=n, spring=int(values.get("spring_passes", 1)),
                                 internal=not spec.is_external, start_radial=done_radial,
                                 flat_bottom=flat_bottom(lim, tip))
            replanned = "a changed set-up"
        offset, start_seq = len(before), seq
    last_seq = passes[-1].seq if passes else 0
    springs = [s for s in state.spring_passes if s.seq > max(last_seq, start_seq)]
    zeros = _zeros(state, passes, plan)
    return Cut(plan, lim, depth, check, tip, offset, len(passes) - offset, len(springs), zeros,
               replanned)


def _zeros(state, passes, plan) -> dict:
    """Return the dial zeros from the latest pick-up in force (new zero = reading − count)."""
    if not state.pickups:
        return {}
    pk = state.pickups[-1]
    before = [p for p in passes if p.seq < pk.seq]
    last = before[-1].payload if before else {}
    feeds = last.get("feeds_with", plan.method.feeds_with)
    counts = {"compound": 0.0, "cross-slide": 0.0}
    done_div = float(last.get("dial_divisions", 0.0))
    if feeds == "compound":
        counts["compound"] = done_div
    else:
        counts["cross-slide"] = done_div
        counts["compound"] = float(last.get("side_divisions") or 0.0)
    dials = {"compound": plan.side_dial or plan.feed_dial, "cross-slide": plan.cross_dial}
    if plan.method.feeds_with == "compound":
        dials["compound"] = plan.feed_dial
    out = {}
    for name, mark in pickup_readings(pk.dial).items():
        dial = dials[name]
        if 0 <= mark < dial.divisions:
            c = counts[name] % dial.divisions
            out[name] = DialZero(round((mark - c) % dial.divisions, 9), dial.divisions)
    return out
