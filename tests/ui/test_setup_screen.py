"""The lathe set-up screen at 80x24 (and 100x30), keypad keys only.

The trains shown are checked against a brute force of the sample lathe's own gears done here
with ``fractions.Fraction``; the dial plan against the carriage/dial arithmetic done here in
integers; the indexing numbers against the sample config's plate, spindle gear and compound dial.
"""

from __future__ import annotations

import json
import re
import sys
from dataclasses import replace
from fractions import Fraction
from functools import lru_cache
from itertools import product
from pathlib import Path

import pytest
from hypothesis import given, settings, strategies as st

from shopterm.lathe.gears import trains_for_lathe
from shopterm.lathe.machine import GearboxPosition
from shopterm.standards import parse
from shopterm.ui.screens.setup import (index_phrase, made_lead, plan_for, plan_payload,
                                       same_values, train_gears, train_payload, usable_methods)
from tests.ui.conftest import screen_lines, screen_text

sys.path.insert(0, str(Path(__file__).resolve().parents[2]))
from tests.glyphs import missing_glyphs  # noqa: E402

# sample_config.toml [leadscrew] tpi = 8: pitch 25.4/8 mm, exactly (1 in = 25.4 mm, ISO 31-1)
LEADSCREW_MM = Fraction(254, 10) / 8
# sample_config.toml [change_gears]: teeth = how many owned
OWNED = {20: 2, 25: 1, 30: 1, 35: 1, 40: 2, 45: 1, 50: 1, 55: 1, 60: 1, 65: 1, 70: 1, 75: 1,
         80: 1, 127: 1}
CLEARANCE = 15          # sample_config.toml [gear_train] clearance = 15
DIAL_TEETH, DIAL_LINES = 16, 8   # sample_config.toml [thread_dial] teeth = 16, lines = 8
SHOWN = 6               # rows the screen offers


@lru_cache(maxsize=None)
def sample_lathe():
    from shopterm.config import load_config
    from shopterm.resources import sample_config_path
    return load_config(sample_config_path()).lathe


def owns(*teeth: int) -> bool:
    return all(list(teeth).count(t) <= OWNED[t] for t in set(teeth))


@lru_cache(maxsize=None)
def every_lead() -> frozenset[Fraction]:
    """Every lead the sample gears can make: leadscrew × Π drivers / Π driven, with the clearance
    rule for compound trains. # computed from Rose, Modern Machine Shop Practice (work pitch = leadscrew
    pitch × Π drivers / Π driven; a pair exceeds the third gear by the clearance, common practice)
    """
    teeth = sorted(OWNED)
    out = {LEADSCREW_MM * Fraction(a, b) for a, b in product(teeth, repeat=2) if owns(a, b)}
    for a, b, c, d in product(teeth, repeat=4):
        if a + b >= c + CLEARANCE and c + d >= b + CLEARANCE and owns(a, b, c, d):
            out.add(LEADSCREW_MM * Fraction(a * c, b * d))
    return frozenset(out)


def row_lead(row: str) -> Fraction:
    """Return the lead the gears written in a screen row make, re-derived with Fraction."""
    if m := re.search(r"(\d+) > idler > (\d+)", row):
        return LEADSCREW_MM * Fraction(int(m[1]), int(m[2]))
    m = re.search(r"(\d+)/(\d+) x (\d+)/(\d+)", row)
    a, b, c, d = (int(x) for x in m.groups())
    return LEADSCREW_MM * Fraction(a * c, b * d)


def gear_rows(app) -> list[str]:
    return [line for line in screen_lines(app) if re.match(r"^\s+[1-9] (\d|box)", line)]


async def open_setup(app, pilot, designation: str, starts: int = 1):
    spec = parse(designation)
    if starts != 1:
        spec = spec.with_(starts=starts)
    assert app.thread_chosen(spec)
    app.goto("setup")
    await pilot.pause()
    await app.workers.wait_for_complete()
    await pilot.pause()
    return spec


@pytest.mark.parametrize("designation,lead", [
    ("M10x1.5-6g", Fraction(3, 2)),                # ISO 261, M10 coarse pitch 1.5 mm
    ("1/4-20 UNC-2A", Fraction(254, 10) / 20),     # ASME B1.1, 1/4-20 UNC: 20 tpi
    ("5/8 BSW", Fraction(254, 10) / 11),           # BS 84, 5/8 BSW: 11 tpi
])
async def test_trains_shown_are_the_best_the_gears_can_make(make_app, designation, lead):
    app = make_app()
    async with app.run_test(size=(80, 24)) as pilot:
        await open_setup(app, pilot, designation)
        rows = gear_rows(app)
        assert len(rows) == SHOWN
        made = [row_lead(r) for r in rows]
        errors = [abs(m / lead - 1) for m in made]
        assert errors == sorted(errors)                          # best first
        ranked = sorted(every_lead(), key=lambda m: abs(m / lead - 1))
        cutoff = abs(ranked[SHOWN - 1] / lead - 1)
        assert set(made) >= {m for m in ranked if abs(m / lead - 1) < cutoff}
        assert all(e <= cutoff for e in errors)
        for row, m in zip(rows, made):
            rel = m / lead - 1
            if rel == 0:
                assert "exact" in row
            else:
                # computed from (lead made / lead wanted − 1): %, × 25 mm, × 1 in
                assert f"{float(rel * 100):+.4f}%" in row
                assert f"{float(rel * 25):+.4f} mm" in row
                assert f"{float(rel):+.5f} in" in row
        text = screen_text(app)
        assert "…" not in text                                   # nothing cut off at 80x24
        assert missing_glyphs(text) == set()                     # drawable on the console


async def test_metric_on_inch_leadscrew_exact_train_and_half_nut_closed(make_app):
    app = make_app()
    async with app.run_test(size=(80, 24)) as pilot:
        await open_setup(app, pilot, "M10x1.5-6g")
        # 127/40 × 60/127 = 3/2 exactly # computed from Rose, Modern Machine Shop Practice (127 = 5 × 25.4)
        assert LEADSCREW_MM * Fraction(60, 127) == Fraction(3, 2)
        assert "60 > idler > 127" in gear_rows(app)[0] and "exact" in gear_rows(app)[0]
        text = screen_text(app)
        assert "Driver 60 on the stud" in text and "driven 127 on the" in text
        # 16 × (127/40) / (3/2) is not whole: no dial line repeats # Jones, Turning and Boring (1914)
        assert (DIAL_TEETH * LEADSCREW_MM / Fraction(3, 2)).denominator != 1
        assert "Keep the half nut closed" in text
        assert "switched off" in text                            # safety note on changing gears


async def test_pick_second_train_confirm_and_payload(make_app):
    app = make_app()
    async with app.run_test(size=(80, 24)) as pilot:
        await open_setup(app, pilot, "M10x1.5-6g")
        second = gear_rows(app)[1]
        await pilot.press("2")            # second train
        assert "how is the work held" in screen_text(app)
        await pilot.press("1")            # in a chuck
        await pilot.press("2")            # run out to a mark
        assert "All answered" in screen_text(app)
        await pilot.press("plus")         # not recorded yet: refused, says why
        assert app.current_name == "setup"
        assert "Enter records this set-up first" in screen_text(app)
        await pilot.press("enter")
        values = app.setup_values()
        m = re.search(r"(\d+)/(\d+) x (\d+)/(\d+)", second)
        a, b, c, d = (int(x) for x in m.groups())
        train = values["train"]
        assert train["drivers"] == [a, c] and train["driven"] == [b, d]
        assert Fraction(train["ratio"]) == Fraction(a * c, b * d)
        # computed from leadscrew × A·C / (B·D), Rose, Modern Machine Shop Practice
        assert train["lead_made_mm"] == pytest.approx(float(LEADSCREW_MM * Fraction(a * c, b * d)))
        assert train["error_pct"] == pytest.approx(
            float((LEADSCREW_MM * Fraction(a * c, b * d) / Fraction(3, 2) - 1) * 100))
        assert values["box"] is None
        assert values["between_centres"] is False and values["relief"] is False
        assert values["dial_plan"]["keep_half_nut_closed"] is True
        assert values["dial_plan"]["text"].startswith("Keep the half nut closed")
        assert values["indexing"] is None and values["for_thread"] == "M10x1.5-6g"
        assert "recorded" in screen_text(app)
        await pilot.press("plus")
        assert app.current_name == "checklist"


async def test_inch_thread_dial_lines_and_recorded_plan(make_app):
    app = make_app()
    async with app.run_test(size=(80, 24)) as pilot:
        await open_setup(app, pilot, "5/8 BSW")   # BS 84: 11 tpi
        lead = Fraction(254, 10) / 11
        # line k is (k−1)·T/K teeth on; usable when that many leadscrew pitches are whole leads
        # and a whole dial turn is too # computed from (Jones)
        step = DIAL_TEETH // DIAL_LINES
        assert (DIAL_TEETH * LEADSCREW_MM / lead).denominator == 1
        lines = [k for k in range(1, DIAL_LINES + 1)
                 if ((k - 1) * step * LEADSCREW_MM / lead).denominator == 1]
        assert lines == [1, 5]
        assert "Close the half nut on lines 1 or 5." in screen_text(app)
        await pilot.press("1", "2", "1", "enter")
        assert app.setup_values()["dial_plan"]["lines"] == lines
        assert app.setup_values()["between_centres"] is True


async def test_enter_before_holding_is_answered_asks_for_it(make_app):
    app = make_app()
    async with app.run_test(size=(80, 24)) as pilot:
        await open_setup(app, pilot, "M10x1.5-6g")
        await pilot.press("enter")
        text = screen_text(app)
        assert "Say how the work is held first" in text
        assert "how is the work held?" in text
        assert app.state.setup is None                    # nothing recorded
        await pilot.press("minus")                        # back a question: the gears again
        assert "change gears" in screen_text(app)


async def test_arrow_keys_change_the_answer_and_minus_goes_back(make_app):
    app = make_app()
    async with app.run_test(size=(80, 24)) as pilot:
        await open_setup(app, pilot, "M10x1.5-6g")
        rows = gear_rows(app)
        await pilot.press("down")                         # NumLock off: ↓ picks the next train
        assert rows[1].split()[1] in screen_text(app).split("Half nut")[0]
        await pilot.press("right")                        # = +: next question, answer kept
        assert "how is the work held" in screen_text(app)
        await pilot.press("left", "left")                 # = -: the gears, then the thread
        assert app.current_name == "thread"


async def test_two_start_thread_offers_indexing_with_numbers(make_app):
    app = make_app()
    async with app.run_test(size=(80, 24)) as pilot:
        spec = await open_setup(app, pilot, "M10x1.5-6g", starts=2)
        await pilot.press("1", "2", "1")                  # best train, between centres, relief
        text = screen_text(app)
        assert "Question 4 of 4: index to the next of 2 starts" in text
        # sample_config.toml [indexing] driving_plate_slots = 4, spindle_gear = 60
        assert "Driving plate: 2 slots on per start (4 slots)." in text      # 4 / 2
        assert "Spindle gear: 30 teeth on per start (60 teeth)." in text     # 60 / 2
        # pitch 1.5 mm over 0.001 in per division (sample_config.toml [compound])
        # computed from 1.5 / 0.0254 = 59.055
        assert f"{1.5 / 0.0254:.3f} div per start (not whole)" in text
        assert "4-jaw chuck" not in text.split("Not here")[0]   # between centres: no chucks
        assert text.splitlines()[-1].strip().startswith("Enter")   # key bar not pushed off
        rows = [ln for ln in screen_lines(app) if re.match(r"^\s+\d [A-Z]", ln)]
        plate = next(i for i, ln in enumerate(rows) if "Driving plate" in ln) + 1
        await pilot.press(str(plate), "enter")
        values = app.setup_values()
        assert values["indexing"] == "driving plate, 2 slots per start"
        assert values["indexing_method"] == "plate" and values["starts"] == spec.starts


async def test_two_start_in_chuck_offers_jaws_not_plate(make_app):
    app = make_app()
    async with app.run_test(size=(100, 30)) as pilot:
        await open_setup(app, pilot, "M10x1.5-6g", starts=2)
        await pilot.press("1", "1", "1")                  # best train, in a chuck, relief
        text = screen_text(app)
        assert "4-jaw chuck: 2 jaws on per start (4 jaws)." in text          # 4 / 2
        assert "Driving plate" not in text.split("Not here")[0]
        assert "3-jaw chuck" in text.split("Not here")[1]  # 3 jaws do not divide by 2
        assert missing_glyphs(text) == set()


async def test_gearbox_only_lathe_records_box(make_app):
    app = make_app()
    # an invented quick-change box for the test (demo data): A = 1/2, B = 1/1
    app.lathe = replace(app.lathe, gears=(), gearbox=(GearboxPosition("A", Fraction(1, 2)),
                                                      GearboxPosition("B", Fraction(1))))
    async with app.run_test(size=(80, 24)) as pilot:
        await open_setup(app, pilot, "3/8-16 UNC-2A")    # ASME B1.1: 16 tpi
        # 8 tpi × 1/2 = 16 tpi, exactly # computed from Rose, Modern Machine Shop Practice
        assert LEADSCREW_MM * Fraction(1, 2) == Fraction(254, 10) / 16
        assert "box A alone" in gear_rows(app)[0] and "exact" in gear_rows(app)[0]
        assert "Set the gearbox to A" in screen_text(app)
        await pilot.press("1", "1", "1", "enter")
        values = app.setup_values()
        assert values["box"] == "A" and values["train"] is None


async def test_no_gears_in_config_says_what_to_do_and_records_nothing(make_app):
    app = make_app()
    app.lathe = replace(app.lathe, gears=(), gearbox=())
    async with app.run_test(size=(80, 24)) as pilot:
        await open_setup(app, pilot, "M10x1.5-6g")
        assert "list the change gears you own" in screen_text(app)
        await pilot.press("enter")
        assert "Nothing to record" in screen_text(app)
        assert app.state.setup is None


async def test_no_thread_chosen(make_app):
    app = make_app(start_screen="setup")
    async with app.run_test(size=(80, 24)) as pilot:
        await pilot.pause()
        assert "Choose a thread first" in screen_text(app)
        await pilot.press("enter")
        assert "Choose a thread first" in screen_text(app)


async def test_undo_of_the_set_up_shows_not_recorded_and_keeps_answers(make_app):
    app = make_app()
    async with app.run_test(size=(80, 24)) as pilot:
        await open_setup(app, pilot, "M10x1.5-6g")
        await pilot.press("3", "2", "1", "enter")
        assert app.state.setup is not None
        await pilot.press("slash")
        await pilot.pause()
        await pilot.press("enter")                        # yes, undo
        await pilot.pause()
        assert app.state.setup is None
        text = screen_text(app)
        assert "not recorded yet" in text
        assert "between centres" in text                  # the answers stay on screen
        await pilot.press("enter")
        third = trains_for_lathe(app.lathe, 1.5, limit=SHOWN)[2]
        assert app.setup_values()["train"]["drivers"] == list(third.drivers)


async def test_answers_come_back_from_the_record(make_app):
    app = make_app()
    async with app.run_test(size=(80, 24)) as pilot:
        await open_setup(app, pilot, "5/8 BSW")
        await pilot.press("2", "2", "2", "enter")
        screen = app.screen
        screen.key = None                                 # as if shown fresh for this job
        screen.load()
        await app.workers.wait_for_complete()
        await pilot.pause()
        assert screen.train_i == 1 and screen.held is True and screen.relief is False
        assert screen.recorded()


# --- the pure parts -------------------------------------------------------------------------

def test_payloads_round_trip_through_json(sample_config):
    lathe = sample_config.lathe
    for t in trains_for_lathe(lathe, Fraction(254, 10) / 11, limit=4):
        payload = {"train": train_payload(t), "dial_plan": plan_payload(plan_for(lathe, made_lead(
            lathe, t), 1))}
        assert same_values(json.loads(json.dumps(payload)), payload)
        assert Fraction(payload["train"]["ratio"]) == t.ratio


def test_train_gears_words(sample_config):
    lathe = sample_config.lathe
    simple = trains_for_lathe(lathe, 1.5)[0]
    assert train_gears(simple) == "60 > idler > 127"
    compound = trains_for_lathe(lathe, 1.5)[1]
    (a, c), (b, d) = compound.drivers, compound.driven
    assert train_gears(compound) == f"{a}/{b} x {c}/{d}"


@settings(max_examples=40, deadline=None)
@given(tpi=st.integers(min_value=2, max_value=80))
def test_dial_payload_matches_integer_dial_arithmetic(tpi):
    """For any whole tpi cut exactly, the recorded lines are those the dial arithmetic gives."""
    lathe = sample_lathe()
    lead = Fraction(254, 10) / tpi
    payload = plan_payload(plan_for(lathe, lead, 1))
    step = DIAL_TEETH // DIAL_LINES
    # computed from Jones, Turning and Boring (1914): a whole dial turn and the line's travel are both
    # whole leads; p/L = tpi / 8 for an 8 tpi leadscrew
    if (DIAL_TEETH * Fraction(tpi, 8)).denominator != 1:
        assert payload["keep_half_nut_closed"] and payload["lines"] == []
    else:
        assert payload["lines"] == [k for k in range(1, DIAL_LINES + 1)
                                    if ((k - 1) * step * Fraction(tpi, 8)).denominator == 1]
    assert payload["anywhere"] == (Fraction(tpi, 8).denominator == 1)


def test_usable_methods_follow_the_holding(sample_config):
    from shopterm.lathe.indexing import indexing_for_lathe
    plan = indexing_for_lathe(sample_config.lathe, Fraction(3), 2)
    centres = {m.key for m in usable_methods(plan, True)}
    chuck = {m.key for m in usable_methods(plan, False)}
    assert "plate" in centres and not any(k.startswith("chuck") for k in centres)
    assert "chuck4" in chuck and "plate" not in chuck
    assert all(usable_methods(plan, None)[i].whole or not usable_methods(plan, None)[j].whole
               for i in range(len(usable_methods(plan, None)))
               for j in range(i, len(usable_methods(plan, None))))    # whole numbers first
    plate = next(m for m in plan.methods if m.key == "plate")
    assert index_phrase(plate) == "driving plate, 2 slots per start"  # 4 slots / 2 starts
