"""Fixtures for the terminal-UI tests: a frozen core and a small fixed real catalog."""

from __future__ import annotations

from pathlib import Path

import pytest

from picker.tui.app import PickerApp
from tests.tui.frozen_core import FrozenCore

# data/parts.csv holds invented parts (no real brand or part number), values chosen by hand
# so that raising gm from 20 to 40 mA/V pushes the low-ESR part past gm_opt and the order of
# the first two swaps (Vittoz, "Low-Power Crystal and MEMS Oscillators", 2010, ch. 3: |Rneg|
# falls again above gm_opt). data/brief.yaml is the circuit they are ranked against.
DATA = Path(__file__).parent / "data"


@pytest.fixture
def catalog_files(tmp_path: Path) -> tuple[Path, Path]:
    """A small fixed catalog and brief on disk (not the growing demo data)."""
    catalog = tmp_path / "parts.csv"
    catalog.write_bytes((DATA / "parts.csv").read_bytes())
    brief = tmp_path / "brief.yaml"
    brief.write_bytes((DATA / "brief.yaml").read_bytes())
    return catalog, brief


@pytest.fixture
def real_app(
    catalog_files: tuple[Path, Path], tmp_path: Path, monkeypatch: pytest.MonkeyPatch
) -> PickerApp:
    from picker.tui.core import PickerCore

    monkeypatch.setenv("PICKER_NO_CACHE", "1")
    catalog, brief = catalog_files
    return PickerApp(PickerCore(), [catalog], brief)


@pytest.fixture
def frozen_app(tmp_path: Path) -> PickerApp:
    return PickerApp(FrozenCore(), [tmp_path / "frozen.csv"], tmp_path / "no-brief.yaml")
