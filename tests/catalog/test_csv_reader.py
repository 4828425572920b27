"""CSV reading: delimiters, encodings, decimal commas, quoted line breaks, line numbers.

Expected bytes are written by hand in each test. Encodings per the Unicode Standard
(UTF-8 BOM EF BB BF; UTF-16LE BOM FF FE) and the Windows-1252 code page table published by
Unicode (0xB0 = DEGREE SIGN; Windows-1252 has no Ω, so a cp1252 file writes "ohm").
"""

from __future__ import annotations

import csv
import io
from collections.abc import Callable
from pathlib import Path

import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from catalog import csv_reader
from catalog.csv_reader import read_csv_table, sniff_delimiter
from catalog.problems import CatalogError
from catalog.reader import load_catalogs

from .conftest import DEMO_HEADER, GOOD_ROW

Write = Callable[[str, bytes | str], Path]


def _cells(table_path: Path) -> list[list[str]]:
    table = read_csv_table(table_path)
    return [list(map(str, column)) for column in table.columns]


@pytest.mark.parametrize("delimiter", [",", ";", "\t"])
def test_each_delimiter(write: Write, delimiter: str) -> None:
    header = DEMO_HEADER.replace(",", delimiter)
    row = GOOD_ROW.replace(",", delimiter)
    result = load_catalogs([write("parts.csv", f"{header}\n{row}\n")])
    assert list(result.parts["mpn"]) == ["ZX-16A"]
    assert result.parts["esr_ohm"].iloc[0] == 80.0
    assert result.problems == ()


def test_sniffer_ignores_delimiters_inside_quotes() -> None:
    lines = ["a;b;c", '"1,5";"2,5";"x,y,z"', "1;2;3"]
    assert sniff_delimiter(lines) == ";"
    assert sniff_delimiter(["a,b\tc,d", "1,2\t3,4"]) == ","


def test_excel_sep_hint_is_honoured(write: Write) -> None:
    text = "sep=;\n" + DEMO_HEADER.replace(",", ";") + "\n" + GOOD_ROW.replace(",", ";") + "\n"
    result = load_catalogs([write("parts.csv", text)])
    assert list(result.parts["source_line"]) == [3]


def test_semicolon_file_with_decimal_commas(write: Write) -> None:
    text = (
        "Part Number;Freq;CL;Tolerance;Stability;Temp Min;Temp Max;ESR;Package\n"
        "ZX-1;14,31818 MHz;12,5 pF;±10 ppm;±20 ppm;-40 °C;85 °C;60 Ω;3225\n"
    )
    parts = load_catalogs([write("parts.csv", text.encode("utf-8"))]).parts
    assert parts["freq_hz"].iloc[0] == pytest.approx(14.31818e6)
    assert parts["load_capacitance_f"].iloc[0] == pytest.approx(12.5e-12)


def test_utf8_with_bom(write: Write) -> None:
    data = b"\xef\xbb\xbf" + f"{DEMO_HEADER}\n{GOOD_ROW}\n".encode()
    table = read_csv_table(write("bom.csv", data))
    assert table.headers[0] == "Part Number"  # BOM not glued to the first header
    assert load_catalogs([write("bom.csv", data)]).problems == ()


def test_cp1252_degree_sign_and_ohm_word(write: Write) -> None:
    # 0xB0 is ° in Windows-1252 and not valid UTF-8 on its own.
    data = (
        b"Part Number,Freq,CL,Tol,Stability,Op Temp Min (\xb0C),Op Temp Max (\xb0C),ESR,Package\n"
        b"ZX-2,16 MHz,12 pF,10,20,-40 \xb0C,85,80 ohm,3225\n"
    )
    result = load_catalogs([write("win.csv", data)])
    assert result.parts["temp_min_c"].iloc[0] == -40.0
    assert result.problems == ()  # a consistent single encoding is not a problem


def test_cp1252_micro_sign(write: Write) -> None:
    # 0xB5 is µ (MICRO SIGN) in Windows-1252.
    data = DEMO_HEADER.encode() + b",Drive (\xb5W)\n" + GOOD_ROW.encode("cp1252") + b",100\n"
    # GOOD_ROW holds "±" (0xB1) and "°" (0xB0), both in Windows-1252; "Ω" is not, so
    # the test header's Ω forces a mixed file: replace it first.
    data = data.replace("Ω".encode(), b"ohm")
    parts = load_catalogs([write("win.csv", data)]).parts
    assert parts["drive_level_w"].iloc[0] == pytest.approx(100e-6)


def test_utf16_with_bom(write: Write) -> None:
    data = f"{DEMO_HEADER}\r\n{GOOD_ROW}\r\n".replace(",", "\t").encode("utf-16")
    result = load_catalogs([write("unicode.txt", data)])
    assert list(result.parts["mpn"]) == ["ZX-16A"]


def test_mixed_encodings_warn_and_load(write: Write) -> None:
    data = (
        f"{DEMO_HEADER}\n{GOOD_ROW}\n".encode()
        + GOOD_ROW.replace("ZX-16A", "ZX-16B").replace("Ω", "").encode("cp1252")
        + b"\n"
    )
    result = load_catalogs([write("mixed.csv", data)])
    assert list(result.parts["mpn"]) == ["ZX-16A", "ZX-16B"]
    assert any("mixes encodings" in p.message for p in result.problems)


def test_quoted_line_breaks_keep_physical_line_numbers(write: Write) -> None:
    text = (
        f"{DEMO_HEADER}\n"
        f"{GOOD_ROW}\n"
        '"ZX-16B\nsecond line",Zyxo,16 MHz,12,10,20,-40 to 85 °C,80,3225,3,5\n'
        "\n"
        "ZX-16C,Zyxo,16 MHz,12,10,20,-40 to 85 °C,bad,3225,3,5\n"
    )
    result = load_catalogs([write("lines.csv", text)])
    assert list(result.parts["source_line"]) == [2, 3]
    (problem,) = result.problems
    assert (problem.line, problem.field, problem.raw) == (6, "esr", "bad")


def test_title_lines_above_header_are_skipped(write: Write) -> None:
    text = f"Invented crystal list\n\n{DEMO_HEADER}\n{GOOD_ROW}\n"
    result = load_catalogs([write("titled.csv", text)])
    assert list(result.parts["source_line"]) == [4]
    assert any("above the header skipped" in p.message for p in result.problems)


def test_row_with_unquoted_decimal_comma_is_refused_not_shifted(write: Write) -> None:
    text = (
        "Part Number,Freq,CL (pF),Tol,Stability,Temp Range,ESR,Package\n"
        "ZX-1,16 MHz,12,5,10,20,-40 to 85,80,3225\n"
        "ZX-2,16 MHz,12,10,20,-40 to 85,80,3225\n"
    )
    result = load_catalogs([write("shift.csv", text)])
    assert list(result.parts["mpn"]) == ["ZX-2"]
    (problem,) = [p for p in result.problems if p.severity == "error"]
    assert problem.line == 2 and "extra" in problem.message


def test_short_rows_are_padded(write: Write) -> None:
    text = f"{DEMO_HEADER},Notes\n{GOOD_ROW}\n"
    result = load_catalogs([write("short.csv", text)])
    assert len(result.parts) == 1


def test_fast_and_careful_paths_agree_on_quoted_line_breaks(write: Write) -> None:
    # No blank line: the columnar path reads this file; the blank line sends the same
    # rows through the careful path. Both must give the same cells and physical lines.
    rows = [
        GOOD_ROW,
        '"ZX-16B\nsecond\nthird",Zyxo,16 MHz,12,10,20,-40 to 85 °C,80,3225,3,5',
        GOOD_ROW.replace("ZX-16A", "ZX-16C"),
        'ZX-16D,"Zy\nxo",16 MHz,12,10,20,-40 to 85 °C,80,3225,3,5',
        GOOD_ROW.replace("ZX-16A", "ZX-16E"),
    ]
    fast = load_catalogs([write("fast.csv", DEMO_HEADER + "\n" + "\n".join(rows) + "\n")])
    assert list(fast.parts["source_line"]) == [2, 3, 6, 7, 9]
    careful = load_catalogs(
        [
            write(
                "careful.csv",
                DEMO_HEADER
                + "\n"
                + "\n".join(rows)
                + "\n\n"
                + GOOD_ROW.replace("ZX-16A", "ZX-16F")
                + "\n",
            )
        ]
    )
    assert list(careful.parts["source_line"]) == [2, 3, 6, 7, 9, 11]
    assert list(careful.parts["mpn"])[:5] == list(fast.parts["mpn"])
    assert fast.parts["maker"].iloc[3] == "Zy\nxo"


_CELL = st.text(alphabet=st.sampled_from(list('ab1 ,;"\n°Ω-.')), max_size=8)


@settings(
    max_examples=60,
    deadline=None,
    suppress_health_check=[HealthCheck.too_slow, HealthCheck.function_scoped_fixture],
)
@given(rows=st.lists(st.lists(_CELL, min_size=3, max_size=3), max_size=12))
def test_columnar_and_careful_paths_agree(
    rows: list[list[str]], tmp_path: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    # Python's csv.writer (the reference RFC 4180 writer) quotes the cells; both read
    # paths must return the same cells at the same physical lines.
    buffer = io.StringIO()
    writer = csv.writer(buffer, lineterminator="\n")
    writer.writerow(["Part Number", "Maker", "Package"])
    writer.writerows(rows)
    path = tmp_path / "t.csv"
    path.write_text(buffer.getvalue(), encoding="utf-8")

    def outcome() -> object:
        try:
            table = read_csv_table(path)
        except CatalogError as error:
            return str(error)
        cells = [[str(cell) for cell in column] for column in table.columns]
        kept = [i for i in range(table.row_count) if i not in table.bad_rows]
        return (
            [[column[i] for i in kept] for column in cells],
            [int(table.lines[i]) for i in kept],
        )

    fast = outcome()
    monkeypatch.setattr(csv_reader, "_read_fast", lambda *args: None)
    careful = outcome()
    assert fast == careful
