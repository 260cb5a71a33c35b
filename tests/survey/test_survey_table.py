"""checker/survey/table.py: reading CSV, TSV, Parquet, folders, DataFrames and mappings."""

import math

import numpy as np
import pandas as pd
import pytest

from checker.errors import InputFileError
from checker.survey.table import (Folder, SurveyTable, cell_text, parse_delimited, read_source,
                                  table_from_mappings)


def test_comments_header_rows_and_their_lines():
    text = ("# invented\n"
            "\n"
            "title,estimate\n"
            "a,1.0\n"
            "\n"
            '"two\nlines",2.50\n'
            "c,3\n")
    table = parse_delimited(text, "t.csv")
    assert table.header == ("title", "estimate")
    assert [r.number for r in table.rows] == [1, 2, 3]
    # Lines: 1 comment, 2 blank, 3 header, 4 row 1, 5 blank, 6-7 row 2 (a quoted line break), 8 row 3.
    assert [r.line for r in table.rows] == [4, 6, 8]
    assert table.rows[1].cells == ("two\nlines", "2.50")  # the printed text, trailing zero kept


def test_byte_order_mark_and_tsv(tmp_path):
    path = tmp_path / "t.tsv"
    path.write_bytes("\ufefftitle\testimate\nA\t0.10\n".encode("utf-8"))
    table = read_source(path)
    assert table.header == ("title", "estimate") and table.rows[0].cells == ("A", "0.10")


@pytest.mark.parametrize("content, message", [
    (b"title;estimate\nA;1\n", "holds ';'"),
    (b"title,estimate\n", "no claims"),
    (b"# only a comment\n", "no header"),
    (b"title\n\xff\xfe\n", "not UTF-8"),
    (b"title\x00\n", "binary"),
    (b'title,estimate\n"A,1\n', "not a well-formed table"),
])
def test_tables_that_cannot_be_read(tmp_path, content, message):
    path = tmp_path / "t.csv"
    path.write_bytes(content)
    with pytest.raises(InputFileError) as err:
        read_source(path)
    assert message in err.value.one_line()


def test_missing_path_and_unknown_extension(tmp_path):
    with pytest.raises(InputFileError, match="no such file"):
        read_source(tmp_path / "nothing.csv")
    (tmp_path / "t.xlsx").write_bytes(b"x")
    with pytest.raises(InputFileError, match=r"\.csv, \.tsv, \.parquet"):
        read_source(tmp_path / "t.xlsx")


def test_folder_lists_claim_files_only(tmp_path):
    (tmp_path / "b.yaml").write_text("x")
    (tmp_path / "a.json").write_text("x")
    (tmp_path / "notes.txt").write_text("x")
    folder = read_source(tmp_path)
    assert isinstance(folder, Folder)
    assert [p.rsplit("/", 1)[-1] for p in folder.files] == ["a.json", "b.yaml"]
    empty = tmp_path / "empty"
    empty.mkdir()
    with pytest.raises(InputFileError, match="holds no claim files"):
        read_source(empty)


def test_parquet_keeps_text_columns_and_writes_numbers_shortest(tmp_path):
    pytest.importorskip("pyarrow")
    frame = pd.DataFrame({"title": ["A", "B"], "estimate": ["4.20", "1e-3"], "samples": [100, 2000],
                          "threshold": [0.5, np.nan]})
    path = tmp_path / "t.parquet"
    frame.to_parquet(path)
    table = read_source(path)
    assert isinstance(table, SurveyTable)
    assert table.rows[0].cells == ("A", "4.20", "100", "0.5")
    assert table.rows[1].cells == ("B", "1e-3", "2000", "")


@pytest.mark.parametrize("value, text", [
    (None, ""), (math.nan, ""), (pd.NA, ""), (True, "true"), (np.bool_(False), "false"),
    (np.int64(5), "5"), (0.1, "0.1"), (np.float32(0.1), "0.1"), (np.float64(2.5e-3), "0.0025"),
    ("2.24e-3", "2.24e-3"),
])
def test_cell_text(value, text):
    assert cell_text(value) == text


def test_mappings_nested_dotted_and_lists():
    table = table_from_mappings([
        {"title": "A", "significance": {"sigma": "4.2"}, "parts": [{"estimate": 0.1}]},
        {"title": "B", "significance.sigma": 3.0},
    ], "<mappings>")
    assert table.header == ("title", "significance.sigma", "parts.0.estimate")
    assert table.rows[0].cells == ("A", "4.2", "0.1")
    assert table.rows[1].cells == ("B", "3.0", "")


def test_a_dataframe_is_a_table():
    table = read_source(pd.DataFrame({"title": ["A"], "estimate": [0.25]}))
    assert table.name == "<DataFrame>" and table.rows[0].cells == ("A", "0.25")


def test_other_objects_are_refused():
    with pytest.raises(InputFileError, match="not a table"):
        read_source(42)
    with pytest.raises(InputFileError, match="not a mapping"):
        read_source(["title"])
