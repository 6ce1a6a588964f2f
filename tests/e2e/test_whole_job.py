"""Issue 8: whole jobs at the machine, keypad keys only, on the installed ``shopterm`` in tmux.

Each test drives the installed command at 80x24 with the keys a numeric keypad sends through
tmux (digits, ``.``, keypad Enter as ``C-j``, Backspace, ``+ - * /``; never a letter):

1. the thread by digits (the jobs and how each thread is picked, by the list walk or as a
   favourite of the demo config, are in ``tests/keypad_jobs.py``, which the key-count
   benchmark replays too), two starts by the thread's option;
2. the demo lathe's set-up: change gears (the lead they make is re-derived with
   ``fractions.Fraction``), work holding, run-out, indexing for two starts; Enter records it;
3. the checklist, every item walked with Enter (the compound setting and half-nut plan read);
4. the counter: the blank's OD typed with digits and ``.``, then the passes cut as shown;
5. wire readings from ``thread_sim.ThreadSim``, which turns the dial marks actually set into
   radial depth and predicts the reading over the wire the screen names; the screen's remaining
   feed is followed (back to the counter, which replans from the reading) until the reading is
   inside the class;
6. the job card, exported from the jobs screen by keypad or by ``shopterm export last``, and
   its numbers checked: the final PD inside the published band, every pass listed.

Every screen along the way is captured; the captures are written under pytest's ``tmp_path``
and printed (``pytest -s tests/e2e/test_whole_job.py`` shows them; so does a failure).
"""

from __future__ import annotations

import math
import re
import subprocess
import sys
from fractions import Fraction
from pathlib import Path

import pytest

from shopterm.job.state import fold
from shopterm.job.store import Store
from tests.e2e import tmux
from tests.keypad_jobs import (CALIPER_STEP_MM, SETUP_ANSWERS, KeypadJob, demo_config, job,
                               lathe_facts, sim_tip)
from tests.e2e.thread_sim import INCH, ThreadSim, radial_from_dial

pytestmark = pytest.mark.e2e

WAIT = 20.0                        # longest one screen may take to appear [s] (slow CI)
ENTER = tmux.KEYPAD_ENTER
KEYPAD = set("0123456789.+-*/") | {ENTER, "BSpace"}

PASS_OF = re.compile(r"\bPass (\d+) of (\d+)\b")
SPRING = re.compile(r"\bSpring pass (\d+) of (\d+)\b")
ALL_CUT = re.compile(r"\bAll (\d+) passes cut\b")
DIAL = re.compile(r"(COMPOUND|CROSS-SLIDE) dial: set mark (\S+)")
DIVS = re.compile(r"\(([\d.]+) div from the zero")
NUM = r"(-?\d+(?:\.\d+)?)"


# ---------------------------------------------------------------------------------------------
# The rig: keypad keys only, every screen captured

class Machine:
    """One shopterm in tmux at 80x24, pressed by keypad keys only; every screen kept."""

    def __init__(self, workdir: Path, config: Path, data: Path) -> None:
        self.workdir, self.config, self.data = workdir, config, data
        self.pane = tmux.start(workdir / "pane", ["--data-dir", str(data)],
                               env={"SHOPTERM_CONFIG": str(config)})
        self.shots: list[tuple[str, str]] = []

    def keys(self, *keys: str) -> None:
        """Press keypad keys (a string of digits/point/operators is pressed key by key)."""
        for k in keys:
            if k not in KEYPAD:
                assert all(ch in KEYPAD for ch in k), f"not a keypad key: {k!r}"
            self.pane.send(k)

    def wait(self, want, timeout: float = WAIT) -> str:
        return self.pane.wait_for(want, timeout)

    def shot(self, title: str, text: str | None = None) -> str:
        """Keep the screen (now, or ``text`` just waited for) under ``title``; return it."""
        text = self.pane.capture() if text is None else text
        self.shots.append((title, text))
        return text

    def write_shots(self, folder: Path) -> None:
        folder.mkdir(parents=True, exist_ok=True)
        for i, (title, text) in enumerate(self.shots, 1):
            name = re.sub(r"[^a-z0-9]+", "-", title.lower()).strip("-")[:40]
            (folder / f"{i:02d}-{name}.txt").write_text(text, encoding="utf-8")
            print(tmux.framed(text, f" {i:02d} {title} "))

    def close(self) -> None:
        self.pane.kill()


def pick(m: Machine, heading: str, label: str, title: str, pages: int = 8) -> None:
    """Press the digit of ``label`` in the list under ``heading``, turning pages with 0."""
    text = m.wait(heading)
    for _ in range(pages):
        digit = tmux.choice_number(text, label, heading)
        if digit is not None:
            m.shot(title, text)
            m.keys(digit)
            return
        before = text
        m.keys("0")
        text = m.wait(lambda t: t != before, 5)
    raise AssertionError(f"{label!r} not in {pages} pages of {heading!r}:\n{tmux.framed(text)}")


def find(pattern: str, text: str, what: str) -> re.Match:
    m = re.search(pattern, text)
    assert m, f"no {what} on the screen:\n{tmux.framed(text)}"
    return m


# ---------------------------------------------------------------------------------------------
# The configs: the sample's demo lathe, shown in mm or in inches

# ---------------------------------------------------------------------------------------------
# One whole job

def choose_thread(m: Machine, walk, starts: int, want: str) -> str:
    """Pick the thread from the lists by digits, set the starts, use it; return the designation
    shown."""
    m.wait("Thread family")
    for heading, label in walk:
        pick(m, heading, label, f"thread: {heading.lower()}")
    text = m.wait("This thread")
    for n in range(2, starts + 1):
        pick(m, "This thread", f"starts: {n - 1}", "thread: starts option")
        text = m.wait(f"starts: {n}")
    text = m.shot("thread: chosen", m.wait("pitch diameter"))
    designation = find(r"(?m)^\s*(.+?)\s{2,}external ·", text, "designation")[1]
    assert want in designation, text
    if starts > 1:
        assert f"{starts} starts" in text, text
    pick(m, "This thread", "use it →", "thread: use it")
    return designation


def gear_lead_mm(gears: str, leadscrew_tpi: int) -> Fraction:
    """Return the lead [mm] a train written on the screen makes, exactly.

    ``60 > idler > 127`` (simple) or ``a/b x c/d`` (drivers a, c; driven b, d).
    References: Rose, Modern Machine Shop Practice (work pitch = leadscrew pitch × drivers/driven).
    """
    screw = Fraction(254, 10) / leadscrew_tpi
    if m := re.fullmatch(r"(\d+) > idler > (\d+)", gears):
        return screw * Fraction(int(m[1]), int(m[2]))
    m = re.fullmatch(r"(\d+)/(\d+) x (\d+)/(\d+)", gears)
    assert m, gears
    a, b, c, d = map(int, m.groups())
    return screw * Fraction(a * c, b * d)


def set_up_lathe(m: Machine, facts: dict, lead_mm: Fraction, starts: int) -> dict:
    """Answer the set-up questions by digits, record it; return what the screen said."""
    text = m.wait("Question 1 of")
    text = m.wait(re.compile(r"(?m)^ Gears\s+\S.*(exact|off the lead)"))
    m.shot("set-up: change gears", text)
    gears = find(r"(?m)^ Gears\s+(.+?), (?:exact|[+-][\d.]+% off the lead)", text, "gears")[1]
    made = gear_lead_mm(gears, facts["leadscrew_tpi"])
    # computed from leadscrew pitch × drivers/driven with Fraction, Rose, Modern Machine Shop Practice
    assert abs(float(made - lead_mm)) <= float(lead_mm) * 1e-3, (gears, made, lead_mm)
    if ", exact" in text:
        assert made == lead_mm, (gears, made)
    m.keys("1")                                          # the best train
    for heading, label in SETUP_ANSWERS:                 # work holding, run-out
        pick(m, heading, label, f"set-up: {label}")
    out = {"gears": gears}
    if starts > 1:
        text = m.wait("index to the next of")
        m.shot("set-up: indexing", text)
        out["indexing_options"] = text
        m.keys("1")
    text = m.wait("All answered")
    m.keys(ENTER)
    text = m.shot("set-up: recorded", m.wait("Set-up recorded"))
    out["half_nut"] = find(r"(?m)^ Half nut\s+(.+)$", text, "half-nut plan")[1].strip()
    if starts > 1:
        out["indexing"] = find(r"(?m)^ Indexing\s+(.+)$", text, "indexing line")[1].strip()
    m.keys("+")
    return out


def walk_checklist(m: Machine) -> str:
    """Check every item with Enter, one at a time; return the checklist as first shown."""
    text = m.wait(re.compile(r": 0 of (\d+) checked"))
    first = m.shot("checklist: first", text)
    total = int(re.search(r": 0 of (\d+) checked", text)[1])
    for k in range(1, total + 1):
        m.keys(ENTER)
        m.wait(f": {k} of {total} checked")
    m.shot("checklist: all checked", m.wait("Every item is checked"))
    m.keys("+")
    return first


def prepare_counter(m: Machine, od_typed: str) -> str:
    """Type the blank's OD (digits and a point), Enter; then confirm the preparation."""
    text = m.wait("Prepare ")
    m.shot("counter: prepare", text)
    # a slip corrected with Backspace: one digit too many, taken back, nothing else lost
    m.keys(od_typed, "7")
    m.wait(f"{od_typed}7")
    m.keys("BSpace")
    m.wait(lambda t: f"{od_typed}7" not in t and od_typed in t)
    m.keys(ENTER)
    text = m.shot("counter: OD taken", m.wait("Measured "))
    m.keys(ENTER)
    m.wait(PASS_OF)
    return text


def dial_setting(text: str) -> tuple[str, float]:
    """Return (which dial, divisions from the zero) the counter says to set for this pass."""
    dial = find(DIAL.pattern, text, "dial setting")
    divs = find(DIVS.pattern, text, "divisions from the zero")
    return dial[1], float(divs[1])


def cut_one(m: Machine, sim: ThreadSim, facts: dict, angle: float, text: str,
            log: list) -> str:
    """Set the dial the screen shows, cut (the simulator cuts), press the key; return the next."""
    which, divs = dial_setting(text)
    step = facts["compound_div_mm"] if which == "COMPOUND" else facts["cross_div_mm"]
    sim.cut_to(radial_from_dial(divs, step, angle if which == "COMPOUND" else 0.0))
    if SPRING.search(text):
        before = SPRING.search(text)[0]
        m.keys("0")
        log.append(("spring", divs))
        return m.wait(lambda t: before not in t and (SPRING.search(t) or ALL_CUT.search(t)
                                                     or PASS_OF.search(t)))
    n = int(PASS_OF.search(text)[1])
    m.keys(ENTER)
    log.append(("pass", divs))
    return m.wait(lambda t: f"Pass {n} recorded" in t)


def read_wires(m: Machine, sim: ThreadSim, facts: dict, unit: str, title: str) -> dict:
    """Go to the wire screen, type the simulator's reading, Enter; return what it shows."""
    m.keys("+")
    text = m.wait("Reading over wires")
    wire = find(rf"wire {NUM} {unit}\b", text, "wire in use")
    wire_mm = float(wire[1]) * (INCH if unit == "in" else 1.0)
    owned = min(facts["wires_mm"], key=lambda w: abs(w - wire_mm))
    assert abs(owned - wire_mm) < (0.00006 * INCH if unit == "in" else 0.0006), (wire_mm, owned)
    typed = sim.typed(owned)                          # the wire as the config measured it
    m.keys(typed, ENTER)
    text = m.wait(f"Reading {typed}")
    text = m.wait(re.compile(r"Oversize by|In the band|Undersize by|At the basic"))
    m.shot(f"wires: {title}", text)
    return what_it_says(text, unit, {"typed": typed, "wire_mm": owned, "text": text,
                                     "sim_pd": sim.pitch_diameter()})


def what_it_says(text: str, unit: str, out: dict) -> dict:
    """Add to ``out`` the PD a reading screen derived, its state and the band in divisions."""
    out["pd"] = float(find(rf"→ PD {NUM} {unit}", text, "PD from the reading")[1])
    out["state"] = ("oversize" if "Oversize by" in text else "in_band" if "In the band" in text
                    else "undersize")
    if band := re.search(r"in the band from (\d+) to (\d+) div", text):
        out["band_divs"] = (int(band[1]), int(band[2]))
    return out


def read_caliper(m: Machine, sim: ThreadSim, facts: dict, unit: str, title: str) -> dict:
    """Go to the caliper screen (no owned wire fits), set the depth slide as it says, type the
    simulator's thickness, Enter; return what it shows."""
    m.keys("+")
    text = m.wait("Thickness read")
    depth = float(find(rf"Depth slide {NUM} {unit}", text, "depth slide")[1])
    depth_mm = depth * (INCH if unit == "in" else 1.0)
    typed = sim.caliper_typed(depth_mm, CALIPER_STEP_MM)
    m.keys(typed, ENTER)
    m.wait(f"Thickness {typed}")
    text = m.wait(re.compile(r"Oversize by|In the band|Undersize by|At the basic"))
    m.shot(f"caliper: {title}", text)
    return what_it_says(text, unit, {"typed": typed, "text": text,
                                     "sim_pd": sim.pitch_diameter(), "caliper": True})


def back_to_counter(m: Machine) -> str:
    m.keys("-")
    return m.wait(re.compile(r"│ Pass counter │"))


def run_whole_job(tmp_path: Path, j: KeypadJob):
    """Cut one whole job by keypad; return (machine, record state, card text, log)."""
    units, starts, od_typed, band = j.units, j.starts, j.od_typed, j.band
    reason = tmux.missing_tools()
    if reason:
        pytest.skip(reason)
    config = demo_config(tmp_path, units, j.wires)
    facts = lathe_facts(config)
    data = tmp_path / "record"
    m = Machine(tmp_path, config, data)
    try:
        designation = choose_thread(m, j.choose, starts, j.want)
        text = m.wait("Question 1 of")
        lead_mm = Fraction(find(r"lead (\d+\.\d+) mm", text, "lead")[1])
        found = set_up_lathe(m, facts, lead_mm, starts)
        checklist = walk_checklist(m)
        prep = prepare_counter(m, od_typed)
        text = m.shot("counter: pass 1", m.pane.capture())
        # what the screen said to set: compound angle from the cross-slide, tip from the config
        angle = float(find(r"compound (\d+(?:\.\d+)?)° from the cross-slide", prep,
                           "compound angle")[1])
        assert f"Compound set to {angle:g} deg on its scale" in checklist, checklist
        od_mm = float(od_typed) * (INCH if units == "in" else 1.0)
        pitch_mm = float(lead_mm) / starts
        tip_kind, tip_mm = sim_tip(j, facts, prep)
        sim = ThreadSim(od_mm, pitch_mm, float(lead_mm), j.angle, tip_kind, tip_mm,
                        facts["resolution_mm"], units,
                        "h28" if j.angle == 60.0 else "helical")
        read = read_caliper if j.measure == "caliper" else read_wires
        log: list = []
        total = int(PASS_OF.search(text)[2])
        first_read = max(1, total - 3)               # a reading before the plan is finished
        readings = []
        while True:
            text = m.pane.capture()
            if PASS_OF.search(text) and not readings and \
                    int(PASS_OF.search(text)[1]) > first_read:
                r = read(m, sim, facts, units, "part-way")
                readings.append(r)
                assert r["state"] == "oversize", r["text"]
                check_remaining(r, sim, facts, angle, band)
                back_to_counter(m)
                text = m.shot("counter: replanned", m.wait("Replanned from wire reading"))
                continue
            if ALL_CUT.search(text):
                r = read(m, sim, facts, units, f"after {len(log)} cuts")
                readings.append(r)
                if r["state"] != "oversize":
                    break
                check_remaining(r, sim, facts, angle, band)
                text = back_to_counter(m)
                assert len(readings) < 5, "the reading never came inside the class"
                if ALL_CUT.search(text):               # nothing replanned: a spring pass
                    m.keys("0")
                    sim.cut_to(sim.depth_mm)
                    log.append(("spring", None))
                    m.wait(re.compile(r"Spring pass recorded"))
                continue
            if len(log) > 40:
                raise AssertionError("too many passes:\n" + tmux.framed(text))
            m.shot(f"counter: cut {len(log) + 1}", text)
            cut_one(m, sim, facts, angle, text, log)
            m.wait(lambda t: PASS_OF.search(t) or SPRING.search(t) or ALL_CUT.search(t))
        final = readings[-1]
        assert final["state"] == "in_band", final["text"]
        card = export_card(m, data, j.export_from_screen)
        with Store.open_read_only(data) as store:
            jobs = store.jobs(include_archived=True)
            state = fold(store.events(jobs[0].id))
        return m, state, card, {"log": log, "readings": readings, "sim": sim, "found": found,
                                "designation": designation, "checklist": checklist,
                                "angle": angle, "facts": facts}
    finally:
        m.write_shots(tmp_path / "captures")
        m.close()


def check_remaining(r: dict, sim: ThreadSim, facts: dict, angle: float, band) -> None:
    """The remaining feed the screen shows agrees with what the simulator says the work needs."""
    pd_min, pd_max = (b * (INCH if sim.unit == "in" else 1.0) for b in band)    # [mm]
    per_div = radial_from_dial(1, facts["compound_div_mm"], angle)       # radial per division
    # the simulator's own depths to the top and bottom of the band, in compound divisions
    # computed from ThreadSim.depth_for (ISO 68-1 profile) and travel = depth / cos(angle)
    top = (sim.depth_for(pd_max) - sim.depth_mm) / per_div
    bottom = (sim.depth_for(pd_min) - sim.depth_mm) / per_div
    assert "band_divs" in r, r["text"]
    lo, hi = r["band_divs"]
    # a caliper read to its step (0.0005 in) knows the PD to about ±0.025 mm: a division more
    slack = 2 if r.get("caliper") else 1
    assert math.ceil(top) - slack <= lo <= math.ceil(top) + slack, (lo, top, r["text"])
    assert math.floor(bottom) - slack <= hi <= math.floor(bottom) + slack, (hi, bottom,
                                                                            r["text"])
    # the PD the screen derived from the reading is the simulator's (exact vs H28 or the
    # brute-force helical model, micrometer rounding): within 0.003 mm; from the caliper,
    # within half its step over tan a (computed: the thickness changes by tan a per unit PD)
    shown = r["pd"] * (INCH if sim.unit == "in" else 1.0)
    tol = (CALIPER_STEP_MM / 2 / math.tan(sim.half_angle) + 0.003 if r.get("caliper")
           else 0.003)
    assert abs(shown - sim.pitch_diameter()) < tol, (shown, sim.pitch_diameter())


def export_card(m: Machine, data: Path, from_screen: bool) -> str:
    """Export the job card: from the jobs screen by keypad, or by ``shopterm export last``."""
    if from_screen:
        m.keys("*")
        text = m.wait("Go to")
        digit = tmux.choice_number(text, "Jobs and export", "Go to")
        assert digit, text
        m.keys(digit)
        text = m.wait("start a new job")
        m.shot("jobs: list", text)
        row = find(r"(?m)^\s*(\d) +1  ", text, "job 1 in the list")
        m.keys(row[1])
        pick(m, "Job 1: what to do", "export job card", "jobs: what to do")
        text = m.shot("jobs: card written", m.wait("written as job card"))
        assert "Written:" in text, text
        # the app writes beside the record (a long path is cut on the pane, so not read back)
        return (data / "exports" / "job-1.txt").read_text(encoding="utf-8")
    cmd = tmux.shopterm_command()
    env = tmux.app_env(m.workdir / "pane")
    done = subprocess.run([str(cmd), "export", "last", "--format", "card", "--data-dir",
                           str(data)], capture_output=True, text=True, timeout=60, env=env)
    assert done.returncode == 0, done.stderr
    return done.stdout


def card_numbers(card: str, unit: str) -> dict:
    """Return the numbers on a job card: final PD, the band, the passes listed [card's unit]."""
    final = find(rf"Final pitch diameter\s+{NUM} {unit}", card, "final PD")
    band = find(rf"re-checked against .+?: band {NUM} {unit} to {NUM} {unit}", card, "band")
    passes = [(int(a), float(b)) for a, b in
              re.findall(rf"(?m)^\s+(\d+)\s+\d\d:\d\d(?::\d\d)?\s+{NUM} {unit}", card)]
    return {"pd": float(final[1]), "band": (float(band[1]), float(band[2])), "passes": passes,
            "count": int(find(r"Passes \((\d+) in force\)", card, "pass count")[1])}


def check_card(card: str, state, unit: str, band: tuple[float, float], sim: ThreadSim) -> None:
    print(card)
    nums = card_numbers(card, unit)
    lo, hi = band
    assert lo <= nums["pd"] <= hi, (nums["pd"], band)
    assert nums["band"] == pytest.approx(band, abs=0.6 * (1e-4 if unit == "in" else 1e-3))
    # every pass cut is listed, numbered 1..n, radial totals growing, as in the record
    assert nums["count"] == len(state.passes)
    assert [n for n, _ in nums["passes"]] == list(range(1, len(state.passes) + 1)), card
    to_unit = INCH if unit == "in" else 1.0
    for (_, shown), p in zip(nums["passes"], state.passes):
        assert shown == pytest.approx(p.radial_cum_mm / to_unit, abs=0.6 * (
            1e-4 if unit == "in" else 1e-3))
    radial = [r for _, r in nums["passes"]]
    assert radial == sorted(radial)
    # the final reading in the record is the simulator's reading, and its PD is the truth
    last = state.last_reading
    assert last.state == "in_band"
    assert lo * to_unit - 1e-9 <= sim.pitch_diameter() <= hi * to_unit + 1e-9
    p, a = sim.pitch_mm, sim.half_angle
    if last.payload.get("method") == "caliper":
        # the caliper's thickness, read to its step, knows the PD to half a step over tan a
        assert abs(last.pd_mm - sim.pitch_diameter()) < CALIPER_STEP_MM / 2 / math.tan(a) + 0.003
        assert "caliper thickness" in card and last.wire_mm is None
        return
    assert abs(last.pd_mm - sim.pitch_diameter()) < 0.003
    # the plain three-wire relation inverts the typed reading: the record's simple PD is
    # M - W(1 + cosec a) + (P/2) cot a (NBS Handbook H28, three-wire method; for 60° the
    # constants 3 / 0.866025)
    assert last.payload["pd_simple_mm"] == pytest.approx(
        last.measured_mm - (1 + 1 / math.sin(a)) * last.wire_mm + p / 2 / math.tan(a),
        abs=2e-6)


# ---------------------------------------------------------------------------------------------
# The jobs

M10_6G = job("M10x1.5-6g").band
UNC_2A = job("3/8-16 UNC-2A").band


def test_m10_metric_job_by_keypad(tmp_path):
    m, state, card, run = run_whole_job(tmp_path, job("M10x1.5-6g"))
    # 60 > idler > 127 on the 8 tpi leadscrew: 25.4/8 × 60/127 = 1.5 mm exactly
    # computed with Fraction, Rose, Modern Machine Shop Practice (8 tpi × 120/127 = 3.000 mm)
    assert gear_lead_mm("60 > idler > 127", 8) == Fraction(3, 2)
    assert run["found"]["gears"]
    # metric lead on an inch leadscrew: keep the half nut closed (Jones, Turning and Boring (1914))
    assert "keep the half nut closed" in run["found"]["half_nut"].lower()
    # modified flank at 29.5° from the cross-slide (US Navy machinery training manual)
    assert run["angle"] == 29.5
    check_card(card, state, "mm", M10_6G, run["sim"])
    assert "6g" in card and "M10x1.5-6g" in card
    assert len(run["readings"]) >= 2                     # part-way, then inside 6g


def test_unc_inch_job_by_keypad(tmp_path):
    m, state, card, run = run_whole_job(tmp_path, job("3/8-16 UNC-2A"))
    # 16 tpi from an 8 tpi leadscrew: ratio 1/2 exactly, lead 25.4/16 mm
    # computed with Fraction from the train on the screen (Rose, Modern Machine Shop Practice)
    assert gear_lead_mm(run["found"]["gears"], 8) == Fraction(254, 160)
    check_card(card, state, "in", UNC_2A, run["sim"])
    assert "3/8-16 UNC-2A" in card


def test_two_start_job_shows_the_indexing_step(tmp_path):
    m, state, card, run = run_whole_job(tmp_path, job("M10x1.5 two starts"))
    facts = run["facts"]
    found = run["found"]
    assert found["indexing"], found
    # whatever method the screen offers first, its step is the count divided by the starts:
    # the demo lathe's 60-tooth spindle gear → 30 teeth, its 4-slot driving plate → 2 slots,
    # a 4-jaw chuck → 2 jaws (computed: count / starts; the counts from the sample config, a
    # chuck's jaws # common practice, no source)
    text = found["indexing"]
    if m_ := re.search(r"(\d+)-jaw chuck, (\d+) jaws? per start", text):
        assert int(m_[2]) * 2 == int(m_[1]), text
    elif m_ := re.search(r"(\d+) teeth per start", text):
        assert int(m_[1]) == facts["spindle_gear"] // 2, text
    elif m_ := re.search(r"(\d+) slots? per start", text):
        assert int(m_[1]) == facts["plate_slots"] // 2, text
    else:
        assert "dial lines" in text, text
    # every method the set-up lists is one the config gives the means for
    assert re.search(rf"\b{facts['spindle_gear'] // 2} teeth|\b{facts['plate_slots'] // 2} "
                     r"slots|jaws", found["indexing_options"]), found["indexing_options"]
    assert "index to the next of 2 starts" in found["indexing_options"]
    assert "starts" in run["checklist"].lower() or "index" in run["checklist"].lower(), \
        run["checklist"]
    # lead 3 mm = 2 × 1.5 (two starts); the counter says to cut every start at each setting
    assert state.thread.values["starts"] == 2
    assert any("cut all 2 starts at this setting" in t for _, t in m.shots), "no start step"
    check_card(card, state, "mm", M10_6G, run["sim"])


# ---------------------------------------------------------------------------------------------
# The simulator itself (no tmux): it must agree with the published numbers it stands on

def test_simulator_against_published_relations():
    pitch = 1.5
    sim = ThreadSim(10.0, pitch, 0.0, 60.0, "radius", 0.0, 0.001, "mm")
    # a sharp V cut to the basic depth 5/8 H below a crest at the basic major leaves the basic
    # PD: ISO 68-1, H = 0.866025P, d2 = d - 0.649519P; here the
    # sharp V from the OD reaches PD = OD - 2·depth + H, so depth = (d - d2 + H) / 2
    h = 0.8660254 * pitch
    sim.cut_to((10.0 - (10.0 - 0.649519 * pitch) + h) / 2)
    assert sim.pitch_diameter() == pytest.approx(10.0 - 0.649519 * pitch, abs=1e-6)
    # no lead: the plain relation, 60° constants M = E + 3W - 0.866025P (NBS Handbook H28, three-wire method)
    w = 0.866
    assert sim.over_wires(w) == pytest.approx(sim.pitch_diameter() + 3 * w - 0.866025 * pitch,
                                              abs=1e-6)
    # H28 lead term: 1/4-20, E 0.2175, W 0.0289 in, lead 0.05 in: 0.000116 in
    # (NBS Handbook H28, three-wire method, [C])
    inch = ThreadSim(0.25, 0.05, 0.05, 60.0, "radius", 0.0, 0.0001, "in")
    plain = 0.2175 + 3 * 0.0289 - 0.866025 * 0.05
    assert inch.over_wires(0.0289, pd_mm=0.2175) - plain == pytest.approx(0.000116, abs=2e-6)
    # a nose radius r sets the V's apex r(1/sin 30° - 1) = r beyond the tip; a flat f by
    # (f/2)/tan 30° (computed from the tool's geometry, 60° form)
    r = ThreadSim(10.0, pitch, pitch, 60.0, "radius", 0.1, 0.001, "mm")
    f = ThreadSim(10.0, pitch, pitch, 60.0, "flat", 0.1, 0.001, "mm")
    assert r.apex_beyond_tip() == pytest.approx(0.1, abs=1e-12)
    assert f.apex_beyond_tip() == pytest.approx(0.05 * math.sqrt(3), abs=1e-12)
    # the inverse: the depth for a PD cuts to that PD
    r.cut_to(r.depth_for(8.928))
    assert r.pitch_diameter() == pytest.approx(8.928, abs=1e-12)
    # the micrometer rounds to its step, in its unit: 0.0001 in = 0.00254 mm
    mic = ThreadSim(9.5, 25.4 / 16, 25.4 / 16, 60.0, "radius", 0.1, 0.00254, "in")
    value = mic.reading(0.9)
    assert value == round(value, 4)
    assert abs(value * INCH - mic.over_wires(0.9)) <= 0.5 * 0.00254 + 1e-9
    assert mic.typed(0.9) == f"{value:.4f}"
    assert r.typed(0.866) == f"{r.reading(0.866):.3f}"
    # the compound at 29.5°: travel = radial / cos 29.5° = radial × 1.14896 (US Navy machinery training manual)
    assert radial_from_dial(10, 0.0254, 29.5) * 1.14896 == pytest.approx(0.254, abs=1e-5)


def test_gear_lead_helper_against_the_published_train():
    # 8 tpi leadscrew × 120/127 = 3.000 mm (Rose, Modern Machine Shop Practice), written as a simple train
    assert gear_lead_mm("120 > idler > 127", 8) == Fraction(3)
    # compound: 4 tpi leadscrew, 36/48 × 66/18 → 11 tpi (Rose);
    # our reading "a/b x c/d" has drivers a, c: 36/18 x 66/48 is that train on an 8 tpi screw
    # giving 25.4/8 × (36·66)/(18·48) = 25.4/8 × 2.75 mm
    assert gear_lead_mm("36/18 x 66/48", 8) == Fraction(254, 80) * Fraction(36 * 66, 18 * 48)
    with pytest.raises(AssertionError):
        gear_lead_mm("box A1 alone", 8)


# ---------------------------------------------------------------------------------------------
# Power threads: a two-start trapezoidal screw over wires, an Acme screw with a caliper

TR24_10 = job("Tr24x10(P5) two starts").band
ACME_2G = job("1-5 ACME-2G").band


def test_two_start_trapezoidal_job_by_keypad(tmp_path):
    m, state, card, run = run_whole_job(tmp_path, job("Tr24x10(P5) two starts"))
    # 10 mm lead on the 8 tpi leadscrew: no exact train from the demo gears; the best is within
    # 0.1 % (checked in set_up_lathe with Fraction, Rose, Modern Machine Shop Practice)
    assert "off the lead" in m.shots[[t for t, _ in m.shots].index("set-up: change gears")][1]
    # metric lead on an inch leadscrew: keep the half nut closed (Jones, Turning and Boring (1914))
    assert "keep the half nut closed" in run["found"]["half_nut"].lower()
    assert run["found"]["indexing"], run["found"]
    # the flat the operator ground is the ISO 2904 root width at d3 for P 5 (ac 0.25 mm):
    # 0.366P − 0.54·ac = 1.830 − 0.135 = 1.696 mm (computed from the ISO 2904 formula, from
    # memory)
    assert run["sim"].tip_kind == "flat"
    assert run["sim"].tip_mm == pytest.approx(0.366 * 5 - 0.54 * 0.25, abs=0.002)
    # the compound set a little under the half-angle of the 30° form (14.5°, from memory)
    assert run["angle"] == 14.5
    # the plan is sized by the groove's area with that flat: some 20 passes, not 145
    assert 12 <= len(state.passes) <= 30, len(state.passes)
    assert any("cut all 2 starts at this setting" in t for _, t in m.shots), "no start step"
    check_card(card, state, "mm", TR24_10, run["sim"])
    assert "Tr24x10(P5)-7e" in card


def test_acme_job_with_the_caliper_by_keypad(tmp_path):
    m, state, card, run = run_whole_job(tmp_path, job("1-5 ACME-2G"))
    # 5 tpi from an 8 tpi leadscrew: ratio 8/5 exactly (Rose, Modern Machine Shop Practice)
    assert gear_lead_mm(run["found"]["gears"], 8) == Fraction(254, 50)
    # no owned wire fits 5 tpi Acme: every reading is a caliper reading, recorded as such
    assert state.readings and all(r.payload.get("method") == "caliper" for r in state.readings)
    assert run["sim"].tip_kind == "flat"
    check_card(card, state, "in", ACME_2G, run["sim"])
    assert "1-5 ACME-2G" in card


def test_helical_simulator_against_published_relations():
    from tests.e2e.thread_sim import over_wires_helical

    def plain(e, w, p, angle):
        # NBS Handbook H28, three-wire method: M = E + W(1 + cosec a) − (P/2) cot a
        a = math.radians(angle / 2)
        return e + w * (1 + 1 / math.sin(a)) - p / 2 / math.tan(a)

    # no lead: the brute force finds the plain relation, for 60°, 30° and 29° forms
    for e, w, p, angle in ((9.026, 0.866, 1.5, 60.0), (21.5, 2.5, 5.0, 30.0),
                           (22.86, 2.62, 5.08, 29.0)):
        assert over_wires_helical(e, w, p, 1e-9, angle) == pytest.approx(plain(e, w, p, angle),
                                                                         abs=1e-6)
    # a small lead angle: H28's lead term is the first term of the series; 1/4-20, E 0.2175,
    # W 0.0289 in, lead 0.05 in: 0.000116 in (NBS Handbook H28, three-wire method, [C]); the
    # brute force agrees to within a tenth of it
    inch = over_wires_helical(0.2175, 0.0289, 0.05, 0.05, 60.0) - plain(0.2175, 0.0289, 0.05, 60)
    assert inch == pytest.approx(0.000116, rel=0.1)
    # the hand does not matter (the groove mirrored)
    assert over_wires_helical(21.226, 2.5, 5.0, -10.0, 30.0) == pytest.approx(
        over_wires_helical(21.226, 2.5, 5.0, 10.0, 30.0), abs=1e-9)
    # a two-start Tr24x10(P5) (8.4°): the wire sits higher than with no lead, and H28's term
    # (computed from the NBS H28 formula) is off by more than a micrometre there: why the
    # whole job uses the brute force
    sim = ThreadSim(24.0, 5.0, 10.0, 30.0, "flat", 1.696, 0.001, "mm", "helical")
    h28 = ThreadSim(24.0, 5.0, 10.0, 30.0, "flat", 1.696, 0.001, "mm")
    exact = sim.over_wires(2.5, pd_mm=21.226)
    assert exact > plain(21.226, 2.5, 5.0, 30.0)
    assert abs(h28.over_wires(2.5, pd_mm=21.226) - exact) > 0.001
    # the caliper at the pitch line reads half the pitch along the axis, times cos of the
    # helix there square to the thread (Machinery's Handbook, Acme thread thickness, from
    # memory): a 1-5 Acme cut to its basic PD 0.9 in, depth slide 0.05 in below a 1 in crest
    acme = ThreadSim(25.4, 5.08, 5.08, 29.0, "flat", 1.75, 0.00254, "in")
    acme.cut_to(acme.depth_for(0.9 * INCH))
    lam = math.atan(5.08 / (math.pi * 0.9 * INCH))
    assert acme.caliper_thickness(0.05 * INCH) == pytest.approx(2.54 * math.cos(lam), abs=1e-9)
    # 0.1 in × cos 4.13° = 0.09974 in, read to a 0.0005 in step: 0.1000 (computed)
    assert acme.caliper_typed(0.05 * INCH, 0.0005 * INCH) == "0.1000"
