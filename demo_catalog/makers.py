"""Invented crystal makers and their invented part-number schemes.

The five names are coined for this demo and the numbering schemes are our own; neither is
meant to resemble any real company or any real ordering code. Each scheme builds part
numbers for whole columns at once (string tables indexed by arrays, no loop over parts).
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass

import numpy as np
import numpy.typing as npt
import pandas as pd

from demo_catalog.distinct import ObjectArray, lookup


def serial_text(serials: npt.NDArray[np.int64], width: int) -> ObjectArray:
    """Zero-padded serial numbers as text."""
    text = pd.Series(serials).astype(str).str.zfill(width)
    return np.asarray(text.to_numpy(dtype=object), dtype=object)


_PACKAGE_SHORT = {"HC-49/US": "49U", "HC-49/SMD": "49S", "CYL2X6": "C26", "CYL3X8": "C38"}


def _package_short(code: object) -> str:
    return _PACKAGE_SHORT.get(str(code), str(code))


_RANGE_LETTERS = {(-20.0, 70.0): "S", (-40.0, 85.0): "W", (-40.0, 105.0): "X", (-40.0, 125.0): "Z"}


def _range_code(parts: pd.DataFrame) -> ObjectArray:
    low = parts["temp_min_c"].to_numpy()
    high = parts["temp_max_c"].to_numpy()
    letters = np.full(len(parts), "Q", dtype=object)
    for (range_low, range_high), letter in _RANGE_LETTERS.items():
        letters[(low == range_low) & (high == range_high)] = letter
    return letters


def _family_letter(parts: pd.DataFrame, letters: dict[str, str]) -> ObjectArray:
    fork = (parts["cut"] == "tuning_fork").to_numpy(dtype=bool)
    mode = lookup(parts["mode"], lambda k: letters[str(k)])
    return np.where(fork, letters["fork"], mode).astype(object)


def _load_code(parts: pd.DataFrame) -> ObjectArray:
    load = parts["load_capacitance_f"].to_numpy() * 1e12
    key = np.where(np.isnan(load), -1.0, np.rint(load * 10.0))
    return lookup(key, _load_letters)


def _load_letters(tenths_pf: object) -> str:
    # Load capacitance in tenths of a pF; -1 marks a series-calibrated part.
    value = float(str(tenths_pf))
    if value < 0:
        return "SR"
    return "1H" if value == 125.0 else f"{round(value / 10):02d}"


def _frequency_code(parts: pd.DataFrame) -> ObjectArray:
    def render(hz: object) -> str:
        value = float(hz)  # type: ignore[arg-type]
        if value < 1e6:
            return f"{round(value)}H"
        return f"{round(value / 1e3)}K"

    return lookup(parts["freq_hz"], render)


def _grade_letter(parts: pd.DataFrame) -> ObjectArray:
    worst = np.fmax(parts["tolerance_ppm"].to_numpy(), parts["stability_ppm"].to_numpy())

    def render(ppm: object) -> str:
        for limit, letter in ((10.0, "A"), (15.0, "B"), (20.0, "C"), (30.0, "D"), (50.0, "E")):
            if float(ppm) <= limit:  # type: ignore[arg-type]
                return letter
        return "F"

    return lookup(worst, render)


def _quellbrook(parts: pd.DataFrame, serial: npt.NDArray[np.int64]) -> ObjectArray:
    # QB + package + family letter + "-" + serial + range letter, e.g. QB2016A-0012W
    letters = {"fork": "K", "fundamental": "A", "overtone3": "T", "overtone5": "V"}
    out: ObjectArray = (
        "QB"
        + lookup(parts["package"], _package_short)
        + _family_letter(parts, letters)
        + "-"
        + serial_text(serial, 4)
        + _range_code(parts)
    )
    return out


def _tarnwell(parts: pd.DataFrame, serial: npt.NDArray[np.int64]) -> ObjectArray:
    # TW + serial + "-" + load code, e.g. TW00412-08 (SR = series, 1H = 12.5 pF)
    out: ObjectArray = "TW" + serial_text(serial, 5) + "-" + _load_code(parts)
    return out


def _vessado(parts: pd.DataFrame, serial: npt.NDArray[np.int64]) -> ObjectArray:
    # VSD + package + "." + frequency code + "." + serial, e.g. VSD2520.25000K.031
    out: ObjectArray = (
        "VSD"
        + lookup(parts["package"], _package_short)
        + "."
        + _frequency_code(parts)
        + "."
        + serial_text(serial, 3)
    )
    return out


def _oridane(parts: pd.DataFrame, serial: npt.NDArray[np.int64]) -> ObjectArray:
    # OR + serial + grade letter from the worse of tolerance and stability, e.g. OR01234C
    out: ObjectArray = "OR" + serial_text(serial, 5) + _grade_letter(parts)
    return out


def _kelvaro(parts: pd.DataFrame, serial: npt.NDArray[np.int64]) -> ObjectArray:
    # KV- + package + "-" + family letter + serial, e.g. KV-3225-F0123
    letters = {"fork": "R", "fundamental": "F", "overtone3": "T", "overtone5": "P"}
    out: ObjectArray = (
        "KV-"
        + lookup(parts["package"], _package_short)
        + "-"
        + _family_letter(parts, letters)
        + serial_text(serial, 4)
    )
    return out


@dataclass(frozen=True)
class Maker:
    """An invented maker: its display name and its part-number scheme."""

    name: str
    number: Callable[[pd.DataFrame, npt.NDArray[np.int64]], ObjectArray]


MAKERS: tuple[Maker, ...] = (
    Maker("Quellbrook", _quellbrook),
    Maker("Tarnwell", _tarnwell),
    Maker("Vessado", _vessado),
    Maker("Oridane", _oridane),
    Maker("Kelvaro", _kelvaro),
)
MAKER_NAMES: tuple[str, ...] = tuple(m.name for m in MAKERS)
_BY_NAME = {m.name: m for m in MAKERS}


def assign_part_numbers(parts: pd.DataFrame, *, first_serial: int = 1) -> pd.DataFrame:
    """Return a copy of ``parts`` with ``mpn`` filled by each row's maker scheme.

    Serial numbers run per maker in row order starting at ``first_serial``, so part
    numbers are unique within the table. An optional integer ``serial`` column overrides
    the running number where it is > 0, and an optional ``variant`` text column is
    appended (a maker's variant of one design). Unknown makers raise ValueError.
    """
    maker = parts["maker"].to_numpy(dtype=object)
    unknown = sorted(set(maker.tolist()) - set(_BY_NAME))
    if unknown:
        raise ValueError(f"no part-number scheme for maker(s) {unknown}")
    given = (
        parts["serial"].to_numpy(dtype=np.int64)
        if "serial" in parts.columns
        else np.zeros(len(parts), dtype=np.int64)
    )
    mpn = np.full(len(parts), "", dtype=object)
    for name, scheme in _BY_NAME.items():
        mask = maker == name
        if not mask.any():
            continue
        running = np.arange(first_serial, first_serial + int(mask.sum()), dtype=np.int64)
        serial = np.where(given[mask] > 0, given[mask], running)
        mpn[mask] = scheme.number(parts.loc[mask], serial)
    if "variant" in parts.columns:
        mpn = mpn + parts["variant"].to_numpy(dtype=object)
    return parts.assign(mpn=mpn)
