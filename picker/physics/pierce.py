"""Small-signal Pierce oscillator: load capacitance, negative resistance, transconductance.

Network (Vittoz, Degrauwe & Bitz, "High-performance crystal oscillator circuits: theory and
application", IEEE JSSC 23(3), 1988; Vittoz, "Low-Power Crystal and MEMS Oscillators",
Springer 2010, ch. 3–4): node 1 is the amplifier input (gate), node 2 its output (drain).
Y1 = G1 + jωCg from node 1 to ground, Y2 = G2 + jωCd from node 2 to ground,
Y3 = G3 + jωC3 between the nodes (C3 = C0 + stray across the crystal; G3 = 1/R_bias),
and a transconductance gm draws gm·V1 out of node 2. The motional arm of the crystal sees
the impedance Zc between nodes 1 and 2.

All inputs are SI (rad/s, S, F, ohm); every function accepts floats or numpy arrays and
broadcasts.
"""

from __future__ import annotations

from typing import NamedTuple

import numpy as np

from picker.physics._arrays import (
    ArrayLike,
    BoolArray,
    ComplexArray,
    FloatArray,
    as_float,
    to_bool,
    to_complex,
    to_float,
)


def board_load_capacitance(cg: ArrayLike, cd: ArrayLike, stray: ArrayLike) -> FloatArray:
    """Load capacitance the Pierce circuit presents to the crystal.

    Parameters
    ----------
    cg : total capacitance from the gate node to ground (external cap + pin) [F]
    cd : total capacitance from the drain node to ground (external cap + pin) [F]
    stray : stray capacitance across the crystal (traces, pads) [F]

    Returns
    -------
    cl : load capacitance [F]

    Notes
    -----
    CL = Cg·Cd/(Cg + Cd) + C_stray — the two caps in series through ground, in parallel
    with the stray (IEC 60122-1 load-capacitance definition applied to the Pierce network).
    """
    cg_a, cd_a = as_float(cg), as_float(cd)
    return to_float(cg_a * cd_a / (cg_a + cd_a) + as_float(stray))


def pierce_impedance(
    omega: ArrayLike,
    gm: ArrayLike,
    cg: ArrayLike,
    cd: ArrayLike,
    c3: ArrayLike,
    g1: ArrayLike = 0.0,
    g2: ArrayLike = 0.0,
    g3: ArrayLike = 0.0,
) -> ComplexArray:
    """Impedance the oscillator circuit presents to the crystal's motional arm.

    Parameters
    ----------
    omega : angular frequency [rad/s]
    gm : amplifier transconductance [S]
    cg : gate-node capacitance to ground [F]
    cd : drain-node capacitance to ground [F]
    c3 : capacitance across the crystal, C0 + stray [F]
    g1 : conductance gate to ground [S] (usually 0)
    g2 : amplifier output conductance [S]
    g3 : conductance across the crystal, 1/R_bias [S]

    Returns
    -------
    zc : impedance [ohm], complex; Re(zc) < 0 means the circuit can feed energy to the
        crystal

    Notes
    -----
    Zc = (gm + Y1 + Y2) / (Y1·Y2 + Y3·(Y1 + Y2 + gm)), Yi = Gi + jωCi (Vittoz et al.,
    IEEE JSSC 1988, eq. 4 form; Vittoz 2010, ch. 3).
    """
    w = as_float(omega)
    y1 = as_float(g1) + 1j * w * as_float(cg)
    y2 = as_float(g2) + 1j * w * as_float(cd)
    y3 = as_float(g3) + 1j * w * as_float(c3)
    gm_a = as_float(gm)
    with np.errstate(invalid="ignore", divide="ignore"):  # NaN inputs give NaN, silently
        z = (gm_a + y1 + y2) / (y1 * y2 + y3 * (y1 + y2 + gm_a))
    return to_complex(z)


def negative_resistance(
    omega: ArrayLike,
    gm: ArrayLike,
    cg: ArrayLike,
    cd: ArrayLike,
    c3: ArrayLike,
    g1: ArrayLike = 0.0,
    g2: ArrayLike = 0.0,
    g3: ArrayLike = 0.0,
) -> FloatArray:
    """Real part of the circuit impedance seen by the motional arm.

    Parameters
    ----------
    omega, gm, cg, cd, c3, g1, g2, g3 : as in :func:`pierce_impedance`

    Returns
    -------
    rneg : Re(Zc) [ohm]; negative when the circuit can sustain oscillation

    Notes
    -----
    Lossless: Re(Zc) = −gm·Cg·Cd / ((gm·C3)² + ω²·(Cg·Cd + C3·(Cg + Cd))²)
    (Vittoz et al., IEEE JSSC 1988).

    Examples
    --------
    16 MHz, gm = 17 mA/V, Cg = Cd = 18 pF, C3 = 7 pF:

    >>> round(float(negative_resistance(2 * np.pi * 16e6, 17e-3, 18e-12, 18e-12, 7e-12)), 1)
    -314.5
    """
    return to_float(np.asarray(np.real(pierce_impedance(omega, gm, cg, cd, c3, g1, g2, g3))))


class PierceCoefficients(NamedTuple):
    """Re(Zc) = (a2·gm² + a1·gm + a0) / (q2·gm² + q1·gm + q0), exact for real gm.

    Attributes
    ----------
    a2 [S], a1 [S²], a0 [S³] : numerator coefficients
    q2 [S²], q1 [S³], q0 [S⁴] : denominator coefficients (the denominator is |D|² ≥ 0)

    None of them depends on gm, so one set serves every gm and every R1 of the same
    network: build it once with :func:`pierce_coefficients`.
    """

    a2: FloatArray
    a1: FloatArray
    a0: FloatArray
    q2: FloatArray
    q1: FloatArray
    q0: FloatArray


def pierce_coefficients(
    omega: ArrayLike,
    cg: ArrayLike,
    cd: ArrayLike,
    c3: ArrayLike,
    g1: ArrayLike = 0.0,
    g2: ArrayLike = 0.0,
    g3: ArrayLike = 0.0,
) -> PierceCoefficients:
    """Coefficients of Re(Zc) as a ratio of two quadratics in the transconductance.

    Parameters
    ----------
    omega, cg, cd, c3, g1, g2, g3 : as in :func:`pierce_impedance`
        [rad/s, F, F, F, S, S, S]

    Returns
    -------
    PierceCoefficients
        a2, a1, a0, q2, q1, q0, broadcast to the common shape of the inputs

    Notes
    -----
    Zc = N/D with N = gm + n0 and D = Y3·gm + d0, n0 = Y1 + Y2, d0 = Y1·Y2 + Y3·n0
    (the network of :func:`pierce_impedance`; Vittoz et al., IEEE JSSC 1988), so
    Re(Zc) = Re(N·conj D) / |D|² with a2 = Re Y3, a1 = Re(conj d0 + n0·conj Y3),
    a0 = Re(n0·conj d0), q2 = |Y3|², q1 = 2·Re(Y3·conj d0), q0 = |d0|².
    Evaluated in real arithmetic (Yi = Gi + jωCi expanded by hand), which is cheaper than
    complex arrays and agrees with them to rounding.
    """
    w = as_float(omega)
    cg_a, cd_a, c3_a = as_float(cg), as_float(cd), as_float(c3)
    g1_a, g2_a, g3_a = as_float(g1), as_float(g2), as_float(g3)
    shape = np.broadcast_shapes(w.shape, cg_a.shape, cd_a.shape, c3_a.shape, g3_a.shape)
    shape = np.broadcast_shapes(shape, g1_a.shape, g2_a.shape)

    def table() -> FloatArray:
        return np.empty(shape)

    # Every array below has the full shape, so the sums can be formed in place: at a million
    # rows a fresh temporary per operation costs about as much as the arithmetic. The
    # operation order is that of the complex products written out, term by term.
    with np.errstate(invalid="ignore", over="ignore"):  # NaN inputs give NaN, silently
        wcg = np.multiply(w, cg_a, out=table())  # Im Y1
        wcd = np.multiply(w, cd_a, out=table())  # Im Y2
        wc3 = np.multiply(w, c3_a, out=table())  # Im Y3
        n0r = g1_a + g2_a  # Re(Y1 + Y2), usually one number
        n0i = np.add(wcg, wcd, out=table())  # Im(Y1 + Y2)
        term = table()
        # d0 = Y1·Y2 + Y3·n0
        d0r = np.multiply(wcg, wcd, out=table())
        np.subtract(g1_a * g2_a, d0r, out=d0r)
        np.multiply(wc3, n0i, out=term)
        np.subtract(g3_a * n0r, term, out=term)
        d0r += term  # (g1·g2 − ωCg·ωCd) + (g3·n0r − ωC3·n0i)
        d0i = np.multiply(g1_a, wcd, out=wcd)
        np.multiply(wcg, g2_a, out=term)
        d0i += term  # g1·ωCd + ωCg·g2
        y3n0i = np.multiply(g3_a, n0i, out=wcg)
        np.multiply(wc3, n0r, out=term)
        y3n0i += term  # g3·n0i + ωC3·n0r
        d0i += y3n0i
        # a1 = d0r + (n0r·g3 + n0i·ωC3)
        a1 = np.multiply(n0r, g3_a, out=y3n0i)
        np.multiply(n0i, wc3, out=term)
        a1 += term
        np.add(d0r, a1, out=a1)
        # a0 = n0r·d0r + n0i·d0i
        a0 = np.multiply(n0r, d0r, out=table())
        np.multiply(n0i, d0i, out=term)
        a0 += term
        # q2 = g3² + (ωC3)²
        q2 = np.multiply(wc3, wc3, out=table())
        np.add(g3_a * g3_a, q2, out=q2)
        # q1 = 2·(g3·d0r + ωC3·d0i)
        q1 = np.multiply(g3_a, d0r, out=table())
        np.multiply(wc3, d0i, out=term)
        q1 += term
        q1 *= 2.0
        # q0 = d0r² + d0i²
        q0 = np.multiply(d0r, d0r, out=n0i)
        np.multiply(d0i, d0i, out=term)
        q0 += term
    # a2 = G3, a view, not a copy: often one number for the whole table
    a2 = np.broadcast_to(g3_a, shape)
    return PierceCoefficients(a2, a1, a0, q2, q1, q0)


class PierceOptimum(NamedTuple):
    """The network's best operating point: where |Re(Zc)| peaks.

    Attributes
    ----------
    gm_opt : optimum transconductance [S] (see :func:`optimum_transconductance`)
    rneg_max : |Rneg|max [ohm] (see :func:`max_negative_resistance`)
    """

    gm_opt: FloatArray
    rneg_max: FloatArray


def critical_transconductance(
    omega: ArrayLike,
    r1: ArrayLike,
    cg: ArrayLike,
    cd: ArrayLike,
    c3: ArrayLike,
    g1: ArrayLike = 0.0,
    g2: ArrayLike = 0.0,
    g3: ArrayLike = 0.0,
) -> FloatArray:
    """Smallest transconductance at which the circuit just cancels the crystal's R1.

    Parameters
    ----------
    omega : angular frequency [rad/s]
    r1 : motional resistance [ohm]
    cg, cd, c3, g1, g2, g3 : as in :func:`pierce_impedance` [F, F, F, S, S, S]

    Returns
    -------
    gm_crit : critical transconductance [S]; ``inf`` where no gm makes −Re(Zc) reach R1
        (R1 above the circuit's |Rneg|max); 0 where the passive network alone is already
        negative (not physical, kept for completeness); NaN where an input is NaN

    Notes
    -----
    Re(Zc) = −R1 becomes, after clearing |D|², the exact quadratic
    (a2 + R1·q2)·gm² + (a1 + R1·q1)·gm + (a0 + R1·q0) = 0; the rising-branch root is the
    smaller one, taken in the stable form gm = 2c/(−b + √(b² − 4ac)).
    Lossless this is gm_crit = 2·R1·ω²·K² / (Cg·Cd + √((Cg·Cd)² − 4·R1²·ω²·C3²·K²)),
    K = Cg·Cd + C3·(Cg + Cd), which tends to ω²·R1·Cg·Cd·(1 + C3/Cg + C3/Cd)² when R1 is
    far below |Rneg|max (Vittoz et al., IEEE JSSC 1988; Vittoz 2010, ch. 3).

    Examples
    --------
    >>> gm = critical_transconductance(2 * np.pi * 16e6, 80.0, 18e-12, 18e-12, 7e-12)
    >>> print(f"{float(gm) * 1e3:.3f} mA/V")
    0.836 mA/V
    """
    return critical_transconductance_from(pierce_coefficients(omega, cg, cd, c3, g1, g2, g3), r1)


def critical_transconductance_from(coefficients: PierceCoefficients, r1: ArrayLike) -> FloatArray:
    """:func:`critical_transconductance` from precomputed :func:`pierce_coefficients`.

    Parameters
    ----------
    coefficients : Re(Zc) coefficients of the network [SI]
    r1 : motional resistance [ohm]

    Returns
    -------
    gm_crit : critical transconductance [S]; ``inf``, 0 and NaN as in
        :func:`critical_transconductance`

    Notes
    -----
    The quadratic (a2 + R1·q2)·gm² + (a1 + R1·q1)·gm + (a0 + R1·q0) = 0, rising-branch root
    2c/(−b + √(b² − 4ac)) (Vittoz et al., IEEE JSSC 1988). Reusing one coefficient set for
    gm_crit, gm_opt, |Rneg|max and Re(Zc) saves rebuilding it for each.
    """
    k = coefficients
    r1_a = as_float(r1)
    a, b, c = np.broadcast_arrays(k.a2 + r1_a * k.q2, k.a1 + r1_a * k.q1, k.a0 + r1_a * k.q0)
    with np.errstate(invalid="ignore", divide="ignore", over="ignore"):
        disc = b * b - 4.0 * a * c
        root = 2.0 * c / (-b + np.sqrt(disc))
    result = np.where((disc >= 0.0) & (b < 0.0) & (c > 0.0), root, np.inf)
    # in place: the masks are rare, and a fresh 1M-row array per rule costs more than the test
    np.copyto(result, 0.0, where=c <= 0.0)
    np.copyto(result, np.nan, where=np.isnan(a) | np.isnan(b) | np.isnan(c))
    return to_float(result)


def optimum_transconductance(
    omega: ArrayLike,
    cg: ArrayLike,
    cd: ArrayLike,
    c3: ArrayLike,
    g1: ArrayLike = 0.0,
    g2: ArrayLike = 0.0,
    g3: ArrayLike = 0.0,
) -> FloatArray:
    """Transconductance at which the negative resistance is largest in magnitude.

    Parameters
    ----------
    omega, cg, cd, c3, g1, g2, g3 : as in :func:`pierce_impedance`

    Returns
    -------
    gm_opt : optimum transconductance [S]; NaN where Re(Zc) has no negative minimum;
        ``inf`` when nothing is across the crystal (C3 = G3 = 0)

    Notes
    -----
    Lossless: gm_opt = ω·(Cg·Cd + C3·(Cg + Cd)) / C3 (Vittoz et al., IEEE JSSC 1988).
    With losses, d Re(Zc)/d gm = 0 for Re(Zc) = P/Q (quadratics, see
    :func:`critical_transconductance`) is the quadratic
    (a2·q1 − a1·q2)·gm² + 2·(a2·q0 − a0·q2)·gm + (a1·q0 − a0·q1) = 0; the root with the
    most negative Re(Zc) is returned.
    """
    return pierce_optimum(pierce_coefficients(omega, cg, cd, c3, g1, g2, g3)).gm_opt


def max_negative_resistance(
    omega: ArrayLike,
    cg: ArrayLike,
    cd: ArrayLike,
    c3: ArrayLike,
    g1: ArrayLike = 0.0,
    g2: ArrayLike = 0.0,
    g3: ArrayLike = 0.0,
) -> FloatArray:
    """Largest |Re(Zc)| the network can reach with any transconductance.

    Parameters
    ----------
    omega, cg, cd, c3, g1, g2, g3 : as in :func:`pierce_impedance`

    Returns
    -------
    rneg_max : |Rneg|max [ohm], positive; 0 where the network never goes negative; ``inf``
        when nothing is across the crystal (C3 = G3 = 0), an idealisation with no ceiling

    Notes
    -----
    Lossless: |Rneg|max = Cg·Cd / (2·ω·C3·(Cg·Cd + C3·(Cg + Cd))), reached at gm_opt
    (Vittoz et al., IEEE JSSC 1988). With losses, exact: −Re(Zc) at the stationary point
    given by :func:`optimum_transconductance`. A crystal with R1 above this value cannot
    start with any amplifier in this network.

    Examples
    --------
    >>> round(float(max_negative_resistance(2 * np.pi * 16e6, 18e-12, 18e-12, 7e-12)), 1)
    399.7
    """
    return pierce_optimum(pierce_coefficients(omega, cg, cd, c3, g1, g2, g3)).rneg_max


def pierce_optimum(coefficients: PierceCoefficients) -> PierceOptimum:
    """gm_opt and |Rneg|max together, from precomputed :func:`pierce_coefficients`.

    Parameters
    ----------
    coefficients : Re(Zc) coefficients of the network [SI]

    Returns
    -------
    PierceOptimum
        gm_opt [S] as :func:`optimum_transconductance`, rneg_max [ohm] as
        :func:`max_negative_resistance` (both come from the same stationary point, so one
        call gives both)

    Notes
    -----
    d Re(Zc)/d gm = 0 for Re(Zc) = P/Q is
    (a2·q1 − a1·q2)·gm² + 2·(a2·q0 − a0·q2)·gm + (a1·q0 − a0·q1) = 0; the positive root
    with the most negative Re(Zc) is the optimum (Vittoz et al., IEEE JSSC 1988).

    Examples
    --------
    16 MHz, Cg = Cd = 18 pF, C3 = 7 pF, lossless (closed forms ω·K/C3 and
    Cg·Cd/(2·ω·C3·K), K = Cg·Cd + C3·(Cg + Cd)):

    >>> k = pierce_coefficients(2 * np.pi * 16e6, 18e-12, 18e-12, 7e-12)
    >>> best = pierce_optimum(k)
    >>> print(f"{float(best.gm_opt) * 1e3:.2f} mA/V, {float(best.rneg_max):.1f} ohm")
    8.27 mA/V, 399.7 ohm
    """
    k = coefficients
    regular = _regular_lossless_rows(k)
    if regular is None or not regular.any():
        return _general_optimum(k)
    # lossless rows (a2 = a0 = q1 = 0): Re(Zc) = a1·gm/(q2·gm² + q0) is least at
    # gm = √(q0/q2), where it is a1/(2·√(q0·q2)); that is ω·K/C3 and −Cg·Cd/(2·ω·C3·K), the
    # closed forms of Vittoz et al. (IEEE JSSC 1988), in a handful of operations
    with np.errstate(invalid="ignore", divide="ignore", over="ignore"):
        gm_opt = np.asarray(np.sqrt(k.q0 / k.q2))
        rneg_max = np.asarray(-k.a1 / (2.0 * np.sqrt(k.q0 * k.q2)))
    if regular.all():
        return PierceOptimum(to_float(gm_opt), to_float(rneg_max))
    # every row keeps its own path (closed form where regular, general elsewhere), so a row's
    # figures never depend on the rest of the table; only the cheaper way to get there varies
    irregular = ~regular
    if np.count_nonzero(irregular) * 4 > irregular.size:  # mostly irregular: no gathers
        general = _general_optimum(k)
        np.copyto(general.gm_opt, gm_opt, where=regular)
        np.copyto(general.rneg_max, rneg_max, where=regular)
        return general
    rest = np.nonzero(irregular)
    general = _general_optimum(PierceCoefficients(*(np.asarray(c)[rest] for c in k)))
    gm_opt[rest] = general.gm_opt
    rneg_max[rest] = general.rneg_max
    return PierceOptimum(to_float(gm_opt), to_float(rneg_max))


def _regular_lossless_rows(k: PierceCoefficients) -> BoolArray | None:
    # rows of a lossless network (G1 = G2 = G3 = 0) with positive, finite capacitances and
    # frequency; None at once when G3 is not zero anywhere (the lossy brief)
    if not np.all(k.a2 == 0.0):
        return None
    regular = (k.a0 == 0.0) & (k.q1 == 0.0) & (k.a1 < 0.0)
    regular &= (k.q2 > 0.0) & (k.q2 < np.inf) & (k.q0 > 0.0) & (k.q0 < np.inf)
    return np.asarray(regular)


def _general_optimum(k: PierceCoefficients) -> PierceOptimum:
    # the stationary-point quadratic of pierce_optimum's Notes, any losses
    a = k.a2 * k.q1 - k.a1 * k.q2
    b = 2.0 * (k.a2 * k.q0 - k.a0 * k.q2)
    b += 0.0  # −0 becomes +0, so copysign below splits the roots exactly as b ≥ 0 does
    c = k.a1 * k.q0 - k.a0 * k.q1
    with np.errstate(invalid="ignore", divide="ignore", over="ignore"):
        sq = np.sqrt(b * b - 4.0 * a * c)
        # both roots in stable forms from h = −(b + sign(b)·√disc)/2: h/a and c/h (a may
        # vanish: lossless, q1 = a2 = 0 gives b = 0 too)
        half = -0.5 * (b + np.copysign(sq, b))
        root_h = half / a
        root_c = c / half
        re_h = _usable_real_part(k, root_h)
        re_c = _usable_real_part(k, root_c)
    # the smaller Re(Zc) wins; on a tie the root (−b ∓ √disc)/(2a) ranks first, which is h/a
    # when b ≥ 0. Re is finite or +inf here (never NaN), so min and the comparisons are exact.
    # np.where costs ~10 plain operations on a mixed mask, hence the boolean forms.
    pick_h = (re_h < re_c) | ((re_h == re_c) & (b >= 0.0))
    gm_opt = _select(pick_h, root_h, root_c)
    re_min = np.minimum(re_h, re_c)
    negative = re_min < 0.0
    rneg_max = np.asarray(np.maximum(-re_min, 0.0) + 0.0)  # + 0.0: Re(Zc) = +0 gives +0
    np.copyto(gm_opt, np.nan, where=~negative)
    # nothing across the crystal (Y3 = 0): Re(Zc) = a1·gm/q0 falls without bound
    unbounded = k.q2 == 0.0
    if unbounded.any():
        unbounded &= (k.q1 == 0.0) & (k.a2 == 0.0) & (k.a1 < 0.0)
        np.copyto(gm_opt, np.inf, where=unbounded)
        np.copyto(rneg_max, np.inf, where=unbounded)
    missing = np.isnan(k.a1) | np.isnan(k.q0) | np.isnan(k.a2) | np.isnan(k.q2)
    np.copyto(gm_opt, np.nan, where=missing)
    np.copyto(rneg_max, np.nan, where=missing)
    return PierceOptimum(to_float(gm_opt), to_float(rneg_max))


def _select(pick: BoolArray, first: FloatArray, second: FloatArray) -> FloatArray:
    # np.where(pick, first, second) as a fresh array; uniform masks (the usual case for
    # one circuit over a table) skip the element-wise select
    if pick.all():
        return np.array(np.broadcast_to(first, pick.shape), dtype=np.float64)
    if not pick.any():
        return np.array(np.broadcast_to(second, pick.shape), dtype=np.float64)
    return np.asarray(np.where(pick, first, second), dtype=np.float64)


def _usable_real_part(k: PierceCoefficients, gm: FloatArray) -> FloatArray:
    # Re(Zc) at a candidate root; +inf where the root is no real positive transconductance
    # (an infinite root makes the value NaN, so it needs no test of its own)
    gm2 = np.asarray(gm * gm)  # 0-d arrays, not scalars, so that out= works for one part too
    value = np.asarray(k.a2 * gm2)
    term = np.asarray(k.a1 * gm)
    value += term
    value += k.a0  # a2·gm² + a1·gm + a0
    denominator = np.multiply(k.q2, gm2, out=gm2)
    np.multiply(k.q1, gm, out=term)
    denominator += term
    denominator += k.q0  # q2·gm² + q1·gm + q0
    value /= denominator
    np.copyto(value, np.inf, where=~((gm > 0.0) & np.isfinite(value)))
    return value


def negative_resistance_from(coefficients: PierceCoefficients, gm: ArrayLike) -> FloatArray:
    """Re(Zc) at a transconductance, from precomputed :func:`pierce_coefficients`.

    Parameters
    ----------
    coefficients : Re(Zc) coefficients of the network [SI]
    gm : amplifier transconductance [S]

    Returns
    -------
    rneg : Re(Zc) [ohm]; agrees with :func:`negative_resistance` to rounding (the two
        differ where Re(Zc) is tiny against |Zc|, i.e. far from any useful operating point)

    Notes
    -----
    (a2·gm² + a1·gm + a0) / (q2·gm² + q1·gm + q0) (Vittoz et al., IEEE JSSC 1988). Cheaper
    than the complex form when several gm values share one network (drive settings).
    """
    k = coefficients
    gm_a = as_float(gm)
    with np.errstate(invalid="ignore", divide="ignore", over="ignore"):
        gm2 = gm_a * gm_a
        value = (k.a2 * gm2 + k.a1 * gm_a + k.a0) / (k.q2 * gm2 + k.q1 * gm_a + k.q0)
    return to_float(value)


def can_start(r1: ArrayLike, rneg_max: ArrayLike) -> BoolArray:
    """Whether any amplifier in this network could start the crystal.

    Parameters
    ----------
    r1 : motional resistance [ohm]
    rneg_max : |Rneg|max of the network [ohm], from :func:`max_negative_resistance`

    Returns
    -------
    ok : True where R1 < |Rneg|max (Vittoz et al., IEEE JSSC 1988); False where either is
        NaN (unknown is not a pass — the caller reports why)
    """
    return to_bool(as_float(r1) < as_float(rneg_max))


def negative_resistance_margin(rneg: ArrayLike, r1: ArrayLike) -> FloatArray:
    """Negative-resistance margin M = |Rneg| / R1.

    Parameters
    ----------
    rneg : Re(Zc) at the operating gm [ohm] (negative when it can oscillate)
    r1 : motional resistance [ohm]

    Returns
    -------
    margin : [1]; 0 where Re(Zc) ≥ 0; NaN where an input is NaN

    Notes
    -----
    Common practice in application literature asks for M ≥ 5 (≥ 10 automotive); the
    threshold is a brief setting, not part of the physics.
    """
    rneg_a = as_float(rneg)
    magnitude = np.where(rneg_a < 0.0, -rneg_a, np.where(np.isnan(rneg_a), np.nan, 0.0))
    return to_float(magnitude / as_float(r1))


def gain_margin(gm: ArrayLike, gm_crit: ArrayLike) -> FloatArray:
    """Gain ratio gm / gm_crit.

    Parameters
    ----------
    gm : amplifier transconductance [S]
    gm_crit : critical transconductance [S]

    Returns
    -------
    ratio : [1]; 0 where gm_crit is infinite

    Notes
    -----
    Differs from the negative-resistance margin once gm approaches gm_opt (Vittoz 2010,
    ch. 3).
    """
    return to_float(np.asarray(as_float(gm) / as_float(gm_crit)))


def oscillation_frequency(
    fs: ArrayLike,
    c1: ArrayLike,
    gm: ArrayLike,
    cg: ArrayLike,
    cd: ArrayLike,
    c3: ArrayLike,
    g1: ArrayLike = 0.0,
    g2: ArrayLike = 0.0,
    g3: ArrayLike = 0.0,
) -> FloatArray:
    """Frequency at which the motional reactance cancels the circuit's reactance.

    Parameters
    ----------
    fs : series resonance of the crystal [Hz]
    c1 : motional capacitance [F]
    gm : transconductance the amplifier presents at this amplitude [S]
    cg, cd, c3, g1, g2, g3 : as in :func:`pierce_impedance` (C3 includes C0)

    Returns
    -------
    f : oscillation frequency [Hz]

    Notes
    -----
    The loop closes where Zm + Zc = 0; its imaginary part gives
    ωL1 − 1/(ωC1) = −Im Zc(ω) (Vittoz et al., IEEE JSSC 1988). With gm → 0 this is the
    load resonance at CL = Cg·Cd/(Cg+Cd) + stray; a finite gm lowers the effective load
    capacitance and raises the frequency. Solved by the same contracting fixed point as
    :func:`picker.physics.crystal.load_resonance_frequency`.
    """
    fs_a, c1_a = as_float(fs), as_float(c1)
    omega_s = 2.0 * np.pi * fs_a
    l1 = 1.0 / (omega_s**2 * c1_a)
    omega = _load_resonance_start(omega_s, c1_a, cg, cd, c3)
    with np.errstate(invalid="ignore", divide="ignore"):
        for _ in range(8):
            x_star = -np.imag(pierce_impedance(omega, gm, cg, cd, c3, g1, g2, g3))
            omega = (x_star + np.sqrt(x_star**2 + 4.0 * l1 / c1_a)) / (2.0 * l1)
    return to_float(omega / (2.0 * np.pi))


def steady_state_frequency(
    fs: ArrayLike,
    r1: ArrayLike,
    c1: ArrayLike,
    cg: ArrayLike,
    cd: ArrayLike,
    c3: ArrayLike,
    g1: ArrayLike = 0.0,
    g2: ArrayLike = 0.0,
    g3: ArrayLike = 0.0,
) -> FloatArray:
    """Oscillation frequency once the amplitude has settled (amplifier pulling included).

    Parameters
    ----------
    fs : series resonance of the crystal [Hz]
    r1 : motional resistance [ohm]
    c1 : motional capacitance [F]
    cg, cd, c3, g1, g2, g3 : as in :func:`pierce_impedance` (C3 includes C0)

    Returns
    -------
    f : steady-state oscillation frequency [Hz]; NaN where the crystal cannot start

    Notes
    -----
    In steady state the amplitude limits the amplifier's effective transconductance at the
    fundamental to the critical value, so Zm + Zc = 0 holds in both parts at once:
    Re Zc(ω, Gm) = −R1 (Gm = gm_crit on the rising branch) and ωL1 − 1/(ωC1) = −Im Zc
    (Vittoz et al., IEEE JSSC 1988; Vittoz 2010, ch. 3). Iterated jointly from the load
    resonance. The offset from the plain load-resonance frequency is the amplifier's
    pulling: typically under 2 ppm for fundamentals, more near the start-up limit.
    """
    fs_a, c1_a = as_float(fs), as_float(c1)
    omega_s = 2.0 * np.pi * fs_a
    l1 = 1.0 / (omega_s**2 * c1_a)
    omega = _load_resonance_start(omega_s, c1_a, cg, cd, c3)
    with np.errstate(invalid="ignore", divide="ignore"):
        for _ in range(8):
            gm = critical_transconductance(omega, r1, cg, cd, c3, g1, g2, g3)
            gm = np.where(np.isfinite(gm), gm, np.nan)
            x_star = -np.imag(pierce_impedance(omega, gm, cg, cd, c3, g1, g2, g3))
            omega = (x_star + np.sqrt(x_star**2 + 4.0 * l1 / c1_a)) / (2.0 * l1)
    return to_float(omega / (2.0 * np.pi))


def _load_resonance_start(
    omega_s: FloatArray, c1: FloatArray, cg: ArrayLike, cd: ArrayLike, c3: ArrayLike
) -> FloatArray:
    # lossless load resonance with everything across the arm: C3 + Cg·Cd/(Cg + Cd)
    cg_a, cd_a = as_float(cg), as_float(cd)
    with np.errstate(invalid="ignore", divide="ignore"):
        total = as_float(c3) + cg_a * cd_a / (cg_a + cd_a)
        return np.asarray(omega_s * np.sqrt(1.0 + c1 / total))
