"""Benchmark of the field-test batch evaluation (prints rows per second and ratios).

Run (from the repository root)::

    python benchmarks/batch_benchmark.py            # 100,000 steam rows, 10,000 gas rows
    python benchmarks/batch_benchmark.py --quick    # smaller counts, about a minute
    python benchmarks/batch_benchmark.py --profile  # also where the batch spends its time

Every comparison runs in this one process, on the same rows, with the same result columns
(power and isentropic efficiency):

1. Steam turbine rated from measured power (IAPWS-IF97, ``Fluid("Water", backend="IF97")``):
   :func:`workbench.fieldtest.evaluate` on the whole frame against the loop a skilled user
   writes by hand: one ``CoolProp.AbstractState("IF97", "Water")`` updated with P-T (inlet),
   P-s (isentropic outlet) and P-h (actual outlet) inputs, three updates a row.  The naive
   loop of high-level ``PropsSI`` calls (four a row) is the second line.
2. Natural-gas booster compressor rated from measured outlet temperature (five components):
   the batch against a skilled loop over one ``AbstractState("HEOS", ...)`` with
   ``specify_phase(iphase_gas)``: P-T updates for inlet and outlet and a Newton iteration on
   temperature for the isentropic outlet with (ds/dT)_P = cp/T (about six updates a row).  The
   naive ``PropsSI`` loop on a mixture string is the second line.
3. Accuracy: the largest difference in isentropic efficiency between the batch and the exact
   single-point API (``Fluid.state_PT`` and :func:`workbench.turbine` /
   :func:`workbench.compressor` row by row) over the whole frame, and the number of rows whose
   status differs.
4. Monte Carlo uncertainty of one test point with 10,000 draws
   (:func:`workbench.monte_carlo_uncertainty`) against the same draws through the
   single-point API (timed on a subset, rate printed).
5. The dask path on a ``distributed.LocalCluster`` of 2 worker processes against 1 (one
   thread each, started under :data:`workbench.fieldtest.dask_batch.CLUSTER_SETTINGS`),
   800,000 rows (a machine-year and a half of one-minute readings) in 32 partitions, best of
   11 rounds; cluster start-up and a warm-up of every worker on other readings (imports,
   tables) are not timed.  In the same rounds the same partitions run on 1 and 2 plain worker
   processes without dask: their ratio is what this shared machine gives at the time, the
   ceiling for dask's.  One run of one worker under distributed's default settings shows what
   the settings change.

The machine has 2 cores shared with other work: rates are per second of this process's CPU
time (wall time varies with whatever else runs), except for dask, whose worker processes are
timed by the wall clock; compare the ratios, which are measured in the same run.  The
direct ``CoolProp`` calls here are the baselines only; the workbench's own flashes all happen in its property layer.
"""

from __future__ import annotations

import argparse
import cProfile
import io
import math
import os
import pstats
import time

import numpy as np
import pandas as pd

import workbench as wb
from workbench.fieldtest import evaluate
from workbench.properties import fast

GAS = {"Methane": 0.89, "Ethane": 0.06, "Propane": 0.02, "Nitrogen": 0.015,
       "CarbonDioxide": 0.015}
RESULTS = ("power", "isentropic_efficiency")


def steam_rows(n, seed=1):
    """Invented back-pressure turbine readings (demo only); some exhausts are wet."""
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


# ---------------------------------------------------------------- skilled hand-written loops
def skilled_steam(frame):
    """One IF97 state object, three updates a row: power and isentropic efficiency."""
    import CoolProp
    import CoolProp.CoolProp as CP

    st = CoolProp.AbstractState("IF97", "Water")
    n = len(frame)
    power, eta = np.full(n, np.nan), np.full(n, np.nan)
    cols = [frame[c].to_numpy(float) for c in ("inlet_pressure", "inlet_temperature",
                                               "outlet_pressure", "mass_flow", "power")]
    for i, (p1, t1, p2, m, w) in enumerate(zip(*cols)):
        try:
            st.update(CP.PT_INPUTS, p1, t1)
            h1, s1 = st.hmass(), st.smass()
            st.update(CP.PSmass_INPUTS, p2, s1)
            h2s = st.hmass()
            h2 = h1 - w / m
            st.update(CP.HmassP_INPUTS, h2, p2)  # the outlet state (temperature, quality)
            st.T()
        except ValueError:
            continue
        power[i] = m * (h1 - h2)
        eta[i] = (h1 - h2) / (h1 - h2s)
    return power, eta


def skilled_gas(frame):
    """One phase-specified HEOS mixture state, P-T updates and Newton on T for the isentrope."""
    import CoolProp
    import CoolProp.CoolProp as CP

    st = CoolProp.AbstractState("HEOS", "&".join(GAS))
    st.set_mole_fractions(list(GAS.values()))
    st.specify_phase(CoolProp.iphase_gas)
    n = len(frame)
    power, eta = np.full(n, np.nan), np.full(n, np.nan)
    cols = [frame[c].to_numpy(float) for c in ("inlet_pressure", "inlet_temperature",
                                               "outlet_pressure", "outlet_temperature",
                                               "mass_flow")]
    updates = 0
    for i, (p1, t1, p2, t2, m) in enumerate(zip(*cols)):
        try:
            st.update(CP.PT_INPUTS, p1, t1)
            h1, s1, cp1, cv1 = st.hmass(), st.smass(), st.cpmass(), st.cvmass()
            st.update(CP.PT_INPUTS, p2, t2)
            h2 = st.hmass()
            updates += 2
            T = t1 * (p2 / p1) ** (1.0 - cv1 / cp1)  # ideal-gas start
            for _ in range(20):
                st.update(CP.PT_INPUTS, p2, T)
                updates += 1
                step = (s1 - st.smass()) * T / st.cpmass()  # (ds/dT)_P = cp/T
                T += step
                if abs(step) < 1e-7 * T:
                    break
            st.update(CP.PT_INPUTS, p2, T)
            updates += 1
            h2s = st.hmass()
        except ValueError:
            continue
        power[i] = m * (h2 - h1)
        eta[i] = (h2s - h1) / (h2 - h1)
    skilled_gas.updates_per_row = updates / max(n, 1)
    return power, eta


# ---------------------------------------------------------------- naive PropsSI loops
def naive_steam(frame, fluid="IF97::Water"):
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


# ---------------------------------------------------------------- exact single-point API
def exact_rows(frame, machine, fluid):
    """Status and isentropic efficiency of every row by the single-point API."""
    fluid = wb.Fluid(fluid.spec, backend=fluid.backend)  # its own caches
    n = len(frame)
    ok, eta = np.zeros(n, bool), np.full(n, np.nan)
    outlet_mode = "outlet_temperature" in frame.columns
    call = wb.compressor if machine == "compressor" else wb.turbine
    for i, row in enumerate(frame.itertuples()):
        try:
            inlet = fluid.state_PT(float(row.inlet_pressure), float(row.inlet_temperature))
            if outlet_mode:
                outlet = fluid.state_PT(float(row.outlet_pressure),
                                        float(row.outlet_temperature))
                result = call(inlet, outlet, mass_flow=float(row.mass_flow))
            else:
                result = call(inlet, P_out=float(row.outlet_pressure), power=float(row.power),
                              mass_flow=float(row.mass_flow))
        except wb.WorkbenchError:
            continue
        ok[i], eta[i] = True, result.isentropic_efficiency
    return ok, eta


def timed(function, *args, **options):
    """Value and the CPU time [s] of this process spent computing it.

    CPU time, not wall time: on a shared machine the wall time of a run depends on what
    else runs meanwhile, and the batch and the loops it is compared with run at different
    moments.  Everything timed here runs in this one thread (the batch avoids the threaded
    linear-algebra library), so its CPU time is its cost.
    """
    start = time.process_time()
    value = function(*args, **options)
    return value, time.process_time() - start


def _rate(rows, seconds):
    return rows / seconds if seconds > 0 else math.inf


def compare(label, frame, machine, fluid, skilled, naive, naive_rows, exact_limit):
    """Batch against the skilled loop (same rows), the naive loop (a subset) and the exact API.

    The process is warmed up first on other readings of the same size (imports, the memory
    allocator's pools), as a long-running session would be, and the first, cold call is
    printed too; property tables and phase envelopes are then forgotten, so the timed batch
    builds its own (their cost is in its time).
    """
    warm = (steam_rows if machine == "turbine" else gas_rows)(len(frame), seed=11)
    _, t_cold = timed(evaluate, warm, machine, fluid, results=RESULTS, keep_inputs=False)
    skilled(warm.iloc[:200])
    fast.forget()
    out, t_batch = timed(evaluate, frame, machine, fluid, results=RESULTS, keep_inputs=False)
    batch_rate = _rate(len(frame), t_batch)
    (power_s, eta_s), t_skilled = timed(skilled, frame)
    skilled_rate = _rate(len(frame), t_skilled)
    eta_b = out["isentropic_efficiency"].to_numpy(float)
    ok_b = (out["status"] == "ok").to_numpy()
    paths = out["path"].value_counts().to_dict() if "path" in out.columns else {}
    print(f"{label}: batch {len(frame):,} rows ({int(ok_b.sum()):,} ok"
          + (f"; paths {paths}" if paths else "") + f") in {t_batch:.2f} s = "
          f"{batch_rate:,.0f} rows/s (first call in the process, on other readings of the "
          f"same size: {t_cold:.2f} s)")
    extra = (f", {skilled.updates_per_row:.1f} updates a row"
             if hasattr(skilled, "updates_per_row") else "")
    print(f"{label}: skilled AbstractState loop, same rows, in {t_skilled:.2f} s = "
          f"{skilled_rate:,.0f} rows/s{extra}")
    both = ok_b & np.isfinite(eta_s)
    print(f"{label}: RATIO batch / skilled loop = {batch_rate / skilled_rate:.2f}x "
          f"(aim >= 10x); largest |d eta| batch vs skilled loop "
          f"{np.max(np.abs(eta_b[both] - eta_s[both])) if both.any() else math.nan:.1e}")
    subset = frame.iloc[:naive_rows]
    eta_n, t_naive = timed(naive, subset)
    naive_rate = _rate(len(subset), t_naive)
    print(f"{label}: (second line) naive PropsSI loop on {len(subset)} rows = "
          f"{naive_rate:,.0f} rows/s; ratio batch / naive = {batch_rate / naive_rate:.1f}x")
    rows = frame if exact_limit is None else frame.iloc[:exact_limit]
    (ok_e, eta_e), t_exact = timed(exact_rows, rows, machine, fluid)
    k = len(rows)
    same = ok_e & ok_b[:k]
    diff = np.max(np.abs(eta_b[:k][same] - eta_e[same])) if same.any() else math.nan
    mismatched = int((ok_e != ok_b[:k]).sum())
    print(f"{label}: ACCURACY over {k:,} rows: largest |d eta| batch vs exact single-point API "
          f"= {diff:.1e} (aim <= 2e-5); rows whose status differs: {mismatched}; "
          f"single-point API {_rate(k, t_exact):,.0f} rows/s")
    return {"ratio": batch_rate / skilled_rate, "naive": batch_rate / naive_rate, "diff": diff,
            "mismatched": mismatched}


def monte_carlo(label, readings, uncertainties, machine, fluid, subset):
    """Monte Carlo of one test point, 10,000 draws, against the single-point API loop.

    Tables and envelopes are forgotten first: the time includes tracing the mixture's phase
    envelope and building the small table around the point.
    """
    fast.forget()
    report, t_mc = timed(wb.monte_carlo_uncertainty, readings, uncertainties,
                         samples=10_000, seed=5, machine=machine, fluid=fluid)
    rng = np.random.default_rng(5)
    draws = pd.DataFrame({name: value + math.hypot(*uncertainties.get(name, (0.0, 0.0)))
                          * rng.standard_normal(subset) for name, value in readings.items()})
    _, t_loop = timed(exact_rows, draws, machine, fluid)
    loop_10k = t_loop / subset * 10_000
    print(f"{label}: Monte Carlo 10,000 draws in {t_mc:.2f} s (aim < 1 s); single-point loop "
          f"{loop_10k:.1f} s for 10,000 (timed on {subset}); ratio {loop_10k / t_mc:.0f}x; "
          f"eta = {report.mean['isentropic_efficiency']:.4f} +- "
          f"{report.expanded['isentropic_efficiency']:.4f} (2 sigma)")
    return t_mc


def _partition_rows(seed, rows):
    """One partition of invented gas readings, made on the worker (as read from a file)."""
    return gas_rows(rows, seed=seed)


def _partition_summary(part):
    """Rows, rows ok and the sum of efficiencies of one evaluated partition."""
    ok = part["status"] == "ok"
    return pd.DataFrame({"rows": [len(part)], "ok": [int(ok.sum())],
                         "eta_sum": [float(part.loc[ok, "isentropic_efficiency"].sum())]})


def _dask_frame(rows, partitions, first_seed, machine, fluid):
    """A lazy frame of ``rows`` invented readings in ``partitions``, evaluated and summarised,
    optimised so that each partition runs as one task (read, evaluate, summarise fused;
    ``client.compute`` sends dask-expr's unfused graph otherwise, four tasks a partition)."""
    import dask.dataframe as dd

    seeds = list(range(first_seed, first_seed + partitions))
    frame = dd.from_map(_partition_rows, seeds, rows=rows // partitions, meta=gas_rows(0))
    return evaluate(frame, machine, fluid, results=RESULTS).map_partitions(
        _partition_summary, meta=_partition_summary(pd.DataFrame(
            {"status": [], "isentropic_efficiency": []}))).optimize()


def _start_cluster(workers, machine, fluid):
    """A LocalCluster of ``workers`` processes (one thread each), every worker warmed up on
    other readings (imports, tables), as a long-running cluster would be."""
    from distributed import Client, LocalCluster

    cluster = LocalCluster(n_workers=workers, threads_per_worker=1, processes=True,
                           dashboard_address=None)
    client = Client(cluster, set_as_default=False)
    client.run(evaluate, gas_rows(4_000, seed=99), machine, fluid, results=RESULTS)
    return cluster, client


def _alternating(runs, rounds):
    """Wall times [s] of every run, the runs taking turns round after round."""
    times = {key: [] for key in runs}
    for _ in range(rounds):
        for key, run in runs.items():
            start = time.perf_counter()
            run()
            times[key].append(time.perf_counter() - start)
    return times


def _pool_partition(seed, rows, machine, fluid):
    """One partition read, evaluated and summarised in a plain worker process (no dask)."""
    return _partition_summary(evaluate(_partition_rows(seed, rows), machine, fluid,
                                       results=RESULTS))


def _start_pool(workers, machine, fluid):
    """``workers`` plain processes (``concurrent.futures``, no dask), started and warmed up."""
    from concurrent.futures import ProcessPoolExecutor
    from multiprocessing import get_context

    pool = ProcessPoolExecutor(workers, mp_context=get_context("spawn"))
    list(pool.map(_pool_partition, [99] * 4, [4_000] * 4, [machine] * 4, [fluid] * 4))
    return pool


def _forget_allocator_variables():
    """Remove the malloc variables a nanny leaves in this process's environment."""
    for name in ("MALLOC_TRIM_THRESHOLD_", "MALLOC_MMAP_THRESHOLD_"):
        os.environ.pop(name, None)


def dask_scaling(rows, machine, fluid, partitions, rounds=11):
    """Wall time of the same job on 1 and 2 worker processes, best of ``rounds``.

    Both clusters run side by side, with two pools of plain worker processes (no dask) that
    evaluate the same kind of partitions, and every round runs each of the four in turn, so a
    busy spell of the shared machine falls on all alike; each round evaluates other
    readings (no cached results).  The partitions are made on the workers
    (``dask.dataframe.from_map``, as a frame read from files would be) and each evaluated
    partition is reduced there to its row counts and sum of efficiencies (as a fleet job
    writes its results where they are computed), so the timed run is the evaluation, not the
    shipping of frames through the client.  The clusters start under
    :data:`workbench.fieldtest.dask_batch.CLUSTER_SETTINGS`.  The plain processes show what
    the machine itself gives, and one run of one worker with distributed's default settings
    what the settings change.
    """
    import itertools

    import dask
    import distributed  # noqa: F401  (loads its defaults before the settings are changed)

    from workbench.fieldtest.dask_batch import CLUSTER_SETTINGS

    seeds = itertools.count(100, partitions)
    per, summary = rows // partitions, {}

    def on_dask(workers, client):
        def run():
            lazy = _dask_frame(rows, partitions, next(seeds), machine, fluid)
            summary[workers] = client.compute(lazy).result()
        return run

    def on_pool(pool):
        def run():
            first = next(seeds)
            list(pool.map(_pool_partition, range(first, first + partitions),
                          [per] * partitions, [machine] * partitions, [fluid] * partitions))
        return run

    # the plain processes first: the nannies leave their allocator variables in this
    # process's environment, and a plain process must not inherit them
    pools = {w: _start_pool(w, machine, fluid) for w in (1, 2)}
    with dask.config.set(CLUSTER_SETTINGS):
        started = {w: _start_cluster(w, machine, fluid) for w in (1, 2)}
    try:
        runs = {("dask", w): on_dask(w, client) for w, (_, client) in started.items()}
        runs.update({("plain", w): on_pool(pool) for w, pool in pools.items()})
        times = _alternating(runs, rounds)
    finally:
        for cluster, client in started.values():
            client.close()
            cluster.close()
        for pool in pools.values():
            pool.shutdown()
    best = {key: min(t) for key, t in times.items()}
    for workers, out in summary.items():
        print(f"dask, {workers} worker(s): {int(out['rows'].sum()):,} rows in {partitions} "
              f"partitions ({int(out['ok'].sum()):,} ok, mean efficiency "
              f"{out['eta_sum'].sum() / out['ok'].sum():.4f}) in {best['dask', workers]:.2f} s "
              f"(wall, best of {rounds} rounds) = {rows / best['dask', workers]:,.0f} rows/s")
    for (kind, workers), t in times.items():
        print(f"{kind}, {workers} worker(s), every round [s]: " + ", ".join(f"{x:.2f}" for x in t))
    ratio = best["dask", 1] / best["dask", 2]
    plain = best["plain", 1] / best["plain", 2]
    print(f"dask: RATIO 2 workers / 1 worker = {ratio:.2f}x (aim >= 1.8x)")
    print(f"the machine without dask (the same partitions on plain worker processes, in the "
          f"same rounds): 2 / 1 = {plain:.2f}x; one plain process {best['plain', 1]:.2f} s, "
          f"one dask worker {best['dask', 1]:.2f} s")
    _forget_allocator_variables()
    cluster, client = _start_cluster(1, machine, fluid)  # distributed's default settings
    try:
        start = time.perf_counter()
        client.compute(_dask_frame(rows, partitions, next(seeds), machine, fluid)).result()
        default = time.perf_counter() - start
    finally:
        client.close()
        cluster.close()
        _forget_allocator_variables()
    print(f"dask, 1 worker with distributed's default settings: {default:.2f} s "
          f"(one run) = {best['dask', 1] / default:.2f}x the rate with CLUSTER_SETTINGS")
    return ratio


def profile(label, frame, machine, fluid, top=14):
    """Where the batch spends its time (cProfile, cumulative)."""
    profiler = cProfile.Profile()
    profiler.enable()
    evaluate(frame, machine, fluid, results=RESULTS, keep_inputs=False)
    profiler.disable()
    text = io.StringIO()
    pstats.Stats(profiler, stream=text).sort_stats("tottime").print_stats(top)
    print(f"--- profile of the batch, {label}, {len(frame):,} rows (own time, top {top})")
    print("\n".join(line for line in text.getvalue().splitlines()[4:] if line.strip()))


def main(argv=None):
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--quick", action="store_true", help="smaller row counts")
    parser.add_argument("--profile", action="store_true", help="profile the batch too")
    parser.add_argument("--no-dask", action="store_true", help="skip the dask comparison")
    parser.add_argument("--only", choices=("steam", "gas", "mc", "dask"),
                        help="run one comparison only")
    args = parser.parse_args(argv)
    if args.quick:
        n_steam, n_gas, n_dask, exact_steam, exact_gas, mc_subset = (
            10_000, 1_000, 40_000, 2_000, 300, 100)
    else:
        n_steam, n_gas, n_dask, exact_steam, exact_gas, mc_subset = (
            100_000, 10_000, 800_000, None, None, 300)
    steam = wb.Fluid("Water", backend="IF97")
    gas = wb.Fluid(GAS)
    found, t_mc, dask_ratio = {}, math.nan, None

    def run(name):
        return args.only in (None, name)

    if run("steam"):
        found["steam"] = compare("steam turbine (IF97)", steam_rows(n_steam), "turbine", steam,
                                 skilled_steam, naive_steam, 200, exact_steam)
    if run("gas"):
        found["gas"] = compare("gas compressor (5 components)", gas_rows(n_gas), "compressor",
                               gas, skilled_gas, naive_gas, 20, exact_gas)
    if run("mc"):
        point = gas_rows(1, seed=7).iloc[0].to_dict()
        u_gas = {"inlet_pressure": (0.002e5, 0.001e5), "outlet_pressure": (0.004e5, 0.002e5),
                 "inlet_temperature": (0.1, 0.05), "outlet_temperature": (0.1, 0.05),
                 "mass_flow": (0.05, 0.02)}
        t_mc = monte_carlo("gas compressor test point", point, u_gas, "compressor", gas,
                           mc_subset)
    if args.profile:
        profile("steam turbine", steam_rows(min(n_steam, 20_000)), "turbine", steam)
        profile("gas compressor", gas_rows(min(n_gas, 2_000)), "compressor", gas)
    if run("dask") and not args.no_dask:
        dask_ratio = dask_scaling(n_dask, "compressor", gas, partitions=32)
    print("summary: " + "; ".join(
        f"{k} batch/skilled {v['ratio']:.2f}x (naive {v['naive']:.0f}x), max |d eta| "
        f"{v['diff']:.1e}, status mismatches {v['mismatched']}" for k, v in found.items())
        + f"; Monte Carlo 10,000 draws {t_mc:.2f} s"
        + ("" if dask_ratio is None else f"; dask 2/1 workers {dask_ratio:.2f}x"))


if __name__ == "__main__":
    main()
