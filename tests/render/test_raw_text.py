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


def test_one_slip_is_one_entry_in_the_terminal_text(tmp_path):
    """Through the CLI: the invented sidedness slip of tests/render/test_raw_markdown.py (z =
    (0.480 - 0.380)/0.036 = 2.778, printed p 5.4e-3 the two-sided value: scipy.stats.norm.sf
    times 2) gives two flags that one convention explains; they are one entry, said once."""
    import io

    from checker.cli import run

    data = tmp_path / "sim.npz"
    assert run(["simulate", "--qubits", "9", "--circuits", "3", "--samples", "800", "--fidelity", "0.5",
                "--seed", "2", "--out", str(data)], io.StringIO(), io.StringIO()) == 0
    claim = tmp_path / "slip.yaml"
    claim.write_text("# Invented scenario: made-up lab and numbers.\ntitle: Invented raw-data sidedness slip\n"
                     "metric: linear-xeb\nqubits: 9\nestimate: 0.480\nstat_error: 0.036\nsamples: 2400\n"
                     "circuits: 3\nthreshold: 0.380\nsignificance: {sigma: 2.78, p_value: 5.4e-3, sided: one}\n",
                     encoding="utf-8")
    out = io.StringIO()
    assert run(["raw", str(data), "--claim", str(claim), "--bootstrap", "200"], out, io.StringIO()) == 1
    lines = out.getvalue().split("Against the claim ")[1].splitlines()
    at = next(i for i, line in enumerate(lines) if "One slip explains" in line)
    assert lines[at] == ("FLAG  significance    One slip explains 2 findings: the print would follow under "
                         "the two-sided convention (both tails).")
    assert lines[at + 1].startswith(" " * 22 + "- Printed 2.78 sigma is p = 0.0027 to 0.0028 one-sided")
    assert lines[at + 2].startswith(" " * 22 + "- Printed p = 5.4e-3, but estimate, threshold and errors give "
                                    "p = 0.0023 to 0.0032")
    # Each of the two is said once (not again on a line of its own), and the count still counts both.
    assert sum("Printed 2.78 sigma is p = 0.0027" in line for line in lines) == 1
    assert "verdict: inconsistent (6 flagged" in out.getvalue()
