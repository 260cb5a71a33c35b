"""checker.stats.heterogeneity: Cochran's Q, I^2, H and the scale factor,
against the BCG worked example, statsmodels, scipy and a seeded simulation."""

from __future__ import annotations

import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from checker.stats.heterogeneity import (birge_ratio, cochran_q, dersimonian_laird_tau2, heterogeneity,
                                         i_squared, log_p_chi2, scale_factor)

# BCG vaccine trials: Colditz et al., JAMA 271, 698 (1994), counts as printed in W. Viechtbauer,
# J. Stat. Softw. 36(3) (2010).
BCG_COUNTS = [(4, 119, 11, 128), (6, 300, 29, 274), (3, 228, 11, 209), (62, 13536, 248, 12619),
              (33, 5036, 47, 5761), (180, 1361, 372, 1079), (8, 2537, 10, 619), (505, 87886, 499, 87892),
              (29, 7470, 45, 7232), (17, 1699, 65, 1600), (186, 50448, 141, 27197), (5, 2493, 3, 2338),
              (27, 16886, 29, 17825)]


def bcg():
    a, b, c, d = (np.array(col, dtype=float) for col in zip(*BCG_COUNTS))
    return np.log((a / (a + b)) / (c / (c + d))), np.sqrt(1 / a - 1 / (a + b) + 1 / c - 1 / (c + d))


def test_bcg_heterogeneity():
    y, s = bcg()
    h = heterogeneity(y, s)
    # Viechtbauer (2010), J. Stat. Softw. 36(3): Q(12) = 152.2330, I^2 = 92.12%, DL tau^2 = 0.3088.
    assert h.df == 12
    assert round(h.q, 4) == 152.2330
    assert round(h.i2 * 100, 2) == 92.12
    assert round(h.tau2, 4) == 0.3088
    # H = sqrt(Q/df) (Higgins and Thompson, Stat. Med. 21, 1539 (2002)); I^2 = (H^2 - 1)/H^2.
    assert h.h == pytest.approx(math.sqrt(152.2330 / 12), rel=1e-6)
    assert h.i2 == pytest.approx((h.h ** 2 - 1) / h.h ** 2, rel=1e-12)
    assert h.scale_factor == h.h


def test_q_and_tau2_match_statsmodels():
    from statsmodels.stats.meta_analysis import combine_effects

    rng = np.random.default_rng(5)
    y = rng.normal(0.0, 0.3, 11)
    s = rng.uniform(0.05, 0.2, 11)
    ref = combine_effects(y, s ** 2, method_re="dl")  # statsmodels takes variances
    assert cochran_q(y, s) == pytest.approx(float(ref.q), rel=1e-12)
    assert float(ref.tau2) > 0
    assert dersimonian_laird_tau2(cochran_q(y, s), s) == pytest.approx(float(ref.tau2), rel=1e-10)


def test_p_value_is_the_chi_square_tail():
    from scipy.stats import chi2

    assert math.exp(log_p_chi2(7.3, 4)) == pytest.approx(float(chi2.sf(7.3, 4)), rel=1e-12)


@pytest.mark.parametrize("q, df, expected", [
    # Particle Data Group, Review of Particle Physics, Introduction, "Averages and fits" (from
    # memory): S = sqrt(chi^2/(N - 1)), applied only when it exceeds 1.
    (5.0, 10, 1.0),
    (10.0, 10, 1.0),
    (40.0, 10, 2.0),
    (9.0, 1, 3.0),
])
def test_pdg_scale_factor_rule(q, df, expected):
    assert scale_factor(q, df) == pytest.approx(expected)


def test_i_squared_is_zero_when_q_is_below_its_degrees_of_freedom():
    # Higgins and Thompson (2002): I^2 = max(0, (Q - df)/Q).
    assert i_squared(3.0, 5) == 0.0
    assert i_squared(0.0, 5) == 0.0
    assert i_squared(10.0, 5) == pytest.approx(0.5)
    assert birge_ratio(0.0, 4) == 0.0


def test_bad_input_is_refused():
    with pytest.raises(ValueError):
        heterogeneity([1.0], [0.1])
    with pytest.raises(ValueError):
        cochran_q([1.0, 2.0], [0.1, 0.0])
    with pytest.raises(ValueError):
        birge_ratio(1.0, 0)


def test_false_alarm_rate_of_p_q_below_one_percent():
    # Seeded simulation: 4000 sets of 8 parts that truly agree. Q ~ chi^2(7), so p_Q < 0.01 should
    # happen in 1% of sets; with 4000 sets the count is Binomial(4000, 0.01), mean 40, sd 6.3, so
    # [15, 70] holds it in all but about 1 in 10^4 seeds.
    rng = np.random.default_rng(20240601)
    s = rng.uniform(0.5, 2.0, 8)
    alarms = 0
    for _ in range(4000):
        y = rng.normal(1.0, s)
        alarms += heterogeneity(y, s).log_p_q < math.log(0.01)
    assert 15 <= alarms <= 70


values = st.floats(min_value=-1e3, max_value=1e3, allow_nan=False)
errors = st.floats(min_value=1e-2, max_value=1e2, allow_nan=False)


@settings(max_examples=100, deadline=None)
@given(st.integers(2, 15).flatmap(lambda k: st.tuples(st.lists(values, min_size=k, max_size=k),
                                                      st.lists(errors, min_size=k, max_size=k))))
def test_i_squared_lies_in_zero_to_one(p):
    h = heterogeneity(*p)
    assert 0.0 <= h.i2 < 1.0
    assert h.q >= 0.0 and h.tau2 >= 0.0 and h.scale_factor >= 1.0
    assert h.log_p_q <= 0.0


@pytest.mark.parametrize("q", [2000.0, 6000.0, 1e5])
def test_tail_beyond_the_double_range_matches_the_closed_forms(q):
    # For even degrees of freedom the chi-square tail is a finite Poisson sum (common practice;
    # e.g. Abramowitz and Stegun, Handbook of Mathematical Functions, eq. 26.4.21):
    # df = 2: exp(-x); df = 4: exp(-x) (1 + x); df = 6: exp(-x) (1 + x + x^2/2), with x = q/2.
    from scipy.stats import chi2

    x = q / 2.0
    assert chi2.logsf(q, 4) == -math.inf  # where scipy gives up
    assert log_p_chi2(q, 2) == pytest.approx(-x, rel=1e-12)
    assert log_p_chi2(q, 4) == pytest.approx(-x + math.log1p(x), rel=1e-12)
    assert log_p_chi2(q, 6) == pytest.approx(-x + math.log(1 + x + x * x / 2), rel=1e-12)
