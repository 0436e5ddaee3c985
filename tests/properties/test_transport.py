"""Viscosity and speed of sound.

References
----------
* IAPWS 2008 viscosity release and IAPWS-95 through the independent `iapws` package.
* Ideal-gas speed of sound sqrt(gamma R T) at low pressure (closed form).
"""

import math

import iapws
import pytest

import workbench as wb
from workbench.errors import PropertyError


def test_viscosity_of_water(water):
    # Reference: IAPWS 2008 viscosity release via iapws.IAPWS95 (mu in Pa s).
    st = water.state(P=1e5, T=293.15)
    assert water.viscosity(st) == pytest.approx(iapws.IAPWS95(T=293.15, P=0.1).mu, rel=1e-4)


def test_speed_of_sound_of_water_and_argon(water):
    # Reference: IAPWS-95 via iapws.IAPWS95 (w in m/s); argon at 1 kPa as a perfect gas,
    # gamma = 5/3, M = 39.948 g/mol (from memory, CIAAW), closed form sqrt(gamma R T / M).
    st = water.state(P=1e6, T=400.0)
    assert water.speed_of_sound(st) == pytest.approx(iapws.IAPWS95(T=400.0, P=1.0).w, rel=1e-6)
    argon = wb.Fluid("Argon")
    gas = argon.state(P=1e3, T=300.0)
    ideal = math.sqrt(5.0 / 3.0 * 8.314462618 * 300.0 / 39.948e-3)
    assert argon.speed_of_sound(gas) == pytest.approx(ideal, rel=1e-4)


def test_two_phase_transport(water_if97):
    # Common practice: a mixture of two phases has no single viscosity or speed of sound here.
    wet = water_if97.state(P=1e5, x=0.5)
    with pytest.raises(PropertyError, match="two-phase"):
        water_if97.viscosity(wet)
    assert math.isnan(water_if97.speed_of_sound(wet))
