"""CSV read several chunks at a time (raw/readers/csv_files.py, CSV_READ_CHUNKS)
gives what reading chunk by chunk gives: the same numbers (the estimators get
the same chunks), and on a damaged file the same first problem, whichever row
and chunk it is in (a read that is not clean is read again chunk by chunk)."""

import pytest

from checker.errors import DataError
from checker.raw.analysis import analyse
from checker.raw.readers import csv_files
from checker.render.json import dumps
from checker.render.raw_json import raw_result_to_dict

CHUNK = 5  # rows per chunk; reads of 4 chunks = 20 rows


def _lines(rows=97, heavy=True):
    out = ["circuit,probability" + (",heavy" if heavy else "")]
    for i in range(rows):
        p = ((i * 7919) % 1000 + 0.5) / 1024 / 1000
        out.append(f"c{i % 6},{p:.6e}" + (f",{i % 2}" if heavy else ""))
    return out


def _both(tmp_path, monkeypatch, lines, **kwargs):
    path = tmp_path / "data.csv"
    path.write_bytes(lines if isinstance(lines, bytes) else ("\n".join(lines) + "\n").encode("utf-8"))
    found = []
    for reads in (1, 4):
        monkeypatch.setattr(csv_files, "CSV_READ_CHUNKS", reads)
        try:
            result = analyse(str(path), "linear-xeb", 10, chunk_rows=CHUNK, bootstrap=50, fit_sample=30, **kwargs)
            found.append(dumps(raw_result_to_dict(result)))
        except DataError as exc:
            found.append(f"error: {exc}")
    assert found[0] == found[1]
    return found[1]


@pytest.mark.parametrize("rows", [1, 4, 5, 19, 20, 21, 97])
def test_valid_files_give_the_same_result(tmp_path, monkeypatch, rows):
    assert not _both(tmp_path, monkeypatch, _lines(rows)).startswith("error")


@pytest.mark.parametrize("row", [0, 3, 6, 19, 20, 44, 96])
@pytest.mark.parametrize("bad", ["c1,abc,1", "c1,1.5,0", "c1,-0.2,1", ",0.001,1", "c1,0.001,2", "c1,0.001,x",
                                 "c1,0.001,1,9", "c1,NaN,1", "c1,,1", "c1,12345678901234567891,1", "", "c1,-0.0,1"])
def test_one_bad_line_gives_the_same_first_problem(tmp_path, monkeypatch, row, bad):
    lines = _lines()
    lines[row + 1] = bad
    _both(tmp_path, monkeypatch, lines)


def test_two_problems_in_one_read_the_earlier_is_told(tmp_path, monkeypatch):
    lines = _lines()
    lines[22] = "c1,0.001,7"  # heavy 7: second chunk of the second read
    lines[38] = "c1,0.001,1,1"  # a malformed line later in the same read
    assert "heavy" in _both(tmp_path, monkeypatch, lines)
    lines = _lines()
    lines[23] = "x" * 1001 + ",0.001,1"  # an id too long, then a bad byte in the same read
    data = ("\n".join(lines) + "\n").encode("utf-8")
    cut = data.index(b"c3,", len(data) // 2)
    _both(tmp_path, monkeypatch, data[:cut] + b"\xff" + data[cut:])


def test_without_heavy_or_circuit(tmp_path, monkeypatch):
    _both(tmp_path, monkeypatch, _lines(60, heavy=False))
    _both(tmp_path, monkeypatch, ["probability"] + [f"{(i + 1) / 4096:.5e}" for i in range(47)])
