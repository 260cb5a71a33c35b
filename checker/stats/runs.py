"""A mean over a few runs (seeds, repetitions): its t test and the readings
of a printed error.

With n runs of spread sd, the error of the mean is sd / sqrt(n) and the
statistic t = (mean - threshold) / (sd / sqrt(n)) has Student's t
distribution on n - 1 degrees of freedom when the runs scatter normally
(the sd is estimated from the same runs).  Its significance in sigma is the
Gaussian-equivalent Z = Phi^-1(1 - p_t); the normal reading takes Z = t.

A printed error may be the error of the mean (sd / sqrt(n)), the spread
itself (sd), or, when the printed "sd" is in fact the error of the mean,
sd x sqrt(n).

References
----------
"Student" (W. S. Gosset), "The probable error of a mean", Biometrika 6, 1 (1908).
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from . import student_t
from .tails import log_p_from_sigma, sigma_from_log_p

DISTRIBUTIONS = ("t", "normal")
ERROR_READINGS = ("error of the mean", "sd", "sd times root n")


@dataclass(frozen=True)
class MeanTest:
    statistic: float      # (mean - threshold) / error
    df: float | None      # None for the normal reading
    log_p: float
    sigma: float          # Gaussian-equivalent significance
    distribution: str
    sided: str


def mean_test(mean: float, error: float, threshold: float, runs: float | None,
              distribution: str = "t", sided: str = "one") -> MeanTest:
    """z (normal) or t on runs - 1 degrees of freedom, with log p and its sigma."""
    stat = (mean - threshold) / error
    if distribution == "normal" or runs is None:
        return MeanTest(stat, None, log_p_from_sigma(stat, sided), stat if sided == "one" else abs(stat),
                        "normal", sided)
    if distribution != "t":
        raise ValueError(f"distribution must be one of {', '.join(DISTRIBUTIONS)}, got {distribution!r}")
    if runs < 2:
        raise ValueError(f"a t test needs at least 2 runs, got {runs}")
    df = runs - 1.0
    log_p = student_t.log_p(stat, df, sided)
    return MeanTest(stat, df, log_p, sigma_from_log_p(log_p, sided), "t", sided)


def error_readings(sd: float, runs: float) -> dict[str, float]:
    """What a printed error would be under each reading of :data:`ERROR_READINGS`."""
    root = math.sqrt(runs)
    return {"error of the mean": sd / root, "sd": sd, "sd times root n": sd * root}
