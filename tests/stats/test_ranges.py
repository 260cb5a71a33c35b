"""checker.stats.ranges: each method of the range engine against brute force over
the box (dense sampling plus every vertex) and against scipy."""

from __future__ import annotations

import math

import numpy as np
import pytest
from scipy.optimize import linprog

from checker.stats.ranges import (binomial_variance_range, bounded_range, sampling_error_range, scalar_range,
                                  vertex_range, weighted_mean_range, weighted_ss_range)


def brute(fn, lows, highs, rng, samples=4000, vectorised=False):
    """min and max of fn over random points and every vertex of the box (beyond 16 inputs,
    4000 random vertices)."""
    lows, highs = np.asarray(lows, float), np.asarray(highs, float)
    d = lows.size
    if d <= 16:
        pick = ((np.arange(2 ** d)[:, None] >> np.arange(d)) & 1).astype(bool)
    else:
        pick = rng.random((4000, d)) < 0.5
    points = np.vstack((np.where(pick, highs, lows), lows + (highs - lows) * rng.random((samples, d))))
    values = fn(points) if vectorised else np.array([fn(p) for p in points])
    return float(values.min()), float(values.max())


def test_vertex_range_is_exact_for_a_monotone_formula():
    # z = (x - t)/s is monotone in x and in s (direction set by the sign of x - t).
    lo, hi = vertex_range(lambda x, s: (x - 1.0) / s, [(0.9, 1.2), (0.1, 0.2)])
    assert (lo, hi) == pytest.approx((-1.0, 2.0))


def test_binomial_variance_peaks_inside_the_interval():
    # p (1 - p) is 1/4 at p = 1/2 (common practice); the corners 0.45 and 0.55 give 0.2475 only.
    assert binomial_variance_range(0.45, 0.55) == pytest.approx((0.2475, 0.25))
    assert binomial_variance_range(0.10, 0.20) == pytest.approx((0.09, 0.16))
    assert binomial_variance_range(0.95, 1.05) == pytest.approx((0.0, 0.0475))


def test_scalar_range_finds_an_interior_maximum():
    lo, hi = scalar_range(lambda p: p * (1 - p), 0.45, 0.55)
    assert hi == pytest.approx(0.25, abs=1e-12)
    assert lo == pytest.approx(0.2475)
    # sin has a maximum at pi/2 and a minimum at 3 pi/2 inside [1, 5].
    assert scalar_range(math.sin, 1.0, 5.0) == pytest.approx((-1.0, 1.0), abs=1e-10)


def test_weighted_mean_range_against_a_linear_programme():
    # The maximum of sum w x / sum w over a box of w is a linear-fractional programme; the
    # Charnes-Cooper transformation makes it a linear one, solved by scipy.optimize.linprog.
    rng = np.random.default_rng(3)
    for _ in range(50):
        k = int(rng.integers(2, 9))
        x_low = rng.normal(0, 1, k)
        x_high = x_low + rng.random(k) * 0.5
        w_low = rng.random(k) + 0.1
        w_high = w_low * (1 + 3 * rng.random(k))
        lo, hi = weighted_mean_range(x_low, x_high, w_low, w_high)
        # max sum x_high y  s.t. sum y = 1, w_low t <= y <= w_high t, t >= 0 (variables y, t).
        for sign, values, got in ((-1, x_high, hi), (1, x_low, lo)):
            c = np.concatenate((sign * values, [0.0]))
            a_ub = np.vstack([np.hstack((np.eye(k), -w_high[:, None])), np.hstack((-np.eye(k), w_low[:, None]))])
            res = linprog(c, A_ub=a_ub, b_ub=np.zeros(2 * k), A_eq=[np.concatenate((np.ones(k), [0.0]))],
                          b_eq=[1.0], bounds=[(0, None)] * (k + 1))
            assert got == pytest.approx(sign * res.fun, rel=1e-9, abs=1e-12)


def q_of(x, s):
    """Cochran's Q, along the last axis."""
    w = 1 / s ** 2
    mu = (w * x).sum(-1, keepdims=True) / w.sum(-1, keepdims=True)
    return (w * (x - mu) ** 2).sum(-1)


@pytest.mark.parametrize("k", [2, 4, 8, 20])
def test_q_range_holds_brute_force(k):
    # Cochran's Q over a box of estimates and errors: no point of the box outside the range, and
    # the range no wider than what sampling and the vertices reach (up to 8 parts; 20 goes
    # past the exhaustive vertex search and tests the threshold search with its certificate).
    rng = np.random.default_rng(k)
    for _ in range(20):
        x = rng.normal(0, 1, k)
        half = rng.random(k) * 0.4
        s = 0.3 + rng.random(k)
        sh = s * rng.random(k) * 0.4
        lo, hi = weighted_ss_range(x - half, x + half, 1 / (s + sh) ** 2, 1 / (s - sh) ** 2)
        b_lo, b_hi = brute(lambda z: q_of(z[:, :k], z[:, k:]), np.concatenate((x - half, s - sh)),
                           np.concatenate((x + half, s + sh)), rng, samples=2000, vectorised=True)
        assert lo <= b_lo * (1 + 1e-9) + 1e-12 and hi >= b_hi * (1 - 1e-9)
        if k <= 8:
            assert hi <= b_hi * (1 + 1e-9)
        # The minimum is a convex problem: scipy's bounded quasi-Newton from the centre reaches it.
        from scipy.optimize import minimize

        res = minimize(lambda z: float(q_of(z, s + sh)), x, method="L-BFGS-B", bounds=list(zip(x - half, x + half)))
        assert lo == pytest.approx(res.fun, rel=1e-6, abs=1e-9)


def test_q_minimum_of_the_audit_case():
    # Issue 11: parts 0.50, 0.58, 0.45, 0.55 each +- 0.02 (printed to two digits) have Q = 24.5 on
    # 3 degrees of freedom; over the printed box its minimum is 12.96 (hand calculation: the
    # estimates drawn 0.005 toward each other and the errors at 0.025).
    x = np.array([0.50, 0.58, 0.45, 0.55])
    lo, hi = weighted_ss_range(x - 0.005, x + 0.005, np.full(4, 1 / 0.025 ** 2), np.full(4, 1 / 0.015 ** 2))
    assert q_of(x, np.full(4, 0.02)) == pytest.approx(24.5)
    assert lo == pytest.approx(12.96)
    # scipy.stats.chi2: its upper tail at 12.96 on 3 degrees of freedom.
    from scipy.stats import chi2

    assert chi2.sf(lo, 3) == pytest.approx(0.00472, rel=1e-3)


def test_bounded_range_on_a_function_with_an_interior_maximum():
    fn = lambda z: -((z[0] - 0.3) ** 2) - (z[1] - 0.6) ** 2  # noqa: E731
    lo, hi = bounded_range(fn, [0, 0], [1, 1], starts=[[0, 0]])
    assert hi == pytest.approx(0.0, abs=1e-10)
    assert lo == pytest.approx(-(0.7 ** 2 + 0.6 ** 2))


def test_sampling_error_range_of_a_proportion_at_one_half():
    # "0.5" from 100 samples: sqrt(p (1 - p) / 100) peaks at 0.05 with p = 1/2 inside [0.45, 0.55].
    variance = lambda p: p * (1 - p)  # noqa: E731
    lo, hi = sampling_error_range(variance, binomial_variance_range, (0.45, 0.55), (100, 100))
    assert (lo, hi) == pytest.approx((math.sqrt(0.2475) / 10, 0.05))
    # With a scale printed to a precision the search reaches the same peak times the scale's end.
    lo, hi = sampling_error_range(variance, binomial_variance_range, (0.45, 0.55), (100, 100), (0.95, 1.05))
    b_lo, b_hi = brute(lambda z: z[1] * math.sqrt(variance(z[0] / z[1])) / 10, [0.45, 0.95], [0.55, 1.05],
                       np.random.default_rng(1))
    assert lo <= b_lo + 1e-12 and hi >= b_hi - 1e-12
    # ... and no wider than random sampling reaches, beyond 0.01% (the exact peak is 1.05 x 0.05).
    assert hi == pytest.approx(0.0525) and hi - b_hi < 1e-5 and b_lo - lo < 1e-5


# The linear-XEB variance's closed-form range (issue 13) against brute force over the interval:
# the grid-and-Brent search it replaced and a dense grid.  Check values: the moments of
# stats.porter_thomas (Boixo et al., Nature Physics 14, 595 (2018), arXiv:1608.00263).
@pytest.mark.parametrize("dimension", [None, 2.0, 4.0, 16.0, 2.0 ** 20])
@pytest.mark.parametrize("f_low, f_high", [(0.0, 1.0), (-0.3, 0.2), (0.2, 0.9), (0.4, 0.41), (0.9, 1.4),
                                           (-0.5, -0.1), (0.6, 0.6), (1.2, 1.5)])
def test_linear_xeb_variance_range_matches_search(dimension, f_low, f_high):
    from checker.stats.porter_thomas import linear_xeb_variance
    from checker.stats.ranges import linear_xeb_variance_range

    def v(f):
        return linear_xeb_variance(min(max(f, 0.0), 1.0), dimension)

    got = linear_xeb_variance_range(f_low, f_high, dimension)
    searched = scalar_range(v, f_low, f_high)
    assert got == pytest.approx(searched, rel=1e-10, abs=1e-15)
    grid = [v(f) for f in np.linspace(f_low, f_high, 20001)]
    assert got[0] <= min(grid) + 1e-15 and got[1] >= max(grid) - 1e-15
    assert got[0] == pytest.approx(min(grid), rel=1e-12) and got[1] == pytest.approx(max(grid), rel=1e-7)


def test_linear_xeb_variance_range_vertex_inside():
    # At D = 4 the parabola's vertex is inside [0, 1]: with E_ideal x = 2D/(D+1) and
    # E_ideal x^2 = 6D^2/((D+1)(D+2)) (Porter-Thomas Beta(1, D - 1) moments, from memory),
    # mean = 1 + (3/5) F and second moment = 8/5 + (8/5) F, so F* = (8/5 - 6/5)/(2 (3/5)^2) = 5/9.
    from checker.stats.porter_thomas import linear_xeb_variance
    from checker.stats.ranges import linear_xeb_variance_range

    lo, hi = linear_xeb_variance_range(0.0, 1.0, 4.0)
    ends = (linear_xeb_variance(0.0, 4.0), linear_xeb_variance(1.0, 4.0))
    assert hi > max(ends)
    assert hi == pytest.approx(linear_xeb_variance(5.0 / 9.0, 4.0), rel=1e-14)
    assert lo == min(ends)
    assert math.isnan(linear_xeb_variance_range(math.nan, 1.0, 4.0)[0])


# The log-XEB variance (mixture moments linear in F; pi^2/6 - F^2 in the large-D limit,
# stats.porter_thomas, from memory of the Porter-Thomas log moments) against the search.
@pytest.mark.parametrize("dimension", [None, 2.0, 4.0, 8.0, 64.0, 2.0 ** 12])
@pytest.mark.parametrize("f_low, f_high", [(0.0, 1.0), (-0.3, 0.2), (0.2, 0.9), (0.4, 0.41), (0.9, 1.4),
                                           (0.6, 0.6), (1.2, 1.5)])
def test_log_xeb_variance_range_matches_search(dimension, f_low, f_high):
    from checker.stats.porter_thomas import log_xeb_variance_finite
    from checker.stats.ranges import concave_parabola_range

    def v(f):
        return log_xeb_variance_finite(min(max(f, 0.0), 1.0), dimension)

    got = concave_parabola_range(lambda f: log_xeb_variance_finite(f, dimension), f_low, f_high)
    assert got == pytest.approx(scalar_range(v, f_low, f_high), rel=1e-10, abs=1e-15)
    grid = [v(f) for f in np.linspace(f_low, f_high, 20001)]
    assert got[0] <= min(grid) + 1e-15 and got[1] >= max(grid) - 1e-15
