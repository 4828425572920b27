"""Writing the shortlist and the brief to files: atomic, never onto an input file.

Every write goes to a temporary file in the target's folder and is moved into place with
os.replace, so a crash never leaves half a file and an existing file is either the old one
or the new one.
"""

from __future__ import annotations

import csv
import io
import json
import math
import os
import tempfile
from collections.abc import Iterable, Mapping, Sequence
from pathlib import Path

import yaml

FORMULA_STARTS = ("=", "+", "-", "@", "\t", "\r")
"""Cell starts a spreadsheet treats as a formula (OWASP "CSV injection" guidance)."""


class ExportError(ValueError):
    """The file cannot be written (one-line message naming the path)."""


def formula_safe(value: object) -> object:
    """A CSV cell that a spreadsheet will not run: text starting like a formula gets a `'`.

    Numbers stay numbers (a negative resistance is written as -312.5, not as text).
    """
    if isinstance(value, bool) or value is None:
        return "" if value is None else str(value).lower()
    if isinstance(value, int | float):
        return "" if isinstance(value, float) and not math.isfinite(value) else value
    text = value if isinstance(value, str) else str(value)
    return "'" + text if text.startswith(FORMULA_STARTS) else text


def _cell(value: object) -> object:
    if isinstance(value, list | tuple):
        return "; ".join(str(v) for v in value)
    if isinstance(value, Mapping):
        return json.dumps(value, default=str)
    return value


def _columns(rows: Sequence[Mapping[str, object]]) -> list[str]:
    columns: dict[str, None] = {}
    for row in rows:
        for key in row:
            columns.setdefault(key, None)
    return list(columns)


def csv_text(rows: Sequence[Mapping[str, object]]) -> str:
    """Rows as CSV, every cell formula-safe; nested values flattened to text."""
    buffer = io.StringIO()
    columns = _columns(rows)
    writer = csv.writer(buffer, lineterminator="\n")
    writer.writerow([formula_safe(c) for c in columns])
    for row in rows:
        writer.writerow([formula_safe(_cell(row.get(c))) for c in columns])
    return buffer.getvalue()


def _json_ready(value: object) -> object:
    if isinstance(value, float) and not math.isfinite(value):
        return None
    if isinstance(value, Mapping):
        return {str(k): _json_ready(v) for k, v in value.items()}
    if isinstance(value, list | tuple):
        return [_json_ready(v) for v in value]
    if hasattr(value, "item"):  # numpy scalars
        return _json_ready(value.item())
    return value


def json_text(rows: Sequence[Mapping[str, object]]) -> str:
    """Rows as a JSON list (NaN and infinities become null, as JSON has neither)."""
    return json.dumps([_json_ready(dict(r)) for r in rows], indent=2, ensure_ascii=False) + "\n"


def _markdown_cell(value: object) -> str:
    if isinstance(value, float):
        return "" if not math.isfinite(value) else f"{value:.6g}"
    return str(_cell(value)).replace("|", "\\|").replace("\n", " ")


def markdown_text(
    rows: Sequence[Mapping[str, object]], columns: Sequence[str] | None = None, title: str = ""
) -> str:
    """Rows as a Markdown table (pipes escaped)."""
    chosen = list(columns) if columns else _columns(rows)
    lines = [f"# {title}", ""] if title else []
    lines.append("| " + " | ".join(chosen) + " |")
    lines.append("|" + "|".join("---" for _ in chosen) + "|")
    for row in rows:
        lines.append("| " + " | ".join(_markdown_cell(row.get(c)) for c in chosen) + " |")
    return "\n".join(lines) + "\n"


def check_target(path: Path, inputs: Iterable[Path]) -> Path:
    """The resolved target, or ExportError when it is an input file or a folder."""
    target = path.expanduser()
    resolved = target.resolve()
    for source in inputs:
        source_path = Path(source).expanduser().resolve()
        if resolved == source_path or (
            source_path.is_dir()
            and resolved.parent == source_path
            and resolved.suffix.lower() in (".csv", ".yaml", ".yml")
        ):
            raise ExportError(f"{target}: refusing to write onto an input file")
    if target.is_dir():
        raise ExportError(f"{target}: is a folder, give a file name")
    if not target.parent.exists():
        raise ExportError(f"{target}: folder {target.parent} does not exist")
    return target


def write_atomic(path: Path, text: str, inputs: Iterable[Path] = ()) -> Path:
    """Write `text` to `path` through a temporary file and os.replace; returns the path."""
    target = check_target(path, inputs)
    descriptor, temporary = tempfile.mkstemp(
        prefix=f".{target.name}.", suffix=".tmp", dir=target.parent
    )
    try:
        with os.fdopen(descriptor, "w", encoding="utf-8", newline="") as handle:
            handle.write(text)
            handle.flush()
            os.fsync(handle.fileno())
        os.replace(temporary, target)
    except OSError as error:
        Path(temporary).unlink(missing_ok=True)
        raise ExportError(f"{target}: {error.strerror or error}") from error
    except BaseException:
        Path(temporary).unlink(missing_ok=True)
        raise
    return target


def export_text(
    rows: Sequence[Mapping[str, object]],
    format_name: str,
    title: str = "",
    markdown_columns: Sequence[str] | None = None,
) -> str:
    """The shortlist in one of the export formats ("csv", "json", "markdown")."""
    if format_name == "csv":
        return csv_text(rows)
    if format_name == "json":
        return json_text(rows)
    if format_name == "markdown":
        return markdown_text(rows, markdown_columns, title)
    raise ExportError(f"unknown export format '{format_name}' (csv, json, markdown)")


def brief_yaml(data: Mapping[str, object]) -> str:
    """The brief mapping as YAML, keys in the order shown on screen."""
    return yaml.safe_dump(_json_ready(dict(data)), sort_keys=False, allow_unicode=True)
