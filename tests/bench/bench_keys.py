"""Key benchmark: the app's own work per key press on a shopterm screen against a bare entry app.

What is measured, and why it is fair:

- Each app runs headless at 80x24 under ``App.run_test``. A key is posted to the app exactly as
  the terminal driver posts it (an ``events.Key`` built the way Textual's own key helper builds
  it, put on the app's message queue).
- The clock is ``time.thread_time_ns()``: CPU time of the one thread that runs every Textual
  message pump. Time spent asleep — waiting for the next frame tick, for input, for timers — is
  not counted, so the figure is the *work* done for the key, not the frame wait.
- The interval runs from posting the key until the app is quiet again: the event loop has no
  ready callback and no message queue of the app, the screen or its widgets holds a message,
  on two event-loop turns running (a handler still busy is either runnable, or waiting on a
  message it sent, or asleep); then the dirty region is painted at once by the compositor
  (``Screen._on_timer_update``, what the frame timer would have called), and the app is let go
  quiet again for anything the paint scheduled. So the figure covers binding lookup, the
  focused widget's handler, messages it sends (``Changed``/``Submitted`` and the screen's
  handlers), reactive updates, layout if any, and the compositor render of the dirty region.
- Checking for quiet costs a little CPU (a few event-loop turns, walking the widgets). It is
  measured the same way with no key posted ("null press", one after every key) and its median
  is subtracted: ``net = median(key) − median(null)``, separately for each app, so a screen with
  more widgets is not charged for the harness walking them.
- The baseline is ``minimal_app.bare_keypad_app()``: a bare Textual app holding one focused
  entry widget, the same ``KeypadEntry`` the screens use, and nothing else. So the ratio is
  what a whole shopterm screen (status line, key bar, lists, handlers, the job record) costs per
  key over the entry alone. A bare app with a stock Textual ``Input`` (blink off) is measured
  too and reported beside it (``key_work_ratio_vs_input``); the Input does more per key than
  our entry, so that ratio is the kinder one and is not the headline.
- Every app types the same keys: a number and then Backspace until the entry is empty again
  (``12.5`` then four Backspaces, ``DEFAULT_PLAN``), so the state is the same at the start of
  each cycle. One unrecorded cycle comes first. The check ``reached_entry`` confirms the keys
  really landed in the entry.
- All the apps of a round run side by side in one event loop, and each key is given to every
  app in turn (the order rotating), so a busy machine's ups and downs fall on all of them
  alike; while one app is measured the others are idle (the quiet check covers the whole
  loop, so an idle app's timers would be counted against the one measured, not hidden).
  ``rounds`` rounds start every app afresh (each shopterm app with a data dir of its own); the
  medians are over all presses of all rounds, and the ratio is also given round by round.
- A shopterm screen is measured by name: the harness chooses M10x1.5-6g (so screens that need a
  thread have one), calls ``app.goto(name)``, focuses the screen's first visible
  ``KeypadEntry`` and types. A screen that is not written yet, or that has no entry, is
  reported and skipped; if no asked-for screen could be measured, the thread screen (its
  designation entry) is measured instead and the report says so.

``key_work_ratio`` is the largest of the measured screens' net medians over the baseline's.
This uses private names: ``App._context`` (so each app paints as itself, not as the app
started last), ``Screen._on_timer_update`` (textual is pinned to 8.2.8) and the
standard asyncio loop's ``_ready`` queue (CPython 3.11; without it the harness falls back to
``Pilot._wait_for_screen``).
"""

from __future__ import annotations

import asyncio
import os
import statistics
import sys
import tempfile
import time
import unicodedata
from pathlib import Path

HERE = Path(__file__).resolve().parent
REPO = HERE.parents[1]
for _p in (str(HERE), str(REPO)):
    if _p not in sys.path:
        sys.path.insert(0, _p)

TARGET = 2.0
#: Keys typed on every app: type a value, then Backspace it all away (a count, a depth and a
#: reading are all typed this way).
DEFAULT_PLAN: tuple[str, ...] = ("1", "2", "full_stop", "5", "backspace", "backspace",
                                 "backspace", "backspace")
DEFAULT_SCREENS = ("prepare", "wires")   # the preparation holds the entry the counter had
DEMO_THREAD = "M10x1.5-6g"


class Unavailable(Exception):
    """The screen asked for cannot be measured (not written yet, or no entry on it)."""


def make_key(app, key: str):
    """Return a fresh ``events.Key`` for ``key`` as Textual's own key helper builds it."""
    from textual import events
    from textual.keys import REPLACED_KEYS, _character_to_key, _get_unicode_name_from_key

    if len(key) == 1 and not key.isalnum():
        key = _character_to_key(key)
    original = REPLACED_KEYS.get(key, key)
    try:
        char = unicodedata.lookup(_get_unicode_name_from_key(original))
    except KeyError:
        char = key if len(key) == 1 else None
    event = events.Key(key, char)
    event.set_sender(app)
    return event


def _queued(app) -> int:
    """Return how many messages wait on the queues of the app, its screen and its widgets."""
    nodes = [app, *app.screen.walk_children(with_self=True)]
    return sum(n.message_queue_size for n in nodes)


async def quiesce(pilot, spins: int = 100_000) -> None:
    """Return when nothing in the app can run: no ready callback in the event loop and no message
    queued, twice running (timers and sleepers may be waiting; they are not work).

    A handler still busy is either runnable (a ready callback), or waiting on a message it sent
    (a queue not empty), or asleep; so this holds only once the work is done.
    """
    ready = getattr(asyncio.get_running_loop(), "_ready", None)
    if ready is None:           # not the standard asyncio loop: use Textual's own wait
        for _ in range(100):
            await pilot._wait_for_screen()
            if not _queued(pilot.app):
                return
        return
    calm = 0
    for _ in range(spins):
        await asyncio.sleep(0)
        if ready or _queued(pilot.app):
            calm = 0
            continue
        calm += 1
        if calm >= 2:
            return


async def settle(pilot) -> None:
    """Handle everything queued, paint the dirty region now, and handle what that queued."""
    await quiesce(pilot)
    with pilot.app._context():          # paint as this app (else only the last app started paints)
        pilot.app.screen._on_timer_update()
    await quiesce(pilot)


def _entry_value(entry) -> str:
    return str(getattr(entry, "value", ""))


async def measure_round(apps: dict, plan: tuple[str, ...], cycles: int) -> dict:
    """Return per-key and null CPU times [ns] of each app, all running side by side.

    apps: name -> (app, prepare), prepare being ``async (app, pilot) -> entry widget`` that puts
    the app where keys are typed (it raises ``Unavailable`` when it cannot); plan: keys of one
    cycle; cycles: recorded cycles (one more, unrecorded, comes first).
    Every app is started (headless, 80x24) in the same event loop; then key by key, each app
    gets the same key in turn (the order rotating), so all of them see the same moments of the
    machine. While one app is measured the others are idle.
    Returns name -> {keys_ns, nulls_ns, reached_entry} and "_unavailable" -> {name: why}.
    References: Python ``time.thread_time_ns`` (CLOCK_THREAD_CPUTIME_ID).
    """
    import contextlib

    out: dict = {"_unavailable": {}}
    async with contextlib.AsyncExitStack() as stack:
        live: dict[str, tuple] = {}
        for name, (app, prepare) in apps.items():
            pilot = await stack.enter_async_context(app.run_test(size=(80, 24)))
            await settle(pilot)
            try:
                entry = await prepare(app, pilot)
            except Unavailable as exc:
                out["_unavailable"][name] = str(exc)
                continue
            app.clear_notifications()
            await settle(pilot)
            live[name] = (app, pilot, entry)
            out[name] = {"keys_ns": [], "nulls_ns": [], "reached_entry": False}
        names = list(live)
        step = 0
        for cycle in range(cycles + 1):
            typed = ""
            for key in plan:
                if key != "backspace":
                    typed += "." if key == "full_stop" else key
                order = names[step % len(names):] + names[:step % len(names)] if names else []
                step += 1
                for name in order:
                    app, pilot, entry = live[name]
                    t0 = time.thread_time_ns()
                    app.post_message(make_key(app, key))
                    await settle(pilot)
                    t1 = time.thread_time_ns()
                    await settle(pilot)
                    t2 = time.thread_time_ns()
                    rec = out[name]
                    if cycle > 0:          # the first cycle is the warm-up
                        rec["keys_ns"].append(t1 - t0)
                        rec["nulls_ns"].append(t2 - t1)
                    if key != "backspace" and _entry_value(entry).endswith(typed):
                        rec["reached_entry"] = True
    return out


def _bare_prepare(app, pilot):
    async def prep(app, pilot):
        entry = app.query_one("#entry")
        entry.focus()
        await settle(pilot)
        return entry
    return prep(app, pilot)


def screen_prepare(name: str):
    """Return a ``prepare`` that shows the shopterm screen ``name`` and focuses its entry."""
    async def prep(app, pilot):
        import importlib.util

        from shopterm.standards import parse
        from shopterm.ui.screens import REGISTRY
        from shopterm.ui.widgets.entry import KeypadEntry

        if name not in REGISTRY:
            raise Unavailable(f"no screen named {name!r} (known: {', '.join(REGISTRY)})")
        if importlib.util.find_spec(REGISTRY[name][0]) is None:
            raise Unavailable(f"screen {name!r} is not written yet ({REGISTRY[name][0]})")
        if name != "thread" and getattr(app, "spec", None) is None:
            app.thread_chosen(parse(DEMO_THREAD))
        try:
            app.goto(name)
        except ModuleNotFoundError as exc:
            raise Unavailable(f"screen {name!r} is not written yet ({exc.name})") from None
        await settle(pilot)
        if getattr(app.screen, "SCREEN_NAME", None) != name:
            raise Unavailable(f"app.goto({name!r}) did not show that screen "
                              f"(showing {type(app.screen).__name__})")
        focused = app.focused
        if isinstance(focused, KeypadEntry) and focused.display:
            entry = focused
        else:
            shown = [e for e in app.screen.query(KeypadEntry) if e.display]
            if not shown:
                raise Unavailable(f"screen {name!r} has no visible entry field")
            entry = shown[0]
        entry.focus()
        await settle(pilot)
        return entry
    return prep


def _summary(sess: list[dict]) -> dict | None:
    keys = [v for s in sess for v in s["keys_ns"]]
    nulls = [v for s in sess for v in s["nulls_ns"]]
    if not keys:
        return None
    k, n = statistics.median(keys), statistics.median(nulls)
    return {"median_us": round(k / 1e3, 1), "null_us": round(n / 1e3, 1),
            "net_us": round(max(k - n, 0.0) / 1e3, 1), "presses": len(keys),
            "reached_entry": all(s["reached_entry"] for s in sess)}


async def _run(screens: tuple[str, ...], rounds: int, cycles: int, config, data_root) -> dict:
    from minimal_app import BareInputApp, bare_keypad_app
    from shopterm.ui.app import ShoptermApp

    made = iter(range(10_000))

    def fresh_app():
        # a data dir of its own for every app: a job left open by one would make the next one
        # start on the "carry on with job ...?" question
        return ShoptermApp(config, data_dir=Path(data_root) / f"data{next(made)}")

    sessions: dict[str, list[dict]] = {}
    unavailable: dict[str, str] = {}
    wanted = list(screens)
    for _ in range(rounds):
        apps = {"bare_input": (BareInputApp(), _bare_prepare),
                "bare_keypad": (bare_keypad_app(), _bare_prepare)}
        for name in wanted:
            apps[name] = (fresh_app(), screen_prepare(name))
        got = await measure_round(apps, DEFAULT_PLAN, cycles)
        unavailable.update(got.pop("_unavailable"))
        if not [n for n in got if n not in ("bare_input", "bare_keypad")]:
            # none of the asked-for screens is there: measure the thread screen instead
            wanted = ["thread"]
            apps = {"bare_input": (BareInputApp(), _bare_prepare),
                    "bare_keypad": (bare_keypad_app(), _bare_prepare),
                    "thread": (fresh_app(), screen_prepare("thread"))}
            got = await measure_round(apps, DEFAULT_PLAN, cycles)
            unavailable.update(got.pop("_unavailable"))
        else:
            wanted = [n for n in wanted if n in got]
        for name, rec in got.items():
            sessions.setdefault(name, []).append(rec)
    return {"sessions": sessions, "unavailable": unavailable}


def run(screens: tuple[str, ...] = DEFAULT_SCREENS, rounds: int = 3, cycles: int = 10) -> dict:
    """Return the key figures: net CPU time per key on each measured screen and the baselines.

    screens: shopterm screen names to measure; rounds: times every app is started afresh and
    measured side by side; cycles: recorded cycles of the key plan per round.
    Keys: key_work_ratio, key_screens_measured, key_screens_unavailable, key_detail.
    """
    from shopterm.config import load_config
    from shopterm.resources import sample_config_path

    saved = {k: os.environ.get(k) for k in ("XDG_CONFIG_HOME", "XDG_DATA_HOME")}
    with tempfile.TemporaryDirectory(prefix="shopterm-bench-keys-") as tmp:
        os.environ["XDG_CONFIG_HOME"] = str(Path(tmp) / "cfg")
        os.environ["XDG_DATA_HOME"] = str(Path(tmp) / "data")
        try:
            config = load_config(sample_config_path())
            raw = asyncio.run(_run(tuple(screens), rounds, cycles, config, Path(tmp)))
        finally:
            for k, v in saved.items():
                if v is None:
                    os.environ.pop(k, None)
                else:
                    os.environ[k] = v
    detail = {name: _summary(s) for name, s in raw["sessions"].items()}
    measured = [n for n in raw["sessions"] if n not in ("bare_input", "bare_keypad")
                and detail.get(n)]

    def ratios_over(baseline: str) -> dict[str, float]:
        base = detail[baseline]["net_us"] if detail.get(baseline) else 0
        return {n: round(detail[n]["net_us"] / base, 3) for n in measured if base > 0}

    # the same ratio round by round (each round's sessions ran back to back), to show the spread
    per_round = {}
    for n in measured:
        rs = []
        for sess, base in zip(raw["sessions"][n], raw["sessions"]["bare_keypad"]):
            b = _summary([base])
            if b and b["net_us"] > 0:
                rs.append(round(_summary([sess])["net_us"] / b["net_us"], 3))
        per_round[n] = rs
    ratios = ratios_over("bare_keypad")
    vs_input = ratios_over("bare_input")
    return {"key_work_ratio": max(ratios.values()) if ratios else None,
            "key_work_ratio_vs_input": max(vs_input.values()) if vs_input else None,
            "key_ratios": ratios,
            "key_ratios_per_round": per_round,
            "key_screens_measured": measured,
            "key_screens_unavailable": raw["unavailable"],
            "key_detail": detail}


def report_lines(res: dict) -> list[str]:
    """Return the printed lines for the key figures."""
    d = res["key_detail"]
    base = d.get("bare_keypad")
    if res["key_work_ratio"] is None or not base:
        return ["key_work_ratio  null  (no screen could be measured: "
                f"{res['key_screens_unavailable']})"]
    parts = ", ".join(f"{n} {d[n]['net_us']:.0f} us" for n in res["key_screens_measured"])
    inp = d.get("bare_input")
    line = (f"key_work_ratio  {res['key_work_ratio']:.3f}  (target <= {TARGET})  "
            f"CPU per key: {parts} vs bare KeypadEntry app {base['net_us']:.0f} us"
            + (f" (bare Input app {inp['net_us']:.0f} us, ratio "
               f"{res['key_work_ratio_vs_input']:.3f})" if inp else ""))
    out = [line]
    rounds = res.get("key_ratios_per_round") or {}
    if any(rounds.values()):
        out.append("                round by round: " + "; ".join(
            f"{n} " + " ".join(f"{r:.2f}" for r in rs) for n, rs in rounds.items()))
    if res["key_screens_unavailable"]:
        out.append("                screens not measured: " + "; ".join(
            res["key_screens_unavailable"].values()))
    return out


if __name__ == "__main__":
    print("\n".join(report_lines(run())))
