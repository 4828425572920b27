"""CSV catalog files -> RawTable (text cells with their physical line numbers).

The delimiter (comma, semicolon or tab) is chosen by counting each candidate outside
quoted text over the first lines: the right one gives the same non-zero count on the
header and on most data lines. Excel's ``sep=;`` first line is honoured. Quoted cells
may span lines; each row keeps the physical line it starts on. Rows are split one at a
time, so an unbalanced quote or an oversized cell spoils only its own row.
"""

from __future__ import annotations

import csv
import io
import re
from dataclasses import dataclass
from pathlib import Path
from typing import Final

import numpy as np
import pyarrow as pa
import pyarrow.compute as pc
import pyarrow.csv as pacsv

from catalog.problems import CatalogError, Problem
from catalog.rawtable import DEFAULT_LIMITS, Column, Limits, RawTable, columns_from_rows
from catalog.textfile import decode_catalog_bytes, read_catalog_bytes

__all__ = ["read_csv_table", "sniff_delimiter", "split_csv_text"]

DELIMITERS: Final[tuple[str, ...]] = (",", ";", "\t")
_QUOTED: Final[re.Pattern[str]] = re.compile(r'"[^"]*"')
_SNIFF_LINES: Final[int] = 50
#: A quoted cell longer than this many physical lines is taken for an unbalanced quote.
_MAX_RECORD_LINES: Final[int] = 50
_MAX_COLUMNS: Final[int] = 500
_SEP_HINT: Final[re.Pattern[str]] = re.compile(r'^\s*"?sep=(.)"?\s*$', re.IGNORECASE)


def sniff_delimiter(lines: list[str]) -> str:
    """Pick the delimiter of a table from its first lines.

    For each candidate, count occurrences outside double-quoted text on every non-blank
    line. Score = share of lines whose count equals the header line's count (and is not
    zero); ties go to the candidate with more columns. A single-column file gives ",".
    """
    sample = [_QUOTED.sub("", line) for line in lines[:_SNIFF_LINES] if line.strip()]
    if not sample:
        return ","
    best, best_score = ",", (-1.0, -1)
    for delimiter in DELIMITERS:
        counts = [line.count(delimiter) for line in sample]
        header = counts[0]
        if header == 0:
            continue
        agree = sum(1 for count in counts if count == header) / len(counts)
        score = (agree, header)
        if score > best_score:
            best, best_score = delimiter, score
    return best


def _physical_lines(text: str) -> list[str]:
    if "\n" not in text and "\r" in text:
        return text.split("\r")  # classic Mac line ends
    lines = text.split("\n")
    return [line[:-1] if line.endswith("\r") else line for line in lines]


def split_csv_text(
    text: str, *, path: str, limits: Limits = DEFAULT_LIMITS
) -> tuple[list[list[str]], list[int], list[Problem], set[int], str]:
    """Split decoded CSV text into records.

    Returns ``(records, start_lines, problems, bad_record_indices, delimiter)``; a bad
    record (unbalanced quote, oversized cell, unsplittable) is kept as an empty list so
    indices stay aligned, and reported as an error on its line.
    """
    lines = _physical_lines(text)
    problems: list[Problem] = []
    first = 0
    delimiter: str | None = None
    while first < len(lines) and not lines[first].strip():
        first += 1
    if first < len(lines):
        hint = _SEP_HINT.match(lines[first])
        if hint is not None and hint.group(1) in (",", ";", "\t", "|"):
            delimiter = hint.group(1)
            first += 1
    if delimiter is None:
        delimiter = sniff_delimiter(lines[first:])
    fast = _split_fast(lines, first, delimiter, limits)
    if fast is not None:
        return fast[0], fast[1], problems, set(), delimiter
    records: list[list[str]] = []
    starts: list[int] = []
    bad: set[int] = set()
    index = first
    total = len(lines)
    max_field = limits.max_field_chars
    while index < total:
        line = lines[index]
        start = index
        if line.count('"') % 2:
            # A quoted cell continues onto the next line: gather until the quotes balance.
            parts = [line]
            quotes = line.count('"')
            probe = index + 1
            while quotes % 2 and probe < total and probe - start < _MAX_RECORD_LINES:
                parts.append(lines[probe])
                quotes += lines[probe].count('"')
                probe += 1
            if quotes % 2:
                problems.append(
                    Problem(
                        path,
                        start + 1,
                        None,
                        _clip(line),
                        "unbalanced quote: this line opens a quoted cell that never closes; "
                        "row not loaded",
                        "error",
                    )
                )
                records.append([])
                starts.append(start + 1)
                bad.add(len(records) - 1)
                index = start + 1
                continue
            record_text = "\n".join(parts)
            index = probe
        else:
            record_text = line
            index += 1
        if not record_text.strip():
            continue
        if len(record_text) > max_field and any(
            len(cell) > max_field for cell in _quick_cells(record_text, delimiter)
        ):
            problems.append(
                Problem(
                    path,
                    start + 1,
                    None,
                    f"{len(record_text)} characters",
                    f"a cell is longer than {max_field} characters; row not loaded",
                    "error",
                )
            )
            records.append([])
            starts.append(start + 1)
            bad.add(len(records) - 1)
            continue
        try:
            if '"' in record_text or "\r" in record_text or "\n" in record_text:
                cells = next(csv.reader([record_text], delimiter=delimiter, strict=False))
            else:
                # No quote and no line break: csv.reader would split at each delimiter
                # and nowhere else, which str.split does without building a reader.
                cells = record_text.split(delimiter)
        except (csv.Error, StopIteration) as error:
            problems.append(
                Problem(
                    path,
                    start + 1,
                    None,
                    _clip(record_text),
                    f"cannot split this row into cells ({error}); row not loaded",
                    "error",
                )
            )
            records.append([])
            starts.append(start + 1)
            bad.add(len(records) - 1)
            continue
        records.append(cells)
        starts.append(start + 1)
        if len(records) > limits.max_rows + 1:
            raise CatalogError(f"{path}: more than {limits.max_rows} rows; split the file")
    return records, starts, problems, bad, delimiter


def _split_fast(
    lines: list[str], first: int, delimiter: str, limits: Limits
) -> tuple[list[list[str]], list[int]] | None:
    """One csv.reader pass over the whole file; None when anything looks off.

    Well-formed files (the usual case) split here at C speed. An unbalanced quote, an
    oversized cell or a record spanning many lines sends the file to the careful
    line-by-line path, which isolates the damage to one row.
    """
    body = lines[first:]
    if max(map(len, body), default=0) > limits.max_field_chars:
        return None
    reader = csv.reader((line + "\n" for line in body), delimiter=delimiter, strict=True)
    records: list[list[str]] = []
    starts: list[int] = []
    previous = 0
    try:
        for cells in reader:
            now = reader.line_num
            if now - previous > _MAX_RECORD_LINES:
                return None
            if cells:
                if now - previous > 1 and sum(map(len, cells)) > limits.max_field_chars:
                    return None
                records.append(cells)
                starts.append(first + previous + 1)
            previous = now
            if len(records) > limits.max_rows + 1:
                return None
    except csv.Error:
        return None
    return records, starts


@dataclass(frozen=True)
class _FastTable:
    headers: tuple[str, ...]
    columns: tuple[Column, ...]
    lines: np.ndarray
    header_line: int


def _read_fast(text: str, path: str, limits: Limits) -> _FastTable | None:
    """Columnar read with pyarrow for well-formed files; None sends the file to the careful path.

    Taken only when no line is blank or oversized, the header is the first line and every
    row has the header's width; a row's physical line is then the header line + 1 + its
    index + the line breaks quoted inside the rows before it. Anything else (and any
    parse error) falls back to ``split_csv_text``, which reports problems row by row.
    """
    lines = _physical_lines(text)
    while lines and not lines[-1].strip():
        lines.pop()
    if len(lines) < 2 or not lines[0].strip() or _SEP_HINT.match(lines[0]):
        return None
    if max(map(len, lines)) > limits.max_field_chars or len(lines) > limits.max_rows + 1:
        return None
    if not all(lines[1:]):  # a blank line inside: let the careful path keep line numbers
        return None
    delimiter = sniff_delimiter(lines)
    try:
        header_cells = next(csv.reader([lines[0]], delimiter=delimiter, strict=True))
    except (csv.Error, StopIteration):
        return None
    blank = delimiter + " \t"
    if any(not line.strip(blank) for line in lines):  # rows of bare delimiters are skipped
        return None
    width = len(header_cells)
    if sum(1 for cell in header_cells if cell.strip()) < 2 or width > _MAX_COLUMNS:
        return None
    names = [f"c{i}" for i in range(width)]
    try:
        table = pacsv.read_csv(
            io.BytesIO("\n".join(lines[1:]).encode("utf-8")),
            read_options=pacsv.ReadOptions(column_names=names, block_size=1 << 22),
            parse_options=pacsv.ParseOptions(
                delimiter=delimiter, newlines_in_values=True, ignore_empty_lines=False
            ),
            convert_options=pacsv.ConvertOptions(
                column_types=dict.fromkeys(names, pa.string()),
                strings_can_be_null=False,
                quoted_strings_can_be_null=False,
            ),
        )
    except (pa.ArrowInvalid, pa.ArrowException, ValueError, OSError):
        return None
    columns = tuple(table.column(i) for i in range(width))
    # Quoted line breaks: row i starts after the lines of rows 0..i-1, whose extra lines
    # are the line breaks inside their cells (counted per column, vectorised).
    breaks = np.zeros(table.num_rows, dtype=np.int64)
    for column in columns:
        breaks += pc.count_substring(column, "\n").to_numpy(zero_copy_only=False)
    if table.num_rows + int(breaks.sum()) != len(lines) - 1:
        return None
    if table.num_rows and int(breaks.max()) >= _MAX_RECORD_LINES:
        return None  # a "cell" of many lines is an unbalanced quote: the careful path says so
    starts = (
        2
        + np.arange(table.num_rows, dtype=np.int64)
        + np.concatenate(([0], np.cumsum(breaks)[:-1])).astype(np.int64)
    )
    headers = tuple(cell.strip().lstrip("\ufeff") for cell in header_cells)
    return _FastTable(headers, columns, starts, 1)


def _quick_cells(record: str, delimiter: str) -> list[str]:
    """Rough split for the size test only (quotes ignored; over-splitting is harmless)."""
    return record.split(delimiter)


def _clip(text: str, size: int = 80) -> str:
    return text if len(text) <= size else text[: size - 3] + "..."


def read_csv_table(path: str | Path, *, limits: Limits = DEFAULT_LIMITS) -> RawTable:
    """Read one CSV catalog into a RawTable. Raises CatalogError when it is unusable.

    The header is the first row with at least two non-blank cells (title lines above it
    are skipped and reported). Rows with more non-blank cells than headers are refused
    (an unquoted delimiter, e.g. a decimal comma in a comma-separated file, would shift
    every later value into the wrong column); shorter rows are padded with blanks.
    """
    file_path = Path(path)
    shown = str(path)
    data = read_catalog_bytes(file_path, limits)
    if not data.strip():
        raise CatalogError(f"{shown}: empty file")
    decoded = decode_catalog_bytes(data, shown)
    fast = _read_fast(decoded.text, shown, limits)
    if fast is not None:
        return RawTable(
            path=shown,
            headers=fast.headers,
            columns=fast.columns,
            lines=fast.lines,
            problems=decoded.problems,
            header_line=fast.header_line,
        )
    records, starts, problems, bad, delimiter = split_csv_text(
        decoded.text, path=shown, limits=limits
    )
    problems = [*decoded.problems, *problems]
    header_at = None
    for position, cells in enumerate(records):
        if position in bad:
            continue
        if sum(1 for cell in cells if cell.strip()) >= 2:
            header_at = position
            break
    if header_at is None:
        raise CatalogError(
            f"{shown}: not a text table: no header row with two or more columns "
            f"(delimiter {_delimiter_name(delimiter)})"
        )
    if header_at > 0:
        problems.append(
            Problem(
                shown,
                starts[0],
                None,
                None,
                f"{header_at} line(s) above the header skipped",
                "warning",
            )
        )
    headers = tuple(cell.strip().lstrip("\ufeff") for cell in records[header_at])
    if len(headers) > _MAX_COLUMNS:
        raise CatalogError(f"{shown}: {len(headers)} columns; not a catalog table")
    width = len(headers)
    rows: list[tuple[str, ...]] = []
    lines: list[int] = []
    bad_rows: set[int] = set()
    for position in range(header_at + 1, len(records)):
        cells = records[position]
        line = starts[position]
        if position in bad:
            bad_rows.add(len(rows))
            rows.append(("",) * width)
            lines.append(line)
            continue
        if len(cells) > width and "".join(cells[width:]).strip():
            extra = sum(1 for cell in cells[width:] if cell.strip())
            problems.append(
                Problem(
                    shown,
                    line,
                    None,
                    _clip(delimiter.join(cells)),
                    f"row has {len(cells)} cells but the header has {width} ({extra} extra "
                    "non-blank); an unquoted delimiter inside a value? row not loaded",
                    "error",
                )
            )
            bad_rows.add(len(rows))
            rows.append(("",) * width)
            lines.append(line)
            continue
        if len(cells) < width:
            cells = cells + [""] * (width - len(cells))
        elif len(cells) > width:
            cells = cells[:width]
        if not "".join(cells).strip():
            continue  # a blank row (e.g. only delimiters) is not a part
        if sum(map(len, cells)) > limits.max_field_chars and (
            oversized := [i for i, cell in enumerate(cells) if len(cell) > limits.max_field_chars]
        ):
            problems.append(
                Problem(
                    shown,
                    line,
                    headers[oversized[0]],
                    f"{len(cells[oversized[0]])} characters",
                    f"a cell is longer than {limits.max_field_chars} characters; row not loaded",
                    "error",
                )
            )
            bad_rows.add(len(rows))
            rows.append(("",) * width)
            lines.append(line)
            continue
        rows.append(tuple(cells))
        lines.append(line)
    return RawTable(
        path=shown,
        headers=headers,
        columns=_arrow_columns(columns_from_rows(rows, width)),
        lines=tuple(lines),
        problems=tuple(problems),
        header_line=starts[header_at],
        bad_rows=frozenset(bad_rows),
    )


def _arrow_columns(columns: tuple[list[str], ...]) -> tuple[Column, ...]:
    """Columns as Arrow strings, as the fast reader gives them (distinct texts are then
    found by ``dictionary_encode`` at C speed); a column Arrow cannot hold stays a list."""
    converted: list[Column] = []
    for column in columns:
        try:
            converted.append(pa.array(column, type=pa.string()))
        except (pa.ArrowException, ValueError, TypeError, UnicodeError):
            converted.append(column)
    return tuple(converted)


def _delimiter_name(delimiter: str) -> str:
    return {"\t": "tab", ",": "comma", ";": "semicolon", "|": "bar"}.get(delimiter, delimiter)
