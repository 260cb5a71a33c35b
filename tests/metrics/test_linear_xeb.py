"""linear-xeb: the standard error of mean(D p) - 1, held against a seeded
simulation of Porter-Thomas sampling at a known fidelity."""

from __future__ import annotations

import numpy as np
import pytest

from checker.metrics import METRICS, ModelInputs

MODEL = METRICS["linear-xeb"]
REPS = 2000  # repetitions of the whole estimate
# Pass rate: with 2000 repetitions of a near-Gaussian estimator the sample standard deviation
# has a relative standard error of about 1/sqrt(2 * 2000) = 1.6%; the 6% band is ~3.8 of
# those, so the assertion holds for about 99.99% of seeds (the seeds here are fixed).
BAND = 0.06


def mixture_samples(rng, fidelity, shape):
    """x = D p of each sample in the large-D limit: Gamma(2) (x e^-x) with probability F,
    else Exp(1) (Boixo et al., Nature Physics 14, 595 (2018), arXiv:1608.00263)."""
    ideal = rng.random(shape) < fidelity
    return np.where(ideal, rng.gamma(2.0, 1.0, shape), rng.exponential(1.0, shape))


def finite_dimension_samples(rng, fidelity, dimension, shape):
    """x = D p(sample) for circuits with Dirichlet(1, ..., 1) output distributions (so each
    probability is Beta(1, D - 1)), a fresh circuit per sample, and a device that samples
    the ideal distribution with probability F and a uniformly random outcome otherwise."""
    probs = rng.dirichlet(np.ones(dimension), size=shape)
    cumulative = np.cumsum(probs, axis=-1)
    drawn = np.minimum((rng.random(shape)[..., None] > cumulative).sum(-1), dimension - 1)
    outcome = np.where(rng.random(shape) < fidelity, drawn, rng.integers(0, dimension, shape))
    return dimension * np.take_along_axis(probs, outcome[..., None], -1)[..., 0]


@pytest.mark.parametrize("fidelity, seed", [(0.002, 11), (0.5, 12), (0.9, 13)])
def test_standard_error_large_dimension(fidelity, seed):
    rng = np.random.default_rng(seed)
    n = 500
    estimates = mixture_samples(rng, fidelity, (REPS, n)).mean(axis=1) - 1.0
    printed = estimates.mean()  # what a claim would print as the estimate
    assert printed == pytest.approx(fidelity, abs=4 * estimates.std() / np.sqrt(REPS))
    formula = MODEL.standard_error(printed, n, ModelInputs())
    assert estimates.std(ddof=1) == pytest.approx(formula, rel=BAND)


@pytest.mark.parametrize("qubits, fidelity, seed", [(1, 0.9, 21), (2, 0.6, 22), (4, 0.3, 23)])
def test_standard_error_finite_dimension(qubits, fidelity, seed):
    rng = np.random.default_rng(seed)
    dimension, n = 2 ** qubits, 200
    estimates = finite_dimension_samples(rng, fidelity, dimension, (REPS, n)).mean(axis=1) - 1.0
    printed = estimates.mean()
    # At finite D the estimate is F (D - 1)/(D + 1), not F (REFERENCES.md, a derivation).
    assert printed == pytest.approx(fidelity * (dimension - 1) / (dimension + 1),
                                    abs=4 * estimates.std() / np.sqrt(REPS))
    formula = MODEL.standard_error(printed, n, ModelInputs(dimension=float(dimension)))
    assert estimates.std(ddof=1) == pytest.approx(formula, rel=BAND)


def test_range_and_needs():
    assert (MODEL.lowest, MODEL.highest, MODEL.hard_bounds) == (-1.0, 1.0, False)
    assert MODEL.needs() == ()
    assert MODEL.count_field == "samples"
    assert MODEL.standard_error(0.5, 0, ModelInputs()) is None
