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
* For a coarse lead (a two-start trapezoidal screw, 7-10 degrees) that term is too rough (some
  micrometres): ``model="helical"`` finds the wire's seat by brute force instead. The groove's
  flank is the helicoid z = L theta / (2 pi) + w(r)/2, w(r) = P/2 + (2r - E) tan a (the groove
  half a pitch wide at the pitch diameter E, its straight flanks at a; the wire touches the
  straight flank, above the root flat and below the crest flat); the wire is a cylinder lying
  along the groove, its axis through (rho, 0, 0) tangent to the helix there (inclined
  atan(L / (2 pi rho))). Its seat is the rho at which the least distance from its axis to the
  flank (searched on a grid of (r, theta) zoomed in a dozen times) is W/2, found by halving;
  by symmetry it touches both flanks, and M = 2 rho + W. Slow (a tenth of a second) and plain.
* A gear-tooth caliper with its depth slide set s below the crest reads the thread at diameter
  D = OD - 2s: along the axis P/2 - (D - E) tan a, square to the thread that times cos of the
  helix angle there, atan(L / (pi D)).

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
    model: str = "h28"                     # the three-wire relation: 'h28' or 'helical'
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
        if self.model == "helical":
            return over_wires_helical(e, wire_mm, self.pitch_mm, self.lead_mm, self.angle_deg)
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

    # -- the gear-tooth caliper ----------------------------------------------------------------
    def caliper_thickness(self, depth_setting_mm: float) -> float:
        """Return the thickness [mm] a gear-tooth caliper reads square to the thread with its
        depth slide ``depth_setting_mm`` [mm] below the crest (see the module's model)."""
        level = self.od_mm - 2 * depth_setting_mm
        axial = self.pitch_mm / 2 - (level - self.pitch_diameter()) * math.tan(self.half_angle)
        return axial * math.cos(math.atan(self.lead_mm / (math.pi * level)))

    def caliper_typed(self, depth_setting_mm: float, step_mm: float) -> str:
        """Return the caliper's thickness as typed: to its step ``step_mm`` [mm], in the unit."""
        t = self.caliper_thickness(depth_setting_mm)
        value, step = (t / INCH, step_mm / INCH) if self.unit == "in" else (t, step_mm)
        return f"{round(value / step) * step:.{4 if self.unit == 'in' else 3}f}"


def over_wires_helical(pd_mm: float, wire_mm: float, pitch_mm: float, lead_mm: float,
                       angle_deg: float, zooms: int = 14, grid: int = 41) -> float:
    """Return the distance over three wires [mm] on a helical groove, by brute-force search of
    the wire's seat on the helicoidal flank (see the module's model).

    pd_mm, wire_mm, pitch_mm, lead_mm [mm]; angle_deg: the form's included angle [deg].
    References: the geometry of a helicoid and a cylinder (no published formula used); with no
    lead it reduces to NBS Handbook H28's plain relation (tested).
    """
    import numpy as np
    e, w = pd_mm, wire_mm
    tan_a = math.tan(math.radians(angle_deg / 2))

    def least_distance(rho: float) -> float:
        beta = math.atan2(lead_mm, 2 * math.pi * rho)
        uy, uz = math.cos(beta), math.sin(beta)
        r0, r1 = max(e / 2 - 1.5 * w, 1e-6), e / 2 + 1.5 * w
        t0, t1 = -0.6, 0.6
        best = math.inf
        for _ in range(zooms):
            r = np.linspace(r0, r1, grid)[:, None]
            t = np.linspace(t0, t1, grid)[None, :]
            x = r * np.cos(t) - rho
            y = r * np.sin(t)
            z = lead_mm * t / (2 * math.pi) + (pitch_mm / 2 + (2 * r - e) * tan_a) / 2
            # |v x u| with u = (0, uy, uz): the distance from the wire's axis
            d = np.sqrt((y * uz - z * uy) ** 2 + (x * uz) ** 2 + (x * uy) ** 2)
            i, j = np.unravel_index(np.argmin(d), d.shape)
            best = float(d[i, j])
            dr, dt = (r1 - r0) / 4, (t1 - t0) / 4
            r0, r1 = r[i, 0] - dr, r[i, 0] + dr
            t0, t1 = t[0, j] - dt, t[0, j] + dt
        return best

    lo, hi = e / 2 - w, e / 2 + 2 * w
    for _ in range(60):
        mid = (lo + hi) / 2
        lo, hi = (mid, hi) if least_distance(mid) < w / 2 else (lo, mid)
    return (lo + hi) + w


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
