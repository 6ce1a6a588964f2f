"""``shopterm calc limits SPEC``: the limits of size of one thread."""

from __future__ import annotations

from shopterm.commands import add_json_option, add_units_option, emit_json, length_out, print_table
from shopterm.standards import cautions, parse
from shopterm.standards import limits as thread_limits
from shopterm.standards.spec import Limits
from shopterm.units import format_length


def register(subparsers) -> None:
    p = subparsers.add_parser("limits", help="limits of size of a thread",
                              description="Major, pitch and minor diameter limits of a thread.")
    p.add_argument("spec", metavar="SPEC", help="designation, e.g. M10x1.5-6g or '1/4-20 UNC-2A'")
    p.add_argument("--internal", action="store_const", const="internal", dest="kind",
                   help="an internal thread (where the class does not say so)")
    add_units_option(p)
    add_json_option(p)
    p.set_defaults(func=run)


def limits_dict(lim: Limits, unit: str) -> dict:
    """Return the limits as the JSON object ``calc limits --json`` prints."""
    spec = lim.spec
    return {
        "designation": spec.designation,
        "form_angle_deg": spec.form.angle_deg,
        "kind": spec.kind,
        "units": unit,
        "pitch": length_out(spec.pitch, unit),
        "lead": length_out(spec.lead, unit),
        "starts": spec.starts,
        "tpi": spec.tpi,
        "major": {"max": length_out(lim.major_max, unit), "min": length_out(lim.major_min, unit)},
        "pitch_diameter": {"max": length_out(lim.pd_max, unit), "min": length_out(lim.pd_min, unit)},
        "minor": {"max": length_out(lim.minor_max, unit), "min": length_out(lim.minor_min, unit)},
        "depth": length_out(lim.depth, unit),
        "lead_angle_deg": round(lim.lead_angle_deg, 4),
        "clearance": length_out(lim.clearance, unit),
        "tip_flat": length_out(lim.tip_flat, unit),
        "taper": taper_dict(lim.taper, unit),
        "notes": list(lim.notes),
    }


def taper_dict(taper, unit: str) -> dict | None:
    """Return a tapered thread's taper as ``calc limits --json`` prints it (None: parallel)."""
    if taper is None:
        return None
    return {"per_unit_on_diameter": taper.per_unit_on_diameter,
            "half_angle_deg": round(taper.half_angle_deg, 6),
            "gauge_plane_from_end": length_out(taper.gauge_plane_from_end, unit),
            "gauge_plane_tolerance": length_out(taper.gauge_plane_tolerance, unit),
            "gauge_diameter": length_out(taper.gauge_diameter, unit),
            "E0": length_out(taper.E0, unit), "E1": length_out(taper.E1, unit),
            "L1": length_out(taper.L1, unit), "L2": length_out(taper.L2, unit),
            "L3": length_out(taper.L3, unit)}


def taper_lines(taper, f, f_pd) -> list[str]:
    """Return the text lines ``calc limits`` prints for a taper (none for a parallel thread);
    ``f`` formats a length, ``f_pd`` E0 and E1 (printed one place finer by ASME B1.20.1)."""
    if taper is None:
        return []
    where = (f"{f(taper.gauge_plane_from_end)} from the small end"
             if taper.gauge_plane_from_end else "at the face of the fitting")
    out = [f"taper {taper.per_unit_on_diameter:g} on diameter ({taper.half_angle_deg:.4f}° to "
           f"the axis); gauge plane {where}, ± {f(taper.gauge_plane_tolerance)}"]
    sizes = [(name, getattr(taper, attr)) for name, attr in
             (("gauge diameter", "gauge_diameter"), ("E0", "E0"), ("E1", "E1"), ("L1", "L1"),
              ("L2", "L2"), ("L3", "L3")) if getattr(taper, attr) is not None]
    out.append("   ".join(f"{name} {(f_pd if name in ('E0', 'E1') else f)(v)}"
                           for name, v in sizes))
    return out


def run(args) -> int:
    spec = parse(args.spec, kind=args.kind)
    lim = thread_limits(spec)
    unit = args.units or spec.native_unit
    if args.json:
        emit_json(limits_dict(lim, unit))
        return 0
    res = 0.001 if unit == "mm" else 0.0001

    def f(v):
        return "—" if v is None else format_length(v, unit, res, suffix=False)

    print(f"{spec.designation}  ({spec.kind}, {spec.form.angle_deg:g}° form, "
          f"{'%g tpi' % spec.tpi if spec.tpi else 'P %s' % f(spec.pitch)}"
          f"{', lead ' + f(spec.lead) if spec.starts > 1 else ''})  [{unit}]")
    print_table([("major", f(lim.major_max), f(lim.major_min)),
                 ("pitch diameter", f(lim.pd_max), f(lim.pd_min)),
                 ("minor", f(lim.minor_max), f(lim.minor_min))], header=("", "max", "min"))
    print(f"basic depth {f(lim.depth)}   lead angle {lim.lead_angle_deg:.2f}°")
    for line in taper_lines(lim.taper, f, lambda v: format_length(v, unit, res / 10,
                                                                  suffix=False)):
        print(line)
    for note in lim.notes:
        print(f"note: {note}")
    for caution in cautions(spec):
        print(f"caution: {caution}")
    return 0
