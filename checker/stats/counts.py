"""Significance of a counting experiment: n events observed over an expected
background b (with, optionally, an uncertainty sigma_b on b).

Every formula returns a signed Z (negative when fewer events than the
background were seen) or a natural-log p, finite in the deep tail.

- ``exact``: the Poisson tail, p = P(N >= n | b).
- ``asymptotic``: Z = sqrt(2 ((s + b) ln(1 + s/b) - s)) with s = n - b, the
  likelihood-ratio significance of Cowan, Cranmer, Gross and Vitells (2011),
  their Eq. 97 (written there for the median, with s the expected signal).
- ``naive``: s / sqrt(b); with a background error, s / sqrt(b + sigma_b^2).
- ``profile``: the profile likelihood ratio when b is known from an auxiliary
  measurement m ~ Poisson(tau b) (the "on/off" problem of Cowan et al. 2011,
  the counting experiment with a control measurement, from memory), equal to
  Li and Ma 1983, Eq. 17; a printed b +- sigma_b is read
  as tau = b / sigma_b^2 and m = tau b (Cousins et al. 2008).
- ``z_bi``: Z_Bi of Cousins, Linnemann and Tucker (2008): the binomial tail
  p = I_{1/(1+tau)}(n, m + 1) of the ratio-of-Poissons test.

References
----------
G. Cowan, K. Cranmer, E. Gross and O. Vitells, "Asymptotic formulae for
likelihood-based tests of new physics", Eur. Phys. J. C 71, 1554 (2011),
arXiv:1007.1727, Eq. 97 and the on/off counting example.
R. D. Cousins, J. T. Linnemann and J. Tucker, "Evaluation of three methods
for calculating statistical significance when incorporating a systematic
uncertainty into a test of the background-only hypothesis for a Poisson
process", Nucl. Instrum. Meth. A 595, 480 (2008), arXiv:physics/0702156.
T.-P. Li and Y.-Q. Ma, "Analysis methods for results in gamma-ray astronomy",
Astrophys. J. 272, 317 (1983), Eq. 17.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from .log_special import log_betainc, log_gammainc_lower
from .tails import log_p_from_sigma, sigma_from_log_p

COUNT_METHODS = ("exact", "asymptotic", "naive", "profile", "z_bi")
# Which methods use the background's error (the others ignore it).
WITH_BACKGROUND_ERROR = ("naive", "profile", "z_bi")


@dataclass(frozen=True)
class CountSignificance:
    """One formula's answer for n over b (+- sigma_b)."""

    method: str
    observed: float
    background: float
    background_error: float
    sigma: float
    log_p: float  # one-sided upper tail

    def log_p_sided(self, sided: str) -> float:
        """log p one-sided, or the two-sided p = 2 min(p, 1 - p) for a signed Z."""
        if sided == "one":
            return self.log_p
        return log_p_from_sigma(self.sigma, "two")


def poisson_log_sf(n: float, mu: float) -> float:
    """log P(N >= n) for N ~ Poisson(mu); 0 for n <= 0.  Finite far below
    1e-300 (scipy's ``poisson.logsf(1999, 3)`` is -inf; this gives -11012.3)."""
    if n <= 0:
        return 0.0
    if mu <= 0:
        return -math.inf
    return log_gammainc_lower(float(n), float(mu))


def _signed(sign: float, q: float) -> float:
    return math.copysign(math.sqrt(max(q, 0.0)), sign)


def _sigma_from_upper_log_p(log_p: float) -> float:
    return sigma_from_log_p(min(log_p, 0.0), "one")


def exact(n: float, b: float) -> CountSignificance:
    """The exact Poisson tail p = P(N >= n | b) and its one-sided Z."""
    log_p = poisson_log_sf(n, b)
    return CountSignificance("exact", n, b, 0.0, _sigma_from_upper_log_p(log_p), log_p)


def asymptotic_z(n: float, b: float) -> float:
    """Cowan et al. (2011), Eq. 97 with s = n - b: sqrt(2 (n ln(n/b) - (n - b)))."""
    s = n - b
    if n <= 0:
        return -math.sqrt(2.0 * b)
    return _signed(s, 2.0 * (n * math.log(n / b) - s))


def asymptotic(n: float, b: float) -> CountSignificance:
    z = asymptotic_z(n, b)
    return CountSignificance("asymptotic", n, b, 0.0, z, log_p_from_sigma(z, "one"))


def naive(n: float, b: float, sigma_b: float = 0.0) -> CountSignificance:
    """s / sqrt(b), or s / sqrt(b + sigma_b^2) with a background error."""
    z = (n - b) / math.sqrt(b + sigma_b * sigma_b)
    return CountSignificance("naive", n, b, sigma_b, z, log_p_from_sigma(z, "one"))


def auxiliary(b: float, sigma_b: float) -> tuple[float, float]:
    """(tau, m): the auxiliary measurement a printed b +- sigma_b stands for,
    tau = b / sigma_b^2 and m = tau b = (b / sigma_b)^2 (Cousins et al. 2008)."""
    tau = b / (sigma_b * sigma_b)
    return tau, tau * b


def profile_z_on_off(n: float, m: float, tau: float) -> float:
    """Signed sqrt(q0) of the on/off profile likelihood ratio,
    q0 = 2 [n ln(n / b0) + m ln(m / (tau b0))], b0 = (n + m) / (1 + tau)
    (Cowan et al. 2011; Li and Ma 1983, Eq. 17)."""
    b0 = (n + m) / (1.0 + tau)
    term_n = n * math.log(n / b0) if n > 0 else 0.0
    term_m = m * math.log(m / (tau * b0)) if m > 0 else 0.0
    return _signed(n - m / tau, 2.0 * (term_n + term_m))


def profile(n: float, b: float, sigma_b: float) -> CountSignificance:
    """The profile-likelihood Z with the background's error; without one it is
    the asymptotic formula."""
    if sigma_b <= 0:
        result = asymptotic(n, b)
        return CountSignificance("profile", n, b, 0.0, result.sigma, result.log_p)
    tau, m = auxiliary(b, sigma_b)
    z = profile_z_on_off(n, m, tau)
    return CountSignificance("profile", n, b, sigma_b, z, log_p_from_sigma(z, "one"))


def z_bi_log_p(n_on: float, n_off: float, tau: float) -> float:
    """log p_Bi = log I_{1/(1+tau)}(n_on, n_off + 1) (Cousins et al. 2008,
    whose n_off need not be whole)."""
    if n_on <= 0:
        return 0.0
    rho = 1.0 / (1.0 + tau)
    return log_betainc(float(n_on), float(n_off) + 1.0, rho)


def z_bi(n: float, b: float, sigma_b: float) -> CountSignificance:
    """Z_Bi for n over b +- sigma_b; without a background error, the exact
    Poisson tail (the limit tau -> infinity)."""
    if sigma_b <= 0:
        result = exact(n, b)
        return CountSignificance("z_bi", n, b, 0.0, result.sigma, result.log_p)
    tau, m = auxiliary(b, sigma_b)
    log_p = z_bi_log_p(n, m, tau)
    return CountSignificance("z_bi", n, b, sigma_b, _sigma_from_upper_log_p(log_p), log_p)


def significance(method: str, n: float, b: float, sigma_b: float = 0.0) -> CountSignificance:
    """One of :data:`COUNT_METHODS` by name; the methods that do not use the
    background's error ignore ``sigma_b``."""
    if method == "exact":
        return exact(n, b)
    if method == "asymptotic":
        return asymptotic(n, b)
    if method == "naive":
        return naive(n, b, sigma_b)
    if method == "profile":
        return profile(n, b, sigma_b)
    if method == "z_bi":
        return z_bi(n, b, sigma_b)
    raise ValueError(f"method must be one of {', '.join(COUNT_METHODS)}, got {method!r}")
