"""Nozzles and diffusers: energy balance, continuity, ideal-gas closed forms."""

import math

import pytest
from iapws import IAPWS97

from workbench.errors import InputError, SpecificationError
from workbench.fluids import Fluid
from workbench.machines.nozzle import diffuser, nozzle, velocity_from_area
from workbench.units import Q_

STEAM = Fluid("Water", backend="IF97")
AIR = Fluid("Air")


def test_exit_velocity_from_rest_matches_if97_enthalpy_drop():
    # V2 = sqrt(2 (h1 - h2s)) from rest (steady-flow energy equation, common practice), with
    # the isentropic enthalpy drop from IAPWS-IF97 through the iapws package.
    inlet = STEAM.state_PT(10e5, 573.15)
    result = nozzle(inlet, 5e5)
    one = IAPWS97(P=1.0, T=573.15)
    two = IAPWS97(P=0.5, s=one.s)
    expected = math.sqrt(2.0 * (one.h - two.h) * 1e3)
    assert result.velocity_out == pytest.approx(expected, rel=1e-6)
    assert result.stagnation_enthalpy == pytest.approx(result.outlet.h
                                                       + result.velocity_out ** 2 / 2, rel=1e-12)


def test_velocity_coefficient_is_root_of_efficiency():
    # phi = V2 / V2s, eta = phi^2 (definition, common practice).
    inlet = STEAM.state_PT(10e5, 573.15)
    ideal = nozzle(inlet, 5e5)
    by_phi = nozzle(inlet, 5e5, velocity_coefficient=0.95)
    by_eta = nozzle(inlet, 5e5, isentropic_efficiency=0.95 ** 2)
    assert by_phi.velocity_out == pytest.approx(0.95 * ideal.velocity_out, rel=1e-9)
    assert by_eta.velocity_out == pytest.approx(by_phi.velocity_out, rel=1e-12)
    assert by_phi.outlet.s > inlet.s


def test_critical_pressure_ratio_gives_sonic_exit():
    # Ideal gas, k = 1.4: the exit is sonic at P2/P0 = (2/(k+1))^(k/(k-1)) = 0.5283
    # (isentropic-flow closed form).  Air at 2 bar and 300 K is close to ideal; k drifts a
    # little as the air cools, so 1 % on the Mach number.
    k = 1.4
    ratio = (2 / (k + 1)) ** (k / (k - 1))
    inlet = AIR.state_PT(2e5, 300.0)
    result = nozzle(inlet, 2e5 * ratio, mass_flow=1.0)
    assert result.outlet_mach_number == pytest.approx(1.0, rel=0.01)
    # Exit temperature T2 = T0 * 2/(k+1) (same closed form).
    assert result.outlet.T == pytest.approx(300.0 * 2 / (k + 1), rel=0.005)


def test_area_ratio_from_continuity():
    # Continuity: A = m / (rho V) at each end (common practice).
    inlet = AIR.state_PT(3e5, 400.0)
    result = nozzle(inlet, 2e5, velocity_in=50.0, mass_flow=2.0)
    a1 = 2.0 / (inlet.rho * 50.0)
    a2 = 2.0 / (result.outlet.rho * result.velocity_out)
    assert result.area_ratio == pytest.approx(a2 / a1, rel=1e-12)
    assert result.area_ratio < 1  # subsonic nozzle converges
    assert velocity_from_area(2.0, inlet.rho, a1) == pytest.approx(50.0)


def test_diffuser_stagnation_pressure_ideal_gas():
    # Full isentropic diffusion to rest reaches the stagnation pressure,
    # P0/P = (1 + (k-1)/2 M^2)^(k/(k-1)), ideal gas k = 1.4 (closed form); 0.2 % for the
    # small real-gas and cp(T) effects of air near 300 K.
    inlet = AIR.state_PT(1e5, 300.0)
    velocity = 200.0
    a = math.sqrt(1.4 * AIR.gas_constant * 300.0)
    mach = velocity / a
    expected = 1e5 * (1 + 0.2 * mach ** 2) ** 3.5
    result = diffuser(inlet, velocity)
    assert result.outlet.P == pytest.approx(expected, rel=2e-3)
    assert result.outlet.h == pytest.approx(inlet.h + velocity ** 2 / 2, rel=1e-12)
    lossy = diffuser(inlet, Q_(200.0, "m/s"), isentropic_efficiency=0.8)
    assert 1e5 < lossy.outlet.P < result.outlet.P


def test_bad_nozzle_inputs():
    inlet = AIR.state_PT(2e5, 300.0)
    with pytest.raises(InputError, match="nozzle outlet pressure"):
        nozzle(inlet, 3e5)
    with pytest.raises(SpecificationError, match="velocity coefficient"):
        nozzle(inlet, 1e5, isentropic_efficiency=0.9, velocity_coefficient=0.9)
    with pytest.raises(InputError, match="nozzle isentropic efficiency"):
        nozzle(inlet, 1e5, isentropic_efficiency=1.2)
    with pytest.raises(InputError, match="diffuser outlet velocity"):
        diffuser(inlet, 100.0, velocity_out=150.0)
