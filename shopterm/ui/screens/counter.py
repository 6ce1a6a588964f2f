"""The pass counter: which mark to set for the next pass, and Enter when it is cut.

Everything on this screen is drawn from the job record (``app.state``) through
``cutting.cut_state.cut_from_record``: the set-up in force gives the plan, the passes cut say
where the count is, a wire reading replans the rest from the measured pitch diameter, a tool
pick-up gives the dials new zeros. After a restart the counter is exactly where it was. Until
the cut is prepared the counter sends the user to the preparation (``route``).
"""

from __future__ import annotations

from rich.text import Text
from textual.app import ComposeResult
from textual.containers import Vertical
from textual.widgets import ProgressBar, Static

from shopterm.cutting.cut_state import Cut, cut_from_record
from shopterm.errors import ShoptermError
from shopterm.ui import keys
from shopterm.ui.screens.cutview import METHOD_NAMES, CutScreen, DialSetting
from shopterm.ui.screens.prepare import cut_stage

CUT_PARTS = ("#dial-row", "#cut-info", "#bar", "#next")


class CounterScreen(CutScreen):
    SCREEN_NAME = "counter"
    TITLE = "Pass counter"
    BINDINGS = [keys.bind(keys.CONFIRM, "confirm", "confirm", show=False),
                *keys.digit_keys("digit")]
    HELP = (("Enter", "the pass shown has just been cut"),
            ("0", "a spring pass (no feed) has just been cut"),
            ("1", "tool reground / thread picked up: set back in the groove, new dial zeros"),
            ("2", "before pass 1: change the preparation"),
            ("8", "the tool form (profiles, interference, root rules)"),
            ("9", "next page of cautions and notes"),
            ("/", "undo the last entry (asks first)"),
            ("+", "measure over the wires; the rest of the plan follows the reading"))

    DEFAULT_CSS = """
    CounterScreen #cut-info { height: auto; padding: 0 1; }
    CounterScreen #bar { height: 1; padding: 0 1; }
    CounterScreen #bar Bar { width: 1fr; }
    CounterScreen #next { height: auto; padding: 0 1; text-style: bold; }
    """

    def __init__(self) -> None:
        super().__init__()
        self.cut: Cut | None = None          # the cut as last drawn

    def compose_body(self) -> ComposeResult:
        yield Static("", id="head")
        with Vertical(id="work"):
            yield DialSetting(id="dial-row", digits_id="dial-big", text_id="dial-text")
            yield Static("", id="cut-info")
            yield ProgressBar(total=1.0, show_eta=False, show_percentage=True, id="bar")
            yield Static("", id="next")
        with Vertical(id="notes"):
            yield Static("", id="message", classes="message")
            yield Static("", id="extra")

    def route(self) -> str:
        return cut_stage(self.app) if self.app.spec is not None else self.SCREEN_NAME

    def job_changed(self) -> None:
        """Called after an undo: the record changed under the screen (it may be unprepared)."""
        if not self.follow_route():
            self.redraw()

    # -- drawing -----------------------------------------------------------------------------
    def redraw(self) -> None:
        if not self.is_mounted:
            return
        if self.no_thread():
            self.show(CUT_PARTS, False)
        elif cut_stage(self.app) == "counter":
            self.draw_cut()
        self.refresh_chrome()

    def draw_cut(self) -> None:
        app, spec = self.app, self.app.spec
        try:
            cut = cut_from_record(spec, app.lathe, app.state)
            v = cut.view()
        except ShoptermError as exc:
            self.query_one("#head", Static).update(Text(f"The set-up cannot make a plan: {exc} "
                                                        "Undo (/) the last change.",
                                                        style="bold"))
            self.show(CUT_PARTS, False)
            self.query_one("#extra", Static).update("")
            return
        self.show(CUT_PARTS, True)
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
        mark_text = f"{v.dial_mark:g}" if v.kind != "done" else "--"
        tpd = plan.feed_dial.travel_per_division
        turns = ("in the first turn" if v.dial_turns == 0 else
                 f"after {v.dial_turns} full turn{'s' if v.dial_turns != 1 else ''} from zero")
        dt = Text()
        dt.append(f"{cut.feed_name.upper()} dial: set mark {mark_text}\n", style="bold")
        dt.append(f"{turns} ({v.dial_divisions:g} div from the zero,"
                  f" {self.L(v.dial_divisions * tpd)} travel)\n")
        if v.side is not None:
            dt.append_text(self.side_shift_line(v))
        elif spec.starts > 1 and v.kind != "done":
            dt.append(f"cut all {spec.starts} starts at this setting before feeding deeper")
        self.query_one("#dial-row", DialSetting).show(mark_text, dt)
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
        used = 2 + 1 + 3 + 2 + 1 + (2 if len(nxt) > self.width() - 8 else 1) + 1
        used += 1 if cut.replanned_from else 0
        if not app.state.passes:
            items = list(v.cautions) + list(cut.depth.notes)
            self.draw_extra(items, self.rows_left(used), caution=True,
                            title="Before the first pass")
        else:
            items = [n for n in plan.notes if not n.startswith("No lathe")]
            cautions = [c for c in v.cautions if "past its limit" in c]
            items = cautions + [cut.plan_counts()] + items[-3:]
            if not cut.check.ok:
                items.append("Tool check fails: 8 shows why.")
            self.draw_extra(items, self.rows_left(used), caution=bool(cautions))

    def side_shift_line(self, v) -> Text:
        """Return the compound's side shift for an alternating-flank pass, on one line."""
        pos = v.side_shift
        where = ("at its zero" if abs(pos) < 1e-9 else
                 f"{self.L(abs(pos))} {'right' if pos > 0 else 'left'} of its zero")
        out = Text(f"COMPOUND: shift {v.side} to mark {v.side_mark:g}", style="bold")
        out.append(f" ({where})")
        return out

    # -- keys --------------------------------------------------------------------------------
    def key_hints(self) -> list[tuple[str, str]]:
        if self.app.spec is None:
            return [("*", "menu"), ("F1", "help")]
        hints = [("Enter", "pass cut"), ("0", "spring"), ("1", "pick up"), ("8", "tool"),
                 ("+", "wires"), ("/", "undo"), ("*", "menu")]
        if not self.app.state.passes:
            hints.insert(3, ("2", "change"))
        return hints

    def action_digit(self, n: int) -> None:
        if self.app.spec is None:
            return
        if n == 0:
            self.spring_pass()
        elif n == 1:
            self.say("")
            self.app.goto("pickup")
        elif n == 2 and not self.app.state.passes:
            self.app.screen_for("prepare").change()
            self.app.goto("prepare")
        elif n == 8:
            self.app.goto("toolform")
        elif n == 9:
            self.next_page()

    def action_confirm(self) -> None:
        if self.app.spec is None:
            return
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
        payload = cut.pass_entry(self.app.state.next_pass, v.dial_text)
        if self.app.record("pass_cut", payload) is None:
            return
        self.page = 0
        self.say(f"Pass {payload['n']} recorded ({self.L(payload['radial_cum_mm'])} radial "
                 "in all).")
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

    def action_forward(self) -> None:
        self.app.goto("wires")
