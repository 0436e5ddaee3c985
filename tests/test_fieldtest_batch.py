"""Tests of workbench.fieldtest.batch: row-by-row equality with the single-point API, bad rows,
steam against the iapws package (IAPWS-IF97)."""

import pathlib

import numpy as np
import pandas as pd
import pytest
from iapws import IAPWS97

import workbench as wb
from workbench.errors import InputError
from workbench.fieldtest import evaluate, read_readings

DATA = pathlib.Path(wb.__file__).parent / "data" / "booster_compressor_readings.csv"
GAS = {"Methane": 0.89, "Ethane": 0.06, "Propane": 0.02, "Nitrogen": 0.015,
       "CarbonDioxide": 0.015}
COLUMN_MAP = {
    "inlet_pressure": "PT-201 suction bar(g)", "inlet_temperature": "TT-201 suction degC",
    "outlet_pressure": "PT-202 discharge bar(g)", "outlet_temperature": "TT-202 discharge degC",
    "standard_volume_flow": "FT-200 flow Sm3/h", "power": "JI-200 shaft kW",
    "speed": "ST-200 speed rpm",
}
UNITS = {"inlet_pressure": "bar(g)", "outlet_pressure": "bar(g)", "inlet_temperature": "degC",
         "outlet_temperature": "degC", "standard_volume_flow": "Sm3/h", "power": "kW",
         "speed": "rpm"}


def air_frame(n=12, seed=3):
    rng = np.random.default_rng(seed)
    p1 = rng.uniform(0.95e5, 1.05e5, n)
    t1 = rng.uniform(285, 300, n)
    p2 = p1 * rng.uniform(1.5, 3.0, n)
    t2 = t1 * (p2 / p1) ** (0.4 / 1.4) + rng.uniform(15, 40, n)
    return pd.DataFrame({"inlet_pressure": p1, "inlet_temperature": t1, "outlet_pressure": p2,
                         "outlet_temperature": t2, "mass_flow": rng.uniform(1, 5, n)},
                        index=pd.RangeIndex(100, 100 + n))


def test_batch_equals_single_point_api_row_by_row():
    # Source: the single-point core API (workbench.compressor), called row by row
    frame = air_frame()
    air = wb.Fluid("Air")
    results = ("power", "isentropic_efficiency", "polytropic_head", "polytropic_efficiency",
               "outlet_temperature")
    out = evaluate(frame, "compressor", air, results=results)
    assert list(out.index) == list(frame.index)
    assert (out["status"] == "ok").all()
    for i, row in frame.iterrows():
        single = wb.compressor(air.state(P=row.inlet_pressure, T=row.inlet_temperature),
                               air.state(P=row.outlet_pressure, T=row.outlet_temperature),
                               mass_flow=row.mass_flow)
        assert out.loc[i, "power"] == pytest.approx(single.power, rel=1e-12)
        assert out.loc[i, "isentropic_efficiency"] == pytest.approx(
            single.isentropic_efficiency, rel=1e-12)
        assert out.loc[i, "polytropic_head"] == pytest.approx(single.polytropic_head, rel=1e-9)
        assert out.loc[i, "polytropic_efficiency"] == pytest.approx(
            single.polytropic_efficiency, rel=1e-9)


def test_steam_turbine_from_power_against_iapws():
    # Source: IAPWS-IF97 through the iapws package; rating from measured power
    # (h2 = h1 - P / m, eta = (h1 - h2) / (h1 - h2s)); exhaust wet for some rows.
    frame = pd.DataFrame({
        "inlet_pressure": [40e5, 60e5, 25e5], "inlet_temperature": [673.15, 723.15, 633.15],
        "outlet_pressure": [5e5, 0.2e5, 3e5], "power": [4.5e6, 9.0e6, 3.0e6],
        "mass_flow": [12.0, 11.0, 10.0]})
    steam = wb.Fluid("Water", backend="IF97")
    out = evaluate(frame, "turbine", steam,
                   results=("power", "isentropic_efficiency", "outlet_quality"))
    assert (out["status"] == "ok").all(), out["message"].tolist()
    for i, row in frame.iterrows():
        inlet = IAPWS97(P=row.inlet_pressure / 1e6, T=row.inlet_temperature)
        iso = IAPWS97(P=row.outlet_pressure / 1e6, s=inlet.s)
        h2 = inlet.h - row.power / row.mass_flow / 1e3  # kJ/kg
        eta = (inlet.h - h2) / (inlet.h - iso.h)
        assert out.loc[i, "isentropic_efficiency"] == pytest.approx(eta, rel=2e-5)
        assert out.loc[i, "power"] == pytest.approx(row.power, rel=1e-9)
        exhaust = IAPWS97(P=row.outlet_pressure / 1e6, h=h2)
        if exhaust.x < 1:
            assert out.loc[i, "outlet_quality"] == pytest.approx(exhaust.x, abs=2e-5)
        else:
            assert np.isnan(out.loc[i, "outlet_quality"])
    assert np.isfinite(out.loc[1, "outlet_quality"])  # 0.2 bar exhaust is wet


def test_volume_flows_become_mass_flows():
    # Source: ideal-gas closed form, rho = P / (R T) for air at 1 atm, 15 degC (Z = 0.9996,
    # from memory), R = 8.314462618 / 0.0289647 J/(kg K)
    frame = air_frame(3).drop(columns="mass_flow")
    frame["standard_volume_flow"] = [1.0, 2.0, 3.0]
    out = evaluate(frame, "compressor", "Air", results=("mass_flow",))
    rho_ideal = 101325.0 / (8.314462618 / 0.0289647 * 288.15)
    np.testing.assert_allclose(out["mass_flow"], rho_ideal * np.array([1.0, 2.0, 3.0]),
                               rtol=1e-3)
    frame = frame.rename(columns={"standard_volume_flow": "Q1"})
    out = evaluate(frame, "compressor", "Air", columns={"volume_flow": "Q1"},
                   results=("mass_flow", "inlet_volume_flow"))
    np.testing.assert_allclose(out["inlet_volume_flow"], [1.0, 2.0, 3.0], rtol=1e-12)
    rho1 = frame.inlet_pressure / (8.314462618 / 0.0289647 * frame.inlet_temperature)
    np.testing.assert_allclose(out["mass_flow"], rho1 * np.array([1.0, 2.0, 3.0]), rtol=2e-3)


def test_bad_file_every_row_back_bad_rows_flagged():
    # Source: the demo file's own list of deliberately bad rows (see tests/data/
    # make_demo_readings.py); every other row is computed (common practice: no row dropped)
    readings = read_readings(DATA, COLUMN_MAP, UNITS, ambient_pressure=101300.0)
    raw = pd.read_csv(DATA, dtype=str)
    out = evaluate(readings, "compressor", wb.Fluid(GAS), mechanical_efficiency=0.985)
    assert len(out) == len(raw) == 300
    assert list(out["timestamp"]) == list(raw["timestamp"])
    expected = {37: ("missing reading", "outlet temperature"),
                88: ("not a number", "inlet pressure"),
                150: ("not a number", "standard volume flow"),
                201: ("invalid reading", "inlet pressure"),
                244: ("invalid reading", "outlet pressure"),
                270: ("inconsistent readings", "isentropic efficiency")}
    for row, (status, words) in expected.items():
        assert out.loc[row, "status"] == status
        assert words in out.loc[row, "message"]
        assert out.loc[row, ["power", "isentropic_efficiency"]].isna().all()
    good = out.drop(index=list(expected))
    assert (good["status"] == "ok").all()
    assert (good["message"] == "").all()
    assert good[["power", "isentropic_efficiency", "isentropic_head"]].notna().all().all()
    # the invented scenario used isentropic efficiencies of 0.75 to 0.79
    assert good["isentropic_efficiency"].between(0.73, 0.80).all()
    # shaft power in the file came from the same mechanical efficiency: within the rounding
    np.testing.assert_allclose(good["shaft_power"], good["reading_power"], rtol=2e-3)
    assert not out["message"].str.contains("CoolProp").any()


def test_results_choice_and_missing_columns():
    frame = air_frame(2)
    out = evaluate(frame, "compressor", "Air", results=("power",), keep_inputs=False)
    assert list(out.columns) == ["status", "message", "path", "power"]
    with pytest.raises(InputError, match="unknown result"):
        evaluate(frame, "compressor", "Air", results=("efficiency",))
    with pytest.raises(InputError, match="no column for outlet_temperature"):
        evaluate(frame.drop(columns="outlet_temperature"), "compressor", "Air", mode="outlet")
    empty = evaluate(frame.iloc[:0], "compressor", "Air")
    assert len(empty) == 0 and "power" in empty.columns


def test_text_cells_in_a_plain_frame_are_flagged():
    # A frame built by hand (not through the readers) with text in a number column
    frame = air_frame(3).astype(object)
    frame.loc[101, "outlet_temperature"] = "fault"
    out = evaluate(frame, "compressor", "Air")
    assert list(out["status"]) == ["ok", "not a number", "ok"]
    assert "'fault'" in out.loc[101, "message"]


def test_any_readings_give_one_row_each_with_a_status():
    # Property-based: whatever the numbers, every row comes back with a status; ok rows have
    # finite results and rows with a message have NaN results (common practice: no row dropped)
    hypothesis = pytest.importorskip("hypothesis")
    st = hypothesis.strategies
    reading = st.one_of(st.floats(allow_nan=True, allow_infinity=True, width=32),
                        st.floats(min_value=0.5e5, max_value=5e5),
                        st.floats(min_value=250.0, max_value=500.0))

    @hypothesis.settings(max_examples=40, deadline=None)
    @hypothesis.given(st.lists(st.tuples(reading, reading, reading, reading, reading),
                               min_size=1, max_size=6))
    def check(rows):
        frame = pd.DataFrame(rows, columns=["inlet_pressure", "inlet_temperature",
                                            "outlet_pressure", "outlet_temperature",
                                            "mass_flow"])
        out = evaluate(frame, "compressor", AIR, results=("power", "isentropic_efficiency"))
        assert len(out) == len(frame) and list(out.index) == list(frame.index)
        ok = out["status"] == "ok"
        assert out.loc[ok, ["power", "isentropic_efficiency"]].notna().all().all()
        assert out.loc[~ok, ["power", "isentropic_efficiency"]].isna().all().all()
        assert (out.loc[~ok, "message"] != "").all()
        assert not out["message"].str.contains("CoolProp").any()
        assert (out["status"] != "failed").all(), out["message"].tolist()

    check()


AIR = wb.Fluid("Air")


def test_repeated_readings_give_identical_rows():
    # A historian export repeating its last value: the repeated rows equal the first one
    frame = pd.concat([air_frame(2)] * 3, ignore_index=True)
    frame.loc[4, "outlet_pressure"] = 0.5e5  # one repeated row made bad: it alone is flagged
    out = evaluate(frame, "compressor", AIR)
    assert list(out["status"]) == ["ok", "ok", "ok", "ok", "invalid reading", "ok"]
    for i in (2, 5):
        assert out.loc[i, "power"] == out.loc[i - 2, "power"]


def test_a_bad_cell_in_an_unused_column_does_not_stop_the_row():
    csv = ("P1,T1,P2,T2,m,kW\n"
           "1.0,20,2.0,90,1.0,\n"          # shaft power missing: not needed from outlet T
           "1.0,20,2.0,90,1.0,80\n"
           "1.0,20,2.0,,1.0,80\n")         # outlet temperature missing: needed
    import io
    readings = read_readings(io.StringIO(csv), {
        "inlet_pressure": "P1", "inlet_temperature": "T1", "outlet_pressure": "P2",
        "outlet_temperature": "T2", "mass_flow": "m", "power": "kW"},
        {"inlet_pressure": "bar(a)", "inlet_temperature": "degC", "outlet_pressure": "bar(a)",
         "outlet_temperature": "degC", "mass_flow": "kg/s", "power": "kW"})
    out = evaluate(readings, "compressor", AIR, mode="outlet")
    assert list(out["status"]) == ["ok", "ok", "missing reading"]
    assert out.loc[0, "power"] == out.loc[1, "power"]
    assert "outlet temperature" in out.loc[2, "message"]


def _single_point(machine, fluid, row, mode):
    """The single-point core API for one row: (result, None) or (None, error text)."""
    try:
        inlet = fluid.state_PT(float(row.inlet_pressure), float(row.inlet_temperature))
        if mode == "outlet":
            outlet = fluid.state_PT(float(row.outlet_pressure), float(row.outlet_temperature))
            return wb.energy_balance(machine, inlet, outlet, mass_flow=row.mass_flow), None
        return wb.energy_balance(machine, inlet, P_out=float(row.outlet_pressure),
                                 power=float(row.power), mass_flow=row.mass_flow), None
    except wb.errors.WorkbenchError as exc:
        return None, str(exc)


@pytest.mark.parametrize("machine, backend, mode", [
    ("turbine", "IF97", "power"), ("turbine", "HEOS", "power"), ("pump", "IF97", "outlet"),
    ("compressor", "HEOS", "outlet")])
def test_whole_array_path_equals_single_point_api(machine, backend, mode, monkeypatch):
    # Source: the single-point core API (workbench.energy_balance) row by row, for pure fluids,
    # which the batch evaluates with whole-array flashes.  Bad rows in the mix (reversed
    # pressure ratio, power beyond the property range, efficiency above 1, an outlet at the
    # saturation temperature) must carry the core's own message.
    rng = np.random.default_rng(5)
    n = 24
    fluid = wb.Fluid("Water", backend=backend) if machine != "compressor" else wb.Fluid("Air")
    if machine == "turbine":
        m = rng.uniform(10, 14, n)
        frame = pd.DataFrame({
            "inlet_pressure": rng.uniform(38e5, 42e5, n),
            "inlet_temperature": rng.uniform(650, 690, n),
            "outlet_pressure": rng.choice([0.1e5, 5e5, 12e5], n),  # wet and superheated
            "power": m * rng.uniform(250e3, 700e3, n), "mass_flow": m})
        frame.loc[3, "outlet_pressure"] = 50e5  # reversed ratio
        frame.loc[5, "power"] = 1e12  # no state at that enthalpy
        frame.loc[7, "power"] = 10.0 * 2.0e6  # efficiency above 1 at the 0.1 bar rows
        frame.loc[7, "outlet_pressure"] = 5e5
    elif machine == "pump":
        p1 = rng.uniform(2e5, 4e5, n)
        frame = pd.DataFrame({
            "inlet_pressure": p1, "inlet_temperature": rng.uniform(300, 400, n),
            "outlet_pressure": rng.uniform(80e5, 120e5, n), "mass_flow": rng.uniform(20, 40, n)})
        frame["outlet_temperature"] = frame["inlet_temperature"] + rng.uniform(0.3, 1.5, n)
        frame.loc[2, "outlet_temperature"] = frame.loc[2, "inlet_temperature"] - 2.0
        frame.loc[4, "inlet_temperature"] = 450.0  # steam at the inlet of a pump
        frame.loc[6, "outlet_pressure"] = 1e5
    else:
        frame = air_frame(n).reset_index(drop=True)
        frame.loc[1, "outlet_temperature"] = frame.loc[1, "inlet_temperature"] + 1.0
        frame.loc[8, "outlet_pressure"] = 0.5e5
    from workbench.fieldtest import batch

    calls = []

    def counted(*args, **options):
        calls.append(1)
        return wb.energy_balance(*args, **options)

    monkeypatch.setattr(batch, "energy_balance", counted)
    out = evaluate(frame, machine, fluid, mode=mode,
                   results=("power", "shaft_power", "isentropic_efficiency", "isentropic_head",
                            "outlet_temperature", "outlet_quality", "inlet_volume_flow",
                            "outlet_temperature_sensitivity", "pressure_ratio"))
    assert len(out) == n
    # only the rows the arrays could not settle went through the single-point API
    assert 0 < len(calls) == (out["status"] != "ok").sum()
    statuses = set()
    for i, row in frame.iterrows():
        single, error = _single_point(machine, fluid, row, mode)
        statuses.add(error is None)
        if error is not None:
            assert out.loc[i, "status"] != "ok"
            assert out.loc[i, "message"] == error
            assert np.isnan(out.loc[i, "power"])
            continue
        assert out.loc[i, "status"] == "ok", out.loc[i, "message"]
        for column, value in (("power", single.power), ("shaft_power", single.shaft_power),
                              ("isentropic_efficiency", single.isentropic_efficiency),
                              ("isentropic_head", single.isentropic_head),
                              ("outlet_temperature", single.outlet.T),
                              ("inlet_volume_flow", single.inlet_volume_flow),
                              # higher over lower pressure for every machine, a turbine's
                              # inlet over outlet (common practice)
                              ("pressure_ratio", single.pressure_ratio)):
            assert out.loc[i, column] == pytest.approx(value, rel=1e-10), column
        sensitivity = single.outlet_temperature_sensitivity
        if np.isnan(sensitivity):
            assert np.isnan(out.loc[i, "outlet_temperature_sensitivity"])
        else:
            assert out.loc[i, "outlet_temperature_sensitivity"] == pytest.approx(sensitivity,
                                                                                 rel=1e-9)
        if not single.outlet.two_phase:
            assert np.isnan(out.loc[i, "outlet_quality"])
        else:
            assert out.loc[i, "outlet_quality"] == pytest.approx(single.outlet.x, abs=1e-10)
    assert statuses == {True, False}
