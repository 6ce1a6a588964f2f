"""Help: what every key does on every screen (F1, or the menu's Help)."""

from __future__ import annotations

import importlib

from rich.text import Text
from textual.app import ComposeResult
from textual.containers import VerticalScroll
from textual.screen import ModalScreen
from textual.widgets import Static

from shopterm.ui import keys
from shopterm.ui.screens import REGISTRY
from shopterm.ui.widgets.keybar import hints_from_bindings

SHARED = [
    ("Enter", "confirm / do it (keypad Enter; ctrl+j under tmux)"),
    ("+", "next step of the job (NumLock off: →)"),
    ("-", "back (NumLock off: ←; Esc)"),
    ("*", "menu of screens (NumLock off: Home)"),
    ("/", "undo the last confirmed entry (asks first)"),
    (".", "decimal point in an entry (a comma works too)"),
    ("Bksp", "delete the last character"),
    ("0-9", "type into the entry; elsewhere pick a numbered choice, 0 = next page"),
    ("F1", "this help"),
]


def help_text() -> Text:
    """Return the help for every screen as one text."""
    out = Text()
    out.append("Keys everywhere\n", style="bold underline")
    for k, what in SHARED:
        out.append(f"  {k:>6}  {what}\n")
    for name, (module, cls_name, title) in REGISTRY.items():
        try:
            cls = getattr(importlib.import_module(module), cls_name)
        except Exception:  # a screen that cannot load must not take the help down with it
            continue
        own = hints_from_bindings(cls.__dict__.get("BINDINGS", []))
        lines = own + list(getattr(cls, "HELP", ()))
        if not lines:
            continue
        out.append(f"\n{title}\n", style="bold underline")
        for k, what in lines:
            out.append(f"  {k:>6}  {what}\n")
    return out


class HelpScreen(ModalScreen[None]):
    DEFAULT_CSS = """
    HelpScreen { align: center middle; }
    HelpScreen > VerticalScroll { width: 78; height: 22; border: round $primary; background: $surface; padding: 0 1; scrollbar-size: 0 0; }
    """
    BINDINGS = [keys.bind(keys.BACK + "," + keys.HELP + "," + keys.MENU + "," + keys.CONFIRM,
                          "close", "close"),
                keys.bind("down,2,plus,add", "scroll(3)", "down"),
                keys.bind("up,8", "scroll(-3)", "up")]

    def compose(self) -> ComposeResult:
        with VerticalScroll():
            yield Static(help_text())
            yield Static("\n[b]Safety[/b]: guards on, chuck key out, eye protection, no gloves or "
                         "loose sleeves near rotating work. Follow local rules and the machine "
                         "maker's instructions.")

    def action_close(self) -> None:
        self.dismiss(None)

    def action_scroll(self, lines: int) -> None:
        self.query_one(VerticalScroll).scroll_relative(y=lines, animate=False)
