"""mean: sd / sqrt(N) against seeded draws from a skewed distribution."""

from __future__ import annotations

import numpy as np
import pytest

from checker.metrics import METRICS, ModelInputs

MODEL = METRICS["mean"]
REPS = 2000
# Pass rate: the sample standard deviation of 2000 repetitions of a mean of 200 has a
# relative standard error of about 1.6%; the 6% band is ~3.8 of those: ~99.99% of seeds pass.
BAND = 0.06


@pytest.mark.parametrize("seed", [51, 52])
def test_standard_error(seed):
    rng = np.random.default_rng(seed)
    n, sd = 200, 0.31
    # Gamma(4) rescaled to standard deviation 0.31: skewed, so not just a Gaussian identity.
    draws = rng.gamma(4.0, sd / 2.0, (REPS, n))
    estimates = draws.mean(axis=1)
    formula = MODEL.standard_error(estimates.mean(), n, ModelInputs(sd=sd))
    assert estimates.std(ddof=1) == pytest.approx(formula, rel=BAND)


def test_needs_the_per_sample_sd():
    assert MODEL.needs() == ("sd",)
    assert MODEL.variance(1.0, ModelInputs()) is None
    assert MODEL.standard_error(1.0, 100, ModelInputs()) is None
    assert MODEL.standard_error(1.0, 100, ModelInputs(sd=2.0)) == pytest.approx(0.2, rel=1e-15)
