"""``shopterm calc wires``: JSON shape and values, units, readings, and every bad-input path.

Sources: ISO 965-2 limits [P]; ASME B1.1 table values [P]; NBS Handbook H28 (three-wire
constants and wire factors [P]); the compound factor 1/cos 29.5° [C]. [P] printed in the named
standard, [C] computed from it.
"""

from __future__ import annotations

import json
import re
from pathlib import Path

import pytest

from shopterm.cli import main

ROOT = Path(__file__).resolve().parents[2]
SAMPLE = ROOT / "sample_config.toml"      # demo config: owns 0.577 mm and 0.866 mm wires


def run(capsys, *argv, config: Path | str = SAMPLE):
    code = main(["--config", str(config), "calc", "wires", *argv])
    out = capsys.readouterr()
    return code, out.out, out.err


def run_json(capsys, *argv, **kw):
    code, out, err = run(capsys, *argv, "--json", **kw)
    assert code == 0, err
    return json.loads(out)


@pytest.fixture()
def inch_wires_config(tmp_path):
    """The sample config with its wire sets replaced by the common inch sizes."""
    text = SAMPLE.read_text()
    text = re.sub(r"^\[\[wires\]\]\n(?:[a-z]+ = .*\n)*", "", text, flags=re.M)
    # NBS Handbook H28, three-wire method: common inch wire sizes
    for v in (".018", ".024", ".029", ".032", ".040", ".045", ".055", ".063"):
        text += f'\n[[wires]]\nmarked = "0{v} in"\n'
    path = tmp_path / "config.toml"
    path.write_text(text)
    return path


def test_json_keys_and_wire_sizes(capsys):
    d = run_json(capsys, "M10x1.5-6g")
    assert set(d) >= {"best_wire", "wire_min", "wire_max", "wire", "wire_ok", "over_wires",
                      "lead_angle_deg", "reading"}
    # output is rounded to 1e-6 mm and the factors to 1e-6: compare within 2e-6
    assert d["best_wire"] == pytest.approx(0.577350 * 1.5, abs=2e-6)   # NBS Handbook H28 [P] best 0.577350P
    assert d["wire_min"] == pytest.approx(0.505182 * 1.5, abs=2e-6)    # NBS Handbook H28 [P] 60° min
    assert d["wire_max"] == pytest.approx(1.010363 * 1.5, abs=2e-6)    # NBS Handbook H28 [P] 60° max
    assert d["wire"] == 0.866 and d["wire_ok"] is True                  # owned set nearest best
    assert d["reading"] is None
    # computed from M = E + 3W − 0.866025P (NBS Handbook H28 [P]) at the ISO 965-2 d2 limits (ISO 965-1/-2 [P]); the
    # lead-angle term adds under 0.002 mm here (NBS H28 form, ½W tan²λ cos a cot a)
    for key, pd in (("at_pd_max", 8.994), ("at_pd_min", 8.862)):
        simple = pd + 3 * 0.866 - 0.866025 * 1.5
        assert 0 < d["over_wires"][key] - simple < 0.002
    assert d["lead_angle_deg"] == pytest.approx(3.03, abs=0.01)   # atan(P / π d2), d2 9.026


def test_units_option(capsys):
    mm = run_json(capsys, "M10x1.5-6g")
    inch = run_json(capsys, "M10x1.5-6g", "--units", "in")
    assert inch["best_wire"] == pytest.approx(mm["best_wire"] / 25.4, abs=1e-7)
    assert inch["over_wires"]["at_pd_min"] == pytest.approx(mm["over_wires"]["at_pd_min"] / 25.4,
                                                            abs=1e-7)


def test_reading_oversize(capsys):
    d = run_json(capsys, "M10x1.5-6g", "--reading", "10.350", "10.352")
    r = d["reading"]
    assert r["mean"] == pytest.approx(10.351) and r["spread"] == pytest.approx(0.002)
    assert r["state"] == "oversize"
    pd = r["pitch_diameter"]
    assert r["pitch_diameter_simple"] > pd
    # computed from the ISO 965-2 band 8.994..8.862 (ISO 965-1/-2 [P]) and travel = radial / cos 29.5°
    assert r["to_max"] == pytest.approx(pd - 8.994, abs=2e-6)
    assert r["to_mid"] == pytest.approx(pd - 8.928, abs=2e-6)
    assert r["to_min"] == pytest.approx(pd - 8.862, abs=2e-6)
    assert r["radial_to_mid"] == pytest.approx(r["to_mid"] / 2, abs=2e-6)
    assert r["compound_to_mid"] == pytest.approx(r["radial_to_mid"] * 1.14896, rel=1e-4)


def test_angle_option(capsys):
    d = run_json(capsys, "M10x1.5-6g", "--reading", "10.35", "--angle", "0")
    assert d["reading"]["compound_to_mid"] == pytest.approx(d["reading"]["radial_to_mid"])


def test_inch_thread_reading_in_its_own_unit(capsys):
    d = run_json(capsys, "1/4-20 UNC-2A", "--wire", ".029", "--reading", ".2585")
    assert d["wire"] == pytest.approx(0.029)
    assert d["reading"]["state"] == "in_band"
    # ASME B1.1 1/4-20 UNC-2A PD 0.2164 / 0.2127 (ASME B1.1 [P])
    assert 0.2127 <= d["reading"]["pitch_diameter"] <= 0.2164


def test_unit_suffix_on_a_reading(capsys):
    a = run_json(capsys, "1/4-20 UNC-2A", "--wire", ".029", "--reading", ".2585")
    b = run_json(capsys, "1/4-20 UNC-2A", "--wire", ".029", "--reading", f"{0.2585 * 25.4}mm")
    assert a["reading"]["pitch_diameter"] == pytest.approx(b["reading"]["pitch_diameter"])


def test_no_class_band_is_the_basic_pd(capsys):
    d = run_json(capsys, "1-5/8 BSW")
    assert d["over_wires"]["at_pd_max"] == d["over_wires"]["at_pd_min"]


def test_quarter_40_picks_the_0_018_wire(capsys, inch_wires_config):
    # common practice, no source: 1/4 in x 40 tpi is checked with 0.018 in wires
    d = run_json(capsys, "1/4x40 ME", config=inch_wires_config)
    assert d["wire"] == pytest.approx(0.018) and d["wire_ok"]


def test_wire_that_cannot_work_is_reported(capsys):
    d = run_json(capsys, "M10x1.5-6g", "--wire", "0.3")
    assert d["wire_ok"] is False and d["over_wires"] is None
    assert "0.866 mm" in d["wire_message"]
    code, out, _ = run(capsys, "M10x1.5-6g", "--wire", "0.3")
    assert code == 0 and "refused" in out


def test_text_output(capsys):
    code, out, _ = run(capsys, "M10x1.5-6g", "--reading", "10.35")
    assert code == 0
    assert "Oversize" in out and "caution" in out and "backlash" in out


@pytest.mark.parametrize("argv, match", [
    (["M10x1.5-6g", "--reading", "abc"], "not a number"),
    (["M10x1.5-6g", "--reading", "0.4075"], "inches taken as mm"),       # a slip
    (["M10x1.5-6g", "--wire", "0.3", "--reading", "10.2"], "0.866 mm"),  # names what works
    (["M10x1.5-6H"], "mating part or a plug gauge"),
    (["M10x1.5-6g", "--reading", "10.35", "--angle", "x"], "not a number"),
    (["M10x1.5-6g", "--reading", "10.35", "--angle", "95"], "compound angle"),
    (["M10x1.5-6g", "--reading", "10.35", "--aim", "9.5"], "aim point"),
    (["M99x7-6g"], ""),
    (["M10x1.5-6g", "--wire", "-1"], "greater than zero"),
])
def test_bad_input_exits_2_with_one_line(capsys, argv, match):
    code, out, err = run(capsys, *argv)
    assert code == 2
    assert err.startswith("shopterm: ") and err.count("\n") == 1
    assert match in err
    assert "Traceback" not in err


@pytest.mark.parametrize("bare, with_class", [("Tr24x10(P5)", "Tr24x10(P5)-7e"),
                                              ("1-5 ACME", "1-5 ACME-2G")])
def test_power_thread_with_no_class_is_measured_to_its_usual_class(capsys, bare, with_class):
    # ISO 2903: 7e is the medium class for general use; ASME B1.5: 2G the general-purpose one
    # (both from memory); the band with no class must be that class's, not the basic PD
    d = run_json(capsys, bare)
    e = run_json(capsys, with_class)
    assert d["over_wires"] == e["over_wires"]
    assert d["over_wires"]["at_pd_max"] > d["over_wires"]["at_pd_min"]
    code, out, _ = run(capsys, bare)
    assert code == 0 and "(no class given)" in out and "diameter basic size" not in out


@pytest.mark.parametrize("extra", [(), ("--json",), ("--reading", "25")])
def test_square_thread_is_refused_in_one_line(capsys, extra):
    code, out, err = run(capsys, "SQUARE 25x5", *extra)
    assert code == 2 and out == ""
    assert len(err.strip().splitlines()) == 1
    assert "calipers" in err and "gauge" in err
