"""From a reading over wires to what to do next: pitch diameter now, what is left to remove,
and that as radial infeed, compound travel and divisions on this lathe's dials.

An external thread's pitch diameter falls by twice the radial infeed (the tool goes in on both
sides of the diameter); the compound, set at its true angle ``A`` from the cross-slide, moves
the tool ``radial / cos A`` along its own slide for a radial infeed ``radial``.

Internal threads cannot be measured over wires on most work: ``fit_check_offer`` says so and
``record_fit_check`` turns a check against the mating part or a plug gauge into a state.

References: NBS Handbook H28 (three-wire method); compound infeed 29.5° from the cross-slide for
60° threads (US Navy machinery training manual); compound travel = radial / cos A
(US Navy machinery training manual); limits of size from ``shopterm.standards``.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Literal, Sequence

from shopterm.errors import InvalidEntry, ShoptermError
from shopterm.lathe.machine import Dial, Lathe
from shopterm.standards.forms import ThreadForm
from shopterm.standards.spec import Limits, ThreadSpec
from shopterm.units import Unit, format_length
from shopterm.cutting.wires import (MEASURE_CAUTION, CaliperBand, PitchFromWires, Readings,
                                    WireBand, band_over_wires, caliper_band, check_reading,
                                    is_power_form, over_wires_exact, pd_from_thickness,
                                    read_pitch_diameter, require_wire, summarise_readings,
                                    thread_thickness, wire_range)

State = Literal["oversize", "in_band", "undersize"]
Slide = Literal["cross-slide", "compound"]

#: Default compound angle from the cross-slide [deg] by included angle of the form, with source.
COMPOUND_ANGLES: dict[float, tuple[float, str]] = {
    60.0: (29.5, "US Navy machinery training manual"),
    55.0: (27.5, "from memory: 27–27.5° for Whitworth form"),
    47.5: (23.5, "common practice, no source: a little under the half-angle"),
    30.0: (14.5, "from memory: a little under the half-angle"),
    29.0: (14.5, "from memory: the half-angle for Acme"),
}

BACKLASH = ("Take up backlash the way you feed: come up to the number turning in the feed "
            "direction; if you pass it, back off a good part of a turn and come up again.")

UNDERSIZE_CAUTION = ("Do not feed any further: every pass makes the thread smaller. Mark the "
                     "part and decide with whoever it is for.")


def default_compound_angle(form: ThreadForm) -> float:
    """Return the usual compound angle from the cross-slide [deg] for ``form``.

    References: COMPOUND_ANGLES (60°: US Navy training manual; others marked there).
    """
    for angle, (value, _src) in COMPOUND_ANGLES.items():
        if abs(angle - form.angle_deg) < 1e-9:
            return value
    return max(form.angle_deg / 2 - 0.5, 0.0)


def feed_direction(kind: str) -> str:
    """Return which way the dials turn to feed, for an 'external' or 'internal' thread.

    References: common practice, no source (right-hand feed screws, tool on the near side).
    """
    if kind == "external":
        return "Turn the dial clockwise to feed in, towards the centre of the work."
    if kind == "internal":
        return ("Internal thread: feed outward, away from the centre of the bore — on most "
                "lathes that is counter-clockwise.")
    raise InvalidEntry("A thread is external or internal.")


def compound_travel(radial: float, angle_deg: float) -> float:
    """Return the compound travel [mm] that gives ``radial`` [mm] infeed at ``angle_deg`` [deg].

    angle_deg: the compound's true angle from the cross-slide direction (0 = straight in).
    References: US Navy machinery training manual, travel = radial / cos A.
    """
    return radial / math.cos(math.radians(_check_angle(angle_deg)))


def _check_angle(angle_deg: float) -> float:
    if not isinstance(angle_deg, (int, float)) or not math.isfinite(angle_deg) \
            or not 0 <= angle_deg < 80:
        raise InvalidEntry("The compound angle is measured from the cross-slide: type 0 to 80°, "
                           "e.g. 29.5 for a 60° thread.")
    return float(angle_deg)


# ---- dial settings ------------------------------------------------------------------------------

@dataclass(frozen=True)
class DialSetting:
    """A feed as set on one dial, rounded to what the dial can be set to."""

    slide: Slide
    dial: Dial
    travel: float            # slide travel wanted [mm]
    divisions_exact: float   # unrounded divisions for that travel
    divisions: int | float   # what to set (multiples of the step)
    radial_set: float        # radial infeed the rounded setting gives [mm]
    predicted_pd: float      # pitch diameter after the cut [mm]
    predicted_over_wires: float  # what the micrometer should then read [mm]
    in_band: bool            # the predicted pitch diameter is inside the band


@dataclass(frozen=True)
class FeedTo:
    """What to feed to bring the pitch diameter to one target."""

    target: Literal["top", "aim", "bottom"]
    target_pd: float         # [mm]
    to_remove: float         # pitch diameter still to come off [mm]; ≤ 0: already there
    radial: float            # radial infeed [mm] (0 when nothing to remove)
    compound: float          # compound travel [mm]
    cross: DialSetting | None     # on the cross-slide dial (None: no lathe, or nothing to feed)
    on_compound: DialSetting | None


def _rounded_setting(slide: Slide, dial: Dial, travel: float, radial_per_travel: float,
                     pd_now: float, pd_max: float, pd_min: float, aim: float,
                     rule: str, step: float, form: ThreadForm, pitch: float, lead: float,
                     wire: float) -> DialSetting:
    exact = dial.divisions_for(travel)
    lo = math.floor(exact / step + 1e-9) * step
    hi = math.ceil(exact / step - 1e-9) * step

    def pd_for(n: float) -> float:
        return pd_now - 2 * dial.travel_for(n) * radial_per_travel

    def ok(pd: float) -> bool:
        return pd_min - 1e-9 <= pd <= pd_max + 1e-9

    cands = [lo, hi] if hi != lo else [lo]
    if rule == "up":        # at least this far (reach the top of the band)
        pick = hi if pd_for(hi) >= pd_min - 1e-9 else lo
    elif rule == "down":    # no further than this (the bottom of the band)
        pick = lo
    else:                   # nearest to the aim that stays in the band; never past the bottom
        inside = [n for n in cands if ok(pd_for(n))]
        if inside:
            pick = min(inside, key=lambda n: abs(pd_for(n) - aim))
        else:
            pick = lo
    pick = int(pick) if float(pick).is_integer() else pick
    radial = dial.travel_for(pick) * radial_per_travel
    pd = pd_for(pick)
    return DialSetting(slide, dial, travel, exact, pick, radial, pd,
                       over_wires_exact(pd, wire, form, pitch, lead), ok(pd))


def feed_to(target: str, target_pd: float, pd_now: float, pd_max: float, pd_min: float,
            aim: float, angle_deg: float, lathe: Lathe | None, form: ThreadForm, pitch: float,
            lead: float, wire: float, step: float = 1.0) -> FeedTo:
    """Return the radial infeed, compound travel and dial settings from ``pd_now`` to ``target_pd``.

    All diameters [mm]; angle_deg: compound's true angle from the cross-slide [deg];
    step: the finest setting on a dial, in divisions (1 = whole divisions).
    References: external thread, PD falls by 2 × radial infeed; travel = radial / cos A.
    """
    remove = pd_now - target_pd
    if remove <= 0:
        return FeedTo(target, target_pd, remove, 0.0, 0.0, None, None)
    radial = remove / 2
    comp = compound_travel(radial, angle_deg)
    cross = on_comp = None
    if lathe is not None:
        rule = {"top": "up", "bottom": "down"}.get(target, "aim")
        cross = _rounded_setting("cross-slide", lathe.cross_dial, radial, 1.0, pd_now, pd_max,
                                 pd_min, aim, rule, step, form, pitch, lead, wire)
        on_comp = _rounded_setting("compound", lathe.compound_dial, comp,
                                   math.cos(math.radians(angle_deg)), pd_now, pd_max, pd_min,
                                   aim, rule, step, form, pitch, lead, wire)
    return FeedTo(target, target_pd, remove, radial, comp, cross, on_comp)


# ---- classes the part still fits ----------------------------------------------------------------

def classes_that_fit(spec: ThreadSpec, pd: float,
                     bands: Sequence[tuple[str, float, float]] | None = None) -> tuple[str, ...]:
    """Return the classes whose pitch-diameter band holds ``pd`` [mm] (pitch diameter only).

    bands: (class, pd_max, pd_min) to choose from; by default every class the standard gives
    for this size and kind, from ``shopterm.standards.classes`` and ``limits``.
    References: the family's tolerance standard (ISO 965, ASME B1.1, BS 84, BS 93).
    """
    if bands is None:
        bands = []
        try:
            from shopterm import standards
            for c in standards.classes(spec):
                if c == spec.tol_class:
                    continue
                lim = standards.limits(spec.with_(tol_class=c))
                bands.append((c, lim.pd_max, lim.pd_min))
        except (ShoptermError, ImportError):
            return ()
    return tuple(c for c, hi, lo in bands if c != spec.tol_class and lo - 1e-9 <= pd <= hi + 1e-9)


# ---- the answer to one set of readings ---------------------------------------------------------

@dataclass(frozen=True)
class Measurement:
    """What a set of readings over wires means for the cut, and what to feed next.

    Diameters [mm]. ``to_*`` are the pitch diameter still to come off (negative: already past).
    ``band_position`` is 0 at the top of the band, 1 at the bottom (outside 0..1 when out).
    """

    readings: Readings
    wire: float
    band: WireBand
    pd: PitchFromWires
    pd_max: float
    pd_min: float
    aim_pd: float
    state: State
    headline: str
    detail: str
    to_max: float
    to_mid: float
    to_min: float
    to_aim: float
    feed_top: FeedTo
    feed_aim: FeedTo
    feed_bottom: FeedTo
    compound_angle_deg: float
    band_position: float | None
    undersize_by: float
    still_fits: tuple[str, ...]
    direction: str
    backlash: str
    caution: str

    @property
    def pitch_diameter(self) -> float:
        """Return the pitch diameter now [mm] (exact model)."""
        return self.pd.pd

    @property
    def pd_mid(self) -> float:
        """Return the middle of the band [mm]."""
        return (self.pd_max + self.pd_min) / 2

    @property
    def radial_to_mid(self) -> float:
        """Return the radial infeed to the middle of the band [mm] (0 when past it)."""
        return max(self.to_mid, 0.0) / 2

    @property
    def compound_to_mid(self) -> float:
        """Return the compound travel to the middle of the band [mm] (0 when past it)."""
        return compound_travel(self.radial_to_mid, self.compound_angle_deg)


def measure(limits: Limits, wire: float, readings: Sequence[float], *,
            lathe: Lathe | None = None, compound_angle_deg: float | None = None,
            aim_pd: float | None = None, resolution: float = 0.001, unit: Unit | None = None,
            dial_step: float = 1.0,
            class_bands: Sequence[tuple[str, float, float]] | None = None) -> Measurement:
    """Return the pitch diameter now, the state, and what to feed, from readings over wires.

    limits: the thread's limits (the band is ``pd_max``..``pd_min``; a band of no width is the
    basic size and counts as met within half a micrometer step); wire: the wire's diameter
    [mm] (measured, when known); readings: over wires [mm], each checked for a unit or entry
    slip before anything is computed; lathe: for dial divisions (None: mm only);
    compound_angle_deg: the compound's true angle from the cross-slide [deg] (default by form);
    aim_pd: where in the band to aim [mm] (default the middle); resolution: the micrometer's
    step [mm]; unit: for messages (default the thread's own); dial_step: finest dial setting
    [divisions]; class_bands: (class, pd_max, pd_min) for the undersize advice (default: the
    standard's tables).
    References: NBS H28 three-wire method; US Navy machinery training manual (compound).
    """
    spec = limits.spec
    form, pitch, lead = spec.form, spec.pitch, spec.lead
    unit = unit or spec.native_unit
    res_shown = 0.0001 if unit == "in" else 0.001
    f = lambda v: format_length(v, unit, res_shown)   # noqa: E731
    if not spec.is_external:
        raise InvalidEntry(fit_check_offer(spec).message)
    require_wire(form, pitch, wire, unit=unit)
    vals = tuple(readings)
    if not vals:
        raise InvalidEntry("Enter at least one reading over the wires.")
    for m in vals:   # a slip is questioned before anything is computed from it
        check_reading(m, form, pitch, lead, limits.basic_major, limits.basic_minor, wire, unit)
    angle = default_compound_angle(form) if compound_angle_deg is None \
        else _check_angle(compound_angle_deg)
    summary = summarise_readings(vals, resolution, unit)
    pd_max, pd_min = limits.pd_max, limits.pd_min
    if pd_max < pd_min:
        raise InvalidEntry("The band's top is below its bottom: check the limits entered.")
    slack = resolution / 2 if pd_max - pd_min < resolution else 0.0
    top, bottom = pd_max + slack, pd_min - slack
    mid = (pd_max + pd_min) / 2
    if aim_pd is None:
        aim = mid
    else:
        if not (pd_min - 1e-9 <= aim_pd <= pd_max + 1e-9):
            raise InvalidEntry(f"The aim point must lie in the band, {f(pd_min)} to {f(pd_max)}.")
        aim = float(aim_pd)

    pdw = read_pitch_diameter(summary.mean, wire, form, pitch, lead)
    pd = pdw.pd
    band = band_over_wires(form, pitch, lead, pd_max, pd_min, wire)
    args = (pd, top, bottom, aim, angle, lathe, form, pitch, lead, wire, dial_step)
    ft_top = feed_to("top", pd_max, *args)
    ft_aim = feed_to("aim", aim, *args)
    ft_bottom = feed_to("bottom", pd_min, *args)
    width = pd_max - pd_min
    position = (pd_max - pd) / width if width > 0 else None
    fits: tuple[str, ...] = ()
    undersize_by = 0.0
    caution = ""
    if pd > top + 1e-12:
        state: State = "oversize"
        headline = f"Oversize by {f(pd - pd_max)} on pitch diameter: feed on."
        detail = _feed_detail(ft_aim, "the aim" if aim_pd is not None else "the middle", unit,
                              angle)
    elif pd >= bottom - 1e-12:
        state = "in_band"
        if width > 0:
            headline = (f"In the band: stop. {f(pd - pd_min)} above the bottom, "
                        f"{f(max(pd_max - pd, 0.0))} below the top.")
        else:
            side = "over" if pd >= pd_max else "under"
            headline = f"At the basic pitch diameter ({f(abs(pd - pd_max))} {side}): stop."
        detail = ("A spring pass at the same setting may take a little more: measure again "
                  "after it.")
    else:
        state = "undersize"
        undersize_by = pd_min - pd
        cls = spec.tol_class or "the basic size"
        fits = classes_that_fit(spec, pd, class_bands) if spec.tol_class else ()
        headline = f"Undersize by {f(undersize_by)} on pitch diameter: it no longer makes {cls}."
        if fits:
            detail = ("On pitch diameter it still fits " + ", ".join(fits)
                      + " (check the major diameter too).")
        else:
            detail = "It fits no other class in the tables: keep it only as a fitted part."
        caution = UNDERSIZE_CAUTION
    if not summary.steady:
        detail = summary.warning + " " + detail
    return Measurement(summary, wire, band, pdw, pd_max, pd_min, aim, state, headline, detail,
                       pd - pd_max, pd - mid, pd - pd_min, pd - aim, ft_top, ft_aim, ft_bottom,
                       angle, position, undersize_by, fits, feed_direction(spec.kind), BACKLASH,
                       caution or MEASURE_CAUTION)


def _feed_detail(ft: FeedTo, where: str, unit: Unit, angle: float) -> str:
    res = 0.0001 if unit == "in" else 0.001
    f = lambda v: format_length(v, unit, res)   # noqa: E731
    text = (f"To {where} of the band: {f(ft.radial)} radial, or {f(ft.compound)} on the "
            f"compound at {angle:g}°.")
    for s in (ft.on_compound, ft.cross):
        if s is not None:
            text += (f" {s.slide.capitalize()}: {s.divisions:g} div → pitch diameter "
                     f"{f(s.predicted_pd)}" + ("" if s.in_band else " (not in the band: the "
                                               "band is finer than one division)") + ".")
    return text


# ---- internal threads: a fit check instead -------------------------------------------------------

@dataclass(frozen=True)
class FitCheckOffer:
    """What to say for a thread that cannot be measured over wires, and the checks to offer."""

    message: str
    checks: tuple[tuple[str, str], ...]   # (key, label)


FIT_CHECKS: tuple[tuple[str, str], ...] = (
    ("mating_part", "Try the mating part"),
    ("plug_gauge", "Try a go / no-go plug gauge"),
)

#: outcome → (state, message). States: "feed_on", "done", "past".
FIT_OUTCOMES: dict[str, dict[str, tuple[str, str]]] = {
    "mating_part": {
        "does_not_start": ("feed_on", "The mating part does not start: feed on, a little at a time."),
        "tight": ("feed_on", "It goes on tight: a small feed or a spring pass, then try again."),
        "good": ("done", "It screws on by hand without shake: stop, the fit is made."),
        "loose": ("past", "It shakes: the thread is past a good fit. Do not feed any further."),
    },
    "plug_gauge": {
        "go_does_not_enter": ("feed_on", "The go gauge does not enter: feed on, a little at a time."),
        "go_enters_nogo_not": ("done", "Go enters, no-go does not: stop, the thread is in class."),
        "nogo_enters": ("past", "The no-go gauge enters: the thread is past its class. Do not "
                                "feed any further."),
    },
}


def fit_check_offer(spec: ThreadSpec) -> FitCheckOffer:
    """Return the message and the fit checks to offer for a thread not measured over wires.

    References: common practice, no source (internal threads are gauged or fitted).
    """
    what = "An internal thread" if not spec.is_external else "This thread"
    return FitCheckOffer(f"{what} cannot be measured over wires on most work: check the fit "
                         "against the mating part or a plug gauge instead, and record it.",
                         FIT_CHECKS)


@dataclass(frozen=True)
class FitCheck:
    """One fit check as recorded: against what, what was found, and what it means."""

    against: str
    outcome: str
    state: str      # "feed_on", "done" or "past"
    message: str
    note: str = ""


def record_fit_check(against: str, outcome: str, note: str = "") -> FitCheck:
    """Return the record of a fit check and what it means for the cut.

    against: 'mating_part' or 'plug_gauge'; outcome: one of FIT_OUTCOMES[against].
    References: common practice, no source.
    """
    table = FIT_OUTCOMES.get(against)
    if table is None:
        raise InvalidEntry("Check against the mating part or a plug gauge: choose "
                           "mating_part or plug_gauge.")
    if outcome not in table:
        raise InvalidEntry(f"For a {against.replace('_', ' ')} the result is one of: "
                           + ", ".join(o.replace("_", " ") for o in table) + ".")
    state, message = table[outcome]
    return FitCheck(against, outcome, state, message, note)


# ---- a power thread measured with a gear-tooth caliper ---------------------------------------

@dataclass(frozen=True)
class CaliperMeasurement:
    """What a gear-tooth caliper's thickness says, as a wire reading would say it.

    Lengths [mm]. ``measurement`` is the same answer as ``measure`` gives for a reading over
    wires (state, what is left, dial settings); its wire figures stand for the pitch diameter
    found here and are not to be shown as readings.
    """

    thickness: float            # as read (square to the thread when ``band.normal``)
    band: CaliperBand           # the depth slide and the thicknesses at the ends of the band
    pitch_diameter: float
    measurement: Measurement
    form: ThreadForm
    pitch: float                # [mm]
    lead: float                 # [mm]

    def thickness_at(self, pd: float) -> float:
        """Return the thickness [mm] the caliper would read at pitch diameter ``pd`` [mm]."""
        return thread_thickness(pd, self.form, self.pitch, self.band.level_diameter,
                                self.lead, self.band.normal)


def measure_by_caliper(limits: Limits, thickness: float, crest_diameter: float, *,
                       lathe: Lathe | None = None, compound_angle_deg: float | None = None,
                       aim_pd: float | None = None, resolution: float = 0.001,
                       unit: Unit | None = None, dial_step: float = 1.0) -> CaliperMeasurement:
    """Return the pitch diameter from a thread thickness read with a gear-tooth caliper, and what
    is left to feed, for a trapezoidal or Acme thread.

    limits: the thread's (a 30° or 29° form, external); thickness [mm]: read square to the
    thread with the depth slide set to ``caliper_band``'s depth from the crest; crest_diameter
    [mm]: the turned major, as measured; the rest as ``measure``. The pitch diameter comes from
    ``pd_from_thickness``; it is then stood for by the reading over the best-size wire that
    would give it (exact model, so the round trip is exact) and judged by ``measure``, so the
    state, the band and the dial settings are the wire screen's own.
    References: gear-tooth caliper on an Acme thread (Machinery's Handbook, from memory); as
    ``measure``.
    """
    spec = limits.spec
    form, pitch, lead = spec.form, spec.pitch, spec.lead
    if not is_power_form(form) or form.angle_deg <= 0:
        raise InvalidEntry("A gear-tooth caliper reading is for trapezoidal and Acme threads.")
    if not spec.is_external:
        raise InvalidEntry(fit_check_offer(spec).message)
    band = caliper_band(form, pitch, lead, limits.pd_max, limits.pd_min, crest_diameter,
                        limits.basic_pd)
    pd = pd_from_thickness(thickness, form, pitch, band.level_diameter, lead, band.normal)
    if not (limits.basic_minor < pd < limits.basic_major):
        u = unit or spec.native_unit
        raise InvalidEntry(f"A thickness of {format_length(thickness, u)} gives a pitch diameter "
                           f"of {format_length(pd, u)}, outside the thread: check the reading, "
                           "its unit and the depth slide.")
    wire = wire_range(form, pitch).best
    m = measure(limits, wire, [over_wires_exact(pd, wire, form, pitch, lead)], lathe=lathe,
                compound_angle_deg=compound_angle_deg, aim_pd=aim_pd, resolution=resolution,
                unit=unit, dial_step=dial_step)
    return CaliperMeasurement(float(thickness), band, pd, m, form, pitch, lead)
