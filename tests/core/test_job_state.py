"""The pure fold: what a job's events add up to (shopterm.job.state)."""

import pytest

from shopterm.errors import InvalidEntry
from shopterm.job.events import make_event
from shopterm.job.state import JobState, apply, fold

AT = "2024-05-01T10:00:00+01:00"


class Builder:
    """Appends checked events to a list, the way a session does (seq in order)."""

    def __init__(self, designation="M10x1.5-6g", units="mm"):
        self.events = []
        self.state = JobState()
        self.add("job_created", designation=designation, thread_kind="external", units=units)

    def add(self, kind, **payload):
        e = make_event(len(self.events) + 1, 1, kind, payload, at=AT)
        self.state = apply(self.state, e)
        self.events.append(e)
        return e


def cut(b, radial, dial=None):
    extra = {} if dial is None else {"dial": dial}
    return b.add("pass_cut", n=b.state.next_pass, radial_cum_mm=radial, **extra)


def test_fold_equals_stepwise_apply_and_keeps_history():
    b = Builder()
    b.add("setup_confirmed", gears=[20, 40], compound_angle_deg=29.5)
    for i in range(1, 4):
        cut(b, 0.1 * i, dial=10 * i)
    assert fold(b.events) == b.state
    assert len(b.state.events) == 5
    assert [p.n for p in b.state.passes] == [1, 2, 3]
    assert b.state.next_pass == 4
    assert b.state.radial_cum_mm == pytest.approx(0.3)  # the last pass's own value, no source
    assert b.state.setup.values["compound_angle_deg"] == 29.5


def test_undo_removes_the_pass_and_keeps_both_entries():
    b = Builder()
    cut(b, 0.1)
    p2 = cut(b, 0.2)
    assert b.state.undoable() == p2
    b.add("undo", target=p2.seq)
    assert [p.n for p in b.state.passes] == [1]
    assert b.state.next_pass == 2          # the undone pass is cut again as pass 2
    assert b.state.radial_cum_mm == pytest.approx(0.1)  # the entry typed above: record arithmetic, computed in the test
    assert [e.kind for e in b.state.events][-2:] == ["pass_cut", "undo"]
    assert p2.seq in b.state.undone
    assert fold(b.events) == b.state


def test_repeated_undo_walks_back_skipping_screens_and_undos():
    b = Builder()
    n = b.add("note", text="first")
    c = cut(b, 0.05)
    b.add("screen", name="passes")
    assert b.state.undoable() == c
    b.add("undo", target=c.seq)
    assert b.state.undoable() == n
    b.add("undo", target=n.seq)
    assert b.state.undoable() is None
    assert b.state.notes == () and b.state.passes == ()
    assert b.state.last_screen == "passes"


@pytest.mark.parametrize("target, words", [
    (99, "no entry 99"),
    (1, "cannot be undone"),     # the job start
    (3, "cannot be undone"),     # a screen move
])
def test_undo_refusals(target, words):
    b = Builder()
    cut(b, 0.1)
    b.add("screen", name="passes")
    with pytest.raises(InvalidEntry, match=words):
        b.add("undo", target=target)


def test_undoing_twice_or_undoing_an_undo_is_refused():
    b = Builder()
    c = cut(b, 0.1)
    u = b.add("undo", target=c.seq)
    with pytest.raises(InvalidEntry, match="already undone"):
        b.add("undo", target=c.seq)
    with pytest.raises(InvalidEntry, match="cannot be undone"):
        b.add("undo", target=u.seq)


def test_a_pass_with_later_passes_cannot_be_undone_first():
    b = Builder()
    c1 = cut(b, 0.1)
    cut(b, 0.2)
    with pytest.raises(InvalidEntry, match="undo those first"):
        b.add("undo", target=c1.seq)


def test_pass_numbers_must_follow_on():
    b = Builder()
    cut(b, 0.1)
    with pytest.raises(InvalidEntry, match="This is pass 2, not pass 5"):
        b.add("pass_cut", n=5, radial_cum_mm=0.2)
    assert len(b.state.passes) == 1       # the refused entry changed nothing


def test_job_must_begin_with_its_start_and_only_once():
    with pytest.raises(InvalidEntry, match="must begin"):
        apply(JobState(), make_event(1, 1, "note", {"text": "x"}, at=AT))
    b = Builder()
    with pytest.raises(InvalidEntry, match="already been started"):
        b.add("job_created", designation="M6", thread_kind="external", units="mm")


def test_entries_out_of_order_or_from_another_job_are_refused():
    b = Builder()
    with pytest.raises(InvalidEntry, match="numbered in order"):
        apply(b.state, make_event(5, 1, "note", {"text": "x"}, at=AT))
    with pytest.raises(InvalidEntry, match="belongs to job 2"):
        apply(b.state, make_event(2, 2, "note", {"text": "x"}, at=AT))


def test_finished_job_takes_notes_and_undo_only_and_reopens_on_undo():
    b = Builder()
    cut(b, 0.1)
    f = b.add("job_finished")
    assert b.state.status == "finished"
    with pytest.raises(InvalidEntry, match="finished; undo the finish"):
        cut(b, 0.2)
    with pytest.raises(InvalidEntry, match="is finished"):
        b.add("job_finished")
    b.add("note", text="checked with ring gauge")
    b.add("undo", target=f.seq)
    assert b.state.status == "open"
    cut(b, 0.2)
    assert b.state.next_pass == 3


def test_archived_job_changes_only_by_undoing_the_archive():
    b = Builder()
    b.add("job_finished")
    a = b.add("job_archived")
    assert b.state.status == "archived"
    with pytest.raises(InvalidEntry, match="archived"):
        b.add("note", text="x")
    with pytest.raises(InvalidEntry, match="archived"):
        b.add("job_archived")
    b.add("undo", target=a.seq)
    assert b.state.status == "finished"


def test_everything_a_resume_needs():
    b = Builder(units="in")
    b.add("thread_chosen", designation="1/4-20 UNC-2A", tol_class="2A")
    b.add("setup_confirmed", gears=[40, 80], method="flank")
    b.add("checklist_item", item="guards on")
    b.add("checklist_item", item="eye protection")
    b.add("checklist_item", item="guards on", done=False)
    cut(b, 0.2, dial="1 turn + 5")
    b.add("spring_pass", radial_cum_mm=0.2)
    b.add("tool_pickup", reason="reground", radial_cum_mm=0.15)
    b.add("wire_reading", measured_mm=6.6, pd_mm=5.7, state="oversize", pd_max_mm=5.6,
          pd_min_mm=5.5, wire_mm=0.733)
    b.add("screen", name="wires", context={"field": "measured"})
    s = b.state
    assert s.current_designation == "1/4-20 UNC-2A" and s.designation == "M10x1.5-6g"
    assert s.units == "in"
    assert s.checklist_done() == {"eye protection"}
    assert s.last_pass.dial == "1 turn + 5"
    assert s.radial_cum_mm == pytest.approx(0.15)  # the tool pick-up came last, no source
    assert s.last_reading.state == "oversize" and s.last_reading.wire_mm == 0.733  # the reading entered above, computed in the test
    assert (s.last_screen, s.last_screen_context) == ("wires", {"field": "measured"})
    assert s.pickups[0].reason == "reground"


def test_undoing_the_latest_setup_brings_back_the_one_before():
    b = Builder()
    b.add("setup_confirmed", gears=[20, 40])
    s2 = b.add("setup_confirmed", gears=[30, 40])
    b.add("undo", target=s2.seq)
    assert b.state.setup.values["gears"] == [20, 40]
