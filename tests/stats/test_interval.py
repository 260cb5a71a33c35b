"""The standard error a printed confidence interval implies."""

from __future__ import annotations

from decimal import Decimal

import pytest

from checker.stats.interval import sigma_from_interval, z_for_level

# Particle Data Group, Review of Particle Physics, chapter "Statistics" (G. Cowan), table of
# two-sided Gaussian intervals: 1 - alpha -> z (table text from memory, per REFERENCES.md).
LEVELS = [("0.8", "1.28"), ("0.9", "1.64"), ("0.95", "1.96"), ("0.99", "2.58"), ("0.999", "3.29")]


@pytest.mark.parametrize("level, printed", LEVELS)
def test_two_sided_critical_value(level, printed):
    assert Decimal(f"{z_for_level(float(level)):.2f}") == Decimal(printed)


def test_half_width_over_z_is_the_standard_error():
    se = 0.0125
    z = z_for_level(0.95)
    assert sigma_from_interval(0.5 - z * se, 0.5 + z * se, 0.95) == pytest.approx(se, rel=1e-12)
    # A 68.27% interval (PDG: 1 sigma holds 0.6827) is one standard error each side.
    assert sigma_from_interval(1.0, 3.0, 0.682689492137086) == pytest.approx(1.0, rel=1e-9)
