"""checker.stats.combination_ranges: a brute-force differential test of every range
(issue 11), and the vectorised formulas against stats.combine and statsmodels.

Random claims with 2 to 8 parts, each estimate and error printed to one, two or three
significant digits (and, for the samples-weighted combination, samples printed to two).
For every quantity the engine's range must hold every value found by brute force (every
vertex of the box for up to six parts; beyond that every vertex of the estimates and of the
errors with the other at a common end, and random vertices; always random interior points;
for Cochran's Q and the scatter also scipy's bounded minimisation, the reference for their
convex minimum), and, where the engine says it is exact, be no wider than brute force by
more than 1% of the quantity's value at the printed numbers.  Every case must pass (the
seeds are fixed; a failure is a bug, not bad luck).
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from scipy.optimize import lsq_linear

from checker.stats.combination_ranges import CombinationRanges, PartsBox, evaluate
from checker.stats.combine import combine
from box_tools import random_box  # shared with the agreement test

EXACT = [("equal", "estimate"), ("equal", "stat_error"), ("samples", "estimate"), ("samples", "stat_error"),
         ("inverse-variance", "estimate"), ("inverse-variance", "stat_error")]
SEARCHED = [("random-effects", "estimate"), ("random-effects", "stat_error"), ("paule-mandel", "estimate"),
            ("paule-mandel", "stat_error"), ("inverse-variance", "scaled_error"), ("equal", "scaled_error")]


def vertices(low, high):
    d = low.size
    pick = ((np.arange(2 ** d)[:, None] >> np.arange(d)) & 1).astype(bool)
    return np.where(pick, high, low)


def brute_points(box: PartsBox, rng, interior: int = 400) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """Rows of (x, s, n) covering the box: vertices and random interior points."""
    k = box.count
    lo = np.concatenate((box.x_low, box.s_low, box.n_low))
    hi = np.concatenate((box.x_high, box.s_high, box.n_high))
    free = np.flatnonzero(hi > lo)
    rows = [np.tile(0.5 * (lo + hi), (1, 1))]
    if free.size <= 12:
        v = np.tile(0.5 * (lo + hi), (2 ** free.size, 1))
        v[:, free] = vertices(lo[free], hi[free])
        rows.append(v)
    else:
        for a, b, pos in ((box.x_low, box.x_high, slice(0, k)), (box.s_low, box.s_high, slice(k, 2 * k)),
                          (box.n_low, box.n_high, slice(2 * k, 3 * k))):
            sub = vertices(a, b)
            for end_x in (box.x_low, box.x_high):
                for end_s in (box.s_low, box.s_high):
                    for end_n in (box.n_low, box.n_high):
                        base = np.concatenate((end_x, end_s, end_n))
                        block = np.tile(base, (sub.shape[0], 1))
                        block[:, pos] = sub
                        rows.append(block)
        rows.append(np.where(rng.random((3000, lo.size)) < 0.5, hi, lo))
    rows.append(lo + (hi - lo) * rng.random((interior, lo.size)))
    z = np.vstack(rows)
    return z[:, :k], z[:, k:2 * k], z[:, 2 * k:]


def check_range(got, values, centre_value, exact: bool, what: str):
    b_lo, b_hi = float(np.min(values)), float(np.max(values))
    slack = 1e-9 * max(abs(b_lo), abs(b_hi))
    assert got[0] <= b_lo + slack and got[1] >= b_hi - slack, (what, got, (b_lo, b_hi))
    if exact:
        extra = (b_lo - got[0]) + (got[1] - b_hi)
        assert extra <= 0.01 * abs(centre_value) + slack, (what, got, (b_lo, b_hi))


def convex_minimum(w, low, high):
    """min over x in the box and free mu of sum w (x - mu)^2: a bounded linear least-squares
    problem in (x, mu), solved by scipy.optimize.lsq_linear (an outside reference for the
    engine's one-variable solution)."""
    k = low.size
    scale = max(float(np.max(np.abs(high))), 1e-300)
    root = np.sqrt(w / w.max())
    a = np.hstack((np.diag(root), -root[:, None]))
    lower = np.append(low / scale, -np.inf)
    upper = np.append(high / scale, np.inf)
    res = lsq_linear(a, np.zeros(k), bounds=(lower, upper), method="bvls", tol=1e-14)
    x, mu = res.x[:k] * scale, res.x[k] * scale
    return float(np.dot(w, (np.clip(x, low, high) - mu) ** 2))


def q_rows(x, s):
    w = 1 / s ** 2
    mu = (w * x).sum(-1, keepdims=True) / w.sum(-1, keepdims=True)
    return (w * (x - mu) ** 2).sum(-1)


@pytest.mark.parametrize("seed", range(4))
def test_exact_ranges_against_brute_force(seed):
    rng = np.random.default_rng(100 + seed)
    for case in range(250):
        box = random_box(rng, printed_samples=case % 5 == 0)
        engine = CombinationRanges(box)
        x, s, n = brute_points(box, rng)
        k = box.count
        for method, quantity in EXACT:
            values = evaluate(method, quantity, x, s, n)
            centre = evaluate(method, quantity, box.x, box.s, box.n)[0]
            check_range(engine.range(method, quantity), values, centre, True, (seed, case, method, quantity))
        # Cochran's Q and the scatter: the brute force plus scipy's bounded minimisation (convex).
        q = q_rows(x, s)
        s_big = box.s_high
        q_min = convex_minimum(s_big ** -2, box.x_low, box.x_high)
        check_range(engine.q(), np.append(q, q_min), q_rows(box.x, box.s), True, (seed, case, "Q"))
        spread = np.sqrt(np.var(x, axis=1, ddof=1) / k)
        ones = np.ones(k)
        ss_min = convex_minimum(ones, box.x_low, box.x_high)
        check_range(engine.spread(), np.append(spread, math.sqrt(max(ss_min, 0) / (k * (k - 1)))),
                    np.std(box.x, ddof=1) / math.sqrt(k), True, (seed, case, "spread"))
        check_range(engine.average(), s.mean(axis=1), box.s.mean(), True, (seed, case, "average"))
        check_range(engine.quadrature(), np.sqrt((s * s).sum(axis=1)), math.sqrt(np.sum(box.s ** 2)), True,
                    (seed, case, "quadrature"))


@pytest.mark.parametrize("seed", range(2))
def test_searched_ranges_hold_brute_force(seed):
    # The approximate ranges (README, "Printed precision"): a local search from the vertices.
    # Each must reach every point brute force finds to within 1% of the quantity's value (half the
    # default tolerance), and in at least 95% of the ranges reach them all (measured on these seeds:
    # all 448 did).
    rng = np.random.default_rng(200 + seed)
    checked = missed = 0
    for case in range(40):
        box = random_box(rng, printed_samples=case % 2 == 0)
        engine = CombinationRanges(box)
        x, s, n = brute_points(box, rng, interior=200)
        quantities = SEARCHED + ([("samples", "stat_error")] if case % 2 == 0 else [])
        for method, quantity in quantities:
            if method == "paule-mandel" and box.count > 5:
                continue  # the brute force's bisection on 2**16 rows would dominate the suite
            values = evaluate(method, quantity, x, s, n)
            centre = abs(evaluate(method, quantity, box.x, box.s, box.n)[0])
            got = engine.range(method, quantity)
            b_lo, b_hi = float(values.min()), float(values.max())
            what = (seed, case, method, quantity, got, (b_lo, b_hi))
            assert got[0] <= b_lo + 0.01 * centre and got[1] >= b_hi - 0.01 * centre, what
            checked += 1
            slack = 1e-9 * max(abs(b_lo), abs(b_hi))
            missed += not (got[0] <= b_lo + slack and got[1] >= b_hi - slack)
    assert missed <= 0.05 * checked, (missed, checked)


@pytest.mark.parametrize("method", ["equal", "samples", "inverse-variance", "random-effects", "paule-mandel"])
def test_the_vectorised_formulas_are_those_of_combine(method):
    # stats.combine is itself held against statsmodels' combine_effects (tests/stats/test_combine.py).
    rng = np.random.default_rng(7)
    for _ in range(30):
        k = int(rng.integers(2, 9))
        x = rng.normal(0, 1, k)
        s = rng.uniform(0.2, 1.5, k)
        n = rng.uniform(100, 1000, k)
        c = combine(method, x, s, n)
        assert evaluate(method, "estimate", x, s, n)[0] == pytest.approx(c.estimate, rel=1e-9, abs=1e-12)
        assert evaluate(method, "stat_error", x, s, n)[0] == pytest.approx(c.stat_error, rel=1e-9)


def test_statsmodels_random_effects_reference():
    # statsmodels.stats.meta_analysis.combine_effects (variances, not errors): DerSimonian-Laird.
    from statsmodels.stats.meta_analysis import combine_effects

    x = np.array([0.50, 0.58, 0.45, 0.55])
    s = np.full(4, 0.02)
    res = combine_effects(x, s ** 2, method_re="dl")
    assert evaluate("random-effects", "estimate", x, s, None)[0] == pytest.approx(res.mean_effect_re, rel=1e-10)
    assert evaluate("random-effects", "stat_error", x, s, None)[0] == pytest.approx(res.sd_eff_w_re, rel=1e-10)


@pytest.mark.parametrize("seed", range(3))
def test_samples_error_range_is_exact_over_printed_samples(seed):
    # The closed form (combination_ranges.samples_error_range): every value brute force finds lies
    # inside it (vertices and interior points), its maximum is the largest vertex, and its minimum
    # is reached: scipy's L-BFGS-B from 20 starts over the samples' box finds nothing lower and
    # gets within 1e-6 of it.  Every case must pass (fixed seeds).
    from scipy.optimize import minimize

    from checker.stats.combination_ranges import samples_error_range

    rng = np.random.default_rng(300 + seed)
    for case in range(25):
        box = random_box(rng, printed_samples=True)
        k = box.count
        got = samples_error_range(box.s_low, box.s_high, box.n_low, box.n_high)
        assert got is not None
        n = np.vstack([vertices(box.n_low, box.n_high),
                       box.n_low + rng.uniform(size=(500, k)) * (box.n_high - box.n_low)])
        low_values = evaluate("samples", "stat_error", box.x, box.s_low, n)
        high_values = evaluate("samples", "stat_error", box.x, box.s_high, n)
        assert got[0] <= low_values.min() * (1 + 1e-12) and got[1] >= high_values.max() * (1 - 1e-12)
        assert got[1] == pytest.approx(high_values[: 2 ** k].max(), rel=1e-12)  # a vertex

        # Searched on the unit box and relative to the lower end, so that the optimiser's
        # tolerances are not swamped by samples of 1e4 and errors of 1e-4.
        def f(z):
            n = box.n_low + z * (box.n_high - box.n_low)
            return float(evaluate("samples", "stat_error", box.x, box.s_low, n[None, :])[0]) / got[0]

        found = got[0] * min(minimize(f, rng.uniform(size=k), method="L-BFGS-B", bounds=[(0, 1)] * k,
                                      options={"ftol": 1e-15, "gtol": 1e-12}).fun for _ in range(20))
        assert got[0] <= found * (1 + 1e-12) and found <= got[0] * (1 + 1e-6), (seed, case, got, found)


def test_samples_error_range_hands_many_free_samples_to_the_search():
    from checker.stats.combination_ranges import ALL_VERTICES, samples_error_range

    k = ALL_VERTICES + 1
    ones = np.ones(k)
    assert samples_error_range(0.1 * ones, 0.2 * ones, 100 * ones, 200 * ones) is None
    # With the samples exact every n is fixed: no vertex to count, the range is the formula's.
    got = samples_error_range(0.1 * ones, 0.2 * ones, 100 * ones, 100 * ones)
    assert got == pytest.approx((0.1 / math.sqrt(k), 0.2 / math.sqrt(k)), rel=1e-12)
