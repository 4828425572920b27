"""Load catalogs: files and directories -> one part table plus every problem found.

``load_catalogs`` is what the CLI and the TUI call (through ``catalog.cache``). Each file
is read (CSV or YAML), its headers are mapped, its cells parsed and validated; the files'
parts are concatenated and part numbers seen twice (in one file or across files) are
resolved: identical data -> one kept (warning); different data -> the first kept, the
later one dropped (error on the later line, warning on the first, naming the fields that
differ). The user's files are only read.
"""

from __future__ import annotations

from collections.abc import Callable, Sequence
from dataclasses import dataclass
from pathlib import Path
from typing import Final

import numpy as np
import pandas as pd

from catalog.csv_reader import read_csv_table
from catalog.headers import HeaderMapping, load_mapping, map_headers
from catalog.problems import CatalogError, Problem
from catalog.rawtable import DEFAULT_LIMITS, Limits, RawTable
from catalog.schema import FIELDS
from catalog.validate import (
    FLOAT_COLUMNS,
    PART_COLUMNS,
    TEXT_COLUMNS,
    ParsedTable,
    validate_table,
)
from catalog.yaml_reader import read_yaml_table

__all__ = [
    "CATALOG_SUFFIXES",
    "FileReport",
    "LoadOutcome",
    "LoadResult",
    "empty_part_table",
    "expand_catalog_paths",
    "load_catalogs",
    "load_catalogs_with_status",
    "parse_catalog_file",
    "read_raw_table",
    "resolve_duplicates",
]

CATALOG_SUFFIXES: Final[tuple[str, ...]] = (".csv", ".yaml", ".yml")
_YAML_SUFFIXES: Final[tuple[str, ...]] = (".yaml", ".yml")
#: Share of one file's progress taken by reading and splitting it (the rest: parsing).
_READ_SHARE: Final[float] = 0.3
_COLUMN_FIELDS: Final[dict[str, str]] = {
    **{spec.column: spec.name for spec in FIELDS if spec.column},
    "series_calibrated": "load_capacitance",
}
_CATEGORY_COLUMNS: Final[tuple[str, ...]] = (*TEXT_COLUMNS, "source_path")


@dataclass(frozen=True)
class FileReport:
    """How many rows one file held and how many became parts."""

    path: str
    rows_read: int
    rows_loaded: int


@dataclass(frozen=True)
class LoadResult:
    """The part table (INTERFACES.md columns), every problem, and one report per file."""

    parts: pd.DataFrame
    problems: tuple[Problem, ...]
    files: tuple[FileReport, ...]


@dataclass(frozen=True)
class LoadOutcome:
    """A LoadResult plus which inputs were unusable as a whole (for lint's exit code)."""

    result: LoadResult
    unusable: tuple[str, ...]


def empty_part_table() -> pd.DataFrame:
    """A part table with every column and dtype and no rows."""
    frame = pd.DataFrame({column: pd.Series(dtype=object) for column in PART_COLUMNS})
    frame["source_path"] = pd.Series(dtype=object)
    frame["source_line"] = pd.Series(dtype=np.int64)
    return _finish_dtypes(frame)


def expand_catalog_paths(paths: Sequence[str | Path]) -> tuple[list[Path], list[Problem]]:
    """Files to read, in order: a directory gives its *.csv/*.yaml/*.yml (sorted by name).

    Missing paths and directories without catalogs come back as error problems.
    """
    files: list[Path] = []
    problems: list[Problem] = []
    for given in paths:
        path = Path(given)
        if path.is_dir():
            inside = sorted(
                child
                for child in path.iterdir()
                if child.is_file() and child.suffix.lower() in CATALOG_SUFFIXES
            )
            if not inside:
                problems.append(
                    Problem(
                        str(path),
                        None,
                        None,
                        None,
                        "directory holds no *.csv, *.yaml or *.yml catalog",
                        "error",
                    )
                )
            files.extend(inside)
        elif path.exists():
            files.append(path)
        else:
            problems.append(
                Problem(str(path), None, None, None, "no such file or directory", "error")
            )
    return files, problems


def read_raw_table(path: Path, *, limits: Limits = DEFAULT_LIMITS) -> RawTable:
    """Read one catalog file by its suffix (.yaml/.yml: YAML; anything else: CSV)."""
    if path.suffix.lower() in _YAML_SUFFIXES:
        return read_yaml_table(path, limits=limits)
    return read_csv_table(path, limits=limits)


def parse_catalog_file(
    path: Path,
    *,
    mapping: HeaderMapping | None = None,
    limits: Limits = DEFAULT_LIMITS,
    progress: Callable[[float], None] | None = None,
) -> ParsedTable:
    """Read, map and validate one file. Raises CatalogError when it is unusable.

    ``progress`` gets this file's share done (0..1): reading counts for the first 30 %.
    """
    raw = read_raw_table(path, limits=limits)
    if progress is not None:
        progress(_READ_SHARE)
    header_map = map_headers(raw.headers, path=raw.path, line=raw.header_line, mapping=mapping)
    step = None if progress is None else _scaled(progress, _READ_SHARE, 1.0)
    parsed = validate_table(raw, header_map, progress=step)
    return ParsedTable(
        parsed.path, parsed.parts, (*raw.problems, *parsed.problems), parsed.rows_read
    )


def _scaled(
    progress: Callable[[float], None], start: float, stop: float
) -> Callable[[float], None]:
    """A progress callback for a sub-task that covers ``start..stop`` of the whole."""

    def report(share: float) -> None:
        progress(start + (stop - start) * min(max(share, 0.0), 1.0))

    return report


def _same(left: object, right: object) -> bool:
    if isinstance(left, float) and isinstance(right, float):
        return (np.isnan(left) and np.isnan(right)) or left == right
    return bool(left == right)


def resolve_duplicates(frame: pd.DataFrame) -> tuple[pd.DataFrame, list[Problem]]:
    """Keep the first row of each part number (compared case-insensitively); report the rest."""
    if frame.empty:
        return frame, []
    key = frame["mpn"].astype(object).map(lambda text: str(text).casefold())
    repeated = key.duplicated(keep=False).to_numpy()
    if not repeated.any():
        return frame, []
    compare = [column for column in PART_COLUMNS if column != "mpn"]
    problems: list[Problem] = []
    drop: list[int] = []
    subset = frame.loc[repeated]
    for _, group in subset.groupby(key[repeated], sort=False):
        first_index = group.index[0]
        first = frame.loc[first_index]
        where_first = f"{first['source_path']}:{first['source_line']}"
        for index in group.index[1:]:
            row = frame.loc[index]
            differing = list(
                dict.fromkeys(
                    _COLUMN_FIELDS.get(c, c) for c in compare if not _same(first[c], row[c])
                )
            )
            here = (str(row["source_path"]), int(row["source_line"]))
            drop.append(index)
            if not differing:
                problems.append(
                    Problem(
                        *here,
                        "mpn",
                        str(row["mpn"]),
                        f"part number repeated with identical data (first at "
                        f"{where_first}); one kept",
                        "warning",
                    )
                )
                continue
            fields = ", ".join(differing)
            problems.append(
                Problem(
                    *here,
                    "mpn",
                    str(row["mpn"]),
                    f"part number already at {where_first} with different "
                    f"{fields}; the first is kept, this row not loaded",
                    "error",
                )
            )
            problems.append(
                Problem(
                    str(first["source_path"]),
                    int(first["source_line"]),
                    "mpn",
                    str(first["mpn"]),
                    f"part number appears again at {here[0]}:{here[1]} with "
                    f"different {fields}; this row is kept, the later one "
                    "dropped",
                    "warning",
                )
            )
    return frame.drop(index=drop), problems


def _finish_dtypes(frame: pd.DataFrame) -> pd.DataFrame:
    """Contract dtypes: float64 SI columns, categoricals for text, object mpn, int64 lines."""
    frame = frame.reset_index(drop=True)
    columns: dict[str, pd.Series] = {}
    for column in frame.columns:
        series = frame[column]
        if column in FLOAT_COLUMNS:
            columns[column] = series.astype(np.float64)
        elif column in _CATEGORY_COLUMNS:
            columns[column] = series.astype(object).fillna("").astype(str).astype("category")
        elif column == "series_calibrated":
            columns[column] = series.astype(bool)
        elif column == "source_line":
            columns[column] = series.astype(np.int64)
        elif column == "mpn":
            columns[column] = series.astype(object)
        else:
            columns[column] = series
    return pd.DataFrame(columns, index=pd.RangeIndex(len(frame)))


def _sort_key(order: dict[str, int]) -> Callable[[Problem], tuple[int, int]]:
    def key(problem: Problem) -> tuple[int, int]:
        return order.get(problem.path, len(order)), problem.line or 0

    return key


def load_catalogs_with_status(
    paths: Sequence[str | Path],
    *,
    mapping: str | Path | None = None,
    progress: Callable[[float], None] | None = None,
    limits: Limits = DEFAULT_LIMITS,
) -> LoadOutcome:
    """Like ``load_catalogs`` but never raises for unusable catalog files: they are listed.

    Raises CatalogError only for an unusable mapping file (the user's configuration).
    """
    header_mapping = load_mapping(mapping) if mapping is not None else None
    files, problems = expand_catalog_paths(paths)
    unusable = [problem.path for problem in problems]
    order = {str(path): position for position, path in enumerate(files)}
    frames: list[pd.DataFrame] = []
    reports: list[FileReport] = []
    sizes = [_size(path) for path in files]
    total = float(sum(sizes)) or 1.0
    done = 0.0
    if progress is not None:
        progress(0.0)
    for path, size in zip(files, sizes, strict=True):
        step = None if progress is None else _scaled(progress, done / total, (done + size) / total)
        try:
            parsed = parse_catalog_file(path, mapping=header_mapping, limits=limits, progress=step)
        except CatalogError as error:
            line, text = _split_location(str(error), str(path))
            problems.append(Problem(str(path), line, None, None, text, "error"))
            unusable.append(str(path))
            reports.append(FileReport(str(path), 0, 0))
        else:
            problems.extend(parsed.problems)
            frames.append(parsed.parts)
            reports.append(FileReport(str(path), parsed.rows_read, len(parsed.parts)))
        done += size
        if progress is not None:
            progress(min(done / total, 1.0))
    usable = [frame for frame in frames if not frame.empty]
    combined = pd.concat(usable, ignore_index=True) if usable else empty_part_table()
    combined, duplicate_problems = resolve_duplicates(combined)
    problems.extend(duplicate_problems)
    if duplicate_problems:
        dropped_per_file: dict[str, int] = {}
        for problem in duplicate_problems:
            if problem.severity == "error" or "one kept" in problem.message:
                dropped_per_file[problem.path] = dropped_per_file.get(problem.path, 0) + 1
        reports = [
            FileReport(r.path, r.rows_read, r.rows_loaded - dropped_per_file.get(r.path, 0))
            for r in reports
        ]
    problems.sort(key=_sort_key(order))
    result = LoadResult(_finish_dtypes(combined), tuple(problems), tuple(reports))
    if progress is not None:
        progress(1.0)
    return LoadOutcome(result, tuple(unusable))


def _split_location(message: str, path: str) -> tuple[int | None, str]:
    """'parts.csv:14: text' -> (14, 'text'); 'parts.csv: text' -> (None, 'text')."""
    if not message.startswith(path + ":"):
        return None, message
    rest = message[len(path) + 1 :]
    head, separator, tail = rest.partition(":")
    if separator and head.strip().isdigit():
        return int(head), tail.strip()
    return None, rest.strip()


def _size(path: Path) -> int:
    try:
        return path.stat().st_size
    except OSError:
        return 0


def load_catalogs(
    paths: Sequence[str | Path],
    *,
    mapping: str | Path | None = None,
    progress: Callable[[float], None] | None = None,
) -> LoadResult:
    """Load catalog files and directories into one part table.

    Parameters
    ----------
    paths : sequence of str or Path
        Files (.csv, .yaml, .yml) and directories (all such files inside, sorted).
    mapping : str or Path, optional
        A header mapping file (YAML, raw header -> field or ``ignore``).
    progress : callable, optional
        Called with the share done, 0.0 to 1.0 (by file size).

    Returns
    -------
    LoadResult
        Parts (INTERFACES.md part table), problems (file, line, field, raw, message,
        severity), one FileReport per file read.

    Raises
    ------
    CatalogError
        When nothing at all is usable (every path missing, unreadable or not a table), or
        the mapping file is unusable. Other trouble is reported in ``problems``.
    """
    if not paths:
        raise CatalogError("no catalog given")
    outcome = load_catalogs_with_status(paths, mapping=mapping, progress=progress)
    result = outcome.result
    unusable = set(outcome.unusable)
    if not any(report.path not in unusable for report in result.files):
        first = next(p for p in result.problems if p.path in unusable and p.severity == "error")
        others = len(unusable) - 1
        more = f" (and {others} more unusable input(s))" if others else ""
        where = first.path if first.line is None else f"{first.path}:{first.line}"
        raise CatalogError(f"{where}: {first.message}{more}")
    return result
