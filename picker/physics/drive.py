"""Drive level: the power the crystal dissipates in its motional resistance."""

from __future__ import annotations

import numpy as np

from picker.physics._arrays import ArrayLike, FloatArray, to_float


def drive_level(
    r1: ArrayLike, f: ArrayLike, vpp: ArrayLike, c0: ArrayLike, cl: ArrayLike
) -> FloatArray:
    """Power dissipated in the crystal.

    Parameters
    ----------
    r1 : motional resistance [ohm]
    f : operating frequency [Hz]
    vpp : peak-to-peak voltage across the crystal [V]
    c0 : shunt capacitance [F]
    cl : load capacitance [F]

    Returns
    -------
    p : drive level [W]

    Notes
    -----
    At load resonance the motional current equals the current through C0 + CL, so with
    I_rms = ω·(C0 + CL)·Vpp/(2√2): P = R1·I_rms² = R1·(π·f·Vpp·(C0 + CL))² / 2
    (IEC 60122-1 drive-level definition; the form given in crystal makers' application
    notes, common practice).

    Examples
    --------
    >>> print(f"{float(drive_level(80.0, 16e6, 1.2, 2e-12, 10e-12)) * 1e6:.2f} µW")
    20.96 µW
    """
    r1_a = np.asarray(r1, dtype=np.float64)
    current_term = np.pi * np.asarray(f, dtype=np.float64) * np.asarray(vpp, dtype=np.float64)
    current_term = current_term * (
        np.asarray(c0, dtype=np.float64) + np.asarray(cl, dtype=np.float64)
    )
    result = r1_a * current_term**2 / 2.0
    return to_float(result)
