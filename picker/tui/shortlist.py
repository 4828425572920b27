"""The shortlist: ranked parts, one line each, only visible rows drawn."""

from __future__ import annotations

import math

import numpy as np

from picker.tui.bars import budget_bar, margin_bar
from picker.tui.model import SHORTLIST_COLUMNS, Shortlist
from picker.tui.rows import Cells, RowList

STATUS_LABELS = {
    "fit": ("✔ fit ", "rowlist--good"),
    "marginal": ("△ marg", "rowlist--warn"),
    "ruled_out": ("✘ out ", "rowlist--bad"),
}
"""Status as a symbol and a word, so it reads without colour."""


def status_cells(status: str) -> tuple[str, str | None]:
    return STATUS_LABELS.get(status, (f"{status[:6]:<6}", None))


def _number(value: float, width: int, digits: int = 1) -> str:
    if not math.isfinite(value):
        return "—".rjust(width)
    text = f"{value:.{digits}f}"
    if len(text) > width:
        text = f"{value:.0f}"
    return text.rjust(width)[:width] if len(text) <= width else "≫".rjust(width)


def _score_text(score: float) -> str:
    if not math.isfinite(score):
        return "  —"
    scaled = score * 100 if abs(score) <= 1.0 else score
    return f"{scaled:3.0f}"


class ShortlistView(RowList):
    """Ranked parts with status, score, margin and budget bars and key figures."""

    empty_text = "no part fits this brief; see Ruled out (r) for the reasons"

    def __init__(self, *, id: str | None = None, classes: str | None = None) -> None:
        super().__init__(id=id, classes=classes)
        self._shortlist: Shortlist | None = None
        self._mpn = np.array([], dtype=object)
        self._columns: dict[str, np.ndarray] = {}

    @property
    def shortlist(self) -> Shortlist | None:
        return self._shortlist

    @property
    def mpns(self) -> np.ndarray:
        return self._mpn

    def show(self, shortlist: Shortlist, keep: str | None = None) -> None:
        """Show a new ranking; the cursor stays on `keep` when that part is still listed."""
        self._shortlist = shortlist
        rows = shortlist.rows
        self._mpn = rows["mpn"].to_numpy(dtype=object)
        self._columns = {name: rows[name].to_numpy() for name in SHORTLIST_COLUMNS}
        cursor = 0
        if keep is not None:
            hits = np.flatnonzero(self._mpn == keep)
            if hits.size:
                cursor = int(hits[0])
        self.set_row_count(len(rows), cursor)

    def index_of(self, mpn: str) -> int | None:
        hits = np.flatnonzero(self._mpn == mpn)
        return int(hits[0]) if hits.size else None

    def current_mpn(self) -> str | None:
        if self.row_count == 0:
            return None
        return str(self._mpn[self.cursor])

    WIDE = 110
    """From this row width on, gain margin and budget headroom get their own columns."""

    def _layout(self, width: int) -> tuple[int, int]:
        """Widths of the part-number column and of each bar for this row width."""
        bar = 6 if width < 100 else 10
        # status 6, score 5, package 8, CL 6, ESR 6, margin 6, ppm 7, each with its gap
        fixed = 6 + 5 + 1 + 8 + 6 + 6 + 6 + 7 + 2 * bar
        if width >= self.WIDE:
            fixed += 7 + 7
        return min(max(width - fixed, 8), 30), bar

    def header_cells(self, width: int) -> Cells:
        mpn_width, bar = self._layout(width - 1)
        text = (
            f" {'status':<6} {'scr':>3} {'part number':<{mpn_width}} {'package':<7} "
            f"{'CL pF':>5} {'ESR Ω':>5} {'margin':>6}{'':<{bar}} {'ppm':>5} {'budget':<{bar}}"
        )
        if width - 1 >= self.WIDE:
            text += f" {'gain':>6} {'spare':>6}"
        return [(text, None)]

    def row_cells(self, index: int, width: int) -> Cells:
        if self._shortlist is None:
            return []
        mpn_width, bar = self._layout(width)
        col = self._columns
        status, style = status_cells(str(col["status"][index]))
        mpn = str(self._mpn[index])
        if len(mpn) > mpn_width:
            mpn = mpn[: mpn_width - 1] + "…"
        cl = float(col["spec_cl_f"][index])
        cl_text = "  ser" if not math.isfinite(cl) else _number(cl * 1e12, 5)
        margin = float(col["margin"][index])
        total = float(col["total_ppm"][index])
        cells: Cells = [
            (status, style),
            (f" {_score_text(float(col['score'][index]))} ", None),
            (f"{mpn:<{mpn_width}} ", None),
            (f"{str(col['package'][index])[:7]:<7} ", None),
            (f"{cl_text} ", None),
            (f"{_number(float(col['esr_ohm'][index]), 5, 0)} ", None),
            (f"{_number(margin, 5)}×", None),
            (margin_bar(margin, float(col["margin_required"][index]), bar), style),
            (f" {_number(total, 5)} ", None),
            (budget_bar(total, self._shortlist.budget_ppm, bar), style),
        ]
        if width >= self.WIDE:
            cells.append((f" {_number(float(col['gain_margin'][index]), 5)}×", None))
            cells.append((f" {_number(float(col['headroom_ppm'][index]), 6)}", None))
        return cells
