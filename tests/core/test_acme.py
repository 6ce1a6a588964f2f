"""Acme (ASME B1.5) and stub Acme (ASME B1.8) threads: limits, designations, refusals.

No printed B1.5/B1.8 table was at hand. The expected values are worked by hand in inches from
the B1.5 formulas as remembered (each step in the comment), rounded to 0.0001 in as the
tables print: PD allowance 2G 0.008√D, 3G 0.006√D, 4G 0.004√D; PD tolerance
2G 0.006√D + 0.030√p, 3G 0.0028√D + 0.014√p, 4G 0.002√D + 0.010√p; clearance 0.020 in
(10 tpi and coarser) or 0.010 in; major/minor crest tolerance 0.05p (at least 0.005 in); external minor
tolerance 1.5 × PD tolerance.
"""

from __future__ import annotations

import json
import math

import pytest

from shopterm.cli import main
from shopterm.errors import UnknownThread, UnsupportedClass, InvalidEntry
from shopterm.standards import acme
from shopterm.standards.forms import ACME_29, STUB_ACME_29

IN = 25.4


def inches(x):
    return None if x is None else round(x / IN, 4)


def test_forms():
    # ASME B1.5: 29°, basic height 0.5p, basic flat 0.3707p (from memory);
    # ASME B1.8: basic height 0.3p, basic flat 0.4224p (from memory)
    for form, h, flat in ((ACME_29, 0.5, 0.3707), (STUB_ACME_29, 0.3, 0.4224)):
        assert form.angle_deg == 29 and form.depth == pytest.approx(h)
        assert form.pd_offset == pytest.approx(h)
        assert 2 * form.crest_trunc * math.tan(form.half_angle_rad) == pytest.approx(flat, abs=5e-5)
        assert form.crest_radius == form.root_radius == 0


def test_1_5_acme_2g_external(registry):
    lim = registry.limits(registry.parse("1-5 ACME-2G"))
    # ASME B1.5 formulas (from memory), D = 1, p = 0.2:
    assert inches(lim.major_max) == 1.0
    assert inches(lim.major_min) == 0.99            # 1 - 0.05 x 0.2
    assert inches(lim.pd_max) == 0.892              # 0.9 - 0.008 x √1
    assert inches(lim.pd_min) == 0.8726             # 0.892 - (0.0060 + 0.030 x √0.2 = 0.0134)
    assert inches(lim.minor_max) == 0.78            # 1 - 0.2 - 0.020
    assert inches(lim.minor_min) == 0.7509          # 0.78 - 1.5 x 0.0194
    assert inches(lim.clearance) == 0.02
    assert lim.tip_flat / IN == pytest.approx(0.3707 * 0.2 - 0.259 * 0.02)   # B1.5 root flat
    assert lim.depth / IN == pytest.approx(0.11)    # 0.5 x 0.2 + 0.020 / 2


@pytest.mark.parametrize("cls, pd_max, pd_min", [
    ("2G", 0.6598, 0.6424),  # 0.6667 - 0.008√.75 (.0069); tol .0052 + .030√(1/6) .0122 = .0174
    ("3G", 0.6615, 0.6534),  # 0.6667 - 0.006√.75 (.0052); tol .0024 + .014√(1/6) .0057 = .0081
    ("4G", 0.6632, 0.6574),  # 0.6667 - 0.004√.75 (.0035); tol .0017 + .010√(1/6) .0041 = .0058
])
def test_3_4_6_classes(registry, cls, pd_max, pd_min):
    lim = registry.limits(registry.parse(f"3/4-6 ACME-{cls}"))
    # B1.5 formulas (from memory)
    assert (inches(lim.pd_max), inches(lim.pd_min)) == (pd_max, pd_min)


@pytest.mark.parametrize("cls, pd_max, pd_min", [
    ("2G", 1.8637, 1.8402),  # 1.875 - .0113 (0.008√2); tol .0085 + .0150 = .0235
    ("3G", 1.8665, 1.8555),  # 1.875 - .0085 (0.006√2); tol .0040 + .0070 = .0110
    ("4G", 1.8693, 1.8615),  # 1.875 - .0057 (0.004√2); tol .0028 + .0050 = .0078
])
def test_2_4_classes(registry, cls, pd_max, pd_min):
    lim = registry.limits(registry.parse(f"2-4 ACME-{cls}"))
    # B1.5 formulas (from memory)
    assert (inches(lim.pd_max), inches(lim.pd_min)) == (pd_max, pd_min)
    assert inches(lim.major_min) == 1.9875          # 2 - 0.05 x 0.25


def test_1_2_10_external_and_internal(registry):
    ext = registry.limits(registry.parse("1/2-10 ACME-2G"))
    # 0.45 - 0.008√.5 (.0057) = .4443; tol .006√.5 (.0042) + .030√.1 (.0095) = .0137
    assert (inches(ext.pd_max), inches(ext.pd_min)) == (0.4443, 0.4306)
    assert inches(ext.clearance) == 0.02            # 10 tpi counts as "10 and coarser"
    nut = registry.limits(registry.parse("1/2-10 ACME-3G internal"))
    assert nut.spec.kind == "internal"
    # 3G nut: PD min basic 0.45, tol .0028√.5 (.0020) + .014√.1 (.0044) = .0064
    assert (inches(nut.pd_min), inches(nut.pd_max)) == (0.45, 0.4564)
    assert (inches(nut.minor_min), inches(nut.minor_max)) == (0.4, 0.405)   # D - p, + 0.05p
    assert inches(nut.major_min) == 0.52            # D + 0.020


def test_fine_pitch_clearance(registry):
    lim = registry.limits(registry.parse("1/4-16 ACME-2G"))
    assert inches(lim.clearance) == 0.01            # finer than 10 tpi: 0.010 in (from memory)
    assert inches(lim.minor_max) == round(0.25 - 1 / 16 - 0.010, 4)
    assert inches(lim.major_min) == 0.245           # 0.05p = .0031 < .005 minimum (from memory)


def test_stub_acme(registry):
    lim = registry.limits(registry.parse("1/2-10 STUB ACME-2G"))
    # ASME B1.8 (from memory): height 0.3p, PD = 0.5 - 0.03 = 0.47, 2G allowance and tolerance
    assert (inches(lim.pd_max), inches(lim.pd_min)) == (0.4643, 0.4506)
    assert inches(lim.minor_max) == 0.42            # 0.5 - 0.6 x 0.1 - 0.020
    assert lim.tip_flat / IN == pytest.approx(0.4224 * 0.1 - 0.259 * 0.02)
    assert lim.spec.form is STUB_ACME_29
    assert registry.classes(lim.spec) == ["2G"]
    with pytest.raises(UnsupportedClass, match="use 2G"):
        registry.parse("1/2-10 STUB ACME-3G")


def test_multi_start(registry):
    spec = registry.parse("1.000-0.4P-0.8L-ACME-2G")
    assert spec.starts == 2
    assert spec.pitch == pytest.approx(0.4 * IN) and spec.lead == pytest.approx(0.8 * IN)
    lim = registry.limits(spec)
    # tol .0060 + .030√.4 (.0190) = .0250, × 1.1 for two starts (B1.5, from memory) = .0275
    assert (inches(lim.pd_max), inches(lim.pd_min)) == (0.792, 0.7645)
    assert spec.designation == "1.000-0.4P-0.8L-ACME-2G"


@pytest.mark.parametrize("text, hand, kind, starts", [
    ("1-5 ACME-2G", "RH", "external", 1),
    ("3/4-6 ACME-2G-LH", "LH", "external", 1),
    ("1/2-10 ACME-3G internal", "RH", "internal", 1),
    ("1-1/2-4 ACME-4G", "RH", "external", 1),
    ("1.000-0.4P-0.8L-ACME-2G", "RH", "external", 2),
    ("2.875-0.4P-1.2L-ACME-3G-LH", "LH", "external", 3),
    ("1/2-10 STUB ACME-2G", "RH", "external", 1),
])
def test_designation_round_trip(round_trip, text, hand, kind, starts):
    round_trip(text, hand, kind, starts)


def test_no_class_means_2g(registry):
    spec = registry.parse("1-5 ACME")
    assert spec.tol_class is None and spec.designation == "1-5 ACME"
    lim = registry.limits(spec)
    assert lim.pd_max == registry.limits(registry.parse("1-5 ACME-2G")).pd_max
    assert any("2G" in n for n in lim.notes)


def test_off_series_pitch_is_computed_and_said(registry):
    lim = registry.limits(registry.parse("1-6 ACME-2G"))
    assert any("gives 1 in with 5 tpi" in n for n in lim.notes)


def test_catalogue_and_classes(registry):
    cat = acme.catalogue()
    names = [s.designation for s in cat]
    # ASME B1.5 Acme series (from memory): 1/4-16 ... 5-2
    for n in ("1/4-16 ACME-2G", "1/2-10 ACME-2G", "1-5 ACME-2G", "2-4 ACME-2G", "5-2 ACME-2G",
              "1-5 STUB ACME-2G"):
        assert n in names
    assert all(registry.parse(n) == s for n, s in zip(names, cat))
    assert registry.classes(registry.parse("1-5 ACME")) == ["2G", "3G", "4G"]
    assert registry.classes(registry.parse("1-5 ACME internal")) == ["2G", "3G", "4G"]
    for s in cat:
        lim = registry.limits(s)
        assert lim.minor_min < lim.minor_max < lim.pd_min < lim.pd_max < lim.major_max


def test_refusals(registry):
    with pytest.raises(UnsupportedClass, match="2G, 3G, 4G") as e:
        registry.parse("1-5 ACME-2C")
    assert "centralizing" in str(e.value)
    with pytest.raises(UnsupportedClass, match="2G, 3G, 4G"):
        registry.parse("1-5 ACME-2A")
    with pytest.raises(UnknownThread, match="1 to 20 tpi") as e:
        registry.parse("1/2-30 ACME")
    assert e.value.suggestions == ("1/2-10 ACME",)
    with pytest.raises(UnknownThread, match="1/4 to 5 in"):
        registry.parse("6-2 ACME")
    with pytest.raises(InvalidEntry, match="whole number of pitches"):
        registry.parse("1.000-0.4P-0.9L-ACME-2G")


def test_calc_limits_json(capsys):
    assert main(["calc", "limits", "1-5 ACME-2G", "--json"]) == 0
    data = json.loads(capsys.readouterr().out)
    assert data["units"] == "in" and data["form_angle_deg"] == 29.0 and data["tpi"] == 5
    assert data["clearance"] == 0.02                      # B1.5 minor diameter clearance
    assert data["tip_flat"] == pytest.approx(0.0690, abs=1e-4)   # 0.3707 x 0.2 - 0.259 x 0.02
    assert data["pitch_diameter"] == {"max": 0.892, "min": 0.8726}
