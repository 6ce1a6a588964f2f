"""A job's state now: a pure fold over its events.

``fold(events) -> JobState`` and ``apply(state, event) -> JobState`` are the only ways to make a
state, and ``apply`` is also the check a new entry must pass before it is written: an event it
refuses (``InvalidEntry``) is never stored.

Undo rules: an ``undo`` names the ``seq`` of an earlier event that may be undone (not the job
start, a screen move or another undo) and that is not already undone. Undoing takes that entry's
effect away; the entry and the undo both stay in the history. A finished job takes only notes,
screen moves, archiving and undo (undo the finish to carry on cutting).

References: none (the project's own record format).
"""

from __future__ import annotations

from dataclasses import dataclass, field, replace
from typing import Iterable

from shopterm.errors import InvalidEntry
from shopterm.job.events import KINDS, Event


@dataclass(frozen=True)
class PassRecord:
    """One pass in force: its number, cumulative radial infeed [mm] and the dial reading."""

    seq: int
    n: int
    radial_cum_mm: float
    dial: float | str | None
    at: str
    payload: dict


@dataclass(frozen=True)
class SpringPassRecord:
    """One spring pass (no new infeed); ``radial_cum_mm`` [mm] where it was taken, if given."""

    seq: int
    radial_cum_mm: float | None
    at: str
    payload: dict


@dataclass(frozen=True)
class Reading:
    """One three-wire reading as shown at the time: measured over wires [mm], PD [mm], state."""

    seq: int
    at: str
    measured_mm: float
    pd_mm: float
    state: str
    pd_max_mm: float | None
    pd_min_mm: float | None
    wire_mm: float | None
    payload: dict


@dataclass(frozen=True)
class ToolPickup:
    """The tool reground or the thread picked up; ``radial_cum_mm`` [mm] is what the new zero stands for."""

    seq: int
    at: str
    reason: str
    radial_cum_mm: float | None
    dial: float | str | None


@dataclass(frozen=True)
class Entry:
    """A dated piece of text in force (a note, or a checklist item with ``done``)."""

    seq: int
    at: str
    text: str
    done: bool = True


@dataclass(frozen=True)
class Chosen:
    """A thread choice or set-up in force: the event's payload as confirmed."""

    seq: int
    at: str
    values: dict


def _opt_float(v) -> float | None:
    return None if v is None else float(v)


@dataclass(frozen=True)
class JobState:
    """Everything a job's screens need to resume exactly where it stopped.

    Lists hold only entries in force (undone ones removed), oldest first; ``events`` holds the
    whole history including undos. Lengths in mm.
    """

    job_id: int | None = None
    events: tuple[Event, ...] = ()
    designation: str | None = None           # as the job was started
    thread_kind: str | None = None
    units: str | None = None
    title: str | None = None
    created_at: str | None = None
    threads: tuple[Chosen, ...] = ()         # thread choices in force; the last one counts
    setups: tuple[Chosen, ...] = ()          # set-ups in force; the last one counts
    checklist: tuple[Entry, ...] = ()
    passes: tuple[PassRecord, ...] = ()
    spring_passes: tuple[SpringPassRecord, ...] = ()
    readings: tuple[Reading, ...] = ()
    pickups: tuple[ToolPickup, ...] = ()
    notes: tuple[Entry, ...] = ()
    last_screen: str | None = None
    last_screen_context: dict = field(default_factory=dict)
    finished_seq: int | None = None
    archived_seq: int | None = None
    undone: frozenset[int] = frozenset()

    # ---- what screens read ------------------------------------------------------------------

    @property
    def thread(self) -> Chosen | None:
        """Return the thread choice in force, or None."""
        return self.threads[-1] if self.threads else None

    @property
    def current_designation(self) -> str | None:
        """Return the designation in force: the last thread chosen, else the one the job began with."""
        return self.thread.values["designation"] if self.thread else self.designation

    @property
    def setup(self) -> Chosen | None:
        """Return the set-up in force, or None."""
        return self.setups[-1] if self.setups else None

    @property
    def finished(self) -> bool:
        return self.finished_seq is not None

    @property
    def archived(self) -> bool:
        return self.archived_seq is not None

    @property
    def status(self) -> str:
        """Return 'archived', 'finished' or 'open'."""
        return "archived" if self.archived else "finished" if self.finished else "open"

    @property
    def last_pass(self) -> PassRecord | None:
        return self.passes[-1] if self.passes else None

    @property
    def next_pass(self) -> int:
        """Return the number the next pass gets (one more than the highest in force)."""
        return max((p.n for p in self.passes), default=0) + 1

    @property
    def radial_cum_mm(self) -> float:
        """Return the cumulative radial infeed in force [mm]: from the latest pass, spring pass
        or tool pick-up that gave one, else 0."""
        best: tuple[int, float] = (0, 0.0)
        for rec in (*self.passes, *self.spring_passes, *self.pickups):
            if rec.radial_cum_mm is not None and rec.seq > best[0]:
                best = (rec.seq, rec.radial_cum_mm)
        return best[1]

    @property
    def last_reading(self) -> Reading | None:
        return self.readings[-1] if self.readings else None

    @property
    def next_seq(self) -> int:
        return len(self.events) + 1

    def checklist_done(self) -> frozenset[str]:
        """Return the checklist items whose latest entry in force says done."""
        latest: dict[str, bool] = {}
        for e in self.checklist:
            latest[e.text] = e.done
        return frozenset(k for k, v in latest.items() if v)

    def event(self, seq: int) -> Event | None:
        """Return the event numbered ``seq``, or None."""
        return self.events[seq - 1] if 1 <= seq <= len(self.events) else None

    def undoable(self) -> Event | None:
        """Return the latest event an undo may take back now, or None."""
        for e in reversed(self.events):
            if e.undoable and e.seq not in self.undone:
                return e
        return None


_AFTER_FINISH = {"note", "screen", "job_archived", "undo"}


def apply(state: JobState, event: Event) -> JobState:
    """Return the state after ``event``; raises ``InvalidEntry`` if the event cannot follow.

    state — the state so far; event — its ``seq`` must be ``state.next_seq`` and, after the
    first, its ``job_id`` the job's.
    """
    kind, p = event.kind, event.payload
    if kind not in KINDS:
        raise InvalidEntry(f"{kind!r} is not something a job records.")
    if event.seq != state.next_seq:
        raise InvalidEntry(f"Entry {event.seq} cannot follow entry {len(state.events)}; "
                           "entries are numbered in order.")
    if not state.events:
        if kind != "job_created":
            raise InvalidEntry("A job must begin with its start entry (thread, kind, units).")
    else:
        if event.job_id != state.job_id:
            raise InvalidEntry(f"That entry belongs to job {event.job_id}, not job {state.job_id}.")
        if kind == "job_created":
            raise InvalidEntry("This job has already been started; start a new job instead.")
    if state.archived and kind != "undo":
        raise InvalidEntry("This job is archived; undo the archiving (/) to change it.")
    if state.finished and kind not in _AFTER_FINISH:
        raise InvalidEntry("This job is finished; undo the finish (/) to carry on with it.")

    s = replace(state, events=state.events + (event,))
    at, seq = event.at, event.seq
    if kind == "job_created":
        return replace(s, job_id=event.job_id, designation=p["designation"],
                       thread_kind=p["thread_kind"], units=p["units"], title=p.get("title"),
                       created_at=at)
    if kind == "thread_chosen":
        return replace(s, threads=s.threads + (Chosen(seq, at, p),))
    if kind == "setup_confirmed":
        return replace(s, setups=s.setups + (Chosen(seq, at, p),))
    if kind == "checklist_item":
        return replace(s, checklist=s.checklist + (Entry(seq, at, p["item"], p.get("done", True)),))
    if kind == "pass_cut":
        if p["n"] != state.next_pass:
            raise InvalidEntry(f"This is pass {state.next_pass}, not pass {p['n']}.")
        rec = PassRecord(seq, p["n"], float(p["radial_cum_mm"]), p.get("dial"), at, p)
        return replace(s, passes=s.passes + (rec,))
    if kind == "spring_pass":
        rec = SpringPassRecord(seq, _opt_float(p.get("radial_cum_mm")), at, p)
        return replace(s, spring_passes=s.spring_passes + (rec,))
    if kind == "wire_reading":
        rec = Reading(seq, at, float(p["measured_mm"]), float(p["pd_mm"]), p["state"],
                      _opt_float(p.get("pd_max_mm")), _opt_float(p.get("pd_min_mm")),
                      _opt_float(p.get("wire_mm")), p)
        return replace(s, readings=s.readings + (rec,))
    if kind == "tool_pickup":
        rec = ToolPickup(seq, at, p["reason"], _opt_float(p.get("radial_cum_mm")), p.get("dial"))
        return replace(s, pickups=s.pickups + (rec,))
    if kind == "note":
        return replace(s, notes=s.notes + (Entry(seq, at, p["text"]),))
    if kind == "screen":
        return replace(s, last_screen=p["name"], last_screen_context=p.get("context", {}))
    if kind == "job_finished":
        return replace(s, finished_seq=seq)
    if kind == "job_archived":
        return replace(s, archived_seq=seq)
    if kind == "undo":
        return _undo(state, s, p["target"])
    raise InvalidEntry(f"{kind!r} is not something a job records.")  # pragma: no cover


#: The JobState list that holds the entries of each undoable kind.
_LIST_OF_KIND = {"thread_chosen": "threads", "setup_confirmed": "setups",
                 "checklist_item": "checklist", "pass_cut": "passes",
                 "spring_pass": "spring_passes", "wire_reading": "readings",
                 "tool_pickup": "pickups", "note": "notes"}


def _undo(before: JobState, s: JobState, target_seq: int) -> JobState:
    target = before.event(target_seq)
    if target is None:
        raise InvalidEntry(f"There is no entry {target_seq} to undo; "
                           f"entries so far are 1 to {len(before.events)}.")
    if not target.undoable:
        raise InvalidEntry(f"Entry {target_seq} ({target.title}) cannot be undone.")
    if target_seq in before.undone:
        raise InvalidEntry(f"Entry {target_seq} ({target.title}) is already undone.")
    if before.archived and target.kind != "job_archived":
        raise InvalidEntry("This job is archived; undo the archiving first.")
    if before.finished and target.kind not in _AFTER_FINISH | {"job_finished"}:
        raise InvalidEntry("This job is finished; undo the finish first.")
    if target.kind == "pass_cut" and any(p.n > target.payload["n"] for p in before.passes):
        # Passes are counted in order; taking one out of the middle would leave a gap.
        raise InvalidEntry(f"Pass {target.payload['n']} has later passes; undo those first.")
    s = replace(s, undone=s.undone | {target_seq})
    drop = lambda recs: tuple(r for r in recs if r.seq != target_seq)  # noqa: E731
    k = target.kind
    if k in _LIST_OF_KIND:
        field_name = _LIST_OF_KIND[k]
        return replace(s, **{field_name: drop(getattr(s, field_name))})
    if k == "job_finished":
        return replace(s, finished_seq=None)
    if k == "job_archived":
        return replace(s, archived_seq=None)
    raise InvalidEntry(f"Entry {target_seq} cannot be undone.")  # pragma: no cover


def fold(events: Iterable[Event]) -> JobState:
    """Return the state a job's events add up to, oldest first.

    Raises ``InvalidEntry`` if the events do not make a valid history.
    """
    state = JobState()
    for e in events:
        state = apply(state, e)
    return state
