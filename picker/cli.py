"""The ``picker`` command line: argparse, exit codes and the top-level error handler.

Exit codes: 0 success; 1 a finding (nothing fits, lint problems); 2 bad usage or unreadable
input. User errors print one line on stderr and never a traceback; an unexpected error prints
one line and "rerun with --debug", and ``--debug`` shows the traceback.
"""

from __future__ import annotations

import argparse
import sys
import textwrap
import traceback
from collections.abc import Sequence
from importlib import resources
from pathlib import Path
from typing import Any, TextIO

import pandas as pd

from picker import report

EXIT_OK = 0
EXIT_FINDING = 1
EXIT_USAGE = 2

EPILOG = "\n\n".join(
    textwrap.fill(paragraph, width=78)
    for paragraph in (
        "Caution: " + report.CAUTION,
        "Without --catalog the bundled demo catalog is used; without --brief the bundled "
        "demo brief. Exit codes: 0 success, 1 a finding (nothing fits, lint problems), 2 bad "
        "usage or unreadable input.",
    )
)


#: Rows a text table shows when --top is not given.
TABLE_ROWS = 10


class UsageError(Exception):
    """A user error to report in one line with exit code 2."""


def demo_catalog_paths() -> list[Path]:
    """The bundled demo catalogs (package data of ``demo_catalog``), sorted by name."""
    root = resources.files("demo_catalog")
    found = [
        Path(str(entry))
        for entry in root.iterdir()
        if entry.is_file() and entry.name.endswith((".csv", ".yaml", ".yml"))
    ]
    return sorted(found)


def _parser() -> argparse.ArgumentParser:
    # SUPPRESS: options may come before or after the command without one hiding the other.
    common = argparse.ArgumentParser(add_help=False, argument_default=argparse.SUPPRESS)
    common.add_argument(
        "--catalog",
        action="append",
        metavar="P",
        help="catalog file or folder (repeatable); default: the bundled demo catalog",
    )
    common.add_argument("--brief", metavar="F", help="brief YAML file; default: the demo brief")
    common.add_argument("--preset", metavar="NAME", help="interface preset (see 'picker presets')")
    common.add_argument("--map", metavar="FILE", help="header mapping file for the catalogs")
    common.add_argument("--debug", action="store_true", help="show tracebacks of errors")

    parser = argparse.ArgumentParser(
        prog="picker",
        description="Choose the quartz crystal for an oscillator circuit from your catalog.",
        epilog=EPILOG,
        formatter_class=argparse.RawDescriptionHelpFormatter,
        parents=[common],
    )
    commands = parser.add_subparsers(dest="command", metavar="COMMAND")

    def add(name: str, help_text: str, formats: Sequence[str]) -> argparse.ArgumentParser:
        sub = commands.add_parser(
            name,
            help=help_text,
            description=help_text,
            epilog=EPILOG,
            formatter_class=argparse.RawDescriptionHelpFormatter,
            parents=[common],
        )
        sub.add_argument("--format", choices=formats, default="table")
        return sub

    rank = add("rank", "rank every part of the catalog against the brief", ("table", "json", "csv"))
    rank.add_argument(
        "--top",
        type=_positive_int,
        default=None,
        metavar="N",
        help=f"rows to show (table default {TABLE_ROWS}; json/csv default: all listed)",
    )
    rank.add_argument("--all", action="store_true", help="every part, ruled-out ones too")

    analyze = add("analyze", "every figure for one or more parts", ("table", "json"))
    analyze.add_argument("mpns", nargs="+", metavar="MPN")

    alternates = add(
        "alternates", "parts that can replace a reference part", ("table", "json", "csv")
    )
    alternates.add_argument("mpns", nargs="+", metavar="MPN")
    alternates.add_argument(
        "--top",
        type=_positive_int,
        default=None,
        metavar="N",
        help=f"rows to show (table default {TABLE_ROWS}; json/csv default: all)",
    )

    lint = add("lint", "check catalog files and report every problem", ("table", "json"))
    lint.add_argument("paths", nargs="+", metavar="P")

    add("presets", "list the interface presets and their budgets", ("table", "json"))
    return parser


def _positive_int(text: str) -> int:
    try:
        value = int(text)
    except ValueError:
        raise argparse.ArgumentTypeError(f"expected a whole number, got '{text}'") from None
    if value < 1:
        raise argparse.ArgumentTypeError(f"expected 1 or more, got {value}")
    return value


def main(argv: Sequence[str] | None = None) -> int:
    """Run the command line; returns the exit code (the console script exits with it)."""
    args_list = list(sys.argv[1:] if argv is None else argv)
    parser = _parser()
    try:
        args = parser.parse_args(args_list)
    except SystemExit as stop:  # argparse: --help (0) or a usage error (2)
        return int(stop.code) if isinstance(stop.code, int) else EXIT_USAGE
    debug = bool(getattr(args, "debug", False)) or "--debug" in args_list
    try:
        return _dispatch(args, sys.stdout, sys.stderr)
    except KeyboardInterrupt:
        print("picker: interrupted", file=sys.stderr)
        return 130
    except BrokenPipeError:
        return EXIT_OK
    except Exception as error:
        message = _user_error_message(error)
        if debug:
            traceback.print_exc(file=sys.stderr)
        if message is not None:
            print(f"picker: {message}", file=sys.stderr)
            return EXIT_USAGE
        print(
            f"picker: unexpected error: {type(error).__name__}: {_one_line(str(error))} "
            "(rerun with --debug for details)",
            file=sys.stderr,
        )
        return EXIT_USAGE


def _one_line(text: str) -> str:
    return " ".join(text.split())


def _user_error_message(error: Exception) -> str | None:
    """One line for errors caused by the user's input; None for program faults."""
    from catalog.problems import CatalogError
    from catalog.units import UnitError

    known: tuple[type[Exception], ...] = (UsageError, CatalogError, UnitError)
    try:
        from picker.brief import BriefError

        known += (BriefError,)
    except ImportError:  # pragma: no cover - brief module always ships
        pass
    try:
        from picker.presets import PresetError

        known += (PresetError,)
    except ImportError:  # pragma: no cover
        pass
    if isinstance(error, known):
        return _one_line(str(error))
    if isinstance(error, FileNotFoundError):
        return f"{error.filename}: no such file"
    if isinstance(error, IsADirectoryError | PermissionError | UnicodeDecodeError):
        return _one_line(str(error))
    if isinstance(error, OSError) and error.filename:
        return f"{error.filename}: {error.strerror or error}"
    return None


def _dispatch(args: argparse.Namespace, out: TextIO, err: TextIO) -> int:
    if args.command is None:
        return _open_app(args, out, err)
    handler = {
        "rank": _rank,
        "analyze": _analyze,
        "alternates": _alternates,
        "lint": _lint,
        "presets": _presets,
    }[args.command]
    return handler(args, out, err)


if __name__ == "__main__":  # pragma: no cover
    sys.exit(main())


# --------------------------------------------------------------------------- loading


def _option(args: argparse.Namespace, name: str) -> Any:
    return getattr(args, name, None)


def _catalog_paths(args: argparse.Namespace) -> list[Path]:
    given = _option(args, "catalog")
    return [Path(p) for p in given] if given else demo_catalog_paths()


def _load_parts(args: argparse.Namespace, err: TextIO) -> pd.DataFrame:
    from catalog.cache import load_catalogs_cached

    paths = _catalog_paths(args)
    result = load_catalogs_cached(paths, mapping=_option(args, "map"))
    errors = sum(1 for p in result.problems if p.severity == "error")
    warnings = len(result.problems) - errors
    if result.problems:
        print(
            f"picker: catalog problems: {errors} rows skipped, {warnings} warnings "
            "(run 'picker lint' on the files for the list)",
            file=err,
        )
    if result.parts.empty:
        names = ", ".join(str(p) for p in paths)
        raise UsageError(f"{names}: no usable parts")
    return result.parts


def _brief_path(args: argparse.Namespace) -> Path:
    from picker.brief import default_brief_path

    given = _option(args, "brief")
    return Path(given) if given else Path(default_brief_path())


def _load_brief(args: argparse.Namespace) -> Any:
    from picker.brief import brief_to_mapping, load_brief, parse_brief

    path = _brief_path(args)
    brief = load_brief(path)
    preset = _option(args, "preset")
    if preset:
        # A preset named on the command line sets the budget, replacing the brief's own.
        mapping = brief_to_mapping(brief)
        mapping["preset"] = preset
        mapping.pop("budget", None)
        brief = parse_brief(mapping, source=f"{path} with --preset {preset}")
    return brief


def _resolve(parts: pd.DataFrame, text: str, err: TextIO) -> str:
    from picker.match import match_part_number

    result = match_part_number(parts["mpn"], text)
    if result.mpn is None:
        raise UsageError(result.describe())
    if result.kind != "exact":
        print(f"picker: {result.describe()}", file=err)
    return result.mpn


# --------------------------------------------------------------------------- commands


def _rank(args: argparse.Namespace, out: TextIO, err: TextIO) -> int:
    from picker.rank import rank_parts

    parts = _load_parts(args, err)
    brief = _load_brief(args)
    ranking = rank_parts(parts, brief)
    include_all = bool(_option(args, "all"))
    available = len(parts) if include_all else ranking.shortlist_size
    top = _option(args, "top")
    if top is None:
        top = TABLE_ROWS if args.format == "table" else available
    frame = ranking.head(top, include_ruled_out=include_all)
    if args.format == "json":
        out.write(report.to_json(report.ranking_objects(frame, brief)))
    elif args.format == "csv":
        rows = report.ranking_csv_rows(frame, brief)
        out.write(report.to_csv(rows, report.RANK_CSV_COLUMNS))
    else:
        more = available - len(frame)
        note = f"; showing {len(frame)}" + (" (--top N or --all for more)" if more > 0 else "")
        out.write(report.ranking_table(ranking, frame, total_shown=note))
        out.write("\n" + "\n".join(report.wrap(report.CAUTION, indent="", hang="")) + "\n")
    if ranking.shortlist_size == 0:
        print("picker: no part fits this brief (use --all to see why)", file=err)
        return EXIT_FINDING
    return EXIT_OK


def _analyze(args: argparse.Namespace, out: TextIO, err: TextIO) -> int:
    from picker.rank import rank_parts

    parts = _load_parts(args, err)
    mpns = [_resolve(parts, text, err) for text in args.mpns]
    brief = _load_brief(args)
    ranking = rank_parts(parts, brief)
    rows = [ranking.row(mpn) for mpn in mpns]
    if args.format == "json":
        objects = [report.part_object(row, brief) for row in rows]
        out.write(report.to_json(objects[0] if len(objects) == 1 else objects))
    else:
        out.write("\n".join(report.part_sheet(row, brief) for row in rows))
    return EXIT_OK


def _alternates(args: argparse.Namespace, out: TextIO, err: TextIO) -> int:
    from picker.alternates import find_alternates

    parts = _load_parts(args, err)
    brief = _load_brief(args) if _option(args, "brief") or _option(args, "preset") else None
    status = EXIT_OK
    objects: dict[str, Any] = {}
    csv_parts: list[str] = []
    for text in args.mpns:
        reference = _resolve(parts, text, err)
        result = find_alternates(parts, reference, brief)
        top = _option(args, "top")
        if top is None and args.format == "table":
            top = TABLE_ROWS
        rows = result.top(top)
        if args.format == "json":
            objects[reference] = report.alternates_objects(result, rows)
        elif args.format == "csv":
            text_csv = report.alternates_csv(result, rows)
            # One header for several references: the rows carry their reference.
            csv_parts.append(text_csv if not csv_parts else text_csv.split("\n", 1)[1])
        else:
            out.write(report.alternates_table(result, rows))
        counts = result.counts()
        if counts["drop_in"] + counts["drop_in_new_caps"] == 0:
            print(f"picker: no drop-in alternate for {reference}", file=err)
            status = EXIT_FINDING
    if args.format == "json":
        # One reference: its list; several: an object keyed by reference part number.
        single = len(objects) == 1
        out.write(report.to_json(next(iter(objects.values())) if single else objects))
    elif args.format == "csv":
        out.write("".join(csv_parts))
    return status


def _lint(args: argparse.Namespace, out: TextIO, err: TextIO) -> int:
    from catalog.lint import lint_catalogs, render_lint_table

    # Lint reads the files afresh (no cache): it is the check of what is on disk now.
    result = lint_catalogs([Path(p) for p in args.paths], mapping=_option(args, "map"))
    if result.exit_code == 2:  # nothing could be read: one line per input, nothing on stdout
        for problem in result.problems:
            if problem.severity == "error":
                print(f"picker: {problem.one_line()}", file=err)
        return 2
    if args.format == "json":
        out.write(report.to_json(result.to_json_dict()))
    else:
        out.write(render_lint_table(result))
    return result.exit_code


def _presets(args: argparse.Namespace, out: TextIO, err: TextIO) -> int:
    from picker.presets import preset_table

    rows = preset_table()
    if args.format == "json":
        out.write(report.to_json(rows))
    else:
        out.write(report.presets_table(rows))
    return EXIT_OK


def _open_app(args: argparse.Namespace, out: TextIO, err: TextIO) -> int:
    paths = _catalog_paths(args)
    try:
        from picker.tui.app import run_app
    except ImportError as error:
        print(f"picker: the terminal UI is not available ({error}); a summary follows", file=err)
        parts = _load_parts(args, err)
        out.write(report.catalog_summary(parts, paths))
        return EXIT_OK
    return int(run_app(paths, _brief_path(args), _option(args, "map")))
