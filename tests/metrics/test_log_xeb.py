"""log-xeb: the standard error of mean(ln D p) + gamma against a seeded
simulation of Porter-Thomas sampling at a known fidelity."""

from __future__ import annotations

import numpy as np
import pytest

from checker.metrics import METRICS, ModelInputs

MODEL = METRICS["log-xeb"]
REPS = 2000
# Pass rate: 2000 repetitions give the sample standard deviation a relative standard error
# of about 1.6%; the 6% band is ~3.8 of those, so about 99.99% of seeds pass (seeds fixed).
BAND = 0.06


def mixture_samples(rng, fidelity, shape):
    """x = D p in the large-D limit: Gamma(2) with probability F, else Exp(1)
    (Boixo et al., Nature Physics 14, 595 (2018), arXiv:1608.00263)."""
    ideal = rng.random(shape) < fidelity
    return np.where(ideal, rng.gamma(2.0, 1.0, shape), rng.exponential(1.0, shape))


@pytest.mark.parametrize("fidelity, seed", [(0.0, 31), (0.3, 32), (0.9, 33)])
def test_standard_error(fidelity, seed):
    rng = np.random.default_rng(seed)
    n = 500
    estimates = np.log(mixture_samples(rng, fidelity, (REPS, n))).mean(axis=1) + np.euler_gamma
    printed = estimates.mean()
    assert printed == pytest.approx(fidelity, abs=4 * estimates.std() / np.sqrt(REPS))
    formula = MODEL.standard_error(printed, n, ModelInputs())
    assert estimates.std(ddof=1) == pytest.approx(formula, rel=BAND)


def test_range():
    assert MODEL.highest == 1.0 and not MODEL.hard_bounds and MODEL.needs() == ()
