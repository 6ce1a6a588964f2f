"""Count the keys a whole keypad job takes: replay the end-to-end jobs in-process and count.

    python tests/bench/bench_key_count.py [--out tests/bench/results.json]

The jobs are those of tests/e2e/test_whole_job.py, from the one definition both use
(tests/keypad_jobs.py): the thread picked as the job says (list walk or favourite), the starts
set, the demo lathe's set-up answered, the checklist walked, the blank's OD typed, the passes
cut, a wire reading typed. Each job runs the real app headless at 80x24 (``App.run_test``) on
the demo config, with a fresh record, and every key pressed is counted and checked to have done
its work (the screen or the record moved on):

- ``choose_thread``: from the first screen to "use it" (the thread recorded);
- ``to_first_pass``: from power-on (the first screen) to the first pass recorded;
- ``per_pass``: the keys that record one more pass on the counter;
- ``per_reading``: the keys that type one wire reading and enter it on the wire screen
  (the reading as ``ThreadSim`` predicts it for the depth cut, at the micrometer's resolution,
  typed as the e2e test types it); the ``+`` there and ``-`` back are counted apart
  (``to_wires_and_back``).

The figures for results.json (``"keys"``) are the worst over the jobs replayed; the run also
gives each job's own counts and where the keys to the first pass go.
"""

from __future__ import annotations

import argparse
import asyncio
import json
import re
import sys
import tempfile
from pathlib import Path

REPO = Path(__file__).resolve().parents[2]     # run as a script: the tests package from here
if str(REPO) not in sys.path:
    sys.path.insert(0, str(REPO))

RESULTS = REPO / "tests" / "bench" / "results.json"
TARGETS = {"choose_thread": 4, "per_pass": 1, "per_reading": 8}
FIGURES = ("choose_thread", "per_pass", "per_reading", "to_first_pass")
KEY_NAMES = {".": "full_stop", "+": "plus", "-": "minus", "*": "asterisk", "/": "slash"}
PASS_OF = re.compile(r"\bPass (\d+) of (\d+)\b")


class Replay:
    """One app under ``run_test``: press keys, count them, wait for what each must do."""

    def __init__(self, app, pilot) -> None:
        self.app, self.pilot = app, pilot
        self.count = 0
        self.marks: dict[str, int] = {}

    def text(self) -> str:
        # private compositor API, as tests/ui/conftest.py (textual is pinned)
        return "\n".join(s.text for s in self.app.screen._compositor.render_strips())

    async def press(self, *keys: str) -> None:
        """Press keys: a string of digits, points and operators key by key, else a key name."""
        for k in keys:
            for ch in (list(k) if set(k) <= set("0123456789.+-*/") else [k]):
                await self.pilot.press(KEY_NAMES.get(ch, ch))
                self.count += 1

    async def until(self, want, what: str, timeout: float = 10.0) -> str:
        """Wait until ``want`` (text, regex or predicate) is on the screen; return the text."""
        test = (want if callable(want) else
                (lambda t: want.search(t)) if isinstance(want, re.Pattern) else
                (lambda t: want in t))
        loop = asyncio.get_running_loop()
        end = loop.time() + timeout
        while True:
            await self.pilot.pause()
            text = self.text()
            if test(text):
                return text
            if loop.time() > end:
                raise AssertionError(f"waited for {what}; the screen shows:\n{text}")
            await asyncio.sleep(0.02)

    async def pick(self, heading: str, label: str, pages: int = 8) -> None:
        """Press the digit of ``label`` under ``heading``, turning pages with 0 (all counted)."""
        from tests.e2e.tmux import choice_number
        text = await self.until(heading, heading)
        for _ in range(pages):
            digit = choice_number(text, label, heading)
            if digit is not None:
                await self.press(digit)
                return
            before = text
            await self.press("0")
            text = await self.until(lambda t: t != before, f"the next page of {heading!r}")
        raise AssertionError(f"{label!r} not in {pages} pages of {heading!r}:\n{text}")

    def mark(self, name: str) -> None:
        self.marks[name] = self.count


async def replay_job(job, workdir: Path) -> dict:
    """Cut the job to its first passes and one reading; return the keys counted."""
    from tests.keypad_jobs import CALIPER_STEP_MM, demo_config, lathe_facts, sim_tip
    from shopterm.config import load_config
    from shopterm.ui.app import ShoptermApp
    from tests.e2e.thread_sim import TaperSim, ThreadSim

    path = demo_config(workdir, job.units, job.wires)
    facts = lathe_facts(path)
    app = ShoptermApp(load_config(path), data_dir=workdir / f"record-{job.units}-{job.starts}")
    async with app.run_test(size=(80, 24)) as pilot:
        r = Replay(app, pilot)
        await r.until("Thread family", "the thread screen")
        for heading, label in job.choose:
            await r.pick(heading, label)
        for n in range(2, job.starts + 1):
            await r.pick("This thread", f"starts: {n - 1}")
            await r.until(f"starts: {n}", f"{n} starts")
        if job.internal:
            await r.pick("This thread", "make it internal (nut)")
            await r.until("internal ·", "the thread made internal")
        await r.pick("This thread", "use it →")
        await r.until("Question 1 of", "the set-up screen")
        assert job.want in app.spec.designation, app.spec.designation
        r.mark("choose_thread")
        await r.until(re.compile(r"(?m)^ Gears\s+\S"), "the change gears")
        await r.press("1")                                  # the best train
        for heading, label in job.setup_answers:
            await r.pick(heading, label)
        if job.starts > 1:
            await r.until("index to the next of", "the indexing question")
            await r.press("1")
        if job.taper is not None:
            await r.pick(*job.taper)
            await r.until("the work's overall length", "the work's length asked")
            await r.press(job.work_length_typed, "enter")
        await r.until("All answered", "every question answered")
        await r.press("enter")
        await r.until("Set-up recorded", "the set-up recorded")
        await r.press("+")
        r.mark("setup")
        text = await r.until(re.compile(r": 0 of (\d+) checked"), "the checklist")
        total = int(re.search(r": 0 of (\d+) checked", text)[1])
        for k in range(1, total + 1):
            await r.press("enter")
            await r.until(f": {k} of {total} checked", f"item {k} checked")
        await r.until("Every item is checked", "the checklist done")
        await r.press("+")
        r.mark("checklist")
        await r.until(lambda t: "Prepare " in t and (" measured" in t or " at small end" in t
                                                      or " at face" in t),
                      "the preparation's size entry")
        await r.until(lambda t: "\u2588" in t, "the size entry's cursor")
        await r.press(job.od_typed, "enter")
        prepared = await r.until("Measured ", "the OD taken")
        await r.press("enter")
        await r.until(PASS_OF, "pass 1 shown")
        r.mark("prepare")
        await r.press("enter")                              # cut pass 1
        await r.until("Pass 1 recorded", "pass 1 recorded")
        assert len(app.state.passes) == 1
        r.mark("first_pass")
        # more passes, as the e2e test cuts them, until a reading makes sense (the flanks past
        # the pitch line): the e2e test's first reading comes after pass total - 3
        total = int(PASS_OF.search(r.text())[2])
        per_pass = []
        for n in range(2, max(2, total - 2)):
            before = r.count
            await r.press("enter")
            await r.until(f"Pass {n} recorded", f"pass {n} recorded")
            assert len(app.state.passes) == n
            per_pass.append(r.count - before)
        r.mark("passes")
        await r.press("+")
        if job.internal:                   # gauged, not measured over wires: a fit check
            await r.until("Record a fit check against:", "the fit check")
            r.mark("to_wires")
            await r.pick("Record a fit check against:", "Try a go / no-go plug gauge")
            await r.pick("What happened?", "The go gauge does not enter")
            await r.until("fit checks so far", "the fit check recorded")
            r.mark("reading")
            await r.press("-")
            await r.until(PASS_OF, "back on the counter")
            r.mark("back")
            return counts(job, r.marks, per_pass, "")
        unit = job.units
        to_mm = 25.4 if unit == "in" else 1.0
        tip_kind, tip_mm = sim_tip(job, facts, prepared)
        args = (float(job.od_typed) * to_mm, app.spec.pitch, app.spec.lead, job.angle,
                tip_kind, tip_mm, facts["resolution_mm"], unit,
                "h28" if job.angle == 60.0 else "helical")
        sim = TaperSim(*args, k=job.taper_k) if job.taper_k else ThreadSim(*args)
        sim.cut_to(app.state.passes[-1].radial_cum_mm)
        if job.measure == "caliper":
            text = await r.until("Thickness read", "the caliper screen")
            depth = re.search(rf"Depth slide (\d+(?:\.\d+)?) {unit}\b", text)
            assert depth, text
            typed = sim.caliper_typed(float(depth[1]) * to_mm, CALIPER_STEP_MM)
            taken = f"Thickness {typed}"
        else:
            text = await r.until("Reading over wires", "the wire screen")
            r.mark("to_wires")
            if job.plane_typed:                # tapered: the plane, once (it is remembered)
                await r.press("enter", "1")
                await r.until("Where is the single wire", "the plane asked")
                await r.press(job.plane_typed, "enter")
                text = await r.until("measured at", "the plane taken")
                r.mark("plane")
            num = re.search(rf"wire (\d+(?:\.\d+)?) {unit}\b", text)
            assert num, text
            shown_mm = float(num[1]) * to_mm
            wire_mm = min(facts["wires_mm"], key=lambda w: abs(w - shown_mm))
            typed = (sim.typed_at(wire_mm, float(job.plane_typed)) if job.plane_typed
                     else sim.typed(wire_mm))
            taken = f"Reading {typed}"
        if "to_wires" not in r.marks:      # the caliper screen
            r.mark("to_wires")
        readings = len(app.state.readings) if hasattr(app.state, "readings") else None
        await r.press(typed, "enter")
        await r.until(taken, "the reading taken")
        if readings is not None:
            assert len(app.state.readings) == readings + 1
        r.mark("reading")
        await r.press("-")
        await r.until(PASS_OF, "back on the counter")
        r.mark("back")
    return counts(job, r.marks, per_pass, typed)


def counts(job, m: dict, per_pass: list, reading_typed: str) -> dict:
    """Return a job's key counts from the marks of its replay (``reading_typed`` '' for an
    internal thread: a fit check with a plug gauge, two digits, stands for the reading)."""
    plane = m.get("plane", m["to_wires"]) - m["to_wires"]
    return {
        "job": job.name,
        "choose_thread": m["choose_thread"],
        "setup": m["setup"] - m["choose_thread"],
        "checklist": m["checklist"] - m["setup"],
        "prepare": m["prepare"] - m["checklist"],
        "to_first_pass": m["first_pass"],
        "per_pass": max(per_pass),
        "passes_cut": len(per_pass) + 1,
        "per_reading": m["reading"] - m["to_wires"] - plane,
        "plane": plane,
        "to_wires_and_back": (m["to_wires"] - m["passes"]) + (m["back"] - m["reading"]),
        "reading_typed": reading_typed,
    }


def run(jobs=None) -> dict:
    """Replay the jobs (default: all of tests/keypad_jobs.py); return {"keys": worst, ...}."""
    from tests.keypad_jobs import JOBS
    jobs = JOBS if jobs is None else jobs
    per_job = []
    with tempfile.TemporaryDirectory(prefix="shopterm-keys-") as tmp:
        for i, job in enumerate(jobs):
            work = Path(tmp) / f"job{i}"
            work.mkdir()
            per_job.append(asyncio.run(replay_job(job, work)))
    worst = {f: max(j[f] for j in per_job) for f in FIGURES}
    return {"keys": worst, "keys_per_job": per_job}


def report_lines(res: dict) -> list[str]:
    k = res["keys"]
    lines = [f"keys            choose thread {k['choose_thread']} (target <= "
             f"{TARGETS['choose_thread']}), per pass {k['per_pass']} (target "
             f"{TARGETS['per_pass']}), per reading {k['per_reading']} (target <= "
             f"{TARGETS['per_reading']}), power-on to first pass {k['to_first_pass']}"]
    for j in res["keys_per_job"]:
        lines.append(f"  {j['job']:<20} choose {j['choose_thread']}, set-up {j['setup']}, "
                     f"checklist {j['checklist']}, prepare {j['prepare']}, first pass "
                     f"{j['to_first_pass']}; pass {j['per_pass']}; reading {j['per_reading']} "
                     f"({j['reading_typed'] + ' + Enter' if j['reading_typed'] else 'a fit check'}"
                     f"; + and - {j['to_wires_and_back']}"
                     + (f"; the plane once {j['plane']}" if j["plane"] else "") + ")")
    return lines


def main(argv: list[str] | None = None) -> int:
    parser = argparse.ArgumentParser(description="Count the keys of the whole keypad jobs.")
    parser.add_argument("--out", default=str(RESULTS),
                        help="results file whose \"keys\" entries are replaced (JSON)")
    args = parser.parse_args(argv)
    res = run()
    print("\n".join(report_lines(res)))
    out = Path(args.out)
    data = json.loads(out.read_text()) if out.is_file() else {}
    data.update(res)
    out.write_text(json.dumps(data, indent=1, default=str) + "\n")
    print(f"wrote {out}")
    return 0


if __name__ == "__main__":
    sys.exit(main())
