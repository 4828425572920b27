"""match_part_number: exact, normalised, one clear fuzzy match, or candidates."""

from __future__ import annotations

import time

import numpy as np
import pandas as pd

from picker.match import match_part_number

MPNS = pd.Series(["QX-3225-16M000-A", "QX-3225-16M000-B", "TF2012-32K768", "ZZ9000"])


def test_exact_match_is_used() -> None:
    result = match_part_number(MPNS, "TF2012-32K768")
    assert (result.mpn, result.kind) == ("TF2012-32K768", "exact")
    assert result.describe() == "using TF2012-32K768"


def test_case_and_space_differences_are_normalised() -> None:
    result = match_part_number(MPNS, "  zz9000 ")
    assert result.mpn == "ZZ9000"
    assert result.kind in ("exact", "normalised")
    lower = match_part_number(MPNS, "tf2012-32k768")
    assert (lower.mpn, lower.kind) == ("TF2012-32K768", "normalised")


def test_one_clear_fuzzy_match_is_used_and_said() -> None:
    result = match_part_number(MPNS, "TF2012-32K76")  # one character dropped
    assert (result.mpn, result.kind) == ("TF2012-32K768", "fuzzy")
    assert "using the closest match TF2012-32K768" in result.describe()


def test_two_close_candidates_are_listed_not_guessed() -> None:
    result = match_part_number(MPNS, "QX-3225-16M000")  # A and B are equally close
    assert result.mpn is None
    names = [name for name, _ in result.candidates[:2]]
    assert set(names) == {"QX-3225-16M000-A", "QX-3225-16M000-B"}
    assert result.describe().startswith("no part number 'QX-3225-16M000'; closest: ")


def test_nothing_alike_gives_no_candidates() -> None:
    result = match_part_number(MPNS, "hello world")
    assert result.mpn is None and result.kind == "none"


def test_empty_inputs() -> None:
    assert match_part_number(pd.Series([], dtype=object), "X").mpn is None
    assert match_part_number(MPNS, "   ").mpn is None


def test_a_million_part_numbers_answer_quickly() -> None:
    rng = np.random.default_rng(3)  # seeded random generator
    numbers = rng.integers(0, 10**9, size=1_000_000)
    mpns = pd.Series([f"PN{n:09d}" for n in numbers])
    target = str(mpns.iloc[123_456])
    start = time.perf_counter()
    assert match_part_number(mpns, target).kind == "exact"
    exact_s = time.perf_counter() - start
    start = time.perf_counter()
    fuzzy = match_part_number(mpns, target[:-1] + ("0" if target[-1] != "0" else "1") + "X")
    fuzzy_s = time.perf_counter() - start
    assert exact_s < 0.5
    assert fuzzy_s < 5.0  # measured ~0.5 s on 2 cores
    assert fuzzy.candidates
