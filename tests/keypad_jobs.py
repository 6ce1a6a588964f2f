"""The whole keypad jobs, as data: the end-to-end test cuts them in tmux
(tests/e2e/test_whole_job.py) and the key-count benchmark replays them in-process
(tests/bench/bench_key_count.py), from this one definition.

Each job names the thread, how it is chosen on the thread screen (a list of (heading, label)
picks: the list walk, a favourite of the demo config), the starts, the display units and the
blank's OD as typed. The set-up answers after the change gears are ``setup`` (work holding and
run-out); a tapered thread adds how the taper is made (``taper``, with the work's length typed
for a set-over) and the plane its wire readings are taken at (``plane_typed``, from the small
end). An internal thread (``internal``) is made so on the thread screen and checked with a plug
gauge instead of wires.
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
    setup: tuple[tuple[str, str], ...] = ()     # (question, answer) after the gears; () = SETUP_ANSWERS
    taper: tuple[str, str] | None = None        # (question, answer) how the taper is made
    work_length_typed: str | None = None        # between centres, for a set-over [display unit]
    plane_typed: str | None = None              # wire readings' plane from the small end
    internal: bool = False
    angle_deg: float = 60.0                     # the form's included angle (for the simulator)
    taper_k: float = 0.0                        # taper on diameter (0: parallel)
    gauge_plane_mm: float = 0.0                 # of a tapered thread, from the small end

    @property
    def setup_answers(self) -> tuple[tuple[str, str], ...]:
        return self.setup or SETUP_ANSWERS


M10_6G = (8.862, 8.994)        # ISO 965-2, M10x1.5-6g d2 min / max
UNC_2A = (0.3287, 0.3331)      # ASME B1.1 table, 3/8-16 UNC-2A PD min / max

#: M10 by the list walk: the family, then its common coarse sizes.
M10_WALK = (("Thread family", "ISO metric"), ("Common sizes", "M10x1.5-6g"))
#: 3/8-16 UNC-2A as a favourite of the demo config (sample_config.toml [favourites]).
UNC_FAVOURITE = (("Thread family", "3/8-16 UNC-2A"),)

R12_BAND = (19.681, 19.906)    # ISO 7-1 size 1/2: PD 19.793 ± T1/2 × 1/16 = ± 1.8/16 at the
#                                gauge plane (from memory; computed band)
G34_INTERNAL = (25.279, 25.421)  # ISO 228-1, G3/4 internal: D2 25.279, + TD2 0.142 (from memory)
R12_GAUGE_LENGTH = 8.2         # ISO 7-1 table 1, size 1/2: gauge length [mm] (from memory)
PIPE_TAPER = 1 / 16            # ISO 7-1: taper 1 in 16 on diameter (from memory)

#: Pipe threads by the list walk: the family (on the list's second page), series, size.
R12_WALK = (("Thread family", "Pipe threads: G, R, NPT"), ("Series", "R"), ("Size", "1/2"))
G34_WALK = (("Thread family", "Pipe threads: G, R, NPT"), ("Series", "G"), ("Size", "3/4"))
#: Between centres (for the set-over), running out into a relief groove.
CENTRES = (("how is the work held?", "between centres (carrier and driving plate)"),
           ("where does the tool run out", "into a relief groove (undercut)"))

JOBS = (
    KeypadJob("M10x1.5-6g", "mm", M10_WALK, 1, "M10x1.5-6g", "9.95", M10_6G, True),
    KeypadJob("3/8-16 UNC-2A", "in", UNC_FAVOURITE, 1, "3/8-16 UNC-2A", "0.3730", UNC_2A, False),
    KeypadJob("M10x1.5 two starts", "mm", M10_WALK, 2, "M10", "9.95", M10_6G, False),
    KeypadJob("R1/2 between centres", "mm", R12_WALK, 1, "R1/2", "20.45", R12_BAND, True,
              setup=CENTRES, taper=("how is the taper made?",
                     "set-over between centres (then the work's length)"),
              work_length_typed="150", plane_typed="5", angle_deg=55.0, taper_k=PIPE_TAPER,
              gauge_plane_mm=R12_GAUGE_LENGTH),
    KeypadJob("G3/4 internal", "mm", G34_WALK, 1, "G3/4", "24.4", G34_INTERNAL, False,
              internal=True, angle_deg=55.0),
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
