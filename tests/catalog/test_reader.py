"""load_catalogs: part-table contract, directories, duplicates, progress, read-only.

Sources of the expectations: the part-table columns and dtypes are the team contract
(INTERFACES.md, "The part table"); duplicate handling and "good rows still load" are
DESIGN.md §3; SI values follow the BIPM SI Brochure (9th ed.) prefixes.
"""

from __future__ import annotations

import hashlib
import subprocess
import sys
from collections.abc import Callable
from pathlib import Path

import numpy as np
import pandas as pd
import pytest

from catalog.problems import CatalogError
from catalog.reader import load_catalogs
from catalog.validate import FLOAT_COLUMNS, PART_COLUMNS

from .conftest import DEMO_HEADER, GOOD_ROW

Write = Callable[[str, bytes | str], Path]
DEMO_DIR = Path(__file__).resolve().parents[2] / "demo_catalog"

CATEGORY_COLUMNS = (
    "maker",
    "package",
    "mode",
    "cut",
    "lifecycle",
    "qualification",
    "pinout",
    "msl",
    "source_path",
)


def _csv(*rows: str) -> str:
    return "\n".join([DEMO_HEADER, *rows]) + "\n"


def test_part_table_columns_and_dtypes_follow_the_contract(write: Write) -> None:
    parts = load_catalogs([write("a.csv", _csv(GOOD_ROW))]).parts
    assert list(parts.columns) == [*PART_COLUMNS, "source_path", "source_line"]
    for column in FLOAT_COLUMNS:
        assert parts[column].dtype == np.float64, column
    for column in CATEGORY_COLUMNS:
        assert isinstance(parts[column].dtype, pd.CategoricalDtype), column
    assert parts["series_calibrated"].dtype == bool
    assert parts["source_line"].dtype == np.int64
    assert parts["mpn"].dtype == object
    row = parts.iloc[0]
    # SI values: 16 MHz, 12 pF, 80 Ω, 3 pF, 5 fF (SI Brochure prefixes)
    assert (row.freq_hz, row.load_capacitance_f, row.esr_ohm) == (16e6, 12e-12, 80.0)
    assert row.c0_f == pytest.approx(3e-12) and row.c1_f == pytest.approx(5e-15)
    assert (row.temp_min_c, row.temp_max_c) == (-40.0, 85.0)
    assert (row.tolerance_ppm, row.stability_ppm) == (10.0, 20.0)
    assert row["mode"] == "fundamental" and row["maker"] == "Zyxo"


def test_empty_result_still_has_every_column(write: Write) -> None:
    result = load_catalogs([write("header_only.csv", DEMO_HEADER + "\n")])
    assert result.parts.empty
    assert list(result.parts.columns) == [*PART_COLUMNS, "source_path", "source_line"]
    assert result.files[0].rows_read == 0


def test_directory_reads_catalogs_sorted_and_skips_other_files(
    write: Write, tmp_path: Path
) -> None:
    folder = tmp_path / "cat"
    folder.mkdir()
    (folder / "b.csv").write_text(_csv(GOOD_ROW.replace("ZX-16A", "B")), encoding="utf-8")
    (folder / "a.csv").write_text(_csv(GOOD_ROW.replace("ZX-16A", "A")), encoding="utf-8")
    (folder / "notes.txt").write_text("not a catalog", encoding="utf-8")
    result = load_catalogs([folder])
    assert list(result.parts["mpn"]) == ["A", "B"]
    assert [Path(f.path).name for f in result.files] == ["a.csv", "b.csv"]


def test_identical_duplicate_is_a_warning_and_kept_once(write: Write) -> None:
    result = load_catalogs([write("a.csv", _csv(GOOD_ROW, GOOD_ROW))])
    assert list(result.parts["mpn"]) == ["ZX-16A"]
    (problem,) = result.problems
    assert (problem.line, problem.severity) == (3, "warning")
    assert "identical" in problem.message
    assert result.files[0].rows_loaded == 1


def test_conflicting_duplicate_across_files_names_fields_and_keeps_first(
    write: Write,
) -> None:
    first = write("a.csv", _csv(GOOD_ROW))
    # Same part number (case differs), different ESR and package.
    second = write(
        "b.csv",
        _csv(GOOD_ROW.replace("ZX-16A", "zx-16a").replace(",80,", ",60,").replace("3225", "2520")),
    )
    result = load_catalogs([first, second])
    assert list(result.parts["esr_ohm"]) == [80.0]
    by_file = {Path(p.path).name: p for p in result.problems}
    assert by_file["b.csv"].severity == "error"
    assert "different esr, package" in by_file["b.csv"].message
    assert "a.csv:2" in by_file["b.csv"].message
    assert by_file["a.csv"].severity == "warning"  # the kept row is loaded: not an error
    assert "b.csv:2" in by_file["a.csv"].message
    assert [f.rows_loaded for f in result.files] == [1, 0]


def test_missing_path_alone_raises_but_next_to_a_good_file_is_a_problem(
    write: Write, tmp_path: Path
) -> None:
    with pytest.raises(CatalogError, match="no such file"):
        load_catalogs([tmp_path / "absent.csv"])
    result = load_catalogs([write("a.csv", _csv(GOOD_ROW)), tmp_path / "absent.csv"])
    assert len(result.parts) == 1
    assert result.problems[-1].message == "no such file or directory"


def test_empty_directory_raises(tmp_path: Path) -> None:
    with pytest.raises(CatalogError, match=r"no \*\.csv"):
        load_catalogs([tmp_path])


def test_progress_is_reported_from_zero_to_one(write: Write) -> None:
    seen: list[float] = []
    load_catalogs(
        [write("a.csv", _csv(GOOD_ROW)), write("b.csv", _csv(GOOD_ROW.replace("ZX-16A", "B")))],
        progress=seen.append,
    )
    assert seen[0] == 0.0 and seen[-1] == 1.0
    assert seen == sorted(seen)


def test_mapping_file_makes_an_unknown_header_usable(write: Write) -> None:
    text = _csv(GOOD_ROW).replace("Load Cap (pF)", "Lod Capacitance (pF)")
    path = write("a.csv", text)
    with pytest.raises(CatalogError, match=r"closest headers: 'Lod Capacitance"):
        load_catalogs([path])
    mapping = write("map.yaml", "Lod Capacitance: load_capacitance\n")
    result = load_catalogs([path], mapping=mapping)
    assert result.parts["load_capacitance_f"].iloc[0] == pytest.approx(12e-12)


def _digest(path: Path) -> str:
    return hashlib.sha256(path.read_bytes()).hexdigest()


def test_reading_never_modifies_the_inputs(write: Write) -> None:
    paths = [write("a.csv", _csv(GOOD_ROW, "broken,row")), write("m.yaml", "Notes: ignore\n")]
    before = [(_digest(p), p.stat().st_mtime_ns) for p in paths]
    load_catalogs([paths[0]], mapping=paths[1])
    assert [(_digest(p), p.stat().st_mtime_ns) for p in paths] == before
    assert sorted(p.name for p in paths[0].parent.iterdir()) == ["a.csv", "m.yaml"]


@pytest.mark.skipif(not any(DEMO_DIR.glob("*.csv")), reason="demo catalog not written yet")
def test_demo_catalog_loads_without_errors() -> None:
    result = load_catalogs([DEMO_DIR])
    errors = [p.one_line() for p in result.problems if p.severity == "error"]
    assert errors == []
    assert len(result.parts) > 100


def test_catalog_package_imports_no_ui() -> None:
    # House rule: the core never imports textual or rich (checked in a clean interpreter).
    code = (
        "import sys, catalog.reader, catalog.lint, catalog.units; "
        "bad = [m for m in ('textual', 'rich', 'picker') if m in sys.modules]; "
        "print(','.join(bad))"
    )
    output = subprocess.run(
        [sys.executable, "-c", code], capture_output=True, text=True, check=True
    ).stdout.strip()
    assert output == ""
