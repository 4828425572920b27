"""Figures firmware must declare: Bluetooth LE sleep clock accuracy and RTC drift."""

from __future__ import annotations

import math

import numpy as np
import pytest

from picker.declared import (
    SLEEP_CLOCK_ACCURACY_LEVELS_PPM,
    declared_figures,
    describe_declared,
    drift_minutes_per_month,
    drift_seconds_per_day,
    sleep_clock_accuracy_code,
    sleep_clock_accuracy_ppm,
)

# Bluetooth Core Specification Vol 6 Part B §2.3.3.1, SCA field of CONNECT_IND (from
# memory): code 7 = 0–20 ppm, 6 = 21–30, 5 = 31–50, 4 = 51–75, 3 = 76–100, 2 = 101–150,
# 1 = 151–250, 0 = 251–500 ppm. A clock is declared in the first range that contains its
# worst case, i.e. its worst case is rounded UP to the next level.
SCA_TABLE = [(20, 7), (30, 6), (50, 5), (75, 4), (100, 3), (150, 2), (250, 1), (500, 0)]


def test_levels_are_the_specification_table() -> None:
    assert [level for level, _ in SCA_TABLE] == list(SLEEP_CLOCK_ACCURACY_LEVELS_PPM)


@pytest.mark.parametrize(("level", "code"), SCA_TABLE)
def test_each_level_maps_to_itself_and_its_code(level: float, code: int) -> None:
    assert sleep_clock_accuracy_ppm(level) == level
    assert sleep_clock_accuracy_code(level) == code


@pytest.mark.parametrize(
    ("worst", "declared"),
    [
        (0.0, 20.0),
        (12.3, 20.0),
        (20.001, 30.0),  # just above a level: the next one up
        (43.2, 50.0),
        (50.000000000001, 50.0),  # floating-point noise on an exact level is not "above"
        (76.0, 100.0),
        (163.7, 250.0),  # a tuning fork at −40 °C (−143.7 ppm) plus ±20 ppm tolerance
        (499.9, 500.0),
        (-43.2, 50.0),  # the sign of the error does not matter
    ],
)
def test_rounds_up_to_next_allowed_level(worst: float, declared: float) -> None:
    assert sleep_clock_accuracy_ppm(worst) == declared


def test_beyond_500_ppm_is_not_declarable() -> None:
    assert math.isnan(sleep_clock_accuracy_ppm(500.5))
    assert math.isnan(sleep_clock_accuracy_code(500.5))
    assert math.isnan(sleep_clock_accuracy_ppm(float("nan")))


def test_sca_vectorised() -> None:
    result = sleep_clock_accuracy_ppm(np.array([10.0, 31.0, 600.0]))
    assert isinstance(result, np.ndarray)
    np.testing.assert_array_equal(result, [20.0, 50.0, np.nan])
    np.testing.assert_array_equal(
        sleep_clock_accuracy_code(np.array([10.0, 31.0, 600.0])), [7.0, 5.0, np.nan]
    )


def test_rtc_drift_one_minute_per_month() -> None:
    # 60 s / (30 · 86400 s) = 23.148 ppm; per day 23.148e-6 · 86400 s = 2.0 s.
    ppm = 60.0 / (30 * 86400) * 1e6
    assert drift_seconds_per_day(ppm) == pytest.approx(2.0, rel=1e-12)
    assert drift_minutes_per_month(ppm) == pytest.approx(1.0, rel=1e-12)
    # The design notes' rounded "23.1 ppm" gives about 2.0 s/day as well.
    assert drift_seconds_per_day(23.1) == pytest.approx(1.996, abs=1e-3)


def test_watch_crystal_rule_of_thumb() -> None:
    # From memory: a ±20 ppm watch crystal gains or loses about 1.7 s a day, under a
    # minute (≈ 52 s) a month. 20e-6 · 86400 = 1.728 s; · 30 / 60 = 0.864 min.
    assert drift_seconds_per_day(20.0) == pytest.approx(1.728)
    assert drift_minutes_per_month(-20.0) == pytest.approx(0.864)


def test_drift_vectorised() -> None:
    np.testing.assert_allclose(drift_seconds_per_day(np.array([1.0, 10.0])), [0.0864, 0.864])


def test_declared_for_ble_sleep() -> None:
    figures = declared_figures(163.7, "ble_sleep")
    assert figures.worst_case_ppm == pytest.approx(163.7)
    assert figures.sleep_clock_accuracy_ppm == 250.0
    assert figures.sleep_clock_accuracy_code == 1.0
    assert figures.drift_s_per_day is None
    lines = describe_declared(figures)
    assert any("declare sleep clock accuracy 250 ppm (SCA field 1" in line for line in lines)


def test_declared_for_ble_sleep_beyond_table() -> None:
    lines = describe_declared(declared_figures(612.0, "ble_sleep"))
    assert any("exceeds the largest allowed" in line for line in lines)


def test_declared_for_rtc() -> None:
    figures = declared_figures(-23.148148148148145, "rtc")
    assert figures.worst_case_ppm == pytest.approx(23.148148148)
    assert figures.drift_s_per_day == pytest.approx(2.0)
    assert figures.drift_min_per_month == pytest.approx(1.0)
    assert figures.sleep_clock_accuracy_ppm is None
    assert any("2.00 s/day, 1.00 min/month" in line for line in describe_declared(figures))


def test_declared_for_other_roles_is_worst_case_only() -> None:
    figures = declared_figures(31.0, "usb_fs")
    assert figures.worst_case_ppm == 31.0
    assert figures.sleep_clock_accuracy_ppm is None
    assert figures.drift_s_per_day is None
    assert describe_declared(figures) == (
        "worst-case frequency error over temperature and life: ±31 ppm",
    )


def test_declared_vectorised() -> None:
    figures = declared_figures(np.array([15.0, 45.0]), "ble_sleep")
    np.testing.assert_array_equal(figures.sleep_clock_accuracy_ppm, [20.0, 50.0])
    np.testing.assert_array_equal(figures.worst_case_ppm, [15.0, 45.0])


def test_docstring_examples() -> None:
    # The examples in the module's docstrings are part of its documentation; keep them true.
    import doctest

    import picker.declared

    result = doctest.testmod(picker.declared)
    assert result.attempted >= 3
    assert result.failed == 0
