"""Help: the keys, what each figure means, and the caution."""

from __future__ import annotations

from typing import ClassVar

from textual.app import ComposeResult
from textual.binding import Binding, BindingType
from textual.containers import VerticalScroll
from textual.screen import ModalScreen
from textual.widgets import Static

from picker.tui.model import CAUTION

FIGURES = (
    ("status", "✔ fit: passes every rule; △ marg: passes but near a limit; ✘ out: fails one"),
    ("scr", "score 0–100 from margin, budget headroom, drive headroom, price, stock, lifecycle"),
    (
        "margin",
        "the figure ranked on: |Rneg|/ESR with the chosen caps (gm forms), the chip's "
        "gm_crit max / the part's gm_crit, or the chip's allowed ESR / ESR; bar: 0 to 2× the "
        "required value, ┆ marks it, › beyond",
    ),
    (
        "ppm",
        "worst-case total frequency error: tolerance + drift + aging + pulling + spread "
        "(bar: share of the budget used, ! over budget)",
    ),
    ("CL pF", "load capacitance the part is calibrated at ('ser' = series resonance)"),
    ("ESR Ω", "largest motional resistance R1 from the catalog"),
    ("gain", "gain margin gm / gm_crit (wide terminals); differs from the margin near gm_opt"),
    ("spare", "budget headroom: budget minus the worst-case total [ppm] (wide terminals)"),
    ("pulling", "offset of the running frequency from nominal with the board's load"),
    ("trim sensitivity", "ppm per pF of load change at the board's load"),
    ("drive level", "power in the crystal at the brief's swing; must stay under the rating"),
    ("[ESTIMATE]", "a typical value used because the catalog did not give it (common practice)"),
    (
        "stray",
        "the brief's stray capacitance is across the crystal (traces and pads); pin "
        "capacitance is per pin to ground",
    ),
)


def help_text(keys: list[tuple[str, str]]) -> str:
    """The help page as plain text (keys first, then figures, then the caution)."""
    lines = ["Keys", ""]
    lines += [f"  {key:<12} {description}" for key, description in keys]
    lines += [
        "",
        "  escape leaves a text field; tab moves between fields.",
        "",
        "What the figures mean",
        "",
    ]
    lines += [f"  {name:<12} {meaning}" for name, meaning in FIGURES]
    lines += ["", "Caution", "", f"  {CAUTION}", "", "Press escape, F1, ? or q to close."]
    return "\n".join(lines)


class HelpScreen(ModalScreen[None]):
    """Full-screen help over the app; any of escape, F1, ? or q closes it."""

    DEFAULT_CSS = """
    HelpScreen { align: center middle; }
    HelpScreen > VerticalScroll {
        width: 100%; max-width: 110; height: 100%;
        border: round $accent; background: $surface; padding: 0 1;
    }
    """

    BINDINGS: ClassVar[list[BindingType]] = [
        Binding("escape,f1,question_mark,q", "close", "Close help", id="help.close"),
    ]

    def __init__(
        self, keys: list[tuple[str, str]], *, title: str = "picker help", body: str | None = None
    ) -> None:
        super().__init__()
        self._keys = keys
        self._title = title
        self._body = body

    def compose(self) -> ComposeResult:
        scroller = VerticalScroll(can_focus=True)
        scroller.border_title = self._title
        with scroller:
            text = help_text(self._keys) if self._body is None else self._body
            yield Static(text, id="help-text", markup=False)

    def on_mount(self) -> None:
        self.query_one(VerticalScroll).focus()

    def action_close(self) -> None:
        self.dismiss(None)
