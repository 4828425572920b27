"""Plausibility checks on loaded parts: values that parse but are probably wrong.

Each check is a warning (the part stays loaded) naming the figure, why it is doubtful and
what to look at. Bands are deliberately generous; they catch unit slips (fF typed as pF,
MHz read as kHz), not unusual parts.
"""

from __future__ import annotations

import math
from collections.abc import Iterable
from typing import Final

import numpy as np
import pandas as pd

from catalog.problems import Problem

__all__ = ["plausibility_problems", "quality_factor"]

#: Q band outside which ESR and C1 cannot both be right. Q = 1/(2π·fs·R1·C1) (IEC 60122-1
#: equivalent circuit); quartz units typically have Q from 2e4 to above 1e5: common practice.
Q_BAND: Final[tuple[float, float]] = (1e3, 1e7)
#: C0/C1 ratio band; AT fundamentals are typically 200-500, overtones much higher: common
#: practice. The band is generous on purpose.
C0_C1_BAND: Final[tuple[float, float]] = (50.0, 50_000.0)
#: Load capacitances specified for crystals (common practice: 4 to 32 pF).
CL_BAND_F: Final[tuple[float, float]] = (4e-12, 32e-12)
#: AT-cut thickness-shear frequency constant, f·t ≈ 1.661 MHz·mm (from memory; Bottom,
#: "Introduction to Quartz Crystal Unit Design", 1982). Above ~60 MHz a fundamental plate
#: is under ~28 µm thick, so such parts are usually overtones.
AT_FREQUENCY_CONSTANT_HZ_M: Final[float] = 1.661e6 * 1e-3
AT_FUNDAMENTAL_MAX_HZ: Final[float] = 60e6
#: A drive rating above this is a unit slip (crystals are rated in µW; common practice).
DRIVE_LEVEL_MAX_W: Final[float] = 10e-3


def quality_factor(freq_hz: np.ndarray, esr_ohm: np.ndarray, c1_f: np.ndarray) -> np.ndarray:
    """Quality factor Q = 1 / (2π · f · R1 · C1) [1].

    Parameters: freq_hz [Hz], esr_ohm [ohm], c1_f [F]. Butterworth-Van Dyke model,
    IEC 60122-1 terms. NaN where an input is missing.
    """
    with np.errstate(divide="ignore", invalid="ignore"):
        return 1.0 / (2.0 * math.pi * freq_hz * esr_ohm * c1_f)


def _warn(
    frame: pd.DataFrame, mask: np.ndarray, field: str, raw: Iterable[str], messages: Iterable[str]
) -> list[Problem]:
    paths = frame["source_path"].to_numpy()[mask]
    lines = frame["source_line"].to_numpy()[mask]
    return [
        Problem(str(path), int(line), field, text, message, "warning")
        for path, line, text, message in zip(paths, lines, raw, messages, strict=True)
    ]


def plausibility_problems(frame: pd.DataFrame) -> list[Problem]:
    """Warnings for loaded parts whose figures are implausible together (see module doc)."""
    if frame.empty:
        return []
    problems: list[Problem] = []
    freq = frame["freq_hz"].to_numpy(dtype=np.float64)
    esr = frame["esr_ohm"].to_numpy(dtype=np.float64)
    c0 = frame["c0_f"].to_numpy(dtype=np.float64)
    c1 = frame["c1_f"].to_numpy(dtype=np.float64)
    load = frame["load_capacitance_f"].to_numpy(dtype=np.float64)
    cut = frame["cut"].to_numpy(dtype=object)
    mode = frame["mode"].to_numpy(dtype=object)
    beta = frame["beta_ppm_per_c2"].to_numpy(dtype=np.float64)
    drive = frame["drive_level_w"].to_numpy(dtype=np.float64)

    q = quality_factor(freq, esr, c1)
    with np.errstate(invalid="ignore"):
        bad_q = np.isfinite(q) & ((q < Q_BAND[0]) | (q > Q_BAND[1]))
    problems += _warn(
        frame,
        bad_q,
        "c1",
        (f"{c1_f * 1e15:g} fF" for c1_f in c1[bad_q]),
        (
            f"Q = 1/(2π·f·R1·C1) = {value:.3g} from ESR and C1 is outside "
            f"{Q_BAND[0]:.0e}..{Q_BAND[1]:.0e} (quartz typically 2e4 to above 1e5, common "
            "practice); check the units of esr and c1"
            for value in q[bad_q]
        ),
    )

    with np.errstate(divide="ignore", invalid="ignore"):
        ratio = c0 / c1
        bad_ratio = np.isfinite(ratio) & ((ratio < C0_C1_BAND[0]) | (ratio > C0_C1_BAND[1]))
    problems += _warn(
        frame,
        bad_ratio,
        "c0",
        (
            f"{a * 1e12:g} pF / {b * 1e15:g} fF"
            for a, b in zip(c0[bad_ratio], c1[bad_ratio], strict=True)
        ),
        (
            f"C0/C1 = {value:.3g} is outside {C0_C1_BAND[0]:g}..{C0_C1_BAND[1]:g} (AT "
            "fundamentals typically 200-500, overtones higher: common practice); check c0 and "
            "c1 units (pF, fF)"
            for value in ratio[bad_ratio]
        ),
    )

    with np.errstate(invalid="ignore"):
        bad_load = np.isfinite(load) & ((load < CL_BAND_F[0]) | (load > CL_BAND_F[1]))
    problems += _warn(
        frame,
        bad_load,
        "load_capacitance",
        (f"{value * 1e12:g} pF" for value in load[bad_load]),
        (
            f"load capacitance {value * 1e12:g} pF is outside the usual 4..32 pF (common "
            "practice); check the unit"
            for value in load[bad_load]
        ),
    )

    at_like = (cut == "AT") | ((cut == "") & (freq >= 1e6))
    thick = at_like & (mode == "fundamental") & (freq > AT_FUNDAMENTAL_MAX_HZ)
    problems += _warn(
        frame,
        thick,
        "mode",
        ("fundamental" for _ in range(int(thick.sum()))),
        (
            f"an AT-cut fundamental at {value / 1e6:g} MHz needs a plate about "
            f"{AT_FREQUENCY_CONSTANT_HZ_M / value * 1e6:.0f} µm thick (t ≈ 1.661 MHz·mm / f); "
            "parts this high are usually overtones: check mode"
            for value in freq[thick]
        ),
    )

    with np.errstate(invalid="ignore"):
        positive_beta = np.isfinite(beta) & (beta > 0)
    problems += _warn(
        frame,
        positive_beta,
        "beta",
        (f"{value:g} ppm/°C²" for value in beta[positive_beta]),
        (
            "a tuning fork's parabolic coefficient is negative (typically -0.034 ppm/°C²); "
            "the sign is probably missing"
            for _ in range(int(positive_beta.sum()))
        ),
    )

    with np.errstate(invalid="ignore"):
        strong = np.isfinite(drive) & (drive > DRIVE_LEVEL_MAX_W)
    problems += _warn(
        frame,
        strong,
        "drive_level",
        (f"{value:g} W" for value in drive[strong]),
        (
            f"drive level {value * 1e3:g} mW is far above any crystal rating (µW range); "
            "check the unit"
            for value in drive[strong]
        ),
    )
    return problems
