"""Event kinds and payload checks (shopterm.job.events)."""

import json
import math

import pytest
from hypothesis import given, settings, strategies as st

from shopterm.errors import InvalidEntry
from shopterm.job.events import KINDS, Event, check_payload, event_from_row, make_event, \
    payload_json

# Minimal valid payloads, one per kind (the project's own record format, no external source).
GOOD = {
    "job_created": {"designation": "M10x1.5-6g", "thread_kind": "external", "units": "mm"},
    "thread_chosen": {"designation": "1/4-20 UNC-2A", "tol_class": "2A"},
    "setup_confirmed": {"gears": [20, 60, 40], "compound_angle_deg": 29.5, "tool": "HSS 60",
                        "method": "flank", "blank_od_mm": 9.95},
    "checklist_item": {"item": "chuck key out"},
    "pass_cut": {"n": 1, "radial_cum_mm": 0.1, "dial": 10},
    "spring_pass": {},
    "wire_reading": {"measured_mm": 10.1, "pd_mm": 8.95, "state": "in band"},
    "tool_pickup": {"reason": "reground", "radial_cum_mm": 0.4},
    "note": {"text": "coolant topped up"},
    "screen": {"name": "passes", "context": {"page": 1}},
    "job_finished": {},
    "job_archived": {},
    "undo": {"target": 2},
}


def test_every_kind_has_a_good_example():
    assert set(GOOD) == set(KINDS)


@pytest.mark.parametrize("kind", sorted(GOOD))
def test_good_payload_round_trips_through_json(kind):
    clean = check_payload(kind, GOOD[kind])
    assert clean == GOOD[kind]
    e = make_event(3, 7, kind, GOOD[kind], at="2024-05-01T10:00:00+01:00")
    back = event_from_row(e.seq, e.job_id, e.kind, payload_json(e), e.at)
    assert back == e


@pytest.mark.parametrize("kind, payload, words", [
    ("cut", {}, "not something a job records"),
    ("pass_cut", {"radial_cum_mm": 0.1}, "needs 'n'"),
    ("pass_cut", {"n": 0, "radial_cum_mm": 0.1}, "whole number"),
    ("pass_cut", {"n": True, "radial_cum_mm": 0.1}, "whole number"),
    ("pass_cut", {"n": 1, "radial_cum_mm": -0.1}, "zero or more"),
    ("pass_cut", {"n": 1, "radial_cum_mm": "0.1"}, "zero or more"),
    ("pass_cut", {"n": 1, "radial_cum_mm": math.inf}, "not infinite"),
    ("wire_reading", {"measured_mm": 0, "pd_mm": 8.9, "state": "x"}, "greater than zero"),
    ("wire_reading", {"measured_mm": 10.1, "pd_mm": math.nan, "state": "x"}, "number"),
    ("note", {"text": "   "}, "not empty"),
    ("note", {"text": "a", "colour": "red"}, "has no 'colour'"),
    ("job_finished", {"x": 1}, "takes: note"),
    ("job_archived", {"x": 1}, "takes no details"),
    ("tool_pickup", {"reason": "broke"}, "reground, picked_up"),
    ("job_created", {"designation": "M6", "thread_kind": "both", "units": "mm"}, "external"),
    ("job_created", {"designation": "M6", "thread_kind": "external", "units": "cm"}, "mm, in"),
    ("setup_confirmed", {"gears": {1: 2}}, "names that are text"),
    ("setup_confirmed", {"gears": object()}, "plain values"),
    ("setup_confirmed", {"x": "y" * 70000}, "too long"),
    ("note", "pass 3", "set of named values"),
    ("note", {"text": "Hand-tight check", "hand_tight": 2.5}, "set of named values"),
])
def test_bad_payloads_are_refused_with_a_message(kind, payload, words):
    with pytest.raises(InvalidEntry, match=words.replace("(", r"\(")):
        check_payload(kind, payload)


def test_missing_payload_counts_as_empty():
    assert check_payload("spring_pass", None) == {}
    with pytest.raises(InvalidEntry, match="needs 'text'"):
        check_payload("note", None)


def test_tuple_values_become_lists_so_memory_equals_disk():
    clean = check_payload("setup_confirmed", {"gears": (20, 40)})
    assert clean == {"gears": [20, 40]}


def test_which_kinds_may_be_undone():
    # The job's own rule (state.py docstring), no external source.
    assert {k for k, v in KINDS.items() if not v.undoable} == {"job_created", "screen", "undo"}
    e = Event(1, 1, "screen", {"name": "x"}, "2024-01-01T00:00:00+00:00")
    assert not e.undoable and e.title == "screen"


json_values = st.recursive(
    st.none() | st.booleans() | st.integers() | st.floats(allow_nan=True) | st.text(max_size=20),
    lambda inner: st.lists(inner, max_size=4) | st.dictionaries(st.text(max_size=8), inner,
                                                                 max_size=4),
    max_leaves=12)


@settings(max_examples=150, deadline=None)
@given(kind=st.sampled_from(sorted(KINDS)) | st.text(max_size=12),
       payload=st.dictionaries(st.sampled_from(["n", "radial_cum_mm", "text", "item", "name",
                                                "designation", "thread_kind", "units", "target",
                                                "measured_mm", "pd_mm", "state", "reason",
                                                "dial", "context"]) | st.text(max_size=6),
                               json_values, max_size=5) | json_values)
def test_check_payload_only_ever_raises_invalid_entry(kind, payload):
    try:
        clean = check_payload(kind, payload)
    except InvalidEntry as exc:
        assert str(exc)
        return
    # What is accepted survives a JSON round trip unchanged.
    assert json.loads(json.dumps(clean, allow_nan=False)) == clean
