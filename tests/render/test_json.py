"""The JSON report: exactly the contract's keys, and never NaN or Infinity."""

from __future__ import annotations

import json
import math

import numpy as np

from checker.render.json import clean, dumps, finding_to_dict, render_json, report_to_dict
from checker.report import Finding, Report


def strict(text):
    def refuse(token):
        raise AssertionError(f"JSON holds {token}")
    return json.loads(text, parse_constant=refuse)


def test_contract_keys():
    f = Finding("fail", "x.", reported=0.0253, recomputed=0.0127, reproduced_by={"sided": "two"},
                details={"sigma_low": 2.2}).from_check("significance")
    data = strict(render_json(Report("t", "c.yaml", (f,))))
    # DESIGN.md, "Output contract", and (issue 16) how many findings of each status.
    assert set(data) == {"title", "file", "verdict", "counts", "findings"}
    assert data["counts"] == {"pass": 0, "warn": 0, "fail": 1, "skip": 0, "info": 0}
    assert data["findings"] == [{"check": "significance", "status": "fail", "message": "x.", "reported": 0.0253,
                                 "recomputed": 0.0127, "reproduced_by": {"sided": "two"},
                                 "details": {"sigma_low": 2.2}, "field": None, "statement": None,
                                 "printed": None, "recomputed_range": None, "tolerance": None,
                                 "log10_reported": None, "log10_recomputed": None,
                                 "title": "Significance",
                                 "question": ("Was this number obtained under the two-sided convention "
                                              "(both tails)? Please say how it was computed.")}]
    assert data["verdict"] == "inconsistent"


def test_self_describing_keys():
    # The keys a finding carries about itself (README, "JSON output").
    from checker.report import Shown, Span

    f = Finding("fail", "x.", field="significance.p_value", statement="p_vs_inputs",
                printed=Shown("1e-400", 5e-401, 1.5e-400, -400.30103, -399.82391),
                recomputed_range=Span(-402.1, -401.7, "log10"), tolerance=0.02).from_check("significance")
    d = strict(render_json(Report("t", "c.yaml", (f,))))["findings"][0]
    assert d["field"] == "significance.p_value" and d["statement"] == "p_vs_inputs"
    assert d["printed"] == {"text": "1e-400", "low": 0.0, "high": 0.0, "log10_low": -400.30103,
                            "log10_high": -399.82391, "log10_value": None,
                            "one_sigma": None, "error_level": None}  # set only for an error at error_level
    # log10 p beside the p (issue 16): the printed value's own log when the finding has one.
    assert d["log10_recomputed"] == {"low": -402.1, "high": -401.7}
    assert d["recomputed_range"] == {"low": -402.1, "high": -401.7, "scale": "log10"}
    assert d["tolerance"] == 0.02
    # The check's own title and question (checker/checks/significance.py, SPEC).
    assert d["title"] == "Significance"
    assert d["question"].startswith("How was the p-value computed from the estimate")


def test_non_finite_numbers_become_null():
    f = Finding("pass", "x.", reported=math.inf, recomputed=math.nan,
                details={"high": math.inf, "low": -math.inf, "nested": {"x": [1.0, math.nan]},
                         "numpy": np.float64("nan"), "int": np.int64(3), "set": frozenset({1})})
    text = render_json(Report("t", "c.yaml", (f,)))
    d = strict(text)["findings"][0]
    assert d["reported"] is None and d["recomputed"] is None
    assert d["details"] == {"high": None, "low": None, "nested": {"x": [1.0, None]}, "numpy": None, "int": 3,
                            "set": [1]}
    assert "NaN" not in text and "Infinity" not in text


def test_empty_reproduced_by_is_null():
    assert finding_to_dict(Finding("pass", "x.", reproduced_by={}))["reproduced_by"] is None
    assert finding_to_dict(Finding("pass", "x."))["reproduced_by"] is None


def test_clean_and_dumps():
    assert clean({1: (1, 2)}) == {"1": [1, 2]}
    assert clean(object.__class__) == str(object.__class__)
    assert dumps({"a": math.nan}) == '{\n  "a": null\n}\n'
    assert dumps({"t": "Fidélité"}).count("Fidélité") == 1  # unicode kept as text


def test_report_to_dict_round_trips_through_json():
    r = Report("t", "c.yaml", (Finding("skip", "needs threshold.").from_check("significance"),))
    assert strict(render_json(r)) == report_to_dict(r)
    assert render_json(r).endswith("}\n")
