"""Lathe set-up: change gears (or the gearbox position), the thread-dial plan, how the work is
held, where the tool runs out, and for a multi-start thread how to index to the next start.

The screen asks one thing at a time on a numbered list: a digit answers and goes on to the next
question, ``-`` goes back a question, ``+`` goes on without changing the answer, Enter records
the whole set-up (``app.record_setup``). The summary at the top always shows every answer.
The gear search runs in a worker thread (the first search for a gear set builds its table).
Screens never compute a dimension: every number here comes from ``shopterm.lathe``.
"""

from __future__ import annotations

import json
from dataclasses import dataclass
from fractions import Fraction

from rich.text import Text
from textual import events, on, work
from textual.app import ComposeResult
from textual.message import Message
from textual.widgets import Static

from shopterm.errors import InvalidEntry, ShoptermError
from shopterm.lathe.gears import GearTrain, lead_made, trains_for_lathe
from shopterm.lathe.indexing import IndexMethod, indexing_for_lathe
from shopterm.lathe.thread_dial import DialPlan, dial_plan
from shopterm.ui import keys
from shopterm.ui.screens.base import ShopScreen
from shopterm.ui.screens.cutview import LengthEntry
from shopterm.ui.screens.taperview import (LENGTH_QUESTION, TAPER_QUESTION, is_tapered,
                                           taper_options, taper_summary, taper_value)
from shopterm.ui.widgets.entry import KeypadEntry
from shopterm.ui.widgets.picklist import PickList
from shopterm.units import format_length

#: How many trains the list offers (best first).
TRAINS_SHOWN = 6

#: The keys this screen writes into the set-up record.
SETUP_KEYS = ("train", "box", "dial_plan", "indexing", "indexing_method", "between_centres",
              "relief", "for_thread", "starts", "taper")

HELD = (("in a chuck", False), ("between centres (carrier and driving plate)", True))
RUNOUT = (("into a relief groove (undercut)", True), ("to a mark or a stop (no relief)", False))

GEAR_HEADER = "   gears                   error    per 25 mm    per 1 in"

NO_DIAL_TEXT = "No thread dial: keep the half nut closed; reverse the spindle to run back."


# --------------------------------------------------------------------------------------------
# Words and payloads (pure: the tests call these too)
# --------------------------------------------------------------------------------------------

def train_gears(train: GearTrain) -> str:
    """Return the gears of a train in a few characters: ``60 > idler > 127``, ``30/55 x 65/75``."""
    if train.kind == "simple":
        gears = f"{train.drivers[0]} > idler > {train.driven[0]}"
    elif train.kind == "compound":
        (a, c), (b, d) = train.drivers, train.driven
        gears = f"{a}/{b} x {c}/{d}"
    else:
        return f"box {train.box} alone"
    return f"box {train.box} + {gears}" if train.box is not None else gears


def train_row(train: GearTrain) -> str:
    """Return one line of the gear list: gears, error %, over 25 mm [mm] and over 1 in [in]."""
    if train.exact:
        return f"{train_gears(train):<22}{'exact':>8}"
    return (f"{train_gears(train):<22}{train.error_pct:>+8.4f}%"
            f"{train.error_per_25mm:>+10.4f} mm{train.error_per_inch:>+9.5f} in")


def train_placement(train: GearTrain, has_box: bool) -> str:
    """Return which gear goes where (drivers, driven, idler) in one or two short sentences."""
    last = "the gearbox input" if has_box else "the leadscrew"
    if train.kind == "box":
        return f"Set the gearbox to {train.box}; no change gears to fit for this lead."
    if train.kind == "simple":
        words = (f"Driver {train.drivers[0]} on the stud, any idler to bridge the gap, "
                 f"driven {train.driven[0]} on {last}.")
    else:
        (a, c), (b, d) = train.drivers, train.driven
        words = (f"Drivers: A {a} on the stud, C {c}. Driven: B {b}, D {d} on {last}. "
                 f"C and B are keyed together on one stud.")
    if train.box is not None:
        words += f" Gearbox at {train.box}."
    return words


def made_lead(lathe, train: GearTrain) -> Fraction:
    """Return the lead the train really makes on this lathe, exactly [mm]."""
    box_ratio = Fraction(1)
    if train.box is not None:
        box_ratio = next(p.ratio for p in lathe.gearbox if p.label == train.box)
    return lead_made(lathe.leadscrew, train.drivers, train.driven,
                     fixed_ratio=lathe.fixed_ratio, box_ratio=box_ratio)


def plan_for(lathe, lead: Fraction, starts: int) -> DialPlan | None:
    """Return the thread-dial plan for ``lead`` [mm] on this lathe, None if it has no dial."""
    if lathe.thread_dial is None:
        return None
    return dial_plan(lathe.leadscrew, lathe.thread_dial, lead, starts)


def plan_text(plan: DialPlan | None) -> str:
    """Return the half-nut plan in one line."""
    return NO_DIAL_TEXT if plan is None else plan.describe()


def start_lines_text(plan: DialPlan | None) -> str:
    """Return which dial lines give which start (``start 1: 1,5; start 2: 3,7``), or ''."""
    if plan is None or not plan.every_start_on_dial:
        return ""
    return "; ".join(f"start {s}: {','.join(str(x) for x in lines)}"
                     for s, lines in plan.start_lines)


def plan_payload(plan: DialPlan | None) -> dict:
    """Return the ``dial_plan`` set-up value: lines, anywhere, keep_half_nut_closed, text."""
    if plan is None:
        return {"lines": [], "anywhere": False, "keep_half_nut_closed": True,
                "text": NO_DIAL_TEXT}
    out = {"lines": list(plan.lines), "anywhere": plan.anywhere,
           "keep_half_nut_closed": plan.keep_half_nut_closed, "text": plan.describe()}
    if plan.start_lines:
        out["start_lines"] = [[s, list(lines)] for s, lines in plan.start_lines]
    return out


def train_payload(train: GearTrain) -> dict | None:
    """Return the ``train`` set-up value ({drivers, driven, ratio, lead_made_mm, error_pct}),
    or None for a gearbox position used alone."""
    if not train.drivers:
        return None
    return {"drivers": list(train.drivers), "driven": list(train.driven),
            "ratio": f"{train.ratio.numerator}/{train.ratio.denominator}",
            "lead_made_mm": train.lead_made_mm, "error_pct": train.error_pct,
            "exact": train.exact, "kind": train.kind}


def index_phrase(method: IndexMethod) -> str:
    """Return a method as the checklist says it: ``driving plate, 2 slots per start``."""
    if method.key == "dial":
        return "thread dial lines, " + method.detail.removeprefix("Dial lines, ")
    amount = f"{method.amount:g}" if method.whole else f"{method.amount:.3f}"
    phrase = f"{method.title.lower()}, {amount} {method.unit} per start"
    return phrase + ("" if method.whole else " (not whole)")


def usable_methods(plan, between_centres: bool | None) -> list[IndexMethod]:
    """Return the indexing methods that work here and suit how the work is held, those that
    move a whole number of divisions, slots, jaws, teeth or lines first."""
    out = []
    for m in plan.working:
        if between_centres and m.key.startswith("chuck"):
            continue
        if between_centres is False and m.key == "plate":
            continue
        out.append(m)
    return sorted(out, key=lambda m: not m.whole)


def same_values(a: dict, b: dict) -> bool:
    """Return True when two set-up dicts hold the same values (as the record keeps them)."""
    return json.dumps(a, sort_keys=True) == json.dumps(b, sort_keys=True)


# --------------------------------------------------------------------------------------------
# The list: the highlight is the answer
# --------------------------------------------------------------------------------------------

class ChoiceList(PickList):
    """A PickList whose highlight is the answer: ↑/↓ change it; Enter is left to the screen."""

    class Moved(Message):
        def __init__(self, choices: "ChoiceList", index: int) -> None:
            super().__init__()
            self.choices = choices
            self.index = index

        @property
        def control(self) -> "ChoiceList":
            return self.choices

    async def _on_key(self, event: events.Key) -> None:
        if event.key in ("enter", "ctrl+j"):
            event.prevent_default()     # not PickList's pick: it bubbles on to the screen's
            return                      # binding (record the set-up)
        if event.key in ("up", "down") and self.page_items():
            event.stop()
            event.prevent_default()
            step = 1 if event.key == "down" else -1
            self.cursor = max(0, min(len(self.page_items()) - 1, self.cursor + step))
            self.post_message(self.Moved(self, self.page * 9 + self.cursor))
            return
        await super()._on_key(event)

    def show(self, index: int) -> None:
        """Put the highlight on item ``index`` (its page shown)."""
        if self.items:
            self.page, self.cursor = divmod(max(0, min(index, len(self.items) - 1)), 9)


# --------------------------------------------------------------------------------------------
# The screen
# --------------------------------------------------------------------------------------------

@dataclass
class Found:
    """What the worker worked out for one thread: trains best first, or why there are none."""

    key: tuple
    trains: tuple[GearTrain, ...]
    error: str = ""


class SetupScreen(ShopScreen):
    SCREEN_NAME = "setup"
    TITLE = "Lathe set-up"
    AUTO_FOCUS = "#choices"
    BINDINGS = [keys.bind(keys.CONFIRM, "confirm", "record set-up")]
    HELP = (("1-9", "answer the question shown, then go on to the next one"),
            ("↑ ↓", "change the answer (NumLock off)"),
            ("+", "next question without changing it; after the last: on to the checklist"),
            ("-", "previous question; from the first: back to the thread"),
            ("Enter", "record the set-up as the summary shows it"))

    DEFAULT_CSS = """
    SetupScreen #thread { height: 1; padding: 0 1; text-style: bold;
                          text-wrap: nowrap; text-overflow: ellipsis; }
    SetupScreen #summary { height: auto; padding: 0 1; margin-bottom: 1;
                           text-wrap: nowrap; text-overflow: ellipsis; }
    SetupScreen #question { height: 1; padding: 0 1; text-style: bold; color: $accent; }
    SetupScreen #header { height: 1; padding: 0 1; color: $text-muted; }
    SetupScreen #choices { min-height: 1; }
    SetupScreen #length { height: 1; padding: 0 1; }
    SetupScreen #detail { height: auto; max-height: 4; padding: 0 1; }
    SetupScreen #caution { height: auto; padding: 0 1; color: $warning; text-style: bold; }
    SetupScreen #others { height: 1; padding: 0 1; color: $text-muted;
                          text-wrap: nowrap; text-overflow: ellipsis; }
    """

    class TrainsFound(Message):
        def __init__(self, found: Found) -> None:
            super().__init__()
            self.found = found

    def __init__(self) -> None:
        super().__init__()
        self.key: tuple | None = None        # the thread the answers are for
        self.found: Found | None = None
        self.train_i = 0
        self.held: bool | None = None
        self.relief: bool | None = None
        self.method_key: str | None = None
        self.taper_method: str | None = None    # tapered threads: how the taper is made
        self.work_length: float | None = None   # [mm] between centres, for the set-over
        self.step = 0

    def compose_body(self) -> ComposeResult:
        yield Static("", id="thread")
        yield Static("", id="summary")
        yield Static("", id="question")
        yield Static("", id="header")
        yield ChoiceList(id="choices", columns=1)
        yield LengthEntry(id="length")
        yield Static("", id="detail")
        yield Static("", id="caution")
        yield Static("", id="others")
        yield Static("", id="message", classes="message")

    # -- loading -------------------------------------------------------------------------------
    def on_screen_resume(self) -> None:
        super().on_screen_resume()
        self.say("")
        self.load()

    def job_changed(self) -> None:
        """The record changed under us (an undo): redraw; the answers on screen stay."""
        self.refresh_chrome()
        self.show()

    def thread_key(self) -> tuple | None:
        spec = self.app.spec
        return None if spec is None else (spec.designation, spec.kind, spec.starts, spec.hand,
                                          spec.lead)

    def load(self) -> None:
        key = self.thread_key()
        if key != self.key:
            self.key, self.found, self.step = key, None, 0
            self.train_i, self.held, self.relief, self.method_key = 0, None, None, None
            self.taper_method, self.work_length = None, None
            if key is not None:
                self.say("Working out the change gears…")
                self.search(key, self.app.spec.lead)
        self.show()

    @work(thread=True, exclusive=True, group="gears")
    def search(self, key: tuple, lead: float) -> None:
        """Find the trains for ``lead`` [mm] off the UI thread (the first search builds a table)."""
        try:
            found = Found(key, trains_for_lathe(self.app.lathe, lead, limit=TRAINS_SHOWN))
            if not found.trains:
                found = Found(key, (), "None of the gears listed in the config can make this "
                                       "lead: add change gears or gearbox positions there.")
        except ShoptermError as exc:
            found = Found(key, (), f"{exc} (in the config file)")
        self.post_message(self.TrainsFound(found))

    @on(TrainsFound)
    def trains_found(self, message: TrainsFound) -> None:
        if message.found.key != self.key:
            return                          # an answer for a thread no longer chosen
        self.found = message.found
        self.say(message.found.error, error=bool(message.found.error))
        self.take_recorded()
        self.show()

    def take_recorded(self) -> None:
        """Start from the set-up in force when it was made for this thread."""
        rec = self.app.setup_values()
        spec = self.app.spec
        if not rec or rec.get("for_thread") != spec.designation or rec.get("starts") != spec.starts:
            return
        for i, t in enumerate(self.trains):
            if train_payload(t) == rec.get("train") and t.box == rec.get("box"):
                self.train_i = i
        if isinstance(rec.get("between_centres"), bool):
            self.held = rec["between_centres"]
        if isinstance(rec.get("relief"), bool):
            self.relief = rec["relief"]
        self.method_key = rec.get("indexing_method")
        taper = rec.get("taper")
        if isinstance(taper, dict):
            self.taper_method = taper.get("method")
            self.work_length = taper.get("work_length_mm")

    # -- what is chosen ------------------------------------------------------------------------
    @property
    def trains(self) -> tuple[GearTrain, ...]:
        return self.found.trains if self.found is not None else ()

    def train(self) -> GearTrain | None:
        return self.trains[self.train_i] if self.trains else None

    def lead(self) -> Fraction | None:
        """Return the lead the chosen train makes [mm], exactly."""
        t = self.train()
        return made_lead(self.app.lathe, t) if t is not None else None

    def dial(self) -> DialPlan | None:
        return plan_for(self.app.lathe, self.lead(), self.app.spec.starts)

    def methods(self) -> list[IndexMethod]:
        spec = self.app.spec
        if spec is None or spec.starts < 2 or self.train() is None:
            return []
        plan = indexing_for_lathe(self.app.lathe, self.lead(), spec.starts, train=self.train())
        return usable_methods(plan, self.held)

    def not_usable(self) -> list[IndexMethod]:
        spec = self.app.spec
        plan = indexing_for_lathe(self.app.lathe, self.lead(), spec.starts, train=self.train())
        ok = {m.key for m in self.methods()}
        return [m for m in plan.methods if m.key not in ok]

    def method(self) -> IndexMethod | None:
        methods = self.methods()
        for m in methods:
            if m.key == self.method_key:
                return m
        return methods[0] if methods else None

    def steps(self) -> list[str]:
        out = ["gears", "held", "runout"]
        if self.app.spec is not None and self.app.spec.starts > 1:
            out.append("indexing")
        if is_tapered(self.app.spec):
            out.append("taper")
            if self.taper_method == "set_over":
                out.append("length")
        return out + ["review"]

    def payload(self) -> dict:
        """Return the set-up values this screen records."""
        t = self.train()
        spec = self.app.spec
        m = self.method()
        return {"train": train_payload(t), "box": t.box, "dial_plan": plan_payload(self.dial()),
                "indexing": index_phrase(m) if m is not None else None,
                "indexing_method": m.key if m is not None else None,
                "between_centres": self.held, "relief": self.relief,
                "for_thread": spec.designation, "starts": spec.starts,
                **({"taper": self.taper()[0]} if is_tapered(spec) else {})}

    def taper(self) -> tuple[dict | None, str]:
        """Return (the set-up's ``taper`` value, '') or (None, what to do)."""
        return taper_value(self.app, self.taper_method, self.held, self.work_length)

    def recorded(self) -> bool:
        """Return True when the set-up in force is what the screen shows."""
        if self.train() is None or self.held is None or self.relief is None:
            return False
        rec = self.app.setup_values()
        payload = self.payload()
        return same_values({k: rec.get(k) for k in SETUP_KEYS if k in payload}, payload)

    # -- drawing -------------------------------------------------------------------------------
    def show(self) -> None:
        spec = self.app.spec
        summary = self.query_one("#summary", Static)
        choices = self.query_one("#choices", ChoiceList)
        self.query_one("#length").display = False
        for wid in ("#question", "#header", "#detail", "#caution", "#others"):
            self.put(wid, "")
        if spec is None:
            self.query_one("#thread", Static).update("No thread chosen yet.")
            summary.update("Choose a thread first: - goes back to the thread screen.")
            choices.display = False
            return
        unit = self.app.shop.display_units
        lathe = self.app.lathe
        lead = (f"lead {format_length(spec.lead, 'mm', 0.0001)}"
                + (f" = {format_length(spec.lead, 'in', 0.0001)}" if unit == "in" else ""))
        starts = f" · {spec.starts} starts" if spec.starts > 1 else ""
        self.query_one("#thread", Static).update(
            f"{spec.designation} {spec.kind} · {lead}{starts} · leadscrew {lathe.leadscrew.label()}")
        summary.update(self.summary_text())
        if self.found is None:
            choices.display = False
            self.put("#question", "Working out the change gears…")
            return
        steps = self.steps()
        self.step = min(self.step, len(steps) - 1)
        getattr(self, f"show_{steps[self.step]}")(choices, steps)


    def put(self, wid: str, content) -> None:
        """Show ``content`` in one of the lines under the list; an empty line takes no row."""
        line = self.query_one(wid, Static)
        line.update(content)
        line.display = bool(content) or wid in ("#question", "#detail")

    def summary_text(self) -> Text:
        out = Text(no_wrap=True, overflow="ellipsis")

        def line(label: str, value: str, style: str = "") -> None:
            if out.plain:
                out.append("\n")
            out.append(f"{label:<10}", style="bold")
            out.append(value, style=style)

        t = self.train()
        if self.found is None:
            line("Gears", "working them out…")
        elif t is None:
            line("Gears", "none can make this lead", "bold")
        else:
            line("Gears", train_gears(t) + (", exact" if t.exact
                                            else f", {t.error_pct:+.4f}% off the lead"))
            plan = self.dial()
            line("Half nut", plan_text(plan),
                 "bold" if plan is None or plan.keep_half_nut_closed else "")
            if start_lines_text(plan):
                line("", "dial lines by start: " + start_lines_text(plan))
        held = {None: "? (not chosen yet)", False: "in a chuck", True: "between centres"}[self.held]
        runout = {None: "?", True: "relief groove", False: "to a mark (no relief)"}[self.relief]
        line("Work", f"{held} · run-out: {runout}")
        if is_tapered(self.app.spec):
            line("Taper", taper_summary(self.taper()[0], self.app.shop.display_units))
        if self.app.spec.starts > 1 and t is not None:
            m = self.method()
            line("Indexing", index_phrase(m) if m else "no method works here (see below)")
        if self.app.state is not None and self.recorded():
            line("Record", "recorded; + goes on to the checklist")
        else:
            line("Record", "not recorded yet: Enter records this set-up", "bold")
        return out

    def set_list(self, choices: ChoiceList, title: str, items: list, index: int | None,
                 steps: list[str]) -> None:
        n = self.step + 1
        self.put("#question", 
            f"Question {n} of {len(steps) - 1}: {title}")
        choices.display = True
        choices.set_items(items)
        choices.show(index if index is not None else 0)
        choices.focus()

    def show_gears(self, choices, steps) -> None:
        lathe = self.app.lathe
        if not self.trains:
            choices.display = False
            self.put("#question", "Change gears: none found")
            return
        self.set_list(choices, "change gears (best first)",
                      [(train_row(t), i) for i, t in enumerate(self.trains)], self.train_i, steps)
        self.put("#header", GEAR_HEADER)
        self.put("#detail", 
            train_placement(self.train(), bool(lathe.gearbox)))
        self.put("#caution", 
            "Change gears only with the lathe switched off at its isolator.")

    def show_held(self, choices, steps) -> None:
        self.set_list(choices, "how is the work held?",
                      [(words, v) for words, v in HELD],
                      None if self.held is None else [v for _, v in HELD].index(self.held), steps)
        self.put("#detail", 
            "Between centres the checklist adds tying the carrier to its driving peg.")

    def show_runout(self, choices, steps) -> None:
        self.set_list(choices, "where does the tool run out at the end of a pass?",
                      [(words, v) for words, v in RUNOUT],
                      None if self.relief is None else [v for _, v in RUNOUT].index(self.relief),
                      steps)
        self.put("#detail", 
            "With no relief the tool must come out at the same mark every pass.")

    def show_indexing(self, choices, steps) -> None:
        methods = self.methods()
        if not methods:
            choices.display = False
            self.put("#question", 
                f"Question {self.step + 1} of {len(steps) - 1}: indexing — no method works")
            self.put("#detail", 
                "\n".join(m.text for m in self.not_usable()[:4]))
            return
        current = self.method()
        self.set_list(choices, f"index to the next of {self.app.spec.starts} starts by",
                      [(m.text, m.key) for m in methods], methods.index(current), steps)
        self.put("#detail", Text(current.detail, overflow="ellipsis"))
        others = ", ".join(m.title.lower() for m in self.not_usable())
        if others:
            self.put("#others", f"Not here: {others}.")

    def show_taper(self, choices, steps) -> None:
        items, words = taper_options(self.app, self.held, self.work_length)
        keys_ = [k for _, k in items]
        self.set_list(choices, TAPER_QUESTION, items,
                      keys_.index(self.taper_method) if self.taper_method in keys_ else None,
                      steps)
        text, refused = words.get(self.taper_method or "set_over")
        self.put("#detail", Text(text, style="bold" if refused else ""))

    def show_length(self, choices, steps) -> None:
        choices.display = False
        self.put("#question", f"Question {self.step + 1} of {len(steps) - 1}: {LENGTH_QUESTION}")
        entry = self.query_one("#length", LengthEntry)
        entry.prompt = f"work length [{self.app.shop.display_units}]: "
        entry.display = True
        entry.focus()
        value, _why = self.taper()
        self.put("#detail", value["text"] if value else
                 "Between the centres' points; the set-over is worked out from it.")

    def show_review(self, choices, steps) -> None:
        choices.display = False
        missing = [words for value, words in ((self.held, "how the work is held"),
                                              (self.relief, "where the tool runs out"))
                   if value is None]
        if is_tapered(self.app.spec) and self.taper()[0] is None:
            missing.append("how the taper is made")
        if missing:
            self.put("#question", "Still to answer: " + " and ".join(missing))
            self.put("#detail", "- goes back to the questions.")
            return
        self.put("#question", "All answered")
        if self.recorded():
            words = "This set-up is recorded. + goes on to the checklist."
        else:
            words = "Enter records this set-up; then + goes on to the checklist."
        self.put("#detail", 
            words + "\n- goes back to change an answer.")

    # -- keys ----------------------------------------------------------------------------------
    def answer(self, value) -> None:
        step = self.steps()[self.step]
        if step == "gears":
            self.train_i = value
        elif step == "held":
            self.held = value
        elif step == "runout":
            self.relief = value
        elif step == "indexing":
            self.method_key = value
        elif step == "taper":
            self.taper_method = value

    @on(PickList.Picked, "#choices")
    def picked(self, event: PickList.Picked) -> None:
        self.answer(event.value)
        self.say("")
        if self.steps()[self.step] == "taper" and (event.value != "set_over" or not self.held):
            value, why = self.taper()           # (set-over between centres: its length next)
            if value is None:           # refused here: say why in place, stay on the question
                self.show()
                self.say(why, error=True)
                return
        self.step += 1
        self.show()

    @on(ChoiceList.Moved, "#choices")
    def moved(self, event: ChoiceList.Moved) -> None:
        items = event.choices.items
        if 0 <= event.index < len(items):
            self.answer(items[event.index][1])
            self.show()

    @on(KeypadEntry.Submitted, "#length")
    def length_typed(self, event: KeypadEntry.Submitted) -> None:
        """The work's length between centres: take it, show the set-over or why not."""
        from shopterm.units import parse_length
        event.stop()
        try:
            mm = parse_length(event.value, self.app.shop.display_units)
            if mm <= 0:
                raise InvalidEntry("The work's length is greater than zero: type it again.")
        except ShoptermError as exc:
            self.say(str(exc), error=True)      # the text stays in the entry to correct
            return
        old, self.work_length = self.work_length, mm
        value, why = self.taper()
        if value is None:
            self.work_length = old if old is not None else mm
            self.show()
            self.say(why, error=True)
            return
        event.entry.clear()
        self.step += 1
        self.show()
        self.say(value["text"])

    def action_forward(self) -> None:
        if self.app.spec is None or self.found is None:
            self.say("Choose a thread first; the set-up is worked out for it.", error=True)
            return
        if self.steps()[self.step] != "review":
            self.step += 1
            self.say("")
            self.show()
            return
        if not self.recorded():
            self.say("Enter records this set-up first; then + goes on to the checklist.",
                     error=True)
            return
        self.app.go_forward(self.SCREEN_NAME)

    def action_back(self) -> None:
        if self.step > 0 and self.found is not None:
            self.step -= 1
            self.say("")
            self.show()
            return
        self.app.go_back(self.SCREEN_NAME)

    def action_confirm(self) -> None:
        if self.app.spec is None:
            self.say("Choose a thread first: - goes back to the thread screen.", error=True)
            return
        if self.found is None:
            self.say("Still working out the change gears; a moment.")
            return
        if self.train() is None:
            self.say("Nothing to record: no gears make this lead. "
                     + (self.found.error or ""), error=True)
            return
        steps = self.steps()
        for what, value, words in (("held", self.held, "how the work is held"),
                                   ("runout", self.relief, "where the tool runs out")):
            if value is None:
                self.step = steps.index(what)
                self.show()
                self.say(f"Say {words} first: pick with a digit.", error=True)
                return
        if is_tapered(self.app.spec) and self.taper()[0] is None:
            want = "length" if self.taper_method == "set_over" and self.held else "taper"
            self.step = self.steps().index(want)
            self.show()
            self.say(self.taper()[1], error=True)
            return
        if self.app.record_setup(self.payload()) is None:
            self.say("The set-up was not recorded (see the note); your answers are kept.",
                     error=True)
            return
        self.step = len(steps) - 1
        self.show()
        self.say("Set-up recorded. + goes on to the checklist.")
