"""The part sheet: every figure for one part, where it came from, and two small plots."""

from __future__ import annotations

import math

import numpy as np
from rich.text import Text
from textual.app import ComposeResult
from textual.containers import VerticalScroll
from textual.widgets import Static

from picker.tui.bars import fraction_bar
from picker.tui.model import CAUTION, DriftCurve, ImpedanceCurve, PartSheet
from picker.tui.plots import curve_plot, framed, marker_row
from picker.tui.shortlist import status_cells

SOURCE_TAGS = {
    "catalog": "catalog",
    "estimate": "ESTIMATE",
    "brief": "brief",
    "computed": "computed",
}
"""Provenance tags; estimates are upper-case so they stand out without colour."""


def _ohms(value: float) -> str:
    for scale, prefix in ((1e6, "M"), (1e3, "k")):
        if abs(value) >= scale:
            return f"{value / scale:.3g} {prefix}Ω"
    return f"{value:.3g} Ω"


def drift_lines(curve: DriftCurve, width: int, height: int = 6) -> list[str]:
    """The drift plot: envelope over temperature against the ±band of the budget."""
    plot_width = max(width - 10, 10)
    band = curve.band_ppm if math.isfinite(curve.band_ppm) else 0.0
    bands = (band, -band) if band > 0 else ()
    lines, (low, high) = curve_plot(
        curve.temperature_c,
        [curve.low_ppm, curve.high_ppm],
        width=plot_width,
        height=height,
        bands=bands,
    )
    t0, t1 = float(np.min(curve.temperature_c)), float(np.max(curve.temperature_c))
    return framed(lines, f"{high:+.0f}ppm", f"{low:+.0f}ppm", f"{t0:.0f} °C", f"{t1:.0f} °C")


def impedance_lines(curve: ImpedanceCurve, width: int, height: int = 6) -> list[str]:
    """|Z| on a log scale near resonance, with fs, fL and fp marked below the axis."""
    plot_width = max(width - 10, 10)
    magnitude = np.log10(np.maximum(curve.magnitude_ohm, 1e-3))
    lines, (low, high) = curve_plot(
        curve.frequency_hz, [magnitude], width=plot_width, height=height
    )
    f0, f1 = float(np.min(curve.frequency_hz)), float(np.max(curve.frequency_hz))
    out = framed(
        lines,
        _ohms(10**high),
        _ohms(10**low),
        f"{(f0 / curve.fs_hz - 1) * 1e6:+.0f} ppm",
        f"{(f1 / curve.fs_hz - 1) * 1e6:+.0f} ppm",
    )
    marks = marker_row(
        f0, f1, plot_width, [(curve.fs_hz, "s"), (curve.fl_hz, "L"), (curve.fp_hz, "p")]
    )
    out.insert(len(out) - 1, " " * 9 + marks)
    return out


def sheet_text(sheet: PartSheet, width: int) -> Text:
    """The whole part sheet as one rich Text (styles add emphasis, never meaning)."""
    text = Text()
    status, _ = status_cells(sheet.status)
    text.append(f"{sheet.mpn}", style="bold")
    text.append(f"  {status.strip()}\n", style="bold")
    text.append(f"{sheet.summary}\n")
    for reason in sheet.reasons:
        text.append(f"  • {reason}\n")

    text.append("\nFigures", style="bold underline")
    text.append("  (source: catalog, brief, computed, ESTIMATE)\n", style="dim")
    label_width = min(max((len(f.label) for f in sheet.figures), default=10), 28)
    for figure in sheet.figures:
        tag = SOURCE_TAGS.get(figure.source, figure.source)
        line = f"  {figure.label:<{label_width}} {figure.value:>16}  [{tag}]"
        text.append(line, style="bold" if figure.source == "estimate" else "")
        if figure.meaning and width >= len(line) + 4 + len(figure.meaning):
            text.append(f"  {figure.meaning}", style="dim")
        text.append("\n")
    if sheet.estimated:
        text.append(
            f"  Estimated (typical values, common practice): {', '.join(sheet.estimated)}\n"
        )

    text.append("\nLoad capacitors\n", style="bold underline")
    for line in sheet.caps:
        text.append(f"  {line}\n")

    text.append("\nError budget", style="bold underline")
    text.append(f"  (worst case, budget {sheet.budget_ppm:.4g} ppm)\n", style="dim")
    bar_width = max(min(width - 36, 30), 6)
    for name, ppm in sheet.budget:
        fraction = ppm / sheet.budget_ppm if sheet.budget_ppm > 0 else math.nan
        text.append(f"  {name:<14} {ppm:8.2f} ppm {fraction_bar(fraction, bar_width)}\n")

    if sheet.declared:
        text.append("\nFigures to declare in firmware\n", style="bold underline")
        for line in sheet.declared:
            text.append(f"  {line}\n")

    if sheet.drift is not None:
        text.append("\nDrift over the brief's temperature range", style="bold underline")
        text.append(
            f"  (dotted: ±{sheet.drift.band_ppm:.3g} ppm left for temperature)\n", style="dim"
        )
        text.append(f"  {sheet.drift.label}\n", style="dim")
        for line in drift_lines(sheet.drift, min(width, 72)):
            text.append(f"{line}\n")
    if sheet.impedance is not None:
        text.append("\n|Z| near resonance", style="bold underline")
        text.append(
            "  (s = fs series, L = fL with the board's load, p = fp parallel)\n", style="dim"
        )
        for line in impedance_lines(sheet.impedance, min(width, 72)):
            text.append(f"{line}\n")

    text.append("\nBench verification plan\n", style="bold underline")
    for number, line in enumerate(sheet.bench, start=1):
        text.append(f"  {number}. {line}\n")
    text.append(f"\n{CAUTION}\n", style="italic")
    return text


class PartSheetView(VerticalScroll, can_focus=True):
    """Scrollable part sheet; re-lays its plots when the width changes."""

    DEFAULT_CSS = """
    PartSheetView { height: 1fr; padding: 0 1; }
    PartSheetView > Static { width: 1fr; }
    """

    def __init__(self, *, id: str | None = None) -> None:
        super().__init__(id=id)
        self._sheet: PartSheet | None = None
        self._body = Static("Highlight a part in the shortlist to see its sheet.", id="sheet-body")

    def compose(self) -> ComposeResult:
        yield self._body

    @property
    def sheet(self) -> PartSheet | None:
        return self._sheet

    def show(self, sheet: PartSheet | None) -> None:
        self._sheet = sheet
        self._render_body()

    def show_message(self, message: str) -> None:
        self._sheet = None
        self._body.update(message)

    def on_resize(self) -> None:
        self._render_body()

    def _render_body(self) -> None:
        if self._sheet is not None:
            width = max(self.size.width - 2, 40)
            self._body.update(sheet_text(self._sheet, width))
