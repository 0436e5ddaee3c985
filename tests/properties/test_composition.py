"""Fluid specifications: names, compositions and their refusals at the input boundary.

References
----------
* Ideal-gas law at low pressure (closed form); molar masses from memory (CIAAW values).
"""

import math
from decimal import Decimal

import numpy as np
import pytest

import workbench as wb
from workbench.errors import InputError
from workbench.properties.composition import MAX_COMPONENTS, canonical_name, parse_spec


def test_mixture_low_pressure_ideal_gas():
    # Closed form: ideal-gas law rho = P M / (R T) at 1 kPa, where Z - 1 < 1e-4.
    gas = wb.Fluid({"Methane": 0.9, "Ethane": 0.1})
    st = gas.state(P=1e3, T=300.0)
    M = 0.9 * 16.0425e-3 + 0.1 * 30.069e-3  # molar masses [kg/mol], from memory (CIAAW values)
    assert st.rho == pytest.approx(1e3 * M / (8.314462618 * 300.0), rel=2e-4)


def test_mass_fraction_basis():
    gas = wb.Fluid({"Methane": 0.5, "Nitrogen": 0.5}, basis="mass")
    # mole fraction of methane = (0.5/16.04)/(0.5/16.04 + 0.5/28.01), molar masses from memory
    expected = (0.5 / 16.0425) / (0.5 / 16.0425 + 0.5 / 28.0134)
    assert dict(zip(gas.components, gas.fractions))["Methane"] == pytest.approx(expected, rel=1e-4)


def test_fractions_of_any_number_type_are_accepted():
    # Common practice: a composition typed as Decimal, numpy or integer numbers is the same gas.
    plain = wb.Fluid({"Methane": 0.9, "Ethane": 0.1})
    assert wb.Fluid({"Methane": Decimal("0.9"), "Ethane": np.float64(0.1)}) == plain
    assert wb.Fluid({"Methane": 1, "Ethane": 0}) == wb.Fluid("Methane")
    assert canonical_name("CO2") == "CarbonDioxide"  # an alias of the property library


@pytest.mark.parametrize("spec, word", [
    ("Unobtainium", "unknown fluid"),
    ({"Methane": 0.5, "Ethane": 0.4}, "sum"),
    ({"Methane": 1.5}, "fraction of Methane"),
    ({}, "empty"),
    (42, "name .text. or a composition"),
    (None, "name .text. or a composition"),
    (["Methane"], "name .text. or a composition"),
    (b"Water", "name .text. or a composition"),
    (True, "name .text. or a composition"),
    ("", "fluid name"),
    ("Water&Ethanol", "fluid name"),  # a mixture string must not pass as a pure fluid
    ("HEOS::Water", "fluid name"),
    ("W" * 500, "fluid name"),
    ("Wa\x00ter", "fluid name"),
    ({"Methane": "0.5", "Ethane": 0.5}, "fraction of Methane"),
    ({"Methane": None, "Ethane": 1.0}, "fraction of Methane"),
    ({"Methane": -0.1, "Ethane": 1.1}, "fraction of Methane"),
    ({"Methane": math.nan, "Ethane": 1.0}, "fraction of Methane"),
    ({"Methane": math.inf, "Ethane": 1.0}, "fraction of Methane"),
    ({"Methane": 10 ** 400, "Ethane": 1.0}, "fraction of Methane"),
    ({"Methane": 1e300, "Ethane": 1.0}, "fraction of Methane"),
    ({"Methane": True}, "fraction of Methane"),
    ({"Methane": [0.5], "Ethane": 0.5}, "fraction of Methane"),
    ({"Methane": wb.Q_(0.5, "m"), "Ethane": 0.5}, "fraction of Methane"),
    ({1: 0.5, "Ethane": 0.5}, "component name"),
    ({"Methane": 0.5, "Unobtainium": 0.5}, "unknown fluid"),
    ({"Methane": 0.5, "CH4": 0.5}, "twice"),
    ({f"Methane{i}": 1.0 / 30 for i in range(30)}, "at most"),
])
def test_bad_fluids_refused(spec, word):
    # Source: the input boundary's rules (workbench.units): refusals name the input.
    with pytest.raises(InputError, match=word):
        wb.Fluid(spec)


@pytest.mark.parametrize("kwargs, word", [
    (dict(backend="REFPROP"), "backend"),
    (dict(backend=None), "backend"),
    (dict(backend=1), "backend"),
    (dict(basis="volume"), "fraction basis"),
    (dict(basis=True), "fraction basis"),
])
def test_bad_options_refused(kwargs, word):
    with pytest.raises(InputError, match=word):
        wb.Fluid({"Methane": 0.9, "Ethane": 0.1}, **kwargs)


def test_if97_only_for_water():
    with pytest.raises(InputError, match="IF97"):
        wb.Fluid("Air", backend="IF97")


def test_too_many_components_limit_is_a_natural_gas_analysis():
    # Common practice: an extended natural-gas analysis lists about 21 components.
    assert MAX_COMPONENTS >= 21
    names, fractions = parse_spec({"Methane": 0.5, "Nitrogen": 0.5})
    assert names == ("Methane", "Nitrogen") and sum(fractions) == pytest.approx(1.0, abs=1e-15)


def test_normalise_fractions():
    # Closed form: each fraction divided by the sum.
    assert wb.normalise_fractions({"Methane": 90, "Ethane": 10}) == pytest.approx(
        {"Methane": 0.9, "Ethane": 0.1})
    for bad, word in (({}, "non-empty"), ("Methane", "non-empty"), ({"Methane": -1}, "Methane"),
                      ({"Methane": 0}, "positive"), ({"Methane": "x"}, "Methane"),
                      ({"Methane": math.nan}, "Methane")):
        with pytest.raises(InputError, match=word):
            wb.normalise_fractions(bad)
