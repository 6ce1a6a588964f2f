"""Baselines for the benchmarks: the least a Textual app can be for the same job.

- ``MinimalApp``: one ``Static`` on the default screen (start-up time and peak memory baseline).
- ``BareInputApp``: one focused Textual ``Input`` (cursor blink off, so no timer runs between
  keys) — the per-key baseline.
- ``BareKeypadApp``: one focused ``KeypadEntry`` (shopterm's own entry widget) and nothing else,
  so the per-key figure can be split into "the widget" and "the screen around it".

This module imports only Textual (and, for ``BareKeypadApp``, the one shopterm widget inside the
function that builds it), so a start-up run of ``MinimalApp`` loads nothing of shopterm.
"""

from __future__ import annotations

from textual.app import App, ComposeResult
from textual.widgets import Input, Static


class MinimalApp(App):
    """One widget, nothing else."""

    ENABLE_COMMAND_PALETTE = False

    def compose(self) -> ComposeResult:
        yield Static("ready", id="only")


class BareInputApp(App):
    """One focused Input with the cursor blink off."""

    ENABLE_COMMAND_PALETTE = False

    def compose(self) -> ComposeResult:
        yield Input(id="entry")

    def on_mount(self) -> None:
        entry = self.query_one("#entry", Input)
        entry.cursor_blink = False
        entry.focus()


def bare_keypad_app() -> App:
    """Return an app holding one focused ``KeypadEntry`` and nothing else."""
    from shopterm.ui.widgets.entry import KeypadEntry

    class BareKeypadApp(App):
        ENABLE_COMMAND_PALETTE = False

        def compose(self) -> ComposeResult:
            yield KeypadEntry(prompt="> ", id="entry")

        def on_mount(self) -> None:
            self.query_one("#entry").focus()

    return BareKeypadApp()
