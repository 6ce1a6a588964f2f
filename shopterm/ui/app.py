"""The Textual app: one App, screens by name, the job record behind every confirmed entry."""

from __future__ import annotations

import importlib
import os
import sys
from pathlib import Path

from textual.app import App
from textual.screen import Screen

from shopterm.ui.screens import FLOW, REGISTRY


class ShoptermApp(App):
    """shopterm at the lathe."""

    CSS_PATH = "app.tcss"
    ENABLE_COMMAND_PALETTE = False
    TITLE = "shopterm"

    def __init__(self, config, *, data_dir: str | os.PathLike | None = None,
                 start_screen: str | None = None) -> None:
        super().__init__()
        self.config = config
        self.lathe = config.lathe
        self.shop = config.shop
        self.data_dir_arg = data_dir
        self.start_screen = start_screen
        self.job = None            # shopterm.job session, opened on mount
        self.spec = None           # the chosen ThreadSpec of the open job
        self._screens_by_name: dict[str, Screen] = {}
        self.current_name: str | None = None

    # -- start-up ----------------------------------------------------------------------------
    def on_mount(self) -> None:
        self._apply_theme()
        self.goto(self.start_screen or "thread")
        self.notify(f"Config: {self.config.path}", timeout=4)

    def _apply_theme(self) -> None:
        from shopterm.config import user_themes_dir
        from shopterm.ui.themes import apply_theme, load_themes
        themes, problems = load_themes([user_themes_dir(), *self.config.theme_dirs])
        for theme in themes:
            self.register_theme(theme)
        message = apply_theme(self, self.shop.theme)
        for problem in problems + ([message] if message else []):
            self.notify(problem, severity="warning", timeout=8)

    # -- screens -----------------------------------------------------------------------------
    def screen_for(self, name: str) -> Screen:
        """Return the one instance of the named screen, made on first use."""
        if name not in self._screens_by_name:
            module, cls_name, _ = REGISTRY[name]
            cls = getattr(importlib.import_module(module), cls_name)
            self._screens_by_name[name] = cls()
        return self._screens_by_name[name]

    def goto(self, name: str) -> None:
        """Show the named screen (the current one keeps its state)."""
        if name == "help":
            self.action_help()
            return
        if name == "quit":
            self.exit(0)
            return
        if name not in REGISTRY:
            return
        try:
            screen = self.screen_for(name)
        except ImportError as exc:  # a screen missing from this build: say so, keep going
            self.log.error(f"screen {name}: {exc!r}")
            self.notify(f"The {REGISTRY[name][2]} screen is not available in this build.",
                        severity="error")
            return
        if self.current_name is None:
            self.push_screen(screen)
        elif screen is not self.screen:
            self.switch_screen(screen)
        self.current_name = name

    def go_forward(self, from_name: str) -> None:
        if from_name in FLOW and FLOW.index(from_name) + 1 < len(FLOW):
            self.goto(FLOW[FLOW.index(from_name) + 1])

    def go_back(self, from_name: str) -> None:
        if from_name in FLOW and FLOW.index(from_name) > 0:
            self.goto(FLOW[FLOW.index(from_name) - 1])
        elif from_name not in FLOW:
            self.goto("counter" if self.spec is not None else "thread")

    def screen_shown(self, name: str) -> None:
        """Called by a screen when it is shown (recorded so a resumed job opens there)."""
        self.current_name = name

    def action_menu(self) -> None:
        from shopterm.ui.screens.menu import MenuScreen

        def chosen(name: str | None) -> None:
            if name:
                self.goto(name)

        self.push_screen(MenuScreen(), chosen)

    def action_help(self) -> None:
        from shopterm.ui.screens.help import HelpScreen
        self.push_screen(HelpScreen())

    def ask_undo(self) -> None:
        self.notify("Nothing to undo yet.", timeout=3)

    # -- what the status line says -----------------------------------------------------------
    def status_text(self, title: str) -> tuple[str, bool]:
        """Return (status line text, whether entries are being saved)."""
        parts = [f"shopterm │ {title}"]
        if self.spec is not None:
            parts.append(self.spec.designation)
        parts.append(f"cfg {Path(str(self.config.path)).name}")
        return "  ".join(parts), True

    # -- the thread --------------------------------------------------------------------------
    def thread_chosen(self, spec) -> None:
        """The user chose a thread: keep it for the job and go on to the set-up."""
        self.spec = spec


def run_app(config_path: str | None = None, data_dir: str | None = None) -> int:
    """Start the app; refuse to start with a config that is not valid. Returns the exit code."""
    from shopterm.config import load_config
    from shopterm.errors import ConfigError

    try:
        config = load_config(config_path)
    except ConfigError as exc:
        print(f"shopterm: {exc}\nFix that line (check it with: shopterm --check-config PATH), "
              "or start with --config pointing at another file.", file=sys.stderr)
        return 2
    app = ShoptermApp(config, data_dir=data_dir)
    app.run()
    return app.return_code or 0
