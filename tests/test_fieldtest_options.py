"""Options of the field-test batch go through the input boundary; progress; import layout.

Refusals are checked by the input's name in the message (the project's rule: a message names
the input, its value and the allowed values).
"""

import ast
import pathlib
import subprocess
import sys

import numpy as np
import pandas as pd
import pytest

import workbench as wb
from workbench.errors import InputError
from workbench.fieldtest import evaluate, with_unit_headers
from workbench.fieldtest.options import RESULTS, batch_options

AIR = wb.Fluid("Air")


def frame(n=3):
    rng = np.random.default_rng(7)
    p1 = rng.uniform(0.95e5, 1.05e5, n)
    t1 = rng.uniform(285, 300, n)
    p2 = p1 * rng.uniform(1.5, 3.0, n)
    # ideal-gas isentropic outlet T1 (P2/P1)^(0.4/1.4) plus 15-40 K of losses
    t2 = t1 * (p2 / p1) ** (0.4 / 1.4) + rng.uniform(15, 40, n)
    return pd.DataFrame({"inlet_pressure": p1, "inlet_temperature": t1, "outlet_pressure": p2,
                         "outlet_temperature": t2, "mass_flow": rng.uniform(1, 5, n)})


@pytest.mark.parametrize("options, word", [
    (dict(basis="x"), "basis"),
    (dict(basis=None), "basis"),
    (dict(mode="x"), "mode"),
    (dict(machine="boiler"), "machine"),
    (dict(columns=["inlet_pressure"]), "columns"),
    (dict(columns={"inlet_pressure": 3}), "column name for inlet_pressure"),
    (dict(columns={"inlet_press": "P1"}), "reading name in columns"),
    (dict(results=("efficiency",)), "unknown result"),
    (dict(results=("power", "power")), "twice"),
    (dict(results=5), "results"),
    (dict(mechanical_efficiency=0.0), "mechanical efficiency"),
    (dict(mechanical_efficiency=1.5), "mechanical efficiency"),
    (dict(mechanical_efficiency=True), "mechanical efficiency"),
    (dict(mechanical_efficiency="0.9"), "mechanical efficiency"),
    (dict(standard_conditions=(288.15,)), "standard conditions"),
    (dict(standard_conditions=(288.15, "1 atm")), "standard pressure"),
    (dict(standard_conditions=(-1.0, 101325.0)), "standard temperature"),
    (dict(keep_inputs="yes"), "keep_inputs"),
    (dict(fluid=3), "fluid"),
    (dict(progress=5), "progress"),
])
def test_options_refused_by_name(options, word):
    options = {"machine": "compressor", "fluid": AIR, **options}
    with pytest.raises(InputError, match=word):
        evaluate(frame(), **options)


def test_frame_must_be_a_dataframe():
    with pytest.raises(InputError, match="DataFrame"):
        evaluate([[1e5, 300.0, 2e5, 380.0, 1.0]], "compressor", AIR)


def test_options_accept_quantities_and_one_result_name():
    options = batch_options("compressor", "Air", results="power",
                            mechanical_efficiency=wb.Q_(98, "percent"),
                            standard_conditions=(wb.Q_(15, "degC"), wb.Q_(1.01325, "bar")))
    assert options.results == ("power",)
    assert options.mechanical_efficiency == pytest.approx(0.98)
    assert options.standard_conditions == pytest.approx((288.15, 101325.0))


def test_result_units_come_from_the_fields_table():
    assert RESULTS["shaft_power"].unit == "W"
    assert RESULTS["isentropic_head"].unit == "J/kg"
    assert RESULTS["pump_head"].unit == "m"
    out = evaluate(frame(), "compressor", AIR, results=("shaft_power", "isentropic_efficiency"),
                   keep_inputs=False)
    # status, message and the path each row took (exact or table), then the results
    assert list(with_unit_headers(out).columns) == ["status", "message", "path",
                                                    "shaft power [W]",
                                                    "isentropic efficiency [-]"]


@pytest.mark.parametrize("fluid, n", [(AIR, 200), (wb.Fluid({"Methane": 0.9, "Ethane": 0.1}), 60)])
def test_progress_every_five_per_cent_and_at_the_end(fluid, n):
    # the whole-array path (pure fluid) and the row-by-row path (mixture; the repeated rows
    # are solved once but counted)
    readings = frame(3).iloc[np.arange(n) % 3].reset_index(drop=True)
    readings.loc[5, "inlet_pressure"] = np.nan  # flagged before any calculation
    readings.loc[7, "outlet_pressure"] = 0.5e5  # refused by the core
    calls = []
    out = evaluate(readings, "compressor", fluid, progress=lambda done, total: calls.append(
        (done, total)))
    assert len(out) == n and list(out.index) == list(readings.index)
    assert calls[-1] == (n, n)
    assert all(total == n for _, total in calls)
    done = [0] + [d for d, _ in calls]
    assert done == sorted(done)
    step = int(np.ceil(0.05 * n))
    assert max(np.diff(done)) <= 2 * step
    assert (out["status"] != "ok").sum() == 2


def test_progress_on_an_empty_frame():
    calls = []
    evaluate(frame().iloc[:0], "compressor", AIR, progress=lambda d, t: calls.append((d, t)))
    assert calls == [(0, 0)]


def test_zero_measured_power_refused_by_name():
    # A measured power of 0 rates nothing (it gave an efficiency of 3e-15 before)
    steam = wb.Fluid("Water", backend="IF97")
    readings = pd.DataFrame({"inlet_pressure": [40e5, 40e5], "inlet_temperature": [673.15] * 2,
                             "outlet_pressure": [5e5, 5e5], "power": [0.0, 4.5e6],
                             "mass_flow": [12.0, 12.0]})
    out = evaluate(readings, "turbine", steam, results=("isentropic_efficiency",))
    assert list(out["status"]) == ["invalid reading", "ok"]
    assert "power 0 W" in out.loc[0, "message"]
    assert np.isnan(out.loc[0, "isentropic_efficiency"])


def test_progress_is_refused_for_a_dask_frame():
    dd = pytest.importorskip("dask.dataframe")
    with pytest.raises(InputError, match="progress"):
        evaluate(dd.from_pandas(frame(), npartitions=1), "compressor", AIR,
                 progress=lambda d, t: None)


def test_no_import_cycle_and_no_dask_on_import():
    # dask_batch imports neither the batch module nor dask; importing the workbench does not
    # import dask's DataFrame (pint alone may import dask's core when dask is installed)
    source = pathlib.Path(wb.__file__).parent / "fieldtest" / "dask_batch.py"
    imported = [alias.name if isinstance(node, ast.Import) else (node.module or "")
                for node in ast.walk(ast.parse(source.read_text()))
                if isinstance(node, (ast.Import, ast.ImportFrom))
                for alias in node.names]
    assert not any("batch" in name or name.startswith("dask") for name in imported), imported
    code = ("import sys, workbench, workbench.fieldtest; "
            "print(sorted(m for m in sys.modules if m.startswith(('dask.dataframe', "
            "'distributed'))))")
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True,
                         check=True, cwd=pathlib.Path(wb.__file__).parent.parent)
    assert out.stdout.strip() == "[]", out.stdout
