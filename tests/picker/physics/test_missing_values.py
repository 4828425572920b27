"""A NaN (a figure the catalog does not give) must come out as NaN, never as a pass or 0.

Cross-module check of the whole physics API: every numeric result computed from a NaN
input is NaN, so a missing value can never look like a good or a bad part by accident.
"""

from __future__ import annotations

import warnings
from collections.abc import Callable

import numpy as np
import pytest

from picker.physics import (
    aging_ppm,
    at_cut_drift_ppm,
    board_load_capacitance,
    critical_transconductance,
    drive_level,
    frequency_error_budget,
    gain_margin,
    impedance,
    load_capacitance_spread_f,
    load_resonance_frequency,
    load_resonance_offset,
    load_spread_ppm,
    max_negative_resistance,
    motional_inductance,
    negative_resistance,
    negative_resistance_margin,
    optimum_transconductance,
    parallel_resonance,
    pulling_ppm,
    quality_factor,
    series_resonance,
    startup_time,
    startup_time_constant,
    trim_sensitivity_ppm_per_pf,
    tuning_fork_drift_ppm,
)

PF = 1e-12
FF = 1e-15
W = 2 * np.pi * 16e6

# each: (function, good arguments); every argument is replaced by NaN in turn
CASES: dict[str, tuple[Callable[..., object], tuple[float, ...]]] = {
    "series_resonance": (series_resonance, (0.02, 5 * FF)),
    "motional_inductance": (motional_inductance, (16e6, 5 * FF)),
    "parallel_resonance": (parallel_resonance, (16e6, 5 * FF, 2 * PF)),
    "quality_factor": (quality_factor, (16e6, 80.0, 5 * FF)),
    "impedance": (impedance, (16e6, 80.0, 0.02, 5 * FF, 2 * PF)),
    "load_resonance_offset": (load_resonance_offset, (5 * FF, 2 * PF, 10 * PF)),
    "load_resonance_frequency": (load_resonance_frequency, (16e6, 80.0, 5 * FF, 2 * PF, 10 * PF)),
    "pulling_ppm": (
        lambda a, b, c, d, e: pulling_ppm(a, b, c, d, e, 12 * PF),
        (16e6, 80.0, 5 * FF, 2 * PF, 10 * PF),
    ),
    "trim_sensitivity_ppm_per_pf": (trim_sensitivity_ppm_per_pf, (5 * FF, 2 * PF, 10 * PF)),
    "board_load_capacitance": (board_load_capacitance, (18 * PF, 18 * PF, 2 * PF)),
    "negative_resistance": (
        negative_resistance,
        (W, 5e-3, 18 * PF, 18 * PF, 3 * PF, 0.0, 1e-4, 1e-6),
    ),
    "critical_transconductance": (
        critical_transconductance,
        (W, 80.0, 18 * PF, 18 * PF, 3 * PF, 0.0, 1e-4, 1e-6),
    ),
    "optimum_transconductance": (
        optimum_transconductance,
        (W, 18 * PF, 18 * PF, 3 * PF, 0.0, 1e-4, 1e-6),
    ),
    "max_negative_resistance": (
        max_negative_resistance,
        (W, 18 * PF, 18 * PF, 3 * PF, 0.0, 1e-4, 1e-6),
    ),
    "negative_resistance_margin": (negative_resistance_margin, (-400.0, 80.0)),
    "gain_margin": (gain_margin, (5e-3, 1e-3)),
    "drive_level": (drive_level, (80.0, 16e6, 1.2, 2 * PF, 10 * PF)),
    "startup_time_constant": (startup_time_constant, (0.02, -400.0, 80.0)),
    "startup_time": (startup_time, (0.02, -400.0, 80.0)),
    "tuning_fork_drift_ppm": (tuning_fork_drift_ppm, (-40.0, -0.034, 25.0)),
    "at_cut_drift_ppm": (at_cut_drift_ppm, (-40.0, 0.1)),
    "aging_ppm": (aging_ppm, (3.0, 3e8, 0.1)),
    "frequency_error_budget": (
        lambda *a: frequency_error_budget(*a).total_ppm,
        (10.0, 20.0, 3.0, 1.0, 2.0),
    ),
    "load_capacitance_spread_f": (
        load_capacitance_spread_f,
        (18 * PF, 18 * PF, 1.5 * PF, 0.05, 1 * PF),
    ),
    "load_spread_ppm": (load_spread_ppm, (5 * FF, 2 * PF, 10 * PF, 1 * PF)),
}


@pytest.mark.parametrize("name", list(CASES))
def test_nan_in_gives_nan_out(name: str) -> None:
    function, good = CASES[name]
    assert np.all(np.isfinite(np.asarray(function(*good)))), "the good case must be finite"
    for i in range(len(good)):
        args = list(good)
        args[i] = np.nan
        with warnings.catch_warnings():
            warnings.simplefilter("error")  # no RuntimeWarning may leak to the user's terminal
            result = np.asarray(function(*args))
        assert np.all(np.isnan(result)), f"{name}: NaN in argument {i} gave {result}"
