"""Tests of the field-test setup files (workbench.fieldtest.setup_file), without widgets.

References outside the project: unit factors of NIST SP 811 (1 bar = 1e5 Pa exactly,
1 psi = 6894.757 Pa, 1 h = 3600 s, 1 kW = 1e3 W); JSON rules of RFC 8259 (NaN is not a JSON
number, a document is UTF-8 text).
"""

import json

import pytest

import workbench as wb
from workbench.fieldtest import setup_file

#: Headers of an invented logger export (the demo file's).
COLUMNS = ["timestamp", "PT-201 suction bar(g)", "TT-201 suction degC",
           "PT-202 discharge bar(g)", "TT-202 discharge degC", "FT-200 flow Sm3/h",
           "JI-200 shaft kW", "ST-200 speed rpm"]


@pytest.fixture()
def demo_setup():
    """A valid setup of the invented booster compressor (SI values)."""
    return setup_file.make_setup(
        machine="compressor", fluid="Methane=0.89; Ethane=0.11", property_model="HEOS",
        ambient_pressure=101300.0, mechanical_efficiency=0.985,
        columns={"inlet_pressure": ("PT-201 suction bar(g)", "bar(g)", 19000.0),
                 "inlet_temperature": ("TT-201 suction degC", "degC", 1.0),
                 "outlet_pressure": ("PT-202 discharge bar(g)", "bar(g)", 48000.0),
                 "outlet_temperature": ("TT-202 discharge degC", "degC", 1.0),
                 "standard_volume_flow": ("FT-200 flow Sm3/h", "Sm3/h", 0.25),
                 "power": ("JI-200 shaft kW", "kW", 35000.0),
                 "speed": ("ST-200 speed rpm", "rpm", 51.0)},
        steady_window=5,
        uncertainty={"pressure_fraction": 0.0025, "temperature_K": 0.2,
                     "flow_fraction": 0.01, "power_fraction": 0.01},
        design={"isentropic_efficiency": 0.77, "shaft_power_W": 1.7e6,
                "inlet_volume_flow_m3_per_s": 0.65, "speed_rpm": None},
        readings_file="booster.csv")


# ---------------------------------------------------------------------- pure functions
def test_make_and_validate_are_inverse_and_json_safe():
    setup = setup_file.make_setup(
        machine="pump", fluid="Water", property_model="IF97", ambient_pressure=101325.0,
        mechanical_efficiency=0.97,
        columns={"inlet_pressure": ("p1", "psig", 6894.757),
                 "mass_flow": ("m", "t/h", 0.5)},
        steady_window=7,
        uncertainty={"pressure_fraction": 0.003, "temperature_K": 0.1, "flow_fraction": 0.02,
                     "power_fraction": 0.015},
        design={"isentropic_efficiency": 0.8, "shaft_power_W": None,
                "inlet_volume_flow_m3_per_s": None, "speed_rpm": 2950.0},
        readings_file="pump.csv")
    text = setup_file.setup_json(setup)
    assert setup_file.read_setup(text, ["p1", "m"]) == setup
    assert json.loads(text)["design_point"]["shaft_power_W"] is None  # null: not given
    assert json.loads(text)["columns"]["mass_flow"] == {
        "column": "m", "unit": "t/h", "steady_tolerance_kg_per_s": 0.5}
    assert "SI units" in json.loads(text)["units"]


def test_difference_conversions_use_the_nist_factors():
    # NIST SP 811: 1 psi = 6894.757 Pa, 1 bar = 1e5 Pa; 1 degF difference = 5/9 K
    # (definition of the Fahrenheit scale); gauge and absolute differences are the same
    assert setup_file.difference_to_si(1.0, "psig", "pressure", "p") == pytest.approx(
        6894.757, rel=1e-7)
    assert setup_file.difference_to_si(0.19, "bar(g)", "pressure", "p") == pytest.approx(
        19000.0, rel=1e-12)
    assert setup_file.difference_to_si(1.8, "degF", "temperature", "t") == pytest.approx(1.0)
    # typed values of up to 12 digits come back exactly
    for value, unit, kind in ((0.19, "bar(g)", "pressure"), (0.2, "psia", "pressure"),
                              (1.8, "degF", "temperature"), (840.0, "Sm3/h", "volume_flow"),
                              (0.035, "MW", "power")):
        si = setup_file.difference_to_si(value, unit, kind, "x")
        assert setup_file.difference_from_si(si, unit, kind, "x") == value


def test_validate_refuses_a_column_the_file_does_not_have(demo_setup):
    with pytest.raises(wb.CaseFileError, match="columns.speed.column"):
        setup_file.validate_setup(demo_setup, COLUMNS[:-1], "short.csv")
    with pytest.raises(wb.CaseFileError, match="no readings file is loaded"):
        setup_file.validate_setup(demo_setup, [])
    assert setup_file.validate_setup(demo_setup, None) == demo_setup  # no file: not checked
    assert setup_file.validate_setup(demo_setup, COLUMNS) == demo_setup


def test_saved_text_round_trips_through_a_file(demo_setup, tmp_path):
    path = tmp_path / "booster-setup.json"
    path.write_text(setup_file.setup_json(demo_setup), encoding="utf-8")
    assert setup_file.read_setup(path, COLUMNS) == demo_setup
    assert setup_file.read_setup(path.read_bytes(), COLUMNS) == demo_setup
    saved = json.loads(path.read_text(encoding="utf-8"))
    assert saved["format_version"] == setup_file.FORMAT_VERSION
    assert saved["format"] == setup_file.FORMAT_NAME




@pytest.mark.parametrize("key, value", [
    ("colour", "blue"), ("format", "something else"), ("format", ["a list"]),
    ("format_version", 2), ("format_version", True), ("format_version", 10**500),
    ("machine", ...), ("machine", "blender"), ("property_model", "ideal gas"), ("fluid", ""),
    ("fluid", 3), ("fluid", "x" * 5000), ("readings_file", 5),
    ("ambient_pressure_Pa", "1 bar"), ("ambient_pressure_Pa", -101300.0),
    ("ambient_pressure_Pa", 10**400), ("ambient_pressure_Pa", None),
    ("mechanical_efficiency", 1.2), ("mechanical_efficiency", 0),
    ("mechanical_efficiency", True), ("steady_window_rows", 1), ("steady_window_rows", 5.0),
    ("steady_window_rows", True), ("steady_window_rows", 10**50), ("columns", []),
    ("columns.mystery_reading", {"column": "x", "unit": "Pa"}),
    ("columns.inlet_pressure.column", "PT-999 missing bar(g)"),
    ("columns.inlet_pressure.column", 7), ("columns.inlet_pressure.unit", "furlong"),
    ("columns.inlet_pressure.unit", "degC"), ("columns.inlet_pressure.steady_tolerance_Pa", -1.0),
    ("columns.inlet_pressure.steady_tolerance_Pa", None),
    ("columns.inlet_pressure.steady_tolerance_Pa", ...),
    ("columns.inlet_temperature.steady_tolerance_Pa", 1.0),
    ("instrument_uncertainty.pressure_fraction", -0.01),
    ("instrument_uncertainty.temperature_K", ...),
    ("instrument_uncertainty.flow_fraction", "1 %"),
    ("design_point.isentropic_efficiency", 1.5), ("design_point.shaft_power_W", 0),
    ("design_point.speed_rpm", -3000.0), ("design_point.head", 1.0),
])
def test_invalid_setup_is_refused_naming_the_key(demo_setup, key, value, edited):
    with pytest.raises(wb.CaseFileError) as info:
        setup_file.validate_setup(edited(demo_setup, key, value), COLUMNS)
    top = key.split(".")[0]
    assert top in str(info.value) or key in str(info.value), str(info.value)
    assert len(str(info.value)) < 400  # a huge value is not copied into the message


def test_bad_json_nan_and_bad_text_are_refused(demo_setup):
    with pytest.raises(wb.CaseFileError, match="not valid JSON"):
        setup_file.read_setup(b"{not json", COLUMNS)
    # RFC 8259: NaN is not a JSON number
    text = setup_file.setup_json(demo_setup).replace('"ambient_pressure_Pa": 101300.0',
                                                     '"ambient_pressure_Pa": NaN')
    assert "NaN" in text
    with pytest.raises(wb.CaseFileError, match="NaN"):
        setup_file.read_setup(text, COLUMNS)
    with pytest.raises(wb.CaseFileError, match="UTF-8"):
        setup_file.read_setup(b"\xff\xfe", COLUMNS)
    with pytest.raises(wb.CaseFileError, match="JSON object"):
        setup_file.read_setup(b"[1, 2]", COLUMNS)
