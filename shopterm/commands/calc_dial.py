"""``shopterm calc dial --lead L``: the thread-dial lines where the half nut may be closed."""

from __future__ import annotations

from shopterm.commands import add_json_option, emit_json
from shopterm.commands.calc_gears import (LEAD_HELP, config_lathe, mm_and_tpi, need_lead,
                                          whole_number)
from shopterm.errors import InvalidEntry
from shopterm.lathe.gears import parse_leadscrew
from shopterm.lathe.machine import ThreadDial
from shopterm.lathe.thread_dial import DialPlan, dial_plan

FLAGS = "--leadscrew, --dial-teeth and --dial-lines"


def register(subparsers) -> None:
    p = subparsers.add_parser(
        "dial", help="thread-dial lines for a lead",
        description="On which thread-dial lines the half nut may be closed for a lead, or "
                    "that it must stay closed. Lines are numbered 1..K from the reference "
                    "line. Flags override the config's lathe.")
    p.add_argument("--lead", metavar="L", help=LEAD_HELP)
    p.add_argument("--leadscrew", metavar="S", help="leadscrew: 8tpi or 3mm")
    p.add_argument("--dial-teeth", metavar="T", help="teeth of the dial's worm wheel")
    p.add_argument("--dial-lines", metavar="K", help="lines engraved on the dial")
    p.add_argument("--numbered", metavar="LIST", help="which lines carry a number, e.g. 1,3,5,7")
    p.add_argument("--starts", metavar="N", help="number of starts (default 1)")
    add_json_option(p)
    p.set_defaults(func=run)


def parse_numbered(text: str | None) -> tuple[int, ...]:
    """Return the numbered lines from ``1,3,5,7`` (empty when not given)."""
    if not text:
        return ()
    out = []
    for part in text.split(","):
        if part.strip():
            n = whole_number(part, "line number", "--numbered")
            out.append(n)
    return tuple(out)


def plan_dict(plan: DialPlan) -> dict:
    """Return a dial plan as ``calc dial --json`` prints it."""
    return {
        "lead": plan.lead_mm,
        "lines": list(plan.lines),
        "numbered": list(plan.numbered),
        "anywhere": plan.anywhere,
        "keep_half_nut_closed": plan.keep_half_nut_closed,
        "line_travel_mm": round(plan.line_travel_mm, 9),
        "starts": plan.starts,
        "start_lines": {str(s): list(v) for s, v in plan.start_lines},
        "plan": plan.describe(),
    }


def run(args) -> int:
    lead = need_lead(args)
    starts = whole_number(args.starts, "number of starts", "--starts") or 1
    teeth = whole_number(args.dial_teeth, "number of dial teeth", "--dial-teeth")
    lines = whole_number(args.dial_lines, "number of dial lines", "--dial-lines")
    if (teeth is None) != (lines is None):
        raise InvalidEntry("Give both --dial-teeth and --dial-lines.")
    leadscrew = parse_leadscrew(args.leadscrew) if args.leadscrew else None
    dial = ThreadDial(teeth, lines, parse_numbered(args.numbered)) if teeth else None
    if leadscrew is None or dial is None:
        lathe = config_lathe(args, FLAGS)
        leadscrew = leadscrew or lathe.leadscrew
        dial = dial or lathe.thread_dial
        if dial is None:
            raise InvalidEntry("The config's lathe has no thread dial: pass --dial-teeth and "
                               "--dial-lines.")
    plan = dial_plan(leadscrew, dial, lead, starts)
    if args.json:
        emit_json(plan_dict(plan))
        return 0
    print(f"Lead {mm_and_tpi(plan.lead_mm)}, leadscrew {leadscrew.label()}, dial "
          f"{dial.teeth} teeth / {dial.lines} lines")
    print(plan.describe())
    if plan.keep_half_nut_closed:
        print("Caution: stop short of the shoulder; reverse only with the tool withdrawn.")
    elif not plan.anywhere:
        print(f"Usable lines: {', '.join(map(str, plan.lines))} "
              f"(carriage {plan.line_travel_mm:.4f} mm from line to line)")
    for s, ls in plan.start_lines:
        print(f"  start {s}: " + (", ".join(map(str, ls)) if ls else "no line"))
    return 0
