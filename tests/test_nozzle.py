"""Nozzles and diffusers: energy balance, continuity, ideal-gas closed forms."""

import math

import pytest
from iapws import IAPWS97

from workbench.errors import InputError, SpecificationError
from workbench.machines.nozzle import diffuser, nozzle, velocity_from_area
from workbench.properties import Fluid
from workbench.units import Q_

STEAM = Fluid("Water", backend="IF97")
AIR = Fluid("Air")


def test_exit_velocity_from_rest_matches_if97_enthalpy_drop():
    # V2 = sqrt(2 (h1 - h2s)) from rest (steady-flow energy equation, common practice), with
    # the isentropic enthalpy drop from IAPWS-IF97 through the iapws package.
    inlet = STEAM.state_PT(10e5, 573.15)
    result = nozzle(inlet, 1.0, P_out=5e5)
    one = IAPWS97(P=1.0, T=573.15)
    two = IAPWS97(P=0.5, s=one.s)
    expected = math.sqrt(2.0 * (one.h - two.h) * 1e3)
    assert result.velocity_out == pytest.approx(expected, rel=1e-6)
    assert result.stagnation_enthalpy == pytest.approx(result.outlet.h
                                                       + result.velocity_out ** 2 / 2, rel=1e-12)


def test_velocity_coefficient_is_root_of_efficiency():
    # phi = V2 / V2s, eta = phi^2 (definition, common practice).
    inlet = STEAM.state_PT(10e5, 573.15)
    ideal = nozzle(inlet, 1.0, P_out=5e5)
    by_phi = nozzle(inlet, 1.0, P_out=5e5, velocity_coefficient=0.95)
    by_eta = nozzle(inlet, 1.0, P_out=5e5, isentropic_efficiency=0.95 ** 2)
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
    result = nozzle(inlet, 1.0, P_out=2e5 * ratio)
    assert result.outlet_mach_number == pytest.approx(1.0, rel=0.01)
    # Exit temperature T2 = T0 * 2/(k+1) (same closed form).
    assert result.outlet.T == pytest.approx(300.0 * 2 / (k + 1), rel=0.005)


def test_area_ratio_from_continuity():
    # Continuity: A = m / (rho V) at each end (common practice).
    inlet = AIR.state_PT(3e5, 400.0)
    result = nozzle(inlet, 2.0, P_out=2e5, velocity_in=50.0)
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
    result = diffuser(inlet, 1.0, velocity_in=velocity)
    assert result.outlet.P == pytest.approx(expected, rel=2e-3)
    assert result.outlet.h == pytest.approx(inlet.h + velocity ** 2 / 2, rel=1e-12)
    lossy = diffuser(inlet, 1.0, velocity_in=Q_(200.0, "m/s"), isentropic_efficiency=0.8)
    assert 1e5 < lossy.outlet.P < result.outlet.P


def test_bad_nozzle_inputs():
    inlet = AIR.state_PT(2e5, 300.0)
    with pytest.raises(InputError, match="nozzle outlet pressure"):
        nozzle(inlet, 1.0, P_out=3e5)
    with pytest.raises(SpecificationError, match="velocity coefficient"):
        nozzle(inlet, 1.0, P_out=1e5, isentropic_efficiency=0.9, velocity_coefficient=0.9)
    with pytest.raises(InputError, match="nozzle isentropic efficiency"):
        nozzle(inlet, 1.0, P_out=1e5, isentropic_efficiency=1.2)
    with pytest.raises(InputError, match="diffuser outlet velocity"):
        diffuser(inlet, 1.0, velocity_in=100.0, velocity_out=150.0)


#: Specific gas constant of argon [J/(kg K)]: molar gas constant 8.314462618 J/(mol K)
#: (CODATA 2018) over the molar mass 39.948 g/mol (IUPAC standard atomic weight).
R_ARGON = 8.314462618 / 0.039948
#: Monatomic perfect gas: cp = 5/2 R, k = 5/3 (kinetic theory, closed form).
CP_ARGON, K_ARGON = 2.5 * R_ARGON, 5.0 / 3.0
ARGON = Fluid("Argon")


def test_nozzle_with_inlet_velocity_perfect_gas():
    # Isentropic expansion of a perfect gas: T2s = T1 (P2/P1)^((k-1)/k) and, with the
    # stagnation enthalpy conserved, V2^2 = V1^2 + 2 cp (T1 - T2s) (closed forms).  With the
    # nozzle efficiency eta = (h01 - h2)/(h01 - h2s) of the module notes, V2^2 is eta times
    # that.  Argon at 1 bar and 300 K is a perfect gas to about 0.1 % (Z near 0.9994, from
    # memory), so 1e-3.
    inlet = ARGON.state_PT(1e5, 300.0)
    t2s = 300.0 * 0.6 ** ((K_ARGON - 1) / K_ARGON)
    ideal = math.sqrt(100.0 ** 2 + 2 * CP_ARGON * (300.0 - t2s))
    result = nozzle(inlet, 1.0, P_out=0.6e5, velocity_in=100.0)
    assert result.velocity_out == pytest.approx(ideal, rel=1e-3)
    assert result.isentropic_outlet.T == pytest.approx(t2s, rel=1e-3)
    lossy = nozzle(inlet, 1.0, P_out=0.6e5, velocity_in=Q_(100.0, "m/s"),
                   isentropic_efficiency=0.9)
    assert lossy.velocity_out == pytest.approx(math.sqrt(0.9) * ideal, rel=1e-3)
    with pytest.raises(InputError, match="nozzle inlet velocity -1 m/s is outside the allowed range at least 0"):
        nozzle(inlet, 1.0, P_out=0.6e5, velocity_in=-1.0)


def test_diffuser_to_a_finite_velocity_perfect_gas():
    # h2 = h1 + (V1^2 - V2^2)/2, so T2 = T1 + (V1^2 - V2^2)/(2 cp); the efficiency
    # eta = (h2s - h1)/(h2 - h1) gives T2s = T1 + eta (T2 - T1) and P2 = P1 (T2s/T1)^(k/(k-1))
    # (perfect-gas closed forms, argon as above).  Continuity: A2/A1 = rho1 V1 / (rho2 V2).
    inlet = ARGON.state_PT(1e5, 300.0)
    t2 = 300.0 + (250.0 ** 2 - 50.0 ** 2) / (2 * CP_ARGON)
    t2s = 300.0 + 0.85 * (t2 - 300.0)
    result = diffuser(inlet, 1.0, velocity_in=250.0, velocity_out=50.0,
                      isentropic_efficiency=0.85)
    p2 = 1e5 * (t2s / 300.0) ** (K_ARGON / (K_ARGON - 1))
    assert result.outlet.T == pytest.approx(t2, rel=1e-4)
    assert result.outlet.P == pytest.approx(p2, rel=1e-3)
    # Perfect-gas densities rho = P / (R T) at both ends.
    rho1, rho2 = 1e5 / (R_ARGON * 300.0), p2 / (R_ARGON * t2)
    assert result.area_ratio == pytest.approx(rho1 * 250.0 / (rho2 * 50.0), rel=2e-3)


def test_supersonic_outlet_carries_a_caution_and_areas_are_nan_at_rest():
    # Air expanded from 10 bar to 1 bar reaches Mach ~2 (isentropic-flow closed form,
    # M = sqrt(2/(k-1) ((P0/P)^((k-1)/k) - 1)) = 2.16 for k = 1.4): a convergent nozzle
    # chokes at Mach 1 (common practice), so the result says so.
    k = 1.4
    mach = math.sqrt(2 / (k - 1) * (10.0 ** ((k - 1) / k) - 1))
    result = nozzle(AIR.state_PT(10e5, 400.0), 1.0, P_out=1e5)
    assert result.outlet_mach_number == pytest.approx(mach, rel=0.02)
    assert any("convergent-divergent" in c for c in result.cautions)
    # From rest the inlet flow area and the area ratio are not defined: NaN, never inf.
    assert math.isnan(result.inlet_area) and math.isnan(result.area_ratio)
    assert math.isfinite(result.outlet_area)
    subsonic = nozzle(AIR.state_PT(2e5, 300.0), 1.0, P_out=1.5e5)
    assert subsonic.cautions == ()


def test_wet_steam_nozzle_and_field_keys():
    # A nozzle expanding saturated steam ends wet (IAPWS-IF97 via iapws: x < 1 at the inlet
    # entropy); the Mach number is not defined there (NaN) and a caution says so.
    from workbench.fields import FIELDS

    inlet = STEAM.state(P=5e5, x=1.0)
    result = nozzle(inlet, 1.0, P_out=1e5)
    assert IAPWS97(P=0.1, s=IAPWS97(P=0.5, x=1).s).x < 1
    assert result.outlet.two_phase and math.isnan(result.outlet_mach_number)
    assert any("wet" in c for c in result.cautions)
    d = result.to_dict()
    assert all(key in FIELDS for key in d if key not in ("device", "fluid"))
    assert d["outlet_quality"] == result.outlet.quality


def test_bad_passage_inputs_are_refused_by_name():
    inlet = AIR.state_PT(2e5, 300.0)
    with pytest.raises(InputError, match="nozzle mass flow was given in m/s"):
        nozzle(inlet, Q_(1.0, "m/s"), P_out=1e5)
    with pytest.raises(InputError, match="diffuser inlet velocity must be a number"):
        diffuser(inlet, 1.0, velocity_in="fast")
    with pytest.raises(InputError, match="diffuser isentropic efficiency"):
        diffuser(inlet, 1.0, velocity_in=100.0, isentropic_efficiency=0.0)
    with pytest.raises(SpecificationError, match="not both"):
        nozzle(inlet, 1.0, P_out=1e5, velocity_coefficient=0.9, isentropic_efficiency=0.8)
