"""Run every shopterm benchmark, print one line per figure, write tests/bench/results.json.

    python tests/bench/run.py [--runs N] [--out PATH] [--skip startup,keys,gears,core,keycount]

With ``--skip``, the figures of the skipped sections are kept from the results file being
replaced, under ``kept_from_earlier_run`` ({section: {date, machine}} of the run that measured
them).

Plain scripts, not pytest. Each ratio is measured side by side with its baseline in this same run
(see the docstring of each ``bench_*.py`` for its method):

- ``startup_ratio`` / ``rss_ratio`` / ``numpy_at_startup`` — bench_startup.py: ``shopterm`` to its
  first ready screen against a one-widget Textual app, fresh process per run, interleaved,
  medians (targets <= 1.25x time, <= 1.3x peak RSS, numpy not loaded).
- ``key_work_ratio`` — bench_keys.py: CPU work per key press on the named screens against a bare
  app with one entry widget (target <= 2x).
- ``gear_speedup`` — bench_gears.py (the gear-search owner's): its ``run()`` dict; null when that
  script is missing (target >= 100x, same answers).
- ``keys`` — bench_key_count.py: the keys the whole keypad jobs of the e2e tests take, replayed
  in-process: ``choose_thread``, ``per_pass``, ``per_reading``, ``to_first_pass`` (worst over
  the jobs; targets <= 4, 1, <= 8), with each job's counts in ``keys_per_job``.
- ``core_catalogue_ms`` — bench_core.py: limits, wires and a pass plan for every catalogue thread
  (target < 16 ms in total).
- ``machine`` (platform, CPU model, cores, Python, textual, load average at the start,
  ``calibration_ms``: a fixed pure-Python workload, so figures from two machines can be scaled)
  and ``date`` (ISO date).

The whole run takes about a minute on a two-core x86 box; expect 3-5x that on a Raspberry Pi 4.
"""

from __future__ import annotations

import argparse
import datetime as _dt
import importlib
import json
import math
import os
import platform
import statistics
import sys
import time
import traceback
from pathlib import Path

HERE = Path(__file__).resolve().parent
REPO = HERE.parents[1]
for _p in (str(HERE), str(REPO)):
    if _p not in sys.path:
        sys.path.insert(0, _p)

RESULTS = HERE / "results.json"
GEAR_TARGET = 100.0
SECTIONS = ("core", "startup", "keys", "gears", "keycount")
#: Keys that describe one run as a whole (never carried over from an earlier file).
_RUN_KEYS = ("machine", "date", "section_seconds", "total_seconds", "failures")


def calibration_ms(repeats: int = 5) -> float:
    """Return the median CPU time [ms] of a fixed pure-Python workload (floats, tuples, dicts).

    Used to scale figures between machines: run this file on both and compare. CPU time of
    this thread, so other processes on a busy machine do not inflate it.
    References: none (our own workload; only its ratio between machines means anything).
    """
    def work() -> float:
        acc = 0.0
        table: dict[int, tuple[float, float]] = {}
        for i in range(1, 60_000):
            x = i * 0.001
            acc += math.sqrt(x) * math.atan(x) / (1.0 + math.cos(x) ** 2)
            table[i % 512] = (x, acc)
        return acc + len(table)

    times = []
    for _ in range(repeats):
        t0 = time.thread_time()
        work()
        times.append((time.thread_time() - t0) * 1e3)
    return round(statistics.median(times), 2)


def _cpu_model() -> str:
    try:
        text = Path("/proc/cpuinfo").read_text(errors="replace")
    except OSError:
        return platform.processor() or "unknown"
    for key in ("model name", "Model", "Hardware", "cpu model"):
        for line in text.splitlines():
            if line.split(":")[0].strip() == key and ":" in line:
                return line.split(":", 1)[1].strip()
    return platform.processor() or "unknown"


def machine_info() -> dict:
    """Return platform, CPU model, cores, Python and textual versions, load average, calibration."""
    try:
        usable = len(os.sched_getaffinity(0))
    except (AttributeError, OSError):
        usable = os.cpu_count()
    try:
        from importlib.metadata import version
        textual_version = version("textual")
    except Exception:
        textual_version = None
    try:
        load = [round(v, 2) for v in os.getloadavg()]
    except OSError:
        load = None
    return {"platform": platform.platform(), "arch": platform.machine(), "cpu": _cpu_model(),
            "cores": os.cpu_count(), "cores_usable": usable,
            "python": platform.python_version(), "textual": textual_version,
            "load_avg_at_start": load, "calibration_ms": calibration_ms()}


def gears_section() -> tuple[dict, list[str]]:
    """Return (figures, printed lines) from bench_gears.run(), or null figures if it is missing."""
    try:
        mod = importlib.import_module("bench_gears")
    except ModuleNotFoundError as exc:
        if exc.name != "bench_gears":
            raise
        return ({"gear_speedup": None, "gears": None},
                ["gear_speedup    null  (tests/bench/bench_gears.py is not there yet)"])
    res = mod.run()
    speed = res.get("gear_speedup", res.get("speedup")) if isinstance(res, dict) else None
    same = res.get("same_answers") if isinstance(res, dict) else None
    line = (f"gear_speedup    {speed:.1f}  (target >= {GEAR_TARGET:g}, same answers)"
            if isinstance(speed, (int, float)) else
            "gear_speedup    null  (bench_gears.run() gave no 'gear_speedup')")
    if same is not None:
        line += f"  same answers: {same}"
    return {"gear_speedup": speed, "gears": res}, [line]


def main(argv: list[str] | None = None) -> int:
    parser = argparse.ArgumentParser(description="Run the shopterm benchmarks.")
    parser.add_argument("--runs", type=int, default=10,
                        help="start-up runs of each app (default 10; the issue asks >= 10)")
    parser.add_argument("--out", default=str(RESULTS), help="results file (JSON)")
    parser.add_argument("--skip", default="", help="comma-separated sections to leave out: "
                        + ",".join(SECTIONS))
    args = parser.parse_args(argv)
    skip = {s.strip() for s in args.skip.split(",") if s.strip()}
    unknown = skip - set(SECTIONS)
    if unknown:
        parser.error(f"unknown section(s) {', '.join(sorted(unknown))}: use {', '.join(SECTIONS)}")

    started = time.perf_counter()
    results: dict = {"startup_ratio": None, "rss_ratio": None, "key_work_ratio": None,
                     "gear_speedup": None, "core_catalogue_ms": None, "keys": None}
    out = Path(args.out)
    if skip and out.is_file():
        # a partial run keeps the figures of the sections it skipped from the file it
        # replaces, and says which, from when and which machine (they were not run again)
        previous = json.loads(out.read_text())
        earlier = previous.pop("kept_from_earlier_run", None) or {}
        results.update({k: v for k, v in previous.items() if k not in _RUN_KEYS})
        results["kept_from_earlier_run"] = {
            name: earlier.get(name) or {"date": previous.get("date"),
                                        "machine": previous.get("machine")}
            for name in sorted(skip)}
    results["machine"] = machine_info()
    results["date"] = _dt.date.today().isoformat()
    print(f"machine         {results['machine']['cpu']}, {results['machine']['cores_usable']} "
          f"cores, Python {results['machine']['python']}, load "
          f"{results['machine']['load_avg_at_start']}, calibration "
          f"{results['machine']['calibration_ms']:.1f} ms")
    failures: dict[str, str] = {}

    def section(name: str, fn) -> None:
        if name in skip:
            print(f"{name:<15} skipped")
            return
        t0 = time.perf_counter()
        try:
            res, lines = fn()
        except Exception as exc:  # one broken section must not hide the others
            failures[name] = f"{type(exc).__name__}: {exc}"
            print(f"{name:<15} FAILED: {failures[name]}")
            traceback.print_exc(limit=3, file=sys.stderr)
            return
        results.update(res)
        results.setdefault("section_seconds", {})[name] = round(time.perf_counter() - t0, 1)
        print("\n".join(lines), flush=True)

    def core():
        import bench_core
        res = bench_core.run()
        return res, bench_core.report_lines(res)

    def startup():
        import bench_startup
        res = bench_startup.run(runs=args.runs)
        return res, bench_startup.report_lines(res)

    def keys():
        import bench_keys
        res = bench_keys.run()
        return res, bench_keys.report_lines(res)

    def keycount():
        import bench_key_count
        res = bench_key_count.run()
        return res, bench_key_count.report_lines(res)

    # core first, while nothing else has touched the standards' caches in this process
    section("core", core)
    section("startup", startup)
    section("keys", keys)
    section("gears", gears_section)
    section("keycount", keycount)
    if failures:
        results["failures"] = failures
    results["total_seconds"] = round(time.perf_counter() - started, 1)
    out.write_text(json.dumps(results, indent=1, default=str) + "\n")
    print(f"wrote {out} ({results['total_seconds']:.0f} s)")
    return 1 if failures else 0


if __name__ == "__main__":
    sys.exit(main())
