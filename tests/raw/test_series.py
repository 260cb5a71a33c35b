"""checker.raw.series: reading a drift series, time zones and sizes included."""

from __future__ import annotations

import pytest

from checker.errors import DataError, InputFileError
from checker.raw import series as series_module
from checker.raw.series import read_series, window_value


def write(tmp_path, text, name="s.csv"):
    path = tmp_path / name
    path.write_text(text)
    return str(path)


def test_numbers_and_date_times(tmp_path):
    s = read_series(write(tmp_path, "time,estimate,error\n1,0.5,0.01\n2,0.6,0.01\n4,0.55,0.02\n"))
    assert list(s.times) == [1, 2, 4] and s.kind == "number" and list(s.errors) == [0.01, 0.01, 0.02]
    d = read_series(write(tmp_path, "time,estimate\n2026-03-01T10:00,0.5\n2026-03-01T13:00,0.6\n"))
    assert list(d.times) == [0, 3] and d.kind == "datetime"
    assert window_value("s", "2026-03-01T11:30", d) == 1.5


def test_offsets_are_instants_and_mixing_them_with_none_is_refused(tmp_path):
    # 10:00+01:00 is 09:00 UTC; 11:00+02:00 is 09:00 UTC too; 10:00Z is one hour later.
    s = read_series(write(tmp_path, "time,estimate\n2026-03-01T10:00+01:00,0.5\n"
                                    "2026-03-01T11:00+02:00,0.6\n2026-03-01T10:00Z,0.5\n"))
    assert list(s.times) == [0, 0, 1]
    with pytest.raises(DataError, match=r"time \(line 3\): time '2026-03-01T11:00' has no time zone"):
        read_series(write(tmp_path, "time,estimate\n2026-03-01T10:00Z,0.5\n2026-03-01T11:00,0.6\n"))
    with pytest.raises(DataError, match="has no time zone, but the series' times have one"):
        window_value("s", "2026-03-01T10:00", s)


@pytest.mark.parametrize("cell, words", [("9" * 400, "is not usable"), ("1e200", "too large"),
                                         ("nan", "is not usable"), ("", "is not usable")])
def test_unusable_times(tmp_path, cell, words):
    with pytest.raises(DataError, match=words) as err:
        read_series(write(tmp_path, f"time,estimate\n1,0.5\n{cell},0.6\n"))
    assert "(line 3)" in str(err.value) and len(str(err.value)) < 300


def test_size_limit(tmp_path, monkeypatch):
    monkeypatch.setattr(series_module, "MAX_BYTES", 20)
    with pytest.raises(InputFileError, match="larger than 20 bytes"):
        read_series(write(tmp_path, "time,estimate\n" + "1,0.5\n" * 10))
