"""Curves case files: the demo cases evaluate, hostile case files are refused by section."""

import json

import pytest

import workbench as wb
from workbench.curves.cases import evaluate_curves_case, list_curves_demos, load_curves_demo


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
