"""Tests of the field-test session (workbench.fieldtest.session), without widgets.

References outside the project: the ideal-gas closed form of a compressor's isentropic
efficiency for air (k = 1.4, from memory); unit factors of NIST SP 811 (1 bar = 1e5 Pa,
1 psi = 6894.757 Pa, 1 h = 3600 s); the library's own building blocks run here directly
(readings_from_frame, evaluate, steady_state_flags, propagate_uncertainty) as the reference
for what the session assembles.
"""

import io
import json

import numpy as np
import pandas as pd
import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

import workbench as wb
from workbench.fieldtest import (
    DesignPoint,
    evaluate,
    propagate_uncertainty,
    readings_from_frame,
    steady_state_flags,
)
from workbench.fieldtest import session as ses
from workbench.fieldtest.setup_file import setup_json

MAP = {"inlet_pressure": "p1 bar", "inlet_temperature": "t1 C", "outlet_pressure": "p2 bar",
       "outlet_temperature": "t2 C", "mass_flow": "m kg/s"}
UNITS = {"inlet_pressure": "bar(a)", "inlet_temperature": "degC",
         "outlet_pressure": "bar(a)", "outlet_temperature": "degC", "mass_flow": "kg/s"}
#: Tolerances [SI]: 1 kPa, 1 K, 0.02 kg/s.
TOLERANCES = {"inlet_pressure": 1e3, "inlet_temperature": 1.0, "outlet_pressure": 1e3,
              "outlet_temperature": 1.0, "mass_flow": 0.02}


def air_file(rows: int = 30) -> bytes:
    """An invented air compressor log: 1 -> 2 bar(a), 20 -> 90 degC, 1 kg/s; the outlet
    temperature steps up by 3 K at row 15; row 7's outlet pressure is text, row 9 has the
    outlet below the inlet."""
    t2 = np.where(np.arange(rows) < 15, 90.0, 93.0)
    frame = pd.DataFrame({"time": [f"08:{i:02d}" for i in range(rows)],
                          "p1 bar": 1.0, "t1 C": 20.0, "p2 bar": 2.0, "t2 C": t2,
                          "m kg/s": 1.0})
    frame["p2 bar"] = frame["p2 bar"].astype(object)
    if rows > 9:
        frame.loc[7, "p2 bar"] = "bad"
        frame.loc[9, "p2 bar"] = 0.5
    return frame.to_csv(index=False).encode()


def air_setup(**changes) -> ses.SessionSetup:
    options = dict(column_map=MAP, units=UNITS, machine="compressor", fluid="Air",
                   steady_window=3, steady_tolerances=TOLERANCES,
                   design=DesignPoint(isentropic_efficiency=0.85, power=80e3,
                                      volume_flow=0.8))
    options.update(changes)
    return ses.SessionSetup(**options)


@pytest.fixture(scope="module")
def raw():
    return ses.read_table("air.csv", air_file())


@pytest.fixture(scope="module")
def result(raw):
    return ses.evaluate_session(raw, air_setup())


# ---------------------------------------------------------------------- the file
def test_a_file_over_the_upload_limit_is_refused_before_parsing():
    # 20 MiB + 1 byte of zeros: refused by its size (a NUL check or a parse would say else)
    big = memoryview(bytes(ses.UPLOAD_LIMIT_BYTES + 1))
    with pytest.raises(wb.ReadingsError, match="20.0 MiB: the largest file accepted is 20 MiB"):
        ses.read_table("huge.csv", big)
    with pytest.raises(wb.ReadingsError, match="largest file accepted"):
        ses.read_table("small.csv", air_file(), limit=100)
    assert len(ses.read_table("small.csv", air_file(), limit=10_000)) == 30


@pytest.mark.parametrize("name, content, words", [
    ("empty.csv", b"", "is empty"),
    ("blank.csv", b" \n \n", "is empty"),
    ("header.csv", b"p1 bar,t1 C\n", "header row but no readings"),
    ("junk.csv", b"\x00\x01\x02\xff" * 100, "binary data"),
    ("broken.xlsx", b"PK\x03\x04 not really a workbook", "Excel workbook"),
    ("text.xlsx", b"p1,t1\n1,2\n", "Excel workbook"),
], ids=["empty", "blank", "header-only", "binary", "corrupt-xlsx", "text-as-xlsx"])
def test_broken_files_get_a_message(name, content, words):
    with pytest.raises(wb.ReadingsError, match=words) as info:
        ses.read_table(name, content)
    assert name in str(info.value)


def test_an_excel_workbook_is_read(tmp_path):
    frame = pd.read_csv(io.BytesIO(air_file(5)))
    path = tmp_path / "air.xlsx"
    frame.to_excel(path, index=False)
    raw = ses.read_table("air.xlsx", path.read_bytes())
    assert list(raw.columns) == list(frame.columns) and len(raw) == 5


def test_fluid_text_is_parsed_not_evaluated():
    assert ses.parse_fluid("Methane=0.9; Ethane=0.1").components == ("Methane", "Ethane")
    for bad in ("Methane=__import__('os')", "Methane=1.5; Ethane=0.1", None, 3):
        with pytest.raises(wb.WorkbenchError):
            ses.parse_fluid(bad)
    with pytest.raises(wb.InputError, match="property model"):
        ses.parse_fluid("Air", "ideal")


# ---------------------------------------------------------------------- the setup
@pytest.mark.parametrize("changes, words", [
    ({"machine": "blender"}, "machine"),
    ({"steady_window": 1}, "steady-state window"),
    ({"steady_window": 2.5}, "steady-state window"),
    ({"steady_window": True}, "steady-state window"),
    ({"steady_tolerances": {**TOLERANCES, "mass_flow": -0.1}}, "tolerance of the mass flow"),
    ({"steady_tolerances": {**TOLERANCES, "mass_flow": float("nan")}}, "mass flow"),
    ({"steady_tolerances": {}}, "tolerance of the inlet pressure"),
    ({"ambient_pressure": 5.0}, "ambient pressure"),
    ({"ambient_pressure": wb.Q_(3, "K")}, "ambient pressure"),
    ({"mechanical_efficiency": True}, "mechanical efficiency"),
    ({"mechanical_efficiency": 1.5}, "mechanical efficiency"),
    ({"column_map": {**MAP, "vibration": "v"}}, "reading name"),
    ({"units": {**UNITS, "mass_flow": "furlong/s"}}, "unit of the mass flow column"),
    ({"uncertainty": {"pressure_fraction": 0.01}}, "temperature_K"),
    ({"fluid": None}, "fluid"),
    ({"design": {"power": 1.0}}, "DesignPoint"),
])
def test_setup_refuses_bad_entries_by_name(changes, words):
    with pytest.raises(wb.InputError, match=words):
        air_setup(**changes)


def test_setup_accepts_quantities_at_the_boundary():
    # NIST SP 811: 1 bar = 1e5 Pa
    setup = air_setup(ambient_pressure=wb.Q_(1.013, "bar"))
    assert setup.ambient_pressure == pytest.approx(101300.0, rel=1e-12)


def test_tolerances_typed_in_the_column_unit():
    # NIST SP 811: 1 psi = 6894.757 Pa; 1 degF difference = 5/9 K; 1 h = 3600 s
    si = ses.tolerances_to_si({"inlet_pressure": 2.0, "outlet_temperature": 1.8,
                               "standard_volume_flow": 36.0},
                              {"inlet_pressure": "psig", "outlet_temperature": "degF",
                               "standard_volume_flow": "Sm3/h"})
    assert si["inlet_pressure"] == pytest.approx(2 * 6894.757, rel=1e-7)
    assert si["outlet_temperature"] == pytest.approx(1.0)
    assert si["standard_volume_flow"] == pytest.approx(0.01)
    with pytest.raises(wb.InputError, match="tolerance -0.5 bar of the inlet pressure"):
        ses.tolerances_to_si({"inlet_pressure": -0.5}, {"inlet_pressure": "bar(g)"})


def test_default_tolerances_follow_the_file(raw):
    # common practice (from memory), as documented: 1 % of the median absolute pressure,
    # 1 K for temperatures (1.8 degF), 2 % of the median flow
    assert ses.default_tolerance(raw, "p1 bar", "bar(a)", "inlet_pressure") == 0.01
    assert ses.default_tolerance(raw, "t1 C", "degF", "inlet_temperature") == 1.8
    assert ses.default_tolerance(raw, "m kg/s", "kg/s", "mass_flow") == 0.02
    # a gauge column: 1 % of (0.5 bar(g) + 1.013 bar ambient) = 0.01513 -> 0.015 bar
    gauge = pd.DataFrame({"p": ["0.5", "0.5", "x"]})
    assert ses.default_tolerance(gauge, "p", "bar(g)", "inlet_pressure", 101300.0) == 0.015


def test_setup_file_round_trip(raw):
    setup = air_setup(uncertainty={"pressure_fraction": 0.003, "temperature_K": 0.1,
                                   "flow_fraction": 0.02, "power_fraction": 0.015},
                      ambient_pressure=95000.0, mechanical_efficiency=0.97)
    text = setup_json(setup.to_setup(readings_file="air.csv"))
    loaded = ses.setup_from_file(text.encode("utf-8"), raw, "air.csv")
    assert loaded == ses.SessionSetup(**{**setup.__dict__, "readings_file": "air.csv"})
    assert json.loads(text)["columns"]["mass_flow"]["steady_tolerance_kg_per_s"] == 0.02


def test_setup_file_that_does_not_fit_is_refused(raw):
    good = air_setup().to_setup()
    with pytest.raises(wb.CaseFileError, match="load the readings file first"):
        ses.setup_from_file(good, None)
    with pytest.raises(wb.CaseFileError, match="'fluid'"):
        ses.setup_from_file({**good, "fluid": "Unobtainium"}, raw)
    other = pd.DataFrame({"p1 bar": ["1"]})
    with pytest.raises(wb.CaseFileError, match="columns.outlet_pressure.column"):
        ses.setup_from_file(good, other, "other.csv")


# ---------------------------------------------------------------------- the evaluation
def test_session_results_are_the_library_results(raw, result):
    # Source: the library's readers and batch on the same table, run here directly
    readings = readings_from_frame(raw, MAP, UNITS)
    direct = evaluate(readings, "compressor", wb.Fluid("Air"), results=ses.SESSION_RESULTS)
    assert list(result.results["status"]) == list(direct["status"])
    np.testing.assert_allclose(result.results["isentropic_efficiency"],
                               direct["isentropic_efficiency"], rtol=1e-12)
    assert result.results.loc[7, "status"] == "not a number"
    assert result.results.loc[9, "status"] != "ok"
    # ideal-gas closed form for air (k = 1.4, from memory): eta = T1((P2/P1)^(2/7) - 1)/(T2 - T1)
    eta = 293.15 * (2.0 ** (0.4 / 1.4) - 1) / 70.0
    assert result.results.loc[0, "isentropic_efficiency"] == pytest.approx(eta, rel=5e-3)


def test_steady_flags_and_reasons(raw, result):
    # Source: steady_state_flags() on the same readings with the same tolerances
    expected = steady_state_flags(result.readings, list(TOLERANCES), 3, TOLERANCES)["steady"]
    assert list(result.steady["steady"]) == list(expected)
    assert result.steady_reason(0) == (False, "no: window not yet full")
    assert result.steady_reason(5) == (True, "yes")
    assert result.steady_reason(15) == (False, "no: outlet T")  # the 3 K step, 2 K from mean
    assert result.steady_reason(8)[1] == "no: reading missing in window"  # row 7's text


def test_reflag_changes_the_flags_only(result):
    wider = {**TOLERANCES, "outlet_temperature": 2.5}
    again = ses.reflag(result, 3, wider)
    assert again.results is result.results and again.uncertainty is result.uncertainty
    expected = steady_state_flags(result.readings, list(wider), 3, wider)["steady"]
    assert list(again.steady["steady"]) == list(expected)
    # the 3 K step strays 2 K from its 3-row window mean (by hand): steady within 2.5 K
    assert again.steady_reason(15) == (True, "yes")
    assert again.summary()["steady"] > result.summary()["steady"]
    longer = ses.reflag(result, 6, TOLERANCES)
    assert longer.setup.steady_window == 6 and result.setup.steady_window == 3
    assert longer.steady_reason(4) == (False, "no: window not yet full")
    with pytest.raises(wb.InputError, match="steady-state window"):
        ses.reflag(result, 1, wider)


def test_uncertainty_sample_is_propagate_uncertainty(result):
    # Source: the library's propagate_uncertainty at the first sampled row, with the default
    # instrument uncertainties (0.25 % of pressures, 0.2 K, 1 % of flow; ASME PTC 19.1)
    u = result.uncertainty
    ok = result.results.index[result.results["status"] == "ok"]
    assert len(u) == ses.UNCERTAINTY_ROWS and set(u["row"]) <= set(ok)
    assert u["row"].iloc[0] == ok[0] and u["row"].iloc[-1] == ok[-1]  # spread over the file
    row = result.readings.loc[u["row"].iloc[0]]
    nominal = {name: float(row[name]) for name in MAP}
    b = {"inlet_pressure": 0.0025, "outlet_pressure": 0.0025, "mass_flow": 0.01}
    unc = {name: (b[name] * nominal[name] if name in b else 0.2, 0.0) for name in MAP}
    report = propagate_uncertainty(nominal, unc, ("isentropic_efficiency", "shaft_power"),
                                   machine="compressor", fluid=wb.Fluid("Air"))
    assert u["U95_isentropic_efficiency"].iloc[0] == pytest.approx(
        report.expanded["isentropic_efficiency"], rel=1e-9)
    assert u["U95_shaft_power"].iloc[0] == pytest.approx(report.expanded["shaft_power"],
                                                         rel=1e-9)


def test_summary_chart_series_table_and_export(result):
    r = result.results
    ok = r["status"] == "ok"
    s = result.summary()
    assert (s["rows"], s["ok"], s["flagged"]) == (30, int(ok.sum()), int((~ok).sum()))
    assert s["mean_isentropic_efficiency"] == pytest.approx(r.loc[ok, "isentropic_efficiency"]
                                                            .mean(), rel=1e-12)
    series = result.chart_series()
    steady = result.steady["steady"]
    x, y, err = series["efficiency"]["steady rows"]
    np.testing.assert_array_equal(x, r.loc[ok & steady, "inlet_volume_flow"])
    np.testing.assert_array_equal(y, r.loc[ok & steady, "isentropic_efficiency"])
    assert err is None
    assert len(series["shaft_power"]["unsteady rows"][0]) == int((ok & ~steady).sum())
    x, y, err = series["shaft_power"]["U95 at sampled rows"]
    np.testing.assert_array_equal(err, result.uncertainty["U95_shaft_power"])
    assert series["efficiency"]["design point"][:2] == ([0.8], [0.85])
    assert series["shaft_power"]["design point"][:2] == ([0.8], [80e3])
    shown = result.table_rows(10)
    assert list(shown.index[:2]) == [7, 9] and len(shown) == 10  # flagged rows first
    # efficiency deviation is 100 (eta - 0.85) points (definition)
    np.testing.assert_allclose(shown.loc[ok[shown.index], "efficiency_deviation_points"],
                               100 * (shown.loc[ok[shown.index], "isentropic_efficiency"]
                                      - 0.85))
    exported = pd.read_csv(io.BytesIO(result.export_csv()))
    assert len(exported) == 30 and list(exported["steady"]) == list(steady)
    assert "not a number" in exported.loc[7, "message"]
    assert "power_deviation_percent" in exported.columns


def test_progress_counts_rows_and_samples(raw):
    calls = []
    ses.evaluate_session(raw, air_setup(), progress=lambda done, total: calls.append(
        (done, total)))
    total = 30 + ses.UNCERTAINTY_ROWS
    assert calls[0] == (0, total) and calls[-1] == (total, total)
    assert all(t == total for _, t in calls)
    assert [d for d, _ in calls] == sorted(d for d, _ in calls)
    with pytest.raises(wb.InputError, match="progress"):
        ses.evaluate_session(raw, air_setup(), progress="yes")


def test_progress_is_passed_to_a_batch_that_reports_it(raw, monkeypatch):
    # the batch's own progress(done, total), once it has one, moves the session's bar
    def batch(frame, machine, fluid, *, progress=None, **options):
        progress(len(frame) // 2, len(frame))
        return evaluate(frame, machine, fluid, **options)

    monkeypatch.setattr(ses, "evaluate", batch)
    calls = []
    ses.evaluate_session(raw, air_setup(), progress=lambda d, t: calls.append(d))
    assert calls[:3] == [0, 15, 30]


# ---------------------------------------------------------------------- hostile entries
#: Values a user, a file or a setup may hand over where something else belongs.
HOSTILE = st.one_of(
    st.none(), st.booleans(), st.integers(), st.integers(min_value=10**300),
    st.floats(allow_nan=True, allow_infinity=True), st.text(max_size=30), st.binary(max_size=20),
    st.lists(st.integers(), max_size=3), st.dictionaries(st.text(max_size=3), st.integers(),
                                                         max_size=2),
    st.sampled_from([wb.Q_(1.0, "bar"), wb.Q_(3.0, "K"), "bar(g)", "p1 bar", "Air", 0, 1e-300]))
SETUP_KEYS = ("column_map", "units", "machine", "fluid", "property_model", "ambient_pressure",
              "mechanical_efficiency", "steady_window", "steady_tolerances", "uncertainty",
              "design", "readings_file")
FAST = settings(max_examples=150, deadline=None, derandomize=True,
                suppress_health_check=[HealthCheck.too_slow])


@FAST
@given(name=st.sampled_from(["r.csv", "r.xlsx", "r.txt", "r"]),
       content=st.one_of(st.binary(max_size=400),
                         st.text(max_size=400).map(lambda t: t.encode("utf-8"))))
def test_any_bytes_give_a_table_or_a_readings_error(name, content):
    # the file reader's contract (DESIGN.md): a table, or a WorkbenchError naming the file
    try:
        table = ses.read_table(name, content)
    except wb.WorkbenchError as exc:
        assert name in str(exc)
    else:
        assert isinstance(table, pd.DataFrame) and len(table) > 0


@FAST
@given(key=st.sampled_from(SETUP_KEYS), value=HOSTILE)
def test_hostile_setup_entries_are_refused_by_name_or_kept_valid(key, value):
    try:
        setup = air_setup(**{key: value})
    except wb.WorkbenchError as exc:
        assert str(exc)  # a message, never a raw exception
    else:
        assert setup.steady_window >= 2 and 0 < setup.mechanical_efficiency <= 1
        assert set(setup.steady_tolerances) == set(setup.column_map)


@FAST
@given(text=st.one_of(HOSTILE, st.text(alphabet="Methane=0.5;,Ethan -1e+x", max_size=30)))
def test_fluid_text_gives_a_fluid_or_a_message(text):
    try:
        fluid = ses.parse_fluid(text)
    except wb.WorkbenchError as exc:
        assert str(exc)
    else:
        assert isinstance(fluid, wb.Fluid)


@FAST
@given(path=st.sampled_from([("machine",), ("fluid",), ("ambient_pressure_Pa",),
                             ("steady_window_rows",), ("columns",),
                             ("columns", "mass_flow"), ("columns", "mass_flow", "unit"),
                             ("columns", "inlet_pressure", "steady_tolerance_Pa"),
                             ("instrument_uncertainty", "flow_fraction"),
                             ("design_point", "speed_rpm"), ("format_version",)]),
       value=HOSTILE)
def test_hostile_setup_files_are_refused_by_key(raw, path, value):
    data = json.loads(json.dumps(air_setup().to_setup()))
    where = data
    for key in path[:-1]:
        where = where[key]
    where[path[-1]] = value if not isinstance(value, (bytes, wb.Q_)) else repr(value)
    try:
        setup = ses.setup_from_file(data, raw, "air.csv")
    except wb.CaseFileError as exc:
        assert path[0] in str(exc) or "setup" in str(exc)
    else:
        assert isinstance(setup, ses.SessionSetup)
