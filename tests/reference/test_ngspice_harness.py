"""The harness itself, checked on circuits whose answers are known in closed form."""

from __future__ import annotations

import numpy as np
import pytest

from tests.reference.ngspice import Sweep, extremum, run_ac, zero_crossing


def test_rc_network_matches_the_textbook_impedance() -> None:
    # Z of R in parallel with C: R/(1 + jωRC) (any circuit-theory text). This proves the
    # harness reads frequency, real and imaginary parts in the right columns.
    r, c = 1e3, 1e-9
    results = run_ac(
        "I1 0 a AC 1\nR1 a 0 1e3\nC1 a 0 1e-9",
        [Sweep("rc", 1e3, 1e6, 7, ("a",))],
    )
    sweep = results["rc"]
    expected = r / (1 + 1j * 2 * np.pi * sweep.frequency * r * c)
    np.testing.assert_allclose(sweep.voltages["a"], expected, rtol=1e-9)


def test_series_lc_zero_crossing_is_the_textbook_resonance() -> None:
    # Series LC: Im Z = ωL − 1/(ωC) crosses zero at 1/(2π√(LC)).
    inductance, capacitance = 1e-3, 1e-9
    f0 = 1 / (2 * np.pi * np.sqrt(inductance * capacitance))
    results = run_ac(
        "I1 0 a AC 1\nR1 a b 1\nL1 b c 1e-3\nC1 c 0 1e-9",
        [Sweep("lc", f0 * 0.99, f0 * 1.01, 201, ("a",))],
    )
    sweep = results["lc"]
    found = zero_crossing(sweep.frequency, sweep.voltages["a"].imag)
    assert abs(found / f0 - 1) < 1e-9


def test_helpers_refuse_a_window_without_the_feature() -> None:
    x = np.linspace(0.0, 1.0, 11)
    try:
        zero_crossing(x, x + 1.0)
    except AssertionError:
        pass
    else:
        raise AssertionError("zero_crossing accepted a window with no sign change")
    try:
        extremum(x, x, find="max")
    except AssertionError:
        pass
    else:
        raise AssertionError("extremum accepted a maximum at the window edge")
    location, value = extremum(x, -((x - 0.43) ** 2) + 2.0, find="max")
    assert abs(location - 0.43) < 1e-12 and abs(value - 2.0) < 1e-12


def test_missing_ngspice_skips_locally_but_fails_in_ci(monkeypatch: pytest.MonkeyPatch) -> None:
    from tests.reference import ngspice

    monkeypatch.setattr(ngspice, "ngspice_path", lambda: None)
    monkeypatch.delenv("CI", raising=False)
    with pytest.raises(pytest.skip.Exception):
        ngspice.require_ngspice()
    monkeypatch.setenv("CI", "true")
    with pytest.raises(pytest.fail.Exception, match="CI is set"):
        ngspice.require_ngspice()
