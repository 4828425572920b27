"""ctrl+r reloads the catalog: new rows appear, a broken file keeps the last good catalog."""

from __future__ import annotations

from pathlib import Path

from picker.tui.app import PickerApp
from picker.tui.shortlist import ShortlistView
from tests.tui.test_app import gm_input, settle, type_into

# Invented part, a copy of TK16-A's figures under a new number (no real brand or part).
EXTRA_ROW = (
    "TK16-Z,Tarnwick,16 MHz,8 pF,10 ppm,10 ppm,-40,85,40 ohm,3225,1.5 pF,4 fF,200 uW,2 ppm,"
    "0.30,5000,active\n"
)


async def test_ctrl_r_reloads_and_keeps_the_last_good_catalog(
    real_app: PickerApp, catalog_files: tuple[Path, Path]
) -> None:
    catalog, _ = catalog_files
    good = catalog.read_text(encoding="utf-8")
    async with real_app.run_test(size=(80, 24)) as pilot:
        await settle(real_app, pilot)
        assert real_app.loaded is not None
        before = len(real_app.loaded.parts)
        # An edit on screen that is not saved must survive the reload.
        await pilot.press("b")
        await type_into(pilot, gm_input(real_app), "33 mA/V")
        await settle(real_app, pilot)
        await pilot.press("escape", "s")
        catalog.write_text(good + EXTRA_ROW, encoding="utf-8")
        await pilot.press("ctrl+r")
        await settle(real_app, pilot)
        assert len(real_app.loaded.parts) == before + 1
        assert "TK16-Z" in list(real_app.query_one(ShortlistView).mpns)
        assert real_app.brief.amplifier.gm_s == 33e-3  # type: ignore[attr-defined]
        assert any("Reloaded" in n.message for n in real_app._notifications)
        listed = list(real_app.query_one(ShortlistView).mpns)

        catalog.write_bytes(b"\x00\xff" * 300)  # not a catalog any more
        await pilot.press("ctrl+r")
        await settle(real_app, pilot)
        assert real_app.is_running and real_app.return_code is None
        assert any(
            "parts.csv" in n.message and "last catalog" in n.message
            for n in real_app._notifications
        )
        assert len(real_app.loaded.parts) == before + 1
        assert list(real_app.query_one(ShortlistView).mpns) == listed
        await pilot.press("down", "c")  # the keys still answer
        await settle(real_app, pilot)
        assert real_app.is_running


async def test_reload_is_in_the_palette_and_the_help(real_app: PickerApp) -> None:
    async with real_app.run_test(size=(80, 24)) as pilot:
        await settle(real_app, pilot)
        assert ("Reload catalog", "read the catalog files again, keep the brief", "reload") in (
            real_app.command_list()
        )
        assert any(key == "ctrl+r" for key, _ in real_app.key_list())
