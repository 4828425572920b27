"""The schema table and header mapping (alias, unit in header, fuzzy, mapping file).

Sources: the demo headers are the list in INTERFACES.md ("Canonical CSV header aliases");
the spreadsheet variants are common distributor/supplier column names (common practice);
the order exact -> alias -> fuzzy suggestion never applied silently is DESIGN.md §3.
"""

from __future__ import annotations

from collections.abc import Callable
from pathlib import Path

import pytest

from catalog.headers import load_mapping, map_headers, split_header_unit, suggest_field
from catalog.problems import CatalogError
from catalog.schema import FIELDS, FIELDS_BY_NAME, normalise_header

# The demo catalog's CSV headers, as listed in INTERFACES.md, with the field each means.
DEMO_HEADERS = {
    "Part Number": ("mpn", None),
    "Manufacturer": ("maker", None),
    "Freq": ("frequency", None),
    "Frequency (MHz)": ("frequency", "MHz"),
    "Load Cap (pF)": ("load_capacitance", "pF"),
    "Tolerance (ppm)": ("tolerance", "ppm"),
    "Stability (ppm)": ("stability", "ppm"),
    "Op Temp Min (°C)": ("temp_min", "°C"),
    "Op Temp Max (°C)": ("temp_max", "°C"),
    "Operating Temperature": ("temp_range", None),
    "ESR max (Ω)": ("esr", "Ω"),
    "Package": ("package", None),
    "Mode": ("mode", None),
    "Cut": ("cut", None),
    "C0 (pF)": ("c0", "pF"),
    "C1 (fF)": ("c1", "fF"),
    "Drive Level max (µW)": ("drive_level", "µW"),
    "Aging (ppm/yr)": ("aging", "ppm/yr"),
    "L (mm)": ("length_mm", "mm"),
    "W (mm)": ("width_mm", "mm"),
    "H (mm)": ("height_mm", "mm"),
    "Unit Price": ("price", None),
    "Stock": ("stock", None),
    "Lifecycle": ("lifecycle", None),
    "Qualification": ("qualification", None),
    "Pinout": ("pinout", None),
    "MSL": ("msl", None),
    "Beta (ppm/°C²)": ("beta", "ppm/°C²"),
    "Turnover (°C)": ("turnover", "°C"),
}

SPREADSHEET_VARIANTS = {
    "Part No.": "mpn",
    "MPN": "mpn",
    "Mfr Part #": "mpn",
    "Frequency": "frequency",
    "Nominal Frequency": "frequency",
    "CL": "load_capacitance",
    "Load Capacitance": "load_capacitance",
    "ESR": "esr",
    "ESR (ohm)": "esr",
    "Tol": "tolerance",
    "Freq Tolerance": "tolerance",
    "Freq Stability": "stability",
    "Temp Range": "temp_range",
    "Operating Temp": "temp_range",
    "Case": "package",
    "Size": "package",
    "Drive Level": "drive_level",
    "Shunt Capacitance": "c0",
    "Motional Capacitance": "c1",
    "Motional Inductance": "l1",
    "Mfr": "maker",
    "ESR_max": "esr",
    "load-cap": "load_capacitance",
    "PART NO": "mpn",
}


def test_aliases_are_unambiguous() -> None:
    # One folded alias must never mean two fields, or mapping would depend on order.
    seen: dict[str, str] = {}
    for spec in FIELDS:
        for alias in (spec.name, *spec.aliases):
            key = normalise_header(alias)
            assert seen.setdefault(key, spec.name) == spec.name, (alias, seen[key], spec.name)


def test_every_schema_field_of_design_section_3_exists() -> None:
    names = {
        "mpn",
        "frequency",
        "load_capacitance",
        "tolerance",
        "stability",
        "temp_min",
        "temp_max",
        "esr",
        "package",
        "maker",
        "beta",
        "turnover",
        "mode",
        "cut",
        "c0",
        "c1",
        "l1",
        "drive_level",
        "aging",
        "length_mm",
        "width_mm",
        "height_mm",
        "price",
        "stock",
        "lifecycle",
        "qualification",
        "pinout",
        "msl",
    }
    assert names <= set(FIELDS_BY_NAME)
    required = {spec.name for spec in FIELDS if spec.required}
    assert required == {
        "mpn",
        "frequency",
        "load_capacitance",
        "tolerance",
        "stability",
        "temp_min",
        "temp_max",
        "esr",
        "package",
    }


@pytest.mark.parametrize(("header", "expected"), list(DEMO_HEADERS.items()))
def test_demo_headers_map_with_their_units(header: str, expected: tuple[str, str | None]) -> None:
    result = map_headers([header], path="demo.csv", line=1)
    assert [(b.field, b.unit) for b in result.bindings] == [expected]
    assert result.problems == ()


@pytest.mark.parametrize(("header", "field"), list(SPREADSHEET_VARIANTS.items()))
def test_spreadsheet_variants_map(header: str, field: str) -> None:
    result = map_headers([header], path="x.csv", line=1)
    assert [b.field for b in result.bindings] == [field]


@pytest.mark.parametrize(
    ("header", "name", "unit"),
    [
        ("Load Cap (pF)", "Load Cap", "pF"),
        ("Freq [MHz]", "Freq", "MHz"),
        ("ESR max (Ω)", "ESR max", "Ω"),
        ("Drive (µW)", "Drive", "µW"),
        ("Package", "Package", None),
    ],
)
def test_split_header_unit(header: str, name: str, unit: str | None) -> None:
    assert split_header_unit(header) == (name, unit)


def test_trailing_unit_word_and_own_column_names() -> None:
    result = map_headers(["Frequency MHz", "esr_ohm", "c0_f"], path="x.csv", line=1)
    assert [(b.field, b.unit) for b in result.bindings] == [
        ("frequency", "MHz"),
        ("esr", "Ω"),
        ("c0", "F"),
    ]


def test_bracket_that_is_not_a_unit_is_reported_not_used() -> None:
    result = map_headers(["ESR (MHz)"], path="x.csv", line=1)
    assert [(b.field, b.unit) for b in result.bindings] == [("esr", None)]
    assert "'MHz' is not a unit" in result.problems[0].message


def test_fuzzy_suggestion_is_reported_not_applied() -> None:
    result = map_headers(["Part Number", "Lod Capacitance"], path="x.csv", line=1)
    assert [b.field for b in result.bindings] == ["mpn"]
    (problem,) = result.problems
    assert problem.severity == "warning"
    assert problem.message.startswith(
        "header 'Lod Capacitance' looks like load_capacitance; confirm it in a mapping file"
    )
    assert suggest_field("Tolerence") == "tolerance"
    assert suggest_field("Colour") is None


def test_unknown_column_is_a_warning_and_duplicate_headers_are_reported() -> None:
    result = map_headers(["ESR", "Notes", "ESR"], path="x.csv", line=1)
    assert [b.field for b in result.bindings] == ["esr"]
    messages = [p.message for p in result.problems]
    assert any("appears twice" in m for m in messages)
    assert any("'Notes' is not a catalog field" in m for m in messages)


def test_mapping_file_applied_with_unit_and_ignore(
    write: Callable[[str, bytes | str], Path],
) -> None:
    path = write(
        "map.yaml",
        "Lod Capacitance: load_capacitance\nOsc: {field: frequency, unit: MHz}\nNotes: ignore\n",
    )
    mapping = load_mapping(path)
    result = map_headers(
        ["Lod Capacitance (pF)", "Osc", "Notes"], path="x.csv", line=1, mapping=mapping
    )
    assert [(b.field, b.unit) for b in result.bindings] == [
        ("load_capacitance", "pF"),
        ("frequency", "MHz"),
    ]
    assert result.problems == ()


@pytest.mark.parametrize(
    ("text", "message"),
    [
        ("Freq: frequncy\n", "did you mean frequency"),
        ("- a\n- b\n", "maps headers to fields"),
        ("Freq: {field: frequency, unit: pF}\n", "not a unit of frequency"),
        ("Freq: [\n", "not valid YAML"),
    ],
)
def test_bad_mapping_file_is_a_catalog_error(
    write: Callable[[str, bytes | str], Path], text: str, message: str
) -> None:
    with pytest.raises(CatalogError, match=message):
        load_mapping(write("map.yaml", text))


def test_trailing_unit_word() -> None:
    result = map_headers(["Drive Level uW", "ESR Ohm"], path="x.csv", line=1)
    assert [(b.field, b.unit) for b in result.bindings] == [("drive_level", "uW"), ("esr", "Ω")]
