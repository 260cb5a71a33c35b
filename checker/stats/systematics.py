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

import functools
import math

import numpy as np
from scipy.special import log_ndtr


def log_p_quadrature(distance: float, stat_error: float, syst_error: float) -> float:
    """log one-sided p of ``distance`` with errors added in quadrature."""
    return float(log_ndtr(-distance / math.hypot(stat_error, syst_error)))


@functools.lru_cache(maxsize=4096)  # pure; a search over conventions asks for the same corners again
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
    if abs(distance) > 1e5 * math.hypot(stat_error, syst_error):
        # Beyond 1e5 sigma the integrand's squares leave the double range; the
        # Gaussian identity (tested at 40 and 200 sigma) is exact there.
        return log_p_quadrature(distance, stat_error, syst_error)
    if distance < 0.0:
        # Below the threshold p is near 1 and its log would round to 0: take the
        # complement, E[Phi_bar((d - delta)/s)] = 1 - E[Phi_bar((-d - delta)/s)]
        # (the shift's distribution is symmetric).
        return float(np.log1p(-math.exp(log_p_marginalized(-distance, stat_error, syst_error))))
    # The p-value does not change when every length is scaled alike: work in units
    # of the combined error so that errors of 1e-300 or 1e300 stay in range.
    scale = math.hypot(stat_error, syst_error)
    distance, stat_error, syst_error = distance / scale, stat_error / scale, syst_error / scale
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
    # The product of two log-concave factors is unimodal, so a bounded search
    # between zero shift and the guess (and a margin beyond) finds its peak.
    margin = 20 * width + 10 * syst_error
    res = minimize_scalar(lambda d: -log_integrand(d),
                          bounds=(min(guess, 0.0) - margin, max(guess, 0.0) + margin),
                          method="bounded", options={"xatol": width * 1e-6})
    peak = max((float(res.x), 0.0, guess), key=log_integrand)
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
        offset = max(width, span * 1e-12)  # at most ~20 breaks a side, however lopsided
        while offset < span:
            breaks.update(b for b in (centre - offset, centre + offset) if low < b < high)
            offset *= 4.0
        if low < centre < high:
            breaks.add(centre)
    # log_integrand - log_peak cancels two numbers of size |log_peak|, so the
    # integrand carries noise of about |log_peak| x 1e-16; ask for no better.
    value, _ = integrate.quad(lambda d: math.exp(log_integrand(d) - log_peak),
                              low, high, points=sorted(breaks), limit=100 + 2 * len(breaks),
                              epsabs=0.0, epsrel=max(1e-10, 1e-14 * abs(log_peak)))
    return float(min(0.0, log_peak + math.log(value)))


def log_p_two_sided(log_p_upper: float, log_p_lower: float) -> float:
    """log of the sum of the two one-sided tails."""
    return min(0.0, float(np.logaddexp(log_p_upper, log_p_lower)))
