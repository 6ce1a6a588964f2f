"""Change-gear trains: which gears on the banjo make the lead wanted on this leadscrew.

A train is *simple* (driver → idler → driven; the idler only turns the direction and does not
change the ratio, so it is not named or counted) or *compound* (A drives B; C, keyed to B on the
same stud, drives D: ratio A/B × C/D). With a quick-change box, each box position multiplies the
ratio again; a box position may also be used with no change gears at all.

Work lead = leadscrew pitch × fixed ratio × box ratio × Π drivers / Π driven.

Every train the gear set allows is worked out once per gear set (cached): the ratios go into numpy
arrays, sorted, and each lead is answered by ``np.searchsorted``. The few nearest candidates are
then ranked with exact ``fractions.Fraction`` arithmetic, so "exact" means exact.

References: Rose, Modern Machine Shop Practice (work pitch = leadscrew pitch × Π drivers / Π driven, from
19th-century shop texts; Rose, *Modern Machine Shop Practice*, 4 tpi leadscrew 36/48 × 66/18 →
11 tpi; 127 = 5 × 25.4 for exact metric from an inch leadscrew).
"""

from __future__ import annotations

import math
import re
from dataclasses import dataclass
from fractions import Fraction
from functools import lru_cache
from typing import Iterable, Literal, Sequence

from shopterm.errors import InvalidEntry
from shopterm.lathe.machine import INCH_MM, GearboxPosition, Lathe, Leadscrew
from shopterm.units import MM_PER_INCH, parse_number, split_unit

TrainKind = Literal["simple", "compound", "box"]

#: Default clearance margin of a compound train [teeth] (common practice, no source).
DEFAULT_MARGIN = 15

#: Most distinct tooth counts a gear set may have (keeps the compound table a few MB).
MAX_DISTINCT_GEARS = 60

#: Most teeth a change gear may have (keeps A*C and B*D exact and small).
MAX_TEETH = 1000


# --------------------------------------------------------------------------------------------
# Reading what people type
# --------------------------------------------------------------------------------------------

def as_exact_lead(lead: float | int | Fraction) -> Fraction:
    """Return a lead as an exact Fraction [mm].

    A float is taken as the nearest fraction with a denominator up to 10**6, which recovers
    inch leads such as 25.4/11 = 127/55 exactly.
    lead [mm]
    References: ISO 31-1 (1 in = 25.4 mm exactly).
    """
    if isinstance(lead, bool) or not isinstance(lead, (int, float, Fraction)):
        raise InvalidEntry("A lead must be a number of millimetres, e.g. 1.5.")
    exact = lead if isinstance(lead, Fraction) else Fraction(lead).limit_denominator(10**6)
    if not (exact > 0) or (isinstance(lead, float) and not math.isfinite(lead)):
        raise InvalidEntry("The lead must be greater than zero: type e.g. 1.5mm or 20tpi.")
    return exact


_TPI = re.compile(r"^(?P<n>.+?)\s*(?:tpi|t\.p\.i\.?)$", re.IGNORECASE)


def _exact_number(text: str) -> Fraction:
    value = parse_number(text)
    return Fraction(value).limit_denominator(10**6)


def parse_lead(text: str) -> Fraction:
    """Return the lead typed as ``1.5mm``, ``1.5`` (mm), ``0.05in`` or ``20tpi``, exactly [mm].

    References: ISO 31-1 (1 in = 25.4 mm exactly).
    """
    if not isinstance(text, str) or not text.strip():
        raise InvalidEntry("Type a lead such as 1.5mm, 1.5 or 20tpi.")
    s = text.strip()
    if m := _TPI.match(s):
        n = _exact_number(m["n"])
        if n <= 0:
            raise InvalidEntry(f"{text!r}: threads per inch must be greater than zero.")
        return INCH_MM / n
    try:
        number, unit = split_unit(s)
        value = _exact_number(number)
    except InvalidEntry:
        raise InvalidEntry(f"{text!r} is not a lead: type e.g. 1.5mm, 1.5 (mm), 0.05in "
                           f"or 20tpi.") from None
    if value <= 0:
        raise InvalidEntry(f"{text!r}: the lead must be greater than zero.")
    return value * INCH_MM if unit == "in" else value


def parse_leadscrew(text: str) -> Leadscrew:
    """Return the leadscrew typed as ``8tpi`` or ``3mm`` (a bare number is refused: say which)."""
    if not isinstance(text, str) or not text.strip():
        raise InvalidEntry("Type the leadscrew as threads per inch (8tpi) or pitch (3mm).")
    s = text.strip()
    if m := _TPI.match(s):
        n = parse_number(m["n"])
        return Leadscrew.from_tpi(n)
    try:
        number, unit = split_unit(s)
        value = parse_number(number)
    except InvalidEntry:
        unit, value = None, None
    if unit == "mm" and value is not None:
        return Leadscrew.from_mm(value)
    if unit == "in" and value is not None:
        return Leadscrew(Fraction(value).limit_denominator(10**6) * INCH_MM, None) \
            if value > 0 else Leadscrew.from_mm(value)
    raise InvalidEntry(f"{text!r}: give the leadscrew as threads per inch (8tpi) or as a "
                       f"pitch in mm (3mm).")


_GEAR_ITEM = re.compile(r"^(?P<t>\d+)\s*(?:[x*]\s*(?P<n>\d+))?$", re.IGNORECASE)


def parse_gear_list(text: str) -> tuple[tuple[int, int], ...]:
    """Return (teeth, how many owned) from ``20,25,30x2,127`` (``x2`` or ``*2`` = two of them)."""
    if not isinstance(text, str) or not text.strip():
        raise InvalidEntry("List the gears you own, e.g. 20,25,30x2,40,127 (x2 = two of them).")
    counts: dict[int, int] = {}
    for raw in text.replace(";", ",").split(","):
        item = raw.strip()
        if not item:
            continue
        m = _GEAR_ITEM.match(item)
        if not m:
            raise InvalidEntry(f"{item!r} is not a gear: write the teeth, e.g. 40, or 40x2 "
                               f"for two of them.")
        teeth, n = int(m["t"]), int(m["n"] or 1)
        if teeth < 1 or n < 1:
            raise InvalidEntry(f"{item!r}: teeth and the number owned must be at least 1.")
        counts[teeth] = counts.get(teeth, 0) + n
    if not counts:
        raise InvalidEntry("List the gears you own, e.g. 20,25,30x2,40,127.")
    return tuple(sorted(counts.items()))


def parse_ratio(text: str) -> Fraction:
    """Return a ratio typed as ``1``, ``1/2``, ``0.5`` or ``2:1`` (driver:driven), exactly."""
    s = text.strip() if isinstance(text, str) else ""
    try:
        if ":" in s:
            a, b = s.split(":", 1)
            r = _exact_number(a) / _exact_number(b)
        else:
            r = _exact_number(s)
    except (InvalidEntry, ZeroDivisionError):
        raise InvalidEntry(f"{text!r} is not a ratio: type e.g. 1, 1/2, 0.5 or 2:1.") from None
    if r <= 0:
        raise InvalidEntry(f"{text!r}: a ratio must be greater than zero.")
    return r


def parse_gearbox(text: str) -> tuple[GearboxPosition, ...]:
    """Return gearbox positions from ``A=1/2,B=1,C=2`` (label=ratio) or ``1/2,1,2``."""
    if not isinstance(text, str) or not text.strip():
        raise InvalidEntry("List the gearbox positions, e.g. A=1/2,B=1,C=2.")
    out = []
    for i, raw in enumerate(p.strip() for p in text.split(",")):
        if not raw:
            continue
        label, _, value = raw.rpartition("=")
        out.append(GearboxPosition(label.strip() or str(i + 1), parse_ratio(value)))
    if not out:
        raise InvalidEntry("List the gearbox positions, e.g. A=1/2,B=1,C=2.")
    return tuple(out)


# --------------------------------------------------------------------------------------------
# Results
# --------------------------------------------------------------------------------------------

@dataclass(frozen=True)
class GearTrain:
    """One way to make a lead: the change gears (drivers, driven), box position and the error.

    ``ratio`` is the change gears' own ratio, Π drivers / Π driven (1 for a box position alone).
    ``error_pct`` is (lead made / lead wanted − 1) × 100. ``error_per_25mm`` [mm] and
    ``error_per_inch`` [in] are how far the thread runs off over 25 mm / 1 in of its length.
    """

    drivers: tuple[int, ...]
    driven: tuple[int, ...]
    ratio: Fraction
    lead_made_mm: float
    error_pct: float
    kind: TrainKind
    lead_wanted_mm: float = 0.0
    box: str | None = None
    exact: bool = False
    error_per_25mm: float = 0.0      # [mm]
    error_per_inch: float = 0.0      # [in]

    @property
    def gear_count(self) -> int:
        """Return how many change gears the train names (idler not counted)."""
        return len(self.drivers) + len(self.driven)

    def describe(self) -> str:
        """Return one line (≤ 76 columns) saying which gears go where and how close it is."""
        if self.kind == "simple":
            gears = f"driver {self.drivers[0]} > idler > driven {self.driven[0]}"
        elif self.kind == "compound":
            a, c = self.drivers
            b, d = self.driven
            gears = f"{a}/{b} x {c}/{d} (A {a} drives B {b}; C {c} on B drives D {d})"
        else:
            gears = "box alone, no change gears"
        if self.box is not None:
            gears = f"box {self.box}: {gears}"
        if self.exact:
            how = "exact"
        else:
            how = f"{self.error_pct:+.4f}%"
        return f"{gears}  {how}"


# --------------------------------------------------------------------------------------------
# The table of every train a gear set allows (numpy, cached)
# --------------------------------------------------------------------------------------------

class _TrainTable:
    """Every simple and compound train of one gear set, sorted by ratio (numpy arrays).

    Each train is one ``code`` over the indices into the sorted tooth list (m gears): a simple
    train i > j is ``i*m + j``; a compound train A/B x C/D is ``m*m + ((a*m + b)*m + c)*m + d``.
    Ordering codes orders trains by fewer gears, then by teeth A, B, C, D: the tie-break inside
    one ratio. ``code`` is sorted by ratio, then by code, so the trains of one ratio
    (``code[group_start[g]:group_end[g]]``, ratio ``unique_ratio[g]``) come best first.

    Each train gets one int64 key, (ratio key << bits) | code, and one plain sort of the keys
    orders the whole table. The ratio key is exact either way:

    - ``"float"``: the ratio's float64 bits with the low mantissa bits dropped. Every ratio is
      N / D with 1 <= N, D <= P (P the biggest tooth count, squared for compound trains), so
      two different ratios differ by at least 1 part in P**2; keeping more mantissa bits than
      that keeps them apart, and the order of the bits is the order of the ratios. Used when
      that many bits and the code fit in 63 (e.g. up to 60 gears of at most 127 teeth).
    - ``"grid"``: otherwise, the rank of N / D in the small sorted grid of every numerator and
      denominator a train can have (the teeth; the products of two teeth).

    The m**4 compound keys are made a block of rows at a time, so no big temporary array is
    ever made (fresh memory is slow to get).
    """

    #: Compound keys worked out per block (about 0.5 MB of int64 at a time).
    _BLOCK = 1 << 16

    #: Use the float ratio key where it is exact (tests turn it off to check the grid).
    use_float_key = True

    def __init__(self, gears: tuple[tuple[int, int], ...], margin: int, compound: bool):
        import numpy as np

        self.teeth = teeth = np.array([t for t, _ in gears], dtype=np.int64)
        self._teeth_list = [int(t) for t, _ in gears]
        owned = np.array([n for _, n in gears], dtype=np.int64)
        self.m = m = len(teeth)
        mm = m * m
        bits = max(1, int(mm + (mm * mm if compound else 0)).bit_length())  # a key's code part
        tf = teeth.astype(np.float64)
        prod = np.multiply.outer(tf, tf).ravel()           # t[a] * t[c] at a*m + c, exact

        p = (int(teeth.max()) if m else 1) ** (2 if compound else 1)   # every N, D <= p
        shift = self._float_shift(p, bits)
        if shift is not None:
            # Float ratio key: float64 bits >> shift, counted from the smallest ratio, 1 / p.
            self.keyed_by = "float"
            offset = int(np.float64(1 / p).view(np.int64)) >> shift
        else:
            self.keyed_by = "grid"
            high, v_one, v_two = self._grid_ranks(teeth, prod, bits)

        # Simple trains: driver i, driven j; i == j needs two of that gear.
        i, j = np.divmod(np.arange(mm), m) if m else (np.zeros(0, np.int64),) * 2
        ok = (i != j) | (owned[i] >= 2)
        i, j = i[ok], j[ok]
        if shift is not None:
            simple = (((tf[i] / tf[j]).view(np.int64) >> shift) - offset) << bits
        else:
            simple = high[v_one[i], v_one[j]]
        simple |= np.flatnonzero(ok)

        if compound and m:
            # Which compound A/B x C/D are allowed, over all m**4 index choices at once, laid
            # out (A, C, B, D): one row per A, C pair and one column per B, D pair.
            ia, kc, jb, ld = np.ix_(*(np.arange(m),) * 4)
            t16 = teeth.astype(np.int16)
            margin = min(margin, 2 * int(teeth.max()))     # more: no train passes either way
            allowed = np.empty((m,) * 4, dtype=bool)
            np.greater_equal(t16[ia] + t16[jb], t16[kc] + margin, out=allowed)
            allowed &= t16[kc] + t16[ld] >= t16[jb] + margin
            pairs = ((ia, kc), (jb, ld), (ia, jb), (ia, ld), (kc, jb), (kc, ld))
            if (owned >= 2).any():
                # A gear used more than once: keep it only if that many are owned.
                repeat = np.zeros((m,) * 4, dtype=bool)
                for x, y in pairs:
                    repeat |= x == y
                rep = np.flatnonzero(allowed & repeat)
                q = np.stack(np.unravel_index(rep, (m,) * 4))           # 4 x n indices
                use = (q[:, None, :] == q[None, :, :]).sum(axis=1)       # uses of each slot's gear
                keep = (use <= owned[q]).all(axis=0)
                allowed &= ~repeat
                allowed.ravel()[rep[keep]] = True
                del repeat
            else:
                for x, y in pairs:                         # four different gears
                    allowed &= x != y
            allowed = allowed.reshape(mm, mm)
            count = np.count_nonzero(allowed, axis=1)
            key = np.empty(len(simple) + int(count.sum()), dtype=np.int64)
            key[:len(simple)] = simple
            # Key of A/B x C/D: the ratio key of (A*C) / (B*D), then the code, split into a
            # part from A, C (the row) and a part from B, D (the column).
            idx = np.arange(m, dtype=np.int64)
            row_code = (mm + idx[:, None] * m ** 3 + idx[None, :] * m).ravel()
            col_code = (idx[:, None] * mm + idx[None, :]).ravel()
            rows = max(1, self._BLOCK // max(1, mm))
            block = np.empty((min(rows, mm), mm), dtype=np.int64)
            at = len(simple)
            for r0 in range(0, mm, rows):
                r1 = min(mm, r0 + rows)
                b = block[:r1 - r0]
                if shift is not None:
                    np.divide(prod[r0:r1, None], prod[None, :], out=b.view(np.float64))
                    b >>= shift
                    b -= offset
                    b <<= bits
                else:
                    np.take(high[v_two[r0:r1]], v_two, axis=1, out=b, mode="clip")
                b += row_code[r0:r1, None]
                b += col_code
                n = int(count[r0:r1].sum())
                np.take(b.ravel(), np.flatnonzero(allowed[r0:r1]), out=key[at:at + n],
                        mode="clip")
                at += n
            del allowed, block
        else:
            key = simple

        key.sort()
        code_dtype = np.int32 if bits < 31 else np.int64
        self.code = np.empty(len(key), dtype=code_dtype)
        np.bitwise_and(key, (1 << bits) - 1, out=self.code, casting="unsafe")
        key >>= bits                                       # now each train's ratio key
        if len(key):
            starts = np.flatnonzero(np.r_[True, key[1:] != key[:-1]])
        else:
            starts = np.zeros(0, np.int64)
        self.group_start = starts
        self.group_end = np.r_[starts[1:], len(key)].astype(np.int64)
        # The float of each ratio, from its first train: (A*C) / (B*D), correctly rounded.
        self.unique_ratio = np.zeros(0)
        if len(starts):
            first = self.code[starts].astype(np.int64)
            one = first < mm                               # simple: c = i, d = j below
            rest, d = np.divmod(np.where(one, first, first - mm), m)
            rest, c = np.divmod(rest, m)
            a, b = np.divmod(rest, m)
            self.unique_ratio = (np.where(one, tf[c], prod[a * m + c])
                                 / np.where(one, tf[d], prod[b * m + d]))

    @staticmethod
    def _float_shift(p: int, bits: int) -> int | None:
        """Return how many float64 bits to drop for an exact ratio key, or None (use the grid).

        p: the biggest numerator or denominator of a ratio; bits: the low bits of a key the
        code takes.
        References: IEEE 754 binary64 (correct rounding of a quotient; the argument is in the
        class docstring).
        """
        if not _TrainTable.use_float_key:
            return None
        keep = (p * p).bit_length() + 1                    # mantissa bits that keep ratios apart
        if keep > 52:
            return None
        shift = 52 - keep
        import numpy as np

        span = (int(np.float64(p).view(np.int64)) >> shift) \
            - (int(np.float64(1 / p).view(np.int64)) >> shift)
        return shift if span.bit_length() + bits <= 63 else None

    @staticmethod
    def _grid_ranks(teeth, prod, bits: int):
        """Return (rank << bits at [N's place, D's place], place of each tooth, of each
        product) over the sorted values every numerator and denominator can take.

        References: none (exact: products of teeth are exact in float64 and each quotient is
        correctly rounded, so equal rationals give equal floats and distinct ones differ).
        """
        import numpy as np

        values, where = np.unique(np.concatenate([teeth.astype(np.float64), prod]),
                                  return_inverse=True)
        where = where.ravel()
        grid = np.divide.outer(values, values).ravel()
        order = np.argsort(grid)
        in_order = grid[order]
        new = np.empty(len(in_order), dtype=bool)
        new[:1] = True
        np.not_equal(in_order[1:], in_order[:-1], out=new[1:])
        rank = np.cumsum(new, dtype=np.int64)
        rank -= 1
        rank <<= bits
        high = np.empty_like(rank)
        high[order] = rank
        m = len(teeth)
        return high.reshape(len(values), len(values)), where[:m], where[m:]

    @property
    def ratio(self):
        """Return the ratio of every train, in table order (numpy float64 array)."""
        import numpy as np

        return np.repeat(self.unique_ratio, self.group_end - self.group_start)

    def __len__(self) -> int:
        return len(self.code)

    def decode(self, code: int) -> tuple[int, int, int, int]:
        """Return the teeth (A, B, C, D) of a coded train; C = D = 0 for a simple train."""
        t, m = self._teeth_list, self.m
        if code < m * m:
            i, j = divmod(code, m)
            return t[i], t[j], 0, 0
        rest = code - m * m
        rest, d = divmod(rest, m)
        rest, c = divmod(rest, m)
        a, b = divmod(rest, m)
        return t[a], t[b], t[c], t[d]

    def nearest(self, wanted: Fraction | float, groups: int, per_ratio: int):
        """Yield teeth (A, B, C, D) of trains in the ``groups`` distinct ratios either side of
        ``wanted``, at most ``per_ratio`` from each ratio (fewer gears, then teeth, first)."""
        import numpy as np

        u = self.unique_ratio
        if not len(u):
            return
        pos = int(np.searchsorted(u, float(wanted)))
        lo, hi = max(0, pos - groups - 1), min(len(u), pos + groups + 1)
        starts, ends = self.group_start[lo:hi], self.group_end[lo:hi]
        if per_ratio == 1:                          # each ratio's trains come best first
            codes = self.code[starts].tolist()
        else:
            codes = [c for s, e in zip(starts.tolist(), ends.tolist())
                     for c in self.code[s:min(e, s + per_ratio)].tolist()]
        for code in codes:
            yield self.decode(code)


def normalise_gears(gears: Iterable[tuple[int, int]] | Iterable[int]) -> tuple[tuple[int, int], ...]:
    """Return the gear set as sorted (teeth, count) pairs, merging repeats.

    Accepts (teeth, count) pairs or a plain list of teeth (each listed once per gear owned).
    """
    counts: dict[int, int] = {}
    for item in gears:
        if isinstance(item, tuple):
            teeth, n = item
        else:
            teeth, n = item, 1
        if isinstance(teeth, bool) or int(teeth) != teeth or int(n) != n:
            raise InvalidEntry(f"Gear {item!r}: teeth and the number owned are whole numbers.")
        teeth, n = int(teeth), int(n)
        if teeth < 1 or n < 0:
            raise InvalidEntry(f"Gear {item!r}: a gear has at least 1 tooth and cannot be "
                               f"owned fewer than 0 times.")
        if teeth > MAX_TEETH:
            raise InvalidEntry(f"Gear {item!r}: more than {MAX_TEETH} teeth; check the list.")
        if n:
            counts[teeth] = counts.get(teeth, 0) + n
    if len(counts) > MAX_DISTINCT_GEARS:
        raise InvalidEntry(f"{len(counts)} different gears is more than shopterm searches "
                           f"({MAX_DISTINCT_GEARS}); leave out the ones you never fit.")
    return tuple(sorted(counts.items()))


@lru_cache(maxsize=16)
def train_table(gears: tuple[tuple[int, int], ...], margin: int = DEFAULT_MARGIN,
                compound: bool = True) -> _TrainTable:
    """Return the sorted table of every train of a gear set (cached per gear set and margin).

    gears ((teeth, count) pairs, as from ``normalise_gears``); margin [teeth].
    References: common practice, no source (the clearance rule).
    """
    return _TrainTable(gears, int(margin), compound)


# --------------------------------------------------------------------------------------------
# The search
# --------------------------------------------------------------------------------------------

def find_trains(leadscrew: Leadscrew, lead: float | Fraction,
                gears: Iterable[tuple[int, int]] | Iterable[int], *,
                fixed_ratio: Fraction | int = 1,
                gearbox: Sequence[GearboxPosition] = (),
                margin: int = DEFAULT_MARGIN,
                compound: bool = True,
                limit: int = 8,
                per_ratio: int = 1) -> tuple[GearTrain, ...]:
    """Return the trains that make ``lead``, best first: smallest |error|, then fewer gears.

    A gear is used only as many times as it is owned. A compound train A/B × C/D is kept only if
    each pair's teeth exceed the third gear by at least ``margin``: A + B ≥ C + margin and
    C + D ≥ B + margin (C must clear A's stud, B must clear D's shaft). Trains of the same ratio
    are ranked by fewer gears, then by teeth (A, B, C, D); at most ``per_ratio`` of each ratio
    are returned, ``limit`` in all. With ``gearbox`` positions, each position is tried with no
    change gears and with every train.

    leadscrew (pitch exact); lead [mm] (multi-start: the lead, not the pitch);
    gears ((teeth, count) pairs); fixed_ratio (stud/tumbler, turns of the first driver per
    spindle turn); margin [teeth].
    References: Rose, Modern Machine Shop Practice (work pitch = leadscrew pitch × Π drivers / Π driven;
    Rose, *Modern Machine Shop Practice*).
    """
    wanted = as_exact_lead(lead)
    fixed = Fraction(fixed_ratio)
    if fixed <= 0:
        raise InvalidEntry("The fixed ratio in the drive must be greater than zero.")
    if limit < 1 or per_ratio < 1:
        raise InvalidEntry("Ask for at least one train.")
    if margin < 0:
        raise InvalidEntry("The clearance margin cannot be negative; 15 teeth is usual.")
    gearset = normalise_gears(gears)
    if not gearset and not gearbox:
        raise InvalidEntry("No gears to search: list the change gears you own, "
                           "e.g. 20,25,30,...,127, or the gearbox positions.")
    table = train_table(gearset, int(margin), bool(compound)) if gearset else None
    boxes: list[tuple[int, GearboxPosition | None]] = (
        list(enumerate(gearbox)) if gearbox else [(0, None)])

    # Exact ranking in integers: with q = base / wanted, a train of ratio num/den makes
    # q * num/den of the lead wanted, so its relative error is (qn*num - qd*den) / (qd*den).
    # Over one common denominator (the lcm of every qd*den) the errors compare as integers.
    candidates = []
    for bi, pos in boxes:
        box_ratio = pos.ratio if pos is not None else Fraction(1)
        base = leadscrew.pitch_exact * fixed * box_ratio          # lead with a 1:1 train [mm]
        q = base / wanted
        qn, qd = q.numerator, q.denominator
        bn, bd = base.numerator, base.denominator
        if pos is not None:
            candidates.append((abs(qn - qd), qd, 0, (0, 0, 0, 0), bi, (), (), 1, 1, pos,
                               bn, bd))
        if table is None:
            continue
        for a, b, c, d in table.nearest(qd / qn, limit, per_ratio):
            if c:
                num, den, drivers, driven, ng = a * c, b * d, (a, c), (b, d), 4
            else:
                num, den, drivers, driven, ng = a, b, (a,), (b,), 2
            candidates.append((abs(qn * num - qd * den), qd * den, ng, (a, b, c, d), bi,
                               drivers, driven, num, den, pos, bn, bd))

    common = math.lcm(*(t[1] for t in candidates)) if candidates else 1
    candidates.sort(key=lambda t: (t[0] * (common // t[1]), t[2], t[3], t[4]))
    seen: dict[tuple[int, int], int] = {}
    out: list[GearTrain] = []
    wn, wd = wanted.numerator, wanted.denominator
    for *_, drivers, driven, num, den, pos, bn, bd in candidates:
        mn, md = bn * num, bd * den                               # lead made [mm] = mn / md
        g = math.gcd(mn, md)
        made = (mn // g, md // g)
        if seen.get(made, 0) >= per_ratio:
            continue
        seen[made] = seen.get(made, 0) + 1
        out.append(_make_train(wn, wd, mn, md, drivers, driven, num, den, pos))
        if len(out) >= limit:
            break
    return tuple(out)


def _make_train(wn: int, wd: int, mn: int, md: int, drivers, driven, num: int, den: int,
                pos: GearboxPosition | None) -> GearTrain:
    """Return the GearTrain for lead wanted wn/wd and lead made mn/md [mm], ratio num/den.

    Floats come from exact integer quotients (correctly rounded, as ``float(Fraction)``).
    """
    rn, rd = mn * wd - wn * md, md * wn                           # made / wanted - 1 = rn / rd
    kind: TrainKind = "box" if not drivers else ("simple" if len(drivers) == 1 else "compound")
    return GearTrain(
        drivers=tuple(drivers), driven=tuple(driven), ratio=Fraction(num, den),
        lead_made_mm=mn / md, error_pct=(rn * 100) / rd, kind=kind,
        lead_wanted_mm=wn / wd, box=pos.label if pos is not None else None,
        exact=rn == 0, error_per_25mm=(rn * 25) / rd,
        error_per_inch=rn / rd)


def trains_for_lathe(lathe: Lathe, lead: float | Fraction, *, limit: int = 8,
                     per_ratio: int = 1) -> tuple[GearTrain, ...]:
    """Return ``find_trains`` for this lathe's leadscrew, gears, fixed ratio, box and margin.

    lead [mm].
    References: Rose, Modern Machine Shop Practice.
    """
    return find_trains(lathe.leadscrew, lead, lathe.gears, fixed_ratio=lathe.fixed_ratio,
                       gearbox=lathe.gearbox, margin=lathe.clearance_margin, limit=limit,
                       per_ratio=per_ratio)


def lead_made(leadscrew: Leadscrew, drivers: Sequence[int], driven: Sequence[int], *,
              fixed_ratio: Fraction | int = 1, box_ratio: Fraction | int = 1) -> Fraction:
    """Return the lead a train makes, exactly [mm] (the inverse of the search).

    leadscrew (pitch exact); drivers, driven [teeth].
    References: Rose, Modern Machine Shop Practice (work pitch = leadscrew pitch × Π drivers / Π driven).
    """
    if len(drivers) != len(driven):
        raise InvalidEntry("A train has as many driven gears as drivers.")
    if any(int(t) != t or t < 1 for t in (*drivers, *driven)):
        raise InvalidEntry("Every gear needs a whole number of teeth, at least 1.")
    r = Fraction(1)
    for t in drivers:
        r *= int(t)
    for t in driven:
        r /= int(t)
    return leadscrew.pitch_exact * Fraction(fixed_ratio) * Fraction(box_ratio) * r


def tpi_of(lead_mm: float) -> float:
    """Return threads per inch of a lead [mm] (25.4 / lead)."""
    return MM_PER_INCH / lead_mm
