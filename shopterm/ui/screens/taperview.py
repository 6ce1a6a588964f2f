"""What the screens show for a tapered thread (ISO 7-1 R/Rc, ASME B1.20.1 NPT): presentation
only, every number from ``shopterm.lathe.taper`` and ``shopterm.cutting.taper_thread``.

Kept apart from the screens it serves (set-up, prepare, wires, fit check) so their own code
stays the same for parallel threads: each screen asks ``is_tapered(spec)`` and hands the
tapered case to a helper here.
"""

from __future__ import annotations

from functools import lru_cache

from shopterm.errors import ShoptermError
from shopterm.standards import limits as thread_limits


@lru_cache(maxsize=32)
def _taper_of(spec):
    return thread_limits(spec).taper


def is_tapered(spec) -> bool:
    """Return whether ``spec`` is a tapered thread (its limits carry a taper)."""
    if spec is None:
        return False
    try:
        return _taper_of(spec) is not None
    except ShoptermError:   # a thread with no limits is not tapered; its screen says why
        return False


# ---- the set-up: how is the taper made? ------------------------------------------------------

TAPER_QUESTION = "how is the taper made?"
LENGTH_QUESTION = "the work's overall length between centres"


def _f(mm: float, unit: str) -> str:
    from shopterm.units import format_length
    return format_length(mm, unit, 0.0001 if unit == "in" else 0.01)


def taper_setups_for(app, work_length: float | None):
    """Return this lathe's ``TaperSetups`` for the chosen thread over its thread length.

    work_length [mm]: between centres, or None (not known, or not between centres).
    """
    from shopterm.cutting.taper_thread import thread_length
    from shopterm.lathe.taper import taper_setups
    taper = _taper_of(app.spec)
    return taper_setups(app.lathe, taper.per_unit_on_diameter, work_length,
                        thread_length(taper))


def taper_options(app, held: bool | None, work_length: float | None
                  ) -> tuple[list[tuple[str, str]], dict[str, tuple[str, bool]]]:
    """Return the taper question's list ((label, method) for set-over, attachment, compound)
    and for each method (what it says, refused?) — the setting on this lathe or its refusal."""
    setups = taper_setups_for(app, work_length if held else None)
    unit = app.shop.display_units
    words: dict[str, tuple[str, bool]] = {}
    if not held:
        so_label = "set-over between centres: not with the work in a chuck"
        words["set_over"] = ("Set-over needs the work between centres: answer 'between "
                             "centres' to how the work is held (- goes back).", True)
    elif work_length is None:
        so_label = "set-over between centres (then the work's length)"
        words["set_over"] = ("The set-over comes from the work's overall length: it is asked "
                             "next.", False)
    elif setups.set_over is None:
        so_label = "set-over between centres: too far for this tailstock"
        words["set_over"] = (setups.set_over_refused, True)
    else:
        so = setups.set_over
        lines = f" ({round(so.divisions, 2):g} lines)" if so.divisions is not None else ""
        so_label = f"set-over between centres: {_f(so.set_over, so.scale_unit)}{lines}"
        words["set_over"] = (f"{so.text} Work {_f(work_length, unit)} long.", False)
    if setups.attachment is None:
        att_label = "taper attachment: not on this lathe"
        words["attachment"] = (setups.attachment_refused, True)
    else:
        att = setups.attachment
        att_label = f"taper attachment: {att.text.removeprefix('Set the taper attachment to ')}"
        att_label = att_label.rstrip(".")
        words["attachment"] = (att.text, False)
    if setups.compound is None:
        comp_label = "compound, for the blank only: not here"
        words["compound"] = (setups.compound_refused, True)
    else:
        comp = setups.compound
        comp_label = f"compound, for the blank only: {comp.scale_reading_deg:.2f}° on its scale"
        words["compound"] = (f"For the blank: {comp.text} It cannot follow the taper under "
                             "the leadscrew: the thread needs 1 or 2.", True)
    return ([(so_label, "set_over"), (att_label, "attachment"), (comp_label, "compound")],
            words)


def taper_value(app, method: str | None, held: bool | None, work_length: float | None
                ) -> tuple[dict | None, str]:
    """Return (the set-up's ``taper`` value, '') or (None, why not / what to do)."""
    from shopterm.lathe.taper import setup_value
    if method is None:
        return None, "Say how the taper is made: pick with a digit."
    if method == "set_over" and (not held or work_length is None):
        if not held:
            return None, taper_options(app, held, work_length)[1]["set_over"][0]
        return None, "Type the work's overall length between centres, then Enter."
    try:
        return setup_value(taper_setups_for(app, work_length if held else None), method,
                           internal=not app.spec.is_external), ""
    except ShoptermError as exc:
        return None, str(exc)


def taper_summary(value: dict | None, unit: str) -> str:
    """Return the set-up summary's taper line."""
    if value is None:
        return "? (not answered yet)"
    if value["method"] == "set_over":
        way = "toward" if value.get("toward_tool", True) else "away from"
        return (f"tailstock set over {_f(value['set_over_mm'], value.get('scale_unit', unit))} "
                f"{way} the tool, work {_f(value['work_length_mm'], unit)}")
    return f"taper attachment at {value['shown']}"


# ---- prepare: where to measure the blank and what it should read --------------------------------

def blank_entry(lim, unit: str, fmt) -> tuple[str, str, str]:
    """Return (entry prompt, hint beside it, the step's text) for a tapered thread's blank:
    measured at the small end (internal: the bore at the face), from ``taper_blank``.
    fmt: the screen's length formatter."""
    from shopterm.cutting.taper_thread import taper_blank
    b = taper_blank(lim, unit)
    where = "bore at face" if b.internal else "OD at small end"   # fits the entry (#od)
    return (f"1 {where} [{unit}]: ", f"should read {fmt(b.at_end)}", b.text)


# ---- wires: readings at a stated plane -------------------------------------------------------------

def default_plane(state, lim) -> float:
    """Return the plane [mm from the small end] a reading is taken at unless another is typed:
    the last reading's of this job, else the gauge plane."""
    from shopterm.cutting.taper_thread import gauge_plane_at
    for r in reversed(state.readings if state is not None else ()):
        d = r.payload.get("distance_mm")
        if d is not None:
            return float(d)
    return gauge_plane_at(lim)


def plane_words(lim, distance: float, fmt) -> str:
    """Return where a reading is taken: ``8.20 mm from the small end (the gauge plane)``."""
    from shopterm.cutting.taper_thread import gauge_plane_at, measured_from
    gauge = abs(distance - gauge_plane_at(lim)) < 1e-6
    return f"{fmt(distance)} from {measured_from(lim)}" + (" (the gauge plane)" if gauge else "")


def wires_head(spec, lim, wire: float, wire_text: str, distance: float, fmt, unit: str):
    """Return the wire screen's head for a tapered thread: the plane, and the reading over the
    wires there at the band's top and bottom."""
    from rich.text import Text
    from shopterm.cutting.taper_thread import limits_at, wire_band_at
    top, bottom = wire_band_at(lim, wire, distance)
    at = limits_at(lim, distance)
    head = Text()
    head.append(spec.designation, style="bold")
    head.append(f"  wire {wire_text}")
    head.append(f"\nmeasured at {plane_words(lim, distance, fmt)}", style="bold")
    head.append(f"\nover wires there {fmt(top, False)} (PD {fmt(at.pd_max, False)}) to "
                f"{fmt(bottom, False)} (PD {fmt(at.pd_min, False)}) {unit}")
    head.append("\nEnter on an empty entry: the plane, a hand-tight check, another wire",
                style="dim")
    return head


def reading_payload(tr) -> dict:
    """Return what a tapered reading adds to (and changes in) the ``wire_reading`` payload: the
    plane, the PD there, and the PDs at the gauge plane (what the cut is planned at)."""
    m = tr.measurement
    shift = tr.shift
    return {"distance_mm": tr.distance, "pd_at_plane_mm": tr.pd_at_plane,
            "pd_mm": tr.pd_at_gauge_plane, "pd_max_mm": m.pd_max + shift,
            "pd_min_mm": m.pd_min + shift, "aim_pd_mm": tr.aim_pd_at_gauge_plane,
            "reading_factor": tr.reading_factor}


PLANE_QUESTION = "Where is the single wire, from the small end?"
TAPER_OPTIONS = (("distance of the measuring plane from the small end", "plane"),
                 ("hand-tight check (ring gauge or the mating fitting)", "hand_tight"),
                 ("another wire", "wire"))


def ask_plane(app, lim, now: float, then) -> None:
    """Ask the measuring plane's distance from the small end by keypad; ``then(mm or None)``."""
    from shopterm.cutting.taper_thread import (gauge_plane_at, measured_from,
                                               shift_to_gauge_plane, thread_length)
    from shopterm.ui.screens.taperask import NumberModal
    from shopterm.units import format_length, parse_length
    unit = app.shop.display_units

    def f(mm: float) -> str:
        return format_length(mm, unit, 0.0001 if unit == "in" else 0.01)

    def check(text: str) -> float:
        mm = parse_length(text, unit)
        shift_to_gauge_plane(lim, mm)            # raises, saying what to do, off the thread
        return mm

    hint = (f"Now {f(now)}. The gauge plane is {f(gauge_plane_at(lim))} from "
            f"{measured_from(lim)}; the thread is {f(thread_length(lim.taper))} long.")
    app.push_screen(NumberModal(PLANE_QUESTION, f"distance [{unit}]: ", hint, check), then)


def set_words(tr, lim, fmt) -> tuple[float, str]:
    """Return (the mean of the readings as typed [mm], what to add after the set's PD): a
    tapered reading's PD is at its plane; away from the gauge plane, say the PD there too."""
    from shopterm.cutting.taper_thread import gauge_plane_at
    mean = sum(tr.typed) / len(tr.typed)
    if abs(tr.distance - gauge_plane_at(lim)) < 1e-6:
        return mean, " (gauge plane)"
    return mean, f" ({fmt(tr.pd_at_gauge_plane, False)} at gauge plane)"
