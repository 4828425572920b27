"""The examples in the physics docstrings run and give the values they show."""

from __future__ import annotations

import doctest
import importlib

import pytest

MODULES = [
    "aging",
    "budget",
    "capacitors",
    "crystal",
    "drive",
    "estimates",
    "pierce",
    "startup",
    "temperature",
]


@pytest.mark.parametrize("name", MODULES)
def test_docstring_examples(name: str) -> None:
    module = importlib.import_module(f"picker.physics.{name}")
    result = doctest.testmod(module, optionflags=doctest.NORMALIZE_WHITESPACE, verbose=False)
    assert result.failed == 0


def test_examples_exist() -> None:
    # the examples are checks too: losing them silently would be a regression
    total = 0
    for name in MODULES:
        module = importlib.import_module(f"picker.physics.{name}")
        total += doctest.testmod(module, optionflags=doctest.NORMALIZE_WHITESPACE).attempted
    assert total >= 12
