"""Error-controlled property tables of one fluid over a pressure-temperature box (batches).

A batch of field-test rows of one machine covers a small part of the fluid's pressure-
temperature plane, and a mixture flash costs hundreds of microseconds.  A
:class:`PropertyTable` holds, on a grid in (ln P, T), the exact values of specific enthalpy,
entropy and density and their first derivatives and cross derivative (from the property
library's analytic derivatives of the equation of state, one flash per node), and interpolates
them by bicubic Hermite polynomials cell by cell.  Isobaric heat capacity is the temperature
derivative of the enthalpy interpolant.

Error control: after building, the table is compared with exact flashes at the centre of every
cell (the off-grid points farthest from the nodes) and the grid is halved until the largest
difference is below half the tolerance (:data:`TOLERANCE`; the old centres become new
nodes, so no flash is wasted).  A table that cannot reach its tolerance within
:data:`MAX_NODES` nodes a side is marked not ``usable`` and every state goes to the exact flash.
:attr:`PropertyTable.max_error` keeps the measured differences.

Pressure-enthalpy and pressure-entropy states are found by Newton iteration on temperature with
the interpolant (to 1e-10 of the temperature).  States outside the box, or whose temperature
falls outside it, are left to the exact flashes (``ok`` False).

References
----------
W. H. Press, S. A. Teukolsky, W. T. Vetterling, B. P. Flannery, Numerical Recipes, 3rd ed.,
Cambridge University Press 2007, section 3.6 (bicubic interpolation from values, gradients and
cross derivatives).
I. H. Bell et al., Ind. Eng. Chem. Res. 53 (2014) 2498 (the property library and its analytic
derivatives).
"""

from __future__ import annotations

import math
import threading

import numpy as np

from ..errors import InputError
from ..units import choice, count, flag, positive

#: Default tolerances of a table: largest absolute difference from the exact flash in specific
#: enthalpy [J/kg] and entropy [J/(kg K)], largest relative difference in density and in
#: isobaric heat capacity [-].
TOLERANCE = {"h": 0.2, "s": 5e-4, "rho": 1e-5, "cp": 1e-4}
#: Nodes in pressure and temperature of the first grid; the most a side after refinement.
START_NODES, MAX_NODES = (5, 9), 129
#: The measured error must stay below this share of the tolerance.
SAFETY = 0.5

# Hermite basis: f(u) = [1 u u^2 u^3] M [f0 f1 f0' f1'].
_M = np.array([[1.0, 0.0, 0.0, 0.0],
               [0.0, 0.0, 1.0, 0.0],
               [-3.0, 3.0, -2.0, -1.0],
               [2.0, -2.0, 1.0, 1.0]])


class GasFlasher:
    """Exact single-phase gas flashes of a fluid with the derivatives a table needs.

    One phase-specified (gas) property-library state object, as the single-state API uses
    for mixtures.  ``count`` is the number of flashes made.
    """

    def __init__(self, fluid):
        import CoolProp

        from .fluid import Fluid

        if not isinstance(fluid, Fluid) or fluid.backend != "HEOS":
            raise InputError(f"a table needs a Fluid on the HEOS backend, not {fluid!r}")
        self.state = CoolProp.AbstractState("HEOS", "&".join(fluid.components))
        if fluid.is_mixture:
            self.state.set_mole_fractions(list(fluid.fractions))
        self.state.specify_phase(CoolProp.iphase_gas)
        self.count = 0

    def __call__(self, P, T):
        """Node data at arrays P [Pa], T [K]: dict of arrays (NaN where the flash fails)."""
        import CoolProp.CoolProp as CP

        names = ("h", "s", "rho", "cp", "h_P", "rho_P", "rho_T", "rho_TT", "rho_PT")
        out = {name: np.full(len(P), np.nan) for name in names}
        st = self.state
        for i, (p, t) in enumerate(zip(P, T)):
            self.count += 1
            try:
                st.update(CP.PT_INPUTS, float(p), float(t))
                row = (st.hmass(), st.smass(), st.rhomass(), st.cpmass(),
                       st.first_partial_deriv(CP.iHmass, CP.iP, CP.iT),
                       st.first_partial_deriv(CP.iDmass, CP.iP, CP.iT),
                       st.first_partial_deriv(CP.iDmass, CP.iT, CP.iP),
                       st.second_partial_deriv(CP.iDmass, CP.iT, CP.iP, CP.iT, CP.iP),
                       st.second_partial_deriv(CP.iDmass, CP.iP, CP.iT, CP.iT, CP.iP))
            except Exception:  # noqa: BLE001 - a failed node makes the table unusable
                continue
            for name, value in zip(names, row):
                out[name][i] = value
        return out


def _node_derivatives(P, T, d):
    """Value, d/dx, d/dT and d2/dxdT (x = ln P) of h, s, rho from one flash's node data."""
    rho, rho_T, rho_TT = d["rho"], d["rho_T"], d["rho_TT"]
    v_T = -rho_T / rho**2
    v_TT = -rho_TT / rho**2 + 2.0 * rho_T**2 / rho**3
    return {
        # dh = cp dT + (dh/dP)_T dP; d2h/dPdT = -T (d2v/dT2)_P
        "h": (d["h"], P * d["h_P"], d["cp"], P * (-T * v_TT)),
        # (ds/dT)_P = cp/T; (ds/dP)_T = -(dv/dT)_P (Maxwell); d2s/dPdT = -(d2v/dT2)_P
        "s": (d["s"], P * (-v_T), d["cp"] / T, P * (-v_TT)),
        "rho": (rho, P * d["rho_P"], rho_T, P * d["rho_PT"]),
    }


class PropertyTable:
    """Bicubic Hermite table of h, s, rho (and cp) over a box in (ln P, T).

    Build with :func:`build_table`.  Attributes: ``P_range`` and ``T_range`` (the box),
    ``tolerance`` (dict), ``max_error`` (largest differences measured at the cell centres),
    ``usable`` (measured errors within the tolerance), ``shape`` (nodes in P and T).
    """

    PROPERTIES = ("h", "s", "rho")

    def __init__(self, x, T, nodes, tolerance):
        self.x, self.T = x, T
        self.P_range = (math.exp(x[0]), math.exp(x[-1]))
        self.T_range = (float(T[0]), float(T[-1]))
        self.shape = (len(x), len(T))
        self.tolerance = dict(tolerance)
        self.max_error: dict = {}
        self.usable = False
        self._dx = (x[-1] - x[0]) / (len(x) - 1)
        self._dT = (T[-1] - T[0]) / (len(T) - 1)
        self._coef = {name: self._coefficients(nodes[name]) for name in self.PROPERTIES}

    def _coefficients(self, node):
        """Per-cell 4x4 coefficient matrices, shape (cells, 16), of one property."""
        f, fx, fT, fxT = (np.asarray(a).reshape(self.shape) for a in node)
        fu, fv, fuv = fx * self._dx, fT * self._dT, fxT * self._dx * self._dT
        F = np.empty((self.shape[0] - 1, self.shape[1] - 1, 4, 4))
        # rows: f(0,.), f(1,.), f_u(0,.), f_u(1,.); columns: (.,0), (.,1), _v(.,0), _v(.,1)
        for r, (a, i0) in enumerate(((f, 0), (f, 1), (fu, 0), (fu, 1))):
            b = fv if r < 2 else fuv
            F[:, :, r, 0] = a[i0:a.shape[0] - 1 + i0, :-1]
            F[:, :, r, 1] = a[i0:a.shape[0] - 1 + i0, 1:]
            F[:, :, r, 2] = b[i0:b.shape[0] - 1 + i0, :-1]
            F[:, :, r, 3] = b[i0:b.shape[0] - 1 + i0, 1:]
        A = np.einsum("ij,abjk,lk->abil", _M, F, _M)
        return A.reshape(-1, 16)

    def covers(self, P, T) -> np.ndarray:
        """Mask of the states inside the box (arrays P [Pa], T [K])."""
        with np.errstate(invalid="ignore"):
            return ((P >= self.P_range[0]) & (P <= self.P_range[1])
                    & (T >= self.T_range[0]) & (T <= self.T_range[1]))

    def _locate(self, P, T):
        u = (np.log(P) - self.x[0]) / self._dx
        v = (T - self.T[0]) / self._dT
        i = np.clip(u.astype(np.int64), 0, self.shape[0] - 2)
        j = np.clip(v.astype(np.int64), 0, self.shape[1] - 2)
        return i * (self.shape[1] - 1) + j, u - i, v - j

    def _eval(self, name, cell, u, v, slope=False):
        A = self._coef[name][cell].reshape(-1, 4, 4)
        pu = np.stack([np.ones_like(u), u, u * u, u * u * u], axis=1)
        row = np.einsum("ni,nij->nj", pu, A)
        value = ((row[:, 3] * v + row[:, 2]) * v + row[:, 1]) * v + row[:, 0]
        if not slope:
            return value
        d = ((3.0 * row[:, 3] * v + 2.0 * row[:, 2]) * v + row[:, 1]) / self._dT
        return value, d

    def properties_PT(self, P, T):
        """h, s, rho, cp at arrays P [Pa], T [K] inside the box (no check here)."""
        cell, u, v = self._locate(P, T)
        h, cp = self._eval("h", cell, u, v, slope=True)
        return h, self._eval("s", cell, u, v), self._eval("rho", cell, u, v), cp

    def temperature(self, P, target, prop):
        """T [K] with h(P, T) (``prop="h"``) or s(P, T) equal to target; NaN where the root
        is not inside the box or the iteration does not settle."""
        n = len(P)
        lo, hi = np.full(n, self.T_range[0]), np.full(n, self.T_range[1])
        T = np.full(n, 0.5 * (self.T_range[0] + self.T_range[1]))
        result = np.full(n, np.nan)
        active = np.arange(n)
        for _ in range(60):
            if not len(active):
                break
            Ta = T[active]
            cell, u, v = self._locate(P[active], Ta)
            value, slope = self._eval("h", cell, u, v, slope=True)
            if prop == "s":
                value = self._eval("s", cell, u, v)
                slope = slope / Ta
            f = value - target[active]
            above = f > 0
            hi[active[above]] = np.minimum(hi[active[above]], Ta[above])
            lo[active[~above]] = np.maximum(lo[active[~above]], Ta[~above])
            with np.errstate(invalid="ignore", divide="ignore"):
                step = -f / slope
            T_new = Ta + step
            bad = ~((T_new >= lo[active]) & (T_new <= hi[active]) & np.isfinite(T_new))
            T_new[bad] = 0.5 * (lo[active][bad] + hi[active][bad])
            done = (np.abs(step) < 1e-10 * Ta) & ~bad
            result[active[done]] = T_new[done]
            stuck = (hi[active] - lo[active]) < 1e-12 * Ta  # the root is at a box edge
            T[active] = T_new
            active = active[~done & ~stuck]
        inside = (result > self.T_range[0]) & (result < self.T_range[1])
        result[~inside] = np.nan
        return result


def _centres(x, T):
    xc = 0.5 * (x[1:] + x[:-1])
    Tc = 0.5 * (T[1:] + T[:-1])
    X, TT = np.meshgrid(xc, Tc, indexing="ij")
    return np.exp(X.ravel()), TT.ravel()


def measure_error(table: PropertyTable, flasher, P=None, T=None) -> dict:
    """Largest differences between the table and exact flashes (``flasher``) at the points
    (P, T) [Pa, K], by default the centres of all cells: absolute for h [J/kg] and s
    [J/(kg K)], relative for rho and cp [-].  Also returns the exact data (key ``"data"``)."""
    if P is None:
        P, T = _centres(table.x, table.T)
    exact = flasher(P, T)
    h, s, rho, cp = table.properties_PT(P, T)
    with np.errstate(invalid="ignore"):
        error = {"h": np.abs(h - exact["h"]), "s": np.abs(s - exact["s"]),
                 "rho": np.abs(rho / exact["rho"] - 1.0), "cp": np.abs(cp / exact["cp"] - 1.0)}
    found = {name: (float(np.max(e)) if np.all(np.isfinite(e)) else math.inf)
             for name, e in error.items()}
    found["data"] = exact
    found["points"] = (P, T)
    return found


def build_table(flasher, P_range, T_range, tolerance=None, *, start=START_NODES,
                max_nodes: int | None = None, refine: bool = True) -> PropertyTable:
    """Build a table over the box and refine it until its measured error is within tolerance.

    Parameters
    ----------
    flasher : callable
        ``flasher(P, T) -> dict`` of exact node data (:class:`GasFlasher`).
    P_range, T_range : tuple of float
        The box: pressures [Pa] and temperatures [K].
    tolerance : dict, optional
        Tolerances as :data:`TOLERANCE` (missing keys from it).
    start : tuple of int
        Nodes in pressure and in temperature of the first grid (odd numbers, at least 3).
    max_nodes : int, optional
        The most nodes a side (default :data:`MAX_NODES`).
    refine : bool
        Halve the grid spacing while the measured error is above the tolerance (a test
        builds a coarse table without refinement to see the error check refuse it).

    Returns
    -------
    PropertyTable
        ``usable`` True when the error measured by exact flashes at the centre of every cell
        is below :data:`SAFETY` times the tolerance for every property.

    Notes
    -----
    Which spacing to halve (pressure, temperature or both) follows from the error the grid
    with every other node left out makes at the left-out nodes, in each direction; that
    estimate uses the nodes already flashed.  Whether the table is usable is decided only by
    the exact flashes at the cell centres.
    """
    tolerance = checked_tolerance(tolerance)
    (p0, p1), (t0, t1) = _box(P_range, T_range)
    max_nodes = count(MAX_NODES if max_nodes is None else max_nodes, "max_nodes", low=3,
                      high=1025)
    try:
        start_P, start_T = start
    except (TypeError, ValueError):
        raise InputError(f"start must be two whole numbers (nodes in P and T), not {start!r}"
                         ) from None
    start = (min(count(start_P, "start nodes in pressure", low=3, high=1025), max_nodes),
             min(count(start_T, "start nodes in temperature", low=3, high=1025), max_nodes))
    refine = flag(refine, "refine")
    x = np.linspace(math.log(p0), math.log(p1), start[0])
    T = np.linspace(t0, t1, start[1])
    X, TT = np.meshgrid(x, T, indexing="ij")
    data = {k: v.reshape(X.shape) for k, v in flasher(np.exp(X.ravel()), TT.ravel()).items()}
    centre_data = None
    while True:
        table = _table(x, T, data, tolerance)
        if table is None:  # a node flash failed: nothing tabulated here
            table = PropertyTable(np.array([x[0], x[-1]]), np.array([T[0], T[-1]]),
                                  {k: (np.zeros(4),) * 4 for k in PropertyTable.PROPERTIES},
                                  tolerance)
            table.max_error = {name: math.inf for name in tolerance}
            return table
        found = measure_error(table, flasher)
        centre_data = {k: v.reshape(len(x) - 1, len(T) - 1) for k, v in found.pop("data").items()}
        found.pop("points")
        table.max_error = found
        table.usable = all(found[k] <= SAFETY * tolerance[k] for k in tolerance)
        if table.usable or not refine:
            return table
        in_x, in_T = _directions(x, T, data, tolerance)
        if (in_x and 2 * len(x) - 1 > max_nodes) or (in_T and 2 * len(T) - 1 > max_nodes):
            return table
        x, T, data = _refined(x, T, data, centre_data if (in_x and in_T) else None, in_x, in_T,
                              flasher)


def checked_tolerance(tolerance) -> dict:
    """Table tolerances: :data:`TOLERANCE` updated with the given positive values.

    Examples
    --------
    >>> checked_tolerance({"h": 0.5})["h"]
    0.5
    """
    if tolerance is None:
        return dict(TOLERANCE)
    if not isinstance(tolerance, dict):
        raise InputError(f"tolerance must be a dict of {', '.join(TOLERANCE)}, not "
                         f"{type(tolerance).__name__}")
    kinds = {"h": "specific_enthalpy", "s": "specific_entropy", "rho": "dimensionless",
             "cp": "dimensionless"}
    found = dict(TOLERANCE)
    for key, value in tolerance.items():
        key = choice(key, tuple(TOLERANCE), "tolerance key")
        found[key] = positive(value, kinds[key], f"tolerance of {key}")
    return found


def _box(P_range, T_range):
    """The box's pressures [Pa] and temperatures [K], checked (positive, increasing)."""
    try:
        (p0, p1), (t0, t1) = P_range, T_range
    except (TypeError, ValueError):
        raise InputError("a table's box is (P_low, P_high), (T_low, T_high)") from None
    p0, p1 = (positive(v, "pressure", "table pressure") for v in (p0, p1))
    t0, t1 = (positive(v, "temperature", "table temperature") for v in (t0, t1))
    if not (p1 > p0 and t1 > t0):
        raise InputError(f"a table's box needs P_low < P_high and T_low < T_high, not "
                         f"({p0:g}, {p1:g}) Pa and ({t0:g}, {t1:g}) K")
    return (p0, p1), (t0, t1)


def _table(x, T, data, tolerance):
    X, TT = np.meshgrid(x, T, indexing="ij")
    nodes = _node_derivatives(np.exp(X.ravel()), TT.ravel(), {k: v.ravel() for k, v in
                                                              data.items()})
    if not all(np.all(np.isfinite(np.concatenate(v))) for v in nodes.values()):
        return None
    return PropertyTable(x, T, nodes, tolerance)


def _directions(x, T, data, tolerance):
    """Which spacings to halve: (pressure, temperature), from the error of the grid with every
    other node left out, in each direction, at the left-out nodes (no new flashes)."""
    def error(keep_x, keep_T):
        sub = {k: v[keep_x][:, keep_T] for k, v in data.items()}
        table = _table(x[keep_x], T[keep_T], sub, tolerance)
        if table is None:
            return math.inf
        X, TT = np.meshgrid(x, T, indexing="ij")
        left = np.ones(X.shape, dtype=bool)
        left[np.ix_(np.flatnonzero(keep_x), np.flatnonzero(keep_T))] = False
        h, s, rho, _ = table.properties_PT(np.exp(X[left]), TT[left])
        return max(np.max(np.abs(h - data["h"][left])) / tolerance["h"],
                   np.max(np.abs(s - data["s"][left])) / tolerance["s"],
                   np.max(np.abs(rho / data["rho"][left] - 1.0)) / tolerance["rho"])

    every = np.ones(len(x), dtype=bool), np.ones(len(T), dtype=bool)
    other_x, other_T = np.arange(len(x)) % 2 == 0, np.arange(len(T)) % 2 == 0
    e_x = error(other_x, every[1]) if len(x) >= 3 else 0.0
    e_T = error(every[0], other_T) if len(T) >= 3 else 0.0
    # The error of a cubic Hermite interpolant falls as the fourth power of the spacing: the
    # present grid's share in a direction is about e / 16.  Halve every direction whose share
    # exceeds a quarter of the allowed error, and at least the worse one.
    in_x, in_T = e_x / 16 > 0.25 * SAFETY, e_T / 16 > 0.25 * SAFETY
    if not (in_x or in_T):
        in_x, in_T = e_x >= e_T, e_T >= e_x
    return bool(in_x), bool(in_T)


def _halved(a):
    out = np.empty(2 * len(a) - 1)
    out[0::2], out[1::2] = a, 0.5 * (a[1:] + a[:-1])
    return out


def _refined(x, T, data, centre_data, in_x, in_T, flasher):
    x2 = _halved(x) if in_x else x
    T2 = _halved(T) if in_T else T
    sx, sT = (2 if in_x else 1), (2 if in_T else 1)
    X2, TT2 = np.meshgrid(x2, T2, indexing="ij")
    new = {k: np.full(X2.shape, np.nan) for k in data}
    known = np.zeros(X2.shape, dtype=bool)
    for k in data:
        new[k][::sx, ::sT] = data[k]
    known[::sx, ::sT] = True
    if centre_data is not None:
        for k in data:
            new[k][1::2, 1::2] = centre_data[k]
        known[1::2, 1::2] = True
    fresh = flasher(np.exp(X2[~known]), TT2[~known])
    for k in new:
        new[k][~known] = fresh[k]
    return x2, T2, new


_TABLES: dict = {}
_LOCK = threading.Lock()


def table_for(key, flasher_factory, P_range, T_range, tolerance=None, *,
              T_floor=-math.inf, T_ceiling=math.inf, P_ceiling=math.inf) -> PropertyTable:
    """A usable-or-not table covering the box, reused from the cache when one covers it.

    ``key`` identifies the fluid; a new table is built with a margin of 5 % of the box on
    every side (later batches of the same machine usually fall inside it), kept above
    ``T_floor`` and below ``T_ceiling`` [K] and ``P_ceiling`` [Pa].
    """
    (p0, p1), (t0, t1) = P_range, T_range
    with _LOCK:
        for table in _TABLES.get(key, ()):
            if (table.P_range[0] <= p0 and p1 <= table.P_range[1]
                    and table.T_range[0] <= t0 and t1 <= table.T_range[1]
                    and table.tolerance == checked_tolerance(tolerance)):
                return table
        dx = 0.05 * (math.log(p1) - math.log(p0)) + 1e-3
        dT = 0.05 * (t1 - t0) + 0.05
        table = build_table(flasher_factory(),
                            (p0 * math.exp(-dx), min(p1 * math.exp(dx), P_ceiling)),
                            (max(t0 - dT, T_floor), min(t1 + dT, T_ceiling)), tolerance)
        tables = _TABLES.setdefault(key, [])
        tables.append(table)
        if len(tables) > 8:
            tables.pop(0)
        return table


def clear_cache() -> None:
    """Forget every cached table (the next batch builds its own)."""
    with _LOCK:
        _TABLES.clear()


__all__ = ["clear_cache", "PropertyTable", "GasFlasher", "build_table", "measure_error", "table_for",
           "TOLERANCE", "START_NODES", "MAX_NODES", "SAFETY"]
