"""Gear-search benchmark: the numpy table + binary search against a plain itertools brute force.

What is measured, and why it is fair:

- The gear set is 30 gears (the usual 20-80 range in small steps plus 127), on an 8 tpi
  leadscrew, compound trains with the default clearance margin of 15 teeth.
- The leads are every distinct lead in the thread catalogue (``shopterm.standards.catalogue()``).
  If the catalogue raises or is empty, a built-in list of common leads is used and the report
  says so (``leads_from``).
- numpy: imported before the clock starts (its import is a start-up cost, measured by
  ``bench_startup.py``). The table cache is cleared first, so the figure includes building the
  table once, then ``find_trains`` for every lead (ranked answers, 8 each). The query alone
  (table already cached, as it is for the rest of a session) is reported too.
- Brute force: for one lead, every ordered choice of 2 or 4 gears from the set
  (``itertools.permutations``), the clearance rule, the error in floats, keeping the best. It
  only finds the best train (less work than a ranking), so it is the cheapest honest baseline.
  It is far too slow to run for every lead, so it runs on ``brute_leads`` leads spread over the
  list and its time per lead is taken from those.
- The same answers are checked: on each brute-forced lead, the best train's exact error
  (``fractions.Fraction``) must equal the numpy search's first answer's.

``gear_speedup`` = brute-force time per lead / numpy time per lead with the table build shared
over the catalogue's leads (the conservative figure); ``gear_speedup_query_only`` uses the
cached query alone.
"""

from __future__ import annotations

import itertools
import sys
import time
from fractions import Fraction
from pathlib import Path

if __package__ in (None, ""):
    sys.path.insert(0, str(Path(__file__).resolve().parents[2]))

from shopterm.lathe.gears import DEFAULT_MARGIN, find_trains, train_table  # noqa: E402
from shopterm.lathe.machine import Leadscrew  # noqa: E402

GEARS_30 = (20, 22, 24, 25, 26, 28, 30, 32, 33, 34, 35, 36, 38, 40, 42, 44, 45, 46, 48, 50,
            52, 54, 55, 56, 60, 64, 65, 70, 75, 127)

#: Used only when the catalogue cannot be read: common metric pitches and inch tpi [mm].
FALLBACK_LEADS = tuple(sorted(
    {float(p) for p in (0.5, 0.7, 0.75, 0.8, 1, 1.25, 1.5, 1.75, 2, 2.5, 3, 3.5, 4)}
    | {25.4 / n for n in (8, 10, 11, 12, 13, 14, 16, 18, 20, 24, 26, 28, 32, 40)}))


def catalogue_leads() -> tuple[tuple[float, ...], str]:
    """Return (distinct leads [mm], where they came from)."""
    try:
        from shopterm.standards import catalogue
        leads = sorted({round(spec.lead, 9) for spec in catalogue()})
        if leads:
            return tuple(leads), "catalogue"
        return FALLBACK_LEADS, "built-in list (catalogue empty)"
    except Exception as exc:                      # the catalogue is someone else's module
        return FALLBACK_LEADS, f"built-in list (catalogue failed: {type(exc).__name__})"


def brute_best(pitch: float, lead: float, gears, margin: int = DEFAULT_MARGIN):
    """Return (drivers, driven) of the smallest-error train, by itertools brute force."""
    best, best_err = None, float("inf")
    for a, b in itertools.permutations(gears, 2):
        err = abs(pitch * a / b - lead)
        if err < best_err:
            best, best_err = ((a,), (b,)), err
    for a, b, c, d in itertools.permutations(gears, 4):
        if a + b >= c + margin and c + d >= b + margin:
            err = abs(pitch * a * c / (b * d) - lead)
            if err < best_err:
                best, best_err = ((a, c), (b, d)), err
    return best


def exact_error(ls: Leadscrew, lead: float, drivers, driven) -> Fraction:
    r = Fraction(1)
    for t in drivers:
        r *= t
    for t in driven:
        r /= t
    wanted = Fraction(lead).limit_denominator(10**6)
    return abs(ls.pitch_exact * r / wanted - 1)


def run(brute_leads: int = 6) -> dict:
    """Return the benchmark figures ({"gear_speedup": float, ...}) after printing them."""
    import numpy  # noqa: F401  (see the module docstring)

    ls = Leadscrew.from_tpi(8)
    leads, source = catalogue_leads()
    gearset = tuple((t, 1) for t in GEARS_30)

    train_table.cache_clear()
    t0 = time.perf_counter()
    answers = {lead: find_trains(ls, lead, gearset) for lead in leads}
    numpy_total = time.perf_counter() - t0
    t0 = time.perf_counter()
    for lead in leads:
        find_trains(ls, lead, gearset)
    query_only = (time.perf_counter() - t0) / len(leads)

    step = max(1, len(leads) // max(1, brute_leads))
    sample = leads[::step][:brute_leads]
    mismatches = []
    t0 = time.perf_counter()
    for lead in sample:
        drivers, driven = brute_best(ls.pitch, lead, GEARS_30)
        top = answers[lead][0]
        if exact_error(ls, lead, drivers, driven) != exact_error(ls, lead, top.drivers, top.driven):
            mismatches.append(lead)
    brute_per_lead = (time.perf_counter() - t0) / len(sample)
    numpy_per_lead = numpy_total / len(leads)
    result = {
        "gear_speedup": brute_per_lead / numpy_per_lead,
        "gear_speedup_query_only": brute_per_lead / query_only,
        "leads": len(leads),
        "leads_from": source,
        "brute_force_leads": len(sample),
        "brute_ms_per_lead": round(brute_per_lead * 1e3, 2),
        "numpy_ms_per_lead": round(numpy_per_lead * 1e3, 3),
        "numpy_query_ms": round(query_only * 1e3, 3),
        "table_trains": len(train_table(gearset)),
        "same_answers": not mismatches,
        "mismatched_leads": mismatches,
    }
    print(f"gear search, 30 gears, {len(leads)} leads from the {source}")
    print(f"  brute force  {result['brute_ms_per_lead']:9.2f} ms/lead "
          f"(on {len(sample)} leads)")
    print(f"  numpy        {result['numpy_ms_per_lead']:9.3f} ms/lead (table build included; "
          f"{result['numpy_query_ms']:.3f} ms per query)")
    print(f"  speed-up     {result['gear_speedup']:9.1f}x with the build, "
          f"{result['gear_speedup_query_only']:.1f}x per cached query (target >= 100x)")
    print(f"  same answers: {'yes' if not mismatches else 'NO ' + str(mismatches)}")
    return result


if __name__ == "__main__":
    run()
