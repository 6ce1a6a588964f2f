"""``shopterm calc passes``: JSON keys, the published plan via --depth, errors exit 2."""

from __future__ import annotations

import json

import pytest

from shopterm.cli import main


def run_json(capsys, *args):
    assert main(["calc", "passes", *args, "--json"]) == 0
    return json.loads(capsys.readouterr().out)


def test_json_keys(capsys):
    out = run_json(capsys, "M10x1.5-6g", "--od", "9.96", "--tip-radius", "0.2")
    for key in ("total_radial", "compound_angle_set", "compound_total", "passes",
                "spring_passes", "tool_check"):
        assert key in out
    assert set(out["tool_check"]) >= {"ok", "messages"}
    assert out["tool_check"]["ok"] is True
    for p in out["passes"]:
        assert set(p) >= {"n", "radial_cum", "radial_inc", "compound_cum", "compound_inc",
                          "dial_divisions"}
    assert out["basic_depth"] == pytest.approx(0.920152, abs=1e-6)  # ISO 68-1 h3 0.613435P


def test_published_plan_with_depth(capsys):
    # threading-tool handbooks (constant chip area), computed: ap 0.6 mm, 5 passes → 0.164, 0.300, 0.424, 0.520, 0.600
    out = run_json(capsys, "M10x1.5-6g", "--od", "9.96", "--depth", "0.6", "--passes", "5",
                   "--method", "radial", "--dial-div", "0.0001")
    assert [round(p["radial_cum"], 3) for p in out["passes"]] == [0.164, 0.3, 0.424, 0.52, 0.6]
    assert out["total_radial"] == 0.6


def test_compound_angle_and_total(capsys):
    out = run_json(capsys, "M10x1.5-6g", "--od", "9.96", "--tip-radius", "0.2", "--angle",
                   "29.5", "--dial-div", "0.0001")
    assert out["compound_angle_true"] == 29.5
    # compound travel = radial / cos 29.5° (US Navy machinery training manual: factor 1.14896)
    assert out["compound_total"] == pytest.approx(out["passes"][-1]["radial_cum"] * 1.14896,
                                                  abs=2e-4)


def test_bad_config_is_noted(capsys, tmp_path):
    bad = tmp_path / "nope.toml"
    bad.write_text("this is = = not toml\n")
    assert main(["--config", str(bad), "calc", "passes", "M10x1.5-6g", "--od", "9.96",
                 "--json"]) == 0
    out = json.loads(capsys.readouterr().out)
    assert any("Config not used" in n for n in out["notes"])
    assert out["compound_angle_set"] == 29.5    # zero along the cross-slide assumed


def test_internal_worn_tip(capsys):
    out = run_json(capsys, "M10x1.5-6H", "--od", "8.5", "--tip-radius", "0.3")
    assert out["tool_check"]["ok"] is False and out["tool_check"]["interference"] > 0
    assert out["bore"]["min"] == 8.376   # ISO 68-1 and ISO 965-1/-2, M10x1.5 6H D1 min [P]


def test_text_output(capsys):
    assert main(["calc", "passes", "M10x1.5-6g", "--od", "9.96", "--tip-radius", "0.2"]) == 0
    text = capsys.readouterr().out
    assert "total radial infeed" in text and "basic depth" in text


@pytest.mark.parametrize("args", [
    ["M10x1.5-6g", "--od", "8"],                      # blank smaller than the PD
    ["M10x1.5-6g", "--od", "9.96", "--passes", "2.5"],
    ["M10x1.5-6g", "--od", "abc"],
    ["M99x7-6g", "--od", "99"],
    ["M10x1.5-6g", "--od", "9.96", "--method", "radial", "--angle", "29.5"],
    ["M10x1.5-6g", "--od", "9.96", "--tip-flat", "2"],
])
def test_errors_exit_2_one_line(capsys, args):
    assert main(["calc", "passes", *args]) == 2
    err = capsys.readouterr().err.strip()
    assert err.startswith("shopterm: ") and "\n" not in err and "Traceback" not in err
