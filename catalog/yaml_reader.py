"""YAML catalog files -> RawTable, without constructing any object the file asks for.

The file is read as a stream of parser events (libyaml's safe parser when available) and
the plain structure (text, lists, mappings) is built here in one pass. Nothing is ever
constructed from a tag: any tag outside the YAML core schema (``!!python/object``,
``!custom``) marks its value as refused and the part holding it is reported. Values keep
the text written in the file (``12pF``, ``-40``, ``1-3``), so YAML 1.1 surprises
(``no`` -> False, ``1:20`` -> 80) cannot change a catalog value. ``yaml.load`` and every
unsafe loader are never used.

Aliases reuse the value their anchor built (no copy), so alias bombs cost nothing while
building; the alias count, the nesting depth and the size of any value turned into cell
text are capped so they cannot cost anything later either.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from pathlib import Path
from typing import Final

import yaml

from catalog.problems import CatalogError, Problem
from catalog.rawtable import DEFAULT_LIMITS, Limits, RawTable, columns_from_rows
from catalog.textfile import decode_catalog_bytes, read_catalog_bytes

__all__ = ["read_yaml_table"]

_CORE: Final[str] = "tag:yaml.org,2002:"
_SAFE_TAGS: Final[frozenset[str]] = frozenset(
    {"!"}
    | {
        _CORE + name
        for name in ("str", "int", "float", "bool", "null", "map", "seq", "timestamp", "merge")
    }
)
# libyaml's parser when PyYAML was built with it (same events, much faster).
_LOADER: Final[type[yaml.SafeLoader]] = getattr(yaml, "CSafeLoader", yaml.SafeLoader)


@dataclass(frozen=True)
class _Tagged:
    """A value carrying a tag we refuse; it is reported, never constructed."""

    tag: str


class _Mapping(dict[str, object]):
    """A YAML mapping with the 1-based line it starts on."""

    line: int = 0


class _Sequence(list[object]):
    """A YAML sequence with the 1-based line it starts on and the line of each item."""

    line: int = 0
    item_lines: list[int]


@dataclass
class _Frame:
    """A collection being built."""

    value: _Mapping | _Sequence
    anchor: str | None
    refused_tag: str | None
    key: object = None
    has_key: bool = False
    merges: list[object] = field(default_factory=list)


def _tag(tag: str) -> str:
    """Show a core-schema tag the way it is written in a file ("!!python/object")."""
    return "!!" + tag.removeprefix(_CORE) if tag.startswith(_CORE) else tag


def _yaml_message(path: str, error: yaml.YAMLError) -> str:
    mark = getattr(error, "problem_mark", None) or getattr(error, "context_mark", None)
    where = f"{path}:{mark.line + 1}" if mark is not None else path
    problem = getattr(error, "problem", None) or str(error).splitlines()[0]
    return f"{where}: not valid YAML ({problem})"


def _line(event: yaml.Event) -> int:
    mark = event.start_mark
    return mark.line + 1 if mark is not None else 0


def _build_document(text: str, path: str, limits: Limits) -> object:
    """Build the document's plain structure from parser events; None for no document."""
    anchors: dict[str, object] = {}
    stack: list[_Frame] = []
    root: object = None
    documents = 0
    aliases = 0

    def attach(value: object, anchor: str | None, line: int) -> None:
        nonlocal root
        if anchor:
            anchors[anchor] = value
        if not stack:
            root = value
            return
        frame = stack[-1]
        if isinstance(frame.value, _Sequence):
            frame.value.append(value)
            frame.value.item_lines.append(line)
        elif not frame.has_key:
            frame.key, frame.has_key = value, True
        else:
            key, frame.key, frame.has_key = frame.key, None, False
            if key == "<<" or (isinstance(key, _Tagged) and key.tag == _CORE + "merge"):
                frame.merges.append(value)
            elif isinstance(key, str):
                frame.value[key] = value
            else:
                frame.value[f"<{type(key).__name__} key>"] = _Tagged("a non-text key")

    try:
        for event in yaml.parse(text, Loader=_LOADER):
            if isinstance(event, yaml.ScalarEvent):
                tag = event.tag
                value: object = event.value
                if tag is not None and tag not in _SAFE_TAGS:
                    value = _Tagged(tag)
                elif tag == _CORE + "merge" and event.value == "<<":
                    value = "<<"
                attach(value, event.anchor, _line(event))
            elif isinstance(event, yaml.AliasEvent):
                aliases += 1
                if aliases > limits.max_yaml_aliases:
                    raise CatalogError(
                        f"{path}:{_line(event)}: more than {limits.max_yaml_aliases} YAML "
                        "aliases; refusing a document that expands like an alias bomb"
                    )
                if event.anchor not in anchors:
                    raise CatalogError(f"{path}:{_line(event)}: unknown YAML alias")
                attach(anchors[event.anchor], None, _line(event))
            elif isinstance(event, yaml.MappingStartEvent | yaml.SequenceStartEvent):
                if len(stack) >= limits.max_yaml_depth:
                    raise CatalogError(
                        f"{path}:{_line(event)}: YAML nested deeper than "
                        f"{limits.max_yaml_depth} levels; a part list needs three"
                    )
                container: _Mapping | _Sequence = (
                    _Mapping() if isinstance(event, yaml.MappingStartEvent) else _Sequence()
                )
                container.line = _line(event)
                if isinstance(container, _Sequence):
                    container.item_lines = []
                tag = event.tag
                refused = tag if tag is not None and tag not in _SAFE_TAGS else None
                stack.append(_Frame(container, event.anchor, refused))
            elif isinstance(event, yaml.MappingEndEvent | yaml.SequenceEndEvent):
                frame = stack.pop()
                built: object = frame.value
                if isinstance(frame.value, _Mapping) and frame.merges:
                    built = _merged(frame.value, frame.merges)
                if frame.refused_tag is not None:
                    built = _Tagged(frame.refused_tag)
                attach(built, frame.anchor, frame.value.line)
            elif isinstance(event, yaml.DocumentStartEvent):
                documents += 1
                if documents > 1:
                    raise CatalogError(
                        f"{path}:{_line(event)}: not valid YAML (expected a single document)"
                    )
    except yaml.YAMLError as error:
        raise CatalogError(_yaml_message(path, error)) from None
    return root


def _merged(mapping: _Mapping, merges: list[object]) -> object:
    """Apply ``<<: *defaults`` merges; explicit keys win (YAML 1.1 merge-key type)."""
    result = _Mapping()
    result.line = mapping.line
    for source in merges:
        for part in source if isinstance(source, list) else [source]:
            if not isinstance(part, dict):
                return _Tagged("a '<<' merge of something that is not a mapping")
            for key, value in part.items():
                result.setdefault(key, value)
    result.update(mapping)
    return result


def _refusal(value: object, seen: set[int] | None = None) -> str | None:
    """Why a part cannot be loaded (a refused tag anywhere inside), or None.

    Values shared through aliases are visited once, so an alias bomb costs its size in
    the file, not its expansion.
    """
    if isinstance(value, _Tagged):
        if value.tag.startswith(("tag:", "!")):
            return (
                f"YAML tag '{_tag(value.tag)}' is not allowed in a catalog; nothing was constructed"
            )
        return f"{value.tag} is not allowed in a catalog"
    if not isinstance(value, dict | list):
        return None
    seen = set() if seen is None else seen
    if id(value) in seen:
        return None
    seen.add(id(value))
    children = value.values() if isinstance(value, dict) else value
    for item in children:
        reason = _refusal(item, seen)
        if reason:
            return reason
    return None


class _TooLong(ValueError):
    """A value whose text would exceed the cell size cap."""


@dataclass
class _TextBudget:
    """Characters and nodes a cell's text may still take (local to one cell)."""

    chars: int
    nodes: int


#: Nodes one cell may expand to; more is only reachable through aliases (a bomb).
_CELL_NODES: Final[int] = 10_000


def _text_of_value(value: object, budget: _TextBudget) -> str:
    """A cell's text: scalars as written, a two-item list as a range, others bracketed.

    Raises _TooLong past the character cap and CatalogError past the node cap (only
    aliases can make a small file describe that many nodes).
    """
    budget.nodes -= 1
    if budget.nodes < 0:
        raise CatalogError(
            "YAML aliases expand one value to more than 10000 items; refusing a document "
            "that expands like an alias bomb"
        )
    if isinstance(value, str):
        budget.chars -= len(value)
        if budget.chars < 0:
            raise _TooLong
        return value
    if isinstance(value, list):
        if len(value) == 2 and all(isinstance(item, str) for item in value):
            return f"{value[0]} to {value[1]}"  # temperature: [-40, 85]
        return "[" + ", ".join(_text_of_value(item, budget) for item in value) + "]"
    if isinstance(value, dict):
        inner = ", ".join(f"{k}: {_text_of_value(v, budget)}" for k, v in value.items())
        return "{" + inner + "}"
    return str(value)


def _items(root: object, path: str) -> list[object]:
    if isinstance(root, _Tagged):
        raise CatalogError(f"{path}: {_refusal(root)}")
    if isinstance(root, list):
        return root
    if isinstance(root, dict):
        if "parts" in root:
            parts = root["parts"]
            if isinstance(parts, _Tagged):
                raise CatalogError(f"{path}: {_refusal(parts)}")
            if isinstance(parts, list):
                return parts
            where = f"{path}:{root.line}" if isinstance(root, _Mapping) else path
            raise CatalogError(f"{where}: 'parts' must be a list of parts")
        kind = "a mapping without 'parts:'"
    else:
        kind = "a single value"
    raise CatalogError(
        f"{path}: not a catalog: expected a list of parts or a mapping with 'parts:', got {kind}"
    )


def _kind(value: object) -> str:
    if isinstance(value, _Tagged):
        return f"<{_tag(value.tag)}>"
    return "<list>" if isinstance(value, list) else f"<{type(value).__name__}>"


def _clip(text: str, size: int = 80) -> str:
    return text if len(text) <= size else text[: size - 3] + "..."


def read_yaml_table(path: str | Path, *, limits: Limits = DEFAULT_LIMITS) -> RawTable:
    """Read one YAML catalog (a list of parts, or a mapping with ``parts:``) into a RawTable.

    Each part is a mapping of header -> value; headers are the keys (the same aliases as
    CSV headers apply). Raises CatalogError when the file is unusable as a whole; a bad
    item is an error problem on its own line and the others load.
    """
    shown = str(path)
    data = read_catalog_bytes(Path(path), limits)
    if not data.strip():
        raise CatalogError(f"{shown}: empty file")
    decoded = decode_catalog_bytes(data, shown)
    root = _build_document(decoded.text, shown, limits)
    if root is None:
        raise CatalogError(f"{shown}: empty file (no YAML document)")
    items = _items(root, shown)
    if len(items) > limits.max_rows:
        raise CatalogError(f"{shown}: more than {limits.max_rows} parts; split the file")
    problems: list[Problem] = list(decoded.problems)
    headers: dict[str, None] = {}
    records: list[dict[str, str]] = []
    lines: list[int] = []
    bad: set[int] = set()
    item_lines = getattr(items, "item_lines", [0] * len(items))
    for item, line in zip(items, item_lines, strict=True):
        record: dict[str, str] = {}
        reason = _refusal(item)
        if reason is None and not isinstance(item, dict):
            reason = "each part must be a mapping of field: value"
        if reason is None and isinstance(item, dict):
            for key, value in item.items():
                try:
                    record[key] = _text_of_value(
                        value, _TextBudget(limits.max_field_chars, _CELL_NODES)
                    )
                except CatalogError as error:
                    raise CatalogError(f"{shown}:{line}: {error}") from None
                except (_TooLong, RecursionError):
                    problems.append(
                        Problem(
                            shown,
                            line,
                            key,
                            None,
                            f"a value is longer than {limits.max_field_chars} characters; "
                            "part not loaded",
                            "error",
                        )
                    )
                    bad.add(len(records))
                    record[key] = ""
        else:
            shown_item = item if isinstance(item, str) else _kind(item)
            problems.append(
                Problem(
                    shown, line, None, _clip(str(shown_item)), f"{reason}; part not loaded", "error"
                )
            )
            bad.add(len(records))
        for key in record:
            headers.setdefault(key, None)
        records.append(record)
        lines.append(line)
    header_tuple = tuple(headers)
    rows = [tuple(record.get(header, "") for header in header_tuple) for record in records]
    return RawTable(
        path=shown,
        headers=header_tuple,
        columns=columns_from_rows(rows, len(header_tuple)),
        lines=tuple(lines),
        problems=tuple(problems),
        header_line=None,
        bad_rows=frozenset(bad),
    )
