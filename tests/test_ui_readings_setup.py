"""Tests of the readings panel's setup files: save, load, refuse (ReadingsPanel).

References outside the project: unit factors of NIST SP 811 (1 bar = 1e5 Pa exactly,
1 psi = 6894.757 Pa, 1 h = 3600 s, 1 kW = 1e3 W); JSON rules of RFC 8259 (NaN is not a JSON
number); the library path (read_readings, evaluate, steady_state_flags) on the demo file,
run here without the panel.
"""

import base64
import datetime
import json

import numpy as np
import pandas as pd
import pytest

from workbench.fieldtest import evaluate, read_readings, setup_file, steady_state_flags
from workbench.fieldtest.session import parse_fluid
from workbench.ui.readings_entries import NONE
from workbench.ui.readings_panel import DEMO_FILE, DEMO_GAS, DEMO_MAP, ReadingsPanel

DEMO_COLUMNS = ["timestamp", *(column for column, _unit in DEMO_MAP.values())]


@pytest.fixture(scope="module")
def demo():
    return ReadingsPanel.demo()


@pytest.fixture(scope="module")
def demo_setup(demo):
    """The demo setup as written to the download link (decoded from the data: URL)."""
    encoded = demo.setup_link.value.split("base64,")[1].split("'")[0]
    return json.loads(base64.b64decode(encoded))


def entries(panel) -> dict:
    """Every entry of the panel that a setup holds (SI values of the number entries)."""
    mapped = [n for n, d in panel.map_column.items() if d.value != NONE]
    return {
        "machine": panel.machine.value, "backend": panel.backend.value,
        "fluid": panel.fluid.value, "ambient": panel.ambient.si, "mech": panel.mech.si,
        "u": [panel.u_pressure.si, panel.u_temperature.si, panel.u_flow.si, panel.u_power.si],
        "design": [panel.d_eta.si, panel.d_power.si, panel.d_flow.si, panel.d_speed.si],
        "window": panel.steady_window.value,
        "columns": {n: panel.map_column[n].value for n in panel.map_column},
        "units": {n: panel.map_unit[n].value for n in mapped},
        "tolerances": {n: panel.tolerance[n].value for n in mapped},
    }


def assert_same_table(a: pd.DataFrame, b: pd.DataFrame):
    assert list(a.columns) == list(b.columns) and list(a.index) == list(b.index)
    for column in a.columns:
        if pd.api.types.is_numeric_dtype(a[column]) and a[column].dtype != bool:
            np.testing.assert_allclose(a[column].to_numpy(dtype=float),
                                       b[column].to_numpy(dtype=float), rtol=1e-12,
                                       atol=0.0, err_msg=column)
        else:
            assert list(a[column].fillna("")) == list(b[column].fillna("")), column


# ---------------------------------------------------------------------- the panel
def test_saved_file_holds_si_values(demo, demo_setup):
    # NIST SP 811: 1 bar = 1e5 Pa exactly; a tolerance in bar(g) is a pressure difference,
    # so the ambient pressure does not enter it
    tol_bar = demo.tolerance["inlet_pressure"].value
    assert demo.tolerance_unit["inlet_pressure"].value == "bar"
    column = demo_setup["columns"]["inlet_pressure"]
    assert column["unit"] == "bar(g)"
    assert column["steady_tolerance_Pa"] == pytest.approx(tol_bar * 1e5, rel=1e-12)
    # 1 h = 3600 s (NIST SP 811): the flow tolerance shown in Sm3/h, stored in m3/s
    flow = demo_setup["columns"]["standard_volume_flow"]
    assert flow["steady_tolerance_m3_per_s"] == pytest.approx(
        demo.tolerance["standard_volume_flow"].value / 3600, rel=1e-12)
    # 1 kW = 1e3 W; the demo's design point is 1.70 MW shaft power at 0.65 m3/s, eta 0.77
    assert demo_setup["columns"]["power"]["steady_tolerance_W"] == pytest.approx(
        demo.tolerance["power"].value * 1e3, rel=1e-12)
    assert demo_setup["design_point"] == {"isentropic_efficiency": 0.77,
                                          "shaft_power_W": 1.70e6,
                                          "inlet_volume_flow_m3_per_s": 0.65,
                                          "speed_rpm": None}
    assert demo_setup["ambient_pressure_Pa"] == 101300.0
    assert demo_setup["instrument_uncertainty"]["pressure_fraction"] == 0.0025  # 0.25 %
    assert demo_setup["readings_file"] == DEMO_FILE.name
    assert demo_setup["format_version"] == setup_file.FORMAT_VERSION


def test_demo_setup_on_the_demo_file_reproduces_the_demo_results(demo, demo_setup, tmp_path):
    # Source: the library path on the demo file with the demo's map (read_readings, evaluate,
    # steady_state_flags), run here without the panel
    path = tmp_path / "demo-setup.json"
    path.write_text(json.dumps(demo_setup), encoding="utf-8")
    panel = ReadingsPanel(DEMO_FILE.name, DEMO_FILE.read_bytes())  # Air, nothing mapped
    assert panel.load_setup(path) is True, panel.message.value
    assert "Setup loaded" in panel.message.value and "6 row(s) flagged" in panel.message.value
    cmap = {k: v[0] for k, v in DEMO_MAP.items()}
    units = {k: v[1] for k, v in DEMO_MAP.items()}
    readings = read_readings(DEMO_FILE, cmap, units, ambient_pressure=101300.0)
    direct = evaluate(readings, "compressor", parse_fluid(DEMO_GAS),
                      mechanical_efficiency=0.985,
                      results=("isentropic_efficiency", "shaft_power", "inlet_volume_flow"))
    assert list(panel.results["status"]) == list(direct["status"])
    for column in ("isentropic_efficiency", "shaft_power", "inlet_volume_flow"):
        np.testing.assert_allclose(panel.results[column], direct[column], rtol=1e-12)
    # the tolerances shown on the demo page, converted by hand (NIST SP 811 factors)
    to_si = {"bar": 1e5, "°C": 1.0, "Sm³/h": 1 / 3600, "kW": 1e3, "rpm": 1.0}
    tolerances = {name: demo.tolerance[name].value * to_si[demo.tolerance_unit[name].value]
                  for name in DEMO_MAP}
    flags = steady_state_flags(readings, list(tolerances), 5, tolerances)["steady"]
    assert list(panel.steady["steady"]) == list(flags)
    assert panel.summary_numbers() == demo.summary_numbers()
    assert panel.table.value == demo.table.value
    assert panel.to_setup() == demo.to_setup()


def test_round_trip_save_change_everything_load(demo, tmp_path):
    panel = ReadingsPanel.demo()
    saved = panel.to_setup()
    before = entries(panel)
    table = panel.export_frame().copy()
    path = tmp_path / "setup.json"
    path.write_text(panel.setup_json(), encoding="utf-8")

    # change every entry a setup holds
    panel.machine.value = "turbine"
    panel.backend.value = "IF97"
    panel.fluid.value = "Water"
    panel.ambient.set_display(0.95)
    panel.mech.set_display(97.0)
    panel.u_pressure.set_display(0.5)
    panel.u_temperature.set_display(0.6)
    panel.u_flow.set_display(2.0)
    panel.u_power.set_display(3.0)
    panel.d_eta.set_display(70.0)
    panel.d_power.set_display(900.0)
    panel.d_flow.set_display(1000.0)
    panel.d_speed.set_display(3000.0)
    panel.steady_window.value = 9
    panel.map_column["standard_volume_flow"].value = NONE
    panel.map_unit["volume_flow"].value = "m3/h"
    panel.map_column["volume_flow"].value = "FT-200 flow Sm3/h"
    panel.map_column["speed"].value = NONE
    panel.map_unit["inlet_pressure"].value = "psig"
    panel.map_unit["power"].value = "MW"
    panel.map_unit["outlet_temperature"].value = "K"
    panel.tolerance["inlet_pressure"].value = 3.0
    panel.tolerance["outlet_temperature"].value = 2.5
    changed = panel.to_setup()
    for key in ("machine", "fluid", "property_model", "ambient_pressure_Pa",
                "mechanical_efficiency", "columns", "steady_window_rows",
                "instrument_uncertainty", "design_point"):
        assert changed[key] != saved[key], key
    for key in ("isentropic_efficiency", "shaft_power_W", "inlet_volume_flow_m3_per_s",
                "speed_rpm"):
        assert changed["design_point"][key] != saved["design_point"][key], key
    for key in setup_file.UNCERTAINTY_KEYS:
        assert changed["instrument_uncertainty"][key] != saved["instrument_uncertainty"][key]

    assert panel.load_setup(path) is True, panel.message.value
    assert entries(panel) == before  # every entry back, exactly
    assert panel.to_setup() == saved
    assert panel.tolerance_unit["inlet_pressure"].value == "bar"
    assert panel.tolerance_unit["outlet_temperature"].value == "°C"
    assert panel.evaluate() is True
    assert_same_table(panel.export_frame(), table)
    # loaded tolerances count as typed: a unit change keeps their size (1 psi = 6894.757 Pa)
    panel.map_unit["inlet_pressure"].value = "psig"
    assert panel.tolerance["inlet_pressure"].value == pytest.approx(
        before["tolerances"]["inlet_pressure"] * 1e5 / 6894.757, rel=1e-5)




# every refusal of the format is checked without widgets in tests/test_fieldtest_setup_file.py;
# here, that a refused setup changes nothing in the panel
@pytest.mark.parametrize("key, value, words", [
    ("colour", "blue", "unknown setup key"),
    ("machine", ..., "missing setup key(s): 'machine'"),
    ("fluid", "Unobtainium", "'fluid'"),  # not a property-library fluid: tried, refused
    ("property_model", "IF97", "'fluid'"),  # IF97 is for water only: tried, refused
    ("columns.inlet_pressure.column", "PT-999 missing bar(g)",
     "'columns.inlet_pressure.column'"),
    ("design_point.shaft_power_W", 0, "'design_point.shaft_power_W'"),
])
def test_invalid_setup_names_the_key_and_keeps_the_panel(demo, demo_setup, key, value, words,
                                                          edited):
    before, results, table = demo.to_setup(), demo.results, demo.table.value
    assert demo.load_setup(edited(demo_setup, key, value)) is False  # never raises
    message = demo.message.text  # plain text shown (MessageArea)
    assert "setup not loaded" in message
    assert words in message, message
    assert demo.to_setup() == before
    assert demo.results is results and demo.table.value == table
    assert "wb-fresh" in demo.summary.value  # the results still match the entries


def test_bad_json_and_nan_are_refused(demo):
    before = demo.to_setup()
    assert demo.load_setup(b"{not json") is False
    assert "not valid JSON" in demo.message.value
    # RFC 8259: NaN is not a JSON number
    text = demo.setup_json().replace('"ambient_pressure_Pa": 101300.0',
                                     '"ambient_pressure_Pa": NaN')
    assert "NaN" in text
    assert demo.load_setup(text) is False
    assert "NaN" in demo.message.value
    assert demo.load_setup(b"\xff\xfe") is False and "UTF-8" in demo.message.value
    assert demo.to_setup() == before


def test_a_setup_for_another_file_keeps_the_panel(demo_setup, tmp_path):
    frame = pd.DataFrame({"p1 bar": [1.0, 1.0], "t1 C": [20.0, 21.0], "p2 bar": [2.0, 2.1],
                          "t2 C": [90.0, 91.0], "m kg/s": [1.0, 1.0]})
    panel = ReadingsPanel("air.csv", frame.to_csv(index=False).encode(), fluid="Air")
    panel.set_column_map({"inlet_pressure": ("p1 bar", "bar(a)"),
                          "outlet_pressure": ("p2 bar", "bar(a)")})
    before = panel.to_setup()
    assert panel.load_setup(demo_setup) is False
    assert "columns.inlet_pressure.column" in panel.message.value
    assert "air.csv" in panel.message.value
    assert panel.to_setup() == before
    # with no readings file at all there is nothing to map
    empty = ReadingsPanel()
    assert empty.load_setup(demo_setup) is False
    assert "load the readings file first" in empty.message.value


def test_upload_widget_and_download_link(demo, demo_setup):
    panel = ReadingsPanel(DEMO_FILE.name, DEMO_FILE.read_bytes())
    assert "wb-input-setup-upload" in panel.setup_upload._dom_classes
    assert "wb-result-setup-link" in panel.setup_link._dom_classes
    assert panel.setup_link.value == ""  # nothing evaluated yet
    panel.setup_save.click()  # a setup can be saved before any evaluation
    assert "download='booster_compressor_readings-setup.json'" in panel.setup_link.value
    data = json.dumps(demo_setup).encode("utf-8")
    panel.setup_upload.value = ({"name": "booster.json", "type": "application/json",
                                 "size": len(data), "content": memoryview(data),
                                 "last_modified": datetime.datetime(2026, 3, 14)},)
    assert "Setup booster.json loaded" in panel.message.value, panel.message.value
    assert panel.setup_upload.value == ()  # cleared, so the same file can be loaded again
    encoded = panel.setup_link.value.split("base64,")[1].split("'")[0]
    assert json.loads(base64.b64decode(encoded)) == demo_setup
    # a bad tolerance cannot be saved: the message says so, the last link stays
    link = panel.setup_link.value
    panel.tolerance["outlet_pressure"].value = -1.0
    panel.setup_save.click()
    assert "setup not saved" in panel.message.value and "outlet pressure" in panel.message.value
    assert panel.setup_link.value == link
