"""Identify a thread from bench measurements: ranking, reasons, ambiguity, telling measurements."""

from fractions import Fraction

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from shopterm.cutting import wires
from shopterm.errors import InvalidEntry
from shopterm.standards import catalogue
from shopterm.standards.forms import ISO_60, WHITWORTH_55
from shopterm.cutting.identify import (AMBIGUOUS_RATIO, identify, measured, pitch_check_count,
                                         pitch_from_count)

IN = 25.4  # mm per inch, exact (NIST SP 811)


# ---- pitch from a count -----------------------------------------------------------------------

@pytest.mark.parametrize("count, length, counted, expected", [
    (11, 10.0, "crests", Fraction(10, 10)),        # computed from P = L/(n − 1), definition of pitch
    (10, 12.7, "spaces", Fraction(127, 100)),      # computed from P = L/n, definition of pitch
    (21, 25.4, "crests", Fraction(254, 200)),      # computed: 20 pitches in an inch = 20 tpi (ASME B1.1 1/4-20)
    (16, 25.4, "spaces", Fraction(254, 160)),      # computed: 16 tpi = 1.5875 mm (ASME B1.1 3/8-16)
])
def test_pitch_from_count(count, length, counted, expected):
    assert pitch_from_count(count, length, counted) == pytest.approx(float(expected), rel=1e-12)


def test_crests_and_spaces_differ_by_one_pitch():
    # computed from the two conventions: n crests span n − 1 spaces
    assert pitch_from_count(11, 15.0, "crests") == pytest.approx(pitch_from_count(10, 15.0, "spaces"))


@pytest.mark.parametrize("count, length, counted", [
    (1, 10.0, "crests"),      # one crest spans no pitch
    (0, 10.0, "spaces"),
    (10, 0.0, "crests"),
    (10, -5.0, "spaces"),
    (10.5, 10.0, "crests"),
    (True, 10.0, "crests"),
    (10, 10.0, "teeth"),
    (10, float("nan"), "crests"),
])
def test_pitch_from_count_errors(count, length, counted):
    with pytest.raises(InvalidEntry):
        pitch_from_count(count, length, counted)


# ---- measurements checked and cross-compared --------------------------------------------------

def test_tpi_and_mm_are_cross_compared_and_combined():
    m = measured(pitch=1.27, tpi=20)          # ASME B1.1: 20 tpi = 25.4/20 = 1.27 mm
    assert m.pitch.pitch == pytest.approx(25.4 / 20, rel=1e-12)
    assert m.pitch.tpi == pytest.approx(20, rel=1e-12)
    assert len(m.pitch_entries) == 2


def test_count_and_gauge_combine():
    m = measured(tpi=20, count=21, length=25.4)   # computed: 20 pitches over an inch
    assert m.pitch.pitch == pytest.approx(1.27, rel=1e-12)


@pytest.mark.parametrize("kw", [
    dict(pitch=1.5, tpi=20),                       # 1.5 mm is 16.93 tpi, not 20
    dict(pitch=1.0, count=11, length=12.7),        # 1.27 mm counted against a 1 mm gauge
])
def test_disagreeing_pitches_are_refused(kw):
    with pytest.raises(InvalidEntry, match="disagree"):
        measured(**kw)


@pytest.mark.parametrize("kw, words", [
    (dict(), "Measure something"),
    (dict(major=-6.0), "greater than zero"),
    (dict(major=6.0, minor=6.5), "smaller than the major"),
    (dict(major=6.0, count=10), "count"),
    (dict(major=6.0, length=10.0), "count"),
    (dict(major=6.0, angle=120), "included angle"),
    (dict(major=6.0, angle="60"), "included angle"),
    (dict(minor=5.0, wires=[(0.7, 6.5)]), "Wires measure a bolt"),
    (dict(major=6.0, wires=[(0.7,)]), "wire size"),
    (dict(major=6.0, pitch=float("inf")), "number"),
    (dict(major=6.0, kind="sideways"), "external or internal"),
])
def test_measurement_errors(kw, words):
    with pytest.raises(InvalidEntry, match=words):
        identify(**kw)


def test_limit_must_be_positive():
    with pytest.raises(InvalidEntry):
        identify(major=6.0, limit=0)


def test_kind_follows_what_was_measured():
    assert measured(major=6.0).kind == "external"
    assert measured(minor=5.0).kind == "internal"
    assert measured(major=6.0, minor=4.8).kind == "external"   # minor is the bolt's root


# ---- the true thread ranks first --------------------------------------------------------------

# (designation, basic major [mm], pitch entry, angle or None, wear [mm])
# Wear: the major measured a few hundredths under basic, as a used part reads (a test input).
TRUE_FIRST = [
    ("M10x1.5", 10.0, dict(pitch=1.5), None, 0.04),          # ISO 261: M10 coarse P 1.5
    ("M6x1", 6.0, dict(pitch=1.0), 60, 0.05),                # ISO 261: M6 coarse P 1 (60° rules out 0BA)
    ("M8x1.25", 8.0, dict(pitch=1.25), None, 0.05),          # ISO 261: M8 coarse P 1.25
    ("M12x1.25", 12.0, dict(pitch=1.25), None, 0.05),        # ISO 261: M12 fine P 1.25
    ("M16x1.5", 16.0, dict(pitch=1.5), None, 0.07),          # ISO 261: M16 fine P 1.5
    ("M24x3", 24.0, dict(pitch=3.0), None, 0.10),            # ISO 261: M24 coarse P 3
    ("M3x0.5", 3.0, dict(pitch=0.5), None, 0.04),            # ISO 261: M3 coarse P 0.5
    ("3/8-16 UNC", 0.375 * IN, dict(tpi=16), 60, 0.07),      # ASME B1.1: 3/8-16 UNC
    ("1/2-13 UNC", 0.5 * IN, dict(tpi=13), None, 0.08),      # ASME B1.1: 1/2-13 UNC
    ("3/8-24 UNF", 0.375 * IN, dict(tpi=24), None, 0.06),    # ASME B1.1: 3/8-24 UNF
    ("1/2-20 UNF", 0.5 * IN, dict(tpi=20), None, 0.08),      # ASME B1.1: 1/2-20 UNF
    ("#10-24 UNC", 0.190 * IN, dict(tpi=24), None, 0.05),    # ASME B1.1: #10 = 0.190 in, 24 tpi
    ("5/16-18 UNC", 0.3125 * IN, dict(tpi=18), 60, 0.06),    # ASME B1.1: 5/16-18 UNC
    ("1-8 UNC", 1.0 * IN, dict(tpi=8), 60, 0.10),            # ASME B1.1: 1-8 UNC
    ("1/4 BSW", 0.25 * IN, dict(tpi=20), 55, 0.03),          # BS 84: 1/4 BSW 20 tpi
    ("1 BSW", 1.0 * IN, dict(tpi=8), 55, 0.10),              # BS 84: 1 BSW 8 tpi
    ("3/8 BSF", 0.375 * IN, dict(tpi=20), None, 0.05),       # BS 84: 3/8 BSF 20 tpi
    ("1/4x40 ME", 0.25 * IN, dict(tpi=40), None, 0.03),      # ME series 1/4 x 40 (BS 84)
    ("3/8x32 ME", 0.375 * IN, dict(tpi=32), 55, 0.03),       # ME series 3/8 x 32 (BS 84)
    ("2BA", 4.7, dict(pitch=0.81), None, 0.04),              # BS 93: 2BA 4.7 / 0.81
    ("0BA", 6.0, dict(pitch=1.0), 47.5, 0.03),               # BS 93: 0BA 6.0 / 1.00
    ("4BA", 3.6, dict(pitch=0.66), None, 0.03),              # BS 93: 4BA 3.6 / 0.66
]


@pytest.mark.parametrize("designation, major, pitch_kw, angle, wear", TRUE_FIRST,
                         ids=[t[0] for t in TRUE_FIRST])
def test_true_thread_ranks_first(designation, major, pitch_kw, angle, wear):
    result = identify(major=major - wear, angle=angle, **pitch_kw)
    top = result.candidates[0]
    assert top.designation == designation
    assert top.score > 0.5
    assert "pitch matches" in top.why
    assert all(c.score <= top.score for c in result.candidates)


def test_reason_names_pitch_and_wear():
    top = identify(major=9.96, pitch=1.5).candidates[0]
    assert top.designation == "M10x1.5"
    assert "pitch matches 1.5 mm exactly" in top.why
    assert "major 9.96 is 0.04 under 10" in top.why      # ISO 261: M10 basic major 10 mm
    assert "normal crest wear" in top.why


def test_tpi_entry_matches_a_metric_pitch_only_when_close():
    # 20 tpi = 1.27 mm against M12x1.25 (ISO 261) and 1/2-20 UNF (ASME B1.1): 1.6 % apart
    result = identify(major=11.95, pitch=1.25)
    assert result.candidates[0].designation == "M12x1.25"
    assert all(c.designation != "1/2-20 UNF" or c.score < 0.05 for c in result.candidates)


def test_wear_makes_a_bolt_smaller_not_larger():
    # M10x1.5-6g major 9.968 / 9.732 (ISO 965-2)
    def m10(result):
        return next(c for c in result.candidates if c.designation == "M10x1.5")
    under = m10(identify(major=9.732 - 0.05, pitch=1.5, limit=20))
    over = m10(identify(major=9.968 + 0.05, pitch=1.5, limit=20))
    assert under.score > 0.9 > 0.5 > over.score
    assert "normal crest wear" in under.why
    assert "rarely larger" in over.why


def test_nut_identified_from_its_minor_diameter():
    # M10x1.5-6H D1 min 8.376, max 8.676 (ISO 965-2)
    result = identify(minor=8.45, pitch=1.5)
    top = result.candidates[0]
    assert top.designation == "M10x1.5"
    assert top.spec.kind == "internal" and top.spec.tol_class == "6H"
    assert "8.376" in top.why
    # a 60° gauge: a Tr10x1.5-7H nut (ISO 2902/2903, D1 8.5 to 8.69) is as near on minor alone
    worn = identify(minor=8.676 + 0.08, pitch=1.5, angle=60).candidates[0]  # crests wear open
    tight = identify(minor=8.376 - 0.08, pitch=1.5, angle=60).candidates[0]
    assert worn.designation == "M10x1.5"
    assert worn.score > tight.score


def test_nothing_fits_says_so():
    result = identify(major=30.0, pitch=0.3)      # no catalogue thread: 30 mm at 0.3 mm pitch
    assert "Nothing in the catalogue fits" in result.note
    assert all(c.score < 0.05 for c in result.candidates)
    assert not result.ambiguous


# ---- ambiguous pairs and what tells them apart ------------------------------------------------

def _items(result, a, b, measure):
    return [t for t in result.to_tell_apart if set(t.between) == {a, b} and t.measure == measure]


def test_quarter_20_against_m6x1_needs_a_pitch_check():
    result = identify(major=5.98, angle=60)       # calipers only, no pitch measured
    assert result.ambiguous
    names = [c.designation for c in result.candidates]
    assert "M6x1" in names and "1/4-20 UNC" in names
    (item,) = _items(result, "M6x1", "1/4-20 UNC", "pitch")
    exp = {e.designation: e.low for e in item.expected}
    assert exp["1/4-20 UNC"] == pytest.approx(10 * 25.4 / 20)   # computed from 10 × P, ASME B1.1 20 tpi
    assert exp["M6x1"] == pytest.approx(10 * 1.0)              # computed from 10 × P, ISO 261 M6 P 1
    assert "10 pitches" in item.how and "12.70" in item.how and "10.00" in item.how


def test_three_eighths_16_against_m10x1_5_needs_a_pitch_check():
    # A worn bolt, pitch counted roughly with a rule (6 crests over 7.8 mm, read to ±0.3 mm)
    result = identify(major=9.49, count=6, length=7.8, length_uncertainty=0.3, angle=60)
    assert result.ambiguous
    top2 = {c.designation for c in result.candidates[:2]}
    assert top2 == {"3/8-16 UNC", "M10x1.5"}
    assert result.candidates[1].score >= AMBIGUOUS_RATIO * result.candidates[0].score
    (item,) = _items(result, "3/8-16 UNC", "M10x1.5", "pitch")
    exp = {e.designation: e.low for e in item.expected}
    assert exp["3/8-16 UNC"] == pytest.approx(10 * 25.4 / 16)   # computed from 10 × P, ASME B1.1 16 tpi
    assert exp["M10x1.5"] == pytest.approx(10 * 1.5)           # computed from 10 × P, ISO 261 M10 P 1.5


def test_quarter_bsw_against_quarter_20_unc_needs_gauge_or_wires():
    result = identify(major=6.30, tpi=20)          # same size and tpi: BS 84 and ASME B1.1
    assert result.ambiguous
    assert {c.designation for c in result.candidates[:2]} == {"1/4-20 UNC", "1/4 BSW"}
    assert not _items(result, "1/4-20 UNC", "1/4 BSW", "pitch")
    (gauge,) = _items(result, "1/4-20 UNC", "1/4 BSW", "gauge")
    assert {e.designation: e.low for e in gauge.expected} == {"1/4-20 UNC": 60.0, "1/4 BSW": 55.0}

    (one,) = _items(result, "1/4-20 UNC", "1/4 BSW", "wires")
    exp = {e.designation: e for e in one.expected}
    w = float(one.expected[0].quantity.split()[1])
    p = 25.4 / 20
    # computed from M = E + W(1 + cosec a) − (P/2)·cot a (NBS H28), E from ASME B1.1 1/4-20
    # UNC-2A PD 0.2164 / 0.2127 in (ASME B1.1); lead-angle term < 0.005 mm
    unc = exp["1/4-20 UNC"]
    assert unc.high == pytest.approx(0.2164 * IN + 3 * w - 0.866025 * p, abs=0.005)
    assert unc.low == pytest.approx(0.2127 * IN + 3 * w - 0.866025 * p, abs=0.005)
    # 1/4 BSW basic E 0.2180 in (BS 84), 55° constants 3.165681 / 0.960491
    bsw = exp["1/4 BSW"]
    assert bsw.high == pytest.approx(0.2180 * IN + 3.165681 * w - 0.960491 * p, abs=0.005)

    (two,) = _items(result, "1/4-20 UNC", "1/4 BSW", "two wires")
    q = two.expected[0].quantity.split()          # "over W2 minus over W1 mm wires"
    w2, w1 = float(q[1]), float(q[4])
    d = {e.designation: e.low for e in two.expected}
    # computed from M2 − M1 = (1 + cosec a)(W2 − W1), NBS H28 relation; lead term < 0.002 mm
    assert d["1/4-20 UNC"] == pytest.approx(3.0 * (w2 - w1), abs=0.002)
    assert d["1/4 BSW"] == pytest.approx(3.165681 * (w2 - w1), abs=0.002)
    for form in (ISO_60, WHITWORTH_55):             # both wires sit on both forms' flanks
        rng = wires.wire_range(form, p)
        assert rng.fits(w1) and rng.fits(w2)


def test_angle_gauge_settles_bsw_against_unc():
    unc = identify(major=6.30, tpi=20, angle=60)
    bsw = identify(major=6.30, tpi=20, angle=55)
    assert unc.candidates[0].designation == "1/4-20 UNC" and not unc.ambiguous
    assert bsw.candidates[0].designation == "1/4 BSW" and not bsw.ambiguous


@pytest.mark.parametrize("true_form, true_pd, winner, loser", [
    # 1/4-20 UNC-2A PD inside 0.2164 / 0.2127 in (ASME B1.1)
    (ISO_60, 0.2150 * IN, "1/4-20 UNC", "1/4 BSW"),
    # 1/4 BSW basic E 0.2180 in (BS 84), a little flank wear
    (WHITWORTH_55, 0.2180 * IN - 0.02, "1/4 BSW", "1/4-20 UNC"),
])
def test_two_wire_sizes_tell_the_form(true_form, true_pd, winner, loser):
    p = 25.4 / 20
    w1, w2 = 0.029 * IN, 0.040 * IN       # common inch wire sizes .029 and .040 (NBS Handbook H28, three-wire method)
    readings = [(w, wires.over_wires_exact(true_pd, w, true_form, p)) for w in (w1, w2)]
    result = identify(major=6.30, tpi=20, wires=readings)
    assert result.candidates[0].designation == winner
    scores = {c.designation: c.score for c in result.candidates}
    assert scores.get(loser, 0.0) < AMBIGUOUS_RATIO * scores[winner]
    assert "the 60° form fits" in result.candidates[0].why or \
        "the 55° form fits" in result.candidates[0].why


def test_an_impossible_wire_reading_scores_low():
    result = identify(major=6.30, tpi=20, wires=[(0.733, 1.0)])
    assert all(c.score < 0.01 for c in result.candidates)


@pytest.mark.parametrize("pa, pb, n", [
    (25.4 / 20, 1.0, 10),        # computed: 0.27 mm apart, 10 pitches already differ 2.7 mm
    (25.4 / 20, 1.25, 25),       # computed: 0.02 mm apart → 0.5/0.02 = 25 pitches
    (25.4 / 16, 1.5, 10),        # computed: 0.0875 mm apart → 5.7 → at least 10
    (1.0, 0.98, 25),             # computed: 0.02 apart → 25
    (1.0, 0.97, 20),             # computed: 0.03 apart → 16.7 → next multiple of 5
])
def test_pitch_check_count(pa, pb, n):
    assert pitch_check_count(pa, pb) == n
    assert n * abs(pa - pb) >= 0.5 - 1e-9


def test_pitch_check_count_same_pitch_refused():
    with pytest.raises(InvalidEntry):
        pitch_check_count(1.5, 1.5)


# ---- invariants -------------------------------------------------------------------------------

_EXTERNAL = [s for s in catalogue()]


@settings(max_examples=40, deadline=None)
@given(st.sampled_from(_EXTERNAL))
def test_a_thread_measured_at_its_limits_scores_one(spec):
    """Any catalogue bolt, measured at its major maximum with its own pitch and angle, scores 1
    and is at the top (possibly tied with an identical-looking thread)."""
    from shopterm.standards import limits
    lim = limits(spec)
    kw = dict(tpi=spec.tpi) if spec.tpi else dict(pitch=spec.pitch)
    result = identify(major=lim.major_max, angle=spec.form.angle_deg, limit=20, **kw)
    scores = {c.spec.designation: c.score for c in result.candidates}
    assert scores[spec.designation] == pytest.approx(1.0)
    assert result.candidates[0].score == pytest.approx(1.0)


@settings(max_examples=60, deadline=None)
@given(st.floats(1.0, 60.0), st.one_of(st.none(), st.floats(0.2, 4.0)))
def test_scores_are_ranked_between_zero_and_one(major, pitch):
    result = identify(major=major, pitch=pitch)
    scores = [c.score for c in result.candidates]
    assert scores == sorted(scores, reverse=True)
    assert all(0.0 <= s <= 1.0 for s in scores)
    assert result.ambiguous == (len(scores) > 1 and scores[1] >= AMBIGUOUS_RATIO * scores[0])


def test_identify_is_fast():
    import time
    identify(major=9.96, pitch=1.5)               # warm the limits cache
    t = time.perf_counter()
    for _ in range(10):
        identify(major=6.30, tpi=20)
    assert (time.perf_counter() - t) / 10 < 0.05
