"""Render a text part frame as a catalog file: spreadsheet-style CSV, plain CSV or YAML.

Rendering is pure (frame -> str); writing is atomic (a temporary file in the same folder,
then ``os.replace``), so a reader never sees half a catalog. Output is byte-for-byte
reproducible: fixed column order, "\\n" line ends, UTF-8 without a byte-order mark.
"""

from __future__ import annotations

import json
import os
import tempfile
from collections.abc import Callable
from dataclasses import dataclass
from pathlib import Path
from typing import Literal

import numpy as np
import numpy.typing as npt
import pandas as pd
import yaml

from demo_catalog.distinct import ObjectArray, factorize
from demo_catalog.fields import FIELDS, number_text

CsvStyle = Literal["spreadsheet", "plain"]

# Unit words this package writes in its text frame, as SI multipliers.
_UNIT_SCALE = {
    "Hz": 1.0,
    "kHz": 1e3,
    "MHz": 1e6,
    "pF": 1e-12,
    "fF": 1e-15,
    "ohm": 1.0,
    "kohm": 1e3,
    "uW": 1e-6,
    "ppm": 1.0,
    "degC": 1.0,
    "ppm/degC^2": 1.0,
}

# Spreadsheet header -> (field, SI multiplier of the header's unit). None = copied as text.
SPREADSHEET_COLUMNS: tuple[tuple[str, str, float | None], ...] = (
    ("Part Number", "mpn", None),
    ("Manufacturer", "maker", None),
    ("Freq", "frequency", None),
    ("Mode", "mode", None),
    ("Cut", "cut", None),
    ("Package", "package", None),
    ("Load Cap (pF)", "load_capacitance", 1e-12),
    ("Tolerance (ppm)", "tolerance", 1.0),
    ("Stability (ppm)", "stability", 1.0),
    ("Operating Temperature", "temp_min", None),
    ("ESR max (Ω)", "esr", 1.0),
    ("C0 (pF)", "c0", 1e-12),
    ("C1 (fF)", "c1", 1e-15),
    ("Drive Level max (µW)", "drive_level", 1e-6),
    ("Aging (ppm/yr)", "aging", 1.0),
    ("Beta (ppm/°C²)", "beta", 1.0),
    ("Turnover (°C)", "turnover", 1.0),
    ("L (mm)", "length_mm", None),
    ("W (mm)", "width_mm", None),
    ("H (mm)", "height_mm", None),
    ("Pinout", "pinout", None),
    ("Qualification", "qualification", None),
    ("MSL", "msl", None),
    ("Lifecycle", "lifecycle", None),
    ("Stock", "stock", None),
    ("Unit Price", "price", None),
)


def split_quantity(text: str) -> tuple[float, float]:
    """("80 ohm") -> (80.0, 1.0): the number and the SI multiplier of its unit word."""
    number, _, unit = text.strip().partition(" ")
    if unit not in _UNIT_SCALE:
        raise ValueError(f"cannot convert {text!r}: unit {unit!r} is not one this package writes")
    return float(number), _UNIT_SCALE[unit]


@dataclass(frozen=True)
class Cells:
    """A column as codes into a table of cell texts (-1 = blank): cheap for 1e6 rows."""

    codes: npt.NDArray[np.int64]
    table: tuple[str, ...]

    @classmethod
    def of(cls, column: pd.Series) -> Cells:
        codes, uniques = factorize(column)
        return cls(codes, tuple(str(v) for v in uniques))

    def map(self, render: Callable[[str], str]) -> Cells:
        return Cells(self.codes, tuple(render(v) for v in self.table))

    def where(self, mask: npt.NDArray[np.bool_], other: Cells) -> Cells:
        """Cells of ``other`` where ``mask`` (and both present), else these."""
        if other.codes is not self.codes and not np.array_equal(other.codes, self.codes):
            raise ValueError("Cells.where needs cells of the same column")
        shifted = np.where(mask & (self.codes >= 0), self.codes + len(self.table), self.codes)
        return Cells(shifted, self.table + other.table)

    def texts(self, blank: str = "") -> ObjectArray:
        table = np.array([*self.table, blank], dtype=object)
        return np.asarray(table[self.codes], dtype=object)


def _in_unit(scale: float) -> Callable[[str], str]:
    def render(value: str) -> str:
        if value == "series":
            return "series"
        number, unit_scale = split_quantity(value)
        # The ratio of two powers of ten, then at most 6 places, so "3.52 fF" stays "3.52".
        return number_text(number * (unit_scale / scale), 6)

    return render


def _spreadsheet_frequency(value: str) -> str:
    number, scale = split_quantity(value)
    hz = number * scale
    if hz < 1e6:
        return f"{hz / 1e3:.3f}kHz"
    return f"{hz / 1e6:.3f}MHz"


def _decorated_resistance(value: str) -> str:
    number, scale = split_quantity(value)
    if scale >= 1e3:
        return f"{number_text(number, 3)} kΩ"
    return f"{number_text(number, 2)} Ω"


def _every(count: int, period: int, phase: int) -> npt.NDArray[np.bool_]:
    return np.asarray((np.arange(count) % period) == phase)


def _temperature_range(text: pd.DataFrame) -> Cells:
    low = Cells.of(text["temp_min"]).map(_in_unit(1.0))
    high = Cells.of(text["temp_max"]).map(_in_unit(1.0))
    width = len(high.table) + 1
    pair = np.where((low.codes < 0) | (high.codes < 0), -1, low.codes * width + high.codes)
    codes, uniques = factorize(pd.Series(pair).where(pair >= 0))
    keys = np.asarray(uniques, dtype=np.float64).astype(np.int64).tolist()
    table = tuple(f"{low.table[k // width]} to {high.table[k % width]} °C" for k in keys)
    return Cells(codes, table)


def spreadsheet_cells(text: pd.DataFrame) -> dict[str, Cells]:
    """The text frame as a spreadsheet export: units in the headers, bare numbers below.

    A few cells carry the decorations people type into spreadsheets ("±20 ppm",
    "20ppm max", "80 Ω", "70 kΩ", "16.000MHz"); which cells is fixed by row position,
    so the output is reproducible.
    """
    count = len(text)
    columns: dict[str, Cells] = {}
    for header, field, scale in SPREADSHEET_COLUMNS:
        if header == "Operating Temperature":
            columns[header] = _temperature_range(text)
            continue
        cells = Cells.of(text[field])
        if field == "frequency":
            cells = cells.where(_every(count, 7, 3), cells.map(_spreadsheet_frequency))
        elif scale is not None:
            bare = cells.map(_in_unit(scale))
            if field == "tolerance":
                cells = bare.where(_every(count, 11, 5), bare.map(lambda v: f"±{v} ppm"))
            elif field == "stability":
                cells = bare.where(_every(count, 13, 6), bare.map(lambda v: f"{v}ppm max"))
            elif field == "esr":
                cells = bare.where(_every(count, 9, 4), cells.map(_decorated_resistance))
            else:
                cells = bare
        columns[header] = cells
    return columns


_NEEDS_QUOTES = r'[,"\r\n]|^\s|\s$'


def _csv_table(cells: Cells, ending: str) -> Cells:
    """Cell texts quoted where CSV needs it (RFC 4180), each followed by ``ending``."""
    # pandas string dtype: vectorised (Arrow) on pandas 3, plain objects on pandas 2.
    table = pd.Series(cells.table, dtype="str")
    quote = table.str.contains(_NEEDS_QUOTES, regex=True)
    quoted = table.where(~quote, '"' + table.str.replace('"', '""', regex=False) + '"')
    return Cells(cells.codes, tuple((quoted + ending).tolist()))


def _join_rows(pieces: list[ObjectArray]) -> str:
    """Concatenate row-major: row 0's pieces, then row 1's, ... (one join, no copying)."""
    if not pieces:
        return ""
    return "".join(np.column_stack(pieces).ravel().tolist())


def render_csv(text: pd.DataFrame, style: CsvStyle = "spreadsheet") -> str:
    """CSV text of a text part frame.

    ``style="spreadsheet"`` uses the spreadsheet headers of INTERFACES.md with units in
    the headers; ``style="plain"`` uses our field names and keeps the units in the cells.
    """
    if style == "spreadsheet":
        columns = spreadsheet_cells(text)
    elif style == "plain":
        columns = {f: Cells.of(text[f]) for f in FIELDS if f in text.columns}
    else:
        raise ValueError(f"style must be 'spreadsheet' or 'plain', got {style!r}")
    names = Cells(np.arange(len(columns), dtype=np.int64), tuple(columns))
    header = "".join(_csv_table(names, ",").texts().tolist())[:-1] + "\n"
    pieces: list[ObjectArray] = []
    for position, cells in enumerate(columns.values()):
        ending = "\n" if position == len(columns) - 1 else ","
        pieces.append(_csv_table(cells, ending).texts(blank=ending))
    return header + _join_rows(pieces)


_PLAIN_PART_NUMBER = r"[A-Z][A-Za-z0-9._/-]*"
_YAML_WORDS = {"y", "n", "yes", "no", "on", "off", "true", "false", "null"}
_NUMERIC_FIELDS = {"length_mm", "width_mm", "height_mm", "stock", "price"}


def _yaml_text(value: str) -> str:
    try:
        plain = yaml.safe_load(value) == value and "#" not in value and ": " not in value
    except yaml.YAMLError:
        plain = False
    return value if plain else json.dumps(value, ensure_ascii=False)


def _yaml_part_numbers(column: pd.Series) -> ObjectArray:
    values = column.astype(str)
    plain = values.str.fullmatch(_PLAIN_PART_NUMBER).to_numpy(dtype=bool) & ~(
        values.str.lower().isin(_YAML_WORDS).to_numpy(dtype=bool)
    )
    out = np.asarray(values.to_numpy(dtype=object), dtype=object).copy()
    if (~plain).any():
        out[~plain] = [_yaml_text(v) for v in out[~plain].tolist()]
    return out


YAML_HEADER = (
    "# Invented demo catalog for picker: every maker, part number and figure is made up.\n"
    "# Figures are illustrative estimates; for a real design confirm with the crystal maker\n"
    "# and a negative-resistance test on the real board.\n"
    "# Written by `python -m demo_catalog.generate`; edit the generator, not this file.\n"
)


def render_yaml(text: pd.DataFrame, *, header: str = YAML_HEADER) -> str:
    """YAML text of a text part frame: a mapping with ``parts:``, one item per row.

    Missing figures are left out of their item; values carry their unit words.
    """
    fields = [f for f in FIELDS if f in text.columns]
    if not len(text):
        return header + "parts: []\n"
    if text[fields[0]].isna().any():
        raise ValueError(f"every part needs {fields[0]!r}; found a blank one")
    pieces: list[ObjectArray] = []
    for position, field in enumerate(fields):
        lead = ("  - " if position == 0 else "    ") + field + ": "
        if field == "mpn":
            pieces.append(np.asarray(lead + _yaml_part_numbers(text[field]) + "\n", dtype=object))
            continue
        cells = Cells.of(text[field])
        quote = (lambda v: v) if field in _NUMERIC_FIELDS else _yaml_text
        pieces.append(cells.map(lambda v, q=quote, lead=lead: lead + q(v) + "\n").texts())  # type: ignore[misc]
    return header + "parts:\n" + _join_rows(pieces)


def write_text_atomic(path: str | Path, content: str) -> None:
    """Write ``content`` (UTF-8) to ``path`` via a temporary file and ``os.replace``."""
    target = Path(path)
    handle, temporary = tempfile.mkstemp(prefix=f".{target.name}.", dir=target.parent)
    try:
        with os.fdopen(handle, "wb") as stream:
            stream.write(content.encode("utf-8"))
            stream.flush()
            os.fsync(stream.fileno())
        # mkstemp creates 0600; a catalog should be as readable as an ordinary file.
        mode = target.stat().st_mode & 0o777 if target.exists() else 0o644
        os.chmod(temporary, mode)
        os.replace(temporary, target)
    except BaseException:
        Path(temporary).unlink(missing_ok=True)
        raise


def write_csv(text: pd.DataFrame, path: str | Path, style: CsvStyle = "spreadsheet") -> None:
    """Write a text part frame as CSV (see :func:`render_csv`), atomically."""
    write_text_atomic(path, render_csv(text, style))


def write_yaml(text: pd.DataFrame, path: str | Path) -> None:
    """Write a text part frame as YAML (see :func:`render_yaml`), atomically."""
    write_text_atomic(path, render_yaml(text))
