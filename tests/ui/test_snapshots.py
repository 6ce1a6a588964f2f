"""Issue 8, screens that fit: every screen as text, at 80x24 and 100x30, bright and console.

One fixed job is set up by keypad keys on the sample config (the invented demo lathe, lengths
shown in inches): M10x1.5-6g chosen, the set-up recorded (best train, in a chuck, relief
groove), three checklist items checked, the counter prepared from a typed OD and two passes cut,
one wire reading typed. Then every screen in ``REGISTRY``, the menu and the help are rendered
with ``App.run_test(size=...)`` and compared with the text in ``tests/ui/golden/`` (clock times
and temporary paths masked). ``SHOPTERM_UPDATE_GOLDEN=1`` writes the golden files instead.

Beside the golden comparison, at every size: the screen is exactly as tall as the terminal, no
line is wider than it, the key bar is the last line and shows every key it means to show in
full, the numbers the screen is for appear in full (PD limits, the dial setting), and nothing
needs scrolling (no widget and no screen has anything scrolled out of view).
"""

from __future__ import annotations

import dataclasses
import os
import re
from pathlib import Path

import pytest

from shopterm.ui.screens import REGISTRY
from shopterm.ui.themes import CONSOLE_THEME
from tests.ui.conftest import screen_lines

GOLDEN = Path(__file__).parent / "golden"
UPDATE = os.environ.get("SHOPTERM_UPDATE_GOLDEN") == "1"
SIZES = ((80, 24), (100, 30))
THEMES = ("shop-bright", CONSOLE_THEME)
#: Screens of an earlier stage, shown while the job is set up (once the cut is prepared the
#: preparation routes to the counter): the OD typed, before Enter confirms it.
ON_THE_WAY = ("prepare",)
#: Screens the fixed job (an external thread) never shows: the fit check is for internal
#: threads (tests/ui/test_wires_screen.py and the console glyph test draw it), the caliper
#: for trapezoidal and Acme threads (tests/ui/test_power_screens.py checks it fits).
NOT_THIS_JOB = ("fitcheck", "caliper")
SCREENS = [*(n for n in REGISTRY if n not in ON_THE_WAY + NOT_THIS_JOB), "menu", "help"]
INCH = 25.4                    # mm in one inch, exact # ISO 31-1 / NIST SP 811
# ISO 965-2, M10x1.5-6g d2 max / min [mm], and in inches to 0.0001
# (computed from mm / 25.4)
PD_MAX_MM, PD_MIN_MM = 8.994, 8.862
PD_MAX_IN, PD_MIN_IN = f"{PD_MAX_MM / INCH:.4f}", f"{PD_MIN_MM / INCH:.4f}"
OD_TYPED = "0.392"             # blank OD [in] (9.957 mm, inside 9.732..9.968) # ISO 965-2 d
READING = "0.4140"             # over wires [in], an oversize reading part-way through the cut
#: What each screen must show in full at 80x24 (beyond the key bar).
MUST_SHOW = {
    "thread": [PD_MAX_IN, PD_MIN_IN, f"{PD_MAX_MM:.3f}", f"{PD_MIN_MM:.3f}"],
    "wires": [f"PD max {PD_MAX_IN}", f"PD min {PD_MIN_IN}", "divisions more"],
    "counter": [re.compile(r"COMPOUND dial: set mark \d+\b"),
                re.compile(r"\(\d+ div from the zero, [\d.]+ in travel\)")],
    "setup": [re.compile(r"Gears\s+60 > idler > 127, exact"), "Keep the half nut closed"],
    "checklist": [re.compile(r"3 of \d+ checked"), "Compound set to 29.5 deg on its scale"],
    "menu": ["Go to", "Jobs and export", "Help", "Quit (the record is saved)"],
    "help": ["Keys everywhere"],
}

TIME = re.compile(r"\b\d{4}-\d\d-\d\d[ T]\d\d:\d\d(?::\d\d)?\b|\b\d\d:\d\d(?::\d\d)?\b")


def masked(lines: list[str], tmp: Path) -> str:
    """Return the screen text with clock times and the test's temporary folder masked."""
    text = "\n".join(line.rstrip() for line in lines)
    text = text.replace(str(tmp), "<tmp>")
    return TIME.sub(lambda m: re.sub(r"\d", "9", m[0]), text) + "\n"


async def until(pilot, app, test, what: str, tries: int = 100) -> None:
    """Pause until ``test()`` holds (the gear search runs in a worker thread)."""
    for _ in range(tries):
        if test():
            return
        await pilot.pause(0.02)
    raise AssertionError(f"never showed {what}:\n" + "\n".join(screen_lines(app)))


def text_of(app) -> str:
    return "\n".join(screen_lines(app))


async def fixed_job(app, pilot, on_the_way=None) -> None:
    """Set up the one job every snapshot shows, by keypad keys where a screen takes them.

    ``on_the_way(name)`` is awaited where a screen of an earlier stage shows (ON_THE_WAY)."""
    await until(pilot, app, lambda: "Thread family" in text_of(app), "the thread screen")
    await pilot.press("tab", *"M10x1.5-6g", "ctrl+j")
    await until(pilot, app, lambda: "pitch diameter" in text_of(app), "the limits")
    await pilot.press("1")                               # use it: on to the set-up
    await until(pilot, app, lambda: "Question 1 of" in text_of(app), "the set-up questions")
    await pilot.press("1", "1", "1")                      # best train, in a chuck, relief
    await until(pilot, app, lambda: "All answered" in text_of(app), "all answered")
    await pilot.press("ctrl+j")
    await until(pilot, app, lambda: "Set-up recorded" in text_of(app), "set-up recorded")
    await pilot.press("plus")
    await until(pilot, app, lambda: app.current_name == "checklist", "the checklist")
    for k in range(1, 4):
        await pilot.press("ctrl+j")
        await until(pilot, app, lambda: f": {k} of" in text_of(app), f"{k} checked")
    app.goto("counter")
    await until(pilot, app, lambda: "Prepare M10x1.5-6g" in text_of(app), "the counter")
    await pilot.press(*OD_TYPED, "ctrl+j")
    await until(pilot, app, lambda: "Measured" in text_of(app), "the OD taken")
    if on_the_way is not None:
        await on_the_way("prepare")
    await pilot.press("ctrl+j")
    await until(pilot, app, lambda: "Pass 1 of" in text_of(app), "pass 1")
    await pilot.press("ctrl+j")
    await until(pilot, app, lambda: "Pass 1 recorded" in text_of(app), "pass 1 recorded")
    await pilot.press("ctrl+j")
    await until(pilot, app, lambda: "Pass 2 recorded" in text_of(app), "pass 2 recorded")
    app.goto("wires")
    await until(pilot, app, lambda: "Reading over wires" in text_of(app), "the wire screen")
    await pilot.press(*READING, "ctrl+j")
    await until(pilot, app, lambda: "Oversize by" in text_of(app), "the reading taken")
    app.clear_notifications()


async def show(app, pilot, name: str) -> None:
    """Bring up screen ``name`` (a registry screen, the menu or the help) on the fixed job."""
    if name == "menu":
        app.goto("counter")
        await pilot.pause()
        await pilot.press("asterisk")
    elif name == "help":
        app.goto("counter")
        await pilot.pause()
        await pilot.press("f1")
    else:
        app.goto(name)
    for _ in range(3):
        await pilot.pause()
    if name == "setup":
        await until(pilot, app, lambda: "Gears" in text_of(app) and "working" not in
                    text_of(app), "the gears")
    app.clear_notifications()
    await pilot.pause()


def key_bar_hints(app) -> list[tuple[str, str]]:
    """Return the hints the screen means its key bar to show (its own key_hints)."""
    screen = app.screen
    return screen.key_hints() if hasattr(screen, "key_hints") else []


def scrolled_out(app) -> list[str]:
    """Return what would need scrolling: a scroll bar shown, or a scrollable widget (the screen
    too) with content out of view."""
    out = []
    screen = app.screen
    for w in [screen, *screen.walk_children()]:
        if not w.display:
            continue
        bars = w.show_vertical_scrollbar or w.show_horizontal_scrollbar
        hidden = w.is_scrollable and (w.max_scroll_y > 0 or w.max_scroll_x > 0)
        if bars or hidden:
            out.append(f"{w!r} bars={bars} max_scroll=({w.max_scroll_x}, {w.max_scroll_y})")
    return out


#: Known faults in others' screens, found by these checks (see the report of issue 8).
#: Problems known and reported but not yet fixed: (screen, width, problem) -> why (xfail).
KNOWN: dict[tuple[str, int, str], str] = {}


def check_screen(app, name: str, lines: list[str], size: tuple[int, int]) -> list[str]:
    """Return what is wrong with screen ``name`` as drawn (``lines``) at ``size``."""
    width, height = size
    text = "\n".join(lines)
    problems = []
    # -- the size: exactly the terminal, nothing wider ----------------------------------------
    if len(lines) != height:
        problems.append(f"{len(lines)} lines on a {height}-line terminal")
    wide = [(i, len(ln)) for i, ln in enumerate(lines) if len(ln) > width]
    if wide:
        problems.append(f"lines wider than {width}: {wide}")
    # -- the key bar: the last line, every key it means to show, in full --------------------
    if name not in ("menu", "help"):
        last = lines[-1]
        missing = [f"{k} {what}" for k, what in key_bar_hints(app)
                   if not re.search(rf"(?:^|\s){re.escape(k)} {re.escape(what)}(?:\s|$)", last)]
        if missing:
            problems.append(f"key bar cut: {missing} in {last.rstrip()!r}")
    # -- the numbers the screen is for, in full ---------------------------------------------
    for want in MUST_SHOW.get(name, []):
        if isinstance(want, str) and want not in text:
            problems.append(f"{want!r} not shown in full")
        elif not isinstance(want, str) and not want.search(text):
            problems.append(f"{want.pattern!r} not shown")
    # -- nothing needs scrolling (the help scrolls by design, by its keys, with no bar) -----
    if name != "help" and scrolled_out(app):
        problems.append(f"needs scrolling: {scrolled_out(app)}")
    if re.search("[▁▂▃▄▅▆▇▉▊▋▌▍▎▏▔▐▕]", text):
        problems.append("a scroll bar or partial block glyph on screen")
    return problems


@pytest.mark.parametrize("theme", THEMES)
@pytest.mark.parametrize("size", SIZES, ids=[f"{w}x{h}" for w, h in SIZES])
async def test_every_screen_fits_and_matches_its_golden_text(sample_config, make_app, tmp_path,
                                                             size, theme):
    from shopterm.ui.app import ShoptermApp
    width, height = size
    make_app()  # sets the private config and data folders for this test
    config = dataclasses.replace(
        sample_config, shop=dataclasses.replace(sample_config.shop, theme=theme))
    app = ShoptermApp(config, data_dir=tmp_path / "data", start_screen="thread")
    problems: dict[str, list[str]] = {}
    changed: list[str] = []
    async with app.run_test(size=size) as pilot:
        assert app.theme == theme

        async def snapshot(name: str) -> None:
            app.clear_notifications()
            await pilot.pause()
            lines = screen_lines(app)
            print(f"---- {name} {width}x{height} {theme}")
            print("\n".join(lines))
            found = check_screen(app, name, lines, size)
            if found:
                problems[name] = found
            golden = GOLDEN / f"{name}-{width}x{height}-{theme}.txt"
            got = masked(lines, tmp_path)
            if UPDATE:
                golden.parent.mkdir(parents=True, exist_ok=True)
                golden.write_text(got, encoding="utf-8")
            if not golden.is_file():
                changed.append(f"{golden.name} missing: run with SHOPTERM_UPDATE_GOLDEN=1")
            elif got != golden.read_text(encoding="utf-8"):
                changed.append(f"{golden.name} differs")

        await fixed_job(app, pilot, snapshot)
        for name in SCREENS:
            await show(app, pilot, name)
            await snapshot(name)
            if name in ("menu", "help"):
                await pilot.press("minus")                  # close it
                await pilot.pause()
    assert not changed, changed
    known = {n: p for n, p in problems.items()
             if all((n, width, p_.split(":")[0]) in KNOWN for p_ in p)}
    unknown = {n: p for n, p in problems.items() if n not in known}
    assert not unknown, unknown
    if known:
        pytest.xfail("; ".join(KNOWN[(n, width, p_.split(":")[0])] + f" ({p_})"
                               for n, ps in known.items() for p_ in ps))


def test_time_mask_keeps_the_numbers_that_are_not_times(tmp_path):
    lines = ["last entry 2026-12-01 23:07  pass 3", "dial 42 · 8.994 mm", f"{tmp_path}/x"]
    assert masked(lines, tmp_path) == ("last entry 9999-99-99 99:99  pass 3\n"
                                       "dial 42 · 8.994 mm\n<tmp>/x\n")
