"""A component error model: what the listed error rates predict.

If a circuit holds n_i occurrences of component i, each failing with
probability e_i independently, it runs without error with probability
P = prod (1 - e_i)^n_i, the usual prediction of a circuit's fidelity from its
gate, readout and idle errors.  The exponential form exp(-sum n_i e_i) is the
small-error approximation printed beside it; it is never below P, since
1 - e <= exp(-e).  With a standard uncertainty sd_i on each e_i, the delta
method gives sd(P) = P sqrt(sum (n_i sd_i / (1 - e_i))^2), because
d ln P / d e_i = -n_i / (1 - e_i).

References
----------
Common practice: the digital error model (product of component fidelities) and
first-order (delta-method) propagation of independent uncertainties, e.g. JCGM
100:2008, Guide to the expression of uncertainty in measurement, eq. (10).
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Sequence


@dataclass(frozen=True)
class BudgetPrediction:
    """What the error budget predicts.

    Attributes
    ----------
    predicted : float
        prod (1 - e_i)^n_i.
    predicted_exponential : float
        exp(-sum n_i e_i).
    predicted_sd : float or None
        Delta-method standard uncertainty of ``predicted``; None when no
        component gives an uncertainty.
    survivals : tuple of float
        (1 - e_i)^n_i for each component.
    """

    predicted: float
    predicted_exponential: float
    predicted_sd: float | None
    survivals: tuple[float, ...]


def survival(error: float, count: float) -> float:
    """(1 - error)^count, computed as exp(count log1p(-error))."""
    if not 0.0 <= error <= 1.0:
        raise ValueError(f"an error rate lies in [0, 1], got {error}")
    if count < 0:
        raise ValueError(f"a count is at least 0, got {count}")
    if error == 1.0:
        return 0.0 if count > 0 else 1.0
    return math.exp(count * math.log1p(-error))


def predict(errors: Sequence[float], counts: Sequence[float],
            error_sds: Sequence[float | None] | None = None) -> BudgetPrediction:
    """The product of the components' survival probabilities.

    Parameters
    ----------
    errors : sequence of float
        Error per occurrence of each component, in [0, 1].
    counts : sequence of float
        Occurrences of each component.
    error_sds : sequence of float or None, optional
        Standard uncertainty of each error (None for a component without one).
    """
    if len(errors) != len(counts) or not errors:
        raise ValueError("errors and counts must be non-empty lists of the same length")
    if error_sds is not None and len(error_sds) != len(errors):
        raise ValueError("error_sds must have one entry per component")
    survivals = tuple(survival(e, n) for e, n in zip(errors, counts))
    predicted = math.prod(survivals)
    exponential = math.exp(-sum(n * e for e, n in zip(errors, counts)))
    sd = None
    if error_sds is not None and any(s is not None for s in error_sds):
        terms = []
        for e, n, s in zip(errors, counts, error_sds):
            if s is None or s == 0:
                continue
            if s < 0:
                raise ValueError(f"an uncertainty is at least 0, got {s}")
            if e >= 1.0:
                return BudgetPrediction(predicted, exponential, None, survivals)
            terms.append(n * s / (1.0 - e))
        sd = predicted * math.sqrt(sum(t * t for t in terms))
    return BudgetPrediction(predicted, exponential, sd, survivals)
