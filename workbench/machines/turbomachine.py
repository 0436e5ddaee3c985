"""Steady-flow energy balance of compressors, turbines, pumps and fans.

One inlet, one outlet, steady state.  Per unit mass, with power absorbed positive::

    w_in = (h2 - h1) + (V2^2 - V1^2) / 2 + g (z2 - z1) + q_loss

For a turbine the delivered specific work is ``-w_in``.  Results always report positive
magnitudes (absorbed by a compressor, pump or fan; delivered by a turbine).

Exactly one of these fixes the outlet:

* ``outlet``: a measured outlet state (rating);
* ``isentropic_efficiency`` or ``polytropic_efficiency`` with ``P_out`` (prediction);
* ``power`` (measured shaft power) with ``P_out``: the outlet enthalpy follows from the
  energy balance.  This is how a steam turbine with a wet exhaust is rated.

Efficiencies
------------
Isentropic efficiencies compare the actual enthalpy change with the isentropic one between
the same pressures (gas-side, adiabatic definition; heat loss counts in the power but not in
the efficiency):

* static-to-static (default): ``(h2s - h1) / (h2 - h1)`` (compression);
* total-to-total (``basis="total"``): the same between stagnation states
  ``h0 = h + V^2/2`` at the stagnation pressures;
* total-to-static (turbines): ``(h01 - h02) / (h01 - h2s)``, the exhaust kinetic energy
  counted as a loss.

References
----------
ASME PTC 10-1997, Performance Test Code on Compressors and Exhausters.
ASME PTC 6-2004, Steam Turbines (the energy balance for exhaust enthalpy from power).
S. L. Dixon, C. A. Hall, Fluid Mechanics and Thermodynamics of Turbomachinery, 7th ed.,
Butterworth-Heinemann 2014, chapter 2 (efficiency definitions).
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from functools import cached_property

from ..errors import InputError, ReadingsError, SpecificationError
from ..polytropic import polytropic_efficiency as _path_efficiency
from ..polytropic import polytropic_outlet, schultz
from ..properties import State
from ..units import optional_si, to_si

#: Standard acceleration of gravity [m/s^2] (CGPM 1901).
STANDARD_GRAVITY = 9.80665

_KINDS = {
    "compressor": True,  # True: raises pressure
    "pump": True,
    "fan": True,
    "turbine": False,
}


@dataclass(frozen=True, eq=False)
class MachineResult:
    """Result of a machine energy balance.  All numbers in SI units.

    Attributes
    ----------
    kind : str
        ``"compressor"``, ``"turbine"``, ``"pump"`` or ``"fan"``.
    basis : str
        ``"static"`` or ``"total"``: the basis of ``isentropic_efficiency`` and
        ``polytropic_efficiency``.
    inlet, outlet : State
        Static inlet and outlet states.
    isentropic_outlet : State
        Outlet pressure at the inlet entropy (static).
    inlet_stagnation, outlet_stagnation : State
        Stagnation (total) states ``h0 = h + V^2/2`` at the static entropy.
    mass_flow : float
        Mass flow [kg/s].
    velocity_in, velocity_out : float
        Flow velocities [m/s].
    elevation_change : float
        Outlet elevation above the inlet [m].
    heat_loss : float
        Heat lost to the surroundings [W] (positive out of the machine).
    mechanical_efficiency : float
        Shaft power over fluid power (turbine) or fluid over shaft power (driven machine) [-].
    specific_work : float
        Fluid work per unit mass, a positive magnitude [J/kg].
    power : float
        Fluid power, a positive magnitude [W].
    shaft_power : float
        Power at the coupling after mechanical losses [W].
    enthalpy_change : float
        h2 - h1 [J/kg].
    kinetic_energy_change : float
        (V2^2 - V1^2) / 2 [J/kg].
    potential_energy_change : float
        g (z2 - z1) [J/kg].
    specific_heat_loss : float
        Heat loss per unit mass [J/kg].
    isentropic_efficiency_static : float
        Static-to-static isentropic efficiency [-].
    isentropic_efficiency_total : float
        Total-to-total isentropic efficiency [-].
    isentropic_efficiency_total_to_static : float
        Total-to-static isentropic efficiency [-] (turbines; NaN for driven machines).
    isentropic_head : float
        |h2s - h1| on the chosen basis [J/kg].
    rated_from : str
        What fixed the outlet: ``"outlet"`` (a measured outlet state), ``"efficiency"`` or
        ``"power"``.
    """

    kind: str
    basis: str
    inlet: State
    outlet: State
    isentropic_outlet: State
    inlet_stagnation: State
    outlet_stagnation: State
    mass_flow: float
    velocity_in: float
    velocity_out: float
    elevation_change: float
    heat_loss: float
    mechanical_efficiency: float
    specific_work: float
    power: float
    shaft_power: float
    enthalpy_change: float
    kinetic_energy_change: float
    potential_energy_change: float
    specific_heat_loss: float
    isentropic_efficiency_static: float
    isentropic_efficiency_total: float
    isentropic_efficiency_total_to_static: float
    isentropic_head: float
    rated_from: str = "outlet"
    _given_polytropic: tuple = field(default=(), repr=False)

    # ---------------------------------------------------------------- derived
    @property
    def isentropic_efficiency(self) -> float:
        """Isentropic efficiency on the result's basis [-]."""
        if self.basis == "total":
            return self.isentropic_efficiency_total
        return self.isentropic_efficiency_static

    @property
    def pressure_ratio(self) -> float:
        """Outlet over inlet static pressure [-]."""
        return self.outlet.P / self.inlet.P

    @property
    def inlet_volume_flow(self) -> float:
        """Actual volume flow at the inlet [m^3/s]."""
        return self.mass_flow / self.inlet.rho

    @property
    def outlet_volume_flow(self) -> float:
        """Actual volume flow at the outlet [m^3/s]."""
        return self.mass_flow / self.outlet.rho

    @property
    def kinetic_share(self) -> float:
        """Share of the specific work that goes into (or comes from) kinetic energy [-]."""
        return abs(self.kinetic_energy_change) / self.specific_work if self.specific_work else math.nan

    @property
    def outlet_temperature(self) -> float:
        """Static outlet temperature [K]."""
        return self.outlet.T

    def _ends(self):
        if self.basis == "total":
            return self.inlet_stagnation, self.outlet_stagnation
        return self.inlet, self.outlet

    @cached_property
    def _schultz(self):
        a, b = self._ends()
        iso = a.fluid.state_Ps(b.P, a.s, T_guess=self.isentropic_outlet.T)
        return schultz(a, b, iso)

    @cached_property
    def _path(self):
        if self._given_polytropic:
            return self._given_polytropic
        a, b = self._ends()
        eta, head, _ = _path_efficiency(a, b, guess=self._schultz.polytropic_efficiency)
        return eta, head

    @property
    def polytropic_efficiency(self) -> float:
        """Polytropic efficiency by direct integration of the polytropic path [-]."""
        return self._path[0]

    @property
    def polytropic_head(self) -> float:
        """Polytropic head by direct path integration, a positive magnitude [J/kg]."""
        return self._path[1]

    @property
    def polytropic_efficiency_schultz(self) -> float:
        """Polytropic efficiency by Schultz's method [-]."""
        return self._schultz.polytropic_efficiency

    @property
    def polytropic_head_schultz(self) -> float:
        """Polytropic head by Schultz's method [J/kg]."""
        return self._schultz.polytropic_head

    @property
    def schultz_factor(self) -> float:
        """Schultz polytropic head correction factor f [-]."""
        return self._schultz.schultz_factor

    @property
    def polytropic_exponent(self) -> float:
        """Polytropic volume exponent n = ln(P2/P1)/ln(v1/v2) [-]."""
        return self._schultz.polytropic_exponent

    @property
    def isentropic_exponent(self) -> float:
        """Isentropic volume exponent n_s = ln(P2/P1)/ln(v1/v2s) [-]."""
        return self._schultz.isentropic_exponent

    @property
    def outlet_temperature_sensitivity(self) -> float:
        """Change of the isentropic efficiency per kelvin of outlet temperature [1/K].

        For a rating from a measured outlet temperature: d(eta)/dT2 = -eta cp2 / (h2 - h1)
        (compression; the magnitude is the same for an expansion).  NaN when the outlet is
        two-phase or the outlet was not measured.
        """
        if self.rated_from != "outlet" or self.outlet.two_phase:
            return math.nan
        dh = self.outlet.h - self.inlet.h
        return abs(self.isentropic_efficiency * self.outlet.cp / dh) if dh else math.nan

    @property
    def cautions(self) -> tuple[str, ...]:
        """Plain-language cautions about how far the numbers can be trusted.

        * A state in the two-phase region: Schultz's method and ASME PTC 10 assume a
          single-phase gas; the path-integrated polytropic values are the ones to use.
        * A rating from a measured outlet temperature where 1 K moves the efficiency by more
          than two points (small temperature rise: low-ratio compressors, fans, pumps; common
          practice is to rate such machines from measured power or with calibrated,
          well-immersed thermometers).
        """
        notes = []
        wet = [(name, st) for name, st in (("inlet", self.inlet), ("outlet", self.outlet),
                                           ("isentropic outlet", self.isentropic_outlet))
               if st.two_phase]
        if wet:
            where = ", ".join(f"{name} quality {st.x:.3f}" for name, st in wet)
            notes.append(f"the process enters the two-phase region ({where}): Schultz's method "
                         "assumes a single-phase gas; use the path-integrated polytropic values")
        sensitivity = self.outlet_temperature_sensitivity
        if math.isfinite(sensitivity) and sensitivity > 0.02:
            rise = abs(self.outlet.T - self.inlet.T)
            notes.append(f"the outlet temperature changes by only {rise:.3g} K: an error of 1 K "
                         f"in it moves the efficiency by {100 * sensitivity:.2g} points; rate "
                         "from measured power or use calibrated, well-immersed thermometers")
        return tuple(notes)

    # ---------------------------------------------------------------- export
    def to_dict(self) -> dict:
        """Flat dict of every result number (SI units, keys end with their unit)."""
        d = {"kind": self.kind, "basis": self.basis, "fluid": self.inlet.fluid.name}
        for prefix, st in (("inlet", self.inlet), ("outlet", self.outlet),
                           ("isentropic_outlet", self.isentropic_outlet)):
            d[f"{prefix}_pressure_Pa"] = st.P
            d[f"{prefix}_temperature_K"] = st.T
            d[f"{prefix}_enthalpy_J_per_kg"] = st.h
            d[f"{prefix}_entropy_J_per_kgK"] = st.s
            d[f"{prefix}_density_kg_per_m3"] = st.rho
            d[f"{prefix}_quality"] = st.quality
        d.update({
            "mass_flow_kg_per_s": self.mass_flow,
            "velocity_in_m_per_s": self.velocity_in,
            "velocity_out_m_per_s": self.velocity_out,
            "specific_work_J_per_kg": self.specific_work,
            "power_W": self.power,
            "shaft_power_W": self.shaft_power,
            "heat_loss_W": self.heat_loss,
            "enthalpy_change_J_per_kg": self.enthalpy_change,
            "kinetic_energy_change_J_per_kg": self.kinetic_energy_change,
            "potential_energy_change_J_per_kg": self.potential_energy_change,
            "pressure_ratio": self.pressure_ratio,
            "isentropic_efficiency": self.isentropic_efficiency,
            "isentropic_efficiency_static": self.isentropic_efficiency_static,
            "isentropic_efficiency_total": self.isentropic_efficiency_total,
            "isentropic_efficiency_total_to_static": self.isentropic_efficiency_total_to_static,
            "polytropic_efficiency": self.polytropic_efficiency,
            "polytropic_efficiency_schultz": self.polytropic_efficiency_schultz,
            "schultz_factor": self.schultz_factor,
            "polytropic_exponent": self.polytropic_exponent,
            "isentropic_head_J_per_kg": self.isentropic_head,
            "polytropic_head_J_per_kg": self.polytropic_head,
            "polytropic_head_schultz_J_per_kg": self.polytropic_head_schultz,
            "inlet_volume_flow_m3_per_s": self.inlet_volume_flow,
            "outlet_volume_flow_m3_per_s": self.outlet_volume_flow,
            "kinetic_share": self.kinetic_share,
        })
        return d

    def to_series(self):
        """The result as a pandas Series (one row of a results table)."""
        import pandas as pd

        return pd.Series(self.to_dict())


def _velocity(name, velocity, diameter, mass_flow, rho):
    """Velocity [m/s] given directly or from mass flow and a flow diameter (continuity)."""
    if diameter is None:
        return velocity
    # V = m / (rho A), A = pi D^2 / 4
    return mass_flow / (rho * math.pi * diameter ** 2 / 4.0)


def _check_state(name, state):
    if not isinstance(state, State):
        raise InputError(f"{name} must be a State from Fluid.state(...), not {type(state).__name__}")
    return state


def _fraction(name, value):
    value = to_si(value, "dimensionless", name)
    if not 0.0 < value <= 1.0:
        raise InputError(f"{name} {value:g} is outside the allowed range (0, 1]")
    return value


def energy_balance(kind: str, inlet: State, outlet: State | None = None, *, P_out=None,
                   isentropic_efficiency=None, polytropic_efficiency=None, power=None,
                   mass_flow=1.0, velocity_in=0.0, velocity_out=0.0, diameter_in=None,
                   diameter_out=None, elevation_change=0.0, heat_loss=0.0,
                   mechanical_efficiency=1.0, basis: str = "static") -> MachineResult:
    """Steady-flow energy balance of one machine; see the module docstring.

    Parameters
    ----------
    kind : {"compressor", "turbine", "pump", "fan"}
        Machine type; fixes the direction of the pressure change.
    inlet : State
        Static inlet state.
    outlet : State, optional
        Measured static outlet state (rating).
    P_out : float or Quantity, optional
        Outlet static pressure [Pa], with an efficiency or ``power``.
    isentropic_efficiency, polytropic_efficiency : float, optional
        Efficiency [-] in (0, 1] on ``basis``, to predict the outlet.
    power : float or Quantity, optional
        Measured shaft power [W] (positive magnitude), to find the outlet from the balance.
    mass_flow : float or Quantity
        Mass flow [kg/s], positive.
    velocity_in, velocity_out : float or Quantity
        Flow velocities [m/s], not negative.
    diameter_in, diameter_out : float or Quantity, optional
        Flow diameters [m]; the velocity then follows from continuity, V = 4 m / (rho pi D^2).
    elevation_change : float or Quantity
        Outlet elevation minus inlet elevation [m].
    heat_loss : float or Quantity
        Heat lost to the surroundings [W] (positive out of the machine).
    mechanical_efficiency : float
        Bearing, seal and gear losses [-] in (0, 1].
    basis : {"static", "total"}
        Basis of the given and reported isentropic and polytropic efficiency.

    Returns
    -------
    MachineResult
    """
    if kind not in _KINDS:
        raise InputError(f"machine kind {kind!r} is not one of {', '.join(_KINDS)}")
    if basis not in ("static", "total"):
        raise InputError(f"efficiency basis must be 'static' or 'total', not {basis!r}")
    raises = _KINDS[kind]
    inlet = _check_state("inlet", inlet)
    fluid = inlet.fluid
    m = to_si(mass_flow, "mass_flow", "mass flow")
    if m <= 0:
        raise InputError(f"mass flow {m:g} kg/s must be positive")
    v1 = to_si(velocity_in, "velocity", "inlet velocity")
    v2 = to_si(velocity_out, "velocity", "outlet velocity")
    d1 = optional_si(diameter_in, "length", "inlet flow diameter")
    d2 = optional_si(diameter_out, "length", "outlet flow diameter")
    for name, vel, dia in (("inlet", v1, d1), ("outlet", v2, d2)):
        if vel < 0:
            raise InputError(f"{name} velocity {vel:g} m/s must not be negative (give the speed)")
        if dia is not None:
            if dia <= 0:
                raise InputError(f"{name} flow diameter {dia:g} m must be positive")
            if vel != 0:
                raise SpecificationError(
                    f"give either the {name} velocity or the {name} flow diameter, not both")
    dz = to_si(elevation_change, "length", "elevation change")
    q_rate = to_si(heat_loss, "power", "heat loss")
    eta_m = _fraction("mechanical efficiency", mechanical_efficiency)
    P2 = optional_si(P_out, "pressure", "outlet pressure")
    eta_s = None if isentropic_efficiency is None else _fraction(
        "isentropic efficiency", isentropic_efficiency)
    eta_p = None if polytropic_efficiency is None else _fraction(
        "polytropic efficiency", polytropic_efficiency)
    shaft = optional_si(power, "power", "power")
    if shaft is not None and shaft < 0:
        raise InputError(f"power {shaft:g} W must be given as a positive magnitude")

    modes = [name for name, value in (("a measured outlet state", outlet),
                                      ("an isentropic efficiency", eta_s),
                                      ("a polytropic efficiency", eta_p),
                                      ("a measured power", shaft)) if value is not None]
    if len(modes) != 1:
        raise SpecificationError(
            "the outlet must be fixed by exactly one of: a measured outlet state, an isentropic "
            "efficiency, a polytropic efficiency or a measured power (the last three with the "
            f"outlet pressure); got {' and '.join(modes) if modes else 'none of them'}")
    if outlet is not None:
        outlet = _check_state("outlet", outlet)
        if outlet.fluid != fluid:
            raise InputError(f"inlet ({fluid.name}) and outlet ({outlet.fluid.name}) are "
                             "states of different fluids")
        if P2 is not None and abs(P2 - outlet.P) > 1e-9 * outlet.P:
            raise SpecificationError(
                f"outlet pressure {P2 / 1e5:.6g} bar disagrees with the measured outlet state "
                f"at {outlet.P / 1e5:.6g} bar: give one of them")
        P2 = outlet.P
    elif P2 is None:
        raise SpecificationError(f"outlet pressure is needed with {modes[0]}")
    fluid.check_pressure(P2, "outlet pressure")
    P1 = inlet.P
    if raises and not P2 > P1:
        raise InputError(
            f"outlet pressure {P2 / 1e5:.6g} bar is not above inlet pressure {P1 / 1e5:.6g} bar: "
            f"a {kind} raises pressure")
    if not raises and not P2 < P1:
        raise InputError(
            f"outlet pressure {P2 / 1e5:.6g} bar is not below inlet pressure {P1 / 1e5:.6g} bar: "
            "a turbine lowers pressure")
    if abs(P2 - P1) <= 1e-9 * P1:
        raise InputError(
            f"outlet pressure {P2 / 1e5:.9g} bar equals the inlet pressure {P1 / 1e5:.9g} bar to "
            f"one part in a billion: there is no pressure change to rate a {kind} by")
    if kind == "pump" and inlet.phase in ("gas", "two-phase"):
        raise InputError(f"the pump inlet is {fluid.name} {inlet.phase} at {inlet.T:.5g} K and "
                         f"{P1 / 1e5:.5g} bar: a pump needs liquid at its inlet "
                         "(use a compressor or fan for a gas)")

    V1 = _velocity("inlet", v1, d1, m, inlet.rho)
    g_dz = STANDARD_GRAVITY * dz
    q = q_rate / m
    iso = fluid.state_Ps(P2, inlet.s, T_guess=inlet.T)
    inlet0 = _stagnation(inlet, V1)

    def out_velocity(rho):
        return _velocity("outlet", v2, d2, m, rho)

    given_poly = ()
    rated_outlet = outlet is not None
    if outlet is not None:
        V2 = out_velocity(outlet.rho)
    else:
        # Predict the outlet enthalpy; iterate when the outlet velocity depends on the outlet
        # density (flow diameter given) or the basis is total (stagnation pressure unknown).
        V2 = out_velocity(iso.rho)
        h2 = None
        guess_T = iso.T
        for _ in range(50):
            if shaft is not None:
                w_fluid = shaft * eta_m / m if raises else shaft / (eta_m * m)
                w_in = w_fluid if raises else -w_fluid
                # w_in = dh + dKE + dPE + q
                h2_new = inlet.h + w_in - (V2 ** 2 - V1 ** 2) / 2 - g_dz - q
            else:
                h2_new = _outlet_enthalpy(inlet, inlet0, P2, V2, eta_s, eta_p, basis,
                                          raises, iso, guess_T, h2)
                if eta_p is not None:
                    h2_new, head = h2_new
                    given_poly = (eta_p, head)
            converged = h2 is not None and abs(h2_new - h2) < 1e-9 * max(abs(h2_new), 1.0)
            h2 = h2_new
            try:
                outlet = fluid.state_Ph(P2, h2, T_guess=guess_T)
            except Exception as exc:
                if shaft is not None:
                    raise ReadingsError(
                        f"the measured power {shaft / 1e3:.6g} kW puts the outlet enthalpy at "
                        f"{h2 / 1e3:.6g} kJ/kg, where no state of {fluid.name} at "
                        f"{P2 / 1e5:.6g} bar exists in the property model: check the readings"
                    ) from exc
                raise
            guess_T = outlet.T
            V2_new = out_velocity(outlet.rho)
            static_only = basis == "static" or eta_s is None and eta_p is None
            if (d2 is None and static_only) or (converged and abs(V2_new - V2) < 1e-9 * max(V2, 1)):
                V2 = V2_new
                break
            V2 = V2_new
        else:
            raise SpecificationError("the outlet velocity and state did not converge: check "
                                     "the outlet flow diameter")

    outlet0 = _stagnation(outlet, V2)
    dh = outlet.h - inlet.h
    dke = (V2 ** 2 - V1 ** 2) / 2
    w_in = dh + dke + g_dz + q
    work = w_in if raises else -w_in
    if work <= 0:
        raise ReadingsError(
            f"the {kind} would {'absorb' if not raises else 'deliver'} power "
            f"({work / 1e3:.6g} kJ/kg): the enthalpy change {dh / 1e3:.6g} kJ/kg, kinetic "
            f"{dke / 1e3:.6g} kJ/kg and heat loss do not fit a {kind}: check the readings")
    fluid_power = work * m
    shaft_power = fluid_power / eta_m if raises else fluid_power * eta_m

    eff_static = _isentropic_eff(inlet.h, outlet.h, iso.h, raises)
    if inlet0 is inlet and outlet0 is outlet:
        iso0 = iso  # no kinetic terms: stagnation and static states coincide
    else:
        iso0 = fluid.state_Ps(outlet0.P, inlet0.s, T_guess=iso.T)
    eff_total = _isentropic_eff(inlet0.h, outlet0.h, iso0.h, raises)
    eff_ts = math.nan if raises else (inlet0.h - outlet0.h) / (inlet0.h - iso.h)
    chosen = eff_total if basis == "total" else eff_static
    if not (chosen > 0):
        raise ReadingsError(
            f"the outlet enthalpy {outlet.h / 1e3:.6g} kJ/kg is not "
            f"{'above' if raises else 'below'} the inlet enthalpy {inlet.h / 1e3:.6g} kJ/kg: "
            f"a {kind} {'raises' if raises else 'lowers'} it: check the readings")
    if chosen > 1 + 1e-9:
        raise ReadingsError(
            f"the readings imply an isentropic efficiency of {chosen:.4f} ({basis} basis), above 1: "
            "check the readings (outlet temperature, pressures, power, flow and heat loss)")
    head_s = abs((iso0.h - inlet0.h) if basis == "total" else (iso.h - inlet.h))
    return MachineResult(
        kind=kind, basis=basis, inlet=inlet, outlet=outlet, isentropic_outlet=iso,
        inlet_stagnation=inlet0, outlet_stagnation=outlet0, mass_flow=m, velocity_in=V1,
        velocity_out=V2, elevation_change=dz, heat_loss=q_rate, mechanical_efficiency=eta_m,
        specific_work=work, power=fluid_power, shaft_power=shaft_power, enthalpy_change=dh,
        kinetic_energy_change=dke, potential_energy_change=g_dz, specific_heat_loss=q,
        isentropic_efficiency_static=eff_static, isentropic_efficiency_total=eff_total,
        isentropic_efficiency_total_to_static=eff_ts, isentropic_head=head_s,
        rated_from="outlet" if rated_outlet else ("power" if shaft is not None else "efficiency"),
        _given_polytropic=given_poly,
    )


def _isentropic_eff(h1, h2, h2s, raises):
    if raises:
        return (h2s - h1) / (h2 - h1) if h2 != h1 else math.nan
    return (h1 - h2) / (h1 - h2s) if h1 != h2s else math.nan


def _stagnation(state: State, velocity: float) -> State:
    """Stagnation state: h0 = h + V^2/2 at the static entropy."""
    if velocity == 0:
        return state
    return state.fluid.state_hs(state.h + velocity ** 2 / 2, state.s, state.P)


def _outlet_enthalpy(inlet, inlet0, P2, V2, eta_s, eta_p, basis, raises, iso, guess_T, h2_prev):
    """Outlet static enthalpy [J/kg] predicted from an efficiency on the chosen basis."""
    fluid = inlet.fluid
    if basis == "static" or (V2 == 0 and inlet0 is inlet):
        start, P_end, iso_end = inlet, P2, iso
        ke_out = 0.0
    else:
        # Stagnation outlet pressure from the current estimate of the outlet state.
        ke_out = V2 ** 2 / 2
        if h2_prev is None:
            h2_est = (inlet.h + (iso.h - inlet.h) / (eta_s or eta_p)) if raises else \
                (inlet.h - (eta_s or eta_p) * (inlet.h - iso.h))
        else:
            h2_est = h2_prev
        est = fluid.state_Ph(P2, h2_est, T_guess=guess_T)
        P_end = _stagnation(est, V2).P
        start = inlet0
        iso_end = fluid.state_Ps(P_end, inlet0.s, T_guess=iso.T)
    if eta_s is not None:
        if raises:
            h0 = start.h + (iso_end.h - start.h) / eta_s
        else:
            h0 = start.h - eta_s * (start.h - iso_end.h)
        return h0 - ke_out
    out, head, _ = polytropic_outlet(start, P_end, eta_p)
    return out.h - ke_out, head


def _public(kind):
    def machine(inlet, outlet=None, *, P_out=None, isentropic_efficiency=None,
                polytropic_efficiency=None, power=None, mass_flow=1.0, velocity_in=0.0,
                velocity_out=0.0, diameter_in=None, diameter_out=None, elevation_change=0.0,
                heat_loss=0.0, mechanical_efficiency=1.0, basis="static") -> MachineResult:
        return energy_balance(
            kind, inlet, outlet, P_out=P_out, isentropic_efficiency=isentropic_efficiency,
            polytropic_efficiency=polytropic_efficiency, power=power, mass_flow=mass_flow,
            velocity_in=velocity_in, velocity_out=velocity_out, diameter_in=diameter_in,
            diameter_out=diameter_out, elevation_change=elevation_change, heat_loss=heat_loss,
            mechanical_efficiency=mechanical_efficiency, basis=basis)

    machine.__name__ = kind
    machine.__qualname__ = kind
    machine.__doc__ = (
        f"Steady-flow energy balance of a {kind}.\n\n"
        f"Same parameters as :func:`energy_balance` without ``kind``.  "
        f"{'Power is absorbed' if _KINDS[kind] else 'Power is delivered'}; results are "
        "positive magnitudes.\n\nReturns\n-------\nMachineResult\n")
    return machine


compressor = _public("compressor")
turbine = _public("turbine")
pump = _public("pump")
fan = _public("fan")

__all__ = ["MachineResult", "energy_balance", "compressor", "turbine", "pump", "fan",
           "STANDARD_GRAVITY"]
