"""Compressor test converted to specified conditions after ASME PTC 10-1997.

Dimensionless groups of one operating condition (test or specified), with the impeller tip
diameter D (radius r = D/2), rotational speed omega [rad/s], tip speed U = omega r, the
inlet volume flow q, the polytropic head W_p and the inlet state (ASME PTC 10-1997,
section 5 and nomenclature, recalled from memory)::

    flow coefficient            phi   = q / (omega r^3)     (= q / (2 pi N r^3), N in rev/s)
    polytropic work coefficient mu_p  = W_p / (z U^2)     (z impellers of the tip speed U)
    machine Mach number         Mm    = U / a_i             (a_i: speed of sound at the inlet)
    machine Reynolds number     Re_m  = U b / nu_i          (b: impeller exit width,
                                                             nu_i: inlet kinematic viscosity)
    specific volume ratio       r_v   = v_i / v_d

The polytropic head and efficiency of each condition come from its inlet and discharge states
by Schultz's method (the code's method; :func:`workbench.compressor`) or by direct
integration of the polytropic path.  The test is converted to the specified conditions at
equal flow coefficient (section 5 of the code)::

    q_sp = q_t (omega_sp / omega_t),   W_p,sp = W_p,t (omega_sp / omega_t)^2,
    eta_p,sp = eta_p,t,                gas power P_sp = rho_i,sp q_sp W_p,sp / eta_p,sp

Reynolds correction (optional, off by default): the centrifugal-compressor correction as
recalled from memory of PTC 10-1997 (not checked against the code's text; use it only when
the contract calls for it and verify it)::

    (1 - eta_sp) / (1 - eta_t) = (R_A,sp R_B,sp) / (R_A,t R_B,t)
    R_A = 0.066 + 0.934 (4.8e6 b / Re_m)^C,   C = 0.988 / Re_m^0.243      (b in ft)
    R_B = log10(0.000125 + 13.67 / Re_m) / log10(e + 13.67 / Re_m)       (e roughness in in)
    mu_p,sp = mu_p,t eta_sp / eta_t

Departure limits (defaults; each may be replaced through ``limits=``):

- specific volume ratio, test over specified: 0.95 .. 1.05 (Table 3.2, Type 1 and 2; from
  memory);
- flow coefficient ratio, test over specified: 0.96 .. 1.04 (Table 3.2; from memory);
- machine Mach number departure Mm_t - Mm_sp (centrifugal): a piecewise-linear
  approximation of the code's Figure 3.3 as recalled from memory, NOT read from the figure:
  +-0.25 up to Mm_sp = 0.214, narrowing to -0.09/+0.06 at Mm_sp = 0.86 and -0.05/+0.03 at
  Mm_sp = 1.2 (held beyond); verify against the figure before a contractual use;
- machine Reynolds number ratio Re_t / Re_sp (centrifugal): 0.1 .. 10, a simplification of
  the code's Figure 3.5 recalled from memory; verify likewise;
- Type 1 tests only (Table 3.1, from memory): inlet pressure +-5 %, inlet temperature +-8 %
  (absolute), speed +-2 %, molar mass +-2 %, inlet volume flow +-4 %.

The uncertainty of the converted head, efficiency and power follows from the test readings'
instrument uncertainties by ASME PTC 19.1 sensitivity propagation
(:func:`workbench.fieldtest.propagate_uncertainty` with this conversion as its model).

References
----------
ASME PTC 10-1997, Performance Test Code on Compressors and Exhausters (Tables 3.1, 3.2,
Figures 3.3-3.5, section 5; recalled from memory as stated above).
J. M. Schultz, "The polytropic analysis of centrifugal compressors", J. Eng. Power 84 (1962)
69-82.
ASME PTC 19.1-2013, Test Uncertainty.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field

import numpy as np
import pandas as pd
from scipy.optimize import brentq

from ..errors import InputError, ReadingsError, WorkbenchError
from ..fields import row
from ..fieldtest.uncertainty import (
    InstrumentUncertainty,
    UncertaintyReport,
    propagate_uncertainty,
)
from ..machines import compressor
from ..polytropic import polytropic_outlet
from ..properties import Fluid
from ..units import choice, count, flag, positive, to_si

#: Reading names whose instrument uncertainties can be propagated.
READINGS = ("inlet_pressure", "inlet_temperature", "discharge_pressure",
            "discharge_temperature", "volume_flow", "speed")
_READING_KINDS = dict(zip(READINGS, ("pressure", "temperature", "pressure", "temperature",
                                     "volume_flow", "rotational_speed")))
#: Machine Mach number departure limits, centrifugal, (Mm_sp, low, high): an approximation
#: of ASME PTC 10-1997 Figure 3.3 recalled from memory (see the module notes).
MACH_DEPARTURE_CENTRIFUGAL = ((0.0, -0.25, 0.25), (0.214, -0.25, 0.25), (0.86, -0.09, 0.06),
                              (1.2, -0.05, 0.03))
#: Default limits: name -> (measure, low, high); Mach limits come from the table above.
DEFAULT_LIMITS = {
    "specific_volume_ratio": ("ratio", 0.95, 1.05),
    "flow_coefficient": ("ratio", 0.96, 1.04),
    "machine_reynolds_number": ("ratio", 0.1, 10.0),
}
#: Type 1 test limits on conditions (Table 3.1, from memory): name -> relative departure.
TYPE1_LIMITS = {"inlet_pressure": 0.05, "inlet_temperature": 0.08, "speed": 0.02,
                "molar_mass": 0.02, "volume_flow": 0.04}
_SOURCES = {
    "specific_volume_ratio": "ASME PTC 10-1997 Table 3.2 (from memory)",
    "flow_coefficient": "ASME PTC 10-1997 Table 3.2 (from memory)",
    "machine_mach_number": "ASME PTC 10-1997 Fig. 3.3, approximated from memory",
    "machine_reynolds_number": "ASME PTC 10-1997 Fig. 3.5, simplified from memory",
}
_FT, _IN = 0.3048, 0.0254


@dataclass(frozen=True)
class CompressorCondition:
    """One operating condition of a compressor: gas, inlet and discharge, flow and speed.

    Attributes
    ----------
    gas : Fluid
        The gas (a test gas or the specified gas).
    inlet_pressure, discharge_pressure : float
        Static pressures [Pa] (Quantities converted), discharge above inlet.
    inlet_temperature, discharge_temperature : float
        Static temperatures [K].
    volume_flow : float
        Inlet volume flow [m^3/s], positive.
    speed : float
        Rotational speed [rad/s], positive.
    """

    gas: Fluid
    inlet_pressure: float
    inlet_temperature: float
    discharge_pressure: float
    discharge_temperature: float
    volume_flow: float
    speed: float

    def __post_init__(self):
        if not isinstance(self.gas, Fluid):
            raise InputError(f"gas must be a workbench Fluid, not {type(self.gas).__name__}")
        values = {name: positive(getattr(self, name), _READING_KINDS.get(name, "pressure"),
                                 name.replace("_", " ")) for name in READINGS}
        if not values["discharge_pressure"] > values["inlet_pressure"]:
            raise InputError(f"discharge pressure {values['discharge_pressure']:g} Pa must "
                             f"exceed the inlet pressure {values['inlet_pressure']:g} Pa")
        for key, value in values.items():
            object.__setattr__(self, key, value)

    @classmethod
    def from_dict(cls, data, gas: Fluid | None = None) -> CompressorCondition:
        """From a dict of SI values (``gas`` a fluid name or given separately)."""
        if not isinstance(data, dict):
            raise InputError(f"a compressor condition must be a dict, not "
                             f"{type(data).__name__}")
        unknown = sorted(str(k) for k in data if k not in (*READINGS, "gas"))
        if unknown:
            raise InputError(f"unknown compressor condition keys: {', '.join(unknown)[:200]}")
        missing = [k for k in READINGS if k not in data]
        if missing:
            raise InputError(f"the compressor condition lacks {', '.join(missing)}")
        if gas is None:
            spec = data.get("gas")
            if not isinstance(spec, (str, dict)):
                raise InputError("the compressor condition needs a gas (a name or a "
                                 "composition)")
            gas = Fluid(spec)
        return cls(gas, **{k: data[k] for k in READINGS})

    def readings(self) -> dict:
        """The six readings by name (SI floats)."""
        return {name: getattr(self, name) for name in READINGS}


def _condition(value, name) -> CompressorCondition:
    if isinstance(value, CompressorCondition):
        return value
    if isinstance(value, dict):
        return CompressorCondition.from_dict(value)
    raise InputError(f"{name} must be a CompressorCondition or a dict, not "
                     f"{type(value).__name__}")


@dataclass(frozen=True)
class SimilarityGroups:
    """Dimensionless groups and performance of one condition.  SI units.

    Attributes
    ----------
    volume_flow : float
        Inlet volume flow [m^3/s].
    mass_flow : float
        [kg/s].
    speed : float
        [rad/s].
    tip_speed : float
        U [m/s].
    flow_coefficient, work_coefficient, machine_mach_number, machine_reynolds_number,
    specific_volume_ratio : float
        The PTC 10 groups [-] (module notes).
    polytropic_head : float
        [J/kg] (method of the call).
    polytropic_efficiency : float
        [-].
    power : float
        Gas power m W_p / eta_p [W].
    outlet_pressure, outlet_temperature : float
        Discharge state [Pa], [K]: measured or specified, or for the converted test the
        discharge predicted at the specified inlet by direct integration of the polytropic
        path at the converted efficiency and head.
    """

    volume_flow: float
    mass_flow: float
    speed: float
    tip_speed: float
    flow_coefficient: float
    work_coefficient: float
    machine_mach_number: float
    machine_reynolds_number: float
    specific_volume_ratio: float
    polytropic_head: float
    polytropic_efficiency: float
    power: float
    outlet_pressure: float
    outlet_temperature: float

    FIELDS = ("volume_flow", "mass_flow", "speed", "tip_speed", "flow_coefficient",
              "work_coefficient", "machine_mach_number", "machine_reynolds_number",
              "specific_volume_ratio", "polytropic_head", "polytropic_efficiency", "power",
              "outlet_pressure", "outlet_temperature")

    def to_dict(self) -> dict:
        """Fields by name (SI; see :data:`workbench.fields.FIELDS`)."""
        return row(self, self.FIELDS)


@dataclass(frozen=True)
class SimilarityCheck:
    """One departure against its limit.

    Attributes
    ----------
    parameter : str
        Field name of the group or condition.
    measure : str
        "ratio" (test over specified) or "departure" (test minus specified, or relative
        departure for the Type 1 conditions).
    test, specified : float
        Values of the two conditions.
    value : float
        The ratio or departure.
    low, high : float
        Allowed range of ``value``.
    within : bool
        ``low <= value <= high``.
    source : str
        Where the limit comes from.
    """

    parameter: str
    measure: str
    test: float
    specified: float
    value: float
    low: float
    high: float
    within: bool
    source: str

    @property
    def verdict(self) -> str:
        """"within limits" or "outside limits"."""
        return "within limits" if self.within else "outside limits"


@dataclass(frozen=True, eq=False)
class CompressorSimilarityResult:
    """A compressor test converted to specified conditions after ASME PTC 10.  SI units.

    Attributes
    ----------
    test_type : str
        "1" or "2".
    method : str
        "schultz" or "integration" (polytropic head).
    test, specified : SimilarityGroups
        Groups and performance of the test and of the specified condition (the datasheet).
    converted : SimilarityGroups
        The test converted to the specified gas, inlet and speed at equal flow coefficient.
    checks : tuple of SimilarityCheck
        Departures against the limits, one per parameter.
    reynolds_correction : bool
        Whether the optional Reynolds correction was applied.
    uncertainty : UncertaintyReport or None
        PTC 19.1 propagation of the readings' uncertainties to the converted
        ``polytropic_head``, ``polytropic_efficiency`` and ``power`` (None when no
        uncertainties were given).
    cautions : tuple of str
    """

    test_type: str
    method: str
    test: SimilarityGroups
    specified: SimilarityGroups
    converted: SimilarityGroups
    checks: tuple
    reynolds_correction: bool
    uncertainty: UncertaintyReport | None
    cautions: tuple = field(default=())

    @property
    def within_limits(self) -> bool:
        """True when every departure is within its limit."""
        return all(c.within for c in self.checks)

    @property
    def verdict(self) -> str:
        """Overall verdict on the test conditions."""
        return ("test conditions within the code's limits" if self.within_limits else
                "test conditions outside the code's limits: "
                + ", ".join(c.parameter.replace("_", " ") for c in self.checks
                            if not c.within))

    def to_dict(self) -> dict:
        """Flat dict: groups of the three conditions, checks, verdict, U95 (SI values)."""
        out = {"test_type": self.test_type, "method": self.method, "verdict": self.verdict}
        for prefix, groups in (("test", self.test), ("specified", self.specified),
                               ("converted", self.converted)):
            out.update({f"{prefix}_{k}": v for k, v in groups.to_dict().items()})
        for c in self.checks:
            suffix = "test_over_specified" if c.measure == "ratio" else "departure"
            out[f"{c.parameter}_{suffix}"] = c.value
            out[f"{c.parameter}_verdict"] = c.verdict
        if self.uncertainty is not None:
            out.update({f"converted_{k}_U95": v for k, v in self.uncertainty.expanded.items()})
        out["cautions"] = "; ".join(self.cautions)
        return out


def _head_efficiency(condition, method):
    gas = condition.gas
    inlet = gas.state(P=condition.inlet_pressure, T=condition.inlet_temperature)
    discharge = gas.state(P=condition.discharge_pressure, T=condition.discharge_temperature)
    for name, state in (("inlet", inlet), ("discharge", discharge)):
        if state.two_phase or state.phase == "liquid":
            raise InputError(f"the {name} of the compressor is {gas.name} {state.phase}: the "
                             "similarity groups are for a gas")
    m = inlet.rho * condition.volume_flow
    rating = compressor(inlet, discharge, mass_flow=m)
    if method == "schultz":
        head, eta = rating.polytropic_head_schultz, rating.polytropic_efficiency_schultz
    else:
        head, eta = rating.polytropic_head, rating.polytropic_efficiency
    if not (head > 0 and 0 < eta <= 1):
        raise ReadingsError(f"the condition gives a polytropic head {head:.5g} J/kg and "
                            f"efficiency {eta:.4g}: check the discharge temperature")
    return inlet, discharge, m, head, eta


def similarity_groups(condition: CompressorCondition, diameter: float, width: float,
                      method: str = "schultz", impellers: int = 1) -> SimilarityGroups:
    """PTC 10 groups and performance of one condition (module notes).

    Parameters
    ----------
    condition : CompressorCondition or dict
    diameter, width : float or Quantity
        Impeller tip diameter and exit width [m].
    method : {"schultz", "integration"}
    impellers : int
        Number of impellers of that tip diameter.

    Returns
    -------
    SimilarityGroups
    """
    condition = _condition(condition, "condition")
    diameter = to_si(diameter, "length", "impeller diameter", low=1e-3, high=20.0)
    width = to_si(width, "length", "impeller width", low=1e-4, high=diameter / 2,
                  high_open=True)
    method = choice(method, ("schultz", "integration"), "polytropic method")
    impellers = count(impellers, "number of impellers", low=1, high=20)
    inlet, discharge, m, head, eta = _head_efficiency(condition, method)
    omega = condition.speed
    r = diameter / 2
    U = omega * r
    a = inlet.fluid.speed_of_sound(inlet)
    if not (math.isfinite(a) and a > 0):
        raise InputError(f"no speed of sound for {inlet.fluid.name} at the inlet")
    nu = inlet.fluid.viscosity(inlet) / inlet.rho
    return SimilarityGroups(
        volume_flow=condition.volume_flow, mass_flow=m, speed=omega, tip_speed=U,
        flow_coefficient=condition.volume_flow / (omega * r ** 3),
        work_coefficient=head / (impellers * U ** 2), machine_mach_number=U / a,
        machine_reynolds_number=U * width / nu,
        specific_volume_ratio=discharge.rho / inlet.rho, polytropic_head=head,
        polytropic_efficiency=eta, power=m * head / eta, outlet_pressure=discharge.P,
        outlet_temperature=discharge.T)


def reynolds_factor(reynolds_number, width, roughness) -> float:
    """R_A R_B of the optional Reynolds correction (module notes; from memory) [-].

    Parameters
    ----------
    reynolds_number : float
        Machine Reynolds number [-], positive.
    width : float
        Impeller exit width b [m] (converted to ft inside, as the correlation needs).
    roughness : float
        Surface roughness e [m] (converted to inches inside).
    """
    Re = to_si(reynolds_number, "dimensionless", "machine Reynolds number", low=1e3)
    b = positive(width, "length", "impeller width") / _FT
    e = to_si(roughness, "length", "impeller roughness", low=0.0) / _IN
    C = 0.988 / Re ** 0.243
    R_A = 0.066 + 0.934 * (4.8e6 * b / Re) ** C
    R_B = math.log10(0.000125 + 13.67 / Re) / math.log10(e + 13.67 / Re)
    return R_A * R_B


def _predicted_discharge(inlet, head, eta, guess):
    """Discharge state at which the polytropic path of efficiency eta has this head."""
    def miss(P):
        return polytropic_outlet(inlet, P, eta)[1] - head

    lo, hi = inlet.P * 1.000001, max(guess, inlet.P * 1.01)
    if miss(lo) >= 0:
        raise ReadingsError(f"the converted polytropic head {head:.5g} J/kg is too small to "
                            "predict a discharge pressure: check the test and specified speeds")
    for _ in range(40):
        if miss(hi) > 0:
            break
        lo, hi = hi, hi * 1.5
    else:
        raise ReadingsError("the converted head is beyond any discharge pressure of the "
                            "property model")
    P = brentq(miss, lo, hi, xtol=1e-6 * inlet.P, rtol=1e-10)
    return polytropic_outlet(inlet, P, eta)[0]


def _convert(test, specified_condition, diameter, width, roughness, method, correct,
             discharge=True, impellers=1):
    """Test groups converted to the specified inlet, gas and speed at equal phi."""
    gas = specified_condition.gas
    inlet = gas.state(P=specified_condition.inlet_pressure,
                      T=specified_condition.inlet_temperature)
    omega = specified_condition.speed
    r = diameter / 2
    U = omega * r
    q = test.flow_coefficient * omega * r ** 3
    eta = test.polytropic_efficiency
    mu_p = test.work_coefficient
    nu = gas.viscosity(inlet) / inlet.rho
    Re = U * width / nu
    if correct:
        factor = (reynolds_factor(Re, width, roughness)
                  / reynolds_factor(test.machine_reynolds_number, width, roughness))
        eta_new = 1 - (1 - eta) * factor
        if not 0 < eta_new <= 1:
            raise ReadingsError(f"the Reynolds correction gives an efficiency {eta_new:.4g}")
        mu_p *= eta_new / eta
        eta = eta_new
    head = mu_p * impellers * U ** 2
    m = inlet.rho * q
    P2 = T2 = ratio = 0.0
    if discharge:
        outlet = _predicted_discharge(inlet, head, eta, specified_condition.discharge_pressure)
        P2, T2, ratio = outlet.P, outlet.T, outlet.rho / inlet.rho
    return SimilarityGroups(
        volume_flow=q, mass_flow=m, speed=omega, tip_speed=U,
        flow_coefficient=test.flow_coefficient, work_coefficient=mu_p,
        machine_mach_number=U / gas.speed_of_sound(inlet), machine_reynolds_number=Re,
        specific_volume_ratio=ratio, polytropic_head=head, polytropic_efficiency=eta,
        power=m * head / eta, outlet_pressure=P2, outlet_temperature=T2)


def mach_number_limits(specified_mach_number) -> tuple[float, float]:
    """(low, high) departure Mm_t - Mm_sp allowed for a centrifugal compressor [-].

    Piecewise-linear in Mm_sp through :data:`MACH_DEPARTURE_CENTRIFUGAL`, held beyond its
    ends: an approximation of ASME PTC 10-1997 Figure 3.3 recalled from memory.
    """
    Mm = to_si(specified_mach_number, "dimensionless", "specified machine Mach number",
               low=0.0)
    x, lo, hi = (np.array(c) for c in zip(*MACH_DEPARTURE_CENTRIFUGAL))
    return float(np.interp(Mm, x, lo)), float(np.interp(Mm, x, hi))


def _limits(limits):
    out = {k: (v[1], v[2]) for k, v in DEFAULT_LIMITS.items()}
    if limits is None:
        return out, None, ()
    if not isinstance(limits, dict):
        raise InputError(f"limits must be a dict of (low, high) pairs, not "
                         f"{type(limits).__name__}")
    mach = None
    for key, pair in limits.items():
        choice(key, (*DEFAULT_LIMITS, "machine_mach_number"), "limit name")
        try:
            low, high = pair
        except (TypeError, ValueError):
            raise InputError(f"limit {key} must be a (low, high) pair, not {pair!r}") from None
        low = to_si(low, "dimensionless", f"{key} low limit")
        high = to_si(high, "dimensionless", f"{key} high limit")
        if not low < high:
            raise InputError(f"{key} low limit {low:g} must be below its high limit {high:g}")
        if key == "machine_mach_number":
            mach = (low, high)
        else:
            out[key] = (low, high)
    return out, mach, tuple(limits)


def _checks(test, spec, test_cond, spec_cond, test_type, limits, mach, user):
    checks = []
    for name in ("specific_volume_ratio", "flow_coefficient", "machine_reynolds_number"):
        t, s = getattr(test, name), getattr(spec, name)
        lo, hi = limits[name]
        src = "limit given by the user" if name in user else _SOURCES[name]
        checks.append(SimilarityCheck(name, "ratio", t, s, t / s, lo, hi, lo <= t / s <= hi,
                                      src))
    t, s = test.machine_mach_number, spec.machine_mach_number
    lo, hi = mach if mach is not None else mach_number_limits(s)
    checks.append(SimilarityCheck(
        "machine_mach_number", "departure", t, s, t - s, lo, hi, lo <= t - s <= hi,
        "limit given by the user" if mach is not None else _SOURCES["machine_mach_number"]))
    if test_type == "1":
        pairs = {"inlet_pressure": (test_cond.inlet_pressure, spec_cond.inlet_pressure),
                 "inlet_temperature": (test_cond.inlet_temperature,
                                       spec_cond.inlet_temperature),
                 "speed": (test_cond.speed, spec_cond.speed),
                 "molar_mass": (test_cond.gas.molar_mass, spec_cond.gas.molar_mass),
                 "volume_flow": (test_cond.volume_flow, spec_cond.volume_flow)}
        for name, (t, s) in pairs.items():
            d = t / s - 1
            tol = TYPE1_LIMITS[name]
            checks.append(SimilarityCheck(name, "departure", t, s, d, -tol, tol,
                                          -tol <= d <= tol,
                                          "ASME PTC 10-1997 Table 3.1 (from memory)"))
    return tuple(checks)


def compressor_similarity(test, specified, *, diameter, width, test_type="2",
                          method="schultz", reynolds_correction=False,
                          roughness=3.2e-6, limits=None, uncertainties=None, impellers=1
                          ) -> CompressorSimilarityResult:
    """Judge a compressor test's similarity and convert it to specified conditions (PTC 10).

    Parameters
    ----------
    test : CompressorCondition or dict
        Measured test condition: gas, inlet and discharge pressure and temperature, inlet
        volume flow, speed.
    specified : CompressorCondition or dict
        Specified condition from the datasheet (gas, inlet, discharge, flow and speed of the
        guarantee point).
    diameter : float or Quantity
        Impeller tip diameter [m] (first impeller), positive.
    width : float or Quantity
        Impeller exit width b [m] used in the machine Reynolds number, positive.
    test_type : {"1", "2"}
        PTC 10 test type; Type 1 adds the Table 3.1 condition checks.
    method : {"schultz", "integration"}
        Polytropic head by Schultz's method or by direct integration.
    reynolds_correction : bool
        Apply the optional Reynolds correction (module notes; from memory, off by default).
    roughness : float or Quantity
        Impeller surface roughness [m] for the Reynolds correction (default 3.2 um, about 125
        micro-inch).
    limits : dict, optional
        Replace default limits: ``{"flow_coefficient": (0.96, 1.04), "machine_mach_number":
        (low, high departure), ...}``.
    impellers : int
        Number of impellers z of the section, all of the tip diameter given (the work
        coefficient is W_p / (z U^2)); default 1.
    uncertainties : dict, optional
        Reading name (``inlet_pressure``, ``inlet_temperature``, ``discharge_pressure``,
        ``discharge_temperature``, ``volume_flow``, ``speed``) -> (systematic, random)
        standard uncertainties in SI units or :class:`workbench.InstrumentUncertainty`.

    Returns
    -------
    CompressorSimilarityResult

    Raises
    ------
    InputError
        Values out of range, unknown options or limit names, a liquid state.
    ReadingsError
        A condition whose head or efficiency is impossible.

    References
    ----------
    ASME PTC 10-1997 (module notes; from memory); ASME PTC 19.1-2013.

    Examples
    --------
    >>> n2 = Fluid("Nitrogen")  # workbench.Fluid
    >>> test = CompressorCondition(n2, 1.0e5, 300.0, 2.2e5, 392.0, 0.8, 1200.0)
    >>> result = compressor_similarity(test, test, diameter=0.4, width=0.02)
    >>> result.within_limits
    True
    """
    test_c = _condition(test, "test condition")
    spec_c = _condition(specified, "specified condition")
    D = to_si(diameter, "length", "impeller diameter", low=1e-3, high=20.0)
    b = to_si(width, "length", "impeller width", low=1e-4, high=D / 2, high_open=True)
    test_type = choice(test_type, ("1", "2"), "test type")
    method = choice(method, ("schultz", "integration"), "polytropic method")
    correct = flag(reynolds_correction, "reynolds_correction")
    eps = to_si(roughness, "length", "impeller roughness", low=0.0, high=1e-3)
    z = count(impellers, "number of impellers", low=1, high=20)
    lims, mach, user = _limits(limits)
    t = similarity_groups(test_c, D, b, method, z)
    s = similarity_groups(spec_c, D, b, method, z)
    checks = _checks(t, s, test_c, spec_c, test_type, lims, mach, user)
    converted = _convert(t, spec_c, D, b, eps, method, correct, impellers=z)
    cautions = []
    if correct and not 1e5 <= t.machine_reynolds_number <= 1e9:
        cautions.append("the Reynolds correction is applied outside the Reynolds numbers it "
                        "was fitted for")
    if test_type == "1" and test_c.gas != spec_c.gas:
        cautions.append("a Type 1 test is run on the specified gas: the gases differ")
    report = None
    if uncertainties is not None:
        report = _uncertainty(test_c, spec_c, D, b, eps, method, correct, uncertainties, z)
    return CompressorSimilarityResult(
        test_type=test_type, method=method, test=t, specified=s, converted=converted,
        checks=checks, reynolds_correction=correct, uncertainty=report,
        cautions=tuple(cautions))


def _uncertainty(test_c, spec_c, D, b, eps, method, correct, uncertainties, z):
    if not isinstance(uncertainties, dict):
        raise InputError("uncertainties must be a dict of reading name -> (systematic, "
                         "random)")
    checked = {}
    for key, value in uncertainties.items():
        choice(key, READINGS, "uncertainty reading")
        if isinstance(value, InstrumentUncertainty):
            value = (value.systematic, value.random)
        if not isinstance(value, (tuple, list)) or len(value) != 2:
            raise InputError(f"uncertainty of {key} must be (systematic, random) or an "
                             f"InstrumentUncertainty, not {value!r:.60}")
        kind = _READING_KINDS[key]
        if kind == "temperature":
            kind = "temperature_difference"
        checked[key] = tuple(to_si(v, kind, f"{part} uncertainty of {key}", low=0.0)
                             for v, part in zip(value, ("systematic", "random")))
    results = ("polytropic_head", "polytropic_efficiency", "power")

    def model(frame):
        rows = []
        for record in frame.to_dict("records"):
            try:
                cond = CompressorCondition(test_c.gas, **record)
                t = similarity_groups(cond, D, b, method, z)
                conv = _convert(t, spec_c, D, b, eps, method, correct, discharge=False,
                                impellers=z)
                rows.append({**{r: getattr(conv, r) for r in results}, "status": "ok",
                             "message": ""})
            except WorkbenchError as exc:
                rows.append({**{r: math.nan for r in results}, "status": "error",
                             "message": str(exc)})
        return pd.DataFrame(rows)

    return propagate_uncertainty(test_c.readings(), checked, results, model=model)


__all__ = ["CompressorCondition", "CompressorSimilarityResult", "DEFAULT_LIMITS",
           "MACH_DEPARTURE_CENTRIFUGAL", "READINGS", "SimilarityCheck", "SimilarityGroups",
           "TYPE1_LIMITS", "compressor_similarity", "mach_number_limits", "reynolds_factor",
           "similarity_groups"]
