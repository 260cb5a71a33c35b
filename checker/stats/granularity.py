"""Granularity: which printed values a count of whole items can produce.

A proportion of N whole items is k/N for a whole k; a mean of N whole-number
responses is T/N for a whole total T; with each response the average of L
whole-number items it is T/(N L).  A printed value stands for the interval its
digits allow, so it is possible exactly when some k/units falls inside that
interval.  The rule can only bite when one step 1/units is wider than the
printed interval, that is when units < 10**d for d printed decimals.

References
----------
N. J. L. Brown and J. A. J. Heathers, "The GRIM test: a simple technique
detects numerous anomalies in the reporting of results in psychology", Social
Psychological and Personality Science 8, 363 (2017) (volume and pages from
memory): the granularity-related inconsistency of means, and its extension to
multi-item scales by multiplying N by the number of items.
"""

from __future__ import annotations

import math
from dataclasses import dataclass


@dataclass(frozen=True)
class Granularity:
    """Whether a printed interval holds some k/units.

    Attributes
    ----------
    units : int
        The denominator (items, or responses times items per response).
    possible : bool
        Some whole k has k/units inside [low, high].
    counts : tuple of int
        The whole k that fit (at most a few are kept), empty when impossible.
    below, above : int or None
        The nearest whole k whose k/units lies below ``low`` and above ``high``.
    can_bite : bool
        One step 1/units is wider than the printed interval, so not every
        printed value is possible.
    """

    units: int
    possible: bool
    counts: tuple[int, ...]
    below: int | None
    above: int | None
    can_bite: bool


def granularity(low: float, high: float, units: int, lowest: int | None = None,
                highest: int | None = None, keep: int = 5) -> Granularity:
    """Whole counts k (lowest <= k <= highest) with low <= k/units <= high.

    Parameters
    ----------
    low, high : float
        The interval the printed value stands for.
    units : int
        The denominator, at least 1.
    lowest, highest : int, optional
        The range k can take (0 and ``units`` for a proportion); unbounded
        when None.
    keep : int
        How many fitting counts to report.

    Notes
    -----
    Each candidate is tested by the division k/units itself, never by
    multiplying the bounds by ``units``: low * units can land a hair above a
    whole number (0.345 * 200 = 69.00000000000001) and lose the k that sits
    exactly on the edge of the printed interval.
    """
    if units < 1 or int(units) != units:
        raise ValueError(f"units must be a whole number of at least 1, got {units}")
    if low > high:
        raise ValueError("low must not exceed high")
    units = int(units)
    first = math.floor(low * units) - 1  # a step below the first candidate
    while first / units < low:
        first += 1
    last = math.ceil(high * units) + 1  # a step above the last candidate
    while last / units > high:
        last -= 1
    if lowest is not None:
        first = max(first, lowest)
    if highest is not None:
        last = min(last, highest)
    fits = tuple(range(first, min(last, first + keep - 1) + 1)) if first <= last else ()
    below = first - 1 if lowest is None or first - 1 >= lowest else None
    above = last + 1 if highest is None or last + 1 <= highest else None
    if not fits:
        # Nearest counts on either side of the empty interval.
        below = last if lowest is None or last >= lowest else None
        above = first if highest is None or first <= highest else None
    can_bite = 1.0 / units > (high - low)
    return Granularity(units, bool(fits), fits, below, above, can_bite)
