"""The committed demo catalogs: counts, makers, physical sanity of every row, no real brands.

The files are read with the small independent parser in ``committed.py``, not with the
code that wrote them.
"""

from __future__ import annotations

import re

import numpy as np
import pandas as pd
import pytest

from demo_catalog import demo_catalog_paths

from .committed import CSV_PATH, YAML_PATH, read_all

FORK_PACKAGES = {"1610", "2012", "3215", "7015", "CYL2X6", "CYL3X8"}
FOUR_PAD_ONLY = {"1612", "2016", "2520", "3225"}
TWO_PAD_ONLY = {"HC-49/US", "HC-49/SMD"} | FORK_PACKAGES
# Nominal body length x width [mm] of the usual package codes (the code is the size:
# "3225" = 3.2 x 2.5 mm; HC-49 outline from memory).
BODY_MM = {
    "1610": (1.6, 1.0),
    "1612": (1.6, 1.2),
    "2012": (2.0, 1.2),
    "2016": (2.0, 1.6),
    "2520": (2.5, 2.0),
    "3215": (3.2, 1.5),
    "3225": (3.2, 2.5),
    "5032": (5.0, 3.2),
    "7015": (7.0, 1.5),
    "7050": (7.0, 5.0),
    "HC-49/SMD": (11.4, 4.7),
    "HC-49/US": (11.05, 4.65),
    "CYL2X6": (6.0, 2.0),
    "CYL3X8": (8.0, 3.0),
}


def within(values: pd.Series, low: float, high: float) -> bool:
    """All values in [low, high], allowing for the last bit of a decimal-to-binary step."""
    return bool(values.between(low - abs(low) * 1e-9, high + abs(high) * 1e-9).all())


@pytest.fixture(scope="module")
def parts() -> pd.DataFrame:
    return read_all()


def test_counts_and_makers(parts: pd.DataFrame) -> None:
    assert len(parts) >= 1500
    assert parts["mpn"].is_unique, "a part number appears twice"
    makers = set(parts["maker"])
    assert 4 <= len(makers) <= 6
    by_file = parts.groupby("source")["maker"].agg(set)
    assert set(by_file.index) == {CSV_PATH.name, YAML_PATH.name}
    assert not (by_file[CSV_PATH.name] & by_file[YAML_PATH.name]), "makers shared by files"
    # Each maker is a real share of the data, not a token row.
    assert parts["maker"].value_counts().min() >= 100


def test_about_ten_percent_have_no_motional_figures(parts: pd.DataFrame) -> None:
    share = parts["c1"].isna().mean()
    assert 0.07 <= share <= 0.13
    assert (parts["c1"].isna() == parts["c0"].isna()).all()


def test_families_are_all_present(parts: pd.DataFrame) -> None:
    forks = parts["cut"] == "tuning_fork"
    assert forks.sum() >= 150
    assert (parts.loc[forks, "freq_hz"] == 32768.0).sum() >= 150
    # A handful of 32.000 kHz forks: the trap for alternates.
    assert 3 <= (parts.loc[forks, "freq_hz"] == 32000.0).sum() <= 30
    assert set(parts.loc[forks, "freq_hz"]) == {32768.0, 32000.0}
    at = parts.loc[~forks]
    common_mhz = {8, 10, 12, 16, 19.2, 20, 24, 25, 26, 27, 32, 38.4, 40, 48, 50, 54}
    assert common_mhz <= set(np.round(at.loc[at["mode"] == "fundamental", "freq_hz"] / 1e6, 3))
    overtone = at["mode"].isin(["overtone3", "overtone5"])
    assert overtone.sum() >= 50 and (at["mode"] == "overtone5").sum() >= 5
    assert at.loc[overtone, "freq_hz"].between(60e6, 125e6).all()
    assert at.loc[~overtone, "freq_hz"].between(8e6, 54e6).all()
    assert 5 <= parts["series"].sum() <= 0.1 * len(parts)


def test_quality_factor_is_physical(parts: pd.DataFrame) -> None:
    # Butterworth-Van Dyke: Q = 1 / (2π f R1 C1) (IEC 60122-1 terms; any crystal text).
    # Common practice: 1e4..1e6 for AT-cut parts evaluated at their ESR max; tuning forks
    # land in the same band at 32 kHz with tens of kilohms and a few fF.
    given = parts.dropna(subset=["c1"])
    q = 1.0 / (2.0 * np.pi * given["freq_hz"] * given["esr"] * given["c1"])
    assert q.between(1e4, 1e6).all(), given.loc[~q.between(1e4, 1e6), "mpn"].tolist()


def test_motional_and_shunt_capacitance_ranges(parts: pd.DataFrame) -> None:
    given = parts.dropna(subset=["c0"])
    fork = given["cut"] == "tuning_fork"
    overtone = given["mode"] != "fundamental"
    assert (given["c0"] > 0).all()
    assert within(given.loc[fork, "c0"], 0.8e-12, 1.5e-12)
    assert within(given.loc[fork, "c1"], 2e-15, 5e-15)
    assert within(given.loc[~fork, "c0"], 1e-12, 7e-12)
    assert within(given.loc[~fork & overtone, "c1"], 0.3e-15, 2e-15)
    assert within(given.loc[~fork & ~overtone, "c1"], 1e-15, 30e-15)
    # Common practice: capacitance ratio r = C0/C1 of a few hundred for AT fundamentals,
    # larger for overtones (r grows with the square of the overtone order).
    ratio = given["c0"] / given["c1"]
    assert ratio[~fork & ~overtone].min() > 150
    assert ratio[~fork & overtone].median() > ratio[~fork & ~overtone].median() * 3


def test_esr_follows_package_and_frequency(parts: pd.DataFrame) -> None:
    fork = parts["cut"] == "tuning_fork"
    assert within(parts.loc[fork, "esr"], 35e3, 90e3)
    at = parts.loc[~fork]
    assert at["esr"].between(20.0, 200.0).all()
    fundamental = at.loc[at["mode"] == "fundamental"]

    def median(package: str, mhz: float) -> float:
        rows = fundamental.loc[
            (fundamental["package"] == package) & (fundamental["freq_hz"] == mhz * 1e6), "esr"
        ]
        assert len(rows) >= 3, (package, mhz)
        return float(rows.median())

    # Smaller package or lower frequency -> higher ESR (common practice).
    assert median("5032", 8) > median("5032", 16)
    assert median("2016", 24) > median("3225", 24)
    assert median("2520", 16) > median("3225", 16)
    assert fundamental.loc[fundamental["freq_hz"] >= 40e6, "esr"].median() <= 50.0


def test_rated_figures_are_in_catalog_ranges(parts: pd.DataFrame) -> None:
    fork = parts["cut"] == "tuning_fork"
    assert set(parts.loc[fork, "tolerance"]) <= {10.0, 20.0}
    assert set(parts.loc[~fork, "tolerance"]) <= {10.0, 15.0, 20.0, 30.0, 50.0}
    assert set(parts.loc[~fork, "stability"]) <= {10.0, 15.0, 20.0, 30.0, 50.0}
    assert parts.loc[fork, "stability"].isna().mean() > 0.5  # often absent for forks
    loads = parts.loc[~parts["series"], "load_f"] * 1e12
    assert set(np.round(loads, 3)) <= {6.0, 7.0, 8.0, 9.0, 10.0, 12.0, 12.5, 16.0, 18.0, 20.0}
    assert set(np.round(parts.loc[fork & ~parts["series"], "load_f"] * 1e12, 3)) <= {
        6.0,
        7.0,
        9.0,
        12.5,
    }
    assert (parts["temp_min"] < 25).all() and (parts["temp_max"] > 25).all()
    assert set(parts["temp_min"]) <= {-40.0, -20.0, 0.0}
    assert within(parts.loc[fork, "drive"], 0.5e-6, 1e-6)
    assert within(parts.loc[~fork, "drive"], 10e-6, 300e-6)
    aging = parts["aging"].dropna()
    assert set(aging) <= {1.0, 2.0, 3.0, 5.0}
    betas = parts["beta"].dropna()
    assert parts.loc[parts["beta"].notna(), "cut"].eq("tuning_fork").all()
    # Typical parabola, β = -0.034 ± 0.006 ppm/°C² with T0 = 25 ± 5 °C (DESIGN.md §4).
    assert betas.between(-0.04, -0.028).all()
    assert parts["turnover"].dropna().between(20.0, 30.0).all()


def test_size_and_pads_match_the_package(parts: pd.DataFrame) -> None:
    for package, group in parts.groupby("package"):
        length, width = BODY_MM[str(package)]
        assert np.allclose(group["length"], length) and np.allclose(group["width"], width)
        assert (group["height"] <= group["width"]).all()
    assert parts.loc[parts["package"] == "2016", "height"].between(0.45, 0.8).all()
    assert parts.loc[parts["package"] == "2016", "height"].nunique() >= 3
    assert parts.loc[parts["package"].isin(FOUR_PAD_ONLY), "pinout"].isin(["1-3", "2-4"]).all()
    assert (parts.loc[parts["package"].isin(TWO_PAD_ONLY), "pinout"] == "").all()
    pinouts = parts.loc[parts["pinout"] != "", "pinout"].value_counts(normalize=True)
    assert pinouts["1-3"] > 0.75 and pinouts["2-4"] > 0.03
    two_pad_5032 = (parts["package"] == "5032") & (parts["pinout"] == "")
    assert two_pad_5032.sum() >= 5


def test_commercial_fields(parts: pd.DataFrame) -> None:
    assert parts["price"].between(0.05, 2.0).all()
    assert parts["stock"].between(0, 200_000).all()
    assert (parts["stock"] == 0).mean() > 0.03
    shares = parts["lifecycle"].value_counts(normalize=True)
    assert set(shares.index) == {"active", "nrnd", "obsolete"}
    assert shares["active"] > 0.75 and shares["obsolete"] < shares["nrnd"]
    assert set(parts["qualification"]) == {"", "AEC-Q200"}
    assert (parts["msl"] == "1").mean() > 0.85
    assert parts["mode"].isin(["fundamental", "overtone3", "overtone5"]).all()


# Well-known crystal and frequency-control brands, from memory; none may appear in the
# demo data. Written independently of the demo's invented names.
REAL_BRANDS = (
    "Epson",
    "Seiko",
    "NDK",
    "Nihon Dempa",
    "Kyocera",
    "AVX",
    "KDS",
    "Daishinku",
    "TXC",
    "Abracon",
    "ECS Inc",
    "Fox Electronics",
    "Citizen",
    "IQD",
    "Rakon",
    "Murata",
    "Raltron",
    "Micro Crystal",
    "Jauch",
    "Geyer",
    "Ecliptek",
    "CTS",
    "Vectron",
    "Hosonic",
    "Siward",
    "Suntsu",
    "Taitien",
    "Diodes",
    "Pericom",
    "Saronix",
    "SiTime",
    "Cardinal",
    "MtronPTI",
    "Bliley",
    "Golledge",
    "Euroquartz",
    "Statek",
    "Crystek",
    "Pletronics",
    "Connor-Winfield",
    "Aker",
    "Harmony",
    "NKG",
    "River Eletec",
    "YXC",
    "Yangxing",
    "Valpey",
    "Petermann",
    "Qantek",
    "Wi2Wi",
    "Interquip",
    "Mercury",
    "Fronter",
    "ILSI",
    "Renesas",
    "Microchip",
)
# Part-number openings of well-known crystal ranges, from memory.
REAL_PART_PREFIXES = (
    "ABM",
    "ABS0",
    "ECS-",
    "FA-",
    "FC-",
    "TSX-",
    "NX",
    "FX",
    "CX3",
    "7M",
    "8Y",
    "9B",
    "X1E",
    "Q13",
    "Q24",
    "SIT",
    "DSX",
    "SC-32",
    "CM315",
)


def test_no_real_brand_or_part_number_pattern(parts: pd.DataFrame) -> None:
    for path in demo_catalog_paths():
        text = path.read_text(encoding="utf-8")
        for brand in REAL_BRANDS:
            assert not re.search(rf"\b{re.escape(brand)}\b", text, re.IGNORECASE), (
                f"{brand!r} appears in {path.name}"
            )
    upper = parts["mpn"].str.upper()
    for prefix in REAL_PART_PREFIXES:
        assert not upper.str.startswith(prefix).any(), prefix


def test_the_brand_list_can_catch_a_brand() -> None:
    # The check above must be able to fail: a planted brand is found.
    planted = "Part Number,Manufacturer\nX1,Raltron\n"
    assert any(re.search(rf"\b{re.escape(b)}\b", planted, re.IGNORECASE) for b in REAL_BRANDS)
