"""Fast array flashes for batches, with the exact flashes for every entry they cannot vouch for.

Two fast paths sit in front of a fluid's exact array flashes (``states_PT``, ``states_Ph``,
``states_Ps``):

* water and steam on IAPWS-IF97: the equations of regions 1, 2 and 4 evaluated over whole
  arrays (:mod:`workbench.properties.if97_vec`).  These are the same equations as the exact
  flashes, evaluated to rounding: their entries count as exact.
* mixtures: an error-controlled property table (:mod:`workbench.properties.tables`) over the
  pressure-temperature box of the batch, clear of the phase envelope traced in one call
  (:mod:`workbench.properties.envelope`).  Their entries are marked ``tabulated`` and hold the
  table's tolerance.

A batch calls :func:`prepare` once with all its pressures and temperatures; the flashes then
use the table for the entries inside its box.  Every other entry (outside the box, near the dew
line or the critical point, outside IF97 regions 1, 2 and 4) is flashed exactly, so the valid
entries, their phases and the entries refused are those of the exact flashes.

References
----------
IAPWS R7-97(2012), Revised Release on the IAPWS Industrial Formulation 1997 for the
Thermodynamic Properties of Water and Steam.
"""

from __future__ import annotations

import math
import threading

import numpy as np

from ..errors import InputError
from ..units import to_si_array
from . import envelope as _envelope
from . import if97_vec, tables

#: Path words of a batch row: every state exact, or at least one state from a table.
PATH_EXACT, PATH_TABLE = "exact", "table"
#: Largest difference in isentropic efficiency [-] a tabulated row may carry; rows whose
#: bound (:func:`efficiency_bound`) is larger are computed exactly.
EFFICIENCY_TOLERANCE = 2e-5
#: Fewest rows for which a batch builds a mixture table (a table costs a few hundred flashes).
MIN_ROWS = 200

_ACTIVE: dict = {}
_LOCK = threading.Lock()


def _key(fluid):
    return (fluid.backend, tuple(fluid.components), tuple(round(f, 12) for f in fluid.fractions))


def active_table(fluid):
    """The usable table a batch prepared for this fluid, or None."""
    return _ACTIVE.get(_key(fluid))


def prepare(fluid, pressures, temperatures, tolerance=None):
    """Make a property table for a mixture over the box of a batch's states (if worth it).

    Parameters
    ----------
    fluid : Fluid
        The fluid; pure fluids and IF97 water need no table (nothing is done).
    pressures, temperatures : array_like
        Every pressure [Pa] and temperature [K] the batch knows (inlets and outlets); NaN and
        values outside the model's range are ignored.
    tolerance : dict, optional
        Table tolerances (:data:`workbench.properties.tables.TOLERANCE`).

    Returns
    -------
    PropertyTable or None
        The usable table now active for the fluid, or None (then every flash is exact).
        The box starts :data:`workbench.properties.envelope.DEW_MARGIN` above the highest dew
        temperature over its pressures (envelope and exact dew points checked).
    """
    from .fluid import Fluid

    if not isinstance(fluid, Fluid):
        raise InputError(f"fluid must be a Fluid, not {type(fluid).__name__}")
    P = to_si_array(pressures, "pressure", "pressures")
    T = to_si_array(temperatures, "temperature", "temperatures")
    tolerance = tables.checked_tolerance(tolerance)
    if not fluid.is_mixture or fluid.backend != "HEOS":
        return None
    with np.errstate(invalid="ignore"):
        P = P[np.isfinite(P) & (P > 0) & (P <= fluid.P_max)]
        T = T[np.isfinite(T) & (T >= fluid.T_min) & (T <= fluid.T_max)]
    if len(P) + len(T) < MIN_ROWS or not len(P) or not len(T):
        return None
    env = _envelope.phase_envelope(fluid)
    floor = env.limit(P, fluid.dew_temperature)
    if not math.isfinite(floor):
        return None
    t0, t1 = max(float(T.min()), floor), float(T.max())
    if not t1 > t0:
        return None
    table = tables.table_for(_key(fluid), lambda: tables.GasFlasher(fluid),
                             (float(P.min()), float(P.max())), (t0, t1), tolerance,
                             T_floor=floor, T_ceiling=fluid.T_max, P_ceiling=fluid.P_max)
    if not table.usable:
        return None
    with _LOCK:
        _ACTIVE[_key(fluid)] = table
    return table


def forget(fluid=None) -> None:
    """Drop the fluid's active table (later flashes are exact); with no fluid, drop every
    table and traced envelope (a batch then builds its own, as in a fresh process)."""
    with _LOCK:
        if fluid is None:
            _ACTIVE.clear()
            tables.clear_cache()
            _envelope.clear_cache()
        else:
            _ACTIVE.pop(_key(fluid), None)


def states(fluid, pair, P, value, exact, make):
    """States of arrays (P, value) for ``pair`` "PT", "Ph" or "Ps", fast where it can vouch.

    Parameters
    ----------
    fluid : Fluid
    pair : {"PT", "Ph", "Ps"}
    P, value : numpy.ndarray
        Pressures [Pa] and temperatures [K], enthalpies [J/kg] or entropies [J/(kg K)].
    exact : callable
        ``exact(P, value) -> StateArray``: the fluid's exact array flash for the pair.
    make : callable
        ``make(P, T, h, s, rho, x, cp, phase, valid, tabulated) -> StateArray``.

    Returns
    -------
    StateArray
        Valid entries equal the exact flash's to rounding (IF97) or within the table's
        tolerance (``tabulated`` entries).
    """
    n = len(P)
    found = None
    tabulated = np.zeros(n, dtype=bool)
    if fluid.backend == "IF97":
        found = if97_vec.array_flash(pair, P, value)
    elif fluid.is_mixture:
        table = active_table(fluid)
        if table is not None:
            found = _table_flash(table, pair, P, value)
            tabulated = found.ok.copy()  # found.ok is completed by the exact flashes below
    if found is None or not found.ok.any():
        return exact(P, value)
    rest = np.flatnonzero(~found.ok)
    cols = {name: getattr(found, name) for name in ("T", "h", "s", "rho", "x", "cp")}
    phase, valid = found.phase, found.ok
    if len(rest):
        other = exact(P[rest], value[rest])
        for name in cols:
            cols[name][rest] = getattr(other, name)
        phase[rest] = other.phase
        valid[rest] = other.valid
    return make(P, cols["T"], cols["h"], cols["s"], cols["rho"], cols["x"], cols["cp"], phase,
                valid, tabulated)


def _table_flash(table, pair, P, value):
    out = if97_vec.Flash(len(P))
    with np.errstate(invalid="ignore"):
        if pair == "PT":
            T = np.where(table.covers(P, value), value, np.nan)
        else:
            inside = (P >= table.P_range[0]) & (P <= table.P_range[1]) & np.isfinite(value)
            T = np.full(len(P), np.nan)
            rows = np.flatnonzero(inside)
            if len(rows):
                T[rows] = table.temperature(P[rows], value[rows], pair[1])
    rows = np.flatnonzero(np.isfinite(T))
    if len(rows):
        h, s, rho, cp = table.properties_PT(P[rows], T[rows])
        out.put(rows, T[rows], h, s, rho, cp, "gas")
        if pair == "Ph":
            out.h[rows] = value[rows]  # the state holds the enthalpy it was asked for
        elif pair == "Ps":
            out.s[rows] = value[rows]
    return out


def efficiency_bound(dh, T_iso, tabulated_in, tabulated_out, tabulated_iso, table):
    """Largest difference in isentropic efficiency [-] that table errors can make in a row.

    With the efficiency A / B (compression (h2s - h1)/(h2 - h1), expansion
    (h1 - h2)/(h1 - h2s)), at most 1, the difference is at most
    (d_iso + 2 d_1 + d_2) / |h2 - h1|, where d_1 and d_2 are the enthalpy tolerance for a
    tabulated inlet or outlet state and d_iso = tol_h + 2 T_iso tol_s for an isentropic state
    found from a tabulated entropy.  Rows without tabulated states get 0.

    Parameters
    ----------
    dh : numpy.ndarray
        Actual enthalpy change h2 - h1 [J/kg].
    T_iso : numpy.ndarray
        Isentropic outlet temperature [K].
    tabulated_in, tabulated_out, tabulated_iso : numpy.ndarray of bool
        Which states came from ``table``.
    table : PropertyTable or None
    """
    if table is None:
        return np.zeros(len(dh))
    tol_h, tol_s = table.tolerance["h"], table.tolerance["s"]
    d1 = np.where(tabulated_in, tol_h, 0.0)
    d2 = np.where(tabulated_out, tol_h, 0.0)
    d_iso = np.where(tabulated_iso | tabulated_in, tol_h + 2.0 * T_iso * tol_s, 0.0)
    with np.errstate(invalid="ignore", divide="ignore"):
        return np.where(d1 + d2 + d_iso > 0, (d_iso + 2.0 * d1 + d2) / np.abs(dh), 0.0)


__all__ = ["prepare", "forget", "states", "active_table", "efficiency_bound", "PATH_EXACT",
           "PATH_TABLE", "EFFICIENCY_TOLERANCE", "MIN_ROWS"]
