"""proportion: the binomial standard error sqrt(p (1 - p) / N) against seeded
Bernoulli draws."""

from __future__ import annotations

import numpy as np
import pytest

from checker.metrics import METRICS, ModelInputs

MODEL = METRICS["proportion"]
REPS = 2000
# Pass rate: the sample standard deviation of 2000 repetitions has a relative standard error
# of about 1.6%; the 6% band is ~3.8 of those: about 99.99% of seeds pass (seeds fixed).
BAND = 0.06


@pytest.mark.parametrize("p, n, seed", [(0.912, 1000, 41), (0.5, 400, 42), (0.03, 5000, 43)])
def test_standard_error(p, n, seed):
    rng = np.random.default_rng(seed)
    estimates = rng.binomial(n, p, REPS) / n
    printed = estimates.mean()
    formula = MODEL.standard_error(printed, n, ModelInputs())
    assert estimates.std(ddof=1) == pytest.approx(formula, rel=BAND)


def test_hard_bounds_and_edges():
    assert (MODEL.lowest, MODEL.highest, MODEL.hard_bounds) == (0.0, 1.0, True)
    assert MODEL.standard_error(1.0, 100, ModelInputs()) == 0.0
    assert MODEL.standard_error(0.5, 100, ModelInputs()) == pytest.approx(0.05, rel=1e-15)
