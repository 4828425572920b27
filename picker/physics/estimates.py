"""Typical crystal parameters for parts whose catalog row leaves them out.

Every value here is a common-practice estimate, from memory, for a typical part of that
package and cut — not a data-sheet figure. Callers must flag each figure computed from an
estimate (the masks returned below say which rows were estimated).
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass
from typing import TypeVar

import numpy as np
import numpy.typing as npt

from picker.physics._arrays import ArrayLike, BoolArray, FloatArray, to_float

T = TypeVar("T")

#: Below this frequency a part without a stated cut is taken to be a tuning fork.
TUNING_FORK_BELOW_HZ = 1e6

# AT-cut fundamental, by package: (C1 [F], C0 [F]). Common practice, estimate (from
# memory): larger blanks carry larger electrodes, hence larger C1 and C0; C0/C1 ≈ 250–500.
_AT_FUNDAMENTAL: dict[str, tuple[float, float]] = {
    "HC-49/U": (20e-15, 5.5e-12),
    "HC-49/US": (18e-15, 5.0e-12),
    "HC-49/SMD": (18e-15, 5.0e-12),
    "7050": (12e-15, 3.5e-12),
    "6035": (10e-15, 3.0e-12),
    "5032": (8e-15, 2.5e-12),
    "3225": (5e-15, 2.0e-12),
    "2520": (3.5e-15, 1.5e-12),
    "2016": (3e-15, 1.3e-12),
    "1612": (2.2e-15, 1.0e-12),
    "1210": (1.8e-15, 0.9e-12),
}
# An unknown package is treated as a mid-size SMD part.
_AT_DEFAULT = (5e-15, 2.0e-12)

# Tuning forks, by package: (C1 [F], C0 [F]). Common practice, estimate (from memory):
# C0 about 1 pF, C1 about 2–4 fF.
_TUNING_FORK: dict[str, tuple[float, float]] = {
    "3215": (3.0e-15, 1.0e-12),
    "2012": (2.5e-15, 0.9e-12),
    "1610": (2.2e-15, 0.8e-12),
    "1210": (2.0e-15, 0.8e-12),
    "2X6": (3.5e-15, 1.5e-12),
    "3X8": (4.0e-15, 1.8e-12),
}
_TUNING_FORK_DEFAULT = (3.0e-15, 1.0e-12)

# Typical largest drive level (from memory, for estimates only).
_TUNING_FORK_DRIVE_W = 0.5e-6
_AT_DRIVE_W: dict[str, float] = {
    "HC-49/U": 500e-6,
    "HC-49/US": 500e-6,
    "HC-49/SMD": 500e-6,
    "7050": 300e-6,
    "6035": 300e-6,
    "5032": 300e-6,
    "3225": 200e-6,
    "2520": 200e-6,
    "2016": 100e-6,
    "1612": 100e-6,
    "1210": 100e-6,
}
_AT_DRIVE_DEFAULT_W = 100e-6


def _is_missing(value: object) -> bool:
    return value is None or (isinstance(value, float) and np.isnan(value))


def _encode(
    values: ArrayLike, transform: Callable[[object], T]
) -> tuple[npt.NDArray[np.int64], list[T]]:
    """Integer codes per element and the transformed distinct values (one call per value).

    Catalog columns repeat a handful of package, mode and cut names over many rows, so the
    per-value work runs once per distinct value and the rest is integer indexing.
    """
    raw = np.asarray(values, dtype=object)
    memo: dict[object, int] = {}
    uniques: list[T] = []

    def code(value: object) -> int:
        found = memo.get(value)
        if found is None:
            found = memo[value] = len(uniques)
            uniques.append(transform(value))
        return found

    codes = np.fromiter((code(v) for v in raw.ravel()), dtype=np.int64, count=raw.size)
    return codes.reshape(raw.shape), uniques


def _normalise_one(value: object) -> str:
    return "" if _is_missing(value) else str(value).upper().replace(" ", "")


def _text_one(value: object) -> str:
    return "" if _is_missing(value) else str(value)


def _order_one(value: object) -> int:
    return {"overtone3": 3, "overtone5": 5, "overtone7": 7}.get(str(value).strip().lower(), 1)


def normalise_package(package: ArrayLike) -> npt.NDArray[np.object_]:
    """Package names as the catalog stores them: upper case, spaces removed.

    Parameters
    ----------
    package : package names, e.g. "hc-49/us", "3225" (str or array of str)

    Returns
    -------
    names : object array of normalised names ("" for missing values)
    """
    codes, uniques = _encode(package, _normalise_one)
    return _take_objects(uniques, codes)


def _take_objects(uniques: list[str], codes: npt.NDArray[np.int64]) -> npt.NDArray[np.object_]:
    table = np.empty(len(uniques), dtype=object)
    table[:] = uniques
    return np.asarray(table[codes], dtype=object)


def overtone_order(mode: ArrayLike) -> npt.NDArray[np.int64]:
    """Overtone order n from the catalog's mode field.

    Parameters
    ----------
    mode : "fundamental", "overtone3", "overtone5" (others and "" count as fundamental)

    Returns
    -------
    n : 1, 3 or 5 [1]
    """
    codes, uniques = _encode(mode, _order_one)
    return np.asarray(np.asarray(uniques, dtype=np.int64)[codes], dtype=np.int64)


def infer_cut(freq_hz: ArrayLike, cut: ArrayLike) -> tuple[npt.NDArray[np.object_], BoolArray]:
    """The cut of each part, inferred from frequency where the catalog leaves it out.

    Parameters
    ----------
    freq_hz : nominal frequency [Hz]
    cut : the catalog's cut ("AT", "tuning_fork", "SC", ...; "" when missing)

    Returns
    -------
    cut : object array of cuts
    inferred : True where the cut was inferred (below 1 MHz: "tuning_fork", else "AT")

    Notes
    -----
    Quartz below 1 MHz is in practice a flexural tuning fork (32.768 kHz and relatives);
    above, a thickness-shear AT-cut (common practice).
    """
    codes, uniques = _encode(cut, _text_one)
    freq, codes = np.broadcast_arrays(np.asarray(freq_hz, dtype=np.float64), codes)
    given = _take_objects(uniques, codes)
    missing = np.asarray([u == "" for u in uniques], dtype=bool)[codes]
    fork = freq < TUNING_FORK_BELOW_HZ
    guess = _take_objects(["AT", "tuning_fork"], fork.astype(np.int64))
    result = np.where(missing, guess, given)
    return np.asarray(result, dtype=object), missing


@dataclass(frozen=True)
class MotionalEstimate:
    """C0 and C1 per part, with masks saying which rows were estimated.

    Attributes
    ----------
    c0_f : shunt capacitance [F]
    c1_f : motional capacitance [F]
    c0_estimated : True where c0_f is a typical value, not the catalog's
    c1_estimated : True where c1_f is a typical value (not the catalog's and not derived
        exactly from the catalog's L1)
    cut : the cut used (the catalog's, or inferred)
    cut_inferred : True where the cut was inferred from the frequency
    """

    c0_f: FloatArray
    c1_f: FloatArray
    c0_estimated: BoolArray
    c1_estimated: BoolArray
    cut: npt.NDArray[np.object_]
    cut_inferred: BoolArray

    @property
    def estimated(self) -> BoolArray:
        """True where either capacitance was estimated."""
        return np.asarray(self.c0_estimated | self.c1_estimated)


def estimate_motional_capacitances(
    freq_hz: ArrayLike,
    package: ArrayLike,
    mode: ArrayLike = "fundamental",
    cut: ArrayLike = "",
    c0_f: ArrayLike = np.nan,
    c1_f: ArrayLike = np.nan,
    l1_h: ArrayLike = np.nan,
) -> MotionalEstimate:
    """Fill in missing C0 and C1 with typical values for the package, cut and mode.

    Parameters
    ----------
    freq_hz : nominal frequency [Hz]
    package : normalised package names (see :func:`normalise_package`)
    mode : "fundamental", "overtone3", "overtone5"
    cut : the catalog's cut, "" when missing (inferred by :func:`infer_cut`)
    c0_f : catalog shunt capacitance [F], NaN when missing
    c1_f : catalog motional capacitance [F], NaN when missing
    l1_h : catalog motional inductance [H], NaN when missing; with C1 missing it gives
        C1 = 1/((2π·f)²·L1) exactly (not an estimate)

    Returns
    -------
    MotionalEstimate

    Notes
    -----
    Common practice, estimate (from memory): AT-cut fundamentals a few fF of C1 (larger
    packages larger), overtones C1/n² of the same blank (C1 falls as the square of the
    overtone order n while C0 stays), tuning forks C0 ≈ 1 pF and C1 ≈ 2–4 fF.
    """
    # encode the name columns before broadcasting, so a scalar mode or cut costs one lookup
    package_codes, packages = _encode(package, _normalise_one)
    mode_codes, orders = _encode(mode, _order_one)
    at_table = np.asarray(
        [_AT_FUNDAMENTAL.get(name, _AT_DEFAULT) for name in packages], dtype=np.float64
    ).reshape(-1, 2)
    fork_table = np.asarray(
        [_TUNING_FORK.get(name, _TUNING_FORK_DEFAULT) for name in packages], dtype=np.float64
    ).reshape(-1, 2)
    freq, package_i, mode_i, c0_a, c1_a, l1_a = np.broadcast_arrays(
        np.asarray(freq_hz, dtype=np.float64),
        package_codes,
        mode_codes,
        np.asarray(c0_f, dtype=np.float64),
        np.asarray(c1_f, dtype=np.float64),
        np.asarray(l1_h, dtype=np.float64),
    )
    cut_used, cut_inferred = infer_cut(freq, cut)
    fork = cut_used == "tuning_fork"
    n = np.asarray(orders, dtype=np.float64)[mode_i]
    typical_c1 = np.where(fork, fork_table[package_i, 0], at_table[package_i, 0] / n**2)
    typical_c0 = np.where(fork, fork_table[package_i, 1], at_table[package_i, 1])
    with np.errstate(divide="ignore", invalid="ignore"):
        from_l1 = 1.0 / ((2.0 * np.pi * freq) ** 2 * l1_a)
    has_c1 = np.isfinite(c1_a) & (c1_a > 0.0)
    has_l1 = np.isfinite(from_l1) & (from_l1 > 0.0)
    has_c0 = np.isfinite(c0_a) & (c0_a > 0.0)
    c1_out = np.where(has_c1, c1_a, np.where(has_l1, from_l1, typical_c1))
    c0_out = np.where(has_c0, c0_a, typical_c0)
    return MotionalEstimate(
        c0_f=np.asarray(c0_out, dtype=np.float64),
        c1_f=np.asarray(c1_out, dtype=np.float64),
        c0_estimated=np.asarray(~has_c0),
        c1_estimated=np.asarray(~has_c1 & ~has_l1),
        cut=np.asarray(cut_used, dtype=object),
        cut_inferred=np.asarray(cut_inferred, dtype=bool),
    )


def typical_max_drive_level_w(package: ArrayLike, cut: ArrayLike) -> FloatArray:
    """Typical largest drive level for a part whose catalog row leaves it out.

    Parameters
    ----------
    package : normalised package names
    cut : cut per part ("tuning_fork" or other)

    Returns
    -------
    p_max : typical maximum drive level [W]

    Notes
    -----
    From memory, for estimates only: tuning forks 0.5–1 µW (the lower end is used); AT-cut
    SMD parts 100–300 µW, smaller packages lower; HC-49 types higher (common practice).
    """
    package_codes, ratings = _encode(
        package, lambda name: _AT_DRIVE_W.get(_normalise_one(name), _AT_DRIVE_DEFAULT_W)
    )
    cut_codes, is_fork = _encode(cut, lambda c: str(c) == "tuning_fork")
    package_i, cut_i = np.broadcast_arrays(package_codes, cut_codes)
    at = np.asarray(ratings, dtype=np.float64)[package_i]
    fork = np.asarray(is_fork, dtype=bool)[cut_i]
    result = np.asarray(np.where(fork, _TUNING_FORK_DRIVE_W, at), dtype=np.float64)
    return to_float(result)
