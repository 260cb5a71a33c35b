"""The claim's printed numbers beside the numbers the raw data give.

Findings (check ids of their own, statuses as for the claim checks):

* ``raw-estimate``: the printed estimate against the raw estimate; ``pass``
  when the print reproduces it or lies within one standard error of it,
  ``warn`` within three, ``fail`` beyond; ``reproduced_by`` names another
  estimator (finite-D corrected, maximum likelihood, another metric) that
  reproduces the print when the stated one does not;
* ``raw-error``: the printed statistical error against the data's; ``fail``
  when it is smaller than sampling alone allows, ``warn`` when over three
  times larger, or when the circuits scatter more than their samples explain;
* ``raw-samples`` and ``raw-circuits``: the printed counts against the rows
  and the distinct circuits;
* ``raw-model``: the goodness of fit of the Porter-Thomas mixture at the fitted
  fidelity (``warn`` below p = 0.01: the model the error bars lean on is in
  doubt).

:func:`claim_with_raw_numbers` returns the claim with the raw estimate, error
and counts in place of the printed ones, so every claim check can also run
on the data's own numbers.
"""

from __future__ import annotations

import math
from dataclasses import replace
from typing import Iterator

from .. import wording
from ..claim.model import Claim, Reported
from ..report import Finding
from ..stats.precision import agrees, gap
from .result import RawResult

WARN_SIGMA = 3.0
ERROR_WARN_RATIO = 3.0
MODEL_P = 0.01


_num = wording.num


def _target(claim: Claim):
    """(printed estimate, printed error, factor bounds, what) the raw estimate is compared with."""
    if claim.extrapolation is not None and claim.combination is not None and claim.combination.estimate is not None:
        return claim.combination.estimate, claim.combination.stat_error, (1.0, 1.0), "combined estimate"
    if claim.extrapolation is not None:
        return claim.estimate, claim.stat_error, claim.extrapolation.factor.bounds, "headline (raw x factor)"
    return claim.estimate, claim.stat_error, (1.0, 1.0), "estimate"


def _alternatives(claim: Claim, result: RawResult) -> dict:
    """Other estimators' values, by the name a finding would give them."""
    out = {}
    head = result.headline
    fd = head.extra.get("fidelity_finite_d")
    if fd is not None and head.estimate is not None and abs(fd - head.estimate) > 0:
        out["finite-D corrected"] = fd
    ml = result.fit("maximum-likelihood")
    if ml is not None and result.metric != "heavy-output":
        out["maximum likelihood"] = ml.fidelity
    for name, est in result.combined.items():
        if name != result.metric and est.estimate is not None and name != "heavy-output":
            out[name] = est.estimate
    return out


def _estimate(claim: Claim, result: RawResult) -> Iterator[Finding]:
    printed, _, factor, what = _target(claim)
    head = result.headline
    tol = claim.tolerance
    if head.estimate is None:
        yield Finding("skip", f"The raw data give no {result.metric} estimate ({head.note}).")
        return
    if printed is None:
        yield Finding("skip", "The claim prints no estimate to compare with the data's.")
        return
    raw = (head.estimate * factor[0], head.estimate * factor[1])
    raw = (min(raw), max(raw))
    se = head.stat_error_data or head.stat_error
    se = se * max(factor) if se else None
    mid = 0.5 * (raw[0] + raw[1])
    details = {"metric": result.metric, "compared_with": what, "raw_low": raw[0], "raw_high": raw[1],
               "raw_stat_error": se, "tolerance": tol}
    base = f"Printed {what} {printed.text} against {_num(mid, 4)} from {result.rows:,} raw samples"
    if agrees(printed.bounds, raw, tol):
        yield Finding("pass", f"{base}: the data reproduce it.", reported=printed.value, recomputed=mid,
                      details=details)
        return
    distance = gap(printed.bounds, raw)
    z = distance / se if se else math.inf
    details["standard_errors"] = z
    other = None
    for name, value in _alternatives(claim, result).items():
        iv = (value * factor[0], value * factor[1])
        if agrees(printed.bounds, (min(iv), max(iv)), tol):
            other = name
            break
    tail = f"; the {other} estimator reproduces the print" if other else ""
    reproduce = {"estimator": other} if other else None
    if z <= 1.0:
        yield Finding("pass", f"{base}: {_num(z, 2)} standard errors apart, within its error{tail}.",
                      reported=printed.value, recomputed=mid, reproduced_by=reproduce, details=details)
    elif z <= WARN_SIGMA:
        yield Finding("warn", f"{base}: {_num(z, 2)} standard errors apart{tail}; are these the data behind the "
                      "print?", reported=printed.value, recomputed=mid, reproduced_by=reproduce, details=details)
    else:
        yield Finding("fail", f"{base}: {_num(z, 2)} standard errors apart{tail or '; no estimator tried reproduces it'}.",
                      reported=printed.value, recomputed=mid, reproduced_by=reproduce, details=details)


def _error(claim: Claim, result: RawResult) -> Iterator[Finding]:
    _, printed, factor, what = _target(claim)
    head = result.headline
    if printed is None:
        yield Finding("skip", "No statistical error is printed to compare with the data's.")
        return
    if head.stat_error_data is None:
        yield Finding("skip", "The raw data give no standard error (fewer than two samples).")
        return
    tol = claim.tolerance
    f = max(factor)
    data = head.stat_error_data * f
    cluster = head.extra.get("stat_error_circuits")
    cluster = cluster * f if cluster else None
    model = head.stat_error * f if head.stat_error else None
    n = max(result.rows, 1)
    # The data's standard error is itself uncertain, by about sqrt(2/N)
    # relative for near-exponential data ((kurtosis - 1)/4 = 2); allow three of those.
    slack = 3.0 * math.sqrt(2.0 / n)
    details = {"metric": result.metric, "stat_error_data": data, "stat_error_circuits": cluster,
               "stat_error_model": model, "tolerance": tol, "slack": slack}
    ratio = printed.value / data
    details["ratio"] = ratio
    words = (f"Printed stat_error {printed.text} against {_num(data)} from the data's scatter "
             f"(model {_num(model)}{', between circuits ' + _num(cluster) if cluster else ''})")
    candidates = {"data": data, "between circuits": cluster, "model": model}
    match = next((k for k, v in candidates.items() if v and agrees(printed.bounds, (v, v), tol)), None)
    if data * (1 - slack) - printed.high > tol * printed.value:
        yield Finding("fail", f"{words}: smaller than sampling alone allows ({_num(ratio, 2)}x)"
                      f"{'; it matches the ' + match + ' error' if match else ''}.",
                      reported=printed.value, recomputed=data,
                      reproduced_by={"error": match} if match else None, details=details)
        return
    if cluster and cluster > data * (1 + 3.0 / math.sqrt(2.0 * max(result.circuit_count - 1, 1))) \
            and cluster - printed.high > tol * printed.value:
        yield Finding("warn", f"{words}: the circuits scatter more than their samples explain, and the printed "
                      f"error does not include it ({_num(printed.value / cluster, 2)}x the between-circuit error).",
                      reported=printed.value, recomputed=cluster, details=details)
        return
    if printed.low - ERROR_WARN_RATIO * max(v for v in candidates.values() if v) > tol * printed.value:
        yield Finding("warn", f"{words}: {_num(ratio, 2)}x larger than the data need; the print may include more "
                      "than sampling.", reported=printed.value, recomputed=data, details=details)
        return
    tail = f"; it is the {match} error" if match else f" ({_num(ratio, 2)}x the data's)"
    yield Finding("pass", f"{words}: consistent{tail}.", reported=printed.value, recomputed=data,
                  reproduced_by={"error": match} if match and match != "data" else None, details=details)


def _count(printed: Reported | None, actual: int, name: str, tol: float, have: bool) -> Iterator[Finding]:
    if printed is None:
        yield Finding("skip", f"No {name} count is printed to compare with the data.")
        return
    if not have:
        yield Finding("skip", f"The data file has no circuit column, so the printed {printed.text} {name} "
                      "cannot be counted.")
        return
    details = {"printed_low": printed.low, "printed_high": printed.high, "tolerance": tol}
    if agrees(printed.bounds, (actual, actual), tol):
        yield Finding("pass", f"Printed {printed.text} {name}; the data hold {actual:,}.",
                      reported=printed.value, recomputed=float(actual), details=details)
    else:
        yield Finding("fail", f"Printed {printed.text} {name}, but the data hold {actual:,}.",
                      reported=printed.value, recomputed=float(actual), details=details)


def _model(result: RawResult) -> Iterator[Finding]:
    fitted = [t for t in result.goodness_of_fit if t.at == "fitted"]
    if not fitted:
        yield Finding("skip", "No goodness-of-fit test was run.")
        return
    worst = min(fitted, key=lambda t: t.p_value)
    details = {t.test: {"statistic": t.statistic, "p_value": t.p_value} for t in fitted}
    details["fidelity"] = worst.fidelity
    details["samples"] = worst.samples
    text = ", ".join(f"{t.test} p = {_num(t.p_value, 2)}" for t in fitted)
    if worst.p_value < MODEL_P:
        yield Finding("warn", f"The Porter-Thomas mixture at the fitted fidelity {_num(worst.fidelity)} does not "
                      f"describe the data ({text}); error bars from that model are in doubt.",
                      recomputed=worst.p_value, details=details)
    else:
        yield Finding("pass", f"The Porter-Thomas mixture at the fitted fidelity {_num(worst.fidelity)} fits the "
                      f"data ({text}).", recomputed=worst.p_value, details=details)


def raw_findings(claim: Claim, result: RawResult) -> list[Finding]:
    """Findings comparing the claim's printed numbers with the raw data's."""
    out = []
    for check, found in (("raw-estimate", _estimate(claim, result)), ("raw-error", _error(claim, result)),
                         ("raw-samples", _count(claim.samples, result.rows, "samples", claim.tolerance, True)),
                         ("raw-circuits", _count(claim.circuits, result.circuit_count, "circuits",
                                                 claim.tolerance, result.extra.get("has_circuit", True))),
                         ("raw-model", _model(result))):
        out.extend(f.from_check(check) for f in found)
    return out


def _reported(value: float, path: str) -> Reported:
    return Reported(float(value), float(value), float(value), _num(value, 4), path)


def _like(value: float, printed: Reported | None, path: str) -> Reported:
    """``value`` as the claim would have printed it: rounded to the printed
    field's last digit, with the interval those digits stand for.  Exact
    when the field is not printed."""
    if printed is None or printed.exact:
        return _reported(value, path)
    step = printed.high - printed.low  # one unit in the last printed digit
    if not step > 0 or not math.isfinite(value):
        return _reported(value, path)
    rounded = round(value / step) * step
    decimals = max(0, -math.floor(math.log10(step) + 1e-9))
    text = f"{rounded:.{decimals}f}" if abs(value) >= 1e-4 or value == 0 else f"{rounded:.3g}"
    return Reported(rounded, rounded - step / 2.0, rounded + step / 2.0, text, path)


def claim_with_raw_numbers(claim: Claim, result: RawResult) -> Claim | None:
    """The claim with its estimate, error and counts taken from the data, each
    rounded to the digits the claim printed it with; None when the headline is
    not the raw estimate itself (an extrapolation)."""
    if claim.extrapolation is not None:
        return None
    head = result.headline
    if head.estimate is None:
        return None
    changes = {"estimate": _like(head.estimate, claim.estimate, "estimate"),
               "samples": _reported(result.rows, "samples")}
    # Over several circuits the data's own error is the between-circuit one: it holds the
    # circuits' spread, which the per-sample error leaves out.
    data_error = head.extra.get("stat_error_circuits") or head.stat_error_data
    if data_error:
        changes["stat_error"] = _like(data_error, claim.stat_error, "stat_error")
    if result.extra.get("has_circuit", True):
        changes["circuits"] = _reported(result.circuit_count, "circuits")
    return replace(claim, interval=None, **changes)


def with_raw_label(finding: Finding) -> Finding:
    """A claim-check finding computed from the raw numbers, marked as such."""
    return replace(finding, message=f"With the raw data's numbers: {finding.message}",
                   details={**finding.details, "numbers": "raw"})
