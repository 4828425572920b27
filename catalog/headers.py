"""Header mapping: the user's column headers -> our schema fields (and header units).

Order of trust, per header:

1. the user's mapping file (``--map FILE``): raw header -> field name or ``ignore``;
2. our field name itself ("load_capacitance");
3. the alias table of ``catalog.schema`` ("Load Cap", "CL", "Part No.");
4. the same with a trailing unit word ("Frequency MHz", "ESR Ohm");
5. a fuzzy suggestion (rapidfuzz), reported as a warning and NOT applied: the user
   confirms it in a mapping file. A wrong guess would silently read the wrong column.

A unit in brackets ("Load Cap (pF)", "Freq [MHz]", "ESR max (Ω)") applies to the bare
numbers of that column; a bracket that is not a unit of the field is reported and ignored.
"""

from __future__ import annotations

import math
import re
from collections.abc import Mapping, Sequence
from dataclasses import dataclass
from pathlib import Path
from typing import Final

import yaml
from rapidfuzz import fuzz, process, utils

from catalog.problems import CatalogError, Problem
from catalog.schema import FIELDS, FIELDS_BY_NAME, TEMP_RANGE_FIELD, FieldSpec, normalise_header
from catalog.textfile import read_capped
from catalog.units import UnitError, parse_quantity

__all__ = [
    "IGNORE",
    "ColumnBinding",
    "HeaderMap",
    "HeaderMapping",
    "MappingEntry",
    "closest_headers",
    "load_mapping",
    "map_headers",
    "missing_required",
    "split_header_unit",
    "suggest_field",
    "unit_fits",
]

#: The word a mapping file uses to say "this column is deliberately not read".
IGNORE: Final[str] = "ignore"
_MAX_MAPPING_BYTES: Final[int] = 1 << 20
#: rapidfuzz ratio (0..100) from which a header is worth suggesting as a field.
_SUGGEST_CUTOFF: Final[float] = 80.0

_BRACKET_UNIT: Final[re.Pattern[str]] = re.compile(r"^(.*?)[\s,]*[(\[{]([^()\[\]{}]*)[)\]}]\s*$")
_TRAILING_UNIT_SEPARATOR: Final[re.Pattern[str]] = re.compile(r"^(.*?)(?:[\s_,/]+|,\s*in\s+)(\S+)$")


@dataclass(frozen=True)
class ColumnBinding:
    """One source column read into one field.

    ``index`` is the 0-based column position, ``header`` the raw header text, ``unit``
    the header's unit for bare numbers (None: the field's canonical unit).
    """

    index: int
    header: str
    field: str
    unit: str | None


@dataclass(frozen=True)
class MappingEntry:
    """What a mapping file says about one header: a field (or None = ignore) and a unit."""

    field: str | None
    unit: str | None


@dataclass(frozen=True)
class HeaderMapping:
    """A user's mapping file, keys folded with ``normalise_header``."""

    path: str
    entries: Mapping[str, MappingEntry]

    def lookup(self, header: str) -> MappingEntry | None:
        """The entry for a raw header (compared folded, then without its bracket unit)."""
        entry = self.entries.get(normalise_header(header))
        if entry is None:
            name, _ = split_header_unit(header)
            entry = self.entries.get(normalise_header(name))
        return entry


@dataclass(frozen=True)
class HeaderMap:
    """The result of mapping one file's headers."""

    bindings: tuple[ColumnBinding, ...]
    problems: tuple[Problem, ...]

    def fields(self) -> frozenset[str]:
        """Field names that have a column."""
        return frozenset(binding.field for binding in self.bindings)


def _alias_table() -> dict[str, str]:
    table: dict[str, str] = {}
    for spec in FIELDS:
        for text in (spec.name, *spec.aliases):
            table.setdefault(normalise_header(text), spec.name)
    return table


_ALIASES: Final[dict[str, str]] = _alias_table()
_ALIAS_KEYS: Final[tuple[str, ...]] = tuple(_ALIASES)


def split_header_unit(header: str) -> tuple[str, str | None]:
    """Split ``"Load Cap (pF)"`` into ``("Load Cap", "pF")``; no bracket -> ``(header, None)``."""
    match = _BRACKET_UNIT.match(header.strip())
    if match is None:
        return header.strip(), None
    name, unit = match.group(1).strip(), match.group(2).strip()
    if not name:
        return header.strip(), None
    return name, unit or None


def unit_fits(unit: str, spec: FieldSpec) -> bool:
    """True when ``unit`` is a unit of ``spec``'s dimension (so bare numbers can use it)."""
    if spec.dimension is None:
        return False
    try:
        value = parse_quantity("1", spec.dimension, default_unit=unit)
    except UnitError:
        return False
    return math.isfinite(value)


def suggest_field(header: str, *, exclude: frozenset[str] = frozenset()) -> str | None:
    """The field a header most likely means, by fuzzy match on the alias table, or None.

    Uses rapidfuzz ``fuzz.ratio`` with its ``default_process`` (lower case, punctuation
    stripped); fields in ``exclude`` (already read from another column) are skipped.
    """
    name, _ = split_header_unit(header)
    folded = normalise_header(name)
    if not folded:
        return None
    candidates = [key for key in _ALIAS_KEYS if _ALIASES[key] not in exclude and len(key) > 2]
    found = process.extractOne(
        folded,
        candidates,
        scorer=fuzz.ratio,
        processor=utils.default_process,
        score_cutoff=_SUGGEST_CUTOFF,
    )
    return None if found is None else _ALIASES[found[0]]


def _match_name(header: str) -> tuple[str | None, str | None, str | None]:
    """Field, header unit and an unusable bracket text for one header (no mapping file)."""
    name, unit = split_header_unit(header)
    field = _ALIASES.get(normalise_header(name))
    whole = _ALIASES.get(normalise_header(header))
    if field is None:
        if whole is not None:
            spec = FIELDS_BY_NAME[whole]
            if spec.column != spec.name and normalise_header(header) == normalise_header(
                spec.column
            ):
                # Our own part-table column name ("c0_f") carries its unit in the name.
                return whole, spec.unit or None, None
            return whole, None, None
        trailing = _TRAILING_UNIT_SEPARATOR.match(name)
        if trailing is not None and unit is None:
            head, word = trailing.group(1), trailing.group(2)
            candidate = _ALIASES.get(normalise_header(head))
            if candidate is not None and unit_fits(word, FIELDS_BY_NAME[candidate]):
                return candidate, word, None
        return None, None, None
    spec = FIELDS_BY_NAME[field]
    if unit is None:
        if spec.column != spec.name and normalise_header(name) == normalise_header(spec.column):
            return field, spec.unit or None, None  # our own column name ("c0_f") carries it
        return field, None, None
    if spec.dimension is None:
        return field, None, None  # "(MPN)" after a text field says nothing about numbers
    if unit_fits(unit, spec):
        return field, unit, None
    if whole is not None:
        return whole, None, None  # "Load Capacitance (CL)" is itself an alias
    return field, None, unit


def map_headers(
    headers: Sequence[str],
    *,
    path: str,
    line: int | None,
    mapping: HeaderMapping | None = None,
) -> HeaderMap:
    """Bind each header of one file to a field; report what could not be bound.

    Parameters
    ----------
    headers : sequence of str
        Raw header texts in column order.
    path, line : str, int or None
        Where the headers are (for problems).
    mapping : HeaderMapping, optional
        The user's mapping file; its entries win over everything else.
    """
    bindings: list[ColumnBinding] = []
    problems: list[Problem] = []
    taken: dict[str, ColumnBinding] = {}
    unmatched: list[tuple[int, str]] = []
    seen_raw: dict[str, int] = {}

    def warn(field: str | None, raw: str, message: str) -> None:
        problems.append(Problem(path, line, field, raw, message, "warning"))

    for index, raw in enumerate(headers):
        header = raw.strip()
        if not header:
            continue
        folded_raw = normalise_header(header)
        if folded_raw in seen_raw:
            warn(
                None,
                header,
                f"header '{header}' appears twice (columns "
                f"{seen_raw[folded_raw] + 1} and {index + 1}); only the first is read",
            )
            continue
        seen_raw[folded_raw] = index
        entry = mapping.lookup(header) if mapping is not None else None
        bracket_problem: str | None = None
        if entry is not None:
            if entry.field is None:
                continue
            field: str | None = entry.field
            unit: str | None = entry.unit
            if unit is None and field is not None:
                _, header_unit = split_header_unit(header)
                spec = FIELDS_BY_NAME[field]
                if header_unit and spec.dimension is not None and unit_fits(header_unit, spec):
                    unit = header_unit
        else:
            field, unit, bracket_problem = _match_name(header)
        if field is None:
            unmatched.append((index, header))
            continue
        if bracket_problem is not None:
            spec = FIELDS_BY_NAME[field]
            warn(
                field,
                header,
                f"header '{header}': '{bracket_problem}' is not a unit of "
                f"{spec.doc}; bare numbers are read in {spec.unit or 'plain numbers'}",
            )
        if field in taken:
            first = taken[field]
            warn(
                field,
                header,
                f"columns '{first.header}' and '{header}' both give {field}; "
                f"reading '{first.header}' and ignoring '{header}'",
            )
            continue
        binding = ColumnBinding(index, header, field, unit)
        taken[field] = binding
        bindings.append(binding)

    for index, header in unmatched:
        suggestion = suggest_field(header, exclude=frozenset(taken))
        if suggestion is not None:
            warn(
                None,
                header,
                f"header '{header}' looks like {suggestion}; confirm it in a "
                f"mapping file (--map) to read it; column {index + 1} ignored",
            )
        else:
            warn(
                None,
                header,
                f"column {index + 1} '{header}' is not a catalog field; ignored "
                "(name it in a mapping file to read it, or 'ignore' to silence this)",
            )
    return HeaderMap(tuple(bindings), tuple(problems))


def missing_required(header_map: HeaderMap) -> tuple[str, ...]:
    """Required fields with no column (a temperature-range column covers both limits)."""
    present = set(header_map.fields())
    if TEMP_RANGE_FIELD in present:
        present |= {"temp_min", "temp_max"}
    return tuple(spec.name for spec in FIELDS if spec.required and spec.name not in present)


def closest_headers(field: str, headers: Sequence[str], *, limit: int = 3) -> list[str]:
    """Headers of a file that most resemble a missing field (for the error message)."""
    spec = FIELDS_BY_NAME[field]
    choices = [header for header in headers if header.strip()]
    if not choices:
        return []
    queries = (spec.name.replace("_", " "), *spec.aliases[:6])
    scored: dict[str, float] = {}
    for query in queries:
        for header, score, _ in process.extract(
            query, choices, scorer=fuzz.ratio, processor=utils.default_process, limit=limit
        ):
            scored[header] = max(scored.get(header, 0.0), float(score))
    ranked = sorted(scored.items(), key=lambda item: -item[1])
    return [header for header, score in ranked[:limit] if score >= 60.0]


def load_mapping(path: str | Path) -> HeaderMapping:
    """Read a header mapping file (YAML: ``raw header: field`` or ``raw header: ignore``).

    An entry may also be ``raw header: {field: frequency, unit: MHz}``; the whole mapping
    may sit under a top-level ``columns:`` key. Raises CatalogError with the file and the
    offending entry when the file is unreadable or names an unknown field.
    """
    source = str(path)
    try:
        # Capped and non-blocking: /dev/zero or a pipe with no writer must not hang us.
        data_bytes = read_capped(Path(path), _MAX_MAPPING_BYTES + 1)
    except OSError as error:
        raise CatalogError(f"{source}: cannot read mapping file ({error.strerror})") from None
    if len(data_bytes) > _MAX_MAPPING_BYTES:
        raise CatalogError(f"{source}: mapping file larger than 1 MB; is it the right file?")
    try:
        data = yaml.safe_load(data_bytes.decode("utf-8-sig"))
    except UnicodeDecodeError:
        raise CatalogError(f"{source}: mapping file is not UTF-8 text") from None
    except yaml.YAMLError as error:
        mark = getattr(error, "problem_mark", None)
        where = f":{mark.line + 1}" if mark is not None else ""
        raise CatalogError(f"{source}{where}: mapping file is not valid YAML") from None
    except RecursionError:
        raise CatalogError(f"{source}: mapping file is nested too deeply") from None
    if isinstance(data, dict) and set(data) == {"columns"}:
        data = data["columns"]
    if not isinstance(data, dict):
        raise CatalogError(
            f"{source}: a mapping file maps headers to fields, e.g. 'Lod Capacitance: "
            "load_capacitance'"
        )
    known = sorted(FIELDS_BY_NAME)
    entries: dict[str, MappingEntry] = {}
    for key, value in data.items():
        header = str(key)
        unit: str | None = None
        target = value
        if isinstance(value, dict):
            target = value.get("field")
            raw_unit = value.get("unit")
            unit = None if raw_unit is None else str(raw_unit)
        if not isinstance(target, str):
            raise CatalogError(
                f"{source}: '{header}': expected a field name or 'ignore', got {target!r}"
            )
        field_name = target.strip()
        if field_name.lower() == IGNORE:
            entries[normalise_header(header)] = MappingEntry(None, None)
            continue
        if field_name not in FIELDS_BY_NAME:
            hint = process.extractOne(
                field_name, known, scorer=fuzz.ratio, processor=utils.default_process
            )
            near = f"; did you mean {hint[0]}?" if hint is not None and hint[1] >= 60 else ""
            raise CatalogError(f"{source}: '{header}': unknown field '{field_name}'{near}")
        spec = FIELDS_BY_NAME[field_name]
        if unit is not None and not unit_fits(unit, spec):
            raise CatalogError(f"{source}: '{header}': unit '{unit}' is not a unit of {field_name}")
        entries[normalise_header(header)] = MappingEntry(field_name, unit)
    return HeaderMapping(source, entries)
