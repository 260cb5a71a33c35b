"""Moments of the scaled probability x = D p under Porter-Thomas statistics.

Under uniform (fully depolarized) sampling x is Exp(1) for large D; under ideal
sampling its density is x e^-x.  A device with fidelity F samples from the
mixture F x e^-x + (1 - F) e^-x, so E x = 1 + F and Var x = 1 + 2F - F^2.  For
the log estimator ln x + gamma the mean is F and the variance pi^2/6 - F^2.

For finite D the ideal probabilities of a random circuit follow Beta(1, D - 1)
and the exact moments are E_u[x] = 1, E_u[x^2] = 2D/(D + 1),
E_ideal[x] = 2D/(D + 1), E_ideal[x^2] = 6D^2/((D + 1)(D + 2)).

References
----------
S. Boixo et al., "Characterizing quantum supremacy in near-term devices",
Nature Physics 14, 595 (2018), arXiv:1608.00263, sections on cross-entropy
benchmarking and Porter-Thomas statistics.
"""

from __future__ import annotations

import math

EULER_GAMMA = 0.5772156649015329
LOG_XEB_VARIANCE_IDEAL_ZERO = math.pi ** 2 / 6.0


def linear_xeb_moments(fidelity: float, dimension: float | None = None) -> tuple[float, float]:
    """Mean and variance of one sample's x = D p under the fidelity mixture.

    Parameters
    ----------
    fidelity : float
        Mixture weight F of the ideal distribution.
    dimension : float, optional
        Hilbert-space dimension D; ``None`` for the large-D limit.

    Returns
    -------
    (mean, variance) of x.
    """
    f = fidelity
    if dimension is None or math.isinf(dimension):
        return 1.0 + f, max(0.0, 1.0 + 2.0 * f - f * f)  # negative below F = 1 - sqrt(2)
    d = float(dimension)
    m_uniform_1, m_uniform_2 = 1.0, 2.0 * d / (d + 1.0)
    m_ideal_1, m_ideal_2 = 2.0 * d / (d + 1.0), 6.0 * d * d / ((d + 1.0) * (d + 2.0))
    mean = f * m_ideal_1 + (1.0 - f) * m_uniform_1
    second = f * m_ideal_2 + (1.0 - f) * m_uniform_2
    return mean, max(0.0, second - mean * mean)


def fidelity_from_linear_xeb(estimate: float, dimension: float | None = None) -> float:
    """The mixture weight F behind an expected estimate mean(x) - 1.

    At finite D, E x - 1 = F (D - 1)/(D + 1) (from E_ideal[x] = 2D/(D + 1)), so
    the printed estimate is not F itself; in the large-D limit it is.
    """
    if dimension is None or math.isinf(dimension):
        return estimate
    d = float(dimension)
    return estimate * (d + 1.0) / (d - 1.0)


def linear_xeb_variance(fidelity: float, dimension: float | None = None) -> float:
    """Per-sample variance of the linear XEB estimator mean(x) - 1."""
    return linear_xeb_moments(fidelity, dimension)[1]


def log_xeb_variance(fidelity: float) -> float:
    """Per-sample variance of ln x + gamma under the mixture, large-D limit."""
    return max(0.0, LOG_XEB_VARIANCE_IDEAL_ZERO - fidelity * fidelity)


def dimension_of(qubits: int | None) -> float | None:
    """D = 2**qubits, or ``None`` when the number of qubits is not known.  Above
    about 60 qubits the finite-D correction is below double precision."""
    if qubits is None:
        return None
    if qubits > 60:
        return math.inf
    return float(2 ** int(qubits))
