"""ISO metric trapezoidal threads: ISO 2904 profile, ISO 2902 series, ISO 2903 limits, designations.

No printed copy of ISO 2902/2903/2904 was at hand: the profile values below are computed from
the ISO 2904 formulas (H1 = 0.5P, h3 = H1 + ac, d2 = d - 0.5P, d3 = d - 2h3, D1 = d - P,
D4 = d + 2ac), and the ISO 2903 cells are from memory, each marked so.
"""

from __future__ import annotations

import json
import math

import pytest

from shopterm.cli import main
from shopterm.errors import InvalidEntry, UnknownThread, UnsupportedClass
from shopterm.standards import trapezoidal as tr
from shopterm.standards.forms import TRAPEZOIDAL_30


@pytest.mark.parametrize("pitch, ac", [
    (1.5, 0.15),   # ISO 2904, ac for P 1.5 (from memory)
    (2, 0.25),     # ISO 2904, ac for P 2 to 5 (from memory)
    (5, 0.25),     # ISO 2904, ac for P 2 to 5 (from memory)
    (6, 0.5),      # ISO 2904, ac for P 6 to 12 (from memory)
    (12, 0.5),     # ISO 2904, ac for P 6 to 12 (from memory)
    (14, 1.0),     # ISO 2904, ac for P 14 to 44 (from memory)
])
def test_clearance_by_pitch_band(pitch, ac):
    assert tr.clearance(pitch) == ac


@pytest.mark.parametrize("text, d2, d3, d1, d4, h3", [
    ("Tr20x4", 18.0, 15.5, 16.0, 20.5, 2.25),    # computed from the ISO 2904 formulas
    ("Tr24x5", 21.5, 18.5, 19.0, 24.5, 2.75),    # computed from the ISO 2904 formulas
    ("Tr40x7", 36.5, 32.0, 33.0, 41.0, 4.0),     # computed from the ISO 2904 formulas
    ("Tr8x1.5", 7.25, 6.2, 6.5, 8.3, 0.9),       # computed from the ISO 2904 formulas
    ("Tr60x14", 53.0, 44.0, 46.0, 62.0, 8.0),    # computed from the ISO 2904 formulas
])
def test_basic_profile(registry, text, d2, d3, d1, d4, h3):
    ext = registry.limits(registry.parse(text))
    nut = registry.limits(registry.parse(text, kind="internal"))
    assert ext.basic_pd == pytest.approx(d2) and nut.basic_pd == pytest.approx(d2)
    assert ext.basic_minor == pytest.approx(d3)
    assert nut.basic_minor == pytest.approx(d1) and nut.minor_min == pytest.approx(d1)
    assert nut.major_min == pytest.approx(d4)
    assert ext.depth == pytest.approx(h3) and nut.depth == pytest.approx(h3)   # h3 = H4


def test_form_proportions():
    # ISO 2901 basic profile: 30°, depth H1 = 0.5P, d - d2 = 0.5P, crest flat 0.366P
    # (computed: 0.5P - 2 x 0.25P x tan 15° = 0.366025P)
    f = TRAPEZOIDAL_30
    assert f.angle_deg == 30 and f.depth == pytest.approx(0.5, abs=1e-6)
    assert f.pd_offset == pytest.approx(0.5, abs=1e-6)
    assert 2 * f.crest_trunc * math.tan(f.half_angle_rad) == pytest.approx(0.366025, abs=1e-6)
    assert f.crest_radius == 0 and f.root_radius == 0      # flat crests, no radii


@pytest.mark.parametrize("pitch, flat", [
    (4, 1.330127),   # computed from the ISO 2904 profile: 0.366025 x 4 - 2 x 0.25 x tan 15°
    (7, 2.294229),   # computed from the ISO 2904 profile: 0.366025 x 7 - 2 x 0.5 x tan 15°
    (1.5, 0.468653), # computed from the ISO 2904 profile: 0.366025 x 1.5 - 2 x 0.15 x tan 15°
])
def test_root_flat_is_the_tool_tip(pitch, flat):
    assert tr.root_flat(pitch) == pytest.approx(flat, abs=1e-6)


def test_tr20x4_7e_limits(registry):
    lim = registry.limits(registry.parse("Tr20x4-7e"))
    assert lim.major_max == 20.0
    assert lim.major_min == pytest.approx(19.700)   # ISO 2903, Td4 at P 4 = 300 µm (from memory)
    assert lim.pd_max == pytest.approx(17.905)      # ISO 2903, e es at P 4 = -95 µm (from memory)
    # Td2 grade 7, d 11.2-22.4, P 4: 90 x 4^0.4 x 15.84^0.1 x 1.25 = 258 -> R40 265 µm
    # (computed from the ISO 965-1 formula ISO 2903 uses, from memory)
    assert lim.pd_min == pytest.approx(17.640)
    assert lim.minor_max == pytest.approx(15.405)   # d3 + es: 15.5 - 0.095 (ISO 2903, from memory)
    assert lim.minor_min == pytest.approx(15.074)  # 15.405 - 1.25 x Td2, to 0.001 (from memory)
    assert lim.clearance == 0.25 and lim.tip_flat == pytest.approx(1.330127, abs=1e-6)


def test_tr20x4_7h_limits(registry):
    lim = registry.limits(registry.parse("Tr20x4-7H"))
    assert lim.spec.kind == "internal"
    assert lim.major_min == pytest.approx(20.5) and lim.major_max is None   # D4 = d + 2ac
    assert lim.minor_max == pytest.approx(16.375)   # ISO 2903, TD1 4 at P 4 = 375 µm (from memory)
    # TD2 grade 7 = 1.32 x 258 = 341 -> R40 335 µm (ISO 965-1 formula, from memory)
    assert (lim.pd_min, lim.pd_max) == (pytest.approx(18.0), pytest.approx(18.335))


def test_tr24x5_and_tr40x7(registry):
    a = registry.limits(registry.parse("Tr24x5-7e"))
    assert a.pd_max == pytest.approx(21.394)        # ISO 2903, e es at P 5 = -106 µm (from memory)
    assert a.major_min == pytest.approx(23.665)     # ISO 2903, Td4 at P 5 = 335 µm (from memory)
    # Td2 grade 7, d 22.4-45, P 5: 90 x 5^0.4 x 31.75^0.1 x 1.25 = 303 -> R40 300
    # (ISO 965-1 formula as ISO 2903 uses it, from memory)
    assert a.pd_min == pytest.approx(21.094)
    b = registry.limits(registry.parse("Tr40x7-7e"))
    assert b.pd_max == pytest.approx(36.375)        # ISO 2903, e es at P 7 = -125 µm (from memory)
    assert b.major_min == pytest.approx(39.575)     # ISO 2903, Td4 at P 7 = 425 µm (from memory)
    c = registry.limits(registry.parse("Tr40x7-7H"))
    assert c.minor_max == pytest.approx(33.560)     # ISO 2903, TD1 at P 7 = 560 µm (from memory)
    assert c.major_min == pytest.approx(41.0)       # D4 = 40 + 2 x 0.5 (ISO 2904 formula)


def test_class_c_and_grade_8(registry):
    c = registry.limits(registry.parse("Tr20x4-7c"))
    assert c.pd_max == pytest.approx(17.810)        # ISO 2903, c es at P 4 = -190 µm (from memory)
    e8 = registry.limits(registry.parse("Tr20x4-8e"))
    # grade 8: 90 x 4^0.4 x 15.84^0.1 x 1.6 = 330 -> R40 335 µm (formula, from memory)
    assert e8.pd_min == pytest.approx(17.905 - 0.335)


def test_multi_start_lead_and_widened_tolerance(registry):
    spec = registry.parse("Tr24x10(P5)")
    assert (spec.pitch, spec.starts, spec.lead) == (5.0, 2, 10.0)
    one = registry.limits(registry.parse("Tr24x5-7e"))
    two = registry.limits(spec)
    # ISO 2903 multi-start factor 1.12 on Td2 for two starts (from memory)
    assert two.pd_tolerance == pytest.approx(1.12 * one.pd_tolerance, abs=0.001)
    assert two.pd_max == one.pd_max                 # deviation goes by the pitch
    assert any("2 starts" in n for n in two.notes)
    assert registry.parse("Tr40x14(P7)").starts == 2 and registry.parse("Tr40x14(P7)").lead == 14


def test_no_class_means_7e_or_7h_and_says_so(registry):
    plain = registry.limits(registry.parse("Tr20x4"))
    assert plain.pd_max == registry.limits(registry.parse("Tr20x4-7e")).pd_max
    assert any("7e" in n for n in plain.notes)
    nut = registry.limits(registry.parse("Tr20x4 internal"))
    assert nut.pd_max == registry.limits(registry.parse("Tr20x4-7H")).pd_max
    assert any("7H" in n for n in nut.notes)


@pytest.mark.parametrize("text, hand, kind, starts", [
    ("Tr20x4", "RH", "external", 1),
    ("Tr20x4-7e", "RH", "external", 1),
    ("Tr20x4-7H", "RH", "internal", 1),
    ("Tr40x14(P7)", "RH", "external", 2),
    ("Tr40x14(P7)-8c", "RH", "external", 2),
    ("Tr20x4LH", "LH", "external", 1),
    ("Tr20x4-7e LH", "LH", "external", 1),
    ("Tr24x10(P5)-7H LH", "LH", "internal", 2),
])
def test_designation_round_trip(round_trip, text, hand, kind, starts):
    round_trip(text, hand, kind, starts)


def test_lenient_reading(registry):
    assert registry.parse("Tr 20 x 4 - 7e").designation == "Tr20x4-7e"
    assert registry.parse("tr20X4LH-7e").designation == "Tr20x4-7e LH"


def test_catalogue_and_classes(registry):
    cat = tr.catalogue()
    names = [s.designation for s in cat]
    assert "Tr20x4-7e" in names and "Tr20x2-7e" in names   # ISO 2902: Tr20, P 4 and 2 (from memory)
    assert "Tr100x12-7e" in names                          # ISO 2902: Tr100, P 12 (from memory)
    assert all(registry.parse(n) == s for n, s in zip(names, cat))
    assert tr.pitches(20)[0] == 4                          # preferred first
    assert registry.classes(registry.parse("Tr20x4")) == ["7e", "8e", "7c", "8c"]
    assert registry.classes(registry.parse("Tr20x4-7H")) == ["7H", "8H"]
    for s in cat:                                          # every size has limits
        lim = registry.limits(s)
        assert lim.pd_min < lim.pd_max < lim.basic_pd < lim.major_max


def test_wrong_pitch_names_the_series_pitches(registry):
    with pytest.raises(UnknownThread) as e:
        registry.parse("Tr20x3")
    assert "ISO 2902 gives Tr20 with P 4 (and 2)" in str(e.value)
    assert e.value.suggestions == ("Tr20x4", "Tr20x2")


def test_refusals(registry):
    with pytest.raises(UnknownThread) as e:
        registry.parse("Tr21x4")
    assert "Tr20x4" in e.value.suggestions
    with pytest.raises(UnsupportedClass, match="7e, 8e, 7c, 8c"):
        registry.parse("Tr20x4-6g")
    with pytest.raises(InvalidEntry, match="7H, 8H"):
        registry.parse("Tr20x4-7e", kind="internal")
    with pytest.raises(InvalidEntry, match="whole number of pitches"):
        registry.parse("Tr40x15(P7)")


def test_calc_limits_json(capsys):
    assert main(["calc", "limits", "Tr20x4-7e", "--json"]) == 0
    data = json.loads(capsys.readouterr().out)
    assert data["designation"] == "Tr20x4-7e" and data["form_angle_deg"] == 30.0
    assert data["clearance"] == 0.25                       # ISO 2904 ac, P 4
    assert data["tip_flat"] == pytest.approx(1.330, abs=0.001)   # computed, ISO 2904 profile
    assert data["pitch_diameter"] == {"max": 17.905, "min": 17.64}
    assert data["depth"] == 2.25
