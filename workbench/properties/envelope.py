"""A mixture's phase envelope from one call, checked against a whole frame of states at once.

The property library traces the whole phase envelope of a mixture (dew and bubble branches,
through the cricondentherm and the cricondenbar) in one call of tens of milliseconds, where a
single dew-point flash costs about a millisecond.  :func:`phase_envelope` keeps the traced
curve; :meth:`PhaseEnvelope.edge_temperature` gives, for an array of pressures, the highest
temperature at which the envelope crosses each pressure: above it (plus a margin) a state is
single-phase gas.  :meth:`PhaseEnvelope.clear` marks the states of a frame that lie clear of
the envelope; the other states (near or below the dew line, or where the envelope could not be
traced) are left to the exact single-state flashes and their dew-point checks.

The curve is checked where it is used: :meth:`PhaseEnvelope.limit` compares it with the exact
dew-point flashes of the single-state API at a few pressures of the frame and raises the
returned temperature limit when they disagree, so a row handed to a fast path is one the
single-state API also finds above the dew point.

References
----------
M. L. Michelsen, "Calculation of phase envelopes and critical points for multicomponent
mixtures", Fluid Phase Equilibria 4 (1980) 1-10 (the tracing method).
I. H. Bell et al., "Pure and pseudo-pure fluid thermophysical property evaluation and the
open-source thermophysical property library CoolProp", Ind. Eng. Chem. Res. 53 (2014) 2498.
"""

from __future__ import annotations

import math
import threading
from dataclasses import dataclass

import numpy as np

from ..errors import InputError
from ..units import count, positive, to_si_array

#: Margin [K] kept between a fast-path state and the dew line.
DEW_MARGIN = 5.0

_CACHE: dict = {}
_LOCK = threading.Lock()


@dataclass(frozen=True)
class PhaseEnvelope:
    """A traced phase envelope of one mixture.

    Attributes
    ----------
    T, P : numpy.ndarray
        Temperatures [K] and pressures [Pa] along the traced curve, in tracing order (dew
        branch from low pressure, then the bubble branch).  Empty if tracing failed.
    cricondenbar : float
        Highest pressure on the curve [Pa] (NaN if not traced).
    cricondentherm : float
        Highest temperature on the curve [K] (NaN if not traced).
    """

    T: np.ndarray
    P: np.ndarray

    @property
    def traced(self) -> bool:
        """True when the curve was traced (at least a few points)."""
        return len(self.T) >= 4

    @property
    def cricondenbar(self) -> float:
        return float(self.P.max()) if self.traced else math.nan

    @property
    def cricondentherm(self) -> float:
        return float(self.T.max()) if self.traced else math.nan

    def edge_temperature(self, P) -> np.ndarray:
        """Highest temperature [K] at which the envelope crosses each pressure P [Pa].

        -inf above the cricondenbar and below the lowest traced pressure is NaN (unknown);
        NaN everywhere when the envelope was not traced.

        Examples
        --------
        >>> env = PhaseEnvelope(np.array([200.0, 250.0, 240.0, 180.0]),
        ...                     np.array([1e5, 40e5, 60e5, 20e5]))
        >>> env.edge_temperature(np.array([20e5])).round(1)  # crossings at 240.6 K and 180 K
        array([240.6])
        """
        P = to_si_array(P, "pressure", "pressure")
        if not self.traced:
            return np.full(len(P), np.nan)
        with np.errstate(invalid="ignore", divide="ignore"):
            x = np.where(P > 0, np.log(np.where(P > 0, P, 1.0)), np.nan)
        xs, ts = np.log(self.P), self.T
        edge = np.full(len(P), -np.inf)
        a, b = xs[:-1], xs[1:]
        lo, hi = np.minimum(a, b), np.maximum(a, b)
        for k in range(len(a)):  # one pass per segment of the curve (about a hundred)
            inside = (x >= lo[k]) & (x <= hi[k])
            if not inside.any():
                continue
            span = b[k] - a[k]
            w = 0.5 if span == 0 else (x[inside] - a[k]) / span
            t = ts[k] + w * (ts[k + 1] - ts[k])
            edge[inside] = np.maximum(edge[inside], t)
        edge[~(x >= xs.min())] = np.nan  # below the traced range (or no pressure): unknown
        return edge

    def limit(self, P, dew_temperature=None, probes: int = 5,
              margin: float = DEW_MARGIN) -> float:
        """Lowest temperature [K] above which every pressure in the range of P is single-phase.

        The highest edge temperature over the range of the pressures (sampled densely between
        their least and greatest), raised to any exact dew point the single-state API finds
        at ``probes`` pressures across the range (``dew_temperature(P)``, ``None`` when it
        finds none), plus ``margin``.  NaN when the envelope was not traced or does not reach
        down to the least pressure.
        """
        P = to_si_array(P, "pressure", "pressure")
        margin = positive(margin, "temperature_difference", "dew margin")
        probes = count(probes, "probes", low=1, high=100)
        P = P[np.isfinite(P) & (P > 0)]
        if not len(P) or not self.traced:
            return math.nan
        grid = np.geomspace(P.min(), P.max(), 200) if P.max() > P.min() else P[:1]
        edge = self.edge_temperature(grid)
        if np.isnan(edge).any():
            return math.nan
        highest = float(np.max(edge))
        if dew_temperature is not None:
            for p in _probe_pressures(P.min(), P.max(), probes):
                t = dew_temperature(p)
                if t is not None and math.isfinite(t):
                    highest = max(highest, t)
        return highest + margin

    def clear(self, P, T, margin: float = DEW_MARGIN) -> np.ndarray:
        """Mask of the states (arrays P [Pa], T [K]) clear of the envelope by ``margin`` [K]."""
        T = to_si_array(T, "temperature", "temperature")
        margin = positive(margin, "temperature_difference", "dew margin")
        edge = self.edge_temperature(P)
        if len(edge) != len(T):
            raise InputError(f"pressure and temperature arrays need equal lengths, not "
                             f"{len(edge)} and {len(T)}")
        with np.errstate(invalid="ignore"):
            return np.isfinite(T) & ~np.isnan(edge) & (T > edge + margin)


#: Step of the probe grid in ln(P): pressures 1 % apart.
_PROBE_STEP = 0.01


def _probe_pressures(p_min: float, p_max: float, probes: int) -> list:
    """``probes`` pressures [Pa] on the fixed 1 % grid, from the grid point at or below
    ``p_min`` to the one at or above ``p_max`` (one point when they coincide)."""
    lo = math.floor(math.log(p_min) / _PROBE_STEP)
    hi = math.ceil(math.log(p_max) / _PROBE_STEP)
    steps = sorted({round(k) for k in np.linspace(lo, hi, probes)}) if hi > lo else [lo]
    return [math.exp(k * _PROBE_STEP) for k in steps]


def phase_envelope(fluid) -> PhaseEnvelope:
    """The phase envelope of a mixture, traced once and cached.

    Parameters
    ----------
    fluid : Fluid
        A mixture (its components and mole fractions).

    Returns
    -------
    PhaseEnvelope
        Not ``traced`` when the property library could not trace it (the caller then uses
        exact dew-point flashes).

    Raises
    ------
    InputError
        If ``fluid`` is not a mixture :class:`workbench.properties.Fluid`.

    Examples
    --------
    >>> import workbench as wb
    >>> env = phase_envelope(wb.Fluid({"Methane": 0.9, "Ethane": 0.1}))
    >>> 190.0 < env.cricondentherm < 260.0
    True
    """
    from .fluid import Fluid

    if not isinstance(fluid, Fluid) or not fluid.is_mixture:
        raise InputError(f"a phase envelope needs a mixture Fluid, not {type(fluid).__name__}"
                         + ("" if not isinstance(fluid, Fluid) else f" {fluid.name}"))
    key = (tuple(fluid.components), tuple(round(f, 12) for f in fluid.fractions))
    with _LOCK:
        found = _CACHE.get(key)
        if found is None:
            found = _CACHE[key] = _trace(*key)
            if len(_CACHE) > 16:
                _CACHE.pop(next(iter(_CACHE)))
    return found


def _trace(components, fractions) -> PhaseEnvelope:
    import CoolProp

    try:
        state = CoolProp.AbstractState("HEOS", "&".join(components))
        state.set_mole_fractions(list(fractions))
        state.build_phase_envelope("")
        data = state.get_phase_envelope_data()
        T, P = np.asarray(data.T, dtype=float), np.asarray(data.p, dtype=float)
    except Exception:  # noqa: BLE001 - the library could not trace it: exact flashes serve
        return PhaseEnvelope(np.empty(0), np.empty(0))
    keep = np.isfinite(T) & np.isfinite(P) & (P > 0) & (T > 0)
    return PhaseEnvelope(T[keep], P[keep])


def clear_cache() -> None:
    """Forget every traced envelope."""
    with _LOCK:
        _CACHE.clear()


__all__ = ["clear_cache", "PhaseEnvelope", "phase_envelope", "DEW_MARGIN"]
