"""checker.stats.budget: the component error model against a seeded simulation
of independent component failures and of uncertain error rates."""

from __future__ import annotations

import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from checker.stats.budget import predict, survival


def test_prediction_is_the_chance_that_no_component_fails():
    # Seeded simulation of the model itself: every occurrence of every component fails
    # independently. 400000 simulated circuits give the error-free fraction with a standard error
    # of about 0.0008 at P = 0.35; 5 standard errors make a failure a 1-in-10^6 event.
    errors, counts = [0.004, 0.0015, 0.02], [120, 300, 10]
    rng = np.random.default_rng(8)
    runs = 400_000
    ok = np.ones(runs, dtype=bool)
    for e, n in zip(errors, counts):
        ok &= rng.binomial(n, e, runs) == 0
    p = predict(errors, counts).predicted
    assert abs(ok.mean() - p) < 5 * math.sqrt(p * (1 - p) / runs)


def test_delta_method_uncertainty_matches_a_simulation():
    # Seeded simulation: error rates drawn from N(e_i, sd_i^2); the spread of the product should
    # match the delta method to a few percent when sd_i * n_i is small (here the relative
    # uncertainty is about 10%, so second-order terms are about 1%). With 200000 draws the
    # simulated sd is known to 0.2%; the 4% band holds for any seed.
    errors, counts, sds = [0.006, 0.001, 0.02], [200, 600, 20], [0.0004, 0.0001, 0.002]
    rng = np.random.default_rng(9)
    draws = np.prod([(1 - rng.normal(e, s, 200_000)) ** n for e, n, s in zip(errors, counts, sds)], axis=0)
    b = predict(errors, counts, sds)
    assert b.predicted_sd == pytest.approx(float(draws.std()), rel=0.04)


def test_survivals_and_missing_uncertainties():
    b = predict([0.01, 0.5], [3, 1], [None, None])
    assert b.survivals == pytest.approx((0.99 ** 3, 0.5))
    assert b.predicted_sd is None
    assert predict([0.01], [3]).predicted_sd is None
    assert survival(1.0, 2) == 0.0 and survival(1.0, 0) == 1.0


@pytest.mark.parametrize("bad", [dict(errors=[1.2], counts=[1]), dict(errors=[-0.1], counts=[1]),
                                 dict(errors=[0.1], counts=[-1]), dict(errors=[], counts=[]),
                                 dict(errors=[0.1], counts=[1, 2]),
                                 dict(errors=[0.1], counts=[1], error_sds=[-0.01])])
def test_unusable_budgets_are_refused(bad):
    with pytest.raises(ValueError):
        predict(**bad)


rates = st.floats(min_value=0.0, max_value=0.2, allow_nan=False)
counts = st.floats(min_value=0.0, max_value=2000.0, allow_nan=False)


@settings(max_examples=100, deadline=None)
@given(st.lists(st.tuples(rates, counts), min_size=1, max_size=6))
def test_exponential_form_is_never_below_the_product(items):
    # 1 - e <= exp(-e) for every e, so prod (1 - e)^n <= exp(-sum n e) (common practice).
    errors, n = zip(*items)
    b = predict(list(errors), list(n))
    assert b.predicted <= b.predicted_exponential * (1 + 1e-12)
    assert 0.0 <= b.predicted <= 1.0
