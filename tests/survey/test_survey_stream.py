"""The streamed batch (survey.run.stream_batch, survey.table.stream_source): the same table, summary
and problems as the in-memory run_batch, byte for byte, whatever the chunk size (issue 13)."""

import io
from pathlib import Path

import numpy as np
import pytest

import checker.survey.run as engine
import checker.survey.table as tables
from checker.cli import run
from checker.errors import InputFileError
from checker.render.survey_text import render_batch_csv, render_batch_text, render_problems
from checker.survey import run_batch
from checker.survey.run import stream_batch
from checker.survey.table import StreamedTable, read_source, stream_source

EXAMPLE = Path(__file__).resolve().parents[2] / "claims_examples" / "survey_table.csv"


def _mixed_table(path: Path, n: int = 45) -> Path:
    """Invented claims: the example's rows repeated with varied estimates, some unusable, some
    stating trials (Sidak) so that both significances enter the adjustment."""
    lines = EXAMPLE.read_text(encoding="utf-8").splitlines()
    header_at = next(i for i, line in enumerate(lines) if not line.startswith("#"))
    body = lines[header_at + 1:]
    out = lines[:header_at + 1]
    for i in range(n):
        out.append(body[i % len(body)])
        if i % 7 == 3:
            out.append("")  # a blank line is not a claim
    path.write_text("\n".join(out) + "\n", encoding="utf-8")
    return path


def _streamed_csv(result) -> str:
    return "".join(render_batch_csv(frame, header=i == 0) for i, frame in enumerate(result.frames()))


@pytest.mark.parametrize("chunk", [1, 4, 1000])
@pytest.mark.parametrize("jobs", [1, 2])
def test_streamed_table_is_the_in_memory_table(tmp_path, monkeypatch, chunk, jobs):
    path = _mixed_table(tmp_path / "mixed.csv")
    whole = run_batch(path, jobs=1)
    monkeypatch.setattr(engine, "CHUNK", chunk)
    result = stream_batch(path, jobs=jobs)
    try:
        assert _streamed_csv(result) == render_batch_csv(whole.frame)
        assert result.summary == whole.summary
        assert result.summary["look_elsewhere_corrected"] > 0 and result.summary["unusable"] > 0
        assert render_problems(result.problems, total=result.problem_count) == render_problems(whole.problems)
        assert render_batch_text(result.flagged, result.summary) == render_batch_text(whole.frame, whole.summary)
        assert result.exit_status == whole.exit_status
    finally:
        result.close()


def test_more_flagged_and_unusable_rows_than_shown(tmp_path, monkeypatch):
    # 45 rows of which 12 inconsistent and 4 unusable; only the first 3 of each kept.
    path = _mixed_table(tmp_path / "mixed.csv")
    whole = run_batch(path, jobs=1)
    monkeypatch.setattr(engine, "SHOW_FIRST", 3)
    result = stream_batch(path, jobs=1, keep_rows=False)
    assert len(result.flagged) == 3 and result.summary["verdicts"]["inconsistent"] > 3
    assert result.problem_count == whole.summary["unusable"] > 3
    assert render_problems(result.problems, limit=3, total=result.problem_count) == \
        render_problems(whole.problems, limit=3)
    with pytest.raises(ValueError, match="kept no rows"):
        next(result.frames())


def test_folder_streams_too(tmp_path):
    examples = EXAMPLE.parent
    for name in ("accuracy_not_whole_count.yaml", "classifier_accuracy_interval.yaml"):
        (tmp_path / name).write_text((examples / name).read_text(encoding="utf-8"), encoding="utf-8")
    (tmp_path / "broken.yaml").write_text("title: [unclosed\n", encoding="utf-8")
    whole = run_batch(tmp_path, jobs=1)
    result = stream_batch(tmp_path, jobs=1)
    try:
        assert _streamed_csv(result) == render_batch_csv(whole.frame)
        assert result.summary == whole.summary
    finally:
        result.close()


def test_cli_csv_and_terminal_text_unchanged(tmp_path):
    path = _mixed_table(tmp_path / "mixed.csv")
    whole = run_batch(path, jobs=1)
    out, err = io.StringIO(), io.StringIO()
    status = run(["batch", str(path), "--out", str(tmp_path / "out.csv"), "--jobs", "1"], stdout=out, stderr=err)
    assert (tmp_path / "out.csv").read_text(encoding="utf-8") == render_batch_csv(whole.frame)
    assert out.getvalue().startswith(render_batch_text(whole.frame, whole.summary))
    assert status == whole.exit_status
    assert not list(tmp_path.glob(".out.csv.*"))  # the temporary file was renamed


def test_rows_are_read_as_read_source_reads_them(tmp_path):
    path = tmp_path / "t.csv"
    path.write_bytes("\ufeff# invented\n\ntitle,estimate\na,1.0\n\n\"two\r\nlines\",2.50\r\nc,3\n".encode("utf-8"))
    streamed = stream_source(path)
    assert isinstance(streamed, StreamedTable)
    table = read_source(path)
    assert streamed.header == table.header and streamed.count == len(table.rows) == 3
    assert tuple(streamed.rows()) == table.rows
    assert tuple(streamed.rows()) == table.rows  # a fresh pass each time


@pytest.mark.parametrize("content", [
    b"title;estimate\nA;1\n",
    b"title,estimate\n",
    b"# only a comment\n",
    b"",
    b"title\n\xff\xfe\n",
    b"\xef\xbb\xbftitle\nab\xe2\x82\n",  # a cut multi-byte character after a byte-order mark
    b"title\nabc\xe2\x82\xacd\xc3\n",
    b"title\n" + "\u20ac".encode("utf-8") * 40 + b"\x80",
    b"title\x00\n\xff",  # NUL is said before UTF-8, as read_source does
    b'title,estimate\n"A,1\n',
    b'title,estimate\nA,1\nB,"x"y\n',
])
@pytest.mark.parametrize("piece", [1, 2, 5, 1 << 20])
def test_refusals_are_read_source_refusals(tmp_path, monkeypatch, content, piece):
    monkeypatch.setattr(tables, "READ_PIECE", piece)  # a multi-byte character cut between pieces
    path = tmp_path / "t.csv"
    path.write_bytes(content)
    with pytest.raises(InputFileError) as expected:
        read_source(path)
    with pytest.raises(InputFileError) as got:
        stream_source(path)
    assert got.value.one_line() == expected.value.one_line()


def test_size_and_claim_limits(tmp_path, monkeypatch):
    path = tmp_path / "t.csv"
    path.write_text("title\n" + "".join(f"c{i}\n" for i in range(50)), encoding="utf-8")
    for name, value in (("MAX_CLAIMS", 20), ("MAX_TABLE_BYTES", 100)):
        with monkeypatch.context() as m:
            m.setattr(tables, name, value)
            with pytest.raises(InputFileError) as expected:
                read_source(path)
            with pytest.raises(InputFileError) as got:
                stream_source(path)
            assert got.value.one_line() == expected.value.one_line()


def test_other_sources_are_read_whole(tmp_path):
    # A DataFrame, mappings and Parquet go through read_source (held in memory), then stream as records.
    table = stream_source([{"title": "a", "metric": "linear-xeb"}])
    assert not isinstance(table, StreamedTable) and len(table.rows) == 1


def test_the_family_is_compact(tmp_path):
    # What the parent keeps per claim for the adjustment: a handful of numbers, not the record.
    path = _mixed_table(tmp_path / "mixed.csv")
    result = stream_batch(path, jobs=1, keep_rows=False)
    per_claim = sum(getattr(result.wide, k).nbytes for k in ("sigma_holm", "sigma_bh"))
    per_claim += sum(getattr(result.wide.adjusted, k).nbytes for k in ("p_holm", "p_bh", "log_p_holm", "log_p_bh"))
    assert per_claim / result.summary["rows"] == 6 * 8
    assert isinstance(result.wide.sigma_holm, np.ndarray)
