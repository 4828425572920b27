"""Command-palette provider: every action of the app, and each interface preset."""

from __future__ import annotations

from functools import partial
from typing import TYPE_CHECKING, cast

from textual.command import DiscoveryHit, Hit, Hits, Provider

from picker.tui.brief_pane import preset_label

if TYPE_CHECKING:
    from picker.tui.app import PickerApp


class PickerCommands(Provider):
    """Offers the app's actions (same names as the footer and help) and the presets."""

    def _entries(self) -> list[tuple[str, str, str]]:
        app = cast("PickerApp", self.app)
        entries = [(title, help_text, action) for title, help_text, action in app.command_list()]
        for preset in app.preset_list():
            entries.append(
                (
                    f"Preset: {preset.title}",
                    f"{preset_label(preset).removeprefix(preset.title + ' — ')} — {preset.clause}",
                    f"preset('{preset.name}')",
                )
            )
        return entries

    async def discover(self) -> Hits:
        for title, help_text, action in self._entries():
            yield DiscoveryHit(title, partial(self.app.run_action, action), help=help_text)

    async def search(self, query: str) -> Hits:
        matcher = self.matcher(query)
        for title, help_text, action in self._entries():
            score = matcher.match(title)
            if score > 0:
                yield Hit(
                    score,
                    matcher.highlight(title),
                    partial(self.app.run_action, action),
                    text=title,
                    help=help_text,
                )
