"""Multi-start indexing: the ways to move the tool from one start to the next, with numbers.

For n starts of lead L the pitch is L/n; each next start is one pitch further along the work,
or, which is the same groove, the work turned 1/n of a revolution against the leadscrew.

- compound set parallel to the bed, advanced one pitch (in compound dial divisions);
- the driving plate's slots, the carrier moved slots/n slots on (slots divisible by n);
- a chuck's jaws, the work moved jaws/n jaws round (4 starts from a 4-jaw, 3 from a 3-jaw);
- a gear turning 1:1 with the spindle (the spindle gear, or the stud gear when the stud turns
  1:1 with the spindle), unmeshed and turned on teeth/n teeth (teeth divisible by n);
- the thread dial, where the lead puts different lines into different starts.

References: Jones, Turning and Boring (1914) (thread dial), Rose, Modern Machine Shop Practice (change gears); the rest is common
practice (no single published source).
"""

from __future__ import annotations

from dataclasses import dataclass
from fractions import Fraction
from typing import Sequence

from shopterm.errors import InvalidEntry
from shopterm.lathe.gears import GearTrain, as_exact_lead
from shopterm.lathe.machine import Dial, Lathe, Leadscrew, ThreadDial
from shopterm.lathe.thread_dial import dial_plan


@dataclass(frozen=True)
class IndexMethod:
    """One way to index to the next start: whether it works here, the amount, and how.

    ``amount`` is how far to move for one start, in ``unit`` (``div`` compound divisions,
    ``slots``, ``jaws``, ``teeth``, or ``lines`` — None when it does not work). ``whole`` says
    whether that amount is a whole number (a compound move may not be).
    """

    key: str
    title: str
    works: bool
    amount: float | None
    unit: str
    whole: bool
    text: str
    detail: str = ""


@dataclass(frozen=True)
class IndexingPlan:
    """Every indexing method considered for n starts of one lead."""

    starts: int
    lead_mm: float
    pitch_mm: float
    methods: tuple[IndexMethod, ...]

    @property
    def working(self) -> tuple[IndexMethod, ...]:
        """Return the methods that work on this lathe for this thread."""
        return tuple(m for m in self.methods if m.works)


def _is_whole(x: float, tol: float = 1e-9) -> bool:
    return abs(x - round(x)) <= tol * max(1.0, abs(x))


def _fmt(x: float) -> str:
    return f"{x:.0f}" if _is_whole(x) else f"{x:.3f}"


def compound_method(pitch_mm: float, dial: Dial | None, scale_reading_deg: float | None) -> IndexMethod:
    """Return the compound method: one pitch in compound divisions, and whether it is whole.

    pitch_mm [mm]; dial (the compound's dial); scale_reading_deg [deg] what the compound's
    scale reads when the slide is parallel to the bed.
    References: common practice, no source.
    """
    where = (f"set the compound parallel to the bed (its scale reads "
             f"{scale_reading_deg:g} deg)" if scale_reading_deg is not None
             else "set the compound parallel to the bed")
    if dial is None:
        return IndexMethod("compound", "Compound advanced one pitch", False, None, "div", False,
                           "Compound: give the compound dial's division to get the numbers.",
                           where)
    div = dial.divisions_for(pitch_mm)
    whole = _is_whole(div)
    text = (f"Compound parallel to bed: {_fmt(div)} div per start"
            + ("" if whole else " (not whole)"))
    detail = (f"{where.capitalize()}; move it {pitch_mm:.4f} mm = {_fmt(div)} divisions "
              f"({dial.describe()}) for each start, always winding the same way to keep "
              f"backlash out.")
    if not whole:
        detail += " Not a whole number of divisions: set it with a dial indicator."
    return IndexMethod("compound", "Compound advanced one pitch", True, div, "div", whole,
                       text, detail)


def _divide_method(key: str, title: str, count: int | None, starts: int, unit: str,
                   what: str, how: str, missing: str) -> IndexMethod:
    if count is None:
        return IndexMethod(key, title, False, None, unit, False, missing)
    if count % starts:
        return IndexMethod(key, title, False, None, unit, False,
                           f"{title}: {count} {what} do not divide by {starts} starts.")
    step = count // starts
    word = unit[:-1] if step == 1 and unit.endswith("s") else unit
    return IndexMethod(key, title, True, float(step), unit, True,
                       f"{title}: {step} {word} on per start ({count} {what}).", how)


def indexing_methods(lead: float | Fraction, starts: int, *,
                     compound_dial: Dial | None = None,
                     compound_parallel_reading_deg: float | None = None,
                     faceplate_slots: int | None = None,
                     chucks: Sequence[int] = (3, 4),
                     spindle_gear: int | None = None,
                     stud_gear: int | None = None,
                     fixed_ratio: Fraction | int = 1,
                     leadscrew: Leadscrew | None = None,
                     thread_dial: ThreadDial | None = None) -> IndexingPlan:
    """Return every indexing method for ``starts`` starts of ``lead``, working or not, with numbers.

    lead [mm] (starts × pitch); compound_dial (the compound's dial);
    compound_parallel_reading_deg [deg] the compound scale's reading when parallel to the bed;
    faceplate_slots (driving plate slots); chucks (jaws of each chuck owned);
    spindle_gear [teeth] a gear on the spindle; stud_gear [teeth] the first driver of the train;
    fixed_ratio (stud turns per spindle turn; the stud gear works only at 1:1);
    leadscrew, thread_dial (for indexing on the dial's lines).
    References: Jones, Turning and Boring (1914) (dial lines); common practice, no source (the rest).
    """
    if isinstance(starts, bool) or int(starts) != starts or starts < 2:
        raise InvalidEntry("Indexing is for 2 or more starts; a single-start thread needs "
                           "none.")
    starts = int(starts)
    wanted = as_exact_lead(lead)
    pitch = float(wanted) / starts
    methods = [compound_method(pitch, compound_dial, compound_parallel_reading_deg)]
    methods.append(_divide_method(
        "plate", "Driving plate", faceplate_slots, starts, "slots", "slots",
        "Between centres: stop, move the carrier's tail to the slot that many on, tie it "
        "again. Do not move the work in the carrier.",
        "Driving plate: give the number of slots to check it."))
    for jaws in sorted(set(int(j) for j in chucks)):
        methods.append(_divide_method(
            f"chuck{jaws}", f"{jaws}-jaw chuck", jaws, starts, "jaws", "jaws",
            "Mark the work at a jaw, open the chuck, turn the work on to the next jaw and "
            "close it again; true it up before cutting.", ""))
    methods.append(_divide_method(
        "spindle_gear", "Spindle gear", spindle_gear, starts, "teeth", "teeth",
        "Spindle stopped, half nut closed: unmesh the spindle gear, mark a tooth, turn the "
        "spindle that many teeth on, mesh it again.",
        "Spindle gear: give its teeth to check it."))
    fixed = Fraction(fixed_ratio)
    if stud_gear is not None and fixed != 1:
        methods.append(IndexMethod(
            "stud_gear", "Stud gear", False, None, "teeth", False,
            f"Stud gear: the stud turns {fixed} of a turn per spindle turn, not 1:1."))
    else:
        methods.append(_divide_method(
            "stud_gear", "Stud gear (1:1 with spindle)", stud_gear, starts, "teeth", "teeth",
            "Spindle stopped, half nut closed: unmesh the stud gear from the next gear, mark a "
            "tooth, turn the spindle until the gear has moved that many teeth, mesh it again.",
            "Stud gear: give the first driver's teeth to check it."))
    methods.append(dial_method(wanted, starts, leadscrew, thread_dial))
    return IndexingPlan(starts=starts, lead_mm=float(wanted), pitch_mm=pitch,
                        methods=tuple(methods))


def dial_method(lead: Fraction, starts: int, leadscrew: Leadscrew | None,
                thread_dial: ThreadDial | None) -> IndexMethod:
    """Return the thread-dial method: which lines put the tool into which start.

    lead [mm]; starts (number of starts).
    References: Jones, Turning and Boring (1914).
    """
    title = "Thread dial lines"
    if leadscrew is None or thread_dial is None:
        return IndexMethod("dial", title, False, None, "lines", False,
                           "Thread dial: give the leadscrew and the dial to check it.")
    plan = dial_plan(leadscrew, thread_dial, lead, starts)
    if not plan.every_start_on_dial:
        why = ("the half nut must stay closed" if plan.keep_half_nut_closed
               else "some starts fall between the lines")
        return IndexMethod("dial", title, False, None, "lines", False,
                           f"Thread dial: not for {starts} starts here; {why}.")
    parts = [f"start {s}: {','.join(str(x) for x in lines)}" for s, lines in plan.start_lines]
    text = "Dial lines, " + "; ".join(parts)
    detail = text
    if len(text) > 76:
        text = "Thread dial: each start has its own lines (see detail)."
    first = plan.start_lines[1][1][0] - 1 if len(plan.start_lines) > 1 else 0
    return IndexMethod("dial", title, True, float(first), "lines", True, text, detail)


def indexing_for_lathe(lathe: Lathe, lead: float | Fraction, starts: int, *,
                       train: GearTrain | None = None,
                       chucks: Sequence[int] = (3, 4)) -> IndexingPlan:
    """Return ``indexing_methods`` with this lathe's compound, plate, gears and thread dial.

    lead [mm]; train (the change gears in use: its first driver is the stud gear).
    References: as ``indexing_methods``.
    """
    stud = train.drivers[0] if train is not None and train.drivers else None
    return indexing_methods(
        lead, starts, compound_dial=lathe.compound_dial,
        compound_parallel_reading_deg=lathe.compound_scale_reading(90.0),
        faceplate_slots=lathe.faceplate_slots, chucks=chucks,
        spindle_gear=lathe.spindle_gear, stud_gear=stud, fixed_ratio=lathe.fixed_ratio,
        leadscrew=lathe.leadscrew, thread_dial=lathe.thread_dial)

