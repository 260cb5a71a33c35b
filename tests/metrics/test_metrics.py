"""The metric registry and the base model: every metric the schema names has a
model, and the shared standard error refuses what it cannot compute."""

from __future__ import annotations

import math

import pytest

from checker.claim.validate import claim_schema
from checker.metrics import METRICS, MetricModel, ModelInputs


def test_registry_matches_the_schema():
    assert set(METRICS) == set(claim_schema()["properties"]["metric"]["enum"])
    for name, model in METRICS.items():
        assert model.name == name and isinstance(model, MetricModel)
        assert model.summary and model.noun


@pytest.mark.parametrize("n", [0, -5])
def test_no_standard_error_without_a_positive_count(n):
    for model in METRICS.values():
        assert model.standard_error(0.5, n, ModelInputs(sd=1.0)) is None


def test_standard_error_is_sqrt_of_variance_over_n():
    for name, model in METRICS.items():
        v = model.variance(0.4, ModelInputs(sd=1.5))
        if name == "counts":  # a yield's error comes from the observed count, not from samples
            assert v is None and model.standard_error(0.4, 250, ModelInputs(sd=1.5)) is None
            continue
        assert model.standard_error(0.4, 250, ModelInputs(sd=1.5)) == pytest.approx(math.sqrt(v / 250), rel=1e-15)


def test_the_base_model_has_no_variance():
    with pytest.raises(NotImplementedError):
        MetricModel().variance(0.5, ModelInputs())


# --- the xeb models' formulas on arrays (raw's per-circuit table calls them so) ---

# Estimates inside, at and beyond the mixture's range (F clipped to [0, 1]), NaN and -0.0, and seeded
# random ones; every dimension regime: the large-D limit, exact finite D (D = 2, 8, 2^20), the log
# model's large-D series above 2^22, and D beyond 60 qubits (infinite).
XEB_VALUES = [math.nan, -0.0, 0.0, -1.0, -0.3, 0.0001, 0.37, 1.0, 1.2, 40.0, -1e300, 1e300]


@pytest.mark.parametrize("metric", ["linear-xeb", "log-xeb"])
@pytest.mark.parametrize("dimension", [None, 2.0, 8.0, 2.0 ** 20, 2.0 ** 23, math.inf])
def test_the_xeb_variances_of_an_array_are_the_scalar_loop_exactly(metric, dimension):
    import numpy as np

    values = np.array(XEB_VALUES + (np.random.default_rng(11).standard_normal(500) * 0.6).tolist())
    model, inputs = METRICS[metric], ModelInputs(dimension=dimension)
    for name in ("variance", "circuit_variance", "within_variance"):
        formula = getattr(model, name)
        got = np.broadcast_to(formula(values, inputs), values.shape)
        loop = [formula(v, inputs) for v in values.tolist()]
        assert all(type(v) is float for v in loop), name  # the scalar path stays plain Python floats
        assert [repr(float(v)) for v in got] == [repr(v) for v in loop], (name, dimension)
