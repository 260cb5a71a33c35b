"""Systematic errors in a significance: the marginalized (hybrid) p-value,
computed by integration, against the quadrature identity it must satisfy for a
Gaussian null."""

from __future__ import annotations

import math

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from scipy import integrate
from scipy.stats import norm

from checker.stats.systematics import log_p_marginalized, log_p_quadrature, log_p_two_sided
from checker.stats.tails import log_p_from_sigma, sigma_from_log_p


def test_reference_example():
    # Cousins and Highland, NIM A 320, 331 (1992) (from memory), worked in REFERENCES.md:
    # f_hat 0.55, T 0.5, s0 0.01, ss 0.02 -> p 0.012673659, Z 2.23607 (= 0.05 / sqrt(5e-4)).
    for log_p in (log_p_marginalized(0.05, 0.01, 0.02), log_p_quadrature(0.05, 0.01, 0.02)):
        assert math.exp(log_p) == pytest.approx(0.012673659, abs=5e-10)
        assert sigma_from_log_p(log_p) == pytest.approx(2.23607, abs=5e-6)


def test_marginalized_against_a_plain_integration():
    # The hybrid p-value written as the average of the tail over the systematic shift and
    # integrated directly with scipy.stats.norm, outside log space (fine at a few sigma).
    distance, s0, ss = 0.05, 0.01, 0.02
    direct, _ = integrate.quad(lambda d: norm.sf((distance - d) / s0) * norm.pdf(d, scale=ss),
                               -12 * ss, 12 * ss, epsabs=0, epsrel=1e-12, limit=200)
    assert math.exp(log_p_marginalized(distance, s0, ss)) == pytest.approx(direct, rel=1e-9)


def test_identity_at_40_sigma():
    # 40 sigma in quadrature: p ~ 3.7e-350, below the smallest double.
    s0, ss = 0.6, 0.8  # hypot = 1
    log_q = log_p_quadrature(40.0, s0, ss)
    assert log_q == pytest.approx(log_p_from_sigma(40.0), rel=1e-14)
    assert log_p_marginalized(40.0, s0, ss) == pytest.approx(log_q, rel=1e-10)


def test_identity_at_200_sigma():
    assert log_p_marginalized(200.0, 0.28, 0.96) == pytest.approx(log_p_from_sigma(200.0), rel=1e-10)


def test_no_systematic_is_the_plain_tail():
    assert log_p_marginalized(0.3, 0.1, 0.0) == pytest.approx(log_p_from_sigma(3.0), rel=1e-14)
    assert log_p_quadrature(0.3, 0.1, 0.0) == pytest.approx(log_p_from_sigma(3.0), rel=1e-14)


@pytest.mark.parametrize("distance, s0, ss", [
    (1.0, 1e-3, 1.0),      # systematic far larger than the statistical error
    (-3.0, 1e-3, 1.0),     # estimate below the threshold, systematic dominant
    (1.0, 1.0, 1e-4),      # systematic negligible
    (5.0, 1e-2, 2.0),
])
def test_identity_when_one_error_dominates(distance, s0, ss):
    assert log_p_marginalized(distance, s0, ss) == pytest.approx(log_p_quadrature(distance, s0, ss),
                                                                 rel=1e-8, abs=1e-12)


def test_two_sided_is_the_sum_of_both_tails():
    up, down = log_p_quadrature(0.05, 0.01, 0.02), log_p_quadrature(-0.05, 0.01, 0.02)
    assert math.exp(log_p_two_sided(up, down)) == pytest.approx(1.0, rel=1e-12)
    assert log_p_two_sided(up, up) == pytest.approx(math.log(2) + up, rel=1e-14)
    assert log_p_two_sided(-1e5, -1e5) == pytest.approx(math.log(2) - 1e5, rel=1e-14)


@settings(max_examples=200, deadline=None)
@given(z=st.floats(min_value=-10.0, max_value=60.0),
       log_s0=st.floats(min_value=-6.0, max_value=3.0),
       log_ratio=st.floats(min_value=-3.0, max_value=3.0))
def test_marginalized_equals_quadrature_for_a_gaussian_null(z, log_s0, log_ratio):
    s0 = 10.0 ** log_s0
    ss = s0 * 10.0 ** log_ratio
    distance = z * math.hypot(s0, ss)
    marginalized = log_p_marginalized(distance, s0, ss)
    quadrature = log_p_quadrature(distance, s0, ss)
    assert marginalized == pytest.approx(quadrature, rel=1e-7, abs=1e-10)
