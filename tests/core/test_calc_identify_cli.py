"""``shopterm calc identify``: JSON shape, ranking, telling measurements, and bad input."""

from __future__ import annotations

import json

import pytest

from shopterm.cli import main


def run(capsys, *argv):
    code = main(["calc", "identify", *argv])
    out = capsys.readouterr()
    return code, out.out, out.err


def run_json(capsys, *argv):
    code, out, err = run(capsys, *argv, "--json")
    assert code == 0, err
    return json.loads(out)


def test_json_shape_and_top_candidate(capsys):
    # a 60° gauge: Tr10x1.5 (ISO 2902) has the same major and pitch, only the angle tells
    data = run_json(capsys, "--major", "9.96", "--pitch", "1.5", "--angle", "60")
    assert set(data) >= {"candidates", "to_tell_apart", "ambiguous", "note"}
    top = data["candidates"][0]
    assert set(top) >= {"designation", "score", "why"}
    assert top["designation"] == "M10x1.5"             # ISO 261: M10 coarse P 1.5
    assert top["score"] == pytest.approx(1.0)
    assert "pitch matches 1.5 mm exactly" in top["why"]
    assert data["ambiguous"] is False and data["to_tell_apart"] == []


def test_tpi_and_inch_major(capsys):
    # 1/4-20 UNC (ASME B1.1): major 0.25 in, 20 tpi; typed in inches with a 60° gauge
    data = run_json(capsys, "--major", "0.248in", "--tpi", "20", "--angle", "60")
    assert data["candidates"][0]["designation"] == "1/4-20 UNC"
    assert data["candidates"][0]["tpi"] == 20


def test_count_over_length(capsys):
    # 11 crests over 10 mm = 1 mm pitch (definition of pitch); M6x1 (ISO 261) with a 60° gauge
    data = run_json(capsys, "--major", "5.95", "--count", "11", "--length", "10", "--angle", "60")
    assert data["candidates"][0]["designation"] == "M6x1"
    spaces = run_json(capsys, "--major", "5.95", "--count", "10", "--length", "10",
                      "--counted", "spaces", "--angle", "60")
    assert spaces["candidates"][0]["designation"] == "M6x1"


def test_ambiguous_pair_gets_telling_measurements(capsys):
    # same size and tpi: 1/4 BSW (BS 84) and 1/4-20 UNC (ASME B1.1)
    data = run_json(capsys, "--major", "6.30", "--tpi", "20")
    assert data["ambiguous"] is True
    names = {c["designation"] for c in data["candidates"][:2]}
    assert names == {"1/4-20 UNC", "1/4 BSW"}
    measures = {t["measure"] for t in data["to_tell_apart"] if set(t["between"]) == names}
    assert {"gauge", "wires", "two wires"} <= measures
    gauge = next(t for t in data["to_tell_apart"] if t["measure"] == "gauge")
    assert {e["designation"]: e["low"] for e in gauge["expected"]} == \
        {"1/4-20 UNC": 60.0, "1/4 BSW": 55.0}


def test_pitch_check_in_json(capsys):
    data = run_json(capsys, "--major", "5.98", "--angle", "60")
    item = next(t for t in data["to_tell_apart"]
                if set(t["between"]) == {"M6x1", "1/4-20 UNC"} and t["measure"] == "pitch")
    exp = {e["designation"]: e["low"] for e in item["expected"]}
    assert exp["1/4-20 UNC"] == pytest.approx(12.7)   # computed from 10 × 25.4/20, ASME B1.1
    assert exp["M6x1"] == pytest.approx(10.0)         # computed from 10 × 1, ISO 261


def test_wire_readings(capsys):
    # 1/4-20 UNC bolt at PD 0.2150 in (inside ASME B1.1 2A 0.2164 / 0.2127 in) over .029
    # and .040 in wires (common sizes, NBS Handbook H28, three-wire method), readings from the exact model
    from shopterm.cutting.wires import over_wires_exact
    from shopterm.standards.forms import ISO_60
    p, e = 25.4 / 20, 0.2150 * 25.4
    args = []
    for w in (0.029 * 25.4, 0.040 * 25.4):
        args += ["--wire", f"{w:.6f}", "--over-wires", f"{over_wires_exact(e, w, ISO_60, p):.6f}"]
    data = run_json(capsys, "--major", "6.30", "--tpi", "20", *args)
    assert data["candidates"][0]["designation"] == "1/4-20 UNC"
    assert data["ambiguous"] is False


def test_text_output(capsys):
    code, out, err = run(capsys, "--major", "6.30", "--tpi", "20")
    assert code == 0 and err == ""
    assert out.startswith("1. 1/4-20 UNC")
    assert "to tell them apart" in out


@pytest.mark.parametrize("argv, words", [
    (["--major", "abc"], "not a number"),
    (["--major", "-6"], "greater than zero"),
    (["--pitch", "1.5", "--tpi", "20"], "disagree"),
    ([], "Measure something"),
    (["--major", "6", "--count", "10"], "count"),
    (["--major", "6", "--count", "ten", "--length", "10"], "whole number"),
    (["--major", "6", "--count", "1", "--length", "10"], "at least 2 crests"),
    (["--major", "6", "--count", "10", "--length", "10", "--counted", "teeth"], "crests"),
    (["--major", "6", "--wire", "0.7"], "--over-wires"),
    (["--minor", "5", "--wire", "0.7", "--over-wires", "6.5"], "Wires measure a bolt"),
    (["--major", "6", "--angle", "200"], "included angle"),
    (["--major", "6", "--limit", "0"], "at least one"),
])
def test_bad_input_exits_2_with_one_line(capsys, argv, words):
    code, out, err = run(capsys, *argv)
    assert code == 2
    assert out == ""
    lines = err.strip().splitlines()
    assert len(lines) == 1 and lines[0].startswith("shopterm: ")
    assert words in lines[0]


def test_crest_flat_option(capsys):
    # ISO 68-1: a 60° bolt's crest flat is P/8 (0.375 mm at P 3); the option reaches the core
    data = run_json(capsys, "--major", "23.95", "--pitch", "3", "--crest-flat", "0.4")
    assert data["candidates"][0]["designation"] == "M24x3"
    assert "crest flat 0.4 fits a crest flat of 0.375" in data["candidates"][0]["why"]
    code, _out, err = run(capsys, "--major", "23.95", "--pitch", "3", "--crest-flat", "-1")
    assert code != 0 and "crest flat" in err


@pytest.mark.parametrize("second, top", [
    # ISO 7-1 / ASME B1.20.1: 1 in 16 on diameter, 10/16 = 0.625 mm over 10 mm (computed)
    ("20.375", {"R1/2", "1/2-14 NPT"}),
    ("21", {"G1/2 external"}),           # ISO 228-1 G: parallel
])
def test_taper_tells_tapered_from_parallel_pipe_threads(capsys, second, top):
    # 1/2 in pipe: 14 tpi at about 21 mm (common practice, no source)
    data = run_json(capsys, "--major", "21", "--tpi", "14", "--taper", f"21,{second},10")
    names = [c["designation"] for c in data["candidates"][:len(top)]]
    assert set(names) == top


@pytest.mark.parametrize("taper, words", [
    ("21,20", "two crest diameters and the distance"),
    ("21,20,0", "must be greater than zero"),
    ("21,15,10", "far steeper than a thread's taper"),
])
def test_taper_mistakes_are_one_line_and_exit_2(capsys, taper, words):
    code, out, err = run(capsys, "--major", "21", "--tpi", "14", "--taper", taper)
    assert code == 2 and words in err and len(err.strip().splitlines()) == 1
