"""The pass counter: prepare the cut (turned size, tip, infeed, plan), then count the passes.

Everything on this screen is drawn from the job record (``app.state``): the set-up in force
gives the plan, the passes cut say where the count is, a wire reading replans the rest from the
measured pitch diameter, a tool pick-up gives the dials new zeros. After a restart the counter
is exactly where it was.
"""

from __future__ import annotations

import re
import textwrap
from dataclasses import dataclass

from rich.text import Text
from textual.app import ComposeResult
from textual.containers import Horizontal, Vertical
from textual.widgets import Digits, ProgressBar, Static

from shopterm.cutting.infeed import METHODS, infeed_method
from shopterm.cutting.pickup import DialZero, new_zero, pickup_steps
from shopterm.cutting.plan import (PLAN_KINDS, Plan, bore_to_prepare, make_plan, pass_view,
                                   replan)
from shopterm.cutting.tool import ToolCheck, ToolDepth, check_tool, tool_depth
from shopterm.errors import InvalidEntry, ShoptermError
from shopterm.lathe.machine import ToolTip
from shopterm.standards import limits as thread_limits
from shopterm.ui import keys
from shopterm.ui.screens.base import ShopScreen
from shopterm.ui.widgets.entry import KeypadEntry
from shopterm.ui.widgets.picklist import PickList
from shopterm.units import format_length, parse_length, parse_number

METHOD_NAMES = {"radial": "radial", "flank": "flank", "modified": "modified flank",
                "alternating": "alternating flank"}
#: Set-up keys that change the plan; a change to one of them after passes were cut replans
#: the rest of the cut from the depth reached.
CUT_KEYS = ("method", "compound_angle_deg", "tool_kind", "tool_size_mm", "blank_od_mm", "plan",
            "passes", "spring_passes", "aim_pd_mm")
PICKUP_REASONS = (("reground", "tool reground"), ("picked_up", "thread picked up again "
                                                  "(tool re-set, work remounted)"))


class LengthEntry(KeypadEntry):
    """A number entry that also takes a unit suffix typed on a keyboard (mm, in, ")."""

    def _accepts(self, ch: str) -> bool:
        return ch in "0123456789.,mMiInN\" "


# ---------------------------------------------------------------------------------------------
# From the record to the plan in force (no Textual here; the screen draws what this returns)


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

    def view(self):
        """Return the ``PassView`` of the next pass, with the dial zeros in force."""
        p = self.plan
        n = len(p.passes)
        done = self.done_in_plan if self.done_in_plan < n else n + self.springs_done
        feed_name = "compound" if p.method.feeds_with == "compound" else "cross-slide"
        z = {k: v.offset for k, v in self.zeros.items()}
        return pass_view(p, done, passes_before=self.passes_before,
                         feed_zero=z.get(feed_name, 0.0),
                         cross_zero=z.get("cross-slide", 0.0),
                         side_zero=z.get("compound", 0.0) if p.method.method == "alternating"
                         else 0.0)


def default_draft(app) -> dict:
    """Return the preparation values to start from: the set-up in force over the defaults."""
    tip = app.shop.tool
    d = {"blank_od_mm": None, "tool_kind": tip.kind, "tool_size_mm": tip.size,
         "tip_from": "config", "method": "modified", "plan": "constant-area", "passes": None,
         "spring_passes": 1}
    setup = app.setup_values()
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
    aim = values.get("aim_pd_mm")
    depth = tool_depth(lim, float(values["blank_od_mm"]), tip, aim)
    method = infeed_method(values["method"], spec.form.angle_deg, lathe=lathe,
                           internal=not spec.is_external, hand=spec.hand)
    plan = make_plan(depth.total_radial, method, lathe=lathe, kind=values["plan"],
                     passes=values.get("passes"), spring=int(values.get("spring_passes", 1)),
                     internal=not spec.is_external)
    check = check_tool(lim, tip, depth.aim_pd, turned_diameter=float(values["blank_od_mm"]))
    return lim, depth, method, plan, check


def is_prepared(values: dict) -> bool:
    """Return whether the set-up in force has what the counter needs to cut."""
    return all(values.get(k) is not None for k in ("blank_od_mm", "method", "plan", "passes",
                                                   "tool_kind", "tool_size_mm"))


_READING = re.compile(r"(compound|cross-slide)\s+([0-9.]+)")


def pickup_text(readings: dict) -> str:
    """Return the record's text for pick-up readings, e.g. 'compound 37; cross-slide 12'."""
    return "; ".join(f"{k} {v:g}" for k, v in readings.items())


def pickup_readings(text) -> dict:
    """Return {dial name: mark} from a pick-up's recorded text (inverse of ``pickup_text``)."""
    if not isinstance(text, str):
        return {}
    return {k: float(v) for k, v in _READING.findall(text)}


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
                                 internal=not spec.is_external, start_radial=done_radial)
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


def wrap_lines(items, width: int, bullet: str = "• ") -> list[str]:
    """Return ``items`` wrapped to ``width`` columns, each starting with ``bullet``."""
    out: list[str] = []
    for item in items:
        out += textwrap.wrap(item, width, initial_indent=bullet,
                             subsequent_indent=" " * len(bullet)) or [bullet]
    return out


# ---------------------------------------------------------------------------------------------
# The screen


class CounterScreen(ShopScreen):
    SCREEN_NAME = "counter"
    AUTO_FOCUS = ""
    TITLE = "Pass counter"
    BINDINGS = [keys.bind(keys.CONFIRM, "confirm", "confirm", show=False),
                *keys.digit_keys("digit")]
    HELP = (("before pass 1", "1 turned size · 2 flat/radius · 3 tip size · 4 infeed method · "
                              "5 plan · 6 passes · 7 spring passes · Enter confirms"),
            ("Enter", "during cutting: the pass shown has just been cut"),
            ("0", "a spring pass (no feed) has just been cut"),
            ("1", "tool reground / thread picked up: set back in the groove, new dial zeros"),
            ("2", "before pass 1: change the preparation"),
            ("8", "the tool form (profiles, interference, root rules)"),
            ("9", "next page of cautions and notes"),
            ("/", "undo the last entry (asks first)"),
            ("+", "measure over the wires; the rest of the plan follows the reading"))

    DEFAULT_CSS = """
    CounterScreen #head { height: auto; padding: 0 1; text-style: bold; }
    CounterScreen #work { height: auto; }
    CounterScreen #notes { height: auto; }
    CounterScreen #prep { height: auto; padding: 0 1; }
    CounterScreen #od-row { height: 1; padding: 0 1; }
    CounterScreen #od { width: 34; padding: 0 0; }
    CounterScreen #od-hint { width: 1fr; color: $text-muted; }
    CounterScreen #value-row { height: 1; padding: 0 1; }
    CounterScreen #value-label { width: auto; text-style: bold; }
    CounterScreen #value { width: 1fr; }
    CounterScreen #methods { height: auto; min-height: 2; }
    CounterScreen #dial-row { height: 3; padding: 0 1; }
    CounterScreen #dial-big { width: auto; min-width: 6; color: $accent; text-style: bold;
                              margin-right: 2; }
    CounterScreen #dial-text { width: 1fr; height: 3; }
    CounterScreen #cut-info { height: auto; padding: 0 1; }
    CounterScreen #bar { height: 1; padding: 0 1; }
    CounterScreen #bar Bar { width: 1fr; }
    CounterScreen #next { height: auto; padding: 0 1; text-style: bold; }
    CounterScreen #extra { height: auto; padding: 0 1; }
    CounterScreen #extra.caution { color: $warning; text-style: none; }
    """

    def __init__(self) -> None:
        super().__init__()
        self.draft: dict | None = None
        self.draft_job: object = None
        self.editing: str | None = None     # which value #value is taking, or 'method'
        self.pickup: dict | None = None      # the pick-up flow in progress
        self.page = 0                        # cautions/notes page
        self.force_prep = False              # 2 before pass 1: back to the preparation

    def compose_body(self) -> ComposeResult:
        yield Static("", id="head")
        with Horizontal(id="od-row"):
            yield LengthEntry(prompt="1 blank OD: ", id="od")
            yield Static("", id="od-hint")
        # What is not on an entry's line sits in boxes of its own (#work, #notes): a key typed
        # into an entry repaints that line and the boxes, not every widget on the screen (the
        # compositor redraws each widget whose container overlaps the change).
        with Vertical(id="work"):
            yield Static("", id="prep")
            with Horizontal(id="dial-row"):
                yield Digits("", id="dial-big")
                yield Static("", id="dial-text")
            yield Static("", id="cut-info")
            yield ProgressBar(total=1.0, show_eta=False, show_percentage=True, id="bar")
            yield Static("", id="next")
        with Horizontal(id="value-row"):
            yield Static("", id="value-label")
            yield LengthEntry(id="value")
        with Vertical(id="notes"):
            yield PickList(id="methods", columns=2)
            yield Static("", id="message", classes="message")
            yield Static("", id="extra")

    def on_mount(self) -> None:
        super().on_mount()
        self.redraw()

    def on_screen_resume(self) -> None:
        super().on_screen_resume()
        self.redraw()

    def job_changed(self) -> None:
        """Called after an undo: the record changed under the screen."""
        self.pickup = None
        self.editing = None
        self.redraw()

    def on_resize(self) -> None:
        self.redraw()

    # -- what mode ---------------------------------------------------------------------------
    @property
    def unit(self) -> str:
        return self.app.shop.display_units

    def L(self, mm: float | None) -> str:
        if mm is None:
            return "—"
        return format_length(mm, self.unit)

    def in_prep(self) -> bool:
        st = self.app.state
        if not is_prepared(self.app.setup_values()):
            return True          # also when passes were recorded without a set-up
        if st is not None and st.passes:
            return False
        return self.force_prep

    def ensure_draft(self) -> None:
        if self.draft is None or self.draft_job is not self.app.job:
            self.draft = default_draft(self.app)
            self.draft_job = self.app.job

    # -- drawing -----------------------------------------------------------------------------
    def redraw(self) -> None:
        if not self.is_mounted:
            return
        app = self.app
        prep_widgets = ("#od-row", "#prep")
        cut_widgets = ("#dial-row", "#cut-info", "#bar", "#next")
        if app.spec is None:
            self.show(prep_widgets + cut_widgets + ("#value-row", "#methods"), False)
            self.query_one("#head", Static).update(
                "Choose a thread first: * then the thread screen (a job starts with its thread).")
            self.query_one("#extra", Static).update("")
            self.refresh_chrome()
            return
        prep = self.in_prep()
        self.show(prep_widgets, prep)
        self.show(cut_widgets, not prep)
        self.show(("#value-row",), self.editing not in (None, "method"))
        self.show(("#methods",), self.editing == "method")
        if prep:
            self.draw_prep()
        else:
            self.draw_cut()
        self.refresh_chrome()

    def show(self, selectors, on: bool) -> None:
        for sel in selectors:
            self.query_one(sel).display = on

    def width(self) -> int:
        w = self.size.width or self.app.size.width or 80
        return max(40, w - 3)

    def draw_extra(self, items: list[str], rows: int, *, caution: bool, title: str = "",
                   wrapped: bool = False) -> None:
        """Show ``items`` wrapped in the space left, a page at a time (9 turns the page)."""
        lines = list(items) if wrapped else wrap_lines(items, self.width())
        rows = max(2, rows - (1 if title else 0))
        pages = max(1, -(-len(lines) // rows))
        self.page %= pages
        shown = lines[self.page * rows:(self.page + 1) * rows]
        out = Text()
        if title:
            out.append(title + (f"  (page {self.page + 1}/{pages}, 9 = next page)"
                                if pages > 1 else ""), style="bold")
            out.append("\n")
        out.append("\n".join(shown))
        extra = self.query_one("#extra", Static)
        extra.update(out)
        extra.set_class(caution, "caution")
        self.pages = pages

    def rows_left(self, used: int) -> int:
        h = self.size.height or self.app.size.height or 24
        return h - 2 - used

    def draw_prep(self) -> None:
        self.ensure_draft()
        d, spec, u = self.draft, self.app.spec, self.unit
        lim = thread_limits(spec)
        internal = not spec.is_external
        head = Text(f"Prepare {spec.designation} ({spec.kind})", style="bold")
        head.append(f" · aim PD {self.L(d.get('aim_pd_mm') or lim.pd_mid)}"
                    f" · basic depth {self.L(lim.depth)}", style="")
        self.query_one("#head", Static).update(head)
        od = self.query_one("#od", LengthEntry)
        od.prompt = f"1 {'bore' if internal else 'blank OD'} measured [{u}]: "
        if internal:
            bore = bore_to_prepare(lim)
            hint = f"bore {self.L(bore.minor_min)} to {self.L(bore.minor_max)}"
        else:
            hint = f"major {self.L(lim.major_min)} to {self.L(lim.major_max)}"
        if d.get("blank_od_mm") is not None and not od.has_focus:
            hint = f"= {self.L(d['blank_od_mm'])}  ({hint.replace(f' {u}', '')} {u})"
        self.query_one("#od-hint", Static).update(hint)
        if d.get("blank_od_mm") is None and self.editing is None and not od.has_focus:
            od.focus()
        lines = Text()
        tip_kind = "flat" if d["tool_kind"] == "flat" else "radius"
        lines.append("2 ", style="bold")
        lines.append(f"tip {tip_kind}  ")
        lines.append("3 ", style="bold")
        lines.append(f"{'flat width' if tip_kind == 'flat' else 'nose radius'} "
                     f"{self.L(d['tool_size_mm'])} (from {d['tip_from']})\n")
        try:
            lim, depth, method, plan, check = prepare(spec, self.app.lathe, d)
        except ShoptermError as exc:
            method = None
            try:
                method = infeed_method(d["method"], spec.form.angle_deg, lathe=self.app.lathe,
                                       internal=internal, hand=spec.hand)
            except ShoptermError:
                pass
            self._method_line(lines, d, method)
            lines.append("5 ", style="bold")
            lines.append(f"plan {d['plan']}  ")
            lines.append("6 ", style="bold")
            lines.append(f"passes {d['passes'] or 'from the first pass'}  ")
            lines.append("7 ", style="bold")
            lines.append(f"spring passes {d['spring_passes']}\n")
            lines.append(str(exc), style="bold")
            self.query_one("#prep", Static).update(lines)
            self.draw_extra(self.caution_items(None, internal), self.rows_left(9),
                            caution=True, title="Before the first pass")
            return
        self._method_line(lines, d, method)
        lines.append("5 ", style="bold")
        lines.append(f"plan {plan.kind}  ")
        lines.append("6 ", style="bold")
        derived = "" if d.get("passes") else f" (first pass ≤ {self.L(plan.max_first)})"
        lines.append(f"passes {plan.count}{derived}  ")
        lines.append("7 ", style="bold")
        lines.append(f"spring {len(plan.spring_passes)}\n")
        lines.append(f"Total infeed {self.L(depth.total_radial)} radial", style="bold")
        lines.append(f" · basic depth {self.L(depth.basic_depth)}")
        if method.feeds_with == "compound":
            lines.append(f" · compound {self.L(plan.compound_total)}")
        lines.append("\n")
        verdict = "Tool check OK" if check.ok else "Tool check FAILS"
        lines.append(verdict, style="bold" if check.ok else "bold red")
        first = next((m for m in check.messages if not check.ok and m.startswith("Fails")),
                     check.messages[0] if check.messages else "")
        lines.append(f": {first.split(': ', 1)[-1]}  (8 tool form)")
        self.query_one("#prep", Static).update(lines)
        used = 3 + 4 + (2 if len(first) > self.width() - 20 else 1) + 1
        used += 1 if self.editing not in (None, "method") else 0
        used += 3 if self.editing == "method" else 0
        items = self.caution_items(plan, internal) + list(depth.notes)
        self.draw_extra(items, self.rows_left(used), caution=True,
                        title="Before the first pass · Enter confirms and starts pass 1")

    def _method_line(self, lines: Text, d: dict, method) -> None:
        lines.append("4 ", style="bold")
        lines.append(f"{METHOD_NAMES[d['method']]}: ")
        if method is None:
            lines.append("\n")
        elif method.feeds_with == "compound":
            lines.append(f"compound {method.true_angle_deg:g}° from the cross-slide — ")
            lines.append(f"SET {method.scale_reading_deg:g}° on its scale\n", style="bold")
        elif method.method == "alternating":
            lines.append("cross-slide feeds; compound parallel to the bed — ")
            lines.append(f"SET {method.scale_reading_deg:g}° on its scale\n", style="bold")
        else:
            lines.append("cross-slide straight in; the compound stays put\n")

    def caution_items(self, plan, internal: bool) -> list[str]:
        from shopterm.cutting.plan import BORING_CAUTIONS, SETUP_CAUTIONS
        items = list(plan.cautions if plan is not None else
                     SETUP_CAUTIONS + (BORING_CAUTIONS if internal else ()))
        if internal:
            bore = bore_to_prepare(thread_limits(self.app.spec))
            items.insert(0, bore.text)
        return items

    def draw_cut(self) -> None:
        app, spec = self.app, self.app.spec
        try:
            cut = cut_from_record(spec, app.lathe, app.state)
            v = cut.view()
        except ShoptermError as exc:
            self.query_one("#head", Static).update(Text(f"The set-up cannot make a plan: {exc} "
                                                        "Undo (/) the last change.",
                                                        style="bold"))
            self.show(("#dial-row", "#cut-info", "#bar", "#next"), False)
            self.query_one("#extra", Static).update("")
            return
        self.cut = cut
        plan = cut.plan
        m = plan.method
        n_total = cut.passes_before + plan.count
        if v.kind == "done":
            title = f"All {n_total} passes cut"
        elif v.kind == "spring":
            title = f"Spring pass {v.n} of {len(plan.spring_passes)} (after {n_total} passes)"
        else:
            title = (f"Pass {cut.passes_before + v.n} of {n_total}"
                     + (" · finishing" if v.kind == "finish" else ""))
        head = Text(title, style="bold")
        if m.feeds_with == "compound":
            head.append(f" · {METHOD_NAMES[m.method]}, compound set "
                        f"{m.scale_reading_deg:g}° on its scale", style="")
        else:
            head.append(f" · {METHOD_NAMES[m.method]}, feed on the cross-slide", style="")
        if cut.replanned_from:
            head.append(f"\nReplanned from {cut.replanned_from}", style="")
        self.query_one("#head", Static).update(head)
        dial_name = "COMPOUND" if m.feeds_with == "compound" else "CROSS-SLIDE"
        mark = v.dial_mark
        mark_text = f"{mark:g}" if v.kind != "done" else "--"
        self.query_one("#dial-big", Digits).update(mark_text)
        tpd = plan.feed_dial.travel_per_division
        turns = ("in the first turn" if v.dial_turns == 0 else
                 f"after {v.dial_turns} full turn{'s' if v.dial_turns != 1 else ''} from zero")
        dt = Text()
        dt.append(f"{dial_name} dial: set mark {mark_text}\n", style="bold")
        dt.append(f"{turns} ({v.dial_divisions:g} div from the zero,"
                  f" {self.L(v.dial_divisions * tpd)} travel)\n")
        if v.side_text:
            dt.append(v.side_text)
        elif spec.starts > 1 and v.kind != "done":
            dt.append(f"cut all {spec.starts} starts at this setting before feeding deeper")
        self.query_one("#dial-text", Static).update(dt)
        info = Text()
        info.append(v.return_text[0].upper() + v.return_text[1:] + "\n")
        info.append(f"Depth done {self.L(v.depth_done)} · left {self.L(v.depth_left)}"
                    f" · of {self.L(v.depth_total)} (radial)")
        self.query_one("#cut-info", Static).update(info)
        self.query_one("#bar", ProgressBar).update(total=1.0, progress=v.progress)
        nxt = v.next_step
        if v.kind != "done":
            nxt += " Then Enter." if v.kind != "spring" else " Then 0."
        self.query_one("#next", Static).update(Text("Next: " + nxt))
        if self.pickup is not None:
            self.show(("#dial-row", "#cut-info", "#bar", "#next"), False)
            self.draw_pickup(cut)
            return
        used = 2 + 1 + 3 + 2 + 1 + (2 if len(nxt) > self.width() - 8 else 1) + 1
        used += 1 if cut.replanned_from else 0
        done_total = len(app.state.passes)
        if done_total == 0:
            items = list(v.cautions) + list(cut.depth.notes)
            self.draw_extra(items, self.rows_left(used), caution=True,
                            title="Before the first pass")
        else:
            items = [n for n in plan.notes if not n.startswith("No lathe")]
            cautions = [c for c in v.cautions if "past its limit" in c]
            items = cautions + [self.plan_line(cut)] + items[-3:]
            if not cut.check.ok:
                items.append("Tool check fails: 8 shows why.")
            self.draw_extra(items, self.rows_left(used), caution=bool(cautions))

    def plan_line(self, cut: Cut) -> str:
        """Return the plan's dial counts from the zero: done ones in brackets, the next marked."""
        parts = []
        for i, p in enumerate(cut.plan.passes):
            c = f"{p.dial_divisions:g}"
            parts.append(f"({c})" if i < cut.done_in_plan else
                         f">{c}<" if i == cut.done_in_plan else c)
        what = "compound" if cut.plan.method.feeds_with == "compound" else "cross-slide"
        return (f"Plan, {what} divisions from the zero: " + " ".join(parts)
                + f" · then {len(cut.plan.spring_passes)} spring")

    def draw_pickup(self, cut: Cut) -> None:
        pk = self.pickup
        steps = pickup_steps(cut.plan.method, cut.plan.internal)
        first = 1
        if pk.get("reason") is None:
            title = "Pick up: 1 tool reground, 2 thread picked up again · - cancels"
        else:
            title = (f"Pick up ({pk['reason'].replace('_', ' ')}): with the tool back in the "
                     "groove, enter the dial readings")
            first = len(steps) - 2
        self.query_one("#head", Static).update(Text(title, style="bold"))
        used = 1 + 1 + (1 if pk.get("reason") else 0)
        lines = []
        for i, step in enumerate(steps[first - 1:], first):
            lines += wrap_lines([step], self.width() - 1, bullet=f"{i}. ")
        self.draw_extra(lines, self.rows_left(used) + 1, caution=False, wrapped=True)

    # -- keys --------------------------------------------------------------------------------
    def key_hints(self) -> list[tuple[str, str]]:
        if self.editing is not None or (self.pickup is not None and self.pickup.get("reason")):
            return [("Enter", "accept"), ("-", "cancel"), ("Bksp", "delete"), ("F1", "help")]
        if self.pickup is not None:
            return [("1", "reground"), ("2", "picked up"), ("-", "cancel"), ("F1", "help")]
        if self.app.spec is None:
            return [("*", "menu"), ("F1", "help")]
        if self.in_prep():
            return [("Enter", "confirm"), ("1-7", "change"), ("8", "tool form"),
                    ("+", "wires"), ("/", "undo"), ("-", "back"), ("*", "menu")] + (
                        [("9", "more")] if getattr(self, "pages", 1) > 1 else [])
        hints = [("Enter", "pass cut"), ("0", "spring"), ("1", "pick up"), ("8", "tool"),
                 ("+", "wires"), ("/", "undo"), ("*", "menu")]
        if not self.app.state.passes:
            hints.insert(3, ("2", "change"))
        return hints

    def action_digit(self, n: int) -> None:
        if self.app.spec is None:
            return
        if self.pickup is not None:
            if n == 9:
                self.page += 1
                self.redraw()
            elif self.pickup.get("reason") is None and n in (1, 2):
                self.pickup["reason"] = PICKUP_REASONS[n - 1][0]
                self.next_pickup_entry()
            return
        if self.editing == "method":
            return
        if n == 8:
            self.app.goto("toolform")
            return
        if n == 9:
            self.page += 1
            self.redraw()
            return
        if self.in_prep():
            self.prep_digit(n)
        else:
            self.cut_digit(n)

    def prep_digit(self, n: int) -> None:
        d = self.draft
        if n == 1:
            od = self.query_one("#od", LengthEntry)
            od.clear()
            od.focus()
            self.say("Type the measured size, then Enter.")
        elif n == 2:
            d["tool_kind"] = "flat" if d["tool_kind"] == "radius" else "radius"
            d["tip_from"] = "this screen"
            self.say(f"Tip: {d['tool_kind']} (3 changes its size).")
        elif n == 3:
            self.edit("tool_size_mm", f"3 tip {'flat width' if d['tool_kind'] == 'flat' else 'nose radius'} [{self.unit}]: ")
        elif n == 4:
            picks = self.query_one("#methods", PickList)
            picks.set_items([(METHOD_NAMES[k], k) for k in METHODS], "Infeed method")
            self.editing = "method"
            self.redraw()
            picks.focus()
            return
        elif n == 5:
            i = PLAN_KINDS.index(d["plan"])
            d["plan"] = PLAN_KINDS[(i + 1) % len(PLAN_KINDS)]
            self.say(f"Plan: {d['plan']}.")
        elif n == 6:
            self.edit("passes", "6 passes (Enter alone: from the largest first pass): ")
        elif n == 7:
            self.edit("spring_passes", "7 spring passes after the last: ")
        else:
            return
        self.redraw()

    def cut_digit(self, n: int) -> None:
        if n == 0:
            self.spring_pass()
        elif n == 1:
            self.pickup = {"reason": None, "step": 0, "readings": {}}
            self.say("")
            self.redraw()
        elif n == 2 and not self.app.state.passes:
            self.force_prep = True
            self.draft = None
            self.say("Change what you need, then Enter confirms again.")
            self.redraw()

    def edit(self, what: str, label: str) -> None:
        self.editing = what
        self.query_one("#value-label", Static).update(label)
        entry = self.query_one("#value", LengthEntry)
        entry.clear()
        self.query_one("#value-row").display = True
        entry.focus()

    def end_edit(self) -> None:
        self.editing = None
        self.query_one("#value", LengthEntry).clear()
        self.set_focus(None)
        self.redraw()

    def on_pick_list_picked(self, event: PickList.Picked) -> None:
        if self.editing == "method":
            self.draft["method"] = event.value
            self.say(f"Infeed: {METHOD_NAMES[event.value]}.")
            self.end_edit()

    def on_keypad_entry_changed(self, event: KeypadEntry.Changed) -> None:
        event.stop()        # typing is this screen's business: nothing above it listens

    def on_keypad_entry_submitted(self, event: KeypadEntry.Submitted) -> None:
        event.stop()
        if event.entry.id == "od":
            self.take_od(event.value)
        elif self.pickup is not None:
            self.take_pickup_reading(event.value)
        elif self.editing:
            self.take_value(self.editing, event.value)

    def take_od(self, text: str) -> None:
        spec = self.app.spec
        try:
            mm = parse_length(text, self.unit)
            tool_depth(thread_limits(spec), mm, ToolTip(self.draft["tool_kind"],
                                                        float(self.draft["tool_size_mm"])),
                       self.draft.get("aim_pd_mm"))
        except ShoptermError as exc:
            self.say(str(exc), error=True)          # the text stays in the entry to correct
            return
        self.draft["blank_od_mm"] = mm
        od = self.query_one("#od", LengthEntry)
        od.clear()
        self.set_focus(None)
        self.say(f"Measured {self.L(mm)}. Check the rest, then Enter confirms.")
        self.redraw()

    def take_value(self, what: str, text: str) -> None:
        d = self.draft
        try:
            if what == "tool_size_mm":
                mm = parse_length(text, self.unit)
                ToolTip(d["tool_kind"], mm)
                d["tool_size_mm"], d["tip_from"] = mm, "this screen"
            elif what == "passes":
                if not text.strip():
                    d["passes"] = None
                else:
                    d["passes"] = self._whole(text, 1, "The number of passes")
            elif what == "spring_passes":
                d["spring_passes"] = self._whole(text, 0, "The spring passes")
        except ShoptermError as exc:
            self.say(str(exc), error=True)
            return
        self.say("")
        self.end_edit()

    @staticmethod
    def _whole(text: str, minimum: int, what: str) -> int:
        v = parse_number(text)
        if v != int(v) or v < minimum or v > 99:
            raise InvalidEntry(f"{what} must be a whole number from {minimum} to 99.")
        return int(v)

    def action_confirm(self) -> None:
        if self.app.spec is None or self.pickup is not None or self.editing:
            return
        if self.in_prep():
            self.confirm_prep()
        else:
            self.pass_cut()

    def confirm_prep(self) -> None:
        d, spec = self.draft, self.app.spec
        try:
            lim, depth, method, plan, check = prepare(spec, self.app.lathe, d)
        except ShoptermError as exc:
            self.say(str(exc), error=True)
            return
        values = {"method": method.method, "compound_angle_deg": method.true_angle_deg,
                  "compound_angle_set": method.scale_reading_deg, "tool_kind": d["tool_kind"],
                  "tool_size_mm": float(d["tool_size_mm"]),
                  "blank_od_mm": float(d["blank_od_mm"]), "plan": plan.kind,
                  "passes": plan.count, "spring_passes": len(plan.spring_passes)}
        if self.app.record_setup(values) is None:
            return
        self.force_prep = False
        self.draft = None
        self.page = 0
        self.say(f"Set-up recorded: {plan.count} passes. Read the cautions, then cut pass 1.")
        self.redraw()

    def pass_cut(self) -> None:
        cut = getattr(self, "cut", None)
        try:
            cut = cut_from_record(self.app.spec, self.app.lathe, self.app.state)
            v = cut.view()
        except ShoptermError as exc:
            self.say(str(exc), error=True)
            return
        if v.kind == "done":
            self.say("All passes are cut: + to measure over the wires, 0 for another spring "
                     "pass.")
            return
        if v.kind == "spring":
            self.say("This is a spring pass: press 0 when it is cut.")
            return
        p = cut.plan.passes[cut.done_in_plan]
        payload = {"n": self.app.state.next_pass, "radial_cum_mm": p.radial_cum,
                   "dial": v.dial_text, "infeed_mm": max(p.radial_inc, 0.0),
                   "compound_mm": abs(p.compound_cum) if cut.plan.method.method != "radial"
                   else 0.0,
                   "cross_mm": 0.0 if cut.plan.method.feeds_with == "compound" else p.radial_cum,
                   "dial_divisions": p.dial_divisions, "feeds_with": cut.plan.method.feeds_with,
                   "kind": p.kind}
        if p.side is not None:
            payload.update(side=p.side, side_divisions=p.side_divisions)
        if self.app.record("pass_cut", payload) is None:
            return
        self.page = 0
        self.say(f"Pass {payload['n']} recorded ({self.L(p.radial_cum)} radial in all).")
        self.redraw()

    def spring_pass(self) -> None:
        st = self.app.state
        try:
            v = cut_from_record(self.app.spec, self.app.lathe, st).view()
        except ShoptermError as exc:
            self.say(str(exc), error=True)
            return
        if self.app.record("spring_pass", {"radial_cum_mm": st.radial_cum_mm,
                                           "dial": v.dial_text}) is None:
            return
        self.say(f"Spring pass recorded at {self.L(st.radial_cum_mm)} radial.")
        self.redraw()

    # -- pick-up flow ------------------------------------------------------------------------
    def pickup_dials(self) -> list[str]:
        m = self.cut.plan.method
        if m.feeds_with == "compound":
            return ["compound", "cross-slide"]
        if m.method == "alternating":
            return ["cross-slide", "compound"]
        return ["cross-slide"]

    def next_pickup_entry(self) -> None:
        dials = self.pickup_dials()
        step = len(self.pickup["readings"])
        if step >= len(dials):
            self.finish_pickup()
            return
        name = dials[step]
        dial = self.cut.plan.cross_dial if name == "cross-slide" else (
            self.cut.plan.feed_dial if self.cut.plan.method.feeds_with == "compound"
            else self.cut.plan.side_dial)
        self.edit("pickup", f"{name} dial reads now (0 to {dial.divisions - 1}): ")
        self.redraw()

    def take_pickup_reading(self, text: str) -> None:
        name = self.pickup_dials()[len(self.pickup["readings"])]
        plan = self.cut.plan
        dial = plan.cross_dial if name == "cross-slide" else (
            plan.feed_dial if plan.method.feeds_with == "compound" else plan.side_dial)
        try:
            mark = parse_number(text)
            new_zero(mark, 0.0, dial)       # checks the mark is on the dial
        except ShoptermError as exc:
            self.say(str(exc), error=True)
            return
        self.pickup["readings"][name] = mark
        self.query_one("#value", LengthEntry).clear()
        self.next_pickup_entry()

    def finish_pickup(self) -> None:
        pk = self.pickup
        st = self.app.state
        payload = {"reason": pk["reason"], "radial_cum_mm": st.radial_cum_mm,
                   "dial": pickup_text(pk["readings"])}
        event = self.app.record("tool_pickup", payload)
        self.pickup = None
        self.editing = None
        self.query_one("#value", LengthEntry).clear()
        self.set_focus(None)
        if event is not None:
            self.say("New dial zeros recorded: the count goes on from here. Take a spring "
                     "pass (0) before feeding deeper.")
        self.redraw()

    # -- back / forward ----------------------------------------------------------------------
    def action_back(self) -> None:
        if self.pickup is not None:
            self.pickup = None
            self.editing = None
            self.set_focus(None)
            self.say("Pick-up cancelled: nothing recorded.")
            self.redraw()
            return
        if self.editing is not None:
            self.say("Not changed.")
            self.end_edit()
            return
        od = self.query_one("#od", LengthEntry)
        if od.has_focus and self.draft and self.draft.get("blank_od_mm") is not None:
            od.clear()
            self.set_focus(None)
            self.redraw()
            return
        if self.force_prep:
            self.force_prep = False
            self.draft = None
            self.say("Preparation unchanged.")
            self.redraw()
            return
        super().action_back()

    def action_forward(self) -> None:
        if self.editing is not None or self.pickup is not None:
            return
        self.app.goto("wires")


def tool_in_use(app) -> tuple[ToolTip, float | None, str]:
    """Return (tip, turned diameter [mm] or None, where the tip comes from) for the tool form.

    The counter's preparation draft wins (before pass 1), then the set-up in force, then the
    config.
    """
    counter = app.screen_for("counter")
    if counter.draft is not None and counter.draft_job is app.job \
            and app.spec is not None and counter.in_prep():
        d = counter.draft
        return ToolTip(d["tool_kind"], float(d["tool_size_mm"])), d.get("blank_od_mm"), \
            "the preparation"
    setup = app.setup_values()
    if setup.get("tool_kind") and setup.get("tool_size_mm") is not None:
        return ToolTip(setup["tool_kind"], float(setup["tool_size_mm"])), \
            setup.get("blank_od_mm"), "the set-up"
    return app.shop.tool, setup.get("blank_od_mm"), "the config"


def set_tool(app, tip: ToolTip) -> str | None:
    """Use ``tip`` from now on: in the counter's preparation before pass 1, else recorded as a
    set-up change. Return an error message, or None."""
    counter = app.screen_for("counter")
    if counter.draft is not None and counter.draft_job is app.job \
            and app.spec is not None and counter.in_prep():
        counter.draft.update(tool_kind=tip.kind, tool_size_mm=tip.size,
                             tip_from="the tool form")
        return None
    if app.job is None:
        return "Choose a thread first: a job starts with its thread."
    if app.record_setup({"tool_kind": tip.kind, "tool_size_mm": tip.size}) is None:
        return "The tip was not recorded (see the message)."
    return None
