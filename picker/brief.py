"""The brief: the oscillator circuit, the board and the limits a crystal must meet.

A brief is a small YAML file (DESIGN §6) whose values carry their units ("9 mA/V",
"2.5 pF", "10 year"). :func:`load_brief` reads one, :func:`parse_brief` checks a mapping
and turns it into frozen dataclasses holding SI floats, and :func:`brief_to_mapping`
writes a brief back as the same kind of mapping (``parse_brief(brief_to_mapping(b)) == b``).

Rules the parser keeps:

- every key is checked; an unknown key is rejected with the closest known key suggested;
- every problem raises :class:`BriefError` with a one-line message that starts with the key
  path (``amplifier.gm: expected a transconductance such as '9 mA/V', got 'abc'``), and,
  when read from a file, the file name and line in front;
- a missing optional key takes the default stated in the dataclass docstrings; the key
  paths filled that way are listed in :attr:`Brief.defaulted` so screens can say
  "(default)";
- bare numbers are accepted only where the unit is not in doubt (ppm, °C, ohm, volt, mm,
  plain counts); a capacitance, frequency, transconductance or duration needs its unit,
  because "12" could mean 12 pF or 12 F;
- the budget comes from, in this order: an explicit ``budget``, the ``preset``'s budget,
  the CAN bit timing in the ``can`` block. An explicit budget therefore overrides the
  preset's (the preset still sets the clock role and, for 32.768 kHz presets, the
  frequency when those are not given); an explicit budget equal to the preset's keeps
  citing the preset's clause;
- the amplifier is described in exactly one form (``gm``, a mapping of named ``gm``
  drive settings, ``gm_crit_max``, ``max_esr`` or ``negative_resistance``). When a data
  sheet gives several and the brief lists them all, ``amplifier.form`` must say which one
  the analysis uses; the others are kept, unused by the analysis.
"""

from __future__ import annotations

import itertools
import math
import os
import unicodedata
from collections.abc import Callable, Mapping, Sequence
from dataclasses import dataclass, field, fields
from importlib import resources
from pathlib import Path
from typing import Final, Literal, cast, get_args

import yaml
from rapidfuzz import fuzz, process
from rapidfuzz.utils import default_process

from catalog.units import (
    Dimension,
    UnitError,
    format_quantity,
    parse_quantity,
    parse_temperature_range,
)
from picker.presets import (
    CLOCK_ROLES,
    CanBitTiming,
    Preset,
    PresetError,
    find_preset,
    preset_names,
)

__all__ = [
    "AMPLIFIER_FORMS",
    "CAP_SERIES",
    "LIFECYCLES",
    "MAX_BRIEF_BYTES",
    "Amplifier",
    "AmplifierForm",
    "Board",
    "Brief",
    "BriefError",
    "InternalCaps",
    "Limits",
    "MaxEsrTable",
    "Weights",
    "brief_to_mapping",
    "brief_to_yaml",
    "default_brief_path",
    "demo_brief_paths",
    "load_brief",
    "load_brief_mapping",
    "parse_brief",
]

AmplifierForm = Literal["gm", "gm_settings", "gm_crit_max", "max_esr", "negative_resistance"]
AMPLIFIER_FORMS: Final[tuple[str, ...]] = get_args(AmplifierForm)
CAP_SERIES: Final[tuple[str, ...]] = ("E6", "E12", "E24")
LIFECYCLES: Final[tuple[str, ...]] = ("active", "nrnd", "obsolete", "")
"""Lifecycle values as in the part table; "" is a part whose lifecycle is not given
(written ``unknown`` in a brief)."""

MAX_BRIEF_BYTES: Final[int] = 256 * 1024
"""A brief is a few hundred bytes; anything larger than this is not a brief."""

_DEFAULT_NAME: Final[str] = "Untitled brief"
_PLACEHOLDER_SOURCE: Final[str] = "<brief>"
_SUGGEST_CUTOFF: Final[float] = 50.0
_MAX_INTERNAL_STEPS: Final[int] = 4096
_MAX_YAML_DEPTH: Final[int] = 16
_MAX_TIME_QUANTA: Final[int] = 512


# --- errors ------------------------------------------------------------------------------


class BriefError(ValueError):
    """A brief that cannot be used. ``str(error)`` is one line for the user.

    Attributes
    ----------
    detail : what is wrong, without place.
    key : the key path ("amplifier.gm", "temperature[1]"), or None for the whole brief.
    source : file name (or "<brief>" for a mapping not read from a file).
    line : 1-based line in the file, when known.
    """

    def __init__(
        self,
        detail: str,
        *,
        key: str | None = None,
        source: str = _PLACEHOLDER_SOURCE,
        line: int | None = None,
        key_path: tuple[str, ...] = (),
    ) -> None:
        self.detail = " ".join(detail.split())
        self.key = key
        self.source = source
        self.line = line
        self.key_path = key_path
        super().__init__(self._compose())

    def _compose(self) -> str:
        pieces = []
        if self.source != _PLACEHOLDER_SOURCE:
            pieces.append(self.source if self.line is None else f"{self.source}:{self.line}")
        if self.key:
            pieces.append(self.key)
        pieces.append(self.detail)
        return ": ".join(pieces)

    def placed(self, source: str, line: int | None) -> BriefError:
        """The same error, located in ``source`` at ``line``."""
        return BriefError(
            self.detail, key=self.key, source=source, line=line, key_path=self.key_path
        )


# --- the dataclasses ---------------------------------------------------------------------


@dataclass(frozen=True)
class MaxEsrTable:
    """Largest crystal ESR the chip tolerates, per load capacitance (and optionally per C0).

    Attributes
    ----------
    load_capacitance_f : the table's load capacitances [F], ascending, distinct.
    esr_ohm : one row per load capacitance; one column per ``c0_f`` value, or a single
        column when the table has no C0 axis [ohm]. A cell is None where the chip maker
        gives no figure (the combination is not supported).
    c0_f : the C0 (shunt capacitance) axis [F], ascending, distinct; None when the limit
        depends on the load capacitance only.

    The analysis interpolates inside the table and never extrapolates silently.
    """

    load_capacitance_f: tuple[float, ...]
    esr_ohm: tuple[tuple[float | None, ...], ...]
    c0_f: tuple[float, ...] | None = None

    @property
    def has_c0_axis(self) -> bool:
        """True when the limit is given per C0 as well as per load capacitance."""
        return self.c0_f is not None

    def column(self, index: int = 0) -> tuple[float | None, ...]:
        """ESR limits [ohm] along the load-capacitance axis for one C0 column."""
        return tuple(row[index] for row in self.esr_ohm)


@dataclass(frozen=True)
class InternalCaps:
    """Load capacitance built into the chip and set by a register (chosen by the analysis).

    Either a ``range_f`` with a ``step_f`` (every value from the low end in steps, up to
    the high end), or named ``codes`` each with its capacitance.

    Attributes
    ----------
    applies_to : "each_pin" (default): the value is the capacitance from each crystal pin
        to ground, the chip's own Ca = Cb; "load": the value is the load capacitance the
        crystal sees from the chip (stray across the crystal still adds).
        The amplifier's pin capacitance adds to each pin in both cases.
    range_f : (lowest, highest) selectable value [F], or None with codes.
    step_f : step between selectable values [F], or None with codes.
    codes : (register code, capacitance [F]) pairs, ascending by capacitance; empty with a
        range.
    """

    applies_to: Literal["each_pin", "load"] = "each_pin"
    range_f: tuple[float, float] | None = None
    step_f: float | None = None
    codes: tuple[tuple[str, float], ...] = ()

    def choices(self) -> tuple[tuple[str, float], ...]:
        """Every selectable (label, capacitance [F]), ascending.

        Labels are the register codes, or for a range the value in pF ("7.5 pF").
        """
        if self.codes:
            return self.codes
        if self.range_f is None or self.step_f is None:
            return ()
        low, high = self.range_f
        count = math.floor((high - low) / self.step_f * (1.0 + 1e-9) + 1e-9) + 1
        values = [float(f"{low + index * self.step_f:.15g}") for index in range(count)]
        return tuple((f"{value * 1e12:.6g} pF", value) for value in values)


@dataclass(frozen=True)
class Amplifier:
    """The chip's oscillator amplifier, in the form its data sheet describes it.

    Attributes
    ----------
    form : which description the analysis uses: "gm", "gm_settings", "gm_crit_max",
        "max_esr" or "negative_resistance".
    gm_s : transconductance [S] (form "gm").
    gm_settings : named drive settings (name, gm [S]), ascending by gm (form
        "gm_settings"); the shortlist reports the lowest setting that meets the margin.
    gm_crit_max_s : largest crystal critical transconductance the chip supports [S],
        margin already included (form "gm_crit_max").
    max_esr : table of the largest crystal ESR per load capacitance (form "max_esr").
    negative_resistance_ohm : the chip's stated negative resistance [ohm], negative
        (form "negative_resistance"); ``negative_resistance_cl_f`` is the load
        capacitance [F] it is stated at.
    pin_capacitance_f : capacitance of each oscillator pin to ground [F], added to each
        load cap. Default 1.5 pF (a typical oscillator pin; common practice — use the
        chip's data sheet figure).
    swing_v : peak-to-peak voltage across the crystal [V], for the drive level.
        Default 1.0 V (common practice for an MCU Pierce stage; low-power 32 kHz stages
        swing less, which only lowers the drive estimate).
    output_resistance_ohm : amplifier output resistance [ohm]; None = ideal (infinite).
    bias_resistance_ohm : feedback bias resistor [ohm]; None = none (infinite).
    internal_caps : programmable load capacitance inside the chip, or None.
    """

    form: AmplifierForm
    gm_s: float | None = None
    gm_settings: tuple[tuple[str, float], ...] = ()
    gm_crit_max_s: float | None = None
    max_esr: MaxEsrTable | None = None
    negative_resistance_ohm: float | None = None
    negative_resistance_cl_f: float | None = None
    pin_capacitance_f: float = 1.5e-12
    swing_v: float = 1.0
    output_resistance_ohm: float | None = None
    bias_resistance_ohm: float | None = None
    internal_caps: InternalCaps | None = None

    def __post_init__(self) -> None:
        needed = {
            "gm": self.gm_s is not None,
            "gm_settings": bool(self.gm_settings),
            "gm_crit_max": self.gm_crit_max_s is not None,
            "max_esr": self.max_esr is not None,
            "negative_resistance": self.negative_resistance_ohm is not None
            and self.negative_resistance_cl_f is not None,
        }
        if self.form not in needed:
            raise BriefError(
                f"unknown amplifier form {self.form!r}; expected one of "
                f"{', '.join(AMPLIFIER_FORMS)}",
                key="amplifier.form",
            )
        if not needed[self.form]:
            raise BriefError(f"form {self.form!r} has no values", key="amplifier.form")

    def forms_given(self) -> tuple[str, ...]:
        """Every form with values in this amplifier (the used one and any others)."""
        given = []
        if self.gm_s is not None:
            given.append("gm")
        if self.gm_settings:
            given.append("gm_settings")
        if self.gm_crit_max_s is not None:
            given.append("gm_crit_max")
        if self.max_esr is not None:
            given.append("max_esr")
        if self.negative_resistance_ohm is not None:
            given.append("negative_resistance")
        return tuple(given)


@dataclass(frozen=True)
class Board:
    """The board around the crystal and the load capacitors it can take.

    Attributes
    ----------
    stray_capacitance_f : capacitance across the crystal from traces and pads [F].
        Default 2 pF (common practice for a compact layout; 1–5 pF is usual).
    stray_uncertainty_f : ± uncertainty on the stray capacitance [F]. Default 1 pF.
    cap_series : IEC 60063 series the load caps are picked from: "E6", "E12" (default)
        or "E24".
    cap_tolerance : load-cap tolerance at and above 10 pF, as a fraction. Default 0.05.
    cap_tolerance_small_f : absolute load-cap tolerance below 10 pF [F]. Default 0.25 pF
        (C0G parts below 10 pF are sold as ±0.1/0.25/0.5 pF).
    fixed_caps_f : (Ca, Cb) to analyse instead of choosing [F], or None.
    """

    stray_capacitance_f: float = 2e-12
    stray_uncertainty_f: float = 1e-12
    cap_series: str = "E12"
    cap_tolerance: float = 0.05
    cap_tolerance_small_f: float = 0.25e-12
    fixed_caps_f: tuple[float, float] | None = None


@dataclass(frozen=True)
class Limits:
    """What a part must meet to count as a fit.

    Attributes
    ----------
    min_margin : least negative-resistance margin |Rneg|/R1 [1]. Default 5 — common
        practice from application literature; 10 is usual for automotive. Must be >= 1.
    marginal_band : a part that passes but comes within this fraction of a limit is
        "marginal" rather than "fit" [1]: margin below min_margin·(1 + band), budget
        headroom below band·budget, drive level above (1 − band) of the rating.
        Default 0.2.
    packages : allowed packages, normalised like the part table ("3225"), or None = any.
    lifecycle : allowed lifecycle values (part-table spelling; "" = not given). Default
        active, nrnd and not given: NRND parts stay visible (ranked down by the lifecycle
        weight) because purchasing often needs them; obsolete parts are ruled out.
    max_height_mm : tallest part allowed [mm], or None.
    require_qualification : qualification the part must list (e.g. "AEC-Q200"), or None.
    min_stock : least stock [count], or None = stock not checked.
    """

    min_margin: float = 5.0
    marginal_band: float = 0.2
    packages: tuple[str, ...] | None = None
    lifecycle: tuple[str, ...] = ("active", "nrnd", "")
    max_height_mm: float | None = None
    require_qualification: str | None = None
    min_stock: float | None = None


@dataclass(frozen=True)
class Weights:
    """Relative weights of the score parts when ordering the fits (>= 0, not all zero).

    Defaults: margin 0.3, headroom 0.25 (budget left over), drive 0.1 (drive-level
    headroom), price 0.15, stock 0.1, lifecycle 0.1. Only the ratios matter.
    """

    margin: float = 0.3
    headroom: float = 0.25
    drive: float = 0.1
    price: float = 0.15
    stock: float = 0.1
    lifecycle: float = 0.1


@dataclass(frozen=True, kw_only=True)
class Brief:
    """A whole brief, SI units throughout.

    Attributes
    ----------
    name : what the circuit is. Default "Untitled brief".
    frequency_hz : nominal clock frequency [Hz] (from the preset when it implies one).
    budget_ppm : total frequency error allowed, all causes, worst case, whole life [ppm].
    budget_source : "brief" when the brief gives the budget, else the clause it came from
        (the preset's clause, or the CAN bit-timing derivation).
    temp_min_c, temp_max_c : board temperature range [°C]. Default −40 … 85 °C.
    lifetime_s : product life for aging [s]. Default 10 years (365.25-day years).
    amplifier, board, limits, weights : see their classes.
    clock_role : what the clock is for (see presets.CLOCK_ROLES): the brief's own, else the
        preset's, else "can" with a ``can`` block, else "general".
    preset : name of the interface preset, or None.
    can : the CAN bit timing, or None.
    defaulted : key paths ("board.stray_capacitance") the brief did not give, filled with
        the stated default or from the preset.
    """

    name: str = _DEFAULT_NAME
    frequency_hz: float
    budget_ppm: float
    budget_source: str = "brief"
    temp_min_c: float = -40.0
    temp_max_c: float = 85.0
    lifetime_s: float = 10 * 365.25 * 86400.0
    amplifier: Amplifier
    board: Board = field(default_factory=Board)
    limits: Limits = field(default_factory=Limits)
    weights: Weights = field(default_factory=Weights)
    clock_role: str = "general"
    preset: str | None = None
    can: CanBitTiming | None = None
    defaulted: tuple[str, ...] = ()


# --- key tables (the schema is data) -------------------------------------------------------

_TOP_KEYS: Final[tuple[str, ...]] = (
    "name",
    "preset",
    "frequency",
    "budget",
    "temperature",
    "lifetime",
    "clock_role",
    "can",
    "amplifier",
    "board",
    "limits",
    "weights",
)
_AMPLIFIER_KEYS: Final[tuple[str, ...]] = (
    "form",
    "gm",
    "gm_crit_max",
    "max_esr",
    "negative_resistance",
    "pin_capacitance",
    "swing",
    "output_resistance",
    "bias_resistance",
    "internal_caps",
)
_BOARD_KEYS: Final[tuple[str, ...]] = (
    "stray_capacitance",
    "stray_uncertainty",
    "cap_series",
    "cap_tolerance",
    "cap_tolerance_small",
    "fixed_caps",
)
_LIMITS_KEYS: Final[tuple[str, ...]] = (
    "min_margin",
    "marginal_band",
    "packages",
    "lifecycle",
    "max_height",
    "require_qualification",
    "min_stock",
)
_WEIGHT_KEYS: Final[tuple[str, ...]] = tuple(f.name for f in fields(Weights))
_CAN_KEYS: Final[tuple[str, ...]] = (
    "bit_time_quanta",
    "prop_seg",
    "phase_seg1",
    "phase_seg2",
    "sjw",
)
_NEGATIVE_RESISTANCE_KEYS: Final[tuple[str, ...]] = ("resistance", "load_capacitance")
_INTERNAL_CAPS_KEYS: Final[tuple[str, ...]] = ("range", "step", "codes", "applies_to")
_MAX_ESR_GRID_KEYS: Final[tuple[str, ...]] = ("load_capacitance", "c0", "esr")

# Dimensions whose bare numbers are ambiguous ("12" capacitance: pF? F?) need a unit.
_NEEDS_UNIT: Final[frozenset[str]] = frozenset(
    {"frequency", "capacitance", "transconductance", "time", "inductance"}
)
_EXAMPLE: Final[dict[str, str]] = {
    "frequency": "'32 MHz'",
    "capacitance": "'12 pF'",
    "transconductance": "'9 mA/V'",
    "time": "'10 year'",
    "inductance": "'10 mH'",
}

Path_ = tuple[str, ...]


# --- small checking helpers ---------------------------------------------------------------


def _key_text(path: Path_) -> str:
    text = ""
    for part in path:
        if part.startswith("["):
            text += part
        else:
            text = f"{text}.{part}" if text else part
    return text


def _fail(path: Path_, detail: str) -> BriefError:
    return BriefError(detail, key=_key_text(path) or None, key_path=path)


def _shown(value: object) -> str:
    text = str(value)
    return text if len(text) <= 60 else text[:57] + "..."


def _closest(word: str, choices: Sequence[str]) -> str | None:
    """The known key closest to ``word`` (rapidfuzz ratio on processed text), if close."""
    found = process.extractOne(
        word, choices, scorer=fuzz.ratio, processor=default_process, score_cutoff=_SUGGEST_CUTOFF
    )
    return None if found is None else str(found[0])


def _unknown(path: Path_, key: str, choices: Sequence[str]) -> BriefError:
    suggestion = _closest(key, choices)
    if suggestion is not None:
        return _fail((*path, key), f"unknown key; did you mean '{suggestion}'?")
    return _fail((*path, key), f"unknown key; expected one of: {', '.join(choices)}")


def _mapping(value: object, path: Path_, what: str) -> Mapping[str, object]:
    """Check ``value`` is a mapping with text keys; return it."""
    if not isinstance(value, Mapping):
        raise _fail(path, f"expected {what}, got {_describe_type(value)} '{_shown(value)}'")
    for key in value:
        if isinstance(key, bool) or not isinstance(key, str | int | float):
            raise _fail(
                path,
                f"key {key!r} is not text; quote it (YAML reads bare on/off/yes/no as true/false)",
            )
    return cast(Mapping[str, object], value)


def _describe_type(value: object) -> str:
    if isinstance(value, Mapping):
        return "a mapping"
    if isinstance(value, list | tuple):
        return "a list"
    if value is None:
        return "nothing"
    return "the value"


def _check_keys(data: Mapping[str, object], path: Path_, known: Sequence[str]) -> None:
    for key in data:
        if str(key) not in known:
            raise _unknown(path, str(key), known)


def _is_bare_number(value: object) -> bool:
    if isinstance(value, bool):
        return False
    if isinstance(value, int | float):
        return True
    if isinstance(value, str):
        try:
            float(value.strip().replace(",", "."))
        except ValueError:
            return False
        return True
    return False


def _quantity(value: object, path: Path_, dimension: Dimension) -> float:
    """Parse one value of ``dimension``; the error names the key path."""
    if value is None or isinstance(value, Mapping | list | tuple):
        try:
            parse_quantity("", dimension)
        except UnitError as error:
            expected = str(error).split(", got")[0]
            raise _fail(path, f"{expected}, got {_describe_type(value)}") from None
    if dimension in _NEEDS_UNIT and _is_bare_number(value):
        raise _fail(
            path,
            f"'{_shown(value)}' needs a unit, e.g. {_EXAMPLE[dimension]} "
            "(a bare number is ambiguous here)",
        )
    try:
        return parse_quantity(cast(str | float | int, value), dimension)
    except UnitError as error:
        raise _fail(path, str(error)) from None


def _bounded(
    value: float,
    path: Path_,
    raw: object,
    *,
    above: float | None = None,
    at_least: float | None = None,
    below: float | None = None,
    at_most: float | None = None,
    why: str = "",
) -> float:
    """Reject values outside the physically possible range, quoting the raw text."""
    reason = f" ({why})" if why else ""
    if above is not None and not value > above:
        if above == 0.0:
            raise _fail(path, f"must be positive, got '{_shown(raw)}'{reason}")
        raise _fail(path, f"must be above {above:g}, got '{_shown(raw)}'{reason}")
    if at_least is not None and not value >= at_least:
        if at_least == 0.0:
            raise _fail(path, f"cannot be negative, got '{_shown(raw)}'{reason}")
        raise _fail(path, f"must be at least {at_least:g}, got '{_shown(raw)}'{reason}")
    if below is not None and not value < below:
        raise _fail(path, f"'{_shown(raw)}' is too large{reason}")
    if at_most is not None and not value <= at_most:
        raise _fail(path, f"'{_shown(raw)}' is too large{reason}")
    return value


def _capacitance(value: object, path: Path_, *, allow_zero: bool = False) -> float:
    farads = _quantity(value, path, "capacitance")
    if allow_zero:
        _bounded(farads, path, value, at_least=0.0)
    else:
        _bounded(farads, path, value, above=0.0)
    return _bounded(
        farads,
        path,
        value,
        at_most=1e-9,
        why="more than 1 nF is not a crystal circuit's capacitance",
    )


def _text_value(value: object, path: Path_, what: str) -> str:
    if isinstance(value, bool) or not isinstance(value, str | int | float):
        raise _fail(path, f"expected {what}, got {_describe_type(value)} '{_shown(value)}'")
    text = _clean_text(str(value))
    if not text:
        raise _fail(path, f"expected {what}, got an empty text")
    return text


def _clean_text(text: str) -> str:
    """Free text for the screen: control and format characters become spaces (a name must
    not carry terminal escape codes), runs of white space one space."""
    kept = "".join(" " if unicodedata.category(char).startswith("C") else char for char in text)
    return " ".join(kept.split())


def _choice(value: object, path: Path_, choices: Sequence[str], what: str) -> str:
    text = _text_value(value, path, what)
    for choice in choices:
        if text.lower() == choice.lower():
            return choice
    suggestion = _closest(text, choices)
    hint = f"; did you mean '{suggestion}'?" if suggestion else ""
    raise _fail(path, f"expected {what} ({', '.join(choices)}), got '{_shown(text)}'{hint}")


def _whole_number(value: object, path: Path_, what: str) -> int:
    number = value
    if isinstance(value, str):
        try:
            number = float(value.strip())
        except ValueError:
            number = None
    if (
        isinstance(number, bool)
        or not isinstance(number, int | float)
        or not math.isfinite(number)
        or number != int(number)
    ):
        raise _fail(path, f"expected {what} as a whole number, got '{_shown(value)}'")
    return int(number)


def _list(value: object, path: Path_, what: str) -> list[object]:
    """A YAML list, or comma-separated text (as a one-line edit field gives it)."""
    if isinstance(value, str):
        return [part.strip() for part in value.split(",") if part.strip()]
    if isinstance(value, list | tuple):
        return list(value)
    raise _fail(path, f"expected {what}, got {_describe_type(value)} '{_shown(value)}'")


# --- sections -----------------------------------------------------------------------------


def _temperature_range(value: object, path: Path_) -> tuple[float, float]:
    items = _list(value, path, "a range such as [-40 °C, 85 °C]")
    if isinstance(value, str) and len(items) != 2:
        # "-40 to 85 °C" style text.
        try:
            return parse_temperature_range(value)
        except UnitError as error:
            raise _fail(path, str(error)) from None
    if len(items) != 2:
        raise _fail(path, f"expected two temperatures [low, high], got {len(items)} values")
    low = _quantity(items[0], (*path, "[0]"), "temperature")
    high = _quantity(items[1], (*path, "[1]"), "temperature")
    for index, (number, raw) in enumerate(((low, items[0]), (high, items[1]))):
        _bounded(number, (*path, f"[{index}]"), raw, above=-273.15, why="below absolute zero")
        _bounded(
            number,
            (*path, f"[{index}]"),
            raw,
            at_most=500.0,
            why="quartz stops being quartz well before this",
        )
    if low > high:
        raise _fail(
            path,
            f"the low end {_shown(items[0])} is above the high end {_shown(items[1])}; "
            "write [low, high]",
        )
    return low, high


def _can_block(value: object, path: Path_) -> CanBitTiming:
    data = _mapping(
        value, path, "a mapping such as {bit_time_quanta: 16, phase_seg1: 7, phase_seg2: 4, sjw: 4}"
    )
    _check_keys(data, path, _CAN_KEYS)
    numbers = {
        key: _whole_number(data[key], (*path, key), "time quanta")
        for key in _CAN_KEYS
        if key in data
    }
    for key, number in numbers.items():
        if number > _MAX_TIME_QUANTA:
            raise _fail((*path, key), f"{number} tq is more than any CAN controller counts")
    for key in ("phase_seg1", "phase_seg2", "sjw"):
        if key not in numbers:
            raise _fail((*path, key), "missing (time quanta)")
    if "prop_seg" not in numbers:
        if "bit_time_quanta" not in numbers:
            raise _fail(path, "give bit_time_quanta or prop_seg")
        numbers["prop_seg"] = (
            numbers["bit_time_quanta"] - 1 - numbers["phase_seg1"] - numbers["phase_seg2"]
        )
        if numbers["prop_seg"] < 1:
            raise _fail(
                (*path, "bit_time_quanta"),
                f"{numbers['bit_time_quanta']} tq leaves no propagation segment after "
                f"sync (1) + phase_seg1 ({numbers['phase_seg1']}) + phase_seg2 "
                f"({numbers['phase_seg2']})",
            )
    try:
        timing = CanBitTiming(
            prop_seg=numbers["prop_seg"],
            phase_seg1=numbers["phase_seg1"],
            phase_seg2=numbers["phase_seg2"],
            sjw=numbers["sjw"],
        )
    except PresetError as error:
        raise _fail(path, str(error)) from None
    given = numbers.get("bit_time_quanta")
    if given is not None and given != timing.bit_time_quanta:
        raise _fail(
            (*path, "bit_time_quanta"),
            f"{given} tq does not equal 1 + prop_seg + phase_seg1 + phase_seg2 = "
            f"{timing.bit_time_quanta} tq",
        )
    return timing


def _gm_settings(data: Mapping[str, object], path: Path_) -> tuple[tuple[str, float], ...]:
    if not data:
        raise _fail(path, "no drive settings; give e.g. {low: 0.5 mA/V, high: 2.5 mA/V}")
    settings = []
    for name, raw in data.items():
        label = _text_value(name, (*path, str(name)), "a setting name")
        gm = _quantity(raw, (*path, label), "transconductance")
        _bounded(gm, (*path, label), raw, above=0.0)
        _bounded(gm, (*path, label), raw, below=1.0, why="1 A/V is beyond any oscillator")
        settings.append((label, gm))
    if len({label for label, _ in settings}) != len(settings):
        raise _fail(path, "two drive settings have the same name")
    return tuple(sorted(settings, key=lambda item: item[1]))


def _esr(value: object, path: Path_) -> float:
    ohms = _quantity(value, path, "resistance")
    _bounded(ohms, path, value, above=0.0)
    return _bounded(ohms, path, value, at_most=10e6, why="above 10 MΩ")


def _ascending_distinct(values: list[float], path: Path_, what: str) -> None:
    ordered = sorted(values)
    for low, high in itertools.pairwise(ordered):
        if low == high:
            raise _fail(path, f"{what} {format_quantity(low, 'capacitance')} appears twice")


def _max_esr(value: object, path: Path_) -> MaxEsrTable:
    data = _mapping(
        value, path, "a mapping of load capacitance to ESR such as {6 pF: 80 ohm, 8 pF: 60 ohm}"
    )
    if not data:
        raise _fail(path, "empty table; give at least one load capacitance and its ESR")
    if "load_capacitance" in data or "esr" in data or "c0" in data:
        return _max_esr_grid(data, path)
    points = []
    for key, raw in data.items():
        load = _capacitance(key, (*path, str(key)))
        points.append((load, _esr(raw, (*path, str(key)))))
    _ascending_distinct([load for load, _ in points], path, "load capacitance")
    points.sort()
    return MaxEsrTable(
        load_capacitance_f=tuple(load for load, _ in points),
        esr_ohm=tuple((esr,) for _, esr in points),
    )


def _max_esr_grid(data: Mapping[str, object], path: Path_) -> MaxEsrTable:
    _check_keys(data, path, _MAX_ESR_GRID_KEYS)
    for key in ("load_capacitance", "esr"):
        if key not in data:
            raise _fail((*path, key), "missing (a grid needs load_capacitance and esr)")
    loads_raw = _list(data["load_capacitance"], (*path, "load_capacitance"), "a list")
    loads = [
        _capacitance(raw, (*path, "load_capacitance", f"[{i}]")) for i, raw in enumerate(loads_raw)
    ]
    if not loads:
        raise _fail((*path, "load_capacitance"), "empty list")
    _ascending_distinct(loads, (*path, "load_capacitance"), "load capacitance")
    c0s: list[float] | None = None
    if data.get("c0") is not None:
        c0_raw = _list(data["c0"], (*path, "c0"), "a list")
        c0s = [_capacitance(raw, (*path, "c0", f"[{i}]")) for i, raw in enumerate(c0_raw)]
        if not c0s:
            raise _fail((*path, "c0"), "empty list")
        _ascending_distinct(c0s, (*path, "c0"), "C0")
    rows_raw = data["esr"]
    if not isinstance(rows_raw, list | tuple):
        raise _fail((*path, "esr"), "expected a list with one entry per load capacitance")
    if len(rows_raw) != len(loads):
        raise _fail(
            (*path, "esr"),
            f"{len(rows_raw)} rows for {len(loads)} load capacitances",
        )
    width = 1 if c0s is None else len(c0s)
    rows: list[tuple[float | None, ...]] = []
    for i, row_raw in enumerate(rows_raw):
        row_path = (*path, "esr", f"[{i}]")
        cells_raw = [row_raw] if c0s is None and not isinstance(row_raw, list) else row_raw
        if not isinstance(cells_raw, list | tuple) or len(cells_raw) != width:
            raise _fail(
                row_path, f"expected {width} ESR value(s), one per C0, got '{_shown(row_raw)}'"
            )
        rows.append(
            tuple(
                None if cell is None else _esr(cell, (*row_path, f"[{j}]"))
                for j, cell in enumerate(cells_raw)
            )
        )
    if all(cell is None for row in rows for cell in row):
        raise _fail((*path, "esr"), "every cell is empty")
    row_order = sorted(range(len(loads)), key=lambda index: loads[index])
    column_order = list(range(width)) if c0s is None else sorted(range(width), key=c0s.__getitem__)
    return MaxEsrTable(
        load_capacitance_f=tuple(loads[i] for i in row_order),
        esr_ohm=tuple(tuple(rows[i][j] for j in column_order) for i in row_order),
        c0_f=None if c0s is None else tuple(c0s[j] for j in column_order),
    )


def _negative_resistance(value: object, path: Path_) -> tuple[float, float]:
    data = _mapping(
        value, path, "a mapping such as {resistance: -1.5 kohm, load_capacitance: 8 pF}"
    )
    _check_keys(data, path, _NEGATIVE_RESISTANCE_KEYS)
    for key in _NEGATIVE_RESISTANCE_KEYS:
        if key not in data:
            raise _fail((*path, key), "missing")
    raw = data["resistance"]
    ohms = _quantity(raw, (*path, "resistance"), "resistance")
    if ohms == 0.0:
        raise _fail((*path, "resistance"), f"cannot be zero, got '{_shown(raw)}'")
    _bounded(abs(ohms), (*path, "resistance"), raw, at_most=100e6, why="above 100 MΩ")
    load = _capacitance(data["load_capacitance"], (*path, "load_capacitance"))
    # Data sheets write it either way ("-1.5 kΩ" or "1.5 kΩ negative resistance").
    return -abs(ohms), load


def _internal_caps(value: object, path: Path_) -> InternalCaps:
    data = _mapping(value, path, "a mapping with range and step, or codes")
    _check_keys(data, path, _INTERNAL_CAPS_KEYS)
    applies_to = cast(
        Literal["each_pin", "load"],
        _choice(
            data.get("applies_to", "each_pin"),
            (*path, "applies_to"),
            ("each_pin", "load"),
            "what the value is",
        ),
    )
    has_range = "range" in data or "step" in data
    if has_range and "codes" in data:
        raise _fail(path, "give either range and step, or codes, not both")
    if "codes" in data:
        codes_data = _mapping(data["codes"], (*path, "codes"), "a mapping of code to capacitance")
        if not codes_data:
            raise _fail((*path, "codes"), "no codes")
        codes = [
            (
                _text_value(code, (*path, "codes", str(code)), "a register code"),
                _capacitance(raw, (*path, "codes", str(code)), allow_zero=True),
            )
            for code, raw in codes_data.items()
        ]
        return InternalCaps(applies_to=applies_to, codes=tuple(sorted(codes, key=lambda c: c[1])))
    if not has_range:
        raise _fail(path, "give range and step (e.g. range: [4 pF, 20 pF], step: 0.5 pF) or codes")
    for key in ("range", "step"):
        if key not in data:
            raise _fail((*path, key), "missing")
    ends = _list(data["range"], (*path, "range"), "[lowest, highest]")
    if len(ends) != 2:
        raise _fail((*path, "range"), f"expected [lowest, highest], got {len(ends)} values")
    low = _capacitance(ends[0], (*path, "range", "[0]"), allow_zero=True)
    high = _capacitance(ends[1], (*path, "range", "[1]"), allow_zero=True)
    if low > high:
        raise _fail((*path, "range"), "the lowest value is above the highest; write [low, high]")
    step = _capacitance(data["step"], (*path, "step"))
    if high > low and (high - low) / step > _MAX_INTERNAL_STEPS:
        raise _fail((*path, "step"), f"more than {_MAX_INTERNAL_STEPS} settings; check the step")
    return InternalCaps(applies_to=applies_to, range_f=(low, high), step_f=step)


def _amplifier(value: object, path: Path_, defaulted: list[str]) -> Amplifier:
    data = _mapping(value, path, "a mapping with the chip's oscillator figures")
    _check_keys(data, path, _AMPLIFIER_KEYS)
    gm_s: float | None = None
    gm_settings: tuple[tuple[str, float], ...] = ()
    given: list[str] = []
    if "gm" in data:
        raw = data["gm"]
        if isinstance(raw, Mapping):
            gm_settings = _gm_settings(
                _mapping(raw, (*path, "gm"), "drive settings"), (*path, "gm")
            )
            given.append("gm_settings")
        else:
            gm_s = _quantity(raw, (*path, "gm"), "transconductance")
            _bounded(gm_s, (*path, "gm"), raw, above=0.0)
            _bounded(gm_s, (*path, "gm"), raw, below=1.0, why="1 A/V is beyond any oscillator")
            given.append("gm")
    gm_crit_max_s: float | None = None
    if "gm_crit_max" in data:
        raw = data["gm_crit_max"]
        gm_crit_max_s = _quantity(raw, (*path, "gm_crit_max"), "transconductance")
        _bounded(gm_crit_max_s, (*path, "gm_crit_max"), raw, above=0.0)
        _bounded(
            gm_crit_max_s,
            (*path, "gm_crit_max"),
            raw,
            below=1.0,
            why="1 A/V is beyond any oscillator",
        )
        given.append("gm_crit_max")
    max_esr = _max_esr(data["max_esr"], (*path, "max_esr")) if "max_esr" in data else None
    if max_esr is not None:
        given.append("max_esr")
    rneg: float | None = None
    rneg_cl: float | None = None
    if "negative_resistance" in data:
        rneg, rneg_cl = _negative_resistance(
            data["negative_resistance"], (*path, "negative_resistance")
        )
        given.append("negative_resistance")
    form = _amplifier_form(data, path, given)

    def optional(key: str, default: float, parse: Callable[[object, Path_], float]) -> float:
        if data.get(key) is None:
            defaulted.append(_key_text((*path, key)))
            return default
        return parse(data[key], (*path, key))

    pin = optional(
        "pin_capacitance",
        Amplifier.pin_capacitance_f,
        lambda raw, where: _capacitance(raw, where, allow_zero=True),
    )
    swing = optional("swing", Amplifier.swing_v, _swing)
    output_resistance = (
        _resistance(data["output_resistance"], (*path, "output_resistance"))
        if data.get("output_resistance") is not None
        else None
    )
    bias_resistance = (
        _resistance(data["bias_resistance"], (*path, "bias_resistance"))
        if data.get("bias_resistance") is not None
        else None
    )
    internal = (
        _internal_caps(data["internal_caps"], (*path, "internal_caps"))
        if data.get("internal_caps") is not None
        else None
    )
    return Amplifier(
        form=form,
        gm_s=gm_s,
        gm_settings=gm_settings,
        gm_crit_max_s=gm_crit_max_s,
        max_esr=max_esr,
        negative_resistance_ohm=rneg,
        negative_resistance_cl_f=rneg_cl,
        pin_capacitance_f=pin,
        swing_v=swing,
        output_resistance_ohm=output_resistance,
        bias_resistance_ohm=bias_resistance,
        internal_caps=internal,
    )


def _amplifier_form(data: Mapping[str, object], path: Path_, given: list[str]) -> AmplifierForm:
    if "form" in data:
        form = _choice(data["form"], (*path, "form"), AMPLIFIER_FORMS, "an amplifier form")
        if form not in given:
            have = ", ".join(given) if given else "none"
            raise _fail((*path, "form"), f"'{form}' is named but not given (given: {have})")
        return cast(AmplifierForm, form)
    if not given:
        raise _fail(
            path,
            "no oscillator figure; give one of gm, gm (drive settings), gm_crit_max, "
            "max_esr, negative_resistance",
        )
    if len(given) > 1:
        raise _fail(
            path,
            f"{' and '.join(given)} are {'both' if len(given) == 2 else 'all'} given; add "
            f"'form: {given[0]}' (or another) to say which one the analysis uses",
        )
    return cast(AmplifierForm, given[0])


def _swing(raw: object, path: Path_) -> float:
    volts = _quantity(raw, path, "voltage")
    _bounded(volts, path, raw, above=0.0)
    return _bounded(volts, path, raw, at_most=20.0, why="above 20 V")


def _resistance(raw: object, path: Path_) -> float:
    ohms = _quantity(raw, path, "resistance")
    return _bounded(ohms, path, raw, above=0.0)


def _board(value: object, path: Path_, defaulted: list[str]) -> Board:
    data = _mapping(value, path, "a mapping with the board's figures")
    _check_keys(data, path, _BOARD_KEYS)
    default = Board()

    def take(key: str, fallback: object, parse: Callable[[object, Path_], object]) -> object:
        if data.get(key) is None:
            defaulted.append(_key_text((*path, key)))
            return fallback
        return parse(data[key], (*path, key))

    def fraction(raw: object, where: Path_) -> float:
        number = _quantity(raw, where, "fraction")
        _bounded(number, where, raw, at_least=0.0)
        return _bounded(
            number, where, raw, below=1.0, why="a fraction below 1; write '5 %' or 0.05"
        )

    fixed: tuple[float, float] | None = None
    if data.get("fixed_caps") is not None:
        items = _list(data["fixed_caps"], (*path, "fixed_caps"), "two capacitances [Ca, Cb]")
        if len(items) != 2:
            raise _fail(
                (*path, "fixed_caps"),
                f"expected two capacitances [Ca, Cb], got {len(items)} values",
            )
        fixed = (
            _capacitance(items[0], (*path, "fixed_caps", "[0]")),
            _capacitance(items[1], (*path, "fixed_caps", "[1]")),
        )
    return Board(
        stray_capacitance_f=cast(
            float,
            take(
                "stray_capacitance",
                default.stray_capacitance_f,
                lambda raw, where: _capacitance(raw, where, allow_zero=True),
            ),
        ),
        stray_uncertainty_f=cast(
            float,
            take(
                "stray_uncertainty",
                default.stray_uncertainty_f,
                lambda raw, where: _capacitance(raw, where, allow_zero=True),
            ),
        ),
        cap_series=cast(
            str,
            take(
                "cap_series",
                default.cap_series,
                lambda raw, where: _choice(raw, where, CAP_SERIES, "an IEC 60063 series"),
            ),
        ),
        cap_tolerance=cast(float, take("cap_tolerance", default.cap_tolerance, fraction)),
        cap_tolerance_small_f=cast(
            float,
            take(
                "cap_tolerance_small",
                default.cap_tolerance_small_f,
                lambda raw, where: _capacitance(raw, where, allow_zero=True),
            ),
        ),
        fixed_caps_f=fixed,
    )


def _package_name(raw: object, path: Path_) -> str:
    return _text_value(raw, path, "a package name such as 3225").upper().replace(" ", "")


def _limits(value: object, path: Path_, defaulted: list[str]) -> Limits:
    data = _mapping(value, path, "a mapping with the limits")
    _check_keys(data, path, _LIMITS_KEYS)
    default = Limits()
    if data.get("min_margin") is None:
        defaulted.append(_key_text((*path, "min_margin")))
        min_margin = default.min_margin
    else:
        raw = data["min_margin"]
        min_margin = _quantity(raw, (*path, "min_margin"), "count")
        _bounded(
            min_margin,
            (*path, "min_margin"),
            raw,
            at_least=1.0,
            why="below 1 the oscillator cannot start",
        )
    if data.get("marginal_band") is None:
        defaulted.append(_key_text((*path, "marginal_band")))
        band = default.marginal_band
    else:
        raw = data["marginal_band"]
        band = _quantity(raw, (*path, "marginal_band"), "fraction")
        _bounded(band, (*path, "marginal_band"), raw, at_least=0.0)
        _bounded(
            band,
            (*path, "marginal_band"),
            raw,
            below=1.0,
            why="a fraction below 1; write '20 %' or 0.2",
        )
    packages: tuple[str, ...] | None = None
    if data.get("packages") is not None:
        items = _list(data["packages"], (*path, "packages"), "a list of packages")
        if not items:
            raise _fail((*path, "packages"), "empty list; remove the key to allow any package")
        packages = tuple(
            dict.fromkeys(
                _package_name(item, (*path, "packages", f"[{i}]")) for i, item in enumerate(items)
            )
        )
    if data.get("lifecycle") is None:
        defaulted.append(_key_text((*path, "lifecycle")))
        lifecycle = default.lifecycle
    else:
        items = _list(data["lifecycle"], (*path, "lifecycle"), "a list of lifecycle values")
        if not items:
            raise _fail((*path, "lifecycle"), "empty list; every part would be ruled out")
        words = [
            _choice(
                item,
                (*path, "lifecycle", f"[{i}]"),
                ("active", "nrnd", "obsolete", "unknown"),
                "a lifecycle",
            )
            for i, item in enumerate(items)
        ]
        lifecycle = tuple(dict.fromkeys("" if word == "unknown" else word for word in words))
    max_height: float | None = None
    if data.get("max_height") is not None:
        raw = data["max_height"]
        max_height = _quantity(raw, (*path, "max_height"), "length")
        _bounded(max_height, (*path, "max_height"), raw, above=0.0)
    qualification: str | None = None
    if data.get("require_qualification") is not None:
        qualification = _text_value(
            data["require_qualification"],
            (*path, "require_qualification"),
            "a qualification such as AEC-Q200",
        )
    min_stock: float | None = None
    if data.get("min_stock") is not None:
        raw = data["min_stock"]
        min_stock = _quantity(raw, (*path, "min_stock"), "count")
        _bounded(min_stock, (*path, "min_stock"), raw, at_least=0.0)
    return Limits(
        min_margin=min_margin,
        marginal_band=band,
        packages=packages,
        lifecycle=lifecycle,
        max_height_mm=max_height,
        require_qualification=qualification,
        min_stock=min_stock,
    )


def _weights(value: object, path: Path_, defaulted: list[str]) -> Weights:
    data = _mapping(value, path, "a mapping of score weights")
    _check_keys(data, path, _WEIGHT_KEYS)
    default = Weights()
    values: dict[str, float] = {}
    for key in _WEIGHT_KEYS:
        if data.get(key) is None:
            defaulted.append(_key_text((*path, key)))
            values[key] = getattr(default, key)
            continue
        raw = data[key]
        number = _quantity(raw, (*path, key), "count")
        values[key] = _bounded(number, (*path, key), raw, at_least=0.0)
    if sum(values.values()) <= 0.0:
        raise _fail(path, "every weight is zero; give at least one a positive weight")
    return Weights(**values)


# --- the whole brief ------------------------------------------------------------------------


def parse_brief(data: Mapping[str, object] | object, *, source: str = _PLACEHOLDER_SOURCE) -> Brief:
    """Check a brief mapping (as read from YAML) and return it as a :class:`Brief`.

    Parameters
    ----------
    data : the mapping; values may carry units ("9 mA/V").
    source : where it came from, put in front of error messages (the default
        "<brief>" is left out, so messages start with the key path).

    Raises
    ------
    BriefError
        On the first problem found; the message names the key path.
    """
    try:
        return _parse(data)
    except BriefError as error:
        if source == _PLACEHOLDER_SOURCE:
            raise
        raise error.placed(source, error.line) from None


def _parse(data: object) -> Brief:
    if data is None:
        raise BriefError("the brief is empty; give at least frequency, budget and amplifier")
    if not isinstance(data, Mapping):
        raise BriefError(
            f"the brief must be a mapping of keys such as 'frequency: 32 MHz', got "
            f"{_describe_type(data)}"
        )
    top = _mapping(data, (), "a mapping")
    _check_keys(top, (), _TOP_KEYS)
    defaulted: list[str] = []

    name = _DEFAULT_NAME
    if top.get("name") is None:
        defaulted.append("name")
    else:
        name = _text_value(top["name"], ("name",), "a name")

    preset: Preset | None = None
    if top.get("preset") is not None:
        text = _text_value(top["preset"], ("preset",), "a preset name")
        try:
            preset = find_preset(text)
        except PresetError:
            suggestion = _closest(text, preset_names())
            hint = f"did you mean '{suggestion}'? " if suggestion else ""
            raise _fail(
                ("preset",),
                f"unknown preset '{_shown(text)}'; {hint}(known: {', '.join(preset_names())})",
            ) from None

    can = _can_block(top["can"], ("can",)) if top.get("can") is not None else None

    if top.get("frequency") is not None:
        raw = top["frequency"]
        frequency = _quantity(raw, ("frequency",), "frequency")
        _bounded(frequency, ("frequency",), raw, above=0.0)
        if not 1e3 <= frequency <= 1e9:
            raise _fail(
                ("frequency",),
                f"'{_shown(raw)}' is outside 1 kHz … 1 GHz, where quartz crystals run",
            )
    elif preset is not None and preset.frequency_hz is not None:
        frequency = preset.frequency_hz
        defaulted.append("frequency")
    else:
        raise _fail(("frequency",), "missing; give the clock frequency, e.g. 'frequency: 32 MHz'")

    budget, budget_source = _budget(top, preset, can)

    temp_min, temp_max = Brief.temp_min_c, Brief.temp_max_c
    if top.get("temperature") is None:
        defaulted.append("temperature")
    else:
        temp_min, temp_max = _temperature_range(top["temperature"], ("temperature",))

    lifetime = Brief.lifetime_s
    if top.get("lifetime") is None:
        defaulted.append("lifetime")
    else:
        raw = top["lifetime"]
        lifetime = _quantity(raw, ("lifetime",), "time")
        _bounded(lifetime, ("lifetime",), raw, at_least=0.0)
        _bounded(
            lifetime, ("lifetime",), raw, at_most=100 * 365.25 * 86400.0, why="more than 100 years"
        )

    if top.get("clock_role") is not None:
        clock_role = _choice(top["clock_role"], ("clock_role",), CLOCK_ROLES, "a clock role")
    else:
        defaulted.append("clock_role")
        clock_role = _implied_role(preset, can)

    if top.get("amplifier") is None:
        raise _fail(
            ("amplifier",),
            "missing; describe the chip's oscillator, e.g. 'amplifier: {gm: 9 mA/V}'",
        )
    amplifier = _amplifier(top["amplifier"], ("amplifier",), defaulted)
    board = _board(top.get("board") or {}, ("board",), defaulted)
    limits = _limits(top.get("limits") or {}, ("limits",), defaulted)
    weights = _weights(top.get("weights") or {}, ("weights",), defaulted)

    return Brief(
        name=name,
        frequency_hz=frequency,
        budget_ppm=budget,
        budget_source=budget_source,
        temp_min_c=temp_min,
        temp_max_c=temp_max,
        lifetime_s=lifetime,
        amplifier=amplifier,
        board=board,
        limits=limits,
        weights=weights,
        clock_role=clock_role,
        preset=None if preset is None else preset.name,
        can=can,
        defaulted=tuple(defaulted),
    )


def _budget(
    top: Mapping[str, object], preset: Preset | None, can: CanBitTiming | None
) -> tuple[float, str]:
    derived = _derived_budget(preset, can)
    if top.get("budget") is not None:
        raw = top["budget"]
        budget = _quantity(raw, ("budget",), "ppm")
        _bounded(budget, ("budget",), raw, above=0.0)
        _bounded(budget, ("budget",), raw, below=1e6, why="a million ppm is the whole frequency")
        # A budget written out that equals the preset's still cites the preset's clause
        # (an editor that shows every field writes the preset's budget back).
        if derived is not None and derived[0] == budget:
            return derived
        return budget, "brief"
    if derived is not None:
        return derived
    if preset is not None:
        raise _fail(
            ("can",),
            f"preset '{preset.name}' needs the bit timing, e.g. 'can: {{bit_time_quanta: 16, "
            "phase_seg1: 7, phase_seg2: 4, sjw: 4}', or an explicit budget",
        )
    raise _fail(
        ("budget",),
        "missing; give the total error allowed, e.g. 'budget: 40 ppm', or a preset "
        f"({', '.join(preset_names())})",
    )


def _derived_budget(preset: Preset | None, can: CanBitTiming | None) -> tuple[float, str] | None:
    """The budget the preset or the CAN bit timing gives, with its source, or None."""
    # Kept to 15 significant digits, as parsed values are, so that a brief written out in
    # full reads back to the same number.
    if preset is not None and preset.budget_ppm is not None:
        return float(f"{preset.budget_ppm:.15g}"), preset.clause
    if can is not None:
        return float(f"{can.tolerance_ppm():.15g}"), can.describe()
    return None


def _implied_role(preset: Preset | None, can: CanBitTiming | None) -> str:
    if preset is not None:
        return preset.clock_role
    if can is not None:
        return "can"
    return "general"


# --- reading files --------------------------------------------------------------------------


def load_brief_mapping(path: str | Path) -> dict[str, object]:
    """Read a brief file as a plain mapping (for an editor), with the checks of load_brief.

    The file is size-capped, must be UTF-8 YAML without duplicate keys or aliases, and
    must hold a mapping; its values are not checked (use :func:`parse_brief` for that).

    Raises
    ------
    BriefError
        As :func:`load_brief` does for the file itself.
    """
    source = str(path)
    text = _read_text(Path(path), source)
    _yaml_lines(text, source)
    data = yaml.safe_load(text)
    if data is None:
        return {}
    if not isinstance(data, dict):
        raise BriefError(
            f"the brief must be a mapping of keys such as 'frequency: 32 MHz', got "
            f"{_describe_type(data)}",
            source=source,
        )
    return cast(dict[str, object], data)


def load_brief(path: str | Path) -> Brief:
    """Read and check a brief YAML file.

    Errors carry the file name and, where the YAML shows it, the line:
    ``brief.yaml:7: amplifier.gm: expected a transconductance such as '9 mA/V', got 'abc'``.

    Raises
    ------
    BriefError
        Unreadable file, larger than :data:`MAX_BRIEF_BYTES`, not UTF-8, not YAML,
        duplicate keys, YAML anchors/aliases, or any problem :func:`parse_brief` finds.
    """
    source = str(path)
    text = _read_text(Path(path), source)
    lines = _yaml_lines(text, source)
    try:
        data = yaml.safe_load(text)
    except yaml.YAMLError as error:  # already caught by _yaml_lines; kept for safety
        raise BriefError(f"not valid YAML: {_yaml_problem(error)}", source=source) from None
    try:
        return _parse(data)
    except BriefError as error:
        raise error.placed(source, _line_for(error.key_path, lines)) from None


def _read_text(path: Path, source: str) -> str:
    try:
        # Non-blocking open: a named pipe with no writer would block open() forever.
        descriptor = os.open(path, os.O_RDONLY | getattr(os, "O_NONBLOCK", 0))
        if getattr(os, "O_NONBLOCK", 0):
            os.set_blocking(descriptor, True)
        with os.fdopen(descriptor, "rb") as handle:
            raw = handle.read(MAX_BRIEF_BYTES + 1)
    except IsADirectoryError:
        raise BriefError("is a directory, not a brief file", source=source) from None
    except OSError as error:
        raise BriefError(
            f"cannot read the brief: {error.strerror or error}", source=source
        ) from None
    if len(raw) > MAX_BRIEF_BYTES:
        raise BriefError(
            f"larger than {MAX_BRIEF_BYTES // 1024} KiB; a brief is a short YAML file",
            source=source,
        )
    try:
        return raw.decode("utf-8-sig")
    except UnicodeDecodeError as error:
        raise BriefError(f"not UTF-8 text (byte {error.start})", source=source) from None


def _yaml_problem(error: yaml.YAMLError) -> str:
    problem = getattr(error, "problem", None) or str(error).splitlines()[0]
    return str(problem)


def _yaml_lines(text: str, source: str) -> dict[Path_, int]:
    """Map each key path to its 1-based line; reject aliases and duplicate keys."""
    depth = 0
    try:
        # The event stream is read without recursion, so depth is checked here, before
        # the (recursive) composer could overflow the stack on hostile nesting.
        for event in yaml.parse(text, Loader=yaml.SafeLoader):
            if isinstance(event, yaml.CollectionStartEvent):
                depth += 1
                if depth > _MAX_YAML_DEPTH:
                    line = event.start_mark.line + 1 if event.start_mark else None
                    raise BriefError(
                        f"nested more than {_MAX_YAML_DEPTH} levels deep; a brief is a few "
                        "levels of keys",
                        source=source,
                        line=line,
                    )
            elif isinstance(event, yaml.CollectionEndEvent):
                depth -= 1
            elif isinstance(event, yaml.AliasEvent):
                line = event.start_mark.line + 1 if event.start_mark else None
                raise BriefError(
                    "YAML anchors and aliases are not supported in a brief",
                    source=source,
                    line=line,
                )
        root = yaml.compose(text, Loader=yaml.SafeLoader)
    except yaml.MarkedYAMLError as error:
        mark = error.problem_mark or error.context_mark
        line = mark.line + 1 if mark is not None else None
        raise BriefError(
            f"not valid YAML: {_yaml_problem(error)}", source=source, line=line
        ) from None
    except yaml.YAMLError as error:
        raise BriefError(f"not valid YAML: {_yaml_problem(error)}", source=source) from None
    lines: dict[Path_, int] = {}
    if root is not None:
        _walk_nodes(root, (), lines, source)
    return lines


def _walk_nodes(node: yaml.Node, path: Path_, lines: dict[Path_, int], source: str) -> None:
    if isinstance(node, yaml.MappingNode):
        seen: dict[str, int] = {}
        for key_node, value_node in node.value:
            key = str(key_node.value)
            line = key_node.start_mark.line + 1
            if key in seen:
                raise BriefError(
                    f"duplicate key (first on line {seen[key]})",
                    key=_key_text((*path, key)),
                    source=source,
                    line=line,
                )
            seen[key] = line
            lines[(*path, key)] = line
            _walk_nodes(value_node, (*path, key), lines, source)
    elif isinstance(node, yaml.SequenceNode):
        for index, item in enumerate(node.value):
            lines[(*path, f"[{index}]")] = item.start_mark.line + 1
            _walk_nodes(item, (*path, f"[{index}]"), lines, source)


def _line_for(key_path: Path_, lines: Mapping[Path_, int]) -> int | None:
    for length in range(len(key_path), 0, -1):
        line = lines.get(key_path[:length])
        if line is not None:
            return line
    return None


# --- writing ---------------------------------------------------------------------------------


def _exact_text(value: float, dimension: Dimension) -> str:
    """Text with a unit that parses back to exactly ``value`` (shortest such form).

    Capacitances are written in pF whatever their size ("0.25 pF", not "250 fF"): that
    is how crystal circuits are discussed.
    """
    for digits in range(4, 18):
        if dimension == "capacitance":
            text = _trimmed(value * 1e12, digits) + " pF"
        else:
            text = format_quantity(value, dimension, digits=digits)
        try:
            if parse_quantity(text, dimension) == value:
                return text
        except UnitError:
            break
    return f"{value!r} {_CANONICAL_SPELLING[dimension]}".strip()


def _trimmed(number: float, decimals: int) -> str:
    text = f"{number:.{decimals}f}"
    if "." in text:
        text = text.rstrip("0").rstrip(".")
    return "0" if text in ("-0", "") else text


_CANONICAL_SPELLING: Final[dict[str, str]] = {
    "frequency": "Hz",
    "capacitance": "F",
    "resistance": "ohm",
    "ppm": "ppm",
    "temperature": "degC",
    "time": "s",
    "transconductance": "S",
    "voltage": "V",
    "length": "mm",
    "fraction": "",
    "count": "",
}


def _plain_number(value: float) -> int | float:
    return int(value) if value.is_integer() and abs(value) < 2**53 else value


def brief_to_mapping(brief: Brief, *, include_defaults: bool = False) -> dict[str, object]:
    """The brief as a YAML-ready mapping with units ("9 mA/V"), in the brief's key layout.

    Values the brief file did not give (``brief.defaulted``) are left out when they still
    hold the value they were filled with, so a saved brief stays what the user wrote;
    ``include_defaults=True`` writes every value (for an editor that shows all fields);
    that mapping parses to the same brief apart from ``defaulted``.
    ``parse_brief(brief_to_mapping(b)) == b`` for every brief ``parse_brief`` returns.
    """
    reference = _reference_brief(brief)
    omit = set() if include_defaults else set(brief.defaulted)

    def keep(path: str, current: object, filled: object) -> bool:
        return path not in omit or current != filled

    out: dict[str, object] = {}
    if keep("name", brief.name, reference.name):
        out["name"] = brief.name
    if brief.preset is not None:
        out["preset"] = brief.preset
    if keep("frequency", brief.frequency_hz, reference.frequency_hz):
        out["frequency"] = _exact_text(brief.frequency_hz, "frequency")
    if brief.budget_source == "brief" or include_defaults:
        out["budget"] = _exact_text(brief.budget_ppm, "ppm")
    if keep(
        "temperature",
        (brief.temp_min_c, brief.temp_max_c),
        (reference.temp_min_c, reference.temp_max_c),
    ):
        out["temperature"] = [
            _exact_text(brief.temp_min_c, "temperature"),
            _exact_text(brief.temp_max_c, "temperature"),
        ]
    if keep("lifetime", brief.lifetime_s, reference.lifetime_s):
        out["lifetime"] = _exact_text(brief.lifetime_s, "time")
    if keep("clock_role", brief.clock_role, reference.clock_role):
        out["clock_role"] = brief.clock_role
    if brief.can is not None:
        out["can"] = dict(brief.can.to_mapping())
    out["amplifier"] = _amplifier_mapping(brief.amplifier, keep)
    for key, section in (
        ("board", _board_mapping(brief.board, keep)),
        ("limits", _limits_mapping(brief.limits, keep)),
        ("weights", _weights_mapping(brief.weights, keep)),
    ):
        if section:
            out[key] = section
    return out


def _reference_brief(brief: Brief) -> Brief:
    """What each defaulted key of ``brief`` was filled with (defaults, preset, CAN)."""
    preset = find_preset(brief.preset) if brief.preset is not None else None
    frequency = (
        preset.frequency_hz
        if preset is not None and preset.frequency_hz is not None
        else brief.frequency_hz
    )
    return Brief(
        frequency_hz=frequency,
        budget_ppm=brief.budget_ppm,
        amplifier=brief.amplifier,
        clock_role=_implied_role(preset, brief.can),
    )


_Keep = Callable[[str, object, object], bool]


def _amplifier_mapping(amplifier: Amplifier, keep: _Keep) -> dict[str, object]:
    default = Amplifier(form="gm", gm_s=1.0)
    out: dict[str, object] = {}
    if len(amplifier.forms_given()) > 1:
        out["form"] = amplifier.form
    if amplifier.gm_s is not None:
        out["gm"] = _exact_text(amplifier.gm_s, "transconductance")
    if amplifier.gm_settings:
        out["gm"] = {
            name: _exact_text(gm, "transconductance") for name, gm in amplifier.gm_settings
        }
    if amplifier.gm_crit_max_s is not None:
        out["gm_crit_max"] = _exact_text(amplifier.gm_crit_max_s, "transconductance")
    if amplifier.max_esr is not None:
        out["max_esr"] = _max_esr_mapping(amplifier.max_esr)
    if amplifier.negative_resistance_ohm is not None and amplifier.negative_resistance_cl_f:
        out["negative_resistance"] = {
            "resistance": _exact_text(amplifier.negative_resistance_ohm, "resistance"),
            "load_capacitance": _exact_text(amplifier.negative_resistance_cl_f, "capacitance"),
        }
    if keep("amplifier.pin_capacitance", amplifier.pin_capacitance_f, default.pin_capacitance_f):
        out["pin_capacitance"] = _exact_text(amplifier.pin_capacitance_f, "capacitance")
    if keep("amplifier.swing", amplifier.swing_v, default.swing_v):
        out["swing"] = _exact_text(amplifier.swing_v, "voltage")
    if amplifier.output_resistance_ohm is not None:
        out["output_resistance"] = _exact_text(amplifier.output_resistance_ohm, "resistance")
    if amplifier.bias_resistance_ohm is not None:
        out["bias_resistance"] = _exact_text(amplifier.bias_resistance_ohm, "resistance")
    if amplifier.internal_caps is not None:
        out["internal_caps"] = _internal_caps_mapping(amplifier.internal_caps)
    return out


def _max_esr_mapping(table: MaxEsrTable) -> dict[str, object]:
    def esr_text(cell: float | None) -> str | None:
        return None if cell is None else _exact_text(cell, "resistance")

    if table.c0_f is None and all(row[0] is not None for row in table.esr_ohm):
        return {
            _exact_text(load, "capacitance"): esr_text(row[0])
            for load, row in zip(table.load_capacitance_f, table.esr_ohm, strict=True)
        }
    grid: dict[str, object] = {
        "load_capacitance": [_exact_text(load, "capacitance") for load in table.load_capacitance_f]
    }
    if table.c0_f is not None:
        grid["c0"] = [_exact_text(c0, "capacitance") for c0 in table.c0_f]
        grid["esr"] = [[esr_text(cell) for cell in row] for row in table.esr_ohm]
    else:
        grid["esr"] = [esr_text(row[0]) for row in table.esr_ohm]
    return grid


def _internal_caps_mapping(caps: InternalCaps) -> dict[str, object]:
    out: dict[str, object] = {}
    if caps.codes:
        out["codes"] = {code: _exact_text(value, "capacitance") for code, value in caps.codes}
    elif caps.range_f is not None and caps.step_f is not None:
        out["range"] = [_exact_text(end, "capacitance") for end in caps.range_f]
        out["step"] = _exact_text(caps.step_f, "capacitance")
    if caps.applies_to != "each_pin":
        out["applies_to"] = caps.applies_to
    return out


def _board_mapping(board: Board, keep: _Keep) -> dict[str, object]:
    default = Board()
    out: dict[str, object] = {}
    for key, current, filled, dimension in (
        (
            "stray_capacitance",
            board.stray_capacitance_f,
            default.stray_capacitance_f,
            "capacitance",
        ),
        (
            "stray_uncertainty",
            board.stray_uncertainty_f,
            default.stray_uncertainty_f,
            "capacitance",
        ),
        ("cap_series", board.cap_series, default.cap_series, None),
        ("cap_tolerance", board.cap_tolerance, default.cap_tolerance, "fraction"),
        (
            "cap_tolerance_small",
            board.cap_tolerance_small_f,
            default.cap_tolerance_small_f,
            "capacitance",
        ),
    ):
        if keep(f"board.{key}", current, filled):
            out[key] = (
                current
                if dimension is None
                else _exact_text(cast(float, current), cast(Dimension, dimension))
            )
    if board.fixed_caps_f is not None:
        out["fixed_caps"] = [_exact_text(cap, "capacitance") for cap in board.fixed_caps_f]
    return out


def _limits_mapping(limits: Limits, keep: _Keep) -> dict[str, object]:
    default = Limits()
    out: dict[str, object] = {}
    if keep("limits.min_margin", limits.min_margin, default.min_margin):
        out["min_margin"] = _plain_number(limits.min_margin)
    if keep("limits.marginal_band", limits.marginal_band, default.marginal_band):
        out["marginal_band"] = _exact_text(limits.marginal_band, "fraction")
    if limits.packages is not None:
        out["packages"] = list(limits.packages)
    if keep("limits.lifecycle", limits.lifecycle, default.lifecycle):
        out["lifecycle"] = [word or "unknown" for word in limits.lifecycle]
    if limits.max_height_mm is not None:
        out["max_height"] = _exact_text(limits.max_height_mm, "length")
    if limits.require_qualification is not None:
        out["require_qualification"] = limits.require_qualification
    if limits.min_stock is not None:
        out["min_stock"] = _plain_number(limits.min_stock)
    return out


def _weights_mapping(weights: Weights, keep: _Keep) -> dict[str, object]:
    default = Weights()
    return {
        key: _plain_number(getattr(weights, key))
        for key in _WEIGHT_KEYS
        if keep(f"weights.{key}", getattr(weights, key), getattr(default, key))
    }


def brief_to_yaml(brief: Brief, *, include_defaults: bool = False) -> str:
    """The brief as YAML text (UTF-8, keys in the brief's order)."""
    return yaml.dump(
        brief_to_mapping(brief, include_defaults=include_defaults),
        Dumper=_BriefDumper,
        sort_keys=False,
        allow_unicode=True,
        default_flow_style=False,
        width=100,
    )


class _BriefDumper(yaml.SafeDumper):
    """Block mappings, but short lists on one line: ``temperature: [-40 °C, 85 °C]``."""


def _represent_list(dumper: yaml.SafeDumper, items: list[object]) -> yaml.Node:
    nested = any(isinstance(item, list | dict) for item in items)
    return dumper.represent_sequence("tag:yaml.org,2002:seq", items, flow_style=not nested)


_BriefDumper.add_representer(list, _represent_list)


# --- bundled demo briefs ---------------------------------------------------------------------

_DEFAULT_BRIEF: Final[str] = "ble_radio.yaml"


def demo_brief_paths() -> list[Path]:
    """The bundled demo briefs (package data of ``demo_catalog``), sorted by name."""
    folder = resources.files("demo_catalog").joinpath("briefs")
    found = [
        Path(str(entry))
        for entry in folder.iterdir()
        if entry.is_file() and entry.name.endswith((".yaml", ".yml"))
    ]
    return sorted(found, key=lambda path: path.name)


def default_brief_path() -> Path:
    """The brief ``picker`` opens when none is given: the Bluetooth LE radio clock.

    It is the most telling demo: a tight budget over a wide temperature range and a long
    life, where aging and load pulling decide, with a programmable-load-cap chip.
    """
    return Path(str(resources.files("demo_catalog").joinpath("briefs", _DEFAULT_BRIEF)))
