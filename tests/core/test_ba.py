"""BA threads (BS 93): table, form, classes, limits, designations, errors.

Check values are from BS 93 unless marked.
"""

import math
from decimal import ROUND_HALF_UP, Decimal

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

import shopterm.standards as standards
from shopterm.errors import InvalidEntry, ShoptermError, UnknownThread, UnsupportedClass
from shopterm.standards import ba
from shopterm.standards.forms import BA_47_5


def _round_mm(x: str) -> float:
    """Round a decimal string to 0.001 mm, half up (independent of the module's rounding)."""
    return float(Decimal(x).quantize(Decimal("0.001"), rounding=ROUND_HALF_UP))


# BS 93 major and pitch
TABLE = [(0, 6.0, 1.00), (1, 5.3, 0.90), (2, 4.7, 0.81), (3, 4.1, 0.73), (4, 3.6, 0.66),
         (5, 3.2, 0.59), (6, 2.8, 0.53), (7, 2.5, 0.48), (8, 2.2, 0.43), (9, 1.9, 0.39),
         (10, 1.7, 0.35)]


def _two_sig(x: float) -> float:
    return float(f"{x:.2g}")


# --- table and form ----------------------------------------------------------------------------

@pytest.mark.parametrize("n, major, pitch", TABLE)  # BS 93 table
def test_table(n, major, pitch):
    spec = ba.parse(f"{n}BA")
    assert (spec.family, spec.series, spec.size) == ("ba", "BA", f"{n}BA")
    assert (spec.major, spec.pitch) == (major, pitch)
    assert spec.form is BA_47_5 and spec.native_unit == "mm"


@pytest.mark.parametrize("n, major, pitch", TABLE)
def test_pitch_is_point_nine_to_the_n_to_two_figures(n, major, pitch):
    # rule: pitch of n BA = 0.9^n mm to two significant figures, BS 93
    assert _two_sig(0.9 ** n) == pitch


@pytest.mark.parametrize("n, major, pitch", TABLE)
def test_major_is_six_p_to_the_six_fifths(n, major, pitch):
    # rule D = 6·P^1.2 to two significant figures  # from memory (BS 93 derivation)
    assert _two_sig(6 * pitch ** 1.2) == major


@pytest.mark.parametrize("value, published", [
    (BA_47_5.height, 1.136337),   # BS 93 H = 1.136337P [P]
    (BA_47_5.depth, 0.6),         # BS 93 depth 0.6P [P]
    (BA_47_5.pd_offset, 0.6),     # BS 93 E = D − 0.6P [P]
    (BA_47_5.minor_offset, 1.2),  # BS 93 core = D − 1.2P [P]
    (BA_47_5.root_radius, 0.180835),  # BS 93 r = 0.180835P [P]
    (ba.RADIUS_FACTOR, 0.180835),     # BS 93 [P]
])
def test_form_constants(value, published):
    assert value == pytest.approx(published, abs=1e-6)


def test_radius_is_the_exact_tangent_radius_not_2p_over_11():
    # computed from the form: H = P/(2 tan 23.75°), equal truncations s = (H − 0.6)/2,
    # arc tangent to both flanks: r = s·sin a / (1 − sin a)
    half = math.radians(23.75)
    height = 0.5 / math.tan(half)
    s = (height - 0.6) / 2
    r = s * math.sin(half) / (1 - math.sin(half))
    assert r == pytest.approx(0.180835, abs=1e-6)  # BS 93 exact tangent radius [P]
    assert round(2 / 11, 3) != round(r, 3)  # 2P/11 is only the rounded nominal [P]


@pytest.mark.parametrize("n, effective", [
    (0, 5.400),  # computed from E = D − 0.6P, BS 93
    (2, 4.214),  # [C]
    (4, 3.204),  # [C]
    (6, 2.482),  # [C]
])
def test_effective_diameters(n, effective):
    major, pitch = ba.BA[n]
    assert major - 0.6 * pitch == pytest.approx(effective, abs=1e-9)  # re-derived
    lim = ba.limits(ba.parse(f"{n}BA"))
    assert lim.basic_pd == pytest.approx(effective, abs=1e-9)
    assert lim.pd_max == lim.pd_min == lim.basic_pd
    assert any("Basic sizes" in note for note in lim.notes)


@pytest.mark.parametrize("n, major, pitch", TABLE)
def test_core_depth_radius(n, major, pitch):
    lim = ba.limits(ba.parse(f"{n}BA"))
    assert lim.basic_minor == pytest.approx(major - 1.2 * pitch, abs=1e-12)  # BS 93 [P]
    assert lim.depth == pytest.approx(0.6 * pitch, abs=1e-12)                # BS 93 [P]
    assert lim.root_radius_min == lim.root_radius_max == pytest.approx(0.180835 * pitch)


# --- classes and limits ------------------------------------------------------------------------

@pytest.mark.parametrize("n, major, pitch", TABLE)
def test_internal_normal_effective_tolerance(n, major, pitch):
    # BS 93:2008 internal effective-diameter tolerance 0.12P + 0.03 mm [P]; no allowance
    tol = _round_mm(str(Decimal("0.12") * Decimal(str(pitch)) + Decimal("0.03")))
    lim = ba.limits(ba.parse(f"{n}BA normal internal"))
    e = major - 0.6 * pitch
    assert lim.pd_min == pytest.approx(e, abs=1e-12)
    assert lim.pd_max == pytest.approx(e + tol, abs=1e-12)
    assert lim.major_min == major and lim.major_max is None
    assert lim.minor_min == pytest.approx(major - 1.2 * pitch) and lim.minor_max is None


def test_2ba_internal_normal_worked():
    # computed from 0.12 × 0.81 + 0.03 = 0.1272 → 0.127 mm (BS 93:2008 [P]); E = 4.214 [C]
    lim = ba.limits(ba.parse("2BA normal internal"))
    assert (lim.pd_min, round(lim.pd_max, 6)) == (pytest.approx(4.214), 4.341)


@pytest.mark.parametrize("cls, factor", [("close", "0.15"), ("normal", "0.20")])  # BS 93:2008 [P]
@pytest.mark.parametrize("n, major, pitch", TABLE)
def test_external_major_tolerance(n, major, pitch, cls, factor):
    td = _round_mm(str(Decimal(factor) * Decimal(str(pitch))))
    lim = ba.limits(ba.parse(f"{n}BA {cls}"))
    assert lim.major_max == major
    assert lim.major_min == pytest.approx(major - td, abs=1e-12)


@pytest.mark.parametrize("cls, a, b", [("close", "0.08", "0.02"),     # from memory
                                       ("normal", "0.10", "0.025")])  # from memory
def test_external_effective_tolerance_is_marked_provisional(cls, a, b):
    lim = ba.limits(ba.parse(f"2BA {cls}"))
    tol = _round_mm(str(Decimal(a) * Decimal("0.81") + Decimal(b)))
    assert lim.pd_max == pytest.approx(4.214)  # no allowance in BS 93  # from memory
    assert lim.pd_min == pytest.approx(4.214 - tol, abs=1e-12)
    assert any("Provisional" in note for note in lim.notes)


def test_close_band_inside_normal_band():
    close, normal = ba.limits(ba.parse("4BA close")), ba.limits(ba.parse("4BA normal"))
    assert normal.pd_min < close.pd_min < close.pd_max == normal.pd_max
    assert normal.major_min < close.major_min


def test_classes_by_kind():
    spec = ba.parse("2BA")
    assert ba.classes(spec) == ["close", "normal"]           # BS 93 external classes
    assert ba.classes(spec.with_(kind="internal")) == ["normal"]  # BS 93 internal class


@pytest.mark.parametrize("text, word", [
    ("2BA close internal", "for external threads"),
    ("2BA tight", "not a BS 93 class"),
    ("2BA medium", "not a BS 93 class"),
])
def test_refused_classes(text, word):
    with pytest.raises(UnsupportedClass) as info:
        ba.parse(text)
    assert word in str(info.value)
    assert all(ba.parse(s) is not None for s in info.value.suggestions)


def test_limits_refuse_a_wrong_class_set_by_hand():
    with pytest.raises(UnsupportedClass):
        ba.limits(ba.parse("2BA").with_(kind="internal", tol_class="close"))


# --- designations ------------------------------------------------------------------------------

@pytest.mark.parametrize("text, expected", [
    ("2BA", "2BA"), ("0 BA", "0BA"), ("2ba close", "2BA close"), ("2 BA normal", "2BA normal"),
    ("2BA-close", "2BA close"), ("10BA normal internal", "10BA normal internal"),
])
def test_designations(text, expected):
    assert ba.format(ba.parse(text)) == expected


@pytest.mark.parametrize("text", ["M2", "2 BSW", "BA", "2BAX", "SPECIAL 4.7x0.81 47.5", ""])
def test_not_ba(text):
    assert ba.parse(text) is None


@pytest.mark.parametrize("text", ["11BA", "25BA"])
def test_sizes_beyond_10ba(text):
    with pytest.raises(UnknownThread, match="0BA to 10BA"):
        ba.parse(text)


def test_catalogue_round_trips():
    cat = ba.catalogue()
    assert [s.size for s in cat] == [f"{n}BA" for n in range(11)]
    for spec in cat:
        assert spec.kind == "external" and spec.tol_class == "normal"
        for kind in ("external", "internal"):
            for cls in [None] + ba.classes(spec.with_(kind=kind)):
                variant = spec.with_(kind=kind, tol_class=cls)
                assert ba.parse(ba.format(variant)) == variant


def test_limits_of_another_family_refused():
    from shopterm.standards import whitworth
    with pytest.raises(InvalidEntry):
        ba.limits(whitworth.parse("3/8 BSW"))


@settings(max_examples=150, deadline=None)
@given(st.text(alphabet="0123456789 BAbaclosenrmitx-", max_size=20))
def test_parse_never_raises_anything_but_shopterm_errors(text):
    try:
        spec = ba.parse(text)
    except ShoptermError:
        return
    if spec is not None:
        assert ba.parse(ba.format(spec)) == spec


# --- registry ----------------------------------------------------------------------------------

def test_registry_parse(registry):
    spec = registry.parse("2BA")
    assert (spec.family, spec.size, spec.major, spec.pitch) == ("ba", "2BA", 4.7, 0.81)  # [P]
    assert registry.parse("0 BA").size == "0BA"
    nut = registry.parse("2BA normal internal")
    assert (nut.kind, nut.tol_class) == ("internal", "normal")
    assert registry.parse(nut.designation) == nut
    assert registry.parse("4BA", kind="internal").kind == "internal"


def test_registry_refuses_close_nut(registry):
    with pytest.raises(ShoptermError):
        registry.parse("2BA close", kind="internal")
