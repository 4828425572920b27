"""A keyboard-driven list that renders only the rows on screen (Textual Line API).

A catalog of a million parts scrolls as fast as one of ten: `render_line` formats the one
row it is asked for, nothing is built for rows off screen.
"""

from __future__ import annotations

from typing import ClassVar

from rich.segment import Segment
from rich.style import Style
from textual.binding import Binding, BindingType
from textual.geometry import Size
from textual.message import Message
from textual.reactive import reactive
from textual.scroll_view import ScrollView
from textual.strip import Strip

Cells = list[tuple[str, str | None]]
"""A row as (text, component class or None) pieces."""


class RowList(ScrollView, can_focus=True):
    """A header line and `row_count` rows with a cursor; subclasses format rows."""

    DEFAULT_CSS = """
    RowList {
        height: 1fr;
        overflow-x: hidden;
    }
    RowList > .rowlist--header { text-style: bold; }
    RowList > .rowlist--cursor { background: $accent 40%; text-style: bold; }
    RowList:focus > .rowlist--cursor { background: $accent; color: $text; }
    RowList > .rowlist--good { color: $success; }
    RowList > .rowlist--warn { color: $warning; }
    RowList > .rowlist--bad { color: $error; }
    RowList > .rowlist--dim { color: $text-muted; }
    """

    COMPONENT_CLASSES: ClassVar[set[str]] = {
        "rowlist--header",
        "rowlist--cursor",
        "rowlist--good",
        "rowlist--warn",
        "rowlist--bad",
        "rowlist--dim",
    }

    BINDINGS: ClassVar[list[BindingType]] = [
        Binding("up,k", "cursor(-1)", "Up", show=False),
        Binding("down,j", "cursor(1)", "Down", show=False),
        Binding("pageup", "page(-1)", "Page up", show=False),
        Binding("pagedown", "page(1)", "Page down", show=False),
        Binding("home", "to_end(0)", "First", show=False),
        Binding("end", "to_end(1)", "Last", show=False),
    ]

    cursor: reactive[int] = reactive(0, always_update=True)
    empty_text = "nothing to show"

    class Highlighted(Message):
        """The cursor moved to `index` (-1 when the list is empty)."""

        def __init__(self, rows: RowList, index: int) -> None:
            super().__init__()
            self.rows = rows
            self.index = index

        @property
        def control(self) -> RowList:
            return self.rows

    def __init__(self, *, id: str | None = None, classes: str | None = None) -> None:
        super().__init__(id=id, classes=classes)
        self._count = 0

    @property
    def row_count(self) -> int:
        return self._count

    def set_row_count(self, count: int, cursor: int = 0) -> None:
        """Declare how many rows there are and where the cursor goes."""
        self._count = count
        self.virtual_size = Size(self.size.width, count + 1)
        self.cursor = min(max(cursor, 0), max(count - 1, 0))
        self.refresh()

    # Subclasses override these two.
    def header_cells(self, width: int) -> Cells:
        return []

    def row_cells(self, index: int, width: int) -> Cells:
        return []

    def validate_cursor(self, value: int) -> int:
        return min(max(value, 0), max(self._count - 1, 0))

    def watch_cursor(self, value: int) -> None:
        self._scroll_cursor_into_view()
        self.refresh()
        self.post_message(self.Highlighted(self, value if self._count else -1))

    def _scroll_cursor_into_view(self) -> None:
        visible = max(self.size.height - 1, 1)
        top = round(self.scroll_offset.y)
        if self.cursor < top:
            self.scroll_to(y=self.cursor, animate=False, immediate=True)
        elif self.cursor >= top + visible:
            self.scroll_to(y=self.cursor - visible + 1, animate=False, immediate=True)

    def on_resize(self) -> None:
        self.virtual_size = Size(self.size.width, self._count + 1)
        self._scroll_cursor_into_view()

    def action_cursor(self, step: int) -> None:
        self.cursor = self.cursor + step

    def action_page(self, direction: int) -> None:
        self.cursor = self.cursor + direction * max(self.size.height - 2, 1)

    def action_to_end(self, last: int) -> None:
        self.cursor = self._count - 1 if last else 0

    def _style(self, name: str | None) -> Style:
        return self.get_component_rich_style(name) if name else Style()

    def _strip(self, cells: Cells, width: int, base: Style) -> Strip:
        segments = [Segment(text, base + self._style(name)) for text, name in cells]
        return Strip(segments).adjust_cell_length(width, base)

    def render_line(self, y: int) -> Strip:
        width = self.scrollable_content_region.width
        base = self.rich_style
        if y == 0:
            return self._strip(
                self.header_cells(width), width, base + self._style("rowlist--header")
            )
        index = round(self.scroll_offset.y) + y - 1
        if self._count == 0:
            text = self.empty_text if y == 1 else ""
            return self._strip([(text, "rowlist--dim")], width, base)
        if index >= self._count:
            return Strip.blank(width, base)
        is_cursor = index == self.cursor
        # The ▶ marks the cursor so it shows without colour (NO_COLOR).
        try:
            row = self.row_cells(index, width - 1)
        except Exception as error:  # a bad value must not take the whole screen down
            row = [(f"⚠ row {index + 1} could not be drawn: {error}", "rowlist--bad")]
        cells: Cells = [("▶" if is_cursor else " ", None), *row]
        style = base + self._style("rowlist--cursor") if is_cursor else base
        return self._strip(cells, width, style)
