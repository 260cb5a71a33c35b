"""checker.stats.combine: the ways of combining parts, against the BCG worked
example, statsmodels, and the defining properties of each method."""

from __future__ import annotations

import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from checker.stats.combine import (COMBINATION_METHODS, combine, equal_weights, inverse_variance, random_effects,
                                   sample_weights, spread_error, weighted)

# BCG vaccine trials: Colditz et al., JAMA 271, 698 (1994), as printed in W. Viechtbauer,
# "Conducting meta-analyses in R with the metafor package", J. Stat. Softw. 36(3) (2010):
# (treated +, treated -, control +, control -) for the 13 trials.
BCG_COUNTS = [(4, 119, 11, 128), (6, 300, 29, 274), (3, 228, 11, 209), (62, 13536, 248, 12619),
              (33, 5036, 47, 5761), (180, 1361, 372, 1079), (8, 2537, 10, 619), (505, 87886, 499, 87892),
              (29, 7470, 45, 7232), (17, 1699, 65, 1600), (186, 50448, 141, 27197), (5, 2493, 3, 2338),
              (27, 16886, 29, 17825)]


def bcg():
    """Log relative risks and their standard errors (the usual large-sample
    variance 1/a - 1/(a+b) + 1/c - 1/(c+d); Viechtbauer 2010, section 3)."""
    a, b, c, d = (np.array(col, dtype=float) for col in zip(*BCG_COUNTS))
    y = np.log((a / (a + b)) / (c / (c + d)))
    v = 1 / a - 1 / (a + b) + 1 / c - 1 / (c + d)
    return y, np.sqrt(v)


def test_bcg_fixed_effect():
    y, s = bcg()
    c = inverse_variance(y, s)
    # Viechtbauer (2010), J. Stat. Softw. 36(3): fixed effect -0.4303 (se 0.0405).
    assert round(c.estimate, 4) == -0.4303
    assert round(c.stat_error, 4) == 0.0405


def test_bcg_random_effects_dersimonian_laird():
    y, s = bcg()
    c = random_effects(y, s, "dl")
    # Viechtbauer (2010), J. Stat. Softw. 36(3): DL tau^2 = 0.3088, random effects -0.7141 (se 0.1787).
    assert round(c.tau2, 4) == 0.3088
    assert round(c.estimate, 4) == -0.7141
    assert round(c.stat_error, 4) == 0.1787


def test_paule_mandel_solves_its_estimating_equation():
    # Paule and Mandel, J. Res. Natl. Bur. Stand. 87, 377 (1982) (from memory): tau^2 is the value
    # at which the generalised Q, sum w_i (y_i - mu)^2 with w_i = 1/(s_i^2 + tau^2), equals K - 1.
    y, s = bcg()
    c = random_effects(y, s, "pm")
    w = 1 / (s ** 2 + c.tau2)
    mu = np.dot(w, y) / w.sum()
    assert c.tau2 > 0
    assert np.dot(w, (y - mu) ** 2) == pytest.approx(len(y) - 1, rel=1e-3)
    assert c.estimate == pytest.approx(mu, abs=1e-12)


def test_inverse_variance_matches_statsmodels_fixed_effect():
    from statsmodels.stats.meta_analysis import combine_effects

    rng = np.random.default_rng(3)
    y = rng.normal(0.2, 0.1, 9)
    s = rng.uniform(0.02, 0.2, 9)
    ref = combine_effects(y, s ** 2)  # statsmodels takes variances
    c = inverse_variance(y, s)
    assert c.estimate == pytest.approx(float(ref.mean_effect_fe), rel=1e-12)
    assert c.stat_error == pytest.approx(float(ref.sd_eff_w_fe), rel=1e-12)


@pytest.mark.parametrize("method", ["dl", "pm"])
def test_random_effects_match_statsmodels(method):
    from statsmodels.stats.meta_analysis import combine_effects

    rng = np.random.default_rng(4)
    y = rng.normal(0.0, 0.3, 10)  # spread well beyond the errors, so tau^2 > 0
    s = rng.uniform(0.05, 0.2, 10)
    ref = combine_effects(y, s ** 2, method_re=method)  # statsmodels takes variances
    c = random_effects(y, s, method)
    assert float(ref.tau2) > 0
    # statsmodels iterates Paule-Mandel to its own default tolerance.
    rel = 1e-10 if method == "dl" else 1e-5
    assert c.tau2 == pytest.approx(float(ref.tau2), rel=rel)
    assert c.estimate == pytest.approx(float(ref.mean_effect_re), rel=rel)
    assert c.stat_error == pytest.approx(float(ref.sd_eff_w_re), rel=rel)


def test_bcg_paule_mandel_against_statsmodels():
    from statsmodels.stats.meta_analysis import combine_effects

    y, s = bcg()
    ref = combine_effects(y, s ** 2, method_re="pm")
    assert random_effects(y, s, "pm").tau2 == pytest.approx(float(ref.tau2), rel=1e-5)


def test_random_effects_truncates_a_negative_dersimonian_laird_tau2():
    # DerSimonian and Laird, Control. Clin. Trials 7, 177 (1986): tau^2 = max(0, (Q - df)/c).
    # These three parts scatter less than their errors (Q = 0.60 on 2 df); statsmodels 0.15 returns
    # the untruncated (negative) moment estimate, which would shrink the error below the
    # fixed-effect one.
    y, s = [2.5e-3, 1.9e-3, 2.3e-3], [0.5e-3, 0.6e-3, 0.5e-3]
    re = random_effects(y, s, "dl")
    fe = inverse_variance(y, s)
    assert re.tau2 == 0.0
    assert re.estimate == pytest.approx(fe.estimate, rel=1e-12)
    assert re.stat_error == pytest.approx(fe.stat_error, rel=1e-12)


def test_equal_weights_is_the_plain_mean():
    # Common practice: mean of K parts, error sqrt(sum s_i^2) / K.
    c = equal_weights([1.0, 2.0, 6.0], [0.3, 0.4, 1.2])
    assert c.estimate == pytest.approx(3.0)
    assert c.stat_error == pytest.approx(math.sqrt(0.09 + 0.16 + 1.44) / 3)


def test_sample_weights_pool_the_counts():
    # Pooling: weighting each part's proportion k_i/n_i by n_i gives sum k / sum n exactly.
    k, n = np.array([12, 40, 7]), np.array([100, 250, 90])
    c = sample_weights(k / n, n)
    assert c.estimate == pytest.approx(k.sum() / n.sum(), rel=1e-14)
    assert c.stat_error is None


def test_spread_error_matches_scipy_sem():
    from scipy.stats import sem

    x = [0.70, 0.74, 0.69, 0.77, 0.72]
    assert spread_error(x) == pytest.approx(float(sem(x)), rel=1e-12)


def test_combine_reports_missing_inputs_as_none():
    assert combine("samples", [1.0, 2.0]) is None
    assert combine("inverse-variance", [1.0, 2.0]) is None
    assert combine("random-effects", [1.0], [0.1]) is None
    assert combine("equal", [1.0, 2.0]).estimate == 1.5


@pytest.mark.parametrize("bad", [
    dict(estimates=[1.0, 2.0], errors=[0.1, 0.0]),
    dict(estimates=[1.0, 2.0], errors=[0.1]),
    dict(estimates=[], errors=[]),
    dict(estimates=[1.0, math.nan], errors=[0.1, 0.1]),
])
def test_inverse_variance_refuses_unusable_parts(bad):
    with pytest.raises(ValueError):
        inverse_variance(**bad)


def test_unknown_method_and_bad_weights_are_refused():
    with pytest.raises(ValueError):
        combine("median", [1.0, 2.0], [0.1, 0.1])
    with pytest.raises(ValueError):
        weighted("x", [1.0, 2.0], [0.0, 0.0])
    with pytest.raises(ValueError):
        random_effects([1.0, 2.0], [0.1, 0.1], "reml")


values = st.floats(min_value=-1e3, max_value=1e3, allow_nan=False)
errors = st.floats(min_value=1e-3, max_value=1e2, allow_nan=False)
parts = st.integers(min_value=2, max_value=12).flatmap(
    lambda k: st.tuples(st.lists(values, min_size=k, max_size=k), st.lists(errors, min_size=k, max_size=k),
                        st.lists(st.integers(1, 10**7), min_size=k, max_size=k)))


@settings(max_examples=60, deadline=None)
@given(parts)
def test_weights_sum_to_one_for_every_method(p):
    x, s, n = p
    for method in COMBINATION_METHODS:
        c = combine(method, x, s, n)
        assert sum(c.weights) == pytest.approx(1.0, abs=1e-12)
        assert all(w >= 0 for w in c.weights)


@settings(max_examples=100, deadline=None)
@given(parts)
def test_inverse_variance_mean_lies_within_the_parts(p):
    x, s, _ = p
    c = inverse_variance(x, s)
    slack = 1e-9 * max(1.0, max(abs(v) for v in x))
    assert min(x) - slack <= c.estimate <= max(x) + slack


@settings(max_examples=100, deadline=None)
@given(parts, st.integers(min_value=0, max_value=11))
def test_a_duplicate_part_never_increases_the_inverse_variance_error(p, which):
    x, s, _ = p
    i = which % len(x)
    before = inverse_variance(x, s).stat_error
    after = inverse_variance(x + [x[i]], s + [s[i]]).stat_error
    assert after <= before * (1 + 1e-12)
