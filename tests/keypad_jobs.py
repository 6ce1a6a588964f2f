"""The whole keypad jobs, as data: the end-to-end test cuts them in tmux
(tests/e2e/test_whole_job.py) and the key-count benchmark replays them in-process
(tests/bench/bench_key_count.py), from this one definition.

Each job names the thread, how it is chosen on the thread screen (a list of (heading, label)
picks: the list walk, a favourite of the demo config), the starts, the display units and the
blank's OD as typed. The set-up answers are the same for every job.
"""

from __future__ import annotations

import re
import tomllib
from dataclasses import dataclass
from fractions import Fraction
from pathlib import Path

from tests.e2e.thread_sim import INCH

SAMPLE = Path(__file__).resolve().parents[1] / "sample_config.toml"


@dataclass(frozen=True)
class KeypadJob:
    name: str
    units: str                                  # the demo config's display units
    choose: tuple[tuple[str, str], ...]         # (heading, label) picked in turn
    starts: int
    want: str                                   # in the designation shown
    od_typed: str                               # the blank's OD as typed [display unit]
    band: tuple[float, float]                   # PD min, max [display unit]
    export_from_screen: bool


M10_6G = (8.862, 8.994)        # ISO 965-2, M10x1.5-6g d2 min / max
UNC_2A = (0.3287, 0.3331)      # ASME B1.1 table, 3/8-16 UNC-2A PD min / max

#: M10 by the list walk: the family, then its common coarse sizes.
M10_WALK = (("Thread family", "ISO metric"), ("Common sizes", "M10x1.5-6g"))
#: 3/8-16 UNC-2A as a favourite of the demo config (sample_config.toml [favourites]).
UNC_FAVOURITE = (("Thread family", "3/8-16 UNC-2A"),)

JOBS = (
    KeypadJob("M10x1.5-6g", "mm", M10_WALK, 1, "M10x1.5-6g", "9.95", M10_6G, True),
    KeypadJob("3/8-16 UNC-2A", "in", UNC_FAVOURITE, 1, "3/8-16 UNC-2A", "0.3730", UNC_2A, False),
    KeypadJob("M10x1.5 two starts", "mm", M10_WALK, 2, "M10", "9.95", M10_6G, False),
)

#: The set-up questions after the change gears (the best train, "1"), with the answer picked.
SETUP_ANSWERS = (("how is the work held?", "in a chuck"),
                 ("where does the tool run out", "into a relief groove (undercut)"))


def job(name: str) -> KeypadJob:
    return next(j for j in JOBS if j.name == name)


def demo_config(tmp: Path, units: str) -> Path:
    """Return the sample config (the demo lathe) with the display in ``units`` and a micrometer
    that reads 0.001 mm (metric) or 0.0001 in (inch), as a shop with either would have."""
    text = SAMPLE.read_text(encoding="utf-8")
    text = re.sub(r'(?m)^units = "\w+"', f'units = "{units}"', text, count=1)
    res = '"0.001 mm"' if units == "mm" else '"0.0001 in"'
    text = re.sub(r'(?m)^resolution = "[^"]*"', f"resolution = {res}", text, count=1)
    path = tmp / f"demo-{units}.toml"
    path.write_text(text, encoding="utf-8")
    return path


def length_mm(text: str) -> float:
    """Return a config length such as ``0.001 in`` in mm."""
    value, unit = text.split()
    return float(Fraction(value)) * (INCH if unit == "in" else 1.0)


def lathe_facts(config: Path) -> dict:
    """Return what the operator knows of the demo lathe from its config (no app code)."""
    cfg = tomllib.loads(config.read_text(encoding="utf-8"))
    tool = cfg["tool"]
    kind = "radius" if "nose_radius" in tool else "flat"
    return {"leadscrew_tpi": cfg["leadscrew"]["tpi"],
            "compound_div_mm": length_mm(cfg["compound"]["division"]),
            "cross_div_mm": length_mm(cfg["cross_slide"]["division"]),
            "tip_kind": kind, "tip_mm": length_mm(tool["nose_radius" if kind == "radius"
                                                       else "flat"]),
            "resolution_mm": length_mm(cfg["micrometer"]["resolution"]),
            "wires_mm": [length_mm(w.get("measured", w["marked"])) for w in cfg["wires"]],
            "spindle_gear": cfg["indexing"]["spindle_gear"],
            "plate_slots": cfg["indexing"]["driving_plate_slots"]}
