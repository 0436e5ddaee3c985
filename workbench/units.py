"""Units: one pint registry for the whole project, conversion at the API boundary.

Inside the workbench every number is in SI base units (Pa, K, J/kg, J/(kg K), kg/s, W, m/s,
m).  Public functions accept either a plain float (taken as SI) or a pint Quantity, which is
converted here.  Display unit systems for the panels live here too.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np
import pint

from .errors import InputError

ureg = pint.UnitRegistry()
ureg.define("percent_ = 0.01 = pct")
Q_ = ureg.Quantity

#: SI unit of each kind of quantity the workbench uses.
SI_UNITS = {
    "pressure": "Pa",
    "temperature": "K",
    "specific_enthalpy": "J/kg",
    "specific_entropy": "J/(kg*K)",
    "mass_flow": "kg/s",
    "volume_flow": "m**3/s",
    "power": "W",
    "velocity": "m/s",
    "length": "m",
    "area": "m**2",
    "density": "kg/m**3",
    "dimensionless": "",
    "heat_flow": "W",
}


def to_si(value, kind: str, name: str) -> float:
    """Convert a float or pint Quantity to an SI float.

    Parameters
    ----------
    value : float or pint.Quantity
        A plain number is taken to be in SI units already.
    kind : str
        Key of :data:`SI_UNITS` (e.g. ``"pressure"``).
    name : str
        Name of the input, used in error messages.

    Returns
    -------
    float
        The value in SI units.

    Raises
    ------
    InputError
        If the value is not a number, is not finite, or has the wrong dimension.
    """
    unit = SI_UNITS[kind]
    if isinstance(value, pint.Quantity):
        try:
            if unit == "":
                magnitude = value.to("dimensionless").magnitude
            else:
                magnitude = value.to(unit).magnitude
        except pint.DimensionalityError:
            raise InputError(
                f"{name} was given in {value.units:~P}, which is not a unit of {kind.replace('_', ' ')}"
            ) from None
    else:
        magnitude = value
    if isinstance(magnitude, (bool, str, bytes)):
        raise InputError(f"{name} must be a number, not {magnitude!r}")
    try:
        number = float(magnitude)
    except (TypeError, ValueError):
        raise InputError(f"{name} must be a number, not {magnitude!r}") from None
    if not math.isfinite(number):
        raise InputError(f"{name} must be a finite number, not {number}")
    return number


def optional_si(value, kind: str, name: str):
    """Like :func:`to_si` but passes ``None`` through."""
    return None if value is None else to_si(value, kind, name)


@dataclass(frozen=True)
class UnitSystem:
    """A display unit system for panels: one unit per kind of quantity.

    Pressures may be shown as gauge pressures against a stated ambient pressure.
    """

    name: str
    units: dict
    gauge: bool = False

    def unit(self, kind: str) -> str:
        """Display unit of a kind of quantity."""
        return self.units.get(kind, SI_UNITS[kind])

    def from_si(self, value: float, kind: str, ambient_pressure: float = 101325.0) -> float:
        """Convert an SI value to this system's display unit."""
        if value is None or (isinstance(value, float) and math.isnan(value)):
            return float("nan")
        if kind == "pressure" and self.gauge:
            value = value - ambient_pressure
        return _convert(value, SI_UNITS[kind], self.unit(kind), kind)

    def to_si(self, value: float, kind: str, ambient_pressure: float = 101325.0) -> float:
        """Convert a value in this system's display unit to SI."""
        si = _convert(value, self.unit(kind), SI_UNITS[kind], kind)
        if kind == "pressure" and self.gauge:
            si = si + ambient_pressure
        return si


def _convert(value, from_unit, to_unit, kind):
    if kind == "temperature":
        return Q_(value, ureg(from_unit).units if from_unit else "").to(to_unit).magnitude
    if from_unit == to_unit:
        return value
    return (value * ureg(from_unit)).to(to_unit).magnitude if from_unit else value


def _make_systems():
    si = {
        "pressure": "Pa", "temperature": "K", "specific_enthalpy": "J/kg",
        "specific_entropy": "J/(kg*K)", "mass_flow": "kg/s", "volume_flow": "m**3/s",
        "power": "W", "velocity": "m/s", "length": "m", "density": "kg/m**3",
        "heat_flow": "W", "area": "m**2", "dimensionless": "",
    }
    metric = dict(si)
    metric.update({
        "pressure": "bar", "temperature": "degC", "specific_enthalpy": "kJ/kg",
        "specific_entropy": "kJ/(kg*K)", "volume_flow": "m**3/h", "power": "kW",
        "length": "mm", "heat_flow": "kW",
    })
    us = dict(si)
    us.update({
        "pressure": "psi", "temperature": "degF", "specific_enthalpy": "Btu/lb",
        "specific_entropy": "Btu/(lb*degR)", "mass_flow": "lb/s", "volume_flow": "ft**3/min",
        "power": "hp", "velocity": "ft/s", "length": "inch", "density": "lb/ft**3",
        "heat_flow": "Btu/h", "area": "ft**2",
    })
    return {
        "SI": UnitSystem("SI", si),
        "bar, degC": UnitSystem("bar, degC", metric),
        "bar(g), degC": UnitSystem("bar(g), degC", metric, gauge=True),
        "US customary": UnitSystem("US customary", us),
        "psig, degF": UnitSystem("psig, degF", us, gauge=True),
    }


#: Display unit systems offered by the panels, by name.
UNIT_SYSTEMS = _make_systems()


def as_array(values, kind: str, name: str) -> np.ndarray:
    """Convert an array-like or array Quantity to an SI float array."""
    if isinstance(values, pint.Quantity):
        try:
            values = values.to(SI_UNITS[kind]).magnitude
        except pint.DimensionalityError:
            raise InputError(f"{name} has the wrong unit for {kind}") from None
    return np.asarray(values, dtype=float)
