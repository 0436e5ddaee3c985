"""Flow quantities: mass flow from a measured flow of any kind, velocity from continuity.

A flow reading is a mass flow, an actual volume flow at inlet conditions, or a standard
volume flow referred to the standard reference conditions :data:`STANDARD_CONDITIONS`
(15 degC, 101.325 kPa, ISO 13443) at the real-gas density of the fluid there.  Everything
that converts a flow (the single-point panels, the field-test batch, the readings files)
does it here.  Floats or numpy arrays.

References
----------
ISO 13443:1996, Natural gas - Standard reference conditions (15 degC, 101.325 kPa).

Examples
--------
>>> mass_flow_from("volume_flow", 2.0, inlet_density=1.2)
2.4
>>> STANDARD_CONDITIONS
(288.15, 101325.0)
"""

from __future__ import annotations

import math

from ..errors import InputError
from ..units import choice

#: Standard reference temperature of a standard volume flow [K]: 15 degC (ISO 13443).
STANDARD_TEMPERATURE = 288.15
#: Standard reference pressure of a standard volume flow [Pa]: 101.325 kPa (ISO 13443),
#: the standard atmosphere.
STANDARD_PRESSURE = 101325.0
#: (temperature [K], pressure [Pa]) of a standard volume flow.
STANDARD_CONDITIONS = (STANDARD_TEMPERATURE, STANDARD_PRESSURE)

#: Kinds of flow reading.
FLOW_KINDS = ("mass_flow", "volume_flow", "standard_volume_flow")


def standard_density(fluid, conditions=STANDARD_CONDITIONS) -> float:
    """Density of a gas at the standard reference conditions [kg/m^3].

    Parameters
    ----------
    fluid : Fluid
        The gas.
    conditions : tuple of float
        (temperature [K], pressure [Pa]); default 15 degC and 101.325 kPa (ISO 13443).

    Raises
    ------
    InputError
        When the fluid is not a gas there (a standard volume flow is for gases).

    Examples
    --------
    >>> import workbench as wb
    >>> round(standard_density(wb.Fluid("Air")), 4)
    1.2255
    """
    temperature, pressure = conditions
    state = fluid.state_PT(float(pressure), float(temperature))
    if state.phase not in ("gas", "supercritical"):
        raise InputError(f"standard volume flow is for gases: {fluid.name} is {state.phase} at "
                         f"{temperature - 273.15:.6g} degC and {pressure / 1e5:.6g} bar; give "
                         "the mass flow")
    return state.rho


def mass_flow_from(kind: str, value, inlet_density=None, standard_density=None):
    """Mass flow [kg/s] from a flow reading of the given kind.

    Parameters
    ----------
    kind : {"mass_flow", "volume_flow", "standard_volume_flow"}
        What ``value`` is.
    value : float or numpy.ndarray
        Mass flow [kg/s] or volume flow [m^3/s].
    inlet_density : float or numpy.ndarray, optional
        Density at the inlet [kg/m^3], for an actual volume flow.
    standard_density : float, optional
        Density at the standard reference conditions [kg/m^3] (:func:`standard_density`), for
        a standard volume flow.

    Returns
    -------
    float or numpy.ndarray
        m = Q rho.

    Examples
    --------
    >>> mass_flow_from("standard_volume_flow", 10.0, standard_density=0.7)
    7.0
    """
    kind = choice(kind, FLOW_KINDS, "flow kind")
    if kind == "mass_flow":
        return value
    density = inlet_density if kind == "volume_flow" else standard_density
    if density is None:
        needed = "inlet density" if kind == "volume_flow" else "standard density"
        raise InputError(f"a {kind.replace('_', ' ')} needs the {needed}")
    return value * density


def velocity_from_diameter(mass_flow, density, diameter):
    """Mean flow velocity [m/s] from continuity: V = m / (rho pi D^2 / 4).

    Parameters
    ----------
    mass_flow : float or numpy.ndarray
        Mass flow [kg/s].
    density : float or numpy.ndarray
        Density [kg/m^3].
    diameter : float or numpy.ndarray
        Flow diameter [m].

    Examples
    --------
    >>> round(velocity_from_diameter(1.0, 1.0, 1.0), 4)
    1.2732
    """
    return mass_flow / (density * math.pi * diameter ** 2 / 4.0)


__all__ = ["FLOW_KINDS", "STANDARD_CONDITIONS", "STANDARD_PRESSURE", "STANDARD_TEMPERATURE",
           "mass_flow_from", "standard_density", "velocity_from_diameter"]
