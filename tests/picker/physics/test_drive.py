"""picker.physics.drive against a hand calculation and the power ngspice puts into R1."""

from __future__ import annotations

import numpy as np
import pytest

from picker.physics import crystal, drive
from tests.picker.physics.reference_parts import CRYSTALS
from tests.reference.ngspice import Sweep, run_ac, spice_number

PF = 1e-12


def test_hand_calculation() -> None:
    # P = R1·(π·f·Vpp·(C0 + CL))²/2 (IEC 60122-1 drive level; crystal makers' application
    # notes): 80 Ω, 16 MHz, 1.2 Vpp, 2 + 10 pF → 80·(π·16e6·1.2·12e-12)²/2 = 20.96 µW.
    assert drive.drive_level(80.0, 16e6, 1.2, 2 * PF, 10 * PF) == pytest.approx(20.955e-6, rel=1e-4)


def test_scales_as_swing_squared_and_with_r1() -> None:
    base = drive.drive_level(80.0, 16e6, 1.0, 2 * PF, 10 * PF)
    np.testing.assert_allclose(
        drive.drive_level(
            np.array([80.0, 160.0, 80.0]), 16e6, np.array([2.0, 1.0, 1.0]), 2 * PF, 10 * PF
        ),
        [4 * base, 2 * base, base],
        rtol=1e-12,
    )
    assert np.ndim(base) == 0


def test_ngspice_power_in_the_motional_resistance() -> None:
    # ngspice AC: the crystal in series with its CL, driven at the load-resonance frequency;
    # the power in R1 is |I(R1)|²·R1/2 for a peak phasor, and Vpp = 2·|V across the crystal|.
    # Exactly, P = R1·Vpk²/(2·|Zm|²) with Zm = R1 + jX the motional arm at fL. The
    # published formula takes |Zm| ≈ 1/(ω(C0+CL)), so it exceeds the true power by the
    # factor ω²(C0+CL)²·|Zm|² = 1 + O(x²), x = ω(C0+CL)·R1: conservative, and within 0.3 %
    # for a typical fundamental (x ≈ 0.03).
    lines, sweeps = [], []
    frequencies = []
    excesses: dict[str, float] = {}
    for k, part in enumerate(CRYSTALS):
        fl = float(crystal.load_resonance_frequency(part.fs, part.r1, part.c1, part.c0, part.cl))
        frequencies.append(fl)
        lines += [
            f"V{k} s{k} 0 DC 0 AC 1",
            f"CL{k} s{k} x{k} {spice_number(part.cl)}",
            f"R{k} x{k} a{k} {spice_number(part.r1)}",
            f"L{k} a{k} b{k} {spice_number(part.l1)}",
            f"C{k} b{k} 0 {spice_number(part.c1)}",
            f"C0{k} x{k} 0 {spice_number(part.c0)}",
        ]
        sweeps.append(Sweep(part.name, fl, fl, 1, (f"x{k}", f"a{k}")))
    results = run_ac("\n".join(lines), sweeps)
    for k, part in enumerate(CRYSTALS):
        v = results[part.name].voltages
        v_crystal, v_inner = v[f"x{k}"][0], v[f"a{k}"][0]
        power = abs((v_crystal - v_inner) / part.r1) ** 2 * part.r1 / 2
        omega = 2 * np.pi * frequencies[k]
        z_motional = part.r1 + 1j * (omega * part.l1 - 1 / (omega * part.c1))
        assert power == pytest.approx(
            part.r1 * abs(v_crystal) ** 2 / (2 * abs(z_motional) ** 2), rel=1e-6
        )
        ours = drive.drive_level(part.r1, frequencies[k], 2 * abs(v_crystal), part.c0, part.cl)
        excess = (omega * (part.c0 + part.cl) * abs(z_motional)) ** 2
        assert ours / power == pytest.approx(excess, rel=1e-6), part.name
        assert ours >= power
        excesses[part.name] = excess
    assert excesses["at_4m_hc49"] - 1 < 3e-3
