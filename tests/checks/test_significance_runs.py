"""The significance check on a mean over a few runs (metric ``mean`` with ``samples`` runs):
Student's t on runs - 1 degrees of freedom, its p given as the equivalent normal sigma
Z = Phi^-1(1 - p_t), and the slips that reproduce a print named (the normal in place of
the t, the printed error read as the runs' sd, the t statistic printed as the sigma).
Kept apart from test_significance.py, which holds the threshold claims of the other metrics."""

from __future__ import annotations

import math

import numpy as np
import pytest
from scipy import stats

from checker.checks import significance
from checker.claim import claim_from_document
from checker.claim.load import parse_text

# The example: "71.3 ± 1.2 over 5 seeds, above 70.0 at p = 0.008" (invented numbers).
FIVE = "title: t\nmetric: mean\nestimate: 71.3\nsamples: 5\nthreshold: 70.0\n"


def findings(text: str) -> list:
    return list(significance.check(claim_from_document(parse_text(text, "c.yaml", "yaml"))))


def one(text: str, statement: str):
    return next(f for f in findings(text) if f.statement == statement)


def t_sf_df4(t: float) -> float:
    """P(T > t) on 4 degrees of freedom in closed form: A(t|4) = sin th (1 + cos^2 th / 2),
    th = arctan(t / 2), and P(T > t) = (1 - A) / 2 (Abramowitz and Stegun 1964, eq. 26.7.3
    for even degrees of freedom; from memory)."""
    th = math.atan(t / 2.0)
    return (1.0 - math.sin(th) * (1.0 + math.cos(th) ** 2 / 2.0)) / 2.0


def test_hand_values_of_the_five_seed_example():
    # By hand: with 1.2 as the error of the mean, t = 1.3 / 1.2 = 1.0833 on 4 dof: p = 0.1698
    # (t) or 0.1393 (normal); neither is 0.008.  With 1.2 as the runs' sd the error of the mean
    # is 1.2 / sqrt(5) = 0.5367, t = 2.4224: p = 0.0363 (t) or 0.0077 (normal).  So the printed
    # 0.008 is the normal tail with 1.2 read as the sd.  Held against scipy.stats.t.sf / norm.sf.
    assert f"{t_sf_df4(1.3 / 1.2):.4f}" == "0.1698" == f"{stats.t.sf(1.3 / 1.2, 4):.4f}"
    t = 1.3 / (1.2 / math.sqrt(5))
    assert f"{t:.4f}" == "2.4224"
    assert f"{t_sf_df4(t):.4f}" == "0.0363" == f"{stats.t.sf(t, 4):.4f}"
    assert f"{stats.norm.sf(t):.3f}" == "0.008"
    assert f"{stats.norm.sf(1.3 / 1.2):.4f}" == "0.1393"


def test_recomputed_p_equals_scipy_ttest_1samp():
    # Five runs built to have mean 71.3 and sd 1.2 exactly; scipy.stats.ttest_1samp
    # (alternative="greater") gives the t test's p, which the check recomputes (as the centre
    # of its range: the printed 71.3 and 1.2 stand for intervals).
    z = np.array([-2.0, -1.0, 0.0, 1.0, 2.0])
    runs = 71.3 + 1.2 * z / z.std(ddof=1)
    ref = stats.ttest_1samp(runs, 70.0, alternative="greater")
    assert ref.pvalue == pytest.approx(t_sf_df4(1.3 / (1.2 / math.sqrt(5))), rel=1e-9)
    claim = claim_from_document(parse_text(FIVE + "sd: 1.2\n", "c.yaml", "yaml"))
    z_centre, log_p = significance.central(claim, significance.stated_convention(claim))
    assert math.exp(log_p) == pytest.approx(ref.pvalue, rel=1e-9)
    # the equivalent normal sigma, Phi^-1(1 - p_t)
    assert z_centre == pytest.approx(stats.norm.isf(ref.pvalue), rel=1e-9)


def test_printed_error_as_sd_with_the_normal_is_named():
    # "71.3 ± 1.2 over 5 seeds ... p = 0.008": under the stated convention (t, 1.2 the error of
    # the mean) p = 0.17; the print follows with the normal and 1.2 read as the runs' sd
    f = one(FIVE + "stat_error: 1.2\nsignificance: {p_value: 0.008}\n", "p_vs_inputs")
    assert f.status == "fail"
    assert dict(f.reproduced_by) == {"distribution": "normal", "error_reading": "sd"}
    assert "Student's t on 4 degrees of freedom" in f.message


def test_normal_in_place_of_t_is_a_flag_with_few_runs():
    # sd 1.2 over 5 runs: the t test gives p = 0.036 (scipy.stats.t.sf(2.4224, 4)); the printed
    # 0.008 is the normal tail, a slip with five runs, so a flag, not a note
    f = one(FIVE + "sd: 1.2\nsignificance: {p_value: 0.008}\n", "p_vs_inputs")
    assert f.status == "fail" and dict(f.reproduced_by) == {"distribution": "normal"}
    assert one(FIVE + "sd: 1.2\nsignificance: {p_value: 0.036}\n", "p_vs_inputs").status == "pass"


def test_equivalent_sigma_of_the_t_test_agrees():
    # p_t = 0.0363 is Z = norm.isf(0.0363) = 1.80 sigma (scipy.stats.norm.isf)
    assert f"{stats.norm.isf(stats.t.sf(2.4224, 4)):.2f}" == "1.80"
    f = one(FIVE + "sd: 1.2\nsignificance: {sigma: 1.8}\n", "sigma_vs_inputs")
    assert f.status == "pass"
    g = one(FIVE + "sd: 1.2\nsignificance: {sigma: 2.42}\n", "sigma_vs_inputs")
    assert g.status == "fail" and dict(g.reproduced_by) == {"distribution": "normal"}


def test_t_statistic_printed_as_sigma_is_a_note():
    # "2.42 sigma, p = 0.036": the p is the t test's on 4 dof (scipy.stats.t.sf), the sigma the
    # t statistic itself; the normal tail of 2.42 would be 0.0078
    f = one(FIVE + "sd: 1.2\nsignificance: {sigma: 2.42, p_value: 0.036}\n", "sigma_vs_p")
    assert f.status == "warn" and dict(f.reproduced_by) == {"sigma": "t statistic"}


def test_two_sided_t():
    # two-sided p = 2 t.sf(2.4224, 4) = 0.0726 (scipy.stats.t.sf)
    assert f"{2 * stats.t.sf(1.3 / (1.2 / math.sqrt(5)), 4):.3f}" == "0.073"
    f = one(FIVE + "sd: 1.2\nsignificance: {p_value: 0.073, sided: two}\n", "p_vs_inputs")
    assert f.status == "pass"


def test_many_runs_keep_the_normal():
    # 400 runs (more than FEW_RUNS): the normal is stated, and a t print is only a note.
    # z = 0.014 / 0.0026 = 5.385: normal p = 3.6e-8 (scipy.stats.norm.sf); t on 399 dof 6.2e-8
    # (printed with five figures, so that the factor 1.7 between them shows)
    text = "title: t\nmetric: mean\nestimate: 0.87400\nstat_error: 0.0026000\nsamples: 400\nthreshold: 0.86\n"
    assert f"{stats.norm.sf(0.014 / 0.0026):.1e}" == "3.6e-08"
    assert one(text + "significance: {p_value: 3.6e-8}\n", "p_vs_inputs").status == "pass"
    p_t = stats.t.sf(0.014 / 0.0026, 399)
    f = one(text + f"significance: {{p_value: {p_t:.2e}}}\n", "p_vs_inputs")
    assert f.status == "warn" and dict(f.reproduced_by) == {"distribution": "t"}


def test_deep_tail_of_t_is_finite():
    # 3 runs with t = 1e5 on 2 degrees of freedom: p = 5.0e-11 (scipy.stats.t.sf), where the
    # normal tail would be far below the double range
    text = "title: t\nmetric: mean\nestimate: 1\nstat_error: 1e-5\nsamples: 3\nthreshold: 0\n"
    f = one(text + f"significance: {{p_value: {stats.t.sf(1e5, 2):.3e}}}\n", "p_vs_inputs")
    assert f.status == "pass"
