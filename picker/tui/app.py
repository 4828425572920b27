"""The picker terminal UI: brief, shortlist, part sheet, ruled out, alternates.

The app only orchestrates: every figure comes from a `Core` (picker.tui.model), the same
functions the command line uses. Slow work (loading, ranking, one part's sheet,
alternates, exports) runs in thread workers so the keyboard never waits.
"""

from __future__ import annotations

import sys
from collections.abc import Sequence
from pathlib import Path
from typing import ClassVar

import pandas as pd
from textual import on, work
from textual.app import App, ComposeResult
from textual.binding import Binding, BindingType
from textual.containers import Horizontal, Vertical
from textual.events import Resize
from textual.timer import Timer
from textual.widgets import (
    Footer,
    Input,
    LoadingIndicator,
    ProgressBar,
    Select,
    Static,
    TabbedContent,
    TabPane,
)
from textual.worker import Worker, WorkerState, get_current_worker

from picker.tui.brief_pane import BriefPane
from picker.tui.commands import PickerCommands
from picker.tui.dialogs import ExportDialog, FindDialog, PathDialog
from picker.tui.export import ExportError, brief_yaml, write_atomic
from picker.tui.filtering import filter_rows
from picker.tui.help_screen import HelpScreen
from picker.tui.lists import AlternatesView, RuledOutView, fit_cells
from picker.tui.model import Alternates, Core, Loaded, PartSheet, Preset, Shortlist
from picker.tui.rows import RowList
from picker.tui.sheet import PartSheetView
from picker.tui.shortlist import ShortlistView, status_cells

MIN_WIDTH = 60
MIN_HEIGHT = 16
WIDE_WIDTH = 150
"""From this terminal width on, the shortlist tab shows the part sheet beside the list."""
RERANK_DELAY_S = 0.15
"""Debounce between the last brief keystroke and the re-rank [s]."""

TABS = (
    ("tab-brief", "Brief"),
    ("tab-shortlist", "Shortlist"),
    ("tab-sheet", "Part sheet"),
    ("tab-ruled-out", "Ruled out"),
    ("tab-alternates", "Alternates"),
)


class PickerApp(App[int]):
    """Keyboard-first crystal picker over one catalog and one brief."""

    TITLE = "picker"
    CSS_PATH = "picker.tcss"
    COMMANDS: ClassVar = {PickerCommands}
    ENABLE_COMMAND_PALETTE = True

    BINDINGS: ClassVar[list[BindingType]] = [
        Binding("f1,question_mark", "help", "Help", id="picker.help"),
        Binding("slash", "find", "Find", id="picker.find"),
        Binding("b", "tab('tab-brief')", "Brief", id="picker.brief", show=False),
        Binding("s", "tab('tab-shortlist')", "Shortlist", id="picker.shortlist", show=False),
        Binding("p", "sheet", "Part sheet", id="picker.sheet", show=False),
        Binding("r", "tab('tab-ruled-out')", "Ruled out", id="picker.ruled_out", show=False),
        Binding("a", "alternates", "Alternates", id="picker.alternates"),
        Binding("e", "export", "Export", id="picker.export"),
        Binding("c", "copy_part", "Copy", id="picker.copy_part"),
        Binding("m", "copy_bom", "Copy BOM line", id="picker.copy_bom", show=False),
        Binding("ctrl+s", "save_brief", "Save brief", id="picker.save_brief", show=False),
        Binding("ctrl+o", "open_brief", "Open brief", id="picker.open_brief", show=False),
        Binding("ctrl+r", "reload", "Reload catalog", id="picker.reload", show=False),
        Binding("escape", "leave_field", "Leave field", id="picker.leave_field", show=False),
        Binding("ctrl+q", "quit_app", "Quit", id="picker.quit", priority=True),
    ]

    def __init__(
        self,
        core: Core,
        catalog_paths: Sequence[Path],
        brief_path: Path,
        mapping: Path | None = None,
        *,
        protected: Sequence[Path] = (),
    ) -> None:
        super().__init__()
        self.core = core
        self.catalog_paths = tuple(Path(p) for p in catalog_paths)
        self.brief_path = Path(brief_path)
        self.mapping = mapping
        self.protected = tuple(protected)
        self.loaded: Loaded | None = None
        self.brief: object = None
        self.shortlist: Shortlist | None = None
        self.alternates_result: Alternates | None = None
        self._ruled_out_view: pd.DataFrame | None = None
        self._ruled_source: Shortlist | None = None
        self._rerank_timer: Timer | None = None
        self._filter_timer: Timer | None = None
        self._presets: tuple[Preset, ...] = ()
        self._detail_text = ""
        self._sheet_request: str | None = None

    # ----------------------------------------------------------------- layout
    def compose(self) -> ComposeResult:
        with Vertical(id="main"):
            yield Static("picker — loading…", id="status-line", markup=False)
            with Vertical(id="loading"):
                yield Static("Reading the catalog…", id="loading-text", markup=False)
                yield ProgressBar(total=100, show_eta=False, id="loading-bar")
                yield LoadingIndicator()
            with TabbedContent(initial="tab-shortlist", id="tabs"):
                with TabPane("Brief (b)", id="tab-brief"):
                    yield BriefPane(self.core, id="brief")
                with (
                    TabPane("Shortlist (s)", id="tab-shortlist"),
                    Horizontal(id="shortlist-row"),
                ):
                    with Vertical(id="shortlist-column"):
                        yield ShortlistView(id="shortlist")
                        yield Static("", id="shortlist-detail", markup=False)
                    # On wide terminals the sheet of the highlighted part sits beside the
                    # list, so both are read at once.
                    yield PartSheetView(id="side-sheet")
                with TabPane("Part sheet (p)", id="tab-sheet"):
                    yield PartSheetView(id="sheet")
                with TabPane("Ruled out (r)", id="tab-ruled-out"):
                    yield Input(
                        placeholder="filter: part number or reason words",
                        id="ruled-filter",
                        compact=True,
                    )
                    yield RuledOutView(id="ruled-out")
                    yield Static("", id="ruled-detail", markup=False)
                with TabPane("Alternates (a)", id="tab-alternates"):
                    yield Input(
                        placeholder="reference part number (fuzzy), enter",
                        id="alt-reference",
                        compact=True,
                    )
                    yield Static("", id="alt-note", markup=False)
                    yield AlternatesView(id="alternates")
                    yield Static("", id="alt-detail", markup=False)
        yield Static("", id="too-small", markup=False)
        yield Footer(compact=True)

    def on_mount(self) -> None:
        self.query_one("#tabs", TabbedContent).display = False
        self._check_size(self.size.width, self.size.height)
        self.load_everything()

    def on_resize(self, event: Resize) -> None:
        self._check_size(event.size.width, event.size.height)

    def _check_size(self, width: int, height: int) -> None:
        small = width < MIN_WIDTH or height < MIN_HEIGHT
        self.screen.set_class(small, "-too-small")
        self.screen.set_class(width >= WIDE_WIDTH, "-wide")
        if small:
            self.query_one("#too-small", Static).update(
                f"Terminal too small ({width}×{height}).\n"
                f"picker needs at least {MIN_WIDTH}×{MIN_HEIGHT}; 80×24 or larger is best.\n"
                "Enlarge the window, or press ctrl+q to quit."
            )

    # ---------------------------------------------------------------- loading
    @work(thread=True, exclusive=True, group="load", exit_on_error=False)
    def load_everything(self) -> None:
        bar = self.query_one("#loading-bar", ProgressBar)

        def progress(fraction: float) -> None:
            self.call_from_thread(bar.update, progress=100.0 * fraction)

        try:
            loaded = self.core.load(self.catalog_paths, self.mapping, progress)
        except (ValueError, OSError) as error:
            self.call_from_thread(self._load_failed, str(error))
            return
        self.call_from_thread(self._set_loading_text, "Ranking the catalog…")
        data, brief, brief_error = self._read_brief(self.brief_path)
        shortlist = None
        if brief is not None:
            shortlist = self.core.rank(loaded.parts, brief)
        self.call_from_thread(self._loaded, loaded, data, brief, brief_error, shortlist)

    def action_reload(self) -> None:
        """Read the catalog files again; the brief on screen (edits included) is kept."""
        if self.loaded is None:
            return  # the first load is still running (or failed and says so)
        self._update_status("reloading the catalog…")
        self.reload_catalog(self.brief)

    @work(thread=True, exclusive=True, group="load", exit_on_error=False)
    def reload_catalog(self, brief: object) -> None:
        try:
            loaded = self.core.load(self.catalog_paths, self.mapping, None)
        except (ValueError, OSError) as error:
            self.call_from_thread(self._load_failed, str(error))
            self.call_from_thread(self._update_status)
            return
        shortlist = None if brief is None else self.core.rank(loaded.parts, brief)
        if not get_current_worker().is_cancelled:
            self.call_from_thread(self._reloaded, loaded, shortlist)

    def _reloaded(self, loaded: Loaded, shortlist: Shortlist | None) -> None:
        self.loaded = loaded
        problems = f"; {len(loaded.problems)} problem(s)" if loaded.problems else ""
        self.notify(
            f"✔ Reloaded {len(loaded.parts):,} parts from {len(loaded.files)} file(s){problems}",
            title="Catalog",
            severity="warning" if loaded.problems else "information",
        )
        if shortlist is not None:
            self._show_ranking(shortlist)
        else:
            self._update_status()

    def _read_brief(self, path: Path) -> tuple[dict[str, object], object, str]:
        try:
            data = self.core.read_brief(path)
        except (ValueError, OSError) as error:
            return {}, None, str(error)
        try:
            return data, self.core.check_brief(data), ""
        except ValueError as error:
            return data, None, str(error)

    def _set_loading_text(self, text: str) -> None:
        self.query_one("#loading-text", Static).update(text)

    def _load_failed(self, message: str) -> None:
        if self.loaded is not None:
            # A reload after a good load: the loading panel is hidden, so say it aloud and
            # keep showing the last good catalog.
            self.notify(
                f"✘ {message}\nThe last catalog that loaded is still shown.",
                title="Catalog",
                severity="error",
                timeout=10,
            )
            return
        self._set_loading_text(f"✘ {message}\n\nNothing could be loaded; press ctrl+q to quit.")
        self.query_one(LoadingIndicator).display = False
        self.query_one("#status-line", Static).update("picker — no catalog")

    def _loaded(
        self,
        loaded: Loaded,
        data: dict[str, object],
        brief: object,
        brief_error: str,
        shortlist: Shortlist | None,
    ) -> None:
        self.loaded = loaded
        self.brief = brief
        self._presets = self.core.presets()
        self.query_one("#loading").display = False
        tabs = self.query_one("#tabs", TabbedContent)
        tabs.display = True
        self.run_worker(
            self.query_one(BriefPane).show(data, self.brief_path.name), group="brief-pane"
        )
        if loaded.problems:
            first = loaded.problems[0]
            self.notify(
                f"{len(loaded.problems)} catalog problem(s), good rows loaded. First: "
                f"{first}\n(ctrl+p → Show catalog problems)",
                title="Catalog",
                severity="warning",
                timeout=6,
            )
        if shortlist is not None:
            self._show_ranking(shortlist)
            self.query_one(ShortlistView).focus()
        else:
            tabs.active = "tab-brief"
            self.notify(f"The brief is not usable yet: {brief_error}", severity="error", timeout=10)
        self._update_status()

    # ---------------------------------------------------------------- ranking
    @on(BriefPane.Valid)
    def _brief_valid(self, event: BriefPane.Valid) -> None:
        self.brief = event.brief
        if self._rerank_timer is not None:
            self._rerank_timer.stop()
        self._rerank_timer = self.set_timer(RERANK_DELAY_S, self._rerank)

    @on(BriefPane.Invalid)
    def _brief_invalid(self, event: BriefPane.Invalid) -> None:
        self._update_status(f"✘ brief: {event.message}")

    def _rerank(self) -> None:
        if self.loaded is not None and self.brief is not None:
            self._update_status(f"re-ranking {len(self.loaded.parts):,} parts…")
            self.rank_now(self.loaded.parts, self.brief)

    @work(thread=True, exclusive=True, group="rank", exit_on_error=False)
    def rank_now(self, parts: pd.DataFrame, brief: object) -> None:
        shortlist = self.core.rank(parts, brief)
        # A newer edit started a newer ranking: this one must not overwrite it.
        if not get_current_worker().is_cancelled:
            self.call_from_thread(self._show_ranking, shortlist)

    def _show_ranking(self, shortlist: Shortlist) -> None:
        self.shortlist = shortlist
        view = self.query_one(ShortlistView)
        view.show(shortlist, keep=view.current_mpn())
        if self._sheet_request is not None:
            self.load_sheet(self._sheet_request)
        self._apply_ruled_filter()
        self._update_status()

    def _update_status(self, extra: str = "") -> None:
        parts = 0 if self.loaded is None else len(self.loaded.parts)
        name = str(getattr(self.brief, "name", None) or self.brief_path.name)
        if self.shortlist is None:
            counts = "not ranked"
        else:
            counts = (
                f"{len(self.shortlist.rows):,} listed · {len(self.shortlist.ruled_out):,} ruled out"
            )
        text = extra or f"{name} · {counts} · {parts:,} parts"
        self.query_one("#status-line", Static).update(text)

    # ---------------------------------------------------------- highlighting
    @on(RowList.Highlighted, "#shortlist")
    def _shortlist_moved(self, event: RowList.Highlighted) -> None:
        view = self.query_one(ShortlistView)
        mpn = view.current_mpn()
        detail = self.query_one("#shortlist-detail", Static)
        if mpn is None or self.shortlist is None:
            detail.update("")
            for sheet_view in self.query(PartSheetView):
                sheet_view.show_message("No part is listed for this brief.")
            return
        row = self.shortlist.rows.iloc[view.cursor]
        status, _ = status_cells(str(row["status"]))
        self._detail_text = (
            f"{status.strip()} {mpn}: margin {row['margin']:.3g} "
            f"(≥ {row['margin_required']:.3g}), "
            f"gain {row['gain_margin']:.3g}, {row['total_ppm']:.3g} of "
            f"{self.shortlist.budget_ppm:.4g} ppm · enter: sheet"
        )
        detail.update(self._detail_text)
        if self._sheet_request is None:
            self.load_sheet(mpn)

    @work(thread=True, exclusive=True, group="sheet", exit_on_error=False)
    def load_sheet(self, mpn: str) -> None:
        if self.loaded is None or self.shortlist is None:
            return
        sheet = self.core.sheet(self.loaded.parts, self.shortlist, self.brief, mpn)
        if not get_current_worker().is_cancelled:
            self.call_from_thread(self._show_sheet, sheet)

    def _show_sheet(self, sheet: PartSheet) -> None:
        self.query_one("#sheet", PartSheetView).show(sheet)
        if sheet.mpn == self.query_one(ShortlistView).current_mpn():
            self.query_one("#side-sheet", PartSheetView).show(sheet)
        if sheet.mpn == self.query_one(ShortlistView).current_mpn() and sheet.reasons:
            # Say why a marginal part is marginal right under the list.
            self.query_one("#shortlist-detail", Static).update(
                f"{self._detail_text}\n  {sheet.reasons[0]}"
            )

    @on(RowList.Highlighted, "#ruled-out")
    def _ruled_moved(self, event: RowList.Highlighted) -> None:
        view = self.query_one(RuledOutView)
        key = view.current_key()
        detail = self.query_one("#ruled-detail", Static)
        if key is None or self.shortlist is None:
            detail.update("")
            return
        reasons = self.core.reasons_at(self.shortlist, key)
        detail.update(
            f"{view.current_mpn()} is ruled out:\n" + "\n".join(f"  ✘ {r}" for r in reasons)
        )

    @on(RowList.Highlighted, "#alternates")
    def _alternate_moved(self, event: RowList.Highlighted) -> None:
        row = self.query_one(AlternatesView).current()
        detail = self.query_one("#alt-detail", Static)
        if row is None:
            detail.update("")
            return
        label, _ = fit_cells(row.fit)
        lines = [f"{label.strip()}: {row.mpn}"] + [f"  · {d}" for d in row.differences]
        detail.update("\n".join(lines))

    def on_key(self, event: object) -> None:
        if getattr(event, "key", "") != "enter":
            return
        focused = self.focused
        if isinstance(focused, ShortlistView) and focused.row_count:
            self.action_sheet()
        elif isinstance(focused, RuledOutView | AlternatesView) and focused.row_count:
            # Any listed part can have its sheet, also one that is ruled out.
            mpn = self._highlighted_mpn()
            if mpn is not None:
                self.action_sheet(mpn)

    def action_sheet(self, mpn: str | None = None) -> None:
        """Open the part sheet: for `mpn`, else for the highlighted shortlist part."""
        self._sheet_request = mpn
        wanted = mpn or self.query_one(ShortlistView).current_mpn()
        shown = self.query_one("#sheet", PartSheetView).sheet
        if wanted is not None and (shown is None or shown.mpn != wanted):
            self.load_sheet(wanted)
        self.action_tab("tab-sheet")

    # --------------------------------------------------------------- ruled out
    @on(Input.Changed, "#ruled-filter")
    def _ruled_filter_changed(self, event: Input.Changed) -> None:
        if self._filter_timer is not None:
            self._filter_timer.stop()
        self._filter_timer = self.set_timer(RERANK_DELAY_S, self._apply_ruled_filter)

    def _apply_ruled_filter(self) -> None:
        if self.shortlist is not None:
            text = self.query_one("#ruled-filter", Input).value
            self.filter_ruled_out(self.shortlist, text)

    @work(thread=True, exclusive=True, group="filter", exit_on_error=False)
    def filter_ruled_out(self, shortlist: Shortlist, text: str) -> None:
        frame = filter_rows(shortlist.ruled_out, text, ("mpn", "package", "first_reason"))
        if not get_current_worker().is_cancelled:
            self.call_from_thread(self._show_ruled_out, frame)

    def _show_ruled_out(self, frame: pd.DataFrame) -> None:
        same = self._ruled_out_view is not None and self.shortlist is self._ruled_source
        self._ruled_out_view = frame
        self._ruled_source = self.shortlist
        self.query_one(RuledOutView).show(frame, same_ranking=same)

    @on(RuledOutView.NeedReasons)
    def _reasons_wanted(self, event: RuledOutView.NeedReasons) -> None:
        if self.shortlist is not None:
            self.write_reasons(event.view, self.shortlist, event.keys)

    @work(thread=True, group="reasons", exit_on_error=False)
    def write_reasons(
        self, view: RuledOutView, shortlist: Shortlist, keys: tuple[int, ...]
    ) -> None:
        sentences = {}
        for key in keys:
            reasons = self.core.reasons_at(shortlist, key)
            sentences[key] = reasons[0] if reasons else ""
        if shortlist is self.shortlist:
            self.call_from_thread(view.add_reasons, sentences)

    # -------------------------------------------------------------- alternates
    def action_alternates(self) -> None:
        if self.loaded is None:
            return
        mpn = self._highlighted_mpn()
        self.action_tab("tab-alternates")
        if mpn is not None:
            self.query_one("#alt-reference", Input).value = mpn
            self.show_alternates_for(mpn)
        else:
            self.query_one("#alt-reference", Input).focus()

    @on(Input.Submitted, "#alt-reference")
    def _alt_submitted(self, event: Input.Submitted) -> None:
        if event.value.strip():
            self.show_alternates_for(event.value.strip())

    def show_alternates_for(self, text: str) -> None:
        """Compare every part against `text` (fuzzy part number) in a worker."""
        self.query_one("#alt-note", Static).update(f"Comparing every part against '{text}'…")
        self.find_alternates(text)

    @work(thread=True, exclusive=True, group="alternates", exit_on_error=False)
    def find_alternates(self, text: str) -> None:
        if self.loaded is None:
            return
        try:
            result = self.core.alternates(self.loaded.parts, text, self.brief)
        except ValueError as error:
            self.call_from_thread(self._alternates_failed, str(error))
            return
        self.call_from_thread(self._show_alternates, result)

    def _alternates_failed(self, message: str) -> None:
        self.query_one("#alt-note", Static).update(f"✘ {message}")
        self.query_one(AlternatesView).show(())

    def _show_alternates(self, result: Alternates) -> None:
        self.alternates_result = result
        self.query_one("#alt-note", Static).update(
            f"Alternates for {result.reference}, closest first. {result.note}".strip()
        )
        view = self.query_one(AlternatesView)
        view.show(result.rows)
        view.focus()

    # -------------------------------------------------------------------- find
    def action_find(self) -> None:
        if self.loaded is None:
            return
        self.push_screen(FindDialog(), self._found)

    @on(FindDialog.Typed)
    def _find_typed(self, event: FindDialog.Typed) -> None:
        if event.text.strip():
            self.match_preview(event.dialog, event.text.strip())

    @work(thread=True, exclusive=True, group="find", exit_on_error=False)
    def match_preview(self, dialog: FindDialog, text: str) -> None:
        if self.loaded is None:
            return
        match = self.core.match(self.loaded.parts, text)
        names = ([match.mpn] if match.mpn else []) + [c for c in match.candidates if c != match.mpn]
        preview = "  ".join(names[:6]) if names else "no close part number"
        self.call_from_thread(dialog.show_candidates, f"→ {preview}")

    def _found(self, text: str | None) -> None:
        if text and self.loaded is not None:
            self.jump_to(text)

    @work(thread=True, exclusive=True, group="find", exit_on_error=False)
    def jump_to(self, text: str) -> None:
        if self.loaded is None:
            return
        match = self.core.match(self.loaded.parts, text)
        self.call_from_thread(self._jump, text, match.mpn, match.candidates, match.note)

    def _jump(self, text: str, mpn: str | None, candidates: tuple[str, ...], note: str) -> None:
        if mpn is None:
            closest = ", ".join(candidates[:5]) or "none"
            self.notify(
                f"No part number matches '{text}' clearly. Closest: {closest}", severity="warning"
            )
            return
        if note:
            self.notify(note)
        view = self.query_one(ShortlistView)
        index = view.index_of(mpn)
        if index is not None:
            self.action_tab("tab-shortlist")
            view.cursor = index
            return
        self.query_one("#ruled-filter", Input).value = ""
        if self.shortlist is not None:
            self._show_ruled_out(self.shortlist.ruled_out)
            ruled = self.query_one(RuledOutView)
            position = ruled.index_of(mpn)
            if position is not None:
                self.action_tab("tab-ruled-out")
                ruled.cursor = position
                self.notify(f"{mpn} is ruled out for this brief; its reasons are below.")
                return
        self.notify(f"{mpn} is in the catalog but not ranked.", severity="warning")

    # ------------------------------------------------------------------ export
    def action_export(self) -> None:
        if self.shortlist is None:
            self.notify("Nothing to export yet.", severity="warning")
            return
        self.push_screen(ExportDialog(), self._export_chosen)

    def _export_chosen(self, choice: tuple[str, str] | None) -> None:
        if choice is not None:
            self.export_now(choice[0], Path(choice[1]))

    def input_files(self) -> tuple[Path, ...]:
        """Files the app must never write onto: catalogs, the mapping, protected briefs."""
        files = list(self.catalog_paths) + list(self.protected)
        if self.loaded is not None:
            files += list(self.loaded.files)
        if self.mapping is not None:
            files.append(self.mapping)
        return tuple(files)

    @work(thread=True, exclusive=True, group="export", exit_on_error=False)
    def export_now(self, format_name: str, path: Path) -> None:
        if self.loaded is None or self.shortlist is None:
            return
        try:
            text, count = self.core.export_text(
                self.loaded.parts, self.shortlist, self.brief, format_name
            )
            written = write_atomic(path, text, [*self.input_files(), self.brief_path])
        except (ExportError, OSError, ValueError) as error:
            self.call_from_thread(self.notify, f"✘ {error}", title="Export", severity="error")
            return
        self.call_from_thread(self.notify, f"✔ Wrote {count:,} parts to {written}", title="Export")

    # ------------------------------------------------------------------- brief
    def action_save_brief(self) -> None:
        suggestion = (
            self.brief_path if self.brief_path not in self.protected else Path("brief.yaml")
        )
        self.push_screen(
            PathDialog(
                "Save the brief as YAML",
                str(suggestion),
                "enter saves (atomically), escape cancels",
            ),
            self._save_brief_to,
        )

    def _save_brief_to(self, text: str | None) -> None:
        if not text:
            return
        data = self.query_one(BriefPane).data
        try:
            written = write_atomic(Path(text), brief_yaml(data), self.input_files())
        except ExportError as error:
            self.notify(f"✘ {error}", title="Save brief", severity="error")
            return
        self.brief_path = written
        self.notify(f"✔ Brief saved to {written}", title="Save brief")

    def action_open_brief(self) -> None:
        self.push_screen(
            PathDialog("Open a brief (YAML)", str(self.brief_path)), self._open_brief_from
        )

    def _open_brief_from(self, text: str | None) -> None:
        if text:
            self.open_brief(Path(text))

    @work(thread=True, exclusive=True, group="brief", exit_on_error=False)
    def open_brief(self, path: Path) -> None:
        data, brief, error = self._read_brief(path)
        if not data and error:
            self.call_from_thread(self.notify, f"✘ {error}", title="Open brief", severity="error")
            return
        self.call_from_thread(self._brief_opened, path, data, brief, error)

    def _brief_opened(self, path: Path, data: dict[str, object], brief: object, error: str) -> None:
        self.brief_path = path
        self.run_worker(self.query_one(BriefPane).show(data, path.name), group="brief-pane")
        if brief is None:
            self.notify(f"✘ {error}", title="Open brief", severity="error")
            self.action_tab("tab-brief")
            return
        self.brief = brief
        self._rerank()

    def action_preset(self, name: str) -> None:
        self.action_tab("tab-brief")
        self.query_one(BriefPane).apply_preset(name)

    # ------------------------------------------------------------------- copy
    def _highlighted_mpn(self) -> str | None:
        tabs = self.query_one("#tabs", TabbedContent)
        if tabs.active == "tab-ruled-out":
            return self.query_one(RuledOutView).current_mpn()
        if tabs.active == "tab-alternates":
            row = self.query_one(AlternatesView).current()
            return row.mpn if row else None
        return self.query_one(ShortlistView).current_mpn()

    def action_copy_part(self) -> None:
        mpn = self._highlighted_mpn()
        if mpn is None:
            self.notify("No part highlighted.", severity="warning")
            return
        self.copy_to_clipboard(mpn)
        self.notify(f"Copied part number {mpn}", title="Clipboard")

    def action_copy_bom(self) -> None:
        mpn = self._highlighted_mpn()
        if mpn is None or self.loaded is None or self.shortlist is None:
            self.notify("No part highlighted.", severity="warning")
            return
        line = self.core.bom_line(self.loaded.parts, self.shortlist, self.brief, mpn)
        self.copy_to_clipboard(line)
        self.notify("Copied BOM line: " + line.replace("\t", " · "), title="Clipboard")

    # -------------------------------------------------------------- navigation
    def action_tab(self, tab_id: str) -> None:
        tabs = self.query_one("#tabs", TabbedContent)
        if not tabs.display:
            return  # still loading: nothing to show yet
        tabs.active = tab_id
        focus_target = {
            "tab-brief": "#brief",
            "tab-shortlist": "#shortlist",
            "tab-sheet": "#sheet",
            "tab-ruled-out": "#ruled-out",
            "tab-alternates": "#alternates",
        }[tab_id]
        targets = self.query(focus_target)
        if targets:
            self.set_focus(targets.first())

    @on(TabbedContent.TabActivated)
    def _tab_activated(self, event: TabbedContent.TabActivated) -> None:
        if event.pane.id == "tab-sheet":
            mpn = self._sheet_request or self.query_one(ShortlistView).current_mpn()
            sheet = self.query_one("#sheet", PartSheetView).sheet
            if mpn is not None and (sheet is None or sheet.mpn != mpn):
                self.load_sheet(mpn)

    def action_leave_field(self) -> None:
        """Escape: leave a text field for the list (or pane) of the same tab."""
        if isinstance(self.focused, Input | Select):
            tabs = self.query_one("#tabs", TabbedContent)
            target = {
                "tab-brief": "#brief",
                "tab-ruled-out": "#ruled-out",
                "tab-alternates": "#alternates",
            }.get(str(tabs.active), "#shortlist")
            self.set_focus(self.query(target).first())

    def command_list(self) -> list[tuple[str, str, str]]:
        """(title, help, action) for the command palette and the help page."""
        return [
            ("Help", "keys, what each figure means, the caution", "help"),
            ("Find part number", "fuzzy search; jumps to the part", "find"),
            ("Show brief", "edit the circuit and its limits", "tab('tab-brief')"),
            ("Show shortlist", "ranked parts that fit", "tab('tab-shortlist')"),
            ("Show part sheet", "every figure for the highlighted part", "sheet"),
            ("Show ruled out", "every failed part with its reasons", "tab('tab-ruled-out')"),
            ("Alternates for highlighted part", "drop-in candidates", "alternates"),
            ("Export shortlist", "CSV, JSON or Markdown file", "export"),
            ("Copy part number", "to the clipboard (OSC 52)", "copy_part"),
            ("Copy BOM line", "part, caps and note to the clipboard", "copy_bom"),
            ("Save brief", "write the brief as YAML", "save_brief"),
            ("Open brief", "read another brief", "open_brief"),
            ("Reload catalog", "read the catalog files again, keep the brief", "reload"),
            ("Show catalog problems", "rows that did not load, and warnings", "problems"),
            ("Quit", "leave picker (status 0)", "quit_app"),
        ]

    def preset_list(self) -> tuple[Preset, ...]:
        return self._presets

    def key_list(self) -> list[tuple[str, str]]:
        keys = [
            ("F1, ?", "this help"),
            ("/", "find a part number (fuzzy) and jump to it"),
            ("b s p r", "brief, shortlist, part sheet, ruled out"),
            ("a", "alternates for the highlighted part"),
            ("↑ ↓ PgUp PgDn", "move in a list (also j, k, Home, End)"),
            ("enter", "on any list: the part sheet of that part (also ruled-out ones)"),
            ("e", "export the shortlist (CSV, JSON, Markdown)"),
            ("c", "copy the part number to the clipboard"),
            ("m", "copy a bill-of-materials line"),
            ("ctrl+s", "save the brief (YAML)"),
            ("ctrl+o", "open another brief"),
            ("ctrl+r", "reload the catalog files (the last good one stays on failure)"),
            ("ctrl+p", "command palette: every action and the interface presets"),
            ("escape", "leave a text field"),
            ("ctrl+q", "quit"),
        ]
        return keys

    def action_help(self) -> None:
        if not isinstance(self.screen, HelpScreen):
            self.push_screen(HelpScreen(self.key_list()))

    def action_problems(self) -> None:
        problems = () if self.loaded is None else self.loaded.problems
        text = "\n".join(problems) if problems else "The catalog loaded without problems."
        self.push_screen(HelpScreen([], title="Catalog problems", body=text))

    def action_quit_app(self) -> None:
        self.exit(0)

    # ----------------------------------------------------------------- errors
    def on_worker_state_changed(self, event: Worker.StateChanged) -> None:
        if event.state == WorkerState.ERROR and event.worker.error is not None:
            error = event.worker.error
            self.notify(
                f"✘ {type(error).__name__}: {error}",
                title="Internal error",
                severity="error",
                timeout=10,
            )


def run_app(
    catalog_paths: Sequence[str | Path], brief_path: str | Path, mapping: str | Path | None = None
) -> int:
    """Open the UI on the given catalogs and brief; returns the exit status (0 on ctrl+q)."""
    from picker.tui.core import PickerCore, bundled_briefs

    app = PickerApp(
        PickerCore(),
        [Path(p) for p in catalog_paths],
        Path(brief_path),
        None if mapping is None else Path(mapping),
        protected=bundled_briefs(),
    )
    try:
        code = app.run()
    except KeyboardInterrupt:
        return 130
    if app.return_code not in (None, 0):
        print(f"picker: the terminal UI stopped (status {app.return_code})", file=sys.stderr)
    return int(code or 0) if app.return_code in (None, 0) else int(app.return_code or 1)
