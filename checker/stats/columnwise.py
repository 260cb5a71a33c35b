"""Significance over whole columns of claims at once (numpy and scipy.special).

For a table of claims the recomputed z and p of every claim are one array
expression: z = (estimate - threshold) / sqrt(stat^2 + syst^2), one-sided
log p = log Phi(-z), two-sided log p = log 2 + log Phi(-|z|).  These are the
printed central values; the per-claim ``significance`` check evaluates the same
formula over the box of printed precision, which contains them.

A marginalized systematic gives the quadrature value exactly for a Gaussian
null (Cousins and Highland 1992), so the column uses quadrature for both.

References
----------
Particle Data Group, Review of Particle Physics, chapter "Statistics" (G. Cowan).
R. D. Cousins and V. L. Highland, Nucl. Instrum. Meth. A 320, 331 (1992).
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np
from scipy.special import log_ndtr, ndtri, ndtri_exp

LOG2 = math.log(2.0)


@dataclass(frozen=True)
class SignificanceColumns:
    """z, log p and p for each claim; NaN where a claim lacks an input.

    Attributes
    ----------
    sigma : numpy.ndarray
        z under the claim's sidedness (|z| when two-sided).
    log_p : numpy.ndarray
        Natural log of the p-value (exact far beyond the double range of p).
    p : numpy.ndarray
        exp(log_p); 0.0 where it underflows.
    """

    sigma: np.ndarray
    log_p: np.ndarray
    p: np.ndarray


def error_from_interval(low, high, level) -> np.ndarray:
    """Standard error implied by symmetric intervals: (high - low) / (2 z_level),
    z_level = Phi^-1(1/2 + level/2) (1.96 for 0.95), computed as
    stats.interval.z_for_level does, without cancellation at levels near 0 or 1."""
    from scipy.special import erfinv

    low, high, level = (np.asarray(a, dtype=float) for a in (low, high, level))
    with np.errstate(invalid="ignore", divide="ignore", over="ignore"):
        z = np.where(level >= 0.5, -ndtri((1.0 - level) / 2.0), np.sqrt(2.0) * erfinv(level))
        return (high - low) / (2.0 * z)


def significance_columns(estimate, threshold, stat_error, syst_error, two_sided) -> SignificanceColumns:
    """Recomputed significance of each claim in a table.

    Parameters
    ----------
    estimate, threshold : array_like
        Printed estimate and the threshold it is claimed to exceed.
    stat_error : array_like
        The standard error the significance divides by (> 0); NaN when unknown.
    syst_error : array_like
        Systematic error added in quadrature; 0 when it does not enter.
    two_sided : array_like of bool
        True where the claim's p-value is two-sided.

    Returns
    -------
    SignificanceColumns
    """
    e, t, s, ss = (np.asarray(a, dtype=float) for a in (estimate, threshold, stat_error, syst_error))
    two = np.asarray(two_sided, dtype=bool)
    with np.errstate(invalid="ignore", divide="ignore"):
        usable = np.isfinite(e) & np.isfinite(t) & (s > 0) & np.isfinite(s)
        z = np.where(usable, (e - t) / np.hypot(s, np.where(np.isfinite(ss), ss, 0.0)), np.nan)
        sigma = np.where(two, np.abs(z), z)
        log_p = np.where(two, np.minimum(0.0, LOG2 + log_ndtr(-np.abs(z))), log_ndtr(-z))
        p = np.exp(log_p)
    return SignificanceColumns(sigma, log_p, p)


def sigma_from_log_p(log_p, two_sided) -> np.ndarray:
    """z whose tail area has log ``log_p``, one- or two-sided per claim (the
    inverse of the tails above; two-sided values are >= 0).  NaN stays NaN;
    log p = -inf gives +inf."""
    lp = np.minimum(np.asarray(log_p, dtype=float), 0.0)
    two = np.asarray(two_sided, dtype=bool)
    with np.errstate(invalid="ignore"):
        one = -ndtri_exp(lp)
        both = np.maximum(0.0, -ndtri_exp(lp - LOG2))
    return np.where(two, both, one)
