"""Vectorised random draws of invented crystal parts, as a numeric part table in SI units.

Every column is drawn for all rows at once from one ``numpy.random.Generator``; there is no
loop over parts (only over the handful of package families). Only ``Generator.random`` is
used, and every drawn value is snapped to a grid with exactly rounded arithmetic (``rint``,
``floor``, ``+``, ``*``, ``/``), so the output is the same on every run and platform for a
given seed; numpy documents no stream guarantee across its releases, which ``--check``
would reveal.

The ranges are plausible figures for invented demo parts (common practice and from memory,
see :mod:`demo_catalog.packages`); the motional capacitance of AT-cut parts follows from a
drawn quality factor and the ESR through Q = 1/(2·π·f·R1·C1) (Butterworth–Van Dyke model,
IEC 60122-1 terms), so every row is physically self-consistent.
"""

from __future__ import annotations

from collections.abc import Sequence

import numpy as np
import numpy.typing as npt
import pandas as pd

from demo_catalog.packages import (
    AT_FUNDAMENTAL_FREQUENCIES_MHZ,
    AT_PACKAGE_SPAN,
    AT_PACKAGES,
    FORK_PACKAGES,
    OVERTONE_FREQUENCIES_MHZ,
    OVERTONE_PACKAGES,
    PACKAGES,
)

FloatArray = npt.NDArray[np.float64]
IntArray = npt.NDArray[np.int64]

# Families, in the order of FAMILY_WEIGHTS.
FORK_32K768, FORK_32K000, AT_FUNDAMENTAL, OVERTONE = 0, 1, 2, 3
FAMILY_WEIGHTS = (0.17, 0.006, 0.724, 0.10)

PACKAGE_CODES: tuple[str, ...] = tuple(p.code for p in FORK_PACKAGES + AT_PACKAGES)
LOAD_PF: tuple[float, ...] = (6.0, 7.0, 8.0, 9.0, 10.0, 12.0, 12.5, 16.0, 18.0, 20.0)

# (stability [ppm], temp_min [°C], temp_max [°C], weight) for AT-cut parts: tight stability
# over a wide range is rare (common practice).
AT_STABILITY_RANGES: tuple[tuple[float, float, float, float], ...] = (
    (10.0, -20.0, 70.0, 2.0),
    (10.0, -40.0, 85.0, 1.5),
    (15.0, -20.0, 70.0, 1.5),
    (15.0, -40.0, 85.0, 2.0),
    (15.0, -40.0, 105.0, 0.5),
    (20.0, -20.0, 70.0, 2.0),
    (20.0, -40.0, 85.0, 3.0),
    (20.0, -40.0, 105.0, 1.0),
    (20.0, -40.0, 125.0, 0.5),
    (30.0, -20.0, 70.0, 2.0),
    (30.0, -40.0, 85.0, 3.0),
    (30.0, -40.0, 105.0, 1.5),
    (30.0, -40.0, 125.0, 1.5),
    (50.0, -40.0, 85.0, 2.0),
    (50.0, -40.0, 105.0, 1.0),
    (50.0, -40.0, 125.0, 1.5),
)
FORK_RANGES: tuple[tuple[float, float, float], ...] = (
    (-40.0, 85.0, 6.0),
    (-40.0, 105.0, 1.0),
    (-40.0, 125.0, 1.5),
    (-20.0, 70.0, 2.0),
)
# (beta [ppm/°C²], turnover [°C], weight): the parabola figures a fork data sheet may list.
FORK_PARABOLAS: tuple[tuple[float, float, float], ...] = (
    (-0.034, 25.0, 3.0),
    (-0.04, 20.0, 1.0),
    (-0.035, 25.0, 1.0),
)
AT_TOLERANCES = ((10.0, 2.0), (15.0, 1.5), (20.0, 3.0), (30.0, 2.5), (50.0, 1.0))
OVERTONE_TOLERANCES = ((15.0, 1.0), (20.0, 2.0), (30.0, 2.0), (50.0, 1.0))
FORK_TOLERANCES = ((10.0, 3.0), (20.0, 7.0))
AT_AGING = ((1.0, 1.0), (2.0, 2.0), (3.0, 3.0), (5.0, 2.0))
FORK_AGING = ((3.0, 3.0), (5.0, 1.0))
LIFECYCLES = (("active", 0.86), ("nrnd", 0.10), ("obsolete", 0.04))
MSL_LEVELS = (("1", 0.93), ("2", 0.02), ("3", 0.03), ("", 0.02))

# Quality factor drawn for AT-cut parts, evaluated at the ESR maximum (common practice:
# 2e4..2e5 for fundamentals; the ESR max sits above the typical R1, so Q here is lower).
AT_Q_RANGE = (2.0e4, 1.2e5)
OVERTONE_Q_RANGE = (2.0e4, 1.5e5)
MISSING_MOTIONAL_SHARE = 0.105


def choose(u: FloatArray, weights: Sequence[float]) -> IntArray:
    """Index into ``weights`` for each uniform draw ``u`` in [0, 1), proportionally."""
    cumulative = np.cumsum(np.asarray(weights, dtype=np.float64))
    picked = np.searchsorted(cumulative / cumulative[-1], u, side="right")
    return np.minimum(picked, len(weights) - 1).astype(np.int64)


def choose_per_group(u: FloatArray, group: IntArray, weight_table: FloatArray) -> IntArray:
    """Index per row, drawn with the weights of that row's group (``weight_table[group]``).

    Loops over the few groups, never over rows.
    """
    picked = np.zeros(u.shape, dtype=np.int64)
    for index in np.unique(group).tolist():
        mask = group == index
        picked[mask] = choose(u[mask], weight_table[index])
    return picked


def on_grid(u: FloatArray, low: FloatArray, high: FloatArray, step: float) -> FloatArray:
    """A value drawn uniformly from the grid ``low, low+step, ..., high`` (inclusive)."""
    first = np.rint(np.asarray(low) / step)
    count = np.rint(np.asarray(high) / step) - first + 1.0
    return (first + np.floor(u * count)) * step


def snap(values: FloatArray, step: float) -> FloatArray:
    """Round to a multiple of ``step``."""
    return np.asarray(np.rint(np.asarray(values) / step) * step, dtype=np.float64)


def _pick(u: FloatArray, table: Sequence[tuple[float, float]]) -> FloatArray:
    values = np.array([v for v, _ in table], dtype=np.float64)
    return values[choose(u, [w for _, w in table])]


def _categorical(codes: npt.NDArray[np.integer], names: Sequence[str]) -> pd.Categorical[str]:
    """Text column from integer codes into ``names`` (no per-row strings are built)."""
    return pd.Categorical.from_codes(codes.astype(np.int64), categories=pd.Index(list(names)))


def _package_matrix(kind: str) -> FloatArray:
    """Per-package weights over LOAD_PF (kind 'load') or drive options (kind 'drive')."""
    if kind == "load":
        matrix = np.zeros((len(PACKAGE_CODES), len(LOAD_PF)))
        for row, code in enumerate(PACKAGE_CODES):
            for value, weight in PACKAGES[code].load_pf:
                matrix[row, LOAD_PF.index(value)] = weight
        return matrix
    width = max(len(PACKAGES[c].drive_uw) for c in PACKAGE_CODES)
    matrix = np.zeros((len(PACKAGE_CODES), width))
    for row, code in enumerate(PACKAGE_CODES):
        matrix[row, : len(PACKAGES[code].drive_uw)] = 1.0
    return matrix


def _drive_values() -> FloatArray:
    width = max(len(PACKAGES[c].drive_uw) for c in PACKAGE_CODES)
    values = np.full((len(PACKAGE_CODES), width), np.nan)
    for row, code in enumerate(PACKAGE_CODES):
        options = PACKAGES[code].drive_uw
        values[row, : len(options)] = options
    return values


def _attribute(codes: IntArray, name: str) -> FloatArray:
    table = np.array([float(getattr(PACKAGES[c], name)) for c in PACKAGE_CODES])
    return np.asarray(table[codes], dtype=np.float64)


def _range_attribute(codes: IntArray, name: str, end: int) -> FloatArray:
    table = np.array([float(getattr(PACKAGES[c], name)[end]) for c in PACKAGE_CODES])
    return np.asarray(table[codes], dtype=np.float64)


def draw_part_table(rng: np.random.Generator, n: int, makers: Sequence[str]) -> pd.DataFrame:
    """Draw ``n`` invented parts as a numeric part table (SI floats, no part numbers yet).

    Parameters
    ----------
    rng : numpy.random.Generator
        Source of randomness; the same state gives the same table.
    n : int
        Number of rows [-].
    makers : sequence of str
        Maker names to spread the rows over (uniformly).

    Returns
    -------
    pandas.DataFrame
        Columns named as the part table of INTERFACES.md (``freq_hz``, ``esr_ohm``, ``c0_f``
        ...), plus ``family`` (0 fork 32.768 kHz, 1 fork 32.000 kHz, 2 AT fundamental,
        3 overtone). ``mpn`` is empty; :func:`demo_catalog.makers.assign_part_numbers`
        fills it.
    """
    if n < 0:
        raise ValueError(f"n must be >= 0, got {n}")
    if not makers:
        raise ValueError("makers must name at least one maker")

    def u() -> FloatArray:
        return rng.random(n)

    family = choose(u(), FAMILY_WEIGHTS)
    fork = family <= FORK_32K000
    at = family == AT_FUNDAMENTAL
    overtone = family == OVERTONE

    # Frequency [Hz]; every value is a whole number of hertz.
    at_index = choose(u(), [w for _, w in AT_FUNDAMENTAL_FREQUENCIES_MHZ])
    at_mhz = np.array([f for f, _ in AT_FUNDAMENTAL_FREQUENCIES_MHZ])[at_index]
    ot_mhz = _pick(u(), OVERTONE_FREQUENCIES_MHZ)
    freq_hz = np.where(family == FORK_32K768, 32768.0, 32000.0)
    freq_hz = np.where(at, np.rint(at_mhz * 1e6), freq_hz)
    freq_hz = np.where(overtone, np.rint(ot_mhz * 1e6), freq_hz)
    freq_mhz = freq_hz / 1e6

    # Package: forks from the fork families; AT fundamentals only where the blank reaches
    # that frequency; overtones from their own list.
    fork_code = choose(u(), (1.0, 4.0, 4.0, 1.0, 1.5, 0.5))
    span_weights = np.array(
        [
            [weight if low <= mhz <= high else 0.0 for _, low, high, weight in AT_PACKAGE_SPAN]
            for mhz, _ in AT_FUNDAMENTAL_FREQUENCIES_MHZ
        ]
    )
    at_code = choose_per_group(u(), at_index, span_weights)
    at_code = np.array([PACKAGE_CODES.index(c) for c, *_ in AT_PACKAGE_SPAN])[at_code]
    ot_code = choose(u(), [w for _, w in OVERTONE_PACKAGES])
    ot_code = np.array([PACKAGE_CODES.index(c) for c, _ in OVERTONE_PACKAGES])[ot_code]
    code = np.where(fork, fork_code, np.where(at, at_code, ot_code)).astype(np.int64)

    # ESR max [ohm], from the package's frequency breakpoints.
    esr_u = u()
    esr = np.empty(n)
    for index, name in enumerate(PACKAGE_CODES):
        mask = code == index
        points = PACKAGES[name].esr_points
        low = np.interp(freq_mhz[mask], [p[0] for p in points], [p[1] for p in points])
        high = np.interp(freq_mhz[mask], [p[0] for p in points], [p[2] for p in points])
        esr[mask] = low + esr_u[mask] * (high - low)
    # Catalogs print ESR maxima as round figures: 5 Ω steps below 60 Ω, 10 Ω above,
    # 5 kΩ for tuning forks.
    at_esr = np.where(esr < 60.0, snap(esr, 5.0), snap(esr, 10.0))
    esr = np.where(fork, snap(esr, 5.0) * 1e3, at_esr)
    esr = np.where(overtone, on_grid(esr_u, np.full(n, 40.0), np.full(n, 100.0), 10.0), esr)

    # Shunt capacitance C0 [F] on a 0.05 pF grid; motional capacitance C1 [F].
    c0_pf = on_grid(
        u(), _range_attribute(code, "c0_pf", 0), _range_attribute(code, "c0_pf", 1), 0.05
    )
    q_at = AT_Q_RANGE[0] + u() * (AT_Q_RANGE[1] - AT_Q_RANGE[0])
    q_ot = OVERTONE_Q_RANGE[0] + u() * (OVERTONE_Q_RANGE[1] - OVERTONE_Q_RANGE[0])
    quality = np.where(overtone, q_ot, q_at)
    c1_ff = 1e15 / (2.0 * np.pi * freq_hz * esr * quality)
    c1_ff = np.where(overtone, np.clip(c1_ff, 0.3, 2.0), np.clip(c1_ff, 1.0, 30.0))
    c1_ff = np.where(c1_ff >= 10.0, snap(c1_ff, 0.1), snap(c1_ff, 0.01))
    fork_c1 = on_grid(u(), np.full(n, 2.0), np.full(n, 5.0), 0.1)
    c1_ff = np.where(fork, fork_c1, c1_ff)
    missing_motional = u() < MISSING_MOTIONAL_SHARE
    c0_f = np.where(missing_motional, np.nan, c0_pf * 1e-12)
    c1_f = np.where(missing_motional, np.nan, c1_ff * 1e-15)

    # Load capacitance: package-typical values; a few AT parts are series-calibrated.
    load_index = choose_per_group(u(), code, _package_matrix("load"))
    load_pf = np.array(LOAD_PF)[load_index]
    series_u = u()
    series = (at & (series_u < 0.02)) | (overtone & (series_u < 0.15))
    ot_load = _pick(u(), ((8.0, 1.0), (10.0, 2.0), (12.0, 1.0), (16.0, 1.0), (18.0, 1.0)))
    load_pf = np.where(overtone, ot_load, load_pf)
    load_f = np.where(series, np.nan, load_pf * 1e-12)

    # Tolerance at 25 °C, stability over the rated range [ppm]; temperatures [°C].
    tolerance = np.where(
        fork,
        _pick(u(), FORK_TOLERANCES),
        np.where(overtone, _pick(u(), OVERTONE_TOLERANCES), _pick(u(), AT_TOLERANCES)),
    )
    combo = choose(u(), [c[3] for c in AT_STABILITY_RANGES])
    combos = np.array([c[:3] for c in AT_STABILITY_RANGES])
    fork_range = choose(u(), [r[2] for r in FORK_RANGES])
    ranges = np.array([r[:2] for r in FORK_RANGES])
    temp_min = np.where(fork, ranges[fork_range, 0], combos[combo, 1])
    temp_max = np.where(fork, ranges[fork_range, 1], combos[combo, 2])

    # Forks: some list the parabola; a few list a one-sided "stability" over their range,
    # rounded up to 10 ppm from the typical parabola (-0.034 ppm/°C², 25 °C).
    parabola = choose(u(), [p[2] for p in FORK_PARABOLAS])
    lists_parabola = fork & (u() < 0.6)
    beta = np.where(lists_parabola, np.array([p[0] for p in FORK_PARABOLAS])[parabola], np.nan)
    turnover = np.where(lists_parabola, np.array([p[1] for p in FORK_PARABOLAS])[parabola], np.nan)
    worst = np.maximum((temp_min - 25.0) ** 2, (temp_max - 25.0) ** 2) * 0.034
    fork_stability = np.where(u() < 0.2, np.ceil(worst / 10.0) * 10.0, np.nan)
    stability = np.where(fork, fork_stability, combos[combo, 0])

    # Aging, first year [ppm]; drive level max [W].
    aging = np.where(fork, _pick(u(), FORK_AGING), _pick(u(), AT_AGING))
    aging = np.where(u() < np.where(fork, 0.3, 0.08), np.nan, aging)
    drive_index = choose_per_group(u(), code, _package_matrix("drive"))
    drive_w = _drive_values()[code, drive_index] * 1e-6

    # Size [mm] and pads.
    length = _attribute(code, "length_mm")
    width = _attribute(code, "width_mm")
    height = on_grid(
        u(), _range_attribute(code, "height_mm", 0), _range_attribute(code, "height_mm", 1), 0.05
    )
    four_pad = u() < _attribute(code, "four_pad_share")
    pinout = _categorical(np.where(four_pad, np.where(u() < 0.12, 2, 1), 0), ("", "1-3", "2-4"))

    mode = _categorical(
        np.where(overtone, np.where((freq_mhz >= 100.0) & (u() < 0.35), 2, 1), 0),
        ("fundamental", "overtone3", "overtone5"),
    )
    cut = _categorical(fork.astype(np.int64), ("AT", "tuning_fork"))

    # Commerce.
    automotive_share = np.where(temp_max >= 105.0, 0.55, 0.04)
    automotive = u() < automotive_share
    qualification = _categorical(automotive.astype(np.int64), ("", "AEC-Q200"))
    lifecycle_code = choose(u(), [w for _, w in LIFECYCLES])
    lifecycle = _categorical(lifecycle_code, tuple(name for name, _ in LIFECYCLES))
    price_u = u()
    price = _range_attribute(code, "price", 0) + price_u * (
        _range_attribute(code, "price", 1) - _range_attribute(code, "price", 0)
    )
    tight = (tolerance <= 10.0) | (np.nan_to_num(stability, nan=99.0) <= 10.0)
    price = price * np.where(tight, 1.3, 1.0) * np.where(automotive, 1.4, 1.0)
    price = price * np.where(overtone, 1.5, 1.0)
    price = snap(np.clip(price, 0.05, 2.0), 0.001)
    stock_u = u()
    out_of_stock = u() < np.where(lifecycle_code == 2, 0.7, 0.12)
    stock = np.where(out_of_stock, 0.0, 1.0 + np.floor(stock_u * stock_u * 200_000.0))
    msl = _categorical(choose(u(), [w for _, w in MSL_LEVELS]), tuple(m for m, _ in MSL_LEVELS))
    maker = _categorical(np.floor(u() * len(makers)).astype(np.int64), tuple(makers))

    return pd.DataFrame(
        {
            "mpn": np.full(n, "", dtype=object),
            "maker": maker,
            "freq_hz": freq_hz,
            "load_capacitance_f": load_f,
            "series_calibrated": series,
            "tolerance_ppm": tolerance,
            "stability_ppm": stability,
            "temp_min_c": temp_min,
            "temp_max_c": temp_max,
            "esr_ohm": esr,
            "package": pd.Categorical.from_codes(code, categories=pd.Index(list(PACKAGE_CODES))),
            "mode": mode,
            "cut": cut,
            "beta_ppm_per_c2": beta,
            "turnover_c": turnover,
            "c0_f": c0_f,
            "c1_f": c1_f,
            "l1_h": np.full(n, np.nan),
            "drive_level_w": drive_w,
            "aging_ppm": aging,
            "length_mm": length,
            "width_mm": width,
            "height_mm": height,
            "price": price,
            "stock": stock,
            "lifecycle": lifecycle,
            "qualification": qualification,
            "pinout": pinout,
            "msl": msl,
            "family": family,
        }
    )
