"""The JSON of ``claimcheck raw --json`` (checker/render/raw_json.py) follows the output contract in DESIGN.md."""

import json
import math

import numpy as np
import pytest

from checker.raw.analysis import analyse
from checker.render.raw_json import raw_result_to_dict
from checker.raw.simulate_circuits import simulate_dataset
from checker.render.json import dumps

# DESIGN.md, "Output contract": claimcheck raw DATA --json.
TOP = {"metric", "qubits", "rows", "combined", "circuits", "goodness_of_fit", "bootstrap"}
COMBINED = {"estimate", "stat_error", "stat_error_data", "samples"}
CIRCUIT = {"circuit", "estimate", "stat_error", "stat_error_data", "samples"}
FIT = {"at", "fidelity", "test", "statistic", "p_value"}
BOOT = {"level", "low", "high", "replicates", "method"}


@pytest.fixture(scope="module")
def result(tmp_path_factory):
    folder = tmp_path_factory.mktemp("result")
    data = simulate_dataset(6, 4, 300, 0.5, np.random.default_rng(2))
    path = folder / "sim.npz"
    np.savez(path, probability=data.probability, circuit=data.circuit, heavy=data.heavy)
    return analyse(str(path), "log-xeb", 6, bootstrap=300, threshold=0.4, fit_sample=1000)


def test_contract_keys(result):
    d = json.loads(dumps(raw_result_to_dict(result)))
    assert TOP <= set(d) and "findings" not in d  # findings only with --claim
    assert d["metric"] == "log-xeb" and d["qubits"] == 6 and d["rows"] == 1200
    assert COMBINED <= set(d["combined"])
    assert len(d["circuits"]) == 4 and all(CIRCUIT <= set(c) for c in d["circuits"])
    assert {g["at"] for g in d["goodness_of_fit"]} == {"fitted", "threshold", "zero"}
    assert all(FIT <= set(g) for g in d["goodness_of_fit"])
    assert BOOT <= set(d["bootstrap"]) and d["bootstrap"]["method"] == "t over circuits"  # 4 circuits
    assert set(d["bootstrap"]["basic"]) == {"low", "high"}
    assert d["combined"]["estimate"] == pytest.approx(result.combined["log-xeb"].estimate)


def test_histogram_entry_for_the_report(result):
    h = raw_result_to_dict(result)["histogram"]
    assert len(h["edges"]) == len(h["observed_density"]) + 1
    assert len(h["density_fitted"]) == len(h["density_zero"]) == len(h["observed_density"])
    boot = h["bootstrap"]
    assert len(boot["edges"]) == len(boot["density"]) + 1
    assert boot["low"] == result.bootstrap.low


def test_json_never_holds_nan(result):
    text = dumps(raw_result_to_dict(result))
    assert "NaN" not in text and "Infinity" not in text
    for value in json.loads(text)["metrics"].values():
        assert all(v is None or not isinstance(v, float) or math.isfinite(v) for v in value.values())
