"""Flow conversion and standard reference conditions (workbench.machines.flows).

References
----------
* ISO 13443:1996: standard reference conditions 15 degC (288.15 K) and 101.325 kPa.
* Ideal gas rho = P / (R T); air has Z = 0.9996 at 15 degC and 1 atm (from memory) and
  M = 28.9647 g/mol (from memory); R = 8.314462618 J/(mol K) (CODATA 2018).
* Continuity m = rho V A, A = pi D^2 / 4 (common practice).
"""

import math

import numpy as np
import pytest

import workbench as wb
from workbench.errors import InputError
from workbench.machines import flows


def test_standard_conditions_are_iso_13443():
    assert flows.STANDARD_CONDITIONS == (288.15, 101325.0)  # 15 degC, 101.325 kPa
    from workbench.fieldtest import STANDARD_CONDITIONS

    assert STANDARD_CONDITIONS is flows.STANDARD_CONDITIONS  # defined once


def test_standard_density_of_air_ideal_gas():
    rho_ideal = 101325.0 / (8.314462618 / 0.0289647 * 288.15)
    assert flows.standard_density(wb.Fluid("Air")) == pytest.approx(rho_ideal / 0.9996, rel=3e-4)


def test_standard_volume_flow_is_for_gases():
    # Water is liquid at 15 degC and 1 atm (common practice): no standard volume flow
    with pytest.raises(InputError, match="standard volume flow is for gases"):
        flows.standard_density(wb.Fluid("Water"))


def test_mass_flow_from_each_kind_floats_and_arrays():
    # m = Q rho (definition)
    assert flows.mass_flow_from("mass_flow", 3.0) == 3.0
    assert flows.mass_flow_from("volume_flow", 2.0, inlet_density=1.5) == 3.0
    assert flows.mass_flow_from("standard_volume_flow", 4.0, standard_density=0.75) == 3.0
    np.testing.assert_allclose(
        flows.mass_flow_from("volume_flow", np.array([1.0, 2.0]), np.array([3.0, 4.0])),
        [3.0, 8.0])
    with pytest.raises(InputError, match="flow kind"):
        flows.mass_flow_from("mass", 1.0)
    with pytest.raises(InputError, match="standard density"):
        flows.mass_flow_from("standard_volume_flow", 1.0)


def test_velocity_from_diameter_continuity():
    assert flows.velocity_from_diameter(3.0, 1.2, 0.25) == pytest.approx(
        3.0 / (1.2 * math.pi * 0.25 ** 2 / 4), rel=1e-15)
