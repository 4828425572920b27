"""Saving and opening briefs from the UI; the command palette lists every action."""

from __future__ import annotations

from pathlib import Path

from textual.widgets import Input

from picker.brief import load_brief
from picker.tui.app import PickerApp
from picker.tui.commands import PickerCommands
from picker.tui.dialogs import PathDialog
from picker.tui.shortlist import ShortlistView
from tests.tui.test_app import gm_input, settle, type_into


async def answer_path_dialog(app: PickerApp, pilot: object, path: Path) -> None:
    assert isinstance(app.screen, PathDialog)
    field = app.screen.query_one(Input)
    field.value = str(path)
    await pilot.press("enter")  # type: ignore[attr-defined]
    await settle(app, pilot)


async def test_save_brief_writes_yaml_that_loads_back(real_app: PickerApp, tmp_path: Path) -> None:
    target = tmp_path / "saved.yaml"
    async with real_app.run_test(size=(80, 24)) as pilot:
        await settle(real_app, pilot)
        await pilot.press("b")
        await type_into(pilot, gm_input(real_app), "33 mA/V")
        await settle(real_app, pilot)
        await pilot.press("escape")
        await pilot.press("ctrl+s")
        await pilot.pause()
        await answer_path_dialog(real_app, pilot, target)
    brief = load_brief(target)
    assert brief.amplifier.gm_s == 33e-3
    assert brief.board.stray_capacitance_f == 2e-12
    assert sorted(p.name for p in tmp_path.iterdir() if p.name.startswith(".")) == []


async def test_save_brief_refuses_a_catalog_file(
    real_app: PickerApp, catalog_files: tuple[Path, Path]
) -> None:
    catalog, _ = catalog_files
    before = catalog.read_bytes()
    async with real_app.run_test(size=(80, 24)) as pilot:
        await settle(real_app, pilot)
        await pilot.press("ctrl+s")
        await pilot.pause()
        await answer_path_dialog(real_app, pilot, catalog)
        messages = [n.message for n in real_app._notifications]
    assert catalog.read_bytes() == before
    assert any("refusing to write onto an input file" in m for m in messages)


async def test_open_another_brief_reranks(real_app: PickerApp, tmp_path: Path) -> None:
    other = tmp_path / "faster.yaml"
    text = (Path(__file__).parent / "data" / "brief.yaml").read_text(encoding="utf-8")
    other.write_text(text.replace("gm: 20 mA/V", "gm: 40 mA/V"), encoding="utf-8")
    async with real_app.run_test(size=(80, 24)) as pilot:
        await settle(real_app, pilot)
        view = real_app.query_one(ShortlistView)
        assert list(view.mpns[:2]) == ["TK16-A", "TK16-B"]
        await pilot.press("ctrl+o")
        await pilot.pause()
        await answer_path_dialog(real_app, pilot, other)
        assert real_app.brief_path == other
        assert list(view.mpns[:2]) == ["TK16-B", "TK16-A"]


async def test_opening_a_missing_brief_is_one_line(real_app: PickerApp, tmp_path: Path) -> None:
    async with real_app.run_test(size=(80, 24)) as pilot:
        await settle(real_app, pilot)
        before = real_app.brief
        await pilot.press("ctrl+o")
        await pilot.pause()
        await answer_path_dialog(real_app, pilot, tmp_path / "missing.yaml")
        messages = [n.message for n in real_app._notifications]
        assert real_app.brief is before
        assert any("missing.yaml" in m and "\n" not in m for m in messages)


async def test_palette_offers_every_action_and_preset(frozen_app: PickerApp) -> None:
    async with frozen_app.run_test(size=(80, 24)) as pilot:
        await settle(frozen_app, pilot)
        provider = PickerCommands(frozen_app.screen)
        titles = [hit.text async for hit in provider.discover()]
        actions = [action for _, _, action in frozen_app.command_list()]
        assert len(titles) == len(actions) + len(frozen_app.preset_list())
        assert "Export shortlist" in titles and "Preset: USB full-speed" in titles
        # Every listed action exists on the app.
        for action in actions:
            name = action.split("(")[0]
            assert callable(getattr(frozen_app, f"action_{name}")), action
        hits = [hit.text async for hit in provider.search("export")]
        assert hits and hits[0] == "Export shortlist"


async def test_choosing_a_preset_sets_the_budget(real_app: PickerApp) -> None:
    # USB 2.0 §7.1.11: full-speed data rate ±0.25 % = ±2500 ppm.
    async with real_app.run_test(size=(80, 24)) as pilot:
        await settle(real_app, pilot)
        real_app.action_preset("usb_fs")
        await settle(real_app, pilot)
        assert real_app.brief.budget_ppm == 2500.0  # type: ignore[attr-defined]
        assert real_app.shortlist is not None and real_app.shortlist.budget_ppm == 2500.0


async def test_the_preset_clause_is_cited_on_screen(real_app: PickerApp) -> None:
    from textual.widgets import Static

    async with real_app.run_test(size=(80, 24)) as pilot:
        await settle(real_app, pilot)
        real_app.action_preset("100base_tx")
        await settle(real_app, pilot)
        clause = str(real_app.query_one("#brief-clause", Static).render())
        # IEEE 802.3 clauses 24–25: 100BASE-TX ±50 ppm.
        assert "IEEE 802.3" in clause
        assert real_app.brief.budget_ppm == 50.0  # type: ignore[attr-defined]
