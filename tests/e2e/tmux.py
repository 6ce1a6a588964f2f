"""Drive the installed ``shopterm`` command in a private tmux server at 80x24, as a keypad would.

Each ``Pane`` has its own tmux server (``tmux -L <unique socket>``, ``-f`` a config of our own so
the tester's ``~/.tmux.conf`` plays no part, status line off so the app gets all 24 rows,
``remain-on-exit`` on so the last screen and exit status of a command that stopped can be read).

Keys go in the way tmux delivers a numeric keypad to the program (DEVELOPERS.md,
"Keys"; verified with tmux and Textual 8.2.8): digits, ``.`` and ``+ - * /`` literally, keypad Enter as ``C-j``,
NumLock-off keys by their tmux names (``Up``, ``Home``, ``PPage`` ...).

References: tmux 3.3 manual (new-session -x/-y/-e, send-keys -l, capture-pane -p,
display-message -p with #{pane_pid}, #{pane_dead}, #{pane_dead_status}).
"""

from __future__ import annotations

import os
import re
import shutil
import subprocess
import sys
import time
import uuid
from pathlib import Path
from typing import Callable, Iterable, Pattern

#: Keypad Enter as tmux delivers it to the program (DEVELOPERS.md, Keys: it arrives as ctrl+j).
KEYPAD_ENTER = "C-j"
#: Key names passed to ``send-keys`` as names (not typed letter by letter).
KEY_NAMES = frozenset({
    "C-j", "C-m", "Enter", "Escape", "BSpace", "Tab", "Space", "Up", "Down", "Left", "Right",
    "Home", "End", "PPage", "NPage", "IC", "DC", "F1", "F2", "F3", "F4", "F5", "F10", "C-c",
    "KPEnter", "KP0", "KP1", "KP2", "KP3", "KP4", "KP5", "KP6", "KP7", "KP8", "KP9",
})
#: Short aliases a test may use for keypad keys.
ALIASES = {"enter": KEYPAD_ENTER, "backspace": "BSpace", "bksp": "BSpace", "esc": "Escape"}

POLL = 0.05          # seconds between looks at the pane
TIMEOUT = 10.0       # seconds a wait may take before it fails (CI machines are slow)
KEY_GAP = 0.03       # seconds between two keys: a person pressing keys, not a paste
UNKNOWN_STATUS = -1000  # the pane has ended, tmux has no exit status for it
#: Appended to a command run with ``keep_open``: the pane stays, showing how it ended.
EXIT_LINE = "[shopterm exited with {}]"
TMUX_CONF = "set -g status off\nset -g remain-on-exit on\nset -g history-limit 200\n"


def tmux_path() -> str | None:
    """Return the tmux executable on PATH, or None."""
    return shutil.which("tmux")


def shopterm_command() -> Path:
    """Return the ``shopterm`` console script installed beside the running Python."""
    return Path(sys.executable).parent / "shopterm"


def missing_tools() -> str | None:
    """Return why the tmux tests cannot run here (no tmux, no installed command), or None."""
    if tmux_path() is None:
        return "tmux is not installed (apt-get install tmux; .ci/run does it)"
    cmd = shopterm_command()
    if not (cmd.is_file() and os.access(cmd, os.X_OK)):
        return (f"no installed shopterm command at {cmd}: install the project into this "
                f"Python's venv (pip install -e '.[test]', as .ci/run does)")
    return None


def app_env(home: Path, *, term: str = "xterm-256color", extra: dict[str, str] | None = None,
            ) -> dict[str, str]:
    """Return a clean environment for the app: its own HOME and XDG folders under ``home``."""
    env = {
        "PATH": os.environ.get("PATH", "/usr/bin:/bin"),
        "HOME": str(home),
        "LANG": "C.UTF-8",
        "LC_ALL": "C.UTF-8",
        "TERM": term,
        "XDG_CONFIG_HOME": str(home / "config"),
        "XDG_DATA_HOME": str(home / "data"),
        "TEXTUAL_ANIMATIONS": "none",
    }
    if extra:
        env.update(extra)
    return env


class Pane:
    """One program running in its own tmux server, 80x24 by default."""

    def __init__(self, socket: str, workdir: Path, argv: list[str]) -> None:
        self.socket = socket
        self.workdir = workdir
        self.argv = argv
        self.target = f"{socket}:0.0"
        self.captures: list[str] = []      # every pane capture taken, oldest first
        self.keep_open = False             # run under sh, pane kept after the command ends

    # -- tmux itself -------------------------------------------------------------------------
    def tmux(self, *args: str, check: bool = True) -> subprocess.CompletedProcess:
        """Return the finished ``tmux -L <socket> ARGS`` (raises on failure when ``check``)."""
        return subprocess.run(
            ["tmux", "-u", "-L", self.socket, "-f", str(self.workdir / "tmux.conf"), *args],
            capture_output=True, text=True, check=check, timeout=TIMEOUT)

    def _display(self, fmt: str) -> str:
        return self.tmux("display-message", "-p", "-t", self.target, fmt).stdout.strip()

    # -- what the brief asks for -------------------------------------------------------------
    @property
    def pane_pid(self) -> int:
        """Return the pid of the program in the pane (the shopterm process: tmux execs argv)."""
        return int(self._display("#{pane_pid}"))

    @property
    def size(self) -> tuple[int, int]:
        """Return (columns, rows) of the pane."""
        w, h = self._display("#{pane_width} #{pane_height}").split()
        return int(w), int(h)

    def dead(self) -> int | None:
        """Return the exit status if the program has stopped, else None.

        A program killed by a signal gives minus the signal number; ``UNKNOWN_STATUS`` when tmux
        has seen the pane end but not the status: tmux 3.3 sometimes never records it when the
        program closes the terminal just before it exits. Start with ``keep_open`` and wait for
        ``EXIT_LINE`` where the status matters.
        """
        dead, status, signal = (self._display("#{pane_dead}|#{pane_dead_status}|"
                                              "#{pane_dead_signal}").split("|") + ["", ""])[:3]
        if dead != "1":
            return None
        if status.isdigit():
            return int(status)
        if signal.isdigit():
            return -int(signal)
        return UNKNOWN_STATUS

    def send(self, *keys: str, gap: float = KEY_GAP) -> None:
        """Press ``keys`` one at a time: key names (``C-j``, ``Up``) as keys, other text typed.

        A text such as ``"M10x1.5-6g"`` is typed character by character with ``gap`` seconds
        between characters, the way a person types (``paste`` sends text in one burst).
        """
        for key in keys:
            key = ALIASES.get(key, key)
            if key in KEY_NAMES:
                self.tmux("send-keys", "-t", self.target, key)
                time.sleep(gap)
                continue
            for ch in key:
                self.tmux("send-keys", "-t", self.target, "-l", "--", ch)
                time.sleep(gap)

    def paste(self, text: str) -> None:
        """Send ``text`` in one burst (as a paste or a very fast typist would)."""
        self.tmux("send-keys", "-t", self.target, "-l", "--", text)

    def capture(self, joined: bool = False) -> str:
        """Return the text on the pane now (``capture-pane -p``), one line per row.

        joined: join lines the terminal wrapped at the right edge (``-J``), for long messages.
        """
        text = self.tmux("capture-pane", "-p", *(["-J"] if joined else []),
                         "-t", self.target).stdout
        self.captures.append(text)
        return text

    def wait_for(self, want: str | Pattern[str] | Callable[[str], bool],
                 timeout: float = TIMEOUT) -> str:
        """Return the pane text once it shows ``want`` (text, regex or test); else fail.

        Polls every 50 ms. Fails at once, with the last screen, if the program has stopped.
        """
        if isinstance(want, str):
            def ok(text: str) -> bool:
                return want in text
        elif isinstance(want, re.Pattern):
            def ok(text: str) -> bool:
                return want.search(text) is not None
        else:
            ok = want
        deadline = time.monotonic() + timeout
        text = ""
        while True:
            text = self.capture()
            if ok(text):
                return text
            status = self.dead()
            if status is not None:
                raise AssertionError(f"shopterm stopped (exit {status}) before showing "
                                     f"{want!r}; last screen:\n{framed(text)}")
            if time.monotonic() > deadline:
                raise AssertionError(f"waited {timeout:g} s for {want!r}; the screen shows:\n"
                                     f"{framed(text)}")
            time.sleep(POLL)

    def wait_until_gone(self, text: str, timeout: float = TIMEOUT) -> str:
        """Return the pane text once ``text`` is no longer shown; else fail."""
        return self.wait_for(lambda t: text not in t, timeout)

    def wait_exit(self, timeout: float = TIMEOUT) -> int:
        """Return the program's exit status (or ``UNKNOWN_STATUS``) once it has stopped; else fail.

        With ``keep_open`` the pane never ends: this reads the status from ``EXIT_LINE``.
        """
        if self.keep_open:
            ended = re.compile(re.escape(EXIT_LINE).replace(r"\{\}", r"(-?\d+)"))
            return int(ended.search(self.wait_for(ended, timeout))[1])
        deadline = time.monotonic() + timeout
        while (status := self.dead()) is None:
            if time.monotonic() > deadline:
                raise AssertionError(f"shopterm still running after {timeout:g} s; screen:\n"
                                     f"{framed(self.capture())}")
            time.sleep(POLL)
        settle = time.monotonic() + 1.0
        while status == UNKNOWN_STATUS and time.monotonic() < settle:
            time.sleep(POLL)
            status = self.dead()
        return status

    def kill(self) -> None:
        """Stop the program and this pane's tmux server, and remove its socket file.

        Nothing else is touched: the server is this pane's own (``-L`` socket).
        """
        try:
            path = self.tmux("display-message", "-p", "#{socket_path}", check=False).stdout
        except subprocess.TimeoutExpired:
            path = ""
        self.tmux("kill-server", check=False)
        if path.strip():
            Path(path.strip()).unlink(missing_ok=True)


def framed(text: str, title: str = "") -> str:
    """Return a pane capture with a frame around it, for test output."""
    lines = text.rstrip("\n").split("\n")
    width = max([80, *(len(line) for line in lines)])
    top = f"+-{title}".ljust(width + 1, "-") + "+"
    return "\n".join([top, *(f"|{line.ljust(width)}|" for line in lines),
                      "+" + "-" * width + "+"])


def start(workdir: Path, args: Iterable[str] = (), *, term: str = "xterm-256color",
          env: dict[str, str] | None = None, width: int = 80, height: int = 24,
          command: Path | None = None, keep_open: bool = False) -> Pane:
    """Return a Pane running the installed ``shopterm ARGS`` in a new private tmux server.

    workdir: a fresh folder for the tmux config and the app's HOME/XDG folders [path].
    term: the TERM the app sees (``xterm-256color``, or ``linux`` for the console's case).
    env: more variables (e.g. ``SHOPTERM_CONFIG``, ``SHOPTERM_DATA``).
    keep_open: run the command under ``sh`` and keep the pane open after it ends, showing
    ``EXIT_LINE`` with its status. tmux can drop what a program printed just before a quick
    exit when the pane closes with it, so use this to read a refusal message. ``pane_pid`` is
    then the shell's; otherwise tmux runs the command itself and ``pane_pid`` is shopterm's.
    """
    workdir.mkdir(parents=True, exist_ok=True)
    # tmux puts its default-terminal in the pane's TERM (over -e), so the config names ours.
    (workdir / "tmux.conf").write_text(TMUX_CONF + f'set -g default-terminal "{term}"\n',
                                       encoding="utf-8")
    for sub in ("config", "data"):
        (workdir / sub).mkdir(exist_ok=True)
    argv = [str(command or shopterm_command()), *args]
    if keep_open:
        line = EXIT_LINE.format("$?")
        argv = ["/bin/sh", "-c", f'"$@"; echo "{line}"; exec sleep 600', "sh", *argv]
    socket = f"shopterm-e2e-{os.getpid()}-{uuid.uuid4().hex[:8]}"
    pane = Pane(socket, workdir, argv)
    pane.keep_open = keep_open
    full_env = app_env(workdir, term=term, extra=env)
    e_args: list[str] = []
    for k, v in full_env.items():
        e_args += ["-e", f"{k}={v}"]
    # The server itself starts with the same clean environment; -e puts it in the pane.
    subprocess.run(
        ["tmux", "-u", "-L", socket, "-f", str(workdir / "tmux.conf"), "new-session", "-d",
         "-s", socket, "-x", str(width), "-y", str(height), "-c", str(workdir), *e_args,
         "--", *argv],
        env=full_env, capture_output=True, text=True, check=True, timeout=TIMEOUT)
    return pane


def choice_number(text: str, label: str, heading: str) -> str | None:
    """Return the digit shown before ``label`` in the numbered list under ``heading``, or None."""
    lines = text.splitlines()
    start = next((i for i, ln in enumerate(lines) if heading in ln), None)
    if start is None:
        return None
    pattern = re.compile(r"(?:^|\s)(\d) " + re.escape(label) + r"(?=\s{2}|\s*$)")
    for ln in lines[start + 1:]:
        if m := pattern.search(ln):
            return m[1]
    return None
