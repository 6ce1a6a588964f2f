"""``ShopScreen``: what every screen shares — status line, key bar, and the app-wide keys."""

from __future__ import annotations

from textual.app import ComposeResult
from textual.binding import Binding
from textual.screen import Screen
from textual.widgets import Static

from shopterm.ui import keys
from shopterm.ui.widgets.keybar import KeyBar, hints_from_bindings


class StatusLine(Static):
    DEFAULT_CSS = """
    StatusLine { dock: top; height: 1; background: $primary; color: $text; padding: 0 1; }
    StatusLine.unsaved { background: $error; }
    """
    shown = ""


class ShopScreen(Screen):
    """Base of every screen: subclasses implement ``compose_body`` and may override actions."""

    SCREEN_NAME = ""
    TITLE = ""
    #: One line per key for the help screen, beyond what the key bar shows.
    HELP: tuple[tuple[str, str], ...] = ()

    BINDINGS = [
        keys.bind(keys.FORWARD, "forward", "next"),
        keys.bind(keys.BACK, "back", "back"),
        keys.bind(keys.MENU, "app.menu", "menu"),
        keys.bind(keys.UNDO, "undo", "undo", show=False),
        keys.bind(keys.HELP, "app.help", "help"),
    ]

    def compose(self) -> ComposeResult:
        # made with their text, so that mounting does not lay the screen out a second time
        status, bar = StatusLine(id="status"), KeyBar(id="keybar")
        self._show_chrome(status, bar)
        yield status
        yield from self.compose_body()
        yield bar

    def compose_body(self) -> ComposeResult:
        yield from ()

    # -- key bar -----------------------------------------------------------------------------
    def all_bindings(self) -> list[Binding]:
        """Return this screen's bindings, its own first, then the shared ones."""
        out: list[Binding] = []
        for cls in type(self).__mro__:
            for b in cls.__dict__.get("BINDINGS", []):
                out.append(b if isinstance(b, Binding) else Binding(*b))
            if cls is ShopScreen:
                break
        return out

    def key_hints(self) -> list[tuple[str, str]]:
        return hints_from_bindings(self.all_bindings())

    def refresh_chrome(self) -> None:
        """Redraw the status line and key bar."""
        try:
            bar, status = self.query_one(KeyBar), self.query_one(StatusLine)
        except Exception:
            return
        self._show_chrome(status, bar)

    def _show_chrome(self, status: StatusLine, bar: KeyBar) -> None:
        bar.show_hints(self.key_hints())
        text, ok = self.app.status_text(self.TITLE)
        if text != status.shown:      # an unchanged line is not laid out and drawn again
            status.shown = text
            status.update(text)
        status.set_class(not ok, "unsaved")

    def on_mount(self) -> None:
        self.refresh_chrome()

    def on_screen_resume(self) -> None:
        if self.app.screen is not self:   # a late resume, or a second call from a subclass
            return
        self.refresh_chrome()
        self.app.screen_shown(self.SCREEN_NAME)

    def route(self) -> str:
        """Return the screen to show when this one is asked for: its own name, or the screen
        for the stage the job is at (the pass counter sends a cut not yet prepared to
        'prepare'). ``app.goto`` follows it; ``+``/``-`` step over a screen that routes away."""
        return self.SCREEN_NAME

    def follow_route(self) -> bool:
        """Go to the screen this one routes to now (after the record changed); True if it went."""
        other = self.route()
        if other == self.SCREEN_NAME:
            return False
        self.app.goto(other)
        return True

    # -- shared actions ----------------------------------------------------------------------
    def action_forward(self) -> None:
        self.app.go_forward(self.SCREEN_NAME)

    def action_back(self) -> None:
        self.app.go_back(self.SCREEN_NAME)

    def action_undo(self) -> None:
        self.app.ask_undo()

    def say(self, message: str, *, error: bool = False) -> None:
        """Show a short message in this screen's message line (``#message``) or as a toast."""
        try:
            line = self.query_one("#message", Static)
        except Exception:
            self.app.notify(message, severity="error" if error else "information")
            return
        line.update(message)
        line.set_class(error, "error")
        line.set_class(not error, "info")
