"""Datasets with known truth: ideal probabilities from Porter-Thomas or from
small random circuits on our own numpy state-vector simulator, and outcomes
sampled from the mixture F p + (1 - F)/D.

The simulator keeps the state as a complex vector of length D = 2**n; qubit q
is bit q of the basis index (qubit 0 the least significant).  A layer applies
a random single-qubit rotation to every qubit (Haar-random in SU(2)), then
controlled-Z gates on a fixed brickwork of neighbouring pairs on a line:
(0,1), (2,3), ... on even layers and (1,2), (3,4), ... on odd layers.  A
product of CZ gates is diagonal, so a layer's entangling step is one
elementwise multiplication by a +-1 vector.

Written by hand because no library in our dependency list simulates circuits;
it is small on purpose (up to about 16 qubits; 20 at most).

References
----------
Haar-random SU(2) from a uniform unit quaternion: K. Shoemake, "Uniform
random rotations", Graphics Gems III (1992) (from memory).
Random circuits approach Porter-Thomas statistics with collision sum
sum_s p_s^2 -> 2/(D + 1): S. Boixo et al., Nature Physics 14, 595 (2018),
arXiv:1608.00263.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

MAX_CIRCUIT_QUBITS = 20
# Above this many qubits the Porter-Thomas model samples each outcome's ideal
# probability from its large-D law instead of drawing all D probabilities.
FULL_DISTRIBUTION_QUBITS = 20
MAX_QUBITS = 60
MODELS = ("porter-thomas", "circuit")

# Standard gates, for tests and hand-built circuits.
HADAMARD = np.array([[1, 1], [1, -1]], dtype=complex) / np.sqrt(2.0)
PAULI_X = np.array([[0, 1], [1, 0]], dtype=complex)


def rx(theta: float) -> np.ndarray:
    """exp(-i theta X / 2)."""
    c, s = np.cos(theta / 2.0), np.sin(theta / 2.0)
    return np.array([[c, -1j * s], [-1j * s, c]], dtype=complex)


def zero_state(qubits: int) -> np.ndarray:
    state = np.zeros(2 ** qubits, dtype=complex)
    state[0] = 1.0
    return state


def apply_single(state: np.ndarray, gate: np.ndarray, qubit: int, qubits: int) -> np.ndarray:
    """Apply a 2x2 ``gate`` to ``qubit`` of an ``qubits``-qubit state; returns a new array."""
    view = state.reshape(2 ** (qubits - qubit - 1), 2, 2 ** qubit)
    return np.einsum("ab,ibj->iaj", gate, view).reshape(-1)


def cz_phases(qubits: int, pairs) -> np.ndarray:
    """The diagonal (+1/-1) of a product of CZ gates on ``pairs``."""
    index = np.arange(2 ** qubits)
    sign = np.ones(2 ** qubits)
    for a, b in pairs:
        both = ((index >> a) & 1) & ((index >> b) & 1)
        sign[both == 1] *= -1.0
    return sign


def brickwork_pairs(qubits: int, layer: int) -> tuple[tuple[int, int], ...]:
    """Neighbouring pairs on a line, offset by the layer's parity."""
    first = layer % 2
    return tuple((q, q + 1) for q in range(first, qubits - 1, 2))


def random_su2(rng: np.random.Generator, size: int) -> np.ndarray:
    """``size`` Haar-random 2x2 unitaries (determinant 1) from uniform unit quaternions."""
    q = rng.standard_normal((size, 4))
    q /= np.linalg.norm(q, axis=1, keepdims=True)
    a = q[:, 0] + 1j * q[:, 3]
    b = q[:, 2] + 1j * q[:, 1]
    gates = np.empty((size, 2, 2), dtype=complex)
    gates[:, 0, 0] = a
    gates[:, 0, 1] = -np.conj(b)
    gates[:, 1, 0] = b
    gates[:, 1, 1] = np.conj(a)
    return gates


@dataclass(frozen=True, eq=False)
class Circuit:
    """A layered circuit: per layer, one 2x2 gate per qubit, then CZ on pairs."""

    qubits: int
    gates: tuple[np.ndarray, ...]  # each (qubits, 2, 2)
    pairs: tuple[tuple[tuple[int, int], ...], ...]

    @property
    def depth(self) -> int:
        return len(self.gates)


def random_circuit(qubits: int, depth: int, rng: np.random.Generator) -> Circuit:
    """A random circuit of ``depth`` layers on ``qubits`` qubits."""
    if not 1 <= qubits <= MAX_CIRCUIT_QUBITS:
        raise ValueError(f"the circuit model takes 1 to {MAX_CIRCUIT_QUBITS} qubits, got {qubits}")
    if depth < 1:
        raise ValueError(f"depth must be at least 1, got {depth}")
    gates = tuple(random_su2(rng, qubits) for _ in range(depth))
    pairs = tuple(brickwork_pairs(qubits, layer) for layer in range(depth))
    return Circuit(qubits, gates, pairs)


def run_circuit(circuit: Circuit, state: np.ndarray | None = None) -> np.ndarray:
    """The final state vector of ``circuit`` from |0...0> (or ``state``)."""
    n = circuit.qubits
    psi = zero_state(n) if state is None else np.asarray(state, dtype=complex).copy()
    phases = {}
    for gates, pairs in zip(circuit.gates, circuit.pairs):
        for q in range(n):
            psi = apply_single(psi, gates[q], q, n)
        if pairs:
            if pairs not in phases:
                phases[pairs] = cz_phases(n, pairs)
            psi = psi * phases[pairs]
    return psi


def circuit_probabilities(qubits: int, depth: int, rng: np.random.Generator) -> np.ndarray:
    """Output distribution |<s|C|0>|^2 of one random circuit."""
    psi = run_circuit(random_circuit(qubits, depth, rng))
    p = np.abs(psi) ** 2
    return p / p.sum()


def porter_thomas_probabilities(qubits: int, rng: np.random.Generator) -> np.ndarray:
    """D probabilities with the Porter-Thomas law: normalised exponentials
    (a flat Dirichlet draw, whose marginals are Beta(1, D - 1))."""
    w = rng.exponential(size=2 ** qubits)
    return w / w.sum()


@dataclass(frozen=True, eq=False)
class Dataset:
    """One row per sample: circuit index, ideal probability, heavy (0/1)."""

    circuit: np.ndarray
    probability: np.ndarray
    heavy: np.ndarray
    qubits: int
    fidelity: float
    model: str
    depth: int | None


def sample_from(p: np.ndarray, samples: int, fidelity: float, rng: np.random.Generator):
    """Sample outcomes from F p + (1 - F)/D; return (probability, heavy) of each.

    The number of ideal draws is Binomial(samples, F); the rest are uniform.
    Heavy means the outcome's ideal probability exceeds the median of ``p``.
    """
    d = p.size
    ideal = rng.binomial(samples, fidelity)
    cdf = np.cumsum(p)
    picks = np.concatenate([
        np.minimum(np.searchsorted(cdf, rng.random(ideal) * cdf[-1], side="right"), d - 1),
        rng.integers(0, d, size=samples - ideal),
    ])
    picks = rng.permutation(picks)
    prob = p[picks]
    heavy = (prob > np.median(p)).astype(np.int8)
    return prob, heavy


def sample_large_dimension(qubits: int, samples: int, fidelity: float, rng: np.random.Generator):
    """Large-D Porter-Thomas sampling without the full distribution: x = D p
    is Gamma(2) for an ideal draw and Exp(1) for a uniform one (errors O(1/D));
    heavy means x > ln 2, the median of Exp(1)."""
    ideal = rng.random(samples) < fidelity
    x = np.where(ideal, rng.gamma(2.0, size=samples), rng.exponential(size=samples))
    prob = x / 2.0 ** qubits
    return prob, (x > np.log(2.0)).astype(np.int8)


def simulate_dataset(qubits: int, circuits: int, samples: int, fidelity: float,
                     rng: np.random.Generator, model: str = "porter-thomas",
                     depth: int | None = None) -> Dataset:
    """A simulated dataset of ``circuits`` x ``samples`` rows.

    Parameters
    ----------
    qubits : int
        1 to 60 for ``porter-thomas``; 1 to 20 for ``circuit``.
    circuits, samples : int
        Circuits, and samples per circuit.
    fidelity : float
        F in [0, 1].
    model : {"porter-thomas", "circuit"}
    depth : int, optional
        Layers per circuit (``circuit`` model; default :func:`default_depth`).
    """
    if model not in MODELS:
        raise ValueError(f"model must be one of {MODELS}, got {model!r}")
    if not 0.0 <= fidelity <= 1.0:
        raise ValueError(f"fidelity must lie in [0, 1], got {fidelity}")
    limit = MAX_CIRCUIT_QUBITS if model == "circuit" else MAX_QUBITS
    if not 1 <= qubits <= limit:
        raise ValueError(f"the {model} model takes 1 to {limit} qubits, got {qubits}")
    if model == "circuit" and depth is None:
        depth = default_depth(qubits)
    probs, heavies = [], []
    for _ in range(circuits):
        if model == "circuit":
            p, h = sample_from(circuit_probabilities(qubits, depth, rng), samples, fidelity, rng)
        elif qubits <= FULL_DISTRIBUTION_QUBITS:
            p, h = sample_from(porter_thomas_probabilities(qubits, rng), samples, fidelity, rng)
        else:
            p, h = sample_large_dimension(qubits, samples, fidelity, rng)
        probs.append(p)
        heavies.append(h)
    circuit = np.repeat(np.arange(circuits, dtype=np.int64), samples)
    return Dataset(circuit, np.concatenate(probs), np.concatenate(heavies), qubits, fidelity, model,
                   depth if model == "circuit" else None)


def default_depth(qubits: int) -> int:
    """Layers enough for a line of ``qubits`` to approach Porter-Thomas
    statistics: 4 n + 4.  Chosen by measurement, not from a source: over 300
    random circuits the mean collision sum (D + 1)/2 sum p^2 was 1.002 +- 0.002
    at 10 qubits and 1.01 +- 0.007 at 6 (2 n + 4 layers left 1.03 at 10)."""
    return 4 * qubits + 4
