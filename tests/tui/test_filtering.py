"""The ruled-out filter: every word must match some column; categories matched once."""

from __future__ import annotations

import pandas as pd

from picker.tui.filtering import contains, filter_rows

FRAME = pd.DataFrame(
    {
        "mpn": pd.Series(["TK16-A", "TK16-B", "MB12-F", None], dtype="str"),
        "package": pd.Categorical(["3225", "2520", "3225", None]),
        "first_reason": pd.Categorical(
            ["frequency differs", "over the error budget", "frequency differs", "too tall"]
        ),
    }
)


def test_contains_is_case_insensitive_and_ignores_missing() -> None:
    assert contains(FRAME["mpn"], "tk16").tolist() == [True, True, False, False]
    assert contains(FRAME["package"], "3225").tolist() == [True, False, True, False]
    assert contains(FRAME["first_reason"], "(").tolist() == [False] * 4  # no regex


def test_every_word_must_match_somewhere() -> None:
    assert filter_rows(FRAME, "frequency 3225", ["mpn", "package", "first_reason"])[
        "mpn"
    ].tolist() == ["TK16-A", "MB12-F"]
    assert filter_rows(FRAME, "tk16 budget", ["mpn", "package", "first_reason"])[
        "mpn"
    ].tolist() == ["TK16-B"]
    assert len(filter_rows(FRAME, "", ["mpn"])) == 4
    assert len(filter_rows(FRAME, "nothing-like-this", ["mpn", "package"])) == 0
