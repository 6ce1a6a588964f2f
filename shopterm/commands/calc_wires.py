"""``shopterm calc wires SPEC``: wire sizes, the band over wires, and what readings say.

Without ``--wire`` the best owned wire set from the config is used, else the best size. A wire
that cannot work is reported (``wire_ok`` false) when there are no readings, and refused (exit 2,
naming the owned sizes that would work) when readings are given.
"""

from __future__ import annotations

import dataclasses
import sys

from shopterm.commands import add_json_option, add_units_option, emit_json, length_out, print_table
from shopterm.cutting.remaining import default_compound_angle, fit_check_offer, measure
from shopterm.cutting.wires import (band_over_wires, caliper_band, check_wire, choose_wire,
                                    is_power_form, require_wire, SQUARE_MEASURE)
from shopterm.errors import InvalidEntry
from shopterm.standards import limits as thread_limits
from shopterm.standards import parse, usual_class
from shopterm.units import DEFAULT_RESOLUTION, format_length, parse_length, parse_number


def register(subparsers) -> None:
    p = subparsers.add_parser(
        "wires", help="three-wire measurement: wire sizes, target readings, pitch diameter",
        description="Wire sizes for a thread, what the micrometer should read over them at the "
                    "ends of the pitch-diameter band, and — given readings — the pitch diameter "
                    "now and how much is left to feed.")
    p.add_argument("spec", metavar="SPEC", help="designation, e.g. M10x1.5-6g or '1/4-20 UNC-2A'")
    p.add_argument("--wire", metavar="W", help="wire diameter (as measured, if you know it); "
                   "in the thread's unit unless you add mm or in")
    p.add_argument("--reading", metavar="M", nargs="+", action="extend", dest="readings",
                   help="reading(s) over the wires, in the thread's unit unless you add mm or in")
    p.add_argument("--angle", metavar="A", help="the compound's true angle from the "
                   "cross-slide direction, degrees (default 29.5 for 60°, 27.5 for 55°, "
                   "23.5 for 47.5°)")
    p.add_argument("--aim", metavar="PD", help="pitch diameter to aim at inside the band "
                   "(default the middle)")
    add_units_option(p)
    add_json_option(p)
    p.set_defaults(func=run)


def _config(args):
    """Return the Config the app would use, or None when the config module is not there."""
    try:
        from shopterm.config import load_config
    except ImportError:
        return None
    return load_config(getattr(args, "config", None) or None)


def run(args) -> int:
    spec = parse(args.spec)
    if not spec.is_external:
        raise InvalidEntry(fit_check_offer(spec).message)
    lim = thread_limits(spec)
    power = is_power_form(spec.form)
    if spec.form.angle_deg <= 0:
        raise InvalidEntry(SQUARE_MEASURE)
    # No class given: a pipe thread has one tolerance, a trapezoidal or Acme thread is measured
    # to its usual class (7e, 2G: the limits say so); any other is measured to its basic size.
    basic_only = spec.tol_class is None and spec.family != "pipe" and not power
    if basic_only:                 # basic size only: the band is the basic pitch diameter
        lim = dataclasses.replace(lim, pd_max=lim.basic_pd, pd_min=lim.basic_pd)
    native = spec.native_unit
    unit = args.units or native
    cfg = _config(args)
    owned = cfg.shop.wires if cfg else ()
    resolution = cfg.shop.micrometer_resolution if cfg else DEFAULT_RESOLUTION[native] * (
        25.4 if native == "in" else 1.0)
    if args.angle is not None:
        angle = parse_number(args.angle)
    else:
        angle = default_compound_angle(spec.form)
    aim = parse_length(args.aim, native) if args.aim is not None else None

    choice = choose_wire(spec.form, spec.pitch, owned, unit)
    if args.wire is not None:
        wire = parse_length(args.wire, native)
        chk = check_wire(spec.form, spec.pitch, wire, owned, unit)
        wire_note = chk.message
    else:
        wire, chk = choice.size, None
        wire_note = choice.note
    wire_ok = chk.ok if chk is not None else True
    readings = [parse_length(t, native) for t in (args.readings or [])]
    if readings:
        require_wire(spec.form, spec.pitch, wire, owned, unit)
    result = None
    if readings:
        result = measure(lim, wire, readings, lathe=cfg.lathe if cfg else None,
                         compound_angle_deg=angle, aim_pd=aim, resolution=resolution, unit=unit)
    band = band_over_wires(spec.form, spec.pitch, spec.lead, lim.pd_max, lim.pd_min, wire) \
        if wire_ok else None
    # Power threads: the thickness at the pitch line, for a gear-tooth caliper (no wire needed).
    caliper = caliper_band(spec.form, spec.pitch, spec.lead, lim.pd_max, lim.pd_min,
                           lim.basic_major, lim.basic_pd) if power else None

    def L(v):
        return length_out(v, unit)

    if args.json:
        out = {
            "designation": spec.designation,
            "units": unit,
            "best_wire": L(choice.range.best),
            "wire_min": L(choice.range.smallest),
            "wire_max": L(choice.range.largest),
            "wire": L(wire),
            "wire_ok": wire_ok,
            "wire_message": wire_note if not wire_ok else "",
            "over_wires": ({"at_pd_max": L(band.at_pd_max), "at_pd_min": L(band.at_pd_min),
                            "at_pd_max_simple": L(band.at_pd_max_simple),
                            "at_pd_min_simple": L(band.at_pd_min_simple)}
                           if band else None),
            "caliper": None if caliper is None else {
                "depth_setting_from_basic_major": L(caliper.depth_setting),
                "normal_thickness_at_pd_max": L(caliper.at_pd_max),
                "normal_thickness_at_pd_min": L(caliper.at_pd_min)},
            "lead_angle_deg": round(lim.lead_angle_deg, 4),
            "compound_angle_deg": angle,
            "reading": None,
        }
        if result is not None:
            r = result
            out["reading"] = {
                "mean": L(r.readings.mean),
                "spread": L(r.readings.spread),
                "pitch_diameter": L(r.pitch_diameter),
                "pitch_diameter_simple": L(r.pd.pd_simple),
                "pitch_diameter_h28": L(r.pd.pd_h28),
                "state": r.state,
                "to_max": L(r.to_max),
                "to_mid": L(r.to_mid),
                "to_min": L(r.to_min),
                "radial_to_mid": L(r.radial_to_mid),
                "compound_to_mid": L(r.compound_to_mid),
                "message": r.headline,
                "spread_warning": r.readings.warning,
                "still_fits": list(r.still_fits),
            }
        emit_json(out)
        return 0

    res = 0.001 if unit == "mm" else 0.0001

    def f(v):
        return format_length(v, unit, res, suffix=False)

    usual = usual_class(spec) if power and spec.tol_class is None else None
    band_text = ("basic size" if basic_only else
                 f"{spec.tol_class or usual or ('at the gauge plane' if lim.taper else 'limits')}"
                 f"{' (no class given)' if usual else ''}: "
                 f"{f(lim.pd_max)} to {f(lim.pd_min)}")
    print(f"{spec.designation}  ({spec.form.angle_deg:g}° form, pitch diameter {band_text})  "
          f"[{unit}]")
    rng = choice.range
    print(f"wire {f(wire)}   best {f(rng.best)}, usable {f(rng.smallest)} to {f(rng.largest)}")
    if not wire_ok:
        print(f"refused: {wire_note}")
        if caliper is not None:
            print(f"gear-tooth caliper: depth slide {f(caliper.depth_setting)} from a crest at "
                  f"the basic major, thickness {f(caliper.at_pd_max)} to {f(caliper.at_pd_min)}")
        return 0
    if args.wire is None and wire_note:
        print(wire_note)
    rows = [("over wires at PD max", f(band.at_pd_max)),
            ("over wires at PD min", f(band.at_pd_min))]
    print_table(rows)
    print(f"lead angle {lim.lead_angle_deg:.2f}°; the simple formula (lead angle neglected) "
          f"would read {f(band.at_pd_max_simple)} to {f(band.at_pd_min_simple)}")
    if caliper is not None:
        print(f"or a gear-tooth caliper, depth slide {f(caliper.depth_setting)} from a crest at "
              f"the basic major: thickness square to the thread {f(caliper.at_pd_max)} to "
              f"{f(caliper.at_pd_min)}")
    if result is None:
        return 0
    r = result
    print_table([
        ("readings", f"{len(r.readings.values)}, mean {f(r.readings.mean)}, "
                     f"spread {f(r.readings.spread)}"),
        ("pitch diameter", f"{f(r.pitch_diameter)} (simple formula {f(r.pd.pd_simple)}, "
                           f"H28 {f(r.pd.pd_h28)})"),
        ("left to remove", f"to top {f(r.to_max)}, middle {f(r.to_mid)}, bottom {f(r.to_min)} "
                           "on diameter"),
    ])
    print(r.headline)
    if r.detail:
        print(r.detail)
    if r.readings.warning and r.readings.warning not in r.detail:
        print(r.readings.warning, file=sys.stderr)
    if r.state == "oversize":
        print(f"{r.direction} {r.backlash}")
    print(f"caution: {r.caution}")
    return 0
