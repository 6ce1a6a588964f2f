"""Hand-tight engagement check of a tapered thread (ISO 7-1 R/Rc, ASME B1.20.1 NPT).

Instead of a reading over wires: a ring gauge (external), a plug gauge (internal) or the mating
fitting screwed on by hand, and either the turns it made or how far it stood off flush. The core
(``cutting.taper_thread.hand_tight_check``) says what that means and what feed brings it flush;
this screen asks three things by keypad (against what, turns or stand-off, the number), shows
the feed in big digits on the slide the cut feeds with, and records a ``note`` whose text begins
``Hand-tight check`` and whose ``hand_tight`` holds the numbers (DEVELOPERS.md, job record).
Reached from the wire screen (Enter on an empty entry) and the fit check of an internal taper.
"""

from __future__ import annotations

from rich.text import Text
from textual.app import ComposeResult
from textual.widgets import Static

from shopterm.errors import ShoptermError
from shopterm.ui import keys
from shopterm.ui.screens.base import ShopScreen
from shopterm.ui.screens.cutview import DialSetting, LengthEntry
from shopterm.ui.screens.taperview import is_tapered
from shopterm.ui.widgets.entry import KeypadEntry
from shopterm.ui.widgets.picklist import PickList

#: Note text that marks a hand-tight check in the record.
HAND_PREFIX = "Hand-tight check"

AGAINST_WORDS = {"ring_gauge": "a ring gauge", "plug_gauge": "a plug gauge",
                 "fitting": "the mating fitting"}
HOW = (("turns made by hand, from catching to hand tight", "turns"),
       ("stopped short of flush by (a length)", "short"),
       ("went past flush by (a length)", "past"))


def hand_tight_payload(check, slide: str) -> dict:
    """Return the note's ``hand_tight`` value for a ``HandTightCheck`` (lengths in mm)."""
    return {"against": check.against, "turns": check.turns, "stand_off_mm": check.stand_off,
            "expected_turns": check.expected_turns, "tolerance_mm": check.tolerance,
            "state": check.state, "to_remove_mm": check.to_remove, "radial_mm": check.radial,
            "compound_mm": check.compound, "compound_angle_deg": check.compound_angle_deg,
            "cross_divisions": check.cross_divisions,
            "compound_divisions": check.compound_divisions, "slide": slide}


class HandTightScreen(ShopScreen):
    SCREEN_NAME = "handtight"
    TITLE = "Hand-tight check"
    AUTO_FOCUS = "#hand-list"
    DEFAULT_CSS = """
    HandTightScreen #hand-head { height: auto; padding: 0 1; }
    HandTightScreen #hand-entry { height: 1; padding: 0 1; }
    HandTightScreen #hand-state { height: auto; padding: 0 1; text-style: bold; }
    HandTightScreen #message { height: auto; max-height: 3; }
    HandTightScreen #caution { dock: bottom; margin-bottom: 1; max-height: 3; }
    """
    BINDINGS = [keys.bind(keys.FORWARD, "forward", "counter", show=False)]
    HELP = (("1-9", "what it was tried against, then turns or stand-off"),
            ("0-9 . Enter", "the turns counted, or the stand-off (a unit may follow)"),
            ("-", "back a question; from the first, back to the wire screen"),
            ("+", "on to the pass counter"))

    def __init__(self) -> None:
        super().__init__()
        self.against: str | None = None
        self.how: str | None = None

    def compose_body(self) -> ComposeResult:
        yield Static("", id="hand-head")
        yield PickList(id="hand-list", columns=1)
        yield LengthEntry(id="hand-entry")
        yield Static("", id="message", classes="message")
        yield DialSetting(id="hand-feed", digits_id="hand-digits", text_id="hand-text")
        yield Static("", id="hand-state")
        yield Static("Stop the spindle before trying a gauge or the fitting; keep the chuck key "
                     "out and hands clear. A gauge check is not a pressure test.",
                     id="caution", classes="caution")

    def on_mount(self) -> None:
        self.redraw()

    def on_screen_resume(self) -> None:
        super().on_screen_resume()
        self.redraw()

    def job_changed(self) -> None:
        self.against = self.how = None
        self.say("")
        self.redraw()

    def limits(self):
        from shopterm.standards import limits
        return limits(self.app.spec)

    def slide(self) -> tuple[str, float | None]:
        values = self.app.setup_values()
        angle = values.get("compound_angle_deg")
        return ("cross-slide" if values.get("method") == "radial" else "compound",
                None if angle is None else float(angle))

    # -- drawing -------------------------------------------------------------------------------
    def redraw(self) -> None:
        if not self.is_mounted:
            return
        spec = self.app.spec
        head = self.query_one("#hand-head", Static)
        picks = self.query_one("#hand-list", PickList)
        entry = self.query_one("#hand-entry", LengthEntry)
        if not is_tapered(spec):
            head.update("A hand-tight check is for a tapered thread (R, Rc, NPT): - goes back "
                        "to the wire screen.")
            picks.display = entry.display = False
            self.refresh_chrome()
            return
        from shopterm.cutting.taper_thread import taper_of
        taper = taper_of(self.limits())
        gauge = taper.L1 if taper.L1 is not None else taper.gauge_plane_from_end
        unit = self.app.shop.display_units
        from shopterm.units import format_length
        text = Text(spec.designation, style="bold")
        text.append(f"  by hand: {gauge / spec.pitch:.1f} turns expected (gauge length "
                    f"{format_length(gauge, unit)}), ± {format_length(taper.gauge_plane_tolerance, unit)}")
        head.update(text)
        picks.display = self.how is None
        entry.display = self.how is not None
        if self.against is None:
            options = (("plug_gauge", "fitting") if not spec.is_external
                       else ("ring_gauge", "fitting"))
            picks.set_items([(f"tried with {AGAINST_WORDS[k]}", k) for k in options],
                            "What was screwed on by hand?")
            picks.focus()
        elif self.how is None:
            picks.set_items(list(HOW), f"With {AGAINST_WORDS[self.against]}: what to enter?")
            picks.focus()
        else:
            entry.prompt = {"turns": "turns by hand: ", "short": f"short of flush by [{unit}]: ",
                            "past": f"past flush by [{unit}]: "}[self.how]
            entry.refresh()
            entry.focus()
        self.refresh_chrome()

    def show_check(self, check, slide: str) -> None:
        divs = check.compound_divisions if slide == "compound" else check.cross_divisions
        feed = self.query_one("#hand-feed", DialSetting)
        if check.state == "feed_on" and divs is not None:
            where = (f"compound at {check.compound_angle_deg:g}°" if slide == "compound"
                     else "cross-slide")
            feed.show(f"{divs:g}", Text(f"divisions more on the {where}\n{check.direction}",
                                        style="bold"))
        else:
            feed.show("0", Text("no more feed", style="bold"))
        state = self.query_one("#hand-state", Static)
        state.update(check.headline)

    # -- keys ----------------------------------------------------------------------------------
    def on_pick_list_picked(self, event: PickList.Picked) -> None:
        event.stop()
        if self.against is None:
            self.against = event.value
        else:
            self.how = event.value
        self.say("")
        self.redraw()

    def on_keypad_entry_submitted(self, event: KeypadEntry.Submitted) -> None:
        from shopterm.cutting.taper_thread import hand_tight_check
        from shopterm.units import parse_length, parse_number
        event.stop()
        slide, angle = self.slide()
        unit = self.app.shop.display_units
        try:
            if self.how == "turns":
                kw = {"turns": parse_number(event.value)}
            else:
                sign = -1.0 if self.how == "past" else 1.0
                kw = {"stand_off": sign * parse_length(event.value, unit)}
            check = hand_tight_check(self.limits(), against=self.against, lathe=self.app.lathe,
                                     compound_angle_deg=angle, unit=unit, **kw)
        except ShoptermError as exc:
            self.say(str(exc), error=True)        # the text stays in the entry to correct
            return
        note = {"text": f"{HAND_PREFIX} with {AGAINST_WORDS[check.against]}: {check.headline}",
                "hand_tight": hand_tight_payload(check, slide)}
        if self.app.record("note", note) is None:
            self.say("The check was not recorded (see the message above); Enter to try again.",
                     error=True)
            return
        event.entry.clear()
        self.show_check(check, slide)
        self.say("Recorded. Type another check, or + for the pass counter.")

    def key_hints(self) -> list[tuple[str, str]]:
        return [("1-9", "pick"), ("Enter", "take it"), ("-", "back"), ("+", "counter"),
                ("/", "undo"), ("*", "menu")]

    def action_back(self) -> None:
        if self.how is not None:
            self.how = None
        elif self.against is not None:
            self.against = None
        else:
            self.app.goto("wires")
            return
        self.say("")
        self.redraw()

    def action_forward(self) -> None:
        self.app.goto("counter")
