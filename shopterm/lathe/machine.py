"""The lathe and the kit beside it, as the config describes them (frozen dataclasses).

Lengths in mm unless a field says otherwise. Exact ratios are ``fractions.Fraction``.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from fractions import Fraction
from typing import Literal

from shopterm.errors import InvalidEntry
from shopterm.units import MM_PER_INCH, Unit, from_mm, to_mm

#: 25.4 as an exact fraction: the inch in millimetres.
INCH_MM = Fraction(254, 10)


@dataclass(frozen=True)
class Leadscrew:
    """The leadscrew: pitch exactly, as a Fraction of a millimetre, and tpi when it is inch."""

    pitch_exact: Fraction        # [mm]
    tpi: float | None = None

    @classmethod
    def from_tpi(cls, tpi: float) -> "Leadscrew":
        if tpi <= 0:
            raise InvalidEntry("A leadscrew's threads per inch must be greater than zero.")
        return cls(INCH_MM / Fraction(tpi).limit_denominator(1000), float(tpi))

    @classmethod
    def from_mm(cls, pitch_mm: float) -> "Leadscrew":
        if pitch_mm <= 0:
            raise InvalidEntry("A leadscrew's pitch must be greater than zero.")
        return cls(Fraction(pitch_mm).limit_denominator(10000), None)

    @property
    def pitch(self) -> float:
        """Return the leadscrew pitch [mm]."""
        return float(self.pitch_exact)

    @property
    def is_inch(self) -> bool:
        return self.tpi is not None

    def label(self) -> str:
        return f"{self.tpi:g} tpi" if self.tpi else f"{self.pitch:g} mm"


@dataclass(frozen=True)
class GearboxPosition:
    """One setting of a quick-change box: its label and the ratio it puts in the drive."""

    label: str
    ratio: Fraction


@dataclass(frozen=True)
class Dial:
    """A slide's micrometer dial.

    ``division`` is the value engraved for one division, in ``unit``; a cross-slide dial that
    ``reads_diameter`` takes ``division`` off the work's diameter per division, so the slide
    itself moves half that.
    """

    unit: Unit
    division: float
    divisions: int
    reads_diameter: bool = False

    def __post_init__(self):
        if self.division <= 0:
            raise InvalidEntry("A dial's division value must be greater than zero.")
        if self.divisions <= 0:
            raise InvalidEntry("A dial must have at least one division.")

    @property
    def travel_per_division(self) -> float:
        """Return how far the slide moves for one division [mm]."""
        mm = to_mm(self.division, self.unit)
        return mm / 2 if self.reads_diameter else mm

    def divisions_for(self, travel_mm: float) -> float:
        """Return the (unrounded) divisions that move the slide ``travel_mm`` [mm]."""
        return travel_mm / self.travel_per_division

    def travel_for(self, divisions: float) -> float:
        """Return the slide travel [mm] of ``divisions`` divisions."""
        return divisions * self.travel_per_division

    def rounded(self, travel_mm: float, step: float = 1.0) -> int | float:
        """Return the nearest settable number of divisions (multiples of ``step`` divisions)."""
        n = self.divisions_for(travel_mm) / step
        r = math.floor(abs(n) + 0.5 + 1e-9) * step
        r = math.copysign(r, n) if r else 0
        return int(r) if float(r).is_integer() else r

    def reading(self, divisions_from_zero: float) -> tuple[int, float]:
        """Return (whole turns, mark on the dial) for a count of divisions from the zero."""
        turns, mark = divmod(divisions_from_zero, self.divisions)
        return int(turns), mark

    def describe(self) -> str:
        what = "on diameter" if self.reads_diameter else "on radius"
        return f"{self.division:g} {self.unit}/div, {self.divisions} div/rev, {what}"


@dataclass(frozen=True)
class ThreadDial:
    """The thread-chasing dial: the worm wheel's teeth, the lines engraved, which are numbered."""

    teeth: int
    lines: int
    numbered: tuple[int, ...] = ()


@dataclass(frozen=True)
class WireSize:
    """One set of three wires: the size marked on it and, optionally, as measured [mm]."""

    marked: float
    measured: float | None = None
    label: str = ""

    @property
    def size(self) -> float:
        """Return the diameter to compute with: measured when known, else marked [mm]."""
        return self.measured if self.measured is not None else self.marked


ToolTipKind = Literal["flat", "radius"]


@dataclass(frozen=True)
class ToolTip:
    """The tool's tip: a flat of given width or a nose radius [mm]."""

    kind: ToolTipKind
    size: float

    def __post_init__(self):
        if self.kind not in ("flat", "radius"):
            raise InvalidEntry("A tool tip is either a flat or a radius.")
        if self.size < 0:
            raise InvalidEntry("A tool tip's flat or radius cannot be negative.")


CompoundZero = Literal["cross_slide", "bed"]

#: How a taper attachment's guide bar is graduated: its angle to the lathe's axis in degrees,
#: or the taper it turns on diameter in inches per foot or mm per 100 mm.
AttachmentScale = Literal["deg", "in_per_ft", "mm_per_100mm"]
ATTACHMENT_SCALES: tuple[str, ...] = ("deg", "in_per_ft", "mm_per_100mm")


@dataclass(frozen=True)
class Tailstock:
    """The tailstock's set-over: the value of one line of its scale, and how far it goes.

    ``division`` [mm] is None when the scale has no graduations to set by (set with a dial
    indicator); ``unit`` is the unit the config wrote it in (for showing); ``max_set_over`` [mm]
    is None when not given.
    """

    division: float | None = None
    unit: Unit = "mm"
    max_set_over: float | None = None


@dataclass(frozen=True)
class TaperAttachment:
    """A taper attachment: how its guide bar is graduated, its largest setting (in that
    graduation) and the longest taper it can follow [mm, None when not given]."""

    scale: AttachmentScale
    max_setting: float
    max_travel: float | None = None

    def __post_init__(self):
        if self.scale not in ATTACHMENT_SCALES:
            raise InvalidEntry("A taper attachment is graduated in deg, in_per_ft or "
                               "mm_per_100mm.")
        if not self.max_setting > 0:
            raise InvalidEntry("A taper attachment's largest setting must be greater than zero.")


@dataclass(frozen=True)
class Lathe:
    """One lathe as the user owns it."""

    name: str
    leadscrew: Leadscrew
    cross_dial: Dial
    compound_dial: Dial
    compound_zero: CompoundZero = "cross_slide"
    gears: tuple[tuple[int, int], ...] = ()        # (teeth, how many owned)
    fixed_ratio: Fraction = Fraction(1)             # stud / tumbler ratio in the drive
    gearbox: tuple[GearboxPosition, ...] = ()
    thread_dial: ThreadDial | None = None
    clearance_margin: int = 15                      # compound-train clearance rule [teeth]
    spindle_gear: int | None = None                 # teeth of a gear on the spindle, for indexing
    faceplate_slots: int | None = None              # driving plate slots, for indexing starts
    tailstock: Tailstock | None = None              # set-over scale, for tapers between centres
    taper_attachment: TaperAttachment | None = None
    compound_travel: float | None = None            # the compound slide's travel [mm]

    def compound_scale_reading(self, true_angle_deg: float) -> float:
        """Return what to set on this compound's scale for a true angle from the cross-slide."""
        if self.compound_zero == "cross_slide":
            return true_angle_deg
        return 90.0 - true_angle_deg

    def true_compound_angle(self, scale_reading_deg: float) -> float:
        """Return the true angle from the cross-slide for what this compound's scale reads."""
        if self.compound_zero == "cross_slide":
            return scale_reading_deg
        return 90.0 - scale_reading_deg


@dataclass(frozen=True)
class Shop:
    """Everything from the config that is not the lathe itself."""

    display_units: Unit = "mm"
    theme: str = "shop-bright"
    wires: tuple[WireSize, ...] = ()
    micrometer_resolution: float = 0.001    # [mm]
    tool: ToolTip = field(default_factory=lambda: ToolTip("radius", 0.1))
    #: The most side clearance ground on the threading tool's flanks [deg]; a lead whose
    #: leading flank needs more is refused (power threads). Common practice, no source.
    tool_side_clearance_deg: float = 15.0
