"""What the wire screens share (readings, wire choice, fit check): pure presentation.

The wire in use and its label, the band picture and the chart of readings. Every dimension
comes from the core (``shopterm.cutting.wires``, ``remaining``); here it is only placed on a
line of characters or put into words.
"""

from __future__ import annotations

from shopterm.cutting.reading_sets import same_wire
from shopterm.errors import ShoptermError
from shopterm.units import format_length, parse_length

#: Width of the band picture and of the chart bars [characters].
PICTURE_WIDTH = 44
#: How many sets of readings the chart shows (the latest ones).
CHART_ROWS = 4


def fmt(app, mm: float, suffix: bool = True) -> str:
    """Return ``mm`` in the display unit to the micrometer's usual resolution."""
    unit = app.shop.display_units
    return format_length(mm, unit, 0.0001 if unit == "in" else 0.001, suffix=suffix)


def wire_label(app, size: float) -> str:
    """Return how an owned wire set is called (its size, and its label or marked size)."""
    for w in app.shop.wires:
        if same_wire(w.size, size):
            extra = w.label
            try:   # a label that only repeats the size says nothing in this unit
                if same_wire(parse_length(extra, app.shop.display_units), size):
                    extra = ""
            except ShoptermError:
                pass
            if w.measured is not None and not extra:
                extra = f"marked {fmt(app, w.marked)}"
            return fmt(app, size) + (f" ({extra})" if extra else "")
    return f"{fmt(app, size)} (measured size)"


def wire_in_use(app) -> tuple[float, str, str]:
    """Return (wire [mm], its description, a problem to show or '') for the chosen thread:
    the set-up's wire if it fits, else the best owned set (or the best size)."""
    from shopterm.cutting.wires import check_wire, choose_wire
    spec, unit = app.spec, app.shop.display_units
    owned = app.shop.wires
    chosen = app.setup_values().get("wire_mm")
    problem = ""
    if chosen:
        chk = check_wire(spec.form, spec.pitch, float(chosen), owned, unit)
        if chk.ok:
            return float(chosen), wire_label(app, float(chosen)), ""
        problem = chk.message
    choice = choose_wire(spec.form, spec.pitch, owned, unit)
    if choice.owned is not None:
        return choice.size, wire_label(app, choice.size), problem
    return choice.size, f"{fmt(app, choice.size)} (best size, not in your sets)", \
        problem or choice.note


def _column(value: float, left: float, right: float, width: int) -> int:
    """Return the column of ``value`` on a scale from ``left`` (column 0) to ``right``."""
    if right == left:
        return width // 2
    col = round((value - left) / (right - left) * (width - 1))
    return min(max(col, 0), width - 1)


def band_picture(pd: float, pd_max: float, pd_min: float, width: int = PICTURE_WIDTH) -> str:
    """Return one line showing where ``pd`` sits against the band (big on the left).

    ``[`` is the top of the band (PD max), ``]`` its bottom (PD min), ``█`` the reading;
    ``<`` or ``>`` at an end means the reading is off the scale that way.
    """
    span = max(pd_max - pd_min, 1e-6)
    left, right = pd_max + 2 * span, pd_min - span
    cells = ["·"] * width
    b0, b1 = _column(pd_max, left, right, width), _column(pd_min, left, right, width)
    for i in range(b0 + 1, b1):
        cells[i] = "░"
    cells[b0], cells[b1] = "[", "]"
    col = _column(pd, left, right, width)
    off = pd > left or pd < right
    cells[col] = ("<" if pd > left else ">") if off else "█"
    return "big " + "".join(cells) + " small"


def chart_rows(sets: list, pd_max: float, pd_min: float, unit: str,
               width: int = PICTURE_WIDTH - 6) -> list[str]:
    """Return the chart lines: one row per reading set; ``█`` moves right as the PD falls.

    ``·`` runs from the reading to the top of the band (what was still to come off), ``│░│``
    is the band.

    sets: (label, pd [mm], count of readings) oldest first.
    """
    if not sets:
        return []
    span = max(pd_max - pd_min, 1e-6)
    left = max(max(pd for _, pd, _ in sets), pd_max + span)
    right = min(min(pd for _, pd, _ in sets), pd_min - span / 2)
    b0, b1 = _column(pd_max, left, right, width), _column(pd_min, left, right, width)
    res = 0.0001 if unit == "in" else 0.001
    out = []
    for label, pd, n in sets:
        col = _column(pd, left, right, width)
        cells = []
        for i in range(width):
            if i == col:
                cells.append("█")
            elif i in (b0, b1):
                cells.append("│")
            elif b0 < i < b1:
                cells.append("░")
            elif col < i < b0:
                cells.append("·")   # still to come off
            else:
                cells.append(" ")
        count = f"×{n}" if n > 1 else "  "
        out.append(f"{label:<8}{format_length(pd, unit, res, suffix=False):>9} {count:<3}"
                   + "".join(cells))
    return out
