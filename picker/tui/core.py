"""`PickerCore`: the UI's adapter onto the real catalog, brief, ranking and physics.

This is the only module of the UI that imports the core packages. Every number it hands
to the screens comes from the same functions the command line uses (picker.rank,
picker.report, picker.alternates, picker.physics), so a figure on screen and the same
figure from `picker analyze --format json` agree; this module only selects and formats.
"""

from __future__ import annotations

import math
from collections.abc import Mapping, Sequence
from pathlib import Path
from typing import Any

import numpy as np
import pandas as pd

from picker.tui.export import markdown_text
from picker.tui.model import (
    Alternate,
    Alternates,
    DriftCurve,
    Figure,
    ImpedanceCurve,
    Loaded,
    Match,
    PartSheet,
    Preset,
    Progress,
    Shortlist,
    Source,
)

RULE_LABELS = {
    "frequency": "frequency differs",
    "never_starts": "can never start",
    "temperature_range": "rated range too narrow",
    "package": "package not allowed",
    "caps": "load caps not realisable",
    "margin": "margin below the minimum",
    "drive": "over-driven",
    "budget": "over the error budget",
    "lifecycle": "lifecycle not allowed",
    "height": "too tall",
    "qualification": "qualification missing",
    "stock": "stock too low",
}
"""Short label of each hard rule of picker.rank, for the ruled-out list before the
sentence (with the part's numbers) is built for the rows on screen."""

SHORTLIST_SOURCE = {
    "mpn": "mpn",
    "status": "status",
    "score": "score",
    "package": "package",
    "spec_cl_f": "spec_load_capacitance_f",
    "esr_ohm": "esr_ohm",
    "margin": "form_margin",
    "margin_required": "form_margin_required",
    "gain_margin": "gain_margin",
    "total_ppm": "error_total_ppm",
    "headroom_ppm": "budget_headroom_ppm",
}
"""Shortlist column (picker.tui.model.SHORTLIST_COLUMNS) -> analysis column it shows."""

MARKDOWN_COLUMNS = (
    "rank",
    "mpn",
    "status",
    "score",
    "package",
    "negative_resistance_margin",
    "error_total_ppm",
    "budget_headroom_ppm",
)

ALTERNATES_SHOWN = 500
"""Alternates written out in words (the sentences cost time; the counts cover them all)."""

IMPEDANCE_SAMPLES = 600
DRIFT_SAMPLES = 61
AT_CUT_ANGLES_DEG = np.linspace(-0.25, 0.25, 51)
"""Cut-angle deviations scanned to draw an AT-cut part's possible curves [degree]."""


def bundled_briefs() -> tuple[Path, ...]:
    """The demo briefs shipped with the program: never saved over."""
    try:
        from picker.brief import demo_brief_paths

        return tuple(Path(p) for p in demo_brief_paths())
    except (ImportError, OSError):
        return ()


def _quantity(value: object, dimension: str, digits: int = 2) -> str:
    """SI value as short text with a prefix; `digits` decimals after the prefix."""
    from catalog.units import format_quantity

    number = _float(value)
    if number is None:
        return "—"
    return format_quantity(number, dimension, digits=digits)  # type: ignore[arg-type]


def _float(value: object) -> float | None:
    try:
        number = float(value)  # type: ignore[arg-type]
    except (TypeError, ValueError):
        return None
    return number if math.isfinite(number) else None


def _label(value: object) -> str:
    """Text of an optional label column ("" for None, NaN and empty)."""
    if value is None or (isinstance(value, float) and math.isnan(value)):
        return ""
    text = str(value)
    return "" if text in ("nan", "None", "<NA>") else text


def _ratio(value: object) -> str:
    number = _float(value)
    return "—" if number is None else f"{number:.3g}"


def _ppm(value: object, signed: bool = False) -> str:
    """ppm with three significant digits; below 0.005 ppm it reads as 0."""
    number = _float(value)
    if number is None:
        return "—"
    number = 0.0 if abs(number) < 0.005 else number
    return f"{number:+.3g} ppm" if signed else f"{number:.3g} ppm"


class PickerCore:
    """Implements picker.tui.model.Core with the project's own functions."""

    def load(
        self, paths: Sequence[Path], mapping: Path | None, progress: Progress | None
    ) -> Loaded:
        from catalog.cache import load_catalogs_cached

        result = load_catalogs_cached(list(paths), mapping=mapping, progress=progress)
        return Loaded(
            parts=result.parts,
            problems=tuple(p.one_line() for p in result.problems),
            files=tuple(Path(f.path) for f in result.files),
        )

    def read_brief(self, path: Path) -> dict[str, object]:
        """Every field of the brief (defaults included, so each can be edited); a brief that
        does not parse comes back as written, so the user can fix it on screen."""
        from picker.brief import BriefError, brief_to_mapping, load_brief, load_brief_mapping

        try:
            return brief_to_mapping(load_brief(path), include_defaults=True)
        except BriefError as error:
            # Read as written with the file checks of load_brief (size, nesting, aliases):
            # a plain yaml.safe_load here expanded alias bombs and overflowed the stack.
            try:
                data = load_brief_mapping(path)
            except BriefError:
                raise error from None
            if not data:
                raise
            return {str(k): v for k, v in data.items()}

    def check_brief(self, data: Mapping[str, object]) -> object:
        from picker.brief import parse_brief

        return parse_brief(data)

    def check_value(self, dimension: str, text: str) -> float:
        from catalog.units import parse_quantity

        return parse_quantity(text, dimension)  # type: ignore[arg-type]

    def presets(self) -> tuple[Preset, ...]:
        from picker.presets import PRESETS

        return tuple(Preset(p.name, p.title, p.budget_ppm, p.clause) for p in PRESETS)

    # ------------------------------------------------------------------ ranking
    def rank(self, parts: pd.DataFrame, brief: object) -> Shortlist:
        from picker.rank import RULES, rank_parts

        ranking = rank_parts(parts, brief)  # type: ignore[arg-type]
        analysis = ranking.analysis
        listed = ranking.order[: ranking.shortlist_size]
        failed = ranking.order[ranking.shortlist_size :]

        # Select the few columns first, then the rows: a million-row frame is never copied
        # whole, and text columns stay in pandas' own string storage (no Python objects).
        rows = (
            analysis[list(SHORTLIST_SOURCE.values())]
            .iloc[listed]
            .set_axis(list(SHORTLIST_SOURCE), axis=1)
            .reset_index(drop=True)
        )
        mask = analysis["fail_mask"].to_numpy(dtype=np.int64)[failed]
        # The lowest set bit is the most fundamental failed rule (picker.rank orders RULES so).
        lowest = mask & -mask
        index = np.where(lowest > 0, np.log2(np.maximum(lowest, 1)).astype(np.int64), 0)
        labels = [RULE_LABELS.get(r, r) for r in RULES]
        ruled_out = (
            analysis[["mpn", "package"]]
            .iloc[failed]
            .reset_index(drop=True)
            .assign(
                key=failed.astype(np.int64),
                first_reason=pd.Categorical.from_codes(
                    index.astype(np.int64), categories=pd.Index(labels)
                ),
            )
        )
        brief_any: Any = brief
        return Shortlist(
            rows=rows,
            ruled_out=ruled_out,
            budget_ppm=float(brief_any.budget_ppm),
            min_margin=float(brief_any.limits.min_margin),
            ranking=ranking,
        )

    def reasons_at(self, shortlist: Shortlist, key: int) -> tuple[str, ...]:
        ranking: Any = shortlist.ranking
        return tuple(ranking.reasons(ranking.analysis.iloc[int(key)]))

    # --------------------------------------------------------------- part sheet
    def sheet(
        self, parts: pd.DataFrame, shortlist: Shortlist, brief: object, mpn: str
    ) -> PartSheet:
        from picker.declared import declared_figures, describe_declared
        from picker.report import part_object

        ranking: Any = shortlist.ranking
        row = ranking.row(mpn)
        b: Any = brief
        obj = part_object(row, b)
        part = parts.loc[row.name] if row.name in parts.index else pd.Series(dtype=object)
        tuning_fork = str(row.get("cut", "")) == "tuning_fork"
        summary = (
            f"{_quantity(row['frequency_hz'], 'frequency', 6)} "
            f"{'tuning fork' if tuning_fork else str(row.get('cut', '') or 'crystal')}, "
            f"{row.get('mode', 'fundamental')}, package {row.get('package', '')}"
            f"{', ' + str(row['maker']) if str(row.get('maker', '')) else ''} — "
            f"{row.get('source_path', '')}:{row.get('source_line', '')}"
        )
        declared = describe_declared(
            declared_figures(obj["error_ppm"]["total"] or math.nan, b.clock_role)
        )
        return PartSheet(
            mpn=mpn,
            status=str(row["status"]),
            summary=summary,
            reasons=tuple(obj["reasons"]),
            figures=self._figures(row, b),
            caps=self._caps(row, b),
            budget=tuple(
                (name, float(obj["error_ppm"][key] or 0.0))
                for name, key in (
                    ("tolerance", "tolerance"),
                    ("temperature", "temperature"),
                    ("aging", "aging"),
                    ("pulling", "pulling"),
                    ("cap spread", "spread"),
                    ("total", "total"),
                    ("rss (info)", "rss"),
                )
                if key in obj["error_ppm"]
            ),
            budget_ppm=float(b.budget_ppm),
            declared=declared,
            bench=self._bench(row, b),
            estimated=tuple(obj["estimated"]),
            drift=self._drift(row, part, b, tuning_fork),
            impedance=self._impedance(row),
        )

    def _figures(self, row: pd.Series, b: Any) -> tuple[Figure, ...]:
        def source(flag: str) -> Source:
            return "estimate" if bool(row.get(flag, False)) else "catalog"

        amp, board = b.amplifier, b.board
        figures = [
            Figure("nominal frequency", _quantity(row["frequency_hz"], "frequency", 6), "catalog"),
            Figure(
                "load capacitance (spec)",
                "series"
                if _float(row["spec_load_capacitance_f"]) is None
                else _quantity(row["spec_load_capacitance_f"], "capacitance"),
                "catalog",
                "the load the part is calibrated at",
            ),
            Figure("tolerance at 25 °C", _ppm(row["tolerance_ppm"]), "catalog"),
            Figure("stability (rated)", _ppm(row["stability_ppm"]), "catalog"),
            Figure(
                "rated temperature",
                f"{_quantity(row['temp_min_c'], 'temperature')} … "
                f"{_quantity(row['temp_max_c'], 'temperature')}",
                "catalog",
            ),
            Figure("ESR (R1 max)", _quantity(row["esr_ohm"], "resistance"), "catalog"),
            Figure("C0 shunt", _quantity(row["c0_f"], "capacitance"), source("c0_estimated")),
            Figure("C1 motional", _quantity(row["c1_f"], "capacitance"), source("c1_estimated")),
            Figure("L1 motional", _quantity(row["l1_h"], "inductance"), "computed"),
            Figure("fs series", _quantity(row["fs_hz"], "frequency", 6), "computed"),
            Figure("fp parallel", _quantity(row["fp_hz"], "frequency", 6), "computed"),
            Figure("Q", _ratio(row["q"]), "computed"),
            Figure("aging, first year", _ppm(row["aging_ppm"]), source("aging_estimated")),
            Figure(
                "drive rating",
                _quantity(row["drive_rating_w"], "power"),
                source("drive_level_estimated"),
            ),
            Figure("amplifier form", str(row.get("amplifier_form", "")), "brief"),
        ]
        if _float(row.get("gm_s")) is not None:
            figures.append(
                Figure(
                    "gm",
                    _quantity(row["gm_s"], "transconductance"),
                    "brief",
                    "amplifier transconductance",
                )
            )
        if _label(row.get("drive_setting")):
            figures.append(
                Figure(
                    "drive setting",
                    str(row["drive_setting"]),
                    "computed",
                    "lowest setting that meets the margin",
                )
            )
        figures += [
            Figure(
                "pin capacitance",
                _quantity(amp.pin_capacitance_f, "capacitance"),
                "brief",
                "per pin to ground",
            ),
            Figure(
                "stray capacitance",
                _quantity(board.stray_capacitance_f, "capacitance"),
                "brief",
                "across the crystal: traces and pads",
            ),
            Figure(
                "board load CL",
                _quantity(row["load_capacitance_f"], "capacitance"),
                "computed",
                "Ca·Cb/(Ca+Cb) with pins, plus stray",
            ),
            Figure(
                "pulling",
                _ppm(row["pulling_ppm"], signed=True),
                "computed",
                "running frequency vs nominal",
            ),
            Figure(
                "trim sensitivity",
                f"{_ratio(row['trim_sensitivity_ppm_per_pf'])} ppm/pF",
                "computed",
            ),
            Figure(
                "negative resistance",
                _quantity(row["negative_resistance_ohm"], "resistance"),
                "computed",
                "Re(Zc)",
            ),
            Figure(
                "|Rneg| ceiling",
                _quantity(row["negative_resistance_max_ohm"], "resistance"),
                "computed",
                "no gm gives more; R1 above it never starts",
            ),
            Figure(
                "margin |Rneg|/R1",
                _ratio(row["negative_resistance_margin"]),
                "computed",
                f"brief asks ≥ {b.limits.min_margin:g} (common practice)",
            ),
            Figure(
                "margin ranked on",
                f"{_ratio(row.get('form_margin'))} "
                f"(needs ≥ {_ratio(row.get('form_margin_required'))})",
                "computed",
                f"the {row.get('amplifier_form', '')} form's figure against its requirement",
            ),
            Figure("gm critical", _quantity(row["gm_critical_s"], "transconductance"), "computed"),
            Figure(
                "gm optimum",
                _quantity(row["gm_optimum_s"], "transconductance"),
                "computed",
                "above it |Rneg| falls again",
            ),
            Figure("gain margin gm/gm_crit", _ratio(row["gain_margin"]), "computed"),
            Figure(
                "drive level",
                _quantity(row["drive_level_w"], "power"),
                "computed",
                f"at {_quantity(amp.swing_v, 'voltage')} p-p swing",
            ),
            Figure(
                "start-up time",
                _quantity(row["startup_time_s"], "time"),
                "computed",
                "estimate: 1 µV noise to 1 V",
            ),
        ]
        if _float(row.get("max_esr_ohm")) is not None:
            figures.append(
                Figure(
                    "chip's max ESR here",
                    _quantity(row["max_esr_ohm"], "resistance"),
                    "brief",
                    "interpolated from the chip's table",
                )
            )
        return tuple(figures)

    def _caps(self, row: pd.Series, b: Any) -> tuple[str, ...]:
        board = b.board
        lines = []
        cap_a, cap_b = _float(row["cap_a_f"]), _float(row["cap_b_f"])
        source = str(row.get("caps_source", ""))
        code = _label(row.get("internal_cap_code"))
        if code:
            lines.append(f"internal load-cap code {code} (chip's programmable caps)")
        if cap_a is not None and cap_b is not None:
            lines.append(
                f"Ca = {_quantity(cap_a, 'capacitance')}, Cb = {_quantity(cap_b, 'capacitance')}"
                f"  ({source}; series {board.cap_series}, ±{board.cap_tolerance * 100:g} %)"
            )
        elif not code:
            lines.append("no standard pair of caps reaches this load")
        ideal = _float(row.get("ideal_cap_f"))
        if ideal is not None:
            lines.append(
                f"ideal equal caps {_quantity(ideal, 'capacitance')} = 2·(CL − stray) − pin"
            )
        lines.append(
            f"board CL {_quantity(row['load_capacitance_f'], 'capacitance')}: stray "
            f"{_quantity(board.stray_capacitance_f, 'capacitance')} across the crystal, "
            f"pin {_quantity(b.amplifier.pin_capacitance_f, 'capacitance')} per pin to ground"
        )
        lines.append(
            f"pulling at these caps {_ppm(row['pulling_ppm'], signed=True)}; "
            f"trim {_ratio(row['trim_sensitivity_ppm_per_pf'])} ppm/pF"
        )
        return tuple(lines)

    def _bench(self, row: pd.Series, b: Any) -> tuple[str, ...]:
        r1 = _float(row["esr_ohm"]) or math.nan
        rneg = abs(_float(row["negative_resistance_ohm"]) or math.nan)
        target = b.limits.min_margin
        added = (target - 1.0) * r1
        stop = rneg - r1
        lines = [
            f"Fit the caps above; measure the frequency through a buffered output (a probe "
            f"on the crystal pins pulls it); expect {_ppm(row['pulling_ppm'], signed=True)} "
            f"from nominal, within ±{_ppm(row['error_spread_ppm'])} for cap and stray spread.",
            f"Negative-resistance test: add {_quantity(added, 'resistance', 3)} in series with "
            f"the crystal ((M−1)·R1 for M = {target:g}); it must still start, also at "
            f"{_quantity(b.temp_min_c, 'temperature')}. It should stop near "
            f"{_quantity(stop, 'resistance', 3)} (|Rneg| − R1).",
            f"Start-up: expect about {_quantity(row['startup_time_s'], 'time', 2)} at room "
            "temperature (estimate); check at the cold end and the lowest supply.",
            f"Drive level: crystal current I gives P = I²·R1; estimate "
            f"{_quantity(row['drive_level_w'], 'power', 3)} against a rating of "
            f"{_quantity(row['drive_rating_w'], 'power', 3)}.",
        ]
        return tuple(lines)

    def _drift(
        self, row: pd.Series, part: pd.Series, b: Any, tuning_fork: bool
    ) -> DriftCurve | None:
        from picker.physics import temperature

        t = np.linspace(b.temp_min_c, b.temp_max_c, DRIFT_SAMPLES)
        headroom = _float(row["budget_headroom_ppm"]) or 0.0
        band = max((_float(row["error_temperature_ppm"]) or 0.0) + headroom, 0.0)
        if tuning_fork:
            beta = _float(part.get("beta_ppm_per_c2")) or temperature.TUNING_FORK_BETA
            t0 = _float(part.get("turnover_c")) or temperature.TUNING_FORK_TURNOVER_C
            spread_b = temperature.TUNING_FORK_BETA_SPREAD
            spread_t = temperature.TUNING_FORK_TURNOVER_SPREAD_C
            curves = np.stack(
                [
                    temperature.tuning_fork_drift_ppm(t, beta + db, t0 + dt)
                    for db in (-spread_b, 0.0, spread_b)
                    for dt in (-spread_t, 0.0, spread_t)
                ]
            )
            label = (
                f"parabola β = {beta:.3g} ± {spread_b:g} ppm/°C², T0 = {t0:g} ± "
                f"{spread_t:g} °C (typical spreads)"
            )
            return DriftCurve(t, curves.min(axis=0), curves.max(axis=0), band, label)
        stability = _float(row["stability_ppm"])
        if stability is None:
            return None
        rated = np.linspace(
            _float(row["temp_min_c"]) or b.temp_min_c,
            _float(row["temp_max_c"]) or b.temp_max_c,
            DRIFT_SAMPLES,
        )
        # Cut angles whose cubic stays within the rated stability over the rated range.
        inside = [
            a
            for a in AT_CUT_ANGLES_DEG
            if np.max(np.abs(temperature.at_cut_drift_ppm(rated, a))) <= stability
        ]
        if not inside:
            inside = [0.0]
        curves = np.stack([temperature.at_cut_drift_ppm(t, a) for a in inside])
        label = (
            f"AT-cut cubic for cut angles that keep ±{stability:g} ppm over the rated "
            "range; the budget uses the rated stability"
        )
        return DriftCurve(t, curves.min(axis=0), curves.max(axis=0), band, label)

    def _impedance(self, row: pd.Series) -> ImpedanceCurve | None:
        from picker.physics import crystal

        values = [_float(row[k]) for k in ("fs_hz", "fp_hz", "esr_ohm", "l1_h", "c1_f", "c0_f")]
        if any(v is None for v in values):
            return None
        fs, fp, r1, l1, c1, c0 = (float(v or 0.0) for v in values)
        cl = _float(row["load_capacitance_f"])
        if fp <= fs:
            return None
        span = fp - fs
        freq = np.linspace(fs - 0.35 * span, fp + 0.35 * span, IMPEDANCE_SAMPLES)
        fl = float(crystal.load_resonance_frequency(fs, r1, c1, c0, cl)) if cl else math.nan
        # Include the resonances themselves so the dips and the peak are drawn at full depth.
        freq = np.unique(np.concatenate([freq, [fs, fp]]))
        magnitude = np.abs(crystal.impedance(freq, r1, l1, c1, c0))
        return ImpedanceCurve(freq, np.asarray(magnitude, dtype=float), fs, fl, fp)

    # --------------------------------------------------------------- alternates
    def alternates(self, parts: pd.DataFrame, mpn: str, brief: object) -> Alternates:
        from picker.alternates import find_alternates

        match = self.match(parts, mpn)
        if match.mpn is None:
            closest = ", ".join(match.candidates[:5])
            raise ValueError(
                f"no part number '{mpn}'" + (f"; closest: {closest}" if closest else "")
            )
        result: Any = find_alternates(parts, match.mpn, brief)  # type: ignore[arg-type]
        packages = parts["package"].astype(str).to_numpy() if "package" in parts else None
        rows = []
        for item in result.top(ALTERNATES_SHOWN):
            status = ""
            analysis = result.analysis_row(item.position)
            if analysis is not None:
                status = str(analysis.get("status", ""))
            rows.append(
                Alternate(
                    mpn=item.mpn,
                    fit=str(item.fit),
                    differences=tuple(item.differences),
                    package="" if packages is None else str(packages[item.position]),
                    status=status,
                )
            )
        counts = result.counts()
        summary = ", ".join(f"{n:,} {name.replace('_', ' ')}" for name, n in counts.items())
        total = len(result.order)
        shown = f" (closest {len(rows):,} of {total:,} shown)" if total > len(rows) else ""
        note = "; ".join(x for x in (match.note, summary + shown) if x)
        return Alternates(match.mpn, note, tuple(rows))

    def match(self, parts: pd.DataFrame, text: str) -> Match:
        from picker.match import match_part_number

        result = match_part_number(parts["mpn"], text)
        note = "" if result.kind == "exact" else result.describe()
        return Match(result.mpn, tuple(name for name, _ in result.candidates), note)

    # ------------------------------------------------------------------- export
    def export_text(
        self, parts: pd.DataFrame, shortlist: Shortlist, brief: object, format_name: str
    ) -> tuple[str, int]:
        from picker.report import (
            RANK_CSV_COLUMNS,
            ranking_csv_rows,
            ranking_objects,
            to_csv,
            to_json,
        )

        ranking: Any = shortlist.ranking
        frame = ranking.fits
        if format_name == "json":
            # The same objects as `picker rank --format json`.
            return to_json(ranking_objects(frame, brief)), len(frame)  # type: ignore[arg-type]
        rows = ranking_csv_rows(frame, brief)  # type: ignore[arg-type]
        if format_name == "csv":
            return to_csv(rows, RANK_CSV_COLUMNS), len(rows)
        if format_name == "markdown":
            b: Any = brief
            title = f"picker shortlist — {b.name}"
            return markdown_text(rows, MARKDOWN_COLUMNS, title), len(rows)
        raise ValueError(f"unknown export format '{format_name}' (csv, json, markdown)")

    def bom_line(self, parts: pd.DataFrame, shortlist: Shortlist, brief: object, mpn: str) -> str:
        ranking: Any = shortlist.ranking
        row = ranking.row(mpn)
        cl = _float(row["spec_load_capacitance_f"])
        pieces = [
            "Y1",
            str(row["mpn"]),
            str(row.get("maker", "") or ""),
            f"crystal {_quantity(row['frequency_hz'], 'frequency', 6)}, "
            f"CL {'series' if cl is None else _quantity(cl, 'capacitance')}, "
            f"±{_float(row['tolerance_ppm']) or 0:g} ppm, {row.get('package', '')}",
        ]
        cap_a, cap_b = _float(row["cap_a_f"]), _float(row["cap_b_f"])
        code = _label(row.get("internal_cap_code"))
        if cap_a is not None and cap_b is not None:
            pieces.append(
                f"load caps {_quantity(cap_a, 'capacitance')} / "
                f"{_quantity(cap_b, 'capacitance')} C0G"
            )
        elif code:
            pieces.append(f"internal load caps, code {code}")
        return "\t".join(pieces)
