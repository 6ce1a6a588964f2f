"""Export: CSV, JSON, the job card, and the ``shopterm export`` command."""

import csv
import io
import json
from fractions import Fraction

import pytest

from shopterm.cli import main
from shopterm.errors import InvalidEntry
from shopterm.job.export import CSV_COLUMNS, band_position, export, job_card, to_csv, to_dict
from shopterm.job.store import Store

MM = 25.4  # exact, NIST SP 811


def metric_job(store):
    job = store.new_job("M10x1.5-6g", title="lead screw nut test bolt")
    job.append("setup_confirmed", {"gears": [20, 40, 60], "compound_angle_deg": 29.5,
                                   "tool": "HSS ground 60", "dial_plan": "any line",
                                   "blank_od_mm": 9.95})
    job.append("checklist_item", {"item": "chuck key out"})
    for i in range(1, 5):
        job.append("pass_cut", {"radial_cum_mm": round(0.2 * i, 3), "dial": 20 * i})
    job.undo()                                    # pass 4 taken back
    job.append("spring_pass", {"radial_cum_mm": 0.6})
    # ISO 965-2 as printed in fastener tables: M10x1.5-6g d2 max 8.994, min 8.862
    job.append("wire_reading", {"measured_mm": 10.2, "wire_mm": 0.866, "pd_mm": 8.95,
                                "pd_max_mm": 8.994, "pd_min_mm": 8.862, "state": "in band"})
    job.append("note", {"text": "checked with a 6H nut, runs freely"})
    job.finish()
    return job


@pytest.fixture
def store(tmp_path):
    s = Store.open(tmp_path)
    yield s
    s.close()


@pytest.mark.parametrize("pd, lo, hi", [
    (8.95, 8.862, 8.994),         # ISO 965-2, M10x1.5-6g d2 limits
    (9.01, 8.862, 8.994),
    (8.80, 8.862, 8.994),
    (0.2150 * MM, 0.2127 * MM, 0.2164 * MM),   # ASME B1.1 table, 1/4-20 UNC-2A PD limits
])
def test_band_position_against_exact_fractions(pd, lo, hi):
    bp = band_position(pd, lo, hi)
    # computed from (pd - min) / (max - min), re-derived here with fractions.Fraction
    frac = (Fraction(pd) - Fraction(lo)) / (Fraction(hi) - Fraction(lo))
    assert bp.fraction == pytest.approx(float(frac), abs=1e-12)
    assert bp.where == ("above max" if frac > 1 else "below min" if frac < 0 else "in band")
    assert bp.over_max_mm == pytest.approx(float(Fraction(pd) - Fraction(hi)), abs=1e-12)


def test_band_needs_max_above_min():
    with pytest.raises(InvalidEntry, match="max above its min"):
        band_position(8.9, 8.994, 8.862)


def test_csv_one_row_per_event_with_units_in_header(store):
    job = metric_job(store)
    text = to_csv(store.events(job.job_id))
    rows = list(csv.DictReader(io.StringIO(text)))
    assert tuple(rows[0].keys()) == CSV_COLUMNS
    assert "radial_cum_mm" in CSV_COLUMNS and "pd_mm" in CSV_COLUMNS
    assert len(rows) == len(job.events)
    passes = [r for r in rows if r["kind"] == "pass_cut"]
    assert [r["pass_n"] for r in passes] == ["1", "2", "3", "4"]
    undo = next(r for r in rows if r["kind"] == "undo")
    assert passes[3]["undone_by_seq"] == undo["seq"]
    assert undo["undo_target_seq"] == passes[3]["seq"]
    reading = next(r for r in rows if r["kind"] == "wire_reading")
    assert (reading["pd_mm"], reading["state"]) == ("8.95", "in band")
    for r in rows:                                # every detail is there in full
        assert json.loads(r["payload_json"]) == job.state.event(int(r["seq"])).payload


def test_json_is_the_whole_job(store):
    job = metric_job(store)
    d = json.loads(export(store.events(job.job_id), "json"))
    assert d == to_dict(job.events)
    assert d["job"]["status"] == "finished" and d["job"]["title"] == "lead screw nut test bolt"
    assert d["setup"]["gears"] == [20, 40, 60]
    assert [p["n"] for p in d["in_force"]["passes"]] == [1, 2, 3]
    assert d["in_force"]["radial_cum_mm"] == 0.6
    assert d["limits_now"]["pd_max_mm"] == pytest.approx(8.994)   # ISO 965-2, M10x1.5-6g
    assert d["limits_now"]["pd_min_mm"] == pytest.approx(8.862)   # ISO 965-2, M10x1.5-6g
    assert d["final_reading"]["where"] == "in band"
    assert len(d["events"]) == len(job.events)


def test_job_card_metric(store):
    job = metric_job(store)
    card = job_card(job.events)
    assert all(len(line) <= 78 for line in card.splitlines())
    assert "M10x1.5-6g" in card and "finished" in card
    assert "compound angle       29.5°" in card and "gears                20 / 40 / 60" in card
    assert "blank od             9.950 mm" in card
    assert "Passes (3 in force)" in card and "0.600 mm" in card
    assert "spring pass" in card
    assert "PD 8.950 mm: in band" in card
    # computed from (8.95 - 8.862) / (8.994 - 8.862) = 2/3; ISO 965-2 M10x1.5-6g d2 limits
    assert "in band, 0.044 mm under max, 67% of the band up from min" in card
    assert "re-checked against M10x1.5-6g: band 8.862 mm to 8.994 mm (same)" in card
    assert "Checklist done: chuck key out" in card
    assert "runs freely" in card
    assert "Undone entries" in card and "pass cut" in card


def test_job_card_inch_job_shows_inches_and_flags_a_band_that_differs(store):
    job = store.new_job("1/4-20 UNC-2A", units="in")
    # band typed as 3A limits by mistake; ASME B1.1 table, 1/4-20 UNC-2A PD 0.2164 / 0.2127
    job.append("wire_reading", {"measured_mm": 0.2500 * MM, "pd_mm": 0.2150 * MM,
                                "pd_max_mm": 0.2175 * MM, "pd_min_mm": 0.2147 * MM,
                                "state": "in band"})
    card = job_card(job.events)
    assert "Final pitch diameter  0.2150 in" in card
    assert "band 0.2127 in to 0.2164 in (DIFFERS" in card
    # computed from (0.2150 - 0.2127) / (0.2164 - 0.2127) = 62.2 %; ASME B1.1 2A limits
    assert "0.0014 in under max, 62% of the band up from min" in card


def test_job_card_without_readings_or_known_thread(store):
    job = store.new_job("a thread from an old drawing")
    card = job_card(job.events)
    assert "no wire reading recorded" in card and "Set-up: none confirmed" in card
    job.append("wire_reading", {"measured_mm": 12.0, "pd_mm": 11.0, "state": "oversize"})
    assert "not re-checked" in job_card(job.events)


def test_unknown_format_is_refused(store):
    job = store.new_job("M6x1-6g")
    with pytest.raises(InvalidEntry, match="csv, json, card"):
        export(job.events, "pdf")


# ---- the command -----------------------------------------------------------------------------

def test_export_command_card_to_stdout_and_json_to_file(tmp_path, capsys):
    with Store.open(tmp_path) as s:
        job = metric_job(s)
        s.new_job("M6x1-6g")                      # a newer job: 'last' picks it
        first = job.job_id
    assert main(["export", str(first), "--data-dir", str(tmp_path)]) == 0
    assert "JOB CARD - job 1" in capsys.readouterr().out
    assert main(["--data-dir", str(tmp_path), "export", "last", "-f", "csv"]) == 0
    assert "M6x1-6g" in capsys.readouterr().out
    out = tmp_path / "job1.json"
    assert main(["export", "1", "--format", "json", "-o", str(out),
                 "--data-dir", str(tmp_path)]) == 0
    assert json.loads(out.read_text())["job"]["id"] == 1
    assert "written to" in capsys.readouterr().err


@pytest.mark.parametrize("job, words", [
    ("7", "no job 7"),
    ("seven", "give a job number such as 3, or 'last'"),
])
def test_export_command_errors_are_one_line_exit_2(tmp_path, capsys, job, words):
    with Store.open(tmp_path) as s:
        s.new_job("M6x1-6g")
    assert main(["export", job, "--data-dir", str(tmp_path)]) == 2
    err = capsys.readouterr().err
    assert words in err and "Traceback" not in err and err.count("\n") == 1


def test_export_command_no_record_and_unwritable_output(tmp_path, capsys):
    assert main(["export", "last", "--data-dir", str(tmp_path / "none")]) == 2
    assert "no job record" in capsys.readouterr().err
    with Store.open(tmp_path) as s:
        s.new_job("M6x1-6g")
    assert main(["export", "last", "-o", str(tmp_path / "no" / "dir" / "f.txt"),
                 "--data-dir", str(tmp_path)]) == 2
    assert "give another file with -o" in capsys.readouterr().err


def test_export_while_the_app_holds_the_record(tmp_path, capsys):
    app = Store.open(tmp_path)
    job = app.new_job("M6x1-6g")
    job.append("pass_cut", {"radial_cum_mm": 0.1})
    assert main(["export", "last", "-f", "json", "--data-dir", str(tmp_path)]) == 0
    assert len(json.loads(capsys.readouterr().out)["events"]) == 2
    job.append("pass_cut", {"radial_cum_mm": 0.2})      # the app is not disturbed
    assert not app.read_only and app.health is None
    app.close()


def test_pipe_thread_card_and_json_carry_the_pressure_caution(store):
    job = store.new_job("R1/2")
    # a reading 5 mm from the small end: PD there and at the gauge plane 3.2/16 mm larger
    # (ISO 7-1 gauge length 8.2 mm, taper 1:16, from memory; computed)
    job.append("wire_reading", {"measured_mm": 21.2, "pd_mm": 19.8, "pd_at_plane_mm": 19.6,
                                "distance_mm": 5.0, "pd_max_mm": 19.906, "pd_min_mm": 19.681,
                                "state": "in_band"})
    job.append("note", {"text": "Hand-tight check with a ring gauge: within the gauge",
                        "hand_tight": {"against": "ring_gauge", "state": "done"}})
    card = job_card(job.events)
    assert "CAUTION     A pressure fitting's fitness for service is not settled" in card
    flat = " ".join(card.split())                 # the card wraps long lines
    assert "at 5.000 mm from the end, PD there 19.600 mm; at the gauge plane, PD 19.800" in flat
    assert "Hand-tight check with a ring gauge" in card
    assert to_dict(job.events)["job"]["cautions"][0].startswith("A pressure fitting's")
    # a screw thread has none
    assert to_dict(metric_job(store).events)["job"]["cautions"] == []
    assert "CAUTION" not in job_card(metric_job(store).events)
