"""analyze_parts against the published formulas, computed independently in each test.

Sources: Butterworth–Van Dyke model and pulling (IEC 60122-1); Pierce small-signal network
(Vittoz, Degrauwe & Bitz, IEEE JSSC 23(3), 1988; Vittoz, "Low-Power Crystal and MEMS
Oscillators", Springer 2010, ch. 3); tuning-fork parabola β = −0.034 ± 0.006 ppm/°C²,
T0 = 25 ± 5 °C (typical data-sheet figures, from memory); aging log law of MIL-PRF-55310;
IEC 60063 E12 values.
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from picker.analysis import analyze_parts
from tests.picker.sample_parts import brief, part, table

TWO_PI = 2.0 * math.pi


def lossless_rneg(omega: float, gm: float, cg: float, cd: float, c3: float) -> float:
    """Re(Zc) = −gm·Cg·Cd / ((gm·C3)² + ω²·(Cg·Cd + C3·(Cg+Cd))²)  (Vittoz 2010, ch. 3)."""
    k = cg * cd + c3 * (cg + cd)
    return -gm * cg * cd / ((gm * c3) ** 2 + (omega * k) ** 2)


def lossless_gm_crit(omega: float, r1: float, cg: float, cd: float, c3: float) -> float:
    """gm_crit = ω²·R1·Cg·Cd·(1 + C3/Cg + C3/Cd)²  (Vittoz 2010, ch. 3)."""
    return omega**2 * r1 * cg * cd * (1 + c3 / cg + c3 / cd) ** 2


def exact_lossless_gm_crit(omega: float, r1: float, cg: float, cd: float, c3: float) -> float:
    """Root of Re(Zc) = −R1 on the rising branch, lossless: clearing the denominator of the
    closed form gives R1·C3²·gm² − Cg·Cd·gm + R1·ω²·K² = 0, K = Cg·Cd + C3·(Cg + Cd); the
    smaller root. The textbook gm_crit above drops the (gm·C3)² term and is ~1 % lower."""
    k = cg * cd + c3 * (cg + cd)
    a, b, c = r1 * c3**2, -cg * cd, r1 * omega**2 * k**2
    return (-b - math.sqrt(b * b - 4 * a * c)) / (2 * a)


def vittoz_example_brief():  # type: ignore[no-untyped-def]
    # Caps fixed at 18 pF with no pin or stray capacitance, so Cg = Cd = 18 pF, C3 = C0.
    return brief(
        amplifier={"gm": "17 mA/V", "pin_capacitance": "0 pF", "swing": "1 V"},
        board={
            "stray_capacitance": "0 pF",
            "stray_uncertainty": "0 pF",
            "fixed_caps": ["18 pF", "18 pF"],
        },
    )


def test_gain_ratio_and_margin_differ_near_gm_opt() -> None:
    # DESIGN §4 worked example: 16 MHz, R1 = 80 Ω, C0 = 7 pF, Cg = Cd = 18 pF,
    # gm = 17 mA/V: gain ratio gm/gm_crit ≈ 20.5 but margin |Rneg|/R1 ≈ 3.9.
    parts = table([part("EX", esr_ohm=80.0, c0_f=7e-12, load_capacitance_f=9e-12)])
    row = analyze_parts(parts, vittoz_example_brief()).iloc[0]
    omega = TWO_PI * 16e6
    # 20.5 comes from the textbook gm_crit; the exact root gives 20.3 (see above).
    assert 17e-3 / lossless_gm_crit(omega, 80.0, 18e-12, 18e-12, 7e-12) == pytest.approx(
        20.5, abs=0.05
    )
    assert row["gain_margin"] == pytest.approx(20.5, rel=0.015)
    assert row["negative_resistance_margin"] == pytest.approx(3.9, abs=0.05)
    assert row["negative_resistance_ohm"] == pytest.approx(
        lossless_rneg(omega, 17e-3, 18e-12, 18e-12, 7e-12), rel=1e-9
    )
    assert row["negative_resistance_ohm"] < 0
    assert row["gm_critical_s"] == pytest.approx(
        exact_lossless_gm_crit(omega, 80.0, 18e-12, 18e-12, 7e-12), rel=1e-9
    )


def test_gm_crit_equal_caps_shortcut() -> None:
    # For Cg = Cd = 2·CL and C3 = C0: gm_crit = 4·R1·ω²·(C0 + CL)²  (Vittoz 2010, ch. 3).
    parts = table([part("EX", esr_ohm=50.0, c0_f=3e-12, load_capacitance_f=9e-12)])
    row = analyze_parts(parts, vittoz_example_brief()).iloc[0]
    omega = TWO_PI * 16e6
    assert row["load_capacitance_f"] == pytest.approx(9e-12)
    shortcut = 4 * 50.0 * omega**2 * (3e-12 + 9e-12) ** 2
    assert lossless_gm_crit(omega, 50.0, 18e-12, 18e-12, 3e-12) == pytest.approx(shortcut)
    assert row["gm_critical_s"] == pytest.approx(shortcut, rel=0.01)
    assert row["gm_critical_s"] == pytest.approx(
        exact_lossless_gm_crit(omega, 50.0, 18e-12, 18e-12, 3e-12), rel=1e-9
    )


def test_rneg_ceiling_and_never_start() -> None:
    # |Rneg|max = Cg·Cd / (2·ω·C3·(Cg·Cd + C3·(Cg+Cd)))  (Vittoz 2010, ch. 3): a part with
    # R1 above it can never start.
    omega = TWO_PI * 16e6
    cg = cd = 18e-12
    c3 = 7e-12
    ceiling = cg * cd / (2 * omega * c3 * (cg * cd + c3 * (cg + cd)))
    parts = table(
        [
            part("BELOW", esr_ohm=0.9 * ceiling, c0_f=c3, load_capacitance_f=9e-12),
            part("ABOVE", esr_ohm=1.1 * ceiling, c0_f=c3, load_capacitance_f=9e-12),
        ]
    )
    out = analyze_parts(parts, vittoz_example_brief())
    assert out["negative_resistance_max_ohm"].to_numpy() == pytest.approx(
        [ceiling, ceiling], rel=1e-6
    )
    assert out["can_never_start"].tolist() == [False, True]


def test_series_resonance_recovered_from_nominal_at_spec_load() -> None:
    # Lossless load resonance fL = fs·√(1 + C1/(C0 + CL)) (IEC 60122-1); the part's nominal is
    # fL at its specified CL, so fs = f_nom / √(1 + C1/(C0 + CL)). R1 moves the zero-phase
    # point by about (ω·R1·(C0+CL))²·D: with R1 = 1 Ω that is < 1e-4 ppm, with 60 Ω ~0.2 ppm.
    parts = table(
        [
            part("P", c0_f=2e-12, c1_f=5e-15, load_capacitance_f=8e-12, esr_ohm=1.0),
            part("R", c0_f=2e-12, c1_f=5e-15, load_capacitance_f=8e-12, esr_ohm=60.0),
        ]
    )
    out = analyze_parts(parts, brief())
    row = out.iloc[0]
    expected = 16e6 / math.sqrt(1 + 5e-15 / 10e-12)
    assert row["fs_hz"] == pytest.approx(expected, rel=1e-9)
    assert out.iloc[1]["fs_hz"] == pytest.approx(expected, rel=1e-6)
    # fp = fs·√(1 + C1/C0); Q = 1/(2π·fs·R1·C1); L1 = 1/((2π·fs)²·C1)
    assert row["fp_hz"] == pytest.approx(expected * math.sqrt(1 + 5e-15 / 2e-12), rel=1e-9)
    assert row["q"] == pytest.approx(1 / (TWO_PI * expected * 1.0 * 5e-15), rel=1e-9)
    assert row["l1_h"] == pytest.approx(1 / ((TWO_PI * expected) ** 2 * 5e-15), rel=1e-9)


def test_e12_pair_lands_closest_and_unequal_when_better() -> None:
    # CL 8 pF, stray 2 pF, pin 1 pF: ideal equal value 2·(8 − 2) − 1 = 11 pF (DESIGN §4),
    # between E12 10 and 12 pF. Equal 10: 5.5 + 2 = 7.5 pF; equal 12: 6.5 + 2 = 8.5 pF;
    # 10 + 12: 11·13/24 + 2 = 7.958 pF, the closest, so the unequal pair is chosen.
    parts = table([part("P")])
    row = analyze_parts(parts, brief()).iloc[0]
    assert (row["cap_a_f"], row["cap_b_f"]) == pytest.approx((10e-12, 12e-12))
    assert row["ideal_cap_f"] == pytest.approx(11e-12)
    assert row["load_capacitance_f"] == pytest.approx(11 * 13 / 24 * 1e-12 + 2e-12)
    assert row["cg_f"] == pytest.approx(11e-12)
    assert row["c3_f"] == pytest.approx(4e-12)  # C0 + stray
    assert bool(row["caps_realisable"])


def test_caps_not_realisable_when_stray_eats_the_load() -> None:
    # CL 4 pF, stray 3 pF, pin 2 pF: ideal 2·(4 − 3) − 2 = 0 pF: nothing to fit.
    parts = table([part("P", load_capacitance_f=4e-12)])
    b = brief(
        amplifier={"gm": "10 mA/V", "pin_capacitance": "2 pF"},
        board={"stray_capacitance": "3 pF"},
    )
    assert not bool(analyze_parts(parts, b).iloc[0]["caps_realisable"])


def test_pulling_matches_first_order_iec_formula() -> None:
    # Part specified at 12 pF on a board presenting 9 pF (fixed 18 pF caps, no pin/stray):
    # Δf/f ≈ C1/2·(1/(C0+CL_board) − 1/(C0+CL_spec))  (IEC 60122-1), here
    # 5e-15/2·(1/11e-12 − 1/14e-12) = 48.7 ppm; the exact zero-phase value agrees to < 1 %.
    parts = table([part("P", load_capacitance_f=12e-12)])
    row = analyze_parts(parts, vittoz_example_brief()).iloc[0]
    first_order = 5e-15 / 2 * (1 / 11e-12 - 1 / 14e-12) * 1e6
    assert first_order == pytest.approx(48.7, abs=0.05)
    assert row["pulling_ppm"] == pytest.approx(first_order, rel=0.01)
    # Trim sensitivity S = −C1/(2·(C0 + CL)²) at the board CL, in ppm/pF (IEC 60122-1).
    assert row["trim_sensitivity_ppm_per_pf"] == pytest.approx(
        -5e-15 / (2 * (11e-12) ** 2) * 1e6 * 1e-12, rel=1e-9
    )


def test_series_calibrated_part_runs_off_by_the_load_offset() -> None:
    # A series-calibrated part in a Pierce circuit runs at its load resonance, D(CL) =
    # C1/(2·(C0 + CL)) above fs (IEC 60122-1): with CL 9 pF, 5e-15/(2·11e-12) = 227 ppm.
    parts = table([part("S", series_calibrated=True)])
    row = analyze_parts(parts, vittoz_example_brief()).iloc[0]
    assert row["fs_hz"] == pytest.approx(16e6)
    assert row["pulling_ppm"] == pytest.approx(5e-15 / (2 * 11e-12) * 1e6, rel=0.01)
    assert math.isnan(row["spec_load_capacitance_f"])


def test_drive_level_formula() -> None:
    # P = R1·(π·f·Vpp·(C0 + CL))²/2 at the board CL (DESIGN §4).
    parts = table([part("P", esr_ohm=80.0)])
    b = brief(amplifier={"gm": "10 mA/V", "pin_capacitance": "1 pF", "swing": "1.2 V"})
    row = analyze_parts(parts, b).iloc[0]
    cl = row["load_capacitance_f"]
    assert row["drive_level_w"] == pytest.approx(
        80.0 * (math.pi * 16e6 * 1.2 * (2e-12 + cl)) ** 2 / 2, rel=1e-9
    )


def test_error_budget_terms_for_an_at_cut_part() -> None:
    # AT-cut: temperature term = rated stability; aging over 10 years by the MIL-PRF-55310
    # log law fitted to the first year, A = X/ln(365·B + 1), B = 0.1/day:
    # X·ln(0.1·3652.5 + 1)/ln(37.5) = 1.6288·X. Total = sum of the five terms.
    parts = table([part("P", tolerance_ppm=10.0, stability_ppm=15.0, aging_ppm=3.0)])
    row = analyze_parts(parts, brief()).iloc[0]
    assert row["error_tolerance_ppm"] == pytest.approx(10.0)
    assert row["error_temperature_ppm"] == pytest.approx(15.0)
    days = 10 * 365.25
    assert row["error_aging_ppm"] == pytest.approx(
        3.0 * math.log(0.1 * days + 1) / math.log(36.5 + 1), rel=1e-6
    )
    assert row["error_aging_ppm"] == pytest.approx(1.63 * 3.0, rel=0.01)
    terms = [
        row[f"error_{k}_ppm"] for k in ("tolerance", "temperature", "aging", "pulling", "spread")
    ]
    assert row["error_total_ppm"] == pytest.approx(sum(abs(t) for t in terms))
    assert row["error_rss_ppm"] == pytest.approx(math.sqrt(sum(t * t for t in terms)))
    assert row["budget_headroom_ppm"] == pytest.approx(100.0 - row["error_total_ppm"])


def test_spread_is_trim_sensitivity_times_load_uncertainty() -> None:
    # Spread ≈ |S|·ΔCL (DESIGN §4). Fixed 18 pF caps at 5 % (0.9 pF each) in series give
    # ΔCL = 0.45 pF, plus 0.5 pF stray uncertainty = 0.95 pF; S at 9 pF with C0 2 pF:
    # 5e-15/(2·(11e-12)²) = 20.66 ppm/pF → 19.6 ppm to first order. D = C1/(2(C0+CL)) is
    # convex, so the larger excursion (CL − ΔCL) is D(8.05 pF) − D(9 pF) = 21.5 ppm.
    parts = table([part("P", load_capacitance_f=9e-12)])
    b = brief(
        amplifier={"gm": "10 mA/V", "pin_capacitance": "0 pF"},
        board={
            "stray_capacitance": "0 pF",
            "stray_uncertainty": "0.5 pF",
            "fixed_caps": ["18 pF", "18 pF"],
        },
    )
    row = analyze_parts(parts, b).iloc[0]

    def offset(cl: float) -> float:
        return 5e-15 / (2 * (2e-12 + cl)) * 1e6

    assert row["error_spread_ppm"] == pytest.approx(offset(8.05e-12) - offset(9e-12), rel=1e-6)
    assert row["error_spread_ppm"] == pytest.approx(20.66 * 0.95, rel=0.1)


def test_tuning_fork_parabola_worst_case_over_the_brief_range() -> None:
    # β = −0.034 ± 0.006 ppm/°C², T0 = 25 ± 5 °C: at −40 °C the worst is β = −0.040 with
    # T0 = 30 °C: 0.040·70² = 196 ppm (at 85 °C: 0.040·65² = 169 ppm, smaller).
    parts = table(
        [
            part(
                "TF",
                freq_hz=32768.0,
                cut="",
                esr_ohm=50e3,
                c0_f=np.nan,
                c1_f=np.nan,
                drive_level_w=np.nan,
                load_capacitance_f=7e-12,
                package="3215",
                stability_ppm=np.nan,
            )
        ]
    )
    b = brief(frequency="32.768 kHz", amplifier={"gm": "20 uA/V", "pin_capacitance": "1 pF"})
    row = analyze_parts(parts, b).iloc[0]
    assert row["error_temperature_ppm"] == pytest.approx(196.0, rel=1e-6)
    assert str(row["cut"]) == "tuning_fork"
    assert bool(row["cut_estimated"]) and bool(row["c0_estimated"]) and bool(row["c1_estimated"])
    assert bool(row["drive_level_estimated"])
    assert row["drive_rating_w"] == pytest.approx(0.5e-6)  # typical tuning-fork maximum


def test_estimates_flag_only_missing_fields() -> None:
    parts = table([part("GIVEN"), part("MISSING", c0_f=np.nan, c1_f=np.nan)])
    out = analyze_parts(parts, brief())
    assert out["c0_estimated"].tolist() == [False, True]
    assert out["c1_estimated"].tolist() == [False, True]
    assert out.index.equals(parts.index)


def test_c1_from_catalog_l1_is_not_an_estimate() -> None:
    # L1 = 1/(ω²·C1) ⇒ C1 = 1/((2π·f)²·L1).
    l1 = 1 / ((TWO_PI * 16e6) ** 2 * 4e-15)
    parts = table([part("L", c1_f=np.nan, l1_h=l1)])
    row = analyze_parts(parts, brief()).iloc[0]
    assert row["c1_f"] == pytest.approx(4e-15, rel=1e-9)
    assert not bool(row["c1_estimated"])


def test_gm_settings_choose_the_lowest_that_meets_the_margin() -> None:
    b = brief(
        amplifier={
            "gm": {"low": "0.5 mA/V", "medium": "2 mA/V", "high": "8 mA/V"},
            "pin_capacitance": "0 pF",
        },
        board={"stray_capacitance": "0 pF", "fixed_caps": ["18 pF", "18 pF"]},
    )
    parts = table(
        [part("EASY", esr_ohm=20.0), part("HARD", esr_ohm=70.0), part("NONE", esr_ohm=400.0)]
    )
    out = analyze_parts(parts, b)
    omega = TWO_PI * 16e6
    expected = []
    for r1 in (20.0, 70.0, 400.0):
        chosen = None
        for name, gm in (("low", 0.5e-3), ("medium", 2e-3), ("high", 8e-3)):
            if -lossless_rneg(omega, gm, 18e-12, 18e-12, 2e-12) / r1 >= 5:
                chosen = name
                break
        expected.append(chosen)
    got = [None if isinstance(v, float) else v for v in out["drive_setting"].tolist()]
    assert got == expected
    assert expected[0] != expected[1]  # the catalog exercises two different settings
    assert expected[2] is None
    assert out["amplifier_form"].astype(str).tolist() == ["gm_settings"] * 3


def test_gm_crit_max_form_reports_the_ratio() -> None:
    b = brief(amplifier={"gm_crit_max": "1 mA/V", "pin_capacitance": "1 pF"})
    row = analyze_parts(table([part("P")]), b).iloc[0]
    assert row["gain_margin"] == pytest.approx(1e-3 / row["gm_critical_s"])
    assert row["form_margin_required"] == 1.0
    assert math.isnan(row["negative_resistance_ohm"])


def test_max_esr_table_interpolates_and_never_extrapolates() -> None:
    # Table 6 pF: 80 Ω, 8 pF: 60 Ω, 12 pF: 40 Ω. At CL 10 pF, linear: 60 + (40−60)·2/4 = 50 Ω.
    b = brief(
        amplifier={
            "max_esr": {"6 pF": "80 ohm", "8 pF": "60 ohm", "12 pF": "40 ohm"},
            "pin_capacitance": "1 pF",
        }
    )
    parts = table(
        [
            part("IN", load_capacitance_f=10e-12, esr_ohm=40.0),
            part("EDGE", load_capacitance_f=12e-12, esr_ohm=40.0),
            part("OUT", load_capacitance_f=4e-12, esr_ohm=40.0),
        ]
    )
    out = analyze_parts(parts, b)
    assert out["max_esr_ohm"].iloc[0] == pytest.approx(50.0)
    assert out["form_margin"].iloc[0] == pytest.approx(50.0 / 40.0)
    assert out["max_esr_ohm"].iloc[1] == pytest.approx(40.0)
    assert out["outside_esr_table"].tolist() == [False, False, True]
    assert math.isnan(out["max_esr_ohm"].iloc[2])


def test_stated_negative_resistance_recovers_the_chip_gm() -> None:
    # The chip states |Rneg| = 500 Ω at CL 9 pF. A part analysed in exactly that configuration
    # (Cg = Cd = 18 pF, no pin/stray, C3 = C0) must show Rneg = −500 Ω again, and the gm found
    # must satisfy the lossless closed form on its lower branch (below gm_opt).
    b = brief(
        amplifier={
            "negative_resistance": {"resistance": "500 ohm", "load_capacitance": "9 pF"},
            "pin_capacitance": "0 pF",
        },
        board={"stray_capacitance": "0 pF", "fixed_caps": ["18 pF", "18 pF"]},
    )
    row = analyze_parts(table([part("P", load_capacitance_f=9e-12, esr_ohm=50.0)]), b).iloc[0]
    omega = TWO_PI * 16e6
    assert row["negative_resistance_ohm"] == pytest.approx(-500.0, rel=1e-6)
    assert lossless_rneg(omega, row["gm_s"], 18e-12, 18e-12, 2e-12) == pytest.approx(
        -500.0, rel=1e-6
    )
    assert row["gm_s"] < row["gm_optimum_s"]
    assert row["negative_resistance_margin"] == pytest.approx(10.0, rel=1e-6)


def test_internal_caps_choose_the_nearest_code() -> None:
    # Codes per pin 8, 12, 16 pF with 1 pF pin and 2 pF stray give board CL 6.5, 8.5, 10.5 pF;
    # a part specified at 8 pF gets the 12 pF code (8.5 pF, the nearest).
    b = brief(
        amplifier={
            "gm": "10 mA/V",
            "pin_capacitance": "1 pF",
            "internal_caps": {"codes": {"0": "8 pF", "1": "12 pF", "2": "16 pF"}},
        }
    )
    row = analyze_parts(table([part("P")]), b).iloc[0]
    assert str(row["internal_cap_code"]) == "1"
    assert row["load_capacitance_f"] == pytest.approx(8.5e-12)
    assert math.isnan(row["cap_a_f"])  # no external capacitors
    assert str(row["caps_source"]) == "internal"


def test_vectorised_over_many_parts_same_as_one_by_one() -> None:
    rng = np.random.default_rng(7)  # seeded random generator: reproducible parts
    rows = [
        part(f"P{i}", esr_ohm=float(rng.uniform(20, 150)), c0_f=float(rng.uniform(1e-12, 4e-12)))
        for i in range(50)
    ]
    parts = table(rows)
    together = analyze_parts(parts, brief())
    alone = analyze_parts(parts.iloc[[17]], brief())
    for name in ("negative_resistance_ohm", "error_total_ppm", "pulling_ppm", "gm_critical_s"):
        assert together[name].iloc[17] == pytest.approx(alone[name].iloc[0], rel=1e-12)


def test_one_step_inversion_matches_the_iterated_physics() -> None:
    # analyze_parts inverts the nominal with one exact-resonance correction; the physics
    # module iterates to convergence. They must agree to 1e-9 even for a third overtone with
    # a high ESR (where the closed form is several ppm off), and the pulling must equal
    # physics.crystal.pulling_ppm.
    from picker.physics import crystal

    parts = table(
        [
            part("OT3", freq_hz=100e6, mode="overtone3", c1_f=0.5e-15, c0_f=3e-12, esr_ohm=120.0),
            part("FUND", esr_ohm=150.0, load_capacitance_f=18e-12),
        ]
    )
    b = brief(frequency="100 MHz")
    out = analyze_parts(parts, b, every_frequency=True)
    for i, row in enumerate(out.itertuples()):
        cl = parts["load_capacitance_f"].iloc[i]
        c1, c0, r1 = parts["c1_f"].iloc[i], parts["c0_f"].iloc[i], parts["esr_ohm"].iloc[i]
        f_nom = parts["freq_hz"].iloc[i]
        fs = crystal.series_resonance_from_load(f_nom, r1, c1, c0, cl)
        assert row.fs_hz == pytest.approx(fs, rel=1e-9)
        pulling = crystal.pulling_ppm(fs, r1, c1, c0, row.load_capacitance_f, cl)
        assert row.pulling_ppm == pytest.approx(pulling, abs=1e-3)


def test_max_esr_grid_with_a_c0_axis_is_bilinear() -> None:
    # Rows CL 8/10/12/16 pF, columns C0 2/3/5 pF (a radio-style table; None = unsupported).
    # CL 10, C0 4: between 70 Ω (C0 3) and 50 Ω (C0 5) → 60 Ω. CL 11, C0 4: halfway between
    # CL 10 (60 Ω) and CL 12 ((60 + 40)/2 = 50 Ω) → 55 Ω. CL 16, C0 5: no figure → flagged.
    b = brief(
        amplifier={
            "max_esr": {
                "load_capacitance": ["8 pF", "10 pF", "12 pF", "16 pF"],
                "c0": ["2 pF", "3 pF", "5 pF"],
                "esr": [
                    ["90 ohm", "80 ohm", "60 ohm"],
                    ["80 ohm", "70 ohm", "50 ohm"],
                    ["70 ohm", "60 ohm", "40 ohm"],
                    ["50 ohm", "40 ohm", None],
                ],
            },
            "pin_capacitance": "1 pF",
        }
    )
    parts = table(
        [
            part("A", load_capacitance_f=10e-12, c0_f=4e-12, esr_ohm=30.0),
            part("B", load_capacitance_f=11e-12, c0_f=4e-12, esr_ohm=30.0),
            part("C", load_capacitance_f=16e-12, c0_f=5e-12, esr_ohm=30.0),
            part("D", load_capacitance_f=10e-12, c0_f=6e-12, esr_ohm=30.0),
        ]
    )
    out = analyze_parts(parts, b)
    assert out["max_esr_ohm"].iloc[0] == pytest.approx(60.0)
    assert out["max_esr_ohm"].iloc[1] == pytest.approx(55.0)
    assert out["outside_esr_table"].tolist() == [False, False, True, True]
    from picker.rank import rank_analysis

    ranking = rank_analysis(out, b)
    reason = ranking.reasons(ranking.row("D"))[0]
    assert reason.startswith("the chip's ESR table gives no figure at CL 10 pF with C0 6 pF")


def test_equal_caps_kept_when_an_unequal_pair_gains_little() -> None:
    # CL 7 pF, stray 2 pF, pin 1.5 pF: ideal 2·(7 − 2) − 1.5 = 8.5 pF. Equal E12 8.2 pF:
    # 9.7/2 + 2 = 6.85 pF (0.15 pF low); the closest unequal pair 6.8 + 12 pF:
    # 8.3·13.5/21.8 + 2 = 7.14 pF (0.14 pF high) gains only 0.01 pF: keep 8.2 + 8.2 pF.
    b = brief(amplifier={"gm": "10 mA/V", "pin_capacitance": "1.5 pF"})
    row = analyze_parts(table([part("P", load_capacitance_f=7e-12)]), b).iloc[0]
    assert (row["cap_a_f"], row["cap_b_f"]) == pytest.approx((8.2e-12, 8.2e-12))
    assert row["load_capacitance_f"] == pytest.approx(6.85e-12)


def test_parts_at_other_frequencies_carry_catalog_figures_only() -> None:
    parts = table([part("HERE"), part("ELSEWHERE", freq_hz=25e6, c0_f=float("nan"))])
    out = analyze_parts(parts, brief())
    here, elsewhere = out.iloc[0], out.iloc[1]
    assert np.isfinite(here["negative_resistance_ohm"])
    assert math.isnan(elsewhere["negative_resistance_ohm"])
    assert elsewhere["frequency_hz"] == 25e6 and elsewhere["esr_ohm"] == 60.0
    assert str(elsewhere["amplifier_form"]) == "gm"
    full = analyze_parts(parts, brief(), every_frequency=True)
    assert np.isfinite(full.iloc[1]["negative_resistance_ohm"])
    assert list(out.columns) == list(full.columns)
    for name in ("negative_resistance_ohm", "error_total_ppm", "cap_a_f"):
        assert out[name].iloc[0] == full[name].iloc[0]
