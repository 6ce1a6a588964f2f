"""Which wire readings belong together: readings taken after the same cut with the same wire
(and, on a tapered thread, at the same plane: the payload's ``distance_mm``) are one set, and the wire screen acts on the set's mean (DEVELOPERS.md, three-wire measurement).

Pure: the record's state in (``state.passes``, ``spring_passes``, ``pickups``, ``readings`` read
by attribute), sets out. No dimension is computed here.
"""

from __future__ import annotations

from dataclasses import dataclass, replace


@dataclass(frozen=True)
class ReadingSet:
    """Readings taken after the same cut with the same wire."""

    after_seq: int          # seq of the pass / spring pass / pick-up before them (0: none)
    label: str              # "start", "pass 3", "spring", "pick-up"
    wire_mm: float | None   # [mm]
    readings: tuple         # shopterm.job.state.Reading, oldest first


def cuts(state) -> list[tuple[int, str]]:
    """Return (seq, label) of every cut in force (passes, spring passes, pick-ups), oldest first."""
    out = [(p.seq, f"pass {p.n}") for p in state.passes]
    out += [(s.seq, "spring") for s in state.spring_passes]
    out += [(k.seq, "pick-up") for k in state.pickups]
    return sorted(out)


def same_wire(a: float | None, b: float | None) -> bool:
    """Return whether two wire sizes [mm] are the same set (to a tenth of a micrometre)."""
    if a is None or b is None:
        return a is b
    return abs(a - b) < 1e-4


def _plane(reading) -> float | None:
    d = reading.payload.get("distance_mm") if isinstance(reading.payload, dict) else None
    return None if d is None else round(float(d), 4)


def reading_sets(state) -> list[ReadingSet]:
    """Return the readings in force grouped into sets (same cut, same wire), oldest first."""
    if state is None:
        return []
    marks = cuts(state)
    sets: list[ReadingSet] = []
    for r in state.readings:
        before = [m for m in marks if m[0] < r.seq]
        seq, label = before[-1] if before else (0, "start")
        if sets and sets[-1].after_seq == seq and same_wire(sets[-1].wire_mm, r.wire_mm) \
                and _plane(sets[-1].readings[-1]) == _plane(r):
            sets[-1] = replace(sets[-1], readings=sets[-1].readings + (r,))
        else:
            sets.append(ReadingSet(seq, label, r.wire_mm, (r,)))
    return sets


def current_set(state, wire_mm: float, distance_mm: float | None = None) -> ReadingSet | None:
    """Return the set a new reading joins: the last one, if nothing was cut since and the wire
    (and the plane, ``distance_mm`` [mm] on a tapered thread) is the same."""
    sets = reading_sets(state)
    if not sets:
        return None
    marks = cuts(state)
    last_cut = marks[-1][0] if marks else 0
    last = sets[-1]
    plane = None if distance_mm is None else round(float(distance_mm), 4)
    if last.after_seq == last_cut and same_wire(last.wire_mm, wire_mm) \
            and _plane(last.readings[-1]) == plane:
        return last
    return None
