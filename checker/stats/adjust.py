"""Adjusting a set of p-values for testing many claims at once.

A table of claims is a family of hypothesis tests.  Holm's step-down procedure
controls the family-wise error rate (the chance that any claim in the set
clears its level by luck alone); Benjamini and Hochberg's step-up procedure
controls the false discovery rate (the expected fraction of lucky claims among
those that clear).  Both come from statsmodels, with the method always named:
``multipletests`` defaults to Holm-Sidak.

References
----------
S. Holm, "A simple sequentially rejective multiple test procedure",
Scandinavian Journal of Statistics 6, 65 (1979).
Y. Benjamini and Y. Hochberg, "Controlling the false discovery rate: a
practical and powerful approach to multiple testing", J. R. Stat. Soc. B 57,
289 (1995).
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

# Our short names -> statsmodels' method names.
METHODS = {"holm": "holm", "bh": "fdr_bh"}


@dataclass(frozen=True)
class Adjustment:
    """Adjusted p-values for one family of tests, in the input's order.

    Attributes
    ----------
    tested : int
        How many finite p-values made up the family (m).
    p_holm, p_bh : numpy.ndarray
        Holm and Benjamini-Hochberg adjusted p-values; NaN where the input was.
    log_p_holm, log_p_bh : numpy.ndarray
        Their natural logs.  Where an adjusted p-value underflows to 0 (a raw
        p below about 1e-308), the log holds the Bonferroni bound
        log(m) + log(p), which both adjusted values never exceed.
    """

    tested: int
    p_holm: np.ndarray
    p_bh: np.ndarray
    log_p_holm: np.ndarray
    log_p_bh: np.ndarray


def adjust_p_values(p_values, method: str) -> np.ndarray:
    """Adjusted p-values by ``method`` (``"holm"`` or ``"bh"``).

    Parameters
    ----------
    p_values : array_like
        Raw p-values in [0, 1]; NaN entries are left out of the family and
        come back as NaN.
    method : {"holm", "bh"}
        Holm (1979) step-down, or Benjamini-Hochberg (1995) step-up.

    Returns
    -------
    numpy.ndarray
        The adjusted p-values, in the input's order.

    Raises
    ------
    ValueError
        For an unknown method or a p-value outside [0, 1].
    """
    if method not in METHODS:
        raise ValueError(f"method must be one of {sorted(METHODS)}, got {method!r}")
    p = np.asarray(p_values, dtype=float)
    finite = np.isfinite(p)
    if np.any((p[finite] < 0) | (p[finite] > 1)):
        raise ValueError("p-values must lie in [0, 1]")
    out = np.full(p.shape, np.nan)
    if finite.any():
        from statsmodels.stats.multitest import multipletests  # heavy: only when asked

        _, corrected, _, _ = multipletests(p[finite], method=METHODS[method])
        out[finite] = corrected
    return out


def adjust_log_p_values(log_p) -> Adjustment:
    """Holm and Benjamini-Hochberg adjustment of p-values held as natural logs.

    Parameters
    ----------
    log_p : array_like
        log p of each test; NaN for a claim with no p-value (left out of the
        family); -inf for p = 0.

    Returns
    -------
    Adjustment
    """
    log_p = np.minimum(np.asarray(log_p, dtype=float), 0.0)
    finite = ~np.isnan(log_p)  # -inf (p = 0) is a test too
    m = int(finite.sum())
    with np.errstate(under="ignore"):
        p = np.where(finite, np.exp(log_p), np.nan)
    bound = np.minimum(0.0, math.log(m) + log_p) if m else log_p
    logs = {}
    adjusted = {}
    for method in METHODS:
        q = adjust_p_values(p, method)
        adjusted[method] = q
        with np.errstate(divide="ignore"):
            lq = np.log(q)
        # Underflow: keep the Bonferroni bound, which is never below Holm's or BH's value.
        logs[method] = np.where(finite & (q == 0.0), bound, lq)
    return Adjustment(m, adjusted["holm"], adjusted["bh"], logs["holm"], logs["bh"])
