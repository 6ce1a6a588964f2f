"""Change-gear search: published trains, exactness, and a plain Fraction brute force."""

from __future__ import annotations

import functools
import itertools
from fractions import Fraction

import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from shopterm.errors import InvalidEntry
from shopterm.lathe.gears import (GearTrain, find_trains, lead_made, normalise_gears,
                                  parse_gear_list, parse_gearbox, parse_lead, parse_leadscrew,
                                  parse_ratio, train_table, trains_for_lathe)
from shopterm.lathe.machine import Dial, GearboxPosition, Lathe, Leadscrew

INCH = Fraction(254, 10)  # ISO 31-1 / NIST SP 811: 1 in = 25.4 mm exactly

# A usual metric-capable set: 20..120 in fives plus 127 (common practice, no source).
SET_FIVES_127 = [20, 25, 30, 35, 40, 45, 50, 55, 60, 65, 70, 75, 80, 90, 100, 110, 120, 127]


# ---------------------------------------------------------------------------------------------
# The brute force the numpy search must agree with: every permutation, exact Fractions.

@functools.lru_cache(maxsize=64)
def _all_trains(gears, margin, compound):
    """Return every distinct (drivers, driven) the gears allow: itertools.permutations."""
    pool = [t for t, n in gears for _ in range(n)]
    trains = set()
    for a, b in itertools.permutations(pool, 2):
        trains.add(((a,), (b,)))
    if compound:
        for a, b, c, d in itertools.permutations(pool, 4):
            if a + b >= c + margin and c + d >= b + margin:
                trains.add(((a, c), (b, d)))
    return frozenset(trains)


def brute_force(leadscrew_pitch: Fraction, wanted: Fraction, gears, *, fixed=Fraction(1),
                margin=15, compound=True, limit=8, per_ratio=1):
    """Return [(drivers, driven, ratio)] ranked as find_trains documents it, by brute force."""
    trains = _all_trains(tuple(gears), margin, compound)
    rows = []
    for drivers, driven in trains:
        r = Fraction(1)
        for t in drivers:
            r *= t
        for t in driven:
            r /= t
        err = abs(leadscrew_pitch * fixed * r / wanted - 1)
        if len(drivers) == 2:
            teeth = (drivers[0], driven[0], drivers[1], driven[1])
        else:
            teeth = (drivers[0], driven[0], 0, 0)
        rows.append(((err, 2 * len(drivers), teeth), drivers, driven, r))
    rows.sort(key=lambda row: row[0])
    out, seen = [], {}
    for _, drivers, driven, r in rows:
        if seen.get(r, 0) >= per_ratio:
            continue
        seen[r] = seen.get(r, 0) + 1
        out.append((drivers, driven, r))
        if len(out) == limit:
            break
    return out


def answers(trains: tuple[GearTrain, ...]):
    return [(t.drivers, t.driven, t.ratio) for t in trains]


@pytest.fixture(params=["float", "grid"])
def ratio_key(request, monkeypatch):
    """Build tables with the float ratio key where it is exact ("float") or always the grid."""
    from shopterm.lathe import gears
    monkeypatch.setattr(gears._TrainTable, "use_float_key", request.param == "float")
    train_table.cache_clear()
    yield request.param
    train_table.cache_clear()


# ---------------------------------------------------------------------------------------------
# Published trains

def test_rose_compound_train_makes_11_tpi_on_4_tpi_leadscrew():
    # Rose, Modern Machine Shop Practice: 4 tpi leadscrew,
    # 36/48 x 66/18 -> 11 tpi. The printed fraction is work tpi / leadscrew tpi
    # (4 x 36x66/(48x18) = 11), so 48 and 18 are the drivers, 36 and 66 the driven.
    ls = Leadscrew.from_tpi(4)
    assert lead_made(ls, (48, 18), (36, 66)) == INCH / 11
    found = find_trains(ls, INCH / 11, [36, 48, 66, 18], limit=8, per_ratio=8)
    exact = [t for t in found if t.exact]
    assert exact and all(t.kind == "compound" for t in exact)
    pairs = {(t.drivers, t.driven) for t in exact}
    assert ((48, 18), (36, 66)) in pairs       # A 48 drives B 36, C 18 on B drives D 66
    assert found[0].exact and found[0].lead_made_mm == pytest.approx(25.4 / 11, abs=1e-12)


def test_120_127_on_8_tpi_makes_3mm_exactly():
    # Rose, Modern Machine Shop Practice: 8 tpi leadscrew x 120/127 = 3.000 mm
    ls = Leadscrew.from_tpi(8)
    assert lead_made(ls, (120,), (127,)) == Fraction(3)
    best = find_trains(ls, 3.0, SET_FIVES_127)[0]
    assert (best.kind, best.drivers, best.driven, best.ratio) == \
        ("simple", (120,), (127,), Fraction(120, 127))
    assert best.exact and best.error_pct == 0.0 and best.lead_made_mm == 3.0


@pytest.mark.parametrize("driver, driven, published_pct", [
    (80, 63, -0.0125),   # computed: 80/63 vs 127/100, -0.0125 %
    (47, 37, +0.0213),   # computed: 47/37 vs 127/100, +0.0213 %
    (63, 50, -0.787),    # computed: 63/50 vs 127/100, -0.787 %
])
def test_approximations_of_127_over_100(driver, driven, published_pct):
    # Inch on a metric leadscrew with no 127 gear: 10 tpi (2.54 mm) on a 2 mm leadscrew needs
    # a train of 127/100. The error is computed from (driver/driven)/(127/100) - 1, re-derived
    # here with fractions.Fraction, and matches the published rounded figure.
    ls = Leadscrew.from_mm(2)
    best = find_trains(ls, INCH / 10, [driver, driven], compound=False)[0]
    assert (best.drivers, best.driven) == ((driver,), (driven,))
    expected = float((Fraction(driver, driven) / Fraction(127, 100) - 1) * 100)
    assert best.error_pct == pytest.approx(expected, rel=1e-12)
    assert best.error_pct == pytest.approx(published_pct, abs=0.0005)
    # error over 25 mm / 1 in of thread: same relative error times the length
    assert best.error_per_25mm == pytest.approx(expected / 100 * 25, rel=1e-12)
    assert best.error_per_inch == pytest.approx(expected / 100, rel=1e-12)


def test_metric_on_inch_leadscrew_needs_127_for_exact():
    # Rose, Modern Machine Shop Practice: 127 = 5 x 25.4 gives exact metric from an inch leadscrew
    ls = Leadscrew.from_tpi(8)
    without = [t for t in SET_FIVES_127 if t != 127]
    with_127 = find_trains(ls, 1.5, SET_FIVES_127)
    assert with_127[0].exact
    best_without = find_trains(ls, 1.5, without)[0]
    assert not best_without.exact
    assert 0 < abs(best_without.error_pct) < 0.1     # close, but not exact


def test_inch_on_metric_leadscrew_with_127():
    # 20 tpi = 1.27 mm on a 3 mm leadscrew: ratio 127/300 (computed, exact with a 127 gear)
    ls = Leadscrew.from_mm(3)
    best = find_trains(ls, parse_lead("20tpi"), SET_FIVES_127)[0]
    assert best.exact and best.ratio == Fraction(127, 300)
    assert not find_trains(ls, parse_lead("20tpi"), SET_FIVES_127[:-1])[0].exact


# ---------------------------------------------------------------------------------------------
# Against the brute force

SMALL_SETS = [
    ((20, 1), (30, 1), (40, 1), (50, 1), (60, 1)),
    ((20, 2), (25, 1), (40, 1), (63, 1), (127, 1)),
    ((18, 1), (36, 1), (48, 1), (66, 1)),
    ((24, 1), (30, 3), (45, 1), (60, 1), (72, 1), (100, 1)),
]
LEADS = [Fraction(1), Fraction(3, 2), INCH / 11, INCH / 20, Fraction(7, 10), Fraction(6),
         INCH / Fraction(23, 2), Fraction(1, 3)]


@pytest.mark.parametrize("gears", SMALL_SETS)
@pytest.mark.parametrize("leadscrew", [Leadscrew.from_tpi(8), Leadscrew.from_mm(3)])
@pytest.mark.parametrize("per_ratio", [1, 3])
def test_same_answers_and_order_as_brute_force(gears, leadscrew, per_ratio, ratio_key):
    for lead in LEADS:
        got = answers(find_trains(leadscrew, lead, gears, limit=10, per_ratio=per_ratio))
        want = brute_force(leadscrew.pitch_exact, lead, gears, limit=10, per_ratio=per_ratio)
        assert got == want, lead


@settings(max_examples=40, deadline=None)
@given(gears=st.lists(st.tuples(st.integers(12, 130), st.integers(1, 2)), min_size=2,
                      max_size=5),
       lead=st.fractions(min_value=Fraction(1, 5), max_value=Fraction(8),
                         max_denominator=200),
       margin=st.integers(0, 30),
       fixed=st.sampled_from([Fraction(1), Fraction(1, 2), Fraction(2)]))
def test_brute_force_agrees_on_random_sets(gears, lead, margin, fixed):
    gearset = normalise_gears(gears)
    if sum(n for _, n in gearset) < 2:
        return
    ls = Leadscrew.from_tpi(8)
    got = answers(find_trains(ls, lead, gearset, fixed_ratio=fixed, margin=margin, limit=6))
    want = brute_force(ls.pitch_exact, lead, gearset, fixed=fixed, margin=margin, limit=6)
    assert got == want


def test_every_answer_re_derives_exactly():
    # inverse path: the lead each train reports is leadscrew x drivers / driven, exactly
    ls = Leadscrew.from_tpi(8)
    for t in find_trains(ls, INCH / 13, SET_FIVES_127, limit=12):
        exact = lead_made(ls, t.drivers, t.driven)
        assert float(exact) == t.lead_made_mm
        assert t.ratio == exact / ls.pitch_exact
        assert t.error_pct == pytest.approx(float((exact / (INCH / 13) - 1) * 100), abs=1e-12)


def test_ranked_by_error_then_fewer_gears():
    ls = Leadscrew.from_tpi(8)
    found = find_trains(ls, 1.25, SET_FIVES_127, limit=15, per_ratio=3)
    keys = [(abs(Fraction(t.error_pct).limit_denominator(10**12)), t.gear_count) for t in found]
    assert [k[0] for k in keys] == sorted(k[0] for k in keys)
    for (e1, g1), (e2, g2) in zip(keys, keys[1:]):
        if e1 == e2:
            assert g1 <= g2


# ---------------------------------------------------------------------------------------------
# Mechanical sense

def test_a_gear_is_used_only_as_often_as_owned():
    # ratio 1/4 needs 20/40 x 20/40 (or 20/40 with another 1/2): one 20 and one 40 cannot
    ls = Leadscrew.from_mm(4)
    one_each = find_trains(ls, 1.0, [(20, 1), (40, 1)], margin=0, limit=20, per_ratio=20)
    assert all(not t.exact for t in one_each)
    for t in one_each:
        used = list(t.drivers + t.driven)
        assert all(used.count(g) <= 1 for g in used)
    two_each = find_trains(ls, 1.0, [(20, 2), (40, 2)], margin=0)
    assert two_each[0].exact and two_each[0].drivers == (20, 20)


@pytest.mark.parametrize("margin", [0, 15, 16, 40])
def test_compound_trains_pass_the_clearance_rule(margin):
    ls = Leadscrew.from_tpi(8)
    found = find_trains(ls, 0.7, SET_FIVES_127, margin=margin, limit=30, per_ratio=5)
    for t in found:
        if t.kind == "compound":
            (a, c), (b, d) = t.drivers, t.driven
            assert a + b >= c + margin and c + d >= b + margin


def test_clearance_boundary():
    # A 20 drives B 30, C 35 on B drives D 40: A + B - C = 15 exactly (allowed at 15, not 16)
    ls = Leadscrew.from_mm(1)
    gears = [20, 30, 35, 40]
    at_15 = find_trains(ls, Fraction(7, 12), gears, margin=15, limit=8, per_ratio=8)
    at_16 = find_trains(ls, Fraction(7, 12), gears, margin=16, limit=8, per_ratio=8)
    assert ((20, 35), (30, 40)) in {(t.drivers, t.driven) for t in at_15}
    assert ((20, 35), (30, 40)) not in {(t.drivers, t.driven) for t in at_16}


def test_simple_train_idler_not_in_ratio_and_described():
    t = find_trains(Leadscrew.from_tpi(8), 3, SET_FIVES_127)[0]
    assert t.gear_count == 2
    assert "idler" in t.describe() and len(t.describe()) <= 76


def test_gearbox_positions():
    # 8 tpi leadscrew, box position 1/2 with no change gears: 16 tpi exactly (computed)
    ls = Leadscrew.from_tpi(8)
    box = parse_gearbox("A=1/2,B=1,C=2")
    found = find_trains(ls, INCH / 16, (), gearbox=box)
    assert found[0].kind == "box" and found[0].box == "A" and found[0].exact
    with_gears = find_trains(ls, INCH / 48, [20, 40, 60], gearbox=box)
    assert with_gears[0].exact and with_gears[0].box == "A"       # 1/2 x 20/60 = 1/6
    assert with_gears[0].ratio == Fraction(1, 3)


def test_fixed_ratio_in_the_drive():
    # a 1:2 stud halves every lead (Rose, Modern Machine Shop Practice formula with the fixed ratio)
    ls = Leadscrew.from_tpi(8)
    t = find_trains(ls, 1.5, SET_FIVES_127, fixed_ratio=Fraction(1, 2))[0]
    assert t.exact and t.ratio == Fraction(120, 127)


def test_table_is_cached_per_gear_set():
    g = normalise_gears(SET_FIVES_127)
    assert train_table(g, 15) is train_table(g, 15)
    assert train_table(g, 15) is not train_table(g, 20)


def test_trains_for_lathe_uses_its_gears():
    lathe = Lathe("demo", Leadscrew.from_tpi(8), Dial("in", 0.001, 200, True),
                  Dial("in", 0.001, 100), gears=tuple((t, 1) for t in SET_FIVES_127))
    assert trains_for_lathe(lathe, 3.0)[0].drivers == (120,)


# ---------------------------------------------------------------------------------------------
# What people type, and errors

@pytest.mark.parametrize("text, mm", [
    ("1.5mm", Fraction(3, 2)), ("1.5", Fraction(3, 2)), ("1,5 mm", Fraction(3, 2)),
    ("20tpi", INCH / 20),        # ISO 31-1: 1 in = 25.4 mm; 20 tpi = 1.27 mm
    ("11.5 tpi", INCH / Fraction(23, 2)), ("11-1/2tpi", INCH / Fraction(23, 2)),
    ("0.05in", Fraction(127, 100)),
])
def test_parse_lead(text, mm):
    assert parse_lead(text) == mm


@pytest.mark.parametrize("text", ["", "abc", "0", "-1mm", "0tpi", "1.5 furlong", "tpi"])
def test_parse_lead_refuses(text):
    with pytest.raises(InvalidEntry):
        parse_lead(text)


def test_parse_leadscrew():
    assert parse_leadscrew("8tpi").pitch_exact == INCH / 8
    assert parse_leadscrew("3mm").pitch_exact == 3
    for bad in ("8", "", "xmm", "0tpi"):
        with pytest.raises(InvalidEntry):
            parse_leadscrew(bad)


def test_parse_gear_list_and_ratio():
    assert parse_gear_list("20, 25x2,20,127*1") == ((20, 2), (25, 2), (127, 1))
    assert parse_ratio("2:1") == 2 and parse_ratio("1/2") == Fraction(1, 2)
    for bad in ("", "20,abc", "0", "20x0"):
        with pytest.raises(InvalidEntry):
            parse_gear_list(bad)
    for bad in ("0", "x", "1:0"):
        with pytest.raises(InvalidEntry):
            parse_ratio(bad)
    assert parse_gearbox("1/2,1") == (GearboxPosition("1", Fraction(1, 2)),
                                      GearboxPosition("2", Fraction(1)))


def test_search_errors():
    ls = Leadscrew.from_tpi(8)
    with pytest.raises(InvalidEntry):
        find_trains(ls, 1.5, [])
    with pytest.raises(InvalidEntry):
        find_trains(ls, 0, [20, 40])
    with pytest.raises(InvalidEntry):
        find_trains(ls, 1.5, [20, 40], margin=-1)
    with pytest.raises(InvalidEntry):
        normalise_gears([0, 20])
    with pytest.raises(InvalidEntry):
        normalise_gears([20.5])
    with pytest.raises(InvalidEntry):
        lead_made(ls, (20,), (40, 50))


# ---------------------------------------------------------------------------------------------
# The sorted table itself, against the itertools brute force (every train, grouped by ratio)

def _table_trains(table):
    """Return [(ratio as Fraction, (drivers, driven))] in table order, decoded from codes."""
    out = []
    for g in range(len(table.unique_ratio)):
        for code in table.code[table.group_start[g]:table.group_end[g]].tolist():
            a, b, c, d = table.decode(code)
            drivers, driven = ((a, c), (b, d)) if c else ((a,), (b,))
            ratio = Fraction(a * (c or 1), b * (d or 1))
            out.append((g, ratio, (drivers, driven), code))
    return out


def _check_table(gears, margin, compound):
    from shopterm.lathe.gears import _TrainTable
    table = _TrainTable(gears, margin, compound)
    rows = _table_trains(table)
    # every train the brute force allows is in the table once, and nothing else
    assert {train for _, _, train, _ in rows} == _all_trains(gears, margin, compound)
    assert len(rows) == len(table) == len(_all_trains(gears, margin, compound))
    # one group per exact ratio, groups in increasing exact ratio, float = the ratio rounded
    ratios = {}
    for g, ratio, _, _ in rows:
        assert ratios.setdefault(g, ratio) == ratio
    group_ratios = [ratios[g] for g in sorted(ratios)]
    assert group_ratios == sorted(set(group_ratios))
    assert table.unique_ratio.tolist() == [float(r) for r in group_ratios]
    assert table.ratio.tolist() == [float(r) for _, r, _, _ in rows]
    # inside one ratio the codes come in increasing order: fewer gears, then teeth A, B, C, D
    codes = [(g, code) for g, _, _, code in rows]
    assert codes == sorted(codes)
    return table


@pytest.mark.parametrize("gears", SMALL_SETS)
@pytest.mark.parametrize("margin", [0, 15, 40])
@pytest.mark.parametrize("compound", [True, False])
def test_table_holds_every_train_grouped_by_exact_ratio(gears, margin, compound, ratio_key):
    assert _check_table(gears, margin, compound).keyed_by == ratio_key


@settings(max_examples=40, deadline=None,
          suppress_health_check=[HealthCheck.function_scoped_fixture])   # same key all along
@given(gears=st.lists(st.tuples(st.integers(1, 1000), st.integers(1, 3)), min_size=1,
                      max_size=5),
       margin=st.integers(0, 60), compound=st.booleans())
def test_table_agrees_with_brute_force_on_random_sets(gears, margin, compound, ratio_key):
    # up to MAX_TEETH = 1000 teeth: products to 10**6, ratios still told apart exactly
    _check_table(normalise_gears(gears), margin, compound)


def test_table_of_nearly_equal_big_gears(ratio_key):
    # 997..1000 teeth: ratios such as 999*1000/(998*997) differ from their neighbours by
    # parts in 10**12; each must still get a group of its own (checked with Fraction)
    _check_table(normalise_gears([991, 997, 998, 999, 1000, (1000, 1)]), 0, True)


def test_table_of_twelve_big_gears(ratio_key):
    # 1..1000 teeth in 12 gears: the float key keeps 41 mantissa bits and 15 code bits, the
    # most it ever packs (checked against the brute force with Fraction like the others)
    table = _check_table(normalise_gears([1, 2, 3, 500, 991, 995, 996, 997, 998, 999, 1000, 7]),
                         0, True)
    assert table.keyed_by == ratio_key


def test_huge_clearance_margin_leaves_simple_trains_only():
    found = find_trains(Leadscrew.from_tpi(8), 1.5, SET_FIVES_127, margin=10**6, limit=20)
    assert found and all(t.kind == "simple" for t in found)


def test_empty_and_single_gear_tables(ratio_key):
    one = train_table(((40, 1),), 15, True)
    assert len(one) == 0 and not len(one.unique_ratio)
    assert find_trains(Leadscrew.from_tpi(8), 1.5, [40]) == ()
    two = train_table(((40, 2),), 0, True)           # two 40s: 40/40 simple only
    assert [t[2] for t in _table_trains(two)] == [((40,), (40,))]
    four = train_table(((40, 4),), 0, True)          # four: also 40/40 x 40/40, after it
    assert [t[2] for t in _table_trains(four)] == [((40,), (40,)), ((40, 40), (40, 40))]
    _check_table(((40, 4),), 0, True)


# ---------------------------------------------------------------------------------------------
# Gearbox positions, against a brute force over every box and every train

def brute_force_boxes(leadscrew_pitch, wanted, gears, boxes, *, margin=15, limit=8,
                      per_ratio=1):
    """Return [(box label, drivers, driven, ratio)] ranked as find_trains documents it."""
    rows = []
    for bi, pos in enumerate(boxes):
        base = leadscrew_pitch * pos.ratio
        rows.append(((abs(base / wanted - 1), 0, (0, 0, 0, 0), bi), pos.label, (), (),
                     Fraction(1), base))
        for drivers, driven in _all_trains(tuple(gears), margin, True):
            r = Fraction(1)
            for t in drivers:
                r *= t
            for t in driven:
                r /= t
            if len(drivers) == 2:
                teeth = (drivers[0], driven[0], drivers[1], driven[1])
            else:
                teeth = (drivers[0], driven[0], 0, 0)
            rows.append(((abs(base * r / wanted - 1), 2 * len(drivers), teeth, bi), pos.label,
                         drivers, driven, r, base * r))
    rows.sort(key=lambda row: row[0])
    out, seen = [], {}
    for _, label, drivers, driven, r, made in rows:
        if seen.get(made, 0) >= per_ratio:
            continue
        seen[made] = seen.get(made, 0) + 1
        out.append((label, drivers, driven, r))
        if len(out) == limit:
            break
    return out


@pytest.mark.parametrize("gears", SMALL_SETS[:3])
@pytest.mark.parametrize("per_ratio", [1, 2])
def test_gearbox_search_agrees_with_brute_force(gears, per_ratio):
    # a three-position box (1/2, 1, 2; common practice, no source) on an 8 tpi leadscrew
    ls = Leadscrew.from_tpi(8)
    box = parse_gearbox("A=1/2,B=1,C=2")
    for lead in LEADS:
        got = [(t.box, t.drivers, t.driven, t.ratio)
               for t in find_trains(ls, lead, gears, gearbox=box, limit=10,
                                    per_ratio=per_ratio)]
        assert got == brute_force_boxes(ls.pitch_exact, lead, gears, box, limit=10,
                                        per_ratio=per_ratio), lead


def test_reported_floats_are_the_exact_values_rounded():
    # every float a train reports is its exact Fraction value rounded once (re-derived here)
    ls = Leadscrew.from_tpi(8)
    box = parse_gearbox("A=1/2,B=1")
    for t in find_trains(ls, INCH / 19, SET_FIVES_127, gearbox=box, limit=12, per_ratio=2):
        box_ratio = {"A": Fraction(1, 2), "B": Fraction(1)}[t.box]
        made = lead_made(ls, t.drivers, t.driven, box_ratio=box_ratio)
        rel = made / (INCH / 19) - 1
        assert t.lead_made_mm == float(made) and t.lead_wanted_mm == float(INCH / 19)
        assert t.error_pct == float(rel * 100) and t.error_per_inch == float(rel)
        assert t.error_per_25mm == float(rel * 25) and t.exact == (rel == 0)


def test_which_ratio_key():
    # the float key needs 2*log2(P**2) + 1 mantissa bits and the code bits within 63: so it
    # serves the usual sets (teeth up to 127, even 60 gears), the grid the big-tooth ones
    from shopterm.lathe.gears import _TrainTable
    usual = normalise_gears(SET_FIVES_127)
    assert _TrainTable(usual, 15, True).keyed_by == "float"
    assert _TrainTable._float_shift(127 ** 2, (60 ** 4 + 60 ** 2).bit_length()) is not None
    big = normalise_gears(range(960, 1001, 2))        # 21 gears of 960..1000 teeth
    assert _TrainTable(big, 15, True).keyed_by == "grid"
    assert _TrainTable(big, 15, False).keyed_by == "float"     # simple only: P = 1000
