"""A catalog file as read, before any meaning is given to it: headers, cells, lines.

Both readers (CSV, YAML) produce a ``RawTable``; header mapping and validation work on
it without knowing the file format.
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass
from typing import Final, TypeAlias

import numpy as np
import pandas as pd
import pyarrow as pa
import pyarrow.compute as pc

from catalog.problems import Problem

__all__ = [
    "DEFAULT_LIMITS",
    "Column",
    "Limits",
    "RawTable",
    "cells_equal",
    "columns_from_rows",
    "factorize_cells",
]


@dataclass(frozen=True)
class Limits:
    """Size limits that keep a hostile or mistaken input from hanging the program.

    Attributes
    ----------
    max_file_bytes : int
        Largest catalog file read [bytes]. 512 MiB holds ``max_rows`` parts of a wide
        export (the demo writes about 135 bytes a part, so a million parts are 135 MB);
        what it bounds is the reader's memory (the file, then its decoded text).
    max_field_chars : int
        Largest single cell [characters]; a longer cell is reported and blanked.
    max_rows : int
        Most rows read from one file.
    max_yaml_aliases : int
        Most YAML aliases (``*name``) in one file; expansion bombs use thousands.
    max_yaml_depth : int
        Deepest YAML nesting; a part list needs three levels.
    max_yaml_nodes : int
        Most YAML nodes after alias expansion.
    """

    max_file_bytes: int = 512 * 1024 * 1024
    max_field_chars: int = 65536
    max_rows: int = 2_000_000
    max_yaml_aliases: int = 1000
    max_yaml_depth: int = 32
    max_yaml_nodes: int = 5_000_000


DEFAULT_LIMITS: Final[Limits] = Limits()


#: One column of cell texts: a list, a numpy object array or a pyarrow string array.
Column: TypeAlias = Sequence[str] | np.ndarray | pa.ChunkedArray | pa.Array


@dataclass(frozen=True)
class RawTable:
    """One file's table as text, column by column.

    ``columns[j]`` holds the cell texts of header ``j`` for every row ("" when absent);
    ``lines[i]`` is the 1-based line where row ``i`` starts; ``bad_rows`` holds row
    indices the reader already found unusable (reported in ``problems``), which
    validation drops. ``header_line`` is the line of the headers (None for YAML).
    """

    path: str
    headers: tuple[str, ...]
    columns: tuple[Column, ...]
    lines: tuple[int, ...] | np.ndarray
    problems: tuple[Problem, ...]
    header_line: int | None
    bad_rows: frozenset[int] = frozenset()

    @property
    def row_count(self) -> int:
        """Number of data rows (bad ones included)."""
        return len(self.lines)


def columns_from_rows(rows: Sequence[Sequence[str]], width: int) -> tuple[list[str], ...]:
    """Transpose rows (already padded to ``width``) into columns."""
    if not rows:
        return tuple([] for _ in range(width))
    return tuple(list(column) for column in zip(*rows, strict=True))


def factorize_cells(column: Column) -> tuple[np.ndarray, list[str]]:
    """Codes per row and the distinct texts, so each distinct text is parsed once."""
    if isinstance(column, pa.ChunkedArray | pa.Array):
        array = column.combine_chunks() if isinstance(column, pa.ChunkedArray) else column
        encoded = pc.dictionary_encode(pc.fill_null(array.cast(pa.string()), ""))
        codes = encoded.indices.to_numpy(zero_copy_only=False).astype(np.int64)
        uniques = ["" if text is None else str(text) for text in encoded.dictionary.to_pylist()]
        return codes, uniques
    codes, found = pd.factorize(np.asarray(column, dtype=object), use_na_sentinel=False)
    return np.asarray(codes, dtype=np.int64), [str(text) for text in found.tolist()]


def cells_equal(column: Column, text: str) -> np.ndarray:
    """Per row, whether the cell (stripped) equals ``text``."""
    codes, uniques = factorize_cells(column)
    hits = np.array([cell.strip() == text for cell in uniques], dtype=bool)
    return hits[codes] if len(uniques) else np.zeros(len(codes), dtype=bool)
