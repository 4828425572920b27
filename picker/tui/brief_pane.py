"""The brief pane: every field of the brief editable in place, checked as you type."""

from __future__ import annotations

from collections.abc import Mapping

from textual import on
from textual.app import ComposeResult
from textual.containers import Horizontal, Vertical, VerticalScroll
from textual.message import Message
from textual.widget import Widget
from textual.widgets import Input, Label, Select, Static

from picker.tui.brief_fields import (
    READ_ONLY_NOTE,
    field_for_error,
    field_value,
    flatten_brief,
    with_value,
)
from picker.tui.model import BriefField, Core, Preset


def preset_label(preset: Preset) -> str:
    """ "USB 2.0 full-speed — ±2500 ppm" (or the note that the budget is derived)."""
    budget = "budget from the brief" if preset.budget_ppm is None else f"±{preset.budget_ppm:g} ppm"
    return f"{preset.title} — {budget}"


def _input_id(index: int) -> str:
    return f"brief-field-{index}"


class BriefPane(VerticalScroll, can_focus=True):
    """One labelled Input per leaf of the brief; the last valid brief is kept.

    Posts `BriefPane.Valid` when the edited brief parses, `BriefPane.Invalid` otherwise.
    """

    DEFAULT_CSS = """
    BriefPane { height: 1fr; padding: 0 1; }
    BriefPane .brief-row { height: 1; }
    BriefPane .brief-label { width: 24; color: $text-muted; }
    BriefPane .brief-section { height: 1; text-style: bold; margin-top: 1; }
    BriefPane .brief-row Input { width: 1fr; }
    BriefPane .brief-error { color: $error; height: auto; padding-left: 24; }
    BriefPane .brief-error.-empty { display: none; }
    BriefPane .brief-note { color: $text-muted; height: auto; padding-left: 24; }
    BriefPane #brief-status { height: auto; color: $text-muted; }
    BriefPane #brief-status.-bad { color: $error; }
    BriefPane #brief-preset { width: 1fr; }
    BriefPane #brief-fields { height: auto; }
    BriefPane #brief-clause { height: auto; color: $text-muted; padding-left: 24; }
    """

    class Valid(Message):
        def __init__(self, data: dict[str, object], brief: object) -> None:
            super().__init__()
            self.data = data
            self.brief = brief

    class Invalid(Message):
        def __init__(self, message: str) -> None:
            super().__init__()
            self.message = message

    def __init__(self, core: Core, *, id: str | None = None) -> None:
        super().__init__(id=id)
        self._core = core
        self._data: dict[str, object] = {}
        self._fields: list[BriefField] = []
        self._presets: tuple[Preset, ...] = ()
        self._loading = False
        self.path_label = ""

    def compose(self) -> ComposeResult:
        yield Static("", id="brief-status")
        with Horizontal(classes="brief-row"):
            yield Label("interface preset", classes="brief-label")
            yield Select[str](
                [], prompt="(none: budget from the brief)", id="brief-preset", compact=True
            )
        yield Static("", id="brief-clause", markup=False)
        yield Vertical(id="brief-fields")

    @property
    def data(self) -> dict[str, object]:
        return self._data

    async def show(self, data: Mapping[str, object], path_label: str) -> None:
        """Replace every field with the values of a freshly opened brief."""
        self._data = dict(data)
        self.path_label = path_label
        self._loading = True
        container = self.query_one("#brief-fields", Vertical)
        await container.remove_children()
        self._fields = []
        rows: list[Widget] = []
        section: tuple[str, ...] = ()
        for index, (brief_field, text) in enumerate(flatten_brief(self._data)):
            self._fields.append(brief_field)
            unit_hint = f" [{brief_field.dimension}]" if brief_field.dimension else ""
            parent = brief_field.path[:-1]
            if parent and parent != section:
                rows.append(Static(".".join(parent), classes="brief-section", markup=False))
            section = parent
            indent = "  " if parent else ""
            rows.append(
                Horizontal(
                    Label(indent + brief_field.path[-1], classes="brief-label", markup=False),
                    Input(
                        text,
                        id=_input_id(index),
                        compact=True,
                        select_on_focus=False,
                        tooltip=f"{brief_field.meaning}{unit_hint}",
                        placeholder=brief_field.meaning,
                        disabled=brief_field.read_only,
                    ),
                    classes="brief-row",
                )
            )
            if brief_field.read_only:
                rows.append(Static(f"ⓘ {READ_ONLY_NOTE}", classes="brief-note", markup=False))
            rows.append(Static("", classes="brief-error -empty", id=f"{_input_id(index)}-error"))
        await container.mount_all(rows)
        self._presets = self._core.presets()
        select = self.query_one("#brief-preset", Select)
        select.set_options([(preset_label(p), p.name) for p in self._presets])
        preset = self._data.get("preset")
        if isinstance(preset, str) and any(p.name == preset for p in self._presets):
            select.value = preset
        self._show_clause(preset if isinstance(preset, str) else None)
        self._set_status(
            f"Brief {path_label}: tab into a field and edit it (escape leaves); "
            "ctrl+s saves, ctrl+o opens another.",
            bad=False,
        )
        self.call_after_refresh(self._done_loading)

    def _done_loading(self) -> None:
        self._loading = False

    def _set_status(self, text: str, *, bad: bool) -> None:
        status = self.query_one("#brief-status", Static)
        status.update(text)
        status.set_class(bad, "-bad")

    def _set_error(self, index: int, message: str) -> None:
        error = self.query_one(f"#{_input_id(index)}-error", Static)
        error.update(f"✘ {message}" if message else "")
        error.set_class(not message, "-empty")

    def _clear_errors(self) -> None:
        for index in range(len(self._fields)):
            self._set_error(index, "")

    @on(Input.Changed)
    def _field_changed(self, event: Input.Changed) -> None:
        event.stop()
        if self._loading or not event.input.id or not event.input.id.startswith("brief-field-"):
            return
        index = int(event.input.id.removeprefix("brief-field-"))
        brief_field = self._fields[index]
        if brief_field.read_only:
            return  # kept exactly as read; a one-line edit would garble the table
        value = field_value(brief_field, event.value)
        if brief_field.dimension and value is not None:
            texts = value if isinstance(value, list) else [value]
            for item in texts:
                try:
                    self._core.check_value(brief_field.dimension, str(item))
                except ValueError as error:
                    self._set_error(index, str(error))
                    self.post_message(self.Invalid(f"{brief_field.label}: {error}"))
                    return
        self._set_error(index, "")
        self._try(with_value(self._data, brief_field.path, value))

    @on(Select.Changed, "#brief-preset")
    def _preset_changed(self, event: Select.Changed) -> None:
        event.stop()
        if self._loading:
            return
        data = dict(self._data)
        self._show_clause(None if event.value is Select.NULL else str(event.value))
        if event.value is Select.NULL:
            data.pop("preset", None)
            self._set_input(("preset",), "")
        else:
            data["preset"] = str(event.value)
            self._set_input(("preset",), data["preset"])
            preset = next(p for p in self._presets if p.name == event.value)
            # An explicit budget would override the preset; the preset's own figure replaces it.
            if preset.budget_ppm is None:
                # The preset derives the budget from data in the brief (CAN bit timing).
                data.pop("budget", None)
                self._set_input(("budget",), "")
            else:
                data["budget"] = f"{preset.budget_ppm:g} ppm"
                self._set_input(("budget",), data["budget"])
        self._try(data)

    def _show_clause(self, name: str | None) -> None:
        """Cite where the preset's budget comes from, right under the choice."""
        preset = next((p for p in self._presets if p.name == name), None)
        text = "" if preset is None else f"source: {preset.clause}"
        clause = self.query_one("#brief-clause", Static)
        clause.update(text)
        clause.display = bool(text)

    def _set_input(self, path: tuple[str, ...], text: object) -> None:
        for index, brief_field in enumerate(self._fields):
            if brief_field.path == path:
                field_input = self.query_one(f"#{_input_id(index)}", Input)
                with field_input.prevent(Input.Changed):
                    field_input.value = str(text)

    def _try(self, data: dict[str, object]) -> None:
        try:
            brief = self._core.check_brief(data)
        except ValueError as error:
            message = str(error)
            labels = [f.label for f in self._fields]
            label = field_for_error(message, labels)
            if label is not None:
                self._set_error(labels.index(label), message)
            self._set_status(f"✘ {message} — the last valid brief is still in use.", bad=True)
            self.post_message(self.Invalid(message))
            return
        self._data = data
        self._clear_errors()
        self._set_status(f"✔ Brief {self.path_label} is valid — shortlist re-ranked.", bad=False)
        self.post_message(self.Valid(data, brief))

    def apply_preset(self, name: str) -> None:
        """Choose an interface preset (from the command palette)."""
        self.query_one("#brief-preset", Select).value = name
