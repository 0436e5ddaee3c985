"""Batch evaluation on dask DataFrames: files larger than memory, fleets of machines.

:func:`map_partitions` maps a pandas evaluation (:func:`workbench.fieldtest.batch.evaluate_frame`)
over the partitions of a dask DataFrame with an explicit ``meta`` (the result of evaluating the
empty partition), so nothing is computed until the caller asks.  The options, the fluid among
them, are sent to the workers by pickling: :class:`workbench.Fluid` pickles as its
specification and rebuilds its property-library state on the worker.  Any scheduler works:
the synchronous one, threads, a ``distributed.LocalCluster`` or a remote cluster.

This module imports neither dask nor the batch module: the frame brings its own
``map_partitions`` and the batch passes its function, so importing the workbench never
imports dask.

References
----------
Dask Development Team, "Dask: Library for dynamic task scheduling", 2016,
https://dask.org (``DataFrame.map_partitions``).
"""

from __future__ import annotations


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


__all__ = ["is_dask", "map_partitions"]
