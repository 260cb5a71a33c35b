"""Hostile data files and sizes through the real command line, under the memory and
time limits of limited.py: NPY headers that lie, nested Parquet columns, truncated
compressed CSV, circuit ids long or looking like missing values, bootstrap and
simulation sizes far beyond reason, drift series with absurd or mixed times, and
tables beyond the batch limits.  Every cost is bounded by the input or refused in one
line beyond a stated limit (README, "Limits").  The data are invented.
"""

from __future__ import annotations

import bz2
import gzip
import io
import json
import lzma
import zipfile

import numpy as np
import pytest

from limited import ROOT, assert_answered, assert_refused, claimcheck, claimcheck_many

EXAMPLES = ROOT / "claims_examples"
RAW = ["--metric", "linear-xeb", "--qubits", "12", "--bootstrap", "0", "--fit-sample", "200"]


def csv_rows(n: int, circuits: int = 5, seed: int = 3) -> bytes:
    rng = np.random.default_rng(seed)
    p = rng.exponential(size=n) / 2 ** 12
    return ("circuit,probability\n" + "".join(f"c{i % circuits},{v:.6e}\n" for i, v in enumerate(p))).encode()


# --- NPY headers that lie -------------------------------------------------------------

def npy_with_header(header: str, body: bytes = b"\x00" * 64) -> bytes:
    head = header.encode("latin-1")
    pad = 64 - (10 + len(head) + 1) % 64
    head = head + b" " * pad + b"\n"
    return b"\x93NUMPY\x01\x00" + len(head).to_bytes(2, "little") + head + body


BAD_SHAPES = ["(-5,)", "(-1, 1)", "(3, -2)", "(-9223372036854775808,)", "(10**20,)", "(1e3,)",
              "(2, 3)", "(99999999999999999999,)", "(True,)", "('a',)", "(0.5,)"]


def test_npy_headers_with_impossible_shapes(tmp_path):
    cases = []
    for i, shape in enumerate(BAD_SHAPES):
        path = tmp_path / f"d{i}.npy"
        path.write_bytes(npy_with_header(f"{{'descr': '<f8', 'fortran_order': False, 'shape': {shape}, }}"))
        cases.append(["raw", path, *RAW])
        npz = tmp_path / f"d{i}.npz"
        with zipfile.ZipFile(npz, "w") as archive:
            archive.writestr("probability.npy", path.read_bytes())
        cases.append(["raw", npz, *RAW])
    wide = tmp_path / "wide.npz"  # circuit ids of 5,000 characters each, fixed width
    np.savez(wide, probability=np.full(10, 1 / 4096), circuit=np.array(["x" * 5000] * 10))
    cases.append(["raw", wide, *RAW])
    outcomes = claimcheck_many(cases)
    for outcome in outcomes:
        assert_refused(outcome, outcome.argv[1])
    assert "characters wide" in outcomes[-1].err


# --- Parquet columns that are not one value per row -------------------------------------

def test_nested_parquet_circuit_and_probability_columns(tmp_path):
    pa = pytest.importorskip("pyarrow")
    import pyarrow.parquet as pq

    nested = {
        "list": pa.array([[1], [2], [3]]), "large_list": pa.array([[1], [2], [3]], type=pa.large_list(pa.int64())),
        "struct": pa.array([{"a": 1}, {"a": 2}, {"a": 3}]),
        "map": pa.array([[("a", 1)], [("b", 2)], [("c", 3)]], type=pa.map_(pa.string(), pa.int64())),
        "binary": pa.array([b"a", b"b", b"c"]), "float": pa.array([0.5, 1.5, 2.5]),
        "timestamp": pa.array([1, 2, 3], type=pa.timestamp("s")),
    }
    cases = []
    for name, column in nested.items():
        for key in ("circuit", "probability", "heavy"):
            table = {"circuit": pa.array(["a", "b", "c"]), "probability": pa.array([0.1, 0.2, 0.3]),
                     "heavy": pa.array([0, 1, 0])}
            if key == "circuit" and name == "float":
                continue  # a float id column is refused too, tested below with the others
            if key != "circuit" and name == "float":
                continue  # floats are numbers
            table[key] = column
            path = tmp_path / f"{name}-{key}.parquet"
            pq.write_table(pa.table(table), path)
            cases.append(["raw", path, *RAW])
    path = tmp_path / "float-circuit.parquet"
    pq.write_table(pa.table({"circuit": nested["float"], "probability": pa.array([0.1, 0.2, 0.3])}), path)
    cases.append(["raw", path, *RAW])
    for outcome in claimcheck_many(cases):
        assert_refused(outcome, outcome.argv[1], "column holds")


# --- truncated and damaged compressed CSV ----------------------------------------------

COMPRESSORS = {".gz": gzip.compress, ".bz2": bz2.compress, ".xz": lzma.compress}


def test_truncated_compressed_csv(tmp_path):
    payload = csv_rows(20_000)
    cases = []
    for suffix, compress in COMPRESSORS.items():
        packed = compress(payload)
        for cut in (1, 5, 12, len(packed) // 3, len(packed) // 2, len(packed) - 3):
            path = tmp_path / f"cut{cut}.csv{suffix}"
            path.write_bytes(packed[:cut])
            cases.append(["raw", path, *RAW])
        flipped = bytearray(packed)
        flipped[len(flipped) // 2] ^= 0xFF
        path = tmp_path / f"flipped.csv{suffix}"
        path.write_bytes(bytes(flipped))
        cases.append(["raw", path, *RAW])
    for outcome in claimcheck_many(cases):
        assert_refused(outcome, outcome.argv[1])


def test_the_truncated_gz_reproduction(tmp_path):
    packed = gzip.compress(csv_rows(20_000))
    path = tmp_path / "data.csv.gz"
    path.write_bytes(packed[: len(packed) // 2])
    assert_refused(claimcheck("raw", path, *RAW), path, "truncated or damaged")


# --- circuit ids -------------------------------------------------------------------------

def test_ids_that_look_like_missing_values_are_ids(tmp_path):
    words = ["NA", "None", "nan", "NaN", "null", "N/A", "#N/A", "-nan", "<NA>", "NULL"]
    path = tmp_path / "ids.csv"
    path.write_text("circuit,probability\n" + "".join(f"{w},{(i % 5 + 1) / 4096}\n" for i, w in
                                                     enumerate(words * 20)))
    empty = tmp_path / "empty-id.csv"
    empty.write_text("circuit,probability\nc1,0.0001\n,0.0002\n")
    outcome, missing = claimcheck_many([["raw", path, *RAW, "--json"], ["raw", empty, *RAW]])
    assert_answered(outcome)
    assert [c["circuit"] for c in json.loads(outcome.stdout)["circuits"]] == words
    assert_refused(missing, empty, "(line 3)", "circuit id is missing")


def test_one_long_id_costs_its_length_once(tmp_path):
    # A 4 MB file with one id of 1,000 characters (the most raw takes) in every row: the
    # fixed-width string arrays of before asked for 97.7 GiB; under the 1 GiB limit it runs.
    from checker.raw.readers import MAX_ID_CHARS

    long_id = "L" * MAX_ID_CHARS
    path = tmp_path / "long.csv"
    rng = np.random.default_rng(5)
    with open(path, "w") as handle:
        handle.write("circuit,probability\n")
        for v in rng.exponential(size=4000) / 4096:
            handle.write(f"{long_id},{v:.6e}\nshort,{v:.6e}\n")
    longer = tmp_path / "longer.csv"
    longer.write_text(f"circuit,probability\nshort,0.0001\n{'L' * (MAX_ID_CHARS + 1)},0.0002\n")
    outcome, refused = claimcheck_many([["raw", path, *RAW, "--json"], ["raw", longer, *RAW]])
    assert_answered(outcome)
    assert {c["circuit"] for c in json.loads(outcome.stdout)["circuits"]} == {long_id, "short"}
    assert_refused(refused, longer, "(line 3)", "characters long")


def test_more_circuits_than_the_limit(tmp_path, monkeypatch):
    from checker.cli import run
    from checker.raw.readers import table

    monkeypatch.setattr(table, "MAX_CIRCUITS", 50)  # the real limit is 100,000; the same branch
    path = tmp_path / "many.csv"
    path.write_bytes(csv_rows(200, circuits=60))
    err = io.StringIO()
    assert run(["raw", str(path), *RAW], io.StringIO(), err) == 2
    assert "more than 50 distinct circuits" in err.getvalue() and err.getvalue().count("\n") == 1


# --- sizes beyond the limits: bootstrap, simulate ---------------------------------------

def test_sizes_beyond_the_limits_are_one_line(tmp_path):
    data = EXAMPLES / "simulated_raw_lattice.csv"
    out = tmp_path / "sim.csv"
    sim = ["simulate", "--qubits", "4", "--fidelity", "0.5", "--out", out]
    cases = {
        "bootstrap": (["raw", data, "--metric", "linear-xeb", "--qubits", "12", "--bootstrap", "1e12"], "bootstrap"),
        "bootstrap+1": (["raw", data, "--metric", "linear-xeb", "--qubits", "12", "--bootstrap", "1000001"],
                        "bootstrap"),
        "fit-sample": (["raw", data, "--metric", "linear-xeb", "--qubits", "12", "--fit-sample", "1e9"],
                       "fit-sample"),
        "circuits": (sim + ["--circuits", "1e7", "--samples", "1"], "circuits"),
        "rows": (sim + ["--circuits", "1000", "--samples", "1e5"], "rows"),
        "depth": (sim[:-2] + ["--model", "circuit", "--circuits", "1", "--samples", "1", "--depth", "1e8",
                              "--out", out], "depth"),
        "work": (sim[:-2] + ["--model", "circuit", "--qubits", "20", "--circuits", "500", "--samples", "1",
                             "--out", out], "amplitude updates"),
        "porter-thomas work": (sim[:-2] + ["--qubits", "20", "--circuits", "5000", "--samples", "1",
                                           "--out", out], "amplitude updates"),
    }
    outcomes = claimcheck_many([argv for argv, _ in cases.values()], seconds=10)
    for outcome, (name, (argv, word)) in zip(outcomes, cases.items()):
        assert outcome.status == 2 and outcome.err.count("\n") == 1 and word in outcome.err, (name, outcome.err)
        assert outcome.seconds < 5, (name, outcome.seconds)
    assert not out.exists()


def test_the_cluster_bootstrap_cost_does_not_grow_with_the_circuits(tmp_path):
    # Beyond checker.stats.bootstrap.DEFAULT_GROUPS circuits are grouped by value, so the cost per
    # replicate is bounded whatever the number of circuits (it was circuits x replicates).
    from checker.cli import run

    path = tmp_path / "d.csv"
    path.write_bytes(csv_rows(6000, circuits=3000))
    out = io.StringIO()
    status = run(["raw", str(path), "--metric", "linear-xeb", "--qubits", "12", "--bootstrap", "200", "--json"],
                 out, io.StringIO())
    assert status == 0 and '"resampling": "circuits, grouped"' in out.getvalue()


# --- drift series --------------------------------------------------------------------------

def test_drift_series_with_absurd_or_mixed_times(tmp_path):
    # The reproductions: 400-digit times were an OverflowError, mixed time zones a ValueError.
    series = {
        "digits": "time,estimate,error\n" + "".join(f"{'9' * 400}{i},0.5,0.01\n" for i in range(5)),
        "digits-estimate": "time,estimate,error\n" + "".join(f"{i},{'9' * 400},0.01\n" for i in range(5)),
        "mixed-offsets-and-none": "time,estimate\n2026-03-01T10:00+01:00,0.5\n2026-03-01T11:00,0.6\n"
                                  "2026-03-01T12:00Z,0.5\n",
        "none-then-offset": "time,estimate\n2026-03-01T10:00,0.5\n2026-03-01T11:00,0.6\n2026-03-01T12:00Z,0.5\n",
        "dates-and-numbers": "time,estimate\n2026-03-01,0.5\n7,0.6\n2026-03-03,0.5\n",
        "huge-finite": "time,estimate,error\n" + "".join(f"{i}e307,0.5,0.01\n" for i in range(1, 6)),
    }
    cases = []
    for name, text in series.items():
        path = tmp_path / f"{name}.csv"
        path.write_text(text)
        cases.append(["drift", path])
    # Different offsets name instants: 10:00+01:00, 11:00+02:00 and 10:00Z are 09:00, 09:00, 10:00 UTC.
    tz = tmp_path / "tz.csv"
    tz.write_text("time,estimate,error\n2026-03-01T10:00+01:00,0.50,0.01\n2026-03-01T11:00+02:00,0.52,0.01\n"
                  "2026-03-01T10:00Z,0.51,0.01\n2026-03-01T11:30Z,0.50,0.01\n")
    cases += [["drift", tz, "--json"], ["drift", tz, "--window", "2026-03-01T09:00", "x"],
              ["drift", tz, "--window", "2026-03-01T09:00Z", "2026-03-01T11:00+00:00"]]
    outcomes = claimcheck_many(cases)
    for outcome in outcomes[:len(series)]:
        assert_refused(outcome, outcome.argv[1])
        assert len(outcome.err) < 400, outcome.err  # a 400-digit value is quoted shortened
    assert_answered(outcomes[-3])
    assert_refused(outcomes[-2], tz, "window")
    assert_answered(outcomes[-1])


# --- batch limits -------------------------------------------------------------------------

def test_batch_tables_beyond_the_claim_limit(tmp_path, monkeypatch):
    from checker.cli import run
    from checker.survey import table

    monkeypatch.setattr(table, "MAX_CLAIMS", 10)  # the real limit is 1,000,000 claims
    path = tmp_path / "survey.csv"
    path.write_text("title,metric,estimate\n" + "".join(f"t{i},mean,{i}\n" for i in range(11)))
    out = tmp_path / "s.csv"
    err = io.StringIO()
    assert run(["batch", str(path), "--out", str(out)], io.StringIO(), err) == 2
    assert "more than 10 claims" in err.getvalue() and not out.exists()
