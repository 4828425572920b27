"""The catalog schema as data: every field, its unit, its header aliases, its checks.

Reading and validation are driven by ``FIELDS`` rather than by per-field code, so adding a
field is one ``FieldSpec`` entry (plus a part-table column in INTERFACES.md).

Field names and part-table columns follow DESIGN.md §3 and INTERFACES.md. Aliases are the
headers people actually put in supplier spreadsheets and distributor exports; they are
compared after ``normalise_header`` (lower case, punctuation and spacing folded), so
"Part No.", "part-no" and "PART NO" are one alias.
"""

from __future__ import annotations

import re
from dataclasses import dataclass
from typing import Final, Literal

from catalog.units import Dimension

__all__ = [
    "CUT_SYNONYMS",
    "FIELDS",
    "FIELDS_BY_NAME",
    "LIFECYCLE_SYNONYMS",
    "MISSING_MARKERS",
    "MODE_SYNONYMS",
    "PINOUT_SYNONYMS",
    "REQUIRED_FIELDS",
    "TEMP_RANGE_FIELD",
    "FieldKind",
    "FieldSpec",
    "normalise_header",
]

FieldKind = Literal["quantity", "text", "choice", "load", "range"]


@dataclass(frozen=True)
class FieldSpec:
    """One catalog field.

    Attributes
    ----------
    name : str
        Our field name (what a mapping file names; DESIGN §3).
    column : str
        Part-table column it fills (the unit is in the name: ``esr_ohm``).
    kind : FieldKind
        ``quantity`` (a number with a unit), ``text`` (kept as written, stripped),
        ``choice`` (one of a closed set, see the ``*_SYNONYMS`` tables), ``load`` (a
        capacitance or the word ``series``), ``range`` (a temperature range that fills
        ``temp_min`` and ``temp_max``).
    dimension : Dimension or None
        For quantities: what ``catalog.units.parse_quantity`` must find.
    unit : str
        The canonical unit of the column (documentation and messages).
    required : bool
        A catalog without this column cannot be used; a row without a value is dropped.
    aliases : tuple of str
        Header spellings that mean this field (compared after ``normalise_header``).
    doc : str
        One line for the user: what the field is.
    allow_negative, allow_zero : bool
        Whether a negative / zero value is physically possible.
    needs_unit : bool
        A bare number is refused unless the header gives a unit: its canonical unit is
        no natural way to write it (a bare "12" in a load-capacitance column is not 12 F).
    """

    name: str
    column: str
    kind: FieldKind
    dimension: Dimension | None
    unit: str
    required: bool
    aliases: tuple[str, ...]
    doc: str
    allow_negative: bool = False
    allow_zero: bool = False
    needs_unit: bool = False


#: Pseudo-field for a single "Operating Temperature: -40 to 85 °C" column.
TEMP_RANGE_FIELD: Final[str] = "temp_range"

FIELDS: Final[tuple[FieldSpec, ...]] = (
    FieldSpec(
        "mpn",
        "mpn",
        "text",
        None,
        "",
        True,
        (
            "part number",
            "part no",
            "part num",
            "part #",
            "part",
            "mpn",
            "mfr part #",
            "mfr part number",
            "mfr part no",
            "mfg part number",
            "mfg part #",
            "manufacturer part number",
            "manufacturer part no",
            "p n",
            "pn",
            "part id",
            "ordering code",
            "order code",
            "order number",
            "item",
            "item number",
        ),
        "the part number used to order the crystal",
    ),
    FieldSpec(
        "maker",
        "maker",
        "text",
        None,
        "",
        False,
        (
            "manufacturer",
            "mfr",
            "mfg",
            "maker",
            "vendor",
            "brand",
            "make",
            "supplier",
            "manufacturer name",
            "mfr name",
        ),
        "who makes the part",
    ),
    FieldSpec(
        "frequency",
        "freq_hz",
        "quantity",
        "frequency",
        "Hz",
        True,
        (
            "freq",
            "frequency",
            "nominal frequency",
            "nominal freq",
            "frequency nominal",
            "f0",
            "fo",
            "fnom",
            "f nom",
            "output frequency",
            "resonant frequency",
            "center frequency",
            "freq hz",
            "freq_hz",
        ),
        "nominal frequency",
    ),
    FieldSpec(
        "load_capacitance",
        "load_capacitance_f",
        "load",
        "capacitance",
        "F",
        True,
        (
            "cl",
            "c l",
            "load cap",
            "load capacitance",
            "load c",
            "c load",
            "cload",
            "load",
            "load capacitance cl",
            "cl load capacitance",
            "load_capacitance_f",
        ),
        "load capacitance the frequency is calibrated at, or 'series'",
        needs_unit=True,
    ),
    FieldSpec(
        "tolerance",
        "tolerance_ppm",
        "quantity",
        "ppm",
        "ppm",
        True,
        (
            "tol",
            "tolerance",
            "freq tolerance",
            "frequency tolerance",
            "freq tol",
            "tolerance at 25 c",
            "tolerance 25 c",
            "tolerance at 25c",
            "initial tolerance",
            "calibration tolerance",
            "adjustment tolerance",
            "frequency tolerance at 25 c",
            "tolerance_ppm",
        ),
        "frequency tolerance at 25 °C (± ppm)",
    ),
    FieldSpec(
        "stability",
        "stability_ppm",
        "quantity",
        "ppm",
        "ppm",
        True,
        (
            "stability",
            "freq stability",
            "frequency stability",
            "temp stability",
            "temperature stability",
            "stability over temperature",
            "frequency stability over temperature",
            "stab",
            "freq stab",
            "temperature characteristics",
            "frequency vs temperature",
            "stability_ppm",
        ),
        "frequency stability over the rated temperature range (± ppm)",
    ),
    FieldSpec(
        "temp_min",
        "temp_min_c",
        "quantity",
        "temperature",
        "°C",
        True,
        (
            "op temp min",
            "operating temp min",
            "operating temperature min",
            "temp min",
            "min temp",
            "tmin",
            "t min",
            "min operating temp",
            "min operating temperature",
            "minimum temperature",
            "operating temperature minimum",
            "temp low",
            "temp_min_c",
        ),
        "lowest rated operating temperature",
        allow_negative=True,
        allow_zero=True,
    ),
    FieldSpec(
        "temp_max",
        "temp_max_c",
        "quantity",
        "temperature",
        "°C",
        True,
        (
            "op temp max",
            "operating temp max",
            "operating temperature max",
            "temp max",
            "max temp",
            "tmax",
            "t max",
            "max operating temp",
            "max operating temperature",
            "maximum temperature",
            "operating temperature maximum",
            "temp high",
            "temp_max_c",
        ),
        "highest rated operating temperature",
        allow_negative=True,
        allow_zero=True,
    ),
    FieldSpec(
        TEMP_RANGE_FIELD,
        "",
        "range",
        "temperature",
        "°C",
        False,
        (
            "operating temperature",
            "operating temp",
            "operating temperature range",
            "operating temp range",
            "op temp",
            "op temp range",
            "temp range",
            "temperature range",
            "operating range",
            "temperature",
            "temp",
            "rated temperature",
            "operating temperature range topr",
            "topr",
        ),
        "rated temperature range written as one text, e.g. '-40 to 85 °C'",
        allow_negative=True,
        allow_zero=True,
    ),
    FieldSpec(
        "esr",
        "esr_ohm",
        "quantity",
        "resistance",
        "Ω",
        True,
        (
            "esr",
            "esr max",
            "max esr",
            "esr maximum",
            "r1",
            "r1 max",
            "equivalent series resistance",
            "series resistance",
            "rs",
            "resistance",
            "motional resistance",
            "esr_ohm",
        ),
        "largest equivalent series resistance (R1)",
    ),
    FieldSpec(
        "package",
        "package",
        "text",
        None,
        "",
        True,
        (
            "package",
            "case",
            "size",
            "footprint",
            "pkg",
            "package size",
            "case size",
            "package case",
            "package type",
            "case package",
            "housing",
            "outline",
            "dimensions",
        ),
        "package or footprint, e.g. 3225 or HC-49/US",
    ),
    FieldSpec(
        "beta",
        "beta_ppm_per_c2",
        "quantity",
        "ppm_per_c2",
        "ppm/°C²",
        False,
        (
            "beta",
            "parabolic coefficient",
            "temperature coefficient",
            "temp coefficient",
            "curvature",
            "parabolic temperature coefficient",
            "b",
            "tempco",
            "beta_ppm_per_c2",
        ),
        "parabolic temperature coefficient of a tuning fork (negative)",
        allow_negative=True,
    ),
    FieldSpec(
        "turnover",
        "turnover_c",
        "quantity",
        "temperature",
        "°C",
        False,
        (
            "turnover",
            "turnover temp",
            "turnover temperature",
            "turning point",
            "turnover point",
            "t0",
            "peak temperature",
            "turnover_c",
        ),
        "turnover temperature of a tuning fork",
        allow_negative=True,
        allow_zero=True,
    ),
    FieldSpec(
        "mode",
        "mode",
        "choice",
        None,
        "",
        False,
        (
            "mode",
            "oscillation mode",
            "vibration mode",
            "overtone",
            "overtone order",
            "mode of oscillation",
        ),
        "fundamental, overtone3 or overtone5",
    ),
    FieldSpec(
        "cut",
        "cut",
        "choice",
        None,
        "",
        False,
        ("cut", "crystal cut", "cut type", "cut angle", "resonator type", "crystal type"),
        "crystal cut: AT, tuning_fork, SC, ...",
    ),
    FieldSpec(
        "c0",
        "c0_f",
        "quantity",
        "capacitance",
        "F",
        False,
        (
            "c0",
            "co",
            "shunt capacitance",
            "shunt cap",
            "static capacitance",
            "parallel capacitance",
            "holder capacitance",
            "c0 shunt capacitance",
            "c0_f",
        ),
        "shunt (static) capacitance",
        needs_unit=True,
    ),
    FieldSpec(
        "c1",
        "c1_f",
        "quantity",
        "capacitance",
        "F",
        False,
        (
            "c1",
            "motional capacitance",
            "motional cap",
            "cm",
            "c1 motional capacitance",
            "dynamic capacitance",
            "c1_f",
        ),
        "motional capacitance",
        needs_unit=True,
    ),
    FieldSpec(
        "l1",
        "l1_h",
        "quantity",
        "inductance",
        "H",
        False,
        ("l1", "motional inductance", "lm", "dynamic inductance", "l1_h"),
        "motional inductance",
        needs_unit=True,
    ),
    FieldSpec(
        "drive_level",
        "drive_level_w",
        "quantity",
        "power",
        "W",
        False,
        (
            "drive level",
            "drive level max",
            "max drive level",
            "drive",
            "dl",
            "dl max",
            "drive level maximum",
            "maximum drive level",
            "power dissipation",
            "drive_level_w",
        ),
        "largest drive level the part tolerates",
        needs_unit=True,
    ),
    FieldSpec(
        "aging",
        "aging_ppm",
        "quantity",
        "ppm",
        "ppm",
        False,
        (
            "aging",
            "ageing",
            "aging first year",
            "aging 1st year",
            "aging per year",
            "aging ppm yr",
            "aging yr",
            "long term stability",
            "aging_ppm",
        ),
        "frequency aging in the first year (± ppm)",
    ),
    FieldSpec(
        "length_mm",
        "length_mm",
        "quantity",
        "length",
        "mm",
        False,
        ("l", "length", "len", "size l", "body length", "length_mm"),
        "body length",
    ),
    FieldSpec(
        "width_mm",
        "width_mm",
        "quantity",
        "length",
        "mm",
        False,
        ("w", "width", "size w", "body width", "width_mm"),
        "body width",
    ),
    FieldSpec(
        "height_mm",
        "height_mm",
        "quantity",
        "length",
        "mm",
        False,
        (
            "h",
            "height",
            "max height",
            "height max",
            "seated height",
            "thickness",
            "size h",
            "body height",
            "height_mm",
        ),
        "seated height",
    ),
    FieldSpec(
        "price",
        "price",
        "quantity",
        "money",
        "",
        False,
        (
            "price",
            "unit price",
            "cost",
            "unit cost",
            "price each",
            "price 1",
            "price usd",
            "price eur",
            "1k price",
            "price 1k",
            "budgetary price",
        ),
        "unit price in the catalog's currency",
        allow_zero=True,
    ),
    FieldSpec(
        "stock",
        "stock",
        "quantity",
        "count",
        "",
        False,
        (
            "stock",
            "qty available",
            "quantity available",
            "inventory",
            "in stock",
            "available",
            "qty",
            "quantity",
            "stock qty",
            "on hand",
            "availability",
        ),
        "parts in stock",
        allow_zero=True,
    ),
    FieldSpec(
        "lifecycle",
        "lifecycle",
        "choice",
        None,
        "",
        False,
        (
            "lifecycle",
            "life cycle",
            "lifecycle status",
            "part status",
            "status",
            "product status",
            "life cycle status",
        ),
        "active, nrnd or obsolete",
    ),
    FieldSpec(
        "qualification",
        "qualification",
        "text",
        None,
        "",
        False,
        (
            "qualification",
            "grade",
            "automotive",
            "quality grade",
            "qualified",
            "automotive qualification",
            "qualification grade",
        ),
        "qualification grade, e.g. AEC-Q200",
    ),
    FieldSpec(
        "pinout",
        "pinout",
        "choice",
        None,
        "",
        False,
        (
            "pinout",
            "pin out",
            "crystal pads",
            "crystal pins",
            "pads",
            "pin configuration",
            "pin config",
            "pin assignment",
            "xtal pins",
            "xtal pads",
        ),
        "pads that carry the crystal on a 4-pad part: 1-3, 2-4 or 1-4",
    ),
    FieldSpec(
        "msl",
        "msl",
        "text",
        None,
        "",
        False,
        ("msl", "moisture sensitivity level", "moisture sensitivity", "msl level"),
        "moisture sensitivity level",
    ),
)

FIELDS_BY_NAME: Final[dict[str, FieldSpec]] = {spec.name: spec for spec in FIELDS}
REQUIRED_FIELDS: Final[tuple[str, ...]] = tuple(spec.name for spec in FIELDS if spec.required)

#: Cell texts that mean "no value" (compared lower-case, stripped).
MISSING_MARKERS: Final[frozenset[str]] = frozenset(
    {"", "-", "--", "—", "–", "n/a", "na", "n.a.", "none", "null", "nan", "?", "tbd", "~"}
)

#: Written forms of each vibration mode (compared after ``normalise_header``).
MODE_SYNONYMS: Final[dict[str, str]] = {
    "fundamental": "fundamental",
    "fund": "fundamental",
    "fundamental mode": "fundamental",
    "1st": "fundamental",
    "1": "fundamental",
    "f": "fundamental",
    "1st overtone": "fundamental",
    "overtone3": "overtone3",
    "3rd overtone": "overtone3",
    "3rd": "overtone3",
    "3": "overtone3",
    "3ot": "overtone3",
    "ot3": "overtone3",
    "3rd ot": "overtone3",
    "third overtone": "overtone3",
    "overtone 3": "overtone3",
    "3 overtone": "overtone3",
    "overtone5": "overtone5",
    "5th overtone": "overtone5",
    "5th": "overtone5",
    "5": "overtone5",
    "5ot": "overtone5",
    "ot5": "overtone5",
    "5th ot": "overtone5",
    "fifth overtone": "overtone5",
    "overtone 5": "overtone5",
    "5 overtone": "overtone5",
}

#: Written forms of each lifecycle state.
LIFECYCLE_SYNONYMS: Final[dict[str, str]] = {
    "active": "active",
    "production": "active",
    "in production": "active",
    "mass production": "active",
    "new": "active",
    "preferred": "active",
    "nrnd": "nrnd",
    "nrfnd": "nrnd",
    "not recommended for new designs": "nrnd",
    "not recommended": "nrnd",
    "not for new designs": "nrnd",
    "mature": "nrnd",
    "last time buy": "nrnd",
    "ltb": "nrnd",
    "obsolete": "obsolete",
    "eol": "obsolete",
    "end of life": "obsolete",
    "discontinued": "obsolete",
    "obs": "obsolete",
    "inactive": "obsolete",
}

#: Written forms of the common cuts; other short letter codes ("SC", "IT") are kept upper-case.
CUT_SYNONYMS: Final[dict[str, str]] = {
    "at": "AT",
    "at cut": "AT",
    "atcut": "AT",
    "sc": "SC",
    "sc cut": "SC",
    "bt": "BT",
    "bt cut": "BT",
    "it": "IT",
    "it cut": "IT",
    "tuning fork": "tuning_fork",
    "tuning_fork": "tuning_fork",
    "tuningfork": "tuning_fork",
    "tf": "tuning_fork",
    "fork": "tuning_fork",
    "xy": "tuning_fork",
    "xy cut": "tuning_fork",
    "tuning fork xy cut": "tuning_fork",
}

#: Written forms of the crystal-pad pairs of a 4-pad part ("" = a 2-pad part or not given).
PINOUT_SYNONYMS: Final[dict[str, str]] = {
    "1 3": "1-3",
    "1 and 3": "1-3",
    "pins 1 3": "1-3",
    "pads 1 3": "1-3",
    "13": "1-3",
    "2 4": "2-4",
    "2 and 4": "2-4",
    "pins 2 4": "2-4",
    "pads 2 4": "2-4",
    "24": "2-4",
    "1 4": "1-4",
    "1 and 4": "1-4",
    "pins 1 4": "1-4",
    "pads 1 4": "1-4",
    "14": "1-4",
    "2 pad": "",
    "2 pads": "",
    "2 pin": "",
    "2 pins": "",
    "1 2": "",
}

_FOLD: Final[re.Pattern[str]] = re.compile(r"[^0-9a-z#°²]+")


def normalise_header(text: str) -> str:
    """Fold a header or choice text for comparison: lower case, µ→u, punctuation → space.

    ``"Part No."`` → ``"part no"``, ``"ESR_max"`` → ``"esr max"``, ``"Load-Cap"`` →
    ``"load cap"``. Units in brackets are NOT removed here (see ``catalog.headers``).
    """
    folded = text.replace("µ", "u").replace("μ", "u").replace("\ufeff", "").lower()
    return " ".join(_FOLD.sub(" ", folded).split())
