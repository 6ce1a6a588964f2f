"""Cut to fit a sample: the band from a sample bolt's pitch diameter, as a special thread."""

import pytest

from shopterm.cutting import wires
from shopterm.cutting.fit_sample import (DEFAULT_BAND, DEFAULT_BOLT_CLEARANCE,
                                         DEFAULT_NUT_CLEARANCE, SOURCE_NOTE, target_from_sample)
from shopterm.cutting.remaining import measure
from shopterm.errors import InvalidEntry
from shopterm.job.events import check_payload
from shopterm.standards import limits, parse

IN = 25.4  # mm per inch, exact (NIST SP 811)


def test_defaults_are_stated():
    assert DEFAULT_NUT_CLEARANCE == 0.05      # common practice, no source (module constant)
    assert DEFAULT_BOLT_CLEARANCE == 0.0      # common practice, no source: as snug as the sample
    assert DEFAULT_BAND == 0.05               # common practice, no source


def test_nut_to_fit_a_sample_bolt():
    m10 = parse("M10x1.5-6g")
    e = 8.95        # inside M10x1.5-6g d2 8.994 / 8.862 (ISO 965-2)
    t = target_from_sample(m10, "internal", sample_pd=e)
    assert t.spec.family == "special" and t.spec.kind == "internal"
    assert t.pd_min == pytest.approx(e + 0.05, abs=1e-9)     # computed from D2 min = E + c
    assert t.pd_max == pytest.approx(e + 0.05 + 0.05, abs=1e-9)   # computed: + band
    assert t.spec.pitch == pytest.approx(1.5)                 # ISO 261 M10 coarse
    assert t.spec.form.angle_deg == 60.0
    assert t.limits.notes[0].startswith(SOURCE_NOTE)
    assert "M10x1.5-6g" in t.limits.notes[0]


def test_bolt_to_fit_a_nut_through_a_bolt_that_fits_it():
    m10 = parse("M10x1.5-6g")
    t = target_from_sample(m10, "external", sample_pd=8.95, clearance=0.02, band=0.04)
    assert t.pd_max == pytest.approx(8.95 - 0.02, abs=1e-9)   # computed from d2 max = E − c
    assert t.pd_min == pytest.approx(8.95 - 0.02 - 0.04, abs=1e-9)
    assert t.spec.kind == "external"
    # The blank keeps the class's major tolerance: 9.968 − 9.732 = 0.236 (ISO 965-2 M10x1.5-6g)
    assert t.limits.major_max - t.limits.major_min == pytest.approx(0.236, abs=1e-9)
    plain = target_from_sample(m10, "external", sample_pd=8.95)
    assert plain.pd_max == pytest.approx(8.95, abs=1e-9)      # default: as snug as the sample


def test_designation_round_trips_to_the_same_band():
    for cut in ("internal", "external"):
        t = target_from_sample(parse("1/4-20 UNC-2A"), cut, sample_pd=5.45)
        again = limits(parse(t.spec.designation))
        assert again.pd_max == pytest.approx(t.pd_max, abs=1e-6)
        assert again.pd_min == pytest.approx(t.pd_min, abs=1e-6)
        assert t.spec.tpi == 20                                # ASME B1.1: 1/4-20
        assert t.spec.native_unit == "in"


def test_band_beyond_basic_moves_the_nominal_size():
    # M10x1.5 basic D2 = 10 − 0.649519 × 1.5 = 9.026 (ISO 68-1)
    t = target_from_sample(parse("M10x1.5-6g"), "internal", sample_pd=8.95)
    assert t.pd_min == pytest.approx(9.0, abs=1e-9)           # computed: 8.95 + 0.05
    assert t.spec.major == pytest.approx(10 - (9.026 - 9.0), abs=5e-4)
    assert any("moved" in n for n in t.notes)


def test_sample_over_wires():
    thread = parse("1/4-20 UNC-2A")
    p = 25.4 / 20
    w = 0.029 * IN                   # common wire size .029 in (NBS Handbook H28, three-wire method)
    true_pd = 0.2150 * IN            # inside 2A PD 0.2164 / 0.2127 in (ASME B1.1)
    m = wires.over_wires_exact(true_pd, w, thread.form, p)
    t = target_from_sample(thread, "internal", wire=w, readings=[m, m])
    assert t.sample_pd == pytest.approx(true_pd, abs=1e-6)   # inverse of the exact model
    # computed from E = M − 3W + 0.866025P (NBS H28, lead angle neglected): the exact pitch
    # diameter is a little smaller, by less than the H28 lead term (< 0.003 mm here)
    simple = m - 3 * w + 0.866025 * p
    assert 0 < simple - t.sample_pd < 0.003
    assert t.pd_min == pytest.approx(true_pd + DEFAULT_NUT_CLEARANCE, abs=1e-6)
    assert t.reading is not None and t.reading.wire == w
    assert any("half nut" in n for n in t.notes)           # the measuring caution is carried


def test_spread_readings_warn():
    thread = parse("M10x1.5-6g")
    w = wires.wire_range(thread.form, 1.5).best
    m = wires.over_wires_exact(8.93, w, thread.form, 1.5)
    t = target_from_sample(thread, "internal", wire=w, readings=[m, m + 0.01])
    assert any("spread" in n for n in t.notes)


def test_sample_outside_the_standard_band_is_noted():
    # below M10x1.5-6g d2 min 8.862 (ISO 965-2)
    t = target_from_sample(parse("M10x1.5-6g"), "internal", sample_pd=8.80)
    assert any("below the M10x1.5-6g band" in n for n in t.notes)


def test_record_payload_is_a_valid_job_event():
    t = target_from_sample(parse("M10x1.5-6g"), "internal", sample_pd=8.95)
    payload = check_payload("thread_chosen", t.record())
    assert payload["target_source"] == "sample"
    assert payload["designation"] == t.spec.designation
    assert payload["pd_min_mm"] == pytest.approx(t.pd_min)
    assert parse(payload["designation"]).kind == "internal"


def test_readings_work_against_the_sample_target():
    thread = parse("M10x1.5-6g")
    t = target_from_sample(thread, "external", sample_pd=8.95, band=0.04)
    w = wires.wire_range(thread.form, 1.5).best
    mid = (t.pd_max + t.pd_min) / 2
    reading = wires.over_wires_exact(mid, w, thread.form, 1.5)
    result = measure(t.limits, w, [reading])
    assert result.state == "in_band"
    assert result.pd_max == pytest.approx(t.pd_max)
    high = measure(t.limits, w, [reading + 0.1])
    assert high.state == "oversize"


@pytest.mark.parametrize("kw, words", [
    (dict(cut="sideways", sample_pd=8.95), "bolt"),
    (dict(cut="internal"), "not both"),
    (dict(cut="internal", sample_pd=8.95, readings=[9.5], wire=0.866), "not both"),
    (dict(cut="internal", readings=[9.5]), "wire size"),
    (dict(cut="internal", sample_pd=-1.0), "more than zero"),
    (dict(cut="internal", sample_pd=8.95, clearance=-0.01), "zero or more"),
    (dict(cut="internal", sample_pd=8.95, band=0.0), "more than zero"),
    (dict(cut="internal", sample_pd=8.95, clearance="a bit"), "number"),
    (dict(cut="internal", wire=0.3, readings=[9.5]), "too small"),      # 0.3 mm wire on 1.5 pitch
    (dict(cut="internal", wire=0.866, readings=[95.0]), "cannot be right"),
    (dict(cut="internal", wire=0.866, readings=[]), "at least one"),
])
def test_errors(kw, words):
    with pytest.raises(InvalidEntry, match=words):
        target_from_sample(parse("M10x1.5-6g"), **kw)


@pytest.mark.parametrize("designation", ["R1/2", "1/2-14 NPT"])
def test_a_tapered_thread_is_not_cut_to_a_sample(designation):
    # ISO 7-1 R and ASME B1.20.1 NPT are gauged along their taper (1 in 16), not by one band
    thread = parse(designation)
    with pytest.raises(InvalidEntry, match="tapered thread"):
        target_from_sample(thread, "internal", sample_pd=19.8)


def test_a_parallel_pipe_thread_still_is():
    # ISO 228-1 G1/2: parallel; pitch diameter 19.793 mm (from memory)
    t = target_from_sample(parse("G1/2"), "internal", sample_pd=19.793)
    assert t.pd_min == pytest.approx(19.793 + DEFAULT_NUT_CLEARANCE)
