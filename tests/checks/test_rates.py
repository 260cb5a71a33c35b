"""The ``rates`` check: rates printed from one table of counts, each recomputed
exactly, each interval matched to a method at its own denominator, and a wrong
denominator or a design effect named."""

from __future__ import annotations

import io
import textwrap

import numpy as np
import pytest

from checker.checks import run_checks
from checker.claim import claim_from_document
from checker.claim.load import parse_text
from checker.cli import run

# Altman, Machin, Bryant and Gardner, Statistics with Confidence, 2nd ed. (BMJ Books, 2000),
# ch. 10, the liver scan example (from memory): 231 true positives, 32 false positives,
# 27 false negatives, 54 true negatives; sensitivity 231/258 = 89.5% (95% CI 85.2% to 92.7%),
# specificity 54/86 = 62.8% (95% CI 52.2% to 72.3%), both by the Wilson method.
LIVER_SCAN = """
    title: liver scan (published worked example)
    metric: proportion
    estimate: 89.5%
    counts_table: {{true_positive: 231, false_positive: 32, false_negative: 27, true_negative: 54}}
    rates:
      sensitivity: {{value: 89.5%, interval: {{low: {sens_low}, high: {sens_high}}}}}
      specificity: {{value: {spec}, interval: {{low: 52.2%, high: 72.3%, level: 95%}}}}
"""

# An invented triage classifier: 35 of 42 positives found (recall 83.33%), 32 of 36 negatives.
TRIAGE = """
    title: Invented triage classifier (invented numbers)
    metric: proportion
    estimate: 85.90%
    counts_table: {{true_positive: 35, false_positive: 4, false_negative: 7, true_negative: 32}}
    rates:
      recall: {recall}
"""


def findings(text: str, **fields):
    claim = claim_from_document(parse_text(textwrap.dedent(text.format(**fields)), "claim.yaml", "yaml"))
    return run_checks(claim, ["rates"]).findings


def by_field(found):
    return {f.field: f for f in found}


def test_the_published_worked_example_agrees_and_names_the_wilson_method():
    found = by_field(findings(LIVER_SCAN, sens_low="85.2%", sens_high="92.7%", spec="62.8%"))
    assert {f.status for f in found.values()} == {"pass"}
    assert found["rates.sensitivity.interval"].details["agreeing"][0] == "wilson"
    assert found["rates.specificity.interval"].details["agreeing"][0] == "wilson"
    assert (found["rates.sensitivity.value"].details["numerator"],
            found["rates.sensitivity.value"].details["denominator"]) == (231, 258)


def test_every_method_at_each_margin_matches_statsmodels():
    # Reference: statsmodels.stats.proportion.proportion_confint at the margin of the 2x2 table
    # each rate divides by (sensitivity by the 258 diseased, specificity by the 86 healthy).
    from statsmodels.stats.proportion import proportion_confint

    found = by_field(findings(LIVER_SCAN, sens_low="85.2%", sens_high="92.7%", spec="62.8%"))
    names = {"wald": "normal", "wilson": "wilson", "clopper-pearson": "beta",
             "agresti-coull": "agresti_coull", "jeffreys": "jeffreys"}
    for field, (k, n) in (("rates.sensitivity.interval", (231, 258)), ("rates.specificity.interval", (54, 86))):
        methods = found[field].details["methods"]
        for ours, theirs in names.items():
            assert (methods[ours]["low"], methods[ours]["high"]) == pytest.approx(
                proportion_confint(k, n, alpha=0.05, method=theirs), rel=1e-10)


def test_a_recall_interval_made_with_all_cases_is_named_with_its_denominator():
    # By hand (common practice, Wald p +- 1.96 sqrt(p(1 - p)/N)): 35/42 with N = 78 gives
    # 75.06%-91.60%; with the right N = 42 it gives 72.06%-94.60%.
    found = by_field(findings(TRIAGE, recall="{value: 83.33%, interval: {low: 75.06%, high: 91.60%}}"))
    iv = found["rates.recall.interval"]
    assert iv.status == "fail"
    assert dict(iv.reproduced_by) == {"method": "wald", "denominator": 78, "margin": "all cases"}
    assert "it is the Wald interval computed with N = 78, all cases, instead of N = 42, the positives" in iv.message
    right = by_field(findings(TRIAGE, recall="{value: 83.33%, interval: {low: 72.06%, high: 94.60%}}"))
    assert right["rates.recall.interval"].status == "pass"


def test_a_rate_printed_with_another_rates_value_is_named():
    # The table's negative predictive value is 32/39 = 82.05%; printed as the recall it is flagged
    # with the rate it is.
    found = by_field(findings(TRIAGE, recall="82.05%"))
    assert found["rates.recall"].status == "fail"
    assert dict(found["rates.recall"].reproduced_by) == {"rate": "negative_predictive_value"}
    assert "35/42 = 83.33" in found["rates.recall"].message


def test_a_rate_over_the_wrong_margin_is_named():
    # 35/78 = 44.87%: the true positives over all cases.
    found = by_field(findings(TRIAGE, recall="44.87%"))
    assert dict(found["rates.recall"].reproduced_by) == {"numerator": "the true positives",
                                                         "denominator": "all cases"}


@pytest.mark.parametrize("printed, status", [("83.33%", "pass"), ("83.3%", "pass"), ("0.8333", "pass"),
                                             ("86%", "fail"), ("0.80", "fail")])
def test_printed_precision_of_a_rate(printed, status):
    assert by_field(findings(TRIAGE, recall=printed))["rates.recall"].status == status


def test_an_interval_wider_than_binomial_is_a_design_effect_note():
    # 2.9 times the Wilson width of 35/42: an effective sample size of about 42 / 2.9^2 cases.
    found = by_field(findings(TRIAGE, recall="{value: 83.33%, interval: {low: 50.0%, high: 99.9%}}"))
    iv = found["rates.recall.interval"]
    assert iv.status == "warn"
    # Kish (1965), Sec. 8.2 (from memory): deff = N / N_eff, N_eff from the Wald half-width.
    half = (0.999 - 0.5) / 2
    n_eff = 1.959963984540054 ** 2 * (35 / 42) * (7 / 42) / half ** 2
    assert iv.details["effective_samples"] == pytest.approx(n_eff, rel=1e-9)
    assert iv.details["design_effect"] == pytest.approx(42 / n_eff, rel=1e-9)
    assert "legitimate reason" in iv.message


def test_f1_is_recomputed_but_its_interval_is_not_binomial():
    # F1 = 2 TP / (2 TP + FP + FN) = 70/81 = 86.42% (van Rijsbergen 1979, ch. 7).
    found = by_field(findings(TRIAGE, recall="83.33%").__class__(()) or
                     run_checks(claim_from_document(parse_text(textwrap.dedent(TRIAGE.format(recall="83.33%"))
                                + "  f1: {value: 86.42%, interval: {low: 0.80, high: 0.93}}\n",
                                "c.yaml", "yaml")), ["rates"]).findings)
    assert found["rates.f1.value"].status == "pass"
    assert found["rates.f1.interval"].status == "skip"


@pytest.mark.parametrize("seed", range(3))
def test_generated_tables_with_a_wrong_denominator_are_caught_by_name(seed):
    # Generator: intervals printed by statsmodels' proportion_confint (reference library) for a
    # rate but with another margin of the table as N, to two decimals in percent. Every draw
    # (3 seeds x 8) must be flagged naming the method and N.
    from statsmodels.stats.proportion import proportion_confint

    rng = np.random.default_rng(100 + seed)
    names = {"wald": "normal", "wilson": "wilson", "clopper-pearson": "beta", "jeffreys": "jeffreys"}
    for _ in range(8):
        tp, fp, fn, tn = (int(x) for x in rng.integers(10, 300, size=4))
        wrong = tp + fp + fn + tn
        method = str(rng.choice(list(names)))
        lo, hi = proportion_confint(tp / (tp + fn) * wrong, wrong, alpha=0.05, method=names[method])
        text = f"""
            title: generated
            metric: proportion
            estimate: 0.5
            counts_table: {{true_positive: {tp}, false_positive: {fp}, false_negative: {fn}, true_negative: {tn}}}
            rates:
              recall: {{value: {100 * tp / (tp + fn):.2f}%, interval: {{low: {100 * lo:.2f}%, high: {100 * hi:.2f}%}}}}
        """
        iv = by_field(findings(text.replace("{", "{{").replace("}", "}}")))["rates.recall.interval"]
        assert iv.status == "fail", (tp, fp, fn, tn, method)
        assert iv.reproduced_by.get("denominator") == wrong, iv.message
        assert iv.reproduced_by["method"] in (method, "wald", "wilson", "agresti-coull", "jeffreys",
                                              "clopper-pearson")


def test_counts_up_to_a_million_stay_bounded():
    # A wrong interval on a table of about 2e6 cases: the search is bounded (it samples long runs
    # of candidate denominators and says so in its details) and still names the total.
    from statsmodels.stats.proportion import proportion_confint

    tp, fp, fn, tn = 700_000, 20_000, 300_000, 980_000
    lo, hi = proportion_confint(0.7 * 2_000_000, 2_000_000, alpha=0.05, method="normal")
    text = f"""
        title: large
        metric: proportion
        estimate: 0.5
        counts_table: {{true_positive: {tp}, false_positive: {fp}, false_negative: {fn}, true_negative: {tn}}}
        rates:
          recall: {{value: 70.000%, interval: {{low: {100 * lo:.4f}%, high: {100 * hi:.4f}%}}}}
    """
    iv = by_field(findings(text.replace("{", "{{").replace("}", "}}")))["rates.recall.interval"]
    assert iv.reproduced_by["margin"] == "all cases"


def cli(*argv):
    out, err = io.StringIO(), io.StringIO()
    return run([str(a) for a in argv], out, err), out.getvalue(), err.getvalue()


@pytest.mark.parametrize("table, says", [
    ("{true_positive: -1, false_positive: 4, false_negative: 7, true_negative: 32}", "counts_table.true_positive"),
    ("{true_positive: 3.5, false_positive: 4, false_negative: 7, true_negative: 32}", "whole number"),
    ("{true_positive: 35%, false_positive: 4, false_negative: 7, true_negative: 32}", "whole number"),
    ("{true_positive: 0, false_positive: 0, false_negative: 0, true_negative: 0}", "holds no cases"),
    ("{true_positive: 35, false_positive: 4, false_negative: 7}", "true_negative"),
])
def test_unusable_tables_are_one_line_and_exit_two(write_claim, table, says):
    path = write_claim(f"title: t\nmetric: proportion\nestimate: 0.5\ncounts_table: {table}\n"
                       "rates: {recall: 0.5}\n")
    status, out, err = cli("check", path)
    assert status == 2 and out == ""
    assert len(err.strip().splitlines()) == 1 and says in err


def test_rates_without_a_table_and_impossible_rates_are_refused(write_claim):
    status, _, err = cli("check", write_claim("title: t\nmetric: proportion\nestimate: 0.5\nrates: {recall: 0.5}\n"))
    assert status == 2 and "no counts_table" in err
    path = write_claim("title: t\nmetric: proportion\nestimate: 0.5\n"
                       "counts_table: {true_positive: 1, false_positive: 1, false_negative: 1, true_negative: 1}\n"
                       "rates: {recall: 1.5}\n")
    status, _, err = cli("check", path)
    assert status == 2 and "rates.recall" in err and "between 0 and 1" in err


def test_no_table_is_a_skip():
    found = findings("title: t\nmetric: proportion\nestimate: 0.5\n")
    assert [f.status for f in found] == ["skip"]


def test_the_reports_show_each_rate_printed_against_the_counts(tmp_path):
    # The Markdown notes and the HTML report carry the check's own table (CheckSpec.summary):
    # each printed rate beside k/n from the table, and what its interval is.
    from pathlib import Path

    example = Path(__file__).resolve().parents[2] / "claims_examples" / "triage_recall_wrong_denominator.yaml"
    notes, page = tmp_path / "n.md", tmp_path / "r.html"
    status, _, _ = cli("check", example, "--markdown", notes, "--html", page)
    assert status == 1
    text = notes.read_text(encoding="utf-8")
    assert "## The printed rates against the table of counts" in text
    assert "| recall | 83.33% | 35/42 = 83.333% | agrees | \\[75.06%, 91.60%\\] | Wald with N = 78 (flagged) |" in text
    assert "| specificity | 88.89% | 32/36 = 88.889% | agrees | \\[78.62%, 99.16%\\] | Wald |" in text
    html = page.read_text(encoding="utf-8")
    assert "The printed rates against the table of counts" in html and "35/42 = 83.333%" in html
