"""Chunked readers: every format gives the same rows; bad files raise one
documented error naming the row or the problem; memory stays flat."""

import sys
import tracemalloc
import zipfile

import numpy as np
import pandas as pd
import pytest

from checker.errors import ClaimcheckError, DataError, InputFileError
from checker.raw.readers import open_table

P = np.array([0.1, 0.25, 0.0, 1.0, 3e-9, 0.5, 0.125])
CIRCUIT = np.array([7, 7, 3, 3, 3, 9, 7])
HEAVY = np.array([1, 0, 0, 1, 0, 1, 1])


def _write(path, fmt, p=P, circuit=CIRCUIT, heavy=HEAVY):
    if fmt == "csv":
        rows = ["circuit,probability,heavy"] + [f"c{c},{float(v)!r},{h}" for c, v, h in zip(circuit, p, heavy)]
        path.write_text("\n".join(rows) + "\n")
    elif fmt == "npy":
        np.save(path, p)
    elif fmt == "npz":
        np.savez(path, probability=p, circuit=circuit, heavy=heavy)
    elif fmt == "parquet":
        pd.DataFrame({"circuit": circuit, "probability": p, "heavy": heavy}).to_parquet(path)
    return str(path)


def _read(path, chunk_rows=3):
    table = open_table(path, chunk_rows=chunk_rows)
    # Chunks may share a reused buffer: copy each before reading the next.
    chunks = [(c.probability.copy(), c.circuit, c.heavy) for c in table.chunks()]
    p = np.concatenate([c[0] for c in chunks])
    codes = np.concatenate([c[1] for c in chunks]) if table.has_circuit else None
    heavy = np.concatenate([c[2] for c in chunks]) if table.has_heavy else None
    return table, p, codes, heavy


@pytest.mark.parametrize("fmt", ["csv", "npy", "npz", "parquet"])
@pytest.mark.parametrize("chunk_rows", [1, 3, 1000])
def test_every_format_reads_the_same_rows(tmp_path, fmt, chunk_rows):
    path = _write(tmp_path / f"data.{fmt}", fmt)
    table, p, codes, heavy = _read(path, chunk_rows)
    assert np.array_equal(p, P)  # exact: CSV floats are written with repr()
    assert table.kind == fmt
    if fmt == "npy":
        assert codes is None and heavy is None and table.total_rows == 7
        return
    labels = ["c7", "c3", "c9"] if fmt == "csv" else [7, 3, 9]
    assert table.labels == labels  # in order of first appearance
    assert [table.labels[c] for c in codes] == [f"c{c}" if fmt == "csv" else c for c in CIRCUIT]
    assert np.array_equal(heavy, HEAVY)


def test_float32_and_big_endian_npy(tmp_path):
    for dtype in ("<f4", ">f8"):
        path = tmp_path / f"p{dtype[1:]}.npy"
        np.save(path, P.astype(dtype))
        _, p, _, _ = _read(str(path))
        assert np.allclose(p, P, rtol=1e-7)


def test_extra_columns_are_reported_not_read(tmp_path):
    path = tmp_path / "extra.csv"
    path.write_text("shot,probability,bitstring\n1,0.5,0101\n2,0.25,0011\n")
    table, p, _, _ = _read(str(path))
    assert table.ignored_columns == ("shot", "bitstring")
    assert p.tolist() == [0.5, 0.25]


def _one_line(exc):
    text = exc.one_line()
    assert "\n" not in text and "Traceback" not in text
    return text


BAD_CSV = {
    "wrong_columns.csv": ("circuit,prob\nc1,0.1\n", "has no 'probability' column"),
    "above_one.csv": ("probability\n0.1\n1.5\n", "(line 3): probability is 1.5, outside [0, 1]"),
    "negative.csv": ("probability\n-0.1\n", "(line 2): probability is -0.1, outside [0, 1]"),
    "nan.csv": ("probability\n0.1\nnan\n", "(line 3): probability is missing or NaN"),
    "infinite.csv": ("probability\ninf\n", "(line 2): probability is inf, not a finite number"),
    "empty.csv": ("", "is empty"),
    "header_only.csv": ("circuit,probability,heavy\n", "holds no rows"),
    "text.csv": ("probability\n0.1\nabc\n", "(line 3): probability 'abc' is not a number"),
    "short_row.csv": ("circuit,probability\nc1,0.1\nc2\n", "(line 3): probability is missing or NaN"),
    "long_row.csv": ("circuit,probability\nc1,0.1\nc2,0.2,9\n", "is not well-formed CSV"),
    "bad_heavy.csv": ("probability,heavy\n0.1,2\n", "(line 2): heavy is 2"),
    "no_circuit.csv": ("circuit,probability\nc1,0.1\n,0.2\n", "(line 3): the circuit id is missing"),
    "twice.csv": ("probability,probability\n0.1,0.2\n", "has the column 'probability' twice"),
    "no_header.csv": ("0.1,0.2\n0.3,0.4\n", "its first line holds numbers, not column names"),
    "blank_line.csv": ("probability\n0.1\n\n0.2\n", "(line 3): probability is missing or NaN"),
}


@pytest.mark.parametrize("name", sorted(BAD_CSV))
def test_bad_csv_files_raise_one_clear_line(tmp_path, name):
    text, expected = BAD_CSV[name]
    path = tmp_path / name
    path.write_text(text)
    with pytest.raises(DataError) as info:
        _read(str(path))
    line = _one_line(info.value)
    assert line.startswith(str(path))
    assert expected in line


def test_truncated_binary_files(tmp_path):
    npy = _write(tmp_path / "full.npy", "npy", p=np.full(1000, 0.001))
    raw = open(npy, "rb").read()
    cut = tmp_path / "cut.npy"
    cut.write_bytes(raw[:-20])
    with pytest.raises(DataError, match="truncated: its header promises 1,000 rows but only 997"):
        open_table(str(cut))
    npz = _write(tmp_path / "full.npz", "npz", p=np.full(1000, 0.001), circuit=np.zeros(1000, int),
                 heavy=np.zeros(1000, int))
    (tmp_path / "cut.npz").write_bytes(open(npz, "rb").read()[:3000])
    with pytest.raises(DataError, match="truncated or damaged"):
        _read(str(tmp_path / "cut.npz"))
    pq = _write(tmp_path / "full.parquet", "parquet", p=np.full(1000, 0.001), circuit=np.zeros(1000, int),
                heavy=np.zeros(1000, int))
    (tmp_path / "cut.parquet").write_bytes(open(pq, "rb").read()[:-100])
    with pytest.raises(DataError, match="not a readable Parquet file"):
        _read(str(tmp_path / "cut.parquet"))
    (tmp_path / "junk.npy").write_bytes(b"not an array at all")
    with pytest.raises(DataError, match="is not a readable NPY array"):
        open_table(str(tmp_path / "junk.npy"))


def test_npy_arrays_that_cannot_hold_probabilities(tmp_path):
    cases = {
        "ints.npy": (np.arange(5), "holds int64 values"),
        "objects.npy": (np.array([0.1, None], dtype=object), "Python objects"),
        "matrix.npy": (np.zeros((3, 2)), "has shape (3, 2)"),
        "records.npy": (np.zeros(3, dtype=[("probability", "f8")]), "records"),
    }
    for name, (array, expected) in cases.items():
        np.save(tmp_path / name, array, allow_pickle=True)
        with pytest.raises(DataError, match=expected.replace("(", r"\(").replace(")", r"\)")):
            open_table(str(tmp_path / name))
    np.save(tmp_path / "column.npy", P.reshape(-1, 1))
    assert np.array_equal(_read(str(tmp_path / "column.npy"))[1], P)
    np.save(tmp_path / "nan.npy", np.array([0.2, np.nan]))
    with pytest.raises(DataError, match="row 2: probability is NaN"):
        _read(str(tmp_path / "nan.npy"))


def test_npz_problems(tmp_path):
    np.savez(tmp_path / "noprob.npz", p=P)
    with pytest.raises(DataError, match="has no 'probability' array"):
        open_table(str(tmp_path / "noprob.npz"))
    np.savez(tmp_path / "lengths.npz", probability=P, circuit=CIRCUIT[:3])
    with pytest.raises(DataError, match="the circuit array has 3 rows but probability has 7"):
        open_table(str(tmp_path / "lengths.npz"))
    np.savez(tmp_path / "heavy.npz", probability=P, heavy=np.full(7, 0.5))
    with pytest.raises(DataError, match="row 1: heavy is 0.5"):
        _read(str(tmp_path / "heavy.npz"))
    np.savez(tmp_path / "strings.npz", probability=P, circuit=np.array(list("abcabca")))
    assert open_table(str(tmp_path / "strings.npz")).has_circuit
    table, _, codes, _ = _read(str(tmp_path / "strings.npz"))
    assert table.labels == ["a", "b", "c"]
    with zipfile.ZipFile(tmp_path / "empty.npz", "w"):
        pass
    with pytest.raises(DataError, match="has no 'probability' array"):
        open_table(str(tmp_path / "empty.npz"))


def test_parquet_null_and_missing_pyarrow(tmp_path, monkeypatch):
    path = tmp_path / "null.parquet"
    pd.DataFrame({"probability": [0.1, None, 0.3]}).to_parquet(path)
    with pytest.raises(DataError, match="row 2: probability is missing"):
        _read(str(path))
    monkeypatch.setitem(sys.modules, "pyarrow", None)
    monkeypatch.setitem(sys.modules, "pyarrow.parquet", None)
    with pytest.raises(DataError, match=r"needs the optional package pyarrow.*claimcheck\[parquet\]"):
        open_table(str(path))


def test_missing_or_unknown_files(tmp_path):
    with pytest.raises(InputFileError, match="no such file"):
        open_table(str(tmp_path / "absent.csv"))
    with pytest.raises(InputFileError, match="is a directory"):
        open_table(str(tmp_path))
    (tmp_path / "data.txt").write_text("probability\n0.1\n")
    with pytest.raises(InputFileError, match="raw data files end in .csv, .npy, .npz or .parquet"):
        open_table(str(tmp_path / "data.txt"))
    assert issubclass(DataError, ClaimcheckError)


def test_the_one_pass_range_check_keeps_its_edges(tmp_path):
    # 0.0, 1.0 and -0.0 are probabilities; the next float above 1 and the
    # smallest negative number are not.
    np.save(tmp_path / "edges.npy", np.array([0.0, 1.0, -0.0, 5e-324]))
    assert _read(str(tmp_path / "edges.npy"))[1].size == 4
    for bad, word in ((np.nextafter(1.0, 2.0), r"outside \[0, 1\]"), (-5e-324, r"outside \[0, 1\]"),
                      (np.inf, "not a finite number"), (-np.inf, "not a finite number")):
        np.save(tmp_path / "bad.npy", np.array([0.5, 0.25, bad]))
        with pytest.raises(DataError, match=f"row 3: probability is .*{word}"):
            _read(str(tmp_path / "bad.npy"))


def test_compressed_csv(tmp_path):
    path = tmp_path / "data.csv.gz"
    pd.DataFrame({"probability": P}).to_csv(path, index=False)
    assert np.array_equal(_read(str(path))[1], P)


def test_memory_stays_flat_whatever_the_file_size(tmp_path):
    # 4,000,000 rows (32 MB) read in 65,536-row chunks: the arrays the reader
    # allocates stay under 4 MB (tracemalloc sees numpy's allocations).
    path = tmp_path / "big.npy"
    np.save(path, np.full(4_000_000, 1e-6))
    tracemalloc.start()
    total = 0.0
    for chunk in open_table(str(path), chunk_rows=1 << 16).chunks():
        total += float(chunk.probability.sum())
    peak = tracemalloc.get_traced_memory()[1]
    tracemalloc.stop()
    assert total == pytest.approx(4.0)
    assert peak < 4 * 2 ** 20
