"""Heat exchangers and coolers: duty balance, pressure drops, second-law terminal checks."""

import math

import pytest
from iapws import IAPWS97

from workbench.errors import InputError, SpecificationError
from workbench.machines.heat_exchanger import cooler, heat_exchanger
from workbench.properties import Fluid
from workbench.units import Q_

WATER = Fluid("Water")
AIR = Fluid("Air")


@pytest.mark.parametrize("given", ["hot_outlet_temperature", "cold_outlet_temperature", "duty"])
def test_duty_balance_closes(given):
    # Heat lost by the hot stream equals heat gained by the cold one (common practice).
    hot, cold = WATER.state_PT(5e5, 363.15), WATER.state_PT(4e5, 293.15)
    spec = {"hot_outlet_temperature": 323.15, "cold_outlet_temperature": 313.15,
            "duty": 5.0e5}[given]
    result = heat_exchanger(hot, 5.0, cold, 8.0, **{given: spec},
                            hot_pressure_drop=0.3e5, cold_pressure_drop=Q_(0.2, "bar"))
    released = 5.0 * (hot.h - result.hot_outlet.h)
    absorbed = 8.0 * (result.cold_outlet.h - cold.h)
    assert released == pytest.approx(absorbed, rel=1e-9)
    assert result.duty == pytest.approx(absorbed, rel=1e-9)
    assert result.hot_outlet.P == pytest.approx(4.7e5, rel=1e-7)
    assert result.cold_outlet.P == pytest.approx(3.8e5, rel=1e-7)
    assert result.entropy_generation > 0  # second law


def test_heat_loss_comes_out_of_the_hot_stream():
    # m_hot (h_in - h_out) = duty + heat_loss, heat lost positive (project convention).
    hot, cold = WATER.state_PT(5e5, 363.15), WATER.state_PT(4e5, 293.15)
    result = heat_exchanger(hot, 5.0, cold, 8.0, duty=4.0e5, heat_loss=1.0e4)
    assert result.heat_released == pytest.approx(4.1e5, rel=1e-9)
    assert result.heat_absorbed == pytest.approx(4.0e5, rel=1e-9)


def test_log_mean_temperature_difference_closed_form():
    # LMTD = (dT1 - dT2) / ln(dT1/dT2) for counterflow (closed form).
    hot, cold = WATER.state_PT(5e5, 363.15), WATER.state_PT(4e5, 293.15)
    r = heat_exchanger(hot, 5.0, cold, 8.0, hot_outlet_temperature=323.15)
    d1, d2 = 363.15 - r.cold_outlet.T, 323.15 - 293.15
    assert r.log_mean_temperature_difference == pytest.approx((d1 - d2) / math.log(d1 / d2))


def test_intercooler_water_flow_matches_if97():
    # Cooling water flow = duty / (h_w,out - h_w,in); water enthalpies from IAPWS-IF97 via the
    # iapws package.  The workbench's water is IAPWS-95; the two agree to well under 0.1 %
    # in enthalpy differences of liquid water (from memory).
    gas = AIR.state_PT(3e5, 420.0)
    result = cooler(gas, 2.0, 308.15, pressure_drop=0.1e5,
                    cooling_water_inlet_temperature=Q_(25.0, "degC"),
                    cooling_water_outlet_temperature=Q_(35.0, "degC"))
    dh = (IAPWS97(P=0.3, T=308.15).h - IAPWS97(P=0.3, T=298.15).h) * 1e3
    assert result.cooling_water_mass_flow == pytest.approx(result.duty / dh, rel=1e-3)
    assert result.exchanger.heat_released == pytest.approx(result.exchanger.heat_absorbed,
                                                           rel=1e-9)
    assert result.outlet.T == pytest.approx(308.15)
    assert result.outlet.P == pytest.approx(2.9e5)


def test_cooler_outlet_hotter_than_inlet_is_refused():
    gas = AIR.state_PT(3e5, 320.0)
    with pytest.raises(InputError, match="cooler outlet temperature") as info:
        cooler(gas, 1.0, 330.0)
    assert "330" in str(info.value) and "320" in str(info.value)


def test_exchanger_specification_errors():
    hot, cold = WATER.state_PT(5e5, 363.15), WATER.state_PT(4e5, 293.15)
    with pytest.raises(SpecificationError, match="exactly one"):
        heat_exchanger(hot, 5.0, cold, 8.0)
    with pytest.raises(InputError, match="hot outlet temperature"):
        heat_exchanger(hot, 5.0, cold, 8.0, hot_outlet_temperature=370.0)
    # A small cold flow would have to leave hotter than the hot inlet: the second law forbids.
    with pytest.raises(SpecificationError, match="temperatures cross"):
        heat_exchanger(hot, 5.0, cold, 0.5, hot_outlet_temperature=300.0)
    with pytest.raises(InputError, match="hot side pressure drop"):
        heat_exchanger(hot, 5.0, cold, 8.0, duty=1e5, hot_pressure_drop=6e5)


def test_balanced_counterflow_perfect_gas():
    # Balanced counterflow (equal m cp on both sides) keeps the temperature difference the
    # same along the exchanger, so LMTD = dT (closed-form limit), UA = duty / dT, and
    # S_gen = m cp [ln(T_h2/T_h1) + ln(T_c2/T_c1)] (perfect gas at one pressure).  Argon:
    # cp = 5/2 R, R = 8.314462618 J/(mol K) (CODATA 2018) over 39.948 g/mol (IUPAC); a
    # perfect gas at 1 bar and 300-500 K to about 0.1 % (from memory).
    cp = 2.5 * 8.314462618 / 0.039948
    argon = Fluid("Argon")
    hot, cold = argon.state_PT(1e5, 500.0), argon.state_PT(1e5, 300.0)
    result = heat_exchanger(hot, 1.0, cold, 1.0, hot_outlet_temperature=400.0)
    assert result.cold_outlet.T == pytest.approx(400.0, rel=1e-3)
    assert result.duty == pytest.approx(cp * 100.0, rel=1e-3)
    assert result.log_mean_temperature_difference == pytest.approx(100.0, rel=1e-3)
    assert result.conductance == pytest.approx(cp, rel=2e-3)
    s_gen = cp * (math.log(400.0 / 500.0) + math.log(400.0 / 300.0))
    assert result.entropy_generation == pytest.approx(s_gen, rel=5e-3)


def test_negative_heat_loss_is_refused():
    hot, cold = WATER.state_PT(5e5, 363.15), WATER.state_PT(4e5, 293.15)
    with pytest.raises(InputError, match="heat exchanger heat loss -5 W must not be negative"):
        heat_exchanger(hot, 5.0, cold, 8.0, duty=1e5, heat_loss=-5.0)
