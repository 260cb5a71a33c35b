"""``rates``: the rates printed from one table of counts, and their intervals.

Every printed rate (accuracy, sensitivity or recall, specificity, precision,
negative predictive value, F1, false positive and false negative rates) is
recomputed exactly from ``counts_table`` and compared with its printed digits
alone: a ratio of whole counts is exact arithmetic, so, as in ``granularity``,
the claim's ``tolerance`` (slack for formulas and conventions) does not widen it;
a rate that disagrees is named with what the table gives and, when it is one,
with the count over a margin of the table that the print is (a recall printed
as the true positives over all cases).

Every printed interval of a rate that is a proportion of its denominator is
matched against the five binomial interval methods at that denominator (and
at the usual other levels, a one-sigma interval labelled 95% being a common
slip).  When none reproduces it, the denominators that would are searched,
the table's margins first (:mod:`checker.stats.denominator_search`): "the
Wald interval with N = 78, all cases, not the 42 positives".  An interval
wider than every method allows is reported with the effective sample size and
design effect it implies: a clustered analysis is a legitimate reason, so
that is a note, not a flag.

References
----------
T. Fawcett, Pattern Recognit. Lett. 27, 861 (2006), Fig. 1 (definitions).
R. G. Newcombe, Stat. Med. 17, 857 (1998), Table I (interval methods).
L. Kish, Survey Sampling (1965), Sec. 8.2 (design effect).
"""

from __future__ import annotations

import math
from typing import Iterator

from ..claim.model import Claim, PrintedRate
from ..report import Finding, Shown, Span
from ..stats.binomial_intervals import METHODS, NAMES, proportion_interval
from ..stats.confusion import CELLS, DEFINITIONS, MARGINS, NUMERATORS, margins, rate_fraction, total
from ..stats.denominator_search import effective_sample_size, search_denominator
from ..stats.precision import agrees, gap
from ..wording import like
from .interval import OTHER_LEVELS, level_text
from .spec import ABOUT_THE_CLAIM, CheckSpec, Statement, SummaryTable


def _words(name: str) -> str:
    return name.replace("_", " ")


def _table(claim: Claim) -> dict[str, int]:
    return {cell: int(getattr(claim.counts_table, cell).value) for cell in CELLS}


def _value_finding(claim: Claim, rate: PrintedRate, table: dict[str, int]) -> Finding:
    k, n = rate_fraction(table, rate.name)
    shown = Shown.of(rate.value)
    base = dict(field=rate.value.path, statement="rate_value", printed=shown, tolerance=0.0)
    words = _words(rate.name)
    if n == 0:
        return Finding("skip", f"The printed {words} {rate.value.text} cannot be recomputed: the table has no "
                       f"cases in its denominator ({DEFINITIONS[rate.name].denominator_words}).",
                       reported=rate.value.value, details={"numerator": k, "denominator": 0}, **base)
    exact = k / n
    fraction = f"{k}/{n} = {like(exact, rate.value)}"
    details = {"numerator": k, "denominator": n, "denominator_words": DEFINITIONS[rate.name].denominator_words}
    kept = dict(reported=rate.value.value, recomputed=exact, recomputed_range=Span(exact, exact), **base)
    if agrees(rate.value.bounds, (exact, exact), 0.0):
        return Finding("pass", f"The printed {words} {rate.value.text} is {fraction} from the table.",
                       details=details, **kept)
    # What the print is instead: another rate of the table, or a count over a margin.
    for other in DEFINITIONS:
        ok, on = rate_fraction(table, other)
        if on == 0 or (ok, on) == (k, n):  # recall and sensitivity are one rate
            continue
        if agrees(rate.value.bounds, (ok / on, ok / on), 0.0):
            return Finding("fail", f"The printed {words} {rate.value.text} is not what the table gives, "
                           f"{fraction}; it is the {_words(other)} ({ok}/{on}).", details=details,
                           reproduced_by={"rate": other}, **kept)
    for top_words, top in NUMERATORS:
        for bottom_words, bottom in MARGINS:
            a, b = total(table, top), total(table, bottom)
            if b and set(top) <= set(bottom) and agrees(rate.value.bounds, (a / b, a / b), 0.0):
                return Finding("fail", f"The printed {words} {rate.value.text} is not what the table gives, "
                               f"{fraction}; it is {top_words} over {bottom_words} ({a}/{b}).", details=details,
                               reproduced_by={"numerator": top_words, "denominator": bottom_words}, **kept)
    return Finding("fail", f"The printed {words} {rate.value.text} is not what the table gives, {fraction}.",
                   details=details, **kept)


def _matching(k: float, n: int, iv, level: float, slack: float) -> tuple[list[str], dict]:
    found, shown = [], {}
    for m in METHODS:
        lo, hi = proportion_interval(k, n, level, m)
        shown[m] = (lo, hi)
        off = max(gap(iv.low.bounds, (lo, lo)), gap(iv.high.bounds, (hi, hi)))
        if off <= slack:
            found.append((off, METHODS.index(m), m))
    return [m for _, _, m in sorted(found)], shown


def _interval_finding(claim: Claim, rate: PrintedRate, table: dict[str, int]) -> Finding:
    iv = rate.interval
    words = _words(rate.name)
    definition = DEFINITIONS[rate.name]
    k, n = rate_fraction(table, rate.name)
    path = rate.value.path.rsplit(".", 1)[0] + ".interval"
    base = dict(field=path, statement="rate_interval", printed=Shown(f"[{iv.low.text}, {iv.high.text}]",
                iv.low.low, iv.high.high), tolerance=claim.tolerance)
    printed = f"[{iv.low.text}, {iv.high.text}]"
    level = iv.level.value
    lt = level_text(level)
    if not definition.binomial:
        return Finding("skip", f"The printed {lt} interval {printed} of the {words} is not checked: the {words} "
                       "is not a proportion of one set of cases, so no binomial method applies.",
                       details={"reason": "not binomial"}, **base)
    if n == 0:
        return Finding("skip", f"The printed interval {printed} of the {words} cannot be checked: the table has "
                       f"no cases in its denominator ({definition.denominator_words}).", details={}, **base)
    if iv.low.value > iv.high.value:
        return Finding("skip", f"The printed interval {printed} of the {words} has its ends reversed.",
                       details={}, **base)
    slack = claim.tolerance * (iv.high.value - iv.low.value) / 2
    agreeing, shown = _matching(k, n, iv, level, slack)
    what = f"{k}/{n} ({definition.denominator_words})"
    details = {"numerator": k, "denominator": n, "level": level,
               "methods": {m: {"low": lo, "high": hi} for m, (lo, hi) in shown.items()}, "agreeing": agreeing}
    first = agreeing[0] if agreeing else "wilson"
    kept = dict(reported=iv.low.value, recomputed=shown[first][0],
                recomputed_range=Span(shown[first][0], shown[first][1]), **base)
    if agreeing:
        also = f" ({', '.join(NAMES[m] for m in agreeing[1:])} too)" if len(agreeing) > 1 else ""
        return Finding("pass", f"The printed {lt} interval {printed} of the {words} is the {NAMES[first]} "
                       f"interval for {what}{also}.", details=details, **kept)
    listing = "; ".join(f"{NAMES[m]} [{like(lo, iv.low)}, {like(hi, iv.high)}]" for m, (lo, hi) in shown.items())
    # Two slips can each explain the print: another level with this N, or this
    # level with another margin as N. The one closer to the printed ends wins.
    def off(lo, hi):
        return max(gap(iv.low.bounds, (lo, lo)), gap(iv.high.bounds, (hi, hi)))

    level_fit = None
    for other_level, other_words in OTHER_LEVELS:
        if abs(other_level - level) < 1e-9:
            continue
        other, other_shown = _matching(k, n, iv, other_level, slack)
        if other:
            distance = off(*other_shown[other[0]])
            if level_fit is None or distance < level_fit[0]:
                level_fit = (distance, other[0], other_level, other_words)
    table_margins = {w: size for w, size in margins(table).items() if size != n}
    search = search_denominator((k / n, k / n), iv.low.bounds, iv.high.bounds, level, slack,
                                margins=table_margins)
    details["search_sampled"] = search.sampled
    labelled = [f for f in search.fits if f.label is not None]
    if labelled and (level_fit is None or off(labelled[0].low, labelled[0].high) <= level_fit[0]):
        fit = labelled[0]
        details["search"] = {"method": fit.method, "denominator": fit.n_best, "margin": fit.label}
        return Finding("fail", f"The printed {lt} interval {printed} of the {words} matches no method for {what} "
                       f"({listing}); it is the {NAMES[fit.method]} interval computed with N = {fit.n_best}, "
                       f"{fit.label}, instead of N = {n}, {definition.denominator_words}.",
                       reproduced_by={"method": fit.method, "denominator": fit.n_best, "margin": fit.label},
                       details=details, **kept)
    if level_fit is not None:
        _, method, other_level, other_words = level_fit
        return Finding("fail", f"The printed {lt} interval {printed} of the {words} matches no method for "
                       f"{what} at {lt} ({listing}); it is the {NAMES[method]} interval at {other_words}.",
                       reproduced_by={"method": method, "level": round(other_level, 6)},
                       details=details, **kept)
    widest = max(hi - lo for lo, hi in shown.values())
    half = (iv.high.value - iv.low.value) / 2
    n_eff = effective_sample_size(k / n, half, level) if 0 < k < n else 0.0
    if 2 * half > widest and 0.0 < n_eff < math.inf and math.isfinite(n / n_eff):
        deff = n / n_eff
        details.update(effective_samples=n_eff, design_effect=deff)
        return Finding("warn", f"The printed {lt} interval {printed} of the {words} is {2 * half / widest:.2g} "
                       f"times as wide as the widest binomial interval for {what} ({listing}); it implies about "
                       f"{n_eff:.3g} effective cases, a design effect of {deff:.3g}. A clustered analysis "
                       "(several cases from one person or site) is a legitimate reason; the paper should say so.",
                       details=details, **{**kept, "statement": "rate_design_effect"})
    if search.fits:
        fit = search.fits[0]
        span = (f"N = {fit.n_low}" if fit.n_low == fit.n_high
                else f"N = {fit.n_low} to {fit.n_high} (closest {fit.n_best})")
        details["search"] = {"method": fit.method, "denominator": fit.n_best, "margin": None}
        return Finding("fail", f"The printed {lt} interval {printed} of the {words} matches no method for {what} "
                       f"({listing}); the {NAMES[fit.method]} interval would give it with {span}, not a margin "
                       "of the table.", reproduced_by={"method": fit.method, "denominator": fit.n_best},
                       details=details, **kept)
    return Finding("fail", f"The printed {lt} interval {printed} of the {words} matches no method for {what} "
                   f"({listing}), nor any denominator.", details=details, **kept)


def check(claim: Claim) -> Iterator[Finding]:
    if claim.counts_table is None:
        yield Finding("skip", "No counts_table is given, so there are no rates to recompute.",
                      details={"missing": ["counts_table"]}, statement="needs_inputs")
        return
    table = _table(claim)
    if not claim.rates:
        yield Finding("skip", "A counts_table is given but no rates are printed from it.",
                      field="counts_table", details={"missing": ["rates"]}, statement="no_rates")
        return
    for rate in claim.rates:
        yield _value_finding(claim, rate, table)
        if rate.interval is not None:
            yield _interval_finding(claim, rate, table)


def summary(findings) -> SummaryTable | None:
    """Each printed rate against what the table of counts gives, and what its
    printed interval is (the method that gives it, or what reproduces it)."""
    rows: dict[str, list[str]] = {}
    marks = {"pass": "agrees", "fail": "flagged", "warn": "note", "skip": "not checked", "info": "shown"}
    for f in findings:
        if f.statement == "rate_value" and "denominator" in f.details:
            name = f.field.split(".")[1]
            k, n = f.details["numerator"], f.details["denominator"]
            given = f"{k}/{n} = {like(k / n, f.printed.text if f.printed else None)}" if n else "no cases"
            rows[name] = [name.replace("_", " "), f.printed.text if f.printed else "", given, marks[f.status], "", ""]
        elif f.statement in ("rate_interval", "rate_design_effect") and f.field:
            name = f.field.split(".")[1]
            row = rows.setdefault(name, [name.replace("_", " "), "", "", "", "", ""])
            row[4] = f.printed.text if f.printed else ""
            agreeing = f.details.get("agreeing") or []
            if agreeing:
                row[5] = NAMES[agreeing[0]]
            elif f.reproduced_by and "denominator" in f.reproduced_by:
                row[5] = f"{NAMES[f.reproduced_by['method']]} with N = {f.reproduced_by['denominator']} (flagged)"
            elif f.reproduced_by and "level" in f.reproduced_by:
                row[5] = f"{NAMES[f.reproduced_by['method']]} at level {f.reproduced_by['level']:g} (flagged)"
            elif "design_effect" in f.details:
                row[5] = f"design effect {f.details['design_effect']:.3g} (note)"
            else:
                row[5] = marks[f.status]
    if not rows:
        return None
    return SummaryTable("The printed rates against the table of counts",
                        ("rate", "printed", "from the counts", "value", "printed interval", "interval is"),
                        tuple(tuple(r) for r in rows.values()))


SPEC = CheckSpec(
    id="rates",
    summary=summary,
    title="Rates from the table of counts",
    run=check,
    quotes="range",
    statements={
        "rate_value": Statement(
            question="How was {what} computed from the table of counts? The table gives another value.",
            if_reproduced=("Is {what} the rate the paper names? The table gives it as another rate "
                           "({reproduced})."),
            reproducible=True),
        "rate_interval": Statement(
            question="Which method and which denominator produced {what}? None of the usual methods reproduces it.",
            if_reproduced="Was {what} made {reproduced}? Please name the method and the denominator beside it.",
            reproducible=True),
        "rate_design_effect": Statement(
            question=("{what} is wider than any binomial interval for its denominator. Was it made from a "
                      "clustered analysis, and how large is the design effect?")),
        "no_rates": Statement(),
        "needs_inputs": ABOUT_THE_CLAIM,
    },
)
