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
    with pytest.raises(InputError, match="heat exchanger heat loss -5 W is outside the allowed range at least 0"):
        heat_exchanger(hot, 5.0, cold, 8.0, duty=1e5, heat_loss=-5.0)


def test_zero_terminal_difference_is_refused_by_name():
    # A zero terminal temperature difference needs an infinite area: LMTD -> 0 and
    # UA -> infinity (limit of the LMTD closed form, TEMA); the workbench refuses it with a
    # message naming the difference instead of returning NaN or infinity.
    from workbench.machines.heat_exchanger import _terminal_differences

    hot_in, cold_in = WATER.state_PT(5e5, 363.15), WATER.state_PT(4e5, 293.15)
    hot_out, cold_out = WATER.state_PT(5e5, 293.15), WATER.state_PT(4e5, 333.15)
    with pytest.raises(SpecificationError, match="cold end temperature difference is 0 K"):
        _terminal_differences(hot_in, hot_out, cold_in, cold_out)
    # Through the public API the outlet temperature at the other stream's inlet temperature
    # is refused with the allowed (open) range.
    with pytest.raises(InputError, match=r"hot outlet temperature 293.15 K must lie in \(293.15"):
        heat_exchanger(hot_in, 5.0, cold_in, 8.0, hot_outlet_temperature=293.15)
    with pytest.raises(InputError, match=r"cold outlet temperature 363.15 K must lie in"):
        heat_exchanger(hot_in, 5.0, cold_in, 8.0, cold_outlet_temperature=363.15)
    gas = AIR.state_PT(3e5, 420.0)
    with pytest.raises(InputError, match="cooling water inlet temperature 308.15 K must be "
                                         "below the cooler outlet temperature 308.15 K"):
        cooler(gas, 2.0, 308.15, cooling_water_inlet_temperature=308.15,
               cooling_water_outlet_temperature=318.15)
    with pytest.raises(InputError, match="cooling water outlet temperature 420 K must be "
                                         "below the cooler inlet temperature 420 K"):
        cooler(gas, 2.0, 308.15, cooling_water_inlet_temperature=298.15,
               cooling_water_outlet_temperature=420.0)


def test_lmtd_near_equal_differences_is_the_closed_form_limit():
    # LMTD = (dt1 - dt2) / ln(dt1/dt2), written with log1p to stay accurate when the two
    # differences are nearly equal (closed form); its limit for equal differences is dT.
    from workbench.machines.heat_exchanger import _lmtd

    for e in (1e-12, 1e-9, 1e-7, 2e-6, 1e-3):
        dt2 = 10.0
        dt1 = dt2 * (1 + e)
        exact = (dt1 - dt2) / dt2  # dt1 - dt2 is exact in floating point (Sterbenz)
        assert _lmtd(dt1, dt2) == pytest.approx((dt1 - dt2) / math.log1p(exact), rel=1e-12)
        assert _lmtd(dt2, dt1) == pytest.approx(_lmtd(dt1, dt2), rel=1e-12)
    assert _lmtd(10.0, 10.0) == 10.0


def test_condensing_stream_carries_a_caution_and_finite_numbers():
    # Steam condensing on the hot side changes phase inside the exchanger: the terminal
    # LMTD does not describe the heat transfer (common practice: zone the exchanger), so the
    # result says so; every number is finite.
    steam = WATER.state(P=1e5, x=1.0)
    cold = WATER.state_PT(3e5, 293.15)
    result = heat_exchanger(steam, 0.5, cold, 20.0, hot_outlet_temperature=360.0)
    assert any("hot stream changes phase" in c for c in result.cautions)
    # Duty = m (h_g(1 bar) - h(1 bar, 360 K)), IAPWS-IF97 via iapws; IAPWS-95 agrees to
    # well under 0.1 % (from memory).
    duty = 0.5 * (IAPWS97(P=0.1, x=1).h - IAPWS97(P=0.1, T=360.0).h) * 1e3
    assert result.duty == pytest.approx(duty, rel=1e-3)
    values = result.to_dict()
    assert math.isfinite(values["conductance"]) and values["conductance"] > 0
    sensible = heat_exchanger(WATER.state_PT(5e5, 363.15), 5.0, cold, 8.0, duty=1e5)
    assert sensible.cautions == ()


def test_result_keys_are_fields():
    # Result keys come from the one table of result fields (workbench.fields.FIELDS), with a
    # hot_/cold_/cooling_water_ stream prefix where a device has several streams.
    from workbench.fields import FIELDS
    from workbench.machines.checks import TEXT_KEYS, field_key

    hot, cold = WATER.state_PT(5e5, 363.15), WATER.state_PT(4e5, 293.15)
    hx = heat_exchanger(hot, 5.0, cold, 8.0, duty=1e5).to_dict()
    cool = cooler(AIR.state_PT(3e5, 420.0), 2.0, 308.15,
                  cooling_water_inlet_temperature=298.15,
                  cooling_water_outlet_temperature=308.15).to_dict()
    for d in (hx, cool):
        for key in d:
            assert key in TEXT_KEYS or field_key(key) in FIELDS
    assert hx["hot_inlet_temperature"] == 363.15
    assert cool["cooling_water_outlet_temperature"] == pytest.approx(308.15)
    assert math.isnan(cool["outlet_quality"])  # single-phase: quality not defined


@pytest.mark.parametrize("value, message", [
    (Q_(5.0, "bar"), "hot mass flow was given in bar"),
    (True, "hot mass flow must be a number"),
    (10 ** 400, "hot mass flow .* is too large"),
    (1e-300, "hot mass flow .* is too small"),
    ([5.0], "hot mass flow must be a single number"),
])
def test_bad_flows_are_refused_by_name(value, message):
    hot, cold = WATER.state_PT(5e5, 363.15), WATER.state_PT(4e5, 293.15)
    with pytest.raises(InputError, match=message):
        heat_exchanger(hot, value, cold, 8.0, duty=1e5)


def test_decimal_and_numpy_inputs_are_accepted():
    # Decimal and numpy scalars are numbers (project input boundary): same result as floats.
    from decimal import Decimal

    import numpy as np

    hot, cold = WATER.state_PT(5e5, 363.15), WATER.state_PT(4e5, 293.15)
    a = heat_exchanger(hot, 5.0, cold, 8.0, duty=1e5)
    b = heat_exchanger(hot, Decimal("5.0"), cold, np.float32(8.0), duty=np.int64(100000))
    assert b.cold_outlet.T == pytest.approx(a.cold_outlet.T, rel=1e-12)
