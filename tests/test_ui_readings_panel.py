"""Tests of the readings dashboard panel (workbench.ui.readings_panel).

The panel must show what the library computes: results from ``evaluate``, error bars from
``propagate_uncertainty`` and steady flags from ``steady_state_flags`` on the same readings,
each recomputed here independently of the panel.
"""

import base64
import datetime
import io
import re

import numpy as np
import pandas as pd
import plotly.graph_objects as go
import pytest

import workbench as wb
from workbench.fieldtest import (
    evaluate,
    propagate_uncertainty,
    read_readings,
    steady_state_flags,
)
from workbench.fieldtest.session import parse_fluid
from workbench.ui.readings_chart import READINGS_TRACES
from workbench.ui.readings_panel import DEMO_FILE, DEMO_GAS, DEMO_MAP, ReadingsPanel

#: Unit factors to SI of the demo file's units (NIST SP 811): 1 bar = 1e5 Pa, 1 kW = 1e3 W,
#: 1 m3/h = 1/3600 m3/s; a difference of 1 degC is 1 K (definition of the Celsius scale).
TO_SI = {"bar": 1e5, "°C": 1.0, "Sm³/h": 1 / 3600, "kW": 1e3, "rpm": 1.0}


@pytest.fixture(scope="module")
def demo():
    return ReadingsPanel.demo()


@pytest.fixture(scope="module")
def library():
    """The library path on the demo file, without the panel: (readings, results)."""
    cmap = {k: v[0] for k, v in DEMO_MAP.items()}
    units = {k: v[1] for k, v in DEMO_MAP.items()}
    readings = read_readings(DEMO_FILE, cmap, units, ambient_pressure=101300.0)
    results = evaluate(readings, "compressor", parse_fluid(DEMO_GAS),
                       mechanical_efficiency=0.985,
                       results=("isentropic_efficiency", "shaft_power", "inlet_volume_flow"))
    return readings, results


def traces(panel):
    """The figure's traces by (chart, trace name)."""
    n = len(READINGS_TRACES)
    data = panel.figure.data
    return {(chart, name): data[offset + i]
            for offset, chart in ((0, "efficiency"), (n, "power"))
            for i, name in enumerate(READINGS_TRACES)}


def hand_tolerances(panel):
    """SI tolerances from the entries as shown, converted with the factors of TO_SI."""
    return {name: panel.tolerance[name].value * TO_SI[panel.tolerance_unit[name].value]
            for name in DEMO_MAP}


def table_steady_cells(table_html):
    """Row index -> 'yes'/'no' of the steady column of the table."""
    return {int(i): flag for i, flag in re.findall(
        r"<tr class='wb-row-\w+'[^>]*><td class='wb-num'>(\d+)</td>"
        r"<td class='wb-steady-(yes|no)'", table_html)}


def test_demo_panel_matches_the_library(demo, library):
    # Source: the library path (read_readings + evaluate) on the same file and map
    _readings, direct = library
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
    # the design power is a shaft (coupling) power: deviation 100 (P_shaft / 1.70 MW - 1) %
    # (definition), the same power the chart shows
    np.testing.assert_allclose(exported.loc[ok, "power_deviation_percent"],
                               100 * (exported.loc[ok, "shaft_power"] / 1.70e6 - 1), rtol=1e-9)


def test_one_figure_widget_updated_in_place():
    panel = ReadingsPanel.demo()
    figure, before = panel.figure, list(panel.figure.data)
    assert isinstance(figure, go.FigureWidget)
    assert len(before) == 2 * len(READINGS_TRACES)  # both charts are subplots of one figure
    assert before[0].xaxis == "x" and before[len(READINGS_TRACES)].xaxis == "x2"
    steady_before = len(before[0].x)
    panel.steady_window.value = 10  # longer window: fewer steady rows, same traces
    panel.evaluate()
    assert panel.figure is figure
    assert all(a is b for a, b in zip(panel.figure.data, before))
    assert len(panel.figure.data) == len(before)
    assert len(panel.figure.data[0].x) < steady_before


def test_chart_data_are_the_library_results_of_the_ok_rows(demo, library):
    # Source: the library's evaluate() on the same readings; bad rows are left out
    _readings, direct = library
    ok = direct["status"] == "ok"
    t = traces(demo)
    flow = np.concatenate([t["efficiency", "steady rows"].x, t["efficiency", "unsteady rows"].x])
    eta = np.concatenate([t["efficiency", "steady rows"].y, t["efficiency", "unsteady rows"].y])
    power = np.concatenate([t["power", "steady rows"].y, t["power", "unsteady rows"].y])
    order = np.argsort(flow, kind="stable")
    expected = direct[ok].sort_values("inlet_volume_flow", kind="stable")
    assert len(flow) == ok.sum() == 294
    np.testing.assert_allclose(flow[order], 3600 * expected["inlet_volume_flow"], rtol=1e-12)
    np.testing.assert_allclose(np.sort(eta), np.sort(100 * direct.loc[ok, "isentropic_efficiency"]),
                               rtol=1e-12)
    np.testing.assert_allclose(np.sort(power), np.sort(direct.loc[ok, "shaft_power"] / 1e3),
                               rtol=1e-12)
    assert np.array_equal(t["efficiency", "steady rows"].x, t["power", "steady rows"].x)


def test_error_bars_are_propagate_uncertainty_at_the_sampled_rows(demo, library):
    # Source: the library's propagate_uncertainty with the panel's stated instrument
    # uncertainties (b: 0.25 % of each pressure, 0.2 K, 1 % of flow), rating from the
    # measured outlet temperature (the measured power is then not an input)
    readings, direct = library
    t = traces(demo)
    rows = list(demo.uncertainty["row"])
    assert len(rows) == 12 and all(direct.loc[rows, "status"] == "ok")
    np.testing.assert_allclose(t["efficiency", "U95 at sampled rows"].x,
                               3600 * direct.loc[rows, "inlet_volume_flow"], rtol=1e-12)
    for k in (0, len(rows) - 1):
        row = readings.loc[rows[k]]
        nominal = {name: float(row[name]) for name in (
            "inlet_pressure", "outlet_pressure", "inlet_temperature", "outlet_temperature",
            "standard_volume_flow")}
        u = {"inlet_pressure": (0.0025 * nominal["inlet_pressure"], 0.0),
             "outlet_pressure": (0.0025 * nominal["outlet_pressure"], 0.0),
             "inlet_temperature": (0.2, 0.0), "outlet_temperature": (0.2, 0.0),
             "standard_volume_flow": (0.01 * nominal["standard_volume_flow"], 0.0)}
        report = propagate_uncertainty(nominal, u, ("isentropic_efficiency", "shaft_power"),
                                       machine="compressor", fluid=parse_fluid(DEMO_GAS),
                                       mechanical_efficiency=0.985)
        assert t["efficiency", "U95 at sampled rows"].error_y.array[k] == pytest.approx(
            100 * report.expanded["isentropic_efficiency"], rel=1e-9)
        assert t["power", "U95 at sampled rows"].error_y.array[k] == pytest.approx(
            report.expanded["shaft_power"] / 1e3, rel=1e-9)
        assert report.expanded["isentropic_efficiency"] > 0


def test_design_point_marker_is_at_the_design_values(demo):
    # Source: the demo's design point (0.77, 1.70 MW shaft power at 0.65 m3/s inlet flow);
    # 0.65 m3/s = 2340 m3/h
    t = traces(demo)
    assert list(t["efficiency", "design point"].x) == [pytest.approx(2340.0)]
    assert list(t["efficiency", "design point"].y) == [pytest.approx(77.0)]
    assert list(t["power", "design point"].x) == [pytest.approx(2340.0)]
    assert list(t["power", "design point"].y) == [pytest.approx(1700.0)]
    assert t["efficiency", "design point"].marker.symbol != t["efficiency", "steady rows"].marker.symbol


def test_steady_flags_in_table_chart_and_export_are_the_library_flags(demo):
    # Source: steady_state_flags() on the same readings with the tolerances shown on the page,
    # converted by hand (NIST SP 811 factors, see TO_SI)
    tolerances = hand_tolerances(demo)
    expected = steady_state_flags(demo.readings, list(tolerances), demo.steady_window.value,
                                  tolerances)["steady"]
    assert 0 < expected.sum() < 300
    data = base64.b64decode(demo.export.value.split("base64,")[1].split("'")[0])
    exported = pd.read_csv(io.BytesIO(data))
    assert list(exported["steady"]) == list(expected)
    cells = table_steady_cells(demo.table.value)
    assert len(cells) == 40
    assert all((flag == "yes") == bool(expected[i]) for i, flag in cells.items())
    assert f"Steady: {int(expected.sum())} of 300 rows" in demo.summary.value
    ok = demo.results["status"] == "ok"
    t = traces(demo)
    assert len(t["efficiency", "steady rows"].x) == int((ok & expected).sum())
    assert len(t["efficiency", "unsteady rows"].x) == int((ok & ~expected).sum())
    assert t["efficiency", "unsteady rows"].marker.symbol == "circle-open"
    # the invented demo ramps the speed by 45 rpm a row over rows 120-140: over a 5-row
    # window the speed strays 2 x 45 = 90 rpm from its mean (by hand), beyond the 51 rpm
    # tolerance (0.5 % of the median speed), so the ramp is unsteady
    assert not expected.loc[125:140].any()
    # the table says why: the first rows have no full window yet; the invented row 244 has
    # its discharge pressure at 15.2 bar(g), far below its neighbours near 39 bar(g)
    assert "<td class='wb-num'>0</td><td class='wb-steady-no' style='background:#dde5ef'>" \
           "no: window not yet full</td>" in demo.table.value
    assert re.search(r"<td class='wb-num'>244</td><td class='wb-steady-no'[^>]*>no: [^<]*"
                     r"outlet p", demo.table.value)
    assert demo.tolerance["speed"].value == 51.0


def test_default_tolerances_follow_the_readings():
    # Source: common practice (from memory) for permissible fluctuations, as documented in the
    # panel: 1 % of the median absolute pressure, 1 K for temperatures, 2 % of the flow
    raw = pd.read_csv(DEMO_FILE)
    panel = ReadingsPanel(DEMO_FILE.name, DEMO_FILE.read_bytes(), DEMO_MAP,
                           ambient_pressure=101300.0)
    p1 = pd.to_numeric(raw["PT-201 suction bar(g)"], errors="coerce").median() + 1.013
    assert panel.tolerance["inlet_pressure"].value == pytest.approx(0.01 * p1, rel=0.03)
    assert panel.tolerance_unit["inlet_pressure"].value == "bar"
    assert panel.tolerance["inlet_temperature"].value == 1.0
    flow = pd.to_numeric(raw["FT-200 flow Sm3/h"], errors="coerce").median()
    assert panel.tolerance["standard_volume_flow"].value == pytest.approx(0.02 * flow, rel=0.03)
    # a typed tolerance keeps its size when the unit changes: 1 psi = 6894.757 Pa (NIST SP 811)
    panel.tolerance["inlet_pressure"].value = 0.2
    panel.map_unit["inlet_pressure"].value = "psig"
    assert panel.tolerance_unit["inlet_pressure"].value == "psi"
    assert panel.tolerance["inlet_pressure"].value == pytest.approx(0.2e5 / 6894.757, rel=1e-5)
    # 1 K is 1.8 degF (definition of the Fahrenheit scale)
    panel.map_unit["outlet_temperature"].value = "degF"
    assert panel.tolerance["outlet_temperature"].value == pytest.approx(1.8)


def test_bad_tolerance_or_window_gives_a_message_and_keeps_the_table():
    panel = ReadingsPanel.demo()
    table = panel.table.value
    panel.tolerance["inlet_pressure"].value = -0.5  # no exception may escape
    assert "tolerance -0.5 bar of the inlet pressure" in panel.message.value
    assert panel.table.value == table
    assert "wb-stale" in panel.summary.value
    panel.tolerance["inlet_pressure"].value = 0.19
    assert "wb-fresh" in panel.summary.value
    panel.steady_window.value = 1
    assert "steady-state window [rows] 1 is outside the allowed range [2," in panel.message.value
    message = panel.message.value
    panel.evaluate()  # the evaluation refuses the same window with the same message
    assert panel.message.value == message
    assert panel.table.value == table


def test_bad_map_gives_a_message_and_keeps_the_last_table():
    panel = ReadingsPanel.demo()
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
    panel = ReadingsPanel(fluid="Air")
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


def test_design_entries_not_given_are_zero_not_nan():
    # NaN cannot travel to the browser as a widget value; 0 stands for "not given"
    panel = ReadingsPanel(fluid="Air")
    assert panel.d_speed.field.value == 0.0
    assert panel.current_setup().design.speed is None


def upload_value(name: str, content: bytes):
    """The value an ipywidgets FileUpload holds after a browser upload."""
    return ({"name": name, "type": "", "size": len(content), "content": memoryview(content),
             "last_modified": datetime.datetime(2026, 3, 14)},)


def test_a_broken_file_keeps_the_last_table_marked_stale():
    panel = ReadingsPanel.demo()
    table, results = panel.table.value, panel.results
    for name, content, words in (
            ("junk.csv", b"\x00\x9f\x12" * 50, "binary data"),
            ("cut.xlsx", b"PK\x03\x04 truncated", "Excel workbook"),
            ("empty.csv", b"", "is empty"),
            ("header.csv", b"a,b,c\n", "header row but no readings")):
        panel.upload.value = upload_value(name, content)  # no exception may escape
        assert words in panel.message.text and name in panel.message.text
        assert panel.message.level == "error"
        assert panel.upload.value == ()  # cleared: the same file can be chosen again
        assert panel.table.value == table and panel.results is results
        assert "wb-stale" in panel.summary.value
    # the last good file is still loaded: evaluating again refreshes the same results
    assert panel.file_name == DEMO_FILE.name and panel.evaluate() is True
    assert "wb-fresh" in panel.summary.value and panel.table.value == table


def test_a_file_over_the_upload_limit_gets_a_message():
    from workbench.fieldtest.session import UPLOAD_LIMIT_BYTES

    panel = ReadingsPanel.demo()
    table = panel.table.value
    panel.upload.value = upload_value("huge.csv", bytes(UPLOAD_LIMIT_BYTES + 1))
    assert "largest file accepted is 20 MiB" in panel.message.text
    assert panel.table.value == table and "wb-stale" in panel.summary.value
    assert panel.file_name == DEMO_FILE.name  # the demo file stays loaded


def test_a_large_file_shows_a_progress_bar(monkeypatch):
    import workbench.ui.readings_panel as module

    frame = pd.DataFrame({"p1": [1.0] * 40, "t1": [20.0] * 40, "p2": [2.0] * 40,
                          "t2": [90.0] * 40, "m": [1.0] * 40})
    panel = ReadingsPanel("air.csv", frame.to_csv(index=False).encode(), fluid="Air")
    panel.set_column_map({"inlet_pressure": ("p1", "bar(a)"),
                          "inlet_temperature": ("t1", "degC"),
                          "outlet_pressure": ("p2", "bar(a)"),
                          "outlet_temperature": ("t2", "degC"), "mass_flow": ("m", "kg/s")})
    assert "wb-result-progress" in panel.progress._dom_classes
    seen = []
    panel.progress.observe(lambda change: seen.append(
        (change["new"], panel.progress.layout.display)), names="value")
    assert panel.evaluate() is True  # 40 rows: below PROGRESS_ROWS, no bar
    assert seen == [] and panel.progress.layout.display == "none"
    monkeypatch.setattr(module, "PROGRESS_ROWS", 20)  # 40 rows are now a large file
    assert panel.evaluate() is True
    values = [v for v, _ in seen]
    assert values[-1] == 100 and values == sorted(values) and len(values) >= 3
    assert all(display is None for _, display in seen)  # shown while it moved
    assert panel.progress.layout.display == "none"  # hidden when done


def test_readings_ui_modules_import_no_property_library_and_build_no_states():
    # layer rule of the project (DESIGN.md): a panel binds widgets to the session below ui
    import ast
    import pathlib

    import workbench.ui as ui

    folder = pathlib.Path(ui.__file__).parent
    for path in sorted(folder.glob("readings_*.py")):
        tree = ast.parse(path.read_text(encoding="utf-8"))
        for node in ast.walk(tree):
            if isinstance(node, ast.Import):
                assert not any(a.name.split(".")[0] == "CoolProp" for a in node.names), path
            elif isinstance(node, ast.ImportFrom):
                module = node.module or ""
                assert module.split(".")[0] != "CoolProp", path
                assert "fluids" not in module.split("."), (path, module)
                assert "properties" not in module.split("."), (path, module)
            elif isinstance(node, ast.Attribute):
                assert node.attr not in ("state", "states_PT", "states_Ph", "states_Ps",
                                         "propagate_uncertainty", "steady_state_flags",
                                         "compare_with_design"), (path, node.attr)
