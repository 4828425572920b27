"""Tests for catalog/cache.py: the parsed-catalog cache.

The reference for every hit is the uncached reader itself (catalog.reader.load_catalogs on the
same files): a cached load must be indistinguishable from it. The hash is checked against the
BLAKE2b test vector published in RFC 7693, Appendix A.
"""

from __future__ import annotations

import hashlib
import json
import os
from pathlib import Path

import pandas as pd
import pytest

from catalog import cache

reader = pytest.importorskip("catalog.reader")

HEADER = (
    "Part Number,Manufacturer,Freq,Load Cap (pF),Tolerance (ppm),Stability (ppm),"
    "Op Temp Min (°C),Op Temp Max (°C),ESR max (Ω),Package,C0 (pF)\n"
)
ROWS = (
    "DEMO-A1,Acme Demo,16 MHz,12,10,20,-40,85,80,3225,3\n"
    "DEMO-A2,Acme Demo,16 MHz,8,20,30,-40,105,60,2520,2.5\n"
    "DEMO-A3,Bravo Demo,32.768 kHz,12.5,20,,-40,85,70000,3215,1.2\n"
    # A bad ESR: the reader reports it and keeps the good rows; the cache must keep the
    # problem list too.
    "DEMO-A4,Bravo Demo,25 MHz,10,10,20,-40,85,lots,2016,2\n"
)


@pytest.fixture
def catalog_file(tmp_path: Path) -> Path:
    folder = tmp_path / "user_catalogs"
    folder.mkdir()
    path = folder / "parts.csv"
    path.write_text(HEADER + ROWS, encoding="utf-8")
    return path


@pytest.fixture
def cache_dir(tmp_path: Path) -> Path:
    return tmp_path / "cache"


@pytest.fixture
def reader_calls(monkeypatch: pytest.MonkeyPatch) -> list[object]:
    """Count real parses: a hit must not call the reader at all."""
    calls: list[object] = []
    real = reader.load_catalogs

    def counting(paths, **kwargs):  # type: ignore[no-untyped-def]
        calls.append(paths)
        return real(paths, **kwargs)

    monkeypatch.setattr(reader, "load_catalogs", counting)
    monkeypatch.delenv("PICKER_NO_CACHE", raising=False)
    monkeypatch.delenv("PICKER_CACHE_DIR", raising=False)
    return calls


def entries(root: Path) -> list[Path]:
    return sorted(root.glob("catalog-*")) if root.is_dir() else []


def assert_same(left: object, right: object) -> None:
    pd.testing.assert_frame_equal(left.parts, right.parts)  # type: ignore[attr-defined]
    assert left.problems == right.problems  # type: ignore[attr-defined]
    assert left.files == right.files  # type: ignore[attr-defined]


def test_hit_equals_uncached_load(catalog_file: Path, cache_dir: Path, reader_calls: list) -> None:
    reference = reader.load_catalogs([catalog_file])  # oracle: the reader, no cache
    reader_calls.clear()
    first = cache.load_catalogs_cached([catalog_file], cache_dir=cache_dir)
    second = cache.load_catalogs_cached([catalog_file], cache_dir=cache_dir)
    assert len(reader_calls) == 1, "the second load must come from the cache"
    assert len(entries(cache_dir)) == 1
    assert_same(first, reference)
    assert_same(second, reference)
    # The demo rows hold a bad value, so the problem list is not trivially empty.
    assert len(second.problems) >= 1
    assert second.parts["package"].dtype == reference.parts["package"].dtype
    assert isinstance(second.parts["package"].dtype, pd.CategoricalDtype)


def test_progress_reaches_one_on_a_hit(
    catalog_file: Path, cache_dir: Path, reader_calls: list
) -> None:
    cache.load_catalogs_cached([catalog_file], cache_dir=cache_dir)
    seen: list[float] = []
    cache.load_catalogs_cached([catalog_file], cache_dir=cache_dir, progress=seen.append)
    assert seen and seen[-1] == 1.0


@pytest.mark.parametrize(
    "edit",
    [
        lambda text: text.replace(
            "DEMO-A1,Acme Demo,16 MHz,12,10,20,-40,85,80",
            "DEMO-A1,Acme Demo,16 MHz,12,10,20,-40,85,81",
        ),
        lambda text: text + "\n",  # parses to the same rows, but the bytes differ
        lambda text: text.replace("\n", "\r\n"),
    ],
    ids=["one-digit", "trailing-newline", "line-endings"],
)
def test_any_byte_change_invalidates(
    edit,
    catalog_file: Path,
    cache_dir: Path,
    reader_calls: list,  # type: ignore[no-untyped-def]
) -> None:
    cache.load_catalogs_cached([catalog_file], cache_dir=cache_dir)
    catalog_file.write_bytes(edit(catalog_file.read_text(encoding="utf-8")).encode("utf-8"))
    result = cache.load_catalogs_cached([catalog_file], cache_dir=cache_dir)
    assert len(reader_calls) == 2
    assert_same(result, reader.load_catalogs([catalog_file]))


def test_order_of_files_is_part_of_the_key(tmp_path: Path, catalog_file: Path) -> None:
    other = catalog_file.with_name("more.csv")
    other.write_text(HEADER + "DEMO-B1,Acme Demo,8 MHz,18,30,50,-20,70,100,5032,4\n", "utf-8")
    forward = cache.catalog_key([catalog_file, other]).digest
    backward = cache.catalog_key([other, catalog_file]).digest
    assert forward != backward
    assert forward == cache.catalog_key([catalog_file, other]).digest


def test_mapping_bytes_are_part_of_the_key(tmp_path: Path, catalog_file: Path) -> None:
    mapping = tmp_path / "mapping.yaml"
    mapping.write_text("Freq: frequency\n", encoding="utf-8")
    before = cache.catalog_key([catalog_file], mapping=mapping).digest
    mapping.write_text("Freq: frequency \n", encoding="utf-8")
    assert cache.catalog_key([catalog_file], mapping=mapping).digest != before
    assert cache.catalog_key([catalog_file]).digest != before


def test_directory_listing_is_part_of_the_key(catalog_file: Path) -> None:
    folder = catalog_file.parent
    before = cache.catalog_key([folder]).digest
    (folder / "extra.csv").write_text(HEADER, encoding="utf-8")
    assert cache.catalog_key([folder]).digest != before


@pytest.mark.parametrize(
    "damage",
    [
        lambda entry: (entry / "parts.parquet").write_bytes(
            (entry / "parts.parquet").read_bytes()[:100]
        ),
        lambda entry: (entry / "parts.parquet").write_bytes(b"\0garbage" * 64),
        lambda entry: (entry / "parts.parquet").unlink(),
        lambda entry: (entry / "meta.json").write_text("{not json", encoding="utf-8"),
        lambda entry: (entry / "meta.json").write_bytes((entry / "meta.json").read_bytes()[:40]),
        lambda entry: (entry / "meta.json").write_text(
            json.dumps({"magic": "someone-else", "version": 1}), encoding="utf-8"
        ),
        # Same size, one byte flipped in the middle: only the checksum can catch this.
        lambda entry: flip_middle_byte(entry / "parts.parquet"),
    ],
    ids=["truncated", "garbage", "missing-table", "bad-json", "truncated-json", "foreign", "flip"],
)
def test_damaged_entry_is_rebuilt(
    damage,
    catalog_file: Path,
    cache_dir: Path,
    reader_calls: list,  # type: ignore[no-untyped-def]
) -> None:
    reference = cache.load_catalogs_cached([catalog_file], cache_dir=cache_dir)
    (entry,) = entries(cache_dir)
    damage(entry)
    rebuilt = cache.load_catalogs_cached([catalog_file], cache_dir=cache_dir)
    assert len(reader_calls) == 2, "a damaged entry must never be trusted"
    assert_same(rebuilt, reference)
    again = cache.load_catalogs_cached([catalog_file], cache_dir=cache_dir)
    assert len(reader_calls) == 2, "the rebuilt entry serves the next load"
    assert_same(again, reference)


def flip_middle_byte(path: Path) -> None:
    data = bytearray(path.read_bytes())
    data[len(data) // 2] ^= 0xFF
    path.write_bytes(bytes(data))


def test_version_change_invalidates(
    catalog_file: Path, cache_dir: Path, reader_calls: list, monkeypatch: pytest.MonkeyPatch
) -> None:
    cache.load_catalogs_cached([catalog_file], cache_dir=cache_dir)
    monkeypatch.setattr(cache, "CACHE_VERSION", cache.CACHE_VERSION + 1)
    cache.load_catalogs_cached([catalog_file], cache_dir=cache_dir)
    assert len(reader_calls) == 2


def test_entry_claiming_another_version_is_discarded(
    catalog_file: Path, cache_dir: Path, reader_calls: list
) -> None:
    cache.load_catalogs_cached([catalog_file], cache_dir=cache_dir)
    (entry,) = entries(cache_dir)
    meta = json.loads((entry / "meta.json").read_text(encoding="utf-8"))
    meta["version"] = cache.CACHE_VERSION + 99
    (entry / "meta.json").write_text(json.dumps(meta), encoding="utf-8")
    cache.load_catalogs_cached([catalog_file], cache_dir=cache_dir)
    assert len(reader_calls) == 2


def test_disabled_by_environment(
    catalog_file: Path, cache_dir: Path, reader_calls: list, monkeypatch: pytest.MonkeyPatch
) -> None:
    monkeypatch.setenv("PICKER_NO_CACHE", "1")
    cache.load_catalogs_cached([catalog_file], cache_dir=cache_dir)
    cache.load_catalogs_cached([catalog_file], cache_dir=cache_dir)
    assert len(reader_calls) == 2
    assert not cache_dir.exists()


def test_environment_chooses_the_folder(
    catalog_file: Path, cache_dir: Path, reader_calls: list, monkeypatch: pytest.MonkeyPatch
) -> None:
    monkeypatch.setenv("PICKER_CACHE_DIR", str(cache_dir))
    cache.load_catalogs_cached([catalog_file])
    assert len(entries(cache_dir)) == 1


def test_catalog_is_never_modified(catalog_file: Path, cache_dir: Path, reader_calls: list) -> None:
    before = catalog_file.read_bytes()
    stat = catalog_file.stat()
    listing = sorted(os.listdir(catalog_file.parent))
    cache.load_catalogs_cached([catalog_file], cache_dir=cache_dir)
    cache.load_catalogs_cached([catalog_file], cache_dir=cache_dir)
    assert catalog_file.read_bytes() == before
    assert catalog_file.stat().st_mtime_ns == stat.st_mtime_ns
    assert sorted(os.listdir(catalog_file.parent)) == listing


def test_never_writes_into_the_catalog_folder(catalog_file: Path, reader_calls: list) -> None:
    listing = sorted(os.listdir(catalog_file.parent))
    cache.load_catalogs_cached([catalog_file], cache_dir=catalog_file.parent)
    assert sorted(os.listdir(catalog_file.parent)) == listing


def test_unwritable_cache_still_loads(
    tmp_path: Path, catalog_file: Path, reader_calls: list
) -> None:
    # A regular file where the cache folder should be: mkdir fails even for root, unlike chmod.
    blocker = tmp_path / "not_a_folder"
    blocker.write_text("", encoding="utf-8")
    result = cache.load_catalogs_cached([catalog_file], cache_dir=blocker / "cache")
    assert_same(result, reader.load_catalogs([catalog_file]))


def test_missing_catalog_raises_the_readers_error(tmp_path: Path, cache_dir: Path) -> None:
    from catalog.problems import CatalogError

    with pytest.raises(CatalogError):
        cache.load_catalogs_cached([tmp_path / "absent.csv"], cache_dir=cache_dir)


def test_least_recently_used_entries_are_evicted(
    tmp_path: Path, cache_dir: Path, reader_calls: list, monkeypatch: pytest.MonkeyPatch
) -> None:
    monkeypatch.setattr(cache, "MAX_ENTRIES", 2)
    files = []
    for number in range(3):
        path = tmp_path / f"set{number}.csv"
        path.write_text(HEADER + ROWS.replace("DEMO-A1", f"DEMO-Z{number}"), encoding="utf-8")
        files.append(path)
    for number, path in enumerate(files):
        cache.load_catalogs_cached([path], cache_dir=cache_dir)
        meta = cache_dir / ("catalog-" + cache.catalog_key([path]).digest) / "meta.json"
        os.utime(meta, (1_000_000 + number, 1_000_000 + number))  # a strict use order
    kept = {entry.name for entry in entries(cache_dir)}
    expected = {"catalog-" + cache.catalog_key([path]).digest for path in files[1:]}
    assert kept == expected


def test_size_bound_keeps_only_the_newest(
    tmp_path: Path, cache_dir: Path, reader_calls: list, monkeypatch: pytest.MonkeyPatch
) -> None:
    monkeypatch.setenv("PICKER_CACHE_MAX_MB", "0.000001")  # about one byte
    for number in range(2):
        path = tmp_path / f"set{number}.csv"
        path.write_text(HEADER + ROWS.replace("DEMO-A1", f"DEMO-Y{number}"), encoding="utf-8")
        cache.load_catalogs_cached([path], cache_dir=cache_dir)
    (kept,) = entries(cache_dir)
    assert kept.name == "catalog-" + cache.catalog_key([path]).digest


def test_file_digest_matches_rfc7693_vector(tmp_path: Path) -> None:
    # RFC 7693, Appendix A: BLAKE2b-512("abc").
    path = tmp_path / "abc.bin"
    path.write_bytes(b"abc")
    assert cache.file_digest(path) == (
        "ba80a53f981c4d0d6a2797b69f12f6e94c212f14685ac4b74b12bb6fdbffa2d1"
        "7d87c5392aab792dc252d5de4533cc9518d38aa8dbf1925ab92386edd4009923"
    )
    # Chunked reading must agree with hashing the whole buffer at once (3 MiB + 1: 4 chunks).
    big = tmp_path / "big.bin"
    data = bytes(range(256)) * (3 * 4096) + b"x"
    big.write_bytes(data)
    assert cache.file_digest(big) == hashlib.blake2b(data).hexdigest()


def test_frame_types_survive_round_trip(tmp_path: Path) -> None:
    """Dtypes that parquet alone would change (empty categoricals, object text) come back."""
    index = pd.Index([10, 20])
    frame = pd.DataFrame(
        {
            "mpn": pd.Series(["X1", "X2"], dtype=object, index=index),
            "package": pd.Series(
                pd.Categorical(["3225", "3225"], categories=["2016", "3225", "5032"]),
                index=index,
            ),
            "freq_hz": pd.Series([16e6, 32e6], index=index),
            "source_line": pd.Series([2, 3], dtype="int64", index=index),
        }
    )
    assert frame["mpn"].notna().all()  # the sample itself must hold text, not NaN
    for sample in (frame, frame.iloc[:0]):
        result = reader.LoadResult(parts=sample, problems=(), files=())
        cache.write_entry(tmp_path, "k", result)
        back = cache.read_entry(tmp_path, "k")
        assert back is not None
        pd.testing.assert_frame_equal(back.parts, sample)
        cache.discard_entry(tmp_path, "k")
