"""``error_level``: what a printed error stands for, converted to one standard error once, when
the claim is built, so every check reads one-sigma errors (issue 16, input side).  Through the
real command line; the normal quantiles from scipy.stats.norm.ppf (a 95% half-width is
Phi^-1(0.975) = 1.959964 standard errors, common practice)."""

from __future__ import annotations

import io
import json

import pytest
from scipy.stats import norm

from checker.cli import run

CLAIM = """\
title: Invented lattice with 95% error bars (invented numbers)
metric: linear-xeb
qubits: 20
estimate: 2.0e-3
stat_error: 0.392e-3
samples: 2.5e7
threshold: 1.0e-3
significance: {{sigma: {sigma}}}
{level}
"""


def check(write_claim, text, *only):
    out, err = io.StringIO(), io.StringIO()
    argv = ["check", str(write_claim(text)), "--json"] + [a for o in only for a in ("--only", o)]
    status = run(argv, out, err)
    return status, (json.loads(out.getvalue())["findings"] if out.getvalue() else None), err.getvalue()


def sigma_finding(found):
    (f,) = [f for f in found if f["statement"] == "sigma_vs_inputs"]
    return f


@pytest.mark.parametrize("level, multiple", [
    ("error_level: 0.95", norm.ppf(0.975)),
    ("error_level: 95%", norm.ppf(0.975)),
    ("error_level: 0.6827", norm.ppf((1 + 0.6827) / 2)),
    ("error_level: 2 sigma", 2.0),
])
def test_the_significance_divides_by_the_one_sigma_error(write_claim, level, multiple):
    z = 1.0e-3 / (0.392e-3 / multiple)
    status, found, _ = check(write_claim, CLAIM.format(sigma=f"{z:.1f}", level=level), "significance")
    f = sigma_finding(found)
    # Over the printed box: estimate [1.95e-3, 2.05e-3], stat_error [0.3915e-3, 0.3925e-3] / multiple.
    low = (1.95e-3 - 1.0e-3) / (0.3925e-3 / multiple)
    high = (2.05e-3 - 1.0e-3) / (0.3915e-3 / multiple)
    assert f["recomputed_range"]["low"] == pytest.approx(low, rel=1e-9)
    assert f["recomputed_range"]["high"] == pytest.approx(high, rel=1e-9)
    assert status == 0 and f["status"] == "pass"


def test_without_error_level_the_same_print_is_flagged(write_claim):
    # 1.0e-3 / 0.392e-3 = 2.55 sigma, not 5.0 (arithmetic); with the 95% level it is 5.0.
    text = CLAIM.format(sigma="5.0, error_at: estimate", level="")
    status, found, _ = check(write_claim, text, "significance")
    assert status == 1 and sigma_finding(found)["status"] == "fail"
    status, found, _ = check(write_claim, text + "error_level: 95%\n", "significance")
    assert status == 0 and sigma_finding(found)["status"] == "pass"


def test_the_error_floor_reads_the_one_sigma_error_and_says_so(write_claim):
    status, found, _ = check(write_claim, CLAIM.format(sigma="5.0", level="error_level: 95%"), "error-floor")
    (f,) = found
    # 0.392e-3 / 1.959964 = 0.2000e-3, and sqrt((1 + 2F - F^2)/2.5e7) = 2.0e-4 at F = 2e-3
    # (Boixo et al. 2018, Nature Physics 14, 595: the Porter-Thomas mixture's variance).
    assert f["status"] == "pass" and f["reported"] == pytest.approx(0.392e-3 / norm.ppf(0.975), rel=1e-12)
    assert "0.392e-3 (95% half-width: 0.2000e-3 at one sigma)" in f["message"]
    assert f["details"]["ratio"] == pytest.approx(1.0, abs=0.01)


def test_json_keeps_the_bare_print_and_gives_the_one_sigma_value_its_own_key(write_claim, tmp_path):
    # Issue 16: printed.text is the print itself; the one standard error is printed.one_sigma
    # (0.1e-3 / 1.959964 = 5.102e-5, scipy.stats.norm.ppf(0.975)), what it stands for
    # printed.error_level, and low/high are the print's own digits (0.05e-3 to 0.15e-3). The
    # floor sqrt((1 + 2F - F^2)/2.5e7) = 2.0e-4 (Boixo et al. 2018) flags the 5.1e-5.
    text = CLAIM.format(sigma="5.0", level="error_level: 95%").replace("0.392e-3", "0.1e-3")
    path = write_claim(text)
    notes, plain = tmp_path / "n.md", tmp_path / "n.txt"
    out = io.StringIO()
    status = run(["check", str(path), "--json", "--only", "error-floor", "--markdown", str(notes),
                  "--plain-text", str(plain)], out, io.StringIO())
    (f,) = json.loads(out.getvalue())["findings"]
    assert status == 1 and f["status"] == "fail"
    printed = f["printed"]
    assert printed["text"] == "0.1e-3" and printed["error_level"] == "95% half-width"
    assert printed["one_sigma"] == pytest.approx(0.1e-3 / norm.ppf(0.975), rel=1e-12)
    assert (printed["low"], printed["high"]) == pytest.approx((0.05e-3, 0.15e-3), rel=1e-12)
    assert printed["log10_value"] == pytest.approx(-4.0, abs=1e-12)
    # The human-readable text still shows both.
    both = "0.1e-3 (95% half-width: 0.0510e-3 at one sigma)"
    assert both in f["message"]
    assert f"   - Printed: statistical error `{both}` (field `stat_error`)." in notes.read_text(encoding="utf-8")
    assert " ".join(plain.read_text(encoding="utf-8").split()).count(f"Printed: statistical error {both}") == 1
    # A number printed at one sigma has null for both keys.
    out = io.StringIO()
    run(["check", str(write_claim(CLAIM.format(sigma="5.0", level=""))), "--json", "--only", "error-floor"],
        out, io.StringIO())
    (f,) = json.loads(out.getvalue())["findings"]
    assert f["printed"]["text"] == "0.392e-3" and f["printed"]["one_sigma"] is None
    assert f["printed"]["error_level"] is None


def test_the_systematic_error_is_converted_too(write_claim):
    # At 95% the one-sigma errors are 0.392e-3 / 1.959964 = 0.2000e-3 and 0.294e-3 / 1.959964 = 0.1500e-3;
    # in quadrature 0.2500e-3, so 1.0e-3 / 0.2500e-3 = 4.0 sigma (arithmetic).
    text = CLAIM.format(sigma="4.0", level="error_level: 0.95").replace(
        "{sigma: 4.0}", "{sigma: 4.0, systematics: quadrature}") + "syst_error: 0.294e-3\n"
    status, found, _ = check(write_claim, text, "significance")
    assert status == 0 and sigma_finding(found)["status"] == "pass"


@pytest.mark.parametrize("level, words", [
    ("2", "(for 2 standard errors write '2 sigma')"),
    ("two sigma", "error_level must be a coverage or a multiple of sigma, got 'two sigma'"),
    ("0", "error_level 0 is not a coverage between 0 and 1"),
])
def test_an_unusable_level_is_one_line(write_claim, level, words):
    status, found, err = check(write_claim, CLAIM.format(sigma="5.0", level=f"error_level: {level}"))
    assert status == 2 and found is None and err.count("\n") == 1
    assert "error_level (line 9): " in err and words in err
