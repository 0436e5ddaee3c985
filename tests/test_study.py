"""Tests of the calculation functions the panels bind to: workbench.study (machine studies,
sweeps, result values, chart series), workbench.train_study and workbench.machine_case.

Outside references: CoolProp called directly (densities at standard and inlet conditions),
the ideal-gas closed form of an isentropic compression, IAPWS-IF97 through the ``iapws``
package, ISO 13443 standard reference conditions (15 degC, 101.325 kPa) and RFC 8259 (JSON).
"""

from __future__ import annotations

import json
import math
import pathlib

import numpy as np
import pytest
from CoolProp.CoolProp import PropsSI
from iapws import IAPWS97

from workbench import machine_case, study, train_study
from workbench.errors import CaseFileError, InputError, WorkbenchError
from workbench.units import Q_

GAS = {"fluid_kind": "pure", "fluid_name": "Nitrogen", "machine": "compressor",
       "outlet_fixed_by": "isentropic efficiency", "inlet_pressure_Pa": 1.0e5,
       "inlet_temperature_K": 300.0, "outlet_pressure_Pa": 2.0e5,
       "isentropic_efficiency": 0.8}


def test_standard_volume_flow_uses_the_density_at_iso_13443_conditions():
    # ISO 13443: 288.15 K and 101325 Pa; density from CoolProp directly
    rho_std = PropsSI("D", "T", 288.15, "P", 101325.0, "Nitrogen")
    r = study.machine_study({**GAS, "flow_given": "standard volume flow",
                             "volume_flow_m3_per_s": 2.0})
    assert r.mass_flow == pytest.approx(2.0 * rho_std, rel=1e-9)


def test_inlet_volume_flow_uses_the_inlet_density():
    rho_in = PropsSI("D", "T", 300.0, "P", 1.0e5, "Nitrogen")  # CoolProp directly
    r = study.machine_study({**GAS, "flow_given": "inlet volume flow",
                             "volume_flow_m3_per_s": 0.5})
    assert r.mass_flow == pytest.approx(0.5 * rho_in, rel=1e-9)


def test_standard_volume_flow_of_a_liquid_is_refused_by_name():
    with pytest.raises(InputError, match="standard volume flow is for gases"):
        study.machine_study({"fluid_name": "Water", "machine": "pump",
                             "inlet_temperature_K": 300.0, "outlet_pressure_Pa": 5e5,
                             "flow_given": "standard volume flow"})


def test_air_compression_at_low_pressure_matches_the_ideal_gas_closed_form():
    # ideal gas, k = 1.4: T2s = T1 (P2/P1)^((k-1)/k); w = cp (T2s - T1) / eta with
    # cp = 1004.5 J/(kg K) (from memory, dry air near 300 K); 1 % for real-gas and cp(T)
    r = study.machine_study({**GAS, "fluid_name": "Air", "mass_flow_kg_per_s": 2.0})
    t2s = 300.0 * 2.0 ** (0.4 / 1.4)
    assert r.power == pytest.approx(2.0 * 1004.5 * (t2s - 300.0) / 0.8, rel=0.01)


def test_inputs_the_options_do_not_use_are_not_read():
    # the volume flow is not used with a mass flow, so a bad value there does not stop it
    r = study.machine_study({**GAS, "flow_given": "mass flow", "volume_flow_m3_per_s": -1.0})
    assert r.mass_flow == 1.0
    with pytest.raises(InputError, match="volume_flow_m3_per_s"):
        study.machine_study({**GAS, "flow_given": "inlet volume flow",
                             "volume_flow_m3_per_s": -1.0})


@pytest.mark.parametrize("key, value, words", [
    ("inlet_pressure_Pa", True, "must be a number"),
    ("inlet_pressure_Pa", "2 bar", "must be a number"),
    ("inlet_pressure_Pa", math.nan, "finite"),
    ("inlet_pressure_Pa", 10 ** 400, "too large"),
    ("inlet_pressure_Pa", -1.0, "outside the allowed range"),
    ("isentropic_efficiency", 1.5, "outside the allowed range"),
    ("machine", "blender", "must be one of"),
    ("colour", "blue", "unknown input"),
    ("fluid_name", "Air\x00", "control characters"),
])
def test_bad_inputs_are_refused_by_name(key, value, words):
    with pytest.raises(InputError) as info:
        study.machine_study({**GAS, key: value})
    assert words in str(info.value)
    assert key in str(info.value) or key == "colour" and "'colour'" in str(info.value)


def test_quantities_are_converted_at_the_boundary():
    # 1 bar = 1e5 Pa, 26.85 degC = 300 K (definitions)
    a = study.machine_study({**GAS, "inlet_pressure_Pa": Q_(1.0, "bar"),
                             "inlet_temperature_K": Q_(26.85, "degC")})
    b = study.machine_study(GAS)
    assert a.power == pytest.approx(b.power, rel=1e-12)
    with pytest.raises(InputError, match="not a unit of pressure"):
        study.machine_study({**GAS, "inlet_pressure_Pa": Q_(1.0, "m")})


def test_result_values_follow_the_fields_table_and_quote_ratios_high_over_low():
    r = study.machine_study({"fluid_name": "Water", "machine": "turbine",
                             "inlet_pressure_Pa": 40e5, "inlet_temperature_K": 673.15,
                             "outlet_pressure_Pa": 10e5, "isentropic_efficiency": 0.8})
    v = study.result_values(r, ["pressure_ratio", "outlet_quality", "outlet_pressure",
                                "shaft_power"])
    assert v["pressure_ratio"] == pytest.approx(4.0, rel=1e-12)  # 40 bar / 10 bar
    assert math.isnan(v["outlet_quality"])  # superheated at 10 bar: no quality
    assert v["outlet_pressure"] == pytest.approx(10e5, rel=1e-9)
    assert v["shaft_power"] == r.shaft_power
    with pytest.raises(KeyError):
        study.result_values(r, ["no_such_field"])


def test_sweep_matches_single_studies_and_leaves_gaps_in_order():
    values = [0.5e5, 2.0e5, 3.0e5]  # the first is below the inlet pressure: refused
    s = study.sweep(GAS, "outlet-pressure", values, ["power", "outlet_temperature"])
    assert list(s.values) == values and len(s.failures) == 1 and s.failures[0][0] == 0
    assert math.isnan(s.columns["power"][0])
    for i in (1, 2):
        one = study.machine_study({**GAS, "outlet_pressure_Pa": values[i]})
        assert s.columns["power"][i] == pytest.approx(one.power, rel=1e-12)
        assert s.columns["outlet_temperature"][i] == pytest.approx(one.outlet.T, rel=1e-12)


def test_sweeping_an_efficiency_fixes_the_outlet_by_it():
    s = study.sweep({**GAS, "outlet_fixed_by": "measured power"}, "isentropic-efficiency",
                    [0.7, 0.9], ["isentropic_efficiency"])
    assert list(s.columns["isentropic_efficiency"]) == pytest.approx([0.7, 0.9], rel=1e-9)


@pytest.mark.parametrize("kwargs, words", [
    ({"variable": "colour", "values": [1.0]}, "sweep variable"),
    ({"variable": "mass-flow", "values": []}, "1 to 200 points"),
    ({"variable": "mass-flow", "values": [1.0, math.inf]}, "values of mass-flow"),
    ({"variable": "mass-flow", "values": [1.0], "names": ["nope"]}, "not in workbench.fields"),
])
def test_bad_sweep_settings_are_refused(kwargs, words):
    with pytest.raises(InputError, match=words):
        study.sweep(GAS, **kwargs)
    with pytest.raises(InputError, match="sweep points"):
        study.sweep_values(1.0, 2.0, 1)


def test_process_series_end_at_the_result_states():
    r = study.machine_study(GAS)
    pts = study.process_series(r, path_steps=8)
    s, h, T = pts["ends"]
    assert list(h) == [r.inlet.h, r.outlet.h] and list(T) == [r.inlet.T, r.outlet.T]
    # a constant-efficiency path at the result's polytropic efficiency ends at its outlet
    assert pts["path"][1][-1] == pytest.approx(r.outlet.h, rel=2e-3)
    assert pts["dome label"] == "saturation dome" and np.isfinite(pts["dome"][0]).any()


def test_train_study_steam_uses_iapws_if97():
    r = train_study.train_study("extraction turbine", {})
    inlet = r.train.stations[0].state
    # IAPWS-IF97 through the iapws package: h at 4.2 MPa, 713.15 K [kJ/kg]
    assert inlet.h == pytest.approx(IAPWS97(P=4.2, T=713.15).h * 1e3, rel=1e-6)
    v = train_study.train_values(r)
    assert v["total_shaft_power"] == pytest.approx(r.total_power, rel=1e-12)
    hp, lp = v["stage_pressure_ratios"]
    assert hp == pytest.approx(38.0 / 12.0, rel=1e-9) and lp == pytest.approx(3.0, rel=1e-9)


@pytest.mark.parametrize("inputs, words", [
    ({"stages": True}, "whole number"),
    ({"stages": 9}, "stages"),
    ({"gas": "Helium3"}, "gas must be one of"),
    ({"cooler_pressure_drop": -1.0}, "cooler pressure drop"),
    ({"mass_flow": 0.0}, "mass flow"),
    ({"colour": 1}, "unknown"),
])
def test_train_study_refuses_bad_inputs_by_name(inputs, words):
    with pytest.raises(InputError, match=words):
        train_study.train_study("intercooled compressor", inputs)
    with pytest.raises(InputError, match="train scenario"):
        train_study.train_study("pipeline", {})


# ---------------------------------------------------------------------- case files

def _case(**inputs):
    return {"format": machine_case.FORMAT_NAME, "format_version": 1, "inputs": inputs}


def test_text_given_as_a_case_is_never_opened_as_a_path(tmp_path, monkeypatch):
    good = json.dumps(_case(machine="fan"))
    (tmp_path / "case.json").write_text(good, encoding="utf-8")
    monkeypatch.chdir(tmp_path)
    with pytest.raises(CaseFileError, match="not valid JSON"):
        machine_case.read_case("case.json")  # a file of that name exists; it is not read
    assert machine_case.read_case(pathlib.Path("case.json"))["inputs"]["machine"] == "fan"
    assert machine_case.read_case(good.encode())["inputs"]["machine"] == "fan"


@pytest.mark.parametrize("source, words", [
    ("[1, 2]", "JSON object"),
    ("[" * 100_000 + "]" * 100_000, "deep"),
    ('{"format_version": ' + "9" * 5000 + "}", "5000 digits"),
    ('{"a": NaN}', "NaN"),
    (b"\xff\xfe", "UTF-8"),
    (json.dumps(_case(inlet_pressure_Pa=10 ** 30)), "31 digits"),
    (json.dumps(_case(fluid_name="Air\u0000")), "null character"),
    (json.dumps(_case(machine=["compressor"])), "must be one of"),
    (json.dumps({**_case(), "extra": 1}), "unknown case file key"),
    (json.dumps({**_case(), "title": "a\u0001"}), "control characters"),
    (12, "not int"),
])
def test_hostile_case_sources_get_messages(source, words):
    with pytest.raises(CaseFileError) as info:
        machine_case.read_case(source)
    assert words in str(info.value)


def test_a_folder_is_refused_with_a_message(tmp_path):
    with pytest.raises(CaseFileError, match="is a folder"):
        machine_case.read_case(tmp_path)


def test_every_shipped_demo_case_runs():
    for name in machine_case.list_demo_cases():
        case = machine_case.load_demo_case(name)
        r = study.machine_study(case["inputs"])
        assert math.isfinite(r.power) and r.power > 0
    with pytest.raises(WorkbenchError, match="unknown demo case"):
        machine_case.load_demo_case("../secrets")
