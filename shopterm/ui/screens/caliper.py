"""Caliper reading: a trapezoidal or Acme thread measured with a gear-tooth caliper.

The published alternative to three wires for these forms (and the way when no owned wire set
fits the pitch): the caliper's depth slide is set from the crest down to the basic pitch line,
and its jaws read the thread's thickness there, square to the thread. The core
(``cutting.remaining.measure_by_caliper``) turns the thickness into the pitch diameter and
judges it as a wire reading is judged, so the state and the divisions more are the wire
screen's own. Each thickness confirmed with Enter is one ``wire_reading`` entry with
``method: "caliper"`` (DEVELOPERS.md, three-wire measurement).

Reached from the wire choice (the caliper entry) or by ``wires``'s route when the set-up says
``measure_with: "caliper"`` or no owned wire fits a power thread.
"""

from __future__ import annotations

from rich.text import Text
from textual.app import ComposeResult
from textual.containers import Horizontal, Vertical
from textual.widgets import Digits, Static

from shopterm.cutting.reading_sets import cuts
from shopterm.errors import ShoptermError
from shopterm.ui import keys
from shopterm.ui.screens.base import ShopScreen
from shopterm.ui.screens.cutview import LengthEntry
from shopterm.ui.screens.wires import WiresScreen, feed_slide
from shopterm.ui.screens.wireview import band_picture, fmt
from shopterm.ui.widgets.entry import KeypadEntry


def uses_caliper(app) -> bool:
    """Return whether the open job measures its thread with the caliper: chosen in the set-up
    (``measure_with``), or a trapezoidal or Acme thread none of the owned wires fits."""
    from shopterm.cutting.wires import is_power_form, wire_range
    spec = app.spec
    if spec is None or not spec.is_external or not is_power_form(spec.form) \
            or spec.form.angle_deg <= 0:
        return False
    chosen = app.setup_values().get("measure_with")
    if chosen is not None:
        return chosen == "caliper"
    rng = wire_range(spec.form, spec.pitch)
    return not any(rng.fits(w.size) for w in app.shop.wires)


class CaliperScreen(ShopScreen):
    SCREEN_NAME = "caliper"
    TITLE = "Caliper reading"
    AUTO_FOCUS = "#thickness"
    DEFAULT_CSS = """
    CaliperScreen #cal-above, CaliperScreen #cal-below { height: auto; }
    CaliperScreen #cal-row { height: 1; }
    CaliperScreen #cal-head { height: auto; padding: 0 1; }
    CaliperScreen #cal-line { height: 1; padding: 0 1; }
    CaliperScreen #cal-feed { height: 3; }
    CaliperScreen #cal-digits { color: $accent; text-style: bold; padding: 0 1; min-width: 9; }
    CaliperScreen #cal-text { height: 3; width: 1fr; }
    CaliperScreen #cal-state { height: auto; max-height: 2; padding: 0 1; text-style: bold; }
    CaliperScreen #cal-state.oversize { color: $warning; }
    CaliperScreen #cal-state.in_band { color: $success; }
    CaliperScreen #cal-state.undersize { color: $error; }
    CaliperScreen #cal-detail { height: auto; max-height: 3; padding: 0 1; }
    CaliperScreen #message { height: auto; max-height: 2; }
    CaliperScreen #caution { dock: bottom; margin-bottom: 1; max-height: 3; }
    """
    BINDINGS = [keys.bind(keys.FORWARD, "forward", "counter", show=False)]
    HELP = (("0-9 .", "type the thickness the caliper reads (a unit may follow: mm, in)"),
            ("Enter", "take the thickness; on an empty entry: choose wires instead"),
            ("/", "undo the last entry (asks first)"),
            ("- or +", "back to the pass counter"))

    def compose_body(self) -> ComposeResult:
        with Vertical(id="cal-above"):
            yield Static("", id="cal-head")
        with Horizontal(id="cal-row"):
            yield LengthEntry(prompt="Thickness read: ", id="thickness")
        with Vertical(id="cal-below"):
            yield Static("", id="message", classes="message")
            yield Static("", id="cal-line")
            with Horizontal(id="cal-feed"):
                yield Digits("", id="cal-digits")
                yield Static("", id="cal-text")
            yield Static("", id="cal-state")
            yield Static("", id="cal-detail")
        yield Static("", id="caution", classes="caution")

    def on_mount(self) -> None:
        super().on_mount()
        self.redraw()

    def on_screen_resume(self) -> None:
        super().on_screen_resume()
        self.redraw()

    def job_changed(self) -> None:
        self.say("")
        self.redraw()

    def on_keypad_entry_changed(self, event: KeypadEntry.Changed) -> None:
        event.stop()

    # -- what the screen works from ----------------------------------------------------------
    @property
    def unit(self) -> str:
        return self.app.shop.display_units

    def crest(self) -> tuple[float, bool]:
        """Return (the crest diameter [mm] the depth slide is set from, whether it was measured):
        the prepared blank's OD, else the basic major."""
        from shopterm.standards import limits
        od = self.app.setup_values().get("blank_od_mm")
        if od is not None:
            return float(od), True
        return limits(self.app.spec).basic_major, False

    def measure(self, thickness: float):
        from shopterm.cutting.remaining import measure_by_caliper
        from shopterm.standards import limits
        values = self.app.setup_values()
        kw = dict(lathe=self.app.lathe, resolution=self.app.shop.micrometer_resolution,
                  unit=self.unit, compound_angle_deg=feed_slide(values)[1])
        lim, crest = limits(self.app.spec), self.crest()[0]
        try:
            return measure_by_caliper(lim, thickness, crest, aim_pd=values.get("aim_pd_mm"), **kw)
        except ShoptermError:
            if values.get("aim_pd_mm") is None:
                raise
            return measure_by_caliper(lim, thickness, crest, **kw)

    def slide(self) -> str:
        return feed_slide(self.app.setup_values())[0]

    def last_reading(self):
        """Return the caliper reading taken since the last cut, or None."""
        state = self.app.state
        if state is None or not state.readings:
            return None
        last = state.readings[-1]
        marks = cuts(state)
        if last.payload.get("method") != "caliper" or (marks and marks[-1][0] > last.seq):
            return None
        return last

    # -- drawing -----------------------------------------------------------------------------
    def redraw(self) -> None:
        if not self.is_mounted:
            return
        head = self.query_one("#cal-head", Static)
        if self.app.spec is None:
            head.update("Choose a thread first: * then the Thread screen.")
            return
        try:
            self.draw()
        except ShoptermError as exc:
            head.update(Text(str(exc), style="bold"))
        self.refresh_chrome()

    def draw(self) -> None:
        from shopterm.cutting.wires import MEASURE_CAUTION, caliper_band
        from shopterm.standards import limits
        spec, u = self.app.spec, self.unit
        lim = limits(spec)
        crest, measured = self.crest()
        band = caliper_band(spec.form, spec.pitch, spec.lead, lim.pd_max, lim.pd_min, crest,
                            lim.basic_pd)
        head = Text(spec.designation, style="bold")
        head.append("  gear-tooth caliper: thread thickness at the pitch line")
        head.append("\nDepth slide ")
        head.append(fmt(self.app, band.depth_setting), style="bold")
        head.append(f" from the crest ({'blank ' if measured else 'basic major '}"
                    f"{fmt(self.app, crest)})")
        head.append(f"\nreads {fmt(self.app, band.at_pd_max, False)} (PD max) to "
                    f"{fmt(self.app, band.at_pd_min, False)} (PD min) {u}, "
                    f"{spec.tol_class or 'usual class'}, jaws square to the thread")
        self.query_one("#cal-head", Static).update(head)
        entry = self.query_one("#thickness", LengthEntry)
        entry.prompt = f"Thickness read [{u}]: "
        entry.refresh()
        self.query_one("#caution", Static).update(
            MEASURE_CAUTION.replace("placing wires", "measuring"))
        last = self.last_reading()
        shown = last is not None
        for sel in ("#cal-feed", "#cal-detail"):
            self.query_one(sel).display = shown
        line = self.query_one("#cal-line", Static)
        state_line = self.query_one("#cal-state", Static)
        if not shown:
            line.update("")
            state_line.set_classes("")
            state_line.update("No caliper reading since the last cut: set the depth slide, "
                              "read the thickness, type it, Enter.")
            return
        self.draw_reading(self.measure(float(last.payload["measured_mm"])))

    def draw_reading(self, cm) -> None:
        m, slide = cm.measurement, self.slide()
        self.query_one("#cal-line", Static).update(
            f"Thickness {fmt(self.app, cm.thickness)} → PD {fmt(self.app, cm.pitch_diameter)}")
        feed = m.feed_aim
        setting = feed.on_compound if slide == "compound" else feed.cross
        text = Text()
        digits = self.query_one("#cal-digits", Digits)
        if m.state == "oversize" and setting is not None:
            digits.update(f"{setting.divisions:g}")
            where = (f"compound at {m.compound_angle_deg:g}°" if slide == "compound"
                     else "cross-slide")
            text.append(f"divisions more on the {where}", style="bold")
            text.append(f"\n→ PD {fmt(self.app, setting.predicted_pd)}, thickness "
                        f"{fmt(self.app, cm.thickness_at(setting.predicted_pd))}")
            top, bottom = WiresScreen.limit_settings(m, slide)
            if top is not None:
                text.append(f"\nin the band from {top} to {bottom} div")
        else:
            digits.update("0")
            text.append("no more feed", style="bold")
            text.append("\n" + ("Stop here." if m.state == "in_band"
                                else "Do not feed any further."))
        self.query_one("#cal-text", Static).update(text)
        state_line = self.query_one("#cal-state", Static)
        state_line.set_classes(m.state)
        state_line.update(m.headline)
        self.query_one("#cal-detail", Static).update(
            band_picture(m.pitch_diameter, m.pd_max, m.pd_min)
            + (f"\n{m.direction}" if m.state == "oversize" else ""))
        if m.state == "undersize":
            self.query_one("#caution", Static).update(m.caution)

    # -- readings ----------------------------------------------------------------------------
    def on_keypad_entry_submitted(self, event: KeypadEntry.Submitted) -> None:
        from shopterm.units import parse_length
        event.stop()
        text = event.value.strip()
        if self.app.spec is None:
            return
        if not text:
            self.app.goto("wirechoice")
            return
        try:
            t = parse_length(text, self.unit)
            cm = self.measure(t)
        except ShoptermError as exc:
            self.say(str(exc), error=True)          # the text stays in the entry to correct
            return
        self.take(cm, text)

    def take(self, cm, typed: str) -> None:
        """Record one caliper reading; show it as taken once the record has it."""
        m, slide = cm.measurement, self.slide()
        setting = m.feed_aim.on_compound if slide == "compound" else m.feed_aim.cross
        marks = cuts(self.app.state) if self.app.state is not None else []
        payload = {
            "measured_mm": cm.thickness, "typed": typed, "method": "caliper",
            "pd_mm": cm.pitch_diameter, "state": m.state, "pd_max_mm": m.pd_max,
            "pd_min_mm": m.pd_min, "aim_pd_mm": m.aim_pd,
            "remaining_mm": max(m.to_aim, 0.0), "radial_remaining_mm": max(m.to_aim, 0.0) / 2,
            "depth_setting_mm": cm.band.depth_setting, "level_mm": cm.band.level_diameter,
            "crest_mm": self.crest()[0], "normal": cm.band.normal,
            "after_seq": marks[-1][0] if marks else 0, "slide": slide,
            "compound_angle_deg": m.compound_angle_deg,
        }
        if m.state == "oversize" and setting is not None:
            payload["divisions"] = setting.divisions
        if self.app.record("wire_reading", payload) is None:
            self.say("The reading was not recorded (see the message above); it is still in "
                     "the entry: Enter to try again.", error=True)
            return
        self.query_one("#thickness", LengthEntry).clear()
        self.say(f"Thickness {fmt(self.app, cm.thickness)} taken.")
        self.redraw()

    # -- keys --------------------------------------------------------------------------------
    def key_hints(self) -> list[tuple[str, str]]:
        return [("Enter", "take reading · empty: wires"), ("/", "undo"), ("-", "counter"),
                ("*", "menu"), ("F1", "help")]

    def action_back(self) -> None:
        self.app.goto("counter")

    def action_forward(self) -> None:
        self.app.goto("counter")
