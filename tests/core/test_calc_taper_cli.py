"""``shopterm calc taper`` through ``shopterm.cli.main`` (capsys)."""

from __future__ import annotations

import json

import pytest

from shopterm.cli import main
from shopterm.resources import sample_config_path

CONFIG = ["--config", str(sample_config_path())]


def run_json(capsys, argv):
    assert main(CONFIG + argv + ["--json"]) == 0
    return json.loads(capsys.readouterr().out)


def test_json_for_1_in_16_between_centres(capsys):
    out = run_json(capsys, ["calc", "taper", "--taper", "1:16", "--work-length", "200mm",
                            "--taper-length", "13.2"])
    # 1:16 over the whole work: L/32 = 6.25 mm (computed from the set-over formula,
    # Machinery's Handbook, from memory); the sample's scale is 1 mm a line
    assert out["set_over"]["set_over"] == pytest.approx(6.25)
    assert out["set_over"]["divisions"] == pytest.approx(6.25)
    # 3/4 in per foot (ASME B1.20.1, from memory); atan(1/32) computed from the 1:16 taper
    assert out["attachment"]["setting"] == pytest.approx(0.75)
    assert out["half_angle_deg"] == pytest.approx(1.789911, abs=1e-6)
    assert out["compound"]["scale_reading_deg"] == pytest.approx(88.210089, abs=1e-6)
    assert out["set_over_refused"] is None and "square to the work's axis" in out["tool_square"]


def test_refusals_in_json(capsys):
    out = run_json(capsys, ["calc", "taper", "--taper", "1/16", "--taper-length", "300mm",
                            "--units", "in"])
    assert out["set_over"] is None and "between centres" in out["set_over_refused"]
    assert out["attachment"] is None and "travel" in out["attachment_refused"]
    assert out["compound"] is None and out["units"] == "in"


def test_text_output_fits_80_columns(capsys):
    assert main(CONFIG + ["calc", "taper", "--taper", "0.0625", "--work-length", "8in",
                          "--taper-length", "0.52in"]) == 0
    text = capsys.readouterr().out
    assert "Set-over:" in text and "Attachment:" in text and "Compound:" in text
    assert all(len(line) <= 80 for line in text.splitlines())


@pytest.mark.parametrize("argv", [
    ["calc", "taper"],                                                     # nothing to go on
    ["calc", "taper", "--taper", "1:16"],                                  # no length
    ["calc", "taper", "--taper", "x:16", "--taper-length", "10"],
    ["calc", "taper", "--taper", "1:16", "--taper-length", "-10"],
    ["calc", "taper", "--taper", "1:16", "--taper-length", "10", "--work-length", "abc"],
    ["calc", "taper", "--taper", "2", "--taper-length", "10"],             # not a taper
    ["calc", "taper", "M10x1.5", "--work-length", "100"],                  # parallel thread
    ["calc", "taper", "M10x1.5", "--taper", "1:16", "--taper-length", "10"],
])
def test_bad_values_exit_2_with_one_line(capsys, argv):
    assert main(CONFIG + argv) == 2
    err = capsys.readouterr().err
    assert len(err.strip().splitlines()) == 1 and "Traceback" not in err


def test_thread_gives_the_taper_and_length(capsys):
    """Runs once ISO 7-1 is in the standards: R1/2's own taper and useful length."""
    from pipe_threads import real_limits
    lim = real_limits("R1/2")
    out = run_json(capsys, ["calc", "taper", "R1/2", "--work-length", "150"])
    assert out["per_unit_on_diameter"] == pytest.approx(1 / 16)      # ISO 7-1 (from memory)
    assert out["set_over"]["taper_length"] == pytest.approx(lim.taper.L2, abs=1e-6)
    assert out["set_over"]["set_over"] == pytest.approx(150 / 32)   # computed, L/32
