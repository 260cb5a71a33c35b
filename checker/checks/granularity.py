"""``granularity``: can a whole count produce the printed value at all?

A proportion of N whole items is k/N; a ``mean`` of N whole-number responses
(``integer_data: true``), each the average of ``items`` whole-number items,
is T/(N items).  The printed value, as the interval its digits stand for,
must hold one such fraction (the GRIM rule).  The rule is exact arithmetic, so
the claim's ``tolerance`` does not widen it; only the printed digits do.  It
needs the count written out in full (``samples: 500``, not ``5e2``), and it can
only bite when N x items is below 10^d for d printed decimals.  The headline
and every part with its own samples are tested.

References
----------
N. J. L. Brown and J. A. J. Heathers, "The GRIM test", Social Psychological
and Personality Science 8, 363 (2017) (volume and pages from memory).
"""

from __future__ import annotations

from typing import Iterator

from ..claim.model import Claim, Reported
from ..report import Finding, Shown
from .no_estimate import no_estimate
from ..stats.granularity import granularity
from ..wording import like
from .spec import ABOUT_THE_CLAIM, CheckSpec, Statement

SEARCH = 0.1  # how far (as a share of N) to look for a count that would make the print possible
MAX_STEPS = 10_000  # and at most this far: samples of 1e9 made a search of 1e8 counts (minutes)


def _nearest_possible(value: Reported, n: int, items: int, proportion: bool) -> int | None:
    """The N closest to n for which the printed value is possible."""
    if proportion and (value.high < 0.0 or value.low > 1.0):
        return None  # no count of items gives a proportion outside [0, 1]
    for step in range(1, min(max(2, int(n * SEARCH)), MAX_STEPS) + 1):
        for cand in (n - step, n + step):
            if cand < 1:
                continue
            units = cand * items
            g = granularity(value.low, value.high, units, 0 if proportion else None,
                            units if proportion else None, keep=1)
            if g.possible:
                return cand
    return None


def _one(claim: Claim, value: Reported, n: Reported | None, what: str, details: dict,
         proportion: bool, items: int) -> Finding:
    noun = "items" if proportion else "whole-number responses"
    if proportion and (value.high < 0.0 or value.low > 1.0):
        # bounds flags it (a percentage without its sign, most often): no count to look for.
        return Finding("skip", f"{what}: {value.text} is not tested: the physical-range check flags it.",
                       details={**details, "skipped_input": value.path}, statement="needs_inputs")
    if n is None:
        return Finding("skip", f"{what}: the granularity test needs the number of {noun} (samples).",
                       details={**details, "missing": ["samples"]}, statement="needs_inputs")
    if not n.exact:
        return Finding("skip", f"{what}: samples is printed as {n.text}, with limited precision; the "
                       "granularity test needs the count written out in full.", details=details,
                       statement="needs_inputs")
    count = _whole(n)
    units = count * items
    per = f" of {items} items each" if items > 1 else ""
    g = granularity(value.low, value.high, units, 0 if proportion else None,
                    units if proportion else None)
    facts = {**details, "units": units, "samples": count, "items": items, "possible": g.possible,
             "counts": list(g.counts), "below": g.below, "above": g.above}
    if not g.can_bite and g.possible:
        what_units = (f"{units} items" if proportion else
                      f"{count} responses of {items} items ({units} item scores)" if items > 1 else
                      f"{units} responses")
        return Finding("skip", f"{what}: with {what_units} every value printed to the precision of "
                       f"{value.text} is some whole count over {units}, so the granularity test cannot bite.",
                       details=facts, statement="cannot_bite")
    about = {"field": value.path, "statement": "whole_count", "printed": Shown.of(value), "tolerance": 0.0}
    if g.possible:
        k = g.counts[0]
        several = f" (or {g.counts[-1]}/{units})" if len(g.counts) > 1 else ""
        whole = (f"a whole count of the {count} {noun}" if proportion
                 else f"a whole-number total over the {count} responses{per}")
        return Finding("pass", f"{what}: {value.text} is {k}/{units} = {like(k / units, value)}{several}, "
                       f"{whole}.", reported=value.value, recomputed=k / units, details=facts, **about)
    near = []
    if g.below is not None:
        near.append(f"{g.below}/{units} = {like(g.below / units, value)}")
    if g.above is not None:
        near.append(f"{g.above}/{units} = {like(g.above / units, value)}")
    other = _nearest_possible(value, count, items, proportion)
    tail = (f"; the nearest count of {noun.split(' ')[-1]} that allows it is {other}" if other is not None
            else "")
    nearest = g.below if g.below is not None else g.above
    return Finding("fail", f"{what}: {value.text} cannot come from {count} {noun}{per}: no whole count fits, "
                   f"the nearest are {' and '.join(near)}{tail}.", reported=value.value,
                   recomputed=nearest / units if nearest is not None else None,
                   reproduced_by={"samples": other} if other is not None else None, details=facts, **about)


def check(claim: Claim) -> Iterator[Finding]:
    proportion = claim.metric == "proportion"
    whole_means = claim.metric == "mean" and claim.integer_data
    if not (proportion or whole_means):
        why = ("set integer_data: true when the responses are whole numbers" if claim.metric == "mean"
               else f"a {claim.metric} estimate is not a count of whole items")
        yield Finding("skip", f"The granularity test applies to proportions and to means of whole-number "
                      f"data; {why}.", details={"missing": ["integer_data"] if claim.metric == "mean" else []},
                      statement="not_counts")
        return
    items = _whole(claim.items) if claim.items is not None else 1
    method = claim.combination.method if claim.combination is not None else None
    if claim.extrapolation is not None:
        yield Finding("skip", "Headline: an extrapolated value is not a count over whole items, so only "
                      "parts are tested.", details={}, statement="headline_not_count")
    elif claim.parts and method != "samples":
        yield Finding("skip", "Headline: a weighted combination of parts is not itself a count over whole "
                      "items (only pooling by samples is), so only parts are tested.", details={},
                      statement="headline_not_count")
    elif claim.estimate is None:
        yield no_estimate(claim, "the headline's whole count")
    else:
        yield _one(claim, claim.estimate, claim.samples, "Headline", {}, proportion, items)
    for part in claim.parts:
        if part.samples is not None:
            yield _one(claim, part.estimate, part.samples, _part_name(part.label), {"part": part.label},
                       proportion, items)


def _whole(count: Reported) -> int:
    """A count as the whole number printed: from its digits when written out in
    full (a double holds only 15 to 17 of them), else from its value."""
    text = count.text.strip()
    return int(text) if count.exact and text.lstrip("+").isdigit() else int(count.value)


def _part_name(label: str) -> str:
    """'Part c1', and 'Part 2' rather than 'Part part 2' for an unlabelled part."""
    return label[:1].upper() + label[1:] if label.lower().startswith("part ") else f"Part {label}"


SPEC = CheckSpec(
    id="granularity",
    title="Whole counts behind the printed value",
    run=check,
    quotes="value",
    statements={
        "whole_count": Statement(
            question=("How many samples or responses stand behind {what}? No whole count gives it "
                      "with the number printed.")),
        "needs_inputs": ABOUT_THE_CLAIM,
        "no_estimate": ABOUT_THE_CLAIM,
        "cannot_bite": ABOUT_THE_CLAIM,
        "not_counts": ABOUT_THE_CLAIM,
        "headline_not_count": ABOUT_THE_CLAIM,
    },
)
