"""No stat_error printed, but samples and a threshold: the significance from the metric model's
sampling floor, said to be so, through the real command line (issue 16, input side).

Linear XEB at finite D: Var x = E_mix[x^2] - (E_mix x)^2 with the Porter-Thomas moments
E_u[x^2] = 2D/(D + 1), E_ideal[x] = 2D/(D + 1), E_ideal[x^2] = 6D^2/((D + 1)(D + 2)) (S. Boixo et
al., Nature Physics 14, 595 (2018)); the floor is sqrt(Var x / N) and z = (estimate - threshold) / floor.
"""

from __future__ import annotations

import io
import json
import math

import pytest

from checker.cli import run

CLAIM = """\
title: Invented 20-qubit device, no error printed (invented numbers)
metric: linear-xeb
qubits: 20
estimate: 2.0e-3
samples: 2.5e7
threshold: 0
significance: {{{sig}}}
"""


def floor_sigma(estimate, samples, d=2.0 ** 20):
    f = estimate * (d + 1) / (d - 1)  # the printed mean(x) - 1 is F (D - 1)/(D + 1)
    mean = f * 2 * d / (d + 1) + (1 - f)
    second = f * 6 * d * d / ((d + 1) * (d + 2)) + (1 - f) * 2 * d / (d + 1)
    return estimate / math.sqrt((second - mean * mean) / samples)


def significance(write_claim, sig):
    out = io.StringIO()
    status = run(["check", str(write_claim(CLAIM.format(sig=sig))), "--json", "--only", "significance"],
                 out, io.StringIO())
    return status, json.loads(out.getvalue())["findings"]


def test_the_floor_gives_the_most_significance_the_samples_allow(write_claim):
    status, found = significance(write_claim, "sigma: 9.0")
    (f,) = found
    # The printed box: estimate [1.95e-3, 2.05e-3], samples [2.45e7, 2.55e7].
    assert f["recomputed_range"]["low"] == pytest.approx(floor_sigma(1.95e-3, 2.45e7), rel=1e-6)
    assert f["recomputed_range"]["high"] == pytest.approx(floor_sigma(2.05e-3, 2.55e7), rel=1e-6)
    assert floor_sigma(2.0e-3, 2.5e7) == pytest.approx(9.98, abs=0.01)
    assert status == 0 and f["status"] == "pass" and f["details"]["error_from"] == "floor"
    assert "no stat_error is printed, so the statistical error is the linear-xeb model's sampling floor" \
        in f["message"]


def test_a_printed_sigma_beyond_the_floor_is_flagged(write_claim):
    status, (f,) = significance(write_claim, "sigma: 12.0")
    assert status == 1 and f["status"] == "fail" and "is more than the at most" in f["message"]
    status, (f,) = significance(write_claim, "p_value: 1e-30")
    assert status == 1 and f["status"] == "fail" and "below the least p" in f["message"]


def test_no_significance_printed_is_information_and_the_required_level_says_so(write_claim):
    status, found = significance(write_claim, "required_sigma: 3")
    assert status == 0 and [f["status"] for f in found] == ["info", "pass"]
    assert "sampling floor" in found[0]["message"] and "sampling floor" in found[1]["message"]
    status, found = significance(write_claim, "required_sigma: 20")
    assert status == 1 and found[1]["status"] == "fail"


def test_without_samples_it_still_says_what_is_missing(write_claim):
    text = CLAIM.format(sig="sigma: 9.0").replace("samples: 2.5e7\n", "")
    out = io.StringIO()
    run(["check", str(write_claim(text)), "--json", "--only", "significance"], out, io.StringIO())
    (f,) = json.loads(out.getvalue())["findings"]
    assert f["status"] == "skip" and "or samples for the model's floor" in f["message"]
