"""Linear cross-entropy benchmarking: F = mean(D p) - 1.

Var x = 1 + 2F - F^2 in the large-D limit; the exact finite-D moments of
Porter-Thomas (Beta(1, D - 1)) statistics are used when ``qubits`` is given.

References
----------
S. Boixo et al., Nature Physics 14, 595 (2018), arXiv:1608.00263.
"""

from ..stats.porter_thomas import fidelity_from_linear_xeb, linear_xeb_variance
from .base import MetricModel, ModelInputs


class LinearXEB(MetricModel):
    name = "linear-xeb"
    summary = "linear cross-entropy fidelity, mean(D p) - 1"
    noun = "a linear XEB fidelity"
    lowest = -1.0  # x = D p >= 0, so mean(x) - 1 >= -1
    highest = 1.0
    hard_bounds = False
    hard_lowest = True  # mean(D p) - 1 cannot go below -1, whatever the noise

    def variance(self, value: float, inputs: ModelInputs) -> float:
        # The printed value is mean(x) - 1, which at finite D is F (D - 1)/(D + 1).
        # The mixture is a distribution only for F in [0, 1]; a noisy negative
        # estimate stands for F near 0 (1 + 2F - F^2 would even turn negative).
        fidelity = fidelity_from_linear_xeb(value, inputs.dimension)
        return linear_xeb_variance(min(max(fidelity, 0.0), 1.0), inputs.dimension)
