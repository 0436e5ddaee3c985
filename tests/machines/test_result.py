"""MachineResult (workbench.machines.result): its export reads the one table of fields.

References
----------
* Ideal-gas closed form for the numbers checked: air compressed 1 -> 2 bar at an isentropic
  efficiency of 0.8 (T2s = T1 (P2/P1)^((k-1)/k), k = 1.4 from memory).
* Standard gravity 9.80665 m/s^2 (CGPM 1901) for the pump head.
"""

import math

import pytest

import workbench as wb
from workbench.fields import FIELDS, headers
from workbench.machines.result import RESULT_FIELDS

AIR = wb.Fluid("Air")


@pytest.fixture(scope="module")
def result():
    return wb.compressor(AIR.state(P=1e5, T=300.0), P_out=2e5, isentropic_efficiency=0.8,
                         mass_flow=2.0)


def test_to_dict_keys_are_field_names(result):
    d = result.to_dict()
    assert list(d)[:4] == ["kind", "basis", "fluid", "rated_from"]
    numbers = list(d)[4:]
    assert numbers == list(RESULT_FIELDS)
    assert set(numbers) <= set(FIELDS)  # every number is described once, in FIELDS
    assert not any(key.endswith(("_W", "_Pa", "_K", "_per_kg", "_per_s")) for key in d)
    for key in numbers:
        value = getattr(result, key)
        assert d[key] == value or (math.isnan(d[key]) and math.isnan(value)), key


def test_numbers_against_closed_form(result):
    d = result.to_dict()
    t2s = 300.0 * 2 ** (0.4 / 1.4)
    assert d["isentropic_outlet_temperature"] == pytest.approx(t2s, rel=5e-4)
    assert d["outlet_temperature"] == pytest.approx(300.0 + (t2s - 300.0) / 0.8, rel=1e-3)
    assert d["inlet_pressure"] == pytest.approx(1e5, rel=1e-12)
    assert d["outlet_pressure"] == pytest.approx(2e5, rel=1e-12)
    assert d["pressure_ratio"] == pytest.approx(2.0, rel=1e-12)
    assert d["power"] == pytest.approx(2.0 * d["specific_work"], rel=1e-12)
    assert d["pump_head"] == pytest.approx(d["isentropic_head"] / 9.80665, rel=1e-12)
    assert math.isnan(d["outlet_quality"])  # single-phase: no quality


def test_series_and_headers(result):
    row = result.to_series()
    assert row["shaft_power"] == pytest.approx(result.shaft_power)
    assert headers(["shaft_power", "outlet_temperature"]) == ["shaft power [W]",
                                                            "outlet temperature [K]"]


def test_wet_outlet_quality():
    # IAPWS-IF97: 40 bar 400 degC expanded to 0.1 bar is wet at an efficiency of 0.8 (common
    # knowledge of condensing turbines; the quality itself is checked against iapws in
    # tests/test_turbomachine.py)
    steam = wb.Fluid("Water", backend="IF97")
    r = wb.turbine(steam.state(P=40e5, T=673.15), P_out=0.1e5, isentropic_efficiency=0.8)
    d = r.to_dict()
    assert 0.8 < d["outlet_quality"] < 1.0
    assert 0.7 < d["isentropic_outlet_quality"] < d["outlet_quality"]


def test_turbine_pressure_ratio_is_inlet_over_outlet():
    # Pressure ratios are quoted higher over lower pressure for every machine (common
    # practice; the description of workbench.fields.FIELDS["pressure_ratio"]): a turbine's is
    # inlet over outlet, 40 bar / 10 bar = 4, in the result and in its flat dict.
    steam = wb.Fluid("Water", backend="IF97")
    r = wb.turbine(steam.state(P=40e5, T=673.15), P_out=10e5, isentropic_efficiency=0.8)
    assert r.pressure_ratio == pytest.approx(4.0, rel=1e-12)
    assert r.to_dict()["pressure_ratio"] == r.pressure_ratio
