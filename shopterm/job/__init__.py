"""The job record: append-only events, the state they fold into, the SQLite store, export.

A screen holds a ``JobSession`` (from ``Store.open(...).new_job(...)`` or ``.open_job(id)``),
reads ``session.state`` and adds entries with ``session.append(kind, payload)`` and
``session.undo()``; ``store.health`` is the warning to show while entries are not being saved.
"""

import importlib

#: Where each name of the package lives; loaded on first use (PEP 562), so that importing
#: ``shopterm.job.store`` to open the record at start-up does not load the events and state.
_HOME = {"KINDS": "events", "Event": "events", "check_payload": "events", "make_event": "events",
         "JobState": "state", "apply": "state", "fold": "state",
         "JobInfo": "store", "JobSession": "store", "Store": "store", "StoreError": "store",
         "data_dir": "store"}

__all__ = list(_HOME)


def __getattr__(name: str):
    if name not in _HOME:
        raise AttributeError(f"module 'shopterm.job' has no attribute {name!r}")
    return getattr(importlib.import_module(f"shopterm.job.{_HOME[name]}"), name)
