"""Hand-placed demo parts: ones that fit each demo circuit, near-misses, and alternates.

The random fill of :mod:`demo_catalog.draw` makes a catalog look real; these rows make
sure each demo circuit has several parts that fit and several that only just miss, and
that a few reference parts have siblings that differ in exactly one way (the cases an
alternates search must tell apart).

Demo circuits covered (the budgets are the interface figures quoted in DESIGN.md §4; the
packages and ranges follow the demo briefs in ``demo_catalog/briefs``): an RTC and a
Bluetooth LE sleep clock at 32.768 kHz over -40…85 °C in 3215 or 2012; a USB full-speed
device at 24 MHz (and 12 MHz parts); an Ethernet PHY at 25 MHz, ±50 ppm all causes, in
3225 or 2520; a Bluetooth LE radio at 32 MHz, ±40 ppm over -40…85 °C and 10 years, in
2016, 2520 or 1612; a CAN node at 16 MHz over -40…105 °C in 3225 or 5032.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field, replace

import numpy as np
import pandas as pd

from demo_catalog.draw import AT_FUNDAMENTAL, FORK_32K000, FORK_32K768, OVERTONE
from demo_catalog.packages import PACKAGES

KHZ_32 = 32768.0
MHZ = 1e6


@dataclass(frozen=True)
class Spec:
    """One hand-placed part in friendly units (converted to SI by :func:`spec_rows`).

    ``twin_of`` names another spec (same maker): the part number then reuses that part's
    serial with ``-<variant>`` appended, as a maker numbers a variant of one design.
    """

    key: str
    maker: str
    freq_hz: float
    package: str
    load_pf: float | None  # None = series-calibrated
    tolerance: float
    stability: float | None
    temp: tuple[float, float]
    esr_ohm: float
    c0_pf: float | None = None
    c1_ff: float | None = None
    drive_uw: float | None = None
    aging: float | None = 2.0
    height_mm: float | None = None
    pinout: str | None = None
    price: float | None = None
    stock: float = 5000.0
    lifecycle: str = "active"
    qualification: str = ""
    msl: str = "1"
    beta: float | None = None
    turnover: float | None = None
    mode: str = "fundamental"
    twin_of: str = ""
    variant: str = ""
    notes: tuple[str, ...] = field(default=())


def _snap(value: float, step: float) -> float:
    return round(value / step) * step


def _default_c1_ff(spec: Spec) -> float:
    if spec.freq_hz < 1e6:
        return 3.0
    # Q = 1/(2π f R1 C1) at the ESR max; 5e4 sits mid-range for AT fundamentals, 4e4 for
    # overtones (common practice).
    quality = 5e4 if spec.mode == "fundamental" else 4e4
    return _snap(1e15 / (2.0 * math.pi * spec.freq_hz * spec.esr_ohm * quality), 0.01)


def _family(spec: Spec) -> int:
    if spec.freq_hz == KHZ_32:
        return FORK_32K768
    if spec.freq_hz < 1e6:
        return FORK_32K000
    return AT_FUNDAMENTAL if spec.mode == "fundamental" else OVERTONE


def _row(spec: Spec) -> dict[str, object]:
    package = PACKAGES[spec.package]
    fork = spec.freq_hz < 1e6
    drive = spec.drive_uw
    if drive is None:
        drive = package.drive_uw[len(package.drive_uw) // 2]
    height = spec.height_mm
    if height is None:
        height = _snap((package.height_mm[0] + package.height_mm[1]) / 2.0, 0.05)
    pinout = spec.pinout
    if pinout is None:
        pinout = "1-3" if package.four_pad_share >= 0.5 else ""
    c0 = spec.c0_pf if spec.c0_pf is not None else _snap(sum(package.c0_pf) / 2.0, 0.05)
    c1 = spec.c1_ff if spec.c1_ff is not None else _default_c1_ff(spec)
    price = spec.price if spec.price is not None else _snap(sum(package.price) / 2.0, 0.001)
    return {
        "mpn": "",
        "maker": spec.maker,
        "freq_hz": float(round(spec.freq_hz)),
        "load_capacitance_f": np.nan if spec.load_pf is None else spec.load_pf * 1e-12,
        "series_calibrated": spec.load_pf is None,
        "tolerance_ppm": spec.tolerance,
        "stability_ppm": np.nan if spec.stability is None else spec.stability,
        "temp_min_c": spec.temp[0],
        "temp_max_c": spec.temp[1],
        "esr_ohm": spec.esr_ohm,
        "package": spec.package,
        "mode": spec.mode,
        "cut": "tuning_fork" if fork else "AT",
        "beta_ppm_per_c2": np.nan if spec.beta is None else spec.beta,
        "turnover_c": np.nan if spec.turnover is None else spec.turnover,
        "c0_f": c0 * 1e-12,
        "c1_f": c1 * 1e-15,
        "l1_h": np.nan,
        "drive_level_w": drive * 1e-6,
        "aging_ppm": np.nan if spec.aging is None else spec.aging,
        "length_mm": package.length_mm,
        "width_mm": package.width_mm,
        "height_mm": height,
        "price": price,
        "stock": spec.stock,
        "lifecycle": spec.lifecycle,
        "qualification": spec.qualification,
        "pinout": pinout,
        "msl": spec.msl,
        "family": _family(spec),
    }


def spec_rows(specs: tuple[Spec, ...]) -> pd.DataFrame:
    """Numeric part table for ``specs`` plus ``role``, ``twin_of`` (row position or -1) and
    ``variant`` columns used when numbering."""
    keys = [s.key for s in specs]
    if len(set(keys)) != len(keys):
        raise ValueError("duplicate spec keys")
    frame = pd.DataFrame([_row(s) for s in specs])
    frame["role"] = np.array(keys, dtype=object)
    frame["twin_of"] = np.array([keys.index(s.twin_of) if s.twin_of else -1 for s in specs])
    frame["variant"] = np.array([f"-{s.variant}" if s.variant else "" for s in specs], dtype=object)
    return frame


def _twin(base: Spec, key: str, variant: str, **changes: object) -> Spec:
    return replace(base, key=key, twin_of=base.key, variant=variant, **changes)  # type: ignore[arg-type]


def _cross(base: Spec, key: str, maker: str, **changes: object) -> Spec:
    return replace(base, key=key, maker=maker, twin_of="", variant="", **changes)  # type: ignore[arg-type]


IND = (-40.0, 85.0)
EXT = (-40.0, 105.0)
AUTO = (-40.0, 125.0)
COM = (-20.0, 70.0)

# --- reference parts with siblings (alternates) -------------------------------------------
BLE_REF = Spec(
    "ble_radio_reference",
    "Quellbrook",
    32 * MHZ,
    "2016",
    8.0,
    10.0,
    10.0,
    IND,
    50.0,
    c0_pf=1.4,
    c1_ff=2.2,
    drive_uw=100.0,
    aging=1.0,
    height_mm=0.5,
)
ETH_REF = Spec(
    "ethernet_reference",
    "Tarnwell",
    25 * MHZ,
    "3225",
    12.0,
    10.0,
    10.0,
    IND,
    50.0,
    c0_pf=2.6,
    c1_ff=3.1,
    drive_uw=200.0,
    aging=1.0,
    height_mm=0.7,
)
RTC_REF = Spec(
    "rtc_reference",
    "Vessado",
    KHZ_32,
    "2012",
    7.0,
    20.0,
    None,
    IND,
    70e3,
    c0_pf=1.1,
    c1_ff=3.2,
    drive_uw=1.0,
    aging=3.0,
    height_mm=0.6,
    beta=-0.034,
    turnover=25.0,
)
CAN_REF = Spec(
    "can_reference",
    "Kelvaro",
    16 * MHZ,
    "3225",
    12.0,
    20.0,
    30.0,
    AUTO,
    60.0,
    c0_pf=2.5,
    c1_ff=3.6,
    drive_uw=200.0,
    aging=3.0,
    height_mm=0.75,
    qualification="AEC-Q200",
)

ALTERNATE_SPECS: tuple[Spec, ...] = (
    BLE_REF,
    _twin(BLE_REF, "ble_higher_esr", "E", esr_ohm=80.0, c1_ff=1.6),
    _twin(BLE_REF, "ble_other_load", "C", load_pf=12.0),
    _twin(BLE_REF, "ble_series", "S", load_pf=None),
    _twin(BLE_REF, "ble_pads_2_4", "P", pinout="2-4"),
    _twin(BLE_REF, "ble_taller", "T", height_mm=0.8),
    _twin(BLE_REF, "ble_lower_drive", "D", drive_uw=50.0),
    _cross(BLE_REF, "ble_other_maker_same", "Oridane", c0_pf=1.35, c1_ff=2.3, price=0.31),
    _cross(BLE_REF, "ble_other_maker_load_9", "Kelvaro", load_pf=9.0, esr_ohm=60.0),
    ETH_REF,
    _twin(ETH_REF, "ethernet_lower_esr", "E", esr_ohm=40.0, c1_ff=3.9),
    _twin(ETH_REF, "ethernet_other_load", "C", load_pf=18.0),
    _twin(ETH_REF, "ethernet_series", "S", load_pf=None),
    _twin(ETH_REF, "ethernet_pads_2_4", "P", pinout="2-4"),
    _twin(ETH_REF, "ethernet_taller", "T", height_mm=0.9),
    _twin(ETH_REF, "ethernet_lower_drive", "D", drive_uw=100.0),
    _cross(ETH_REF, "ethernet_other_maker_same", "Kelvaro", c0_pf=2.7, c1_ff=3.0),
    _cross(
        ETH_REF,
        "ethernet_other_package",
        "Oridane",
        package="2520",
        c0_pf=2.1,
        height_mm=0.6,
        drive_uw=100.0,
    ),
    RTC_REF,
    _twin(RTC_REF, "rtc_higher_esr", "E", esr_ohm=90e3),
    _twin(RTC_REF, "rtc_other_load", "C", load_pf=12.5),
    _twin(RTC_REF, "rtc_32000", "F", freq_hz=32000.0),
    _twin(RTC_REF, "rtc_taller", "T", height_mm=0.8),
    _twin(RTC_REF, "rtc_lower_drive", "D", drive_uw=0.5),
    _cross(RTC_REF, "rtc_other_maker_same", "Oridane", c0_pf=1.0, c1_ff=3.4),
    _cross(RTC_REF, "rtc_other_maker_32000", "Kelvaro", freq_hz=32000.0),
    CAN_REF,
    _twin(CAN_REF, "can_higher_esr", "E", esr_ohm=80.0, c1_ff=2.7),
    _twin(CAN_REF, "can_other_load", "C", load_pf=8.0),
    _twin(CAN_REF, "can_series", "S", load_pf=None),
    _twin(CAN_REF, "can_pads_2_4", "P", pinout="2-4"),
    _twin(CAN_REF, "can_taller", "T", height_mm=1.0),
    _twin(CAN_REF, "can_lower_drive", "D", drive_uw=100.0),
    _cross(CAN_REF, "can_other_maker_same", "Quellbrook", c0_pf=2.45),
    _cross(CAN_REF, "can_other_package", "Tarnwell", package="5032", c0_pf=3.2, height_mm=1.1),
)

# --- parts that fit each demo circuit, and near-misses ------------------------------------
# fmt: off
CIRCUIT_SPECS: tuple[Spec, ...] = (
    # RTC and sleep clock, 32.768 kHz over -40…85 °C, in 3215 or 2012.
    Spec("rtc_fit_3215", "Tarnwell", KHZ_32, "3215", 7.0, 20.0, None, IND, 50e3,
         beta=-0.034, turnover=25.0),
    Spec("rtc_fit_2012_auto", "Kelvaro", KHZ_32, "2012", 9.0, 20.0, None, AUTO, 50e3,
         qualification="AEC-Q200", beta=-0.04, turnover=20.0),
    Spec("rtc_fit_2012_cl6", "Oridane", KHZ_32, "2012", 6.0, 10.0, None, IND, 60e3,
         beta=-0.035, turnover=25.0),
    Spec("rtc_miss_package_1610", "Quellbrook", KHZ_32, "1610", 6.0, 10.0, None, IND, 90e3,
         drive_uw=0.5, c1_ff=2.4),
    Spec("rtc_miss_narrow_range", "Vessado", KHZ_32, "2012", 7.0, 20.0, None, COM, 70e3),
    Spec("rtc_miss_32000_3215", "Tarnwell", 32000.0, "3215", 7.0, 20.0, None, IND, 50e3),
    # Large load and high ESR: the critical transconductance exceeds a low-power stage's.
    Spec("rtc_miss_high_load_esr", "Quellbrook", KHZ_32, "3215", 12.5, 20.0, None, IND, 70e3),
    Spec("rtc_miss_obsolete", "Oridane", KHZ_32, "3215", 7.0, 20.0, None, IND, 50e3,
         lifecycle="obsolete", stock=0.0),
    # USB full-speed device, 24 MHz (and 12 MHz parts for other chips).
    Spec("usb_fit_12_3225", "Quellbrook", 12 * MHZ, "3225", 10.0, 30.0, 30.0, IND, 80.0),
    Spec("usb_fit_24_2520", "Vessado", 24 * MHZ, "2520", 8.0, 20.0, 20.0, IND, 60.0),
    Spec("usb_fit_24_3225", "Oridane", 24 * MHZ, "3225", 12.0, 20.0, 30.0, IND, 50.0),
    Spec("usb_fit_12_hc49smd", "Kelvaro", 12 * MHZ, "HC-49/SMD", 18.0, 30.0, 30.0, IND, 50.0),
    Spec("usb_fit_12_5032", "Tarnwell", 12 * MHZ, "5032", 20.0, 30.0, 50.0, IND, 60.0,
         pinout=""),
    Spec("usb_miss_12288", "Quellbrook", 12.288 * MHZ, "3225", 10.0, 30.0, 30.0, IND, 80.0),
    Spec("usb_miss_24576", "Kelvaro", 24.576 * MHZ, "2520", 8.0, 20.0, 20.0, IND, 60.0),
    Spec("usb_miss_range_0_70", "Oridane", 24 * MHZ, "3225", 12.0, 30.0, 30.0, (0.0, 70.0),
         50.0),
    Spec("usb_miss_obsolete", "Tarnwell", 24 * MHZ, "3225", 10.0, 20.0, 30.0, COM, 50.0,
         lifecycle="obsolete", stock=0.0),
    # Ethernet PHY, 25 MHz, ±50 ppm all causes, in 3225 or 2520.
    Spec("ethernet_fit_2520", "Vessado", 25 * MHZ, "2520", 10.0, 15.0, 15.0, IND, 60.0),
    Spec("ethernet_fit_3225_cl10", "Oridane", 25 * MHZ, "3225", 10.0, 20.0, 15.0, IND, 50.0),
    Spec("ethernet_fit_2520_cl8", "Quellbrook", 25 * MHZ, "2520", 8.0, 10.0, 20.0, IND, 50.0,
         aging=3.0),
    Spec("ethernet_fit_3225_ext", "Kelvaro", 25 * MHZ, "3225", 10.0, 15.0, 20.0, EXT, 50.0,
         aging=1.0),
    Spec("ethernet_miss_sum_55", "Tarnwell", 25 * MHZ, "3225", 12.0, 20.0, 30.0, IND, 50.0,
         aging=3.0),
    Spec("ethernet_miss_sum_64", "Oridane", 25 * MHZ, "2520", 10.0, 30.0, 30.0, IND, 60.0),
    Spec("ethernet_miss_narrow_range", "Quellbrook", 25 * MHZ, "3225", 12.0, 10.0, 10.0, COM,
         50.0),
    Spec("ethernet_miss_package_5032", "Quellbrook", 25 * MHZ, "5032", 12.0, 10.0, 20.0, IND,
         40.0, aging=3.0, pinout=""),
    Spec("ethernet_miss_26", "Kelvaro", 26 * MHZ, "3225", 12.0, 10.0, 10.0, IND, 50.0),
    # Bluetooth LE radio, 32 MHz, ±40 ppm over -40…85 °C and 10 years, 2016/2520/1612.
    Spec("ble_fit_2016_cl6", "Vessado", 32 * MHZ, "2016", 6.0, 10.0, 15.0, IND, 60.0,
         aging=1.0, drive_uw=100.0),
    Spec("ble_fit_2520_cl8", "Oridane", 32 * MHZ, "2520", 8.0, 10.0, 10.0, IND, 40.0),
    Spec("ble_fit_2520_cl10", "Tarnwell", 32 * MHZ, "2520", 10.0, 15.0, 15.0, IND, 40.0,
         aging=1.0),
    Spec("ble_fit_2016_ext", "Kelvaro", 32 * MHZ, "2016", 7.0, 10.0, 10.0, EXT, 50.0,
         aging=1.0, height_mm=0.45),
    Spec("ble_fit_1612", "Kelvaro", 32 * MHZ, "1612", 8.0, 10.0, 10.0, IND, 80.0, aging=1.0),
    # Larger load, tight figures: less trim sensitivity, so more headroom in the budget.
    Spec("ble_fit_2520_cl10_a", "Vessado", 32 * MHZ, "2520", 10.0, 10.0, 10.0, IND, 40.0,
         aging=1.0),
    Spec("ble_fit_2520_cl10_b", "Kelvaro", 32 * MHZ, "2520", 10.0, 10.0, 10.0, IND, 40.0,
         aging=1.0, c0_pf=1.8),
    Spec("ble_fit_2016_cl9", "Oridane", 32 * MHZ, "2016", 9.0, 10.0, 10.0, IND, 50.0,
         aging=1.0),
    Spec("ble_miss_sum_43", "Quellbrook", 32 * MHZ, "2016", 8.0, 20.0, 20.0, IND, 60.0),
    Spec("ble_miss_marginal_40", "Oridane", 32 * MHZ, "2520", 8.0, 15.0, 20.0, IND, 40.0,
         aging=3.0),
    Spec("ble_miss_package_3225", "Vessado", 32 * MHZ, "3225", 8.0, 10.0, 10.0, IND, 40.0,
         aging=1.0),
    Spec("ble_miss_package_5032", "Quellbrook", 32 * MHZ, "5032", 8.0, 10.0, 10.0, IND, 40.0,
         aging=1.0),
    Spec("ble_miss_narrow_range", "Tarnwell", 32 * MHZ, "2016", 8.0, 10.0, 10.0, COM, 50.0,
         aging=1.0),
    # CAN node, 16 MHz over -40…105 °C, in 3225 or 5032.
    Spec("can_fit_3225_cl8", "Quellbrook", 16 * MHZ, "3225", 8.0, 20.0, 20.0, EXT, 60.0),
    Spec("can_fit_5032_auto", "Oridane", 16 * MHZ, "5032", 18.0, 30.0, 30.0, AUTO, 50.0,
         qualification="AEC-Q200", pinout=""),
    Spec("can_fit_5032_ext", "Vessado", 16 * MHZ, "5032", 12.0, 20.0, 30.0, EXT, 50.0),
    Spec("can_miss_package_2520", "Vessado", 16 * MHZ, "2520", 10.0, 20.0, 30.0, EXT, 80.0),
    Spec("can_miss_package_hc49smd", "Tarnwell", 16 * MHZ, "HC-49/SMD", 20.0, 30.0, 30.0,
         EXT, 40.0),
    Spec("can_miss_range_85", "Kelvaro", 16 * MHZ, "3225", 12.0, 20.0, 30.0, IND, 60.0),
    Spec("can_miss_16384", "Quellbrook", 16.384 * MHZ, "3225", 12.0, 20.0, 30.0, AUTO, 60.0),
    Spec("can_miss_nrnd_no_stock", "Oridane", 16 * MHZ, "3225", 12.0, 20.0, 30.0, AUTO, 60.0,
         lifecycle="nrnd", stock=0.0),
)
# fmt: on

CURATED_SPECS: tuple[Spec, ...] = ALTERNATE_SPECS + CIRCUIT_SPECS
