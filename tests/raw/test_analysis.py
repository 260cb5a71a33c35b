"""One pass over a data file, then fits, tests and the bootstrap."""

import numpy as np
import pytest

from checker.errors import DataError
from checker.raw.analysis import analyse
from checker.render.raw_json import raw_result_to_dict
from checker.raw.simulate_circuits import simulate_dataset


@pytest.fixture(scope="module")
def files(tmp_path_factory):
    folder = tmp_path_factory.mktemp("analysis")
    rng = np.random.default_rng(1)
    many = simulate_dataset(10, 12, 400, 0.5, rng)
    np.savez(folder / "many.npz", probability=many.probability, circuit=many.circuit, heavy=many.heavy)
    one = simulate_dataset(10, 1, 6000, 0.5, rng)
    np.savez(folder / "one.npz", probability=one.probability, heavy=one.heavy)
    np.save(folder / "one.npy", one.probability)
    return folder, many, one


def test_combined_estimates_and_all_parts(files):
    folder, many, _ = files
    r = analyse(str(folder / "many.npz"), "linear-xeb", 10, bootstrap=500, threshold=0.2, fit_sample=2000)
    x = many.probability * 1024
    assert r.rows == 4800 and r.circuit_count == 12
    assert r.headline.estimate == pytest.approx(x.mean() - 1)
    assert set(r.combined) == {"linear-xeb", "log-xeb", "heavy-output"}
    assert [f.method for f in r.fits] == ["moment", "maximum-likelihood"]
    assert [(t.at, t.test) for t in r.goodness_of_fit] == [
        (at, test) for at in ("fitted", "threshold", "zero") for test in ("kolmogorov-smirnov", "cramer-von-mises")]
    assert r.bootstrap.resampling == "circuits" and r.bootstrap.replicates == 500
    assert r.bootstrap.low < r.headline.estimate < r.bootstrap.high
    # F = 0 is far from the data (F = 0.5) at 2,000 samples.
    zero = [t for t in r.goodness_of_fit if t.at == "zero"]
    assert all(t.p_value < 1e-6 for t in zero)
    assert r.histogram is not None and r.histogram.samples == 2000


def test_single_circuit_bootstrap_is_binned_and_close_to_the_data_error(files):
    # The binned bootstrap sd of a mean equals sample sd / sqrt(N) to Monte
    # Carlo precision (2,000 replicates: about 1.6%; tolerance 6%).
    folder, _, one = files
    r = analyse(str(folder / "one.npy"), "linear-xeb", 10, bootstrap=2000, fit_sample=1000)
    assert r.bootstrap.resampling == "binned"
    assert r.bootstrap.sd == pytest.approx(r.headline.stat_error_data, rel=0.06)
    assert 0 < r.bootstrap.within_share < 1e-4
    assert r.bootstrap.error_bound < 0.01 * r.bootstrap.sd
    assert any("value bins" in n for n in r.notes)
    log = analyse(str(folder / "one.npy"), "log-xeb", 10, bootstrap=2000, fit_sample=1000)
    assert log.bootstrap.resampling == "binned"
    assert log.bootstrap.sd == pytest.approx(log.headline.stat_error_data, rel=0.06)
    heavy = analyse(str(folder / "one.npz"), "heavy-output", 10, bootstrap=2000, fit_sample=1000)
    assert heavy.bootstrap.resampling == "binomial"
    assert heavy.headline.estimate == pytest.approx(one.heavy.mean())


def test_same_seed_same_result_other_seed_other_bootstrap(files):
    folder, _, _ = files
    path = str(folder / "many.npz")
    a = raw_result_to_dict(analyse(path, "linear-xeb", 10, bootstrap=300, seed=5, fit_sample=500))
    b = raw_result_to_dict(analyse(path, "linear-xeb", 10, bootstrap=300, seed=5, fit_sample=500))
    c = raw_result_to_dict(analyse(path, "linear-xeb", 10, bootstrap=300, seed=6, fit_sample=500))
    assert a == b
    assert a["bootstrap"]["percentile"]["low"] != c["bootstrap"]["percentile"]["low"]  # the t interval has no seed
    assert a["combined"] == c["combined"]


def test_estimate_only_skips_the_rest(files):
    folder, _, _ = files
    r = analyse(str(folder / "many.npz"), "linear-xeb", 10, estimate_only=True)
    assert r.bootstrap is None and r.goodness_of_fit == () and r.histogram is None
    assert [f.method for f in r.fits] == ["moment"]
    assert "log-xeb" not in r.combined
    full = analyse(str(folder / "many.npz"), "linear-xeb", 10, bootstrap=0, fit_sample=100)
    assert r.headline == full.headline


def test_data_the_metric_cannot_use(files, tmp_path):
    folder, _, _ = files
    with pytest.raises(DataError, match="has no heavy column"):
        analyse(str(folder / "one.npy"), "heavy-output", 10)
    np.save(tmp_path / "zero.npy", np.array([0.0, 0.001, 0.002]))
    with pytest.raises(DataError, match="1 samples have probability 0"):
        analyse(str(tmp_path / "zero.npy"), "log-xeb", 10)
    assert analyse(str(tmp_path / "zero.npy"), "linear-xeb", 10, bootstrap=10).combined["log-xeb"].estimate is None
    with pytest.raises(DataError, match="qubits must be a whole number from 1 to 500"):
        analyse(str(tmp_path / "zero.npy"), "linear-xeb", 0)
    with pytest.raises(DataError, match="has no raw-data estimator"):
        analyse(str(tmp_path / "zero.npy"), "proportion", 10)


def test_notes_flag_a_wrong_number_of_qubits(files):
    folder, _, _ = files
    r = analyse(str(folder / "many.npz"), "linear-xeb", 16, bootstrap=0, fit_sample=100)
    assert any("check --qubits" in n for n in r.notes)


def test_bootstrap_histogram_counts_match_its_density(files):
    # The counts per bin (drawn by raw --html) and the density (in --json) describe
    # the same replicates: density = counts / (replicates x bin width), numpy's
    # definition of density=True (numpy.histogram documentation).
    folder, _, _ = files
    b = analyse(str(folder / "many.npz"), "linear-xeb", 10, bootstrap=400, fit_sample=1000).bootstrap
    counts = np.asarray(b.histogram_counts)
    assert counts.sum() == b.replicates and len(counts) == len(b.histogram_edges) - 1
    widths = np.diff(b.histogram_edges)
    assert np.allclose(counts / (b.replicates * widths), b.histogram_density)
