"""Keystroke-to-shortlist time of the real terminal UI, driven headless by Textual's Pilot.

One keystroke edits the brief's amplifier gm (a digit typed at the start of the field, then
deleted again, so each press is a real, valid change); the clock stops when the shortlist
view has been refilled with the new ranking and the screen has been repainted.
"""

from __future__ import annotations

import asyncio
import os
import statistics
import time
from pathlib import Path
from typing import Any

#: Brief field the benchmark edits (the brief pane's key path).
GM_PATH = ("amplifier", "gm")


async def _until(pilot: Any, condition: Any, *, timeout: float, step: float = 0.002) -> bool:
    deadline = time.perf_counter() + timeout
    while not condition():
        if time.perf_counter() > deadline:
            return False
        await pilot.pause(step)
    return True


async def keystroke_to_shortlist(
    csv: str | Path, cache: str | Path, repeats: int
) -> tuple[dict[str, float], float]:
    """Run the app on ``csv``; figures of ``repeats`` keystrokes and the time to first list.

    Returns ({"median_s", "best_s", "work_median_s"}, startup seconds). ``work_median_s``
    leaves out the app's debounce: it runs from the moment the re-rank starts.
    """
    os.environ["PICKER_CACHE_DIR"] = str(cache)
    from textual.widgets import Input, TabbedContent

    from bench.probe import bench_brief_path
    from picker.tui.app import PickerApp
    from picker.tui.brief_pane import BriefPane
    from picker.tui.core import PickerCore

    app = PickerApp(PickerCore(), [Path(csv)], bench_brief_path())
    shown: list[float] = []
    started: list[float] = []
    original_show = app._show_ranking
    original_rerank = app._rerank

    def show(shortlist: Any) -> None:
        original_show(shortlist)
        shown.append(time.perf_counter())

    def rerank() -> None:
        started.append(time.perf_counter())
        original_rerank()

    app._show_ranking = show  # type: ignore[method-assign]
    app._rerank = rerank  # type: ignore[method-assign]
    begin = time.perf_counter()
    totals: list[float] = []
    work: list[float] = []
    async with app.run_test(size=(100, 32)) as pilot:
        if not await _until(pilot, lambda: app.shortlist is not None, timeout=300, step=0.05):
            raise RuntimeError("the shortlist never appeared")
        await pilot.pause()
        startup = time.perf_counter() - begin
        app.query_one("#tabs", TabbedContent).active = "tab-brief"
        await pilot.pause()
        pane = app.query_one(BriefPane)
        index = next(i for i, f in enumerate(pane._fields) if tuple(f.path) == GM_PATH)
        field = app.query_one(f"#brief-field-{index}", Input)
        field.focus()
        await pilot.pause()
        for attempt in range(repeats):
            keys = ("home", "1") if attempt % 2 == 0 else ("home", "delete")
            await pilot.press(keys[0])
            before = len(shown)
            start = time.perf_counter()
            await pilot.press(keys[1])
            if not await _until(pilot, lambda before=before: len(shown) > before, timeout=60):
                raise RuntimeError(f"no re-rank after editing gm to {field.value!r}")
            await pilot.pause()  # let the refilled list repaint
            end = time.perf_counter()
            totals.append(end - start)
            work.append(end - started[-1])
            await pilot.pause(0.3)  # let a late timer or worker settle before the next key
    return (
        {
            "median_s": statistics.median(totals),
            "best_s": min(totals),
            "work_median_s": statistics.median(work),
        },
        startup,
    )


if __name__ == "__main__":  # manual check: python -m bench.tui_timing CSV
    import sys

    print(asyncio.run(keystroke_to_shortlist(sys.argv[1], "/tmp/picker-bench-tui", 5)))
