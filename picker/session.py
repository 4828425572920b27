"""Staged re-ranking of one part table: keep what a brief edit did not change.

A brief edit usually touches one section: a new gm changes the negative resistance, the
margins, the start-up time and the statuses, but no crystal or board figure. The analysis is
therefore built in stages, each a pure function of the part table and the brief sections it
reads (frozen dataclasses, so they compare and hash):

1. selection — which parts sit at the brief's nominal frequency (``brief.frequency_hz``);
   only they get circuit figures (:func:`picker.analysis.analyze_parts`);
2. board — crystal and board figures of those parts
   (:func:`picker.analysis.board_stage`, keyed on :func:`picker.analysis.board_key`);
3. amplifier — negative resistance, margins and gm figures
   (:func:`picker.analysis.amplifier_stage`, keyed on :func:`picker.analysis.amplifier_key`);
4. catalog rules — the rules, score components and order of the parts at other
   frequencies, which no circuit figure can change (keyed on the frequency, temperature
   range, limits and weights).

:class:`RankSession` keeps the latest result of each stage for its own part table; the
caller owns the session (one per loaded catalog), so nothing is global. Every ranking it
returns equals :func:`picker.rank.rank_analysis` of :func:`picker.analysis.analyze_parts`
(the tests compare the two column by column).
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass
from typing import Any, TypeVar

import numpy as np
import pandas as pd

from picker.analysis import (
    BoardStage,
    amplifier_key,
    amplifier_stage,
    analysis_columns,
    analysis_frame,
    board_key,
    board_stage,
    frequency_matches,
    spread_columns,
)
from picker.brief import Brief
from picker.rank import (
    SCORE_COMPONENTS,
    Ranking,
    _popcount,
    catalog_failure_mask,
    catalog_score_components,
    cheapest,
    circuit_score_components,
    failure_mask,
    marginal_mask,
    order_rows,
    ranked_frame,
    status_codes,
    status_counts,
    weighted_score,
)

T = TypeVar("T")

#: Catalog columns the catalog-level rules and score components read.
_CATALOG_COLUMNS = (
    "temp_min_c",
    "temp_max_c",
    "package",
    "lifecycle",
    "height_mm",
    "qualification",
    "stock",
    "price",
)

#: Status code of a ruled-out part and the order key's status scale (as rank.order_rows).
_RULED_OUT = 2
_STATUS_SCALE = 1000.0


@dataclass(frozen=True)
class _Selection:
    """Stage 1: the parts at the brief's nominal frequency."""

    rows: np.ndarray  # positions of the parts at the brief's frequency
    everything: bool  # every part is at the brief's frequency (no spreading needed)
    subset: pd.DataFrame  # those parts
    f_nom: np.ndarray  # nominal frequency of every part [Hz]


@dataclass(frozen=True)
class _Board:
    """Stage 2: the board stage of the selected parts and its columns over all parts."""

    stage: BoardStage
    head: dict[str, Any]
    tail: dict[str, Any]


@dataclass(frozen=True)
class _Catalog:
    """Stage 4: everything about the parts at other frequencies (all ruled out)."""

    fail: np.ndarray  # catalog-rule bits of every part
    components: dict[str, np.ndarray]  # score components, circuit ones 0
    score: np.ndarray  # the score of every part with the circuit components 0
    cheapest_price: float


@dataclass(frozen=True)
class _OffOrder:
    """The parts at other frequencies in ranking order (built when an order is asked for)."""

    positions: np.ndarray  # by (order key, position)
    key: np.ndarray  # their order keys, ascending
    pair: np.ndarray  # group of equal keys × n + position, strictly ascending


class RankSession:
    """Ranks one part table against successive briefs, reusing unchanged stages.

    >>> session = RankSession(parts)            # doctest: +SKIP
    >>> first = session.rank(brief)             # doctest: +SKIP
    >>> again = session.rank(brief_with_new_gm) # doctest: +SKIP  (amplifier stage only)

    Holds the latest result of each stage (memory about one ranking); a new part table needs
    a new session.
    """

    def __init__(self, parts: pd.DataFrame) -> None:
        self.parts = parts
        self._memo: dict[str, tuple[object, Any]] = {}

    def _stage(self, name: str, key: object, build: Callable[[], T]) -> T:
        held = self._memo.get(name)
        if held is not None and held[0] == key:
            return held[1]
        value = build()
        self._memo[name] = (key, value)
        return value

    def rank(self, brief: Brief) -> Ranking:
        """The ranking of the session's part table against ``brief`` (as
        :func:`picker.rank.rank_parts`)."""
        parts = self.parts
        selection = self._stage("selection", brief.frequency_hz, lambda: _select(parts, brief))
        board = self._stage("board", board_key(brief), lambda: _board(parts, selection, brief))
        amplifier = self._stage(
            "amplifier", amplifier_key(brief), lambda: amplifier_stage(board.stage, brief)
        )
        limits = brief.limits
        catalog_key = (
            brief.frequency_hz,
            brief.temp_min_c,
            brief.temp_max_c,
            limits.packages,
            limits.lifecycle,
            limits.max_height_mm,
            limits.require_qualification,
            limits.min_stock,
            brief.weights,
        )
        catalog = self._stage("catalog", catalog_key, lambda: _catalog(parts, selection, brief))

        def off_order() -> _OffOrder:
            return self._stage("off_order", catalog_key, lambda: _off_order(selection, catalog))

        return self._stage(
            "ranking",
            brief,
            lambda: _ranking(parts, selection, board, amplifier, catalog, off_order, brief),
        )


def _select(parts: pd.DataFrame, brief: Brief) -> _Selection:
    f_nom = parts["freq_hz"].to_numpy(dtype=float, na_value=np.nan)
    match = frequency_matches(f_nom, brief)
    everything = bool(match.all())
    rows = np.flatnonzero(match)
    subset = parts if everything else parts.iloc[rows]
    return _Selection(rows=rows, everything=everything, subset=subset, f_nom=f_nom)


def _board(parts: pd.DataFrame, selection: _Selection, brief: Brief) -> _Board:
    stage = board_stage(selection.subset, brief)
    if selection.everything:
        return _Board(stage=stage, head=stage.head, tail=stage.tail)
    spread = spread_columns({**stage.head, **stage.tail}, parts, selection.rows, brief,
                            selection.f_nom)  # fmt: skip
    head = {name: spread[name] for name in stage.head}
    tail = {name: spread[name] for name in stage.tail}
    return _Board(stage=stage, head=head, tail=tail)


def _catalog_table(parts: pd.DataFrame, f_nom: np.ndarray) -> pd.DataFrame:
    columns: dict[str, Any] = {"frequency_hz": f_nom}
    columns.update({name: parts[name] for name in _CATALOG_COLUMNS if name in parts})
    return pd.DataFrame(columns, index=parts.index, copy=False)


def _catalog(parts: pd.DataFrame, selection: _Selection, brief: Brief) -> _Catalog:
    n = len(parts)
    table = _catalog_table(parts, selection.f_nom)
    fail = catalog_failure_mask(table, brief)
    low = cheapest(table)
    components = {name: np.zeros(n) for name in ("margin", "headroom", "drive")}
    components.update(catalog_score_components(table, cheapest_price=low))
    components = {name: components[name] for name in SCORE_COMPONENTS}
    score = weighted_score(components, brief)
    return _Catalog(fail=fail, components=components, score=score, cheapest_price=low)


def _off_order(selection: _Selection, catalog: _Catalog) -> _OffOrder:
    n = selection.f_nom.size
    off = np.ones(n, dtype=bool)
    off[selection.rows] = False
    off_rows = np.flatnonzero(off)
    failures = _popcount(catalog.fail[off_rows])
    key = _order_key(np.full(off_rows.size, _RULED_OUT), catalog.score[off_rows] - failures)
    by_key = np.argsort(key, kind="stable")
    positions, key = off_rows[by_key], key[by_key]
    group = np.cumsum(np.concatenate(([0], (np.diff(key) != 0).astype(np.int64))))
    return _OffOrder(positions=positions, key=key, pair=group * max(n, 1) + positions)


def _order_key(status: np.ndarray, score: np.ndarray) -> np.ndarray:
    """rank.order_rows' sort key: status first, then score (high first)."""
    return status * _STATUS_SCALE + np.where(np.isfinite(score), -score, 500.0)


def _scatter(base: np.ndarray, rows: np.ndarray, values: np.ndarray) -> np.ndarray:
    out = base.copy()
    out[rows] = values
    return out


def _ranking(
    parts: pd.DataFrame,
    selection: _Selection,
    board: _Board,
    amplifier: dict[str, Any],
    catalog: _Catalog,
    off_order: Callable[[], _OffOrder],
    brief: Brief,
) -> Ranking:
    n, rows = len(parts), selection.rows
    # The parts at the brief's frequency: judged in full, on their own small frame.
    frame = analysis_frame(board.stage, amplifier)
    sub_fail = failure_mask(frame, brief)
    sub_near = np.where(sub_fail != 0, 0, marginal_mask(frame, brief))
    sub_status = status_codes(sub_fail, sub_near)
    sub_components = circuit_score_components(frame)
    sub_score = weighted_score(
        {
            **sub_components,
            **{name: catalog.components[name][rows] for name in ("price", "stock", "lifecycle")},
        },
        brief,
    )
    # Every part: the catalog stage's arrays with the selected rows written in.
    fail = _scatter(catalog.fail, rows, sub_fail)
    near = _scatter(np.zeros(n, dtype=np.int64), rows, sub_near)
    status = _scatter(np.full(n, _RULED_OUT, dtype=np.int8), rows, sub_status)
    score = _scatter(catalog.score, rows, sub_score)
    components = dict(catalog.components)
    for name, values in sub_components.items():
        components[name] = _scatter(catalog.components[name], rows, values)
    if selection.everything:
        columns = analysis_columns(board.head, amplifier, board.tail)
    else:
        spread = spread_columns(amplifier, parts, rows, brief, selection.f_nom)
        columns = analysis_columns(board.head, spread, board.tail)
    table = ranked_frame(columns, status, score, fail, near, components, index=parts.index)
    mpns, key_score = frame["mpn"], sub_score - _popcount(sub_fail)

    def ordering() -> np.ndarray:
        return _order(selection, off_order(), mpns, sub_status, key_score)

    return Ranking(analysis=table, brief=brief, counts=status_counts(status), ordering=ordering)


def _order(
    selection: _Selection,
    off: _OffOrder,
    mpns: pd.Series,
    status: np.ndarray,
    key_score: np.ndarray,
) -> np.ndarray:
    """rank.order_rows over every part, sorting only the selected rows: the parts at other
    frequencies are put in order once per catalog stage (:func:`_off_order`) and the
    selected ruled-out rows are merged into that order (ties: catalog position, as a
    stable sort gives)."""
    rows = selection.rows
    local = order_rows(status, key_score, mpns, names_below_status=_RULED_OUT)
    listed = local[status[local] < _RULED_OUT]
    out_local = local[status[local] >= _RULED_OUT]  # by (key, position) already: stable sort
    out_rows = rows[out_local]
    out_key = _order_key(status[out_local], key_score[out_local])
    lo = np.searchsorted(off.key, out_key, side="left")
    hi = np.searchsorted(off.key, out_key, side="right")
    where = lo.copy()
    tied = hi > lo
    if tied.any():
        n = max(selection.f_nom.size, 1)
        pair = off.pair[lo[tied]] // n * n + out_rows[tied]
        where[tied] = np.searchsorted(off.pair, pair, side="left")
    ruled = np.insert(off.positions, where, out_rows)
    return np.concatenate((rows[listed], ruled)).astype(np.int64)
