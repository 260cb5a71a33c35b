"""Significance over whole columns of claims at once (numpy and scipy.special):
the z of every adjusted p-value of a survey, one array expression.  (Each
claim's own z and p come from its ``significance`` check.)

References
----------
Particle Data Group, Review of Particle Physics, chapter "Statistics" (G. Cowan).
"""

from __future__ import annotations

import math

import numpy as np
from scipy.special import ndtri_exp

LOG2 = math.log(2.0)


def sigma_from_log_p(log_p, two_sided) -> np.ndarray:
    """z whose tail area has log ``log_p``, one- or two-sided per claim (the
    inverse of stats.tails.log_p_from_sigma; two-sided values are >= 0).  NaN stays NaN;
    log p = -inf gives +inf."""
    lp = np.minimum(np.asarray(log_p, dtype=float), 0.0)
    two = np.asarray(two_sided, dtype=bool)
    with np.errstate(invalid="ignore"):
        one = -ndtri_exp(lp)
        both = np.maximum(0.0, -ndtri_exp(lp - LOG2))
    return np.where(two, both, one)
