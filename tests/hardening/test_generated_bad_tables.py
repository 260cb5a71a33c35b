"""Generated bad tables and data files through the real command line.

``batch``, ``raw``, ``drift`` and ``plan`` are fed inputs that cannot be used.  Whatever
is wrong, claimcheck must exit 2 with exactly one line on stderr that starts with the
file's name (and names the column or row where there is one), print no traceback,
write nothing to stdout and create no report.  ``batch`` is the one command that goes
on past a bad row: there every bad row gets one stderr line with its row number and
the good rows are still checked.

The tables here are invented; no value in them comes from a real device.
"""

from __future__ import annotations

import datetime
import io
import json

import numpy as np
import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from checker.claim.validate import SCHEMA_PATH
from checker.cli import run
from checker.survey import table as survey_table

# Per example: generous for a loaded machine, finite so that a slow path shows (tests/conftest.py).
DEADLINE = datetime.timedelta(seconds=20)

SETTINGS = dict(deadline=DEADLINE, suppress_health_check=[HealthCheck.too_slow, HealthCheck.data_too_large,
                                                       HealthCheck.function_scoped_fixture])
RAW_OPTIONS = ["--metric", "linear-xeb", "--qubits", "12", "--bootstrap", "0", "--fit-sample", "50"]

# A claim row that batch checks as consistent (invented numbers): (0.021 - 0) / 0.0015 = 14 sigma.
GOOD_HEADER = "title,metric,qubits,estimate,stat_error,samples,threshold,significance.sigma"
GOOD_ROW = "Invented lattice run,linear-xeb,20,2.10e-2,0.15e-2,5.0e5,0,14"

# Every way of writing a value that is not a usable finite number.
NOT_FINITE = ["nan", "NaN", "NAN", "-nan", "inf", "-inf", "+inf", "Inf", "Infinity", "-Infinity",
              "1e999", "-1e999", "NA", "N/A", "null", "None", "#N/A", "n/a", ""]
NOT_NUMBER = ["abc", "1.2.3", "0x1p-3", "1,5", "--1", "1e", "e5", "½", "0.1.", "true", "[0.1]", " "]


def run_cli(argv):
    out, err = io.StringIO(), io.StringIO()
    status = run([str(a) for a in argv], out, err)
    return status, out.getvalue(), err.getvalue()


def assert_one_line(status, out, err, name, *words):
    """Exit 2, nothing on stdout, one stderr line starting with ``name``, naming ``words``."""
    assert status == 2, (status, err, out[:300])
    assert out == "", out[:300]
    assert err.count("\n") == 1 and err.endswith("\n"), err
    assert err.startswith(str(name)), err
    assert "Traceback" not in err
    for word in words:
        assert str(word) in err, (word, err)


def text_bytes(text: str, encoding: str) -> bytes:
    return text.encode(encoding)


# --- batch: the whole table unusable -----------------------------------------

SCHEMA = json.loads(SCHEMA_PATH.read_text(encoding="utf-8"))
VOCABULARY_ROOTS = set(SCHEMA["properties"])
SIGNIFICANCE_FIELDS = set(SCHEMA["properties"]["significance"].get("properties", {}))
unknown_column = st.text(alphabet="abcdefghijklmnopqrstuvwxyz_", min_size=1, max_size=12).filter(
    lambda c: c not in VOCABULARY_ROOTS and not c.startswith("_"))
unknown_significance_field = st.text(alphabet="abcdefghijklmnopqrstuvwxyz_", min_size=1, max_size=12).filter(
    lambda c: c not in SIGNIFICANCE_FIELDS)


def whole_table_cases():
    """(suffix, bytes, words the message must hold); each case makes the whole table unusable."""
    return st.one_of(
        # A column outside the claim vocabulary.
        unknown_column.map(lambda c: (".csv", f"{GOOD_HEADER},{c}\n{GOOD_ROW},1\n".encode(), [repr(c)])),
        # A nested column under a field that has no such part.
        unknown_significance_field.map(lambda c: (".csv", f"{GOOD_HEADER},significance.{c}\n{GOOD_ROW},1\n".encode(),
                                      [c])),
        # A header cell with no name.
        st.integers(min_value=0, max_value=7).map(
            lambda i: (".csv", (",".join(GOOD_HEADER.split(",")[:i] + [""] + GOOD_HEADER.split(",")[i:])
                                + "\n" + GOOD_ROW + ",x\n").encode(), [f"column {i + 1}"])),
        # The same column twice.
        st.sampled_from(GOOD_HEADER.split(",")).map(
            lambda c: (".csv", f"{GOOD_HEADER},{c}\n{GOOD_ROW},1\n".encode(), [repr(c)])),
        # Binary junk (always with a NUL byte) and junk without NULs that is not UTF-8.
        st.binary(min_size=0, max_size=300).map(lambda b: (".csv", b[:5] + b"\x00" + b, ["binary"])),
        st.binary(min_size=1, max_size=300).map(lambda b: (".csv", b"\xff" + b.replace(b"\x00", b""), ["UTF-8"])),
        # Wrong encodings of an otherwise good table.
        st.sampled_from(["utf-16", "utf-16-le", "utf-32"]).map(
            lambda e: (".csv", text_bytes(GOOD_HEADER + "\n" + GOOD_ROW + "\n", e), ["binary"])),
        st.text(alphabet="éüßñøå", min_size=1, max_size=10).map(
            lambda t: (".csv", f"{GOOD_HEADER}\n{t}{GOOD_ROW}\n".encode("latin-1"), ["UTF-8"])),
        # Empty, blank, only comments, header only.
        st.sampled_from([b"", b"\n", b"   \n\n", b"# invented\n", b"# a\n\n# b\n"]).map(
            lambda b: (".csv", b, ["no header"])),
        st.sampled_from(["", "\n", "\n\n  \n", ",,,\n"]).map(
            lambda tail: (".csv", (GOOD_HEADER + "\n" + tail).encode(), ["no claims"])),
        # An unclosed quote.
        st.integers(min_value=0, max_value=40).map(
            lambda n: (".csv", (GOOD_HEADER + "\n" + GOOD_ROW + "\n" * (n + 1) + '"unclosed,linear-xeb\n').encode(),
                       ["well-formed"])),
        # Semicolons where commas belong.
        st.just((".csv", (GOOD_HEADER.replace(",", ";") + "\n" + GOOD_ROW.replace(",", ";") + "\n").encode(),
                 ["';'"])),
        # Not a table at all: wrong extension, or Parquet that is junk.
        st.sampled_from([".txt", ".xlsx", "", ".yaml.bak", ".CSVX"]).map(
            lambda s: (s, (GOOD_HEADER + "\n" + GOOD_ROW + "\n").encode(), ["extension"])),
        st.binary(min_size=0, max_size=200).map(lambda b: (".parquet", b, ["Parquet"])),
    )


@settings(max_examples=300, **SETTINGS)
@given(case=whole_table_cases(), out_suffix=st.sampled_from([".csv", ".json", ".html"]))
def test_batch_whole_table_unusable(tmp_path_factory, case, out_suffix):
    suffix, payload, words = case
    folder = tmp_path_factory.mktemp("batch")
    table = folder / f"survey{suffix}"
    table.write_bytes(payload)
    out = folder / f"summary{out_suffix}"
    status, stdout, stderr = run_cli(["batch", table, "--out", out])
    assert_one_line(status, stdout, stderr, table, *words)
    assert not out.exists()
    assert sorted(p.name for p in folder.iterdir()) == [table.name]  # no temporary file either
    assert table.read_bytes() == payload


@settings(max_examples=40, **SETTINGS)
@given(names=st.lists(st.sampled_from(["notes.txt", "data.csv", "README", "claim.yaml.bak", ".hidden", "x.md"]),
                      unique=True, max_size=4), subfolder=st.booleans())
def test_batch_folder_without_claims(tmp_path_factory, names, subfolder):
    folder = tmp_path_factory.mktemp("claims")
    for name in names:
        (folder / name).write_text("title: invented\n")
    if subfolder:
        (folder / "inner.yaml").mkdir()  # a folder named like a claim file is not one
    out = tmp_path_factory.mktemp("out") / "summary.json"
    status, stdout, stderr = run_cli(["batch", folder, "--out", out])
    assert_one_line(status, stdout, stderr, folder, "no claim files")
    assert not out.exists()


def test_batch_table_over_the_size_limit(tmp_path, monkeypatch):
    # The real limit is 2 GB; a smaller one exercises the same branch without writing 2 GB.
    monkeypatch.setattr(survey_table, "MAX_TABLE_BYTES", 1000)
    table = tmp_path / "survey.csv"
    table.write_text(GOOD_HEADER + "\n" + (GOOD_ROW + "\n") * 30)
    out = tmp_path / "summary.csv"
    status, stdout, stderr = run_cli(["batch", table, "--out", out])
    assert_one_line(status, stdout, stderr, table, "larger than 1,000 bytes")
    assert not out.exists()


# --- batch: bad rows are reported and the rest are checked -----------------------

BATCH_NOT_NUMBER = [t for t in NOT_NUMBER if t.strip()]  # a blank cell is a field left out
BAD_CELLS = {  # column index in GOOD_HEADER -> values that make the row unusable
    3: NOT_FINITE[:-1] + BATCH_NOT_NUMBER,  # estimate ("" would be a missing required field: also bad)
    4: NOT_FINITE[:10] + BATCH_NOT_NUMBER,  # (a negative error is a finding, not unusable)  # stat_error
    5: ["-5", "0", "2.5", "many", "1,000", "-1e6", "nan", "inf"],  # samples
    2: ["-1", "0", "2.5", "twenty", "nan"],  # qubits
    1: ["linear_xeb", "XEB", "fidelity", "1", "LINEAR-XEB"],  # metric
}


def bad_row():
    return st.one_of(
        st.sampled_from(sorted(BAD_CELLS)).flatmap(
            lambda i: st.sampled_from(BAD_CELLS[i]).map(lambda v, i=i: ("cell", i, v))),
        st.integers(min_value=1, max_value=3).map(lambda k: ("short", k, "")),
        st.integers(min_value=1, max_value=3).map(lambda k: ("long", k, "")),
    )


def render_bad_row(kind, index, value) -> str:
    cells = GOOD_ROW.split(",")
    if kind == "cell":
        cells[index] = f'"{value}"' if "," in value else value
    elif kind == "short":
        cells = cells[:-index]
    else:
        cells = cells + ["1"] * index
    return ",".join(cells)


@settings(max_examples=120, **SETTINGS)
@given(layout=st.lists(st.one_of(st.just(None), bad_row()), min_size=1, max_size=6).filter(
    lambda rows: any(r is not None for r in rows)))
def test_batch_reports_each_bad_row_and_goes_on(tmp_path_factory, layout):
    folder = tmp_path_factory.mktemp("rows")
    table = folder / "survey.csv"
    lines = [GOOD_HEADER] + [GOOD_ROW if r is None else render_bad_row(*r) for r in layout]
    table.write_text("\n".join(lines) + "\n")
    out = folder / "summary.json"
    status, stdout, stderr = run_cli(["batch", table, "--out", out])
    bad_numbers = [i + 1 for i, r in enumerate(layout) if r is not None]
    good = len(layout) - len(bad_numbers)
    assert status == 2, (status, stderr)  # no claim failed a check, some rows could not be used
    assert "Traceback" not in stderr and "internal error" not in stderr, stderr
    err_lines = stderr.splitlines()
    assert len(err_lines) == len(bad_numbers), stderr
    for number, line in zip(bad_numbers, err_lines):
        assert line.startswith(f"{table} row {number}"), (line, layout)
        assert f"(line {number + 1})" in line, line  # row N sits on line N + 1, below the header
    # The batch went on: every row is in the table written, the good ones checked.
    written = json.loads(out.read_text())
    rows = written["claims"]
    assert [r["source"] for r in rows] == [f"row {i + 1}" for i in range(len(layout))]
    assert len(rows) == len(layout)
    verdicts = [r["verdict"] for r in rows]
    assert verdicts.count("unusable") == len(bad_numbers)
    assert verdicts.count("consistent") == good
    assert f"{good} claim" in stdout, stdout


# --- raw ---------------------------------------------------------------------------

def npy_bytes(array) -> bytes:
    buffer = io.BytesIO()
    np.save(buffer, array, allow_pickle=True)
    return buffer.getvalue()


def npz_bytes(compressed=False, **arrays) -> bytes:
    buffer = io.BytesIO()
    (np.savez_compressed if compressed else np.savez)(buffer, **arrays)
    return buffer.getvalue()


probabilities = st.lists(st.floats(min_value=0.0, max_value=1.0), min_size=1, max_size=30)
outside = st.one_of(st.floats(min_value=1.0, exclude_min=True, allow_infinity=False, allow_nan=False),
                    st.floats(max_value=0.0, exclude_max=True, allow_infinity=False, allow_nan=False)
                    .filter(lambda x: x != 0.0))
non_finite_float = st.sampled_from([np.nan, np.inf, -np.inf, -np.nan])


def csv_cases():
    """(bytes, words) for a .csv raw data file that cannot be used."""
    def with_bad(ps, i, text, extra=""):
        i = i % (len(ps) + 1)
        cells = [repr(p) for p in ps]
        cells.insert(i, text)
        return ("probability\n" + "\n".join(cells) + "\n").encode(), ["probability", f"(line {i + 2})"]

    return st.one_of(
        st.tuples(probabilities, st.integers(0, 40), outside).map(lambda c: with_bad(c[0], c[1], repr(c[2]))),
        st.tuples(probabilities, st.integers(0, 40), st.sampled_from(NOT_FINITE)).map(
            lambda c: with_bad(c[0], c[1], c[2])),
        st.tuples(probabilities, st.integers(0, 40), st.sampled_from([t for t in NOT_NUMBER if t.strip()])).map(
            lambda c: with_bad(c[0], c[1], f'"{c[2]}"' if "," in c[2] else c[2])),
        # No probability column.
        st.lists(unknown_column.filter(lambda c: c not in ("circuit", "heavy", "probability")), min_size=1,
                 max_size=4, unique=True).map(
            lambda cols: ((",".join(cols) + "\n" + ",".join("0.1" for _ in cols) + "\n").encode(),
                          ["no 'probability' column"])),
        # heavy not 0/1.
        st.tuples(probabilities, st.sampled_from(["2", "-1", "0.5", "nan", "yes", "1e9"])).map(
            lambda c: (("probability,heavy\n" + "".join(f"{p!r},0\n" for p in c[0]) + f"0.1,{c[1]}\n").encode(),
                       ["heavy", f"(line {len(c[0]) + 2})"])),
        # Empty, header only, numbers for a header, a column twice.
        st.sampled_from([b"", b"\n", b"\n\n\n"]).map(lambda b: (b, ["empty"])),
        st.sampled_from(["probability\n", "circuit,probability,heavy\n", "probability\n\n"]).map(
            lambda t: (t.encode(), ["no rows"] if t.count("\n") == 1 else ["probability"])),
        probabilities.map(lambda ps: (("\n".join(repr(p) for p in ps) + "\n").encode(), ["numbers"])),
        st.just((b"probability,probability\n0.1,0.2\n", ["twice"])),
        # Binary junk and wrong encodings.
        st.binary(min_size=1, max_size=200).map(lambda b: (b"\xff\xfe" + b, [])),
        st.sampled_from(["utf-16", "utf-32"]).map(lambda e: ("probability\n0.1\n".encode(e), ["UTF-8"])),
        st.text(alphabet="éüß", min_size=1, max_size=5).map(
            lambda t: (f"probability,{t}\n0.1,1\n".encode("latin-1"), ["UTF-8"])),
        # An unclosed quote.
        probabilities.map(lambda ps: (("probability\n" + "".join(f"{p!r}\n" for p in ps) + '"0.1\n').encode(), [])),
    )


def npy_cases():
    def bad_at(ps, i, value):
        arr = np.array(ps, dtype=float)
        i = i % (len(ps) + 1)
        arr = np.insert(arr, i, value)
        return npy_bytes(arr), ["probability", f"row {i + 1}"]

    good = npy_bytes(np.full(64, 0.1))
    return st.one_of(
        st.tuples(probabilities, st.integers(0, 40), outside).map(lambda c: bad_at(*c)),
        st.tuples(probabilities, st.integers(0, 40), non_finite_float).map(lambda c: bad_at(*c)),
        st.sampled_from([np.int64, np.int8, np.uint16, np.complex128, np.bool_, "U3", "S2", object,
                         [("p", "f8")], "datetime64[s]"]).map(
            lambda dt: (npy_bytes(np.zeros(4, dtype=dt)), ["probability"])),
        st.sampled_from([(3, 2), (2, 2, 1), (), (1, 5)]).map(
            lambda shape: (npy_bytes(np.full(shape, 0.1)), ["shape"])),
        st.integers(min_value=1, max_value=len(good) - 1).map(lambda k: (good[:k], [])),  # truncated
        st.binary(min_size=0, max_size=200).map(lambda b: (b, [])),
        st.binary(min_size=0, max_size=100).map(lambda b: (b"\x93NUMPY" + b, [])),
        st.just((npy_bytes(np.zeros(0)), ["no rows"])),
        st.sampled_from([np.float16, np.float32, ">f8"]).map(
            lambda dt: (npy_bytes(np.array([0.5, 1.5], dtype=dt)), ["row 2", "outside"])),
    )


def npz_cases():
    good = npz_bytes(compressed=True, probability=np.full(2000, 0.1), heavy=np.ones(2000))
    return st.one_of(
        st.lists(unknown_column, min_size=0, max_size=3, unique=True).filter(
            lambda ks: "probability" not in ks).map(
            lambda ks: (npz_bytes(**{k: np.full(3, 0.1) for k in ks}), ["no 'probability' array"])),
        st.tuples(st.integers(1, 20), st.integers(1, 20)).filter(lambda c: c[0] != c[1]).map(
            lambda c: (npz_bytes(probability=np.full(c[0], 0.1), heavy=np.ones(c[1])), ["heavy", "rows"])),
        st.tuples(probabilities, non_finite_float).map(
            lambda c: (npz_bytes(probability=np.append(c[0], c[1])), ["probability", f"row {len(c[0]) + 1}"])),
        st.tuples(probabilities, st.sampled_from([2, -1, 3, 7])).map(
            lambda c: (npz_bytes(probability=np.array(c[0]), heavy=np.append(np.zeros(len(c[0]) - 1), c[1])),
                       ["heavy", f"row {len(c[0])}"])),
        st.just((npz_bytes(probability=np.full(2, 0.1), circuit=np.array([1, None], dtype=object)),
                 ["circuit"])),
        st.just((npz_bytes(probability=np.full(2, 0.1), heavy=np.array(["a", "b"])), ["heavy"])),
        st.integers(min_value=1, max_value=len(good) - 1).map(lambda k: (good[:k], [])),  # truncated
        st.binary(min_size=0, max_size=200).map(lambda b: (b"PK\x03\x04" + b, [])),
    )


def raw_cases():
    return st.one_of(csv_cases().map(lambda c: (".csv",) + c), npy_cases().map(lambda c: (".npy",) + c),
                     npz_cases().map(lambda c: (".npz",) + c))


@settings(max_examples=300, **SETTINGS)
@given(case=raw_cases(), as_json=st.booleans())
def test_raw_bad_data_exit_2_with_one_line(tmp_path_factory, case, as_json):
    suffix, payload, words = case
    folder = tmp_path_factory.mktemp("raw")
    data = folder / f"samples{suffix}"
    data.write_bytes(payload)
    status, stdout, stderr = run_cli(["raw", data, *RAW_OPTIONS] + (["--json"] if as_json else []))
    assert_one_line(status, stdout, stderr, data, *words)
    assert data.read_bytes() == payload
    assert sorted(p.name for p in folder.iterdir()) == [data.name]


@pytest.mark.parametrize("suffix", [".csv", ".npy"])
def test_raw_negative_zero_is_a_probability(tmp_path, suffix):
    # -0.0 equals 0 (IEEE 754) and is a valid probability; it once broke the value bins.
    data = tmp_path / f"zeros{suffix}"
    values = np.array([-0.0, 0.1, 0.0, 2e-4])
    if suffix == ".csv":
        data.write_text("probability\n" + "\n".join(repr(float(v)) for v in values) + "\n")
    else:
        data.write_bytes(npy_bytes(values))
    status, stdout, stderr = run_cli(["raw", data, *RAW_OPTIONS, "--json"])
    assert status == 0, stderr
    assert json.loads(stdout)


# --- drift -------------------------------------------------------------------------

def series_text(times, estimates, errors=None):
    header = "time,estimate" + (",error" if errors is not None else "")
    rows = [f"{t},{e}" + (f",{s}" if errors is not None else "")
            for t, e, s in zip(times, estimates, errors if errors is not None else times)]
    return "".join(line + "\n" for line in [header] + rows)


finite = st.floats(min_value=-1e3, max_value=1e3, allow_nan=False)


def drift_cases():
    def bad_at(column, n, i, text):
        times = [str(k) for k in range(n)]
        estimates = ["0.5"] * n
        errors = ["0.01"] * n
        target = {"time": times, "estimate": estimates, "error": errors}[column]
        i = i % n
        target[i] = text
        return series_text(times, estimates, errors).encode(), [column, f"(line {i + 2})"]

    return st.one_of(
        st.tuples(st.sampled_from(["time", "estimate", "error"]), st.integers(3, 20), st.integers(0, 30),
                  st.sampled_from([t for t in NOT_FINITE if t] + [t for t in NOT_NUMBER if t.strip() and "," not in t])).map(
            lambda c: bad_at(*c)),
        st.tuples(st.integers(3, 20), st.integers(0, 30), st.sampled_from(["0", "-0.01", "-1", "0.0"])).map(
            lambda c: bad_at("error", *c)),
        # Missing columns.
        st.lists(unknown_column.filter(lambda c: c not in ("time", "estimate", "error")), min_size=1, max_size=3,
                 unique=True).flatmap(lambda cols: st.sampled_from([cols, cols + ["time"], cols + ["estimate"]])).map(
            lambda cols: ((",".join(cols) + "\n" + ",".join("1" for _ in cols) + "\n").encode(), ["column"])),
        # Too few points, or all at one time.
        st.lists(finite, min_size=0, max_size=2).map(
            lambda es: (series_text(range(len(es)), es).encode(), ["no rows"] if not es else ["three"])),
        st.tuples(finite, st.lists(finite, min_size=3, max_size=10)).map(
            lambda c: (series_text([c[0]] * len(c[1]), c[1]).encode(), ["same time"])),
        st.sampled_from([b"", b"\n\n"]).map(lambda b: (b, ["empty"])),
        st.sampled_from(["time,estimate,estimate", "time,time,estimate"]).map(
            lambda h: ((h + "\n1,2,3\n2,3,4\n3,4,5\n").encode(), ["twice"])),
        # Values whose fit overflows double precision.
        st.floats(min_value=1e200, max_value=1e308).map(
            lambda big: (series_text([0, 1, 2, 3], [big, -big, big, -big]).encode(), ["double precision"])),
        st.binary(min_size=1, max_size=200).map(lambda b: (b"\xff" + b, [])),
        st.sampled_from(["utf-16", "utf-32"]).map(lambda e: (series_text([1, 2, 3], [1, 2, 3]).encode(e), [])),
    )


@settings(max_examples=250, **SETTINGS)
@given(case=drift_cases(), as_json=st.booleans())
def test_drift_bad_series_exit_2_with_one_line(tmp_path_factory, case, as_json):
    payload, words = case
    folder = tmp_path_factory.mktemp("drift")
    series = folder / "series.csv"
    series.write_bytes(payload)
    status, stdout, stderr = run_cli(["drift", series] + (["--json"] if as_json else []))
    assert_one_line(status, stdout, stderr, series, *words)
    assert series.read_bytes() == payload


@settings(max_examples=30, **SETTINGS)
@given(window=st.sampled_from([("a", "b"), ("5", "1"), ("nan", "1"), ("0", "inf"), ("2026-01-01", "3")]))
def test_drift_bad_window(tmp_path_factory, window):
    series = tmp_path_factory.mktemp("drift") / "series.csv"
    series.write_text(series_text(range(6), [0.5, 0.51, 0.49, 0.5, 0.52, 0.5]))
    status, stdout, stderr = run_cli(["drift", series, "--window", *window])
    assert_one_line(status, stdout, stderr, series, "window")


# --- plan --------------------------------------------------------------------------

PLAN_BASE = {"--metric": "linear-xeb", "--fidelity": "0.002", "--threshold": "0", "--sigma": "5"}
PLAN_BAD = {
    "--fidelity": NOT_FINITE[:11] + NOT_NUMBER + ["5", "-2"],
    "--threshold": NOT_FINITE[:11] + NOT_NUMBER,
    "--sigma": NOT_FINITE[:11] + NOT_NUMBER + ["0", "-1"],
    "--power": NOT_FINITE[:11] + NOT_NUMBER + ["1", "0.4", "2", "-0.8"],
    "--syst": NOT_FINITE[:11] + NOT_NUMBER + ["-1"],
    "--samples": NOT_FINITE[:11] + NOT_NUMBER + ["0", "-5", "2.5", "1e400"],
    "--qubits": NOT_FINITE[:11] + NOT_NUMBER + ["0", "2.5"],
    "--metric": ["xeb", "LINEAR-XEB", "", "fidelity"],
    "--circuits": ["10"],  # linear-xeb counts samples
}


@settings(max_examples=200, **SETTINGS)
@given(option=st.sampled_from(sorted(PLAN_BAD)).flatmap(
    lambda o: st.sampled_from(PLAN_BAD[o]).map(lambda v, o=o: (o, v))), as_json=st.booleans())
def test_plan_bad_option_exit_2_with_one_line(option, as_json):
    name, value = option
    options = dict(PLAN_BASE, **{name: value})
    # "--opt=value", so that values such as "-inf" are not read as options.
    argv = ["plan"] + [f"{key}={text}" for key, text in options.items()]
    status, stdout, stderr = run_cli(argv + (["--json"] if as_json else []))
    assert_one_line(status, stdout, stderr, "claimcheck", name)


@pytest.mark.parametrize("extra", [["--syst", "1e300"], ["--fidelity", "1e-300"], ["--syst", "1e-300", "--fidelity", "1e-300"]])
def test_plan_values_beyond_double_precision(extra):
    argv = ["plan", "--metric", "linear-xeb", "--threshold", "0", "--sigma", "5", "--fidelity", "0.002"] + extra
    status, stdout, stderr = run_cli(argv)
    assert_one_line(status, stdout, stderr, "claimcheck plan", "double precision")
