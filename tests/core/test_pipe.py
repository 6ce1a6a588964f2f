"""Pipe threads: ISO 228-1 (G), ISO 7-1 (R, Rc, Rp), ASME B1.20.1 (NPT).

No printed copy of these standards was at hand: every table value below is
recalled from the standard's printed table and marked `# from memory`; values re-derived from a
published formula say so. The cross-checks between columns (h rule, turns × pitch, taper × axial
tolerance) make a slip in a recalled table show.
"""

from __future__ import annotations

import json
import math
from fractions import Fraction

import pytest

import shopterm.standards as registry
from shopterm.cli import main
from shopterm.errors import InvalidEntry, UnknownThread, UnsupportedClass
from shopterm.standards import pipe
from shopterm.standards.forms import NPT_60, WHITWORTH_55

IN = 25.4
MM = 1e-9


def lim(text: str, kind: str | None = None):
    return registry.limits(registry.parse(text, kind=kind))


# -- ISO 228-1 -------------------------------------------------------------------------------

def test_g_half_basic_sizes():
    L = lim("G1/2A")
    assert L.spec.tpi == 14                        # ISO 228-1 table, 1/2: 14 tpi, from memory
    assert L.spec.pitch == pytest.approx(1.814, abs=5e-4)   # ISO 228-1 table, P 1.814, from memory
    assert L.basic_major == pytest.approx(20.955, abs=MM)   # ISO 228-1 table, G1/2 d, from memory
    assert L.basic_pd == pytest.approx(19.793, abs=MM)      # ISO 228-1 table, G1/2 d2, from memory
    assert L.basic_minor == pytest.approx(18.631, abs=MM)   # ISO 228-1 table, G1/2 d1, from memory
    assert L.depth == pytest.approx(1.162, abs=MM)          # ISO 228-1 table, h 1.162, from memory
    assert L.spec.form is WHITWORTH_55


@pytest.mark.parametrize("text,pd_min,major_min", [
    ("G1/2A", 19.793 - 0.142, 20.955 - 0.284),   # ISO 228-1, 1/2: Td2 A 142 µm, Td 284 µm, from memory
    ("G1/2B", 19.793 - 0.284, 20.955 - 0.284),   # ISO 228-1, 1/2: Td2 B 284 µm (2 × A), from memory
    ("G1/8A", 9.147 - 0.107, 9.728 - 0.214),     # ISO 228-1, 1/8: d2 9.147, Td2 A 107 µm, Td 214, from memory
    ("G1A", 31.770 - 0.180, 33.249 - 0.360),     # ISO 228-1, 1: d2 31.770, Td2 A 180 µm, Td 360, from memory
    ("G4B", 111.551 - 0.434, 113.030 - 0.434),   # ISO 228-1, 4: d2 111.551, Td2 B 434 µm, Td 434, from memory
])
def test_g_external_classes(text, pd_min, major_min):
    L = lim(text)
    assert L.pd_min == pytest.approx(pd_min, abs=MM)
    assert L.major_min == pytest.approx(major_min, abs=MM)
    assert L.pd_max == L.basic_pd and L.major_max == L.basic_major   # ISO 228-1: es = 0
    assert L.taper is None


def test_g_internal_one_class():
    L = lim("G1/2")
    assert L.spec.kind == "internal" and L.spec.tol_class is None
    assert L.pd_min == pytest.approx(19.793, abs=MM)           # ISO 228-1: EI = 0, from memory
    assert L.pd_max == pytest.approx(19.793 + 0.142, abs=MM)   # ISO 228-1, 1/2: TD2 142 µm, from memory
    assert L.minor_min == pytest.approx(18.631, abs=MM)        # ISO 228-1 table, D1, from memory
    assert L.minor_max == pytest.approx(18.631 + 0.541, abs=MM)  # ISO 228-1, 1/2: TD1 541 µm, from memory
    assert L.major_min == pytest.approx(20.955, abs=MM) and L.major_max is None
    assert registry.classes(L.spec) == []
    assert registry.classes(L.spec.with_(kind="external")) == ["A", "B"]


@pytest.mark.parametrize("size", list(pipe.ISO_SIZES))
def test_g_table_follows_the_h_rule(size):
    # Computed from the ISO 228-1 formulas: h = 0.640327P rounded to 0.001 mm, d2 = d − h,
    # d1 = d − 2h; d = the inch major × 25.4 to 0.001 mm.
    tpi, d = pipe.ISO_SIZES[size]
    h = round(0.640327 * IN / tpi, 3)
    L = lim(f"G{size}A")
    assert L.basic_pd == pytest.approx(d - h, abs=1e-6)
    assert L.basic_minor == pytest.approx(d - 2 * h, abs=1e-6)
    assert d / IN == pytest.approx(round(d / IN, 3), abs=2e-5)   # an inch major to 0.001 in
    assert L.pd_max - L.pd_min < L.major_max - L.major_min       # Td > Td2 A in the table


# -- ISO 7-1 ---------------------------------------------------------------------------------

def test_r_half_at_the_gauge_plane():
    L = lim("R1/2")
    t = L.taper
    assert t.per_unit_on_diameter == 1 / 16                   # ISO 7-1: taper 1:16
    assert t.gauge_plane_from_end == pytest.approx(8.2)        # ISO 7-1, 1/2 gauge length, from memory
    assert t.gauge_plane_tolerance == pytest.approx(1.8)       # ISO 7-1, 1/2 ±T1/2 1.8 mm (1 turn), from memory
    assert t.gauge_diameter == pytest.approx(20.955)           # ISO 7-1 = ISO 228-1 d, from memory
    assert t.L2 == pytest.approx(13.2)                         # ISO 7-1, 1/2 useful thread, from memory
    assert t.half_angle_deg == pytest.approx(math.degrees(math.atan(1 / 32)))  # computed, atan(k/2)
    # the PD band at the gauge plane: ± T1/2 × 1/16 (computed from the ISO 7-1 tolerance)
    assert L.pd_max == pytest.approx(19.793 + 1.8 / 16, abs=MM)
    assert L.pd_min == pytest.approx(19.793 - 1.8 / 16, abs=MM)
    assert L.basic_pd == pytest.approx(19.793, abs=MM)         # ISO 7-1 table d2, from memory


def test_rc_and_rp_half():
    rc = lim("Rc1/2")
    assert rc.spec.kind == "internal" and rc.spec.series == "R"
    assert rc.taper.gauge_plane_from_end == 0.0                # gauged at the face (ISO 7-1)
    assert rc.taper.gauge_plane_tolerance == pytest.approx(2.3)  # ISO 7-1, 1/2 ±T2/2, from memory
    assert rc.pd_max - rc.pd_min == pytest.approx(2 * 2.3 / 16, abs=MM)
    rp = lim("Rp1/2")
    assert rp.taper is None and rp.spec.kind == "internal"
    assert rp.pd_max == pytest.approx(19.793 + 0.142, abs=MM)  # ISO 7-1, Rp 1/2 ±0.142, from memory
    assert rp.pd_min == pytest.approx(19.793 - 0.142, abs=MM)


@pytest.mark.parametrize("size", list(pipe.ISO7))
def test_iso7_columns_agree(size):
    # Cross-checks of the recalled ISO 7-1 table: ±T1/2 = its turns × P to 0.1 mm; ±T2/2 the
    # same for the internal thread; the Rp diameter tolerance = T2/2 × 1/16 to 0.001 mm; the
    # useful thread is the gauge length plus a whole number of quarter turns.
    a, t1, t1_turns, t2, t2_turns, useful, rp = pipe.ISO7[size]
    p = IN / pipe.ISO_SIZES[size][0]
    assert t1 == pytest.approx(t1_turns * p, abs=0.05)
    assert t2 == pytest.approx(t2_turns * p, abs=0.05)
    assert rp == pytest.approx(t2_turns * p / 16, abs=0.001)
    quarters = (useful - a) / p * 4
    assert quarters == pytest.approx(round(quarters), abs=0.15)


# -- ASME B1.20.1 ----------------------------------------------------------------------------

def test_npt_half():
    L = lim("1/2-14 NPT")
    t = L.taper
    assert t.E0 / IN == pytest.approx(0.75843, abs=1e-9)   # ASME B1.20.1 table, 1/2 E0, from memory
    assert t.E1 / IN == pytest.approx(0.77843, abs=1e-9)   # ASME B1.20.1 table, 1/2 E1, from memory
    assert t.L1 / IN == pytest.approx(0.320, abs=1e-9)     # ASME B1.20.1 table, 1/2 L1, from memory
    assert t.L2 / IN == pytest.approx(0.5337, abs=1e-9)    # ASME B1.20.1 table, 1/2 L2, from memory
    assert t.L3 / IN == pytest.approx(0.2143, abs=1e-9)    # ASME B1.20.1 table, 1/2 L3 (3 thr), from memory
    assert t.gauge_plane_from_end == pytest.approx(t.L1)   # E1 lies at L1 from the small end
    assert t.gauge_plane_tolerance / IN == pytest.approx(1 / 14)   # ±1 turn (ASME B1.20.1)
    assert t.gauge_diameter is None
    assert L.spec.major / IN == pytest.approx(0.840)       # ASME B1.20.1, 1/2 pipe OD, from memory
    assert L.basic_pd == pytest.approx(t.E1)
    assert L.pd_max - L.pd_min == pytest.approx(2 * IN / 14 / 16)  # ±1 turn × 1/16, computed
    assert L.depth / IN == pytest.approx(0.8 / 14)         # h = 0.800p, ASME B1.20.1, from memory
    assert L.spec.form is NPT_60


@pytest.mark.parametrize("size,e0,e1", [
    ("1/8", 0.36351, 0.37360),     # ASME B1.20.1 table, from memory
    ("1/4", 0.47739, 0.49163),     # ASME B1.20.1 table, from memory
    ("1", 1.21363, 1.23863),       # ASME B1.20.1 table, from memory
    ("2", 2.26902, 2.29627),       # ASME B1.20.1 table, from memory
    ("2-1/2", 2.71953, 2.76216),   # ASME B1.20.1 table, from memory
    ("3", 3.34062, 3.38850),       # ASME B1.20.1 table, from memory (E0 an exact half, 3.340625)
    ("4", 4.33438, 4.38712),       # ASME B1.20.1 table, from memory (E0 an exact half, 4.334375)
])
def test_npt_e0_e1_printed(size, e0, e1):
    v = pipe.npt_inches(size)
    assert v["E0"] == pytest.approx(e0, abs=1e-9)
    assert v["E1"] == pytest.approx(e1, abs=1e-9)


@pytest.mark.parametrize("size", list(pipe.NPT))
def test_npt_formulas(size):
    # Computed from the ASME B1.20.1 formulas, exactly in Fractions: E0 = D − (0.05D + 1.1)p,
    # E1 = E0 + 0.0625·L1, L2 = (0.80D + 6.8)p.
    d_text, tpi, l1, _ = pipe.NPT[size]
    d, p = Fraction(d_text), 1 / Fraction(tpi)
    e0 = d - (Fraction(5, 100) * d + Fraction(11, 10)) * p
    v = pipe.npt_inches(size)
    assert v["E0"] == pytest.approx(float(e0), abs=5.01e-6)
    assert v["E1"] == pytest.approx(float(e0 + Fraction(l1) / 16), abs=5.01e-6)
    assert v["L2"] == pytest.approx(float((Fraction(8, 10) * d + Fraction(68, 10)) * p), abs=5.01e-5)
    assert v["L2"] > v["L1"]


def test_npt_internal_gauged_at_the_face():
    L = lim("1/2-14 NPT internal")
    assert L.spec.kind == "internal" and L.taper.gauge_plane_from_end == 0.0
    assert L.major_max is None and L.minor_min is not None


# -- designations, refusals, cautions ---------------------------------------------------------

@pytest.mark.parametrize("text,series,kind,cls,size", [
    ("G1/2A", "G", "external", "A", "1/2"),
    ("G1/2B", "G", "external", "B", "1/2"),
    ("G1/2", "G", "internal", None, "1/2"),
    ("G 1 1/2 A", "G", "external", "A", "1 1/2"),
    ("G1-1/2A", "G", "external", "A", "1 1/2"),
    ("R1/2", "R", "external", None, "1/2"),
    ("Rc1/2", "R", "internal", None, "1/2"),
    ("Rp1/2", "Rp", "internal", None, "1/2"),
    ("R 1 1/4", "R", "external", None, "1 1/4"),
    ("1/2-14 NPT", "NPT", "external", None, "1/2"),
    ("1/2 NPT", "NPT", "external", None, "1/2"),
    ('1-1/4" NPT', "NPT", "external", None, "1-1/4"),
    ("1/2-14 NPT internal", "NPT", "internal", None, "1/2"),
])
def test_parse(text, series, kind, cls, size):
    s = registry.parse(text)
    assert (s.family, s.series, s.kind, s.tol_class, s.size) == ("pipe", series, kind, cls, size)


def test_formats():
    assert [registry.parse(t).designation for t in ("G 1/2 A", "rc 1/2", "1/2 npt", "G1-1/2B")] \
        == ["G1/2A", "Rc1/2", "1/2-14 NPT", "G1 1/2B"]
    assert registry.parse("R1/2", kind="internal").designation == "Rc1/2"


def _variants():
    for s in pipe.catalogue():
        yield s
        if s.series != "G":
            yield s.with_(kind="internal")
    for size in pipe.ISO7:
        yield pipe.parse(f"Rp{size}")
    for size in pipe.ISO_SIZES:
        yield pipe.parse(f"G{size}")
        yield pipe.parse(f"G{size}B")


@pytest.mark.parametrize("spec", list(_variants()), ids=lambda s: s.designation)
def test_round_trip_and_limits(spec):
    again = registry.parse(spec.designation)
    assert again == spec
    L = registry.limits(spec)
    assert L.pd_min < L.basic_pd < L.pd_max or (L.taper is None and L.pd_max > L.pd_min)
    assert (L.taper is not None) == (spec.series in ("R", "NPT"))
    assert registry.cautions(spec) == (pipe.PRESSURE_CAUTION,)


@pytest.mark.parametrize("text,word,suggest", [
    ("G5/16A", "no 5/16", ("G1/4A", "G3/8A")),
    ("R5/8", "no 5/8", ("R1/2", "R3/4")),
    ("5/8-14 NPT", "no 5/8", ("1/2-14 NPT", "3/4-14 NPT")),
    ("1/2-18 NPT", "14 threads per inch", ("1/2-14 NPT",)),
    ("G1/2C", "classes are A and B", ("G1/2A", "G1/2B", "G1/2")),
    ("R1/2A", "no class letter", ("R1/2",)),
    ("1/2 BSPT", "written the ISO way", ("G1/2A", "R1/2", "Rc1/2")),
    ("1/2 NPSM", "not built into shopterm", ("1/2-14 NPT",)),
    ("1/2 NPTF", "not built into shopterm", ("1/2-14 NPT",)),
])
def test_refusals_name_the_nearest(text, word, suggest):
    with pytest.raises(UnknownThread) as exc:
        registry.parse(text)
    assert word in str(exc.value)
    assert exc.value.suggestions == suggest


def test_kind_refusals():
    with pytest.raises(InvalidEntry, match="internal G with no letter"):
        registry.parse("G1/2A internal")
    with pytest.raises(InvalidEntry, match="mate is the taper R1/2"):
        registry.limits(registry.parse("Rp1/2", kind="external"))
    with pytest.raises(UnsupportedClass, match="one tolerance"):
        registry.limits(registry.parse("R1/2").with_(tol_class="A"))
    assert registry.parse("G1/2 external").designation == "G1/2 external"
    assert "class A" in " ".join(lim("G1/2 external").notes)


def test_cautions_only_for_pipe():
    assert registry.cautions(registry.parse("M10")) == ()
    assert "fitness for service" in registry.cautions(registry.parse("R1/2"))[0]


def test_half_inch_pipe_is_in_the_catalogue_at_its_real_od():
    cat = {s.designation: s for s in registry.catalogue() if s.family == "pipe"}
    assert cat["G1/2A"].major == pytest.approx(20.955)      # ISO 228-1, from memory
    assert cat["R1/2"].major == pytest.approx(20.955)       # ISO 7-1 gauge diameter, from memory
    assert cat["1/2-14 NPT"].major == pytest.approx(0.840 * IN)   # ASME B1.20.1 OD, from memory
    assert all(cat[d].tpi == 14 for d in ("G1/2A", "R1/2", "1/2-14 NPT"))


def test_identify_finds_pipe_at_21_mm_14_tpi():
    from shopterm.cutting.identify import identify
    result = identify(major=21.0, pitch=IN / 14)
    top = [c.spec.family for c in result.candidates[:3]]
    assert top == ["pipe"] * 3   # 1/2 in pipe is 14 tpi at 21 mm (common practice, no source)


def test_walk_group():
    from shopterm.standards import walk
    assert walk.series("pipe") == ["G", "R", "NPT"]
    assert "1/2" in walk.sizes("pipe", "R")


# -- calc limits --json -----------------------------------------------------------------------

def _json(capsys, *argv):
    assert main(["calc", "limits", *argv, "--json"]) == 0
    return json.loads(capsys.readouterr().out)


def test_calc_limits_json_r_half(capsys):
    out = _json(capsys, "R1/2")
    t = out["taper"]
    assert set(t) >= {"per_unit_on_diameter", "half_angle_deg", "gauge_plane_from_end",
                      "gauge_diameter", "L1", "L2"}
    assert t["per_unit_on_diameter"] == 0.0625                 # ISO 7-1: 1:16
    assert t["gauge_plane_from_end"] == pytest.approx(8.2)     # ISO 7-1, from memory
    assert t["gauge_diameter"] == pytest.approx(20.955)        # ISO 7-1, from memory
    assert t["L2"] == pytest.approx(13.2)                      # ISO 7-1, from memory
    assert t["E0"] is None and t["E1"] is None
    assert out["units"] == "mm" and out["pitch_diameter"]["max"] == pytest.approx(19.9055)


def test_calc_limits_json_npt_half(capsys):
    out = _json(capsys, "1/2-14 NPT")
    t = out["taper"]
    assert out["units"] == "in"
    assert t["E0"] == pytest.approx(0.75843, abs=1e-6)   # ASME B1.20.1, from memory
    assert t["E1"] == pytest.approx(0.77843, abs=1e-6)   # ASME B1.20.1, from memory
    assert t["L1"] == pytest.approx(0.320, abs=1e-6)     # ASME B1.20.1, from memory
    assert t["L2"] == pytest.approx(0.5337, abs=1e-6)    # ASME B1.20.1, from memory
    assert t["gauge_diameter"] is None
    assert t["half_angle_deg"] == pytest.approx(1.789911, abs=1e-6)   # computed, atan(1/32)


def test_calc_limits_text_shows_taper_and_caution(capsys):
    assert main(["calc", "limits", "1/2-14 NPT"]) == 0
    out = capsys.readouterr().out
    assert "E0 0.75843   E1 0.77843" in out
    assert "gauge plane" in out and "caution: A pressure fitting" in out
    assert main(["calc", "limits", "M10"]) == 0
    assert "taper" not in capsys.readouterr().out


@pytest.mark.parametrize("cmd", [["wires"], ["passes", "--od", "21"], ["passes", "--od", "0.84in"]])
@pytest.mark.parametrize("text", ["G1/2A", "R1/2", "1/2-14 NPT"])
def test_other_commands_do_not_crash(capsys, cmd, text):
    code = main(["calc", cmd[0], text, *cmd[1:]])
    assert code in (0, 2)
    assert "Traceback" not in capsys.readouterr().err
