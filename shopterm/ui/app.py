"""The Textual app: one App, screens by name, the job record behind every confirmed entry."""

from __future__ import annotations

import contextlib
import importlib
import os
import sys
from pathlib import Path

from textual.app import App
from textual.screen import Screen

from shopterm.ui.screens import FLOW, REGISTRY
from shopterm.ui.themes import CONSOLE_CSS


class ShoptermApp(App):
    """shopterm at the lathe."""

    CSS_PATH = "app.tcss"
    CSS = CONSOLE_CSS
    ENABLE_COMMAND_PALETTE = False
    TITLE = "shopterm"

    def __init__(self, config, *, data_dir: str | os.PathLike | None = None,
                 start_screen: str | None = None, store_opening=None) -> None:
        """``store_opening``: a ``shopterm.job.store.StoreOpening`` already under way for
        ``data_dir`` (``run_app`` starts one before reading the config); else the store is
        opened on mount."""
        super().__init__()
        self._store_opening = store_opening
        self.config = config
        self.lathe = config.lathe
        self.shop = config.shop
        self.data_dir_arg = data_dir
        self.start_screen = start_screen
        self.store = None          # shopterm.job.store.Store, opened on mount
        self.job = None            # shopterm.job.store.JobSession of the open job
        self.spec = None           # the chosen ThreadSpec of the open job
        self._screens_by_name: dict[str, Screen] = {}
        self.current_name: str | None = None
        self._start_notes: list[str] = []     # theme problems, shown once mounted
        self._favourites: tuple[str, ...] | None = None   # checked after the first paint
        self._started = False
        self._resume_offer = None             # the unfinished job to ask about, on mount
        self._goto_on_mount: str | None = None
        self._choose_theme()

    # -- start-up ----------------------------------------------------------------------------
    def get_default_screen(self) -> Screen:
        """Return the screen the app starts on, as the first screen of the stack.

        The record is opened first (the screen may list recent jobs). Starting on our own
        screen instead of pushing it over Textual's blank one saves building, laying out and
        painting a second screen, and a frame, before the first screen is ready. A start
        screen that is not a registry screen (or fails to load) is left to ``goto`` on mount.
        References: Textual 8.2.8 ``App.get_default_screen`` / ``App._init_mode``.
        """
        if self._started:
            return super().get_default_screen()
        self._started = True
        for note in self._start_notes:
            self.notify(note, severity="warning", timeout=8)
        self._open_store()
        last = self.store.last_unfinished() if self.store is not None else None
        if last is not None and self.start_screen is None:
            self._resume_offer = last          # asked over the thread screen, on mount
        name = self.start_screen or "thread"
        if name in REGISTRY:
            try:
                screen = self.screen_for(name)
            except ImportError:
                pass                           # goto on mount says so and goes on
            else:
                # what push_screen does for a screen (as _init_mode does for a MODES screen):
                # its own CSS loaded, a result callback so switch_screen can replace it
                self._load_screen_css(screen)
                screen._push_result_callback(screen, None)
                self.current_name = name
                return screen
        self._goto_on_mount = name
        return super().get_default_screen()

    def on_mount(self) -> None:
        if self._resume_offer is not None:
            self._offer_resume(self._resume_offer)
        elif self._goto_on_mount is not None:
            self.goto(self._goto_on_mount)
        # After the first paint: the screen is there to use a frame sooner; the toast follows.
        from shopterm.config import start_message
        self.call_after_refresh(self.notify, start_message(self.config), timeout=4)
        self.call_after_refresh(self._check_favourites)

    def _check_favourites(self) -> None:
        """Check the config's favourites against the standards (after the first paint: it
        loads thread tables the first screen does not need), say which were left out, and
        have the screen show them as the standards print them."""
        written = [text for text, _ in getattr(self.config, "favourites_written", ())]
        self._favourites = tuple(getattr(self.config, "favourites", ()))
        for problem in getattr(self.config, "problems", ()):
            self.notify(problem, severity="warning", timeout=8)
        if list(self._favourites) != written and hasattr(self.screen, "favourites_changed"):
            self.screen.favourites_changed()

    # -- the job record ----------------------------------------------------------------------
    def _open_store(self) -> None:
        from shopterm.job.store import Store, StoreError
        opening, self._store_opening = self._store_opening, None
        try:
            self.store = (opening.result() if opening is not None
                          else Store.open(self.data_dir_arg))
        except StoreError as exc:
            self.store = None
            self.notify(f"{exc} Nothing will be saved.", severity="error", timeout=30)
            return
        if self.store.message:
            self.notify(self.store.message, severity="warning", timeout=20)

    def _offer_resume(self, info) -> None:
        from shopterm.ui.screens.menu import ConfirmScreen
        session = self.store.open_job(info.id)
        st = session.state
        where = f"pass {len(st.passes)} done" if st.passes else "before the first pass"
        question = (f"Carry on with job {info.id}: {st.current_designation} ({where})?\n"
                    "Enter: carry on where it stopped.  -: start a new job.")

        def answer(yes: bool | None) -> None:
            if yes and self._resume(session):
                return
            self.goto("thread")

        self.push_screen(ConfirmScreen(question), answer)

    def _resume(self, session) -> bool:
        """Open ``session``'s job on the screen it was last on; False if its thread won't parse."""
        from shopterm.errors import ShoptermError
        from shopterm.standards import parse
        st = session.state
        chosen = st.thread.values if st.thread else {}
        try:
            spec = parse(st.current_designation, kind=chosen.get("thread_kind", st.thread_kind))
            if "starts" in chosen and chosen["starts"] != spec.starts:
                spec = spec.with_(starts=int(chosen["starts"]))
        except ShoptermError as exc:
            self.notify(f"Job {session.job_id}'s thread cannot be read ({exc}).", severity="error")
            return False
        self.job = session
        self.spec = spec
        self.goto(st.last_screen if st.last_screen in REGISTRY else "counter")
        return True

    def open_job(self, job_id: int) -> bool:
        """Make job ``job_id`` the open job and show it where it stopped."""
        if self.store is None:
            return False
        return self._resume(self.store.open_job(job_id))

    @property
    def state(self):
        """Return the open job's state (a ``shopterm.job.state.JobState``), or None."""
        return self.job.state if self.job is not None else None

    def record(self, kind: str, payload: dict | None = None):
        """Write one confirmed entry to the job record; return the Event, or None if refused.

        The entry is committed to disk before this returns, so a screen shows it as done only
        after it is safe. A refused entry is reported on screen and nothing else changes.
        """
        from shopterm.errors import ShoptermError
        if self.job is None:
            self.notify("Choose a thread first: a job starts with its thread.", severity="error")
            return None
        try:
            event = self.job.append(kind, payload or {})
        except ShoptermError as exc:
            self.notify(str(exc), severity="error", timeout=10)
            return None
        self._after_change()
        return event

    def setup_values(self) -> dict:
        """Return the set-up in force: every set-up entry's values, later ones over earlier."""
        merged: dict = {}
        for chosen in (self.state.setups if self.state is not None else ()):
            merged.update(chosen.values)
        return merged

    def record_setup(self, values: dict):
        """Record a set-up entry carrying the whole set-up in force with ``values`` over it."""
        return self.record("setup_confirmed", {**self.setup_values(), **values})

    def _after_change(self) -> None:
        screen = self.screen
        if hasattr(screen, "refresh_chrome"):
            screen.refresh_chrome()
        if self.job is not None and self.job.health:
            self.notify(self.job.health, severity="error", timeout=15)

    def _choose_theme(self) -> None:
        """Set the configured theme before the stylesheet is first parsed (so it is parsed
        once); keep the problems to show once mounted."""
        from shopterm.ui.themes import load_themes, set_start_theme
        themes, problems = load_themes(self.config.theme_dirs)
        message = set_start_theme(self, self.shop.theme, themes=themes)
        self._start_notes = problems + ([message] if message else [])

    # -- screens -----------------------------------------------------------------------------
    def screen_for(self, name: str) -> Screen:
        """Return the one instance of the named screen, made on first use."""
        if name not in self._screens_by_name:
            module, cls_name, _ = REGISTRY[name]
            cls = getattr(importlib.import_module(module), cls_name)
            screen = cls()
            # Installed, so switching away keeps it (and what was typed in it) alive.
            self.install_screen(screen, name=f"shop-{name}")
            self._screens_by_name[name] = screen
        return self._screens_by_name[name]

    def goto(self, name: str) -> None:
        """Show the named screen, or the one it routes to at this stage of the job (the
        current one keeps its state)."""
        if name == "help":
            self.action_help()
            return
        if name == "quit":
            self.exit(0)
            return
        if name == "shutdown":
            self.ask_shutdown()
            return
        if name not in REGISTRY:
            return
        try:
            name = self.route(name)
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

    def route(self, name: str) -> str:
        """Return the registry screen ``name`` leads to now (its ``route()``, followed once)."""
        routed = getattr(self.screen_for(name), "route", lambda: name)()
        return routed if routed in REGISTRY else name

    def _step(self, from_name: str, step: int) -> None:
        """Go ``step`` (+1/-1) along FLOW from ``from_name``, over screens that route away."""
        i = FLOW.index(from_name) + step
        while 0 <= i < len(FLOW):
            try:
                here = self.route(FLOW[i]) == FLOW[i]
            except ImportError:
                here = True                 # goto says the screen is missing
            if here:
                self.goto(FLOW[i])
                return
            i += step

    def go_forward(self, from_name: str) -> None:
        if from_name in FLOW:
            self._step(from_name, +1)

    def go_back(self, from_name: str) -> None:
        if from_name in FLOW:
            self._step(from_name, -1)
        else:
            self.goto("counter" if self.spec is not None else "thread")

    def screen_shown(self, name: str) -> None:
        """Called by a screen when it is shown (recorded so a resumed job opens there)."""
        self.current_name = name
        if self.job is not None and not self.job.read_only and self.state.last_screen != name:
            from shopterm.errors import ShoptermError
            try:
                self.job.append("screen", {"name": name})
            except ShoptermError:
                pass

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
        """Ask before taking back the last confirmed entry; Enter undoes it."""
        from shopterm.ui.screens.menu import ConfirmScreen
        target = self.job.undoable() if self.job is not None else None
        if target is None:
            self.notify("Nothing to undo in this job.", timeout=3)
            return
        screen = self.screen

        def answer(yes: bool | None) -> None:
            if not yes:
                return
            if self.record("undo", {"target": target.seq}) is not None:
                self.notify(f"Undone: {target.title}.", timeout=4)
                if hasattr(screen, "job_changed"):
                    screen.job_changed()

        self.push_screen(ConfirmScreen(f"Undo {describe_event(target)}?"), answer)

    # -- shutting the Pi down ----------------------------------------------------------------
    def ask_shutdown(self) -> None:
        """Ask before shutting the machine down (only offered with ``[pi] shutdown_command``)."""
        from shopterm.ui.screens.menu import ConfirmScreen
        if not self.config.shutdown_command:
            return

        def answer(yes: bool | None) -> None:
            if yes:
                self.shut_down()

        self.push_screen(ConfirmScreen(
            "Shut the Pi down?\nThe job record is closed first; the job can be carried on "
            "after the next start.\nSwitch off only when the screen is dark and the Pi's "
            "activity light has stopped."), answer)

    def shut_down(self) -> bool:
        """Close the record, then run the configured shutdown command; True if it ran.

        Refused (nothing closed) while entries wait in memory to be written. If the command
        cannot be run or fails, the record is opened again and the app goes on as before.
        References: SQLite "Write-Ahead Logging" (closing the last connection checkpoints the
        WAL into the database file); sync(2).
        """
        import subprocess
        command = self.config.shutdown_command
        job_id = self.job.job_id if self.job is not None else None
        if self.store is not None:
            if self.store.pending and not self.store.retry():
                self.notify(f"Not shutting down: {self.store.health}", severity="error",
                            timeout=20)
                return False
            self.store.close()
            self.store = None
            self.job = None
        os.sync()
        try:
            run = subprocess.run(command, stdin=subprocess.DEVNULL, capture_output=True,
                                 text=True, timeout=30)
            failed = (None if run.returncode == 0 else
                      (run.stderr.strip().splitlines() or [f"exit status {run.returncode}"])[-1])
        except (OSError, subprocess.TimeoutExpired) as exc:
            failed = str(exc)
        if failed is None:
            self.exit(0, message="shopterm: the job record is closed; the Pi is shutting down.")
            return True
        self._open_store()
        if self.store is not None and job_id is not None:
            self.job = self.store.open_job(job_id)
        self.notify(f"The Pi did not shut down ({' '.join(command)}: {failed}). The record is "
                    "open again; carry on, or switch off from a shell.", severity="error",
                    timeout=20)
        self._after_change()
        return False

    # -- what the status line says -----------------------------------------------------------
    def status_text(self, title: str) -> tuple[str, bool]:
        """Return (status line text, whether entries are being saved).

        The saving state comes right after the title so that a narrow screen never cuts it off.
        """
        ok = self.store is not None and not (
            self.job is not None and (self.job.health or self.job.read_only))
        parts = [f"shopterm │ {title}", "saved" if ok else "NOT SAVING"]
        if self.job is not None:
            parts.append(f"job {self.job.job_id}")
        if self.spec is not None:
            parts.append(self.spec.designation)
        parts.append(f"cfg {Path(str(self.config.path)).name}")
        return " │ ".join(parts), ok

    # -- the thread --------------------------------------------------------------------------
    def thread_chosen(self, spec, extra: dict | None = None) -> bool:
        """The user chose a thread: start a job with it, or record the change in the open one.

        ``extra`` — more values for the record's thread entry (e.g. ``target_source: "sample"``).
        """
        from shopterm.errors import ShoptermError
        payload = {"designation": spec.designation, "thread_kind": spec.kind,
                   "tol_class": spec.tol_class or "", "starts": spec.starts, "hand": spec.hand,
                   **(extra or {})}
        if self.store is None:
            self.spec = spec
            return True
        try:
            if self.job is None or self.state.finished or self.state.archived:
                self.job = self.store.new_job(spec.designation, spec.kind,
                                              self.shop.display_units)
                self.job.append("thread_chosen", payload)
            elif extra or self.state.current_designation != spec.designation or (
                    self.state.thread and self.state.thread.values.get("starts") != spec.starts):
                self.job.append("thread_chosen", payload)
        except ShoptermError as exc:
            self.notify(str(exc), severity="error", timeout=10)
            return False
        self.spec = spec
        return True

    def new_job(self) -> None:
        """Close the open job (it stays in the record) and start choosing a thread."""
        self.job = None
        self.spec = None
        self.goto("thread")

    def favourite_threads(self) -> list[str]:
        """Return the config's favourite threads: as written until they are checked (after the
        first paint), then as the standards print them, the ones they refuse left out."""
        if self._favourites is None:
            return [text for text, _ in getattr(self.config, "favourites_written", ())]
        return list(self._favourites)

    def recent_threads(self) -> list[str]:
        """Return the designations of recent jobs, newest first, each once."""
        if self.store is None:
            return []
        seen: list[str] = []
        for info in sorted(self.store.jobs(include_archived=True), key=lambda j: -j.id):
            if info.designation and info.designation not in seen:
                seen.append(info.designation)
        return seen[:5]


def describe_event(event) -> str:
    """Return a short description of an entry for the undo question."""
    p = event.payload
    if event.kind == "pass_cut":
        return f"pass {p.get('n')} (radial {p.get('radial_cum_mm', 0):.3f} mm in all)"
    if event.kind == "wire_reading":
        return f"the wire reading {p.get('typed') or p.get('measured_mm')}"
    if event.kind == "checklist_item":
        return f"the checklist item '{p.get('item')}'"
    return event.title


def run_app(config_path: str | None = None, data_dir: str | None = None, *,
            profile=None) -> int:
    """Start the app; refuse to start with a config that is not valid. Returns the exit code.

    ``profile``: a ``shopterm.startprofile.StartProfile`` (``shopterm --profile-start``): the
    phases are timed into it and the app stops once its first screen is painted.
    """
    from shopterm.config import load_config
    from shopterm.errors import ConfigError
    from shopterm.job.store import Store

    phase = profile.phase if profile is not None else (lambda name: contextlib.nullcontext())
    # The record opens on a thread meanwhile: its disk waits overlap reading the config and
    # Textual's start; the app takes it on mount.
    opening = Store.open_in_background(data_dir)
    try:
        with phase("config read"):
            config = load_config(config_path)
    except ConfigError as exc:
        opening.discard()
        print(f"shopterm: {exc}\nFix that line (check it with: shopterm --check-config PATH), "
              "or start with --config pointing at another file.", file=sys.stderr)
        return 2
    except BaseException:
        opening.discard()
        raise
    with phase("app built (themes, stylesheet)"):
        app = ShoptermApp(config, data_dir=data_dir, store_opening=opening)
    if profile is None:
        app.run()
    else:
        # Textual draws on stderr: on a terminal the first paint is the real one
        app.run(headless=not sys.__stderr__.isatty(), auto_pilot=profile.autopilot)
        profile.add("record open", opening.seconds * 1e3,
                    f"on its own thread meanwhile; the app waited {opening.waited * 1e3:.1f} ms",
                    after="app built (themes, stylesheet)")
    return app.return_code or 0
