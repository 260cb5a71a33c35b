"""``claimcheck raw --json`` written in pieces (render/raw_json.raw_result_json_pieces)
is the plain ``dumps(raw_result_to_dict(result))`` text once joined, whatever
the number of circuits (around the piece size), the ids (quotes, newlines,
control and bidirectional characters, non-ASCII) or the findings of a claim;
and the command writes the same bytes as the plain text to a UTF-8 stream and
to an ASCII one."""

import io
import json

import numpy as np
import pytest

from checker.cli import run
from checker.raw.analysis import analyse
from checker.render import raw_json
from checker.render.json import dumps
from checker.render.raw_json import raw_result_json_pieces, raw_result_to_dict


def _csv(path, circuits, samples=3, ids=None, seed=0):
    rng = np.random.default_rng(seed)
    ids = ids or [f"c{i}" for i in range(circuits)]
    lines = ["circuit,probability,heavy"]
    for i in range(circuits):
        for _ in range(samples):
            label = ids[i % len(ids)]
            quoted = '"' + label.replace('"', '""') + '"'
            lines.append(f"{quoted},{rng.exponential() / 1024:.6e},{int(rng.random() < 0.6)}")
    path.write_text("\n".join(lines) + "\n", encoding="utf-8")
    return str(path)


@pytest.mark.parametrize("circuits", [1, 2, 7, 10, 11, 25])
@pytest.mark.parametrize("estimate_only", [True, False])
def test_pieces_join_to_the_plain_text(tmp_path, monkeypatch, circuits, estimate_only):
    monkeypatch.setattr(raw_json, "CIRCUITS_PER_PIECE", 10)  # pieces of 10 circuits: 1, 2 and 3 pieces
    path = _csv(tmp_path / "data.csv", circuits)
    result = analyse(path, "linear-xeb", 10, estimate_only=estimate_only, bootstrap=0 if estimate_only else 200,
                     fit_sample=50)
    pieces = list(raw_result_json_pieces(result))
    assert "".join(pieces) == dumps(raw_result_to_dict(result))
    assert len(pieces) == 2 + -(-circuits // 10)


def test_awkward_ids_and_no_circuit_column(tmp_path, monkeypatch):
    monkeypatch.setattr(raw_json, "CIRCUITS_PER_PIECE", 2)
    ids = ['a "quoted" id', "two\nlines", "tab\there", "bidi\u202eevil", "\u00b1 \u03b3 \u4e2d", "bell\x07", "x" * 50]
    path = _csv(tmp_path / "ids.csv", len(ids), ids=ids)
    result = analyse(path, "heavy-output", 10, bootstrap=100, fit_sample=20)
    assert "".join(raw_result_json_pieces(result)) == dumps(raw_result_to_dict(result))
    npy = tmp_path / "p.npy"
    np.save(npy, np.random.default_rng(1).exponential(size=100) / 1024)
    result = analyse(str(npy), "log-xeb", 10, bootstrap=100, fit_sample=20)
    assert "".join(raw_result_json_pieces(result)) == dumps(raw_result_to_dict(result))


class _Narrow(io.StringIO):
    encoding = "ascii"


@pytest.mark.parametrize("stream", [io.StringIO, _Narrow])
def test_the_command_writes_the_plain_bytes(tmp_path, monkeypatch, stream):
    ids = ["\u00b1 plus-minus", "plain", "\u03b3 gamma", "more"]
    path = _csv(tmp_path / "data.csv", 4, ids=ids)
    claim = tmp_path / "claim.yaml"
    claim.write_text("title: Invented raw claim\nmetric: linear-xeb\nqubits: 10\nestimate: 0.01\n", encoding="utf-8")
    argv = ["raw", path, "--claim", str(claim), "--bootstrap", "100", "--fit-sample", "20", "--json"]
    plain_out, err = stream(), io.StringIO()
    monkeypatch.setattr(raw_json, "CIRCUITS_PER_PIECE", 10 ** 9)  # one piece: the plain text
    status = run(argv, plain_out, err)
    monkeypatch.setattr(raw_json, "CIRCUITS_PER_PIECE", 1)
    pieces_out = stream()
    assert run(argv, pieces_out, io.StringIO()) == status
    assert pieces_out.getvalue() == plain_out.getvalue()
    assert '"findings"' in plain_out.getvalue()


@pytest.mark.parametrize("value", [
    {}, [], 1.5, None, "text", True, 7,
    {"a": 1, "b": [1, 2.5, None], "c": {}, "d": [], "e": {"f": {"g": "\u00b1\n\"q\""}}, "h": [[], [{}], [1, [2]]]},
    [{"x": -0.0, "y": 1e-300, "z": False}, "\u4e2d", [None]],
    {"only": {"scalars": 1, "here": "a\tb"}},
])
@pytest.mark.parametrize("level", [0, 1, 3])
def test_indented_json_is_json_dumps(value, level):
    plain = json.dumps(value, indent=2, ensure_ascii=False, allow_nan=False)
    if level:
        plain = plain.replace("\n", "\n" + "  " * level)  # as it stands `level` levels deep
    assert raw_json.indented_json(value, level) == plain
