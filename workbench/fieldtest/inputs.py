"""Input checks of the field-test functions (design point, uncertainty, steady state).

Thin wrappers over the project's one input boundary (:mod:`workbench.units`) for the two
things the field-test entries add: a shaft speed, kept in rev/min as the readings keep it,
and a value "in the reading's SI unit" whose kind depends on the reading it belongs to.

Examples
--------
>>> from workbench.units import Q_
>>> speed_rpm(Q_(50, "revolution/second"), "rated speed")
3000.0
>>> reading_value(Q_(2, "bar"), "inlet_pressure", "reading inlet_pressure")
200000.0
"""

from __future__ import annotations

import pint

from ..errors import InputError
from ..units import MAX_MAGNITUDE, to_si
from .readers import READING_KINDS


def _offset(value, name):
    if isinstance(value, pint.Quantity) and not value._is_multiplicative:
        raise InputError(f"{name} was given in {value.units:~P}, a unit with an offset: give a "
                         "difference (K, delta_degC, delta_degF) or an absolute value in K")


def speed_rpm(value, name: str, *, low=0.0, low_open=True) -> float:
    """A shaft speed [rev/min]: a plain number is taken as rev/min; a Quantity in rpm,
    rev/s or rad/s is converted (Hz is refused: pint reads it as rad/s, not rev/s)."""
    if isinstance(value, pint.Quantity):
        if "hertz" in str(value.units):
            raise InputError(f"{name} was given in Hz, which is ambiguous for a shaft speed: "
                             "give rpm or revolution/second")
        try:
            value = value.to("rpm").magnitude
        except pint.DimensionalityError:
            raise InputError(f"{name} was given in {value.units:~P}, which is not a unit of "
                             "rotational speed (rpm)") from None
        except (pint.PintError, TypeError, ValueError, OverflowError, ArithmeticError):
            raise InputError(f"{name} cannot be converted to rpm") from None
    return to_si(value, "dimensionless", name, low=low, low_open=low_open)


def any_si(value, name: str, **bounds) -> float:
    """A number in some SI unit not known here: a plain number as it is, a Quantity in its
    SI base units (offset units such as degC refused)."""
    _offset(value, name)
    if isinstance(value, pint.Quantity):
        try:
            value = value.to_base_units().magnitude
        except (pint.PintError, TypeError, ValueError, OverflowError, ArithmeticError):
            raise InputError(f"{name} cannot be converted to SI units") from None
    return to_si(value, "dimensionless", name, **bounds)


def reading_value(value, reading: str, name: str, *, difference: bool = False,
                  **bounds) -> float:
    """A value of the named reading in its SI unit (rev/min for the speed).

    ``difference``: the value is a difference or an uncertainty of the reading (temperatures
    then in K, offset units refused).  Readings not in READING_KINDS go through
    :func:`any_si`.
    """
    kind = READING_KINDS.get(reading, (None,))[0]
    if kind == "speed":
        return speed_rpm(value, name, low=bounds.get("low"), low_open=bounds.get(
            "low_open", False))
    if kind is None:
        return any_si(value, name, **bounds)
    if difference:
        _offset(value, name)
        kind = "temperature_difference" if kind == "temperature" else kind
    return to_si(value, kind, name, **bounds)


__all__ = ["MAX_MAGNITUDE", "any_si", "reading_value", "speed_rpm"]
