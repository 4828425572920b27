"""The app under Pilot at 80×24: editing, alternates, export, find, help, quit, small size."""

from __future__ import annotations

import json
from pathlib import Path

from textual.widgets import Input, Static, TabbedContent

from picker.tui.app import PickerApp
from picker.tui.brief_pane import BriefPane
from picker.tui.help_screen import HelpScreen
from picker.tui.lists import AlternatesView, RuledOutView
from picker.tui.shortlist import ShortlistView


async def settle(app: PickerApp, pilot: object) -> None:
    """Wait for every worker and timer (the 150 ms re-rank debounce) to finish."""
    for _ in range(4):
        await app.workers.wait_for_complete()
        await pilot.pause(0.2)  # type: ignore[attr-defined]
    await app.workers.wait_for_complete()


def gm_input(app: PickerApp) -> Input:
    pane = app.query_one(BriefPane)
    index = next(i for i, f in enumerate(pane._fields) if f.path == ("amplifier", "gm"))
    return app.query_one(f"#brief-field-{index}", Input)


async def type_into(pilot: object, field: Input, text: str) -> None:
    field.focus()
    field.value = ""
    await pilot.press(*text)  # type: ignore[attr-defined]


async def test_editing_gm_reorders_the_shortlist(real_app: PickerApp) -> None:
    async with real_app.run_test(size=(80, 24)) as pilot:
        await settle(real_app, pilot)
        view = real_app.query_one(ShortlistView)
        # At 20 mA/V the low-ESR part leads; at 40 mA/V it sits above gm_opt, its |Rneg|
        # falls, and the next part overtakes it (Vittoz 2010, ch. 3).
        assert list(view.mpns[:2]) == ["TK16-A", "TK16-B"]
        await pilot.press("b")
        await type_into(pilot, gm_input(real_app), "40 mA/V")
        await settle(real_app, pilot)
        assert list(view.mpns[:2]) == ["TK16-B", "TK16-A"]


async def test_selection_is_kept_after_a_rerank(real_app: PickerApp) -> None:
    async with real_app.run_test(size=(80, 24)) as pilot:
        await settle(real_app, pilot)
        view = real_app.query_one(ShortlistView)
        await pilot.press("down")
        assert view.current_mpn() == "TK16-B"
        await pilot.press("b")
        await type_into(pilot, gm_input(real_app), "40 mA/V")
        await settle(real_app, pilot)
        assert view.current_mpn() == "TK16-B"
        assert view.cursor == 0  # it moved to the top, the cursor followed it


async def test_bad_value_shows_on_the_field_and_keeps_the_last_brief(real_app: PickerApp) -> None:
    async with real_app.run_test(size=(80, 24)) as pilot:
        await settle(real_app, pilot)
        before = real_app.brief
        await pilot.press("b")
        field = gm_input(real_app)
        await type_into(pilot, field, "abc")
        await settle(real_app, pilot)
        error = real_app.query_one(f"#{field.id}-error", Static)
        assert "transconductance" in str(error.render())
        assert real_app.brief is before
        assert len(real_app.query_one(ShortlistView).mpns) == 3


async def test_alternates_open_for_the_highlighted_part(real_app: PickerApp) -> None:
    async with real_app.run_test(size=(80, 24)) as pilot:
        await settle(real_app, pilot)
        await pilot.press("a")
        await settle(real_app, pilot)
        tabs = real_app.query_one("#tabs", TabbedContent)
        assert tabs.active == "tab-alternates"
        view = real_app.query_one(AlternatesView)
        # Every other part of the six is listed, the 12 MHz one as incompatible.
        assert view.row_count == 5
        fits = {row.mpn: row.fit for row in real_app.alternates_result.rows}  # type: ignore[union-attr]
        assert fits["MB12-F"] == "incompatible"


async def test_alternates_for_a_typed_part_number(real_app: PickerApp) -> None:
    async with real_app.run_test(size=(80, 24)) as pilot:
        await settle(real_app, pilot)
        await pilot.press("a")
        await settle(real_app, pilot)
        field = real_app.query_one("#alt-reference", Input)
        field.focus()
        field.value = ""
        await pilot.press(*"mb16d", "enter")  # fuzzy: case and the dash do not matter
        await settle(real_app, pilot)
        assert real_app.alternates_result is not None
        assert real_app.alternates_result.reference == "MB16-D"


async def test_export_writes_the_file(real_app: PickerApp, tmp_path: Path) -> None:
    target = tmp_path / "out" / "shortlist.json"
    target.parent.mkdir()
    async with real_app.run_test(size=(80, 24)) as pilot:
        await settle(real_app, pilot)
        real_app.export_now("json", target)
        await settle(real_app, pilot)
    rows = json.loads(target.read_text(encoding="utf-8"))
    assert [r["mpn"] for r in rows] == ["TK16-A", "TK16-B", "MB16-D"]
    # No temporary file is left beside it (written through os.replace).
    assert sorted(p.name for p in target.parent.iterdir()) == ["shortlist.json"]


async def test_export_through_the_dialog_writes_csv(
    real_app: PickerApp, tmp_path: Path, monkeypatch: object
) -> None:
    import os

    os.chdir(tmp_path)
    async with real_app.run_test(size=(80, 24)) as pilot:
        await settle(real_app, pilot)
        await pilot.press("e")
        await pilot.pause()
        await pilot.press("enter")  # default name shortlist.csv in the working folder
        await settle(real_app, pilot)
    text = (tmp_path / "shortlist.csv").read_text(encoding="utf-8")
    assert text.splitlines()[0].startswith("rank,mpn")
    assert "TK16-A" in text


async def test_export_refuses_to_overwrite_an_input_catalog(
    real_app: PickerApp, catalog_files: tuple[Path, Path]
) -> None:
    catalog, _ = catalog_files
    before = catalog.read_bytes()
    async with real_app.run_test(size=(80, 24)) as pilot:
        await settle(real_app, pilot)
        real_app.export_now("csv", catalog)
        await settle(real_app, pilot)
        messages = [n.message for n in real_app._notifications]
    assert catalog.read_bytes() == before
    assert any("refusing to write onto an input file" in m for m in messages)


async def test_find_jumps_to_a_listed_part(real_app: PickerApp) -> None:
    async with real_app.run_test(size=(80, 24)) as pilot:
        await settle(real_app, pilot)
        await pilot.press("slash")
        await pilot.press(*"MB16-D", "enter")
        await settle(real_app, pilot)
        assert real_app.query_one(ShortlistView).current_mpn() == "MB16-D"


async def test_find_jumps_to_a_ruled_out_part(real_app: PickerApp) -> None:
    async with real_app.run_test(size=(80, 24)) as pilot:
        await settle(real_app, pilot)
        await pilot.press("slash")
        await pilot.press(*"MB12-F", "enter")
        await settle(real_app, pilot)
        assert real_app.query_one("#tabs", TabbedContent).active == "tab-ruled-out"
        assert real_app.query_one(RuledOutView).current_mpn() == "MB12-F"
        detail = str(real_app.query_one("#ruled-detail", Static).render())
        assert "12 MHz" in detail  # the reason names the wrong frequency


async def test_ruled_out_rows_get_their_reason_sentences(real_app: PickerApp) -> None:
    async with real_app.run_test(size=(80, 24)) as pilot:
        await settle(real_app, pilot)
        await pilot.press("r")
        await settle(real_app, pilot)
        view = real_app.query_one(RuledOutView)
        lines = [view.render_line(y).text for y in range(1, view.row_count + 1)]
        # The short rule label is replaced by the sentence with the part's own numbers.
        assert any("MB12-F" in line and "12 MHz" in line for line in lines), lines


async def test_ruled_out_filter(real_app: PickerApp) -> None:
    async with real_app.run_test(size=(80, 24)) as pilot:
        await settle(real_app, pilot)
        await pilot.press("r")
        view = real_app.query_one(RuledOutView)
        assert view.row_count == 3
        real_app.query_one("#ruled-filter", Input).focus()
        await pilot.press(*"frequency")
        await settle(real_app, pilot)
        assert view.row_count == 1
        assert view.current_mpn() == "MB12-F"


async def test_help_shows_keys_and_caution(frozen_app: PickerApp) -> None:
    async with frozen_app.run_test(size=(80, 24)) as pilot:
        await settle(frozen_app, pilot)
        await pilot.press("f1")
        await pilot.pause()
        assert isinstance(frozen_app.screen, HelpScreen)
        text = str(frozen_app.screen.query_one("#help-text", Static).render())
        assert "negative-resistance test on the real board" in text
        assert "crystal maker" in text
        assert "local regulations" in text
        await pilot.press("escape")
        await pilot.press("question_mark")
        await pilot.pause()
        assert isinstance(frozen_app.screen, HelpScreen)


async def test_ctrl_q_exits_with_status_zero(frozen_app: PickerApp) -> None:
    async with frozen_app.run_test(size=(80, 24)) as pilot:
        await settle(frozen_app, pilot)
        await pilot.press("ctrl+q")
        await pilot.pause()
    assert frozen_app.return_code == 0


async def test_small_terminal_shows_a_message(frozen_app: PickerApp) -> None:
    async with frozen_app.run_test(size=(40, 10)) as pilot:
        await settle(frozen_app, pilot)
        message = frozen_app.query_one("#too-small", Static)
        assert message.display and message.region.width > 0
        assert "too small" in str(message.render())
        assert frozen_app.query_one("#main").region.width == 0
        await pilot.resize_terminal(80, 24)
        await pilot.pause()
        assert frozen_app.query_one("#main").region.width == 80


async def test_copy_part_number_notifies(frozen_app: PickerApp) -> None:
    async with frozen_app.run_test(size=(80, 24)) as pilot:
        await settle(frozen_app, pilot)
        copied: list[str] = []
        frozen_app.copy_to_clipboard = copied.append  # type: ignore[method-assign]
        await pilot.press("c")
        await pilot.press("m")
        await pilot.pause()
        first = frozen_app.query_one(ShortlistView).current_mpn()
        assert copied[0] == first
        assert copied[1].startswith(f"Y1, {first}")
        messages = [n.message for n in frozen_app._notifications]
        assert any(m == f"Copied part number {first}" for m in messages)


async def test_escape_leaves_a_field_and_letters_switch_tabs_again(real_app: PickerApp) -> None:
    async with real_app.run_test(size=(80, 24)) as pilot:
        await settle(real_app, pilot)
        await pilot.press("b")
        field = gm_input(real_app)
        field.focus()
        await pilot.press("s")  # typed into the field, not a tab switch
        assert field.value.endswith("s")
        await pilot.press("escape", "s")
        assert real_app.query_one("#tabs", TabbedContent).active == "tab-shortlist"
        assert isinstance(real_app.focused, ShortlistView)


async def test_enter_on_a_ruled_out_part_opens_its_sheet(real_app: PickerApp) -> None:
    from picker.tui.sheet import PartSheetView

    async with real_app.run_test(size=(80, 24)) as pilot:
        await settle(real_app, pilot)
        await pilot.press("r")
        view = real_app.query_one(RuledOutView)
        view.cursor = view.index_of("MB12-F") or 0
        await pilot.press("enter")
        await settle(real_app, pilot)
        assert real_app.query_one("#tabs", TabbedContent).active == "tab-sheet"
        sheet = real_app.query_one("#sheet", PartSheetView).sheet
        assert sheet is not None and sheet.mpn == "MB12-F"
        assert sheet.status == "ruled_out" and "12 MHz" in sheet.reasons[0]
        # p brings back the sheet of the highlighted shortlist part.
        await pilot.press("p")
        await settle(real_app, pilot)
        assert real_app.query_one("#sheet", PartSheetView).sheet.mpn == "TK16-A"  # type: ignore[union-attr]


async def test_a_missing_catalog_is_a_message_not_a_crash(tmp_path: Path) -> None:
    from picker.tui.core import PickerCore

    app = PickerApp(PickerCore(), [tmp_path / "missing.csv"], tmp_path / "brief.yaml")
    async with app.run_test(size=(80, 24)) as pilot:
        await settle(app, pilot)
        text = str(app.query_one("#loading-text", Static).render())
        assert "missing.csv" in text and "ctrl+q" in text
        await pilot.press("s", "a", "/", "e", "c")  # nothing to act on: nothing breaks
        await pilot.press("ctrl+q")
    assert app.return_code == 0


async def test_a_broken_brief_opens_on_the_brief_with_the_error(
    catalog_files: tuple[Path, Path], monkeypatch: object
) -> None:
    from picker.tui.core import PickerCore

    catalog, brief = catalog_files
    brief.write_text(brief.read_text().replace("gm: 20 mA/V", "gm: 20 parsecs"))
    app = PickerApp(PickerCore(), [catalog], brief)
    async with app.run_test(size=(80, 24)) as pilot:
        await settle(app, pilot)
        assert app.query_one("#tabs", TabbedContent).active == "tab-brief"
        assert any("amplifier.gm" in n.message for n in app._notifications)
        # Fixing the field in place brings the shortlist.
        await type_into(pilot, gm_input(app), "20 mA/V")
        await settle(app, pilot)
        assert list(app.query_one(ShortlistView).mpns[:1]) == ["TK16-A"]


async def test_wide_terminal_shows_the_sheet_beside_the_list(real_app: PickerApp) -> None:
    from picker.tui.sheet import PartSheetView

    async with real_app.run_test(size=(160, 40)) as pilot:
        await settle(real_app, pilot)
        side = real_app.query_one("#side-sheet", PartSheetView)
        assert side.region.width > 40
        assert side.sheet is not None and side.sheet.mpn == "TK16-A"
        await pilot.press("down")
        await settle(real_app, pilot)
        assert side.sheet.mpn == "TK16-B"  # type: ignore[union-attr]
        await pilot.resize_terminal(100, 30)
        await pilot.pause()
        assert side.region.width == 0
