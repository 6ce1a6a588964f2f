"""The tool tip against the thread: how deep it must go, and whether its form suits the thread.

Geometry (single-point tool ground to the thread's included angle 2a, axial section, lead angle
neglected): at the aim pitch diameter the groove is P/2 wide, so a sharp V tool has its apex
(P/4)·cot a beyond the pitch line. A flat f at the tip holds it back by (f/2)·cot a; a nose
radius r tangent to both flanks holds it back by r·(1/sin a − 1). The total radial infeed is
measured from the diameter actually turned: the blank's OD (external) or the bore's ID
(internal, feeding outward).

The form check compares the two thread surfaces over one pitch — the one this tool cuts and the
mating thread at its maximum-material size — and reports any place where they overlap, with a
point list for each surface so a screen can draw them.

References: ISO 68-1 (basic profile, H = 0.866025P, h3 = 17/24 H, root radius H/6);
ISO 965-1 (external root radius ≥ 0.125P); ASME B1.1 (UN/UNR roots); BS 84 (Whitworth rounded
form, r = 0.137329P); BS 93 (BA, r = 0.180835P).
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from shopterm.errors import InvalidEntry
from shopterm.lathe.machine import ToolTip
from shopterm.standards.spec import Limits
from shopterm.units import Unit, format_length

#: Below this the core treats two surfaces as touching, not overlapping [mm].
TOUCH = 1e-6

#: Where a standard gives one root radius (BS 84, BS 93), a ground tip within this fraction of
#: it is accepted. Our own tolerance, no source: a toolroom-ground radius is rarely closer.
SINGLE_RADIUS_TOLERANCE = 0.10


def _half_angle(form_angle_deg: float) -> float:
    if not (0 < form_angle_deg < 180):
        raise InvalidEntry(f"A thread form angle of {form_angle_deg:g}° cannot be cut: use the "
                           "included angle, e.g. 60 or 55.")
    return math.radians(form_angle_deg / 2)


def sharp_apex_beyond_pitch_line(pitch: float, form_angle_deg: float) -> float:
    """Return how far a sharp V tool's apex lies beyond the pitch line [mm].

    pitch [mm]; form_angle_deg: included angle [deg].
    References: ISO 68-1 basic profile (groove P/2 wide at the pitch line).
    """
    return pitch / 4 / math.tan(_half_angle(form_angle_deg))


def tip_setback(tip: ToolTip, form_angle_deg: float) -> float:
    """Return how far the tip's flat or radius holds it back from the sharp V apex [mm].

    tip: flat width or nose radius [mm]; form_angle_deg: included angle [deg].
    References: plane geometry of a V with half-angle a: flat f → (f/2)·cot a;
    radius r tangent to both flanks → r·(1/sin a − 1).
    """
    a = _half_angle(form_angle_deg)
    if tip.kind == "flat":
        return tip.size / 2 / math.tan(a)
    return tip.size * (1 / math.sin(a) - 1)


def tip_beyond_pitch_line(tip: ToolTip, pitch: float, form_angle_deg: float) -> float:
    """Return how far the tool's tip must lie beyond the pitch line [mm] (toward the root).

    tip [mm]; pitch [mm]; form_angle_deg [deg]. Raises InvalidEntry when the tip is so wide that
    it could not reach the pitch line.
    References: ISO 68-1 basic profile; see ``tip_setback``.
    """
    if pitch <= 0:
        raise InvalidEntry("The pitch must be greater than zero.")
    depth = sharp_apex_beyond_pitch_line(pitch, form_angle_deg) - tip_setback(tip, form_angle_deg)
    if depth <= 0:
        what = "flat" if tip.kind == "flat" else "radius"
        raise InvalidEntry(f"A tip {what} of {tip.size:.3f} mm is too big for a {pitch:g} mm "
                           f"pitch: it cannot reach the pitch line. Grind it smaller (under "
                           f"{largest_tip(tip.kind, pitch, form_angle_deg):.3f} mm).")
    return depth


def largest_tip(kind: str, pitch: float, form_angle_deg: float) -> float:
    """Return the flat or radius [mm] whose tip would just reach the pitch line.

    kind: 'flat' or 'radius'; pitch [mm]; form_angle_deg [deg].
    References: inverse of ``tip_setback``.
    """
    a = _half_angle(form_angle_deg)
    apex = sharp_apex_beyond_pitch_line(pitch, form_angle_deg)
    return 2 * apex * math.tan(a) if kind == "flat" else apex / (1 / math.sin(a) - 1)


@dataclass(frozen=True)
class ToolDepth:
    """Where the tool must go: total radial infeed from the turned surface to the aim PD."""

    total_radial: float          # [mm] from the turned diameter to the tip, on radius
    turned_diameter: float       # [mm] blank OD (external) or bore ID (internal), as measured
    aim_pd: float                # [mm]
    tip_beyond_pitch_line: float  # [mm]
    root_diameter: float         # [mm] diameter the tip leaves at the aim PD
    basic_depth: float           # [mm] the standard's basic depth (Limits.depth), to compare
    internal: bool
    notes: tuple[str, ...] = ()

    @property
    def difference_from_basic(self) -> float:
        """Return total_radial − basic_depth [mm] (what the turned size and tip add or take)."""
        return self.total_radial - self.basic_depth


def tool_depth(limits: Limits, turned_diameter: float, tip: ToolTip,
               aim_pd: float | None = None) -> ToolDepth:
    """Return the total radial infeed that puts the pitch diameter at ``aim_pd``.

    limits: the thread's limits (pitch, form, kind, band, basic depth); turned_diameter [mm]:
    blank OD for an external thread, bore ID for an internal one, as measured; tip [mm];
    aim_pd [mm], default the middle of the band.
    External: (OD − PD)/2 + t; internal (feeds outward): (PD − ID)/2 + t, t = tip beyond the
    pitch line.
    References: ISO 68-1 basic profile; see ``tip_beyond_pitch_line``.
    """
    spec = limits.spec
    internal = not spec.is_external
    aim = limits.pd_mid if aim_pd is None else float(aim_pd)
    if not (turned_diameter > 0 and math.isfinite(turned_diameter)):
        raise InvalidEntry("Enter the measured diameter of the turned surface (greater than 0).")
    what = "bore" if internal else "blank"
    if internal and turned_diameter >= aim:
        raise InvalidEntry(f"The bore ({turned_diameter:.3f} mm) is not smaller than the pitch "
                           f"diameter aimed at ({aim:.3f} mm): check the entry or the thread.")
    if not internal and turned_diameter <= aim:
        raise InvalidEntry(f"The blank ({turned_diameter:.3f} mm) is not larger than the pitch "
                           f"diameter aimed at ({aim:.3f} mm): check the entry or the thread.")
    if (not internal and turned_diameter > 1.5 * limits.basic_major) or (
            internal and turned_diameter < 0.5 * limits.basic_minor):
        raise InvalidEntry(f"The {what} ({turned_diameter:.3f} mm) is far from this thread's "
                           f"size (major {limits.basic_major:.3f} mm): check the number and its "
                           "unit (add mm or in).")
    t = tip_beyond_pitch_line(tip, spec.pitch, spec.form.angle_deg)
    if internal:
        total = (aim - turned_diameter) / 2 + t
        root = aim + 2 * t
    else:
        total = (turned_diameter - aim) / 2 + t
        root = aim - 2 * t
    notes: list[str] = []
    if internal:
        lo, hi = limits.minor_min, limits.minor_max
        if lo is not None and turned_diameter < lo - TOUCH:
            notes.append(f"The bore {turned_diameter:.3f} mm is under the minor min {lo:.3f} mm: "
                         "bore it out first or the nut's crests will be too high.")
        if hi is not None and turned_diameter > hi + TOUCH:
            notes.append(f"The bore {turned_diameter:.3f} mm is over the minor max {hi:.3f} mm: "
                         "the thread will be shallow at the crest.")
    else:
        lo, hi = limits.major_min, limits.major_max
        if hi is not None and turned_diameter > hi + TOUCH:
            notes.append(f"The blank {turned_diameter:.3f} mm is over the major max {hi:.3f} mm: "
                         "turn it down first.")
        if lo is not None and turned_diameter < lo - TOUCH:
            notes.append(f"The blank {turned_diameter:.3f} mm is under the major min {lo:.3f} mm: "
                         "the crests will be too narrow.")
    return ToolDepth(total, float(turned_diameter), aim, t, root, limits.depth, internal,
                     tuple(notes))


# ---------------------------------------------------------------------------------------------
# Thread surfaces over one pitch


@dataclass(frozen=True)
class Surface:
    """One thread surface in an axial section, x from the middle of the external tooth [mm].

    The external thread's material lies below ``y`` (toward the axis), the internal thread's
    above. ``outer_*`` shape the end nearest the major diameter (x = 0), ``inner_*`` the end
    nearest the minor diameter (x = ±P/2): a clip is a flat at that radius, a radius is an arc
    tangent to both flanks. All values in mm.
    """

    pitch: float
    half_angle: float            # [rad]
    pitch_radius: float
    outer_clip: float | None = None
    outer_radius: float = 0.0
    inner_clip: float | None = None
    inner_radius: float = 0.0

    def y(self, x: float) -> float:
        """Return the surface's radius [mm] at axial position x [mm]."""
        p, a = self.pitch, self.half_angle
        u = abs(math.remainder(x, p))            # 0 … P/2
        cot = 1 / math.tan(a)
        y = self.pitch_radius + (p / 4 - u) * cot
        if self.outer_radius > 0:
            top = self.pitch_radius + p / 4 * cot
            if u <= self.outer_radius * math.cos(a):
                yc = top - self.outer_radius / math.sin(a)
                y = min(y, yc + math.sqrt(max(self.outer_radius ** 2 - u * u, 0.0)))
        if self.outer_clip is not None:
            y = min(y, self.outer_clip)
        v = p / 2 - u
        if self.inner_radius > 0:
            bottom = self.pitch_radius - p / 4 * cot
            if v <= self.inner_radius * math.cos(a):
                yc = bottom + self.inner_radius / math.sin(a)
                y = max(y, yc - math.sqrt(max(self.inner_radius ** 2 - v * v, 0.0)))
        if self.inner_clip is not None:
            y = max(y, self.inner_clip)
        return y

    def breakpoints(self) -> list[float]:
        """Return the x values in [0, P/2] where the surface changes from one piece to the next."""
        p, a = self.pitch, self.half_angle
        pts = [0.0, p / 2, p / 4]
        if self.outer_radius > 0:
            pts.append(self.outer_radius * math.cos(a))
        if self.inner_radius > 0:
            pts.append(p / 2 - self.inner_radius * math.cos(a))
        for clip in (self.outer_clip, self.inner_clip):
            if clip is not None:
                pts.append(p / 4 - (clip - self.pitch_radius) * math.tan(a))
        return sorted(min(max(x, 0.0), p / 2) for x in pts)


def _tool_end(tip: ToolTip, pitch: float, a: float, pitch_radius: float,
              outward: bool) -> tuple[float | None, float]:
    """Return (clip, radius) for the end of a surface that this tip cuts."""
    if tip.kind == "radius":
        return None, tip.size
    t = (pitch / 4 - tip.size / 2) / math.tan(a)
    return (pitch_radius + t if outward else pitch_radius - t), 0.0


def _nominal_root_radius(limits: Limits) -> float:
    """Return a root radius for drawing the mating external thread [mm]."""
    form, p = limits.spec.form, limits.spec.pitch
    if form.root_radius > 0:
        return form.root_radius * p
    return form.height / 6 * p   # ISO 68-1 nominal external root radius H/6


def _radial_clearance(limits: Limits) -> float:
    """Return a power thread's crest clearance on radius [mm]: ISO 2904 ac is given on radius
    (D4 = d + 2ac), ASME B1.5's major and minor clearances on diameter."""
    if not limits.clearance:
        return 0.0
    return limits.clearance if limits.spec.form.angle_deg == 30 else limits.clearance / 2


def _nominal_root_tip(limits: Limits) -> ToolTip:
    """Return the tip of the mating external thread's nominal root (a flat for power forms)."""
    if _is_power(limits):
        return ToolTip("flat", _basic_root_flat(limits))
    return ToolTip("radius", _nominal_root_radius(limits))


def external_surface(limits: Limits, pd: float, crest_diameter: float,
                     tip: ToolTip | None = None) -> Surface:
    """Return the external thread's surface at pitch diameter ``pd`` [mm].

    crest_diameter [mm]: the turned OD (crest flat); tip: the tool that cut the root (None: the
    standard's nominal root). Crest rounded where the form is (BS 84, BS 93).
    References: ISO 68-1; BS 84; BS 93.
    """
    spec = limits.spec
    a, p = spec.form.half_angle_rad, spec.pitch
    tip = tip or _nominal_root_tip(limits)
    clip, radius = _tool_end(tip, p, a, pd / 2, outward=False)
    return Surface(p, a, pd / 2, outer_clip=crest_diameter / 2,
                   outer_radius=spec.form.crest_radius * p, inner_clip=clip, inner_radius=radius)


def internal_surface(limits: Limits, pd: float, crest_diameter: float,
                     tip: ToolTip | None = None) -> Surface:
    """Return the internal thread's surface at pitch diameter ``pd`` [mm].

    crest_diameter [mm]: the bore (the nut's crest, its minor diameter); tip: the tool that cut
    the root (None: the basic root, a flat at the basic major or the form's rounding).
    References: ISO 68-1; BS 84; BS 93.
    """
    spec = limits.spec
    form, a, p = spec.form, spec.form.half_angle_rad, spec.pitch
    if tip is None:
        clip, radius = limits.basic_major / 2, form.crest_radius * p
        if spec.is_external and _is_power(limits):
            clip += _radial_clearance(limits)     # the nut's root clears the screw's crest
    else:
        clip, radius = _tool_end(tip, p, a, pd / 2, outward=True)
    return Surface(p, a, pd / 2, outer_clip=clip, outer_radius=radius,
                   inner_clip=crest_diameter / 2, inner_radius=form.root_radius * p)


def overlap(external: Surface, internal: Surface, samples: int = 400) -> tuple[float, float]:
    """Return (largest overlap, x where it is) [mm]: how far the external surface stands above
    the internal one at worst (≤ 0 means clear by that much).

    Sampled on a uniform grid over half a pitch plus both surfaces' breakpoints, where the
    worst case of lines, flats and arcs lies.
    References: plane geometry.
    """
    p = external.pitch
    xs = set(external.breakpoints()) | set(internal.breakpoints())
    xs |= {p / 2 * i / samples for i in range(samples + 1)}
    best, where = -math.inf, 0.0
    for x in sorted(xs):
        d = external.y(x) - internal.y(x)
        if d > best:
            best, where = d, x
    return best, where


# ---------------------------------------------------------------------------------------------
# The picture


BOLT, NUT, BOTH, GAP, PITCH_LINE = "▒", "░", "█", " ", "·"


@dataclass(frozen=True)
class ProfilePicture:
    """Both thread surfaces over one pitch, for a screen to draw (x along the axis, y radial, mm).

    ``interference`` holds (x, y_low, y_high) where the external thread's material stands above
    the internal thread's surface.
    """

    pitch: float
    external: tuple[tuple[float, float], ...]
    internal: tuple[tuple[float, float], ...]
    interference: tuple[tuple[float, float, float], ...]
    cut: str                      # which of the two this tool cuts: 'external' or 'internal'
    pitch_radius: float           # [mm] the aim pitch line

    def render_profiles(self, width: int, height: int) -> list[str]:
        """Return ``height`` text lines of ``width`` characters: ▒ external, ░ internal,
        █ where they overlap, · the pitch line, space the gap between them."""
        if width < 4 or height < 3:
            raise InvalidEntry("The profile picture needs at least 4 columns and 3 lines.")
        ys = [y for _, y in self.external] + [y for _, y in self.internal]
        lo, hi = min(ys), max(ys)
        span = (hi - lo) or 1.0
        lo, hi = lo - span * 0.05, hi + span * 0.05
        ext = [_interp(self.external, -self.pitch / 2 + self.pitch * (c + 0.5) / width)
               for c in range(width)]
        nut = [_interp(self.internal, -self.pitch / 2 + self.pitch * (c + 0.5) / width)
               for c in range(width)]
        pitch_row = round((hi - self.pitch_radius) / (hi - lo) * (height - 1))
        lines = []
        for r in range(height):
            top = hi - (hi - lo) * r / height
            bottom = hi - (hi - lo) * (r + 1) / height
            mid = (top + bottom) / 2
            row = []
            for c in range(width):
                in_bolt = mid <= ext[c]
                in_nut = mid >= nut[c]
                if in_bolt and in_nut:
                    row.append(BOTH)
                elif ext[c] > nut[c] + TOUCH and bottom <= ext[c] and top >= nut[c]:
                    row.append(BOTH)      # a thin overlap inside one cell
                elif in_bolt:
                    row.append(BOLT)
                elif in_nut:
                    row.append(NUT)
                else:
                    row.append(PITCH_LINE if r == pitch_row else GAP)
            lines.append("".join(row))
        return lines


def _interp(points: tuple[tuple[float, float], ...], x: float) -> float:
    for (x0, y0), (x1, y1) in zip(points, points[1:]):
        if x0 <= x <= x1:
            return y0 if x1 == x0 else y0 + (y1 - y0) * (x - x0) / (x1 - x0)
    return points[0][1] if x < points[0][0] else points[-1][1]


def _picture(ext: Surface, nut: Surface, cut: str, pitch_radius: float,
             samples: int = 120) -> ProfilePicture:
    p = ext.pitch
    half = set(ext.breakpoints()) | set(nut.breakpoints()) | {p / 2 * i / samples
                                                             for i in range(samples + 1)}
    xs = sorted({-x for x in half} | half)
    e = tuple((x, ext.y(x)) for x in xs)
    n = tuple((x, nut.y(x)) for x in xs)
    bad = tuple((x, yn, ye) for (x, ye), (_, yn) in zip(e, n) if ye > yn + TOUCH)
    return ProfilePicture(p, e, n, bad, cut, pitch_radius)


# ---------------------------------------------------------------------------------------------
# The form check


@dataclass(frozen=True)
class ToolCheck:
    """Whether the tip's form suits the thread, and the picture of the two profiles."""

    ok: bool
    messages: tuple[str, ...]
    interference: float           # [mm] radial overlap with the mating thread, 0.0 when clear
    clearance: float              # [mm] least radial gap to the mating thread (negative: overlap)
    root_radius_min: float | None  # [mm] the rule applied, if any
    root_radius_max: float | None
    largest_clear_radius: float | None  # [mm] biggest nose radius that would clear, when fouling
    picture: ProfilePicture


def _root_rule(limits: Limits) -> tuple[float | None, float | None]:
    if not limits.spec.is_external:
        return None, None
    return limits.root_radius_min, limits.root_radius_max


def check_tool(limits: Limits, tip: ToolTip, aim_pd: float | None = None,
               turned_diameter: float | None = None, mating: Limits | None = None) -> ToolCheck:
    """Return the form check of ``tip`` for this thread at ``aim_pd``.

    limits: the thread to cut; tip [mm]; aim_pd [mm] (default mid band); turned_diameter [mm]
    (blank OD or bore ID; default the major max / minor min); mating: the mating thread's limits
    (default its basic size — the maximum-material size with no allowance, the worst any class
    allows). External: root radius rules (Limits.root_radius_min/max), the root below the minor
    max, and clear of the nut's crest at its minimum minor and PD. Internal: the root the tip cuts
    clear of the screw's crest at its major max and PD max.
    References: ISO 965-1 (root ≥ 0.125P); ASME B1.1 (UNR 0.108P–0.144P; UN root below minor
    max); BS 84 (r = 0.137329P); BS 93 (r = 0.180835P); ISO 68-1 basic profile.
    """
    spec = limits.spec
    p = spec.pitch
    if spec.form.angle_deg <= 0:
        raise InvalidEntry("A square thread's tool is a square-nosed parting-style tool as wide "
                           f"as the groove ({p / 2:.3f} mm at basic); there is no flank to draw "
                           "against the mating thread.")
    aim = limits.pd_mid if aim_pd is None else float(aim_pd)
    t = tip_beyond_pitch_line(tip, p, spec.form.angle_deg)
    fails: list[str] = []
    warns: list[str] = []
    goods: list[str] = []
    rmin, rmax = _root_rule(limits)
    internal = not spec.is_external
    if not internal:
        if rmin is not None or rmax is not None:
            single = rmin is not None and rmax is not None and abs(rmax - rmin) < TOUCH
            lo = rmin * (1 - SINGLE_RADIUS_TOLERANCE) if single else rmin
            hi = rmax * (1 + SINGLE_RADIUS_TOLERANCE) if single else rmax
            want = (f"{rmin:.3f} mm" if single else
                    f"{rmin:.3f} to {rmax:.3f} mm" if rmin is not None and rmax is not None else
                    f"at least {rmin:.3f} mm" if rmin is not None else f"at most {rmax:.3f} mm")
            if tip.kind == "flat":
                fails.append(f"This thread needs a rounded root (radius {want}); a flat tip leaves "
                             "sharp corners. Grind a nose radius.")
            elif lo is not None and tip.size < lo - TOUCH:
                fails.append(f"Tip radius {tip.size:.3f} mm is under the root radius rule "
                             f"({want}). Grind a larger radius.")
            elif hi is not None and tip.size > hi + TOUCH:
                fails.append(f"Tip radius {tip.size:.3f} mm is over the root radius rule "
                             f"({want}). Grind a smaller radius.")
            else:
                goods.append(f"Tip radius {tip.size:.3f} mm meets the root radius rule ({want}).")
        elif spec.family == "unified" and tip.kind == "flat" and tip.size < p / 8 - TOUCH:
            # from memory: ASME B1.1 UN design form has a root flat of P/8.
            warns.append(f"Tip flat {tip.size:.3f} mm is narrower than P/8 = {p / 8:.3f} mm "
                         "(the UN design root flat, from memory): a sharper root is weaker.")
        root = aim - 2 * t
        if limits.minor_max is not None and root > limits.minor_max + TOUCH:
            fails.append(f"The root would be at {root:.3f} mm, above the minor max "
                         f"{limits.minor_max:.3f} mm: use a smaller tip.")
        crest = turned_diameter if turned_diameter is not None else (
            limits.major_max if limits.major_max is not None else limits.basic_major)
        ext = external_surface(limits, aim, crest, tip)
        if mating is not None:
            nut_pd = mating.pd_min
            nut_minor = mating.minor_min if mating.minor_min is not None else mating.basic_minor
        else:
            nut_pd, nut_minor = limits.basic_pd, _internal_basic_minor(limits)
        nut = internal_surface(limits, nut_pd, nut_minor, None)
        mate_text = f"the nut at its minimum minor {nut_minor:.3f} mm and PD {nut_pd:.3f} mm"
    else:
        crest = turned_diameter if turned_diameter is not None else (
            limits.minor_min if limits.minor_min is not None else limits.basic_minor)
        nut = internal_surface(limits, aim, crest, tip)
        if mating is not None:
            bolt_pd = mating.pd_max
            bolt_major = mating.major_max if mating.major_max is not None else mating.basic_major
        else:
            bolt_pd, bolt_major = limits.basic_pd, limits.basic_major
        ext = external_surface(limits, bolt_pd, bolt_major, None)
        mate_text = (f"the screw's crest at its major max {bolt_major:.3f} mm and PD "
                     f"{bolt_pd:.3f} mm")
    worst, _ = overlap(ext, nut)
    interference = max(worst, 0.0) if worst > TOUCH else 0.0
    largest = None
    if interference > 0:
        if _is_power(limits):
            fix = f" Grind the flat to the standard {form_tip_flat(limits):.3f} mm."
        else:
            largest = _largest_clear_radius(limits, aim, ext, nut, internal)
            fix = (f" Regrind to a radius of at most {largest:.3f} mm." if largest is not None
                   else " Regrind the tip.")
        where = "root the tip cuts in the nut" if internal else "root the tip leaves"
        fails.append(f"The {where} fouls {mate_text} by {interference:.3f} mm (on radius) "
                     f"before the thread is cut.{fix}")
    clearance = -worst if abs(worst) > TOUCH else 0.0     # touching: 0, not −0
    if interference <= 0:
        goods.append(f"The root clears {mate_text} by {max(clearance, 0.0):.3f} mm.")
    picture = _picture(ext, nut, "internal" if internal else "external", aim / 2)
    messages = tuple(["Fails: " + m for m in fails] + ["Warning: " + m for m in warns]
                     + ["OK: " + m for m in goods])
    return ToolCheck(not fails, messages, interference, clearance, rmin, rmax, largest, picture)


def _internal_basic_minor(limits: Limits) -> float:
    """Return the basic minor diameter of the mating nut (D1 = d − 2·depth of the basic form)."""
    return limits.basic_major - limits.spec.form.minor_offset * limits.spec.pitch


def _largest_clear_radius(limits: Limits, aim: float, ext: Surface, nut: Surface,
                          internal: bool) -> float | None:
    """Return the largest nose radius [mm] that would clear the mating surface, by bisection."""
    p, form = limits.spec.pitch, limits.spec.form
    hi = largest_tip("radius", p, form.angle_deg) * 0.999
    lo = 0.0

    def clears(r: float) -> bool:
        tip = ToolTip("radius", r)
        if internal:
            cut = Surface(p, nut.half_angle, nut.pitch_radius, None, r, nut.inner_clip,
                          nut.inner_radius)
            return overlap(ext, cut, 100)[0] <= TOUCH
        cut = Surface(p, ext.half_angle, ext.pitch_radius, ext.outer_clip, ext.outer_radius,
                      None, tip.size)
        return overlap(cut, nut, 100)[0] <= TOUCH

    if not clears(lo):
        return None
    for _ in range(40):
        mid = (lo + hi) / 2
        if clears(mid):
            lo = mid
        else:
            hi = mid
    return lo


# ---------------------------------------------------------------------------------------------
# Power threads: the flat-nosed tool, its side clearances and the helix


#: A flat this much wider than the groove at the root is still taken as fitting [mm] (a
#: 0.0001 in entry step, and what a ground flat is held to). Our own tolerance, no source.
FLAT_TOLERANCE = 0.005

#: Side clearance wanted beyond the helix angle on each flank [deg]. Common practice, no source
#: (texts give 2° to 5°; a larger one weakens the edge).
WORKING_CLEARANCE_DEG = 3.0


def _is_power(limits: Limits) -> bool:
    from shopterm.cutting.wires import is_power_form
    return is_power_form(limits.spec.form)


def form_tip_flat(limits: Limits) -> float:
    """Return the flat [mm] at the tip of the tool that cuts this thread's root.

    Limits.tip_flat where the standard gives it (ISO 2904 root width at d3; ASME B1.5
    0.3707p − 0.259 × clearance); else the basic form's flat at the root, P·2·root_trunc·tan a
    (0.366P for 30°, 0.3707P for 29°), and P/2 for a square thread.
    References: ISO 2904; ASME B1.5; square thread: common practice, no source.
    """
    return limits.tip_flat if limits.tip_flat is not None else _basic_root_flat(limits)


def _basic_root_flat(limits: Limits) -> float:
    """Return the basic form's flat at the root [mm]: 2·root_trunc·P·tan a, P/2 when square."""
    form, p = limits.spec.form, limits.spec.pitch
    if form.angle_deg <= 0:
        return p / 2
    return 2 * form.root_trunc * p * math.tan(form.half_angle_rad)


def helix_angle_deg(lead: float, diameter: float) -> float:
    """Return the helix (lead) angle [deg] of a lead [mm] at a diameter [mm]: atan(L / (π d)).

    References: geometry of the helix; ``Limits.lead_angle_deg`` at the pitch diameter.
    """
    if not (diameter > 0):
        raise InvalidEntry("The diameter must be greater than zero.")
    return math.degrees(math.atan(lead / (math.pi * diameter)))


@dataclass(frozen=True)
class PowerTool:
    """A flat-nosed tool for a power thread: the tip, the helix and each flank's side clearance.

    Angles in degrees, lengths in mm. The leading flank is the tool's side facing the way the
    carriage moves (toward the headstock for a right-hand thread cut toward the chuck); it
    needs the helix angle at the minor diameter plus the working clearance, the trailing flank
    the working clearance less the helix angle at the major diameter (negative: that side may
    lean past square by that much and still clear).
    """

    tip: ToolTip                    # the flat in use
    standard_flat: float            # the standard's flat for this thread
    groove_at_root: float           # width of the groove at the root diameter, at the aim PD
    root_diameter: float            # d3 (external) or D4 (internal) used for that width
    helix_minor_deg: float
    helix_pitch_deg: float
    helix_major_deg: float
    working_clearance_deg: float
    leading_deg: float              # side clearance the leading flank needs
    trailing_deg: float             # side clearance the trailing flank needs
    max_side_clearance_deg: float   # the most the tool has ground (the configured limit)
    leading_side: str               # 'headstock' or 'tailstock'
    notes: tuple[str, ...] = ()

    def lines(self, unit: Unit = "mm") -> tuple[str, ...]:
        """Return the side clearances as short lines (≤ 38 columns) to set beside a picture,
        the flat in ``unit``."""
        toward = "chuck" if self.leading_side == "headstock" else "tailstock"
        res = 0.0001 if unit == "in" else 0.001
        return (f"Helix: minor {self.helix_minor_deg:.2f}°",
                f"       major {self.helix_major_deg:.2f}°",
                f"Leading side (to {toward}):",
                f"  clearance {self.leading_deg:.1f}°",
                "Trailing side:",
                f"  clearance {self.trailing_deg:.1f}°",
                f"Flat {format_length(self.tip.size, unit, res)}",
                f"  standard {format_length(self.standard_flat, unit, res)}")


def power_tool(limits: Limits, tip: ToolTip | None = None, *, aim_pd: float | None = None,
               working_clearance_deg: float = WORKING_CLEARANCE_DEG,
               max_side_clearance_deg: float = 15.0) -> PowerTool:
    """Return the flat-nosed tool for a trapezoidal, Acme or square thread, or refuse it.

    limits: the thread (a 30°, 29° or square form); tip: the flat ground (None: the standard
    flat, ``form_tip_flat``); aim_pd [mm] (default the middle of the band);
    working_clearance_deg [deg]; max_side_clearance_deg [deg]: the most side clearance the tool
    has (``Shop.tool_side_clearance_deg``).
    Raises InvalidEntry when: the form is not a power form; the tip is a nose radius; the flat
    is wider than the groove at the root diameter (fed to the root it would cut the flanks
    back); the leading flank needs more clearance than the tool has (lead too steep).
    Side clearance: leading = helix at the minor diameter + working clearance; trailing =
    working clearance − helix at the major diameter (the diameters the flanks work between: a
    screw's root d3 and crest, a nut's bore and root D4).
    References: side clearance rule as given in machine-shop texts (Machinery's Handbook,
    "Thread cutting tools: side clearance"), from memory; ISO 2904 / ASME B1.5 root flats.
    """
    spec = limits.spec
    if not _is_power(limits):
        raise InvalidEntry(f"A flat-nosed power-thread tool is for trapezoidal, Acme and square "
                           f"threads, not a {spec.form.angle_deg:g}° form.")
    if not (0 <= working_clearance_deg < 45) or not (0 < max_side_clearance_deg < 45):
        raise InvalidEntry("Side clearances are in degrees: the working clearance 0 to 45, the "
                           "most the tool has more than 0 and under 45.")
    p, a = spec.pitch, spec.form.half_angle_rad
    standard = form_tip_flat(limits)
    tip = tip or ToolTip("flat", standard)
    if tip.kind != "flat":
        raise InvalidEntry(f"A {spec.form.name} thread has a flat root: grind the tool with a "
                           f"flat tip of {standard:.3f} mm, not a nose radius.")
    aim = limits.pd_mid if aim_pd is None else float(aim_pd)
    if spec.is_external:
        root = limits.minor_max if limits.minor_max is not None else limits.basic_minor
        groove = p / 2 - (aim - root) * math.tan(a)
    else:
        root = limits.major_min if limits.major_min is not None else limits.basic_major
        groove = p / 2 - (root - aim) * math.tan(a)
    where = "d3" if spec.is_external else "D4"
    if tip.size > groove + FLAT_TOLERANCE:
        raise InvalidEntry(
            f"A {tip.size:.3f} mm flat is wider than the groove at the root ({groove:.3f} mm at "
            f"{where} {root:.3f} mm for a pitch diameter of {aim:.3f} mm): fed to the root it "
            f"would cut into the flanks and leave the thread thin. Grind the flat to "
            f"{standard:.3f} mm (at most {groove:.3f} mm).")
    if tip.size <= 0:
        raise InvalidEntry(f"A power-thread tool needs a flat tip: grind it to {standard:.3f} mm.")
    # the smallest and largest diameters the tool's flanks work at: a screw from its root to
    # its crest, a nut from its crest (the bore) to its root
    if spec.is_external:
        minor = root
        major = limits.major_max if limits.major_max is not None else limits.basic_major
    else:
        minor = limits.minor_min if limits.minor_min is not None else limits.basic_minor
        major = root
    h_minor = helix_angle_deg(spec.lead, minor)
    h_major = helix_angle_deg(spec.lead, major)
    leading = h_minor + working_clearance_deg
    trailing = working_clearance_deg - h_major
    side = "headstock" if spec.hand == "RH" else "tailstock"
    if leading > max_side_clearance_deg + 1e-9:
        raise InvalidEntry(
            f"The lead is too steep for this tool: the leading flank needs {leading:.1f}° of "
            f"side clearance (helix {h_minor:.1f}° at the minor diameter + "
            f"{working_clearance_deg:g}° working clearance), the tool has at most "
            f"{max_side_clearance_deg:g}°. Grind the leading side to {leading:.1f}° or set the "
            "tool in a holder tilted to the helix angle, and set side_clearance in [tool].")
    notes: list[str] = []
    if tip.size < standard - FLAT_TOLERANCE:
        notes.append(f"The flat {tip.size:.3f} mm is narrower than the standard "
                     f"{standard:.3f} mm: the root is cut deeper than the standard's "
                     f"({where}), leaving the thread weaker.")
    if trailing < 0:
        notes.append(f"The helix leans the trailing flank away from the tool: that side may be "
                     f"ground up to {-trailing:.1f}° past square and still clear.")
    return PowerTool(tip, standard, groove, root, h_minor, limits.lead_angle_deg, h_major,
                     float(working_clearance_deg), leading, trailing,
                     float(max_side_clearance_deg), side, tuple(notes))


def standard_tip(limits: Limits) -> ToolTip:
    """Return a tip matching the standard's root for this thread (used when none is entered).

    External: the middle of the root-radius rule where the standard gives one (ISO 965-1 minimum
    0.125P: the ISO 68-1 nominal H/6 = 0.144338P; UNR 0.108P–0.144P: 0.126P; BS 84, BS 93: their
    radius); otherwise (UN flat root) the design root flat P/8 (from memory). Internal: the
    form's crest rounding (BS 84, BS 93), else the basic flat P/8 at the basic major.
    References: ISO 68-1; ISO 965-1; ASME B1.1; BS 84; BS 93.
    """
    spec, p = limits.spec, limits.spec.pitch
    if _is_power(limits):
        return ToolTip("flat", form_tip_flat(limits))
    if spec.is_external:
        lo, hi = limits.root_radius_min, limits.root_radius_max
        if lo is not None and hi is not None:
            return ToolTip("radius", (lo + hi) / 2)
        if lo is not None:
            return ToolTip("radius", max(lo, spec.form.height / 6 * p))
        if spec.form.root_radius > 0:
            return ToolTip("radius", spec.form.root_radius * p)
        return ToolTip("flat", p / 8)
    if spec.form.crest_radius > 0:
        return ToolTip("radius", spec.form.crest_radius * p)
    return ToolTip("flat", p / 8)
