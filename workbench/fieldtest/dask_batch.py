"""Batch evaluation on dask DataFrames: files larger than memory, fleets of machines.

:func:`map_partitions` maps a pandas evaluation (:func:`workbench.fieldtest.batch.evaluate_frame`)
over the partitions of a dask DataFrame with an explicit ``meta`` (the result of evaluating the
empty partition), so nothing is computed until the caller asks.  The options, the fluid among
them, are sent to the workers by pickling: :class:`workbench.Fluid` pickles as its
specification and rebuilds its property-library state on the worker.  Any scheduler works:
the synchronous one, threads, a ``distributed.LocalCluster`` or a remote cluster.

On a ``distributed`` cluster, start the cluster under :data:`CLUSTER_SETTINGS`
(``dask.config.set(CLUSTER_SETTINGS)`` before the cluster is made): each worker then
evaluates batches 2.5 to 3 times faster than under distributed's defaults, about as fast as
a plain process, and two workers on two cores come close to twice one.  Compute
``lazy.optimize()`` to run each partition's reading, evaluation and whatever follows as one
task.

This module imports neither dask nor the batch module: the frame brings its own
``map_partitions`` and the batch passes its function, so importing the workbench never
imports dask.

References
----------
Dask Development Team, "Dask: Library for dynamic task scheduling", 2016,
https://dask.org (``DataFrame.map_partitions``).
"""

from __future__ import annotations

#: Heap sizes [bytes] for glibc's allocator in a batch worker: blocks up to
#: ``_MMAP_THRESHOLD`` come from the heap (not a fresh ``mmap`` each), and freed memory is
#: given back to the system only when more than ``_TRIM_THRESHOLD`` of it lies free at the top.
_MMAP_THRESHOLD = 16 * 2**20
_TRIM_THRESHOLD = 128 * 2**20

#: Dask settings for a ``distributed`` cluster that runs batches
#: (``dask.config.set(CLUSTER_SETTINGS)`` before the cluster is made; they reach only
#: processes started after it).  Measured on this project's 2-core test machine
#: (benchmarks/batch_benchmark.py):
#:
#: * ``MALLOC_MMAP_THRESHOLD_`` 16 MiB and ``MALLOC_TRIM_THRESHOLD_`` 128 MiB, instead of
#:   the nanny's 64 KiB trim threshold (which also fixes the mmap threshold at 128 KiB, so
#:   every larger numpy temporary of the batch is a fresh ``mmap`` whose pages the kernel
#:   must fault in and zero: a worker evaluated batches 2.5 to 3 times slower) and instead
#:   of glibc's own sliding thresholds (under which a partition evaluated in a worker's task
#:   thread, whose heap is a separate arena, took 10 to 30 % longer than the same partition in
#:   a process's main thread).  A worker that keeps freed memory for its next partition is
#:   what a batch wants; it holds at most 128 MiB more than it uses.
#: * the worker's statistical profiler off (it samples the running task every 10 ms), the
#:   event-loop health tick every second instead of every 20 ms, and the memory monitor every
#:   second instead of every 100 ms: together they took about 4 % of a core in each idle
#:   worker and 6 % in the process that runs the scheduler, all of it taken from the batch
#:   when the workers fill the cores.  Memory limits are still enforced, a second later.
#:
#: The allocator variables are read when a worker process starts; the nanny also leaves them
#: in the environment of the process that starts the workers (and so of any process that one
#: starts later).
CLUSTER_SETTINGS = {
    "distributed.nanny.pre-spawn-environ.MALLOC_TRIM_THRESHOLD_": str(_TRIM_THRESHOLD),
    "distributed.nanny.pre-spawn-environ.MALLOC_MMAP_THRESHOLD_": str(_MMAP_THRESHOLD),
    "distributed.worker.profile.enabled": False,
    "distributed.admin.tick.interval": "1s",
    "distributed.worker.memory.monitor-interval": "1s",
}


def is_dask(frame) -> bool:
    """True for a dask (or dask-expr) DataFrame, without importing dask."""
    return type(frame).__module__.split(".")[0] in ("dask", "dask_expr")


def map_partitions(frame, function, options):
    """``function(partition, options)`` over every partition of a dask frame (lazy).

    Parameters
    ----------
    frame : dask.dataframe.DataFrame
        The readings.
    function : callable
        A pandas evaluation ``function(pandas_frame, options) -> pandas_frame``, picklable
        (a module-level function).
    options : object
        Its checked options, picklable.

    Returns
    -------
    dask.dataframe.DataFrame
        Lazy; its ``meta`` is ``function`` applied to the empty partition.
    """
    meta = function(frame._meta, options)
    return frame.map_partitions(function, options, meta=meta)


__all__ = ["CLUSTER_SETTINGS", "is_dask", "map_partitions"]
