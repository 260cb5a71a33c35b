"""Suggestions for the names people type (checker/claim/suggest.py), tried
through the command line as a new user meets them: ``check`` on a claim file
and ``batch`` on a table of claims."""

from __future__ import annotations

import io

import pytest

from checker.cli import run

BASE = "title: t\nmetric: proportion\nestimate: 0.6\n"
HEADER = "title,metric,estimate"


def refusal(*argv) -> str:
    out, err = io.StringIO(), io.StringIO()
    status = run([str(a) for a in argv], out, err)
    assert status == 2 and out.getvalue() == "" and err.getvalue().count("\n") == 1, err.getvalue()
    return err.getvalue()


@pytest.mark.parametrize("extra, hint", [
    # A field of another section is sent there, not to the nearest spelling ('estimate').
    ("sigma: 3\n", "unknown field 'sigma'; it belongs under significance; allowed fields of a claim"),
    ("p_value: 0.01\n", "unknown field 'p_value'; it belongs under significance;"),
    ("shots: 1000\n", "unknown field 'shots'; did you mean 'samples'? allowed"),
    ("n: 1000\n", "unknown field 'n'; did you mean 'samples'? allowed"),
    ("systematic: 0.01\n", "unknown field 'systematic'; did you mean 'syst_error'? allowed"),
    ("confidence_interval: {low: 0.5, high: 0.7}\n",
     "unknown field 'confidence_interval'; did you mean 'interval'?"),
    ("ci: {low: 0.5, high: 0.7}\n", "unknown field 'ci'; did you mean 'interval'?"),
    # Either error could be meant: ask which.
    ("error: 0.01\n", "unknown field 'error'; did you mean 'stat_error' or 'syst_error'? say which;"),
    ("Stat_Error: 0.01\n", "unknown field 'Stat_Error'; did you mean 'stat_error'?"),
    ("parts:\n  - {estimate: 0.6, shots: 100}\n",
     "parts.0.shots (line 5): unknown field 'shots'; did you mean 'samples'?"),
])
def test_check_suggests_the_field_meant(write_claim, extra, hint):
    assert hint in refusal("check", write_claim(BASE + extra))


@pytest.mark.parametrize("written, meant", [("Linear-XEB", "linear-xeb"), ("linear_xeb", "linear-xeb"),
                                             ("LOG XEB", "log-xeb"), ("Proportion", "proportion")])
def test_a_choice_in_another_case_or_with_underscores_is_refused_with_its_spelling(write_claim, written, meant):
    # Refused, not silently accepted: DESIGN.md fixes the vocabulary's spelling.
    line = refusal("check", write_claim(f"title: t\nmetric: {written}\nestimate: 0.6\n"))
    assert f"metric (line 2): metric is {written!r}; did you mean {meant!r}? allowed: linear-xeb | " in line


def test_a_choice_under_a_section_gets_its_spelling_too(write_claim):
    line = refusal("check", write_claim(BASE + "combination: {method: Inverse_Variance}\n"))
    assert "combination.method (line 4): method is 'Inverse_Variance'; did you mean 'inverse-variance'?" in line


@pytest.mark.parametrize("column, hint", [
    ("sigma", "the column 'sigma' is not in the claim vocabulary; it belongs under significance: "
              "name the column 'significance.sigma';"),
    # A misspelt dotted column gets the whole dotted name, not only its first part.
    ("signficance.sigma", "the column 'signficance.sigma' is not in the claim vocabulary; "
                          "did you mean 'significance.sigma'?"),
    ("shots", "did you mean 'samples'?"),
    ("n", "did you mean 'samples'?"),
    ("systematic", "did you mean 'syst_error'?"),
    ("ci", "did you mean 'interval'?"),
    ("error", "did you mean 'stat_error' or 'syst_error'? say which;"),
    ("parts.0.shots", "did you mean 'parts.0.samples'?"),
])
def test_batch_columns_get_the_same_suggestions(tmp_path, column, hint):
    path = tmp_path / "t.csv"
    path.write_text(f"{HEADER},{column}\nx,proportion,0.6,1\n", encoding="utf-8")
    assert hint in refusal("batch", path)


def test_batch_rows_get_the_choice_spelling(tmp_path):
    path = tmp_path / "t.csv"
    path.write_text(f"{HEADER}\nx,Linear_XEB,0.6\n", encoding="utf-8")
    out, err = io.StringIO(), io.StringIO()
    status = run(["batch", str(path)], out, err)
    assert status == 2
    assert "metric is 'Linear_XEB'; did you mean 'linear-xeb'?" in err.getvalue()
