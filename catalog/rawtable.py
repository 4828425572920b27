"""A catalog file as read, before any meaning is given to it: headers, cells, lines.

Both readers (CSV, YAML) produce a ``RawTable``; header mapping and validation work on
it without knowing the file format.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Final

from catalog.problems import Problem

__all__ = ["DEFAULT_LIMITS", "Limits", "RawTable"]


@dataclass(frozen=True)
class Limits:
    """Size limits that keep a hostile or mistaken input from hanging the program.

    Attributes
    ----------
    max_file_bytes : int
        Largest catalog file read [bytes] (50 MB holds about a million parts).
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

    max_file_bytes: int = 50 * 1024 * 1024
    max_field_chars: int = 65536
    max_rows: int = 2_000_000
    max_yaml_aliases: int = 1000
    max_yaml_depth: int = 32
    max_yaml_nodes: int = 5_000_000


DEFAULT_LIMITS: Final[Limits] = Limits()


@dataclass(frozen=True)
class RawTable:
    """One file's table as text.

    ``rows`` are lists of cell strings in header order (shorter rows are padded with "");
    ``lines[i]`` is the 1-based line where row ``i`` starts; ``bad_rows`` holds row
    indices the reader already found unusable (reported in ``problems``), which
    validation drops. ``header_line`` is the line of the headers (None for YAML).
    """

    path: str
    headers: tuple[str, ...]
    rows: tuple[tuple[str, ...], ...]
    lines: tuple[int, ...]
    problems: tuple[Problem, ...]
    header_line: int | None
    bad_rows: frozenset[int] = frozenset()
