"""Hostile catalog files, through the command line (in-process) and through load_catalogs.

Each case builds its file in tmp_path, then checks: the exit codes of DESIGN.md §6 (lint 0
clean, 1 problems, 2 unusable; rank 2 for unreadable input), no traceback, the good rows
still load (rows_loaded counted), every row problem names file, line, field and raw text,
the input is unchanged, and the case ends within its time bound.
"""

from __future__ import annotations

import contextlib
import os
import random
import time
from collections.abc import Callable
from dataclasses import dataclass
from pathlib import Path

import pytest

from catalog.problems import CatalogError
from catalog.reader import load_catalogs
from tests.hostile.conftest import (
    GOOD_ROWS,
    HEADER,
    RunCli,
    bounded,
    make_fifo,
    part_row,
    snapshot,
    write_catalog,
)


@dataclass(frozen=True)
class Case:
    """One hostile catalog: how to build it and what must come out."""

    name: str
    build: Callable[[Path], Path]
    # DESIGN.md §6 with catalog/lint.py's reading of it: 0 clean or warnings only, 1 rows
    # with errors (or an unusable input beside usable ones), 2 nothing usable.
    lint_code: int
    rows_loaded: int | None  # None: unusable as a whole
    words: str = ""  # in the message of an unusable file, or of one row problem


def _bytes(name: str, data: bytes) -> Callable[[Path], Path]:
    def build(folder: Path) -> Path:
        path = folder / name
        path.write_bytes(data)
        return path

    return build


def _lines(name: str, lines: list[str]) -> Callable[[Path], Path]:
    return lambda folder: write_catalog(folder, name, lines)


def _garbage(size: int) -> bytes:
    return random.Random(20261202).randbytes(size)  # seeded random generator: same bytes each run


def _huge_field(folder: Path) -> Path:
    huge = "9" * (5 * 1024 * 1024)  # a 5 MB cell in the esr column
    return write_catalog(
        folder, "huge_field.csv", [GOOD_ROWS[0], part_row("QN-BIG", esr=huge), GOOD_ROWS[1]]
    )


def _mixed_encoding(folder: Path) -> Path:
    path = folder / "mixed.csv"
    good = "\n".join([HEADER, GOOD_ROWS[0], GOOD_ROWS[1]]).encode("utf-8")
    # One line saved by a Windows tool: 'µ' is byte 0xB5 in Windows-1252, invalid as UTF-8.
    legacy = part_row("QN16-MU").replace("200 uW", "150 µW").encode("cp1252")
    utf8_line = part_row("QN16-OHM", esr="40 Ω").encode("utf-8")
    path.write_bytes(good + b"\n" + legacy + b"\n" + utf8_line + b"\n")
    return path


def _european(folder: Path) -> Path:
    # A spreadsheet export with a European locale: BOM, semicolons, decimal commas.
    rows = [
        "QN16-EU1;Quillon;16 MHz;12,5 pF;10 ppm;10 ppm;-40;85;40 ohm;3225;2,1 pF;5,5 fF;"
        "200 uW;2 ppm;0,30;5000;active",
        "QN32K-EU2;Quillon;32,768 kHz;12,5 pF;20 ppm;;-40;85;70 kohm;3215;1,2 pF;3,5 fF;"
        "1 uW;3 ppm;0,25;100;active",
    ]
    text = "\n".join([HEADER.replace(",", ";"), *rows]) + "\n"
    path = folder / "export_de.csv"
    path.write_bytes(b"\xef\xbb\xbf" + text.encode("utf-8"))
    return path


def _alias_bomb(folder: Path) -> Path:
    lines = ['a: &a ["lol","lol","lol","lol","lol","lol","lol","lol","lol"]']
    for level in "bcdefghi":
        previous = chr(ord(level) - 1)
        lines.append(f"{level}: &{level} [" + ",".join([f"*{previous}"] * 9) + "]")
    lines.append("parts:\n  - mpn: QN-BOMB\n    maker: *i")
    path = folder / "bomb.yaml"
    path.write_text("\n".join(lines) + "\n", encoding="utf-8")
    return path


def _deep_yaml(folder: Path) -> Path:
    path = folder / "deep.yaml"
    path.write_text("parts:\n  - mpn: " + "[" * 10_000 + "]" * 10_000 + "\n", encoding="utf-8")
    return path


def _deep_block_yaml(folder: Path) -> Path:
    # Block style nests by indentation: 10 000 levels of "k:" mappings.
    path = folder / "deep_block.yaml"
    path.write_text("".join(" " * depth + "k:\n" for depth in range(10_000)), encoding="utf-8")
    return path


def _sparse(name: str, size: int) -> Callable[[Path], Path]:
    def build(folder: Path) -> Path:
        path = folder / name
        with open(path, "wb") as handle:
            handle.write((HEADER + "\n" + GOOD_ROWS[0] + "\n").encode())
            handle.truncate(size)  # sparse: costs no disk, reads as NUL bytes
        return path

    return build


def _dev_zero_link(folder: Path) -> Path:
    path = folder / "endless.csv"
    path.symlink_to("/dev/zero")  # endless input behind a catalog's name
    return path


def _good_plus(name: str, *bad: str) -> Callable[[Path], Path]:
    return _lines(name, [GOOD_ROWS[0], *bad, GOOD_ROWS[1]])


CASES = [
    Case("empty", _bytes("empty.csv", b""), 2, None, "empty"),
    Case("header only", _lines("header.csv", []), 0, 0),
    Case("binary garbage", _bytes("garbage.csv", _garbage(20_000)), 2, None, "not a text table"),
    Case("binary garbage yaml", _bytes("garbage.yaml", _garbage(20_000)), 2, None, "not a text"),
    Case(
        "NUL bytes in one cell",
        _good_plus("nul.csv", part_row("QN-NUL", esr="4\x000 ohm")),
        1,
        2,
        "expected a resistance",
    ),
    Case("5 MB single field", _huge_field, 1, 2, "longer than"),
    Case(
        "unbalanced quote",
        _good_plus("quote.csv", '"' + part_row("QN-QUOTE")),
        1,
        2,
        "unbalanced quote",
    ),
    Case(
        "duplicate headers",
        _bytes(
            "dup_header.csv",
            f"{HEADER},esr\n{GOOD_ROWS[0]},99 ohm\n{GOOD_ROWS[1]},99 ohm\n".encode(),
        ),
        0,  # a warning: the first column is read, rows load
        2,
        "twice",
    ),
    Case(
        "duplicate part numbers, different data",
        _good_plus("dup_mpn.csv", part_row("QN16-A", esr="60 ohm")),
        1,
        2,
        "different esr",
    ),
    Case("mixed encodings", _mixed_encoding, 0, 4, "Windows-1252"),  # a warning, rows load
    Case("European spreadsheet export", _european, 0, 2),
    Case(
        "wrong dimension",
        _good_plus("dimension.csv", part_row("QN-DIM", esr="16 MHz")),
        1,
        2,
        "expected a resistance",
    ),
    Case(
        "negative ESR",
        _good_plus("negative.csv", part_row("QN-NEG", esr="-40 ohm")),
        1,
        2,
        "negative",
    ),
    Case("NaN ESR", _good_plus("nan.csv", part_row("QN-NAN", esr="NaN")), 1, 2, "missing"),
    Case(
        "infinite frequency",
        _good_plus("inf.csv", part_row("QN-INF", frequency="inf MHz")),
        1,
        2,
        "expected",
    ),
    Case(
        "overflowing number",
        _good_plus("overflow.csv", part_row("QN-BIGE", esr="1e999")),
        1,
        2,
        "expected",
    ),
    Case("YAML alias bomb", _alias_bomb, 2, None, "alias"),
    Case("YAML scalar", _bytes("scalar.yaml", b"just a sentence\n"), 2, None, "single value"),
    Case("YAML 10k nested flow", _deep_yaml, 2, None, "nest"),
    Case("YAML 10k nested block", _deep_block_yaml, 2, None, "nest"),
    Case(
        "over the size limit (sparse 600 MiB)",
        # Just over the reader's 512 MiB file limit (catalog.rawtable.Limits.max_file_bytes).
        _sparse("big.csv", 600 * 1024 * 1024),
        2,
        None,
        "larger than",
    ),
    Case(
        "far over the size limit (sparse 8 GB)",
        _sparse("huge.csv", 8 * 1024**3),
        2,
        None,
        "larger than",
    ),
    Case("endless input (/dev/zero)", _dev_zero_link, 2, None, "larger than"),
    Case(
        "named pipe with no writer", lambda folder: make_fifo(folder, "pipe.csv"), 2, None, "pipe"
    ),
]


def _check_row_problems(problems: list[dict[str, object]], path: Path) -> None:
    """Every problem names its file; a problem about a row names line, field and raw text."""
    for problem in problems:
        assert problem["path"] == str(path)
        assert problem["severity"] in ("error", "warning")
        assert problem["message"]
        if problem["field"] is not None:  # a finding about one cell of one row
            assert isinstance(problem["line"], int) and problem["line"] >= 1
            assert problem["raw"] is not None
        if problem["severity"] == "error":  # a row was dropped: say which and why
            assert isinstance(problem["line"], int)


@pytest.mark.parametrize("case", CASES, ids=[case.name for case in CASES])
def test_lint_json(case: Case, corpus: Path, run_cli: RunCli) -> None:
    path = case.build(corpus)
    table = run_cli("lint", str(path))  # the table format: same exit code, no traceback
    assert table.code == case.lint_code, table.err
    run = run_cli("lint", str(path), "--format", "json")
    assert run.code == case.lint_code, run.err
    if case.rows_loaded is None:
        assert run.out == ""
        (line,) = run.err.splitlines()  # one line, naming the file and what is wrong
        assert path.name in line and case.words in line
        return
    report = run.json()
    assert isinstance(report, dict)
    assert report["rows_loaded"] == case.rows_loaded
    (file_report,) = report["files"]
    assert file_report["path"] == str(path)
    assert file_report["rows_loaded"] == case.rows_loaded
    problems = report["problems"]
    _check_row_problems(problems, path)
    errors = [p for p in problems if p["severity"] == "error"]
    assert bool(errors) == (case.lint_code == 1)
    if case.words:
        assert any(case.words in str(p["message"]) for p in problems), problems
    # A problem quotes the raw text, clipped: the report must not echo a 5 MB cell.
    assert len(run.out) < 100_000


@pytest.mark.parametrize("case", CASES, ids=[case.name for case in CASES])
def test_rank(case: Case, corpus: Path, run_cli: RunCli, brief_file: Path) -> None:
    path = case.build(corpus)
    run = run_cli(
        "rank", "--catalog", str(path), "--brief", str(brief_file), "--format", "json", "--all"
    )
    if not case.rows_loaded:  # unusable, or no parts at all: exit 2, one line
        assert run.code == 2
        assert run.out == ""
        assert path.name in run.err
        run = run_cli("analyze", "QN16-A", "--catalog", str(path), "--brief", str(brief_file))
        assert run.code == 2 and run.out == "" and path.name in run.err
        return
    assert run.code == 0, run.err
    ranked = run.json()
    assert isinstance(ranked, list) and len(ranked) == case.rows_loaded
    if case.lint_code == 1:  # the rows that were skipped are mentioned, not hidden
        assert "catalog problems" in run.err


@pytest.mark.parametrize("case", CASES, ids=[case.name for case in CASES])
def test_library(case: Case, corpus: Path) -> None:
    path = case.build(corpus)
    before = snapshot(corpus)
    start = time.perf_counter()
    with bounded():
        try:
            result = load_catalogs([path])
        except CatalogError as error:
            assert case.rows_loaded is None, str(error)
            assert str(path) in str(error) and case.words in str(error)
            assert "\n" not in str(error)
            assert snapshot(corpus) == before
            return
    assert snapshot(corpus) == before
    assert time.perf_counter() - start < 20.0
    assert case.rows_loaded is not None
    assert len(result.parts) == case.rows_loaded
    assert result.parts["mpn"].is_unique


def test_good_values_survive_the_export_quirks(corpus: Path) -> None:
    """Decimal commas, BOM and a Windows-1252 line give the same SI numbers as clean text."""
    european = load_catalogs([_european(corpus)]).parts.set_index("mpn")
    assert european.loc["QN16-EU1", "load_capacitance_f"] == pytest.approx(12.5e-12)
    assert european.loc["QN16-EU1", "c1_f"] == pytest.approx(5.5e-15)
    assert european.loc["QN32K-EU2", "freq_hz"] == pytest.approx(32768.0)
    assert european.loc["QN16-EU1", "price"] == pytest.approx(0.30)
    mixed = load_catalogs([_mixed_encoding(corpus)]).parts.set_index("mpn")
    assert mixed.loc["QN16-MU", "drive_level_w"] == pytest.approx(150e-6)  # the cp1252 'µ'
    assert mixed.loc["QN16-OHM", "esr_ohm"] == pytest.approx(40.0)  # UTF-8 'Ω' on another line


def test_duplicate_part_number_keeps_the_first_and_says_where(
    corpus: Path, run_cli: RunCli
) -> None:
    path = write_catalog(corpus, "dup.csv", [GOOD_ROWS[0], part_row("QN16-A", esr="60 ohm")])
    report = run_cli("lint", str(path), "--format", "json").json()
    assert isinstance(report, dict)
    (error,) = [p for p in report["problems"] if p["severity"] == "error"]
    assert (error["line"], error["field"], error["raw"]) == (3, "mpn", "QN16-A")
    assert f"{path}:2" in error["message"]  # points at the row that was kept
    parts = load_catalogs([path]).parts
    assert parts["esr_ohm"].tolist() == [40.0]  # the first row's data, not the later one


def test_yaml_language_tag_runs_nothing(corpus: Path, run_cli: RunCli) -> None:
    marker = corpus.parent / "marker-from-yaml"
    payloads = [
        f"parts:\n  - mpn: !!python/object/apply:os.system ['touch {marker}']\n",
        f"!!python/object/apply:os.system ['touch {marker}']\n",
        f"parts:\n  - !!python/object/new:subprocess.Popen [['touch', '{marker}']]\n",
        f"parts:\n  - mpn: QN-TAG\n"
        f"    maker: !!python/object/apply:pathlib.Path.touch ['{marker}']\n",
    ]
    for index, text in enumerate(payloads):
        path = corpus / f"tag{index}.yaml"
        path.write_text(text, encoding="utf-8")
        run = run_cli("lint", str(path), "--format", "json")
        assert run.code in (1, 2)  # reported, never constructed
        assert "not allowed" in run.out + run.err
        with bounded(), contextlib.suppress(CatalogError):
            load_catalogs([path])
    assert not marker.exists()


def test_directory_missing_path_and_mixtures(corpus: Path, run_cli: RunCli) -> None:
    empty = corpus / "empty_folder"
    empty.mkdir()
    run = run_cli("lint", str(empty))
    assert run.code == 2 and "empty_folder" in run.err
    missing = corpus / "no_such.csv"
    run = run_cli("lint", str(missing))
    assert run.code == 2 and "no_such.csv" in run.err and "no such" in run.err
    run = run_cli("rank", "--catalog", str(missing))
    assert run.code == 2 and "no_such.csv" in run.err

    # A folder of good and bad files: the good rows load, the bad file is a problem.
    folder = corpus / "mixed_folder"
    folder.mkdir()
    write_catalog(folder, "a_good.csv", GOOD_ROWS[:2])
    (folder / "b_garbage.csv").write_bytes(_garbage(5000))
    write_catalog(folder, "c_partly.csv", [GOOD_ROWS[2], part_row("QN-X", esr="16 MHz")])
    (folder / "notes.txt").write_text("not a catalog\n", encoding="utf-8")
    report = run_cli("lint", str(folder), "--format", "json").json()
    assert isinstance(report, dict)
    assert report["rows_loaded"] == 3
    assert [Path(f["path"]).name for f in report["files"]] == [
        "a_good.csv",
        "b_garbage.csv",
        "c_partly.csv",
    ]
    garbage = [p for p in report["problems"] if p["path"].endswith("b_garbage.csv")]
    assert garbage and garbage[0]["severity"] == "error"
    assert len(load_catalogs([folder]).parts) == 3

    # A usable file beside a missing one: problems found (exit 1), the good rows load.
    good = write_catalog(corpus, "good.csv", GOOD_ROWS)
    run = run_cli("lint", str(good), str(missing), "--format", "json")
    assert run.code == 1
    report = run.json()
    assert isinstance(report, dict) and report["rows_loaded"] == len(GOOD_ROWS)
    assert any(p["path"] == str(missing) for p in report["problems"])


def test_clean_catalog_lints_clean(corpus: Path, run_cli: RunCli) -> None:
    """The control case: without it every test above could pass on a reader that fails all."""
    path = write_catalog(corpus, "clean.csv", GOOD_ROWS)
    run = run_cli("lint", str(path), "--format", "json")
    assert run.code == 0
    report = run.json()
    assert isinstance(report, dict)
    assert report["rows_loaded"] == len(GOOD_ROWS) and report["problems"] == []


def test_many_bad_rows_among_good_ones(corpus: Path, run_cli: RunCli) -> None:
    """Every other row bad in a different way: every good row loads, every bad one is named."""
    bad_cells = ["16 MHz", "-40 ohm", "NaN", "inf", "abc", "", "40 ohm ohm", "1e999", "4\x000"]
    rows: list[str] = []
    for index in range(200):
        if index % 2:
            rows.append(part_row(f"QN-BAD{index}", esr=bad_cells[index % len(bad_cells)]))
        else:
            rows.append(part_row(f"QN-OK{index}"))
    path = write_catalog(corpus, "many.csv", rows)
    report = run_cli("lint", str(path), "--format", "json").json()
    assert isinstance(report, dict)
    assert report["rows_loaded"] == 100
    errors = [p for p in report["problems"] if p["severity"] == "error"]
    assert sorted(p["line"] for p in errors) == list(range(3, 202, 2))  # line 1 is the header
    assert all(p["field"] == "esr" for p in errors)
    loaded = load_catalogs([path]).parts
    assert sorted(loaded["mpn"]) == sorted(f"QN-OK{i}" for i in range(0, 200, 2))
    # Each part's recorded line points at its own row.
    assert all(int(line) % 2 == 0 for line in loaded["source_line"])


def test_size_limit_is_checked_before_reading(corpus: Path) -> None:
    """A file far over the limit is refused from its size alone, in well under a second."""
    path = _sparse("huge.csv", 64 * 1024**3)(corpus)
    start = time.perf_counter()
    with bounded(), pytest.raises(CatalogError, match="larger than"):
        load_catalogs([path])
    assert time.perf_counter() - start < 1.0
    assert os.stat(path).st_blocks < 100  # still sparse: nothing was written to it


@pytest.mark.parametrize(
    ("field", "cell", "words"),
    [
        ("esr", "16 MHz", "expected a resistance"),
        ("esr", "-40 ohm", "negative"),
        ("frequency", "16 pF", "expected a frequency"),
        ("load_capacitance", "inf pF", "expected"),
        ("tolerance", "ten ppm", "expected"),
        ("temp_max", "85 ohm", "expected a temperature"),
    ],
)
def test_row_problem_quotes_line_field_and_raw_text(
    corpus: Path, run_cli: RunCli, field: str, cell: str, words: str
) -> None:
    columns = HEADER.split(",")
    cells = part_row("QN-ONE").split(",")
    cells[columns.index(field)] = cell
    path = write_catalog(corpus, "one.csv", [GOOD_ROWS[0], GOOD_ROWS[1], ",".join(cells)])
    report = run_cli("lint", str(path), "--format", "json").json()
    assert isinstance(report, dict)
    (problem,) = [p for p in report["problems"] if p["severity"] == "error"]
    assert (problem["path"], problem["line"], problem["field"]) == (str(path), 4, field)
    assert problem["raw"] == cell and words in problem["message"]
    assert report["rows_loaded"] == 2


def test_hostile_mapping_files(corpus: Path, run_cli: RunCli) -> None:
    """The --map file is the user's too: endless, piped, binary or a folder gives exit 2."""
    catalog = write_catalog(corpus, "parts.csv", GOOD_ROWS)
    endless = corpus / "endless_map.yaml"
    endless.symlink_to("/dev/zero")
    garbage = corpus / "garbage_map.yaml"
    garbage.write_bytes(_garbage(3000))
    folder = corpus / "map_folder"
    folder.mkdir()
    cases = [
        (make_fifo(corpus, "pipe_map.yaml"), "maps headers to fields"),
        (endless, "larger than"),
        (garbage, "mapping file"),
        (folder, "cannot read"),
    ]
    for mapping, words in cases:
        run = run_cli("lint", str(catalog), "--map", str(mapping))
        assert run.code == 2 and mapping.name in run.err and words in run.err, run.err
        run = run_cli("rank", "--catalog", str(catalog), "--map", str(mapping))
        assert run.code == 2 and mapping.name in run.err


def test_alternates_json_with_a_brief_is_valid_json(
    corpus: Path, run_cli: RunCli, brief_file: Path
) -> None:
    """A part whose new caps cannot be computed (NaN) must still give strict JSON (RFC 8259
    has no NaN), not an 'unexpected error'."""
    rows = [
        *GOOD_ROWS,
        part_row("QN16-HI").replace("8 pF", "30 pF"),
        part_row("QN16-SER").replace("8 pF", "series"),
        part_row("QN12-X", frequency="12 MHz"),  # another frequency: no caps can match
    ]
    catalog = write_catalog(corpus, "parts.csv", rows)
    run = run_cli(
        "alternates", "QN16-A", "--catalog", str(catalog), "--brief", str(brief_file),
        "--format", "json",
    )  # fmt: skip
    assert run.code in (0, 1), run.err
    assert "unexpected error" not in run.err
    alternates = run.json()
    assert isinstance(alternates, list) and len(alternates) == len(rows) - 1
    other = next(a for a in alternates if a["mpn"] == "QN12-X")
    assert other["fit"] == "incompatible" and other["new_caps_f"] in (None, [None, None])
