"""What the three screens of the cut share (prepare, counter, pick-up): pure presentation.

``CutScreen`` is their base: the display unit, lengths as text, the paged notes box (``#extra``,
9 turns the page), showing and hiding parts. What the cut *is* comes from the record through
``shopterm.cutting.cut_state``; nothing here computes a dimension.
"""

from __future__ import annotations

import textwrap

from rich.text import Text
from textual.containers import Horizontal
from textual.widgets import Digits, Static

from shopterm.ui.screens.base import ShopScreen
from shopterm.ui.widgets.entry import KeypadEntry
from shopterm.units import format_length

METHOD_NAMES = {"radial": "radial", "flank": "flank", "modified": "modified flank",
                "alternating": "alternating flank"}


class LengthEntry(KeypadEntry):
    """A number entry that also takes a unit suffix typed on a keyboard (mm, in, ")."""

    def _accepts(self, ch: str) -> bool:
        return ch in "0123456789.,mMiInN\" "


class DialSetting(Horizontal):
    """A dial setting to read from two metres: the number in big digits, what it is beside it.

    ``show(big, text)``; ``big`` is the number alone (e.g. ``"37"``, ``"--"``).
    """

    DEFAULT_CSS = """
    DialSetting { height: 3; padding: 0 1; }
    DialSetting > Digits { width: auto; min-width: 6; color: $accent; text-style: bold;
                           margin-right: 2; }
    DialSetting > Static { width: 1fr; height: 3; }
    """

    def __init__(self, *, id: str | None = None, digits_id: str | None = None,
                 text_id: str | None = None) -> None:
        super().__init__(id=id)
        self._ids = (digits_id, text_id)

    def compose(self):
        yield Digits("", id=self._ids[0])
        yield Static("", id=self._ids[1])

    def show(self, big: str, text) -> None:
        self.query_one(Digits).update(big)
        self.query_one(Static).update(text)


def wrap_lines(items, width: int, bullet: str = "• ") -> list[str]:
    """Return ``items`` wrapped to ``width`` columns, each starting with ``bullet``."""
    out: list[str] = []
    for item in items:
        out += textwrap.wrap(item, width, initial_indent=bullet,
                             subsequent_indent=" " * len(bullet)) or [bullet]
    return out


class CutScreen(ShopScreen):
    """Base of the screens of the cut: a head line, paged notes, lengths in the display unit."""

    AUTO_FOCUS = ""
    DEFAULT_CSS = """
    CutScreen #head { height: auto; padding: 0 1; text-style: bold; }
    CutScreen #work { height: auto; }
    CutScreen #notes { height: auto; }
    CutScreen #value-row { height: 1; padding: 0 1; }
    CutScreen #value-label { width: auto; text-style: bold; }
    CutScreen #value { width: 1fr; }
    CutScreen #extra { height: auto; padding: 0 1; }
    CutScreen #extra.caution { color: $warning; text-style: none; }
    """

    def __init__(self) -> None:
        super().__init__()
        self.page = 0                        # notes page (9 turns it)
        self.pages = 1
        self._unsaid: tuple[str, bool] | None = None

    def on_mount(self) -> None:
        super().on_mount()
        self.redraw()
        if self._unsaid is not None:       # said before the screen was first shown
            message, error = self._unsaid
            self._unsaid = None
            super().say(message, error=error)

    def say(self, message: str, *, error: bool = False) -> None:
        """Show a message in ``#message``; said before the screen is first shown, it waits."""
        if not self.is_mounted:
            self._unsaid = (message, error)
            return
        self._unsaid = None
        super().say(message, error=error)

    def on_screen_resume(self) -> None:
        super().on_screen_resume()
        self.redraw()

    def on_resize(self) -> None:
        self.redraw()

    def redraw(self) -> None:
        """Draw the screen from the record (subclasses)."""

    def on_keypad_entry_changed(self, event: KeypadEntry.Changed) -> None:
        event.stop()        # typing is this screen's business: nothing above it listens

    # -- lengths -----------------------------------------------------------------------------
    @property
    def unit(self) -> str:
        return self.app.shop.display_units

    def L(self, mm: float | None) -> str:
        if mm is None:
            return "—"
        return format_length(mm, self.unit)

    # -- layout ------------------------------------------------------------------------------
    def show(self, selectors, on: bool) -> None:
        for sel in selectors:
            self.query_one(sel).display = on

    def width(self) -> int:
        w = self.size.width or self.app.size.width or 80
        return max(40, w - 3)

    def rows_left(self, used: int) -> int:
        h = self.size.height or self.app.size.height or 24
        return h - 2 - used

    def no_thread(self) -> bool:
        """Say so and return True when no thread is chosen (every cut screen needs one)."""
        if self.app.spec is not None:
            return False
        self.query_one("#head", Static).update(
            "Choose a thread first: * then the thread screen (a job starts with its thread).")
        self.query_one("#extra", Static).update("")
        return True

    def draw_extra(self, items: list[str], rows: int, *, caution: bool, title: str = "",
                   wrapped: bool = False) -> None:
        """Show ``items`` wrapped in the space left, a page at a time (9 turns the page)."""
        lines = list(items) if wrapped else wrap_lines(items, self.width())
        rows = max(2, rows - (1 if title else 0))
        pages = max(1, -(-len(lines) // rows))
        self.page %= pages
        shown = lines[self.page * rows:(self.page + 1) * rows]
        out = Text()
        if title:
            out.append(title + (f"  (page {self.page + 1}/{pages}, 9 = next page)"
                                if pages > 1 else ""), style="bold")
            out.append("\n")
        out.append("\n".join(shown))
        extra = self.query_one("#extra", Static)
        extra.update(out)
        extra.set_class(caution, "caution")
        self.pages = pages

    def next_page(self) -> None:
        self.page += 1
        self.redraw()

    # -- the one-line entry (#value-row) -----------------------------------------------------
    def edit(self, what: str, label: str) -> None:
        """Open the one-line entry for ``what`` with ``label`` before it."""
        self.editing = what
        self.query_one("#value-label", Static).update(label)
        entry = self.query_one("#value", LengthEntry)
        entry.clear()
        self.query_one("#value-row").display = True
        entry.focus()

    def end_edit(self) -> None:
        self.editing = None
        self.query_one("#value", LengthEntry).clear()
        self.set_focus(None)
        self.redraw()
