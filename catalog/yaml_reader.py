"""YAML catalog files -> RawTable, without constructing any object the file asks for.

The file is first scanned as a stream of events (no objects built) to refuse alias bombs
and absurd nesting; then composed into nodes with PyYAML's safe loader and walked here.
Values are kept as the text written in the file (``12pF``, ``-40``, ``1-3``), so YAML 1.1
surprises (``no`` -> False, ``1:20`` -> 80) cannot change a catalog value. Any tag outside
the YAML core schema (``!!python/object``, ``!custom``) is refused as a problem; nothing is
ever constructed from it. ``yaml.load`` with an unsafe loader is never used.
"""

from __future__ import annotations

from collections.abc import Iterator
from dataclasses import dataclass
from pathlib import Path
from typing import Final

import yaml

from catalog.problems import CatalogError, Problem
from catalog.rawtable import DEFAULT_LIMITS, Limits, RawTable, columns_from_rows
from catalog.textfile import decode_catalog_bytes, read_catalog_bytes

__all__ = ["read_yaml_table"]

_CORE: Final[str] = "tag:yaml.org,2002:"
_SAFE_TAGS: Final[frozenset[str]] = frozenset(
    _CORE + name
    for name in (
        "str",
        "int",
        "float",
        "bool",
        "null",
        "map",
        "seq",
        "timestamp",
        "merge",
        "omap",
        "set",
        "binary",
    )
)
_NULL: Final[str] = _CORE + "null"
# libyaml's safe loader when PyYAML was built with it (same safety, ~20x faster).
_LOADER: Final[type[yaml.SafeLoader]] = getattr(yaml, "CSafeLoader", yaml.SafeLoader)
_MERGE: Final[str] = _CORE + "merge"


class _Refused(ValueError):
    """A node the walker will not turn into a value (message says why)."""


@dataclass
class _Budget:
    """Nodes still allowed after alias expansion (mutable, local to one read)."""

    left: int


def _scan_events(text: str, path: str, limits: Limits) -> int:
    """Count events, aliases and depth without building anything; return the event count."""
    aliases = 0
    depth = 0
    events = 0
    try:
        for event in yaml.parse(text, Loader=_LOADER):
            events += 1
            line = event.start_mark.line + 1 if event.start_mark is not None else 0
            if isinstance(event, yaml.AliasEvent):
                aliases += 1
                if aliases > limits.max_yaml_aliases:
                    raise CatalogError(
                        f"{path}:{line}: more than {limits.max_yaml_aliases} "
                        "YAML aliases; refusing a document that expands like an alias bomb"
                    )
            elif isinstance(event, yaml.CollectionStartEvent):
                depth += 1
                if depth > limits.max_yaml_depth:
                    raise CatalogError(
                        f"{path}:{line}: YAML nested deeper than "
                        f"{limits.max_yaml_depth} levels; a part list needs three"
                    )
            elif isinstance(event, yaml.CollectionEndEvent):
                depth -= 1
    except yaml.YAMLError as error:
        raise CatalogError(_yaml_message(path, error)) from None
    return events


def _tag(tag: str) -> str:
    """Show a core-schema tag the way it is written in a file ("!!python/object")."""
    return "!!" + tag.removeprefix(_CORE) if tag.startswith(_CORE) else tag


def _yaml_message(path: str, error: yaml.YAMLError) -> str:
    mark = getattr(error, "problem_mark", None) or getattr(error, "context_mark", None)
    where = f"{path}:{mark.line + 1}" if mark is not None else path
    problem = getattr(error, "problem", None) or str(error).splitlines()[0]
    return f"{where}: not valid YAML ({problem})"


def _plain(node: yaml.Node, budget: _Budget, depth: int) -> str | list[object] | dict[str, object]:
    budget.left -= 1
    if budget.left < 0:
        raise CatalogError("YAML document expands to too many nodes (aliases?)")
    if depth > 64:
        raise _Refused("nested too deeply")
    if node.tag not in _SAFE_TAGS:
        raise _Refused(
            f"YAML tag '{_tag(node.tag)}' is not allowed in a catalog; nothing was constructed"
        )
    if isinstance(node, yaml.ScalarNode):
        return "" if node.tag == _NULL else str(node.value)
    if isinstance(node, yaml.SequenceNode):
        return [_plain(item, budget, depth + 1) for item in node.value]
    if isinstance(node, yaml.MappingNode):
        return dict(_pairs(node, budget, depth))
    raise _Refused("unknown YAML node")


def _pairs(node: yaml.MappingNode, budget: _Budget, depth: int) -> Iterator[tuple[str, object]]:
    """Key/value pairs of a mapping, with ``<<: *defaults`` merges (explicit keys win)."""
    explicit: dict[str, object] = {}
    merged: dict[str, object] = {}
    for key_node, value_node in node.value:
        if key_node.tag == _MERGE or (
            isinstance(key_node, yaml.ScalarNode) and key_node.value == "<<"
        ):
            sources = (
                value_node.value if isinstance(value_node, yaml.SequenceNode) else [value_node]
            )
            for source in sources:
                if not isinstance(source, yaml.MappingNode):
                    raise _Refused("'<<' must merge a mapping")
                for key, value in _pairs(source, budget, depth + 1):
                    merged.setdefault(key, value)
            continue
        if not isinstance(key_node, yaml.ScalarNode):
            raise _Refused("a mapping key must be plain text")
        if key_node.tag not in _SAFE_TAGS:
            raise _Refused(f"YAML tag '{_tag(key_node.tag)}' is not allowed in a catalog")
        explicit[str(key_node.value)] = value_node
    for key, value in merged.items():
        if key not in explicit:
            yield key, value
    for key, value_node in explicit.items():
        assert isinstance(value_node, yaml.Node)
        yield key, _plain(value_node, budget, depth + 1)


def read_yaml_table(path: str | Path, *, limits: Limits = DEFAULT_LIMITS) -> RawTable:
    """Read one YAML catalog (a list of parts, or a mapping with ``parts:``) into a RawTable.

    Each part is a mapping of header -> value; headers are the keys (the same aliases as
    CSV headers apply). Raises CatalogError when the file is unusable as a whole; a bad
    item is an error problem on its own line and the others load.
    """
    file_path = Path(path)
    shown = str(path)
    data = read_catalog_bytes(file_path, limits)
    if not data.strip():
        raise CatalogError(f"{shown}: empty file")
    decoded = decode_catalog_bytes(data, shown)
    text = decoded.text
    events = _scan_events(text, shown, limits)
    try:
        root = yaml.compose(text, Loader=_LOADER)
    except yaml.YAMLError as error:
        raise CatalogError(_yaml_message(shown, error)) from None
    except RecursionError:
        raise CatalogError(f"{shown}: YAML nested too deeply") from None
    if root is None:
        raise CatalogError(f"{shown}: empty file (no YAML document)")
    items_node = _items_node(root, shown)
    budget = _Budget(min(limits.max_yaml_nodes, 20 * events + 10_000))
    problems: list[Problem] = list(decoded.problems)
    headers: dict[str, None] = {}
    records: list[dict[str, str]] = []
    lines: list[int] = []
    bad: set[int] = set()
    for item in items_node.value:
        line = item.start_mark.line + 1
        record: dict[str, str] = {}
        try:
            if item.tag not in _SAFE_TAGS:
                raise _Refused(
                    f"YAML tag '{_tag(item.tag)}' is not allowed in a catalog; "
                    "nothing was constructed"
                )
            if not isinstance(item, yaml.MappingNode):
                raise _Refused("each part must be a mapping of field: value")
            for key, value in _pairs(item, budget, 2):
                record[key] = _text_of_value(value)
        except _Refused as refused:
            problems.append(
                Problem(
                    shown,
                    line,
                    None,
                    _clip(_node_text(item)),
                    f"{refused}; part not loaded",
                    "error",
                )
            )
            bad.add(len(records))
            record = {}
        except RecursionError:
            problems.append(
                Problem(shown, line, None, None, "part nested too deeply; not loaded", "error")
            )
            bad.add(len(records))
            record = {}
        except CatalogError as error:
            raise CatalogError(f"{shown}:{line}: {error}") from None
        for key in record:
            headers.setdefault(key, None)
        records.append(record)
        lines.append(line)
        if len(records) > limits.max_rows:
            raise CatalogError(f"{shown}: more than {limits.max_rows} parts; split the file")
    header_tuple = tuple(headers)
    rows = tuple(
        tuple(_cell(record.get(header, ""), limits) for header in header_tuple)
        for record in records
    )
    for position, record in enumerate(records):
        for header, value in record.items():
            if len(value) > limits.max_field_chars:
                problems.append(
                    Problem(
                        shown,
                        lines[position],
                        header,
                        f"{len(value)} characters",
                        f"a value is longer than {limits.max_field_chars} "
                        "characters; part not loaded",
                        "error",
                    )
                )
                bad.add(position)
    return RawTable(
        path=shown,
        headers=header_tuple,
        columns=columns_from_rows(rows, len(header_tuple)),
        lines=tuple(lines),
        problems=tuple(problems),
        header_line=None,
        bad_rows=frozenset(bad),
    )


def _text_of_value(value: object) -> str:
    if isinstance(value, str):
        return value
    if isinstance(value, list):
        if len(value) == 2 and all(isinstance(item, str) for item in value):
            return f"{value[0]} to {value[1]}"
        return "[" + ", ".join(_text_of_value(item) for item in value) + "]"
    if isinstance(value, dict):
        return "{" + ", ".join(f"{k}: {_text_of_value(v)}" for k, v in value.items()) + "}"
    return str(value)


def _cell(value: str, limits: Limits) -> str:
    return "" if len(value) > limits.max_field_chars else value


def _items_node(root: yaml.Node, path: str) -> yaml.SequenceNode:
    if root.tag not in _SAFE_TAGS:
        raise CatalogError(
            f"{path}: YAML tag '{_tag(root.tag)}' is not allowed; nothing was constructed"
        )
    if isinstance(root, yaml.SequenceNode):
        return root
    if isinstance(root, yaml.MappingNode):
        for key_node, value_node in root.value:
            if isinstance(key_node, yaml.ScalarNode) and key_node.value == "parts":
                if isinstance(value_node, yaml.SequenceNode) and value_node.tag in _SAFE_TAGS:
                    return value_node
                raise CatalogError(
                    f"{path}:{value_node.start_mark.line + 1}: 'parts' must be a list of parts"
                )
    kind = "a single value" if isinstance(root, yaml.ScalarNode) else "a mapping without 'parts:'"
    raise CatalogError(
        f"{path}: not a catalog: expected a list of parts or a mapping with 'parts:', got {kind}"
    )


def _node_text(node: yaml.Node) -> str:
    if isinstance(node, yaml.ScalarNode):
        return str(node.value)
    return (
        f"<{type(node).__name__.removesuffix('Node').lower()} at line {node.start_mark.line + 1}>"
    )


def _clip(text: str, size: int = 80) -> str:
    return text if len(text) <= size else text[: size - 3] + "..."
