"""Problem records and the whole-input error."""

from __future__ import annotations

import dataclasses

import pytest

from catalog.problems import CatalogError, Problem


def test_one_line_matches_contract_example() -> None:
    # The exact wording promised in INTERFACES.md.
    problem = Problem(
        "parts.csv",
        14,
        "esr",
        "16 MHz",
        "expected a resistance such as '80 ohm', got '16 MHz'",
        "error",
    )
    assert problem.one_line() == (
        "parts.csv:14: esr: expected a resistance such as '80 ohm', got '16 MHz'"
    )


def test_one_line_without_line_or_field_and_warning_tag() -> None:
    problem = Problem("parts.csv", None, None, None, "no rows", "warning")
    assert problem.one_line() == "parts.csv: warning: no rows"


def test_problem_is_frozen_and_json_shaped() -> None:
    problem = Problem("a.yaml", 3, "cl", "x", "bad", "error")
    with pytest.raises(dataclasses.FrozenInstanceError):
        problem.line = 4  # type: ignore[misc]
    assert set(problem.to_json_dict()) == {"path", "line", "field", "raw", "message", "severity"}


def test_catalog_error_is_a_value_error() -> None:
    assert issubclass(CatalogError, ValueError)
