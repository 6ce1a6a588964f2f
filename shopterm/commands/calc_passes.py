"""``shopterm calc passes SPEC --od D``: total infeed, pass plan on this lathe's dials, tool check."""

from __future__ import annotations

from shopterm.commands import add_json_option, add_units_option, emit_json, length_out, print_table
from shopterm.cutting.infeed import METHODS, infeed_method
from shopterm.cutting.plan import (DEFAULT_MAX_FIRST, DEFAULT_MIN_PASS, PLAN_KINDS, bore_to_prepare,
                                   make_plan)
from shopterm.cutting.tool import check_tool, power_tool, standard_tip, tool_depth
from shopterm.cutting.wires import is_power_form
from shopterm.errors import InvalidEntry
from shopterm.lathe.machine import Dial, Shop, ToolTip
from shopterm.units import parse_length, parse_number


def register(subparsers) -> None:
    p = subparsers.add_parser(
        "passes", help="total infeed and the pass plan on your dials",
        description="From the turned diameter and the tool tip: the total radial infeed to the "
                    "aim pitch diameter, the passes as dial settings, and a check of the tool's "
                    "form against the thread. Lengths take a unit suffix (mm, in); without one "
                    "they are in the thread's own unit.")
    p.add_argument("spec", metavar="SPEC", help="designation, e.g. M10x1.5-6g or '1/4-20 UNC-2A'")
    p.add_argument("--od", required=True, metavar="D",
                   help="measured diameter turned: the blank's OD (external) or the bore (internal)")
    p.add_argument("--internal", action="store_const", const="internal", dest="kind",
                   help="an internal thread (where the class does not say so)")
    tip = p.add_mutually_exclusive_group()
    tip.add_argument("--tip-flat", metavar="F", help="width of the flat on the tool's tip")
    tip.add_argument("--tip-radius", metavar="R", help="nose radius of the tool's tip")
    p.add_argument("--method", choices=METHODS, default="modified",
                   help="infeed method (default: modified flank)")
    p.add_argument("--angle", metavar="A",
                   help="the compound's true angle from the cross-slide [deg] (29.5 for 60°)")
    p.add_argument("--offset", metavar="DEG", default="0.5",
                   help="modified/alternating: degrees under half the form angle (default 0.5)")
    p.add_argument("--plan", choices=PLAN_KINDS, default="constant-area", dest="plan_kind",
                   help="how the depth is split (default: constant-area)")
    p.add_argument("--passes", metavar="N", help="number of infeed passes (spring passes apart)")
    p.add_argument("--max-first", metavar="H",
                   help=f"largest first pass on radius when --passes is not given "
                        f"(default {DEFAULT_MAX_FIRST} mm)")
    p.add_argument("--min-pass", metavar="H",
                   help=f"smallest infeed pass on radius (default {DEFAULT_MIN_PASS} mm)")
    p.add_argument("--finish", metavar="H", help="depth of a last finishing pass (default none)")
    p.add_argument("--spring", metavar="N", default="1", help="spring passes (default 1)")
    p.add_argument("--depth", metavar="H", help="total radial infeed, instead of computing it")
    p.add_argument("--dial-div", metavar="X",
                   help="slide travel per division of the feeding dial (default: from the config)")
    p.add_argument("--step", metavar="S", default="1",
                   help="round dial settings to this many divisions (default 1; 0.5 for halves)")
    add_units_option(p)
    add_json_option(p)
    p.set_defaults(func=run)


def _whole(text: str, what: str, minimum: int) -> int:
    value = parse_number(text)
    if value != int(value) or value < minimum:
        raise InvalidEntry(f"{what} must be a whole number, {minimum} or more (got {text!r}).")
    return int(value)


def _config(path):
    """Return (lathe, shop, notes) from the config, or (None, None, notes) when it cannot load."""
    try:
        from shopterm.config import HOW_SAMPLE, load_config
        cfg = load_config(path)
    except Exception as exc:  # the config module may be missing or the file bad: say so
        return None, None, (f"Config not used ({exc}); the compound scale is taken as reading 0 "
                            "along the cross-slide.",)
    notes = ()
    if cfg.how_found == HOW_SAMPLE:
        notes = (f"Using {HOW_SAMPLE}: its lathe is a demo; write your own config for your "
                 "dials.",)
    return cfg.lathe, cfg.shop, notes


def run(args) -> int:
    from shopterm.standards import limits as thread_limits
    from shopterm.standards import parse

    spec = parse(args.spec, kind=args.kind)
    lim = thread_limits(spec)
    native = spec.native_unit
    unit = args.units or native

    def length(text, what, positive=True):
        mm = parse_length(text, native)
        if positive and not mm > 0:
            raise InvalidEntry(f"The {what} must be greater than zero.")
        return mm

    od = length(args.od, "turned diameter (--od)")
    lathe, shop, notes = _config(getattr(args, "config", None))
    notes = list(notes)
    if args.tip_flat is not None:
        tip = ToolTip("flat", length(args.tip_flat, "tip flat", positive=False))
    elif args.tip_radius is not None:
        tip = ToolTip("radius", length(args.tip_radius, "tip radius", positive=False))
    elif shop is not None and not (is_power_form(spec.form) and shop.tool.kind == "radius"):
        tip = shop.tool
        notes.append(f"Tool tip from the config: {tip.kind} {tip.size:.3f} mm.")
    else:
        tip = standard_tip(lim)
        notes.append(f"No tip given: using the standard's root, {tip.kind} {tip.size:.3f} mm.")
    angle = parse_number(args.angle) if args.angle is not None else None
    offset = parse_number(args.offset)
    method = infeed_method(args.method, spec.form.angle_deg, angle_deg=angle, offset_deg=offset,
                           lathe=lathe, internal=not spec.is_external, hand=spec.hand)
    power = None
    if is_power_form(spec.form):
        power = power_tool(lim, tip, max_side_clearance_deg=(
            shop.tool_side_clearance_deg if shop is not None else Shop().tool_side_clearance_deg))
        notes.extend(power.notes)
    depth = tool_depth(lim, od, tip)
    total = depth.total_radial
    if args.depth is not None:
        total = length(args.depth, "depth (--depth)")
        notes.append(f"Total infeed set with --depth; the tip geometry gives "
                     f"{depth.total_radial:.4f} mm.")
    feed_dial = None
    if args.dial_div is not None:
        div_mm = length(args.dial_div, "dial division (--dial-div)")
        base = None
        if lathe is not None:
            base = lathe.compound_dial if method.feeds_with == "compound" else lathe.cross_dial
        feed_dial = Dial("mm", div_mm, base.divisions if base else 100, reads_diameter=False)
    passes = _whole(args.passes, "--passes", 1) if args.passes is not None else None
    kwargs = {}
    if args.max_first is not None:
        kwargs["max_first"] = length(args.max_first, "largest first pass (--max-first)")
    if args.min_pass is not None:
        kwargs["min_pass"] = length(args.min_pass, "minimum pass (--min-pass)", positive=False)
    finish = length(args.finish, "finishing pass", positive=False) if args.finish else 0.0
    step = parse_number(args.step)
    plan = make_plan(total, method, lathe=lathe, kind=args.plan_kind, passes=passes,
                     finish=finish, spring=_whole(args.spring, "--spring", 0), dial_step=step,
                     internal=not spec.is_external, feed_dial=feed_dial,
                     flat_bottom=tip.size if power is not None else 0.0, **kwargs)
    check = check_tool(lim, tip, turned_diameter=od)
    bore = bore_to_prepare(lim) if not spec.is_external else None
    notes += list(depth.notes) + list(plan.notes)

    def L(mm):
        return length_out(mm, unit)

    def pass_dict(p):
        d = {"n": p.n, "radial_cum": L(p.radial_cum), "radial_inc": L(p.radial_inc),
             "compound_cum": L(p.compound_cum), "compound_inc": L(p.compound_inc),
             "dial_divisions": p.dial_divisions, "kind": p.kind,
             "exact_radial_cum": L(p.exact_radial_cum)}
        if p.side is not None:
            d.update(side=p.side, side_divisions=p.side_divisions)
        return d

    if args.json:
        emit_json({
            "designation": spec.designation, "units": unit,
            "aim_pd": L(depth.aim_pd), "turned_diameter": L(od),
            "tip": {"kind": tip.kind, "size": L(tip.size)},
            "basic_depth": L(lim.depth), "computed_radial": L(depth.total_radial),
            "total_radial": L(total), "method": method.method,
            "compound_angle_true": method.true_angle_deg,
            "compound_angle_set": method.scale_reading_deg,
            "feeds_with": method.feeds_with,
            "compound_total": L(plan.compound_total),
            "passes": [pass_dict(p) for p in plan.passes],
            "spring_passes": [pass_dict(p) for p in plan.spring_passes],
            "tool_check": {"ok": check.ok, "messages": list(check.messages),
                           "interference": L(check.interference)},
            "bore": None if bore is None else {"min": L(bore.minor_min),
                                               "max": L(bore.minor_max),
                                               "suggested": L(bore.suggested)},
            "power_tool": None if power is None else {
                "flat": L(power.tip.size), "standard_flat": L(power.standard_flat),
                "helix_minor_deg": round(power.helix_minor_deg, 3),
                "helix_major_deg": round(power.helix_major_deg, 3),
                "leading_clearance_deg": round(power.leading_deg, 3),
                "trailing_clearance_deg": round(power.trailing_deg, 3),
                "leading_side": power.leading_side},
            "notes": notes,
        })
        return 0

    dec = 3 if unit == "mm" else 4

    def f(mm):
        v = length_out(mm, unit)
        return f"{v:.{dec}f}"

    print(f"{spec.designation} ({spec.kind})  [{unit}]")
    print(f"aim PD {f(depth.aim_pd)}   turned {f(od)}   tip {tip.kind} {f(tip.size)}")
    print(f"total radial infeed {f(total)}   (standard's basic depth {f(lim.depth)})")
    if method.feeds_with == "compound":
        print(f"compound {method.true_angle_deg:g}° from the cross-slide: set "
              f"{method.scale_reading_deg:g}° on its scale; travel {f(plan.compound_total)}")
    else:
        print(f"method {method.method}: feed on the cross-slide")
    rows = []
    for p in plan.passes + plan.spring_passes:
        label = f"spring {p.n}" if p.kind == "spring" else (
            f"{p.n} finish" if p.kind == "finish" else str(p.n))
        rows.append((label, f(p.radial_cum), f(p.radial_inc), f(p.compound_cum),
                     f"{p.dial_divisions:g}"))
    print_table(rows, ("pass", "radial", "+radial", "compound", "dial"))
    for m in check.messages:
        print(m)
    if power is not None:
        print(f"helix {power.helix_minor_deg:.2f}° at the minor, {power.helix_major_deg:.2f}° "
              f"at the major; side clearance: leading {power.leading_deg:.1f}° (the "
              f"{power.leading_side} side), trailing {power.trailing_deg:.1f}°")
    if bore is not None:
        print(bore.text)
    for n in notes:
        print(f"note: {n}")
    return 0
