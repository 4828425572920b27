"""picker.physics.capacitors against IEC 60063 and brute-force pair searches."""

from __future__ import annotations

import itertools

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from picker.physics import capacitors

PF = 1e-12

# IEC 60063:2015 Table 1 (from memory): the E24 values that are NOT the two-digit
# rounding of 10^(i/24); the standard kept these older values.
_E24_EXCEPTIONS = {2.7, 3.0, 3.3, 3.6, 3.9, 4.3, 4.7, 8.2}


def test_e24_is_the_rounded_geometric_series_with_the_published_exceptions() -> None:
    significands = capacitors.series_significands("E24")
    assert len(significands) == 24
    geometric = np.round(10 ** (np.arange(24) / 24), 1)
    differs = {s for s, g in zip(significands, geometric, strict=True) if abs(s - g) > 1e-9}
    assert differs == _E24_EXCEPTIONS
    # and each exception is within one step of 0.1 of the geometric value
    for s, g in zip(significands, geometric, strict=True):
        assert abs(s - g) <= 0.1 + 1e-9


def test_e12_and_e6_are_every_other_value() -> None:
    # IEC 60063: each series is every other value of the next finer one.
    e24 = capacitors.series_significands("E24")
    assert capacitors.series_significands("E12") == e24[::2]
    assert capacitors.series_significands("E6") == e24[::4]
    assert capacitors.series_significands("e12") == e24[::2]
    with pytest.raises(ValueError, match="unknown capacitor series 'E48'"):
        capacitors.series_significands("E48")  # type: ignore[arg-type]


def test_standard_values_span_one_to_one_hundred_picofarads() -> None:
    values = capacitors.standard_values("E12")
    assert values[0] == 1 * PF and values[-1] == 100 * PF
    assert 22e-12 in values and 8.2e-12 in values and 82e-12 in values
    assert len(values) == 2 * 12 + 1
    assert np.all(np.diff(values) > 0)
    assert len(capacitors.standard_values("E24", 10 * PF, 47 * PF)) == 17


def test_ideal_external_capacitance_hand_calculation() -> None:
    # 2·(CL − C_stray) − C_pin: 2·(12 − 2.5) − 1.5 = 17.5 pF (for equal caps).
    assert capacitors.ideal_external_capacitance(12 * PF, 2.5 * PF, 1.5 * PF) == pytest.approx(
        17.5 * PF
    )
    np.testing.assert_allclose(
        capacitors.ideal_external_capacitance(np.array([12, 6]) * PF, 2.5 * PF, 1.5 * PF),
        [17.5 * PF, 5.5 * PF],
    )


def test_equal_pair_hand_calculation() -> None:
    # 17.5 pF ideal → nearest E12 18 pF → CL = (18 + 1.5)/2 + 2.5 = 12.25 pF.
    pair = capacitors.choose_equal_pair(12 * PF, 2.5 * PF, 1.5 * PF)
    assert pair.cap_a_f == pair.cap_b_f == 18 * PF
    assert pair.board_cl_f == pytest.approx(12.25 * PF)
    assert pair.ideal_f == pytest.approx(17.5 * PF)
    assert bool(pair.realisable)
    # 8.9 pF target → ideal 11.3 pF → E12 gives 12 pF, E24 gives 11 pF
    e12 = capacitors.choose_equal_pair(8.9 * PF, 2.5 * PF, 1.5 * PF, "E12")
    e24 = capacitors.choose_equal_pair(8.9 * PF, 2.5 * PF, 1.5 * PF, "E24")
    assert (e12.cap_a_f, e24.cap_a_f) == (12e-12, 11e-12)


def test_not_realisable_is_flagged() -> None:
    # ideal ≤ 0 (pins and stray already exceed CL) and ideal below 1 pF are flagged
    pair = capacitors.choose_equal_pair(
        np.array([4.0, 3.9, 12.0]) * PF, 3 * PF, np.array([5.0, 1.5, 1.5]) * PF
    )
    assert pair.realisable.tolist() == [False, False, True]
    assert pair.ideal_f[0] < 0 and 0 < pair.ideal_f[1] < 1 * PF
    unequal = capacitors.choose_unequal_pair(
        np.array([4.0, 3.9, 12.0]) * PF, 3 * PF, np.array([5.0, 1.5, 1.5]) * PF
    )
    assert unequal.realisable.tolist() == [False, False, True]


def _brute_force_unequal(
    target: float, stray: float, pin: float, values: np.ndarray, max_ratio: float
) -> float:
    best = np.inf
    for a, b in itertools.combinations_with_replacement(values, 2):
        if b / a > max_ratio * (1 + 1e-9):
            continue
        cl = (a + pin) * (b + pin) / (a + b + 2 * pin) + stray
        best = min(best, abs(cl - target))
    return float(best)


@settings(deadline=None)  # timing varies on shared CI machines
@given(target=st.floats(4.0, 20.0), stray=st.floats(0.5, 3.0), pin=st.floats(0.5, 5.0))
def test_pair_choices_against_brute_force(target: float, stray: float, pin: float) -> None:
    values = capacitors.standard_values("E12")
    target_f, stray_f, pin_f = target * PF, stray * PF, pin * PF
    equal = capacitors.choose_equal_pair(target_f, stray_f, pin_f)
    unequal = capacitors.choose_unequal_pair(target_f, stray_f, pin_f)
    # equal pair: standard values, and no other equal pair lands closer
    assert equal.cap_a_f in values and equal.cap_b_f == equal.cap_a_f
    equal_errors = np.abs((values + pin_f) / 2 + stray_f - target_f)
    assert abs(equal.board_cl_f - target_f) == pytest.approx(equal_errors.min(), abs=1e-18)
    if not bool(unequal.realisable):
        return
    # unequal pair: standard values, the best of all N² pairs within the ratio limit,
    # and never worse than the equal pair
    assert unequal.cap_a_f in values and unequal.cap_b_f in values
    assert unequal.cap_a_f <= unequal.cap_b_f <= 2.0 * unequal.cap_a_f * (1 + 1e-9)
    brute = _brute_force_unequal(target_f, stray_f, pin_f, values, 2.0)
    assert abs(unequal.board_cl_f - target_f) == pytest.approx(brute, abs=2e-18)
    assert abs(unequal.board_cl_f - target_f) <= abs(equal.board_cl_f - target_f) + 2e-18
    board = (
        (unequal.cap_a_f + pin_f)
        * (unequal.cap_b_f + pin_f)
        / (unequal.cap_a_f + unequal.cap_b_f + 2 * pin_f)
    )
    assert unequal.board_cl_f == pytest.approx(board + stray_f, rel=1e-12)


def test_unequal_pair_example() -> None:
    # 12 pF target, 2.5 pF stray, 1.5 pF pins: the best E12 pair is 15 + 22 pF
    # (16.5·23.5/40 + 2.5 = 12.194 pF, 0.056 pF off against the equal pair's 0.25 pF).
    pair = capacitors.choose_unequal_pair(12 * PF, 2.5 * PF, 1.5 * PF)
    assert (pair.cap_a_f, pair.cap_b_f) == (15e-12, 22e-12)
    assert pair.board_cl_f == pytest.approx((16.5 * 23.5 / 40 + 2.5) * PF)


def test_capacitor_tolerance_absolute_below_ten_picofarads() -> None:
    # Common practice: below ~10 pF ceramic caps carry ±0.1/0.25/0.5 pF, above a percentage.
    np.testing.assert_allclose(
        capacitors.capacitor_tolerance_f(np.array([6.8, 10.0, 22.0]) * PF, 0.05),
        [0.25 * PF, 0.5 * PF, 1.1 * PF],
    )
    assert capacitors.capacitor_tolerance_f(4.7 * PF, 0.05, 0.1 * PF) == pytest.approx(0.1 * PF)


def test_scalar_and_array_inputs() -> None:
    targets = np.array([6.0, 8.0, 12.5, 18.0]) * PF
    for chooser in (capacitors.choose_equal_pair, capacitors.choose_unequal_pair):
        vector = chooser(targets, 2 * PF, 1.5 * PF)
        assert vector.cap_a_f.shape == (4,) and vector.realisable.shape == (4,)
        for i, target in enumerate(targets):
            single = chooser(target, 2 * PF, 1.5 * PF)
            assert np.ndim(single.cap_a_f) == 0
            assert single.cap_a_f == vector.cap_a_f[i] and single.cap_b_f == vector.cap_b_f[i]
        grid = chooser(np.stack([targets, targets]), 2 * PF, 1.5 * PF)
        assert grid.board_cl_f.shape == (2, 4)


def test_empty_input() -> None:
    for chooser in (capacitors.choose_equal_pair, capacitors.choose_unequal_pair):
        pair = chooser(np.array([]), 2 * PF, 1.5 * PF)
        assert pair.cap_a_f.shape == (0,) and pair.realisable.shape == (0,)
