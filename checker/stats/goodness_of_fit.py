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

    def to_dict(self) -> dict:
        return {"at": self.at, "fidelity": self.fidelity, "test": self.test,
                "statistic": self.statistic, "p_value": self.p_value, "samples": self.samples}


def fit_tests(sample, fidelity: float, dimension: float | None = None, at: str = "fitted") -> tuple[FitTest, FitTest]:
    """Kolmogorov-Smirnov and Cramer-von Mises tests of ``sample`` (values of
    x = D p) against the mixture at ``fidelity``.

    Returns
    -------
    (FitTest, FitTest): Kolmogorov-Smirnov, then Cramer-von Mises.
    """
    from scipy import stats

    x = np.asarray(sample, dtype=float).ravel()
    if x.size < 2:
        raise ValueError("a goodness-of-fit test needs at least two samples")
    f = _clip_fidelity(fidelity)

    def cdf(v):
        return mixture_cdf(v, f, dimension)

    # scipy's exact Kolmogorov distribution costs a quarter second at n = 1e5;
    # beyond 10,000 samples the asymptotic one agrees to the digits that matter.
    ks = stats.kstest(x, cdf, method="exact" if x.size <= 10_000 else "asymp")
    cvm = stats.cramervonmises(x, cdf)
    return (FitTest(at, f, "kolmogorov-smirnov", float(ks.statistic), float(ks.pvalue), int(x.size)),
            FitTest(at, f, "cramer-von-mises", float(cvm.statistic), float(min(max(cvm.pvalue, 0.0), 1.0)),
                    int(x.size)))


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
