"""Shared input checks of the devices (throttle, nozzle, diffuser, mixer, splitter, heat
exchanger, cooler, pipe): one place for what every device validates.

The numeric checks are the project's one input boundary itself
(:mod:`workbench.units`: ``to_si``, ``positive``, ``not_negative``, ``fraction``,
``choice``), so every device refuses bool, text, None, NaN, infinity, overflow, arrays and
Quantities of the wrong dimension by the input's name.  What is added here is device
knowledge: a state argument must be a :class:`~workbench.properties.State`; an outlet pressure
must lie below the inlet's; a flow through a passage of a given diameter must give a
physical velocity; result dicts use the names of :data:`workbench.fields.FIELDS`.

Examples
--------
>>> from workbench.machines import checks
>>> checks.positive(2.5, "mass_flow", "pipe mass flow")
2.5
"""

from __future__ import annotations

import math
import re

from .. import units
from ..errors import InputError
from ..fields import FIELDS
from ..properties import State

#: Highest mean velocity [m/s] accepted when it is derived from a mass flow and a diameter.
#: Liquid lines run at a few m/s and gas lines at tens (common practice); a derived velocity
#: above this is a typing error in the flow or the diameter (1e-300 m, t/h taken as kg/s...).
MAX_PASSAGE_VELOCITY = 1000.0

#: Prefixes of stream-qualified result keys: ``hot_inlet_pressure`` is the field
#: ``inlet_pressure`` of the hot stream, ``stream_2_mass_flow`` the field ``mass_flow`` of a
#: mixer's second inlet stream, ``branch_1_split_fraction`` a splitter's first branch.
STREAM_PREFIX = re.compile(r"^(hot|cold|cooling_water|stream_\d+|branch_\d+)_(.+)$")

#: Text (not numeric) keys of a device's ``to_dict``.
TEXT_KEYS = ("device", "fluid", "hot_fluid", "cold_fluid")


def state(value, name: str) -> State:
    """``value`` itself when it is a State, else an InputError naming the input."""
    if not isinstance(value, State):
        raise InputError(f"{name} must be a State from Fluid.state(...), not "
                         f"{type(value).__name__}")
    return value


#: The numeric checks are the input boundary's own functions, under the names the devices
#: use: ``number`` is :func:`workbench.units.to_si`, ``optional`` is
#: :func:`workbench.units.optional_si`.
positive = units.positive
not_negative = units.not_negative
number = units.to_si
optional = units.optional_si
fraction = units.fraction
choice = units.choice


def below_inlet(device: str, P_out: float, inlet: State, reason: str) -> None:
    """Refuse an outlet pressure [Pa] that is not below the inlet's; ``reason`` ends it."""
    if not P_out < inlet.P:
        raise InputError(
            f"{device} outlet pressure {P_out / 1e5:.6g} bar is not below the inlet pressure "
            f"{inlet.P / 1e5:.6g} bar: {reason}")


def passage_velocity(mass_flow: float, density: float, diameter: float, name: str) -> float:
    """Mean velocity [m/s] of ``mass_flow`` [kg/s] through a round passage (continuity).

    ``V = m / (rho pi D^2 / 4)``; a velocity above :data:`MAX_PASSAGE_VELOCITY` is refused,
    naming the flow and the diameter (``name`` is the passage, e.g. "pipe").
    """
    velocity = mass_flow / (density * math.pi * diameter ** 2 / 4)
    if not velocity <= MAX_PASSAGE_VELOCITY:
        raise InputError(
            f"{name} mass flow {mass_flow:.6g} kg/s through the {name} diameter "
            f"{diameter:.6g} m gives a velocity of {velocity:.3g} m/s, above "
            f"{MAX_PASSAGE_VELOCITY:g} m/s: check the flow and the diameter (and their units)")
    return velocity


def quality(st: State) -> float:
    """Vapour quality [-] of a state, NaN when single-phase (``State.quality``)."""
    return st.quality


def field_key(key: str) -> str:
    """The :data:`~workbench.fields.FIELDS` name behind a result key (a stream prefix
    stripped); a KeyError names a key that is in neither form."""
    if key in FIELDS:
        return key
    match = STREAM_PREFIX.match(key)
    if match and match.group(2) in FIELDS:
        return match.group(2)
    raise KeyError(f"result key {key!r} is not a field of workbench.fields.FIELDS")


def result_dict(items) -> dict:
    """A device's ``to_dict``: ``(key, value)`` pairs whose keys are FIELDS names (or a
    stream prefix and a FIELDS name, see :data:`STREAM_PREFIX`) or text keys."""
    out = {}
    for key, value in items:
        if key not in TEXT_KEYS:
            field_key(key)
        out[key] = value
    return out


def state_items(prefix: str, st: State, names=("pressure", "temperature", "enthalpy",
                                               "quality")):
    """``(key, value)`` pairs of a state's properties, keys ``<prefix>_<name>``
    (``prefix`` "inlet" gives ``inlet_pressure``...; ``""`` gives ``pressure``...)."""
    values = {"pressure": st.P, "temperature": st.T, "enthalpy": st.h, "entropy": st.s,
              "density": st.rho, "quality": st.quality}
    return [(f"{prefix}_{n}" if prefix else n, values[n]) for n in names]


__all__ = ["MAX_PASSAGE_VELOCITY", "STREAM_PREFIX", "TEXT_KEYS", "below_inlet", "choice",
           "field_key", "fraction", "not_negative", "number", "optional", "passage_velocity",
           "positive", "quality", "result_dict", "state", "state_items"]
