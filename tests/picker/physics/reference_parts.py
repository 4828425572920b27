"""Invented crystals spanning the catalog's range, for the reference comparisons.

No value here comes from a data sheet: they are round, plausible figures for each kind of
part (common practice, estimates), from a 32.768 kHz tuning fork to a 100 MHz third
overtone, including a deliberately lossy stress case (low Q) where R1 visibly moves the
zero-phase frequency.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np


@dataclass(frozen=True)
class ReferenceCrystal:
    """Motional parameters (SI) of an invented part and the load it is used with."""

    name: str
    fs: float  # series resonance [Hz]
    r1: float  # motional resistance [ohm]
    c1: float  # motional capacitance [F]
    c0: float  # shunt capacitance [F]
    cl: float  # load capacitance [F]

    @property
    def l1(self) -> float:
        return 1.0 / ((2 * np.pi * self.fs) ** 2 * self.c1)


CRYSTALS: tuple[ReferenceCrystal, ...] = (
    ReferenceCrystal("fork_32k768", 32768.0, 50e3, 3.0e-15, 1.2e-12, 9e-12),
    ReferenceCrystal("at_4m_hc49", 4.0e6, 60.0, 18e-15, 5.0e-12, 18e-12),
    ReferenceCrystal("at_16m_3225", 16.0e6, 80.0, 5e-15, 2.0e-12, 10e-12),
    ReferenceCrystal("at_32m_2016", 32.0e6, 60.0, 3e-15, 1.3e-12, 8e-12),
    ReferenceCrystal("at_27m_stress_high_esr", 27.0e6, 250.0, 6e-15, 4.0e-12, 6e-12),
    ReferenceCrystal("ot3_100m", 100.0e6, 100.0, 0.6e-15, 2.5e-12, 10e-12),
)
