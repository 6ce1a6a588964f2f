"""What thread is this? Rank the catalogue's threads against what a person measured at the bench.

Measurements (all optional, at least one):

- the crest diameter with calipers: the major diameter of a bolt, the minor diameter of a nut;
  also, where measured, the root diameter (a bolt's minor, a nut's major);
- the pitch: from a thread gauge in mm or in tpi, or by counting over a measured length. Both
  mm and tpi may be given; they are cross-checked (a 1.27 mm pitch is 20 tpi) and combined;
- the included flank angle from a gauge (60, 55, 47.5, 30 trapezoidal, 29 Acme, 0 square);
- the width of the crest flat (a bolt's), which tells a trapezoidal or Acme thread (about
  0.37P) from a 60° one (P/8) and a rounded Whitworth or BA crest (none);
- readings over wires of a bolt (wire size and reading), each giving a pitch diameter for every
  candidate through the three-wire relation; two wire sizes together test the flank angle;
- a taper: the crest diameter at two places a stated distance apart. It tells a tapered pipe
  thread (ISO 7-1 R, NPT: 1 in 16 on diameter) from a parallel one of the same size and pitch
  (ISO 228-1 G). A tapered candidate's diameters are those at its gauge plane; a diameter
  measured anywhere on its thread may lie from its small end to the end of its useful thread,
  so its bands are widened by the taper over that length.

Counting threads over a length. ``counted="crests"`` (the default): the count includes the
crest at each end of the measured length, so ``n`` crests span ``n − 1`` pitches and
pitch = length / (count − 1). ``counted="spaces"``: the count is of the spaces (whole pitches)
between the first and last crest, so pitch = length / count.

Scoring. Each measurement is compared with the range the candidate's standard allows, giving a
signed distance in units of how far such a measurement may plausibly stray (``z``); the score is
exp(−½ Σ z²): 1 when every measurement lies where this thread puts it, falling towards 0 as
they disagree. The pitch is trusted more than a diameter. Worn crests are normal: a bolt's major
diameter may be well under its class minimum (crest wear, generous allowance below) but rarely
over its maximum; a nut's minor diameter wears larger. A power thread's crests wear further —
a leadscrew or a vice screw runs in its nut for years (``LEADSCREW_WEAR_PER_P``) — while its
pitch stays exact: such a screw is still offered, with a note. Rivals scoring at least
``AMBIGUOUS_RATIO`` of the top score make the answer ambiguous, and ``to_tell_apart`` names the
measurement that separates them with the expected value for each.

The uncertainties below are shop judgement (marked so), not values from a standard.

References: basic sizes and limits from the family modules (ISO 261/965, ASME B1.1, BS 84,
BS 93); three-wire relation M = E + W(1 + cosec a) − (P/2)·cot a, NBS Handbook H28, through
``shopterm.cutting.wires``; 1 in = 25.4 mm exactly.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, replace
from functools import lru_cache
from typing import Iterable, Literal, Sequence

from shopterm.cutting.wires import is_power_form, over_wires, pitch_diameter, wire_range
from shopterm.errors import InvalidEntry
from shopterm.standards.forms import ThreadForm
from shopterm.standards.spec import Kind, Limits, ThreadSpec
from shopterm.units import MM_PER_INCH

Counted = Literal["crests", "spaces"]
COUNTED: tuple[Counted, ...] = ("crests", "spaces")

# ---- how far each kind of measurement may plausibly stray (shop judgement) -------------------

#: A thread-gauge leaf that sits right: relative pitch uncertainty. Common practice, no source
#: (a leaf 1.6 % off shows light over a dozen threads).
GAUGE_REL = 0.005
#: Reading a length crest to crest with calipers or a rule [mm]. Common practice, no source.
LENGTH_UNCERTAINTY = 0.1
#: Calipers on a crest diameter [mm]: how far over the class maximum a reading may go.
#: Common practice, no source.
CALIPER = 0.03
#: Crest wear allowed beyond the class limit [mm] = CREST_WEAR_BASE + CREST_WEAR_PER_P · P.
#: Common practice, no source.
CREST_WEAR_BASE = 0.05
CREST_WEAR_PER_P = 0.10
#: Root diameters are hard to reach with calipers: ± ROOT_BASE + ROOT_PER_P · P [mm].
#: Common practice, no source.
ROOT_BASE = 0.05
ROOT_PER_P = 0.05
#: Width assumed for a crest-diameter range the catalogue gives none for (basic-size threads),
#: over P. Common practice, no source: about what ISO 6g and Unified 2A give (0.15–0.16 P).
ASSUMED_CREST_BAND = 0.15
#: Width assumed for a pitch-diameter band of zero width, over P. Common practice, no source:
#: about ISO 6g / Unified 2A Td2 (0.07–0.09 P).
ASSUMED_PD_BAND = 0.08
#: A flank-angle gauge reading [deg]. Common practice, no source.
ANGLE_SIGMA = 1.5
#: Pitch diameter from wires: flank wear below the band, and micrometer error either side [mm].
#: Common practice, no source.
PD_WEAR_BASE = 0.02
PD_WEAR_PER_P = 0.03
PD_OVER = 0.02
#: Two wire sizes on the right form give the same pitch diameter within this [mm].
#: A power thread's crests (leadscrews, vice and press screws) wear more: allowance below the
#: major minimum per unit of pitch. Shop judgement, no source.
LEADSCREW_WEAR_PER_P = 0.15
#: How far a crest flat read with a loupe and scale or calipers may stray, and its share of the
#: pitch (wear widens or narrows it). Shop judgement, no source.
CREST_FLAT_BASE = 0.05
CREST_FLAT_PER_P = 0.05

#: Common practice, no source (two micrometer readings of ±0.005 mm and seating).
WIRE_AGREEMENT = 0.015
#: A rival scoring at least this share of the top score makes the answer ambiguous.
AMBIGUOUS_RATIO = 0.25
#: Calipers on two crest diameters, for a taper: the spread of the change of diameter per
#: unit length is hypot(CALIPER, CALIPER) / distance + TAPER_FLOOR (uneven crest wear).
#: Common practice, no source.
TAPER_FLOOR = 0.005
#: Where to measure a taper's two diameters apart, to tell a taper from a parallel thread [mm].
#: Common practice, no source.
TAPER_CHECK_DISTANCE = 10.0
#: How many close rivals of the top candidate get a telling measurement.
MAX_RIVALS = 5
#: Candidates scoring below this are not listed.
MIN_SCORE = 1e-4
#: A pitch check over a count should differ by at least this much to be read with calipers [mm].
#: Common practice, no source.
READABLE_DIFFERENCE = 0.5


# ---- what was measured ------------------------------------------------------------------------

def pitch_from_count(count: int, length: float, counted: Counted = "crests") -> float:
    """Return the pitch [mm] from a count of threads over a measured length.

    count: crests counted including both ends (``counted="crests"``: pitch = length/(count − 1))
    or spaces between them (``counted="spaces"``: pitch = length/count); length [mm] from the
    first to the last crest counted.
    References: definition of pitch (ISO 5408: axial distance between corresponding points on
    adjacent threads).
    """
    if counted not in COUNTED:
        raise InvalidEntry(f"Say what was counted: crests or spaces, not {counted!r}.")
    if isinstance(count, bool) or not isinstance(count, int):
        raise InvalidEntry("The count must be a whole number of threads.")
    _check_length(length, "length counted over")
    pitches = count - 1 if counted == "crests" else count
    if pitches < 1:
        raise InvalidEntry("Count at least 2 crests (or 1 space) over the length: "
                           "10 or more gives a good pitch.")
    return float(length) / pitches


@dataclass(frozen=True)
class PitchEntry:
    """One measured pitch and how far it may stray [mm]."""

    pitch: float
    sigma: float
    how: str                  # e.g. "gauge 1.5 mm", "gauge 20 tpi", "11 crests over 12.7 mm"

    @property
    def tpi(self) -> float:
        """Return the pitch as threads per inch."""
        return MM_PER_INCH / self.pitch


@dataclass(frozen=True)
class WireEntry:
    """One reading over three wires of a bolt [mm]."""

    wire: float
    over_wires: float


@dataclass(frozen=True)
class TaperEntry:
    """Two crest diameters a distance apart [mm], and the taper they give (on diameter)."""

    first: float
    second: float
    distance: float

    @property
    def per_unit(self) -> float:
        """Return the change of diameter per unit length (1/16 = 0.0625 for pipe tapers)."""
        return abs(self.second - self.first) / self.distance

    @property
    def sigma(self) -> float:
        """Return how far ``per_unit`` may plausibly stray (shop judgement, see TAPER_FLOOR)."""
        return math.hypot(CALIPER, CALIPER) / self.distance + TAPER_FLOOR


@dataclass(frozen=True)
class Measured:
    """Everything measured, checked; lengths in mm, angle in degrees."""

    kind: Kind
    major: float | None
    minor: float | None
    pitch: PitchEntry | None         # all pitch entries combined
    pitch_entries: tuple[PitchEntry, ...]
    angle: float | None
    wires: tuple[WireEntry, ...]
    crest_flat: float | None = None   # width of a bolt's crest flat [mm]
    taper: TaperEntry | None = None

    @property
    def crest(self) -> float | None:
        """Return the crest diameter measured: a bolt's major, a nut's minor [mm]."""
        return self.major if self.kind == "external" else self.minor

    @property
    def root(self) -> float | None:
        """Return the root diameter measured: a bolt's minor, a nut's major [mm]."""
        return self.minor if self.kind == "external" else self.major


def _check_length(value, what: str) -> float:
    if isinstance(value, bool) or not isinstance(value, (int, float)) or not math.isfinite(value):
        raise InvalidEntry(f"The {what} must be a number in mm.")
    if value <= 0:
        raise InvalidEntry(f"The {what} must be greater than zero.")
    return float(value)


def _mm(v: float) -> str:
    """Return a length in mm written short: 9.96, 10, 6.35, 1.588."""
    text = f"{v:.3f}".rstrip("0").rstrip(".")
    return "0" if text in ("-0", "") else text


def _tpi_text(tpi: float) -> str:
    return f"{tpi:.2f}".rstrip("0").rstrip(".")


def measured(*, major: float | None = None, minor: float | None = None,
             pitch: float | None = None, tpi: float | None = None,
             count: int | None = None, length: float | None = None,
             counted: Counted = "crests", angle: float | None = None,
             wires: Iterable[tuple[float, float]] = (), kind: Kind | None = None,
             length_uncertainty: float = LENGTH_UNCERTAINTY,
             crest_flat: float | None = None,
             taper: tuple[float, float, float] | None = None) -> Measured:
    """Return the measurements checked and the pitch entries cross-compared and combined.

    major, minor [mm] (calipers); pitch [mm] and/or tpi [1/in] from a gauge; count with
    length [mm] (see ``pitch_from_count``); angle [deg] included flank angle; wires: pairs of
    (wire diameter [mm], reading over wires [mm]) on a bolt; kind: 'external' or 'internal'
    (default: external when a major diameter is given, internal when only a minor);
    length_uncertainty [mm]: how well the counted length was read; crest_flat [mm]: the width
    of a bolt's crest flat (0 for a rounded crest); taper: (crest diameter [mm], crest
    diameter [mm], distance between them along the axis [mm]).
    Raises ``InvalidEntry`` saying what to enter instead.
    References: this module's docstring; 1 in = 25.4 mm.
    """
    if major is not None:
        major = _check_length(major, "major diameter")
    if minor is not None:
        minor = _check_length(minor, "minor diameter")
    if kind is None:
        kind = "internal" if (major is None and minor is not None) else "external"
    if kind not in ("external", "internal"):
        raise InvalidEntry(f"{kind!r} is not a kind of thread: use external or internal.")
    if major is not None and minor is not None and minor >= major:
        raise InvalidEntry(f"The minor diameter {_mm(minor)} must be smaller than the major "
                           f"{_mm(major)}: check which is which.")
    entries: list[PitchEntry] = []
    if pitch is not None:
        p = _check_length(pitch, "pitch")
        entries.append(PitchEntry(p, GAUGE_REL * p, f"gauge {_mm(p)} mm"))
    if tpi is not None:
        n = _check_length(tpi, "number of threads per inch")
        p = MM_PER_INCH / n
        entries.append(PitchEntry(p, GAUGE_REL * p, f"gauge {_tpi_text(n)} tpi"))
    if (count is None) != (length is None):
        raise InvalidEntry("Give both the count of threads and the length they span, "
                           "or neither.")
    if count is not None:
        sigma_len = _check_length(length_uncertainty, "length uncertainty")
        p = pitch_from_count(count, length, counted)
        pitches = count - 1 if counted == "crests" else count
        entries.append(PitchEntry(p, sigma_len / pitches,
                                  f"{count} {counted} over {_mm(length)} mm"))
    for i, a in enumerate(entries):
        for b in entries[i + 1:]:
            if abs(a.pitch - b.pitch) > 3 * math.hypot(a.sigma, b.sigma):
                raise InvalidEntry(
                    f"The pitch entries disagree: {a.how} is {_mm(a.pitch)} mm "
                    f"({_tpi_text(a.tpi)} tpi) but {b.how} is {_mm(b.pitch)} mm "
                    f"({_tpi_text(b.tpi)} tpi). Check them and enter the one you trust.")
    combined = None
    if entries:
        w = [1 / e.sigma ** 2 for e in entries]
        p = math.fsum(wi * e.pitch for wi, e in zip(w, entries)) / math.fsum(w)
        combined = PitchEntry(p, 1 / math.sqrt(math.fsum(w)),
                              " and ".join(e.how for e in entries))
    if angle is not None:
        if isinstance(angle, bool) or not isinstance(angle, (int, float)) \
                or not math.isfinite(angle) or not (angle == 0 or 20 <= angle <= 90):
            raise InvalidEntry("The flank angle is the included angle from a gauge, between 20 "
                               "and 90 degrees: 60 (metric, Unified), 55 (Whitworth form), "
                               "47.5 (BA), 30 (trapezoidal) or 29 (Acme); 0 for a square "
                               "thread.")
        angle = float(angle)
    if crest_flat is not None:
        if isinstance(crest_flat, bool) or not isinstance(crest_flat, (int, float)) \
                or not math.isfinite(crest_flat) or crest_flat < 0:
            raise InvalidEntry("The crest flat is a width in mm, 0 or more (0 for a rounded "
                               "crest).")
        if kind == "internal":
            raise InvalidEntry("The crest flat is read on a bolt: leave it out for a nut.")
        crest_flat = float(crest_flat)
    wire_list: list[WireEntry] = []
    for pair in wires:
        try:
            w_d, reading = pair
        except (TypeError, ValueError):
            raise InvalidEntry("Give each reading over wires with its wire size.") from None
        wire_list.append(WireEntry(_check_length(w_d, "wire size"),
                                   _check_length(reading, "reading over wires")))
    if wire_list and kind == "internal":
        raise InvalidEntry("Wires measure a bolt, not a nut: for a nut, measure a bolt that "
                           "fits it well, or leave the wire readings out.")
    taper_entry = None
    if taper is not None:
        try:
            first, second, apart = taper
        except (TypeError, ValueError):
            raise InvalidEntry("Give a taper as two crest diameters and the distance between "
                               "them.") from None
        taper_entry = TaperEntry(_check_length(first, "first diameter of the taper"),
                                 _check_length(second, "second diameter of the taper"),
                                 _check_length(apart, "distance between the two diameters"))
        if taper_entry.per_unit > 0.3:
            raise InvalidEntry(f"The two diameters differ by {_mm(abs(second - first))} over "
                               f"{_mm(apart)}: far steeper than a thread's taper (1 in 16 is "
                               f"{_mm(apart / 16)}). Check the numbers and the distance.")
    if major is None and minor is None and combined is None and not wire_list \
            and taper_entry is None:
        raise InvalidEntry("Measure something first: the major diameter of a bolt or the minor "
                           "diameter of a nut with calipers, and the pitch with a gauge or by "
                           "counting threads over a length.")
    return Measured(kind, major, minor, combined, tuple(entries), angle, tuple(wire_list),
                    crest_flat, taper_entry)


# ---- candidates -------------------------------------------------------------------------------

@dataclass(frozen=True)
class Check:
    """One measurement against one candidate: signed distance ``z`` and what it says."""

    what: str          # "pitch", "angle", "major", "minor", "wires", "form"
    z: float
    text: str


@dataclass(frozen=True)
class Candidate:
    """One catalogue thread the part could be, with its score and the reasons."""

    spec: ThreadSpec            # external or internal as measured, in the usual class
    designation: str            # without a class, e.g. "M10x1.5", "1/4-20 UNC", "1/4 BSW"
    score: float                # 0..1, 1 = every measurement where this thread puts it
    why: str
    checks: tuple[Check, ...]
    limits: Limits | None = None   # the limits it was judged by (its gauge plane if tapered)


@dataclass(frozen=True)
class Expected:
    """What a telling measurement should read on one candidate [mm] (low == high when exact)."""

    designation: str
    quantity: str
    low: float
    high: float


@dataclass(frozen=True)
class TellApart:
    """A measurement that separates two candidates, with what each would give."""

    between: tuple[str, str]
    measure: str    # pitch, gauge, crest flat, depth, starts, wires, two wires, diameter
    how: str
    expected: tuple[Expected, ...]


@dataclass(frozen=True)
class Identification:
    """Ranked candidates for what was measured, and how to tell the close ones apart."""

    measured: Measured
    candidates: tuple[Candidate, ...]
    ambiguous: bool
    to_tell_apart: tuple[TellApart, ...]
    note: str


def _plain(spec: ThreadSpec) -> str:
    return spec.with_(tol_class=None, pitch_implied=False, kind="external").designation


def _internal(spec: ThreadSpec) -> ThreadSpec:
    """Return the nut matching a catalogue bolt, in the family's usual internal class."""
    from shopterm.standards import classes
    base = spec.with_(kind="internal", tol_class=None)
    offered = classes(base)
    cls = spec.tol_class or ""
    for want in ("6H" if spec.family == "iso" else None,
                 cls.replace("A", "B") if spec.family == "unified" else None,
                 cls if cls in offered else None):
        if want and want in offered:
            return base.with_(tol_class=want)
    return base


@lru_cache(maxsize=2048)
def _limits(spec: ThreadSpec, kind: Kind) -> Limits:
    from shopterm.standards import limits
    return limits(spec if kind == "external" else _internal(spec))


def _taper_k(lim: Limits) -> float:
    return lim.taper.per_unit_on_diameter if lim.taper is not None else 0.0


def _along_taper(lim: Limits) -> Limits:
    """Return a tapered thread's bands widened over its thread: external from its small end to
    its useful length's end; internal from its face (where it is gauged) to its useful length."""
    t = lim.taper
    if t is None:
        return lim
    if lim.spec.is_external:
        down = t.diameter_shift(t.gauge_plane_from_end)
        up = t.diameter_shift(max((t.L2 or 0.0) - t.gauge_plane_from_end, 0.0))
    else:
        from shopterm.cutting.taper_thread import thread_length
        down, up = t.diameter_shift(thread_length(t)), 0.0
    basic = {"major": lim.basic_major, "pd": lim.basic_pd, "minor": lim.basic_minor}
    out = {}
    for d, b in basic.items():
        lo, hi = getattr(lim, f"{d}_min"), getattr(lim, f"{d}_max")
        out[f"{d}_min"] = (lo if lo is not None else b) - down
        out[f"{d}_max"] = (hi if hi is not None else b) + up
    return replace(lim, **out)


def _band_z(value: float, lo: float, hi: float, below: float, above: float) -> float:
    """Return the signed distance of ``value`` outside [lo, hi] in units of below/above."""
    if value < lo:
        return (value - lo) / below
    if value > hi:
        return (value - hi) / above
    return 0.0


def _words(z: float) -> str:
    a = abs(z)
    return "normal crest wear" if a < 1 else ("more wear than usual" if a < 2
                                              else "more than wear alone explains")


def _class_name(lim: Limits) -> str:
    return lim.spec.tol_class or "usual"


def _crest_check(m: Measured, spec: ThreadSpec, lim: Limits) -> Check | None:
    value = m.crest
    if value is None:
        return None
    p = spec.pitch
    wear = CREST_WEAR_BASE + (LEADSCREW_WEAR_PER_P if is_power_form(spec.form)
                              else CREST_WEAR_PER_P) * p
    if m.kind == "external":
        what, basic = "major", lim.basic_major
        hi = lim.major_max if lim.major_max is not None else basic
        lo = lim.major_min if lim.major_min is not None else hi - ASSUMED_CREST_BAND * p
        if hi - lo < 1e-9:
            lo = hi - ASSUMED_CREST_BAND * p
        z = _band_z(value, lo, hi, wear, CALIPER)
        diff = value - basic
        side = (f"{_mm(-diff)} under" if diff < 0 else f"{_mm(diff)} over")
        head = f"major {_mm(value)} is {side} {_mm(basic)}"
        if abs(diff) < 5e-4:
            head = f"major {_mm(value)} is the basic {_mm(basic)}"
        if z < 0:
            text = f"{head}, {_mm(lo - value)} below the {_class_name(lim)} minimum — {_words(z)}"
        elif z > 0:
            text = f"{head}, {_mm(value - hi)} over the maximum — a worn bolt is rarely larger"
        else:
            text = f"{head} — within the {_class_name(lim)} range" + (
                ", normal crest wear" if diff < -5e-4 else "")
    else:
        what, basic = "minor", lim.basic_minor
        lo = lim.minor_min if lim.minor_min is not None else basic
        hi = lim.minor_max if lim.minor_max is not None else lo + ASSUMED_CREST_BAND * p
        z = _band_z(value, lo, hi, CALIPER, wear)
        diff = value - basic
        side = (f"{_mm(-diff)} under" if diff < 0 else f"{_mm(diff)} over")
        head = f"nut minor {_mm(value)} is {side} the basic {_mm(basic)}"
        if z > 0:
            text = (f"{head}, {_mm(value - hi)} over the {_class_name(lim)} maximum — "
                    f"{_words(z).replace('crest wear', 'wear of the nut')}")
        elif z < 0:
            text = f"{head}, {_mm(lo - value)} under the minimum — a worn nut is rarely smaller"
        else:
            text = f"{head} — within the {_class_name(lim)} range"
    return Check(what, z, text)


def _root_check(m: Measured, spec: ThreadSpec, lim: Limits) -> Check | None:
    value = m.root
    if value is None:
        return None
    p = spec.pitch
    sigma = ROOT_BASE + ROOT_PER_P * p
    if m.kind == "external":
        what = "minor"
        hi = lim.minor_max if lim.minor_max is not None else lim.basic_minor
        lo = lim.minor_min if lim.minor_min is not None else hi - ASSUMED_CREST_BAND * p
        name = "root (minor)"
    else:
        what = "major"
        lo = lim.major_min if lim.major_min is not None else lim.basic_major
        hi = lim.major_max if lim.major_max is not None else lo + ASSUMED_CREST_BAND * p
        name = "nut root (major)"
    z = _band_z(value, lo, hi, sigma, sigma)
    where = ("within its range" if z == 0 else
             f"{_mm(abs(value - (lo if z < 0 else hi)))} {'under' if z < 0 else 'over'} its range")
    return Check(what, z, f"{name} {_mm(value)} is {where} {_mm(lo)}–{_mm(hi)}")


def _pitch_check(m: Measured, spec: ThreadSpec) -> Check | None:
    if m.pitch is None:
        return None
    z = (m.pitch.pitch - spec.pitch) / m.pitch.sigma
    own = f"{_mm(spec.pitch)} mm" + (f" ({_tpi_text(spec.tpi)} tpi)" if spec.tpi else "")
    d = abs(m.pitch.pitch - spec.pitch)
    if d < 5e-4:
        text = f"pitch matches {own} exactly"
    elif abs(z) < 1:
        text = f"pitch {_mm(m.pitch.pitch)} mm matches {own} within the measurement"
    else:
        text = (f"pitch {_mm(m.pitch.pitch)} mm ({_tpi_text(m.pitch.tpi)} tpi) is "
                f"{_mm(d)} mm off {own}")
    return Check("pitch", z, text)


def _angle_check(m: Measured, spec: ThreadSpec) -> Check | None:
    if m.angle is None:
        return None
    own = spec.form.angle_deg
    z = (m.angle - own) / ANGLE_SIGMA
    text = (f"{own:g}° form as gauged" if abs(z) < 1 else
            f"gauged {m.angle:g}° but this thread is a {own:g}° form")
    return Check("angle", z, text)


def crest_flat_of(form: ThreadForm, pitch: float) -> float:
    """Return the basic crest flat of a bolt of ``form`` [mm] (0 for a rounded crest).

    Flat = 2·crest_trunc·P·tan a: P/8 for 60° (ISO 68-1), 0.366P trapezoidal (ISO 2904),
    0.3707P Acme (ASME B1.5); a square thread's crest is half the pitch.
    References: ISO 68-1; ISO 2904; ASME B1.5; square: common practice, no source.
    """
    if form.crest_radius > 0:
        return 0.0
    if form.angle_deg <= 0:
        return pitch / 2
    return 2 * form.crest_trunc * pitch * math.tan(form.half_angle_rad)


def _crest_flat_check(m: Measured, spec: ThreadSpec) -> Check | None:
    if m.crest_flat is None:
        return None
    want = crest_flat_of(spec.form, spec.pitch)
    z = (m.crest_flat - want) / (CREST_FLAT_BASE + CREST_FLAT_PER_P * spec.pitch)
    shape = "a rounded crest" if want == 0 else f"a crest flat of {_mm(want)}"
    text = (f"crest flat {_mm(m.crest_flat)} fits {shape}" if abs(z) < 1 else
            f"crest flat {_mm(m.crest_flat)}, but this thread has {shape}")
    return Check("form", z, text)


def _worn_screw_note(c: Candidate, m: Measured) -> str:
    """Return the worn-leadscrew note for a power thread whose pitch is exact and crests worn."""
    if not (is_power_form(c.spec.form) and m.kind == "external" and m.major is not None):
        return ""
    by = {k.what: k for k in c.checks}
    if "pitch" not in by or abs(by["pitch"].z) >= 1 or "major" not in by or by["major"].z >= 0:
        return ""
    if "angle" in by and abs(by["angle"].z) >= 1:
        return ""
    lim = _limits(c.spec, m.kind)
    worn = (lim.major_min if lim.major_min is not None else lim.basic_major) - m.major
    return (f"{c.designation} looks like a worn leadscrew or screw: the pitch is exact, the "
            f"crests are worn {_mm(worn)} mm under the major minimum. Take the size from the "
            "least worn part (near the ends), and the flanks over wires, before cutting its "
            "mate.")


def _taper_check(m: Measured, lim: Limits) -> Check | None:
    if m.taper is None:
        return None
    k, got = _taper_k(lim), m.taper.per_unit
    z = (got - k) / m.taper.sigma
    own = f"tapered 1 in {1 / k:g}" if k else "parallel"
    text = (f"the diameter changes {_mm(abs(m.taper.second - m.taper.first))} mm over "
            f"{_mm(m.taper.distance)} mm: " + ("a " + own + " thread" if abs(z) < 1 else
                                            f"but this thread is {own}"))
    return Check("taper", z, text)


def _wire_pd(reading: WireEntry, spec: ThreadSpec) -> float | None:
    try:
        return pitch_diameter(reading.over_wires, reading.wire, spec.form, spec.pitch,
                              spec.lead, method="h28")
    except InvalidEntry:
        return None


def _wire_checks(m: Measured, spec: ThreadSpec, lim: Limits) -> list[Check]:
    if not m.wires or spec.form.angle_deg <= 0:     # wires cannot measure a square thread
        return []
    p = spec.pitch
    hi = lim.pd_max
    lo = lim.pd_min if lim.pd_max - lim.pd_min > 1e-9 else hi - ASSUMED_PD_BAND * p
    out: list[Check] = []
    pds: list[tuple[WireEntry, float]] = []
    for r in m.wires:
        e = _wire_pd(r, spec)
        if e is None:
            out.append(Check("wires", -10.0, f"{_mm(r.over_wires)} over {_mm(r.wire)} wires is "
                                             "too small a reading for this thread"))
            continue
        pds.append((r, e))
        z = _band_z(e, lo, hi, PD_WEAR_BASE + PD_WEAR_PER_P * p, PD_OVER)
        where = ("within its band" if z == 0 else
                 f"{_mm(abs(e - (lo if z < 0 else hi)))} {'under' if z < 0 else 'over'} its band")
        out.append(Check("wires", z, f"over {_mm(r.wire)} wires the pitch diameter is {_mm(e)}, "
                                     f"{where} {_mm(lo)}–{_mm(hi)}"))
    if len(pds) >= 2:
        (r1, e1), (r2, e2) = min(pds, key=lambda t: t[0].wire), max(pds, key=lambda t: t[0].wire)
        if r2.wire - r1.wire > 0.05 * p:
            z = (e2 - e1) / WIRE_AGREEMENT
            text = (f"the two wire sizes agree on the pitch diameter ({_mm(e1)}, {_mm(e2)}): "
                    f"the {spec.form.angle_deg:g}° form fits" if abs(z) < 1 else
                    f"the two wire sizes give pitch diameters {_mm(e1)} and {_mm(e2)}: "
                    f"not a {spec.form.angle_deg:g}° form")
            out.append(Check("form", z, text))
    return out


def _prefilter(m: Measured, spec: ThreadSpec) -> bool:
    """Return whether ``spec`` is worth scoring in full (cheap test on basic sizes)."""
    if m.pitch is not None and abs(m.pitch.pitch - spec.pitch) > 8 * m.pitch.sigma \
            + 0.02 * spec.pitch:
        return False
    if m.crest is not None:
        basic = spec.major if m.kind == "external" else spec.major - spec.form.minor_offset * \
            spec.pitch
        if abs(m.crest - basic) > 0.3 * basic + 1.0:
            return False
    return True


def _evaluate(m: Measured, spec: ThreadSpec, given: Limits | None = None) -> Candidate:
    lim = given if given is not None else _limits(spec, m.kind)
    span = _along_taper(lim)
    checks = [c for c in (_pitch_check(m, spec), _angle_check(m, spec),
                          _crest_flat_check(m, spec), _taper_check(m, lim),
                          _crest_check(m, spec, span), _root_check(m, spec, span))
              if c is not None]
    checks.extend(_wire_checks(m, spec, span))
    score = math.exp(-0.5 * math.fsum(c.z ** 2 for c in checks))
    why = "; ".join(c.text for c in checks)
    return Candidate(lim.spec, _plain(spec), score, why, tuple(checks), lim)


def identify(*, major: float | None = None, minor: float | None = None,
             pitch: float | None = None, tpi: float | None = None,
             count: int | None = None, length: float | None = None,
             counted: Counted = "crests", angle: float | None = None,
             wires: Iterable[tuple[float, float]] = (), kind: Kind | None = None,
             length_uncertainty: float = LENGTH_UNCERTAINTY, limit: int = 8,
             threads: Sequence[ThreadSpec | Limits] | None = None,
             crest_flat: float | None = None,
             taper: tuple[float, float, float] | None = None) -> Identification:
    """Return the catalogue threads ranked against the measurements, and how to tell them apart.

    Parameters as ``measured`` (major, minor, length, crest_flat [mm]; pitch [mm]; tpi [1/in];
    angle [deg]; wires: (wire [mm], reading [mm]) pairs; taper: (diameter, diameter, distance
    apart) [mm]); limit: most candidates listed; threads: the threads to rank (default: the
    whole catalogue), each a ThreadSpec or the Limits to judge it by.
    References: this module's docstring; limits from the family modules.
    """
    m = measured(major=major, minor=minor, pitch=pitch, tpi=tpi, count=count, length=length,
                 counted=counted, angle=angle, wires=wires, kind=kind,
                 length_uncertainty=length_uncertainty, crest_flat=crest_flat,
                 taper=taper)
    return identify_measured(m, limit=limit, threads=threads)


def identify_measured(m: Measured, *, limit: int = 8,
                      threads: Sequence[ThreadSpec | Limits] | None = None) -> Identification:
    """Return the ranked candidates for checked measurements ``m`` (see ``identify``).

    References: this module's docstring.
    """
    if isinstance(limit, bool) or not isinstance(limit, int) or limit < 1:
        raise InvalidEntry("Ask for at least one candidate.")
    if threads is None:
        from shopterm.standards import catalogue
        threads = catalogue()
    pairs_in = [(t.spec, t) if isinstance(t, Limits) else (t, None) for t in threads]
    ranked = sorted(((_evaluate(m, s, lim), i) for i, (s, lim) in enumerate(pairs_in)
                     if _prefilter(m, s)), key=lambda t: (-t[0].score, t[1]))
    scored = [c for c, _ in ranked]
    listed = [c for c in scored if c.score >= MIN_SCORE][:limit]
    note = ""
    if not listed:
        listed = scored[:3]
        note = ("Nothing in the catalogue fits these measurements well: check them (mm or "
                "inch?), or cut it as a special thread.")
    elif listed[0].score < 0.05:
        note = ("The best fit is poor: check the measurements, or the thread may be a special "
                "or worn beyond the usual.")
    worn = _worn_screw_note(listed[0], m) if listed else ""
    if worn:
        note = (note + " " + worn).strip()
    if not listed:
        return Identification(m, (), False, (), note)
    top = listed[0]
    rivals = [c for c in listed[1:] if c.score >= AMBIGUOUS_RATIO * top.score]
    # The top against each close rival, and the first three among themselves.
    pairs = [(top, r) for r in rivals[:MAX_RIVALS]]
    first = [top] + rivals[:2]
    pairs += [(a, b) for i, a in enumerate(first[1:], 1) for b in first[i + 1:]]
    tell: list[TellApart] = []
    for a, b in pairs:
        tell.extend(tell_apart(a, b, m))
    return Identification(m, tuple(listed), bool(rivals), tuple(tell), note)


# ---- telling two candidates apart -------------------------------------------------------------

def pitch_check_count(pitch_a: float, pitch_b: float) -> int:
    """Return how many pitches to measure over so two pitches [mm] differ readably.

    At least 10, rounded up to a multiple of 5, so the two lengths differ by at least
    READABLE_DIFFERENCE (common practice, no source).
    References: none (arithmetic).
    """
    d = abs(pitch_a - pitch_b)
    if d <= 0:
        raise InvalidEntry("The two pitches are the same: a pitch check cannot tell them apart.")
    n = max(10, math.ceil(READABLE_DIFFERENCE / d - 1e-9))
    return int(5 * math.ceil(n / 5))


def _pd_band(lim: Limits) -> tuple[float, float]:
    hi = lim.pd_max
    lo = lim.pd_min if lim.pd_max - lim.pd_min > 1e-9 else hi - ASSUMED_PD_BAND * lim.spec.pitch
    return lo, hi


def _two_wires(fa: ThreadForm, fb: ThreadForm, pitch: float) -> tuple[float, float]:
    """Return a small and a large wire [mm] that both forms' flanks take at ``pitch``."""
    ra, rb = wire_range(fa, pitch), wire_range(fb, pitch)
    small = max(ra.smallest, rb.smallest) * 1.1
    large = min(ra.largest, rb.largest) * 0.95
    return round(small, 2), math.floor(large * 100) / 100


def tell_apart(a: Candidate, b: Candidate, m: Measured) -> list[TellApart]:
    """Return the measurements that separate candidates ``a`` and ``b``, cheapest first.

    m: what was measured already (its wire size, if any, is used for the wire readings).
    References: pitch arithmetic; three-wire relation (NBS H28) through ``shopterm.cutting.wires``.
    """
    out: list[TellApart] = []
    sa, sb = a.spec, b.spec
    pair = (a.designation, b.designation)
    if abs(sa.pitch - sb.pitch) > 1e-9:
        n = pitch_check_count(sa.pitch, sb.pitch)
        la, lb = n * sa.pitch, n * sb.pitch
        out.append(TellApart(
            pair, "pitch",
            f"measure over {n} pitches ({n + 1} crests, first to last): {a.designation} "
            f"{la:.2f} mm, {b.designation} {lb:.2f} mm; or try a "
            f"{_pitch_name(sa)} and a {_pitch_name(sb)} gauge leaf",
            _exact(a, b, f"length of {n} pitches", la, lb)))
    if sa.form.angle_deg != sb.form.angle_deg:
        ga, gb = sa.form.angle_deg, sb.form.angle_deg
        out.append(TellApart(
            pair, "gauge",
            f"hold a {ga:g}° and a {gb:g}° gauge leaf (or centre gauge) in the thread against "
            f"the light: {a.designation} is {ga:g}°, {b.designation} {gb:g}°",
            _exact(a, b, "included angle [deg]", ga, gb)))
        fa, fb = crest_flat_of(sa.form, sa.pitch), crest_flat_of(sb.form, sb.pitch)
        if m.kind == "external" and abs(fa - fb) > 0.1 * max(sa.pitch, sb.pitch):
            out.append(TellApart(
                pair, "crest flat",
                f"look at a crest under a loupe and measure its flat: {a.designation} "
                f"{_mm(fa)} mm, {b.designation} {_mm(fb)} mm",
                _exact(a, b, "crest flat", fa, fb)))
        if m.kind == "external" and abs(sa.pitch - sb.pitch) < 0.02 * sa.pitch \
                and sa.form.angle_deg > 0 and sb.form.angle_deg > 0:
            out.extend(_wire_tell(a, b, m))
    same_shape = _same_proportions(sa.form, sb.form)
    la, lb = a.limits or _limits(sa, m.kind), b.limits or _limits(sb, m.kind)
    if sa.form.angle_deg == sb.form.angle_deg and not same_shape:
        # same angle, other proportions (Acme and stub Acme): the depth tells them apart
        q = "root (minor) diameter" if m.kind == "external" else "root (major) diameter"

        def root_band(lim: Limits) -> tuple[float, float]:
            if m.kind == "external":
                lo, hi = lim.minor_min, lim.minor_max
                basic = lim.basic_minor
            else:
                lo, hi = lim.major_min, lim.major_max
                basic = lim.basic_major
            return (lo if lo is not None else basic), (hi if hi is not None else basic)

        ra, rb = root_band(la), root_band(lb)
        out.append(TellApart(
            pair, "depth",
            f"measure the {q} with pointed anvils or a caliper's depth blade: "
            f"{a.designation} {_mm(ra[0])}–{_mm(ra[1])} mm, {b.designation} "
            f"{_mm(rb[0])}–{_mm(rb[1])} mm",
            (Expected(a.designation, q, *ra), Expected(b.designation, q, *rb))))
    if sa.starts != sb.starts:
        out.append(TellApart(
            pair, "starts",
            f"count the grooves that begin at the end of the thread (the starts), or mark the "
            f"work and measure how far one turn carries a nut: {a.designation} {sa.starts} "
            f"start{'s' if sa.starts > 1 else ''}, lead {_mm(sa.lead)} mm; {b.designation} "
            f"{sb.starts}, lead {_mm(sb.lead)} mm",
            _exact(a, b, "lead", sa.lead, sb.lead)))
    ka, kb = _taper_k(la), _taper_k(lb)
    if abs(ka - kb) > 1e-9:
        d = TAPER_CHECK_DISTANCE
        name = lambda k: f"tapered 1 in {1 / k:g}" if k else "parallel"   # noqa: E731
        out.append(TellApart(
            pair, "taper",
            f"measure the crest diameter with calipers at two places {_mm(d)} mm apart along "
            f"the thread: on {a.designation} ({name(ka)}) they differ by {_mm(ka * d)} mm, on "
            f"{b.designation} ({name(kb)}) by {_mm(kb * d)} mm",
            (Expected(a.designation, f"diameter change over {_mm(d)} mm", ka * d, ka * d),
             Expected(b.designation, f"diameter change over {_mm(d)} mm", kb * d, kb * d))))
    if abs(sa.pitch - sb.pitch) <= 1e-9 and same_shape and sa.starts == sb.starts \
            and abs(ka - kb) <= 1e-9:
        la, lb = _along_taper(la), _along_taper(lb)     # tapered: anywhere on the thread
        if m.kind == "external":
            ra, rb = (la.major_min, la.major_max), (lb.major_min, lb.major_max)
            q = "major diameter"
        else:
            ra, rb = (la.minor_min, la.minor_max), (lb.minor_min, lb.minor_max)
            q = "minor diameter"
        ra = tuple(v if v is not None else (la.basic_major if m.kind == "external"
                                            else la.basic_minor) for v in ra)
        rb = tuple(v if v is not None else (lb.basic_major if m.kind == "external"
                                            else lb.basic_minor) for v in rb)
        out.append(TellApart(
            pair, "diameter",
            f"measure the {q} with a micrometer where the thread is least worn (near the "
            f"shoulder or the nut face): {a.designation} {_mm(ra[0])}–{_mm(ra[1])} mm, "
            f"{b.designation} {_mm(rb[0])}–{_mm(rb[1])} mm",
            (Expected(a.designation, q, ra[0], ra[1]), Expected(b.designation, q, rb[0], rb[1]))))
    return out


def _exact(a: Candidate, b: Candidate, quantity: str, va: float,
           vb: float) -> tuple[Expected, Expected]:
    """Return what one exact measurement reads on each of two candidates."""
    return (Expected(a.designation, quantity, va, va), Expected(b.designation, quantity, vb, vb))


def _same_proportions(fa: ThreadForm, fb: ThreadForm) -> bool:
    """Return whether two forms have the same profile (ISO and Unified 60° do)."""
    pa = (fa.angle_deg, fa.height, fa.crest_trunc, fa.root_trunc, fa.crest_radius, fa.root_radius)
    pb = (fb.angle_deg, fb.height, fb.crest_trunc, fb.root_trunc, fb.crest_radius, fb.root_radius)
    return all(abs(x - y) < 1e-9 for x, y in zip(pa, pb))


def _pitch_name(spec: ThreadSpec) -> str:
    return f"{_tpi_text(spec.tpi)} tpi" if spec.tpi else f"{_mm(spec.pitch)} mm"


def _wire_tell(a: Candidate, b: Candidate, m: Measured) -> list[TellApart]:
    """Return the wire readings that separate two forms of (nearly) the same pitch."""
    sa, sb = a.spec, b.spec
    pair = (a.designation, b.designation)
    la, lb = a.limits or _limits(sa, "external"), b.limits or _limits(sb, "external")
    wire = m.wires[0].wire if m.wires else round(wire_range(sa.form, sa.pitch).best, 3)

    def reading(spec: ThreadSpec, lim: Limits, w: float) -> tuple[float, float]:
        lo, hi = _pd_band(lim)
        return (over_wires(lo, w, spec.form, spec.pitch, spec.lead, method="h28"),
                over_wires(hi, w, spec.form, spec.pitch, spec.lead, method="h28"))

    ma, mb = reading(sa, la, wire), reading(sb, lb, wire)
    overlap = ma[0] <= mb[1] and mb[0] <= ma[1]
    out = [TellApart(
        pair, "wires",
        f"over {_mm(wire)} mm wires: {a.designation} {ma[0]:.3f}–{ma[1]:.3f} mm, "
        f"{b.designation} {mb[0]:.3f}–{mb[1]:.3f} mm"
        + (" — these overlap, so one wire size cannot settle it" if overlap else ""),
        (Expected(a.designation, f"over {_mm(wire)} mm wires", *ma),
         Expected(b.designation, f"over {_mm(wire)} mm wires", *mb)))]
    w1, w2 = _two_wires(sa.form, sb.form, sa.pitch)
    if w2 > w1:
        def diff(spec: ThreadSpec, lim: Limits) -> float:
            e = sum(_pd_band(lim)) / 2
            return (over_wires(e, w2, spec.form, spec.pitch, spec.lead, method="h28")
                    - over_wires(e, w1, spec.form, spec.pitch, spec.lead, method="h28"))
        da, db = diff(sa, la), diff(sb, lb)
        out.append(TellApart(
            pair, "two wires",
            f"measure over {_mm(w1)} mm wires and over {_mm(w2)} mm wires at the same place: "
            f"the second reading is larger by {da:.3f} mm on {a.designation} "
            f"({sa.form.angle_deg:g}°), {db:.3f} mm on {b.designation} "
            f"({sb.form.angle_deg:g}°), whatever the wear",
            (Expected(a.designation, f"over {_mm(w2)} minus over {_mm(w1)} mm wires", da, da),
             Expected(b.designation, f"over {_mm(w2)} minus over {_mm(w1)} mm wires", db, db))))
    return out
