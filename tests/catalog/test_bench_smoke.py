"""Smoke test of the benchmark's own pieces (fast; no timings are asserted).

The baselines must do the published math, or the benchmark's ratios mean nothing: the loop
is checked against the worked Pierce example in DESIGN.md §4 (16 MHz, R1 = 80 Ω,
C0 = 7 pF, Cg = Cd = 18 pF, gm = 17 mA/V: gm/gm_crit = 20.5, |Rneg|/R1 = 3.9; formulas of
Vittoz, Degrauwe & Bitz, IEEE JSSC 23(3), 1988), and the DuckDB query against the loop.
"""

from __future__ import annotations

import math
import sys
from pathlib import Path

import numpy as np
import pandas as pd
import pytest

ROOT = Path(__file__).resolve().parents[2]
sys.path.insert(0, str(ROOT))

from bench import baselines  # noqa: E402
from bench.report import Row, format_table, ratio_row, target_row  # noqa: E402

EXAMPLE = baselines.Circuit(
    frequency_hz=16e6,
    gm_s=17e-3,
    pin_f=0.0,
    swing_v=1.0,
    g2_s=0.0,
    g3_s=0.0,
    stray_f=0.0,
    stray_uncertainty_f=0.0,
    cap_tolerance=0.05,
    budget_ppm=100.0,
    temp_low_c=-20.0,
    temp_high_c=70.0,
    lifetime_days=3652.5,
    min_margin=5.0,
    packages=(),
)


def example_row(**changes: object) -> dict[str, object]:
    row: dict[str, object] = {
        "mpn": "DEMO-16M",
        "freq_hz": 16e6,
        "esr_ohm": 80.0,
        "c0_f": 7e-12,
        "c1_f": 5e-15,
        "series_calibrated": False,
        # CL 9 pF with no stray or pin capacitance asks for 18 pF caps, an E12 value.
        "load_capacitance_f": 9e-12,
        "tolerance_ppm": 10.0,
        "stability_ppm": 20.0,
        "aging_ppm": 3.0,
        "temp_min_c": -40.0,
        "temp_max_c": 85.0,
        "package": "3225",
        "drive_level_w": 100e-6,
    }
    row.update(changes)
    return row


def test_loop_reproduces_the_worked_pierce_example() -> None:
    (result,) = baselines.rank_loop([example_row()], EXAMPLE)
    margin, gm_crit = result[3], result[4]
    # DESIGN.md §4 worked example (from the Vittoz formulas): ratio 20.5, margin 3.9.
    assert EXAMPLE.gm_s / gm_crit == pytest.approx(20.5, abs=0.05)
    assert margin == pytest.approx(3.9, abs=0.05)
    # Lossless closed form, Vittoz et al. 1988: Re(Zc) = -gm·Cg·Cd / ((gm·C3)² + ω²(...)²).
    w, cg, c3, gm = 2 * math.pi * 16e6, 18e-12, 7e-12, 17e-3
    rneg = -gm * cg * cg / ((gm * c3) ** 2 + w**2 * (cg * cg + c3 * 2 * cg) ** 2)
    assert margin == pytest.approx(-rneg / 80.0, rel=1e-12)


def test_loop_pulling_is_zero_at_the_specified_load() -> None:
    # Pulling C1/2·(1/(C0+CL_board) − 1/(C0+CL_spec)) vanishes when the board gives CL_spec.
    (result,) = baselines.rank_loop([example_row()], EXAMPLE)
    assert abs(result[5]) < 1e-9
    # 2 pF of stray: ideal caps 2·(9 − 2) = 14 pF → E12 15 pF, board CL 7.5 + 2 = 9.5 pF,
    # pulling C1/2·(1/(7 + 9.5) − 1/(7 + 9)) pF⁻¹ = −4.735 ppm (worked by hand).
    circuit = baselines.Circuit(**{**EXAMPLE.__dict__, "stray_f": 2e-12})
    (strayed,) = baselines.rank_loop([example_row()], circuit)
    assert strayed[5] == pytest.approx(-4.735, abs=0.001)


def test_duckdb_query_agrees_with_the_loop() -> None:
    pytest.importorskip("duckdb")
    rows = [
        example_row(
            mpn=f"DEMO-{i}",
            esr_ohm=20.0 + 7.0 * i,
            # Half at the circuit's 16 MHz: the others take the frequency filter's branch.
            freq_hz=16e6 if i % 2 else 8e6 + 1e6 * i,
            load_capacitance_f=(6 + i % 8) * 1e-12,
            package=("3225", "2520")[i % 2],
        )
        for i in range(40)
    ]
    parts = pd.DataFrame(rows)
    circuit = baselines.Circuit(
        **{
            **EXAMPLE.__dict__,
            "stray_f": 2e-12,
            "pin_f": 1.5e-12,
            "g2_s": 1 / 8e3,
            "g3_s": 1e-6,
            "packages": ("3225",),
        }
    )
    loop = {r[2]: r for r in baselines.rank_loop(rows, circuit)}
    table = baselines.rank_duckdb(baselines.duckdb_connection(parts), circuit).to_pandas()
    assert len(table) == len(rows)
    assert np.isfinite(table["margin"].to_numpy(dtype=float)).sum() >= 20  # circuit math ran
    for record in table.itertuples():
        mine = loop[record.mpn]
        # NaN on both sides for parts at another frequency (no circuit figures there).
        assert record.margin == pytest.approx(mine[3], rel=1e-9, nan_ok=True)
        assert record.total == pytest.approx(mine[6], rel=1e-9, nan_ok=True)
        assert record.fails == mine[8]
    assert list(table["mpn"]) == [r[2] for r in baselines.rank_loop(rows, circuit)]


def test_report_marks_pass_and_miss() -> None:
    fast = target_row("x", {"t": 0.010}, "t", limit=0.015)
    slow = target_row("y", {"t": 0.030}, "t", limit=0.015)
    absent = target_row("z", {"error": "module missing"}, "t", limit=0.015)
    assert (fast.verdict, slow.verdict, absent.value) == ("PASS", "MISS", "n/a")
    assert "2.00× over" in slow.note
    ratio = ratio_row("r", {"a": 1.0}, "a", {"b": 0.02}, "b", at_least=100.0)
    assert ratio.verdict == "MISS" and ratio.value.startswith("50.0")
    text = format_table([fast, slow, absent, ratio, Row("n", "1")], title="t")
    assert "1 PASS, 2 MISS, 1 n/a" in text
