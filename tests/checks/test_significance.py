"""``significance``: printed sigma and p against each other and against the
estimate, threshold and errors, under every convention; deep tails in log p."""

from __future__ import annotations

import math

import pytest
from scipy.stats import norm

from checker.stats.tails import log_p_from_sigma


def sig_findings(check_claim, text):
    report = check_claim(text, only=["significance"])
    return report.findings


def by_quantity(found):
    """(sigma-vs-p finding, sigma finding, p finding, required finding) by their details."""
    out = {"sigma_vs_p": None, "sigma": None, "p_value": None, "required_sigma": None}
    for f in found:
        key = f.details.get("quantity") or ("sigma_vs_p" if "p_from_sigma_low" in f.details else None)
        out[key] = f
    return out


# Cousins and Highland, NIM A 320, 331 (1992) (from memory), worked in REFERENCES.md:
# f_hat 0.55, T 0.5, s0 0.01, ss 0.02 -> p 0.012673659, Z 2.23607 with the systematic in
# quadrature (or marginalized); printed here to enough digits that the box is narrow.
CH = ("title: Invented claim\nmetric: mean\nestimate: 0.55000\nthreshold: 0.5\n"
      "stat_error: 0.010000\nsyst_error: 0.020000\n")


@pytest.mark.parametrize("systematics", ["quadrature", "marginalized"])
def test_the_reference_example_agrees_under_its_convention(check_claim, systematics):
    found = sig_findings(check_claim, CH + f"significance: {{sigma: 2.236, p_value: 0.01267, "
                                           f"systematics: {systematics}}}\n")
    assert [f.status for f in found] == ["pass", "pass", "pass"]
    q = by_quantity(found)
    assert q["sigma"].recomputed == pytest.approx(2.23607, abs=5e-5)
    assert q["p_value"].recomputed == pytest.approx(0.012673659, rel=1e-4)


def test_a_systematic_left_out_is_caught_and_named(check_claim):
    found = sig_findings(check_claim, CH + "significance: {sigma: 2.236, p_value: 0.01267, systematics: none}\n")
    q = by_quantity(found)
    assert q["sigma_vs_p"].status == "pass"
    assert q["sigma"].status == "fail" and dict(q["sigma"].reproduced_by) == {"systematics": "quadrature"}
    # Pinned: the finding a referee acts on.
    assert q["sigma"].message == (
        "Printed 2.236 sigma, but estimate, threshold and errors give 5 sigma (one-sided, statistical error "
        "only, error taken at the estimate); it would follow with systematic error added in quadrature.")
    assert q["p_value"].status == "fail" and dict(q["p_value"].reproduced_by) == {"systematics": "quadrature"}
    # Unstated, the same numbers follow from a usual convention: a note naming it, not a flag.
    q = by_quantity(sig_findings(check_claim, CH + "significance: {sigma: 2.236, p_value: 0.01267}\n"))
    for key in ("sigma", "p_value"):
        assert q[key].status == "warn" and dict(q[key].reproduced_by) == {"systematics": "quadrature"}
        assert "the claim states no treatment of the systematic error" in q[key].message


def test_the_sidedness_slip(check_claim):
    # One-sided claim, but the printed p is twice the one-sided tail of the printed sigma.
    found = sig_findings(check_claim, CH + "significance: {sigma: 2.236, p_value: 0.02535, "
                                           "systematics: quadrature, sided: one}\n")
    q = by_quantity(found)
    assert q["sigma_vs_p"].status == "fail"
    assert dict(q["sigma_vs_p"].reproduced_by) == {"sided": "two"}
    # Pinned.
    assert q["sigma_vs_p"].message == ("Printed 2.236 sigma is p = 0.013 one-sided, but the printed "
                                       "p = 0.02535 is the two-sided value.")
    assert q["sigma"].status == "pass"
    assert q["p_value"].status == "fail" and dict(q["p_value"].reproduced_by) == {"sided": "two"}
    # Stated as two-sided, the same numbers are consistent.
    found = sig_findings(check_claim, CH + "significance: {sigma: 2.236, p_value: 0.02535, "
                                           "systematics: quadrature, sided: two}\n")
    assert [f.status for f in found] == ["pass", "pass", "pass"]


def test_no_sidedness_reconciles_a_wrong_p(check_claim):
    (f, *_) = sig_findings(check_claim, CH + "significance: {sigma: 2.236, p_value: 0.2, "
                                             "systematics: quadrature}\n")
    assert f.status == "fail" and f.reproduced_by is None
    # "0.2" is [0.15, 0.25]: scipy.stats.norm.isf gives 1.036 and 0.674 sigma.
    assert norm.isf(0.25) == pytest.approx(0.674, abs=5e-4) and norm.isf(0.15) == pytest.approx(1.036, abs=5e-4)
    assert f.message.endswith("which would be 0.674 to 1.04 sigma; no sidedness reconciles them.")


# --- exactly on the printed-precision edge -----------------------------------------------------
# Binary-exact numbers, so the edge is exact: "10.63" is [10.625, 10.635] and "2" is [1.5, 2.5],
# so z = (estimate - 0) / stat_error runs from 10.625 / 2.5 = 4.25 to 10.635 / 1.5 = 7.09.
EDGE = "title: Invented claim\nmetric: mean\nestimate: 10.63\nthreshold: 0\nstat_error: 2\ntolerance: 0\n"


def test_a_sigma_that_agrees_only_at_the_edge_of_its_interval_passes(check_claim):
    (f,) = sig_findings(check_claim, EDGE + "significance: {sigma: 4.2}\n")  # [4.15, 4.25]
    assert f.status == "pass" and f.details["sigma_low"] == 4.25


def test_one_digit_beyond_the_edge_fails(check_claim):
    (f,) = sig_findings(check_claim, EDGE + "significance: {sigma: 4.1}\n")  # [4.05, 4.15]
    assert f.status == "fail" and f.message.endswith("no convention reproduces it.")


def test_the_default_tolerance_and_design_examples(check_claim):
    # DESIGN.md: "4.2" against a recomputed 4.25 must pass; against 4.6 it must fail.
    base = "title: Invented claim\nmetric: mean\nthreshold: 0\nstat_error: 1.0000000\n"
    assert sig_findings(check_claim, base + "estimate: 4.2500000\nsignificance: {sigma: 4.2}\n")[0].status == "pass"
    assert sig_findings(check_claim, base + "estimate: 4.6000000\nsignificance: {sigma: 4.2}\n")[0].status == "fail"


def test_error_at_the_threshold(check_claim):
    # 0.80 vs 0.5 with 100 samples: se at the threshold sqrt(0.25 / 100) = 0.05 gives z = 6.0;
    # the printed error at the estimate, 0.040, gives 7.5.
    base = "title: Invented claim\nmetric: proportion\nestimate: 0.80\nthreshold: 0.5\nsamples: 100\nstat_error: 0.040\n"
    (f,) = sig_findings(check_claim, base + "significance: {sigma: 6.0, error_at: estimate}\n")
    assert f.status == "fail" and dict(f.reproduced_by) == {"error_at": "threshold"}
    (f,) = sig_findings(check_claim, base + "significance: {sigma: 6.0}\n")
    assert f.status == "warn" and dict(f.reproduced_by) == {"error_at": "threshold"}
    (f,) = sig_findings(check_claim, base + "significance: {sigma: 6.0, error_at: threshold}\n")
    assert f.status == "pass" and f.details["sigma_low"] < 6.0 < f.details["sigma_high"]


# --- deep tails --------------------------------------------------------------------------------
DEEP = "title: Invented claim\nmetric: mean\nestimate: 0.400000\nthreshold: 0\nstat_error: 0.0100000\n"


def test_a_40_sigma_claim(check_claim):
    # One-sided 40 sigma: log10 p = -349.437 (see tests/stats/test_tails.py), p = 3.66e-350.
    assert log_p_from_sigma(40.0) / math.log(10) == pytest.approx(-349.437, abs=1e-3)
    found = sig_findings(check_claim, DEEP + "significance: {sigma: 40.000, p_value: 3.66e-350}\n")
    assert [f.status for f in found] == ["pass", "pass", "pass"]


def test_a_sidedness_slip_at_40_sigma_is_still_a_factor_of_two(check_claim):
    # DESIGN.md: compare p as p, so a factor of 2 is caught where sigma hides it in 0.05%.
    found = sig_findings(check_claim, DEEP + "significance: {sigma: 40.000, p_value: 7.32e-350, sided: one}\n")
    q = by_quantity(found)
    assert q["sigma_vs_p"].status == "fail" and dict(q["sigma_vs_p"].reproduced_by) == {"sided": "two"}
    assert q["sigma"].status == "pass"
    assert q["p_value"].status == "fail" and dict(q["p_value"].reproduced_by) == {"sided": "two"}


def test_a_p_of_1e_minus_300(check_claim):
    # common practice: 1e-300 one-sided is 37.0471 sigma (tests/stats/test_tails.py round trip).
    text = ("title: Invented claim\nmetric: mean\nestimate: 37.0471\nthreshold: 0\nstat_error: 1.00000\n"
            "significance: {sigma: 37.0471, p_value: 1.0e-300}\n")
    assert [f.status for f in sig_findings(check_claim, text)] == ["pass", "pass", "pass"]


def test_a_200_sigma_claim(check_claim):
    # log10 p(200 sigma, one-sided) = -8688.59: p = 2.6e-8689.
    assert log_p_from_sigma(200.0) / math.log(10) == pytest.approx(-8688.5898, abs=1e-4)
    text = ("title: Invented claim\nmetric: mean\nestimate: 200.0000\nthreshold: 0\nstat_error: 1.000000\n"
            "significance: {sigma: 200.000, p_value: 2.6e-8689}\n")
    assert [f.status for f in sig_findings(check_claim, text)] == ["pass", "pass", "pass"]


def test_marginalized_at_40_sigma_matches_quadrature(check_claim):
    # 0.4 / hypot(0.006, 0.008) = 40: the integral over the systematic must hold in log space.
    text = ("title: Invented claim\nmetric: mean\nestimate: 0.400000\nthreshold: 0\nstat_error: 0.00600000\n"
            "syst_error: 0.00800000\nsignificance: {sigma: 40.000, p_value: 3.66e-350, systematics: marginalized}\n")
    found = sig_findings(check_claim, text)
    assert [f.status for f in found] == ["pass", "pass", "pass"]
    assert by_quantity(found)["p_value"].details["log10_p_high"] == pytest.approx(-349.437, abs=0.01)


# --- printed bounds, required sigma, skips -----------------------------------------------------
BOUND = "title: Invented claim\nmetric: mean\nthreshold: 0.5\nstat_error: 0.0100\n"


def test_a_printed_bound_on_p(check_claim):
    found = sig_findings(check_claim, BOUND + "estimate: 0.5500\nsignificance: {sigma: 5.0, p_value: '< 0.001'}\n")
    assert [f.status for f in found] == ["pass", "pass", "pass"]
    found = sig_findings(check_claim, BOUND + "estimate: 0.5200\nsignificance: {sigma: 2.0, p_value: '< 0.001'}\n")
    q = by_quantity(found)
    assert q["sigma_vs_p"].status == "fail" and "at least 3.09 sigma" in q["sigma_vs_p"].message
    assert q["sigma"].status == "pass" and q["p_value"].status == "fail"


@pytest.mark.parametrize("estimate, status", [("0.5200", "fail"), ("0.53", "warn"), ("0.5400", "pass")])
def test_required_sigma(check_claim, estimate, status):
    # 0.02 / 0.01 = 2 sigma is short of 3; "0.53" is 2.5 to 3.5 (only within printed precision);
    # 0.04 / 0.01 = 4 clears it.
    q = by_quantity(sig_findings(check_claim, BOUND + f"estimate: {estimate}\nsignificance: {{required_sigma: 3}}\n"))
    assert q["required_sigma"].status == status
    assert q["required_sigma"].reported == 3.0


def test_required_sigma_message(check_claim):
    q = by_quantity(sig_findings(check_claim, BOUND + "estimate: 0.5200\nsignificance: {required_sigma: 3}\n"))
    assert q["required_sigma"].message == "Recomputed 1.99 to 2.02 sigma falls short of the required 3 sigma."


def test_an_interval_stands_in_for_the_standard_error(check_claim):
    # 95% interval of half-width 1.96 x 0.01 (PDG: z = 1.96 for 95%).
    text = ("title: Invented claim\nmetric: mean\nestimate: 0.5400\nthreshold: 0.5\n"
            "interval: {low: 0.5204, high: 0.5596}\nsignificance: {sigma: 4.0}\n")
    (f,) = sig_findings(check_claim, text)
    assert f.status == "pass" and f.details["sigma_low"] < 4.0 < f.details["sigma_high"]


def test_skips_say_what_is_missing(check_claim):
    (f,) = sig_findings(check_claim, "title: t\nmetric: mean\nestimate: 0.54\nstat_error: 0.01\n"
                                     "significance: {sigma: 4}\n")
    assert f.status == "skip" and f.message == "Cannot recompute the significance; needs threshold."
    (f,) = sig_findings(check_claim, "title: t\nmetric: mean\nestimate: 0.54\nthreshold: 0.5\n")
    assert f.status == "skip" and "stat_error (or interval)" in f.message


def test_an_estimate_below_its_threshold(check_claim):
    text = BOUND + "estimate: 0.4600\nsignificance: {sigma: -4.0, p_value: 0.99997}\n"
    assert [f.status for f in sig_findings(check_claim, text)] == ["pass", "pass", "pass"]
    text = BOUND + "estimate: 0.4600\nsignificance: {sigma: 4.0, p_value: 6.3e-5, sided: two}\n"
    assert [f.status for f in sig_findings(check_claim, text)] == ["pass", "pass", "pass"]


# --- issue 11, item 4: the heavy-output criterion's error convention ----------------------------

HEAVY_40 = """\
title: Invented heavy-output claim on 40 circuits
metric: heavy-output
qubits: 6
estimate: 0.705
stat_error: 0.012
samples: 40000
circuits: 40
threshold: 0.6666667
significance: {required_sigma: 2}
"""


def test_heavy_output_reaching_two_sigma_only_with_shot_noise_is_flagged(check_claim):
    found = check_claim(HEAVY_40, only=["significance"]).findings
    (crit,) = [f for f in found if f.details.get("quantity") == "criterion"]
    # Cross et al., Phys. Rev. A 100, 032328 (2019): sigma = sqrt(h (1 - h)/circuits) at the
    # estimate; (0.705 - 2/3)/sqrt(0.705 x 0.295/40) = 0.532 (hand calculation), far short of 2,
    # while the printed 0.012 gives 3.2.
    assert crit.status == "fail"
    assert crit.details["per_circuit_error"] == pytest.approx(math.sqrt(0.705 * 0.295 / 40))
    assert crit.details["sigma_circuits_low"] < 0.532 < crit.details["sigma_circuits_high"]
    assert crit.details["sigma_printed_low"] > 2
    assert "only with the printed stat_error 0.012" in crit.message


def test_the_criterion_agrees_with_what_plan_expects(check_claim):
    # plan's table for 40 circuits at the expected value 0.705 gives the same per-circuit sigma.
    import io
    import json

    from checker.cli import run

    out = io.StringIO()
    run(["plan", "--metric", "heavy-output", "--fidelity", "0.705", "--circuits", "40", "--json"], out,
        io.StringIO())
    row = next(r for r in json.loads(out.getvalue())["table"] if r["circuits"] == 40)
    found = check_claim(HEAVY_40, only=["significance"]).findings
    (crit,) = [f for f in found if f.details.get("quantity") == "criterion"]
    assert crit.details["sigma_circuits_low"] <= row["expected_sigma"] <= crit.details["sigma_circuits_high"]


def test_heavy_output_criterion_without_a_printed_error_is_computed(check_claim):
    # Heavy output, circuits, threshold and required_sigma: 2, no stat_error: the criterion itself,
    # (0.757 - 2/3)/sqrt(0.757 x 0.243/100) = 2.11 (hand calculation from Cross et al. 2019).
    text = ("title: Invented heavy-output claim\nmetric: heavy-output\nqubits: 6\nestimate: 0.757\n"
            "circuits: 100\nthreshold: 0.6666667\nsignificance: {required_sigma: 2}\n")
    found = check_claim(text, only=["significance"]).findings
    statuses = {f.details.get("quantity"): f for f in found}
    required = statuses["required_sigma"]
    assert required.status == "pass"
    z = (0.757 - 0.6666667) / math.sqrt(0.757 * 0.243 / 100)
    assert required.details["sigma_low"] < z < required.details["sigma_high"]
    assert "criterion" not in statuses  # no second convention to compare


def test_the_central_significance_matches_the_pdg_tail_areas(check_claim):
    # Particle Data Group, Review of Particle Physics, "Statistics", table of Gaussian tail
    # areas (from memory): two-sided 3 sigma 2.7e-3, 5 sigma 5.7e-7; one-sided 5 sigma 2.87e-7.
    import math

    for sided, z, p, rel in (("two", 3, 2.7e-3, 0.01), ("two", 5, 5.7e-7, 0.01), ("one", 5, 2.87e-7, 0.002),
                             ("one", 3, 2.7e-3 / 2, 0.01)):
        report = check_claim(f"title: Invented\nmetric: mean\nestimate: {z}\nstat_error: 1\nsd: 1\n"
                             f"threshold: 0\nsignificance: {{sided: {sided}}}\n", only=["significance"])
        d = next(f.details for f in report.findings if f.statement == "inputs_only")
        assert d["sigma_central"] == pytest.approx(z, rel=1e-12)
        assert 10 ** d["log10_p_central"] == pytest.approx(p, rel=rel)


def test_the_central_significance_uses_the_stated_errors(check_claim):
    import math

    # Quadrature of stat and syst; marginalized gives the same for a Gaussian null (Cousins and
    # Highland 1992); an interval's half-width over 1.96 at 95% (PDG "Statistics").
    for systematics in ("quadrature", "marginalized"):
        report = check_claim("title: Invented\nmetric: mean\nestimate: 0.081\nstat_error: 0.012\nsd: 1\n"
                             f"syst_error: 0.008\nthreshold: 0.03\nsignificance: {{systematics: {systematics}}}\n",
                             only=["significance"])
        d = report.findings[0].details
        assert d["sigma_central"] == pytest.approx(0.051 / math.hypot(0.012, 0.008), rel=1e-12)
    report = check_claim("title: Invented\nmetric: linear-xeb\nestimate: 1.85e-3\nthreshold: 1.0e-3\n"
                         "interval: {low: 1.5e-3, high: 2.2e-3, level: 0.95}\n", only=["significance"])
    d = report.findings[0].details
    assert d["sigma_central"] == pytest.approx(0.85e-3 / (0.35e-3 / 1.959964), rel=1e-6)


# --- issue 11, item 4: the heavy-output criterion's error convention ----------------------------

HEAVY_40 = """\
title: Invented heavy-output claim on 40 circuits
metric: heavy-output
qubits: 6
estimate: 0.705
stat_error: 0.012
samples: 40000
circuits: 40
threshold: 0.6666667
significance: {required_sigma: 2}
"""


def test_heavy_output_reaching_two_sigma_only_with_shot_noise_is_flagged(check_claim):
    found = check_claim(HEAVY_40, only=["significance"]).findings
    (crit,) = [f for f in found if f.details.get("quantity") == "criterion"]
    # Cross et al., Phys. Rev. A 100, 032328 (2019): sigma = sqrt(h (1 - h)/circuits) at the
    # estimate; (0.705 - 2/3)/sqrt(0.705 x 0.295/40) = 0.532 (hand calculation), far short of 2,
    # while the printed 0.012 gives 3.2.
    assert crit.status == "fail"
    assert crit.details["per_circuit_error"] == pytest.approx(math.sqrt(0.705 * 0.295 / 40))
    assert crit.details["sigma_circuits_low"] < 0.532 < crit.details["sigma_circuits_high"]
    assert crit.details["sigma_printed_low"] > 2
    assert "only with the printed stat_error 0.012" in crit.message


def test_the_criterion_agrees_with_what_plan_expects(check_claim):
    # plan's table for 40 circuits at the expected value 0.705 gives the same per-circuit sigma.
    import io
    import json

    from checker.cli import run

    out = io.StringIO()
    run(["plan", "--metric", "heavy-output", "--fidelity", "0.705", "--circuits", "40", "--json"], out,
        io.StringIO())
    row = next(r for r in json.loads(out.getvalue())["table"] if r["circuits"] == 40)
    found = check_claim(HEAVY_40, only=["significance"]).findings
    (crit,) = [f for f in found if f.details.get("quantity") == "criterion"]
    assert crit.details["sigma_circuits_low"] <= row["expected_sigma"] <= crit.details["sigma_circuits_high"]


def test_heavy_output_criterion_without_a_printed_error_is_computed(check_claim):
    # Heavy output, circuits, threshold and required_sigma: 2, no stat_error: the criterion itself,
    # (0.757 - 2/3)/sqrt(0.757 x 0.243/100) = 2.11 (hand calculation from Cross et al. 2019).
    text = ("title: Invented heavy-output claim\nmetric: heavy-output\nqubits: 6\nestimate: 0.757\n"
            "circuits: 100\nthreshold: 0.6666667\nsignificance: {required_sigma: 2}\n")
    found = check_claim(text, only=["significance"]).findings
    statuses = {f.details.get("quantity"): f for f in found}
    required = statuses["required_sigma"]
    assert required.status == "pass"
    z = (0.757 - 0.6666667) / math.sqrt(0.757 * 0.243 / 100)
    assert required.details["sigma_low"] < z < required.details["sigma_high"]
    assert "criterion" not in statuses  # no second convention to compare
