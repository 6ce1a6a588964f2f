"""Arbitrary entries and undos thrown at a job session (hypothesis).

Whatever is thrown: only InvalidEntry escapes, and it has a message; every entry that was
taken is still there; the state folded again from the database equals the state in memory;
and a full disk in the middle changes none of that once it is fixed.
"""

import os
import sqlite3
import tempfile

from hypothesis import HealthCheck, given, settings, strategies as st

from shopterm.errors import InvalidEntry
from shopterm.job.events import KINDS
from shopterm.job.state import fold
from shopterm.job.store import Store

SCRATCH = "/dev/shm" if os.path.isdir("/dev/shm") and os.access("/dev/shm", os.W_OK) else None

numbers = st.one_of(st.integers(-5, 200), st.floats(allow_nan=True, allow_infinity=True),
                    st.floats(0, 20))
values = st.one_of(numbers, st.text(max_size=12), st.booleans(), st.none(),
                   st.lists(st.integers(0, 127), max_size=4),
                   st.dictionaries(st.text(max_size=4), st.integers(), max_size=2))
keys = st.sampled_from(sorted({k for kind in KINDS.values()
                               for k in (*kind.required, *kind.optional)}) + ["junk"])
payloads = st.one_of(st.dictionaries(keys, values, max_size=5), values)

plausible = st.one_of(
    st.builds(lambda r, d: ("pass_cut", {"radial_cum_mm": r, "dial": d}),
              st.floats(0, 2), st.integers(0, 200)),
    st.builds(lambda t: ("note", {"text": t}), st.text(max_size=30)),
    st.builds(lambda m, p, s: ("wire_reading", {"measured_mm": m, "pd_mm": p, "state": s}),
              st.floats(0, 30), st.floats(0, 30), st.sampled_from(["in band", "oversize", ""])),
    st.just(("spring_pass", {})),
    st.just(("job_finished", {})),
    st.just(("job_archived", {})),
    st.builds(lambda n: ("screen", {"name": n}), st.sampled_from(["passes", "wires", "setup"])),
    st.builds(lambda i: ("checklist_item", {"item": i}), st.sampled_from(["guards", "key out"])),
)
arbitrary = st.tuples(st.sampled_from(sorted(KINDS)) | st.text(max_size=8), payloads)
ops = st.lists(st.one_of(
    plausible.map(lambda kp: ("append", *kp)),
    arbitrary.map(lambda kp: ("append", *kp)),
    st.one_of(st.none(), st.integers(-2, 30)).map(lambda s: ("undo", s)),
    st.sampled_from([("disk_full",), ("disk_ok",)]),
), max_size=25)


class Flaky:
    """The store's connection, with writes failing while ``full`` is set."""

    def __init__(self, real):
        self.real, self.full = real, False

    def execute(self, sql, *args):
        if self.full and sql.lstrip().upper().startswith(("INSERT", "UPDATE")):
            raise sqlite3.OperationalError("database or disk is full")
        return self.real.execute(sql, *args)

    def __getattr__(self, name):
        return getattr(self.real, name)


@settings(max_examples=60, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(ops=ops)
def test_arbitrary_entries_never_break_the_record(ops):
    with tempfile.TemporaryDirectory(dir=SCRATCH) as d:
        store = Store.open(d)
        conn = Flaky(store._conn)
        store._conn = conn
        job = store.new_job("M10x1.5-6g")
        taken = list(job.events)
        for op in ops:
            before = job.state
            try:
                if op[0] == "append":
                    taken.append(job.append(op[1], op[2]))
                elif op[0] == "undo":
                    taken.append(job.undo(op[1]))
                else:
                    conn.full = op[0] == "disk_full"
                    continue
            except InvalidEntry as exc:
                assert str(exc).strip()
                assert job.state is before             # a refused entry changes nothing
            assert list(job.events) == taken           # nothing taken ever disappears
            if store.health is None:
                assert fold(store.events(job.job_id)) == job.state
            else:
                assert "NOT being saved" in store.health
        conn.full = False
        assert store.retry() and store.health is None
        assert store.events(job.job_id) == taken
        assert fold(store.events(job.job_id)) == job.state
        store.close()
        with Store.open(d) as again:                   # and so after a restart
            assert again.open_job(job.job_id).state == job.state
