"""Linear cross-entropy benchmarking: F = mean(D p) - 1.

Var x = 1 + 2F - F^2 in the large-D limit; the exact finite-D moments of
Porter-Thomas (Beta(1, D - 1)) statistics are used when ``qubits`` is given.
Circuit to circuit, each circuit's own mean of x varies by
B = 4 F^2 D^2 (D - 1)/((D + 1)^2 (D + 2)(D + 3)), about 4 F^2/D, which the
error of a mean over K circuits keeps as B/K however many samples each has
(derivation in checker.stats.porter_thomas).

References
----------
S. Boixo et al., Nature Physics 14, 595 (2018), arXiv:1608.00263.
"""

from ..stats.elementwise import clip_unit
from ..stats.porter_thomas import fidelity_from_linear_xeb, linear_xeb_circuit_variance, linear_xeb_variance
from .base import MetricModel, ModelInputs


def _fidelity(value: float, inputs: ModelInputs) -> float:
    # The printed value is mean(x) - 1, which at finite D is F (D - 1)/(D + 1).
    # The mixture is a distribution only for F in [0, 1]; a noisy negative
    # estimate stands for F near 0 (1 + 2F - F^2 would even turn negative).
    return clip_unit(fidelity_from_linear_xeb(value, inputs.dimension))


class LinearXEB(MetricModel):
    name = "linear-xeb"
    summary = "linear cross-entropy fidelity, mean(D p) - 1"
    noun = "a linear XEB fidelity"
    lowest = -1.0  # x = D p >= 0, so mean(x) - 1 >= -1
    highest = 1.0
    hard_bounds = False
    hard_lowest = True  # mean(D p) - 1 cannot go below -1, whatever the noise

    def variance(self, value: float, inputs: ModelInputs) -> float:
        return linear_xeb_variance(_fidelity(value, inputs), inputs.dimension)

    def variance_range(self, low: float, high: float, inputs: ModelInputs) -> tuple[float, float]:
        from ..stats.ranges import linear_xeb_variance_range  # numpy: loaded only by the checks

        # _fidelity is non-decreasing in the value, so the interval's ends map to F's ends.
        return linear_xeb_variance_range(_fidelity(low, inputs), _fidelity(high, inputs), inputs.dimension)

    def circuit_variance(self, value: float, inputs: ModelInputs) -> float:
        return linear_xeb_circuit_variance(_fidelity(value, inputs), inputs.dimension)
