"""Command-line answers to single questions (``shopterm calc …``, ``shopterm export``).

Each ``calc_<name>.py`` module defines ``register(subparsers)``, which adds its parser and sets
``func=run`` where ``run(args) -> int``. Output helpers shared by all of them live here.
"""

from __future__ import annotations

import json
import sys
from typing import Any

from shopterm.units import Unit, from_mm


def emit_json(obj: Any) -> None:
    """Print ``obj`` as one JSON document on stdout."""
    json.dump(obj, sys.stdout, indent=2, sort_keys=False)
    sys.stdout.write("\n")


def length_out(mm: float | None, unit: Unit, digits: int | None = None) -> float | None:
    """Return ``mm`` in ``unit`` for output, rounded to the unit's usual digits (6 mm, 7 in)."""
    if mm is None:
        return None
    value = from_mm(mm, unit)
    return round(value, digits if digits is not None else (6 if unit == "mm" else 7))


def add_units_option(parser) -> None:
    parser.add_argument("--units", choices=("mm", "in"),
                        help="output unit (default: the standard's own unit)")


def add_json_option(parser) -> None:
    parser.add_argument("--json", action="store_true", help="print one JSON object")


def print_table(rows: list[tuple[str, ...]], header: tuple[str, ...] | None = None) -> None:
    """Print a small left/right-aligned text table (first column left, the rest right)."""
    allrows = ([header] if header else []) + rows
    widths = [max(len(r[i]) for r in allrows) for i in range(len(allrows[0]))]
    for r in allrows:
        cells = [r[0].ljust(widths[0])] + [c.rjust(w) for c, w in zip(r[1:], widths[1:])]
        print("  ".join(cells).rstrip())
