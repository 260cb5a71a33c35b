"""``claimcheck raw`` through the real command line (checker.cli.run)."""

import io
import json
import shutil
from pathlib import Path

import numpy as np
import pytest

from checker.cli import run
from checker.raw.simulate_circuits import simulate_dataset

EXAMPLES = Path(__file__).resolve().parents[2] / "claims_examples"


def _run(*argv):
    out, err = io.StringIO(), io.StringIO()
    status = run(list(argv), out, err)
    return status, out.getvalue(), err.getvalue()


@pytest.fixture(scope="module")
def data(tmp_path_factory):
    folder = tmp_path_factory.mktemp("rawcmd")
    sim = simulate_dataset(10, 6, 400, 0.5, np.random.default_rng(4))
    path = folder / "sim.npz"
    np.savez(path, probability=sim.probability, circuit=sim.circuit, heavy=sim.heavy)
    return folder, str(path)


def _claim(folder, name, text):
    path = folder / name
    path.write_text(text)
    return str(path)


def test_text_output(data):
    _, path = data
    status, out, err = _run("raw", path, "--metric", "linear-xeb", "--qubits", "10", "--bootstrap", "200")
    assert status == 0 and err == ""
    assert "2,400 samples, 6 circuit(s), 10 qubits" in out and "Bootstrap (200 replicates" in out


def test_json_output_follows_the_contract(data):
    _, path = data
    status, out, _ = _run("raw", path, "--metric", "heavy-output", "--qubits", "10", "--bootstrap", "100",
                          "--json", "--seed", "3")
    d = json.loads(out)
    assert status == 0
    assert {"metric", "qubits", "rows", "combined", "circuits", "goodness_of_fit", "bootstrap"} <= set(d)
    assert d["metric"] == "heavy-output" and d["bootstrap"]["seed"] == 3 and "findings" not in d


def test_the_invented_example_agrees_with_its_claim(tmp_path):
    # The committed example: simulated data and an invented claim written to match.
    status, out, _ = _run("raw", str(EXAMPLES / "simulated_raw_lattice.csv"), "--claim",
                          str(EXAMPLES / "simulated_raw_lattice.yaml"), "--bootstrap", "200", "--json")
    d = json.loads(out)
    assert status == 0 and d["verdict"] == "consistent"
    checks = {f["check"] for f in d["findings"]}
    assert {"raw-estimate", "raw-error", "raw-samples", "raw-circuits", "raw-model", "significance"} <= checks
    assert any(f["details"].get("numbers") == "raw" for f in d["findings"])


def test_a_claim_the_data_contradict_exits_1(data):
    folder, path = data
    claim = _claim(folder, "off.yaml", "title: Invented claim, far off its simulated data\nmetric: linear-xeb\n"
                   "qubits: 10\nestimate: 0.80\nstat_error: 0.02\nsamples: 2400\ncircuits: 6\n")
    status, out, err = _run("raw", path, "--claim", claim, "--bootstrap", "50")
    assert status == 1 and err == ""
    assert "FLAG  raw-estimate" in out and "verdict: inconsistent" in out


def test_claim_and_options_must_agree(data):
    folder, path = data
    claim = _claim(folder, "ok.yaml", "title: Invented\nmetric: linear-xeb\nqubits: 10\nestimate: 0.5\n")
    status, _, err = _run("raw", path, "--claim", claim, "--metric", "log-xeb")
    assert status == 2 and "the claim's metric is linear-xeb but --metric says log-xeb" in err
    proportion = _claim(folder, "prop.yaml", "title: Invented\nmetric: proportion\nestimate: 0.5\n")
    status, _, err = _run("raw", path, "--claim", proportion)
    assert status == 2 and "has no raw-data estimator" in err
    status, _, err = _run("raw", path, "--metric", "linear-xeb")
    assert status == 2 and "give --qubits N" in err


@pytest.mark.parametrize("name, text, expected", [
    ("columns.csv", "circuit,prob\nc1,0.1\n", "has no 'probability' column"),
    ("range.csv", "probability\n0.2\n1.2\n", "probability (line 3): probability is 1.2, outside [0, 1]"),
    ("nan.csv", "probability\nNaN\n", "probability (line 2): probability is missing or NaN"),
    ("empty.csv", "", "is empty"),
])
def test_bad_files_exit_2_with_one_line(data, name, text, expected):
    folder, _ = data
    path = folder / name
    path.write_text(text)
    status, out, err = _run("raw", str(path), "--metric", "linear-xeb", "--qubits", "4")
    assert status == 2 and out == ""
    assert err.count("\n") == 1 and err.startswith(str(path)) and expected in err
    assert "Traceback" not in err


def test_truncated_npy_exits_2(data):
    folder, _ = data
    full = folder / "full.npy"
    np.save(full, np.full(100, 0.01))
    cut = folder / "cut.npy"
    cut.write_bytes(full.read_bytes()[:-7])
    status, _, err = _run("raw", str(cut), "--metric", "linear-xeb", "--qubits", "4")
    assert status == 2 and "is truncated" in err and err.count("\n") == 1


@pytest.mark.parametrize("argv, words", [
    (["--bootstrap", "-1"], "bootstrap must be at least 0"),
    (["--level", "1.5"], "level must lie between 0 and 1"),
    (["--threshold", "nan"], "must be a finite number"),
    (["--qubits", "x"], "qubits must be a whole number"),
])
def test_bad_options_exit_2(data, argv, words):
    _, path = data
    status, _, err = _run("raw", path, "--metric", "linear-xeb", *(argv if "--qubits" in argv else
                                                                    argv + ["--qubits", "10"]))
    assert status == 2 and words in err


def test_estimate_only(data):
    _, path = data
    status, out, _ = _run("raw", path, "--metric", "linear-xeb", "--qubits", "10", "--estimate-only", "--json")
    d = json.loads(out)
    assert status == 0 and d["bootstrap"] is None and d["goodness_of_fit"] == []


def test_input_files_are_not_modified(data, tmp_path):
    _, path = data
    copy = tmp_path / "copy.npz"
    shutil.copy(path, copy)
    before = copy.read_bytes()
    _run("raw", str(copy), "--metric", "linear-xeb", "--qubits", "10", "--bootstrap", "10")
    assert copy.read_bytes() == before


def test_also_test_at_names_what_the_value_does_and_the_old_name_still_works(data):
    _, path = data
    results = []
    for option, value in (("--also-test-at", "0.3"), ("--threshold", "0.3"), ("--also-test-at", "30%")):
        status, out, err = _run("raw", path, "--metric", "linear-xeb", "--qubits", "10", "--bootstrap", "0",
                              option, value, "--json")
        fits = {g["at"]: g["fidelity"] for g in json.loads(out)["goodness_of_fit"]}
        assert status == 0 and fits["threshold"] == pytest.approx(0.3)
        # The old name is a deprecated alias: one line on stderr, and none for the new name.
        if option == "--threshold":
            assert err.count("\n") == 1 and "--threshold is deprecated; use --also-test-at" in err
        else:
            assert err == ""
        results.append(out)
    assert results[0] == results[1] == results[2]
    status, out, _ = _run("raw", "--help")
    assert "--also-test-at F" in out and "--threshold" not in out
