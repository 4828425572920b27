"""RawTable + header map -> part-table rows (SI floats) and every problem found.

Vectorised by distinct text: each column's cells are factorised and each distinct raw
string is parsed once (catalog columns repeat a handful of values), then the results are
mapped back to the rows. A cell error drops its row (severity ``error``); a doubtful but
usable value keeps it (``warning``). Checks that need several fields (temperature order,
plausibility) run on whole columns afterwards.
"""

from __future__ import annotations

import math
import re
from collections.abc import Callable
from dataclasses import dataclass
from typing import Final

import numpy as np
import pandas as pd

from catalog.headers import HeaderMap, closest_headers, missing_required
from catalog.plausibility import plausibility_problems
from catalog.problems import CatalogError, Problem, Severity
from catalog.rawtable import Column, RawTable, cells_equal, factorize_cells
from catalog.schema import (
    CUT_SYNONYMS,
    FIELDS,
    FIELDS_BY_NAME,
    LIFECYCLE_SYNONYMS,
    MISSING_MARKERS,
    MODE_SYNONYMS,
    PINOUT_SYNONYMS,
    TEMP_RANGE_FIELD,
    FieldSpec,
    normalise_header,
)
from catalog.units import (
    UnitError,
    is_bare_number,
    parse_plain_numbers,
    parse_quantity,
    parse_temperature_range,
)

__all__ = [
    "FLOAT_COLUMNS",
    "PART_COLUMNS",
    "TEXT_COLUMNS",
    "ParsedTable",
    "check_required_columns",
    "normalise_package",
    "validate_table",
]

#: Part-table columns in contract order (INTERFACES.md), without the source columns.
PART_COLUMNS: Final[tuple[str, ...]] = (
    "mpn",
    "maker",
    "freq_hz",
    "load_capacitance_f",
    "series_calibrated",
    "tolerance_ppm",
    "stability_ppm",
    "temp_min_c",
    "temp_max_c",
    "esr_ohm",
    "package",
    "mode",
    "cut",
    "beta_ppm_per_c2",
    "turnover_c",
    "c0_f",
    "c1_f",
    "l1_h",
    "drive_level_w",
    "aging_ppm",
    "length_mm",
    "width_mm",
    "height_mm",
    "price",
    "stock",
    "lifecycle",
    "qualification",
    "pinout",
    "msl",
)
TEXT_COLUMNS: Final[tuple[str, ...]] = (
    "maker",
    "package",
    "mode",
    "cut",
    "lifecycle",
    "qualification",
    "pinout",
    "msl",
)
FLOAT_COLUMNS: Final[tuple[str, ...]] = tuple(
    column for column in PART_COLUMNS if column not in (*TEXT_COLUMNS, "mpn", "series_calibrated")
)
_SERIES_WORDS: Final[frozenset[str]] = frozenset(
    {"series", "ser", "series resonance", "series resonant", "s", "sr", "series mode"}
)
_ASYMMETRIC: Final[re.Pattern[str]] = re.compile(
    r"^\s*([+-−]\s*[\d.,]+)\s*(?:ppm)?\s*[/,;]\s*([+-−]\s*[\d.,]+)\s*(ppm)?\s*$", re.IGNORECASE
)
_PACKAGE_SIZE: Final[re.Pattern[str]] = re.compile(
    r"^(\d+(?:\.\d+)?)\s*(?:mm)?\s*[x×*]\s*(\d+(?:\.\d+)?)\s*(?:mm)?$", re.IGNORECASE
)
_HC49: Final[re.Pattern[str]] = re.compile(r"^HC-?(\d+)(.*)$")
#: Quartz crystals are made from about 1 kHz (tuning forks) to a few hundred MHz
#: (overtones, inverted-mesa fundamentals): common practice; anything outside is a mistake.
_FREQUENCY_FLOOR_HZ: Final[float] = 1e3
_FREQUENCY_CEILING_HZ: Final[float] = 1e9


@dataclass(frozen=True)
class ParsedTable:
    """One file's loaded parts (part-table columns, plain dtypes) and its problems."""

    path: str
    parts: pd.DataFrame
    problems: tuple[Problem, ...]
    rows_read: int


@dataclass(frozen=True)
class _Outcome:
    """What one distinct raw text became: value(s), or why not."""

    value: object
    extra: object = None
    message: str | None = None
    severity: Severity = "error"


_NO_VALUE: Final[_Outcome] = _Outcome(None)
_MONTH: Final[re.Pattern[str]] = re.compile(
    r"\b(?:jan|feb|mar|apr|may|jun|jul|aug|sep|oct|nov|dec)[a-z]*\b", re.IGNORECASE
)


def normalise_package(text: str) -> str:
    """Package name in one spelling: upper case, no spaces; "3.2x2.5 mm" -> "3225".

    Size codes are length and width in tenths of a millimetre (the usual SMD crystal
    naming, common practice): 3.2 x 2.5 mm -> "3225", 2.0 x 1.6 mm -> "2016".
    """
    compact = text.strip()
    size = _PACKAGE_SIZE.match(compact)
    if size is not None:
        length, width = float(size.group(1)), float(size.group(2))
        if length < 10 and width < 10:
            return f"{round(length * 10):02d}{round(width * 10):02d}"
    folded = re.sub(r"\s+", "", compact).upper()
    hc = _HC49.match(folded)
    if hc is not None:
        return f"HC-{hc.group(1)}{hc.group(2)}"
    return folded


def check_required_columns(raw: RawTable, header_map: HeaderMap) -> None:
    """Raise CatalogError naming the file, the missing fields and the closest headers."""
    # A tuning-fork catalog may have no stability column; its rows are checked one by one.
    missing = [name for name in missing_required(header_map) if name != "stability"]
    if not missing:
        return
    hints = []
    for name in missing:
        near = closest_headers(name, raw.headers)
        if near:
            hints.append(f"{name} (closest headers: {', '.join(repr(h) for h in near)})")
        else:
            hints.append(name)
    where = raw.path if raw.header_line is None else f"{raw.path}:{raw.header_line}"
    raise CatalogError(
        f"{where}: missing required column(s): {'; '.join(hints)}; name them in a mapping "
        "file (--map) if the file uses other headers"
    )


def _clip(text: str, size: int = 200) -> str:
    """Raw text for a problem: enough to find the cell, never a whole huge cell."""
    return text if len(text) <= size else text[: size - 3] + "..."


def _is_missing(text: str) -> bool:
    return text.strip().lower() in MISSING_MARKERS


def _quantity_outcome(spec: FieldSpec, unit: str | None) -> Callable[[str], _Outcome]:
    assert spec.dimension is not None
    dimension = spec.dimension

    def parse(text: str) -> _Outcome:
        if spec.needs_unit and unit is None and is_bare_number(text):
            return _Outcome(
                math.nan,
                message=(
                    f"'{text.strip()}' has no unit; write e.g. '{text.strip()} "
                    f"{_unit_hint(spec)}' or put the unit in the header ('{spec.name} "
                    f"({_unit_hint(spec)})')"
                ),
            )
        try:
            value = parse_quantity(text, dimension, default_unit=unit)
        except UnitError as error:
            if dimension == "ppm":
                asymmetric = _asymmetric_ppm(text)
                if asymmetric is not None:
                    return _Outcome(
                        asymmetric,
                        message=(
                            f"asymmetric limits '{text.strip()}': the larger side "
                            f"({asymmetric:g} ppm) is used"
                        ),
                        severity="warning",
                    )
            return _Outcome(math.nan, message=str(error))
        if dimension in ("ppm",) and spec.name in ("tolerance", "stability", "aging"):
            value = abs(value)  # written "-20 ppm" or "±20": a symmetric limit either way
        if value < 0 and not spec.allow_negative:
            return _Outcome(math.nan, message=f"must not be negative, got '{text.strip()}'")
        if value == 0 and not spec.allow_zero:
            return _Outcome(math.nan, message=f"must not be zero, got '{text.strip()}'")
        return _Outcome(value)

    return parse


def _unit_hint(spec: FieldSpec) -> str:
    return {"load_capacitance": "pF", "c0": "pF", "c1": "fF", "l1": "mH", "drive_level": "uW"}.get(
        spec.name, spec.unit
    )


def _asymmetric_ppm(text: str) -> float | None:
    """'-10/+20 ppm' -> 20.0 (the worst side); None when the text is not of that form."""
    match = _ASYMMETRIC.match(text.replace("−", "-"))
    if match is None:
        return None
    try:
        sides = [abs(float(side.replace(" ", "").replace(",", "."))) for side in match.groups()[:2]]
    except ValueError:
        return None
    worst = max(sides)
    return worst if math.isfinite(worst) else None


def _load_outcome(spec: FieldSpec, unit: str | None) -> Callable[[str], _Outcome]:
    quantity = _quantity_outcome(spec, unit)

    def parse(text: str) -> _Outcome:
        if normalise_header(text) in _SERIES_WORDS:
            return _Outcome(math.nan, extra=True)
        outcome = quantity(text)
        if outcome.message is not None and outcome.severity == "error":
            return _Outcome(
                math.nan, extra=False, message=(f"{outcome.message} (or the word 'series')")
            )
        return _Outcome(
            outcome.value, extra=False, message=outcome.message, severity=outcome.severity
        )

    return parse


def _range_outcome(text: str) -> _Outcome:
    try:
        low, high = parse_temperature_range(text)
    except UnitError as error:
        return _Outcome(math.nan, math.nan, message=str(error))
    return _Outcome(low, high)


def _limit_outcome(spec: FieldSpec, unit: str | None, side: int) -> Callable[[str], _Outcome]:
    quantity = _quantity_outcome(spec, unit)

    def parse(text: str) -> _Outcome:
        outcome = quantity(text)
        if outcome.message is None:
            return outcome
        # A whole range in a limit column ("-40 to 85 °C" under "Temp Min") is still clear.
        ranged = _range_outcome(text)
        if ranged.message is None:
            return _Outcome(ranged.value if side == 0 else ranged.extra)
        return outcome

    return parse


def _choice_outcome(spec: FieldSpec) -> Callable[[str], _Outcome]:
    table = {
        "mode": MODE_SYNONYMS,
        "lifecycle": LIFECYCLE_SYNONYMS,
        "cut": CUT_SYNONYMS,
        "pinout": PINOUT_SYNONYMS,
    }[spec.name]
    choices = sorted({value for value in table.values() if value})

    def parse(text: str) -> _Outcome:
        key = normalise_header(text)
        if key in table:
            return _Outcome(table[key])
        if spec.name == "cut" and re.fullmatch(r"[A-Za-z]{1,4}(?:[- ]?cut)?", text.strip()):
            return _Outcome(text.strip().upper().removesuffix("CUT").strip(" -"))
        hint = ""
        if spec.name == "pinout":
            digits = sorted(re.findall(r"[1-4]", text))
            if len(digits) == 2 and f"{digits[0]}-{digits[1]}" in ("1-3", "2-4", "1-4"):
                return _Outcome(f"{digits[0]}-{digits[1]}")
            if _MONTH.search(text):
                hint = (
                    " (a spreadsheet may have turned '1-3' into a date: format the column as text)"
                )
        return _Outcome(
            "",
            message=(f"'{text.strip()}' is not one of {', '.join(choices)}; left blank{hint}"),
            severity="warning",
        )

    return parse


def _text_outcome(spec: FieldSpec) -> Callable[[str], _Outcome]:
    def parse(text: str) -> _Outcome:
        stripped = text.strip()
        if spec.name == "mpn":
            return _Outcome(" ".join(stripped.split()))
        if spec.name == "package":
            return _Outcome(normalise_package(stripped))
        if spec.name == "msl":
            match = re.fullmatch(r"(?:msl|level)?\s*([1-6][a]?)(?:\.0)?", stripped, re.IGNORECASE)
            if match is not None:
                return _Outcome(match.group(1).lower())
        return _Outcome(stripped)

    return parse


def _outcome_parser(spec: FieldSpec, unit: str | None) -> Callable[[str], _Outcome]:
    if spec.kind == "quantity":
        if spec.name in ("temp_min", "temp_max"):
            return _limit_outcome(spec, unit, 0 if spec.name == "temp_min" else 1)
        return _quantity_outcome(spec, unit)
    if spec.kind == "load":
        return _load_outcome(spec, unit)
    if spec.kind == "range":
        return _range_outcome
    if spec.kind == "choice":
        return _choice_outcome(spec)
    return _text_outcome(spec)


@dataclass(frozen=True)
class _Column:
    """One parsed column, kept per distinct text: ``codes[i]`` is row i's distinct text.

    Per-row arrays are built only where needed (``rows``), so a million-row column does
    not hold six object arrays of a million entries each.
    """

    codes: np.ndarray
    raw_u: np.ndarray  # object: the distinct texts
    values_u: np.ndarray  # object: what each became
    extra_u: np.ndarray  # object: second value (range high end, series flag)
    missing_u: np.ndarray  # bool
    message_u: np.ndarray  # object: None or the message
    error_u: np.ndarray  # bool: the message is an error (row dropped)
    warning_u: np.ndarray  # bool: the message is a warning

    def rows(self, per_distinct: np.ndarray) -> np.ndarray:
        """Spread a per-distinct array over the rows."""
        return per_distinct[self.codes]

    @property
    def missing(self) -> np.ndarray:
        return self.rows(self.missing_u)

    @property
    def error(self) -> np.ndarray:
        return self.rows(self.error_u)

    def floats(self, values_u: np.ndarray, unusable_u: np.ndarray) -> np.ndarray:
        """Per-row floats of ``values_u``; NaN where ``unusable_u``."""
        out = np.full(len(values_u), np.nan, dtype=np.float64)
        if len(values_u) and not unusable_u.all():
            out[~unusable_u] = values_u[~unusable_u].astype(np.float64)
        return self.rows(out)


#: Batch reader of the distinct texts a column parser can take in one pass:
#: ``(values, extra, handled)``; unhandled texts go through the per-text parser.
_Batch = Callable[[list[str]], tuple[np.ndarray, object, np.ndarray]]


def _plain_number_batch(spec: FieldSpec, unit: str | None) -> _Batch | None:
    """Plain numbers of a quantity column read in one pass (``parse_plain_numbers``).

    Gives what ``_quantity_outcome`` gives for them: a value with no message. Values the
    per-text parser would refuse or annotate (negative, zero, no unit where one is
    needed) are left to it, so every message still comes from one place.
    """
    if spec.kind not in ("quantity", "load") or spec.dimension is None:
        return None
    if spec.needs_unit and unit is None:
        return None  # a bare number is an error here: the per-text parser says why
    dimension = spec.dimension
    symmetric = dimension == "ppm" and spec.name in ("tolerance", "stability", "aging")
    extra = False if spec.kind == "load" else None

    def batch(texts: list[str]) -> tuple[np.ndarray, object, np.ndarray]:
        values, handled = parse_plain_numbers(texts, dimension, default_unit=unit)
        if symmetric:
            values = np.abs(values)
        if not spec.allow_negative:
            handled &= ~(values < 0)
        if not spec.allow_zero:
            handled &= values != 0
        return values, extra, handled

    return batch


def _text_batch(spec: FieldSpec) -> _Batch | None:
    """Part numbers that need no cleaning (printable ASCII, single inner spaces) as they are."""
    if spec.kind != "text" or spec.name != "mpn":
        return None

    def batch(texts: list[str]) -> tuple[np.ndarray, object, np.ndarray]:
        # For such a text, " ".join(text.strip().split()) is the text itself.
        handled = np.array(
            [
                text.isascii()
                and text.isprintable()
                and "  " not in text
                and text[:1] != " "
                and text[-1:] != " "
                for text in texts
            ],
            dtype=bool,
        )
        return np.asarray(texts, dtype=object), None, handled

    return batch


def _parse_column(
    cells: Column, parse: Callable[[str], _Outcome], batch: _Batch | None = None
) -> _Column:
    """Parse each distinct text once (in one pass where ``batch`` can) and keep the codes."""
    codes, uniques = factorize_cells(cells)
    count = len(uniques)
    missing_u = np.array([_is_missing(text) for text in uniques], dtype=bool)
    values_u = np.full(count, None, dtype=object)
    extra_u = np.full(count, None, dtype=object)
    message_u = np.full(count, None, dtype=object)
    error_u = np.zeros(count, dtype=bool)
    warning_u = np.zeros(count, dtype=bool)
    done = missing_u.copy()
    if batch is not None and count:
        values, extra, handled = batch(uniques)
        handled &= ~missing_u
        values_u[handled] = values[handled]
        extra_u[handled] = extra
        done |= handled
    for index in np.flatnonzero(~done).tolist():
        outcome = parse(uniques[index])
        values_u[index] = outcome.value
        extra_u[index] = outcome.extra
        if outcome.message is not None:
            message_u[index] = outcome.message
            error_u[index] = outcome.severity == "error"
            warning_u[index] = outcome.severity != "error"
    return _Column(
        np.asarray(codes, dtype=np.int64),
        np.asarray(uniques, dtype=object),
        values_u,
        extra_u,
        missing_u,
        message_u,
        error_u,
        warning_u,
    )


def _batch_reader(spec: FieldSpec, unit: str | None) -> _Batch | None:
    return _plain_number_batch(spec, unit) or _text_batch(spec)


def validate_table(
    raw: RawTable,
    header_map: HeaderMap,
    *,
    progress: Callable[[float], None] | None = None,
) -> ParsedTable:
    """Parse and check every cell of one file; keep rows without errors.

    Raises CatalogError (via ``check_required_columns``) when a required column is
    missing. Every problem carries file, line, field, raw text and message.
    """
    if raw.header_line is not None:
        # A CSV without a required column is unusable; in YAML each part names its own
        # fields, so a field no part has is reported part by part below.
        check_required_columns(raw, header_map)
    count = raw.row_count
    problems: list[Problem] = list(header_map.problems)
    lines = np.asarray(raw.lines, dtype=np.int64)
    dropped = np.zeros(count, dtype=bool)
    if raw.bad_rows:
        dropped[list(raw.bad_rows)] = True
    # Every problem of a row is reported (fix them all in one pass), except on rows the
    # reader could not split at all.
    reader_bad = dropped.copy()
    # A header row repeated inside the data (files pasted together) is not a part.
    for binding in header_map.bindings:
        if binding.field != "mpn" or not count:
            continue
        repeated = cells_equal(raw.columns[binding.index], binding.header) & ~dropped
        for position in np.nonzero(repeated)[0].tolist():
            problems.append(
                Problem(
                    raw.path,
                    int(lines[position]),
                    None,
                    binding.header,
                    "the header row is repeated here; line skipped",
                    "warning",
                )
            )
        dropped |= repeated
        reader_bad |= repeated
    parsed: dict[str, _Column] = {}
    for done, binding in enumerate(header_map.bindings):
        if progress is not None:
            progress(done / max(len(header_map.bindings), 1))
        spec = FIELDS_BY_NAME[binding.field]
        parsed_column = _parse_column(
            raw.columns[binding.index],
            _outcome_parser(spec, binding.unit),
            _batch_reader(spec, binding.unit),
        )
        parsed[binding.field] = parsed_column
        flagged_u = parsed_column.error_u | parsed_column.warning_u
        flagged = (
            np.flatnonzero(parsed_column.rows(flagged_u) & ~reader_bad) if flagged_u.any() else ()
        )
        for position in [int(p) for p in flagged]:
            code = int(parsed_column.codes[position])
            severity = "error" if parsed_column.error_u[code] else "warning"
            problems.append(
                Problem(
                    raw.path,
                    int(lines[position]),
                    binding.field,
                    _clip(str(parsed_column.raw_u[code])),
                    str(parsed_column.message_u[code])
                    + ("; row not loaded" if severity == "error" else ""),
                    "error" if severity == "error" else "warning",
                )
            )
        if parsed_column.error_u.any():
            dropped |= parsed_column.error

    data: dict[str, object] = {}
    column: _Column | None
    # Quantities and text columns in one pass over the schema.
    for spec in FIELDS:
        if spec.kind == "range":
            continue
        column = parsed.get(spec.name)
        if column is None:
            data[spec.column] = (
                np.full(count, np.nan)
                if spec.kind in ("quantity", "load")
                else np.full(count, "", dtype=object)
            )
            if spec.kind == "load":
                data["series_calibrated"] = np.zeros(count, dtype=bool)
            continue
        unusable_u = column.missing_u | column.error_u
        if spec.kind in ("quantity", "load"):
            data[spec.column] = column.floats(column.values_u, unusable_u)
            if spec.kind == "load":
                data["series_calibrated"] = column.rows(
                    np.array([value is True for value in column.extra_u], dtype=bool)
                )
        else:
            texts_u = np.where(unusable_u, "", column.values_u).astype(object)
            data[spec.column] = column.rows(texts_u)

    # A temperature-range column fills limits that have no column or no value.
    range_column = parsed.get(TEMP_RANGE_FIELD)
    if range_column is not None:
        unusable_u = range_column.missing_u | range_column.error_u
        low = range_column.floats(range_column.values_u, unusable_u)
        high = range_column.floats(range_column.extra_u, unusable_u)
        for column_name, filler in (("temp_min_c", low), ("temp_max_c", high)):
            current = np.asarray(data[column_name], dtype=np.float64)
            data[column_name] = np.where(np.isnan(current), filler, current)

    # A limit column holding a whole range fills the other limit too.
    for field_name, other_column, side in (
        ("temp_min", "temp_max_c", 1),
        ("temp_max", "temp_min_c", 0),
    ):
        column = parsed.get(field_name)
        if column is None:
            continue
        current = np.asarray(data[other_column], dtype=np.float64)
        for position in np.nonzero(np.isnan(current) & ~column.missing)[0].tolist():
            ranged = _range_outcome(str(column.raw_u[column.codes[position]]))
            if ranged.message is None:
                current[position] = float(ranged.value if side == 0 else ranged.extra)  # type: ignore[arg-type]
        data[other_column] = current

    # Required values that are missing (after range filling).
    frequency = np.asarray(data["freq_hz"], dtype=np.float64)
    cut = np.asarray(data["cut"], dtype=object)
    tuning_fork = (cut == "tuning_fork") | ((cut == "") & (frequency < 1e6))
    for spec in FIELDS:
        if not spec.required:
            continue
        if spec.kind in ("quantity", "load"):
            values = np.asarray(data[spec.column], dtype=np.float64)
            absent = np.isnan(values)
            if spec.kind == "load":
                absent &= ~np.asarray(data["series_calibrated"], dtype=bool)
        else:
            absent = np.asarray(data[spec.column], dtype=object) == ""
        column = parsed.get(spec.name)
        if column is not None:
            absent &= ~column.error  # already reported as unreadable
        if spec.name == "stability":
            absent &= ~tuning_fork  # DESIGN §4: a tuning fork's drift comes from beta
        if spec.name in ("temp_min", "temp_max") and range_column is not None:
            absent &= ~range_column.error  # the range's own error says it
        for position in np.nonzero(absent & ~reader_bad)[0].tolist():
            problems.append(
                Problem(
                    raw.path,
                    int(lines[position]),
                    spec.name,
                    "",
                    f"missing {spec.doc}; row not loaded",
                    "error",
                )
            )
        dropped |= absent

    # A frequency no quartz crystal has is a unit mistake ("16" read as 16 Hz), not a part.
    outside = ((frequency < _FREQUENCY_FLOOR_HZ) | (frequency > _FREQUENCY_CEILING_HZ)) & ~dropped
    frequency_column = parsed.get("frequency")
    for position in np.nonzero(outside)[0].tolist():
        raw_text = (
            ""
            if frequency_column is None
            else _clip(str(frequency_column.raw_u[frequency_column.codes[position]]))
        )
        problems.append(
            Problem(
                raw.path,
                int(lines[position]),
                "frequency",
                raw_text,
                f"{frequency[position]:g} Hz is outside any quartz crystal (1 kHz to 1 GHz); "
                "a bare number is read in Hz: write '16 MHz' or a header like 'Frequency (MHz)'; "
                "row not loaded",
                "error",
            )
        )
    dropped |= outside

    # Limits in the wrong order.
    temp_min = np.asarray(data["temp_min_c"], dtype=np.float64)
    temp_max = np.asarray(data["temp_max_c"], dtype=np.float64)
    reversed_rows = (temp_min >= temp_max) & ~dropped
    for position in np.nonzero(reversed_rows)[0].tolist():
        problems.append(
            Problem(
                raw.path,
                int(lines[position]),
                "temp_min",
                f"{temp_min[position]:g} / {temp_max[position]:g}",
                f"minimum temperature {temp_min[position]:g} °C is not below the maximum "
                f"{temp_max[position]:g} °C; row not loaded",
                "error",
            )
        )
    dropped |= reversed_rows

    if "mode" in data:
        modes = np.asarray(data["mode"], dtype=object)
        data["mode"] = np.where(modes == "", "fundamental", modes).astype(object)

    frame = pd.DataFrame({column: data[column] for column in PART_COLUMNS})
    frame["source_path"] = raw.path
    frame["source_line"] = lines
    kept = frame.loc[~dropped].reset_index(drop=True)
    problems.extend(plausibility_problems(kept))
    return ParsedTable(raw.path, kept, tuple(problems), count)
