"""What the question-at-a-time screens share ("What thread is this?", cut to fit a sample).

``StepScreen`` asks one question at a time: numbered choices (a ``PickList``) or a keypad
entry (``MeasureEntry``). A subclass says which question comes next from the answers so far
(``step()``), what to ask (``question``/``choices``), how to read what was typed
(``read_entry``, the core checks it) and what to show under it (``detail``). ``-`` steps back
one answer, keeping what was typed at each entry; Enter and digits answer.

Presentation only: no dimension is computed here.
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
from shopterm.units import format_length

#: A wire-size choice that opens an entry for a size not among the owned sets.
TYPE_SIZE = "type"
UNIT_CHARS = set("inmINM\"")


class MeasureEntry(KeypadEntry):
    """A number entry that also takes a unit typed after the number (``0.403in``, ``10.24mm``).

    Letters only, so ``-`` and ``/`` still reach the screen as back and undo.
    """

    def _accepts(self, ch: str) -> bool:
        return super()._accepts(ch) or ch in UNIT_CHARS


def wire_label(size_mm: float, unit: str, label: str = "") -> str:
    """Return a wire size as the owner reads it: 0.866 mm, 0.0290 in, with its label."""
    text = format_length(size_mm, unit, 0.0001 if unit == "in" else 0.001)
    return f"{text} ({label})" if label else text


def wire_items(owned, unit: str) -> list[tuple[str, Any]]:
    """Return the owned wire sets as numbered choices, and "another size: type it"."""
    items = [(wire_label(w.size, unit, w.label), w.size) for w in owned][:8]
    return items + [("another size: type it", TYPE_SIZE)]


class StepScreen(ShopScreen):
    """One question at a time; see the module docstring for what a subclass provides."""

    AUTO_FOCUS = "#choices"
    CSS = """
    #entered { height: auto; max-height: 2; padding: 0 1; color: $text-muted; }
    #message { height: auto; max-height: 5; }
    #question { height: auto; padding: 0 1; text-style: bold; }
    #detail { height: 1fr; padding: 0 1; }
    """
    BINDINGS = [keys.bind(keys.CONFIRM, "confirm", "confirm", show=False)]
    #: The steps that ask for a typed value (the others offer numbered choices).
    ENTRY_STEPS: frozenset[str] = frozenset()

    def __init__(self) -> None:
        super().__init__()
        self.values: dict[str, Any] = {}
        self.history: list[dict[str, Any]] = []
        self.typed: dict[str, str] = {}        # what was typed at each entry, kept across `-`

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

    # -- what a subclass provides ---------------------------------------------------------------
    @property
    def unit(self) -> str:
        return self.app.shop.display_units

    def step(self) -> str:
        """Return the name of the question to ask now (or of the view to show)."""
        raise NotImplementedError

    def question(self, step: str) -> str:
        raise NotImplementedError

    def choices(self, step: str) -> tuple[str, list[tuple[str, Any]]]:
        """Return (question, numbered choices) for a pick step."""
        return "", []

    def read_entry(self, step: str, text: str) -> Any:
        """Return the value typed at ``step`` checked by the core (mm); raise with what to do."""
        raise InvalidEntry("Nothing to type here: pick a numbered choice.")

    def entered_text(self) -> Text:
        return Text("")

    def detail(self, step: str) -> Text | str:
        return ""

    def prefill(self, step: str) -> str:
        """Return the text an entry starts with when nothing was typed there yet."""
        return ""

    def typed_key(self, step: str) -> str:
        """Return where the text typed at ``step`` is kept."""
        return step

    def store_entry(self, step: str, value: Any) -> None:
        """Keep the value read at an entry step (default: as the answer to ``step``)."""
        self.answer(step, value)

    def chose(self, step: str, value: Any) -> bool:
        """Act on a numbered choice; False if it was refused (nothing changes then)."""
        self.answer(step, value)
        return True

    def forward(self, step: str) -> None:
        """``+`` on a pick step."""
        self.say("Answer the question with a digit.")

    def leave_back(self) -> None:
        """``-`` on the first question."""
        self.app.go_back(self.SCREEN_NAME)

    # -- the answers ----------------------------------------------------------------------------
    def answer(self, key: str, value: Any) -> None:
        """Record one answer, keeping the state before it for ``-``."""
        self.history.append(copy.deepcopy(self.values))
        self.values[key] = value

    def step_back(self) -> bool:
        if not self.history:
            return False
        self.values = self.history.pop()
        return True

    # -- drawing --------------------------------------------------------------------------------
    def show_step(self) -> None:
        step = self.step()
        picks = self.query_one("#choices", PickList)
        entry = self.query_one("#number", KeypadEntry)
        question = self.query_one("#question", Static)
        self.query_one("#entered", Static).update(self.entered_text())
        if step in self.ENTRY_STEPS:
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
        self.query_one("#detail", Static).update(self.detail(step))

    def wrapped(self, text: str, limit: int, indent: str = "  ") -> list[str]:
        """Return ``text`` wrapped to the screen's width, at most ``limit`` lines (… if cut)."""
        width = max(30, (self.size.width or 80) - 4)
        lines = textwrap.wrap(text, width, subsequent_indent=indent, break_on_hyphens=False)
        if len(lines) > limit:
            lines = lines[:limit]
            lines[-1] = lines[-1][:width - 1].rstrip() + "…"
        return lines

    # -- answering ------------------------------------------------------------------------------
    @on(PickList.Picked, "#choices")
    def picked(self, event: PickList.Picked) -> None:
        event.stop()
        self.say("")
        if self.chose(self.step(), event.value):
            self.go_on()

    def go_on(self) -> None:
        """Show the next question."""
        self.show_step()

    @on(KeypadEntry.Submitted, "#number")
    def submitted(self, event: KeypadEntry.Submitted) -> None:
        event.stop()
        self.take_entry(event.value)

    def take_entry(self, raw: str) -> None:
        """Check what was typed at the current entry step and go on, or say what to change."""
        step = self.step()
        if step not in self.ENTRY_STEPS:
            return
        self.typed[self.typed_key(step)] = raw
        try:
            value = self.read_entry(step, raw.strip())
        except ReadingSlip as exc:
            self.say(f"{exc} From the keypad alone, type it converted to {self.unit}.",
                     error=True)
            return
        except ShoptermError as exc:
            self.say(str(exc), error=True)
            return
        self.say("")
        self.store_entry(step, value)
        self.go_on()

    def use(self, spec, extra: dict | None = None) -> None:
        """Make ``spec`` the job's thread (with ``extra`` in its record entry) and go to set-up."""
        if not self.app.thread_chosen(spec, extra):
            self.say("The thread was not recorded (see the message above); try again.",
                     error=True)
            return
        self.say(f"{spec.designation} is the job's thread.")
        self.app.goto("setup")

    # -- keys -----------------------------------------------------------------------------------
    def action_back(self) -> None:
        if self.step_back():
            self.say("")
            self.show_step()
        else:
            self.leave_back()

    def action_forward(self) -> None:
        step = self.step()
        if step in self.ENTRY_STEPS:
            self.take_entry(self.query_one("#number", KeypadEntry).value)
        else:
            self.forward(step)

    def action_confirm(self) -> None:
        # Enter that no widget took (e.g. focus lost): act as the highlighted choice.
        if self.step() not in self.ENTRY_STEPS:
            picks = self.query_one("#choices", PickList)
            picks.pick(picks.cursor)
