"""``claimcheck simulate`` through the real command line."""

import io
import os

import numpy as np
import pytest

from checker.cli import run
from checker.raw.readers import open_table


def _run(*argv):
    out, err = io.StringIO(), io.StringIO()
    status = run(list(argv), out, err)
    return status, out.getvalue(), err.getvalue()


BASE = ["simulate", "--qubits", "6", "--circuits", "3", "--samples", "50", "--fidelity", "0.4"]


@pytest.mark.parametrize("ext", ["csv", "npy", "npz", "parquet"])
def test_writes_each_format(tmp_path, ext):
    target = tmp_path / f"sim.{ext}"
    status, out, err = _run(*BASE, "--out", str(target))
    assert status == 0 and "wrote 150 simulated samples" in out
    table = open_table(str(target))
    assert sum(len(c) for c in table.chunks()) == 150
    assert ("NPY keeps only the probability column" in err) == (ext == "npy")
    assert [p.name for p in tmp_path.iterdir()] == [target.name]  # no temporary file left


def test_same_seed_same_bytes(tmp_path):
    a, b, c = (tmp_path / n for n in ("a.csv", "b.csv", "c.csv"))
    _run(*BASE, "--out", str(a), "--seed", "9")
    _run(*BASE, "--out", str(b), "--seed", "9")
    _run(*BASE, "--out", str(c), "--seed", "10")
    assert a.read_bytes() == b.read_bytes() != c.read_bytes()


def test_circuit_model_and_depth(tmp_path):
    target = tmp_path / "c.npz"
    status, out, _ = _run("simulate", "--qubits", "5", "--circuits", "2", "--samples", "20", "--fidelity", "1",
                          "--model", "circuit", "--depth", "7", "--out", str(target))
    assert status == 0 and "circuit model, depth 7" in out
    with np.load(target) as z:
        assert z["probability"].size == 40 and set(np.unique(z["circuit"])) == {0, 1}


@pytest.mark.parametrize("extra, words", [
    (["--model", "circuit", "--qubits", "21"], "the circuit model takes at most 20 qubits"),
    (["--depth", "4"], "--depth applies to --model circuit only"),
    (["--samples", "20000000"], "simulate writes at most 10,000,000"),
    (["--fidelity", "1.2"], "fidelity must lie in [0, 1]"),
    (["--qubits", "61"], "the porter-thomas model takes at most 60 qubits"),
])
def test_refusals_exit_2(tmp_path, extra, words):
    argv = list(BASE)
    for i in range(0, len(extra), 2):
        if extra[i] in argv:
            argv[argv.index(extra[i]) + 1] = extra[i + 1]
        else:
            argv += extra[i:i + 2]
    target = tmp_path / "x.csv"
    status, out, err = _run(*argv, "--out", str(target))
    assert status == 2 and words in err and not target.exists()


def test_bad_output_paths_exit_2(tmp_path):
    status, _, err = _run(*BASE, "--out", str(tmp_path / "x.txt"))
    assert status == 2 and "write .csv, .npy, .npz or .parquet" in err
    status, _, err = _run(*BASE, "--out", str(tmp_path / "missing" / "x.csv"))
    assert status == 2 and "its folder does not exist" in err
    assert os.listdir(tmp_path) == []


def test_circuits_and_samples_have_defaults(tmp_path):
    target = tmp_path / "sim.csv"
    status, out, _ = _run("simulate", "--qubits", "6", "--fidelity", "40%", "--out", str(target))
    assert status == 0 and "wrote 10,000 simulated samples (10 circuits x 1000" in out
    assert "fidelity 0.4," in out


def test_the_defaults_are_in_the_help_and_the_readme():
    from pathlib import Path

    status, out, _ = _run("simulate", "--help")
    assert status == 0 and "--circuits K" in out and "(default 10)" in out
    assert "--samples N" in out and "(default 1,000)" in out
    readme = " ".join((Path(__file__).resolve().parents[2] / "README.md").read_text(encoding="utf-8").split())
    assert "`--circuits` defaults to 10 and `--samples` to 1,000 per circuit" in readme
