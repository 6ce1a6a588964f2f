"""Thread dial: checked against a brute-force simulation of spindle, leadscrew, carriage, dial.

The simulation is its own model, written from the machine, not from the rule in the module:
the first pass is engaged with everything at zero; the tool then follows x = lead × spindle
turns. Later the carriage is parked at some place x_r with the half nut open while the spindle
(and, through the gears, the leadscrew) keeps turning. The dial's worm wheel rolls on the
leadscrew, so its angle is (leadscrew turns − x_r / leadscrew pitch) / teeth. Whenever the dial
shows a line the half nut is closed; the tool is then in the first groove if x_r − lead × spindle
turns is a whole number of leads (for n starts: in start s if it is s pitches past a groove).
A line is usable when every such closing, over many dial turns and parking places, agrees.
"""

from __future__ import annotations

from fractions import Fraction

import pytest

from shopterm.errors import InvalidEntry
from shopterm.lathe.machine import Leadscrew, ThreadDial
from shopterm.lathe.thread_dial import dial_plan, half_nut_plan_text

INCH = Fraction(254, 10)  # ISO 31-1: 1 in = 25.4 mm exactly


def simulate(p_ls: Fraction, lead: Fraction, teeth: int, lines: int, starts: int = 1,
             dial_turns: int = 40, parking=range(0, 5)):
    """Return {line: set of start offsets seen} and the set seen at every tooth position.

    Lengths are counted in whole units of 1/D mm (D makes leadscrew pitch and lead whole), so
    the simulation runs on integers.
    """
    d = p_ls.denominator * lead.denominator
    pitch_u, lead_u = int(p_ls * d), int(lead * d)          # leadscrew pitch, lead [1/D mm]
    per_line: dict[int, set] = {k: set() for k in range(1, lines + 1)}
    any_tooth: set = set()
    for j in parking:
        x_r = j * pitch_u                  # carriage parked where a thread lines up [1/D mm]
        for leadscrew_turns in range(teeth * dial_turns):
            # spindle turns = leadscrew turns x pitch / lead (the gear ratio), so the first
            # groove is at lead x spindle turns = leadscrew turns x pitch [1/D mm]
            groove_x = leadscrew_turns * pitch_u
            # dial: worm wheel rolled by the leadscrew, less the carriage's own travel [teeth]
            dial_teeth = (leadscrew_turns - x_r // pitch_u) % teeth
            # tool's distance past the first groove, in pitches (pitch = lead / starts)
            num = (x_r - groove_x) * starts
            seen = (num // lead_u) % starts if num % lead_u == 0 else ("between", num % lead_u)
            any_tooth.add(seen)
            for line in per_line:
                if dial_teeth * lines == (line - 1) * teeth:
                    per_line[line].add(seen)
    return per_line, any_tooth


CASES = [
    # (leadscrew, lead [mm], dial teeth, dial lines)
    *[(Leadscrew.from_tpi(8), INCH / n, 32, 8) for n in
      (8, 9, 10, 11, 12, 13, 16, 20, 24, 27, Fraction(23, 2), Fraction(9, 2), 4)],
    *[(Leadscrew.from_tpi(8), Fraction(p), 32, 8) for p in
      (Fraction(1), Fraction(3, 2), Fraction(2), Fraction(127, 100))],
    *[(Leadscrew.from_tpi(8), INCH / n, 16, 4) for n in (10, 11, 14, 19)],
    *[(Leadscrew.from_tpi(4), INCH / n, 16, 8) for n in (6, 7, Fraction(27, 2))],
    *[(Leadscrew.from_mm(3), Fraction(p), 15, 5) for p in
      (Fraction(1), Fraction(3, 2), Fraction(3, 4), Fraction(6), INCH / 20, Fraction(5, 2))],
    *[(Leadscrew.from_mm(6), Fraction(p), 12, 6) for p in (Fraction(1), Fraction(7, 4), 2)],
]


@pytest.mark.parametrize("ls, lead, teeth, lines", CASES)
def test_lines_match_simulation(ls, lead, teeth, lines):
    plan = dial_plan(ls, ThreadDial(teeth, lines, ()), lead)
    per_line, any_tooth = simulate(ls.pitch_exact, Fraction(lead), teeth, lines)
    usable = tuple(k for k, seen in per_line.items() if seen == {0})
    assert plan.lines == usable
    assert plan.keep_half_nut_closed == (not usable)
    assert plan.anywhere == (any_tooth == {0})


@pytest.mark.parametrize("starts", [2, 3, 4])
@pytest.mark.parametrize("ls, lead, teeth, lines", [
    (Leadscrew.from_tpi(8), INCH, 32, 8),           # 1 in lead on 8 tpi
    (Leadscrew.from_tpi(8), INCH / 2, 32, 8),
    (Leadscrew.from_tpi(8), INCH / 3, 32, 8),
    (Leadscrew.from_mm(3), Fraction(12), 16, 8),
    (Leadscrew.from_mm(3), Fraction(9), 15, 5),
    (Leadscrew.from_tpi(8), Fraction(6), 32, 8),    # metric multi-start on inch: none
])
def test_multi_start_lines_match_simulation(ls, lead, teeth, lines, starts):
    plan = dial_plan(ls, ThreadDial(teeth, lines, ()), lead, starts)
    per_line, _ = simulate(ls.pitch_exact, Fraction(lead), teeth, lines, starts)
    if plan.keep_half_nut_closed:
        assert all(len(seen) > 1 for seen in per_line.values())
        return
    sim = {s: tuple(k for k, seen in per_line.items() if seen == {s - 1})
           for s in range(1, starts + 1)}
    assert dict(plan.start_lines) == sim
    assert plan.lines == sim[1]
    assert plan.every_start_on_dial == all(sim.values())


def test_metric_on_inch_leadscrew_keeps_half_nut_closed():
    # Jones, Turning and Boring (1914): metric lead on an inch leadscrew -> keep the half nut closed
    plan = dial_plan(Leadscrew.from_tpi(8), ThreadDial(32, 8, (1, 3, 5, 7)), 1.5)
    assert plan.keep_half_nut_closed and plan.lines == () and not plan.anywhere
    assert "reverse the spindle" in plan.describe()


def test_jones_rule_one_dial_turn_is_teeth_over_tpi():
    # (Jones): one dial revolution = T/L in; 32 teeth on 8 tpi = 4 in,
    # so 8 lines are 0.5 in = 12.7 mm apart (computed).
    plan = dial_plan(Leadscrew.from_tpi(8), ThreadDial(32, 8, (1, 3, 5, 7)), INCH / 10)
    assert plan.line_travel_mm == pytest.approx(12.7, abs=1e-12)


@pytest.mark.parametrize("tpi, text", [
    (16, "anywhere"),                 # computed: lead divides the leadscrew pitch
    (10, "any line"),                 # computed: 0.5 in per line = 5 leads
    (11, "any numbered line"),        # computed: 1 in per numbered line = 11 leads
    (Fraction(23, 2), "lines 1 or 5"),  # computed: 2 in = 23 leads
])
def test_plan_wording(tpi, text):
    plan = dial_plan(Leadscrew.from_tpi(8), ThreadDial(32, 8, (1, 3, 5, 7)), INCH / tpi)
    assert text in half_nut_plan_text(plan)
    assert len(plan.describe()) <= 76


def test_exact_lead_from_float():
    # a float lead of 25.4/11 is read as 127/55 exactly
    plan = dial_plan(Leadscrew.from_tpi(8), ThreadDial(32, 8, (1, 3, 5, 7)), 25.4 / 11)
    assert plan.lines == (1, 3, 5, 7) and plan.numbered == (1, 3, 5, 7)


@pytest.mark.parametrize("dial, lead, starts", [
    (ThreadDial(30, 4, ()), 1.5, 1),          # lines not a whole number of teeth apart
    (ThreadDial(0, 4, ()), 1.5, 1),
    (ThreadDial(32, 0, ()), 1.5, 1),
    (ThreadDial(32, 8, (9,)), 1.5, 1),        # no line 9
    (ThreadDial(32, 8, ()), 0, 1),
    (ThreadDial(32, 8, ()), 1.5, 0),
])
def test_errors(dial, lead, starts):
    with pytest.raises(InvalidEntry):
        dial_plan(Leadscrew.from_tpi(8), dial, lead, starts)
