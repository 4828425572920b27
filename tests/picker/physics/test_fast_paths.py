"""The vectorised fast paths against straightforward reference implementations.

The Pierce coefficients are formed in real arithmetic, the optimum and the critical gm share
one coefficient set, the load-resonance fixed point stops per row, and the error budget's
RSS is one sum of squares. Each check here compares with the plain textbook evaluation
(complex arithmetic for the Pierce network of Vittoz, Degrauwe & Bitz, IEEE JSSC 23(3),
1988; the fixed step count for the load resonance; a scaled RSS and math.hypot for the
budget) on invented parts drawn by a seeded random generator over the ranges a catalog
holds (32 kHz tuning forks to 100 MHz overtones; values are estimates, not data-sheet
figures).
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from picker.physics import budget, crystal, pierce

# Agreement asked of every rewritten path: 1e-12 relative (rounding differs at the 1e-15
# level on catalog-like inputs; the margin covers ill-conditioned rows).
RTOL = 1e-12


def _log_uniform(rng: np.random.Generator, low: float, high: float, n: int) -> np.ndarray:
    return np.exp(rng.uniform(np.log(low), np.log(high), n))


def _network(seed: int, n: int = 20_000, *, lossy: bool) -> dict[str, np.ndarray]:
    """Catalog-like Pierce networks (invented; ranges from memory of typical designs)."""
    rng = np.random.default_rng(seed)
    f = _log_uniform(rng, 32e3, 100e6, n)
    values = {
        "omega": 2 * np.pi * f,
        "cg": _log_uniform(rng, 4e-12, 40e-12, n),
        "cd": _log_uniform(rng, 4e-12, 40e-12, n),
        "c3": _log_uniform(rng, 0.8e-12, 8e-12, n),
        "r1": _log_uniform(rng, 10.0, 80e3, n),
        "g1": np.zeros(n),
        "g2": _log_uniform(rng, 1e-6, 1e-3, n) if lossy else np.zeros(n),
        "g3": _log_uniform(rng, 1e-8, 1e-5, n) if lossy else np.zeros(n),
    }
    # missing figures stay missing
    values["c3"][::97] = np.nan
    values["r1"][::89] = np.nan
    return values


# --- reference: the network in complex arithmetic, as first written ------------------------


def _reference_coefficients(v: dict[str, np.ndarray]) -> tuple[np.ndarray, ...]:
    # Zc = N/D, N = gm + n0, D = Y3·gm + d0 (Vittoz et al. 1988), expanded with complex
    # numpy: Re(Zc) = Re(N·conj D)/|D|²
    w = v["omega"]
    y1 = v["g1"] + 1j * w * v["cg"]
    y2 = v["g2"] + 1j * w * v["cd"]
    y3 = v["g3"] + 1j * w * v["c3"]
    n0 = y1 + y2
    d0 = y1 * y2 + y3 * n0
    return (
        np.real(np.conj(y3)),
        np.real(np.conj(d0) + n0 * np.conj(y3)),
        np.real(n0 * np.conj(d0)),
        np.abs(y3) ** 2,
        2.0 * np.real(y3 * np.conj(d0)),
        np.abs(d0) ** 2,
    )


def _reference_optimum(v: dict[str, np.ndarray]) -> tuple[np.ndarray, np.ndarray]:
    a2, a1, a0, q2, q1, q0 = _reference_coefficients(v)
    a = a2 * q1 - a1 * q2
    b = 2.0 * (a2 * q0 - a0 * q2)
    c = a1 * q0 - a0 * q1
    with np.errstate(invalid="ignore", divide="ignore"):
        sq = np.sqrt(b * b - 4.0 * a * c)
        roots = [(-b - sq) / (2.0 * a), (-b + sq) / (2.0 * a)]
        values = []
        for gm in roots:
            value = (a2 * gm**2 + a1 * gm + a0) / (q2 * gm**2 + q1 * gm + q0)
            values.append(np.where((gm > 0) & np.isfinite(value), value, np.inf))
    first = values[0] <= values[1]
    gm_opt = np.where(first, roots[0], roots[1])
    re_min = np.minimum(values[0], values[1])
    negative = re_min < 0.0
    gm_opt = np.where(negative, gm_opt, np.nan)
    rneg_max = np.where(negative, -re_min, 0.0)
    missing = np.isnan(a1) | np.isnan(q0)
    return np.where(missing, np.nan, gm_opt), np.where(missing, np.nan, rneg_max)


def _reference_critical(v: dict[str, np.ndarray]) -> np.ndarray:
    a2, a1, a0, q2, q1, q0 = _reference_coefficients(v)
    r1 = v["r1"]
    a, b, c = a2 + r1 * q2, a1 + r1 * q1, a0 + r1 * q0
    with np.errstate(invalid="ignore", divide="ignore"):
        # the smaller root of the quadratic in its cancellation-free form 2c/(−b + √disc)
        # (the (−b − √disc)/(2a) form loses digits when 4ac ≪ b², as it does here)
        disc = b * b - 4.0 * a * c
        root = 2.0 * c / (-b + np.sqrt(disc))
    result = np.where((disc >= 0) & (b < 0) & (c > 0), root, np.inf)
    result = np.where(c <= 0.0, 0.0, result)
    return np.where(np.isnan(a) | np.isnan(b) | np.isnan(c), np.nan, result)


def _args(v: dict[str, np.ndarray]) -> tuple[np.ndarray, ...]:
    return v["omega"], v["cg"], v["cd"], v["c3"], v["g1"], v["g2"], v["g3"]


@pytest.mark.parametrize("lossy", [False, True])
def test_coefficients_match_the_complex_expansion(lossy: bool) -> None:
    v = _network(11, lossy=lossy)
    fast = pierce.pierce_coefficients(*_args(v))
    reference = _reference_coefficients(v)
    # a2 = Re Y3 = G3 exactly; the complex form also turns it NaN where C3 is missing, which
    # q2 = |Y3|² carries here (every consumer reads both)
    np.testing.assert_array_equal(fast.a2, v["g3"])
    assert np.array_equal(np.isnan(fast.q2), np.isnan(v["c3"]))
    # a1, a0 and q1 are sums of two products that can nearly cancel: judge each row against
    # the size of its terms, the rounding either form can carry
    w, y3 = v["omega"], v["g3"] + 1j * v["omega"] * v["c3"]
    n0 = v["g1"] + v["g2"] + 1j * w * (v["cg"] + v["cd"])
    d0 = (v["g1"] + 1j * w * v["cg"]) * (v["g2"] + 1j * w * v["cd"]) + y3 * n0
    scales = {
        "a1": np.abs(d0.real) + np.abs(n0.real * y3.real) + np.abs(n0.imag * y3.imag),
        "a0": np.abs(n0.real * d0.real) + np.abs(n0.imag * d0.imag),
        "q2": reference[3],
        "q1": 2.0 * (np.abs(y3.real * d0.real) + np.abs(y3.imag * d0.imag)),
        "q0": reference[5],
    }
    for name, got, want in zip(fast._fields[1:], fast[1:], reference[1:], strict=True):
        close = np.abs(got - want) <= RTOL * scales[name]
        both_nan = np.isnan(got) & np.isnan(want)
        assert np.all(close | both_nan), name


@pytest.mark.parametrize("lossy", [False, True])
def test_pierce_optimum_matches_the_reference(lossy: bool) -> None:
    v = _network(12, lossy=lossy)
    best = pierce.pierce_optimum(pierce.pierce_coefficients(*_args(v)))
    gm_ref, rneg_ref = _reference_optimum(v)
    np.testing.assert_allclose(best.gm_opt, gm_ref, rtol=RTOL, equal_nan=True)
    np.testing.assert_allclose(best.rneg_max, rneg_ref, rtol=RTOL, equal_nan=True)
    # the same figures through the two single-purpose functions
    np.testing.assert_array_equal(pierce.optimum_transconductance(*_args(v)), best.gm_opt)
    np.testing.assert_array_equal(pierce.max_negative_resistance(*_args(v)), best.rneg_max)


def test_pierce_optimum_lossless_closed_forms() -> None:
    # Vittoz et al. 1988: gm_opt = ω·K/C3 and |Rneg|max = Cg·Cd/(2·ω·C3·K),
    # K = Cg·Cd + C3·(Cg + Cd)
    v = _network(13, lossy=False)
    w, cg, cd, c3 = v["omega"], v["cg"], v["cd"], v["c3"]
    k = cg * cd + c3 * (cg + cd)
    best = pierce.pierce_optimum(pierce.pierce_coefficients(w, cg, cd, c3))
    np.testing.assert_allclose(best.gm_opt, w * k / c3, rtol=1e-12, equal_nan=True)
    np.testing.assert_allclose(
        best.rneg_max, cg * cd / (2 * w * c3 * k), rtol=1e-12, equal_nan=True
    )


@pytest.mark.parametrize("lossy", [False, True])
def test_critical_transconductance_from_matches_the_reference(lossy: bool) -> None:
    v = _network(14, lossy=lossy)
    k = pierce.pierce_coefficients(*_args(v))
    fast = pierce.critical_transconductance_from(k, v["r1"])
    np.testing.assert_allclose(fast, _reference_critical(v), rtol=RTOL, equal_nan=True)
    np.testing.assert_array_equal(
        pierce.critical_transconductance(v["omega"], v["r1"], *_args(v)[1:]), fast
    )


@pytest.mark.parametrize("lossy", [False, True])
def test_negative_resistance_from_matches_the_complex_impedance(lossy: bool) -> None:
    # Re of Zc = (gm + Y1 + Y2)/(Y1·Y2 + Y3·(Y1 + Y2 + gm)) (Vittoz et al. 1988) in complex
    # numpy, at operating points between gm_crit and a few times gm_opt
    v = _network(15, lossy=lossy)
    rng = np.random.default_rng(16)
    k = pierce.pierce_coefficients(*_args(v))
    gm = pierce.pierce_optimum(k).gm_opt * _log_uniform(rng, 0.05, 3.0, v["omega"].size)
    w = v["omega"]
    y1 = v["g1"] + 1j * w * v["cg"]
    y2 = v["g2"] + 1j * w * v["cd"]
    y3 = v["g3"] + 1j * w * v["c3"]
    with np.errstate(invalid="ignore"):
        want = np.real((gm + y1 + y2) / (y1 * y2 + y3 * (y1 + y2 + gm)))
    np.testing.assert_allclose(pierce.negative_resistance_from(k, gm), want, rtol=1e-10)


def test_one_number_in_gives_one_number_out() -> None:
    k = pierce.pierce_coefficients(2 * np.pi * 16e6, 18e-12, 18e-12, 7e-12, 0.0, 1e-4, 1e-6)
    best = pierce.pierce_optimum(k)
    assert np.ndim(best.gm_opt) == 0 and np.ndim(best.rneg_max) == 0
    assert np.ndim(pierce.critical_transconductance_from(k, 80.0)) == 0
    assert np.ndim(pierce.negative_resistance_from(k, 5e-3)) == 0


# --- load resonance: early stop per row --------------------------------------------------


def _reference_load_resonance(fs, r1, c1, c0, cl):  # type: ignore[no-untyped-def]
    # the fixed point of crystal.load_resonance_frequency's Notes, always six steps
    fs, r1, c1, c0, cl = np.broadcast_arrays(fs, r1, c1, c0, cl)
    omega_s = 2 * np.pi * fs
    l1 = 1.0 / (omega_s**2 * c1)
    with np.errstate(divide="ignore", invalid="ignore"):
        omega = omega_s * np.sqrt(1.0 + c1 / (c0 + cl))
        for _ in range(6):
            b0 = omega * c0
            s = 1.0 / (omega * cl)
            a = b0 * (1.0 + b0 * s)
            b = 1.0 + 2.0 * b0 * s
            c = s + a * r1**2
            x_star = 2.0 * c / (b + np.sqrt(b * b - 4.0 * a * c))
            omega = (x_star + np.sqrt(x_star**2 + 4.0 * l1 / c1)) / (2.0 * l1)
    return omega / (2 * np.pi)


def _crystals(seed: int, n: int = 50_000) -> tuple[np.ndarray, ...]:
    rng = np.random.default_rng(seed)
    fs = _log_uniform(rng, 32e3, 100e6, n)
    r1 = _log_uniform(rng, 10.0, 80e3, n)
    c1 = _log_uniform(rng, 0.5e-15, 40e-15, n)
    c0 = _log_uniform(rng, 0.8e-12, 7e-12, n)
    cl = _log_uniform(rng, 4e-12, 30e-12, n)
    cl[::7] = np.inf  # no load capacitor: the crystal's own zero-phase frequency
    r1[::101] = np.nan
    return fs, r1, c1, c0, cl


def test_load_resonance_equals_the_fixed_step_count_bit_for_bit() -> None:
    # a row stops only once a step returns its very bits, so nothing may differ at all
    args = _crystals(21)
    np.testing.assert_array_equal(
        crystal.load_resonance_frequency(*args), _reference_load_resonance(*args)
    )


def test_load_resonance_of_a_row_does_not_depend_on_the_rest_of_the_table() -> None:
    args = _crystals(22, n=2_000)
    together = crystal.load_resonance_frequency(*args)
    alone = [crystal.load_resonance_frequency(*(a[i] for a in args)) for i in range(0, 2_000, 37)]
    np.testing.assert_array_equal(np.asarray(alone), together[::37])


def test_load_resonance_two_dimensional_broadcast() -> None:
    # a frequency column against a row of load capacitances (the compaction indexes N-d)
    fs = np.array([[32768.0], [16e6], [40e6]])
    cl = np.array([6e-12, 9e-12, 12.5e-12, np.inf])
    got = crystal.load_resonance_frequency(fs, 60.0, 5e-15, 2e-12, cl)
    assert got.shape == (3, 4)
    np.testing.assert_array_equal(got, _reference_load_resonance(fs, 60.0, 5e-15, 2e-12, cl))


# --- error budget RSS -----------------------------------------------------------------------


def test_rss_matches_a_scaled_root_sum_square() -> None:
    # √(Σ t²) with every term divided by the largest (the overflow-safe textbook form)
    rng = np.random.default_rng(31)
    terms = [rng.normal(0.0, 1.0, 50_000) * _log_uniform(rng, 1e-3, 1e3, 50_000) for _ in "abcde"]
    stacked = np.abs(np.stack(terms))
    largest = stacked.max(axis=0)
    want = largest * np.sqrt(((stacked / largest) ** 2).sum(axis=0))
    got = budget.frequency_error_budget(*terms)
    np.testing.assert_allclose(got.rss_ppm, want, rtol=1e-15 * 8)
    np.testing.assert_array_equal(got.total_ppm, stacked.sum(axis=0))


@pytest.mark.parametrize(
    "terms",
    [
        (1e-200, 3e-200, 0.0, 0.0, 2e-200),  # squares would underflow to zero
        (1e200, 2e200, 0.0, 5e199, 0.0),  # squares would overflow to inf
        (0.0, 0.0, 0.0, 0.0, 0.0),
    ],
)
def test_rss_far_outside_the_safe_range_uses_hypot(terms: tuple[float, ...]) -> None:
    # math.hypot of several arguments is the reference (Python ≥ 3.8, exact scaling)
    got = budget.frequency_error_budget(*(np.array([t, 1.0]) for t in terms)).rss_ppm
    assert got[0] == pytest.approx(math.hypot(*terms), rel=1e-15, abs=0.0)
    assert got[1] == pytest.approx(math.sqrt(5.0), rel=1e-15)


def test_rss_unknown_when_a_term_is_missing_even_beside_an_infinite_one() -> None:
    # hypot(inf, NaN) is inf in IEEE 754; a missing figure must still give NaN
    got = budget.frequency_error_budget(np.nan, np.inf, 1.0, 1.0, 1.0)
    assert np.isnan(got.rss_ppm) and np.isnan(got.total_ppm)
    assert budget.frequency_error_budget(np.inf, 1.0, 1.0, 1.0, 1.0).rss_ppm == np.inf


def test_lossless_optimum_edge_rows_take_the_general_path() -> None:
    # Vittoz et al. 1988 limits: no capacitor at one node (Cg = 0) gives Re(Zc) = 0 for every
    # gm (no optimum, |Rneg|max 0); nothing across the crystal (C3 = 0) has no ceiling
    # (Re(Zc) = −gm/(ω²·Cg·Cd) falls without bound); a missing value stays missing; the
    # regular rows beside them keep the closed forms
    w = 2 * np.pi * np.array([16e6, 16e6, 16e6, 16e6, 8e6])
    cg = np.array([18e-12, 0.0, 18e-12, np.nan, 12e-12])
    cd = np.full(5, 18e-12)
    c3 = np.array([7e-12, 7e-12, 0.0, 7e-12, 3e-12])
    best = pierce.pierce_optimum(pierce.pierce_coefficients(w, cg, cd, c3))
    k = cg * cd + c3 * (cg + cd)
    for row in (0, 4):
        assert best.gm_opt[row] == pytest.approx(w[row] * k[row] / c3[row], rel=1e-12)
        assert best.rneg_max[row] == pytest.approx(
            cg[row] * cd[row] / (2 * w[row] * c3[row] * k[row]), rel=1e-12
        )
    assert np.isnan(best.gm_opt[1]) and best.rneg_max[1] == 0.0
    assert best.gm_opt[2] == np.inf and best.rneg_max[2] == np.inf
    assert np.isnan(best.gm_opt[3]) and np.isnan(best.rneg_max[3])
    one = pierce.pierce_optimum(pierce.pierce_coefficients(w[0], cg[0], cd[0], c3[0]))
    assert np.ndim(one.gm_opt) == 0 and one.gm_opt == pytest.approx(best.gm_opt[0], rel=1e-15)


@pytest.mark.parametrize("missing_every", [2, 50])
def test_lossless_optimum_of_a_row_does_not_depend_on_the_rest_of_the_table(
    missing_every: int,
) -> None:
    # mostly missing or mostly complete tables take different routes; each row's figures
    # must come out the same as when it is evaluated alone
    v = _network(17, n=3_000, lossy=False)
    v["cg"][::missing_every] = np.nan
    args = (v["omega"], v["cg"], v["cd"], v["c3"])
    together = pierce.pierce_optimum(pierce.pierce_coefficients(*args))
    for i in range(0, 3_000, 41):
        alone = pierce.pierce_optimum(pierce.pierce_coefficients(*(a[i] for a in args)))
        np.testing.assert_array_equal(alone.gm_opt, together.gm_opt[i])
        np.testing.assert_array_equal(alone.rneg_max, together.rneg_max[i])
