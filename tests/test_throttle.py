"""Throttle valve: isenthalpic expansion, Joule-Thomson cooling, flashing steam."""

import math

import pytest
from iapws import IAPWS97

from workbench.errors import InputError, WorkbenchError
from workbench.machines.throttle import throttle
from workbench.properties import Fluid

STEAM = Fluid("Water", backend="IF97")
AIR = Fluid("Air")


def test_enthalpy_is_constant_and_air_cools():
    # Throttling is isenthalpic (common practice).
    inlet = AIR.state_PT(10e5, 300.0)
    result = throttle(inlet, 1e5, mass_flow=2.0)
    assert result.outlet.h == pytest.approx(inlet.h, rel=1e-10)
    assert result.outlet.P == pytest.approx(1e5)
    # Air near room temperature has a Joule-Thomson coefficient of roughly 0.2 K/bar
    # (from memory), so 9 bar of throttling cools it by about 2 K.
    assert 0.1e-5 < result.mean_joule_thomson_coefficient < 0.3e-5
    assert result.temperature_change < 0
    assert result.to_dict()["mass_flow_kg_per_s"] == 2.0


@pytest.mark.parametrize("quality", [0.0, 0.5])
def test_flashing_steam_quality_matches_if97(quality):
    # Wet or saturated-liquid steam at 50 bar throttled to 1 bar; reference: IAPWS-IF97
    # through the iapws package at the same enthalpy.
    inlet = STEAM.state(P=50e5, x=quality)
    result = throttle(inlet, 1e5)
    reference = IAPWS97(P=0.1, h=inlet.h / 1e3)
    assert result.outlet_quality == pytest.approx(reference.x, abs=1e-6)
    assert result.outlet.T == pytest.approx(reference.T, abs=1e-4)
    assert result.flashes is (quality == 0.0)


def test_saturated_vapour_ends_superheated_as_if97_says():
    # Saturated vapour at 50 bar throttled to 1 bar leaves superheated (IAPWS-IF97 via iapws
    # gives x = 1 and the temperature at 1 bar and the inlet enthalpy).
    inlet = STEAM.state(P=50e5, x=1.0)
    result = throttle(inlet, 1e5)
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
    assert throttle(inlet, 1e5).outlet_quality == pytest.approx(reference.x, abs=2e-3)


def test_outlet_pressure_above_inlet_is_refused():
    inlet = AIR.state_PT(2e5, 300.0)
    with pytest.raises(InputError, match="throttle outlet pressure"):
        throttle(inlet, 3e5)
    with pytest.raises(WorkbenchError, match="throttle mass flow"):
        throttle(inlet, 1e5, mass_flow=-1.0)


def test_perfect_gas_entropy_generation():
    # Throttling a perfect gas keeps T (h depends on T only) and generates
    # m R ln(P1/P2) of entropy (closed form).  Argon: R = 8.314462618 J/(mol K) (CODATA
    # 2018) over 39.948 g/mol (IUPAC); at 1 bar and 300 K it is a perfect gas to about
    # 0.1 % (from memory), and its small Joule-Thomson cooling (a few tenths of a kelvin per
    # bar, from memory) moves the entropy by well under that.
    r_argon = 8.314462618 / 0.039948
    inlet = Fluid("Argon").state_PT(1e5, 300.0)
    result = throttle(inlet, 0.5e5, mass_flow=2.0)
    expected = 2.0 * r_argon * math.log(2.0)
    assert result.to_dict()["entropy_generation_W_per_K"] == pytest.approx(expected, rel=2e-3)
    assert abs(result.temperature_change) < 0.5
    assert result.pressure_drop == pytest.approx(0.5e5, rel=1e-12)
