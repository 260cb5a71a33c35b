"""Which denominator a printed binomial interval was computed with.

A printed rate k/N with a confidence interval that no method reproduces with
the stated N is often the right method applied with the wrong N: a recall's
interval computed with all cases instead of the positives, a specificity's
with the predicted negatives.  This module searches the whole numbers N' for
which a method, applied to the printed rate, gives both printed ends.

How it searches: every method's interval narrows as N grows at a fixed rate
(the half-width falls like 1/sqrt(N)), so the N' whose width can match the
printed width form one run of whole numbers, found by two bisections over
[1, ``n_max``]; each N' of the run (or, in a long run, an even sample of
``MAX_CHECKED`` of them and both ends) is then checked for both ends.  The
rate is taken at ``RATE_POINTS`` points across its printed interval, so the
search can miss a fit that needs one exact rate inside a wide printed rate:
it is a search for an explanation, not the basis of a flag.

When the printed interval is wider than the binomial one, the N' found is an
effective sample size, and N / N' the design effect (Kish 1965, Survey
Sampling, Sec. 8.2: the ratio of the actual variance to that of simple random
sampling of the same size): a clustered analysis is a legitimate reason.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from .binomial_intervals import INTERVAL_METHODS, interval_arrays, proportion_intervals
from .interval import z_for_level

MAX_CHECKED = 400   # N' checked one by one in a run of candidates
RATE_POINTS = 5     # rates tried across the printed rate's interval
N_MAX = 10**9       # the largest denominator searched


@dataclass(frozen=True)
class DenominatorFit:
    """One method that reproduces the printed interval with denominators
    ``n_low`` to ``n_high`` (every checked N' between them fits); ``low`` and
    ``high`` are its interval at ``n_best``, the fit closest to the print;
    ``label`` names the margin of a counts table it is, when it is one."""

    method: str
    n_low: int
    n_high: int
    n_best: int
    low: float
    high: float
    label: str | None = None


@dataclass(frozen=True)
class DenominatorSearch:
    """The fits found, closest first (margins before other whole numbers),
    and whether a run of candidates was too long to check whole."""

    fits: tuple[DenominatorFit, ...]
    sampled: bool
    n_max: int


def _gap(value: np.ndarray, low: float, high: float) -> np.ndarray:
    return np.maximum(0.0, np.maximum(low - value, value - high))


def _misfit(method, rates, n, level, low_box, high_box):
    """For each N in ``n``: the smallest, over the rates, of the larger of the
    two ends' distances from their printed intervals, and the ends there."""
    p = np.asarray(rates, dtype=float)[:, None]
    size = np.asarray(n, dtype=float)[None, :]
    lo, hi = interval_arrays(np.clip(p, 0.0, 1.0) * size, size, level, method)
    off = np.maximum(_gap(lo, *low_box), _gap(hi, *high_box))
    best = np.argmin(off, axis=0)
    cols = np.arange(off.shape[1])
    return off[best, cols], lo[best, cols], hi[best, cols]


def _widths(method, rates, n, level):
    widths = [hi - lo for lo, hi in proportion_intervals([min(max(p, 0.0), 1.0) * n for p in rates],
                                                          n, level, method)]
    return min(widths), max(widths)


def _bracket(pred, guess: float | None, n_max: int) -> tuple[int, int]:
    """[lo, hi] about ``guess`` with pred(lo) false (or lo = 1) and pred(hi)
    true (or hi = n_max), for :func:`_first`; [1, n_max] without a guess."""
    if guess is None or not math.isfinite(guess):
        return 1, n_max
    lo = max(1, min(n_max, int(guess / 100)))
    hi = max(1, min(n_max, int(guess * 100) + 10))
    if lo > 1 and pred(lo):
        lo = 1
    if hi < n_max and not pred(hi):
        hi = n_max
    return lo, hi


def _first(pred, lo: int, hi: int) -> int:
    """The smallest N in [lo, hi] with pred(N) true (pred false then true as N
    grows), or hi + 1."""
    if not pred(hi):
        return hi + 1
    while lo < hi:
        mid = (lo + hi) // 2
        if pred(mid):
            hi = mid
        else:
            lo = mid + 1
    return lo


def search_denominator(rate: tuple[float, float], low: tuple[float, float], high: tuple[float, float],
                       level: float, slack: float, *, margins: dict[str, int] | None = None,
                       methods=INTERVAL_METHODS, n_max: int = N_MAX) -> DenominatorSearch:
    """Denominators N' with which a method reproduces a printed interval.

    Parameters
    ----------
    rate : (float, float)
        The printed rate's interval (or an exact k/N twice).
    low, high : (float, float)
        The printed interval ends' intervals.
    level : float
        The interval's confidence level.
    slack : float
        How far an end may lie from its printed interval and still fit.
    margins : dict, optional
        Labelled denominators to try first (a counts table's margins).
    methods : sequence of str
    n_max : int
        The largest N' searched.

    Returns
    -------
    DenominatorSearch
    """
    rates = [float(r) for r in np.unique(np.linspace(max(rate[0], 0.0), min(rate[1], 1.0), RATE_POINTS))]
    low_box = (low[0] - slack, low[1] + slack)
    high_box = (high[0] - slack, high[1] + slack)
    width_low = max(high[0] - low[1] - 2 * slack, 0.0)
    width_high = high[1] - low[0] + 2 * slack
    found: list[tuple[int, float, int, DenominatorFit]] = []
    labelled = set()
    for label, size in (margins or {}).items():
        if not 1 <= size <= n_max:
            continue
        for order, method in enumerate(methods):
            off, lo, hi = _misfit(method, rates, [size], level, low_box, high_box)
            if off[0] == 0.0:
                found.append((0, abs(lo[0] - sum(low) / 2) + abs(hi[0] - sum(high) / 2), order,
                              DenominatorFit(method, size, size, size, float(lo[0]), float(hi[0]), label)))
                labelled.add((method, size))
    sampled = False
    # The Wald N for the printed width: every method's candidates lie within a
    # factor of it except at tiny N, and the bisections start from a bracket
    # about it (checked, and widened to [1, n_max] when it does not hold).
    middle = (rates[0] + rates[-1]) / 2
    z = z_for_level(level)
    half = (width_low + width_high) / 4
    try:
        guess = z * z * middle * (1 - middle) / (half * half) if half > 0 and 0 < middle < 1 else None
    except (ZeroDivisionError, OverflowError):  # a width too small or too large to square
        guess = None
    for order, method in enumerate(methods):
        # Widths fall as N grows: the candidates are the N whose narrowest
        # width is at most the widest printed one and whose widest width is at
        # least the narrowest printed one.
        narrow_enough = lambda m: _widths(method, rates, m, level)[0] <= width_high  # noqa: E731
        too_narrow = lambda m: _widths(method, rates, m, level)[1] < width_low  # noqa: E731
        start = _first(narrow_enough, *_bracket(narrow_enough, guess, n_max))
        stop = _first(too_narrow, *_bracket(too_narrow, guess, n_max)) - 1
        if start > stop:
            continue
        if stop - start + 1 > MAX_CHECKED:
            sampled = True
            candidates = np.unique(np.linspace(start, stop, MAX_CHECKED).round().astype(np.int64))
        else:
            candidates = np.arange(start, stop + 1, dtype=np.int64)
        off, lo, hi = _misfit(method, rates, candidates, level, low_box, high_box)
        fits = np.flatnonzero(off == 0.0)
        if fits.size == 0:
            continue
        # Runs of consecutive candidates that fit, each one fit.
        breaks = np.flatnonzero(np.diff(fits) > 1)
        for run in np.split(fits, breaks + 1):
            closeness = np.abs(lo[run] - sum(low) / 2) + np.abs(hi[run] - sum(high) / 2)
            best = run[int(np.argmin(closeness))]
            n_best = int(candidates[best])
            if (method, n_best) in labelled:
                continue
            found.append((1, float(closeness.min()), order,
                          DenominatorFit(method, int(candidates[run[0]]), int(candidates[run[-1]]), n_best,
                                         float(lo[best]), float(hi[best]))))
    found.sort(key=lambda item: item[:3])
    return DenominatorSearch(tuple(item[3] for item in found), sampled, n_max)


def effective_sample_size(rate: float, half_width: float, level: float) -> float:
    """The N for which the Wald half-width z sqrt(p(1 - p)/N) equals the
    printed one: the effective sample size of an interval wider (or narrower)
    than the binomial one (Kish 1965, Survey Sampling, Sec. 8.2, from memory).
    Infinite for a zero half-width; zero for a rate of 0 or 1."""
    z = z_for_level(level)
    if not half_width > 0:
        return math.inf
    try:
        return z * z * rate * (1.0 - rate) / (half_width * half_width)
    except OverflowError:  # a half-width near the double range's edge
        return 0.0
    except ZeroDivisionError:  # a half-width whose square underflows
        return math.inf
