"""``shopterm export JOB [--format csv|json|card] [-o FILE] [--data-dir DIR]``.

JOB is a job number, or ``last`` for the newest job. The record is opened read-only, so a
running shopterm on the same data is not disturbed.
"""

from __future__ import annotations

import sys
from pathlib import Path

from shopterm.errors import InvalidEntry
from shopterm.job.export import write_whole


def register(subparsers) -> None:
    """Add the ``export`` subcommand to the top-level parser."""
    p = subparsers.add_parser(
        "export", help="write a job out as CSV, JSON or a printable job card",
        description="Write one job out: csv (one row per entry), json (the whole job), "
                    "card (plain text to print and keep with the part).")
    p.add_argument("job", metavar="JOB", help="job number, or 'last' for the newest job")
    p.add_argument("--format", "-f", dest="export_format", default="card",
                   choices=("csv", "json", "card"), help="what to write (default: card)")
    p.add_argument("-o", "--output", metavar="FILE",
                   help="write to FILE instead of the screen ('-' for the screen)")
    # A separate dest, so that `shopterm --data-dir X export 1` is not reset by this default.
    p.add_argument("--data-dir", dest="export_data_dir", metavar="DIR",
                   help="where the job record is kept")
    p.set_defaults(func=run)


def _job_id(text: str, store) -> int:
    t = text.strip().lower()
    if t == "last":
        jobs = store.jobs(include_archived=True)
        if not jobs:
            raise InvalidEntry("There are no jobs in the record yet; there is nothing to export.")
        return jobs[0].id
    try:
        n = int(t)
    except ValueError:
        raise InvalidEntry(f"{text!r} is not a job: give a job number such as 3, or 'last'."
                           ) from None
    store.job(n)          # InvalidEntry if there is no such job
    return n


def run(args) -> int:
    """Write the job out; return 0 (errors are raised as ``ShoptermError`` for the CLI)."""
    from shopterm.job.export import export
    from shopterm.job.store import Store

    directory = getattr(args, "export_data_dir", None) or getattr(args, "data_dir", None)
    store = Store.open_read_only(directory)
    try:
        job_id = _job_id(args.job, store)
        text = export(store.events(job_id), args.export_format,
                      store.job(job_id).status)
    finally:
        store.close()
    out = args.output
    if not out or out == "-":
        sys.stdout.write(text)
        sys.stdout.flush()
        return 0
    _write_file(Path(out), text)
    print(f"Job {job_id} written to {out} ({args.export_format}).", file=sys.stderr)
    return 0


def _write_file(path: Path, text: str) -> None:
    """Write ``text`` to ``path`` whole or not at all; a failure says what to do."""
    try:
        write_whole(path, text)
    except OSError as exc:
        raise InvalidEntry(f"Cannot write {path} ({exc.strerror or exc}); give another file "
                           "with -o.") from None
