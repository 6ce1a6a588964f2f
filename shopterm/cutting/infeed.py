"""Infeed methods: which slide feeds, at what angle, and how to set it on this lathe's scale.

- radial: the cross-slide feeds straight in; both flanks cut at once.
- flank: the compound at half the form angle from the cross-slide; the tool cuts on one flank.
- modified: the compound at half the form angle less a small offset (0.5° by default), so the
  trailing flank gets a light skim — 29.5° for 60°, 27° for 55°.
- alternating: for coarse pitches. The compound is swung parallel to the bed and moves the tool
  along the work; the cross-slide feeds the depth; each pass the compound shifts the tool toward
  the other flank by the depth just fed × tan(half angle − offset), so the passes cut the two
  flanks in turn and the groove stays one V of the tool's shape. Each pass the tool slides
  along the flank it left last time, so the groove's two flanks only ever move outward and
  end where the last pass puts them: the same holds for a flat-nosed tool in a trapezoidal or
  Acme groove (its flanks are at the form angle; its flat finishes the bottom on the last pass).
- a square thread (0°) is fed radially only.

Compound travel for a radial depth h at angle θ from the cross-slide: h / cos θ.

References: US Navy machinery training manual (29.5° for 60° threads); compound travel =
depth / cos angle computed from the geometry (29.5° → 1.14896, 27.5° → 1.12738).
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Literal

from shopterm.cutting.wires import POWER_ANGLES
from shopterm.errors import InvalidEntry

Method = Literal["radial", "flank", "modified", "alternating"]
METHODS: tuple[str, ...] = ("radial", "flank", "modified", "alternating")
METHOD_TITLES = {
    "radial": "radial (cross-slide straight in)",
    "flank": "flank (compound at half the form angle)",
    "modified": "modified flank (compound at half the form angle less the offset)",
    "alternating": "alternating flank (cross-slide in, compound shifts side to side)",
}
DEFAULT_OFFSET_DEG = 0.5


def compound_factor(angle_deg: float) -> float:
    """Return compound travel per unit of radial depth, 1 / cos(angle).

    angle_deg: the compound's true angle from the cross-slide direction [deg], 0 ≤ angle < 90.
    References: computed, travel = radial / cos θ (29.5° → 1.14896, 27.5° → 1.12738).
    """
    if not (0 <= angle_deg < 90) or not math.isfinite(angle_deg):
        raise InvalidEntry(f"A compound angle of {angle_deg:g}° cannot feed in: give the angle "
                           "from the cross-slide, at least 0 and under 90 (29.5 for 60° threads).")
    return 1 / math.cos(math.radians(angle_deg))


@dataclass(frozen=True)
class InfeedMethod:
    """How the depth is fed: the slide, the compound's angle (true and on this scale), steps."""

    method: str
    form_angle_deg: float
    true_angle_deg: float         # compound from the cross-slide direction [deg]
    scale_reading_deg: float      # what to set on this lathe's compound scale [deg]
    feeds_with: str               # 'compound' or 'cross-slide'
    factor: float                 # feeding-slide travel per radial depth (1 for the cross-slide)
    side_shift_per_depth: float   # alternating: compound shift per radial depth fed, else 0
    steps: tuple[str, ...]
    notes: tuple[str, ...] = ()

    def feed_travel(self, radial: float) -> float:
        """Return the feeding slide's travel [mm] for a radial depth [mm]."""
        return radial * self.factor

    def radial_for(self, travel: float) -> float:
        """Return the radial depth [mm] that a feeding-slide travel [mm] gives (inverse)."""
        return travel / self.factor


def infeed_method(method: str, form_angle_deg: float, *, angle_deg: float | None = None,
                  offset_deg: float = DEFAULT_OFFSET_DEG, lathe=None,
                  internal: bool = False, hand: str = "RH") -> InfeedMethod:
    """Return the infeed method set up for this form and lathe.

    method: radial | flank | modified | alternating; form_angle_deg: included angle [deg];
    angle_deg: the compound's true angle from the cross-slide [deg] (overrides the method's own,
    flank and modified only); offset_deg [deg] for modified and alternating; lathe: a ``Lathe``
    for the compound scale convention (None: scale zeroed along the cross-slide); internal,
    hand: for the wording of the steps.
    References: US Navy machinery training manual.
    """
    if method not in METHODS:
        raise InvalidEntry(f"{method!r} is not an infeed method: use one of {', '.join(METHODS)}.")
    if not (0 <= form_angle_deg < 180):
        raise InvalidEntry(f"A form angle of {form_angle_deg:g}° cannot be cut: use the "
                           "included angle, e.g. 60 or 55.")
    if form_angle_deg == 0 and method != "radial":
        raise InvalidEntry("A square thread has parallel flanks, so there is no flank to feed "
                           "along: feed it radially (method radial) with a tool as wide as the "
                           "groove, or rough with a narrower one and widen it.")
    if form_angle_deg > 0 and not (0 <= offset_deg < form_angle_deg / 2):
        raise InvalidEntry(f"The flank offset must be at least 0 and under half the form angle "
                           f"({form_angle_deg / 2:g}°).")
    half = form_angle_deg / 2
    notes: list[str] = []
    if angle_deg is not None and method in ("radial", "alternating"):
        raise InvalidEntry(f"--angle sets the compound for flank feeding; the {method} method "
                           "sets its own. Leave the angle out or use --method modified.")
    if method == "radial":
        true = 0.0
    elif method == "flank":
        true = half if angle_deg is None else float(angle_deg)
    elif method == "modified":
        true = half - offset_deg if angle_deg is None else float(angle_deg)
    else:
        true = 90.0
    if method in ("flank", "modified"):
        compound_factor(true)      # validates
        if true > half + 1e-9:
            notes.append(f"The compound at {true:g}° is steeper than the flank ({half:g}°): the "
                         "trailing flank will be left stepped. Use {:g}° or less.".format(half))
    scale = true if lathe is None else lathe.compound_scale_reading(true)
    if lathe is None:
        notes.append("No lathe given: the compound scale is taken as reading 0 along the "
                     "cross-slide.")
    # common practice, no source: feed the compound so the tool moves the way the carriage
    # travels (toward the headstock for a right-hand thread), so the leading flank cuts.
    towards = "toward the headstock" if hand == "RH" else "toward the tailstock"
    if method == "radial":
        steps = ("Feed the depth on the cross-slide, straight in; the compound stays put.",
                 "Both flanks cut at once: keep passes light, more so on coarse pitches.")
        feeds, factor, shift = "cross-slide", 1.0, 0.0
    elif method == "alternating":
        tan = math.tan(math.radians(half - offset_deg))
        steps = (f"Swing the compound parallel to the bed (set {scale:g}° on its scale); it now "
                 "moves the tool along the work.",
                 "Each pass: cross-slide in to the setting shown, then the compound to the side "
                 "setting shown, so the tool cuts on one flank.",
                 "The side setting changes sides every pass; always come up to a compound "
                 "setting from the same direction to keep the backlash out.",
                 "Withdraw the cross-slide at the end of the pass; do not touch the compound "
                 "until the tool is clear.")
        feeds, factor, shift = "cross-slide", 1.0, tan
    else:
        steps = (f"Swing the compound {true:g}° from the cross-slide (set {scale:g}° on its "
                 f"scale), turned so that feeding it moves the tool in and {towards}, the way the "
                 "carriage travels.",
                 "Set the cross-slide on its return mark; feed only on the compound.",
                 "Each pass: compound to the setting shown, cut, withdraw the cross-slide, run "
                 "back, return the cross-slide to its mark.")
        feeds, factor, shift = "compound", compound_factor(true), 0.0
    if form_angle_deg in POWER_ANGLES and method in ("radial", "alternating"):
        # common practice, no source: a power thread's wide flat takes a large chip radially.
        notes.append("Power thread: the flat-nosed tool cuts the bottom and both flanks at "
                     "once; keep the passes light, use plenty of cutting oil, and finish with "
                     "the standard-width flat.")
    if internal:
        steps += ("Internal thread: the depth is fed outward, away from the bore's centre; "
                  "withdraw toward the centre.",)
    return InfeedMethod(method, float(form_angle_deg), true, scale, feeds, factor, shift, steps,
                        tuple(notes))
