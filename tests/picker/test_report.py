"""report: the JSON contract (DESIGN §6), formula-safe CSV, 80-column text."""

from __future__ import annotations

import csv
import io
import json

import pytest

from picker import report
from picker.rank import rank_parts
from tests.picker.sample_parts import brief, part, table

CONTRACT_KEYS = {
    "mpn": str,
    "frequency_hz": float,
    "fs_hz": float,
    "fp_hz": float,
    "q": float,
    "load_capacitance_f": float,
    "external_caps_f": list,
    "pulling_ppm": float,
    "trim_sensitivity_ppm_per_pf": float,
    "negative_resistance_ohm": float,
    "negative_resistance_margin": float,
    "gm_critical_s": float,
    "gain_margin": float,
    "drive_level_w": float,
    "startup_time_s": float,
    "error_ppm": dict,
    "budget_headroom_ppm": float,
    "status": str,
    "reasons": list,
    "estimated": list,
    "amplifier_form": str,
}


@pytest.fixture(scope="module")
def ranking():  # type: ignore[no-untyped-def]
    parts = table(
        [
            part("=CMD|' /C calc'!A0", esr_ohm=50.0),
            part("GOOD"),
            part("EST", c0_f=float("nan"), c1_f=float("nan")),
            part("BAD", esr_ohm=200.0),
        ]
    )
    return rank_parts(parts, brief())


def test_part_object_has_the_contract_keys_and_types(ranking) -> None:  # type: ignore[no-untyped-def]
    obj = report.part_object(ranking.row("GOOD"), ranking.brief)
    for key, kind in CONTRACT_KEYS.items():
        assert isinstance(obj[key], kind), key
    assert set(obj["error_ppm"]) >= {
        "tolerance",
        "temperature",
        "aging",
        "pulling",
        "spread",
        "total",
    }
    assert obj["negative_resistance_ohm"] < 0
    assert obj["status"] in ("fit", "marginal", "ruled_out")
    assert obj["drive_setting"] is None
    ca, cb = obj["external_caps_f"]
    assert (ca, cb) == pytest.approx((10e-12, 12e-12))  # SI farads, not pF
    json.loads(report.to_json(obj))  # valid JSON, no NaN


def test_estimated_fields_listed(ranking) -> None:  # type: ignore[no-untyped-def]
    assert report.part_object(ranking.row("EST"), ranking.brief)["estimated"] == ["c0", "c1"]
    assert report.part_object(ranking.row("GOOD"), ranking.brief)["estimated"] == []


def test_ruled_out_part_carries_reasons(ranking) -> None:  # type: ignore[no-untyped-def]
    obj = report.part_object(ranking.row("BAD"), ranking.brief)
    assert obj["status"] == "ruled_out"
    assert obj["reasons"][0].startswith("margin ")


@pytest.mark.parametrize(
    ("value", "expected"),
    [
        ("=1+1", "'=1+1"),
        ("+SUM(A1)", "'+SUM(A1)"),
        ("-2+3", "'-2+3"),
        ("@cmd", "'@cmd"),
        ("\tx", "'\tx"),
        ("\rx", "'\rx"),
        ("plain", "plain"),
        (-312.5, -312.5),  # numbers stay numbers, a negative resistance is not neutralised
        (float("nan"), ""),
        (None, ""),
        (True, "true"),
    ],
)
def test_safe_cell(value: object, expected: object) -> None:
    assert report.safe_cell(value) == expected


def test_csv_neutralises_text_and_keeps_numbers(ranking) -> None:  # type: ignore[no-untyped-def]
    rows = report.ranking_csv_rows(ranking.table, ranking.brief)
    text = report.to_csv(rows, report.RANK_CSV_COLUMNS)
    records = list(csv.DictReader(io.StringIO(text)))
    evil = next(r for r in records if "CMD" in r["mpn"])
    assert evil["mpn"].startswith("'=")
    assert float(evil["negative_resistance_ohm"]) < 0  # still a plain number
    assert not evil["negative_resistance_ohm"].startswith("'")


def test_ranking_table_fits_80_columns(ranking) -> None:  # type: ignore[no-untyped-def]
    text = report.ranking_table(ranking, ranking.head(10, include_ruled_out=True))
    assert max(len(line) for line in text.splitlines()) <= 80
    assert "[" in text and "#" in text  # text bars, no colour needed


def test_part_sheet_shows_provenance_caution_and_bench_plan(ranking) -> None:  # type: ignore[no-untyped-def]
    sheet = report.part_sheet(ranking.row("EST"), ranking.brief)
    assert max(len(line) for line in sheet.splitlines()) <= 80
    assert "estimate" in sheet and "catalog" in sheet and "brief" in sheet
    assert "negative-resistance test" in sheet
    # Bench plan: with min margin 5 and R1 60 Ω, add (5 − 1)·60 = 240 Ω in series.
    assert "(5−1)·60 Ω = 240 Ω" in sheet
    assert "10 pF + 12 pF" in sheet


def test_bar_is_text() -> None:
    assert report.bar(0.5) == "[###...]"
    assert report.bar(None) == "[??????]"
    assert report.bar(2.0) == "[######]"


def test_ranking_table_shows_whole_part_numbers_within_80_columns() -> None:
    # A BOM needs the whole part number: a long one gets a line of its own, never an ellipsis.
    long_mpn = "XQ-3225-16.000MHZ-08PF-T&R-LONGSUFFIX"
    ranked = rank_parts(table([part(long_mpn), part("SHORT-1")]), brief())
    text = report.ranking_table(ranked, ranked.head(10, include_ruled_out=True))
    assert long_mpn in text and "SHORT-1" in text
    assert max(len(line) for line in text.splitlines()) <= 80
