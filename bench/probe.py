"""One measurement per fresh interpreter, so each peak RSS belongs to that measurement alone.

``python -m bench.probe NAME --csv PATH --cache DIR [--sample N] [--repeats N]`` prints one
JSON object on stdout: the figures (seconds unless the name says otherwise) and
``peak_rss_mb`` from ``resource.getrusage(RUSAGE_SELF).ru_maxrss`` (kilobytes on Linux).
"""

from __future__ import annotations

import argparse
import asyncio
import json
import math
import resource
import sys
import time
import traceback
from collections.abc import Callable
from dataclasses import replace
from pathlib import Path
from typing import Any

Figures = dict[str, Any]


def best_of(function: Callable[[int], object], repeats: int) -> float:
    """Smallest wall time of ``function(attempt)`` over ``repeats`` calls [s]."""
    best = math.inf
    for attempt in range(repeats):
        start = time.perf_counter()
        function(attempt)
        best = min(best, time.perf_counter() - start)
    return best


def peak_rss_mb() -> float:
    """Peak resident set of this process [MB].

    ``getrusage(RUSAGE_SELF).ru_maxrss`` is, on Linux, at least the parent's RSS at the fork
    (measured: a child of an 800 MB parent reports 789 MB while its own high-water mark is
    11 MB), so the kernel's per-address-space ``VmHWM`` is used when /proc has it, and the
    parent (``python -m bench``) keeps itself small by generating data in a subprocess.
    """
    try:
        status = Path("/proc/self/status").read_text(encoding="ascii")
        return float(status.split("VmHWM:")[1].split()[0]) / 1024.0
    except (OSError, IndexError, ValueError):
        return resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024.0


def cache_has(args: argparse.Namespace) -> bool:
    """True when the parsed catalog is already cached (else the probe's RSS includes a parse,
    e.g. because the catalog package's source changed since the load probe ran)."""
    from catalog.cache import catalog_key

    return (Path(args.cache) / ("catalog-" + catalog_key([args.csv]).digest)).is_dir()


def _load(args: argparse.Namespace) -> Any:
    from catalog.cache import load_catalogs_cached

    return load_catalogs_cached([args.csv], cache_dir=args.cache)


def bench_brief_path() -> Path:
    """A bundled demo brief whose amplifier is a plain gm (the benchmark varies gm).

    The CAN-node brief (16 MHz) when present, else the first brief with a plain gm.
    """
    from picker.brief import demo_brief_paths, load_brief

    paths = sorted(demo_brief_paths(), key=lambda p: (p.stem != "can_node", p.name))
    for path in paths:
        if load_brief(path).amplifier.gm_s is not None:
            return path
    raise RuntimeError("no demo brief gives a plain amplifier gm")


def _brief() -> Any:
    from picker.brief import load_brief

    return load_brief(bench_brief_path())


def brief_with_gm(brief: Any, gm_s: float) -> Any:
    """The brief with another amplifier transconductance: a real change, nothing memoised."""
    return replace(brief, amplifier=replace(brief.amplifier, gm_s=gm_s))


def probe_hash(args: argparse.Namespace) -> Figures:
    from bench.data import catalog_files
    from catalog.cache import file_digest

    files = catalog_files(Path(args.csv))
    size = sum(f.stat().st_size for f in files)
    seconds = best_of(lambda _: [file_digest(f) for f in files], args.repeats)
    return {"hash_s": seconds, "file_mb": size / 1e6, "hash_mb_per_s": size / 1e6 / seconds}


def probe_load(args: argparse.Namespace) -> Figures:
    """Cold load (parse + cache write into an empty cache), then cached loads (best of)."""
    from catalog.cache import clear_cache, load_catalogs_cached
    from catalog.reader import load_catalogs

    clear_cache(args.cache)
    start = time.perf_counter()
    result = load_catalogs_cached([args.csv], cache_dir=args.cache)
    cold = time.perf_counter() - start
    rows = len(result.parts)
    del result
    cached = best_of(lambda _: load_catalogs_cached([args.csv], cache_dir=args.cache), args.repeats)
    start = time.perf_counter()
    load_catalogs([args.csv])
    parse_only = time.perf_counter() - start
    return {"cold_s": cold, "cached_s": cached, "parse_only_s": parse_only, "rows": rows}


def probe_rank(args: argparse.Namespace) -> Figures:
    """Re-rank after a gm change: staged (a RankSession kept across the edits, as an
    interactive caller holds one) and one-shot (``rank_parts``, nothing kept); both
    include the order of every part."""
    from picker.rank import rank_parts
    from picker.session import RankSession

    parts = _load(args).parts
    brief = _brief()
    gm = float(brief.amplifier.gm_s)
    session = RankSession(parts)
    _ = session.rank(brief).order  # first call: every stage built, imports warm; not timed

    def edited(attempt: int) -> Any:
        return brief_with_gm(brief, gm * (1.0 + 0.01 * (attempt + 1)))

    staged = best_of(lambda attempt: session.rank(edited(attempt)).order, args.repeats)
    one_shot = best_of(lambda attempt: rank_parts(parts, edited(attempt)).order, args.repeats)
    return {"rank_s": staged, "rank_one_shot_s": one_shot, "rows": len(parts)}


def probe_loop(args: argparse.Namespace) -> Figures:
    from bench.baselines import circuit_from_brief, time_loop_scaled

    parts = _load(args).parts
    seconds, timed = time_loop_scaled(
        parts, circuit_from_brief(_brief()), sample=args.sample, repeats=args.repeats
    )
    return {"loop_s": seconds, "loop_rows_timed": timed, "rows": len(parts)}


def probe_duckdb(args: argparse.Namespace) -> Figures:
    from bench.baselines import circuit_from_brief, duckdb_connection, rank_duckdb, with_gm

    parts = _load(args).parts
    circuit = circuit_from_brief(_brief())
    con = duckdb_connection(parts)
    rank_duckdb(con, circuit)  # warm-up
    seconds = best_of(
        lambda attempt: rank_duckdb(
            con, with_gm(circuit, circuit.gm_s * (1.0 + 0.01 * (attempt + 1)))
        ),
        args.repeats,
    )
    return {"duckdb_s": seconds, "rows": len(parts)}


def probe_crosscheck(args: argparse.Namespace) -> Figures:
    """How closely the loop baseline agrees with DuckDB and with picker on the margin."""
    import numpy as np

    from bench.baselines import circuit_from_brief, loop_matches_vector, rank_loop
    from picker.analysis import analyze_parts

    parts = _load(args).parts.iloc[:2000]
    brief = _brief()
    circuit = circuit_from_brief(brief)
    loop_vs_duckdb = loop_matches_vector(parts, circuit)
    ours = analyze_parts(parts, brief)
    mine = {row[2]: row[3] for row in rank_loop(parts.to_dict("records"), circuit)}
    theirs = dict(zip(ours["mpn"], ours["negative_resistance_margin"], strict=True))
    # Only rows without estimated C0 (the baselines fill gaps with one typical value).
    known = parts.loc[parts["c0_f"].notna(), "mpn"] if "c0_f" in parts else parts["mpn"]
    diffs = np.array(
        [abs(mine[m] - theirs[m]) / max(abs(theirs[m]), 1e-12) for m in known if m in mine]
    )
    diffs = diffs[np.isfinite(diffs)]
    return {
        "loop_vs_duckdb_max_rel": loop_vs_duckdb,
        "loop_vs_picker_median_rel": float(np.median(diffs)) if diffs.size else float("nan"),
        "compared_rows": int(diffs.size),
    }


def probe_alternates(args: argparse.Namespace) -> Figures:
    """Alternates for one part with the brief: fresh (nothing kept) and with the session
    the shortlist was ranked in (as an interactive caller holds one)."""
    from picker.alternates import find_alternates
    from picker.session import RankSession

    parts = _load(args).parts
    brief = _brief()
    mpns = parts["mpn"].to_numpy()
    find_alternates(parts, str(mpns[0]), brief)  # warm-up

    def reference(attempt: int) -> str:
        return str(mpns[(attempt + 1) * 7919 % len(mpns)])

    seconds = best_of(lambda a: find_alternates(parts, reference(a), brief), args.repeats)
    session = RankSession(parts)
    session.rank(brief)
    kept = best_of(
        lambda a: find_alternates(parts, reference(a), brief, session=session), args.repeats
    )
    return {"alternates_s": seconds, "alternates_session_s": kept, "rows": len(parts)}


def probe_fuzzy(args: argparse.Namespace) -> Figures:
    from picker.match import match_part_number

    parts = _load(args).parts
    mpns = parts["mpn"].to_numpy()

    def typo(attempt: int) -> str:
        text = str(mpns[(attempt + 1) * 104729 % len(mpns)])
        # Drop one character and lower-case: neither exact nor normalised-exact.
        return (text[:3] + text[4:]).lower()

    column = parts["mpn"]
    found = match_part_number(column, typo(99))  # warm-up
    if not found.candidates:
        raise RuntimeError(f"the lookup of {typo(99)!r} found no candidates: not a fuzzy pass")
    seconds = best_of(lambda attempt: match_part_number(column, typo(attempt)), args.repeats)
    return {"fuzzy_s": seconds, "rows": len(parts), "kind": found.kind}


def probe_tui(args: argparse.Namespace) -> Figures:
    """Keystroke to re-rendered shortlist in the real app under Pilot; see bench/tui_timing."""
    from bench.tui_timing import keystroke_to_shortlist

    figures, startup = asyncio.run(keystroke_to_shortlist(args.csv, args.cache, args.repeats))
    return {
        "keystroke_s": figures["median_s"],
        "keystroke_best_s": figures["best_s"],
        "keystroke_work_s": figures["work_median_s"],
        "tui_ready_s": startup,
    }


PROBES: dict[str, Callable[[argparse.Namespace], Figures]] = {
    "hash": probe_hash,
    "load": probe_load,
    "rank": probe_rank,
    "loop": probe_loop,
    "duckdb": probe_duckdb,
    "crosscheck": probe_crosscheck,
    "alternates": probe_alternates,
    "fuzzy": probe_fuzzy,
    "tui": probe_tui,
}


def main(argv: list[str] | None = None) -> int:
    parser = argparse.ArgumentParser(prog="python -m bench.probe")
    parser.add_argument("name", choices=sorted(PROBES))
    parser.add_argument("--csv", required=True)
    parser.add_argument("--cache", required=True)
    parser.add_argument("--sample", type=int, default=20_000)
    parser.add_argument("--repeats", type=int, default=5)
    args = parser.parse_args(argv)
    hit = cache_has(args) if args.name not in ("hash", "load") else None
    try:
        figures = PROBES[args.name](args)
    except Exception as error:  # the parent prints "n/a" with this reason
        last = traceback.extract_tb(error.__traceback__)[-1]
        figures = {
            "error": f"{type(error).__name__}: {error} ({Path(last.filename).name}:{last.lineno})"
        }
    figures["peak_rss_mb"] = peak_rss_mb()
    if hit is not None:
        figures["cache_hit"] = hit
    sys.stdout.write(json.dumps(figures) + "\n")
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
