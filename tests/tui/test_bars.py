"""Text bars: exact widths, eighth-block resolution, symbols that read without colour."""

from __future__ import annotations

import math

import pytest

from picker.tui.bars import budget_bar, fraction_bar, margin_bar


@pytest.mark.parametrize("width", [1, 6, 10])
@pytest.mark.parametrize("fraction", [-1.0, 0.0, 0.33, 0.5, 1.0, 7.0, math.nan])
def test_every_bar_is_exactly_its_width(fraction: float, width: int) -> None:
    assert len(fraction_bar(fraction, width)) == width
    assert len(margin_bar(fraction * 10, 5.0, width)) == width
    assert len(budget_bar(fraction * 40, 40.0, width)) == width


def test_fraction_bar_uses_eighth_blocks() -> None:
    # U+2588 FULL BLOCK and U+258C LEFT HALF BLOCK (Unicode "Block Elements" chart).
    assert fraction_bar(0.5, 4) == "██  "
    assert fraction_bar(0.5 / 4 + 0.25, 4) == "█▌  "
    assert fraction_bar(1.0, 3) == "███"
    assert fraction_bar(0.0, 3) == "   "


def test_margin_bar_marks_the_minimum_and_overflow() -> None:
    # span 0..2·min: a margin of half the minimum fills a quarter, the minimum mark shows.
    assert margin_bar(2.5, 5.0, 8) == "██  ┆   "
    assert margin_bar(10.0, 5.0, 8) == "████████"
    assert margin_bar(30.0, 5.0, 8).endswith("›")


def test_budget_bar_flags_over_budget() -> None:
    assert budget_bar(20.0, 40.0, 6) == "███   "
    assert budget_bar(50.0, 40.0, 6) == "█████!"
    assert budget_bar(math.nan, 40.0, 3) == "?  "
