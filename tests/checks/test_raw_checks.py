"""The raw-data checks (checker/checks/raw_*.py, RAW_REGISTRY): the claim's
printed numbers against the raw data's (invented claims on simulated data)."""

from dataclasses import replace

import numpy as np
import pytest

from checker.claim import read_claim
from checker.raw.analysis import analyse
from checker.checks import run_raw_checks
from checker.checks.raw_rerun import claim_with_raw_numbers, like_printed, with_raw_label
from checker.raw.simulate_circuits import simulate_dataset
from checker.stats.goodness_of_fit import FitTest


@pytest.fixture(scope="module")
def result(tmp_path_factory):
    folder = tmp_path_factory.mktemp("compare")
    data = simulate_dataset(12, 8, 500, 0.6, np.random.default_rng(7))
    path = folder / "sim.npz"
    np.savez(path, probability=data.probability, circuit=data.circuit, heavy=data.heavy)
    return analyse(str(path), "linear-xeb", 12, bootstrap=200, fit_sample=2000)


def _claim(result, **fields):
    base = {"title": "Invented claim on simulated data", "metric": "linear-xeb", "qubits": 12,
            "estimate": f"{result.headline.estimate:.3f}", "stat_error": f"{result.headline.stat_error_data:.3f}",
            "samples": result.rows, "circuits": result.circuit_count}
    base.update({k: v for k, v in fields.items() if v is not None})
    for k in [k for k, v in fields.items() if v is None]:
        base.pop(k)
    return read_claim(base)


def raw_findings(claim, result):
    """The raw-data checks' own findings (raw-rerun's repeats of the claim checks left out)."""
    return [f for f in run_raw_checks(claim, result) if f.check.startswith("raw-")]


def _by_check(findings):
    return {f.check: f for f in findings}


def test_a_claim_made_from_the_data_agrees(result):
    found = _by_check(raw_findings(_claim(result), result))
    assert [found[c].status for c in ("raw-estimate", "raw-error", "raw-samples", "raw-circuits", "raw-model")] \
        == ["pass"] * 5
    assert "the data reproduce it" in found["raw-estimate"].message


def test_estimate_off_by_standard_errors(result):
    se = result.headline.stat_error_data
    est = result.headline.estimate
    assert _by_check(raw_findings(_claim(result, estimate=f"{est + 0.5 * se:.4f}"), result))[
        "raw-estimate"].status == "pass"
    warn = _by_check(raw_findings(_claim(result, estimate=f"{est + 2 * se:.4f}"), result))["raw-estimate"]
    assert warn.status == "warn" and "are these the data behind the print?" in warn.message
    fail = _by_check(raw_findings(_claim(result, estimate=f"{est + 5 * se:.4f}"), result))["raw-estimate"]
    assert fail.status == "fail" and fail.details["standard_errors"] > 4.5


def test_another_estimator_that_reproduces_the_print_is_named(result):
    # The likelihood and moment estimates differ by about half an error here;
    # a tolerance of 0.1% keeps the default 2% slack from covering the gap.
    ml = result.fit("maximum-likelihood").fidelity
    finding = _by_check(raw_findings(_claim(result, estimate=f"{ml:.4f}", tolerance=0.001), result))["raw-estimate"]
    assert finding.status == "pass" and "within its error" in finding.message
    assert "the maximum likelihood estimator reproduces the print" in finding.message
    assert finding.reproduced_by == {"estimator": "maximum likelihood"}


def test_printed_error_against_the_data(result):
    data = result.headline.stat_error_data
    small = _by_check(raw_findings(_claim(result, stat_error=f"{data / 2:.4f}"), result))["raw-error"]
    assert small.status == "fail" and "smaller than sampling alone allows" in small.message
    large = _by_check(raw_findings(_claim(result, stat_error=f"{data * 5:.3f}"), result))["raw-error"]
    assert large.status == "warn"
    # Circuits that scatter twice as much as their samples explain:
    head = result.headline
    wide = replace(result, combined={**result.combined, "linear-xeb": replace(
        head, extra={**head.extra, "stat_error_circuits": 2 * data})})
    named = _by_check(raw_findings(_claim(result, stat_error=f"{2 * data:.4f}"), wide))["raw-error"]
    assert named.status == "pass" and named.reproduced_by == {"error": "between circuits"}
    left_out = _by_check(raw_findings(_claim(result, stat_error=f"{data:.4f}"), wide))["raw-error"]
    assert left_out.status == "warn" and "the circuits scatter more than their samples explain" in left_out.message
    missing = _by_check(raw_findings(_claim(result, stat_error=None), result))["raw-error"]
    assert missing.status == "skip"


def test_counts_against_the_rows_and_circuits(result):
    found = _by_check(raw_findings(_claim(result, samples="4.5e3", circuits=9), result))
    assert found["raw-samples"].status == "fail" and "the data hold 4,000" in found["raw-samples"].message
    assert found["raw-circuits"].status == "fail"
    # "4.0e3" stands for [3950, 4050]: agrees with 4,000 rows.
    assert _by_check(raw_findings(_claim(result, samples="4.0e3"), result))["raw-samples"].status == "pass"
    no_column = replace(result, extra={**result.extra, "has_circuit": False})
    assert _by_check(raw_findings(_claim(result), no_column))["raw-circuits"].status == "skip"


def test_model_finding_warns_when_the_mixture_does_not_fit(result):
    bad = replace(result, goodness_of_fit=(FitTest("fitted", 0.6, "kolmogorov-smirnov", 0.2, 1e-9, 100),
                                           FitTest("fitted", 0.6, "cramer-von-mises", 3.0, 1e-8, 100)))
    finding = _by_check(raw_findings(_claim(result), bad))["raw-model"]
    assert finding.status == "warn" and "error bars from that model are in doubt" in finding.message
    none = replace(result, goodness_of_fit=())
    assert _by_check(raw_findings(_claim(result), none))["raw-model"].status == "skip"


def test_raw_numbers_take_the_printed_precision(result):
    claim = _claim(result, estimate="0.61", stat_error="0.021")
    swapped = claim_with_raw_numbers(claim, result)
    assert swapped.estimate.text == f"{round(result.headline.estimate, 2):.2f}"
    assert swapped.estimate.high - swapped.estimate.low == pytest.approx(0.01)
    # Over several circuits the data's own error is the between-circuit one.
    assert swapped.stat_error.text == f"{round(result.headline.extra['stat_error_circuits'], 3):.3f}"
    assert swapped.samples.exact and swapped.samples.value == result.rows
    assert like_printed(0.123456, None, "x").exact
    extrapolated = _claim(result, extrapolation={"factor": 0.9})
    assert claim_with_raw_numbers(extrapolated, result) is None
    labelled = with_raw_label(raw_findings(claim, result)[0])
    assert labelled.message.startswith("With the raw data's numbers: ") and labelled.details["numbers"] == "raw"


def test_extrapolated_headline_is_compared_as_raw_times_factor(result):
    est = result.headline.estimate
    claim = _claim(result, estimate=f"{est * 0.9:.4f}", stat_error=None, extrapolation={"factor": "0.90"})
    finding = _by_check(raw_findings(claim, result))["raw-estimate"]
    assert finding.status == "pass" and finding.details["compared_with"] == "headline (raw x factor)"
