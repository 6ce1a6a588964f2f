"""Picking the thread up again after the tool was reground or re-set, or the work remounted.

The tool is set back into the existing groove by hand, the dial readings taken there become the
new zero, and the pass count goes on where it stopped: new zero = reading now − count done
(modulo one turn of the dial).

References: arithmetic of a graduated dial; the setting-in steps are common practice, no source.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from shopterm.cutting.infeed import InfeedMethod
from shopterm.cutting.plan import Plan, dial_reading
from shopterm.errors import InvalidEntry
from shopterm.lathe.machine import Dial


def pickup_steps(method: InfeedMethod, internal: bool = False) -> tuple[str, ...]:
    """Return the steps that set the tool back into the existing groove, in order.

    method: the infeed method in use; internal: a bore thread.
    References: common practice, no source.
    """
    slide = "compound" if method.feeds_with == "compound" else "cross-slide"
    along = ("the compound (it moves the tool along the work)" if method.method == "alternating"
             else "the compound together with the cross-slide (the compound moves the tool "
                  "along the work as well as in)" if slide == "compound"
             else "the compound (it moves the tool along the work)")
    steps = [
        "Stop the spindle and switch the lathe off at the isolator before you reach in.",
        "Set the tool on centre height and square to the work with the thread gauge.",
        "Close the half nut (on the thread-dial mark you use) and turn the spindle by hand in the "
        "cutting direction to take up the backlash; leave the half nut closed.",
        "Stop with the tool over the existing groove, just clear of the work.",
        ("Bring the cross-slide to its return mark." if slide == "compound"
         else "Bring the cross-slide in until the tool is just clear of the groove."),
        f"Move the tool into the groove with {along} until both flanks touch lightly; finish "
        "every movement in the feeding direction so the backlash stays out.",
        "Read the dials where they stand now and enter the readings: they become the new zero, "
        "so the count goes on where it stopped.",
        "Withdraw, switch on, and take a spring pass at this setting before feeding deeper.",
    ]
    if internal:
        steps.insert(5, "Inside a bore the flanks are hard to see: use a light behind the work or "
                        "a mirror, and keep the bar clear of the crests.")
    return tuple(steps)


@dataclass(frozen=True)
class DialZero:
    """The mark on one dial that now stands for count 0 [divisions]."""

    offset: float
    divisions: int

    def reading_for(self, count: float) -> float:
        """Return the mark to set for a count from the zero [divisions]."""
        return round((self.offset + count) % self.divisions, 9)

    def count_for(self, reading: float, turns: int = 0) -> float:
        """Return the count from the zero for a mark read [divisions] plus whole ``turns`` more
        (inverse of ``reading_for`` within one turn)."""
        return round((reading - self.offset) % self.divisions + turns * self.divisions, 9)


def new_zero(reading_now: float, done_divisions: float, dial: Dial) -> DialZero:
    """Return the dial's new zero: the mark read now less the count already done.

    reading_now: the mark the dial shows with the tool back in the groove [divisions];
    done_divisions: the count from the old zero that the cut had reached [divisions];
    dial: which dial (for the divisions in one turn).
    References: arithmetic of a graduated dial (modulo one turn).
    """
    if not math.isfinite(reading_now) or not (0 <= reading_now < dial.divisions):
        raise InvalidEntry(f"Enter the mark the dial shows, from 0 to under {dial.divisions}.")
    if not math.isfinite(done_divisions) or done_divisions < 0:
        raise InvalidEntry("The count already done cannot be negative.")
    return DialZero(round((reading_now - done_divisions) % dial.divisions, 9), dial.divisions)


@dataclass(frozen=True)
class Pickup:
    """The state after picking up: new zeros and the steps shown to the user."""

    feed_zero: DialZero
    cross_zero: DialZero
    side_zero: DialZero | None
    done: int                   # passes already cut (the count goes on from here)
    steps: tuple[str, ...]


def pick_up(plan: Plan, done: int, feed_reading: float, cross_reading: float,
            side_reading: float | None = None) -> Pickup:
    """Return the new zeros so the pass count goes on after ``done`` passes.

    plan: the plan being cut; done: passes already cut; feed_reading, cross_reading,
    side_reading: the marks the feeding dial, the cross-slide dial and (alternating) the
    compound dial show with the tool set back in the groove [divisions].
    Compound feeding: the cross-slide's reading becomes its return mark (count 0).
    References: arithmetic of a graduated dial.
    """
    if not isinstance(done, int) or not (0 <= done <= len(plan.passes)):
        raise InvalidEntry(f"Passes done must be a whole number from 0 to {len(plan.passes)}.")
    last = plan.passes[done - 1] if done else None
    done_div = last.dial_divisions if last else _start_divisions(plan)
    feed_zero = new_zero(feed_reading, done_div, plan.feed_dial)
    if plan.method.feeds_with == "compound":
        cross_zero = new_zero(cross_reading, 0.0, plan.cross_dial)
    else:
        cross_zero = new_zero(cross_reading, done_div, plan.cross_dial)
    side_zero = None
    if plan.method.method == "alternating":
        if side_reading is None:
            raise InvalidEntry("Alternating flank: also enter the compound dial's reading.")
        side_zero = DialZero(round((side_reading - ((last.side_divisions or 0.0) if last else 0.0))
                                   % plan.side_dial.divisions, 9), plan.side_dial.divisions)
        # Centred in the groove the tool is where the last pass's side setting put the groove.
    return Pickup(feed_zero, cross_zero, side_zero, done,
                  pickup_steps(plan.method, plan.internal))


def _start_divisions(plan: Plan) -> float:
    travel = plan.method.feed_travel(plan.start_radial)
    return round(travel / plan.feed_dial.travel_per_division, 9)


def continued_reading(plan: Plan, pickup: Pickup, pass_index: int) -> tuple[int, float]:
    """Return (whole turns, mark) to set for pass ``pass_index`` (1-based) after a pick-up.

    Turns are counted from the new zero mark. References: arithmetic of a graduated dial.
    """
    if not (1 <= pass_index <= len(plan.passes)):
        raise InvalidEntry(f"Pass number must be from 1 to {len(plan.passes)}.")
    return dial_reading(plan.passes[pass_index - 1].dial_divisions, plan.feed_dial,
                        pickup.feed_zero.offset)
