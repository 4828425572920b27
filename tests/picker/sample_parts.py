"""Small hand-made part tables and briefs for the analysis, rank and alternates tests.

The parts are invented (no real makers or part numbers); every figure is chosen so the
expected results can be worked out by hand from the published formulas in the tests.
"""

from __future__ import annotations

from collections.abc import Mapping
from typing import Any

import numpy as np
import pandas as pd

from picker.brief import Brief, parse_brief

CATEGORICAL = (
    "maker",
    "package",
    "mode",
    "cut",
    "lifecycle",
    "qualification",
    "pinout",
    "msl",
    "source_path",
)

BASE_PART: dict[str, Any] = {
    "maker": "Testco",
    "freq_hz": 16e6,
    "load_capacitance_f": 8e-12,
    "series_calibrated": False,
    "tolerance_ppm": 10.0,
    "stability_ppm": 10.0,
    "temp_min_c": -40.0,
    "temp_max_c": 85.0,
    "esr_ohm": 60.0,
    "package": "3225",
    "mode": "fundamental",
    "cut": "AT",
    "beta_ppm_per_c2": np.nan,
    "turnover_c": np.nan,
    "c0_f": 2e-12,
    "c1_f": 5e-15,
    "l1_h": np.nan,
    "drive_level_w": 200e-6,
    "aging_ppm": 2.0,
    "length_mm": 3.2,
    "width_mm": 2.5,
    "height_mm": 0.8,
    "price": 0.30,
    "stock": 5000.0,
    "lifecycle": "active",
    "qualification": "",
    "pinout": "1-3",
    "msl": "1",
    "source_path": "test.csv",
}


def part(mpn: str, **changes: Any) -> dict[str, Any]:
    """One part-table row: the base part with ``changes``."""
    row = {"mpn": mpn, **BASE_PART, **changes}
    if changes.get("series_calibrated"):
        row["load_capacitance_f"] = np.nan
    return row


def table(rows: list[dict[str, Any]]) -> pd.DataFrame:
    """A part table in the INTERFACES.md schema (categoricals, source lines)."""
    frame = pd.DataFrame(rows)
    frame["source_line"] = np.arange(2, len(frame) + 2, dtype=np.int64)
    for name in CATEGORICAL:
        frame[name] = frame[name].astype("category")
    return frame


BASE_BRIEF: dict[str, Any] = {
    "name": "test circuit",
    "frequency": "16 MHz",
    "budget": "100 ppm",
    "temperature": ["-40 degC", "85 degC"],
    "lifetime": "10 year",
    "amplifier": {"gm": "10 mA/V", "pin_capacitance": "1 pF", "swing": "1 V"},
    "board": {
        "stray_capacitance": "2 pF",
        "stray_uncertainty": "0.5 pF",
        "cap_series": "E12",
        "cap_tolerance": "5 %",
    },
    "limits": {"min_margin": 5},
}


def brief(**sections: Any) -> Brief:
    """The base brief with top-level keys or whole sections replaced/merged."""
    data: dict[str, Any] = {
        k: (dict(v) if isinstance(v, Mapping) else v) for k, v in BASE_BRIEF.items()
    }
    for key, value in sections.items():
        if isinstance(value, Mapping) and isinstance(data.get(key), dict) and key != "amplifier":
            data[key] = {**data[key], **value}
        else:
            data[key] = value
    return parse_brief(data, source="<test>")
