"""Choosing the thread: a recent or favourite one, the list walk (group → common sizes, or
series → size → pitch), or a designation typed (letters, or numbers with ``.``: 10.1.5).

A thread picked from a list is the catalogue's: external, the usual class; "This thread"
turns it internal, changes the class, the hand and the starts. The "Special thread" family
opens the ``special`` screen, which hands the thread it makes back here (``take_special``).
"""

from __future__ import annotations

from dataclasses import dataclass, field, replace

from rich.table import Table
from rich.text import Text
from textual import events, on
from textual.app import ComposeResult
from textual.widgets import Static

from shopterm.errors import ShoptermError
from typing import TYPE_CHECKING

from shopterm.standards import cautions, classes, limits, numeric, parse, walk
from shopterm.ui import keys
from shopterm.ui.screens.base import ShopScreen
from shopterm.ui.widgets.entry import KeypadEntry
from shopterm.ui.widgets.picklist import PickList
from shopterm.units import format_length

if TYPE_CHECKING:
    from shopterm.standards.spec import ThreadSpec

STARTS_CYCLE = (1, 2, 3, 4, 5, 6, 8)
NO_CLASS = "basic size"
ONE_CLASS = "standard tolerance"   # a pipe thread with no class to choose


def no_class_word(spec) -> str:
    """Return what a thread without a class is cut to: its one tolerance, or basic size."""
    return ONE_CLASS if spec.family == "pipe" else NO_CLASS


@dataclass
class Walk:
    """What has been picked so far in the list walk."""

    group: str | None = None
    more: bool = False                     # past the group's common sizes
    series: str | None = None
    size: str | None = None
    base: ThreadSpec | None = None         # size and pitch picked
    spec: ThreadSpec | None = None         # the complete thread
    choosing_class: bool = False           # the class list, for ``spec``
    history: list = field(default_factory=list)

    def snapshot(self) -> None:
        self.history.append(replace(self, history=[]))

    def restore(self) -> bool:
        if not self.history:
            return False
        last = self.history.pop()
        hist = self.history
        self.__dict__.update(last.__dict__)
        self.history = hist
        return True


def limits_table(spec: ThreadSpec, display_unit: str) -> Table:
    """Return the limits of ``spec`` as a table in the display unit and the standard's unit."""
    lim = limits(spec)
    units = [display_unit] + ([spec.native_unit] if spec.native_unit != display_unit else [])
    t = Table(box=None, padding=(0, 1), show_edge=False, expand=False)
    t.add_column("", style="bold")
    for u in units:
        t.add_column(f"max {u}", justify="right")
        t.add_column(f"min {u}", justify="right")

    def cells(vmax, vmin):
        out = []
        for u in units:
            for v in (vmax, vmin):
                out.append("—" if v is None else format_length(v, u, suffix=False))
        return out

    t.add_row("major", *cells(lim.major_max, lim.major_min))
    t.add_row("pitch diameter", *cells(lim.pd_max, lim.pd_min), style="bold")
    t.add_row("minor", *cells(lim.minor_max, lim.minor_min))
    return t


def thread_summary(spec: ThreadSpec, display_unit: str) -> Text:
    """Return the one-line summary under the designation: kind, form, pitch, lead, lead angle."""
    lim = limits(spec)
    pitch = (f"{spec.tpi:g} tpi" if spec.tpi else
             f"P {format_length(spec.pitch, 'mm', 0.001, suffix=False).rstrip('0').rstrip('.')}")
    out = Text()
    out.append(spec.designation, style="bold")
    out.append(f"  {spec.kind} · {spec.form.angle_deg:g}° · {pitch}")
    if spec.starts > 1:
        out.append(f" · {spec.starts} starts, lead {format_length(spec.lead, display_unit)}")
    if spec.hand == "LH":
        out.append(" · left hand")
    out.append(f"\nbasic depth {format_length(lim.depth, display_unit)}"
               + (f" ({format_length(lim.depth, spec.native_unit)})"
                  if spec.native_unit != display_unit else "")
               + f" · lead angle {lim.lead_angle_deg:.2f}°")
    for note in lim.notes[:2]:
        out.append(f"\nnote: {note}", style="dim")
    for caution in cautions(spec):
        out.append(f"\ncaution: {caution}", style="bold")
    return out


class ThreadScreen(ShopScreen):
    SCREEN_NAME = "thread"
    AUTO_FOCUS = "#choices"
    TITLE = "Thread"
    BINDINGS = [keys.bind("tab", "type_designation", "type", show=False),
                keys.bind("full_stop,decimal", "type_number", "type a size")]
    HELP = (("then", "digits and points: 10 = M10 coarse, 10.1.25 = M10x1.25, 1.6.0.35 = "
                     "M1.6x0.35; inch as numerator.denominator.tpi: 3.8.16 = 3/8-16, "
                     "1.1.4.7 = 1-1/4-7, 1.1.8 = 1-8"),
            ("1-9", "pick from the numbered list; 0 = next page"),
            ("-", "go back one step in the list"),
            ("letter", "start typing a designation (M10x1.5-6g, 1/4-20 UNC-2A, 2BA …)"),
            ("Enter", "in the designation field: look it up; on the result: use this thread"))
    NUMBER_PROMPT = "Size.pitch: "

    def __init__(self) -> None:
        super().__init__()
        self.walk = Walk()

    def compose_body(self) -> ComposeResult:
        yield KeypadEntry(prompt="Designation: ", placeholder="type e.g. M10x1.5-6g — or pick below",
                          text=True, id="designation")
        yield Static("", id="message", classes="message")
        yield Static("", id="crumbs")
        yield PickList(id="choices")
        yield Static("", id="summary")
        yield Static("", id="limits")

    def on_mount(self) -> None:
        super().on_mount()
        picks = self.query_one("#choices", PickList)
        picks.type_into(self.query_one("#designation", KeypadEntry), self.NUMBER_PROMPT)
        picks.focus()
        self.show_step()

    def favourites_changed(self) -> None:
        """Show the first list again once the app has checked the favourites."""
        if self.walk.group is None and self.walk.spec is None:
            self.show_step()

    # -- typed designation -------------------------------------------------------------------
    def action_type_designation(self) -> None:
        entry = self.query_one("#designation", KeypadEntry)
        entry.begin_text()
        entry.focus()

    def action_type_number(self) -> None:
        entry = self.query_one("#designation", KeypadEntry)
        entry.begin_number(self.NUMBER_PROMPT)
        entry.focus()

    def on_key(self, event: events.Key) -> None:
        entry = self.query_one("#designation", KeypadEntry)
        ch = event.character
        if (not entry.has_focus or not entry.text_mode) and ch and (ch.isalpha() or ch == "#"):
            if not entry.text_mode:            # a letter after the point key: a designation
                value = entry.value
                entry.begin_text()
                entry.value = value
            entry.focus()
            entry.value += ch
            event.stop()

    @on(KeypadEntry.Submitted, "#designation")
    def designation_submitted(self, event: KeypadEntry.Submitted) -> None:
        text = event.value.strip()
        if not text:
            self.query_one("#choices").focus()
            return
        others: list[ThreadSpec] = []
        try:
            if numeric.is_numeric(text):
                spec, *others = numeric.candidates(text)
            else:
                spec = parse(text)
            limits(spec)
        except ShoptermError as exc:
            self.say(str(exc), error=True)
            return
        self.walk.snapshot()
        self.walk.spec = spec
        self.remember(spec)
        self.query_one("#choices", PickList).focus()   # Enter now means "use it"
        also = f" (also {', '.join(s.designation for s in others)})" if others else ""
        self.say(f"{spec.designation}: Enter uses it, + goes on to the set-up.{also}")
        self.show_step()

    # -- the list walk -----------------------------------------------------------------------
    def choices(self) -> tuple[str, list[tuple[str, object]]]:
        """Return (title, numbered items) for the step the walk is at."""
        w = self.walk
        if w.spec is not None and w.choosing_class:
            cls = classes(w.spec.with_(tol_class=None))
            items = [(c, ("cls", c)) for c in cls]
            if not cls or w.spec.family in ("whitworth", "ba"):
                items.append((no_class_word(w.spec), ("cls", None)))
            return f"Class of fit ({w.spec.kind})", items
        if w.spec is not None:
            spec = w.spec
            hand = "left hand" if spec.hand == "LH" else "right hand"
            other = "internal (nut)" if spec.is_external else "external (screw)"
            return ("This thread", [("use it →", "use"), (f"make it {other}", "kind"),
                                    (f"class: {spec.tol_class or no_class_word(spec)}", "class"),
                                    (f"hand: {hand}", "hand"),
                                    (f"starts: {spec.starts}", "starts"),
                                    ("choose again", "again")])
        if w.group is None:
            favourites = self.app_favourites()
            recent = [d for d in self.app_recent() if d not in favourites][:3]
            items = [(f"recent {d}", ("typed", d)) for d in recent]
            items += [(d, ("typed", d)) for d in favourites]
            items += [(g.title, ("group", g.key)) for g in walk.GROUPS]
            return "Thread family, favourite or recent (. types a size)", items
        common = walk.common(w.group)
        if common and not w.more:
            pitch = {"power": ", preferred pitch", "pipe": ""}.get(w.group, ", coarse pitch")
            return f"Common sizes{pitch}", (
                [(s.designation, ("thread", s)) for s in common]
                + [("more sizes and pitches", ("more", True))])
        if w.series is None and len(walk.series(w.group)) > 1:
            return "Series", [(s, ("series", s)) for s in walk.series(w.group)]
        if w.size is None:
            return "Size", [(s, ("size", s)) for s in walk.sizes(w.group, w.series)]
        if w.base is None:
            specs = walk.pitches(w.group, w.series, w.size)
            return "Pitch", [(self.pitch_label(s), ("base", s)) for s in specs]
        return "", []

    @staticmethod
    def pitch_label(spec: ThreadSpec) -> str:
        if spec.tpi:
            return f"{spec.tpi:g} tpi {spec.series}"
        return f"{spec.pitch:g} mm" + (" coarse" if spec.pitch_implied else "")

    def show_step(self) -> None:
        title, items = self.choices()
        picks = self.query_one("#choices", PickList)
        picks.display = bool(items)
        if items:
            picks.set_items(items, title)
            if not self.query_one("#designation", KeypadEntry).has_focus:
                picks.focus()
        self.query_one("#crumbs", Static).update(self.crumbs())
        self.show_result()

    def crumbs(self) -> Text:
        w = self.walk
        parts = []
        if w.group:
            parts.append(walk.group(w.group).title)
        for v in (w.series, w.size):
            if v:
                parts.append(v)
        if w.base is not None:
            parts.append(self.pitch_label(w.base))
        return Text(" › ".join(parts), style="dim") if parts else Text("")

    def show_result(self) -> None:
        spec = self.walk.spec
        summary = self.query_one("#summary", Static)
        table = self.query_one("#limits", Static)
        if spec is None:
            summary.update("")
            table.update("")
            return
        unit = self.app.shop.display_units
        summary.update(thread_summary(spec, unit))
        table.update(limits_table(spec, unit))

    @on(PickList.Picked, "#choices")
    def picked(self, event: PickList.Picked) -> None:
        value = event.value
        w = self.walk
        if w.spec is not None and isinstance(value, str):
            self.final_option(value)
            return
        what, v = value
        if what == "typed":                   # a recent or favourite designation
            try:
                spec = parse(v)
                limits(spec)
            except ShoptermError as exc:
                self.say(str(exc), error=True)
                return
            w.snapshot()
            w.spec = spec
        elif what == "thread":                # a common size, as the catalogue has it
            w.snapshot()
            w.spec = v
        elif what == "cls":
            spec = w.spec.with_(tol_class=v)
            try:
                limits(spec)                  # refuses a class the tables lack for this size
            except ShoptermError as exc:
                self.say(str(exc), error=True)
                return
            w.snapshot()
            w.spec = spec
            w.choosing_class = False
        elif what == "group" and v == "special":   # entered on a screen of its own
            self.say("")
            self.app.screen_for("special").begin()
            self.app.goto("special")
            return
        else:
            w.snapshot()
            setattr(w, what, v)
            if what == "group" and len(walk.series(v)) == 1:
                w.series = walk.series(v)[0]
            if what == "size":
                specs = walk.pitches(w.group, w.series, w.size)
                if len(specs) == 1:
                    w.base = specs[0]
            if w.base is not None:
                w.spec = w.base.with_(pitch_implied=False)   # external, the usual class
        self.say("")
        self.show_step()

    def final_option(self, option: str) -> None:
        w = self.walk
        spec = w.spec
        if option == "use":
            self.use_thread()
            return
        if option == "again":
            self.walk = Walk()
            self.query_one("#designation", KeypadEntry).clear()
            self.show_step()
            return
        if option == "class":
            w.snapshot()
            w.choosing_class = True
            self.show_step()
            return
        try:
            if option == "kind":
                spec = walk.with_kind(spec, "internal" if spec.is_external else "external")
            elif option == "hand":
                spec = spec.with_(hand="RH" if spec.hand == "LH" else "LH")
            elif option == "starts":
                i = STARTS_CYCLE.index(spec.starts) if spec.starts in STARTS_CYCLE else 0
                spec = spec.with_(starts=STARTS_CYCLE[(i + 1) % len(STARTS_CYCLE)])
            limits(spec)
        except ShoptermError as exc:
            self.say(str(exc), error=True)
            return
        w.spec = spec
        self.show_step()

    def use_thread(self) -> None:
        spec = self.walk.spec
        if spec is None:
            self.say("Choose a thread first.", error=True)
            return
        self.remember(spec)
        self.app.thread_chosen(spec)
        self.app.go_forward(self.SCREEN_NAME)

    def action_forward(self) -> None:
        if self.walk.spec is None:
            self.say("Choose a thread first: pick from the list or type a designation.",
                     error=True)
            return
        self.use_thread()

    def action_back(self) -> None:
        entry = self.query_one("#designation", KeypadEntry)
        if entry.has_focus:
            self.query_one("#choices").focus()
            return
        if self.walk.restore():
            self.say("")
            self.show_step()
        else:
            self.say("This is the first step: pick a thread family.")

    def take_special(self, spec: ThreadSpec) -> None:
        """Show a special thread made on the ``special`` screen as the thread chosen."""
        self.walk.snapshot()
        self.walk.group, self.walk.spec = "special", spec
        self.say(f"{spec.designation}: Enter uses it, + goes on to the set-up.")
        self.show_step()

    # -- recent threads ----------------------------------------------------------------------
    def app_recent(self) -> list[str]:
        return list(getattr(self.app, "recent_threads", lambda: [])())

    def app_favourites(self) -> list[str]:
        return list(getattr(self.app, "favourite_threads", lambda: [])())

    def remember(self, spec: ThreadSpec) -> None:
        hook = getattr(self.app, "remember_thread", None)
        if hook:
            hook(spec.designation)
