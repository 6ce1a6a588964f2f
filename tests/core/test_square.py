"""Square threads: no standard; the usual practical proportions and the fit the user gives."""

from __future__ import annotations

import pytest

from shopterm.errors import InvalidEntry
from shopterm.standards.forms import FORMS, SQUARE_0

IN = 25.4


def test_basic_sizes_metric(registry):
    lim = registry.limits(registry.parse("SQUARE 25x5"))
    # depth 0.5P, d2 = d - 0.5P, minor d - P, tool 0.5P wide (common practice, no source)
    assert (lim.basic_pd, lim.basic_minor, lim.depth) == (22.5, 20.0, 2.5)
    assert lim.pd_max == lim.pd_min == 22.5 and lim.tip_flat == 2.5
    assert any("no standard" in n for n in lim.notes)
    assert lim.spec.form is SQUARE_0 and SQUARE_0.angle_deg == 0


def test_nut_has_the_clearance(registry):
    lim = registry.limits(registry.parse("SQUARE 25x5 internal"))
    # nut 0.1 mm deeper and its groove 0.1 mm wider (common practice, no source)
    assert lim.clearance == 0.1 and lim.depth == pytest.approx(2.6)
    assert lim.tip_flat == pytest.approx(2.6) and lim.major_min == pytest.approx(25.2)
    assert lim.minor_min == 20.0


def test_inch_with_a_fit(registry):
    spec = registry.parse("SQUARE 1-5 A0.005 T0.01")
    assert spec.tpi == 5 and spec.pitch == pytest.approx(0.2 * IN)
    lim = registry.limits(spec)
    # d2 = 1 - 0.1 = 0.9 in, less the allowance, band T wide (the user's fit)
    assert lim.pd_max / IN == pytest.approx(0.895) and lim.pd_min / IN == pytest.approx(0.885)


@pytest.mark.parametrize("text", ["SQUARE 25x5", "SQUARE 1-5", "SQUARE 1-1/4-4 A0.004 T0.008",
                                  "SQUARE 40x8 S2 internal", "SQUARE 20x4 T0.1"])
def test_round_trip(registry, text):
    spec = registry.parse(text)
    assert spec.designation == text and registry.parse(text) == spec


def test_refusals(registry):
    with pytest.raises(InvalidEntry, match="no core"):
        registry.parse("SQUARE 10x5")
    with pytest.raises(InvalidEntry, match="not understood"):
        registry.parse("SQUARE 25x5 Q3")
    with pytest.raises(InvalidEntry, match="write a square thread"):
        registry.parse("SQUARE 25")


def test_square_form_is_not_a_flanked_form(registry):
    # FORMS holds the forms with a flank angle (wires and compound infeed work from it)
    assert SQUARE_0 not in FORMS.values()
    assert registry.classes(registry.parse("SQUARE 25x5")) == []
