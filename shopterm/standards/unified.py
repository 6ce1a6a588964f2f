"""Unified inch screw threads (UNC, UNF, UNEF, 8-UN, 12-UN, 16-UN; UNR external roots).

Designations as ASME B1.1 writes them: ``1/4-20 UNC-2A``, ``#10-32 UNF-3B``, ``1-1/8-8 UN-2A``,
``0.250-20 UNC-2A``, ``1/4-20 UNRC-2A`` and multi-start
``0.750-0.0625P-0.1875L (3 STARTS) UNF-2A``. Limits of size are computed by the ASME B1.1
tolerance formulas in inches, rounded as the standard rounds them (0.0001 in), then converted
to mm once.

References: ASME B1.1 (Unified Inch Screw Threads, UN and UNR Thread Form);
ASME B1.1.
"""

from __future__ import annotations

import math
import re
from decimal import ROUND_HALF_UP, Decimal
from fractions import Fraction

from shopterm.errors import InvalidEntry, UnknownThread, UnsupportedClass
from shopterm.standards.forms import UNIFIED_60
from shopterm.standards.spec import Limits, ThreadSpec, inch

__all__ = ["parse", "limits", "format", "catalogue", "classes", "SERIES", "SERIES_TITLES",
           "EXTERNAL_CLASSES", "INTERNAL_CLASSES", "length_of_engagement", "pd_tolerance_in",
           "numbered_major_in"]

FAMILY = "unified"

# --------------------------------------------------------------------------------------------
# Series tables: (size label, basic major [in], tpi).
# ASME B1.1 Table 1 series, from memory. Numbered sizes: #n = 0.060 + 0.013·n in (ASME B1.1).
# Constant-pitch series list only the sizes whose combination is not already a UNC/UNF/UNEF
# thread (ASME B1.1 prints those as the graded series, e.g. 1-8 is UNC, 1-1/8-12 is UNF).
# --------------------------------------------------------------------------------------------

Row = tuple[str, float, float]


def numbered_major_in(n: int) -> float:
    """Return the basic major diameter of numbered size #n [in]: 0.060 + 0.013·n.

    References: ASME B1.1 (numbered machine-screw sizes).
    """
    return float(Fraction(60 + 13 * n, 1000))


_UNC: tuple[Row, ...] = (  # ASME B1.1 Table 1 series, from memory
    ("#1", 0.073, 64), ("#2", 0.086, 56), ("#3", 0.099, 48), ("#4", 0.112, 40),
    ("#5", 0.125, 40), ("#6", 0.138, 32), ("#8", 0.164, 32), ("#10", 0.190, 24),
    ("#12", 0.216, 24), ("1/4", 0.2500, 20), ("5/16", 0.3125, 18), ("3/8", 0.3750, 16),
    ("7/16", 0.4375, 14), ("1/2", 0.5000, 13), ("9/16", 0.5625, 12), ("5/8", 0.6250, 11),
    ("3/4", 0.7500, 10), ("7/8", 0.8750, 9), ("1", 1.0000, 8), ("1-1/8", 1.1250, 7),
    ("1-1/4", 1.2500, 7), ("1-3/8", 1.3750, 6), ("1-1/2", 1.5000, 6), ("1-3/4", 1.7500, 5),
    ("2", 2.0000, 4.5), ("2-1/4", 2.2500, 4.5), ("2-1/2", 2.5000, 4), ("2-3/4", 2.7500, 4),
    ("3", 3.0000, 4), ("3-1/4", 3.2500, 4), ("3-1/2", 3.5000, 4), ("3-3/4", 3.7500, 4),
    ("4", 4.0000, 4),
)

_UNF: tuple[Row, ...] = (  # ASME B1.1 Table 1 series, from memory
    ("#0", 0.060, 80), ("#1", 0.073, 72), ("#2", 0.086, 64), ("#3", 0.099, 56),
    ("#4", 0.112, 48), ("#5", 0.125, 44), ("#6", 0.138, 40), ("#8", 0.164, 36),
    ("#10", 0.190, 32), ("#12", 0.216, 28), ("1/4", 0.2500, 28), ("5/16", 0.3125, 24),
    ("3/8", 0.3750, 24), ("7/16", 0.4375, 20), ("1/2", 0.5000, 20), ("9/16", 0.5625, 18),
    ("5/8", 0.6250, 18), ("3/4", 0.7500, 16), ("7/8", 0.8750, 14), ("1", 1.0000, 12),
    ("1-1/8", 1.1250, 12), ("1-1/4", 1.2500, 12), ("1-3/8", 1.3750, 12), ("1-1/2", 1.5000, 12),
)

_UNEF: tuple[Row, ...] = (  # ASME B1.1 Table 1 series, from memory
    ("#12", 0.216, 32), ("1/4", 0.2500, 32), ("5/16", 0.3125, 32), ("3/8", 0.3750, 32),
    ("7/16", 0.4375, 28), ("1/2", 0.5000, 28), ("9/16", 0.5625, 24), ("5/8", 0.6250, 24),
    ("11/16", 0.6875, 24), ("3/4", 0.7500, 20), ("13/16", 0.8125, 20), ("7/8", 0.8750, 20),
    ("15/16", 0.9375, 20), ("1", 1.0000, 20), ("1-1/16", 1.0625, 18), ("1-1/8", 1.1250, 18),
    ("1-3/16", 1.1875, 18), ("1-1/4", 1.2500, 18), ("1-5/16", 1.3125, 18),
    ("1-3/8", 1.3750, 18), ("1-7/16", 1.4375, 18), ("1-1/2", 1.5000, 18),
    ("1-9/16", 1.5625, 18), ("1-5/8", 1.6250, 18), ("1-11/16", 1.6875, 18),
)


def _label(x: Fraction) -> str:
    whole, rest = divmod(x, 1)
    if rest == 0:
        return str(whole)
    frac = f"{rest.numerator}/{rest.denominator}"
    return f"{whole}-{frac}" if whole else frac


def _constant_pitch(tpi: int, first: Fraction) -> tuple[Row, ...]:
    # ASME B1.1 Table 1 series, from memory: sixteenths up to 2 in, eighths from 2 to 4 in.
    sizes = [first + Fraction(k, 16) for k in range(int((2 - first) * 16) + 1)]
    sizes += [2 + Fraction(k, 8) for k in range(1, 17)]
    graded = {(Fraction(str(d)), t) for table in (_UNC, _UNF, _UNEF) for _, d, t in table}
    return tuple((_label(s), float(s), tpi) for s in sizes if (s, tpi) not in graded)


#: Series key -> rows. The order is the order a plain ``UN`` is looked up in.
SERIES: dict[str, tuple[Row, ...]] = {
    "UNC": _UNC,
    "UNF": _UNF,
    "UNEF": _UNEF,
    "8-UN": _constant_pitch(8, Fraction(1)),
    "12-UN": _constant_pitch(12, Fraction(9, 16)),
    "16-UN": _constant_pitch(16, Fraction(3, 8)),
}

SERIES_TITLES: dict[str, str] = {
    "UNC": "Unified coarse", "UNF": "Unified fine", "UNEF": "Unified extra fine",
    "8-UN": "8 tpi constant pitch", "12-UN": "12 tpi constant pitch",
    "16-UN": "16 tpi constant pitch",
}

EXTERNAL_CLASSES = ("1A", "2A", "3A")
INTERNAL_CLASSES = ("1B", "2B", "3B")

# Series word as written -> (series key or None for "any UN series", rounded root?)
_SERIES_WORDS: dict[str, tuple[str | None, bool]] = {
    "UNC": ("UNC", False), "UNF": ("UNF", False), "UNEF": ("UNEF", False), "UN": (None, False),
    "UNRC": ("UNC", True), "UNRF": ("UNF", True), "UNREF": ("UNEF", True), "UNR": (None, True),
}

# --------------------------------------------------------------------------------------------
# Parsing
# --------------------------------------------------------------------------------------------

_SIZE = r"(?:\#\s*\d+|NO\.?\s*\d+|\d+[-\s]\d+\s*/\s*\d+|\d+\s*/\s*\d+|\d*\.\d+|\d+)"
_NUM = r"(?:\d*\.\d+|\d+)"
_TAIL = r"\s*(?P<series>UN[A-Z]*)(?:\s*-?\s*(?P<cls>[0-9A-Z]+))?"
_PLAIN = re.compile(rf"^(?P<size>{_SIZE})\s*-\s*(?P<tpi>\d+(?:\.\d+)?){_TAIL}$", re.IGNORECASE)
_MULTI = re.compile(
    rf"^(?P<size>{_SIZE})\s*-\s*(?P<p>{_NUM})\s*P\s*(?:-\s*(?P<l>{_NUM})\s*L)?\s*"
    rf"(?:\(\s*(?P<n>\d+)\s*STARTS?\s*\))?\s*-?{_TAIL}$", re.IGNORECASE)


def _size_candidates(text: str) -> tuple[list[tuple[str, Fraction]], bool]:
    """Return [(normalised label, major in)] the size text may mean, and whether it is decimal."""
    s = re.sub(r"(\d)\s+(\d+\s*/)", r"\1-\2", text.strip())  # "1 1/8" is 1-1/8
    s = "".join(s.split()).upper()
    if s.startswith("#") or s.startswith("NO"):
        n = int(s.lstrip("#").removeprefix("NO").lstrip("."))
        return [(f"#{n}", Fraction(60 + 13 * n, 1000))], False
    if "/" in s:
        if m := re.fullmatch(r"(\d+)-(\d+)/(\d+)", s):
            whole, num, den = int(m[1]), int(m[2]), int(m[3])
        else:
            whole, (num, den) = 0, map(int, s.split("/"))
        if den == 0:
            raise InvalidEntry(f"Size {text!r}: a fraction cannot have 0 below the line.")
        value = whole + Fraction(num, den)
        return [(_label(value), value)], False
    if "." in s:
        label = "0" + s if s.startswith(".") else s
        return [(label, Fraction(label))], True
    n = int(s)
    out = [(str(n), Fraction(n))]
    if n <= 12:  # a bare 10 in "10-32 UNF" is the numbered size
        out.append((f"#{n}", Fraction(60 + 13 * n, 1000)))
    return out, False


def _rows_for(major: Fraction, series: str | None) -> list[tuple[str, Row]]:
    keys = [series] if series else list(SERIES)
    return [(k, r) for k in keys for r in SERIES[k] if Fraction(str(r[1])) == major]


def _tpi_text(tpi: float) -> str:
    return f"{tpi:g}"


def _designation(size: str, tpi: float, word: str, cls: str | None) -> str:
    return f"{size}-{_tpi_text(tpi)} {word}" + (f"-{cls}" if cls else "")


def _series_word(series: str, unr: bool, plain_un: bool) -> str:
    if plain_un or series.endswith("-UN"):
        return "UNR" if unr else "UN"
    return ("UNR" + series[2:]) if unr else series


def _check_class(cls: str | None, text: str) -> tuple[str | None, str]:
    """Return (class or None, kind) from the class text."""
    if cls is None:
        return None, "external"
    c = cls.upper()
    if re.fullmatch(r"[123]", c):
        raise InvalidEntry(f"{text!r}: class {c} needs A (external) or B (internal), "
                           f"e.g. {c}A for a screw or {c}B for a nut.")
    if c in EXTERNAL_CLASSES:
        return c, "external"
    if c in INTERNAL_CLASSES:
        return c, "internal"
    if re.fullmatch(r"\d[AB]", c):
        near = EXTERNAL_CLASSES if c.endswith("A") else INTERNAL_CLASSES
        raise UnsupportedClass(f"{text!r}: ASME B1.1 has no class {c}; use one of "
                               f"{', '.join(near)}.", ())
    raise InvalidEntry(f"{text!r}: {cls!r} is not a Unified class; use 1A, 2A or 3A for a "
                       "screw, 1B, 2B or 3B for a nut.")


def _suggest_for(labels: list[tuple[str, Fraction]], series: str | None, word_series: str | None,
                 unr: bool, plain_un: bool, cls: str | None) -> tuple[str, ...]:
    """Return designations for the sizes meant, the series asked for first."""
    out: list[str] = []
    for label, major in labels:
        for key, row in _rows_for(major, None):
            first = key == series
            d = _designation(label, row[2], _series_word(key, unr, plain_un and key in
                             ("UNC", "UNF", "UNEF")), cls)
            if first:
                out.insert(0, d)
            elif d not in out:
                out.append(d)
    if out:
        return tuple(out[:4])
    # No such size: the nearest sizes of the series asked for.
    target = float(labels[0][1])
    rows = [(k, r) for k in ([word_series] if word_series else list(SERIES)) for r in SERIES[k]]
    rows.sort(key=lambda kr: abs(kr[1][1] - target))
    seen: list[str] = []
    for key, (label, _, tpi) in rows:
        d = _designation(label, tpi, _series_word(key, unr, plain_un), cls)
        if d not in seen:
            seen.append(d)
        if len(seen) == 3:
            break
    return tuple(seen)


def parse(text: str) -> ThreadSpec | None:
    """Return the Unified thread ``text`` designates, or None if it is not written as one.

    text: e.g. ``1/4-20 UNC-2A``, ``#10-32 UNF-3B``, ``0.750-0.0625P-0.1875L (3 STARTS) UNF-2A``
    (sizes, P and L in inches). Raises ``UnknownThread`` (with suggestions) for a size or tpi
    not in the series, ``UnsupportedClass``/``InvalidEntry`` for a bad class or multi-start.

    References: ASME B1.1 (thread designations).
    """
    if not isinstance(text, str):
        return None
    s = " ".join(text.strip().split())
    multi = _MULTI.match(s)
    plain = None if multi else _PLAIN.match(s)
    m = multi or plain
    if m is None:
        return None
    word = m["series"].upper()
    if word not in _SERIES_WORDS:
        return None  # UNS, UNJ ...: not a series this module tabulates
    word_series, unr = _SERIES_WORDS[word]
    plain_un = word_series is None
    cls, kind = _check_class(m["cls"], s)
    if unr and kind == "internal":
        raise InvalidEntry(f"{s!r}: UNR is a rounded root for screws only; for the nut write "
                           f"{word.replace('R', '', 1)}-{cls} (UN internal threads mate with UNR).")
    candidates, decimal_size = _size_candidates(m["size"])

    starts = 1
    if multi:
        p_in = float(multi["p"])
        if p_in <= 0:
            raise InvalidEntry(f"{s!r}: the pitch P must be greater than zero (in inches).")
        if multi["l"] is not None:
            l_in = float(multi["l"])
            ratio = l_in / p_in
            starts = round(ratio)
            if starts < 1 or abs(ratio - starts) > 1e-6:
                raise InvalidEntry(f"{s!r}: the lead L ({l_in:g} in) must be a whole number of "
                                   f"pitches P ({p_in:g} in); check P and L.")
        if multi["n"] is not None:
            stated = int(multi["n"])
            if multi["l"] is None:
                starts = stated
            elif stated != starts:
                raise InvalidEntry(f"{s!r}: L/P gives {starts} starts but {stated} are stated; "
                                   "correct L, P or the number of starts.")
            if stated < 1:
                raise InvalidEntry(f"{s!r}: a thread has at least 1 start.")
        tpi_value = 1 / p_in
        tpi_given = round(tpi_value, 6)
    else:
        tpi_given = float(m["tpi"])
        if tpi_given <= 0:
            raise InvalidEntry(f"{s!r}: the threads per inch must be greater than zero.")

    found: list[tuple[str, str, Row]] = []
    for label, major in candidates:
        for key, row in _rows_for(major, word_series):
            if abs(row[2] - tpi_given) < 1e-6 * row[2]:
                found.append((label, key, row))
    if not found:
        if multi:
            tried = f"P {multi['p']} in ({tpi_given:g} tpi)"
        else:
            tried = f"{_tpi_text(tpi_given)} tpi"
        series_name = word_series or "UN"
        raise UnknownThread(f"{s!r}: {tried} at size {m['size']} is not in the {series_name} "
                            "series of ASME B1.1.",
                            _suggest_for(candidates, word_series, word_series, unr, plain_un,
                                         cls))
    label, key, row = found[0]
    extra: list[tuple[str, str]] = []
    if unr:
        extra.append(("root", "UNR"))
    if plain_un and key in ("UNC", "UNF", "UNEF"):
        extra.append(("written", "UN"))
    if multi:
        extra.append(("style", "PL"))
    tpi = float(row[2])
    return ThreadSpec(
        family=FAMILY, series=key, size=label, major=inch(row[1]), pitch=25.4 / tpi,
        form=UNIFIED_60, kind=kind, tol_class=cls, tpi=tpi, starts=starts,
        native_unit="in", extra=tuple(extra))


# --------------------------------------------------------------------------------------------
# Formatting, catalogue, classes
# --------------------------------------------------------------------------------------------

def _flags(spec: ThreadSpec) -> dict[str, str]:
    return dict(spec.extra)


def _inch_text(x: float) -> str:
    text = f"{x:.4f}"
    if abs(float(text) - x) > 1e-9:
        text = f"{x:.6f}".rstrip("0")
    return text


def format(spec: ThreadSpec) -> str:  # noqa: A001 - the family contract names it so
    """Return the designation as ASME B1.1 writes it, e.g. ``1/4-20 UNC-2A`` (no LH suffix).

    References: ASME B1.1 (thread designations).
    """
    flags = _flags(spec)
    word = _series_word(spec.series, flags.get("root") == "UNR", flags.get("written") == "UN")
    cls = f"-{spec.tol_class}" if spec.tol_class else ""
    if spec.starts > 1 or flags.get("style") == "PL":
        p_in = 1 / spec.tpi
        text = f"{spec.size}-{_inch_text(p_in)}P-{_inch_text(p_in * spec.starts)}L"
        if spec.starts > 1:
            text += f" ({spec.starts} STARTS)"
        return f"{text} {word}{cls}"
    return f"{spec.size}-{_tpi_text(spec.tpi)} {word}{cls}"


def catalogue() -> list[ThreadSpec]:
    """Return every size of every tabulated Unified series, external, class 2A.

    References: ASME B1.1 Table 1 series (from memory).
    """
    out = []
    for key, rows in SERIES.items():
        for label, major, tpi in rows:
            out.append(ThreadSpec(family=FAMILY, series=key, size=label, major=inch(major),
                                  pitch=25.4 / tpi, form=UNIFIED_60, kind="external",
                                  tol_class="2A", tpi=float(tpi), native_unit="in"))
    return out


def classes(spec: ThreadSpec) -> list[str]:
    """Return the ASME B1.1 classes for this kind: 1A 2A 3A (external) or 1B 2B 3B (internal).

    References: ASME B1.1 (classes of thread).
    """
    return list(EXTERNAL_CLASSES if spec.is_external else INTERNAL_CLASSES)


# --------------------------------------------------------------------------------------------
# Tolerances (all in inches)
# --------------------------------------------------------------------------------------------

_TENTH_THOU = Decimal("0.0001")
_THOU = Decimal("0.001")
_MICRO = Decimal("0.000001")

# Pitch-diameter tolerance of each class as a multiple of the class 2A tolerance
# (ASME B1.1, from memory).
_PD_FACTOR = {"1A": Decimal("1.5"), "2A": Decimal("1"), "3A": Decimal("0.75"),
              "1B": Decimal("1.95"), "2B": Decimal("1.3"), "3B": Decimal("0.975")}
# Extra PD tolerance for multi-start threads: 2 starts +10 %, 3 starts +15 %, 4 or more +20 %
# (ASME B1.1, from memory).
_STARTS_FACTOR = {1: Decimal("1"), 2: Decimal("1.10"), 3: Decimal("1.15")}


def _dec(x: float) -> Decimal:
    return Decimal(repr(float(x)))


def _round(x: Decimal, step: Decimal = _TENTH_THOU) -> Decimal:
    return x.quantize(step, rounding=ROUND_HALF_UP)


def length_of_engagement(series: str, major_in: float, tpi: float) -> float:
    """Return the length of engagement LE [in] the ASME B1.1 tolerances are based on.

    LE = D for UNC and UNF (and the 4-, 6-, 8-UN series); LE = 9P for UNEF and the 12-, 16-UN
    series. major_in [in], tpi [1/in].
    UNEF: ASME B1.1 infers 9P for the 12-/16-/20-UN series from the printed tables
    and leaves UNEF open. We take 9P because ASME B1.1 groups UNEF with the fine constant-pitch
    series (from memory): extra-fine threads are for thin walls and short nuts, where nine
    pitches, not a whole diameter, is what engages.

    References: ASME B1.1 (pitch diameter tolerance formula).
    """
    if series in ("UNC", "UNF", "8-UN"):
        return major_in
    return 9 / tpi


def _pd_increments(major_in: float, le_in: float, p_in: float) -> Decimal:
    # ASME B1.1 tabulates the three increments of the class 2A PD tolerance to six decimals
    # (from memory) and the class tolerances are built from their sum. Summing the increments
    # at that precision is what makes 1/4-20 UNC-2B give 1.3 x 0.003731 = 0.00485 -> 0.0049 and
    # PD max 0.2224 as printed (ASME B1.1); summing unrounded gives 0.00484998
    # -> 0.0048 and 0.2223, which the printed table contradicts.
    d_term = _round(_dec(0.0015 * major_in ** (1 / 3)), _MICRO)
    le_term = _round(_dec(0.0015 * math.sqrt(le_in)), _MICRO)
    p_term = _round(_dec(0.015 * p_in ** (2 / 3)), _MICRO)
    return d_term + le_term + p_term


def pd_tolerance_in(major_in: float, tpi: float, tol_class: str, series: str = "UNC",
                    starts: int = 1) -> float:
    """Return the pitch-diameter tolerance [in] of ``tol_class``, rounded to 0.0001 in.

    Td2(2A) = 0.0015·D^(1/3) + 0.0015·√LE + 0.015·P^(2/3); other classes a multiple of it
    (1A 1.5, 3A 0.75, 1B 1.95, 2B 1.3, 3B 0.975), rounded from the unrounded product.
    major_in [in], tpi [1/in], series selects LE (see ``length_of_engagement``).

    References: ASME B1.1 (tolerances).
    """
    if tol_class not in _PD_FACTOR:
        raise UnsupportedClass(f"ASME B1.1 has no class {tol_class!r}; use 1A, 2A, 3A, 1B, 2B "
                               "or 3B.")
    p_in = 1 / tpi
    base = _pd_increments(major_in, length_of_engagement(series, major_in, tpi), p_in)
    factor = _PD_FACTOR[tol_class] * _STARTS_FACTOR.get(starts, Decimal("1.20"))
    return float(_round(base * factor))


def _allowance(major_in: float, tpi: float, tol_class: str, series: str) -> Decimal:
    # es = 0.300 x Td2(2A) for classes 1A and 2A; none for 3A and internal threads
    # (ASME B1.1).
    if tol_class not in ("1A", "2A"):
        return Decimal(0)
    base = _pd_increments(major_in, length_of_engagement(series, major_in, tpi), 1 / tpi)
    return _round(base * Decimal("0.300"))


def _internal_minor_tolerance(major_in: float, p_in: float, tol_class: str) -> float:
    # Internal minor-diameter tolerance (ASME B1.1; the 1/4 in-and-up 2B rule is in
    # ASME B1.1 (from memory), the rest from memory):
    #   1B/2B, 1/4 in and larger: 0.25P − 0.40P² (0.15P at 4 tpi and coarser);
    #   3B all sizes, and 1B/2B below 1/4 in: 0.05·P^(2/3) + 0.03·P/D − 0.002, but not less than
    #   0.23P − 1.5P² (13 tpi and finer) or 0.120P (coarser than 13 tpi), nor more than 0.394P.
    if tol_class in ("1B", "2B") and major_in >= 0.25:
        if p_in >= 0.25:
            return 0.15 * p_in
        return 0.25 * p_in - 0.40 * p_in ** 2
    t = 0.05 * p_in ** (2 / 3) + 0.03 * p_in / major_in - 0.002
    low = 0.23 * p_in - 1.5 * p_in ** 2 if p_in <= 1 / 13 + 1e-12 else 0.120 * p_in
    return min(max(t, low), 0.394 * p_in)


def limits(spec: ThreadSpec) -> Limits:
    """Return the ASME B1.1 limits of size of a Unified thread (in mm, computed in inches).

    External: major and PD max/min; minor max (UNR: basic major − allowance − 1.226869P;
    UN flat root: basic minor − allowance); root radius 0.108P–0.144P for UNR.
    Internal: major min = basic major; PD min = basic PD, max = min + TD2; minor min = basic
    minor, max = min + TD1 (printed to 0.001 in for 1B/2B, 1/4 in and larger; else 0.0001 in),
    both from the basic minor already rounded to 0.0001 in.
    ``depth``: 0.613435P on radius for external threads (17/24 H, major to the UNR root), which
    is what the tool must reach so the screw clears the nut's crest; 0.541266P for internal
    (5/8 H, the basic depth of engagement), the same two depths as ISO h3/H1.
    No class given: class 2A or 2B, said in the notes.

    References: ASME B1.1 (basic profile, allowances, tolerances, UNR root);
    ASME B1.1.
    """
    if spec.family != FAMILY or not spec.tpi:
        raise UnknownThread(f"{spec.size} is not a Unified thread; enter it as UNC, UNF, UNEF "
                            "or UN.")
    flags = _flags(spec)
    notes: list[str] = []
    cls = spec.tol_class
    if cls is None:
        cls = "2A" if spec.is_external else "2B"
        notes.append(f"No class given: limits for class {cls}.")
    if cls not in classes(spec):
        raise UnsupportedClass(f"Class {cls} is for an {'internal' if spec.is_external else 'external'}"
                               f" thread; use one of {', '.join(classes(spec))}.")
    unr = flags.get("root") == "UNR"
    if unr and not spec.is_external:
        raise InvalidEntry("UNR is a rounded root for screws only; for a nut use the UN series "
                           f"word ({spec.series}) with class 1B, 2B or 3B.")

    d = _round(_dec(spec.major / 25.4))   # table majors have at most 4 decimals
    d_in = float(d)
    tpi = spec.tpi
    p_in = 1 / tpi
    le = length_of_engagement(spec.series, d_in, tpi)
    basic_pd = _round(_dec(d_in - 0.649519 / tpi))     # ASME B1.1
    basic_minor = _round(_dec(d_in - 1.082532 / tpi))  # ASME B1.1
    td2 = Decimal(str(pd_tolerance_in(d_in, tpi, cls, spec.series, spec.starts)))
    notes.append(f"PD tolerance for a length of engagement of {float(le):.4g} in "
                 f"({'D' if le == d_in else '9P'}).")
    if spec.starts > 1:
        pct = {2: 10, 3: 15}.get(spec.starts, 20)
        notes.append(f"{spec.starts} starts: PD tolerance widened {pct} %.")

    root_min = root_max = None
    if spec.is_external:
        es = _allowance(d_in, tpi, cls, spec.series)
        td = _round(_dec((0.090 if cls == "1A" else 0.060) * p_in ** (2 / 3)))
        major_max = d - es
        major_min = major_max - td
        pd_max = basic_pd - es
        pd_min = pd_max - td2
        if unr:
            # UNR minor max = basic major − allowance − 1.226869P, i.e. max PD − 0.577350P
            # (ASME B1.1, from memory), with the root radius 0.108P..0.144P.
            minor_max = _round(_dec(d_in - float(es) - 1.226869 * p_in))
            root_min, root_max = inch(0.108 * p_in), inch(0.144 * p_in)
            notes.append("UNR root: rounded, radius 0.108P to 0.144P.")
        else:
            # UN flat root: clear the nut's crest at basic minor less the allowance.
            minor_max = basic_minor - es
            notes.append("UN root: flat or rounded; keep the root below the minor max.")
        if cls == "3A":
            notes.append("Class 3A has no allowance.")
        depth = 0.613435 * p_in
        return Limits(
            spec=spec, basic_major=inch(float(d)), basic_pd=inch(float(basic_pd)),
            basic_minor=inch(float(basic_minor)), major_max=inch(float(major_max)),
            major_min=inch(float(major_min)), pd_max=inch(float(pd_max)),
            pd_min=inch(float(pd_min)), minor_max=inch(float(minor_max)), minor_min=None,
            depth=inch(depth), notes=tuple(notes), root_radius_min=root_min,
            root_radius_max=root_max)

    pd_min = basic_pd
    pd_max = basic_pd + td2
    tol1 = _round(_dec(_internal_minor_tolerance(d_in, p_in, cls)))
    step = _THOU if cls in ("1B", "2B") and d_in >= 0.25 else _TENTH_THOU
    # Min minor = the basic minor as the table prints it (0.0001 in), then to the class's step:
    # 1-3/4-5 basic minor 1.53349.. prints 1.5335, so 2B min minor 1.534 (ASME B1.1 table);
    # rounding the unrounded value gives 1.533.
    minor_min = _round(basic_minor, step)
    minor_max = _round(basic_minor + tol1, step)
    notes.append("Major diameter max is not set by ASME B1.1: the tap or tool crest sets it.")
    depth = 0.541266 * p_in
    return Limits(
        spec=spec, basic_major=inch(float(d)), basic_pd=inch(float(basic_pd)),
        basic_minor=inch(float(basic_minor)), major_max=None, major_min=inch(float(d)),
        pd_max=inch(float(pd_max)), pd_min=inch(float(pd_min)), minor_max=inch(float(minor_max)),
        minor_min=inch(float(minor_min)), depth=inch(depth), notes=tuple(notes))
