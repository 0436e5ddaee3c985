"""Saturation of pure fluids and the dew line of mixtures.

References
----------
* IAPWS-IF97 through the independent `iapws` package (J. Rodriguez Romero).
* Raoult's law (ideal gas, ideal solution) at low pressure, common practice.
"""

import iapws
import numpy as np
import pytest

import workbench as wb
from workbench.errors import InputError, PropertyError


def test_saturation_curve_matches_iapws97(water_if97):
    # Reference: IAPWS-IF97 saturation states via iapws.IAPWS97(P, x).
    curve = water_if97.saturation_curve(points=8)
    assert len(curve) == 16
    # Compared below 16.5 MPa (regions 1 and 2, T_sat < 623.15 K): near the critical point, in
    # region 3, the property library's IF97 and `iapws` differ by up to ~0.3 % in h.
    for st, x in [(st, 0) for st in curve[:8]] + [(st, 1) for st in curve[8:]]:
        if st.P < 16.5e6:
            assert st.h == pytest.approx(iapws.IAPWS97(P=st.P / 1e6, x=x).h * 1e3, rel=1e-6)
    isobar = water_if97.isobar(1e5, curve[0].s, curve[-1].s, points=5)
    assert all(st is None or st.P == pytest.approx(1e5) for st in isobar)


def test_saturation_temperature_and_pressure_match_iapws97(water_if97):
    # Reference: IAPWS-IF97 region 4 via iapws.IAPWS97(P, x) and (T, x).
    assert water_if97.saturation_temperature(1e6) == pytest.approx(
        iapws.IAPWS97(P=1.0, x=0).T, rel=1e-9)
    assert water_if97.saturation_pressure(450.0) == pytest.approx(
        iapws.IAPWS97(T=450.0, x=0).P * 1e6, rel=1e-8)
    liquid, vapour = water_if97.saturation_states(1e6)
    assert (liquid.x, vapour.x) == (0.0, 1.0) and liquid.two_phase and vapour.two_phase


def test_saturation_of_a_mixture_and_dew_of_a_pure_fluid_refused(natural_gas, water):
    for method in (natural_gas.saturation_states, natural_gas.saturation_temperature):
        with pytest.raises(InputError, match="pure fluids only"):
            method(1e5)
    with pytest.raises(InputError, match="mixtures only"):
        water.dew_temperature(1e5)
    for bad in (0, 1, "40", 10 ** 9, True):
        with pytest.raises(InputError, match="number of points"):
            water.saturation_curve(bad)
    with pytest.raises(InputError, match="isobar pressure"):
        water.isobar(-1.0, 1000.0, 2000.0)


def test_dense_natural_gas_above_the_cricondenbar_is_accepted():
    # Common practice (value from memory): the phase envelope of a lean natural gas
    # (~89 % methane) closes near 50 bar and 225 K, so gas at 200 bar and 400 K - an export
    # or injection compressor's discharge - is single-phase.  The property library's dew-point
    # solver returns a trivial solution there (about 1394 K), which must not refuse the state.
    gas = wb.Fluid({"Methane": 0.89, "Ethane": 0.06, "Propane": 0.02, "Nitrogen": 0.015,
                    "CarbonDioxide": 0.015})
    for pressure in (150e5, 200e5, 250e5):
        assert gas.state_PT(pressure, 400.0).phase == "gas"
        assert gas.dew_temperature(pressure) is None
    t_dew = gas.dew_temperature(45e5)
    assert 195.0 < t_dew < 230.0  # below the critical temperature of ethane, above methane's
    with pytest.raises(PropertyError, match="dew point"):
        gas.state_PT(45e5, t_dew - 1.0)


def test_dew_line_table_gives_the_exact_verdicts():
    # Source: the exact dew-point flash of the same mixture (a fluid that never tabulates).
    # After many distinct pressures a fluid tabulates its dew line; its bounds must hold the
    # exact dew point, and states either side of the line get the same verdict as before.
    spec = {"Methane": 0.89, "Ethane": 0.06, "Propane": 0.03, "Nitrogen": 0.02}
    gas, exact = wb.Fluid(spec), wb.Fluid(spec)
    exact.DEW_TABLE_AFTER = 10 ** 9
    pressures = np.geomspace(2e5, 40e5, 40)
    for pressure in pressures:
        gas.dew_temperature(float(pressure))
    checked = 0
    for pressure in pressures[::4] * 1.013:
        pressure = float(pressure)
        t_dew = exact.dew_temperature(pressure)
        bounds = gas.dew_bounds(pressure)
        if t_dew is None or bounds is None:
            continue
        checked += 1
        assert bounds[0] < t_dew < bounds[1]
        for T in (t_dew - 0.05, t_dew + 0.05, t_dew + 3.0, t_dew + 150.0):
            if T < gas.T_min:
                continue
            verdicts = []
            for fluid in (gas, exact):
                try:
                    verdicts.append(fluid.state_PT(pressure, T).h)
                except PropertyError:
                    verdicts.append("refused")
            assert verdicts[0] == verdicts[1] or verdicts[0] == pytest.approx(verdicts[1])
        s = exact.state_PT(pressure, t_dew + 40.0).s
        assert gas.state_Ps(pressure * 1.5, s).T == pytest.approx(
            exact.state_Ps(pressure * 1.5, s).T, rel=1e-9)
    assert checked >= 5
    assert exact.dew_bounds(2e6) is None  # a fluid that never tabulates vouches for nothing


def test_dew_line_of_a_mixture_against_raoults_law():
    # Raoult's law (ideal gas, ideal solution), common practice at low pressure:
    # 1 = sum(y_i P / Psat_i(T)) at the dew point; pure-component vapour pressures from each
    # component's own equation of state.  Agreement within 1 K at 0.2-0.5 bar.
    import CoolProp.CoolProp as CP
    from scipy.optimize import brentq

    spec = {"Methane": 0.90, "Ethane": 0.07, "Propane": 0.03}
    gas = wb.Fluid(spec)

    def raoult(P):
        def residual(T):
            total = 0.0
            for name, y in spec.items():
                if T < CP.PropsSI("Tcrit", name):
                    total += y * P / CP.PropsSI("P", "T", T, "Q", 0, name)
            return total - 1.0
        return brentq(residual, 100.0, 300.0)

    for P in (0.2e5, 0.5e5):
        assert gas.dew_temperature(P) == pytest.approx(raoult(P), abs=1.0)
    line = gas.dew_line(30)
    assert len(line) > 10 and wb.Fluid("Water").dew_line() == []
    assert gas.saturation_curve(30) == line
    temperatures = [st.T for st in line]
    assert temperatures[:10] == sorted(temperatures[:10])  # rises with pressure at first
    for st in line[::6]:
        assert st.T == pytest.approx(gas.dew_temperature(st.P), rel=1e-12)
        assert st.phase == "gas"
        gas.state_PT(st.P, st.T + 0.5)  # just above the line: accepted
        with pytest.raises(PropertyError, match="dew point"):
            gas.state_PT(st.P, st.T - 0.5)
