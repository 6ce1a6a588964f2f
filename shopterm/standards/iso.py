"""ISO metric screw threads: designations, the ISO 261 series, ISO 965-1 tolerances, limits of size.

Designations are read and printed the way ISO 965-1 writes them: ``M10x1.5-6g``, ``M10-6H``
(coarse pitch left out), ``M10x1.25-5g6g`` (pitch-diameter grade, then crest grade),
``M16xPh3P1.5-6g`` (multi-start: lead 3, pitch 1.5, two starts). The class letter's case says
the kind: lower case (e f g h) external, capital (G H) internal.

The tolerances are the stored ISO 965-1 tables in ``shopterm/data`` (micrometres), not the
clause-13 formulas: those formulas do not reproduce the tables (M3x0.5 Td2 grade 6: table 75,
formula 80), so a thread outside the tables is refused rather than computed.

Limits of size are rounded to 0.001 mm, once, at the end, as ISO 965-2 prints them. The basic
sizes (``basic_major``, ``basic_pd``, ``basic_minor``) and ``depth`` are left unrounded from the
ISO 68-1 formulas so later computations do not inherit a rounding.

References: ISO 68-1 (basic profile), ISO 261 (general plan), ISO 724 (basic dimensions),
ISO 965-1 (tolerances, Tables 1-6), ISO 965-2 (limits of size), FED-STD-H28/21B (cross-check).
"""

from __future__ import annotations

import csv
import math
import re
from dataclasses import dataclass
from functools import cache
from importlib.resources import files

from shopterm.errors import InvalidEntry, UnknownThread, UnsupportedClass
from shopterm.standards.forms import ISO_60
from shopterm.standards.spec import Kind, Limits, ThreadSpec
from shopterm.units import round_to

__all__ = ["parse", "limits", "format", "catalogue", "classes", "sizes", "pitches",
           "coarse_pitch", "fundamental_deviation", "major_tolerance", "minor_tolerance",
           "pd_tolerance", "engagement_lengths", "EngagementLengths", "DEFAULT_CLASS",
           "EXTERNAL_POSITIONS", "INTERNAL_POSITIONS"]

FAMILY = "iso"
SERIES = "M"

#: Tolerance positions in ISO 965-1 Table 1: lower case external, capitals internal.
EXTERNAL_POSITIONS = ("e", "f", "g", "h")
INTERNAL_POSITIONS = ("G", "H")

#: The class used when a designation gives none: ISO 965-1's medium class for general use.
DEFAULT_CLASS: dict[str, str] = {"external": "6g", "internal": "6H"}  # from memory (ISO 965-1 clause 10)

#: ISO 965-1 recommended tolerance classes, in the order the thread list offers them: single
#: classes, then combined ones (pitch-diameter grade, crest grade), then the rarer ones. Each
#: list is filtered by the table cells for the size. The usual choice is DEFAULT_CLASS.
_PREFERRED: dict[str, tuple[str, ...]] = {  # from memory (ISO 965-1 recommended classes)
    "external": ("4h", "6e", "6f", "6g", "6h", "8g", "8e", "5g6g", "5h6h", "7e6e", "7g6g",
                 "7h6h", "3h4h", "4g", "5g4g", "5h4h", "9e8e", "9g8g"),
    "internal": ("4H", "5H", "6G", "6H", "7G", "7H", "5H6H", "5G", "8G", "8H"),
}

# ISO 68-1 basic profile, multiples of the pitch (as printed, six decimals).
_D2 = 0.649519   # d - d2
_D1 = 1.082532   # d - D1 (= d - d1)
_D3 = 1.226869   # d - d3, external design-profile minor
_H3 = 0.613435   # 17/24 H, external thread depth
_H1 = 0.541266   # 5/8 H, internal thread depth (basic depth of engagement)
_R_MIN = 0.125   # minimum external root radius / P (ISO 965-1)

_UM = 0.001      # one micrometre [mm]

# --------------------------------------------------------------------------- stored tables


def _pkey(pitch: float) -> int:
    """Return a pitch [mm] as an integer key (units of 0.1 µm) so table lookups never compare floats."""
    return round(pitch * 10000)


def _rows(name: str) -> list[dict[str, str]]:
    text = files("shopterm.data").joinpath(name).read_text(encoding="utf-8")
    lines = [ln for ln in text.splitlines() if ln.strip() and not ln.lstrip().startswith("#")]
    return list(csv.DictReader(lines))


def _cell(text: str) -> int | None:
    text = text.strip()
    return None if text == "-" else int(text)


@cache
def _deviations() -> dict[int, dict[str, int | None]]:
    """ISO 965-1 Table 1, µm: {pitch key: {position: deviation}} (EI for G H, es for e f g h)."""
    out = {}
    for r in _rows("iso965-1_table1_fundamental_deviations.csv"):
        out[_pkey(float(r["P_mm"]))] = {
            "G": _cell(r["G_EI"]), "H": _cell(r["H_EI"]), "e": _cell(r["e_es"]),
            "f": _cell(r["f_es"]), "g": _cell(r["g_es"]), "h": _cell(r["h_es"])}
    return out


@cache
def _by_pitch(name: str, prefix: str) -> dict[int, dict[int, int | None]]:
    """A table keyed by pitch only (Td, TD1), µm: {pitch key: {grade: tolerance}}."""
    out = {}
    for r in _rows(name):
        out[_pkey(float(r["P_mm"]))] = {int(k[len(prefix):]): _cell(v) for k, v in r.items()
                                        if k.startswith(prefix)}
    return out


@dataclass(frozen=True)
class _RangeRow:
    d_over: float
    d_upto: float
    pkey: int
    values: dict


@cache
def _by_range(name: str, prefix: str) -> tuple[_RangeRow, ...]:
    """A table keyed by diameter range and pitch (Td2, TD2), µm."""
    return tuple(_RangeRow(float(r["d_over"]), float(r["d_upto"]), _pkey(float(r["P_mm"])),
                           {int(k[len(prefix):]): _cell(v) for k, v in r.items()
                            if k.startswith(prefix)})
                 for r in _rows(name))


def _range_row(rows, d: float, pitch: float):
    """Return the row for 'over d_over, up to and including d_upto' and this pitch, or None."""
    pk = _pkey(pitch)
    for row in rows:
        if row.d_over < d <= row.d_upto and row.pkey == pk:
            return row
    return None


@dataclass(frozen=True)
class _Size:
    d: float
    choice: int
    coarse: float | None
    fine: tuple[float, ...]

    @property
    def pitches(self) -> tuple[float, ...]:
        return ((self.coarse,) if self.coarse is not None else ()) + self.fine


@cache
def _series() -> tuple[_Size, ...]:
    """ISO 261 sizes M1 to M68 with coarse and fine pitches."""
    out = []
    for r in _rows("iso261_series.csv"):
        coarse = None if r["coarse"].strip() == "-" else float(r["coarse"])
        out.append(_Size(float(r["d"]), int(r["choice"]), coarse,
                         tuple(float(p) for p in r["fine"].split())))
    return tuple(out)


def _size(d: float) -> _Size | None:
    for s in _series():
        if abs(s.d - d) < 1e-9:
            return s
    return None


# Cells resting on one published copy only: the limits say so in a note.
_PROVISIONAL_F_FROM = 0.5            # Table 1, f column for P >= 0.5
_PROVISIONAL_PAIRS = {(1.4, 0.3), (26.0, 1.5), (38.0, 1.5)}   # ISO 261 entries the copies dispute
_DISPUTED_MISSING = {(30.0, 1.0), (35.0, 2.0)}                 # listed by one copy, not stored here


def _td2_provisional(row: _RangeRow, grade: int) -> bool:
    p = row.pkey / 10000
    if grade == 3:
        return (row.d_over >= 45
                or (row.d_over == 5.6 and p == 1.5)
                or (row.d_over == 11.2 and 1.5 <= p <= 2.5)
                or (row.d_over == 22.4 and 1.5 <= p <= 4.5))
    if row.d_over == 45 and p == 2 and grade == 9:
        return True
    return row.d_over == 22.4 and p == 1.5 and grade in (8, 9)


# --------------------------------------------------------------------------- table access


def _fmt(x: float) -> str:
    return f"{x:g}"


def fundamental_deviation(position: str, pitch: float) -> float:
    """Return the fundamental deviation [mm]: es (negative or 0) for e f g h, EI for G H.

    position: ``e``, ``f``, ``g``, ``h`` (external) or ``G``, ``H`` (internal); pitch [mm].
    Raises ``UnsupportedClass`` where Table 1 gives no value.
    References: ISO 965-1 Table 1.
    """
    if position not in EXTERNAL_POSITIONS + INTERNAL_POSITIONS:
        raise UnsupportedClass(f"ISO 965-1 has no tolerance position {position!r}: use e, f, g, h "
                               "(external, lower case) or G, H (internal, capitals).")
    row = _deviations().get(_pkey(pitch))
    if row is None:
        raise UnknownThread(f"ISO 965-1 Table 1 has no pitch {_fmt(pitch)} mm.")
    value = row[position]
    if value is None:
        same = EXTERNAL_POSITIONS if position in EXTERNAL_POSITIONS else INTERNAL_POSITIONS
        given = [p for p in same if row[p] is not None]
        raise UnsupportedClass(f"ISO 965-1 gives no tolerance position {position} for pitch "
                               f"{_fmt(pitch)} mm (only {', '.join(given)}).")
    return value * _UM


def major_tolerance(grade: int, pitch: float) -> float:
    """Return Td, the external major-diameter (crest) tolerance [mm].

    grade: 4, 6 or 8; pitch [mm]. References: ISO 965-1 Table 4 (Td).
    """
    return _grade_cell(_by_pitch("iso965-1_td_major_external.csv", "Td"), grade, pitch,
                       "major-diameter tolerance Td")


def minor_tolerance(grade: int, pitch: float) -> float:
    """Return TD1, the internal minor-diameter (crest) tolerance [mm].

    grade: 4 to 8; pitch [mm]. References: ISO 965-1 Table 3 (TD1).
    """
    return _grade_cell(_by_pitch("iso965-1_td1_minor_internal.csv", "TD1_"), grade, pitch,
                       "minor-diameter tolerance TD1")


def _grade_cell(table, grade: int, pitch: float, what: str) -> float:
    row = table.get(_pkey(pitch))
    if row is None:
        raise UnknownThread(f"ISO 965-1 gives no {what} for pitch {_fmt(pitch)} mm.")
    value = row.get(grade)
    if value is None:
        given = [str(g) for g, v in row.items() if v is not None]
        raise UnsupportedClass(f"ISO 965-1 gives no {what} grade {grade} for pitch "
                               f"{_fmt(pitch)} mm; grades given: {', '.join(given)}.")
    return value * _UM


def _pd_row(kind: str, d: float, pitch: float) -> _RangeRow:
    rows = (_by_range("iso965-1_td2_pitch_external.csv", "Td2_") if kind == "external"
            else _by_range("iso965-1_TD2_pitch_internal.csv", "TD2_"))
    row = _range_row(rows, d, pitch)
    if row is None:
        raise UnknownThread(f"ISO 965-1 gives no pitch-diameter tolerance for d {_fmt(d)} mm "
                            f"with pitch {_fmt(pitch)} mm.")
    return row


def pd_tolerance(grade: int, d: float, pitch: float, kind: Kind = "external") -> float:
    """Return the pitch-diameter tolerance [mm]: Td2 (external) or TD2 (internal).

    grade: 3 to 9 (external) or 4 to 8 (internal) where the table has them; d: basic major
    diameter [mm]; pitch [mm]. Diameter ranges are 'over d_over up to and including d_upto'.
    References: ISO 965-1 Tables 5 (TD2) and 6 (Td2).
    """
    row = _pd_row(kind, d, pitch)
    value = row.values.get(grade)
    if value is None:
        name = "Td2" if kind == "external" else "TD2"
        given = [str(g) for g, v in row.values.items() if v is not None]
        raise UnsupportedClass(
            f"ISO 965-1 gives no pitch-diameter tolerance {name} grade {grade} for d over "
            f"{_fmt(row.d_over)} up to {_fmt(row.d_upto)} mm, pitch {_fmt(pitch)} mm; grades "
            f"given: {', '.join(given)}.")
    return value * _UM


@dataclass(frozen=True)
class EngagementLengths:
    """ISO 965-1 Table 2 length-of-engagement groups for one size and pitch, in mm.

    Short (S): length up to ``short_upto``; normal (N): over that up to ``long_over``;
    long (L): over ``long_over``. ``provisional`` is True: Table 2 rests on one copy only.
    """

    short_upto: float
    long_over: float
    provisional: bool = True

    def group(self, length: float) -> str:
        """Return 'S', 'N' or 'L' for a length of engagement [mm]."""
        if length <= self.short_upto:
            return "S"
        return "N" if length <= self.long_over else "L"


def engagement_lengths(spec: ThreadSpec) -> EngagementLengths:
    """Return the short/normal/long engagement limits for ``spec``'s diameter and pitch.

    References: ISO 965-1 Table 2 (lengths of thread engagement).
    """
    rows = tuple(_RangeRow(float(r["d_over"]), float(r["d_upto"]), _pkey(float(r["P_mm"])),
                           {"S": float(r["S_upto"]), "L": float(r["L_over"])})
                 for r in _engagement_rows())
    row = _range_row(rows, spec.major, spec.pitch)
    if row is None:
        raise UnknownThread(f"ISO 965-1 Table 2 gives no lengths of engagement for "
                            f"{format(spec)}.")
    return EngagementLengths(row.values["S"], row.values["L"])


@cache
def _engagement_rows() -> tuple[dict[str, str], ...]:
    return tuple(_rows("iso965-1_table2_engagement.csv"))


# --------------------------------------------------------------------------- series


def sizes() -> tuple[float, ...]:
    """Return the ISO 261 nominal diameters [mm], M1 to M68.

    References: ISO 261 (general plan).
    """
    return tuple(s.d for s in _series())


def pitches(d: float) -> tuple[float, ...]:
    """Return the ISO 261 pitches [mm] of diameter ``d`` [mm], coarse first; () if not a size.

    References: ISO 261 (general plan).
    """
    s = _size(d)
    return s.pitches if s else ()


def coarse_pitch(d: float) -> float | None:
    """Return the ISO 261 coarse pitch [mm] of diameter ``d`` [mm], or None if it has none.

    References: ISO 261 (general plan).
    """
    s = _size(d)
    return s.coarse if s else None


def _check_pair(d: float, pitch: float, cls: str | None) -> _Size:
    """Return the ISO 261 size of ``d``, or raise UnknownThread naming what exists."""
    s = _size(d)
    tail = f"-{cls}" if cls else ""
    special = "Anything else can be entered as a special thread."
    if s is None:
        near = sorted(_series(), key=lambda z: abs(z.d - d))[:2]
        near = sorted(near, key=lambda z: z.d)
        raise UnknownThread(
            f"M{_fmt(d)} is not an ISO 261 diameter; the nearest are "
            f"{' and '.join('M' + _fmt(z.d) for z in near)}. {special}",
            tuple(_write(z.d, z.coarse if z.coarse else z.fine[0], 1, z.coarse is not None)
                  + tail for z in near))
    if not any(abs(p - pitch) < 1e-9 for p in s.pitches):
        listed = ", ".join(_fmt(p) + (" (coarse)" if p == s.coarse else "") for p in s.pitches)
        disputed = (" One published copy of ISO 261 lists this pair; the other does not."
                    if (s.d, round(pitch, 4)) in _DISPUTED_MISSING else "")
        raise UnknownThread(
            f"M{_fmt(d)}x{_fmt(pitch)} is not in ISO 261: M{_fmt(d)} comes in pitch {listed}."
            f"{disputed} {special}",
            tuple(_write(s.d, p, 1, False) + tail for p in s.pitches))
    return s


# --------------------------------------------------------------------------- classes


_CLASS = re.compile(r"^(?P<pg>\d)(?P<pp>[A-Za-z])(?:(?P<cg>\d)(?P<cp>[A-Za-z]))?$")


@dataclass(frozen=True)
class _Class:
    pitch_grade: int
    crest_grade: int
    position: str

    @property
    def kind(self) -> Kind:
        return "internal" if self.position.isupper() else "external"

    @property
    def text(self) -> str:
        if self.pitch_grade == self.crest_grade:
            return f"{self.pitch_grade}{self.position}"
        return f"{self.pitch_grade}{self.position}{self.crest_grade}{self.position}"


def _read_class(token: str) -> _Class:
    """Return the grades and position of a class such as ``6g``, ``6H`` or ``5g6g``."""
    m = _CLASS.match(token)
    if not m:
        raise InvalidEntry(f"{token!r} is not an ISO tolerance class: write the grade then the "
                           "letter, e.g. 6g (external), 6H (internal), or 5g6g (pitch-diameter "
                           "grade then crest grade).")
    pos = m["pp"]
    if m["cp"] is not None and m["cp"] != pos:
        raise InvalidEntry(f"{token!r}: both halves of a combined class take the same letter, "
                           f"e.g. {m['pg']}{pos}{m['cg']}{pos}.")
    if pos not in EXTERNAL_POSITIONS + INTERNAL_POSITIONS:
        raise UnsupportedClass(f"Class {token!r}: ISO 965-1 tolerance positions are e, f, g, h for "
                               "external threads (lower case) and G, H for internal (capitals).")
    pg = int(m["pg"])
    return _Class(pg, int(m["cg"]) if m["cg"] else pg, pos)


@cache
def _tolerances(d: float, pitch: float, c: _Class) -> tuple[float, float, float, tuple[str, ...]]:
    """Return (deviation, pitch-diameter tolerance, crest tolerance) [mm] and provisional notes."""
    kind = c.kind
    grades = (3, 4, 5, 6, 7, 8, 9) if kind == "external" else (4, 5, 6, 7, 8)
    if c.pitch_grade not in grades:
        raise UnsupportedClass(f"Class {c.text}: ISO 965-1 pitch-diameter grades for {kind} "
                               f"threads are {', '.join(map(str, grades))}.")
    crest = (4, 6, 8) if kind == "external" else (4, 5, 6, 7, 8)
    if c.crest_grade not in crest:
        raise UnsupportedClass(f"Class {c.text}: ISO 965-1 crest-diameter grades for {kind} "
                               f"threads are {', '.join(map(str, crest))}.")
    dev = fundamental_deviation(c.position, pitch)
    row = _pd_row(kind, d, pitch)
    td2 = pd_tolerance(c.pitch_grade, d, pitch, kind)
    tcrest = (major_tolerance if kind == "external" else minor_tolerance)(c.crest_grade, pitch)
    notes = []
    if c.position == "f" and pitch >= _PROVISIONAL_F_FROM:
        notes.append(f"Provisional: the fundamental deviation f for pitch {_fmt(pitch)} rests on "
                     "one published copy of ISO 965-1.")
    if kind == "external" and _td2_provisional(row, c.pitch_grade):
        notes.append(f"Provisional: Td2 grade {c.pitch_grade} for this size rests on one "
                     "published copy of ISO 965-1.")
    return dev, td2, tcrest, tuple(notes)


def _available(d: float, pitch: float, c: _Class) -> bool:
    try:
        _tolerances(d, pitch, c)
    except UnknownThread:
        return False
    return True


def _classes_for(d: float, pitch: float, kind: str) -> list[str]:
    return [t for t in _PREFERRED[kind] if _available(d, pitch, _read_class(t))]


def classes(spec: ThreadSpec) -> list[str]:
    """Return the ISO 965-1 recommended classes the tables give for this size, pitch and kind.

    References: ISO 965-1 (recommended tolerance classes; Tables 1-6 for which cells exist).
    """
    return _classes_for(spec.major, spec.pitch, spec.kind)


def _refuse(d: float, pitch: float, c: _Class, err: UnknownThread, head: str) -> None:
    """Raise UnsupportedClass for a class the tables lack, naming the classes they do give."""
    given = _classes_for(d, pitch, c.kind)

    def distance(t: str) -> tuple[int, bool]:
        o = _read_class(t)
        return ((o.position != c.position) + abs(o.pitch_grade - c.pitch_grade)
                + abs(o.crest_grade - c.crest_grade), t != DEFAULT_CLASS[c.kind])

    near = sorted(given, key=distance)[:3]
    raise UnsupportedClass(
        f"{head}: {err.args[0]} Classes the tables give for this {c.kind} thread: "
        f"{', '.join(given) or 'none'}.", tuple(f"{_head(d, pitch)}-{t}" for t in near)) from None


def _head(d: float, pitch: float) -> str:
    s = _size(d)
    return _write(d, pitch, 1, s is not None and s.coarse == pitch)


# --------------------------------------------------------------------------- designations


_NUM = r"(?:\d+(?:[.,]\d+)?|[.,]\d+)"
_DESIGNATION = re.compile(
    rf"""^M\s*(?P<d>{_NUM})
        (?:\s*[x×*]\s*(?:Ph\s*(?P<lead>{_NUM})\s*P\s*(?P<mp>{_NUM})|(?P<p>{_NUM})))?
        (?:(?:\s*-\s*|\s+)(?P<cls>[0-9A-Za-z]+))?
        \s*$""",
    re.IGNORECASE | re.VERBOSE)


def _num(text: str) -> float:
    return float(text.replace(",", "."))


def _write(d: float, pitch: float, starts: int, implied: bool) -> str:
    if starts > 1:
        return f"M{_fmt(d)}xPh{_fmt(round(starts * pitch, 6))}P{_fmt(pitch)}"
    return f"M{_fmt(d)}" if implied else f"M{_fmt(d)}x{_fmt(pitch)}"


def parse(text: str) -> ThreadSpec | None:
    """Return the ISO metric thread ``text`` designates, or None if it is not written ISO's way.

    Reads ``M10x1.5-6g``, ``M10-6H``, ``M10x1.25-5g6g``, ``M16xPh3P1.5-6g``; lenient about
    ``x``/``X``/``×``, spaces and a decimal comma; the class letter's case gives the kind.
    Raises ``UnknownThread`` (not in ISO 261), ``UnsupportedClass`` (class the tables lack) or
    ``InvalidEntry`` (lead not a whole number of pitches, malformed class).
    References: ISO 965-1 clause 4 (designation), ISO 261.
    """
    if not isinstance(text, str):
        return None
    m = _DESIGNATION.match(text.strip())
    if not m:
        return None
    d = _num(m["d"])
    cls = _read_class(m["cls"]) if m["cls"] else None
    starts = 1
    if m["lead"] is not None:
        lead, pitch = _num(m["lead"]), _num(m["mp"])
        if pitch <= 0:
            raise InvalidEntry(f"{text.strip()!r}: the pitch after P must be greater than zero.")
        ratio = lead / pitch
        starts = round(ratio)
        if starts < 1 or abs(ratio - starts) > 1e-9:
            raise InvalidEntry(
                f"{text.strip()!r}: the lead Ph{_fmt(lead)} must be a whole number of pitches "
                f"P{_fmt(pitch)} (e.g. Ph{_fmt(2 * pitch)}P{_fmt(pitch)} for two starts).")
        implied = False
    elif m["p"] is not None:
        pitch, implied = _num(m["p"]), False
    else:
        s = _size(d)
        if s is not None and s.coarse is None:
            raise UnknownThread(
                f"M{_fmt(d)} has no coarse pitch in ISO 261: give the pitch, e.g. "
                f"M{_fmt(d)}x{_fmt(s.fine[0])}.",
                tuple(_write(d, p, 1, False) + (f"-{m['cls']}" if m["cls"] else "")
                      for p in s.fine))
        pitch, implied = (s.coarse if s else 0.0), True
    size = _check_pair(d, pitch, cls.text if cls else None)
    pitch = next(p for p in size.pitches if abs(p - pitch) < 1e-9)
    kind: Kind = cls.kind if cls else "external"
    spec = ThreadSpec(family=FAMILY, series=SERIES, size=f"M{_fmt(size.d)}", major=size.d,
                      pitch=pitch, form=ISO_60, kind=kind, tol_class=cls.text if cls else None,
                      starts=starts, native_unit="mm", pitch_implied=implied)
    if cls is not None:
        try:
            _tolerances(size.d, pitch, cls)
        except UnknownThread as err:
            _refuse(size.d, pitch, cls, err, f"Class {cls.text} for {format(spec.with_(tol_class=None))}")
    return spec


def format(spec: ThreadSpec) -> str:  # noqa: A001 - the family contract's name
    """Return the designation as ISO 965-1 writes it, e.g. ``M10x1.25-6g`` or ``M10-6H``.

    The coarse pitch is left out when the spec says so (``pitch_implied``); a hand is never
    added (the registry adds `` LH``).
    References: ISO 965-1 clause 4.
    """
    head = _write(spec.major, spec.pitch, spec.starts, spec.pitch_implied and spec.starts == 1)
    return f"{head}-{spec.tol_class}" if spec.tol_class else head


# --------------------------------------------------------------------------- limits


def _mm3(x: float) -> float:
    """Return ``x`` [mm] rounded to 0.001 mm (half away from zero), as ISO 965-2 prints."""
    return round(round_to(x, 0.001), 3)


def limits(spec: ThreadSpec) -> Limits:
    """Return the limits of size of an ISO metric thread (class 6g/6H when none is given).

    External: d max = d + es, d min = d max - Td; d2 max = d2 + es, d2 min = d2 max - Td2;
    d3 max = d3 + es (d3 = d - 1.226869P), d3 min not set. Internal: D min = D + EI, D max not
    set; D2 min = D2 + EI, D2 max = D2 min + TD2; D1 min = D1 + EI, D1 max = D1 min + TD1.
    ``basic_minor`` is d3 (external) or D1 (internal); ``depth`` is h3 = 0.613435P (external)
    or H1 = 0.541266P (internal). spec: an ISO ThreadSpec (lengths in mm).
    References: ISO 68-1, ISO 724, ISO 965-1 clause 9 and Tables 1-6, ISO 965-2.
    """
    if spec.family != FAMILY:
        raise InvalidEntry(f"{spec.size} is not an ISO metric thread; ask its own family.")
    d, p = spec.major, spec.pitch
    _check_pair(d, p, spec.tol_class)
    notes: list[str] = []
    if spec.tol_class is None:
        cls = _default_class(d, p, spec.kind)
        notes.append(f"No class given: limits are for {cls.text}, the ISO 965-1 medium class "
                     "for general use.")
    else:
        cls = _read_class(spec.tol_class)
        if cls.kind != spec.kind:
            raise InvalidEntry(
                f"Class {cls.text} is for an {cls.kind} thread but this one is {spec.kind}: use a "
                "lower-case letter (6g) for external, a capital (6H) for internal.")
    try:
        dev, td2, tcrest, prov = _tolerances(d, p, cls)
    except UnknownThread as err:
        _refuse(d, p, cls, err, f"Class {cls.text} for {format(spec.with_(tol_class=None))}")
    notes.extend(prov)
    if (d, p) in _PROVISIONAL_PAIRS:
        notes.append(f"Provisional: ISO 261 listing of M{_fmt(d)}x{_fmt(p)} differs between "
                     "published copies.")
    if spec.starts > 1:
        # from memory: ISO 965-1's tolerances are set out for single-start threads.
        notes.append(f"{spec.starts} starts: ISO 965-1 tolerances are for the pitch; agree the "
                     "fit of a multi-start thread with the mating part.")
    d2 = d - _D2 * p
    if cls.kind == "external":
        d3 = d - _D3 * p
        major_max = d + dev
        pd_max = d2 + dev
        return Limits(
            spec=spec, basic_major=d, basic_pd=d2, basic_minor=d3,
            major_max=_mm3(major_max), major_min=_mm3(major_max - tcrest),
            pd_max=_mm3(pd_max), pd_min=_mm3(pd_max - td2),
            minor_max=_mm3(d3 + dev), minor_min=None,
            depth=_H3 * p, notes=tuple(notes), root_radius_min=_R_MIN * p)
    d1 = d - _D1 * p
    pd_min = d2 + dev
    minor_min = d1 + dev
    return Limits(
        spec=spec, basic_major=d, basic_pd=d2, basic_minor=d1,
        major_max=None, major_min=_mm3(d + dev),
        pd_max=_mm3(pd_min + td2), pd_min=_mm3(pd_min),
        minor_max=_mm3(minor_min + tcrest), minor_min=_mm3(minor_min),
        depth=_H1 * p, notes=tuple(notes))


def _default_class(d: float, pitch: float, kind: str) -> _Class:
    """Return 6g/6H, or for the smallest internal sizes (no grade 6) the nearest grade given."""
    order = ("6g",) if kind == "external" else ("6H", "5H", "4H")
    for t in order:
        c = _read_class(t)
        if _available(d, pitch, c):
            return c
    raise UnsupportedClass(f"ISO 965-1 gives no {DEFAULT_CLASS[kind]} class for "
                           f"M{_fmt(d)}x{_fmt(pitch)} {kind}; give a class.")


# --------------------------------------------------------------------------- catalogue


@cache
def _catalogue() -> tuple[ThreadSpec, ...]:
    out = []
    for s in _series():
        for p in s.pitches:
            c = _read_class(DEFAULT_CLASS["external"])
            if not _available(s.d, p, c):
                continue
            out.append(ThreadSpec(family=FAMILY, series=SERIES, size=f"M{_fmt(s.d)}", major=s.d,
                                  pitch=p, form=ISO_60, kind="external", tol_class=c.text,
                                  native_unit="mm", pitch_implied=(p == s.coarse)))
    return tuple(out)


def catalogue() -> list[ThreadSpec]:
    """Return every ISO 261 size and pitch (M1 to M68, coarse then fine), external, class 6g.

    References: ISO 261, ISO 965-1.
    """
    return list(_catalogue())
