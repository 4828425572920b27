"""Problems found while reading a catalog, and the error for an unusable one."""

from __future__ import annotations

from dataclasses import dataclass
from typing import Literal

__all__ = ["CatalogError", "Problem", "Severity"]

Severity = Literal["error", "warning"]


@dataclass(frozen=True)
class Problem:
    """One finding about one place in a catalog file.

    ``severity`` is ``"error"`` when the row was not loaded and ``"warning"`` when it was
    loaded anyway. ``line`` is 1-based (the physical line in a CSV, the item's line in a
    YAML file) or None for a finding about the whole file; ``field`` is our schema field
    name (or the raw header when no field applies); ``raw`` is the text as found.
    """

    path: str
    line: int | None
    field: str | None
    raw: str | None
    message: str
    severity: Severity

    def one_line(self) -> str:
        """``"parts.csv:14: esr: expected a resistance such as '80 ohm', got '16 MHz'"``.

        Warnings carry a ``warning:`` tag before the message so a plain log still tells
        kept rows from dropped ones.
        """
        place = self.path if self.line is None else f"{self.path}:{self.line}"
        pieces = [place]
        if self.field:
            pieces.append(self.field)
        message = self.message if self.severity == "error" else f"warning: {self.message}"
        pieces.append(message)
        return ": ".join(pieces)

    def to_json_dict(self) -> dict[str, object]:
        """The lint JSON object of DESIGN §6 (keys path, line, field, raw, message, severity)."""
        return {
            "path": self.path,
            "line": self.line,
            "field": self.field,
            "raw": self.raw,
            "message": self.message,
            "severity": self.severity,
        }


class CatalogError(ValueError):
    """The input is unusable as a whole (missing, unreadable, not a table): exit code 2.

    The message is one line naming the file and what is wrong.
    """
