"""Throttle valve: isenthalpic expansion, Joule-Thomson cooling, flashing steam."""

import math

import pytest
from iapws import IAPWS97

from workbench.errors import InputError, WorkbenchError
from workbench.machines.throttle import throttle
from workbench.properties import Fluid
from workbench.units import Q_

STEAM = Fluid("Water", backend="IF97")
AIR = Fluid("Air")


def test_enthalpy_is_constant_and_air_cools():
    # Throttling is isenthalpic (common practice).
    inlet = AIR.state_PT(10e5, 300.0)
    result = throttle(inlet, 2.0, P_out=1e5)
    assert result.outlet.h == pytest.approx(inlet.h, rel=1e-10)
    assert result.outlet.P == pytest.approx(1e5)
    # Air near room temperature has a Joule-Thomson coefficient of roughly 0.2 K/bar
    # (from memory), so 9 bar of throttling cools it by about 2 K.
    assert 0.1e-5 < result.mean_joule_thomson_coefficient < 0.3e-5
    assert result.temperature_change < 0
    assert result.to_dict()["mass_flow"] == 2.0


@pytest.mark.parametrize("quality", [0.0, 0.5])
def test_flashing_steam_quality_matches_if97(quality):
    # Wet or saturated-liquid steam at 50 bar throttled to 1 bar; reference: IAPWS-IF97
    # through the iapws package at the same enthalpy.
    inlet = STEAM.state(P=50e5, x=quality)
    result = throttle(inlet, 1.0, P_out=1e5)
    reference = IAPWS97(P=0.1, h=inlet.h / 1e3)
    assert result.outlet_quality == pytest.approx(reference.x, abs=1e-6)
    assert result.outlet.T == pytest.approx(reference.T, abs=1e-4)
    assert result.flashes is (quality == 0.0)


def test_saturated_vapour_ends_superheated_as_if97_says():
    # Saturated vapour at 50 bar throttled to 1 bar leaves superheated (IAPWS-IF97 via iapws
    # gives x = 1 and the temperature at 1 bar and the inlet enthalpy).
    inlet = STEAM.state(P=50e5, x=1.0)
    result = throttle(inlet, 1.0, P_out=1e5)
    reference = IAPWS97(P=0.1, h=inlet.h / 1e3)
    assert reference.x == 1
    assert math.isnan(result.outlet_quality)
    assert result.outlet.T == pytest.approx(reference.T, abs=1e-3)
    assert result.outlet.T > STEAM.saturation_temperature(1e5)


def test_heos_steam_agrees_with_if97():
    # IAPWS-95 (HEOS) and IF97 agree on this flash to a few parts in 1e4 (IF97's stated
    # consistency with IAPWS-95, from memory).
    water = Fluid("Water")
    inlet = water.state(P=50e5, x=0.0)
    reference = IAPWS97(P=0.1, h=inlet.h / 1e3)
    assert throttle(inlet, 1.0, P_out=1e5).outlet_quality == pytest.approx(reference.x,
                                                                 abs=2e-3)


def test_outlet_pressure_above_inlet_is_refused():
    inlet = AIR.state_PT(2e5, 300.0)
    with pytest.raises(InputError, match="throttle outlet pressure"):
        throttle(inlet, 1.0, P_out=3e5)
    with pytest.raises(WorkbenchError, match="throttle mass flow"):
        throttle(inlet, -1.0, P_out=1e5)


def test_perfect_gas_entropy_generation():
    # Throttling a perfect gas keeps T (h depends on T only) and generates
    # m R ln(P1/P2) of entropy (closed form).  Argon: R = 8.314462618 J/(mol K) (CODATA
    # 2018) over 39.948 g/mol (IUPAC); at 1 bar and 300 K it is a perfect gas to about
    # 0.1 % (from memory), and its small Joule-Thomson cooling (a few tenths of a kelvin per
    # bar, from memory) moves the entropy by well under that.
    r_argon = 8.314462618 / 0.039948
    inlet = Fluid("Argon").state_PT(1e5, 300.0)
    result = throttle(inlet, 2.0, P_out=0.5e5)
    expected = 2.0 * r_argon * math.log(2.0)
    assert result.to_dict()["entropy_generation"] == pytest.approx(expected, rel=2e-3)
    assert abs(result.temperature_change) < 0.5
    assert result.pressure_drop == pytest.approx(0.5e5, rel=1e-12)


def test_flashing_and_warming_carry_cautions():
    # Saturated liquid throttled flashes (common practice); hydrogen at room temperature is
    # above its Joule-Thomson inversion temperature (about 200 K, from memory) and warms.
    flashing = throttle(STEAM.state(P=50e5, x=0.0), 1.0, P_out=1e5)
    assert flashing.flashes and "flashes" in flashing.cautions[0]
    assert flashing.outlet_quality == flashing.outlet.quality  # one source: State.quality
    warming = throttle(Fluid("Hydrogen").state_PT(100e5, 300.0), 1.0, P_out=1e5)
    assert warming.temperature_change > 0
    assert "inversion temperature" in warming.cautions[0]
    assert throttle(AIR.state_PT(10e5, 300.0), 1.0, P_out=1e5).cautions == ()


def test_keys_are_fields_and_quality_is_nan_when_single_phase():
    # Result keys come from workbench.fields.FIELDS (the one table of result fields).
    from workbench.fields import FIELDS

    d = throttle(AIR.state_PT(10e5, 300.0), 2.0, P_out=1e5).to_dict()
    assert all(key in FIELDS for key in d if key not in ("device", "fluid"))
    assert math.isnan(d["outlet_quality"]) and math.isnan(d["inlet_quality"])


@pytest.mark.parametrize("kwargs, message", [
    (dict(P_out=Q_(1.0, "m")), "throttle outlet pressure was given in m"),
    (dict(P_out=float("inf")), "throttle outlet pressure must be a finite number"),
    (dict(P_out=[1e5]), "throttle outlet pressure must be a single number"),
    (dict(mass_flow=False), "throttle mass flow must be a number"),
    (dict(mass_flow=0), "throttle mass flow 0 kg/s is outside the allowed range above 0"),
])
def test_bad_values_are_refused_by_name(kwargs, message):
    args = dict(mass_flow=1.0, P_out=1e5)
    args.update(kwargs)
    with pytest.raises(InputError, match=message):
        throttle(AIR.state_PT(10e5, 300.0), args["mass_flow"], P_out=args["P_out"])
    with pytest.raises(InputError, match="throttle inlet must be a State"):
        throttle("air", 1.0, P_out=1e5)


def test_quantities_and_decimal_give_the_same_result():
    # pint Quantities and Decimal are converted at the input boundary (NIST SP 811: 1 bar =
    # 1e5 Pa, 1 t/h = 1/3.6 kg/s).
    from decimal import Decimal

    inlet = AIR.state_PT(10e5, 300.0)
    a = throttle(inlet, 2.0, P_out=1e5)
    b = throttle(inlet, Q_(7.2, "t/h"), P_out=Q_(Decimal("1"), "bar"))
    assert b.outlet.T == pytest.approx(a.outlet.T, rel=1e-12)
    assert b.mass_flow == pytest.approx(2.0, rel=1e-12)


def test_device_signatures_are_consistent():
    # Project API rule (issue 9): every single-inlet device takes the inlet state and a
    # required mass flow first (positional or keyword), and its outlet pressure keyword-only.
    import inspect

    import workbench as wb

    for device in (wb.throttle, wb.nozzle, wb.diffuser, wb.splitter, wb.cooler,
                   wb.pipe_segment):
        params = list(inspect.signature(device).parameters.values())
        assert params[1].name == "mass_flow", device.__name__
        assert params[1].default is inspect.Parameter.empty, device.__name__
        assert params[1].kind is inspect.Parameter.POSITIONAL_OR_KEYWORD, device.__name__
    for device in (wb.throttle, wb.nozzle, wb.mixer):
        P_out = inspect.signature(device).parameters["P_out"]
        assert P_out.kind is inspect.Parameter.KEYWORD_ONLY, device.__name__
    hx = inspect.signature(wb.heat_exchanger).parameters
    assert hx["hot_mass_flow"].default is inspect.Parameter.empty
    assert hx["cold_mass_flow"].default is inspect.Parameter.empty
    # keyword use reads like the machines': throttle(inlet, mass_flow=..., P_out=...)
    inlet = AIR.state_PT(10e5, 300.0)
    assert throttle(inlet, mass_flow=2.0, P_out=1e5).mass_flow == 2.0
