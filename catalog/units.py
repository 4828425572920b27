"""Units at the edge: the program's one pint registry, text -> SI float, SI float -> text.

Everything inside the program works on plain floats in the canonical unit of each
dimension (Hz, F, ohm, W, ppm, degC, s, S, V, H, mm, ratio). This module is the only
place that turns catalog or brief text into those floats and back.

Parsing is cached per ``(text, dimension, default_unit)`` because catalog columns repeat
the same few strings thousands of times.
"""

from __future__ import annotations

import math
import numbers
import re
from collections.abc import Sequence
from functools import lru_cache
from typing import TYPE_CHECKING, Any, Final, Literal, get_args

import numpy as np

if TYPE_CHECKING:
    import pint

    #: The program's one pint registry, built on first access (see ``__getattr__``).
    ureg: pint.UnitRegistry

__all__ = [
    "DIMENSIONS",
    "Dimension",
    "UnitError",
    "canonical_unit",
    "format_quantity",
    "is_bare_number",
    "parse_plain_numbers",
    "parse_quantity",
    "parse_temperature_range",
    "ureg",
]


class UnitError(ValueError):
    """A text is not a finite quantity of the expected kind."""


Dimension = Literal[
    "frequency",
    "capacitance",
    "resistance",
    "power",
    "ppm",
    "temperature",
    "time",
    "transconductance",
    "voltage",
    "inductance",
    "length",
    "fraction",
    "money",
    "count",
    "ppm_per_c2",
]
DIMENSIONS: Final[tuple[str, ...]] = get_args(Dimension)


@lru_cache(maxsize=1)
def _registry() -> pint.UnitRegistry:
    """The one pint registry (pint's own advice: one per program), built on first use.

    Importing pint and building its registry costs 0.5-2 s; the common unit spellings
    convert through ``_FAST_FACTORS`` without it, so most runs never pay that.
    """
    import pint

    return pint.UnitRegistry(cache_folder=None)


def __getattr__(name: str) -> Any:
    # ``catalog.units.ureg`` stays available (PEP 562) without importing pint up front.
    if name == "ureg":
        return _registry()
    raise AttributeError(f"module {__name__!r} has no attribute {name!r}")


# Canonical unit (pint spelling) of each physical dimension handled through pint.
_PINT_CANONICAL: Final[dict[str, str]] = {
    "frequency": "hertz",
    "capacitance": "farad",
    "resistance": "ohm",
    "power": "watt",
    "time": "second",
    "transconductance": "siemens",
    "voltage": "volt",
    "inductance": "henry",
    "length": "millimeter",
}

# Shown to the user in error messages: what the column expects, with an example.
_EXAMPLES: Final[dict[str, str]] = {
    "frequency": "a frequency such as '32.768 kHz'",
    "capacitance": "a capacitance such as '12 pF'",
    "resistance": "a resistance such as '80 ohm'",
    "power": "a power such as '100 uW'",
    "ppm": "a frequency deviation such as '20 ppm'",
    "temperature": "a temperature such as '-40 °C'",
    "time": "a duration such as '10 year'",
    "transconductance": "a transconductance such as '9 mA/V'",
    "voltage": "a voltage such as '1.2 V'",
    "inductance": "an inductance such as '10 mH'",
    "length": "a length such as '3.2 mm'",
    "fraction": "a fraction such as '5 %' or '0.05'",
    "money": "a price such as '0.42'",
    "count": "a count such as '1200'",
    "ppm_per_c2": "a curvature such as '-0.034 ppm/°C²'",
}

# Base symbol that a bare SI prefix ("12 p", "32.768 k") attaches to, per dimension.
_PREFIX_BASE: Final[dict[str, str]] = {
    "frequency": "Hz",
    "capacitance": "F",
    "resistance": "ohm",
    "power": "W",
    "time": "s",
    "transconductance": "S",
    "voltage": "V",
    "inductance": "H",
}
_PREFIXES: Final[dict[str, float]] = {
    "f": 1e-15,
    "p": 1e-12,
    "n": 1e-9,
    "u": 1e-6,
    "m": 1e-3,
    "k": 1e3,
    "K": 1e3,
    "M": 1e6,
    "G": 1e9,
}

# Maximum text length worth parsing; a longer "value" is garbage, not a quantity.
_MAX_TEXT: Final[int] = 200

_NUMBER = r"[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?"
_NUMBER_THEN_UNIT: Final[re.Pattern[str]] = re.compile(rf"^({_NUMBER})\s*(.*)$")
# Resistor code as printed on parts lists: "80R", "4R7" (4.7 ohm), "4k7", "1M5".
_RKM: Final[re.Pattern[str]] = re.compile(r"^(\d+)([RkKM])(\d*)$")
_THOUSANDS: Final[re.Pattern[str]] = re.compile(r"^[+-]?\d{1,3}(?:,\d{3})+(?:\.\d+)?$")
_DECIMAL_COMMA: Final[re.Pattern[str]] = re.compile(r"(?<=\d),(?=\d)")
# Words and signs around a value that say "limit" or "typical" but not how much.
_DECORATION_WORDS: Final[re.Pattern[str]] = re.compile(
    r"\b(?:max|maximum|min|minimum|typ|typical|nom|nominal|approx|ca|abs|absolute)\b\.?",
    re.IGNORECASE,
)
_PER_YEAR: Final[re.Pattern[str]] = re.compile(
    r"(?:/|per)?(?:1st|first)?(?:yr|year|y|a|annum)s?$|(?:/|per)(?:1st|first)(?:yr|year)$"
)
# "value ± spread" (a nominal with its spread): the nominal is the value.
_NOMINAL_SPREAD: Final[re.Pattern[str]] = re.compile(
    rf"^({_NUMBER})\s*([^\d±+]*?)\s*(?:±|\+/-|\+-)\s*(?:{_NUMBER})\s*(\S*)$"
)
_CONDITION: Final[re.Pattern[str]] = re.compile(r"\s*(?:@|\bat\b).*$", re.IGNORECASE)
_EMPTY_BRACKETS: Final[re.Pattern[str]] = re.compile(r"[(\[]\s*\.?\s*[)\]]")
_LEADING_SIGNS: Final[re.Pattern[str]] = re.compile(r"^(?:±|\+/-|\+-|\+/−|<=|>=|≤|≥|<|>|~|≈)\s*")

# Spellings that pint does not know or reads differently (pint's "C" is coulomb).
_TEMPERATURE_UNITS: Final[dict[str, str]] = {
    "": "degC",
    "°c": "degC",
    "ºc": "degC",
    "degc": "degC",
    "deg c": "degC",
    "c": "degC",
    "celsius": "degC",
    "deg": "degC",
    "°": "degC",
    "k": "kelvin",
    "kelvin": "kelvin",
    "°f": "degF",
    "ºf": "degF",
    "degf": "degF",
    "f": "degF",
    "fahrenheit": "degF",
}
_PPM_FACTORS: Final[dict[str, float]] = {
    "": 1.0,
    "ppm": 1.0,
    "ppb": 1e-3,
    "%": 1e4,
    "percent": 1e4,
    "ppt": 1e-6,
}
_FRACTION_FACTORS: Final[dict[str, float]] = {
    "": 1.0,
    "%": 1e-2,
    "percent": 1e-2,
    "ppm": 1e-6,
    "ppb": 1e-9,
}
_CURRENCY: Final[re.Pattern[str]] = re.compile(
    r"^(?:[$€£¥]|usd|eur|gbp|chf|jpy|cny)\s*|"
    r"\s*(?:[$€£¥]|usd|eur|gbp|chf|jpy|cny)$",
    re.IGNORECASE,
)


_CURRENCY_NAMES: Final[frozenset[str]] = frozenset(
    {"", "$", "€", "£", "¥", "usd", "eur", "gbp", "chf", "jpy", "cny", "each", "ea", "/pc", "/ea"}
)


def canonical_unit(dimension: Dimension) -> str:
    """Return the canonical unit symbol (as shown to users) of ``dimension``."""
    return {
        "frequency": "Hz",
        "capacitance": "F",
        "resistance": "Ω",
        "power": "W",
        "ppm": "ppm",
        "temperature": "°C",
        "time": "s",
        "transconductance": "A/V",
        "voltage": "V",
        "inductance": "H",
        "length": "mm",
        "fraction": "",
        "money": "",
        "count": "",
        "ppm_per_c2": "ppm/°C²",
    }[dimension]


def parse_quantity(
    text: str | float | int,
    dimension: Dimension,
    *,
    default_unit: str | None = None,
) -> float:
    """Parse one catalog or brief value into the canonical unit of ``dimension``.

    Parameters
    ----------
    text : str, float or int
        The raw value, e.g. ``"±20 ppm"``, ``"12,5 pF"``, ``"max. 80 Ω"``, ``"-40 °C"``.
    dimension : Dimension
        What the value must be. Canonical units: frequency [Hz], capacitance [F],
        resistance [ohm], power [W], ppm [ppm], temperature [degC], time [s],
        transconductance [S], voltage [V], inductance [H], length [mm], fraction [1],
        money and count [bare number], ppm_per_c2 [ppm/degC²].
    default_unit : str, optional
        Unit for a bare number (e.g. ``"pF"`` taken from a column header); without it a
        bare number is read in the canonical unit.

    Returns
    -------
    float
        A finite magnitude in the canonical unit.

    Raises
    ------
    UnitError
        Anything that is not a finite number of the right dimension. Nothing else is
        raised.
    """
    if dimension not in DIMENSIONS:
        raise UnitError(f"unknown dimension {dimension!r}")
    if isinstance(text, bool | np.bool_):
        raise UnitError(f"expected {_EXAMPLES[dimension]}, got {text!r}")
    if isinstance(text, numbers.Real):  # int, float and numpy scalars (YAML, frames)
        number = float(text)
        if not math.isfinite(number):
            raise UnitError(f"expected {_EXAMPLES[dimension]}, got '{text}'")
        text = str(int(text)) if isinstance(text, numbers.Integral) else repr(number)
    if not isinstance(text, str):
        raise UnitError(f"expected {_EXAMPLES[dimension]}, got {type(text).__name__}")
    value, message = _parse_cached(text, dimension, default_unit)
    if message is not None:
        raise UnitError(message)
    return value


def is_bare_number(text: str) -> bool:
    """True when ``text`` is a number without a unit ("12", "±20", "12,5 max")."""
    if not isinstance(text, str) or len(text) > _MAX_TEXT:
        return False
    cleaned = _normalise_number(_strip_decorations(text), "")
    match = _NUMBER_THEN_UNIT.match(cleaned)
    return match is not None and not match.group(2).strip()


def parse_plain_numbers(
    texts: Sequence[str], dimension: Dimension, *, default_unit: str | None = None
) -> tuple[np.ndarray, np.ndarray]:
    """Read the cells that are plain decimal numbers ("12", "-0.5", "1e-3") in one pass.

    Returns ``(values, handled)``: ``values[i]`` is exactly what
    ``parse_quantity(texts[i], dimension, default_unit=default_unit)`` returns wherever
    ``handled[i]`` is True, NaN elsewhere. Cells with anything else in them (units,
    decorations, commas, blanks), values that would be refused, and columns whose unit
    needs pint are left unhandled for ``parse_quantity``. Never raises for bad text.
    """
    count = len(texts)
    values = np.full(count, np.nan, dtype=np.float64)
    handled = np.zeros(count, dtype=bool)
    factor = _plain_factor(dimension, default_unit) if dimension in DIMENSIONS else None
    if factor is None:
        return values, handled
    match = _PLAIN_NUMBER.fullmatch
    for index, text in enumerate(texts):
        if not isinstance(text, str) or len(text) > _MAX_TEXT or match(text) is None:
            continue
        value = float(text) * factor
        if not math.isfinite(value):
            continue
        rounded = float(f"{value:.15g}")  # the same rounding as ``_finite``
        if math.isfinite(rounded):
            values[index] = rounded
            handled[index] = True
    return values, handled


def parse_temperature_range(text: str) -> tuple[float, float]:
    """Parse a rated temperature range into ``(min, max)`` in degC.

    Accepts "-40 to 85 °C", "-40 °C to +85 °C", "-40~+85", "-40…85 °C", "-40/+85",
    "-40 - 85 °C" and "[-40, 85]". A unit given only once (at the end) applies to both
    ends. Raises UnitError otherwise, or when min >= max.
    """
    if not isinstance(text, str):
        raise UnitError(f"expected a temperature range such as '-40 to 85 °C', got {text!r}")
    low, high, message = _parse_range_cached(text)
    if message is not None:
        raise UnitError(message)
    return low, high


def format_quantity(value: float, dimension: Dimension, *, digits: int = 4) -> str:
    """Format an SI value as short text with an engineering prefix.

    ``digits`` is the most decimals shown after scaling; trailing zeros are dropped, so
    32768 Hz -> "32.768 kHz", 12e-12 F -> "12 pF", 0.009 S -> "9 mA/V". NaN -> "—".
    """
    try:
        number = float(value)
    except (TypeError, ValueError):
        return str(value)
    if math.isnan(number):
        return "—"
    if math.isinf(number):
        return "∞" if number > 0 else "-∞"
    if dimension == "temperature":
        return f"{_trim(number, digits)} °C"
    if dimension == "ppm":
        return f"{_trim(number, digits)} ppm"
    if dimension == "ppm_per_c2":
        return f"{_trim(number, digits)} ppm/°C²"
    if dimension == "fraction":
        return f"{_trim(number * 100.0, digits)} %"
    if dimension == "length":
        return f"{_trim(number, digits)} mm"
    if dimension in ("money", "count"):
        return _trim(number, digits)
    if dimension == "time" and abs(number) >= 86400.0:
        days = number / 86400.0
        if abs(days) >= 365.0:
            return f"{_trim(days / 365.25, digits)} year"
        return f"{_trim(days, digits)} day"
    symbol = {
        "frequency": "Hz",
        "capacitance": "F",
        "resistance": "Ω",
        "power": "W",
        "time": "s",
        "transconductance": "A/V",
        "voltage": "V",
        "inductance": "H",
    }.get(dimension, "")
    return _engineering(number, symbol, digits)


# --- internals -------------------------------------------------------------------------


def _trim(number: float, digits: int) -> str:
    text = f"{number:.{max(digits, 0)}f}"
    if "." in text:
        text = text.rstrip("0").rstrip(".")
    return "0" if text in ("-0", "") else text


def _engineering(number: float, symbol: str, digits: int) -> str:
    if number == 0.0:
        return f"0 {symbol}".rstrip()
    prefixes = {-15: "f", -12: "p", -9: "n", -6: "µ", -3: "m", 0: "", 3: "k", 6: "M", 9: "G"}
    exponent = int(math.floor(math.log10(abs(number)) / 3.0) * 3)
    exponent = min(max(exponent, -15), 9)
    mantissa = number / 10.0**exponent
    # Rounding can carry 999.99 up to 1000: move to the next prefix.
    if abs(float(_trim(mantissa, digits))) >= 1000.0 and exponent < 9:
        exponent += 3
        mantissa = number / 10.0**exponent
    return f"{_trim(mantissa, digits)} {prefixes[exponent]}{symbol}"


def _expected(dimension: str, raw: str) -> str:
    shown = raw if len(raw) <= 60 else raw[:57] + "..."
    # Line breaks and other control characters shown escaped: the message stays one line.
    shown = "".join(char if char.isprintable() else repr(char)[1:-1] for char in shown)
    return f"expected {_EXAMPLES[dimension]}, got '{shown}'"


def _strip_decorations(text: str) -> str:
    """Remove limit words, ± signs and spacing that say nothing about the amount."""
    cleaned = (
        text.replace("\u00a0", " ")
        .replace("\u2009", " ")
        .replace("\u202f", " ")
        .replace("\u2212", "-")  # typographic minus
        .replace("µ", "u")
        .replace("μ", "u")
        .replace("\u03a9", "ohm")  # Greek capital omega
        .replace("\u2126", "ohm")  # the separate OHM SIGN code point
        .replace("²", "^2")
        .replace("\u2103", "°C")  # DEGREE CELSIUS as one character
        .replace("\u2109", "°F")
        .strip()
    )
    # A test condition after the value says nothing about it: "±10 ppm @ 25 °C".
    cleaned = _CONDITION.sub("", cleaned)
    cleaned = _DECORATION_WORDS.sub(" ", cleaned)
    cleaned = _EMPTY_BRACKETS.sub(" ", cleaned).strip(" :=")
    previous = None
    while previous != cleaned:
        previous = cleaned
        cleaned = _LEADING_SIGNS.sub("", cleaned).strip()
    return " ".join(cleaned.split())


def _normalise_number(text: str, dimension: str) -> str:
    """Turn decimal commas into points; keep thousands separators for counts and prices."""
    if _THOUSANDS.match(text.split(" ")[0]) and dimension in ("count", "money"):
        head, _, tail = text.partition(" ")
        return (head.replace(",", "") + " " + tail).strip()
    if text.count(",") == 1:
        return _DECIMAL_COMMA.sub(".", text)
    return text


@lru_cache(maxsize=65536)
def _parse_cached(text: str, dimension: str, default_unit: str | None) -> tuple[float, str | None]:
    """Parse or explain; returns ``(value, None)`` or ``(nan, message)`` (cacheable)."""
    try:
        return _parse_uncached(text, dimension, default_unit), None
    except UnitError as error:
        return math.nan, str(error)
    except Exception:  # pint and re may raise many types on hostile text
        return math.nan, _expected(dimension, text)


def _parse_uncached(text: str, dimension: str, default_unit: str | None) -> float:
    if len(text) > _MAX_TEXT:
        raise UnitError(_expected(dimension, text))
    cleaned = _strip_decorations(text)
    if dimension == "money":
        cleaned = _CURRENCY.sub("", cleaned).strip()
    if dimension == "count":
        cleaned = cleaned.rstrip("+ ")  # "5000+" in a stock column: at least 5000
    cleaned = _normalise_number(cleaned, dimension)
    if dimension == "resistance":
        rkm = _RKM.match(cleaned)
        if rkm:
            whole, letter, fraction = rkm.groups()
            scale = {"R": 1.0, "k": 1e3, "K": 1e3, "M": 1e6}[letter]
            return _finite(float(f"{whole}.{fraction or '0'}") * scale, dimension, text)
    spread = _NOMINAL_SPREAD.match(cleaned)
    if spread is not None:
        cleaned = f"{spread.group(1)} {spread.group(2).strip() or spread.group(3)}".strip()
    match = _NUMBER_THEN_UNIT.match(cleaned)
    if match is None:
        raise UnitError(_expected(dimension, text))
    number = float(match.group(1))
    unit = match.group(2).strip()
    if not unit and default_unit:
        unit = _strip_decorations(default_unit)
    value = _convert(number, unit, dimension, text)
    return _finite(value, dimension, text)


# A cell that is nothing but a decimal number: every cleaning step of ``_parse_uncached``
# leaves it as it is, so its value is float(text) times the column's unit factor.
_PLAIN_NUMBER: Final[re.Pattern[str]] = re.compile(
    r"[+-]?(?:[0-9]+(?:\.[0-9]*)?|\.[0-9]+)(?:[eE][+-]?[0-9]+)?", re.ASCII
)


@lru_cache(maxsize=256)
def _plain_factor(dimension: str, default_unit: str | None) -> float | None:
    """The factor ``f`` with ``parse(n) == n * f`` for a plain number ``n``; None if not so.

    Mirrors ``_convert`` branch by branch for the unit a bare number gets (the header's
    ``default_unit`` or none); None where that path would need pint or refuse the unit.
    """
    try:
        unit = _strip_decorations(default_unit) if default_unit else ""
        key = unit.lower().replace(" ", "")
        if dimension == "temperature":
            name = _TEMPERATURE_UNITS.get(unit.lower().strip()) or _TEMPERATURE_UNITS.get(key)
            return _FAST_FACTORS.get((name, "degC")) if name else None
        if dimension == "ppm":
            return _PPM_FACTORS.get(_PER_YEAR.sub("", key))
        if dimension == "fraction":
            return _FRACTION_FACTORS.get(key)
        if dimension == "ppm_per_c2":
            compact = key.replace("°", "").replace("deg", "").replace("**", "^")
            allowed = ("", "ppm/c^2", "ppm/c2", "ppm/k^2", "ppm/k2", "ppm/(c^2)", "ppm/c/c")
            return 1.0 if compact in allowed else None
        if dimension == "money":
            return 1.0 if key in _CURRENCY_NAMES else None
        if dimension == "count":
            return 1.0 if key in ("", "pcs", "pc", "pieces", "units", "ea") else None
        canonical = _PINT_CANONICAL[dimension]
        if not unit:
            return 1.0
        if unit in _PREFIXES and dimension in _PREFIX_BASE:
            # (n * prefix) * 1.0 in ``_convert_physical``: the base unit's factor is 1.0.
            base = _FAST_FACTORS.get((_PREFIX_BASE[dimension], canonical))
            return _PREFIXES[unit] if base == 1.0 else None
        return _FAST_FACTORS.get((_spell_for_pint(unit, dimension), canonical))
    except Exception:  # hostile header text: leave the column to the careful path
        return None


def _finite(value: float, dimension: str, raw: str) -> float:
    # Unit scaling leaves binary noise (100 uW -> 9.999999999999999e-05); 15 significant
    # digits is below any catalog's precision and gives the value the user wrote.
    # Checked after rounding: values next to the float maximum round up to infinity.
    rounded = float(f"{value:.15g}") if math.isfinite(value) else value
    if not math.isfinite(rounded):
        raise UnitError(_expected(dimension, raw))
    return rounded


def _convert(number: float, unit: str, dimension: str, raw: str) -> float:
    """Convert ``number`` given in ``unit`` to the canonical unit of ``dimension``."""
    key = unit.lower().replace(" ", "")
    if dimension == "temperature":
        name = _TEMPERATURE_UNITS.get(unit.lower().strip()) or _TEMPERATURE_UNITS.get(key)
        if name is None:
            raise UnitError(_expected(dimension, raw))
        factor = _FAST_FACTORS.get((name, "degC"))
        if factor is not None:
            return float(number * factor)  # degC -> degC: pint leaves the magnitude as is
        # Offset units: build the quantity directly (multiplying would be ambiguous).
        return float(_registry().Quantity(number, name).to("degC").magnitude)
    if dimension == "ppm":
        key = _PER_YEAR.sub("", key)
        if key not in _PPM_FACTORS:
            raise UnitError(_expected(dimension, raw))
        return number * _PPM_FACTORS[key]
    if dimension == "fraction":
        if key not in _FRACTION_FACTORS:
            raise UnitError(_expected(dimension, raw))
        return number * _FRACTION_FACTORS[key]
    if dimension == "ppm_per_c2":
        compact = key.replace("°", "").replace("deg", "").replace("**", "^")
        allowed = ("", "ppm/c^2", "ppm/c2", "ppm/k^2", "ppm/k2", "ppm/(c^2)", "ppm/c/c")
        if compact not in allowed:
            raise UnitError(_expected(dimension, raw))
        return number
    if dimension == "money":
        if key not in _CURRENCY_NAMES:
            raise UnitError(_expected(dimension, raw))
        return number
    if dimension == "count":
        if key not in ("", "pcs", "pc", "pieces", "units", "ea"):
            raise UnitError(_expected(dimension, raw))
        return number
    return _convert_physical(number, unit, dimension, raw)


def _convert_physical(number: float, unit: str, dimension: str, raw: str) -> float:
    canonical = _PINT_CANONICAL[dimension]
    if not unit:
        return number
    if unit in _PREFIXES and dimension in _PREFIX_BASE:
        # "12 p" in a capacitance column: the prefix alone, base unit implied.
        return _to_canonical(
            number * _PREFIXES[unit], _PREFIX_BASE[dimension], canonical, raw, dimension
        )
    spelled = _spell_for_pint(unit, dimension)
    if not re.fullmatch(r"[A-Za-z0-9_/*^. ()]+", spelled):
        raise UnitError(_expected(dimension, raw))
    return _to_canonical(number, spelled, canonical, raw, dimension)


# Parts lists often write units in one case ("12PF", "16MHZ", "100UW", "1MOHM"). Read
# case-blind, these have one sensible meaning per column: nobody specifies petafarads,
# millihertz or megawatts for a crystal. Keys are lower case; values are pint spellings.
_CASE_BLIND: Final[dict[str, dict[str, str]]] = {
    "capacitance": {"f": "F", "ff": "fF", "pf": "pF", "nf": "nF", "uf": "uF"},
    "frequency": {"hz": "Hz", "khz": "kHz", "mhz": "MHz", "ghz": "GHz"},
    "power": {"w": "W", "nw": "nW", "uw": "uW", "mw": "mW"},
    "inductance": {"h": "H", "uh": "uH", "mh": "mH", "kh": "kH"},
    "transconductance": {
        "s": "S",
        "ms": "mS",
        "us": "uS",
        "a/v": "A/V",
        "ma/v": "mA/V",
        "ua/v": "uA/V",
        "mho": "S",
        "mmho": "mS",
        "umho": "uS",
    },
    "voltage": {"v": "V", "mv": "mV", "uv": "uV"},
}


def _spell_for_pint(unit: str, dimension: str) -> str:
    """Map trade spellings to pint's: 'R'/'Ohm' -> ohm, 'PF' -> pF, 'yr' -> year."""
    compact = unit.replace(" ", "")
    table = _CASE_BLIND.get(dimension)
    if table is not None and compact.lower() in table:
        return table[compact.lower()]
    if dimension == "resistance":
        if compact in ("MOHM", "MOHMS", "MEG", "MΩ"):
            return "Mohm"  # all capitals: a parts list's mega, not milli
        if compact.lower() in ("kohm", "kohms", "k"):
            return "kohm"
        lowered = compact.lower()
        for prefix in ("", "m", "k", "M"):
            if compact in (f"{prefix}R", f"{prefix}ohms", f"{prefix}Ohm", f"{prefix}Ohms"):
                return f"{prefix}ohm"
        if lowered in ("ohm", "ohms", "r"):
            return "ohm"
        if lowered in ("kohm", "kohms"):
            return "kohm"
        if compact in ("Mohms", "MOhm", "MOhms", "Meg", "meg"):
            return "Mohm"
    if dimension == "time":
        return {
            "yr": "year",
            "yrs": "year",
            "y": "year",
            "a": "year",
            "d": "day",
            "hr": "hour",
            "hrs": "hour",
            "h": "hour",
            "years": "year",
            "days": "day",
            "hours": "hour",
            "min": "minute",
            "months": "month",
        }.get(compact.lower(), compact)
    if dimension == "transconductance":
        return compact.replace("mho", "S").replace("µ", "u")
    if dimension == "frequency":
        lowered = compact.lower()
        return {"hz": "Hz", "khz": "kHz", "mhz": "MHz", "ghz": "GHz"}.get(lowered, compact)
    if dimension == "length" and compact.lower() in ("mil", "mils"):
        return "thou"
    return compact


# Conversion factors of the common spellings (as ``_spell_for_pint`` returns them) to each
# canonical unit: the very factors pint uses (pint converts a multiplicative unit as
# ``value * factor``), so ``number * factor`` is bit-identical to pint's result. Checked
# entry by entry against pint and over generated values in tests/catalog/test_units_fast.py.
# Any other spelling goes through pint.
_FAST_FACTORS: Final[dict[tuple[str, str], float]] = {
    ("Hz", "hertz"): 1.0,
    ("kHz", "hertz"): 1e3,
    ("MHz", "hertz"): 1e6,
    ("GHz", "hertz"): 1e9,
    ("F", "farad"): 1.0,
    ("fF", "farad"): 1e-15,
    ("pF", "farad"): 1e-12,
    ("nF", "farad"): 1e-9,
    ("uF", "farad"): 1e-6,
    ("ohm", "ohm"): 1.0,
    ("kohm", "ohm"): 1e3,
    ("Mohm", "ohm"): 1e6,
    ("mohm", "ohm"): 1e-3,
    ("W", "watt"): 1.0,
    ("nW", "watt"): 1e-9,
    ("uW", "watt"): 1e-6,
    ("mW", "watt"): 1e-3,
    ("s", "second"): 1.0,
    ("ms", "second"): 1e-3,
    ("us", "second"): 1e-6,
    ("year", "second"): 31557600.0,  # pint's year: 365.25 days
    ("month", "second"): 2629800.0,  # a twelfth of that year
    ("day", "second"): 86400.0,
    ("hour", "second"): 3600.0,
    ("minute", "second"): 60.0,
    ("S", "siemens"): 1.0,
    ("mS", "siemens"): 1e-3,
    ("uS", "siemens"): 1e-6,
    ("A/V", "siemens"): 1.0,
    ("mA/V", "siemens"): 1e-3,
    ("uA/V", "siemens"): 1e-6,
    ("V", "volt"): 1.0,
    ("mV", "volt"): 1e-3,
    ("uV", "volt"): 1e-6,
    ("H", "henry"): 1.0,
    ("mH", "henry"): 1e-3,
    ("uH", "henry"): 1e-6,
    ("nH", "henry"): 1e-9,
    ("mm", "millimeter"): 1.0,
    ("um", "millimeter"): 1e-3,
    ("cm", "millimeter"): 10.0,
    ("m", "millimeter"): 1e3,
    ("thou", "millimeter"): 0.0254,
    ("inch", "millimeter"): 25.4,
    ("degC", "degC"): 1.0,
}


def _to_canonical(number: float, unit: str, canonical: str, raw: str, dimension: str) -> float:
    factor = _FAST_FACTORS.get((unit, canonical))
    if factor is not None:
        return float(number * factor)
    return _to_canonical_pint(number, unit, canonical, raw, dimension)


def _to_canonical_pint(number: float, unit: str, canonical: str, raw: str, dimension: str) -> float:
    try:
        quantity = _registry().Quantity(number, unit).to(canonical)
    except Exception as error:  # undefined unit, wrong dimension, syntax: all "not this"
        raise UnitError(_expected(dimension, raw)) from error
    return float(quantity.magnitude)


_RANGE_SEPARATORS: Final[re.Pattern[str]] = re.compile(
    r"\s*(?:\bto\b|\.\.\.|\.\.|…|~|/|–|—|,|;|\s-\s|(?<=[\d°CcFfK])-(?=[+-]?\s*\d))\s*",
    re.IGNORECASE,
)


@lru_cache(maxsize=4096)
def _parse_range_cached(text: str) -> tuple[float, float, str | None]:
    message = f"expected a temperature range such as '-40 to 85 °C', got '{text[:60]}'"
    try:
        low, high = _parse_range_uncached(text)
    except Exception:
        return math.nan, math.nan, message
    if not low < high:
        return (
            low,
            high,
            (f"temperature range '{text[:60]}' has its minimum at or above its maximum"),
        )
    return low, high, None


def _parse_range_uncached(text: str) -> tuple[float, float]:
    if len(text) > _MAX_TEXT:
        raise UnitError("too long")
    cleaned = text.strip().strip("[]()").replace("\u2212", "-").strip()
    cleaned = re.sub(r"^(?:from|between)\s+", "", cleaned, flags=re.IGNORECASE)
    cleaned = re.sub(r"\s+and\s+", " to ", cleaned, flags=re.IGNORECASE)
    parts = [part for part in _RANGE_SEPARATORS.split(cleaned, maxsplit=1) if part.strip()]
    if len(parts) != 2:
        raise UnitError("not a range")
    low_text, high_text = (part.strip() for part in parts)
    # A unit written once at the end ("-40 to 85 °F") applies to both ends.
    high_match = _NUMBER_THEN_UNIT.match(_strip_decorations(high_text))
    unit = high_match.group(2).strip() if high_match else ""
    low_match = _NUMBER_THEN_UNIT.match(_strip_decorations(low_text))
    if low_match is not None and not low_match.group(2).strip() and unit:
        low_text = f"{low_match.group(1)} {unit}"
    low = parse_quantity(low_text, "temperature")
    high = parse_quantity(high_text, "temperature")
    return low, high
