"""Figures that firmware must declare for a clock, from its worst-case frequency error.

A Bluetooth LE link layer tells its peer how accurate its sleep clock is (the SCA field),
and an RTC's drift is promised to the user in seconds per day or minutes per month. Both
follow from the worst-case total error of the chosen crystal on the real board, over the
whole temperature range and life (picker/physics/budget.py gives that total).

Pure functions: scalars in give floats out, arrays broadcast element by element.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Final

import numpy as np
import numpy.typing as npt

__all__ = [
    "SCA_CLAUSE",
    "SLEEP_CLOCK_ACCURACY_LEVELS_PPM",
    "DeclaredFigures",
    "declared_figures",
    "describe_declared",
    "drift_minutes_per_month",
    "drift_seconds_per_day",
    "sleep_clock_accuracy_code",
    "sleep_clock_accuracy_ppm",
]

FloatOrArray = float | npt.NDArray[np.float64]

SLEEP_CLOCK_ACCURACY_LEVELS_PPM: Final[tuple[float, ...]] = (
    20.0,
    30.0,
    50.0,
    75.0,
    100.0,
    150.0,
    250.0,
    500.0,
)
"""Upper ends of the sleep clock accuracy ranges a Bluetooth LE device may declare [ppm].

Bluetooth Core Specification, Vol 6 Part B §2.3.3.1, the SCA field of the CONNECT_IND
(CONNECT_REQ before v5.0) PDU: codes 7 … 0 stand for 0–20, 21–30, 31–50, 51–75, 76–100,
101–150, 151–250 and 251–500 ppm (table recalled from memory; its number differs
between specification versions).
"""

SCA_CLAUSE: Final[str] = (
    "Bluetooth Core Specification Vol 6 Part B §2.3.3.1 (SCA field of CONNECT_IND)"
)

SECONDS_PER_DAY: Final[float] = 86400.0
DAYS_PER_MONTH: Final[float] = 30.0
"""A month is taken as 30 days, as in the ±1 min/month RTC preset."""

# Rounding before comparing with the table: a total such as 50.000000000001 ppm from
# floating-point sums is 50 ppm, not a reason to declare 75 ppm.
_COMPARE_DECIMALS: Final[int] = 6


def _result(array: npt.NDArray[np.float64]) -> FloatOrArray:
    return float(array) if array.ndim == 0 else array


def sleep_clock_accuracy_ppm(total_ppm_worst: npt.ArrayLike) -> FloatOrArray:
    """Sleep clock accuracy to declare: the worst-case error rounded UP to an SCA level [ppm].

    Parameters
    ----------
    total_ppm_worst : worst-case total frequency error, all causes, whole life [ppm]
        (the sign is ignored).

    Returns
    -------
    The smallest level of :data:`SLEEP_CLOCK_ACCURACY_LEVELS_PPM` that is at least the
    error; NaN when the error exceeds 500 ppm (the largest level allowed) or is NaN.

    Examples
    --------
    >>> sleep_clock_accuracy_ppm(43.2)
    50.0
    """
    error = np.round(np.abs(np.asarray(total_ppm_worst, dtype=np.float64)), _COMPARE_DECIMALS)
    levels = np.asarray(SLEEP_CLOCK_ACCURACY_LEVELS_PPM)
    index = np.searchsorted(levels, np.nan_to_num(error, nan=np.inf), side="left")
    inside = index < levels.size
    declared = np.where(inside, levels[np.minimum(index, levels.size - 1)], np.nan)
    return _result(declared.astype(np.float64))


def sleep_clock_accuracy_code(total_ppm_worst: npt.ArrayLike) -> FloatOrArray:
    """The 3-bit SCA field value (7 = 0–20 ppm … 0 = 251–500 ppm); NaN beyond 500 ppm.

    Same rounding as :func:`sleep_clock_accuracy_ppm`; returned as float so NaN fits.
    """
    declared = np.asarray(sleep_clock_accuracy_ppm(total_ppm_worst), dtype=np.float64)
    levels = np.asarray(SLEEP_CLOCK_ACCURACY_LEVELS_PPM)
    index = np.searchsorted(levels, np.nan_to_num(declared, nan=np.inf), side="left")
    code = np.where(np.isnan(declared), np.nan, (levels.size - 1) - index)
    return _result(code.astype(np.float64))


def drift_seconds_per_day(error_ppm: npt.ArrayLike) -> FloatOrArray:
    """Clock drift [s/day] of a clock off by ``error_ppm`` [ppm]: ppm·1e-6·86400 s.

    >>> round(drift_seconds_per_day(23.148), 2)
    2.0
    """
    error = np.abs(np.asarray(error_ppm, dtype=np.float64))
    return _result(error * 1e-6 * SECONDS_PER_DAY)


def drift_minutes_per_month(error_ppm: npt.ArrayLike) -> FloatOrArray:
    """Clock drift [min/month] for ``error_ppm`` [ppm], with a 30-day month.

    >>> round(drift_minutes_per_month(60 / (30 * 86400) * 1e6), 6)
    1.0
    """
    error = np.abs(np.asarray(error_ppm, dtype=np.float64))
    return _result(error * 1e-6 * DAYS_PER_MONTH * SECONDS_PER_DAY / 60.0)


@dataclass(frozen=True)
class DeclaredFigures:
    """What firmware (or the product's specification) must state for this clock.

    Attributes
    ----------
    clock_role : the brief's clock role ("rtc", "ble_sleep", ...).
    worst_case_ppm : worst-case total error over temperature and life [ppm], positive.
    sleep_clock_accuracy_ppm : for "ble_sleep" clocks, the SCA level to declare [ppm],
        NaN when the error exceeds 500 ppm; None for other roles.
    sleep_clock_accuracy_code : the matching SCA field value 0–7 (NaN beyond 500 ppm);
        None for other roles.
    drift_s_per_day : for "rtc" clocks, worst-case drift [s/day]; None otherwise.
    drift_min_per_month : for "rtc" clocks, worst-case drift [min per 30-day month];
        None otherwise.
    """

    clock_role: str
    worst_case_ppm: FloatOrArray
    sleep_clock_accuracy_ppm: FloatOrArray | None = None
    sleep_clock_accuracy_code: FloatOrArray | None = None
    drift_s_per_day: FloatOrArray | None = None
    drift_min_per_month: FloatOrArray | None = None


def declared_figures(total_ppm_worst: npt.ArrayLike, clock_role: str) -> DeclaredFigures:
    """The figures to declare for a clock with worst-case total error ``total_ppm_worst``.

    Parameters
    ----------
    total_ppm_worst : worst-case total frequency error, all causes, whole life [ppm]
        (float or array; the sign is ignored).
    clock_role : the brief's clock role; "ble_sleep" adds the sleep clock accuracy,
        "rtc" adds the drift per day and per month; other roles carry the worst case only.
    """
    worst = np.abs(np.asarray(total_ppm_worst, dtype=np.float64))
    figures = DeclaredFigures(clock_role=clock_role, worst_case_ppm=_result(worst))
    if clock_role == "ble_sleep":
        return DeclaredFigures(
            clock_role=clock_role,
            worst_case_ppm=figures.worst_case_ppm,
            sleep_clock_accuracy_ppm=sleep_clock_accuracy_ppm(worst),
            sleep_clock_accuracy_code=sleep_clock_accuracy_code(worst),
        )
    if clock_role == "rtc":
        return DeclaredFigures(
            clock_role=clock_role,
            worst_case_ppm=figures.worst_case_ppm,
            drift_s_per_day=drift_seconds_per_day(worst),
            drift_min_per_month=drift_minutes_per_month(worst),
        )
    return figures


def describe_declared(figures: DeclaredFigures) -> tuple[str, ...]:
    """Sentences for the part sheet (scalar figures only; arrays are for tables)."""
    worst = float(np.asarray(figures.worst_case_ppm))
    lines = [f"worst-case frequency error over temperature and life: ±{worst:.3g} ppm"]
    if figures.sleep_clock_accuracy_ppm is not None:
        level = float(np.asarray(figures.sleep_clock_accuracy_ppm))
        if np.isnan(level):
            lines.append(
                f"sleep clock accuracy: ±{worst:.3g} ppm exceeds the largest allowed "
                f"(500 ppm, {SCA_CLAUSE}); this crystal cannot serve as the sleep clock"
            )
        else:
            code = float(np.asarray(figures.sleep_clock_accuracy_code))
            lines.append(
                f"declare sleep clock accuracy {level:.0f} ppm (SCA field {code:.0f}, {SCA_CLAUSE})"
            )
    if figures.drift_s_per_day is not None and figures.drift_min_per_month is not None:
        per_day = float(np.asarray(figures.drift_s_per_day))
        per_month = float(np.asarray(figures.drift_min_per_month))
        lines.append(
            f"RTC drift up to {per_day:.2f} s/day, {per_month:.2f} min/month (30-day month)"
        )
    return tuple(lines)
