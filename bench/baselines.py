"""Two baselines doing the same per-part math as ``picker rank``, for the benchmark ratios.

(a) ``rank_loop``: the straightforward script an engineer would write first, one Python loop
    iteration per part (``math``/``cmath``), no numpy.
(b) ``rank_duckdb``: the same filter and formulas as one SQL query in DuckDB over the part
    table (registered zero-copy through Arrow).

Both compute, per part: the equal load capacitors (ideal 2·(CL − C_stray) − C_pin, rounded to
E12 by log-nearest index), the board CL, the exact Pierce negative resistance
Re(Zc) = Re((gm + Y1 + Y2) / (Y1·Y2 + Y3·(Y1 + Y2 + gm))) with Yi = Gi + jωCi (Vittoz,
Degrauwe & Bitz, IEEE JSSC 23(3), 1988), the margin |Rneg|/R1, gm_crit, pulling
C1/2·(1/(C0+CL_board) − 1/(C0+CL_spec)), trim sensitivity, the worst-case frequency budget
(tolerance + temperature + log-law aging + |pulling| + |S|·ΔCL), drive level
R1·(π·f·Vpp·(C0+CL))²/2, the hard checks and a score, then order the parts.

Same filter as picker: only the parts at the brief's nominal frequency (within 1e-9
relative, :data:`SAME_FREQUENCY`) get the circuit math; every other part is ruled out by
frequency with only its catalog checks (temperature range, package) and a zero score, and
still takes its place in the order. They are
benchmarks of the work, not second implementations to trust: missing C0/C1 get one fixed
typical value instead of picker's package table.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Any

import numpy as np
import pandas as pd

#: IEC 60063 E12 mantissas.
E12 = (1.0, 1.2, 1.5, 1.8, 2.2, 2.7, 3.3, 3.9, 4.7, 5.6, 6.8, 8.2)
#: Fill-ins for missing C0/C1 (typical values, common practice; benchmark only).
TYPICAL_C0_F = 3e-12
TYPICAL_C1_F = 5e-15
TYPICAL_DRIVE_W = 100e-6
TYPICAL_AGING_PPM = 3.0
#: Log-law aging constant B [1/day] (MIL-PRF-55310 form f(t) = A·ln(B·t + 1)).
AGING_B_PER_DAY = 0.1
#: Tuning-fork parabola, worst case of the typical spread (from memory).
BETA_WORST_PPM_PER_C2 = -0.040
TURNOVER_SPREAD_C = 5.0
#: Nominal frequencies within this fraction of the brief's are the brief's (as picker).
SAME_FREQUENCY = 1e-9


@dataclass(frozen=True)
class Circuit:
    """The brief reduced to the plain SI numbers the baselines need."""

    frequency_hz: float
    gm_s: float
    pin_f: float
    swing_v: float
    g2_s: float
    g3_s: float
    stray_f: float
    stray_uncertainty_f: float
    cap_tolerance: float
    budget_ppm: float
    temp_low_c: float
    temp_high_c: float
    lifetime_days: float
    min_margin: float
    packages: tuple[str, ...]


def circuit_from_brief(brief: Any) -> Circuit:
    """Read the numbers out of a ``picker.brief.Brief`` (attribute names per picker/brief.py)."""
    amp, board, limits = brief.amplifier, brief.board, brief.limits
    rout = getattr(amp, "output_resistance_ohm", None)
    rbias = getattr(amp, "bias_resistance_ohm", None)
    gm = getattr(amp, "gm_s", None)
    low, high = _temperature_range(brief)
    return Circuit(
        frequency_hz=float(_first(brief, "frequency_hz", "frequency")),
        gm_s=float(gm) if gm is not None else 1e-3,
        pin_f=float(amp.pin_capacitance_f),
        swing_v=float(amp.swing_v),
        g2_s=0.0 if rout is None else 1.0 / float(rout),
        g3_s=0.0 if rbias is None else 1.0 / float(rbias),
        stray_f=float(board.stray_capacitance_f),
        stray_uncertainty_f=float(_first(board, "stray_uncertainty_f", default=0.0)),
        cap_tolerance=float(_first(board, "cap_tolerance", "cap_tolerance_fraction", default=0.05)),
        budget_ppm=float(_first(brief, "budget_ppm", "budget")),
        temp_low_c=low,
        temp_high_c=high,
        lifetime_days=float(_first(brief, "lifetime_s", default=10 * 365.25 * 86400)) / 86400.0,
        min_margin=float(limits.min_margin),
        packages=tuple(str(p) for p in (getattr(limits, "packages", None) or ())),
    )


def _first(obj: Any, *names: str, default: Any = None) -> Any:
    for name in names:
        value = getattr(obj, name, None)
        if value is not None:
            return value
    if default is None:
        raise AttributeError(f"{type(obj).__name__} has none of {names}")
    return default


def _temperature_range(brief: Any) -> tuple[float, float]:
    for name in ("temperature_c", "temperature", "temperature_range_c"):
        value = getattr(brief, name, None)
        if value is not None:
            low, high = value
            return float(low), float(high)
    return float(brief.temp_min_c), float(brief.temp_max_c)


def with_gm(circuit: Circuit, gm_s: float) -> Circuit:
    """A copy with another transconductance (the benchmark's "brief change")."""
    from dataclasses import replace

    return replace(circuit, gm_s=gm_s)


# --------------------------------------------------------------------------- (a) the loop


def _e12_nearest(value_f: float) -> float:
    if not value_f > 0:
        return E12[0] * 1e-12
    index = round(12.0 * math.log10(value_f / 1e-12))
    decade, step = divmod(index, 12)
    return E12[step] * 1e-12 * 10.0**decade


def rank_loop(rows: list[dict[Any, Any]], circuit: Circuit) -> list[tuple[Any, ...]]:
    """Per-part Python loop: figures, checks and score for each row, then sorted.

    ``rows`` are dicts with the part-table column names (``DataFrame.to_dict("records")``),
    converted before timing starts, as a script reading a CSV would hold them.
    """
    c = circuit
    out: list[tuple[Any, ...]] = []
    nan = math.nan
    for row in rows:
        f = row["freq_hz"]
        if not abs(f - c.frequency_hz) <= SAME_FREQUENCY * c.frequency_hz:
            # The frequency filter first, as picker: no circuit figures at another frequency.
            fails = 1
            if row["temp_min_c"] > c.temp_low_c or row["temp_max_c"] < c.temp_high_c:
                fails |= 2
            if c.packages and str(row["package"]) not in c.packages:
                fails |= 4
            out.append((True, -0.0, row["mpn"], nan, nan, nan, nan, nan, fails))
            continue
        r1 = row["esr_ohm"]
        c0 = row.get("c0_f")
        c0 = TYPICAL_C0_F if c0 is None or c0 != c0 else c0
        c1 = row.get("c1_f")
        c1 = TYPICAL_C1_F if c1 is None or c1 != c1 else c1
        series = bool(row.get("series_calibrated", False))
        cl_spec = row["load_capacitance_f"]
        target = 12e-12 if series or cl_spec != cl_spec else cl_spec
        ideal = 2.0 * (target - c.stray_f) - c.pin_f
        cap = _e12_nearest(ideal)
        cg = cd = cap + c.pin_f
        cl_board = cg * cd / (cg + cd) + c.stray_f
        c3 = c0 + c.stray_f
        w = 2.0 * math.pi * f
        y1 = complex(0.0, w * cg)
        y2 = complex(c.g2_s, w * cd)
        y3 = complex(c.g3_s, w * c3)
        zc = (c.gm_s + y1 + y2) / (y1 * y2 + y3 * (y1 + y2 + c.gm_s))
        rneg = zc.real
        margin = max(-rneg, 0.0) / r1
        gm_crit = w * w * r1 * cg * cd * (1 + c3 / cg + c3 / cd) ** 2
        if series:
            pulling = c1 / (2.0 * (c0 + cl_board)) * 1e6
        else:
            pulling = c1 / 2.0 * (1.0 / (c0 + cl_board) - 1.0 / (c0 + target)) * 1e6
        trim = -c1 / (2.0 * (c0 + cl_board) ** 2) * 1e6 * 1e-12
        delta_cl = c.cap_tolerance * cap / 2.0 + c.stray_uncertainty_f
        spread = abs(trim) * delta_cl * 1e12
        stability = row.get("stability_ppm")
        if f < 1e6:
            worst_dt = max(
                abs(t - t0)
                for t in (c.temp_low_c, c.temp_high_c)
                for t0 in (25.0 - TURNOVER_SPREAD_C, 25.0 + TURNOVER_SPREAD_C)
            )
            temperature = abs(BETA_WORST_PPM_PER_C2) * worst_dt**2
        else:
            temperature = stability if stability == stability and stability is not None else 0.0
        aging_first = row.get("aging_ppm")
        aging_first = (
            TYPICAL_AGING_PPM if aging_first is None or aging_first != aging_first else aging_first
        )
        aging = (
            aging_first
            * math.log(AGING_B_PER_DAY * c.lifetime_days + 1.0)
            / math.log(AGING_B_PER_DAY * 365.0 + 1.0)
        )
        total = row["tolerance_ppm"] + temperature + aging + abs(pulling) + spread
        drive = r1 * (math.pi * f * c.swing_v * (c0 + cl_board)) ** 2 / 2.0
        rating = row.get("drive_level_w")
        rating = TYPICAL_DRIVE_W if rating is None or rating != rating else rating
        fails = 0
        if row["temp_min_c"] > c.temp_low_c or row["temp_max_c"] < c.temp_high_c:
            fails |= 2
        if c.packages and str(row["package"]) not in c.packages:
            fails |= 4
        if margin < c.min_margin:
            fails |= 8
        if drive > rating:
            fails |= 16
        if total > c.budget_ppm:
            fails |= 32
        score = min(margin / (4.0 * c.min_margin), 1.0) + max(0.0, 1.0 - total / c.budget_ppm)
        out.append((fails != 0, -score, row["mpn"], margin, gm_crit, pulling, total, drive, fails))
    out.sort()
    return out


def time_loop_scaled(
    parts: pd.DataFrame, circuit: Circuit, *, sample: int, repeats: int = 3
) -> tuple[float, int]:
    """Best-of time of the loop on a ``sample``-row subsample, scaled to ``len(parts)`` rows.

    The loop costs the same per row, so the scaled figure is the full-table estimate; sorting
    is n·log n, so scaling slightly understates the loop (in its favour). Returns
    (seconds for all rows, rows actually timed).
    """
    import time

    take = min(sample, len(parts))
    rows = parts.iloc[:take].to_dict("records")
    best = math.inf
    for attempt in range(repeats):
        varied = with_gm(circuit, circuit.gm_s * (1.0 + 0.01 * (attempt + 1)))
        start = time.perf_counter()
        rank_loop(rows, varied)
        best = min(best, time.perf_counter() - start)
    return best * len(parts) / take, take


# --------------------------------------------------------------------------- (b) DuckDB


def _duckdb_sql(c: Circuit) -> str:
    e12 = ", ".join(repr(m) for m in E12)
    packages = ", ".join("'" + p.replace("'", "''") + "'" for p in c.packages) or "NULL"
    package_check = f"CAST(package AS VARCHAR) NOT IN ({packages})" if c.packages else "FALSE"
    tf_dt = max(
        abs(t - t0)
        for t in (c.temp_low_c, c.temp_high_c)
        for t0 in (25.0 - TURNOVER_SPREAD_C, 25.0 + TURNOVER_SPREAD_C)
    )
    aging_factor = math.log(AGING_B_PER_DAY * c.lifetime_days + 1.0) / math.log(
        AGING_B_PER_DAY * 365.0 + 1.0
    )
    return f"""
WITH p AS (
  SELECT *,
    coalesce(c0_f, {TYPICAL_C0_F}) AS c0, coalesce(c1_f, {TYPICAL_C1_F}) AS c1,
    CASE WHEN series_calibrated OR load_capacitance_f IS NULL OR isnan(load_capacitance_f)
         THEN 12e-12 ELSE load_capacitance_f END AS target,
    2 * pi() * freq_hz AS w
  FROM parts
  WHERE abs(freq_hz - {c.frequency_hz}) <= {SAME_FREQUENCY * c.frequency_hz}
), k AS (
  SELECT *, CAST(round(12 * log10(greatest(2 * (target - {c.stray_f}) - {c.pin_f}, 1e-13)
                        / 1e-12)) AS BIGINT) AS e_index
  FROM p
), caps AS (
  SELECT *,
    ([{e12}])[(e_index % 12 + 12) % 12 + 1] * 1e-12 * pow(10, floor(e_index / 12.0)) AS cap
  FROM k
), node AS (
  SELECT *, cap + {c.pin_f} AS cg, cap + {c.pin_f} AS cd, c0 + {c.stray_f} AS c3 FROM caps
), z AS (
  SELECT *,
    (cg * cd) / (cg + cd) + {c.stray_f} AS cl_board,
    {c.gm_s} + {c.g2_s} AS nr, w * (cg + cd) AS ni
  FROM node
), zz AS (
  SELECT *,
    -w * w * cg * cd + {c.g3_s} * nr - w * c3 * ni AS dr,
    w * ({c.g2_s} * cg) + {c.g3_s} * ni + w * c3 * nr AS di
  FROM z
), fig AS (
  SELECT *,
    (nr * dr + ni * di) / (dr * dr + di * di) AS rneg,
    w * w * esr_ohm * cg * cd * pow(1 + c3 / cg + c3 / cd, 2) AS gm_crit,
    CASE WHEN series_calibrated THEN c1 / (2 * (c0 + cl_board)) * 1e6
         ELSE c1 / 2 * (1 / (c0 + cl_board) - 1 / (c0 + target)) * 1e6 END AS pulling,
    -c1 / (2 * pow(c0 + cl_board, 2)) * 1e-6 AS trim,
    esr_ohm * pow(pi() * freq_hz * {c.swing_v} * (c0 + cl_board), 2) / 2 AS drive
  FROM zz
), bud AS (
  SELECT *,
    greatest(-rneg, 0) / esr_ohm AS margin,
    tolerance_ppm
      + CASE WHEN freq_hz < 1e6 THEN {abs(BETA_WORST_PPM_PER_C2) * tf_dt**2}
             ELSE coalesce(stability_ppm, 0) END
      + coalesce(aging_ppm, {TYPICAL_AGING_PPM}) * {aging_factor}
      + abs(pulling)
      + abs(trim) * ({c.cap_tolerance} * cap / 2 + {c.stray_uncertainty_f}) * 1e12 AS total
  FROM fig
), chk AS (
  SELECT *,
    (CASE WHEN temp_min_c > {c.temp_low_c} OR temp_max_c < {c.temp_high_c} THEN 2 ELSE 0 END)
    | (CASE WHEN {package_check} THEN 4 ELSE 0 END)
    | (CASE WHEN margin < {c.min_margin} THEN 8 ELSE 0 END)
    | (CASE WHEN drive > coalesce(drive_level_w, {TYPICAL_DRIVE_W}) THEN 16 ELSE 0 END)
    | (CASE WHEN total > {c.budget_ppm} THEN 32 ELSE 0 END) AS fails,
    least(margin / {4.0 * c.min_margin}, 1) + greatest(0, 1 - total / {c.budget_ppm}) AS score
  FROM bud
)
SELECT mpn, margin, gm_crit, pulling, total, drive, fails, score FROM chk
UNION ALL
SELECT mpn, NULL, NULL, NULL, NULL, NULL,
    1 | (CASE WHEN temp_min_c > {c.temp_low_c} OR temp_max_c < {c.temp_high_c} THEN 2 ELSE 0 END)
      | (CASE WHEN {package_check} THEN 4 ELSE 0 END),
    0.0
FROM parts
WHERE NOT (abs(freq_hz - {c.frequency_hz}) <= {SAME_FREQUENCY * c.frequency_hz})
ORDER BY fails <> 0, score DESC, mpn
"""


def duckdb_connection(parts: pd.DataFrame) -> Any:
    """A DuckDB connection with ``parts`` registered as the view ``parts`` (zero copy)."""
    import duckdb

    con = duckdb.connect()
    table = parts[[c for c in parts.columns if c in _DUCKDB_COLUMNS]].copy()
    table["package"] = table["package"].astype(str)
    con.register("parts", table)
    return con


_DUCKDB_COLUMNS = frozenset(
    {
        "mpn", "freq_hz", "esr_ohm", "c0_f", "c1_f", "series_calibrated", "load_capacitance_f",
        "tolerance_ppm", "stability_ppm", "aging_ppm", "temp_min_c", "temp_max_c", "package",
        "drive_level_w",
    }
)  # fmt: skip


def rank_duckdb(con: Any, circuit: Circuit) -> Any:
    """Run the ranking query; the result is fetched as an Arrow table (cheapest transfer)."""
    return con.sql(_duckdb_sql(circuit)).to_arrow_table()


def loop_matches_vector(parts: pd.DataFrame, circuit: Circuit, *, sample: int = 2000) -> float:
    """Largest relative difference of the margin between the loop and DuckDB on a sample.

    A self-check that the two baselines do the same math (0 means identical).
    """
    head = parts.iloc[:sample]
    loop = {row[2]: row[3] for row in rank_loop(head.to_dict("records"), circuit)}
    con = duckdb_connection(head)
    result = rank_duckdb(con, circuit).to_pandas()
    db = dict(zip(result["mpn"], result["margin"], strict=True))
    diffs = [abs(loop[m] - db[m]) / max(abs(loop[m]), 1e-12) for m in loop if np.isfinite(loop[m])]
    return max(diffs) if diffs else 0.0
