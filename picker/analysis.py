"""Every circuit figure for every part at once, against one brief.

:func:`analyze_parts` works on numpy arrays over all parts (no loop over parts) and builds the
result frame once, so a million parts re-analyse in a fraction of a second. The columns are
named as the JSON keys of the analysis contract (``error_ppm`` flattened to
``error_tolerance_ppm`` ... ``error_rss_ppm``; ``external_caps_f`` as ``cap_a_f``/``cap_b_f``)
plus the catalog figures the ranking and alternates need and provenance flags
(``<field>_estimated``).

Conventions (as in the brief): the stray capacitance is across the crystal (traces and pads),
the pin capacitance is per pin to ground and is added to each load capacitor. Every figure is
an estimate from data-sheet values.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any, Literal, cast

import numpy as np
import pandas as pd

from picker.brief import Brief
from picker.physics import aging as aging_law
from picker.physics import budget as error_budget
from picker.physics import capacitors, crystal, drive, estimates, pierce, startup, temperature

CapSeries = Literal["E6", "E12", "E24"]

#: JSON name of each provenance flag column (``<name>_estimated``) in the analysis frame.
ESTIMATED_FIELDS: tuple[str, ...] = ("c0", "c1", "cut", "drive_level", "aging")

#: Board load aimed at for series-calibrated parts, which specify no load capacitance
#: [F]. Common practice: a mid-range load; the pulling figure then shows how far the part
#: runs from its series resonance in this parallel circuit.
SERIES_PART_TARGET_CL_F = 12e-12

#: First-year aging assumed when the catalog gives none [ppm], from memory: ±3 ppm/year is
#: a common figure for both AT-cut and tuning-fork parts.
DEFAULT_AGING_PPM = 3.0

#: An unequal capacitor pair replaces the nearest equal pair only when it brings the board
#: CL this much closer to the target [F]; smaller gains are within the capacitors' own
#: tolerance (common practice: equal caps keep the Pierce stage at its design point).
UNEQUAL_PAIR_GAIN_F = 0.1e-12

#: Start-up is counted from noise to full amplitude: ln(1 V / 1 µV) time constants.
STARTUP_AMPLITUDE_RATIO = 1e6

#: Catalog columns carried into the analysis frame unchanged (ranking, alternates, display).
PASS_THROUGH = (
    "mpn",
    "maker",
    "package",
    "mode",
    "series_calibrated",
    "tolerance_ppm",
    "stability_ppm",
    "temp_min_c",
    "temp_max_c",
    "esr_ohm",
    "aging_ppm",
    "length_mm",
    "width_mm",
    "height_mm",
    "price",
    "stock",
    "lifecycle",
    "qualification",
    "pinout",
    "msl",
    "source_path",
    "source_line",
)


def _col(parts: pd.DataFrame, name: str) -> np.ndarray:
    """A float64 column as an array (NaN when the column is absent)."""
    if name not in parts.columns:
        return np.full(len(parts), np.nan)
    return parts[name].to_numpy(dtype=float, na_value=np.nan)


def _series_flags(parts: pd.DataFrame) -> np.ndarray:
    """True for series-calibrated parts (no load capacitance in the catalog)."""
    if "series_calibrated" in parts.columns:
        return parts["series_calibrated"].to_numpy(dtype=bool)
    return np.isnan(_col(parts, "load_capacitance_f"))


def _factor(parts: pd.DataFrame, name: str) -> tuple[np.ndarray, np.ndarray]:
    """Integer codes per row and the labels they index (the last label is "" for missing).

    Categorical columns use their codes directly: converting a million-row text column to
    Python strings costs far more than the analysis itself.
    """
    n = len(parts)
    if name not in parts.columns:
        return np.zeros(n, dtype=np.int64), np.asarray([""], dtype=object)
    column = parts[name]
    if isinstance(column.dtype, pd.CategoricalDtype):
        codes = column.cat.codes.to_numpy().astype(np.int64)
        uniques = column.cat.categories
    else:
        codes, uniques = pd.factorize(column, sort=False)
        codes = np.asarray(codes, dtype=np.int64)
    labels = np.asarray([str(u) for u in uniques] + [""], dtype=object)
    return np.where(codes < 0, labels.size - 1, codes), labels


def _given(value: float | None, name: str) -> float:
    """A brief figure the amplifier form requires (the brief validates its presence)."""
    if value is None:
        raise ValueError(f"amplifier.{name}: required by this amplifier form")
    return float(value)


def _constant(n: int, text: str) -> Any:
    """A text column holding one value (categorical: no million Python strings)."""
    return pd.Categorical.from_codes(np.zeros(n, dtype=np.int8), categories=pd.Index([text]))


def _labelled(codes: np.ndarray, labels: np.ndarray) -> pd.Categorical:
    """A categorical from codes into ``labels`` (duplicates in ``labels`` are merged)."""
    small = pd.Categorical(np.asarray(labels, dtype=object))
    return pd.Categorical.from_codes(np.asarray(small.codes)[codes], categories=small.categories)


#: Nominal frequencies within this fraction of the brief's are the brief's frequency.
SAME_FREQUENCY = 1e-9


def frequency_matches(freq_hz: np.ndarray, brief: Brief) -> np.ndarray:
    """True where a part's nominal frequency is the brief's (exact, to 1e-9 relative)."""
    return np.asarray(
        np.abs(freq_hz - brief.frequency_hz) <= SAME_FREQUENCY * brief.frequency_hz, dtype=bool
    )


def analyze_parts(
    parts: pd.DataFrame, brief: Brief, *, every_frequency: bool = False
) -> pd.DataFrame:
    """All circuit figures for every row of the part table ``parts`` (same index).

    Parameters
    ----------
    parts : the part table (INTERFACES.md column schema, SI float columns).
    brief : the circuit and its limits.
    every_frequency : compute the circuit figures for parts at other nominal frequencies
        too. By default they are NaN there: such a part cannot serve this brief whatever its
        figures, and a catalog usually holds many frequencies, so skipping them makes a
        re-analysis several times faster. Catalog figures are always carried.

    Returns
    -------
    DataFrame with one row per part; figures in SI units except where the name says ppm.
    """
    f_nom = _col(parts, "freq_hz")
    match = frequency_matches(f_nom, brief)
    if every_frequency or match.all():
        return _analyze_rows(parts, brief)
    rows = np.flatnonzero(match)
    computed = _analyze_rows(parts.iloc[rows], brief)
    return _spread_rows(computed, parts, rows, brief, f_nom)


def _spread_rows(
    computed: pd.DataFrame, parts: pd.DataFrame, rows: np.ndarray, brief: Brief, f_nom: np.ndarray
) -> pd.DataFrame:
    """The analysis of ``rows`` placed into a frame over all of ``parts`` (others: NaN,
    False, or missing; catalog columns and the budget carried for every row)."""
    given = {name: computed[name] for name in computed.columns}
    columns = spread_columns(given, parts, rows, brief, f_nom)
    return pd.DataFrame(columns, index=parts.index, copy=False)


#: Flag columns that hold True for parts whose circuit figures are not computed.
_TRUE_WHEN_SKIPPED = frozenset({"caps_realisable"})


def spread_columns(
    computed: dict[str, Any],
    parts: pd.DataFrame,
    rows: np.ndarray,
    brief: Brief,
    f_nom: np.ndarray,
) -> dict[str, Any]:
    """Analysis columns of the rows ``rows`` of ``parts`` spread over all of ``parts``.

    Rows not analysed get NaN, False (True for ``caps_realisable``) or a missing category;
    catalog columns, the nominal frequency, the budget, C0/C1/L1 where the catalog gives
    them and the spec load capacitance are carried for every row. Same column order.
    """
    n = len(parts)
    out: dict[str, Any] = {}
    for name, value in computed.items():
        if name in PASS_THROUGH and name in parts:
            out[name] = parts[name]
            continue
        column = pd.Series(value, copy=False) if not isinstance(value, pd.Series) else value
        if isinstance(column.dtype, pd.CategoricalDtype):
            codes = np.full(n, -1, dtype=np.int64)
            codes[rows] = column.cat.codes.to_numpy()
            out[name] = pd.Categorical.from_codes(codes, categories=column.cat.categories)
        elif column.dtype == bool:
            flags = np.full(n, name in _TRUE_WHEN_SKIPPED, dtype=bool)
            flags[rows] = column.to_numpy(dtype=bool)
            out[name] = flags
        else:
            values = np.full(n, np.nan)
            values[rows] = column.to_numpy(dtype=float, na_value=np.nan)
            out[name] = values
    if "frequency_hz" in out:
        out["frequency_hz"] = f_nom
    if "budget_ppm" in out:
        out["budget_ppm"] = np.full(n, float(brief.budget_ppm))
    # Catalog figures stay visible for every part (NaN only where the catalog is silent).
    for name in ("c0_f", "c1_f", "l1_h"):
        if name in out:
            given = _col(parts, name).copy()
            given[rows] = pd.Series(computed[name], copy=False).to_numpy(dtype=float)
            out[name] = given
    if "spec_load_capacitance_f" in out:
        spec = np.where(_series_flags(parts), np.nan, _col(parts, "load_capacitance_f"))
        out["spec_load_capacitance_f"] = spec
    if "amplifier_form" in out:
        out["amplifier_form"] = _constant(n, brief.amplifier.form)
    return out


def _analyze_rows(parts: pd.DataFrame, brief: Brief) -> pd.DataFrame:
    """analyze_parts for every row given (see there)."""
    stage = board_stage(parts, brief)
    return analysis_frame(stage, amplifier_stage(stage, brief))


def board_key(brief: Brief) -> tuple[object, ...]:
    """The brief sections :func:`board_stage` reads (frozen, hashable): equal keys give
    identical crystal and board figures, so a caller may keep that stage while they hold."""
    amp = brief.amplifier
    return (
        brief.frequency_hz,
        brief.board,
        amp.pin_capacitance_f,
        amp.swing_v,
        amp.internal_caps,
        brief.temp_min_c,
        brief.temp_max_c,
        brief.lifetime_s,
        brief.budget_ppm,
    )


def amplifier_key(brief: Brief) -> tuple[object, ...]:
    """The brief sections :func:`amplifier_stage` reads on top of :func:`board_key`."""
    return (*board_key(brief), brief.amplifier, brief.limits.min_margin)


@dataclass(frozen=True)
class BoardStage:
    """Crystal and board figures of some parts: everything that does not depend on the
    amplifier's gain (the first two analysis stages; see :func:`board_stage`).

    Attributes
    ----------
    index : the analysed rows' index.
    head : analysis columns up to the trim sensitivity, in frame order.
    tail : drive, error-budget and provenance columns, in frame order.
    omega, r1, c0, cg, cd, c3, cl_spec, cl_board, l1 : arrays the amplifier stage needs
        [rad/s, ohm, F, F, F, F, F, F, H].
    """

    index: pd.Index
    head: dict[str, Any]
    tail: dict[str, Any]
    omega: np.ndarray
    r1: np.ndarray
    c0: np.ndarray
    cg: np.ndarray
    cd: np.ndarray
    c3: np.ndarray
    cl_spec: np.ndarray
    cl_board: np.ndarray
    l1: np.ndarray


def board_stage(parts: pd.DataFrame, brief: Brief) -> BoardStage:
    """Crystal-only figures (fs, fp, Q, L1, estimates) and board figures (caps, CL, pulling,
    trim, drive level, error budget) for every row of ``parts``; depends on the brief only
    through :func:`board_key`."""
    n = len(parts)
    amp, board = brief.amplifier, brief.board
    f_nom = _col(parts, "freq_hz")
    r1 = _col(parts, "esr_ohm")
    cl_spec = _col(parts, "load_capacitance_f")
    series = _series_flags(parts)
    cl_spec = np.where(series, np.nan, cl_spec)

    # Missing C0/C1/cut: typical values by package, mode and cut, flagged per part.
    typical = _typical_values(parts, f_nom)
    c0_given, c1_given, l1_given = _col(parts, "c0_f"), _col(parts, "c1_f"), _col(parts, "l1_h")
    has_c0 = np.isfinite(c0_given) & (c0_given > 0)
    has_c1 = np.isfinite(c1_given) & (c1_given > 0)
    has_l1 = np.isfinite(l1_given) & (l1_given > 0)
    with np.errstate(divide="ignore", invalid="ignore"):
        # A catalog L1 gives C1 exactly (the reciprocal of L1 = 1/(ω²·C1)), not an estimate.
        c1_from_l1 = crystal.motional_inductance(f_nom, l1_given)
    c0 = np.where(has_c0, c0_given, typical["c0_f"])
    c1 = np.where(has_c1, c1_given, np.where(has_l1, c1_from_l1, typical["c1_f"]))
    c0_estimated, c1_estimated = ~has_c0, ~has_c1 & ~has_l1
    cut, cut_estimated = typical["cut"], typical["cut_estimated"]
    tuning_fork = typical["tuning_fork"]

    # The nominal is the load-resonance frequency at the spec CL for parallel-calibrated parts
    # (invert the exact zero-phase relation); a series-calibrated part's nominal is fs.
    with np.errstate(invalid="ignore", divide="ignore"):
        # Start from the lossless exact inverse fs = f_nom/√(1 + C1/(C0+CL)) and correct once
        # with the exact zero-phase frequency: the R1 shift (≲ 1 ppm) contracts by about
        # C1/(C0+CL) ~ 1e-3 per step, so one step leaves < 1e-9 relative (tested).
        cl_use = np.where(series, np.inf, cl_spec)
        fs = f_nom / np.sqrt(1.0 + c1 / (c0 + cl_use))
        fs = np.where(
            series, f_nom, fs * f_nom / crystal.load_resonance_frequency(fs, r1, c1, c0, cl_use)
        )
        l1 = crystal.motional_inductance(fs, c1)
        fp = crystal.parallel_resonance(fs, c1, c0)
        q = crystal.quality_factor(fs, r1, c1)

    caps = _choose_caps(cl_spec, series, brief, n)
    cg = caps["cap_a_f"] + caps["pin_f"]
    cd = caps["cap_b_f"] + caps["pin_f"]
    stray = board.stray_capacitance_f
    cl_board = pierce.board_load_capacitance(cg, cd, stray)
    c3 = c0 + stray

    with np.errstate(invalid="ignore", divide="ignore"):
        # Pulling: the operating (load-resonance) frequency's offset from the nominal, which is
        # fL at the spec CL (= f_nom by the inversion above) or fs for series parts (= f_nom).
        f_board = crystal.load_resonance_frequency(fs, r1, c1, c0, cl_board)
        pulling = (f_board - f_nom) / f_nom * 1e6
        trim = crystal.trim_sensitivity_ppm_per_pf(c1, c0, cl_board)

    drive_rating = _col(parts, "drive_level_w")
    drive_estimated = ~(drive_rating > 0)
    drive_rating = np.where(drive_estimated, typical["drive_rating_w"], drive_rating)
    drive_w = drive.drive_level(r1, f_nom, amp.swing_v, c0, cl_board)

    aging_first_year = _col(parts, "aging_ppm")
    aging_estimated = np.isnan(aging_first_year)
    aging_first_year = np.where(aging_estimated, DEFAULT_AGING_PPM, aging_first_year)
    budget = _error_budget(
        parts, brief, tuning_fork, aging_first_year, pulling, caps, c0, c1, cl_board
    )

    head: dict[str, Any] = {name: parts[name] for name in PASS_THROUGH if name in parts}
    head.update(
        {
            "frequency_hz": f_nom,
            "fs_hz": fs,
            "fp_hz": fp,
            "q": q,
            "l1_h": l1,
            "c0_f": c0,
            "c1_f": c1,
            "cut": cut,
            "spec_load_capacitance_f": cl_spec,
            "load_capacitance_f": cl_board,
            "cap_a_f": caps["cap_a_f_external"],
            "cap_b_f": caps["cap_b_f_external"],
            "caps_source": caps["source"],
            "internal_cap_code": caps["code"],
            "ideal_cap_f": caps["ideal_f"],
            "caps_realisable": caps["realisable"],
            "cg_f": cg,
            "cd_f": cd,
            "c3_f": c3,
            "pulling_ppm": pulling,
            "trim_sensitivity_ppm_per_pf": trim,
        }
    )
    tail: dict[str, Any] = {
        "drive_level_w": drive_w,
        "drive_rating_w": drive_rating,
        **budget,
        "c0_estimated": c0_estimated,
        "c1_estimated": c1_estimated,
        "cut_estimated": cut_estimated,
        "drive_level_estimated": drive_estimated,
        "aging_estimated": aging_estimated,
    }
    return BoardStage(
        index=parts.index,
        head=head,
        tail=tail,
        omega=2.0 * np.pi * f_nom,
        r1=r1,
        c0=c0,
        cg=cg,
        cd=cd,
        c3=c3,
        cl_spec=cl_spec,
        cl_board=cl_board,
        l1=l1,
    )


def amplifier_stage(stage: BoardStage, brief: Brief) -> dict[str, Any]:
    """The amplifier-dependent columns (negative resistance, margins, gm figures, start-up
    time) for the rows of ``stage``; depends on the brief through :func:`amplifier_key`."""
    amp = brief.amplifier
    g2 = 0.0 if amp.output_resistance_ohm is None else 1.0 / amp.output_resistance_ohm
    g3 = 0.0 if amp.bias_resistance_ohm is None else 1.0 / amp.bias_resistance_ohm
    s = stage
    circuit = _amplifier_figures(
        brief, s.omega, s.r1, s.c0, s.cg, s.cd, s.c3, g2, g3, s.cl_spec, s.cl_board
    )
    with np.errstate(invalid="ignore", divide="ignore"):
        rneg = circuit["negative_resistance_ohm"]
        circuit["startup_time_s"] = startup.startup_time(
            s.l1, rneg, s.r1, ratio=STARTUP_AMPLITUDE_RATIO
        )
    return circuit


#: Where the amplifier stage's start-up column sits in the frame (after the drive figures).
_AFTER_DRIVE = ("drive_level_w", "drive_rating_w")


def analysis_columns(
    head: dict[str, Any], amplifier: dict[str, Any], tail: dict[str, Any]
) -> dict[str, Any]:
    """The analysis frame's columns in contract order from the stages' column sets."""
    circuit = {k: v for k, v in amplifier.items() if k != "startup_time_s"}
    columns: dict[str, Any] = {**head, **circuit}
    columns.update({name: tail[name] for name in _AFTER_DRIVE})
    columns["startup_time_s"] = amplifier["startup_time_s"]
    columns.update({k: v for k, v in tail.items() if k not in _AFTER_DRIVE})
    return columns


def analysis_frame(stage: BoardStage, amplifier: dict[str, Any]) -> pd.DataFrame:
    """The analysis frame of the rows of ``stage`` (see :func:`analyze_parts`)."""
    columns = analysis_columns(stage.head, amplifier, stage.tail)
    # copy=False: the columns are fresh arrays; consolidating them would copy every one.
    return pd.DataFrame(columns, index=stage.index, copy=False)


def _typical_values(parts: pd.DataFrame, f_nom: np.ndarray) -> dict[str, Any]:
    """Typical C0, C1, drive rating and the cut per part (physics.estimates), computed once
    per distinct (package, mode, cut, below 1 MHz) combination and spread back to the rows:
    the estimate tables are looked up per value, which would be slow over a million rows."""
    if len(parts) == 0:
        empty = np.zeros(0)
        return {
            "c0_f": empty,
            "c1_f": empty,
            "cut": pd.Categorical([]),
            "tuning_fork": np.zeros(0, dtype=bool),
            "cut_estimated": np.zeros(0, dtype=bool),
            "drive_rating_w": empty,
        }
    key = np.zeros(len(parts), dtype=np.int64)
    factors = {name: _factor(parts, name) for name in ("package", "mode", "cut")}
    for codes, labels in factors.values():
        key = key * labels.size + codes
    low = f_nom < estimates.TUNING_FORK_BELOW_HZ
    key = key * 2 + low
    back, distinct_keys = pd.factorize(key, sort=False)  # hashing: no sort of a million keys
    first = np.empty(len(distinct_keys), dtype=np.int64)
    first[back[::-1]] = np.arange(len(key))[::-1]  # last write wins: the first occurrence
    frame = pd.DataFrame({name: labels[codes[first]] for name, (codes, labels) in factors.items()})
    frame["low"] = low[first]
    # A stand-in frequency on the right side of the tuning-fork threshold per combination.
    freq = np.where(frame["low"].to_numpy(bool), 32768.0, 10e6)
    cut_text = frame["cut"].to_numpy(object)
    est = estimates.estimate_motional_capacitances(
        freq, frame["package"].to_numpy(object), frame["mode"].to_numpy(object), cut_text
    )
    rating = estimates.typical_max_drive_level_w(frame["package"].to_numpy(object), est.cut)
    return {
        "c0_f": np.asarray(est.c0_f)[back],
        "c1_f": np.asarray(est.c1_f)[back],
        "cut": _labelled(back, np.asarray(est.cut, dtype=object)),
        "tuning_fork": (np.asarray(est.cut, dtype=object) == "tuning_fork")[back],
        "cut_estimated": np.asarray(est.cut_inferred, dtype=bool)[back],
        "drive_rating_w": np.asarray(rating, dtype=float)[back],
    }


def _choose_caps(cl_spec: np.ndarray, series: np.ndarray, brief: Brief, n: int) -> dict[str, Any]:
    """Load capacitors per part: the brief's fixed pair, the chip's internal code, or E-series.

    Returns arrays ``cap_a_f``/``cap_b_f`` (the capacitance at each pin excluding the pin's
    own capacitance), the external values to report (NaN with internal caps), ``pin_f``,
    ``source`` ("fixed", "internal", "e_series"), ``code`` (internal code or ""),
    ``ideal_f`` (the ideal equal external value) and ``realisable``.
    """
    amp, board = brief.amplifier, brief.board
    stray, pin = board.stray_capacitance_f, amp.pin_capacitance_f
    target = np.where(series, SERIES_PART_TARGET_CL_F, cl_spec)
    ideal = capacitors.ideal_external_capacitance(target, stray, pin)
    pin_f = np.full(n, pin)
    code = _constant(n, "")
    if board.fixed_caps_f is not None:
        ca = np.full(n, board.fixed_caps_f[0])
        cb = np.full(n, board.fixed_caps_f[1])
        return {
            "cap_a_f": ca,
            "cap_b_f": cb,
            "cap_a_f_external": ca,
            "cap_b_f_external": cb,
            "pin_f": pin_f,
            "source": _constant(n, "fixed"),
            "code": code,
            "ideal_f": ideal,
            "realisable": np.ones(n, dtype=bool),
        }
    internal = amp.internal_caps
    if internal is not None and internal.choices():
        names = np.asarray([label for label, _ in internal.choices()], dtype=object)
        values = np.asarray([value for _, value in internal.choices()], dtype=float)
        # "load": the chip states the load it presents, so each pin carries twice that value
        # (two equal capacitors in series), the pin capacitance on top.
        per_pin = 2.0 * values if internal.applies_to == "load" else values
        cl_options = pierce.board_load_capacitance(per_pin + pin, per_pin + pin, stray)
        # Pick the setting whose board CL lands nearest the part's CL.
        # Once per distinct target CL (a catalog has few), then spread back to the rows.
        back, distinct = pd.factorize(np.where(np.isfinite(target), target, -1.0), sort=False)
        distinct = np.asarray(distinct, dtype=float)
        best = np.argmin(np.abs(cl_options[None, :] - distinct[:, None]), axis=1)[back]
        miss = np.abs(cl_options[best] - target)
        realisable = np.isfinite(target) & (miss <= internal_tolerance_f(cl_options))
        return {
            "cap_a_f": per_pin[best],
            "cap_b_f": per_pin[best],
            "cap_a_f_external": np.full(n, np.nan),
            "cap_b_f_external": np.full(n, np.nan),
            "pin_f": pin_f,
            "source": _constant(n, "internal"),
            "code": _labelled(best, names),
            "ideal_f": ideal,
            "realisable": realisable,
        }
    # The pair depends on the target CL only (stray and pin are the brief's), and a catalog
    # holds few distinct CL values: choose once per distinct target, then spread back.
    finite = np.where(np.isfinite(target), target, -1.0)
    back, distinct = pd.factorize(finite, sort=False)
    distinct = np.asarray(distinct, dtype=float)
    if distinct.size == 0:  # an empty part table
        distinct = np.asarray([-1.0])
    targets = np.where(distinct > 0, distinct, np.nan)
    series_name = cast(CapSeries, board.cap_series)
    equal = capacitors.choose_equal_pair(targets, stray, pin, series_name)
    chosen = capacitors.choose_unequal_pair(targets, stray, pin, series_name)
    # Equal caps unless an unequal pair lands materially closer: a gain of less than
    # UNEQUAL_PAIR_GAIN_F is below the capacitors' own tolerance (common practice).
    miss_equal = np.abs(np.asarray(equal.board_cl_f, dtype=float).reshape(-1) - targets)
    miss_unequal = np.abs(np.asarray(chosen.board_cl_f, dtype=float).reshape(-1) - targets)
    use_unequal = miss_unequal < miss_equal - UNEQUAL_PAIR_GAIN_F
    pick_a = np.where(use_unequal, chosen.cap_a_f, equal.cap_a_f).reshape(-1)
    pick_b = np.where(use_unequal, chosen.cap_b_f, equal.cap_b_f).reshape(-1)
    cap_a, cap_b = pick_a[back], pick_b[back]
    return {
        "cap_a_f": cap_a,
        "cap_b_f": cap_b,
        "cap_a_f_external": cap_a,
        "cap_b_f_external": cap_b,
        "pin_f": pin_f,
        "source": _constant(n, "e_series"),
        "code": code,
        "ideal_f": ideal,
        "realisable": np.asarray(chosen.realisable, dtype=bool).reshape(-1)[back],
    }


def internal_tolerance_f(cl_options: np.ndarray) -> float:
    """How far the programmed board CL may miss the part's CL and still count as realisable:
    one step of the setting table (1 pF when there is one setting) [F]. Outside the table's
    range the nearest setting misses by more and the part needs external capacitors."""
    steps = np.diff(np.sort(cl_options))
    return float(steps.max()) if steps.size else 1e-12


def _amplifier_figures(
    brief: Brief,
    omega: np.ndarray,
    r1: np.ndarray,
    c0: np.ndarray,
    cg: np.ndarray,
    cd: np.ndarray,
    c3: np.ndarray,
    g2: float,
    g3: float,
    cl_spec: np.ndarray,
    cl_board: np.ndarray,
) -> dict[str, Any]:
    """Negative resistance, margins and the figure ranked on, for the brief's amplifier form.

    ``form_margin`` is what the ranking compares with ``form_margin_required``:
    gm / gm_settings / negative_resistance: M = |Rneg|/R1 against the brief's minimum;
    gm_crit_max: chip max / part gm_crit against 1 (the chip's figure includes its margin);
    max_esr: allowed ESR / ESR against 1.
    """
    amp, limits = brief.amplifier, brief.limits
    n = omega.size
    form = amp.form
    nan = np.full(n, np.nan)
    required = np.full(n, float(limits.min_margin))
    # One set of Re(Zc) coefficients serves |Rneg|max, gm_crit and gm_opt (all with the
    # output and bias losses, so gm_opt is the optimum of the same network).
    coefficients = pierce.pierce_coefficients(omega, cg, cd, c3, 0.0, g2, g3)
    optimum = pierce.pierce_optimum(coefficients)
    rneg_max = optimum.rneg_max
    gm_crit = pierce.critical_transconductance_from(coefficients, r1)
    gm_opt = optimum.gm_opt
    setting = pd.Categorical.from_codes(
        np.full(n, -1, dtype=np.int8), categories=pd.Index([], dtype=object)
    )
    outside = np.zeros(n, dtype=bool)
    max_esr = nan
    lookup_cl = np.where(np.isnan(cl_spec), cl_board, cl_spec)

    if form in ("gm", "gm_settings", "negative_resistance"):
        if form == "gm":
            gm = np.full(n, _given(amp.gm_s, "gm"))
        elif form == "gm_settings":
            gm, setting = _lowest_setting(brief, omega, r1, cg, cd, c3, g2, g3)
        else:
            gm = _equivalent_gm(brief, omega, c0, g2, g3)
        rneg = pierce.negative_resistance(omega, gm, cg, cd, c3, 0.0, g2, g3)
        margin = np.maximum(-rneg, 0.0) / r1
        gain = gm / gm_crit
        form_margin = margin
    elif form == "gm_crit_max":
        gm, rneg, margin = nan, nan, nan
        gain = _given(amp.gm_crit_max_s, "gm_crit_max") / gm_crit
        form_margin = gain
        required = np.ones(n)
    elif form == "max_esr":
        gm, rneg, margin, gain = nan, nan, nan, nan
        max_esr, outside = max_esr_allowed(amp.max_esr, lookup_cl, c0)
        form_margin = max_esr / r1
        required = np.ones(n)
    else:  # pragma: no cover - the brief validates the form
        raise ValueError(f"amplifier form {form!r} is not known")
    return {
        "amplifier_form": _constant(n, form),
        "drive_setting": setting,
        "gm_s": gm,
        "negative_resistance_ohm": rneg,
        "negative_resistance_margin": margin,
        "negative_resistance_max_ohm": rneg_max,
        "gm_critical_s": gm_crit,
        "gm_optimum_s": gm_opt,
        "gain_margin": gain,
        "can_never_start": ~(r1 < rneg_max),
        "max_esr_ohm": max_esr,
        "esr_table_cl_f": lookup_cl,
        "outside_esr_table": outside,
        "form_margin": form_margin,
        "form_margin_required": required,
    }


def _lowest_setting(
    brief: Brief,
    omega: np.ndarray,
    r1: np.ndarray,
    cg: np.ndarray,
    cd: np.ndarray,
    c3: np.ndarray,
    g2: float,
    g3: float,
) -> tuple[np.ndarray, Any]:
    """Per part, the lowest named drive setting whose margin meets the minimum.

    Settings are ascending by gm, so the first one that meets the margin draws the least
    current. Parts that no setting serves get the highest setting (its margin is reported)
    and ``None`` as the setting name.
    """
    settings = brief.amplifier.gm_settings
    n = omega.size
    chosen_gm = np.full(n, float(settings[-1][1]))
    chosen = np.full(n, -1, dtype=np.int8)  # index of the setting; -1: none meets the margin
    for index, (_, gm_value) in enumerate(settings):
        rneg = pierce.negative_resistance(omega, gm_value, cg, cd, c3, 0.0, g2, g3)
        meets = (chosen < 0) & (np.maximum(-rneg, 0.0) / r1 >= brief.limits.min_margin)
        chosen_gm = np.where(meets, gm_value, chosen_gm)
        chosen = np.where(meets, index, chosen).astype(np.int8)
    names = [name for name, _ in settings]
    return chosen_gm, pd.Categorical.from_codes(chosen, categories=pd.Index(names))


def _equivalent_gm(
    brief: Brief, omega: np.ndarray, c0: np.ndarray, g2: float, g3: float
) -> np.ndarray:
    """The gm that gives the chip's stated |Rneg| at its stated CL (lower branch).

    The stated configuration is taken as equal caps giving that CL with this board's stray and
    pin capacitance and this part's C0; inverting the exact Rneg(gm) there is the critical-gm
    problem with R1 replaced by the stated |Rneg|. A stated figure above the ceiling
    |Rneg|max of that configuration is not reachable; gm_opt (the ceiling) is used then.
    """
    amp, board = brief.amplifier, brief.board
    stated = abs(_given(amp.negative_resistance_ohm, "negative_resistance"))
    cl = _given(amp.negative_resistance_cl_f, "negative_resistance")
    stray = board.stray_capacitance_f
    each = 2.0 * (cl - stray)  # gate and drain node capacitance, pins included
    cg = np.full(omega.size, each)
    c3 = c0 + stray
    gm = pierce.critical_transconductance(omega, stated, cg, cg, c3, 0.0, g2, g3)
    ceiling = pierce.optimum_transconductance(omega, cg, cg, c3, 0.0, g2, g3)
    return np.where(np.isfinite(gm), gm, ceiling)


def max_esr_allowed(table: Any, cl: np.ndarray, c0: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """Interpolate the chip's max-ESR table at each part's CL (and C0 when it has that axis).

    Linear interpolation inside the table; outside it the allowed ESR is NaN and the part is
    flagged (never extrapolated silently). Returns (allowed ESR [ohm], outside flag).
    """
    cl_points = np.asarray(table.load_capacitance_f, dtype=float)
    # Rows follow the CL axis, columns the C0 axis; None (unsupported) becomes NaN.
    grid = np.asarray(
        [[np.nan if cell is None else float(cell) for cell in row] for row in table.esr_ohm],
        dtype=float,
    )
    tolerance = 1e-15  # 0.001 pF: a CL equal to a table point is inside
    outside = ~((cl >= cl_points.min() - tolerance) & (cl <= cl_points.max() + tolerance))
    if table.c0_f is None:
        allowed = np.interp(cl, cl_points, grid[:, 0])
    else:
        c0_axis = np.asarray(table.c0_f, dtype=float)
        outside |= ~((c0 >= c0_axis.min() - tolerance) & (c0 <= c0_axis.max() + tolerance))
        allowed = _bilinear(cl_points, c0_axis, grid, cl, c0)
        outside |= np.isnan(allowed)
    return np.where(outside, np.nan, allowed), outside


def _bilinear(
    x_axis: np.ndarray, y_axis: np.ndarray, grid: np.ndarray, x: np.ndarray, y: np.ndarray
) -> np.ndarray:
    """Bilinear interpolation of ``grid[x_index, y_index]`` (NaN cells propagate)."""
    xi = np.clip(np.searchsorted(x_axis, x) - 1, 0, max(x_axis.size - 2, 0))
    yi = np.clip(np.searchsorted(y_axis, y) - 1, 0, max(y_axis.size - 2, 0))
    if x_axis.size == 1 or y_axis.size == 1:
        return grid[np.minimum(xi, grid.shape[0] - 1), np.minimum(yi, grid.shape[1] - 1)]
    x0, x1 = x_axis[xi], x_axis[xi + 1]
    y0, y1 = y_axis[yi], y_axis[yi + 1]
    tx = np.clip((x - x0) / (x1 - x0), 0.0, 1.0)
    ty = np.clip((y - y0) / (y1 - y0), 0.0, 1.0)
    v00, v01 = grid[xi, yi], grid[xi, yi + 1]
    v10, v11 = grid[xi + 1, yi], grid[xi + 1, yi + 1]
    return (1 - tx) * ((1 - ty) * v00 + ty * v01) + tx * ((1 - ty) * v10 + ty * v11)


def _error_budget(
    parts: pd.DataFrame,
    brief: Brief,
    tuning_fork: np.ndarray,
    aging_first_year: np.ndarray,
    pulling: np.ndarray,
    caps: dict[str, np.ndarray],
    c0: np.ndarray,
    c1: np.ndarray,
    cl_board: np.ndarray,
) -> dict[str, np.ndarray]:
    """Worst-case and RSS frequency error [ppm] from its five causes, and the headroom."""
    board = brief.board
    tolerance = _col(parts, "tolerance_ppm")
    # Tuning forks: the parabola over the brief's range with β and T0 anywhere in their
    # typical spreads (the catalog's β/T0 when given); other cuts: the rated stability.
    drift = _col(parts, "stability_ppm").copy()
    if tuning_fork.any():  # the parabola only where needed: most parts are AT-cut
        drift[tuning_fork] = temperature.temperature_drift_budget_ppm(
            True,
            drift[tuning_fork],
            brief.temp_min_c,
            brief.temp_max_c,
            beta=_col(parts, "beta_ppm_per_c2")[tuning_fork],
            t0=_col(parts, "turnover_c")[tuning_fork],
        )
    aging = np.abs(aging_law.aging_ppm(aging_first_year, brief.lifetime_s))
    # Spread: both caps at ± their tolerance (absolute below 10 pF) plus the stray
    # uncertainty, turned into ppm through the load-resonance offset at the board CL.
    delta_cl = error_budget.load_capacitance_spread_f(
        caps["cap_a_f"],
        caps["cap_b_f"],
        caps["pin_f"],
        board.cap_tolerance,
        board.stray_uncertainty_f,
        board.cap_tolerance_small_f,
    )
    spread = error_budget.load_spread_ppm(c1, c0, cl_board, delta_cl)
    terms = error_budget.frequency_error_budget(tolerance, drift, aging, pulling, spread)
    budget = np.full(len(parts), float(brief.budget_ppm))
    total = np.asarray(terms.total_ppm)
    return {
        "error_tolerance_ppm": terms.tolerance_ppm,
        "error_temperature_ppm": terms.temperature_ppm,
        "error_aging_ppm": terms.aging_ppm,
        "error_pulling_ppm": terms.pulling_ppm,
        "error_spread_ppm": terms.spread_ppm,
        "error_total_ppm": total,
        "error_rss_ppm": terms.rss_ppm,
        "budget_ppm": budget,
        "budget_headroom_ppm": budget - total,
    }
