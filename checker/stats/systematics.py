"""How a systematic error enters a significance.

``quadrature`` adds it to the statistical error in quadrature.  ``marginalized``
is the hybrid treatment: the p-value averaged over a Gaussian distribution of
the systematic shift.  For a Gaussian null the two are identical; this module
computes the marginalized value by numerical integration so that the identity
is something a test checks, not something the code assumes.

References
----------
R. D. Cousins and V. L. Highland, "Incorporating systematic uncertainties into
an upper limit", Nucl. Instrum. Meth. A 320, 331 (1992).
"""

from __future__ import annotations

import math

import numpy as np
from scipy.special import log_ndtr


def log_p_quadrature(distance: float, stat_error: float, syst_error: float) -> float:
    """log one-sided p of ``distance`` with errors added in quadrature."""
    return float(log_ndtr(-distance / math.hypot(stat_error, syst_error)))


def log_p_marginalized(distance: float, stat_error: float, syst_error: float) -> float:
    """log of E_delta[ Phi_bar((distance - delta) / stat_error) ], delta ~ N(0, syst_error^2).

    The integrand is taken in log space and re-centred on its maximum before
    ``scipy.integrate.quad`` sees it, so the integral stays accurate at 40 sigma
    where both factors are far below the double-precision range.

    Parameters
    ----------
    distance : float
        estimate - threshold (one-sided, upper tail).
    stat_error, syst_error : float
        Standard deviations of the statistical error and of the systematic shift.
    """
    if syst_error <= 0.0:
        return float(log_ndtr(-distance / stat_error))
    # Loaded here: only a claim that states `marginalized` pays for them.
    from scipy import integrate
    from scipy.optimize import minimize_scalar

    def log_integrand(delta: float) -> float:
        return (float(log_ndtr(-(distance - delta) / stat_error))
                - 0.5 * (delta / syst_error) ** 2
                - math.log(syst_error * math.sqrt(2.0 * math.pi)))

    # The product peaks near the shift that the quadrature picture predicts;
    # refine with a few Newton-free steps of a bounded search around it.
    total = stat_error * stat_error + syst_error * syst_error
    guess = distance * syst_error * syst_error / total

    width = syst_error * stat_error / math.sqrt(total)
    res = minimize_scalar(lambda d: -log_integrand(d),
                          bounds=(guess - 20 * width - 10 * syst_error, guess + 20 * width + 10 * syst_error),
                          method="bounded", options={"xatol": width * 1e-6})
    peak = float(res.x)
    log_peak = log_integrand(peak)
    # The peak is `width` wide where both factors bend, but when the systematic
    # dominates the tail factor is a step at `distance` and the mass spreads over
    # the systematic's own scale on the step's open side, so span that (width <= syst_error).
    # quad's first Kronrod nodes can step over a feature much narrower than the
    # range and report a tiny error for a wrong value, so break the range at
    # geometrically spaced offsets around the peak and the step.
    span = 40.0 * syst_error
    low, high = peak - span, peak + span
    breaks = set()
    for centre in (peak, distance):
        offset = width
        while offset < span:
            breaks.update(b for b in (centre - offset, centre + offset) if low < b < high)
            offset *= 4.0
        if low < centre < high:
            breaks.add(centre)
    value, _ = integrate.quad(lambda d: math.exp(log_integrand(d) - log_peak),
                              low, high, points=sorted(breaks), limit=100 + 2 * len(breaks),
                              epsabs=0.0, epsrel=1e-10)
    return float(min(0.0, log_peak + math.log(value)))


def log_p_two_sided(log_p_upper: float, log_p_lower: float) -> float:
    """log of the sum of the two one-sided tails."""
    return min(0.0, float(np.logaddexp(log_p_upper, log_p_lower)))
