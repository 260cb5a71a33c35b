"""Log-space incomplete beta and gamma functions: the library where it is
exact, independent sums and closed forms where it underflows."""

from __future__ import annotations

import math

import numpy as np
import pytest
from scipy.special import betainc, gammainc, gammaln, logsumexp

from checker.stats.log_special import log_betainc, log_gammainc_lower


@pytest.mark.parametrize("a, b, x", [(2.0, 3.0, 0.1), (50.0, 0.5, 0.3), (4.0, 6.0, 0.01), (0.5, 0.5, 0.9)])
def test_incomplete_beta_equals_scipy_where_it_is_representable(a, b, x):
    # scipy.special.betainc (Cephes incbet), full double precision here
    assert log_betainc(a, b, x) == pytest.approx(math.log(betainc(a, b, x)), rel=1e-13)


def test_incomplete_beta_deep_tail_matches_a_direct_binomial_sum():
    # I_{1/2}(k, m - k + 1) = P(X >= k) for X ~ Binomial(m, 1/2) (common practice);
    # the sum of the binomial terms in log space is an independent reference.
    m, k = 3000, 2900
    j = np.arange(k, m + 1)
    direct = logsumexp(gammaln(m + 1) - gammaln(j + 1) - gammaln(m - j + 1) - m * math.log(2))
    assert betainc(k, m - k + 1, 0.5) == 0.0  # the library underflows
    assert log_betainc(k, m - k + 1, 0.5) == pytest.approx(direct, rel=1e-12)


@pytest.mark.parametrize("n, mu", [(5, 2.0), (30, 12.5), (1, 0.3)])
def test_poisson_tail_equals_scipy_where_it_is_representable(n, mu):
    assert log_gammainc_lower(n, mu) == pytest.approx(math.log(gammainc(n, mu)), rel=1e-13)


def test_poisson_tail_deep_matches_a_direct_sum_of_terms():
    # P(N >= 2000 | 3) summed term by term in log space (common practice)
    k = np.arange(2000, 4000)
    direct = logsumexp(k * math.log(3.0) - 3.0 - gammaln(k + 1))
    assert gammainc(2000, 3.0) == 0.0
    assert log_gammainc_lower(2000, 3.0) == pytest.approx(direct, rel=1e-12)
