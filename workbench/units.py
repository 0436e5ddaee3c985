"""Units: one pint registry for the whole project, conversion at the API boundary.

Inside the workbench every number is in SI base units (Pa, K, J/kg, J/(kg K), kg/s, W, m/s,
m).  Public functions accept either a plain float (taken as SI) or a pint Quantity, which is
converted here.  Display unit systems for the panels live here too.
"""

from __future__ import annotations

import math
import re
import sys
from dataclasses import dataclass

import numpy as np

# pint imports dask.base at import time when dask is installed (for pint Quantities wrapping
# dask arrays, which the workbench does not use); that costs the dashboards about half a
# second per kernel.  Hide dask from pint while pint loads, unless dask is already imported.
_HIDE_DASK = "dask" not in sys.modules
if _HIDE_DASK:
    sys.modules["dask"] = None  # type: ignore[assignment]  # makes "import dask" fail
try:
    import pint
finally:
    if _HIDE_DASK:
        del sys.modules["dask"]

from .errors import InputError  # noqa: E402  (after pint, see above)

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
    "temperature_difference": "K",
    "specific_energy": "J/kg",
    "specific_heat": "J/(kg*K)",
    "rotational_speed": "rad/s",
    "dynamic_viscosity": "Pa*s",
    "time": "s",
    "mass": "kg",
    "thermal_conductance": "W/K",
    "entropy_flow": "W/K",
    "joule_thomson_coefficient": "K/Pa",
    "per_kelvin": "1/K",
}


#: One revolution a minute in rad/s (NIST SP 811): speeds are typed in rpm, kept in rad/s.
RPM = 2.0 * math.pi / 60.0

#: A plain decimal number as typed in a table cell or written in a text file ("12", "-.5",
#: "3.2e5"); anything else in such a cell is refused or read as missing.
NUMBER_TEXT = re.compile(r"[-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?")


#: Largest magnitude of any SI input [SI unit].  Anything larger is no physical entry of this
#: trade and would overflow in use (squares of velocities, products with flows).
MAX_MAGNITUDE = 1e12
#: Smallest non-zero magnitude of any SI input: a value below it (1e-300 m) is a typing error
#: and would overflow when divided by.
MIN_MAGNITUDE = 1e-12


def _unit_words(kind: str) -> str:
    unit = SI_UNITS[kind]
    return f" {unit}" if unit else ""


def _describe(value) -> str:
    """Short, safe text of a value for a message (never its whole repr if huge)."""
    try:
        text = repr(value)
    except Exception:  # noqa: BLE001 - a hostile __repr__ must not escape
        text = f"a {type(value).__name__}"
    return text if len(text) <= 60 else text[:57] + "..."


def _magnitude(value, kind: str, name: str):
    """SI magnitude of a Quantity (any object) or the value itself."""
    if isinstance(value, pint.Quantity):
        unit = SI_UNITS[kind]
        try:
            return value.to(unit or "dimensionless").magnitude
        except pint.DimensionalityError:
            raise InputError(
                f"{name} was given in {value.units:~P}, which is not a unit of "
                f"{kind.replace('_', ' ')} ({unit or 'dimensionless'})") from None
        except (pint.PintError, TypeError, ValueError, OverflowError, ArithmeticError):
            raise InputError(f"{name} {_describe(value)} cannot be converted to "
                             f"{unit or 'a plain number'}") from None
    return value


def to_si(value, kind: str, name: str, *, low=None, high=None, low_open: bool = False,
          high_open: bool = False) -> float:
    """Convert one entry to an SI float, validated: the workbench's input boundary.

    Parameters
    ----------
    value : int, float, Decimal, numpy scalar or pint.Quantity
        A plain number is taken to be in SI units already.  Integers of any size are accepted
        (and refused by name if they overflow a float).
    kind : str
        Key of :data:`SI_UNITS` (e.g. ``"pressure"``); a Quantity's dimension is checked
        against it.
    name : str
        Name of the input, used in every error message.
    low, high : float, optional
        Allowed range in SI units; ``low_open``/``high_open`` exclude the end itself.

    Returns
    -------
    float
        The value in SI units.

    Raises
    ------
    InputError
        For bool, text, None, arrays, NaN, infinity, overflow, a wrong dimension, a magnitude
        outside [1e-12, 1e12] (SI) other than zero, or a value outside ``low``..``high``; the
        message names the input, the value and the allowed range.

    Examples
    --------
    >>> to_si(Q_(5, "bar"), "pressure", "inlet pressure")
    500000.0
    """
    magnitude = _magnitude(value, kind, name)
    if magnitude is None:
        raise InputError(f"{name} is missing: a number is needed")
    if isinstance(magnitude, (bool, np.bool_, str, bytes)):
        raise InputError(f"{name} must be a number, not {_describe(magnitude)}")
    if isinstance(magnitude, np.ndarray) and magnitude.ndim == 0:
        magnitude = magnitude[()]
    if isinstance(magnitude, (list, tuple, dict, set, np.ndarray)) or (
            hasattr(magnitude, "__len__") and not isinstance(magnitude, (int, float))):
        raise InputError(f"{name} must be a single number, not {_describe(magnitude)}")
    try:
        number = float(magnitude)
    except OverflowError:
        raise InputError(f"{name} {_describe(magnitude)}{_unit_words(kind)} is too large: the "
                         f"allowed magnitude is at most {MAX_MAGNITUDE:g}{_unit_words(kind)}"
                         ) from None
    except (TypeError, ValueError, ArithmeticError):
        raise InputError(f"{name} must be a number, not {_describe(magnitude)}") from None
    if not math.isfinite(number):
        raise InputError(f"{name} must be a finite number, not {number}")
    unit = _unit_words(kind)
    if abs(number) > MAX_MAGNITUDE:
        raise InputError(f"{name} {number:g}{unit} is too large: the allowed magnitude is at "
                         f"most {MAX_MAGNITUDE:g}{unit}")
    if number != 0 and abs(number) < MIN_MAGNITUDE:
        raise InputError(f"{name} {number:g}{unit} is too small to be meaningful: give 0 or a "
                         f"magnitude of at least {MIN_MAGNITUDE:g}{unit}")
    _check_range(number, name, unit, low, high, low_open, high_open)
    return number


def _check_range(number, name, unit, low, high, low_open, high_open):
    below = low is not None and (number <= low if low_open else number < low)
    above = high is not None and (number >= high if high_open else number > high)
    if below or above:
        lo = "" if low is None else ("(" if low_open else "[") + f"{low:g}"
        hi = "" if high is None else f"{high:g}" + (")" if high_open else "]")
        if low is not None and high is not None:
            allowed = f"{lo}, {hi}"
        elif low is not None:
            allowed = ("above " if low_open else "at least ") + f"{low:g}"
        else:
            allowed = ("below " if high_open else "at most ") + f"{high:g}"
        raise InputError(f"{name} {number:g}{unit} is outside the allowed range {allowed}{unit}")


def optional_si(value, kind: str, name: str, **bounds):
    """Like :func:`to_si` but passes ``None`` through."""
    return None if value is None else to_si(value, kind, name, **bounds)


def positive(value, kind: str, name: str) -> float:
    """:func:`to_si` for a quantity that must be above zero (a flow, a diameter...)."""
    return to_si(value, kind, name, low=0.0, low_open=True)


def not_negative(value, kind: str, name: str) -> float:
    """:func:`to_si` for a quantity that must not be below zero (a velocity magnitude...)."""
    return to_si(value, kind, name, low=0.0)


def fraction(value, name: str, *, allow_zero: bool = False) -> float:
    """A dimensionless fraction in (0, 1] (or [0, 1] with ``allow_zero``), e.g. an efficiency."""
    return to_si(value, "dimensionless", name, low=0.0, high=1.0, low_open=not allow_zero)


def count(value, name: str, *, low: int = 1, high: int | None = None) -> int:
    """A whole number (int, numpy integer or an integral float) within [low, high]."""
    if isinstance(value, (bool, np.bool_)) or value is None or isinstance(value, (str, bytes)):
        raise InputError(f"{name} must be a whole number, not {_describe(value)}")
    number = to_si(value, "dimensionless", name)
    if number != int(number):
        raise InputError(f"{name} must be a whole number, not {number:g}")
    _check_range(number, name, "", low, high, False, False)
    return int(number)


def flag(value, name: str) -> bool:
    """A yes/no option: only ``True`` or ``False`` (numpy bools too) are accepted."""
    if isinstance(value, (bool, np.bool_)):
        return bool(value)
    raise InputError(f"{name} must be True or False, not {_describe(value)}")


def choice(value, options, name: str) -> str:
    """One of a fixed set of option strings; anything else is refused by name.

    Examples
    --------
    >>> choice("total", ("static", "total"), "efficiency basis")
    'total'
    """
    options = tuple(options)
    if not isinstance(value, str) or value not in options:
        raise InputError(f"{name} must be one of {', '.join(repr(o) for o in options)}, not "
                         f"{_describe(value)}")
    return value


def text(value, name: str, *, max_length: int = 200) -> str:
    """A short piece of text (a name, a label): no control characters, bounded length."""
    if not isinstance(value, str):
        raise InputError(f"{name} must be text, not {_describe(value)}")
    if len(value) > max_length:
        raise InputError(f"{name} is {len(value)} characters long: at most {max_length} allowed")
    if any(ord(c) < 32 and c not in "\t" for c in value):
        raise InputError(f"{name} {_describe(value)} contains control characters")
    return value


_UNIT_TEXT = re.compile(r"^[A-Za-z0-9_ .*/^()%-]{1,40}$")


def parse_unit(unit_text, kind: str, name: str):
    """Parse a unit written as text (``"bar"``, ``"m**3/h"``, ``"degC"``) safely.

    The text is checked against a short character set before pint sees it (pint evaluates unit
    expressions) and its dimension against ``kind``.

    Returns
    -------
    pint.Unit
    """
    if not isinstance(unit_text, str) or not _UNIT_TEXT.match(unit_text.strip() or "?"):
        raise InputError(f"unit of {name} {_describe(unit_text)} is not a unit text (letters, "
                         "digits and * / ^ ( ) . - only, at most 40 characters)")
    try:
        unit = ureg.parse_units(unit_text.strip().replace("^", "**"))
    except Exception:  # noqa: BLE001 - pint raises many kinds (TokenError, UndefinedUnitError...)
        raise InputError(f"unit of {name} {unit_text!r} is not a unit pint knows") from None
    target = SI_UNITS[kind] or "dimensionless"
    if unit.dimensionality != ureg.parse_units(target).dimensionality:
        raise InputError(f"unit of {name} {unit_text!r} is not a unit of "
                         f"{kind.replace('_', ' ')} ({target})")
    return unit


def to_si_array(values, kind: str, name: str, *, allow_nan: bool = True) -> np.ndarray:
    """Convert a sequence, array or array Quantity to a 1-D SI float array, validated.

    NaN marks a missing reading and is kept when ``allow_nan``; infinity, text and values of
    magnitude above :data:`MAX_MAGNITUDE` are refused by name.
    """
    values = _magnitude(values, kind, name)
    if values is None or isinstance(values, (str, bytes, bool, dict, set)):
        raise InputError(f"{name} must be a sequence of numbers, not {_describe(values)}")
    try:
        array = np.asarray(values, dtype=float)
    except (TypeError, ValueError, OverflowError):
        raise InputError(f"{name} must be a sequence of numbers, not {_describe(values)}"
                         ) from None
    if array.ndim == 0:
        array = array.reshape(1)
    if array.ndim != 1:
        raise InputError(f"{name} must be a flat sequence of numbers, not an array of shape "
                         f"{array.shape}")
    bad = np.isinf(array) | (np.abs(np.nan_to_num(array)) > MAX_MAGNITUDE)
    if not allow_nan:
        bad |= np.isnan(array)
    if bad.any():
        i = int(np.flatnonzero(bad)[0])
        raise InputError(f"{name} entry {i} ({array[i]}) must be a finite number of magnitude "
                         f"at most {MAX_MAGNITUDE:g}{_unit_words(kind)}")
    return array


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


as_array = to_si_array
