"""The brief: validation messages, defaults, presets, round trip, demo briefs."""

from __future__ import annotations

import dataclasses
from pathlib import Path
from typing import Any

import pytest
import yaml
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from picker.brief import (
    MAX_BRIEF_BYTES,
    Amplifier,
    Board,
    Brief,
    BriefError,
    Limits,
    Weights,
    brief_to_mapping,
    brief_to_yaml,
    default_brief_path,
    demo_brief_paths,
    load_brief,
    load_brief_mapping,
    parse_brief,
)
from picker.presets import CLOCK_ROLES

# Julian year (365.25 days of 86400 s, the IAU definition pint uses for "year").
YEAR_S = 365.25 * 86400.0


def minimal(**changes: Any) -> dict[str, Any]:
    data: dict[str, Any] = {
        "frequency": "32 MHz",
        "budget": "40 ppm",
        "amplifier": {"gm": "9 mA/V"},
    }
    data.update(changes)
    return data


def error_of(data: object) -> str:
    with pytest.raises(BriefError) as caught:
        parse_brief(data)  # type: ignore[arg-type]
    message = str(caught.value)
    assert "\n" not in message
    return message


# --- values and units -------------------------------------------------------------------


def test_design_example_parses_to_si() -> None:
    text = """
name: Greenhouse sensor node, radio reference
frequency: 32 MHz
budget: 40 ppm
temperature: [-20 degC, 70 degC]
lifetime: 10 year
amplifier:
  gm: 9 mA/V
  pin_capacitance: 1.5 pF
  swing: 1.2 V
  output_resistance: 8 kohm
  bias_resistance: 1 Mohm
board:
  stray_capacitance: 2.5 pF
  stray_uncertainty: 1 pF
  cap_series: E12
  cap_tolerance: 5 %
  fixed_caps: [10 pF, 10 pF]
limits:
  min_margin: 5
  packages: [3225, 2520]
"""
    brief = parse_brief(yaml.safe_load(text))
    assert brief.name == "Greenhouse sensor node, radio reference"
    assert brief.frequency_hz == 32e6
    assert brief.budget_ppm == 40.0
    assert brief.budget_source == "brief"
    assert (brief.temp_min_c, brief.temp_max_c) == (-20.0, 70.0)
    assert brief.lifetime_s == pytest.approx(10 * YEAR_S)
    amplifier = brief.amplifier
    assert amplifier.form == "gm"
    assert amplifier.gm_s == pytest.approx(9e-3)  # 9 mA/V = 9 mS by definition of S
    assert amplifier.pin_capacitance_f == pytest.approx(1.5e-12)
    assert amplifier.swing_v == 1.2
    assert amplifier.output_resistance_ohm == 8e3
    assert amplifier.bias_resistance_ohm == 1e6
    assert brief.board.stray_capacitance_f == pytest.approx(2.5e-12)
    assert brief.board.cap_tolerance == pytest.approx(0.05)
    assert brief.board.fixed_caps_f == pytest.approx((10e-12, 10e-12))
    assert brief.limits.packages == ("3225", "2520")
    assert brief.clock_role == "general"


def test_defaults_are_the_documented_ones() -> None:
    brief = parse_brief(minimal())
    assert brief.name == "Untitled brief"
    assert (brief.temp_min_c, brief.temp_max_c) == (-40.0, 85.0)
    assert brief.lifetime_s == pytest.approx(10 * YEAR_S)
    assert brief.clock_role == "general"
    assert brief.preset is None and brief.can is None
    assert brief.amplifier.pin_capacitance_f == 1.5e-12
    assert brief.amplifier.swing_v == 1.0
    assert brief.amplifier.output_resistance_ohm is None
    assert brief.amplifier.bias_resistance_ohm is None
    assert brief.amplifier.internal_caps is None
    assert brief.board == Board(
        stray_capacitance_f=2e-12,
        stray_uncertainty_f=1e-12,
        cap_series="E12",
        cap_tolerance=0.05,
        cap_tolerance_small_f=0.25e-12,
        fixed_caps_f=None,
    )
    assert brief.limits == Limits(
        min_margin=5.0,
        marginal_band=0.2,
        packages=None,
        lifecycle=("active", "nrnd", ""),
        max_height_mm=None,
        require_qualification=None,
        min_stock=None,
    )
    assert brief.weights == Weights(
        margin=0.3, headroom=0.25, drive=0.1, price=0.15, stock=0.1, lifecycle=0.1
    )
    for key in (
        "name",
        "temperature",
        "lifetime",
        "clock_role",
        "amplifier.pin_capacitance",
        "amplifier.swing",
        "board.stray_capacitance",
        "board.cap_series",
        "limits.min_margin",
        "limits.lifecycle",
        "weights.price",
    ):
        assert key in brief.defaulted
    assert "frequency" not in brief.defaulted


def test_null_means_default() -> None:
    # An editor that clears a field writes null: the stated default applies, as if absent.
    brief = parse_brief(
        minimal(amplifier={"gm": "9 mA/V", "swing": None}, board={"stray_capacitance": None})
    )
    assert brief.amplifier.swing_v == 1.0
    assert brief.board.stray_capacitance_f == 2e-12
    assert "amplifier.swing" in brief.defaulted
    assert error_of(minimal(amplifier={"gm": None})) == (
        "amplifier.gm: expected a transconductance such as '9 mA/V', got nothing"
    )


def test_free_text_loses_control_characters() -> None:
    # A terminal escape in a name must not reach the screen.
    brief = parse_brief(minimal(name="Beacon\x1b[31m  radio\n", limits={"packages": ["32\t25"]}))
    assert brief.name == "Beacon [31m radio"
    assert brief.limits.packages == ("3225",)


def test_given_values_are_not_marked_default() -> None:
    brief = parse_brief(minimal(board={"stray_capacitance": "3 pF"}))
    assert "board.stray_capacitance" not in brief.defaulted
    assert "board.stray_uncertainty" in brief.defaulted


def test_temperature_as_range_text() -> None:
    brief = parse_brief(minimal(temperature="-40 to 105 °C"))
    assert (brief.temp_min_c, brief.temp_max_c) == (-40.0, 105.0)


def test_temperature_in_fahrenheit() -> None:
    # (−40 °F = −40 °C; 185 °F = 85 °C: t_C = (t_F − 32)·5/9)
    brief = parse_brief(minimal(temperature=["-40 °F", "185 °F"]))
    assert brief.temp_min_c == pytest.approx(-40.0)
    assert brief.temp_max_c == pytest.approx(85.0)


def test_comma_separated_lists_from_an_edit_field() -> None:
    brief = parse_brief(
        minimal(
            temperature="-20 °C, 70 °C", limits={"packages": "3225, 2520", "lifecycle": "active"}
        )
    )
    assert (brief.temp_min_c, brief.temp_max_c) == (-20.0, 70.0)
    assert brief.limits.packages == ("3225", "2520")
    assert brief.limits.lifecycle == ("active",)


def test_packages_normalised_like_the_part_table() -> None:
    brief = parse_brief(minimal(limits={"packages": ["hc-49/us", "HC-49 /SMD", 3225, "3225"]}))
    assert brief.limits.packages == ("HC-49/US", "HC-49/SMD", "3225")


def test_lifecycle_unknown_means_not_given() -> None:
    brief = parse_brief(minimal(limits={"lifecycle": ["Active", "unknown"]}))
    assert brief.limits.lifecycle == ("active", "")


def test_other_limits() -> None:
    brief = parse_brief(
        minimal(
            limits={
                "max_height": "0.8 mm",
                "require_qualification": "AEC-Q200",
                "min_stock": 1000,
                "marginal_band": "10 %",
                "min_margin": 10,
            }
        )
    )
    assert brief.limits.max_height_mm == pytest.approx(0.8)
    assert brief.limits.require_qualification == "AEC-Q200"
    assert brief.limits.min_stock == 1000
    assert brief.limits.marginal_band == pytest.approx(0.1)
    assert brief.limits.min_margin == 10


def test_weights_given_and_defaulted() -> None:
    brief = parse_brief(minimal(weights={"price": 0, "margin": 2}))
    assert brief.weights.price == 0
    assert brief.weights.margin == 2
    assert brief.weights.stock == 0.1


# --- amplifier forms --------------------------------------------------------------------


def test_gm_settings_sorted_ascending() -> None:
    brief = parse_brief(
        minimal(amplifier={"gm": {"high": "10 mA/V", "low": "2 mA/V", "medium": "5000 uS"}})
    )
    assert brief.amplifier.form == "gm_settings"
    assert brief.amplifier.gm_s is None
    names = [name for name, _ in brief.amplifier.gm_settings]
    assert names == ["low", "medium", "high"]
    assert brief.amplifier.gm_settings[1][1] == pytest.approx(5e-3)


def test_gm_crit_max() -> None:
    brief = parse_brief(minimal(amplifier={"gm_crit_max": "1.5 µA/V"}))
    assert brief.amplifier.form == "gm_crit_max"
    assert brief.amplifier.gm_crit_max_s == pytest.approx(1.5e-6)


def test_max_esr_simple_table_sorted() -> None:
    brief = parse_brief(
        minimal(amplifier={"max_esr": {"12 pF": "40 ohm", "6 pF": "80 Ω", "8 pF": 60}})
    )
    table = brief.amplifier.max_esr
    assert brief.amplifier.form == "max_esr"
    assert table is not None
    assert table.load_capacitance_f == pytest.approx((6e-12, 8e-12, 12e-12))
    assert table.column() == (80.0, 60.0, 40.0)
    assert not table.has_c0_axis


def test_max_esr_grid_with_c0_axis_and_gaps() -> None:
    grid = {
        "load_capacitance": ["10 pF", "8 pF"],
        "c0": ["3 pF", "2 pF"],
        "esr": [["70 ohm", "80 ohm"], [None, "90 ohm"]],
    }
    table = parse_brief(minimal(amplifier={"max_esr": grid})).amplifier.max_esr
    assert table is not None
    assert table.load_capacitance_f == pytest.approx((8e-12, 10e-12))
    assert table.c0_f == pytest.approx((2e-12, 3e-12))
    # rows by CL ascending, columns by C0 ascending; the gap stays a gap
    assert table.esr_ohm == ((90.0, None), (80.0, 70.0))


def test_max_esr_grid_without_c0() -> None:
    grid = {"load_capacitance": ["6 pF", "9 pF"], "esr": ["80 ohm", "50 ohm"]}
    table = parse_brief(minimal(amplifier={"max_esr": grid})).amplifier.max_esr
    assert table is not None
    assert table.esr_ohm == ((80.0,), (50.0,))


def test_negative_resistance_sign_normalised() -> None:
    for written in ("-450 ohm", "450 ohm"):
        amplifier = parse_brief(
            minimal(
                amplifier={
                    "negative_resistance": {"resistance": written, "load_capacitance": "8 pF"}
                }
            )
        ).amplifier
        assert amplifier.form == "negative_resistance"
        assert amplifier.negative_resistance_ohm == -450.0
        assert amplifier.negative_resistance_cl_f == pytest.approx(8e-12)


def test_internal_caps_range() -> None:
    amplifier = parse_brief(
        minimal(
            amplifier={
                "gm": "9 mA/V",
                "internal_caps": {"range": ["4 pF", "20 pF"], "step": "0.5 pF"},
            }
        )
    ).amplifier
    caps = amplifier.internal_caps
    assert caps is not None
    assert caps.applies_to == "each_pin"
    choices = caps.choices()
    assert len(choices) == 33  # (20 − 4) / 0.5 + 1
    assert choices[0] == ("4 pF", pytest.approx(4e-12))
    assert choices[-1][1] == pytest.approx(20e-12)
    assert choices[1][0] == "4.5 pF"


def test_internal_caps_codes_sorted() -> None:
    caps = parse_brief(
        minimal(
            amplifier={
                "gm": "9 mA/V",
                "internal_caps": {
                    "codes": {2: "10 pF", 0: "4 pF", 1: "6 pF"},
                    "applies_to": "load",
                },
            }
        )
    ).amplifier.internal_caps
    assert caps is not None
    assert caps.applies_to == "load"
    assert [code for code, _ in caps.choices()] == ["0", "1", "2"]


def test_several_forms_need_form_key() -> None:
    both = {"gm": "9 mA/V", "max_esr": {"8 pF": "60 ohm"}}
    assert error_of(minimal(amplifier=both)) == (
        "amplifier: gm and max_esr are both given; add 'form: gm' (or another) to say "
        "which one the analysis uses"
    )
    amplifier = parse_brief(minimal(amplifier={**both, "form": "max_esr"})).amplifier
    assert amplifier.form == "max_esr"
    assert amplifier.gm_s == pytest.approx(9e-3)  # kept, unused by the analysis
    assert amplifier.forms_given() == ("gm", "max_esr")


def test_amplifier_dataclass_checks_its_form() -> None:
    with pytest.raises(BriefError, match=r"amplifier\.form: form 'gm' has no values"):
        Amplifier(form="gm")
    with pytest.raises(BriefError, match="unknown amplifier form"):
        Amplifier(form="magic", gm_s=1e-3)  # type: ignore[arg-type]


# --- presets and CAN ------------------------------------------------------------------


def test_preset_fills_budget_and_role() -> None:
    data = minimal(preset="usb_fs", frequency="24 MHz")
    del data["budget"]
    brief = parse_brief(data)
    # USB 2.0 §7.1.11: full-speed ±0.25 % = 2500 ppm.
    assert brief.budget_ppm == 2500.0
    assert "§7.1.11" in brief.budget_source
    assert brief.clock_role == "usb_fs"
    assert brief.preset == "usb_fs"


def test_explicit_budget_overrides_preset() -> None:
    brief = parse_brief(minimal(preset="ble_active", budget="40 ppm"))
    assert brief.budget_ppm == 40.0
    assert brief.budget_source == "brief"
    assert brief.clock_role == "ble_active"


def test_explicit_budget_equal_to_preset_keeps_clause() -> None:
    brief = parse_brief(minimal(preset="usb_hs", budget="0.05 %"))
    assert brief.budget_ppm == 500.0
    assert "§7.1.11" in brief.budget_source


def test_explicit_role_overrides_preset() -> None:
    brief = parse_brief(minimal(preset="usb_hs", clock_role="general"))
    assert brief.clock_role == "general"


def test_rtc_preset_fills_frequency() -> None:
    data = {"preset": "rtc", "amplifier": {"gm": "10 µA/V"}}
    brief = parse_brief(data)
    assert brief.frequency_hz == 32768.0
    assert "frequency" in brief.defaulted
    # 60 s per 30-day month
    assert brief.budget_ppm == pytest.approx(60 / (30 * 86400) * 1e6)


def test_can_block_gives_budget() -> None:
    data = minimal(can={"bit_time_quanta": 16, "phase_seg1": 7, "phase_seg2": 4, "sjw": 4})
    del data["budget"]
    brief = parse_brief(data)
    # min(7, 4) / (2·(13·16 − 4)) = 4/408 -> 9803.9 ppm (see test_presets.py)
    assert brief.budget_ppm == pytest.approx(1e6 * 4 / 408)
    assert brief.clock_role == "can"
    assert brief.can is not None and brief.can.prop_seg == 4
    assert "NBT 16 tq" in brief.budget_source


def test_can_block_with_prop_seg_only() -> None:
    data = minimal(preset="can", can={"prop_seg": 1, "phase_seg1": 4, "phase_seg2": 4, "sjw": 4})
    del data["budget"]
    assert parse_brief(data).budget_ppm == pytest.approx(1e6 * 4 / 252)


# --- validation messages ----------------------------------------------------------------


@pytest.mark.parametrize(
    ("data", "message"),
    [
        (
            minimal(amplifier={"gm": "abc"}),
            "amplifier.gm: expected a transconductance such as '9 mA/V', got 'abc'",
        ),
        (minimal(amplifier={"gn": "9 mA/V"}), "amplifier.gn: unknown key; did you mean 'gm'?"),
        (minimal(frequncy="32 MHz"), "frequncy: unknown key; did you mean 'frequency'?"),
        (
            minimal(board={"stray_capacitence": "2 pF"}),
            "board.stray_capacitence: unknown key; did you mean 'stray_capacitance'?",
        ),
        (
            minimal(limits={"min_margn": 5}),
            "limits.min_margn: unknown key; did you mean 'min_margin'?",
        ),
        (
            minimal(amplifier={"gm": "9 mA/V", "qqq": 1}),
            "amplifier.qqq: unknown key; expected one of: form, gm, gm_crit_max, max_esr, "
            "negative_resistance, pin_capacitance, swing, output_resistance, "
            "bias_resistance, internal_caps",
        ),
        (
            minimal(frequency="2 GHz"),
            "frequency: '2 GHz' is outside 1 kHz … 1 GHz, where quartz crystals run",
        ),
        (minimal(budget="-40 ppm"), "budget: must be positive, got '-40 ppm'"),
        (minimal(budget="0 ppm"), "budget: must be positive, got '0 ppm'"),
        (
            minimal(budget="12 pF"),
            "budget: expected a frequency deviation such as '20 ppm', got '12 pF'",
        ),
        (
            minimal(temperature=["85 °C", "-40 °C"]),
            "temperature: the low end 85 °C is above the high end -40 °C; write [low, high]",
        ),
        (
            minimal(temperature=["-40 °C"]),
            "temperature: expected two temperatures [low, high], got 1 values",
        ),
        (
            minimal(temperature=["-300 °C", "20 °C"]),
            "temperature[0]: must be above -273.15, got '-300 °C' (below absolute zero)",
        ),
        (minimal(amplifier={"gm": "0 mA/V"}), "amplifier.gm: must be positive, got '0 mA/V'"),
        (minimal(amplifier={"gm": "-3 mA/V"}), "amplifier.gm: must be positive, got '-3 mA/V'"),
        (minimal(lifetime="-1 year"), "lifetime: cannot be negative, got '-1 year'"),
        (
            minimal(limits={"min_margin": 0.5}),
            "limits.min_margin: must be at least 1, got '0.5' (below 1 the oscillator cannot "
            "start)",
        ),
        (
            minimal(board={"stray_capacitance": 2}),
            "board.stray_capacitance: '2' needs a unit, e.g. '12 pF' (a bare number is "
            "ambiguous here)",
        ),
        (
            minimal(frequency=32),
            "frequency: '32' needs a unit, e.g. '32 MHz' (a bare number is ambiguous here)",
        ),
        (
            minimal(frequency="32 Hz"),
            "frequency: '32 Hz' is outside 1 kHz … 1 GHz, where quartz crystals run",
        ),
        (
            minimal(lifetime=10),
            "lifetime: '10' needs a unit, e.g. '10 year' (a bare number is ambiguous here)",
        ),
        (
            minimal(board={"cap_series": "E13"}),
            "board.cap_series: expected an IEC 60063 series (E6, E12, E24), got 'E13'; did you "
            "mean 'E12'?",
        ),
        (
            minimal(board={"cap_tolerance": 5}),
            "board.cap_tolerance: '5' is too large (a fraction below 1; write '5 %' or 0.05)",
        ),
        (
            minimal(board={"fixed_caps": ["10 pF"]}),
            "board.fixed_caps: expected two capacitances [Ca, Cb], got 1 values",
        ),
        (
            minimal(board={"fixed_caps": ["10 pF", "abc"]}),
            "board.fixed_caps[1]: expected a capacitance such as '12 pF', got 'abc'",
        ),
        (
            minimal(limits={"lifecycle": ["actve"]}),
            "limits.lifecycle[0]: expected a lifecycle (active, nrnd, obsolete, unknown), got "
            "'actve'; did you mean 'active'?",
        ),
        (
            minimal(limits={"packages": []}),
            "limits.packages: empty list; remove the key to allow any package",
        ),
        (
            minimal(
                weights={
                    key: 0 for key in ("margin", "headroom", "drive", "price", "stock", "lifecycle")
                }
            ),
            "weights: every weight is zero; give at least one a positive weight",
        ),
        (minimal(weights={"price": -1}), "weights.price: cannot be negative, got '-1'"),
        (
            minimal(clock_role="bluetooth"),
            "clock_role: expected a clock role (" + ", ".join(CLOCK_ROLES) + "), got 'bluetooth'",
        ),
        (
            minimal(preset="usb_f"),
            "preset: unknown preset 'usb_f'; did you mean 'usb_fs'? (known: usb_fs, usb_hs, "
            "10base_t, 100base_tx, ble_active, ble_sleep, rtc, can)",
        ),
        (
            minimal(amplifier=5),
            "amplifier: expected a mapping with the chip's oscillator figures, got the value '5'",
        ),
        (
            minimal(amplifier={"pin_capacitance": "1 pF"}),
            "amplifier: no oscillator figure; give one of gm, gm (drive settings), "
            "gm_crit_max, max_esr, negative_resistance",
        ),
        (
            minimal(amplifier={"gm": "9 mA/V", "form": "max_esr"}),
            "amplifier.form: 'max_esr' is named but not given (given: gm)",
        ),
        (
            minimal(amplifier={"gm": {"low": "1 mA/V", "high": "x"}}),
            "amplifier.gm.high: expected a transconductance such as '9 mA/V', got 'x'",
        ),
        (
            minimal(amplifier={"gm": {True: "1 mA/V"}}),
            "amplifier.gm: key True is not text; quote it (YAML reads bare on/off/yes/no as "
            "true/false)",
        ),
        (
            minimal(amplifier={"max_esr": {"8 pF": "60 ohm", "8.0 pF": "50 ohm"}}),
            "amplifier.max_esr: load capacitance 8 pF appears twice",
        ),
        (
            minimal(amplifier={"max_esr": {"8 pF": "-60 ohm"}}),
            "amplifier.max_esr.8 pF: must be positive, got '-60 ohm'",
        ),
        (
            minimal(
                amplifier={"max_esr": {"load_capacitance": ["8 pF", "10 pF"], "esr": ["60 ohm"]}}
            ),
            "amplifier.max_esr.esr: 1 rows for 2 load capacitances",
        ),
        (
            minimal(
                amplifier={
                    "max_esr": {
                        "load_capacitance": ["8 pF"],
                        "c0": ["2 pF", "3 pF"],
                        "esr": [["60 ohm"]],
                    }
                }
            ),
            "amplifier.max_esr.esr[0]: expected 2 ESR value(s), one per C0, got '['60 ohm']'",
        ),
        (
            minimal(amplifier={"negative_resistance": {"resistance": "-1 kohm"}}),
            "amplifier.negative_resistance.load_capacitance: missing",
        ),
        (
            minimal(
                amplifier={
                    "negative_resistance": {"resistance": "0 ohm", "load_capacitance": "8 pF"}
                }
            ),
            "amplifier.negative_resistance.resistance: cannot be zero, got '0 ohm'",
        ),
        (
            minimal(
                amplifier={
                    "gm": "9 mA/V",
                    "internal_caps": {"range": ["20 pF", "4 pF"], "step": "1 pF"},
                }
            ),
            "amplifier.internal_caps.range: the lowest value is above the highest; write "
            "[low, high]",
        ),
        (
            minimal(
                amplifier={
                    "gm": "9 mA/V",
                    "internal_caps": {
                        "range": ["4 pF", "20 pF"],
                        "step": "1 pF",
                        "codes": {0: "4 pF"},
                    },
                }
            ),
            "amplifier.internal_caps: give either range and step, or codes, not both",
        ),
        (
            minimal(amplifier={"gm": "9 mA/V", "swing": "0 V"}),
            "amplifier.swing: must be positive, got '0 V'",
        ),
        (
            minimal(amplifier={"gm": "9 mA/V", "bias_resistance": "-1 Mohm"}),
            "amplifier.bias_resistance: must be positive, got '-1 Mohm'",
        ),
        (
            minimal(can={"bit_time_quanta": 16, "phase_seg1": 7, "phase_seg2": 4}),
            "can.sjw: missing (time quanta)",
        ),
        (
            minimal(can={"bit_time_quanta": 10, "phase_seg1": 7, "phase_seg2": 4, "sjw": 4}),
            "can.bit_time_quanta: 10 tq leaves no propagation segment after sync (1) + "
            "phase_seg1 (7) + phase_seg2 (4)",
        ),
        (
            minimal(
                can={
                    "bit_time_quanta": 17,
                    "prop_seg": 4,
                    "phase_seg1": 7,
                    "phase_seg2": 4,
                    "sjw": 4,
                }
            ),
            "can.bit_time_quanta: 17 tq does not equal 1 + prop_seg + phase_seg1 + phase_seg2 "
            "= 16 tq",
        ),
        (
            minimal(can={"bit_time_quanta": 16, "phase_seg1": 7, "phase_seg2": 4, "sjw": 2.5}),
            "can.sjw: expected time quanta as a whole number, got '2.5'",
        ),
        (
            minimal(can={"bit_time_quanta": 16, "phase_seg1": 7, "phase_seg2": 4, "sjw": 6}),
            "can: sjw: 6 tq is longer than a phase segment (phase_seg1 7, phase_seg2 4); the "
            "jump width may not exceed the shorter phase segment (CAN bit timing rules)",
        ),
    ],
)
def test_validation_message(data: dict[str, Any], message: str) -> None:
    assert error_of(data) == message


def test_can_time_quanta_capped() -> None:
    data = minimal(can={"bit_time_quanta": 100000, "phase_seg1": 7, "phase_seg2": 4, "sjw": 4})
    assert error_of(data) == (
        "can.bit_time_quanta: 100000 tq is more than any CAN controller counts"
    )


def test_missing_required_keys() -> None:
    no_frequency = minimal()
    del no_frequency["frequency"]
    assert error_of(no_frequency) == (
        "frequency: missing; give the clock frequency, e.g. 'frequency: 32 MHz'"
    )
    no_budget = minimal()
    del no_budget["budget"]
    assert error_of(no_budget).startswith(
        "budget: missing; give the total error allowed, e.g. 'budget: 40 ppm', or a preset"
    )
    no_amplifier = minimal()
    del no_amplifier["amplifier"]
    assert error_of(no_amplifier) == (
        "amplifier: missing; describe the chip's oscillator, e.g. 'amplifier: {gm: 9 mA/V}'"
    )
    can_without_timing = minimal(preset="can")
    del can_without_timing["budget"]
    assert error_of(can_without_timing).startswith("can: preset 'can' needs the bit timing")


def test_not_a_mapping() -> None:
    assert error_of([1, 2]) == (
        "the brief must be a mapping of keys such as 'frequency: 32 MHz', got a list"
    )
    assert error_of(None).startswith("the brief is empty")
    assert error_of(minimal(board=["x"])).startswith(
        "board: expected a mapping with the board's figures, got a list"
    )


def test_source_is_named_when_given() -> None:
    with pytest.raises(BriefError) as caught:
        parse_brief(minimal(budget="-1 ppm"), source="mine.yaml")
    assert str(caught.value) == "mine.yaml: budget: must be positive, got '-1 ppm'"
    assert caught.value.key == "budget"


def test_brief_error_is_a_value_error() -> None:
    assert issubclass(BriefError, ValueError)


# --- files ------------------------------------------------------------------------------


def write(tmp_path: Path, text: str, name: str = "brief.yaml") -> Path:
    path = tmp_path / name
    path.write_text(text, encoding="utf-8")
    return path


def test_file_error_names_file_and_line(tmp_path: Path) -> None:
    path = write(
        tmp_path,
        "frequency: 32 MHz\nbudget: 40 ppm\namplifier:\n  swing: 1 V\n  gm: abc\n",
    )
    with pytest.raises(BriefError) as caught:
        load_brief(path)
    assert str(caught.value) == (
        f"{path}:5: amplifier.gm: expected a transconductance such as '9 mA/V', got 'abc'"
    )
    assert caught.value.line == 5


def test_file_unknown_key_line(tmp_path: Path) -> None:
    path = write(tmp_path, "frequency: 32 MHz\nbudget: 40 ppm\namplifier:\n  gn: 9 mA/V\n")
    with pytest.raises(
        BriefError,
        match=r"brief.yaml:4: amplifier.gn: unknown key; did you "
        r"mean 'gm'\?",
    ):
        load_brief(path)


def test_file_list_item_line(tmp_path: Path) -> None:
    path = write(
        tmp_path,
        "frequency: 32 MHz\nbudget: 40 ppm\ntemperature:\n  - -40 °C\n  - hot\n"
        "amplifier: {gm: 9 mA/V}\n",
    )
    with pytest.raises(
        BriefError,
        match=r"brief.yaml:5: temperature\[1\]: expected a "
        r"temperature",
    ):
        load_brief(path)


def test_file_missing(tmp_path: Path) -> None:
    with pytest.raises(BriefError, match=r"nope.yaml: cannot read the brief: No such file"):
        load_brief(tmp_path / "nope.yaml")


def test_file_is_directory(tmp_path: Path) -> None:
    with pytest.raises(BriefError, match="is a directory"):
        load_brief(tmp_path)


def test_file_too_large(tmp_path: Path) -> None:
    path = write(tmp_path, "# " + "x" * MAX_BRIEF_BYTES + "\n")
    with pytest.raises(BriefError, match="larger than 256 KiB"):
        load_brief(path)


def test_file_not_utf8(tmp_path: Path) -> None:
    path = tmp_path / "brief.yaml"
    path.write_bytes(b"name: caf\xe9\n")
    with pytest.raises(BriefError, match="not UTF-8 text"):
        load_brief(path)


def test_file_not_yaml(tmp_path: Path) -> None:
    path = write(tmp_path, "frequency: 32 MHz\nbudget: [40 ppm\namplifier: x\n")
    with pytest.raises(BriefError, match=r"brief.yaml:\d+: not valid YAML"):
        load_brief(path)


def test_file_duplicate_key(tmp_path: Path) -> None:
    path = write(tmp_path, "frequency: 32 MHz\nbudget: 40 ppm\nbudget: 50 ppm\n")
    with pytest.raises(BriefError) as caught:
        load_brief(path)
    assert str(caught.value) == f"{path}:3: budget: duplicate key (first on line 2)"


def test_file_aliases_rejected(tmp_path: Path) -> None:
    path = write(
        tmp_path,
        "frequency: &f 32 MHz\nbudget: 40 ppm\nname: *f\namplifier: {gm: 9 mA/V}\n",
    )
    with pytest.raises(BriefError, match="anchors and aliases are not supported"):
        load_brief(path)


def test_file_nested_too_deeply(tmp_path: Path) -> None:
    # Hostile nesting must give a one-line error, not a RecursionError traceback.
    path = write(tmp_path, "name: " + "[" * 5000 + "]" * 5000 + "\n")
    with pytest.raises(BriefError, match=r"brief.yaml:1: nested more than 16 levels deep"):
        load_brief(path)
    with pytest.raises(BriefError, match="nested more than 16 levels deep"):
        load_brief_mapping(path)


def test_file_empty_and_not_mapping(tmp_path: Path) -> None:
    with pytest.raises(BriefError, match=r"empty.yaml: the brief is empty"):
        load_brief(write(tmp_path, "", "empty.yaml"))
    with pytest.raises(BriefError, match=r"list.yaml: the brief must be a mapping"):
        load_brief(write(tmp_path, "- 1\n- 2\n", "list.yaml"))


def test_load_brief_mapping(tmp_path: Path) -> None:
    path = write(tmp_path, "frequency: 32 MHz\namplifier:\n  gm: abc\n")
    assert load_brief_mapping(path) == {"frequency": "32 MHz", "amplifier": {"gm": "abc"}}
    with pytest.raises(BriefError, match="duplicate key"):
        load_brief_mapping(write(tmp_path, "a: 1\na: 2\n", "dup.yaml"))


# --- writing and round trip --------------------------------------------------------------


def test_mapping_writes_units() -> None:
    brief = parse_brief(
        minimal(
            name="x",
            amplifier={"gm": "9 mA/V", "output_resistance": "8 kohm"},
            board={"stray_capacitance": "2.5 pF", "cap_tolerance_small": "0.1 pF"},
        )
    )
    mapping = brief_to_mapping(brief)
    assert mapping["frequency"] == "32 MHz"
    assert mapping["budget"] == "40 ppm"
    amplifier = mapping["amplifier"]
    assert isinstance(amplifier, dict)
    assert amplifier == {"gm": "9 mA/V", "output_resistance": "8 kΩ"}
    assert mapping["board"] == {"stray_capacitance": "2.5 pF", "cap_tolerance_small": "0.1 pF"}
    assert "limits" not in mapping  # all defaulted: not written


def test_mapping_with_defaults_writes_everything() -> None:
    brief = parse_brief(minimal())
    full = brief_to_mapping(brief, include_defaults=True)
    assert full["temperature"] == ["-40 °C", "85 °C"]
    assert full["lifetime"] == "10 year"
    board = full["board"]
    assert isinstance(board, dict)
    assert board["stray_capacitance"] == "2 pF"
    assert board["cap_tolerance"] == "5 %"
    again = parse_brief(full)
    assert again == dataclasses.replace(brief, defaulted=())


def test_preset_budget_not_written() -> None:
    data: dict[str, Any] = {"preset": "rtc", "amplifier": {"gm_crit_max": "1.5 µA/V"}}
    brief = parse_brief(data)
    mapping = brief_to_mapping(brief)
    assert mapping == {"preset": "rtc", "amplifier": {"gm_crit_max": "1.5 µA/V"}}
    assert parse_brief(mapping) == brief


def test_changed_default_is_written() -> None:
    brief = parse_brief(minimal())
    changed = dataclasses.replace(
        brief, board=dataclasses.replace(brief.board, stray_capacitance_f=3e-12)
    )
    board = brief_to_mapping(changed)["board"]
    assert board == {"stray_capacitance": "3 pF"}


def test_yaml_text_round_trip() -> None:
    brief = load_brief(default_brief_path())
    text = brief_to_yaml(brief)
    assert "temperature: [-40 °C, 85 °C]" in text
    assert parse_brief(yaml.safe_load(text)) == brief


def test_odd_values_round_trip_exactly() -> None:
    brief = parse_brief(
        minimal(
            frequency="32.768123456789 kHz",
            budget="0.123456789012345 ppm",
            amplifier={"gm": "1.23456789012345 mA/V"},
        )
    )
    assert parse_brief(brief_to_mapping(brief)) == brief


# Generated briefs: values drawn as numbers, written as text in a random unit, parsed;
# the parsed brief must survive brief_to_mapping -> YAML text -> parse_brief unchanged.


def _text(value: float, unit: str) -> str:
    return f"{value:.12g} {unit}".strip()


_capacitance = st.sampled_from(["pF", "nF"]).flatmap(
    lambda unit: st.floats(0.1, 40).map(lambda pf: _text(pf / 1000 if unit == "nF" else pf, unit))
)
_gm = st.floats(1e-6, 0.05).map(lambda s: _text(s * 1e3, "mA/V"))
_esr = st.floats(1, 100_000).map(lambda ohm: _text(ohm, "ohm"))


@st.composite
def _amplifier(draw: st.DrawFn) -> dict[str, Any]:
    form = draw(
        st.sampled_from(
            ["gm", "gm_settings", "gm_crit_max", "max_esr", "negative_resistance", "grid"]
        )
    )
    out: dict[str, Any] = {}
    if form == "gm":
        out["gm"] = draw(_gm)
    elif form == "gm_settings":
        names = draw(
            st.lists(
                st.sampled_from(["low", "mid", "high", "3", "max"]),
                min_size=1,
                max_size=4,
                unique=True,
            )
        )
        out["gm"] = {name: draw(_gm) for name in names}
    elif form == "gm_crit_max":
        out["gm_crit_max"] = draw(st.floats(0.1, 100).map(lambda u: _text(u, "µA/V")))
    elif form == "max_esr":
        loads = draw(st.lists(st.integers(10, 400), min_size=1, max_size=5, unique=True))
        out["max_esr"] = {_text(load / 10, "pF"): draw(_esr) for load in loads}
    elif form == "grid":
        loads = draw(st.lists(st.integers(10, 400), min_size=1, max_size=4, unique=True))
        c0s = draw(st.lists(st.integers(5, 80), min_size=1, max_size=3, unique=True))
        grid = [[draw(st.one_of(st.none(), _esr)) for _ in c0s] for _ in loads]
        grid[0][0] = draw(_esr)
        out["max_esr"] = {
            "load_capacitance": [_text(load / 10, "pF") for load in loads],
            "c0": [_text(c0 / 10, "pF") for c0 in c0s],
            "esr": grid,
        }
    else:
        out["negative_resistance"] = {
            "resistance": draw(_esr),
            "load_capacitance": draw(_capacitance),
        }
    if draw(st.booleans()):
        out["pin_capacitance"] = draw(_capacitance)
    if draw(st.booleans()):
        out["swing"] = _text(draw(st.floats(0.05, 5)), "V")
    if draw(st.booleans()):
        out["output_resistance"] = draw(_esr)
    if draw(st.booleans()):
        out["bias_resistance"] = _text(draw(st.floats(0.01, 50)), "Mohm")
    if draw(st.booleans()):
        if draw(st.booleans()):
            low = draw(st.integers(0, 20))
            out["internal_caps"] = {
                "range": [f"{low} pF", f"{low + draw(st.integers(0, 20))} pF"],
                "step": draw(st.sampled_from(["0.25 pF", "0.5 pF", "1 pF"])),
            }
        else:
            out["internal_caps"] = {
                "codes": {str(i): f"{4 + 2 * i} pF" for i in range(draw(st.integers(1, 8)))},
                "applies_to": draw(st.sampled_from(["each_pin", "load"])),
            }
    return out


@st.composite
def _brief_mapping(draw: st.DrawFn) -> dict[str, Any]:
    data: dict[str, Any] = {"amplifier": draw(_amplifier())}
    preset = draw(st.sampled_from([None, "usb_fs", "rtc", "ble_sleep", "can", "100base_tx"]))
    if preset is not None:
        data["preset"] = preset
    if preset == "can" or (draw(st.booleans()) and preset is None):
        ps2 = draw(st.integers(2, 8))
        data["can"] = {
            "prop_seg": draw(st.integers(1, 8)),
            "phase_seg1": draw(st.integers(ps2, 8)),
            "phase_seg2": ps2,
            "sjw": draw(st.integers(1, ps2)),
        }
    if preset not in ("rtc", "ble_sleep") or draw(st.booleans()):
        data["frequency"] = (
            draw(st.sampled_from(["32.768 kHz", "12 MHz", "25 MHz", "32000 kHz"]))
            if draw(st.booleans())
            else _text(draw(st.floats(1.0, 500.0)), "MHz")
        )
    if (preset is None and "can" not in data) or draw(st.booleans()):
        data["budget"] = _text(draw(st.floats(0.01, 50_000)), "ppm")
    if draw(st.booleans()):
        data["name"] = draw(
            st.text(min_size=1, max_size=20).filter(lambda s: any(c.isalnum() for c in s))
        )
    if draw(st.booleans()):
        low = draw(st.floats(-100, 100))
        data["temperature"] = [_text(low, "°C"), _text(low + draw(st.floats(0, 150)), "°C")]
    if draw(st.booleans()):
        data["lifetime"] = _text(draw(st.floats(0, 40)), draw(st.sampled_from(["year", "day"])))
    if draw(st.booleans()):
        data["clock_role"] = draw(st.sampled_from(CLOCK_ROLES))
    board: dict[str, Any] = {}
    if draw(st.booleans()):
        board["stray_capacitance"] = draw(_capacitance)
    if draw(st.booleans()):
        board["cap_series"] = draw(st.sampled_from(["E6", "e12", "E24"]))
    if draw(st.booleans()):
        board["cap_tolerance"] = _text(draw(st.floats(0, 20)), "%")
    if draw(st.booleans()):
        board["fixed_caps"] = [draw(_capacitance), draw(_capacitance)]
    if board:
        data["board"] = board
    limits: dict[str, Any] = {}
    if draw(st.booleans()):
        limits["min_margin"] = draw(st.floats(1, 30))
    if draw(st.booleans()):
        limits["packages"] = draw(
            st.lists(st.sampled_from(["3225", "2520", "hc-49/us"]), min_size=1, max_size=3)
        )
    if draw(st.booleans()):
        limits["lifecycle"] = draw(
            st.lists(
                st.sampled_from(["active", "nrnd", "unknown", "obsolete"]), min_size=1, max_size=4
            )
        )
    if draw(st.booleans()):
        limits["max_height"] = _text(draw(st.floats(0.2, 5)), "mm")
    if draw(st.booleans()):
        limits["min_stock"] = draw(st.integers(0, 100_000))
    if limits:
        data["limits"] = limits
    if draw(st.booleans()):
        data["weights"] = {"price": draw(st.floats(0.01, 5)), "margin": draw(st.floats(0, 5))}
    return data


@settings(max_examples=300, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(_brief_mapping())
def test_round_trip_generated(data: dict[str, Any]) -> None:
    brief = parse_brief(data)
    mapping = brief_to_mapping(brief)
    assert parse_brief(mapping) == brief
    text = brief_to_yaml(brief)
    assert parse_brief(yaml.safe_load(text)) == brief
    full = parse_brief(brief_to_mapping(brief, include_defaults=True))
    assert full == dataclasses.replace(brief, defaulted=())


# --- demo briefs ------------------------------------------------------------------------


def test_at_least_five_demo_briefs_and_default_among_them() -> None:
    paths = demo_brief_paths()
    assert len(paths) >= 5
    assert default_brief_path() in paths


@pytest.mark.parametrize("path", demo_brief_paths(), ids=lambda path: path.name)
def test_demo_brief_parses_and_is_sane(path: Path) -> None:
    brief = load_brief(path)
    assert parse_brief(brief_to_mapping(brief)) == brief
    amplifier = brief.amplifier
    # Sane for real circuits (common practice): stray 1–5 pF, pin 0.5–3 pF, swing 0.3–1.5 V.
    assert 1e-12 <= brief.board.stray_capacitance_f <= 5e-12
    assert 0.5e-12 <= amplifier.pin_capacitance_f <= 3e-12
    assert 0.3 <= amplifier.swing_v <= 1.5
    gms = [gm for _, gm in amplifier.gm_settings] + ([amplifier.gm_s] if amplifier.gm_s else [])
    for gm in gms:
        if brief.frequency_hz < 1e6:
            assert 1e-6 <= gm <= 1e-4  # 32 kHz Pierce: a few to tens of µA/V
        else:
            assert 1e-3 <= gm <= 20e-3  # MCU HF oscillator: about 1–20 mA/V
    text = path.read_text(encoding="utf-8").lower()
    assert "invented" in text


def test_demo_briefs_cover_every_form_and_role() -> None:
    briefs = [load_brief(path) for path in demo_brief_paths()]
    forms = {brief.amplifier.form for brief in briefs}
    assert forms == {"gm", "gm_settings", "gm_crit_max", "max_esr", "negative_resistance"}
    roles = {brief.clock_role for brief in briefs}
    assert {"rtc", "ble_sleep", "ble_active", "usb_fs", "ethernet", "can"} <= roles
    assert any(brief.amplifier.internal_caps is not None for brief in briefs)
    assert any(
        brief.amplifier.output_resistance_ohm and brief.amplifier.bias_resistance_ohm
        for brief in briefs
    )
    assert any(brief.can is not None for brief in briefs)


def test_default_brief_is_the_radio_reference() -> None:
    brief = load_brief(default_brief_path())
    assert brief.frequency_hz == 32e6
    assert brief.budget_ppm == 40.0
    assert (brief.temp_min_c, brief.temp_max_c) == (-40.0, 85.0)
    assert brief.lifetime_s == pytest.approx(10 * YEAR_S)


def test_brief_dataclass_is_frozen_and_keyword_only() -> None:
    brief = Brief(frequency_hz=16e6, budget_ppm=50.0, amplifier=Amplifier(form="gm", gm_s=5e-3))
    with pytest.raises(dataclasses.FrozenInstanceError):
        brief.budget_ppm = 1.0  # type: ignore[misc]
    with pytest.raises(TypeError):
        Brief(16e6, 50.0)  # type: ignore[misc]
