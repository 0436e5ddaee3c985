"""The temperature solver (scipy's Newton with Brent/Chandrupatla safeguards).

References
----------
* CoolProp's low-level AbstractState called directly (the mixture's h and s at the root).
* IAPWS-IF97 forward equations through the independent `iapws` package.
* Closed forms (a root of an arctangent, where Newton's method alone diverges).
* The hand-written safeguarded Newton iterations this solver replaced (kept below as the
  reference of the old results).
"""

import math
from collections import namedtuple

import CoolProp
import CoolProp.CoolProp as CP
import iapws
import numpy as np
import pytest

import workbench as wb
from workbench.properties import solver

SPEC = {"Methane": 0.86, "Ethane": 0.07, "Propane": 0.04, "Nitrogen": 0.03}
Point = namedtuple("Point", "T h s cp")


def _old_newton(fluid, P, target, prop, T, lo, hi, rtol):
    """The safeguarded Newton iteration of the former workbench/fluids.py (reference)."""
    pick = (lambda st: st.h) if prop == "h" else (lambda st: st.s)
    slope = (lambda st: st.cp) if prop == "h" else (lambda st: st.cp / st.T)
    a_lo, a_hi = lo, hi
    for _ in range(60):
        st = fluid.flash_PT(P, T)
        f = pick(st) - target
        if f > 0:
            a_hi = T
        else:
            a_lo = T
        T_new = T - f / slope(st)
        if not (a_lo < T_new < a_hi):
            T_new = 0.5 * (a_lo + a_hi)
        if abs(T_new - T) < rtol * T:
            return fluid.flash_PT(P, T_new)
        T = T_new
    raise AssertionError("the reference did not converge")


def _coolprop_gas(P, T):
    """h [J/kg] and s [J/(kg K)] of the natural gas from CoolProp directly (gas phase)."""
    state = CP.AbstractState("HEOS", "&".join(SPEC))
    state.set_mole_fractions(list(SPEC.values()))
    state.specify_phase(CoolProp.iphase_gas)
    state.update(CP.PT_INPUTS, P, T)
    return state.hmass(), state.smass()


@pytest.mark.parametrize("prop", ["h", "s"])
def test_mixture_roots_hit_the_target_and_equal_the_old_results(prop):
    # Sources: CoolProp's AbstractState directly (h, s at the root); the former hand-written
    # Newton iteration started from the same guess (as the machines give one), to 1e-9.
    gas = wb.Fluid(SPEC)
    for P1, T1, ratio in ((30e5, 300.0, 3.0), (10e5, 280.0, 0.4), (60e5, 350.0, 1.8)):
        inlet = gas.state_PT(P1, T1)
        P2 = P1 * ratio
        target = inlet.h + 40e3 if prop == "h" else inlet.s
        lo = max(gas.T_min, gas.dew_temperature(P2) or gas.T_min)
        new = solver.temperature_root(gas.flash_PT, P2, target, prop, T1, lo, gas.T_max)
        old = _old_newton(gas, P2, target, prop, T1, lo, gas.T_max, solver.RTOL_MIXTURE)
        h, s = _coolprop_gas(P2, new.T)
        assert (h if prop == "h" else s) == pytest.approx(target, rel=1e-12)
        assert new.h == pytest.approx(old.h, rel=1e-9)
        assert new.s == pytest.approx(old.s, rel=1e-9)


@pytest.mark.parametrize("P_MPa, T_K", [(0.1, 400.0), (1.0, 300.0), (5.0, 700.0), (25.0, 900.0),
                                        (0.01, 1000.0)])
def test_if97_states_agree_with_the_forward_equations(water_if97, P_MPa, T_K):
    # Source: IAPWS-IF97 forward equations via iapws.IAPWS97(P, T): the state found from h
    # (or s) has the forward equations' h (or s) at its temperature, to 1e-9.
    ref = iapws.IAPWS97(P=P_MPa, T=T_K)
    for prop, target in (("h", ref.h * 1e3), ("s", ref.s * 1e3)):
        st = solver.if97_state(water_if97, P_MPa * 1e6, target, prop)
        again = iapws.IAPWS97(P=P_MPa, T=st.T)
        assert (again.h if prop == "h" else again.s) * 1e3 == pytest.approx(target, rel=1e-9)
        assert st.T == pytest.approx(T_K, rel=1e-9)


@pytest.mark.parametrize("P_MPa, T_K", [(23.0, 650.0), (30.0, 680.0), (50.0, 720.0)])
def test_if97_region_3_states_from_h_and_s(water_if97, P_MPa, T_K):
    # Source: IAPWS-IF97 region 3 via iapws.IAPWS97(P, T).  The property library has no
    # backward equation there (its P-h and P-s flashes fail), so the solver starts mid-range;
    # the state found has the forward equations' h and s at the temperature it came from.
    # The library's region 3 and `iapws` differ by up to ~2e-6 in h (two implementations).
    forward = water_if97.state_PT(P_MPa * 1e6, T_K)
    ref = iapws.IAPWS97(P=P_MPa, T=T_K)
    assert ref.region == 3
    assert forward.h == pytest.approx(ref.h * 1e3, rel=5e-6)
    for prop in ("h", "s"):
        st = solver.if97_state(water_if97, P_MPa * 1e6, getattr(forward, prop), prop)
        assert st.T == pytest.approx(T_K, rel=1e-9)
        assert getattr(st, prop) == pytest.approx(getattr(forward, prop), rel=1e-9)
        many = water_if97.states_Ph if prop == "h" else water_if97.states_Ps
        assert many([P_MPa * 1e6], [getattr(forward, prop)]).T[0] == pytest.approx(T_K, rel=1e-9)


def test_if97_arrays_equal_the_single_states(water_if97):
    # Source: the single-state solver (if97_state) entry by entry, to 1e-9 in h and s.
    P = np.array([0.1e6, 1e6, 5e6, 23e6, 30e6, 1e4])
    T = np.array([400.0, 300.0, 700.0, 660.0, 650.0, 1000.0])
    s = np.array([water_if97.state_PT(p, t).s for p, t in zip(P, T)])
    found = solver.if97_states(water_if97, P, s, "s", np.ones(len(P), dtype=bool))
    assert found.valid.all()
    for i in range(len(P)):
        single = solver.if97_state(water_if97, float(P[i]), float(s[i]), "s")
        assert found.h[i] == pytest.approx(single.h, rel=1e-9)
        assert found.s[i] == pytest.approx(single.s, rel=1e-9)


def _arctan_point(P, T):
    """A made-up 'enthalpy' h = 1e4 atan((T - 500)/10) + 1e6 with its slope (closed form)."""
    h = 1e4 * math.atan((T - 500.0) / 10.0) + 1e6
    cp = 1e4 / 10.0 / (1.0 + ((T - 500.0) / 10.0) ** 2)
    return Point(T, h, h, cp)


def test_newton_that_leaves_the_bracket_falls_back_to_a_bracketing_method():
    # Closed form: atan has its root at T = 500 K; Newton's method from 560 K overshoots far
    # out of [300, 900] K, so the safeguard (Brent's method) must find it.
    st = solver.temperature_root(_arctan_point, 1e5, 1e6, "h", 560.0, 300.0, 900.0)
    assert st.T == pytest.approx(500.0, abs=1e-9)
    roots, ok = solver.temperature_roots(
        lambda P, T: 1e4 * np.arctan((T - 500.0) / 10.0) + 1e6,
        lambda P, T: 1e3 / (1.0 + ((T - 500.0) / 10.0) ** 2),
        np.ones(3), np.full(3, 1e6), np.array([560.0, 505.0, 499.0]),
        np.full(3, 300.0), np.full(3, 900.0))
    assert ok.all()
    np.testing.assert_allclose(roots, 500.0, rtol=1e-12)


def test_targets_outside_the_bracket_say_which_side():
    # Closed form: the arctangent 'enthalpy' lies within 1e6 +- 1.6e4 on [300, 900] K.
    for target, side in ((0.9e6, "low"), (1.1e6, "high")):
        with pytest.raises(solver.NoRootInBracket) as info:
            solver.temperature_root(_arctan_point, 1e5, target, "h", 560.0, 300.0, 900.0)
        assert info.value.side == side
        assert isinstance(info.value, wb.PropertyError)
    roots, ok = solver.temperature_roots(
        lambda P, T: 1e4 * np.arctan((T - 500.0) / 10.0) + 1e6,
        lambda P, T: 1e3 / (1.0 + ((T - 500.0) / 10.0) ** 2),
        np.ones(1), np.array([1.1e6]), np.array([560.0]), np.array([300.0]), np.array([900.0]))
    assert not ok[0] and np.isnan(roots[0])


def test_mixture_solver_refusals_name_the_side(natural_gas):
    # Source: the model's published temperature limit and the mixture's dew point.
    with pytest.raises(wb.PropertyError, match="dew point"):
        natural_gas.state_Ph(50e5, -2e6)
    with pytest.raises(wb.PropertyError, match="temperature limit"):
        natural_gas.state_Ph(50e5, 5e7)
