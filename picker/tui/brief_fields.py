"""The brief as a flat list of editable text fields, and back.

Pure functions over the brief mapping (the YAML structure of DESIGN §6): no Textual here,
so the round trip is easy to test. The brief pane shows one Input per leaf; lists are
edited as comma-separated text. A list of lists (the rows of a max_esr grid with a C0 axis)
has no faithful one-line form, so it is shown read-only and kept exactly as read.
"""

from __future__ import annotations

from collections.abc import Mapping

from picker.tui.model import BriefField

KNOWN: dict[tuple[str, ...], tuple[str | None, str]] = {
    ("name",): (None, "what this circuit is"),
    ("preset",): (None, "interface preset that sets the budget (see ctrl+p → preset)"),
    ("frequency",): ("frequency", "nominal clock frequency"),
    ("budget",): ("ppm", "total frequency error allowed, all causes, whole life"),
    ("temperature",): ("temperature", "board temperature range: low, high"),
    ("lifetime",): ("time", "product life for aging"),
    ("amplifier", "gm"): ("transconductance", "oscillator transconductance (chip data sheet)"),
    ("amplifier", "gm_crit_max"): ("transconductance", "largest crystal gm_crit the chip drives"),
    ("amplifier", "pin_capacitance"): ("capacitance", "per pin to ground, added to each cap"),
    ("amplifier", "swing"): ("voltage", "peak-to-peak across the crystal, for drive level"),
    ("amplifier", "output_resistance"): ("resistance", "amplifier output resistance"),
    ("amplifier", "bias_resistance"): ("resistance", "feedback bias resistor"),
    ("board", "stray_capacitance"): ("capacitance", "across the crystal: traces and pads"),
    ("board", "stray_uncertainty"): ("capacitance", "± on the stray capacitance"),
    ("board", "cap_series"): (None, "IEC 60063 series for the load caps: E6, E12, E24"),
    ("board", "cap_tolerance"): ("fraction", "load-cap tolerance above 10 pF"),
    ("board", "cap_tolerance_small"): ("capacitance", "load-cap tolerance below 10 pF"),
    ("board", "fixed_caps"): ("capacitance", "analyse these two caps instead of choosing"),
    ("limits", "min_margin"): (None, "least negative-resistance margin (common practice: 5)"),
    ("limits", "packages"): (None, "allowed packages, e.g. 3225, 2520"),
    ("limits", "max_height"): ("length", "tallest part allowed, e.g. 0.9 mm"),
}
"""Dimension and help per known key path; unknown keys are still editable as text."""

OPTIONAL: tuple[tuple[str, ...], ...] = (("limits", "max_height"),)
"""Optional leaves offered as an empty field when the brief leaves them out, so they can be
set on screen (an empty field stays out of the brief)."""

READ_ONLY_NOTE = "table of rows: edit in the YAML file (ctrl+o reopens it)"


def flatten_brief(data: Mapping[str, object]) -> list[tuple[BriefField, str]]:
    """Every leaf of the brief mapping as (field, text), in the mapping's order."""
    out: list[tuple[BriefField, str]] = []
    _walk(data, (), out)
    present = {f.path for f, _ in out}
    for path in OPTIONAL:
        if path not in present and _parent_is_mapping(data, path):
            dimension, meaning = _describe(path)
            out.append((BriefField(path, ".".join(path), dimension, meaning), ""))
    return out


def _parent_is_mapping(data: Mapping[str, object], path: tuple[str, ...]) -> bool:
    """True when every section above `path` is absent or a mapping (nothing to overwrite)."""
    node: object = data
    for key in path[:-1]:
        if not isinstance(node, Mapping):
            return False
        node = node.get(key, {})
    return isinstance(node, Mapping) and path[-1] not in node


def _walk(
    node: Mapping[str, object], prefix: tuple[str, ...], out: list[tuple[BriefField, str]]
) -> None:
    for key, value in node.items():
        path = (*prefix, str(key))
        if isinstance(value, Mapping):
            _walk(value, path, out)
            continue
        dimension, meaning = _describe(path)
        is_list = isinstance(value, list | tuple)
        if is_list and any(isinstance(v, list | tuple | Mapping) for v in value):  # type: ignore[attr-defined]
            text = "; ".join(_nested_text(v) for v in value)  # type: ignore[attr-defined]
            out.append(
                (
                    BriefField(path, ".".join(path), None, meaning, True, read_only=True),
                    text,
                )
            )
            continue
        text = (
            ", ".join(_text(v) for v in value) if isinstance(value, list | tuple) else _text(value)
        )
        out.append((BriefField(path, ".".join(path), dimension, meaning, is_list), text))


def _describe(path: tuple[str, ...]) -> tuple[str | None, str]:
    if path in KNOWN:
        return KNOWN[path]
    # gm settings and ESR tables: named leaves under a known key share its dimension.
    if len(path) >= 3 and path[:2] == ("amplifier", "gm"):
        return "transconductance", f"gm of drive setting '{path[2]}'"
    if path == ("amplifier", "max_esr", "load_capacitance"):
        return "capacitance", "load capacitances of the ESR table's rows"
    if path == ("amplifier", "max_esr", "c0"):
        return "capacitance", "crystal C0 of the ESR table's columns"
    if path == ("amplifier", "max_esr", "esr"):
        return "resistance", "largest ESR per row (and per C0 column)"
    if len(path) >= 3 and path[:2] == ("amplifier", "max_esr"):
        return "resistance", f"largest ESR the chip tolerates at {path[2]}"
    return None, ""


def _nested_text(value: object) -> str:
    """One row of a nested table as "[a, b, —]" (an empty cell as —), for reading only."""
    if isinstance(value, list | tuple):
        return "[" + ", ".join(_nested_text(v) for v in value) + "]"
    if isinstance(value, Mapping):
        return "{" + ", ".join(f"{k}: {_nested_text(v)}" for k, v in value.items()) + "}"
    return "—" if value is None else _text(value)


def _text(value: object) -> str:
    if value is None:
        return ""
    if isinstance(value, bool):
        return "true" if value else "false"
    return str(value)


def field_value(brief_field: BriefField, text: str) -> object:
    """The mapping value for the text typed into `brief_field` (lists split on commas)."""
    stripped = text.strip()
    if brief_field.is_list:
        return [part.strip() for part in stripped.split(",") if part.strip()]
    return stripped if stripped else None


def with_value(
    data: Mapping[str, object], path: tuple[str, ...], value: object
) -> dict[str, object]:
    """A copy of `data` with the leaf at `path` replaced (None removes the key)."""
    copy: dict[str, object] = {k: _deep_copy(v) for k, v in data.items()}
    node: dict[str, object] = copy
    for key in path[:-1]:
        child = node.get(key)
        if not isinstance(child, dict):
            child = {}
            node[key] = child
        node = child
    if value is None:
        node.pop(path[-1], None)
    else:
        node[path[-1]] = value
    return copy


def _deep_copy(value: object) -> object:
    if isinstance(value, Mapping):
        return {k: _deep_copy(v) for k, v in value.items()}
    if isinstance(value, list | tuple):
        return [_deep_copy(v) for v in value]
    return value


def field_for_error(message: str, labels: list[str]) -> str | None:
    """The field label a brief error names ("amplifier.gm: expected ..."), longest first."""
    for label in sorted(labels, key=len, reverse=True):
        if message.startswith(f"{label}:") or f" {label}:" in message or f"{label}[" in message:
            return label
    return None
