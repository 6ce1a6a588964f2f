"""The whole keypad jobs, as data: the end-to-end test cuts them in tmux
(tests/e2e/test_whole_job.py) and the key-count benchmark replays them in-process
(tests/bench/bench_key_count.py), from this one definition.

Each job names the thread, how it is chosen on the thread screen (a list of (heading, label)
picks: the list walk, a favourite of the demo config), the starts, the display units and the
blank's OD as typed. The set-up answers after the change gears are ``setup`` (default
``SETUP_ANSWERS``: work holding and run-out). A power thread's job also
gives its form angle, any wire set the shop adds to the demo config for it, and how it is
measured: over wires, or with a gear-tooth caliper when no wire the shop owns fits.
A tapered thread adds how the taper is made (``taper``, with the work's length typed for a
set-over) and the plane its wire readings are taken at (``plane_typed``, from the small end).
An internal thread (``internal``) is made so on the thread screen and checked with a plug
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
    angle: float = 60.0                         # the form's included angle [deg]
    wires: tuple[str, ...] = ()                 # wire sets added to the demo config
    measure: str = "wires"                      # 'wires' or 'caliper'
    setup: tuple[tuple[str, str], ...] = ()     # (question, answer) after the gears; () = SETUP_ANSWERS
    taper: tuple[str, str] | None = None        # (question, answer) how the taper is made
    work_length_typed: str | None = None        # between centres, for a set-over [display unit]
    plane_typed: str | None = None              # wire readings' plane from the small end
    internal: bool = False
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

#: Pipe threads by the list walk: the family, then its common sizes.
R12_WALK = (("Thread family", "Pipe threads: G, R, NPT"), ("Common sizes", "R1/2"))
G34_WALK = (("Thread family", "Pipe threads: G, R, NPT"), ("Common sizes", "G3/4A"))
#: Between centres (for the set-over), running out into a relief groove.
CENTRES = (("how is the work held?", "between centres (carrier and driving plate)"),
           ("where does the tool run out", "into a relief groove (undercut)"))
#: Tr24x5 from the leadscrew group's common sizes (the two starts are set on the thread's options).
TR24_WALK = (("Thread family", "Leadscrew: trapezoidal, Acme"), ("Common sizes", "Tr24x5-7e"))
#: 1-5 ACME from the leadscrew group's common sizes.
ACME_WALK = (("Thread family", "Leadscrew: trapezoidal, Acme"), ("Common sizes", "1-5 ACME-2G"))
# ISO 2903, Tr24x10(P5)-7e d2 limits as this project computes them from the remembered
# tolerance formula with the multi-start factor (from memory, not checked against a print)
TR24_10_7E = (21.058, 21.394)
# ASME B1.5, 1-5 ACME-2G pitch diameter min / max (from memory: 0.8726 / 0.8920 in)
ACME_2G = (0.8726, 0.8920)

JOBS = (
    KeypadJob("M10x1.5-6g", "mm", M10_WALK, 1, "M10x1.5-6g", "9.95", M10_6G, True),
    KeypadJob("3/8-16 UNC-2A", "in", UNC_FAVOURITE, 1, "3/8-16 UNC-2A", "0.3730", UNC_2A, False),
    KeypadJob("M10x1.5 two starts", "mm", M10_WALK, 2, "M10", "9.95", M10_6G, False),
    KeypadJob("R1/2 between centres", "mm", R12_WALK, 1, "R1/2", "20.45", R12_BAND, True,
              setup=CENTRES, taper=("how is the taper made?",
                     "set-over between centres (then the work's length)"),
              work_length_typed="150", plane_typed="5", angle=55.0, taper_k=PIPE_TAPER,
              gauge_plane_mm=R12_GAUGE_LENGTH),
    KeypadJob("G3/4 internal", "mm", G34_WALK, 1, "G3/4", "24.4", G34_INTERNAL, False,
              internal=True, angle=55.0),
    # a 3-wire set of 2.5 mm, as a shop cutting 5 mm trapezoidal screws would own
    # (the best size for 5 mm pitch at 30°, 0.5176P = 2.588 mm, common practice, no source)
    KeypadJob("Tr24x10(P5) two starts", "mm", TR24_WALK, 2, "Tr24x10(P5)-7e", "23.9",
              TR24_10_7E, True, angle=30.0, wires=("2.5 mm",)),
    # the demo config owns no wire for 5 tpi Acme (0.0975 to 0.130 in): a gear-tooth caliper
    KeypadJob("1-5 ACME-2G", "in", ACME_WALK, 1, "1-5 ACME-2G", "0.995", ACME_2G, False,
              angle=29.0, measure="caliper"),
)

#: The set-up questions after the change gears (the best train, "1"), with the answer picked.
SETUP_ANSWERS = (("how is the work held?", "in a chuck"),
                 ("where does the tool run out", "into a relief groove (undercut)"))


#: A gear-tooth vernier's step [mm]: 0.0005 in (common practice, no source).
CALIPER_STEP_MM = 0.0005 * INCH

#: The power thread's flat, as the preparation names it ("3 flat width 1.696 mm").
FLAT_SHOWN = re.compile(r"3 flat width (\d+(?:\.\d+)?) (mm|in)")


def sim_tip(job: KeypadJob, facts: dict, prepare_text: str) -> tuple[str, float]:
    """Return (kind, size [mm]) of the tip the operator cuts with: a power thread's flat ground
    to the width the preparation names (as the compound angle, it is set as the screen says),
    else the config's tip."""
    if job.angle not in (29.0, 30.0):
        return facts["tip_kind"], facts["tip_mm"]
    m = FLAT_SHOWN.search(prepare_text)
    assert m, prepare_text
    return "flat", float(m[1]) * (INCH if m[2] == "in" else 1.0)


def job(name: str) -> KeypadJob:
    return next(j for j in JOBS if j.name == name)


def demo_config(tmp: Path, units: str, wires: tuple[str, ...] = ()) -> Path:
    """Return the sample config (the demo lathe) with the display in ``units`` and a micrometer
    that reads 0.001 mm (metric) or 0.0001 in (inch), as a shop with either would have, and
    the wire sets ``wires`` (marked sizes such as ``"2.5 mm"``) added to its own."""
    text = SAMPLE.read_text(encoding="utf-8")
    text = re.sub(r'(?m)^units = "\w+"', f'units = "{units}"', text, count=1)
    res = '"0.001 mm"' if units == "mm" else '"0.0001 in"'
    text = re.sub(r'(?m)^resolution = "[^"]*"', f"resolution = {res}", text, count=1)
    for w in wires:
        text = text.replace("[micrometer]", f'[[wires]]\nmarked = "{w}"\n\n[micrometer]', 1)
    path = tmp / f"demo-{units}{'-' + '-'.join(wires).replace(' ', '') if wires else ''}.toml"
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
