"""Whitworth-form threads (BSW, BSF, model-engineer): BS 84 basic sizes, designations, errors.

Check values are from BS 84 as printed (tagged [P]) unless marked.
"""

import math

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

import shopterm.standards as standards
from shopterm.errors import InvalidEntry, ShoptermError, UnknownThread, UnsupportedClass
from shopterm.standards import whitworth as w
from shopterm.standards.forms import WHITWORTH_55

IN = 25.4  # exact, NIST SP 811


# --- the form --------------------------------------------------------------------------------

@pytest.mark.parametrize("value, published", [
    (WHITWORTH_55.height, 0.960491),        # BS 84 H = 0.960491P, [P]
    (WHITWORTH_55.depth, 0.640327),         # BS 84 h = 2/3 H = 0.640327P [P]
    (WHITWORTH_55.pd_offset, 0.640327),     # BS 84 E = D − 0.640327P [P]
    (WHITWORTH_55.minor_offset, 1.280654),  # BS 84 core = D − 1.280654P [P]
    (WHITWORTH_55.root_radius, 0.137329),   # BS 84 r = 0.137329P [P]
    (w.PD_FACTOR, 0.640327),                # BS 84 [P]
    (w.CORE_FACTOR, 1.280654),              # BS 84 [P]
    (w.RADIUS_FACTOR, 0.137329),            # BS 84 [P]
])
def test_form_constants(value, published):
    assert value == pytest.approx(published, abs=1e-6)


def test_radius_is_tangent_to_the_flanks_at_the_h6_truncation():
    # computed from the geometry of the BS 84 form: H = P/(2 tan 27.5°), H/6 cut off at crest,
    # arc tangent to both flanks through the truncation line: r = s·sin a / (1 − sin a)
    half = math.radians(27.5)
    height = 0.5 / math.tan(half)
    s = height / 6
    r = s * math.sin(half) / (1 - math.sin(half))
    assert r == pytest.approx(0.137329, abs=1e-6)  # BS 84 r = 0.137329P [P]
    assert height == pytest.approx(0.960491, abs=1e-6)  # BS 84 H [P]


# --- BSW basic sizes ---------------------------------------------------------------------------

@pytest.mark.parametrize("designation, tpi, e_in, core_in", [
    ("1/8 BSW", 40, 0.1090, 0.0930),  # BS 84 BSW basic 1/8-40, [P]
    ("1/4 BSW", 20, 0.2180, 0.1860),  # BS 84 BSW basic 1/4-20 [P]
    ("3/8 BSW", 16, 0.3350, 0.2950),  # BS 84 BSW basic 3/8-16 [P]
    ("1/2 BSW", 12, 0.4466, 0.3933),  # BS 84 BSW basic 1/2-12 [P]
    ("3/4 BSW", 10, 0.6860, None),    # BS 84 BSW basic 3/4-10 E [P]
    ("1 BSW", 8, 0.9200, None),       # BS 84 BSW basic 1-8 E [P]
])
def test_bsw_basic_effective_and_core(designation, tpi, e_in, core_in):
    spec = w.parse(designation)
    assert spec.tpi == tpi
    assert spec.pitch == pytest.approx(IN / tpi, rel=1e-12)
    _, e, core = w.basic_inches(spec)
    assert e == pytest.approx(e_in, abs=1e-9)
    lim = w.limits(spec)
    assert lim.basic_pd == pytest.approx(e_in * IN, abs=1e-9)
    assert (lim.pd_max, lim.pd_min) == (lim.basic_pd, lim.basic_pd)
    if core_in is not None:
        assert core == pytest.approx(core_in, abs=1e-9)
        assert lim.basic_minor == pytest.approx(core_in * IN, abs=1e-9)


@pytest.mark.parametrize("size, tpi", [
    ("1/4", 26), ("5/16", 22), ("3/8", 20), ("7/16", 18), ("1/2", 16),  # BS 84 BSF pitches [P]
])
def test_bsf_pitches(size, tpi):
    spec = w.parse(f"{size} BSF")
    assert (spec.series, spec.tpi) == ("BSF", tpi)
    assert spec.pitch == pytest.approx(IN / tpi, rel=1e-12)


def test_bsf_basic_effective_diameter_rederived():
    # computed from E = D − 0.640327/n (BS 84 [P]), 3/8-20 BSF, rounded to 0.0001 in as BS 84 prints
    e = round(0.375 - 0.640327 / 20, 4)
    assert w.limits(w.parse("3/8 BSF")).basic_pd == pytest.approx(e * IN, abs=1e-9)


@pytest.mark.parametrize("text, size, tpi", [
    ("5/32x40 ME", "5/32", 40),   # model-engineer sizes in use, published ME series table [P]
    ("3/16x40 ME", "3/16", 40),   # [P]
    ("7/32x40 ME", "7/32", 40),   # [P]
    ("1/4x40 ME", "1/4", 40),     # [P]
    ("5/16x32 ME", "5/16", 32),   # [P]
    ("3/8-32 ME", "3/8", 32),     # [P]
    ("3/8 x 40 ME", "3/8", 40),   # [P]
])
def test_model_engineer_sizes(text, size, tpi):
    spec = w.parse(text)
    assert (spec.family, spec.series, spec.size, spec.tpi) == ("whitworth", "ME", size, tpi)
    assert spec.form is WHITWORTH_55
    assert w.format(spec) == f"{size}x{tpi} ME"


def test_model_engineer_limits_are_basic_with_a_note():
    lim = w.limits(w.parse("1/4x40 ME"))
    p = IN / 40
    # computed from E = D − 0.640327P, BS 84 form [P], rounded to 0.0001 in
    assert lim.basic_pd == pytest.approx(round(0.25 - 0.640327 / 40, 4) * IN, abs=1e-9)
    assert lim.pd_tolerance == 0
    assert lim.depth == pytest.approx(0.640327 * p, rel=1e-9)  # BS 84 depth [P]
    assert any("no published tolerance" in n for n in lim.notes)


@pytest.mark.parametrize("designation", ["3/8 BSW", "1/4 BSF", "1/4x40 ME"])
def test_depth_radius_and_basic_note(designation):
    spec = w.parse(designation)
    lim = w.limits(spec)
    assert lim.depth == pytest.approx(0.640327 * spec.pitch, rel=1e-9)  # BS 84 [P]
    assert lim.root_radius_min == lim.root_radius_max == pytest.approx(
        0.137329 * spec.pitch, rel=1e-9)  # BS 84 [P]
    assert lim.major_max == lim.major_min == spec.major
    assert lim.minor_min is None and lim.minor_max == lim.basic_minor
    assert any("Basic sizes" in n for n in lim.notes)


def test_internal_limits_leave_the_open_sides_unbounded():
    lim = w.limits(w.parse("3/8 BSW internal"))
    assert lim.major_max is None and lim.major_min == pytest.approx(0.375 * IN)
    assert lim.minor_min == lim.basic_minor and lim.minor_max is None
    # BS 84 BSW basic 3/8-16 E 0.3350 [P]
    assert lim.pd_min == lim.pd_max == pytest.approx(0.3350 * IN, abs=1e-9)


# --- designations ------------------------------------------------------------------------------

@pytest.mark.parametrize("text, expected", [
    ("3/8 BSW", "3/8 BSW"),
    ("3/8-16 BSW", "3/8 BSW"),
    ('3/8" BSW', "3/8 BSW"),
    (".375 BSW", "3/8 BSW"),
    ("1-1/2 BSW", "1-1/2 BSW"),
    ("1 1/2 BSW", "1-1/2 BSW"),
    ("1-1/2-6 BSW", "1-1/2 BSW"),
    ("1-8 BSW", "1 BSW"),
    ("3/8 whitworth", "3/8 BSW"),
    ("1/4 bsf", "1/4 BSF"),
    ("1/4-40 me", "1/4x40 ME"),
    ("3/8 BSW internal", "3/8 BSW internal"),
])
def test_designations_read(text, expected):
    assert w.format(w.parse(text)) == expected


@pytest.mark.parametrize("text", ["2BA", "M10x1.5", "1/4-20 UNC", "1/4-20", "SPECIAL 20x1.25 60",
                                  "3/8 BSWX", "", "BSW"])
def test_other_families_text_is_not_taken(text):
    assert w.parse(text) is None


def test_catalogue_round_trips_and_is_external_basic():
    cat = w.catalogue()
    assert len(cat) == len(w.BSW) + len(w.BSF) + sum(len(v) for v in w.ME.values())
    for spec in cat:
        assert spec.kind == "external" and spec.tol_class is None and spec.native_unit == "in"
        assert w.parse(w.format(spec)) == spec
        internal = spec.with_(kind="internal")
        assert w.parse(w.format(internal)) == internal


def test_bsw_range_and_bsf_range():
    assert list(w.BSW)[0] == "1/8" and list(w.BSW)[-1] == "2"   # BSW 1/8–2 in (brief, BS 84)
    assert list(w.BSF)[0] == "3/16" and list(w.BSF)[-1] == "1"  # BSF 3/16–1 in (brief, BS 84)


# --- classes: named by BS 84, not built in ----------------------------------------------------

@pytest.mark.parametrize("text", ["3/8 BSW medium", "3/8 BSW close", "3/8 BSW free",
                                  "3/8 BSW normal", "1/4 BSF medium internal", "3/8 BSW-medium"])
def test_bs84_classes_are_refused_with_a_way_forward(text):
    with pytest.raises(UnsupportedClass) as exc:
        w.parse(text)
    msg = str(exc.value)
    assert "not built into shopterm" in msg and "SPECIAL" in msg
    assert exc.value.suggestions and w.parse(exc.value.suggestions[0]) is not None


def test_unknown_class_word_lists_the_bs84_classes():
    with pytest.raises(UnsupportedClass, match="close, medium, free"):
        w.parse("3/8 BSW tight")


def test_model_engineer_class_refused_pointing_to_special():
    with pytest.raises(UnsupportedClass, match="no published tolerance table") as exc:
        w.parse("1/4x40 ME medium")
    assert "SPECIAL 0.25x40TPI 55" in str(exc.value)
    # the suggested special really parses (allowance/tolerance placeholders filled in)
    from shopterm.standards import special
    assert special.parse("SPECIAL 0.25x40TPI 55 A0.001 T0.002").form is WHITWORTH_55


def test_classes_and_limits_refuse_a_class_set_by_hand():
    spec = w.parse("3/8 BSW")
    assert w.classes(spec) == []
    with pytest.raises(UnsupportedClass):
        w.limits(spec.with_(tol_class="medium"))


# --- errors ------------------------------------------------------------------------------------

@pytest.mark.parametrize("text, exc, words", [
    ("3/8-20 BSW", UnknownThread, "3/8 BSF"),      # 20 tpi is the BSF pitch, BS 84 [P]
    ("1/3 BSW", UnknownThread, "BSW sizes are"),
    ("1/8 BSF", UnknownThread, "BSF sizes are"),
    ("1/4 ME", InvalidEntry, "threads per inch"),
    ("1/4x60 ME", UnknownThread, "32 or 40 tpi"),
    ("5/8x40 ME", UnknownThread, "5/8x32 ME"),
    ("0 BSW", InvalidEntry, "greater than zero"),
    ("1/0 BSW", InvalidEntry, "0 below the line"),
])
def test_errors_say_what_to_do(text, exc, words):
    with pytest.raises(exc) as info:
        w.parse(text)
    assert words in str(info.value)


def test_limits_of_another_family_refused():
    from shopterm.standards import ba
    with pytest.raises(InvalidEntry):
        w.limits(ba.parse("2BA"))


@settings(max_examples=150, deadline=None)
@given(st.text(alphabet="0123456789/-. xXBSWFMEbswfme\"", max_size=16))
def test_parse_never_raises_anything_but_shopterm_errors(text):
    try:
        spec = w.parse(text)
    except ShoptermError:
        return
    if spec is not None:
        assert w.parse(w.format(spec)) == spec


# --- registry ----------------------------------------------------------------------------------

def test_registry_parses_whitworth(registry):
    spec = registry.parse("3/8 BSW")
    assert (spec.family, spec.series, spec.size) == ("whitworth", "BSW", "3/8")
    me = registry.parse("1/4x40 ME")
    assert (me.family, me.series, me.tpi) == ("whitworth", "ME", 40)
    assert registry.format_designation(me) == "1/4x40 ME"


def test_registry_kind_and_hand(registry):
    spec = registry.parse("3/8 BSW LH internal")
    assert (spec.kind, spec.hand) == ("internal", "LH")
    assert registry.parse(spec.designation) == spec
    assert registry.parse("1/4 BSF", kind="internal").kind == "internal"


def test_bsw_is_not_unc(registry):
    pytest.importorskip("shopterm.standards.unified")
    bsw = registry.parse("1/4 BSW")
    unc = registry.parse("1/4-20 UNC")
    assert (bsw.family, bsw.form.angle_deg) == ("whitworth", 55.0)
    assert (unc.family, unc.form.angle_deg) == ("unified", 60.0)
    assert bsw.tpi == unc.tpi == 20 and bsw.major == pytest.approx(unc.major)
    # BS 84 BSW 1/4-20 E 0.2180 [P] vs ASME B1.1 basic PD D − 0.649519/n = 0.21752 [P formula]
    assert registry.limits(bsw).basic_pd == pytest.approx(0.2180 * IN, abs=1e-9)
    assert registry.limits(unc).basic_pd == pytest.approx((0.25 - 0.649519 / 20) * IN, abs=0.00006 * IN)
    assert registry.limits(unc).basic_pd < registry.limits(bsw).basic_pd
