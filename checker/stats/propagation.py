"""Printed precision carried through a function of many inputs.

``precision.over_box`` evaluates every corner of the box of input intervals,
2**n evaluations: right for the handful of inputs of a significance, hopeless
for a combination of 13 parts (2**26 corners).  Here each input is moved to
the two ends of its interval in turn, the others held at their printed values,
and the worst-case deviations are added (first-order worst-case propagation).
For a function linear in its inputs, such as a weighted mean in its estimates,
the result is exact; for smooth functions the neglected second-order terms are
of order (half-width / value)**2, far below any tolerance a claim states.
"""

from __future__ import annotations

import math
from typing import Callable, Sequence

Range = tuple[float, float]


def _finite(x) -> bool:
    return x is not None and math.isfinite(x)


def ranges_one_at_a_time(fn: Callable[[list[float]], Sequence[float | None] | None],
                         centre: Sequence[float],
                         bounds: Sequence[Range]) -> list[Range] | None:
    """Ranges of every output of ``fn`` over the box ``bounds``, to first order.

    Parameters
    ----------
    fn : callable
        Takes a list of input values and returns a sequence of outputs (None
        or NaN for an output that cannot be computed there), or None.
    centre : sequence of float
        The printed values, each inside its interval.
    bounds : sequence of (low, high)
        Each input's interval.

    Returns
    -------
    list of (low, high), one per output; (nan, nan) for an output that is not
    finite at the centre.  None when ``fn`` gives nothing at the centre.

    References
    ----------
    Common practice: linear (first-order) worst-case error propagation, the sum
    of the absolute deviations each input causes on its own.
    """
    if len(centre) != len(bounds):
        raise ValueError("centre and bounds must have the same length")
    base = fn(list(centre))
    if base is None:
        return None
    base = [float(b) if _finite(b) else math.nan for b in base]
    down = [0.0] * len(base)
    up = [0.0] * len(base)
    for i, (lo, hi) in enumerate(bounds):
        if lo == hi:
            continue
        worst_up = [0.0] * len(base)
        worst_down = [0.0] * len(base)
        for end in (lo, hi):
            point = list(centre)
            point[i] = end
            moved = fn(point)
            if moved is None:
                continue
            for j, (b, m) in enumerate(zip(base, moved)):
                if _finite(m) and math.isfinite(b):
                    worst_up[j] = max(worst_up[j], m - b)
                    worst_down[j] = max(worst_down[j], b - m)
        for j in range(len(base)):
            up[j] += worst_up[j]
            down[j] += worst_down[j]
    return [(b - d, b + u) if math.isfinite(b) else (math.nan, math.nan)
            for b, d, u in zip(base, down, up)]
