"""Braille plots: dot encoding per the Unicode standard, scaling, markers, framing."""

from __future__ import annotations

import unicodedata

import numpy as np

from picker.tui.plots import BrailleGrid, curve_plot, framed, marker_row


def test_dot_bits_follow_the_unicode_braille_block() -> None:
    # The Unicode character database names each braille cell by its raised dots
    # ("BRAILLE PATTERN DOTS-1"); dots 1,2,3 are the left column top to bottom, 4,5,6 the
    # right column, 7 (left) and 8 (right) the bottom row.
    dot_number = {
        (0, 0): 1,
        (0, 1): 2,
        (0, 2): 3,
        (1, 0): 4,
        (1, 1): 5,
        (1, 2): 6,
        (0, 3): 7,
        (1, 3): 8,
    }
    for (x, y), number in dot_number.items():
        grid = BrailleGrid(1, 1)
        grid.set(x, y)
        assert unicodedata.name(grid.lines()[0]) == f"BRAILLE PATTERN DOTS-{number}"
    full = BrailleGrid(1, 1)
    for x in range(2):
        for y in range(4):
            full.set(x, y)
    assert unicodedata.name(full.lines()[0]) == "BRAILLE PATTERN DOTS-12345678"


def test_outside_dots_are_ignored() -> None:
    grid = BrailleGrid(2, 1)
    grid.set(-1, 0)
    grid.set(4, 0)
    grid.set(0, 4)
    assert grid.lines() == ["⠀⠀"]


def test_rising_line_goes_from_bottom_left_to_top_right() -> None:
    x = np.linspace(0.0, 1.0, 20)
    lines, (low, high) = curve_plot(x, [x], width=4, height=2, y_range=(0.0, 1.0))
    assert len(lines) == 2 and all(len(line) == 4 for line in lines)
    assert lines[1][0] != "⠀" and lines[0][0] == "⠀"  # starts low on the left
    assert lines[0][-1] != "⠀" and lines[1][-1] == "⠀"  # ends high on the right
    assert (low, high) == (0.0, 1.0)


def test_nan_leaves_a_gap() -> None:
    x = np.arange(8.0)
    y = np.where(x < 4, 0.5, np.nan)
    lines, _ = curve_plot(x, [y], width=4, height=1, y_range=(0.0, 1.0))
    assert lines[0][2:] == "⠀⠀"


def test_markers_land_under_their_x() -> None:
    assert marker_row(0.0, 10.0, 11, [(0.0, "s"), (5.0, "L"), (10.0, "p")]) == "s    L    p"
    assert marker_row(0.0, 10.0, 5, [(20.0, "x")]) == "     "


def test_framed_adds_labels_and_axis() -> None:
    out = framed(["⠁⠁", "⠂⠂"], "+5", "-5", "a", "b", label_width=3)
    assert out[0] == " +5│⠁⠁" and out[1] == " -5│⠂⠂"
    assert out[2] == "   └──"
