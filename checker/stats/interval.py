"""What a printed confidence interval implies about the standard error."""

from __future__ import annotations

from scipy.special import ndtri


def z_for_level(level: float) -> float:
    """Two-sided Gaussian critical value: 1.96 for 0.95 (PDG, "Statistics")."""
    return float(ndtri(0.5 + level / 2.0))


def sigma_from_interval(low: float, high: float, level: float) -> float:
    """Standard error implied by a symmetric interval's half-width."""
    return (high - low) / (2.0 * z_for_level(level))
