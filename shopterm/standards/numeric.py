"""A thread typed with the keypad's digits and point alone: ``10.1.5`` is M10x1.5.

The keypad has no letters, and its ``/`` and ``-`` keys mean undo and back, so a designation is
typed as numbers joined by points (fields), read against the catalogue:

==============  ====================================  ==========================================
typed           read as                               e.g.
==============  ====================================  ==========================================
``S``           ISO metric size S, coarse pitch       ``10`` → M10x1.5, ``24`` → M24x3
``S.P``         size S, pitch P (whole mm)            ``24.2`` → M24x2, ``8.1`` → M8x1
``S.P.p``       size S, pitch P.p                     ``10.1.25`` → M10x1.25, ``12.1.5``
``S.s``         a size with a decimal, coarse         ``1.6`` → M1.6, ``2.5`` → M2.5
``S.s.P.p``     a size with a decimal, pitch P.p      ``1.6.0.35`` → M1.6x0.35
``N.D.T``       inch size N/D, T threads per inch     ``3.8.16`` → 3/8-16 UNC, ``1.4.20``
``W.N.D.T``     inch size W-N/D, T tpi                ``1.1.4.7`` → 1-1/4-7 UNC
``W.1.T``       whole inches (W/1), T tpi             ``1.1.8`` → 1-8 UNC
==============  ====================================  ==========================================

Every reading of the fields is tried and kept only if the catalogue has that thread, so a text
such as ``1.6`` (M1.6, never M1 with a 6 mm pitch) is not ambiguous in practice. Each result is
the catalogue's thread: external, the family's usual class (change them on the thread screen).
An inch size found in more than one family (3/8-16 is UNC and BSW) gives every match, in the
order of the thread screen's families (``walk.GROUPS``): Unified first.
"""

from __future__ import annotations

import re
from fractions import Fraction
from typing import TYPE_CHECKING

from shopterm.errors import InvalidEntry

if TYPE_CHECKING:
    from shopterm.standards.spec import ThreadSpec

_NUMERIC = re.compile(r"\d+(\.\d+)*")

HOW = ("size.pitch with the point key: 10 = M10 coarse, 10.1.25 = M10x1.25, "
       "3.8.16 = 3/8-16")


def is_numeric(text: str) -> bool:
    """Return whether ``text`` is written in this grammar (digits and points only)."""
    return bool(_NUMERIC.fullmatch(text.strip()))


def _mm_readings(fields: list[str]) -> list[tuple[Fraction, Fraction | None]]:
    """Return every (size, pitch or None for coarse) the fields can be read as [mm]."""
    def num(parts: list[str]) -> Fraction:
        return Fraction(".".join(parts))

    n = len(fields)
    out: list[tuple[Fraction, Fraction | None]] = []
    for size_n in (1, 2):                      # the size takes one field, or two with a point
        rest = n - size_n
        if rest < 0:
            continue
        size = num(fields[:size_n])
        if rest == 0:
            out.append((size, None))
        elif rest in (1, 2):                    # the pitch takes one field, or two
            out.append((size, num(fields[size_n:])))
    return out


def _inch_readings(fields: list[str]) -> list[tuple[Fraction, int]]:
    """Return every (size [in], tpi) the fields can be read as: N.D.T or W.N.D.T."""
    out = []
    if len(fields) in (3, 4):
        whole = int(fields[0]) if len(fields) == 4 else 0
        num, den, tpi = (int(f) for f in fields[-3:])
        if den > 0 and tpi > 0 and (num < den or den == 1):
            out.append((whole + Fraction(num, den), tpi))
    return out


def _inch_size(value: Fraction) -> str:
    """Return an inch size as the catalogue writes it: ``3/8``, ``1``, ``1-1/4``."""
    whole, part = divmod(value, 1)
    if not part:
        return str(whole)
    frac = f"{part.numerator}/{part.denominator}"
    return f"{whole}-{frac}" if whole else frac


def candidates(text: str) -> list[ThreadSpec]:
    """Return the catalogue threads the typed numbers stand for, best first.

    Raises ``InvalidEntry`` when the text is not digits and points, or no thread matches.
    """
    from shopterm.standards import walk

    typed = text.strip()
    if not is_numeric(typed):
        raise InvalidEntry(f"'{typed}' is not numbers joined by points. Type {HOW}.")
    fields = typed.split(".")
    metric = _mm_readings(fields)
    inch = _inch_readings(fields)
    found: list[ThreadSpec] = []
    for g in walk.GROUPS:
        for spec in walk.members(g.key):
            if spec.family == "iso":
                hit = any(spec.size == f"M{float(size):g}" and (
                    spec.pitch_implied if pitch is None
                    else abs(spec.pitch - float(pitch)) < 1e-9) for size, pitch in metric)
                if hit:
                    spec = spec.with_(pitch_implied=False)
            else:
                hit = spec.tpi is not None and any(
                    spec.size == _inch_size(size) and spec.tpi == tpi for size, tpi in inch)
            if hit and spec not in found:
                found.append(spec)
    if not found:
        raise InvalidEntry(f"no thread in the tables is typed '{typed}'. Type {HOW}; "
                           f"or pick from the lists.")
    return found
