"""A small thread simulator for the whole-job tests: what the micrometer would read over wires.

It stands in for the lathe and the work. It knows what the operator knows and did: the blank's
measured OD, the tool's tip (nose radius or flat) and form angle, the pitch and lead, and every
depth the tool was actually taken to (the dial marks the screen said to set, turned into radial
depth through this lathe's dial and the compound angle the screen said to set). From those it
predicts the pitch diameter the work now has and the reading over a given wire, rounded to the
micrometer's resolution, in the micrometer's unit. It never asks the app for a dimension.

The model:

* The tool is the thread form's V (included angle 2a) with its point rounded (radius r) or
  flattened (flat f). Its flanks are those of a sharp V whose apex lies beyond the real tip by
  r(1/sin a - 1) for a radius, (f/2)/tan a for a flat.
* A V whose apex is at radius R_apex leaves a groove of width 2 (R - R_apex) tan a at radius R.
  The pitch line is where the groove is half a pitch wide: R_pd = R_apex + P / (4 tan a), so
  PD = OD - 2 (depth + beyond) + P / (2 tan a). (ISO 68-1: for 60 degrees P/(2 tan 30) = H =
  0.866025P.) It holds once the flanks have cut past the pitch line (depth is read on the deepest
  cut so far; a spring pass cuts no deeper).
* The reading over three wires of size W: the published relation with the lead-angle term
  (NBS Handbook H28 / ASME B1.2 form):
  M = E + W (1 + cosec a + 1/2 tan^2(lambda) cos a cot a) - (P/2) cot a, tan(lambda) = L/(pi E).
  With lambda = 0 it is the plain relation M = E + W(1 + cosec a) - (P/2) cot a. The lead term
  matters for a two-start thread (lead twice the pitch); the app itself uses the exact helical
  model, so the two agree to a few tenths of a micrometre, not exactly (that is the point: the
  readings do not come from the code under test).

* A tapered thread (``TaperSim``): the blank is turned to the taper (k on diameter) and measured
  at one plane; the set-over or attachment moves the tool square to the axis, so every plane is
  cut to the same depth and the PD at a plane z from the small end is the PD at the measured
  plane plus k (z - z_measured). Over wires at z: the two wires of one side sit a pitch apart
  on radii k P / 2 apart, so the anvil tangent to both lies at the half-angle alpha = atan(k/2)
  to the axis; the spindle face is parallel to it, and the single wire at the plane between
  them is (M_square - W) cos alpha + W from the anvil's face (M_square: the reading square to
  the axis at z, the published relation above). Derived here from that geometry.
* An internal thread (``internal=True``): the bore grows by the depth cut, so
  PD = bore + 2 (depth + beyond) - P / (2 tan a).

References: ISO 68-1 basic profile (H = 0.866025P); NBS Handbook H28, three-wire method (three-wire
relation, H28 lead-angle term); compound travel = radial depth / cos angle, from the geometry.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field

INCH = 25.4        # mm in one inch, exact # ISO 31-1 / NIST SP 811 (1959 agreement)


@dataclass
class ThreadSim:
    """The work on the lathe: a blank of measured OD being cut by a V tool.

    od_mm [mm], pitch_mm [mm], lead_mm [mm], angle_deg [deg] (included), tip_kind
    ('radius'|'flat'), tip_mm [mm], resolution [mm] (the micrometer's smallest step),
    unit ('mm'|'in': what the micrometer reads in).
    """

    od_mm: float
    pitch_mm: float
    lead_mm: float
    angle_deg: float
    tip_kind: str
    tip_mm: float
    resolution_mm: float
    unit: str
    depth_mm: float = 0.0                  # deepest radial cut so far [mm]
    cuts: list = field(default_factory=list)

    # -- the tool and the work -----------------------------------------------------------------
    @property
    def half_angle(self) -> float:
        """Return the flank half-angle a [rad]."""
        return math.radians(self.angle_deg / 2)

    def apex_beyond_tip(self) -> float:
        """Return how far the tool's virtual sharp apex lies beyond its real tip [mm]."""
        a = self.half_angle
        if self.tip_kind == "radius":
            return self.tip_mm * (1 / math.sin(a) - 1)
        return (self.tip_mm / 2) / math.tan(a)

    def cut_to(self, radial_mm: float) -> None:
        """Take the tool in to ``radial_mm`` [mm] from the blank's surface and cut a pass."""
        self.cuts.append(radial_mm)
        self.depth_mm = max(self.depth_mm, radial_mm)

    internal: bool = False                 # a bore (od_mm is the bore) cut by a boring tool

    def pitch_diameter(self) -> float:
        """Return the pitch diameter the work has now [mm] (see the module's model)."""
        a = self.half_angle
        if self.internal:
            return (self.od_mm + 2 * (self.depth_mm + self.apex_beyond_tip())
                    - self.pitch_mm / (2 * math.tan(a)))
        return (self.od_mm - 2 * (self.depth_mm + self.apex_beyond_tip())
                + self.pitch_mm / (2 * math.tan(a)))

    def depth_for(self, pd_mm: float) -> float:
        """Return the radial depth [mm] that leaves pitch diameter ``pd_mm`` [mm] (the inverse)."""
        a = self.half_angle
        if self.internal:
            return (pd_mm - self.od_mm + self.pitch_mm / (2 * math.tan(a))) / 2 \
                - self.apex_beyond_tip()
        return (self.od_mm - pd_mm + self.pitch_mm / (2 * math.tan(a))) / 2 \
            - self.apex_beyond_tip()

    # -- the micrometer ------------------------------------------------------------------------
    def over_wires(self, wire_mm: float, pd_mm: float | None = None) -> float:
        """Return the true distance over three wires [mm] (unrounded) at ``pd_mm`` (default now).

        References: NBS Handbook H28 / ASME B1.2 form with the lead term.
        """
        e = self.pitch_diameter() if pd_mm is None else pd_mm
        a = self.half_angle
        tan_lead = self.lead_mm / (math.pi * e)
        cosec, cot = 1 / math.sin(a), 1 / math.tan(a)
        return (e + wire_mm * (1 + cosec + 0.5 * tan_lead ** 2 * math.cos(a) * cot)
                - self.pitch_mm / 2 * cot)

    def reading(self, wire_mm: float) -> float:
        """Return what the micrometer shows over ``wire_mm`` [mm], in its unit, at its resolution."""
        m = self.over_wires(wire_mm)
        value = m / INCH if self.unit == "in" else m
        step = self.resolution_mm / INCH if self.unit == "in" else self.resolution_mm
        return round(round(value / step) * step, 6)

    def typed(self, wire_mm: float) -> str:
        """Return the reading as the keypad types it (digits and a point, no unit)."""
        places = 4 if self.unit == "in" else 3
        return f"{self.reading(wire_mm):.{places}f}"


def radial_from_dial(divisions: float, travel_per_division_mm: float, angle_deg: float) -> float:
    """Return the radial depth [mm] of ``divisions`` on a slide set ``angle_deg`` from the
    cross-slide (0 for the cross-slide itself).

    travel_per_division_mm [mm]. References: US Navy machinery training manual (compound travel =
    radial depth / cos angle).
    """
    return divisions * travel_per_division_mm * math.cos(math.radians(angle_deg))


@dataclass
class TaperSim(ThreadSim):
    """A tapered thread: ``od_mm`` is the blank measured ``measured_at_mm`` from the small end;
    ``k`` the taper on diameter. ``pitch_diameter()`` is at the measured plane."""

    k: float = 1 / 16
    measured_at_mm: float = 0.0

    def pd_at(self, z_mm: float) -> float:
        """Return the pitch diameter [mm] ``z_mm`` [mm] from the small end."""
        return self.pitch_diameter() + self.k * (z_mm - self.measured_at_mm)

    def reading_at(self, wire_mm: float, z_mm: float) -> float:
        """Return what the micrometer shows over ``wire_mm`` with the single wire ``z_mm`` from
        the small end, anvil on the two wires of the other side (see the module's model)."""
        square = self.over_wires(wire_mm, self.pd_at(z_mm))
        alpha = math.atan(self.k / 2)
        m = (square - wire_mm) * math.cos(alpha) + wire_mm
        value = m / INCH if self.unit == "in" else m
        step = self.resolution_mm / INCH if self.unit == "in" else self.resolution_mm
        return round(round(value / step) * step, 6)

    def typed_at(self, wire_mm: float, z_mm: float) -> str:
        places = 4 if self.unit == "in" else 3
        return f"{self.reading_at(wire_mm, z_mm):.{places}f}"
