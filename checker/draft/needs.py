"""The fields a check would still need, written into a draft as commented-out
lines: (field path, why, when it applies)."""

from __future__ import annotations

from .model import Field


# What the checks still need, as commented-out lines: (path, why, when).
NEEDS = (
    (("source",), "where the numbers were read (paper, version, table)", lambda d, m: True),
    (("qubits",), "the XEB metrics take the dimension D = 2**qubits (error-floor, bounds)",
     lambda d, m: m in ("linear-xeb", "log-xeb")),
    (("stat_error",), "error-floor and significance need the standard error as printed",
     lambda d, m: m != "counts" and not d("interval", "low") and not (m == "mean" and d("sd") and d("samples"))),
    (("samples",), "error-floor needs the samples behind the estimate (shots, test items, runs)",
     lambda d, m: m not in ("heavy-output", "counts")),
    (("circuits",), "heavy output's standard error comes from the number of circuits",
     lambda d, m: m == "heavy-output"),
    (("sd",), "error-floor needs the per-sample standard deviation of a mean",
     lambda d, m: m == "mean"),
    (("threshold",), "significance needs the value the claim says it exceeds",
     lambda d, m: m != "counts" and not d("baseline", "estimate")),
    (("significance", "sigma"), "significance compares the printed sigma (or p_value)",
     lambda d, m: (d("threshold") or m == "counts") and not d("significance", "p_value")),
    (("trials",), "look-elsewhere needs the configurations tried, if this is the best of several",
     lambda d, m: d("significance", "sigma") or d("significance", "p_value")),
    (("baseline", "stat_error"), "comparison needs the baseline's own error (or its samples)",
     lambda d, m: d("baseline", "estimate") and not d("baseline", "samples")),
    # comparison.paired, when not printed, is written as the default with a guess (writer.py).
    (("comparison", "discordant"), "a paired comparison of proportions needs the two discordant counts",
     lambda d, m: d("baseline", "estimate") and d("comparison", "paired")),
    (("background_error",), "the background's own uncertainty, if printed",
     lambda d, m: m == "counts"),
)


def missing(fields: list[Field], metric: str) -> list[tuple]:
    have = {f.path for f in fields}
    d = lambda *p: tuple(p) in have  # noqa: E731
    return [(path, why) for path, why, when in NEEDS if path not in have and when(d, metric)]
