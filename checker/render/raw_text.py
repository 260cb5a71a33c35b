"""Terminal text for ``claimcheck raw`` and ``claimcheck drift``.  Pure
functions of their result objects; nothing here computes a statistic."""

from __future__ import annotations


from .. import wording
from ..report import STATUSES, tally_statuses
from ..vocabulary import COUNT_WORDS, CAUTION_SHORT, FIT_TEST_NAMES as TEST_WORDS, METRIC_NAMES as METRIC_WORDS, STATUS_MARKS
from ..wording import p_equals
AT_WORDS = {"fitted": "fitted", "threshold": "threshold", "zero": "zero"}
MAX_CIRCUIT_LINES = 12


def _n(x, digits: int = 4) -> str:
    return wording.num(x, digits)


def render_raw_text(result) -> str:
    """The raw-data summary, then the claim findings when there are any."""
    lines = [f"Raw data {result.file}: {result.rows:,} samples, {result.circuit_count:,} circuit(s), "
             f"{result.qubits} qubits (D = 2^{result.qubits})", ""]
    lines.append("Estimates over all circuits (standard errors: model / data / ratio):")
    for name, est in result.combined.items():
        mark = "*" if name == result.metric else " "
        if est.estimate is None:
            lines.append(f" {mark} {METRIC_WORDS[name]:<13} not computed: {est.note}")
            continue
        extra = []
        if est.extra.get("stat_error_circuits"):
            extra.append(f"between circuits {_n(est.extra['stat_error_circuits'], 3)}")
        if "fidelity_finite_d" in est.extra and name != "heavy-output":
            extra.append(f"finite-D corrected {_n(est.extra['fidelity_finite_d'])}")
        if est.extra.get("stat_error_shots"):
            extra.append(f"from shots {_n(est.extra['stat_error_shots'], 3)}")
        tail = f"; {', '.join(extra)}" if extra else ""
        lines.append(f" {mark} {METRIC_WORDS[name]:<13} {_n(est.estimate)}  +- {_n(est.stat_error, 3)} / "
                     f"{_n(est.stat_error_data, 3)} / {_n(est.ratio, 3)}{tail}")
    if result.fits:
        fits = "; ".join(f"{f.method} {_n(f.fidelity)} +- {_n(f.stat_error, 3)}" for f in result.fits)
        lines += ["", f"Fidelity fitted: {fits}"]
    if result.goodness_of_fit:
        size = result.goodness_of_fit[0].samples
        lines += ["", f"Goodness of fit of x = D p to the Porter-Thomas mixture ({size:,} samples):"]
        by_at: dict = {}
        for t in result.goodness_of_fit:
            by_at.setdefault(t.at, []).append(t)
        for at, tests in by_at.items():
            parts = "   ".join(f"{TEST_WORDS[t.test]} {_n(t.statistic, 3)}, {p_equals(t.p_value)}" for t in tests)
            lines.append(f"  {AT_WORDS[at]:<9} F = {_n(tests[0].fidelity)}   {parts}")
    b = result.bootstrap
    if b is not None:
        first = f"{b.level:.0%} {b.interval} {_n(b.low)} to {_n(b.high)}; "
        if b.interval != "percentile":
            first += f"percentile {_n(b.percentile_low)} to {_n(b.percentile_high)}; "
        lines += ["", f"Bootstrap ({b.replicates:,} replicates, {b.resampling} resampled, seed {b.seed}): "
                  f"{first}basic {_n(b.basic_low)} to {_n(b.basic_high)}; sd {_n(b.sd, 3)}"]
    if result.circuit_count > 1:
        lines += ["", f"Per circuit ({METRIC_WORDS[result.metric]}"
                  f"{', first ' + str(MAX_CIRCUIT_LINES) if result.circuit_count > MAX_CIRCUIT_LINES else ''}):",
                  f"  {'circuit':<12} {'samples':>9} {'estimate':>10} {'model se':>9} {'data se':>9} {'ratio':>6}"]
        for label, metrics in result.circuits[:MAX_CIRCUIT_LINES]:
            m = metrics.get(result.metric)
            if m is None:
                lines.append(f"  {str(label):<12} (no {METRIC_WORDS[result.metric]})")
                continue
            lines.append(f"  {str(label):<12} {m.samples:>9,} {_n(m.estimate):>10} {_n(m.stat_error, 3):>9} "
                         f"{_n(m.stat_error_data, 3):>9} {_n(m.ratio, 3):>6}")
    if result.notes:
        lines += ["", "Notes:"] + [f"  - {note}" for note in result.notes]
    if result.findings is not None:
        width = max((len(f.check) for f in result.findings), default=8)
        lines += ["", f"Against the claim {result.claim_file}:"]
        shown, same = visible_findings(result.findings)
        lines += _finding_lines(shown, width)
        if same:
            lines.append(f"       ({same} claim check(s) give the same result with the raw data's numbers; "
                         "--json lists them)")
        counts = {s: sum(f.status == s for f in result.findings) for s in STATUSES}
        tally = ", ".join(f"{counts[s]} {COUNT_WORDS[s]}" for s in tally_statuses(counts))
        lines += ["", f"verdict: {result.verdict} ({tally})"]
        if counts["fail"] or counts["warn"]:
            lines.append(CAUTION_SHORT)
    return "\n".join(lines) + "\n"


def _finding_lines(shown, width: int) -> list[str]:
    """One line per finding, except that the findings one slip explains are
    one entry (as in the referee notes): the slip's line at the place of the
    first, then each finding it explains below it."""
    from .notes import shared_point, slip_groups  # here, so that drift's text need not load the checks

    slips = {id(f): g for g in slip_groups(shown) if len(g) > 1 for f in g}
    lines = []
    for f in shown:
        group = slips.get(id(f))
        if group is None:
            lines.append(f"{STATUS_MARKS[f.status]} {f.check:<{width}}  {f.message}")
        elif group[0] is f:
            s = shared_point(group)
            lines.append(f"{STATUS_MARKS[s.status]} {f.check:<{width}}  {s.opening}")
            named = len({m.check for m in group}) > 1
            lines += [f"{'':<{len(STATUS_MARKS[m.status]) + width + 3}}- {m.check + ': ' if named else ''}{m.message}"
                      for m in group]
    return lines


def visible_findings(findings):
    """Findings to print: a claim check rerun on the raw numbers is left out
    when it says exactly what the printed-number run said."""
    from ..checks import RAW_REGISTRY  # here, so that drift's text need not load the checks
    from ..checks.raw_rerun import RAW_PREFIX

    printed: dict = {}
    for f in findings:
        if f.details.get("numbers") != "raw" and f.check not in RAW_REGISTRY:
            printed.setdefault(f.check, []).append(f)
    seen: dict = {}
    shown, same = [], 0
    for f in findings:
        if f.details.get("numbers") == "raw":
            i = seen.get(f.check, 0)
            seen[f.check] = i + 1
            twins = printed.get(f.check, [])
            twin = twins[i] if i < len(twins) else None
            if twin is not None and twin.status == f.status and RAW_PREFIX + twin.message == f.message:
                same += 1
                continue
        shown.append(f)
    return shown, same


def render_drift_text(result, file: str, origin: str | None = None) -> str:
    """The stability summary of one series; ``origin`` is the first point's
    date-time when the times were date-times (then counted in hours since it)."""
    r = result
    unit = f" hours since the first point ({origin})" if origin else ""
    per = "per hour" if origin else "per unit time"
    # The count of the series and of its window are said once each.
    inside = "all" if r.window_points == r.points else f"{r.window_points} of them"
    lines = [f"Drift of {file}: {r.points} points, {inside} in the window {_n(r.window_start)} to "
             f"{_n(r.window_end)}{unit}", ""]
    lines.append(f"  slope            {_n(r.slope)} +- {_n(r.slope_error, 3)} {per}; {r.level:.0%} interval "
                 f"{_n(r.slope_low)} to {_n(r.slope_high)} ({p_equals(r.slope_p_value)})")
    lines.append(f"  level at window  {_n(r.trend_level)} +- {_n(r.trend_level_error, 3)} (intercept at the window "
                 f"centre; {r.level:.0%} interval {_n(r.trend_level_low)} to {_n(r.trend_level_high)})")
    lines.append(f"  trend across window {_n(r.trend_change, 3)} (as a spread {_n(r.trend_spread, 3)})")
    spread = f"  residual sd      {_n(r.residual_sd, 3)} overall"
    if r.residual_sd_window is not None:
        spread += f", {_n(r.residual_sd_window, 3)} in the window"
    if r.stated_error_rms_window is not None:
        spread += f" against stated errors {_n(r.stated_error_rms_window, 3)}"
    lines.append(spread)
    if r.excess_spread_window is not None:
        lines.append(f"  excess spread    {_n(r.excess_spread_window, 3)}"
                     f"{'' if r.stated_error_rms_window is not None else ' (no errors given: all of the residual spread)'}")
    if r.consistent_with_none:
        lines.append(f"  systematic       consistent with none (estimate {_n(r.systematic_estimate, 3)}; "
                     f"{r.level:.0%} upper limit {_n(r.systematic_upper, 3)})")
    else:
        lines.append(f"  systematic       {_n(r.systematic, 3)} (drift beyond its noise and excess spread in quadrature; "
                     f"{r.level:.0%} upper limit {_n(r.systematic_upper, 3)})")
    if r.constant_chi2 is not None:
        lines.append(f"  constant model   chi2 = {_n(r.constant_chi2, 4)} for {r.constant_dof} dof about the line "
                     f"({p_equals(r.scatter_p_value)}), weighted slope {p_equals(r.weighted_slope_p_value)}; "
                     f"combined {p_equals(r.constant_p_value)}")
    verdict = ("rejected (" + " and ".join({"slope": "the slope differs from 0",
                                            "scatter": "the scatter exceeds the stated errors"}[x]
                                           for x in r.reasons) + f", alpha {r.alpha:g})"
               if r.constant_rejected else f"not rejected at alpha {r.alpha:g}")
    lines += ["", f"A constant value over time: {verdict}."]
    return "\n".join(lines) + "\n"
