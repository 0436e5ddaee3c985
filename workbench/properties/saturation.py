"""Saturation of pure fluids and the dew line of mixtures (methods of :class:`Fluid`).

Pure fluids: the saturation dome, saturated liquid and vapour states, saturation temperature
and pressure.  Mixtures: the dew-point temperature at a pressure (the edge of the gas region
the workbench supports), a tabulated dew line that spares a batch one dew-point flash per
state, and the dew line drawn on charts.

References
----------
I. H. Bell, J. Wronski, S. Quoilin, V. Lemort, Ind. Eng. Chem. Res. 53 (2014) 2498-2508
(CoolProp's saturation and phase-envelope solvers).
M. L. Michelsen, J. M. Mollerup, Thermodynamic Models: Fundamentals & Computational Aspects,
2nd ed., Tie-Line Publications, 2007 (dew points of mixtures).
"""

from __future__ import annotations

import math

import CoolProp
import CoolProp.CoolProp as CP
import numpy as np

from ..errors import InputError, PropertyError
from ..units import count, to_si
from .state import State

#: Pressures [Pa] of a mixture's dew line and dew-line table: 0.1 bar to 200 bar.
DEW_LINE_PRESSURES = (1e4, 2e7)


def _none_nan(value):
    return math.nan if value is None else value


class Saturation:
    """Saturation and dew-line methods of :class:`~workbench.properties.Fluid`."""

    def saturation_curve(self, points: int = 40) -> list[State]:
        """The saturation dome: saturated-liquid states upwards, then saturated vapour down.

        Pressures are log-spaced from just above the triple point to 0.995 of the critical
        pressure; pressures the model cannot resolve are left out.  Mixtures give their dew
        line instead (:meth:`dew_line`), the edge of the region they are supported in.
        Cached per fluid object.

        Parameters
        ----------
        points : int
            Pressures along the dome, 2 to 2000.

        Examples
        --------
        >>> import workbench as wb
        >>> len(wb.Fluid("Water").saturation_curve(10))
        20
        """
        points = count(points, "number of points", low=2, high=2000)
        if self.is_mixture:
            return self.dew_line(points)
        cache = self.__dict__.setdefault("_curve_cache", {})
        if points not in cache:
            lo = max(self.P_triple * 1.01, 1.0)
            hi = self.P_critical * 0.995
            liquid, vapour = [], []
            for k in range(points):
                P = lo * (hi / lo) ** (k / max(points - 1, 1))
                try:
                    sl, sv = self.saturation_states(P)
                except PropertyError:
                    continue
                liquid.append(sl)
                vapour.append(sv)
            cache[points] = liquid + vapour[::-1]
        return list(cache[points])

    def dew_line(self, points: int = 40) -> list[State]:
        """Saturated-gas states along a mixture's dew line, low pressure first.

        Pressures are log-spaced from 0.1 bar to 200 bar; the line ends at the first pressure
        without a dew point (near the cricondenbar); points below the lowest temperature of a
        component's model are left out.  Pure fluids give an empty list (their dome is
        :meth:`saturation_curve`).  Cached per fluid object.

        Examples
        --------
        >>> import workbench as wb
        >>> wb.Fluid("Water").dew_line()
        []
        """
        points = count(points, "number of points", low=2, high=2000)
        if not self.is_mixture:
            return []
        cache = self.__dict__.setdefault("_dew_line_cache", {})
        if points not in cache:
            line = []
            for P in np.geomspace(*DEW_LINE_PRESSURES, points):
                T = self.dew_temperature(float(P))
                if T is None or T < self.T_min:  # below the range of a component's model
                    if line and T is None:
                        break
                    continue
                try:  # the gas at its dew point (the flash is phase-specified as gas)
                    line.append(self.flash(CP.PT_INPUTS, float(P), T,
                                           f"dew point at P={P:.6g} Pa"))
                except PropertyError:
                    break
            cache[points] = line
        return list(cache[points])

    def isobar(self, P: float, s_low: float, s_high: float, points: int = 16) -> list:
        """States along an isobar at P [Pa] between two entropies [J/(kg K)].

        Entries the property model cannot resolve are ``None`` (a gap on a chart).

        Examples
        --------
        >>> import workbench as wb
        >>> len(wb.Fluid("Air").isobar(1e5, 6800.0, 7000.0, points=3))
        3
        """
        P = self.check_pressure(to_si(P, "pressure", "isobar pressure"), "isobar pressure")
        s_low = to_si(s_low, "specific_entropy", "lowest entropy")
        s_high = to_si(s_high, "specific_entropy", "highest entropy")
        points = count(points, "number of points", low=2, high=2000)
        out, guess = [], None
        for k in range(points):
            s = s_low + (s_high - s_low) * k / (points - 1)
            try:
                st = self.state_Ps(P, s, T_guess=guess)
            except PropertyError:
                out.append(None)
                continue
            out.append(st)
            guess = st.T
        return out

    def saturation_states(self, P: float) -> tuple[State, State]:
        """Saturated liquid and saturated vapour states at pressure P [Pa] (pure fluids).

        Kept in a small cache per pressure: batch rows and sweeps reuse the same pressures.

        Examples
        --------
        >>> import workbench as wb
        >>> liquid, vapour = wb.Fluid("Water").saturation_states(101325.0)
        >>> round(liquid.T, 2), liquid.x, vapour.x
        (373.12, 0.0, 1.0)
        """
        if self.is_mixture:
            raise InputError("saturation states are defined for pure fluids only")
        P = self.check_pressure(P, "saturation pressure")
        cached = self._sat_cache.get(P)
        if cached is None:
            cached = (self.flash(CP.PQ_INPUTS, P, 0.0, f"saturation at P={P:.6g} Pa"),
                      self.flash(CP.PQ_INPUTS, P, 1.0, f"saturation at P={P:.6g} Pa"))
            if len(self._sat_cache) > 512:
                self._sat_cache.clear()
            self._sat_cache[P] = cached
        return cached

    def saturation_temperature(self, P: float) -> float:
        """Saturation temperature [K] at pressure P [Pa] (pure fluids)."""
        if self.is_mixture:
            raise InputError("saturation temperature is defined for pure fluids only")
        return self.saturation_states(self.check_pressure(P, "saturation pressure"))[0].T

    def saturation_pressure(self, T: float) -> float:
        """Saturation (vapour) pressure [Pa] at temperature T [K] (pure fluids)."""
        if self.is_mixture:
            raise InputError("saturation pressure is defined for pure fluids only")
        T = to_si(T, "temperature", "saturation temperature", low=0.0, low_open=True)
        return self.flash(CP.QT_INPUTS, 0.0, T, f"saturation at T={T:.6g} K").P

    def dew_temperature(self, P: float) -> float | None:
        """Dew-point temperature [K] of a mixture at P [Pa], ``None`` if it cannot be found
        (above the cricondenbar, or the phase-envelope solver did not converge).

        The property library's dew-point solver can return the trivial solution above the
        cricondenbar (an "incipient liquid" with the density of the gas, e.g. 1394 K for a
        lean natural gas at 200 bar); such solutions, and any above the highest critical
        temperature of the components (no dew point lies there for the mixtures of this
        region), are not dew points and give ``None``.

        Examples
        --------
        >>> import workbench as wb
        >>> 150.0 < wb.Fluid({"Methane": 0.9, "Ethane": 0.1}).dew_temperature(20e5) < 250.0
        True
        """
        if not self.is_mixture:
            raise InputError("the dew temperature is defined for mixtures only; pure fluids "
                             "have a saturation temperature")
        key = round(math.log(P), 9)
        if key in self._dew_cache:
            return self._dew_cache[key]
        a = self._as
        value = None
        try:
            a.unspecify_phase()
            a.update(CP.PQ_INPUTS, P, 1.0)
            value = a.T()
            liquid = a.saturated_liquid_keyed_output(CP.iDmolar)
            vapour = a.saturated_vapor_keyed_output(CP.iDmolar)
            if not math.isfinite(value) or value <= 0 or value > self._highest_critical:
                value = None
            elif not abs(liquid - vapour) > 1e-6 * abs(vapour):
                value = None  # trivial solution: the two "phases" are the same
        except Exception:  # noqa: BLE001 - the phase-envelope solver raises several kinds
            value = None
        finally:
            a.specify_phase(CoolProp.iphase_gas)
        self._dew_cache[key] = value
        return value

    def check_above_dew(self, P: float, T: float) -> None:
        """Refuse (PropertyError) a mixture state at or below its dew point at P [Pa].

        Uses the dew-line table's bounds where they vouch for the verdict, the exact dew
        point otherwise.
        """
        bounds = self.dew_bounds(P)
        if bounds is not None and T > bounds[1]:
            return  # clear of the dew line by more than the table's margin
        t_dew = self.dew_temperature(P)
        if t_dew is not None and T <= t_dew:
            raise PropertyError(
                f"temperature {T:.6g} K is at or below the dew point {t_dew:.6g} K of {self.name} "
                f"at {P / 1e5:.6g} bar: mixtures are supported in the single-phase gas region only")

    def dew_bounds(self, P: float):
        """Bounds (low, high) [K] on a mixture's dew temperature at P [Pa] from the dew-line
        table, or ``None`` where the table cannot vouch for it (then the exact dew point is
        needed).

        The dew-point flash costs milliseconds; a batch of rows at ever different pressures
        would do one per state.  After :attr:`DEW_TABLE_AFTER` distinct flashes the fluid
        tabulates the dew line on a log-pressure grid, checks the linear interpolation at each
        interval's midpoint, and gives bounds widened to 0.5 K plus 20 times that check.
        A state clear of the high bound needs no flash; any other state (and every state in an
        interval where a flash of the table failed, e.g. near the cricondenbar) gets the exact
        one.
        """
        table = self.__dict__.get("_dew_table")
        if table is None:
            if len(self._dew_cache) < self.DEW_TABLE_AFTER:
                return None
            table = self._dew_table = self._build_dew_table()
        grid, values, margins = table
        x = math.log(P)
        k = int(np.searchsorted(grid, x)) - 1
        if k < 0 or k >= len(grid) - 1 or not math.isfinite(margins[k]):
            return None
        t = values[k] + (values[k + 1] - values[k]) * (x - grid[k]) / (grid[k + 1] - grid[k])
        return t - margins[k], t + margins[k]

    def _build_dew_table(self):
        grid = np.linspace(math.log(DEW_LINE_PRESSURES[0]), math.log(DEW_LINE_PRESSURES[1]), 81)
        values = np.array([_none_nan(self.dew_temperature(math.exp(x))) for x in grid])
        middles = 0.5 * (grid[1:] + grid[:-1])
        exact = np.array([_none_nan(self.dew_temperature(math.exp(x))) for x in middles])
        error = np.abs(exact - 0.5 * (values[1:] + values[:-1]))  # NaN where not found
        return grid, values, 0.5 + 20.0 * error
