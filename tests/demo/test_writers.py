"""Writers: what is written reads back as the same text, in every style."""

from __future__ import annotations

import csv
import io
from pathlib import Path

import numpy as np
import pandas as pd
import pytest
import yaml

from demo_catalog.fields import FIELDS
from demo_catalog.generate import generate_part_table, generate_parts
from demo_catalog.writers import SPREADSHEET_COLUMNS, render_csv, render_yaml, write_csv, write_yaml

from .committed import CSV_PATH, YAML_PATH, quantity


@pytest.fixture(scope="module")
def parts() -> pd.DataFrame:
    return generate_parts(800, 11)


def _as_text(frame: pd.DataFrame) -> list[dict[str, str]]:
    return [
        {str(k): ("" if pd.isna(v) else str(v)) for k, v in row.items()}
        for row in frame.to_dict(orient="records")
    ]


def test_plain_csv_round_trips(parts: pd.DataFrame) -> None:
    rows = list(csv.DictReader(io.StringIO(render_csv(parts, "plain"))))
    assert rows == _as_text(parts)


def test_yaml_round_trips_and_omits_blanks(parts: pd.DataFrame) -> None:
    items = yaml.safe_load(render_yaml(parts))["parts"]
    assert len(items) == len(parts)
    for item, expected in zip(items, _as_text(parts), strict=True):
        assert set(item) == {k for k, v in expected.items() if v != ""}
        assert {k: str(v) for k, v in item.items()} == {k: v for k, v in expected.items() if v}
        assert isinstance(item.get("msl", ""), str)
        assert isinstance(item["package"], str)


def test_spreadsheet_csv_values_agree_with_the_numbers(parts: pd.DataFrame) -> None:
    table = generate_part_table(800, 11)
    rows = list(csv.DictReader(io.StringIO(render_csv(parts, "spreadsheet"))))
    assert list(rows[0]) == [h for h, _, _ in SPREADSHEET_COLUMNS]
    freq = np.array([quantity(r["Freq"], "Hz") for r in rows])
    esr = np.array([quantity(r["ESR max (Ω)"], "ohm", "Ω") for r in rows])
    c1 = np.array([quantity(r["C1 (fF)"], "F", "fF") for r in rows])
    tol = np.array([quantity(r["Tolerance (ppm)"], "ppm", "ppm") for r in rows])
    np.testing.assert_allclose(freq, table["freq_hz"], rtol=1e-12)
    np.testing.assert_allclose(esr, table["esr_ohm"], rtol=1e-12)
    np.testing.assert_allclose(c1, table["c1_f"], rtol=1e-9)
    np.testing.assert_allclose(tol, table["tolerance_ppm"], rtol=1e-12)
    series = [r["Load Cap (pF)"] == "series" for r in rows]
    assert series == table["series_calibrated"].tolist()


def test_committed_export_carries_spreadsheet_decorations() -> None:
    text = CSV_PATH.read_text(encoding="utf-8")
    header = text.splitlines()[0]
    for name in (
        "Part Number",
        "Manufacturer",
        "Freq",
        "Load Cap (pF)",
        "ESR max (Ω)",
        "Operating Temperature",
        "Drive Level max (µW)",
        "Beta (ppm/°C²)",
    ):
        assert name in header.split(",")
    for decorated in (
        ",±",
        "ppm max,",
        " Ω,",
        " kΩ,",
        "MHz,",
        " kHz,",
        " MHz,",
        ",series,",
        ",12.5,",
        " to 85 °C,",
    ):
        assert decorated in text, decorated
    assert "\r" not in text and not text.startswith("\ufeff")
    # The trap for alternates reads as what it is.
    assert ",32.000 kHz," in text or ",32.000kHz," in text


def test_committed_yaml_uses_unit_strings() -> None:
    data = yaml.safe_load(YAML_PATH.read_text(encoding="utf-8"))
    first = data["parts"][0]
    assert first["frequency"].endswith("MHz") and first["esr"].endswith("ohm")
    assert first["temp_min"].endswith("degC") and first["drive_level"].endswith("uW")
    assert first["load_capacitance"].endswith("pF")


def test_awkward_text_is_quoted(tmp_path: Path) -> None:
    frame = generate_parts(3, 5).assign(
        maker=["Comma, Inc", 'Quote "Q"', "yes"], mpn=["A-1", "no", "#3"]
    )
    write_csv(frame, tmp_path / "x.csv", style="plain")
    rows = list(csv.DictReader((tmp_path / "x.csv").open(encoding="utf-8", newline="")))
    assert [r["maker"] for r in rows] == ["Comma, Inc", 'Quote "Q"', "yes"]
    write_yaml(frame, tmp_path / "x.yaml")
    items = yaml.safe_load((tmp_path / "x.yaml").read_text(encoding="utf-8"))["parts"]
    assert [i["maker"] for i in items] == ["Comma, Inc", 'Quote "Q"', "yes"]
    assert [i["mpn"] for i in items] == ["A-1", "no", "#3"]


def test_writes_are_atomic_and_leave_no_temporaries(tmp_path: Path) -> None:
    target = tmp_path / "cat.csv"
    target.write_text("old", encoding="utf-8")
    target.chmod(0o640)
    write_csv(generate_parts(5), target)
    assert target.read_text(encoding="utf-8").startswith("Part Number,")
    assert target.stat().st_mode & 0o777 == 0o640
    assert [p.name for p in tmp_path.iterdir()] == ["cat.csv"]
    with pytest.raises(ValueError, match="style"):
        write_csv(generate_parts(5), target, style="fancy")  # type: ignore[arg-type]
    assert target.read_text(encoding="utf-8").startswith("Part Number,")


def test_empty_frames_render(tmp_path: Path) -> None:
    empty = generate_parts(0)
    assert render_csv(empty, "plain").strip() == ",".join(FIELDS)
    assert yaml.safe_load(render_yaml(empty)) == {"parts": []}


def test_catalog_reader_loads_both_files_without_problems() -> None:
    reader = pytest.importorskip("catalog.reader")
    from demo_catalog import demo_catalog_paths
    from demo_catalog.generate import demo_part_tables

    result = reader.load_catalogs(demo_catalog_paths())
    assert [p.one_line() for p in result.problems] == []
    assert [f.rows_read == f.rows_loaded for f in result.files] == [True, True]
    loaded = result.parts.set_index("mpn")
    mine = pd.concat(demo_part_tables().values(), ignore_index=True).set_index("mpn")
    assert set(loaded.index) == set(mine.index)
    loaded = loaded.loc[mine.index]
    for column in (
        "freq_hz",
        "load_capacitance_f",
        "tolerance_ppm",
        "stability_ppm",
        "temp_min_c",
        "temp_max_c",
        "esr_ohm",
        "c0_f",
        "c1_f",
        "drive_level_w",
        "aging_ppm",
        "beta_ppm_per_c2",
        "turnover_c",
        "height_mm",
        "price",
        "stock",
    ):
        np.testing.assert_allclose(loaded[column], mine[column], rtol=1e-9, err_msg=column)
    for column in ("package", "mode", "pinout", "lifecycle", "qualification"):
        assert loaded[column].astype(str).tolist() == mine[column].astype(str).tolist(), column
    assert loaded["series_calibrated"].tolist() == mine["series_calibrated"].tolist()


@pytest.mark.parametrize("style", ["spreadsheet", "plain", "yaml"])
def test_catalog_reader_loads_generated_catalogs_in_every_style(tmp_path: Path, style: str) -> None:
    reader = pytest.importorskip("catalog.reader")
    parts = generate_parts(400, 21)
    path = tmp_path / ("parts.yaml" if style == "yaml" else "parts.csv")
    if style == "yaml":
        write_yaml(parts, path)
    else:
        write_csv(parts, path, style=style)  # type: ignore[arg-type]
    result = reader.load_catalogs([path])
    assert [p.one_line() for p in result.problems] == []
    table = generate_part_table(400, 21).set_index("mpn")
    loaded = result.parts.set_index("mpn").loc[table.index]
    for column in ("freq_hz", "esr_ohm", "c1_f", "load_capacitance_f", "drive_level_w"):
        np.testing.assert_allclose(loaded[column], table[column], rtol=1e-9, err_msg=column)
