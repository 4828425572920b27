"""The UI adapter shows the core's numbers: same figures as `picker analyze --format json`,
checked against the published Pierce formula, and a million rows stay cheap to show."""

from __future__ import annotations

import io
import json
import math
import time
from pathlib import Path

import numpy as np
import pandas as pd
import pytest

from picker.tui.app import PickerApp
from picker.tui.core import PickerCore
from picker.tui.model import Shortlist
from picker.tui.shortlist import ShortlistView


@pytest.fixture
def ranked(catalog_files: tuple[Path, Path], monkeypatch: pytest.MonkeyPatch):  # type: ignore[no-untyped-def]
    monkeypatch.setenv("PICKER_NO_CACHE", "1")
    catalog, brief_path = catalog_files
    core = PickerCore()
    loaded = core.load([catalog], None, None)
    brief = core.check_brief(core.read_brief(brief_path))
    return core, loaded, brief, core.rank(loaded.parts, brief)


def analyze_json(catalog: Path, brief: Path, mpn: str) -> dict[str, object]:
    from picker.cli import main

    out = io.StringIO()
    import contextlib

    with contextlib.redirect_stdout(out):
        code = main(
            ["analyze", mpn, "--catalog", str(catalog), "--brief", str(brief), "--format", "json"]
        )
    assert code == 0
    return json.loads(out.getvalue())  # type: ignore[no-any-return]


def test_shortlist_figures_equal_the_cli_json(ranked, catalog_files) -> None:  # type: ignore[no-untyped-def]
    _, _, _, shortlist = ranked
    catalog, brief = catalog_files
    for _, row in shortlist.rows.iterrows():
        obj = analyze_json(catalog, brief, str(row["mpn"]))
        assert obj["status"] == row["status"]
        assert row["margin"] == pytest.approx(obj["negative_resistance_margin"], rel=1e-12)
        assert row["gain_margin"] == pytest.approx(obj["gain_margin"], rel=1e-12)
        assert row["total_ppm"] == pytest.approx(obj["error_ppm"]["total"], rel=1e-12)  # type: ignore[index]


def test_margin_matches_the_lossless_pierce_formula(ranked) -> None:  # type: ignore[no-untyped-def]
    # Vittoz, Degrauwe & Bitz, IEEE JSSC 23(3), 1988: without losses
    # Re(Zc) = −gm·Cg·Cd / ((gm·C3)² + ω²·(Cg·Cd + C3·(Cg+Cd))²), Cg = Ca + Cpin,
    # Cd = Cb + Cpin, C3 = C0 + stray. The test brief has no output or bias resistance.
    _core, _loaded, _brief, shortlist = ranked
    for mpn in shortlist.rows["mpn"]:
        row = shortlist.ranking.row(mpn)  # type: ignore[attr-defined]
        cg = row["cap_a_f"] + 1.5e-12
        cd = row["cap_b_f"] + 1.5e-12
        c3 = row["c0_f"] + 2e-12
        omega = 2 * math.pi * 16e6
        gm = 20e-3
        rneg = -gm * cg * cd / ((gm * c3) ** 2 + omega**2 * (cg * cd + c3 * (cg + cd)) ** 2)
        margin = abs(rneg) / row["esr_ohm"]
        shown = shortlist.rows.loc[shortlist.rows["mpn"] == mpn, "margin"].iloc[0]
        assert shown == pytest.approx(margin, rel=1e-6)


def test_part_sheet_carries_provenance_and_caution_figures(ranked) -> None:  # type: ignore[no-untyped-def]
    core, loaded, brief, shortlist = ranked
    sheet = core.sheet(loaded.parts, shortlist, brief, "TK16-A")
    sources = {f.label: f.source for f in sheet.figures}
    assert sources["ESR (R1 max)"] == "catalog"
    assert sources["gm"] == "brief"
    assert sources["margin |Rneg|/R1"] == "computed"
    assert dict(sheet.budget)["total"] == pytest.approx(
        shortlist.rows.set_index("mpn").loc["TK16-A", "total_ppm"]
    )
    # Bench plan: (M − 1)·R1 in series for M = 5 and R1 = 40 Ω is 160 Ω.
    assert "160 Ω" in sheet.bench[1]
    # |Z| is smallest at fs and largest at fp (Butterworth–Van Dyke model, IEC 60444-1).
    z = sheet.impedance
    assert z is not None
    assert z.frequency_hz[np.argmin(z.magnitude_ohm)] == pytest.approx(z.fs_hz, rel=2e-6)
    assert z.frequency_hz[np.argmax(z.magnitude_ohm)] == pytest.approx(z.fp_hz, rel=2e-6)
    assert z.fs_hz < z.fl_hz < z.fp_hz


def test_ruled_out_labels_name_the_first_failed_rule(ranked) -> None:  # type: ignore[no-untyped-def]
    core, _, _, shortlist = ranked
    labels = dict(zip(shortlist.ruled_out["mpn"], shortlist.ruled_out["first_reason"], strict=True))
    assert labels["MB12-F"] == "frequency differs"
    assert labels["MB16-E"] == "rated range too narrow"
    key = int(shortlist.ruled_out.set_index("mpn").loc["MB12-F", "key"])
    assert "12 MHz" in core.reasons_at(shortlist, key)[0]


def million_row_shortlist() -> Shortlist:
    n = 1_000_000
    rng = np.random.default_rng(7)  # a seeded random generator: the same rows every run
    rows = pd.DataFrame(
        {
            "mpn": np.char.add("PX-", np.arange(n).astype(str)).astype(object),
            "status": np.where(rng.random(n) < 0.5, "fit", "marginal").astype(object),
            "score": rng.random(n),
            "package": np.full(n, "3225", dtype=object),
            "spec_cl_f": np.full(n, 12e-12),
            "esr_ohm": rng.uniform(20, 100, n),
            "margin": rng.uniform(5, 20, n),
            "margin_required": np.full(n, 5.0),
            "gain_margin": rng.uniform(5, 30, n),
            "total_ppm": rng.uniform(10, 50, n),
            "headroom_ppm": rng.uniform(0, 40, n),
        }
    )
    ruled = pd.DataFrame({"key": [], "mpn": [], "package": [], "first_reason": []})
    return Shortlist(rows, ruled, 50.0, 5.0, None)


async def test_a_million_rows_render_only_what_is_visible() -> None:
    from textual.app import App, ComposeResult

    class One(App[None]):
        def compose(self) -> ComposeResult:
            yield ShortlistView(id="list")

    app = One()
    async with app.run_test(size=(80, 24)) as pilot:
        view = app.query_one(ShortlistView)
        shortlist = million_row_shortlist()
        calls: list[int] = []
        original = view.row_cells

        def counting(index: int, width: int):  # type: ignore[no-untyped-def]
            calls.append(index)
            return original(index, width)

        view.row_cells = counting  # type: ignore[method-assign]
        start = time.perf_counter()
        view.show(shortlist)
        await pilot.pause()
        for key in ("end", "pageup", "home", "pagedown"):
            await pilot.press(key)
            await pilot.pause()
        elapsed = time.perf_counter() - start
        assert view.cursor == view.size.height - 2  # home, then one page down
        # Only rows on screen were formatted: a few screens of 23 rows, not a million.
        assert len(set(calls)) < 200
        assert max(calls) == 999_999
        assert elapsed < 5.0


async def test_the_app_keeps_its_selection_when_the_part_stays(frozen_app: PickerApp) -> None:
    async with frozen_app.run_test(size=(80, 24)) as pilot:
        for _ in range(3):
            await frozen_app.workers.wait_for_complete()
            await pilot.pause(0.1)
        view = frozen_app.query_one(ShortlistView)
        await pilot.press("down", "down")
        chosen = view.current_mpn()
        assert frozen_app.shortlist is not None
        view.show(frozen_app.shortlist, keep=chosen)
        assert view.current_mpn() == chosen
        view.show(frozen_app.shortlist, keep="NOT-LISTED")
        assert view.cursor == 0


def test_max_esr_form_shows_the_ranked_ratio(catalog_files, monkeypatch) -> None:  # type: ignore[no-untyped-def]
    # With a chip ESR table the figure ranked on is allowed ESR / ESR against 1 (DESIGN §6);
    # TK16-A (CL 8 pF, ESR 40 Ω) against a flat 100 Ω table: 100 / 40 = 2.5.
    monkeypatch.setenv("PICKER_NO_CACHE", "1")
    catalog, brief_path = catalog_files
    core = PickerCore()
    loaded = core.load([catalog], None, None)
    data = core.read_brief(brief_path)
    amplifier = dict(data["amplifier"])  # type: ignore[call-overload]
    amplifier.pop("gm")
    amplifier["max_esr"] = {"6 pF": "100 ohm", "20 pF": "100 ohm"}
    data["amplifier"] = amplifier
    shortlist = core.rank(loaded.parts, core.check_brief(data))
    row = shortlist.rows.set_index("mpn").loc["TK16-A"]
    assert row["margin"] == pytest.approx(2.5)
    assert row["margin_required"] == 1.0
