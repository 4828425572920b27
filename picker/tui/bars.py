"""Bars drawn with text characters, so a row reads the same with or without colour.

Pure functions returning plain strings of exactly `width` cells.
"""

from __future__ import annotations

import math

EIGHTHS = " ▏▎▍▌▋▊▉█"


def fraction_bar(fraction: float, width: int) -> str:
    """A left-aligned bar filling `fraction` (0..1, clipped) of `width` cells, 1/8 resolution."""
    if width <= 0:
        return ""
    if not math.isfinite(fraction):
        return "?".ljust(width)
    eighths = round(min(max(fraction, 0.0), 1.0) * width * 8)
    full, part = divmod(eighths, 8)
    text = "█" * full + (EIGHTHS[part] if part and full < width else "")
    return text.ljust(width)


def margin_bar(margin: float, min_margin: float, width: int) -> str:
    """Negative-resistance margin against the brief's minimum.

    The bar spans 0 to 2 × min_margin; the minimum sits at the middle, marked `┆` where the
    bar does not cover it, and a margin beyond the span ends in `›`.
    """
    if width <= 0:
        return ""
    if not math.isfinite(margin) or min_margin <= 0:
        return "?".ljust(width)
    span = 2.0 * min_margin
    cells = list(fraction_bar(margin / span, width))
    mark = min(width - 1, round(width * min_margin / span))
    if cells[mark] == " ":
        cells[mark] = "┆"
    if margin > span:
        cells[-1] = "›"
    return "".join(cells)


def budget_bar(total_ppm: float, budget_ppm: float, width: int) -> str:
    """Share of the budget used by the worst-case total; over budget ends in `!`."""
    if width <= 0:
        return ""
    if not (math.isfinite(total_ppm) and math.isfinite(budget_ppm)) or budget_ppm <= 0:
        return "?".ljust(width)
    text = fraction_bar(total_ppm / budget_ppm, width)
    if total_ppm > budget_ppm:
        text = text[:-1] + "!"
    return text
