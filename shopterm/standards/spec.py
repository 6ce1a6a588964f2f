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
    ``3B``, ``7e``, ``7H``, ``2G``) or None (basic size, or the family's usual class).
    """

    family: str                  # a key of standards.FAMILIES: "iso", "unified", ... "special"
    series: str                  # "M", "UNC", ..., "BSW", "BA", "Tr", "ACME", "STUB ACME", ...
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
    ``depth`` is the basic thread depth on radius (ISO h3 for external, H1 for internal;
    trapezoidal h3 = H4 = 0.5P + ac; Acme 0.5p + c/2, stub Acme 0.3p + c/2).
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
    #: Power threads: the crest/root clearance the standard adds [mm]: ISO 2904 ac (on radius)
    #: for Tr; the ASME B1.5/B1.8 minor diameter clearance (on diameter: 0.020 in for 10 tpi and
    #: coarser, 0.010 in finer) for Acme; the nut's clearance for a square thread. ``depth``
    #: already includes it. None for forms that have none.
    clearance: float | None = None
    #: Flat at the tip of the tool that cuts this thread's root [mm] (ISO 2904 root width at d3,
    #: ASME B1.5 0.3707p - 0.259 x clearance); None where the root is rounded or not a flat.
    tip_flat: float | None = None
    #: Tapered threads: the taper and where the thread is gauged; None for parallel threads.
    #: The diameters above are then those at the gauge plane.
    taper: "Taper | None" = None

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


@dataclass(frozen=True)
class Taper:
    """A tapered thread's taper and where it is gauged. Lengths in mm.

    ``per_unit_on_diameter`` is the change of diameter per unit of length (1/16 for ISO 7-1 and
    ASME B1.20.1). ``gauge_plane_from_end`` is the distance from the small end of an external
    thread to its gauge plane (ISO 7-1 gauge length; NPT: L1, where E1 lies).
    ``gauge_diameter`` is the diameter the standard gauges there (ISO 7-1: the major diameter
    at the gauge plane; NPT: None, E0 and E1 given instead). ``gauge_plane_tolerance`` is the
    ± axial position allowed for the gauge plane [mm].

    An internal tapered thread is gauged at the face of the fitting: ``gauge_plane_from_end``
    is then 0, measured from the opening (the large end). ``L1`` is the hand-tight engagement
    (ISO 7-1: the gauge length), ``L2`` the effective thread (ISO 7-1: the minimum useful
    thread of the external thread; None where not built in), ``L3`` the wrench make-up.
    """

    per_unit_on_diameter: float
    gauge_plane_from_end: float
    gauge_plane_tolerance: float
    gauge_diameter: float | None = None
    E0: float | None = None          # pitch diameter at the small end (NPT) [mm]
    E1: float | None = None          # pitch diameter at the hand-tight plane (NPT) [mm]
    L1: float | None = None          # hand-tight engagement [mm]
    L2: float | None = None          # effective (useful) thread length [mm]
    L3: float | None = None          # wrench make-up beyond hand-tight (NPT) [mm]

    @property
    def half_angle_deg(self) -> float:
        """Return the angle of the taper to the axis [deg]: atan(k / 2)."""
        return math.degrees(math.atan(self.per_unit_on_diameter / 2))

    def diameter_shift(self, distance: float) -> float:
        """Return how much larger a diameter is ``distance`` [mm] further towards the large end."""
        return distance * self.per_unit_on_diameter


def inch(value_in: float) -> float:
    """Return a value given in inches in mm (for readable module tables)."""
    return value_in * MM_PER_INCH
