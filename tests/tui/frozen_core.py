"""A frozen stand-in for the core, so UI tests and snapshots do not move with the physics.

It is a test double, not physics: margins and budgets are simple made-up functions of the
brief's gm and budget, enough for the screens to react to edits. The invented parts carry
no real brand or part number.
"""

from __future__ import annotations

from collections.abc import Mapping, Sequence
from pathlib import Path

import numpy as np
import pandas as pd

from catalog.units import parse_quantity
from picker.tui.export import export_text
from picker.tui.model import (
    Alternate,
    Alternates,
    DriftCurve,
    Figure,
    ImpedanceCurve,
    Loaded,
    Match,
    PartSheet,
    Preset,
    Progress,
    Shortlist,
)

PARTS = pd.DataFrame(
    {
        "mpn": [
            "NX16-A12",
            "NX16-B08",
            "NX16-C12",
            "QT16-D10",
            "QT16-E12",
            "QT16-F18",
            "LW16-G12",
            "LW16-H08",
        ],
        "package": ["3225", "2520", "3225", "2016", "3225", "5032", "3225", "2520"],
        "load_capacitance_f": [12e-12, 8e-12, 12e-12, 10e-12, 12e-12, 18e-12, 12e-12, 8e-12],
        "esr_ohm": [40.0, 60.0, 80.0, 100.0, 30.0, 150.0, 50.0, 70.0],
        "tolerance_ppm": [10.0, 10.0, 20.0, 10.0, 30.0, 20.0, 10.0, 15.0],
        "stability_ppm": [10.0, 15.0, 10.0, 20.0, 10.0, 30.0, 10.0, 10.0],
    }
)

BRIEF = {
    "name": "Test radio node",
    "frequency": "16 MHz",
    "budget": "50 ppm",
    "temperature": ["-20 degC", "70 degC"],
    "amplifier": {"gm": "10 mA/V", "pin_capacitance": "1.5 pF"},
    "board": {"stray_capacitance": "2 pF"},
    "limits": {"min_margin": "5"},
}


class FrozenCore:
    """Implements picker.tui.model.Core with fixed, hand-made figures."""

    def __init__(
        self,
        parts: pd.DataFrame = PARTS,
        files: Sequence[Path] = (),
        problems: tuple[str, ...] = (
            "parts.csv:9: esr: expected a resistance such as '80 ohm', got 'abc'",
        ),
    ) -> None:
        self.parts = parts
        self.files = tuple(files)
        self.problems = problems

    def load(
        self, paths: Sequence[Path], mapping: Path | None, progress: Progress | None
    ) -> Loaded:
        if progress is not None:
            progress(1.0)
        return Loaded(self.parts, self.problems, tuple(paths) + self.files)

    def read_brief(self, path: Path) -> dict[str, object]:
        import yaml

        if path.exists():
            data = yaml.safe_load(path.read_text(encoding="utf-8"))
            if not isinstance(data, dict):
                raise ValueError(f"{path}: not a mapping")
            return data
        return dict(BRIEF)

    def check_value(self, dimension: str, text: str) -> float:
        return parse_quantity(text, dimension)  # type: ignore[arg-type]

    def check_brief(self, data: Mapping[str, object]) -> object:
        amplifier = data.get("amplifier")
        if not isinstance(amplifier, Mapping) or "gm" not in amplifier:
            raise ValueError("amplifier.gm: missing")
        gm = parse_quantity(str(amplifier["gm"]), "transconductance")
        if gm <= 0:
            raise ValueError(f"amplifier.gm: must be positive, got '{amplifier['gm']}'")
        budget = parse_quantity(str(data.get("budget", "50 ppm")), "ppm")
        limits = data.get("limits")
        min_margin = float(str(limits.get("min_margin", 5))) if isinstance(limits, Mapping) else 5
        return {"gm": gm, "budget": budget, "min_margin": min_margin}

    def presets(self) -> tuple[Preset, ...]:
        return (
            Preset("usb_fs", "USB full-speed", 2500.0, "USB 2.0 §7.1.11"),
            Preset("100base_tx", "100BASE-TX", 50.0, "IEEE 802.3 cl. 24–25"),
        )

    def rank(self, parts: pd.DataFrame, brief: object) -> Shortlist:
        assert isinstance(brief, dict)
        gm = brief["gm"]
        # Made-up "gm_crit" proportional to ESR and CL squared: a test double only.
        cl = parts["load_capacitance_f"].to_numpy()
        gm_crit = parts["esr_ohm"].to_numpy() * (cl / 12e-12) ** 2 * 2e-5
        margin = gm / gm_crit
        total = parts["tolerance_ppm"].to_numpy() + parts["stability_ppm"].to_numpy() + 5.0
        headroom = brief["budget"] - total
        ok = (margin >= brief["min_margin"]) & (headroom >= 0)
        status = np.where(
            ok, np.where(margin < 1.2 * brief["min_margin"], "marginal", "fit"), "ruled_out"
        )
        score = 0.6 * np.minimum(margin / (4 * brief["min_margin"]), 1.0) + 0.4 * np.clip(
            headroom / brief["budget"], 0, 1
        )
        table = pd.DataFrame(
            {
                "mpn": parts["mpn"],
                "status": status,
                "score": score,
                "package": parts["package"],
                "spec_cl_f": cl,
                "esr_ohm": parts["esr_ohm"],
                "margin": margin,
                "margin_required": np.full(len(margin), brief["min_margin"]),
                "gain_margin": margin * 1.5,
                "total_ppm": total,
                "headroom_ppm": headroom,
            }
        )
        table = table.sort_values(["score", "mpn"], ascending=[False, True], kind="stable")
        listed = table[table["status"] != "ruled_out"].reset_index(drop=True)
        out = table[table["status"] == "ruled_out"].reset_index(drop=True)
        ruled = pd.DataFrame(
            {
                "key": np.arange(len(out)),
                "mpn": out["mpn"],
                "package": out["package"],
                "first_reason": [self._reasons(r, brief)[0] for _, r in out.iterrows()],
            }
        )
        return Shortlist(listed, ruled, brief["budget"], brief["min_margin"], table)

    def _reasons(self, row: pd.Series, brief: dict[str, float]) -> tuple[str, ...]:
        reasons = []
        if row["margin"] < brief["min_margin"]:
            reasons.append(f"margin {row['margin']:.2f} < {brief['min_margin']:g}")
        if row["headroom_ppm"] < 0:
            reasons.append(
                f"total error {row['total_ppm']:.0f} ppm > budget {brief['budget']:.0f} ppm"
            )
        return tuple(reasons) or ("none",)

    def reasons_at(self, shortlist: Shortlist, key: int) -> tuple[str, ...]:
        table = shortlist.ranking
        assert isinstance(table, pd.DataFrame)
        out = table[table["status"] == "ruled_out"].reset_index(drop=True)
        return self._reasons(
            out.iloc[int(key)], {"min_margin": shortlist.min_margin, "budget": shortlist.budget_ppm}
        )

    def sheet(
        self, parts: pd.DataFrame, shortlist: Shortlist, brief: object, mpn: str
    ) -> PartSheet:
        table = shortlist.ranking
        assert isinstance(table, pd.DataFrame)
        row = table[table["mpn"] == mpn].iloc[0]
        temps = np.linspace(-20, 70, 31)
        drift = (
            -0.0004 * (temps - 25) ** 2 * row["stability_ppm"]
            if "stability_ppm" in row
            else -0.004 * (temps - 25) ** 2
        )
        fs = 16e6
        freq = np.linspace(fs * (1 - 300e-6), fs * (1 + 2500e-6), 200)
        magnitude = np.abs(1.0 / (1e-9 + np.abs(freq - fs) * 1e-6)) + row["esr_ohm"]
        return PartSheet(
            mpn=mpn,
            status=str(row["status"]),
            summary="16 MHz AT-cut, package " + str(row["package"]),
            reasons=(),
            figures=(
                Figure("ESR (R1)", f"{row['esr_ohm']:.0f} Ω", "catalog", "largest R1"),
                Figure("C0", "1.8 pF", "estimate", "shunt capacitance"),
                Figure("margin", f"{row['margin']:.2f}", "computed", "|Rneg|/R1"),
                Figure("gm", "10 mA/V", "brief"),
            ),
            caps=("Ca = Cb = 18 pF (E12)",),
            budget=(("tolerance", 10.0), ("total", 30.0)),
            budget_ppm=shortlist.budget_ppm,
            declared=("worst case ±30 ppm",),
            bench=("add 200 Ω in series; it must still start",),
            estimated=("c0_f",),
            drift=DriftCurve(temps, drift, drift, 20.0, "test curve"),
            impedance=ImpedanceCurve(freq, magnitude, fs, fs * (1 + 200e-6), fs * (1 + 2000e-6)),
        )

    def alternates(self, parts: pd.DataFrame, mpn: str, brief: object) -> Alternates:
        match = self.match(parts, mpn)
        if match.mpn is None:
            raise ValueError(f"no part number '{mpn}'")
        reference = parts[parts["mpn"] == match.mpn].iloc[0]
        rows = []
        for _, part in parts[parts["mpn"] != match.mpn].iterrows():
            same_pkg = part["package"] == reference["package"]
            same_cl = part["load_capacitance_f"] == reference["load_capacitance_f"]
            fit = ("drop_in" if same_cl else "drop_in_new_caps") if same_pkg else "incompatible"
            differences = []
            if not same_pkg:
                differences.append(f"package {part['package']} vs {reference['package']}")
            if not same_cl:
                differences.append("load capacitance differs: new caps")
            rows.append(Alternate(str(part["mpn"]), fit, tuple(differences), str(part["package"])))
        order = {"drop_in": 0, "drop_in_new_caps": 1, "review": 2, "incompatible": 3}
        rows.sort(key=lambda a: (order[a.fit], a.mpn))
        return Alternates(match.mpn, match.note, tuple(rows))

    def match(self, parts: pd.DataFrame, text: str) -> Match:
        from picker.match import match_part_number

        result = match_part_number(parts["mpn"], text)
        note = "" if result.kind == "exact" else result.describe()
        return Match(result.mpn, tuple(c for c, _ in result.candidates), note)

    def export_text(
        self, parts: pd.DataFrame, shortlist: Shortlist, brief: object, format_name: str
    ) -> tuple[str, int]:
        rows = [dict(r) for _, r in shortlist.rows.iterrows()]
        return export_text(rows, format_name, title="test shortlist"), len(rows)

    def bom_line(self, parts: pd.DataFrame, shortlist: Shortlist, brief: object, mpn: str) -> str:
        return f"Y1, {mpn}, crystal 16 MHz; C1 C2 18 pF"
