"""Ranges of every combination of parts over the box of the parts' printed
intervals: each part's estimate x_i in [a_i, b_i], its error s_i in
[c_i, d_i] and its samples n_i in [l_i, u_i].

Which method gives which range (``METHOD_OF`` names it for each quantity):

- equal-weight mean: linear in x, exact.  Its error sqrt(sum s^2)/K rises
  with every s_i: exact.
- samples-weighted mean: a weighted mean with weights n, exact
  (``ranges.weighted_mean_range``).  Its error sqrt(sum n^2 s^2)/sum n rises
  with every s_i; with exact samples that is all (exact); with samples printed
  to a precision, exact too (``samples_error_range``: its minimum on a
  one-parameter curve, its maximum on a vertex) up to ``ALL_VERTICES`` free
  samples, searched beyond (``ranges.bounded_range``).
- inverse-variance mean: a weighted mean with weights 1/s^2 in
  [1/d^2, 1/c^2], exact.  Its error 1/sqrt(sum 1/s^2) rises with every s_i:
  exact.
- Cochran's Q and the parts' scatter: ``ranges.weighted_ss_range`` (the
  minimum a convex problem, the maximum on a vertex).
- the DerSimonian-Laird error and every error scaled by the Birge ratio
  depend on the estimates only through Q and rise with it: for each set of
  part errors their extremes over the estimates are Q's (exact); the part
  errors are then searched.
- random-effects means (DerSimonian-Laird, Paule-Mandel) and the Paule-Mandel
  error: no closed form; bounded local search (L-BFGS-B) from the box's
  centre, from the points where Q is smallest and largest and, for boxes of
  up to ``ALL_VERTICES`` free inputs, from the best of all vertices (beyond,
  from vertex climbs).  These searches are the only approximate ranges.

When a part's error comes from the metric model (from its estimate and its
count) rather than from print, the box gives that error its own interval, the
model's minimum and maximum over the estimate's interval and the count's: the
error is then treated as independent of the estimate, a relaxation that can
only widen the range (by the change of the model error across one printed
digit of the estimate).

References
----------
See ``checker.stats.ranges``; the combinations themselves are those of
``checker.stats.combine``.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from .combine import tau2_paule_mandel
from .precision import agrees
from .ranges import Range, weighted_ss_max, weighted_ss_min, bounded_range, weighted_mean_range, weighted_ss_range

ALL_VERTICES = 12  # free inputs up to which every vertex is a starting candidate
SEARCH_LIMIT = 32  # free inputs beyond which the candidates alone are evaluated, without a search
CLIMBS = 3  # beyond ALL_VERTICES: vertex climbs from this many best candidates each way
PART_VERTICES = 10  # parts up to which every vertex of the estimates (and of the errors) is one

METHOD_OF = {
    ("equal", "estimate"): "exact: linear in the estimates",
    ("equal", "stat_error"): "exact: rises with every part error",
    ("samples", "estimate"): "exact: weighted-mean thresholds",
    ("samples", "stat_error"): "exact: rises with every part error; over printed samples a "
                               "one-parameter minimum and a vertex maximum (bounded local search "
                               "beyond 12 free samples)",
    ("inverse-variance", "estimate"): "exact: weighted-mean thresholds",
    ("inverse-variance", "stat_error"): "exact: rises with every part error",
    ("random-effects", "estimate"): "bounded local search",
    ("random-effects", "stat_error"): "exact over the estimates (through Q); errors searched",
    ("paule-mandel", "estimate"): "bounded local search",
    ("paule-mandel", "stat_error"): "bounded local search",
    ("any", "scaled_error"): "exact over the estimates (through Q); errors searched",
    ("q", ""): "exact: convex minimum, vertex maximum",
    ("spread", ""): "exact: convex minimum, vertex maximum",
    ("average", ""): "exact: rises with every part error",
    ("quadrature", ""): "exact: rises with every part error",
}


@dataclass(frozen=True)
class PartsBox:
    """The box of the parts' inputs: value and interval of each estimate, error
    (None when not every part has one) and samples (None likewise)."""

    x: np.ndarray
    x_low: np.ndarray
    x_high: np.ndarray
    s: np.ndarray | None = None
    s_low: np.ndarray | None = None
    s_high: np.ndarray | None = None
    n: np.ndarray | None = None
    n_low: np.ndarray | None = None
    n_high: np.ndarray | None = None

    @property
    def count(self) -> int:
        return int(self.x.size)


def _meets(bounds: tuple[float, float], r: Range | None, tolerance: float) -> bool:
    """``precision.agrees`` against a range that may be missing or not finite (never met)."""
    return r is not None and all(math.isfinite(v) for v in r) and agrees(bounds, r, tolerance)


def _widened(r: Range) -> Range:
    """A range opened by 1e-9 of each end: room for the rounding of the values it bounds."""
    return (r[0] - 1e-9 * abs(r[0]), r[1] + 1e-9 * abs(r[1]))


def _pm_tau2(x: np.ndarray, v: np.ndarray) -> np.ndarray:
    """Paule-Mandel tau^2 for each row, by bisection on all rows at once: the
    generalised Q falls as tau^2 grows (see ``combine.tau2_paule_mandel``)."""
    k = x.shape[-1]

    def excess(t2):
        w = 1.0 / (v + t2[:, None])
        mu = (w * x).sum(-1) / w.sum(-1)
        return (w * (x - mu[:, None]) ** 2).sum(-1) - (k - 1)

    lo = np.zeros(x.shape[0])
    hi = ((x - x.mean(-1, keepdims=True)) ** 2).sum(-1) / (k - 1)
    need = excess(lo) > 0
    if not need.any():
        return lo
    for _ in range(80):  # 2**-80 of the bracket: far below any printed digit
        mid = 0.5 * (lo + hi)
        up = excess(mid) > 0
        lo = np.where(up, mid, lo)
        hi = np.where(up, hi, mid)
    return np.where(need, 0.5 * (lo + hi), 0.0)


def evaluate(method: str, quantity: str, x: np.ndarray, s: np.ndarray | None,
             n: np.ndarray | None) -> np.ndarray:
    """``quantity`` ("estimate", "stat_error", "scaled_error") of ``method`` at
    each row of x (and s, n): the formulas of ``stats.combine``, vectorised."""
    shape = np.broadcast_shapes(*[np.atleast_2d(a).shape for a in (x, s, n) if a is not None])
    x = np.broadcast_to(np.atleast_2d(x), shape)
    k = x.shape[-1]
    v = None if s is None else np.broadcast_to(np.atleast_2d(s), shape) ** 2
    tau2 = np.zeros(x.shape[0])
    if method == "equal":
        w = np.ones_like(x)
    elif method == "samples":
        w = np.broadcast_to(np.atleast_2d(n), shape)
    elif method == "inverse-variance":
        w = 1.0 / v
    elif method == "random-effects":
        wf = 1.0 / v
        wsum = wf.sum(-1)
        mu = (wf * x).sum(-1) / wsum
        q = (wf * (x - mu[:, None]) ** 2).sum(-1)
        denom = wsum - (wf * wf).sum(-1) / wsum
        with np.errstate(divide="ignore", invalid="ignore"):
            tau2 = np.where(denom > 0, np.maximum(0.0, (q - (k - 1)) / denom), 0.0)
        w = 1.0 / (v + tau2[:, None])
    elif method == "paule-mandel":
        if x.shape[0] == 1:  # one point (a local search's step): Brent's method, as combine does
            tau2 = np.array([tau2_paule_mandel(x[0], np.sqrt(v[0]))])
        else:
            tau2 = _pm_tau2(x, v)
        w = 1.0 / (v + tau2[:, None])
    else:
        raise ValueError(f"unknown method {method!r}")
    p = w / w.sum(-1, keepdims=True)
    if quantity == "estimate":
        return (p * x).sum(-1)
    err = np.sqrt((p * p * (v + tau2[:, None])).sum(-1))
    if quantity == "stat_error":
        return err
    wf = 1.0 / v
    mu = (wf * x).sum(-1) / wf.sum(-1)
    q = (wf * (x - mu[:, None]) ** 2).sum(-1)
    return err * np.maximum(1.0, np.sqrt(q / (k - 1)))


def samples_error_range(s_low: np.ndarray, s_high: np.ndarray, n_low: np.ndarray,
                        n_high: np.ndarray, vertex_limit: int = ALL_VERTICES) -> Range | None:
    """The exact range of the samples-weighted error sqrt(sum n_i^2 s_i^2) / sum n_i over the
    box, every n_i > 0; None for a maximum over more than ``vertex_limit`` free samples (the
    caller then searches).  Written by hand: no library bounds a ratio like this one.

    f = sum n^2 s^2 / (sum n)^2 rises with every s_i, so the errors sit at their ends.  Along
    one n_k, with the rest fixed, f = (a n_k^2 + b)/(n_k + c)^2 falls and then rises (its
    derivative has the sign of a c n_k - b): the maximum is at a vertex of the samples' box.
    At the minimum the conditions for a bounded smooth minimum (df/dn_k = 2 (s_k^2 n_k S - Q)/S^3,
    S = sum n, Q = sum n^2 s^2) put every n_k at clip(lam / s_k^2, l_k, u_k) with lam = Q/S:
    the minimum lies on that one-parameter curve.  Between the curve's breakpoints
    (lam = s_k^2 l_k and s_k^2 u_k) f = (C lam^2 + B)/(C lam + E)^2, smallest at lam = B/E, so
    the breakpoints and those points hold it."""
    v = np.asarray(s_low, float) ** 2
    lo, hi = np.asarray(n_low, float), np.asarray(n_high, float)
    if not (np.all(lo > 0) and np.all(np.isfinite(hi)) and np.all(v > 0)):
        return None
    breaks = np.unique(np.concatenate([v * lo, v * hi]))
    lams = [breaks]
    for a, b in zip(breaks[:-1], breaks[1:]):
        mid = 0.5 * (a + b)
        free = (v * lo < mid) & (mid < v * hi)
        fixed_n = np.where(v * hi <= mid, hi, lo)[~free]
        big_b = float(np.sum(fixed_n ** 2 * v[~free]))
        big_e = float(np.sum(fixed_n))
        if free.any() and big_e > 0 and a < big_b / big_e < b:
            lams.append(np.array([big_b / big_e]))
    lam = np.concatenate(lams)
    n = np.clip(lam[:, None] / v[None, :], lo, hi)
    f_min = float(np.min(np.sum(n * n * v, -1) / np.sum(n, -1) ** 2))
    free = np.flatnonzero(hi > lo)
    if free.size > vertex_limit:
        return None
    w = np.asarray(s_high, float) ** 2
    pick = ((np.arange(2 ** free.size)[:, None] >> np.arange(free.size)) & 1).astype(bool)
    vertices = np.tile(lo, (pick.shape[0], 1))
    vertices[:, free] = np.where(pick, hi[free], lo[free])
    f_max = float(np.max(np.sum(vertices ** 2 * w, -1) / np.sum(vertices, -1) ** 2))
    return (math.sqrt(f_min), math.sqrt(f_max))


class CombinationRanges:
    """Ranges of the combinations of one box of parts, each computed when first
    asked for (the searched ones cost far more than the closed forms)."""

    def __init__(self, box: PartsBox):
        self.box = box
        self._cache: dict = {}

    def _cached(self, key, compute):
        if key not in self._cache:
            self._cache[key] = compute()
        return self._cache[key]

    # --- closed forms ---------------------------------------------------------------------------
    def q(self) -> Range | None:
        """Cochran's Q over the box."""
        b = self.box
        if b.s is None:
            return None
        return self._cached("q", lambda: weighted_ss_range(b.x_low, b.x_high, 1.0 / b.s_high ** 2,
                                                           1.0 / b.s_low ** 2))

    def spread(self) -> Range:
        """sd(x)/sqrt(K), the error of the plain mean from the parts' scatter."""
        b = self.box
        k = b.count

        def compute():
            ones = np.ones(k)
            lo, hi = weighted_ss_range(b.x_low, b.x_high, ones, ones)
            return (math.sqrt(lo / (k * (k - 1))), math.sqrt(hi / (k * (k - 1))))

        return self._cached("spread", compute)

    def average(self) -> Range | None:
        b = self.box
        return None if b.s is None else (float(b.s_low.mean()), float(b.s_high.mean()))

    def quadrature(self) -> Range | None:
        b = self.box
        return None if b.s is None else (float(np.sqrt(np.sum(b.s_low ** 2))),
                                         float(np.sqrt(np.sum(b.s_high ** 2))))

    def range(self, method: str, quantity: str) -> Range | None:
        """The range of ``quantity`` of ``method``; None when the method lacks an
        input (errors, samples)."""
        if self._inputs_missing(method, quantity):
            return None
        return self._cached((method, quantity), lambda: self._compute(method, quantity))

    # --- agreement with a print, from cheaper bounds where they settle it --------------------------
    def agrees(self, method: str, quantity: str, bounds: tuple[float, float], tolerance: float) -> bool:
        """Whether a printed interval agrees (``precision.agrees``) with the range of
        ``quantity`` of ``method``: always the answer the full range gives, False where
        that range is missing or not finite.

        A searched range (random-effects, Paule-Mandel, every Birge-scaled error) is
        only computed when neither of two cheaper ranges settles the question: one
        that holds it (``outer_range``: a print apart from it is apart from the
        searched range) and one it holds (the search's own candidates, whose values
        it keeps: a print that meets them meets it).  Checks that only ask whether
        a method reproduces a print then skip the searches."""
        key = (method, quantity)
        searched = quantity == "scaled_error" or method in ("random-effects", "paule-mandel")
        if key in self._cache or not searched or self._inputs_missing(method, quantity):
            return _meets(bounds, self.range(method, quantity), tolerance)
        outer = self._cached(("outer",) + key, lambda: self.outer_range(method, quantity))
        if outer is not None and not agrees(bounds, outer, tolerance):
            return False
        inner = self.candidate_range(method, quantity)
        if all(math.isfinite(v) for v in inner) and agrees(bounds, inner, tolerance):
            return True
        return _meets(bounds, self.range(method, quantity), tolerance)

    def candidate_range(self, method: str, quantity: str) -> Range:
        """The range of a searched quantity over the search's own starting points
        (no local search): the searched range holds it."""
        return self._cached(("inner", method, quantity),
                            lambda: self._searched(method, quantity, candidates_only=True))

    def computed(self, method: str, quantity: str) -> bool:
        """Whether the full range of ``quantity`` of ``method`` has been computed."""
        return (method, quantity) in self._cache

    def _inputs_missing(self, method: str, quantity: str) -> bool:
        """The method lacks an input (errors, samples): ``range`` is None."""
        b = self.box
        return ((b.s is None and (quantity != "estimate" or method not in ("equal", "samples")))
                or (method == "samples" and b.n is None))

    def tau2_bounds(self, method: str) -> Range:
        """Bounds on the between-part variance over the box (errors needed).

        DerSimonian-Laird: tau^2 = max(0, (Q - (K - 1)) / D), D = W - sum w^2 / W.
        Q lies in ``q()``; D rises with every weight (dD/dw_k = ((W - w_k)^2 +
        sum_{i != k} w_i^2) / W^2 >= 0), so it lies between its values at the
        smallest and the largest weights.
        Paule-Mandel: tau^2 is the root of Q_gen(t) = K - 1, Q_gen(t) = min over mu of
        sum (x_i - mu)^2 / (v_i + t), which falls with t and rises with every weight;
        over the box it is largest where the largest Q_gen over the estimates
        (``weighted_ss_max`` at weights 1/(v_low + t)) meets K - 1 and smallest where
        the smallest (``weighted_ss_min`` at 1/(v_high + t)) does.  Bisection keeps
        the side of each root that bounds it; Q_gen(t) <= SS/t (SS the plain scatter)
        puts the upper end of the bracket at max SS / (K - 1).  Written by hand: no
        library bounds a root over a box."""
        b = self.box
        k = b.count
        v_lo, v_hi = b.s_low ** 2, b.s_high ** 2
        if method == "random-effects":
            q_lo, q_hi = self.q()

            def denom(w):
                total = w.sum()
                return total - float(np.dot(w, w)) / total

            d_lo, d_hi = denom(1.0 / v_hi), denom(1.0 / v_lo)
            t_lo = max(0.0, (q_lo - (k - 1)) / d_hi) if d_hi > 0 else 0.0
            t_hi = max(0.0, (q_hi - (k - 1)) / d_lo) if d_lo > 0 else math.inf
            return (t_lo * (1 - 1e-9), t_hi * (1 + 1e-9))
        ones = np.ones(k)
        top = weighted_ss_max(b.x_low, b.x_high, ones) / (k - 1)

        def root_side(excess, upper: bool) -> float:
            lo, hi = 0.0, top
            if excess(0.0) <= 0:
                return 0.0
            for _ in range(24):  # to 6e-8 of the bracket: the bound need not be tight
                mid = 0.5 * (lo + hi)
                if excess(mid) > 0:
                    lo = mid
                else:
                    hi = mid
            return hi if upper else lo

        t_hi = root_side(lambda t: weighted_ss_max(b.x_low, b.x_high, 1.0 / (v_lo + t)) - (k - 1), True)
        t_lo = root_side(lambda t: weighted_ss_min(b.x_low, b.x_high, 1.0 / (v_hi + t)) - (k - 1), False)
        return (t_lo * (1 - 1e-9), t_hi * (1 + 1e-9) + 1e-300)

    def outer_range(self, method: str, quantity: str) -> Range | None:
        """A range that holds the searched one (every value the search can reach),
        from closed forms; None where there is none.  The weights 1/(v_i + tau^2) lie
        in [1/(v_high + tau^2_high), 1/(v_low + tau^2_low)] (``tau2_bounds``), so the
        random-effects means lie in the exact range of a weighted mean with weights
        in those intervals (``weighted_mean_range``) and their error
        1/sqrt(sum w_i) between its values at the two ends.  A Birge-scaled error is
        the error times max(1, sqrt(Q/(K - 1))), each factor within its own range."""
        b = self.box
        k = b.count
        if b.s is None:
            return None
        if quantity == "scaled_error":
            if method in ("random-effects", "paule-mandel"):
                err = self.outer_range(method, "stat_error")
            else:
                err = self.range(method, "stat_error")
            if err is None or not all(math.isfinite(v) for v in err):
                return None
            q_lo, q_hi = self.q()
            f_lo = max(1.0, math.sqrt(max(q_lo, 0.0) / (k - 1)))
            f_hi = max(1.0, math.sqrt(q_hi / (k - 1)))
            return _widened((err[0] * f_lo, err[1] * f_hi))
        t_lo, t_hi = self.tau2_bounds(method)
        v_lo, v_hi = b.s_low ** 2, b.s_high ** 2
        if quantity == "estimate":
            return _widened(weighted_mean_range(b.x_low, b.x_high, 1.0 / (v_hi + t_hi), 1.0 / (v_lo + t_lo)))
        with np.errstate(divide="ignore"):
            return _widened((float(1.0 / np.sqrt(np.sum(1.0 / (v_lo + t_lo)))),
                             float(1.0 / np.sqrt(np.sum(1.0 / (v_hi + t_hi))))))

    def _compute(self, method: str, quantity: str) -> Range:
        b = self.box
        k = b.count
        if quantity == "estimate" and method == "equal":
            return (float(b.x_low.mean()), float(b.x_high.mean()))
        if quantity == "estimate" and method == "samples":
            return weighted_mean_range(b.x_low, b.x_high, b.n_low, b.n_high)
        if quantity == "estimate" and method == "inverse-variance":
            return weighted_mean_range(b.x_low, b.x_high, 1.0 / b.s_high ** 2, 1.0 / b.s_low ** 2)
        if quantity == "stat_error" and method == "equal":
            return (float(np.sqrt(np.sum(b.s_low ** 2)) / k), float(np.sqrt(np.sum(b.s_high ** 2)) / k))
        if quantity == "stat_error" and method == "inverse-variance":
            return (float(1.0 / np.sqrt(np.sum(1.0 / b.s_low ** 2))),
                    float(1.0 / np.sqrt(np.sum(1.0 / b.s_high ** 2))))
        if quantity == "stat_error" and method == "samples":
            if np.array_equal(b.n_low, b.n_high):
                p = b.n / b.n.sum()
                return (float(np.sqrt(np.sum(p * p * b.s_low ** 2))),
                        float(np.sqrt(np.sum(p * p * b.s_high ** 2))))
            # Rises with every s_i: the errors go to their ends; over the samples the closed
            # form (samples_error_range), searched only beyond its vertex limit.
            exact = samples_error_range(b.s_low, b.s_high, b.n_low, b.n_high)
            if exact is not None:
                return exact
            low = self._search(lambda n: evaluate("samples", "stat_error", b.x, b.s_low, n),
                               b.n_low, b.n_high, [b.n])[0]
            high = self._search(lambda n: evaluate("samples", "stat_error", b.x, b.s_high, n),
                                b.n_low, b.n_high, [b.n])[1]
            return (low, high)
        return self._searched(method, quantity)

    # --- searches -------------------------------------------------------------------------------
    def _through_q(self, method: str, quantity: str) -> bool:
        """The quantity depends on the estimates only through Cochran's Q, and rises with it:
        the DerSimonian-Laird error (tau^2 rises with Q) and every Birge-scaled error
        (S = max(1, sqrt(Q/df))), samples weights exact."""
        b = self.box
        if quantity == "scaled_error":
            return method in ("equal", "inverse-variance") or (
                method == "samples" and np.array_equal(b.n_low, b.n_high))
        return (method, quantity) == ("random-effects", "stat_error")

    def _error_given_q(self, method: str, quantity: str, s: np.ndarray, q: float) -> float:
        b = self.box
        k = b.count
        v = s * s
        if quantity == "stat_error":  # random-effects
            wf = 1.0 / v
            wsum = wf.sum()
            denom = wsum - np.dot(wf, wf) / wsum
            tau2 = max(0.0, (q - (k - 1)) / denom) if denom > 0 else 0.0
            return float(1.0 / math.sqrt(np.sum(1.0 / (v + tau2))))
        if method == "equal":
            err = math.sqrt(v.sum()) / k
        elif method == "inverse-variance":
            err = 1.0 / math.sqrt(np.sum(1.0 / v))
        else:
            p = b.n / b.n.sum()
            err = math.sqrt(np.sum(p * p * v))
        return err * max(1.0, math.sqrt(max(q, 0.0) / (k - 1)))

    def _searched_through_q(self, method: str, quantity: str, candidates_only: bool = False) -> Range:
        """Over the estimates the quantity's extremes are those of Q, exact for every set of
        errors (``ranges.weighted_ss_range``); the errors alone are then searched."""
        b = self.box

        def side(which):
            def rows(z):
                z = np.atleast_2d(z)
                out = np.empty(z.shape[0])
                for i, s in enumerate(z):
                    w = 1.0 / (s * s)
                    q = weighted_ss_min(b.x_low, b.x_high, w) if which == "min" else weighted_ss_max(b.x_low, b.x_high, w)
                    out[i] = self._error_given_q(method, quantity, s, q)
                return out
            return rows

        starts = [b.s, b.s_low, b.s_high]
        # Each point costs an exact Q range, so the search stops at fewer inputs.
        limit = SEARCH_LIMIT // 2
        low = self._search(side("min"), b.s_low, b.s_high, starts, PART_VERTICES, limit, candidates_only)[0]
        high = self._search(side("max"), b.s_low, b.s_high, starts, PART_VERTICES, limit, candidates_only)[1]
        return (low, high)

    def _searched(self, method: str, quantity: str, candidates_only: bool = False) -> Range:
        if self._through_q(method, quantity):
            return self._searched_through_q(method, quantity, candidates_only)
        b = self.box
        k = b.count
        with_n = method == "samples" and not np.array_equal(b.n_low, b.n_high)
        n_fixed = b.n

        def split(z):
            z = np.atleast_2d(z)
            x, s = z[:, :k], z[:, k:2 * k]
            n = z[:, 2 * k:] if with_n else n_fixed
            return x, s, n

        def fn(z):
            x, s, n = split(z)
            return evaluate(method, quantity, x, s, n)

        low = np.concatenate([b.x_low, b.s_low] + ([b.n_low] if with_n else []))
        high = np.concatenate([b.x_high, b.s_high] + ([b.n_high] if with_n else []))
        centre = np.concatenate([b.x, b.s] + ([b.n] if with_n else []))
        # Where Q is smallest (estimates drawn to a common value, errors large) and largest
        # (estimates pushed apart, errors small): the scatter drives tau^2 and the Birge ratio.
        wmid = 1.0 / b.s ** 2
        mu = float(np.dot(wmid, b.x) / wmid.sum())
        together = np.clip(mu, b.x_low, b.x_high)
        apart = np.where(0.5 * (b.x_low + b.x_high) < mu, b.x_low, b.x_high)
        extra = [b.n] if with_n else []
        starts = [centre]
        xs = [together, apart, b.x_low, b.x_high]
        ss = [b.s_low, b.s_high]
        if k <= PART_VERTICES:
            # Every vertex of the estimates with the errors all at one end, and every vertex of
            # the errors with the estimates drawn together or pushed apart.
            pick = ((np.arange(2 ** k)[:, None] >> np.arange(k)) & 1).astype(bool)
            xs += list(np.where(pick, b.x_high, b.x_low))
            ss += list(np.where(pick, b.s_high, b.s_low))
        for x in xs:
            for s in (b.s_low, b.s_high):
                starts.append(np.concatenate([x, s] + extra))
        for s in ss:
            for x in (together, apart):
                starts.append(np.concatenate([x, s] + extra))
        return self._search(fn, low, high, starts, candidates_only=candidates_only)

    @staticmethod
    def _climb(fn_rows, low, high, free, start, sign, rounds: int = 50):
        """From a point, move to the best vertex reached by flipping one free input to its
        other end at a time (every flip of a round evaluated in one batch), while that
        lowers (sign 1) or raises (sign -1) the value.  Returns (point, value) or None."""
        point = np.where(start - low < high - start, low, high).astype(float)
        point[~np.isin(np.arange(low.size), free)] = start[~np.isin(np.arange(low.size), free)]
        with np.errstate(all="ignore"):
            current = float(fn_rows(point[None, :])[0])
        if not math.isfinite(current):
            return None
        for _ in range(rounds):
            flips = np.tile(point, (free.size, 1))
            cols = free
            flips[np.arange(free.size), cols] = np.where(point[cols] == low[cols], high[cols], low[cols])
            with np.errstate(all="ignore"):
                values = np.asarray(fn_rows(flips), float)
            values = np.where(np.isfinite(values), sign * values, np.inf)
            i = int(np.argmin(values))
            if not values[i] < sign * current:
                break
            point, current = flips[i], sign * values[i]
        return point, current

    @staticmethod
    def _search(fn_rows, low, high, starts, vertex_limit: int = ALL_VERTICES,
                search_limit: int = SEARCH_LIMIT, candidates_only: bool = False) -> Range:
        """Candidates (the starts and, for small boxes, every vertex) evaluated in
        one batch; a bounded local search from the best two in each direction.
        With ``candidates_only`` the candidates' own range, which the search's
        range always holds (every candidate's value is among those it keeps)."""
        low, high = np.asarray(low, float), np.asarray(high, float)
        free = np.flatnonzero(high > low)
        candidates = [np.asarray(s, float) for s in starts]
        if 0 < free.size <= vertex_limit:
            pick = ((np.arange(2 ** free.size)[:, None] >> np.arange(free.size)) & 1).astype(bool)
            vertices = np.tile(0.5 * (low + high), (pick.shape[0], 1))
            vertices[:, free] = np.where(pick, high[free], low[free])
            candidates.extend(vertices)
        rows = np.vstack(candidates)
        with np.errstate(all="ignore"):
            values = np.asarray(fn_rows(rows), float)
        ok = np.isfinite(values)
        if not ok.any():
            return (math.nan, math.nan)
        if free.size > search_limit or candidates_only:
            # Many parts: the candidates alone (README, "Printed precision").
            return (float(values[ok].min()), float(values[ok].max()))
        lowest = [rows[i] for i in np.argsort(np.where(ok, values, np.inf))[:CLIMBS] if ok[i]]
        highest = [rows[i] for i in np.argsort(np.where(ok, -values, np.inf))[:CLIMBS] if ok[i]]
        if free.size > vertex_limit:
            # Not every vertex was tried: climb from the best ones, one flip at a time.
            for sign, group in ((1.0, lowest), (-1.0, highest)):
                for start in list(group):
                    found = CombinationRanges._climb(fn_rows, low, high, free, start, sign)
                    if found is not None:
                        group.insert(0, found[0])
                        values = np.append(values, found[1])
                        ok = np.append(ok, True)
            lowest.sort(key=lambda z: float(fn_rows(z[None, :])[0]))
            highest.sort(key=lambda z: -float(fn_rows(z[None, :])[0]))
        best = lowest[:2] + highest[:2]

        def one(z):
            with np.errstate(all="ignore"):
                return float(fn_rows(z[None, :])[0])

        # With every vertex among the candidates one search each way from the best of them.
        lo, hi = bounded_range(one, low, high, starts=best,
                               searches=1 if free.size <= vertex_limit else 2)
        return (min(lo, float(values[ok].min())), max(hi, float(values[ok].max())))
