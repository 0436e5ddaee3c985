"""Benchmark of the field-test batch evaluation (prints rows per second and ratios).

Run (from the repository root)::

    python benchmarks/batch_benchmark.py            # 100,000 steam rows, 10,000 gas rows
    python benchmarks/batch_benchmark.py --quick    # smaller counts, about a minute

Three comparisons, all in this one process and run:

1. Steam turbine rated from measured power (IAPWS-IF97 through ``Fluid("Water",
   backend="IF97")``): :func:`workbench.fieldtest.evaluate` on the whole frame against a naive
   row-by-row loop of high-level ``CoolProp.CoolProp.PropsSI`` calls (``"Water"``, the
   library's default IAPWS-95 model, four calls a row), timed on a subset of 200 rows (rows/s
   reported for that subset).  For a like-for-like view the same loop on ``"IF97::Water"`` is
   also printed: that loop uses the IF97 backward equations as they are (inconsistent with the
   forward equations by up to ~25 mK), while the batch makes every state consistent with the
   forward equations, as the single-point API does.
2. Natural-gas booster compressor rated from measured outlet temperature (five-component
   mixture): the batch against naive ``PropsSI`` calls with a mixture string
   (``"HEOS::Methane[0.89]&..."``), timed on a subset of 20 rows.
3. The dask path on a ``distributed.LocalCluster`` of 2 worker processes against 1 (one
   thread each), same frame; cluster start-up and a warm-up of every worker on other readings
   (imports, the fluid's dew-line table) are not timed.

The naive loops and the batch give the same efficiencies (the largest difference is printed).
The machine has 2 cores shared with other work: ratios vary from run to run.  The direct
``CoolProp`` calls here are the naive baseline only; the workbench's own flashes all happen in
``workbench/properties/``.
"""

from __future__ import annotations

import argparse
import time

import numpy as np
import pandas as pd

import workbench as wb
from workbench.fieldtest import evaluate

GAS = {"Methane": 0.89, "Ethane": 0.06, "Propane": 0.02, "Nitrogen": 0.015,
       "CarbonDioxide": 0.015}


def steam_rows(n, seed=1):
    """Invented back-pressure turbine readings (demo only)."""
    rng = np.random.default_rng(seed)
    m = rng.uniform(10.0, 14.0, n)
    return pd.DataFrame({
        "inlet_pressure": rng.uniform(38e5, 42e5, n),
        "inlet_temperature": rng.uniform(663.15, 683.15, n),
        "outlet_pressure": rng.uniform(4.5e5, 5.5e5, n),
        "mass_flow": m,
        "power": m * rng.uniform(360e3, 410e3, n),
    })


def gas_rows(n, seed=2):
    """Invented booster-compressor readings (demo only)."""
    rng = np.random.default_rng(seed)
    p1 = rng.uniform(18e5, 20e5, n)
    t1 = rng.uniform(293.15, 303.15, n)
    ratio = rng.uniform(2.0, 2.3, n)
    t2 = t1 * ratio ** 0.27 + rng.uniform(5.0, 12.0, n)
    return pd.DataFrame({"inlet_pressure": p1, "inlet_temperature": t1,
                         "outlet_pressure": p1 * ratio, "outlet_temperature": t2,
                         "mass_flow": rng.uniform(8.0, 12.0, n)})


def naive_steam(frame, fluid="Water"):
    import CoolProp.CoolProp as CP

    eta = []
    for row in frame.itertuples():
        h1 = CP.PropsSI("H", "P", row.inlet_pressure, "T", row.inlet_temperature, fluid)
        s1 = CP.PropsSI("S", "P", row.inlet_pressure, "T", row.inlet_temperature, fluid)
        h2s = CP.PropsSI("H", "P", row.outlet_pressure, "S", s1, fluid)
        h2 = h1 - row.power / row.mass_flow
        CP.PropsSI("T", "P", row.outlet_pressure, "H", h2, fluid)
        eta.append((h1 - h2) / (h1 - h2s))
    return np.array(eta)


def naive_steam_if97(frame):
    return naive_steam(frame, "IF97::Water")


def naive_gas(frame):
    import CoolProp.CoolProp as CP

    fluid = "HEOS::" + "&".join(f"{k}[{v}]" for k, v in GAS.items())
    eta = []
    for row in frame.itertuples():
        h1 = CP.PropsSI("H", "P", row.inlet_pressure, "T", row.inlet_temperature, fluid)
        s1 = CP.PropsSI("S", "P", row.inlet_pressure, "T", row.inlet_temperature, fluid)
        h2 = CP.PropsSI("H", "P", row.outlet_pressure, "T", row.outlet_temperature, fluid)
        h2s = CP.PropsSI("H", "P", row.outlet_pressure, "S", s1, fluid)
        eta.append((h2s - h1) / (h2 - h1))
    return np.array(eta)


def timed(function, *args, **options):
    start = time.perf_counter()
    value = function(*args, **options)
    return value, time.perf_counter() - start


def compare(label, frame, machine, fluid, naive, naive_rows, results, same_model=None):
    out, t_batch = timed(evaluate, frame, machine, fluid, results=results)
    ok = int((out["status"] == "ok").sum())
    subset = frame.iloc[:naive_rows]
    eta_naive, t_naive = timed(naive, subset)
    batch_rate = len(frame) / t_batch
    naive_rate = len(subset) / t_naive
    diff = np.nanmax(np.abs(eta_naive - out["isentropic_efficiency"].to_numpy()[:naive_rows]))
    print(f"{label}: batch {len(frame)} rows ({ok} ok) in {t_batch:.2f} s = "
          f"{batch_rate:,.0f} rows/s")
    print(f"{label}: naive PropsSI loop on a subset of {len(subset)} rows in {t_naive:.2f} s = "
          f"{naive_rate:,.1f} rows/s")
    print(f"{label}: ratio batch/naive = {batch_rate / naive_rate:.1f}x (aim >= 20x); "
          f"largest efficiency difference {diff:.1e}")
    if same_model is not None:
        subset = frame.iloc[:naive_rows * 10]
        eta_same, t_same = timed(same_model, subset)
        same_rate = len(subset) / t_same
        diff = np.nanmax(np.abs(eta_same - out["isentropic_efficiency"].to_numpy()[:len(subset)]))
        print(f"{label}: same-model naive loop (IF97 backward equations as they are) on "
              f"{len(subset)} rows = {same_rate:,.0f} rows/s; ratio batch/same-model = "
              f"{batch_rate / same_rate:.1f}x; largest efficiency difference {diff:.1e}")
    return batch_rate / naive_rate


def dask_scaling(frame, machine, fluid, results, partitions):
    import dask.dataframe as dd
    from distributed import Client, LocalCluster

    rates = {}
    warm = gas_rows(120, seed=99)
    for workers in (1, 2):
        with LocalCluster(n_workers=workers, threads_per_worker=1, processes=True,
                          dashboard_address=None) as cluster, Client(cluster) as client:
            lazy = evaluate(dd.from_pandas(frame, npartitions=partitions), machine, fluid,
                            results=results)
            # Warm up every worker on other readings (imports, the fluid's dew-line table),
            # as a long-running cluster would be: the timed run measures throughput.
            client.run(evaluate, warm, machine, fluid, results=results)
            start = time.perf_counter()
            out = client.compute(lazy).result()
            elapsed = time.perf_counter() - start
        rates[workers] = len(frame) / elapsed
        print(f"dask, {workers} worker(s): {len(out)} rows in {elapsed:.2f} s = "
              f"{rates[workers]:,.0f} rows/s")
    print(f"dask: ratio 2 workers / 1 worker = {rates[2] / rates[1]:.2f}x (aim >= 1.6x)")
    return rates[2] / rates[1]


def main(argv=None):
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--quick", action="store_true", help="smaller row counts")
    args = parser.parse_args(argv)
    n_steam, n_gas, n_dask = (5_000, 500, 600) if args.quick else (100_000, 10_000, 3_000)
    steam = wb.Fluid("Water", backend="IF97")
    gas = wb.Fluid(GAS)
    ratios = {}
    ratios["steam"] = compare("steam turbine (IF97)", steam_rows(n_steam), "turbine", steam,
                              naive_steam, 200,
                              ("power", "isentropic_efficiency", "outlet_temperature"),
                              same_model=naive_steam_if97)
    ratios["gas"] = compare("gas compressor (mixture)", gas_rows(n_gas), "compressor", gas,
                            naive_gas, 5 if args.quick else 20,
                            ("power", "isentropic_efficiency", "outlet_temperature"))
    ratios["dask"] = dask_scaling(gas_rows(n_dask, seed=3), "compressor", gas,
                                  ("power", "isentropic_efficiency"), partitions=8)
    print("ratios: " + ", ".join(f"{k} {v:.2f}x" for k, v in ratios.items()))


if __name__ == "__main__":
    main()
