"""``claimcheck plan``: the JSON contract, worked cases, unreachable targets, bad options."""

import pytest

from plan_tools import claimcheck, plan_json


def test_json_keys_follow_the_design():
    data = plan_json("--metric", "proportion", "--fidelity", "0.6", "--threshold", "0.5", "--sigma", "3")
    for key in ("metric", "target_sigma", "power", "samples", "reachable", "best_sigma", "table"):
        assert key in data
    # Chow, Shao and Wang (2008), section 3.1: 0.24 (3 + 0.8416)^2 / 0.1^2 = 354.2 -> 355 samples.
    assert data["samples"] == 355 and data["reachable"] is True
    assert data["power"] == 0.8 and data["best_sigma"] is None  # no systematic, no ceiling
    assert [row["samples"] for row in data["table"]] == sorted(row["samples"] for row in data["table"])
    assert 355 in [row["samples"] for row in data["table"]]


def test_json_keys_in_the_claim_vocabulary_beside_the_first_names():
    # Issue 16: the keys a claim file uses (estimate, required_sigma, syst_error), with the first
    # names kept beside them at the same values. The count is Chow, Shao and Wang (2008), section
    # 3.1 with a systematic: 0.24 (3 + 0.8416)^2 / 0.1^2 = 354.2 -> 355 samples with none; a
    # systematic of 0.005 only adds to it.
    data = plan_json("--metric", "proportion", "--estimate", "0.6", "--threshold", "0.5",
                     "--required-sigma", "3", "--syst-error", "0.005")
    assert (data["estimate"], data["required_sigma"], data["syst_error"]) == (0.6, 3.0, 0.005)
    assert (data["fidelity"], data["target_sigma"], data["syst"]) == (0.6, 3.0, 0.005)
    assert data["samples"] > 355 and data["reachable"] is True
    keys = list(data)
    assert keys.index("estimate") < keys.index("fidelity") and keys.index("required_sigma") < keys.index("target_sigma")


def test_heavy_output_defaults_reproduce_the_minimum_h_table():
    # Cross et al., Phys. Rev. A 100, 032328 (2019), via REFERENCES.md: 100 circuits need a mean
    # heavy-output probability of 0.75293; 200 circuits 0.72949.
    data = plan_json("--metric", "heavy-output", "--fidelity", "0.75293", "--power", "0.5",
                     "--circuits", "200")
    assert data["threshold"] == pytest.approx(2 / 3) and data["target_sigma"] == 2.0
    assert data["circuits"] == 100  # 0.75293 is the minimum mean at 100 circuits
    assert data["at"]["smallest_detectable"] == pytest.approx(0.72949, abs=5e-6)
    row = next(r for r in data["table"] if r["circuits"] == 100)
    assert row["smallest_detectable"] == pytest.approx(0.75293, abs=5e-6)
    assert "samples" not in data


def test_unreachable_target_gives_the_best_sigma():
    status, out, _ = claimcheck("plan", "--metric", "linear-xeb", "--fidelity", "2e-3", "--threshold", "1e-3",
                                "--sigma", "4", "--syst", "3e-4")
    assert status == 0
    assert "4 sigma cannot be reached at any number of samples" in out
    assert "best achievable sigma: 3.33 (with unlimited samples)" in out
    data = plan_json("--metric", "linear-xeb", "--fidelity", "2e-3", "--threshold", "1e-3", "--sigma", "4",
                     "--syst", "3e-4")
    assert data["reachable"] is False and data["samples"] is None
    assert data["best_sigma"] == pytest.approx(10 / 3)


def test_text_names_the_count_and_its_pass_rate():
    status, out, _ = claimcheck("plan", "--metric", "proportion", "--fidelity", "0.6", "--threshold", "0.5",
                                "--sigma", "3")
    assert status == 0
    assert "samples needed: 355 (standard error 0.026, expected 3.85 sigma, passes in 80.1% of such experiments)" in out


def test_qubits_enter_the_linear_xeb_variance():
    # Finite D = 2: E_ideal[x^2] = 6D^2/((D + 1)(D + 2)) (REFERENCES.md, Porter-Thomas moments),
    # which at F = 0 gives Var = 2D/(D + 1) - 1 = 1/3 against 1 in the large-D limit.
    small = plan_json("--metric", "linear-xeb", "--fidelity", "0", "--threshold", "-0.1", "--sigma", "3",
                      "--qubits", "1")
    assert small["per_sample_variance"] == pytest.approx(1 / 3)


@pytest.mark.parametrize("argv, message", [
    (["--metric", "proportion", "--fidelity", "0.6", "--sigma", "3"], "--threshold: is needed for proportion"),
    (["--metric", "mean", "--fidelity", "0.6", "--threshold", "0.5", "--sigma", "3"], "--sd: is needed"),
    (["--metric", "linear-xeb", "--fidelity", "0.1", "--threshold", "0", "--sigma", "3", "--circuits", "50"],
     "--circuits: needs --qubits"),
    (["--metric", "proportion", "--fidelity", "0.6", "--threshold", "0.5", "--sigma", "3", "--circuits", "50"],
     "--circuits: does not apply: proportion counts samples"),
    (["--metric", "proportion", "--fidelity", "1.2", "--threshold", "0.5", "--sigma", "3"], "lies outside [0, 1]"),
    (["--metric", "proportion", "--fidelity", "0.6", "--threshold", "0.5", "--sigma", "3", "--power", "0.3"],
     "argument --power: must lie in [0.5, 1)"),
    (["--metric", "proportion", "--estimate", "nan", "--threshold", "0.5", "--required-sigma", "3"],
     "argument --estimate: must be a finite number"),
    (["--metric", "proportion", "--threshold", "0.5", "--required-sigma", "3"],
     "--estimate: is needed: the value you expect to measure"),
    (["--metric", "proportion", "--estimate", "0.6", "--threshold", "0.5", "--power", "90"],
     "got '90' (for 90 percent, write 90%)"),
    (["--metric", "proportion", "--fidelity", "0.6", "--threshold", "0.5", "--sigma", "3", "--samples", "2.5"],
     "argument --samples: must be a whole number"),
])
def test_bad_options_are_one_line_and_exit_2(argv, message):
    status, out, err = claimcheck("plan", *argv)
    assert status == 2 and out == ""
    assert err.count("\n") == 1 and message in err


def test_option_names_from_the_claim_vocabulary_percentages_and_old_names():
    # The same plan three ways: the claim's names with percentages, the first names, and a
    # negative threshold after its option.  N = p(1-p)(z_Z + z_P)^2/(p - T)^2 is the textbook
    # count (Chow, Shao and Wang, "Sample Size Calculations in Clinical Research", 2008, one-sample
    # proportion); plan's own value is only compared with itself here.
    new = plan_json("--metric", "proportion", "--estimate", "60%", "--threshold", "50%",
                    "--required-sigma", "3", "--power", "80%", "--syst-error", "0.5%")
    old = plan_json("--metric", "proportion", "--fidelity", "0.6", "--threshold", "0.5", "--sigma", "3",
                    "--power", "0.8", "--syst", "0.005")
    assert new == old and new["power"] == 0.8 and new["threshold"] == 0.5
    shifted = plan_json("--metric", "mean", "--estimate", "-0.4", "--threshold", "-0.5", "--required-sigma", "3",
                        "--sd", "0.3")
    assert shifted["threshold"] == -0.5 and shifted["reachable"]
    # A fraction reads exactly, as in claim files.
    assert plan_json("--metric", "heavy-output", "--estimate", "0.75", "--threshold", "2/3")["threshold"] == 2 / 3


def test_help_names_the_options_after_the_claim_and_hides_the_first_names():
    # issue 16: the target level is the claim's required_sigma, the expected value is not
    # always a fidelity.  The first names were documented, so they still work (above), unlisted.
    status, out, _ = claimcheck("plan", "--help")
    assert status == 0
    for name in ("--estimate F", "--required-sigma Z", "--syst-error S", "--power P"):
        assert name in out
    for old in ("--fidelity", "--sigma", "--syst "):
        assert old not in out.replace("--required-sigma", "").replace("--syst-error", "")
    # A percentage and a negative number after their options, through the command line; the
    # textbook count N = sd^2 (z_Z + z_P)^2 / (F - T)^2 = (3 + 0.8416)^2 / 0.3^2 = 164.0 for
    # sd = 1, Z = 3, power 80% (z = 0.8416, scipy.stats.norm.ppf(0.8)); Chow, Shao and Wang,
    # "Sample Size Calculations in Clinical Research" (2008), one-sample mean.
    assert plan_json("--metric", "mean", "--estimate", "-20%", "--threshold", "-0.5", "--sd", "1",
                     "--required-sigma", "3", "--power", "80%")["samples"] == 164
