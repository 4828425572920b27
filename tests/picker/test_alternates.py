"""find_alternates on prepared variants of one reference part.

Reference: 32.768 kHz would be the classic near-miss case, so the reference here is a
tuning fork at 32.768 kHz, CL 7 pF, package 3215, pinout unstated (2-pad), plus a 4-pad
16 MHz AT-cut reference for the pinout cases.
"""

from __future__ import annotations

import math

import pytest

from picker.alternates import find_alternates
from tests.picker.sample_parts import brief, part, table

FORK = dict(
    freq_hz=32768.0,
    cut="tuning_fork",
    load_capacitance_f=7e-12,
    package="3215",
    pinout="",
    esr_ohm=70e3,
    c0_f=1.0e-12,
    c1_f=3.0e-15,
    stability_ppm=float("nan"),
    drive_level_w=0.5e-6,
    tolerance_ppm=20.0,
    temp_min_c=-40.0,
    temp_max_c=85.0,
    height_mm=0.8,
)


def fork(mpn: str, **changes: object) -> dict:
    return part(mpn, **{**FORK, **changes})


FORK_CATALOG = [
    fork("REF"),
    fork("SAME-BETTER-ESR", esr_ohm=50e3),
    fork("OTHER-CL", load_capacitance_f=12.5e-12),
    fork("NEAR-MISS", freq_hz=32000.0),
    fork("SERIES", series_calibrated=True),
    fork("TALLER", height_mm=1.0),
    fork("OTHER-PACKAGE", package="2012"),
    fork("WORSE-ESR", esr_ohm=90e3),
]


def classes(result) -> dict[str, str]:  # type: ignore[no-untyped-def]
    return {alt.mpn: alt.fit for alt in result.rows}


def differences(result, mpn: str) -> tuple[str, ...]:  # type: ignore[no-untyped-def]
    return next(alt.differences for alt in result.rows if alt.mpn == mpn)


def test_classes_without_a_brief() -> None:
    result = find_alternates(table(FORK_CATALOG), "REF", None)
    assert classes(result) == {
        "SAME-BETTER-ESR": "drop_in",
        "OTHER-CL": "drop_in_new_caps",
        "NEAR-MISS": "incompatible",
        "SERIES": "review",
        "TALLER": "review",
        "OTHER-PACKAGE": "incompatible",
        "WORSE-ESR": "review",  # no circuit to judge a worse ESR by
    }
    assert "REF" not in classes(result)
    # Closest first: the drop-in, then the new-caps one, then reviews, incompatible last.
    order = [alt.fit for alt in result.rows]
    assert order == sorted(
        order, key=["drop_in", "drop_in_new_caps", "review", "incompatible"].index
    )


def test_near_miss_frequency_is_said_with_ppm() -> None:
    # (32000 − 32768)/32768 = −23 437.5 ppm
    result = find_alternates(table(FORK_CATALOG), "REF", None)
    text = differences(result, "NEAR-MISS")[0]
    assert text == ("near miss: 32.000 kHz is NOT 32.768 kHz (-23,437.5 ppm); not interchangeable")


def test_new_caps_are_named_with_standard_values() -> None:
    # Without a brief: stray 2 pF and pin 1.5 pF assumed (the brief defaults). CL 7 pF:
    # ideal 2·(7 − 2) − 1.5 = 8.5 pF; CL 12.5 pF: 2·(12.5 − 2) − 1.5 = 19.5 pF (E12 values
    # around them: 8.2/10 and 18/22 pF).
    result = find_alternates(table(FORK_CATALOG), "REF", None)
    alt = next(a for a in result.rows if a.mpn == "OTHER-CL")
    assert alt.new_caps_f is not None
    e12 = {1.0, 1.2, 1.5, 1.8, 2.2, 2.7, 3.3, 3.9, 4.7, 5.6, 6.8, 8.2}
    for value in alt.new_caps_f:
        mantissa = value * 1e12 / 10 ** math.floor(math.log10(value * 1e12))
        assert round(mantissa, 3) in e12
    assert alt.differences[0].startswith("load capacitance 12.5 pF vs 7 pF: change both caps from")


def test_series_calibrated_alternate_states_the_offset() -> None:
    # D = C1/(2·(C0 + CL)) = 3e-15/(2·8e-12) = 187.5 ppm above its series resonance at the
    # reference's 7 pF load (IEC 60122-1 first-order offset).
    result = find_alternates(table(FORK_CATALOG), "REF", None)
    text = differences(result, "SERIES")[0]
    assert "series-calibrated" in text and "+188 ppm" in text


def test_taller_and_worse_esr_are_explained() -> None:
    result = find_alternates(table(FORK_CATALOG), "REF", None)
    assert differences(result, "TALLER") == ("height 1 mm vs 0.8 mm: taller, check the enclosure",)
    assert differences(result, "WORSE-ESR") == ("ESR 90 kΩ vs 70 kΩ: worse",)


AT = dict(pinout="1-3")

AT_CATALOG = [
    part("AT-REF", **AT),
    part("AT-SAME", **AT),
    part("AT-24", pinout="2-4"),
    part("AT-NOPIN", pinout=""),
    part("AT-ESR80", esr_ohm=80.0, **AT),
    part("AT-CL12", load_capacitance_f=12e-12, **AT),
    part("AT-WEAK-DRIVE", drive_level_w=5e-6, **AT),
]


def test_pinout_on_four_pad_parts() -> None:
    result = find_alternates(table(AT_CATALOG), "AT-REF", None)
    got = classes(result)
    assert got["AT-SAME"] == "drop_in"
    assert got["AT-24"] == "incompatible"
    assert got["AT-NOPIN"] == "review"
    assert differences(result, "AT-24")[0] == (
        "crystal pads 2-4 vs 1-3: a different pinout on the same footprint"
    )


def test_with_a_brief_figures_are_recomputed_per_alternate() -> None:
    # In the 16 MHz test circuit (test_rank): |Rneg| = 656.8 Ω, so ESR 60 Ω gives margin
    # 10.9 and ESR 80 Ω gives 8.2: still fit, so a worse ESR is a drop-in with its cost said.
    b = brief()
    result = find_alternates(table(AT_CATALOG), "AT-REF", b)
    got = classes(result)
    assert got["AT-ESR80"] == "drop_in"
    text = differences(result, "AT-ESR80")[0]
    assert text == "ESR 80 Ω vs 60 Ω: margin 8.2 instead of 11 in this circuit"
    # CL 12 pF: new E12 caps from the brief's board (ideal 2·(12 − 2) − 1 = 19 pF). Equal 18:
    # 9.5 + 2 = 11.5 pF; 18 + 22: 19·23/42 + 2 = 12.40 pF; 15 + 27: 16·28/44 + 2 = 12.18 pF,
    # the closest with a ratio under 2, so the unequal 15 + 27 pF pair is named.
    cl12 = next(a for a in result.rows if a.mpn == "AT-CL12")
    assert cl12.fit == "drop_in_new_caps"
    assert (
        cl12.differences[0]
        == "load capacitance 12 pF vs 8 pF: change both caps from 10 pF + 12 pF to 15 pF + 27 pF"
    )
    # A drive rating below this circuit's 7.52 µW drive level: over-driven, incompatible.
    assert got["AT-WEAK-DRIVE"] == "incompatible"
    assert any("over-driven" in d for d in differences(result, "AT-WEAK-DRIVE"))
    row = result.analysis_row(cl12.position)
    assert row is not None and row["mpn"] == "AT-CL12"


def test_unknown_reference_raises_key_error() -> None:
    with pytest.raises(KeyError):
        find_alternates(table(AT_CATALOG), "NOPE", None)


def test_top_n_is_the_head_of_the_full_order() -> None:
    # top(n) sorts only the rows that can reach the first n places; it must agree with the
    # full order, ties (equal parts) broken by part number in both.
    rows = [fork("REF")] + [fork(f"TWIN-{i:02d}") for i in range(12, 0, -1)]
    rows += [fork(f"FAR-{i}", package="2012") for i in range(5)]
    result = find_alternates(table(rows), "REF", None)
    head = [a.mpn for a in result.top(5)]
    assert head == ["TWIN-01", "TWIN-02", "TWIN-03", "TWIN-04", "TWIN-05"]
    fresh = find_alternates(table(rows), "REF", None)
    assert [a.mpn for a in fresh.rows][:5] == head
    assert result.size == 17


def test_obsolete_part_is_not_a_drop_in() -> None:
    result = find_alternates(table([fork("REF"), fork("OLD", lifecycle="obsolete")]), "REF", None)
    (alt,) = result.rows
    assert alt.fit == "review"
    assert alt.differences[0] == "lifecycle obsolete: not for new purchases"
