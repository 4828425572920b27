"""Property tests: random bytes, text and mappings raise nothing but the project's errors.

Example counts are bounded so the folder stays fast; hypothesis keeps failing examples in
its database, so a found crash is replayed first on the next run.
"""

from __future__ import annotations

import io
import math
import os
import tempfile
from contextlib import redirect_stderr, redirect_stdout
from pathlib import Path
from typing import get_args
from unittest import mock

from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from catalog.problems import CatalogError
from catalog.reader import load_catalogs
from catalog.units import Dimension, UnitError, parse_quantity
from picker.brief import BriefError, load_brief, parse_brief
from picker.cli import main
from tests.hostile.conftest import HEADER, bounded, part_row

_SCRATCH = Path(tempfile.mkdtemp(prefix="picker-hostile-fuzz-"))
_FAST = settings(max_examples=120, deadline=None, suppress_health_check=[HealthCheck.too_slow])
DIMENSIONS: tuple[str, ...] = get_args(Dimension)

#: Pieces that matter to a unit parser: digits, signs, separators, unit words, symbols.
_UNIT_PIECES = [*"0123456789+-−.,eE ±/%°Ωµμ^²³()[]pFkMWuKs\t\x00\ufeff"]
_UNIT_PIECES += ["Hz", "ohm", "ppm", "degC", "mA/V", "nan", "inf", "max", "typ", "year"]


def _pieces(pieces: list[str], most: int) -> st.SearchStrategy[str]:
    return st.lists(st.sampled_from(pieces), max_size=most).map("".join)


_UNIT_TEXT = _pieces(_UNIT_PIECES, 12)


@_FAST
@given(text=st.one_of(st.text(max_size=40), _UNIT_TEXT),
       dimension=st.sampled_from(DIMENSIONS))  # fmt: skip
def test_unit_parser_text(text: str, dimension: str) -> None:
    try:
        value = parse_quantity(text, dimension)  # type: ignore[arg-type]
    except UnitError as error:
        assert "\n" not in str(error)
        return
    assert isinstance(value, float) and math.isfinite(value)


@_FAST
@given(number=st.one_of(st.floats(allow_nan=True, allow_infinity=True), st.integers()),
       dimension=st.sampled_from(DIMENSIONS))  # fmt: skip
def test_unit_parser_numbers(number: float | int, dimension: str) -> None:
    try:
        value = parse_quantity(number, dimension)  # type: ignore[arg-type]
    except UnitError:
        return
    assert math.isfinite(value)


@settings(max_examples=80, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(data=st.binary(max_size=3000), suffix=st.sampled_from([".csv", ".yaml", ".yml"]))
def test_reader_over_random_bytes(data: bytes, suffix: str) -> None:
    path = _SCRATCH / f"random{suffix}"
    path.write_bytes(data)
    try:
        with bounded(10):
            result = load_catalogs([path])
    except CatalogError as error:
        assert str(path) in str(error)
    else:
        assert result.parts["mpn"].is_unique
        assert all(p.path == str(path) for p in result.problems)
    assert path.read_bytes() == data


_CELL = st.one_of(
    _pieces(_UNIT_PIECES, 8),
    st.sampled_from(["", '"', '""', ";", ",", "\n", "\r", "16 MHz", "80 ohm", "12 pF", "-40"]),
)


@settings(max_examples=40, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(rows=st.lists(st.lists(_CELL, max_size=20), max_size=12), good=st.integers(0, 3))
def test_cli_lint_over_random_tables(rows: list[list[str]], good: int) -> None:
    """Random rows around good ones: exit 0/1 (never 2: the header and good rows are usable),
    no traceback, every good row loads."""
    lines = [HEADER, *(part_row(f"QN-FZ{i}") for i in range(good)), *(",".join(r) for r in rows)]
    path = _SCRATCH / "table.csv"
    path.write_text("\n".join(lines) + "\n", encoding="utf-8")
    out, err = io.StringIO(), io.StringIO()
    with (
        mock.patch.dict(os.environ, {"PICKER_CACHE_DIR": str(_SCRATCH / "cache")}),
        redirect_stdout(out),
        redirect_stderr(err),
        bounded(10),
    ):
        code = main(["lint", str(path), "--format", "json"])
    assert "Traceback" not in out.getvalue() + err.getvalue()
    assert code in (0, 1), err.getvalue()
    if good:
        import json

        loaded = json.loads(out.getvalue())["rows_loaded"]
        assert loaded >= 1  # good rows survive whatever follows them (a quote may eat some)


_KEYS = st.sampled_from(
    ["name", "preset", "frequency", "budget", "temperature", "lifetime", "clock_role", "can",
     "amplifier", "board", "limits", "weights", "gm", "gm_crit_max", "max_esr",
     "negative_resistance", "pin_capacitance", "swing", "stray_capacitance", "fixed_caps",
     "cap_series", "min_margin", "packages", "budjet", "6 pF", "low", "form", "range", "step"]
)  # fmt: skip
_LEAVES = st.one_of(
    st.none(),
    st.booleans(),
    st.integers(-(10**6), 10**6),
    st.floats(allow_nan=True, allow_infinity=True),
    _pieces(_UNIT_PIECES, 10),
    st.sampled_from(
        ["16 MHz", "40 ppm", "9 mA/V", "12 pF", "E12", "usb_fs", "-40 degC", "10 year"]
    ),
)
_VALUES = st.recursive(
    _LEAVES,
    lambda inner: st.one_of(st.lists(inner, max_size=4), st.dictionaries(_KEYS, inner, max_size=5)),
    max_leaves=25,
)


@settings(max_examples=150, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(data=st.one_of(st.dictionaries(_KEYS, _VALUES, max_size=8), _VALUES))
def test_brief_parser_over_random_mappings(data: object) -> None:
    try:
        with bounded(10):
            brief = parse_brief(data)
    except BriefError as error:
        assert "\n" not in str(error)
        return
    assert math.isfinite(brief.frequency_hz) and brief.frequency_hz > 0
    assert math.isfinite(brief.budget_ppm) and brief.budget_ppm > 0
    assert brief.temp_min_c <= brief.temp_max_c


@_FAST
@given(text=_pieces([*"-:&*!<[]{}\n #'\"x1|>", "  ", "frequency", "budget", "amplifier", "gm",
                     "16 MHz", "!!python/object/apply:os.system ", "*a", "&a "], 60))  # fmt: skip
def test_load_brief_over_random_yamlish_text(text: str) -> None:
    path = _SCRATCH / "brief.yaml"
    path.write_text(text, encoding="utf-8")
    try:
        with bounded(10):
            load_brief(path)
    except BriefError as error:
        assert str(error).startswith(str(path))
