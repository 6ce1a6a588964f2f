"""The set-up checklist: the short items to confirm before the first pass (pure data).

Only the items that apply to this job are built (no carrier when the work is in a chuck).
The screen steps through them; each confirmation goes into the job record under ``key``.

References: common shop practice (no single published source); cautions defer to local rules
and the machine maker's instructions.
"""

from __future__ import annotations

from dataclasses import dataclass

from shopterm.errors import InvalidEntry

#: Longest ``text`` of an item, so it fits an 80-column screen with a margin.
TEXT_WIDTH = 76


@dataclass(frozen=True)
class ChecklistItem:
    """One thing to check: a stable ``key``, a short ``text`` (≤ 76 columns), optional detail."""

    key: str
    text: str
    detail: str = ""
    caution: bool = False


def _item(key: str, text: str, detail: str = "", caution: bool = False) -> ChecklistItem:
    if len(text) > TEXT_WIDTH:
        # Long texts (a half-nut plan given by the caller) go to the detail whole.
        detail = f"{text} {detail}".strip()
        text = text[: TEXT_WIDTH - 3].rstrip() + "..."
    return ChecklistItem(key, text, detail, caution)


def build_checklist(*, between_centres: bool, internal: bool, compound_setting_deg: float,
                    half_nut_plan: str, has_relief: bool,
                    compound_true_deg: float | None = None,
                    half_nut_stays_closed: bool = False,
                    starts: int = 1, indexing: str | None = None,
                    left_hand: bool = False,
                    taper: tuple[tuple[str, str, str], ...] = ()) -> tuple[ChecklistItem, ...]:
    """Return the checklist items that apply to this set-up, in the order to check them.

    between_centres (work driven by a carrier, not held in a chuck); internal (a boring tool
    cutting an internal thread); compound_setting_deg [deg] what to set *on this lathe's
    compound scale*; compound_true_deg [deg] the same angle from the cross-slide, for the
    detail; half_nut_plan (one line, e.g. from ``DialPlan.describe()``); has_relief (a thread
    relief groove to run out into); half_nut_stays_closed (the dial cannot be used: reverse
    the spindle); starts, indexing (the method chosen to move to the next start); left_hand;
    taper: (key, text, detail) lines of a tapered thread (``lathe.taper.checklist_lines``): an
    item with the key ``tool_square`` takes the place of the usual one.
    References: common shop practice, no single published source.
    """
    if not isinstance(half_nut_plan, str) or not half_nut_plan.strip():
        raise InvalidEntry("The checklist needs the half-nut plan: work out the thread dial "
                           "first.")
    if isinstance(starts, bool) or int(starts) != starts or starts < 1:
        raise InvalidEntry("The number of starts must be a whole number, 1 or more.")
    items = [
        _item("centre_height", "Tool point at centre height",
              "Check it against the tailstock centre or a height gauge."),
    ]
    taper_items = {key: _item(key, text, detail) for key, text, detail in taper}
    if "tool_square" in taper_items:
        items.append(taper_items.pop("tool_square"))
    elif internal:
        items.append(_item(
            "tool_square", "Boring tool square to the work: thread gauge on a true surface",
            "Hold the thread gauge against the turned face or outside diameter and set the "
            "tool's point into its notch."))
    else:
        items.append(_item(
            "tool_square", "Tool square to the work: thread gauge on the turned diameter",
            "Hold the thread gauge against the turned diameter and set the tool's point into "
            "its notch."))
    items.extend(taper_items.values())
    detail = ("As this lathe's scale reads it"
              + (f" ({compound_true_deg:g} deg true from the cross-slide)."
                 if compound_true_deg is not None else "."))
    items.append(_item("compound", f"Compound set to {compound_setting_deg:g} deg on its scale",
                       detail))
    if between_centres:
        items.append(_item(
            "carrier", "Carrier tied to its driving peg so the work cannot slip",
            "A slip loses the timing between work and leadscrew and spoils the thread."))
    hn_detail = ""
    if half_nut_stays_closed:
        hn_detail = ("At the end of each pass withdraw the tool, stop, and reverse the spindle "
                     "to run back; never open the half nut until the thread is done.")
    items.append(_item("half_nut", f"Half nut: {half_nut_plan.strip()}", hn_detail,
                       caution=half_nut_stays_closed))
    if starts > 1:
        items.append(_item(
            "indexing", f"{int(starts)} starts: index by {indexing}" if indexing
            else f"{int(starts)} starts: indexing method chosen and marked",
            "Index only with the half nut closed and the spindle stopped; cut every start "
            "to the same depth."))
    items.append(_item("backlash", "Backlash taken up on cross-slide and compound",
                       "Always come to a setting winding in the feed direction."))
    if has_relief:
        items.append(_item("relief", "Thread relief cut for the tool to run out into",
                           "Open the half nut (or stop) while the tool is in the relief."))
    else:
        items.append(_item("stop_mark", "Stopping point marked on the work or a stop set",
                           "With no relief, pull the tool out at the mark every pass.",
                           caution=True))
    if left_hand:
        items.append(_item("direction", "Leadscrew reversed for a left-hand thread",
                           "The carriage must travel away from the headstock."))
    items.append(_item("chuck_key", "Chuck key out, guards on, eye protection on",
                       "Follow your shop's rules and the machine maker's instructions.",
                       caution=True))
    items.append(_item("clothing", "No gloves, loose sleeves or jewellery near the work",
                       "Rotating work and gears can catch them; tie long hair back.",
                       caution=True))
    return tuple(items)
