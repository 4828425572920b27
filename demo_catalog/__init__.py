"""Invented demo crystal catalogs, their seeded generator, and the demo briefs.

Everything here is invented: makers, part numbers and figures. The figures are plausible
estimates for demonstration only; for a real design confirm them with the crystal maker
and with a negative-resistance test on the real board.

This module imports nothing heavy; the generator lives in :mod:`demo_catalog.generate`.
"""

from __future__ import annotations

from pathlib import Path

__all__ = ["demo_catalog_paths"]

_HERE = Path(__file__).resolve().parent
CATALOG_FILES = ("crystals_export.csv", "crystals.yaml")


def demo_catalog_paths() -> list[Path]:
    """The bundled demo catalog files (spreadsheet-style CSV, then our own YAML)."""
    return [_HERE / name for name in CATALOG_FILES]
