"""A job handed on: CSV (one row per event), JSON (the whole job) and a printable job card.

The card's final pitch diameter and band come from the reading entries (what was shown at the
time), re-checked against ``shopterm.standards.limits`` when the designation parses.

References: RFC 4180 (CSV), RFC 8259 (JSON); the standards named by each thread family.
"""

from __future__ import annotations

import csv
import io
import json
from dataclasses import dataclass
from datetime import datetime
from typing import Any, Sequence

from shopterm.errors import InvalidEntry, ShoptermError
from shopterm.job.events import KINDS, Event
from shopterm.job.state import JobState, fold
from shopterm.units import format_length

FORMATS = ("csv", "json", "card")

#: CSV columns; lengths carry their unit in the name. ``payload_json`` holds every detail.
CSV_COLUMNS = ("seq", "at", "kind", "undone_by_seq", "pass_n", "radial_cum_mm", "dial_reading",
               "infeed_mm", "measured_mm", "wire_mm", "pd_mm", "pd_max_mm", "pd_min_mm",
               "state", "undo_target_seq", "text", "payload_json")

_TEXT_KEYS = ("text", "item", "designation", "name", "reason", "note")


@dataclass(frozen=True)
class BandPosition:
    """Where a pitch diameter sits in its band.

    ``where`` is 'above max', 'in band' or 'below min'; ``fraction`` is 0 at the min and 1 at the
    max; ``over_max_mm`` = pd − max [mm] (positive: still oversize), ``over_min_mm`` = pd − min.
    """

    pd_mm: float
    pd_min_mm: float
    pd_max_mm: float
    where: str
    fraction: float
    over_max_mm: float
    over_min_mm: float


def band_position(pd_mm: float, pd_min_mm: float, pd_max_mm: float) -> BandPosition:
    """Return where ``pd_mm`` sits between ``pd_min_mm`` and ``pd_max_mm`` (all [mm]).

    References: ISO 965-1 / ASME B1.1 — a thread is within its class when its pitch diameter
    lies between the pitch-diameter limits.
    """
    if not pd_max_mm > pd_min_mm:
        raise InvalidEntry("A pitch-diameter band needs its max above its min.")
    fraction = (pd_mm - pd_min_mm) / (pd_max_mm - pd_min_mm)
    where = "above max" if pd_mm > pd_max_mm else "below min" if pd_mm < pd_min_mm else "in band"
    return BandPosition(pd_mm, pd_min_mm, pd_max_mm, where, fraction, pd_mm - pd_max_mm,
                        pd_mm - pd_min_mm)


def recheck_limits(designation: str | None, thread_kind: str | None):
    """Return the ``Limits`` of the designation as the standards give them now, or None."""
    if not designation:
        return None
    try:
        from shopterm.standards import limits, parse
        return limits(parse(designation, kind=thread_kind))
    except (ShoptermError, ImportError, ValueError, KeyError, ArithmeticError):
        return None


def thread_cautions(designation: str | None, thread_kind: str | None) -> tuple[str, ...]:
    """Return the standards' cautions for the job's thread (pipe threads: the pressure-fitting
    caution), () when there are none or the designation does not parse."""
    lim = recheck_limits(designation, thread_kind)
    if lim is None:
        return ()
    from shopterm.standards import cautions
    return cautions(lim.spec)


def _undone_by(state: JobState) -> dict[int, int]:
    return {e.payload["target"]: e.seq for e in state.events if e.kind == "undo"}


# ---- CSV -------------------------------------------------------------------------------------


def _csv_row(e: Event, undone_by: dict[int, int]) -> dict[str, Any]:
    p = e.payload
    text = next((p[k] for k in _TEXT_KEYS if isinstance(p.get(k), str)), "")
    return {
        "seq": e.seq, "at": e.at, "kind": e.kind, "undone_by_seq": undone_by.get(e.seq, ""),
        "pass_n": p.get("n", "") if e.kind == "pass_cut" else "",
        "radial_cum_mm": p.get("radial_cum_mm", ""), "dial_reading": p.get("dial", ""),
        "infeed_mm": p.get("infeed_mm", ""), "measured_mm": p.get("measured_mm", ""),
        "wire_mm": p.get("wire_mm", ""), "pd_mm": p.get("pd_mm", ""),
        "pd_max_mm": p.get("pd_max_mm", ""), "pd_min_mm": p.get("pd_min_mm", ""),
        "state": p.get("state", "") if e.kind == "wire_reading" else "",
        "undo_target_seq": p.get("target", "") if e.kind == "undo" else "",
        "text": text,
        "payload_json": json.dumps(p, sort_keys=True),
    }


def to_csv(events: Sequence[Event]) -> str:
    """Return the job as CSV text: a header, then one row per event, oldest first."""
    state = fold(events)
    undone_by = _undone_by(state)
    buf = io.StringIO()
    w = csv.DictWriter(buf, fieldnames=CSV_COLUMNS)
    w.writeheader()
    for e in state.events:
        w.writerow(_csv_row(e, undone_by))
    return buf.getvalue()


# ---- JSON ------------------------------------------------------------------------------------


def to_dict(events: Sequence[Event], status: str | None = None) -> dict:
    """Return the whole job as a plain JSON object: job, thread, set-up, what is in force, events."""
    s = fold(events)
    lim = recheck_limits(s.current_designation, s.thread_kind)
    last = s.last_reading
    final = None
    if last is not None:
        final = {"seq": last.seq, "at": last.at, "pd_mm": last.pd_mm, "state": last.state,
                 "pd_min_mm": last.pd_min_mm, "pd_max_mm": last.pd_max_mm}
        if last.pd_min_mm is not None and last.pd_max_mm is not None \
                and last.pd_max_mm > last.pd_min_mm:
            bp = band_position(last.pd_mm, last.pd_min_mm, last.pd_max_mm)
            final.update(where=bp.where, band_fraction=bp.fraction)
    return {
        "format": "shopterm-job", "format_version": 1,
        "job": {"id": s.job_id, "title": s.title or s.designation, "created": s.created_at,
                "status": status or s.status, "designation": s.designation,
                "thread_kind": s.thread_kind, "units": s.units,
                "cautions": list(thread_cautions(s.current_designation, s.thread_kind))},
        "thread": s.thread.values if s.thread else None,
        "setup": s.setup.values if s.setup else None,
        "limits_now": None if lim is None else {
            "designation": lim.spec.designation, "pd_max_mm": lim.pd_max, "pd_min_mm": lim.pd_min,
            "major_max_mm": lim.major_max, "major_min_mm": lim.major_min},
        "in_force": {
            "passes": [{"seq": p.seq, "n": p.n, "radial_cum_mm": p.radial_cum_mm, "dial": p.dial,
                        "at": p.at} for p in s.passes],
            "spring_passes": [{"seq": p.seq, "radial_cum_mm": p.radial_cum_mm, "at": p.at}
                              for p in s.spring_passes],
            "readings": [r.payload | {"seq": r.seq, "at": r.at} for r in s.readings],
            "tool_pickups": [{"seq": t.seq, "at": t.at, "reason": t.reason,
                              "radial_cum_mm": t.radial_cum_mm, "dial": t.dial}
                             for t in s.pickups],
            "checklist_done": sorted(s.checklist_done()),
            "notes": [{"seq": n.seq, "at": n.at, "text": n.text} for n in s.notes],
            "radial_cum_mm": s.radial_cum_mm, "next_pass": s.next_pass,
            "last_screen": s.last_screen,
        },
        "final_reading": final,
        "undone": sorted(s.undone),
        "events": [e.to_json() for e in s.events],
    }


def to_json(events: Sequence[Event], status: str | None = None) -> str:
    """Return the whole job as JSON text (see ``to_dict``)."""
    return json.dumps(to_dict(events, status), indent=2) + "\n"


# ---- the job card ----------------------------------------------------------------------------


def _time(at: str, with_date: bool = False) -> str:
    try:
        t = datetime.fromisoformat(at)
    except (TypeError, ValueError):
        return str(at)
    return t.strftime("%Y-%m-%d %H:%M" if with_date else "%H:%M:%S")


def _value(key: str, v: Any, unit: str) -> str:
    if key.endswith("_mm") and isinstance(v, (int, float)) and not isinstance(v, bool):
        return format_length(float(v), unit)
    if (key.endswith("_deg") or "angle" in key) and isinstance(v, (int, float)) \
            and not isinstance(v, bool):
        return f"{v:g}°"
    if isinstance(v, bool):
        return "yes" if v else "no"
    if isinstance(v, float):
        return f"{v:g}"
    if isinstance(v, list):
        return " / ".join(_value("", x, unit) for x in v)
    if isinstance(v, dict):
        return ", ".join(f"{_label(k)} {_value(k, x, unit)}" for k, x in v.items())
    return "" if v is None else str(v)


def _label(key: str) -> str:
    for suffix in ("_mm", "_deg"):
        if key.endswith(suffix):
            key = key[: -len(suffix)]
    return key.replace("_", " ")


def _len(mm: float | None, unit: str) -> str:
    return "" if mm is None else format_length(mm, unit)


def job_card(events: Sequence[Event], status: str | None = None) -> str:
    """Return a plain-text job card (at most 78 characters a line) to print and keep with the part.

    Lengths in the job's units. The final pitch diameter is the last reading in force, with the
    band as shown at the time, re-checked against the standard's limits when they can be found.
    References: ISO 965-1, ASME B1.1, BS 84, BS 93 (via ``shopterm.standards.limits``).
    """
    s = fold(events)
    unit = s.units or "mm"
    out: list[str] = []
    add = out.append
    add(f"JOB CARD - job {s.job_id}: {s.title or s.designation}")
    add("=" * 78)
    add(f"Thread      {s.current_designation}  ({s.thread_kind})")
    if s.thread and s.thread.values.get("tol_class"):
        add(f"Class       {s.thread.values['tol_class']}")
    for caution in thread_cautions(s.current_designation, s.thread_kind):
        add(f"CAUTION     {caution}")
    add(f"Started     {_time(s.created_at or '', True)}    status: {status or s.status}")
    if s.finished:
        add(f"Finished    {_time(s.event(s.finished_seq).at, True)}")
    add("")
    add("Set-up" + (f" (confirmed {_time(s.setup.at)})" if s.setup else ": none confirmed"))
    if s.setup:
        for key, v in s.setup.values.items():
            add(f"  {_label(key):<20} {_value(key, v, unit)}")
    add("")
    add(f"Passes ({len(s.passes)} in force)")
    if s.passes:
        add(f"  {'no.':>4}  {'time':<8}  {'radial total':>14}  dial")
        for p in s.passes:
            add(f"  {p.n:>4}  {_time(p.at):<8}  {_len(p.radial_cum_mm, unit):>14}  "
                f"{'' if p.dial is None else p.dial}")
    for sp in s.spring_passes:
        add(f"  spring pass at {_time(sp.at)}"
            + (f", radial total {_len(sp.radial_cum_mm, unit)}" if sp.radial_cum_mm is not None
               else ""))
    for t in s.pickups:
        add(f"  {'tool reground' if t.reason == 'reground' else 'thread picked up'} at "
            f"{_time(t.at)}" + (f", new zero at radial total {_len(t.radial_cum_mm, unit)}"
                                if t.radial_cum_mm is not None else ""))
    add("")
    add(f"Wire readings ({len(s.readings)})")
    for r in s.readings:
        wire = f", wire {_len(r.wire_mm, unit)}" if r.wire_mm else ""
        plane = r.payload.get("distance_mm")
        where = "" if plane is None else (f" at {_len(plane, unit)} from the end, PD there "
                                          f"{_len(r.payload.get('pd_at_plane_mm'), unit)}; "
                                          "at the gauge plane")
        how = ("caliper thickness" if r.payload.get("method") == "caliper" else "over wires")
        add(f"  {_time(r.at):<8}  {how} {_len(r.measured_mm, unit)}{wire}{where}, "
            f"PD {_len(r.pd_mm, unit)}: {r.state}")
    add("")
    last = s.last_reading
    if last is None:
        add("Final pitch diameter: no wire reading recorded.")
    else:
        add(f"Final pitch diameter  {_len(last.pd_mm, unit)}  (reading at {_time(last.at)}: "
            f"{last.state})")
        if last.pd_min_mm is not None and last.pd_max_mm is not None \
                and last.pd_max_mm > last.pd_min_mm:
            bp = band_position(last.pd_mm, last.pd_min_mm, last.pd_max_mm)
            add(f"  band shown then {_len(bp.pd_min_mm, unit)} to {_len(bp.pd_max_mm, unit)}:")
            add("    " + _where_words(bp, unit))
        lim = recheck_limits(s.current_designation, s.thread_kind)
        if lim is None:
            add("  (not re-checked: the designation is not one the standards tables give)")
        else:
            bp = band_position(last.pd_mm, lim.pd_min, lim.pd_max)
            same = (last.pd_min_mm is not None and last.pd_max_mm is not None
                    and abs(lim.pd_min - last.pd_min_mm) < 5e-4
                    and abs(lim.pd_max - last.pd_max_mm) < 5e-4)
            add(f"  re-checked against {lim.spec.designation}: band {_len(lim.pd_min, unit)} to "
                f"{_len(lim.pd_max, unit)}" + (" (same)" if same else " (DIFFERS from the band "
                                                "shown then)"))
            if not same:
                add("    " + _where_words(bp, unit))
    done = sorted(s.checklist_done())
    if done:
        add("")
        add("Checklist done: " + ", ".join(done))
    if s.notes:
        add("")
        add("Notes")
        for n in s.notes:
            for i, line in enumerate(_wrap(n.text, 66)):
                add(f"  {_time(n.at) if i == 0 else '':<8}  {line}")
    if s.undone:
        add("")
        add("Undone entries (kept in the record): " + ", ".join(
            f"{q} {KINDS[s.event(q).kind].title}" for q in sorted(s.undone)))
    return "\n".join(_fit(line) for line in out) + "\n"


def _fit(line: str, width: int = 78) -> str:
    """Return ``line`` wrapped to ``width`` characters, continuation lines indented."""
    import textwrap
    line = line.rstrip()
    if len(line) <= width:
        return line
    indent = " " * (len(line) - len(line.lstrip()) + 4)
    return "\n".join(textwrap.wrap(line, width, subsequent_indent=indent,
                                    break_long_words=True, drop_whitespace=True))


def _where_words(bp: BandPosition, unit: str) -> str:
    if bp.where == "above max":
        return f"above max by {_len(bp.over_max_mm, unit)}"
    if bp.where == "below min":
        return f"below min by {_len(-bp.over_min_mm, unit)}"
    return (f"in band, {_len(-bp.over_max_mm, unit)} under max, "
            f"{bp.fraction * 100:.0f}% of the band up from min")


def _wrap(text: str, width: int) -> list[str]:
    import textwrap
    lines: list[str] = []
    for para in text.splitlines() or [""]:
        lines.extend(textwrap.wrap(para, width) or [""])
    return lines


def export(events: Sequence[Event], fmt: str, status: str | None = None) -> str:
    """Return the job in ``fmt``: 'csv', 'json' or 'card'."""
    if fmt == "csv":
        return to_csv(events)
    if fmt == "json":
        return to_json(events, status)
    if fmt == "card":
        return job_card(events, status)
    raise InvalidEntry(f"{fmt!r} is not an export format; use one of: {', '.join(FORMATS)}.")


def write_whole(path, text: str, *, make_folder: bool = False) -> None:
    """Write ``text`` to ``path`` whole or not at all (temporary file, fsync, then rename).

    make_folder: create the folder first (else a missing folder is an error). Raises
    ``OSError``; nothing half-written is left behind.
    """
    import os
    import tempfile
    from pathlib import Path

    path = Path(path)
    if make_folder:
        path.parent.mkdir(parents=True, exist_ok=True)
    fd, tmp = tempfile.mkstemp(prefix=f".{path.name}.", dir=path.parent)
    try:
        with os.fdopen(fd, "w", encoding="utf-8", newline="") as f:
            f.write(text)
            f.flush()
            os.fsync(f.fileno())
        os.replace(tmp, path)
    except BaseException:
        try:
            os.unlink(tmp)
        except OSError:
            pass
        raise
