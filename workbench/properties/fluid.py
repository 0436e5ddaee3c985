"""The fluid: identity, property-library state objects, single-state flashes and range checks.

A :class:`Fluid` holds one CoolProp ``AbstractState`` per thread (created once, reused for every
flash) and produces immutable :class:`~workbench.properties.State` objects in SI units.  Its
saturation and dew-line methods live in :mod:`.saturation`, its array flashes in
:mod:`.arrays`, transport properties in :mod:`.transport`; the temperature solver in
:mod:`.solver`.

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

import CoolProp
import CoolProp.CoolProp as CP

from ..errors import InputError, PropertyError
from ..units import choice, to_si
from . import solver
from .arrays import ArrayFlashes
from .composition import parse_spec
from .saturation import Saturation
from .state import PHASE_WORDS, State
from .transport import Transport

#: Universal gas constant [J/(mol K)] (CODATA 2018, exact).
R_UNIVERSAL = 8.314462618

#: Property models a fluid can use.
BACKENDS = ("HEOS", "IF97")

_PAIRS = ({"P", "T"}, {"P", "h"}, {"P", "s"}, {"P", "x"}, {"T", "x"})


class Fluid(Saturation, ArrayFlashes, Transport):
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
        Specifications that are neither a name nor a composition, unknown fluid names,
        fractions that are not numbers in [0, 1] or do not sum to 1, an empty composition or
        one of too many components, IF97 for a fluid other than water, unknown options.

    Notes
    -----
    Supported regions: pure and pseudo-pure fluids over the whole range of their Helmholtz-
    energy equation of state, including the two-phase region; water on IAPWS-IF97 (273.15 K
    to 1073.15 K, up to 100 MPa); mixtures in the single-phase gas and dense (supercritical)
    region only (a state at or below the mixture's dew point is refused).

    Examples
    --------
    >>> steam = Fluid("Water", backend="IF97")
    >>> round(steam.state(P=1e5, T=400.0).h)
    2730398
    """

    #: Distinct dew-point flashes after which a fluid builds its dew-line table (a batch).
    DEW_TABLE_AFTER = 24

    def __init__(self, spec, *, basis: str = "mole", backend: str = "HEOS"):
        backend = choice(backend, BACKENDS, "backend")
        if isinstance(spec, Fluid):
            spec = spec.spec
        names, fractions = parse_spec(spec, basis)
        self.components: tuple[str, ...] = names
        self.fractions: tuple[float, ...] = fractions
        self.is_mixture = len(names) > 1
        if backend == "IF97" and (self.is_mixture or names[0] != "Water"):
            raise InputError("the IF97 backend is for water only")
        self.backend = backend
        # One property-library state object per thread: a state object holds the last flash,
        # so two threads (a threaded dask scheduler, a web server) must not share one.
        self._local = threading.local()
        try:
            self._local.state = self._new_state()
        except Exception:  # noqa: BLE001 - the library raises ValueError or RuntimeError
            raise InputError(
                f"the property library has no mixture model for {' + '.join(names)}"
            ) from None
        self._set_limits()
        self.name = self._display_name()
        self._array_name = f"{backend}::{names[0]}"  # array interface (pure fluids)
        #: Number of property flashes done by this fluid object (for benchmarks); an array
        #: call counts one per entry and output.
        self.flash_count = 0

    def _set_limits(self) -> None:
        st, names = self._as, self.components
        self.molar_mass = st.molar_mass()  # kg/mol
        self.gas_constant = R_UNIVERSAL / self.molar_mass  # J/(kg K)
        self.T_min = st.Tmin()
        self.T_max = st.Tmax()
        self.P_max = st.pmax()
        if self.is_mixture:
            # Each component's model must be valid too.
            self.T_min = max(self.T_min, max(CP.PropsSI("Tmin", n) for n in names))
            self._highest_critical = max(CP.PropsSI("Tcrit", n) for n in names)
            self.T_critical = self.P_critical = float("nan")
            self._dew_cache: dict = {}
        else:
            self.T_critical = st.T_critical()
            self.P_critical = st.p_critical()
            self.P_triple = (CP.PropsSI("ptriple", names[0]) if self.backend == "HEOS"
                             else 611.657)
            self._sat_cache: dict = {}

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

        Raises
        ------
        InputError
            A wrong pair, or an entry that is not a finite number in range (named).
        PropertyError
            No state of the model there (outside its range, below a mixture's dew point).

        Examples
        --------
        >>> round(Fluid("Water").state(P=1e5, x=1.0).T, 3)
        372.756
        """
        given = {k for k, v in dict(P=P, T=T, h=h, s=s, x=x).items() if v is not None}
        if given not in _PAIRS:
            raise InputError(
                f"a state needs exactly one of the pairs (P, T), (P, h), (P, s), (P, x), (T, x); "
                f"got {', '.join(sorted(given)) or 'nothing'}")
        if P is not None:
            P = self.check_pressure(to_si(P, "pressure", "pressure"))
        if T is not None:
            T = self.check_temperature(to_si(T, "temperature", "temperature"))
        if x is not None:
            x = to_si(x, "dimensionless", "quality", low=0.0, high=1.0)
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
            return self.flash(CP.PQ_INPUTS, P, x, f"P={P:.6g} Pa, x={x:g}")
        if T >= self.T_critical:
            raise InputError(
                f"temperature {T:.6g} K is at or above the critical temperature "
                f"{self.T_critical:.6g} K of {self.name}: quality has no meaning there")
        return self.flash(CP.QT_INPUTS, x, T, f"T={T:.6g} K, x={x:g}")

    # fast SI entry points used by the machines (inputs already floats)
    def state_PT(self, P: float, T: float) -> State:
        """State from pressure [Pa] and temperature [K] (SI floats)."""
        self.check_pressure(P)
        self.check_temperature(T)
        if self.is_mixture:
            self.check_above_dew(P, T)
            return self.flash_PT(P, T)
        if self.P_triple < P < self.P_critical:
            try:
                t_sat = self.saturation_temperature(P)
            except PropertyError:
                t_sat = None
            if t_sat is not None and abs(T - t_sat) < 1e-6 * t_sat:
                raise InputError(
                    f"temperature {T:.6g} K is the saturation temperature at {P / 1e5:.6g} bar: "
                    "the state is not fixed by P and T there; give the quality instead")
        return self.flash_PT(P, T)

    def state_Ph(self, P: float, h: float, T_guess: float | None = None) -> State:
        """State from pressure [Pa] and specific enthalpy [J/kg] (SI floats).

        ``T_guess`` [K] starts the temperature solver of a mixture (ignored otherwise).
        """
        return self._state_from(P, h, "h", T_guess)

    def state_Ps(self, P: float, s: float, T_guess: float | None = None) -> State:
        """State from pressure [Pa] and specific entropy [J/(kg K)] (SI floats).

        ``T_guess`` [K] starts the temperature solver of a mixture (ignored otherwise).
        """
        return self._state_from(P, s, "s", T_guess)

    def _state_from(self, P: float, target: float, prop: str, T_guess) -> State:
        self.check_pressure(P)
        if self.is_mixture:
            return self._mixture_state(P, target, prop, T_guess)
        if self.backend == "IF97":
            st = solver.if97_state(self, P, target, prop)
        elif prop == "h":
            st = self.flash(CP.HmassP_INPUTS, target, P, f"P={P:.6g} Pa, h={target:.6g} J/kg")
        else:
            st = self.flash(CP.PSmass_INPUTS, P, target, f"P={P:.6g} Pa, s={target:.6g} J/(kg K)")
        self.check_temperature(st.T, derived=True)
        return st

    def _mixture_state(self, P: float, target: float, prop: str, T_guess,
                       exact_dew: bool = False) -> State:
        """Mixtures: T with h(P, T) or s(P, T) equal to the target, above the dew point.

        The bracket starts at the dew point; in a batch the dew-line table's low bound serves,
        and a root not clear of its high bound is solved again with the exact dew point.
        """
        bounds = None if exact_dew else self.dew_bounds(P)
        if bounds is not None:
            try:
                st = self._solve_gas_T(P, target, prop, T_guess, max(self.T_min, bounds[0]))
            except PropertyError:
                st = None
            if st is not None and st.T > bounds[1]:
                return st
            return self._mixture_state(P, target, prop, T_guess, exact_dew=True)
        t_dew = self.dew_temperature(P)
        return self._solve_gas_T(P, target, prop, T_guess,
                                 self.T_min if t_dew is None else max(self.T_min, t_dew))

    def _solve_gas_T(self, P: float, target: float, prop: str, T_guess, lo: float) -> State:
        hi = self.T_max
        T0 = T_guess if (T_guess is not None and lo < T_guess < hi) else min(max(300.0, lo * 1.05),
                                                                            hi)
        label = "specific enthalpy" if prop == "h" else "specific entropy"
        try:
            return solver.temperature_root(self.flash_PT, P, target, prop, T0, lo, hi)
        except solver.NoRootInBracket as exc:
            if exc.side == "low":
                raise PropertyError(
                    f"{label} {target:.6g} at {P / 1e5:.6g} bar lies at or below the dew point "
                    f"of {self.name} (or below the model's temperature range): mixtures are "
                    "supported in the single-phase gas region only") from None
            raise PropertyError(
                f"{label} {target:.6g} at {P / 1e5:.6g} bar lies above the property model's "
                f"temperature limit {hi:.6g} K for {self.name}") from None

    def state_hs(self, h: float, s: float, P_guess: float) -> State:
        """State from specific enthalpy [J/kg] and entropy [J/(kg K)], e.g. a stagnation state.

        Solved by Newton's method on pressure along the isentrope (dh = v dP), because
        enthalpy-entropy flashes are not available for every fluid and backend; each step is
        kept within a factor of 5 of the last pressure.
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
        st = self.flash_PT(P, T)
        try:
            slope = self._as.first_partial_deriv(CP.iHmass, CP.iP, CP.iT)
        except (ValueError, RuntimeError) as exc:
            raise PropertyError(f"the property model gave no derivative for {self.name} at "
                                f"P={P:.6g} Pa, T={T:.6g} K") from exc
        return st, slope

    # ------------------------------------------------------------------ range checks
    def check_pressure(self, P, name: str = "pressure") -> float:
        """A pressure [Pa] within the property model's range, or a refusal naming the input.

        Parameters
        ----------
        P : float
            Absolute pressure [Pa] (an SI number; convert Quantities with ``units.to_si``).
        name : str
            Name of the input in the message (e.g. ``"outlet pressure"``).

        Returns
        -------
        float
            ``P`` as a float.

        Raises
        ------
        InputError
            Not a finite number, or not positive.
        PropertyError
            Above the model's pressure limit :attr:`P_max`.

        Examples
        --------
        >>> Fluid("Air").check_pressure(2e5, "outlet pressure")
        200000.0
        """
        if type(P) is not float:  # ints of any size, numpy scalars, Decimal: the boundary
            P = to_si(P, "pressure", name)
        if not math.isfinite(P):
            raise InputError(f"{name} must be a finite number, not {P!r}")
        if P <= 0:
            raise InputError(f"{name} {P:g} Pa is not positive: give an absolute pressure")
        if P > self.P_max:
            raise PropertyError(
                f"{name} {P / 1e5:.6g} bar is above the property model's limit "
                f"{self.P_max / 1e5:.6g} bar for {self.name}")
        return P

    def check_temperature(self, T, name: str = "temperature", derived: bool = False) -> float:
        """A temperature [K] within the property model's range, or a refusal naming it.

        ``derived`` says the temperature came out of a flash (the message then speaks of
        "the resulting temperature").

        Raises
        ------
        InputError
            Not a finite number, or not positive.
        PropertyError
            Outside [:attr:`T_min`, :attr:`T_max`].

        Examples
        --------
        >>> Fluid("Air").check_temperature(300.0)
        300.0
        """
        if type(T) is not float:
            T = to_si(T, "temperature", name)
        if not math.isfinite(T):
            raise InputError(f"{name} must be a finite number, not {T!r}")
        if T <= 0:
            raise InputError(f"{name} {T:g} K is not positive: give an absolute temperature")
        lo, hi = self.T_min, self.T_max
        if T < lo * (1 - 1e-9) or T > hi * (1 + 1e-9):
            what = f"the resulting {name}" if derived else name
            raise PropertyError(
                f"{what} {T:.6g} K ({T - 273.15:.2f} degC) is outside the property model's range "
                f"{lo:.6g} K to {hi:.6g} K for {self.name}")
        return T

    # ------------------------------------------------------------------ flashes
    def flash(self, pair: int, a: float, b: float, described: str) -> State:
        """One flash of this thread's property-library state object (no range checks).

        Parameters
        ----------
        pair : int
            The property library's input pair (``CoolProp.CoolProp.PT_INPUTS``...).
        a, b : float
            The two inputs in the pair's order, SI.
        described : str
            The inputs in words for the message if the flash fails.

        Raises
        ------
        PropertyError
            The library found no state (its own message is not shown).
        """
        st = self._as
        self.flash_count += 1
        try:
            st.update(pair, a, b)
            return self._read(st)
        except PropertyError:
            raise
        except Exception as exc:  # noqa: BLE001 - the library raises several kinds
            raise PropertyError(
                f"the property model could not find a state of {self.name} at {described}; "
                "the state is probably outside the model's range") from exc

    def flash_PT(self, P: float, T: float) -> State:
        """A pressure [Pa], temperature [K] flash without range checks (see :meth:`flash`)."""
        return self.flash(CP.PT_INPUTS, P, T, f"P={P:.6g} Pa, T={T:.6g} K")

    def _read(self, st) -> State:
        P, T, h, s, rho = st.p(), st.T(), st.hmass(), st.smass(), st.rhomass()
        x = math.nan
        if self.is_mixture:
            phase_word = "gas"
        else:
            phase_word = PHASE_WORDS.get(st.phase(), "")
            q = st.Q()
            if phase_word == "two-phase" and 0.0 <= q <= 1.0:
                x = q
        cp = math.nan
        if x != x:  # single-phase
            try:
                cp = st.cpmass()
            except Exception:  # noqa: BLE001 - no heat capacity where the library has none
                pass
        if not (math.isfinite(P + T + h + s + rho) and rho > 0):
            raise PropertyError(f"the property model returned an invalid state of {self.name}")
        return State(self, P, T, h, s, rho, x, cp, phase_word)


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
