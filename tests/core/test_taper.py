"""The taper on this lathe (shopterm/lathe/taper.py): set-over, attachment, compound, refusals.

Sources: set-over = (D − d)/2 × L_work / L_taper and offset = taper per foot × L / 24
(Machinery's Handbook, taper turning by tailstock offset, from memory); 1 in 16 on diameter
(ISO 7-1 and ASME B1.20.1, from memory); 3/4 in per foot for NPT (ASME B1.20.1, from memory).
"""

from __future__ import annotations

import math

import pytest

from shopterm.errors import InvalidEntry
from shopterm.lathe import taper as tp
from shopterm.lathe.machine import Dial, Lathe, Leadscrew, Tailstock, TaperAttachment

K = 1 / 16          # ISO 7-1 / ASME B1.20.1 taper 1:16 on diameter (from memory)


def lathe(**kw) -> Lathe:
    """A demo lathe invented for the test; its taper kit from ``kw``."""
    return Lathe("test", Leadscrew.from_tpi(8), Dial("mm", 0.02, 100, reads_diameter=True),
                 Dial("mm", 0.02, 75), **kw)


def test_half_angle_of_1_in_16():
    # computed from the ISO 7-1 taper 1:16: atan(1/32) = 1.7899°
    assert tp.half_angle_deg(K) == pytest.approx(1.7899, abs=5e-5)
    # a 1:16 taper is 3/4 in per foot on diameter (ASME B1.20.1, from memory)
    assert tp.attachment_reading(K, "in_per_ft") == pytest.approx(0.75)
    assert tp.attachment_reading(K, "mm_per_100mm") == pytest.approx(6.25)  # computed, 100/16
    assert tp.attachment_reading(K, "deg") == pytest.approx(1.7899, abs=5e-5)


def test_set_over_whole_work_is_length_over_32():
    # 1:16 over the whole work: L/32 (computed from the set-over formula, Machinery's Handbook)
    s = tp.set_over(None, K, 200.0)
    assert s.set_over == pytest.approx(200 / 32)
    assert s.diameter_change == pytest.approx(12.5)        # 200/16, computed
    assert s.by_indicator and s.divisions is None and "dial indicator" in s.text


def test_set_over_short_taper_on_long_work():
    # taper 13.2 mm long (ISO 7-1 R1/2 useful length, from memory) on work 150 mm between centres:
    # (D - d)/2 × L/l = (13.2/16)/2 × 150/13.2 = 4.6875 (computed from the formula)
    s = tp.set_over(None, K, 150.0, 13.2)
    assert s.diameter_change == pytest.approx(13.2 / 16)
    assert s.set_over == pytest.approx(4.6875)


def test_set_over_against_handbook_taper_per_foot_form():
    # offset = TPF × L / 24 (Machinery's Handbook, from memory): 3/4 in/ft over 12 in -> 0.375 in
    s = tp.set_over(None, 0.75 / 12, 12 * 25.4)
    assert s.set_over / 25.4 == pytest.approx(0.75 * 12 / 24)


def test_set_over_inverse_gives_the_taper_back():
    # inverse path: k = 2 × set-over / L_work (rearranged set-over formula)
    for k, work in ((K, 120.0), (0.05, 300.0), (1 / 48, 90.0)):
        s = tp.set_over(None, k, work, work / 3)
        assert 2 * s.set_over / s.work_length == pytest.approx(k)
        assert s.diameter_change / s.taper_length == pytest.approx(k)


def test_set_over_on_the_tailstock_scale():
    m = lathe(tailstock=Tailstock(division=0.5, unit="mm", max_set_over=10.0))
    s = tp.set_over(m, K, 200.0)
    assert s.divisions == pytest.approx(6.25 / 0.5)       # computed: 6.25 mm at 0.5 mm a line
    assert not s.by_indicator and "12.5 lines" in s.text
    assert "towards the tool" in s.direction and "indicator" in s.note


@pytest.mark.parametrize("m,work,taper,words", [
    (lathe(tailstock=Tailstock(max_set_over=5.0)), 200.0, None, "more than this tailstock"),
    (None, 100.0, 120.0, "cannot be longer than the work"),
    (None, -5.0, None, "greater than zero"),
    (None, 0.0, None, "greater than zero"),
])
def test_set_over_refused(m, work, taper, words):
    with pytest.raises(InvalidEntry, match=words):
        tp.set_over(m, K, work, taper)


@pytest.mark.parametrize("k", [0, -0.0625, 1.5, float("nan"), True])
def test_bad_taper_refused(k):
    with pytest.raises(InvalidEntry, match="change of diameter per unit of length"):
        tp.half_angle_deg(k)


@pytest.mark.parametrize("scale,expected", [
    ("in_per_ft", 0.75),           # ASME B1.20.1: 3/4 in per foot (from memory)
    ("mm_per_100mm", 6.25),        # computed from 1:16
    ("deg", 1.78991),              # computed from the ISO 7-1 taper: atan(1/32)
])
def test_attachment_setting_in_its_own_graduation(scale, expected):
    m = lathe(taper_attachment=TaperAttachment(scale, 10.0, 250.0))
    a = tp.attachment_setting(m, K, 13.2)
    assert a.setting == pytest.approx(expected, abs=1e-5)
    assert a.per_foot_in == pytest.approx(0.75) and a.per_100_mm == pytest.approx(6.25)
    assert a.half_angle_deg == pytest.approx(1.78991, abs=1e-5)


@pytest.mark.parametrize("att,length,words", [
    (None, 13.2, r"No taper attachment in the config \(\[taper_attachment\]\)"),
    (TaperAttachment("in_per_ft", 0.5), 13.2, "more than its 0.5 in/ft"),
    (TaperAttachment("deg", 1.5), 13.2, "more than its 1.5°"),
    (TaperAttachment("mm_per_100mm", 10.0, 100.0), 150.0, "longer than the taper attachment"),
])
def test_attachment_refused(att, length, words):
    with pytest.raises(InvalidEntry, match=words):
        tp.attachment_setting(lathe(taper_attachment=att), K, length)


def test_attachment_type_checks_itself():
    with pytest.raises(InvalidEntry):
        TaperAttachment("inch", 3.0)
    with pytest.raises(InvalidEntry):
        TaperAttachment("deg", 0.0)


def test_compound_half_angle_on_either_scale():
    # compound at α = 1.7899° to the axis: 88.2101° from the cross-slide (computed, 90 − α)
    c = tp.compound_taper(lathe(), K, 13.2)
    assert c.true_angle_deg == pytest.approx(88.2101, abs=5e-5)
    assert c.scale_reading_deg == pytest.approx(88.2101, abs=5e-5)
    bed = tp.compound_taper(lathe(compound_zero="bed"), K, 13.2)
    assert bed.scale_reading_deg == pytest.approx(1.7899, abs=5e-5)
    # travel over the taper = L / cos α (computed): 13.2 / cos 1.7899° = 13.20644
    assert c.travel == pytest.approx(13.2 / math.cos(math.atan(1 / 32)))
    assert c.travel == pytest.approx(13.20644, abs=1e-5)
    assert "leadscrew" in c.note       # it does not cut the thread itself


def test_compound_travel_limit():
    with pytest.raises(InvalidEntry, match="more than its 10.0 mm"):
        tp.compound_taper(lathe(compound_travel=10.0), K, 13.2)
    assert tp.compound_taper(lathe(compound_travel=70.0), K, 13.2).travel < 70


def test_all_three_with_reasons():
    m = lathe(tailstock=Tailstock(division=1.0, max_set_over=12.0), compound_travel=10.0)
    s = tp.taper_setups(m, K, 200.0, 13.2)
    assert s.set_over is not None and s.set_over.set_over == pytest.approx(6.25)
    assert s.attachment is None and "No taper attachment" in s.attachment_refused
    assert s.compound is None and "more than its" in s.compound_refused
    assert s.half_angle_deg == pytest.approx(1.7899, abs=5e-5)
    assert "square to the work's axis" in s.tool_square    # common practice, no source
    chuck = tp.taper_setups(m, K, None, 13.2)
    assert chuck.set_over is None and "between centres" in chuck.set_over_refused
    with pytest.raises(InvalidEntry):
        tp.taper_setups(m, K, -1.0, 13.2)
    with pytest.raises(InvalidEntry):
        tp.taper_setups(m, K, 200.0, 0.0)


def test_sample_config_taper_kit():
    from shopterm.config import load_config
    from shopterm.resources import sample_config_path
    m = load_config(sample_config_path()).lathe
    s = tp.taper_setups(m, K, 200.0, 13.2)
    # sample: 1 mm a line, 12 mm at most; 3 in/ft attachment over 10 in; compound 2.75 in
    assert s.set_over.divisions == pytest.approx(6.25)
    assert s.attachment.setting == pytest.approx(0.75) and s.attachment.scale == "in_per_ft"
    assert s.compound is not None


# ---- the set-up's taper value and its checklist lines ---------------------------------------------

def test_setup_value_set_over_and_its_checklist_lines():
    kit = lathe(tailstock=Tailstock(division=1.0, max_set_over=12.0))
    setups = tp.taper_setups(kit, K, 160.0, 13.2)
    v = tp.setup_value(setups, "set_over")
    # 160/32 = 5 mm, 5 lines of 1 mm (computed from the set-over formula, Machinery's Handbook)
    assert v["method"] == "set_over" and v["set_over_mm"] == pytest.approx(5.0)
    assert v["divisions"] == pytest.approx(5.0) and v["toward_tool"] is True
    lines = dict((key, (text, detail)) for key, text, detail in tp.checklist_lines(v))
    assert lines["taper"][0] == "Tailstock set over 5.00 mm toward the tool (dial indicator)"
    assert "dial indicator over the work length" in lines["taper"][1]
    assert "not to the taper" in lines["tool_square"][0]
    # an internal thread's face at the tailstock: the other way (common practice, no source)
    inside = tp.setup_value(setups, "set_over", internal=True)
    assert "away from the tool" in tp.checklist_lines(inside)[0][1]


def test_setup_value_attachment_and_refusals():
    kit = lathe(taper_attachment=TaperAttachment("in_per_ft", 3.0, None))
    setups = tp.taper_setups(kit, K, None, 13.2)
    v = tp.setup_value(setups, "attachment")
    # 12/16 = 0.75 in per foot (ASME B1.20.1, 3/4 in per foot, from memory)
    assert v["setting"] == pytest.approx(0.75) and v["shown"] == "0.75 in/ft"
    assert tp.checklist_lines(v)[0][1] == "Taper attachment set to 0.75 in/ft, its bar clamped"
    with pytest.raises(InvalidEntry, match="not between centres"):
        tp.setup_value(setups, "set_over")          # no work length: not between centres
    with pytest.raises(InvalidEntry, match="blank"):
        tp.setup_value(setups, "compound")          # the compound turns the blank only
    with pytest.raises(InvalidEntry, match="No taper attachment"):
        tp.setup_value(tp.taper_setups(lathe(), K, None, 13.2), "attachment")
    with pytest.raises(InvalidEntry, match="set-over, the taper attachment or the compound"):
        tp.setup_value(setups, "eyeball")
    with pytest.raises(InvalidEntry, match="record it on the set-up screen"):
        tp.checklist_lines(None)
