"""What thread is this? Measure a part at the bench and see which standard threads it could be.

One question at a time, every one answered from the keypad (``-`` steps back, keeping what was
typed): what the part is (bolt or nut, mm or inch) → its crest diameter (a bolt's major, a
nut's minor) → how the pitch was taken (gauge in mm or tpi, or a count of crests or spaces over
a length) → the flank angle from a gauge → readings over wires (bolts; as many sizes as wanted,
two sizes test the flank angle) → the ranked candidates with their reasons and what would tell
the top ones apart. A digit opens a candidate: everything it was checked on and what tells it
from the others; from there Enter (or 1) makes it the job's thread and opens the set-up, or
"cut to fit a sample" asks for the mating sample's pitch diameter (over wires, or known) and the
fit clearance and makes the job's thread a special whose pitch-diameter band fits the sample;
the job's thread entry says the target came from a sample.

The screen computes nothing: ``shopterm.cutting.identify`` ranks, ``shopterm.cutting.fit_sample``
makes the target, the units module reads what was typed.
"""

from __future__ import annotations

import copy
import textwrap
from typing import Any

from rich.text import Text
from textual import on
from textual.app import ComposeResult
from textual.widgets import Static

from shopterm.cutting.wires import ReadingSlip
from shopterm.errors import InvalidEntry, ShoptermError
from shopterm.ui import keys
from shopterm.ui.screens.base import ShopScreen
from shopterm.ui.widgets.entry import KeypadEntry
from shopterm.ui.widgets.picklist import PickList
from shopterm.units import format_length, parse_number, parse_positive_length

#: Candidates listed (the core ranks more; beyond six they are rarely worth a look).
LISTED = 6
#: Entry steps: the question asked, with ``{unit}`` for the unit the diameters are in.
QUESTIONS = {
    "diameter": "{crest} with calipers, on the crests [{unit}] (Enter alone: not measured)",
    "pitch": "Pitch from the gauge [mm]",
    "tpi": "Threads per inch from the gauge",
    "count": "How many {counted} counted{both}",
    "length": "Length from the first to the last crest counted [{unit}]",
    "wire_typed": "Wire size [{unit}]",
    "over": "Reading over the {wire} wires [{unit}]",
    "fit_wire_typed": "Wire size used on the sample [{unit}]",
    "fit_over": "Reading over the {wire} wires on the sample bolt [{unit}]",
    "fit_pd": "The sample bolt's pitch diameter [{unit}]",
    "clearance": "Fit clearance on pitch diameter [{unit}] (Enter alone: {default})",
}
ENTRY_STEPS = frozenset(QUESTIONS)
PITCH_WAYS = (("pitch gauge in mm", "mm"), ("pitch gauge in tpi", "tpi"),
              ("count crests over a length", "crests"), ("count spaces over a length", "spaces"),
              ("pitch not measured", None))
ANGLES = (("60° (metric, Unified)", 60.0), ("55° (Whitworth form)", 55.0),
          ("47.5° (BA)", 47.5), ("not gauged", None))
TYPE_SIZE = "type"


class MeasureEntry(KeypadEntry):
    """A number entry that also takes a unit typed after the number (``0.403in``, ``10.24mm``).

    Letters only, so ``-`` and ``/`` still reach the screen as back and undo.
    """

    def _accepts(self, ch: str) -> bool:
        return super()._accepts(ch) or ch in UNIT_CHARS


UNIT_CHARS = set("inmINM\"")


def wire_label(size_mm: float, unit: str, label: str = "") -> str:
    """Return a wire size as the owner reads it: 0.866 mm, 0.0290 in, with its label."""
    text = format_length(size_mm, unit, 0.0001 if unit == "in" else 0.001)
    return f"{text} ({label})" if label else text


class IdentifyScreen(ShopScreen):
    SCREEN_NAME = "identify"
    TITLE = "What thread is this?"
    AUTO_FOCUS = "#choices"
    CSS = """
    IdentifyScreen #entered { height: auto; max-height: 2; padding: 0 1; color: $text-muted; }
    IdentifyScreen #message { height: auto; max-height: 5; }
    IdentifyScreen #question { height: auto; padding: 0 1; text-style: bold; }
    IdentifyScreen #detail { height: 1fr; padding: 0 1; }
    """
    BINDINGS = [keys.bind(keys.CONFIRM, "confirm", "confirm", show=False)]
    HELP = (("1-9", "answer the question: pick a numbered choice"),
            ("digits . Enter", "type a measurement, Enter to go on (Enter alone skips "
                               "the diameter, or takes the usual clearance)"),
            ("-", "step back one question; what you typed is kept"),
            ("", "on the candidates, a digit opens one: Enter uses it as the job's thread; "
                 "2 cuts to fit a sample instead"),
            ("", "readings over two wire sizes tell a 60° thread from a 55° one"))

    def __init__(self) -> None:
        super().__init__()
        self.values: dict[str, Any] = {}
        self.history: list[dict[str, Any]] = []
        self.typed: dict[str, str] = {}        # what was typed at each entry, kept across `-`
        self.result = None                     # shopterm.cutting.identify.Identification
        self._result_key: str | None = None
        self.target = None                     # shopterm.cutting.fit_sample.SampleTarget

    def compose_body(self) -> ComposeResult:
        yield Static("", id="entered")
        yield Static("", id="message", classes="message")
        yield Static("", id="question")
        yield MeasureEntry(prompt="> ", id="number")
        yield PickList(columns=1, id="choices")
        yield Static("", id="detail")

    def on_mount(self) -> None:
        super().on_mount()
        self.show_step()

    def job_changed(self) -> None:
        self.show_step()

    # -- the answers so far --------------------------------------------------------------------
    @property
    def unit(self) -> str:
        part = self.values.get("part")
        return part[1] if part else self.app.shop.display_units

    @property
    def kind(self) -> str:
        part = self.values.get("part")
        return part[0] if part else "external"

    def answer(self, key: str, value: Any) -> None:
        """Record one answer, keeping the state before it for ``-``."""
        self.history.append(copy.deepcopy(self.values))
        self.values[key] = value

    def step_back(self) -> bool:
        if not self.history:
            return False
        self.values = self.history.pop()
        return True

    def step(self) -> str:
        """Return the name of the question to ask now (or of the view to show)."""
        v = self.values
        for key in ("part", "diameter", "pitch_how"):
            if key not in v:
                return key
        how = v["pitch_how"]
        if how in ("mm", "tpi") and how.replace("mm", "pitch") not in v:
            return how.replace("mm", "pitch")
        if how in ("crests", "spaces"):
            for key in ("count", "length"):
                if key not in v:
                    return key
        if "angle" not in v:
            return "angle"
        if self.kind == "external":
            if "more_wires" not in v:
                return "wires"
            if v["more_wires"]:
                if "wire" not in v:
                    return "wire"
                if v["wire"] == TYPE_SIZE:
                    return "wire_typed"
                return "over"
        if "chosen" not in v:
            return "results"
        if "fit_cut" not in v:
            return "candidate"
        if "fit_how" not in v:
            return "fit_how"
        if v["fit_how"] == "wires":
            if "fit_wire" not in v:
                return "fit_wire"
            if v["fit_wire"] == TYPE_SIZE:
                return "fit_wire_typed"
            if "fit_over" not in v:
                return "fit_over"
        elif "fit_pd" not in v:
            return "fit_pd"
        if "clearance" not in v:
            return "clearance"
        return "target"

    def typed_key(self, step: str) -> str:
        """Return where the text typed at ``step`` is kept (each wire reading has its own)."""
        if step in ("wire_typed", "over"):
            return f"{step}{len(self.values.get('wires', []))}"
        return step

    def measurements(self, **more) -> dict:
        """Return the keyword arguments for ``identify`` from the answers so far (mm)."""
        v = self.values
        kw: dict[str, Any] = {"kind": self.kind}
        if v.get("diameter") is not None:
            kw["major" if self.kind == "external" else "minor"] = v["diameter"]
        how = v.get("pitch_how")
        if how == "mm" and "pitch" in v:
            kw["pitch"] = v["pitch"]
        elif how == "tpi" and "tpi" in v:
            kw["tpi"] = v["tpi"]
        elif how in ("crests", "spaces") and "length" in v:
            kw.update(count=v["count"], length=v["length"], counted=how)
        if v.get("angle") is not None:
            kw["angle"] = v["angle"]
        if v.get("wires"):
            kw["wires"] = [tuple(w) for w in v["wires"]]
        kw.update(more)
        return kw

    # -- drawing -------------------------------------------------------------------------------
    def show_step(self) -> None:
        step = self.step()
        picks = self.query_one("#choices", PickList)
        entry = self.query_one("#number", KeypadEntry)
        question = self.query_one("#question", Static)
        self.query_one("#entered", Static).update(self.entered_text())
        detail: Text | str = ""
        if step in ("results", "candidate", "fit_how", "fit_wire", "fit_wire_typed",
                    "fit_over", "fit_pd", "clearance", "target"):
            self.identification()     # the same answers give the cached result
        if step in ENTRY_STEPS:
            picks.display = False
            entry.display = True
            question.update(Text(self.question(step)))
            entry.value = self.typed.get(self.typed_key(step), self.prefill(step))
            entry.focus()
        else:
            entry.display = False
            title, items = self.choices(step)
            question.update(Text(title))
            picks.set_items(items)
            picks.display = True
            picks.focus()
        if step == "results":
            detail = self.results_text()
        elif step == "candidate":
            detail = self.candidate_text()
        elif step == "target":
            detail = self.target_text()
        elif step in ("over", "fit_over", "wire", "fit_wire", "wires"):
            from shopterm.cutting.wires import MEASURE_CAUTION
            detail = Text(f"Caution: {MEASURE_CAUTION}", style="bold")
        self.query_one("#detail", Static).update(detail)

    def question(self, step: str) -> str:
        v = self.values
        wire = v.get("wire") if step == "over" else v.get("fit_wire")
        default = ""
        if step == "clearance":
            from shopterm.cutting.fit_sample import DEFAULT_BOLT_CLEARANCE, DEFAULT_NUT_CLEARANCE
            c = DEFAULT_NUT_CLEARANCE if v.get("fit_cut") == "internal" else DEFAULT_BOLT_CLEARANCE
            default = f"the usual {format_length(c, self.unit)}"
        return QUESTIONS[step].format(
            unit=self.unit, counted=v.get("pitch_how", "crests"),
            both=" (both end crests included)" if v.get("pitch_how") == "crests" else "",
            crest="Major diameter of the bolt" if self.kind == "external"
            else "Minor diameter of the nut (the bore)",
            wire=wire_label(wire, self.unit) if isinstance(wire, float) else "",
            default=default)

    def prefill(self, step: str) -> str:
        """Return the text an entry starts with: a reading already taken on the same wires."""
        if step != "fit_over":
            return ""
        wire = self.fit_wire_size()
        for i, (w, _m) in enumerate(self.values.get("wires", [])):
            if abs(w - wire) < 1e-9:
                return self.typed.get(f"over{i}", "")
        return ""

    def choices(self, step: str) -> tuple[str, list[tuple[str, Any]]]:
        """Return (question, numbered choices) for a pick step."""
        v = self.values
        if step == "part":
            units = [self.app.shop.display_units] + [u for u in ("mm", "in")
                                                     if u != self.app.shop.display_units]
            items = []
            for u in units:
                words = "mm" if u == "mm" else "inches"
                items += [(f"a bolt (external), diameters in {words}", ("external", u)),
                          (f"a nut (internal), diameters in {words}", ("internal", u))]
            return "What is the part?", items
        if step == "pitch_how":
            return "How was the pitch taken?", list(PITCH_WAYS)
        if step == "angle":
            return "Flank angle from a gauge or centre gauge", list(ANGLES)
        if step == "wires":
            n = len(v.get("wires", []))
            more = "another reading over wires (a second size tests the angle)" if n else \
                "a reading over wires"
            return "Readings over wires (optional)", [("show the candidates", False),
                                                     (f"add {more}", True)]
        if step == "wire":
            return "Which wires?", self.wire_items(self.app.shop.wires)
        if step == "results":
            return self.results_choices()
        if step == "candidate":
            c = self.chosen()
            cuts = [("a nut to fit the sample bolt", "internal"),
                    ("a bolt to fit the nut the sample bolt fits", "external")]
            if self.kind == "internal":
                cuts.reverse()
            return (f"{c.designation}: what now?", [("use it as the job's thread → set-up", "use")]
                    + [(f"cut to fit a sample: {what}", cut) for what, cut in cuts]
                    + [("back to the candidates", "back")])
        if step == "fit_how":
            return "The sample bolt's pitch diameter", [("measure it over wires", "wires"),
                                                       ("I know it: type it", "pd")]
        if step == "fit_wire":
            from shopterm.cutting.wires import wire_range
            spec = self.chosen().spec
            rng = wire_range(spec.form, spec.pitch)
            fitting = [w for w in self.app.shop.wires if rng.fits(w.size)]
            title = (f"Which wires? ({wire_label(rng.smallest, self.unit)} to "
                     f"{wire_label(rng.largest, self.unit)} suit {self.chosen().designation})")
            return title, self.wire_items(fitting)
        if step == "target":
            return "Target from the sample", [("use this target as the job's thread → set-up",
                                               "use"), ("change the clearance", "back")]
        return "", []

    def wire_items(self, owned) -> list[tuple[str, Any]]:
        items = [(wire_label(w.size, self.unit, w.label), w.size) for w in owned][:8]
        return items + [("another size: type it", TYPE_SIZE)]

    def entered_text(self) -> Text:
        """Return one line of what has been measured so far, in the units it was typed in."""
        v, u = self.values, self.unit
        if "part" not in v:
            return Text("Measure the part: calipers on the crests, a pitch gauge or a rule.")
        parts = ["bolt" if self.kind == "external" else "nut"]
        if "diameter" in v:
            what = "major" if self.kind == "external" else "minor"
            parts.append(f"{what} {format_length(v['diameter'], u)}" if v["diameter"] is not None
                         else f"{what} not measured")
        how = v.get("pitch_how")
        if how == "mm" and "pitch" in v:
            parts.append(f"pitch {format_length(v['pitch'], 'mm')}")
        elif how == "tpi" and "tpi" in v:
            parts.append(f"{v['tpi']:g} tpi")
        elif how in ("crests", "spaces") and "length" in v:
            parts.append(f"{v['count']} {how} over {format_length(v['length'], u)}")
        elif "pitch_how" in v and how is None:
            parts.append("pitch not measured")
        if "angle" in v:
            parts.append(f"{v['angle']:g}°" if v["angle"] is not None else "angle not gauged")
        for w, m in v.get("wires", []):
            parts.append(f"{format_length(m, u)} over {wire_label(w, u)} wires")
        return Text(" · ".join(parts))

    # -- the candidates ------------------------------------------------------------------------
    def identification(self):
        """Return the identification for the answers (computed once per set of answers)."""
        from shopterm.cutting.identify import identify
        kw = self.measurements()
        key = repr(sorted(kw.items()))
        if key != self._result_key:
            self.result = identify(limit=LISTED, **kw)
            self._result_key = key
        return self.result

    def chosen(self):
        return self.result.candidates[self.values["chosen"]]

    def chosen_spec(self):
        """Return the chosen candidate's thread, its pitch written out (M10x1.5, not M10)."""
        return self.chosen().spec.with_(pitch_implied=False)

    def results_choices(self) -> tuple[str, list[tuple[str, Any]]]:
        r = self.result
        items = [(f"{c.designation:<14} fit {c.score:4.0%}", i)
                 for i, c in enumerate(r.candidates)]
        head = ("Could be any of these — a digit shows one" if r.ambiguous else
                "Best fit first — a digit shows one")
        return head, items

    def _lines(self, text: str, limit: int, indent: str = "  ") -> list[str]:
        width = max(30, (self.size.width or 80) - 4)
        lines = textwrap.wrap(text, width, subsequent_indent=indent, break_on_hyphens=False)
        if len(lines) > limit:
            lines = lines[:limit]
            lines[-1] = lines[-1][:width - 1].rstrip() + "…"
        return lines

    def results_text(self) -> Text:
        r = self.result
        out = Text()
        tall = (self.size.height or 24) >= 30
        for i, c in enumerate(r.candidates[:3]):
            for line in self._lines(f"{i + 1} {c.designation}: {c.why}", 3 if tall else 2):
                out.append(line + "\n")
        if r.note:
            out.append(r.note + "\n", style="bold")
        if len(r.candidates) > 1 and r.ambiguous:
            top = r.candidates[0].designation
            rival = r.candidates[1].designation
            out.append(f"To tell {top} from {rival}:\n", style="bold")
            shown = [t for t in r.to_tell_apart if set(t.between) == {top, rival}]
            for t in shown[:3 if tall else 2]:
                for line in self._lines(f"• {t.how}", 2):
                    out.append(line + "\n")
            out.append("A digit on a candidate shows what tells it from the others.", style="dim")
        elif r.candidates:
            out.append(f"Only {r.candidates[0].designation} fits well.", style="bold")
        return out

    def candidate_text(self) -> Text:
        c = self.chosen()
        out = Text()
        for line in self._lines(f"fit {c.score:.0%}: {c.why}", 4):
            out.append(line + "\n")
        tells = [t for t in self.result.to_tell_apart if c.designation in t.between]
        if tells:
            out.append("What tells it from the others:\n", style="bold")
            room = max(2, (self.size.height or 24) - 16)
            lines: list[str] = []
            for t in tells:
                lines += self._lines(f"• {t.how}", 2)
            for line in lines[:room]:
                out.append(line + "\n")
        else:
            out.append("No close rival: nothing else needs checking.")
        return out

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
            for line in self._lines(note, 3):
                out.append(line + "\n")
        return out

    # -- answering -----------------------------------------------------------------------------
    @on(PickList.Picked, "#choices")
    def picked(self, event: PickList.Picked) -> None:
        event.stop()
        step, value = self.step(), event.value
        self.say("")
        if step == "candidate":
            if value == "back":
                self.action_back()
                return
            if value == "use":
                self.use(self.chosen_spec())
                return
            self.answer("fit_cut", value)
        elif step == "target":
            if value == "back":
                self.action_back()
                return
            self.use(self.target.spec, self.target.record())
            return
        elif step == "wires":
            self.answer("more_wires", value)
        elif step == "fit_wire" and value != TYPE_SIZE:
            from shopterm.cutting.wires import require_wire
            spec = self.chosen().spec
            try:
                require_wire(spec.form, spec.pitch, value, self.app.shop.wires, self.unit)
            except ShoptermError as exc:
                self.say(str(exc), error=True)
                return
            self.answer("fit_wire", value)
        elif step == "results":
            self.answer("chosen", value)
        else:
            self.answer(step, value)
        self.go_on()

    def go_on(self) -> None:
        """Show the next question; refuse (and step back) if the core cannot use the answers."""
        if self.step() == "results":
            try:
                self.identification()
            except ShoptermError as exc:
                self.step_back()
                self.say(f"{exc} Press - to change an answer.", error=True)
                self.show_step()
                return
        self.show_step()

    @on(KeypadEntry.Submitted, "#number")
    def submitted(self, event: KeypadEntry.Submitted) -> None:
        event.stop()
        self.take_entry(event.value)

    def take_entry(self, raw: str) -> None:
        """Check what was typed at the current entry step and go on, or say what to change."""
        step = self.step()
        if step not in ENTRY_STEPS:
            return
        text = raw.strip()
        self.typed[self.typed_key(step)] = raw
        try:
            value = self.read_entry(step, text)
        except ReadingSlip as exc:
            self.say(f"{exc} From the keypad alone, type it converted to {self.unit}.",
                     error=True)
            return
        except ShoptermError as exc:
            self.say(str(exc), error=True)
            return
        self.say("")
        if step == "over":
            wire = self.values["wire"]
            self.history.append(copy.deepcopy(self.values))
            v = self.values
            v["wires"] = v.get("wires", []) + [(wire, value)]
            for key in ("more_wires", "wire"):
                v.pop(key, None)
        elif step == "wire_typed":
            self.answer("wire", value)        # the typed size replaces "type it"
        elif step == "fit_wire_typed":
            self.answer("fit_wire", value)
        else:
            self.answer(step, value)
        self.go_on()

    def read_entry(self, step: str, text: str):
        """Return the value typed at ``step`` checked by the core (mm); raise with what to do."""
        from shopterm.cutting.identify import measured, pitch_from_count
        u = self.unit
        if not text and step == "diameter":
            return None
        if not text and step == "clearance":
            from shopterm.cutting.fit_sample import DEFAULT_BOLT_CLEARANCE, DEFAULT_NUT_CLEARANCE
            value = (DEFAULT_NUT_CLEARANCE if self.values["fit_cut"] == "internal"
                     else DEFAULT_BOLT_CLEARANCE)
            self.make_target(value)
            return value
        if not text:
            raise InvalidEntry("Type the value, then Enter (or - to step back).")
        if step == "diameter":
            d = parse_positive_length(text, u, "diameter")
            measured(**{"major" if self.kind == "external" else "minor": d}, kind=self.kind)
            return d
        if step == "pitch":
            p = parse_positive_length(text, "mm", "pitch")
            measured(pitch=p)
            return p
        if step == "tpi":
            n = parse_number(text)
            measured(tpi=n)
            return n
        if step == "count":
            try:
                n = int(text)
            except ValueError:
                raise InvalidEntry(f"{text!r} is not a whole number: count the "
                                   f"{self.values['pitch_how']}, e.g. 11.") from None
            pitch_from_count(n, 1.0, self.values["pitch_how"])   # the count alone is checked
            return n
        if step == "length":
            length = parse_positive_length(text, u, "length")
            measured(count=self.values["count"], length=length,
                     counted=self.values["pitch_how"])
            return length
        if step in ("wire_typed", "fit_wire_typed"):
            w = parse_positive_length(text, u, "wire size")
            if step == "fit_wire_typed":
                from shopterm.cutting.wires import require_wire
                spec = self.chosen().spec
                require_wire(spec.form, spec.pitch, w, self.app.shop.wires, u)
            return w
        if step == "over":
            m = parse_positive_length(text, u, "reading over wires")
            wire = self.values["wire"]
            measured(**self.measurements(wires=[(wire, m)]))
            return m
        if step == "fit_over":
            from shopterm.cutting.fit_sample import sample_pitch_diameter
            m = parse_positive_length(text, u, "reading over wires")
            sample_pitch_diameter(self.chosen().spec, self.fit_wire_size(), m)
            return m
        if step == "fit_pd":
            return parse_positive_length(text, u, "pitch diameter")
        if step == "clearance":
            c = parse_length_zero_ok(text, u)
            self.make_target(c)
            return c
        raise InvalidEntry("Nothing to type here: pick a numbered choice.")

    def fit_wire_size(self) -> float:
        return self.values["fit_wire"]

    def make_target(self, clearance: float) -> None:
        """Make the target from the sample (``target_from_sample``); raises what to change."""
        from shopterm.cutting.fit_sample import target_from_sample
        v = self.values
        spec = self.chosen_spec()
        if v["fit_how"] == "wires":
            self.target = target_from_sample(spec, v["fit_cut"], wire=self.fit_wire_size(),
                                             readings=v["fit_over"], clearance=clearance)
        else:
            self.target = target_from_sample(spec, v["fit_cut"], sample_pd=v["fit_pd"],
                                             clearance=clearance)

    def use(self, spec, extra: dict | None = None) -> None:
        """Make ``spec`` the job's thread (with ``extra`` in its record entry) and go to set-up."""
        if not self.app.thread_chosen(spec, extra):
            self.say("The thread was not recorded (see the message above); try again.",
                     error=True)
            return
        self.say(f"{spec.designation} is the job's thread.")
        self.app.goto("setup")

    # -- keys ----------------------------------------------------------------------------------
    def action_back(self) -> None:
        if self.step_back():
            self.say("")
            self.show_step()
        else:
            self.app.go_back(self.SCREEN_NAME)

    def action_forward(self) -> None:
        step = self.step()
        if step in ENTRY_STEPS:
            self.take_entry(self.query_one("#number", KeypadEntry).value)
        elif step == "candidate":
            self.use(self.chosen_spec())
        elif step == "target":
            self.use(self.target.spec, self.target.record())
        else:
            self.say("Answer the question with a digit; the candidates come after.")

    def action_confirm(self) -> None:
        # Enter that no widget took (e.g. focus lost): act as the highlighted choice.
        if self.step() not in ENTRY_STEPS:
            picks = self.query_one("#choices", PickList)
            picks.pick(picks.cursor)


def parse_length_zero_ok(text: str, unit: str) -> float:
    """Return a length [mm] that may be zero (a clearance); negative is refused."""
    from shopterm.units import parse_length
    mm = parse_length(text, unit)
    if mm < 0:
        raise InvalidEntry("The clearance cannot be negative: type 0 for a fit as snug as "
                           "the sample.")
    return mm
