"""Frequency error budget: the causes of frequency error, summed worst case and as RSS."""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from picker.physics._arrays import ArrayLike, FloatArray, as_float, to_float
from picker.physics.capacitors import capacitor_tolerance_f
from picker.physics.crystal import load_resonance_offset


@dataclass(frozen=True)
class ErrorBudget:
    """Frequency error terms per part, all positive magnitudes [ppm].

    Attributes
    ----------
    tolerance_ppm : calibration tolerance at 25 °C
    temperature_ppm : drift over the brief's temperature range
    aging_ppm : aging over the brief's lifetime
    pulling_ppm : |pulling| at the chosen load capacitors (a systematic offset)
    spread_ppm : frequency spread from capacitor tolerance and stray uncertainty
    total_ppm : worst-case sum of the five terms
    rss_ppm : root-sum-square of the five terms (treats them as independent)
    """

    tolerance_ppm: FloatArray
    temperature_ppm: FloatArray
    aging_ppm: FloatArray
    pulling_ppm: FloatArray
    spread_ppm: FloatArray
    total_ppm: FloatArray
    rss_ppm: FloatArray


def frequency_error_budget(
    tolerance_ppm: ArrayLike,
    temperature_ppm: ArrayLike,
    aging_ppm: ArrayLike,
    pulling_ppm: ArrayLike,
    spread_ppm: ArrayLike,
) -> ErrorBudget:
    """Combine the error terms into a worst-case total and a root-sum-square.

    Parameters
    ----------
    tolerance_ppm, temperature_ppm, aging_ppm, pulling_ppm, spread_ppm : the terms [ppm];
        signs are dropped (each is used as a ± magnitude)

    Returns
    -------
    ErrorBudget
        the magnitudes, their sum and their RSS, broadcast to a common shape

    Notes
    -----
    Worst case: total = Σ|term|; RSS = √(Σ term²) (standard error-budget practice; the
    worst case is what an interface limit is checked against). A NaN term makes the
    totals NaN, so a missing figure is never silently counted as zero.
    """
    tolerance, temperature, aging, pulling, spread = np.broadcast_arrays(
        *(
            np.abs(as_float(t))
            for t in (tolerance_ppm, temperature_ppm, aging_ppm, pulling_ppm, spread_ppm)
        )
    )
    total = tolerance + temperature + aging + pulling + spread
    rss = _root_sum_square(tolerance, temperature, aging, pulling, spread)
    return ErrorBudget(
        tolerance_ppm=to_float(tolerance),
        temperature_ppm=to_float(temperature),
        aging_ppm=to_float(aging),
        pulling_ppm=to_float(pulling),
        spread_ppm=to_float(spread),
        total_ppm=to_float(total),
        rss_ppm=to_float(rss),
    )


def load_capacitance_spread_f(
    cap_a: ArrayLike,
    cap_b: ArrayLike,
    c_pin: ArrayLike,
    tolerance_fraction: ArrayLike,
    stray_uncertainty: ArrayLike,
    absolute_tolerance_f: ArrayLike = 0.25e-12,
) -> FloatArray:
    """Worst-case deviation of the board load capacitance from its nominal value.

    Parameters
    ----------
    cap_a, cap_b : external capacitors [F]
    c_pin : pin capacitance per pin to ground [F]
    tolerance_fraction : capacitor tolerance for values ≥ 10 pF, e.g. 0.05 [1]
    stray_uncertainty : ± uncertainty of the stray capacitance [F]
    absolute_tolerance_f : capacitor tolerance below 10 pF [F]

    Returns
    -------
    delta_cl : ± ΔCL [F], the larger of the upward and downward excursions

    Notes
    -----
    CL = (Ca + Cp)(Cb + Cp)/(Ca + Cb + 2Cp) + C_stray rises with both caps, so the extremes
    are both caps at +tolerance and both at −tolerance; the series combination is evaluated
    exactly there. The stray capacitance shifts CL but not its spread; its uncertainty adds
    directly.
    """
    a, b, pin = as_float(cap_a), as_float(cap_b), as_float(c_pin)
    tol_a = capacitor_tolerance_f(a, tolerance_fraction, absolute_tolerance_f)
    tol_b = capacitor_tolerance_f(b, tolerance_fraction, absolute_tolerance_f)

    def series(x: FloatArray, y: FloatArray) -> FloatArray:
        return np.asarray((x + pin) * (y + pin) / (x + y + 2.0 * pin))

    nominal = series(a, b)
    up = series(a + tol_a, b + tol_b) - nominal
    down = nominal - series(np.maximum(a - tol_a, 0.0), np.maximum(b - tol_b, 0.0))
    result = np.maximum(up, down) + np.abs(as_float(stray_uncertainty))
    return to_float(np.asarray(result))


def load_spread_ppm(c1: ArrayLike, c0: ArrayLike, cl: ArrayLike, delta_cl: ArrayLike) -> FloatArray:
    """Frequency spread caused by a ± uncertainty of the load capacitance.

    Parameters
    ----------
    c1 : motional capacitance [F]
    c0 : shunt capacitance [F]
    cl : nominal board load capacitance [F]
    delta_cl : ± uncertainty of CL [F]

    Returns
    -------
    spread : ± frequency spread [ppm], positive

    Notes
    -----
    max(|D(CL − ΔCL) − D(CL)|, |D(CL + ΔCL) − D(CL)|) with D = C1/(2(C0 + CL))
    (IEC 60122-1); equals |S|·ΔCL to first order, S the trim sensitivity, and is slightly
    larger because D is convex in CL.
    """
    cl_a, delta = as_float(cl), np.abs(as_float(delta_cl))
    centre = load_resonance_offset(c1, c0, cl_a)
    low = load_resonance_offset(c1, c0, np.maximum(cl_a - delta, 0.0))
    high = load_resonance_offset(c1, c0, cl_a + delta)
    result = np.maximum(np.abs(low - centre), np.abs(high - centre)) * 1e6
    return to_float(np.asarray(result))


def clock_error_s(error_ppm: ArrayLike, interval_s: ArrayLike) -> FloatArray:
    """Time a clock gains or loses over an interval at a given frequency error.

    Parameters
    ----------
    error_ppm : frequency error [ppm]
    interval_s : elapsed time [s], e.g. 86400 for a day, 30·86400 for a month

    Returns
    -------
    error : accumulated time error [s] (same sign as the frequency error)

    Notes
    -----
    Δt = Δf/f · t. For an RTC, ±1 min per 30-day month is 60/(30·86400) = 23.1 ppm, and
    1 ppm is 0.0864 s per day.
    """
    return to_float(as_float(error_ppm) * 1e-6 * as_float(interval_s))


def _root_sum_square(*terms: FloatArray) -> FloatArray:
    # √(Σ t²) directly (no 5-row stack, no scaling pass); only rows whose sum of squares
    # left the safe range (a term beyond ~1e145 or below ~1e-145, or NaN/inf) are redone
    # with hypot, which neither overflows nor underflows
    with np.errstate(over="ignore", under="ignore", invalid="ignore"):
        sum_squares = terms[0] * terms[0]
        for term in terms[1:]:
            sum_squares = sum_squares + term * term
        rss = np.sqrt(sum_squares)
    redo = ~((sum_squares > 1e-290) & (sum_squares < 1e290))
    if not np.any(redo):
        return np.asarray(rss)
    rss = np.array(rss, dtype=np.float64)  # writable, also for 0-d inputs
    picked = [np.broadcast_to(term, rss.shape)[redo] for term in terms]
    redone = picked[0]
    for term in picked[1:]:
        redone = np.hypot(redone, term)
    # hypot(inf, NaN) is inf: a missing term must leave the RSS unknown, as it does the sum
    redone = np.where(np.isnan(sum(picked)), np.nan, redone)
    rss[redo] = redone
    return rss
