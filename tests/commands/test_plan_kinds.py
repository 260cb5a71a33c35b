"""``claimcheck plan`` for a baseline, runs and a counting experiment (issue 14): sizes against
statsmodels' power solvers and closed forms, seeded simulations that the planned size reaches the
stated power, and one-line refusals of options a kind cannot use."""

from __future__ import annotations

import math

import numpy as np
import pytest
from scipy import stats

from plan_tools import claimcheck, plan_json


UNPAIRED = ("--metric", "proportion", "--estimate", "0.913", "--baseline", "0.890", "--required-sigma", "3")


def test_unpaired_items_equal_statsmodels_normal_ind_power():
    # statsmodels NormalIndPower with effect size (p1 - p2) / sqrt((p1 q1 + p2 q2) / 2), one-sided
    # alpha = norm.sf(3), power 0.8: the same n per arm as Fleiss et al. (2003) without the
    # continuity correction
    from statsmodels.stats.power import NormalIndPower
    p1, p2 = 0.913, 0.890
    es = (p1 - p2) / math.sqrt((p1 * (1 - p1) + p2 * (1 - p2)) / 2)
    ref = NormalIndPower().solve_power(effect_size=es, alpha=stats.norm.sf(3), power=0.8, alternative="larger")
    data = plan_json(*UNPAIRED)
    assert data["kind"] == "two-proportions"
    assert data["required_sigma"] == data["target_sigma"] == 3
    assert data["items_per_arm"] == math.ceil(ref) == data["samples"]
    # closed form by hand: (3 + 0.8416)^2 (0.913 x 0.087 + 0.890 x 0.110) / 0.023^2
    # = 14.758 x 0.177331 / 0.000529 = 4947.2
    assert f"{(3 + stats.norm.ppf(0.8)) ** 2 * (0.913 * 0.087 + 0.89 * 0.11) / 0.023 ** 2:.1f}" == "4947.2"
    assert data["items_per_arm"] == 4948
    assert data["achieved_power"] >= 0.8
    assert [row["items_per_arm"] for row in data["table"]] == sorted(row["items_per_arm"] for row in data["table"])


def test_unpaired_plan_reaches_its_power_in_simulation():
    # seeded: 4000 pairs of independent arms of the planned size; the unpaired z clears 3 sigma
    # in 0.80 of them within 3 standard errors (3 sqrt(0.8 x 0.2 / 4000) = 0.019)
    n = plan_json(*UNPAIRED)["items_per_arm"]
    rng = np.random.default_rng(11)
    a, b = rng.binomial(n, 0.913, 4000) / n, rng.binomial(n, 0.890, 4000) / n
    z = (a - b) / np.sqrt(a * (1 - a) / n + b * (1 - b) / n)
    assert abs((z >= 3).mean() - 0.8) < 0.019


PAIRED = UNPAIRED + ("--paired", "--discordance", "0.075")


def test_paired_items_follow_connor():
    # Connor (1987): n = (z_a sqrt(psi) + z_b sqrt(psi - delta^2))^2 / delta^2 with psi = 0.075,
    # delta = 0.023, by hand: (3 x 0.273861 + 0.841621 x 0.272894)^2 / 0.000529 = 1.105141 / 0.000529
    # = 2089.1
    psi, delta = 0.075, 0.023
    n = (3 * math.sqrt(psi) + stats.norm.ppf(0.8) * math.sqrt(psi - delta ** 2)) ** 2 / delta ** 2
    assert f"{n:.1f}" == "2089.1"
    data = plan_json(*PAIRED)
    assert data["kind"] == "paired-proportions" and data["items"] == 2090
    # the same pair on separate items needs more than twice as many in each arm
    assert plan_json(*UNPAIRED)["items_per_arm"] > 2 * data["items"]


def test_paired_plan_reaches_its_power_in_simulation():
    # seeded: 4000 experiments of the planned size with cells p10 = 0.049, p01 = 0.026; McNemar's z
    # clears 3 sigma in 0.80 of them within 3 standard errors (0.019)
    n = plan_json(*PAIRED)["items"]
    rng = np.random.default_rng(12)
    cells = rng.multinomial(n, [0.049, 0.026, 1 - 0.075], size=4000)
    z = (cells[:, 0] - cells[:, 1]) / np.sqrt(cells[:, 0] + cells[:, 1])
    assert abs((z >= 3).mean() - 0.8) < 0.019


RUNS = ("--metric", "mean", "--runs", "--estimate", "71.3", "--threshold", "70", "--sd", "1.2",
        "--required-sigma", "2")


def test_runs_equal_statsmodels_t_test_power():
    # statsmodels TTestPower (one-sample t, one-sided at alpha = norm.sf(2)), effect size 1.3 / 1.2
    from statsmodels.stats.power import TTestPower
    ref = TTestPower().solve_power(effect_size=1.3 / 1.2, alpha=stats.norm.sf(2), power=0.8, alternative="larger")
    data = plan_json(*RUNS)
    assert data["kind"] == "mean-runs" and data["runs"] == math.ceil(ref)
    # the normal formula ((2 + 0.8416) 1.2 / 1.3)^2 = 6.9 would promise 7 runs; the t needs more
    assert data["runs"] > math.ceil(((2 + stats.norm.ppf(0.8)) * 1.2 / 1.3) ** 2)


def test_runs_plan_reaches_its_power_in_simulation():
    # seeded: 20000 experiments of the planned runs (normal scatter, sd 1.2); the t test passes in
    # the achieved power's share within 3 standard errors (3 sqrt(0.8 x 0.2 / 20000) = 0.0085)
    data = plan_json(*RUNS)
    k = data["runs"]
    rng = np.random.default_rng(13)
    runs = rng.normal(71.3, 1.2, size=(20000, k))
    t = (runs.mean(axis=1) - 70.0) / (runs.std(axis=1, ddof=1) / math.sqrt(k))
    passed = stats.t.sf(t, k - 1) <= stats.norm.sf(2)
    assert abs(passed.mean() - data["achieved_power"]) < 0.0085
    assert data["achieved_power"] >= 0.8


COUNTS = ("--metric", "counts", "--estimate", "16.8", "--background", "30.2", "--required-sigma", "3")


def test_counting_exposure_reaches_its_power_in_simulation():
    # seeded: 20000 Poisson counts at the planned exposure; the exact tail (scipy.stats.poisson)
    # clears 3 sigma in 0.80 of them within 3 standard errors (0.0085)
    data = plan_json(*COUNTS)
    assert data["kind"] == "counting-exposure"
    t = data["exposure"]
    assert data["expected_background"] == pytest.approx(30.2 * t)
    crit = int(stats.poisson.isf(stats.norm.sf(3), 30.2 * t)) + 1  # smallest n with P(N >= n) <= alpha
    while stats.poisson.sf(crit - 2, 30.2 * t) <= stats.norm.sf(3):
        crit -= 1
    assert stats.poisson.sf(crit - 1, 30.2 * t) <= stats.norm.sf(3) < stats.poisson.sf(crit - 2, 30.2 * t)
    rng = np.random.default_rng(14)
    n = rng.poisson(47.0 * t, 20000)
    assert abs((n >= crit).mean() - 0.8) < 0.0085


def test_text_output_names_the_size():
    status, out, _ = claimcheck("plan", *PAIRED)
    assert status == 0
    assert "items, each scored by both needed: 2,090" in out and "Connor 1987" in out
    status, out, _ = claimcheck("plan", *COUNTS)
    assert status == 0 and "units of exposure needed" in out


@pytest.mark.parametrize("argv, words", [
    (UNPAIRED + ("--discordance", "0.1"), "--discordance"),
    (UNPAIRED + ("--paired",), "--discordance"),
    (PAIRED[:-1] + ("0.5",), "cannot go with"),
    (("--metric", "proportion", "--estimate", "0.8", "--baseline", "0.9", "--required-sigma", "3"), "not below"),
    (("--metric", "mean", "--estimate", "0.8", "--baseline", "0.7", "--required-sigma", "3"), "--metric proportion"),
    (("--metric", "counts", "--estimate", "3", "--required-sigma", "3"), "--background"),
    (COUNTS + ("--sd", "1"), "--sd"),
    (RUNS + ("--samples", "5"), "--samples"),
    (("--metric", "mean", "--runs", "--estimate", "69", "--threshold", "70", "--sd", "1.2", "--required-sigma", "2"),
     "not above"),
])
def test_unusable_options_are_one_line(argv, words):
    status, out, err = claimcheck("plan", *argv)
    assert status == 2 and out == ""
    assert words in err and len(err.strip().splitlines()) == 1 and "Traceback" not in err
