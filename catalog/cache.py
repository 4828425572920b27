"""Parsed-catalog cache (pass-through for now; the on-disk cache follows).

``load_catalogs_cached`` has the signature and result type of ``catalog.reader.load_catalogs``
so the command line and the terminal UI can call it today.
"""

from __future__ import annotations

from collections.abc import Callable, Sequence
from pathlib import Path
from typing import TYPE_CHECKING

if TYPE_CHECKING:
    from catalog.reader import LoadResult


def load_catalogs_cached(
    paths: Sequence[str | Path],
    *,
    mapping: str | Path | None = None,
    progress: Callable[[float], None] | None = None,
    cache_dir: str | Path | None = None,
) -> LoadResult:
    """Load catalogs like ``catalog.reader.load_catalogs``, reusing a parsed copy when valid.

    Parameters
    ----------
    paths : catalog files or directories, read in the order given.
    mapping : optional header-mapping file.
    progress : optional callback receiving the fraction done, 0..1.
    cache_dir : cache folder; default ``PICKER_CACHE_DIR`` or the user cache directory.
    """
    from catalog.reader import load_catalogs

    del cache_dir  # the on-disk cache is not written yet
    return load_catalogs(paths, mapping=mapping, progress=progress)
