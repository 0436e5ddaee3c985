"""Fluid names and compositions: what a :class:`~workbench.properties.Fluid` is made of.

Names are the property library's fluid names (and its aliases); a composition is a dict of
names and mole or mass fractions.  Everything a user types passes the input boundary of
:mod:`workbench.units` here, so a bad name or fraction is refused by name.

References
----------
I. H. Bell et al., Ind. Eng. Chem. Res. 53 (2014) 2498-2508 (CoolProp's fluid list).
"""

from __future__ import annotations

import CoolProp.CoolProp as CP

from ..errors import InputError
from ..units import choice, text, to_si

#: Most components a composition may have (a detailed natural-gas analysis has about 21).
MAX_COMPONENTS = 24

#: Fraction bases of a composition.
BASES = ("mole", "mass")

_FLUID_LIST = sorted(CP.get_global_param_string("FluidsList").split(","))


def available_fluids() -> list[str]:
    """Names of the pure and pseudo-pure fluids the property library knows, sorted.

    Examples
    --------
    >>> "Water" in available_fluids()
    True
    """
    return list(_FLUID_LIST)


def canonical_name(name, what: str = "fluid name") -> str:
    """The property library's name of a fluid, accepting its aliases.

    Parameters
    ----------
    name : str
        A fluid name or alias (``"Water"``, ``"R134a"``, ``"CO2"``).
    what : str
        Name of the input in messages.

    Raises
    ------
    InputError
        For non-text, empty, overlong or unknown names.

    Examples
    --------
    >>> canonical_name("CO2")
    'CarbonDioxide'
    """
    key = text(name, what, max_length=60).strip()
    if not key or not all(c.isalnum() or c in "-_(), ." for c in key):
        raise InputError(f"{what} {name!r} is not a fluid name: use a property-library fluid "
                         "name such as Water, Air, Nitrogen, CarbonDioxide, Methane, R134a")
    try:
        return CP.get_fluid_param_string(key, "name")
    except Exception:  # noqa: BLE001 - the library raises ValueError or RuntimeError
        raise InputError(
            f"unknown fluid {name!r}: use a property-library fluid name such as Water, Air, "
            "Nitrogen, CarbonDioxide, Methane, R134a (see workbench.available_fluids())"
        ) from None


def _fractions(composition) -> list[tuple]:
    """(name as given, fraction) pairs of a composition, each fraction in [0, 1]."""
    if not isinstance(composition, dict):
        raise InputError(f"a composition must be a dict of fluid names and fractions, not "
                         f"{type(composition).__name__}")
    if not composition:
        raise InputError("composition is empty: give at least one component")
    if len(composition) > MAX_COMPONENTS:
        raise InputError(f"composition has {len(composition)} components: at most "
                         f"{MAX_COMPONENTS} are supported")
    pairs = []
    for key, value in composition.items():
        label = text(key, "component name of the composition", max_length=60)
        pairs.append((label, to_si(value, "dimensionless", f"fraction of {label}",
                                   low=0.0, high=1.0)))
    return pairs


def normalise_fractions(composition: dict) -> dict:
    """Scale fractions so they sum to exactly 1 (a convenience for editors and panels).

    Parameters
    ----------
    composition : dict
        Fluid names and fractions (any positive scale, e.g. percent).

    Raises
    ------
    InputError
        For a non-dict, an empty dict, a negative or non-numeric fraction, or a zero sum.

    Examples
    --------
    >>> normalise_fractions({"Methane": 90, "Ethane": 10})
    {'Methane': 0.9, 'Ethane': 0.1}
    """
    if not isinstance(composition, dict) or not composition:
        raise InputError("a composition must be a non-empty dict of fluid names and fractions")
    if len(composition) > MAX_COMPONENTS:
        raise InputError(f"composition has {len(composition)} components: at most "
                         f"{MAX_COMPONENTS} are supported")
    values = {}
    for key, value in composition.items():
        label = text(key, "component name of the composition", max_length=60)
        values[label] = to_si(value, "dimensionless", f"fraction of {label}", low=0.0)
    total = sum(values.values())
    if total <= 0:
        raise InputError(f"composition fractions sum to {total}; they must be positive")
    return {k: v / total for k, v in values.items()}


def parse_spec(spec, basis: str = "mole") -> tuple[tuple[str, ...], tuple[float, ...]]:
    """Components and mole fractions of a fluid specification.

    Parameters
    ----------
    spec : str or dict
        A fluid name, or a composition ``{"Methane": 0.9, "Ethane": 0.1}`` whose fractions sum
        to 1 within 1e-6 (zero fractions are dropped).
    basis : {"mole", "mass"}
        Basis of the fractions of a composition.

    Returns
    -------
    names : tuple of str
        The property library's component names.
    fractions : tuple of float
        Mole fractions [-], summing to 1.

    Raises
    ------
    InputError
        Non-text, non-dict specifications, unknown names, bad fractions, a component given
        twice, an empty composition or too many components.

    Examples
    --------
    >>> parse_spec({"Methane": 0.5, "Nitrogen": 0.5})
    (('Methane', 'Nitrogen'), (0.5, 0.5))
    """
    basis = choice(basis, BASES, "fraction basis")
    if isinstance(spec, str):
        return (canonical_name(spec),), (1.0,)
    if not isinstance(spec, dict):
        raise InputError(f"a fluid is given by a name (text) or a composition (dict), not "
                         f"{type(spec).__name__}")
    names, fractions = [], []
    for key, fraction in _fractions(spec):
        canonical = canonical_name(key, "component name")
        if fraction == 0:
            continue
        if canonical in names:
            raise InputError(f"component {key} appears twice in the composition")
        names.append(canonical)
        fractions.append(fraction)
    total = sum(fractions)
    if abs(total - 1.0) > 1e-6:
        raise InputError(
            f"composition fractions sum to {total:.6g}; they must sum to 1 "
            "(normalise them with workbench.normalise_fractions)")
    fractions = [f / total for f in fractions]
    if basis == "mass":
        molar = [CP.PropsSI("M", n) for n in names]
        moles = [f / m for f, m in zip(fractions, molar)]
        fractions = [n / sum(moles) for n in moles]
    return tuple(names), tuple(fractions)
