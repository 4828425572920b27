"""Exports: formula-safe CSV, atomic writes, never onto an input file."""

from __future__ import annotations

import csv
import io
import json
import math
from pathlib import Path

import pytest

from picker.tui.export import (
    ExportError,
    check_target,
    csv_text,
    export_text,
    formula_safe,
    json_text,
    markdown_text,
    write_atomic,
)


@pytest.mark.parametrize("text", ["=1+1", "+1", "-1", "@SUM(A1)", "\tx", "\rx"])
def test_text_that_starts_like_a_formula_is_neutralised(text: str) -> None:
    # OWASP "CSV Injection": prefix cells beginning with = + - @ tab or CR with a quote.
    assert formula_safe(text) == "'" + text


def test_numbers_stay_numbers() -> None:
    assert formula_safe(-312.5) == -312.5
    assert formula_safe(7) == 7
    assert formula_safe(math.nan) == ""
    assert formula_safe("TK16-A") == "TK16-A"


def test_csv_round_trips_through_the_csv_module() -> None:
    rows = [{"mpn": "=HYPERLINK(x)", "rneg": -300.0, "reasons": ["a", "b"]}]
    parsed = list(csv.reader(io.StringIO(csv_text(rows))))
    assert parsed == [["mpn", "rneg", "reasons"], ["'=HYPERLINK(x)", "-300.0", "a; b"]]


def test_json_has_no_nan() -> None:
    # RFC 8259 has no NaN or Infinity; they become null.
    assert json.loads(json_text([{"x": math.nan, "y": math.inf, "z": 1.5}])) == [
        {"x": None, "y": None, "z": 1.5}
    ]


def test_markdown_escapes_pipes() -> None:
    text = markdown_text([{"mpn": "A|B", "score": 0.5}], title="T")
    assert "| A\\|B | 0.5 |" in text and text.startswith("# T\n")


def test_unknown_format_is_refused() -> None:
    with pytest.raises(ExportError):
        export_text([], "xlsx")


def test_write_is_atomic_and_replaces(tmp_path: Path) -> None:
    target = tmp_path / "out.csv"
    target.write_text("old", encoding="utf-8")
    write_atomic(target, "new", ())
    assert target.read_text(encoding="utf-8") == "new"
    assert [p.name for p in tmp_path.iterdir()] == ["out.csv"]


def test_input_files_are_never_written(tmp_path: Path) -> None:
    catalog = tmp_path / "parts.csv"
    catalog.write_text("mpn\nA\n", encoding="utf-8")
    with pytest.raises(ExportError, match="refusing to write onto an input file"):
        write_atomic(catalog, "x", [catalog])
    # Another spelling of the same file is caught too.
    with pytest.raises(ExportError):
        write_atomic(tmp_path / "." / "parts.csv", "x", [catalog])
    # A catalog folder protects every catalog file inside it.
    with pytest.raises(ExportError):
        check_target(tmp_path / "other.yaml", [tmp_path])
    assert catalog.read_text(encoding="utf-8") == "mpn\nA\n"


def test_missing_folder_is_a_one_line_error(tmp_path: Path) -> None:
    with pytest.raises(ExportError, match="does not exist"):
        write_atomic(tmp_path / "nope" / "x.csv", "x", ())
