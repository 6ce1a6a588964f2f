"""Pick the thread up again: after the tool was reground or re-set, or the work remounted.

The steps set the tool back into the groove; the dial readings typed there become the new
zeros (recorded as one ``tool_pickup`` entry once every dial is read) and the pass counter goes
on where it stopped. Nothing is recorded until the last reading: ``-`` leaves it as it was.
"""

from __future__ import annotations

from rich.text import Text
from textual.app import ComposeResult
from textual.containers import Horizontal, Vertical
from textual.widgets import Static

from shopterm.cutting.cut_state import (PICKUP_REASONS, Cut, check_pickup_mark, cut_from_record,
                                        pickup_text)
from shopterm.cutting.pickup import pickup_steps
from shopterm.errors import ShoptermError
from shopterm.ui import keys
from shopterm.ui.screens.cutview import CutScreen, DialSetting, LengthEntry, wrap_lines
from shopterm.ui.screens.prepare import cut_stage
from shopterm.ui.widgets.entry import KeypadEntry


class PickupScreen(CutScreen):
    SCREEN_NAME = "pickup"
    TITLE = "Pick up the thread"
    BINDINGS = [*keys.digit_keys("digit")]
    HELP = (("1 2", "why: 1 the tool was reground, 2 the thread is picked up again (tool "
                    "re-set, work remounted)"),
            ("Enter", "take the dial reading typed; after the last one the new zeros are "
                      "recorded and the pass counter goes on"),
            ("9", "next page of the steps"),
            ("-", "cancel: nothing is recorded, back to the pass counter"))

    def __init__(self) -> None:
        super().__init__()
        self.reason: str | None = None
        self.readings: dict[str, float] = {}
        self.editing: str | None = None
        self.cut: Cut | None = None

    def compose_body(self) -> ComposeResult:
        yield Static("", id="head")
        with Vertical(id="work"):
            yield DialSetting(id="pk-dial", digits_id="pk-big", text_id="pk-text")
        with Horizontal(id="value-row"):
            yield Static("", id="value-label")
            yield LengthEntry(id="value")
        with Vertical(id="notes"):
            yield Static("", id="message", classes="message")
            yield Static("", id="extra")

    def route(self) -> str:
        if self.app.spec is not None and cut_stage(self.app) == "prepare":
            return "prepare"
        return self.SCREEN_NAME

    def on_screen_resume(self) -> None:
        self.start()

    def start(self) -> None:
        """Begin a pick-up afresh: nothing chosen, nothing read."""
        self.reason, self.readings, self.editing, self.page = None, {}, None, 0
        if not self.is_mounted:
            return
        self.query_one("#value", LengthEntry).clear()
        self.set_focus(None)
        self.say("")

    def job_changed(self) -> None:
        """Called after an undo: what was read belongs to the cut before it; start again."""
        self.leave("")

    def leave(self, message: str) -> None:
        """Drop the pick-up in progress and go back to the counter, telling it ``message``."""
        self.start()
        self.app.goto("counter")
        if message:
            self.app.screen_for("counter").say(message)

    # -- drawing -----------------------------------------------------------------------------
    def redraw(self) -> None:
        if not self.is_mounted:
            return
        if self.no_thread():
            self.show(("#pk-dial", "#value-row"), False)
        else:
            self.draw_pickup()
        self.refresh_chrome()

    def draw_pickup(self) -> None:
        try:
            self.cut = cut = cut_from_record(self.app.spec, self.app.lathe, self.app.state)
        except ShoptermError as exc:
            self.query_one("#head", Static).update(Text(f"The set-up cannot make a plan: {exc}",
                                                        style="bold"))
            self.show(("#pk-dial", "#value-row"), False)
            self.query_one("#extra", Static).update("")
            return
        self.show(("#pk-dial",), True)
        self.show(("#value-row",), self.editing is not None)
        steps = pickup_steps(cut.plan.method, cut.plan.internal)
        first = 1
        if self.reason is None:
            title = "Pick up: 1 tool reground, 2 thread picked up again · - cancels"
        else:
            title = (f"Pick up ({self.reason.replace('_', ' ')}): with the tool back in the "
                     "groove, enter the dial readings")
            first = len(steps) - 2
        self.query_one("#head", Static).update(Text(title, style="bold"))
        self.draw_setting(cut)
        used = 1 + 3 + 1 + (1 if self.editing else 0)
        lines = []
        for i, step in enumerate(steps[first - 1:], first):
            lines += wrap_lines([step], self.width() - 1, bullet=f"{i}. ")
        self.draw_extra(lines, self.rows_left(used) + 1, caution=False, wrapped=True)

    def draw_setting(self, cut: Cut) -> None:
        """Big digits: the cross-slide's return mark to set (compound feeding), else the mark
        the feeding dial stood at for the last pass (to compare with once it is back)."""
        view = cut.view()
        text = Text()
        if cut.feed_name == "compound":
            big = f"{view.return_mark:g}"
            text.append(f"CROSS-SLIDE: set its return mark {big}\n", style="bold")
            text.append(f"({view.return_text}; the compound feeds)")
        elif (last := cut.last_setting()) is not None:
            turns, mark, count = last
            big = f"{mark:g}"
            text.append(f"CROSS-SLIDE stood at mark {big} for the last pass\n", style="bold")
            text.append(f"({count:g} div from the zero"
                        + (f", {turns} full turn{'s' if turns != 1 else ''}" if turns else "")
                        + "; the new zero keeps that count)")
        else:
            big = "--"
            text.append("No pass cut yet: the readings set the zero of pass 1.", style="bold")
        self.query_one("#pk-dial", DialSetting).show(big, text)

    # -- keys --------------------------------------------------------------------------------
    def key_hints(self) -> list[tuple[str, str]]:
        more = [("9", "more")] if self.pages > 1 else []
        if self.editing is not None:
            return [("Enter", "accept"), ("-", "cancel"), ("Bksp", "delete"), ("F1", "help")]
        if self.app.spec is None:
            return [("*", "menu"), ("F1", "help")]
        return [("1", "reground"), ("2", "picked up"), ("-", "cancel"), ("F1", "help")] + more

    def action_digit(self, n: int) -> None:
        if self.app.spec is None or self.cut is None:
            return
        if n == 9:
            self.next_page()
        elif self.reason is None and n in (1, 2):
            self.reason = PICKUP_REASONS[n - 1][0]
            self.next_entry()

    def next_entry(self) -> None:
        """Ask for the next dial's reading, or record the pick-up once all are read."""
        dials = self.cut.pickup_dials()
        if len(self.readings) >= len(dials):
            self.finish()
            return
        name, dial = dials[len(self.readings)]
        self.edit("pickup", f"{name} dial reads now (0 to {dial.divisions - 1}): ")
        self.redraw()

    def on_keypad_entry_submitted(self, event: KeypadEntry.Submitted) -> None:
        event.stop()
        if self.editing is None:
            return
        name, dial = self.cut.pickup_dials()[len(self.readings)]
        try:
            mark = check_pickup_mark(event.value, dial)
        except ShoptermError as exc:
            self.say(str(exc), error=True)          # the text stays in the entry to correct
            return
        self.readings[name] = mark
        self.query_one("#value", LengthEntry).clear()
        self.say("")
        self.next_entry()

    def finish(self) -> None:
        payload = {"reason": self.reason, "radial_cum_mm": self.app.state.radial_cum_mm,
                   "dial": pickup_text(self.readings)}
        event = self.app.record("tool_pickup", payload)
        # one line at 80 columns (the message line is one line high)
        self.leave("New dial zeros recorded. Take a spring pass (0) before feeding deeper."
                   if event is not None else "")

    def action_back(self) -> None:
        self.leave("Pick-up cancelled: nothing recorded.")

    def action_forward(self) -> None:
        """Nothing: a pick-up is finished by its readings or cancelled with -."""
