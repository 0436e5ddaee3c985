"""The balance kernel (workbench.machines.balance) over floats and arrays.

References
----------
* IAPWS-IF97 through the `iapws` package (steam expansion, wet exhaust).
* Perfect-gas closed form T2s = T1 (P2/P1)^((k-1)/k), k = 5/3 for a monatomic gas (kinetic
  theory); argon at 0.5-1.5 bar has Z - 1 < 1e-3.
* First law for one inlet and one outlet, w_in = dh + (V2^2 - V1^2)/2 + g dz + q (common
  practice).
"""

import math

import iapws
import numpy as np
import pandas as pd
import pytest

import workbench as wb
from workbench.fieldtest import evaluate
from workbench.machines import balance

STEAM = wb.Fluid("Water", backend="IF97")
AIR = wb.Fluid("Air")
ARGON = wb.Fluid("Argon")


def _spy(monkeypatch):
    """Record every call of the kernel (the kind of its inlet argument) and pass it on."""
    calls = []
    kernel = balance.steady_flow

    def spy(kind, inlet, *args, **options):
        calls.append(type(inlet).__name__)
        return kernel(kind, inlet, *args, **options)

    monkeypatch.setattr(balance, "steady_flow", spy)
    return calls


def test_single_point_api_goes_through_the_kernel(monkeypatch):
    calls = _spy(monkeypatch)
    inlet = AIR.state(P=1e5, T=300.0)
    wb.compressor(inlet, P_out=2e5, isentropic_efficiency=0.8)
    wb.compressor(inlet, AIR.state(P=2e5, T=385.0), mass_flow=2.0)
    wb.turbine(STEAM.state(P=40e5, T=673.15), P_out=1e5, power=5e6, mass_flow=12.0)
    assert calls == ["State", "State", "State"]


def test_batch_goes_through_the_kernel_over_arrays(monkeypatch):
    # A pure-fluid frame: the whole-array path calls the kernel once with arrays; the one
    # row it refuses (reversed pressure ratio) goes through the single-point API, which calls
    # the kernel's pressure check and raises: no further kernel call for that row.
    calls = _spy(monkeypatch)
    frame = pd.DataFrame({"inlet_pressure": [1e5, 1e5, 1e5],
                          "inlet_temperature": [300.0, 300.0, 300.0],
                          "outlet_pressure": [2e5, 0.5e5, 3e5],
                          "outlet_temperature": [385.0, 290.0, 440.0],
                          "mass_flow": [1.0, 1.0, 1.0]})
    out = evaluate(frame, "compressor", AIR)
    assert calls == ["StateArray"]
    assert list(out["status"]) == ["ok", "invalid reading", "ok"]
    # costly results go row by row through the single-point API, which uses the kernel
    calls.clear()
    evaluate(frame.iloc[[0, 2]], "compressor", AIR, results=("polytropic_efficiency",))
    assert calls == ["State", "State"]


def test_perfect_gas_efficiency_closed_form():
    # eta = (T2s - T1)/(T2 - T1) for a perfect gas (constant cp), T2s from the closed form
    inlet = ARGON.state(P=0.5e5, T=300.0)
    outlet = ARGON.state(P=1.5e5, T=520.0)
    iso = ARGON.state(P=1.5e5, s=inlet.s)
    b = balance.steady_flow("compressor", inlet, outlet, iso, mass_flow=2.0)
    t2s = 300.0 * 3.0 ** 0.4
    assert b.refusal == balance.OK
    assert b.isentropic_efficiency == pytest.approx((t2s - 300.0) / (520.0 - 300.0), rel=2e-3)
    assert b.pressure_ratio == pytest.approx(3.0, rel=1e-12)
    assert b.power == pytest.approx(2.0 * (outlet.h - inlet.h), rel=1e-12)


def test_first_law_terms():
    # w_in = dh + (V2^2 - V1^2)/2 + g dz + q (common practice); standard gravity 9.80665 m/s^2
    # (CGPM 1901)
    inlet, outlet = AIR.state(P=1e5, T=300.0), AIR.state(P=1.5e5, T=345.0)
    iso = AIR.state(P=1.5e5, s=inlet.s)
    b = balance.steady_flow("fan", inlet, outlet, iso, mass_flow=2.0, velocity_in=10.0,
                            velocity_out=60.0, elevation_change=5.0, heat_loss=1000.0,
                            mechanical_efficiency=0.95, stagnation=(inlet, outlet, iso))
    expected = (outlet.h - inlet.h) + (60.0 ** 2 - 10.0 ** 2) / 2 + 9.80665 * 5.0 + 500.0
    assert b.specific_work == pytest.approx(expected, rel=1e-12)
    assert b.shaft_power == pytest.approx(2.0 * expected / 0.95, rel=1e-12)
    assert b.kinetic_energy_change == pytest.approx(1750.0, rel=1e-12)
    assert b.specific_heat_loss == pytest.approx(500.0, rel=1e-12)


def test_steam_expansion_over_arrays_against_iapws():
    # IAPWS-IF97 through iapws.IAPWS97: eta = (h1 - h2)/(h1 - h2s), exhaust from the power
    P1 = np.array([40e5, 60e5, 25e5])
    T1 = np.array([673.15, 723.15, 633.15])
    P2 = np.array([5e5, 0.2e5, 3e5])
    power = np.array([4.5e6, 9.0e6, 3.0e6])
    m = np.array([12.0, 11.0, 10.0])
    inlet = STEAM.states_PT(P1, T1)
    h2 = balance.outlet_enthalpy_from_power("turbine", inlet.h, power, m, 1.0)
    outlet = STEAM.states_Ph(P2, h2)
    iso = STEAM.states_Ps(P2, inlet.s)
    b = balance.steady_flow("turbine", inlet, outlet, iso, mass_flow=m)
    assert (b.refusal == balance.OK).all()
    for i in range(3):
        a = iapws.IAPWS97(P=P1[i] / 1e6, T=T1[i])
        s = iapws.IAPWS97(P=P2[i] / 1e6, s=a.s)
        h_out = a.h - power[i] / m[i] / 1e3
        assert b.isentropic_efficiency[i] == pytest.approx((a.h - h_out) / (a.h - s.h), rel=2e-5)
        assert b.power[i] == pytest.approx(power[i], rel=1e-9)


def test_arrays_equal_floats_entry_by_entry():
    # The kernel over arrays gives the kernel over single states, entry by entry (the same
    # expressions), with the refusal codes of each entry.
    P1 = np.array([1e5, 1e5, 1e5, 1e5])
    T1 = np.array([300.0, 300.0, 300.0, 300.0])
    P2 = np.array([2e5, 3e5, 2e5, 0.5e5])
    T2 = np.array([385.0, 420.0, 340.0, 260.0])  # the third row: efficiency above 1
    inlet, outlet = AIR.states_PT(P1, T1), AIR.states_PT(P2, T2)
    iso = AIR.states_Ps(P2, inlet.s)
    arrays = balance.steady_flow("compressor", inlet, outlet, iso, mass_flow=2.0)
    assert list(arrays.refusal) == [balance.OK, balance.OK, balance.EFFICIENCY_ABOVE_ONE,
                                    balance.WRONG_DIRECTION]
    for i in range(4):
        single = balance.steady_flow("compressor", inlet.state(i), outlet.state(i),
                                     iso.state(i), mass_flow=2.0)
        assert single.refusal == arrays.refusal[i]
        for name in ("power", "isentropic_efficiency", "isentropic_head", "pressure_ratio"):
            assert getattr(single, name) == pytest.approx(getattr(arrays, name)[i], rel=1e-14)


@pytest.mark.parametrize("kind, P_out, phase, code", [
    ("compressor", 0.5e5, "gas", balance.WRONG_DIRECTION),
    ("turbine", 2e5, "gas", balance.WRONG_DIRECTION),
    ("fan", 1e5 * (1 + 1e-12), "gas", balance.NO_PRESSURE_CHANGE),
    ("pump", 5e5, "gas", balance.PUMP_INLET_NOT_LIQUID),
    ("pump", 5e5, "two-phase", balance.PUMP_INLET_NOT_LIQUID),
    ("pump", 5e5, "liquid", balance.OK),
])
def test_pressure_refusals_floats_and_arrays(kind, P_out, phase, code):
    # Common practice: a compressor, pump or fan raises pressure, a turbine lowers it; a pump
    # needs liquid at its inlet.
    assert balance.pressure_refusal(kind, 1e5, P_out, phase) == code
    arrays = balance.pressure_refusal(kind, np.array([1e5, 1e5]), np.array([P_out, P_out]),
                                      np.array([phase, phase], dtype=object))
    assert list(arrays) == [code, code]


def test_refusal_messages_name_the_values():
    inlet = AIR.state(P=5e5, T=300.0)
    error = balance.refusal_error(balance.WRONG_DIRECTION, "compressor", inlet, 2e5)
    assert isinstance(error, wb.InputError)
    assert "outlet pressure 2 bar" in str(error) and "inlet pressure 5 bar" in str(error)
    # T2s = 300 K * 2^(0.4/1.4) = 366 K for air (closed form, k = 1.4 from memory): an
    # outlet at 350 K means an efficiency above 1
    outlet = AIR.state(P=10e5, T=350.0)
    iso = AIR.state(P=10e5, s=inlet.s)
    b = balance.steady_flow("compressor", inlet, outlet, iso, mass_flow=1.0)
    assert b.refusal == balance.EFFICIENCY_ABOVE_ONE
    error = balance.refusal_error(b.refusal, "compressor", inlet, 10e5, outlet=outlet, result=b)
    assert isinstance(error, wb.ReadingsError)
    assert f"{b.isentropic_efficiency:.4f}" in str(error) and "above 1" in str(error)
    assert balance.refusal_error(balance.OK, "compressor", inlet, 10e5) is None


def test_temperature_sensitivity_closed_form():
    # Perfect gas, constant cp: |d eta / d T2| = eta / (T2 - T1), i.e. eta cp / dh
    assert balance.temperature_sensitivity(0.8, 1000.0, 50_000.0) == pytest.approx(0.016)
    assert math.isnan(balance.temperature_sensitivity(0.8, math.nan, 50_000.0))
    assert math.isnan(balance.temperature_sensitivity(0.8, 1000.0, 0.0))


def test_velocities_need_stagnation_states():
    inlet, outlet = AIR.state(P=1e5, T=300.0), AIR.state(P=2e5, T=385.0)
    iso = AIR.state(P=2e5, s=inlet.s)
    with pytest.raises(wb.SpecificationError, match="stagnation"):
        balance.steady_flow("compressor", inlet, outlet, iso, mass_flow=1.0, velocity_out=50.0)
