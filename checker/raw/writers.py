"""Simulated datasets as CSV, NPY, NPZ or Parquet bytes (the format from the
output file's extension), for :func:`checker.output.write_atomic`."""

from __future__ import annotations

import io
from pathlib import Path

import numpy as np

from ..errors import DataError, OutputError
from .simulate_circuits import Dataset

FORMATS = {".csv": "csv", ".npy": "npy", ".npz": "npz", ".parquet": "parquet", ".pq": "parquet"}


def format_of(path: str) -> str:
    fmt = FORMATS.get(Path(path).suffix.lower())
    if fmt is None:
        raise OutputError(str(path), f"has the extension {Path(path).suffix or '(none)'!r}",
                          "write .csv, .npy, .npz or .parquet")
    return fmt


def dataset_bytes(data: Dataset, fmt: str, name: str = "") -> bytes:
    """The dataset in one of the raw formats.  NPY keeps the probabilities only."""
    if fmt == "csv":
        return _csv(data)
    buffer = io.BytesIO()
    if fmt == "npy":
        np.save(buffer, data.probability)
    elif fmt == "npz":
        np.savez_compressed(buffer, probability=data.probability, circuit=data.circuit, heavy=data.heavy)
    elif fmt == "parquet":
        try:
            import pyarrow as pa
            import pyarrow.parquet as pq
        except ImportError:
            raise DataError(name or "output", "writing Parquet needs the optional package pyarrow",
                            "pip install 'claimcheck[parquet]', or write .csv, .npy or .npz") from None
        table = pa.table({"circuit": data.circuit, "probability": data.probability, "heavy": data.heavy})
        pq.write_table(table, buffer)
    else:
        raise ValueError(f"unknown format {fmt!r}")
    return buffer.getvalue()


def _csv(data: Dataset) -> bytes:
    # repr() is the shortest text that reads back as the same float64.
    lines = ["circuit,probability,heavy"]
    circuit = data.circuit.tolist()
    probability = data.probability.tolist()
    heavy = data.heavy.tolist()
    lines.extend(f"c{c},{p!r},{h}" for c, p, h in zip(circuit, probability, heavy))
    return ("\n".join(lines) + "\n").encode("ascii")
