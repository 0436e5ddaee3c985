"""The dask path of workbench.fieldtest.evaluate gives the same numbers as the pandas path."""

import dask
import dask.dataframe as dd
import numpy as np
import pandas as pd
import pytest

import workbench as wb
from workbench.fieldtest import evaluate


def readings(n=24):
    rng = np.random.default_rng(11)
    p1 = rng.uniform(0.95e5, 1.05e5, n)
    t1 = rng.uniform(285, 300, n)
    p2 = p1 * rng.uniform(1.5, 3.0, n)
    t2 = t1 * (p2 / p1) ** (0.4 / 1.4) + rng.uniform(15, 40, n)
    frame = pd.DataFrame({"inlet_pressure": p1, "inlet_temperature": t1, "outlet_pressure": p2,
                          "outlet_temperature": t2, "mass_flow": rng.uniform(1, 5, n)})
    frame.loc[5, "outlet_pressure"] = 0.5e5  # reversed pressure ratio
    frame.loc[9, "inlet_temperature"] = np.nan  # missing reading
    return frame


def check_same(frame, got):
    expected = evaluate(frame, "compressor", wb.Fluid("Air"))
    pd.testing.assert_frame_equal(got, expected)
    assert (got["status"] != "ok").sum() == 2


def test_dask_synchronous_equals_pandas():
    frame = readings()
    lazy = evaluate(dd.from_pandas(frame, npartitions=3), "compressor", wb.Fluid("Air"))
    assert type(lazy).__module__.split(".")[0] in ("dask", "dask_expr")
    with dask.config.set(scheduler="synchronous"):
        check_same(frame, lazy.compute())


def test_dask_local_cluster_threads_equals_pandas():
    distributed = pytest.importorskip("distributed")
    frame = readings()
    with distributed.LocalCluster(n_workers=1, threads_per_worker=2, processes=False,
                                  dashboard_address=None) as cluster, \
            distributed.Client(cluster) as client:
        lazy = evaluate(dd.from_pandas(frame, npartitions=4), "compressor", "Air")
        check_same(frame, client.compute(lazy).result())


def test_cluster_settings_reach_the_worker_processes(monkeypatch):
    # the keys of CLUSTER_SETTINGS are distributed's own (a misspelt key would be ignored
    # without a word): a worker process started under them has glibc's heap thresholds set
    # (16 MiB mmap, 128 MiB trim), no profiler, and its health tick runs every second
    # (distributed's documented config)
    distributed = pytest.importorskip("distributed")
    from workbench.fieldtest.dask_batch import CLUSTER_SETTINGS

    for name in ("MALLOC_TRIM_THRESHOLD_", "MALLOC_MMAP_THRESHOLD_"):
        # the nanny leaves them in this process: restore this process's environment after
        monkeypatch.setenv(name, "")
        monkeypatch.delenv(name)

    def seen(dask_worker):
        import os

        return (os.environ.get("MALLOC_TRIM_THRESHOLD_"), os.environ.get("MALLOC_MMAP_THRESHOLD_"),
                "profile" in dask_worker.periodic_callbacks,
                dask_worker.periodic_callbacks["tick"].callback_time)

    with dask.config.set(CLUSTER_SETTINGS):
        with distributed.LocalCluster(n_workers=1, threads_per_worker=1, processes=True,
                                      dashboard_address=None) as cluster, \
                distributed.Client(cluster) as client:
            trim, mmap, profiling, tick = next(iter(client.run(seen).values()))
            frame = readings()
            lazy = evaluate(dd.from_pandas(frame, npartitions=2), "compressor", "Air")
            check_same(frame, client.compute(lazy.optimize()).result())
    assert (trim, mmap) == ("134217728", "16777216")
    assert not profiling and tick == 1000
