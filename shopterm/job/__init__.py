"""The job record: append-only events, the state they fold into, the SQLite store, export.

A screen holds a ``JobSession`` (from ``Store.open(...).new_job(...)`` or ``.open_job(id)``),
reads ``session.state`` and adds entries with ``session.append(kind, payload)`` and
``session.undo()``; ``store.health`` is the warning to show while entries are not being saved.
"""

from shopterm.job.events import KINDS, Event, check_payload, make_event
from shopterm.job.state import JobState, apply, fold
from shopterm.job.store import JobInfo, JobSession, Store, StoreError, data_dir

__all__ = ["KINDS", "Event", "check_payload", "make_event", "JobState", "apply", "fold",
           "JobInfo", "JobSession", "Store", "StoreError", "data_dir"]
