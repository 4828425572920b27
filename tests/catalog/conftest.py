"""Helpers for catalog tests: write invented catalogs as exact bytes."""

from __future__ import annotations

from collections.abc import Callable
from pathlib import Path

import pytest

#: Headers of the team's demo CSV export (INTERFACES.md list), in one line.
DEMO_HEADER = (
    "Part Number,Manufacturer,Freq,Load Cap (pF),Tolerance (ppm),Stability (ppm),"
    "Operating Temperature,ESR max (Ω),Package,C0 (pF),C1 (fF)"
)
#: One invented, physically consistent AT-cut part (16 MHz, Q about 2.5e4, C0/C1 = 600).
GOOD_ROW = "ZX-16A,Zyxo,16 MHz,12,±10,±20,-40 to 85 °C,80,3225,3,5"


@pytest.fixture
def write(tmp_path: Path) -> Callable[[str, bytes | str], Path]:
    """Write ``content`` (text is UTF-8 encoded) to ``tmp_path/name`` and return the path."""

    def _write(name: str, content: bytes | str) -> Path:
        path = tmp_path / name
        data = content.encode("utf-8") if isinstance(content, str) else content
        path.write_bytes(data)
        return path

    return _write
