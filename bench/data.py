"""Synthetic catalogs for the benchmark, written under ``bench/_data/`` (git-ignored)."""

from __future__ import annotations

import hashlib
import os
import shutil
from pathlib import Path

DATA = Path(__file__).resolve().parent / "_data"
SEED = 1234


def generator_fingerprint() -> str:
    """Short digest of the demo generator's source: a changed generator means new files."""
    import demo_catalog

    hasher = hashlib.blake2b(digest_size=4)
    for source in sorted(Path(demo_catalog.__file__).parent.glob("*.py")):
        hasher.update(source.read_bytes())
    return hasher.hexdigest()


#: Rows per generated file: the reader refuses files above its size limit (50 MB; a
#: 250k-row demo file is about 34 MB), so a large catalog is a folder of several files.
ROWS_PER_FILE = 250_000


def catalog_csv(rows: int, *, seed: int = SEED, folder: Path = DATA) -> Path:
    """The synthetic catalog of ``rows`` parts, generated once and reused while unchanged.

    One CSV file up to ``ROWS_PER_FILE`` rows; above that a folder of CSV files (the reader
    reads a folder's files in name order, so the parts and their order are the same).
    """
    from demo_catalog.generate import generate_parts, write_csv

    folder.mkdir(parents=True, exist_ok=True)
    stem = f"parts_{rows}_seed{seed}_"
    name = f"{stem}{generator_fingerprint()}"
    path = folder / (name + ".csv") if rows <= ROWS_PER_FILE else folder / name
    if path.exists():
        return path
    for old in folder.glob(f"{stem}*"):
        shutil.rmtree(old) if old.is_dir() else old.unlink()
    text = generate_parts(rows, seed)
    if rows <= ROWS_PER_FILE:
        write_csv(text, path)  # write_csv is atomic
        return path
    temp = folder / (name + ".partial")
    shutil.rmtree(temp, ignore_errors=True)
    temp.mkdir()
    for number, start in enumerate(range(0, rows, ROWS_PER_FILE)):
        write_csv(text.iloc[start : start + ROWS_PER_FILE], temp / f"part_{number:02d}.csv")
    os.replace(temp, path)
    return path


def catalog_files(path: Path) -> list[Path]:
    """The CSV files of a generated catalog (one file, or a folder's files in order)."""
    return sorted(path.glob("*.csv")) if path.is_dir() else [path]
