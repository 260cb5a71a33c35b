"""The state-vector simulator against hand-solved circuits, norm
preservation, and Porter-Thomas statistics for deep random circuits.

Porter-Thomas collision sum: sum_s p_s^2 -> 2/(D + 1) for Haar-random states
(Boixo et al., Nature Physics 14, 595 (2018), arXiv:1608.00263).  Ideal
heavy-output probability (1 + ln 2)/2 = 0.846574: Cross et al., Phys. Rev. A
100, 032328 (2019), arXiv:1811.12926 (REFERENCES.md).
"""

import math

import numpy as np
import pytest

from checker.raw import simulate_circuits as sc

S = 1 / math.sqrt(2)


def _circuit(qubits, layers):
    """A hand-built circuit: layers of (gate per qubit, CZ pairs)."""
    gates = tuple(np.stack(g) for g, _ in layers)
    pairs = tuple(tuple(p) for _, p in layers)
    return sc.Circuit(qubits, gates, pairs)


I2 = np.eye(2, dtype=complex)


def test_one_qubit_hadamard_and_rotation():
    # H|0> = (|0> + |1>)/sqrt 2; Rx(theta)|0> = cos(theta/2)|0> - i sin(theta/2)|1>.
    psi = sc.run_circuit(_circuit(1, [([sc.HADAMARD], [])]))
    assert np.allclose(psi, [S, S])
    theta = 0.7
    psi = sc.run_circuit(_circuit(1, [([sc.rx(theta)], [])]))
    assert np.allclose(psi, [math.cos(theta / 2), -1j * math.sin(theta / 2)])


def test_qubit_zero_is_the_least_significant_bit():
    # X on qubit 1 of |00> gives |q1 q0> = |10>, basis index 2.
    psi = sc.run_circuit(_circuit(2, [([I2, sc.PAULI_X], [])]))
    assert np.allclose(psi, [0, 0, 1, 0])


def test_two_qubit_bell_state_from_h_and_cz():
    # H on q0, then CNOT(q0 -> q1) written as H(q1) CZ H(q1):
    # |00> -> (|00> + |11>)/sqrt 2, indices 0 and 3.
    layers = [([sc.HADAMARD, sc.HADAMARD], [(0, 1)]), ([I2, sc.HADAMARD], [])]
    psi = sc.run_circuit(_circuit(2, layers))
    assert np.allclose(psi, [S, 0, 0, S])


def test_cz_on_the_plus_plus_state():
    # CZ (|0>+|1>)(|0>+|1>)/2 = (|00> + |01> + |10> - |11>)/2.
    psi = sc.run_circuit(_circuit(2, [([sc.HADAMARD, sc.HADAMARD], [(0, 1)])]))
    assert np.allclose(psi, [0.5, 0.5, 0.5, -0.5])
    assert np.array_equal(sc.cz_phases(2, [(0, 1)]), [1, 1, 1, -1])


def test_brickwork_pattern():
    assert sc.brickwork_pairs(5, 0) == ((0, 1), (2, 3))
    assert sc.brickwork_pairs(5, 1) == ((1, 2), (3, 4))
    assert sc.brickwork_pairs(1, 0) == ()


@pytest.mark.parametrize("qubits", [1, 2, 5, 9])
def test_random_circuits_preserve_the_norm(qubits):
    rng = np.random.default_rng(qubits)
    psi = sc.run_circuit(sc.random_circuit(qubits, 12, rng))
    assert np.linalg.norm(psi) == pytest.approx(1.0, abs=1e-12)


def test_random_su2_is_special_unitary_and_haar():
    g = sc.random_su2(np.random.default_rng(3), 20_000)
    eye = np.einsum("nij,nkj->nik", g, g.conj())
    assert np.allclose(eye, np.eye(2), atol=1e-12)
    assert np.allclose(np.linalg.det(g), 1.0)
    # Haar on SU(2): |U_00|^2 is uniform on [0, 1], so E|U_00|^4 = 1/3 (common
    # practice); 20,000 draws give sd 0.0021, the tolerance is about 5 sd.
    assert np.mean(np.abs(g[:, 0, 0]) ** 4) == pytest.approx(1 / 3, abs=0.01)


def test_deep_circuits_reach_the_porter_thomas_collision_sum():
    # 150 circuits of 6 qubits at the default depth: the mean of (D + 1)/2 sum p^2
    # is 1 within 4 standard errors of the mean (about 9,999 seeds in 10,000
    # if the circuits are Porter-Thomas; measured 1.01 +- 0.007 at this depth).
    # One layer stays far from it (a product-like state has a larger sum).
    rng = np.random.default_rng(11)
    qubits = 6
    d = 2 ** qubits
    deep = np.array([np.sum(sc.circuit_probabilities(qubits, sc.default_depth(qubits), rng) ** 2)
                     for _ in range(150)]) * (d + 1) / 2
    assert abs(deep.mean() - 1.0) < 4 * deep.std(ddof=1) / math.sqrt(deep.size) + 0.01
    shallow = np.array([np.sum(sc.circuit_probabilities(qubits, 1, rng) ** 2) for _ in range(50)]) * (d + 1) / 2
    assert shallow.mean() > 2.0


def test_porter_thomas_draws_have_the_collision_sum_exactly_in_expectation():
    # A flat Dirichlet draw has E sum p^2 = D * 2/(D (D + 1)) = 2/(D + 1).
    rng = np.random.default_rng(12)
    sums = np.array([np.sum(sc.porter_thomas_probabilities(8, rng) ** 2) for _ in range(400)]) * 257 / 2
    assert abs(sums.mean() - 1.0) < 4 * sums.std(ddof=1) / 20


def test_sampling_from_the_mixture_has_the_expected_mean():
    # For a fixed distribution p, E[D p(s)] = F D sum p^2 + (1 - F): within 4
    # standard errors (99.99% of seeds).
    rng = np.random.default_rng(13)
    p = sc.porter_thomas_probabilities(10, rng)
    d = p.size
    for f in (0.0, 0.5, 1.0):
        prob, heavy = sc.sample_from(p, 200_000, f, rng)
        x = d * prob
        expected = f * d * np.sum(p ** 2) + (1 - f)
        assert abs(x.mean() - expected) < 4 * x.std() / math.sqrt(x.size)
        assert set(np.unique(heavy)) <= {0, 1}
        assert np.all(np.isin(prob, p))


def test_heavy_output_probability_of_ideal_sampling():
    # Ideal sampling of Porter-Thomas circuits gives heavy outputs with
    # probability (1 + ln 2)/2 = 0.846574 (Cross et al. 2019), uniform sampling
    # 1/2.  40 circuits x 5,000 samples at 12 qubits: sd about 0.004 from the
    # circuits' own spread; tolerance 0.015.
    rng = np.random.default_rng(14)
    ideal = sc.simulate_dataset(12, 40, 5000, 1.0, rng)
    uniform = sc.simulate_dataset(12, 40, 5000, 0.0, rng)
    assert ideal.heavy.mean() == pytest.approx(0.846574, abs=0.015)
    assert uniform.heavy.mean() == pytest.approx(0.5, abs=0.01)


def test_large_dimension_sampler_has_the_porter_thomas_moments():
    # E x = 1 + F and Var x = 1 + 2F - F^2 (Boixo et al. 2018); 4 sd tolerance.
    rng = np.random.default_rng(15)
    f, n = 0.4, 400_000
    prob, heavy = sc.sample_large_dimension(40, n, f, rng)
    x = prob * 2.0 ** 40
    assert abs(x.mean() - (1 + f)) < 4 * math.sqrt((1 + 2 * f - f * f) / n)
    assert x.var() == pytest.approx(1 + 2 * f - f * f, rel=0.02)
    assert heavy.mean() == pytest.approx(f * (1 + math.log(2)) / 2 + (1 - f) * 0.5, abs=0.005)


def test_dataset_layout_and_validation():
    rng = np.random.default_rng(16)
    data = sc.simulate_dataset(4, 3, 7, 0.5, rng, model="circuit", depth=5)
    assert data.circuit.tolist() == [0] * 7 + [1] * 7 + [2] * 7
    assert data.probability.size == 21 and data.depth == 5
    assert sc.simulate_dataset(30, 2, 5, 0.5, rng).probability.max() < 1e-6
    for bad in [dict(model="quantum"), dict(fidelity=1.5), dict(qubits=21, model="circuit"), dict(qubits=61)]:
        kwargs = dict(qubits=3, circuits=1, samples=5, fidelity=0.5, rng=rng) | bad
        with pytest.raises(ValueError):
            sc.simulate_dataset(**kwargs)
    with pytest.raises(ValueError):
        sc.random_circuit(3, 0, rng)
