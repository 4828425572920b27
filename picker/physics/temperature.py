"""Frequency drift over temperature: tuning-fork parabola and AT-cut cubic."""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from picker.physics._arrays import ArrayLike, FloatArray, as_float, to_float

#: Typical tuning-fork parabolic coefficient [ppm/°C²] and its data-sheet spread.
TUNING_FORK_BETA = -0.034
TUNING_FORK_BETA_SPREAD = 0.006
#: Typical tuning-fork turnover temperature [°C] and its data-sheet spread.
TUNING_FORK_TURNOVER_C = 25.0
TUNING_FORK_TURNOVER_SPREAD_C = 5.0

# AT-cut cubic coefficients about 25 °C (Gerber & Ballato (eds.), "Precision Frequency
# Control" vol. 2, 1985, after Bechmann, Ballato & Lukaszek 1962).
AT_CUT_A1_PER_DEGREE = -5.08e-6  # [1/°C per degree of cut-angle deviation]
AT_CUT_A2 = -0.45e-9  # [1/°C²]
AT_CUT_A3 = 108.6e-12  # [1/°C³]
AT_CUT_REFERENCE_C = 25.0


def tuning_fork_drift_ppm(
    t_c: ArrayLike,
    beta: ArrayLike = TUNING_FORK_BETA,
    t0: ArrayLike = TUNING_FORK_TURNOVER_C,
) -> FloatArray:
    """Frequency drift of a tuning-fork crystal.

    Parameters
    ----------
    t_c : temperature [°C]
    beta : parabolic coefficient [ppm/°C²], negative
    t0 : turnover temperature [°C]

    Returns
    -------
    drift : Δf/f [ppm]

    Notes
    -----
    Δf/f = β·(T − T0)² (tuning-fork crystal data sheets, common practice);
    −143.65 ppm at −40 °C for β = −0.034 ppm/°C², T0 = 25 °C.

    Examples
    --------
    >>> round(float(tuning_fork_drift_ppm(-40.0)), 2)
    -143.65
    """
    return to_float(as_float(beta) * (as_float(t_c) - as_float(t0)) ** 2)


@dataclass(frozen=True)
class DriftBounds:
    """Extremes of a drift over a temperature range and parameter spreads.

    Attributes
    ----------
    worst_abs_ppm : largest |Δf/f| [ppm]
    lowest_ppm : most negative Δf/f [ppm]
    highest_ppm : most positive Δf/f [ppm] (0 or below for a part that only falls)
    """

    worst_abs_ppm: FloatArray
    lowest_ppm: FloatArray
    highest_ppm: FloatArray


def tuning_fork_worst_drift_ppm(
    t_min: ArrayLike,
    t_max: ArrayLike,
    beta: ArrayLike = TUNING_FORK_BETA,
    beta_spread: ArrayLike = TUNING_FORK_BETA_SPREAD,
    t0: ArrayLike = TUNING_FORK_TURNOVER_C,
    t0_spread: ArrayLike = TUNING_FORK_TURNOVER_SPREAD_C,
) -> DriftBounds:
    """Worst tuning-fork drift over a temperature range, β and T0 anywhere in their spreads.

    Parameters
    ----------
    t_min, t_max : temperature range [°C]
    beta : nominal parabolic coefficient [ppm/°C²]
    beta_spread : ± spread of β [ppm/°C²]
    t0 : nominal turnover temperature [°C]
    t0_spread : ± spread of T0 [°C]

    Returns
    -------
    DriftBounds
        worst |Δf/f|, the most negative and the most positive Δf/f [ppm]

    Notes
    -----
    Δf/f = β·(T − T0)² (common practice). (T − T0)² over T ∈ [t_min, t_max] and
    T0 ∈ [t0 − s, t0 + s] is largest at a corner, max(|t_min − t0 − s|, |t_max − t0 + s|)²,
    and smallest at the gap between the two intervals (0 when they overlap). β enters
    linearly, so the extremes are at β ± spread.
    """
    lo_t, hi_t = as_float(t_min), as_float(t_max)
    t0_lo = as_float(t0) - as_float(t0_spread)
    t0_hi = as_float(t0) + as_float(t0_spread)
    far = np.maximum(np.abs(lo_t - t0_hi), np.abs(hi_t - t0_lo)) ** 2
    gap = np.maximum(0.0, np.maximum(lo_t - t0_hi, t0_lo - hi_t)) ** 2
    beta_lo = as_float(beta) - np.abs(as_float(beta_spread))
    beta_hi = as_float(beta) + np.abs(as_float(beta_spread))
    candidates = np.stack(
        np.broadcast_arrays(beta_lo * far, beta_lo * gap, beta_hi * far, beta_hi * gap)
    )
    lowest = candidates.min(axis=0)
    highest = candidates.max(axis=0)
    worst = np.maximum(np.abs(lowest), np.abs(highest))
    return DriftBounds(to_float(worst), to_float(lowest), to_float(highest))


def at_cut_drift_ppm(t_c: ArrayLike, angle_deviation_deg: ArrayLike = 0.0) -> FloatArray:
    """Frequency drift of an AT-cut crystal over temperature.

    Parameters
    ----------
    t_c : temperature [°C]
    angle_deviation_deg : deviation of the cut angle from the zero-temperature-coefficient
        AT angle [degree of arc]

    Returns
    -------
    drift : Δf/f [ppm]

    Notes
    -----
    Δf/f = a1·x + a2·x² + a3·x³, x = T − 25 °C, a1 = −5.08e-6/°C per degree of angle
    deviation, a2 = −0.45e-9/°C², a3 = 108.6e-12/°C³ — Gerber & Ballato (eds.), "Precision
    Frequency Control" vol. 2, 1985, after Bechmann, Ballato & Lukaszek 1962.
    """
    x = as_float(t_c) - AT_CUT_REFERENCE_C
    a1 = AT_CUT_A1_PER_DEGREE * as_float(angle_deviation_deg)
    return to_float((a1 * x + AT_CUT_A2 * x**2 + AT_CUT_A3 * x**3) * 1e6)


def at_cut_drift_bounds_ppm(
    t_min: ArrayLike, t_max: ArrayLike, angle_deviation_deg: ArrayLike = 0.0
) -> DriftBounds:
    """Exact extremes of the AT-cut cubic over a temperature range.

    Parameters
    ----------
    t_min, t_max : temperature range [°C]
    angle_deviation_deg : cut-angle deviation [degree of arc]

    Returns
    -------
    DriftBounds
        worst |Δf/f|, most negative and most positive Δf/f over the range [ppm]

    Notes
    -----
    The extremes of a cubic on an interval lie at the ends or at the turning points
    x = (−a2 ± √(a2² − 3·a1·a3)) / (3·a3) inside it (cubic of :func:`at_cut_drift_ppm`).
    """
    lo, hi, angle = np.broadcast_arrays(
        as_float(t_min), as_float(t_max), as_float(angle_deviation_deg)
    )
    a1 = AT_CUT_A1_PER_DEGREE * angle
    disc = AT_CUT_A2**2 - 3.0 * a1 * AT_CUT_A3
    root = np.sqrt(np.maximum(disc, 0.0))
    candidates = [lo, hi]
    for sign in (-1.0, 1.0):
        t_turn = AT_CUT_REFERENCE_C + (-AT_CUT_A2 + sign * root) / (3.0 * AT_CUT_A3)
        inside = (disc >= 0.0) & (t_turn > lo) & (t_turn < hi)
        candidates.append(np.where(inside, t_turn, lo))
    values = np.stack([at_cut_drift_ppm(t, angle) for t in candidates])
    lowest, highest = values.min(axis=0), values.max(axis=0)
    worst = np.maximum(np.abs(lowest), np.abs(highest))
    return DriftBounds(to_float(worst), to_float(lowest), to_float(highest))


def at_cut_best_angle_deg(
    t_min: ArrayLike, t_max: ArrayLike, search_deg: float = 1.0
) -> FloatArray:
    """Cut-angle deviation that minimises the worst AT-cut drift over a temperature range.

    Parameters
    ----------
    t_min, t_max : temperature range [°C]
    search_deg : half-width of the searched angle interval [degree of arc]

    Returns
    -------
    angle : best cut-angle deviation [degree of arc] (for drift plots of a well-cut part
        when the catalog gives only a stability figure)

    Notes
    -----
    For each temperature Δf/f is affine in a1, so the worst |Δf/f| over the range is a
    maximum of convex functions of the angle — convex — and a vectorised ternary search
    finds its minimum (cubic of Gerber & Ballato 1985, after Bechmann et al. 1962).
    """
    lo_t, hi_t = np.broadcast_arrays(as_float(t_min), as_float(t_max))
    lo = np.full(lo_t.shape, -float(search_deg))
    hi = np.full(lo_t.shape, float(search_deg))
    for _ in range(80):  # (2/3)^80 of 2° is far below any meaningful angle
        left = lo + (hi - lo) / 3.0
        right = hi - (hi - lo) / 3.0
        worse_left = as_float(at_cut_drift_bounds_ppm(lo_t, hi_t, left).worst_abs_ppm) > as_float(
            at_cut_drift_bounds_ppm(lo_t, hi_t, right).worst_abs_ppm
        )
        lo = np.where(worse_left, left, lo)
        hi = np.where(worse_left, hi, right)
    return to_float((lo + hi) / 2.0)


def temperature_drift_budget_ppm(
    is_tuning_fork: ArrayLike,
    stability_ppm: ArrayLike,
    t_min: ArrayLike,
    t_max: ArrayLike,
    beta: ArrayLike = np.nan,
    t0: ArrayLike = np.nan,
    beta_spread: ArrayLike = TUNING_FORK_BETA_SPREAD,
    t0_spread: ArrayLike = TUNING_FORK_TURNOVER_SPREAD_C,
) -> FloatArray:
    """Temperature term of the frequency error budget.

    Parameters
    ----------
    is_tuning_fork : True for tuning-fork parts [bool]
    stability_ppm : rated ± stability over the part's rated range [ppm] (AT and others)
    t_min, t_max : the brief's temperature range [°C]
    beta : the part's parabolic coefficient [ppm/°C²]; NaN for the typical −0.034
    t0 : the part's turnover temperature [°C]; NaN for the typical 25 °C
    beta_spread, t0_spread : ± spreads applied around β and T0 [ppm/°C², °C]

    Returns
    -------
    drift : worst |Δf/f| over the range [ppm], positive

    Notes
    -----
    AT-cut and other parts: the rated stability (the cubic depends on the cut angle, which
    the catalog does not give). Tuning forks: the worst of β·(T − T0)² over the brief's
    range with β and T0 anywhere in their spreads (:func:`tuning_fork_worst_drift_ppm`).
    Whether the part's rated range covers the brief's range is checked by the caller.
    """
    beta_a = as_float(beta)
    t0_a = as_float(t0)
    beta_use = np.where(np.isfinite(beta_a), beta_a, TUNING_FORK_BETA)
    t0_use = np.where(np.isfinite(t0_a), t0_a, TUNING_FORK_TURNOVER_C)
    fork = tuning_fork_worst_drift_ppm(t_min, t_max, beta_use, beta_spread, t0_use, t0_spread)
    result = np.where(
        np.asarray(is_tuning_fork, dtype=bool), fork.worst_abs_ppm, np.abs(as_float(stability_ppm))
    )
    return to_float(np.asarray(result, dtype=np.float64))
