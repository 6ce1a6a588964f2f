"""``shopterm calc gears --lead L``: the change gears that make a lead on this leadscrew.

Also holds the small helpers that ``calc dial`` and ``calc starts`` share (reading the lead,
falling back on the config's lathe when flags leave something out).
"""

from __future__ import annotations

from fractions import Fraction

from shopterm.commands import add_json_option, emit_json, print_table
from shopterm.errors import InvalidEntry, ShoptermError
from shopterm.lathe.gears import (DEFAULT_MARGIN, GearTrain, find_trains, parse_gear_list,
                                  parse_gearbox, parse_lead, parse_leadscrew, parse_ratio)
from shopterm.lathe.machine import Lathe
from shopterm.units import MM_PER_INCH

LEAD_HELP = "lead wanted: 1.5mm, 1.5 (mm), 0.05in or 20tpi (multi-start: the lead)"


def register(subparsers) -> None:
    p = subparsers.add_parser(
        "gears", help="change gears for a lead",
        description="Simple and compound change-gear trains that make a lead, best first. "
                    "Flags override the config's lathe.")
    p.add_argument("--lead", metavar="L", help=LEAD_HELP)
    p.add_argument("--leadscrew", metavar="S", help="leadscrew: 8tpi or 3mm")
    p.add_argument("--gears", metavar="LIST", help="gears owned: 20,25,30x2,...,127 (x2 = two)")
    p.add_argument("--box", metavar="LIST", help="gearbox positions: A=1/2,B=1,C=2")
    p.add_argument("--fixed", metavar="R", help="fixed ratio in the drive (stud/tumbler), e.g. 1 or 1/2")
    p.add_argument("--margin", metavar="TEETH", type=str,
                   help=f"compound clearance margin in teeth (default {DEFAULT_MARGIN})")
    p.add_argument("--limit", metavar="N", type=str, help="how many trains to show (default 8)")
    p.add_argument("--simple", action="store_true", help="simple trains only (no compound)")
    add_json_option(p)
    p.set_defaults(func=run)


# --------------------------------------------------------------------------------------------
# Shared by calc gears / dial / starts

def need_lead(args) -> Fraction:
    """Return the ``--lead`` given, exactly [mm]; says what to type when it is missing."""
    if not getattr(args, "lead", None):
        raise InvalidEntry("Give the lead with --lead, e.g. --lead 1.5mm or --lead 20tpi.")
    return parse_lead(args.lead)


def whole_number(text: str | None, what: str, flag: str, minimum: int = 1) -> int | None:
    """Return ``text`` as a whole number ≥ ``minimum``, or None when not given."""
    if text is None:
        return None
    try:
        value = int(str(text).strip())
    except ValueError:
        raise InvalidEntry(f"{flag} {text!r}: the {what} is a whole number, e.g. {flag} "
                           f"{max(minimum, 2)}.") from None
    if value < minimum:
        raise InvalidEntry(f"{flag} {text}: the {what} must be at least {minimum}.")
    return value


def config_lathe(args, flags: str) -> Lathe:
    """Return the lathe from the config; if none can be read, say which flags to pass."""
    try:
        from shopterm.config import load_config
    except ImportError:
        raise InvalidEntry(f"No config reader is available: pass {flags}.") from None
    try:
        config = load_config(getattr(args, "config", None) or None)
    except ShoptermError as exc:
        raise InvalidEntry(f"{exc} Or pass {flags} to leave the config out.") from None
    lathe = getattr(config, "lathe", config)
    if not isinstance(lathe, Lathe):
        raise InvalidEntry(f"The config gave no lathe: pass {flags}.")
    return lathe


def mm_and_tpi(lead_mm: float) -> str:
    """Return a lead as ``3 mm (8.4667 tpi)`` for the text output. lead_mm [mm]"""
    return f"{lead_mm:.6g} mm ({MM_PER_INCH / lead_mm:.4f} tpi)"


# --------------------------------------------------------------------------------------------

def train_dict(t: GearTrain) -> dict:
    """Return one train as ``calc gears --json`` prints it (lengths in mm)."""
    return {
        "kind": t.kind,
        "box": t.box,
        "drivers": list(t.drivers),
        "driven": list(t.driven),
        "ratio": f"{t.ratio.numerator}/{t.ratio.denominator}",
        "lead_made": round(t.lead_made_mm, 9),
        "error_pct": round(t.error_pct, 6),
        "error_per_25mm": round(t.error_per_25mm, 6),
        "error_per_inch": round(t.error_per_inch, 7),
        "exact": t.exact,
        "describe": t.describe(),
    }


def run(args) -> int:
    lead = need_lead(args)
    limit = whole_number(args.limit, "number of trains", "--limit") or 8
    margin = whole_number(args.margin, "clearance margin", "--margin", minimum=0)
    fixed = parse_ratio(args.fixed) if args.fixed else None
    box = parse_gearbox(args.box) if args.box else None
    leadscrew = parse_leadscrew(args.leadscrew) if args.leadscrew else None
    gears = parse_gear_list(args.gears) if args.gears else None
    if leadscrew is None or (gears is None and box is None):
        lathe = config_lathe(args, "--leadscrew and --gears")
        leadscrew = leadscrew or lathe.leadscrew
        if gears is None:
            gears = lathe.gears
        if box is None:
            box = lathe.gearbox
        fixed = fixed if fixed is not None else lathe.fixed_ratio
        margin = margin if margin is not None else lathe.clearance_margin
    trains = find_trains(leadscrew, lead, gears or (), fixed_ratio=fixed or 1,
                         gearbox=box or (), margin=DEFAULT_MARGIN if margin is None else margin,
                         compound=not args.simple, limit=limit)
    if args.json:
        emit_json({"lead": float(lead), "lead_unit": "mm", "leadscrew": leadscrew.label(),
                   "trains": [train_dict(t) for t in trains]})
        return 0
    print(f"Lead {mm_and_tpi(float(lead))}, leadscrew {leadscrew.label()}")
    rows = []
    for n, t in enumerate(trains, 1):
        if t.kind == "simple":
            gears_text = f"{t.drivers[0]} > idler > {t.driven[0]}"
        elif t.kind == "compound":
            gears_text = f"{t.drivers[0]}/{t.driven[0]} x {t.drivers[1]}/{t.driven[1]}"
        else:
            gears_text = "no change gears"
        if t.box is not None:
            gears_text = f"box {t.box}: {gears_text}"
        rows.append((f"{n}. {gears_text}", f"{t.lead_made_mm:.6f}",
                     "exact" if t.exact else f"{t.error_pct:+.4f}",
                     f"{t.error_per_25mm:+.4f}", f"{t.error_per_inch:+.5f}"))
    if rows:
        print_table(rows, ("train (A/B x C/D: A, C drive)", "lead mm", "error %",
                           "mm/25mm", "in/in"))
    else:
        print("No train found: list more gears with --gears.")
    return 0
