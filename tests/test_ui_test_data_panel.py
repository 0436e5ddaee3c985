"""Tests of the field-test data panel (workbench.ui.test_data_panel)."""

import base64
import datetime
import io

import numpy as np
import pandas as pd
import pytest

import workbench as wb
from workbench.fieldtest import evaluate, read_readings
from workbench.ui.test_data_panel import DEMO_FILE, DEMO_MAP, FieldDataPanel, parse_fluid


@pytest.fixture(scope="module")
def demo():
    return FieldDataPanel.demo()


def test_demo_panel_matches_the_library(demo):
    # Source: the library path (read_readings + evaluate) on the same file and map
    cmap = {k: v[0] for k, v in DEMO_MAP.items()}
    units = {k: v[1] for k, v in DEMO_MAP.items()}
    readings = read_readings(DEMO_FILE, cmap, units, ambient_pressure=101300.0)
    direct = evaluate(readings, "compressor", parse_fluid(
        "Methane=0.89; Ethane=0.06; Propane=0.02; Nitrogen=0.015; CarbonDioxide=0.015"),
        mechanical_efficiency=0.985)
    np.testing.assert_allclose(demo.results["isentropic_efficiency"],
                               direct["isentropic_efficiency"], rtol=1e-12)
    numbers = demo.summary_numbers()
    assert numbers["rows"] == 300 and numbers["flagged"] == 6
    assert "6 row(s) flagged" in demo.message.value
    assert wb.SAFETY_CAUTION[:40] in demo.caution.value


def test_table_colours_flagged_rows_and_export_has_every_row(demo):
    assert demo.table.value.count("wb-row-flagged") == 6
    assert "is not a number" in demo.table.value
    link = demo.export.value
    data = base64.b64decode(link.split("base64,")[1].split("'")[0])
    exported = pd.read_csv(io.BytesIO(data))
    assert len(exported) == 300
    assert list(exported["status"].fillna("")) == list(demo.results["status"])
    assert "efficiency_deviation_points" in exported.columns
    # efficiency deviation is 100 (eta - 0.77) points (definition)
    ok = exported["status"] == "ok"
    np.testing.assert_allclose(exported.loc[ok, "efficiency_deviation_points"],
                               100 * (exported.loc[ok, "isentropic_efficiency"] - 0.77),
                               rtol=1e-9)


def test_chart_has_rows_error_bars_and_design_point(demo):
    eff = {s["name"]: s for s in demo.plot_data["efficiency"]}
    assert len(eff["rows"]["x"]) == 294
    bars = eff["U95 at sampled rows"]["error"]
    assert len(bars) > 0 and np.all(np.asarray(bars) > 0)
    assert eff["design point"]["y"] == [pytest.approx(77.0)]
    assert demo.figure.value.count("<svg") == 2
    assert "<script" not in demo.figure.value


def test_bad_map_gives_a_message_and_keeps_the_last_table():
    panel = FieldDataPanel.demo()
    table = panel.table.value
    panel.map_column["outlet_temperature"].value = "(not measured)"
    panel.map_column["power"].value = "(not measured)"
    panel.evaluate()
    assert "no column for" in panel.message.value
    assert panel.table.value == table
    assert "wb-stale" in panel.summary.value


def test_upload_of_an_excel_file(tmp_path):
    frame = pd.DataFrame({"p1 bar": [1.0, 1.0, "bad"], "t1 C": [20.0, 21.0, 20.0],
                          "p2 bar": [2.0, 0.5, 2.0], "t2 C": [90.0, 91.0, 90.0],
                          "m kg/s": [1.0, 1.0, 1.0]})
    path = tmp_path / "air.xlsx"
    frame.to_excel(path, index=False)
    panel = FieldDataPanel(fluid="Air")
    panel.upload.value = ({"name": "air.xlsx", "content": memoryview(path.read_bytes()),
                           "type": "", "size": 0,
                           "last_modified": datetime.datetime(2026, 3, 14)},)
    assert "3 rows" in panel.message.value
    panel.set_column_map({"inlet_pressure": ("p1 bar", "bar(a)"),
                          "inlet_temperature": ("t1 C", "degC"),
                          "outlet_pressure": ("p2 bar", "bar(a)"),
                          "outlet_temperature": ("t2 C", "degC"),
                          "mass_flow": ("m kg/s", "kg/s")})
    panel.evaluate()
    assert list(panel.results["status"]) == ["ok", "invalid reading", "not a number"]
    # ideal-gas closed form for air (k = 1.4, from memory): eta = T1((P2/P1)^(2/7) - 1)/(T2 - T1)
    t1, t2 = 293.15, 363.15
    eta = t1 * (2.0 ** (0.4 / 1.4) - 1) / (t2 - t1)
    assert panel.results.loc[0, "isentropic_efficiency"] == pytest.approx(eta, rel=5e-3)


def test_fluid_text_is_parsed_not_evaluated():
    assert parse_fluid("Methane=0.9; Ethane=0.1").components == ("Methane", "Ethane")
    with pytest.raises(wb.WorkbenchError):
        parse_fluid("Methane=__import__('os')")


def test_design_entries_not_given_are_zero_not_nan():
    # NaN cannot travel to the browser as a widget value; 0 stands for "not given"
    panel = FieldDataPanel(fluid="Air")
    assert panel.d_speed.field.value == 0.0
    assert panel._design().speed is None
