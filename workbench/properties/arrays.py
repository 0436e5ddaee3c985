"""Array flashes: many states of one fluid at once (methods of :class:`Fluid`).

:meth:`states_PT`, :meth:`states_Ph` and :meth:`states_Ps` return a
:class:`~workbench.properties.StateArray` (one entry per row) through the property library's
array interface, with the same checks and results as the single-state methods; entries those
would refuse are marked not valid.  Mixtures are flashed entry by entry.

References
----------
I. H. Bell et al., Ind. Eng. Chem. Res. 53 (2014) 2498-2508 (CoolProp's ``PropsSI`` array
interface).
"""

from __future__ import annotations

import threading

import CoolProp.CoolProp as CP
import numpy as np

from ..errors import InputError, PropertyError
from ..units import to_si_array
from . import solver
from .state import StateArray, empty_columns, phase_words

_ARRAY_LOCK = threading.Lock()


def pair_arrays(a, b, kinds: tuple[str, str], names: tuple[str, str]
                ) -> tuple[np.ndarray, np.ndarray]:
    """Two equal-length 1-D SI float arrays (a scalar or one-entry array is repeated).

    Each input passes the input boundary (:func:`workbench.units.to_si_array`): sequences,
    arrays and array Quantities of the right dimension are accepted; NaN marks a missing
    entry (the state there is not valid).

    Parameters
    ----------
    a, b : array_like or pint.Quantity
        The two inputs (SI when plain numbers).
    kinds : tuple of str
        Quantity kinds of ``a`` and ``b`` (keys of :data:`workbench.units.SI_UNITS`).
    names : tuple of str
        Names of ``a`` and ``b`` in messages.

    Raises
    ------
    InputError
        Text, None, dicts, infinity, magnitudes above 1e12 (SI), a wrong dimension, arrays of
        more than one dimension or of different lengths; the message names the input.

    Examples
    --------
    >>> [v.tolist() for v in pair_arrays(1e5, [300.0, 310.0], ("pressure", "temperature"),
    ...                                  ("pressure", "temperature"))]
    [[100000.0, 100000.0], [300.0, 310.0]]
    """
    a = to_si_array(a, kinds[0], names[0])
    b = to_si_array(b, kinds[1], names[1])
    if len(a) != len(b):
        if len(a) == 1:
            a = np.full(len(b), a[0])
        elif len(b) == 1:
            b = np.full(len(a), b[0])
        else:
            raise InputError(f"{names[0]} and {names[1]} arrays need equal lengths, not "
                             f"{len(a)} and {len(b)}")
    return a, b


def fast_states(fluid, pair: str, P, value, exact) -> StateArray:
    """The fast path of the array flashes (:mod:`workbench.properties.fast`): IF97 water
    and mixtures with a batch's property table; ``exact(P, value)`` for everything else."""
    if fluid.backend != "IF97" and not fluid.is_mixture:
        return exact(P, value)
    from . import fast

    def make(P, T, h, s, rho, x, cp, phase, valid, tabulated):
        # entries not valid are NaN and "" already (fast path and exact flashes)
        return StateArray(fluid, P, T, h, s, rho, x, cp, phase, valid,
                          tabulated & valid if tabulated.any() else None)

    return fast.states(fluid, pair, P, value, exact, make)


class ArrayFlashes:
    """Array-flash methods of :class:`~workbench.properties.Fluid`."""

    def states_PT(self, P, T) -> StateArray:
        """States from arrays of pressure [Pa] and temperature [K] (one flash per entry).

        Same checks as :meth:`state_PT`; entries it would refuse (NaN, out of range) are not
        valid.  IF97 water and mixtures with a batch's property table take the fast path
        (:mod:`workbench.properties.fast`); other pure fluids are flashed by the property
        library's array interface, other mixture states entry by entry.

        Raises
        ------
        InputError
            Inputs that are not arrays of numbers (text, None, dicts), hold infinity or a
            magnitude above 1e12 (SI), have the wrong dimension or more than one dimension,
            or differ in length (see :func:`pair_arrays`).

        Examples
        --------
        >>> import workbench as wb
        >>> wb.Fluid("Air").states_PT([1e5, -1.0], [300.0, 300.0]).valid.tolist()
        [True, False]
        """
        P, T = pair_arrays(P, T, ("pressure", "temperature"), ("pressure", "temperature"))
        return fast_states(self, "PT", P, T, self._exact_states_PT)

    def _exact_states_PT(self, P, T) -> StateArray:
        """The exact array flash from P [Pa] and T [K] (no fast path)."""
        if self.is_mixture:
            return self._states_by_entry(self.state_PT, P, T)
        valid = self.pressure_ok(P) & np.isfinite(T) & self.temperature_ok(T)
        idx = np.flatnonzero(valid)
        near = (P[idx] > self.P_triple) & (P[idx] < self.P_critical)
        if near.any():
            # P and T do not fix a state at the saturation temperature (as state_PT).
            t_sat = self.array_property("T", "P", P[idx[near]], "Q", 0.0)
            ambiguous = np.abs(T[idx[near]] - t_sat) < 1e-6 * t_sat
            valid[idx[near][ambiguous]] = False
        return self.read_states(P, "P", P, "T", T, valid)

    def states_Ph(self, P, h) -> StateArray:
        """States from arrays of pressure [Pa] and specific enthalpy [J/kg].

        Same results and checks as :meth:`state_Ph`, entry by entry.
        """
        return self._states_from(P, h, "h")

    def states_Ps(self, P, s) -> StateArray:
        """States from arrays of pressure [Pa] and specific entropy [J/(kg K)].

        Same results and checks as :meth:`state_Ps`, entry by entry.
        """
        return self._states_from(P, s, "s")

    def _states_from(self, P, target, prop: str) -> StateArray:
        kind = "specific_enthalpy" if prop == "h" else "specific_entropy"
        P, target = pair_arrays(P, target, ("pressure", kind),
                                ("pressure", kind.replace("_", " ")))
        return fast_states(self, "P" + prop, P, target,
                           lambda p, t: self._exact_states_from(p, t, prop))

    def _exact_states_from(self, P, target, prop: str) -> StateArray:
        """The exact array flash from P [Pa] and h or s (no fast path)."""
        if self.is_mixture:
            method = self.state_Ph if prop == "h" else self.state_Ps
            return self._states_by_entry(method, P, target)
        valid = self.pressure_ok(P) & np.isfinite(target)
        if self.backend == "IF97":
            return solver.if97_states(self, P, target, prop, valid)
        # Helmholtz-energy models: one P-h or P-s flash per entry on the fluid's own state
        # object (each array-interface output would repeat the iterative flash).
        if prop == "h":
            found = self._states_by_entry(lambda p, h: self.flash(
                CP.HmassP_INPUTS, h, p, f"P={p:.6g} Pa, h={h:.6g} J/kg"), P, target, valid)
        else:
            found = self._states_by_entry(lambda p, s: self.flash(
                CP.PSmass_INPUTS, p, s, f"P={p:.6g} Pa, s={s:.6g} J/(kg K)"), P, target, valid)
        return found.masked(found.valid & self.temperature_ok(found.T))

    def pressure_ok(self, P) -> np.ndarray:
        """Mask of the pressures [Pa] within the property model's range (array form of
        :meth:`check_pressure`: finite, positive, at most :attr:`P_max`).

        Examples
        --------
        >>> import workbench as wb
        >>> wb.Fluid("Air").pressure_ok(np.array([1e5, 0.0, np.nan])).tolist()
        [True, False, False]
        """
        P = np.asarray(P, dtype=float)
        with np.errstate(invalid="ignore"):
            return np.isfinite(P) & (P > 0) & (P <= self.P_max)

    def temperature_ok(self, T) -> np.ndarray:
        """Mask of the temperatures [K] within the property model's range (array form of
        :meth:`check_temperature`).

        Examples
        --------
        >>> import workbench as wb
        >>> wb.Fluid("Air").temperature_ok(np.array([300.0, 1e5])).tolist()
        [True, False]
        """
        T = np.asarray(T, dtype=float)
        with np.errstate(invalid="ignore"):
            return (T > 0) & (T >= self.T_min * (1 - 1e-9)) & (T <= self.T_max * (1 + 1e-9))

    def array_property(self, output: str, name1: str, value1, name2: str,
                       value2) -> np.ndarray:
        """One output of the property library's array interface (pure fluids).

        Parameters
        ----------
        output : str
            The library's output key (``"H"``, ``"S"``, ``"D"``, ``"C"``, ``"T"``, ``"Q"``,
            ``"Phase"``).
        name1, name2 : str
            Input keys (``"P"``, ``"T"``, ``"Q"``, ``"H"``, ``"S"``).
        value1 : numpy.ndarray
            Values of the first input, SI.
        value2 : numpy.ndarray or float
            Values of the second input (a number is repeated).

        Returns
        -------
        numpy.ndarray
            SI values, NaN where the library failed or gave a non-finite value.  Counts one
            flash per entry in :attr:`flash_count`.

        Examples
        --------
        >>> import workbench as wb
        >>> water = wb.Fluid("Water", backend="IF97")
        >>> water.array_property("T", "P", np.array([101325.0]), "Q", 0.0).round(2).tolist()
        [373.12]
        """
        value1 = np.asarray(value1, dtype=float)
        n = value1.size
        if n == 0:
            return np.empty(0)
        self.flash_count += n
        if np.ndim(value2) == 0:
            value2 = np.full(n, float(value2))
        try:
            with _ARRAY_LOCK:  # the array interface shares the library's own state objects
                result = np.asarray(CP.PropsSI(output, name1, value1, name2, value2,
                                               self._array_name), dtype=float)
        except Exception:  # noqa: BLE001 - the library refuses the whole call: entry by entry
            result = np.empty(n)
            for i in range(n):
                try:
                    result[i] = CP.PropsSI(output, name1, value1[i], name2, value2[i],
                                           self._array_name)
                except Exception:  # noqa: BLE001
                    result[i] = np.nan
        result = result.reshape(n)
        result[~np.isfinite(result)] = np.nan
        return result

    def saturation_arrays(self, P):
        """Saturation temperature [K] and saturated liquid and vapour h, s, rho at P [Pa].

        Returns
        -------
        t_sat : numpy.ndarray
        liquid, vapour : dict
            Arrays ``"h"`` [J/kg], ``"s"`` [J/(kg K)], ``"rho"`` [kg/m^3].

        The last pressure array is remembered: a batch asks for the isentropic and the actual
        outlet state at the same outlet pressures.
        """
        key = P.tobytes()
        cached = self.__dict__.get("_sat_arrays")
        if cached is not None and cached[0] == key:
            return cached[1]
        t_sat = self.array_property("T", "P", P, "Q", 0.0)
        liq = {k: self.array_property(name, "P", P, "Q", 0.0) for k, name in
               (("h", "H"), ("s", "S"), ("rho", "D"))}
        vap = {k: self.array_property(name, "P", P, "Q", 1.0) for k, name in
               (("h", "H"), ("s", "S"), ("rho", "D"))}
        self._sat_arrays = (key, (t_sat, liq, vap))
        return t_sat, liq, vap

    def read_states(self, P, name1, value1, name2, value2, valid) -> StateArray:
        """States at the valid entries of an input pair, by the array interface (no checks).

        Reads T, h, s, rho, cp, the phase and, inside the dome, the quality; entries the
        library cannot resolve become not valid.
        """
        n = len(P)
        idx = np.flatnonzero(valid)
        out, phase = empty_columns(n)
        if len(idx):
            a, b = value1[idx], value2[idx]
            for name, key in (("T", "T"), ("h", "H"), ("s", "S"), ("rho", "D"), ("cp", "C")):
                if name == "T" and name2 == "T":
                    out["T"][idx] = b  # the flash keeps the given temperature
                    continue
                out[name][idx] = self.array_property(key, name1, a, name2, b)
            words = phase_words(self.array_property("Phase", name1, a, name2, b))
            phase[idx] = words
            two = words == "two-phase"
            if two.any():
                q = self.array_property("Q", name1, a[two], name2, b[two])
                rows = idx[two]
                inside = (q >= 0) & (q <= 1)
                out["x"][rows[inside]] = q[inside]
                out["cp"][rows] = np.nan
        with np.errstate(invalid="ignore"):
            ok = np.isfinite(out["T"] + out["h"] + out["s"] + out["rho"]) & (out["rho"] > 0)
        valid = valid & ok & (phase != "")
        return StateArray(self, P, out["T"], out["h"], out["s"], out["rho"], out["x"],
                          out["cp"], phase, valid).masked(valid)

    def _states_by_entry(self, method, a, b, where=None) -> StateArray:
        n = len(a)
        cols = {name: np.full(n, np.nan) for name in ("P", "T", "h", "s", "rho", "x", "cp")}
        phase = np.full(n, "", dtype=object)
        valid = np.zeros(n, dtype=bool)
        for i in (range(n) if where is None else np.flatnonzero(where)):
            try:
                st = method(float(a[i]), float(b[i]))
            except (InputError, PropertyError):
                continue
            for name in ("P", "T", "h", "s", "rho", "x", "cp"):
                cols[name][i] = getattr(st, name)
            phase[i], valid[i] = st.phase, True
        return StateArray(self, cols["P"], cols["T"], cols["h"], cols["s"], cols["rho"],
                          cols["x"], cols["cp"], phase, valid)
