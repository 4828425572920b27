"""Invented package families for the demo catalog: sizes, pads and typical figure ranges.

Every range here is a plausible, rounded figure for *invented* demo parts (common practice
and from memory, not from any data sheet). The generator draws inside these ranges; nothing
in the program treats them as the truth about a real crystal.

Units: lengths in mm, capacitances in pF, motional capacitance in fF, ESR in ohm (tuning
forks in kohm), drive level in µW, frequencies in MHz unless a name says otherwise.
"""

from __future__ import annotations

from dataclasses import dataclass


@dataclass(frozen=True)
class Package:
    """One package family.

    Attributes
    ----------
    code : str
        Package code as the catalog prints it (already in the part table's normalised form).
    length_mm, width_mm : float
        Nominal body size [mm].
    height_mm : tuple[float, float]
        Smallest and largest height seen across parts of this package [mm]; drawn on a
        0.05 mm grid.
    four_pad_share : float
        Fraction of parts with four pads (the others have two pads or two leads, no pinout).
    c0_pf : tuple[float, float]
        Shunt capacitance range [pF].
    drive_uw : tuple[float, ...]
        Maximum drive level ratings offered [µW].
    esr_points : tuple[tuple[float, float, float], ...]
        (frequency [MHz], lowest ESR max [ohm], highest ESR max [ohm]) breakpoints, linearly
        interpolated in frequency (held flat outside). Tuning forks use kohm.
    load_pf : tuple[tuple[float, float], ...]
        (load capacitance [pF], weight) choices.
    price : tuple[float, float]
        Unit price range for a standard-grade part [currency units].
    """

    code: str
    length_mm: float
    width_mm: float
    height_mm: tuple[float, float]
    four_pad_share: float
    c0_pf: tuple[float, float]
    drive_uw: tuple[float, ...]
    esr_points: tuple[tuple[float, float, float], ...]
    load_pf: tuple[tuple[float, float], ...]
    price: tuple[float, float]


# Tuning-fork (32 kHz) packages. ESR breakpoints in kohm at 0.032768 MHz: smaller forks have
# higher motional resistance (common practice).
FORK_PACKAGES: tuple[Package, ...] = (
    Package(
        "1610",
        1.6,
        1.0,
        (0.45, 0.50),
        0.0,
        (0.8, 1.1),
        (0.5,),
        ((0.032768, 70.0, 90.0),),
        ((6.0, 3.0), (7.0, 2.0), (9.0, 1.0)),
        (0.18, 0.45),
    ),
    Package(
        "2012",
        2.0,
        1.2,
        (0.55, 0.80),
        0.0,
        (0.9, 1.3),
        (0.5, 1.0),
        ((0.032768, 50.0, 90.0),),
        ((6.0, 2.0), (7.0, 3.0), (9.0, 2.0), (12.5, 2.0)),
        (0.12, 0.35),
    ),
    Package(
        "3215",
        3.2,
        1.5,
        (0.75, 0.90),
        0.0,
        (1.0, 1.5),
        (0.5, 1.0),
        ((0.032768, 50.0, 70.0),),
        ((6.0, 1.0), (7.0, 2.0), (9.0, 2.0), (12.5, 4.0)),
        (0.08, 0.25),
    ),
    Package(
        "7015",
        7.0,
        1.5,
        (1.30, 1.40),
        0.0,
        (1.0, 1.5),
        (1.0,),
        ((0.032768, 45.0, 65.0),),
        ((6.0, 1.0), (12.5, 3.0)),
        (0.10, 0.30),
    ),
    # Cylinders, named by diameter x length in mm: an invented code of ours.
    Package(
        "CYL2X6",
        6.0,
        2.0,
        (2.00, 2.00),
        0.0,
        (1.0, 1.5),
        (1.0,),
        ((0.032768, 35.0, 50.0),),
        ((6.0, 1.0), (12.5, 3.0)),
        (0.06, 0.20),
    ),
    Package(
        "CYL3X8",
        8.0,
        3.0,
        (3.00, 3.00),
        0.0,
        (1.1, 1.5),
        (1.0,),
        ((0.032768, 35.0, 40.0),),
        ((12.5, 1.0),),
        (0.08, 0.22),
    ),
)

# AT-cut packages. Smaller package and lower frequency -> higher ESR (common practice).
AT_PACKAGES: tuple[Package, ...] = (
    Package(
        "1612",
        1.6,
        1.2,
        (0.30, 0.40),
        1.0,
        (1.0, 2.0),
        (10.0, 20.0, 50.0, 100.0),
        ((24.0, 80.0, 120.0), (32.0, 60.0, 100.0), (40.0, 50.0, 80.0), (54.0, 40.0, 60.0)),
        ((6.0, 3.0), (7.0, 2.0), (8.0, 3.0), (9.0, 1.0), (10.0, 1.0)),
        (0.35, 1.20),
    ),
    Package(
        "2016",
        2.0,
        1.6,
        (0.45, 0.80),
        1.0,
        (1.2, 2.2),
        (50.0, 100.0, 200.0),
        (
            (16.0, 100.0, 150.0),
            (24.0, 60.0, 100.0),
            (32.0, 50.0, 80.0),
            (40.0, 40.0, 60.0),
            (54.0, 30.0, 50.0),
        ),
        ((6.0, 2.0), (7.0, 2.0), (8.0, 4.0), (9.0, 2.0), (10.0, 2.0), (12.0, 1.0)),
        (0.20, 0.90),
    ),
    Package(
        "2520",
        2.5,
        2.0,
        (0.55, 0.80),
        1.0,
        (1.5, 2.8),
        (100.0, 200.0),
        (
            (12.0, 100.0, 150.0),
            (16.0, 60.0, 100.0),
            (24.0, 50.0, 80.0),
            (32.0, 40.0, 60.0),
            (40.0, 30.0, 50.0),
        ),
        ((6.0, 1.0), (8.0, 3.0), (9.0, 2.0), (10.0, 3.0), (12.0, 3.0), (16.0, 1.0), (18.0, 1.0)),
        (0.15, 0.70),
    ),
    Package(
        "3225",
        3.2,
        2.5,
        (0.60, 1.00),
        1.0,
        (2.0, 3.5),
        (100.0, 200.0, 300.0),
        (
            (8.0, 100.0, 200.0),
            (12.0, 60.0, 100.0),
            (16.0, 40.0, 80.0),
            (24.0, 40.0, 60.0),
            (32.0, 30.0, 50.0),
        ),
        ((8.0, 2.0), (9.0, 1.0), (10.0, 3.0), (12.0, 4.0), (16.0, 2.0), (18.0, 3.0), (20.0, 2.0)),
        (0.10, 0.60),
    ),
    Package(
        "5032",
        5.0,
        3.2,
        (0.80, 1.30),
        0.6,
        (2.5, 4.5),
        (200.0, 300.0),
        ((8.0, 80.0, 150.0), (12.0, 50.0, 80.0), (16.0, 40.0, 60.0), (25.0, 30.0, 50.0)),
        ((10.0, 1.0), (12.0, 2.0), (16.0, 2.0), (18.0, 3.0), (20.0, 3.0)),
        (0.08, 0.45),
    ),
    Package(
        "7050",
        7.0,
        5.0,
        (1.10, 1.50),
        0.8,
        (3.0, 5.0),
        (200.0, 300.0),
        ((8.0, 60.0, 100.0), (12.0, 40.0, 60.0), (16.0, 30.0, 50.0)),
        ((12.0, 1.0), (16.0, 2.0), (18.0, 3.0), (20.0, 3.0)),
        (0.08, 0.40),
    ),
    Package(
        "HC-49/SMD",
        11.4,
        4.7,
        (3.20, 4.30),
        0.0,
        (4.0, 6.0),
        (100.0, 200.0, 300.0),
        ((8.0, 50.0, 90.0), (12.0, 40.0, 60.0), (16.0, 30.0, 50.0)),
        ((12.0, 1.0), (16.0, 2.0), (18.0, 3.0), (20.0, 3.0)),
        (0.06, 0.30),
    ),
    Package(
        "HC-49/US",
        11.05,
        4.65,
        (3.40, 3.80),
        0.0,
        (5.0, 7.0),
        (100.0, 200.0, 300.0),
        ((8.0, 40.0, 80.0), (12.0, 30.0, 50.0), (16.0, 25.0, 40.0)),
        ((16.0, 1.0), (18.0, 3.0), (20.0, 3.0)),
        (0.05, 0.25),
    ),
)

PACKAGES: dict[str, Package] = {p.code: p for p in FORK_PACKAGES + AT_PACKAGES}

# Which AT packages carry which fundamental frequencies (MHz -> allowed packages with weights).
# Tiny blanks do not reach low frequencies (common practice: a 1612 starts near 24 MHz).
AT_FUNDAMENTAL_FREQUENCIES_MHZ: tuple[tuple[float, float], ...] = (
    (8.0, 5.0),
    (10.0, 3.0),
    (12.0, 6.0),
    (12.288, 1.0),
    (16.0, 9.0),
    (16.384, 1.0),
    (19.2, 3.0),
    (20.0, 4.0),
    (24.0, 8.0),
    (24.576, 1.5),
    (25.0, 8.0),
    (26.0, 5.0),
    (27.0, 2.0),
    (32.0, 8.0),
    (38.4, 3.0),
    (40.0, 5.0),
    (48.0, 4.0),
    (50.0, 2.0),
    (54.0, 1.5),
)

# (package, lowest fundamental [MHz], highest fundamental [MHz], weight)
AT_PACKAGE_SPAN: tuple[tuple[str, float, float, float], ...] = (
    ("1612", 24.0, 54.0, 2.0),
    ("2016", 16.0, 54.0, 4.0),
    ("2520", 12.0, 54.0, 4.0),
    ("3225", 8.0, 54.0, 6.0),
    ("5032", 8.0, 50.0, 2.5),
    ("7050", 8.0, 40.0, 1.0),
    ("HC-49/SMD", 8.0, 40.0, 1.5),
    ("HC-49/US", 8.0, 40.0, 1.5),
)

# Third- and fifth-overtone parts (MHz, weight) and the packages that carry them.
OVERTONE_FREQUENCIES_MHZ: tuple[tuple[float, float], ...] = (
    (60.0, 2.0),
    (64.0, 1.0),
    (72.0, 2.0),
    (75.0, 1.0),
    (80.0, 2.0),
    (96.0, 1.0),
    (100.0, 2.0),
    (106.25, 1.0),
    (120.0, 1.0),
    (125.0, 2.0),
)
OVERTONE_PACKAGES: tuple[tuple[str, float], ...] = (
    ("2520", 1.0),
    ("3225", 4.0),
    ("5032", 3.0),
    ("7050", 1.5),
    ("HC-49/SMD", 1.0),
    ("HC-49/US", 1.0),
)
