"""Choosing a thread in few keys: the common sizes of a group, the kind and its usual class,
and a designation typed with digits and points (``standards.numeric``)."""

from __future__ import annotations

import pytest

from shopterm.errors import InvalidEntry
from shopterm.standards import limits, numeric, parse, walk


def test_common_iso_sizes_are_the_coarse_threads_m4_to_m24():
    got = [(s.size, s.pitch) for s in walk.common("iso")]
    # ISO 261 coarse pitches of the ISO 262 selected sizes M4-M24 (from memory)
    assert got == [("M4", 0.7), ("M5", 0.8), ("M6", 1.0), ("M8", 1.25), ("M10", 1.5),
                   ("M12", 1.75), ("M16", 2.0), ("M20", 2.5), ("M24", 3.0)]
    assert all(s.kind == "external" and s.tol_class == "6g" and not s.pitch_implied
               for s in walk.common("iso"))
    assert len(walk.common("iso")) <= 9                 # one page of the keypad's digits


def test_common_unc_sizes_have_their_coarse_tpi():
    got = [(s.size, s.tpi) for s in walk.common("unified")]
    # ASME B1.1 table, UNC tpi of 1/4 to 1 in (from memory)
    assert got == [("1/4", 20), ("5/16", 18), ("3/8", 16), ("7/16", 14), ("1/2", 13),
                   ("5/8", 11), ("3/4", 10), ("7/8", 9), ("1", 8)]
    assert walk.common("ba") == []                      # no common list: the sizes as before


def test_with_kind_gives_the_usual_class_and_back():
    m10 = walk.common("iso")[4]
    nut = walk.with_kind(m10, "internal")
    assert (nut.kind, nut.tol_class) == ("internal", "6H")   # ISO 965-1, 6H/6g general use
    assert walk.with_kind(nut, "external") == m10
    unc = parse("3/8-16 UNC-2A")
    assert walk.with_kind(unc, "internal").tol_class == "2B"  # ASME B1.1, 2A/2B general use
    ba = parse("2BA normal")
    assert walk.with_kind(ba, "internal").tol_class == "normal"   # BS 93 classes both kinds
    bsw = parse("3/8 BSW")
    assert walk.with_kind(bsw, "internal").tol_class is None      # basic size alone
    limits(walk.with_kind(bsw, "internal"))


@pytest.mark.parametrize("typed, want", [
    ("10", "M10x1.5-6g"),           # ISO 261, M10 coarse pitch 1.5
    ("10.1.5", "M10x1.5-6g"),
    ("10.1.25", "M10x1.25-6g"),     # ISO 261, M10 fine 1.25
    ("10.1", "M10x1-6g"),           # ISO 261, M10 fine 1
    ("24.2", "M24x2-6g"),           # ISO 261, M24 fine 2
    ("1.6", "M1.6x0.35-6g"),        # ISO 261, M1.6 coarse 0.35 (from memory)
    ("1.6.0.35", "M1.6x0.35-6g"),
    ("3.8.16", "3/8-16 UNC-2A"),    # ASME B1.1, 3/8 UNC 16 tpi
    ("1.4.28", "1/4-28 UNF-2A"),    # ASME B1.1, 1/4 UNF 28 tpi
    ("1.1.4.7", "1-1/4-7 UNC-2A"),  # ASME B1.1, 1-1/4 UNC 7 tpi
    ("1.1.8", "1-8 UNC-2A"),        # ASME B1.1, 1 in UNC 8 tpi
])
def test_numbers_read_as_a_thread(typed, want):
    assert numeric.candidates(typed)[0].designation == want


def test_an_inch_size_in_two_families_gives_both_unified_first():
    got = [s.designation for s in numeric.candidates("3.8.16")]
    assert got == ["3/8-16 UNC-2A", "3/8 BSW"]          # BS 84: 3/8 BSW has 16 tpi (from memory)


@pytest.mark.parametrize("typed", ["10.1.6", "10.7", "3.8.17", "0"])
def test_numbers_that_are_no_thread_say_how_to_type_one(typed):
    with pytest.raises(InvalidEntry) as info:
        numeric.candidates(typed)
    assert f"'{typed}'" in str(info.value) and "10.1.25 = M10x1.25" in str(info.value)


@pytest.mark.parametrize("typed", ["M10", "10..5", ".10", "10.", "10-1.5", ""])
def test_only_digits_and_points_are_numbers(typed):
    assert not numeric.is_numeric(typed)
    with pytest.raises(InvalidEntry):
        numeric.candidates(typed)


def test_common_leadscrew_threads_are_the_preferred_tr_pitches_and_acme_sizes():
    got = [s.designation for s in walk.common("power")]
    # ISO 2902 first-choice diameters with their preferred pitch (from memory)
    assert got[:6] == ["Tr12x3-7e", "Tr16x4-7e", "Tr20x4-7e", "Tr24x5-7e", "Tr32x6-7e",
                       "Tr40x7-7e"]
    # ASME B1.5 general-purpose series: 1/2-10, 3/4-6, 1-5 (from memory)
    assert got[6:] == ["1/2-10 ACME-2G", "3/4-6 ACME-2G", "1-5 ACME-2G"]
    assert len(got) <= 9                                # one page of the keypad's digits
    # a listed pitch that is not the coarsest is the one taken (Tr24: 8, 5 and 3 in ISO 2902)
    assert [s.pitch for s in walk.pitches("power", "Tr", "Tr24")][0] == 8.0
