"""Fan performance from a test after ISO 5801's definitions: pressures, air power, efficiencies.

Definitions (ISO 5801, recalled from memory; check against the standard before a contractual
use).  At the inlet (1) and outlet (2) measuring sections, with static pressure p, density
rho, mean velocity v = q_m / (rho A) and Mach number Ma = v / a::

    p_d   = rho v^2 / 2 * F_M,   F_M = 1 + Ma^2/4 + Ma^4/40 + Ma^6/1600     (dynamic pressure)
    p_sg  = p + p_d                                                         (stagnation)
    p_F   = p_sg2 - p_sg1                                                   (fan pressure)
    p_sF  = p_2 - p_sg1 = p_F - p_d2                                        (fan static pressure)

F_M is the isentropic series of (p_sg - p) / (rho v^2 / 2) for a ratio of specific heats of
1.4.  The fan air power uses the compressibility coefficient k_p, which turns the product of
the inlet stagnation volume flow and the fan pressure into the polytropic work of the gas::

    x   = p_F / p_sg1,   Z_k = (kappa - 1)/kappa * P_r / (q_Vsg1 p_sg1)
    k_p = ln(1 + x) / x * Z_k / ln(1 + Z_k)
    P_u = q_Vsg1 p_F k_p,         eta_r = P_u / P_r                          (fan efficiency)
    P_us = q_Vsg1 p_sF k_ps,      eta_sr = P_us / P_r                        (fan static eff.)

with P_r the impeller power (the power given to the gas), kappa the isentropic exponent and
k_ps the same expression with x_s = p_sF / p_sg1.  The expression follows from a polytropic
compression of an ideal gas between the stagnation states whose temperature rise the impeller
power sets: (1 + x)^((n - 1)/n) = 1 + Z_k.

Here the inlet state is a workbench State; the outlet state follows from the outlet static
pressure and the stagnation enthalpy h_sg2 = h_sg1 + P_r / q_m (adiabatic casing), with
density and speed of sound from the property model.  kappa defaults to cp/(cp - R) at the
inlet (ideal-gas value, adequate for air at fan pressures).

References
----------
ISO 5801, Fans - Performance testing using standardized airways (definitions of fan pressure,
fan static pressure, fan air power, compressibility coefficient, fan efficiency; recalled
from memory).
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field

from ..errors import InputError, ReadingsError
from ..fields import row
from ..properties import State
from ..units import optional_si, positive, to_si

#: Iterations for the outlet density (converges to rounding in 3-4 at fan Mach numbers).
_OUTLET_ITERATIONS = 8


def mach_factor(mach_number) -> float:
    """ISO 5801's Mach factor F_M = 1 + Ma^2/4 + Ma^4/40 + Ma^6/1600 [-].

    Parameters
    ----------
    mach_number : float
        Mach number of the mean velocity [-], in [0, 1).

    Returns
    -------
    float

    References
    ----------
    ISO 5801 (from memory); the series of the isentropic stagnation pressure for kappa = 1.4.

    Examples
    --------
    >>> round(mach_factor(0.2), 6)
    1.01004
    """
    Ma = to_si(mach_number, "dimensionless", "Mach number", low=0.0, high=1.0, high_open=True)
    return 1 + Ma ** 2 / 4 + Ma ** 4 / 40 + Ma ** 6 / 1600


def compressibility_coefficient(pressure_rise, inlet_stagnation_pressure, volume_flow,
                                impeller_power, isentropic_exponent=1.4) -> float:
    """Compressibility coefficient k_p of ISO 5801 [-] (module notes).

    Parameters
    ----------
    pressure_rise : float or Quantity
        Fan pressure p_F (or fan static pressure for k_ps) [Pa], above -0.9 p_sg1.
    inlet_stagnation_pressure : float or Quantity
        p_sg1 [Pa], positive.
    volume_flow : float or Quantity
        Inlet stagnation volume flow q_Vsg1 [m^3/s], positive.
    impeller_power : float or Quantity
        Power given to the gas P_r [W], positive.
    isentropic_exponent : float
        kappa [-], in (1, 2].

    Returns
    -------
    float
        k_p; 1 in the limit of a vanishing pressure rise.

    References
    ----------
    ISO 5801 (from memory).

    Examples
    --------
    >>> round(compressibility_coefficient(2000.0, 101325.0, 10.0, 25000.0), 5)
    0.99375
    """
    p1 = positive(inlet_stagnation_pressure, "pressure", "inlet stagnation pressure")
    dp = to_si(pressure_rise, "pressure", "fan pressure", low=-0.9 * p1)
    q = positive(volume_flow, "volume_flow", "inlet volume flow")
    P_r = positive(impeller_power, "power", "impeller power")
    kappa = to_si(isentropic_exponent, "dimensionless", "isentropic exponent", low=1.0,
                  high=2.0, low_open=True)
    return _k_p(dp / p1, (kappa - 1) / kappa * P_r / (q * p1))


def _ln_ratio(x: float) -> float:
    """ln(1 + x) / x, 1 at x = 0."""
    return 1.0 - x / 2 + x * x / 3 if abs(x) < 1e-8 else math.log1p(x) / x


def _k_p(x: float, z_k: float) -> float:
    return _ln_ratio(x) / _ln_ratio(z_k)


@dataclass(frozen=True, eq=False)
class FanTestResult:
    """Fan performance from one test point after ISO 5801.  SI units.

    Attributes
    ----------
    inlet, outlet : State
        Static states at the inlet and outlet measuring sections.
    mass_flow : float
        [kg/s].
    volume_flow : float
        Inlet volume flow at the inlet static density [m^3/s].
    velocity_in, velocity_out : float
        Mean velocities [m/s].
    fan_dynamic_pressure : float
        Dynamic pressure at the outlet p_d2 [Pa].
    fan_pressure, fan_static_pressure : float
        p_F and p_sF [Pa].
    compressibility_coefficient, static_compressibility_coefficient : float
        k_p and k_ps [-].
    fan_air_power, fan_static_air_power : float
        P_u and P_us [W].
    power : float
        Impeller power given [W].
    fan_efficiency, fan_static_efficiency : float
        P_u / P_r and P_us / P_r [-].
    isentropic_exponent : float
        kappa used [-].
    cautions : tuple of str
        A negative fan static pressure, a Mach number above 0.3.
    """

    inlet: State
    outlet: State
    mass_flow: float
    volume_flow: float
    velocity_in: float
    velocity_out: float
    fan_dynamic_pressure: float
    fan_pressure: float
    fan_static_pressure: float
    compressibility_coefficient: float
    static_compressibility_coefficient: float
    fan_air_power: float
    fan_static_air_power: float
    power: float
    fan_efficiency: float
    fan_static_efficiency: float
    isentropic_exponent: float
    cautions: tuple = field(default=())

    FIELDS = ("mass_flow", "volume_flow", "velocity_in", "velocity_out",
              "fan_dynamic_pressure", "fan_pressure", "fan_static_pressure",
              "compressibility_coefficient", "static_compressibility_coefficient",
              "fan_air_power", "fan_static_air_power", "power", "fan_efficiency",
              "fan_static_efficiency")

    def to_dict(self) -> dict:
        """Result fields by name (SI values; see :data:`workbench.fields.FIELDS`)."""
        out = {"fluid": self.inlet.fluid.name, "inlet_pressure": self.inlet.P,
               "inlet_temperature": self.inlet.T, "outlet_pressure": self.outlet.P,
               "outlet_temperature": self.outlet.T}
        out.update(row(self, self.FIELDS))
        out["cautions"] = "; ".join(self.cautions)
        return out


def _dynamic(state: State, velocity: float) -> tuple[float, float]:
    a = state.fluid.speed_of_sound(state)
    if not (math.isfinite(a) and a > 0):
        raise InputError(f"no speed of sound for {state.fluid.name} at {state.P:.6g} Pa, "
                         f"{state.T:.6g} K")
    Ma = velocity / a
    if Ma >= 1:
        raise ReadingsError(f"the mean velocity {velocity:.5g} m/s is at or above the speed of "
                            f"sound {a:.5g} m/s: not a fan test")
    return state.rho * velocity ** 2 / 2 * mach_factor(Ma), Ma


def _outlet(inlet, P2, h_sg2, m, A2):
    fluid = inlet.fluid
    rho2 = inlet.rho * P2 / inlet.P
    outlet = None
    for _ in range(_OUTLET_ITERATIONS):
        v2 = m / (rho2 * A2)
        h2 = h_sg2 - v2 ** 2 / 2
        outlet = fluid.state_Ph(P2, h2, T_guess=inlet.T)
        if abs(outlet.rho - rho2) <= 1e-12 * rho2:
            break
        rho2 = outlet.rho
    return outlet, m / (outlet.rho * A2)


def fan_test(inlet, *, outlet_pressure, volume_flow, inlet_area, outlet_area, power,
             isentropic_exponent=None) -> FanTestResult:
    """Fan pressure, air power and efficiency of one test point after ISO 5801.

    Parameters
    ----------
    inlet : State
        Static state at the inlet measuring section (a gas).
    outlet_pressure : float or Quantity
        Static pressure at the outlet measuring section [Pa].
    volume_flow : float or Quantity
        Inlet volume flow at the inlet static density [m^3/s], positive.
    inlet_area, outlet_area : float or Quantity
        Flow areas of the measuring sections [m^2], positive.
    power : float or Quantity
        Impeller power given to the gas P_r [W], positive.
    isentropic_exponent : float, optional
        kappa [-] in (1, 2]; default cp/(cp - R) at the inlet.

    Returns
    -------
    FanTestResult

    Raises
    ------
    InputError
        Values out of range, a liquid or two-phase inlet.
    ReadingsError
        A fan pressure that is not positive, a fan efficiency above 1, a sonic velocity.

    References
    ----------
    ISO 5801 (module notes; from memory).

    Examples
    --------
    >>> import workbench as wb
    >>> air = wb.Fluid("Air").state(P=100000.0, T=293.15)
    >>> r = fan_test(air, outlet_pressure=101500.0, volume_flow=5.0, inlet_area=1.0,
    ...              outlet_area=0.5, power=12000.0)
    >>> round(r.fan_efficiency, 3)
    0.641
    """
    if not isinstance(inlet, State):
        raise InputError(f"fan inlet must be a workbench State, not {type(inlet).__name__}")
    if inlet.two_phase or inlet.phase == "liquid":
        raise InputError(f"the fan inlet is {inlet.fluid.name} {inlet.phase}: a fan moves a gas")
    P2 = positive(outlet_pressure, "pressure", "outlet pressure")
    q1 = positive(volume_flow, "volume_flow", "inlet volume flow")
    A1 = positive(inlet_area, "area", "inlet area")
    A2 = positive(outlet_area, "area", "outlet area")
    P_r = positive(power, "power", "impeller power")
    kappa = optional_si(isentropic_exponent, "dimensionless", "isentropic exponent", low=1.0,
                        high=2.0, low_open=True)
    if kappa is None:
        kappa = inlet.cp / (inlet.cp - inlet.fluid.gas_constant)
        if not (math.isfinite(kappa) and 1.0 < kappa <= 2.0):
            raise InputError(f"the ideal-gas isentropic exponent {kappa:.4g} at the inlet is "
                             "not in (1, 2]: give isentropic_exponent=")
    m = inlet.rho * q1
    v1 = q1 / A1
    pd1, Ma1 = _dynamic(inlet, v1)
    p_sg1 = inlet.P + pd1
    stagnation1 = inlet.fluid.state_Ps(p_sg1, inlet.s, T_guess=inlet.T)
    outlet, v2 = _outlet(inlet, P2, inlet.h + v1 ** 2 / 2 + P_r / m, m, A2)
    if outlet.two_phase or outlet.phase == "liquid":
        raise ReadingsError(f"the fan outlet comes out {outlet.phase}: not a fan test")
    pd2, Ma2 = _dynamic(outlet, v2)
    p_F = P2 + pd2 - p_sg1
    p_sF = P2 - p_sg1
    if not p_F > 0:
        raise ReadingsError(f"fan pressure {p_F:.5g} Pa is not positive: the outlet stagnation "
                            "pressure must exceed the inlet stagnation pressure")
    q_sg1 = m / stagnation1.rho
    z_k = (kappa - 1) / kappa * P_r / (q_sg1 * p_sg1)
    k_p = _k_p(p_F / p_sg1, z_k)
    if p_sF <= -0.9 * p_sg1:
        raise ReadingsError(f"fan static pressure {p_sF:.5g} Pa is implausible")
    k_ps = _k_p(p_sF / p_sg1, z_k)
    P_u, P_us = q_sg1 * p_F * k_p, q_sg1 * p_sF * k_ps
    eta, eta_s = P_u / P_r, P_us / P_r
    if eta > 1:
        raise ReadingsError(f"fan efficiency {eta:.4g} exceeds 1: the impeller power "
                            f"{P_r:.5g} W is below the fan air power {P_u:.5g} W")
    cautions = []
    if p_sF < 0:
        cautions.append("the fan static pressure is negative (outlet static below inlet "
                        "stagnation pressure)")
    if max(Ma1, Ma2) > 0.3:
        cautions.append(f"a measuring-section Mach number is {max(Ma1, Ma2):.3g}, above 0.3")
    return FanTestResult(
        inlet=inlet, outlet=outlet, mass_flow=m, volume_flow=q1, velocity_in=v1,
        velocity_out=v2, fan_dynamic_pressure=pd2, fan_pressure=p_F, fan_static_pressure=p_sF,
        compressibility_coefficient=k_p, static_compressibility_coefficient=k_ps,
        fan_air_power=P_u, fan_static_air_power=P_us, power=P_r, fan_efficiency=eta,
        fan_static_efficiency=eta_s, isentropic_exponent=kappa, cautions=tuple(cautions))


__all__ = ["FanTestResult", "compressibility_coefficient", "fan_test", "mach_factor"]
