"""Numeric part table -> catalog text in our field vocabulary (DESIGN.md §3).

The text carries units the way a catalog would write them ("16 MHz", "8 pF", "40 ohm",
"100 uW", "-40 degC"); a missing figure is left blank (NaN in the frame). Each column is
rendered through a table of its distinct values, so a million rows take well under a
second per column.
"""

from __future__ import annotations

from collections.abc import Callable

import numpy as np
import pandas as pd

from demo_catalog.distinct import factorize

# Field order of the text frame (DESIGN.md §3 names).
FIELDS: tuple[str, ...] = (
    "mpn",
    "maker",
    "frequency",
    "mode",
    "cut",
    "package",
    "load_capacitance",
    "tolerance",
    "stability",
    "temp_min",
    "temp_max",
    "esr",
    "c0",
    "c1",
    "drive_level",
    "aging",
    "beta",
    "turnover",
    "length_mm",
    "width_mm",
    "height_mm",
    "pinout",
    "qualification",
    "msl",
    "lifecycle",
    "stock",
    "price",
)


def number_text(value: float, decimals: int = 6) -> str:
    """Shortest fixed-point text for ``value`` at most ``decimals`` places ("12.5", "8", "-40")."""
    text = f"{value:.{decimals}f}"
    if "." in text:
        text = text.rstrip("0").rstrip(".")
    return "0" if text in ("-0", "") else text


def frequency_text(hz: float) -> str:
    """ "32.768 kHz", "16 MHz", "106.25 MHz" from hertz."""
    if hz < 1e6:
        # Watch-crystal catalogs keep three decimals, so 32.000 kHz reads unlike 32.768 kHz.
        return f"{hz / 1e3:.3f} kHz"
    return f"{number_text(hz / 1e6, 6)} MHz"


def _frequency_text(hz: object) -> str:
    return frequency_text(float(hz))  # type: ignore[arg-type]


def _scaled(scale: float, unit: str, decimals: int) -> Callable[[object], str]:
    def render(value: object) -> str:
        number = number_text(float(value) * scale, decimals)  # type: ignore[arg-type]
        return f"{number} {unit}" if unit else number

    return render


def _load_text(pf: object) -> str:
    value = float(pf)  # type: ignore[arg-type]
    return "series" if value < 0 else f"{number_text(value, 3)} pF"


def _resistance_text(ohm: object) -> str:
    value = float(ohm)  # type: ignore[arg-type]
    if value >= 1e3:
        return f"{number_text(value / 1e3, 3)} kohm"
    return f"{number_text(value, 2)} ohm"


def text_column(values: object, render: Callable[[object], str]) -> pd.Categorical:
    """Render each distinct value of a column once; the result is a categorical of text.

    Missing values (NaN/None) stay missing. Categoricals keep a million-row text column
    cheap to build, store and write.
    """
    codes, uniques = factorize(values)  # type: ignore[arg-type]
    rendered = [render(v) for v in uniques]
    # Two floats a rounding step apart may render alike: merge them.
    merged_codes, categories = pd.factorize(np.array(rendered, dtype=object))
    merged = np.append(np.asarray(merged_codes, dtype=np.int64), -1)
    return pd.Categorical.from_codes(merged[codes], categories=pd.Index(categories, dtype=object))


def _text(values: object) -> pd.Categorical:
    """A text column as categorical; "" counts as missing."""
    column = text_column(values, str)
    if "" in column.categories:
        column = column.remove_categories([""])
    return column


def to_field_text(parts: pd.DataFrame) -> pd.DataFrame:
    """Render a numeric part table (SI floats, INTERFACES.md columns) as catalog text.

    Parameters
    ----------
    parts : pandas.DataFrame
        Numeric part table as built by :func:`demo_catalog.draw.draw_part_table` with
        ``mpn`` filled.

    Returns
    -------
    pandas.DataFrame
        One text column per field of :data:`FIELDS`; missing figures are NaN.
    """

    def col(name: str) -> pd.Series:
        return parts[name]

    load_pf = parts["load_capacitance_f"].to_numpy(dtype=np.float64) * 1e12
    # Series-calibrated parts get a sentinel value that renders as the word.
    load_pf = np.where(parts["series_calibrated"].to_numpy(dtype=bool), -1.0, load_pf)
    load = text_column(load_pf, _load_text)
    columns: dict[str, object] = {
        "mpn": parts["mpn"].astype(str).to_numpy(dtype=object),
        "maker": _text(parts["maker"]),
        "frequency": text_column(col("freq_hz"), _frequency_text),
        "mode": _text(parts["mode"]),
        "cut": _text(parts["cut"]),
        "package": _text(parts["package"]),
        "load_capacitance": load,
        "tolerance": text_column(col("tolerance_ppm"), _scaled(1.0, "ppm", 3)),
        "stability": text_column(col("stability_ppm"), _scaled(1.0, "ppm", 3)),
        "temp_min": text_column(col("temp_min_c"), _scaled(1.0, "degC", 2)),
        "temp_max": text_column(col("temp_max_c"), _scaled(1.0, "degC", 2)),
        "esr": text_column(col("esr_ohm"), _resistance_text),
        "c0": text_column(col("c0_f"), _scaled(1e12, "pF", 3)),
        "c1": text_column(col("c1_f"), _scaled(1e15, "fF", 3)),
        "drive_level": text_column(col("drive_level_w"), _scaled(1e6, "uW", 3)),
        "aging": text_column(col("aging_ppm"), _scaled(1.0, "ppm", 3)),
        "beta": text_column(col("beta_ppm_per_c2"), _scaled(1.0, "ppm/degC^2", 4)),
        "turnover": text_column(col("turnover_c"), _scaled(1.0, "degC", 2)),
        "length_mm": text_column(col("length_mm"), _scaled(1.0, "", 2)),
        "width_mm": text_column(col("width_mm"), _scaled(1.0, "", 2)),
        "height_mm": text_column(col("height_mm"), _scaled(1.0, "", 2)),
        "pinout": _text(parts["pinout"]),
        "qualification": _text(parts["qualification"]),
        "msl": _text(parts["msl"]),
        "lifecycle": _text(parts["lifecycle"]),
        "stock": text_column(col("stock"), _scaled(1.0, "", 0)),
        "price": text_column(col("price"), _scaled(1.0, "", 3)),
    }
    return pd.DataFrame({name: columns[name] for name in FIELDS}, index=parts.index)
