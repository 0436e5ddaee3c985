"""The batch's fast paths against the single-point API, row by row.

Frames that hold wet and superheated steam exhausts (IAPWS-IF97 over arrays), a natural gas
approaching its dew line (rows below it, in the table's margin and clear of it: the table's
edge), and readings the core refuses.  Every row's status must equal the single-point API's
and every efficiency must lie within 2e-5 of it (the issue's tolerance; IF97 rows within
1e-9).  The single-point API is the reference (``Fluid.state_PT`` and
:func:`workbench.compressor` / :func:`workbench.turbine`, exact flashes of the property
library); its own checks against iapws and CoolProp are in tests/properties.
"""

import math

import numpy as np
import pandas as pd
import pytest
from iapws import IAPWS97

import workbench as wb
from workbench.properties import fast

GAS = {"Methane": 0.89, "Ethane": 0.06, "Propane": 0.02, "Nitrogen": 0.015,
       "CarbonDioxide": 0.015}
RESULTS = ("power", "isentropic_efficiency")


def _single(frame, machine, fluid):
    """(ok, efficiency, power) of every row by the single-point API (a fresh fluid)."""
    fluid = wb.Fluid(fluid.spec, backend=fluid.backend)
    call = wb.compressor if machine == "compressor" else wb.turbine
    rows = []
    for row in frame.itertuples():
        try:
            inlet = fluid.state_PT(float(row.inlet_pressure), float(row.inlet_temperature))
            if "outlet_temperature" in frame.columns:
                outlet = fluid.state_PT(float(row.outlet_pressure),
                                        float(row.outlet_temperature))
                r = call(inlet, outlet, mass_flow=float(row.mass_flow))
            else:
                r = call(inlet, P_out=float(row.outlet_pressure), power=float(row.power),
                         mass_flow=float(row.mass_flow))
        except wb.WorkbenchError:
            rows.append((False, math.nan, math.nan))
            continue
        rows.append((True, r.isentropic_efficiency, r.power))
    return [np.array(column) for column in zip(*rows)]


def _compare(out, frame, machine, fluid, tolerance):
    ok, eta, power = _single(frame, machine, fluid)
    batch_ok = (out["status"] == "ok").to_numpy()
    assert (batch_ok == ok).all(), np.flatnonzero(batch_ok != ok)
    assert (out.loc[~batch_ok, "message"] != "").all()
    diff = np.abs(out["isentropic_efficiency"].to_numpy()[ok] - eta[ok])
    assert diff.max() <= tolerance
    assert np.allclose(out["power"].to_numpy()[ok], power[ok], rtol=tolerance)
    return ok


def test_steam_rows_with_wet_and_superheated_exhausts_equal_the_single_point_api():
    # invented back-pressure and condensing turbine readings (test data only): the measured
    # power is an efficiency of 0.6 to 0.92 times the isentropic drop from the iapws package
    rng = np.random.default_rng(21)
    n = 300
    p1 = rng.uniform(5e5, 60e5, n)
    t1 = rng.uniform(560.0, 800.0, n)
    p2 = p1 * rng.uniform(0.005, 0.3, n)
    m = rng.uniform(5.0, 15.0, n)
    drop = np.array([IAPWS97(P=a / 1e6, T=b).h - IAPWS97(P=c / 1e6, s=IAPWS97(P=a / 1e6, T=b).s).h
                     for a, b, c in zip(p1, t1, p2)]) * 1e3
    frame = pd.DataFrame({"inlet_pressure": p1, "inlet_temperature": t1,
                          "outlet_pressure": p2, "mass_flow": m,
                          "power": m * drop * rng.uniform(0.6, 0.92, n)})
    frame.loc[0, "power"] = -1.0              # the core refuses a negative power
    frame.loc[1, "outlet_pressure"] = 80e5     # above the inlet: not a turbine
    frame.loc[2, "inlet_temperature"] = 300.0  # liquid at the inlet
    steam = wb.Fluid("Water", backend="IF97")
    out = wb.evaluate(frame, "turbine", steam, results=RESULTS)
    ok = _compare(out, frame, "turbine", steam, 1e-9)
    assert set(out["path"]) == {"exact"}  # IF97 arrays are the same equations
    quality = wb.evaluate(frame, "turbine", steam, results=("outlet_quality",))
    wet = np.isfinite(quality["outlet_quality"].to_numpy())
    assert wet[ok].sum() > 30 and (~wet[ok]).sum() > 30  # both kinds of exhaust


def test_pump_rows_on_if97_equal_the_single_point_api():
    # invented feed-pump readings (test data only): compressed liquid, region 1
    rng = np.random.default_rng(22)
    n = 120
    t1 = rng.uniform(290.0, 420.0, n)
    frame = pd.DataFrame({"inlet_pressure": rng.uniform(3e5, 6e5, n), "inlet_temperature": t1,
                          "outlet_pressure": rng.uniform(20e5, 150e5, n),
                          "outlet_temperature": t1 + rng.uniform(0.3, 2.0, n),
                          "mass_flow": rng.uniform(5.0, 50.0, n)})
    water = wb.Fluid("Water", backend="IF97")
    out = wb.evaluate(frame, "pump", water, results=RESULTS)
    ok, eta, _ = _single_pump(frame, water)
    assert ((out["status"] == "ok").to_numpy() == ok).all()
    assert np.max(np.abs(out["isentropic_efficiency"].to_numpy()[ok] - eta[ok])) <= 1e-9


def _single_pump(frame, fluid):
    fluid = wb.Fluid(fluid.spec, backend=fluid.backend)
    rows = []
    for row in frame.itertuples():
        try:
            r = wb.pump(fluid.state_PT(row.inlet_pressure, row.inlet_temperature),
                        fluid.state_PT(row.outlet_pressure, row.outlet_temperature),
                        mass_flow=row.mass_flow)
        except wb.WorkbenchError:
            rows.append((False, math.nan, math.nan))
            continue
        rows.append((True, r.isentropic_efficiency, r.power))
    return [np.array(column) for column in zip(*rows)]


def _dew_line_frame(n=260, seed=23):
    """Invented compressor readings at 38-42 bar from 217 K (below the dew point, about
    221 K there) to 270 K: rows below the dew line are refused, rows in the table's margin
    are exact, rows clear of it come from the table (test data only)."""
    rng = np.random.default_rng(seed)
    p1 = rng.uniform(38e5, 42e5, n)
    t1 = np.concatenate([rng.uniform(217.0, 232.0, 60), rng.uniform(232.0, 270.0, n - 60)])
    ratio = rng.uniform(1.2, 1.5, n)
    frame = pd.DataFrame({"inlet_pressure": p1, "inlet_temperature": t1,
                          "outlet_pressure": p1 * ratio,
                          "outlet_temperature": t1 * ratio ** 0.3 + rng.uniform(2.0, 8.0, n),
                          "mass_flow": rng.uniform(8.0, 12.0, n)})
    frame.loc[0, "outlet_temperature"] = frame.loc[0, "inlet_temperature"] - 5.0  # no work
    return frame


def test_gas_rows_approaching_the_dew_line_equal_the_single_point_api():
    fast.forget()
    gas = wb.Fluid(GAS)
    frame = _dew_line_frame()
    p1, t1 = frame["inlet_pressure"].to_numpy(), frame["inlet_temperature"].to_numpy()
    out = wb.evaluate(frame, "compressor", gas, results=RESULTS)
    ok = _compare(out, frame, "compressor", gas, fast.EFFICIENCY_TOLERANCE)
    path = out["path"].to_numpy()
    assert (path == "table").sum() > 100 and ((path == "exact") & ok).sum() > 5
    assert (~ok).sum() > 3  # below the dew line: refused by both
    dew = np.array([gas.dew_temperature(p) or 0.0 for p in p1])
    assert (t1[path == "table"] > dew[path == "table"]).all()
    note = out.attrs["tolerance"]
    assert note["table"]["isentropic_efficiency"] == fast.EFFICIENCY_TOLERANCE
    fast.forget()


def test_results_do_not_depend_on_the_block_size(monkeypatch):
    # the whole-array path evaluates blocks of BLOCK_ROWS rows; blocks of 7 rows (the last
    # one short) must give the same frame, row for row, as one block
    from workbench.fieldtest import batch

    gas = wb.Fluid(GAS)
    frame = _dew_line_frame(n=150, seed=5)
    whole = wb.evaluate(frame, "compressor", gas, results=RESULTS)
    monkeypatch.setattr(batch, "BLOCK_ROWS", 7)
    blocks = wb.evaluate(frame, "compressor", gas, results=RESULTS)
    pd.testing.assert_frame_equal(blocks, whole)
    assert set(whole["path"]) == {"table", "exact"} and (whole["status"] != "ok").any()


def test_monte_carlo_draws_use_the_table_and_agree_with_propagation():
    # JCGM 101 / ASME PTC 19.1: Monte Carlo standard deviation against the first-order
    # propagation through the same batch (the sampling error of 4000 draws is about 1 %)
    fast.forget()
    gas = wb.Fluid(GAS)
    readings = {"inlet_pressure": 19e5, "inlet_temperature": 298.0, "outlet_pressure": 41e5,
                "outlet_temperature": 381.0, "mass_flow": 10.0}
    u = {"inlet_temperature": (0.1, 0.05), "outlet_temperature": (0.1, 0.05),
         "inlet_pressure": (200.0, 100.0), "outlet_pressure": (400.0, 200.0)}
    mc = wb.monte_carlo_uncertainty(readings, u, samples=4000, seed=1, machine="compressor",
                                    fluid=gas)
    taylor = wb.propagate_uncertainty(readings, u, machine="compressor", fluid=gas)
    eta = "isentropic_efficiency"
    assert mc.standard_deviation[eta] == pytest.approx(taylor.combined[eta], rel=0.05)
    assert fast.active_table(gas) is not None
    fast.forget()
