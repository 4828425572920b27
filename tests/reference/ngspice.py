"""A small ngspice harness: write a netlist, run ``ngspice -b``, read AC results back.

The reference simulator is the Debian ``ngspice`` package. Many independent sub-networks
can share one netlist; each AC sweep in the ``.control`` block writes only the vectors it
names (``wrdata``), so one ngspice process serves a whole test module.

When ngspice is missing the tests that need it are skipped locally, but fail when the
environment variable ``CI`` is set, so a CI machine without ngspice cannot pass silently.
"""

from __future__ import annotations

import os
import shutil
import subprocess
import tempfile
from collections.abc import Sequence
from dataclasses import dataclass
from pathlib import Path

import numpy as np
import numpy.typing as npt
import pytest

NGSPICE_FALLBACK = "/usr/bin/ngspice"
TIMEOUT_S = 120.0


def ngspice_path() -> str | None:
    """The ngspice executable, or None when it is not installed."""
    found = shutil.which("ngspice")
    if found:
        return found
    return NGSPICE_FALLBACK if Path(NGSPICE_FALLBACK).is_file() else None


def require_ngspice() -> str:
    """The ngspice executable; skip the test without it, or fail when ``CI`` is set."""
    path = ngspice_path()
    if path is None:
        message = "ngspice is not installed (Debian package 'ngspice')"
        if os.environ.get("CI"):
            pytest.fail(f"{message}, and CI is set: the reference checks must run in CI")
        pytest.skip(message)
    return path


def spice_number(value: float) -> str:
    """A float in a form ngspice reads back exactly (17 significant digits, no suffix)."""
    return f"{float(value):.17e}"


@dataclass(frozen=True)
class Sweep:
    """One AC analysis: a linear frequency sweep and the node voltages to record.

    Attributes
    ----------
    name : label of the sweep (used for the output file name)
    f_start, f_stop : sweep limits [Hz]; equal limits with points=1 give one frequency
    points : number of frequency points
    nodes : node names whose complex voltages are written
    """

    name: str
    f_start: float
    f_stop: float
    points: int
    nodes: tuple[str, ...]


@dataclass(frozen=True)
class SweepResult:
    """Frequencies [Hz] and complex node voltages [V] of one sweep."""

    frequency: npt.NDArray[np.float64]
    voltages: dict[str, npt.NDArray[np.complex128]]


def run_ac(elements: str, sweeps: Sequence[Sweep]) -> dict[str, SweepResult]:
    """Run ngspice in batch mode on ``elements`` and return the AC results per sweep.

    Parameters
    ----------
    elements : netlist body (element lines, no title, no ``.end``)
    sweeps : the AC analyses to run, each writing its own data file

    Returns
    -------
    results : sweep name -> SweepResult
    """
    executable = require_ngspice()
    with tempfile.TemporaryDirectory(prefix="picker-ngspice-") as tmp:
        directory = Path(tmp)
        control = ["set wr_singlescale", "set wr_vecnames", "option numdgt=15"]
        for index, sweep in enumerate(sweeps):
            vectors = " ".join(f"v({node})" for node in sweep.nodes)
            control.append(
                f"ac lin {sweep.points} {spice_number(sweep.f_start)} {spice_number(sweep.f_stop)}"
            )
            control.append(f"wrdata {directory / f'sweep{index}.txt'} {vectors}")
            control.append("destroy all")
        netlist = "\n".join(
            ["* picker reference netlist", elements.strip(), ".control", *control, ".endc", ".end"]
        )
        netlist_path = directory / "circuit.cir"
        netlist_path.write_text(netlist + "\n", encoding="ascii")
        completed = subprocess.run(
            [executable, "-b", str(netlist_path)],
            capture_output=True,
            text=True,
            timeout=TIMEOUT_S,
            check=False,
            cwd=directory,
        )
        results: dict[str, SweepResult] = {}
        for index, sweep in enumerate(sweeps):
            data_path = directory / f"sweep{index}.txt"
            if not data_path.is_file():
                raise RuntimeError(
                    f"ngspice wrote no data for sweep {sweep.name!r} "
                    f"(exit {completed.returncode}):\n{completed.stdout[-2000:]}"
                    f"\n{completed.stderr[-2000:]}"
                )
            results[sweep.name] = _read_wrdata(data_path, sweep)
        return results


def _read_wrdata(path: Path, sweep: Sweep) -> SweepResult:
    # wr_singlescale + wr_vecnames: a header line, then "f re(v1) im(v1) re(v2) im(v2) ..."
    table = np.loadtxt(path, skiprows=1, ndmin=2)
    expected = 1 + 2 * len(sweep.nodes)
    if table.shape[1] != expected:
        raise RuntimeError(f"{path.name}: expected {expected} columns, got {table.shape[1]}")
    voltages = {
        node: table[:, 1 + 2 * i] + 1j * table[:, 2 + 2 * i] for i, node in enumerate(sweep.nodes)
    }
    return SweepResult(frequency=table[:, 0], voltages=voltages)


def zero_crossing(x: npt.NDArray[np.float64], y: npt.NDArray[np.float64]) -> float:
    """First sign change of y(x), refined by a quadratic through the three nearest points.

    Raises AssertionError when y does not change sign in the sampled range, so a reference
    check whose window misses the root fails instead of passing.
    """
    signs = np.signbit(y)
    changes = np.flatnonzero(signs[1:] != signs[:-1])
    assert changes.size, "no zero crossing in the simulated window"
    i = int(changes[0])
    lo = max(0, min(i - 1, len(x) - 3))
    h = x[i + 1] - x[i]
    # interpolating parabola in t = (x − x[i])/h, root sought in [0, 1]
    a, b, c = np.polyfit((x[lo : lo + 3] - x[i]) / h, y[lo : lo + 3], 2)
    roots = np.roots([a, b, c]) if abs(a) > 1e-300 else np.array([-c / b])
    real = roots[np.abs(roots.imag) <= 1e-9 * (1 + np.abs(roots.real))].real
    inside = real[(real >= -0.01) & (real <= 1.01)]
    assert inside.size, "quadratic refinement found no root inside the bracket"
    return float(x[i] + inside[0] * h)


def extremum(
    x: npt.NDArray[np.float64], y: npt.NDArray[np.float64], *, find: str
) -> tuple[float, float]:
    """Location and value of the sampled maximum or minimum of y(x), refined by a parabola.

    Raises AssertionError when the extremum sits at the edge of the window.
    """
    i = int(np.argmax(y) if find == "max" else np.argmin(y))
    assert 0 < i < len(y) - 1, "the extremum is at the edge of the simulated window"
    u = x[i - 1 : i + 2] - x[i]
    a, b, c = np.polyfit(u, y[i - 1 : i + 2], 2)
    u_star = -b / (2 * a)
    return float(x[i] + u_star), float(c - b * b / (4 * a))


def run_transient(
    elements: str, step: float, stop: float, vectors: Sequence[str]
) -> tuple[npt.NDArray[np.float64], dict[str, npt.NDArray[np.float64]]]:
    """Run a transient analysis from the given initial conditions (``uic``).

    Parameters
    ----------
    elements : netlist body; initial conditions as ``ic=`` on L and C lines
    step : print and maximum time step [s]
    stop : end time [s]
    vectors : ngspice vector expressions to record, e.g. ``i(L1)`` or ``v(g)``

    Returns
    -------
    t : time points [s]
    values : vector expression -> samples
    """
    executable = require_ngspice()
    with tempfile.TemporaryDirectory(prefix="picker-ngspice-") as tmp:
        directory = Path(tmp)
        data_path = directory / "transient.txt"
        control = [
            "option numdgt=15",
            f"tran {spice_number(step)} {spice_number(stop)} 0 {spice_number(step)} uic",
            f"wrdata {data_path} {' '.join(vectors)}",
        ]
        netlist_path = directory / "circuit.cir"
        netlist_path.write_text(
            "\n".join(
                ["* picker transient", elements.strip(), ".control", *control, ".endc", ".end"]
            )
            + "\n",
            encoding="ascii",
        )
        completed = subprocess.run(
            [executable, "-b", str(netlist_path)],
            capture_output=True,
            text=True,
            timeout=TIMEOUT_S,
            check=False,
            cwd=directory,
        )
        if not data_path.is_file():
            raise RuntimeError(
                f"ngspice wrote no transient data (exit {completed.returncode}):\n"
                f"{completed.stdout[-2000:]}\n{completed.stderr[-2000:]}"
            )
        # without wr_singlescale each vector is written as a (time, value) column pair
        table = np.loadtxt(data_path, ndmin=2)
        return table[:, 0], {name: table[:, 2 * i + 1] for i, name in enumerate(vectors)}
