"""Measuring a thread over three wires: pitch diameter from the reading and back, wire sizes,
and what a set of readings says.

Three ways to relate the measurement over wires ``M`` to the pitch diameter ``E`` of a
symmetric thread of half-angle ``a``, pitch ``P``, wire diameter ``W``:

``simple``
    M = E + W(1 + cosec a) − (P/2)·cot a — the lead angle neglected (wire in an axial groove).
``h28``
    the lead-angle correction of NBS Handbook H28 / ASME B1.2:
    E = M + (P/2)·cot a − W·[1 + cosec a + ½·tan²λ·cos a·cot a], tan λ = L / (π E).
    Published as good for lead angles up to about 5°.
``exact``
    the wire is a straight cylinder of radius r = W/2 whose axis lies in a plane square to the
    micrometer's line (the anvil face), at distance X from the thread axis, tilted in that plane
    by an angle θ from square to the thread axis. It must not cut into either helicoidal flank
    ``z = Lφ/2π ± (P/4 + (ρ − E/2)·tan a)``. For a given θ the deepest X it can sink to is the
    largest, over the flank, of ``ρ cos φ + √(r² − v²)`` (v the distance of the flank point from
    the wire's axis measured in the anvil plane). The maximum over the flank's radius ρ has a
    closed form, leaving a one-dimensional maximum over the helix angle φ; the anvil pushes the
    wire until it settles at the tilt that lets it sink deepest, so X = min over θ of that
    maximum: a saddle point of the depth as a function of (φ, θ). It is found by Newton's
    method on the depth's gradient, with its first and second derivatives in closed form,
    started from the seat in the plain V (tilt = helix angle at the wire's axis): two to four
    steps, a few tens of µs in pure Python. Where Newton's method does not settle (lead
    angles of about 30° and more on very small diameters) nested golden-section searches do
    the same job slowly. Results are cached per (E, W, form, P, L). The groove is symmetric
    under a half turn about the micrometer's line, so the wire touches both flanks;
    M = 2X + W. The flank is taken only on its straight part (between the root and crest
    roundings or flats), so a far, imaginary extension of it never holds the wire up. With
    L = 0 this reduces to ``simple`` exactly, and for small lead
    angles it agrees with ``h28`` (tests check both).

All lengths in mm. Wire sizes: best W = P / (2 cos a) touches the flanks at the pitch line;
the smallest usable wire must stand proud of the crest, the largest must still touch the flank
on its straight part, below where the crest flat or the crest rounding begins (basic profile,
axial section, lead angle neglected — as the published ranges are worked out).

References: NBS Handbook H28 (1957) Part I, Section IX, "Measurement of pitch diameter by the
three-wire method"; ASME B1.2 (gages and gaging for Unified threads), three-wire appendix;
Newton's method for a stationary point and golden-section search (Kiefer 1953), as in any
numerical analysis text (e.g. Press et al., *Numerical Recipes*, ch. 9–10);
Jones, *Turning and Boring* (1914), m = d − 1.5155p + 3w; BS 84 / BS 93 basic forms for the
rounded crests. Constants as collected in NBS Handbook H28, three-wire method.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from functools import lru_cache
from typing import Iterable, Literal, Sequence

from shopterm.errors import InvalidEntry
from shopterm.lathe.machine import WireSize
from shopterm.standards.forms import ThreadForm
from shopterm.units import MM_PER_INCH, Unit, format_length

Method = Literal["exact", "h28", "simple"]
METHODS: tuple[Method, ...] = ("exact", "h28", "simple")

#: Shown wherever readings are taken.
MEASURE_CAUTION = ("Stop the spindle and put the half nut out before placing wires; keep the "
                   "chuck key out and hands clear of the chuck. Follow your shop's rules and "
                   "the lathe maker's instructions.")

#: Readings of one place may differ by this many micrometer steps before it means something
#: (a wire out of place, a burr, taper). Common practice, no source.
SPREAD_STEPS = 2

_GOLDEN = (math.sqrt(5) - 1) / 2


def _positive(value: float, what: str) -> float:
    if not isinstance(value, (int, float)) or isinstance(value, bool) or not math.isfinite(value):
        raise InvalidEntry(f"The {what} must be a number.")
    if value <= 0:
        raise InvalidEntry(f"The {what} must be greater than zero.")
    return float(value)


# ---- constants and wire sizes ----------------------------------------------------------------

@dataclass(frozen=True)
class WireConstants:
    """Three-wire constants of a form, all as multiples of the pitch or of the wire.

    M = E + c_w·W − c_p·P (lead angle neglected); ``best``/``smallest``/``largest`` are wire
    diameters over P.
    """

    form_key: str
    angle_deg: float
    c_w: float
    c_p: float
    best: float
    smallest: float
    largest: float


def _flank_limits(form: ThreadForm) -> tuple[float, float, float]:
    """Return (crest height, straight flank top, straight flank bottom) over P, from the root apex."""
    a = form.half_angle_rad
    H = form.height
    tangent = math.cos(a) ** 2 / math.sin(a)   # radial depth of an arc's tangent point per radius
    crest_top = H - form.crest_trunc
    top = H - (form.crest_radius * tangent if form.crest_radius > 0 else form.crest_trunc)
    bottom = form.root_radius * tangent if form.root_radius > 0 else form.root_trunc
    return crest_top, top, bottom


#: How a square thread is measured instead of over wires (common practice, no source).
SQUARE_MEASURE = ("Wires cannot measure a square thread (its flanks are parallel): measure the "
                  "thread's width over its flats with calipers and the minor diameter, or fit "
                  "it to a gauge or its nut.")


def wire_constants(form: ThreadForm) -> WireConstants:
    """Return the three-wire constants and the usable wire range of ``form`` (over P).

    form: a symmetric basic form. The wire's top stands (W/2)(1 + cosec a) above the sharp root
    and touches the flank (W/2)·cos²a / sin a above it; a crest rounding of radius R ends its
    straight flank R·cos²a / sin a below the sharp crest.
    References: NBS H28 three-wire method (60° range 0.505182P–1.010363P);
    BS 84, BS 93 crest radii.
    """
    if form.angle_deg <= 0:
        raise InvalidEntry(SQUARE_MEASURE)
    a = form.half_angle_rad
    c_w = 1 + 1 / math.sin(a)
    c_p = 0.5 / math.tan(a)
    contact = math.cos(a) ** 2 / (2 * math.sin(a))   # contact height per unit wire diameter
    crest_top, top, bottom = _flank_limits(form)
    smallest = max(crest_top / (c_w / 2), bottom / contact)
    largest = top / contact
    return WireConstants(form.key, form.angle_deg, c_w, c_p, 1 / (2 * math.cos(a)),
                         smallest, largest)


@dataclass(frozen=True)
class WireRange:
    """Wire diameters [mm] for one thread: the best, the smallest and largest that work."""

    pitch: float
    best: float
    smallest: float
    largest: float

    def fits(self, wire: float) -> bool:
        """Return whether a wire of diameter ``wire`` [mm] works on this thread."""
        return self.smallest * (1 + 1e-9) < wire <= self.largest * (1 + 1e-9)


def wire_range(form: ThreadForm, pitch: float) -> WireRange:
    """Return the best, smallest and largest wire [mm] for ``pitch`` [mm] of ``form``.

    References: NBS H28 (best wire P / (2 cos a)).
    """
    p = _positive(pitch, "pitch")
    k = wire_constants(form)
    return WireRange(p, k.best * p, k.smallest * p, k.largest * p)


def _wire_label(w: WireSize, unit: Unit) -> str:
    size = format_length(w.size, unit, 0.0001 if unit == "in" else 0.001)
    return f"{size} ({w.label})" if w.label else size


def _one_of(names: Sequence[str]) -> str:
    return names[0] if len(names) == 1 else ", ".join(names[:-1]) + " or " + names[-1]


@dataclass(frozen=True)
class WireCheck:
    """Whether one wire can measure this thread, and which owned wires could."""

    wire: float                       # [mm], the diameter checked
    ok: bool
    range: WireRange
    message: str                      # what to tell the user ('' when ok)
    would_work: tuple[WireSize, ...]  # owned wires that fit, best first


def check_wire(form: ThreadForm, pitch: float, wire: float, owned: Iterable[WireSize] = (),
               unit: Unit = "mm") -> WireCheck:
    """Return whether a wire of diameter ``wire`` [mm] works on ``pitch`` [mm] of ``form``.

    owned: the wire sets the user has (their ``size`` is used: measured when known);
    unit: unit for the message.
    References: wire range as in ``wire_constants``.
    """
    w = _positive(wire, "wire diameter")
    rng = wire_range(form, pitch)
    fitting = tuple(sorted((o for o in owned if rng.fits(o.size)),
                           key=lambda o: abs(o.size - rng.best)))
    if rng.fits(w):
        return WireCheck(w, True, rng, "", fitting)
    res = 0.0001 if unit == "in" else 0.001
    f = lambda v: format_length(v, unit, res)   # noqa: E731
    why = ("too small: it would sink below the crest" if w <= rng.smallest
           else "too large: it would ride on the crest, not the flanks")
    if fitting:
        use = "Use " + _one_of([_wire_label(o, unit) for o in fitting]) + " from your sets."
    else:
        use = "None of your sets fits: use a wire close to " + f(rng.best) + "."
        if is_power_form(form):
            use += " " + NO_WIRE_OFFER
    msg = (f"A {f(w)} wire is {why} of this thread (it needs {f(rng.smallest)} to "
           f"{f(rng.largest)}, best {f(rng.best)}). {use}")
    return WireCheck(w, False, rng, msg, fitting)


def require_wire(form: ThreadForm, pitch: float, wire: float, owned: Iterable[WireSize] = (),
                 unit: Unit = "mm") -> WireCheck:
    """Return the check of a wire that works; raise ``InvalidEntry`` naming the owned wires that would.

    References: as ``check_wire``.
    """
    chk = check_wire(form, pitch, wire, owned, unit)
    if not chk.ok:
        raise InvalidEntry(chk.message)
    return chk


@dataclass(frozen=True)
class WireChoice:
    """The wire to measure with: an owned set when one fits, else the best size to get."""

    size: float                # [mm] diameter to compute with
    owned: WireSize | None     # the owned set chosen, or None
    range: WireRange
    note: str


def choose_wire(form: ThreadForm, pitch: float, owned: Iterable[WireSize] = (),
                unit: Unit = "mm") -> WireChoice:
    """Return the owned wire closest to the best size that works, else the best size itself.

    References: as ``check_wire``.
    """
    owned = tuple(owned)
    rng = wire_range(form, pitch)
    fitting = sorted((o for o in owned if rng.fits(o.size)), key=lambda o: abs(o.size - rng.best))
    res = 0.0001 if unit == "in" else 0.001
    if fitting:
        o = fitting[0]
        return WireChoice(o.size, o, rng, f"Using your {_wire_label(o, unit)} wires.")
    what = "None of your wire sets fits this thread" if owned else "No wire sets are configured"
    offer = " " + NO_WIRE_OFFER if is_power_form(form) else ""
    return WireChoice(rng.best, None, rng,
                      f"{what}: figures are for the best size, {format_length(rng.best, unit, res)} "
                      f"(anything from {format_length(rng.smallest, unit, res)} to "
                      f"{format_length(rng.largest, unit, res)} works).{offer}")


# ---- power threads without a fitting wire -----------------------------------------------------

#: The included angles of the power-transmission forms (trapezoidal 30°, Acme and stub Acme 29°,
#: square 0°), measured where no wire set fits with one wire or on the thread's thickness.
POWER_ANGLES: tuple[float, ...] = (30.0, 29.0, 0.0)

#: Offered when no owned wire fits a power thread. Published practice for Acme and trapezoidal
#: threads: measure over one wire and the opposite crest, or the thread thickness at the pitch
#: line with a gear-tooth vernier caliper (ASME B1.5 and Machinery's Handbook, from memory).
NO_WIRE_OFFER = ("Without a fitting wire, measure over one wire and the opposite crest, or "
                 "the thread thickness at the pitch line with a gear-tooth vernier caliper "
                 "(half the pitch at basic size).")


def is_power_form(form: ThreadForm) -> bool:
    """Return whether ``form`` is a power-transmission form (30°, 29° or square)."""
    return any(abs(form.angle_deg - a) < 1e-9 for a in POWER_ANGLES)


def pd_single_wire(m: float, wire: float, form: ThreadForm, pitch: float, major: float,
                   lead: float | None = None, method: Method = "exact") -> float:
    """Return the pitch diameter [mm] from a reading over one wire and the opposite crest.

    m [mm]: micrometer over the wire and the crest across the axis; major [mm]: that crest's
    diameter, measured; wire, pitch, lead [mm]. The reading spans the crest radius and the
    wire's top, major/2 + X + W/2, where three wires read 2X + W: M = 2m − major.
    References: ASME B1.5 one-wire method (from memory); geometry as ``wire_contact``.
    """
    _positive(m, "reading over the wire")
    d = _positive(major, "measured major diameter")
    if m <= d / 2:
        raise InvalidEntry("A reading over one wire and the opposite crest must be more than "
                           "half the major diameter: check the reading and the major.")
    return pitch_diameter(2 * m - d, wire, form, pitch, lead, method)


def _thickness_parts(form: ThreadForm, pitch: float) -> tuple[float, float]:
    p = _positive(pitch, "pitch")
    if form.angle_deg <= 0:
        raise InvalidEntry("A square thread is as thick at every depth, so its thickness does "
                           "not give the pitch diameter: measure the thickness itself (half the "
                           "pitch) and the minor diameter.")
    return p, math.tan(form.half_angle_rad)


def _lead_angle(lead: float, pd: float) -> float:
    return math.atan(lead / (math.pi * pd))


def thread_thickness(pd: float, form: ThreadForm, pitch: float, level_diameter: float,
                     lead: float | None = None, normal: bool = False) -> float:
    """Return the thread's thickness [mm] at ``level_diameter`` for pitch diameter ``pd``.

    pd, pitch, level_diameter [mm]; lead [mm] (default the pitch); normal: thickness square to
    the thread (the caliper laid over at the lead angle), else along the axis. Axial thickness
    t = P/2 − (D − E)·tan a (P/2 at the pitch line, thinner toward the crest); normal thickness
    t·cos λ, tan λ = L/(π E).
    References: gear-tooth vernier caliper on a thread, Machinery's Handbook (Acme thread
    thickness P/2 at the pitch line; normal thickness = axial × cos of the lead angle), from
    memory; ISO 2904 / ASME B1.5 basic profiles.
    """
    p, tan_a = _thickness_parts(form, pitch)
    e = _positive(pd, "pitch diameter")
    l = p if lead is None else _positive(lead, "lead")
    t = p / 2 - (level_diameter - e) * tan_a
    if t <= 0:
        raise InvalidEntry("At that depth the thread has no thickness left: set the caliper's "
                           "depth slide to reach the pitch line, not the crest.")
    return t * math.cos(_lead_angle(l, e)) if normal else t


def pd_from_thickness(thickness: float, form: ThreadForm, pitch: float, level_diameter: float,
                      lead: float | None = None, normal: bool = False) -> float:
    """Return the pitch diameter [mm] from a thread thickness read at ``level_diameter`` [mm].

    thickness [mm]; pitch, lead [mm]; level_diameter [mm]: the measured crest diameter less
    twice the caliper's depth setting; normal: the thickness was read square to the thread.
    Inverse of ``thread_thickness``: E = D − (P/2 − t)/tan a, t axial (iterated on λ for a
    normal reading).
    References: as ``thread_thickness``.
    """
    p, tan_a = _thickness_parts(form, pitch)
    t = _positive(thickness, "thread thickness")
    l = p if lead is None else _positive(lead, "lead")
    if t >= p:
        raise InvalidEntry(f"A thread thickness of {t:.3f} mm is a whole pitch or more: check "
                           "the reading and its unit.")
    e = level_diameter - (p / 2 - t) / tan_a
    for _ in range(50 if normal else 0):
        if e <= 0:
            break
        nxt = level_diameter - (p / 2 - t / math.cos(_lead_angle(l, e))) / tan_a
        if abs(nxt - e) < 1e-12:
            e = nxt
            break
        e = nxt
    if e <= 0:
        raise InvalidEntry("That thickness cannot be right at this depth setting: check the "
                           "reading, the depth slide and the crest diameter.")
    return e


@dataclass(frozen=True)
class CaliperBand:
    """A gear-tooth caliper's settings for a pitch-diameter band [mm]."""

    depth_setting: float        # the depth slide, from the crest down to the basic pitch line
    level_diameter: float       # where the jaws read: crest − 2 × depth_setting
    at_pd_max: float            # thickness to read at the top of the band
    at_pd_min: float            # … at the bottom
    normal: bool                # thickness square to the thread (else along the axis)
    lead_angle_deg: float       # at the middle of the band


def caliper_band(form: ThreadForm, pitch: float, lead: float, pd_max: float, pd_min: float,
                 crest_diameter: float, basic_pd: float, normal: bool = True) -> CaliperBand:
    """Return the depth setting and the thicknesses that bound the band.

    form; pitch, lead [mm]; pd_max, pd_min [mm]; crest_diameter [mm]: the turned major,
    measured; basic_pd [mm]: the depth slide is set to reach the basic pitch line,
    (crest − basic PD)/2; normal: read square to the thread (default, as the jaws sit).
    References: as ``thread_thickness``.
    """
    depth = (crest_diameter - basic_pd) / 2
    if depth <= 0:
        raise InvalidEntry("The crest diameter must be larger than the pitch diameter: check "
                           "the measured major.")
    level = crest_diameter - 2 * depth
    mid = (pd_max + pd_min) / 2
    return CaliperBand(depth, level,
                       thread_thickness(pd_max, form, pitch, level, lead, normal),
                       thread_thickness(pd_min, form, pitch, level, lead, normal), normal,
                       math.degrees(_lead_angle(lead, mid)))


# ---- the three-wire relation ----------------------------------------------------------------

def _check_common(wire: float, pitch: float, lead: float | None) -> tuple[float, float, float]:
    w = _positive(wire, "wire diameter")
    p = _positive(pitch, "pitch")
    l = p if lead is None else _positive(lead, "lead")
    return w, p, l


def over_wires_simple(pd: float, wire: float, form: ThreadForm, pitch: float) -> float:
    """Return the measurement over wires [mm], lead angle neglected.

    pd: pitch diameter [mm]; wire: diameter [mm]; pitch [mm].
    References: NBS H28, M = E + W(1 + cosec a) − (P/2)·cot a.
    """
    w, p, _ = _check_common(wire, pitch, None)
    k = wire_constants(form)
    return pd + k.c_w * w - k.c_p * p


def pd_simple(m: float, wire: float, form: ThreadForm, pitch: float) -> float:
    """Return the pitch diameter [mm] from a measurement over wires, lead angle neglected.

    m: over wires [mm]; wire [mm]; pitch [mm].
    References: NBS H28, E = M − W(1 + cosec a) + (P/2)·cot a.
    """
    w, p, _ = _check_common(wire, pitch, None)
    k = wire_constants(form)
    return m - k.c_w * w + k.c_p * p


def h28_correction(pd: float, wire: float, form: ThreadForm, lead: float) -> float:
    """Return the NBS H28 lead-angle correction [mm]: ½·W·tan²λ·cos a·cot a.

    pd [mm] (for tan λ = L / (π E)); wire [mm]; lead [mm].
    References: NBS Handbook H28 / ASME B1.2 three-wire formula with lead-angle term.
    """
    a = form.half_angle_rad
    tan_l = lead / (math.pi * pd)
    return 0.5 * wire * tan_l ** 2 * math.cos(a) / math.tan(a)


def over_wires_h28(pd: float, wire: float, form: ThreadForm, pitch: float,
                   lead: float | None = None) -> float:
    """Return the measurement over wires [mm] with the H28 lead-angle correction.

    pd [mm]; wire [mm]; pitch [mm]; lead [mm] (default: the pitch, one start).
    References: NBS Handbook H28 / ASME B1.2.
    """
    w, p, l = _check_common(wire, pitch, lead)
    return over_wires_simple(pd, w, form, p) + h28_correction(pd, w, form, l)


def pd_h28(m: float, wire: float, form: ThreadForm, pitch: float,
           lead: float | None = None) -> float:
    """Return the pitch diameter [mm] from M with the H28 lead-angle correction (iterated on λ).

    m [mm]; wire [mm]; pitch [mm]; lead [mm] (default: the pitch).
    References: NBS Handbook H28 / ASME B1.2, tan λ = L / (π E).
    """
    w, p, l = _check_common(wire, pitch, lead)
    e0 = pd_simple(m, w, form, p)
    if e0 <= 0:
        raise InvalidEntry("That reading is too small for this wire and pitch: check it.")
    e = e0
    for _ in range(30):
        nxt = e0 - h28_correction(e, w, form, l)
        if nxt <= 0:
            raise InvalidEntry("That reading is too small for this wire and pitch: check it.")
        if abs(nxt - e) < 1e-13:
            return nxt
        e = nxt
    return e


@dataclass(frozen=True)
class WireContact:
    """Where a wire settles in a helical groove (the exact model)."""

    over_wires: float       # M [mm]
    axis_distance: float    # X: thread axis to the wire's axis [mm]
    tilt_deg: float         # θ: the wire's tilt from square to the thread axis [deg]
    contact_diameter: float  # 2ρ at the contact point [mm]
    contact_angle_deg: float  # φ of the contact point around the axis [deg]


# The exact model, worked in the wire's frame: the wire's axis passes through (X, 0, 0) along
# (0, cos θ, sin θ); a point of the + flank at helix angle φ and radius ρ lies at distance v =
# ρ·b − e_z from it in the anvil plane, b = sin φ·sin θ − tan a·cos θ, e_z = cos θ·(kφ + c0),
# k = L/2π, c0 = P/4 − (E/2)·tan a. The depth the flank allows there is ρ cos φ + √(r² − v²);
# its largest value over ρ is g(φ, θ) = (cos φ·e_z − r·q)/b, q = √(b² + cos²φ), at ρ = (e_z −
# r cos φ/q)/b, or the value at the nearer end of the straight flank when that ρ is off it.
# X = min over θ of max over φ of g: a saddle point of g, found by Newton's method on its
# gradient with the derivatives below worked out by hand (two or three steps from the plain-V
# start); see ``wire_contact``.

_Groove = tuple  # (r, tan a, k, c0, rho_lo, rho_hi, reach, theta_lo, theta_hi)


@lru_cache(maxsize=32)
def _form_groove(form: ThreadForm) -> tuple[float, float, float, float]:
    """Return (tan a, H/P, straight flank top/P, bottom/P) of ``form``, the last two from the root apex.

    References: ``_flank_limits``.
    """
    _crest, top, bottom = _flank_limits(form)
    return math.tan(form.half_angle_rad), form.height, top, bottom


def _groove(e: float, w: float, form: ThreadForm, p: float, l: float) -> _Groove:
    """Return the constants of the groove a wire of diameter ``w`` [mm] lies in.

    e: pitch diameter [mm]; p: pitch [mm]; l: lead [mm]. ``reach`` bounds the helix angle of
    the contact [rad] (it lies within a wire's reach of the wire's plane); ``theta_lo`` and
    ``theta_hi`` bound the tilt [rad] (``theta_hi`` above the helix angle near the root).
    References: module docstring (NBS H28 three-wire geometry).
    """
    r = w / 2
    tan_a, height, top, bottom = _form_groove(form)
    k = l / (2 * math.pi)
    root_apex = e / 2 - height * p / 2      # radius of the sharp root
    reach = min(1.2, 3 * (r + p) / max(e, 1e-9))
    lam = math.atan(k / max(e / 2 - p / 2, e / 4))   # helix angle near the root
    return (r, tan_a, k, p / 4 - e / 2 * tan_a, root_apex + bottom * p, root_apex + top * p,
            reach, -1e-3 if k == 0 else 0.0, min(1.3, 1.6 * lam + 1e-3))


def _depth(phi: float, theta: float, gr: _Groove, order: int):
    """Return the deepest the flank lets the wire's axis come at (φ, θ), or None where it cannot
    hold the wire; with its derivatives up to ``order``.

    phi, theta [rad]. Returns (g [mm], ρ [mm]) for order 0, then g_φ, g_θ for order 1, then
    g_φφ, g_φθ, g_θθ for order 2 (derivatives of g = N/b and of the end-of-flank depth
    R cos φ + √(r² − u²), u = R·b − e_z, by the quotient and chain rules).
    References: module docstring.
    """
    r, tan_a, k, c0, rho_lo, rho_hi = gr[:6]
    c, s = math.cos(phi), math.sin(phi)
    ct, st = math.cos(theta), math.sin(theta)
    b = s * st - tan_a * ct
    if b > -1e-12:
        return None
    m = k * phi + c0
    ez = ct * m
    q = math.sqrt(b * b + c * c)
    rho = (ez - r * c / q) / b
    if rho_lo <= rho <= rho_hi:
        g = (c * ez - r * q) / b
        if order == 0:
            return g, rho
        bp, bt = c * st, s * ct + tan_a * st
        ezp, ezt = ct * k, -st * m
        qp = (b * bp - c * s) / q
        qt = b * bt / q
        gp = (-s * ez + c * ezp - r * qp - g * bp) / b
        gt = (c * ezt - r * qt - g * bt) / b
        if order == 1:
            return g, rho, gp, gt
        bpp, bpt = -s * st, c * ct                 # b_θθ = −b, e_z,θθ = −e_z, e_z,φφ = 0
        qpp = (bp * bp + b * bpp + s * s - c * c - qp * qp) / q
        qpt = (bp * bt + b * bpt - qp * qt) / q
        qtt = (bt * bt - b * b - qt * qt) / q
        gpp = (-c * ez - 2 * s * ezp - r * qpp - 2 * gp * bp - g * bpp) / b
        gpt = (-s * ezt - c * st * k - r * qpt - gp * bt - gt * bp - g * bpt) / b
        gtt = (-c * ez - r * qtt - 2 * gt * bt + g * b) / b
        return g, rho, gp, gt, gpp, gpt, gtt
    # the flank exists only on its straight part: the depth is concave in ρ, so the largest
    # depth there is at the nearer end
    R = rho_lo if rho < rho_lo else rho_hi
    u = R * b - ez
    if abs(u) >= r:
        return None
    S = math.sqrt(r * r - u * u)
    g = R * c + S
    if order == 0:
        return g, R
    bp, bt = c * st, s * ct + tan_a * st
    up, ut = R * bp - ct * k, R * bt + st * m
    gp = -R * s - u * up / S
    gt = -u * ut / S
    if order == 1:
        return g, R, gp, gt
    upp, upt, utt = -R * s * st, R * c * ct + st * k, -R * b + ez
    w3 = u * u / (S * S * S)
    gpp = -R * c - (up * up + u * upp) / S - w3 * up * up
    gpt = -(up * ut + u * upt) / S - w3 * up * ut
    gtt = -(ut * ut + u * utt) / S - w3 * ut * ut
    return g, R, gp, gt, gpp, gpt, gtt


def _depth_per_pd(phi: float, theta: float, gr: _Groove) -> float:
    """Return ∂g/∂E at (φ, θ): how fast the wire's seat rises with the pitch diameter (½ at no lead).

    phi, theta [rad]. E moves c0 by −(tan a)/2 and the ends of the straight flank by ½.
    References: module docstring.
    """
    r, tan_a, k, c0, rho_lo, rho_hi = gr[:6]
    c, s = math.cos(phi), math.sin(phi)
    ct, st = math.cos(theta), math.sin(theta)
    b = s * st - tan_a * ct
    ez = ct * (k * phi + c0)
    q = math.sqrt(b * b + c * c)
    rho = (ez - r * c / q) / b
    if rho_lo <= rho <= rho_hi:
        return -c * ct * tan_a / (2 * b)
    R = rho_lo if rho < rho_lo else rho_hi
    u = R * b - ez
    return c / 2 - u * (b + ct * tan_a) / (2 * math.sqrt(r * r - u * u))


def _settle_newton(gr: _Groove, phi: float, theta: float):
    """Return (X [mm], θ, φ, ρ [mm]) at the saddle of g by Newton's method from (φ, θ), or None.

    None when a step leaves the groove, the curvature is not that of a saddle (max in φ, min
    in θ), the steps do not settle, or the result lies outside the bounds of ``_groove``.
    References: Newton's method for a stationary point (any numerical analysis text).
    """
    reach, theta_lo, theta_hi = gr[6:]
    for _ in range(30):
        d = _depth(phi, theta, gr, 2)
        if d is None:
            return None
        _g, _rho, gp, gt, gpp, gpt, gtt = d
        det = gpp * gtt - gpt * gpt
        if gpp >= 0 or det >= 0:
            return None
        dphi = (gpt * gt - gtt * gp) / det
        dtheta = (gpt * gp - gpp * gt) / det
        if abs(dphi) > reach or abs(dtheta) > 0.25:
            return None
        phi += dphi
        theta += dtheta
        if abs(dphi) < 1e-12 and abs(dtheta) < 1e-12:
            break
    else:
        if abs(dphi) > 1e-9 or abs(dtheta) > 1e-9:
            return None
    if not (-reach <= phi <= reach and theta_lo <= theta <= theta_hi):
        return None
    d = _depth(phi, theta, gr, 0)
    return None if d is None else (d[0], theta, phi, d[1])


def _golden_max(f, lo: float, hi: float, tol: float):
    """Return (x, f(x)) maximising a unimodal ``f`` on [lo, hi]."""
    c = hi - _GOLDEN * (hi - lo)
    d = lo + _GOLDEN * (hi - lo)
    fc, fd = f(c), f(d)
    while hi - lo > tol:
        if fc > fd:
            hi, d, fd = d, c, fc
            c = hi - _GOLDEN * (hi - lo)
            fc = f(c)
        else:
            lo, c, fc = c, d, fd
            d = lo + _GOLDEN * (hi - lo)
            fd = f(d)
    return (c, fc) if fc > fd else (d, fd)


def _settle_search(gr: _Groove):
    """Return (X [mm], θ, φ, ρ [mm]) by nested golden-section searches (slow, sure).

    For each tilt θ the largest g over φ: a 17-point scan over the reach, refined by a golden
    search; then the smallest of those over θ by a golden search. Used when Newton's method
    does not settle (lead angles of about 30° and more on a very small diameter).
    References: golden-section search (Kiefer 1953).
    """
    reach, theta_lo, theta_hi = gr[6:]

    def g(phi: float, theta: float) -> float:
        d = _depth(phi, theta, gr, 0)
        return -math.inf if d is None else d[0]

    def sink_limit(theta: float):
        n = 16
        step = 2 * reach / n
        best_i, best_v = 0, -math.inf
        for i in range(n + 1):
            v = g(-reach + i * step, theta)
            if v > best_v:
                best_i, best_v = i, v
        lo = -reach + max(best_i - 1, 0) * step
        hi = -reach + min(best_i + 1, n) * step
        phi, x = _golden_max(lambda f: g(f, theta), lo, hi, 1e-7)
        return x, phi

    theta, _ = _golden_max(lambda t: -sink_limit(t)[0], theta_lo, theta_hi, 1e-6)
    x, phi = sink_limit(theta)
    d = _depth(phi, theta, gr, 0)
    rho = d[1] if d is not None else math.nan
    return x, theta, phi, rho


def _plain_v_start(e: float, w: float, form: ThreadForm, p: float, k: float) -> tuple[float, float]:
    """Return (φ, θ) to start Newton from: the contact in the wire's plane, the wire tilted to
    the helix angle at its axis as it sits in the plain V (lead neglected).

    e, w, p [mm]; k = L/2π [mm].
    References: NBS H28 simple formula for the wire's seat.
    """
    a = form.half_angle_rad
    x_plain = (e + w / math.sin(a) - p / (2 * math.tan(a))) / 2
    return 0.0, math.atan2(k, x_plain)


def _settle(e: float, w: float, form: ThreadForm, p: float, l: float,
            start: tuple[float, float] | None = None):
    """Return (X [mm], θ, φ, ρ [mm], groove) where the wire settles; ``start`` is (φ, θ) or None.

    e, w, p, l [mm], already checked.
    References: module docstring.
    """
    gr = _groove(e, w, form, p, l)
    found = None
    if start is not None:
        found = _settle_newton(gr, *start)
    if found is None:
        found = _settle_newton(gr, *_plain_v_start(e, w, form, p, gr[2]))
    if found is None:
        found = _settle_search(gr)
    return found + (gr,)


@lru_cache(maxsize=512)
def _settle_cached(e: float, w: float, form: ThreadForm, p: float, l: float):
    """Return ``_settle`` from the plain-V start, remembered (the wire screen asks again and again).

    e, w, p, l [mm], already checked.
    References: module docstring.
    """
    return _settle(e, w, form, p, l)


def wire_contact(pd: float, wire: float, form: ThreadForm, pitch: float,
                 lead: float | None = None) -> WireContact:
    """Return where a wire settles in the helical groove and the exact measurement over wires.

    pd: pitch diameter [mm]; wire [mm]; pitch [mm]; lead [mm] (default: the pitch).
    Method in the module docstring: X = min over the wire's tilt θ of the max over the helix
    angle φ of the closed-form depth g(φ, θ) the flank allows, i.e. the saddle point of g,
    found by Newton's method on ∇g = 0 with g's first and second derivatives in closed form,
    started from the plain-V seat (tilt = helix angle at the wire's axis); nested golden-section
    searches when Newton's method does not settle. Results are cached per (pd, wire, form,
    pitch, lead).
    References: geometry of NBS H28 three-wire method (wire square to the micrometer's line,
    lying in the helical groove); the lead-angle correction of H28 is its small-angle form;
    Newton's method for a saddle point, golden-section search (Kiefer 1953) as the fallback.
    """
    w, p, l = _check_common(wire, pitch, lead)
    e = _positive(pd, "pitch diameter")
    x, theta, phi, rho, _gr = _settle_cached(e, w, form, p, l)
    return WireContact(2 * x + w, x, math.degrees(theta), 2 * rho, math.degrees(phi))


def over_wires_exact(pd: float, wire: float, form: ThreadForm, pitch: float,
                     lead: float | None = None) -> float:
    """Return the measurement over wires [mm] from the exact helical-groove model.

    pd [mm]; wire [mm]; pitch [mm]; lead [mm] (default: the pitch).
    References: see ``wire_contact``.
    """
    w, p, l = _check_common(wire, pitch, lead)
    e = _positive(pd, "pitch diameter")
    return 2 * _settle_cached(e, w, form, p, l)[0] + w


def pd_exact(m: float, wire: float, form: ThreadForm, pitch: float,
             lead: float | None = None) -> float:
    """Return the pitch diameter [mm] for a measurement over wires, exact helical-groove model.

    m: over wires [mm]; wire [mm]; pitch [mm]; lead [mm] (default: the pitch).
    Solved by Newton steps E ← E + (m − M(E)) / M'(E) from the H28 value, M'(E) = 2·∂g/∂E at
    the wire's seat (the seat's own shift does not change X to first order), each seat found
    from the last one.
    References: see ``wire_contact``; Newton's method, envelope theorem for M'(E).
    """
    w, p, l = _check_common(wire, pitch, lead)
    e = pd_h28(m, w, form, p, l)
    start = None
    for _ in range(25):
        x, theta, phi, _rho, gr = _settle(e, w, form, p, l, start)
        slope = 2 * _depth_per_pd(phi, theta, gr)
        if not 0.5 < slope < 2.0:       # never seen; a plain step still converges
            slope = 1.0
        step = (m - (2 * x + w)) / slope
        e += step
        if e <= 0:
            raise InvalidEntry("That reading is too small for this wire and pitch: check it.")
        if abs(step) < 1e-11:
            break
        start = (phi, theta)
    return e


def over_wires(pd: float, wire: float, form: ThreadForm, pitch: float,
               lead: float | None = None, method: Method = "exact") -> float:
    """Return the measurement over wires [mm] by ``method`` ('exact', 'h28' or 'simple').

    pd [mm]; wire [mm]; pitch [mm]; lead [mm].
    References: see the module docstring.
    """
    if method == "exact":
        return over_wires_exact(pd, wire, form, pitch, lead)
    if method == "h28":
        return over_wires_h28(pd, wire, form, pitch, lead)
    if method == "simple":
        return over_wires_simple(pd, wire, form, pitch)
    raise InvalidEntry(f"No method {method!r}: use exact, h28 or simple.")


def pitch_diameter(m: float, wire: float, form: ThreadForm, pitch: float,
                   lead: float | None = None, method: Method = "exact") -> float:
    """Return the pitch diameter [mm] from a measurement over wires by ``method``.

    m [mm]; wire [mm]; pitch [mm]; lead [mm].
    References: see the module docstring.
    """
    if method == "exact":
        return pd_exact(m, wire, form, pitch, lead)
    if method == "h28":
        return pd_h28(m, wire, form, pitch, lead)
    if method == "simple":
        return pd_simple(m, wire, form, pitch)
    raise InvalidEntry(f"No method {method!r}: use exact, h28 or simple.")


@dataclass(frozen=True)
class PitchFromWires:
    """The pitch diameter a measurement over wires gives, by each method [mm]."""

    over_wires: float
    wire: float
    pd: float            # exact model: the one to act on
    pd_h28: float        # handbook lead-angle correction
    pd_simple: float     # classic formula, lead angle neglected
    lead_angle_deg: float  # at the pitch diameter found


def read_pitch_diameter(m: float, wire: float, form: ThreadForm, pitch: float,
                        lead: float | None = None) -> PitchFromWires:
    """Return the pitch diameter from ``m`` by the exact, H28 and simple methods.

    m: over wires [mm]; wire [mm]; pitch [mm]; lead [mm] (default: the pitch).
    References: see the module docstring.
    """
    w, p, l = _check_common(wire, pitch, lead)
    e = pd_exact(m, w, form, p, l)
    return PitchFromWires(m, w, e, pd_h28(m, w, form, p, l), pd_simple(m, w, form, p),
                          math.degrees(math.atan(l / (math.pi * e))))


# ---- the band over wires --------------------------------------------------------------------

@dataclass(frozen=True)
class WireBand:
    """What the micrometer should read over a wire for the pitch-diameter band [mm]."""

    wire: float
    at_pd_max: float
    at_pd_mid: float
    at_pd_min: float
    at_pd_max_simple: float
    at_pd_min_simple: float
    lead_angle_deg: float


def band_over_wires(form: ThreadForm, pitch: float, lead: float, pd_max: float, pd_min: float,
                    wire: float) -> WireBand:
    """Return the readings over ``wire`` that bound the pitch-diameter band (exact model).

    pitch, lead [mm]; pd_max, pd_min [mm]; wire [mm].
    References: see the module docstring.
    """
    mid = (pd_max + pd_min) / 2
    return WireBand(wire,
                    over_wires_exact(pd_max, wire, form, pitch, lead),
                    over_wires_exact(mid, wire, form, pitch, lead),
                    over_wires_exact(pd_min, wire, form, pitch, lead),
                    over_wires_simple(pd_max, wire, form, pitch),
                    over_wires_simple(pd_min, wire, form, pitch),
                    math.degrees(math.atan(lead / (math.pi * mid))))


# ---- readings ---------------------------------------------------------------------------------

class ReadingSlip(InvalidEntry):
    """A reading no pitch diameter of this thread could give: likely a unit or entry slip.

    ``likely`` is the value [mm] the reading probably meant (in the other unit), or None.
    """

    def __init__(self, message: str, likely: float | None = None):
        super().__init__(message)
        self.likely = likely


def plausible_readings(form: ThreadForm, pitch: float, lead: float, major: float, minor: float,
                       wire: float) -> tuple[float, float]:
    """Return the lowest and highest reading [mm] any pitch diameter from ``minor`` to ``major`` gives.

    pitch, lead, major, minor (basic diameters) [mm]; wire [mm].
    The exact model reads at least the simple value and adds less than the H28 lead-angle
    term (tests check both), so twice that term bounds the high end.
    References: NBS H28 simple and lead-corrected three-wire formulas.
    """
    lo = over_wires_simple(minor, wire, form, pitch)
    hi = over_wires_simple(major, wire, form, pitch) + 2 * h28_correction(minor, wire, form, lead)
    return lo, hi


def check_reading(m: float, form: ThreadForm, pitch: float, lead: float, major: float,
                  minor: float, wire: float, unit: Unit = "mm") -> float:
    """Return ``m`` [mm] when a reading over ``wire`` is possible; raise ``ReadingSlip`` if not.

    A reading about 25.4 times too large or too small is named as a likely mm/inch slip.
    m [mm]; pitch, lead, major, minor [mm]; wire [mm]; unit: the unit for the message.
    References: ``plausible_readings``; 1 in = 25.4 mm exactly.
    """
    if not isinstance(m, (int, float)) or not math.isfinite(m) or m <= 0:
        raise ReadingSlip("A reading over wires must be a length greater than zero.")
    lo, hi = plausible_readings(form, pitch, lead, major, minor, wire)
    if lo <= m <= hi:
        return float(m)
    res = 0.0001 if unit == "in" else 0.001
    f = lambda v, u=unit: format_length(v, u, 0.0001 if u == "in" else 0.001)  # noqa: E731
    seen = format_length(m, unit, res)
    span = f"between {f(lo)} and {f(hi)}"
    if lo <= m * MM_PER_INCH <= hi:
        likely = m * MM_PER_INCH
        raise ReadingSlip(f"A reading of {seen} cannot be right over these wires (it must be "
                          f"{span}). It looks like inches taken as mm: did you mean "
                          f"{f(likely, 'in')}? Type it with its unit, e.g. "
                          f"{format_length(likely, 'in', 0.0001, suffix=False)}in.", likely)
    if lo <= m / MM_PER_INCH <= hi:
        likely = m / MM_PER_INCH
        raise ReadingSlip(f"A reading of {seen} cannot be right over these wires (it must be "
                          f"{span}). It looks like mm taken as inches: did you mean "
                          f"{f(likely, 'mm')}? Type it with its unit, e.g. "
                          f"{format_length(likely, 'mm', 0.001, suffix=False)}mm.", likely)
    raise ReadingSlip(f"A reading of {seen} cannot be right over these wires (it must be "
                      f"{span}): check the reading, the wire size and the thread chosen.")


@dataclass(frozen=True)
class Readings:
    """One or several readings over wires [mm]: their mean and spread, and whether to trust it."""

    values: tuple[float, ...]
    mean: float
    spread: float             # largest minus smallest
    resolution: float         # the micrometer's step [mm]
    steady: bool              # spread within SPREAD_STEPS steps
    warning: str              # '' when steady


def summarise_readings(values: Sequence[float], resolution: float,
                       unit: Unit = "mm") -> Readings:
    """Return the mean and spread of ``values`` [mm] and a warning when they spread too far.

    resolution: the micrometer's smallest step [mm]; unit: for the message.
    References: arithmetic mean; spread threshold of SPREAD_STEPS steps (common practice).
    """
    vals = tuple(float(v) for v in values)
    if not vals:
        raise InvalidEntry("Enter at least one reading over the wires.")
    res = _positive(resolution, "micrometer resolution")
    for v in vals:
        if not math.isfinite(v) or v <= 0:
            raise InvalidEntry("A reading over wires must be a length greater than zero.")
    mean = math.fsum(vals) / len(vals)
    spread = max(vals) - min(vals)
    steady = spread <= SPREAD_STEPS * res * (1 + 1e-6)
    warning = ""
    if not steady:
        shown = 0.0001 if unit == "in" else 0.001
        warning = (f"The readings spread {format_length(spread, unit, shown)}, more than the "
                   f"micrometer's {SPREAD_STEPS} steps of {format_length(res, unit, shown / 10)}: "
                   "check that each wire sits in its groove, look for a burr, and measure at "
                   "both ends for taper before feeding.")
    return Readings(vals, mean, spread, res, steady, warning)
