"""Fixtures for the terminal-UI tests: a frozen core and a small fixed real catalog."""

from __future__ import annotations

from pathlib import Path

import pytest

from picker.tui.app import PickerApp
from tests.tui.frozen_core import FrozenCore

# Invented parts (no real brand or part number); values chosen by hand so that raising gm
# from 20 to 40 mA/V pushes the low-ESR part past gm_opt and the order of the first two
# swaps (Vittoz, "Low-Power Crystal and MEMS Oscillators", 2010, ch. 3: |Rneg| falls above
# gm_opt).
CATALOG_CSV = """\
mpn,maker,frequency,load_capacitance,tolerance,stability,temp_min,temp_max,esr,package,c0,c1,drive_level,aging,price,stock,lifecycle
TK16-A,Tarnwick,16 MHz,8 pF,10 ppm,10 ppm,-40,85,40 ohm,3225,1.5 pF,4 fF,200 uW,2 ppm,0.30,5000,active
TK16-B,Tarnwick,16 MHz,12 pF,10 ppm,10 ppm,-40,85,80 ohm,3225,2.0 pF,5 fF,200 uW,2 ppm,0.20,5000,active
TK16-C,Tarnwick,16 MHz,18 pF,10 ppm,15 ppm,-40,85,150 ohm,3225,3.0 pF,6 fF,200 uW,2 ppm,0.15,5000,active
MB16-D,Morrow Bay,16 MHz,10 pF,20 ppm,20 ppm,-40,85,60 ohm,2520,1.8 pF,4 fF,150 uW,3 ppm,0.25,5000,active
MB16-E,Morrow Bay,16 MHz,12 pF,10 ppm,10 ppm,-20,70,50 ohm,3225,2.0 pF,5 fF,200 uW,2 ppm,0.22,5000,active
MB12-F,Morrow Bay,12 MHz,12 pF,10 ppm,10 ppm,-40,85,60 ohm,3225,2.0 pF,5 fF,200 uW,2 ppm,0.22,5000,active
"""

BRIEF_YAML = """\
name: Test sensor node clock
frequency: 16 MHz
budget: 60 ppm
temperature: [-40 degC, 85 degC]
lifetime: 10 year
amplifier:
  gm: 20 mA/V
  pin_capacitance: 1.5 pF
  swing: 1.0 V
board:
  stray_capacitance: 2 pF
  stray_uncertainty: 0.5 pF
  cap_series: E12
  cap_tolerance: 5 %
limits:
  min_margin: 5
"""


@pytest.fixture
def catalog_files(tmp_path: Path) -> tuple[Path, Path]:
    """A small fixed catalog and brief on disk (not the growing demo data)."""
    catalog = tmp_path / "parts.csv"
    catalog.write_text(CATALOG_CSV, encoding="utf-8")
    brief = tmp_path / "brief.yaml"
    brief.write_text(BRIEF_YAML, encoding="utf-8")
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
