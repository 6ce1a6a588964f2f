"""What a thread is (``ThreadSpec``) and the sizes it must be made to (``Limits``)."""

from __future__ import annotations

import math
from dataclasses import dataclass, field, replace
from typing import Literal

from shopterm.standards.forms import ThreadForm
from shopterm.units import MM_PER_INCH, Unit

Kind = Literal["external", "internal"]
Hand = Literal["RH", "LH"]


@dataclass(frozen=True)
class ThreadSpec:
    """One thread as designated: form, size, pitch, starts, hand, kind and class of fit.

    Lengths in mm. ``tpi`` is set for threads designated by threads per inch.
    ``tol_class`` is the class as the standard writes it (``6g``, ``4h6h``, ``6H``, ``2A``,
    ``3B``, ``medium``, ``close``, ``normal``, ``free``) or None for basic size only.
    """

    family: str                  # "iso", "unified", "whitworth", "ba", "special"
    series: str                  # "M", "MF", "UNC", "UNF", "UNEF", "8-UN", "BSW", "BSF", "ME", "BA", "special"
    size: str                    # as written: "M10", "1/4", "#10", "2BA", "0.750"
    major: float                 # basic major diameter [mm]
    pitch: float                 # [mm]
    form: ThreadForm
    kind: Kind = "external"
    tol_class: str | None = None
    tpi: float | None = None
    starts: int = 1
    hand: Hand = "RH"
    native_unit: Unit = "mm"
    pitch_implied: bool = False  # designation leaves the pitch out (ISO coarse)
    # A special thread's user-given fit: allowance (es, negative for external) and tolerances.
    allowance: float | None = None      # [mm] on pitch and major diameter
    pd_tolerance: float | None = None   # [mm]
    major_tolerance: float | None = None  # [mm]
    extra: tuple[tuple[str, str], ...] = field(default=())  # family-specific flags

    @property
    def lead(self) -> float:
        """Return the lead [mm]: starts × pitch."""
        return self.starts * self.pitch

    @property
    def is_external(self) -> bool:
        return self.kind == "external"

    @property
    def designation(self) -> str:
        """Return the designation written the way the family's standard writes it."""
        from shopterm.standards import format_designation
        return format_designation(self)

    def with_(self, **changes) -> "ThreadSpec":
        """Return a copy with some fields changed."""
        return replace(self, **changes)


@dataclass(frozen=True)
class Limits:
    """Limits of size of one thread, all diameters in mm.

    ``None`` means the standard sets no limit there (e.g. internal major max).
    ``depth`` is the basic thread depth on radius (ISO h3 for external, H1 for internal).
    ``lead_angle_deg`` is the helix angle at the basic pitch diameter: atan(L / (π d2)).
    """

    spec: ThreadSpec
    basic_major: float
    basic_pd: float
    basic_minor: float
    major_max: float | None
    major_min: float | None
    pd_max: float
    pd_min: float
    minor_max: float | None
    minor_min: float | None
    depth: float
    notes: tuple[str, ...] = ()
    root_radius_min: float | None = None   # external root radius rule [mm], where the standard has one
    root_radius_max: float | None = None

    @property
    def lead_angle_deg(self) -> float:
        """Return the lead angle at the basic pitch diameter [deg]."""
        return math.degrees(math.atan(self.spec.lead / (math.pi * self.basic_pd)))

    @property
    def pd_mid(self) -> float:
        """Return the middle of the pitch-diameter band [mm]."""
        return (self.pd_max + self.pd_min) / 2

    @property
    def pd_tolerance(self) -> float:
        """Return the width of the pitch-diameter band [mm]."""
        return self.pd_max - self.pd_min


def inch(value_in: float) -> float:
    """Return a value given in inches in mm (for readable module tables)."""
    return value_in * MM_PER_INCH
