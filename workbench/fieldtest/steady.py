"""Steady-state filter for performance-test readings.

A test point counts only while the machine is steady.  Common practice in performance-test
codes is to require that, over a window of consecutive scans, no reading deviates from its
window mean by more than a stated tolerance (e.g. 1 % of the reading for pressure and flow,
0.5 K for temperature).  :func:`steady_state_flags` applies that rule over a trailing window of
``window`` rows: a row is steady when, for every listed column, the largest absolute
deviation of the readings in the window ending at that row from their window mean is within
the tolerance.  Rows before the first full window, and windows with a missing reading, are not
steady.

References
----------
ASME PTC 10-1997, Performance Test Code on Compressors and Exhausters, section 5 (permissible
fluctuation of test readings).
ASME PTC 19.1-2013, Test Uncertainty.
"""

from __future__ import annotations

import numpy as np
import pandas as pd

from ..errors import InputError


def steady_state_flags(frame: pd.DataFrame, columns, window: int, tolerance,
                       relative: bool = False) -> pd.DataFrame:
    """Flag the rows at which the readings have been steady over a trailing window.

    Parameters
    ----------
    frame : pandas.DataFrame
        Readings, one row per scan, in time order.
    columns : sequence of str
        Columns to check.
    window : int
        Number of consecutive rows in a window (at least 2).
    tolerance : float or dict
        Allowed maximum deviation from the window mean, per column (dict) or for all columns;
        in the column's units, or a fraction of the window mean's magnitude when
        ``relative=True`` (0.01 for 1 %).
    relative : bool
        Tolerances are fractions of the window mean.

    Returns
    -------
    pandas.DataFrame
        Same index as ``frame``: ``<column>_max_deviation`` (largest |reading - window mean|
        in the column's units, NaN before the first full window) for each column, and
        ``steady`` (bool).

    References
    ----------
    ASME PTC 10-1997, section 5 (permissible fluctuations).
    """
    columns = list(columns)
    if isinstance(window, bool) or not isinstance(window, (int, np.integer)) or window < 2:
        raise InputError(f"window {window!r} must be a whole number of rows, at least 2")
    missing = [c for c in columns if c not in frame.columns]
    if missing:
        raise InputError(f"column(s) {', '.join(map(repr, missing))} are not in the readings")
    tolerances = tolerance if isinstance(tolerance, dict) else {c: tolerance for c in columns}
    out = pd.DataFrame(index=frame.index)
    steady = np.ones(len(frame), dtype=bool)
    if len(frame) < window:
        steady[:] = False
    for c in columns:
        if c not in tolerances:
            raise InputError(f"no tolerance given for column {c!r}")
        tol = float(tolerances[c])
        if not tol >= 0:
            raise InputError(f"tolerance {tol!r} for column {c!r} must not be negative")
        x = pd.to_numeric(frame[c], errors="coerce").to_numpy(dtype=float)
        deviation = np.full(len(x), np.nan)
        if len(x) >= window:
            view = np.lib.stride_tricks.sliding_window_view(x, window)
            mean = view.mean(axis=1)
            dev = np.abs(view - mean[:, None]).max(axis=1)
            deviation[window - 1:] = dev
            limit = tol * np.abs(mean) if relative else np.full(len(mean), tol)
            ok = np.zeros(len(x), dtype=bool)
            ok[window - 1:] = dev <= limit  # NaN compares False: a missing reading is unsteady
            steady &= ok
        out[f"{c}_max_deviation"] = deviation
    out["steady"] = steady
    return out


__all__ = ["steady_state_flags"]
