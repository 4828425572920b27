"""picker.physics.temperature against published coefficients and brute-force extremes."""

from __future__ import annotations

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from picker.physics import temperature


def test_tuning_fork_at_minus_forty() -> None:
    # Common practice (tuning-fork data sheets): β = −0.034 ppm/°C², T0 = 25 °C gives
    # −0.034·65² = −143.65 ppm at −40 °C, and 0 at the turnover.
    assert temperature.tuning_fork_drift_ppm(-40.0) == pytest.approx(-143.65, abs=1e-9)
    assert temperature.tuning_fork_drift_ppm(25.0) == 0.0
    np.testing.assert_allclose(
        temperature.tuning_fork_drift_ppm(np.array([-40.0, 85.0]), -0.034, 25.0), [-143.65, -122.4]
    )


def test_worst_drift_hand_calculation() -> None:
    # −40…85 °C with β = −0.034 ± 0.006 and T0 = 25 ± 5 °C: the farthest corner is
    # −40 °C against T0 = 30 °C (70 °C away) at β = −0.040: −0.040·4900 = −196 ppm.
    bounds = temperature.tuning_fork_worst_drift_ppm(-40.0, 85.0)
    assert bounds.worst_abs_ppm == pytest.approx(196.0)
    assert bounds.lowest_ppm == pytest.approx(-196.0)
    assert bounds.highest_ppm == pytest.approx(0.0)  # the turnover lies inside the range
    # a range that misses every possible turnover never reaches zero drift:
    # 40…60 °C, nearest T0 = 30 °C, least |β| = 0.028 → −0.028·100 = −2.8 ppm
    warm = temperature.tuning_fork_worst_drift_ppm(40.0, 60.0)
    assert warm.highest_ppm == pytest.approx(-2.8)


@settings(deadline=None)  # timing varies on shared CI machines
@given(
    t_min=st.floats(-55, 20),
    span=st.floats(1, 120),
    beta=st.floats(-0.05, 0.0),
    beta_spread=st.floats(0, 0.01),
    t0=st.floats(15, 35),
    t0_spread=st.floats(0, 8),
)
def test_worst_drift_matches_brute_force(
    t_min: float, span: float, beta: float, beta_spread: float, t0: float, t0_spread: float
) -> None:
    # Brute force over a grid of T, β and T0 (grid includes the interval ends, where the
    # extremes of a convex parabola's square lie), against the closed corner analysis.
    t_max = t_min + span
    t = np.linspace(t_min, t_max, 241)[:, None, None]
    b = np.linspace(beta - beta_spread, beta + beta_spread, 5)[None, :, None]
    turn = np.linspace(t0 - t0_spread, t0 + t0_spread, 241)[None, None, :]
    drift = b * (t - turn) ** 2
    bounds = temperature.tuning_fork_worst_drift_ppm(t_min, t_max, beta, beta_spread, t0, t0_spread)
    tolerance = 1e-9 + 0.02 * abs(beta - beta_spread) * (span / 240 + 2 * t0_spread / 240) * (
        span + 2 * t0_spread + 80
    )
    assert bounds.lowest_ppm == pytest.approx(drift.min(), abs=tolerance)
    assert bounds.highest_ppm == pytest.approx(drift.max(), abs=tolerance)
    assert bounds.worst_abs_ppm == pytest.approx(np.abs(drift).max(), abs=tolerance)
    assert bounds.highest_ppm <= 1e-12 or beta + beta_spread > 0


def test_positive_drift_appears_when_beta_may_be_positive() -> None:
    # β = −0.002 ± 0.006 allows β = +0.004: highest = 0.004·(far corner)² > 0.
    bounds = temperature.tuning_fork_worst_drift_ppm(-40.0, 85.0, -0.002, 0.006, 25.0, 5.0)
    assert bounds.highest_ppm == pytest.approx(0.004 * 70**2)
    assert bounds.lowest_ppm == pytest.approx(-0.008 * 70**2)
    assert bounds.worst_abs_ppm == pytest.approx(0.008 * 70**2)


def test_at_cut_cubic_published_coefficients() -> None:
    # Gerber & Ballato (eds.), "Precision Frequency Control" vol. 2 (1985), after Bechmann,
    # Ballato & Lukaszek (1962): a2 = −0.45e-9/°C², a3 = 108.6e-12/°C³ about 25 °C.
    # Hand calculation at the zero-angle cut: x = 60 → −1.62 + 23.458 = 21.838 ppm;
    # x = −65 → −1.901 − 29.824 = −31.726 ppm.
    np.testing.assert_allclose(
        temperature.at_cut_drift_ppm(np.array([85.0, -40.0, 25.0])),
        [21.8376, -31.7255, 0.0],
        atol=1e-3,
    )

    # the inflection point of the cubic is at x = −a2/(3·a3) = +1.381 °C, i.e. 26.38 °C
    # (AT-cut inflection a little above room temperature, common practice). A central
    # second difference with a 1 °C step is exact for a cubic: f''(25 °C) = 2·a2 in ppm.
    def second_derivative(t: float) -> float:
        values = temperature.at_cut_drift_ppm(np.array([t - 1.0, t, t + 1.0]))
        return float(values[0] - 2 * values[1] + values[2])

    assert second_derivative(25.0) == pytest.approx(2 * -0.45e-9 * 1e6, rel=1e-9)
    assert second_derivative(25 + 0.45e-9 / (3 * 108.6e-12)) == pytest.approx(0.0, abs=1e-12)


def test_at_cut_angle_term_is_linear() -> None:
    # a1 = −5.08e-6/°C per degree of angle deviation (same source): the angle adds
    # −5.08 ppm/°C·x per degree.
    x = np.array([-65.0, -20.0, 0.0, 30.0, 60.0])
    delta = temperature.at_cut_drift_ppm(25 + x, 0.1) - temperature.at_cut_drift_ppm(25 + x, 0.0)
    np.testing.assert_allclose(delta, -5.08 * 0.1 * x, atol=1e-9)


def test_budget_drift_uses_stability_for_at_and_parabola_for_forks() -> None:
    result = temperature.temperature_drift_budget_ppm(
        np.array([True, False, True]),
        np.array([np.nan, 30.0, 50.0]),
        -40.0,
        85.0,
        beta=np.array([np.nan, np.nan, -0.030]),
        t0=np.array([np.nan, np.nan, 25.0]),
    )
    # fork with typical β, T0: 196 ppm; AT: its rated ±30 ppm; fork β = −0.030 ± 0.006:
    # 0.036·70² = 176.4 ppm (a fork's stated stability is not used; the parabola is)
    np.testing.assert_allclose(result, [196.0, 30.0, 176.4])
    assert np.ndim(temperature.temperature_drift_budget_ppm(False, -20.0, 0.0, 70.0)) == 0
    assert temperature.temperature_drift_budget_ppm(False, -20.0, 0.0, 70.0) == 20.0


def test_scalar_and_array_inputs() -> None:
    t = np.array([-40.0, 0.0, 85.0])
    assert np.ndim(temperature.tuning_fork_drift_ppm(-40.0)) == 0
    assert np.ndim(temperature.at_cut_drift_ppm(-40.0)) == 0
    np.testing.assert_allclose(
        temperature.at_cut_drift_ppm(t), [temperature.at_cut_drift_ppm(v) for v in t], rtol=1e-12
    )
    bounds = temperature.tuning_fork_worst_drift_ppm(
        np.array([-40.0, -20.0]), np.array([85.0, 70.0])
    )
    assert bounds.worst_abs_ppm.shape == (2,)
    assert (
        bounds.worst_abs_ppm[1]
        == temperature.tuning_fork_worst_drift_ppm(-20.0, 70.0).worst_abs_ppm
    )


@settings(deadline=None)  # timing varies on shared CI machines
@given(t_min=st.floats(-55, 20), span=st.floats(5, 150), angle=st.floats(-0.5, 0.5))
def test_at_cut_bounds_match_a_dense_grid(t_min: float, span: float, angle: float) -> None:
    # Exact extremes (ends and turning points) against a dense sampling of the cubic.
    t = np.linspace(t_min, t_min + span, 20001)
    drift = temperature.at_cut_drift_ppm(t, angle)
    bounds = temperature.at_cut_drift_bounds_ppm(t_min, t_min + span, angle)
    # a sampled extremum can only fall short of the true one, by at most f''·h²/8
    assert bounds.lowest_ppm <= drift.min() + 1e-12
    assert bounds.highest_ppm >= drift.max() - 1e-12
    assert bounds.lowest_ppm == pytest.approx(drift.min(), abs=1e-6)
    assert bounds.highest_ppm == pytest.approx(drift.max(), abs=1e-6)
    assert bounds.worst_abs_ppm == pytest.approx(np.abs(drift).max(), abs=1e-6)


def test_at_cut_best_angle_is_the_grid_minimum() -> None:
    # Brute force over cut angles (0.0005° steps) of the exact worst drift, against the
    # ternary search. −40…85 °C: about +0.07° and ±8.4 ppm for an ideally cut blank (rated
    # parts add angle tolerance, hence the ±10…±30 ppm of catalogs, common practice).
    ranges = np.array([[-40.0, 85.0], [-20.0, 70.0], [-40.0, 125.0], [0.0, 50.0]])
    best = temperature.at_cut_best_angle_deg(ranges[:, 0], ranges[:, 1])
    angles = np.arange(-1.0, 1.0, 0.0005)
    for (lo, hi), angle in zip(ranges, best, strict=True):
        worst = temperature.at_cut_drift_bounds_ppm(lo, hi, angles).worst_abs_ppm
        assert (
            temperature.at_cut_drift_bounds_ppm(lo, hi, angle).worst_abs_ppm <= worst.min() + 1e-9
        )
        assert angle == pytest.approx(angles[np.argmin(worst)], abs=0.001)
    assert best[0] == pytest.approx(0.07, abs=0.005)
    assert temperature.at_cut_drift_bounds_ppm(-40.0, 85.0, best[0]).worst_abs_ppm == pytest.approx(
        8.44, abs=0.01
    )
    assert np.ndim(temperature.at_cut_best_angle_deg(-40.0, 85.0)) == 0
