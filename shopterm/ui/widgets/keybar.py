"""``KeyBar``: the bottom line saying what each key does on this screen (our own footer).

Textual's Footer draws with glyphs the Linux console fonts lack; this one uses plain text.
"""

from __future__ import annotations

from rich.text import Text
from textual.widgets import Static

from shopterm.ui import keys


class KeyBar(Static):
    DEFAULT_CSS = """
    KeyBar { dock: bottom; height: 1; background: $panel; color: $text; padding: 0 1; }
    """

    hints: list[tuple[str, str]] | None = None

    def show_hints(self, hints: list[tuple[str, str]]) -> None:
        """Show ``(key label, what it does)`` pairs (nothing is redrawn if they are the same)."""
        if hints == self.hints:
            return
        self.hints = hints
        out = Text(no_wrap=True, overflow="ellipsis")
        for i, (k, what) in enumerate(hints):
            if i:
                out.append("  ")
            out.append(k, style="reverse bold")
            out.append(f" {what}")
        self.update(out)


def hints_from_bindings(bindings) -> list[tuple[str, str]]:
    """Return key-bar hints from a list of Bindings (those with ``show`` and a description)."""
    seen: set[str] = set()
    out = []
    for b in bindings:
        if not b.show or not b.description or b.action in seen:
            continue
        seen.add(b.action)
        out.append((b.key_display or keys.label(b.key), b.description))
    return out
