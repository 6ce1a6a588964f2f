"""The job record on disk: SQLite (stdlib ``sqlite3``), one transaction per confirmed entry.

``Store.open(data_dir(...))`` gives the app its record; ``store.new_job(...)`` or
``store.open_job(id)`` gives a ``JobSession``, the object a screen holds: ``session.append(kind,
payload)`` checks the entry against the job's state, writes it and commits (WAL,
``synchronous=FULL``) *before* it returns, so a screen shows an entry as done only once it is on
the card.

Faults it survives, and what it tells the user (``store.message`` once at start,
``store.health`` for as long as it lasts):

* killed at any moment — SQLite's WAL keeps every committed entry;
* a corrupt or truncated file — kept aside as ``<name>.corrupt-<timestamp>``, a fresh record begun;
* a full or read-only disk — entries kept in memory, in order, and written on the next entry or
  ``retry()``; ``health`` says that entries are not being saved until they are;
* a second copy of the app on the same data — an exclusive ``flock`` on ``shopterm.lock``; the
  second copy opens the record read-only (or refuses), never writes;
* a record written by a newer shopterm — refused, untouched; an older one — copied aside
  (``<name>.v<N>-backup-<timestamp>``) and migrated in place.

References: SQLite documentation, "Write-Ahead Logging", "PRAGMA synchronous", "PRAGMA
user_version", "How To Corrupt An SQLite Database File"; POSIX flock(2).
"""

from __future__ import annotations

import fcntl
import os
import shutil
import sqlite3
import time
from dataclasses import dataclass
from datetime import datetime
from pathlib import Path
from typing import TYPE_CHECKING, Any

from shopterm.errors import InvalidEntry, ShoptermError

if TYPE_CHECKING:
    from shopterm.job.events import Event
    from shopterm.job.state import JobState

# ``shopterm.job.events`` and ``.state`` (their dataclasses, json) are imported where a job is
# read or written, not here: opening the record and listing its jobs needs neither, so the app
# does not pay for them before its first screen is shown.

#: The schema this shopterm writes (``PRAGMA user_version``).
SCHEMA_VERSION = 2
DB_NAME = "jobs.sqlite3"
LOCK_NAME = "shopterm.lock"

# Version 1 (first release) had jobs(id, title, created, finished 0/1, designation) and
# events(id autoincrement, job_id, seq, kind, payload, at); version 2 keeps the job's status
# (open/finished/archived) and its kind and units, and keys events by (job_id, seq).
_SCHEMA_V2 = """
CREATE TABLE jobs (
    id          INTEGER PRIMARY KEY,
    title       TEXT NOT NULL,
    created     TEXT NOT NULL,
    status      TEXT NOT NULL DEFAULT 'open' CHECK (status IN ('open', 'finished', 'archived')),
    designation TEXT NOT NULL DEFAULT '',
    thread_kind TEXT NOT NULL DEFAULT 'external',
    units       TEXT NOT NULL DEFAULT 'mm'
);
CREATE TABLE events (
    job_id  INTEGER NOT NULL REFERENCES jobs(id),
    seq     INTEGER NOT NULL CHECK (seq >= 1),
    kind    TEXT NOT NULL,
    payload TEXT NOT NULL,
    at      TEXT NOT NULL,
    PRIMARY KEY (job_id, seq)
) WITHOUT ROWID;
CREATE INDEX jobs_status ON jobs(status);
"""

_MIGRATE_V1_V2 = """
ALTER TABLE jobs RENAME TO jobs_v1;
ALTER TABLE events RENAME TO events_v1;
""" + _SCHEMA_V2 + """
INSERT INTO jobs (id, title, created, status, designation)
    SELECT id, title, created, CASE WHEN finished THEN 'finished' ELSE 'open' END,
           COALESCE(designation, '') FROM jobs_v1;
INSERT INTO events (job_id, seq, kind, payload, at)
    SELECT job_id, seq, kind, payload, at FROM events_v1;
DROP TABLE events_v1;
DROP TABLE jobs_v1;
"""

#: Migrations: from version N to N+1, each one script run in one transaction.
MIGRATIONS: dict[int, str] = {1: _MIGRATE_V1_V2}


class StoreError(ShoptermError):
    """The job record cannot be opened or written as asked; the message says what to do."""


def data_dir(explicit: str | os.PathLike | None = None) -> Path:
    """Return the folder the job record lives in (not created here).

    explicit — ``--data-dir``; else ``$SHOPTERM_DATA``; else ``$XDG_DATA_HOME/shopterm``;
    else ``~/.local/share/shopterm``.
    References: XDG Base Directory Specification 0.8 (``XDG_DATA_HOME``).
    """
    if explicit:
        return Path(explicit).expanduser()
    if env := os.environ.get("SHOPTERM_DATA"):
        return Path(env).expanduser()
    xdg = os.environ.get("XDG_DATA_HOME")
    if xdg and os.path.isabs(xdg):          # the spec says to ignore a relative path
        return Path(xdg) / "shopterm"
    return Path.home() / ".local" / "share" / "shopterm"


@dataclass(frozen=True)
class JobInfo:
    """One job in the list: id, title, when it began, status, thread as begun."""

    id: int
    title: str
    created: str
    status: str          # open / finished / archived
    designation: str
    thread_kind: str = "external"
    units: str = "mm"


def _stamp() -> str:
    return datetime.now().strftime("%Y%m%d-%H%M%S")


def _aside(path: Path, label: str) -> Path:
    """Return a free name beside ``path``: ``<name>.<label>-<timestamp>[-n]``."""
    base = path.with_name(f"{path.name}.{label}-{_stamp()}")
    target, n = base, 1
    while target.exists():
        target, n = base.with_name(f"{base.name}-{n}"), n + 1
    return target


def _is_write_fault(exc: BaseException) -> bool:
    return isinstance(exc, (sqlite3.OperationalError, sqlite3.DatabaseError, OSError))


def _fault_words(exc: BaseException) -> str:
    text = str(exc).lower()
    if "full" in text or isinstance(exc, OSError) and getattr(exc, "errno", None) == 28:
        return "the disk is full"
    if "readonly" in text or "read-only" in text or "read only" in text:
        return "the disk is read-only"
    return f"the record cannot be written ({exc})"


class Store:
    """The job record in one data folder. Open with ``Store.open(dir)``; close when done.

    ``message`` — what happened at start that the user should know (or None);
    ``read_only`` — True when another copy holds the record; ``health`` — None while entries are
    being saved, else the warning to keep on screen.
    """

    def __init__(self, directory: Path, *, if_locked: str = "read_only", lock: bool = True):
        self.directory = Path(directory)
        self.path = self.directory / DB_NAME
        self.message: str | None = None
        self.read_only = False
        self._notices: list[str] = []
        self._lock_fd: int | None = None
        self._conn: Any = None
        self._pending: list[tuple[str, Any]] = []     # ("job", JobInfo) / ("event", Event, status)
        self._fault: str | None = None
        self._sessions: dict[int, JobSession] = {}
        self._pending_jobs: dict[int, JobInfo] = {}
        self._max_job_id = 0
        if if_locked not in ("read_only", "refuse"):
            raise ValueError("if_locked must be 'read_only' or 'refuse'")
        try:
            if lock:
                self.directory.mkdir(parents=True, exist_ok=True)
        except OSError as exc:
            raise StoreError(f"Cannot make the data folder {self.directory} ({exc.strerror}); "
                             "give a folder you can write with --data-dir.") from None
        if lock and not self._take_lock():
            if if_locked == "refuse":
                raise StoreError(f"Another shopterm is already using the record in "
                                 f"{self.directory}; close it first, or use --data-dir.")
            self.read_only = True
            self._notices.append(
                f"Another shopterm is using the record in {self.directory}: this one has opened "
                "it read-only and will save nothing. Close the other one, then start this again.")
        elif not lock:
            self.read_only = True
        try:
            self._connect()
        except BaseException:
            self.close()
            raise
        self.message = " ".join(self._notices) or None

    @classmethod
    def open(cls, directory: str | os.PathLike | None = None, *, if_locked: str = "read_only"
             ) -> "Store":
        """Return the store in ``directory`` (default ``data_dir()``), opened for writing.

        if_locked — 'read_only' (default) or 'refuse' when another copy holds the record.
        """
        return cls(data_dir(directory), if_locked=if_locked)

    @classmethod
    def open_in_background(cls, directory: str | os.PathLike | None = None) -> "StoreOpening":
        """Return a ``StoreOpening``: ``Store.open(directory)`` already running on a thread.

        Opening waits on the disk (lock, ``quick_check``, WAL set-up, a fresh record's schema
        committed with ``synchronous=FULL``); on a thread those waits overlap the app's own
        start. ``opening.result()`` gives the store (or raises what ``open`` raised).
        """
        return StoreOpening(directory)

    @classmethod
    def open_read_only(cls, directory: str | os.PathLike | None = None) -> "Store":
        """Return the store opened only for reading (no lock taken; for ``shopterm export``)."""
        return cls(data_dir(directory), lock=False)

    # ---- opening --------------------------------------------------------------------------

    def _take_lock(self) -> bool:
        try:
            fd = os.open(self.directory / LOCK_NAME, os.O_RDWR | os.O_CREAT, 0o644)
        except OSError as exc:
            raise StoreError(f"Cannot write in the data folder {self.directory} "
                             f"({exc.strerror}); give a folder you can write with --data-dir."
                             ) from None
        try:
            fcntl.flock(fd, fcntl.LOCK_EX | fcntl.LOCK_NB)
        except OSError:
            os.close(fd)
            return False
        self._lock_fd = fd
        return True

    def _connect(self) -> None:
        if self.read_only:
            if not self.path.exists():
                raise StoreError(f"There is no job record in {self.directory} yet; "
                                 "start shopterm there first, or give --data-dir.")
            try:
                self._conn = sqlite3.connect(f"file:{self.path}?mode=ro", uri=True,
                                             isolation_level=None, timeout=5,
                                             check_same_thread=False)
                version = self._conn.execute("PRAGMA user_version").fetchone()[0]
            except sqlite3.DatabaseError as exc:
                raise StoreError(f"The job record {self.path} cannot be read ({exc}); start "
                                 "shopterm there alone to repair it.") from None
            if version > SCHEMA_VERSION:
                raise StoreError(self._newer_words(version))
            if version < SCHEMA_VERSION:
                raise StoreError(f"The job record {self.path} is from an older shopterm; start "
                                 "shopterm there alone once so it can update the record.")
        else:
            self._open_writable()
        row = self._conn.execute("SELECT max(id) FROM jobs").fetchone()
        self._max_job_id = row[0] or 0

    def _newer_words(self, version: int) -> str:
        return (f"The job record {self.path} was written by a newer shopterm (record version "
                f"{version}; this one knows up to {SCHEMA_VERSION}). It has been left untouched: "
                "update shopterm, or use --data-dir to keep a separate record.")

    def _open_writable(self) -> None:
        for attempt in range(2):
            try:
                if attempt == 0 and self.path.exists() and self.path.stat().st_size == 0 \
                        and Path(str(self.path) + "-wal").exists():
                    # SQLite would take an empty file for a new record and drop the log beside it.
                    raise sqlite3.DatabaseError("the record file is empty")
                self._conn = sqlite3.connect(self.path, isolation_level=None, timeout=5,
                                             check_same_thread=False)
                version = self._check()
                break
            except sqlite3.OperationalError as exc:
                # Cannot open or lock the file (permissions, read-only disk): not corruption,
                # so the file is left exactly as it is.
                self._close_conn()
                raise StoreError(f"The job record {self.path} cannot be opened for writing "
                                 f"({exc}); check the card is not full or read-only, or use "
                                 "--data-dir.") from None
            except sqlite3.DatabaseError as exc:
                self._close_conn()
                if attempt:
                    raise StoreError(f"The job record {self.path} cannot be opened ({exc}); "
                                     "use --data-dir to keep the record somewhere else.") from None
                self._set_aside_corrupt(exc)
        if version > SCHEMA_VERSION:
            self._close_conn()
            raise StoreError(self._newer_words(version))
        try:
            self._prepare(version)
        except sqlite3.DatabaseError as exc:
            self._close_conn()
            raise StoreError(f"The job record {self.path} cannot be made ready ({exc}); check "
                             "the card is not full or read-only, or use --data-dir.") from None

    def _close_conn(self) -> None:
        if self._conn is not None:
            try:
                self._conn.close()
            except Exception:  # noqa: BLE001
                pass
            self._conn = None

    def _prepare(self, version: int) -> None:
        self._conn.execute("PRAGMA journal_mode=WAL")
        self._conn.execute("PRAGMA synchronous=FULL")
        self._conn.execute("PRAGMA foreign_keys=ON")
        if version == 0 and not self._has_tables():
            self._run_script(_SCHEMA_V2, SCHEMA_VERSION)
        elif version < SCHEMA_VERSION:
            self._migrate(version)

    def _check(self) -> int:
        c = self._conn
        version = c.execute("PRAGMA user_version").fetchone()[0]
        rows = c.execute("PRAGMA quick_check").fetchall()
        if rows != [("ok",)]:
            raise sqlite3.DatabaseError("; ".join(str(r[0]) for r in rows[:3]))
        if version and version <= SCHEMA_VERSION:
            try:
                c.execute("SELECT count(*) FROM jobs").fetchone()
                c.execute("SELECT count(*) FROM events").fetchone()
            except sqlite3.OperationalError as exc:
                raise sqlite3.DatabaseError(f"tables missing: {exc}") from None
        elif version == 0 and self._has_tables():
            raise sqlite3.DatabaseError("not a shopterm record")
        return version

    def _has_tables(self) -> bool:
        return bool(self._conn.execute(
            "SELECT count(*) FROM sqlite_master WHERE type='table'").fetchone()[0])

    def _set_aside_corrupt(self, exc: BaseException) -> None:
        target = _aside(self.path, "corrupt")
        for suffix in ("", "-wal", "-shm"):
            src = Path(str(self.path) + suffix)
            if src.exists():
                os.replace(src, Path(str(target) + suffix))
        self._notices.append(
            f"The job record could not be read ({exc}); it has been kept as {target.name} and a "
            "fresh record started. Earlier jobs are still in that file, but not shown here.")

    def _migrate(self, version: int) -> None:
        backup = _aside(self.path, f"v{version}-backup")
        dest = sqlite3.connect(backup)
        try:
            self._conn.backup(dest)
        finally:
            dest.close()
        while version < SCHEMA_VERSION:
            self._run_script(MIGRATIONS[version], version + 1)
            version += 1
        self._notices.append(f"The job record was updated to version {SCHEMA_VERSION}; the old "
                             f"one is kept as {backup.name}.")

    def _run_script(self, script: str, version_after: int) -> None:
        """Run ``script`` and set the schema version, all in one transaction."""
        self._conn.execute("BEGIN IMMEDIATE")
        try:
            for stmt in _statements(script):
                self._conn.execute(stmt)
            self._conn.execute(f"PRAGMA user_version={int(version_after)}")
            self._conn.execute("COMMIT")
        except BaseException:
            self._conn.execute("ROLLBACK")
            raise

    def close(self) -> bool:
        """Return True if nothing was left unwritten, after writing what is pending if possible,
        closing the database and releasing the lock."""
        all_written = True
        if self._conn is not None:
            if self._pending and not self.read_only:
                all_written = self.retry()
            try:
                self._conn.close()
            except Exception:
                pass
            self._conn = None
        if self._lock_fd is not None:
            try:
                fcntl.flock(self._lock_fd, fcntl.LOCK_UN)
            finally:
                os.close(self._lock_fd)
                self._lock_fd = None
        return all_written and not self._pending

    def __enter__(self) -> "Store":
        return self

    def __exit__(self, *exc) -> None:
        self.close()

    # ---- health -----------------------------------------------------------------------------

    @property
    def pending(self) -> int:
        """Return how many entries are kept in memory, not yet written."""
        return len(self._pending)

    @property
    def health(self) -> str | None:
        """Return None while every entry is saved, else the warning to show until fixed."""
        if self.read_only:
            return ("Read-only: another shopterm has this record open, so entries here are NOT "
                    "saved. Close the other one and start this one again.")
        if self._fault is None:
            return None
        n = len(self._pending)
        return (f"Entries are NOT being saved: {self._fault}. {n} "
                f"entr{'y is' if n == 1 else 'ies are'} kept in memory and will be written as "
                "soon as the disk takes them (on the next entry, or retry). Free some space or "
                "fix the card; do not switch off.")

    def retry(self) -> bool:
        """Return True when nothing is left unwritten, after trying to write what is pending."""
        if self.read_only:
            return not self._pending
        while self._pending:
            op = self._pending[0]
            try:
                self._write(op)
            except Exception as exc:  # noqa: BLE001 — every write fault is reported, not raised
                if not _is_write_fault(exc):
                    raise
                self._fault = _fault_words(exc)
                return False
            self._pending.pop(0)
            if op[0] == "job":
                self._pending_jobs.pop(op[1].id, None)
        self._fault = None
        return True

    def _write(self, op: tuple) -> None:
        c = self._conn
        c.execute("BEGIN IMMEDIATE")
        try:
            if op[0] == "job":
                j: JobInfo = op[1]
                c.execute("INSERT INTO jobs (id, title, created, status, designation, "
                          "thread_kind, units) VALUES (?, ?, ?, ?, ?, ?, ?)",
                          (j.id, j.title, j.created, j.status, j.designation, j.thread_kind,
                           j.units))
            else:
                from shopterm.job.events import payload_json
                e: Event = op[1]
                c.execute("INSERT INTO events (job_id, seq, kind, payload, at) "
                          "VALUES (?, ?, ?, ?, ?)",
                          (e.job_id, e.seq, e.kind, payload_json(e), e.at))
                c.execute("UPDATE jobs SET status = ? WHERE id = ?", (op[2], e.job_id))
            c.execute("COMMIT")
        except BaseException:
            try:
                c.execute("ROLLBACK")
            except Exception:  # noqa: BLE001 — the transaction may already be gone
                pass
            raise

    def _submit(self, op: tuple) -> bool:
        """Queue ``op`` behind anything pending and write all in order; True if all written."""
        if self.read_only:
            raise StoreError("This copy of shopterm opened the record read-only because another "
                             "copy is using it; the entry was not taken. Use the other copy.")
        self._pending.append(op)
        if op[0] == "job":
            self._pending_jobs[op[1].id] = op[1]
        return self.retry()

    # ---- jobs ---------------------------------------------------------------------------------

    def jobs(self, include_archived: bool = False) -> list[JobInfo]:
        """Return the jobs, newest first (archived ones only if asked)."""
        found: dict[int, JobInfo] = {}
        for r in self._conn.execute("SELECT id, title, created, status, designation, "
                                    "thread_kind, units FROM jobs"):
            found[r[0]] = JobInfo(*r)
        found.update(self._pending_jobs)
        for jid, sess in self._sessions.items():
            if jid in found and found[jid].status != sess.state.status:
                i = found[jid]
                found[jid] = JobInfo(i.id, i.title, i.created, sess.state.status, i.designation,
                                     i.thread_kind, i.units)
        out = sorted(found.values(), key=lambda j: j.id, reverse=True)
        return [j for j in out if include_archived or j.status != "archived"]

    def job(self, job_id: int) -> JobInfo:
        """Return the job numbered ``job_id``; raises ``InvalidEntry`` if there is none."""
        for j in self.jobs(include_archived=True):
            if j.id == job_id:
                return j
        raise InvalidEntry(f"There is no job {job_id}; pick one from the list of jobs.")

    def last_unfinished(self) -> JobInfo | None:
        """Return the newest open job (to offer to resume), or None."""
        return next((j for j in self.jobs() if j.status == "open"), None)

    def events(self, job_id: int) -> list[Event]:
        """Return the job's events as written to the database, oldest first."""
        from shopterm.job.events import event_from_row
        rows = self._conn.execute("SELECT seq, job_id, kind, payload, at FROM events "
                                  "WHERE job_id = ? ORDER BY seq", (job_id,)).fetchall()
        return [event_from_row(*r) for r in rows]

    def new_job(self, designation: str, thread_kind: str = "external", units: str = "mm",
                title: str | None = None) -> "JobSession":
        """Return a session on a new job, its start entry written (or kept, if the disk is full).

        designation — the thread as typed; thread_kind — 'external' or 'internal';
        units — 'mm' or 'in' (how the job shows lengths); title — defaults to the designation.
        """
        from shopterm.job.events import make_event
        from shopterm.job.state import JobState, apply
        payload = {"designation": designation, "thread_kind": thread_kind, "units": units}
        if title:
            payload["title"] = title
        job_id = self._max_job_id + 1
        first = make_event(1, job_id, "job_created", payload)
        state = apply(JobState(), first)
        info = JobInfo(job_id, title or designation.strip(), first.at, "open",
                       designation.strip(), thread_kind, units)
        self._submit(("job", info))
        self._max_job_id = job_id
        session = JobSession(self, info, JobState())
        self._sessions[job_id] = session
        session._record(first, state)
        return session

    def open_job(self, job_id: int) -> "JobSession":
        """Return the session on job ``job_id`` (the same object each time it is asked for)."""
        if job_id in self._sessions:
            return self._sessions[job_id]
        from shopterm.job.state import fold
        info = self.job(job_id)
        try:
            state = fold(self.events(job_id))
        except InvalidEntry as exc:
            raise StoreError(f"Job {job_id}'s record does not add up ({exc}); export it to see "
                             "what is there, and start a new job.") from None
        session = JobSession(self, info, state)
        self._sessions[job_id] = session
        return session

    def finish(self, job_id: int) -> Event:
        """Return the entry that marks job ``job_id`` finished."""
        return self.open_job(job_id).append("job_finished", {})

    def archive(self, job_id: int) -> Event:
        """Return the entry that archives job ``job_id`` (it leaves the usual list)."""
        return self.open_job(job_id).append("job_archived", {})


class StoreOpening:
    """``Store.open(directory)`` on its own thread; ``result()`` waits for it.

    The store is handed over whole: nothing uses it until ``result()`` has returned, and its
    connection is made with ``check_same_thread=False`` so the waiting thread may use it.
    References: Python ``sqlite3`` (``check_same_thread``; the module releases the GIL while
    SQLite works), ``threading``.
    """

    def __init__(self, directory: str | os.PathLike | None = None) -> None:
        import threading
        self._store: Store | None = None
        self._error: BaseException | None = None
        self.seconds = 0.0          # how long opening took on its thread
        self.waited = 0.0           # how long ``result()`` waited for it
        self._thread = threading.Thread(target=self._run, args=(directory,),
                                        name="shopterm-store-open", daemon=True)
        self._thread.start()

    def _run(self, directory) -> None:
        start = time.perf_counter()
        try:
            self._store = Store.open(directory)
        except BaseException as exc:  # noqa: BLE001 — handed to result(), raised there
            self._error = exc
        self.seconds = time.perf_counter() - start

    def result(self) -> Store:
        """Return the opened store once it is open; raise what ``Store.open`` raised."""
        start = time.perf_counter()
        self._thread.join()
        self.waited = time.perf_counter() - start
        if self._error is not None:
            error, self._error = self._error, None
            raise error
        return self._store

    def discard(self) -> None:
        """Close the store if it opened (the app is not starting after all)."""
        self._thread.join()
        if self._store is not None:
            self._store.close()
            self._store = None


class JobSession:
    """One job as a screen holds it: its state, and the way to add entries and undo them."""

    def __init__(self, store: Store, info: JobInfo, state: JobState):
        self.store = store
        self.info = info
        self.state = state

    @property
    def job_id(self) -> int:
        return self.info.id

    @property
    def events(self) -> tuple[Event, ...]:
        return self.state.events

    @property
    def health(self) -> str | None:
        """Return the store's warning while entries are not being saved, else None."""
        return self.store.health

    @property
    def read_only(self) -> bool:
        return self.store.read_only

    def retry(self) -> bool:
        """Return True when every entry is written, after trying again."""
        return self.store.retry()

    def saved(self, seq: int) -> bool:
        """Return whether entry ``seq`` is on disk (False while it waits in memory)."""
        return not any(op[0] == "event" and op[1].job_id == self.job_id and op[1].seq == seq
                       for op in self.store._pending)

    def append(self, kind: str, payload: dict | None = None) -> Event:
        """Return the entry made of ``kind`` and ``payload``, checked, written and committed.

        For ``pass_cut`` a missing ``n`` is filled with the next pass number. Raises
        ``InvalidEntry`` (nothing written, state unchanged) if the entry cannot be taken, and
        ``StoreError`` if this copy is read-only. If the disk refuses the write the entry is
        still taken, kept in memory, and ``health`` says so.
        """
        from shopterm.job.events import make_event
        from shopterm.job.state import apply
        if kind == "pass_cut" and isinstance(payload, dict) and "n" not in payload:
            payload = {**payload, "n": self.state.next_pass}
        event = make_event(self.state.next_seq, self.job_id, kind, payload)
        new_state = apply(self.state, event)
        self._record(event, new_state)
        return event

    def _record(self, event: Event, new_state: JobState) -> None:
        self.store._submit(("event", event, new_state.status))   # StoreError if read-only
        self.state = new_state

    def undo(self, seq: int | None = None) -> Event:
        """Return the undo entry that takes back entry ``seq`` (default: ``undoable()``).

        Raises ``InvalidEntry`` if there is nothing to undo or that entry cannot be undone.
        """
        if seq is None:
            target = self.state.undoable()
            if target is None:
                raise InvalidEntry("There is nothing to undo in this job.")
            seq = target.seq
        return self.append("undo", {"target": seq})

    def undoable(self) -> Event | None:
        """Return the entry ``undo()`` would take back now, or None."""
        return self.state.undoable()

    def finish(self) -> Event:
        return self.append("job_finished", {})

    def archive(self) -> Event:
        return self.append("job_archived", {})


def _statements(script: str) -> list[str]:
    return [s.strip() for s in script.split(";") if s.strip()]
