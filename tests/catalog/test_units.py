"""Unit parsing and formatting.

Expected values are SI conversions from the BIPM SI Brochure (9th edition, 2019): prefix
factors (Table 7) and the degree Celsius / kelvin relation t/°C = T/K - 273.15; the
Fahrenheit relation t/°F = 9/5 t/°C + 32 is the NIST SP 811 (2008) definition, Annex B.
"""

from __future__ import annotations

import math

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from catalog.units import (
    DIMENSIONS,
    UnitError,
    format_quantity,
    parse_quantity,
    parse_temperature_range,
    ureg,
)


@pytest.mark.parametrize(
    ("text", "dimension", "expected"),
    [
        # SI prefixes: k = 1e3, M = 1e6, p = 1e-12, f = 1e-15, u = 1e-6 (SI Brochure Table 7)
        ("32.768 kHz", "frequency", 32768.0),
        ("16 MHz", "frequency", 16e6),
        ("16M", "frequency", 16e6),
        ("12pF", "capacitance", 12e-12),
        ("12 p", "capacitance", 12e-12),
        ("12,5 pF", "capacitance", 12.5e-12),
        ("3 fF", "capacitance", 3e-15),
        ("typ 7 pF", "capacitance", 7e-12),
        ("±20 ppm", "ppm", 20.0),
        ("+/-20ppm", "ppm", 20.0),
        ("20ppm max", "ppm", 20.0),
        ("50 ppb", "ppm", 0.05),
        ("0.01 %", "ppm", 100.0),  # 1 % = 1e4 ppm
        ("3 ppm/yr", "ppm", 3.0),
        ("max. 80 Ω", "resistance", 80.0),
        ("80 ohm", "resistance", 80.0),
        ("<= 60 Ω", "resistance", 60.0),
        ("80R", "resistance", 80.0),  # resistor code, IEC 60062
        ("4R7", "resistance", 4.7),
        ("4k7", "resistance", 4700.0),
        ("8 kΩ", "resistance", 8000.0),
        ("1 Mohm", "resistance", 1e6),
        ("100 µW", "power", 100e-6),  # MICRO SIGN
        ("100 μW", "power", 100e-6),  # GREEK SMALL LETTER MU
        ("100 uW", "power", 100e-6),
        ("-40", "temperature", -40.0),
        ("-40 °C", "temperature", -40.0),
        ("-40 degC", "temperature", -40.0),
        ("85 C", "temperature", 85.0),
        ("233.15 K", "temperature", -40.0),
        ("-40 °F", "temperature", -40.0),  # the two scales cross at -40
        ("212 °F", "temperature", 100.0),
        ("10 year", "time", 10 * 365.25 * 86400),  # pint's Julian year
        ("1 day", "time", 86400.0),
        ("9 mA/V", "transconductance", 9e-3),
        ("17 mS", "transconductance", 17e-3),
        ("500 µA/V", "transconductance", 500e-6),
        ("1.2 V", "voltage", 1.2),
        ("10 mH", "inductance", 10e-3),
        ("3.2 mm", "length", 3.2),
        ("5 %", "fraction", 0.05),
        ("0.05", "fraction", 0.05),
        ("$0.42", "money", 0.42),
        ("1,200", "count", 1200.0),
        ("-0.034 ppm/°C²", "ppm_per_c2", -0.034),
        ("-0.034 ppm/degC^2", "ppm_per_c2", -0.034),
        # Conditions and bracketed limit words around a value
        ("±10 ppm @ 25 °C", "ppm", 10.0),
        ("±10ppm at 25℃", "ppm", 10.0),  # U+2103 DEGREE CELSIUS
        ("80 Ω (max.)", "resistance", 80.0),
        ("12 pF (typ)", "capacitance", 12e-12),
        ("-40℃", "temperature", -40.0),
        ("5000+", "count", 5000.0),
        ("0,55 €", "money", 0.55),
        # One-case spellings from parts lists mean the only sensible prefix for a crystal:
        # 12PF is 12 pF (not petafarad), 16MHZ is 16 MHz, 100UW is 100 µW.
        ("12PF", "capacitance", 12e-12),
        ("12 pf", "capacitance", 12e-12),
        ("16MHZ", "frequency", 16e6),
        ("100UW", "power", 100e-6),
        ("1 MOHM", "resistance", 1e6),
        ("4.7 KOHM", "resistance", 4.7e3),
        ("2 mohm", "resistance", 2e-3),  # written in exact SI case: milli stays milli
        ("17MS", "transconductance", 17e-3),
        # A nominal with its spread is read as the nominal.
        ("-0.035±0.005 ppm/°C²", "ppm_per_c2", -0.035),
        ("25±5 °C", "temperature", 25.0),
        ("12 pF ± 0.5 pF", "capacitance", 12e-12),
        ("±3ppm 1st year", "ppm", 3.0),
        ("1 ppm per year", "ppm", 1.0),
    ],
)
def test_parse_examples(text: str, dimension: str, expected: float) -> None:
    assert parse_quantity(text, dimension, default_unit=None) == pytest.approx(  # type: ignore[arg-type]
        expected, rel=1e-12, abs=1e-12
    )


def test_default_unit_applies_to_bare_numbers_only() -> None:
    assert parse_quantity("12", "capacitance", default_unit="pF") == pytest.approx(12e-12)
    assert parse_quantity(12.5, "capacitance", default_unit="pF") == pytest.approx(12.5e-12)
    # An explicit unit in the cell wins over the header's unit.
    assert parse_quantity("8 fF", "capacitance", default_unit="pF") == pytest.approx(8e-15)
    assert parse_quantity("16", "frequency", default_unit="MHz") == 16e6


def test_values_come_out_clean() -> None:
    # 100 µW is exactly 1e-4 W; no binary noise for downstream equality and display.
    assert parse_quantity("100 uW", "power") == 1e-4
    assert parse_quantity("9 mA/V", "transconductance") == 0.009


@pytest.mark.parametrize(
    ("text", "dimension", "kind"),
    [
        ("16 MHz", "resistance", "a resistance such as '80 ohm'"),
        ("abc", "capacitance", "a capacitance such as '12 pF'"),
        ("nan", "capacitance", "a capacitance"),
        ("inf", "frequency", "a frequency"),
        ("-inf", "frequency", "a frequency"),
        ("1e400", "frequency", "a frequency"),
        ("", "resistance", "a resistance"),
        ("12 pF", "frequency", "a frequency"),
        ("20 ppm", "capacitance", "a capacitance"),
        ("-40 °C", "ppm", "a frequency deviation"),
        ("5 kg", "fraction", "a fraction"),
    ],
)
def test_parse_rejects_with_expected_kind(text: str, dimension: str, kind: str) -> None:
    with pytest.raises(UnitError) as caught:
        parse_quantity(text, dimension)  # type: ignore[arg-type]
    assert kind in str(caught.value)
    assert f"got '{text}'" in str(caught.value)


def test_parse_rejects_non_finite_numbers_and_bools() -> None:
    for value in (math.nan, math.inf, -math.inf):
        with pytest.raises(UnitError):
            parse_quantity(value, "frequency")
    with pytest.raises(UnitError):
        parse_quantity(True, "count")  # type: ignore[arg-type]


def test_unit_error_is_a_value_error() -> None:
    assert issubclass(UnitError, ValueError)


def test_registry_is_shared() -> None:
    from catalog import units

    assert units.ureg is ureg


@pytest.mark.parametrize(
    ("text", "expected"),
    [
        ("-40 to 85 °C", (-40.0, 85.0)),
        ("-40 °C to +85 °C", (-40.0, 85.0)),
        ("-40~+85", (-40.0, 85.0)),
        ("-40…85 °C", (-40.0, 85.0)),
        ("-40/+85", (-40.0, 85.0)),
        ("-40 - 85", (-40.0, 85.0)),
        ("-40-85", (-40.0, 85.0)),
        ("-20..70", (-20.0, 70.0)),
        ("[-40, 85]", (-40.0, 85.0)),
        ("−40 to +125 °C", (-40.0, 125.0)),  # typographic minus
        ("-40 ~ +85℃", (-40.0, 85.0)),
        ("from -40 to 85 °C", (-40.0, 85.0)),
        ("between -40 and +85 °C", (-40.0, 85.0)),
        # NIST SP 811: t/°C = (t/°F - 32) * 5/9; unit given once applies to both ends
        ("-40 to 185 °F", (-40.0, 85.0)),
    ],
)
def test_temperature_ranges(text: str, expected: tuple[float, float]) -> None:
    low, high = parse_temperature_range(text)
    assert low == pytest.approx(expected[0])
    assert high == pytest.approx(expected[1])


@pytest.mark.parametrize("text", ["85 to -40", "25 to 25", "x", "", "-40", "a to b"])
def test_temperature_range_rejects(text: str) -> None:
    with pytest.raises(UnitError):
        parse_temperature_range(text)


@pytest.mark.parametrize(
    ("value", "dimension", "expected"),
    [
        (32768.0, "frequency", "32.768 kHz"),
        (12e-12, "capacitance", "12 pF"),
        (80.0, "resistance", "80 Ω"),
        (100e-6, "power", "100 µW"),
        (-40.0, "temperature", "-40 °C"),
        (9e-3, "transconductance", "9 mA/V"),
        (1.2e-3, "time", "1.2 ms"),
        (14.31818e6, "frequency", "14.3182 MHz"),
        (0.05, "fraction", "5 %"),
        (20.0, "ppm", "20 ppm"),
        (999.99999, "resistance", "1 kΩ"),  # rounding carries to the next prefix
        (0.0, "capacitance", "0 F"),
        (math.nan, "frequency", "—"),
    ],
)
def test_format_examples(value: float, dimension: str, expected: str) -> None:
    assert format_quantity(value, dimension) == expected  # type: ignore[arg-type]


@pytest.mark.parametrize(
    ("value", "dimension"),
    [
        (32768.0, "frequency"),
        (12e-12, "capacitance"),
        (80.0, "resistance"),
        (-40.0, "temperature"),
        (9e-3, "transconductance"),
        (1e-4, "power"),
        (20.0, "ppm"),
    ],
)
def test_format_round_trips_through_parse(value: float, dimension: str) -> None:
    text = format_quantity(value, dimension)  # type: ignore[arg-type]
    assert parse_quantity(text, dimension) == pytest.approx(value)  # type: ignore[arg-type]


@settings(max_examples=400, deadline=None)
@given(
    text=st.text(max_size=40),
    dimension=st.sampled_from(DIMENSIONS),
    unit=st.one_of(st.none(), st.text(max_size=8)),
)
def test_any_text_gives_a_finite_float_or_unit_error(
    text: str, dimension: str, unit: str | None
) -> None:
    try:
        value = parse_quantity(text, dimension, default_unit=unit)  # type: ignore[arg-type]
    except UnitError:
        return
    assert isinstance(value, float)
    assert math.isfinite(value)


@settings(max_examples=200, deadline=None)
@given(
    text=st.from_regex(
        r"[-+±~ ]{0,2}[0-9.,eE]{1,8} ?(p|pF|k|kHz|MHz|ohm|R|°C|ppm|%|x)?", fullmatch=True
    ),
    dimension=st.sampled_from(DIMENSIONS),
)
def test_number_like_text_gives_a_finite_float_or_unit_error(text: str, dimension: str) -> None:
    try:
        value = parse_quantity(text, dimension)  # type: ignore[arg-type]
    except UnitError:
        return
    assert math.isfinite(value)


@settings(max_examples=300, deadline=None)
@given(text=st.text(max_size=40))
def test_any_text_gives_a_range_or_unit_error(text: str) -> None:
    try:
        low, high = parse_temperature_range(text)
    except UnitError:
        return
    assert low < high
