"""``claimcheck template --metric M``: a commented skeleton that loads."""

import io

import pytest

from checker.claim.validate import claim_schema
from checker.cli import run


def claimcheck(*argv, stdin=None):
    out, err = io.StringIO(), io.StringIO()
    status = run(list(map(str, argv)), out, err)
    return status, out.getvalue(), err.getvalue()


@pytest.mark.parametrize("metric", claim_schema()["properties"]["metric"]["enum"])
def test_each_skeleton_loads_and_names_every_field_it_offers(tmp_path, metric):
    status, text, err = claimcheck("template", "--metric", metric)
    assert (status, err) == (0, "")
    assert f"metric: {metric} " in text and text.startswith(f"# Claim skeleton for metric {metric}")
    path = tmp_path / "skeleton.yaml"
    path.write_text(text, encoding="utf-8")
    status, out, err = claimcheck("check", path, "--verdict-only")
    assert status == 0 and err == "" and out.startswith(("consistent", "incomplete"))
    # Every field of the vocabulary is there, commented out, except the ones of other metrics.
    offered = {line.lstrip("# ").split(":")[0] for line in text.splitlines() if ":" in line}
    assert {"stat_error", "samples", "threshold", "significance", "sigma", "p_value", "parts"} <= offered
    assert ("sd" in offered) == (metric == "mean")
    assert ("qubits" in offered) == (metric in ("linear-xeb", "log-xeb", "heavy-output"))
    assert ("observed" in offered) == (metric == "counts")


def test_a_misspelt_metric_gets_its_spelling():
    status, out, err = claimcheck("template", "--metric", "Linear_XEB")
    assert status == 2 and out == "" and "unknown metric 'Linear_XEB'; did you mean 'linear-xeb'?" in err
