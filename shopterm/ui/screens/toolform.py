"""The tool form: the thread this tip cuts against its mating thread, drawn in console glyphs,
with the interference, the largest clearing radius and the root-rule verdicts. For a power
thread (trapezoidal, Acme) the flat-nosed tool's helix angles and side clearances stand beside
the picture (``shopterm.cutting.tool.power_tool``)."""

from __future__ import annotations

from rich.text import Text
from textual.app import ComposeResult
from textual.containers import Horizontal
from textual.widgets import Static

from shopterm.cutting.tool import BOLT, BOTH, NUT, PITCH_LINE, check_tool, power_tool
from shopterm.cutting.wires import is_power_form
from shopterm.errors import ShoptermError
from shopterm.lathe.machine import ToolTip
from shopterm.standards import limits as thread_limits
from shopterm.ui import keys
from shopterm.ui.screens.base import ShopScreen
from shopterm.ui.screens.cutview import LengthEntry, wrap_lines
from shopterm.ui.screens.prepare import set_tool, tool_in_use
from shopterm.ui.widgets.entry import KeypadEntry
from shopterm.units import format_length, parse_length


class ToolFormScreen(ShopScreen):
    SCREEN_NAME = "toolform"
    AUTO_FOCUS = ""
    TITLE = "Tool form"
    BINDINGS = [*keys.digit_keys("digit")]
    HELP = (("1", "type a new tip size (flat width or nose radius); Enter uses it"),
            ("2", "switch the tip between a flat and a nose radius"),
            ("-", "back to the pass counter"))

    DEFAULT_CSS = """
    ToolFormScreen { overflow: hidden; }
    ToolFormScreen #tf-head { height: 1; padding: 0 1; text-style: bold; }
    ToolFormScreen #tf-art { height: auto; }
    ToolFormScreen #tf-picture { height: auto; width: 1fr; padding: 0 1; }
    ToolFormScreen #tf-side { height: auto; width: auto; padding: 0 1 0 0; display: none; }
    ToolFormScreen #tf-numbers { height: auto; padding: 0 1; }
    ToolFormScreen #tf-verdicts { height: auto; padding: 0 1; }
    ToolFormScreen #tf-row { height: 1; padding: 0 1; }
    ToolFormScreen #tf-label { width: auto; text-style: bold; }
    ToolFormScreen #tf-size { width: 1fr; }
    """

    def __init__(self) -> None:
        super().__init__()
        self.check = None

    def compose_body(self) -> ComposeResult:
        yield Static("", id="tf-head")
        with Horizontal(id="tf-art"):
            yield Static("", id="tf-picture")
            yield Static("", id="tf-side")
        yield Static("", id="tf-numbers")
        yield Static("", id="tf-verdicts")
        with Horizontal(id="tf-row"):
            yield Static("", id="tf-label")
            yield LengthEntry(id="tf-size")
        yield Static("", id="message", classes="message")

    def on_mount(self) -> None:
        super().on_mount()
        self.query_one("#tf-row").display = False
        self.redraw()

    def on_screen_resume(self) -> None:
        super().on_screen_resume()
        self.redraw()

    def job_changed(self) -> None:
        self.redraw()

    def on_resize(self) -> None:
        self.redraw()

    def L(self, mm: float | None) -> str:
        return "—" if mm is None else format_length(mm, self.app.shop.display_units)

    def redraw(self) -> None:
        if not self.is_mounted:
            return
        app = self.app
        head = self.query_one("#tf-head", Static)
        if app.spec is None:
            head.update("Choose a thread first: * then the thread screen.")
            for sel in ("#tf-picture", "#tf-numbers", "#tf-verdicts"):
                self.query_one(sel, Static).update("")
            self.query_one("#tf-side").display = False
            return
        tip, od, source = tool_in_use(app)
        self.tip = tip
        what = "flat" if tip.kind == "flat" else "nose radius"
        head.update(f"{app.spec.designation} {app.spec.kind} · {what} {self.L(tip.size)}"
                    f" ({tip.size:.3f} mm) · from {source}")
        side = self.query_one("#tf-side", Static)
        power = None
        try:
            lim = thread_limits(app.spec)
            if is_power_form(app.spec.form):
                power = power_tool(lim, tip,
                                   max_side_clearance_deg=app.shop.tool_side_clearance_deg)
            check = check_tool(lim, tip, turned_diameter=od)
        except ShoptermError as exc:
            self.check = None
            side.display = False
            self.query_one("#tf-picture", Static).update("")
            self.query_one("#tf-numbers", Static).update("")
            hint = ("Press 2 for a flat tip, then 1 for its width."
                    if is_power_form(app.spec.form) and tip.kind == "radius"
                    else "Press 1 to enter another tip size.")
            self.query_one("#tf-verdicts", Static).update(Text(f"{exc} {hint}", style="bold"))
            return
        self.check = check
        width = max(20, (self.app.size.width or 80) - 2)
        if power is not None:
            side_lines = power.lines(app.shop.display_units)
            side.update("\n".join(side_lines))
            side.display = True
            width = max(20, width - max(len(t) for t in side_lines) - 1)
        else:
            side.display = False
        verdicts = wrap_lines(check.messages + (power.notes if power else ()),
                              max(20, (self.app.size.width or 80) - 2))
        editing = self.query_one("#tf-row").display
        rows = (self.app.size.height or 24) - 2 - 1 - 3 - len(verdicts) - 1 - (1 if editing else 0)
        pic_h = max(3, min(rows, 16))
        pic = check.picture.render_profiles(width, pic_h)
        art = Text(no_wrap=True, overflow="crop")
        styles = {BOLT: "", NUT: "dim", BOTH: "bold reverse red", PITCH_LINE: "dim"}
        for line in pic:
            for ch in line:
                art.append(ch, style=styles.get(ch, ""))
            art.append("\n")
        cut = "screw" if check.picture.cut == "external" else "nut"
        legend = (f"{BOLT} screw  {NUT} nut  {BOTH} overlap  {PITCH_LINE} pitch line"
                  if power is not None else
                  f"{BOLT} screw  {NUT} nut  {BOTH} interference  {PITCH_LINE} aim pitch "
                  f"line  (this tip cuts the {cut})")
        art.append(legend, style="dim")
        self.query_one("#tf-picture", Static).update(art)
        nums = Text(no_wrap=True, overflow="ellipsis")
        if check.interference > 0:
            nums.append(f"Interference {self.L(check.interference)} ({check.interference:.3f} "
                        "mm) on radius", style="bold red")
        else:
            nums.append(f"Clear by {self.L(check.clearance)} "
                        f"({check.clearance:.3f} mm) on radius", style="bold")
        verdict = " · verdict: " + ("OK" if check.ok else "FAILS")
        if power is not None:
            nums.append(f"\nRoot flat: standard {self.L(power.standard_flat)} "
                        f"({power.standard_flat:.3f} mm)" + verdict)
        else:
            self.radius_numbers(nums, check, verdict)
        self.query_one("#tf-numbers", Static).update(nums)
        out = Text()
        failing = False
        for line in verdicts:
            if line.startswith("•"):
                failing = line[2:].startswith("Fails")
            if out:
                out.append("\n")
            out.append(line, style="bold red" if failing else "")
        self.query_one("#tf-verdicts", Static).update(out)

    def radius_numbers(self, nums: Text, check, verdict: str) -> None:
        """Add the largest clearing radius and the root-radius rule (the V-threads)."""
        largest = check.largest_clear_radius
        nums.append(" · largest clearing radius "
                    + (f"{self.L(largest)} ({largest:.3f} mm)" if largest is not None else "—"))
        lo, hi = check.root_radius_min, check.root_radius_max
        rule = ("none for this thread" if lo is None and hi is None else
                f"{self.L(lo)} to {self.L(hi)}" if lo is not None and hi is not None else
                f"at least {self.L(lo)}" if lo is not None else f"at most {self.L(hi)}")
        nums.append(f"\nRoot radius rule: {rule}" + verdict, style="")

    def key_hints(self) -> list[tuple[str, str]]:
        if self.is_mounted and self.query_one("#tf-row").display:
            return [("Enter", "use this size"), ("-", "cancel"), ("Bksp", "delete"),
                    ("F1", "help")]
        return [("1", "tip size"), ("2", "flat/radius"), ("-", "back"), ("*", "menu"),
                ("F1", "help")]

    def action_digit(self, n: int) -> None:
        if self.app.spec is None:
            return
        tip, _, _ = tool_in_use(self.app)
        if n == 1:
            what = "flat width" if tip.kind == "flat" else "nose radius"
            self.query_one("#tf-label", Static).update(
                f"1 new {what} [{self.app.shop.display_units}]: ")
            self.query_one("#tf-row").display = True
            entry = self.query_one("#tf-size", LengthEntry)
            entry.clear()
            entry.focus()
            self.redraw()
            self.refresh_chrome()
        elif n == 2:
            self.use(ToolTip("flat" if tip.kind == "radius" else "radius", tip.size))

    def on_keypad_entry_submitted(self, event: KeypadEntry.Submitted) -> None:
        event.stop()
        try:
            mm = parse_length(event.value, self.app.shop.display_units)
            tip = ToolTip(self.tip.kind, mm)
            lim = thread_limits(self.app.spec)
            if is_power_form(self.app.spec.form):         # a flat that undercuts says so here
                power_tool(lim, tip, max_side_clearance_deg=self.app.shop.tool_side_clearance_deg)
            check_tool(lim, tip)    # a tip too big says so here
        except ShoptermError as exc:
            self.say(str(exc), error=True)             # the typed text stays to correct
            return
        self.close_entry()
        self.use(tip)

    def use(self, tip: ToolTip) -> None:
        problem = set_tool(self.app, tip)
        if problem:
            self.say(problem, error=True)
        else:
            self.say(f"Tip now {tip.kind} {self.L(tip.size)}.")
        self.redraw()

    def close_entry(self) -> None:
        self.query_one("#tf-row").display = False
        self.query_one("#tf-size", LengthEntry).clear()
        self.set_focus(None)
        self.refresh_chrome()

    def action_back(self) -> None:
        if self.query_one("#tf-row").display:
            self.close_entry()
            self.say("Not changed.")
            self.redraw()
            return
        self.app.goto("counter")
