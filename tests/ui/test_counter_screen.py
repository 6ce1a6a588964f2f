"""The pass counter at 80x24, keypad keys only: prepare, cut, undo, spring pass, pick up, replan.

The sample config's demo lathe: display in inches, compound and cross-slide dials 0.001 in per
division (on radius), 100 divisions; compound scale zeroed along the cross-slide; tool tip
nose radius 0.004 in.
"""

import math
import re

import pytest

from shopterm.standards import parse
from tests.ui.conftest import screen_text

pytestmark = pytest.mark.asyncio

IN = 25.4                    # NIST SP 811: 1 in = 25.4 mm exactly
P = 1.5                      # ISO 261: M10 coarse pitch
PD_MAX, PD_MIN = 8.994, 8.862  # ISO 965-2, M10x1.5-6g d2 max / min
DIV = 0.001 * IN             # sample config: 0.001 in per division, on radius
OD_IN = 0.388                # the blank as "measured" in these tests [in]
TIP_R = 0.004 * IN           # sample config: nose radius 0.004 in
ANGLE = 29.5                 # US Navy machinery training manual: compound 29.5° for 60° threads


def expected_pass_counts(tip_r=TIP_R, od=OD_IN * IN):
    """Re-derive the plan's compound counts independently.

    Total radial = (OD − PD aim)/2 + (P/4)·cot 30° − r·(1/sin 30° − 1)   # computed from the
    ISO 68-1 basic profile (groove P/2 wide at the pitch line) and a nose radius tangent to
    both flanks; passes n = ⌈0.3·(ap/0.2)²⌉ + 1 and cumulative Δap_x = ap/√(n−1)·√φ   #
    computed from the constant chip-area formula, threading-tool handbooks (constant chip area) (threading-tool
    handbooks); compound travel = radial / cos 29.5°.
    """
    aim = (PD_MAX + PD_MIN) / 2
    ap = (od - aim) / 2 + P / 4 / math.tan(math.radians(30)) - tip_r * (1 / math.sin(math.radians(30)) - 1)
    n = math.ceil(0.3 * (ap / 0.2) ** 2 - 1e-9) + 1
    counts = []
    for x in range(1, n + 1):
        phi = 0.3 if x == 1 else 1.0 if x == 2 else x - 1.0
        cum = ap if x == n else ap / math.sqrt(n - 1) * math.sqrt(phi)
        counts.append(math.floor(cum / math.cos(math.radians(ANGLE)) / DIV + 0.5))
    return ap, n, counts


async def open_counter(app, pilot, designation="M10x1.5-6g"):
    app.thread_chosen(parse(designation))
    app.goto("counter")
    await pilot.pause()


async def prepare(pilot, od="0.388"):
    await pilot.press(*[("full_stop" if c == "." else c) for c in od])
    await pilot.press("enter")          # the size
    await pilot.press("enter")          # confirm the preparation


async def test_prepare_then_first_pass_dial_from_published_plan(make_app):
    app = make_app(start_screen="thread")
    ap, n, counts = expected_pass_counts()
    async with app.run_test(size=(80, 24)) as pilot:
        await open_counter(app, pilot)
        text = screen_text(app)
        assert "Before the first pass" in text
        assert "eye protection" in text and "Chuck key" in text and "half nut" in text
        assert "no gloves, loose sleeves" in text
        assert "SET 29.5° on its scale" in text       # US Navy training manual, 29.5° for 60°
        await pilot.press("full_stop", "3", "8", "8", "enter")
        text = screen_text(app)
        # computed from ISO 68-1 geometry and the measured OD (see expected_pass_counts)
        assert f"Total infeed {ap / IN:.4f} in radial" in text
        assert "basic depth 0.0362 in" in text        # ISO 68-1: h3 = 0.613435P = 0.920 mm
        assert "Tool check FAILS" in text              # ISO 965-1: root radius ≥ 0.125P = 0.1875
        assert app.state.setups == ()                  # nothing recorded before Enter
        await pilot.press("enter")
        values = app.setup_values()
        assert values["blank_od_mm"] == pytest.approx(OD_IN * IN)
        assert values["method"] == "modified" and values["plan"] == "constant-area"
        assert values["compound_angle_deg"] == 29.5 and values["compound_angle_set"] == 29.5
        assert values["tool_kind"] == "radius" and values["tool_size_mm"] == pytest.approx(TIP_R)
        assert values["passes"] == n and values["spring_passes"] == 1
        text = screen_text(app)
        assert f"Pass 1 of {n}" in text
        assert f"Set-up recorded: {n} passes" in text   # said by the preparation, shown here
        assert f"COMPOUND dial: set mark {counts[0]}" in text
        assert "Cross-slide back to 0 every pass" in text
        assert "Before the first pass" in text          # cautions still shown before pass 1
        await pilot.press("enter")                      # pass 1 cut
        assert len(app.state.passes) == 1
        rec = app.state.passes[0]
        # the rounded dial count sets the depth: count · 0.001 in · cos 29.5°
        assert rec.radial_cum_mm == pytest.approx(counts[0] * DIV * math.cos(math.radians(ANGLE)))
        assert rec.payload["compound_mm"] == pytest.approx(counts[0] * DIV)
        assert rec.payload["cross_mm"] == 0.0 and rec.n == 1
        text = screen_text(app)
        assert f"Pass 2 of {n}" in text and f"set mark {counts[1]}" in text
        assert "Pass 1 recorded" in text


async def test_undo_spring_pass_and_restart_resumes(make_app):
    app = make_app(start_screen="thread")
    ap, n, counts = expected_pass_counts()
    async with app.run_test(size=(80, 24)) as pilot:
        await open_counter(app, pilot)
        await prepare(pilot)
        await pilot.press("enter", "enter")             # passes 1 and 2
        assert [p.n for p in app.state.passes] == [1, 2]
        await pilot.press("slash")                      # undo asks …
        assert len(app.state.passes) == 2
        await pilot.press("enter")                      # … Enter undoes pass 2
        assert [p.n for p in app.state.passes] == [1]
        assert f"Pass 2 of {n}" in screen_text(app)
        await pilot.press("0")                          # a spring pass at the depth reached
        assert len(app.state.spring_passes) == 1
        assert app.state.spring_passes[0].radial_cum_mm == pytest.approx(
            app.state.passes[0].radial_cum_mm)
        assert f"Pass 2 of {n}" in screen_text(app)     # a spring pass does not move the count
        job_id = app.job.job_id
    again = make_app(start_screen="thread")
    async with again.run_test(size=(80, 24)) as pilot:
        assert again.open_job(job_id)
        await pilot.pause()
        text = screen_text(again)
        assert f"Pass 2 of {n}" in text and f"set mark {counts[1]}" in text


async def test_all_passes_then_spring_and_done(make_app):
    app = make_app(start_screen="thread")
    _, n, counts = expected_pass_counts()
    async with app.run_test(size=(80, 24)) as pilot:
        await open_counter(app, pilot)
        await prepare(pilot)
        for _ in range(n):
            await pilot.press("enter")
        assert len(app.state.passes) == n
        text = screen_text(app)
        assert "Spring pass 1 of 1" in text and f"set mark {counts[-1]}" in text
        await pilot.press("enter")                      # Enter is not a spring pass
        assert len(app.state.passes) == n and "press 0" in screen_text(app)
        await pilot.press("0")
        text = screen_text(app)
        assert f"All {n} passes cut" in text
        await pilot.press("enter")
        assert len(app.state.passes) == n               # nothing more to record


async def test_pickup_gives_new_zero_and_count_goes_on(make_app):
    app = make_app(start_screen="thread")
    _, n, counts = expected_pass_counts()
    async with app.run_test(size=(80, 24)) as pilot:
        await open_counter(app, pilot)
        await prepare(pilot)
        await pilot.press("enter")                      # pass 1 at counts[0]
        await pilot.press("1")                          # pick-up flow
        text = screen_text(app)
        assert "isolator" in text and "new zero" in text
        await pilot.press("1")                          # tool reground
        await pilot.press("1", "2", "0", "enter")       # a mark past the 100-line dial: refused
        assert "from 0 to under 100" in screen_text(app)
        assert app.state.pickups == ()
        assert app.screen.query_one("#value").value == "120"   # kept to correct
        await pilot.press("backspace", "backspace", "backspace", "5", "0", "enter")  # compound 50
        await pilot.press("2", "0", "enter")            # cross-slide reads 20
        assert len(app.state.pickups) == 1
        pk = app.state.pickups[0]
        assert pk.reason == "reground"
        assert pk.radial_cum_mm == pytest.approx(app.state.passes[0].radial_cum_mm)
        text = screen_text(app)
        # new zero = reading now − count done (arithmetic of a graduated dial)
        mark2 = (50 - counts[0] + counts[1]) % 100
        assert f"Pass 2 of {n}" in text and f"set mark {mark2}" in text
        assert "Cross-slide back to 20 every pass" in text
        await pilot.press("1", "minus")                 # a started pick-up can be cancelled
        assert len(app.state.pickups) == 1 and "cancelled" in screen_text(app)


async def test_bad_entries_keep_what_was_typed(make_app):
    app = make_app(start_screen="thread")
    async with app.run_test(size=(80, 24)) as pilot:
        await open_counter(app, pilot)
        await pilot.press("enter")                      # confirm with no OD: told what to do
        assert "Measure the blank's OD" in screen_text(app)
        await pilot.press("3", "enter")                 # 3 in: far from an M10
        text = screen_text(app)
        assert "far from this thread's size" in text
        assert app.screen.query_one("#od").value == "3"
        assert app.state.setups == ()
        await pilot.press("backspace", "full_stop", "3", "8", "8", "enter")
        await pilot.press("6", "0", "enter")            # 0 passes refused, entry kept
        assert "whole number from 1" in screen_text(app)
        assert app.screen.query_one("#value").value == "0"
        await pilot.press("backspace", "5", "enter")
        await pilot.press("4", "1")                     # method: radial
        await pilot.press("enter")
        values = app.setup_values()
        assert values["passes"] == 5 and values["method"] == "radial"
        assert values["compound_angle_deg"] == 0.0
        assert "CROSS-SLIDE dial" in screen_text(app)


async def test_replan_after_wire_reading(make_app):
    app = make_app(start_screen="thread")
    async with app.run_test(size=(80, 24)) as pilot:
        await open_counter(app, pilot)
        await prepare(pilot)
        for _ in range(3):
            await pilot.press("enter")
        done = app.state.passes[-1].radial_cum_mm
        pd_now = 9.100                                  # a reading above the 6g band
        app.record("wire_reading", {"measured_mm": 10.4, "pd_mm": pd_now, "state": "oversize"})
        app.screen.job_changed()
        await pilot.pause()
        text = screen_text(app)
        assert "Replanned from wire reading" in text
        # radial left = (PD now − aim)/2, aim = mid of ISO 965-2 6g band
        left = (pd_now - (PD_MAX + PD_MIN) / 2) / 2
        total = done + left
        shown = float(re.search(r"of ([0-9.]+) in \(radial\)", text).group(1))
        # the last pass is set to a whole division: within half a division on the compound
        assert abs(shown - total / IN) <= 0.0005 * math.cos(math.radians(ANGLE)) + 0.00005
        assert "Pass 4 of" in text
        assert "Before the first pass" not in text       # set-up cautions only before pass 1


async def test_counter_fits_100x30_and_internal_bore(make_app):
    app = make_app(start_screen="thread")
    async with app.run_test(size=(100, 30)) as pilot:
        await open_counter(app, pilot, "M10x1.5-6H")
        text = screen_text(app)
        assert "bore measured" in text
        assert "Bore to" in text and "8.526 mm" in text   # mid of ISO 965-2 6H D1 8.376/8.676
        assert "boring bar" in text or "page 1/" in text
