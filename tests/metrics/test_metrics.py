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
