"""Each bundled demo brief gives a non-empty shortlist on the bundled demo catalog.

A demo that shows "nothing fits" on first run teaches nothing; this guards the pairing
of the demo briefs (picker/brief.py's package data) with the demo catalog.
"""

from __future__ import annotations

from pathlib import Path

import pandas as pd
import pytest

from catalog.reader import load_catalogs
from picker.brief import demo_brief_paths, load_brief
from picker.cli import demo_catalog_paths
from picker.rank import rank_parts


@pytest.fixture(scope="module")
def demo_parts() -> pd.DataFrame:
    paths = demo_catalog_paths()
    assert paths, "the demo catalog is missing"
    return load_catalogs(paths).parts


@pytest.mark.parametrize("path", demo_brief_paths(), ids=lambda path: path.name)
def test_demo_brief_has_a_shortlist(path: Path, demo_parts: pd.DataFrame) -> None:
    brief = load_brief(path)
    ranking = rank_parts(demo_parts, brief)
    assert ranking.shortlist_size > 0, f"{path.name}: nothing fits"
    # Status "fit" for at least one part, not only "marginal" ones.
    assert ranking.counts.get("fit", 0) > 0, f"{path.name}: only marginal parts"
