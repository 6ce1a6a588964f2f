"""``shopterm calc starts --starts n --lead L``: every way to index to the next start."""

from __future__ import annotations

from shopterm.commands import add_json_option, emit_json
from shopterm.commands.calc_dial import parse_numbered
from shopterm.commands.calc_gears import (LEAD_HELP, config_lathe, mm_and_tpi, need_lead,
                                          whole_number)
from shopterm.errors import InvalidEntry
from shopterm.lathe.gears import parse_leadscrew, parse_ratio, trains_for_lathe
from shopterm.lathe.indexing import IndexingPlan, indexing_for_lathe, indexing_methods
from shopterm.lathe.machine import Dial, ThreadDial
from shopterm.units import parse_positive_length, split_unit

LATHE_FLAGS = ("compound_div", "plate_slots", "spindle_gear", "stud_gear", "leadscrew",
               "dial_teeth", "dial_lines")


def register(subparsers) -> None:
    p = subparsers.add_parser(
        "starts", help="indexing for a multi-start thread",
        description="Every way to move the tool from one start to the next, with the numbers. "
                    "With none of the lathe flags, the config's lathe is used.")
    p.add_argument("--starts", metavar="N", help="number of starts (2 or more)")
    p.add_argument("--lead", metavar="L", help=LEAD_HELP)
    p.add_argument("--compound-div", metavar="D", help="compound dial division: 0.02mm or 0.001in")
    p.add_argument("--compound-zero", choices=("cross_slide", "bed"), default="cross_slide",
                   help="what the compound scale's 0 is parallel to (default cross_slide)")
    p.add_argument("--plate-slots", metavar="N", help="slots in the driving plate")
    p.add_argument("--chucks", metavar="LIST", default="3,4", help="jaws of your chucks (default 3,4)")
    p.add_argument("--spindle-gear", metavar="T", help="teeth of a gear on the spindle")
    p.add_argument("--stud-gear", metavar="T", help="teeth of the stud gear (first driver)")
    p.add_argument("--fixed", metavar="R", help="stud turns per spindle turn (default 1)")
    p.add_argument("--leadscrew", metavar="S", help="leadscrew: 8tpi or 3mm (for the dial)")
    p.add_argument("--dial-teeth", metavar="T", help="teeth of the thread dial's worm wheel")
    p.add_argument("--dial-lines", metavar="K", help="lines on the thread dial")
    p.add_argument("--numbered", metavar="LIST", help="numbered dial lines, e.g. 1,3,5,7")
    add_json_option(p)
    p.set_defaults(func=run)


def plan_dict(plan: IndexingPlan) -> dict:
    """Return an indexing plan as ``calc starts --json`` prints it (lengths in mm)."""
    return {
        "starts": plan.starts,
        "lead": plan.lead_mm,
        "pitch": plan.pitch_mm,
        "methods": [{"key": m.key, "title": m.title, "works": m.works, "amount": m.amount,
                     "unit": m.unit, "whole": m.whole, "text": m.text, "detail": m.detail}
                    for m in plan.methods],
    }


def _compound_dial(text: str) -> Dial:
    _, unit = split_unit(text)
    unit = unit or "mm"
    value = parse_positive_length(text, unit, "compound division") / (25.4 if unit == "in" else 1)
    return Dial(unit, value, 1)


def _chucks(text: str) -> tuple[int, ...]:
    return tuple(whole_number(p, "number of jaws", "--chucks", minimum=2)
                 for p in text.split(",") if p.strip())


def run(args) -> int:
    starts = whole_number(args.starts, "number of starts", "--starts")
    if starts is None:
        raise InvalidEntry("Give the number of starts with --starts, e.g. --starts 2.")
    if starts < 2:
        raise InvalidEntry("A single-start thread needs no indexing: give --starts 2 or more.")
    lead = need_lead(args)
    chucks = _chucks(args.chucks or "")
    if not any(getattr(args, f) for f in LATHE_FLAGS):
        lathe = config_lathe(args, "--compound-div and the other lathe flags")
        train = None
        if lathe.gears or lathe.gearbox:
            found = trains_for_lathe(lathe, lead, limit=1)
            train = found[0] if found and found[0].exact else None
        plan = indexing_for_lathe(lathe, lead, starts, train=train, chucks=chucks)
    else:
        teeth = whole_number(args.dial_teeth, "number of dial teeth", "--dial-teeth")
        lines = whole_number(args.dial_lines, "number of dial lines", "--dial-lines")
        if (teeth is None) != (lines is None):
            raise InvalidEntry("Give both --dial-teeth and --dial-lines.")
        dial = ThreadDial(teeth, lines, parse_numbered(args.numbered)) if teeth else None
        plan = indexing_methods(
            lead, starts,
            compound_dial=_compound_dial(args.compound_div) if args.compound_div else None,
            compound_parallel_reading_deg=90.0 if args.compound_zero == "cross_slide" else 0.0,
            faceplate_slots=whole_number(args.plate_slots, "number of slots", "--plate-slots"),
            chucks=chucks,
            spindle_gear=whole_number(args.spindle_gear, "number of teeth", "--spindle-gear"),
            stud_gear=whole_number(args.stud_gear, "number of teeth", "--stud-gear"),
            fixed_ratio=parse_ratio(args.fixed) if args.fixed else 1,
            leadscrew=parse_leadscrew(args.leadscrew) if args.leadscrew else None,
            thread_dial=dial)
    if args.json:
        emit_json(plan_dict(plan))
        return 0
    print(f"{plan.starts} starts, lead {mm_and_tpi(plan.lead_mm)}, pitch {plan.pitch_mm:.6g} mm")
    working = plan.working
    if working:
        print("Works here:")
        for m in working:
            print(f"  {m.text}")
    others = [m for m in plan.methods if not m.works]
    if others:
        print("Not here:")
        for m in others:
            print(f"  {m.text}")
    print("Index with the spindle stopped; cut every start to the same depth.")
    return 0
