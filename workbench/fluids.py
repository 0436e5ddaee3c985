"""Real-fluid states over CoolProp's low-level ``AbstractState``.

Every property flash of the workbench happens in this module.  A :class:`Fluid` holds one
CoolProp ``AbstractState`` (created once, reused for every flash) and produces immutable
:class:`State` objects in SI units.

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
from dataclasses import dataclass, field

import CoolProp
import CoolProp.CoolProp as CP

from .errors import InputError, PropertyError
from .units import to_si

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
        try:
            self._as = CP.AbstractState(backend, "&".join(names))
            if self.is_mixture:
                self._as.set_mole_fractions(list(fractions))
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
            self._as.specify_phase(CoolProp.iphase_gas)
            self.T_critical = self.P_critical = float("nan")
            self._dew_cache: dict = {}
        else:
            self.T_critical = self._as.T_critical()
            self.P_critical = self._as.p_critical()
            self.P_triple = CP.PropsSI("ptriple", names[0]) if backend == "HEOS" else 611.657
            self._sat_cache: dict = {}
        self.name = self._display_name()
        #: Number of property flashes done by this fluid object (for benchmarks).
        self.flash_count = 0

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
        pressure; pressures the model cannot resolve are left out.  Mixtures give an empty
        list.  Cached per fluid object.
        """
        if self.is_mixture:
            return []
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
        (above the cricondenbar, or the phase-envelope solver did not converge)."""
        key = round(math.log(P), 9)
        if key in self._dew_cache:
            return self._dew_cache[key]
        a = self._as
        value = None
        try:
            a.unspecify_phase()
            a.update(CP.PQ_INPUTS, P, 1.0)
            value = a.T()
            if not math.isfinite(value) or value <= 0:
                value = None
        except Exception:
            value = None
        finally:
            a.specify_phase(CoolProp.iphase_gas)
        self._dew_cache[key] = value
        return value

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

    def _solve_T(self, P: float, target: float, prop: str, T_guess: float | None) -> State:
        """Mixtures: find T with h(P, T) or s(P, T) equal to target (safeguarded Newton)."""
        lo = self.T_min
        t_dew = self.dew_temperature(P)
        if t_dew is not None:
            lo = max(lo, t_dew)
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


def _rebuild_fluid(spec, backend):
    return Fluid(spec, backend=backend)
