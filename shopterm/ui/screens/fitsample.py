"""Cut to fit a sample: the job's target band taken from a mating part, not from a class.

Reached from "What thread is this?" with the candidate chosen there (``begin``), or on its own
for the job's thread. One question at a time, from the keypad: what is cut (a nut to fit the
sample bolt, or a bolt to fit the nut that bolt fits) → the sample bolt's pitch diameter, over
wires (which wires, the reading) or typed when known → the fit clearance (Enter alone: the
usual one) → the target: a special thread whose pitch-diameter band fits the sample; Enter
makes it the job's thread (its record entry says the target came from a sample) and opens the
set-up.

The screen computes nothing: ``shopterm.cutting.fit_sample`` makes the target and checks the
sample's readings, ``shopterm.cutting.wires`` the wire.
"""

from __future__ import annotations

from typing import Any

from rich.text import Text

from shopterm.errors import InvalidEntry, ShoptermError
from shopterm.ui.screens.stepview import TYPE_SIZE, StepScreen, wire_items, wire_label
from shopterm.units import format_length, parse_length, parse_positive_length

QUESTIONS = {
    "wire_typed": "Wire size used on the sample [{unit}]",
    "over": "Reading over the {wire} wires on the sample bolt [{unit}]",
    "pd": "The sample bolt's pitch diameter [{unit}]",
    "clearance": "Fit clearance on pitch diameter [{unit}] (Enter alone: {default})",
}


class FitSampleScreen(StepScreen):
    SCREEN_NAME = "fitsample"
    TITLE = "Cut to fit a sample"
    ENTRY_STEPS = frozenset(QUESTIONS)
    HELP = (("1-9", "pick a numbered choice"),
            ("digits . Enter", "type a reading or size, Enter to go on (Enter alone takes the "
                               "usual clearance)"),
            ("-", "step back one question; what you typed is kept; from the first question, "
                  "back to the thread it started from"),
            ("Enter / +", "on the target: make it the job's thread and go to the set-up"))

    def __init__(self) -> None:
        super().__init__()
        self.reference = None       # ThreadSpec the sample is a thread of
        self.from_identify = False
        self.own_unit: str | None = None
        self.readings: dict[float, str] = {}   # wire [mm] → reading typed on "What thread"
        self.target = None          # shopterm.cutting.fit_sample.SampleTarget

    def begin(self, reference, cut: str, unit: str, readings: dict[float, str]) -> None:
        """Start on ``reference`` (a candidate chosen on "What thread is this?"), cutting
        ``cut`` ('internal': a nut to fit the sample bolt; 'external': a bolt), lengths in
        ``unit``; ``readings``: what was typed over each wire size there, offered again."""
        self.reference, self.from_identify = reference, True
        self.own_unit, self.readings = unit, dict(readings)
        self.values, self.history, self.typed, self.target = {"cut": cut}, [], {}, None
        if self.is_mounted:
            self.say("")
            self.show_step()

    def on_screen_resume(self) -> None:
        super().on_screen_resume()
        self.show_step()              # the job's thread may have changed meanwhile

    @property
    def unit(self) -> str:
        return self.own_unit or self.app.shop.display_units

    def thread(self):
        """Return the thread the sample is of: the one handed over, else the job's."""
        if self.reference is None and self.app.spec is not None:
            return self.app.spec.with_(pitch_implied=False)
        return self.reference

    def refusal(self) -> str:
        """Return why the thread cannot be cut to a sample (a tapered one), or ''."""
        from shopterm.cutting.fit_sample import check_sample_thread
        try:
            check_sample_thread(self.thread())
        except ShoptermError as exc:
            return str(exc)
        return ""

    # -- the questions --------------------------------------------------------------------------
    def step(self) -> str:
        v = self.values
        if self.thread() is None:
            return "no_thread"
        if self.refusal():
            return "refused"
        if "cut" not in v:
            return "cut"
        if "how" not in v:
            return "how"
        if v["how"] == "wires":
            if "wire" not in v:
                return "wire"
            if v["wire"] == TYPE_SIZE:
                return "wire_typed"
            if "over" not in v:
                return "over"
        elif "pd" not in v:
            return "pd"
        if "clearance" not in v:
            return "clearance"
        return "target"

    def question(self, step: str) -> str:
        from shopterm.cutting.fit_sample import DEFAULT_BOLT_CLEARANCE, DEFAULT_NUT_CLEARANCE
        wire = self.values.get("wire")
        c = DEFAULT_NUT_CLEARANCE if self.values.get("cut") == "internal" else \
            DEFAULT_BOLT_CLEARANCE
        return QUESTIONS[step].format(
            unit=self.unit, wire=wire_label(wire, self.unit) if isinstance(wire, float) else "",
            default=f"the usual {format_length(c, self.unit)}")

    def prefill(self, step: str) -> str:
        """Return a reading already taken over the same wires on "What thread is this?"."""
        if step != "over":
            return ""
        return next((text for w, text in self.readings.items()
                     if abs(w - self.values["wire"]) < 1e-9), "")

    def choices(self, step: str) -> tuple[str, list[tuple[str, Any]]]:
        if step == "no_thread":
            return ("No thread to fit yet: identify the sample or choose the thread",
                    [("What thread is this? (measure the sample)", "identify"),
                     ("choose the thread", "thread")])
        if step == "refused":
            return self.refusal(), [("back", "back")]
        if step == "cut":
            cuts = [("a nut to fit the sample bolt", "internal"),
                    ("a bolt to fit the nut the sample bolt fits", "external")]
            if not self.thread().is_external:
                cuts.reverse()
            return f"{self.designation()}: what is cut to fit the sample?", cuts
        if step == "how":
            return "The sample bolt's pitch diameter", [("measure it over wires", "wires"),
                                                       ("I know it: type it", "pd")]
        if step == "wire":
            from shopterm.cutting.wires import wire_range
            spec = self.thread()
            rng = wire_range(spec.form, spec.pitch)
            fitting = [w for w in self.app.shop.wires if rng.fits(w.size)]
            title = (f"Which wires? ({wire_label(rng.smallest, self.unit)} to "
                     f"{wire_label(rng.largest, self.unit)} suit {self.designation()})")
            return title, wire_items(fitting, self.unit)
        if step == "target":
            return "Target from the sample", [("use this target as the job's thread → set-up",
                                               "use"), ("change the clearance", "back")]
        return "", []

    def designation(self) -> str:
        return self.thread().with_(tol_class=None).designation

    def entered_text(self) -> Text:
        spec = self.thread()
        if spec is None:
            return Text("Cut to fit a sample: a thread to start from is needed.")
        cut = self.values.get("cut")
        what = {"internal": "a nut to fit the sample bolt",
                "external": "a bolt to fit the nut the sample bolt fits"}.get(cut, "")
        parts = [f"sample: {self.designation()}"] + ([f"cutting {what}"] if what else [])
        if isinstance(self.values.get("over"), float):
            parts.append(f"{format_length(self.values['over'], self.unit)} over "
                         f"{wire_label(self.values['wire'], self.unit)} wires")
        elif "pd" in self.values:
            parts.append(f"pitch diameter {format_length(self.values['pd'], self.unit)}")
        return Text(" · ".join(parts))

    def detail(self, step: str) -> Text | str:
        if step == "target":
            return self.target_text()
        if step in ("wire", "over"):
            from shopterm.cutting.wires import MEASURE_CAUTION
            return Text(f"Caution: {MEASURE_CAUTION}", style="bold")
        return ""

    def target_text(self) -> Text:
        t = self.target
        out = Text()
        lim = t.limits
        out.append(f"{t.spec.designation}\n", style="bold")
        out.append(f"pitch diameter {format_length(lim.pd_min, self.unit)} to "
                   f"{format_length(lim.pd_max, self.unit)} "
                   f"(sample {format_length(t.sample_pd, self.unit)}, clearance "
                   f"{format_length(t.clearance, self.unit)})\n", style="bold")
        for note in t.notes[1:]:
            for line in self.wrapped(note, 3):
                out.append(line + "\n")
        return out

    # -- answering ------------------------------------------------------------------------------
    def chose(self, step: str, value: Any) -> bool:
        if step == "no_thread":
            self.app.goto(value)
            return False
        if step == "refused":
            self.leave_back()
            return False
        if step == "target":
            if value == "back":
                self.action_back()
            else:
                self.use(self.target.spec, self.target.record())
            return False
        if step == "wire" and value != TYPE_SIZE:
            from shopterm.cutting.wires import require_wire
            spec = self.thread()
            try:
                require_wire(spec.form, spec.pitch, value, self.app.shop.wires, self.unit)
            except ShoptermError as exc:
                self.say(str(exc), error=True)
                return False
        self.answer(step, value)
        return True

    def store_entry(self, step: str, value: Any) -> None:
        self.answer("wire" if step == "wire_typed" else step, value)   # a size replaces "type it"

    def read_entry(self, step: str, text: str):
        u = self.unit
        if not text and step == "clearance":
            from shopterm.cutting.fit_sample import DEFAULT_BOLT_CLEARANCE, DEFAULT_NUT_CLEARANCE
            value = (DEFAULT_NUT_CLEARANCE if self.values["cut"] == "internal"
                     else DEFAULT_BOLT_CLEARANCE)
            self.make_target(value)
            return value
        if not text:
            raise InvalidEntry("Type the value, then Enter (or - to step back).")
        if step == "wire_typed":
            from shopterm.cutting.wires import require_wire
            w = parse_positive_length(text, u, "wire size")
            spec = self.thread()
            require_wire(spec.form, spec.pitch, w, self.app.shop.wires, u)
            return w
        if step == "over":
            from shopterm.cutting.fit_sample import sample_pitch_diameter
            m = parse_positive_length(text, u, "reading over wires")
            sample_pitch_diameter(self.thread(), self.values["wire"], m)
            return m
        if step == "pd":
            return parse_positive_length(text, u, "pitch diameter")
        c = parse_length(text, u)       # the clearance: zero allowed, negative refused
        if c < 0:
            raise InvalidEntry("The clearance cannot be negative: type 0 for a fit as snug as "
                               "the sample.")
        self.make_target(c)
        return c

    def make_target(self, clearance: float) -> None:
        """Make the target from the sample (``target_from_sample``); raises what to change."""
        from shopterm.cutting.fit_sample import target_from_sample
        v = self.values
        spec = self.thread()
        if v["how"] == "wires":
            self.target = target_from_sample(spec, v["cut"], wire=v["wire"],
                                             readings=v["over"], clearance=clearance)
        else:
            self.target = target_from_sample(spec, v["cut"], sample_pd=v["pd"],
                                             clearance=clearance)

    # -- keys -----------------------------------------------------------------------------------
    def forward(self, step: str) -> None:
        if step == "target":
            self.use(self.target.spec, self.target.record())
        else:
            self.say("Answer the question with a digit; the target comes after.")

    def leave_back(self) -> None:
        if self.from_identify:
            self.app.goto("identify")
        else:
            self.app.go_back(self.SCREEN_NAME)
