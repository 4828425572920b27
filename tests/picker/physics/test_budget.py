"""picker.physics.budget: error-budget arithmetic and the load-capacitance spread."""

from __future__ import annotations

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from picker.physics import budget, crystal

PF = 1e-12
FF = 1e-15


def test_worst_case_and_rss_hand_calculation() -> None:
    # Σ|terms| = 10 + 20 + 3 + 1 + 2 = 36; RSS = √(100 + 400 + 9 + 1 + 4) = √514 = 22.67.
    result = budget.frequency_error_budget(10.0, 20.0, 3.0, -1.0, 2.0)
    assert result.total_ppm == pytest.approx(36.0)
    assert result.rss_ppm == pytest.approx(np.sqrt(514.0))
    assert result.pulling_ppm == 1.0  # the sign of the pulling is dropped for the budget
    assert np.ndim(result.total_ppm) == 0


def test_missing_figure_is_never_counted_as_zero() -> None:
    result = budget.frequency_error_budget(10.0, np.nan, 3.0, 1.0, 2.0)
    assert np.isnan(result.total_ppm) and np.isnan(result.rss_ppm)


_term = st.floats(-500, 500, allow_nan=False)


@settings(deadline=None)  # timing varies on shared CI machines
@given(a=_term, b=_term, c=_term, d=_term, e=_term)
def test_total_is_never_below_any_part(a: float, b: float, c: float, d: float, e: float) -> None:
    # a worst-case sum of magnitudes bounds every term and the RSS; the RSS bounds each term
    result = budget.frequency_error_budget(a, b, c, d, e)
    parts = [
        result.tolerance_ppm,
        result.temperature_ppm,
        result.aging_ppm,
        result.pulling_ppm,
        result.spread_ppm,
    ]
    for part in parts:
        assert result.total_ppm >= part
        assert result.rss_ppm >= part * (1 - 1e-12)
    assert result.rss_ppm <= result.total_ppm * (1 + 1e-12)


def test_arrays_broadcast() -> None:
    result = budget.frequency_error_budget(
        np.array([10.0, 20.0]), 30.0, 3.0, np.array([-1.0, 5.0]), 0.5
    )
    np.testing.assert_allclose(result.total_ppm, [44.5, 58.5])
    assert result.aging_ppm.shape == (2,)


def test_load_capacitance_spread_hand_calculation() -> None:
    # 18 pF caps ±5 %, 1.5 pF pins: (18.9 + 1.5)/2 − (18 + 1.5)/2 = 0.45 pF each way, plus
    # ±1 pF stray uncertainty → ±1.45 pF.
    assert budget.load_capacitance_spread_f(
        18 * PF, 18 * PF, 1.5 * PF, 0.05, 1 * PF
    ) == pytest.approx(1.45 * PF)
    # 6.8 pF caps are below 10 pF: ±0.25 pF absolute (common practice) → 0.125 pF, no stray
    assert budget.load_capacitance_spread_f(
        6.8 * PF, 6.8 * PF, 1.5 * PF, 0.05, 0.0
    ) == pytest.approx(0.125 * PF)
    # unequal caps: exact series combination at both extremes (larger excursion wins)
    a, b, pin = 12 * PF, 27 * PF, 1 * PF

    def series(x: float, y: float) -> float:
        return (x + pin) * (y + pin) / (x + y + 2 * pin)

    up = series(a * 1.05, b * 1.05) - series(a, b)
    down = series(a, b) - series(a * 0.95, b * 0.95)
    assert budget.load_capacitance_spread_f(a, b, pin, 0.05, 0.0) == pytest.approx(
        max(up, down), rel=1e-12
    )


def test_load_spread_is_trim_sensitivity_times_delta_to_first_order() -> None:
    # spread ≈ |S|·ΔCL (IEC 60122-1 trim sensitivity); the exact difference is a little
    # larger (D is convex in CL) and converges to |S|·ΔCL as ΔCL → 0.
    c1, c0, cl = 5 * FF, 2 * PF, 10 * PF
    s = abs(crystal.trim_sensitivity_ppm_per_pf(c1, c0, cl))
    for delta_pf in (1.0, 0.1, 0.01):
        spread = budget.load_spread_ppm(c1, c0, cl, delta_pf * PF)
        assert spread >= s * delta_pf
        assert spread == pytest.approx(s * delta_pf, rel=1.5 * delta_pf / 12)
    np.testing.assert_allclose(
        budget.load_spread_ppm(np.array([5, 3]) * FF, 2 * PF, np.array([10, 8]) * PF, 1 * PF),
        [
            budget.load_spread_ppm(5 * FF, 2 * PF, 10 * PF, 1 * PF),
            budget.load_spread_ppm(3 * FF, 2 * PF, 8 * PF, 1 * PF),
        ],
    )


def test_clock_error_for_rtc_figures() -> None:
    # Design notes §4 RTC preset: ±1 min per 30-day month is 60 s/(30·86400 s) = 23.1 ppm;
    # 1 ppm accumulates 86.4 ms per day.
    assert budget.clock_error_s(60 / (30 * 86400) * 1e6, 30 * 86400) == pytest.approx(60.0)
    assert budget.clock_error_s(23.1, 30 * 86400) == pytest.approx(59.9, abs=0.05)
    np.testing.assert_allclose(
        budget.clock_error_s(np.array([1.0, -20.0]), 86400.0), [0.0864, -1.728]
    )
    assert np.ndim(budget.clock_error_s(1.0, 86400.0)) == 0


def test_load_capacitance_spread_arrays() -> None:
    caps = np.array([18.0, 6.8, 12.0]) * PF
    vector = budget.load_capacitance_spread_f(
        caps, caps, 1.5 * PF, 0.05, np.array([1.0, 0.0, 0.5]) * PF
    )
    singles = [
        budget.load_capacitance_spread_f(c, c, 1.5 * PF, 0.05, u * PF)
        for c, u in zip(caps, [1.0, 0.0, 0.5], strict=True)
    ]
    np.testing.assert_allclose(vector, singles, rtol=1e-12)
    np.testing.assert_allclose(vector[:2], [1.45 * PF, 0.125 * PF], rtol=1e-12)
