"""Parsed-catalog cache: reuse the part table of catalog files that have not changed.

Parsing a large catalog (header mapping, unit parsing, validation) costs seconds; reading a
columnar copy of the result costs a fraction of that. ``load_catalogs_cached`` has the
signature and result of ``catalog.reader.load_catalogs`` plus ``cache_dir``.

How an entry is found and trusted
---------------------------------
* Key: BLAKE2b over, in order, every catalog file's path and bytes (a directory contributes
  its file listing and each catalog file in it), the mapping file's bytes, ``CACHE_VERSION``,
  the installed program version and a fingerprint of the ``catalog`` package's own source, so
  an edited reader never serves tables parsed by the old one. Any byte change is a new key.
* Entry: one folder ``catalog-<key>/`` holding ``parts.parquet`` (pyarrow; categoricals are
  kept, their categories and every column's dtype restored from the metadata) and
  ``meta.json`` (problems, file reports, dtypes, the parquet file's size and BLAKE2b digest).
* Written into a temporary folder inside the cache and renamed into place (``os.replace``),
  so a reader sees a whole entry or none.
* On read the header, key, version, size, digest, row count and dtypes are all checked; an
  entry that fails any check is deleted and the catalog is parsed again. No cache failure
  (unwritable folder, full disk, corrupt entry) ever reaches the caller: the catalog is
  simply loaded without the cache.
* Bounded: at most ``MAX_ENTRIES`` entries and ``PICKER_CACHE_MAX_MB`` (default 1024) MB;
  the least recently used entries go first.

Where
-----
``cache_dir`` argument, else ``PICKER_CACHE_DIR``, else ``platformdirs.user_cache_dir("picker")``.
``PICKER_NO_CACHE=1`` turns the cache off. The cache never writes into a folder that holds one
of the catalogs; the user's catalog files are only ever read.
"""

from __future__ import annotations

import contextlib
import dataclasses
import hashlib
import importlib
import json
import os
import shutil
import stat
import tempfile
import time
from collections.abc import Callable, Iterator, Sequence
from dataclasses import dataclass
from importlib import metadata
from pathlib import Path
from typing import TYPE_CHECKING, Any

import pandas as pd
import pyarrow as pa
import pyarrow.parquet as pq

from catalog.rawtable import DEFAULT_LIMITS

if TYPE_CHECKING:
    from catalog.reader import LoadResult

#: Bump when the entry layout or the meaning of the part table changes.
CACHE_VERSION = 1
#: Written into every ``meta.json``; anything else in that slot is a foreign file.
MAGIC = "picker-parsed-catalog"
#: Entries kept at most (each catalog set the user works with is one entry).
MAX_ENTRIES = 8
#: Default size bound of the whole cache, megabytes; ``PICKER_CACHE_MAX_MB`` overrides.
DEFAULT_MAX_MB = 1024
#: Suffixes a directory argument contributes (the reader reads these; we hash them).
CATALOG_SUFFIXES = frozenset({".csv", ".yaml", ".yml"})
#: Temporary folders older than this (seconds) are left-overs of a killed process.
STALE_TEMP_S = 3600.0

_ENTRY_PREFIX = "catalog-"
_TEMP_PREFIX = ".tmp-"
_PARTS = "parts.parquet"
_META = "meta.json"
_CHUNK = 1 << 20


class CacheEntryError(ValueError):
    """A cache entry failed verification (it is then deleted and rebuilt)."""


@dataclass(frozen=True)
class SourceStat:
    """Size and modification time of one input file, to detect edits during a parse."""

    path: str
    size: int
    mtime_ns: int


@dataclass(frozen=True)
class CatalogKey:
    """The cache key of one set of inputs and the files it was computed from."""

    digest: str
    sources: tuple[SourceStat, ...]


# --------------------------------------------------------------------------- locations


def cache_disabled() -> bool:
    """True when ``PICKER_NO_CACHE`` is set to anything but ``""``, ``0``, ``false`` or ``no``."""
    value = os.environ.get("PICKER_NO_CACHE", "").strip().lower()
    return value not in ("", "0", "false", "no")


def default_cache_dir() -> Path:
    """The cache folder: ``PICKER_CACHE_DIR`` when set, else the user cache directory."""
    override = os.environ.get("PICKER_CACHE_DIR", "").strip()
    if override:
        return Path(override).expanduser()
    import platformdirs

    return Path(platformdirs.user_cache_dir("picker"))


def max_cache_bytes() -> int:
    """Size bound of the cache in bytes (``PICKER_CACHE_MAX_MB``, default 1024 MB)."""
    raw = os.environ.get("PICKER_CACHE_MAX_MB", "").strip()
    try:
        megabytes = float(raw) if raw else float(DEFAULT_MAX_MB)
    except ValueError:
        megabytes = float(DEFAULT_MAX_MB)
    return max(0, int(megabytes * 1024 * 1024))


# --------------------------------------------------------------------------- the key


def file_digest(path: str | Path) -> str:
    """BLAKE2b (512-bit) hex digest of a file's bytes, read in 1 MiB chunks.

    ``hashlib.file_digest`` reads into one reused buffer and releases the GIL while hashing;
    about 1 GB/s on one core (measured by ``python -m bench``).
    """
    with open(path, "rb") as handle:
        return hashlib.file_digest(handle, hashlib.blake2b).hexdigest()


def _expand(paths: Sequence[str | Path]) -> Iterator[tuple[str, Path]]:
    """Yield (label, file) for every file the key must cover, in reading order.

    A directory yields a listing label (so an added or removed file changes the key) and then
    each of its catalog files, sorted by name, as the reader reads them.
    """
    for given in paths:
        path = Path(given)
        if path.is_dir():
            names = sorted(child.name for child in path.iterdir())
            yield "dir:" + os.path.abspath(path) + "\0" + "\0".join(names), Path()
            for name in names:
                child = path / name
                if child.suffix.lower() in CATALOG_SUFFIXES and child.is_file():
                    yield "file:" + str(child) + "\0" + os.path.abspath(child), child
        else:
            yield "file:" + str(given) + "\0" + os.path.abspath(path), path


def _code_fingerprint() -> str:
    """Digest of this package's source files, so a changed parser never reuses old tables."""
    hasher = hashlib.blake2b(digest_size=16)
    for source in sorted(Path(__file__).resolve().parent.glob("*.py")):
        hasher.update(source.name.encode())
        hasher.update(source.read_bytes())
    return hasher.hexdigest()


def _program_version() -> str:
    try:
        return metadata.version("picker")
    except metadata.PackageNotFoundError:
        return "unknown"


def _update(hasher: Any, text: str) -> None:
    data = text.encode("utf-8", "surrogateescape")
    hasher.update(len(data).to_bytes(8, "little"))
    hasher.update(data)


def catalog_key(paths: Sequence[str | Path], *, mapping: str | Path | None = None) -> CatalogKey:
    """Cache key of these catalogs and mapping file under this program version.

    Raises OSError when an input cannot be read (the caller then leaves the error to the
    reader, which reports it properly).
    """
    hasher = hashlib.blake2b(digest_size=32, person=b"picker-catalog")
    _update(hasher, f"{MAGIC}/{CACHE_VERSION}/{_program_version()}/{_code_fingerprint()}")
    sources: list[SourceStat] = []
    inputs = list(_expand(paths))
    if mapping is not None:
        inputs.append(("mapping:" + os.path.abspath(mapping), Path(mapping)))
    for label, path in inputs:
        _update(hasher, label)
        if label.startswith("dir:"):
            continue
        before = os.stat(path)
        if not stat.S_ISREG(before.st_mode) or before.st_size > DEFAULT_LIMITS.max_file_bytes:
            # A pipe or device would be consumed (or never end) and an oversized file read
            # whole just to hash it: skip the cache and let the reader refuse or read it.
            raise OSError(f"{path}: not a regular catalog file within the size limit")
        _update(hasher, file_digest(path))
        sources.append(SourceStat(str(path), before.st_size, before.st_mtime_ns))
    return CatalogKey(hasher.hexdigest(), tuple(sources))


def _unchanged(key: CatalogKey) -> bool:
    """True when no input changed size or modification time since the key was computed."""
    try:
        for source in key.sources:
            now = os.stat(source.path)
            if (now.st_size, now.st_mtime_ns) != (source.size, source.mtime_ns):
                return False
    except OSError:
        return False
    return True


# --------------------------------------------------------------------------- frame <-> disk


def _column_spec(series: pd.Series) -> dict[str, Any]:
    dtype = series.dtype
    spec: dict[str, Any] = {"name": str(series.name), "dtype": str(dtype)}
    if isinstance(dtype, pd.CategoricalDtype):
        spec["categories"] = dtype.categories.tolist()
        spec["categories_dtype"] = str(dtype.categories.dtype)
        spec["ordered"] = bool(dtype.ordered)
    return spec


def _restore_column(series: pd.Series, spec: dict[str, Any]) -> pd.Series:
    """Give a column read back from parquet exactly the dtype it was written with.

    Returns ``series`` itself when it already has that dtype (the common case: no copy).
    """
    if spec["dtype"] == "category":
        categories = pd.Index(spec["categories"], dtype=spec["categories_dtype"])
        wanted = pd.CategoricalDtype(categories, ordered=spec["ordered"])
        if _column_spec(series) == spec:
            return series
        return series.astype(wanted)
    if str(series.dtype) != spec["dtype"]:
        return series.astype(spec["dtype"])
    return series


def _frame_signature(frame: pd.DataFrame) -> dict[str, Any]:
    return {
        "columns": [_column_spec(frame[name]) for name in frame.columns],
        "index_dtype": str(frame.index.dtype),
        "index_name": frame.index.name,
        "rows": len(frame),
        # JSON round trip: tuples become lists on disk, so compare the stored form.
        "attrs": json.loads(json.dumps(frame.attrs)),
    }


def _check_frame(frame: pd.DataFrame, signature: dict[str, Any]) -> pd.DataFrame:
    """Restore dtypes and attrs, then insist the frame matches what was written."""
    specs = signature["columns"]
    if [str(name) for name in frame.columns] != [spec["name"] for spec in specs]:
        raise CacheEntryError("column names differ")
    if len(frame) != signature["rows"]:
        raise CacheEntryError("row count differs")
    restored = frame
    for name, spec in zip(frame.columns, specs, strict=True):
        column = frame[name]
        fixed = _restore_column(column, spec)
        if fixed is not column:
            restored[name] = fixed  # only the columns parquet changed are replaced
    if str(restored.index.dtype) != signature["index_dtype"]:
        restored.index = restored.index.astype(signature["index_dtype"])
    restored.index.name = signature["index_name"]
    restored.attrs = dict(signature["attrs"])
    if _frame_signature(restored) != signature:
        raise CacheEntryError("column types could not be restored")
    return restored


def _encode_value(value: Any) -> Any:
    """JSON form of a LoadResult field: tuples of dataclasses keep their class name."""
    if isinstance(value, tuple) and all(dataclasses.is_dataclass(item) for item in value):
        return {
            "kind": "dataclasses",
            "items": [
                {
                    "class": f"{type(item).__module__}:{type(item).__qualname__}",
                    "fields": dataclasses.asdict(item),
                }
                for item in value
            ],
        }
    return {"kind": "plain", "value": value}


def _decode_value(encoded: dict[str, Any]) -> Any:
    if encoded["kind"] == "plain":
        return encoded["value"]
    items = []
    for item in encoded["items"]:
        module_name, _, qualname = item["class"].partition(":")
        # Only our own package's classes are rebuilt from a cache file.
        if module_name.split(".")[0] != "catalog":
            raise CacheEntryError(f"foreign class {item['class']!r}")
        cls: Any = importlib.import_module(module_name)
        for part in qualname.split("."):
            cls = getattr(cls, part)
        items.append(cls(**item["fields"]))
    return tuple(items)


def _digest_bytes(data: bytes) -> str:
    return hashlib.blake2b(data).hexdigest()


def write_entry(root: Path, key: str, result: LoadResult) -> Path:
    """Store ``result`` under ``key`` in ``root`` atomically; returns the entry folder.

    Raises OSError, TypeError/ValueError (a field that JSON or Arrow cannot hold), or
    pyarrow errors; the caller treats any of them as "not cached".
    """
    root.mkdir(parents=True, exist_ok=True)
    frame: pd.DataFrame = result.parts
    table = pa.Table.from_pandas(frame, preserve_index=None)
    others = {
        field.name: _encode_value(getattr(result, field.name))
        for field in dataclasses.fields(result)
        if field.name != "parts"
    }
    temp = Path(tempfile.mkdtemp(prefix=_TEMP_PREFIX, dir=root))
    try:
        sink = pa.BufferOutputStream()
        # lz4 read back about 1.5-2x faster than zstd level 1 on a 1M-row table, for a
        # file ~15% larger (60 MB against 52 MB; measured, see /work/notes/perf_findings.md).
        pq.write_table(table, sink, compression="lz4")
        data = sink.getvalue().to_pybytes()
        (temp / _PARTS).write_bytes(data)
        meta = {
            "magic": MAGIC,
            "version": CACHE_VERSION,
            "key": key,
            "parts_size": len(data),
            "parts_blake2b": _digest_bytes(data),
            "frame": _frame_signature(frame),
            "result_type": f"{type(result).__module__}:{type(result).__qualname__}",
            "fields": others,
            "written": time.time(),
        }
        (temp / _META).write_text(json.dumps(meta, ensure_ascii=False), encoding="utf-8")
        final = root / (_ENTRY_PREFIX + key)
        try:
            os.replace(temp, final)
        except OSError:
            # Another process stored the same key first; its entry is as good as ours.
            if not (final / _META).is_file():
                raise
            shutil.rmtree(temp, ignore_errors=True)
        return final
    except BaseException:
        shutil.rmtree(temp, ignore_errors=True)
        raise


def read_entry(root: Path, key: str) -> LoadResult | None:
    """The stored result for ``key``, or None when there is none.

    Raises CacheEntryError (or OSError/ValueError/pyarrow errors) when an entry exists but
    cannot be trusted.
    """
    entry = root / (_ENTRY_PREFIX + key)
    meta_path = entry / _META
    if not meta_path.exists():
        return None
    meta = json.loads(meta_path.read_text(encoding="utf-8"))
    if not isinstance(meta, dict) or meta.get("magic") != MAGIC:
        raise CacheEntryError("not a picker cache entry")
    if meta.get("version") != CACHE_VERSION or meta.get("key") != key:
        raise CacheEntryError("entry from another version or key")
    data = (entry / _PARTS).read_bytes()
    if len(data) != meta["parts_size"] or _digest_bytes(data) != meta["parts_blake2b"]:
        raise CacheEntryError("part table checksum mismatch")
    table = pq.read_table(pa.BufferReader(data))
    del data
    # split_blocks + self_destruct: one block per column and Arrow buffers freed as they
    # convert, so the peak holds about one copy of the table instead of three.
    frame = table.to_pandas(split_blocks=True, self_destruct=True)
    del table
    frame = _check_frame(frame, meta["frame"])
    fields = {name: _decode_value(value) for name, value in meta["fields"].items()}
    from catalog.reader import LoadResult as ResultType

    if meta["result_type"] != f"{ResultType.__module__}:{ResultType.__qualname__}":
        raise CacheEntryError("entry holds another result type")
    result = ResultType(parts=frame, **fields)
    with contextlib.suppress(OSError):
        os.utime(meta_path)  # marks the entry as recently used for eviction
    return result


def discard_entry(root: Path, key: str) -> None:
    """Delete an entry (best effort)."""
    shutil.rmtree(root / (_ENTRY_PREFIX + key), ignore_errors=True)


def _entry_size(entry: Path) -> int:
    return sum(child.stat().st_size for child in entry.iterdir() if child.is_file())


def evict(root: Path, *, keep: str | None = None, max_bytes: int | None = None) -> list[Path]:
    """Remove least recently used entries beyond ``MAX_ENTRIES`` or ``max_bytes``.

    The entry named by ``keep`` (just written) stays even when alone it exceeds the bound.
    Left-over temporary folders older than ``STALE_TEMP_S`` are removed too. Returns the
    entries removed.
    """
    limit = max_cache_bytes() if max_bytes is None else max_bytes
    now = time.time()
    entries: list[tuple[float, int, Path]] = []
    for child in root.iterdir():
        try:
            if child.name.startswith(_TEMP_PREFIX):
                if now - child.stat().st_mtime > STALE_TEMP_S:
                    shutil.rmtree(child, ignore_errors=True)
                continue
            if not child.name.startswith(_ENTRY_PREFIX) or not child.is_dir():
                continue
            meta = child / _META
            used = meta.stat().st_mtime if meta.exists() else child.stat().st_mtime
            entries.append((used, _entry_size(child), child))
        except OSError:
            continue
    entries.sort(key=lambda item: (item[2].name != _ENTRY_PREFIX + str(keep), -item[0]))
    removed: list[Path] = []
    total = 0
    for position, (_, size, entry) in enumerate(entries):
        total += size
        if position > 0 and (position >= MAX_ENTRIES or total > limit):
            shutil.rmtree(entry, ignore_errors=True)
            removed.append(entry)
            total -= size
    return removed


def clear_cache(cache_dir: str | Path | None = None) -> int:
    """Delete every entry in the cache folder; returns how many were removed."""
    root = Path(cache_dir) if cache_dir is not None else default_cache_dir()
    if not root.is_dir():
        return 0
    count = 0
    for child in root.iterdir():
        if child.name.startswith((_ENTRY_PREFIX, _TEMP_PREFIX)) and child.is_dir():
            shutil.rmtree(child, ignore_errors=True)
            count += 1
    return count


# --------------------------------------------------------------------------- the entry point


def _beside_a_catalog(root: Path, paths: Sequence[str | Path]) -> bool:
    """True when ``root`` is a folder that holds one of the catalogs (never write there)."""
    try:
        resolved = root.resolve()
        for given in paths:
            path = Path(given).resolve()
            folder = path if path.is_dir() else path.parent
            if resolved == folder:
                return True
    except OSError:
        return True
    return False


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
    progress : optional callback receiving the fraction done, 0..1 (1.0 at once on a hit).
    cache_dir : cache folder; default ``PICKER_CACHE_DIR`` or the user cache directory.

    Returns
    -------
    The same ``LoadResult`` the reader returns (equal frame, same problems and file reports).
    Raises only what ``load_catalogs`` raises (``CatalogError``); cache trouble of any kind
    falls back to an uncached load.
    """
    from catalog.reader import load_catalogs

    if cache_disabled():
        return load_catalogs(paths, mapping=mapping, progress=progress)
    root = Path(cache_dir).expanduser() if cache_dir is not None else default_cache_dir()
    try:
        key = catalog_key(paths, mapping=mapping)
    except OSError:
        # A missing or unreadable input: let the reader say so in its own words.
        return load_catalogs(paths, mapping=mapping, progress=progress)
    try:
        cached = read_entry(root, key.digest)
    except Exception:
        # Corrupt, truncated, foreign or stale: never trusted, rebuilt below.
        discard_entry(root, key.digest)
        cached = None
    if cached is not None:
        if progress is not None:
            progress(1.0)
        return cached
    result = load_catalogs(paths, mapping=mapping, progress=progress)
    if _unchanged(key) and not _beside_a_catalog(root, paths):
        try:
            write_entry(root, key.digest, result)
            evict(root, keep=key.digest)
        except Exception:
            pass  # an unwritable or full cache only costs speed
    return result
