"""Batch evaluation on dask DataFrames: files larger than memory, fleets of machines.

:func:`evaluate_dask` maps :func:`workbench.fieldtest.batch.evaluate` over the partitions of a
dask DataFrame with an explicit ``meta`` (the result of evaluating the empty partition), so
nothing is computed until the caller asks.  The fluid is sent to the workers by pickling:
:class:`workbench.Fluid` pickles as its specification and rebuilds its property-library state
on the worker.  Any scheduler works: the synchronous one, threads, a
``distributed.LocalCluster`` or a remote cluster.

References
----------
Dask Development Team, "Dask: Library for dynamic task scheduling", 2016,
https://dask.org (``DataFrame.map_partitions``).
"""

from __future__ import annotations

from .batch import DEFAULT_RESULTS, STANDARD_CONDITIONS, _resolve_fluid


def _partition(part, options):
    from .batch import evaluate

    return evaluate(part, **options)


def evaluate_dask(frame, machine: str = "compressor", fluid=None, *, columns=None,
                  results=DEFAULT_RESULTS, mode: str = "auto", basis: str = "static",
                  mechanical_efficiency: float = 1.0, standard_conditions=STANDARD_CONDITIONS,
                  keep_inputs: bool = True):
    """Evaluate a dask DataFrame of readings partition by partition (lazy).

    Parameters are those of :func:`workbench.fieldtest.batch.evaluate`.

    Returns
    -------
    dask.dataframe.DataFrame
        The same columns as the pandas path; call ``.compute()`` for a pandas frame.
    """
    options = dict(machine=machine, fluid=_resolve_fluid(fluid), columns=columns,
                   results=tuple(results), mode=mode, basis=basis,
                   mechanical_efficiency=mechanical_efficiency,
                   standard_conditions=tuple(standard_conditions), keep_inputs=keep_inputs)
    meta = _partition(frame._meta, options)
    return frame.map_partitions(_partition, options, meta=meta)


__all__ = ["evaluate_dask"]
