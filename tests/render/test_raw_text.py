"""Terminal text of ``raw`` and ``drift``: what a reader needs is there, and
a claim check rerun on the raw numbers is shown only when it says something
new."""

import numpy as np
import pytest

from checker.raw.analysis import analyse
from checker.raw.simulate_circuits import simulate_dataset
from checker.render.raw_text import visible_findings, render_drift_text, render_raw_text
from checker.report import Finding
from checker.stats.drift import drift_analysis


@pytest.fixture(scope="module")
def result(tmp_path_factory):
    path = tmp_path_factory.mktemp("text") / "sim.npz"
    data = simulate_dataset(8, 3, 200, 0.4, np.random.default_rng(3))
    np.savez(path, probability=data.probability, circuit=data.circuit, heavy=data.heavy)
    return analyse(str(path), "linear-xeb", 8, bootstrap=200, fit_sample=500)


def test_raw_text_sections(result):
    text = render_raw_text(result)
    for words in ("600 samples, 3 circuit(s), 8 qubits", "* linear XEB", "log XEB", "heavy output",
                  "Fidelity fitted: moment", "maximum-likelihood", "Goodness of fit of x = D p",
                  "Kolmogorov-Smirnov", "Cramer-von Mises", "Bootstrap (200 replicates, circuits resampled",
                  "Per circuit (linear XEB):"):
        assert words in text
    assert "Against the claim" not in text


def test_identical_reruns_are_folded():
    printed = [Finding("pass", "Sigma agrees.", check="significance"),
               Finding("fail", "Too small.", check="error-floor")]
    rerun = [Finding("pass", "With the raw data's numbers: Sigma agrees.", check="significance",
                     details={"numbers": "raw"}),
             Finding("pass", "With the raw data's numbers: Fine.", check="error-floor", details={"numbers": "raw"})]
    shown, same = visible_findings(printed + rerun)
    assert same == 1 and shown == printed + rerun[1:]


def test_drift_text():
    r = drift_analysis(np.arange(6.0), np.array([1.0, 1.02, 1.01, 1.05, 1.04, 1.07]), np.full(6, 0.01))
    text = render_drift_text(r, "series.csv")
    assert "Drift of series.csv: 6 points" in text
    assert "slope" in text and "systematic" in text and "chi2 =" in text
    assert "A constant value over time: rejected" in text
