"""Hostile and broken inputs: only CatalogError or a LoadResult comes out, never a hang.

The corpus is generated here in tmp_path. Every case also checks that the file was not
modified by reading it. The YAML alias bomb is the exponential-entity construction known
as "billion laughs" (first described for XML entities; the same shape works with YAML
anchors, from memory); the "!!python/object" tags are PyYAML's documented language tags,
which its full/unsafe loaders would construct.
"""

from __future__ import annotations

import contextlib
import hashlib
import os
import time
from collections.abc import Callable
from pathlib import Path

import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from catalog.csv_reader import read_csv_table
from catalog.problems import CatalogError
from catalog.reader import LoadResult, load_catalogs
from catalog.yaml_reader import read_yaml_table

from .conftest import DEMO_HEADER, GOOD_ROW

Write = Callable[[str, bytes | str], Path]


def _load_or_error(path: Path) -> LoadResult | CatalogError:
    digest = hashlib.sha256(path.read_bytes()).hexdigest() if path.is_file() else None
    try:
        outcome: LoadResult | CatalogError = load_catalogs([path])
    except CatalogError as error:
        outcome = error
    if digest is not None:
        assert hashlib.sha256(path.read_bytes()).hexdigest() == digest
    return outcome


@pytest.mark.parametrize(
    ("name", "content", "message"),
    [
        ("empty.csv", b"", "empty file"),
        ("blank.csv", b"\n\n  \n", "empty file"),
        ("garbage.csv", bytes(range(256)) * 64, "not a text table"),
        ("workbook.csv", b"PK\x03\x04" + b"\x00" * 200, "export the sheet as CSV"),
        ("one_column.csv", b"just\nsome\nwords\n", "no header row"),
        ("empty.yaml", b"", "empty file"),
        ("scalar.yaml", b"hello\n", "single value"),
        ("garbage.yaml", bytes(range(256)) * 64, "not a text table"),
    ],
)
def test_unusable_files_raise_catalog_error(
    write: Write, name: str, content: bytes, message: str
) -> None:
    outcome = _load_or_error(write(name, content))
    assert isinstance(outcome, CatalogError)
    assert message in str(outcome)
    assert name in str(outcome)  # the message names the file


def test_header_only_is_fine(write: Write) -> None:
    outcome = _load_or_error(write("h.csv", DEMO_HEADER + "\n"))
    assert isinstance(outcome, LoadResult) and outcome.parts.empty
    assert outcome.problems == ()


def test_nul_bytes_spoil_only_their_cells(write: Write) -> None:
    data = (
        f"{DEMO_HEADER}\n{GOOD_ROW}\n".encode()
        + GOOD_ROW.replace("ZX-16A", "ZX-16B").replace(",80,", ",8\x000,").encode()
        + b"\n"
    )
    outcome = _load_or_error(write("nul.csv", data))
    assert isinstance(outcome, LoadResult)
    assert list(outcome.parts["mpn"]) == ["ZX-16A"]  # "8\x000" is not silently "80"
    assert any("NUL" in p.message for p in outcome.problems)
    assert any(p.field == "esr" and p.line == 3 for p in outcome.problems)


def test_five_megabyte_field_is_a_problem_not_a_hang(write: Write) -> None:
    huge = "x" * (5 * 1024 * 1024)
    text = f'{DEMO_HEADER}\n{GOOD_ROW}\n"{huge}",{GOOD_ROW.split(",", 1)[1]}\n'
    text += GOOD_ROW.replace("ZX-16A", "ZX-16C") + "\n"
    start = time.perf_counter()
    outcome = _load_or_error(write("huge.csv", text))
    assert time.perf_counter() - start < 10.0
    assert isinstance(outcome, LoadResult)
    assert list(outcome.parts["mpn"]) == ["ZX-16A", "ZX-16C"]
    (problem,) = [p for p in outcome.problems if p.severity == "error"]
    assert problem.line == 3 and "longer than" in problem.message


def test_unbalanced_quote_spoils_one_row(write: Write) -> None:
    text = (
        f"{DEMO_HEADER}\n{GOOD_ROW}\n"
        + '"ZX-BAD,Zyxo,16 MHz,12,10,20,-40 to 85 °C,80,3225,3,5\n'
        + GOOD_ROW.replace("ZX-16A", "ZX-16C")
        + "\n"
    )
    outcome = _load_or_error(write("quote.csv", text))
    assert isinstance(outcome, LoadResult)
    assert list(outcome.parts["mpn"]) == ["ZX-16A", "ZX-16C"]
    (problem,) = [p for p in outcome.problems if p.severity == "error"]
    assert problem.line == 3 and "unbalanced quote" in problem.message


def test_duplicate_headers_are_reported(write: Write) -> None:
    text = f"{DEMO_HEADER},ESR max (Ω)\n{GOOD_ROW},999\n"
    outcome = _load_or_error(write("dup.csv", text))
    assert isinstance(outcome, LoadResult)
    assert outcome.parts["esr_ohm"].iloc[0] == 80.0  # the first column is read
    assert any("appears twice" in p.message for p in outcome.problems)


def test_file_size_cap(write: Write, monkeypatch: pytest.MonkeyPatch) -> None:
    from catalog import reader
    from catalog.rawtable import Limits

    path = write("big.csv", f"{DEMO_HEADER}\n{GOOD_ROW}\n" * 100)
    outcome = reader.load_catalogs_with_status([path], limits=Limits(max_file_bytes=1000))
    assert outcome.unusable == (str(path),)
    assert "larger than" in outcome.result.problems[0].message


def test_directory_and_missing_path(tmp_path: Path) -> None:
    assert isinstance(_load_or_error(tmp_path), CatalogError)
    assert isinstance(_load_or_error(tmp_path / "nope.csv"), CatalogError)


@pytest.mark.parametrize(
    "text",
    [
        "parts:\n  - mpn: !!python/object/apply:os.system ['true']\n",
        "!!python/object/new:os.system ['true']\n",
        "parts:\n  - !!python/name:os.system\n",
        "parts:\n  - mpn: !custom x\n",
    ],
)
def test_yaml_language_tags_never_constructed(write: Write, text: str) -> None:
    outcome = _load_or_error(write("tags.yaml", text))
    if isinstance(outcome, LoadResult):
        assert outcome.parts.empty
        assert any("not allowed" in p.message for p in outcome.problems)
    else:
        assert "not allowed" in str(outcome)


def test_yaml_alias_bomb_is_fast(write: Write) -> None:
    lines = ['a: &a ["lol","lol","lol","lol","lol","lol","lol","lol","lol"]']
    for level in "bcdefghi":
        previous = chr(ord(level) - 1)
        lines.append(f"{level}: &{level} [" + ",".join([f"*{previous}"] * 9) + "]")
    lines.append("parts:\n  - mpn: Z\n    notes: *i")
    start = time.perf_counter()
    outcome = _load_or_error(write("bomb.yaml", "\n".join(lines) + "\n"))
    assert time.perf_counter() - start < 5.0
    assert isinstance(outcome, CatalogError)


def test_yaml_deep_nesting(write: Write) -> None:
    assert isinstance(_load_or_error(write("deep.yaml", "[" * 100000 + "\n")), CatalogError)


@pytest.mark.parametrize(
    ("cell", "words"),
    [
        ("16 MHz", "expected a resistance"),
        ("-80", "negative"),
        ("NaN ohm", "expected"),
        ("inf", "expected"),
        ("1e999", "expected"),
        ("80 ohm ohm", "expected"),
    ],
)
def test_wrong_dimension_negative_nan_inf_cells(write: Write, cell: str, words: str) -> None:
    text = f"{DEMO_HEADER}\n{GOOD_ROW.replace(',80,', f',{cell},')}\n"
    outcome = _load_or_error(write("v.csv", text))
    assert isinstance(outcome, LoadResult) and outcome.parts.empty
    assert words in outcome.problems[0].message


_RANDOM = settings(
    max_examples=150,
    deadline=None,
    suppress_health_check=[HealthCheck.too_slow, HealthCheck.function_scoped_fixture],
)


@_RANDOM
@given(data=st.binary(max_size=2000), suffix=st.sampled_from([".csv", ".yaml"]))
def test_random_bytes_give_catalog_error_or_result(
    data: bytes, suffix: str, tmp_path: Path
) -> None:
    path = tmp_path / f"random{suffix}"
    path.write_bytes(data)
    _load_or_error(path)
    reader = read_csv_table if suffix == ".csv" else read_yaml_table
    with contextlib.suppress(CatalogError):
        reader(path)
    os.remove(path)


_CSV_ALPHABET = st.sampled_from([*list(',;\t"\n\r x1-.°Ωµ±pFMHzkohmppm'), "\x00", "\ufeff"])


@_RANDOM
@given(body=st.text(alphabet=_CSV_ALPHABET, max_size=400))
def test_random_table_text_gives_catalog_error_or_result(body: str, tmp_path: Path) -> None:
    path = tmp_path / "table.csv"
    path.write_bytes((DEMO_HEADER + "\n" + body).encode("utf-8"))
    outcome = _load_or_error(path)
    if isinstance(outcome, LoadResult):
        assert outcome.parts["mpn"].is_unique
    os.remove(path)


_YAML_PIECES = st.sampled_from(
    [
        *"-:&*!<[]{}\n #'\".x1",
        "mpn",
        "parts",
        "  ",
        "!!python/object ",
        "<<",
        "&a ",
        "*a",
        "freq: 16 MHz",
        "\n  - ",
    ]
)


@_RANDOM
@given(pieces=st.lists(_YAML_PIECES, max_size=80))
def test_random_yaml_text_gives_catalog_error_or_result(pieces: list[str], tmp_path: Path) -> None:
    path = tmp_path / "table.yaml"
    path.write_bytes("".join(pieces).encode("utf-8"))
    _load_or_error(path)
    os.remove(path)


def test_fifo_without_writer_is_refused_not_waited_on(tmp_path: Path) -> None:
    fifo = tmp_path / "pipe.csv"
    os.mkfifo(fifo)
    start = time.perf_counter()
    outcome = _load_or_error(fifo)
    assert isinstance(outcome, CatalogError) and "pipe" in str(outcome)
    assert time.perf_counter() - start < 5.0


def test_problem_raw_text_is_clipped(write: Write) -> None:
    text = f"{DEMO_HEADER}\n{GOOD_ROW.replace(',80,', ',' + 'z' * 20000 + ',')}\n"
    outcome = _load_or_error(write("long.csv", text))
    assert isinstance(outcome, LoadResult)
    assert all(len(p.raw or "") <= 200 for p in outcome.problems)
    assert all(len(p.message) <= 400 for p in outcome.problems)
