"""Cutting and measuring a tapered thread (ISO 7-1 R/Rc, ASME B1.20.1 NPT) on a manual lathe.

A tapered thread's ``Limits`` give its diameters at the gauge plane; k is the taper on
diameter (1/16). Distances along the thread are measured from the end a person measures from:

- external: from the small end (the end of the pipe); the gauge plane lies
  ``taper.gauge_plane_from_end`` from it, and a diameter ``z`` from the small end is smaller by
  k × (gauge_plane_from_end − z);
- internal: from the face of the fitting, inward; an internal taper thread is gauged at its
  face (ISO 7-1: gauge plane at the face, ±T2/2; ASME B1.20.1: the L1 plug gauge flush with
  the face ±1 turn; both from memory), and a diameter ``z`` in from the face is smaller by k × z.

- The blank is turned to the taper first, with the same set-over or attachment as the thread:
  ``taper_blank`` says what it should measure at the end and at the gauge plane.
- With the taper made by the set-over or the attachment the tool moves square to the work's
  axis, so a feed deepens the thread the same at every plane: the depth is planned at the
  gauge plane (``tapered_tool_depth``) and a reading anywhere tells the feed left.
- Over wires (``measure_tapered``): a reading taken at a stated plane gives the pitch
  diameter there, carried along the taper to the gauge plane; what is left to feed comes from
  ``cutting.remaining.measure`` on the limits moved to that plane. The micrometer's anvil
  seated on the two wires of one side lies along the taper, at the half-angle α to the square
  section, so it reads (M − W)·cos α + W where M is the reading square to the axis over the
  single wire's plane (computed from that geometry; common practice, no source: the NBS H28
  treatment of taper pipe threads over wires was not at hand). At 1:16 that is 0.05 % of M − W.
- Hand-tight engagement (``hand_tight_check``): a ring gauge (or the mating fitting) screwed on
  by hand should leave the thread's small end flush with its face; a plug gauge in an internal
  thread should stand with its gauge notch flush with the face; ±1 turn is the usual limit
  (ISO 7-1 gauge length tolerance; ASME B1.20.1 L1 gauging, from memory). A stand-off ``s``
  (the gauge stops short) puts the gauge plane ``s`` away from where it should be; the pitch
  diameter to come off is k × s (turns short × pitch × taper).
"""

from __future__ import annotations

import math
from dataclasses import dataclass, replace
from typing import Literal, Sequence

from shopterm.cutting.remaining import (Measurement, compound_travel, default_compound_angle,
                                        feed_direction, measure)
from shopterm.cutting.tool import ToolDepth, tool_depth
from shopterm.errors import InvalidEntry
from shopterm.lathe.machine import Lathe, ToolTip
from shopterm.standards.spec import Limits, Taper
from shopterm.units import Unit, format_length

#: Common practice, no source.
PRESSURE_CAUTION = ("A pressure fitting's fitness for service is not settled by its dimensions: "
                    "follow the codes that apply and the fitting maker's instructions.")


def _number(value) -> bool:
    return not isinstance(value, bool) and isinstance(value, (int, float)) \
        and math.isfinite(value)


def taper_of(limits: Limits) -> Taper:
    """Return the limits' taper; raise ``InvalidEntry`` for a parallel thread."""
    if limits.taper is None:
        raise InvalidEntry(f"{limits.spec.designation} is a parallel thread: it has no taper "
                           "and no gauge plane. Measure it as any other thread.")
    return limits.taper


def measured_from(limits: Limits) -> str:
    """Return the end distances are measured from: 'the small end' or 'the face' (internal)."""
    return "the small end" if limits.spec.is_external else "the face"


def gauge_plane_at(limits: Limits) -> float:
    """Return the gauge plane's distance [mm] from ``measured_from``: external
    ``gauge_plane_from_end``, internal 0 (the face)."""
    return taper_of(limits).gauge_plane_from_end if limits.spec.is_external else 0.0


def thread_length(taper: Taper) -> float:
    """Return the length of thread [mm] from the end distances are measured from: L2; an
    internal thread with none (ISO 7-1 Rc) as deep as a mating external reaches, L1 plus the
    gauge plane's tolerance (computed from the gauge length)."""
    if taper.L2 is not None:
        return taper.L2
    if taper.gauge_plane_from_end == 0 and taper.L1 is not None:
        return taper.L1 + taper.gauge_plane_tolerance
    return 2 * taper.gauge_plane_from_end


def shift_to_gauge_plane(limits: Limits, distance: float) -> float:
    """Return what to add to a diameter taken ``distance`` [mm] from the small end (external)
    or in from the face (internal) to get the same diameter at the gauge plane [mm]:
    k × (gauge_plane_from_end − distance) external, k × distance internal."""
    taper = taper_of(limits)
    where = measured_from(limits)
    if not _number(distance) or distance < 0:
        raise InvalidEntry(f"Give the distance from {where} of the thread, 0 or more.")
    longest = thread_length(taper)
    if distance > longest + 1e-9:
        raise InvalidEntry(f"{distance:.2f} mm from {where} is beyond the thread "
                           f"({longest:.2f} mm long): check the distance and its unit.")
    if limits.spec.is_external:
        return taper.diameter_shift(taper.gauge_plane_from_end - distance)
    return taper.diameter_shift(distance)


def limits_at(limits: Limits, distance: float) -> Limits:
    """Return the limits moved along the taper to the plane ``distance`` [mm] from the small
    end (internal: in from the face).

    Every diameter is smaller by ``shift_to_gauge_plane``; the taper is kept.
    """
    d = shift_to_gauge_plane(limits, distance)
    moved = {f: getattr(limits, f) - d for f in
             ("basic_major", "basic_pd", "basic_minor", "major_max", "major_min", "pd_max",
              "pd_min", "minor_max", "minor_min") if getattr(limits, f) is not None}
    return replace(limits, **moved)


# ---- the blank ---------------------------------------------------------------------------------

@dataclass(frozen=True)
class TaperBlank:
    """What the turned taper should measure before the thread is cut. Diameters [mm]."""

    internal: bool
    k: float
    measured_from: str             # "the small end" (external) or "the face" (internal)
    gauge_plane_at: float          # distance of the gauge plane from that end
    at_end: float                  # diameter at that end
    at_gauge_plane: float
    at_far_end: float | None       # at the far end of the useful thread (L2 from that end)
    thread_length: float | None
    text: str


def taper_blank(limits: Limits, unit: Unit = "mm") -> TaperBlank:
    """Return the blank's crest diameter (external: major; internal: the bore, minor) at the
    end it is measured from, at the gauge plane, and at the far end of the useful thread.

    External: the gauge diameter where the standard gives one (ISO 7-1), else the basic major
    at the gauge plane; internal: the basic minor there. unit: for the text only.
    References: ISO 7-1 (gauge diameter at the gauge plane), ASME B1.20.1 (L1, L2); 1:16 taper.
    """
    taper = taper_of(limits)
    internal = not limits.spec.is_external
    gauge = limits.basic_minor if internal else (
        taper.gauge_diameter if taper.gauge_diameter is not None else limits.basic_major)
    at = gauge_plane_at(limits)
    end = gauge - shift_to_gauge_plane(limits, 0.0)
    length = thread_length(taper)
    far = gauge - shift_to_gauge_plane(limits, length) if length > 0 else None
    f = lambda v: format_length(v, unit, 0.001 if unit == "mm" else 0.0001)   # noqa: E731
    where = measured_from(limits)
    if internal:
        text = (f"Bore the taper first, with the same set-over or attachment. It should "
                f"measure {f(gauge)} at the face (the gauge plane)"
                + (f" and {f(far)} {f(length)} in from it." if far is not None else "."))
    else:
        text = (f"Turn the blank to the taper first, with the same set-over or attachment. "
                f"It should measure {f(end)} at the small end and {f(gauge)} {f(at)} from it "
                "(the gauge plane).")
    return TaperBlank(internal, taper.per_unit_on_diameter, where, at, end, gauge, far,
                      length if far is not None else None, text)


def blank_at_gauge_plane(limits: Limits, measured: float, distance: float) -> float:
    """Return the blank's diameter at the gauge plane from one ``measured`` [mm] taken
    ``distance`` [mm] from the small end (internal: in from the face)."""
    if not _number(measured) or measured <= 0:
        raise InvalidEntry("Enter the diameter measured on the turned taper (greater than 0).")
    return float(measured) + shift_to_gauge_plane(limits, distance)


def tapered_tool_depth(limits: Limits, measured: float, distance: float, tip: ToolTip,
                       aim_pd: float | None = None) -> ToolDepth:
    """Return the total radial infeed for a tapered thread, planned at the gauge plane.

    measured [mm]: the turned taper's diameter ``distance`` [mm] from the small end
    (internal: the bore's, in from the face); tip;
    aim_pd [mm] at the gauge plane (default the middle of the band). The set-over or the
    attachment makes the taper, so the same infeed cuts the same depth at every plane.
    References: ``cutting.tool.tool_depth``.
    """
    return tool_depth(limits, blank_at_gauge_plane(limits, measured, distance), tip, aim_pd)


# ---- over wires, at a stated plane ---------------------------------------------------------------

@dataclass(frozen=True)
class TaperReading:
    """A set of readings over wires at one plane of a tapered thread. Diameters [mm].

    ``measurement`` is ``remaining.measure`` at that plane: its state, remainders and dial
    settings hold at the gauge plane too (the feed deepens every plane alike); its pitch
    diameters and wire band are at the measuring plane, square to the axis.
    """

    measurement: Measurement
    distance: float              # of the single wire's plane from the small end
    shift: float                 # add to a diameter at the plane to get it at the gauge plane
    typed: tuple[float, ...]     # the readings as the micrometer showed them
    reading_factor: float        # cos α: reading = (square reading − W)·factor + W
    pd_at_plane: float
    pd_at_gauge_plane: float
    aim_pd_at_gauge_plane: float
    read_at_pd_max: float        # what the micrometer should show at this plane, band top
    read_at_pd_min: float
    note: str


def _as_read(square: float, wire: float, factor: float) -> float:
    return (square - wire) * factor + wire


def wire_band_at(limits: Limits, wire: float, distance: float) -> tuple[float, float]:
    """Return what the micrometer should read over ``wire`` [mm] at ``distance`` [mm] from the
    small end at the band's top and bottom (PD max, PD min there), anvil on two wires as
    ``measure_tapered`` reads it. References: ``wires.band_over_wires``; this module's docstring.
    """
    from shopterm.cutting.wires import band_over_wires
    at = limits_at(limits, distance)
    spec = limits.spec
    band = band_over_wires(spec.form, spec.pitch, spec.lead, at.pd_max, at.pd_min, wire)
    factor = math.cos(math.radians(taper_of(limits).half_angle_deg))
    return _as_read(band.at_pd_max, wire, factor), _as_read(band.at_pd_min, wire, factor)


def measure_tapered(limits: Limits, wire: float, readings: Sequence[float], distance: float,
                    *, aim_pd: float | None = None, **kw) -> TaperReading:
    """Return what readings over wires at ``distance`` [mm] from the small end say.

    limits: a tapered thread's limits (gauge plane); wire [mm]; readings [mm] as the
    micrometer showed them (anvil on the two wires); distance: of the single wire from the
    small end; aim_pd [mm] at the gauge plane (default the middle of the band); other keywords
    as ``remaining.measure`` (lathe, compound_angle_deg, resolution, unit, dial_step).
    Raises ``InvalidEntry`` for a parallel or internal thread, a plane off the thread, or a
    reading no pitch diameter there could give.
    References: this module's docstring; ``remaining.measure``.
    """
    taper = taper_of(limits)
    shift = shift_to_gauge_plane(limits, distance)
    at = limits_at(limits, distance)
    factor = math.cos(math.radians(taper.half_angle_deg))
    typed = tuple(readings)
    for m in typed:
        if not _number(m) or m <= wire:
            raise InvalidEntry("A reading over wires must be larger than the wire: check it.")
    square = [(m - wire) / factor + wire for m in typed]
    aim = None if aim_pd is None else aim_pd - shift
    result = measure(at, wire, square, aim_pd=aim, **kw)
    note = ""
    if distance < limits.spec.pitch:
        note = ("The first thread at the small end is rarely full: measure a thread or two "
                "further in. ")
    band = result.band
    return TaperReading(result, float(distance), shift, typed, factor, result.pitch_diameter,
                        result.pitch_diameter + shift, result.aim_pd + shift,
                        _as_read(band.at_pd_max, wire, factor),
                        _as_read(band.at_pd_min, wire, factor),
                        note + "Readings at other planes differ by the taper: "
                               "always say where they were taken.")


# ---- hand-tight engagement ---------------------------------------------------------------------

Against = Literal["ring_gauge", "plug_gauge", "fitting"]
AGAINST: tuple[str, ...] = ("ring_gauge", "plug_gauge", "fitting")
HandState = Literal["feed_on", "done", "past"]


@dataclass(frozen=True)
class HandTightCheck:
    """A hand-tight engagement check and what it means for the cut. Lengths [mm]."""

    against: str
    stand_off: float             # + : the gauge stopped short of flush (thread still too tight)
    turns: float | None          # counted by hand, when given
    expected_turns: float        # L1 (the gauge length) / pitch
    tolerance: float             # the gauge plane's ± position
    state: HandState
    to_remove: float             # pitch diameter to come off to bring it flush (0: none)
    radial: float                # radial infeed for that
    compound: float              # compound travel for that at compound_angle_deg
    compound_angle_deg: float
    cross_divisions: int | float | None     # on the cross-slide dial (None: no lathe)
    compound_divisions: int | float | None
    headline: str
    direction: str


def hand_tight_check(limits: Limits, *, stand_off: float | None = None,
                     turns: float | None = None, against: str = "ring_gauge",
                     lathe: Lathe | None = None, compound_angle_deg: float | None = None,
                     unit: Unit | None = None) -> HandTightCheck:
    """Return what a hand-tight engagement check says, and the feed to bring it flush.

    Give one of: stand_off [mm], how far the gauge (or fitting) stopped short of flush (a
    ring gauge: the thread's small end inside the gauge's face by that much; a plug gauge:
    its notch standing proud of the fitting's face; negative: gone past flush); turns, made by
    hand from the thread catching to hand tight (expected: L1 / pitch, the gauge length).
    against: 'ring_gauge', 'plug_gauge' (internal thread) or 'fitting' (a mating part: not a
    gauge, so only a guide). The pitch diameter to remove is k × stand_off.
    References: this module's docstring.
    """
    taper = taper_of(limits)
    spec = limits.spec
    unit = unit or spec.native_unit
    f = lambda v: format_length(v, unit, 0.0001 if unit == "in" else 0.001)   # noqa: E731
    if against not in AGAINST:
        raise InvalidEntry("Check against a ring_gauge, a plug_gauge or the mating fitting.")
    if against == "plug_gauge" and spec.is_external:
        raise InvalidEntry("A plug gauge checks an internal thread: use a ring gauge or the "
                           "mating fitting on an external one.")
    if against == "ring_gauge" and not spec.is_external:
        raise InvalidEntry("A ring gauge checks an external thread: use a plug gauge or the "
                           "mating fitting in an internal one.")
    if (stand_off is None) == (turns is None):
        raise InvalidEntry("Give either the stand-off from flush or the turns made by hand, "
                           "one of the two.")
    pitch = spec.pitch
    # the gauge's length engaged by hand: L1 (an internal thread's gauge plane is its face)
    gauge_len = taper.L1 if taper.L1 is not None else taper.gauge_plane_from_end
    expected = gauge_len / pitch
    if turns is not None:
        if not _number(turns) or turns < 0:
            raise InvalidEntry("The turns made by hand are a number, 0 or more.")
        if turns > 2 * expected + 2:
            raise InvalidEntry(f"{turns:g} turns by hand is far beyond the {expected:.1f} "
                               "expected: the thread is far undersize, or the count is wrong.")
        s = (expected - turns) * pitch
    else:
        if not _number(stand_off):
            raise InvalidEntry("The stand-off is a length: how far short of flush it stopped.")
        s = float(stand_off)
        if abs(s) > gauge_len:
            raise InvalidEntry(f"A stand-off of {f(s)} is more than the whole gauge length "
                               f"({f(gauge_len)}): if the gauge does not start, feed on and try "
                               "again; else check the number and its unit.")
    tol = taper.gauge_plane_tolerance
    remove = max(taper.diameter_shift(s), 0.0)
    radial = remove / 2
    angle = default_compound_angle(spec.form) if compound_angle_deg is None \
        else float(compound_angle_deg)
    comp = compound_travel(radial, angle)
    cross_div = comp_div = None
    if lathe is not None:
        cross_div = lathe.cross_dial.rounded(radial)
        comp_div = lathe.compound_dial.rounded(comp)
    turns_off = s / pitch
    if s > tol + 1e-9:
        state: HandState = "feed_on"
        headline = (f"{turns_off:.1f} turns short of flush ({f(s)}): feed on {f(radial)} "
                    f"radial to take {f(remove)} off the pitch diameter.")
    elif s >= -tol - 1e-9:
        state = "done"
        headline = (f"Within the gauge's ±{f(tol)} ({turns_off:+.1f} turns from flush): stop."
                    + (f" {f(remove)} more off the pitch diameter would bring it flush."
                       if remove > 0 else ""))
    else:
        state = "past"
        headline = (f"{-turns_off:.1f} turns past flush ({f(-s)}): the thread is past its "
                    "size. Do not feed any further.")
    if against == "fitting":
        headline += " A fitting is not a gauge: confirm with a gauge where it matters."
    return HandTightCheck(against, s, None if turns is None else float(turns), expected, tol,
                          state, remove, radial, comp, angle, cross_div, comp_div, headline,
                          feed_direction(spec.kind))
