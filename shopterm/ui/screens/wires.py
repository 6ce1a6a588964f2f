"""Wire reading: measure over three wires, see what is left to feed, record each reading.

The screen shows the wire in use (the set-up's ``wire_mm``, else the best owned set that fits)
and what the micrometer should read over it at the top and bottom of the pitch-diameter band.
Each reading typed and confirmed with Enter is one ``wire_reading`` entry in the job record.
Readings taken after the same cut (no pass in between) with the same wire are one set: the
screen shows their mean and spread and acts on the mean. What it shows is always drawn from the
record (``app.state``), never from a count of its own; the core (``shopterm.cutting.remaining``)
computes every dimension.

Another wire is chosen on the wire choice screen (``wirechoice``: Enter on an empty entry).
Internal threads cannot be measured over wires on most work: this screen routes them to the fit
check (``fitcheck``). Which readings make a set is ``cutting.reading_sets``; the band picture and
the chart are ``wireview``.
"""

from __future__ import annotations

from dataclasses import replace

from rich.text import Text
from textual import events, on
from textual.app import ComposeResult
from textual.containers import Horizontal, Vertical
from textual.widgets import Digits, Static

from shopterm.cutting.reading_sets import ReadingSet, current_set, cuts, reading_sets
from shopterm.errors import InvalidEntry, ShoptermError
from shopterm.ui import keys
from shopterm.ui.screens.base import ShopScreen
from shopterm.ui.screens import taperview
from shopterm.ui.screens.wireview import CHART_ROWS, band_picture, chart_rows, fmt, wire_in_use
from shopterm.ui.widgets.entry import KeypadEntry

__all__ = ["WiresScreen", "ReadingSet", "reading_sets", "band_picture", "chart_rows"]

#: Characters a keyboard may add after a number to give its unit (``10.2mm``, ``.402in``, ``.4"``).
#: From this lead angle on the set line shows the simple formula's PD beside the exact one
#: (a two-start trapezoidal screw, 8°: they differ by about 0.1 mm). Our own threshold.
BIG_LEAD_ANGLE_DEG = 5.0
UNIT_CHARS = set("abcdefghijklmnopqrstuvwxyzABCDEFGHIJKLMNOPQRSTUVWXYZ\" ")


def feed_slide(values: dict) -> tuple[str, float | None]:
    """Return (the slide the set-up ``values`` feed with, the compound's angle or None).

    Radial and alternating-flank cuts feed on the cross-slide (the alternating cut's compound
    lies parallel to the bed, 90°, and only shifts the tool sideways: no feed angle).
    """
    if values.get("method") in ("radial", "alternating"):
        return "cross-slide", None
    angle = values.get("compound_angle_deg")
    return "compound", (float(angle) if angle is not None else None)


# ---- the screen -----------------------------------------------------------------------------

class WiresScreen(ShopScreen):
    SCREEN_NAME = "wires"
    TITLE = "Wire reading"
    AUTO_FOCUS = "#reading"
    DEFAULT_CSS = """
    WiresScreen #above { height: auto; }
    WiresScreen #below { height: auto; }
    WiresScreen #wires-head { height: auto; max-height: 4; padding: 0 1; }
    WiresScreen #reading { margin: 0 0; }
    WiresScreen #set-line { height: 1; padding: 0 1; }
    WiresScreen #feed { height: 3; }
    WiresScreen #feed-digits { color: $accent; text-style: bold; padding: 0 1; min-width: 9; }
    WiresScreen #feed-text { height: 3; width: 1fr; }
    WiresScreen #feed-how { height: auto; max-height: 3; padding: 0 1; }
    WiresScreen #state-line { height: auto; max-height: 2; padding: 0 1; text-style: bold; }
    WiresScreen #state-line.oversize { color: $warning; }
    WiresScreen #state-line.in_band { color: $success; }
    WiresScreen #state-line.undersize { color: $error; }
    WiresScreen #detail { height: auto; max-height: 4; padding: 0 1; }
    WiresScreen #picture { height: 1; padding: 0 1; }
    WiresScreen #chart { height: auto; padding: 0 1; }
    WiresScreen #message { height: auto; max-height: 3; }
    WiresScreen #caution { dock: bottom; margin-bottom: 1; max-height: 3; }
    """
    BINDINGS = [keys.bind(keys.FORWARD, "forward", "counter", show=False)]
    HELP = (("0-9 .", "type a reading over the wires (a unit may follow: mm, in)"),
            ("Enter", "take the reading typed; on an empty entry: choose another wire"),
            ("/", "undo the last entry (asks first)"),
            ("- or +", "back to the pass counter"))

    def __init__(self) -> None:
        super().__init__()
        self.draft = ""            # the entry's text not yet confirmed (kept over a re-compose)
        self.plane: float | None = None   # tapered: the measuring plane [mm from the small end]
        self.plane_for: tuple = ()        # the (job, thread) that plane is for
        self.taper_reading = None         # tapered: the last TaperReading measured

    def compose_body(self) -> ComposeResult:
        # What is above and below the entry sits in containers of its own: a key typed into the
        # entry then repaints the entry's line and these two boxes, not every widget on the
        # screen (the compositor redraws each widget whose container overlaps the change).
        with Vertical(id="above"):
            yield Static("", id="wires-head")
        yield KeypadEntry(prompt="Reading over wires: ", id="reading")
        with Vertical(id="below"):
            yield Static("", id="message", classes="message")
            yield Static("", id="set-line")
            with Horizontal(id="feed"):
                yield Digits("", id="feed-digits")
                yield Static("", id="feed-text")
            yield Static("", id="feed-how")
            yield Static("", id="state-line")
            yield Static("", id="detail")
            yield Static("", id="picture")
            yield Static("", id="chart")
        yield Static("", id="caution", classes="caution")

    def on_mount(self) -> None:
        self._message_line = self.query_one("#message", Static)   # looked at on every key
        super().on_mount()
        # The app may have taken this screen down while another was shown (it is composed
        # again then): bring back what was typed and not yet confirmed.
        self.query_one("#reading", KeypadEntry).value = self.draft
        self.redraw()

    @on(KeypadEntry.Changed, "#reading")
    def entry_changed(self, event: KeypadEntry.Changed) -> None:
        event.stop()        # typing is this screen's business: nothing above it listens
        if type(event) is not KeypadEntry.Changed:   # Enter, not typing
            return
        self.draft = event.value
        if event.value and self._message_line.has_class("info"):
            self.say("")    # "reading taken" is old news once the next one is being typed

    def on_screen_resume(self) -> None:
        super().on_screen_resume()
        self.redraw()

    def job_changed(self) -> None:
        """The record changed under us (an undo, another thread): draw it again from it."""
        self.say("")
        if not self.follow_route():
            self.redraw()

    def route(self) -> str:
        from shopterm.ui.screens.caliper import uses_caliper
        spec = self.app.spec
        if spec is not None and not spec.is_external:
            return "fitcheck"
        return "caliper" if uses_caliper(self.app) else self.SCREEN_NAME

    # -- what the screen works from ----------------------------------------------------------
    @property
    def unit(self) -> str:
        return self.app.shop.display_units

    def fmt(self, mm: float, suffix: bool = True) -> str:
        return fmt(self.app, mm, suffix)

    def limits(self):
        """Return the thread's limits; a thread with no class is measured to its basic PD."""
        from shopterm.standards import limits
        lim = limits(self.app.spec)
        if self.app.spec.tol_class is None and self.app.spec.family != "pipe":
            lim = replace(lim, pd_max=lim.basic_pd, pd_min=lim.basic_pd)
        return lim

    def wire(self) -> tuple[float, str, str]:
        """Return (wire [mm], its description, a problem to show or '')."""
        return wire_in_use(self.app)

    def feed_slide(self) -> tuple[str, float | None]:
        """Return (the slide the user feeds with, compound angle from the set-up or None)."""
        return feed_slide(self.app.setup_values())

    def tapered(self) -> bool:
        return taperview.is_tapered(self.app.spec)

    def distance(self) -> float | None:
        """Return the measuring plane of a tapered thread [mm from the small end], else None."""
        if not self.tapered():
            return None
        if self.plane is None or self.plane_for != (self.app.job, self.app.spec):
            self.plane = taperview.default_plane(self.app.state, self.limits())
            self.plane_for = (self.app.job, self.app.spec)
        return self.plane

    def measure(self, readings: list[float], wire: float):
        """Return the core's Measurement of ``readings`` [mm] over ``wire`` [mm] (raises if refused)."""
        from shopterm.cutting.remaining import measure
        if self.tapered():     # at the plane typed: the core's measure_tapered, never measure
            from shopterm.cutting.taper_thread import measure_tapered

            def measure(lim, wire, readings, **kw):
                self.taper_reading = measure_tapered(lim, wire, readings, self.distance(), **kw)
                return self.taper_reading.measurement
        _slide, angle = self.feed_slide()
        aim = self.app.setup_values().get("aim_pd_mm")
        kw = dict(lathe=self.app.lathe, compound_angle_deg=angle,
                  resolution=self.app.shop.micrometer_resolution, unit=self.unit)
        lim = self.limits()
        try:
            return measure(lim, wire, readings, aim_pd=aim, **kw)
        except InvalidEntry:
            if aim is None:
                raise
            return measure(lim, wire, readings, **kw)   # an aim outside a changed band: the middle

    # -- drawing -----------------------------------------------------------------------------
    def redraw(self) -> None:
        if not self.is_mounted:
            return
        spec = self.app.spec
        head = self.query_one("#wires-head", Static)
        if spec is None:
            head.update("Choose a thread first: * then the Thread screen.")
            self.show_parts(entry=False, feed=False)
            return
        if not spec.is_external:
            return                         # routed to the fit check (job_changed, goto)
        try:
            self.draw_external()
        except ShoptermError as exc:
            self.say(str(exc), error=True)

    def show_parts(self, *, entry: bool, feed: bool) -> None:
        self.query_one("#reading").display = entry
        for sel in ("#feed", "#feed-how", "#state-line", "#detail", "#picture", "#chart", "#set-line"):
            self.query_one(sel).display = feed
        self.refresh_chrome()

    def draw_external(self) -> None:
        from shopterm.cutting.wires import MEASURE_CAUTION, band_over_wires
        spec, state = self.app.spec, self.app.state
        lim = self.limits()
        wire, wire_text, problem = self.wire()
        band = band_over_wires(spec.form, spec.pitch, spec.lead, lim.pd_max, lim.pd_min, wire)
        u = self.unit
        cls = spec.tol_class or "basic"
        if self.tapered():
            head = taperview.wires_head(spec, lim, wire, wire_text, self.distance(), self.fmt, u)
        else:
            head = Text()
            head.append(f"{spec.designation}", style="bold")
            head.append(f"  wire {wire_text}")
            head.append(f"\nover wires: {self.fmt(band.at_pd_max, False)} (PD max "
                        f"{self.fmt(lim.pd_max, False)}) to {self.fmt(band.at_pd_min, False)} "
                        f"(PD min {self.fmt(lim.pd_min, False)}) {u}, {cls}")
        self.query_one("#wires-head", Static).update(head)
        entry = self.query_one("#reading", KeypadEntry)
        entry.prompt = f"Reading over wires [{u}]: "
        entry.refresh()
        if problem:
            self.say(problem, error=True)
        self.query_one("#caution", Static).update(MEASURE_CAUTION)
        self.show_parts(entry=True, feed=True)
        current = current_set(state, wire, self.distance())
        if current is None:
            self.draw_history(lim, CHART_ROWS)
            self.draw_no_reading(state)
            return
        m = self.measure([r.measured_mm for r in current.readings], wire)
        self.draw_measurement(m, current)
        # an 80x24 screen has room for the feed, its turning hints and a spread warning only
        # with a shorter chart; a taller one shows more of it
        crowded = m.state == "oversize" and not m.readings.steady
        self.draw_history(lim, max(1, CHART_ROWS + self.app.size.height - 24 - 2 * crowded))

    def draw_no_reading(self, state) -> None:
        marks = cuts(state) if state is not None else []
        for sel in ("#feed", "#feed-how", "#detail", "#picture"):
            self.query_one(sel).display = False
        self.query_one("#picture").display = False
        line = self.query_one("#state-line", Static)
        line.set_classes("")
        if state is not None and state.readings and marks:
            line.update(f"Cut since the last reading ({marks[-1][1]}): measure again.")
        elif state is not None and state.readings:
            line.update("The wire has changed since the last reading: measure again.")
        else:
            line.update("No reading yet: place the wires, measure, type the reading, Enter.")
        self.query_one("#set-line", Static).update("")

    def draw_measurement(self, m, current: ReadingSet) -> None:
        slide, _ = self.feed_slide()
        r = m.readings
        n = len(r.values)
        set_text = Text("before pass 1: " if current.after_seq == 0
                        else f"after {current.label}: ")
        mean, where = r.mean, ""
        if self.tapered():        # readings as typed; the PD is at the plane measured
            mean, where = taperview.set_words(self.taper_reading, self.limits(), self.fmt)
        if n == 1:
            set_text.append(f"1 reading {self.fmt(mean)}")
        else:
            set_text.append(f"{n} readings: mean {self.fmt(mean, False)}, spread "
                            f"{self.fmt(r.spread)}")
            if not r.steady:
                set_text.append(" TOO WIDE", style="bold reverse")
        set_text.append(f" → PD {self.fmt(m.pitch_diameter)}{where}")
        if m.pd.lead_angle_deg >= BIG_LEAD_ANGLE_DEG:     # the simple formula is well off
            set_text.append(f" (simple formula {self.fmt(m.pd.pd_simple, False)})")
        self.query_one("#set-line", Static).update(set_text)

        feed = m.feed_aim
        setting = feed.on_compound if slide == "compound" else feed.cross
        other = feed.cross if slide == "compound" else feed.on_compound
        digits = self.query_one("#feed-digits", Digits)
        text = Text()
        how = self.query_one("#feed-how", Static)
        if m.state == "oversize" and setting is not None:
            digits.update(f"{setting.divisions:g}")
            dial = setting.dial
            where = (f"compound at {m.compound_angle_deg:g}°" if slide == "compound"
                     else "cross-slide")
            text.append(f"divisions more on the {where}", style="bold")
            text.append(f"  ({dial.division:g} {dial.unit}/div"
                        + (" on diameter)" if dial.reads_diameter else ")"))
            top, bottom = self.limit_settings(m, slide)
            text.append(f"\n→ PD {self.fmt(setting.predicted_pd)}, over wires "
                        f"{self.fmt(setting.predicted_over_wires)}")
            if top is not None:
                text.append(f"\nin the band from {top} to {bottom} div")
            if other is not None:
                text.append(f" · on the {other.slide} {other.divisions:g}")
            how.update(f"{m.direction} {m.backlash}")
            how.display = True
        else:
            digits.update("0")
            text.append("no more feed", style="bold")
            text.append("\n" + ("Stop here." if m.state == "in_band"
                                else "Do not feed any further."))
            how.display = False
        self.query_one("#feed-text", Static).update(text)
        self.query_one("#feed").display = True

        line = self.query_one("#state-line", Static)
        line.set_classes(m.state)
        line.update(m.headline)
        detail = self.query_one("#detail", Static)
        parts = []
        if not r.steady:
            parts.append(r.warning)
        if m.state != "oversize":
            parts.append(m.detail.replace(r.warning, "").strip())
        detail.update(" ".join(p for p in parts if p))
        detail.display = bool(parts)
        picture = self.query_one("#picture", Static)
        picture.update(band_picture(m.pitch_diameter, m.pd_max, m.pd_min))
        picture.display = True
        if m.state == "undersize":
            self.query_one("#caution", Static).update(m.caution)

    @staticmethod
    def limit_settings(m, slide: str) -> tuple:
        """Return (divisions to reach the top, divisions no further than the bottom) on ``slide``."""
        def on(ft):
            s = ft.on_compound if slide == "compound" else ft.cross
            return None if s is None else f"{s.divisions:g}"
        top, bottom = on(m.feed_top), on(m.feed_bottom)
        if top is None or bottom is None:
            return None, None
        return top, bottom

    def draw_history(self, lim, rows: int) -> None:
        sets = reading_sets(self.app.state)
        chart = self.query_one("#chart", Static)
        if not sets:
            chart.update("")
            chart.display = False
            return
        rows_shown = rows
        rows = [(s.label, s.readings[-1].pd_mm, len(s.readings)) for s in sets]
        shown = rows[-rows_shown:]
        title = Text(f"closing in: PD [{self.unit}] after each cut, │░│ the band", style="bold")
        if len(rows) > len(shown):
            title.append(f"  +{len(rows) - len(shown)} earlier", style="dim")
        lines = chart_rows(shown, lim.pd_max, lim.pd_min, self.unit)
        chart.update(Text("\n").join([title] + [Text(x) for x in lines]))
        chart.display = True

    # -- readings ------------------------------------------------------------------------------
    def on_key(self, event: events.Key) -> None:
        """A unit typed after the number (keyboard only) goes into the entry."""
        entry = self.query_one("#reading", KeypadEntry)
        ch = event.character
        if entry.has_focus and ch and ch in UNIT_CHARS and entry.value \
                and len(entry.value) < entry.max_length:
            entry.value += ch
            event.stop()

    @on(KeypadEntry.Submitted, "#reading")
    def entry_submitted(self, event: KeypadEntry.Submitted) -> None:
        event.stop()
        text = event.value.strip()
        if self.app.spec is None or not self.app.spec.is_external:
            return
        if not text:
            if self.tapered():
                self.ask_taper_option()
            else:
                self.app.goto("wirechoice")
            return
        self.reading_typed(text)

    def reading_typed(self, text: str) -> None:
        from shopterm.cutting.wires import ReadingSlip, check_reading
        from shopterm.units import parse_length
        spec = self.app.spec
        try:
            m = parse_length(text, self.unit)
            lim = self.limits()
            wire, _, _ = self.wire()
            if self.tapered():
                from shopterm.cutting.taper_thread import limits_at
                lim = limits_at(lim, self.distance())
            check_reading(m, spec.form, spec.pitch, spec.lead, lim.basic_major,
                          lim.basic_minor, wire, self.unit)
        except ReadingSlip as slip:
            if slip.likely is None:
                self.say(str(slip), error=True)
                return
            self.ask_slip(text, slip)
            return
        except ShoptermError as exc:
            self.say(str(exc), error=True)
            return
        self.take_reading(m, text)

    def ask_slip(self, text: str, slip) -> None:
        """Ask whether a reading 25.4 times off meant the other unit; record nothing until answered."""
        from shopterm.ui.screens.menu import ConfirmScreen
        other = "in" if self.unit == "mm" else "mm"
        from shopterm.units import format_length
        meant = format_length(slip.likely, other, 0.0001 if other == "in" else 0.001)
        question = (f"{slip}\n\nEnter: take it as {meant} ({self.fmt(slip.likely)}).\n"
                    "-: no, change what I typed.")

        def answer(yes: bool | None) -> None:
            if yes:
                self.take_reading(slip.likely, f"{text} (taken as {meant})")
            else:
                self.say("Nothing recorded: change the reading, or add its unit (mm or in).")
                self.query_one("#reading").focus()

        self.app.push_screen(ConfirmScreen(question), answer)

    def take_reading(self, m: float, typed: str) -> None:
        """Record one reading [mm]; show it as taken only once the record has it."""
        state = self.app.state
        wire, _, _ = self.wire()
        current = current_set(state, wire, self.distance())
        values = [r.measured_mm for r in current.readings] if current else []
        try:
            result = self.measure(values + [m], wire)
        except ShoptermError as exc:
            self.say(str(exc), error=True)
            return
        slide, _ = self.feed_slide()
        setting = result.feed_aim.on_compound if slide == "compound" else result.feed_aim.cross
        marks = cuts(state) if state is not None else []
        payload = {
            "measured_mm": m, "typed": typed, "pd_mm": result.pitch_diameter,
            "state": result.state, "wire_mm": wire,
            "pd_max_mm": result.pd_max, "pd_min_mm": result.pd_min, "aim_pd_mm": result.aim_pd,
            "remaining_mm": max(result.to_aim, 0.0),
            "radial_remaining_mm": max(result.to_aim, 0.0) / 2,
            "mean_mm": result.readings.mean, "spread_mm": result.readings.spread,
            "set_mm": list(result.readings.values), "steady": result.readings.steady,
            "pd_h28_mm": result.pd.pd_h28, "pd_simple_mm": result.pd.pd_simple,
            "after_seq": marks[-1][0] if marks else 0,
            "slide": slide, "compound_angle_deg": result.compound_angle_deg,
        }
        if result.state == "oversize" and setting is not None:
            payload["divisions"] = setting.divisions
        if self.tapered():
            payload.update(taperview.reading_payload(self.taper_reading))
        if self.app.record("wire_reading", payload) is None:
            self.say("The reading was not recorded (see the message above); it is still in "
                     "the entry: Enter to try again.", error=True)
            return
        self.query_one("#reading", KeypadEntry).clear()
        n = len(result.readings.values)
        self.say(f"Reading {self.fmt(m)} taken" + (f" ({n} in this set)." if n > 1 else "."))
        self.redraw()

    def ask_taper_option(self) -> None:
        """Tapered thread, Enter on an empty entry: the measuring plane, a hand-tight check or
        another wire."""
        from shopterm.ui.screens.taperask import PickModal

        def chosen(what) -> None:
            if what == "plane":
                taperview.ask_plane(self.app, self.limits(), self.distance(), self.plane_typed)
            elif what == "hand_tight":
                self.app.goto("handtight")
            elif what == "wire":
                self.app.goto("wirechoice")

        self.app.push_screen(PickModal("Tapered thread:", list(taperview.TAPER_OPTIONS)), chosen)

    def plane_typed(self, mm: float | None) -> None:
        if mm is not None:
            self.plane = mm
            self.say("Readings now at " + taperview.plane_words(self.limits(), mm, self.fmt)
                     + ".")
        self.redraw()

    # -- keys ----------------------------------------------------------------------------------
    def key_hints(self) -> list[tuple[str, str]]:
        empty = "more" if self.tapered() else "wire"
        return [("Enter", f"take reading · empty: {empty}"), ("/", "undo"), ("-", "counter"),
                ("*", "menu"), ("F1", "help")]

    def action_back(self) -> None:
        self.app.goto("counter")

    def action_forward(self) -> None:
        self.app.goto("counter")
