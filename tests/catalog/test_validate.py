"""Cell and row validation: bad cells, units, ranges, required values, plausibility.

Sources: required fields and problem contents are DESIGN.md §3; Q = 1/(2π·f·R1·C1) is the
Butterworth-Van Dyke relation (IEC 60122-1 terms), checked against sympy; the plausibility
bands (Q 1e3..1e7, C0/C1 50..50000, CL 4..32 pF) are common practice; the AT-cut frequency
constant 1.661 MHz·mm is from memory (Bottom, "Introduction to Quartz Crystal Unit
Design", 1982).
"""

from __future__ import annotations

import math
from collections.abc import Callable
from pathlib import Path

import pytest
import sympy

from catalog.plausibility import quality_factor
from catalog.problems import CatalogError
from catalog.reader import load_catalogs
from catalog.validate import normalise_package

from .conftest import DEMO_HEADER, GOOD_ROW

Write = Callable[[str, bytes | str], Path]


def _load(write: Write, *rows: str, header: str = DEMO_HEADER):
    return load_catalogs([write("parts.csv", "\n".join([header, *rows]) + "\n")])


def test_one_bad_cell_reports_file_line_field_raw_and_keeps_other_rows(write: Write) -> None:
    bad = GOOD_ROW.replace("ZX-16A", "ZX-16B").replace(",80,", ",16 MHz,")
    result = _load(write, GOOD_ROW, bad, GOOD_ROW.replace("ZX-16A", "ZX-16C"))
    assert list(result.parts["mpn"]) == ["ZX-16A", "ZX-16C"]
    (problem,) = result.problems
    assert problem.path.endswith("parts.csv")
    assert (problem.line, problem.field, problem.raw, problem.severity) == (
        3,
        "esr",
        "16 MHz",
        "error",
    )
    assert "expected a resistance such as '80 ohm', got '16 MHz'" in problem.message
    assert problem.one_line().endswith(
        "parts.csv:3: esr: expected a resistance such as '80 ohm', got '16 MHz'; row not loaded"
    )
    assert result.files[0].rows_read == 3 and result.files[0].rows_loaded == 2


@pytest.mark.parametrize(
    ("old", "new", "field", "words"),
    [
        (",80,", ",-80,", "esr", "negative"),
        (",80,", ",0,", "esr", "zero"),
        # "nan"/"n/a" mean "no value" (pandas writes nan for a blank); required -> missing.
        (",80,", ",nan,", "esr", "missing"),
        (",80,", ",NaN ohm,", "esr", "expected a resistance"),
        (",80,", ",inf,", "esr", "expected a resistance"),
        ("16 MHz", "12 pF", "frequency", "expected a frequency"),
        (",12,", ",12 ppm,", "load_capacitance", "expected a capacitance"),
        (",3,5", ",-3,5", "c0", "negative"),
        ("-40 to 85 °C", "85 to -40 °C", "temp_range", "minimum at or above"),
        ("16 MHz", "16", "frequency", "outside any quartz crystal"),
    ],
)
def test_impossible_values_drop_the_row(
    write: Write, old: str, new: str, field: str, words: str
) -> None:
    result = _load(write, GOOD_ROW.replace(old, new, 1))
    assert result.parts.empty
    assert any(
        p.field == field and words in p.message and p.severity == "error" for p in result.problems
    ), result.problems


def test_every_problem_of_a_row_is_reported(write: Write) -> None:
    result = _load(write, GOOD_ROW.replace("16 MHz", "x").replace(",80,", ",y,"))
    assert {p.field for p in result.problems} == {"frequency", "esr"}


def test_bare_capacitance_without_header_unit_is_refused(write: Write) -> None:
    header = "Part Number,Freq,CL,Tol,Stability,Temp Range,ESR,Package"
    result = _load(write, "ZX-1,16 MHz,12,10,20,-40 to 85,80,3225", header=header)
    assert result.parts.empty
    assert "has no unit" in result.problems[0].message
    ok = _load(write, "ZX-1,16 MHz,12 pF,10,20,-40 to 85,80,3225", header=header)
    assert ok.parts["load_capacitance_f"].iloc[0] == pytest.approx(12e-12)


def test_series_calibrated_parts(write: Write) -> None:
    parts = _load(write, GOOD_ROW.replace(",12,", ",series,")).parts
    assert bool(parts["series_calibrated"].iloc[0])
    assert math.isnan(parts["load_capacitance_f"].iloc[0])


def test_missing_required_value_drops_row_but_tuning_fork_may_lack_stability(
    write: Write,
) -> None:
    header = "Part Number,Freq,CL,Tol,Stability,Temp Range,ESR,Package,Cut"
    rows = [
        "ZX-1,16 MHz,12 pF,10,,-40 to 85,80,3225,AT",  # AT-cut: stability needed
        "ZX-2,32.768 kHz,12.5 pF,20,,-40 to 85,70 kohm,2012,tuning fork",
        "ZX-3,16 MHz,12 pF,10,20,-40 to 85,80,,AT",
    ]
    result = _load(write, *rows, header=header)
    assert list(result.parts["mpn"]) == ["ZX-2"]
    assert result.parts["cut"].iloc[0] == "tuning_fork"
    assert {(p.line, p.field) for p in result.problems} == {(2, "stability"), (4, "package")}


def test_missing_required_column_names_file_fields_and_closest_headers(write: Write) -> None:
    header = "Part Number,Freq,Lod Capacitance,Tol,Stability,Temp Range,ESR"
    with pytest.raises(CatalogError) as caught:
        _load(write, "ZX-1,16 MHz,12 pF,10,20,-40 to 85,80", header=header)
    message = str(caught.value)
    assert "parts.csv:1: missing required column(s)" in message
    assert "load_capacitance (closest headers: 'Lod Capacitance'" in message
    assert "package" in message


def test_asymmetric_tolerance_takes_the_worse_side(write: Write) -> None:
    result = _load(write, GOOD_ROW.replace(",±10,", ",-10/+15 ppm,"))
    assert result.parts["tolerance_ppm"].iloc[0] == 15.0
    assert result.problems[0].severity == "warning"


def test_choices_are_normalised_or_warned(write: Write) -> None:
    header = DEMO_HEADER + ",Mode,Lifecycle,Pinout,MSL"
    parts = _load(write, GOOD_ROW + ",3rd overtone,NRND,pads 2&4,MSL 1", header=header).parts
    assert list(parts[["mode", "lifecycle", "pinout", "msl"]].iloc[0]) == [
        "overtone3",
        "nrnd",
        "2-4",
        "1",
    ]
    result = _load(write, GOOD_ROW + ",sideways,,,", header=header)
    assert result.parts["mode"].iloc[0] == "fundamental"
    assert result.problems[0].severity == "warning"


@pytest.mark.parametrize(
    ("text", "expected"),
    [
        ("3.2x2.5 mm", "3225"),
        ("2.0 x 1.6", "2016"),
        ("hc49/us", "HC-49/US"),
        ("HC-49/SMD", "HC-49/SMD"),
        (" 3225 ", "3225"),
        ("5032", "5032"),
    ],
)
def test_package_names(text: str, expected: str) -> None:
    assert normalise_package(text) == expected


def test_quality_factor_matches_sympy() -> None:
    # Q = 1/(2π f R1 C1): Butterworth-Van Dyke model, IEC 60122-1; evaluated by sympy.
    f, r, c = sympy.symbols("f r c", positive=True)
    expression = 1 / (2 * sympy.pi * f * r * c)
    expected = float(expression.subs({f: 16e6, r: 80, c: sympy.Rational(5, 10**15)}))
    assert quality_factor(16e6, 80.0, 5e-15) == pytest.approx(expected, rel=1e-12)
    # By hand: 2π·16e6·80·5e-15 = 4.0212e-5, so Q ≈ 24868.


@pytest.mark.parametrize(
    ("old", "new", "field", "words"),
    [
        # C1 typed in pF instead of fF: Q = 1/(2π·16e6·80·5e-12) ≈ 25, far below 1e3.
        ("C1 (fF)", "C1 (pF)", "c1", "Q = "),
        # C0/C1 = 3 pF / 5 fF = 600 is typical; C0 in nF gives 6e5, outside 50..50000.
        ("C0 (pF)", "C0 (nF)", "c0", "C0/C1"),
        # 45 pF is outside the 4..32 pF common-practice band.
        (",12,", ",45,", "load_capacitance", "outside the usual 4..32 pF"),
        # 80 MHz AT fundamental: 1.661 MHz·mm / 80 MHz ≈ 21 µm plate.
        ("16 MHz", "80 MHz", "mode", "21 µm"),
    ],
)
def test_plausibility_warnings_keep_the_row(
    write: Write, old: str, new: str, field: str, words: str
) -> None:
    text = "\n".join(
        [
            DEMO_HEADER.replace(old, new) if "(" in old else DEMO_HEADER,
            GOOD_ROW.replace(old, new) if "(" not in old else GOOD_ROW,
        ]
    )
    result = load_catalogs([write("parts.csv", text + "\n")])
    assert len(result.parts) == 1
    found = [p for p in result.problems if p.field == field]
    assert found and found[0].severity == "warning" and words in found[0].message, result.problems


def test_plausible_part_has_no_warnings(write: Write) -> None:
    # The reference row: 16 MHz, R1 80 Ω, C1 5 fF -> Q ≈ 2.5e4; C0/C1 = 600; CL 12 pF.
    assert _load(write, GOOD_ROW).problems == ()


def test_positive_beta_is_flagged(write: Write) -> None:
    header = "Part Number,Freq,CL,Tol,Stability,Temp Range,ESR,Package,Beta"
    result = _load(write, "ZX-2,32.768 kHz,12.5 pF,20,,-40 to 85,70 kohm,2012,0.034", header=header)
    assert result.problems[0].field == "beta"


def test_repeated_header_row_is_skipped_with_a_warning(write: Write) -> None:
    result = _load(write, GOOD_ROW, DEMO_HEADER, GOOD_ROW.replace("ZX-16A", "ZX-16B"))
    assert list(result.parts["mpn"]) == ["ZX-16A", "ZX-16B"]
    (problem,) = result.problems
    assert (problem.line, problem.severity) == (3, "warning")
    assert "header row is repeated" in problem.message


def test_pinout_turned_into_a_date_gets_a_hint(write: Write) -> None:
    header = DEMO_HEADER + ",Pinout"
    result = _load(
        write, GOOD_ROW + ",3-Jan", GOOD_ROW.replace("ZX-16A", "ZX-16B") + ",3-1", header=header
    )
    assert list(result.parts["pinout"]) == ["", "1-3"]
    assert "into a date" in result.problems[0].message


def test_each_distinct_text_is_parsed_once(write: Write, monkeypatch: pytest.MonkeyPatch) -> None:
    import catalog.validate as validate_module

    calls: list[tuple[str, str]] = []
    real = validate_module.parse_quantity

    def counting(text: str, dimension: str, **kwargs: object) -> float:
        calls.append((text, dimension))
        return real(text, dimension, **kwargs)  # type: ignore[arg-type]

    batches: list[tuple[list[str], str]] = []
    real_batch = validate_module.parse_plain_numbers

    def counting_batch(texts: list[str], dimension: str, **kwargs: object) -> object:
        batches.append((list(texts), dimension))
        return real_batch(texts, dimension, **kwargs)  # type: ignore[arg-type]

    monkeypatch.setattr(validate_module, "parse_quantity", counting)
    monkeypatch.setattr(validate_module, "parse_plain_numbers", counting_batch)
    # Cells with a unit go through parse_quantity, once per distinct text.
    rows = [
        GOOD_ROW.replace("ZX-16A", f"ZX-{i}").replace(",80,", f",{60 + 20 * (i % 2)} ohm,")
        for i in range(500)
    ]
    result = _load(write, *rows)
    assert len(result.parts) == 500
    esr_calls = [text for text, dimension in calls if dimension == "resistance"]
    assert sorted(esr_calls) == ["60 ohm", "80 ohm"]  # 500 cells, two distinct texts
    # Plain numbers are read in one batch of the distinct texts per column.
    calls.clear()
    batches.clear()
    rows = [
        GOOD_ROW.replace("ZX-16A", f"ZX-{i}").replace(",80,", f",{60 + 20 * (i % 2)},")
        for i in range(500)
    ]
    result = _load(write, *rows)
    assert len(result.parts) == 500
    assert not [text for text, dimension in calls if dimension == "resistance"]
    esr_batches = [texts for texts, dimension in batches if dimension == "resistance"]
    assert [sorted(texts) for texts in esr_batches] == [["60", "80"]]
    assert sorted(result.parts["esr_ohm"].unique()) == [60.0, 80.0]
