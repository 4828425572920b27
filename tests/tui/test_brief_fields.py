"""The brief as editable fields and back."""

from __future__ import annotations

from picker.tui.brief_fields import field_for_error, field_value, flatten_brief, with_value
from picker.tui.model import BriefField

BRIEF = {
    "name": "Node",
    "temperature": ["-40 degC", "85 degC"],
    "amplifier": {"gm": {"low": "0.5 mA/V", "high": "2 mA/V"}, "swing": "1 V"},
    "limits": {"min_margin": 5},
}


def test_every_leaf_becomes_a_field_with_its_dimension() -> None:
    fields = {f.label: (f, text) for f, text in flatten_brief(BRIEF)}
    assert list(fields) == [
        "name",
        "temperature",
        "amplifier.gm.low",
        "amplifier.gm.high",
        "amplifier.swing",
        "limits.min_margin",
        "limits.max_height",
    ]
    assert fields["temperature"][1] == "-40 degC, 85 degC"
    assert fields["temperature"][0].is_list
    assert fields["amplifier.gm.low"][0].dimension == "transconductance"
    assert fields["amplifier.swing"][0].dimension == "voltage"
    assert fields["limits.min_margin"][1] == "5"


def test_edit_round_trip_leaves_the_original_untouched() -> None:
    temperature = BriefField(("temperature",), "temperature", "temperature", is_list=True)
    edited = with_value(BRIEF, ("temperature",), field_value(temperature, "-20 degC, 70 degC"))
    assert edited["temperature"] == ["-20 degC", "70 degC"]
    assert BRIEF["temperature"] == ["-40 degC", "85 degC"]
    deeper = with_value(edited, ("amplifier", "gm", "low"), "0.8 mA/V")
    assert deeper["amplifier"]["gm"] == {"low": "0.8 mA/V", "high": "2 mA/V"}  # type: ignore[index]
    assert BRIEF["amplifier"]["gm"]["low"] == "0.5 mA/V"  # type: ignore[index]


def test_empty_text_removes_the_key() -> None:
    name = BriefField(("name",), "name")
    assert "name" not in with_value(BRIEF, ("name",), field_value(name, "  "))


def test_error_messages_find_their_field() -> None:
    labels = ["amplifier.gm", "amplifier.gm_crit_max", "temperature", "name"]
    assert field_for_error("amplifier.gm: expected a transconductance", labels) == "amplifier.gm"
    assert field_for_error("brief.yaml:7: amplifier.gm: bad", labels) == "amplifier.gm"
    assert field_for_error("temperature[1]: below the low end", labels) == "temperature"
    assert field_for_error("not a mapping", labels) is None
