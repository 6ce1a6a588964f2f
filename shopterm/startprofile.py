"""``shopterm --profile-start``: where start-up time goes, one line per phase, in ms.

For a user on a slow machine (a Raspberry Pi) to report what start-up costs there. The app is
started the usual way (same config, same record, on the terminal when stderr is one, else
headless at 80x24) and stops by itself once its first screen is painted; then the table is
printed. Phases, in the order they happen (each includes the imports made during it):

- ``python start``: from the process start (``/proc/self/stat``, 10 ms steps) until the
  profile starts: interpreter, site-packages, the command's own script, the command line read;
- ``import the app``: Textual, Rich and the app's modules;
- ``config read``, ``app built (themes, stylesheet)``;
- ``record open``: the job record opens on a thread meanwhile; the line gives how long the
  thread took and how long the app waited for it;
- ``first screen composed and mounted``, ``first paint``;
- ``ready``: the whole, from process start to the first painted screen.

Then the import time by package over the whole start (self time of each module, as
``python -X importtime`` counts it), largest first.

References: CPython ``importlib._bootstrap._find_and_load`` (the import machinery calls it by
name for every import not yet in ``sys.modules``); proc(5) ``/proc/[pid]/stat`` field 22
(start time in clock ticks since boot) against ``CLOCK_BOOTTIME``.
"""

from __future__ import annotations

import contextlib
import os
import sys
import threading
import time

#: shopterm's own packages that make up the core (no Textual in them); the rest is the app.
CORE_PARTS = ("units", "errors", "standards", "lathe", "cutting", "job", "config", "resources")

#: Phase names, in order (the test checks the printed lines against these).
PHASES = ("python start", "import the app", "config read", "app built (themes, stylesheet)",
          "record open", "first screen composed and mounted", "first paint", "ready")


def import_group(name: str) -> str:
    """Return the package group a module name is counted under."""
    top = name.split(".")[0]
    if top == "shopterm":
        part = name.split(".")[1] if "." in name else ""
        return "shopterm core" if part in CORE_PARTS or not part else "shopterm app"
    if top in ("textual", "rich"):
        return top
    if top in sys.stdlib_module_names or top.startswith("_"):
        return "python standard library"
    return "other packages"


def since_process_start_ms() -> float | None:
    """Return the ms since this process started (10 ms steps), or None where /proc is missing."""
    try:
        with open("/proc/self/stat") as f:
            fields = f.read().rsplit(")", 1)[1].split()
        started = int(fields[19]) / os.sysconf("SC_CLK_TCK")   # field 22 of the whole line
        return (time.clock_gettime(time.CLOCK_BOOTTIME) - started) * 1e3
    except (OSError, ValueError, IndexError, AttributeError):
        return None


class StartProfile:
    """Collects the phases of one start and the import time by package."""

    def __init__(self) -> None:
        self.t0 = time.perf_counter()
        before = since_process_start_ms()
        self.phases: list[tuple[str, float, str]] = [
            ("python start", before if before is not None else float("nan"),
             "from /proc, 10 ms steps" if before is not None else "unknown here")]
        self.origin = self.t0 - (before or 0.0) / 1e3     # process start, perf_counter clock
        self.imports: dict[str, float] = {}
        self._stacks: dict[int, list[float]] = {}
        self._boot = None
        self._original = None
        self.last = self.t0

    # -- imports -----------------------------------------------------------------------------
    def watch_imports(self) -> None:
        """Time every import from now on (until ``stop_watching``), by package group."""
        import importlib._bootstrap as boot
        self._boot, self._original = boot, boot._find_and_load
        original, imports, stacks = self._original, self.imports, self._stacks

        def timed(name, import_):
            stack = stacks.setdefault(threading.get_ident(), [])
            start = time.perf_counter()
            stack.append(0.0)
            try:
                return original(name, import_)
            finally:
                total = time.perf_counter() - start
                inner = stack.pop()
                if stack:
                    stack[-1] += total
                group = import_group(name)
                imports[group] = imports.get(group, 0.0) + (total - inner) * 1e3

        boot._find_and_load = timed

    def stop_watching(self) -> None:
        if self._boot is not None:
            self._boot._find_and_load = self._original
            self._boot = None

    # -- phases ------------------------------------------------------------------------------
    def mark(self, name: str, note: str = "") -> None:
        """End the phase ``name`` now: it ran since the previous mark."""
        now = time.perf_counter()
        self.phases.append((name, (now - self.last) * 1e3, note))
        self.last = now

    @contextlib.contextmanager
    def phase(self, name: str):
        """End the phase ``name`` when the block ends (phases follow on: nothing is lost)."""
        yield
        self.mark(name)

    def add(self, name: str, ms: float, note: str = "", after: str | None = None) -> None:
        """Add a phase timed elsewhere: at the end, or just after the phase ``after``."""
        names = [p[0] for p in self.phases]
        at = names.index(after) + 1 if after in names else len(self.phases)
        self.phases.insert(at, (name, ms, note))

    def finish(self) -> None:
        self.add("ready", (time.perf_counter() - self.origin) * 1e3,
                 "from process start to the first painted screen")

    async def autopilot(self, pilot) -> None:
        """Wait for the first shopterm screen, mark it mounted and painted, then leave."""
        import asyncio
        app = pilot.app
        deadline = time.monotonic() + 60
        # a ShopScreen anywhere in the stack: a resumable job's question may sit over it
        while not any(getattr(s, "SCREEN_NAME", "") and s.is_mounted for s in app.screen_stack):
            if time.monotonic() > deadline:
                self.add("first screen composed and mounted", float("nan"), "never (60 s)")
                app.exit(3)
                return
            await asyncio.sleep(0.0005)
        self.mark("first screen composed and mounted")
        painted = asyncio.Event()
        app.screen.call_after_refresh(painted.set)
        await painted.wait()
        self.mark("first paint")
        self.finish()
        app.exit()

    # -- report ------------------------------------------------------------------------------
    def lines(self) -> list[str]:
        """Return the printed report: a heading, one line per phase, one per import group."""
        import platform
        try:
            load = " ".join(f"{v:.2f}" for v in os.getloadavg())
        except OSError:
            load = "?"
        out = [f"shopterm start-up profile: Python {platform.python_version()}, "
               f"{platform.machine()}, {os.cpu_count()} cores, load {load}",
               f"{'phase':<44}{'ms':>8}"]
        for name, ms, note in self.phases:
            out.append(f"{name:<44}{ms:>8.1f}" + (f"  ({note})" if note else ""))
        out.append("imports by package (self time, inside the phases above):")
        for group, ms in sorted(self.imports.items(), key=lambda kv: -kv[1]):
            out.append(f"{'  import ' + group:<44}{ms:>8.1f}")
        return out


def profile_start(config_path: str | None = None, data_dir: str | None = None) -> int:
    """Start the app once, stop at its first painted screen, print where the time went."""
    prof = StartProfile()
    prof.watch_imports()
    try:
        with prof.phase("import the app"):
            from shopterm.ui.app import run_app
        code = run_app(config_path=config_path, data_dir=data_dir, profile=prof)
    finally:
        prof.stop_watching()
    print("\n".join(prof.lines()))
    return code
