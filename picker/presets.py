"""Interface presets: the total frequency-error budget an interface standard allows.

A preset fills a brief's ``budget`` (and its ``clock_role``) from the clause of the
standard that limits the clock. Each budget is the total error of the clock source, all
causes, over the whole life: initial tolerance, temperature drift, aging and load pulling.

The CAN bus has no single figure: the tolerance follows from the bit timing the firmware
programs (:func:`can_tolerance_ppm`), so the ``can`` preset needs the brief's ``can`` block.

Nothing here reads files or keeps state; the table of presets is an immutable tuple.
"""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass
from typing import Final

import numpy as np
import numpy.typing as npt

__all__ = [
    "CAN_CLAUSE",
    "CLOCK_ROLES",
    "PRESETS",
    "CanBitTiming",
    "Preset",
    "PresetError",
    "can_tolerance_conditions",
    "can_tolerance_ppm",
    "find_preset",
    "preset_names",
    "preset_table",
]

CLOCK_ROLES: Final[tuple[str, ...]] = (
    "general",
    "rtc",
    "ble_sleep",
    "ble_active",
    "usb_fs",
    "usb_hs",
    "ethernet",
    "can",
)
"""What the clock is for; decides which figures firmware must declare (see declared.py)."""

CAN_CLAUSE: Final[str] = (
    "ISO 11898-1 / Bosch CAN 2.0 oscillator tolerance from the bit timing: "
    "df ≤ min(PS1, PS2) / (2·(13·NBT − PS2)) and df ≤ SJW / (20·NBT)"
)

_SECONDS_PER_30_DAY_MONTH: Final[float] = 30.0 * 86400.0


class PresetError(ValueError):
    """An unknown preset name or an impossible CAN bit timing (message is one line)."""


@dataclass(frozen=True)
class Preset:
    """One interface preset.

    Attributes
    ----------
    name : the key used in a brief (``preset: usb_fs``) and on the command line.
    title : what it is, in words.
    budget_ppm : total allowed frequency error, worst case [ppm]; None when the budget is
        derived from data in the brief (CAN bit timing).
    clause : where the figure comes from, shown on screen beside the budget.
    clock_role : the role a brief using this preset gets unless it names its own.
    frequency_hz : the clock frequency the preset implies [Hz], or None when the interface
        leaves it to the chip (USB runs from 12, 24 or 48 MHz crystals, for example).
    """

    name: str
    title: str
    budget_ppm: float | None
    clause: str
    clock_role: str
    frequency_hz: float | None = None


PRESETS: Final[tuple[Preset, ...]] = (
    Preset(
        name="usb_fs",
        title="USB 2.0 full-speed function (12 Mb/s)",
        budget_ppm=2500.0,
        clause="USB 2.0 Specification §7.1.11: full-speed data rate 12 Mb/s ±0.25 %",
        clock_role="usb_fs",
    ),
    Preset(
        name="usb_hs",
        title="USB 2.0 high-speed (480 Mb/s)",
        budget_ppm=500.0,
        clause="USB 2.0 Specification §7.1.11: high-speed data rate 480 Mb/s ±0.05 %",
        clock_role="usb_hs",
    ),
    Preset(
        name="10base_t",
        title="Ethernet 10BASE-T (10 Mb/s)",
        budget_ppm=100.0,
        clause="IEEE 802.3 clause 14: 10BASE-T transmit rate 10 Mb/s ±0.01 %",
        clock_role="ethernet",
        frequency_hz=None,
    ),
    Preset(
        name="100base_tx",
        title="Ethernet 100BASE-TX (125 MBd)",
        budget_ppm=50.0,
        clause="IEEE 802.3 clauses 24–25: 100BASE-TX symbol rate 125 MBd ±50 ppm",
        clock_role="ethernet",
    ),
    Preset(
        name="ble_active",
        title="Bluetooth LE active (radio) clock",
        budget_ppm=50.0,
        clause="Bluetooth Core Specification Vol 6 Part B §4.2: active clock accuracy ±50 ppm",
        clock_role="ble_active",
    ),
    Preset(
        name="ble_sleep",
        title="Bluetooth LE sleep clock",
        budget_ppm=500.0,
        clause="Bluetooth Core Specification Vol 6 Part B §4.2: sleep clock accuracy ±500 ppm",
        clock_role="ble_sleep",
        frequency_hz=32768.0,
    ),
    Preset(
        name="rtc",
        title="Real-time clock keeping ±1 min/month",
        budget_ppm=60.0 / _SECONDS_PER_30_DAY_MONTH * 1e6,
        clause="derived: 60 s in a 30-day month = 23.1 ppm (a product target, not a standard)",
        clock_role="rtc",
        frequency_hz=32768.0,
    ),
    Preset(
        name="can",
        title="CAN bus node (classical CAN)",
        budget_ppm=None,
        clause=CAN_CLAUSE,
        clock_role="can",
    ),
)
"""Every preset, in the order ``picker presets`` lists them."""


def preset_names() -> tuple[str, ...]:
    """Names of all presets, in table order."""
    return tuple(preset.name for preset in PRESETS)


def _normalise_name(name: str) -> str:
    return name.strip().lower().replace("-", "_").replace(" ", "_")


def find_preset(name: str) -> Preset:
    """Return the preset called ``name`` (case, '-' and '_' are not significant).

    Raises
    ------
    PresetError
        When no preset has that name; the message lists the known names.
    """
    wanted = _normalise_name(name)
    for preset in PRESETS:
        if preset.name == wanted:
            return preset
    raise PresetError(f"unknown preset '{name}'; known presets: {', '.join(preset_names())}")


def preset_table() -> list[dict[str, str]]:
    """Rows for ``picker presets``: name, title, budget (text), clock role and clause."""
    rows = []
    for preset in PRESETS:
        budget = (
            "from the bit timing (brief 'can' block)"
            if preset.budget_ppm is None
            else f"±{preset.budget_ppm:.4g} ppm"
        )
        rows.append(
            {
                "name": preset.name,
                "title": preset.title,
                "budget": budget,
                "clock_role": preset.clock_role,
                "clause": preset.clause,
            }
        )
    return rows


# --- CAN bit timing ------------------------------------------------------------------------


@dataclass(frozen=True)
class CanBitTiming:
    """A classical-CAN nominal bit time, in time quanta (tq).

    NBT = 1 (synchronisation segment) + prop_seg + phase_seg1 + phase_seg2.

    Attributes
    ----------
    prop_seg : propagation segment [tq], >= 1.
    phase_seg1 : phase buffer segment 1 [tq], >= 1. A controller that merges the
        propagation segment and phase segment 1 into one ``TSEG1`` register field: give
        prop_seg as the part of TSEG1 the bus delay needs and phase_seg1 as the rest.
    phase_seg2 : phase buffer segment 2 [tq], >= 1.
    sjw : (re)synchronisation jump width [tq], 1 <= sjw <= min(phase_seg1, phase_seg2).
    """

    prop_seg: int
    phase_seg1: int
    phase_seg2: int
    sjw: int

    def __post_init__(self) -> None:
        for name in ("prop_seg", "phase_seg1", "phase_seg2", "sjw"):
            value = getattr(self, name)
            if isinstance(value, bool) or not isinstance(value, int) or value < 1:
                raise PresetError(
                    f"{name}: expected a whole number of time quanta >= 1, got {value!r}"
                )
        if self.sjw > min(self.phase_seg1, self.phase_seg2):
            raise PresetError(
                f"sjw: {self.sjw} tq is longer than a phase segment "
                f"(phase_seg1 {self.phase_seg1}, phase_seg2 {self.phase_seg2}); "
                "the jump width may not exceed the shorter phase segment (CAN bit timing rules)"
            )

    @property
    def bit_time_quanta(self) -> int:
        """Nominal bit time NBT [tq] = 1 + prop_seg + phase_seg1 + phase_seg2."""
        return 1 + self.prop_seg + self.phase_seg1 + self.phase_seg2

    def tolerance_ppm(self) -> float:
        """The oscillator tolerance this bit timing allows each node [ppm]."""
        return float(
            can_tolerance_ppm(self.phase_seg1, self.phase_seg2, self.sjw, self.bit_time_quanta)
        )

    def describe(self) -> str:
        """One line for the budget's source: the timing and the tolerance it gives."""
        return (
            f"CAN bit timing NBT {self.bit_time_quanta} tq (prop {self.prop_seg}, "
            f"PS1 {self.phase_seg1}, PS2 {self.phase_seg2}, SJW {self.sjw}) → "
            f"±{self.tolerance_ppm():.4g} ppm ({CAN_CLAUSE})"
        )

    def to_mapping(self) -> Mapping[str, int]:
        """The brief's ``can`` block for this timing."""
        return {
            "bit_time_quanta": self.bit_time_quanta,
            "prop_seg": self.prop_seg,
            "phase_seg1": self.phase_seg1,
            "phase_seg2": self.phase_seg2,
            "sjw": self.sjw,
        }


FloatOrArray = float | npt.NDArray[np.float64]


def can_tolerance_conditions(
    phase_seg1: npt.ArrayLike,
    phase_seg2: npt.ArrayLike,
    sjw: npt.ArrayLike,
    bit_time_quanta: npt.ArrayLike,
) -> tuple[npt.NDArray[np.float64], npt.NDArray[np.float64]]:
    """The two classical-CAN oscillator-tolerance conditions, each as a limit on df.

    Parameters
    ----------
    phase_seg1, phase_seg2 : phase buffer segments PS1, PS2 [tq]
    sjw : synchronisation jump width SJW [tq]
    bit_time_quanta : nominal bit time NBT [tq]

    Returns
    -------
    (condition_1, condition_2) : largest relative deviation df [1] each condition allows.

    Notes
    -----
    df is the tolerance of each node's clock (two nodes may differ by 2·df):

    1. df ≤ min(PS1, PS2) / (2·(13·NBT − PS2)) — the phase error accumulated over the
       13 bits between resynchronisations after an error flag must fit the phase segment;
    2. df ≤ SJW / (20·NBT) — over the 10 bits between two recessive-to-dominant edges
       the phase error must be correctable by one resynchronisation.

    References: F. Hartwich and A. Bassemir (Robert Bosch GmbH), "The Configuration of
    the CAN Bit Timing", 6th International CAN Conference, Turin, 1999, which states both
    conditions in this form and gives Prop_Seg = 1, Phase_Seg1 = Phase_Seg2 = SJW = 4 as
    a 1.58 % example; Bosch, "CAN Specification 2.0", 1991, and ISO 11898-1 define the
    bit time and resynchronisation the conditions rest on.
    """
    ps1 = np.asarray(phase_seg1, dtype=np.float64)
    ps2 = np.asarray(phase_seg2, dtype=np.float64)
    jump = np.asarray(sjw, dtype=np.float64)
    nbt = np.asarray(bit_time_quanta, dtype=np.float64)
    condition_1 = np.minimum(ps1, ps2) / (2.0 * (13.0 * nbt - ps2))
    condition_2 = jump / (20.0 * nbt)
    return condition_1, condition_2


def can_tolerance_ppm(
    phase_seg1: npt.ArrayLike,
    phase_seg2: npt.ArrayLike,
    sjw: npt.ArrayLike,
    bit_time_quanta: npt.ArrayLike,
) -> FloatOrArray:
    """Oscillator tolerance a classical-CAN bit timing allows each node [ppm].

    The smaller of the two conditions of :func:`can_tolerance_conditions`, times 1e6.
    Scalars in give a float out; arrays broadcast.

    Examples
    --------
    >>> round(can_tolerance_ppm(7, 4, 4, 16))  # 4 / (2·(208 − 4)) = 0.9804 %
    9804
    """
    condition_1, condition_2 = can_tolerance_conditions(
        phase_seg1, phase_seg2, sjw, bit_time_quanta
    )
    result = np.minimum(condition_1, condition_2) * 1e6
    if result.ndim == 0:
        return float(result)
    return result
