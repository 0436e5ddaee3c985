"""Real-fluid states over CoolProp's low-level ``AbstractState``.

Every property flash of the workbench happens in this module.  A :class:`Fluid` holds one
CoolProp ``AbstractState`` (created once, reused for every flash) and produces immutable
:class:`State` objects in SI units.  For batches, :meth:`Fluid.states_PT`,
:meth:`Fluid.states_Ph` and :meth:`Fluid.states_Ps` return a :class:`StateArray` (one entry per
row) through CoolProp's array interface, with the same checks and results as the single-state
methods; entries those would refuse are marked not valid.

Supported regions
-----------------
* Pure and pseudo-pure fluids (``"Water"``, ``"Air"``, ``"R134a"``, ``"CarbonDioxide"`` ...):
  the whole range of CoolProp's Helmholtz-energy equation of state, including the two-phase
  region (flashes from P-T, P-h, P-s, P-quality and T-quality).
* Water on IAPWS-IF97 (``Fluid("Water", backend="IF97")``): faster, 273.15 K to 1073.15 K and
  up to 100 MPa.
* Mixtures given by composition: the single-phase gas and dense (supercritical) region only.
  Flashes are phase-specified P-T flashes; P-h and P-s are solved here by a safeguarded Newton
  iteration on temperature.  A state at or below the mixture's dew point is refused.

References
----------
I. H. Bell, J. Wronski, S. Quoilin, V. Lemort, "Pure and Pseudo-pure Fluid Thermophysical
Property Evaluation and the Open-Source Thermophysical Property Library CoolProp",
Ind. Eng. Chem. Res. 53 (2014) 2498-2508.
IAPWS R7-97(2012), Revised Release on the IAPWS Industrial Formulation 1997 for the
Thermodynamic Properties of Water and Steam.
"""

from __future__ import annotations

import math
import threading
from dataclasses import dataclass, field

import CoolProp
import CoolProp.CoolProp as CP
import numpy as np

from .errors import InputError, PropertyError
from .units import to_si

_ARRAY_LOCK = threading.Lock()

#: Universal gas constant [J/(mol K)] (CODATA 2018, exact).
R_UNIVERSAL = 8.314462618

_FLUID_LIST = sorted(CP.get_global_param_string("FluidsList").split(","))


def available_fluids() -> list[str]:
    """Names of the pure and pseudo-pure fluids the property library knows, sorted."""
    return list(_FLUID_LIST)


def _canonical_name(name: str) -> str:
    """Return CoolProp's name for a fluid, accepting its aliases; raise InputError if unknown."""
    if not isinstance(name, str) or not name.strip():
        raise InputError(f"fluid name must be a non-empty text, not {name!r}")
    key = name.strip()
    try:
        canonical = CP.get_fluid_param_string(key, "name")
    except Exception:
        raise InputError(
            f"unknown fluid {name!r}: use a property-library fluid name such as Water, Air, "
            "Nitrogen, CarbonDioxide, Methane, R134a (see workbench.available_fluids())"
        ) from None
    return canonical


def normalise_fractions(composition: dict) -> dict:
    """Scale fractions so they sum to exactly 1 (a convenience for editors and panels)."""
    total = sum(float(v) for v in composition.values())
    if not math.isfinite(total) or total <= 0:
        raise InputError(f"composition fractions sum to {total}; they must be positive")
    return {k: float(v) / total for k, v in composition.items()}


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
    x : float or None
        Vapour quality (mass fraction of vapour) [-], ``None`` when single-phase.
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
    x: float | None
    cp: float = float("nan")
    phase: str = ""

    @property
    def two_phase(self) -> bool:
        """True inside the two-phase region (a vapour quality is defined)."""
        return self.x is not None and not (isinstance(self.x, float) and math.isnan(self.x))

    @property
    def quality(self) -> float:
        """Vapour quality [-], NaN when single-phase (for tables)."""
        return float(self.x) if self.two_phase else math.nan

    @property
    def v(self) -> float:
        """Specific volume [m^3/kg]."""
        return 1.0 / self.rho

    @property
    def Z(self) -> float:
        """Compressibility factor P v / (R T) [-]."""
        return self.P / (self.rho * self.fluid.gas_constant * self.T)

    def as_dict(self) -> dict:
        """Flat dict of the state's numbers in SI units."""
        return {
            "P": self.P, "T": self.T, "h": self.h, "s": self.s, "rho": self.rho,
            "x": self.x, "phase": self.phase,
        }

    def __repr__(self) -> str:
        q = "" if self.x is None else f", x={self.x:.4f}"
        return (f"State({self.fluid.name}: P={self.P:.6g} Pa, T={self.T:.6g} K, "
                f"h={self.h:.6g} J/kg, s={self.s:.6g} J/(kg K){q})")


_PHASE_WORDS = {
    CoolProp.iphase_liquid: "liquid",
    CoolProp.iphase_gas: "gas",
    CoolProp.iphase_supercritical: "supercritical",
    CoolProp.iphase_supercritical_gas: "gas",
    CoolProp.iphase_supercritical_liquid: "liquid",
    CoolProp.iphase_twophase: "two-phase",
    CoolProp.iphase_critical_point: "supercritical",
}

_PHASE_TABLE = np.array([_PHASE_WORDS.get(code, "") for code in range(16)], dtype=object)


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
        Boolean mask of the entries interpolated in a property table (within the table's
        tolerance of the exact flash, see :mod:`workbench.properties.fast`); None when every
        entry is an exact flash.
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

    def state(self, i: int) -> State:
        """Entry ``i`` as a :class:`State` (raises PropertyError for an entry not valid)."""
        if not self.valid[i]:
            raise PropertyError(f"entry {i} of the state array is not a valid state")
        x = float(self.x[i])
        return State(self.fluid, float(self.P[i]), float(self.T[i]), float(self.h[i]),
                     float(self.s[i]), float(self.rho[i]), None if math.isnan(x) else x,
                     float(self.cp[i]), str(self.phase[i]))

    def __repr__(self) -> str:
        return f"StateArray({self.fluid.name}: {int(self.valid.sum())} of {len(self)} valid)"


class Fluid:
    """A pure fluid, pseudo-pure fluid or mixture, and the factory of its states.

    Parameters
    ----------
    spec : str or dict
        A property-library fluid name (``"Water"``, ``"Air"``, ``"R134a"``) or a composition
        ``{"Methane": 0.9, "Ethane": 0.1}``.  Fractions must sum to 1 (within 1e-6).
    basis : {"mole", "mass"}
        Basis of the fractions of a composition.
    backend : {"HEOS", "IF97"}
        Property model.  ``"IF97"`` is allowed for water only.

    Raises
    ------
    InputError
        Unknown fluid names, fractions that are not positive or do not sum to 1, IF97 for a
        fluid other than water.
    """

    def __init__(self, spec, *, basis: str = "mole", backend: str = "HEOS"):
        if backend not in ("HEOS", "IF97"):
            raise InputError(f"backend must be 'HEOS' or 'IF97', not {backend!r}")
        if basis not in ("mole", "mass"):
            raise InputError(f"fraction basis must be 'mole' or 'mass', not {basis!r}")
        if isinstance(spec, Fluid):
            spec = spec.spec
        if isinstance(spec, dict):
            if not spec:
                raise InputError("composition is empty: give at least one component")
            names, fractions = [], []
            for key, value in spec.items():
                canonical = _canonical_name(key)
                fraction = to_si(value, "dimensionless", f"fraction of {key}")
                if fraction < 0 or fraction > 1:
                    raise InputError(f"fraction of {key} is {fraction}; it must lie in [0, 1]")
                if fraction == 0:
                    continue
                if canonical in names:
                    raise InputError(f"component {key} appears twice in the composition")
                names.append(canonical)
                fractions.append(fraction)
            total = sum(fractions)
            if abs(total - 1.0) > 1e-6:
                raise InputError(
                    f"composition fractions sum to {total:.6g}; they must sum to 1 "
                    "(normalise them with workbench.normalise_fractions)"
                )
            fractions = [f / total for f in fractions]
            if basis == "mass":
                molar = [CP.PropsSI("M", n) for n in names]
                moles = [f / m for f, m in zip(fractions, molar)]
                fractions = [n / sum(moles) for n in moles]
        else:
            names, fractions = [_canonical_name(spec)], [1.0]
        self.components: tuple[str, ...] = tuple(names)
        self.fractions: tuple[float, ...] = tuple(fractions)
        self.is_mixture = len(names) > 1
        if backend == "IF97" and (self.is_mixture or names[0] != "Water"):
            raise InputError("the IF97 backend is for water only")
        self.backend = backend
        # One property-library state object per thread: a state object holds the last flash,
        # so two threads (a threaded dask scheduler, a web server) must not share one.
        self._local = threading.local()
        try:
            self._local.state = self._new_state()
        except Exception:
            raise InputError(
                f"the property library has no mixture model for {' + '.join(names)}"
            ) from None
        self.molar_mass = self._as.molar_mass()  # kg/mol
        self.gas_constant = R_UNIVERSAL / self.molar_mass  # J/(kg K)
        self.T_min = self._as.Tmin()
        self.T_max = self._as.Tmax()
        self.P_max = self._as.pmax()
        if self.is_mixture:
            # Each component's model must be valid too.
            self.T_min = max(self.T_min, max(CP.PropsSI("Tmin", n) for n in names))
            self._highest_critical = max(CP.PropsSI("Tcrit", n) for n in names)
            self.T_critical = self.P_critical = float("nan")
            self._dew_cache: dict = {}
        else:
            self.T_critical = self._as.T_critical()
            self.P_critical = self._as.p_critical()
            self.P_triple = CP.PropsSI("ptriple", names[0]) if backend == "HEOS" else 611.657
            self._sat_cache: dict = {}
        self.name = self._display_name()
        self._array_name = f"{backend}::{names[0]}"  # array interface (pure fluids)
        #: Number of property flashes done by this fluid object (for benchmarks); an array
        #: call counts one per entry and output.
        self.flash_count = 0

    def _new_state(self):
        state = CP.AbstractState(self.backend, "&".join(self.components))
        if self.is_mixture:
            state.set_mole_fractions(list(self.fractions))
            state.specify_phase(CoolProp.iphase_gas)
        return state

    @property
    def _as(self):
        """This thread's property-library state object (made on first use in a thread)."""
        try:
            return self._local.state
        except AttributeError:
            self._local.state = self._new_state()
            return self._local.state

    # ------------------------------------------------------------------ identity
    @property
    def spec(self):
        """The name (pure fluid) or the mole-fraction composition (mixture)."""
        if self.is_mixture:
            return dict(zip(self.components, self.fractions))
        return self.components[0]

    def _display_name(self) -> str:
        if not self.is_mixture:
            return self.components[0] + (" (IF97)" if self.backend == "IF97" else "")
        return " + ".join(f"{n} {f:.4g}" for n, f in zip(self.components, self.fractions))

    def __eq__(self, other) -> bool:
        return (isinstance(other, Fluid) and self.backend == other.backend
                and self.components == other.components
                and all(abs(a - b) < 1e-12 for a, b in zip(self.fractions, other.fractions)))

    def __hash__(self) -> int:
        return hash((self.backend, self.components, tuple(round(f, 12) for f in self.fractions)))

    def __reduce__(self):
        return (_rebuild_fluid, (self.spec, self.backend))

    def __repr__(self) -> str:
        return f"Fluid({self.spec!r}" + (", backend='IF97')" if self.backend == "IF97" else ")")

    # ------------------------------------------------------------------ public flashes
    def state(self, *, P=None, T=None, h=None, s=None, x=None) -> State:
        """Return the state fixed by two properties.

        Parameters
        ----------
        P : float or Quantity, optional
            Pressure [Pa].
        T : float or Quantity, optional
            Temperature [K].
        h : float or Quantity, optional
            Specific enthalpy [J/kg].
        s : float or Quantity, optional
            Specific entropy [J/(kg K)].
        x : float, optional
            Vapour quality [-], in [0, 1]; pure fluids only.

        Accepted pairs: (P, T), (P, h), (P, s), (P, x), (T, x).
        """
        given = {k for k, v in dict(P=P, T=T, h=h, s=s, x=x).items() if v is not None}
        pairs = [{"P", "T"}, {"P", "h"}, {"P", "s"}, {"P", "x"}, {"T", "x"}]
        if given not in pairs:
            raise InputError(
                f"a state needs exactly one of the pairs (P, T), (P, h), (P, s), (P, x), (T, x); "
                f"got {', '.join(sorted(given)) or 'nothing'}"
            )
        if P is not None:
            P = self._check_pressure(to_si(P, "pressure", "pressure"))
        if T is not None:
            T = self._check_temperature(to_si(T, "temperature", "temperature"))
        if x is not None:
            x = to_si(x, "dimensionless", "quality")
            if not 0.0 <= x <= 1.0:
                raise InputError(f"quality {x:g} is outside [0, 1]")
            if self.is_mixture:
                raise InputError("quality can be given for pure fluids only; "
                                 "mixtures are supported in the gas region")
        if given == {"P", "T"}:
            return self.state_PT(P, T)
        if given == {"P", "h"}:
            return self.state_Ph(P, to_si(h, "specific_enthalpy", "specific enthalpy"))
        if given == {"P", "s"}:
            return self.state_Ps(P, to_si(s, "specific_entropy", "specific entropy"))
        if given == {"P", "x"}:
            if P >= self.P_critical:
                raise InputError(
                    f"pressure {P / 1e5:.6g} bar is at or above the critical pressure "
                    f"{self.P_critical / 1e5:.6g} bar of {self.name}: quality has no meaning there")
            return self._flash(CP.PQ_INPUTS, P, x, f"P={P:.6g} Pa, x={x:g}")
        if T >= self.T_critical:
            raise InputError(
                f"temperature {T:.6g} K is at or above the critical temperature "
                f"{self.T_critical:.6g} K of {self.name}: quality has no meaning there")
        return self._flash(CP.QT_INPUTS, x, T, f"T={T:.6g} K, x={x:g}")

    # fast SI entry points used by the machines (inputs already floats)
    def state_PT(self, P: float, T: float) -> State:
        """State from pressure [Pa] and temperature [K] (SI floats)."""
        self._check_pressure(P)
        self._check_temperature(T)
        if self.is_mixture:
            self._check_above_dew(P, T)
            return self._flash(CP.PT_INPUTS, P, T, f"P={P:.6g} Pa, T={T:.6g} K")
        if self.P_triple < P < self.P_critical:
            try:
                t_sat = self.saturation_temperature(P)
            except PropertyError:
                t_sat = None
            if t_sat is not None and abs(T - t_sat) < 1e-6 * t_sat:
                raise InputError(
                    f"temperature {T:.6g} K is the saturation temperature at {P / 1e5:.6g} bar: "
                    "the state is not fixed by P and T there; give the quality instead")
        return self._flash(CP.PT_INPUTS, P, T, f"P={P:.6g} Pa, T={T:.6g} K")

    def state_Ph(self, P: float, h: float, T_guess: float | None = None) -> State:
        """State from pressure [Pa] and specific enthalpy [J/kg] (SI floats)."""
        self._check_pressure(P)
        if self.is_mixture:
            return self._solve_T(P, h, "h", T_guess)
        if self.backend == "IF97":
            st = self._if97_exact(P, h, "h", CP.HmassP_INPUTS, (h, P))
        else:
            st = self._flash(CP.HmassP_INPUTS, h, P, f"P={P:.6g} Pa, h={h:.6g} J/kg")
        self._check_temperature(st.T, derived=True)
        return st

    def state_Ps(self, P: float, s: float, T_guess: float | None = None) -> State:
        """State from pressure [Pa] and specific entropy [J/(kg K)] (SI floats)."""
        self._check_pressure(P)
        if self.is_mixture:
            return self._solve_T(P, s, "s", T_guess)
        if self.backend == "IF97":
            st = self._if97_exact(P, s, "s", CP.PSmass_INPUTS, (P, s))
        else:
            st = self._flash(CP.PSmass_INPUTS, P, s, f"P={P:.6g} Pa, s={s:.6g} J/(kg K)")
        self._check_temperature(st.T, derived=True)
        return st

    def state_hs(self, h: float, s: float, P_guess: float) -> State:
        """State from specific enthalpy [J/kg] and entropy [J/(kg K)], e.g. a stagnation state.

        Solved here by a secant iteration on pressure along the isentrope, because
        enthalpy-entropy flashes are not available for every fluid and backend.
        """
        P0 = P_guess
        st0 = self.state_Ps(P0, s)
        f0 = st0.h - h
        if abs(f0) < 1e-9 * max(abs(h), 1.0):
            return st0
        # dh = v dP along an isentrope: Newton step.
        P1 = P0 + (-f0) * st0.rho
        for _ in range(50):
            P1 = min(max(P1, 0.2 * P0), 5.0 * P0)
            st1 = self.state_Ps(P1, s, T_guess=st0.T)
            f1 = st1.h - h
            if abs(f1) < 1e-9 * max(abs(h), 1.0):
                return st1
            step = -f1 * st1.rho
            P0, st0, f0 = P1, st1, f1
            P1 = P1 + step
        raise PropertyError(f"the stagnation state of {self.name} at h={h:.6g} J/kg, "
                            f"s={s:.6g} J/(kg K) did not converge")

    def gas_path_point(self, P: float, T: float) -> tuple[State, float]:
        """State at (P [Pa], T [K]) and the isothermal enthalpy slope (dh/dP)_T [m^3/kg].

        Used to integrate process paths of mixtures with temperature as the path variable.
        """
        st = self._flash(CP.PT_INPUTS, P, T, f"P={P:.6g} Pa, T={T:.6g} K")
        try:
            slope = self._as.first_partial_deriv(CP.iHmass, CP.iP, CP.iT)
        except (ValueError, RuntimeError) as exc:
            raise PropertyError(f"the property model gave no derivative for {self.name} at "
                                f"P={P:.6g} Pa, T={T:.6g} K") from exc
        return st, slope

    # ------------------------------------------------------------------ saturation
    def saturation_curve(self, points: int = 40) -> list[State]:
        """The saturation dome: saturated-liquid states upwards, then saturated vapour down.

        Pressures are log-spaced from just above the triple point to 0.995 of the critical
        pressure; pressures the model cannot resolve are left out.  Mixtures give their dew
        line instead (:meth:`dew_line`), the edge of the region they are supported in.
        Cached per fluid object.
        """
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
        component's model are left out.  Pure fluids give an empty list (their
        dome is :meth:`saturation_curve`).  Cached per fluid object.
        """
        if not self.is_mixture:
            return []
        cache = self.__dict__.setdefault("_dew_line_cache", {})
        if points not in cache:
            line = []
            for P in np.geomspace(1e4, 2e7, max(points, 2)):
                T = self.dew_temperature(float(P))
                if T is None or T < self.T_min:  # below the range of a component's model
                    if line and T is None:
                        break
                    continue
                try:  # the gas at its dew point (the flash is phase-specified as gas)
                    line.append(self._flash(CP.PT_INPUTS, float(P), T, f"dew point at P={P:.6g} Pa"))
                except PropertyError:
                    break
            cache[points] = line
        return list(cache[points])

    def isobar(self, P: float, s_low: float, s_high: float, points: int = 16) -> list:
        """States along an isobar at P [Pa] between two entropies [J/(kg K)].

        Entries the property model cannot resolve are ``None`` (a gap on a chart).
        """
        out, guess = [], None
        for k in range(points):
            s = s_low + (s_high - s_low) * k / max(points - 1, 1)
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
        """
        if self.is_mixture:
            raise InputError("saturation states are defined for pure fluids only")
        cached = self._sat_cache.get(P)
        if cached is None:
            cached = (self._flash(CP.PQ_INPUTS, P, 0.0, f"saturation at P={P:.6g} Pa"),
                      self._flash(CP.PQ_INPUTS, P, 1.0, f"saturation at P={P:.6g} Pa"))
            if len(self._sat_cache) > 512:
                self._sat_cache.clear()
            self._sat_cache[P] = cached
        return cached

    def saturation_temperature(self, P: float) -> float:
        """Saturation temperature [K] at pressure P [Pa] (pure fluids)."""
        if self.is_mixture:
            raise InputError("saturation temperature is defined for pure fluids only")
        return self.saturation_states(P)[0].T

    def saturation_pressure(self, T: float) -> float:
        """Saturation (vapour) pressure [Pa] at temperature T [K] (pure fluids)."""
        if self.is_mixture:
            raise InputError("saturation pressure is defined for pure fluids only")
        return self._flash(CP.QT_INPUTS, 0.0, T, f"saturation at T={T:.6g} K").P

    def dew_temperature(self, P: float) -> float | None:
        """Dew-point temperature [K] of a mixture at P [Pa], ``None`` if it cannot be found
        (above the cricondenbar, or the phase-envelope solver did not converge).

        The property library's dew-point solver can return the trivial solution above the
        cricondenbar (an "incipient liquid" with the density of the gas, e.g. 1394 K for a
        lean natural gas at 200 bar); such solutions, and any above the highest critical
        temperature of the components (no dew point lies there for the mixtures of this
        region), are not dew points and give ``None``.
        """
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
        except Exception:
            value = None
        finally:
            a.specify_phase(CoolProp.iphase_gas)
        self._dew_cache[key] = value
        return value

    #: Distinct dew-point flashes after which a fluid builds its dew-line table (a batch).
    DEW_TABLE_AFTER = 24

    def _dew_bounds(self, P: float):
        """Bounds (low, high) [K] on the dew temperature at P [Pa] from the dew-line table, or
        ``None`` where the table cannot vouch for it (then the exact dew point is needed).

        The dew-point flash costs milliseconds; a batch of rows at ever different pressures
        would do one per state.  After :data:`DEW_TABLE_AFTER` distinct flashes the fluid
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
        grid = np.linspace(math.log(1e4), math.log(2e7), 81)
        values = np.array([_none_nan(self.dew_temperature(math.exp(x))) for x in grid])
        middles = 0.5 * (grid[1:] + grid[:-1])
        exact = np.array([_none_nan(self.dew_temperature(math.exp(x))) for x in middles])
        error = np.abs(exact - 0.5 * (values[1:] + values[:-1]))  # NaN where not found
        return grid, values, 0.5 + 20.0 * error

    # ------------------------------------------------------------------ array flashes
    def states_PT(self, P, T) -> StateArray:
        """States from arrays of pressure [Pa] and temperature [K].

        Same checks as :meth:`state_PT`; entries it would refuse are not valid.  IF97 water
        and mixtures with a batch's property table take the fast path
        (:mod:`workbench.properties.fast`); the other entries are flashed exactly.
        """
        P, T = _pair_arrays(P, T)
        return _fast_states(self, "PT", P, T, self._exact_states_PT)

    def _exact_states_PT(self, P, T) -> StateArray:
        """Exact array flash from P [Pa] and T [K]: pure fluids by the property library's
        array interface, mixtures entry by entry."""
        if self.is_mixture:
            return self._states_by_entry(self.state_PT, P, T)
        valid = self._pressure_ok(P) & np.isfinite(T) & self._temperature_ok(T)
        idx = np.flatnonzero(valid)
        near = (P[idx] > self.P_triple) & (P[idx] < self.P_critical)
        if near.any():
            # P and T do not fix a state at the saturation temperature (as state_PT).
            t_sat = self._props("T", "P", P[idx[near]], "Q", 0.0)
            ambiguous = np.abs(T[idx[near]] - t_sat) < 1e-6 * t_sat
            valid[idx[near][ambiguous]] = False
        return self._read_arrays(P, "P", P, "T", T, valid)

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
        P, target = _pair_arrays(P, target)
        return _fast_states(self, "P" + prop, P, target,
                            lambda p, t: self._exact_states_from(p, t, prop))

    def _exact_states_from(self, P, target, prop: str) -> StateArray:
        if self.is_mixture:
            method = self.state_Ph if prop == "h" else self.state_Ps
            return self._states_by_entry(method, P, target)
        valid = self._pressure_ok(P) & np.isfinite(target)
        if self.backend == "IF97":
            return self._if97_exact_arrays(P, target, prop, valid)
        # Helmholtz-energy models: one P-h or P-s flash per entry on the fluid's own state
        # object (each array-interface output would repeat the iterative flash).
        if prop == "h":
            found = self._states_by_entry(lambda p, h: self._flash(
                CP.HmassP_INPUTS, h, p, f"P={p:.6g} Pa, h={h:.6g} J/kg"), P, target, valid)
        else:
            found = self._states_by_entry(lambda p, s: self._flash(
                CP.PSmass_INPUTS, p, s, f"P={p:.6g} Pa, s={s:.6g} J/(kg K)"), P, target, valid)
        keep = found.valid & self._temperature_ok(found.T)
        return _masked(found, keep)

    def _if97_exact_arrays(self, P, target, prop, valid) -> StateArray:
        """Array form of :meth:`_if97_exact`: lever rule inside the dome, Newton on the forward
        equations outside it (safeguarded by a bracket, started from the saturation line)."""
        n = len(P)
        key = "H" if prop == "h" else "S"
        out = {name: np.full(n, np.nan) for name in ("T", "h", "s", "rho", "x", "cp")}
        phase = np.full(n, "", dtype=object)
        lower = np.full(n, self.T_min)
        upper = np.full(n, self.T_max)
        T = np.full(n, np.nan)
        idx = np.flatnonzero(valid & (P < self.P_critical))
        if len(idx):
            t_sat, liq, vap = self._saturation_arrays(P[idx])
            lo = liq["h" if prop == "h" else "s"]
            hi = vap["h" if prop == "h" else "s"]
            value = target[idx]
            two = (lo <= value) & (value <= hi)
            x = (value[two] - lo[two]) / (hi[two] - lo[two])
            v = (1 - x) / liq["rho"][two] + x / vap["rho"][two]
            rows = idx[two]
            out["T"][rows] = t_sat[two]
            out["h"][rows] = liq["h"][two] + x * (vap["h"][two] - liq["h"][two])
            out["s"][rows] = liq["s"][two] + x * (vap["s"][two] - liq["s"][two])
            out["rho"][rows] = 1.0 / v
            out["x"][rows] = x
            phase[rows] = "two-phase"
            # Single-phase entries: start on the saturation line with a typical heat capacity
            # (vapour 2.1, liquid 4.2 kJ/(kg K)) and keep the root bracketed by it.
            gas, liquid = value > hi, value < lo
            for side, edge, c_p, bound in ((gas, vap, 2100.0, lower), (liquid, liq, 4200.0, upper)):
                rows = idx[side]
                bound[rows] = t_sat[side]
                excess = value[side] - edge["h" if prop == "h" else "s"][side]
                if prop == "h":
                    T[rows] = t_sat[side] + excess / c_p
                else:
                    T[rows] = t_sat[side] * np.exp(excess / c_p)
        high = np.flatnonzero(valid & (P >= self.P_critical))
        if len(high):
            T[high] = self._props("T", "P", P[high], key, target[high])  # backward equations
        active = np.flatnonzero(valid & (phase != "two-phase"))
        T[active] = np.clip(T[active], lower[active] * (1 + 1e-9), upper[active])
        done = np.zeros(n, dtype=bool)
        slopes = np.full(n, np.nan)  # dh/dT = cp or ds/dT = cp/T at the last iterate
        fresh = np.ones(n, dtype=bool)  # the slope is evaluated again after a large step
        last_step = np.full(n, np.inf)
        for _ in range(60):
            if not len(active):
                break
            Ta = T[active]
            value = self._props(key, "P", P[active], "T", Ta)
            again = active[fresh[active]]
            if len(again):
                cp = self._props("C", "P", P[again], "T", T[again])
                slopes[again] = cp if prop == "h" else cp / T[again]
            f = value - target[active]
            slope = slopes[active]
            bad = ~(np.isfinite(f) & np.isfinite(slope) & (slope > 0))
            if bad.any():  # left to the single-state method
                valid[active[bad]] = False
                keep = ~bad
                active, Ta, f, slope = active[keep], Ta[keep], f[keep], slope[keep]
            above = f > 0
            upper[active[above]] = np.minimum(upper[active[above]], Ta[above])
            lower[active[~above]] = np.maximum(lower[active[~above]], Ta[~above])
            step = -f / slope
            T_new = Ta + step
            converged = np.abs(step) < 1e-10 * T_new
            outside = ~converged & ~((T_new > lower[active]) & (T_new < upper[active]))
            T_new[outside] = 0.5 * (lower[active][outside] + upper[active][outside])
            T[active] = T_new
            # Near the root the heat capacity hardly changes: keep the slope (chord steps)
            # once the step is below 1e-4 of the temperature and the steps shrink fast.
            fresh[active] = (np.abs(step) > 1e-4 * Ta) | (np.abs(step) > 1e-3 * last_step[active])
            last_step[active] = np.abs(step)
            done[active[converged]] = True
            active = active[~converged]
        valid[active] = False  # not converged: the single-state method decides
        single = np.flatnonzero(valid & done)
        if len(single):
            found = self._read_arrays(P[single], "P", P[single], "T", T[single],
                                      np.ones(len(single), dtype=bool))
            for name in ("T", "h", "s", "rho", "cp"):
                out[name][single] = getattr(found, name)
            phase[single] = found.phase
            valid[single] = found.valid
        valid &= np.isfinite(out["T"]) & self._temperature_ok(out["T"])
        return _masked(StateArray(self, P, out["T"], out["h"], out["s"], out["rho"], out["x"],
                                  out["cp"], phase, valid), valid)

    def _saturation_arrays(self, P):
        """Saturation temperature [K] and saturated liquid and vapour h, s, rho at P [Pa].

        The last pressure array is remembered: a batch asks for the isentropic and the actual
        outlet state at the same outlet pressures.
        """
        key = P.tobytes()
        cached = self.__dict__.get("_sat_arrays")
        if cached is not None and cached[0] == key:
            return cached[1]
        t_sat = self._props("T", "P", P, "Q", 0.0)
        liq = {k: self._props(name, "P", P, "Q", 0.0) for k, name in
               (("h", "H"), ("s", "S"), ("rho", "D"))}
        vap = {k: self._props(name, "P", P, "Q", 1.0) for k, name in
               (("h", "H"), ("s", "S"), ("rho", "D"))}
        self._sat_arrays = (key, (t_sat, liq, vap))
        return t_sat, liq, vap

    def _read_arrays(self, P, name1, value1, name2, value2, valid) -> StateArray:
        """Read T, h, s, rho, phase (and cp, quality) at the valid entries."""
        n = len(P)
        idx = np.flatnonzero(valid)
        out = {name: np.full(n, np.nan) for name in ("T", "h", "s", "rho", "x", "cp")}
        phase = np.full(n, "", dtype=object)
        if len(idx):
            a, b = value1[idx], value2[idx]
            for name, key in (("T", "T"), ("h", "H"), ("s", "S"), ("rho", "D"), ("cp", "C")):
                if name == "T" and name2 == "T":
                    out["T"][idx] = b  # the flash keeps the given temperature
                    continue
                out[name][idx] = self._props(key, name1, a, name2, b)
            codes = self._props("Phase", name1, a, name2, b)
            known = np.isfinite(codes) & (codes >= 0) & (codes < len(_PHASE_TABLE))
            words = np.full(len(idx), "", dtype=object)
            words[known] = _PHASE_TABLE[codes[known].astype(int)]
            phase[idx] = words
            two = words == "two-phase"
            if two.any():
                q = self._props("Q", name1, a[two], name2, b[two])
                rows = idx[two]
                inside = (q >= 0) & (q <= 1)
                out["x"][rows[inside]] = q[inside]
                out["cp"][rows] = np.nan
        with np.errstate(invalid="ignore"):
            ok = np.isfinite(out["T"] + out["h"] + out["s"] + out["rho"]) & (out["rho"] > 0)
        valid = valid & ok & (phase != "")
        return _masked(StateArray(self, P, out["T"], out["h"], out["s"], out["rho"], out["x"],
                                  out["cp"], phase, valid), valid)

    def _props(self, output: str, name1: str, value1, name2: str, value2) -> np.ndarray:
        """One output of the property library's array interface (inf/errors become NaN)."""
        value1 = np.asarray(value1, dtype=float)
        count = value1.size
        if count == 0:
            return np.empty(0)
        self.flash_count += count
        if np.ndim(value2) == 0:
            value2 = np.full(count, float(value2))
        try:
            with _ARRAY_LOCK:  # the array interface shares the library's own state objects
                result = np.asarray(CP.PropsSI(output, name1, value1, name2, value2,
                                               self._array_name), dtype=float)
        except Exception:  # the library refuses the whole call: fall back entry by entry
            result = np.empty(count)
            for i in range(count):
                try:
                    result[i] = CP.PropsSI(output, name1, value1[i], name2, value2[i],
                                           self._array_name)
                except Exception:
                    result[i] = np.nan
        result = result.reshape(count)
        result[~np.isfinite(result)] = np.nan
        return result

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
            for name in ("P", "T", "h", "s", "rho", "cp"):
                cols[name][i] = getattr(st, name)
            cols["x"][i] = np.nan if st.x is None else st.x
            phase[i], valid[i] = st.phase, True
        return StateArray(self, cols["P"], cols["T"], cols["h"], cols["s"], cols["rho"],
                          cols["x"], cols["cp"], phase, valid)

    def _pressure_ok(self, P) -> np.ndarray:
        return np.isfinite(P) & (P > 0) & (P <= self.P_max)

    def _temperature_ok(self, T) -> np.ndarray:
        with np.errstate(invalid="ignore"):
            return (T > 0) & (T >= self.T_min * (1 - 1e-9)) & (T <= self.T_max * (1 + 1e-9))

    # ------------------------------------------------------------------ internals
    def _check_pressure(self, P: float) -> float:
        if not (isinstance(P, float) or isinstance(P, int)) or not math.isfinite(P):
            raise InputError(f"pressure must be a finite number, not {P!r}")
        if P <= 0:
            raise InputError(f"pressure {P:g} Pa is not positive: give an absolute pressure")
        if P > self.P_max:
            raise PropertyError(
                f"pressure {P / 1e5:.6g} bar is above the property model's limit "
                f"{self.P_max / 1e5:.6g} bar for {self.name}")
        return P

    def _check_temperature(self, T: float, derived: bool = False) -> float:
        if not math.isfinite(T):
            raise InputError(f"temperature must be a finite number, not {T!r}")
        if T <= 0:
            raise InputError(f"temperature {T:g} K is not positive: give an absolute temperature")
        lo, hi = self.T_min, self.T_max
        if T < lo * (1 - 1e-9) or T > hi * (1 + 1e-9):
            what = "the resulting temperature" if derived else "temperature"
            raise PropertyError(
                f"{what} {T:.6g} K ({T - 273.15:.2f} degC) is outside the property model's range "
                f"{lo:.6g} K to {hi:.6g} K for {self.name}")
        return T

    def _check_above_dew(self, P: float, T: float) -> None:
        bounds = self._dew_bounds(P)
        if bounds is not None and T > bounds[1]:
            return  # clear of the dew line by more than the table's margin
        t_dew = self.dew_temperature(P)
        if t_dew is not None and T <= t_dew:
            raise PropertyError(
                f"temperature {T:.6g} K is at or below the dew point {t_dew:.6g} K of {self.name} "
                f"at {P / 1e5:.6g} bar: mixtures are supported in the single-phase gas region only")

    def _flash(self, pair, a, b, described: str) -> State:
        st = self._as
        self.flash_count += 1
        try:
            st.update(pair, a, b)
            return self._read(st)
        except PropertyError:
            raise
        except Exception as exc:  # the property library raises several kinds of errors
            raise PropertyError(
                f"the property model could not find a state of {self.name} at {described}; "
                "the state is probably outside the model's range"
            ) from exc

    def _read(self, st) -> State:
        P, T, h, s, rho = st.p(), st.T(), st.hmass(), st.smass(), st.rhomass()
        if self.is_mixture:
            phase_word, x = "gas", None
        else:
            phase_word = _PHASE_WORDS.get(st.phase(), "")
            q = st.Q()
            x = q if (phase_word == "two-phase" and 0.0 <= q <= 1.0) else None
        cp = float("nan")
        if x is None:
            try:
                cp = st.cpmass()
            except Exception:
                pass
        if not (math.isfinite(P + T + h + s + rho) and rho > 0):
            raise PropertyError(f"the property model returned an invalid state of {self.name}")
        return State(self, P, T, h, s, rho, x, cp, phase_word)

    def viscosity(self, state: State) -> float:
        """Dynamic viscosity [Pa s] at a single-phase state.

        Raises PropertyError for two-phase states and where the property library has no
        viscosity model for the fluid (many mixtures).
        """
        if state.x is not None:
            raise PropertyError(f"viscosity of {self.name} is not defined inside the two-phase "
                                f"region (quality {state.x:.4g})")
        self._flash(CP.PT_INPUTS, state.P, state.T, f"P={state.P:.6g} Pa, T={state.T:.6g} K")
        try:
            value = self._as.viscosity()
        except Exception:
            value = float("nan")
        if not (math.isfinite(value) and value > 0):
            raise PropertyError(f"the property library has no viscosity model for {self.name}")
        return value

    def speed_of_sound(self, state: State) -> float:
        """Speed of sound [m/s] at a single-phase state (NaN inside the two-phase region)."""
        if state.x is not None:
            return float("nan")
        self._flash(CP.PT_INPUTS, state.P, state.T, f"P={state.P:.6g} Pa, T={state.T:.6g} K")
        try:
            return self._as.speed_sound()
        except Exception:
            return float("nan")

    def _if97_exact(self, P: float, target: float, prop: str, pair, values) -> State:
        """Make an IF97 P-h or P-s state consistent with the forward equations.

        The IF97 backward equations T(P, h) and T(P, s) agree with the forward equations only to
        the release's consistency limits (IAPWS R7-97, about 25 mK), which moves a pump's
        enthalpy rise by tenths of a percent.  Here the two-phase region is resolved with the
        saturation states and the lever rule, and single-phase states by Newton iteration on
        temperature with the forward equations, starting from the backward-equation estimate.
        """
        pick = (lambda st: st.h) if prop == "h" else (lambda st: st.s)
        if P < self.P_critical:
            liq, vap = self.saturation_states(P)
            lo, hi = pick(liq), pick(vap)
            if lo <= target <= hi:
                x = (target - lo) / (hi - lo)
                v = (1 - x) / liq.rho + x / vap.rho
                return State(self, P, liq.T, liq.h + x * (vap.h - liq.h),
                             liq.s + x * (vap.s - liq.s), 1.0 / v, x, float("nan"), "two-phase")
        st = approx = self._flash(pair, *values, f"P={P:.6g} Pa, {prop}={target:.6g}")
        T = st.T
        for _ in range(20):
            st = self._flash(CP.PT_INPUTS, P, T, f"P={P:.6g} Pa, T={T:.6g} K")
            slope = st.cp if prop == "h" else st.cp / st.T
            if not math.isfinite(slope) or slope <= 0:
                return approx
            step = (target - pick(st)) / slope
            T += step
            if abs(step) < 1e-10 * T:
                return self._flash(CP.PT_INPUTS, P, T, f"P={P:.6g} Pa, T={T:.6g} K")
        return st

    def _solve_T(self, P: float, target: float, prop: str, T_guess: float | None,
                 exact_dew: bool = False) -> State:
        """Mixtures: find T with h(P, T) or s(P, T) equal to target (safeguarded Newton).

        The bracket starts at the dew point; in a batch the dew-line table's low bound serves,
        and a root not clear of its high bound is solved again with the exact dew point.
        """
        lo = self.T_min
        bounds = None if exact_dew else self._dew_bounds(P)
        if bounds is not None:
            try:
                st = self._solve_T_from(P, target, prop, T_guess, max(lo, bounds[0]))
            except PropertyError:
                st = None
            if st is not None and st.T > bounds[1]:
                return st
            return self._solve_T(P, target, prop, T_guess, exact_dew=True)
        t_dew = self.dew_temperature(P)
        return self._solve_T_from(P, target, prop, T_guess,
                                  lo if t_dew is None else max(lo, t_dew))

    def _solve_T_from(self, P: float, target: float, prop: str, T_guess: float | None,
                      lo: float) -> State:
        """Safeguarded Newton on T in [lo, T_max] for h(P, T) or s(P, T) equal to target."""
        hi = self.T_max
        value = (lambda st: st.h) if prop == "h" else (lambda st: st.s)
        slope = (lambda st: st.cp) if prop == "h" else (lambda st: st.cp / st.T)
        T = T_guess if (T_guess is not None and lo < T_guess < hi) else min(max(300.0, lo * 1.05), hi)
        a_lo, a_hi = lo, hi
        label = "specific enthalpy" if prop == "h" else "specific entropy"
        for _ in range(60):
            st = self._flash(CP.PT_INPUTS, P, T, f"P={P:.6g} Pa, T={T:.6g} K")
            f = value(st) - target
            if f > 0:
                a_hi = T
            else:
                a_lo = T
            step = -f / slope(st)
            T_new = T + step
            if not (a_lo < T_new < a_hi):
                T_new = 0.5 * (a_lo + a_hi)
            if abs(T_new - T) < 1e-8 * T:
                return self._flash(CP.PT_INPUTS, P, T_new, f"P={P:.6g} Pa, T={T_new:.6g} K")
            if a_hi - a_lo < 1e-9 * T:
                break
            T = T_new
        if a_lo <= lo * (1 + 1e-9):
            raise PropertyError(
                f"{label} {target:.6g} at {P / 1e5:.6g} bar lies at or below the dew point of "
                f"{self.name} (or below the model's temperature range): mixtures are supported in "
                "the single-phase gas region only")
        if a_hi >= hi * (1 - 1e-9):
            raise PropertyError(
                f"{label} {target:.6g} at {P / 1e5:.6g} bar lies above the property model's "
                f"temperature limit {hi:.6g} K for {self.name}")
        raise PropertyError(f"the {label} flash of {self.name} at {P / 1e5:.6g} bar did not converge")


# ---- fast array flashes (workbench/properties/fast.py): the hook of states_PT/Ph/Ps ----
def _fast_states(fluid, pair, P, value, exact) -> StateArray:
    """The fast path for IF97 water and for mixtures with a batch's table; exact otherwise."""
    if fluid.backend != "IF97" and not fluid.is_mixture:
        return exact(P, value)
    from .properties import fast

    def make(P, T, h, s, rho, x, cp, phase, valid, tabulated):
        # entries not valid are NaN and "" already (fast path and exact flashes)
        return StateArray(fluid, P, T, h, s, rho, x, cp, phase, valid,
                          tabulated & valid if tabulated.any() else None)

    return fast.states(fluid, pair, P, value, exact, make)


def _none_nan(value):
    return float("nan") if value is None else value


def _masked(states: StateArray, keep) -> StateArray:
    """The same states with the entries outside ``keep`` made not valid (NaN)."""
    keep = states.valid & keep

    def cut(values):
        values = values.copy()
        values[~keep] = np.nan
        return values

    phase = states.phase.copy()
    phase[~keep] = ""
    tabulated = None if states.tabulated is None else states.tabulated & keep
    return StateArray(states.fluid, cut(states.P), cut(states.T), cut(states.h), cut(states.s),
                      cut(states.rho), cut(states.x), cut(states.cp), phase, keep, tabulated)


def _pair_arrays(a, b):
    """Two equal-length 1-D float arrays (a scalar is repeated)."""
    a = np.atleast_1d(np.asarray(a, dtype=float))
    b = np.atleast_1d(np.asarray(b, dtype=float))
    if a.ndim != 1 or b.ndim != 1:
        raise InputError("state arrays take one-dimensional arrays of numbers")
    if len(a) != len(b):
        if len(a) == 1:
            a = np.full(len(b), a[0])
        elif len(b) == 1:
            b = np.full(len(a), b[0])
        else:
            raise InputError(f"state arrays need equal lengths, not {len(a)} and {len(b)}")
    return a, b


_REBUILT: dict = {}


def _rebuild_fluid(spec, backend):
    """Unpickle a fluid: one object per process and specification, so a worker that receives
    the fluid with every partition keeps its caches (saturation states, dew-line table)."""
    key = (repr(spec), backend)
    fluid = _REBUILT.get(key)
    if fluid is None:
        if len(_REBUILT) > 32:
            _REBUILT.clear()
        fluid = _REBUILT[key] = Fluid(spec, backend=backend)
    return fluid
