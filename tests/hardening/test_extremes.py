"""Exact tails and extreme inputs, end to end.

Sigma from 0.01 to 1000 and p from 0.5 down to 1e-300 (and log-p far beyond the
double range) must round-trip to 1e-9 relative through every conversion the tool
makes, and no NaN or Infinity may reach any JSON output.
"""

from __future__ import annotations

import datetime
import io
import json
import math

from hypothesis import given, settings
from hypothesis import strategies as st

from checker.checks import run_checks
from checker.claim import read_claim
from checker.cli import run
from checker.stats.multiplicity import log_bonferroni, log_gross_vitells, log_sidak
from checker.stats.systematics import log_p_marginalized, log_p_quadrature
from checker.stats.tails import log_p_from_sigma, sigma_from_log_p

# Per example: generous for a loaded machine, finite so that a slow path shows (tests/conftest.py).
DEADLINE = datetime.timedelta(seconds=20)

SIGMAS = st.floats(min_value=0.01, max_value=1000.0)
LOG_P = st.floats(min_value=math.log(1e-300), max_value=math.log(0.5))
FAR_LOG_P = st.floats(min_value=-1e12, max_value=-700.0)


def _refuse(token):
    raise AssertionError(f"{token} in JSON output")


@settings(max_examples=300, deadline=DEADLINE)
@given(SIGMAS, st.sampled_from(["one", "two"]))
def test_sigma_round_trips(z, sided):
    back = sigma_from_log_p(log_p_from_sigma(z, sided), sided)
    assert math.isclose(back, z, rel_tol=1e-9)


@settings(max_examples=300, deadline=DEADLINE)
@given(st.one_of(LOG_P, FAR_LOG_P), st.sampled_from(["one", "two"]))
def test_log_p_round_trips(log_p, sided):
    back = log_p_from_sigma(sigma_from_log_p(log_p, sided), sided)
    assert math.isclose(back, log_p, rel_tol=1e-9)


@settings(max_examples=200, deadline=DEADLINE)
@given(st.floats(min_value=1.0, max_value=1000.0), st.integers(min_value=1, max_value=10**6))
def test_corrections_stay_finite_and_ordered_in_the_far_tail(z, trials):
    lp = log_p_from_sigma(z)
    sidak, bonf = log_sidak(lp, trials), log_bonferroni(lp, trials)
    assert math.isfinite(sidak) and math.isfinite(bonf)
    # Sidak never exceeds Bonferroni, and neither falls below the local p.
    assert lp - 1e-12 <= sidak <= bonf + 1e-12
    gv = log_gross_vitells(lp, z, 2.0, 0.5)
    assert math.isfinite(gv) and gv >= lp


@settings(max_examples=60, deadline=DEADLINE)
@given(st.floats(min_value=0.5, max_value=40.0), st.floats(min_value=0.05, max_value=3.0))
def test_marginalized_matches_quadrature_in_the_tail(z_total, ratio):
    # Cousins and Highland (1992): for a Gaussian null the averaged p equals the
    # quadrature p exactly; checked here out to 40 sigma.
    stat, syst = 1.0, ratio
    distance = z_total * math.hypot(stat, syst)
    exact = log_p_quadrature(distance, stat, syst)
    assert math.isclose(log_p_marginalized(distance, stat, syst), exact, rel_tol=1e-7, abs_tol=1e-9)


def _claim(tmp_path, z, digits=12, samples="1000000000000", **extra):
    se = 1e-6
    estimate = z * se
    lp = log_p_from_sigma(z)
    exponent = math.floor(lp / math.log(10))
    mantissa = 10 ** (lp / math.log(10) - exponent)
    p_text = f"{mantissa:.{digits - 1}f}e{exponent}"
    lines = [
        "title: extreme tail (invented)", "metric: linear-xeb", f"estimate: {estimate!r}",
        f"stat_error: {se!r}", f"samples: {samples}", "threshold: 0", "tolerance: 0",
        "significance:", f"  sigma: {z:.9f}", f"  p_value: '{p_text}'",
    ] + [f"{k}: {v}" for k, v in extra.items()]
    path = tmp_path / "claim.yaml"
    path.write_text("\n".join(lines) + "\n")
    return path


@settings(max_examples=40, deadline=DEADLINE)
@given(st.floats(min_value=1.0, max_value=1000.0))
def test_extreme_claims_agree_with_themselves_and_give_finite_json(tmp_path_factory, z):
    path = _claim(tmp_path_factory.mktemp("tail"), z)
    report = run_checks(read_claim(path), ["significance"])
    assert [f.status for f in report.findings] == ["pass", "pass", "pass"], [f.message for f in report.findings]
    out = io.StringIO()
    run(["check", str(path), "--json"], out, io.StringIO())
    json.loads(out.getvalue(), parse_constant=_refuse)


def test_p_beyond_the_double_range_is_compared_in_log_space(tmp_path):
    # 200 sigma: p = 10^-8690; its printed text must keep its size.
    path = _claim(tmp_path, 200.0, digits=4)
    report = run_checks(read_claim(path), ["significance"])
    assert all(f.status == "pass" for f in report.findings)
    # The same claim with p a factor 2 off (a sidedness slip) is caught.
    text = path.read_text()
    lp = log_p_from_sigma(200.0) + math.log(2.0)
    exponent = math.floor(lp / math.log(10))
    doubled = f"{10 ** (lp / math.log(10) - exponent):.3f}e{exponent}"
    start = text.index("p_value: '") + len("p_value: '")
    path.write_text(text[:start] + doubled + text[text.index("'", start):])
    slip = run_checks(read_claim(path), ["significance"])
    # The claim states no sidedness, so the slip is a note naming the two-sided convention.
    assert slip.findings[0].status == "warn"
    assert dict(slip.findings[0].reproduced_by) == {"sided": "two"}


def test_huge_samples_and_tiny_errors(tmp_path):
    path = tmp_path / "claim.yaml"
    path.write_text("title: huge (invented)\nmetric: proportion\nestimate: 0.5000012\n"
                    "stat_error: 5.0e-7\nsamples: 1000000000000\nthreshold: 0.5\n"
                    "significance: {sigma: 2.4}\n")
    out = io.StringIO()
    assert run(["check", str(path), "--json"], out, io.StringIO()) == 0
    data = json.loads(out.getvalue(), parse_constant=_refuse)
    floor = next(f for f in data["findings"] if f["check"] == "error-floor")
    # sqrt(0.25 / 1e12) = 5e-7 exactly (binomial standard error, common practice).
    assert math.isclose(floor["recomputed"], 5.0e-7, rel_tol=1e-5)
