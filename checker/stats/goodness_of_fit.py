"""Goodness of fit of x = D p to the Porter-Thomas fidelity mixture.

With fidelity F the scaled ideal probability of a sampled outcome has density
F x e^-x + (1 - F) e^-x = e^-x (1 - F + F x) for large D, with distribution
function G(x) = 1 - e^-x (1 + F x).  At finite D, with the ideal probabilities
Beta(1, D - 1) (uniform sampling) and Beta(2, D - 1) (ideal sampling, the
size-biased law), the exact forms are

    g(x) = (D - 1)/D (1 - x/D)^(D - 2) (1 - F + F x),
    G(x) = 1 - (1 - x/D)^(D - 1) (1 + F (D - 1) x / D),      0 <= x <= D,

which tend to the large-D forms.  The tests are Kolmogorov-Smirnov and
Cramer-von Mises from scipy, against G at a given F.  When F was fitted from
the same data the p-values are conservative (too large), as for any test
with an estimated parameter; at a fixed F (the claim's threshold, or 0) they
are exact.

References
----------
S. Boixo et al., "Characterizing quantum supremacy in near-term devices",
Nature Physics 14, 595 (2018), arXiv:1608.00263 (Porter-Thomas statistics,
the fidelity mixture).
NIST/SEMATECH e-Handbook of Statistical Methods, sections 1.3.5.16
(Kolmogorov-Smirnov) and 1.3.5.14 (Anderson-Darling, the same family of
EDF statistics as Cramer-von Mises); S. Csorgo and J. J. Faraway, "The exact
and asymptotic distribution of Cramer-von Mises statistics", J. R. Stat.
Soc. B 58, 221 (1996), the p-value scipy.stats.cramervonmises computes (as its
documentation cites).
The finite-D distribution functions are derivations (the Beta(2, n) CDF is
1 - (1 - p)^n (1 + n p)); tests check them by numerical integration.

The reference is itself a sample.  The data come from K circuits, each with
its own D ideal probabilities: the mixture over those K D values departs from
the continuous law G by about 1/sqrt(K D) (a random function, not a bridge of
fixed shape), so with many more samples than K D even data from the model
itself at the true F are rejected (16 qubits, one circuit, 1e5 samples: 11%
at p < 0.01; 12 qubits: every time).  Calibrated by measurement
(benchmarks/fit_false_alarms.py, the project's simulator, 12-20 qubits, 1-20
circuits): at most K D / 8 values are tested (an even stride through the
subsample), and the statistics are referred to n_eff = 1/(1/n + (1 + F^2)/(2 K D))
values instead of n (the reference's variance adds to the sample's; (1 + F^2)/(K D)
is the sum of squared mixture weights, and the factor 1/2 is fitted).  Data
from the model at the true F then give p < 0.01 in about 1% of runs.

Cramer-von Mises far tail.  scipy's p-value is 1 minus a distribution function
and stops being monotone below about 1e-7 (p(T = 6) = 7.6e-12 but
p(T = 19.6) = 8.7e-9).  Here the upper tail of the limiting distribution is
computed directly, by Smirnov's integral

    P(W^2 > t) = (1/pi) sum_k (-1)^(k+1) int_{(2k-1) pi}^{2k pi} (2/u) sqrt(-u / sin u) e^(-t u^2 / 2) du,

(N. V. Smirnov, 1937; J. Durbin, "Distribution Theory for Tests Based on the
Sample Distribution Function", SIAM (1973), section 4.4, from memory), which
agrees with scipy's limiting distribution to 1e-12 where that is accurate;
beyond t = 20 its leading term 2 sqrt(2) Phi(-pi sqrt t) (the first
eigenvalue 1/pi^2 of the statistic's series, with the product of the others,
sqrt(2)) is used with its O(1/t) correction matched there, in log space so no
p-value underflows.  scipy's finite-n p-value (Csorgo and Faraway) is kept
up to t = 2 (p about 1.3e-5); beyond, the limiting tail is scaled by the
finite-n ratio at t = 2, which keeps p continuous and falling.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

TESTS = ("kolmogorov-smirnov", "cramer-von-mises")


def _clip_fidelity(fidelity: float) -> float:
    # Outside [0, 1] the mixture is not a distribution (its density goes negative).
    return min(max(float(fidelity), 0.0), 1.0)


def mixture_cdf(x, fidelity: float, dimension: float | None = None) -> np.ndarray:
    """G(x) of the fidelity mixture (large D when ``dimension`` is None or inf)."""
    f = _clip_fidelity(fidelity)
    x = np.maximum(np.asarray(x, dtype=float), 0.0)
    if dimension is None or math.isinf(dimension):
        return -np.expm1(-x) - f * x * np.exp(-x)
    d = float(dimension)
    u = np.minimum(x / d, 1.0)
    with np.errstate(divide="ignore"):
        tail = np.exp((d - 1.0) * np.log1p(-u))
    return 1.0 - tail * (1.0 + f * (d - 1.0) * u)


def mixture_pdf(x, fidelity: float, dimension: float | None = None) -> np.ndarray:
    """g(x) of the fidelity mixture."""
    f = _clip_fidelity(fidelity)
    x = np.maximum(np.asarray(x, dtype=float), 0.0)
    if dimension is None or math.isinf(dimension):
        return np.exp(-x) * (1.0 - f + f * x)
    d = float(dimension)
    u = np.minimum(x / d, 1.0)
    with np.errstate(divide="ignore"):
        shape = np.exp((d - 2.0) * np.log1p(-u)) if d > 2 else np.ones_like(u)
    return (d - 1.0) / d * shape * (1.0 - f + f * x) * (x <= d)


def bin_density(edges, fidelity: float, dimension: float | None = None) -> np.ndarray:
    """Mean of g over each bin, (G(b) - G(a)) / (b - a): what a histogram of
    the density should show."""
    edges = np.asarray(edges, dtype=float)
    cdf = mixture_cdf(edges, fidelity, dimension)
    return np.diff(cdf) / np.diff(edges)


_CVM_SWITCH = 2.0  # scipy's finite-n p-value up to here; the limiting tail, scaled, beyond
_CVM_SERIES = 20.0  # Smirnov's integral up to here; the leading term with its 1/t correction beyond


def _cvm_limit_tail(t: float) -> float:
    """P(W^2 > t) of the limiting Cramer-von Mises law, by Smirnov's integral
    (module docstring), for 0 < t <= _CVM_SERIES."""
    from scipy import integrate

    total = 0.0
    for k in range(1, 400):
        a, b = (2 * k - 1) * math.pi, 2 * k * math.pi
        half = (b - a) / 2.0

        def integrand(theta, a=a, half=half):
            # u = a + half (1 - cos theta) takes the 1/sqrt singularities at both ends away.
            u = a + half * (1.0 - math.cos(theta))
            s = -math.sin(u)
            if s <= 0.0:
                return 0.0
            return 2.0 / u * math.sqrt(u / s) * math.exp(-t * u * u / 2.0) * half * math.sin(theta)

        term, _ = integrate.quad(integrand, 0.0, math.pi, limit=200, epsabs=0.0, epsrel=1e-12)
        total += term if k % 2 else -term
        if abs(term) < 1e-16 * abs(total):
            break
    return total / math.pi


def _cvm_leading_log(t: float) -> float:
    """ln of 2 sqrt(2) Phi(-pi sqrt t), the limiting tail's leading term."""
    from scipy.special import log_ndtr

    return math.log(2.0 * math.sqrt(2.0)) + float(log_ndtr(-math.pi * math.sqrt(t)))


def cramer_von_mises_log_p(statistic: float, n: int) -> float:
    """Natural log of the Cramer-von Mises p-value of ``statistic`` from ``n`` values,
    monotone in the statistic and accurate in the far tail (module docstring).

    References
    ----------
    Smirnov (1937), Durbin (1973), Csorgo and Faraway (1996); see the module docstring.
    """
    t = float(statistic)
    if not t > 0:
        return 0.0
    at_switch = _scipy_cvm_p(_CVM_SWITCH, n)
    if t <= _CVM_SWITCH or not at_switch > 0:
        # A handful of values (n below about 8): the statistic cannot exceed n/3 + 1/(12 n),
        # and scipy's finite-n law, zero beyond its support, is all there is.
        p = min(_scipy_cvm_p(t, n), 1.0)
        return math.log(p) if p > 0 else -math.inf
    # Finite-n ratio at the switch, carried into the tail.
    scale = math.log(at_switch) - math.log(_cvm_limit_tail(_CVM_SWITCH))
    if t <= _CVM_SERIES:
        return scale + math.log(_cvm_limit_tail(t))
    # ratio exact/leading = 1 + c/t, c matched at _CVM_SERIES.
    c = (math.exp(math.log(_cvm_limit_tail(_CVM_SERIES)) - _cvm_leading_log(_CVM_SERIES)) - 1.0) * _CVM_SERIES
    return scale + _cvm_leading_log(t) + math.log1p(c / t)


def _scipy_cvm_p(t: float, n: int) -> float:
    """scipy's finite-n p-value of a Cramer-von Mises statistic t (Csorgo and Faraway)."""
    from scipy.stats import _hypotests

    # The public scipy.stats.cramervonmises takes data, not a statistic; this is the
    # function it calls for the p-value (scipy/stats/_hypotests.py, _cdf_cvm).
    return float(1.0 - _hypotests._cdf_cvm(np.array([t], dtype=float), int(n))[0])


@dataclass(frozen=True)
class FitTest:
    """One goodness-of-fit test at one fidelity.

    Attributes
    ----------
    at : str
        ``fitted``, ``threshold`` or ``zero``.
    fidelity : float
        F of the model tested (clipped to [0, 1]).
    test : str
        ``kolmogorov-smirnov`` or ``cramer-von-mises``.
    statistic, p_value : float
    samples : int
        Size of the sample tested.
    """

    at: str
    fidelity: float
    test: str
    statistic: float
    p_value: float
    samples: int
    log_p: float = math.nan  # natural log of the p-value where it is known below double precision

    def to_dict(self) -> dict:
        out = {"at": self.at, "fidelity": self.fidelity, "test": self.test,
               "statistic": self.statistic, "p_value": self.p_value, "samples": self.samples}
        if math.isfinite(self.log_p):
            out["log10_p_value"] = self.log_p / math.log(10.0)
        return out


REFERENCE_SHARE = 8.0  # test at most K D / REFERENCE_SHARE values
REFERENCE_WEIGHT = 0.5  # the fitted factor of the reference's variance (module docstring)


def tested_size(n: int, reference: float | None) -> int:
    """How many of ``n`` values are tested against a reference of ``reference`` = K D outcomes."""
    if reference is None or not math.isfinite(reference):
        return int(n)
    return int(max(2, min(n, reference / REFERENCE_SHARE)))


def effective_size(n: int, fidelity: float, reference: float | None) -> float:
    """n_eff = 1/(1/n + w (1 + F^2)/(K D)) (module docstring); n for a continuous reference."""
    if reference is None or not math.isfinite(reference):
        return float(n)
    f = _clip_fidelity(fidelity)
    return 1.0 / (1.0 / n + REFERENCE_WEIGHT * (1.0 + f * f) / reference)


def fit_tests(sample, fidelity: float, dimension: float | None = None, at: str = "fitted",
              reference: float | None = None) -> tuple[FitTest, FitTest]:
    """Kolmogorov-Smirnov and Cramer-von Mises tests of ``sample`` (values of
    x = D p) against the mixture at ``fidelity``.

    Parameters
    ----------
    reference : float, optional
        K D, the distinct outcomes of the circuits the data come from; the
        tests are then calibrated for the reference's own finite size (module
        docstring).  None: the continuous law is the reference.

    Returns
    -------
    (FitTest, FitTest): Kolmogorov-Smirnov, then Cramer-von Mises; ``samples``
    is the number of values tested.
    """
    from scipy import stats

    x = np.asarray(sample, dtype=float).ravel()
    if x.size < 2:
        raise ValueError("a goodness-of-fit test needs at least two samples")
    m = tested_size(x.size, reference)
    if m < x.size:
        x = x[np.linspace(0, x.size - 1, m).round().astype(np.int64)]
    f = _clip_fidelity(fidelity)
    n_eff = effective_size(x.size, f, reference)

    def cdf(v):
        return mixture_cdf(v, f, dimension)

    # scipy's exact Kolmogorov distribution costs a quarter second at n = 1e5;
    # beyond 10,000 samples the asymptotic one agrees to the digits that matter.
    ks = stats.kstest(x, cdf, method="exact" if x.size <= 10_000 else "asymp")
    ks_p = float(ks.pvalue)
    if n_eff < x.size:
        # The same statistic referred to n_eff values (asymptotic Kolmogorov law).
        ks_p = float(stats.kstwobign.sf(float(ks.statistic) * math.sqrt(n_eff)))
    cvm = stats.cramervonmises(x, cdf)
    cvm_log_p = cramer_von_mises_log_p(float(cvm.statistic) * n_eff / x.size, max(2, int(round(n_eff))))
    return (FitTest(at, f, "kolmogorov-smirnov", float(ks.statistic), ks_p, int(x.size)),
            FitTest(at, f, "cramer-von-mises", float(cvm.statistic), min(math.exp(cvm_log_p), 1.0),
                    int(x.size), cvm_log_p))


@dataclass(frozen=True, eq=False)
class MixtureHistogram:
    """A histogram of x = D p beside the mixture density at two fidelities,
    for a plot (the renderer draws it; it computes nothing)."""

    edges: np.ndarray
    observed_density: np.ndarray
    density_fitted: np.ndarray
    density_zero: np.ndarray
    fidelity_fitted: float
    samples: int
    beyond: float  # fraction of the sample above the last edge

    def to_dict(self) -> dict:
        return {"edges": self.edges.tolist(), "observed_density": self.observed_density.tolist(),
                "density_fitted": self.density_fitted.tolist(), "density_zero": self.density_zero.tolist(),
                "fidelity_fitted": self.fidelity_fitted, "samples": self.samples, "beyond": self.beyond}


def mixture_histogram(sample, fidelity_fitted: float, dimension: float | None = None,
                      bins: int = 40) -> MixtureHistogram:
    """Observed density of ``sample`` on ``bins`` equal bins from 0 to its
    99.9th percentile, with the mixture's bin-mean density at the fitted F
    and at F = 0."""
    x = np.asarray(sample, dtype=float).ravel()
    top = float(np.quantile(x, 0.999)) if x.size else 1.0
    top = max(top, 1e-12)
    edges = np.linspace(0.0, top, bins + 1)
    counts, _ = np.histogram(x, bins=edges)
    width = np.diff(edges)
    observed = counts / (x.size * width) if x.size else np.zeros(bins)
    beyond = float(np.mean(x > top)) if x.size else 0.0
    return MixtureHistogram(edges, observed, bin_density(edges, fidelity_fitted, dimension),
                            bin_density(edges, 0.0, dimension), float(fidelity_fitted), int(x.size), beyond)
