"""Do the parts agree with each other?  Cochran's Q and what follows from it.

Q = sum w_i (x_i - x_iv)^2 with w_i = 1/s_i^2 and x_iv the inverse-variance
mean; under agreement Q ~ chi^2 with K - 1 degrees of freedom.  From Q:
I^2 = max(0, (Q - df)/Q), the share of the scatter beyond what the errors
explain; H = sqrt(Q/df), which is also the Birge ratio and the Particle Data
Group's scale factor S = sqrt(chi^2/(N - 1)), applied (to the error of an
inverse-variance mean) only when it exceeds 1; and the DerSimonian-Laird
between-part variance tau^2 = max(0, (Q - df) / (W - sum w^2 / W)).

References
----------
W. G. Cochran, "The combination of estimates from different experiments",
Biometrics 10, 101 (1954) (from memory).
J. P. T. Higgins and S. G. Thompson, "Quantifying heterogeneity in a
meta-analysis", Stat. Med. 21, 1539 (2002): I^2 and H.
Particle Data Group, Review of Particle Physics, Introduction, "Averages and
fits": the scale factor S, applied when S > 1 (from memory).
R. DerSimonian and N. Laird, Control. Clin. Trials 7, 177 (1986).
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Sequence

import numpy as np


@dataclass(frozen=True)
class Heterogeneity:
    """Cochran's Q across K parts and the measures derived from it.

    Attributes
    ----------
    q : float
        Cochran's Q.
    df : int
        K - 1.
    log_p_q : float
        Natural log of the chi-square upper tail of Q (kept in logs: a large
        Q's p-value falls below the double range).
    i2, h : float
        Higgins and Thompson's I^2 (in [0, 1)) and H.
    tau2 : float
        DerSimonian-Laird between-part variance.
    """

    q: float
    df: int
    log_p_q: float
    i2: float
    h: float
    tau2: float

    @property
    def p_q(self) -> float:
        return math.exp(self.log_p_q) if self.log_p_q > -745.0 else 0.0

    @property
    def scale_factor(self) -> float:
        """The PDG scale factor: H when above 1, otherwise 1."""
        return scale_factor(self.q, self.df)


def i_squared(q: float, df: int) -> float:
    """I^2 = max(0, (Q - df)/Q); 0 when Q is 0."""
    if q <= 0:
        return 0.0
    return max(0.0, (q - df) / q)


def birge_ratio(q: float, df: int) -> float:
    """H = sqrt(Q/df), the Birge ratio."""
    if df < 1:
        raise ValueError("the Birge ratio needs at least two parts")
    return math.sqrt(max(q, 0.0) / df)


def scale_factor(q: float, df: int) -> float:
    """S = max(1, sqrt(Q/df)): scale an error only when the parts scatter more
    than their errors allow."""
    return max(1.0, birge_ratio(q, df))


def log_p_chi2(q: float, df: int) -> float:
    """log of P(chi^2_df >= q), finite however large q is.

    ``scipy.special.chdtrc`` (the regularised upper incomplete gamma function,
    without the import cost of ``scipy.stats``) underflows to 0 once the tail
    falls below the double range; there the asymptotic expansion
    Gamma(a, x) ~ x^(a-1) e^-x sum_k (a-1)(a-2)...(a-k) / x^k with a = df/2,
    x = q/2 takes over, accurate to double precision since x is then far above
    a (Abramowitz and Stegun, Handbook of Mathematical Functions, eq. 6.5.32).
    """
    from scipy.special import chdtrc

    p = float(chdtrc(df, max(q, 0.0)))
    if p > 1e-300:
        return math.log(p)
    a, x = df / 2.0, q / 2.0
    total, term = 1.0, 1.0
    for k in range(1, 200):
        term *= (a - k) / x
        total += term
        if abs(term) < 1e-17 * abs(total):
            break
    return (a - 1.0) * math.log(x) - x - math.lgamma(a) + math.log(total)


def cochran_q(estimates: Sequence[float], errors: Sequence[float]) -> float:
    """Cochran's Q.  Hand-written (one line of numpy) so that claims with parts
    need not import statsmodels; the tests hold it against statsmodels and the
    BCG worked example."""
    x = np.asarray(estimates, dtype=float)
    s = np.asarray(errors, dtype=float)
    if x.shape != s.shape or x.ndim != 1:
        raise ValueError("estimates and errors must be lists of the same length")
    if np.any(s <= 0) or not np.all(np.isfinite(s)) or not np.all(np.isfinite(x)):
        raise ValueError("errors must be finite and more than zero, estimates finite")
    w = 1.0 / (s * s)
    mean = np.dot(w, x) / w.sum()
    return float(np.dot(w, (x - mean) ** 2))


def dersimonian_laird_tau2(q: float, errors: Sequence[float]) -> float:
    """tau^2 = max(0, (Q - df) / (W - sum w^2 / W))."""
    s = np.asarray(errors, dtype=float)
    w = 1.0 / (s * s)
    df = s.size - 1
    denom = w.sum() - np.dot(w, w) / w.sum()
    if denom <= 0:
        return 0.0
    return float(max(0.0, (q - df) / denom))


def heterogeneity(estimates: Sequence[float], errors: Sequence[float]) -> Heterogeneity:
    """Cochran's Q, its p-value, I^2, H and the DerSimonian-Laird tau^2.

    Parameters
    ----------
    estimates, errors : sequences of float
        At least two parts, each error more than zero.
    """
    if len(estimates) < 2:
        raise ValueError("heterogeneity needs at least two parts")
    q = cochran_q(estimates, errors)
    df = len(estimates) - 1
    return Heterogeneity(q=q, df=df, log_p_q=log_p_chi2(q, df), i2=i_squared(q, df),
                         h=birge_ratio(q, df), tau2=dersimonian_laird_tau2(q, errors))
