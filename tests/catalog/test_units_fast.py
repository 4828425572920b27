"""The pint-free fast paths of catalog.units give exactly what the pint path gives.

Reference: pint itself (``UnitRegistry.Quantity(n, unit).to(canonical)``), the unit
library the parser falls back to. Every comparison is bit for bit (``==`` on floats, or
the same UnitError message), since a faster load must not change a single value.
"""

from __future__ import annotations

import math
import subprocess
import sys
from unittest import mock

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from catalog import units
from catalog.units import UnitError, parse_plain_numbers, parse_quantity

# Spellings a catalog cell or header may carry, per dimension (fast-table ones, ones that
# only pint knows, and a few wrong ones).
_UNITS: dict[str, list[str]] = {
    "frequency": ["Hz", "kHz", "MHz", "GHz", "khz", "MHZ", "k", "M", "mHz", "hertz", "pF"],
    "capacitance": ["F", "fF", "pF", "nF", "uF", "µF", "PF", "p", "f", "mF", "aF", "Hz"],
    "resistance": ["ohm", "Ω", "kohm", "kΩ", "MΩ", "R", "k", "M", "mohm", "Gohm", "ohms"],
    "power": ["W", "uW", "µW", "mW", "nW", "UW", "u", "kW", "pW", "V"],
    "time": ["s", "ms", "us", "yr", "year", "years", "d", "day", "h", "min", "months", "week"],
    "transconductance": ["S", "mS", "mA/V", "uA/V", "mmho", "umho", "A/V", "nS", "ohm"],
    "voltage": ["V", "mV", "uV", "kV", "m", "u"],
    "inductance": ["H", "mH", "uH", "nH", "kH", "m"],
    "length": ["mm", "cm", "m", "um", "mil", "thou", "inch", "in", "ft"],
    "temperature": ["°C", "degC", "C", "K", "°F", "celsius"],
}

_numbers = st.one_of(
    st.floats(allow_nan=False, allow_infinity=False, width=64).map(repr),
    st.integers(min_value=-(10**20), max_value=10**20).map(str),
    st.from_regex(r"[+-]?[0-9]{1,6}(\.[0-9]{0,8})?([eE][+-]?[0-9]{1,3})?", fullmatch=True),
)


def _outcome(text: str, dimension: str, default_unit: str | None) -> float | str:
    """The uncached parse: the value, or the UnitError message."""
    try:
        return units._parse_uncached(text, dimension, default_unit)
    except UnitError as error:
        return f"UnitError: {error}"
    except Exception as error:  # the cached wrapper turns these into its own message
        return f"other: {type(error).__name__}"


def _same(fast: float | str, slow: float | str) -> bool:
    if isinstance(fast, float) and isinstance(slow, float):
        return fast == slow or (math.isnan(fast) and math.isnan(slow))
    return fast == slow


@pytest.mark.parametrize(("unit", "canonical"), sorted(units._FAST_FACTORS))
def test_every_fast_factor_is_pints_factor(unit: str, canonical: str) -> None:
    # pint converts a multiplicative unit as value * factor; the table must hold that factor.
    pint_factor = units._registry().Quantity(1.0, unit).to(canonical).magnitude
    assert units._FAST_FACTORS[(unit, canonical)] == pint_factor


@settings(max_examples=400, deadline=None)
@given(
    data=st.data(),
    dimension=st.sampled_from(sorted(_UNITS)),
    number=_numbers,
    space=st.sampled_from(["", " ", "  "]),
)
def test_fast_conversion_equals_pint(
    data: st.DataObject, dimension: str, number: str, space: str
) -> None:
    unit = data.draw(st.sampled_from(_UNITS[dimension]))
    text = f"{number}{space}{unit}"
    fast = _outcome(text, dimension, None)
    with mock.patch.dict(units._FAST_FACTORS, clear=True):
        slow = _outcome(text, dimension, None)
    assert _same(fast, slow), (text, fast, slow)


_ALL_DIMENSIONS = sorted(units.DIMENSIONS)
_HEADER_UNITS = [
    *sorted({unit for spellings in _UNITS.values() for unit in spellings}),
    "ppm",
    "ppm/yr",
    "%",
    "USD",
    "pcs",
    "ppm/°C²",
    "",
    "bogus",
]


@settings(max_examples=600, deadline=None)
@given(
    texts=st.lists(
        st.one_of(_numbers, st.text(max_size=12), st.sampled_from(["", " 12", "1,5", "+-3"])),
        max_size=12,
    ),
    dimension=st.sampled_from(_ALL_DIMENSIONS),
    default_unit=st.one_of(st.none(), st.sampled_from(_HEADER_UNITS)),
)
def test_plain_numbers_equal_parse_quantity(
    texts: list[str], dimension: str, default_unit: str | None
) -> None:
    values, handled = parse_plain_numbers(texts, dimension, default_unit=default_unit)  # type: ignore[arg-type]
    for text, value, done in zip(texts, values.tolist(), handled.tolist(), strict=True):
        if not done:
            assert math.isnan(value)
            continue
        # Handled cells: exactly parse_quantity's value, through the pint path too.
        assert value == parse_quantity(text, dimension, default_unit=default_unit)  # type: ignore[arg-type]
        with mock.patch.dict(units._FAST_FACTORS, clear=True):
            assert value == _outcome(text, dimension, default_unit)


def test_plain_numbers_take_the_common_catalog_cells() -> None:
    # A fast path that never fires would pass the equality tests above; these must fire.
    values, handled = parse_plain_numbers(
        ["10", "2.65", "1e3", "-40", "12 pF"], "capacitance", default_unit="pF"
    )
    assert handled.tolist() == [True, True, True, True, False]
    assert values[0] == 1e-11  # 10 pF, the value pint gives for 10 * 1e-12 F
    values, handled = parse_plain_numbers(["0.42", "82544"], "money")
    assert handled.all() and values.tolist() == [0.42, 82544.0]


def test_plain_numbers_leave_pint_units_alone() -> None:
    _, handled = parse_plain_numbers(["25"], "temperature", default_unit="°F")
    assert not handled.any()
    _, handled = parse_plain_numbers(["25"], "length", default_unit="ft")
    assert not handled.any()


def test_common_units_parse_without_importing_pint() -> None:
    # A warm run should not pay for pint: the demo's spellings convert without it.
    code = (
        "import sys; from catalog.units import parse_quantity as p;"
        "v = [p('32.768 kHz', 'frequency'), p('12 pF', 'capacitance'), p('80 Ω', 'resistance'),"
        " p('100 µW', 'power'), p('-40 °C', 'temperature'), p('9 mA/V', 'transconductance'),"
        " p('10 year', 'time'), p('3.2 mm', 'length'), p('20 ppm', 'ppm')];"
        "print(v, 'pint' in sys.modules)"
    )
    done = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True)
    assert done.stdout.strip().endswith("False"), done.stdout
    assert units.ureg is units._registry()  # the lazy public name is the one registry
