"""Seeded generator of the invented demo catalogs, reusable for large synthetic catalogs.

Every maker, part number and figure it writes is invented. The figures are plausible
estimates for demonstration only: for a real design, confirm with the crystal maker and
with a negative-resistance test on the real board; safety-critical products follow their
own qualification rules and local regulations.

Command line::

    python -m demo_catalog.generate            # rewrite the committed demo catalogs
    python -m demo_catalog.generate --check    # exit 1 if they differ from what it would write
    python -m demo_catalog.generate --rows 1000000 --out big.csv   # a large synthetic catalog

Public functions: :func:`generate_parts` (text, our field vocabulary),
:func:`generate_part_table` (numeric, SI), :func:`write_csv`, :func:`write_yaml`,
:func:`demo_parts`, :func:`reference_part_numbers`.
"""

from __future__ import annotations

import argparse
import sys
from collections.abc import Sequence
from pathlib import Path

import numpy as np
import pandas as pd

from demo_catalog.curated import CURATED_SPECS, spec_rows
from demo_catalog.draw import draw_part_table
from demo_catalog.fields import to_field_text
from demo_catalog.makers import MAKER_NAMES, assign_part_numbers
from demo_catalog.writers import render_csv, render_yaml, write_csv, write_text_atomic, write_yaml

__all__ = [
    "DEFAULT_SEED",
    "demo_files",
    "demo_part_tables",
    "demo_parts",
    "generate_part_table",
    "generate_parts",
    "main",
    "reference_part_numbers",
    "write_csv",
    "write_yaml",
]

DEFAULT_SEED = 60063
PACKAGE_DIR = Path(__file__).resolve().parent
EXPORT_CSV = "crystals_export.csv"
OWN_YAML = "crystals.yaml"
# Which invented makers each committed catalog holds (disjoint), and how many random rows.
DEMO_FILES: dict[str, tuple[tuple[str, ...], int, int]] = {
    EXPORT_CSV: (("Quellbrook", "Tarnwell", "Vessado"), 900, DEFAULT_SEED + 1),
    OWN_YAML: (("Oridane", "Kelvaro"), 620, DEFAULT_SEED + 2),
}
_INTERNAL = ["family", "role", "twin_of", "variant", "serial"]


def generate_part_table(
    n: int, seed: int = DEFAULT_SEED, *, makers: Sequence[str] = MAKER_NAMES
) -> pd.DataFrame:
    """``n`` invented parts as a numeric part table (SI float columns of INTERFACES.md).

    Parameters
    ----------
    n : int
        Number of parts [-].
    seed : int
        Seed of the ``numpy.random.Generator`` (PCG64); the same seed gives the same
        table.
    makers : sequence of str
        Invented makers to spread the parts over (names from
        :data:`demo_catalog.makers.MAKER_NAMES`).

    Returns
    -------
    pandas.DataFrame
        ``mpn``, ``maker``, ``freq_hz`` [Hz], ``load_capacitance_f`` [F] (NaN when
        ``series_calibrated``), ``tolerance_ppm``, ``stability_ppm`` [ppm], ``temp_min_c``,
        ``temp_max_c`` [°C], ``esr_ohm`` [Ω], ``package``, ``mode``, ``cut``,
        ``beta_ppm_per_c2`` [ppm/°C²], ``turnover_c`` [°C], ``c0_f``, ``c1_f`` [F],
        ``l1_h`` [H] (always NaN), ``drive_level_w`` [W], ``aging_ppm`` [ppm],
        ``length_mm``, ``width_mm``, ``height_mm`` [mm], ``price``, ``stock``,
        ``lifecycle``, ``qualification``, ``pinout``, ``msl``.
    """
    rng = np.random.Generator(np.random.PCG64(seed))
    table = assign_part_numbers(draw_part_table(rng, n, makers))
    return table.drop(columns=[c for c in _INTERNAL if c in table.columns])


def generate_parts(
    n: int, seed: int = DEFAULT_SEED, *, makers: Sequence[str] = MAKER_NAMES
) -> pd.DataFrame:
    """``n`` invented parts as catalog text in our field vocabulary (DESIGN.md §3).

    Values carry units as a catalog writes them ("16 MHz", "8 pF", "40 ohm", "100 uW",
    "-40 degC", "±"-free ppm figures such as "20 ppm"); NaN means the catalog leaves the
    field blank. Vectorised: a million rows take a few seconds. Pass the result to
    :func:`write_csv` or :func:`write_yaml`.
    """
    return to_field_text(generate_part_table(n, seed, makers=makers))


def _numbered_curated() -> pd.DataFrame:
    """The hand-placed parts with serials: running per maker; a variant reuses its base's."""
    curated = spec_rows(CURATED_SPECS)
    serial = np.zeros(len(curated), dtype=np.int64)
    counters: dict[str, int] = {}
    for position, (maker, twin_of) in enumerate(
        zip(curated["maker"].tolist(), curated["twin_of"].tolist(), strict=True)
    ):
        if twin_of >= 0:
            serial[position] = serial[twin_of]
        else:
            counters[maker] = counters.get(maker, 0) + 1
            serial[position] = counters[maker]
    return curated.assign(serial=serial)


def demo_part_tables() -> dict[str, pd.DataFrame]:
    """Numeric part tables of the committed demo catalogs, keyed by file name.

    Each holds the hand-placed parts of its makers (fits, near-misses and alternates for
    the demo circuits, see :mod:`demo_catalog.curated`) followed by seeded random parts.
    Column ``role`` names the hand-placed parts ("" for random ones).
    """
    curated = _numbered_curated()
    tables: dict[str, pd.DataFrame] = {}
    for name, (makers, fill, seed) in DEMO_FILES.items():
        mine = curated.loc[curated["maker"].isin(makers)]
        rng = np.random.Generator(np.random.PCG64(seed))
        random_rows = draw_part_table(rng, fill, makers)
        # Random parts number on after the hand-placed ones of the same maker.
        start = mine.groupby("maker")["serial"].max().to_dict()
        order = random_rows.groupby("maker").cumcount().to_numpy() + 1
        offset = random_rows["maker"].astype(object).map(start).fillna(0).to_numpy(dtype=np.int64)
        random_rows = random_rows.assign(serial=order + offset, role="", twin_of=-1, variant="")
        table = pd.concat([mine, random_rows], ignore_index=True)
        table = assign_part_numbers(table)
        tables[name] = table.drop(columns=["family", "twin_of", "variant", "serial"])
    return tables


def demo_parts() -> dict[str, pd.DataFrame]:
    """Text frames (our field vocabulary) of the committed demo catalogs, by file name."""
    return {name: to_field_text(table) for name, table in demo_part_tables().items()}


def reference_part_numbers() -> dict[str, str]:
    """Role of each hand-placed demo part -> its part number (e.g. "ble_radio_reference")."""
    out: dict[str, str] = {}
    for table in demo_part_tables().values():
        placed = table.loc[table["role"] != ""]
        out.update(zip(placed["role"].tolist(), placed["mpn"].tolist(), strict=True))
    return out


def demo_files() -> dict[str, str]:
    """File name -> exact text of each committed demo catalog."""
    text = demo_parts()
    return {
        EXPORT_CSV: render_csv(text[EXPORT_CSV], "spreadsheet"),
        OWN_YAML: render_yaml(text[OWN_YAML]),
    }


def _differing(directory: Path) -> list[str]:
    stale = []
    for name, content in demo_files().items():
        path = directory / name
        try:
            current = path.read_bytes()
        except OSError:
            stale.append(f"{path}: missing")
            continue
        if current != content.encode("utf-8"):
            stale.append(f"{path}: differs from what the generator writes")
    return stale


def _parser() -> argparse.ArgumentParser:
    parser = argparse.ArgumentParser(
        prog="python -m demo_catalog.generate",
        description="Write the invented demo crystal catalogs (or a large synthetic one).",
        epilog=(
            "All makers, part numbers and figures are invented. Figures are estimates: "
            "confirm with the crystal maker and a negative-resistance test on the real "
            "board; safety-critical products follow their own qualification rules."
        ),
    )
    parser.add_argument(
        "--check",
        action="store_true",
        help="exit 1 if the committed files differ from what would be written",
    )
    parser.add_argument(
        "--dir",
        type=Path,
        default=PACKAGE_DIR,
        help="folder of the demo catalogs (default: this package)",
    )
    parser.add_argument(
        "--rows", type=int, default=None, help="instead: write this many random parts to --out"
    )
    parser.add_argument("--seed", type=int, default=DEFAULT_SEED, help="seed for --rows")
    parser.add_argument(
        "--out",
        type=Path,
        default=None,
        help="file for --rows (.csv spreadsheet style, .yaml/.yml YAML)",
    )
    parser.add_argument(
        "--style",
        choices=("spreadsheet", "plain"),
        default="spreadsheet",
        help="CSV style for --rows",
    )
    return parser


def main(argv: Sequence[str] | None = None) -> int:
    """Entry point; returns the exit code (0 done, 1 --check found stale files, 2 bad use)."""
    parser = _parser()
    args = parser.parse_args(argv)
    try:
        if args.rows is not None:
            if args.out is None or args.rows < 0:
                parser.error("--rows needs a count >= 0 and --out FILE")
            parts = generate_parts(args.rows, args.seed)
            if args.out.suffix.lower() in (".yaml", ".yml"):
                write_yaml(parts, args.out)
            else:
                write_csv(parts, args.out, args.style)
            print(f"wrote {args.rows} parts to {args.out}")
            return 0
        if args.check:
            stale = _differing(args.dir)
            for line in stale:
                print(line, file=sys.stderr)
            if stale:
                print("run `python -m demo_catalog.generate` to rewrite them", file=sys.stderr)
                return 1
            print("demo catalogs are up to date")
            return 0
        for name, content in demo_files().items():
            write_text_atomic(args.dir / name, content)
            print(f"wrote {args.dir / name}")
        return 0
    except (OSError, ValueError) as error:
        print(f"error: {error}", file=sys.stderr)
        return 2


if __name__ == "__main__":
    raise SystemExit(main())
