"""The thread dial: on which lines the half nut may be closed again for this lead.

The dial's worm wheel (T teeth) meshes the leadscrew, so one dial revolution is T leadscrew
pitches of carriage travel against the leadscrew thread; its K lines are T/K teeth apart,
numbered 1..K from the reference line. With the spindle and leadscrew geared together the
half nut drops in whenever a whole leadscrew pitch lines up. Closing it on dial position δ
(teeth from the reference line, counted from where the first pass was engaged), after m whole
dial revolutions that the dial cannot show, puts the tool (δ + mT)·p/L work leads from the
first groove (p leadscrew pitch, L work lead). So a line is safe for every m exactly when
T·p/L and δ·p/L are whole numbers. If T·p/L is not whole no line is safe (e.g. a metric lead
on an inch leadscrew: the factor 127): keep the half nut closed and reverse the spindle.
If p/L is whole, every tooth position is safe: the half nut may be closed anywhere.

For n starts the tool lands in start s = (−δ·p·n/L) mod n (start s lies s pitches further
along the way the carriage travels while cutting), when that is a whole number.

References: Jones, *Turning and Boring* (1914): re-engage where the carriage
has moved a whole number of the work's leads; one dial revolution = T/L in for an L tpi
leadscrew; the factor 127 makes a metric lead on an inch leadscrew unusable on the dial.
"""

from __future__ import annotations

from dataclasses import dataclass
from fractions import Fraction

from shopterm.errors import InvalidEntry
from shopterm.lathe.gears import as_exact_lead
from shopterm.lathe.machine import Leadscrew, ThreadDial


@dataclass(frozen=True)
class DialPlan:
    """Where the half nut may be closed for one lead, and which start each line gives.

    ``lines`` are the usable line numbers (1..K) for the first start; ``numbered`` is the part of
    them that carry a number. ``start_lines`` gives, for a multi-start thread, the lines of each
    start: ``((1, (1, 5)), (2, (3, 7)))`` means start 1 on lines 1 and 5, start 2 on 3 and 7.
    ``line_travel_mm`` is the carriage travel from one line to the next [mm].
    """

    lines: tuple[int, ...]
    anywhere: bool
    keep_half_nut_closed: bool
    numbered: tuple[int, ...] = ()
    start_lines: tuple[tuple[int, tuple[int, ...]], ...] = ()
    starts: int = 1
    dial_lines: int = 0
    line_travel_mm: float = 0.0
    lead_mm: float = 0.0
    dial_numbered: tuple[int, ...] = ()

    @property
    def every_start_on_dial(self) -> bool:
        """Return True when each start has at least one line of its own."""
        return (self.starts > 1 and not self.keep_half_nut_closed
                and len(self.start_lines) == self.starts
                and all(lines for _, lines in self.start_lines))

    def describe(self) -> str:
        """Return the half-nut plan in one short line (≤ 76 columns)."""
        if self.keep_half_nut_closed:
            return "Keep the half nut closed; reverse the spindle to run back."
        if self.anywhere:
            return "Close the half nut anywhere; the dial is not needed."
        if len(self.lines) == self.dial_lines:
            return "Close the half nut on any line."
        if self.dial_numbered and set(self.lines) == set(self.dial_numbered):
            return "Close the half nut on any numbered line."
        return "Close the half nut on line" + ("s " if len(self.lines) > 1 else " ") \
            + _join(self.lines) + "."


def _join(items) -> str:
    items = [str(i) for i in items]
    return items[0] if len(items) == 1 else ", ".join(items[:-1]) + " or " + items[-1]


def dial_plan(leadscrew: Leadscrew, dial: ThreadDial, lead: float | Fraction,
              starts: int = 1) -> DialPlan:
    """Return the lines where the half nut may be closed for ``lead``, or that none may be.

    leadscrew (pitch exact); dial (worm-wheel teeth, lines, numbered lines); lead [mm] (the
    lead, starts × pitch); starts (number of starts).
    References: Jones, *Turning and Boring* (1914); the factor 127.
    """
    wanted = as_exact_lead(lead)
    teeth, k = dial.teeth, dial.lines
    if int(teeth) != teeth or teeth < 1:
        raise InvalidEntry("The thread dial's gear needs a whole number of teeth, at least 1.")
    if int(k) != k or k < 1:
        raise InvalidEntry("The thread dial needs at least one line.")
    if teeth % k:
        raise InvalidEntry(f"{k} lines on a {teeth}-tooth dial gear are not a whole number of "
                           f"teeth apart; check the teeth and the lines.")
    if int(starts) != starts or starts < 1:
        raise InvalidEntry("The number of starts must be a whole number, 1 or more.")
    bad = [n for n in dial.numbered if not 1 <= n <= k]
    if bad:
        raise InvalidEntry(f"Numbered line {bad[0]} is not one of the dial's lines 1..{k}.")
    step = teeth // k                                   # teeth from one line to the next
    per_tooth = leadscrew.pitch_exact / wanted          # work leads per tooth of the dial
    travel = float(leadscrew.pitch_exact * step)
    common = dict(starts=int(starts), dial_lines=k, line_travel_mm=travel,
                  lead_mm=float(wanted), dial_numbered=tuple(sorted(set(dial.numbered))))
    if (teeth * per_tooth).denominator != 1:
        return DialPlan(lines=(), anywhere=False, keep_half_nut_closed=True, **common)
    anywhere = per_tooth.denominator == 1
    lines = tuple(line for line in range(1, k + 1)
                  if ((line - 1) * step * per_tooth).denominator == 1)
    numbered = tuple(n for n in lines if n in dial.numbered)
    start_lines: tuple[tuple[int, tuple[int, ...]], ...] = ()
    if starts > 1:
        found: dict[int, list[int]] = {s: [] for s in range(1, starts + 1)}
        for line in range(1, k + 1):
            where = -(line - 1) * step * per_tooth * starts
            if where.denominator == 1:
                found[int(where) % starts + 1].append(line)
        start_lines = tuple((s, tuple(v)) for s, v in found.items())
    return DialPlan(lines=lines, anywhere=anywhere, keep_half_nut_closed=False,
                    numbered=numbered, start_lines=start_lines, **common)


def half_nut_plan_text(plan: DialPlan) -> str:
    """Return the half-nut plan as the set-up checklist shows it (one short line)."""
    return plan.describe()
