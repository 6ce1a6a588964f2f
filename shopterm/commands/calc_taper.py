"""``shopterm calc taper [SPEC] --work-length L``: set-over, attachment and compound for a taper."""

from __future__ import annotations

import textwrap

from shopterm.commands import add_json_option, add_units_option, emit_json, length_out
from shopterm.errors import InvalidEntry, ShoptermError
from shopterm.lathe.gears import parse_ratio
from shopterm.lathe.taper import TaperSetups, taper_setups
from shopterm.units import format_length, parse_length


def register(subparsers) -> None:
    p = subparsers.add_parser(
        "taper", help="tailstock set-over, taper attachment and compound for a taper",
        description="How to make a taper on the config's lathe: the tailstock set-over for work "
                    "between centres, the taper attachment's setting, and the compound's angle "
                    "for a short taper. Give a tapered thread (R1/2, 1/2-14 NPT) or --taper. "
                    "Lengths take a unit suffix (mm, in); without one they are in the thread's "
                    "own unit (mm with --taper).")
    p.add_argument("spec", metavar="SPEC", nargs="?", help="a tapered thread, e.g. R1/2")
    p.add_argument("--taper", metavar="K", help="taper on diameter instead of SPEC: 1:16, 1/16 "
                                                "or 0.0625")
    p.add_argument("--work-length", metavar="L",
                   help="work's length between centres (leave out: not between centres)")
    p.add_argument("--taper-length", metavar="T",
                   help="length of the taper (default: the thread's useful length)")
    add_units_option(p)
    add_json_option(p)
    p.set_defaults(func=run)


def _lathe(path):
    """Return (lathe or None, note) from the config."""
    try:
        from shopterm.config import load_config
        return load_config(path or None).lathe, ""
    except ShoptermError as exc:
        return None, f"Config not used ({exc}); no set-over scale or attachment known."


def setups_dict(s: TaperSetups, unit: str) -> dict:
    """Return the set-ups as ``calc taper --json`` prints them (lengths in ``unit``)."""
    so, att, comp = s.set_over, s.attachment, s.compound
    return {
        "units": unit,
        "per_unit_on_diameter": s.k,
        "half_angle_deg": round(s.half_angle_deg, 6),
        "set_over": None if so is None else {
            "set_over": length_out(so.set_over, unit), "divisions": so.divisions,
            "by_indicator": so.by_indicator, "work_length": length_out(so.work_length, unit),
            "taper_length": length_out(so.taper_length, unit),
            "diameter_change": length_out(so.diameter_change, unit), "text": so.text},
        "set_over_refused": s.set_over_refused or None,
        "attachment": None if att is None else {
            "setting": round(att.setting, 6), "scale": att.scale,
            "per_foot_in": round(att.per_foot_in, 6), "per_100_mm": round(att.per_100_mm, 6),
            "text": att.text},
        "attachment_refused": s.attachment_refused or None,
        "compound": None if comp is None else {
            "scale_reading_deg": round(comp.scale_reading_deg, 6),
            "true_angle_deg": round(comp.true_angle_deg, 6),
            "travel": length_out(comp.travel, unit), "text": comp.text, "note": comp.note},
        "compound_refused": s.compound_refused or None,
        "tool_square": s.tool_square,
    }


def run(args) -> int:
    native, k, useful = "mm", None, None
    if args.spec and args.taper:
        raise InvalidEntry("Give a thread or --taper, not both.")
    if args.spec:
        from shopterm.cutting.taper_thread import taper_of
        from shopterm.standards import limits, parse
        spec = parse(args.spec)
        taper = taper_of(limits(spec))
        native, k, useful = spec.native_unit, taper.per_unit_on_diameter, taper.L2
    elif args.taper:
        k = float(parse_ratio(args.taper))
    else:
        raise InvalidEntry("Give a tapered thread (e.g. R1/2) or the taper with --taper 1:16.")
    unit = args.units or native
    work = None if args.work_length is None else parse_length(args.work_length, native)
    length = useful if args.taper_length is None else parse_length(args.taper_length, native)
    if length is None:
        raise InvalidEntry("Give the length of the taper with --taper-length, e.g. 20mm.")
    lathe, note = _lathe(getattr(args, "config", None))
    s = taper_setups(lathe, k, work, length)
    if args.json:
        out = setups_dict(s, unit)
        out["note"] = note or None
        emit_json(out)
        return 0
    f = lambda v: format_length(v, unit, 0.001 if unit == "mm" else 0.0001)   # noqa: E731

    def say(text: str) -> None:
        print(textwrap.fill(text, 80, subsequent_indent="    "))

    say(f"Taper {k:.6g} on diameter ({s.half_angle_deg:.4f}° to the axis) over {f(length)}")
    if note:
        say(note)
    say("Set-over:   " + (s.set_over.text if s.set_over else s.set_over_refused))
    say("Attachment: " + (s.attachment.text if s.attachment else s.attachment_refused))
    say("Compound:   " + (s.compound.text if s.compound else s.compound_refused))
    if s.compound:
        say("  " + s.compound.note)
    say(s.tool_square)
    return 0
