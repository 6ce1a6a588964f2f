"""What can happen in a job: the event kinds, their payloads, and the frozen ``Event``.

A job is an append-only list of events, numbered 1, 2, 3… (``seq``) within the job. An event is
never changed or removed; a mistake is taken back by a later ``undo`` event that names the
``seq`` of the entry it takes back, so the history shows both.

Payloads are plain JSON objects (str keys; str, int, float, bool, None, list, dict values;
no NaN or infinity). Lengths carry their unit in the key name, always millimetres: ``_mm``.

References: none (the project's own record format; see DEVELOPERS.md, "Layers").
"""

from __future__ import annotations

import json
import math
from dataclasses import dataclass
from datetime import datetime
from typing import Any, Callable

from shopterm.errors import InvalidEntry

#: The biggest payload one entry may carry, as JSON text [bytes]; more is certainly a mistake.
MAX_PAYLOAD_BYTES = 64 * 1024

# ---- field checks: each returns None when the value is fine, else what is expected ----------


def _is_number(v: Any) -> bool:
    return isinstance(v, (int, float)) and not isinstance(v, bool) and math.isfinite(v)


def _number(v: Any) -> str | None:
    return None if _is_number(v) else "a number"


def _length(v: Any) -> str | None:
    return None if _is_number(v) and v >= 0 else "a length in mm, zero or more"


def _positive_length(v: Any) -> str | None:
    return None if _is_number(v) and v > 0 else "a length in mm greater than zero"


def _count(v: Any) -> str | None:
    ok = isinstance(v, int) and not isinstance(v, bool) and 1 <= v <= 100_000
    return None if ok else "a whole number from 1 up"


def _text(v: Any) -> str | None:
    return None if isinstance(v, str) and v.strip() and len(v) <= 2000 else \
        "some text (not empty, at most 2000 characters)"


def _opt_text(v: Any) -> str | None:
    return None if isinstance(v, str) and len(v) <= 2000 else "text of at most 2000 characters"


def _bool(v: Any) -> str | None:
    return None if isinstance(v, bool) else "true or false"


def _object(v: Any) -> str | None:
    return None if isinstance(v, dict) else "a set of named values"


def _choice(*options: str) -> Callable[[Any], str | None]:
    def check(v: Any) -> str | None:
        return None if v in options else "one of " + ", ".join(options)
    return check


def _dial(v: Any) -> str | None:
    # A dial reading is what the dial shows: a number of divisions, or text such as "2 turns + 13".
    if _is_number(v) or (isinstance(v, str) and v.strip() and len(v) <= 100):
        return None
    return "a dial reading (a number of divisions, or short text)"


@dataclass(frozen=True)
class EventKind:
    """One kind of event: the payload keys it needs and may have, and whether undo may take it back."""

    name: str
    title: str                                   # plain words for lists and the job card
    required: dict[str, Callable[[Any], str | None]]
    optional: dict[str, Callable[[Any], str | None]]
    undoable: bool = True
    open_keys: bool = False                      # other keys allowed (any JSON value)


def _kind(name, title, required=None, optional=None, undoable=True, open_keys=False) -> EventKind:
    return EventKind(name, title, dict(required or {}), dict(optional or {}), undoable, open_keys)


#: Every event kind, by name.
KINDS: dict[str, EventKind] = {k.name: k for k in (
    _kind("job_created", "job started",
          {"designation": _text, "thread_kind": _choice("external", "internal"),
           "units": _choice("mm", "in")},
          {"title": _opt_text}, undoable=False),
    _kind("thread_chosen", "thread chosen", {"designation": _text},
          {"thread_kind": _choice("external", "internal"), "tol_class": _opt_text},
          open_keys=True),
    # Set-up: gears, dial plan, compound angle as set, tool, method, blank OD… (free JSON values;
    # the usual keys are checked when present).
    _kind("setup_confirmed", "set-up confirmed", {},
          {"compound_angle_deg": _number, "blank_od_mm": _positive_length, "method": _opt_text,
           "tool": _opt_text}, open_keys=True),
    _kind("checklist_item", "checklist item", {"item": _text}, {"done": _bool}),
    _kind("pass_cut", "pass cut", {"n": _count, "radial_cum_mm": _length},
          {"dial": _dial, "infeed_mm": _length, "compound_mm": _length, "cross_mm": _number},
          open_keys=True),
    _kind("spring_pass", "spring pass", {},
          {"radial_cum_mm": _length, "dial": _dial}, open_keys=True),
    # A three-wire reading: what was read and what the screen showed at the time.
    _kind("wire_reading", "wire reading",
          {"measured_mm": _positive_length, "pd_mm": _number, "state": _text},
          {"wire_mm": _positive_length, "pd_max_mm": _number, "pd_min_mm": _number,
           "remaining_mm": _number, "typed": _opt_text}, open_keys=True),
    # The tool was reground or the thread picked up again: ``radial_cum_mm`` is the depth the
    # new zero stands for.
    _kind("tool_pickup", "tool reground / thread picked up",
          {"reason": _choice("reground", "picked_up")},
          {"radial_cum_mm": _length, "dial": _dial, "note": _opt_text}),
    # A note; a hand-tight engagement check of a tapered thread carries ``hand_tight``.
    _kind("note", "note", {"text": _text}, {"hand_tight": _object}),
    _kind("screen", "screen", {"name": _text}, {"context": _object}, undoable=False),
    _kind("job_finished", "job finished", {}, {"note": _opt_text}),
    _kind("job_archived", "job archived", {}),
    _kind("undo", "undo", {"target": _count}, undoable=False),
)}


@dataclass(frozen=True)
class Event:
    """One entry in a job's record.

    ``seq`` counts from 1 within the job; ``at`` is local time with its UTC offset (ISO 8601,
    seconds); ``payload`` is a plain JSON object whose lengths are in mm.
    """

    seq: int
    job_id: int
    kind: str
    payload: dict
    at: str

    @property
    def undoable(self) -> bool:
        """Return whether an ``undo`` may name this event (ignores whether it already was)."""
        return KINDS[self.kind].undoable

    @property
    def title(self) -> str:
        """Return the kind in plain words."""
        return KINDS[self.kind].title

    def to_json(self) -> dict:
        """Return the event as a plain JSON object."""
        return {"seq": self.seq, "job_id": self.job_id, "kind": self.kind, "at": self.at,
                "payload": self.payload}


def now() -> str:
    """Return the time now as the record writes it (local, with UTC offset, seconds)."""
    return datetime.now().astimezone().isoformat(timespec="seconds")


def _json_value_error(v: Any, depth: int = 0) -> str | None:
    if depth > 20:
        return "nested too deeply"
    if v is None or isinstance(v, (bool, str)):
        return None
    if isinstance(v, (int, float)):
        return None if math.isfinite(v) else "a number that is not infinite or NaN"
    if isinstance(v, (list, tuple)):
        for item in v:
            if err := _json_value_error(item, depth + 1):
                return err
        return None
    if isinstance(v, dict):
        for k, item in v.items():
            if not isinstance(k, str):
                return "names that are text"
            if err := _json_value_error(item, depth + 1):
                return err
        return None
    return "plain values (text, numbers, true/false, lists)"


def check_payload(kind: str, payload: Any) -> dict:
    """Return a normalised copy of ``payload`` for an event of ``kind`` (JSON round trip).

    kind — one of ``KINDS``; payload — a dict of plain JSON values.
    Raises ``InvalidEntry`` saying what is missing or wrong.
    References: RFC 8259 (JSON values).
    """
    if not isinstance(kind, str) or kind not in KINDS:
        raise InvalidEntry(f"{kind!r} is not something a job records; use one of: "
                           + ", ".join(KINDS) + ".")
    spec = KINDS[kind]
    if payload is None:
        payload = {}
    if not isinstance(payload, dict):
        raise InvalidEntry(f"The details of a {spec.title} must be a set of named values.")
    if err := _json_value_error(payload):
        raise InvalidEntry(f"The details of a {spec.title} must be {err}.")
    for key, check in spec.required.items():
        if key not in payload:
            raise InvalidEntry(f"A {spec.title} needs '{key}': give {check(object()) or 'it'}.")
    for key, value in payload.items():
        check = spec.required.get(key) or spec.optional.get(key)
        if check is None:
            if spec.open_keys:
                continue
            allowed = list(spec.required) + list(spec.optional)
            raise InvalidEntry(f"A {spec.title} has no '{key}'"
                               + (f"; it takes: {', '.join(allowed)}." if allowed else
                                  "; it takes no details."))
        if (expected := check(value)) is not None:
            raise InvalidEntry(f"'{key}' of a {spec.title} must be {expected}, not {value!r}."
                               [:300])
    text = json.dumps(payload, allow_nan=False, sort_keys=True)
    if len(text.encode()) > MAX_PAYLOAD_BYTES:
        raise InvalidEntry(f"The details of a {spec.title} are too long "
                           f"(at most {MAX_PAYLOAD_BYTES // 1024} KiB); shorten the text.")
    return json.loads(text)


def make_event(seq: int, job_id: int, kind: str, payload: Any, at: str | None = None) -> Event:
    """Return a checked ``Event``; ``at`` defaults to now.

    Raises ``InvalidEntry`` for an unknown kind or a payload that lacks or misuses a key.
    """
    clean = check_payload(kind, payload)
    return Event(int(seq), int(job_id), kind, clean, at or now())


def event_from_row(seq: int, job_id: int, kind: str, payload_json: str, at: str) -> Event:
    """Return the ``Event`` stored in a database row (payload as JSON text)."""
    return Event(int(seq), int(job_id), str(kind), json.loads(payload_json), str(at))


def payload_json(event: Event) -> str:
    """Return the event's payload as the JSON text the store writes."""
    return json.dumps(event.payload, allow_nan=False, sort_keys=True)
