"""Shared helpers for the renderer tests: the example claims, their reports,
and hand-built findings for the checks that another branch is adding
(combination, heterogeneity, error-budget).

The hand-built findings follow the details contract those checks promise.
Their numbers are not invented: they are computed here, outside the project,
with statsmodels (combine_effects: fixed effect, DerSimonian-Laird, Paule-Mandel)
and scipy, so the pictures show what the real checks will report.
"""

from __future__ import annotations

import math
import os
from pathlib import Path

from checker.checks import run_checks
from checker.claim import read_claim
from checker.report import Finding, Report, Shown

HERE = Path(__file__).resolve().parent
CLAIMS = HERE / "claims"
GOLDEN = HERE / "golden"

# The four checks on the base branch; naming them keeps the golden files stable
# when other checks join the registry.
BASE_CHECKS = ("bounds", "error-floor", "significance", "look-elsewhere")


def load(name: str, monkeypatch):
    """Read a claim from tests/render/claims with a short, machine-independent
    file name in the report."""
    monkeypatch.chdir(CLAIMS)
    return read_claim(name)


def combination_findings(claim) -> list[Finding]:
    """The combination and heterogeneity findings for a claim with parts,
    computed with statsmodels (Viechtbauer 2010 and DerSimonian and Laird 1986
    define the methods; statsmodels is the reference implementation here)."""
    import numpy as np
    from scipy.stats import chi2
    from statsmodels.stats.meta_analysis import combine_effects

    est = np.array([p.estimate.value for p in claim.parts])
    err = np.array([p.stat_error.value for p in claim.parts])
    samples = np.array([p.samples.value for p in claim.parts])
    dl = combine_effects(est, err ** 2, method_re="chi2")
    pm = combine_effects(est, err ** 2, method_re="iterated")
    w = samples / samples.sum()
    methods = {
        "equal": {"estimate": float(est.mean()), "stat_error": float(math.sqrt((err ** 2).sum()) / len(err))},
        "samples": {"estimate": float((w * est).sum()), "stat_error": float(math.sqrt((w ** 2 * err ** 2).sum()))},
        "inverse-variance": {"estimate": float(dl.mean_effect_fe), "stat_error": float(dl.sd_eff_w_fe)},
        "random-effects": {"estimate": float(dl.mean_effect_re), "stat_error": float(dl.sd_eff_w_re)},
        "paule-mandel": {"estimate": float(pm.mean_effect_re), "stat_error": float(pm.sd_eff_w_re)},
    }
    c = claim.combination
    stated = methods[c.method]
    combo = Finding(
        "fail",
        f"Printed combination {c.estimate.text} ± {c.stat_error.text} under {c.method}, but the parts "
        f"give {stated['estimate']:.3g} ± {stated['stat_error']:.2g}; inverse-variance weights give "
        f"{methods['inverse-variance']['estimate']:.3g} ± {methods['inverse-variance']['stat_error']:.2g}.",
        reported=c.stat_error.value, recomputed=stated["stat_error"],
        reproduced_by={"method": "inverse-variance"}, field="combination.stat_error", statement="combined",
        printed=Shown.of(c.stat_error),
        details={"summary": True, "method": c.method, "methods": methods,
                 "printed": {"estimate": c.estimate.value, "stat_error": c.stat_error.value}},
        check="combination")
    q, df = float(dl.q), len(est) - 1
    p_q = float(chi2.sf(q, df))
    h = math.sqrt(q / df)
    het = Finding(
        "fail" if p_q < 0.01 else "pass",
        f"Cochran's Q = {q:.3g} on {df} degrees of freedom (p = {p_q:.2g}, I^2 = {100 * max(0.0, (q - df) / q):.0f}%): "
        "the parts disagree more than their errors allow, and the combined error was not scaled for it.",
        reported=None, recomputed=q, field="combination.stat_error", statement="scatter_not_allowed",
        printed=Shown.of(c.stat_error),
        details={"Q": q, "df": df, "p_Q": p_q, "I2": max(0.0, (q - df) / q), "H": h,
                 "scale_factor": max(1.0, h), "tau2": float(dl.tau2)},
        check="heterogeneity")
    return [combo, het]


def budget_finding(claim) -> Finding:
    """The error-budget finding: survival (1 - e) ** n per component, their
    product, its delta-method standard deviation, and exp(-sum n e)
    (common practice for component error models)."""
    comps, log_var = [], 0.0
    predicted, total = 1.0, 0.0
    for item in claim.error_budget:
        n, e = item.count.value, item.error.value
        surv = (1.0 - e) ** n
        comps.append({"name": item.name, "count": n, "error": e, "survival": surv})
        predicted *= surv
        total += n * e
        if item.error_sd is not None:
            log_var += (n * item.error_sd.value / (1.0 - e)) ** 2
    measured = claim.estimate.value
    ratio = measured / predicted
    return Finding(
        "warn" if not 0.5 <= ratio <= 2.0 else "pass",
        f"The error budget predicts {predicted:.3g} ± {predicted * math.sqrt(log_var):.2g}; the measured "
        f"{claim.estimate.text} is {ratio:.2g} times that.",
        reported=measured, recomputed=predicted, field="estimate", statement="budget",
        printed=Shown.of(claim.estimate),
        details={"components": comps, "predicted": predicted,
                 "predicted_sd": predicted * math.sqrt(log_var),
                 "predicted_exponential": math.exp(-total), "measured": measured, "ratio": ratio},
        check="error-budget")


def sidedness_report(monkeypatch):
    claim = load("sidedness_slip.yaml", monkeypatch)
    return run_checks(claim, BASE_CHECKS), claim


def four_parts_report(monkeypatch):
    """The multi-part claim: the base checks plus the hand-built combination,
    heterogeneity and error-budget findings."""
    claim = load("four_parts.yaml", monkeypatch)
    base = run_checks(claim, BASE_CHECKS)
    extra = tuple(combination_findings(claim)) + (budget_finding(claim),)
    return Report(base.title, base.file, base.findings + extra), claim


def refresh_requested() -> bool:
    """Golden files are rewritten only on purpose: CLAIMCHECK_REFRESH_GOLDEN=1."""
    return os.environ.get("CLAIMCHECK_REFRESH_GOLDEN") == "1"
