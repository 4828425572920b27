"""Interface presets and the CAN bit-timing tolerance, against the standards' figures."""

from __future__ import annotations

from fractions import Fraction

import numpy as np
import pytest

from picker.presets import (
    CLOCK_ROLES,
    PRESETS,
    CanBitTiming,
    PresetError,
    can_tolerance_conditions,
    can_tolerance_ppm,
    find_preset,
    preset_names,
    preset_table,
)

# (name, budget ppm, text the clause must cite, clock role, frequency Hz or None)
# Sources, from memory of the standards' wording:
# - USB 2.0 Specification §7.1.11: full-speed 12.000 Mb/s ±0.25 % (= 2500 ppm),
#   high-speed 480.00 Mb/s ±0.05 % (= 500 ppm).
# - IEEE 802.3 clause 14 (10BASE-T): 10 Mb/s ±0.01 % (= 100 ppm);
#   clauses 24–25 (100BASE-TX): 125 MBd ±50 ppm.
# - Bluetooth Core Specification Vol 6 Part B §4.2: active clock ±50 ppm, sleep clock
#   ±500 ppm (worst case).
# - RTC ±1 min/month: derived, 60 s / (30 days × 86400 s/day) = 23.148 ppm.
EXPECTED = [
    ("usb_fs", 2500.0, "USB 2.0 Specification §7.1.11", "usb_fs", None),
    ("usb_hs", 500.0, "USB 2.0 Specification §7.1.11", "usb_hs", None),
    ("10base_t", 100.0, "IEEE 802.3 clause 14", "ethernet", None),
    ("100base_tx", 50.0, "IEEE 802.3 clauses 24–25", "ethernet", None),
    ("ble_active", 50.0, "Vol 6 Part B §4.2", "ble_active", None),
    ("ble_sleep", 500.0, "Vol 6 Part B §4.2", "ble_sleep", 32768.0),
    ("rtc", 60.0 / (30 * 86400) * 1e6, "60 s in a 30-day month", "rtc", 32768.0),
]


@pytest.mark.parametrize(("name", "budget", "clause", "role", "frequency"), EXPECTED)
def test_preset_budget_clause_role(
    name: str, budget: float, clause: str, role: str, frequency: float | None
) -> None:
    preset = find_preset(name)
    assert preset.budget_ppm == pytest.approx(budget, rel=1e-12)
    assert clause in preset.clause
    assert preset.clock_role == role
    assert preset.clock_role in CLOCK_ROLES
    assert preset.frequency_hz == frequency


def test_percent_figures_match_ppm() -> None:
    # The standards state USB and 10BASE-T in percent: 0.25 % = 2500 ppm, 0.05 % = 500
    # ppm, 0.01 % = 100 ppm (1 % = 10 000 ppm by definition).
    assert find_preset("usb_fs").budget_ppm == 0.25 * 1e4
    assert find_preset("usb_hs").budget_ppm == 0.05 * 1e4
    assert find_preset("10base_t").budget_ppm == pytest.approx(0.01 * 1e4)


def test_rtc_budget_is_one_minute_per_month() -> None:
    # 23.1 ppm to one decimal, as quoted in the design notes.
    budget = find_preset("rtc").budget_ppm
    assert budget is not None
    assert round(budget, 1) == 23.1
    assert budget * 1e-6 * 30 * 86400 == pytest.approx(60.0)


def test_can_preset_has_no_fixed_budget() -> None:
    preset = find_preset("can")
    assert preset.budget_ppm is None
    assert "ISO 11898-1" in preset.clause
    assert preset.clock_role == "can"


def test_every_preset_is_tested_and_names_are_unique() -> None:
    assert len(set(preset_names())) == len(PRESETS)
    assert set(preset_names()) == {row[0] for row in EXPECTED} | {"can"}


def test_find_preset_normalises_and_rejects() -> None:
    assert find_preset(" USB-FS ").name == "usb_fs"
    assert find_preset("100BASE_TX").name == "100base_tx"
    with pytest.raises(PresetError, match=r"unknown preset 'usb3'; known presets: usb_fs"):
        find_preset("usb3")


def test_preset_table_rows() -> None:
    rows = preset_table()
    assert [row["name"] for row in rows] == list(preset_names())
    by_name = {row["name"]: row for row in rows}
    assert by_name["usb_fs"]["budget"] == "±2500 ppm"
    assert by_name["rtc"]["budget"] == "±23.15 ppm"
    assert "bit timing" in by_name["can"]["budget"]
    assert all(row["clause"] for row in rows)


# --- CAN -------------------------------------------------------------------------------
# Conditions as stated by Hartwich & Bassemir, "The Configuration of the CAN Bit Timing",
# Bosch, 6th International CAN Conference 1999 (df = each node's relative tolerance):
#   (1) df <= min(PS1, PS2) / (2·(13·NBT − PS2))
#   (2) df <= SJW / (20·NBT)


def test_can_worked_example_16_tq() -> None:
    # NBT 16 tq: sync 1 + prop 4 + PS1 7 + PS2 4, SJW 4. By hand:
    #   (1) min(7, 4) / (2·(13·16 − 4)) = 4 / (2·204) = 4/408 = 0.0098039 -> 9803.9 ppm
    #   (2) 4 / (20·16) = 4/320 = 0.0125 -> 12500 ppm
    # The smaller, 9803.9 ppm (0.98 %), is the tolerance.
    condition_1, condition_2 = can_tolerance_conditions(7, 4, 4, 16)
    assert float(condition_1) == pytest.approx(float(Fraction(4, 408)), rel=1e-15)
    assert float(condition_2) == pytest.approx(float(Fraction(4, 320)), rel=1e-15)
    assert can_tolerance_ppm(7, 4, 4, 16) == pytest.approx(9803.921568627, rel=1e-12)


def test_can_published_example() -> None:
    # Hartwich & Bassemir 1999: Prop_Seg 1, PS1 = PS2 = SJW = 4 (NBT 10 tq) allows
    # 1.58 %. By hand: (1) 4 / (2·(130 − 4)) = 4/252 = 1.587 %; (2) 4/200 = 2 %.
    assert can_tolerance_ppm(4, 4, 4, 10) == pytest.approx(1e6 * 4 / 252, rel=1e-12)
    assert 15800 < can_tolerance_ppm(4, 4, 4, 10) < 15900


def test_can_jump_width_condition_can_dominate() -> None:
    # NBT 25, PS1 = PS2 = 8, SJW 1: (1) 8/(2·(325 − 8)) = 8/634 = 12618 ppm;
    # (2) 1/(20·25) = 1/500 = 2000 ppm -> the jump-width condition decides.
    assert can_tolerance_ppm(8, 8, 1, 25) == pytest.approx(2000.0, rel=1e-12)


def test_can_tolerance_broadcasts() -> None:
    result = can_tolerance_ppm(
        np.array([7, 4, 8]), np.array([4, 4, 8]), np.array([4, 4, 1]), np.array([16, 10, 25])
    )
    assert isinstance(result, np.ndarray)
    np.testing.assert_allclose(result, [1e6 * 4 / 408, 1e6 * 4 / 252, 2000.0], rtol=1e-12)


def test_can_bit_timing_dataclass() -> None:
    timing = CanBitTiming(prop_seg=4, phase_seg1=7, phase_seg2=4, sjw=4)
    assert timing.bit_time_quanta == 16
    assert timing.tolerance_ppm() == pytest.approx(1e6 * 4 / 408)
    assert "±9804 ppm" in timing.describe()
    assert dict(timing.to_mapping()) == {
        "bit_time_quanta": 16,
        "prop_seg": 4,
        "phase_seg1": 7,
        "phase_seg2": 4,
        "sjw": 4,
    }


@pytest.mark.parametrize(
    ("kwargs", "message"),
    [
        ({"prop_seg": 0, "phase_seg1": 7, "phase_seg2": 4, "sjw": 4}, "prop_seg: expected"),
        ({"prop_seg": 4, "phase_seg1": 7, "phase_seg2": 4, "sjw": 5}, "sjw: 5 tq is longer"),
        ({"prop_seg": 4, "phase_seg1": 2, "phase_seg2": 4, "sjw": 3}, "sjw: 3 tq is longer"),
        ({"prop_seg": 4, "phase_seg1": 7, "phase_seg2": True, "sjw": 1}, "phase_seg2"),
    ],
)
def test_can_bit_timing_rejects_impossible(kwargs: dict[str, int], message: str) -> None:
    with pytest.raises(PresetError, match=message):
        CanBitTiming(**kwargs)


def test_docstring_examples() -> None:
    # The examples in the module's docstrings are part of its documentation; keep them true.
    import doctest

    import picker.presets

    result = doctest.testmod(picker.presets)
    assert result.attempted >= 1
    assert result.failed == 0
