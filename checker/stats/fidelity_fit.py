"""Fitting the fidelity F of the mixture F p + (1 - F)/D to the ideal
probabilities of the sampled outcomes.

Maximum likelihood.  A device with fidelity F produces outcome s with
probability F p_s + (1 - F)/D = (1 - F + F x_s)/D, x_s = D p_s.  The
likelihood of the observed outcomes is therefore prod_i (1 - F + F x_i)/D for
*any* set of ideal probabilities: it needs no Porter-Thomas assumption and no
large-D limit.  The log-likelihood sum_i ln(1 - F + F x_i) is concave in F, so
its maximum is the single root of the score sum_i (x_i - 1)/(1 - F + F x_i)
inside the interval where every term stays positive; its standard error is the
inverse square root of the observed information sum_i (x_i - 1)^2 / (1 - F +
F x_i)^2.

Moment estimator.  Under Porter-Thomas statistics E x = 1 + F (D - 1)/(D + 1)
(finite D; 1 + F for large D), so F = (mean x - 1)(D + 1)/(D - 1).  The plain
linear XEB mean(x) - 1 is this estimator without the finite-D factor.

References
----------
S. Boixo et al., "Characterizing quantum supremacy in near-term devices",
Nature Physics 14, 595 (2018), arXiv:1608.00263 (the fidelity mixture, linear
XEB, Porter-Thomas moments).
Observed-information standard errors: Y. Pawitan, "In All Likelihood", OUP
(2001), ch. 2 (common practice).
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from .porter_thomas import log_xeb_offsets  # noqa: F401  (kept here for its users)


@dataclass(frozen=True)
class FidelityFit:
    """One fitted fidelity.

    Attributes
    ----------
    method : str
        ``moment`` or ``maximum-likelihood``.
    fidelity, stat_error : float
    samples : int
    dimension : float or None
        D used for the finite-D factor (moment estimator); None for large D.
    at_boundary : bool
        The maximum sits on the edge of the allowed range (the score does not
        change sign there), so the standard error is only indicative.
    """

    method: str
    fidelity: float
    stat_error: float
    samples: int
    dimension: float | None = None
    at_boundary: bool = False

    def to_dict(self) -> dict:
        return {"method": self.method, "fidelity": self.fidelity, "stat_error": self.stat_error,
                "samples": self.samples, "at_boundary": self.at_boundary}


def finite_dimension_factor(dimension: float | None) -> float:
    """(D - 1)/(D + 1): how much of F the plain linear XEB recovers at finite D."""
    if dimension is None or math.isinf(dimension):
        return 1.0
    d = float(dimension)
    return (d - 1.0) / (d + 1.0)


def log_xeb_finite_dimension(estimate: float, dimension: float | None) -> float:
    """F from the log XEB mean(ln x) + gamma with the finite-D offsets removed."""
    u, i = log_xeb_offsets(dimension)
    return (estimate - u) / (i - u)


def moment_fidelity(mean_x: float, var_x: float, n: int, dimension: float | None = None) -> FidelityFit:
    """F from the mean of x = D p, with its standard error from the data.

    Parameters
    ----------
    mean_x, var_x : float
        Sample mean and variance of x.
    n : int
        Number of samples.
    dimension : float, optional
        D; the finite-D factor (D - 1)/(D + 1) is divided out when given.
    """
    factor = finite_dimension_factor(dimension)
    se = math.sqrt(max(var_x, 0.0) / n) / factor if n > 0 else math.inf
    return FidelityFit("moment", (mean_x - 1.0) / factor, se, int(n), dimension)


def _search_range(x: np.ndarray) -> tuple[float, float]:
    """F for which 1 - F + F x > 0 for every x, intersected with [-1, 2].

    Where the data set the limit, the end is open (the log-likelihood runs to
    minus infinity there); step inside it by a relative hair so the score
    stays finite.
    """
    xmin, xmax = float(x.min()), float(x.max())
    low, high = -1.0, 2.0
    open_low = xmax > 1.0 and -1.0 / (xmax - 1.0) > low
    open_high = xmin < 1.0 and 1.0 / (1.0 - xmin) < high
    if open_low:
        low = -1.0 / (xmax - 1.0)
    if open_high:
        high = 1.0 / (1.0 - xmin)
    span = high - low
    return (low + 1e-12 * span if open_low else low), (high - 1e-12 * span if open_high else high)


def max_likelihood_fidelity(x: np.ndarray, weights: np.ndarray | None = None) -> FidelityFit:
    """Maximum-likelihood F from scaled probabilities x = D p.

    Parameters
    ----------
    x : array
        Scaled ideal probabilities of the observed outcomes (or bin means).
    weights : array, optional
        How many samples each x stands for (bin counts); 1 each by default.

    Returns
    -------
    FidelityFit with ``method="maximum-likelihood"``.

    Notes
    -----
    Solved with ``scipy.optimize.brentq`` on the score, which is strictly
    decreasing in F, so the root is unique.
    """
    from scipy.optimize import brentq

    x = np.asarray(x, dtype=float).ravel()
    w = np.ones_like(x) if weights is None else np.asarray(weights, dtype=float).ravel()
    keep = w > 0
    x, w = x[keep], w[keep]
    n = float(w.sum())
    if x.size == 0:
        raise ValueError("no samples to fit")
    d = x - 1.0

    def score(f: float) -> float:
        return float(np.sum(w * d / (1.0 + f * d)))

    a, b = _search_range(x)
    s_a, s_b = score(a), score(b)
    at_boundary = False
    if s_a <= 0.0:
        f_hat, at_boundary = a, True
    elif s_b >= 0.0:
        f_hat, at_boundary = b, True
    else:
        f_hat = brentq(score, a, b, xtol=1e-14, rtol=1e-12, maxiter=200)
    info = float(np.sum(w * (d / (1.0 + f_hat * d)) ** 2))
    se = 1.0 / math.sqrt(info) if info > 0 else math.inf
    return FidelityFit("maximum-likelihood", float(f_hat), se, int(round(n)), None, at_boundary)
