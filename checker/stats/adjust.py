"""Adjusting a set of p-values for testing many claims at once.

A table of claims is a family of hypothesis tests.  Holm's step-down procedure
controls the family-wise error rate (the chance that any claim in the set
clears its level by luck alone); Benjamini and Hochberg's step-up procedure
controls the false discovery rate (the expected fraction of lucky claims among
those that clear).  Both are computed here in log space (see
:func:`_log_adjusted` for why not statsmodels, which the tests compare with;
its ``multipletests`` defaults to Holm-Sidak, so the method is always named).

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

# Our short names -> statsmodels' method names (the tests' reference).
ADJUSTMENTS = {"holm": "holm", "bh": "fdr_bh"}


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
        Their natural logs, computed in log space: exact where the adjusted
        p-value itself underflows to 0 (a raw p below about 1e-308).
    """

    tested: int
    p_holm: np.ndarray
    p_bh: np.ndarray
    log_p_holm: np.ndarray
    log_p_bh: np.ndarray


def _log_adjusted(log_p: np.ndarray, method: str) -> np.ndarray:
    """Holm or BH adjusted log p-values for a family of finite-or--inf logs.

    Written in log space here rather than taken from statsmodels'
    ``multipletests``: the log form keeps adjusted p-values below the double
    range exact (statsmodels works with p and gives 0 there), and statsmodels'
    Holm branch calls ``gc.collect()`` on every call, which costs a batch of a
    million claims seconds.  The tests compare both with statsmodels.

    Holm (1979): the i-th smallest of m p-values (i from 1) is adjusted to
    max over j <= i of min(1, (m - j + 1) p_(j)).  Benjamini and Hochberg
    (1995): to min over j >= i of min(1, m p_(j) / j).
    """
    m = log_p.size
    order = np.argsort(log_p, kind="stable")
    ranked = log_p[order]
    i = np.arange(1, m + 1, dtype=float)
    if method == "holm":
        steps = np.maximum.accumulate(np.minimum(0.0, np.log(m - i + 1) + ranked))
    else:
        steps = np.minimum.accumulate(np.minimum(0.0, math.log(m) - np.log(i) + ranked)[::-1])[::-1]
    out = np.empty(m)
    out[order] = steps
    return out


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
    if method not in ADJUSTMENTS:
        raise ValueError(f"method must be one of {sorted(ADJUSTMENTS)}, got {method!r}")
    p = np.asarray(p_values, dtype=float)
    finite = np.isfinite(p)
    if np.any((p[finite] < 0) | (p[finite] > 1)):
        raise ValueError("p-values must lie in [0, 1]")
    out = np.full(p.shape, np.nan)
    if finite.any():
        with np.errstate(divide="ignore"):
            out[finite] = np.exp(_log_adjusted(np.log(p[finite]), method))
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
    logs = {}
    adjusted = {}
    for method in ADJUSTMENTS:
        lq = np.full(log_p.shape, np.nan)
        if m:
            lq[finite] = _log_adjusted(log_p[finite], method)
        logs[method] = lq
        with np.errstate(under="ignore"):
            adjusted[method] = np.exp(lq)
    return Adjustment(m, adjusted["holm"], adjusted["bh"], logs["holm"], logs["bh"])
