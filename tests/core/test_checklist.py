"""Set-up checklist builder: which items apply, their keys, and that they fit the screen."""

from __future__ import annotations

import pytest

from shopterm.errors import InvalidEntry
from shopterm.lathe.checklist import TEXT_WIDTH, build_checklist
from shopterm.lathe.machine import Leadscrew, ThreadDial
from shopterm.lathe.thread_dial import dial_plan


def keys(items):
    return [i.key for i in items]


def base(**kw):
    args = dict(between_centres=False, internal=False, compound_setting_deg=29.5,
                half_nut_plan="Close the half nut on any numbered line.", has_relief=True)
    args.update(kw)
    return build_checklist(**args)


def test_chuck_work_has_no_carrier_item():
    # issue 6: items that do not apply are left out (no carrier in a chuck)
    assert "carrier" not in keys(base())
    centres = base(between_centres=True)
    assert "carrier" in keys(centres)
    carrier = next(i for i in centres if i.key == "carrier")
    assert "slip" in carrier.text and "timing" in carrier.detail


def test_all_items_in_order():
    k = keys(base(between_centres=True, starts=2, indexing="compound, 75 div"))
    assert k == ["centre_height", "tool_square", "compound", "carrier", "half_nut", "indexing",
                 "backlash", "relief", "chuck_key", "clothing"]


def test_relief_or_stop_mark():
    assert "relief" in keys(base()) and "stop_mark" not in keys(base())
    no_relief = base(has_relief=False)
    assert "stop_mark" in keys(no_relief) and "relief" not in keys(no_relief)


def test_compound_as_the_scale_reads():
    item = next(i for i in base(compound_setting_deg=60.5, compound_true_deg=29.5)
                if i.key == "compound")
    assert "60.5" in item.text and "29.5" in item.detail and "scale" in item.text


def test_internal_wording():
    ext = next(i for i in base() if i.key == "tool_square")
    inner = next(i for i in base(internal=True) if i.key == "tool_square")
    assert "gauge" in ext.text and "Boring" in inner.text


def test_half_nut_from_dial_plan_and_caution_when_closed():
    plan = dial_plan(Leadscrew.from_tpi(8), ThreadDial(32, 8, (1, 3, 5, 7)), 1.5)
    items = base(half_nut_plan=plan.describe(), half_nut_stays_closed=True)
    hn = next(i for i in items if i.key == "half_nut")
    assert hn.caution and "reverse" in hn.detail and "closed" in hn.text


def test_safety_items_always_there():
    k = keys(base())
    assert "chuck_key" in k and "clothing" in k
    text = " ".join(i.text + " " + i.detail for i in base())
    for word in ("guards", "eye protection", "gloves", "sleeves", "maker's instructions"):
        assert word in text


def test_left_hand_item():
    assert "direction" in keys(base(left_hand=True)) and "direction" not in keys(base())


@pytest.mark.parametrize("kw", [dict(), dict(between_centres=True, internal=True,
                                             has_relief=False, starts=3, left_hand=True),
                                dict(half_nut_plan="x" * 120)])
def test_texts_fit_and_keys_unique(kw):
    items = base(**kw)
    assert all(len(i.text) <= TEXT_WIDTH for i in items)
    assert len(set(keys(items))) == len(items)
    if "half_nut_plan" in kw:
        hn = next(i for i in items if i.key == "half_nut")
        assert "x" * 120 in hn.detail            # nothing of the long plan is lost


@pytest.mark.parametrize("kw", [dict(half_nut_plan=""), dict(starts=0)])
def test_errors(kw):
    with pytest.raises(InvalidEntry):
        base(**kw)


def test_a_taper_adds_its_setting_and_the_tool_square_to_the_axis():
    from shopterm.lathe.checklist import build_checklist
    lines = (("tool_square", "Tool set square to the work's axis, not to the taper", "why"),
             ("taper", "Tailstock set over 5.00 mm toward the tool (dial indicator)", "how"))
    items = build_checklist(between_centres=True, internal=False, compound_setting_deg=27,
                            half_nut_plan="any line", has_relief=True, taper=lines)
    keys = [it.key for it in items]
    # the taper's tool-square item takes the place of the usual one, next to centre height
    assert keys[:3] == ["centre_height", "tool_square", "taper"]
    assert keys.count("tool_square") == 1 and items[1].text.endswith("not to the taper")
    plain = build_checklist(between_centres=True, internal=False, compound_setting_deg=27,
                            half_nut_plan="any line", has_relief=True)
    assert "taper" not in [it.key for it in plain] and len(plain) == len(items) - 1
