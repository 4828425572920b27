"""Oscillator physics: pure numpy functions over arrays, SI units, no I/O.

Every function accepts floats or numpy arrays, broadcasts them, and returns the same shape
(a 0-d input gives a numpy scalar). Units: Hz, rad/s, ohm, S, F, H, W, V, s, °C, ppm.
Every figure is an estimate from data-sheet values; confirm margins with the crystal maker
and with a negative-resistance test on the real board; safety-critical products follow
their own qualification rules and local regulations. NaN in (a figure not given) gives NaN
out, never a silent pass or zero.

Public API (re-exported here)
-----------------------------
crystal.py — Butterworth–Van Dyke crystal (IEC 60122-1, IEC 60444-1)
    series_resonance(l1, c1) -> fs [Hz]
    motional_inductance(fs, c1) -> l1 [H]
    parallel_resonance(fs, c1, c0) -> fp [Hz]
    quality_factor(fs, r1, c1) -> Q
    impedance(f, r1, l1, c1, c0) -> Z [ohm, complex]
    impedance_phase(f, r1, l1, c1, c0) -> arg Z [rad]
    load_resonance_offset(c1, c0, cl) -> C1/(2(C0+CL)) [fraction]
    load_resonance_frequency(fs, r1, c1, c0, cl) -> exact zero-phase fL with CL in series [Hz]
    series_resonance_from_load(f_load, r1, c1, c0, cl) -> fs of a part calibrated at cl [Hz]
    pulling_ppm(fs, r1, c1, c0, cl_board, cl_spec) -> offset from nominal [ppm]
        (cl_spec NaN: series-calibrated, offset from fs)
    pulling_range_ppm(c1, c0, cl_low, cl_high) -> IEC pulling range [ppm]
    trim_sensitivity_ppm_per_pf(c1, c0, cl) -> -C1/(2(C0+CL)^2) [ppm/pF]
    load_resonance_resistance(r1, c0, cl) -> RL = R1(1+C0/CL)^2 [ohm]
pierce.py — Pierce oscillator, small signal (Vittoz, Degrauwe & Bitz, IEEE JSSC 1988)
    board_load_capacitance(cg, cd, stray) -> CL [F]   (cg, cd include pin capacitance)
    pierce_impedance(omega, gm, cg, cd, c3, g1=0, g2=0, g3=0) -> Zc [ohm, complex]
    negative_resistance(omega, gm, cg, cd, c3, g1=0, g2=0, g3=0) -> Re(Zc) [ohm], < 0 good
    critical_transconductance(omega, r1, cg, cd, c3, g1=0, g2=0, g3=0) -> gm_crit [S]
        (exact, losses included; inf when R1 > |Rneg|max)
    optimum_transconductance(omega, cg, cd, c3, g1=0, g2=0, g3=0) -> gm_opt [S]
    max_negative_resistance(omega, cg, cd, c3, g1=0, g2=0, g3=0) -> |Rneg|max [ohm], > 0
    can_start(r1, rneg_max) -> bool
    oscillation_frequency(fs, c1, gm, cg, cd, c3, g1=0, g2=0, g3=0) -> f where Zm + Zc is
        real [Hz]
    steady_state_frequency(fs, r1, c1, cg, cd, c3, g1=0, g2=0, g3=0) -> settled frequency,
        amplifier pulling included (gm settles at gm_crit) [Hz]; NaN if it cannot start
    negative_resistance_margin(rneg, r1) -> M = |Rneg|/R1
    gain_margin(gm, gm_crit) -> gm/gm_crit
    One network, many figures (build the coefficients once; none depends on gm or R1):
    pierce_coefficients(omega, cg, cd, c3, g1=0, g2=0, g3=0) -> PierceCoefficients(a2, a1,
        a0, q2, q1, q0): Re(Zc) = (a2 gm^2 + a1 gm + a0)/(q2 gm^2 + q1 gm + q0)
    pierce_optimum(coefficients) -> PierceOptimum(gm_opt, rneg_max) [S, ohm], the same values
        as optimum_transconductance and max_negative_resistance from one evaluation
    critical_transconductance_from(coefficients, r1) -> gm_crit [S], the same values as
        critical_transconductance
    negative_resistance_from(coefficients, gm) -> Re(Zc) [ohm], negative_resistance to
        rounding
drive.py
    drive_level(r1, f, vpp, c0, cl) -> P [W] (first-order, slightly conservative)
startup.py
    startup_time_constant(l1, rneg, r1) -> tau = 2 L1/(|Rneg|-R1) [s] (inf if it cannot start)
    startup_time(l1, rneg, r1, ratio=1e6) -> tau ln(ratio) [s]
temperature.py
    tuning_fork_drift_ppm(t_c, beta=-0.034, t0=25) -> [ppm]
    tuning_fork_worst_drift_ppm(t_min, t_max, beta=-0.034, beta_spread=0.006, t0=25,
                                t0_spread=5) -> DriftBounds(worst_abs_ppm, lowest_ppm,
                                highest_ppm)
    at_cut_drift_ppm(t_c, angle_deviation_deg=0) -> [ppm]
    at_cut_drift_bounds_ppm(t_min, t_max, angle_deviation_deg=0) -> DriftBounds (exact)
    at_cut_best_angle_deg(t_min, t_max, search_deg=1.0) -> angle minimising worst drift [deg]
    temperature_drift_budget_ppm(is_tuning_fork, stability_ppm, t_min, t_max, beta=nan,
                                 t0=nan, beta_spread=0.006, t0_spread=5) -> [ppm] >= 0
aging.py
    aging_ppm(first_year_ppm, t_s, b_per_day=0.1) -> [ppm]
budget.py
    frequency_error_budget(tolerance_ppm, temperature_ppm, aging_ppm, pulling_ppm,
                           spread_ppm) -> ErrorBudget(tolerance_ppm, temperature_ppm,
                           aging_ppm, pulling_ppm, spread_ppm, total_ppm, rss_ppm)
    load_capacitance_spread_f(cap_a, cap_b, c_pin, tolerance_fraction, stray_uncertainty,
                              absolute_tolerance_f=0.25e-12) -> ±ΔCL [F]
    load_spread_ppm(c1, c0, cl, delta_cl) -> ± spread [ppm]
    clock_error_s(error_ppm, interval_s) -> time gained/lost [s] (RTC s/day, min/month)
capacitors.py — IEC 60063 values; stray across the crystal, pin capacitance per pin
    series_significands(series) -> tuple of one decade
    standard_values(series="E12", low_f=1e-12, high_f=100e-12) -> values [F]
    capacitor_tolerance_f(value_f, tolerance_fraction, absolute_tolerance_f=0.25e-12) -> [F]
    ideal_external_capacitance(cl, stray, c_pin) -> 2(CL - stray) - c_pin [F]
    choose_equal_pair(cl_target, stray, c_pin, series="E12", values_f=None) -> CapacitorPair
    choose_unequal_pair(cl_target, stray, c_pin, series="E12", values_f=None,
                        max_ratio=2.0) -> CapacitorPair
        CapacitorPair(cap_a_f, cap_b_f, board_cl_f, ideal_f, realisable)
estimates.py — typical values, common practice, estimates
    normalise_package(package) -> object array
    overtone_order(mode) -> 1, 3, 5
    infer_cut(freq_hz, cut) -> (cut, inferred mask)
    estimate_motional_capacitances(freq_hz, package, mode="fundamental", cut="",
                                   c0_f=nan, c1_f=nan, l1_h=nan) -> MotionalEstimate(
                                   c0_f, c1_f, c0_estimated, c1_estimated, cut,
                                   cut_inferred; .estimated)
    typical_max_drive_level_w(package, cut) -> [W]
"""

from __future__ import annotations

from picker.physics.aging import aging_ppm
from picker.physics.budget import (
    ErrorBudget,
    clock_error_s,
    frequency_error_budget,
    load_capacitance_spread_f,
    load_spread_ppm,
)
from picker.physics.capacitors import (
    CapacitorPair,
    capacitor_tolerance_f,
    choose_equal_pair,
    choose_unequal_pair,
    ideal_external_capacitance,
    series_significands,
    standard_values,
)
from picker.physics.crystal import (
    impedance,
    impedance_phase,
    load_resonance_frequency,
    load_resonance_offset,
    load_resonance_resistance,
    motional_inductance,
    parallel_resonance,
    pulling_ppm,
    pulling_range_ppm,
    quality_factor,
    series_resonance,
    series_resonance_from_load,
    trim_sensitivity_ppm_per_pf,
)
from picker.physics.drive import drive_level
from picker.physics.estimates import (
    MotionalEstimate,
    estimate_motional_capacitances,
    infer_cut,
    normalise_package,
    overtone_order,
    typical_max_drive_level_w,
)
from picker.physics.pierce import (
    PierceCoefficients,
    PierceOptimum,
    board_load_capacitance,
    can_start,
    critical_transconductance,
    critical_transconductance_from,
    gain_margin,
    max_negative_resistance,
    negative_resistance,
    negative_resistance_from,
    negative_resistance_margin,
    optimum_transconductance,
    oscillation_frequency,
    pierce_coefficients,
    pierce_impedance,
    pierce_optimum,
    steady_state_frequency,
)
from picker.physics.startup import startup_time, startup_time_constant
from picker.physics.temperature import (
    DriftBounds,
    at_cut_best_angle_deg,
    at_cut_drift_bounds_ppm,
    at_cut_drift_ppm,
    temperature_drift_budget_ppm,
    tuning_fork_drift_ppm,
    tuning_fork_worst_drift_ppm,
)

__all__ = [
    "CapacitorPair",
    "DriftBounds",
    "ErrorBudget",
    "MotionalEstimate",
    "PierceCoefficients",
    "PierceOptimum",
    "aging_ppm",
    "at_cut_best_angle_deg",
    "at_cut_drift_bounds_ppm",
    "at_cut_drift_ppm",
    "board_load_capacitance",
    "can_start",
    "capacitor_tolerance_f",
    "choose_equal_pair",
    "choose_unequal_pair",
    "clock_error_s",
    "critical_transconductance",
    "critical_transconductance_from",
    "drive_level",
    "estimate_motional_capacitances",
    "frequency_error_budget",
    "gain_margin",
    "ideal_external_capacitance",
    "impedance",
    "impedance_phase",
    "infer_cut",
    "load_capacitance_spread_f",
    "load_resonance_frequency",
    "load_resonance_offset",
    "load_resonance_resistance",
    "load_spread_ppm",
    "max_negative_resistance",
    "motional_inductance",
    "negative_resistance",
    "negative_resistance_from",
    "negative_resistance_margin",
    "normalise_package",
    "optimum_transconductance",
    "oscillation_frequency",
    "overtone_order",
    "parallel_resonance",
    "pierce_coefficients",
    "pierce_impedance",
    "pierce_optimum",
    "pulling_ppm",
    "pulling_range_ppm",
    "quality_factor",
    "series_resonance",
    "series_resonance_from_load",
    "series_significands",
    "standard_values",
    "startup_time",
    "startup_time_constant",
    "steady_state_frequency",
    "temperature_drift_budget_ppm",
    "trim_sensitivity_ppm_per_pf",
    "tuning_fork_drift_ppm",
    "tuning_fork_worst_drift_ppm",
    "typical_max_drive_level_w",
]
