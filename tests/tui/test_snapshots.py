"""SVG snapshots at 80×24 and 120×40 with frozen data (tests/tui/frozen_core.py).

Regenerate after a deliberate change with `pytest tests/tui --snapshot-update` and look at
the report before committing.
"""

from __future__ import annotations

from pathlib import Path

import pytest

from picker.tui.app import PickerApp
from tests.tui.frozen_core import FrozenCore


def frozen(tmp_path: Path) -> PickerApp:
    return PickerApp(FrozenCore(problems=()), [Path("frozen.csv")], Path("no-brief.yaml"))


async def ready(pilot) -> None:  # type: ignore[no-untyped-def]
    for _ in range(3):
        await pilot.app.workers.wait_for_complete()
        await pilot.pause(0.1)


@pytest.mark.parametrize("size", [(80, 24), (120, 40)])
def test_shortlist(snap_compare, tmp_path: Path, size: tuple[int, int]) -> None:  # type: ignore[no-untyped-def]
    assert snap_compare(frozen(tmp_path), terminal_size=size, run_before=ready)


@pytest.mark.parametrize("size", [(80, 24), (120, 40)])
def test_part_sheet(snap_compare, tmp_path: Path, size: tuple[int, int]) -> None:  # type: ignore[no-untyped-def]
    async def run_before(pilot) -> None:  # type: ignore[no-untyped-def]
        await ready(pilot)
        await pilot.press("p")
        await ready(pilot)

    assert snap_compare(frozen(tmp_path), terminal_size=size, run_before=run_before)


@pytest.mark.parametrize("size", [(80, 24), (120, 40)])
def test_brief(snap_compare, tmp_path: Path, size: tuple[int, int]) -> None:  # type: ignore[no-untyped-def]
    async def run_before(pilot) -> None:  # type: ignore[no-untyped-def]
        await ready(pilot)
        await pilot.press("b")
        await ready(pilot)

    assert snap_compare(frozen(tmp_path), terminal_size=size, run_before=run_before)


def test_ruled_out(snap_compare, tmp_path: Path) -> None:  # type: ignore[no-untyped-def]
    async def run_before(pilot) -> None:  # type: ignore[no-untyped-def]
        await ready(pilot)
        await pilot.press("r")
        await ready(pilot)

    assert snap_compare(frozen(tmp_path), terminal_size=(80, 24), run_before=run_before)


def test_help(snap_compare, tmp_path: Path) -> None:  # type: ignore[no-untyped-def]
    async def run_before(pilot) -> None:  # type: ignore[no-untyped-def]
        await ready(pilot)
        await pilot.press("f1")
        await ready(pilot)

    assert snap_compare(frozen(tmp_path), terminal_size=(80, 24), run_before=run_before)


def test_too_small(snap_compare, tmp_path: Path) -> None:  # type: ignore[no-untyped-def]
    assert snap_compare(frozen(tmp_path), terminal_size=(50, 12), run_before=ready)


def test_alternates(snap_compare, tmp_path: Path) -> None:  # type: ignore[no-untyped-def]
    async def run_before(pilot) -> None:  # type: ignore[no-untyped-def]
        await ready(pilot)
        await pilot.press("a")
        await ready(pilot)

    assert snap_compare(frozen(tmp_path), terminal_size=(80, 24), run_before=run_before)
