"""A taper on *this* lathe: tailstock set-over, taper-attachment setting, compound angle.

A taper is given by ``k``, its change of diameter per unit of length (1/16 for ISO 7-1 and
ASME B1.20.1 pipe threads): its half-angle to the axis is atan(k/2).

- Tailstock set-over, work between centres: set-over = (D − d)/2 × L_work / L_taper, with
  D − d = k × L_taper, so set-over = k/2 × L_work, whatever the taper's length (for 1:16:
  L_work/32). It is the shop-text small-angle formula (Machinery's Handbook, taper turning by
  offsetting the tailstock: offset = taper per foot × L / 24, from memory); the exact offset
  L·sin(atan(k/2)) differs by 0.05 % at 1:16 (computed).
- Taper attachment: the guide bar set to the half-angle, or to the taper on diameter in inches
  per foot (k × 12) or mm per 100 mm (k × 100), as its graduation reads.
- Compound: swung to the half-angle and fed by hand. It turns a short taper (the blank), but
  it cannot follow the taper while the leadscrew drives the carriage: the thread itself needs
  the set-over or the attachment (common practice, no source).

Every length in mm; settings on the attachment in its own graduation.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from shopterm.errors import InvalidEntry, ShoptermError
from shopterm.lathe.machine import Lathe
from shopterm.units import format_length

#: Common practice, no source.
TOOL_SQUARE = ("Set the threading tool square to the work's axis with a centre gauge, not "
               "square to the tapered surface: the flanks of a taper pipe thread are square to "
               "the axis.")

#: Common practice, no source.
COMPOUND_NOTE = ("The compound, fed by hand, turns the blank's taper; it cannot follow the "
                 "taper while the leadscrew drives the carriage, so cut the thread itself with "
                 "the set-over or the taper attachment.")

#: Common practice, no source.
SET_OVER_NOTE = ("Check the set-over with a dial indicator on the tailstock barrel; the "
                 "tailstock's own scale is only a guide. The centres now bear on one edge of "
                 "the centre holes: keep them lubricated and not too tight. Put the tailstock "
                 "back in line after the job.")

_UNIT_NAMES = {"deg": "°", "in_per_ft": " in/ft", "mm_per_100mm": " mm/100 mm"}


def _positive(value: float, what: str) -> float:
    if isinstance(value, bool) or not isinstance(value, (int, float)) \
            or not math.isfinite(value) or value <= 0:
        raise InvalidEntry(f"The {what} must be a length greater than zero.")
    return float(value)


def _check_k(k: float) -> float:
    if isinstance(k, bool) or not isinstance(k, (int, float)) or not math.isfinite(k) \
            or not 0 < k < 1:
        raise InvalidEntry("The taper is the change of diameter per unit of length, between 0 "
                           "and 1: 1/16 for pipe threads (1:16).")
    return float(k)


def half_angle_deg(k: float) -> float:
    """Return the angle of a taper to its axis [deg]: atan(k / 2). k: diameter change per length."""
    return math.degrees(math.atan(_check_k(k) / 2))


def _f(mm: float, unit: str) -> str:
    return format_length(mm, unit, 0.0001 if unit == "in" else 0.01)


# ---- tailstock set-over -------------------------------------------------------------------------

@dataclass(frozen=True)
class SetOver:
    """The tailstock set-over for a taper turned between centres. Lengths [mm]."""

    k: float
    work_length: float          # between the centres' points (overall length of the work)
    taper_length: float
    diameter_change: float      # D − d over the taper's length
    set_over: float             # offset of the tailstock centre from the lathe's axis
    divisions: float | None     # on the tailstock's scale (None: it has no graduations)
    scale_unit: str             # the unit the scale is read in ("mm" or "in")
    by_indicator: bool          # no graduations to set by: set it with a dial indicator
    direction: str
    text: str
    note: str = SET_OVER_NOTE


def set_over(lathe: Lathe | None, k: float, work_length: float,
             taper_length: float | None = None) -> SetOver:
    """Return the tailstock set-over for a taper ``k`` on work ``work_length`` [mm] long.

    taper_length [mm]: the tapered part (default the whole work). Raises ``InvalidEntry`` when
    the taper is longer than the work or the set-over exceeds the config's ``max_set_over``.
    References: set-over = (D − d)/2 × L_work / L_taper (Machinery's Handbook, from memory).
    """
    k = _check_k(k)
    work = _positive(work_length, "work's length between centres")
    taper = work if taper_length is None else _positive(taper_length, "taper's length")
    if taper > work + 1e-9:
        raise InvalidEntry(f"The taper ({taper:.1f} mm) cannot be longer than the work "
                           f"({work:.1f} mm) between centres: check the two lengths.")
    change = k * taper
    offset = change / 2 * work / taper
    tail = lathe.tailstock if lathe is not None else None
    unit = tail.unit if tail is not None else "mm"
    if tail is not None and tail.max_set_over is not None and offset > tail.max_set_over + 1e-9:
        raise InvalidEntry(f"The set-over wanted, {_f(offset, unit)}, is more than this "
                           f"tailstock's {_f(tail.max_set_over, unit)}: use the taper "
                           "attachment, or shorter work between centres.")
    divisions = offset / tail.division if tail is not None and tail.division else None
    direction = ("Offset the tailstock towards the tool for a taper that is smallest at the "
                 "tailstock end (away from the tool for one smallest at the headstock).")
    if divisions is not None:
        text = (f"Set the tailstock over {_f(offset, unit)} ({round(divisions, 2):g} lines on its "
                f"scale).")
    else:
        text = f"Set the tailstock over {_f(offset, unit)}, read on a dial indicator."
    return SetOver(k, work, taper, change, offset, divisions, unit, divisions is None,
                   direction, text)


# ---- taper attachment ---------------------------------------------------------------------------

@dataclass(frozen=True)
class AttachmentSetting:
    """The taper attachment's guide bar setting for a taper."""

    k: float
    half_angle_deg: float
    setting: float              # in the attachment's graduation
    scale: str                  # "deg", "in_per_ft" or "mm_per_100mm"
    per_foot_in: float          # the taper on diameter in inches per foot
    per_100_mm: float           # the taper on diameter in mm per 100 mm
    taper_length: float         # [mm]
    text: str


def attachment_reading(k: float, scale: str) -> float:
    """Return what a guide bar graduated in ``scale`` is set to for taper ``k``.

    scale: 'deg' (the bar's angle to the axis: atan(k/2)), 'in_per_ft' (12 k: inches of
    diameter per foot), 'mm_per_100mm' (100 k). References: definition of taper per foot.
    """
    k = _check_k(k)
    if scale == "deg":
        return half_angle_deg(k)
    if scale == "in_per_ft":
        return 12 * k
    if scale == "mm_per_100mm":
        return 100 * k
    raise InvalidEntry("A taper attachment is graduated in deg, in_per_ft or mm_per_100mm.")


def attachment_setting(lathe: Lathe | None, k: float, taper_length: float) -> AttachmentSetting:
    """Return the taper attachment's setting for taper ``k`` over ``taper_length`` [mm].

    Raises ``InvalidEntry`` when the config has no ``[taper_attachment]``, or the setting or
    the length is beyond it. References: ``attachment_reading``.
    """
    k = _check_k(k)
    length = _positive(taper_length, "taper's length")
    att = lathe.taper_attachment if lathe is not None else None
    if att is None:
        raise InvalidEntry("No taper attachment in the config ([taper_attachment]): use the "
                           "tailstock set-over, or add the attachment to the config.")
    setting = attachment_reading(k, att.scale)
    shown = _UNIT_NAMES[att.scale]
    if setting > att.max_setting + 1e-9:
        raise InvalidEntry(f"This taper needs {setting:.4g}{shown} on the taper attachment, more "
                           f"than its {att.max_setting:g}{shown}: use the tailstock set-over.")
    if att.max_travel is not None and length > att.max_travel + 1e-9:
        raise InvalidEntry(f"The taper ({length:.1f} mm) is longer than the taper attachment's "
                           f"travel ({att.max_travel:.1f} mm): use the tailstock set-over.")
    text = f"Set the taper attachment to {setting:.4g}{shown}."
    return AttachmentSetting(k, half_angle_deg(k), setting, att.scale, 12 * k, 100 * k,
                             length, text)


# ---- compound ---------------------------------------------------------------------------------

@dataclass(frozen=True)
class CompoundTaper:
    """The compound swung to the taper's half-angle, for a short taper fed by hand."""

    k: float
    half_angle_deg: float
    true_angle_deg: float       # the compound's true angle from the cross-slide
    scale_reading_deg: float    # what this compound's angle scale is set to
    travel: float               # compound travel over the taper's length [mm]
    text: str
    note: str = COMPOUND_NOTE


def compound_taper(lathe: Lathe | None, k: float, taper_length: float) -> CompoundTaper:
    """Return the compound setting that turns taper ``k`` over ``taper_length`` [mm].

    The compound lies at the half-angle α to the lathe's axis, 90° − α from the cross-slide;
    its travel over the taper is L / cos α. Raises ``InvalidEntry`` when that is more than the
    config's compound travel. References: trigonometry; compound zero as the config says.
    """
    k = _check_k(k)
    length = _positive(taper_length, "taper's length")
    alpha = half_angle_deg(k)
    true = 90.0 - alpha
    reading = lathe.compound_scale_reading(true) if lathe is not None else true
    travel = length / math.cos(math.radians(alpha))
    limit = lathe.compound_travel if lathe is not None else None
    if limit is not None and travel > limit + 1e-9:
        raise InvalidEntry(f"The compound would travel {travel:.1f} mm over this taper, more "
                           f"than its {limit:.1f} mm: use the tailstock set-over or the taper "
                           "attachment.")
    text = (f"Swing the compound to {reading:.4f}° on its scale ({alpha:.4f}° to the lathe's "
            f"axis) and feed it by hand.")
    return CompoundTaper(k, alpha, true, reading, travel, text)


# ---- all three, for a screen ---------------------------------------------------------------------

@dataclass(frozen=True)
class TaperSetups:
    """Every way this lathe can make a taper, each with its refusal when it cannot."""

    k: float
    half_angle_deg: float
    set_over: SetOver | None
    set_over_refused: str
    attachment: AttachmentSetting | None
    attachment_refused: str
    compound: CompoundTaper | None
    compound_refused: str
    tool_square: str = TOOL_SQUARE


def taper_setups(lathe: Lathe | None, k: float, work_length: float | None,
                 taper_length: float) -> TaperSetups:
    """Return the set-over, attachment and compound settings for a taper (or why not).

    k: diameter change per unit length; work_length [mm] between centres (None: the work is
    not between centres, no set-over); taper_length [mm]. A bad ``k`` or ``taper_length`` is
    raised (``InvalidEntry``); a method the lathe cannot use is named with its reason.
    """
    k = _check_k(k)
    _positive(taper_length, "taper's length")
    if work_length is not None:
        _positive(work_length, "work's length between centres")

    def attempt(fn, *args):
        try:
            return fn(*args), ""
        except ShoptermError as exc:
            return None, str(exc)

    if work_length is None:
        so, so_why = None, "The work is not between centres: set-over needs work between centres."
    else:
        so, so_why = attempt(set_over, lathe, k, work_length, taper_length)
    att, att_why = attempt(attachment_setting, lathe, k, taper_length)
    comp, comp_why = attempt(compound_taper, lathe, k, taper_length)
    return TaperSetups(k, half_angle_deg(k), so, so_why, att, att_why, comp, comp_why)


# ---- the set-up's answer -------------------------------------------------------------------------

#: How a tapered thread's taper is made, as the set-up records it (``taper`` ``method``).
TAPER_METHODS = ("set_over", "attachment", "compound")


def setup_value(setups: TaperSetups, method: str, *, internal: bool = False) -> dict:
    """Return the set-up's ``taper`` value for ``method`` (DEVELOPERS.md, set-up keys).

    setups: from ``taper_setups``; method: one of ``TAPER_METHODS``; internal: the thread is
    internal (its large end, the face, is at the tailstock), else the small end is at the
    tailstock. Raises ``InvalidEntry`` with the refusal when this lathe cannot make the thread's
    taper that way: the compound turns the blank only, so it is always refused for the thread
    (its setting for the blank is in the message).
    """
    if method == "set_over":
        so = setups.set_over
        if so is None:
            raise InvalidEntry(setups.set_over_refused)
        # smaller at the tailstock: offset toward the tool (the SetOver's direction)
        return {"method": method, "k": so.k, "work_length_mm": so.work_length,
                "taper_length_mm": so.taper_length, "set_over_mm": so.set_over,
                "divisions": so.divisions, "scale_unit": so.scale_unit,
                "toward_tool": not internal, "text": so.text}
    if method == "attachment":
        att = setups.attachment
        if att is None:
            raise InvalidEntry(setups.attachment_refused)
        return {"method": method, "k": att.k, "taper_length_mm": att.taper_length,
                "setting": att.setting, "scale": att.scale,
                "shown": f"{att.setting:.4g}{_UNIT_NAMES[att.scale]}", "text": att.text}
    if method == "compound":
        comp = setups.compound
        if comp is None:
            raise InvalidEntry(setups.compound_refused)
        raise InvalidEntry(f"For the blank: {comp.text} {COMPOUND_NOTE}")
    raise InvalidEntry("Make the taper by the set-over, the taper attachment or the compound.")


def checklist_lines(value: dict) -> tuple[tuple[str, str, str], ...]:
    """Return the checklist's (key, text, detail) lines for a set-up's ``taper`` value: the
    taper's setting and the tool square to the axis. Raises ``InvalidEntry`` for a value that
    is not one ``setup_value`` makes. References: common practice, no source."""
    method = value.get("method") if isinstance(value, dict) else None
    square = ("tool_square", "Tool set square to the work's axis, not to the taper",
              TOOL_SQUARE)
    if method == "set_over":
        unit = value.get("scale_unit", "mm")
        way = "toward the tool" if value.get("toward_tool", True) else "away from the tool"
        lines = value.get("divisions")
        scale = f"{round(lines, 2):g} lines on its scale; " if lines is not None else ""
        end = "small end" if value.get("toward_tool", True) else "face of the bore"
        text = f"Tailstock set over {_f(value['set_over_mm'], unit)} {way} (dial indicator)"
        detail = (f"Check it with a dial indicator over the work length: {scale}work "
                  f"{_f(value['work_length_mm'], unit)} between centres, {end} at the "
                  f"tailstock. {SET_OVER_NOTE}")
        return (("taper", text, detail), square)
    if method == "attachment":
        return (("taper", f"Taper attachment set to {value['shown']}, its bar clamped",
                 "Take up the attachment's backlash: start each pass from the same side."),
                square)
    raise InvalidEntry("The set-up's taper is made by the set-over or the taper attachment: "
                       "record it on the set-up screen.")
