"""The per-circuit estimates as arrays (checker.raw.circuit_table) against the
plain per-circuit loop (checker.raw.estimators.circuit_estimates): the same
numbers bit for bit (compared by repr, so -0.0, None and the types count),
on random data and on edge cases (one sample per circuit, equal values,
zero probabilities, circuits without heavy outputs, every dimension regime
of the log-XEB variances: exact finite D, the large-D series above 2^22, and
D beyond 60 qubits)."""

import numpy as np
import pytest

from checker.raw.circuit_table import circuit_table
from checker.raw.estimators import Accumulator, Sums, circuit_estimates
from checker.raw.readers import Chunk
from checker.raw.simulate_circuits import simulate_dataset


def _same(sums, labels):
    fast = list(circuit_table(sums, labels))
    plain = list(zip(labels, circuit_estimates(sums)))
    assert len(fast) == len(plain)
    for (label_a, a), (label_b, b) in zip(fast, plain):
        assert label_a == label_b
        assert list(a) == list(b)
        for name in a:
            assert repr(a[name].to_dict()) == repr(b[name].to_dict()), (label_a, name)
            assert repr(a[name]) == repr(b[name])
    return fast


def _accumulated(qubits, p, circuit, heavy=None):
    acc = Accumulator(qubits, sample_size=0, bins=False, rng=np.random.default_rng(0))
    acc.add(Chunk(0, p, circuit, heavy))
    return acc.result(list(range(int(circuit.max()) + 1)))


@pytest.mark.parametrize("qubits", [1, 2, 3, 8, 12, 20, 22, 23, 30, 60, 61, 200])
def test_random_circuits_give_the_plain_numbers(qubits):
    rng = np.random.default_rng(qubits)
    circuits = 300
    sizes = rng.integers(1, 12, size=circuits)  # one-sample circuits included
    circuit = np.repeat(np.arange(circuits), sizes)
    x = np.where(rng.random(circuit.size) < 0.4, rng.gamma(2.0, size=circuit.size), rng.exponential(size=circuit.size))
    p = np.minimum(x / 2.0 ** min(qubits, 1000), 1.0)
    heavy = (rng.random(circuit.size) < 0.7).astype(float)
    _same(_accumulated(qubits, p, circuit, heavy), [f"c{i}" for i in range(circuits)])


def test_simulated_data_give_the_plain_numbers():
    data = simulate_dataset(10, 40, 50, 0.5, np.random.default_rng(3))
    _same(_accumulated(10, data.probability, data.circuit, data.heavy.astype(float)), list(range(40)))


def _sums(qubits, n, sx, sx2, sl=None, sl2=None, zeros=None, hn=None, hs=None):
    k = len(n)
    arr = lambda v: None if v is None else np.asarray(v, dtype=float)  # noqa: E731
    return Sums(qubits=qubits, labels=tuple(range(k)), n=arr(n), sum_x=arr(sx), sum_x2=arr(sx2), sum_l=arr(sl),
                sum_l2=arr(sl2), zeros=arr(zeros if zeros is not None else [0.0] * k), heavy_n=arr(hn),
                heavy_sum=arr(hs), bins=None, sample=np.empty(0))


@pytest.mark.parametrize("qubits", [2, 10, 23, 61])
def test_edge_cases_give_the_plain_numbers(qubits):
    # Equal values (zero spread), all probabilities 0 (x = 0: estimate -1, log XEB not computed),
    # values far above the model's range (F clipped to 1), one sample, a circuit without heavy outputs.
    sums = _sums(qubits, n=[4, 3, 1, 2, 5, 2],
                 sx=[4.0, 0.0, 7.5, 200.0, 5.0, 1e-300],
                 sx2=[4.0, 0.0, 56.25, 20000.0, 5.0, 0.0],
                 sl=[0.0, 0.0, 2.0, 10.0, -3.0, -1400.0], sl2=[0.0, 0.0, 4.0, 50.0, 1.8, 980000.0],
                 zeros=[0.0, 3.0, 0.0, 0.0, 1.0, 0.0],
                 hn=[4.0, 0.0, 1.0, 2.0, 5.0, 2.0], hs=[4.0, 0.0, 1.0, 1.0, 0.0, 2.0])
    fast = _same(sums, list("abcdef"))
    assert "heavy-output" not in fast[1][1]
    assert fast[1][1]["log-xeb"].estimate is None
    assert fast[2][1]["linear-xeb"].stat_error_data is None


def test_sequence_behaviour():
    sums = _sums(10, n=[2, 3, 4], sx=[2.0, 3.5, 4.4], sx2=[2.5, 5.0, 6.0])
    table = circuit_table(sums, ["a", "b", "c"])
    plain = tuple(zip(["a", "b", "c"], circuit_estimates(sums)))
    assert len(table) == 3
    assert [label for label, _ in table[:2]] == ["a", "b"]
    assert table[-1][0] == "c" and repr(table[-1]) == repr(plain[-1])
    assert repr(table[1:]) == repr(list(plain[1:]))
    with pytest.raises(IndexError):
        table[3]


def test_a_circuit_without_samples_takes_the_plain_path():
    sums = _sums(10, n=[2, 0], sx=[2.0, 0.0], sx2=[2.5, 0.0])
    with pytest.raises(ZeroDivisionError):
        circuit_estimates(sums)
    with pytest.raises(ZeroDivisionError):
        circuit_table(sums, ["a", "b"])
