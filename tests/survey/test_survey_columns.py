"""checker/survey/columns.py: table columns against the claim vocabulary, rows into Documents."""

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from checker.claim import claim_from_document
from checker.claim.model import build_claim
from checker.claim.validate import _validator
from checker.errors import ClaimSchemaError, DataError
from checker.survey.columns import ColumnPlan, parse_column_name

HEADER = ["title", "metric", "estimate", "stat_error", "samples", "threshold", "significance.sigma",
          "significance.sided", "integer_data", "# note"]


def doc_of(cells, header=HEADER, line=7):
    plan = ColumnPlan(header, "t.csv")
    return plan.document(cells, "t.csv row 1", line)


def test_column_names_with_dots_and_entry_numbers():
    assert parse_column_name("significance.sigma") == ("significance", "sigma")
    assert parse_column_name("parts.0.estimate") == ("parts", 0, "estimate")


def test_a_row_keeps_every_cell_as_printed():
    doc, quick = doc_of(["T", "linear-xeb", "2.10e-2", "0.15e-2", "5.0e5", "0", "14", "one", "", "x"])
    assert quick
    assert doc.data == {"title": "T", "metric": "linear-xeb", "estimate": "2.10e-2", "stat_error": "0.15e-2",
                        "samples": "5.0e5", "threshold": "0", "significance": {"sigma": "14", "sided": "one"}}
    claim = build_claim(doc)
    # DESIGN.md, printed precision: "2.10e-2" stands for [2.095e-2, 2.105e-2]; "14" for [13.5, 14.5].
    assert claim.estimate.bounds == pytest.approx((2.095e-2, 2.105e-2))
    assert claim.significance.sigma.bounds == pytest.approx((13.5, 14.5))
    # Counts written with an exponent carry printed precision: 5.0e5 is [4.95e5, 5.05e5].
    assert claim.samples.bounds == pytest.approx((4.95e5, 5.05e5))


def test_quick_path_builds_the_same_claim_as_full_validation():
    doc, quick = doc_of(["T", "mean", "0.912", "0.009", "1000", "0.5", "45.8", "", "true", ""])
    assert quick
    assert build_claim(doc) == claim_from_document(doc)
    assert build_claim(doc).integer_data is True


def test_cells_are_stripped_and_empty_means_absent():
    doc, quick = doc_of([" T ", " mean ", " 0.25 ", "", "", "", "", "", "", ""])
    assert quick and doc.data == {"title": "T", "metric": "mean", "estimate": "0.25"}


@pytest.mark.parametrize("cells, message, schema_refuses", [
    (["T", "fidelity", "0.5", "", "", "", "", "", "", ""], "metric is 'fidelity'", True),
    (["T", "proportion", "0.5", "", "2,000", "", "", "", "", ""], "thousands separators", True),
    (["T", "proportion", "0.5", "", "", "", "", "both", "", ""], "sided is 'both'", True),
    (["T", "proportion", "0.5", "", "", "", "", "", "yes", ""], "must be true or false", True),
    (["", "proportion", "0.5", "", "", "", "", "", "", ""], "required field 'title'", True),
    # Digits the schema accepts as text; the claim builder refuses the value.
    (["T", "proportion", "0.5", "", "-5", "", "", "", "", ""], "whole number of at least 1", False),
])
def test_a_bad_row_gets_the_check_commands_message(cells, message, schema_refuses):
    doc, quick = doc_of(cells)
    assert quick is not schema_refuses
    with pytest.raises(ClaimSchemaError) as full:
        claim_from_document(doc)
    with pytest.raises(ClaimSchemaError) as batch_path:
        build_claim(doc) if quick else claim_from_document(doc)
    line = full.value.one_line()
    assert batch_path.value.one_line() == line
    assert message in line and line.startswith("t.csv row 1: ") and "(line 7)" in line


def test_ragged_row_is_reported_with_its_line():
    with pytest.raises(DataError) as err:
        doc_of(["T", "mean", "0.25"])
    assert err.value.one_line() == ("t.csv row 1 (line 7): has 3 cells but the header names 10 columns; "
                                    "give every row one cell per column (empty for a field left out)")


@pytest.mark.parametrize("header, message", [
    (["title", "metric", "estimate", "significance.sigm"], "did you mean 'significance.sigma'?"),
    (["title", "metric", "estimat"], "did you mean 'estimate'?"),
    (["title", "significance"], "names a group of fields"),
    (["title", "parts.estimate"], "needs an entry number after parts"),
    (["title", "estimate.low"], "holds a single value"),
    (["title", "title"], "appears twice"),
    (["title", ""], "has no name"),
    (["# only notes"], "names no claim field"),
])
def test_header_problems_stop_the_table(header, message):
    with pytest.raises(DataError) as err:
        ColumnPlan(header, "t.csv")
    assert message in err.value.one_line()


def test_list_columns_become_lists_and_gaps_are_refused():
    header = ["title", "metric", "estimate", "parts.0.label", "parts.0.estimate", "parts.1.estimate",
              "combination.method"]
    plan = ColumnPlan(header, "t.csv")
    doc, quick = plan.document(["T", "mean", "1", "a", "1.0", "2.0", "equal"], "r", 3)
    assert quick
    assert doc.data["parts"] == [{"label": "a", "estimate": "1.0"}, {"estimate": "2.0"}]
    assert doc.texts[("parts", 1, "estimate")] == "2.0"
    with pytest.raises(DataError) as err:
        plan.document(["T", "mean", "1", "", "", "2.0", ""], "r", 3)
    assert "leaves parts.0 empty" in err.value.one_line()


# Cells drawn from valid and invalid texts for each kind of field.
NUMBERS = ["", "4.2", "2.5e7", "0", "-1", "1e-3", "abc", "1,000", "017", "91.2%", "< 0.001", "1:30", "nan"]
POOLS = {
    "title": ["", "T", "42"],
    "metric": ["", "linear-xeb", "proportion", "heavy-output", "fidelity"],
    "estimate": NUMBERS, "stat_error": NUMBERS, "samples": NUMBERS + ["30", "3.5"],
    "significance.sigma": NUMBERS, "significance.p_value": NUMBERS,
    "significance.sided": ["", "one", "two", "both"],
    "integer_data": ["", "true", "false", "yes", "1"],
    "interval.low": NUMBERS, "interval.high": ["", "0.5"],
    "combination.method": ["", "equal", "median"], "combination.estimate": ["", "0.3", "x"],
    "parts.0.estimate": ["", "0.1", "?"], "parts.0.label": ["", "a"], "parts.1.estimate": ["", "0.2"],
}


@settings(max_examples=300, deadline=None)
@given(st.fixed_dictionaries({k: st.sampled_from(v) for k, v in POOLS.items()}))
def test_quick_test_agrees_with_the_schema_validator(row):
    # The quick test must never pass a row the schema refuses (the batch would then skip the
    # validator's message), and should pass every row the schema accepts (else it saves nothing).
    plan = ColumnPlan(list(POOLS), "t.csv")
    try:
        doc, quick = plan.document([row[k] for k in POOLS], "r", 1)
    except DataError:
        return  # a gap in the parts entries: reported before the schema
    assert quick == _validator().is_valid(doc.data)


def test_rates_are_dotted_columns_as_a_bare_value_or_a_value_with_an_interval():
    header = ["title", "metric", "estimate", "counts_table.true_positive", "counts_table.false_positive",
              "counts_table.false_negative", "counts_table.true_negative", "rates.specificity",
              "rates.recall.value", "rates.recall.interval.low", "rates.recall.interval.high"]
    doc, _ = doc_of(["T", "proportion", "85.90%", "35", "4", "7", "32", "88.89%", "83.33%", "75.06%", "91.60%"],
                    header=header)
    assert doc.data["rates"] == {"specificity": "88.89%",
                                 "recall": {"value": "83.33%", "interval": {"low": "75.06%", "high": "91.60%"}}}
    claim = claim_from_document(doc)
    assert [r.name for r in claim.rates] == ["specificity", "recall"]
    assert claim.rates[1].interval.high.text == "91.60%"


@pytest.mark.parametrize("column, says", [("rates.recall.interval", "names a group of fields"),
                                          ("rates.recal", "did you mean 'rates.recall'"),
                                          ("rates.specificity.value.low", "holds a single value")])
def test_rate_column_mistakes_are_one_line(column, says):
    with pytest.raises(DataError, match=says):
        ColumnPlan(["title", "metric", "estimate", column], "t.csv")
