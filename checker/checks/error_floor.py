"""``error-floor``: the standard error that sampling alone implies.

With N samples and a per-sample variance v from the metric model, no honest
analysis can print a statistical error below sqrt(v / N).  When the claim
also says how many circuits K the samples come from, each circuit's own mean
scatters about the ensemble's by B (the metric model's circuit variance,
about 4 F^2/D for linear XEB), and the floor is sqrt(v / N + B (1/K - 1/N))
(checker.stats.porter_thomas).  One far above it (more than 3x) is not
impossible (drifts, a conservative analysis) but deserves a sentence in the
paper.
"""

from __future__ import annotations

import math
from typing import Iterator

from ..claim.model import Claim, Reported
from ..report import Finding, Shown, Span
from ..stats.precision import agrees, error_of_the_mean, over_box
from ..stats.ranges import sampling_error_range, scalar_range
from ..wording import and_list, num, span_text
from .common import fewer_samples_than_circuits, flagged_error, skipped_words, above, below, count_for_error, metric_of, model_inputs
from .spec import ABOUT_THE_CLAIM, CheckSpec, Statement

WARN_RATIO = 3.0


def _floor(claim: Claim, estimate: Reported, n: Reported, factor: tuple[float, float],
           circuits: Reported | None = None):
    """The floor's exact range over the printed box (``stats.ranges.sampling_error_range``:
    the variance's own extremes over the estimate's interval, not its corners).

    With ``circuits`` K the variance of the mean is (v + B (N/K - 1)) / N, which falls
    with N and with K at every value: the floor's low end is at the largest N and K,
    its high end at the smallest, each searched over the value's interval."""
    model = metric_of(claim)
    lows, highs = [], []
    # The variance rises with sd (metric mean), so its two ends bound it.
    for sd in sorted(set(claim.sd.bounds)) if claim.sd is not None else (None,):
        inputs = model_inputs(claim, sd=sd)
        if circuits is None or model.count_field != "samples":
            low, high = sampling_error_range(lambda v: model.variance(v, inputs),
                                             lambda a, b: model.variance_range(a, b, inputs),
                                             estimate.bounds, n.bounds, factor)
        else:
            ends = []
            for count, k in ((n.high, circuits.high), (n.low, circuits.low)):
                stretch = count / min(k, count) - 1.0 if k > 0 else 0.0

                def v_eff(v, stretch=stretch):
                    var = model.variance(v, inputs)
                    return None if var is None else var + model.circuit_variance(v, inputs) * stretch

                ends.append(sampling_error_range(v_eff, lambda a, b, f=v_eff: scalar_range(f, a, b),
                                                 estimate.bounds, (count, count), factor))
            low, high = ends[0][0], ends[1][1]
        lows.append(low)
        highs.append(high)
    if not all(math.isfinite(v) for v in lows + highs):
        return (math.nan, math.nan)
    return (min(lows), max(highs))


# An honest analysis estimates the circuits' spread from K circuit means, whose
# sample variance is (B + W/S) chi^2_{K-1}/(K-1) under Gaussian statistics
# (common practice): a printed error is flagged only below the floor with B/K
# scaled by this quantile of chi^2_{K-1}/(K-1), which about one honest
# analysis in a thousand undercuts.
PLAUSIBLE_QUANTILE = 0.001


def _spread_quantile(circuits: float) -> float:
    """The PLAUSIBLE_QUANTILE quantile of chi^2_{K-1}/(K-1); 0 for one circuit."""
    if not circuits >= 1.5:
        return 0.0
    if circuits > 1e12:  # the quantile is 1 to within 1e-5
        return 1.0
    from scipy.stats import chi2

    dof = float(round(circuits)) - 1.0
    return float(chi2.ppf(PLAUSIBLE_QUANTILE, dof)) / dof


def _plausible_floor(claim: Claim, estimate: Reported, n: Reported, factor: tuple[float, float],
                     circuits: Reported) -> tuple[float, float]:
    """The floor with the circuit term B/K scaled by :func:`_spread_quantile`:
    V/N + B (q/K - 1/N), which is the floor of K/q circuits (V/N when that
    exceeds N)."""
    q = _spread_quantile(circuits.value)
    scaled = Reported(math.inf, math.inf, math.inf, circuits.text, circuits.path) if q == 0 else \
        Reported(circuits.value / q, circuits.low / q, circuits.high / q, circuits.text, circuits.path)
    return _floor(claim, estimate, n, factor, scaled)


def _count_for(variance: float | None, scale: float, error: float, between: float = 0.0,
               circuits: float | None = None) -> float | None:
    """The count N with sqrt(variance / N + between (1/K - 1/N)) x scale = error;
    None when there is none (no variance, no positive error, an error the K
    circuits alone exceed, or an N beyond the double range)."""
    if not variance or not error > 0:
        return None
    ratio = error / scale
    room = ratio * ratio - (between / circuits if circuits else 0.0)  # x * x overflows to inf, x ** 2 raises
    within = variance - (between if circuits else 0.0)
    if not room > 0 or not within > 0:
        return None
    n = within / room
    return n if math.isfinite(n) else None


def _circuits_for(variance: float, between: float, scale: float, error: float, samples: float) -> float | None:
    """The circuits K with sqrt(variance / N + between (1/K - 1/N)) x scale = error at N samples."""
    ratio = error / scale
    room = ratio * ratio - (variance - between) / samples
    if not between > 0 or not room > 0:
        return None
    k = between / room
    return k if math.isfinite(k) else None


def _sd_reading(claim: Claim, error: Reported, n: Reported, details: dict) -> Finding | None:
    """A mean's printed error that equals its sd (the spread of the runs printed as the error
    of the mean) or sd x sqrt(n) (the value printed as the sd is in fact the error of the mean),
    and not sd / sqrt(n): a warn naming which.  None when the error reads as the error of the mean,
    matches neither, or n < 2 (then the readings coincide)."""
    sd = claim.sd
    if sd is None or not n.low >= 2 or not sd.value > 0:
        return None
    tol = claim.tolerance
    ranges = {"error of the mean": error_of_the_mean(sd.bounds, n.bounds),
              "sd": sd.bounds,
              "sd times root n": over_box(lambda s, k: s * math.sqrt(k), [sd.bounds, n.bounds])}
    matches = [name for name, r in ranges.items() if agrees(error.bounds, r, tol)]
    if not matches or "error of the mean" in matches:
        return None
    name = matches[0]
    mean_error = ranges["error of the mean"]
    facts = {**details, "reading": name, "error_of_the_mean_low": mean_error[0],
             "error_of_the_mean_high": mean_error[1], "sd_times_root_n_low": ranges["sd times root n"][0],
             "sd_times_root_n_high": ranges["sd times root n"][1], "tolerance": tol}
    about = {"field": error.path, "printed": Shown.of(error), "recomputed_range": Span(*mean_error),
             "tolerance": tol, "reported": error.value, "recomputed": (mean_error[0] + mean_error[1]) / 2}
    if name == "sd":
        return Finding("warn", f"Headline: printed stat_error {error.text} equals the printed sd {sd.text}: the "
                       f"spread of the {n.text} runs printed as the error of the mean, which is sd/sqrt({n.text}) "
                       f"= {span_text(mean_error)}.", reproduced_by={"error_reading": "sd"}, details=facts,
                       statement="error_is_sd", **about)
    return Finding("warn", f"Headline: printed stat_error {error.text} is the printed sd {sd.text} times "
                   f"sqrt({n.text}) ({span_text(ranges['sd times root n'])}): the value printed as the sd looks "
                   f"like the error of the mean, and the stat_error like the spread of the runs; read as printed "
                   f"the error of the mean is {span_text(mean_error)}.",
                   reproduced_by={"error_reading": "sd times root n"}, details=facts, statement="sd_is_error",
                   **about)


# The per-sample variance each model uses, in words, for the implied count's sentence
# (the formulas of checker.stats.porter_thomas and checker.stats.binomial).
VARIANCE_WORDS = {
    "linear-xeb": "per-sample variance 1 + 2F - F^2 under the Porter-Thomas mixture",
    "log-xeb": "per-sample variance pi^2/6 - F^2 under the Porter-Thomas mixture",
    "heavy-output": "variance h(1 - h) per circuit",
    "proportion": "binomial variance p(1 - p) per item",
    "mean": "the printed per-sample sd",
}


def _implied_count(claim: Claim, estimate: Reported, error: Reported, factor: tuple[float, float],
                   what: str, details: dict, circuits: Reported | None) -> Finding | None:
    """No count printed: the count the printed error implies under the metric model, for the
    reader to hold against what the paper says it took (N = v / (error / factor)^2, or with K
    circuits the N of sqrt(v/N + B (1/K - 1/N)) = error / factor).  None when the model
    cannot say (an input it needs is missing, or the error is not above zero)."""
    model = metric_of(claim)
    if any(getattr(claim, f) is None for f in model.needs()) or not error.value > 0:
        return None
    count_name = model.count_field
    k = circuits.value if (circuits is not None and count_name == "samples") else None
    inputs = model_inputs(claim, circuits=k)
    mid = estimate.value / factor[0]
    v_mid = model.variance(mid, inputs)
    b_mid = model.circuit_variance(mid, inputs) if k else 0.0
    central = _count_for(v_mid, factor[0], error.value, b_mid, k)
    if central is None:
        return None
    if k is None:
        # N = v / (e / f)^2 rises with v and f and falls with e: its range over the printed box
        # from the variance's own extremes over the estimate's interval.
        v_low, v_high = model.variance_range(estimate.low / factor[1], estimate.high / factor[0], inputs) \
            if factor[0] > 0 else (v_mid, v_mid)
        low = v_low * (factor[0] / error.high) ** 2 if error.high > 0 else math.nan
        high = v_high * (factor[1] / error.low) ** 2 if error.low > 0 else math.inf
    else:
        low = high = central
    if not (math.isfinite(low) and math.isfinite(high)):
        low = high = central
    with_k = f" from {circuits.text} circuits" if k else ""
    spread = "" if num(low, 2) == num(high, 2) else f" ({span_text((low, high), 3)} within the printed precision)"
    return Finding("info", f"{what}: no {count_name} are printed; the printed stat_error {error.text} on "
                   f"{estimate.text} implies about {num(central, 2)} {count_name}{with_k}{spread} under the "
                   f"{model.name} model ({VARIANCE_WORDS.get(model.name, 'its per-sample variance')}): "
                   f"compare with what the paper says it took.",
                   recomputed=central, details={**details, "count_field": count_name, "implied": central,
                                                "implied_low": low, "implied_high": high,
                                                "missing": [count_name]},
                   field=error.path, statement="implied_count", printed=Shown.of(error),
                   recomputed_range=Span(low, high))


def _one(claim: Claim, estimate: Reported, error: Reported | None, n: Reported | None,
         factor: tuple[float, float], what: str, details: dict,
         samples: Reported | None = None, circuits: Reported | None = None) -> Iterator[Finding]:
    """``n`` is the count of the metric's error convention; ``samples``, when it
    is a different count (heavy output: circuits vs. all shots), sets the floor
    that sampling alone imposes; ``circuits``, the circuits the samples come
    from, adds the circuit-to-circuit term."""
    model = metric_of(claim)
    if flagged_error(error):
        yield Finding("skip", f"{what}: no floor compared; {skipped_words(error)}.",
                      details={**details, "skipped_input": error.path}, statement="needs_inputs")
        return
    total = samples if samples is not None else n
    if fewer_samples_than_circuits(total, circuits):
        yield Finding("skip", f"{what}: no floor compared; {total.text} samples from {circuits.text} circuits "
                      "are not used: the physical-range check flags them.",
                      details={**details, "skipped_input": total.path}, statement="needs_inputs")
        return
    if error is not None and n is None:
        implied = _implied_count(claim, estimate, error, factor, what, details, circuits)
        if implied is not None:
            yield implied
            return
    if error is None or n is None:
        missing = (["stat_error"] if error is None else []) + ([model.count_field] if n is None else [])
        missing += [f for f in model.needs() if getattr(claim, f) is None]  # the mean model's sd
        yield Finding("skip", f"{what}: no floor to compare with; needs {and_list(missing)}.",
                      details={**details, "missing": missing}, statement="needs_inputs")
        return
    missing = [f for f in model.needs() if getattr(claim, f) is None]
    if missing:
        yield Finding("skip", f"{what}: the {model.name} model needs {', '.join(missing)}.",
                      details={**details, "missing": missing}, statement="needs_inputs")
        return
    reading = _sd_reading(claim, error, n, details) if claim.metric == "mean" else None
    if reading is not None:
        yield reading
        return
    model_circuits = circuits if (circuits is not None and model.count_field == "samples") else None
    low, high = _floor(claim, estimate, n, factor, model_circuits)
    if not math.isfinite(low) or not high > 0:
        # e.g. a proportion printed as 1 (or beyond it, which bounds reports): no sampling error
        yield Finding("skip", f"{what}: the model gives no positive error here.", details=details,
                      statement="no_model_error")
        return
    tol = claim.tolerance
    count_name = "circuits" if n.path.endswith("circuits") else "samples"
    # Var(mean over circuits of s shots) = Var(h_c)/n + E[h_c (1 - h_c)]/(n s) >= h (1 - h)/(n s):
    # the binomial error over all shots is a true floor, the per-circuit one only a convention
    # (Baldwin et al., arXiv:2110.14808: it over-covers at typical shot counts).
    hard = _floor(claim, estimate, samples, factor) if samples is not None else (low, high)
    if not math.isfinite(hard[0]):
        hard = (low, high)
    plausible = (low, high)
    if model_circuits is not None:
        plausible = _plausible_floor(claim, estimate, n, factor, model_circuits)
    k_mid = model_circuits.value if model_circuits is not None else None
    mid_inputs = model_inputs(claim, circuits=k_mid)
    v_mid = model.variance(estimate.value / factor[0], mid_inputs)
    b_mid = model.circuit_variance(estimate.value / factor[0], mid_inputs) if k_mid else 0.0
    implied_n = _count_for(v_mid, factor[0], error.value, b_mid, k_mid)
    facts = {**details, "floor_low": low, "floor_high": high, "printed_low": error.low,
             "printed_high": error.high, "tolerance": tol, "count_field": count_name}
    if k_mid:
        facts["circuits"] = k_mid
        facts["circuit_variance"] = b_mid
    ratio = error.value / ((low + high) / 2)
    facts["ratio"] = ratio
    reproduce = {count_name: round(implied_n)} if implied_n is not None else None
    needed = (f"it would take about {num(implied_n, 2)} {count_name}" if implied_n is not None
              else f"no number of {count_name} would reach it under the model")
    if implied_n is None and k_mid and v_mid:
        # No sample count reaches the print with K circuits: say how many circuits would.
        implied_k = _circuits_for(v_mid, b_mid, factor[0], error.value, n.value)
        reproduce = {"circuits": round(implied_k)} if implied_k is not None else None
        needed = (f"it would take about {num(implied_k, 2)} circuits (no number of samples from "
                  f"{model_circuits.text} suffices)" if implied_k is not None
                  else f"no number of samples from {model_circuits.text} circuits would reach it, nor any number "
                  f"of circuits at {n.text} {count_name}")
    about = {"field": error.path, "printed": Shown.of(error), "recomputed_range": Span(low, high),
             "tolerance": tol}
    source = f"{n.text} {count_name}" + (f" from {model_circuits.text} circuits" if model_circuits is not None else "")
    base = (f"{what}: printed stat_error {error.text} against {span_text((low, high))} that "
            f"{source} allow under the {model.name} model")
    if samples is not None:
        facts["sampling_floor_low"], facts["sampling_floor_high"] = hard
    if model_circuits is not None and plausible[0] < low:
        facts["floor_plausible_low"], facts["floor_plausible_high"] = plausible
    if model_circuits is not None and below(error, plausible[0], tol):
        yield Finding("fail", f"{base}: smaller than sampling alone permits "
                      f"({num(ratio, 2)}x), even allowing for how little {model_circuits.text} circuits tell of "
                      f"their own spread (at least {span_text(plausible)}); {needed}.",
                      reported=error.value, recomputed=(low + high) / 2, reproduced_by=reproduce,
                      details=facts, statement="below_floor", **about)
    elif model_circuits is not None and below(error, low, tol):
        yield Finding("pass", f"{base}: {num(ratio, 2)}x the floor, below it but within what an estimate of "
                      f"the spread between {model_circuits.text} circuits can give (down to "
                      f"{span_text(plausible)}).", reported=error.value, recomputed=(low + high) / 2,
                      details=facts, statement="within_floor", **about)
    elif below(error, hard[0], tol):
        if samples is not None:
            ratio = error.value / ((hard[0] + hard[1]) / 2)
            facts["ratio"] = ratio
            implied = _count_for(v_mid, factor[0], error.value)
            yield Finding("fail", f"{what}: printed stat_error {error.text} against {span_text(hard)} that "
                          f"{samples.text} samples allow under the {model.name} model, even before any "
                          f"circuit-to-circuit spread: smaller than sampling alone permits ({num(ratio, 2)}x); "
                          f"it would take about {num(implied, 2)} samples.",
                          reported=error.value, recomputed=(hard[0] + hard[1]) / 2,
                          reproduced_by={"samples": round(implied)} if implied is not None else None,
                          details=facts, statement="below_floor", **{**about, "recomputed_range": Span(*hard)})
            return
        if count_name == "circuits":
            # The per-circuit error sqrt(h (1 - h)/circuits) is the criterion's convention
            # (Cross et al. 2019), not a floor: the circuits' own heavy-output probabilities may
            # spread far less than h (1 - h), and each circuit's shots shrink the rest.  Without
            # the number of shots there is no floor (issue 11, item 4).
            yield Finding("skip", f"{base}: {num(ratio, 2)}x the per-circuit convention, which is the "
                          "heavy-output criterion's error, not a floor; the floor of sampling alone needs "
                          "samples (all shots).", reported=error.value, recomputed=(low + high) / 2,
                          details={**facts, "missing": ["samples"]}, statement="per_circuit_convention", **about)
            return
        yield Finding("fail", f"{base}: smaller than sampling alone permits "
                      f"({num(ratio, 2)}x); {needed}.",
                      reported=error.value, recomputed=(low + high) / 2, reproduced_by=reproduce,
                      details=facts, statement="below_floor", **about)
    elif below(error, low, tol):
        yield Finding("pass", f"{what}: printed stat_error {error.text} is below the {span_text((low, high))} "
                      f"that the per-{count_name[:-1]} convention gives for {n.text} {count_name} "
                      f"({num(ratio, 2)}x) but above the {span_text(hard)} floor of {samples.text} samples: "
                      f"consistent with many samples per {count_name[:-1]}.",
                      reported=error.value, recomputed=(low + high) / 2, details=facts,
                      statement="per_circuit_convention", **about)
    elif above(error, WARN_RATIO * high, tol):
        yield Finding("warn", f"{base}: {num(ratio, 2)}x the sampling floor, which suggests extra "
                      "spread (drift, circuit-to-circuit variation) the claim does not describe.",
                      reported=error.value, recomputed=(low + high) / 2, reproduced_by=reproduce,
                      details=facts, statement="above_floor", **about)
    else:
        yield Finding("pass", f"{base}: consistent ({num(ratio, 2)}x the floor).",
                      reported=error.value, recomputed=(low + high) / 2, details=facts,
                      statement="within_floor", **about)


def check(claim: Claim) -> Iterator[Finding]:
    factor = (1.0, 1.0)
    if claim.extrapolation is not None and claim.extrapolation.factor.value > 0:
        # The headline is the measured value times the factor; so is its error.
        factor = claim.extrapolation.factor.bounds
    n = count_for_error(claim)
    samples = claim.samples if (n is not None and n is not claim.samples) else None
    if claim.estimate is not None:
        yield from _one(claim, claim.estimate, claim.stat_error, n, factor, "Headline", {}, samples,
                        claim.circuits)
    for part in claim.parts:
        if part.stat_error is None:
            continue
        n = part.circuits if (metric_of(claim).count_field == "circuits" and part.circuits) else part.samples
        if n is None:
            continue
        samples = part.samples if n is not part.samples else None
        yield from _one(claim, part.estimate, part.stat_error, n, (1.0, 1.0),
                        f"Part {part.label}", {"part": part.label}, samples, part.circuits)


SPEC = CheckSpec(
    id="error-floor",
    title="Statistical error against the sampling floor",
    run=check,
    statements={
        "below_floor": Statement(
            question=("How was the statistical error estimated, and how many samples stand behind it? "
                      "As printed it is smaller than sampling alone allows."),
            if_reproduced=("How was the statistical error estimated, and how many samples stand behind it? "
                           "As printed it is smaller than sampling alone allows; it would follow {reproduced}."),
            reproducible=True),
        "above_floor": Statement(
            question=("What besides sampling noise does the statistical error include (drift, "
                      "circuit-to-circuit spread)? A sentence on it would help readers.")),
        "within_floor": Statement(),
        "error_is_sd": Statement(
            question=("Is {what} the spread of the runs (their sd) rather than the error of their mean? "
                      "The error of the mean is the sd divided by the square root of the number of runs."),
            if_reproduced=("Is {what} the spread of the runs rather than the error of their mean? It is what "
                           "one gets {reproduced}; the error of the mean is the sd divided by sqrt(runs).")),
        "sd_is_error": Statement(
            question=("Is the value printed as the sd in fact the error of the mean, and {what} the spread "
                      "of the runs? The printed error is the sd times the square root of the number of runs."),
            if_reproduced=("Is the value printed as the sd in fact the error of the mean, and {what} the "
                           "spread of the runs? The print follows {reproduced}.")),
        "per_circuit_convention": Statement(),
        "needs_inputs": ABOUT_THE_CLAIM,
        "implied_count": Statement(),
        "no_model_error": ABOUT_THE_CLAIM,
    },
)
