"""``KeypadEntry``: an entry field that keeps the keypad's operator keys free for the screen.

A Textual ``Input`` swallows every printable key, so ``+ - * /`` would never reach the screen.
This widget takes only what it needs (digits, ``.``/``,``, Backspace, and in text mode the
characters of a designation) and lets every other key bubble up to the screen's bindings.
"""

from __future__ import annotations

from textual import events
from textual.message import Message
from textual.reactive import reactive
from textual.widget import Widget
from rich.text import Text

NUMBER_CHARS = set("0123456789.,")
TEXT_CHARS = set("0123456789.,abcdefghijklmnopqrstuvwxyzABCDEFGHIJKLMNOPQRSTUVWXYZ#/- ()\"'×")


class KeypadEntry(Widget, can_focus=True):
    """A one-line entry for numbers (or, with ``text=True``, designations)."""

    DEFAULT_CSS = """
    KeypadEntry { height: 1; width: 1fr; padding: 0 1; background: $boost; }
    KeypadEntry:focus { background: $primary 30%; text-style: bold; }
    """

    value: reactive[str] = reactive("", layout=False)

    class _EntryMessage(Message):
        def __init__(self, entry: "KeypadEntry", value: str) -> None:
            super().__init__()
            self.entry = entry
            self.value = value

        @property
        def control(self) -> "KeypadEntry":
            return self.entry

    class Changed(_EntryMessage):
        """The text changed; ``value`` is the raw text."""

    class Submitted(_EntryMessage):
        """Enter was pressed; ``value`` is the raw text (the screen parses and checks it)."""

    def __init__(self, value: str = "", *, prompt: str = "", placeholder: str = "",
                 text: bool = False, max_length: int = 40, id: str | None = None,
                 classes: str | None = None) -> None:
        super().__init__(id=id, classes=classes)
        self.prompt = prompt
        self.placeholder = placeholder
        self.text_mode = text
        self._saved: tuple[bool, str] | None = None   # mode and prompt before begin_number
        self.max_length = max_length
        self.set_reactive(KeypadEntry.value, value)

    def render(self) -> Text:
        out = Text(self.prompt, style="bold") if self.prompt else Text()
        if self.value:
            out.append(self.value)
        elif self.placeholder and not self.has_focus:
            out.append(self.placeholder, style="dim")
        if self.has_focus:
            out.append("█")
        return out

    def clear(self) -> None:
        self.value = ""

    def begin_number(self, prompt: str | None = None) -> None:
        """Start an empty numeric entry in a text-mode field (digits and points only, so
        ``+ - * /`` keep their meaning for the screen) until the field loses the focus; a
        different ``prompt`` is shown meanwhile."""
        self._saved = (self.text_mode, self.prompt)
        self.text_mode = False
        if prompt is not None:
            self.prompt = prompt
        self.value = ""
        self.refresh()

    def begin_text(self) -> None:
        """Go back to the field's mode and prompt from before ``begin_number`` (nothing to do
        when it was not called: a screen may have changed the prompt since)."""
        if self._saved is None:
            return
        self.text_mode, self.prompt = self._saved
        self._saved = None
        self.refresh()

    def watch_value(self, value: str) -> None:
        self.post_message(self.Changed(self, value))

    def _accepts(self, ch: str) -> bool:
        return ch in (TEXT_CHARS if self.text_mode else NUMBER_CHARS)

    def feed(self, key: str, character: str | None) -> bool:
        """Apply one key as this entry would; return whether the entry took it.

        Also used by a ``PickList`` that hands on keys typed ahead into its entry.
        """
        ch = "." if key in ("full_stop", "decimal") else character
        if key in ("enter", "ctrl+j"):
            self.post_message(self.Submitted(self, self.value))
            return True
        if key in ("backspace", "delete", "ctrl+h"):
            if not self.value:
                return False  # an empty entry lets Backspace go to the screen
            self.value = self.value[:-1]
            return True
        if ch and len(ch) == 1 and self._accepts(ch) and key not in ("plus", "asterisk"):
            if not self.text_mode and ch in "-/":
                return False
            if len(self.value) < self.max_length:
                self.value += ch
            return True
        return False

    async def _on_key(self, event: events.Key) -> None:
        if self.feed(event.key, event.character):
            event.stop()
            event.prevent_default()
            return
        await super()._on_key(event)

    def on_focus(self) -> None:
        self.refresh()

    def on_blur(self) -> None:
        self.begin_text()
