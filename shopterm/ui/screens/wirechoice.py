"""Choose the wire: an owned set that fits this pitch, or a size typed as measured.

Reached from the wire reading screen (Enter on an empty entry). The core checks the wire
(``cutting.wires.require_wire``: a refusal names the owned sets that would work); the choice is
recorded as the set-up's ``wire_mm`` and the reading screen comes back.
"""

from __future__ import annotations

from rich.text import Text
from textual.app import ComposeResult
from textual.containers import Horizontal
from textual.widgets import Static

from shopterm.errors import ShoptermError
from shopterm.ui import keys
from shopterm.ui.screens.base import ShopScreen
from shopterm.ui.screens.cutview import LengthEntry
from shopterm.ui.screens.wireview import fmt, wire_in_use, wire_label
from shopterm.ui.widgets.entry import KeypadEntry
from shopterm.ui.widgets.picklist import PickList


class WireChoiceScreen(ShopScreen):
    SCREEN_NAME = "wirechoice"
    TITLE = "Choose the wire"
    AUTO_FOCUS = "#wire-list"
    DEFAULT_CSS = """
    WireChoiceScreen #choice-head { height: auto; padding: 0 1; }
    WireChoiceScreen #size-row { height: 1; display: none; }
    WireChoiceScreen #message { height: auto; max-height: 3; }
    """
    BINDINGS = [keys.bind(keys.FORWARD, "forward", "readings", show=False)]
    HELP = (("1-9", "pick a wire set that fits this pitch, or 'type a measured size'"),
            ("Enter", "with a size typed: check it and use it"),
            ("-", "back to the readings (the size entry: back to the list)"))

    def __init__(self) -> None:
        super().__init__()
        self.typing = False                  # the size entry is open

    def compose_body(self) -> ComposeResult:
        yield Static("", id="choice-head")
        yield PickList(id="wire-list", columns=2)
        with Horizontal(id="size-row"):
            yield LengthEntry(id="wire-size")
        yield Static("", id="message", classes="message")

    def route(self) -> str:
        spec = self.app.spec
        return "fitcheck" if spec is not None and not spec.is_external else self.SCREEN_NAME

    def on_mount(self) -> None:
        self.redraw()

    def on_screen_resume(self) -> None:
        self.typing = False
        self.say("")
        self.redraw()

    def job_changed(self) -> None:
        self.redraw()

    def items(self) -> list[tuple[str, object]]:
        """Return the owned sets that fit, best first (or the best size), then 'type' (and
        the gear-tooth caliper for a trapezoidal or Acme thread)."""
        from shopterm.cutting.wires import is_power_form, wire_range
        spec = self.app.spec
        rng = wire_range(spec.form, spec.pitch)
        owned = sorted((w for w in self.app.shop.wires if rng.fits(w.size)),
                       key=lambda w: abs(w.size - rng.best))
        out: list[tuple[str, object]] = [(wire_label(self.app, w.size), w.size) for w in owned]
        if not owned:
            out.append((f"best size {fmt(self.app, rng.best)}", rng.best))
        out.append(("type a measured size", "type"))
        if is_power_form(spec.form):
            out.append(("gear-tooth caliper (thickness at the pitch line)", "caliper"))
        return out

    def redraw(self) -> None:
        from shopterm.cutting.wires import wire_range
        if not self.is_mounted:
            return
        spec, app = self.app.spec, self.app
        head = self.query_one("#choice-head", Static)
        picks = self.query_one("#wire-list", PickList)
        if spec is None:
            head.update("Choose a thread first: * then the Thread screen.")
            picks.display = False
            self.refresh_chrome()
            return
        _size, now, _problem = wire_in_use(app)
        head.update(Text(spec.designation, style="bold") + Text(f"  wire in use {now}"))
        rng = wire_range(spec.form, spec.pitch)
        picks.display = not self.typing
        picks.set_items(self.items()[:9],
                        f"Wire sets that fit (best {fmt(app, rng.best)}, "
                        f"{fmt(app, rng.smallest, False)}–{fmt(app, rng.largest)})")
        self.query_one("#size-row").display = self.typing
        entry = self.query_one("#wire-size", LengthEntry)
        entry.prompt = f"Wire size as measured [{app.shop.display_units}]: "
        (entry if self.typing else picks).focus()
        self.refresh_chrome()

    def on_pick_list_picked(self, event: PickList.Picked) -> None:
        if event.value == "caliper":
            if self.app.record_setup({"measure_with": "caliper"}) is not None:
                self.app.goto("caliper")
            return
        if event.value == "type":
            self.typing = True
            self.query_one("#wire-size", LengthEntry).clear()
            self.redraw()
            self.say("Type the wire diameter as your micrometer reads it, then Enter.")
            return
        self.use_wire(float(event.value))

    def on_keypad_entry_changed(self, event: KeypadEntry.Changed) -> None:
        event.stop()

    def on_keypad_entry_submitted(self, event: KeypadEntry.Submitted) -> None:
        from shopterm.units import parse_positive_length
        event.stop()
        text = event.value.strip()
        if not text:
            self.app.goto("wires")              # nothing typed: the wire stays as it was
            return
        try:
            size = parse_positive_length(text, self.app.shop.display_units, "wire diameter")
        except ShoptermError as exc:
            self.say(str(exc), error=True)          # the text stays in the entry to correct
            return
        self.use_wire(size)

    def use_wire(self, size: float) -> None:
        """Check ``size`` [mm] against this pitch, record it in the set-up, back to readings."""
        from shopterm.cutting.wires import require_wire
        spec = self.app.spec
        try:
            require_wire(spec.form, spec.pitch, size, self.app.shop.wires,
                         self.app.shop.display_units)
        except ShoptermError as exc:
            self.say(str(exc), error=True)
            return
        from shopterm.cutting.wires import is_power_form
        values = {"wire_mm": size}
        if is_power_form(spec.form):
            values["measure_with"] = "wires"        # not the caliper (``caliper.uses_caliper``)
        if self.app.record_setup(values) is None:
            self.say("The wire was not changed (see the message above).", error=True)
            return
        self.app.goto("wires")
        self.app.screen_for("wires").say(f"Wire {wire_label(self.app, size)} recorded in the "
                                         "set-up.")

    def key_hints(self) -> list[tuple[str, str]]:
        if self.typing:
            return [("Enter", "use this wire"), ("-", "cancel"), ("*", "menu"), ("F1", "help")]
        return [("1-9", "pick wire"), ("-", "cancel"), ("/", "undo"), ("*", "menu"),
                ("F1", "help")]

    def action_back(self) -> None:
        if self.typing:
            self.typing = False
            self.say("")
            self.redraw()
            return
        self.app.goto("wires")

    def action_forward(self) -> None:
        self.app.goto("wires")
