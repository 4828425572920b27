"""Lint report: the JSON shape of DESIGN §6, exit codes and the plain-text table.

Sources: the JSON keys are DESIGN.md §6 ("lint --format json prints ..."); exit codes
0 clean or warnings only, 1 error rows, 2 unusable input are the task's contract.
"""

from __future__ import annotations

import json
from collections.abc import Callable
from pathlib import Path

import pytest

from catalog.lint import lint_catalogs, render_lint_table

from .conftest import DEMO_HEADER, GOOD_ROW

Write = Callable[[str, bytes | str], Path]
DEMO_DIR = Path(__file__).resolve().parents[2] / "demo_catalog"
PROBLEM_KEYS = {"path", "line", "field", "raw", "message", "severity"}


def _csv(*rows: str) -> str:
    return "\n".join([DEMO_HEADER, *rows]) + "\n"


def test_clean_catalog_exit_0_and_json_shape(write: Write) -> None:
    report = lint_catalogs([write("a.csv", _csv(GOOD_ROW))])
    data = json.loads(json.dumps(report.to_json_dict()))
    assert set(data) == {"files", "rows_loaded", "problems"}
    assert data["files"] == [
        {"path": str(write("a.csv", _csv(GOOD_ROW))), "rows_read": 1, "rows_loaded": 1}
    ]
    assert data["rows_loaded"] == 1 and data["problems"] == []
    assert report.exit_code == 0


def test_warnings_only_exit_0(write: Write) -> None:
    report = lint_catalogs([write("a.csv", _csv(GOOD_ROW, GOOD_ROW))])
    assert report.warnings == 1 and report.errors == 0
    assert report.exit_code == 0


def test_error_rows_exit_1_with_full_problem_objects(write: Write) -> None:
    report = lint_catalogs([write("a.csv", _csv(GOOD_ROW, GOOD_ROW.replace(",80,", ",x,")))])
    assert report.exit_code == 1
    (problem,) = report.to_json_dict()["problems"]  # type: ignore[misc]
    assert set(problem) == PROBLEM_KEYS
    assert problem["line"] == 3 and problem["field"] == "esr" and problem["raw"] == "x"
    assert problem["severity"] == "error"


@pytest.mark.parametrize("name", ["absent.csv", "garbage.csv", "empty.csv"])
def test_unusable_input_exit_2(write: Write, tmp_path: Path, name: str) -> None:
    if name == "garbage.csv":
        write(name, bytes(range(256)) * 40)
    elif name == "empty.csv":
        write(name, b"")
    report = lint_catalogs([tmp_path / name])
    assert report.exit_code == 2
    assert report.problems[0].severity == "error" and report.problems[0].line is None


def test_one_unusable_among_good_files_is_a_problem_found(write: Write, tmp_path: Path) -> None:
    # The good file was checked, so this is a finding (1), not an unusable run (2).
    report = lint_catalogs([write("a.csv", _csv(GOOD_ROW)), tmp_path / "absent.csv"])
    assert report.rows_loaded == 1
    assert report.exit_code == 1
    assert any(p.path.endswith("absent.csv") and p.severity == "error" for p in report.problems)


def test_bad_mapping_file_exit_2(write: Write) -> None:
    report = lint_catalogs(
        [write("a.csv", _csv(GOOD_ROW))], mapping=write("map.yaml", "Freq: frequncy\n")
    )
    assert report.exit_code == 2 and report.fatal is not None
    assert "unknown field 'frequncy'" in report.fatal


def test_table_is_grouped_by_file_and_fits_80_columns(write: Write) -> None:
    long_raw = "y" * 200
    report = lint_catalogs(
        [
            write("a.csv", _csv(GOOD_ROW, GOOD_ROW.replace(",80,", f",{long_raw},"))),
            write("b.csv", _csv(GOOD_ROW.replace("ZX-16A", "ZX-16B"))),
        ]
    )
    text = render_lint_table(report)
    assert max(len(line) for line in text.splitlines()) <= 80
    lines = text.splitlines()
    assert "a.csv" in lines[0] and "(2 rows read, 1 loaded)" in " ".join(lines[:2])
    assert any(line.strip().startswith("3 ERROR esr") for line in lines)
    assert "no problems" in text  # b.csv
    assert lines[-1] == "2 files, 3 rows read, 2 loaded; 1 error, 0 warnings"


@pytest.mark.skipif(not any(DEMO_DIR.glob("*.csv")), reason="demo catalog not written yet")
def test_demo_catalog_lints_with_zero_errors() -> None:
    report = lint_catalogs([DEMO_DIR])
    assert report.errors == 0, [p.one_line() for p in report.problems][:10]
    assert report.exit_code == 0
