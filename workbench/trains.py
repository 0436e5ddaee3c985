"""Machine trains: machines and devices in series, with splits and merges on the way.

A :class:`Train` is an ordered list of steps acting on one main stream.  Each step takes the
main stream's state and mass flow and gives the next ones:

* machines: :class:`CompressorStage`, :class:`TurbineSection`, :class:`PumpStage`
  (through :mod:`workbench.machines.turbomachine`);
* devices: :class:`Cooler`, :class:`PressureLoss`, :class:`ThrottleValve`, :class:`PipeRun`;
* a split :class:`Extraction` (a branch leaves the train) and a merge :class:`Admission`
  (a stream joins it), with the mass balance enforced at each.

Every station (the inlet, each step's outlet, each branch) is kept, so the result gives the
station table, each machine's result and the totals.  :func:`intercooled_compressor` and
:func:`extraction_turbine` build common trains.

References
----------
Steady-flow mass and energy balances of each control volume (common practice).
ASME PTC 10-1997 (compressor sections with intercooling); ASME PTC 6-2004 (steam turbines
with extraction).
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field

from .errors import InputError, SpecificationError, WorkbenchError
from .machines.heat_exchanger import cooler as _cooler
from .machines.mixer import MASS_BALANCE_TOLERANCE, mixer, splitter
from .machines.pipe import pipe_segment
from .machines.throttle import _check_state, _quality, throttle
from .machines.turbomachine import MachineResult, energy_balance
from .properties import State
from .units import optional_si, to_si

MACHINE_KINDS = ("compressor", "turbine", "pump")


# ----------------------------------------------------------------------------- stations
@dataclass(frozen=True, eq=False)
class Station:
    """One point of a train.

    Attributes
    ----------
    name : str
        Station name (``"inlet"``, ``"<step> outlet"``, ``"<step> branch"``).
    state : State
        Static state.
    mass_flow : float
        Mass flow through the station [kg/s].
    role : str
        ``"main"`` on the main line, ``"extraction"`` for a branch leaving, ``"admission"``
        for a stream joining.
    """

    name: str
    state: State
    mass_flow: float
    role: str = "main"

    def to_dict(self) -> dict:
        """Flat dict of the station (SI units, keys end with their unit)."""
        st = self.state
        return {"station": self.name, "role": self.role, "pressure_Pa": st.P,
                "temperature_K": st.T, "enthalpy_J_per_kg": st.h,
                "entropy_J_per_kgK": st.s, "quality": _quality(st),
                "mass_flow_kg_per_s": self.mass_flow, "phase": st.phase}


@dataclass(frozen=True, eq=False)
class StepResult:
    """What one step did.

    Attributes
    ----------
    name : str
        Step name.
    kind : str
        ``"compressor"``, ``"turbine"``, ``"pump"``, ``"cooler"``, ``"pressure loss"``,
        ``"throttle valve"``, ``"pipe"``, ``"extraction"`` or ``"admission"``.
    result : object
        The machine's or device's result (``MachineResult``, ``CoolerResult`` ...).
    stations : tuple of Station
        Stations this step added (branch first, then its main-line outlet).
    """

    name: str
    kind: str
    result: object
    stations: tuple


def _check_flow(step, flow):
    """Refuse a step whose stated mass flow disagrees with the train's balance."""
    if step.mass_flow is None:
        return
    stated = to_si(step.mass_flow, "mass_flow", f"mass flow of step {step.name!r}")
    if abs(stated - flow) > MASS_BALANCE_TOLERANCE * max(flow, 1e-30):
        raise SpecificationError(
            f"the mass balance does not close at step {step.name!r}: the train carries "
            f"{flow:.9g} kg/s there but the step's mass flow is given as {stated:.9g} kg/s "
            f"(allowed difference {MASS_BALANCE_TOLERANCE:g} relative)")


def _outlet_pressure_or(step, other, kind, what):
    """The step's ``P_out`` [Pa] and ``other`` (its ``what``, of ``kind``) in SI units.

    Exactly one of the two must be given; the one not given comes back as ``None``.
    """
    P2 = optional_si(step.P_out, "pressure", f"outlet pressure of {step.name!r}")
    value = optional_si(other, kind, f"{what} of {step.name!r}")
    if (P2 is None) == (value is None):
        raise SpecificationError(f"step {step.name!r} needs its outlet pressure or its {what} "
                                 "(exactly one)")
    return P2, value


# ----------------------------------------------------------------------------- steps
class _Step:
    """What every step does: check a stated mass flow against the train, then act.

    ``apply(inlet, flow)`` gives ``(result, outlet state, outlet mass flow [kg/s], branch
    stations)``.  A step with one inlet and one outlet passing the whole flow on defines
    ``_device(inlet, flow)`` (returning a result with an ``outlet``); a split or merge
    defines ``_apply`` itself.
    """

    def apply(self, inlet, flow):
        _check_flow(self, flow)
        return self._apply(inlet, flow)

    def _apply(self, inlet, flow):
        result = self._device(inlet, flow)
        return result, result.outlet, flow, ()


@dataclass(frozen=True)
class _MachineStep(_Step):
    name: str
    P_out: object = None
    pressure_ratio: object = None
    isentropic_efficiency: object = None
    polytropic_efficiency: object = None
    mechanical_efficiency: object = 1.0
    heat_loss: object = 0.0
    mass_flow: object = None
    kind = "compressor"

    def _outlet_pressure(self, inlet):
        P2, ratio = _outlet_pressure_or(self, self.pressure_ratio, "dimensionless",
                                        "pressure ratio")
        if ratio is not None:
            turbine = self.kind == "turbine"
            if not ratio > 0:
                basis = "inlet over outlet" if turbine else "outlet over inlet"
                raise InputError(f"pressure ratio of {self.name!r} is {ratio:g}; it must be "
                                 f"positive ({basis} pressure)")
            P2 = inlet.P / ratio if turbine else inlet.P * ratio
        return P2

    def _device(self, inlet, flow):
        return energy_balance(
            self.kind, inlet, P_out=self._outlet_pressure(inlet),
            isentropic_efficiency=self.isentropic_efficiency,
            polytropic_efficiency=self.polytropic_efficiency, mass_flow=flow,
            heat_loss=self.heat_loss, mechanical_efficiency=self.mechanical_efficiency)


@dataclass(frozen=True)
class CompressorStage(_MachineStep):
    """A compressor stage (or section).  Give ``P_out`` [Pa] or ``pressure_ratio`` [-] and
    one efficiency [-]; ``mass_flow`` [kg/s], if given, is checked against the train."""

    kind = "compressor"


@dataclass(frozen=True)
class TurbineSection(_MachineStep):
    """A turbine section.  ``pressure_ratio`` is inlet over outlet pressure (> 1)."""

    kind = "turbine"


@dataclass(frozen=True)
class PumpStage(_MachineStep):
    """A pump stage.  Give ``P_out`` [Pa] or ``pressure_ratio`` [-] and an efficiency."""

    kind = "pump"


@dataclass(frozen=True)
class Cooler(_Step):
    """A cooler (intercooler, aftercooler) to ``outlet_temperature`` [K] with a process-side
    ``pressure_drop`` [Pa] and, optionally, cooling water inlet/outlet temperatures [K]."""

    name: str
    outlet_temperature: object
    pressure_drop: object = 0.0
    cooling_water_inlet_temperature: object = None
    cooling_water_outlet_temperature: object = None
    mass_flow: object = None
    kind = "cooler"

    def _device(self, inlet, flow):
        return _cooler(inlet, flow, self.outlet_temperature, pressure_drop=self.pressure_drop,
                       cooling_water_inlet_temperature=self.cooling_water_inlet_temperature,
                       cooling_water_outlet_temperature=self.cooling_water_outlet_temperature)


@dataclass(frozen=True)
class ThrottleValve(_Step):
    """An isenthalpic throttle valve to ``P_out`` [Pa] or by ``pressure_drop`` [Pa]."""

    name: str
    P_out: object = None
    pressure_drop: object = None
    mass_flow: object = None
    kind = "throttle valve"

    def _device(self, inlet, flow):
        P2, dP = _outlet_pressure_or(self, self.pressure_drop, "pressure", "pressure drop")
        if dP is not None:
            if not 0 < dP < inlet.P:
                raise InputError(
                    f"pressure drop of {self.name!r} is {dP / 1e5:.6g} bar; it must lie in "
                    f"(0, {inlet.P / 1e5:.6g}) bar, below the inlet pressure")
            P2 = inlet.P - dP
        return throttle(inlet, flow, P_out=P2)


@dataclass(frozen=True)
class PressureLoss(ThrottleValve):
    """A pressure drop without work or heat (knock-out drum, strainer, piping): isenthalpic.
    Give ``pressure_drop`` [Pa]."""

    kind = "pressure loss"


@dataclass(frozen=True)
class PipeRun(_Step):
    """A liquid pipe segment; ``options`` are the keyword arguments of
    :func:`workbench.machines.pipe.pipe_segment` (length, elevation_change, viscosity...)."""

    name: str
    diameter: object
    options: dict = field(default_factory=dict)
    mass_flow: object = None
    kind = "pipe"

    def _device(self, inlet, flow):
        return pipe_segment(inlet, flow, self.diameter, **self.options)


@dataclass(frozen=True)
class Extraction(_Step):
    """A branch leaving the train (bleed, extraction): give its ``branch_mass_flow``
    [kg/s] or its ``fraction`` [-] of the flow arriving."""

    name: str
    branch_mass_flow: object = None
    fraction: object = None
    mass_flow: object = None
    kind = "extraction"

    def _apply(self, inlet, flow):
        if (self.branch_mass_flow is None) == (self.fraction is None):
            raise SpecificationError(f"extraction {self.name!r} needs its branch mass flow or "
                                     "its fraction (exactly one)")
        if self.fraction is not None:
            f = to_si(self.fraction, "dimensionless", f"split fraction of {self.name!r}")
            if not 0.0 <= f <= 1.0:
                raise InputError(f"split fraction of {self.name!r} is {f:g}; it must lie in "
                                 "[0, 1]")
            result = splitter(inlet, flow, fractions=[f, None])
        else:
            b = to_si(self.branch_mass_flow, "mass_flow", f"branch mass flow of {self.name!r}")
            if not 0.0 <= b < flow:
                raise SpecificationError(
                    f"the mass balance does not close at extraction {self.name!r}: the branch "
                    f"mass flow {b:.6g} kg/s must lie in [0, {flow:.6g}) kg/s, below the flow "
                    "arriving")
            result = splitter(inlet, flow, branch_mass_flows=[b, None])
        branch, rest = result.branch_mass_flows
        return result, inlet, rest, (Station(f"{self.name} branch", inlet, branch,
                                             "extraction"),)


@dataclass(frozen=True)
class Admission(_Step):
    """A stream joining the train (admission, recycle): its ``state`` and
    ``branch_mass_flow`` [kg/s]; mixing at the lower pressure."""

    name: str
    state: State = None
    branch_mass_flow: object = None
    mass_flow: object = None
    kind = "admission"

    def _apply(self, inlet, flow):
        joining = _check_state(f"state of admission {self.name!r}", self.state)
        if self.branch_mass_flow is None:
            raise SpecificationError(f"admission {self.name!r} needs its branch mass flow")
        b = to_si(self.branch_mass_flow, "mass_flow", f"branch mass flow of {self.name!r}")
        result = mixer([(inlet, flow), (joining, b)])
        return result, result.outlet, result.mass_flow, (
            Station(f"{self.name} branch", joining, result.inlet_mass_flows[1], "admission"),)


# ----------------------------------------------------------------------------- results
@dataclass(frozen=True, eq=False)
class TrainResult:
    """Result of a train.  All numbers in SI units.

    Attributes
    ----------
    stations : tuple of Station
        Every station in order: the inlet, then each step's branch (if any) and outlet.
    steps : tuple of StepResult
        Each step's result, in order.
    inlet_mass_flow, outlet_mass_flow : float
        Main-line flow at the train inlet and outlet [kg/s].
    extracted_mass_flow, admitted_mass_flow : float
        Total flow of the branches leaving and joining [kg/s].
    """

    stations: tuple
    steps: tuple
    inlet_mass_flow: float
    outlet_mass_flow: float
    extracted_mass_flow: float
    admitted_mass_flow: float

    @property
    def machines(self) -> dict:
        """Each machine's :class:`MachineResult`, by step name."""
        return {s.name: s.result for s in self.steps if s.kind in MACHINE_KINDS}

    @property
    def absorbed_power(self) -> float:
        """Shaft power taken by the compressors and pumps [W]."""
        return math.fsum(s.result.shaft_power for s in self.steps
                         if s.kind in ("compressor", "pump"))

    @property
    def delivered_power(self) -> float:
        """Shaft power given by the turbine sections [W]."""
        return math.fsum(s.result.shaft_power for s in self.steps if s.kind == "turbine")

    @property
    def net_power(self) -> float:
        """Delivered minus absorbed shaft power [W] (negative for a driven train)."""
        return self.delivered_power - self.absorbed_power

    @property
    def heat_removed(self) -> float:
        """Heat taken out by the coolers [W]."""
        return math.fsum(s.result.duty for s in self.steps if s.kind == "cooler")

    @property
    def cooling_water_mass_flow(self) -> float:
        """Cooling water needed by the coolers that were given water temperatures [kg/s]."""
        flows = [s.result.cooling_water_mass_flow for s in self.steps if s.kind == "cooler"]
        flows = [f for f in flows if not math.isnan(f)]
        return math.fsum(flows) if flows else math.nan

    @property
    def outlet(self) -> State:
        """Main-line outlet state."""
        return [s for s in self.stations if s.role == "main"][-1].state

    def totals(self) -> dict:
        """The train's totals (SI units, keys end with their unit)."""
        return {
            "absorbed_power_W": self.absorbed_power,
            "delivered_power_W": self.delivered_power,
            "net_power_W": self.net_power,
            "heat_removed_W": self.heat_removed,
            "cooling_water_mass_flow_kg_per_s": self.cooling_water_mass_flow,
            "inlet_mass_flow_kg_per_s": self.inlet_mass_flow,
            "outlet_mass_flow_kg_per_s": self.outlet_mass_flow,
            "extracted_mass_flow_kg_per_s": self.extracted_mass_flow,
            "admitted_mass_flow_kg_per_s": self.admitted_mass_flow,
        }

    def to_dict(self) -> dict:
        """``{"stations": [...], "steps": [...], "totals": {...}}`` of flat dicts."""
        return {
            "stations": [s.to_dict() for s in self.stations],
            "steps": [{"step": s.name, "kind": s.kind, **_summary(s)} for s in self.steps],
            "totals": self.totals(),
        }

    def stations_frame(self):
        """The station table as a pandas DataFrame (one row per station, SI units)."""
        import pandas as pd

        return pd.DataFrame([s.to_dict() for s in self.stations]).set_index("station")

    def machines_frame(self):
        """One row per machine (compressor, turbine, pump) as a pandas DataFrame, SI units."""
        import pandas as pd

        rows = [{"step": s.name, **_summary(s)} for s in self.steps if s.kind in MACHINE_KINDS]
        columns = ["step", "kind", "inlet_pressure_Pa", "outlet_pressure_Pa", "pressure_ratio",
                   "inlet_temperature_K", "outlet_temperature_K", "mass_flow_kg_per_s",
                   "isentropic_efficiency", "specific_work_J_per_kg", "power_W",
                   "shaft_power_W"]
        return pd.DataFrame(rows, columns=columns).set_index("step")

    def devices_frame(self):
        """One row per device step (coolers, valves, pipes, branches), SI units."""
        import pandas as pd

        rows = [{"step": s.name, **_summary(s)} for s in self.steps
                if s.kind not in MACHINE_KINDS]
        return pd.DataFrame(rows).set_index("step") if rows else pd.DataFrame()


def _summary(step: StepResult) -> dict:
    """A short flat dict of a step's result (machines: the main numbers, not every one)."""
    r = step.result
    if isinstance(r, MachineResult):
        return {"kind": r.kind, "inlet_pressure_Pa": r.inlet.P, "outlet_pressure_Pa": r.outlet.P,
                "pressure_ratio": r.pressure_ratio, "inlet_temperature_K": r.inlet.T,
                "outlet_temperature_K": r.outlet.T, "mass_flow_kg_per_s": r.mass_flow,
                "isentropic_efficiency": r.isentropic_efficiency,
                "specific_work_J_per_kg": r.specific_work, "power_W": r.power,
                "shaft_power_W": r.shaft_power,
                "outlet_quality": _quality(r.outlet)}
    d = dict(r.to_dict())
    d["kind"] = step.kind
    d.pop("device", None)
    return d


# ----------------------------------------------------------------------------- train
class Train:
    """An ordered list of steps acting on one main stream.

    Parameters
    ----------
    steps : sequence of step objects
        :class:`CompressorStage`, :class:`TurbineSection`, :class:`PumpStage`,
        :class:`Cooler`, :class:`PressureLoss`, :class:`ThrottleValve`, :class:`PipeRun`,
        :class:`Extraction`, :class:`Admission`, with unique names.

    Examples
    --------
    >>> train = Train([CompressorStage("stage 1", pressure_ratio=3, isentropic_efficiency=0.8),
    ...                Cooler("intercooler", outlet_temperature=308.15, pressure_drop=0.2e5),
    ...                CompressorStage("stage 2", P_out=8e5, isentropic_efficiency=0.8)])
    >>> result = train.run(inlet, mass_flow=2.0)          # doctest: +SKIP
    """

    def __init__(self, steps):
        steps = tuple(steps)
        if not steps:
            raise InputError("a train needs at least one step")
        names = set()
        for i, step in enumerate(steps, start=1):
            if not hasattr(step, "apply") or not hasattr(step, "name"):
                raise InputError(f"train step {i} is a {type(step).__name__}, not a train step "
                                 "(CompressorStage, Cooler, Extraction, ...)")
            if step.name in names:
                raise InputError(f"train step name {step.name!r} is used twice; names must be "
                                 "unique")
            names.add(step.name)
        self.steps = steps

    def __repr__(self) -> str:
        return f"Train([{', '.join(repr(s.name) for s in self.steps)}])"

    def run(self, inlet: State, mass_flow) -> TrainResult:
        """Run the train from ``inlet`` with ``mass_flow`` [kg/s] at the train inlet.

        Returns
        -------
        TrainResult

        Raises
        ------
        SpecificationError
            A step's stated mass flow disagrees with the balance, or a branch is larger than
            the flow arriving.
        WorkbenchError
            Any error of a machine or device, of the same class, with the step named.
        """
        inlet = _check_state("train inlet", inlet)
        m0 = to_si(mass_flow, "mass_flow", "train inlet mass flow")
        if not m0 > 0:
            raise InputError(f"train inlet mass flow {m0:g} kg/s must be positive")
        stations = [Station("inlet", inlet, m0)]
        records = []
        state, flow = inlet, m0
        extracted = admitted = 0.0
        for step in self.steps:
            try:
                result, state, new_flow, branches = step.apply(state, flow)
            except WorkbenchError as exc:
                raise type(exc)(_named(step, exc)) from exc
            for b in branches:
                if b.role == "extraction":
                    extracted += b.mass_flow
                else:
                    admitted += b.mass_flow
            flow = new_flow
            outlet = Station(f"{step.name} outlet", state, flow)
            stations.extend(branches)
            stations.append(outlet)
            records.append(StepResult(step.name, step.kind, result, tuple(branches) + (outlet,)))
        balance = m0 + admitted - extracted - flow
        if abs(balance) > MASS_BALANCE_TOLERANCE * (m0 + admitted):
            raise SpecificationError(
                f"the train's mass balance does not close: inlet {m0:.9g} + admitted "
                f"{admitted:.9g} - extracted {extracted:.9g} - outlet {flow:.9g} = {balance:.3g} "
                "kg/s")
        return TrainResult(stations=tuple(stations), steps=tuple(records), inlet_mass_flow=m0,
                           outlet_mass_flow=flow, extracted_mass_flow=extracted,
                           admitted_mass_flow=admitted)


def _named(step, exc) -> str:
    text = str(exc)
    return text if repr(step.name) in text else f"step {step.name!r}: {text}"


def run_train(inlet: State, mass_flow, steps) -> TrainResult:
    """Shorthand for ``Train(steps).run(inlet, mass_flow)``."""
    return Train(steps).run(inlet, mass_flow)


# ----------------------------------------------------------------------------- built trains
def _per_item(value, count, name):
    """A scalar repeated ``count`` times, or a sequence of exactly ``count`` values."""
    if isinstance(value, (list, tuple)):
        if len(value) != count:
            raise InputError(f"{name} has {len(value)} values; {count} are needed (one each)")
        return list(value)
    return [value] * count


@dataclass(frozen=True, eq=False)
class IntercooledCompressorResult:
    """Result of :func:`intercooled_compressor`.  SI units.

    Attributes
    ----------
    train : TrainResult
        Every station, stage and cooler.
    stage_pressure_ratios : tuple of float
        Discharge over suction pressure of each stage [-].
    method : str
        ``"equal"``, ``"optimal"`` or ``"given"``: how the stage ratios were chosen.
    """

    train: TrainResult
    stage_pressure_ratios: tuple
    method: str

    @property
    def stage_powers(self) -> tuple:
        """Shaft power of each stage [W]."""
        return tuple(r.shaft_power for r in self.train.machines.values())

    @property
    def total_power(self) -> float:
        """Shaft power of all stages [W]."""
        return self.train.absorbed_power

    @property
    def intermediate_pressures(self) -> tuple:
        """Discharge pressure of each stage but the last [Pa]."""
        return tuple(r.outlet.P for r in list(self.train.machines.values())[:-1])

    def to_dict(self) -> dict:
        """Train dict with the stage ratios, powers and method added to the totals."""
        d = self.train.to_dict()
        d["totals"].update({"method": self.method, "total_power_W": self.total_power})
        for i, (r, w) in enumerate(zip(self.stage_pressure_ratios, self.stage_powers), start=1):
            d["totals"][f"stage_{i}_pressure_ratio"] = r
            d["totals"][f"stage_{i}_shaft_power_W"] = w
        return d

    def stations_frame(self):
        """Station table (see :meth:`TrainResult.stations_frame`)."""
        return self.train.stations_frame()

    def machines_frame(self):
        """Stage table (see :meth:`TrainResult.machines_frame`)."""
        return self.train.machines_frame()


def intercooled_compressor(inlet: State, mass_flow, *, P_out=None, pressure_ratio=None,
                           stages=2, isentropic_efficiency=None, polytropic_efficiency=None,
                           cooler_outlet_temperature, cooler_pressure_drop=0.0,
                           knockout_pressure_drop=0.0, aftercooler=False,
                           aftercooler_pressure_drop=0.0, stage_ratios="equal",
                           cooling_water_inlet_temperature=None,
                           cooling_water_outlet_temperature=None,
                           mechanical_efficiency=1.0) -> IntercooledCompressorResult:
    """A compressor in stages with an intercooler (and knock-out pressure drop) after each
    stage but the last, and an optional aftercooler.

    The stage ratios are ``"equal"`` (all stages the same ratio, found so that the last stage
    discharges at ``P_out`` after the pressure drops between stages), ``"optimal"`` (the ratios
    that minimise the total shaft power, found with ``scipy.optimize.minimize``) or a sequence
    of the first ``stages - 1`` ratios (the last one closes on ``P_out``).

    Parameters
    ----------
    inlet : State
        Suction state of the first stage.
    mass_flow : float or Quantity
        Mass flow [kg/s].
    P_out, pressure_ratio : float or Quantity, optional
        Discharge pressure of the last stage [Pa], or its ratio to the suction pressure [-].
    stages : int
        Number of stages, 1 to 8.
    isentropic_efficiency, polytropic_efficiency : float or sequence, optional
        Stage efficiency [-] (one for all stages, or one per stage); give one kind.
    cooler_outlet_temperature : float, Quantity or sequence
        Gas temperature leaving each intercooler (and the aftercooler) [K].
    cooler_pressure_drop, knockout_pressure_drop : float, Quantity or sequence
        Pressure drop of each intercooler and of the knock-out drum after it [Pa].
    aftercooler : bool
        Cool the last stage's discharge too.
    aftercooler_pressure_drop : float or Quantity
        Pressure drop of the aftercooler [Pa].
    stage_ratios : {"equal", "optimal"} or sequence of float
        How the stage ratios are chosen.
    cooling_water_inlet_temperature, cooling_water_outlet_temperature : float, optional
        Cooling water temperatures [K], to size the water flow of every cooler.
    mechanical_efficiency : float
        Mechanical efficiency of each stage [-].

    Returns
    -------
    IntercooledCompressorResult

    References
    ----------
    For an ideal gas with perfect intercooling and equal stage efficiencies the total work is
    least with equal stage ratios, P_intermediate = sqrt(P1 P2) for two stages (common
    practice); ASME PTC 10-1997 for the stage energy balances.
    """
    import numpy as np
    from scipy.optimize import brentq, minimize

    inlet = _check_state("compressor suction state", inlet)
    if isinstance(stages, bool) or not isinstance(stages, (int, np.integer)) or not 1 <= stages <= 8:
        raise InputError(f"number of stages {stages!r} must be a whole number from 1 to 8")
    P2 = optional_si(P_out, "pressure", "discharge pressure")
    ratio = optional_si(pressure_ratio, "dimensionless", "overall pressure ratio")
    if (P2 is None) == (ratio is None):
        raise SpecificationError("give the discharge pressure or the overall pressure ratio "
                                 "(exactly one)")
    if P2 is None:
        P2 = inlet.P * ratio
    if not P2 > inlet.P:
        raise InputError(f"discharge pressure {P2 / 1e5:.6g} bar must be above the suction "
                         f"pressure {inlet.P / 1e5:.6g} bar")
    n = int(stages)
    etas_s = _per_item(isentropic_efficiency, n, "isentropic efficiency")
    etas_p = _per_item(polytropic_efficiency, n, "polytropic efficiency")
    n_coolers = n - 1 + (1 if aftercooler else 0)
    t_cool = _per_item(cooler_outlet_temperature, max(n_coolers, 1), "cooler outlet temperature")
    drops = [to_si(d, "pressure", "cooler pressure drop")
             for d in _per_item(cooler_pressure_drop, max(n - 1, 1), "cooler pressure drop")]
    ko = [to_si(d, "pressure", "knock-out pressure drop")
          for d in _per_item(knockout_pressure_drop, max(n - 1, 1), "knock-out pressure drop")]
    for name, values in (("cooler pressure drop", drops), ("knock-out pressure drop", ko)):
        for v in values:
            if v < 0:
                raise InputError(f"{name} {v:g} Pa must not be negative")
    water = dict(cooling_water_inlet_temperature=cooling_water_inlet_temperature,
                 cooling_water_outlet_temperature=cooling_water_outlet_temperature)

    def build(ratios):
        steps = []
        for i in range(n):
            last = i == n - 1
            steps.append(CompressorStage(
                f"stage {i + 1}", P_out=P2 if last else None,
                pressure_ratio=None if last else ratios[i],
                isentropic_efficiency=etas_s[i], polytropic_efficiency=etas_p[i],
                mechanical_efficiency=mechanical_efficiency))
            if not last:
                steps.append(Cooler(f"intercooler {i + 1}", t_cool[i], pressure_drop=drops[i],
                                    **water))
                if ko[i] > 0:
                    steps.append(PressureLoss(f"knock-out drum {i + 1}", pressure_drop=ko[i]))
        if aftercooler:
            steps.append(Cooler("aftercooler", t_cool[-1],
                                pressure_drop=aftercooler_pressure_drop, **water))
        return Train(steps)

    def last_suction(ratios):
        P = inlet.P
        for i in range(n - 1):
            P = P * ratios[i] - drops[i] - ko[i]
            if P <= 0:
                return P
        return P

    def run(ratios):
        return build(ratios).run(inlet, mass_flow)

    if n == 1:
        method, ratios = "given", []
    elif isinstance(stage_ratios, str) and stage_ratios in ("equal", "optimal"):
        method = stage_ratios

        def equal_gap(log_r):
            r = math.exp(log_r)
            P = last_suction([r] * (n - 1))
            return (P * r - P2) / P2 if P > 0 else -1.0

        hi = math.log(P2 / inlet.P)
        while equal_gap(hi) < 0:
            hi *= 1.5
            if hi > 50:
                raise SpecificationError("the pressure drops between stages are too large for "
                                         "any stage ratio to reach the discharge pressure")
        log_r = brentq(equal_gap, 1e-9, hi, xtol=1e-13)
        ratios = [math.exp(log_r)] * (n - 1)
        if method == "optimal":
            base = run(ratios).absorbed_power

            def total(x):
                rs = [math.exp(v) for v in x]
                if any(r <= 1 for r in rs) or not last_suction(rs) * 1.0 < P2:
                    return 1e6
                try:
                    return run(rs).absorbed_power / base
                except (InputError, SpecificationError):
                    return 1e6

            x0 = np.log(ratios)
            found = minimize(total, x0, method="Nelder-Mead",
                             options={"xatol": 1e-9, "fatol": 1e-13, "maxiter": 4000})
            ratios = [math.exp(v) for v in found.x]
    elif isinstance(stage_ratios, str):
        raise InputError(f"stage ratios {stage_ratios!r} must be 'equal', 'optimal' or a list of "
                         f"{n - 1} ratios")
    else:
        method = "given"
        ratios = [to_si(r, "dimensionless", f"pressure ratio of stage {i + 1}")
                  for i, r in enumerate(_per_item(list(stage_ratios), n - 1, "stage ratios"))]
        for i, r in enumerate(ratios, start=1):
            if not r > 1:
                raise InputError(f"pressure ratio of stage {i} is {r:g}; it must be above 1")
    result = run(ratios)
    stage_ratios_out = tuple(r.pressure_ratio for r in result.machines.values())
    return IntercooledCompressorResult(train=result, stage_pressure_ratios=stage_ratios_out,
                                       method=method)


@dataclass(frozen=True, eq=False)
class ExtractionTurbineResult:
    """Result of :func:`extraction_turbine`.  SI units.

    Attributes
    ----------
    train : TrainResult
        Valve, HP section, extraction and LP section.
    feed_heater : HeatExchangerResult or None
        The closed feed heater fed by the extraction, when feedwater was given.
    """

    train: TrainResult
    feed_heater: object = None

    @property
    def high_pressure_section(self) -> MachineResult:
        """HP section result (full flow)."""
        return self.train.machines["HP section"]

    @property
    def low_pressure_section(self) -> MachineResult:
        """LP section result (flow after the extraction)."""
        return self.train.machines["LP section"]

    @property
    def total_power(self) -> float:
        """Shaft power of both sections [W]."""
        return self.train.delivered_power

    def to_dict(self) -> dict:
        """Train dict; the feed heater's numbers under ``"feed_heater"``."""
        d = self.train.to_dict()
        d["feed_heater"] = None if self.feed_heater is None else self.feed_heater.to_dict()
        return d

    def stations_frame(self):
        """Station table (see :meth:`TrainResult.stations_frame`)."""
        return self.train.stations_frame()

    def machines_frame(self):
        """Section table (see :meth:`TrainResult.machines_frame`)."""
        return self.train.machines_frame()


def extraction_turbine(inlet: State, mass_flow, P_out, *, extraction_pressure,
                       extraction_mass_flow, hp_isentropic_efficiency,
                       lp_isentropic_efficiency, valve_outlet_pressure=None,
                       valve_pressure_drop=None, mechanical_efficiency=1.0,
                       feedwater_inlet=None, feedwater_mass_flow=None) -> ExtractionTurbineResult:
    """A steam turbine behind a throttle valve with one extraction between two sections.

    The valve throttles the steam (isenthalpic); the HP section expands the full flow to the
    extraction pressure; the extraction takes its flow off; the LP section expands the rest
    to the exhaust pressure.  With feedwater given, the extraction steam condenses in a closed
    feed heater to saturated liquid at the extraction pressure (the drain) and the heater
    duty heats the feedwater, which may leave no hotter than the steam's saturation
    temperature (terminal temperature difference not negative).

    Parameters
    ----------
    inlet : State
        Steam state ahead of the valve.
    mass_flow : float or Quantity
        Throttle (admission) steam flow [kg/s].
    P_out : float or Quantity
        Exhaust pressure [Pa].
    extraction_pressure : float or Quantity
        Pressure at the extraction point [Pa].
    extraction_mass_flow : float or Quantity
        Extraction flow [kg/s], below the throttle flow.
    hp_isentropic_efficiency, lp_isentropic_efficiency : float
        Section isentropic efficiencies [-].
    valve_outlet_pressure, valve_pressure_drop : float or Quantity, optional
        Pressure after the valve [Pa], or the valve's pressure drop [Pa]; neither: the valve
        is wide open (no step).
    mechanical_efficiency : float
        Mechanical efficiency of each section [-].
    feedwater_inlet : State, optional
        Feedwater entering the feed heater.
    feedwater_mass_flow : float or Quantity, optional
        Feedwater flow [kg/s], with ``feedwater_inlet``.

    Returns
    -------
    ExtractionTurbineResult

    References
    ----------
    ASME PTC 6-2004 (steam turbine sections and extraction); steady-flow energy equation for
    the feed heater (common practice).
    """
    from .machines.heat_exchanger import heat_exchanger

    steps = []
    if valve_outlet_pressure is not None or valve_pressure_drop is not None:
        steps.append(ThrottleValve("inlet valve", P_out=valve_outlet_pressure,
                                   pressure_drop=valve_pressure_drop))
    steps += [
        TurbineSection("HP section", P_out=extraction_pressure,
                       isentropic_efficiency=hp_isentropic_efficiency,
                       mechanical_efficiency=mechanical_efficiency),
        Extraction("extraction", branch_mass_flow=extraction_mass_flow),
        TurbineSection("LP section", P_out=P_out, isentropic_efficiency=lp_isentropic_efficiency,
                       mechanical_efficiency=mechanical_efficiency),
    ]
    result = Train(steps).run(inlet, mass_flow)
    heater = None
    if (feedwater_inlet is None) != (feedwater_mass_flow is None):
        raise SpecificationError("give the feedwater inlet state and its mass flow together")
    if feedwater_inlet is not None:
        bleed = next(s for s in result.stations if s.role == "extraction")
        fluid = bleed.state.fluid
        drain_h = fluid.saturation_states(bleed.state.P)[0].h
        duty = bleed.mass_flow * (bleed.state.h - drain_h)
        if not duty > 0:
            raise SpecificationError("the extraction steam is not above saturated liquid: it "
                                     "cannot heat feedwater")
        heater = heat_exchanger(bleed.state, bleed.mass_flow, feedwater_inlet,
                                feedwater_mass_flow, duty=duty)
        t_sat = fluid.saturation_temperature(bleed.state.P)
        if heater.cold_outlet.T > t_sat:
            raise SpecificationError(
                f"the feedwater would leave the feed heater at {heater.cold_outlet.T:.5g} K, "
                f"above the extraction steam's saturation temperature {t_sat:.5g} K at "
                f"{bleed.state.P / 1e5:.5g} bar: raise the feedwater mass flow or lower the "
                "extraction mass flow")
    return ExtractionTurbineResult(train=result, feed_heater=heater)


__all__ = ["Admission", "CompressorStage", "Cooler", "Extraction", "PipeRun", "PressureLoss",
           "PumpStage", "Station", "StepResult", "ThrottleValve", "Train", "TrainResult",
           "TurbineSection", "run_train", "IntercooledCompressorResult",
           "ExtractionTurbineResult", "intercooled_compressor", "extraction_turbine"]
