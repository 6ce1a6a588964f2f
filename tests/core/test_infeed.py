"""Infeed methods: compound angles, factors, scale settings, errors."""

from __future__ import annotations

import math
from fractions import Fraction

import pytest

from shopterm.cutting.infeed import compound_factor, infeed_method
from shopterm.errors import InvalidEntry
from shopterm.lathe.machine import Dial, Lathe, Leadscrew


@pytest.mark.parametrize("angle, factor", [
    (29.5, 1.14896),   # computed, 1/cos 29.5°
    (27.5, 1.12738),   # computed, 1/cos 27.5°
])
def test_published_compound_factors(angle, factor):
    assert compound_factor(angle) == pytest.approx(factor, abs=5e-6)
    # computed from cos: the compound's radial component of one unit of travel
    assert 1 / compound_factor(angle) == pytest.approx(math.cos(math.radians(angle)))


@pytest.mark.parametrize("method, form, true", [
    ("modified", 60, 29.5),   # US Navy machinery training manual
    ("modified", 55, 27.0),   # half of 55 less the 0.5° default offset (task rule)
    ("flank", 60, 30.0),      # half the included angle
    ("flank", 55, 27.5),
    ("radial", 60, 0.0),
    ("alternating", 60, 90.0),
])
def test_true_angles(method, form, true):
    m = infeed_method(method, form)
    assert m.true_angle_deg == pytest.approx(true)
    assert m.steps


def _lathe(zero):
    d = Dial("mm", 0.02, 100)
    return Lathe("test", Leadscrew(Fraction(3)), d, d, compound_zero=zero)


def test_scale_reading_bed_zero():
    # US Navy machinery training manual (from memory): scales zeroed along the bed read 60.5 for 29.5
    m = infeed_method("modified", 60, lathe=_lathe("bed"))
    assert m.scale_reading_deg == pytest.approx(60.5)
    assert m.true_angle_deg == pytest.approx(29.5)
    m = infeed_method("modified", 60, lathe=_lathe("cross_slide"))
    assert m.scale_reading_deg == pytest.approx(29.5)
    assert not any("No lathe" in n for n in m.notes)


def test_travel_and_inverse():
    m = infeed_method("modified", 60)
    assert m.feed_travel(0.6) == pytest.approx(0.6 * 1.14896, abs=1e-5)  # computed factor, 1/cos 29.5°
    assert m.radial_for(m.feed_travel(0.6)) == pytest.approx(0.6)
    assert m.feeds_with == "compound"
    assert infeed_method("radial", 60).feeds_with == "cross-slide"


def test_alternating_side_shift():
    m = infeed_method("alternating", 60)
    assert m.side_shift_per_depth == pytest.approx(math.tan(math.radians(29.5)))
    assert any("parallel to the bed" in s for s in m.steps)


def test_angle_override_and_warning():
    m = infeed_method("modified", 60, angle_deg=29.0)
    assert m.true_angle_deg == 29.0
    steep = infeed_method("flank", 60, angle_deg=31.0)
    assert any("stepped" in n for n in steep.notes)


@pytest.mark.parametrize("kwargs, msg", [
    (dict(method="spiral", form_angle_deg=60), "not an infeed method"),
    (dict(method="flank", form_angle_deg=60, angle_deg=95), "cannot feed"),
    (dict(method="radial", form_angle_deg=60, angle_deg=29.5), "Leave the angle out"),
    (dict(method="modified", form_angle_deg=60, offset_deg=40), "offset"),
    (dict(method="flank", form_angle_deg=0), "square thread"),   # 0°: parallel flanks
    (dict(method="flank", form_angle_deg=-5), "form angle"),
])
def test_errors(kwargs, msg):
    with pytest.raises(InvalidEntry, match=msg):
        infeed_method(**kwargs)


def test_internal_steps_say_outward():
    m = infeed_method("modified", 60, internal=True)
    assert any("outward" in s for s in m.steps)
