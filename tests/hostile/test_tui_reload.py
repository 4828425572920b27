"""The terminal UI under Pilot: a catalog that turns bad, hostile briefs, and exports.

The app offers no reload action (no key, no palette entry); the one path that (re)reads
the catalog is the ``load_everything`` worker that mounting runs, so these tests run it
again after the catalog file was replaced with garbage, the way a reload would.
"""

from __future__ import annotations

import csv
import io
import os
import random
from pathlib import Path

import pytest
from textual.widgets import Static

from picker.tui.app import PickerApp
from picker.tui.core import PickerCore
from picker.tui.shortlist import ShortlistView
from tests.hostile.conftest import BRIEF_TEXT, GOOD_ROWS, bounded, part_row, write_catalog


async def settle(app: PickerApp, pilot: object) -> None:
    """Wait for every worker and the re-rank debounce timer."""
    for _ in range(3):
        await app.workers.wait_for_complete()
        await pilot.pause(0.1)  # type: ignore[attr-defined]
    await app.workers.wait_for_complete()


def _visible_text(app: PickerApp) -> str:
    """Text a user can see now: displayed Static widgets of the screen, and notifications."""
    shown = [
        str(widget.render())
        for widget in app.screen.query(Static)
        if all(getattr(node, "display", True) for node in widget.ancestors_with_self)
    ]
    notes = [n.message for n in app._notifications]
    return "\n".join(shown + notes)


@pytest.fixture
def files(tmp_path: Path, monkeypatch: pytest.MonkeyPatch) -> tuple[Path, Path]:
    monkeypatch.setenv("PICKER_CACHE_DIR", str(tmp_path / "cache"))
    folder = tmp_path / "corpus"
    folder.mkdir()
    catalog = write_catalog(folder, "parts.csv", GOOD_ROWS)
    brief = folder / "brief.yaml"
    brief.write_text(BRIEF_TEXT, encoding="utf-8")
    return catalog, brief


@pytest.mark.parametrize(
    "garbage",
    [
        random.Random(11).randbytes(4096),  # seeded random generator: binary junk
        b"",  # emptied
    ],
    ids=["binary", "emptied"],
)
async def test_catalog_turned_bad_keeps_the_app_running(
    files: tuple[Path, Path], garbage: bytes
) -> None:
    catalog, brief = files
    app = PickerApp(PickerCore(), [catalog], brief)
    with bounded(60):
        async with app.run_test(size=(80, 24)) as pilot:
            await settle(app, pilot)
            assert len(app.query_one(ShortlistView).mpns) == len(GOOD_ROWS)
            catalog.write_bytes(garbage)
            app.load_everything()  # what a reload would run
            await settle(app, pilot)
            assert app.is_running
            assert app.return_code is None
            # The user is told, naming the file; the old shortlist is still there.
            assert "parts.csv" in _visible_text(app)
            assert len(app.query_one(ShortlistView).mpns) == len(GOOD_ROWS)
            await pilot.press("s", "down", "p")  # still answers keys
            await settle(app, pilot)
            assert app.is_running


async def test_catalog_with_bad_rows_loads_the_good_ones(files: tuple[Path, Path]) -> None:
    catalog, brief = files
    write_catalog(catalog.parent, "parts.csv", [*GOOD_ROWS, part_row("QN-BAD", esr="16 MHz")])
    app = PickerApp(PickerCore(), [catalog], brief)
    with bounded(60):
        async with app.run_test(size=(80, 24)) as pilot:
            await settle(app, pilot)
            assert len(app.query_one(ShortlistView).mpns) == len(GOOD_ROWS)
            assert any("catalog problem" in n.message for n in app._notifications)
            assert app.loaded is not None
            assert any("parts.csv:6: esr" in p for p in app.loaded.problems)


@pytest.mark.parametrize(
    "brief_text",
    [
        'a: &a ["x","x","x","x","x","x","x","x","x"]\n'
        + "".join(
            f"{c}: &{c} [" + ",".join([f"*{chr(ord(c) - 1)}"] * 9) + "]\n" for c in "bcdefghi"
        ),
        "frequency: " + "[" * 10_000 + "]" * 10_000 + "\n",
        "frequency: 16 MHz\nbudget: -5 ppm\namplifier:\n  gm: 20 mA/V\n",
    ],
    ids=["alias bomb", "10k nested", "negative budget"],
)
async def test_hostile_brief_keeps_the_app_running(
    files: tuple[Path, Path], brief_text: str
) -> None:
    catalog, brief = files
    brief.write_text(brief_text, encoding="utf-8")
    app = PickerApp(PickerCore(), [catalog], brief)
    with bounded(60):
        async with app.run_test(size=(80, 24)) as pilot:
            await settle(app, pilot)
            assert app.is_running
            assert app.loaded is not None, "the catalog never finished loading"
            messages = [n.message for n in app._notifications]
            assert any("brief" in m for m in messages), messages
            assert not any("Internal error" in str(n.title) for n in app._notifications)


async def test_export_from_the_app_refuses_the_catalog_and_neutralises_formulas(
    files: tuple[Path, Path],
) -> None:
    catalog, brief = files
    write_catalog(
        catalog.parent, "parts.csv", [*GOOD_ROWS, part_row("=HYPERLINK(1)"), part_row("@SUM(1)")]
    )
    before = catalog.read_bytes()
    target = catalog.parent / "shortlist.csv"
    app = PickerApp(PickerCore(), [catalog], brief)
    with bounded(60):
        async with app.run_test(size=(80, 24)) as pilot:
            await settle(app, pilot)
            app.export_now("csv", catalog)
            await settle(app, pilot)
            assert any("refusing" in n.message for n in app._notifications)
            assert catalog.read_bytes() == before
            app.export_now("csv", target)
            await settle(app, pilot)
            assert app.is_running
    rows = list(csv.reader(io.StringIO(target.read_text(encoding="utf-8"))))
    cells = [cell for row in rows for cell in row]
    assert "'=HYPERLINK(1)" in cells and "'@SUM(1)" in cells
    assert not any(cell.startswith(("=", "@", "+")) for cell in cells)


async def test_opening_hostile_briefs_and_saving_onto_the_catalog(
    files: tuple[Path, Path],
) -> None:
    catalog, brief = files
    folder = catalog.parent
    endless = folder / "endless.yaml"
    endless.symlink_to("/dev/zero")
    pipe = folder / "pipe.yaml"
    os.mkfifo(pipe)
    binary = folder / "binary.yaml"
    binary.write_bytes(random.Random(5).randbytes(2000))  # seeded random generator
    before = catalog.read_bytes()
    app = PickerApp(PickerCore(), [catalog], brief)
    with bounded(60):
        async with app.run_test(size=(80, 24)) as pilot:
            await settle(app, pilot)
            for hostile in (endless, pipe, binary, folder, folder / "missing.yaml"):
                app.open_brief(hostile)
                await settle(app, pilot)
                assert app.is_running
                assert app.brief_path == brief  # the good brief stays in use
                assert any(hostile.name in n.message for n in app._notifications), hostile
            app._save_brief_to(str(catalog))  # what the save dialog does with that path
            await settle(app, pilot)
            assert any("refusing" in n.message for n in app._notifications)
            assert catalog.read_bytes() == before
            assert len(app.query_one(ShortlistView).mpns) == len(GOOD_ROWS)
