"""The generator: deterministic, vectorised, and `--check` guards the committed files."""

from __future__ import annotations

import os
import shutil
import subprocess
import sys
import time
from pathlib import Path

import numpy as np
import pandas as pd
import pytest
import yaml

from demo_catalog import demo_catalog_paths
from demo_catalog.fields import FIELDS
from demo_catalog.generate import (
    DEFAULT_SEED,
    demo_files,
    generate_part_table,
    generate_parts,
    main,
    reference_part_numbers,
)
from demo_catalog.writers import render_csv, render_yaml

REPO = Path(__file__).resolve().parents[2]


def test_same_seed_gives_identical_parts_and_bytes() -> None:
    first, second = generate_parts(3000), generate_parts(3000)
    pd.testing.assert_frame_equal(first, second)
    assert render_csv(first) == render_csv(second)
    assert render_yaml(first) == render_yaml(second)
    assert demo_files() == demo_files()


def test_other_seed_gives_other_parts() -> None:
    a = generate_part_table(500, DEFAULT_SEED)
    b = generate_part_table(500, DEFAULT_SEED + 1)
    assert not np.array_equal(a["esr_ohm"].to_numpy(), b["esr_ohm"].to_numpy())


def test_generate_parts_shape_and_vocabulary() -> None:
    parts = generate_parts(2000, 7)
    assert list(parts.columns) == list(FIELDS)
    assert len(parts) == 2000
    assert parts["mpn"].is_unique
    assert parts["mpn"].notna().all()
    # Text with units, as a catalog writes it.
    assert parts["frequency"].str.fullmatch(r"\d+(\.\d+)? (kHz|MHz)").all()
    assert parts["esr"].str.fullmatch(r"\d+(\.\d+)? k?ohm").all()
    load = parts["load_capacitance"]
    assert (load.str.fullmatch(r"\d+(\.\d+)? pF") | (load == "series")).all()
    assert parts["temp_min"].str.fullmatch(r"-?\d+ degC").all()
    assert parts["drive_level"].str.fullmatch(r"\d+(\.\d+)? uW").all()


def test_empty_and_bad_counts() -> None:
    empty = generate_parts(0)
    assert len(empty) == 0
    assert list(empty.columns) == list(FIELDS)
    with pytest.raises(ValueError, match="n must be"):
        generate_parts(-1)


def test_large_catalogs_are_generated_vectorised() -> None:
    # 200k rows well inside 30 s; a per-part Python loop over draws would blow this.
    start = time.perf_counter()
    parts = generate_parts(200_000)
    elapsed = time.perf_counter() - start
    assert len(parts) == 200_000 and parts["mpn"].is_unique
    assert elapsed < 30.0, f"200k rows took {elapsed:.1f} s"


def test_check_passes_for_committed_files() -> None:
    assert main(["--check"]) == 0


@pytest.mark.parametrize("hash_seed", ["1", "12345"])
def test_check_passes_in_a_fresh_interpreter(hash_seed: str) -> None:
    # A new process with a different string-hash seed must write the same bytes.
    env = {**os.environ, "PYTHONHASHSEED": hash_seed}
    done = subprocess.run(
        [sys.executable, "-m", "demo_catalog.generate", "--check"],
        cwd=REPO,
        env=env,
        capture_output=True,
        text=True,
        timeout=300,
    )
    assert done.returncode == 0, done.stderr


def test_check_fails_on_a_changed_or_missing_file(tmp_path: Path) -> None:
    for path in demo_catalog_paths():
        shutil.copy(path, tmp_path / path.name)
    assert main(["--check", "--dir", str(tmp_path)]) == 0
    csv_copy = tmp_path / "crystals_export.csv"
    csv_copy.write_bytes(csv_copy.read_bytes().replace(b"Tarnwell", b"Tarnwel", 1))
    assert main(["--check", "--dir", str(tmp_path)]) == 1
    (tmp_path / "crystals.yaml").unlink()
    assert main(["--check", "--dir", str(tmp_path)]) == 1
    # Rewriting restores exactly the committed bytes.
    assert main(["--dir", str(tmp_path)]) == 0
    for path in demo_catalog_paths():
        assert (tmp_path / path.name).read_bytes() == path.read_bytes()
    assert main(["--check", "--dir", str(tmp_path)]) == 0
    assert sorted(p.name for p in tmp_path.iterdir()) == sorted(
        p.name for p in demo_catalog_paths()
    ), "a temporary file was left behind"


def test_rows_option_writes_a_synthetic_catalog(tmp_path: Path) -> None:
    assert main(["--rows", "40", "--out", str(tmp_path / "big.csv")]) == 0
    lines = (tmp_path / "big.csv").read_text(encoding="utf-8").splitlines()
    assert len(lines) == 41 and lines[0].startswith("Part Number,")
    assert main(["--rows", "40", "--out", str(tmp_path / "big.yaml")]) == 0
    data = yaml.safe_load((tmp_path / "big.yaml").read_text(encoding="utf-8"))
    assert len(data["parts"]) == 40


def test_bad_usage_is_one_line_not_a_traceback(
    tmp_path: Path, capsys: pytest.CaptureFixture[str]
) -> None:
    missing = tmp_path / "no" / "such" / "dir" / "x.csv"
    assert main(["--rows", "5", "--out", str(missing)]) == 2
    err = capsys.readouterr().err
    assert err.startswith("error:") and "Traceback" not in err and err.count("\n") == 1


def test_reference_parts_are_named() -> None:
    refs = reference_part_numbers()
    for role in ("ble_radio_reference", "ethernet_reference", "rtc_reference", "can_reference"):
        assert role in refs
    # A variant of a reference shares its part-number stem.
    assert refs["ble_series"].startswith(refs["ble_radio_reference"])
