"""Brief fields that used to be wrong: the height limit, the max_esr grid with a C0 axis."""

from __future__ import annotations

import shutil
from dataclasses import replace
from pathlib import Path

from textual.widgets import Input

from picker.brief import brief_to_mapping, load_brief, parse_brief
from picker.tui.app import PickerApp
from picker.tui.brief_fields import field_value, flatten_brief, with_value
from picker.tui.brief_pane import BriefPane
from picker.tui.core import PickerCore
from tests.tui.test_app import settle, type_into
from tests.tui.test_brief_files import answer_path_dialog

DEMO_BRIEFS = Path(__file__).parents[2] / "demo_catalog" / "briefs"
ETHERNET = DEMO_BRIEFS / "ethernet_gateway.yaml"


def _fields(data: dict[str, object]) -> dict[str, tuple[object, str]]:
    return {f.label: (f, text) for f, text in flatten_brief(data)}


def test_height_limit_is_offered_and_round_trips_through_the_brief_parser() -> None:
    # The brief key is limits.max_height, a length; picker.brief.Limits holds it in mm.
    data = PickerCore().read_brief(ETHERNET)
    fields = _fields(data)
    assert "limits.max_height_mm" not in fields
    field, text = fields["limits.max_height"]
    assert text == ""  # not in this brief, offered empty
    assert field.dimension == "length"  # type: ignore[attr-defined]
    edited = with_value(data, field.path, field_value(field, "0.9 mm"))  # type: ignore[attr-defined,arg-type]
    brief = parse_brief(edited)
    assert abs(brief.limits.max_height_mm - 0.9) < 1e-12  # type: ignore[operator]
    # 0.035 in = 0.889 mm exactly (1 in = 25.4 mm, NIST SP 811 appendix B).
    inch = parse_brief(with_value(data, field.path, "0.035 in"))
    assert abs(inch.limits.max_height_mm - 0.889) < 1e-12  # type: ignore[operator]
    # Shown again from the parsed brief, the field holds the same length.
    again = _fields(brief_to_mapping(brief, include_defaults=True))["limits.max_height"][1]
    assert parse_brief(with_value(data, ("limits", "max_height"), again)) == brief
    # An emptied field leaves the key out, so the limit is gone.
    assert parse_brief(with_value(edited, field.path, None)).limits.max_height_mm is None  # type: ignore[attr-defined]


def test_max_esr_grid_rows_are_read_only_and_axes_have_their_dimension() -> None:
    fields = _fields(PickerCore().read_brief(ETHERNET))
    esr, text = fields["amplifier.max_esr.esr"]
    assert esr.read_only  # type: ignore[attr-defined]
    assert text.startswith("[90 Ω, 80 Ω, 60 Ω]; [80 Ω")
    assert text.endswith("[50 Ω, 40 Ω, —]")
    assert fields["amplifier.max_esr.load_capacitance"][0].dimension == "capacitance"  # type: ignore[attr-defined]
    assert fields["amplifier.max_esr.c0"][0].dimension == "capacitance"  # type: ignore[attr-defined]
    assert not fields["amplifier.max_esr.c0"][0].read_only  # type: ignore[attr-defined]


async def test_ethernet_brief_survives_an_edit_and_a_save(
    catalog_files: tuple[Path, Path], tmp_path: Path, monkeypatch: object
) -> None:
    monkeypatch.setenv("PICKER_NO_CACHE", "1")  # type: ignore[attr-defined]
    catalog, _ = catalog_files
    brief_path = tmp_path / "ethernet.yaml"
    shutil.copyfile(ETHERNET, brief_path)
    target = tmp_path / "saved.yaml"
    app = PickerApp(PickerCore(), [catalog], brief_path)
    async with app.run_test(size=(100, 40)) as pilot:
        await settle(app, pilot)
        pane = app.query_one(BriefPane)
        labels = [f.label for f in pane._fields]
        esr = app.query_one(f"#brief-field-{labels.index('amplifier.max_esr.esr')}", Input)
        assert esr.disabled
        await pilot.press("b")
        swing = app.query_one(f"#brief-field-{labels.index('amplifier.swing')}", Input)
        await type_into(pilot, swing, "1.3 V")
        await settle(app, pilot)
        await pilot.press("escape", "ctrl+s")
        await pilot.pause()
        await answer_path_dialog(app, pilot, target)
    original, saved = load_brief(ETHERNET), load_brief(target)
    assert saved.amplifier.swing_v == 1.3
    # Everything else, the grid with its C0 axis and its empty cell included, is unchanged.
    assert saved.amplifier.max_esr == original.amplifier.max_esr
    expected = parse_brief(with_value(brief_to_mapping(original), ("amplifier", "swing"), "1.3 V"))
    # The pane saves defaults explicitly, so only the record of which were defaulted differs.
    assert replace(saved, defaulted=()) == replace(expected, defaulted=())
