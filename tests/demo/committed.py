"""Read the committed demo catalogs without the project's own reader or unit parser.

An independent, deliberately small parser (regular expressions and an SI-prefix table) so
that the checks on the files do not lean on the code that wrote them or on ``catalog/``.
"""

from __future__ import annotations

import csv
import re
from pathlib import Path

import numpy as np
import pandas as pd
import yaml

DEMO_DIR = Path(__file__).resolve().parents[2] / "demo_catalog"
CSV_PATH = DEMO_DIR / "crystals_export.csv"
YAML_PATH = DEMO_DIR / "crystals.yaml"

_PREFIX = {
    "": 1.0,
    "k": 1e3,
    "M": 1e6,
    "m": 1e-3,
    "u": 1e-6,
    "µ": 1e-6,
    "n": 1e-9,
    "p": 1e-12,
    "f": 1e-15,
}
_BASE = {
    "Hz": "Hz",
    "F": "F",
    "ohm": "ohm",
    "Ω": "ohm",
    "W": "W",
    "ppm": "ppm",
    "degC": "degC",
    "°C": "degC",
    "ppm/degC^2": "ppm/degC^2",
    "ppm/°C²": "ppm/degC^2",
}
_QUANTITY = re.compile(r"^\s*(?:±|\+/-)?\s*([-+]?\d+(?:\.\d+)?)\s*(\S*?)\s*(?:max\.?)?\s*$")


def quantity(text: object, expected: str, header_unit: str = "") -> float:
    """SI value of ``text`` ("±20 ppm", "80 Ω", "16.000MHz", "12.5" with a header unit)."""
    if text is None or (isinstance(text, float) and np.isnan(text)) or str(text).strip() == "":
        return float("nan")
    if isinstance(text, int | float):
        text = str(text)
    match = _QUANTITY.match(str(text))
    if not match:
        raise ValueError(f"not a quantity: {text!r}")
    number, unit = float(match.group(1)), match.group(2) or header_unit
    for prefix, scale in _PREFIX.items():
        rest = unit[len(prefix) :] if unit.startswith(prefix) else None
        if rest is not None and _BASE.get(rest) == expected:
            return number * scale
    raise ValueError(f"{text!r} is not in {expected}")


def _row(get: dict[str, object], source: str) -> dict[str, object]:
    return {"source": source, **get}


def read_csv() -> pd.DataFrame:
    """The spreadsheet-style export as SI floats (its headers carry the units)."""
    with CSV_PATH.open(encoding="utf-8", newline="") as stream:
        rows = list(csv.DictReader(stream))
    out = []
    for r in rows:
        low, high = re.match(r"^(-?\d+) to (-?\d+) °C$", r["Operating Temperature"]).groups()  # type: ignore[union-attr]
        load = r["Load Cap (pF)"]
        out.append(
            _row(
                {
                    "mpn": r["Part Number"],
                    "maker": r["Manufacturer"],
                    "freq_hz": quantity(r["Freq"], "Hz"),
                    "series": load == "series",
                    "load_f": float("nan") if load == "series" else quantity(load, "F", "pF"),
                    "tolerance": quantity(r["Tolerance (ppm)"], "ppm", "ppm"),
                    "stability": quantity(r["Stability (ppm)"], "ppm", "ppm"),
                    "temp_min": float(low),
                    "temp_max": float(high),
                    "esr": quantity(r["ESR max (Ω)"], "ohm", "Ω"),
                    "package": r["Package"],
                    "mode": r["Mode"] or "fundamental",
                    "cut": r["Cut"],
                    "c0": quantity(r["C0 (pF)"], "F", "pF"),
                    "c1": quantity(r["C1 (fF)"], "F", "fF"),
                    "drive": quantity(r["Drive Level max (µW)"], "W", "µW"),
                    "aging": quantity(r["Aging (ppm/yr)"], "ppm", "ppm"),
                    "beta": quantity(r["Beta (ppm/°C²)"], "ppm/degC^2", "ppm/°C²"),
                    "turnover": quantity(r["Turnover (°C)"], "degC", "°C"),
                    "length": float(r["L (mm)"]),
                    "width": float(r["W (mm)"]),
                    "height": float(r["H (mm)"]),
                    "pinout": r["Pinout"],
                    "qualification": r["Qualification"],
                    "msl": r["MSL"],
                    "lifecycle": r["Lifecycle"],
                    "stock": float(r["Stock"]),
                    "price": float(r["Unit Price"]),
                },
                CSV_PATH.name,
            )
        )
    return pd.DataFrame(out)


def read_yaml() -> pd.DataFrame:
    """Our own YAML catalog as SI floats (its values carry the units)."""
    data = yaml.safe_load(YAML_PATH.read_text(encoding="utf-8"))
    out = []
    for p in data["parts"]:
        load = p.get("load_capacitance")
        out.append(
            _row(
                {
                    "mpn": p["mpn"],
                    "maker": p["maker"],
                    "freq_hz": quantity(p["frequency"], "Hz"),
                    "series": load == "series",
                    "load_f": float("nan") if load == "series" else quantity(load, "F"),
                    "tolerance": quantity(p["tolerance"], "ppm"),
                    "stability": quantity(p.get("stability"), "ppm"),
                    "temp_min": quantity(p["temp_min"], "degC"),
                    "temp_max": quantity(p["temp_max"], "degC"),
                    "esr": quantity(p["esr"], "ohm"),
                    "package": str(p["package"]),
                    "mode": p.get("mode", "fundamental"),
                    "cut": p.get("cut", ""),
                    "c0": quantity(p.get("c0"), "F"),
                    "c1": quantity(p.get("c1"), "F"),
                    "drive": quantity(p.get("drive_level"), "W"),
                    "aging": quantity(p.get("aging"), "ppm"),
                    "beta": quantity(p.get("beta"), "ppm/degC^2"),
                    "turnover": quantity(p.get("turnover"), "degC"),
                    "length": float(p["length_mm"]),
                    "width": float(p["width_mm"]),
                    "height": float(p["height_mm"]),
                    "pinout": p.get("pinout", ""),
                    "qualification": p.get("qualification", ""),
                    "msl": p.get("msl", ""),
                    "lifecycle": p.get("lifecycle", ""),
                    "stock": float(p["stock"]),
                    "price": float(p["price"]),
                },
                YAML_PATH.name,
            )
        )
    return pd.DataFrame(out)


def read_all() -> pd.DataFrame:
    """Both committed catalogs, one row per part."""
    return pd.concat([read_csv(), read_yaml()], ignore_index=True)
