"""``raw-error``: the printed statistical error against the raw data's.

``fail`` when the print is smaller than sampling alone allows (the data's own
standard error, less three times its own relative uncertainty sqrt(2/N));
``warn`` when the circuits scatter more than their samples explain and the
print leaves that out, or when it is over three times larger than every error
the data give; ``reproduced_by`` names the error the print matches (between
circuits, the metric model's).

References
----------
Common practice: the relative standard error of a standard deviation from N
near-exponential samples is about sqrt((kurtosis - 1) / (4 N)) = sqrt(2 / N).
"""

from __future__ import annotations

import math
from typing import TYPE_CHECKING, Iterator

from .. import wording
from ..claim.model import Claim
from ..report import Finding, Shown
from ..stats.precision import agrees
from .raw_common import about, target
from .spec import ABOUT_THE_CLAIM, CheckSpec, Statement

if TYPE_CHECKING:
    from ..raw.result import RawResult

ERROR_WARN_RATIO = 3.0


def check(claim: Claim, result: "RawResult") -> Iterator[Finding]:
    aim = target(claim)
    printed, factor = aim.stat_error, aim.factor
    head = result.headline
    if printed is None:
        yield Finding("skip", "No statistical error is printed to compare with the data's.", statement="not_printed")
        return
    if head.stat_error_data is None:
        yield Finding("skip", "The raw data give no standard error (fewer than two samples).",
                      statement="no_data_error", field=printed.path, printed=Shown.of(printed),
                      reported=printed.value)
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
    words = (f"Printed stat_error {printed.text} against {wording.num(data)} from the data's scatter "
             f"(model {wording.num(model)}{', between circuits ' + wording.num(cluster) if cluster else ''})")
    candidates = {"data": data, "between circuits": cluster, "model": model}
    match = next((k for k, v in candidates.items() if v and agrees(printed.bounds, (v, v), tol)), None)
    facts = {"reported": printed.value, "recomputed": data, **about(printed, "stat_error", data, data, tol)}
    if data * (1 - slack) - printed.high > tol * printed.value:
        yield Finding("fail", f"{words}: smaller than sampling alone allows ({wording.num(ratio, 2)}x)"
                      f"{'; it matches the ' + match + ' error' if match else ''}.",
                      reproduced_by={"error": match} if match else None, details=details, **facts)
        return
    if cluster and cluster > data * (1 + 3.0 / math.sqrt(2.0 * max(result.circuit_count - 1, 1))) \
            and cluster - printed.high > tol * printed.value:
        yield Finding("warn", f"{words}: the circuits scatter more than their samples explain, and the printed "
                      f"error does not include it ({wording.num(printed.value / cluster, 2)}x the between-circuit "
                      "error).", details=details,
                      **{**facts, **about(printed, "circuit_scatter", cluster, cluster, tol), "recomputed": cluster})
        return
    if printed.low - ERROR_WARN_RATIO * max(v for v in candidates.values() if v) > tol * printed.value:
        yield Finding("warn", f"{words}: {wording.num(ratio, 2)}x larger than the data need; the print may include "
                      "more than sampling.", details=details,
                      **{**facts, **about(printed, "larger_than_data", data, data, tol)})
        return
    tail = f"; it is the {match} error" if match else f" ({wording.num(ratio, 2)}x the data's)"
    yield Finding("pass", f"{words}: consistent{tail}.",
                  reproduced_by={"error": match} if match and match != "data" else None, details=details, **facts)


SPEC = CheckSpec(
    id="raw-error",
    title="Printed statistical error against the raw data",
    run=check,
    quotes="value",
    statements={
        "stat_error": Statement(
            question=("The raw samples scatter more than {what} allows. How was the error computed, "
                      "and from which data?"),
            if_reproduced=("The raw samples scatter more than {what} allows; the print matches the data "
                           "{reproduced}. Which error does the claim print, and why that one?"),
            reproducible=True),
        "circuit_scatter": Statement(
            question=("The circuits of the raw data scatter more than their samples explain, and {what} leaves "
                      "that out. Does the claim's error count the circuit-to-circuit spread?")),
        "larger_than_data": Statement(
            question=("The raw data need less than a third of {what}. What does the error include besides "
                      "sampling? Listing it would let readers follow it.")),
        "not_printed": ABOUT_THE_CLAIM,
        "no_data_error": Statement(),
    },
)
