"""The benchmark's one table: figure, target, PASS/MISS and by how much."""

from __future__ import annotations

from collections.abc import Mapping, Sequence
from dataclasses import dataclass

Figures = Mapping[str, float | str]


@dataclass(frozen=True)
class Row:
    """One line of the table."""

    what: str
    value: str
    target: str = ""
    verdict: str = ""
    note: str = ""


def _format(value: float, unit: str) -> str:
    if unit == "s":
        if value < 1e-3:
            return f"{value * 1e6:.0f} µs"
        if value < 1.0:
            return f"{value * 1e3:.1f} ms"
        return f"{value:.2f} s"
    if unit == "MB":
        return f"{value:.0f} MB"
    if unit == "x":
        return f"{value:,.1f}×"
    return f"{value:.3g}"


def target_row(
    what: str,
    figures: Figures,
    key: str,
    *,
    limit: float | None = None,
    unit: str = "s",
    note: str = "",
) -> Row:
    """A measured figure, compared with an upper limit when one is set."""
    value = figures.get(key)
    if not isinstance(value, (int, float)):
        return Row(
            what,
            "n/a",
            _format(limit, unit) if limit else "",
            "",
            str(figures.get("error", "not measured"))[:90],
        )
    if figures.get("cache_hit") is False and unit == "MB":
        note = (note + "; " if note else "") + "cache missed: includes a parse"
    if limit is None:
        return Row(what, _format(float(value), unit), note=note)
    passed = value <= limit
    by = f"{limit / value:.1f}× inside" if passed and value > 0 else f"{value / limit:.2f}× over"
    return Row(
        what,
        _format(float(value), unit),
        "≤ " + _format(limit, unit),
        "PASS" if passed else "MISS",
        (by + ("; " + note if note else "")).strip(),
    )


def ratio_row(
    what: str,
    top: Figures,
    top_key: str,
    bottom: Figures,
    bottom_key: str,
    *,
    at_least: float | None = None,
    at_most: float | None = None,
) -> Row:
    """``top/bottom`` as a ratio, with a lower or upper bound as the target."""
    a, b = top.get(top_key), bottom.get(bottom_key)
    if not isinstance(a, (int, float)) or not isinstance(b, (int, float)) or b <= 0:
        reason = top.get("error") or bottom.get("error") or "not measured"
        return Row(what, "n/a", note=str(reason)[:90])
    ratio = a / b
    if at_least is not None:
        passed = ratio >= at_least
        return Row(
            what,
            _format(ratio, "x"),
            "≥ " + _format(at_least, "x"),
            "PASS" if passed else "MISS",
            f"{ratio / at_least:.2f}× the target",
        )
    if at_most is not None:
        passed = ratio <= at_most
        return Row(
            what,
            _format(ratio, "x"),
            "≤ " + _format(at_most, "x"),
            "PASS" if passed else "MISS",
            f"{ratio / at_most:.2f}× the limit",
        )
    return Row(what, _format(ratio, "x"))


def format_table(rows: Sequence[Row], *, title: str) -> str:
    """Plain-text table (no colour: it goes into notes and CI logs)."""
    header = Row("measurement", "figure", "target", "result", "margin / note")
    table = [header, *rows]
    widths = [
        max(len(getattr(r, f)) for r in table) for f in ("what", "value", "target", "verdict")
    ]
    lines = [title, "-" * len(title)]
    for row in table:
        lines.append(
            f"{row.what:<{widths[0]}}  {row.value:>{widths[1]}}  {row.target:<{widths[2]}}  "
            f"{row.verdict:<{widths[3]}}  {row.note}".rstrip()
        )
        if row is header:
            lines.append("-" * (sum(widths) + 6 + 14))
    passed = sum(r.verdict == "PASS" for r in rows)
    missed = sum(r.verdict == "MISS" for r in rows)
    lines.append(f"\n{passed} PASS, {missed} MISS, {sum(r.value == 'n/a' for r in rows)} n/a")
    return "\n".join(lines)
