"""Thermodynamic states: one state (:class:`State`) and many states of one fluid (:class:`StateArray`).

Both hold SI numbers only; they are made by :class:`workbench.properties.Fluid`.  The vapour
quality is a float everywhere: NaN when the state is single-phase, so a table column of
qualities needs no special case (``State.two_phase`` says which it is).

References
----------
I. H. Bell, J. Wronski, S. Quoilin, V. Lemort, "Pure and Pseudo-pure Fluid Thermophysical
Property Evaluation and the Open-Source Thermophysical Property Library CoolProp",
Ind. Eng. Chem. Res. 53 (2014) 2498-2508 (the phase codes translated here).
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from typing import TYPE_CHECKING

import CoolProp
import numpy as np

from ..errors import PropertyError

if TYPE_CHECKING:  # pragma: no cover - for annotations only
    from .fluid import Fluid

#: Plain phase words for the property library's phase codes.
PHASE_WORDS = {
    CoolProp.iphase_liquid: "liquid",
    CoolProp.iphase_gas: "gas",
    CoolProp.iphase_supercritical: "supercritical",
    CoolProp.iphase_supercritical_gas: "gas",
    CoolProp.iphase_supercritical_liquid: "liquid",
    CoolProp.iphase_twophase: "two-phase",
    CoolProp.iphase_critical_point: "supercritical",
}

#: The same words indexed by phase code (for arrays of codes); ``""`` for unknown codes.
PHASE_TABLE = np.array([PHASE_WORDS.get(code, "") for code in range(16)], dtype=object)


def phase_words(codes: np.ndarray) -> np.ndarray:
    """Plain phase words for an array of the property library's phase codes.

    Parameters
    ----------
    codes : numpy.ndarray
        Phase codes as floats (NaN where the library gave none).

    Returns
    -------
    numpy.ndarray
        Object array of words as in :data:`PHASE_WORDS`; ``""`` where the code is unknown.

    Examples
    --------
    >>> phase_words(np.array([float(CoolProp.iphase_twophase), np.nan])).tolist()
    ['two-phase', '']
    """
    known = np.isfinite(codes) & (codes >= 0) & (codes < len(PHASE_TABLE))
    words = np.full(len(codes), "", dtype=object)
    words[known] = PHASE_TABLE[codes[known].astype(int)]
    return words


@dataclass(frozen=True, eq=False)
class State:
    """A thermodynamic state of a fluid, in SI units.

    Attributes
    ----------
    fluid : Fluid
        The fluid this state belongs to.
    P : float
        Pressure [Pa].
    T : float
        Temperature [K].
    h : float
        Specific enthalpy [J/kg].
    s : float
        Specific entropy [J/(kg K)].
    rho : float
        Density [kg/m^3].
    x : float
        Vapour quality (mass fraction of vapour) [-]; NaN when single-phase (see
        :attr:`two_phase`).
    cp : float
        Isobaric specific heat [J/(kg K)]; NaN inside the two-phase region.
    phase : str
        ``"liquid"``, ``"gas"``, ``"supercritical"``, ``"two-phase"`` (plain words).
    """

    fluid: Fluid = field(repr=False)
    P: float
    T: float
    h: float
    s: float
    rho: float
    x: float = math.nan
    cp: float = math.nan
    phase: str = ""

    @property
    def two_phase(self) -> bool:
        """True inside the two-phase region (a vapour quality is defined)."""
        return not math.isnan(self.x)

    @property
    def quality(self) -> float:
        """Vapour quality [-], NaN when single-phase (the same number as :attr:`x`)."""
        return float(self.x)

    @property
    def v(self) -> float:
        """Specific volume [m^3/kg]."""
        return 1.0 / self.rho

    @property
    def Z(self) -> float:
        """Compressibility factor P v / (R T) [-]."""
        return self.P / (self.rho * self.fluid.gas_constant * self.T)

    def as_dict(self) -> dict:
        """Flat dict of the state's numbers in SI units (``x`` NaN when single-phase)."""
        return {
            "P": self.P, "T": self.T, "h": self.h, "s": self.s, "rho": self.rho,
            "x": self.x, "phase": self.phase,
        }

    def __repr__(self) -> str:
        q = f", x={self.x:.4f}" if self.two_phase else ""
        return (f"State({self.fluid.name}: P={self.P:.6g} Pa, T={self.T:.6g} K, "
                f"h={self.h:.6g} J/kg, s={self.s:.6g} J/(kg K){q})")


@dataclass(frozen=True, eq=False)
class StateArray:
    """Many states of one fluid held as arrays, one entry per row (batch evaluation).

    Made by :meth:`Fluid.states_PT`, :meth:`Fluid.states_Ph` and :meth:`Fluid.states_Ps`.
    Entries the single-state API would refuse (out of range, not found, ambiguous) have
    ``valid`` False and NaN numbers; call the single-state method for that entry to get the
    message.  Valid entries equal the single-state results to rounding.

    Attributes
    ----------
    fluid : Fluid
        The fluid of every state.
    P, T, h, s, rho : numpy.ndarray
        Pressure [Pa], temperature [K], specific enthalpy [J/kg], specific entropy
        [J/(kg K)], density [kg/m^3].
    x : numpy.ndarray
        Vapour quality [-]; NaN where single-phase.
    cp : numpy.ndarray
        Isobaric specific heat [J/(kg K)]; NaN inside the two-phase region.
    phase : numpy.ndarray
        Plain phase words as in :class:`State` (object array; ``""`` where not valid).
    valid : numpy.ndarray
        Boolean mask of the entries found.
    tabulated : numpy.ndarray or None
        Boolean mask of the entries interpolated in a batch's property table (within the
        table's tolerance of the exact flash, see :mod:`workbench.properties.fast`); None when
        every entry is an exact flash.
    """

    fluid: Fluid = field(repr=False)
    P: np.ndarray
    T: np.ndarray
    h: np.ndarray
    s: np.ndarray
    rho: np.ndarray
    x: np.ndarray
    cp: np.ndarray
    phase: np.ndarray
    valid: np.ndarray
    tabulated: np.ndarray | None = None

    def __len__(self) -> int:
        return len(self.P)

    @property
    def two_phase(self) -> np.ndarray:
        """Boolean mask of the entries inside the two-phase region."""
        return ~np.isnan(self.x)

    def state(self, i: int) -> State:
        """Entry ``i`` as a :class:`State` (raises PropertyError for an entry not valid)."""
        if not self.valid[i]:
            raise PropertyError(f"entry {i} of the state array is not a valid state")
        return State(self.fluid, float(self.P[i]), float(self.T[i]), float(self.h[i]),
                     float(self.s[i]), float(self.rho[i]), float(self.x[i]),
                     float(self.cp[i]), str(self.phase[i]))

    def masked(self, keep) -> StateArray:
        """The same states with the entries outside ``keep`` made not valid (NaN numbers).

        Examples
        --------
        >>> import workbench as wb
        >>> states = wb.Fluid("Air").states_PT([1e5, 2e5], [300.0, 300.0])
        >>> states.masked(np.array([True, False])).valid.tolist()
        [True, False]
        """
        keep = self.valid & keep

        def cut(values):
            values = values.copy()
            values[~keep] = np.nan
            return values

        phase = self.phase.copy()
        phase[~keep] = ""
        tabulated = None if self.tabulated is None else self.tabulated & keep
        return StateArray(self.fluid, cut(self.P), cut(self.T), cut(self.h), cut(self.s),
                          cut(self.rho), cut(self.x), cut(self.cp), phase, keep, tabulated)

    def __repr__(self) -> str:
        return f"StateArray({self.fluid.name}: {int(self.valid.sum())} of {len(self)} valid)"


def empty_columns(n: int) -> tuple[dict, np.ndarray]:
    """NaN columns T, h, s, rho, x, cp of length ``n`` and an empty phase column."""
    columns = {name: np.full(n, np.nan) for name in ("T", "h", "s", "rho", "x", "cp")}
    return columns, np.full(n, "", dtype=object)
