"""picker.physics.aging against the MIL-PRF-55310 logarithmic law."""

from __future__ import annotations

import numpy as np
import pytest

from picker.physics import aging

DAY = 86400.0
YEAR = 365 * DAY


def test_first_year_reproduces_the_catalog_figure() -> None:
    # A = X/ln(365·B + 1) makes A·ln(B·365 d + 1) = X exactly (MIL-PRF-55310 log form).
    assert aging.aging_ppm(3.0, YEAR) == pytest.approx(3.0, rel=1e-12)
    assert aging.aging_ppm(-3.0, YEAR) == pytest.approx(-3.0, rel=1e-12)
    assert aging.aging_ppm(3.0, 0.0) == 0.0


def test_ten_years_is_about_one_point_six_times_the_first() -> None:
    # ln(3651)/ln(37.5) = 8.203/3.624 = 1.629 — the design notes' "≈ 1.6·X" (B = 0.1/day).
    ratio = aging.aging_ppm(1.0, 10 * YEAR)
    assert ratio == pytest.approx(np.log(0.1 * 3650 + 1) / np.log(36.5 + 1), rel=1e-12)
    assert ratio == pytest.approx(1.63, abs=0.005)


def test_log_law_shape() -> None:
    # equal ratios of (B·t + 1) add equal aging: f(t) = A·ln(B·t + 1)
    x, b = 5.0, 0.1
    t1 = (np.e - 1) / b * DAY
    t2 = (np.e**2 - 1) / b * DAY
    a = x / np.log(365 * b + 1)
    np.testing.assert_allclose(aging.aging_ppm(x, np.array([t1, t2])), [a, 2 * a], rtol=1e-12)
    # a larger B front-loads the aging: more in the first month, same at one year
    month = 30 * DAY
    assert aging.aging_ppm(x, month, b_per_day=1.0) > aging.aging_ppm(x, month, b_per_day=0.1)
    assert aging.aging_ppm(x, YEAR, b_per_day=1.0) == pytest.approx(x)


def test_scalar_and_array_inputs() -> None:
    t = np.array([0.5, 1, 5, 10]) * YEAR
    x = np.array([3.0, 3.0, 5.0, 1.0])
    assert np.ndim(aging.aging_ppm(3.0, YEAR)) == 0
    np.testing.assert_allclose(
        aging.aging_ppm(x, t), [aging.aging_ppm(a, b) for a, b in zip(x, t, strict=True)]
    )
    assert np.all(np.diff(aging.aging_ppm(3.0, t)) > 0)
