"""Parquet (needs the optional pyarrow), batch by batch.

Text circuit ids are dictionary-encoded per batch (distinct ids and one code
per row); integer ids are used as they are.  Nested columns (lists, structs,
maps) are refused: an id is one value.
"""

from __future__ import annotations

from typing import Iterator

import numpy as np

from ...errors import DataError
from ...input_files import open_regular
from .table import (ALLOWED_CIRCUIT, ALLOWED_HEAVY, ALLOWED_PROBABILITY, COLUMNS, Chunk, CircuitColumn, DataTable,
                    columns_or_fail, first_line)

ALLOWED_FILE = "give the path of a CSV, NPY, NPZ or Parquet data file"


def _pyarrow(name: str):
    try:
        import pyarrow  # noqa: F401
        import pyarrow.parquet as pq
    except ImportError:
        raise DataError(name, "reading Parquet needs the optional package pyarrow, which is not installed",
                        "pip install 'claimcheck[parquet]', or give CSV, NPY or NPZ") from None
    return pq


def _circuit_type_ok(pa, kind) -> bool:
    if pa.types.is_dictionary(kind):
        kind = kind.value_type
    return (pa.types.is_integer(kind) or pa.types.is_string(kind) or pa.types.is_large_string(kind)
            or (hasattr(pa.types, "is_string_view") and pa.types.is_string_view(kind)))


def _number_type_ok(pa, kind) -> bool:
    return pa.types.is_floating(kind) or pa.types.is_integer(kind) or pa.types.is_boolean(kind)


def open_parquet(name: str, chunk_rows: int) -> DataTable:
    pq = _pyarrow(name)
    import pyarrow as pa

    with open_regular(name, ALLOWED_FILE) as handle:
        try:
            parquet = pq.ParquetFile(handle)
            schema = parquet.schema_arrow
            rows = int(parquet.metadata.num_rows)
        except (pa.ArrowException, OSError, ValueError) as exc:
            raise DataError(name, f"is not a readable Parquet file ({first_line(exc)})",
                            "give a complete Parquet file") from None
    known, ignored = columns_or_fail(name, schema.names)
    for key in known:
        kind = schema.field(key).type
        ok = _circuit_type_ok(pa, kind) if key == "circuit" else _number_type_ok(pa, kind)
        if not ok:
            allowed = {"circuit": ALLOWED_CIRCUIT, "probability": ALLOWED_PROBABILITY, "heavy": ALLOWED_HEAVY}[key]
            raise DataError(name, f"the {key} column holds {kind} values", allowed, path=key)
    return DataTable(name, "parquet", known, rows, ignored, chunk_rows, parquet_chunks)


def parquet_chunks(table: DataTable) -> Iterator[Chunk]:
    pq = _pyarrow(table.path)
    import pyarrow as pa

    columns = [c for c in COLUMNS if c == "probability" or getattr(table, f"has_{c}")]
    start = 0
    try:
        with open_regular(table.path, ALLOWED_FILE) as handle:
            parquet = pq.ParquetFile(handle)
            for batch in parquet.iter_batches(batch_size=table.chunk_rows, columns=columns):
                arrays = {}
                for key in columns:
                    col = batch.column(batch.schema.get_field_index(key))
                    if col.null_count:
                        mask = np.asarray(col.is_null().to_numpy(zero_copy_only=False))
                        i = int(np.flatnonzero(mask)[0])
                        table.fail_row(start + i, key, f"{key} is missing (null)",
                                       ALLOWED_PROBABILITY if key == "probability" else
                                       (ALLOWED_HEAVY if key == "heavy" else "every row names its circuit"))
                    if key == "circuit":
                        arrays[key] = _circuit_column(pa, col)
                    else:
                        arrays[key] = col.to_numpy(zero_copy_only=False)
                p = np.asarray(arrays["probability"], dtype=float)
                yield table.make_chunk(start, p, arrays.get("circuit"), arrays.get("heavy"))
                start += len(p)
    except (pa.ArrowException, OSError) as exc:
        raise DataError(table.path, f"is truncated or damaged ({first_line(exc)})", "give the complete file") from None


def _circuit_column(pa, col):
    kind = col.type.value_type if pa.types.is_dictionary(col.type) else col.type
    if pa.types.is_integer(kind) and not pa.types.is_dictionary(col.type):
        return col.to_numpy(zero_copy_only=False)
    encoded = col if pa.types.is_dictionary(col.type) else col.dictionary_encode()
    ids = encoded.dictionary.to_numpy(zero_copy_only=False)
    return CircuitColumn(np.asarray(ids, dtype=object), encoded.indices.to_numpy(zero_copy_only=False))
