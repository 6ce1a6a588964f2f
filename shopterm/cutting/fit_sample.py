"""Cut to fit a sample: the target pitch-diameter band from a known-good part, not from a class.

Two cases, both measured over wires on a bolt (a nut cannot be measured over wires):

- cutting a **nut** to fit an existing bolt: the sample is that bolt. The nut's band starts
  ``clearance`` above the bolt's pitch diameter: D2 min = E + c, D2 max = D2 min + band.
- cutting a **bolt** to fit an existing nut: the sample is a bolt that fits that nut well. The
  new bolt's band ends ``clearance`` below the sample's pitch diameter (0 by default: as
  snug as the sample): d2 max = E − c, d2 min = d2 max − band.

The result is a special thread (``shopterm.standards.special.make``) of the same form, pitch
(or tpi), starts and nominal size, whose allowance and pitch-diameter tolerance put its limits
exactly on that band; its designation round-trips through ``parse``, so plan, counter and
readings work against it unchanged. Where the band lies on the far side of the basic pitch
diameter (more metal than basic), the special's nominal diameter is moved by that amount so the
allowance stays zero or more, and a note says so.

References: three-wire relation, ``shopterm.cutting.wires`` (NBS Handbook H28);
special threads, ``shopterm.standards.special`` (ISO 68-1, BS 84, BS 93 basic forms).
"""

from __future__ import annotations

import math
from dataclasses import dataclass, replace
from typing import Sequence

from shopterm.cutting.wires import (MEASURE_CAUTION, PitchFromWires, check_reading,
                                    read_pitch_diameter, require_wire, summarise_readings)
from shopterm.errors import InvalidEntry
from shopterm.standards import limits as thread_limits
from shopterm.standards.special import make
from shopterm.standards.spec import Kind, Limits, ThreadSpec

#: Pitch-diameter clearance of a nut cut to an existing bolt [mm]. Common practice, no source
#: (of the order of the ISO 6g fundamental deviation on M6–M12, 0.026–0.034 mm, plus a little).
DEFAULT_NUT_CLEARANCE = 0.05
#: A bolt cut to match a bolt that fits the nut: as snug as the sample [mm].
DEFAULT_BOLT_CLEARANCE = 0.0
#: Width of the target band when none is given [mm]. Common practice, no source.
DEFAULT_BAND = 0.05
#: The micrometer step assumed for the spread check of several sample readings [mm].
DEFAULT_RESOLUTION = 0.001

SOURCE_NOTE = "Target from a sample"


@dataclass(frozen=True)
class SampleTarget:
    """A job target taken from a measured sample: the special spec and its limits [mm]."""

    spec: ThreadSpec            # the special thread to cut (plan, counter, readings use it)
    limits: Limits              # its limits, with the note saying where the target came from
    cut: Kind                   # what is being cut: 'internal' (a nut) or 'external' (a bolt)
    sample_pd: float            # pitch diameter of the sample bolt
    reading: PitchFromWires | None   # the sample's wire reading, when measured here
    clearance: float
    band: float
    reference: str | None       # the standard thread it stands in for, if given
    notes: tuple[str, ...]

    @property
    def pd_max(self) -> float:
        return self.limits.pd_max

    @property
    def pd_min(self) -> float:
        return self.limits.pd_min

    def record(self) -> dict:
        """Return the payload of a ``thread_chosen`` job event that says the target is a sample's.

        References: ``shopterm.job.events`` (lengths in mm, keys ending ``_mm``).
        """
        out = {"designation": self.spec.designation, "thread_kind": self.cut,
               "target_source": "sample",
               "sample": "mating bolt" if self.cut == "internal" else "bolt that fits the nut",
               "sample_pd_mm": self.sample_pd, "clearance_mm": self.clearance,
               "band_mm": self.band, "pd_max_mm": self.pd_max, "pd_min_mm": self.pd_min,
               "note": " ".join(self.notes)}
        if self.reading is not None:
            out["sample_over_wires_mm"] = self.reading.over_wires
            out["sample_wire_mm"] = self.reading.wire
        if self.reference:
            out["reference"] = self.reference
        return out


def _amount(value, what: str, *, zero_ok: bool) -> float:
    if isinstance(value, bool) or not isinstance(value, (int, float)) or not math.isfinite(value):
        raise InvalidEntry(f"The {what} must be a number in mm.")
    if value < 0 or (value == 0 and not zero_ok):
        raise InvalidEntry(f"The {what} must be {'zero or more' if zero_ok else 'more than zero'}"
                           " (in mm).")
    return float(value)


def check_sample_thread(thread: ThreadSpec) -> None:
    """Raise ``InvalidEntry`` if ``thread`` cannot be cut to a sample here: a tapered thread
    (ISO 7-1 R/Rc, NPT), whose fit is made along its taper (a hand-tight check at the gauge
    plane, ``taper_thread.hand_tight_check``), not by one pitch-diameter band.
    References: ISO 7-1 and ASME B1.20.1 (gauging at the gauge plane).
    """
    if thread_limits(thread.with_(kind="external")).taper is not None:
        raise InvalidEntry(f"{thread.with_(tol_class=None).designation} is a tapered thread: "
                           "it fits along its taper, not to one pitch diameter. Cut it to its "
                           "standard and check it hand-tight against the fitting.")


def sample_pitch_diameter(thread: ThreadSpec, wire: float, readings: float | Sequence[float],
                          resolution: float = DEFAULT_RESOLUTION) -> tuple[PitchFromWires, str]:
    """Return the sample bolt's pitch diameter from readings over wires, and a spread warning.

    thread: the thread the sample is (form, pitch, lead, basic sizes); wire [mm];
    readings [mm] (one or several at the same place, averaged); resolution [mm].
    Raises ``InvalidEntry`` for a wire that does not suit the pitch or an impossible reading.
    References: NBS H28 three-wire method, exact helical-groove model in ``wires``.
    """
    values = [readings] if isinstance(readings, (int, float)) else list(readings)
    summary = summarise_readings(values, resolution)
    require_wire(thread.form, thread.pitch, wire)
    lim = thread_limits(thread.with_(kind="external"))
    check_reading(summary.mean, thread.form, thread.pitch, thread.lead, lim.basic_major,
                  lim.basic_minor, wire)
    return read_pitch_diameter(summary.mean, wire, thread.form, thread.pitch, thread.lead), \
        summary.warning


def target_from_sample(thread: ThreadSpec, cut: Kind, *, sample_pd: float | None = None,
                       wire: float | None = None, readings: float | Sequence[float] | None = None,
                       clearance: float | None = None, band: float = DEFAULT_BAND,
                       resolution: float = DEFAULT_RESOLUTION) -> SampleTarget:
    """Return the special thread whose pitch-diameter band fits the measured sample.

    thread: the thread being copied (a standard designation parsed, or a special) — form,
    pitch or tpi, starts and nominal size; cut: 'internal' (a nut to fit the sample bolt) or
    'external' (a bolt to fit the nut the sample bolt fits); sample_pd [mm] known directly, or
    wire [mm] with readings [mm] over wires on the sample; clearance [mm] on pitch diameter
    (default DEFAULT_NUT_CLEARANCE for a nut, DEFAULT_BOLT_CLEARANCE for a bolt); band [mm]
    width of the target band; resolution [mm] of the micrometer for the spread check.
    Raises ``InvalidEntry`` saying what to enter.
    References: module docstring; ``special.make`` limits (allowance towards less metal).
    """
    if cut not in ("external", "internal"):
        raise InvalidEntry(f"{cut!r} is not a kind of thread: say whether a bolt (external) or a "
                           "nut (internal) is being cut.")
    check_sample_thread(thread)
    if (sample_pd is None) == (readings is None):
        raise InvalidEntry("Give the sample's pitch diameter, or the wire size and the reading "
                           "over wires on the sample bolt, not both.")
    reading = None
    notes: list[str] = []
    if readings is not None:
        if wire is None:
            raise InvalidEntry("Give the wire size used on the sample.")
        reading, warning = sample_pitch_diameter(thread, wire, readings, resolution)
        if warning:
            notes.append(warning)
        e = reading.pd
    else:
        e = _amount(sample_pd, "sample's pitch diameter", zero_ok=False)
    c = _amount(DEFAULT_NUT_CLEARANCE if clearance is None and cut == "internal" else
                DEFAULT_BOLT_CLEARANCE if clearance is None else clearance,
                "fit clearance", zero_ok=True)
    w = _amount(band, "band width", zero_ok=False)
    form, p = thread.form, thread.pitch
    if cut == "internal":
        pd_min = e + c
        pd_max = pd_min + w
    else:
        pd_max = e - c
        pd_min = pd_max - w
    major = thread.major
    basic_pd = major - form.pd_offset * p
    if cut == "external":
        allowance = basic_pd - pd_max
    else:
        allowance = pd_min - basic_pd
    if allowance < 0:
        shift = -allowance
        major = major + shift if cut == "external" else major - shift
        allowance = 0.0
        notes.append(f"The target has more metal than the basic size by {shift:.3f} mm, so the "
                     f"nominal diameter was moved to {major:.3f} mm to keep the band.")
    # An allowance that rounds away in the designation is no allowance.
    if allowance < 1e-9:
        allowance = 0.0
    ref_lim = None
    if thread.family != "special":
        try:
            ref_lim = thread_limits(thread.with_(kind="external"))
        except InvalidEntry:
            ref_lim = None
    major_tol = None
    if cut == "external" and ref_lim is not None and ref_lim.major_max is not None \
            and ref_lim.major_min is not None and ref_lim.major_max > ref_lim.major_min:
        major_tol = ref_lim.major_max - ref_lim.major_min
    spec = make(major, pitch_mm=None if thread.tpi else p, tpi=thread.tpi,
                angle_deg=form.angle_deg, kind=cut, allowance_mm=allowance,
                pd_tolerance_mm=w, major_tolerance_mm=major_tol, starts=thread.starts,
                unit=thread.native_unit)
    if thread.hand != spec.hand:
        spec = spec.with_(hand=thread.hand)
    lim = thread_limits(spec)
    reference = thread.designation if thread.family != "special" else None
    what = ("nut to fit the sample bolt" if cut == "internal"
            else "bolt to fit the nut the sample bolt fits")
    head = (f"{SOURCE_NOTE}: {what}; sample pitch diameter {e:.4f} mm, clearance {c:.3f} mm, "
            f"band {lim.pd_min:.4f}–{lim.pd_max:.4f} mm"
            + (f" (in place of {reference})" if reference else "") + ".")
    if ref_lim is not None and not (ref_lim.pd_min - 1e-9 <= e <= ref_lim.pd_max + 1e-9):
        side = "below" if e < ref_lim.pd_min else "above"
        notes.append(f"The sample's pitch diameter is {side} the {reference} band "
                     f"({ref_lim.pd_min:.4f}–{ref_lim.pd_max:.4f} mm): it is worn or made to "
                     "another fit; the target follows the sample.")
    if reading is not None:
        notes.append(MEASURE_CAUTION)
    all_notes = (head, *notes)
    lim = replace(lim, notes=all_notes + lim.notes)
    return SampleTarget(spec, lim, cut, e, reading, c, w, reference, all_notes)
