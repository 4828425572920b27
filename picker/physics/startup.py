"""Start-up time of the oscillation from noise (small-signal estimate)."""

from __future__ import annotations

import numpy as np

from picker.physics._arrays import ArrayLike, FloatArray, to_float


def startup_time_constant(l1: ArrayLike, rneg: ArrayLike, r1: ArrayLike) -> FloatArray:
    """Time constant of the exponential growth of the oscillation amplitude.

    Parameters
    ----------
    l1 : motional inductance [H]
    rneg : negative resistance of the circuit, Re(Zc) (its magnitude is used) [ohm]
    r1 : motional resistance [ohm]

    Returns
    -------
    tau : growth time constant [s]; ``inf`` where |Rneg| ≤ R1 (it cannot start); NaN where
        an input is NaN

    Notes
    -----
    The motional current grows as exp(t/τ) with τ = 2·L1 / (|Rneg| − R1): the net negative
    resistance −(|Rneg| − R1) in a series RLC gives the envelope exp(−R·t/(2·L1))
    (Vittoz 2010, ch. 3).

    Examples
    --------
    >>> print(f"{float(startup_time_constant(0.02, -400.0, 80.0)) * 1e6:.0f} µs")
    125 µs
    """
    excess = np.abs(np.asarray(rneg, dtype=np.float64)) - np.asarray(r1, dtype=np.float64)
    l1_a = np.asarray(l1, dtype=np.float64)
    with np.errstate(divide="ignore"):
        tau = np.where(excess > 0.0, 2.0 * l1_a / np.where(excess > 0.0, excess, 1.0), np.inf)
    tau = np.asarray(np.where(np.isnan(excess) | np.isnan(l1_a), np.nan, tau), dtype=np.float64)
    return to_float(tau)


def startup_time(
    l1: ArrayLike, rneg: ArrayLike, r1: ArrayLike, ratio: ArrayLike = 1e6
) -> FloatArray:
    """Estimated time for the amplitude to grow from noise to its final value.

    Parameters
    ----------
    l1 : motional inductance [H]
    rneg : negative resistance of the circuit, Re(Zc) [ohm]
    r1 : motional resistance [ohm]
    ratio : final amplitude over initial (noise) amplitude [1]; 1e6 is 1 µV to 1 V

    Returns
    -------
    t : start-up time [s]; ``inf`` where it cannot start

    Notes
    -----
    t ≈ τ·ln(V_final/V_noise) — an estimate: the growth slows as the amplitude limits
    (Vittoz 2010, ch. 3). For ratio 1e6 this is about 13.8·τ.
    """
    tau = startup_time_constant(l1, rneg, r1)
    result = np.asarray(tau * np.log(np.asarray(ratio, dtype=np.float64)), dtype=np.float64)
    return to_float(result)
