"""picker.physics.estimates: typical values (common practice) and the masks that flag them."""

from __future__ import annotations

import numpy as np
import pytest

from picker.physics import estimates

PF = 1e-12
FF = 1e-15


def test_cut_is_inferred_only_when_missing() -> None:
    # below 1 MHz a part without a cut is a tuning fork (common practice)
    cut, inferred = estimates.infer_cut([32768.0, 16e6, 16e6, 100e3], ["", "", "SC", None])
    assert cut.tolist() == ["tuning_fork", "AT", "SC", "tuning_fork"]
    assert inferred.tolist() == [True, True, False, True]


def test_catalog_values_win_and_masks_say_what_was_estimated() -> None:
    result = estimates.estimate_motional_capacitances(
        freq_hz=[16e6, 16e6, 16e6, 32768.0],
        package=["3225", "3225", "3225", "3215"],
        mode="fundamental",
        cut="",
        c0_f=[1.8 * PF, np.nan, np.nan, np.nan],
        c1_f=[4 * FF, np.nan, np.nan, np.nan],
        l1_h=[np.nan, np.nan, 0.02, np.nan],
    )
    assert result.c0_f[0] == 1.8 * PF and result.c1_f[0] == 4 * FF
    assert result.c0_estimated.tolist() == [False, True, True, True]
    assert result.c1_estimated.tolist() == [False, True, False, True]
    assert result.estimated.tolist() == [False, True, True, True]
    # C1 from L1 is exact, not an estimate: C1 = 1/((2π·16 MHz)²·0.02 H) = 4.947 fF
    assert result.c1_f[2] == pytest.approx(1 / ((2 * np.pi * 16e6) ** 2 * 0.02), rel=1e-12)
    assert result.cut.tolist() == ["AT", "AT", "AT", "tuning_fork"]


def test_typical_values_lie_in_the_ranges_of_the_trade() -> None:
    # Common practice (estimates, from memory): AT-cut fundamentals have C1 of a few fF up
    # to ~30 fF and C0/C1 of roughly 200–500; tuning forks C0 ≈ 1 pF (0.5–2) and
    # C1 ≈ 2–4 fF; a third overtone's C1 is C1_fundamental/9.
    packages = ["HC-49/US", "5032", "3225", "2520", "2016", "1612", "UNKNOWN"]
    at = estimates.estimate_motional_capacitances(np.full(len(packages), 16e6), packages)
    assert np.all((at.c1_f >= 1 * FF) & (at.c1_f <= 30 * FF))
    assert np.all((at.c0_f / at.c1_f >= 150) & (at.c0_f / at.c1_f <= 600))
    assert np.all(np.diff(at.c1_f[:-1]) <= 0)  # larger packages carry larger C1
    fork = estimates.estimate_motional_capacitances(np.full(3, 32768.0), ["3215", "2012", "1610"])
    assert np.all((fork.c0_f >= 0.5 * PF) & (fork.c0_f <= 2 * PF))
    assert np.all((fork.c1_f >= 2 * FF) & (fork.c1_f <= 4 * FF))
    overtone = estimates.estimate_motional_capacitances(
        [48e6, 48e6], ["3225", "3225"], ["fundamental", "overtone3"]
    )
    assert overtone.c1_f[1] == pytest.approx(overtone.c1_f[0] / 9)
    assert overtone.c0_f[1] == overtone.c0_f[0]


def test_package_names_are_normalised() -> None:
    assert estimates.normalise_package(["hc-49/us", " 3225", None, np.nan]).tolist() == [
        "HC-49/US",
        "3225",
        "",
        "",
    ]
    lower = estimates.estimate_motional_capacitances(16e6, "hc-49/us")
    upper = estimates.estimate_motional_capacitances(16e6, "HC-49/US")
    assert lower.c1_f == upper.c1_f


def test_overtone_order() -> None:
    assert estimates.overtone_order(
        ["fundamental", "overtone3", "overtone5", "", "Overtone3"]
    ).tolist() == [
        1,
        3,
        5,
        1,
        3,
    ]


def test_typical_drive_levels() -> None:
    # From memory, for estimates only: tuning forks 0.5–1 µW; AT-cut SMD 100–300 µW.
    drive = estimates.typical_max_drive_level_w(
        ["3215", "3225", "1612"], ["tuning_fork", "AT", "AT"]
    )
    assert 0.5e-6 <= drive[0] <= 1e-6
    assert 100e-6 <= drive[1] <= 300e-6 and 100e-6 <= drive[2] <= 300e-6
    assert drive[2] <= drive[1]


def test_scalar_and_array_inputs() -> None:
    single = estimates.estimate_motional_capacitances(16e6, "3225")
    assert np.ndim(single.c1_f) == 0 and bool(single.c1_estimated)
    vector = estimates.estimate_motional_capacitances(
        np.array([16e6, 32768.0]), np.array(["3225", "3215"])
    )
    assert vector.c0_f.shape == (2,)
    assert vector.c1_f[0] == single.c1_f
    assert np.ndim(estimates.typical_max_drive_level_w("3225", "AT")) == 0


def test_empty_catalog() -> None:
    empty_f, empty_o = np.array([]), np.array([], dtype=object)
    result = estimates.estimate_motional_capacitances(
        empty_f, empty_o, empty_o, empty_o, empty_f, empty_f, empty_f
    )
    assert (
        result.c0_f.shape == (0,) and result.c1_estimated.shape == (0,) and result.cut.shape == (0,)
    )
    assert estimates.typical_max_drive_level_w(empty_o, empty_o).shape == (0,)
    assert estimates.normalise_package(empty_o).shape == (0,)
