"""The fast exact three-wire solver against a slow, independent reference solver.

``shopterm.cutting.wires`` finds where a wire settles in the helical groove (the saddle point
of the depth the flank allows, min over the wire's tilt θ of max over the helix angle φ) by
Newton's method with hand-worked derivatives. The reference below is the earlier solver, kept
here on its own: the same geometry (NBS H28 three-wire method: a straight wire square to the
micrometer's line lying in the helical groove, touching only the straight part of the flank),
solved by a 17-point scan and nested golden-section searches, and the pitch diameter from a
reading by plain fixed-point steps. It shares no code with the module's solver beyond the
basic forms and the flank limits of ``_flank_limits`` (checked in test_wires.py against the
BS 84 / BS 93 crest radii and the published 60° wire range).

Every check value here is computed by the reference (``# computed by the reference solver``);
the agreement asked of the fast solver is 1e-7 mm on the reading over wires and on the pitch
diameter — a hundredth of a 0.001 mm micrometer step (common practice, no source, for the
step). The module keeps ``reference_contact``/``reference_pd`` importable for a by-hand
speed comparison.
"""

from __future__ import annotations

import math

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from shopterm.cutting import wires as w
from shopterm.standards import catalogue, limits
from shopterm.standards.forms import (ACME_29, BA_47_5, FORMS, ISO_60, TRAPEZOIDAL_30,
                                      UNIFIED_60, WHITWORTH_55)

AGREE = 1e-7       # [mm] the fast solver must give the reference's answers to this
GOLDEN = (math.sqrt(5) - 1) / 2


# ---- the reference: nested golden-section searches ----------------------------------------------

def _golden_max(f, lo, hi, tol):
    """Return (x, f(x)) maximising a unimodal ``f`` on [lo, hi] (golden-section search)."""
    c = hi - GOLDEN * (hi - lo)
    d = lo + GOLDEN * (hi - lo)
    fc, fd = f(c), f(d)
    while hi - lo > tol:
        if fc > fd:
            hi, d, fd = d, c, fc
            c = hi - GOLDEN * (hi - lo)
            fc = f(c)
        else:
            lo, c, fc = c, d, fd
            d = lo + GOLDEN * (hi - lo)
            fd = f(d)
    return (c, fc) if fc > fd else (d, fd)


def reference_contact(e, wire, form, p, lead):
    """Return (M, X, θ [deg], 2ρ, φ [deg]) for pitch diameter e [mm], by nested golden searches.

    For a tilt θ the wire's axis may sink to the largest, over the + flank, of
    ρ cos φ + √(r² − v²), v = ρ·b − e_z the distance in the anvil plane; the maximum over ρ in
    closed form, over φ by a scan and a golden search; X is the smallest of that over θ.
    """
    r = wire / 2
    tan_a = math.tan(math.radians(form.angle_deg / 2))
    k = lead / (2 * math.pi)
    c0 = p / 4 - e / 2 * tan_a
    _crest, top, bottom = w._flank_limits(form)
    root_apex = e / 2 - form.height * p / 2
    rho_lo, rho_hi = root_apex + bottom * p, root_apex + top * p

    def depth(phi, theta):
        ct, st_ = math.cos(theta), math.sin(theta)
        c = math.cos(phi)
        b = math.sin(phi) * st_ - tan_a * ct
        if b > -1e-12:
            return -math.inf, math.nan
        ee = (k * phi + c0) * ct
        q = math.sqrt(b * b + c * c)
        rho = (ee - r * c / q) / b
        if rho_lo <= rho <= rho_hi:
            return (c * ee - r * q) / b, rho
        rho = min(max(rho, rho_lo), rho_hi)
        u = rho * b - ee
        if abs(u) >= r:
            return -math.inf, rho
        return rho * c + math.sqrt(r * r - u * u), rho

    reach = min(1.2, 3 * (r + p) / e)

    def sink(theta):
        n = 16
        step = 2 * reach / n
        vals = [depth(-reach + i * step, theta)[0] for i in range(n + 1)]
        i = max(range(n + 1), key=vals.__getitem__)
        lo, hi = -reach + max(i - 1, 0) * step, -reach + min(i + 1, n) * step
        phi, x = _golden_max(lambda f: depth(f, theta)[0], lo, hi, 1e-7)
        return x, phi

    lam = math.atan(k / max(e / 2 - p / 2, e / 4))
    theta, _ = _golden_max(lambda t: -sink(t)[0], 0.0, min(1.3, 1.6 * lam + 1e-3), 1e-6)
    x, phi = sink(theta)
    rho = depth(phi, theta)[1]
    return 2 * x + wire, x, math.degrees(theta), 2 * rho, math.degrees(phi)


def reference_pd(m, wire, form, p, lead):
    """Return the pitch diameter [mm] for reading ``m`` by fixed-point steps E ← E + (m − M(E)).

    Started from the simple formula E = M − W(1 + cosec a) + (P/2) cot a (NBS H28).
    """
    a = math.radians(form.angle_deg / 2)
    e = m - wire * (1 + 1 / math.sin(a)) + p / 2 / math.tan(a)
    for _ in range(60):
        step = m - reference_contact(e, wire, form, p, lead)[0]
        e += step
        if abs(step) < 1e-11:
            break
    return e


def _fresh_exact(e, wire, form, p, lead):
    """The module's exact reading, computed afresh (its cache cleared)."""
    w._settle_cached.cache_clear()
    return w.over_wires_exact(e, wire, form, p, lead)


def _wire_between(form, p, frac):
    """A wire diameter [mm] from just above the smallest (frac 0) to the largest (frac 1)."""
    rng = w.wire_range(form, p)
    return max(rng.smallest * (1 + 1e-7), rng.smallest + frac * (rng.largest - rng.smallest))


# ---- same answers over a drawn sample -----------------------------------------------------------

# every form, pitches 0.2–8 mm (drawn on a log scale), 1–6 starts, E from 3P to 40P, wires from
# the smallest to the largest (both ends drawn often)
GEOMETRY = dict(form=st.sampled_from(list(FORMS.values())),
                log_p=st.floats(math.log(0.2), math.log(8.0)),
                starts=st.integers(1, 6), ratio=st.floats(3.0, 40.0),
                frac=st.one_of(st.just(0.0), st.just(1.0), st.floats(0.0, 1.0)))


@settings(max_examples=40, deadline=None)
@given(**GEOMETRY)
def test_reading_and_seat_agree_with_the_reference(form, log_p, starts, ratio, frac):
    p = math.exp(log_p)
    e, lead = ratio * p, starts * p
    wire = _wire_between(form, p, frac)
    m_ref, x_ref, tilt_ref, dia_ref, angle_ref = reference_contact(e, wire, form, p, lead)
    w._settle_cached.cache_clear()
    c = w.wire_contact(e, wire, form, p, lead)
    # computed by the reference solver (nested golden searches on the H28 geometry)
    assert c.over_wires == pytest.approx(m_ref, abs=AGREE)
    assert c.axis_distance == pytest.approx(x_ref, abs=AGREE / 2)
    # the reference's tilt is good to its 1e-6 rad search tolerance, its contact angle to that
    # times dφ/dθ (a few): the seat itself, not only the reading, is the same
    assert c.tilt_deg == pytest.approx(tilt_ref, abs=2e-4)
    assert c.contact_angle_deg == pytest.approx(angle_ref, abs=2e-3)
    assert c.contact_diameter == pytest.approx(dia_ref, abs=1e-5)
    assert w.over_wires_exact(e, wire, form, p, lead) == c.over_wires


_CATALOGUE = [s for s in catalogue() if s.is_external]


@settings(max_examples=30, deadline=None)
@given(spec=st.sampled_from(_CATALOGUE), starts=st.integers(1, 6), where=st.floats(0.0, 1.0),
       frac=st.one_of(st.just(0.0), st.just(1.0), st.floats(0.0, 1.0)))
def test_catalogue_bands_agree_with_the_reference(spec, starts, where, frac):
    # a catalogue thread's own pitch-diameter band (its standard's limits), cut with 1–6 starts
    lim = limits(spec)
    e = lim.pd_min + where * (lim.pd_max - lim.pd_min)
    lead = starts * spec.pitch
    wire = _wire_between(spec.form, spec.pitch, frac)
    m_ref = reference_contact(e, wire, spec.form, spec.pitch, lead)[0]
    # computed by the reference solver
    assert _fresh_exact(e, wire, spec.form, spec.pitch, lead) == pytest.approx(m_ref, abs=AGREE)


@settings(max_examples=25, deadline=None)
@given(**GEOMETRY, off=st.floats(-0.03, 0.03))
def test_pitch_diameter_from_a_reading_agrees_with_the_reference(form, log_p, starts, ratio,
                                                                 frac, off):
    # the inverse path: a reading a little either side of the one E gives
    p = math.exp(log_p)
    lead = starts * p
    wire = _wire_between(form, p, frac)
    m = reference_contact(ratio * p, wire, form, p, lead)[0] + off * p
    e_ref = reference_pd(m, wire, form, p, lead)
    w._settle_cached.cache_clear()
    # computed by the reference solver (fixed-point steps on its own readings)
    assert w.pd_exact(m, wire, form, p, lead) == pytest.approx(e_ref, abs=AGREE)
    assert w.read_pitch_diameter(m, wire, form, p, lead).pd == pytest.approx(e_ref, abs=AGREE)


def test_band_over_wires_agrees_with_the_reference():
    # M10x1.5-6g d2 max 8.994, min 8.862: ISO 965-2 as printed;
    # best wire 0.866 mm; a two-start cut of it
    form, p, lead, wire = ISO_60, 1.5, 3.0, 0.866
    w._settle_cached.cache_clear()
    band = w.band_over_wires(form, p, lead, 8.994, 8.862, wire)
    for got, e in ((band.at_pd_max, 8.994), (band.at_pd_mid, 8.928), (band.at_pd_min, 8.862)):
        # computed by the reference solver
        assert got == pytest.approx(reference_contact(e, wire, form, p, lead)[0], abs=AGREE)


# ---- where Newton's method does not settle --------------------------------------------------------

@pytest.mark.parametrize("form, p, starts, ratio, frac", [
    (TRAPEZOIDAL_30, 0.331, 3, 1.641, 0.0),    # lead angle 30°: curvature wrong at the start
    (ACME_29, 1.939, 4, 1.761, 0.208),         # 36°
    (BA_47_5, 3.374, 6, 1.602, 0.268),         # 50°: a step leaves the groove
    (WHITWORTH_55, 0.494, 6, 1.575, 0.0),      # 50°
])
def test_steep_leads_fall_back_to_the_search_and_still_agree(form, p, starts, ratio, frac):
    # extreme multi-start geometry (far beyond any catalogue thread): the Newton start fails,
    # the nested search takes over, and the answer is still the reference's
    e, lead = ratio * p, starts * p
    wire = _wire_between(form, p, frac)
    gr = w._groove(e, wire, form, p, lead)
    assert w._settle_newton(gr, *w._plain_v_start(e, wire, form, p, gr[2])) is None
    # computed by the reference solver
    assert _fresh_exact(e, wire, form, p, lead) == pytest.approx(
        reference_contact(e, wire, form, p, lead)[0], abs=AGREE)


@pytest.mark.parametrize("form, e, p, starts", [
    (UNIFIED_60, 0.2175 * 25.4, 25.4 / 20, 1),   # 1/4-20 UNC basic E (NBS Handbook H28, three-wire method (computed))
    (ACME_29, 20.0, 4.0, 3),
    (TRAPEZOIDAL_30, 36.0, 8.0, 6),              # Tr40x48(P8)-like: lead angle 23°
])
def test_newton_settles_on_ordinary_threads(form, e, p, starts):
    # the fast path is the one taken for real threads (no fallback), and it is a saddle:
    # tilted either way the wire could sink less far, and no helix angle holds it higher
    wire = w.wire_constants(form).best * p
    gr = w._groove(e, wire, form, p, starts * p)
    found = w._settle_newton(gr, *w._plain_v_start(e, wire, form, p, gr[2]))
    assert found is not None
    x, theta, phi, _rho = found
    ref = reference_contact(e, wire, form, p, starts * p)
    assert 2 * x + wire == pytest.approx(ref[0], abs=AGREE)   # computed by the reference solver
    def depth(f, t):
        d = w._depth(f, t, gr, 0)
        return -math.inf if d is None else d[0]

    # the depth function itself scanned densely over φ (no solver): tilted either way the best
    # seat is higher, and at the settled tilt no helix angle holds the wire higher
    for dt in (-1e-3, 1e-3):
        assert max(depth(phi + i * 1e-4, theta + dt) for i in range(-300, 301)) > x + 1e-12
    assert max(depth(phi + i * 1e-3, theta) for i in range(-300, 301)) <= x + 1e-12


# ---- the cache -------------------------------------------------------------------------------

def test_cached_answers_are_the_fresh_ones_and_keyed_by_every_argument():
    w._settle_cached.cache_clear()
    args = (8.928, 0.866, ISO_60, 1.5, 3.0)
    first = w.wire_contact(*args)
    again = w.wire_contact(*args)
    assert again == first
    w._settle_cached.cache_clear()
    assert w.wire_contact(*args) == first
    # a different lead or form is not served from the cache of another
    assert w.over_wires_exact(8.928, 0.866, ISO_60, 1.5, 1.5) < first.over_wires
    assert w.over_wires_exact(8.928, 0.866, UNIFIED_60, 1.5, 3.0) == first.over_wires  # same form
    assert w.over_wires_exact(8.928, 0.866, WHITWORTH_55, 1.5, 3.0) != first.over_wires


def test_bad_entries_still_refused_before_any_solving():
    # error paths kept: the message tells the user what is wrong
    with pytest.raises(w.InvalidEntry, match="pitch diameter"):
        w.over_wires_exact(0.0, 0.866, ISO_60, 1.5)
    with pytest.raises(w.InvalidEntry, match="lead"):
        w.wire_contact(8.9, 0.866, ISO_60, 1.5, -3.0)
    with pytest.raises(w.InvalidEntry, match="too small"):
        w.pd_exact(0.5, 0.866, ISO_60, 1.5)
