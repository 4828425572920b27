"""Statuses, reasons, order and score of rank_parts on a hand-computed catalog.

The circuit (tests.picker.sample_parts.brief): 16 MHz, gm = 10 mA/V, pin 1 pF, stray 2 pF,
min margin 5 (common practice), marginal band 20 %, budget 100 ppm.
Every part is specified at CL 8 pF with C0 = 2 pF, so (see test_analysis) the E12 caps are
10 pF + 12 pF: Cg = 11 pF, Cd = 13 pF, C3 = C0 + stray = 4 pF, ω = 2π·16 MHz.
Lossless Re(Zc) = −gm·Cg·Cd / ((gm·C3)² + ω²·(Cg·Cd + C3·(Cg+Cd))²)  (Vittoz 2010, ch. 3):
  gm·C3 = 4e-14 → 1.6e-27;  K = 143e-24 + 4e-12·24e-12 = 2.39e-22;  (ω·K)² = 5.773e-28;
  Rneg = −1.43e-24 / 2.1773e-27 = −656.8 Ω.
|Rneg|max = Cg·Cd / (2·ω·C3·K) = 1.43e-22 / 1.922e-25 = 744.0 Ω.
So ESR 30 Ω → M = 21.9, 60 Ω → 10.9 (fit); 120 Ω → 5.47 (within 20 % above 5: marginal);
140 Ω → 4.69 (ruled out, margin); 800 Ω > 744 Ω (can never start).
Budget: tolerance 10 + stability 10 + aging 2·1.63 = 3.3 + pulling ≈ 1 + spread ≈ 16 ppm
≈ 40 ppm < 100; with tolerance and stability 50 ppm each it exceeds 100 ppm.
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from picker.rank import RULES, rank_parts
from tests.picker.sample_parts import brief, part, table

TWO_PI = 2.0 * math.pi


def hand_rneg(gm: float = 10e-3) -> float:
    omega = TWO_PI * 16e6
    cg, cd, c3 = 11e-12, 13e-12, 4e-12
    k = cg * cd + c3 * (cg + cd)
    return -gm * cg * cd / ((gm * c3) ** 2 + (omega * k) ** 2)


CATALOG = [
    part("GOOD-LOWESR", esr_ohm=30.0),
    part("GOOD", esr_ohm=60.0),
    part("MARGINAL-M", esr_ohm=120.0),
    part("LOW-MARGIN", esr_ohm=140.0),
    part("NEVER", esr_ohm=800.0),
    part("WRONG-F", freq_hz=16.000016e6),
    part("NARROW-T", temp_min_c=-20.0, temp_max_c=70.0),
    part("OVER-BUDGET", tolerance_ppm=50.0, stability_ppm=50.0),
    part("OBSOLETE", lifecycle="obsolete"),
]


@pytest.fixture(scope="module")
def ranking():  # type: ignore[no-untyped-def]
    return rank_parts(table(CATALOG), brief())


def test_hand_computed_negative_resistance(ranking) -> None:  # type: ignore[no-untyped-def]
    good = ranking.row("GOOD")
    assert hand_rneg() == pytest.approx(-656.8, abs=0.5)
    assert good["negative_resistance_ohm"] == pytest.approx(hand_rneg(), rel=1e-9)
    assert good["negative_resistance_max_ohm"] == pytest.approx(744.0, abs=0.5)


def test_statuses(ranking) -> None:  # type: ignore[no-untyped-def]
    status = {row["mpn"]: str(row["status"]) for _, row in ranking.table.iterrows()}
    assert status == {
        "GOOD-LOWESR": "fit",
        "GOOD": "fit",
        "MARGINAL-M": "marginal",
        "LOW-MARGIN": "ruled_out",
        "NEVER": "ruled_out",
        "WRONG-F": "ruled_out",
        "NARROW-T": "ruled_out",
        "OVER-BUDGET": "ruled_out",
        "OBSOLETE": "ruled_out",
    }
    assert ranking.counts == {"fit": 2, "marginal": 1, "ruled_out": 6}


def test_order_best_first(ranking) -> None:  # type: ignore[no-untyped-def]
    order = ranking.table["mpn"].tolist()
    assert order[:3] == ["GOOD-LOWESR", "GOOD", "MARGINAL-M"]
    assert ranking.fits["mpn"].tolist() == order[:3]
    assert set(ranking.ruled_out["mpn"]) == set(order[3:])


def test_first_reasons_carry_the_numbers(ranking) -> None:  # type: ignore[no-untyped-def]
    def first(mpn: str) -> str:
        return ranking.reasons(ranking.row(mpn))[0]

    margin = -hand_rneg() / 140.0
    assert first("LOW-MARGIN") == f"margin {margin:.2g} < 5 with this amplifier"
    assert "can never start" in first("NEVER")
    # NEVER also fails the margin rule, but never-starting is the more fundamental reason.
    assert len(ranking.reasons(ranking.row("NEVER"))) >= 2
    assert ranking.reasons(ranking.row("WRONG-F")) == [
        "nominal 16.000016 MHz is not the brief's 16 MHz"
    ]
    assert first("NARROW-T") == "rated −20…70 °C does not cover −40 °C or 85 °C"
    over = ranking.row("OVER-BUDGET")
    assert first("OVER-BUDGET") == (
        f"total error {over['error_total_ppm']:.3g} ppm > budget 100 ppm"
    )
    assert first("OBSOLETE") == "lifecycle 'obsolete' is not allowed"
    assert ranking.reasons(ranking.row("MARGINAL-M")) == [
        f"margin {-hand_rneg() / 120.0:.2g} is within 20 % of the minimum 5"
    ]
    assert ranking.reasons(ranking.row("GOOD")) == []


def test_failure_bits_match_rule_names(ranking) -> None:  # type: ignore[no-untyped-def]
    mask = int(ranking.row("NARROW-T")["fail_mask"])
    assert mask == 1 << RULES.index("temperature_range")


def test_frequency_rule_is_exact_to_one_part_per_billion() -> None:
    parts = table(
        [part("SAME", freq_hz=16e6 * (1 + 5e-10)), part("OFF", freq_hz=16e6 * (1 + 2e-9))]
    )
    r = rank_parts(parts, brief())
    assert str(r.row("SAME")["status"]) != "ruled_out"
    assert str(r.row("OFF")["status"]) == "ruled_out"


def test_package_height_qualification_and_stock_limits() -> None:
    parts = table(
        [
            part("OK", qualification="AEC-Q200"),
            part("BIG", package="5032", qualification="AEC-Q200"),
            part("TALL", height_mm=1.2, qualification="AEC-Q200"),
            part("PLAIN"),
            part("SCARCE", stock=10.0, qualification="AEC-Q200"),
        ]
    )
    b = brief(
        limits={
            "min_margin": 5,
            "packages": ["3225"],
            "max_height": "1 mm",
            "require_qualification": "AEC-Q200",
            "min_stock": 100,
        }
    )
    r = rank_parts(parts, b)
    assert str(r.row("OK")["status"]) == "fit"
    assert r.reasons(r.row("BIG"))[0] == "package 5032 is not allowed (3225)"
    assert r.reasons(r.row("TALL"))[0] == "height 1.2 mm > 1 mm"
    assert r.reasons(r.row("PLAIN"))[0] == "not qualified to AEC-Q200"
    assert r.reasons(r.row("SCARCE"))[0] == "stock 10 < 100"


def test_drive_level_over_the_rating_is_ruled_out() -> None:
    # P = R1·(π·f·Vpp·(C0+CL))²/2 with 60 Ω, 16 MHz, 1 V, 2 + 7.958 pF:
    # (π·16e6·9.958e-12)² = 2.505e-7 → ·60/2 = 7.52 µW.
    parts = table([part("WEAK", drive_level_w=5e-6), part("NEAR", drive_level_w=8.5e-6)])
    r = rank_parts(parts, brief())
    assert r.reasons(r.row("WEAK"))[0] == "drive level 7.52 µW > rating 5 µW"
    assert str(r.row("NEAR")["status"]) == "marginal"  # 7.52 µW > 80 % of 8.5 µW = 6.8 µW
    assert "drive level" in r.reasons(r.row("NEAR"))[0]


def test_max_esr_outside_the_table_is_marginal_with_the_span() -> None:
    b = brief(
        amplifier={
            "max_esr": {"6 pF": "80 ohm", "8 pF": "60 ohm", "12 pF": "40 ohm"},
            "pin_capacitance": "1 pF",
        }
    )
    parts = table([part("IN", esr_ohm=30.0), part("OUT", load_capacitance_f=4e-12, esr_ohm=30.0)])
    r = rank_parts(parts, b)
    assert str(r.row("IN")["status"]) == "fit"  # 60/30 = 2 ≥ 1
    out = r.row("OUT")
    assert str(out["status"]) == "marginal"
    assert r.reasons(out)[0].startswith("CL 4 pF is outside the chip's ESR table (6–12 pF)")
    over = rank_parts(table([part("HIGH", esr_ohm=70.0)]), b)
    assert over.reasons(over.row("HIGH"))[0] == (
        "ESR 70 Ω exceeds the 60 Ω the chip allows at CL 8 pF"
    )


def test_empty_catalog_ranks_to_nothing() -> None:
    r = rank_parts(table([part("X")]).iloc[0:0], brief())
    assert len(r.table) == 0 and r.shortlist_size == 0


def test_score_components_in_unit_range_and_weights_applied(ranking) -> None:  # type: ignore[no-untyped-def]
    table_ = ranking.table
    for name in ("margin", "headroom", "drive", "price", "stock", "lifecycle"):
        values = table_[f"score_{name}"].to_numpy()
        assert ((values >= 0) & (values <= 1)).all()
    row = ranking.row("GOOD")
    w = brief().weights
    weighted = sum(
        getattr(w, n) * row[f"score_{n}"]
        for n in ("margin", "headroom", "drive", "price", "stock", "lifecycle")
    ) / sum(getattr(w, n) for n in ("margin", "headroom", "drive", "price", "stock", "lifecycle"))
    assert row["score"] == pytest.approx(weighted, abs=1e-9)


def test_equal_parts_are_ordered_by_part_number() -> None:
    parts = table([part("ZED"), part("ALPHA"), part("MIKE")])
    assert rank_parts(parts, brief()).table["mpn"].tolist() == ["ALPHA", "MIKE", "ZED"]


better = st.fixed_dictionaries(
    {
        "esr": st.floats(0.0, 0.9),
        "tolerance": st.floats(0.0, 0.9),
        "stability": st.floats(0.0, 0.9),
        "aging": st.floats(0.0, 0.9),
        "price": st.floats(0.0, 0.9),
        "stock": st.floats(1.0, 10.0),
        "drive": st.floats(1.0, 3.0),
        "wider": st.booleans(),
    }
)


@settings(max_examples=40, deadline=None)
@given(
    esr=st.floats(20.0, 200.0),
    tolerance=st.floats(5.0, 60.0),
    stability=st.floats(5.0, 60.0),
    price=st.floats(0.1, 2.0),
    narrow=st.booleans(),
    gain=better,
)
def test_a_part_at_least_as_good_never_ranks_below_its_twin(
    esr: float, tolerance: float, stability: float, price: float, narrow: bool, gain: dict
) -> None:
    base = dict(
        esr_ohm=esr,
        tolerance_ppm=tolerance,
        stability_ppm=stability,
        price=price,
        aging_ppm=3.0,
        stock=500.0,
        drive_level_w=20e-6,
        temp_min_c=-20.0 if narrow else -40.0,
    )
    twin = dict(
        esr_ohm=esr * (1 - gain["esr"]),
        tolerance_ppm=tolerance * (1 - gain["tolerance"]),
        stability_ppm=stability * (1 - gain["stability"]),
        price=price * (1 - gain["price"]),
        aging_ppm=3.0 * (1 - gain["aging"]),
        stock=500.0 * gain["stock"],
        drive_level_w=20e-6 * gain["drive"],
        temp_min_c=-40.0 if gain["wider"] else base["temp_min_c"],
    )
    others = [part(f"OTHER{i}", esr_ohm=40.0 + 15 * i, price=0.2 + 0.1 * i) for i in range(4)]
    # The twin's name sorts after the base's, so an exact tie cannot hide a wrong order.
    parts = table([part("B-BASE", **base), part("Z-TWIN", **twin), *others])
    order = rank_parts(parts, brief()).table["mpn"].tolist()
    r = rank_parts(parts, brief())
    twin_row, base_row = r.row("Z-TWIN"), r.row("B-BASE")
    if base_row["score"] == twin_row["score"] and str(base_row["status"]) == str(
        twin_row["status"]
    ):
        return  # an exact tie (nothing improved enough to show): order falls to the name
    assert order.index("Z-TWIN") < order.index("B-BASE")
    assert np.isfinite(twin_row["score"])


def test_equal_ruled_out_parts_keep_catalog_order() -> None:
    parts = table([part("ZED", freq_hz=25e6), part("ALPHA", freq_hz=25e6), part("OK")])
    assert rank_parts(parts, brief()).table["mpn"].tolist() == ["OK", "ZED", "ALPHA"]
