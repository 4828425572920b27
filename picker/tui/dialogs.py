"""Small modal dialogs: a file path, an export target, a part-number search."""

from __future__ import annotations

from typing import ClassVar

from textual import on
from textual.app import ComposeResult
from textual.binding import Binding, BindingType
from textual.containers import Vertical
from textual.message import Message
from textual.screen import ModalScreen
from textual.widgets import Input, Label, Select, Static

from picker.tui.model import EXPORT_FORMATS

DIALOG_CSS = """
{name} {{ align: center middle; }}
{name} > Vertical {{
    width: 90%; max-width: 76; height: auto;
    border: round $accent; background: $surface; padding: 0 1;
}}
{name} Label {{ width: 1fr; }}
{name} .dialog-hint {{ color: $text-muted; }}
{name} .dialog-error {{ color: $error; }}
"""


class PathDialog(ModalScreen[str | None]):
    """Ask for a file path; enter accepts, escape cancels."""

    DEFAULT_CSS = DIALOG_CSS.format(name="PathDialog")
    BINDINGS: ClassVar[list[BindingType]] = [
        Binding("escape", "cancel", "Cancel", id="dialog.cancel"),
    ]

    def __init__(self, title: str, value: str = "", hint: str = "") -> None:
        super().__init__()
        self._title, self._value, self._hint = title, value, hint

    def compose(self) -> ComposeResult:
        with Vertical():
            yield Label(self._title)
            yield Input(self._value, id="dialog-path", compact=True)
            yield Static(self._hint or "enter accepts, escape cancels", classes="dialog-hint")

    @on(Input.Submitted)
    def _submitted(self, event: Input.Submitted) -> None:
        event.stop()
        self.dismiss(event.value.strip() or None)

    def action_cancel(self) -> None:
        self.dismiss(None)


class ExportDialog(ModalScreen[tuple[str, str] | None]):
    """Choose a format and a file for the shortlist export."""

    DEFAULT_CSS = DIALOG_CSS.format(name="ExportDialog")
    BINDINGS: ClassVar[list[BindingType]] = [
        Binding("escape", "cancel", "Cancel", id="dialog.cancel"),
    ]

    def __init__(self, stem: str = "shortlist") -> None:
        super().__init__()
        self._stem = stem

    def compose(self) -> ComposeResult:
        with Vertical():
            yield Label("Export the shortlist")
            yield Select(
                [(f.name, f.name) for f in EXPORT_FORMATS],
                value="csv",
                allow_blank=False,
                id="export-format",
                compact=True,
            )
            yield Input(f"{self._stem}.csv", id="export-path", compact=True)
            yield Static(
                "enter writes (atomically; never onto an input file), escape cancels",
                classes="dialog-hint",
            )

    def on_mount(self) -> None:
        self.query_one("#export-path", Input).focus()

    @on(Select.Changed, "#export-format")
    def _format_changed(self, event: Select.Changed) -> None:
        path_input = self.query_one("#export-path", Input)
        suffix = next(f.suffix for f in EXPORT_FORMATS if f.name == event.value)
        stem = path_input.value.rsplit(".", 1)[0] if "." in path_input.value else path_input.value
        path_input.value = stem + suffix

    @on(Input.Submitted, "#export-path")
    def _submitted(self, event: Input.Submitted) -> None:
        event.stop()
        path = event.value.strip()
        if not path:
            return
        format_name = str(self.query_one("#export-format", Select).value)
        self.dismiss((format_name, path))

    def action_cancel(self) -> None:
        self.dismiss(None)


class FindDialog(ModalScreen[str | None]):
    """Fuzzy part-number search: candidates update as you type, enter jumps."""

    DEFAULT_CSS = DIALOG_CSS.format(name="FindDialog")
    BINDINGS: ClassVar[list[BindingType]] = [
        Binding("escape", "cancel", "Cancel", id="dialog.cancel"),
    ]

    class Typed(Message):
        def __init__(self, dialog: FindDialog, text: str) -> None:
            super().__init__()
            self.dialog = dialog
            self.text = text

    def __init__(self, title: str = "Find a part number") -> None:
        super().__init__()
        self._title = title

    def compose(self) -> ComposeResult:
        with Vertical():
            yield Label(self._title)
            yield Input("", id="find-text", compact=True, placeholder="part number, fuzzy")
            yield Static(
                "enter jumps to the closest match, escape cancels",
                id="find-candidates",
                classes="dialog-hint",
            )

    @on(Input.Changed, "#find-text")
    def _changed(self, event: Input.Changed) -> None:
        event.stop()
        self.post_message(self.Typed(self, event.value))

    def show_candidates(self, text: str) -> None:
        self.query_one("#find-candidates", Static).update(text)

    @on(Input.Submitted, "#find-text")
    def _submitted(self, event: Input.Submitted) -> None:
        event.stop()
        self.dismiss(event.value.strip() or None)

    def action_cancel(self) -> None:
        self.dismiss(None)
