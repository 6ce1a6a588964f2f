"""Two small questions the tapered-thread screens ask over the screen in use, keypad only:
pick one of a few numbered options (``PickModal``) or type one number (``NumberModal``).

Each is a ``ModalScreen`` that hands its answer back to the callback given to ``push_screen``
(None when ``-`` leaves it unanswered).
"""

from __future__ import annotations

from typing import Any, Callable

from textual.app import ComposeResult
from textual.containers import Vertical
from textual.markup import escape
from textual.screen import ModalScreen
from textual.widgets import Static

from shopterm.errors import ShoptermError
from shopterm.ui import keys
from shopterm.ui.screens.cutview import LengthEntry
from shopterm.ui.widgets.entry import KeypadEntry
from shopterm.ui.widgets.picklist import PickList

_CSS = """
{name} {{ align: center middle; }}
{name} > Vertical {{ width: 70; height: auto; border: round $accent; background: $surface;
                    padding: 0 1; }}
{name} #ask-error {{ color: $error; height: auto; }}
"""


class PickModal(ModalScreen[Any]):
    """A numbered list over the screen: a digit answers, ``-`` leaves it."""

    DEFAULT_CSS = _CSS.format(name="PickModal")
    BINDINGS = [keys.bind(keys.BACK, "leave", "back")]

    def __init__(self, title: str, items: list[tuple[str, Any]]) -> None:
        super().__init__()
        self.title_text, self.items = title, items

    def compose(self) -> ComposeResult:
        with Vertical():
            yield PickList(self.items, columns=1, title=self.title_text, id="ask-list")
            yield Static("[b] 1-9 [/b] pick     [b] - [/b] back")

    def on_mount(self) -> None:
        self.query_one("#ask-list").focus()

    def on_pick_list_picked(self, event: PickList.Picked) -> None:
        event.stop()
        self.dismiss(event.value)

    def action_leave(self) -> None:
        self.dismiss(None)


class NumberModal(ModalScreen[Any]):
    """One number typed over the screen; ``check(text)`` turns it into the answer or raises a
    ``ShoptermError`` whose message is shown in place (the text stays to correct)."""

    DEFAULT_CSS = _CSS.format(name="NumberModal")
    BINDINGS = [keys.bind(keys.BACK, "leave", "back")]

    def __init__(self, question: str, prompt: str, hint: str,
                 check: Callable[[str], Any]) -> None:
        super().__init__()
        self.question, self.prompt, self.hint, self.check = question, prompt, hint, check

    def compose(self) -> ComposeResult:
        with Vertical():
            yield Static(f"[b]{escape(self.question)}[/b]")
            yield LengthEntry(prompt=self.prompt, id="ask-entry")
            yield Static(escape(self.hint))
            yield Static("", id="ask-error")
            yield Static("[b] Enter [/b] take it     [b] - [/b] back, nothing changed")

    def on_mount(self) -> None:
        self.query_one("#ask-entry").focus()

    def on_keypad_entry_submitted(self, event: KeypadEntry.Submitted) -> None:
        event.stop()
        try:
            answer = self.check(event.value)
        except ShoptermError as exc:
            self.query_one("#ask-error", Static).update(str(exc))
            return
        self.dismiss(answer)

    def action_leave(self) -> None:
        self.dismiss(None)
