"""Loading claim files: printed text and lines kept, YAML loaded safely, and
every unusable file refused with one documented error in one line."""

from __future__ import annotations

import json
import math
import re
from pathlib import Path

import numpy as np
import pytest
import yaml
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from checker.claim.load import MAX_BYTES, MAX_DEPTH, document_from_mapping, load_document, parse_bytes, parse_text
from checker.errors import ClaimcheckError, InputFileError

# FILE[: field.path][ (line N)]: what is wrong[; what is allowed] -- errors.py, RULES.md
ONE_LINE = re.compile(r"^(?P<file>.+?)(?:: (?P<path>[^ :]+))?(?: \(line (?P<line>\d+)\))?: (?P<problem>[^;\n]+)"
                      r"(?:; (?P<allowed>[^\n]+))?$")


def one_line(exc: ClaimcheckError) -> re.Match:
    text = str(exc)
    assert "\n" not in text and text == exc.one_line()
    match = ONE_LINE.match(text)
    assert match, text
    return match


YAML_CLAIM = """\
title: Invented lattice claim
metric: linear-xeb
qubits: 30
estimate: 2.24e-3
stat_error: "0.20e-3"
samples: 25000000
significance:
  sigma: 4.20
  p_value: 1.3E-5
parts:
  - {label: c1, estimate: 2.5e-3}
  - label: c2
    estimate: 91.2%
integer_data: false
source: ~
"""


def test_yaml_keeps_printed_text_and_lines():
    doc = parse_text(YAML_CLAIM, "claim.yaml", "yaml")
    assert doc.data["estimate"] == 2.24e-3  # YAML 1.1 would give the string "2.24e-3"
    assert doc.data["qubits"] == 30 and isinstance(doc.data["qubits"], int)
    assert doc.data["significance"]["sigma"] == 4.2
    assert doc.data["stat_error"] == "0.20e-3"  # quoted: stays text, the model reads it
    assert doc.data["parts"][1]["estimate"] == "91.2%"
    assert doc.data["integer_data"] is False and doc.data["source"] is None
    texts = doc.texts
    assert texts[("estimate",)] == "2.24e-3"
    assert texts[("significance", "sigma")] == "4.20"  # the trailing zero survives
    assert texts[("significance", "p_value")] == "1.3E-5"
    assert texts[("samples",)] == "25000000"
    assert texts[("parts", 0, "estimate")] == "2.5e-3"
    assert doc.line_of(("estimate",)) == 4
    assert doc.line_of(("significance", "p_value")) == 9
    assert doc.line_of(("parts", 1, "estimate")) == 13
    assert doc.line_of(("parts", 0, "estimate")) == 11
    assert doc.line_of(("significance", "no_such_field")) == 7  # the nearest enclosing field


def test_json_keeps_printed_text_and_lines():
    text = ('{\n  "title": "Invented",\n  "metric": "proportion",\n  "estimate": 0.90,\n'
            '  "samples": 25000000,\n  "significance": {"p_value": 1.30e-5, "sided": "two"}\n}\n')
    doc = parse_text(text, "claim.json", "json")
    assert doc.data["estimate"] == 0.9
    assert doc.texts[("estimate",)] == "0.90"  # json.loads alone would print 0.9
    assert doc.texts[("significance", "p_value")] == "1.30e-5"
    assert doc.data["samples"] == 25000000 and isinstance(doc.data["samples"], int)
    assert doc.line_of(("estimate",)) == 4
    assert doc.line_of(("significance", "p_value")) == 6


def test_a_byte_order_mark_is_accepted():
    doc = parse_bytes("\ufefftitle: t\nmetric: mean\nestimate: 1\n".encode("utf-8"), "c.yaml", "yaml")
    assert doc.data["title"] == "t"


@pytest.mark.parametrize("text, value", [("1e-3", 1e-3), ("3e6", 3e6), ("+0.5", 0.5), (".5", 0.5),
                                         ("-2", -2), ("true", True), ("False", False), ("null", None),
                                         ("", None), ("1.0", 1.0)])
def test_yaml_plain_scalars(text, value):
    doc = parse_text(f"title: t\nx: {text}\n", "c.yaml", "yaml")
    assert doc.data["x"] == value and type(doc.data["x"]) is type(value)


@pytest.mark.parametrize("text", ["017", "1:30", "yes", "no", "on", "0x1F", "1_000", ".nan", ".inf",
                                  "-.inf", "2024-01-01", "1,000", "0o17"])
def test_yaml_1_1_surprises_stay_text_for_the_validator_to_refuse(text):
    # PyYAML (YAML 1.1) would read 017 as 15, 1:30 as 90, yes as True, 1_000 as 1000.
    doc = parse_text(f"title: t\nx: {text}\n", "c.yaml", "yaml")
    assert doc.data["x"] == text


def test_yaml_never_constructs_objects(tmp_path):
    marker = tmp_path / "constructed"
    text = f"title: !!python/object/apply:os.system ['touch {marker}']\nmetric: mean\nestimate: 1\n"
    with pytest.raises(InputFileError) as err:
        parse_text(text, "c.yaml", "yaml")
    assert not marker.exists()
    m = one_line(err.value)
    assert m["path"] == "title" and m["line"] == "1" and "tag" in m["problem"]


@pytest.mark.parametrize("text, path, line, words", [
    ("title: t\ntitle: u\n", "title", "2", "twice"),
    ("a: {b: 1, b: 2}\n", "a.b", "1", "twice"),
    ("x: &v 0.01\ny: *v\n", "y", "2", "alias"),
    ("x: &v [1, 2]\ny: *v\n", "y", "2", "alias"),
    ("x: &v {a: [1, *v]}\n", "x.a.1", "1", "alias"),
    ("base: &b {a: 1}\nother:\n  <<: *b\n", "other", "3", "merge"),
    ("x: !!binary aGVsbG8=\n", "x", "1", "tag"),
    ("x: !custom 3\n", "x", "1", "tag"),
    ("x: !!set {a, b}\n", "x", "1", "tag"),
    ("? [a, b]\n: c\n", "", "1", "field name"),
])
def test_yaml_refusals_name_the_field_and_line(text, path, line, words):
    with pytest.raises(InputFileError) as err:
        parse_text(text, "c.yaml", "yaml")
    m = one_line(err.value)
    assert (m["file"], m["path"] or "", m["line"]) == ("c.yaml", path, line)
    assert words in m["problem"] and m["allowed"]


def test_billion_laughs_is_refused_at_the_first_alias():
    text = "a: &a [x, x, x, x, x, x, x, x, x]\nb: &b [*a, *a, *a, *a, *a, *a, *a, *a, *a]\n" \
           "c: &c [*b, *b, *b, *b, *b, *b, *b, *b, *b]\nd: [*c, *c, *c, *c, *c, *c, *c, *c, *c]\n"
    with pytest.raises(InputFileError, match="alias"):
        parse_text(text, "c.yaml", "yaml")


@pytest.mark.parametrize("raw, fmt, words", [
    (b"", "yaml", "is empty"),
    (b"  \n\t\n", "yaml", "is empty"),
    (b"# only a comment\n", "yaml", "no document"),
    (b"title: t\n---\ntitle: u\n", "yaml", "2 YAML documents"),
    (b"- a\n- b\n", "yaml", "a list"),
    (b"just text\n", "yaml", "a single text"),
    (b"42\n", "yaml", "a single number"),
    (b"title: t\x00\n", "yaml", "binary"),
    (b"title: caf\xe9\n", "yaml", "not UTF-8"),
    (b"title: [unclosed\n", "yaml", "not valid YAML"),
    (b"title: t\n\tbad: 1\n", "yaml", "not valid YAML"),
    (b"title: t\x07\n", "yaml", "not valid YAML"),
    (b'{"title": "t",}', "json", "not valid JSON"),
    (b'{"x": NaN}', "json", "NaN"),
    (b'{"x": -Infinity}', "json", "Infinity"),
    (b'{"x": 1e400}', "json", "not finite"),
    (b'{"x": 1, "x": 2}', "json", "twice"),
    (b"[1, 2]", "json", "a list"),
    (b"null", "json", "nothing"),
    (b'"text"', "json", "a single text"),
])
def test_unusable_documents(raw, fmt, words):
    with pytest.raises(InputFileError) as err:
        parse_bytes(raw, "c." + fmt, fmt)
    m = one_line(err.value)
    assert words in m["problem"] and m["allowed"]


def test_syntax_errors_give_the_line():
    with pytest.raises(InputFileError) as err:
        parse_text("title: t\nmetric: mean\nestimate: [1,\n", "c.yaml", "yaml")
    assert one_line(err.value)["line"] == "4"
    with pytest.raises(InputFileError) as err:
        parse_text('{\n"title": "t",\n"metric" "mean"\n}', "c.json", "json")
    assert one_line(err.value)["line"] == "3"


def test_the_binary_junk_of_a_random_file(tmp_path):
    path = tmp_path / "junk.yaml"
    path.write_bytes(np.random.default_rng(7).integers(0, 256, 4096, dtype=np.uint8).tobytes())
    with pytest.raises(InputFileError) as err:
        load_document(path)
    assert one_line(err.value)["file"] == str(path)


@pytest.mark.parametrize("fmt", ["yaml", "json"])
def test_too_deep(fmt):
    deep = "[" * (MAX_DEPTH + 5) + "]" * (MAX_DEPTH + 5)
    text = f'{{"title": "t", "x": {deep}}}'
    with pytest.raises(InputFileError, match="nested too deeply"):
        parse_text(text, "c." + fmt, fmt)


@pytest.mark.parametrize("fmt", ["yaml", "json"])
def test_far_too_deep_for_the_parser_is_still_one_error(fmt):
    text = '{"x": ' + "[" * 5_000 + "]" * 5_000 + "}"
    with pytest.raises(InputFileError, match="nested too deeply"):
        parse_text(text, "c." + fmt, fmt)


def test_too_large(tmp_path):
    path = tmp_path / "big.yaml"
    path.write_bytes(b"title: t\nsource: " + b"x" * MAX_BYTES + b"\n")
    with pytest.raises(InputFileError, match="larger than"):
        load_document(path)


def test_files_that_are_not_claim_files(tmp_path):
    with pytest.raises(InputFileError, match="no such file"):
        load_document(tmp_path / "missing.yaml")
    (tmp_path / "folder.yaml").mkdir()
    with pytest.raises(InputFileError, match="directory"):
        load_document(tmp_path / "folder.yaml")
    (tmp_path / "notes.txt").write_text("title: t\n")
    with pytest.raises(InputFileError, match="extension"):
        load_document(tmp_path / "notes.txt")


def test_the_file_is_never_modified(tmp_path):
    path = tmp_path / "c.yml"
    path.write_text(YAML_CLAIM)
    before = path.stat().st_mtime_ns, path.read_bytes()
    load_document(path)
    assert (path.stat().st_mtime_ns, path.read_bytes()) == before


# --- the notebook API -------------------------------------------------------------------

def test_document_from_mapping():
    doc = document_from_mapping({"title": "t", "estimate": np.float64(0.25), "samples": np.int64(40),
                                 "parts": ({"estimate": 1.5},)})
    assert doc.data == {"title": "t", "estimate": 0.25, "samples": 40, "parts": [{"estimate": 1.5}]}
    assert doc.texts[("estimate",)] == "0.25" and doc.texts[("samples",)] == "40"


@pytest.mark.parametrize("mapping, words", [
    ({"x": math.nan}, "not finite"),
    ({"x": math.inf}, "not finite"),
    ({"x": object()}, "holds a object"),
    ({"x": {1, 2}}, "holds a set"),
])
def test_document_from_mapping_refusals(mapping, words):
    with pytest.raises(InputFileError, match=words):
        document_from_mapping(mapping)


def test_document_from_a_mapping_too_deep():
    value: object = 1
    for _ in range(MAX_DEPTH + 2):
        value = [value]
    with pytest.raises(InputFileError, match="nested too deeply"):
        document_from_mapping({"x": value})


# --- properties -------------------------------------------------------------------------

@settings(max_examples=200, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(raw=st.one_of(st.binary(max_size=300), st.text(max_size=300).map(lambda s: s.encode("utf-8"))),
       fmt=st.sampled_from(["yaml", "json"]))
def test_random_bytes_load_or_raise_a_documented_error(raw, fmt):
    try:
        doc = parse_bytes(raw, "c." + fmt, fmt)
    except InputFileError as exc:
        one_line(exc)
    else:
        assert isinstance(doc.data, dict)


YAMLISH = st.text(alphabet=st.sampled_from(list("ab:-[]{},&*!|>'\"#%@`?~ \n\t0123456789.eE+_x<")),
                  max_size=200)


@settings(max_examples=200, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(text=YAMLISH, fmt=st.sampled_from(["yaml", "json"]))
def test_random_yaml_like_text_loads_or_raises_a_documented_error(text, fmt):
    try:
        doc = parse_text(text, "c." + fmt, fmt)
    except InputFileError as exc:
        one_line(exc)
    else:
        assert isinstance(doc.data, dict)


SCALARS = st.one_of(st.none(), st.booleans(), st.integers(-10**30, 10**30),
                    st.floats(allow_nan=False, allow_infinity=False), st.text(max_size=20))
TREES = st.recursive(SCALARS, lambda kids: st.one_of(st.lists(kids, max_size=4),
                                                     st.dictionaries(st.text(max_size=8), kids, max_size=4)),
                     max_leaves=15)


@settings(max_examples=100, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(tree=st.dictionaries(st.text(max_size=8), TREES, max_size=6), fmt=st.sampled_from(["yaml", "json"]))
def test_random_structures_round_trip_through_the_loader(tree, fmt):
    text = yaml.safe_dump(tree, allow_unicode=True) if fmt == "yaml" else json.dumps(tree)
    try:
        doc = parse_text(text, "c." + fmt, fmt)
    except InputFileError as exc:
        one_line(exc)
        return
    assert isinstance(doc.data, dict)
    if fmt == "json":
        # JSON keeps every value as written.  (YAML need not: PyYAML's dumper writes some
        # strings, such as "1e5" or a NEL character, in forms that read back differently.)
        assert doc.data == tree


def test_the_c_loader_reads_every_example_like_the_pure_python_one(monkeypatch):
    # PyYAML's libyaml loader is used where available for speed; it must give the same values,
    # printed texts and line numbers as the reference pure-Python SafeLoader.
    import yaml

    import checker.claim.load as load

    root = Path(__file__).resolve().parents[2]
    texts = [p.read_text(encoding="utf-8") for p in sorted((root / "claims_examples").glob("*.yaml"))]
    texts += ["title: t\nmetric: mean\nestimate: 0.30e-3\nx: &a [1, 2]\ny: *a\n",
              "title: 'quoted: # not a comment'\nmetric: mean\nestimate: \"017\"\n",
              "- - - [1]\n", "a: {b: {c: [1, {d: 2}]}}\n", 'title: "\\ud800 lone surrogate"\n',
              "a: [1, 2\n", "a: 'unterminated\n"]
    for text in texts:
        outcomes = []
        for loader in (yaml.SafeLoader, getattr(yaml, "CSafeLoader", yaml.SafeLoader)):
            monkeypatch.setattr(load, "SAFE_LOADER", loader)
            try:
                doc = load.parse_text(text, "c.yaml", "yaml")
                outcomes.append((doc.data, dict(doc.texts), dict(doc.lines)))
            except Exception as exc:  # noqa: BLE001 - the two loaders must refuse alike too
                outcomes.append((type(exc).__name__, str(exc)))
        assert outcomes[0] == outcomes[1], text


def test_json_line_numbers_from_events_equal_those_from_composed_nodes():
    # The quick map (parser events) against the reference (composed nodes) on every example claim
    # as JSON, indented and on one line, and on texts at the edges of the two YAML readings.
    import glob
    import json

    from checker.claim.load import _json_lines, json_lines_composed, load_document

    texts = []
    for name in sorted(glob.glob("claims_examples/*.yaml") + glob.glob("claims_examples/*.json")):
        try:
            data = load_document(name).data
        except Exception:  # noqa: BLE001 - an example that is refused on purpose has no JSON to make
            continue
        texts += [json.dumps(data), json.dumps(data, indent=2), json.dumps(data, indent="\t"),
                  json.dumps(data, indent=1).replace("\n", "\r\n")]
    texts += ['{"a": [1, [2, [3, {"b": []}]], {}], "c": {"d": {"e": null}}}', '[]', '{}', '"x"', '3',
              '{"emoji": "\\ud83d\\ude00", "slash": "a\\/b"}', '{"lone": "\\ud800"}',
              '{"' + "k" * 1100 + '": 1, "b": 2}', '{"a":\t1,\n\t"b": [\n1,\n2]}',
              '{"a": "line\u2028sep", "b": 2}', '{"a": 1}\n\n', '\ufeff{"a": 1}']
    assert len(texts) > 60
    for text in texts:
        assert _json_lines(text) == json_lines_composed(text), text[:80]
