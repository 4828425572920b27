"""Load capacitors: IEC 60063 preferred values, tolerances, and choosing a pair.

Convention (shown on screen by the callers): the stray capacitance is across the crystal
(traces and pads); the pin capacitance is per pin, from each crystal pin to ground, and
adds to the external capacitor on that pin.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Literal

import numpy as np
import numpy.typing as npt

from picker.physics._arrays import ArrayLike, FloatArray, to_bool, to_float

Series = Literal["E6", "E12", "E24"]

# IEC 60063:2015, Table 1 — the significands of one decade.
_E_SERIES_SIGNIFICANDS: dict[str, tuple[float, ...]] = {
    "E6": (1.0, 1.5, 2.2, 3.3, 4.7, 6.8),
    "E12": (1.0, 1.2, 1.5, 1.8, 2.2, 2.7, 3.3, 3.9, 4.7, 5.6, 6.8, 8.2),
    "E24": (
        1.0, 1.1, 1.2, 1.3, 1.5, 1.6, 1.8, 2.0, 2.2, 2.4, 2.7, 3.0,
        3.3, 3.6, 3.9, 4.3, 4.7, 5.1, 5.6, 6.2, 6.8, 7.5, 8.2, 9.1,
    ),
}  # fmt: skip

#: Default range of the value tables [F]: 1 pF to 100 pF, the span used for crystal caps.
SMALLEST_VALUE_F = 1e-12
LARGEST_VALUE_F = 100e-12

#: Below this value, small ceramic capacitors are specified with an absolute tolerance
#: (±0.1/0.25/0.5 pF classes) instead of a percentage (common practice).
ABSOLUTE_TOLERANCE_BELOW_F = 10e-12
DEFAULT_ABSOLUTE_TOLERANCE_F = 0.25e-12


def series_significands(series: Series) -> tuple[float, ...]:
    """Significands of one decade of an IEC 60063 series.

    Parameters
    ----------
    series : "E6", "E12" or "E24"

    Returns
    -------
    significands : e.g. (1.0, 1.2, 1.5, ...) for E12 [1]

    Raises
    ------
    ValueError
        for an unknown series name
    """
    try:
        return _E_SERIES_SIGNIFICANDS[series.upper()]
    except KeyError:
        known = ", ".join(_E_SERIES_SIGNIFICANDS)
        raise ValueError(f"unknown capacitor series {series!r}; expected one of {known}") from None


def standard_values(
    series: Series = "E12",
    low_f: float = SMALLEST_VALUE_F,
    high_f: float = LARGEST_VALUE_F,
) -> FloatArray:
    """All standard values of an IEC 60063 series within a range, ascending.

    Parameters
    ----------
    series : "E6", "E12" or "E24"
    low_f, high_f : inclusive range [F]

    Returns
    -------
    values : standard capacitances [F]

    Notes
    -----
    Values are significand × 10^k pF (IEC 60063:2015, Table 1), with no binary noise:
    22 pF is the float ``22e-12``.
    """
    significands = np.asarray(series_significands(series))
    decades = np.arange(-1, 4)
    values_pf = np.round((significands[None, :] * 10.0 ** decades[:, None]).ravel(), 6)
    # through decimal text, so 22 pF is the double nearest to 22e-12, as a user would type it
    values = np.asarray([float(f"{v:.6g}e-12") for v in np.unique(values_pf)])
    keep = (values >= low_f * (1 - 1e-9)) & (values <= high_f * (1 + 1e-9))
    return np.asarray(values[keep], dtype=np.float64)


def capacitor_tolerance_f(
    value_f: ArrayLike,
    tolerance_fraction: ArrayLike,
    absolute_tolerance_f: ArrayLike = DEFAULT_ABSOLUTE_TOLERANCE_F,
) -> FloatArray:
    """± tolerance of a ceramic capacitor.

    Parameters
    ----------
    value_f : nominal capacitance [F]
    tolerance_fraction : relative tolerance for values of 10 pF and above, e.g. 0.05 [1]
    absolute_tolerance_f : absolute tolerance below 10 pF [F] (±0.1, 0.25 or 0.5 pF)

    Returns
    -------
    tolerance : ± deviation [F]

    Notes
    -----
    Small C0G capacitors carry absolute tolerance codes (B ±0.1 pF, C ±0.25 pF,
    D ±0.5 pF) below about 10 pF, percentages above (common practice; IEC 60062 codes).
    """
    value = np.asarray(value_f, dtype=np.float64)
    relative = np.abs(value) * np.asarray(tolerance_fraction, dtype=np.float64)
    absolute = np.asarray(absolute_tolerance_f, dtype=np.float64)
    result = np.where(value < ABSOLUTE_TOLERANCE_BELOW_F, absolute, relative)
    result = np.asarray(result, dtype=np.float64)
    return to_float(result)


def ideal_external_capacitance(cl: ArrayLike, stray: ArrayLike, c_pin: ArrayLike) -> FloatArray:
    """External capacitor value (each of two equal caps) that makes the board CL exact.

    Parameters
    ----------
    cl : load capacitance the crystal is specified at [F]
    stray : stray capacitance across the crystal [F]
    c_pin : pin capacitance per pin to ground [F]

    Returns
    -------
    c_ext : ideal value of each external capacitor [F]; ≤ 0 when not realisable

    Notes
    -----
    From CL = (C + C_pin)/2 + C_stray for two equal caps: C = 2·(CL − C_stray) − C_pin.
    """
    result = 2.0 * (np.asarray(cl, dtype=np.float64) - np.asarray(stray, dtype=np.float64))
    result = np.asarray(result - np.asarray(c_pin, dtype=np.float64))
    return to_float(result)


@dataclass(frozen=True)
class CapacitorPair:
    """A chosen pair of load capacitors, per part.

    Attributes
    ----------
    cap_a_f, cap_b_f : external capacitor values [F] (cap_a ≤ cap_b)
    board_cl_f : load capacitance the board then presents [F]
    ideal_f : ideal equal-cap value from :func:`ideal_external_capacitance` [F]
    realisable : False where the ideal value is ≤ 0, below the smallest or above the largest
        value of the table; the pair is then the nearest table value, which misses the
        target
    """

    cap_a_f: FloatArray
    cap_b_f: FloatArray
    board_cl_f: FloatArray
    ideal_f: FloatArray
    realisable: npt.NDArray[np.bool_]


def _board_cl(
    cap_a: FloatArray, cap_b: FloatArray, stray: FloatArray, c_pin: FloatArray
) -> FloatArray:
    total_a = cap_a + c_pin
    total_b = cap_b + c_pin
    return np.asarray(total_a * total_b / (total_a + total_b) + stray)


def choose_equal_pair(
    cl_target: ArrayLike,
    stray: ArrayLike,
    c_pin: ArrayLike,
    series: Series = "E12",
    values_f: ArrayLike | None = None,
) -> CapacitorPair:
    """Nearest equal pair of standard capacitors for a target load capacitance.

    Parameters
    ----------
    cl_target : load capacitance the crystal is specified at [F]
    stray : stray capacitance across the crystal [F]
    c_pin : pin capacitance per pin to ground [F]
    series : IEC 60063 series used when ``values_f`` is not given
    values_f : explicit table of available values [F], ascending (optional)

    Returns
    -------
    CapacitorPair
        with cap_a = cap_b = the standard value nearest to the ideal one

    Notes
    -----
    CL is linear in the equal cap value (CL = (C + C_pin)/2 + C_stray), so the nearest
    value is also the one with the nearest board CL.

    Examples
    --------
    CL = 12 pF, 2.5 pF stray, 1.5 pF per pin: ideal 17.5 pF, E12 gives 18 pF:

    >>> pair = choose_equal_pair(12e-12, 2.5e-12, 1.5e-12)
    >>> float(pair.cap_a_f), round(float(pair.board_cl_f) * 1e12, 2)
    (1.8e-11, 12.25)
    """
    table = standard_values(series) if values_f is None else np.asarray(values_f, dtype=np.float64)
    target, stray_a, pin_a = np.broadcast_arrays(
        np.asarray(cl_target, dtype=np.float64),
        np.asarray(stray, dtype=np.float64),
        np.asarray(c_pin, dtype=np.float64),
    )
    ideal = np.asarray(ideal_external_capacitance(target, stray_a, pin_a))
    index = np.clip(np.searchsorted(table, ideal), 1, len(table) - 1)
    below, above = table[index - 1], table[index]
    safe_ideal = np.where(np.isfinite(ideal), ideal, table[0])
    nearest = np.where(np.abs(safe_ideal - below) <= np.abs(above - safe_ideal), below, above)
    nearest = np.where(np.isfinite(ideal), nearest, np.nan)
    board = _board_cl(nearest, nearest, stray_a, pin_a)
    realisable = (
        (ideal > 0.0) & (ideal >= table[0] * (1 - 1e-9)) & (ideal <= table[-1] * (1 + 1e-9))
    )
    return CapacitorPair(
        to_float(nearest), to_float(nearest), to_float(board), to_float(ideal), to_bool(realisable)
    )


def choose_unequal_pair(
    cl_target: ArrayLike,
    stray: ArrayLike,
    c_pin: ArrayLike,
    series: Series = "E12",
    values_f: ArrayLike | None = None,
    max_ratio: float = 2.0,
) -> CapacitorPair:
    """Best pair of standard capacitors, equal or not, for a target load capacitance.

    Parameters
    ----------
    cl_target : load capacitance the crystal is specified at [F]
    stray : stray capacitance across the crystal [F]
    c_pin : pin capacitance per pin to ground [F]
    series : IEC 60063 series used when ``values_f`` is not given
    values_f : explicit table of available values [F], ascending (optional)
    max_ratio : largest allowed cap_b/cap_a [1]. Common practice keeps the pair close so
        the gain split of the Pierce stage stays near the equal-cap design point.

    Returns
    -------
    CapacitorPair
        the pair whose board CL is closest to the target; ties go to the more equal pair

    Notes
    -----
    For each table value as cap_a, the exact partner is
    C_b = 1/(1/(CL − C_stray) − 1/(C_a + C_pin)) − C_pin; the two table values around it
    are candidates. That is 2·N candidates instead of N², computed once per distinct
    (target, stray, pin) and spread back to the parts (vectorised).
    """
    table = standard_values(series) if values_f is None else np.asarray(values_f, dtype=np.float64)
    target, stray_a, pin_a = np.broadcast_arrays(
        np.asarray(cl_target, dtype=np.float64),
        np.asarray(stray, dtype=np.float64),
        np.asarray(c_pin, dtype=np.float64),
    )
    shape = target.shape
    # solve once per distinct (target, stray, pin): catalogs repeat a few CL values, and the
    # candidate grid per row is 2·N wide
    rows_in = np.stack([target.ravel(), stray_a.ravel(), pin_a.ravel()], axis=1)
    rows_in = np.where(np.isfinite(rows_in), rows_in, -1.0)  # NaN rows are masked below
    if rows_in.size and np.all(rows_in[:, 1:] == rows_in[0, 1:]):
        # the usual case, one board for all parts: a 1-D unique is much faster
        targets, back = np.unique(rows_in[:, 0], return_inverse=True)
        distinct = np.column_stack(
            [targets, np.full(targets.shape, rows_in[0, 1]), np.full(targets.shape, rows_in[0, 2])]
        )
    else:
        distinct, back = np.unique(rows_in, axis=0, return_inverse=True)
    back = np.asarray(back).reshape(-1)
    t, s, p = distinct[:, 0:1], distinct[:, 1:2], distinct[:, 2:3]
    cap_a = table[None, :]
    with np.errstate(divide="ignore", invalid="ignore"):
        series_needed = t - s
        partner = 1.0 / (1.0 / series_needed - 1.0 / (cap_a + p)) - p
    partner = np.where(np.isfinite(partner) & (partner > 0.0), partner, table[-1])
    index = np.clip(np.searchsorted(table, partner), 1, len(table) - 1)
    candidates_b = np.stack([table[index - 1], table[index]], axis=-1)  # (rows, N, 2)
    candidates_a = np.broadcast_to(cap_a[..., None], candidates_b.shape)
    small = np.minimum(candidates_a, candidates_b).reshape(len(distinct), 2 * len(table))
    large = np.maximum(candidates_a, candidates_b).reshape(len(distinct), 2 * len(table))
    with np.errstate(divide="ignore", invalid="ignore"):
        board = _board_cl(small, large, s, p)
        error = np.abs(board - t)
    ratio = large / small
    error = np.where(ratio <= max_ratio * (1 + 1e-9), error, np.inf)
    # ties (within 1 aF) go to the more equal pair
    score = np.round(error / 1e-18) + (ratio - 1.0) / (max_ratio + 1.0)
    best = np.argmin(score, axis=1) if len(distinct) else np.zeros(0, dtype=np.int64)
    rows = np.arange(len(distinct))
    best_a = small[rows, best][back].reshape(shape)
    best_b = large[rows, best][back].reshape(shape)
    best_board = board[rows, best][back].reshape(shape)
    ideal = np.asarray(ideal_external_capacitance(target, stray_a, pin_a))
    bad = ~np.isfinite(ideal)
    best_a = np.where(bad, np.nan, best_a)
    best_b = np.where(bad, np.nan, best_b)
    best_board = np.where(bad, np.nan, best_board)
    realisable = (
        (ideal > 0.0) & (ideal >= table[0] * (1 - 1e-9)) & (ideal <= table[-1] * (1 + 1e-9))
    )
    return CapacitorPair(
        to_float(best_a),
        to_float(best_b),
        to_float(best_board),
        to_float(ideal),
        to_bool(realisable),
    )
