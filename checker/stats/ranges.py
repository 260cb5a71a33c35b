"""The range engine: the minimum and maximum of a recomputed quantity over the
box of its inputs' printed intervals.

A printed number stands for an interval, so a quantity recomputed from printed
numbers is an interval too: its exact minimum and maximum over the box of the
inputs' intervals.  Each function here names the method it uses and when that
method is exact:

- ``vertex_range``: the box's vertices.  Exact for a function that is monotone
  in each input when the others are held fixed (in either direction, and the
  direction may depend on the others): moving the inputs to an end one at a
  time never loses the extremum.  z = (x - t)/s, products, quotients, tail
  probabilities of z.
- ``scalar_range``: one input, any smooth function: the ends, a grid, and
  Brent's bounded minimisation of every interior extremum the grid brackets.
- ``binomial_variance_range``: p (1 - p) in closed form (it peaks at 1/2).
- ``weighted_mean_range``: sum w x / sum w with values and weights each in an
  interval.  Exact: at the maximum every value is at its upper end and the
  weight of a part is at its upper end exactly when its value exceeds the
  maximum (a fractional-programming threshold), so the K + 1 thresholds of the
  sorted values are the only candidates.
- ``weighted_ss_range``: sum w (x - xbar_w)^2 (Cochran's Q, and the scatter of
  the parts) over a box of values.  The minimum is a convex problem solved
  exactly: min over mu of sum w dist(mu, [a_i, b_i])^2, a convex piecewise
  quadratic in one variable.  The maximum of a convex function lies on a
  vertex: every vertex is tried up to ``EXHAUSTIVE_PARTS`` parts; beyond, the
  vertices that split the parts at a threshold, improved by single flips, and
  certified against the min-max bound min over mu of sum w max((a - mu)^2,
  (b - mu)^2); where the certificate fails the bound itself is returned (a
  range that holds the exact one and is at most that much wider).
- ``bounded_range``: several inputs, no structure known: L-BFGS-B (bounded
  quasi-Newton, scipy.optimize.minimize) from given starting points, in both
  directions.  A local search: the one approximate method here, used only
  where no closed form is known (random-effects fits, the Birge-scaled error,
  the samples-weighted error when the samples carry printed precision).

No first-order (one-input-at-a-time) propagation is used anywhere.

References
----------
W. Dinkelbach, "On nonlinear fractional programming", Manage. Sci. 13, 492
(1967): the threshold structure of the weighted mean's extremes.
S. Ferson et al., "Exact bounds on finite populations of interval data",
Reliable Computing 11, 207 (2005): the lower bound of the variance of interval
data is a convex problem; the upper bound is NP-hard in general (hence the
certificate above).
R. P. Brent, Algorithms for Minimization without Derivatives (1973), ch. 5.
R. H. Byrd, P. Lu, J. Nocedal and C. Zhu, SIAM J. Sci. Comput. 16, 1190 (1995):
L-BFGS-B.
"""

from __future__ import annotations

import itertools
import math
from typing import Callable, Sequence

import numpy as np

Range = tuple[float, float]
NAN_RANGE: Range = (math.nan, math.nan)
EXHAUSTIVE_PARTS = 12  # 2**12 vertices, evaluated as one numpy array
GRID = 4  # intervals of the grid that brackets a scalar function's interior extrema


def _finite(v) -> bool:
    return v is not None and math.isfinite(v)


def vertex_range(fn: Callable[..., float | None], boxes: Sequence[tuple[float, float]]) -> Range:
    """Range of ``fn`` over the vertices of the box.

    Exact when ``fn`` is monotone in each input with the others held fixed.
    Vertices where ``fn`` is None or not finite are skipped; (nan, nan) when
    none is finite.
    """
    values = []
    for corner in itertools.product(*[sorted(set(b)) for b in boxes]):
        v = fn(*corner)
        if _finite(v):
            values.append(float(v))
    if not values:
        return NAN_RANGE
    return (min(values), max(values))


def scalar_range(fn: Callable[[float], float | None], low: float, high: float, grid: int = GRID) -> Range:
    """Range of a function of one input over [low, high].

    Method: the ends, a point just inside each end and a grid of ``grid``
    intervals; every point that is a local extremum among its neighbours is
    refined by Brent's bounded method (scipy.optimize.minimize_scalar) on its two
    neighbouring intervals.  Exact (to the optimiser's tolerance) for any
    function whose interior extrema are at least one grid interval apart; the
    metric models' variances have at most one.
    """
    if not (math.isfinite(low) and math.isfinite(high)):
        return NAN_RANGE
    if low == high:
        v = fn(low)
        return (float(v), float(v)) if _finite(v) else NAN_RANGE
    # A grid, and a point just inside each end: an extremum between an end and its neighbour
    # then shows as a local extremum of the grid too.
    inner = 1e-7 * (high - low)
    xs = np.unique(np.concatenate((np.linspace(low, high, grid + 1), [low + inner, high - inner])))
    ys = []
    for x in xs:
        v = fn(float(x))
        ys.append(float(v) if _finite(v) else math.nan)
    ys = np.asarray(ys)
    if not np.any(np.isfinite(ys)):
        return NAN_RANGE
    lo, hi = float(np.nanmin(ys)), float(np.nanmax(ys))
    interior = []
    for i in range(1, xs.size - 1):
        a, b, c = ys[i - 1], ys[i], ys[i + 1]
        if not (math.isfinite(a) and math.isfinite(b) and math.isfinite(c)):
            continue
        if b < min(a, c) or (b <= min(a, c) and b < max(a, c)):
            interior.append((i, 1.0))
        if b > max(a, c) or (b >= max(a, c) and b > min(a, c)):
            interior.append((i, -1.0))
    if interior:
        from scipy.optimize import minimize_scalar

        for i, sign in interior:
            def objective(x, sign=sign):
                v = fn(float(x))
                return sign * v if _finite(v) else math.inf

            res = minimize_scalar(objective, bounds=(float(xs[i - 1]), float(xs[i + 1])), method="bounded",
                                  options={"xatol": 1e-12 * max(abs(low), abs(high), 1e-300)})
            v = fn(float(res.x))
            if _finite(v):
                lo, hi = min(lo, float(v)), max(hi, float(v))
    return (lo, hi)


def binomial_variance_range(low: float, high: float) -> Range:
    """Exact range of p (1 - p) for p in [low, high] (clipped to [0, 1]): a
    parabola with its peak 1/4 at p = 1/2, so the maximum is interior whenever
    1/2 is inside, and the minimum is at the end farther from 1/2."""
    a, b = min(max(low, 0.0), 1.0), min(max(high, 0.0), 1.0)
    ends = (a * (1 - a), b * (1 - b))
    peak = 0.25 if a <= 0.5 <= b else max(ends)
    return (min(ends), peak)


def linear_xeb_variance_range(f_low: float, f_high: float, dimension: float | None = None) -> Range:
    """Exact range of the linear-XEB per-sample variance for a mixture weight F in
    [f_low, f_high] (clipped to [0, 1]).

    The moments of x under the mixture are linear in F (mean a + b F, second moment
    c + e F; ``stats.porter_thomas.linear_xeb_moments``), so the variance
    c + e F - (a + b F)^2 is a concave parabola in F with its vertex at
    F* = (e - 2 a b) / (2 b^2): the minimum is at an end, the maximum at F* when it
    lies inside, else at an end (the clip at 0 is monotone and keeps both).  Replaces
    the grid-and-Brent search of ``scalar_range``, which the tests compare it with.
    """
    from .porter_thomas import linear_xeb_moments

    if not (math.isfinite(f_low) and math.isfinite(f_high)):
        return NAN_RANGE
    a_f, b_f = min(max(f_low, 0.0), 1.0), min(max(f_high, 0.0), 1.0)
    a, s0 = linear_xeb_moments(0.0, dimension)
    m1, v1 = linear_xeb_moments(1.0, dimension)
    slope = m1 - a  # b
    e = (v1 + m1 * m1) - (s0 + a * a)  # the second moment's slope (the variance at F = 0 is not clipped)
    ends = (linear_xeb_moments(a_f, dimension)[1], linear_xeb_moments(b_f, dimension)[1])
    high = max(ends)
    if slope != 0.0:
        vertex = (e - 2.0 * a * slope) / (2.0 * slope * slope)
        if a_f < vertex < b_f:
            high = max(high, linear_xeb_moments(vertex, dimension)[1])
    return (min(ends), high)


def concave_parabola_range(fn: Callable[[float], float], f_low: float, f_high: float) -> Range:
    """Range over [f_low, f_high] (clipped to [0, 1]) of a mixture variance fn(F) =
    second(F) - mean(F)^2 whose moments are linear in F, so a concave parabola.

    Three values at F = 0, 1/2, 1 fix the parabola; the minimum is at an end and the
    maximum at its vertex when inside, else at an end.  Falls back to ``scalar_range``
    when a value is not positive (fn clips the variance at 0) or the fit is not
    concave.  The tests compare it with ``scalar_range``.
    """
    if not (math.isfinite(f_low) and math.isfinite(f_high)):
        return NAN_RANGE
    a, b = min(max(f_low, 0.0), 1.0), min(max(f_high, 0.0), 1.0)
    q0, qh, q1 = fn(0.0), fn(0.5), fn(1.0)
    c2 = 2.0 * (q0 - 2.0 * qh + q1)
    if not (q0 > 0 and qh > 0 and q1 > 0 and c2 < 0 and all(map(math.isfinite, (q0, qh, q1)))):
        return scalar_range(fn, a, b)
    ends = (fn(a), fn(b))
    high = max(ends)
    vertex = -(q1 - q0 - c2) / (2.0 * c2)
    if a < vertex < b:
        high = max(high, fn(vertex))
    return (min(ends), high)


def _threshold_max(values: np.ndarray, w_low: np.ndarray, w_high: np.ndarray) -> float:
    """max over w in the box of sum w v / sum w (values fixed)."""
    order = np.argsort(-values, kind="stable")
    v, lo, hi = values[order], w_low[order], w_high[order]
    # Candidate k: the k largest values at their upper weight, the rest at the lower.
    hi_num = np.concatenate(([0.0], np.cumsum(hi * v)))
    hi_den = np.concatenate(([0.0], np.cumsum(hi)))
    lo_num = np.concatenate((np.cumsum((lo * v)[::-1])[::-1], [0.0]))
    lo_den = np.concatenate((np.cumsum(lo[::-1])[::-1], [0.0]))
    den = hi_den + lo_den
    with np.errstate(invalid="ignore", divide="ignore"):
        means = (hi_num + lo_num) / den
    means = means[np.isfinite(means) & (den > 0)]
    return float(np.max(means)) if means.size else math.nan


def weighted_mean_range(x_low, x_high, w_low, w_high) -> Range:
    """Exact range of sum w_i x_i / sum w_i with x_i in [x_low_i, x_high_i] and
    w_i in [w_low_i, w_high_i] (w >= 0, each box independent).

    The mean rises with every x_i (positive weights), so the maximum takes
    every x_i at its upper end; over the weights the maximum of the ratio puts
    w_i at its upper end exactly when x_i lies above the maximum itself
    (Dinkelbach 1967), so the sorted thresholds are the only candidates.
    """
    x_low, x_high = np.asarray(x_low, float), np.asarray(x_high, float)
    w_low, w_high = np.asarray(w_low, float), np.asarray(w_high, float)
    high = _threshold_max(x_high, w_low, w_high)
    low = -_threshold_max(-x_low, w_low, w_high)
    return (low, high)


def weighted_ss_min(a: np.ndarray, b: np.ndarray, w: np.ndarray) -> float:
    """min over mu of sum w dist(mu, [a, b])^2, exactly.

    The derivative, 2 [sum_{b_i < mu} w_i (mu - b_i) - sum_{a_i > mu} w_i (a_i - mu)],
    rises with mu and is linear between the sorted ends; the root is found on
    its segment and solved there.
    """
    points = np.unique(np.concatenate((a, b)))
    ob, oa = np.argsort(b), np.argsort(a)
    bs, wb = b[ob], w[ob]
    as_, wa = a[oa], w[oa]
    cw_b = np.concatenate(([0.0], np.cumsum(wb)))
    cwx_b = np.concatenate(([0.0], np.cumsum(wb * bs)))
    cw_a = np.concatenate((np.cumsum(wa[::-1])[::-1], [0.0]))
    cwx_a = np.concatenate((np.cumsum((wa * as_)[::-1])[::-1], [0.0]))

    def slope_parts(mu_index_b, mu_index_a):
        return cw_b[mu_index_b], cwx_b[mu_index_b], cw_a[mu_index_a], cwx_a[mu_index_a]

    # Derivative / 2 at each point: below-sum over b_i < mu, above-sum over a_i > mu.
    ib = np.searchsorted(bs, points, side="left")
    ia = np.searchsorted(as_, points, side="right")
    d = (cw_b[ib] * points - cwx_b[ib]) - (cwx_a[ia] - cw_a[ia] * points)
    j = int(np.searchsorted(d, 0.0, side="left"))
    if j < len(points) and d[j] == 0.0:
        mu = float(points[j])
    else:
        # The root lies between points[j - 1] and points[j]; there the sets are fixed.
        left = points[j - 1] if j > 0 else points[0] - 1.0
        right = points[j] if j < len(points) else points[-1] + 1.0
        mid = 0.5 * (left + right)
        kb = int(np.searchsorted(bs, mid, side="left"))
        ka = int(np.searchsorted(as_, mid, side="right"))
        sw_b, swx_b, sw_a, swx_a = slope_parts(kb, ka)
        total = sw_b + sw_a
        mu = (swx_b + swx_a) / total if total > 0 else mid
        mu = float(min(max(mu, left), right))
    dist = np.where(mu < a, a - mu, np.where(mu > b, mu - b, 0.0))
    return float(np.dot(w, dist * dist))


def _ss(x: np.ndarray, w: np.ndarray) -> np.ndarray:
    """sum w (x - xbar_w)^2 along the last axis."""
    mean = (x @ w) / w.sum()
    dev = x - mean[..., None] if x.ndim > 1 else x - mean
    return (dev * dev) @ w


def weighted_ss_max(a: np.ndarray, b: np.ndarray, w: np.ndarray) -> float:
    k = a.size
    if k <= EXHAUSTIVE_PARTS:
        pick = ((np.arange(2 ** k)[:, None] >> np.arange(k)) & 1).astype(bool)
        return float(np.max(_ss(np.where(pick, b, a), w)))
    # Threshold vertices: the parts sorted by midpoint, the lower ones at their lower end.
    # Q = sum w x^2 - (sum w x)^2 / sum w for every split at once, from cumulative sums.
    order = np.argsort(0.5 * (a + b), kind="stable")
    wa, wb = w[order] * a[order], w[order] * b[order]
    lower1 = np.concatenate(([0.0], np.cumsum(wa)))
    lower2 = np.concatenate(([0.0], np.cumsum(wa * a[order])))
    upper1 = np.concatenate((np.cumsum(wb[::-1])[::-1], [0.0]))
    upper2 = np.concatenate((np.cumsum((wb * b[order])[::-1])[::-1], [0.0]))
    first = lower1 + upper1
    q_splits = lower2 + upper2 - first * first / w.sum()
    split = int(np.argmax(q_splits))
    best_x = np.empty(k)
    best_x[order[:split]] = a[order[:split]]
    best_x[order[split:]] = b[order[split:]]
    best = float(_ss(best_x, w))
    # Single flips: each coordinate to the end farther from the others' weighted mean.
    for _ in range(k):
        wsum = w.sum()
        others = (best_x @ w - w * best_x) / (wsum - w)
        x = np.where(np.abs(a - others) > np.abs(b - others), a, b)
        v = float(_ss(x, w))
        if v <= best * (1 + 1e-15):
            break
        best, best_x = v, x
    # Certificate: max_x min_mu <= min_mu max_x, a convex function of mu.
    from scipy.optimize import minimize_scalar

    def bound(mu):
        return float(np.dot(w, np.maximum((a - mu) ** 2, (b - mu) ** 2)))

    res = minimize_scalar(bound, bounds=(float(a.min()), float(b.max())), method="bounded",
                          options={"xatol": 1e-12 * max(abs(a).max(), abs(b).max(), 1e-300)})
    upper = min(bound(float(res.x)), bound(float(np.dot(w, 0.5 * (a + b)) / w.sum())))
    return best if best >= upper * (1 - 1e-9) else upper


def weighted_ss_range(x_low, x_high, w_min, w_max) -> Range:
    """Range of Q = sum w_i (x_i - xbar_w)^2 with x_i in [x_low_i, x_high_i] and
    w_i in [w_min_i, w_max_i].

    Q = min over mu of sum w_i (x_i - mu)^2 rises with every w_i (its
    derivative is (x_i - xbar_w)^2 >= 0), so the minimum takes the smallest
    weights and the maximum the largest; then see the module docstring.
    """
    a, b = np.asarray(x_low, float), np.asarray(x_high, float)
    w_min, w_max = np.asarray(w_min, float), np.asarray(w_max, float)
    low = weighted_ss_min(a, b, w_min)
    high = weighted_ss_max(a, b, w_max) if np.all(np.isfinite(w_max)) else math.inf
    return (low, high)


def bounded_range(fn: Callable[[np.ndarray], float | None], low: Sequence[float], high: Sequence[float],
                  starts: Sequence[Sequence[float]] = (), searches: int = 2, maxiter: int = 60) -> Range:
    """Range of ``fn`` over the box [low, high] by bounded local search.

    Method: every start (and the box's centre) is evaluated; from the best
    ``searches`` of them in each direction L-BFGS-B runs inside the box, on
    coordinates scaled to [0, 1].  A local method: the range it returns holds
    every value it evaluated, and is exact when the function has one minimum
    and one maximum in the box (or when they lie at the starts given).
    """
    low, high = np.asarray(low, float), np.asarray(high, float)
    free = high > low
    centre = 0.5 * (low + high)
    width = np.where(free, high - low, 0.0)

    def at(u):
        z = low + width * u if free.all() else np.where(free, low + width * u, centre)
        v = fn(z)
        return float(v) if _finite(v) else math.nan

    points = [np.full(low.size, 0.5)] + [np.clip((np.asarray(s, float) - low) / np.where(free, width, 1.0), 0, 1)
                                         for s in starts]
    values = [at(u) for u in points]
    finite = [v for v in values if math.isfinite(v)]
    if not finite:
        return NAN_RANGE
    lo, hi = min(finite), max(finite)
    if not free.any():
        return (lo, hi)
    from scipy.optimize import minimize

    scale = max(abs(lo), abs(hi), 1e-300)
    index = np.flatnonzero(free)
    bounds = [(0.0, 1.0)] * index.size
    for sign in (1.0, -1.0):
        ranked = sorted((sign * v, i) for i, v in enumerate(values) if math.isfinite(v))
        for _, i in ranked[:searches]:
            base = points[i].copy()

            def objective(u, base=base, sign=sign):
                full = base.copy()
                full[index] = u
                v = at(full)
                return sign * v / scale if math.isfinite(v) else 1e300

            res = minimize(objective, base[index], method="L-BFGS-B", bounds=bounds,
                           options={"ftol": 1e-11, "gtol": 1e-9, "maxiter": maxiter})
            full = base.copy()
            full[index] = np.clip(res.x, 0.0, 1.0)
            v = at(full)
            if math.isfinite(v):
                lo, hi = min(lo, v), max(hi, v)
    return (lo, hi)


def sampling_error_range(variance: Callable[[float], float | None],
                         variance_range: Callable[[float, float], Range],
                         value: tuple[float, float], count: tuple[float, float],
                         scale: tuple[float, float] = (1.0, 1.0)) -> Range:
    """Range of scale x sqrt(v(value / scale) / count) over the box of value,
    count and scale (an extrapolation factor, positive).

    The count enters as 1/sqrt(count), monotone: its ends.  With an exact scale
    the value enters only through the variance, whose exact extremes over the
    interval ``variance_range`` gives (the binomial variance peaks inside it at
    1/2).  With a scale printed to a precision, value and scale are searched
    together (``bounded_range`` from the four vertices).
    """
    if not (count[0] > 0 and scale[0] > 0):
        return NAN_RANGE
    if scale[0] == scale[1]:
        f = scale[0]
        v_low, v_high = variance_range(value[0] / f, value[1] / f)
        if not (math.isfinite(v_low) and math.isfinite(v_high)):
            return NAN_RANGE
        g = (f * math.sqrt(max(v_low, 0.0)), f * math.sqrt(max(v_high, 0.0)))
    else:
        def root(z):
            v = variance(float(z[0]) / float(z[1]))
            return None if v is None else float(z[1]) * math.sqrt(max(v, 0.0))

        low, high = (value[0], scale[0]), (value[1], scale[1])
        corners = [(a, b) for a in value for b in scale]
        g = bounded_range(root, low, high, starts=corners)
        if not all(math.isfinite(x) for x in g):
            return NAN_RANGE
    return (g[0] / math.sqrt(count[1]), g[1] / math.sqrt(count[0]))
