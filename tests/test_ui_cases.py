"""Tests of the machine panel's case files (workbench.ui.cases): plain JSON, validated.

JSON rules checked against RFC 8259 (NaN and Infinity are not JSON numbers).
"""

import json

import pytest

import workbench as wb
from workbench.ui import MachinePanel, cases


@pytest.fixture(scope="module")
def panel():
    return MachinePanel(case="compressor-demo")


def test_demo_cases_are_listed_and_valid():
    names = cases.list_demo_cases()
    assert {"compressor-demo", "turbine-demo"} <= set(names)
    comp = cases.load_demo_case("compressor-demo")["inputs"]
    assert comp["fluid_kind"] == "mixture" and len(comp["composition"]) == 4
    assert comp["outlet_fixed_by"] == "measured outlet"
    turb = cases.load_demo_case("turbine-demo")["inputs"]
    assert turb["fluid_name"] == "Water" and turb["outlet_fixed_by"] == "measured power"


def test_round_trip_through_a_file(panel, tmp_path):
    panel.set_values(**{"mass-flow": 13.5, "outlet-pressure": 58.0})
    case = panel.to_case()
    path = tmp_path / "case.json"
    path.write_text(json.dumps(case), encoding="utf-8")
    other = MachinePanel(case="turbine-demo")
    assert other.load_case(path) is True, other.message.text
    assert other.to_case() == case
    assert other.shown("power") == panel.shown("power")
    # stored values are SI: 13.5 kg/s, 58 bar = 5.8e6 Pa
    assert case["inputs"]["outlet_pressure_Pa"] == pytest.approx(5.8e6)
    assert case["inputs"]["mass_flow_kg_per_s"] == pytest.approx(13.5)


@pytest.mark.parametrize("change, words", [
    ({"colour": "blue"}, "unknown"),
    ({"inlet_pressure_Pa": "20 bar"}, "must be a number"),
    ({"inlet_pressure_Pa": -1.0}, "outside the allowed range"),
    ({"isentropic_efficiency": 1.5}, "outside the allowed range"),
    ({"machine": "blender"}, "must be one of"),
    ({"mass_flow_kg_per_s": True}, "must be a number"),
    ({"outlet_pressure_Pa": 1.0e6}, "not above inlet pressure"),  # physically wrong
])
def test_invalid_case_leaves_the_panel_unchanged(panel, change, words):
    before = panel.to_case()
    result_before = panel.result
    bad = panel.to_case()
    bad["inputs"].update(change)
    assert panel.load_case(bad) is False
    assert words in panel.message.text
    assert panel.message.text.startswith("case not loaded")
    assert panel.to_case() == before
    assert panel.result is result_before


def test_nan_and_bad_json_are_refused(panel):
    before = panel.to_case()
    text = panel.case_json().replace("2000000.0", "NaN", 1)
    assert panel.load_case(text) is False
    assert panel.load_case(b"{not json") is False
    assert "not valid JSON" in panel.message.text
    assert panel.to_case() == before


def test_validate_case_raises_case_file_error():
    with pytest.raises(wb.CaseFileError):
        cases.validate_case({"format": "something else", "format_version": 1})
    with pytest.raises(wb.CaseFileError):
        cases.validate_case([1, 2])
    full = cases.validate_case({"format": cases.FORMAT_NAME, "format_version": 1,
                                "inputs": {"machine": "fan"}})
    assert full["inputs"]["machine"] == "fan"
    assert set(full["inputs"]) == set(cases.DEFAULT_INPUTS)


def test_upload_widget_and_download_link(panel):
    import base64
    import datetime

    other = MachinePanel(case="turbine-demo")
    other._refresh_case_link()
    encoded = other.case_link.value.split("base64,")[1].split("'")[0]
    assert json.loads(base64.b64decode(encoded)) == other.to_case()
    data = json.dumps(panel.to_case()).encode("utf-8")
    other.upload.value = ({"name": "case.json", "type": "application/json", "size": len(data),
                           "content": memoryview(data),
                           "last_modified": datetime.datetime(2026, 1, 1)},)
    assert other.message.text.startswith("case loaded"), other.message.text
    assert other.to_case() == panel.to_case()
