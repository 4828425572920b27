"""Row lists for ruled-out parts and alternates (Line API, visible rows only)."""

from __future__ import annotations

import numpy as np
import pandas as pd
from textual.message import Message

from picker.tui.model import Alternate
from picker.tui.rows import Cells, RowList

FIT_LABELS = {
    "drop_in": ("● drop-in   ", "rowlist--good"),
    "drop_in_new_caps": ("◐ new caps  ", "rowlist--good"),
    "review": ("△ review    ", "rowlist--warn"),
    "incompatible": ("✘ no        ", "rowlist--bad"),
}
"""How closely an alternate drops in, as a symbol and words (readable without colour)."""


def fit_cells(fit: str) -> tuple[str, str | None]:
    return FIT_LABELS.get(fit, (f"{fit[:11]:<12}", None))


class RuledOutView(RowList):
    """Ruled-out parts: part number, package and the most fundamental reason.

    The reason sentence carries the part's own numbers and costs a little to write, so the
    view asks for sentences (`NeedReasons`) only for the rows it draws, shows the short
    rule label until they arrive, and remembers them.
    """

    empty_text = "no part is ruled out (or none matches the filter)"

    class NeedReasons(Message):
        """Sentences wanted for these keys (see `add_reasons`)."""

        def __init__(self, view: RuledOutView, keys: tuple[int, ...]) -> None:
            super().__init__()
            self.view = view
            self.keys = keys

    def __init__(self, *, id: str | None = None) -> None:
        super().__init__(id=id)
        self._frame = pd.DataFrame({"key": [], "mpn": [], "package": [], "first_reason": []})
        self._keys: np.ndarray = np.array([], dtype=np.int64)
        self._sentences: dict[int, str] = {}
        self._wanted: set[int] = set()

    def show(self, frame: pd.DataFrame, *, same_ranking: bool = False) -> None:
        """Show ruled-out rows (columns key, mpn, package, first_reason; any index)."""
        self._frame = frame
        self._keys = frame["key"].to_numpy(dtype=np.int64)
        if not same_ranking:
            self._sentences = {}
        self._wanted = set()
        self.set_row_count(len(frame))

    def add_reasons(self, sentences: dict[int, str]) -> None:
        """Sentences for some keys arrived: draw them."""
        self._sentences.update(sentences)
        self._wanted.difference_update(sentences)
        self.refresh()

    def _text(self, column: str, index: int) -> str:
        return str(self._frame[column].iloc[index])

    def current_mpn(self) -> str | None:
        return self._text("mpn", self.cursor) if self.row_count else None

    def current_key(self) -> int | None:
        return int(self._keys[self.cursor]) if self.row_count else None

    def index_of(self, mpn: str) -> int | None:
        hits = np.flatnonzero((self._frame["mpn"] == mpn).to_numpy(dtype=bool))
        return int(hits[0]) if hits.size else None

    def _reason(self, index: int) -> str:
        key = int(self._keys[index])
        if key in self._sentences:
            return self._sentences[key]
        if not self._wanted:
            self.call_later(self._ask)
        self._wanted.add(key)
        return self._text("first_reason", index)

    def _ask(self) -> None:
        if self._wanted:
            self.post_message(self.NeedReasons(self, tuple(sorted(self._wanted))))

    def _mpn_width(self, width: int) -> int:
        return min(max(width // 4, 12), 22)

    def header_cells(self, width: int) -> Cells:
        w = self._mpn_width(width - 1)
        return [(f" {'part number':<{w}} {'package':<8} first reason", None)]

    def row_cells(self, index: int, width: int) -> Cells:
        w = self._mpn_width(width)
        mpn = self._text("mpn", index)
        mpn = mpn if len(mpn) <= w else mpn[: w - 1] + "…"
        return [
            (f"{mpn:<{w}} ", None),
            (f"{self._text('package', index)[:8]:<8} ", None),
            ("✘ ", "rowlist--bad"),
            (self._reason(index), None),
        ]


class AlternatesView(RowList):
    """Alternates for one reference part, closest first."""

    empty_text = "type a part number above (or press a on a shortlist row)"

    def __init__(self, *, id: str | None = None) -> None:
        super().__init__(id=id)
        self._rows: tuple[Alternate, ...] = ()

    def show(self, rows: tuple[Alternate, ...]) -> None:
        self._rows = rows
        self.set_row_count(len(rows))

    def current(self) -> Alternate | None:
        return self._rows[self.cursor] if self._rows else None

    def _mpn_width(self, width: int) -> int:
        return min(max(width // 4, 12), 24)

    def header_cells(self, width: int) -> Cells:
        w = self._mpn_width(width - 1)
        return [(f" {'drops in?':<12} {'part number':<{w}} {'package':<8} differences", None)]

    def row_cells(self, index: int, width: int) -> Cells:
        row = self._rows[index]
        w = self._mpn_width(width)
        label, style = fit_cells(row.fit)
        mpn = row.mpn if len(row.mpn) <= w else row.mpn[: w - 1] + "…"
        first = row.differences[0] if row.differences else "identical in every compared field"
        more = f" (+{len(row.differences) - 1})" if len(row.differences) > 1 else ""
        return [
            (label, style),
            (f" {mpn:<{w}} ", None),
            (f"{row.package[:8]:<8} ", None),
            (first + more, None),
        ]
