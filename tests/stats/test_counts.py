"""Counting-experiment significances against the published test cases of
Cousins, Linnemann and Tucker (2008) and against scipy."""

from __future__ import annotations

import math

import pytest
from scipy import stats

from checker.stats import counts
from checker.stats.tails import sigma_from_log_p

# R. D. Cousins, J. T. Linnemann and J. Tucker, Nucl. Instrum. Meth. A 595, 480 (2008),
# arXiv:physics/0702156, Table 1: reference cases (n_on, n_off, tau) with the profile-
# likelihood Z (Z_PL, Li and Ma Eq. 17) to the two decimals printed there.
TABLE_1 = [
    (4, 5, 5.0, "1.95"), (6, 18.78, 14.44, "2.82"), (9, 17.83, 4.69, "1.99"),
    (17, 40.11, 10.56, "4.57"), (50, 55, 2.0, "3.02"), (67, 15, 0.5, "3.04"),
    (200, 10, 0.1, "2.38"), (523, 2327, 5.99, "5.95"), (498426, 493434, 1.0, "5.01"),
    (2119449, 23650096, 11.21, "6.40"),
]


@pytest.mark.parametrize("n_on, n_off, tau, printed", TABLE_1)
def test_profile_likelihood_matches_table_1(n_on, n_off, tau, printed):
    assert f"{counts.profile_z_on_off(n_on, n_off, tau):.2f}" == printed


@pytest.mark.parametrize("n_on, n_off, tau", [(c[0], c[1], c[2]) for c in TABLE_1 if float(c[1]).is_integer()])
def test_z_bi_is_the_binomial_tail(n_on, n_off, tau):
    # p_Bi = P(X >= n_on), X ~ Binomial(n_on + n_off, 1 / (1 + tau)) (Cousins et al. 2008);
    # scipy.stats.binom.sf as the independent reference
    p = stats.binom.sf(n_on - 1, n_on + int(n_off), 1 / (1 + tau))
    assert math.exp(counts.z_bi_log_p(n_on, n_off, tau)) == pytest.approx(p, rel=1e-9)


def test_z_bi_first_reference_case():
    # Cousins et al. 2008, Table 1, case 1 (n_on = 4, n_off = 5, tau = 5): Z_Bi = 1.66 (from memory)
    assert f"{sigma_from_log_p(counts.z_bi_log_p(4, 5, 5.0)):.2f}" == "1.66"


@pytest.mark.parametrize("n, b", [(47, 30.2), (10, 3.2), (3, 0.5), (1000, 900.0)])
def test_asymptotic_formula_is_the_likelihood_ratio(n, b):
    # Cowan et al. 2011, Eq. 97 with s = n - b is sqrt(q0) for a Poisson count, q0 =
    # 2 [log L(n | n) - log L(n | b)]; scipy.stats.poisson.logpmf as the reference
    q0 = 2 * (stats.poisson.logpmf(n, n) - stats.poisson.logpmf(n, b))
    assert counts.asymptotic_z(n, b) == pytest.approx(math.sqrt(q0), rel=1e-10)


def test_asymptotic_formula_tends_to_s_over_root_b():
    # Cowan et al. 2011, below Eq. 97: Z ~ s / sqrt(b) for s << b
    assert counts.asymptotic_z(1e6 + 100, 1e6) == pytest.approx(100 / 1000, rel=1e-3)


@pytest.mark.parametrize("n, b", [(47, 30.2), (5, 1.1), (12, 12.0)])
def test_exact_tail_equals_scipy(n, b):
    # scipy.stats.poisson.sf(n - 1, b) = P(N >= n)
    assert math.exp(counts.exact(n, b).log_p) == pytest.approx(stats.poisson.sf(n - 1, b), rel=1e-12)


def test_exact_tail_far_below_the_double_range():
    assert stats.poisson.logsf(1999, 3.0) == -math.inf
    got = counts.exact(2000, 3.0)
    assert math.isfinite(got.log_p) and got.sigma > 100


def test_profile_without_background_error_is_the_asymptotic_formula():
    assert counts.profile(47, 30.2, 0.0).sigma == pytest.approx(counts.asymptotic_z(47, 30.2))


def test_profile_tends_to_the_asymptotic_formula_as_the_error_vanishes():
    assert counts.profile(47, 30.2, 1e-4).sigma == pytest.approx(counts.asymptotic_z(47, 30.2), rel=1e-5)


def test_background_error_lowers_every_significance():
    # 47 over 30.2 +- 3.1: each method that knows the error gives less than it does without
    for method in counts.WITH_BACKGROUND_ERROR:
        assert counts.significance(method, 47, 30.2, 3.1).sigma < counts.significance(method, 47, 30.2, 0.0).sigma


def test_fewer_events_than_background_give_a_negative_z():
    assert counts.asymptotic_z(20, 30.2) < 0 and counts.naive(20, 30.2).sigma < 0
    assert counts.profile(20, 30.2, 3.1).sigma < 0


def test_unknown_method_is_refused():
    with pytest.raises(ValueError):
        counts.significance("poisson", 4, 1.0)
