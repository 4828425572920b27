"""Catalog lint: every problem of a set of catalogs, as JSON (DESIGN §6) or a plain table.

``picker lint`` calls ``lint_catalogs`` and prints ``report.to_json_dict()`` (JSON) or
``render_lint_table(report)`` (text), then exits with ``report.exit_code``:
0 no errors (warnings only or clean), 1 rows with errors were found, 2 an input is unusable
(missing, not a table, a bad mapping file). Lint never raises for bad catalogs.
"""

from __future__ import annotations

import textwrap
from collections.abc import Sequence
from dataclasses import dataclass
from pathlib import Path
from typing import Final

from catalog.problems import CatalogError, Problem
from catalog.reader import FileReport, load_catalogs_with_status

__all__ = ["LintReport", "lint_catalogs", "render_lint_table"]

_WIDTH: Final[int] = 80


@dataclass(frozen=True)
class LintReport:
    """What lint found.

    Attributes
    ----------
    files : tuple of FileReport
        One per catalog file read (rows read, rows loaded).
    rows_loaded : int
        Parts loaded from all files after duplicate handling.
    problems : tuple of Problem
        Every problem, in file and line order.
    unusable : tuple of str
        Inputs that could not be used at all (their reason is among ``problems``).
    fatal : str or None
        A one-line reason when nothing could be checked (e.g. a bad mapping file).
    """

    files: tuple[FileReport, ...]
    rows_loaded: int
    problems: tuple[Problem, ...]
    unusable: tuple[str, ...] = ()
    fatal: str | None = None

    @property
    def errors(self) -> int:
        """Number of error problems (rows not loaded or inputs unusable)."""
        return sum(1 for problem in self.problems if problem.severity == "error")

    @property
    def warnings(self) -> int:
        """Number of warning problems (rows loaded anyway)."""
        return sum(1 for problem in self.problems if problem.severity == "warning")

    @property
    def exit_code(self) -> int:
        """0 clean or warnings only, 1 error rows found, 2 unusable input.

        An unusable input beside usable ones is a problem found (1): the usable files were
        checked and the unusable one is reported among the problems. Only when nothing at
        all could be read is the run unusable (2).
        """
        usable = [f for f in self.files if f.path not in self.unusable]
        if self.fatal is not None or (self.unusable and not usable):
            return 2
        return 1 if self.errors else 0

    def to_json_dict(self) -> dict[str, object]:
        """``{"files": [{"path", "rows_read", "rows_loaded"}], "rows_loaded": N,
        "problems": [{"path", "line", "field", "raw", "message", "severity"}]}``."""
        return {
            "files": [
                {"path": f.path, "rows_read": f.rows_read, "rows_loaded": f.rows_loaded}
                for f in self.files
            ],
            "rows_loaded": self.rows_loaded,
            "problems": [problem.to_json_dict() for problem in self.problems],
        }


def lint_catalogs(paths: Sequence[str | Path], mapping: str | Path | None = None) -> LintReport:
    """Check catalogs and report every problem; never raises for bad input.

    Parameters
    ----------
    paths : sequence of str or Path
        Catalog files and directories, as for ``catalog.reader.load_catalogs``.
    mapping : str or Path, optional
        Header mapping file (``--map``).
    """
    if not paths:
        message = "no catalog given"
        return LintReport((), 0, (Problem("", None, None, None, message, "error"),), fatal=message)
    try:
        outcome = load_catalogs_with_status(paths, mapping=mapping)
    except CatalogError as error:
        text = str(error)
        where = str(mapping) if mapping is not None else ""
        return LintReport((), 0, (Problem(where, None, None, None, text, "error"),), fatal=text)
    result = outcome.result
    return LintReport(
        files=result.files,
        rows_loaded=len(result.parts),
        problems=result.problems,
        unusable=outcome.unusable,
    )


def _plural(count: int, word: str) -> str:
    return f"{count} {word}" if count == 1 else f"{count} {word}s"


def render_lint_table(report: LintReport, *, width: int = _WIDTH) -> str:
    """Plain-text lint report grouped by file, one problem per entry, fits ``width`` columns.

    Each entry: line number, severity, field, message; the raw text on its own line when
    there is one. Ends with a summary line.
    """
    out: list[str] = []
    by_path: dict[str, list[Problem]] = {}
    for problem in report.problems:
        by_path.setdefault(problem.path, []).append(problem)
    reported = {f.path: f for f in report.files}
    order = [f.path for f in report.files] + [p for p in by_path if p not in reported]
    for path in order:
        file_report = reported.get(path)
        title = path or "(input)"
        if len(title) > width:
            title = "..." + title[-(width - 3) :]  # keep the file name end of a long path
        if file_report is not None:
            counts = f"  ({file_report.rows_read} rows read, {file_report.rows_loaded} loaded)"
            if len(title) + len(counts) <= width:
                out.append(title + counts)
            else:
                out.extend([title, counts[:width]])
        else:
            out.append(title)
        entries = by_path.get(path, [])
        if not entries:
            out.append("  no problems")
        for problem in entries:
            line = "-" if problem.line is None else str(problem.line)
            mark = "ERROR" if problem.severity == "error" else "warn "
            field = problem.field or ""
            lead = f"  {line:>6} {mark} {field[:8]:<8} "
            out.extend(
                textwrap.wrap(
                    problem.message,
                    width=width,
                    initial_indent=lead,
                    subsequent_indent=" " * len(lead),
                )
                or [lead.rstrip()]
            )
            if problem.raw:
                raw = problem.raw if len(problem.raw) <= 50 else problem.raw[:47] + "..."
                out.append(f"{' ' * len(lead)}raw: {raw!r}"[:width])
        out.append("")
    read = sum(f.rows_read for f in report.files)
    summary = (
        f"{_plural(len(report.files), 'file')}, {read} rows read, {report.rows_loaded} loaded; "
        f"{_plural(report.errors, 'error')}, {_plural(report.warnings, 'warning')}"
    )
    if report.unusable:
        summary += f"; {len(report.unusable)} unusable input(s)"
    out.extend(textwrap.wrap(summary, width=width))
    return "\n".join(out)
