"""Exports: atomic (temporary file in the target's folder, then rename), never onto an input
catalog, and spreadsheet formula cells neutralised.

Formula neutralising follows the OWASP "CSV Injection" guidance: a cell that starts with
``=``, ``+``, ``-``, ``@``, a tab or a carriage return is prefixed with ``'`` so a
spreadsheet shows it as text instead of running it.
"""

from __future__ import annotations

import csv
import hashlib
import io
import os
from pathlib import Path

import pytest

from picker.tui import export
from tests.hostile.conftest import GOOD_ROWS, RunCli, part_row, write_catalog

FORMULA_STARTS = ("=", "+", "-", "@", "\t", "\r")  # OWASP CSV Injection list

#: Part numbers and maker names a hostile catalog could carry into an export.
HOSTILE_MPNS = ("=HYPERLINK(1)", "+SUM(1)", "-2+3", "@SUM(A1)")


def _is_number(text: str) -> bool:
    try:
        float(text)
    except ValueError:
        return False
    return True


def _assert_formula_safe(csv_output: str) -> list[list[str]]:
    rows = list(csv.reader(io.StringIO(csv_output)))
    assert len(rows) > 1
    for row in rows:
        for cell in row:
            if cell.startswith(FORMULA_STARTS):
                assert _is_number(cell), f"formula cell not neutralised: {cell!r}"
    return rows


def _hostile_catalog(folder: Path) -> Path:
    lines = [part_row(mpn).replace("Quillon", "=cmd|' /C calc'!A0") for mpn in HOSTILE_MPNS]
    return write_catalog(folder, "formulas.csv", [*lines, GOOD_ROWS[0]])


def _digest(path: Path) -> tuple[str, int]:
    return hashlib.sha256(path.read_bytes()).hexdigest(), path.stat().st_mtime_ns


def test_cli_csv_outputs_are_formula_safe(corpus: Path, run_cli: RunCli, brief_file: Path) -> None:
    catalog = _hostile_catalog(corpus)
    run = run_cli(
        "rank", "--catalog", str(catalog), "--brief", str(brief_file), "--format", "csv", "--all"
    )
    assert run.code == 0
    rows = _assert_formula_safe(run.out)
    mpns = {row[rows[0].index("mpn")] for row in rows[1:]}
    assert {"'" + mpn for mpn in HOSTILE_MPNS} <= mpns  # kept, readable, not executable
    # Negative numbers stay numbers (a negative resistance is not a formula).
    column = rows[0].index("negative_resistance_ohm")
    assert all(float(row[column]) < 0 for row in rows[1:])
    run = run_cli("alternates", "QN16-A", "--catalog", str(catalog), "--format", "csv")
    _assert_formula_safe(run.out)


def test_tui_export_text_is_formula_safe() -> None:
    rows = [
        {"mpn": mpn, "maker": "@evil", "note": "\t=1", "rneg": -312.5, "reasons": ["-x", "=y"]}
        for mpn in HOSTILE_MPNS
    ]
    _assert_formula_safe(export.export_text(rows, "csv"))
    assert export.formula_safe(-312.5) == -312.5
    assert export.formula_safe("=1") == "'=1"


def test_export_is_atomic(corpus: Path, monkeypatch: pytest.MonkeyPatch) -> None:
    target = corpus / "shortlist.csv"
    target.write_text("old export\n", encoding="utf-8")
    seen: list[tuple[Path, str]] = []
    real_replace = os.replace

    def watching_replace(source: str | Path, destination: str | Path) -> None:
        # At the moment of the rename the whole new text sits in a temporary file beside
        # the target (same folder, so the rename is atomic) and the old file is untouched.
        seen.append((Path(source), Path(source).read_text(encoding="utf-8")))
        assert Path(destination).read_text(encoding="utf-8") == "old export\n"
        real_replace(source, destination)

    monkeypatch.setattr(export.os, "replace", watching_replace)
    export.write_atomic(target, "new export\n")
    ((temporary, text),) = seen
    assert temporary.parent == target.parent and temporary != target
    assert text == "new export\n"
    assert target.read_text(encoding="utf-8") == "new export\n"
    assert sorted(p.name for p in corpus.iterdir()) == ["shortlist.csv"]  # no temp left


def test_failed_export_leaves_the_old_file_and_no_temporary(
    corpus: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    target = corpus / "shortlist.csv"
    target.write_text("old export\n", encoding="utf-8")
    before = _digest(target)

    def full_disk(descriptor: int) -> None:
        raise OSError(28, "No space left on device")

    monkeypatch.setattr(export.os, "fsync", full_disk)
    with pytest.raises(export.ExportError, match="No space left"):
        export.write_atomic(target, "new export\n" * 1000)
    assert _digest(target) == before
    assert sorted(p.name for p in corpus.iterdir()) == ["shortlist.csv"]


def test_export_refuses_input_catalogs(corpus: Path) -> None:
    catalog = write_catalog(corpus, "parts.csv", GOOD_ROWS)
    before = _digest(catalog)
    link = corpus / "link.csv"
    link.symlink_to(catalog)
    folder = corpus / "catalogs"
    folder.mkdir()
    inside = write_catalog(folder, "more.csv", GOOD_ROWS)
    inside_before = _digest(inside)
    attempts = [
        (catalog, [catalog]),  # the catalog itself
        (link, [catalog]),  # a symlink to it
        (corpus / "." / "parts.csv", [catalog]),  # another spelling of it
        (inside, [folder]),  # a catalog inside a catalog folder
        (folder / "new.yaml", [folder]),  # a new catalog file the folder would then read
    ]
    for target, inputs in attempts:
        with pytest.raises(export.ExportError, match="refusing to write onto an input"):
            export.write_atomic(target, "mpn\n", inputs)
    assert _digest(catalog) == before and _digest(inside) == inside_before
    with pytest.raises(export.ExportError, match="folder"):
        export.write_atomic(folder, "x\n", [catalog])
    with pytest.raises(export.ExportError, match="does not exist"):
        export.write_atomic(corpus / "missing" / "x.csv", "x\n", [catalog])
    # The control: a new file next to the catalog is fine.
    written = export.write_atomic(corpus / "shortlist.csv", "mpn\n", [catalog, folder])
    assert written.read_text(encoding="utf-8") == "mpn\n"
