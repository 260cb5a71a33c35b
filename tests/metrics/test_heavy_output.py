"""heavy-output: sqrt(h (1 - h) / circuits) against a seeded simulation of
random circuits with Porter-Thomas output distributions."""

from __future__ import annotations

import numpy as np
import pytest

from checker.metrics import METRICS, ModelInputs

MODEL = METRICS["heavy-output"]
REPS = 1500
# Pass rate: 1500 repetitions give the sample standard deviation a relative standard error
# of about 1.8%; the 7% band is ~3.8 of those, so about 99.99% of seeds pass (seeds fixed).
BAND = 0.07


def circuit_heavy_probabilities(rng, fidelity, dimension, shape):
    """Per circuit, the probability that one shot lands in the heavy set (the outcomes whose
    ideal probability is above the median).  The ideal distribution is Dirichlet(1, ..., 1)
    (Porter-Thomas); the device samples it with probability F, else a uniform outcome,
    which is heavy half the time (Cross et al., Phys. Rev. A 100, 032328 (2019))."""
    probs = np.sort(rng.dirichlet(np.ones(dimension), size=shape), axis=-1)
    heavy_mass = probs[..., dimension // 2:].sum(axis=-1)
    return fidelity * heavy_mass + (1.0 - fidelity) * 0.5


@pytest.mark.parametrize("fidelity, seed", [(0.7, 61), (1.0, 62)])
def test_standard_error_with_one_shot_per_circuit(fidelity, seed):
    rng = np.random.default_rng(seed)
    circuits = 100
    h_c = circuit_heavy_probabilities(rng, fidelity, 32, (REPS, circuits))
    estimates = (rng.random((REPS, circuits)) < h_c).mean(axis=1)
    printed = estimates.mean()
    formula = MODEL.standard_error(printed, circuits, ModelInputs())
    assert estimates.std(ddof=1) == pytest.approx(formula, rel=BAND)


def test_many_shots_per_circuit_spread_far_less_than_the_formula():
    # Baldwin et al., "Re-examining the quantum volume test", arXiv:2110.14808 (2022): the
    # sqrt(h (1 - h) / n_circuits) interval over-covers at typical shot counts.  With 100
    # shots per circuit the spread here is about a ninth of the formula, so the formula is
    # a convention, not a floor, once a circuit is sampled many times.
    rng = np.random.default_rng(63)
    circuits, shots = 100, 100
    h_c = circuit_heavy_probabilities(rng, 0.7, 32, (REPS, circuits))
    estimates = (rng.binomial(shots, h_c) / shots).mean(axis=1)
    printed = estimates.mean()
    formula = MODEL.standard_error(printed, circuits, ModelInputs())
    assert estimates.std(ddof=1) < 0.3 * formula
    # Binomial over all shots is a true floor: Var = Var(h_c)/n + E[h_c (1 - h_c)]/(n s)
    # >= h (1 - h)/(n s) (common practice, law of total variance).
    assert estimates.std(ddof=1) > MODEL.standard_error(printed, circuits * shots, ModelInputs())


def test_counts_circuits_and_is_bounded():
    assert MODEL.count_field == "circuits"
    assert (MODEL.lowest, MODEL.highest, MODEL.hard_bounds) == (0.0, 1.0, True)
