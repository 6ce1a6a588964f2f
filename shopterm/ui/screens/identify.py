"""What thread is this? Measure a part at the bench and see which standard threads it could be.

One question at a time, every one answered from the keypad (``-`` steps back, keeping what was
typed): what the part is (bolt or nut, mm or inch) → its crest diameter (a bolt's major, a
nut's minor) → how the pitch was taken (gauge in mm or tpi, or a count of crests or spaces over
a length) → the flank angle from a gauge (60, 55, 47.5, 30 trapezoidal, 29 Acme, 0 square) →
for a bolt, more measurements if wanted: readings over wires (two sizes test the flank angle),
the width of the crest flat, a taper (the crest diameter at two places and the distance between
them) → the ranked candidates with their reasons, the worn-leadscrew note, and the telling
measurements: a digit on one (the taper, the crest flat, the angle, wires) asks for it and ranks
again. A digit on a candidate opens it: everything it was checked on and what tells it from the
others; from there Enter (or 1) makes it the job's thread and opens the set-up, or "cut to fit
a sample" hands it to the ``fitsample`` screen.

The screen computes nothing: ``shopterm.cutting.identify`` ranks, checks each measurement and
says what tells the candidates apart; the units module reads what was typed.
"""

from __future__ import annotations

import copy
from typing import Any

from rich.text import Text

from shopterm.errors import InvalidEntry, ShoptermError
from shopterm.ui.screens.stepview import TYPE_SIZE, StepScreen, wire_items, wire_label
from shopterm.units import format_length, parse_length, parse_number, parse_positive_length

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
    "crest_flat": "Width of the flat on a crest, loupe and rule [{unit}] (0: a rounded crest)",
    "taper_1": "Taper: the crest diameter at one place, with calipers [{unit}]",
    "taper_2": "Taper: the crest diameter at a second place along the thread [{unit}]",
    "taper_apart": "Taper: how far apart the two places are, along the thread [{unit}]",
}
PITCH_WAYS = (("pitch gauge in mm", "mm"), ("pitch gauge in tpi", "tpi"),
              ("count crests over a length", "crests"), ("count spaces over a length", "spaces"),
              ("pitch not measured", None))
ANGLES = (("60° (metric, Unified)", 60.0), ("55° (Whitworth form)", 55.0),
          ("47.5° (BA)", 47.5), ("not gauged", None), ("30° (trapezoidal)", 30.0),
          ("29° (Acme)", 29.0), ("0°: square flanks (square thread)", 0.0))
TAPER_HINT = ("Calipers square across the crests at two places along the thread, as far apart "
              "as the thread allows. A tapered pipe thread (R, NPT) grows 1 in 16 on "
              "diameter; a parallel one (G) not at all.")
CREST_FLAT_HINT = ("Look at a crest under a loupe against a rule or the caliper jaws: a "
                   "trapezoidal or Acme crest is a wide flat (over a third of the pitch), a 60° "
                   "crest a narrow one (an eighth), a Whitworth or BA crest rounded (type 0).")
#: The measurements this screen can ask for again from the candidates, by the core's
#: ``TellApart.measure``, in the order offered: with the calipers first (they are in hand: the
#: crest diameter was taken with them), then a gauge leaf, then wires.
ASK_FOR = {"taper": ("taper", "measure the taper (tapered or parallel?)"),
           "crest flat": ("crest_flat", "measure the crest flat (its width tells the form)"),
           "gauge": ("angle", "gauge the flank angle"),
           "wires": ("wires", "add a reading over wires"),
           "two wires": ("wires", "add a reading over wires")}


class IdentifyScreen(StepScreen):
    SCREEN_NAME = "identify"
    TITLE = "What thread is this?"
    ENTRY_STEPS = frozenset(QUESTIONS)
    HELP = (("1-9", "answer the question: pick a numbered choice"),
            ("digits . Enter", "type a measurement, Enter to go on (Enter alone skips "
                               "the diameter)"),
            ("-", "step back one question; what you typed is kept"),
            ("", "on the candidates, a digit opens one: Enter uses it as the job's thread; "
                 "2 cuts to fit a sample instead"),
            ("", "the candidates list the measurements that tell them apart: a digit asks "
                 "for one (the taper: two diameters and the distance between them)"),
            ("", "readings over two wire sizes tell a 60° thread from a 55° one"))

    def __init__(self) -> None:
        super().__init__()
        self.result = None                     # shopterm.cutting.identify.Identification
        self._result_key: str | None = None

    # -- the answers so far --------------------------------------------------------------------
    @property
    def unit(self) -> str:
        part = self.values.get("part")
        return part[1] if part else self.app.shop.display_units

    @property
    def kind(self) -> str:
        part = self.values.get("part")
        return part[0] if part else "external"

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
        if "extra" in v:                       # asked for from the candidates
            return self.measure_step(v["extra"])
        if self.kind == "external":
            if "more" not in v:
                return "wires"
            if v["more"]:
                return self.measure_step(v["more"])
        if "chosen" not in v:
            return "results"
        return "candidate"

    def measure_step(self, what: str) -> str:
        """Return the step of an optional measurement being taken."""
        v = self.values
        if what == "wires":
            if "wire" not in v:
                return "wire"
            return "wire_typed" if v["wire"] == TYPE_SIZE else "over"
        if what == "taper":
            return ("taper_1", "taper_2", "taper_apart")[len(v.get("taper_parts", ()))]
        return what                            # "crest_flat", "angle"

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
        for key in ("angle", "crest_flat", "taper"):
            if v.get(key) is not None:
                kw[key] = v[key]
        if v.get("wires"):
            kw["wires"] = [tuple(w) for w in v["wires"]]
        kw.update(more)
        return kw

    # -- drawing -------------------------------------------------------------------------------
    def show_step(self) -> None:
        if self.step() in ("results", "candidate"):
            self.identification()     # the same answers give the cached result
        super().show_step()

    def detail(self, step: str) -> Text | str:
        if step == "results":
            return self.results_text()
        if step == "candidate":
            return self.candidate_text()
        if step.startswith("taper"):
            return TAPER_HINT
        if step == "crest_flat":
            return CREST_FLAT_HINT
        if step in ("over", "wire", "wires"):
            from shopterm.cutting.wires import MEASURE_CAUTION
            return Text(f"Caution: {MEASURE_CAUTION}", style="bold")
        return ""

    def question(self, step: str) -> str:
        v = self.values
        wire = v.get("wire")
        return QUESTIONS[step].format(
            unit=self.unit, counted=v.get("pitch_how", "crests"),
            both=" (both end crests included)" if v.get("pitch_how") == "crests" else "",
            crest="Major diameter of the bolt" if self.kind == "external"
            else "Minor diameter of the nut (the bore)",
            wire=wire_label(wire, self.unit) if isinstance(wire, float) else "")

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
            return "Readings over wires, crest flat, taper (optional)", [
                ("show the candidates", False), (f"add {more}", "wires"),
                ("the crest flat: its width", "crest_flat"),
                ("the taper: the diameter at two places", "taper")]
        if step == "wire":
            return "Which wires?", wire_items(self.app.shop.wires, self.unit)
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
        return "", []

    def entered_text(self) -> Text:
        """Return what has been measured so far, in the units it was typed in."""
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
        if "crest_flat" in v:
            parts.append(f"crest flat {format_length(v['crest_flat'], u)}")
        if "taper" in v:
            d1, d2, apart = v["taper"]
            parts.append(f"taper {format_length(d1, u, suffix=False)} to "
                         f"{format_length(d2, u)} over {format_length(apart, u)}")
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

    def to_ask(self) -> list[tuple[str, str]]:
        """Return (step, label) of the measurements that would tell the close candidates
        apart and that can be taken here now, in ``ASK_FOR`` order."""
        r, v = self.result, self.values
        if not r.ambiguous:
            return []
        named = {t.measure for t in r.to_tell_apart}
        taken = {"taper": "taper" in v, "crest_flat": "crest_flat" in v,
                 "angle": v.get("angle") is not None, "wires": False}
        out: list[tuple[str, str]] = []
        for measure, (step, label) in ASK_FOR.items():
            if measure in named and not taken[step] and (step, label) not in out:
                out.append((step, label))
        return out

    def results_choices(self) -> tuple[str, list[tuple[str, Any]]]:
        r = self.result
        items: list[tuple[str, Any]] = [(f"{c.designation:<14} fit {c.score:4.0%}", i)
                                        for i, c in enumerate(r.candidates)]
        items += [(f"→ {label}", ("ask", step)) for step, label in self.to_ask()]
        head = ("Could be any of these — a digit shows one" if r.ambiguous else
                "Best fit first — a digit shows one")
        return head, items

    def results_text(self) -> Text:
        """Return the top candidates' reasons, the note and the telling measurement, in the
        lines left under the list (the reasons get what the rest leaves)."""
        r = self.result
        tall = (self.size.height or 24) >= 30
        ask = self.to_ask()
        tail: list[tuple[str, str]] = [(line, "bold") for line in self.wrapped(r.note, 4, "")]
        if len(r.candidates) > 1 and r.ambiguous:
            top = r.candidates[0].designation
            if ask:
                first = {m for m, (step, _) in ASK_FOR.items() if step == ask[0][0]}
                shown = [t for t in r.to_tell_apart if t.measure in first
                         and top in t.between][:1]
                tail.append(("To tell them apart:", "bold"))
            else:
                rival = r.candidates[1].designation
                shown = [t for t in r.to_tell_apart if set(t.between) == {top, rival}]
                shown = shown[:3 if tall else 2]
                tail.append((f"To tell {top} from {rival}:", "bold"))
            for t in shown:
                tail += [(line, "") for line in self.wrapped(f"• {t.how}", 3 if ask else 2)]
            tail.append(("A digit on a candidate shows what tells it from the others.", "dim"))
        elif r.candidates and not r.note:       # a note says what the fit is worth
            tail.append((f"Only {r.candidates[0].designation} fits well.", "bold"))
        # status, what was entered (2), message, question, the list, key bar
        room = (self.size.height or 24) - 6 - len(self.results_choices()[1]) - len(tail)
        out = Text()
        for i, c in enumerate(r.candidates[:3]):
            lines = self.wrapped(f"{i + 1} {c.designation}: {c.why}", 3 if tall else 2)
            if len(lines) > room:
                break
            room -= len(lines)
            for line in lines:
                out.append(line + "\n")
        for line, style in tail:
            out.append(line + "\n", style=style)
        out.rstrip()
        return out

    def candidate_text(self) -> Text:
        c = self.chosen()
        out = Text()
        for line in self.wrapped(f"fit {c.score:.0%}: {c.why}", 4):
            out.append(line + "\n")
        tells = [t for t in self.result.to_tell_apart if c.designation in t.between]
        if tells:
            out.append("What tells it from the others:\n", style="bold")
            room = max(2, (self.size.height or 24) - 16)
            lines: list[str] = []
            for t in tells:
                lines += self.wrapped(f"• {t.how}", 2)
            for line in lines[:room]:
                out.append(line + "\n")
        else:
            out.append("No close rival: nothing else needs checking.")
        return out

    # -- answering -----------------------------------------------------------------------------
    def chose(self, step: str, value: Any) -> bool:
        if step == "candidate":
            if value == "back":
                self.action_back()
            elif value == "use":
                self.use(self.chosen_spec())
            else:
                self.fit_sample(value)
            return False
        if step == "results":
            if isinstance(value, tuple):       # a telling measurement: ask for it
                self.answer("extra", value[1])
            else:
                self.answer("chosen", value)
        elif step == "wires":
            self.answer("more", value)
        else:
            self.answer(step, value)
            if step == "angle":
                self.values.pop("extra", None)  # gauged again from the candidates
        return True

    def fit_sample(self, cut: str) -> None:
        """Open the ``fitsample`` screen on the chosen candidate, cutting ``cut``."""
        readings = {w: self.typed.get(f"over{i}", "")
                    for i, (w, _m) in enumerate(self.values.get("wires", []))}
        self.app.screen_for("fitsample").begin(self.chosen_spec(), cut, self.unit, readings)
        self.app.goto("fitsample")

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

    def store_entry(self, step: str, value: Any) -> None:
        v = self.values
        if step in ("over", "crest_flat", "taper_apart"):
            # a measurement complete: kept, and back to where it was asked from
            self.history.append(copy.deepcopy(v))
            if step == "over":
                v["wires"] = v.get("wires", []) + [(v["wire"], value)]
            elif step == "crest_flat":
                v["crest_flat"] = value
            else:
                v["taper"] = (*v["taper_parts"], value)
            for key in ("wire", "taper_parts", "extra" if "extra" in v else "more"):
                v.pop(key, None)
        elif step == "wire_typed":
            self.answer("wire", value)        # the typed size replaces "type it"
        elif step in ("taper_1", "taper_2"):
            self.answer("taper_parts", [*v.get("taper_parts", []), value])
        else:
            self.answer(step, value)

    def read_entry(self, step: str, text: str):
        """Return the value typed at ``step`` checked by the core (mm); raise with what to do."""
        from shopterm.cutting.identify import measured, pitch_from_count
        u = self.unit
        if not text and step == "diameter":
            return None
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
        if step == "wire_typed":
            return parse_positive_length(text, u, "wire size")
        if step == "over":
            m = parse_positive_length(text, u, "reading over wires")
            measured(**self.measurements(wires=[(self.values["wire"], m)]))
            return m
        if step == "crest_flat":
            flat = parse_length(text, u)
            measured(**self.measurements(crest_flat=flat))
            return flat
        if step in ("taper_1", "taper_2"):
            return parse_positive_length(text, u, "crest diameter")
        apart = parse_positive_length(text, u, "distance between the two places")
        measured(**self.measurements(taper=(*self.values["taper_parts"], apart)))
        return apart

    # -- keys ----------------------------------------------------------------------------------
    def forward(self, step: str) -> None:
        if step == "candidate":
            self.use(self.chosen_spec())
        else:
            self.say("Answer the question with a digit; the candidates come after.")
