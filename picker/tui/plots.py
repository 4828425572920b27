"""Small terminal plots drawn with braille characters (2 × 4 dots per cell).

Pure functions: arrays in, lines of text out. No plotting dependency.
"""

from __future__ import annotations

import math
from collections.abc import Sequence

import numpy as np

# Unicode braille: dot (col, row) -> bit; see the Unicode "Braille Patterns" block U+2800.
_DOT_BITS = ((0x01, 0x08), (0x02, 0x10), (0x04, 0x20), (0x40, 0x80))


class BrailleGrid:
    """A width × height cell grid addressed in dots (2·width × 4·height)."""

    def __init__(self, width: int, height: int) -> None:
        self.width = max(width, 1)
        self.height = max(height, 1)
        self._bits = np.zeros((self.height, self.width), dtype=np.uint8)

    @property
    def dots_x(self) -> int:
        return 2 * self.width

    @property
    def dots_y(self) -> int:
        return 4 * self.height

    def set(self, x: int, y: int) -> None:
        """Set the dot at column x, row y (row 0 at the top); outside is ignored."""
        if 0 <= x < self.dots_x and 0 <= y < self.dots_y:
            row, sub_y = divmod(y, 4)
            col, sub_x = divmod(x, 2)
            self._bits[row, col] |= _DOT_BITS[sub_y][sub_x]

    def line(self, x0: int, y0: int, x1: int, y1: int) -> None:
        """Set the dots on a straight segment (enough steps to leave no gaps)."""
        steps = max(abs(x1 - x0), abs(y1 - y0), 1)
        for i in range(steps + 1):
            self.set(round(x0 + (x1 - x0) * i / steps), round(y0 + (y1 - y0) * i / steps))

    def lines(self) -> list[str]:
        return ["".join(chr(0x2800 + int(b)) for b in row) for row in self._bits]


def _scale(value: float, low: float, high: float, size: int) -> int:
    if high <= low:
        return size // 2
    return round((value - low) / (high - low) * (size - 1))


def curve_plot(
    x: np.ndarray,
    curves: Sequence[np.ndarray],
    *,
    width: int,
    height: int,
    y_range: tuple[float, float] | None = None,
    bands: Sequence[float] = (),
) -> tuple[list[str], tuple[float, float]]:
    """Plot one or more curves y(x) and dotted horizontal lines at `bands`.

    Returns the braille lines (top first) and the y range used. NaN samples leave gaps.
    """
    grid = BrailleGrid(width, height)
    finite = [c[np.isfinite(c)] for c in curves]
    values = np.concatenate([*finite, np.asarray(bands, dtype=float)]) if finite else np.array([])
    if y_range is None:
        if values.size == 0:
            y_range = (0.0, 1.0)
        else:
            low, high = float(values.min()), float(values.max())
            pad = 0.08 * (high - low) if high > low else max(abs(high), 1.0) * 0.1
            y_range = (low - pad, high + pad)
    x_low, x_high = float(np.nanmin(x)), float(np.nanmax(x))
    for level in bands:
        y = grid.dots_y - 1 - _scale(level, *y_range, grid.dots_y)
        for dot_x in range(0, grid.dots_x, 3):
            grid.set(dot_x, y)
    for curve in curves:
        previous: tuple[int, int] | None = None
        for xv, yv in zip(x, curve, strict=True):
            if not (math.isfinite(xv) and math.isfinite(yv)):
                previous = None
                continue
            point = (
                _scale(float(xv), x_low, x_high, grid.dots_x),
                grid.dots_y - 1 - _scale(float(yv), *y_range, grid.dots_y),
            )
            if previous is None:
                grid.set(*point)
            else:
                grid.line(*previous, *point)
            previous = point
    return grid.lines(), y_range


def marker_row(
    x_low: float, x_high: float, width: int, markers: Sequence[tuple[float, str]]
) -> str:
    """A text row of `width` cells with each marker's letter under its x position."""
    cells = [" "] * width
    for value, letter in markers:
        if math.isfinite(value) and x_low <= value <= x_high:
            cells[_scale(value, x_low, x_high, width)] = letter
    return "".join(cells)


def framed(
    lines: list[str], y_top: str, y_bottom: str, x_left: str, x_right: str, label_width: int = 8
) -> list[str]:
    """Add a y label on the first and last rows and an x axis line below."""
    out = []
    for i, line in enumerate(lines):
        if i == 0:
            label = y_top
        elif i == len(lines) - 1:
            label = y_bottom
        else:
            label = ""
        out.append(f"{label:>{label_width}}│{line}")
    width = len(lines[0]) if lines else 0
    gap = max(width - len(x_left) - len(x_right), 1)
    out.append(" " * label_width + "└" + "─" * width)
    out.append(" " * (label_width + 1) + x_left + " " * gap + x_right)
    return out
