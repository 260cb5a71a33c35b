"""Schema validation: every refusal is one line naming the field, its line,
what is wrong and what is allowed."""

from __future__ import annotations

import json
import re
from pathlib import Path

import pytest
from jsonschema import Draft202012Validator

from checker.claim import read_claim
from checker.claim.load import parse_text
from checker.claim.validate import SCHEMA_PATH, claim_schema, validate_document
from checker.errors import ClaimcheckError, ClaimSchemaError

ROOT = Path(__file__).resolve().parents[2]
BASE = "title: Invented claim\nmetric: proportion\nestimate: 0.9\n"


def refusal(text: str, fmt: str = "yaml") -> str:
    doc = parse_text(text, f"claim.{fmt}", fmt)
    with pytest.raises(ClaimSchemaError) as err:
        validate_document(doc)
    line = str(err.value)
    assert "\n" not in line
    return line


def test_the_schema_is_a_valid_2020_12_schema_and_the_packaged_copy_is_the_published_one():
    schema = claim_schema()
    Draft202012Validator.check_schema(schema)
    assert schema["$schema"] == "https://json-schema.org/draft/2020-12/schema"
    assert json.loads((ROOT / "schemas" / "claim.schema.json").read_text()) == schema
    assert SCHEMA_PATH.is_file()


def test_the_vocabulary_of_design_md_is_all_in_the_schema():
    # DESIGN.md, "Claim vocabulary (fixed)".
    props = claim_schema()["properties"]
    # Fields added beyond DESIGN.md's vocabulary, each in the README's field table.
    added = {"counts_table", "rates", "error_level"}
    assert set(props) - added == {"$schema", "title", "source", "metric", "qubits", "estimate", "stat_error",
                          "syst_error", "interval", "samples", "circuits", "sd", "threshold", "significance",
                          "trials", "parts", "combination", "extrapolation", "error_budget", "integer_data",
                          "items", "tolerance",
                          # DESIGN.md, "Turn-2 additions" (the issue "More kinds of claims")
                          "baseline", "comparison", "observed", "background", "background_error"}
    assert set(props["baseline"]["properties"]) == {"label", "estimate", "stat_error", "samples"}
    assert set(props["comparison"]["properties"]) == {"paired", "discordant", "difference", "difference_error",
                                                       "sigma", "p_value", "sided", "test"}
    assert set(props["significance"]["properties"]) == {
        "sigma", "p_value", "sided", "systematics", "error_at", "required_sigma", "global_sigma",
        "upcrossings", "upcrossing_sigma"}
    # estimate is optional for the kinds that print none; build_claim enforces the rest
    assert claim_schema()["required"] == ["title", "metric"]


def test_a_claim_may_carry_its_schema():
    validate_document(parse_text(BASE + "$schema: claimcheck/claim.schema.json\n", "c.yaml", "yaml"))


# Pinned messages: the YAML 1.1 surprises (DESIGN.md, "Pitfalls already measured here").
@pytest.mark.parametrize("field_text, message", [
    ("samples: 017", "claim.yaml: samples (line 4): 017 has a leading zero, which YAML 1.1 reads as an "
                     "octal number (15); write the number without leading zeros"),
    ("samples: 1:30", "claim.yaml: samples (line 4): 1:30 would be read by YAML 1.1 as a base-60 number; "
                      "write a plain decimal number"),
    ("stat_error: yes", "claim.yaml: stat_error (line 4): yes is a YAML 1.1 true/false word, not a number; "
                        "write a number"),
    ("samples: 0x1F", "claim.yaml: samples (line 4): 0x1F is written in base 16, 8 or 2; "
                      "write a plain decimal number"),
    ("samples: 1_000", "claim.yaml: samples (line 4): 1_000 uses underscores, which YAML 1.1 silently drops; "
                       "write the digits without underscores"),
    ("stat_error: .nan", "claim.yaml: stat_error (line 4): .nan is not a finite number; "
                         "numbers must be finite: no NaN or infinity"),
    ("stat_error: .inf", "claim.yaml: stat_error (line 4): .inf is not a finite number; "
                         "numbers must be finite: no NaN or infinity"),
])
def test_yaml_1_1_surprises_are_refused_with_a_reason(field_text, message):
    assert refusal(BASE + field_text + "\n") == message


@pytest.mark.parametrize("field_text, words", [
    ("significance: {sigma: no}", "significance.sigma (line 4): no is a YAML 1.1 true/false word"),
    ("significance:\n  p_value: off", "significance.p_value (line 5): off is a YAML 1.1 true/false word"),
    ("samples: 019", "019 has a leading zero"),
    ("samples: 1,000", "thousands separators"),
    ("threshold: -.inf", "not a finite number"),
    ("samples: true", "samples (line 4): samples is true, a true/false value"),
])
def test_more_numbers_that_are_not_numbers(field_text, words):
    assert words in refusal(BASE + field_text + "\n")


def test_json_true_is_quoted_as_json_writes_it():
    text = '{"title": "t", "metric": "mean", "estimate": 1, "samples": true}'
    assert refusal(text, "json") == "claim.json: samples (line 1): samples is true, a true/false value; write a number"


def test_unknown_field_names_itself_and_suggests_the_spelling():
    assert refusal(BASE + "stat_eror: 0.01\n").startswith(
        "claim.yaml: stat_eror (line 4): unknown field 'stat_eror'; did you mean 'stat_error'? "
        "allowed fields of a claim: $schema, background, background_error, baseline, circuits,")


def test_a_field_in_the_wrong_section_says_where_it_belongs():
    assert "upcrossings (line 4): unknown field 'upcrossings'; it belongs under significance;" in \
        refusal(BASE + "upcrossings: 2\n")
    assert "significance.trials (line 5): unknown field 'trials'; it belongs at the top level;" in \
        refusal(BASE + "significance:\n  trials: 3\n")


def test_missing_required_fields():
    assert refusal("title: t\n") == (
        "claim.yaml: (top level) (line 1): the required field 'metric' is missing; "
        "a claim needs title, metric")
    assert refusal(BASE + "parts:\n  - label: a\n") == (
        "claim.yaml: parts.0 (line 5): the required field 'estimate' is missing; parts.0 needs estimate")
    assert "interval (line 4): the required field 'high' is missing" in refusal(BASE + "interval: {low: 0.8}\n")


@pytest.mark.parametrize("field_text, words", [
    ("metric: xeb", "metric (line 2): metric is 'xeb'; did you mean 'linear-xeb' or 'log-xeb'? allowed: linear-xeb | log-xeb | heavy-output | "
                    "proportion | mean | counts"),
    ("significance: {sided: both}", "significance.sided (line 4): sided is 'both'; allowed: one | two"),
    ("significance: {systematics: added}", "allowed: none | quadrature | marginalized"),
    ("significance: {error_at: null_value}", "allowed: estimate | threshold"),
    ("combination: {method: median}", "allowed: equal | samples | inverse-variance | random-effects"),
    ("significance: [1]", "significance (line 4): significance must be a mapping of fields"),
    ("parts: {a: 1}", "parts (line 4): parts must be a list"),
    ("parts: []", "parts (line 4): parts is empty"),
    ("integer_data: 3", "integer_data (line 4): integer_data must be true or false"),
    ("source: 12", "source (line 4): source must be text"),
    ("tolerance: -0.1", "tolerance (line 4): tolerance must be at least 0, got -0.1"),
    ("samples: 0", "samples (line 4): samples must be a whole number of at least 1, got 0"),
    ("samples: -5", "samples must be a whole number of at least 1, got -5"),
    ("circuits: 2.5", "circuits must be a whole number of at least 1, got 2.5"),
    ("estimate: high", "estimate (line 3): estimate must be a number, got 'high'"),
    ("stat_error: [1, 2]", "stat_error must be a number, got '[1, 2]'"),
    ("stat_error:", "stat_error must be a number"),
])
def test_wrong_kinds_of_value(field_text, words):
    text = BASE + field_text + "\n"
    if field_text.startswith("metric"):
        text = "title: Invented claim\n" + field_text + "\nestimate: 0.9\n"
    if field_text.startswith("estimate"):
        text = "title: Invented claim\nmetric: proportion\n" + field_text + "\n"
    assert words in refusal(text)


def test_the_earliest_problem_in_the_file_is_reported():
    text = BASE + "samples: -5\nstat_eror: 1\ncircuits: 017\n"
    assert "samples (line 4)" in refusal(text)
    text = BASE + "stat_eror: 1\nsamples: -5\n"
    assert "stat_eror (line 4)" in refusal(text)


def test_refusals_through_read_claim_name_the_file(tmp_path):
    path = tmp_path / "typo.yaml"
    path.write_text(BASE + "stat_eror: 0.01\n")
    with pytest.raises(ClaimSchemaError) as err:
        read_claim(path)
    assert str(err.value).startswith(f"{path}: stat_eror (line 4): unknown field")
    assert isinstance(err.value, ClaimcheckError)


FORMAT = re.compile(r"^claim\.(yaml|json): [^ ]+ \(line \d+\): [^;]+; .+$")


@pytest.mark.parametrize("field_text", ["samples: 017", "stat_eror: 1", "metric2: x", "parts: []",
                                        "significance: {sided: 3}", "interval: {low: a, high: 1}"])
def test_every_schema_refusal_has_the_full_one_line_format(field_text):
    assert FORMAT.match(refusal(BASE + field_text + "\n"))
