"""Fit check: an internal thread tried against the mating part or a plug gauge.

Most internal threads cannot be measured over wires; the wire screen routes an internal thread
here. What was tried and what happened is recorded as a ``note`` whose text begins
``Fit check against`` (DEVELOPERS.md, three-wire measurement); the core
(``cutting.remaining.record_fit_check``) says what it means.
"""

from __future__ import annotations

from rich.text import Text
from textual.app import ComposeResult
from textual.widgets import Static

from shopterm.errors import ShoptermError
from shopterm.ui.screens.base import ShopScreen
from shopterm.ui.screens.taperview import is_tapered
from shopterm.ui.screens.wireview import CHART_ROWS
from shopterm.ui.widgets.picklist import PickList

#: Note text that marks a fit check in the record.
FIT_PREFIX = "Fit check"


class FitCheckScreen(ShopScreen):
    SCREEN_NAME = "fitcheck"
    TITLE = "Fit check"
    AUTO_FOCUS = "#fit-list"
    DEFAULT_CSS = """
    FitCheckScreen #fit-head { height: auto; padding: 0 1; }
    FitCheckScreen #chart { height: auto; padding: 0 1; }
    FitCheckScreen #message { height: auto; max-height: 3; }
    FitCheckScreen #caution { dock: bottom; margin-bottom: 1; max-height: 3; }
    """
    HELP = (("1-9", "what the thread was tried against, then what happened: recorded as a note"),
            ("-", "back to the first question; from there to the pass counter"))

    def __init__(self) -> None:
        super().__init__()
        self.against: str | None = None     # None: asking what it was tried against

    def compose_body(self) -> ComposeResult:
        yield Static("", id="fit-head")
        yield PickList(id="fit-list", columns=1)
        yield Static("", id="message", classes="message")
        yield Static("", id="chart")
        yield Static("Stop the spindle before trying a gauge or the mating part; keep the chuck "
                     "key out and hands clear of the chuck. Follow your shop's rules and the "
                     "maker's.", id="caution", classes="caution")

    def route(self) -> str:
        spec = self.app.spec
        return "wires" if spec is not None and spec.is_external else self.SCREEN_NAME

    def on_mount(self) -> None:
        self.redraw()

    def on_screen_resume(self) -> None:
        self.redraw()

    def job_changed(self) -> None:
        """The record changed under us (an undo, another thread): ask afresh."""
        self.against = None
        self.say("")
        if not self.follow_route():
            self.redraw()

    def redraw(self) -> None:
        from shopterm.cutting.remaining import FIT_CHECKS, FIT_OUTCOMES, fit_check_offer
        if not self.is_mounted:
            return
        spec = self.app.spec
        head = self.query_one("#fit-head", Static)
        picks = self.query_one("#fit-list", PickList)
        if spec is None:
            head.update("Choose a thread first: * then the Thread screen.")
            picks.display = False
            self.refresh_chrome()
            return
        head.update(Text(spec.designation, style="bold") + Text("\n" + fit_check_offer(spec)
                                                                .message))
        picks.display = True
        if self.against is None:
            extra = ([("Plug gauge stand-off (hand-tight check of the taper)", "hand_tight")]
                     if is_tapered(spec) else [])
            picks.set_items([(label, key) for key, label in FIT_CHECKS] + extra,
                            "Record a fit check against:")
        else:
            picks.set_items([(msg.split(":")[0], key)
                             for key, (_, msg) in FIT_OUTCOMES[self.against].items()],
                            "What happened?")
        picks.focus()
        notes = [n for n in (self.app.state.notes if self.app.state else ())
                 if n.text.startswith(FIT_PREFIX)]
        chart = self.query_one("#chart", Static)
        chart.display = bool(notes)
        chart.update(Text("\n").join([Text("fit checks so far", style="bold")]
                                     + [Text(n.text) for n in notes[-CHART_ROWS:]]))
        self.refresh_chrome()

    def on_pick_list_picked(self, event: PickList.Picked) -> None:
        from shopterm.cutting.remaining import FIT_CHECKS, record_fit_check
        if event.value == "hand_tight":
            self.app.goto("handtight")
            return
        if self.against is None:
            self.against = event.value
            self.redraw()
            return
        try:
            check = record_fit_check(self.against, event.value)
        except ShoptermError as exc:
            self.say(str(exc), error=True)
            return
        against = dict(FIT_CHECKS)[check.against].removeprefix("Try ")
        text = f"{FIT_PREFIX} against {against}: {check.message}"
        if self.app.record("note", {"text": text}) is None:
            self.say("The fit check was not recorded (see the message above); pick it again.",
                     error=True)
            return
        self.against = None
        self.redraw()
        self.say(check.message, error=check.state == "past")

    def key_hints(self) -> list[tuple[str, str]]:
        return [("1-9", "pick"), ("-", "counter" if self.against is None else "back"),
                ("/", "undo"), ("*", "menu"), ("F1", "help")]

    def action_back(self) -> None:
        if self.against is not None:
            self.against = None
            self.say("")
            self.redraw()
            return
        self.app.goto("counter")

    def action_forward(self) -> None:
        self.app.goto("counter")
