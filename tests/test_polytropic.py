"""Polytropic methods against perfect-gas closed forms.

References
----------
* Perfect gas: polytropic path T2/T1 = (P2/P1)^((k-1)/(k eta_p)) (compression) and
  (P2/P1)^(eta_p (k-1)/k) (expansion); polytropic head = n/(n-1) R T1 [(P2/P1)^((n-1)/n) - 1].
* Schultz (1962): the Schultz factor is exactly 1 for a perfect gas.
"""

import math

import pytest

import workbench as wb
from workbench.polytropic import polytropic_efficiency, polytropic_outlet, schultz


@pytest.fixture(scope="module")
def argon():
    # Monatomic gas: k = 5/3 exactly for the ideal gas (kinetic theory); at 0.2-1 bar Z - 1 is
    # below 1e-3, so the closed forms hold to about 2e-4.
    return wb.Fluid("Argon")


def test_expansion_closed_form(argon):
    inlet = argon.state(P=1e5, T=600.0)
    out, head, _ = polytropic_outlet(inlet, 0.25e5, 0.85)
    k = 5.0 / 3.0
    assert out.T == pytest.approx(600.0 * 0.25 ** (0.85 * (k - 1) / k), rel=2e-4)
    # head = integral v dP = (h1 - h2)/eta_p for expansion
    assert head == pytest.approx((inlet.h - out.h) / 0.85, rel=1e-6)


def test_compression_head_closed_form(argon):
    inlet = argon.state(P=0.2e5, T=300.0)
    eta, k = 0.8, 5.0 / 3.0
    out, head, _ = polytropic_outlet(inlet, 0.8e5, eta)
    n_over = eta * k / (k - 1)  # n/(n-1) = eta k/(k-1) for a perfect gas
    R = argon.gas_constant
    expected = n_over * R * 300.0 * (4.0 ** (1 / n_over) - 1)
    assert head == pytest.approx(expected, rel=3e-4)


def test_schultz_factor_is_one_for_perfect_gas(argon):
    inlet = argon.state(P=0.2e5, T=300.0)
    iso = argon.state(P=0.8e5, s=inlet.s)
    out, _, _ = polytropic_outlet(inlet, 0.8e5, 0.75)
    result = schultz(inlet, out, iso)
    assert result.schultz_factor == pytest.approx(1.0, abs=5e-4)
    assert result.isentropic_exponent == pytest.approx(5.0 / 3.0, rel=5e-4)
    assert result.polytropic_efficiency == pytest.approx(0.75, abs=1e-4)


def test_rating_inverts_prediction_for_steam():
    steam = wb.Fluid("Water", backend="IF97")
    inlet = steam.state(P=60e5, T=753.15)
    out, _, _ = polytropic_outlet(inlet, 0.08e5, 0.83)
    assert out.two_phase and out.x < 1
    eta, head, _ = polytropic_efficiency(inlet, out)
    assert eta == pytest.approx(0.83, abs=1e-5)
    assert head == pytest.approx((inlet.h - out.h) / eta, rel=1e-5)
    assert math.isfinite(head)


def test_path_states_follow_closed_form(argon):
    # Every point of the drawn path obeys T/T1 = (P/P1)^((k-1)/(k eta_p)) for a perfect gas.
    from workbench.polytropic import polytropic_path

    inlet = argon.state(P=0.2e5, T=300.0)
    states = polytropic_path(inlet, 0.8e5, 0.8, points=6)
    assert len(states) == 7 and states[-1].P == pytest.approx(0.8e5)
    for st in states:
        assert st.T == pytest.approx(300.0 * (st.P / 0.2e5) ** (0.4 / 0.8), rel=3e-4)
