"""YAML catalogs: shapes, line numbers, merges, and refusal of unsafe documents.

Sources: merge keys ("<<") follow the YAML 1.1 merge-key type (yaml.org/type/merge);
the tags refused are PyYAML's documented python/* language tags; line numbers are the
1-based lines of each item as the YAML text is written.
"""

from __future__ import annotations

from collections.abc import Callable
from pathlib import Path

import pytest

from catalog.problems import CatalogError
from catalog.reader import load_catalogs
from catalog.yaml_reader import read_yaml_table

Write = Callable[[str, bytes | str], Path]

PART = """\
  - mpn: ZY-32K
    maker: Zyxo
    frequency: 32.768 kHz
    load_capacitance: 12.5 pF
    tolerance: ±20 ppm
    temperature: [-40, 85]
    esr: 70 kohm
    package: "2012"
    beta: -0.034 ppm/°C²
"""


def test_mapping_with_parts_and_line_numbers(write: Write) -> None:
    text = "# invented\nparts:\n" + PART + PART.replace("ZY-32K", "ZY-32L")
    result = load_catalogs([write("c.yaml", text)])
    assert list(result.parts["mpn"]) == ["ZY-32K", "ZY-32L"]
    assert list(result.parts["source_line"]) == [3, 12]
    assert result.parts["temp_min_c"].iloc[0] == -40.0
    assert result.parts["esr_ohm"].iloc[0] == 70e3
    assert result.problems == ()


def test_top_level_list_and_values_kept_as_written(write: Write) -> None:
    # YAML 1.1 would read 'no' as False and 1-3 stays text; we keep what was written.
    text = PART.replace("  - ", "- ", 1).replace("\n    ", "\n  ") + "  pinout: 1-3\n"
    result = load_catalogs([write("c.yml", text)])
    assert result.parts["pinout"].iloc[0] == "1-3"
    assert result.parts["package"].iloc[0] == "2012"


def test_merge_key_defaults(write: Write) -> None:
    text = (
        "defaults: &d\n  maker: Zyxo\n  package: 3225\n  tolerance: 10 ppm\n"
        "parts:\n"
        "  - <<: *d\n    mpn: ZY-1\n    frequency: 16 MHz\n    load_capacitance: 8 pF\n"
        "    stability: 20 ppm\n    temp_min: -40\n    temp_max: 85\n    esr: 60 ohm\n"
        "    maker: Other\n"
    )
    parts = load_catalogs([write("m.yaml", text)]).parts
    assert parts["package"].iloc[0] == "3225"
    assert parts["maker"].iloc[0] == "Other"  # the explicit key wins over the merge


def test_python_tags_are_refused_and_nothing_is_constructed(write: Write, tmp_path: Path) -> None:
    marker = tmp_path / "constructed"
    text = (
        "parts:\n"
        f"  - mpn: !!python/object/apply:os.system ['touch {marker}']\n"
        "    frequency: 16 MHz\n"
        f"  - !!python/object/new:pathlib.Path ['{marker}']\n" + PART
    )
    result = load_catalogs([write("evil.yaml", text)])
    assert not marker.exists()
    assert list(result.parts["mpn"]) == ["ZY-32K"]
    errors = [p for p in result.problems if p.severity == "error"]
    assert [p.line for p in errors] == [2, 4], errors
    assert all("!!python/object" in p.message for p in errors), errors


def test_root_tag_is_refused(write: Write, tmp_path: Path) -> None:
    with pytest.raises(CatalogError, match="not allowed"):
        read_yaml_table(write("evil.yaml", "!!python/object/apply:os.getcwd []\n"))


def test_alias_bomb_is_refused_quickly(write: Write) -> None:
    # The classic exponential-expansion document ("billion laughs", YAML flavour).
    lines = ['a: &a ["lol","lol","lol","lol","lol","lol","lol","lol","lol"]']
    for level in "bcdefghi":
        previous = chr(ord(level) - 1)
        lines.append(f"{level}: &{level} [" + ",".join([f"*{previous}"] * 9) + "]")
    lines.append("parts:\n  - mpn: Z\n    notes: *i")
    with pytest.raises(CatalogError, match="alias bomb"):
        read_yaml_table(write("bomb.yaml", "\n".join(lines) + "\n"))


def test_alias_count_is_capped(write: Write) -> None:
    text = "a: &a x\nparts:\n  - mpn: Z\n    notes: [" + ",".join(["*a"] * 1500) + "]\n"
    with pytest.raises(CatalogError, match="aliases"):
        read_yaml_table(write("many.yaml", text))


def test_alias_expansion_budget_catches_smaller_bombs(write: Write) -> None:
    # Few aliases (under the alias cap) but still a large expansion.
    lines = ['a: &a ["x","x","x","x","x","x","x","x","x","x"]']
    for level in "bcdef":
        previous = chr(ord(level) - 1)
        lines.append(f"{level}: &{level} [" + ",".join([f"*{previous}"] * 10) + "]")
    lines.append("parts:\n  - mpn: Z\n    notes: *f")
    with pytest.raises(CatalogError, match="alias bomb"):
        read_yaml_table(write("bomb.yaml", "\n".join(lines) + "\n"))


@pytest.mark.parametrize(
    ("text", "message"),
    [
        ("just text\n", "single value"),
        ("42\n", "single value"),
        ("name: x\n", "without 'parts:'"),
        ("parts: 3\n", "must be a list"),
        ("a: [1,\n", "not valid YAML"),
        ("---\na: 1\n---\nb: 2\n", "not valid YAML"),
        ("# only a comment\n", "empty"),
    ],
)
def test_unusable_documents(write: Write, text: str, message: str) -> None:
    with pytest.raises(CatalogError, match=message):
        read_yaml_table(write("bad.yaml", text))


def test_deep_nesting_is_refused(write: Write) -> None:
    # libyaml refuses very deep documents itself; our own cap stops at 32 levels.
    with pytest.raises(CatalogError, match="nest"):
        read_yaml_table(write("deep.yaml", "[" * 5000 + "]" * 5000 + "\n"))
    with pytest.raises(CatalogError, match="nested deeper than 32"):
        read_yaml_table(write("deep.yaml", "[" * 40 + "]" * 40 + "\n"))


def test_item_that_is_not_a_mapping_is_one_problem(write: Write) -> None:
    result = load_catalogs([write("c.yaml", "parts:\n  - just a string\n" + PART)])
    assert list(result.parts["mpn"]) == ["ZY-32K"]
    assert result.problems[0].line == 2
