"""Simulated datasets written in each format read back unchanged."""

import sys

import numpy as np
import pytest

from checker.errors import DataError, OutputError
from checker.raw.readers import open_table
from checker.raw.simulate_circuits import simulate_dataset
from checker.raw.writers import dataset_bytes, format_of


@pytest.fixture(scope="module")
def data():
    return simulate_dataset(5, 3, 40, 0.7, np.random.default_rng(1))


@pytest.mark.parametrize("fmt", ["csv", "npy", "npz", "parquet"])
def test_round_trip(tmp_path, data, fmt):
    path = tmp_path / f"sim.{fmt}"
    assert format_of(str(path)) == fmt
    path.write_bytes(dataset_bytes(data, fmt))
    table = open_table(str(path))
    chunks = [(c.probability.copy(), c.circuit, c.heavy) for c in table.chunks()]
    p = np.concatenate([c[0] for c in chunks])
    assert np.array_equal(p, data.probability)  # exact, CSV included
    if fmt == "npy":
        assert not table.has_circuit and not table.has_heavy
        return
    codes = np.concatenate([c[1] for c in chunks])
    assert np.array_equal(codes, data.circuit)  # circuits appear in order 0, 1, 2
    assert np.array_equal(np.concatenate([c[2] for c in chunks]), data.heavy)


def test_csv_layout(data):
    text = dataset_bytes(data, "csv").decode()
    lines = text.splitlines()
    assert lines[0] == "circuit,probability,heavy"
    assert len(lines) == 121 and lines[1].startswith("c0,") and lines[-1].startswith("c2,")


def test_unknown_extension_and_missing_pyarrow(data, monkeypatch):
    with pytest.raises(OutputError, match="write .csv, .npy, .npz or .parquet"):
        format_of("out.txt")
    monkeypatch.setitem(sys.modules, "pyarrow", None)
    with pytest.raises(DataError, match="needs the optional package pyarrow"):
        dataset_bytes(data, "parquet", "out.parquet")
