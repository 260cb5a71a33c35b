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
from fractions import Fraction


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
    A count k fits when the division k/units, as a double, lies inside
    [low, high]: never by multiplying the bounds by ``units`` in floating
    point, where low * units can land a hair above a whole number
    (0.345 * 200 = 69.00000000000001) and lose the k that sits exactly on the
    edge of the printed interval.  The candidates come from exact rational
    arithmetic (the bounds as fractions times ``units``), so the cost does not
    grow with the counts and no count is too large: a unit-step search from
    a float product never ends where the float spacing exceeds 1, and a
    product beyond the double range overflows.
    """
    if int(units) != units or units < 1:
        raise ValueError(f"units must be a whole number of at least 1, got {units}")
    if not (math.isfinite(low) and math.isfinite(high)):
        raise ValueError("low and high must be finite")
    if low > high:
        raise ValueError("low must not exceed high")
    units = int(units)
    first = _edge(low, units, up=True)
    last = _edge(high, units, up=False)
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
    can_bite = step_wider(low, high, units)
    return Granularity(units, bool(fits), fits, below, above, can_bite)


# How far the double k/units may stray from the exact k/units past an edge; a
# bound on the steps taken back from the exact edge (each step is one k).
_ROUNDING_STEPS = 64


# Below this a double product bound * units has a rounding error under one
# unit, and a margin of FAST_MARGIN times its size (at least 1) exceeds it.
FAST_PRODUCT = 2.0 ** 50
FAST_MARGIN = 2.0 ** -50


def step_wider(low: float, high: float, units: int) -> bool:
    """1/units > high - low, exactly (:func:`step_wider_plain`).

    Quick path, in doubles: 1/units and high - low are each correctly rounded,
    so within a relative 2**-53 of the exact values; when they differ by more
    than 2**-50 relative the doubles order them as the exact values are ordered.
    Closer than that, or near the subnormal range, the exact fractions decide.
    (A profile of the interval check put half of granularity's cost in the
    fractions.)  tests/stats/test_granularity.py holds the two paths equal."""
    if units > FAST_PRODUCT:  # 1/units near or beyond the subnormal range, or units beyond a double
        return step_wider_plain(low, high, units)
    step = 1.0 / units
    width = high - low
    if step > 1e-290 and (width == 0.0 or width > 1e-290):
        if step > width * (1.0 + FAST_MARGIN):
            return True
        if step < width * (1.0 - FAST_MARGIN):
            return False
    return step_wider_plain(low, high, units)


def step_wider_plain(low: float, high: float, units: int) -> bool:
    """1/units > high - low in exact rational arithmetic (the reference of the quick path)."""
    return Fraction(1, units) > Fraction(high) - Fraction(low)


def exact_round(bound: float, units: int, up: bool) -> int:
    """ceil (``up``) or floor of the exact product bound * units.

    Quick path: the double product is within half a unit in its last place of
    the exact one; when it lies further than FAST_MARGIN x max(|product|, 1)
    from every whole number, the exact product has the same floor and ceiling.
    Otherwise (on or next to a whole number, or too large) the exact fraction
    decides (:func:`exact_round_plain`; tests hold the two equal)."""
    if units > FAST_PRODUCT:  # bound * units could overflow a double
        return exact_round_plain(bound, units, up)
    product = bound * units
    if abs(product) < FAST_PRODUCT:
        below = math.floor(product)
        margin = max(abs(product), 1.0) * FAST_MARGIN
        if product - below > margin and below + 1 - product > margin:
            return below + 1 if up else below
    return exact_round_plain(bound, units, up)


def exact_round_plain(bound: float, units: int, up: bool) -> int:
    """ceil (``up``) or floor of bound * units, from the exact fraction."""
    exact = Fraction(bound) * units
    return math.ceil(exact) if up else math.floor(exact)


def _edge(bound: float, units: int, up: bool) -> int:
    """The least k with k/units >= bound (``up``), or the greatest k with
    k/units <= bound, k/units taken as the double Python's division gives."""
    if up:
        k = exact_round(bound, units, True)  # k/units >= bound exactly, so also once rounded
        for _ in range(_ROUNDING_STEPS):  # a k below may round up onto the bound
            if _ratio(k - 1, units) >= bound:
                k -= 1
            else:
                break
        return k
    k = exact_round(bound, units, False)
    for _ in range(_ROUNDING_STEPS):
        if _ratio(k + 1, units) <= bound:
            k += 1
        else:
            break
    return k


def _ratio(k: int, units: int) -> float:
    try:
        return k / units  # correctly rounded, whatever the sizes of k and units
    except OverflowError:
        return math.inf if (k > 0) == (units > 0) else -math.inf
