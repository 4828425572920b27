"""picker.physics.startup against a transient ngspice simulation of a linear Pierce stage."""

from __future__ import annotations

import numpy as np
import pytest

from picker.physics import crystal, pierce, startup
from tests.reference.ngspice import run_transient, spice_number

PF = 1e-12
FF = 1e-15


def test_time_constant_hand_calculation() -> None:
    # τ = 2·L1/(|Rneg| − R1) (Vittoz 2010, ch. 3): 2·0.02 H/(400 − 80) Ω = 125 µs.
    assert startup.startup_time_constant(0.02, -400.0, 80.0) == pytest.approx(125e-6, rel=1e-12)
    # the sign of Rneg is not used: the magnitude is what beats R1
    assert startup.startup_time_constant(0.02, 400.0, 80.0) == pytest.approx(125e-6, rel=1e-12)


def test_cannot_start_gives_infinite_times() -> None:
    tau = startup.startup_time_constant(
        np.array([0.02, 0.02, 0.02]), np.array([-400.0, -80.0, -50.0]), 80.0
    )
    assert tau[0] == pytest.approx(125e-6) and np.isinf(tau[1]) and np.isinf(tau[2])
    assert np.isinf(startup.startup_time(0.02, -50.0, 80.0))


def test_startup_time_is_tau_times_log_ratio() -> None:
    # 1 µV to 1 V: ln(1e6) = 13.8 time constants (the design notes' "≈ 14·τ", an estimate).
    tau = startup.startup_time_constant(0.02, -400.0, 80.0)
    assert startup.startup_time(0.02, -400.0, 80.0) == pytest.approx(tau * np.log(1e6), rel=1e-12)
    assert startup.startup_time(0.02, -400.0, 80.0) / tau == pytest.approx(13.8, abs=0.05)
    assert startup.startup_time(0.02, -400.0, 80.0, ratio=1e3) == pytest.approx(tau * np.log(1e3))


def test_scalar_and_array_inputs() -> None:
    l1 = np.array([0.02, 7863.0, 0.001])
    rneg = np.array([-400.0, -300e3, -90.0])
    r1 = np.array([80.0, 50e3, 100.0])
    scalars = [startup.startup_time(a, b, c) for a, b, c in zip(l1, rneg, r1, strict=True)]
    assert all(np.ndim(v) == 0 for v in scalars)
    np.testing.assert_allclose(startup.startup_time(l1, rneg, r1), scalars, rtol=1e-12)
    assert startup.startup_time_constant(l1, rneg, r1).shape == (3,)


def test_ngspice_transient_growth_matches_the_time_constant() -> None:
    # ngspice transient of the linear small-signal Pierce loop (VCCS gm, Cg, Cd, C3 and the
    # motional arm R1–L1–C1 between gate and drain), started from a small inductor current.
    # The envelope of the motional current grows as exp(t/τ); its fitted τ must match
    # 2·L1/(|Rneg| − R1) with Rneg = Re(Zc) at the load-resonance frequency, within 1 %
    # (the formula treats Zc as constant near resonance). A C1 of 30 fF keeps τ at ~150
    # cycles so the simulation is short; the formula does not depend on Q being huge.
    fs, r1, c1, c0, stray, cap, gm = 16e6, 80.0, 30 * FF, 2 * PF, 1 * PF, 18 * PF, 5e-3
    l1 = float(crystal.motional_inductance(fs, c1))
    c3 = c0 + stray
    fl = float(
        crystal.load_resonance_frequency(
            fs, r1, c1, c0, pierce.board_load_capacitance(cap, cap, stray)
        )
    )
    rneg = pierce.negative_resistance(2 * np.pi * fl, gm, cap, cap, c3)
    tau = float(startup.startup_time_constant(l1, rneg, r1))
    netlist = "\n".join(
        [
            f"G1 d 0 g 0 {spice_number(gm)}",
            f"CG g 0 {spice_number(cap)}",
            f"CD d 0 {spice_number(cap)}",
            f"C3 g d {spice_number(c3)}",
            f"RM g a {spice_number(r1)}",
            f"LM a b {spice_number(l1)} ic=1e-6",
            f"CM b d {spice_number(c1)}",
        ]
    )
    t, values = run_transient(netlist, step=1 / fl / 100, stop=4 * tau, vectors=["i(LM)"])
    current = values["i(LM)"]
    peaks = (current[1:-1] > current[:-2]) & (current[1:-1] > current[2:])
    t_peak, i_peak = t[1:-1][peaks], current[1:-1][peaks]
    window = (t_peak > tau) & (t_peak < 3.5 * tau)
    assert window.sum() > 100
    slope = np.polyfit(t_peak[window], np.log(i_peak[window]), 1)[0]
    assert 1 / slope == pytest.approx(tau, rel=0.01)
