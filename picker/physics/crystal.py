"""The quartz crystal alone: Butterworth–Van Dyke model, resonances, load resonance, pulling.

All inputs are SI (Hz, ohm, F, H); every function accepts floats or numpy arrays and
broadcasts. The model is the motional arm R1–L1–C1 in parallel with the shunt capacitance
C0, as defined in IEC 60122-1 and IEC 60444-1.
"""

from __future__ import annotations

import numpy as np
import numpy.typing as npt

from picker.physics._arrays import (
    ArrayLike,
    ComplexArray,
    FloatArray,
    as_float,
    to_complex,
    to_float,
)

_TWO_PI = 2.0 * np.pi

#: Fixed-point steps of :func:`load_resonance_frequency`: at most this many (the contraction
#: by about C1/(C0+CL) ~ 1e-3 per step reaches double precision in three or four) ...
_LOAD_RESONANCE_MAX_STEPS = 6
#: ... a row stops at the first step that leaves it unchanged; once fewer than one row in
#: this many still moves, only the moving rows are stepped.
_LOAD_RESONANCE_COMPACT_BELOW = 4


def series_resonance(l1: ArrayLike, c1: ArrayLike) -> FloatArray:
    """Series (motional) resonance frequency.

    Parameters
    ----------
    l1 : motional inductance [H]
    c1 : motional capacitance [F]

    Returns
    -------
    fs : series resonance frequency [Hz]

    Notes
    -----
    fs = 1 / (2π·√(L1·C1)) — zero reactance of the motional arm (IEC 60122-1).

    Examples
    --------
    >>> round(float(series_resonance(1.0 / ((2 * np.pi * 16e6) ** 2 * 10e-15), 10e-15)))
    16000000
    """
    return to_float(1.0 / (_TWO_PI * np.sqrt(as_float(l1) * as_float(c1))))


def motional_inductance(fs: ArrayLike, c1: ArrayLike) -> FloatArray:
    """Motional inductance from series resonance and motional capacitance.

    Parameters
    ----------
    fs : series resonance frequency [Hz]
    c1 : motional capacitance [F]

    Returns
    -------
    l1 : motional inductance [H]

    Notes
    -----
    L1 = 1 / ((2π·fs)²·C1), the series-resonance condition solved for L1 (IEC 60122-1).
    """
    omega = _TWO_PI * as_float(fs)
    return to_float(1.0 / (omega**2 * as_float(c1)))


def parallel_resonance(fs: ArrayLike, c1: ArrayLike, c0: ArrayLike) -> FloatArray:
    """Parallel (anti-)resonance frequency of the lossless crystal.

    Parameters
    ----------
    fs : series resonance frequency [Hz]
    c1 : motional capacitance [F]
    c0 : shunt capacitance [F]

    Returns
    -------
    fp : parallel resonance frequency [Hz]

    Notes
    -----
    fp = fs·√(1 + C1/C0): the motional arm's inductive reactance cancels C0
    (IEC 60122-1).
    """
    return to_float(as_float(fs) * np.sqrt(1.0 + as_float(c1) / as_float(c0)))


def quality_factor(fs: ArrayLike, r1: ArrayLike, c1: ArrayLike) -> FloatArray:
    """Quality factor of the motional arm.

    Parameters
    ----------
    fs : series resonance frequency [Hz]
    r1 : motional resistance [ohm]
    c1 : motional capacitance [F]

    Returns
    -------
    q : quality factor [1]

    Notes
    -----
    Q = 1 / (2π·fs·R1·C1) = (1/R1)·√(L1/C1) (IEC 60122-1).
    """
    return to_float(1.0 / (_TWO_PI * as_float(fs) * as_float(r1) * as_float(c1)))


def impedance(
    f: ArrayLike, r1: ArrayLike, l1: ArrayLike, c1: ArrayLike, c0: ArrayLike
) -> ComplexArray:
    """Complex impedance of the crystal (motional arm in parallel with C0).

    Parameters
    ----------
    f : frequency [Hz]
    r1 : motional resistance [ohm]
    l1 : motional inductance [H]
    c1 : motional capacitance [F]
    c0 : shunt capacitance [F]

    Returns
    -------
    z : impedance [ohm], complex

    Notes
    -----
    Zm = R1 + jωL1 + 1/(jωC1);  Z = Zm / (1 + jωC0·Zm)  (Butterworth–Van Dyke model,
    IEC 60444-1).
    """
    omega = _TWO_PI * as_float(f)
    z_motional = as_float(r1) + 1j * (omega * as_float(l1) - 1.0 / (omega * as_float(c1)))
    with np.errstate(invalid="ignore", divide="ignore"):  # NaN inputs give NaN, silently
        z = z_motional / (1.0 + 1j * omega * as_float(c0) * z_motional)
    return to_complex(z)


def impedance_phase(
    f: ArrayLike, r1: ArrayLike, l1: ArrayLike, c1: ArrayLike, c0: ArrayLike
) -> FloatArray:
    """Phase of the crystal impedance.

    Parameters
    ----------
    f, r1, l1, c1, c0 : as in :func:`impedance` [Hz, ohm, H, F, F]

    Returns
    -------
    phase : arg(Z) [rad], in (−π/2, π/2]; positive where the crystal is inductive

    Notes
    -----
    φ = atan2(Im Z, Re Z) of the Butterworth–Van Dyke impedance (IEC 60444-1).
    """
    return to_float(np.angle(impedance(f, r1, l1, c1, c0)))


def load_resonance_offset(c1: ArrayLike, c0: ArrayLike, cl: ArrayLike) -> FloatArray:
    """Fractional load-resonance offset above series resonance (first-order closed form).

    Parameters
    ----------
    c1 : motional capacitance [F]
    c0 : shunt capacitance [F]
    cl : load capacitance in series with the crystal [F]

    Returns
    -------
    d : (fL − fs)/fs [1, a fraction]

    Notes
    -----
    D = C1 / (2·(C0 + CL)), IEC 60122-1. The lossless exact value is
    √(1 + C1/(C0+CL)) − 1; :func:`load_resonance_frequency` gives the exact root with
    R1 included.
    """
    return to_float(as_float(c1) / (2.0 * (as_float(c0) + as_float(cl))))


def load_resonance_frequency(
    fs: ArrayLike, r1: ArrayLike, c1: ArrayLike, c0: ArrayLike, cl: ArrayLike
) -> FloatArray:
    """Exact zero-phase frequency of the crystal in series with a load capacitance.

    Parameters
    ----------
    fs : series resonance frequency [Hz]
    r1 : motional resistance [ohm]
    c1 : motional capacitance [F]
    c0 : shunt capacitance [F]
    cl : load capacitance in series with the crystal [F]; ``inf`` gives the crystal's own
        zero-phase frequency (no load capacitor)

    Returns
    -------
    fl : lower zero-phase (load-resonance) frequency [Hz]; NaN where R1 is so large that
        the phase never reaches zero

    Notes
    -----
    With X = ωL1 − 1/(ωC1), B0 = ωC0 and s = 1/(ωCL), Im(Zxtal + 1/(jωCL)) = 0 reduces to
    the quadratic (derived by clearing the denominator of the parallel combination)

        B0·(1 + B0·s)·X² − (1 + 2·B0·s)·X + s + B0·(1 + B0·s)·R1² = 0,

    whose smaller root is X* = 2c/(b + √(b² − 4ac)) (the numerically stable form). X* is a
    slowly varying function of ω, so ω follows from L1·ω² − X*·ω − 1/C1 = 0 by a fixed-point
    iteration that contracts by about C1/(C0+CL) per step; six steps reach double precision,
    and a row stops earlier once a step leaves it unchanged (most rows after three or four).
    Lossless, X* = 1/(ω(C0+CL)) and fL = fs·√(1 + C1/(C0+CL)) (IEC 60122-1).

    Examples
    --------
    16 MHz series resonance, C1 = 5 fF, C0 = 2 pF, CL = 10 pF, R1 = 80 Ω:

    >>> fl = load_resonance_frequency(16e6, 80.0, 5e-15, 2e-12, 10e-12)
    >>> print(f"{(float(fl) / 16e6 - 1) * 1e6:.2f} ppm above fs")
    208.70 ppm above fs
    """
    fs_a, r1_a, c1_a, c0_a, cl_a = np.broadcast_arrays(
        as_float(fs), as_float(r1), as_float(c1), as_float(c0), as_float(cl)
    )
    omega_s = _TWO_PI * fs_a
    l1 = 1.0 / (omega_s**2 * c1_a)
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        # loop invariants, formed as the step would form them (same rounding)
        invariants = (c0_a, cl_a, r1_a * r1_a, 4.0 * l1 / c1_a, 2.0 * l1)
        # start from the lossless exact value
        omega = np.asarray(omega_s * np.sqrt(1.0 + c1_a / (c0_a + cl_a)))
        omega = _iterate_load_resonance(omega, invariants)
    return to_float(omega / _TWO_PI)


_Invariants = tuple[FloatArray, FloatArray, FloatArray, FloatArray, FloatArray]


def _load_resonance_step(omega: FloatArray, invariants: _Invariants) -> FloatArray:
    # one fixed-point step of load_resonance_frequency (see its Notes)
    c0, cl, r1_squared, four_l1_per_c1, two_l1 = invariants
    b0 = omega * c0
    s = 1.0 / (omega * cl)
    b0_s = b0 * s
    a = b0 * (1.0 + b0_s)
    b = 1.0 + 2.0 * b0_s
    c = s + a * r1_squared
    disc = b * b - 4.0 * a * c
    x_star = 2.0 * c / (b + np.sqrt(disc))
    return np.asarray((x_star + np.sqrt(x_star * x_star + four_l1_per_c1)) / two_l1)


def _iterate_load_resonance(omega: FloatArray, invariants: _Invariants) -> FloatArray:
    # A row whose step returns the very same bits has reached a fixed point of the step, so
    # every later step returns it again: it is final. Rows keep stepping (up to the maximum)
    # only while they move; once few move, only those rows are computed. Every row's result
    # is therefore exactly that of the full-table fixed step count, and independent of the
    # other rows, while most of the table stops after three or four steps.
    active: tuple[npt.NDArray[np.intp], ...] | None = None
    sub_omega, sub_invariants = omega, invariants
    for _ in range(_LOAD_RESONANCE_MAX_STEPS):
        new = _load_resonance_step(sub_omega, sub_invariants)
        moved = new.view(np.int64) != sub_omega.view(np.int64)
        if active is None:
            omega = new
        else:
            omega[active] = new
        count = int(np.count_nonzero(moved))
        if count == 0:
            break
        if active is None and count * _LOAD_RESONANCE_COMPACT_BELOW >= moved.size:
            sub_omega = new
            continue
        keep = np.nonzero(moved)
        if active is None:
            active = keep
            sub_invariants = _take(invariants, keep)
        else:
            active = tuple(index[keep] for index in active)
            sub_invariants = _take(sub_invariants, keep)
        sub_omega = new[keep]
    return omega


def _take(invariants: _Invariants, index: tuple[npt.NDArray[np.intp], ...]) -> _Invariants:
    c0, cl, r1_squared, four_l1_per_c1, two_l1 = invariants
    return (c0[index], cl[index], r1_squared[index], four_l1_per_c1[index], two_l1[index])


def series_resonance_from_load(
    f_load: ArrayLike, r1: ArrayLike, c1: ArrayLike, c0: ArrayLike, cl: ArrayLike
) -> FloatArray:
    """Series resonance of a part whose nominal frequency is specified at a load capacitance.

    Parameters
    ----------
    f_load : nominal frequency, i.e. the load resonance at ``cl`` [Hz]
    r1 : motional resistance [ohm]
    c1 : motional capacitance [F]
    c0 : shunt capacitance [F]
    cl : load capacitance the part is calibrated at [F]; NaN or ``inf`` for a part
        calibrated at series resonance (then fs = f_load)

    Returns
    -------
    fs : series resonance frequency [Hz]

    Notes
    -----
    Inverts :func:`load_resonance_frequency`: fs ← fs·f_load/fL(fs), which converges in a
    few steps because fL/fs depends on fs only through the small R1 term.
    """
    f_load_a, r1_a, c1_a, c0_a, cl_a = np.broadcast_arrays(
        as_float(f_load), as_float(r1), as_float(c1), as_float(c0), as_float(cl)
    )
    series = ~np.isfinite(cl_a)
    cl_use = np.where(series, np.inf, cl_a)
    fs = f_load_a / np.sqrt(1.0 + c1_a / (c0_a + cl_use))
    for _ in range(4):
        fs = fs * f_load_a / load_resonance_frequency(fs, r1_a, c1_a, c0_a, cl_use)
    fs = np.where(series, f_load_a, fs)
    return to_float(np.asarray(fs))


def pulling_ppm(
    fs: ArrayLike,
    r1: ArrayLike,
    c1: ArrayLike,
    c0: ArrayLike,
    cl_board: ArrayLike,
    cl_spec: ArrayLike,
) -> FloatArray:
    """Frequency offset caused by running the part at a load other than its specified one.

    Parameters
    ----------
    fs : series resonance frequency [Hz]
    r1 : motional resistance [ohm]
    c1 : motional capacitance [F]
    c0 : shunt capacitance [F]
    cl_board : load capacitance the board presents [F]
    cl_spec : load capacitance the part is calibrated at [F]; NaN for a part calibrated
        at series resonance

    Returns
    -------
    pulling : (fL(cl_board) − f_nominal)/f_nominal [ppm], where f_nominal = fL(cl_spec), or
        fs for a series-calibrated part

    Notes
    -----
    Exact zero-phase frequencies from :func:`load_resonance_frequency`. To first order this
    is the IEC 60122-1 pulling Δf/f = C1/2·(1/(C0+CL_board) − 1/(C0+CL_spec)).
    """
    cl_spec_a = as_float(cl_spec)
    series = ~np.isfinite(cl_spec_a)
    f_board = load_resonance_frequency(fs, r1, c1, c0, cl_board)
    f_spec = load_resonance_frequency(fs, r1, c1, c0, np.where(series, 1.0, cl_spec_a))
    f_nominal = np.where(series, as_float(fs) * np.ones_like(f_spec), f_spec)
    return to_float(np.asarray((f_board - f_nominal) / f_nominal * 1e6))


def pulling_range_ppm(
    c1: ArrayLike, c0: ArrayLike, cl_low: ArrayLike, cl_high: ArrayLike
) -> FloatArray:
    """Pulling range between two load capacitances (first-order closed form).

    Parameters
    ----------
    c1 : motional capacitance [F]
    c0 : shunt capacitance [F]
    cl_low, cl_high : the two load capacitances [F]

    Returns
    -------
    range : (fL(cl_low) − fL(cl_high))/fs [ppm], positive when cl_low < cl_high

    Notes
    -----
    PR = C1·(CL2 − CL1) / (2·(C0 + CL1)·(C0 + CL2)), IEC 60122-1.
    """
    c1_a, c0_a = as_float(c1), as_float(c0)
    low, high = as_float(cl_low), as_float(cl_high)
    return to_float(c1_a * (high - low) / (2.0 * (c0_a + low) * (c0_a + high)) * 1e6)


def trim_sensitivity_ppm_per_pf(c1: ArrayLike, c0: ArrayLike, cl: ArrayLike) -> FloatArray:
    """Trim sensitivity: slope of the load-resonance offset against load capacitance.

    Parameters
    ----------
    c1 : motional capacitance [F]
    c0 : shunt capacitance [F]
    cl : load capacitance [F]

    Returns
    -------
    s : dD/dCL [ppm/pF], negative

    Notes
    -----
    S = −C1 / (2·(C0 + CL)²), IEC 60122-1; ×1e6 for ppm and ×1e-12 per pF.

    Examples
    --------
    >>> round(float(trim_sensitivity_ppm_per_pf(5e-15, 2e-12, 10e-12)), 2)
    -17.36
    """
    c1_a, c0_a, cl_a = as_float(c1), as_float(c0), as_float(cl)
    return to_float(-c1_a / (2.0 * (c0_a + cl_a) ** 2) * 1e6 * 1e-12)


def load_resonance_resistance(r1: ArrayLike, c0: ArrayLike, cl: ArrayLike) -> FloatArray:
    """Equivalent series resistance of the crystal at load resonance.

    Parameters
    ----------
    r1 : motional resistance [ohm]
    c0 : shunt capacitance [F]
    cl : load capacitance [F]

    Returns
    -------
    rl : load-resonance resistance [ohm]

    Notes
    -----
    RL = R1·(1 + C0/CL)², IEC 60122-1. Shown for information; the start-up margin uses R1.
    """
    return to_float(as_float(r1) * (1.0 + as_float(c0) / as_float(cl)) ** 2)
