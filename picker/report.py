"""What the command line prints: per-part JSON objects, 80-column text tables, safe CSV.

Nothing here computes physics; it formats the analysis and ranking frames. The same
per-part object feeds ``analyze --format json``, ``rank --format json`` and the alternates
with a brief, so every output agrees with the others and with the terminal UI.

CSV cells are formula-safe: a text cell that begins with ``=``, ``+``, ``-``, ``@``, a tab or
a carriage return gets a leading apostrophe so a spreadsheet shows it as text instead of
running it. Numbers are written as plain numbers (a negative resistance stays ``-312.5``,
numeric in the spreadsheet): only text cells are neutralised, because only text can carry a
formula.
"""

from __future__ import annotations

import csv
import io
import json
import math
from collections.abc import Iterable, Mapping, Sequence
from typing import Any

import numpy as np
import pandas as pd

from catalog.units import Dimension, format_quantity
from picker.brief import Brief
from picker.declared import declared_figures, describe_declared
from picker.rank import Ranking, reasons_for_row

CAUTION = (
    "Every figure is an estimate from data-sheet values. Confirm margins with the crystal "
    "maker and with a negative-resistance test on the real board (a series resistor added "
    "until oscillation stops). Safety-critical products follow their own qualification "
    "rules and local regulations."
)

WIDTH = 80

#: JSON field name -> provenance flag column in the analysis frame.
_ESTIMATED = {
    "c0": "c0_estimated",
    "c1": "c1_estimated",
    "cut": "cut_estimated",
    "drive_level": "drive_level_estimated",
    "aging": "aging_estimated",
}

_ERROR_KEYS = ("tolerance", "temperature", "aging", "pulling", "spread", "total", "rss")

_FORMULA_START = ("=", "+", "-", "@", "\t", "\r")


# --------------------------------------------------------------------------- values


def _float(value: Any) -> float | None:
    """A JSON-safe float: None for NaN, infinities and missing values."""
    if value is None:
        return None
    try:
        number = float(value)
    except (TypeError, ValueError):
        return None
    return number if math.isfinite(number) else None


def _text(value: Any) -> str | None:
    if value is None or (isinstance(value, float) and math.isnan(value)):
        return None
    text = str(value)
    return text if text not in ("", "nan", "None", "<NA>") else None


def estimated_fields(row: pd.Series) -> list[str]:
    """Names of the figures that used an estimate instead of a catalog value."""
    return [name for name, column in _ESTIMATED.items() if bool(row.get(column, False))]


def part_object(row: pd.Series, brief: Brief) -> dict[str, Any]:
    """The analysis JSON object of one ranked row (DESIGN §6 keys, SI units, nulls for n/a)."""
    cap_a, cap_b = _float(row["cap_a_f"]), _float(row["cap_b_f"])
    declared = declared_figures(_float(row["error_total_ppm"]) or math.nan, brief.clock_role)
    obj: dict[str, Any] = {
        "mpn": str(row["mpn"]),
        "maker": _text(row.get("maker")),
        "package": _text(row.get("package")),
        "frequency_hz": _float(row["frequency_hz"]),
        "fs_hz": _float(row["fs_hz"]),
        "fp_hz": _float(row["fp_hz"]),
        "q": _float(row["q"]),
        "esr_ohm": _float(row["esr_ohm"]),
        "c0_f": _float(row["c0_f"]),
        "c1_f": _float(row["c1_f"]),
        "l1_h": _float(row["l1_h"]),
        "spec_load_capacitance_f": _float(row["spec_load_capacitance_f"]),
        "load_capacitance_f": _float(row["load_capacitance_f"]),
        "external_caps_f": [cap_a, cap_b] if cap_a is not None and cap_b is not None else None,
        "caps_source": _text(row["caps_source"]),
        "internal_cap_code": _text(row["internal_cap_code"]),
        "pulling_ppm": _float(row["pulling_ppm"]),
        "trim_sensitivity_ppm_per_pf": _float(row["trim_sensitivity_ppm_per_pf"]),
        "negative_resistance_ohm": _float(row["negative_resistance_ohm"]),
        "negative_resistance_margin": _float(row["negative_resistance_margin"]),
        "negative_resistance_max_ohm": _float(row["negative_resistance_max_ohm"]),
        "gm_s": _float(row["gm_s"]),
        "gm_critical_s": _float(row["gm_critical_s"]),
        "gm_optimum_s": _float(row["gm_optimum_s"]),
        "gain_margin": _float(row["gain_margin"]),
        "max_esr_ohm": _float(row["max_esr_ohm"]),
        "drive_level_w": _float(row["drive_level_w"]),
        "drive_rating_w": _float(row["drive_rating_w"]),
        "startup_time_s": _float(row["startup_time_s"]),
        "error_ppm": {key: _float(row[f"error_{key}_ppm"]) for key in _ERROR_KEYS},
        "budget_ppm": _float(row["budget_ppm"]),
        "budget_headroom_ppm": _float(row["budget_headroom_ppm"]),
        "status": str(row["status"]),
        "reasons": reasons_for_row(row, brief),
        "estimated": estimated_fields(row),
        "amplifier_form": str(row["amplifier_form"]),
        "circuit_computed": _float(row["negative_resistance_max_ohm"]) is not None
        or _float(row["gm_critical_s"]) is not None,
        "drive_setting": _text(row["drive_setting"]),
        "score": _float(row["score"]),
        "declared": {
            "worst_case_ppm": _float(np.asarray(declared.worst_case_ppm)),
            "sleep_clock_accuracy_ppm": _float(declared.sleep_clock_accuracy_ppm),
            "drift_s_per_day": _float(declared.drift_s_per_day),
            "drift_min_per_month": _float(declared.drift_min_per_month),
        },
    }
    return obj


def ranking_objects(frame: pd.DataFrame, brief: Brief) -> list[dict[str, Any]]:
    """One JSON object per row of ``frame`` (already ordered)."""
    return [part_object(row, brief) for _, row in frame.iterrows()]


def to_json(value: Any) -> str:
    """Pretty JSON with a trailing newline (NaN never appears: values went through _float)."""
    return json.dumps(value, indent=2, ensure_ascii=False, allow_nan=False) + "\n"


# --------------------------------------------------------------------------- CSV


def safe_cell(value: Any) -> Any:
    """A CSV cell that a spreadsheet will not execute: text starting with = + - @ tab CR gets
    a leading apostrophe; numbers stay numbers; None and NaN become empty cells."""
    if value is None:
        return ""
    if isinstance(value, bool | np.bool_):
        return "true" if value else "false"
    if isinstance(value, int | float | np.integer | np.floating):
        number = float(value)
        return "" if not math.isfinite(number) else value
    text = str(value)
    if text.startswith(_FORMULA_START):
        return "'" + text
    return text


def to_csv(rows: Sequence[Mapping[str, Any]], columns: Sequence[str]) -> str:
    """CSV text with a header row; every cell through :func:`safe_cell`."""
    buffer = io.StringIO()
    writer = csv.writer(buffer, lineterminator="\n")
    writer.writerow([safe_cell(c) for c in columns])
    for row in rows:
        writer.writerow([safe_cell(row.get(c)) for c in columns])
    return buffer.getvalue()


RANK_CSV_COLUMNS = (
    "rank",
    "mpn",
    "maker",
    "package",
    "status",
    "score",
    "frequency_hz",
    "spec_load_capacitance_f",
    "load_capacitance_f",
    "cap_a_f",
    "cap_b_f",
    "esr_ohm",
    "negative_resistance_ohm",
    "negative_resistance_margin",
    "gain_margin",
    "drive_level_w",
    "drive_rating_w",
    "error_total_ppm",
    "error_rss_ppm",
    "budget_headroom_ppm",
    "amplifier_form",
    "drive_setting",
    "estimated",
    "reasons",
)


def ranking_csv_rows(frame: pd.DataFrame, brief: Brief) -> list[dict[str, Any]]:
    rows = []
    for rank, (_, row) in enumerate(frame.iterrows(), start=1):
        obj = part_object(row, brief)
        rows.append(
            {
                **obj,
                "rank": rank,
                "cap_a_f": _float(row["cap_a_f"]),
                "cap_b_f": _float(row["cap_b_f"]),
                "error_total_ppm": obj["error_ppm"]["total"],
                "error_rss_ppm": obj["error_ppm"]["rss"],
                "estimated": " ".join(obj["estimated"]),
                "reasons": "; ".join(obj["reasons"]),
            }
        )
    return rows


# --------------------------------------------------------------------------- text helpers


def fmt(value: Any, dimension: Dimension, digits: int = 3) -> str:
    number = _float(value)
    return "—" if number is None else format_quantity(number, dimension, digits=digits)


def num(value: Any, digits: int = 3) -> str:
    number = _float(value)
    if number is None:
        return "—"
    if 1e3 <= abs(number) < 1e7:
        return f"{number:.0f}"  # budgets such as 2500 ppm read better without an exponent
    text = f"{number:.{digits}g}"
    return text if "e" not in text else f"{number:.1e}"


def ohms(value: Any) -> str:
    """A resistance in at most four characters: "60", "120", "50k" (tuning forks)."""
    number = _float(value)
    if number is None:
        return "—"
    return f"{number / 1e3:.3g}k" if abs(number) >= 1e3 else f"{number:.3g}"


def bar(fraction: float | None, width: int = 6) -> str:
    """A text bar ``[####....]``: filled share of ``width``; '?' when unknown."""
    if fraction is None or not math.isfinite(fraction):
        return "[" + "?" * width + "]"
    filled = round(max(0.0, min(1.0, fraction)) * width)
    return "[" + "#" * filled + "." * (width - filled) + "]"


def _clip(text: str, width: int) -> str:
    return text if len(text) <= width else text[: width - 1] + "…"


def wrap(
    text: str, indent: str = "  ", width: int = WIDTH, *, hang: str | None = None
) -> list[str]:
    """Wrap ``text`` to ``width``; continuation lines are indented by ``hang`` (default: as
    deep as the first line plus two spaces)."""
    import textwrap

    follow = " " * (len(indent) + 2) if hang is None else hang
    return textwrap.wrap(
        text, width=width, initial_indent=indent, subsequent_indent=follow, break_on_hyphens=False
    )


STATUS_MARK = {"fit": "fit", "marginal": "marginal", "ruled_out": "ruled out"}


_MPN_WIDTH_MAX = 19  # the widest that keeps a row within 80 columns


def ranking_table(ranking: Ranking, frame: pd.DataFrame, *, total_shown: str = "") -> str:
    """The shortlist as an 80-column text table with a margin bar and a budget bar per row.

    Margin bar: log scale, half full at the required minimum, full at four times it.
    Budget bar: the share of the budget the worst-case total uses (full = all of it).
    """
    brief = ranking.brief
    lines = [
        f"Brief: {_clip(brief.name, 50)} — {fmt(brief.frequency_hz, 'frequency', 7)}, "
        f"budget ±{num(brief.budget_ppm)} ppm",
        f"{ranking.counts.get('fit', 0)} fit, {ranking.counts.get('marginal', 0)} marginal, "
        f"{ranking.counts.get('ruled_out', 0)} ruled out{total_shown}",
        "",
    ]
    # The part number is what the reader copies into a BOM: size its column to the longest
    # one shown (up to 19 characters) and give any longer one a line of its own.
    mpn_width = min(max([11, *(len(str(m)) for m in frame["mpn"])]), _MPN_WIDTH_MAX)
    lines.append(
        f"{'#':>3} {'part number':<{mpn_width}} {'pkg':<6}{'CL':>5}{'ESR':>5}"
        f"{'margin':>7} {'':<8}{'error':>6} {'':<8} status"
    )
    for position, (_, row) in enumerate(frame.iterrows(), start=1):
        margin = _float(row["form_margin"])
        required = _float(row["form_margin_required"]) or 1.0
        margin_fraction = None if margin is None else math.log(max(margin / required, 1e-9))
        if margin_fraction is not None:
            margin_fraction = max(0.0, (margin_fraction + math.log(4)) / (2 * math.log(4)))
        total = _float(row["error_total_ppm"])
        budget = _float(row["budget_ppm"]) or 1.0
        used = None if total is None else total / budget
        status = str(row["status"])
        cl = _float(row["spec_load_capacitance_f"])
        cl_text = "ser" if cl is None else f"{cl * 1e12:.3g}"
        mpn = str(row["mpn"])
        if len(mpn) > mpn_width:
            lines.append(f"{position:>3} {mpn}")
        lines.append(
            f"{position if len(mpn) <= mpn_width else '':>3} "
            f"{_clip(mpn, mpn_width):<{mpn_width}} {_clip(str(row['package']), 6):<6}"
            f"{cl_text:>5}{ohms(row['esr_ohm']):>5}{num(margin, 2):>7} "
            f"{bar(margin_fraction)}{num(total, 3):>6} "
            f"{bar(used)} {STATUS_MARK.get(status, status)}"
        )
        if status != "fit":
            reasons = reasons_for_row(row, brief)
            if reasons:
                lines.extend(wrap(reasons[0], indent="      "))
    lines += [
        "",
        "margin: the figure ranked on; bar half full at the required minimum, full at 4x.",
        f"error: worst-case total in ppm; bar = share of the ±{num(brief.budget_ppm)} ppm"
        " budget used.",
        "CL: the part's specified load in pF (ser = series resonance); ESR in Ω.",
    ]
    return "\n".join(line.rstrip() for line in lines) + "\n"


# --------------------------------------------------------------------------- part sheet

_PROVENANCE_OF = {"c0_f": "c0", "c1_f": "c1", "drive_rating_w": "drive_level"}


def _given(brief: Brief, key: str) -> str:
    """Origin of a brief figure: "brief" when the file gave it, "default" when it did not."""
    return "default" if key in brief.defaulted else "brief"


def part_sheet(row: pd.Series, brief: Brief) -> str:
    """Every figure of one part with where it came from, for ``picker analyze``."""
    est = set(estimated_fields(row))

    def src(field: str, default: str = "catalog") -> str:
        return "estimate" if _PROVENANCE_OF.get(field, field) in est else default

    form = str(row["amplifier_form"])
    status = str(row["status"])
    reasons = reasons_for_row(row, brief)
    lines = [
        f"{row['mpn']}  ({_text(row.get('maker')) or 'maker not given'}, "
        f"package {_text(row.get('package')) or '?'}, {_text(row.get('mode')) or 'fundamental'}, "
        f"cut {_text(row['cut']) or 'not given'}{' (inferred)' if 'cut' in est else ''})",
        f"status: {STATUS_MARK.get(status, status)}   score {num(row['score'], 2)}   "
        f"brief: {_clip(brief.name, 40)}",
    ]
    lines += wrap("; ".join(reasons), indent="  ") if reasons else []
    if _float(row["gm_critical_s"]) is None and _float(row["fs_hz"]) is None:
        lines += wrap(
            "Circuit figures are not computed for a part at another frequency than the "
            "brief's; give a brief at its frequency to see them.",
            indent="  ",
        )
    lines.append("")

    def section(title: str, items: Iterable[tuple[str, str, str]]) -> None:
        lines.append(title)
        for label, value, origin in items:
            lines.append(f"  {label:<31}{value:<29}{origin}"[:WIDTH].rstrip())
        lines.append("")

    spec_cl = _float(row["spec_load_capacitance_f"])
    section(
        f"{'Crystal':<33}{'value':<29}from",
        [
            ("nominal frequency", fmt(row["frequency_hz"], "frequency", 9), "catalog"),
            (
                "specified at load",
                "series resonance" if spec_cl is None else fmt(spec_cl, "capacitance"),
                "catalog",
            ),
            ("series resonance fs", fmt(row["fs_hz"], "frequency", 9), "computed"),
            ("parallel resonance fp", fmt(row["fp_hz"], "frequency", 9), "computed"),
            ("ESR (max R1)", fmt(row["esr_ohm"], "resistance"), "catalog"),
            ("C0", fmt(row["c0_f"], "capacitance"), src("c0_f")),
            ("C1", fmt(row["c1_f"], "capacitance"), src("c1_f")),
            ("L1", fmt(row["l1_h"], "inductance"), "computed"),
            ("Q", num(row["q"], 5), "computed"),
            ("tolerance at 25 °C", f"±{num(row['tolerance_ppm'])} ppm", "catalog"),
            (
                "rated temperature range",
                f"{num(row['temp_min_c'])} … {num(row['temp_max_c'])} °C",
                "catalog",
            ),
            ("drive level rating", fmt(row["drive_rating_w"], "power"), src("drive_rating_w")),
        ],
    )
    source = str(row["caps_source"])
    if source == "internal":
        internal = brief.amplifier.internal_caps
        where = "each pin" if internal is None or internal.applies_to == "each_pin" else "load"
        caps_text = f"setting {row['internal_cap_code']} ({where})"
        caps_origin = "chosen (internal)"
    elif source == "fixed":
        caps_text = f"{fmt(row['cap_a_f'], 'capacitance')} + {fmt(row['cap_b_f'], 'capacitance')}"
        caps_origin = "brief (fixed)"
    else:
        caps_text = f"{fmt(row['cap_a_f'], 'capacitance')} + {fmt(row['cap_b_f'], 'capacitance')}"
        caps_origin = f"chosen ({brief.board.cap_series})"
    realisable = bool(row["caps_realisable"])
    section(
        "Load capacitors (stray is across the crystal; pin capacitance per pin to ground)",
        [
            ("load capacitors Ca + Cb", caps_text + ("" if realisable else " (!)"), caps_origin),
            ("ideal equal value", fmt(row["ideal_cap_f"], "capacitance"), "computed"),
            ("stray across the crystal", fmt(brief.board.stray_capacitance_f, "capacitance"),
             _given(brief, "board.stray_capacitance")),
            ("pin capacitance (each)", fmt(brief.amplifier.pin_capacitance_f, "capacitance"),
             _given(brief, "amplifier.pin_capacitance")),
            ("board load CL", fmt(row["load_capacitance_f"], "capacitance"), "computed"),
            ("pulling from nominal", f"{num(row['pulling_ppm'], 3)} ppm", "computed"),
            ("trim sensitivity",
             f"{num(row['trim_sensitivity_ppm_per_pf'], 3)} ppm/pF", "computed"),
        ],
    )  # fmt: skip
    amp_rows = [("amplifier described by", _FORM_TEXT.get(form, form), "brief")]
    if form in ("gm", "gm_settings", "negative_resistance"):
        gm_origin = "brief" if form == "gm" else "derived from brief"
        if form == "gm_settings":
            setting = _text(row["drive_setting"])
            amp_rows.append(("drive setting", setting or "none meets the margin", "chosen"))
        amp_rows += [
            ("gm used", fmt(row["gm_s"], "transconductance"), gm_origin),
            ("negative resistance Rneg", fmt(row["negative_resistance_ohm"], "resistance"),
             "computed"),
            ("margin |Rneg|/R1", f"{num(row['negative_resistance_margin'], 3)} "
             f"(need {num(row['form_margin_required'], 2)})", "computed"),
        ]  # fmt: skip
    elif form == "gm_crit_max":
        amp_rows.append(
            ("chip's largest gm_crit", fmt(brief.amplifier.gm_crit_max_s, "transconductance"),
             "brief")
        )  # fmt: skip
    elif form == "max_esr":
        amp_rows += [
            ("ESR allowed at this CL", fmt(row["max_esr_ohm"], "resistance"),
             "brief table" + (" (outside!)" if bool(row["outside_esr_table"]) else "")),
            ("allowed / ESR", num(row["form_margin"], 3), "computed"),
        ]  # fmt: skip
    amp_rows += [
        ("critical gm (start-up limit)", fmt(row["gm_critical_s"], "transconductance"),
         "computed"),
        ("gain margin", num(row["gain_margin"], 3), "computed"),
        ("|Rneg| ceiling at these caps", fmt(row["negative_resistance_max_ohm"], "resistance"),
         "computed"),
        ("drive level at this swing", fmt(row["drive_level_w"], "power"), "computed"),
        ("start-up time (estimate)", fmt(row["startup_time_s"], "time"), "computed"),
    ]  # fmt: skip
    section("Oscillator (Pierce, small-signal)", amp_rows)
    section(
        "Frequency error budget, worst case",
        [
            ("tolerance", f"{num(row['error_tolerance_ppm'])} ppm", "catalog"),
            ("temperature over brief's range", f"{num(row['error_temperature_ppm'])} ppm",
             "computed" if str(row["cut"]) == "tuning_fork" else "catalog"),
            ("aging over the lifetime", f"{num(row['error_aging_ppm'])} ppm",
             "estimate" if "aging" in est else "computed"),
            ("|pulling|", f"{num(row['error_pulling_ppm'])} ppm", "computed"),
            ("spread (caps, stray)", f"{num(row['error_spread_ppm'])} ppm", "computed"),
            ("total (worst case)", f"{num(row['error_total_ppm'])} ppm  {bar(_used(row))}",
             "computed"),
            ("total (root-sum-square)", f"{num(row['error_rss_ppm'])} ppm", "computed"),
            ("budget / headroom", f"{num(row['budget_ppm'])} / "
             f"{num(row['budget_headroom_ppm'])} ppm", brief.budget_source),
        ],
    )  # fmt: skip
    figures = declared_figures(_float(row["error_total_ppm"]) or math.nan, brief.clock_role)
    lines.append("To declare (firmware / specification)")
    lines += [line for text in describe_declared(figures) for line in wrap(text)]
    lines.append("")
    lines.append("Bench check on the real board")
    lines += [line for text in bench_plan(row, brief) for line in wrap(text)]
    lines.append("")
    lines += wrap(CAUTION, indent="", hang="")
    return "\n".join(line.rstrip() for line in lines) + "\n"


_FORM_TEXT = {
    "gm": "transconductance gm",
    "gm_settings": "named drive settings",
    "gm_crit_max": "largest crystal gm_crit",
    "max_esr": "max-ESR table",
    "negative_resistance": "stated |Rneg| (gm inferred)",
}


def _used(row: pd.Series) -> float | None:
    total, budget = _float(row["error_total_ppm"]), _float(row["budget_ppm"])
    return None if total is None or not budget else total / budget


def bench_plan(row: pd.Series, brief: Brief) -> list[str]:
    """The negative-resistance test for the real board, with this part's numbers."""
    r1 = _float(row["esr_ohm"]) or 0.0
    required = float(brief.limits.min_margin)
    series_r = (required - 1.0) * r1
    steps = [
        f"1. Add (M−1)·R1 = ({num(required, 2)}−1)·{num(r1)} Ω = {num(series_r)} Ω in series "
        "with the crystal: it must still start, at the coldest temperature and lowest supply.",
    ]
    rneg = _float(row["negative_resistance_ohm"])
    if rneg is not None:
        stop = abs(rneg) - r1
        steps.append(
            f"2. Raise the series resistor until oscillation stops: expected near "
            f"|Rneg| − R1 = {num(abs(rneg))} − {num(r1)} = {num(stop)} Ω with ESR at its "
            "maximum (a typical part has lower ESR and stops later). The measured |Rneg| is "
            "that resistor plus the part's actual ESR."
        )
    else:
        steps.append(
            "2. Raise the series resistor until oscillation stops; |Rneg| is that resistor "
            "plus the part's actual ESR (the chip's data gives no Rneg to compare with)."
        )
    steps.append(
        f"3. Measure the frequency at the board's load: expected {num(row['pulling_ppm'], 3)} ppm "
        "from nominal; a probe adds capacitance, so use a buffered output or a counter on a "
        "clock-out pin."
    )
    return steps


# --------------------------------------------------------------------------- alternates


def alternates_objects(result: Any, rows: Sequence[Any]) -> list[dict[str, Any]]:
    """JSON list for ``picker alternates``: mpn, fit, differences, and with a brief the same
    figures as ``analyze``."""
    out = []
    for alt in rows:
        obj: dict[str, Any] = {
            "mpn": alt.mpn,
            "fit": alt.fit,
            "differences": list(alt.differences),
            "new_caps_f": [_float(c) for c in alt.new_caps_f] if alt.new_caps_f else None,
        }
        analysis = result.analysis_row(alt.position)
        if analysis is not None and result.brief is not None:
            figures = part_object(analysis, result.brief)
            figures.pop("mpn")
            obj.update(figures)
        out.append(obj)
    return out


def alternates_csv(result: Any, rows: Sequence[Any]) -> str:
    columns = ["reference", "rank", "mpn", "fit", "new_cap_a_f", "new_cap_b_f", "differences"]
    with_brief = result.brief is not None
    if with_brief:
        columns += ["status", "negative_resistance_margin", "error_total_ppm"]
    records = []
    for rank, alt in enumerate(rows, start=1):
        record: dict[str, Any] = {
            "reference": result.reference_mpn,
            "rank": rank,
            "mpn": alt.mpn,
            "fit": alt.fit,
            "new_cap_a_f": alt.new_caps_f[0] if alt.new_caps_f else None,
            "new_cap_b_f": alt.new_caps_f[1] if alt.new_caps_f else None,
            "differences": "; ".join(alt.differences),
        }
        analysis = result.analysis_row(alt.position)
        if analysis is not None:
            record["status"] = str(analysis["status"])
            record["negative_resistance_margin"] = _float(analysis["negative_resistance_margin"])
            record["error_total_ppm"] = _float(analysis["error_total_ppm"])
        records.append(record)
    return to_csv(records, columns)


_FIT_TEXT = {
    "drop_in": "drop-in",
    "drop_in_new_caps": "drop-in with new caps",
    "review": "review",
    "incompatible": "incompatible",
}


def alternates_table(result: Any, rows: Sequence[Any]) -> str:
    ref = result.reference
    counts = result.counts()
    lines = [
        f"Alternates for {ref['mpn']} ({fmt(ref['freq_hz'], 'frequency', 7)}, package "
        f"{ref['package']}, "
        + (
            "series resonance"
            if bool(ref.get("series_calibrated"))
            else f"CL {fmt(ref['load_capacitance_f'], 'capacitance')}"
        )
        + ")",
        ("circuit: " + _clip(result.brief.name, 60))
        if result.brief is not None
        else "data-sheet comparison only (give --brief to check each part in your circuit)",
        ", ".join(f"{_FIT_TEXT[k]}: {counts[k]}" for k in _FIT_TEXT),
        "",
    ]
    for rank, alt in enumerate(rows, start=1):
        lines.append(f"{rank:>3} {_clip(alt.mpn, 24):<24} {_FIT_TEXT[alt.fit]}")
        for text in alt.differences or ("same data-sheet figures",):
            lines.extend(wrap(text, indent="      - "))
    lines += ["", *wrap(CAUTION, indent="", hang="")]
    return "\n".join(line.rstrip() for line in lines) + "\n"


# --------------------------------------------------------------------------- presets


def presets_table(rows: Sequence[Mapping[str, str]]) -> str:
    lines = []
    for row in rows:
        lines.append(_clip(f"{row['name']:<14} {row['title']}", WIDTH))
        lines += wrap(f"budget {row['budget']}; {row['clause']}", indent="               ")
    return "\n".join(lines) + "\n"


def catalog_summary(parts: pd.DataFrame, paths: Sequence[Any]) -> str:
    """A short text summary of a catalog (shown when the terminal UI cannot start)."""
    lines = [f"{len(parts)} parts from {len(paths)} file(s)"]
    by_freq = parts.groupby("freq_hz", observed=True).size().sort_index()
    for freq, count in by_freq.items():
        lines.append(f"  {fmt(freq, 'frequency', 7):>14}  {count:>6} parts")
    lines.append("Try: picker rank, picker analyze MPN, picker alternates MPN, picker --help")
    return "\n".join(lines) + "\n"
