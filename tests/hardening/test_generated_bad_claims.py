"""Generated bad claim files through the real command line.

Every file here is unusable on purpose.  Whatever is wrong, claimcheck must exit 2
with exactly one line on stderr that starts with the file's name (and names the field
where there is one), print no traceback, write nothing to stdout and create no report.
"""

from __future__ import annotations

import datetime
import io
import json

import yaml
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from checker.cli import run

# Per example: generous for a loaded machine, finite so that a slow path shows (tests/conftest.py).
DEADLINE = datetime.timedelta(seconds=20)

VALID = {
    "title": "Generated claim (invented)",
    "metric": "linear-xeb",
    "qubits": 20,
    "estimate": 2.0e-3,
    "stat_error": 0.3e-3,
    "samples": 2000000,
    "threshold": 0.0,
    "significance": {"sigma": 6.7, "sided": "one"},
    "trials": 3,
}
NUMBER_FIELDS = [("estimate",), ("stat_error",), ("threshold",), ("significance", "sigma")]
COUNT_FIELDS = [("samples",), ("qubits",), ("trials",)]
ENUM_FIELDS = [("metric",), ("significance", "sided")]

# YAML texts that are not usable numbers, each written the way a person might.
BAD_NUMBER_TEXT = [".nan", ".NaN", ".inf", "-.inf", "+.Inf", "'NaN'", "'inf'", "'Infinity'", "abc",
                   "'1.2.3'", "yes", "no", "on", "off", "017", "1:30", "0x1F", "1_000", "[1, 2]",
                   "{a: 1}", "true", "''", "null", "'1,5'", "'2.24e-3x'"]
BAD_COUNT_TEXT = ["-5", "0", "2.5", "'many'", "-1e6", "1e400", "0.55e1", "'-3'", "3.7", "'0'"]
BAD_ENUM_TEXT = ["three", "1", "null", "[one]", "'One '"]


def set_in(doc: dict, path: tuple, value) -> dict:
    doc = json.loads(json.dumps(doc))
    node = doc
    for key in path[:-1]:
        node = node[key]
    node[path[-1]] = value
    return doc


def yaml_with(path: tuple, text: str) -> str:
    """The valid claim as YAML, with the field at ``path`` written as raw ``text``."""
    marker = "__REPLACE_ME__"
    body = yaml.safe_dump(set_in(VALID, path, marker), sort_keys=False)
    return body.replace(marker, text)


def structural_cases():
    return st.one_of(
        st.tuples(st.sampled_from(NUMBER_FIELDS), st.sampled_from(BAD_NUMBER_TEXT)).map(
            lambda c: ("yaml", yaml_with(*c).encode(), ".".join(c[0]))),
        st.tuples(st.sampled_from(COUNT_FIELDS), st.sampled_from(BAD_COUNT_TEXT)).map(
            lambda c: ("yaml", yaml_with(*c).encode(), ".".join(c[0]))),
        st.tuples(st.sampled_from(ENUM_FIELDS), st.sampled_from(BAD_ENUM_TEXT)).map(
            lambda c: ("yaml", yaml_with(*c).encode(), ".".join(c[0]))),
        # Unknown fields, at the top level and nested.
        st.tuples(st.sampled_from(["sigma_level", "estmate", "pvalue", "x"]), st.booleans()).map(
            lambda c: ("yaml", (yaml.safe_dump(VALID, sort_keys=False)
                                + (f"{c[0]}: 1\n" if c[1] else f"significance_extra:\n  {c[0]}: 1\n")).encode(),
                       c[0] if c[1] else "")),
        # A required field missing.
        st.sampled_from(["title", "metric", "estimate"]).map(
            lambda k: ("yaml", yaml.safe_dump({a: b for a, b in VALID.items() if a != k}).encode(), "")),
        # Duplicate keys.
        st.sampled_from(["estimate", "title", "samples"]).map(
            lambda k: ("yaml", (yaml.safe_dump(VALID, sort_keys=False) + f"{k}: {json.dumps(VALID[k])}\n").encode(), k)),
        # JSON with non-finite numbers written every way.
        st.sampled_from(["NaN", "Infinity", "-Infinity", "1e999", "-1e999"]).map(
            lambda t: ("json", json.dumps(VALID).replace('"estimate": 0.002', f'"estimate": {t}').encode(), "")),
        # Broken syntax, wrong top-level shapes, empty files.
        st.sampled_from([b"", b"   \n", b"title: [unclosed\n", b"- a\n- b\n", b"just text\n", b"42\n",
                         b"{\"title\": \"x\",}", b"---\ntitle: a\n---\ntitle: b\n", b"title: 'x\n",
                         b"\tmetric: mean\n", b"null\n"]).map(lambda b: ("yaml", b, "")),
        # Binary junk and wrong encodings.
        st.binary(min_size=1, max_size=200).map(lambda b: ("yaml", b"\x00" + b, "")),
        st.text(alphabet="éüßñ€", min_size=1, max_size=20).map(
            lambda t: ("yaml", f"title: {t}\nmetric: mean\n".encode("utf-16"), "")),
        st.text(alphabet="éüßñ", min_size=1, max_size=20).map(
            lambda t: ("yaml", f"title: {t}\nmetric: mean\nestimate: 1\n".encode("latin-1"), "")),
        # Deep nesting.
        st.integers(min_value=40, max_value=3000).map(
            lambda n: ("yaml", ("title: " + "[" * n + "]" * n + "\n").encode(), "")),
        st.integers(min_value=40, max_value=3000).map(
            lambda n: ("json", ('{"title": ' + "[" * n + "]" * n + "}").encode(), "")),
        # Anchors and aliases, including the exponential kind.
        st.integers(min_value=1, max_value=9).map(lambda n: ("yaml", _laughs(n).encode(), "")),
        # Tags that would construct objects.
        st.sampled_from(["!!python/object:os.system", "!!python/name:os.system", "!custom",
                         "!!binary aGVsbG8="]).map(
            lambda t: ("yaml", yaml_with(("title",), f"{t} x").encode(), "title")),
        # A huge file.
        st.integers(min_value=1_000_001, max_value=1_200_000).map(
            lambda n: ("yaml", (yaml.safe_dump(VALID) + "#" * n + "\n").encode(), "")),
    )


def _laughs(depth: int) -> str:
    lines = ["a0: &a0 [x, x, x, x, x, x, x, x, x]"]
    for i in range(1, depth + 1):
        refs = ", ".join([f"*a{i - 1}"] * 9)
        lines.append(f"a{i}: &a{i} [{refs}]")
    return "title: t\nmetric: mean\nestimate: 1\nsd: 1\n" + "\n".join(f"x{line}" for line in lines) + "\n"


@settings(max_examples=1000, deadline=DEADLINE, suppress_health_check=[HealthCheck.too_slow,
                                                                     HealthCheck.data_too_large])
@given(structural_cases())
def test_bad_claim_files_exit_2_with_one_line(tmp_path_factory, case):
    fmt, payload, field = case
    folder = tmp_path_factory.mktemp("bad")
    claim = folder / f"claim.{fmt}"
    claim.write_bytes(payload)
    report = folder / "notes.md"
    out, err = io.StringIO(), io.StringIO()
    status = run(["check", str(claim), "--json", "--markdown", str(report)], out, err)
    message = err.getvalue()
    assert status == 2, (payload[:200], message, out.getvalue()[:300])
    assert out.getvalue() == ""
    assert message.count("\n") == 1 and message.endswith("\n"), message
    assert message.startswith(str(claim)), message
    assert "Traceback" not in message
    if field:
        assert field in message, message
    assert not report.exists()
    assert claim.read_bytes() == payload  # the input is never modified
