"""Pipe segments with a liquid (Bernoulli, Darcy-Weisbach) and NPSH available."""

import math

import pytest
from iapws import IAPWS97

from workbench.errors import InputError, SpecificationError
from workbench.machines.pipe import darcy_friction_factor, npsh_available, pipe_segment
from workbench.machines.turbomachine import STANDARD_GRAVITY as G
from workbench.properties import Fluid
from workbench.units import Q_

WATER = Fluid("Water")
#: Volumetric expansion coefficient of water at 20 degC [1/K] (from memory).
BETA_20C = 2.07e-4


def _colebrook(Re, eD):
    # Colebrook (1939), solved by fixed-point iteration here, independent of `fluids`.
    f = 0.02
    for _ in range(100):
        f = (-2.0 * math.log10(eD / 3.7 + 2.51 / (Re * math.sqrt(f)))) ** -2
    return f


def test_bernoulli_rising_narrowing_pipe():
    # Frictionless, adiabatic: P2 = P1 - rho (V2^2 - V1^2)/2 - rho g dz (Bernoulli's equation,
    # closed form); density of water at 20 degC and 3 bar from IAPWS-IF97 via iapws.
    inlet = WATER.state_PT(3e5, 293.15)
    rho = IAPWS97(P=0.3, T=293.15).rho
    m, d1, d2, dz = 10.0, 0.10, 0.05, 10.0
    v1, v2 = m / (rho * math.pi * d1 ** 2 / 4), m / (rho * math.pi * d2 ** 2 / 4)
    expected = 3e5 - rho * (v2 ** 2 - v1 ** 2) / 2 - rho * G * dz
    result = pipe_segment(inlet, m, d1, outlet_diameter=d2, elevation_change=dz)
    assert result.outlet.P == pytest.approx(expected, rel=1e-5)
    assert result.velocity_out == pytest.approx(v2, rel=1e-5)
    # Energy: h2 - h1 = v (P2 - P1), and dh = cp dT + v (1 - beta T) dP, so the liquid's
    # temperature changes by v dP beta T / cp only; water's expansion coefficient at 20 degC
    # is beta = 2.07e-4 1/K (from memory).
    dT = (expected - 3e5) / rho * BETA_20C * 293.15 / inlet.cp
    assert result.outlet.T - 293.15 == pytest.approx(dT, rel=0.03)


def test_friction_factor_moody_and_colebrook():
    # Moody chart, commercial steel, Re = 1e5, e/D = 0.0002: f ~ 0.0195 (from memory, read
    # off the chart to about 3 %); the Colebrook equation itself to 0.5 % (the `fluids`
    # default is an explicit solution of Colebrook).
    f = darcy_friction_factor(1e5, 2e-4)
    assert f == pytest.approx(0.0195, rel=0.03)
    assert f == pytest.approx(_colebrook(1e5, 2e-4), rel=5e-3)
    # Laminar: f = 64/Re (Hagen-Poiseuille, closed form).
    assert darcy_friction_factor(1000.0, 1e-3) == pytest.approx(0.064, rel=1e-9)


def test_darcy_weisbach_head_loss():
    # h_f = f (L/D) V^2 / (2 g), f from Colebrook (Darcy-Weisbach, common practice).
    inlet = WATER.state_PT(5e5, 293.15)
    m, d, length, mu = 20.0, 0.15, 200.0, 1.0e-3
    result = pipe_segment(inlet, m, d, length=length, viscosity=Q_(1.0, "mPa*s"))
    v = m / (inlet.rho * math.pi * d ** 2 / 4)
    re = inlet.rho * v * d / mu
    f = _colebrook(re, 4.5e-5 / d)
    head = f * length / d * v ** 2 / (2 * G)
    assert result.reynolds_number == pytest.approx(re, rel=1e-9)
    assert result.head_loss == pytest.approx(head, rel=5e-3)
    assert result.pressure_drop == pytest.approx(inlet.rho * G * head, rel=5e-3)
    # The friction work warms the liquid at constant enthalpy: dT = g h_f (1 - beta T) / cp
    # (from dh = cp dT + v (1 - beta T) dP with h constant).
    warming = G * head * (1 - BETA_20C * 293.15) / inlet.cp
    assert result.outlet.T - inlet.T == pytest.approx(warming, rel=0.01)


def test_pump_work_raises_pressure():
    # P2 - P1 = rho w for a frictionless level pipe with pump work w (Bernoulli with work).
    inlet = WATER.state_PT(2e5, 293.15)
    result = pipe_segment(inlet, 5.0, 0.1, pump_power=5.0e3)
    assert result.outlet.P - inlet.P == pytest.approx(inlet.rho * 1.0e3, rel=1e-6)


def test_npsh_available_matches_closed_form():
    # NPSHa = (P - Pv)/(rho g) + V^2/(2 g); vapour pressure and density of water at 25 degC
    # from IAPWS-IF97 via iapws (ANSI/HI 9.6.1 definition).
    suction = WATER.state_PT(1.2e5, 298.15)
    pv = IAPWS97(T=298.15, x=0).P * 1e6
    rho = IAPWS97(P=0.12, T=298.15).rho
    expected = (1.2e5 - pv) / (rho * G) + 2.0 ** 2 / (2 * G)
    result = npsh_available(suction, velocity=2.0)
    assert result.npsh_available == pytest.approx(expected, rel=1e-4)
    assert result.vapour_pressure == pytest.approx(pv, rel=1e-4)


def test_bad_pipe_inputs():
    with pytest.raises(InputError, match="pipe inlet"):
        pipe_segment(Fluid("Air").state_PT(2e5, 300.0), 1.0, 0.1)
    inlet = WATER.state_PT(2e5, 293.15)
    with pytest.raises(SpecificationError, match="outlet pressure"):
        pipe_segment(inlet, 1.0, 0.1, elevation_change=50.0)
    with pytest.raises(InputError, match="pipe diameter"):
        pipe_segment(inlet, 1.0, -0.1)


def test_minor_losses_and_npsh_from_flow():
    # Fittings only (no length): dP = K rho V^2 / 2 (loss-coefficient definition, common
    # practice), V = m / (rho pi D^2 / 4) (continuity); water density at 20 degC and 3 bar
    # from IAPWS-IF97 via iapws.
    inlet = WATER.state_PT(3e5, 293.15)
    rho = IAPWS97(P=0.3, T=293.15).rho
    v = 10.0 / (rho * math.pi * 0.1 ** 2 / 4)
    result = pipe_segment(inlet, 10.0, 0.1, minor_loss_coefficient=2.0)
    assert result.pressure_drop == pytest.approx(2.0 * rho * v ** 2 / 2, rel=1e-5)
    assert result.head_loss == pytest.approx(2.0 * v ** 2 / (2 * 9.80665), rel=1e-5)
    # NPSHa with the velocity from the mass flow and the flange diameter (same continuity);
    # vapour pressure at 20 degC from IAPWS-IF97 via iapws; g = 9.80665 m/s^2 (3rd CGPM).
    pv = IAPWS97(T=293.15, x=0).P * 1e6
    suction = npsh_available(inlet, mass_flow=Q_(36.0, "t/h"), diameter=0.1)
    assert suction.velocity == pytest.approx(v, rel=1e-5)
    expected = (3e5 - pv) / (rho * 9.80665) + v ** 2 / (2 * 9.80665)
    assert suction.npsh_available == pytest.approx(expected, rel=1e-5)
    with pytest.raises(InputError, match="minor loss coefficient -1 is outside the allowed range at least 0"):
        pipe_segment(inlet, 10.0, 0.1, minor_loss_coefficient=-1.0)
    with pytest.raises(InputError, match="pipe outlet diameter 0 m is outside the allowed range above 0"):
        pipe_segment(inlet, 10.0, 0.1, outlet_diameter=0.0)


def test_viscosity_comes_from_the_fluid_by_default():
    # Reynolds number rho V D / mu with the viscosity of water from the IAPWS 2008
    # formulation (through the iapws package, IAPWS97(...).mu), density from IAPWS-IF97.
    inlet = WATER.state_PT(5e5, 293.15)
    reference = IAPWS97(P=0.5, T=293.15)
    m, d = 20.0, 0.15
    v = m / (reference.rho * math.pi * d ** 2 / 4)
    result = pipe_segment(inlet, m, d, length=200.0)
    assert result.reynolds_number == pytest.approx(reference.rho * v * d / reference.mu,
                                                   rel=1e-4)
    # the override still wins
    override = pipe_segment(inlet, m, d, length=200.0, viscosity=Q_(2.0, "mPa*s"))
    assert override.reynolds_number == pytest.approx(result.reynolds_number
                                                     * reference.mu / 2.0e-3, rel=1e-4)
    with pytest.raises(InputError, match="viscosity was given in bar"):
        pipe_segment(inlet, m, d, length=200.0, viscosity=Q_(1.0, "bar"))


def test_hot_water_rising_below_its_vapour_pressure_is_refused():
    # Water at 80 degC and 1 bar lifted 8 m: P2 = P1 - rho g dz = 0.238 bar, below its vapour
    # pressure 0.4741 bar (IAPWS-IF97 via iapws): the liquid would boil, so the pipe balance
    # is refused with a message naming the vapour pressure (documented choice).
    inlet = WATER.state_PT(1e5, 353.15)
    pv = IAPWS97(T=353.15, x=0).P * 1e6
    with pytest.raises(SpecificationError, match="below the vapour pressure") as info:
        pipe_segment(inlet, 1.0, 0.1, elevation_change=8.0)
    assert f"{pv / 1e5:.4f}" in str(info.value)
    # 4 m of rise leaves 0.62 bar, above it: accepted, the vapour pressure reported.
    ok = pipe_segment(inlet, 1.0, 0.1, elevation_change=4.0)
    assert ok.outlet.P == pytest.approx(1e5 - ok.density * G * 4.0, rel=1e-9)
    assert ok.vapour_pressure == pytest.approx(pv, rel=1e-4)
    assert not ok.outlet.two_phase and ok.cautions == ()


def test_pump_whose_suction_may_boil_gives_a_caution():
    # With pump work w in the segment, the pump's position is not known; at the outlet end
    # the liquid would reach it at P2 - rho w (Bernoulli with work, closed form), here below
    # the vapour pressure of 80 degC water: a caution, not a refusal.
    inlet = WATER.state_PT(1e5, 353.15)
    result = pipe_segment(inlet, 1.0, 0.1, elevation_change=8.0, pump_power=200.0)
    assert result.outlet.P > result.vapour_pressure
    assert len(result.cautions) == 1 and "vapour pressure" in result.cautions[0]


def test_roughness_limit_is_the_same_in_both_functions():
    # e/D up to 0.05 (the top of the Moody chart, from memory) is accepted by both the
    # friction factor and the pipe; above it both refuse.
    inlet = WATER.state_PT(5e5, 293.15)
    f = darcy_friction_factor(1e5, 0.05)
    result = pipe_segment(inlet, 20.0, 0.1, length=10.0, roughness=0.005, viscosity=1e-3)
    assert result.friction_factor == pytest.approx(f, rel=1e-2)
    # Fully rough Colebrook limit 1/sqrt(f) = -2 log10(e/D / 3.7) (closed form); Re = 1e5
    # is not fully rough, so only 10 %.
    assert f == pytest.approx((-2 * math.log10(0.05 / 3.7)) ** -2, rel=0.1)
    with pytest.raises(InputError, match="relative roughness"):
        darcy_friction_factor(1e5, 0.0501)
    with pytest.raises(InputError, match="pipe roughness"):
        pipe_segment(inlet, 20.0, 0.1, length=10.0, roughness=0.00501)


@pytest.mark.parametrize("kwargs, message", [
    (dict(diameter=1e-300), "pipe diameter 1e-300 m is too small"),
    (dict(diameter=1e-6), "velocity of .* m/s, above 1000 m/s"),
    (dict(diameter=Q_(0.1, "kg")), "pipe diameter was given in kg"),
    (dict(mass_flow=10 ** 400), "pipe mass flow .* is too large"),
    (dict(mass_flow=float("nan")), "pipe mass flow must be a finite number"),
    (dict(mass_flow="10"), "pipe mass flow must be a number"),
    (dict(mass_flow=None), "pipe mass flow is missing"),
])
def test_bad_numbers_are_refused_by_name(kwargs, message):
    inlet = WATER.state_PT(5e5, 293.15)
    args = dict(mass_flow=1.0, diameter=0.1)
    args.update(kwargs)
    with pytest.raises(InputError, match=message):
        pipe_segment(inlet, args["mass_flow"], args["diameter"])


def test_decimal_inputs_and_field_keys():
    # Decimal is a number (project input boundary); result keys come from FIELDS.
    from decimal import Decimal

    from workbench.fields import FIELDS

    inlet = WATER.state_PT(3e5, 293.15)
    a = pipe_segment(inlet, 10.0, 0.1, minor_loss_coefficient=2.0)
    b = pipe_segment(inlet, Decimal("10"), Decimal("0.1"), minor_loss_coefficient=Decimal(2))
    assert b.outlet.P == a.outlet.P
    d = a.to_dict()
    assert all(key in FIELDS for key in d if key not in ("device", "fluid"))
    assert math.isnan(d["reynolds_number"])  # not defined: no length
    assert set(npsh_available(inlet, velocity=1.0).to_dict()) <= set(FIELDS) | {"device",
                                                                               "fluid"}
