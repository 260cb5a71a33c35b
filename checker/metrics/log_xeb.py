"""Logarithmic cross-entropy benchmarking: F = mean(ln D p) + Euler's gamma.

Var = pi^2/6 - F^2 under the Porter-Thomas fidelity mixture (large D).

References
----------
S. Boixo et al., Nature Physics 14, 595 (2018), arXiv:1608.00263.
"""

from ..stats.porter_thomas import log_xeb_variance
from .base import MetricModel, ModelInputs


class LogXEB(MetricModel):
    name = "log-xeb"
    summary = "logarithmic cross-entropy fidelity, mean(ln D p) + gamma"
    noun = "a log XEB fidelity"
    highest = 1.0
    hard_bounds = False

    def variance(self, value: float, inputs: ModelInputs) -> float:
        return log_xeb_variance(min(max(value, 0.0), 1.0))  # the mixture needs F in [0, 1]
