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
from ..units import count, flag
from .inputs import any_si

#: Most columns checked at once (a logger export has tens; a guard against a runaway list).
MAX_COLUMNS = 10_000


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
    tolerance : float, Quantity or dict
        Allowed maximum deviation from the window mean, per column (dict) or for all columns,
        not negative; in the column's SI unit (a Quantity is converted to SI base units;
        temperatures as differences, K or delta_degC), or a fraction of the window mean's
        magnitude when ``relative=True`` (0.01 for 1 %).
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

    Examples
    --------
    >>> frame = pd.DataFrame({"p": [1.0, 1.0, 1.0, 5.0]})
    >>> steady_state_flags(frame, ["p"], window=2, tolerance=0.5)["steady"].tolist()
    [False, True, True, False]
    """
    frame, columns = _checked_frame(frame, columns)
    window = count(window, "window", low=2)
    relative = flag(relative, "relative")
    tolerances = _tolerances(tolerance, columns)
    out = pd.DataFrame(index=frame.index)
    steady = np.ones(len(frame), dtype=bool)
    if len(frame) < window:
        steady[:] = False
    for c in columns:
        tol = tolerances[c]
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


def _checked_frame(frame, columns):
    """The readings frame and the list of column names, refused by name when bad."""
    if not isinstance(frame, pd.DataFrame):
        raise InputError(f"readings must be a pandas DataFrame, not {type(frame).__name__}")
    if isinstance(columns, (str, bytes)) or not hasattr(columns, "__iter__"):
        raise InputError(f"columns must be a list of column names, not {columns!r:.60}")
    columns = list(columns)
    if len(columns) > MAX_COLUMNS:
        raise InputError(f"columns lists {len(columns)} names, at most {MAX_COLUMNS}")
    for c in columns:
        if not isinstance(c, str):
            raise InputError(f"columns must be column names (text), not {c!r:.60}")
    missing = [c for c in columns if c not in frame.columns]
    if missing:
        raise InputError(f"column(s) {', '.join(map(repr, missing[:5]))} are not in the "
                         "readings")
    return frame, columns


def _tolerances(tolerance, columns) -> dict:
    """Tolerance per column, each a number not below zero (Quantities in SI base units)."""
    if isinstance(tolerance, dict):
        for key in tolerance:
            if key not in columns:
                raise InputError(f"tolerance given for {key!r:.60}, which is not a checked "
                                 "column")
        missing = [c for c in columns if c not in tolerance]
        if missing:
            raise InputError(f"no tolerance given for column {missing[0]!r}")
        given = tolerance
    else:
        given = {c: tolerance for c in columns}
    return {c: any_si(given[c], f"tolerance for column {c!r}", low=0.0) for c in columns}


__all__ = ["steady_state_flags"]
