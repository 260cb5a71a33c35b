"""Binomial proportions and the heavy-output criterion.

References
----------
A. W. Cross et al., Phys. Rev. A 100, 032328 (2019), arXiv:1811.12926:
ideal heavy-output probability (1 + ln 2)/2; pass when h - 2 sigma > 2/3.
"""

from __future__ import annotations

import math

HEAVY_OUTPUT_IDEAL = (1.0 + math.log(2.0)) / 2.0
HEAVY_OUTPUT_THRESHOLD = 2.0 / 3.0


def binomial_variance(p: float) -> float:
    """p (1 - p), with p clipped to [0, 1]."""
    p = min(max(p, 0.0), 1.0)
    return p * (1.0 - p)


def heavy_output_minimum_mean(circuits: int, z: float = 2.0,
                              threshold: float = HEAVY_OUTPUT_THRESHOLD) -> float:
    """Smallest mean h with h - z sqrt(h (1 - h) / n) > threshold.

    Solves the quadratic (h - t)^2 = z^2 h (1 - h) / n for its root above t.
    """
    n = float(circuits)
    a = 1.0 + z * z / n
    b = -(2.0 * threshold + z * z / n)
    c = threshold * threshold
    return (-b + math.sqrt(b * b - 4.0 * a * c)) / (2.0 * a)


def heavy_output_sigma(h: float, threshold: float, circuits: float, syst: float = 0.0) -> float | None:
    """The heavy-output criterion's z: (h - threshold) / sqrt(h (1 - h) / circuits (+ syst^2)),
    the error over circuits taken at the estimate (Cross et al. 2019).

    Over a box of h and circuits it is exact at the vertices: for fixed circuits K the
    derivative in h has the sign of h (1 - 2t) + t + 2 K syst^2, which is linear in h, equal to
    t at h = 0 and to 1 - t at h = 1, so positive for h and t in [0, 1]; and for fixed h it is
    monotone in K.
    """
    v = binomial_variance(h) / circuits + syst * syst
    if not v > 0:
        return None
    return (h - threshold) / math.sqrt(v)
