"""A special thread, entered from the keypad: reached from the "Special thread" family on the
thread screen, and handed back to it made (where "This thread" can change its kind, class,
hand and starts, and use it).

One question at a time: the unit the diameters are in → the major diameter → the pitch as mm
or threads per inch → the pitch → the form angle (60, 55, 47.5) → the allowance on pitch and
major diameter → the pitch-diameter tolerance → external or internal. ``-`` steps back one
answer keeping what was typed; from the first question, back to the thread families.

The screen computes nothing: ``shopterm.standards.special.make`` makes and checks the thread.
"""

from __future__ import annotations

from typing import Any

from rich.text import Text

from shopterm.errors import InvalidEntry, ShoptermError
from shopterm.ui.screens.stepview import StepScreen
from shopterm.units import parse_number

#: Entry steps: the question, with ``{unit}`` for the unit chosen first.
QUESTIONS = {
    "major": "Major diameter [{unit}]",
    "pitch": "Pitch [mm]",
    "tpi": "Threads per inch",
    "allowance": "Allowance on PD and major (0 for none) [{unit}]",
    "pd_tol": "Pitch-diameter tolerance (0 for basic only) [{unit}]",
}
ORDER = ("unit", "major", "pitch_kind", "pitch", "angle", "allowance", "pd_tol", "kind")
CHOICES = {
    "unit": ("Special thread: diameters in", [("mm", "mm"), ("inch", "in")]),
    "pitch_kind": ("Pitch given as", [("pitch in mm", "mm"), ("threads per inch", "tpi")]),
    "angle": ("Form angle", [("60° (ISO, Unified)", 60.0), ("55° (Whitworth)", 55.0),
                             ("47.5° (BA)", 47.5)]),
    "kind": ("External or internal", [("external (screw)", "external"),
                                      ("internal (nut)", "internal")]),
}


class SpecialThreadScreen(StepScreen):
    SCREEN_NAME = "special"
    TITLE = "Special thread"
    ENTRY_STEPS = frozenset(QUESTIONS)
    HELP = (("1-9", "pick a numbered choice"),
            ("digits . Enter", "type a size, Enter to go on"),
            ("-", "step back one question; what you typed is kept; from the first question, "
                  "back to the thread families"))

    def step(self) -> str:
        for key in ORDER:
            if key not in self.values:
                if key == "pitch" and self.values.get("pitch_kind") == "tpi":
                    return "tpi"
                return key
        return "kind"

    @property
    def unit(self) -> str:
        return self.values.get("unit", "mm")

    def question(self, step: str) -> str:
        return QUESTIONS[step].format(unit=self.unit)

    def choices(self, step: str) -> tuple[str, list[tuple[str, Any]]]:
        title, items = CHOICES[step]
        return title, list(items)

    def entered_text(self) -> Text:
        v = self.values
        if "unit" not in v:
            return Text("A thread of no standard: its size, pitch, form and tolerance.")
        parts = [f"diameters in {v['unit']}"]
        for key, words in (("major", "major"), ("pitch", "pitch"), ("angle", "angle"),
                           ("allowance", "allowance"), ("pd_tol", "PD tolerance")):
            if key in v:
                value = f"{v[key]:g}" + (
                    (" tpi" if v["pitch_kind"] == "tpi" else " mm") if key == "pitch"
                    else "°" if key == "angle" else f" {v['unit']}")
                parts.append(f"{words} {value}")
        return Text(" · ".join(parts))

    def read_entry(self, step: str, text: str) -> float:
        value = parse_number(text)
        if step in ("major", "pitch", "tpi") and value <= 0:
            raise InvalidEntry("It must be greater than zero.")
        if value < 0:
            raise InvalidEntry("It cannot be negative: type 0 for none.")
        return value

    def store_entry(self, step: str, value: Any) -> None:
        self.answer("pitch" if step == "tpi" else step, value)

    def chose(self, step: str, value: Any) -> bool:
        if step != "kind":
            self.answer(step, value)
            return True
        try:
            spec = self.make(value)
        except ShoptermError as exc:
            self.say(f"{exc} Press - to change the last value.", error=True)
            return False
        self.app.screen_for("thread").take_special(spec)
        self.app.goto("thread")
        return False

    def make(self, kind: str):
        """Return the special thread for the answers (``special.make``, limits checked)."""
        from shopterm.standards import limits, special
        from shopterm.units import to_mm
        s, unit = self.values, self.unit
        kwargs = dict(angle_deg=s["angle"], kind=kind, unit=unit,
                      allowance_mm=to_mm(s["allowance"], unit),
                      pd_tolerance_mm=to_mm(s["pd_tol"], unit) or None)
        if s["pitch_kind"] == "tpi":
            kwargs["tpi"] = s["pitch"]
        else:
            kwargs["pitch_mm"] = s["pitch"]
        spec = special.make(to_mm(s["major"], unit), **kwargs)
        limits(spec)
        return spec

    def begin(self) -> None:
        """Start again from the first question (what was typed before is kept to offer)."""
        self.values, self.history = {}, []
        if self.is_mounted:
            self.say("")
            self.show_step()

    def forward(self, step: str) -> None:
        self.say("Answer the question with a digit.")

    def leave_back(self) -> None:
        self.app.goto("thread")
