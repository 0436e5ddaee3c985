"""Tests of workbench.fieldtest.readers: unit conversions against their definitions, CSV and
Excel import, missing and non-numeric cells."""

import io

import numpy as np
import pandas as pd
import pytest

from workbench.errors import InputError
from workbench.fieldtest import read_readings
from workbench.fieldtest.readers import convert_values, parse_unit


@pytest.mark.parametrize("unit, value, expected", [
    # gauge pressure + barometer (definition of gauge pressure, ASME PTC 19.2)
    ("bar(g)", 2.0, 2.0e5 + 101325.0),
    ("barg", 2.0, 2.0e5 + 101325.0),
    ("bar(a)", 2.0, 2.0e5),
    ("kPa", 150.0, 150e3),
    # 1 psi = 0.45359237 kg * 9.80665 m/s^2 / (0.0254 m)^2 = 6894.757293 Pa (exact definitions)
    ("psig", 10.0, 10 * 0.45359237 * 9.80665 / 0.0254 ** 2 + 101325.0),
    ("psia", 10.0, 10 * 0.45359237 * 9.80665 / 0.0254 ** 2),
])
def test_pressure_units(unit, value, expected):
    got = convert_values([value], unit, "pressure", "inlet_pressure", 101325.0)
    assert got[0] == pytest.approx(expected, rel=1e-12)


def test_temperature_flow_power_units():
    # Definitions: K = degC + 273.15; degF = 1.8 degC + 32; 1 h = 3600 s; 1 t = 1000 kg
    assert convert_values([25.0], "degC", "temperature", "t")[0] == pytest.approx(298.15)
    assert convert_values([212.0], "degF", "temperature", "t")[0] == pytest.approx(373.15)
    assert convert_values([300.0], "K", "temperature", "t")[0] == pytest.approx(300.0)
    assert convert_values([36.0], "t/h", "mass_flow", "m")[0] == pytest.approx(10.0)
    assert convert_values([3600.0], "m3/h", "volume_flow", "q")[0] == pytest.approx(1.0)
    assert convert_values([7200.0], "Sm3/h", "volume_flow", "q")[0] == pytest.approx(2.0)
    assert convert_values([1.5], "MW", "power", "p")[0] == pytest.approx(1.5e6)
    assert parse_unit("m3/h", "volume_flow") == ("m**3/h", False)
    with pytest.raises(InputError, match="not a unit of pressure"):
        convert_values([1.0], "degC", "pressure", "inlet_pressure")


CSV = """time;P in;T in;P out;T out;flow
1;1,20;20,0;3,10;120,5;10,0
2;;20,1;3,12;121,0;10,1
3;1,21;broken;3,11;121,2;10,2
"""


def test_csv_import_keeps_every_row_and_notes_bad_cells():
    frame = read_readings(io.StringIO(CSV), {"inlet_pressure": "P in", "inlet_temperature": "T in",
                                             "outlet_pressure": "P out",
                                             "outlet_temperature": "T out",
                                             "mass_flow": "flow"},
                          {"inlet_pressure": "bar(g)", "inlet_temperature": "degC",
                           "outlet_pressure": "bar(g)", "outlet_temperature": "degC",
                           "mass_flow": "t/h"}, sep=";", decimal=",", ambient_pressure=1.0e5)
    assert len(frame) == 3
    assert frame.loc[0, "inlet_pressure"] == pytest.approx(2.2e5)
    assert frame.loc[0, "mass_flow"] == pytest.approx(10.0 / 3.6)
    assert list(frame["time"]) == ["1", "2", "3"]
    assert frame.loc[0, "reading_problem"] == ""
    assert "inlet pressure reading (column 'P in') is missing" in frame.loc[1, "reading_problem"]
    assert "'broken'" in frame.loc[2, "reading_problem"]
    assert np.isnan(frame.loc[2, "inlet_temperature"])


def test_excel_import(tmp_path):
    path = tmp_path / "readings.xlsx"
    pd.DataFrame({"P1 [psig]": [14.5, "n/a"], "T1 [degF]": [68.0, 70.0]}).to_excel(
        path, index=False)
    frame = read_readings(path, {"inlet_pressure": "P1 [psig]", "inlet_temperature": "T1 [degF]"},
                          {"inlet_pressure": "psig", "inlet_temperature": "degF"})
    # 14.5 psi = 99974 Pa (exact psi definition) + 101325 Pa barometer
    assert frame.loc[0, "inlet_pressure"] == pytest.approx(14.5 * 6894.757293168 + 101325.0)
    assert frame.loc[0, "inlet_temperature"] == pytest.approx(293.15)
    assert "not a number" in frame.loc[1, "reading_problem"]


def test_map_errors_name_the_problem():
    raw = io.StringIO("a,b\n1,2\n")
    with pytest.raises(InputError, match="not in the file"):
        read_readings(raw, {"inlet_pressure": "c"}, {"inlet_pressure": "bar"})
    with pytest.raises(InputError, match="unknown reading name"):
        read_readings(io.StringIO("a\n1\n"), {"suction": "a"}, {"suction": "bar"})
    with pytest.raises(InputError, match="no unit given"):
        read_readings(io.StringIO("a\n1\n"), {"inlet_pressure": "a"}, {})
