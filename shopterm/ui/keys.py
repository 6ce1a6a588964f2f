"""One meaning per keypad key, the same on every screen, with every alias a keypad can send.

A numeric keypad sends ``plus minus asterisk slash full_stop enter`` on the console and over SSH,
``add subtract multiply divide decimal`` in kitty-protocol terminals, ``ctrl+j`` for Enter under
tmux, and navigation keys with NumLock off (see DEVELOPERS.md, "Keys").
"""

from __future__ import annotations

from textual.binding import Binding

CONFIRM = "enter,ctrl+j"
FORWARD = "plus,add,right"
BACK = "minus,subtract,left,escape"
MENU = "asterisk,multiply,home"
UNDO = "slash,divide"
HELP = "f1"
UP = "up"
DOWN = "down"
PAGE_UP = "pageup"
PAGE_DOWN = "pagedown"

#: What the key bar prints for a key name.
LABELS = {
    "enter": "Enter", "ctrl+j": "Enter", "plus": "+", "add": "+", "minus": "-", "subtract": "-",
    "asterisk": "*", "multiply": "*", "slash": "/", "divide": "/", "full_stop": ".",
    "decimal": ".", "f1": "F1", "backspace": "Bksp", "escape": "Esc", "right": "→", "left": "←",
    "up": "↑", "down": "↓", "home": "Home", "pageup": "PgUp", "pagedown": "PgDn",
}


def label(keys: str) -> str:
    """Return the short label for the first key of a comma-separated key list."""
    first = keys.split(",")[0].strip()
    return LABELS.get(first, first.upper() if len(first) == 1 else first)


def bind(keys: str, action: str, description: str, *, show: bool = True,
         priority: bool = False) -> Binding:
    """Return a Binding for ``keys`` (all aliases) with a description for the key bar."""
    return Binding(keys, action, description, show=show, priority=priority)


def digit_keys(action: str, description: str = "", show: bool = False) -> list[Binding]:
    """Return bindings of 0..9 to ``action(n)``."""
    return [Binding(str(n), f"{action}({n})", description, show=show) for n in range(10)]
