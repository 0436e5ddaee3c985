"""The steady-flow balance kernel of compressors, turbines, pumps and fans.

One set of equations and checks, used by the single-point API
(:func:`workbench.machines.energy_balance`) with :class:`~workbench.properties.State` objects and
floats, and by every batch (:func:`workbench.fieldtest.evaluate`) with
:class:`~workbench.properties.StateArray` objects and numpy arrays, one entry per row.

One inlet, one outlet, steady state.  Per unit mass, with power absorbed positive::

    w_in = (h2 - h1) + (V2^2 - V1^2) / 2 + g (z2 - z1) + q_loss

For a turbine the delivered specific work is ``-w_in``; results are positive magnitudes.
Isentropic efficiencies compare the actual enthalpy change with the isentropic one between
the same pressures (compression ``(h2s - h1) / (h2 - h1)``, expansion
``(h1 - h2) / (h1 - h2s)``), static-to-static or between stagnation states
(total-to-total); a turbine's total-to-static efficiency is ``(h01 - h02) / (h01 - h2s)``.

The kernel takes SI values that already passed the input boundary (:mod:`workbench.units`)
and states that already exist: it does no flash and raises nothing for a refused entry.
It reports a refusal code per entry instead (:data:`OK` where the entry is valid); the
single-point API turns a code into the project's error with :func:`refusal_error`, the batch
sends the rows with a code through the single-point API for their message.

References
----------
ASME PTC 10-1997, Performance Test Code on Compressors and Exhausters.
ASME PTC 6-2004, Steam Turbines (the energy balance for exhaust enthalpy from power).
S. L. Dixon, C. A. Hall, Fluid Mechanics and Thermodynamics of Turbomachinery, 7th ed.,
Butterworth-Heinemann 2014, chapter 2 (efficiency definitions).

Examples
--------
>>> import workbench as wb
>>> from workbench.machines import balance
>>> air = wb.Fluid("Air")
>>> inlet, outlet = air.state(P=1e5, T=300.0), air.state(P=2e5, T=380.0)
>>> iso = air.state(P=2e5, s=inlet.s)
>>> b = balance.steady_flow("compressor", inlet, outlet, iso, mass_flow=2.0)
>>> b.refusal == balance.OK, round(b.isentropic_efficiency, 3)
(True, 0.819)
"""

from __future__ import annotations

import math
from typing import NamedTuple

import numpy as np

from ..errors import InputError, ReadingsError, SpecificationError

#: Standard acceleration of gravity [m/s^2] (CGPM 1901).
STANDARD_GRAVITY = 9.80665

#: Machine kind -> True where the machine raises the pressure of the fluid.
RAISES_PRESSURE = {"compressor": True, "pump": True, "fan": True, "turbine": False}
#: Machine kinds.
KINDS = tuple(RAISES_PRESSURE)
#: Efficiency bases.
BASES = ("static", "total")

#: Relative pressure change below which there is nothing to rate a machine by [-].
PRESSURE_TOLERANCE = 1e-9
#: An efficiency up to 1 + this is taken as 1 (rounding of the property model) [-].
EFFICIENCY_TOLERANCE = 1e-9

# Refusal codes, in the order the checks apply (the first failed check is reported).
OK = 0
WRONG_DIRECTION = 1
NO_PRESSURE_CHANGE = 2
PUMP_INLET_NOT_LIQUID = 3
STATE_NOT_FOUND = 4
NO_WORK = 5
WRONG_ENTHALPY_SIDE = 6
EFFICIENCY_ABOVE_ONE = 7

#: Refusal code -> short description (messages with numbers: :func:`refusal_error`).
REFUSALS = {
    OK: "valid",
    WRONG_DIRECTION: "the outlet pressure is on the wrong side of the inlet pressure",
    NO_PRESSURE_CHANGE: "no pressure change",
    PUMP_INLET_NOT_LIQUID: "the pump inlet is not liquid",
    STATE_NOT_FOUND: "a state was not found by the property model",
    NO_WORK: "the specific work is not positive",
    WRONG_ENTHALPY_SIDE: "the isentropic efficiency is not positive",
    EFFICIENCY_ABOVE_ONE: "the isentropic efficiency is above 1",
}

_NOT_LIQUID = ("gas", "two-phase")


class Balance(NamedTuple):
    """Energy balance of one entry (floats) or many (arrays); SI units.

    Attributes
    ----------
    specific_work : float or numpy.ndarray
        Fluid work per unit mass, positive for the machine's own direction [J/kg].
    power : float or numpy.ndarray
        Fluid power [W].
    shaft_power : float or numpy.ndarray
        Power at the coupling after mechanical losses [W].
    enthalpy_change, kinetic_energy_change, potential_energy_change : float or numpy.ndarray
        h2 - h1, (V2^2 - V1^2)/2 and g (z2 - z1) [J/kg].
    specific_heat_loss : float or numpy.ndarray
        Heat loss per unit mass [J/kg].
    isentropic_efficiency_static, isentropic_efficiency_total : float or numpy.ndarray
        Static-to-static and total-to-total isentropic efficiencies [-].
    isentropic_efficiency_total_to_static : float or numpy.ndarray
        Total-to-static isentropic efficiency [-] (turbines; NaN for driven machines).
    isentropic_efficiency : float or numpy.ndarray
        The isentropic efficiency on the chosen basis [-].
    isentropic_head : float or numpy.ndarray
        |h2s - h1| on the chosen basis [J/kg].
    pressure_ratio : float or numpy.ndarray
        Higher over lower static pressure [-]: outlet over inlet for a compressor, pump or
        fan, inlet over outlet for a turbine (common practice).
    refusal : int or numpy.ndarray
        :data:`OK` (0) where the entry is valid, else the code of the first failed check.
    """

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
    isentropic_efficiency: float
    isentropic_head: float
    pressure_ratio: float
    refusal: int


def _first_refusal(checks, scalar):
    """Code of the first check that failed (``checks``: ``(code, ok)`` pairs in order)."""
    if scalar:
        for code, ok in checks:
            if not ok:
                return code
        return OK
    refusal = OK
    for code, ok in reversed(checks):  # earlier checks overwrite later ones
        refusal = np.where(ok, refusal, code)
    return np.asarray(refusal, dtype=np.int8)


def _ratio(numerator, denominator, scalar):
    """numerator / denominator, NaN where the denominator is zero."""
    if scalar:
        return numerator / denominator if denominator != 0 else math.nan
    with np.errstate(divide="ignore", invalid="ignore"):
        return np.where(denominator != 0, numerator / denominator, np.nan)


def pressure_checks(kind: str, P_in, P_out, inlet_phase) -> list:
    """The checks on the pressures and the inlet phase, as ``(code, ok)`` pairs in order.

    Parameters
    ----------
    kind : {"compressor", "turbine", "pump", "fan"}
        Machine kind.
    P_in, P_out : float or numpy.ndarray
        Inlet and outlet static pressure [Pa].
    inlet_phase : str or numpy.ndarray
        Phase words of the inlet state(s).
    """
    if not isinstance(P_in, np.ndarray) and not isinstance(P_out, np.ndarray):
        return _pressure_checks(kind, P_in, P_out, inlet_phase)
    with np.errstate(invalid="ignore"):
        return _pressure_checks(kind, P_in, P_out, inlet_phase)


def _pressure_checks(kind, P_in, P_out, inlet_phase):
    direction = P_out > P_in if RAISES_PRESSURE[kind] else P_out < P_in
    change = abs(P_out - P_in) > PRESSURE_TOLERANCE * P_in
    if kind != "pump":
        liquid = True
    elif isinstance(inlet_phase, np.ndarray):
        liquid = ~np.isin(inlet_phase, _NOT_LIQUID)
    else:
        liquid = inlet_phase not in _NOT_LIQUID
    return [(WRONG_DIRECTION, direction), (NO_PRESSURE_CHANGE, change),
            (PUMP_INLET_NOT_LIQUID, liquid)]


def pressure_refusal(kind: str, P_in, P_out, inlet_phase):
    """Refusal code of the pressure and inlet-phase checks alone (before any outlet exists).

    Same parameters as :func:`pressure_checks`.  Returns :data:`OK`, :data:`WRONG_DIRECTION`,
    :data:`NO_PRESSURE_CHANGE` or :data:`PUMP_INLET_NOT_LIQUID`, per entry.

    Examples
    --------
    >>> pressure_refusal("turbine", 40e5, 50e5, "gas") == WRONG_DIRECTION
    True
    """
    scalar = not isinstance(P_in, np.ndarray) and not isinstance(P_out, np.ndarray)
    return _first_refusal(pressure_checks(kind, P_in, P_out, inlet_phase), scalar)


def isentropic_efficiency(raises: bool, h_in, h_out, h_isentropic):
    """Isentropic efficiency [-] from enthalpies [J/kg]; NaN where undefined.

    Compression ``(h2s - h1) / (h2 - h1)``, expansion ``(h1 - h2) / (h1 - h2s)``.
    """
    scalar = not isinstance(h_in + h_out + h_isentropic, np.ndarray)
    return _efficiency(raises, h_in, h_out, h_isentropic, scalar)


def _efficiency(raises, h_in, h_out, h_isentropic, scalar):
    if raises:
        return _ratio(h_isentropic - h_in, h_out - h_in, scalar)
    return _ratio(h_in - h_out, h_in - h_isentropic, scalar)


def fluid_work_from_shaft(kind: str, shaft_power, mass_flow, mechanical_efficiency):
    """Work put into the fluid per unit mass, ``w_in`` [J/kg], from a measured shaft power [W].

    A driven machine gives the fluid ``eta_m P_shaft / m``; a turbine takes
    ``P_shaft / (eta_m m)`` from it (``w_in`` negative).
    """
    if RAISES_PRESSURE[kind]:
        return shaft_power * mechanical_efficiency / mass_flow
    return -shaft_power / (mechanical_efficiency * mass_flow)


def outlet_enthalpy_from_power(kind: str, h_in, shaft_power, mass_flow, mechanical_efficiency,
                               kinetic_energy_change=0.0, potential_energy_change=0.0,
                               specific_heat_loss=0.0):
    """Outlet static enthalpy [J/kg] from a measured shaft power: the balance solved for h2.

    ``h2 = h1 + w_in - (V2^2 - V1^2)/2 - g (z2 - z1) - q_loss`` (ASME PTC 6 approach for a
    wet exhaust).  Floats or arrays.
    """
    w_in = fluid_work_from_shaft(kind, shaft_power, mass_flow, mechanical_efficiency)
    return h_in + w_in - kinetic_energy_change - potential_energy_change - specific_heat_loss


def temperature_sensitivity(efficiency, cp_out, enthalpy_change):
    """Change of the isentropic efficiency per kelvin of outlet temperature [1/K].

    ``|d(eta)/dT2| = |eta cp2 / (h2 - h1)|`` for a rating from a measured outlet temperature;
    NaN where the outlet is two-phase (no cp) or the enthalpy change is zero.
    """
    scalar = not isinstance(efficiency * cp_out * enthalpy_change, np.ndarray)
    return abs(_ratio(efficiency * cp_out, enthalpy_change, scalar))


def steady_flow(kind: str, inlet, outlet, isentropic, *, mass_flow, velocity_in=0.0,
                velocity_out=0.0, elevation_change=0.0, heat_loss=0.0,
                mechanical_efficiency=1.0, basis: str = "static",
                stagnation=None) -> Balance:
    """Steady-flow energy balance of a machine between states that exist: the kernel.

    Parameters
    ----------
    kind : {"compressor", "turbine", "pump", "fan"}
        Machine kind.
    inlet, outlet, isentropic : State or StateArray
        Static inlet and outlet states and the isentropic outlet (outlet pressure at the inlet
        entropy).  StateArray entries that are not ``valid`` are refused
        (:data:`STATE_NOT_FOUND`).
    mass_flow : float or numpy.ndarray
        Mass flow [kg/s], positive.
    velocity_in, velocity_out : float or numpy.ndarray
        Flow velocities [m/s].
    elevation_change : float or numpy.ndarray
        Outlet elevation above the inlet [m].
    heat_loss : float or numpy.ndarray
        Heat lost to the surroundings [W] (positive out of the machine).
    mechanical_efficiency : float
        Mechanical efficiency [-] in (0, 1].
    basis : {"static", "total"}
        Basis of the reported ``isentropic_efficiency``, ``isentropic_head`` and of the checks.
    stagnation : tuple of State or StateArray, optional
        (inlet, outlet, isentropic) stagnation states, ``h0 = h + V^2/2`` at the static
        entropy, the last at the outlet stagnation pressure.  Needed when a velocity is not
        zero; without velocities the stagnation states are the static ones.

    Returns
    -------
    Balance
        Floats for State inputs, arrays for StateArray inputs.

    References
    ----------
    ASME PTC 10-1997; Dixon and Hall (2014), chapter 2.
    """
    if stagnation is None:
        if _any(velocity_in) or _any(velocity_out):
            raise SpecificationError("the stagnation states are needed when a velocity is given")
        stagnation = (inlet, outlet, isentropic)
    if not isinstance(inlet.h, np.ndarray):
        return _steady_flow(kind, inlet, outlet, isentropic, mass_flow, velocity_in,
                            velocity_out, elevation_change, heat_loss, mechanical_efficiency,
                            basis, stagnation, True)
    with np.errstate(invalid="ignore", divide="ignore"):
        return _steady_flow(kind, inlet, outlet, isentropic, mass_flow, velocity_in,
                            velocity_out, elevation_change, heat_loss, mechanical_efficiency,
                            basis, stagnation, False)


def _any(value) -> bool:
    return bool(np.any(value != 0)) if isinstance(value, np.ndarray) else value != 0


def _steady_flow(kind, inlet, outlet, isentropic, mass_flow, velocity_in, velocity_out,
                 elevation_change, heat_loss, mechanical_efficiency, basis, stagnation, scalar):
    raises = RAISES_PRESSURE[kind]
    inlet0, outlet0, isentropic0 = stagnation
    dh = outlet.h - inlet.h
    dke = (velocity_out * velocity_out - velocity_in * velocity_in) / 2
    g_dz = STANDARD_GRAVITY * elevation_change
    q = heat_loss / mass_flow
    w_in = dh + dke + g_dz + q  # first law, power absorbed positive
    work = w_in if raises else -w_in
    fluid_power = work * mass_flow
    shaft_power = (fluid_power / mechanical_efficiency if raises
                   else fluid_power * mechanical_efficiency)
    eff_static = _efficiency(raises, inlet.h, outlet.h, isentropic.h, scalar)
    if inlet0 is inlet and outlet0 is outlet and isentropic0 is isentropic:
        eff_total = eff_static  # no kinetic terms: stagnation and static states coincide
    else:
        eff_total = _efficiency(raises, inlet0.h, outlet0.h, isentropic0.h, scalar)
    if raises:
        eff_ts = math.nan if scalar else np.full(np.shape(dh), np.nan)
    else:  # total-to-static: the exhaust kinetic energy counted as a loss
        eff_ts = _ratio(inlet0.h - outlet0.h, inlet0.h - isentropic.h, scalar)
    if basis == "total":
        chosen, head = eff_total, abs(isentropic0.h - inlet0.h)
    else:
        chosen, head = eff_static, abs(isentropic.h - inlet.h)
    # quoted higher over lower pressure for every machine (common practice)
    ratio = outlet.P / inlet.P if raises else inlet.P / outlet.P
    checks = _pressure_checks(kind, inlet.P, outlet.P, inlet.phase)
    if not scalar:
        found = inlet.valid & outlet.valid & isentropic.valid
        if inlet0 is not inlet:
            found = found & inlet0.valid & outlet0.valid & isentropic0.valid
        checks.append((STATE_NOT_FOUND, found))
    checks += [(NO_WORK, work > 0), (WRONG_ENTHALPY_SIDE, chosen > 0),
               (EFFICIENCY_ABOVE_ONE, chosen <= 1 + EFFICIENCY_TOLERANCE)]
    return Balance(work, fluid_power, shaft_power, dh, dke, g_dz, q, eff_static, eff_total,
                   eff_ts, chosen, head, ratio, _first_refusal(checks, scalar))


def refusal_error(code: int, kind: str, inlet, P_out: float, *, basis: str = "static",
                  outlet=None, result: Balance | None = None):
    """The project's error for a refused single entry, or None where ``code`` is :data:`OK`.

    Parameters
    ----------
    code : int
        Refusal code of the entry (from :func:`pressure_refusal` or :func:`steady_flow`).
    kind : str
        Machine kind.
    inlet : State
        Static inlet state.
    P_out : float
        Outlet static pressure [Pa].
    basis : str
        Efficiency basis of the balance.
    outlet : State, optional
        Static outlet state (codes found by :func:`steady_flow`).
    result : Balance, optional
        The balance of the entry (codes found by :func:`steady_flow`).

    Returns
    -------
    InputError, ReadingsError or None
        The message names the reading or input, its value and what a ``kind`` needs.
    """
    if code == OK:
        return None
    raises = RAISES_PRESSURE[kind]
    P1 = inlet.P
    if code == WRONG_DIRECTION:
        side, verb = ("above", "raises") if raises else ("below", "lowers")
        return InputError(f"outlet pressure {P_out / 1e5:.6g} bar is not {side} inlet pressure "
                          f"{P1 / 1e5:.6g} bar: a {kind} {verb} pressure")
    if code == NO_PRESSURE_CHANGE:
        return InputError(
            f"outlet pressure {P_out / 1e5:.9g} bar equals the inlet pressure {P1 / 1e5:.9g} bar "
            f"to one part in a billion: there is no pressure change to rate a {kind} by")
    if code == PUMP_INLET_NOT_LIQUID:
        return InputError(f"the pump inlet is {inlet.fluid.name} {inlet.phase} at "
                          f"{inlet.T:.5g} K and {P1 / 1e5:.5g} bar: a pump needs liquid at its "
                          "inlet (use a compressor or fan for a gas)")
    if code == NO_WORK:
        return ReadingsError(
            f"the {kind} would {'absorb' if not raises else 'deliver'} power "
            f"({result.specific_work / 1e3:.6g} kJ/kg): the enthalpy change "
            f"{result.enthalpy_change / 1e3:.6g} kJ/kg, kinetic "
            f"{result.kinetic_energy_change / 1e3:.6g} kJ/kg and heat loss do not fit a "
            f"{kind}: check the readings")
    if code == WRONG_ENTHALPY_SIDE:
        return ReadingsError(
            f"the outlet enthalpy {outlet.h / 1e3:.6g} kJ/kg is not "
            f"{'above' if raises else 'below'} the inlet enthalpy {inlet.h / 1e3:.6g} kJ/kg: "
            f"a {kind} {'raises' if raises else 'lowers'} it: check the readings")
    if code == EFFICIENCY_ABOVE_ONE:
        return ReadingsError(
            f"the readings imply an isentropic efficiency of {result.isentropic_efficiency:.4f} "
            f"({basis} basis), above 1: check the readings (outlet temperature, pressures, "
            "power, flow and heat loss)")
    return ReadingsError(f"{REFUSALS.get(code, 'refused')}: check the readings")


__all__ = ["BASES", "Balance", "EFFICIENCY_ABOVE_ONE", "EFFICIENCY_TOLERANCE", "KINDS",
           "NO_PRESSURE_CHANGE", "NO_WORK", "OK", "PRESSURE_TOLERANCE",
           "PUMP_INLET_NOT_LIQUID", "RAISES_PRESSURE", "REFUSALS", "STANDARD_GRAVITY",
           "STATE_NOT_FOUND", "WRONG_DIRECTION", "WRONG_ENTHALPY_SIDE", "fluid_work_from_shaft",
           "isentropic_efficiency", "outlet_enthalpy_from_power", "pressure_checks",
           "pressure_refusal", "refusal_error", "steady_flow", "temperature_sensitivity"]
