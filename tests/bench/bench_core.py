"""Core benchmark: limits, wires and a pass plan for every thread in the catalogue.

For each thread of ``shopterm.standards.catalogue()`` (external, usual class), the three things a
screen needs once a thread is chosen, each timed on its own with ``time.thread_time_ns`` (CPU
time of this thread: another process taking the CPU on a busy machine is not charged to us;
shopterm's core does no I/O or sleeping here, so on an idle machine it equals the wall time):

``limits``
    ``shopterm.standards.limits(spec)``.
``wires``
    ``choose_wire(form, pitch, shop.wires)`` (the demo config's wire sets) and
    ``band_over_wires(form, pitch, lead, pd_max, pd_min, wire)`` — the readings over wires that
    bound the pitch-diameter band, exact model (what the wire screen shows).
``plan``
    ``tool_depth(limits, major_max, shop.tool)`` (blank turned to the major max),
    ``infeed_method("modified", angle, lathe=...)`` and ``make_plan(total_radial, method,
    lathe=...)`` on the demo lathe's dials.

A *cold* sweep clears every ``functools`` cache in the loaded ``shopterm`` modules first (the
tolerance-table and catalogue caches), so each thread is computed as in a fresh process; the
headline ``core_catalogue_ms`` is the median of the cold sweeps' totals. *Warm* sweeps (caches
kept) are reported beside it. Sweeps repeat until ``budget_s`` is spent (at least one of each).
A part whose module is missing is skipped and reported (``core_parts_run``); a thread whose part
raises a ``ShoptermError`` is counted under ``core_errors`` with the message.
"""

from __future__ import annotations

import statistics
import sys
import time
from pathlib import Path

HERE = Path(__file__).resolve().parent
REPO = HERE.parents[1]
if str(REPO) not in sys.path:
    sys.path.insert(0, str(REPO))

TARGET_MS = 16.0
PARTS = ("limits", "wires", "plan")


def clear_caches() -> int:
    """Clear every functools cache in the loaded shopterm modules; return how many were cleared."""
    n = 0
    for name, mod in list(sys.modules.items()):
        if not name.startswith("shopterm") or mod is None:
            continue
        for value in list(vars(mod).values()):
            clear = getattr(value, "cache_clear", None)
            if callable(clear) and getattr(value, "__module__", None) == name:
                clear()
                n += 1
    return n


def _parts(config) -> tuple[dict, dict]:
    """Return (part name -> function(spec, lim) -> None, part name -> why it cannot run)."""
    from shopterm.standards import limits

    funcs: dict = {}
    missing: dict = {}
    lathe, shop = config.lathe, config.shop
    funcs["limits"] = None  # limits is always run first; its result feeds the other parts
    try:
        from shopterm.cutting.wires import band_over_wires, choose_wire

        def wires(spec, lim):
            choice = choose_wire(spec.form, spec.pitch, shop.wires)
            band_over_wires(spec.form, spec.pitch, spec.lead, lim.pd_max, lim.pd_min,
                            choice.size)
        funcs["wires"] = wires
    except ImportError as exc:
        missing["wires"] = f"{type(exc).__name__}: {exc}"
    try:
        from shopterm.cutting.infeed import infeed_method
        from shopterm.cutting.plan import make_plan
        from shopterm.cutting.tool import tool_depth

        def plan(spec, lim):
            internal = not spec.is_external
            turned = (lim.minor_min if internal else lim.major_max) or lim.basic_major
            depth = tool_depth(lim, turned, shop.tool)
            method = infeed_method("modified", spec.form.angle_deg, lathe=lathe,
                                   internal=internal, hand=spec.hand)
            make_plan(depth.total_radial, method, lathe=lathe, internal=internal)
        funcs["plan"] = plan
    except ImportError as exc:
        missing["plan"] = f"{type(exc).__name__}: {exc}"
    del limits
    return funcs, missing


def sweep(specs, config, funcs: dict, *, cold: bool) -> tuple[list[dict], dict[str, str]]:
    """Return per-thread times [ns] of each part for one pass over ``specs``, and errors.

    specs: ThreadSpecs; config: a shopterm Config (demo lathe, wires, tool); cold: clear the
    caches first.
    References: Python ``time.thread_time_ns`` (CLOCK_THREAD_CPUTIME_ID).
    """
    from shopterm.errors import ShoptermError
    from shopterm.standards import limits

    if cold:
        clear_caches()
    rows: list[dict] = []
    errors: dict[str, str] = {}
    clock = time.thread_time_ns
    for spec in specs:
        row = {"thread": spec.designation, "family": spec.family}
        t0 = clock()
        try:
            lim = limits(spec)
        except ShoptermError as exc:
            errors[f"{row['thread']} limits"] = str(exc)
            row["limits"] = clock() - t0
            rows.append(row)
            continue
        row["limits"] = clock() - t0
        for part in ("wires", "plan"):
            fn = funcs.get(part)
            if fn is None:
                continue
            t0 = clock()
            try:
                fn(spec, lim)
            except ShoptermError as exc:
                errors[f"{row['thread']} {part}"] = str(exc)
            row[part] = clock() - t0
        rows.append(row)
    return rows, errors


def _total_ms(rows: list[dict], part: str | None = None) -> float:
    parts = PARTS if part is None else (part,)
    return sum(r.get(p, 0) for r in rows for p in parts) / 1e6


def run(budget_s: float = 15.0, max_sweeps: int = 7, specs=None, config=None) -> dict:
    """Return the core figures: total and per-thread time for limits, wires and plan.

    budget_s: time to spend on repeated sweeps [s]; max_sweeps: most sweeps of each kind;
    specs: threads to time (default: the whole catalogue); config: default the bundled sample.
    Keys: core_catalogue_ms (median cold sweep total), core_warm_ms, core_parts_run,
    core_threads, core_part_ms, core_family_ms, core_per_thread_us, core_slowest, core_errors.
    """
    from shopterm.config import load_config
    from shopterm.resources import sample_config_path
    from shopterm.standards import catalogue

    if config is None:
        config = load_config(sample_config_path())
    t0 = time.perf_counter()
    if specs is None:
        specs = list(catalogue())
    catalogue_ms = (time.perf_counter() - t0) * 1e3
    funcs, missing = _parts(config)
    cold_runs, warm_runs = [], []
    errors: dict[str, str] = {}
    start = time.perf_counter()
    while True:
        rows, errs = sweep(specs, config, funcs, cold=True)
        cold_runs.append(rows)
        errors.update(errs)
        rows, errs = sweep(specs, config, funcs, cold=False)
        warm_runs.append(rows)
        errors.update(errs)
        if len(cold_runs) >= max_sweeps or time.perf_counter() - start > budget_s:
            break
    cold_totals = [_total_ms(r) for r in cold_runs]
    warm_totals = [_total_ms(r) for r in warm_runs]
    # the cold sweep whose total is the median stands for the per-part and per-thread detail
    mid = sorted(range(len(cold_runs)), key=lambda i: cold_totals[i])[len(cold_runs) // 2]
    rows = cold_runs[mid]
    ran = ["limits"] + [p for p in ("wires", "plan") if funcs.get(p)]
    per_thread = [sum(r.get(p, 0) for p in PARTS) / 1e3 for r in rows]
    families: dict[str, float] = {}
    for r in rows:
        families[r["family"]] = families.get(r["family"], 0.0) + _total_ms([r])
    slowest = sorted(rows, key=lambda r: -sum(r.get(p, 0) for p in PARTS))[:10]
    n = len(rows)
    return {
        "core_catalogue_ms": round(statistics.median(cold_totals), 2) if n else None,
        "core_warm_ms": round(statistics.median(warm_totals), 2) if n else None,
        "core_sweeps": len(cold_runs),
        "core_threads": n,
        "core_parts_run": ran,
        "core_parts_missing": missing,
        "core_catalogue_build_ms": round(catalogue_ms, 2),
        "core_part_ms": {p: round(_total_ms(rows, p), 2) for p in ran},
        "core_family_ms": {k: round(v, 2) for k, v in sorted(families.items())},
        "core_per_thread_us": ({"median": round(statistics.median(per_thread), 1),
                                "max": round(max(per_thread), 1)} if n else None),
        "core_slowest": [{"thread": r["thread"],
                          **{f"{p}_us": round(r[p] / 1e3, 1) for p in PARTS if p in r}}
                         for r in slowest],
        "core_errors": dict(list(errors.items())[:20]),
        "core_error_count": len(errors),
    }


def report_lines(res: dict) -> list[str]:
    """Return the printed lines for the core figures."""
    if res["core_catalogue_ms"] is None:
        return ["core_catalogue_ms null  (no threads in the catalogue)"]
    parts = ", ".join(f"{p} {ms:.1f}" for p, ms in res["core_part_ms"].items())
    pt = res["core_per_thread_us"]
    lines = [f"core_catalogue_ms {res['core_catalogue_ms']:.1f}  (target < {TARGET_MS:g})  "
             f"{res['core_threads']} threads, parts ms: {parts}; per thread median "
             f"{pt['median']:.0f} us, max {pt['max']:.0f} us; warm {res['core_warm_ms']:.1f} ms"]
    if res["core_parts_missing"]:
        lines.append("                  parts not run: " + "; ".join(
            f"{k} ({v})" for k, v in res["core_parts_missing"].items()))
    if res["core_error_count"]:
        lines.append(f"                  {res['core_error_count']} thread parts raised, e.g. "
                     + next(iter(res["core_errors"].items()))[0])
    return lines


if __name__ == "__main__":
    print("\n".join(report_lines(run())))
