"""``python -m bench [--quick] [--sizes 100000,1000000]``: picker's speed against baselines.

Every figure comes from a fresh interpreter (``bench.probe``) so peak RSS belongs to one
measurement. Ratios are measured in the same run. The synthetic catalogs are written under
``bench/_data/`` (git-ignored) by the demo generator and reused while the generator's output
for that size and seed is unchanged (same file name).
"""

from __future__ import annotations

import argparse
import json
import os
import shutil
import subprocess
import sys
import tempfile
import time
from collections.abc import Sequence
from pathlib import Path

from bench.data import catalog_files
from bench.report import Row, format_table, ratio_row, target_row

PYTHON = sys.executable


def generated_catalog(rows: int) -> Path:
    """``catalog_csv(rows)`` run in a child process, so this parent stays small (a forked
    child's ``ru_maxrss`` starts at the parent's size)."""
    code = f"from bench.data import catalog_csv; print(catalog_csv({int(rows)}))"
    done = subprocess.run(
        [PYTHON, "-c", code], capture_output=True, text=True, check=False, env=_env()
    )
    if done.returncode != 0:
        tail = (done.stderr.strip().splitlines() or ["no output"])[-1]
        raise SystemExit(f"python -m bench: generating {rows:,} rows failed: {tail}")
    return Path(done.stdout.strip().splitlines()[-1])


def run_probe(name: str, csv: Path, cache: Path, **options: int) -> dict[str, float | str]:
    """Run one ``bench.probe`` measurement in a fresh interpreter; its JSON figures."""
    command = [PYTHON, "-m", "bench.probe", name, "--csv", str(csv), "--cache", str(cache)]
    for key, value in options.items():
        command += [f"--{key}", str(value)]
    done = subprocess.run(command, capture_output=True, text=True, check=False, env=_env())
    try:
        return json.loads(done.stdout.strip().splitlines()[-1])
    except (IndexError, json.JSONDecodeError):
        tail = (done.stderr.strip().splitlines() or ["no output"])[-1]
        return {"error": f"probe {name} failed: {tail}"}


def _env(**extra: str) -> dict[str, str]:
    env = dict(os.environ)
    env.pop("PICKER_NO_CACHE", None)
    env["PYTHONPATH"] = str(Path(__file__).resolve().parent.parent)
    env.update(extra)
    return env


def wall_time(
    command: Sequence[str],
    *,
    repeats: int,
    env: dict[str, str] | None = None,
    before: object = None,
) -> float:
    """Best wall time of a whole command (interpreter start included) [s]."""
    best = float("inf")
    for _ in range(repeats):
        if callable(before):
            before()
        start = time.perf_counter()
        subprocess.run(command, capture_output=True, check=False, env=env or _env())
        best = min(best, time.perf_counter() - start)
    return best


def picker_command() -> list[str]:
    """The installed ``picker`` console script, else the same entry point through Python."""
    script = Path(PYTHON).parent / "picker"
    if script.exists():
        return [str(script)]
    return [PYTHON, "-c", "import sys; from picker.cli import main; sys.exit(main())"]


def cli_figures(csv: Path, *, repeats: int) -> dict[str, float]:
    """``picker rank`` cold (empty cache) and warm, and the pandas yardsticks."""
    cache = Path(tempfile.mkdtemp(prefix="picker-bench-cli-"))
    picker = [
        *picker_command(),
        "rank",
        "--catalog",
        str(csv),
        "--top",
        "10",
        "--format",
        "json",
    ]
    env = _env(PICKER_CACHE_DIR=str(cache))
    try:
        cold = wall_time(
            picker,
            repeats=max(1, repeats // 2),
            env=env,
            before=lambda: shutil.rmtree(cache, ignore_errors=True),
        )
        subprocess.run(picker, capture_output=True, check=False, env=env)  # fill the cache
        warm = wall_time(picker, repeats=repeats, env=env)
        status = subprocess.run(picker, capture_output=True, text=True, check=False, env=env)
    finally:
        shutil.rmtree(cache, ignore_errors=True)
    files = [str(f) for f in catalog_files(csv)]
    read_csv = wall_time(
        [PYTHON, "-c", f"import pandas; [pandas.read_csv(f) for f in {files!r}]"],
        repeats=repeats,
    )
    import_pandas = wall_time([PYTHON, "-c", "import pandas"], repeats=repeats)
    figures = {
        "cold_s": cold,
        "warm_s": warm,
        "read_csv_s": read_csv,
        "import_pandas_s": import_pandas,
        "exit_code": float(status.returncode),
    }
    return figures


def _sizes(text: str) -> list[int]:
    try:
        sizes = [int(part.replace("_", "")) for part in text.split(",") if part.strip()]
    except ValueError:
        raise argparse.ArgumentTypeError(
            f"expected sizes such as 100000,1000000, got {text!r}"
        ) from None
    if not sizes or min(sizes) < 10:
        raise argparse.ArgumentTypeError("sizes must be 10 rows or more")
    return sizes


def measure(sizes: Sequence[int], *, repeats: int, sample: int, quick: bool) -> list[Row]:
    """Run every measurement; the table rows with targets and ratios."""
    small, large = min(sizes), max(sizes)
    rows: list[Row] = []
    cache = Path(tempfile.mkdtemp(prefix="picker-bench-cache-"))
    say = (lambda text: None) if quick else (lambda text: print(text, file=sys.stderr, flush=True))
    try:
        csvs = {}
        for size in sizes:
            say(f"· generating {size:,} rows")
            csvs[size] = generated_catalog(size)
        for size in sizes:
            csv = csvs[size]
            say(f"· {size:,} rows: hash, load")
            hashed = run_probe("hash", csv, cache, repeats=3)
            loaded = run_probe("load", csv, cache, repeats=3)
            label = f"{size:,}"
            rows.append(
                target_row(
                    f"hash catalog file ({label} rows)", hashed, "hash_s", note=_mb_per_s(hashed)
                )
            )
            rows.append(
                target_row(
                    f"load, cold ({label} rows)",
                    loaded,
                    "cold_s",
                    limit=3.0 if size <= 100_000 else None,
                    note=f"again in-process, caches warm: {_s(loaded.get('parse_only_s'))}",
                )
            )
            rows.append(
                target_row(
                    f"load, cached ({label} rows)",
                    loaded,
                    "cached_s",
                    limit=0.3 if size <= 100_000 else None,
                )
            )
            say(f"· {size:,} rows: rank, baselines")
            ranked = run_probe("rank", csv, cache, repeats=repeats)
            loop = run_probe("loop", csv, cache, repeats=3, sample=min(sample, size))
            duck = run_probe("duckdb", csv, cache, repeats=repeats)
            limit = 0.015 if size <= 100_000 else 0.100 if size <= 1_000_000 else None
            rows.append(
                target_row(
                    f"re-rank after gm change ({label} rows)",
                    ranked,
                    "rank_s",
                    limit=limit,
                    note="staged: session kept, amplifier stage redone",
                )
            )
            rows.append(
                target_row(
                    f"  one-shot rank_parts ({label} rows)",
                    ranked,
                    "rank_one_shot_s",
                    note="nothing kept between calls",
                )
            )
            timed = loop.get("loop_rows_timed")
            rows.append(
                target_row(
                    f"  per-row Python loop ({label}, scaled)",
                    loop,
                    "loop_s",
                    note=f"timed {int(timed):,} rows, scaled up; frequency filter first"
                    if isinstance(timed, (int, float))
                    else "",
                )
            )
            rows.append(
                ratio_row(
                    f"  picker vs loop ({label})", loop, "loop_s", ranked, "rank_s", at_least=100.0
                )
            )
            rows.append(
                target_row(
                    f"  DuckDB same SQL ({label} rows)",
                    duck,
                    "duckdb_s",
                    note="same frequency filter, formulas and order",
                )
            )
            rows.append(
                ratio_row(
                    f"  picker vs DuckDB ({label})",
                    duck,
                    "duckdb_s",
                    ranked,
                    "rank_s",
                    at_least=1.0,
                )
            )
            rows.append(target_row(f"  peak RSS, rank ({label})", ranked, "peak_rss_mb", unit="MB"))
        check = run_probe("crosscheck", csvs[small], cache)
        rows.append(
            target_row(
                "baselines agree: loop vs DuckDB margin",
                check,
                "loop_vs_duckdb_max_rel",
                unit="rel",
            )
        )
        rows.append(
            target_row(
                "baselines vs picker margin (median)",
                check,
                "loop_vs_picker_median_rel",
                unit="rel",
                note=f"{int(check.get('compared_rows', 0) or 0)} rows, catalog C0",
            )
        )
        say(f"· {large:,} rows: alternates, fuzzy lookup")
        alternates = run_probe("alternates", csvs[large], cache, repeats=3)
        fuzzy = run_probe("fuzzy", csvs[large], cache, repeats=3)
        rows.append(
            target_row(
                f"alternates for one part ({large:,})",
                alternates,
                "alternates_s",
                limit=0.100 if large >= 1_000_000 else None,
                note="fresh: nothing kept",
            )
        )
        rows.append(
            target_row(
                f"  alternates, session kept ({large:,})",
                alternates,
                "alternates_session_s",
                limit=0.100 if large >= 1_000_000 else None,
                note="the shortlist's RankSession reused",
            )
        )
        rows.append(target_row(f"fuzzy part-number lookup ({large:,})", fuzzy, "fuzzy_s"))
        say(f"· TUI at {small:,} and {large:,} rows")
        tui_small = run_probe("tui", csvs[small], cache, repeats=repeats)
        rows.append(
            target_row(
                f"TUI keystroke → shortlist ({small:,})",
                tui_small,
                "keystroke_s",
                limit=0.050 if small <= 100_000 else None,
            )
        )
        rows.append(
            target_row(
                "  of which after the debounce",
                tui_small,
                "keystroke_work_s",
                note="re-rank start → repainted list (median)",
            )
        )
        rows.append(target_row(f"  peak RSS, TUI ({small:,})", tui_small, "peak_rss_mb", unit="MB"))
        tui_large = tui_small if large == small else run_probe("tui", csvs[large], cache, repeats=3)
        if large != small:
            rows.append(
                target_row(f"TUI keystroke → shortlist ({large:,})", tui_large, "keystroke_s")
            )
        rows.append(
            target_row(
                f"peak RSS, TUI ({large:,})",
                tui_large,
                "peak_rss_mb",
                unit="MB",
                limit=600.0 if large >= 1_000_000 else None,
            )
        )
        say(f"· picker rank command at {large:,} rows")
        cli = cli_figures(csvs[large], repeats=3)
        cli_note = "" if cli["exit_code"] in (0.0, 1.0) else f"exit code {int(cli['exit_code'])}!"
        rows.append(target_row(f"`picker rank` cold ({large:,})", cli, "cold_s", note=cli_note))
        rows.append(target_row("  pandas.read_csv, same file", cli, "read_csv_s"))
        rows.append(ratio_row("  cold / read_csv", cli, "cold_s", cli, "read_csv_s", at_most=3.0))
        rows.append(target_row(f"`picker rank` warm ({large:,})", cli, "warm_s"))
        rows.append(target_row("  python -c 'import pandas'", cli, "import_pandas_s"))
        rows.append(
            ratio_row("  warm / import pandas", cli, "warm_s", cli, "import_pandas_s", at_most=3.0)
        )
    finally:
        shutil.rmtree(cache, ignore_errors=True)
    return rows


def _s(value: object) -> str:
    return f"{value:.3g} s" if isinstance(value, (int, float)) else "n/a"


def _mb_per_s(figures: dict[str, float | str]) -> str:
    speed, size = figures.get("hash_mb_per_s"), figures.get("file_mb")
    if isinstance(speed, (int, float)) and isinstance(size, (int, float)):
        return f"{size:.0f} MB at {speed:.0f} MB/s"
    return ""


def main(argv: Sequence[str] | None = None) -> int:
    parser = argparse.ArgumentParser(prog="python -m bench", description=__doc__.splitlines()[0])
    parser.add_argument(
        "--quick",
        action="store_true",
        help="small sizes and few repeats: a smoke check, not figures",
    )
    parser.add_argument(
        "--sizes",
        type=_sizes,
        default=None,
        metavar="N,N",
        help="catalog sizes in rows (default 100000,1000000)",
    )
    parser.add_argument("--repeats", type=int, default=None, help="timed runs per figure")
    parser.add_argument(
        "--sample",
        type=int,
        default=20_000,
        help="rows timed in the per-row loop baseline (then scaled up)",
    )
    args = parser.parse_args(argv)
    sizes = args.sizes or ([200, 2000] if args.quick else [100_000, 1_000_000])
    repeats = args.repeats or (2 if args.quick else 7)
    rows = measure(sizes, repeats=repeats, sample=args.sample, quick=args.quick)
    print(
        format_table(
            rows,
            title=f"picker benchmark, sizes {', '.join(f'{s:,}' for s in sizes)}"
            + (" (quick: smoke check only)" if args.quick else ""),
        )
    )
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
