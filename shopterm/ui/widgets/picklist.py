"""``PickList``: a numbered list a keypad can drive: digits 1–9 pick, 0 turns the page.

A list given an entry with ``type_into`` hands it a typed letter (and, with ``number_prompt``,
the point key, which starts a numeric entry there: digits and points only).

With NumLock off, ↑/↓ move the highlight, PgUp/PgDn turn pages and Enter picks.
"""

from __future__ import annotations

import asyncio
from contextlib import suppress
from typing import Any, Sequence

from rich.text import Text
from textual import events
from textual.message import Message
from textual.reactive import reactive
from textual.widget import Widget

PAGE = 9


class PickList(Widget, can_focus=True):
    """Numbered choices, nine to a page."""

    DEFAULT_CSS = """
    PickList { height: auto; min-height: 3; padding: 0 1; }
    PickList:focus { background: $boost; }
    """

    page: reactive[int] = reactive(0)
    cursor: reactive[int] = reactive(0)

    class Picked(Message):
        def __init__(self, picklist: "PickList", index: int, value: Any) -> None:
            super().__init__()
            self.picklist = picklist
            self.index = index
            self.value = value

        @property
        def control(self) -> "PickList":
            return self.picklist

    def __init__(self, items: Sequence[tuple[str, Any]] = (), *, columns: int = 3,
                 title: str = "", id: str | None = None, classes: str | None = None) -> None:
        super().__init__(id=id, classes=classes)
        self.items: list[tuple[str, Any]] = list(items)
        self.columns = columns
        self.title = title
        self.typing_target = None      # a KeypadEntry (text mode) that a typed letter starts
        self.number_prompt: str | None = None
        self._typing = False

    def type_into(self, entry, number_prompt: str | None = None) -> None:
        """Let a letter typed here start typing into ``entry`` (a designation field); with
        ``number_prompt``, the point key starts a numeric entry there under that prompt.

        Keys typed ahead after that letter follow it into the entry, in order, even before
        the focus has moved (a paste or a fast typist sends them in one burst).
        """
        self.typing_target = entry
        self.number_prompt = number_prompt

    def on_focus(self) -> None:
        self._typing = False

    def set_items(self, items: Sequence[tuple[str, Any]], title: str = "") -> None:
        """Replace the choices and go back to the first page."""
        self.items = list(items)
        self.title = title
        self.page = 0
        self.cursor = 0
        self.clear_cached_dimensions()      # else a longer list keeps the old list's height
        self.refresh(layout=True)

    @property
    def pages(self) -> int:
        return max(1, -(-len(self.items) // PAGE))

    def page_items(self) -> list[tuple[str, Any]]:
        start = self.page * PAGE
        return self.items[start:start + PAGE]

    def render(self) -> Text:
        out = Text()
        if self.title or self.pages > 1:
            out.append(self.title, style="bold")
            if self.pages > 1:
                out.append(f"   page {self.page + 1}/{self.pages}, 0 = next page", style="dim")
            out.append("\n")
        items = self.page_items()
        width = self._cell_width()
        columns = self._columns_that_fit()
        for i, (lbl, _) in enumerate(items):
            style = "reverse" if (i == self.cursor and self.has_focus) else ""
            out.append(f"{i + 1} ", style="bold")
            out.append(lbl.ljust(width - 2), style=style)
            if (i + 1) % columns == 0 and i + 1 < len(items):
                out.append("\n")
            else:
                out.append("  ")
        if not items:
            out.append("(nothing to choose)", style="dim")
        return out

    def _cell_width(self) -> int:
        return max((len(lbl) for lbl, _ in self.page_items()), default=4) + 4

    def _columns_that_fit(self, width: int | None = None) -> int:
        """Return how many columns of items fit the width (never more than asked for)."""
        width = width if width is not None else self.content_size.width
        if width <= 0:
            return self.columns
        return max(1, min(self.columns, (width + 2) // (self._cell_width() + 2)))

    def get_content_height(self, container, viewport, width) -> int:
        rows = -(-max(1, len(self.page_items())) // self._columns_that_fit(width))
        return rows + (1 if (self.title or self.pages > 1) else 0)

    def pick(self, index_on_page: int) -> bool:
        """Tell the screen that item ``index_on_page`` was picked; False if there is none."""
        items = self.page_items()
        if not 0 <= index_on_page < len(items):
            return False
        # Straight to the screen (every screen handles its lists itself), so that the
        # ``settled`` callback queued behind it runs only once the screen has acted on it.
        return self.screen.post_message(self.Picked(self, self.page * PAGE + index_on_page,
                                                     items[index_on_page][1]))

    async def _pick_and_settle(self, index_on_page: int) -> None:
        """Pick, then hold the next key until the screen has acted on the pick.

        A keypad user types ahead: without this, a second digit pressed before the screen has
        shown the next list would pick from the old one.
        """
        if not self.pick(index_on_page):
            return
        settled = asyncio.Event()
        if self.screen.call_later(settled.set):
            with suppress(asyncio.TimeoutError):
                await asyncio.wait_for(settled.wait(), 0.5)

    def next_page(self, step: int = 1) -> None:
        self.page = (self.page + step) % self.pages
        self.cursor = 0

    async def _on_key(self, event: events.Key) -> None:
        key = event.key
        target = self.typing_target
        ch = event.character
        if (target is not None and self.number_prompt is not None and not self._typing
                and key in ("full_stop", "decimal")):
            self._typing = True
            target.begin_number(self.number_prompt)
            event.stop()
            event.prevent_default()
            self.app.set_focus(target)
            return
        if target is not None and (self._typing or (ch and (ch.isalpha() or ch == "#"))):
            self._typing = True
            if target.feed(key, ch):
                event.stop()
                event.prevent_default()
                if self.app.focused is self:
                    self.app.set_focus(target)
                return
        handled = True
        if key in "123456789" and len(key) == 1:
            await self._pick_and_settle(int(key) - 1)
        elif key == "0":
            self.next_page()
        elif key == "pagedown":
            self.next_page()
        elif key == "pageup":
            self.next_page(-1)
        elif key == "down":
            self.cursor = min(self.cursor + 1, len(self.page_items()) - 1)
        elif key == "up":
            if self.cursor == 0 and self.page > 0:
                self.next_page(-1)
            else:
                self.cursor = max(self.cursor - 1, 0)
        elif key in ("enter", "ctrl+j"):
            await self._pick_and_settle(self.cursor)
        else:
            handled = False
        if handled:
            event.stop()
            event.prevent_default()
        else:
            await super()._on_key(event)
