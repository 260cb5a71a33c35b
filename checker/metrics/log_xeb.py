"""Logarithmic cross-entropy benchmarking: F = mean(ln D p) + Euler's gamma.

Var = pi^2/6 - F^2 under the Porter-Thomas fidelity mixture for large D; at
finite D (``qubits`` given) the exact flat-Dirichlet moments, 5-15% lower at
3-4 qubits.  Circuit to circuit, each circuit's own mean varies by B, about
(pi^2/6 - 1 - 2F + (pi^2/6) F^2)/D, which does not vanish as F -> 0; the error
of a mean over K circuits keeps B/K however many samples each has
(derivations in checker.stats.porter_thomas).

References
----------
S. Boixo et al., Nature Physics 14, 595 (2018), arXiv:1608.00263.
"""

from ..stats.elementwise import clip_unit
from ..stats.porter_thomas import fidelity_from_log_xeb, log_xeb_circuit_variance, log_xeb_variance_finite
from .base import MetricModel, ModelInputs


def _fidelity(value: float, inputs: ModelInputs) -> float:
    # At finite D the expected estimate is u + F (i - u) (offsets u -> 0, i -> 1);
    # the mixture needs F in [0, 1].
    return clip_unit(fidelity_from_log_xeb(value, inputs.dimension))


class LogXEB(MetricModel):
    name = "log-xeb"
    summary = "logarithmic cross-entropy fidelity, mean(ln D p) + gamma"
    noun = "a log XEB fidelity"
    highest = 1.0
    hard_bounds = False

    def variance(self, value: float, inputs: ModelInputs) -> float:
        return log_xeb_variance_finite(_fidelity(value, inputs), inputs.dimension)

    def variance_range(self, low: float, high: float, inputs: ModelInputs) -> tuple[float, float]:
        from ..stats.ranges import concave_parabola_range  # numpy: loaded only by the checks

        # _fidelity is non-decreasing in the value (i > u), so the interval's ends map to F's ends.
        return concave_parabola_range(lambda f: log_xeb_variance_finite(f, inputs.dimension),
                                      _fidelity(low, inputs), _fidelity(high, inputs))

    def circuit_variance(self, value: float, inputs: ModelInputs) -> float:
        return log_xeb_circuit_variance(_fidelity(value, inputs), inputs.dimension)
