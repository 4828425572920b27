"""Statuses, reasons, score and order for every part against one brief.

The hard rules are evaluated for all parts at once and stored as a bitmask per part (one
int64 column is cheap at a million rows); the reason sentences, which carry the part's own
numbers, are written only for the rows somebody looks at (:meth:`Ranking.reasons`).

Status
    ``ruled_out`` when any hard rule fails; ``marginal`` when every rule passes but a figure
    lies inside the brief's marginal band of its limit (the reason says which); else ``fit``.
Score
    A weighted mean of readable components, each 0..1 (see :data:`SCORE_COMPONENTS`), with the
    brief's weights. Order: status, then score (high first), then part number, so equal parts
    always come out in the same order (ruled-out parts: fewest failed rules first, then
    score, then catalog order).
"""

from __future__ import annotations

import math
from collections.abc import Callable
from dataclasses import dataclass, field
from functools import cached_property
from typing import Any

import numpy as np
import pandas as pd

from picker.analysis import frequency_matches
from picker.brief import Brief

STATUSES = ("fit", "marginal", "ruled_out")

# Hard rules in order of how fundamental they are: the first failing one is the first reason.
RULES: tuple[str, ...] = (
    "frequency",
    "never_starts",
    "temperature_range",
    "package",
    "caps",
    "margin",
    "drive",
    "budget",
    "lifecycle",
    "height",
    "qualification",
    "stock",
)
RULE_BIT = {name: 1 << i for i, name in enumerate(RULES)}

# Marginal conditions (all rules pass but the part sits close to a limit).
MARGINAL: tuple[str, ...] = ("margin", "outside_table", "budget", "drive")
MARGINAL_BIT = {name: 1 << i for i, name in enumerate(MARGINAL)}

#: Score components, each 0..1, paired with the Weights attribute that scales them.
SCORE_COMPONENTS: tuple[str, ...] = (
    "margin",
    "headroom",
    "drive",
    "price",
    "stock",
    "lifecycle",
)

#: Margin that earns the full margin score, as a multiple of the required minimum.
FULL_MARGIN_MULTIPLE = 4.0
#: Stock that earns the full stock score (pieces); log scale below it.
FULL_STOCK = 10_000.0
LIFECYCLE_SCORE = {"active": 1.0, "nrnd": 0.3, "obsolete": 0.0}
#: Lifecycle score when the catalog does not say.
UNKNOWN_LIFECYCLE_SCORE = 0.5


@dataclass(frozen=True)
class Ranking:
    """Every part's analysis with status, score and reasons, for one brief.

    Attributes
    ----------
    analysis : the analysis frame (index = the part table's index), plus ``status``,
        ``score``, ``score_<component>`` columns, ``fail_mask`` and ``marginal_mask``.
    brief : the brief ranked against.
    counts : parts per status.
    ordering : computes :attr:`order` on first use (callers that read statuses and scores
        only, such as the alternates, never pay for sorting a million ruled-out parts).
    """

    analysis: pd.DataFrame
    brief: Brief
    counts: dict[str, int] = field(default_factory=dict)
    ordering: Callable[[], np.ndarray] = field(default=lambda: np.zeros(0, dtype=np.int64),
                                               repr=False, compare=False)  # fmt: skip

    @cached_property
    def order(self) -> np.ndarray:
        """Positions into ``analysis``, best first."""
        return self.ordering()

    @cached_property
    def table(self) -> pd.DataFrame:
        """The whole analysis ordered best first (built on first use: it copies every column)."""
        return self.analysis.iloc[self.order]

    def head(self, n: int, *, include_ruled_out: bool = False) -> pd.DataFrame:
        """The best ``n`` rows (fit and marginal only unless ``include_ruled_out``)."""
        positions = self.order if include_ruled_out else self.order[: self.shortlist_size]
        return self.analysis.iloc[positions[:n]]

    @property
    def shortlist_size(self) -> int:
        return self.counts.get("fit", 0) + self.counts.get("marginal", 0)

    @property
    def fits(self) -> pd.DataFrame:
        """Fit and marginal parts, best first."""
        return self.analysis.iloc[self.order[: self.shortlist_size]]

    @property
    def ruled_out(self) -> pd.DataFrame:
        """Ruled-out parts, best first."""
        return self.analysis.iloc[self.order[self.shortlist_size :]]

    def row(self, mpn: str) -> pd.Series:
        """The analysis row of one part number (KeyError when absent)."""
        hits = np.flatnonzero((self.analysis["mpn"] == mpn).to_numpy(dtype=bool))
        if hits.size == 0:
            raise KeyError(mpn)
        return self.analysis.iloc[int(hits[0])]

    def reasons(self, row: pd.Series) -> list[str]:
        """Reason sentences for one analysis row, the most fundamental first."""
        return reasons_for_row(row, self.brief)


def rank_parts(parts: pd.DataFrame, brief: Brief) -> Ranking:
    """Analyse, judge and order every part of ``parts`` against ``brief``.

    Equal to ``rank_analysis(analyze_parts(parts, brief), brief)``, computed in stages
    (:class:`picker.session.RankSession`); to re-rank the same table after a brief edit,
    keep a session and call its ``rank`` instead, which reuses the unchanged stages.
    """
    from picker.session import RankSession  # the session builds on this module

    return RankSession(parts).rank(brief)


def rank_analysis(analysis: pd.DataFrame, brief: Brief) -> Ranking:
    """Judge and order an already computed analysis frame (see :func:`rank_parts`)."""
    fail = failure_mask(analysis, brief)
    near = np.where(fail != 0, 0, marginal_mask(analysis, brief))
    status_code = status_codes(fail, near)
    components = score_components(analysis, brief)
    score = weighted_score(components, brief)
    table = ranked_frame(analysis, status_code, score, fail, near, components)
    # Ruled-out parts: those failing fewer rules first (closest to usable), then by score.
    failures = _popcount(fail)
    mpns = analysis["mpn"]

    def ordering() -> np.ndarray:
        return order_rows(status_code, score - failures, mpns, names_below_status=2)

    return Ranking(
        analysis=table, brief=brief, counts=status_counts(status_code), ordering=ordering
    )


def status_codes(fail: np.ndarray, near: np.ndarray) -> np.ndarray:
    """Index into STATUSES per row: ruled out on any failed rule, marginal when near a limit."""
    return np.where(fail != 0, 2, np.where(near != 0, 1, 0)).astype(np.int8)


def status_counts(status_code: np.ndarray) -> dict[str, int]:
    """How many rows hold each status."""
    found = np.bincount(status_code.astype(np.int64), minlength=len(STATUSES))
    return {name: int(found[i]) for i, name in enumerate(STATUSES)}


def weighted_score(components: dict[str, np.ndarray], brief: Brief) -> np.ndarray:
    """The brief-weighted mean of the score components (rounded to 12 decimals, so equal
    parts tie exactly)."""
    weights = {name: float(getattr(brief.weights, name)) for name in SCORE_COMPONENTS}
    total_weight = sum(weights.values()) or 1.0
    score = sum(weights[name] * components[name] for name in SCORE_COMPONENTS) / total_weight
    return np.round(score, 12)


def ranked_frame(
    analysis: pd.DataFrame | dict[str, Any],
    status_code: np.ndarray,
    score: np.ndarray,
    fail: np.ndarray,
    near: np.ndarray,
    components: dict[str, np.ndarray],
    index: pd.Index | None = None,
) -> pd.DataFrame:
    """The analysis columns plus status, score, masks and score components, one frame."""
    columns: dict[str, Any] = {
        "status": pd.Categorical.from_codes(status_code, categories=pd.Index(list(STATUSES))),
        "score": score,
        "fail_mask": fail,
        "marginal_mask": near,
    }
    for name in SCORE_COMPONENTS:
        columns[f"score_{name}"] = components[name]
    if isinstance(analysis, pd.DataFrame):
        index = analysis.index
        merged = {name: analysis[name] for name in analysis.columns}
    else:
        merged = dict(analysis)
    # One frame without consolidating blocks (a copy of every column at a million rows).
    merged.update(columns)
    return pd.DataFrame(merged, index=index, copy=False)


def _popcount(mask: np.ndarray) -> np.ndarray:
    """Number of set bits per element (how many hard rules a part fails)."""
    count = np.zeros(mask.shape, dtype=np.int64)
    for bit in RULE_BIT.values():
        count += (mask & bit) != 0
    return count


def order_rows(
    status: np.ndarray,
    score: np.ndarray,
    mpns: pd.Series,
    *,
    names_below_status: int | None = None,
) -> np.ndarray:
    """Positions sorted by status (small first), score (high first), then part number.

    ``score`` must lie within ±20. With ``names_below_status``, ties among rows of that
    status or above keep the catalog's order instead of the part-number order (also
    deterministic): sorting hundreds of thousands of equal ruled-out parts by name costs
    seconds and tells nobody anything. Also used by the alternates (class, closeness).
    """
    # One float key (status dominates: scores lie within ±20) sorts faster than a lexsort.
    key = status * 1000.0 + np.where(np.isfinite(score), -score, 500.0)
    order = np.argsort(key, kind="stable")
    if order.size < 2:
        return order
    k = key[order]
    same = k[1:] == k[:-1]
    if names_below_status is not None:
        same &= status[order][1:] < names_below_status
    if not same.any():
        return order
    # Break ties by part number, touching only tied rows: a run id per group of equal keys,
    # then one sort of (run, part number) over those rows.
    new_run = np.concatenate(([True], ~same))
    run = np.cumsum(new_run)
    tied = np.concatenate(([False], same)) | np.concatenate((same, [False]))
    positions = order[tied]
    frame = pd.DataFrame(
        {"run": run[tied], "mpn": mpns.iloc[positions].astype(str).to_numpy()},
    )
    resorted = frame.sort_values(["run", "mpn"], kind="stable").index.to_numpy()
    order = order.copy()
    order[tied] = positions[resorted]
    return order


# --------------------------------------------------------------------------- hard rules


def _arr(table: pd.DataFrame, name: str) -> np.ndarray:
    return table[name].to_numpy(dtype=float, na_value=np.nan)


def _per_value(
    table: pd.DataFrame, name: str, judge: Callable[[str], Any], dtype: Any
) -> np.ndarray:
    """``judge`` applied to a text column, evaluated once per distinct value.

    Catalog text columns are categoricals with a handful of values; judging each category
    and indexing by the codes avoids a million Python strings.
    """
    column = table[name]
    if isinstance(column.dtype, pd.CategoricalDtype):
        codes = column.cat.codes.to_numpy()
        labels = [str(c) for c in column.cat.categories] + [""]
    else:
        codes, uniques = pd.factorize(column, sort=False)
        labels = [str(u) for u in uniques] + [""]
    values = np.asarray([judge(text) for text in labels], dtype=dtype)
    return values[np.where(codes < 0, len(labels) - 1, codes)]


#: Rules judged on the circuit figures (not computed for parts at another frequency).
CIRCUIT_RULES: tuple[str, ...] = ("never_starts", "caps", "margin", "drive", "budget")
_CIRCUIT_BITS = sum(RULE_BIT[r] for r in CIRCUIT_RULES)


def failure_mask(table: pd.DataFrame, brief: Brief) -> np.ndarray:
    """Bitmask (int64) of failed hard rules per row; NaN in a figure counts as failing it."""
    wrong_frequency = ~frequency_matches(_arr(table, "frequency_hz"), brief)
    mask = catalog_failure_mask(table, brief) | circuit_failure_mask(table, brief)
    # At another frequency the circuit figures are not computed (NaN): only the frequency
    # and the catalog-level rules (range, package, lifecycle, ...) are reasons then.
    return np.where(wrong_frequency, mask & ~_CIRCUIT_BITS, mask)


def catalog_failure_mask(table: pd.DataFrame, brief: Brief) -> np.ndarray:
    """Bits of the rules judged on catalog columns alone (frequency, temperature range,
    package, lifecycle, height, qualification, stock); ``table`` needs ``frequency_hz`` and
    the catalog columns."""
    n = len(table)
    mask = np.zeros(n, dtype=np.int64)
    limits = brief.limits

    def fail(rule: str, condition: np.ndarray) -> None:
        np.bitwise_or(mask, np.where(condition, RULE_BIT[rule], 0), out=mask)

    fail("frequency", ~frequency_matches(_arr(table, "frequency_hz"), brief))
    t_min, t_max = _arr(table, "temp_min_c"), _arr(table, "temp_max_c")
    fail("temperature_range", ~((t_min <= brief.temp_min_c) & (t_max >= brief.temp_max_c)))
    if limits.packages:
        allowed = {str(p).upper().replace(" ", "") for p in limits.packages}
        fail("package", ~_per_value(table, "package", lambda p: p in allowed, bool))
    lifecycles = _allowed_lifecycles(brief)
    if lifecycles is not None:
        fail("lifecycle", ~_per_value(table, "lifecycle", lambda v: v in lifecycles, bool))
    max_height = _optional(limits, "max_height_mm")
    if max_height is not None:
        fail("height", _arr(table, "height_mm") > max_height)
    qualification = _optional(limits, "require_qualification")
    if qualification:
        wanted = str(qualification).upper()
        have = _per_value(table, "qualification", lambda q: wanted in q.upper(), bool)
        fail("qualification", ~have)
    min_stock = _optional(limits, "min_stock")
    if min_stock is not None:
        fail("stock", ~(_arr(table, "stock") >= min_stock))
    return mask


def circuit_failure_mask(table: pd.DataFrame, brief: Brief) -> np.ndarray:
    """Bits of the rules judged on the circuit figures (:data:`CIRCUIT_RULES`)."""
    mask = np.zeros(len(table), dtype=np.int64)

    def fail(rule: str, condition: np.ndarray) -> None:
        np.bitwise_or(mask, np.where(condition, RULE_BIT[rule], 0), out=mask)

    fail("never_starts", table["can_never_start"].to_numpy(dtype=bool))
    fail("caps", ~table["caps_realisable"].to_numpy(dtype=bool))
    margin, required = _arr(table, "form_margin"), _arr(table, "form_margin_required")
    outside = table["outside_esr_table"].to_numpy(dtype=bool)
    fail("margin", ~(margin >= required) & ~outside)
    level, rating = _arr(table, "drive_level_w"), _arr(table, "drive_rating_w")
    fail("drive", level > rating)
    fail("budget", ~(_arr(table, "budget_headroom_ppm") >= 0.0))
    return mask


def marginal_mask(table: pd.DataFrame, brief: Brief) -> np.ndarray:
    """Bitmask of 'close to a limit' conditions (only meaningful where no rule fails)."""
    band = float(brief.limits.marginal_band)
    mask = np.zeros(len(table), dtype=np.int64)

    def near(name: str, condition: np.ndarray) -> None:
        np.bitwise_or(mask, np.where(condition, MARGINAL_BIT[name], 0), out=mask)

    margin, required = _arr(table, "form_margin"), _arr(table, "form_margin_required")
    near("margin", margin < required * (1.0 + band))
    near("outside_table", table["outside_esr_table"].to_numpy(dtype=bool))
    budget = _arr(table, "budget_ppm")
    near("budget", _arr(table, "budget_headroom_ppm") < band * budget)
    near("drive", _arr(table, "drive_level_w") > (1.0 - band) * _arr(table, "drive_rating_w"))
    return mask


def _optional(obj: object, name: str) -> Any:
    return getattr(obj, name, None)


def _allowed_lifecycles(brief: Brief) -> set[str] | None:
    allowed = brief.limits.lifecycle
    return None if not allowed else {str(v) for v in allowed}


# --------------------------------------------------------------------------- score


def score_components(
    table: pd.DataFrame, brief: Brief, *, cheapest_price: float | None = None
) -> dict[str, np.ndarray]:
    """Each score component in 0..1 (higher is better); monotone in the part's figures.

    margin: log(margin / required) / log(FULL_MARGIN_MULTIPLE), clipped — four times the
    required margin earns the full score. headroom: budget headroom / budget. drive: 1 − drive
    level / rating. price: cheapest listed price / price (unknown price 0.5). stock:
    log10(1 + stock) / log10(1 + FULL_STOCK) (unknown 0). lifecycle: active 1, NRND 0.3,
    obsolete 0, unknown 0.5. ``cheapest_price``: the cheapest price of the whole table when
    ``table`` holds only some of its rows (default: the cheapest in ``table``).
    """
    return {
        **circuit_score_components(table),
        **catalog_score_components(table, cheapest_price=cheapest_price),
    }


def circuit_score_components(table: pd.DataFrame) -> dict[str, np.ndarray]:
    """The margin, headroom and drive components (see :func:`score_components`)."""
    with np.errstate(divide="ignore", invalid="ignore"):
        margin, required = _arr(table, "form_margin"), _arr(table, "form_margin_required")
        margin_score = np.log(margin / required) / np.log(FULL_MARGIN_MULTIPLE)
        headroom = _arr(table, "budget_headroom_ppm") / _arr(table, "budget_ppm")
        drive = 1.0 - _arr(table, "drive_level_w") / _arr(table, "drive_rating_w")
    raw = {"margin": margin_score, "headroom": headroom, "drive": drive}
    return {name: np.clip(np.nan_to_num(v, nan=0.0), 0.0, 1.0) for name, v in raw.items()}


def cheapest(table: pd.DataFrame) -> float:
    """The lowest positive finite price in ``table`` (NaN when none)."""
    price = _arr(table, "price")
    finite_price = price[np.isfinite(price) & (price > 0)]
    return float(finite_price.min()) if finite_price.size else math.nan


def catalog_score_components(
    table: pd.DataFrame, *, cheapest_price: float | None = None
) -> dict[str, np.ndarray]:
    """The price, stock and lifecycle components (see :func:`score_components`)."""
    with np.errstate(divide="ignore", invalid="ignore"):
        price = _arr(table, "price")
        low = cheapest(table) if cheapest_price is None else cheapest_price
        price_score = np.where(np.isfinite(price) & (price > 0), low / price, 0.5)
        stock = np.log10(1.0 + np.maximum(_arr(table, "stock"), 0.0)) / np.log10(1.0 + FULL_STOCK)
    lifecycle_score = _per_value(
        table, "lifecycle", lambda v: LIFECYCLE_SCORE.get(v, UNKNOWN_LIFECYCLE_SCORE), float
    )
    raw = {"price": price_score, "stock": stock, "lifecycle": lifecycle_score}
    return {name: np.clip(np.nan_to_num(v, nan=0.0), 0.0, 1.0) for name, v in raw.items()}


# --------------------------------------------------------------------------- reasons


def reasons_for_row(row: pd.Series, brief: Brief) -> list[str]:
    """Sentences for a row's failed rules (most fundamental first), then its marginal notes."""
    fail = int(row["fail_mask"])
    out = [_RULE_TEXT[rule](row, brief) for rule in RULES if fail & RULE_BIT[rule]]
    if fail == 0:
        near = int(row["marginal_mask"])
        out += [_MARGINAL_TEXT[name](row, brief) for name in MARGINAL if near & MARGINAL_BIT[name]]
    return out


def first_reason(row: pd.Series, brief: Brief) -> str:
    reasons = reasons_for_row(row, brief)
    return reasons[0] if reasons else ""


def _num(value: float, digits: int = 3) -> str:
    """A plain number with ``digits`` significant figures (no exponent for everyday sizes)."""
    if value is None or not np.isfinite(value):
        return "n/a"
    text = f"{value:.{digits}g}"
    if "e" in text:
        text = f"{value:.{max(digits - 1, 0)}e}"
    return text


def _freq(hz: float) -> str:
    if hz >= 1e6:
        return f"{hz / 1e6:.6f}".rstrip("0").rstrip(".") + " MHz"
    return f"{hz / 1e3:.3f} kHz"


def _cap(f: float) -> str:
    return f"{_num(f * 1e12)} pF"


def _power(w: float) -> str:
    return f"{_num(w * 1e6)} µW"


def _gm(s: float) -> str:
    return f"{_num(s * 1e3)} mA/V" if s >= 1e-4 else f"{_num(s * 1e6)} µA/V"


def _temp(c: float) -> str:
    return f"{c:g}".replace("-", "−")


def _form_limit_text(row: pd.Series, brief: Brief) -> str:
    form = str(row["amplifier_form"])
    margin, required = float(row["form_margin"]), float(row["form_margin_required"])
    if form == "gm_crit_max":
        return (
            f"gm_crit {_gm(float(row['gm_critical_s']))} exceeds the chip's maximum "
            f"{_gm(float(brief.amplifier.gm_crit_max_s or math.nan))}"
        )
    if form == "max_esr":
        return (
            f"ESR {_num(float(row['esr_ohm']))} Ω exceeds the {_num(float(row['max_esr_ohm']))} Ω "
            f"the chip allows at CL {_cap(float(row['esr_table_cl_f']))}"
        )
    text = f"margin {_num(margin, 2)} < {_num(required, 2)} with this amplifier"
    if form == "gm_settings":
        text += " even at its highest drive setting"
    return text


def _temperature_text(row: pd.Series, brief: Brief) -> str:
    lo, hi = float(row["temp_min_c"]), float(row["temp_max_c"])
    misses = []
    if not lo <= brief.temp_min_c:
        misses.append(f"{_temp(brief.temp_min_c)} °C")
    if not hi >= brief.temp_max_c:
        misses.append(f"{_temp(brief.temp_max_c)} °C")
    return f"rated {_temp(lo)}…{_temp(hi)} °C does not cover {' or '.join(misses)}"


def _caps_text(row: pd.Series, brief: Brief) -> str:
    spec = float(row["spec_load_capacitance_f"])
    return (
        f"load capacitance {_cap(spec)} cannot be built on this board: stray "
        f"{_cap(brief.board.stray_capacitance_f)} and pin capacitance leave no standard "
        "capacitor value"
    )


_RULE_TEXT: dict[str, Callable[[pd.Series, Brief], str]] = {
    "frequency": lambda r, b: (
        f"nominal {_freq(float(r['frequency_hz']))} is not the brief's {_freq(b.frequency_hz)}"
    ),
    "never_starts": lambda r, b: (
        f"ESR {_num(float(r['esr_ohm']))} Ω is above the most this circuit can cancel "
        f"(|Rneg|max {_num(float(r['negative_resistance_max_ohm']))} Ω at these caps): "
        "it can never start"
    ),
    "temperature_range": _temperature_text,
    "package": lambda r, b: (
        f"package {r['package']} is not allowed ({', '.join(map(str, b.limits.packages or ()))})"
    ),
    "caps": _caps_text,
    "margin": _form_limit_text,
    "drive": lambda r, b: (
        f"drive level {_power(float(r['drive_level_w']))} > rating "
        f"{_power(float(r['drive_rating_w']))}"
    ),
    "budget": lambda r, b: (
        f"total error {_num(float(r['error_total_ppm']))} ppm > budget "
        f"{_num(float(r['budget_ppm']))} ppm"
    ),
    "lifecycle": lambda r, b: f"lifecycle '{r['lifecycle'] or 'unknown'}' is not allowed",
    "height": lambda r, b: (
        f"height {_num(float(r['height_mm']))} mm > "
        f"{_num(float(b.limits.max_height_mm or math.nan))} mm"
    ),
    "qualification": lambda r, b: f"not qualified to {b.limits.require_qualification}",
    "stock": lambda r, b: (
        f"stock {_num(float(r['stock']))} < {_num(float(b.limits.min_stock or math.nan))}"
    ),
}


def _near_margin_text(row: pd.Series, brief: Brief) -> str:
    band = round(brief.limits.marginal_band * 100)
    form = str(row["amplifier_form"])
    value = _num(float(row["form_margin"]), 2)
    if form == "gm_crit_max":
        return f"gain margin {value} is within {band} % of the chip's gm_crit limit"
    if form == "max_esr":
        return f"ESR is within {band} % of the chip's maximum (allowed/ESR {value})"
    required = _num(float(row["form_margin_required"]), 2)
    return f"margin {value} is within {band} % of the minimum {required}"


def _outside_table_text(row: pd.Series, brief: Brief) -> str:
    table = brief.amplifier.max_esr
    points = [] if table is None else [p * 1e12 for p in table.load_capacitance_f]
    span = f"{_num(min(points))}–{_num(max(points))} pF" if points else "no points"
    cl = float(row["esr_table_cl_f"])
    inside = bool(points) and min(points) - 1e-3 <= cl * 1e12 <= max(points) + 1e-3
    if inside and table is not None and table.c0_f is not None:
        c0_span = f"{_num(min(table.c0_f) * 1e12)}–{_num(max(table.c0_f) * 1e12)} pF"
        return (
            f"the chip's ESR table gives no figure at CL {_cap(cl)} with C0 "
            f"{_cap(float(row['c0_f']))} (C0 axis {c0_span}): not extrapolated, review by hand"
        )
    return (
        f"CL {_cap(cl)} is outside the chip's ESR table ({span}): not extrapolated, review by hand"
    )


_MARGINAL_TEXT: dict[str, Callable[[pd.Series, Brief], str]] = {
    "margin": _near_margin_text,
    "outside_table": _outside_table_text,
    "budget": lambda r, b: (
        f"budget headroom {_num(float(r['budget_headroom_ppm']))} ppm is within "
        f"{round(b.limits.marginal_band * 100)} % of the {_num(float(r['budget_ppm']))} ppm "
        "budget"
    ),
    "drive": lambda r, b: (
        f"drive level {_power(float(r['drive_level_w']))} is within "
        f"{round(b.limits.marginal_band * 100)} % of the rating "
        f"{_power(float(r['drive_rating_w']))}"
    ),
}
