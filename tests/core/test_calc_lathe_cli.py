"""``shopterm calc gears / dial / starts`` through ``shopterm.cli.main`` (capsys)."""

from __future__ import annotations

import json
from pathlib import Path

import pytest

from shopterm.cli import main
from shopterm.lathe.gears import trains_for_lathe

FIVES_127 = "20,25,30,35,40,45,50,55,60,65,70,75,80,90,100,110,120,127"


def run_json(capsys, argv):
    assert main(argv + ["--json"]) == 0
    return json.loads(capsys.readouterr().out)


def test_gears_json_3mm_on_8tpi(capsys):
    # Rose, Modern Machine Shop Practice: 8 tpi leadscrew x 120/127 = 3.000 mm
    out = run_json(capsys, ["calc", "gears", "--lead", "3mm", "--leadscrew", "8tpi",
                            "--gears", FIVES_127])
    assert out["lead"] == 3.0
    first = out["trains"][0]
    assert (first["drivers"], first["driven"], first["ratio"]) == ([120], [127], "120/127")
    assert first["lead_made"] == 3.0 and first["error_pct"] == 0.0
    assert all({"drivers", "driven", "ratio", "lead_made", "error_pct"} <= set(t)
               for t in out["trains"])


def test_gears_tpi_lead_and_text_output(capsys):
    # Rose: 4 tpi leadscrew, 36/48 x 66/18 -> 11 tpi
    assert main(["calc", "gears", "--lead", "11tpi", "--leadscrew", "4tpi",
                 "--gears", "18,36,48,66"]) == 0
    text = capsys.readouterr().out
    assert "exact" in text and all(len(line) <= 80 for line in text.splitlines())


def test_gears_box_and_simple(capsys):
    out = run_json(capsys, ["calc", "gears", "--lead", "16tpi", "--leadscrew", "8tpi",
                            "--box", "A=1/2,B=1"])
    assert out["trains"][0]["kind"] == "box" and out["trains"][0]["box"] == "A"
    out = run_json(capsys, ["calc", "gears", "--lead", "1.5", "--leadscrew", "8tpi",
                            "--gears", FIVES_127, "--simple", "--limit", "3"])
    assert len(out["trains"]) == 3 and all(t["kind"] == "simple" for t in out["trains"])


SAMPLE = Path(__file__).resolve().parents[2] / "sample_config.toml"


@pytest.mark.skipif(not SAMPLE.is_file(), reason="sample config not in this tree")
def test_gears_from_config_when_flags_missing(capsys):
    # no --leadscrew/--gears: the config's lathe is used; the answer is find_trains on it
    from shopterm.config import load_config
    lathe = load_config(SAMPLE).lathe
    out = run_json(capsys, ["--config", str(SAMPLE), "calc", "gears", "--lead", "1.5mm"])
    want = trains_for_lathe(lathe, 1.5)
    assert [(t["drivers"], t["driven"]) for t in out["trains"]] == \
        [(list(t.drivers), list(t.driven)) for t in want]
    # a flag overrides the config's value
    out = run_json(capsys, ["--config", str(SAMPLE), "calc", "gears", "--lead", "1.5mm",
                            "--leadscrew", "3mm"])
    assert out["leadscrew"] == "3 mm"


def test_gears_missing_config_says_which_flags(capsys, tmp_path):
    code = main(["--config", str(tmp_path / "none.toml"), "calc", "gears", "--lead", "1.5"])
    err = capsys.readouterr().err
    assert code == 2 and "--leadscrew and --gears" in err and len(err.strip().splitlines()) == 1


@pytest.mark.parametrize("argv", [
    ["calc", "gears", "--leadscrew", "8tpi", "--gears", "20,40"],              # no --lead
    ["calc", "gears", "--lead", "abc", "--leadscrew", "8tpi", "--gears", "20"],
    ["calc", "gears", "--lead", "1.5", "--leadscrew", "8", "--gears", "20"],
    ["calc", "gears", "--lead", "1.5", "--leadscrew", "8tpi", "--gears", "20,x"],
    ["calc", "gears", "--lead", "1.5", "--leadscrew", "8tpi", "--gears", "20", "--margin", "-1"],
    ["calc", "dial", "--lead", "1.5", "--leadscrew", "8tpi", "--dial-teeth", "30",
     "--dial-lines", "4"],
    ["calc", "dial", "--lead", "1.5", "--leadscrew", "8tpi", "--dial-teeth", "32"],
    ["calc", "starts", "--starts", "1", "--lead", "3"],
    ["calc", "starts", "--lead", "3"],
    ["calc", "starts", "--starts", "two", "--lead", "3", "--plate-slots", "8"],
])
def test_bad_input_exits_2_with_one_line(capsys, argv):
    assert main(argv) == 2
    err = capsys.readouterr().err
    assert err.startswith("shopterm: ") and len(err.strip().splitlines()) == 1


def test_dial_json(capsys):
    # computed (Jones, Turning and Boring (1914) rule): 11 tpi on 8 tpi, 32 teeth, 8 lines -> odd lines
    out = run_json(capsys, ["calc", "dial", "--lead", "11tpi", "--leadscrew", "8tpi",
                            "--dial-teeth", "32", "--dial-lines", "8", "--numbered", "1,3,5,7"])
    assert out["lines"] == [1, 3, 5, 7] and out["anywhere"] is False
    assert out["keep_half_nut_closed"] is False


def test_dial_metric_on_inch_keeps_half_nut_closed(capsys):
    # Jones, Turning and Boring (1914): metric on an inch leadscrew -> keep the half nut closed
    out = run_json(capsys, ["calc", "dial", "--lead", "1.5mm", "--leadscrew", "8tpi",
                            "--dial-teeth", "32", "--dial-lines", "8"])
    assert out == {**out, "lines": [], "anywhere": False, "keep_half_nut_closed": True}
    assert main(["calc", "dial", "--lead", "1.5mm", "--leadscrew", "8tpi", "--dial-teeth",
                 "32", "--dial-lines", "8"]) == 0
    assert "Caution" in capsys.readouterr().out


def test_starts_json(capsys):
    out = run_json(capsys, ["calc", "starts", "--starts", "2", "--lead", "1in",
                            "--compound-div", "0.001in", "--plate-slots", "8",
                            "--leadscrew", "8tpi", "--dial-teeth", "32", "--dial-lines", "8"])
    m = {x["key"]: x for x in out["methods"]}
    assert out["pitch"] == pytest.approx(12.7, abs=1e-12)          # 1 in / 2 (computed)
    assert m["compound"]["amount"] == pytest.approx(500, rel=1e-12)  # 0.5 in / 0.001 in
    assert m["plate"]["amount"] == 4 and m["dial"]["works"]


def test_starts_text(capsys):
    assert main(["calc", "starts", "--starts", "3", "--lead", "4.5", "--spindle-gear", "60"]) == 0
    out = capsys.readouterr().out
    assert "Spindle gear: 20 teeth" in out and "3-jaw chuck: 1 jaw on" in out
