"""Curves case files: the demo cases evaluate, hostile case files are refused by section;
test points from a readings result file."""

import json

import numpy as np
import pytest

import workbench as wb
from workbench.curves.cases import (
    evaluate_curves_case,
    list_curves_demos,
    load_curves_demo,
    points_from_readings,
)
from workbench.fieldtest.session import read_table


def test_demo_cases_evaluate():
    assert {"pump-loop-demo", "compressor-co2-shop-test-demo"} <= set(list_curves_demos())
    pump = evaluate_curves_case(load_curves_demo("pump-loop-demo"))
    # the operating point lies where the curve meets the system (definition)
    op = pump.operating_point
    assert op.total_head == pytest.approx(pump.system.head(op.volume_flow), rel=1e-9)
    assert op.npsh_margin > 0
    assert pump.acceptance.grade.name == "2B" and pump.acceptance.verdict in ("pass", "fail")
    comp = evaluate_curves_case(load_curves_demo("compressor-co2-shop-test-demo"))
    sim = comp.similarity
    assert {c.parameter for c in sim.checks} == {"specific_volume_ratio", "flow_coefficient",
                                                 "machine_mach_number",
                                                 "machine_reynolds_number"}
    assert sim.uncertainty.expanded["power"] > 0
    # conversion at equal flow coefficient (closed form, PTC 10 section 5)
    ratio = sim.specified.speed / sim.test.speed
    assert sim.converted.polytropic_head == pytest.approx(sim.test.polytropic_head * ratio ** 2)


def test_round_trip_through_json_text():
    data = load_curves_demo("pump-loop-demo")
    again = evaluate_curves_case(json.loads(json.dumps(data)))
    assert again.operating_point.volume_flow == pytest.approx(
        evaluate_curves_case(data).operating_point.volume_flow)


@pytest.mark.parametrize("change, match", [
    (lambda d: d.update(format="something else"), "case format"),
    (lambda d: d.update(format_version=True), "format_version"),
    (lambda d: d.update(kind="turbine"), "case kind"),
    (lambda d: d.update(colour="red"), "unknown keys"),
    (lambda d: d["curve"].update(head="high"), "curve"),
    (lambda d: d["system"].update(temperature=-5.0), "system"),
    (lambda d: d["system"]["sections"][0].update(diameter=0.0), "section diameter"),
    (lambda d: d["acceptance"].update(grade="9Z"), "acceptance grade"),
    (lambda d: d["acceptance"].pop("test_flow"), "acceptance lacks test_flow"),
    (lambda d: d.update(curve=[1, 2]), "curve"),
    (lambda d: d.update(similarity={}), "is for compressors"),
])
def test_hostile_cases_are_refused(change, match):
    data = load_curves_demo("pump-loop-demo")
    change(data)
    with pytest.raises(wb.CaseFileError, match=match):
        evaluate_curves_case(data)


def test_compressor_case_refusals():
    data = load_curves_demo("compressor-co2-shop-test-demo")
    data["similarity"]["uncertainties"]["speed"] = [-1.0, 0.0]
    with pytest.raises(wb.CaseFileError, match="uncertainty of speed"):
        evaluate_curves_case(data)
    with pytest.raises(wb.CaseFileError, match="unknown curves demo"):
        load_curves_demo("../etc/passwd")
    with pytest.raises(wb.CaseFileError, match="JSON object"):
        evaluate_curves_case("pump-loop-demo")


# a readings result file as the readings dashboard exports it (SI values, speed in rpm as
# workbench.fieldtest.readers keeps it; invented test data)
PUMP_RESULTS = ("status,steady,inlet_volume_flow,isentropic_head,shaft_power,speed\n"
                "ok,True,0.15,412.0,75000,1473\n"
                "ok,True,0.10,450.0,66000,1475\n"
                "inconsistent readings,False,0.12,,,1474\n"
                "ok,False,0.13,430.0,70000,1474\n"
                "ok,True,0.20,340.0,80000,1474\n")


def test_pump_points_from_a_readings_result_file():
    points = points_from_readings(read_table("r.csv", PUMP_RESULTS.encode()), "pump")
    # only ok and steady rows, sorted by flow
    assert points["test_flow"].tolist() == [0.10, 0.15, 0.20]
    assert points["test_power"].tolist() == [66000.0, 75000.0, 80000.0]
    # head = isentropic head / g for a liquid (common practice; g = 9.80665 m/s2,
    # ISO 80000-3)
    assert points["test_head"] == pytest.approx(np.array([450.0, 412.0, 340.0]) / 9.80665)
    # the mean speed of the usable rows; 1 rpm = 2 pi / 60 rad/s (NIST SP 811)
    assert points["test_speed"] == pytest.approx((1475 + 1473 + 1474) / 3 * 2 * np.pi / 60)


def test_compressor_point_is_the_mean_of_the_usable_rows():
    csv = ("status,steady,inlet_pressure,inlet_temperature,outlet_pressure,"
           "reading_outlet_temperature,inlet_volume_flow,speed\n"
           "ok,True,299000,299.8,546000,352.4,0.3861,6730\n"
           "ok,True,301000,300.2,547600,352.72,0.3881,6742\n"
           "ok,False,250000,280.0,500000,340.0,0.30,6000\n"
           "ok,True,301000,300.2,547600,not read,0.3881,6742\n")
    points = points_from_readings(read_table("c.csv", csv.encode()), "compressor")
    assert points["discharge_pressure"].tolist() == [546800.0]
    assert points["discharge_temperature"][0] == pytest.approx(352.56)
    assert points["speed"][0] == pytest.approx(6736.0 * 2 * np.pi / 60)


@pytest.mark.parametrize("csv, machine, match", [
    ("time,p1\n1,2\n", "pump", "no status column"),
    ("status,inlet_volume_flow\nok,0.1\n", "pump", "no column 'isentropic_head'"),
    ("status,steady,inlet_volume_flow,isentropic_head,shaft_power,speed\n"
     "ok,False,0.1,400,60000,1480\nfailed,True,0.1,400,60000,1480\n", "pump", "no row is usable"),
    (PUMP_RESULTS, "fan", "machine must be one of"),
])
def test_unusable_readings_files_are_refused_by_name(csv, machine, match):
    with pytest.raises(wb.WorkbenchError, match=match):
        points_from_readings(read_table("r.csv", csv.encode()), machine)
    with pytest.raises(wb.WorkbenchError, match="must be a table"):
        points_from_readings("status,flow", "pump")
