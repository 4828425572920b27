"""What the terminal UI needs from the core, and the one adapter that provides it.

The screens never import `catalog`, `picker.rank`, `picker.analysis` or the physics
directly: they talk to a `Core`. `PickerCore` (in `picker.tui.core`) wires the real
functions; tests pass a frozen double with fixed figures so that snapshots do not move
when the physics is refined. Everything here is plain data: frozen dataclasses and
pandas frames whose float columns are SI values.
"""

from __future__ import annotations

from collections.abc import Callable, Mapping, Sequence
from dataclasses import dataclass
from pathlib import Path
from typing import Literal, Protocol

import numpy as np
import pandas as pd

Source = Literal["catalog", "estimate", "brief", "computed"]
"""Where a figure on the part sheet came from."""

CAUTION = (
    "Every figure is an estimate from data-sheet values. Confirm the margins with the "
    "crystal maker and with a negative-resistance test on the real board (a series "
    "resistor added until oscillation stops). Safety-critical products follow their own "
    "qualification rules and local regulations."
)

SHORTLIST_COLUMNS = (
    "mpn",
    "status",
    "score",
    "package",
    "spec_cl_f",
    "esr_ohm",
    "margin",
    "margin_required",
    "gain_margin",
    "total_ppm",
    "headroom_ppm",
)
"""Columns of `Shortlist.rows`; floats in SI (F, ohm), ppm, plain ratios. `margin` is the
figure the ranking compares with `margin_required` for the brief's amplifier form."""

RULED_OUT_COLUMNS = ("key", "mpn", "package", "first_reason")
"""Columns of `Shortlist.ruled_out`: `key` is handed back to `Core.reasons_at`; `first_reason`
is a short label of the most fundamental failed rule (cheap at a million rows)."""


@dataclass(frozen=True)
class Loaded:
    """A catalog read from disk.

    Attributes
    ----------
    parts : the part table (INTERFACES.md columns)
    problems : one-line problem texts ("parts.csv:14: esr: expected ...")
    files : every file that was read; the UI never writes onto one of them
    """

    parts: pd.DataFrame
    problems: tuple[str, ...]
    files: tuple[Path, ...]


@dataclass(frozen=True)
class Shortlist:
    """One ranking of the whole catalog against one brief.

    Attributes
    ----------
    rows : listed parts (fit and marginal), best first, columns `SHORTLIST_COLUMNS`
    ruled_out : every part that failed, columns `RULED_OUT_COLUMNS`
    budget_ppm : the brief's total error budget [ppm]
    min_margin : the brief's minimum negative-resistance margin [1]
    ranking : the core's own ranking object, handed back to the core for details
    """

    rows: pd.DataFrame
    ruled_out: pd.DataFrame
    budget_ppm: float
    min_margin: float
    ranking: object = None


@dataclass(frozen=True)
class Figure:
    """One line of the part sheet: a named value and where it came from."""

    label: str
    value: str
    source: Source
    meaning: str = ""


@dataclass(frozen=True)
class DriftCurve:
    """Frequency drift over the brief's temperature range.

    Attributes
    ----------
    temperature_c : sample temperatures [°C]
    low_ppm, high_ppm : the drift envelope at each temperature [ppm] (equal for one curve)
    band_ppm : the part of the budget left for temperature drift, drawn as ±band [ppm]
    label : how the curve was obtained ("parabola, β = ...", "rated stability ...")
    """

    temperature_c: np.ndarray
    low_ppm: np.ndarray
    high_ppm: np.ndarray
    band_ppm: float
    label: str


@dataclass(frozen=True)
class ImpedanceCurve:
    """|Z| of the crystal near resonance.

    Attributes
    ----------
    frequency_hz : sample frequencies [Hz]
    magnitude_ohm : |Z| at each frequency [ohm]
    fs_hz, fl_hz, fp_hz : series, load and parallel resonance [Hz]
    """

    frequency_hz: np.ndarray
    magnitude_ohm: np.ndarray
    fs_hz: float
    fl_hz: float
    fp_hz: float


@dataclass(frozen=True)
class PartSheet:
    """Everything the part sheet shows for one part (already formatted for display)."""

    mpn: str
    status: str
    summary: str
    reasons: tuple[str, ...]
    figures: tuple[Figure, ...]
    caps: tuple[str, ...]
    budget: tuple[tuple[str, float], ...]
    budget_ppm: float
    declared: tuple[str, ...]
    bench: tuple[str, ...]
    estimated: tuple[str, ...] = ()
    drift: DriftCurve | None = None
    impedance: ImpedanceCurve | None = None


@dataclass(frozen=True)
class Alternate:
    """One part compared against a reference part."""

    mpn: str
    fit: str
    differences: tuple[str, ...]
    package: str = ""
    status: str = ""


@dataclass(frozen=True)
class Alternates:
    """Every part ordered by how closely it drops in for `reference`."""

    reference: str
    note: str
    rows: tuple[Alternate, ...]


@dataclass(frozen=True)
class Match:
    """A fuzzy part-number lookup: the part chosen (if any) and the closest candidates."""

    mpn: str | None
    candidates: tuple[str, ...] = ()
    note: str = ""


@dataclass(frozen=True)
class Preset:
    """An interface preset: a named total budget with the clause it comes from."""

    name: str
    title: str
    budget_ppm: float | None
    clause: str


@dataclass(frozen=True)
class BriefField:
    """One editable leaf of the brief mapping.

    Attributes
    ----------
    path : key path into the brief mapping (("amplifier", "gm"))
    label : what the field is called on screen ("amplifier.gm")
    dimension : unit dimension for as-you-type parsing (catalog.units), or None for text
    meaning : one line of help
    is_list : the value is a list, edited as comma-separated text ("-40 degC, 85 degC")
    read_only : shown but not editable here (a nested table such as a max_esr grid's rows,
        which one line of text cannot hold faithfully); edit it in the YAML file
    """

    path: tuple[str, ...]
    label: str
    dimension: str | None = None
    meaning: str = ""
    is_list: bool = False
    read_only: bool = False


@dataclass(frozen=True)
class ExportFormat:
    """A file format the shortlist can be exported to."""

    name: str
    suffix: str


EXPORT_FORMATS = (
    ExportFormat("csv", ".csv"),
    ExportFormat("json", ".json"),
    ExportFormat("markdown", ".md"),
)

Progress = Callable[[float], None]


class Core(Protocol):
    """What the UI calls. Every method may raise ValueError/OSError with a one-line message."""

    def load(
        self, paths: Sequence[Path], mapping: Path | None, progress: Progress | None
    ) -> Loaded: ...

    def read_brief(self, path: Path) -> dict[str, object]: ...

    def check_brief(self, data: Mapping[str, object]) -> object: ...

    def check_value(self, dimension: str, text: str) -> float: ...

    def presets(self) -> tuple[Preset, ...]: ...

    def rank(self, parts: pd.DataFrame, brief: object) -> Shortlist: ...

    def reasons_at(self, shortlist: Shortlist, key: int) -> tuple[str, ...]: ...

    def sheet(
        self, parts: pd.DataFrame, shortlist: Shortlist, brief: object, mpn: str
    ) -> PartSheet: ...

    def alternates(self, parts: pd.DataFrame, mpn: str, brief: object) -> Alternates: ...

    def match(self, parts: pd.DataFrame, text: str) -> Match: ...

    def export_text(
        self, parts: pd.DataFrame, shortlist: Shortlist, brief: object, format_name: str
    ) -> tuple[str, int]: ...

    def bom_line(
        self, parts: pd.DataFrame, shortlist: Shortlist, brief: object, mpn: str
    ) -> str: ...
