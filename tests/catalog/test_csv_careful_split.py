"""The careful CSV path splits rows exactly as Python's csv module does.

Reference: the standard library's ``csv.reader`` (RFC 4180-style quoting), which the
careful path used for every row; rows without quotes or line breaks are now split with
``str.split`` and must come out the same.
"""

from __future__ import annotations

import csv

from hypothesis import given, settings
from hypothesis import strategies as st

from catalog.csv_reader import split_csv_text

# Cell text: letters, digits, spaces, unit signs, NUL and other control characters; no
# quote, no line break and no delimiter candidate (those make a different row).
_CELL = st.text(
    alphabet=st.characters(
        blacklist_characters='"\r\n\t,;', blacklist_categories=("Cs",), max_codepoint=0x2FF
    ),
    max_size=8,
)


@settings(max_examples=300, deadline=None)
@given(
    rows=st.lists(st.lists(_CELL, min_size=2, max_size=5), min_size=1, max_size=12),
    delimiter=st.sampled_from([",", ";"]),
)
def test_careful_rows_match_csv_reader(rows: list[list[str]], delimiter: str) -> None:
    header = delimiter.join(["Part Number", "Frequency", "ESR"])
    lines = [delimiter.join(cells) for cells in rows]
    # An unbalanced quote on the first data row sends the whole file to the careful path.
    text = "\n".join([header, '"X1' + delimiter + "2", *lines]) + "\n"
    records, starts, _problems, _bad, used = split_csv_text(text, path="t.csv")
    assert used == delimiter
    expected = [next(csv.reader([header], delimiter=delimiter, strict=False))]
    expected_starts = [1]
    expected.append([])  # the unbalanced row: kept empty so indices stay aligned
    expected_starts.append(2)
    for number, line in enumerate(lines, start=3):
        if not line.strip():
            continue  # blank rows are skipped by both
        expected.append(next(csv.reader([line], delimiter=delimiter, strict=False)))
        expected_starts.append(number)
    assert records == expected
    assert starts == expected_starts


def test_careful_path_is_taken_and_keeps_quoted_rows() -> None:
    # The unbalanced quote is reported on its own line; a quoted row still splits by csv.
    text = 'Part Number,Frequency\n"A1,2\n"B,1",16 MHz\nC,12 MHz\n'
    records, starts, problems, bad, _ = split_csv_text(text, path="t.csv")
    assert records[1] == [] and bad == {1}
    assert [problem.line for problem in problems] == [2]
    assert "unbalanced quote" in problems[0].message
    assert records[2] == ["B,1", "16 MHz"] and records[3] == ["C", "12 MHz"]
    assert starts == [1, 2, 3, 4]
