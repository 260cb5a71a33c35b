"""``error-floor``: the printed standard error against what sampling alone
allows, with the edges of the printed digits respected."""

from __future__ import annotations

import math
import textwrap

import pytest
from statsmodels.stats.proportion import proportion_confint

from checker.checks import run_checks
from checker.claim import claim_from_document
from checker.claim.load import parse_text

BASE = "title: Invented claim\nmetric: {metric}\nestimate: {estimate}\n"


def floor_findings(check_claim, metric, estimate, extra):
    report = check_claim(BASE.format(metric=metric, estimate=estimate) + extra, only=["error-floor"])
    return report.findings


def test_a_proportion_floor_matches_the_wald_half_width_of_statsmodels(check_claim):
    (f,) = floor_findings(check_claim, "proportion", "0.912", "stat_error: 0.009\nsamples: 1000\n")
    # statsmodels' normal-approximation (Wald) interval is p +- 1.96 sqrt(p (1 - p) / n).
    low, high = proportion_confint(912, 1000, alpha=0.05, method="normal")
    wald_se = (high - low) / 2 / 1.959963984540054
    assert f.status == "pass"
    assert f.details["floor_low"] < wald_se < f.details["floor_high"]
    assert f.recomputed == pytest.approx(wald_se, rel=1e-3)


def test_an_error_smaller_than_sampling_allows(check_claim):
    (f,) = floor_findings(check_claim, "proportion", "0.912", "stat_error: 0.002\nsamples: 1000\n")
    assert f.status == "fail"
    # Pinned: the most important error-floor finding.
    assert f.message == ("Headline: printed stat_error 0.002 against 0.00894 to 0.00898 that 1000 samples allow "
                         "under the proportion model: smaller than sampling alone permits (0.22x); it would "
                         "take about 2e4 samples.")
    # 0.912 x 0.088 / 0.002^2 = 20064 samples would give that error.
    assert dict(f.reproduced_by) == {"samples": 20064}
    assert f.reported == 0.002


def test_an_error_no_count_of_circuits_or_samples_reaches_says_so(check_claim):
    # Linear XEB on 3 qubits (D = 8), F = 0.01 from 10 samples over 2 circuits: the sampling term
    # alone, (1 + 2F - F^2)/N ~ 0.1, is far above 0.001^2, so neither more samples from 2 circuits
    # nor more circuits at 10 samples gives the printed error (the sentence once read "it would
    # take about more circuits and samples than ...").
    (f,) = floor_findings(check_claim, "linear-xeb", "0.01",
                          "qubits: 3\nstat_error: 0.001\nsamples: 10\ncircuits: 2\n")
    assert f.status == "fail" and f.reproduced_by is None
    assert f.message.endswith("no number of samples from 2 circuits would reach it, nor any number of "
                              "circuits at 10 samples.")


def test_an_error_only_more_circuits_reach_names_the_circuits(check_claim):
    (f,) = floor_findings(check_claim, "linear-xeb", "0.3",
                          "qubits: 3\nstat_error: 0.01\nsamples: 1000000\ncircuits: 10\n")
    assert f.status == "fail"
    assert "it would take about 3e2 circuits (no number of samples from 10 suffices)." in f.message
    assert set(f.reproduced_by) == {"circuits"}


def test_the_floor_edge_one_digit_at_a_time(check_claim):
    # Floor low end: "0.912" is [0.9115, 0.9125]; sqrt(0.9125 x 0.0875 / 1000) = 0.0089355.
    assert math.sqrt(0.9125 * 0.0875 / 1000) == pytest.approx(0.0089355, abs=1e-7)
    extra = "samples: 1000\ntolerance: 0\nstat_error: {}\n"
    # "0.0089" reaches 0.00895, above the floor: passes.  "0.0088" reaches only 0.00885: fails.
    assert floor_findings(check_claim, "proportion", "0.912", extra.format("0.0089"))[0].status == "pass"
    assert floor_findings(check_claim, "proportion", "0.912", extra.format("0.0088"))[0].status == "fail"
    # The default tolerance (2%) lets 0.00885 x 1.02 = 0.0090 clear the floor.
    default = "samples: 1000\nstat_error: 0.0088\n"
    assert floor_findings(check_claim, "proportion", "0.912", default)[0].status == "pass"


def test_far_above_the_floor_is_a_note(check_claim):
    (f,) = floor_findings(check_claim, "proportion", "0.912", "stat_error: 0.05\nsamples: 1000\n")
    assert f.status == "warn" and "5.6x the sampling floor" in f.message


def test_linear_xeb_floor(check_claim):
    # Boixo et al. (2018): Var x = 1 + 2F - F^2 per sample; at F = 2.24e-3 and N = 2.5e7 the
    # floor is sqrt(1.00447) / 5000 = 2.0045e-4.
    (f,) = floor_findings(check_claim, "linear-xeb", "2.24e-3", "stat_error: 0.20e-3\nsamples: 2.5e7\n")
    assert f.status == "pass"
    assert f.details["floor_low"] < math.sqrt(1 + 2 * 2.24e-3 - 2.24e-3 ** 2) / 5000 < f.details["floor_high"]
    # "2.5e7" samples is [2.45e7, 2.55e7]: the floor's width comes mostly from that.
    assert f.details["floor_high"] / f.details["floor_low"] == pytest.approx(math.sqrt(2.55 / 2.45), rel=2e-3)


def test_heavy_output_with_one_shot_per_circuit(check_claim):
    # Cross et al. (2019): sigma = sqrt(h (1 - h) / n_circuits); 0.742 and 200 circuits give 0.0309.
    (f,) = floor_findings(check_claim, "heavy-output", "0.742", "stat_error: 0.031\ncircuits: 200\n")
    assert f.status == "pass" and f.details["count_field"] == "circuits"
    # Issue 11, item 4: below the per-circuit convention is no contradiction without the shots.
    (f,) = floor_findings(check_claim, "heavy-output", "0.742", "stat_error: 0.005\ncircuits: 200\n")
    assert f.status == "skip" and f.details["missing"] == ["samples"]


def test_heavy_output_with_many_shots_per_circuit(check_claim):
    # Baldwin et al., arXiv:2110.14808 (2022): at typical shot counts the per-circuit formula
    # over-states the error, so a smaller printed error is no contradiction so long as it stays
    # above the binomial floor of all shots (see tests/metrics/test_heavy_output.py).
    extra = "circuits: 200\nsamples: 200000\nstat_error: {}\n"
    (f,) = floor_findings(check_claim, "heavy-output", "0.742", extra.format("0.005"))
    assert f.status == "pass" and "consistent with many samples per circuit" in f.message
    (f,) = floor_findings(check_claim, "heavy-output", "0.742", extra.format("0.0005"))
    assert f.status == "fail" and "200000 samples allow" in f.message
    assert f.details["sampling_floor_low"] == pytest.approx(math.sqrt(0.7425 * 0.2575 / 200000), rel=1e-12)
    (f,) = floor_findings(check_claim, "heavy-output", "0.742", extra.format("0.031"))
    assert f.status == "pass"


def test_mean_needs_the_per_sample_sd(check_claim):
    (f,) = floor_findings(check_claim, "mean", "5.2", "stat_error: 0.05\nsamples: 400\n")
    assert f.status == "skip" and f.message == "Headline: the mean model needs sd."
    (f,) = floor_findings(check_claim, "mean", "5.2", "stat_error: 0.05\nsamples: 400\nsd: 1.0\n")
    assert f.status == "pass"
    assert (f.details["floor_low"], f.details["floor_high"]) == pytest.approx((0.95 / 20, 1.05 / 20))


def test_skips_name_what_is_missing(check_claim):
    # With a printed error and no samples the finding says what the error implies (issue 16):
    # 0.9 x 0.1 / 0.01^2 = 900 samples (binomial variance, common practice).
    (f,) = floor_findings(check_claim, "proportion", "0.9", "stat_error: 0.01\n")
    assert f.status == "info" and f.message.startswith("Headline: no samples are printed;")
    assert list(f.details["missing"]) == ["samples"] and f.recomputed == pytest.approx(900)
    # A mean's floor is sd/sqrt(N) (common practice): with no sd the skip says so too (issue 16).
    (f,) = floor_findings(check_claim, "mean", "0.9", "stat_error: 0.01\n")
    assert f.status == "skip" and f.message == "Headline: no floor to compare with; needs samples and sd."
    assert list(f.details["missing"]) == ["samples", "sd"]
    (f,) = floor_findings(check_claim, "mean", "0.9", "")
    assert f.message == "Headline: no floor to compare with; needs stat_error, samples and sd."
    # With sd the count follows instead: (0.2 / 0.01)^2 = 400 samples (se = sd/sqrt(N), common practice).
    (f,) = floor_findings(check_claim, "mean", "0.9", "stat_error: 0.01\nsd: 0.2\n")
    assert f.status == "info" and f.recomputed == pytest.approx(400) and "sd" not in f.details["missing"]
    (f,) = floor_findings(check_claim, "proportion", "0.9", "")
    assert f.message == "Headline: no floor to compare with; needs stat_error and samples."


def test_an_extrapolated_headline_scales_its_floor(check_claim):
    # Headline 0.5 = measured 0.25 x 2: the floor is 2 sqrt(0.25 x 0.75 / 100) = 0.0866.
    (f,) = floor_findings(check_claim, "proportion", "0.50", "stat_error: 0.0866\nsamples: 100\n"
                          "extrapolation: {factor: 2}\n")
    assert f.status == "pass"
    assert f.details["floor_low"] < 2 * math.sqrt(0.25 * 0.75 / 100) < f.details["floor_high"]


def test_one_finding_per_part_with_its_label(check_claim):
    found = floor_findings(check_claim, "proportion", "0.5",
                           "stat_error: 0.05\nsamples: 100\nparts:\n"
                           "  - {label: a, estimate: 0.5, stat_error: 0.001, samples: 100}\n"
                           "  - {label: b, estimate: 0.5}\n"
                           "  - {label: c, estimate: 0.5, stat_error: 0.05}\n")
    assert [(f.status, f.details.get("part")) for f in found] == [("pass", None), ("fail", "a")]
    assert found[1].message.startswith("Part a: printed stat_error 0.001")


# --- parts: each part's printed error against the error its own samples allow ---------------

def part_findings(text: str):
    claim = claim_from_document(parse_text(textwrap.dedent(text), "claim.yaml", "yaml"))
    return {f.details.get("part", "headline"): f for f in run_checks(claim, ["error-floor"]).findings}


def test_each_part_is_held_against_its_own_samples():
    # Binomial floor sqrt(p (1 - p) / n) (common practice): part a sqrt(0.9 x 0.1 / 1000) = 0.0095;
    # part b's printed 0.002 is below sqrt(0.8 x 0.2 / 1000) = 0.0126.
    text = """
        title: parts
        metric: proportion
        estimate: 0.85
        parts:
          - {label: a, estimate: 0.900, stat_error: 0.0095, samples: 1000}
          - {label: b, estimate: 0.800, stat_error: 0.0020, samples: 1000}
          - {label: c, estimate: 0.850}
    """
    found = part_findings(text)
    assert found["a"].status == "pass"
    assert found["b"].status == "fail"
    assert found["b"].message.startswith("Part b: printed stat_error 0.0020")
    assert math.isclose(found["b"].recomputed, math.sqrt(0.16 / 1000), rel_tol=1e-3)
    assert "c" not in found  # no error printed for c: nothing to compare
    assert found["headline"].status == "skip"


def test_heavy_output_parts_count_circuits():
    # Cross et al., Phys. Rev. A 100, 032328 (2019): sigma = sqrt(h (1 - h) / circuits).
    text = """
        title: hop
        metric: heavy-output
        estimate: 0.75
        parts:
          - {label: width 5, estimate: 0.760, stat_error: 0.030, circuits: 200}
    """
    f = part_findings(text)["width 5"]
    assert f.status == "pass"
    assert math.isclose(f.recomputed, math.sqrt(0.76 * 0.24 / 200), rel_tol=1e-3)


def test_a_linear_xeb_estimate_printed_as_zero_does_not_break_the_model():
    # "0" stands for [-0.5, 0.5]; the fidelity mixture (Boixo et al., Nature Physics 14, 595 (2018))
    # is a distribution only for F in [0, 1], where Var x = 1 + 2F - F^2 runs from 1 to 2, so a
    # negative estimate is read as F = 0 and the floor is sqrt(1 / 1e6) = 0.001, not 0.
    text = "title: t\nmetric: linear-xeb\nestimate: 0\nstat_error: 0.001\nsamples: 1000000\n"
    f = part_findings(text)["headline"]
    assert f.status == "pass"
    assert f.details["floor_low"] == pytest.approx(0.001, rel=1e-12)


def test_a_proportion_at_one_half_uses_the_peak_of_the_binomial_variance(check_claim):
    # Issue 11: "0.5 +- 0.153" from 100 samples.  Over p in [0.45, 0.55] the floor
    # sqrt(p (1 - p)/100) peaks at 0.05 (p = 1/2, inside the interval), not at the corners' 0.0497;
    # 0.153 is within the 2% tolerance of 3 x 0.05, so it gets no note.
    (f,) = floor_findings(check_claim, "proportion", "0.5", "stat_error: 0.153\nsamples: 100\n")
    assert f.details["floor_high"] == pytest.approx(0.05)
    assert f.status == "pass"


def test_a_published_style_heavy_output_claim_is_not_below_a_floor(check_claim):
    # Issue 11, item 4: heavy output 0.757 over 100 circuits with a printed two-sigma lower bound of
    # 0.746 (error 0.0055) is 0.13x the per-circuit convention sqrt(h (1 - h)/100) = 0.0429
    # (Cross et al., Phys. Rev. A 100, 032328 (2019)); that convention is not a floor, so no flag.
    (f,) = floor_findings(check_claim, "heavy-output", "0.757", "stat_error: 0.0055\ncircuits: 100\n")
    assert f.status != "fail"
    assert f.recomputed == pytest.approx(math.sqrt(0.757 * 0.243 / 100), rel=2e-3)


# --- the circuit-to-circuit term -------------------------------------------------------------

def test_the_issues_honest_claim_with_circuits_passes_and_the_samples_only_one_fails(check_claim):
    # Issue "Right at the edges", item 2: 10 qubits, F = 0.5, 10 circuits, 1e6 samples: the
    # honest error is about 0.010 (4F^2/D per circuit, over 10 circuits); 0.0014 counts the
    # samples and not the circuits.
    extra = "qubits: 10\nstat_error: {}\nsamples: 1000000\ncircuits: 10\n"
    (honest,) = floor_findings(check_claim, "linear-xeb", "0.50", extra.format("0.010"))
    assert honest.status == "pass"
    assert honest.details["floor_low"] < 0.0100 < honest.details["floor_high"] * 1.01
    (slip,) = floor_findings(check_claim, "linear-xeb", "0.50", extra.format("0.0014"))
    assert slip.status == "fail"
    assert "no number of samples from 10 suffices" in slip.message
    assert slip.reproduced_by == {"circuits": pytest.approx(4.6e3, rel=0.05)}
    # Without circuits the floor stays sqrt(v/N), the smallest any number of circuits allows.
    (no_k,) = floor_findings(check_claim, "linear-xeb", "0.50",
                             "qubits: 10\nstat_error: 0.0014\nsamples: 1000000\n")
    assert no_k.status == "pass" and no_k.details["floor_high"] < 0.00135


def test_log_xeb_floor_counts_circuits_even_at_zero_fidelity(check_claim):
    # The log-XEB circuit term (pi^2/6 - 1)/D does not vanish at F = 0: 12 qubits, 4 circuits,
    # 4e6 samples: sqrt(pi^2/6 / 4e6 + 0.645 / 4096 / 4) = 0.0069 against 0.00064 without circuits.
    (f,) = floor_findings(check_claim, "log-xeb", "0.000",
                          "qubits: 12\nstat_error: 0.0007\nsamples: 4000000\ncircuits: 4\n")
    assert f.status == "fail"
    assert f.recomputed == pytest.approx(math.sqrt(math.pi ** 2 / 6 / 4e6 + (math.pi ** 2 / 6 - 1) / 4096 / 4),
                                         rel=0.02)


def test_a_small_shortfall_within_what_few_circuits_can_estimate_passes(check_claim):
    # 8 circuits estimate their own spread with chi^2 on 7 degrees of freedom: a print 7% under
    # the expected floor is within that (about one honest analysis in a thousand lands below
    # the flagged level).
    (f,) = floor_findings(check_claim, "linear-xeb", "0.606",
                          "qubits: 12\nstat_error: 0.021\nsamples: 4000\ncircuits: 8\n")
    assert f.status == "pass" and f.details["floor_plausible_low"] < 0.0215 * 1.02 and 0.021 < f.details["floor_low"]


# --- a mean over runs: which error was printed (issue 14) ---------------------------------
# Readings of a printed error for sd 1.2 over 5 runs (checker.stats.runs.error_readings, by hand):
# error of the mean 1.2 / sqrt(5) = 0.5367, the sd itself 1.2, sd x sqrt(5) = 2.683.

def test_a_printed_error_equal_to_the_sd_is_named(check_claim):
    (f,) = floor_findings(check_claim, "mean", "71.3", "sd: 1.2\nstat_error: 1.2\nsamples: 5\n")
    assert f.status == "warn" and f.statement == "error_is_sd"
    assert dict(f.reproduced_by) == {"error_reading": "sd"}
    # Pinned: the slip named in words, with the error of the mean it should have been
    assert f.message == ("Headline: printed stat_error 1.2 equals the printed sd 1.2: the spread of the 5 runs "
                         "printed as the error of the mean, which is sd/sqrt(5) = 0.514 to 0.559.")
    assert f.details["error_of_the_mean_low"] < 1.2 / math.sqrt(5) < f.details["error_of_the_mean_high"]


def test_a_printed_error_of_sd_times_root_n_is_named(check_claim):
    (f,) = floor_findings(check_claim, "mean", "71.3", "sd: 1.2\nstat_error: 2.68\nsamples: 5\n")
    assert f.status == "warn" and f.statement == "sd_is_error"
    assert dict(f.reproduced_by) == {"error_reading": "sd times root n"}


def test_the_error_of_the_mean_passes(check_claim):
    (f,) = floor_findings(check_claim, "mean", "71.3", "sd: 1.2\nstat_error: 0.537\nsamples: 5\n")
    assert f.status == "pass" and f.statement == "within_floor"


@pytest.mark.parametrize("error, statement", [
    # sd 1.20 over 4 runs: sd / 2 = 0.600 (the floor); 1.20 the sd; 2.40 = sd x 2
    ("0.600", "within_floor"), ("1.20", "error_is_sd"), ("2.40", "sd_is_error"),
    # one digit beyond each reading's printed interval: 1.26 is neither 1.20 nor 2.40 (within
    # the warn ratio of 3, so a plain pass); 2.53 is above the floor by 4.2x
    ("1.26", "within_floor"), ("2.53", "above_floor")])
def test_readings_at_the_edges_of_the_digits(check_claim, error, statement):
    (f,) = floor_findings(check_claim, "mean", "71.3", f"sd: 1.20\nstat_error: {error}\nsamples: 4\n")
    assert f.statement == statement
