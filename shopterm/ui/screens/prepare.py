"""Prepare the cut: the turned size, the tool tip, the infeed method and the pass plan.

What is typed here is a draft until Enter confirms it; then it is recorded as the set-up
(``cut_state.prepared_setup``) and the pass counter takes over. Before pass 1 the counter's 2
comes back here to change it; after pass 1 a change goes through the set-up (the counter replans
from the depth reached).
"""

from __future__ import annotations

from rich.text import Text
from textual.app import ComposeResult
from textual.containers import Horizontal, Vertical
from textual.widgets import Static

from shopterm.cutting.cut_state import (default_draft, is_prepared, power_tool_for, prepare,
                                       prepared_setup, turned_depth)
from shopterm.cutting.infeed import METHODS, infeed_method
from shopterm.cutting.plan import BORING_CAUTIONS, PLAN_KINDS, SETUP_CAUTIONS, bore_to_prepare
from shopterm.cutting.tool import standard_tip
from shopterm.cutting.wires import is_power_form
from shopterm.errors import InvalidEntry, ShoptermError
from shopterm.lathe.machine import ToolTip
from shopterm.standards import limits as thread_limits
from shopterm.ui import keys
from shopterm.ui.screens.cutview import METHOD_NAMES, CutScreen, LengthEntry
from shopterm.ui.screens.taperview import blank_entry, is_tapered
from shopterm.ui.widgets.entry import KeypadEntry
from shopterm.ui.widgets.picklist import PickList
from shopterm.units import parse_length, parse_number


def cut_stage(app) -> str:
    """Return the screen the cut is at: 'prepare' until the set-up in force has what the
    counter needs (or while the preparation is being changed before pass 1), else 'counter'."""
    if not is_prepared(app.setup_values()):
        return "prepare"            # also when passes were recorded without a set-up
    if app.state is not None and app.state.passes:
        return "counter"
    return "prepare" if app.screen_for("prepare").changing() else "counter"


class PrepareScreen(CutScreen):
    SCREEN_NAME = "prepare"
    TITLE = "Prepare the cut"
    BINDINGS = [keys.bind(keys.CONFIRM, "confirm", "confirm", show=False),
                *keys.digit_keys("digit")]
    HELP = (("1", "the turned size: the blank's OD (a bore for an internal thread)"),
            ("2 3", "tip: flat or radius, and its size"),
            ("4", "infeed method (radial, flank, modified flank, alternating flank)"),
            ("5 6 7", "plan (constant area / equal), passes, spring passes"),
            ("Enter", "confirm: recorded as the set-up; the pass counter shows pass 1"),
            ("8", "the tool form (profiles, interference, root rules)"),
            ("9", "next page of cautions and notes"),
            ("-", "back (while changing before pass 1: leave it as it was)"))

    DEFAULT_CSS = """
    PrepareScreen #prep { height: auto; padding: 0 1; }
    PrepareScreen #od-row { height: 1; padding: 0 1; }
    PrepareScreen #od { width: 34; padding: 0 0; }
    PrepareScreen #od-hint { width: 1fr; color: $text-muted; }
    PrepareScreen #methods { height: auto; min-height: 2; }
    """

    def __init__(self) -> None:
        super().__init__()
        self.draft: dict | None = None
        self.draft_job: object = None
        self.editing: str | None = None     # which value #value is taking, or 'method'
        self._changing_job: object = None    # the job whose preparation is being changed

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
        with Horizontal(id="value-row"):
            yield Static("", id="value-label")
            yield LengthEntry(id="value")
        with Vertical(id="notes"):
            yield PickList(id="methods", columns=2)
            yield Static("", id="message", classes="message")
            yield Static("", id="extra")

    # -- where the cut is --------------------------------------------------------------------
    def route(self) -> str:
        return cut_stage(self.app) if self.app.spec is not None else self.SCREEN_NAME

    def changing(self) -> bool:
        """Return whether the preparation of the open job is being changed (counter's 2)."""
        return self.app.job is not None and self._changing_job is self.app.job

    def change(self) -> None:
        """Open the recorded preparation again to change it before pass 1."""
        self._changing_job = self.app.job
        self.draft = None
        self.say("Change what you need, then Enter confirms again.")

    def draft_in_use(self) -> bool:
        """Return whether this screen's draft is what the job will cut with (before pass 1)."""
        return (self.draft is not None and self.draft_job is self.app.job
                and self.app.spec is not None and cut_stage(self.app) == "prepare")

    def ensure_draft(self) -> None:
        if self.draft is None or self.draft_job is not self.app.job:
            self.draft = default_draft(self.app.shop.tool, self.app.setup_values(),
                                       thread_limits(self.app.spec))
            self.draft_job = self.app.job

    def job_changed(self) -> None:
        """Called after an undo: the record changed under the screen."""
        self.editing = None
        self.redraw()

    # -- drawing -----------------------------------------------------------------------------
    def redraw(self) -> None:
        if not self.is_mounted:
            return
        if self.no_thread():
            self.show(("#od-row", "#prep", "#value-row", "#methods"), False)
        else:
            self.show(("#od-row", "#prep"), True)
            self.show(("#value-row",), self.editing not in (None, "method"))
            self.show(("#methods",), self.editing == "method")
            self.draw_prep()
        self.refresh_chrome()

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
        if is_tapered(spec):
            od.prompt, hint, _text = blank_entry(lim, u, self.L)
        elif internal:
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
        where = (f"standard for {spec.designation}" if d["tip_from"] == "standard"
                 else f"from {d['tip_from']}")
        lines.append(f"{'flat width' if tip_kind == 'flat' else 'nose radius'} "
                     f"{self.L(d['tool_size_mm'])} ({where})\n")
        try:
            lim, depth, method, plan, check = prepare(spec, self.app.lathe, d)
        except ShoptermError as exc:
            self.draw_unplanned(lines, d, internal, exc)
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
        power = self.power_tool_line(lim, d, depth.aim_pd)
        if power is not None:
            lines.append("\n")
            lines.append_text(power)
        self.query_one("#prep", Static).update(lines)
        used = 3 + 4 + (2 if len(first) > self.width() - 20 else 1) + 1
        used += 0 if power is None else (2 if power.cell_len > self.width() else 1)
        used += 1 if self.editing not in (None, "method") else 0
        used += 3 if self.editing == "method" else 0
        items = self.caution_items(plan, internal) + list(depth.notes)
        self.draw_extra(items, self.rows_left(used), caution=True,
                        title="Before the first pass · Enter confirms and starts pass 1")

    def power_tool_line(self, lim, d: dict, aim_pd: float) -> Text | None:
        """Return the power thread's tool line (helix and side clearances, or why the tool is
        refused and what to do), None for any other thread."""
        try:
            tool = power_tool_for(lim, d, self.app.shop.tool_side_clearance_deg, aim_pd)
        except ShoptermError as exc:
            what = ("press 2 for a flat tip" if d["tool_kind"] != "flat"
                    else "3 changes the flat, 8 shows the form")
            return Text(f"Tool refused: {exc} ({what})", style="bold red")
        if tool is None:
            return None
        out = Text("Helix ", style="bold")
        out.append(f"{tool.helix_minor_deg:.1f}° minor, {tool.helix_major_deg:.1f}° major · "
                   f"side clearance: leading {tool.leading_deg:.1f}°, trailing "
                   f"{tool.trailing_deg:.1f}°")
        return out

    def draw_unplanned(self, lines: Text, d: dict, internal: bool, exc: ShoptermError) -> None:
        """Draw the choices as they stand and what stops a plan (e.g. no turned size yet)."""
        spec = self.app.spec
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
        power = self.power_tool_line(thread_limits(spec), d, None)
        if power is not None:
            lines.append("\n")
            lines.append_text(power)
        self.query_one("#prep", Static).update(lines)
        self.draw_extra(self.caution_items(None, internal),
                        self.rows_left(9 + (0 if power is None else 1)),
                        caution=True, title="Before the first pass")

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
        items = list(plan.cautions if plan is not None else
                     SETUP_CAUTIONS + (BORING_CAUTIONS if internal else ()))
        lim = thread_limits(self.app.spec)
        if is_tapered(self.app.spec):
            items.insert(0, blank_entry(lim, self.unit, self.L)[2])
        elif internal:
            items.insert(0, bore_to_prepare(lim).text)
        return items

    # -- keys --------------------------------------------------------------------------------
    def key_hints(self) -> list[tuple[str, str]]:
        if self.editing is not None:
            return [("Enter", "accept"), ("-", "cancel"), ("Bksp", "delete"), ("F1", "help")]
        if self.app.spec is None:
            return [("*", "menu"), ("F1", "help")]
        return [("Enter", "confirm"), ("1-7", "change"), ("8", "tool form"),
                ("+", "wires"), ("/", "undo"), ("-", "back"), ("*", "menu")] + (
                    [("9", "more")] if self.pages > 1 else [])

    def action_digit(self, n: int) -> None:
        if self.app.spec is None or self.editing == "method":
            return
        if n == 8:
            self.app.goto("toolform")
        elif n == 9:
            self.next_page()
        elif 1 <= n <= 7:
            self.change_value(n)

    def change_value(self, n: int) -> None:
        d = self.draft
        if n == 1:
            od = self.query_one("#od", LengthEntry)
            od.clear()
            od.focus()
            self.say("Type the measured size, then Enter.")
        elif n == 2:
            d["tool_kind"] = "flat" if d["tool_kind"] == "radius" else "radius"
            d["tip_from"] = "this screen"
            self.power_flat(d)
            self.say(f"Tip: {d['tool_kind']} (3 changes its size).")
        elif n == 3:
            size = "flat width" if d["tool_kind"] == "flat" else "nose radius"
            self.edit("tool_size_mm", f"3 tip {size} [{self.unit}]: ")
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
        self.redraw()

    def power_flat(self, d: dict) -> None:
        """A power thread's tip turned to a flat starts at the standard's flat (back to a
        radius: the config's)."""
        lim, shop_tip = thread_limits(self.app.spec), self.app.shop.tool
        if not is_power_form(lim.spec.form):
            return
        if d["tool_kind"] == "flat":
            d["tool_size_mm"], d["tip_from"] = standard_tip(lim).size, "standard"
        elif shop_tip.kind == "radius":
            d["tool_size_mm"], d["tip_from"] = shop_tip.size, "config"

    def on_pick_list_picked(self, event: PickList.Picked) -> None:
        if self.editing == "method":
            self.draft["method"] = event.value
            self.say(f"Infeed: {METHOD_NAMES[event.value]}.")
            self.end_edit()

    def on_keypad_entry_submitted(self, event: KeypadEntry.Submitted) -> None:
        event.stop()
        if event.entry.id == "od":
            self.take_od(event.value)
        elif self.editing:
            self.take_value(self.editing, event.value)

    def take_od(self, text: str) -> None:
        d = self.draft
        try:
            mm = parse_length(text, self.unit)
            turned_depth(thread_limits(self.app.spec), d, mm,
                         ToolTip(d["tool_kind"], float(d["tool_size_mm"])))
        except ShoptermError as exc:
            self.say(str(exc), error=True)          # the text stays in the entry to correct
            return
        d["blank_od_mm"] = mm
        self.query_one("#od", LengthEntry).clear()
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
                d["passes"] = (self._whole(text, 1, "The number of passes") if text.strip()
                               else None)
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
        if self.app.spec is None or self.editing:
            return
        try:
            values = prepared_setup(self.app.spec, self.app.lathe, self.draft)
        except ShoptermError as exc:
            self.say(str(exc), error=True)
            return
        if self.app.record_setup(values) is None:
            return
        self._changing_job = None
        self.draft = None
        self.say("")
        counter = self.app.screen_for("counter")
        counter.page = 0
        self.app.goto("counter")
        counter.say(f"Set-up recorded: {values['passes']} passes. Read the cautions, then cut "
                    "pass 1.")

    def action_back(self) -> None:
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
        if self.changing():
            self._changing_job = None
            self.draft = None
            self.say("")
            self.app.goto("counter")
            self.app.screen_for("counter").say("Preparation unchanged.")
            return
        super().action_back()

    def action_forward(self) -> None:
        if self.editing is None:
            super().action_forward()


def tool_in_use(app) -> tuple[ToolTip, float | None, str]:
    """Return (tip, turned diameter [mm] or None, where the tip comes from) for the tool form.

    The preparation's draft wins (before pass 1), then the set-up in force, then the config.
    """
    prep = app.screen_for("prepare")
    if prep.draft_in_use():
        d = prep.draft
        return ToolTip(d["tool_kind"], float(d["tool_size_mm"])), d.get("blank_od_mm"), \
            "the preparation"
    setup = app.setup_values()
    if setup.get("tool_kind") and setup.get("tool_size_mm") is not None:
        return ToolTip(setup["tool_kind"], float(setup["tool_size_mm"])), \
            setup.get("blank_od_mm"), "the set-up"
    return app.shop.tool, setup.get("blank_od_mm"), "the config"


def set_tool(app, tip: ToolTip) -> str | None:
    """Use ``tip`` from now on: in the preparation's draft before pass 1, else recorded as a
    set-up change. Return an error message, or None."""
    prep = app.screen_for("prepare")
    if prep.draft_in_use():
        prep.draft.update(tool_kind=tip.kind, tool_size_mm=tip.size, tip_from="the tool form")
        return None
    if app.job is None:
        return "Choose a thread first: a job starts with its thread."
    if app.record_setup({"tool_kind": tip.kind, "tool_size_mm": tip.size}) is None:
        return "The tip was not recorded (see the message)."
    return None
