"""The XEB models' standard error of a mean over K circuits, sqrt(v/N + B (1/K - 1/N)),
held against the scatter of estimates from the project's own simulator
(checker.raw.simulate_circuits, Porter-Thomas model: a fresh flat-Dirichlet output
distribution per circuit, outcomes from F p + (1 - F)/D).  benchmarks/error_model_circuits.py
runs the full grid (D = 2^6..2^16, F = 0.01..0.8, K = 1..50); this is a seeded, fast subset."""

from __future__ import annotations

import math

import numpy as np
import pytest

from checker.metrics import METRICS, ModelInputs
from checker.raw.simulate_circuits import simulate_dataset
from checker.stats.porter_thomas import EULER_GAMMA, log_xeb_mean

REPS = 700
# Pass rate: 700 repetitions give the sample standard deviation of a near-Gaussian estimate a
# relative standard error of about 1/sqrt(2 * 700) = 2.7%; the 10% band (the issue's
# requirement) is about 3.7 of those, so about 99.98% of seeds pass (the seeds are fixed).
BAND = 0.10


def simulated_estimates(qubits, circuits, samples, fidelity, seed):
    """(linear, log) XEB estimates of REPS simulated experiments."""
    rng = np.random.default_rng(seed)
    d = 2.0 ** qubits
    lin, log = [], []
    for _ in range(REPS):
        data = simulate_dataset(qubits, circuits, samples, fidelity, rng)
        x = data.probability * d
        lin.append(x.mean() - 1.0)
        log.append(np.log(x).mean() + EULER_GAMMA)
    return np.array(lin), np.array(log)


@pytest.mark.parametrize("qubits, circuits, samples, fidelity, seed", [
    (6, 1, 200, 0.8, 1), (6, 20, 50, 0.5, 2), (8, 5, 400, 0.1, 3), (10, 3, 2000, 0.5, 4), (10, 50, 40, 0.01, 5),
])
def test_standard_error_with_circuits_matches_the_simulated_scatter(qubits, circuits, samples, fidelity, seed):
    lin, log = simulated_estimates(qubits, circuits, samples, fidelity, seed)
    d = 2.0 ** qubits
    n = circuits * samples
    inputs = ModelInputs(dimension=d, circuits=circuits)
    # The models take the expected printed value: F (D - 1)/(D + 1) and u + F (i - u).
    lin_model = METRICS["linear-xeb"].standard_error(fidelity * (d - 1) / (d + 1), n, inputs)
    log_model = METRICS["log-xeb"].standard_error(log_xeb_mean(fidelity, d), n, inputs)
    assert lin.std(ddof=1) == pytest.approx(lin_model, rel=BAND)
    assert log.std(ddof=1) == pytest.approx(log_model, rel=BAND)


def test_the_circuit_term_is_what_the_scatter_needs():
    # At 6 qubits, 5 circuits of 2000 samples, F = 0.5, the floor without circuits is
    # sqrt(v/N); with them it is about 2.6x larger, and the simulated scatter follows the latter.
    lin, _ = simulated_estimates(6, 5, 2000, 0.5, 6)
    d = 64.0
    value = 0.5 * (d - 1) / (d + 1)
    model = METRICS["linear-xeb"]
    naive = model.standard_error(value, 10_000, ModelInputs(dimension=d))
    honest = model.standard_error(value, 10_000, ModelInputs(dimension=d, circuits=5))
    assert honest / naive > 2.5
    assert lin.std(ddof=1) == pytest.approx(honest, rel=BAND)
    assert lin.std(ddof=1) > 2.0 * naive


def test_the_issues_two_cases():
    # Issue "Right at the edges", item 2: 10 qubits, F = 0.5, 10 circuits, 1e6 samples: the
    # honest error is about 0.010 (the model without circuits gave 0.0013).  16 qubits,
    # 5 circuits x 200k samples, F = 0.05, log XEB: the circuit term raises the error by about
    # 1.4x (benchmarks/error_model_circuits.py measures the scatter: RESULTS.md).
    lin = METRICS["linear-xeb"]
    d = 2.0 ** 10
    value = 0.5 * (d - 1) / (d + 1)
    assert round(lin.standard_error(value, 1e6, ModelInputs(dimension=d, circuits=10)), 3) == 0.010
    assert round(lin.standard_error(value, 1e6, ModelInputs(dimension=d)), 4) == 0.0013
    log = METRICS["log-xeb"]
    d = 2.0 ** 16
    value = log_xeb_mean(0.05, d)
    ratio = (log.standard_error(value, 1e6, ModelInputs(dimension=d, circuits=5))
             / log.standard_error(value, 1e6, ModelInputs(dimension=d)))
    assert 1.3 < ratio < 1.5


def test_without_circuits_the_error_is_the_smallest_any_count_allows():
    model = METRICS["linear-xeb"]
    inputs = ModelInputs(dimension=1024.0)
    v = model.variance(0.3, inputs)
    assert model.standard_error(0.3, 1e4, inputs) == pytest.approx(math.sqrt(v / 1e4), rel=1e-15)
    for k in (1, 10, 1000):
        assert model.standard_error(0.3, 1e4, ModelInputs(dimension=1024.0, circuits=k)) >= \
            model.standard_error(0.3, 1e4, inputs)
    # Metrics whose samples are not random circuits have no circuit term.
    assert METRICS["proportion"].circuit_variance(0.3, inputs) == 0.0
