"""The quick validation of long part lists (claim/validate.py: surely_valid and
schema_errors) gives exactly jsonschema's errors, and so the same one-line
messages, over hostile part lists: wrong types, bools, None, integer-valued
floats, counts below 1, YAML 1.1 surprises, unknown and missing fields, a bad
part anywhere in a long list; and over random part lists (hypothesis)."""

import pytest
from hypothesis import given
from hypothesis import strategies as st

from checker.claim import document_from_mapping
from checker.claim.validate import QUICK_PARTS, claim_schema, schema_errors, surely_valid, validate_document
from checker.errors import ClaimSchemaError, InputFileError


def _doc(parts, **extra):
    return {"title": "Invented claim with parts", "metric": "linear-xeb", "estimate": "2.1e-3", "parts": parts,
            **extra}


def _good(i):
    return {"label": f"c{i}", "estimate": f"{2.0 + i / 1000:.3f}e-3", "stat_error": "7.1e-4", "samples": "2.0e6"}


def _errors(data, quick):
    return sorted((tuple(map(str, e.absolute_path)), e.validator, e.message) for e in schema_errors(data, quick))


def _message(data):
    try:
        validate_document(document_from_mapping(data))
    except (ClaimSchemaError, InputFileError) as exc:  # the loader refuses NaN before the schema
        return str(exc)
    return None


HOSTILE = [
    True, None, 1.5, "text", [1], {}, {"label": "x"}, {"estimate": True}, {"estimate": None},
    {"estimate": [1.0]}, {"estimate": {"a": 1}}, {"estimate": "1,000"}, {"estimate": "0x10"}, {"estimate": "nan"},
    {"estimate": "1_000"}, {"estimate": "yes"}, {"estimate": "2/3"}, {"estimate": "01"}, {"estimate": 2e-3, "extra": 1},
    {"estimate": 1, "samples": 0}, {"estimate": 1, "samples": 2.5}, {"estimate": 1, "samples": 2.0},
    {"estimate": 1, "samples": True}, {"estimate": 1, "circuits": -3}, {"estimate": 1, "label": 7},
    {"estimate": 1, "label": None}, {"estimate": float("nan")}, {"estimate": float("inf"), "samples": float("inf")},
    {"estimate": "91.2%", "stat_error": "+.5", "samples": "3e6", "circuits": "10"}, {1: 2, "estimate": 1},
]


@pytest.mark.parametrize("bad", HOSTILE, ids=[repr(h)[:40] for h in HOSTILE])
@pytest.mark.parametrize("where", [0, QUICK_PARTS // 2, 999])
def test_one_hostile_part_anywhere_in_a_long_list(bad, where):
    parts = [_good(i) for i in range(1000)]
    parts[where] = bad
    data = _doc(parts)
    assert _errors(data, True) == _errors(data, False)
    assert _message(data) == _message({**data, "parts": list(parts)})


def test_valid_long_lists_and_errors_elsewhere_keep_their_messages():
    parts = [_good(i) for i in range(500)]
    assert _errors(_doc(parts), True) == [] == _errors(_doc(parts), False)
    assert surely_valid(parts, claim_schema()["properties"]["parts"])
    for extra in ({"samples": "1,000"}, {"unknown_field": 1}, {"metric": "linear_xeb"}, {"tolerance": True}):
        data = _doc(parts, **extra)
        assert _errors(data, True) == _errors(data, False) != []
        assert _message(data) is not None
    assert _errors(_doc([]), True) == _errors(_doc([]), False) != []  # an empty list: minItems
    assert _errors(_doc("not a list"), True) == _errors(_doc("not a list"), False) != []


_values = st.one_of(st.none(), st.booleans(), st.integers(-3, 10 ** 7), st.floats(allow_nan=True),
                    st.sampled_from(["2.1e-3", "91%", "1,0", "0x1", "", "-", ".", "1e", "3e6", "yes", " 1", "1/2"]),
                    st.text(max_size=4), st.lists(st.integers(), max_size=2))
_keys = st.sampled_from(["label", "estimate", "stat_error", "samples", "circuits", "other"])
_parts = st.lists(st.one_of(st.dictionaries(_keys, _values, max_size=5), _values), min_size=0, max_size=40)


@given(_parts, st.integers(0, 60))
def test_random_part_lists_give_jsonschemas_errors(extra, padding):
    parts = [_good(i) for i in range(padding)] + extra
    data = _doc(parts)
    assert _errors(data, True) == _errors(data, False)
    # A list shown valid is valid under jsonschema itself.
    if surely_valid(parts, claim_schema()["properties"]["parts"]):
        assert not [e for e in schema_errors(data, False) if e.absolute_path and e.absolute_path[0] == "parts"]
