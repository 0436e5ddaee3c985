"""Train steps: the machines and devices a train is built from, and its stations.

Every step is a frozen dataclass whose numbers pass through the input boundary
(:mod:`workbench.units`) when it is made, so a wrong entry is refused at once with the step
named.  ``apply(inlet, flow)`` gives ``(result, outlet state, outlet mass flow [kg/s], branch
stations)``.

Pressure ratios are always quoted higher over lower pressure: outlet over inlet for a
:class:`CompressorStage` or :class:`PumpStage`, inlet over outlet for a
:class:`TurbineSection` (common practice); every ratio given is above 1.

References
----------
Steady-flow mass and energy balances of each control volume (common practice).
"""

from __future__ import annotations

import inspect
from dataclasses import dataclass, field

from ..errors import InputError, SpecificationError
from ..machines import checks
from ..machines.heat_exchanger import cooler as _cooler
from ..machines.mixer import MASS_BALANCE_TOLERANCE, mixer, splitter
from ..machines.pipe import pipe_segment
from ..machines.throttle import throttle
from ..machines.turbomachine import energy_balance
from ..properties import State
from ..units import fraction, optional_si, positive, text, to_si

#: Fields of the station table, in order (see :data:`workbench.fields.FIELDS`).
STATION_FIELDS = ("pressure", "temperature", "enthalpy", "entropy", "quality", "mass_flow")
MACHINE_KINDS = ("compressor", "turbine", "pump")


#: A state argument, or an InputError naming it (the devices' check).
check_state = checks.state


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
        """Flat dict of the station: ``station``, ``role``, the :data:`STATION_FIELDS` under
        their field names (SI units, see :data:`workbench.fields.FIELDS`) and ``phase``."""
        st = self.state
        values = {"pressure": st.P, "temperature": st.T, "enthalpy": st.h, "entropy": st.s,
                  "quality": st.quality, "mass_flow": self.mass_flow}
        return {"station": self.name, "role": self.role,
                **{n: values[n] for n in STATION_FIELDS}, "phase": st.phase}


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

    @property
    def branch(self) -> Station | None:
        """The branch leaving or joining at this step (extraction, admission), else None."""
        return next((s for s in self.stations if s.role != "main"), None)


# ----------------------------------------------------------------------------- helpers
def _set(step, **values):
    for key, value in values.items():
        object.__setattr__(step, key, value)


def _common(step):
    """Check the name and the stated mass flow of any step."""
    name = text(step.name, "train step name")
    mass_flow = optional_si(step.mass_flow, "mass_flow", f"mass flow of step {name!r}",
                            low=0.0, low_open=True)
    _set(step, name=name, mass_flow=mass_flow)


def _exactly_one(step, a, b, what):
    if (a is None) == (b is None):
        raise SpecificationError(f"step {step.name!r} needs its {what} (exactly one)")


class _Step:
    """What every step does: check a stated mass flow against the train, then act.

    A step with one inlet and one outlet passing the whole flow on defines
    ``_device(inlet, flow)`` (returning a result with an ``outlet``); a split or merge
    defines ``_apply`` itself.
    """

    def apply(self, inlet, flow):
        """``(result, outlet state, outlet mass flow [kg/s], branch stations)``."""
        if self.mass_flow is not None and abs(self.mass_flow - flow) > \
                MASS_BALANCE_TOLERANCE * max(flow, 1e-30):
            raise SpecificationError(
                f"the mass balance does not close at step {self.name!r}: the train carries "
                f"{flow:.9g} kg/s there but the step's mass flow is given as "
                f"{self.mass_flow:.9g} kg/s (allowed difference {MASS_BALANCE_TOLERANCE:g} "
                "relative)")
        return self._apply(inlet, flow)

    def _apply(self, inlet, flow):
        result = self._device(inlet, flow)
        return result, result.outlet, flow, ()


# ----------------------------------------------------------------------------- machines
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

    def __post_init__(self):
        _common(self)
        name = self.name
        basis = "inlet over outlet" if self.kind == "turbine" else "outlet over inlet"
        ratio = optional_si(self.pressure_ratio, "dimensionless",
                            f"pressure ratio of step {name!r}")
        if ratio is not None and not ratio > 1:
            raise InputError(f"pressure ratio of step {name!r} is {ratio:g}; it is quoted higher "
                             f"over lower pressure ({basis} for a {self.kind}) and must be above 1")
        P2 = optional_si(self.P_out, "pressure", f"outlet pressure of step {name!r}", low=0.0,
                         low_open=True)
        _exactly_one(self, P2, ratio, "outlet pressure or its pressure ratio")
        eta_s = None if self.isentropic_efficiency is None else fraction(
            self.isentropic_efficiency, f"isentropic efficiency of step {name!r}")
        eta_p = None if self.polytropic_efficiency is None else fraction(
            self.polytropic_efficiency, f"polytropic efficiency of step {name!r}")
        _exactly_one(self, eta_s, eta_p, "isentropic or polytropic efficiency")
        _set(self, P_out=P2, pressure_ratio=ratio, isentropic_efficiency=eta_s,
             polytropic_efficiency=eta_p,
             mechanical_efficiency=fraction(self.mechanical_efficiency,
                                            f"mechanical efficiency of step {name!r}"),
             heat_loss=to_si(self.heat_loss, "power", f"heat loss of step {name!r}"))

    def outlet_pressure(self, inlet: State) -> float:
        """Outlet pressure [Pa] from ``inlet``: ``P_out``, or the ratio the right way round."""
        if self.pressure_ratio is None:
            return self.P_out
        if self.kind == "turbine":
            return inlet.P / self.pressure_ratio
        return inlet.P * self.pressure_ratio

    def _device(self, inlet, flow):
        return energy_balance(
            self.kind, inlet, P_out=self.outlet_pressure(inlet),
            isentropic_efficiency=self.isentropic_efficiency,
            polytropic_efficiency=self.polytropic_efficiency, mass_flow=flow,
            heat_loss=self.heat_loss, mechanical_efficiency=self.mechanical_efficiency)


@dataclass(frozen=True)
class CompressorStage(_MachineStep):
    """A compressor stage (or section).

    Give ``P_out`` [Pa] or ``pressure_ratio`` [-] (outlet over inlet, above 1) and one
    efficiency [-]; ``mechanical_efficiency`` [-], ``heat_loss`` [W]; ``mass_flow`` [kg/s],
    if given, is checked against the train.

    Examples
    --------
    >>> CompressorStage("stage 1", pressure_ratio=3, isentropic_efficiency=0.8).pressure_ratio
    3.0
    """

    kind = "compressor"


@dataclass(frozen=True)
class TurbineSection(_MachineStep):
    """A turbine section.

    Give ``P_out`` [Pa] or ``pressure_ratio`` [-], quoted higher over lower pressure as for
    every machine: for a turbine that is inlet over outlet (above 1), so a ratio of 4 from
    8 bar ends at 2 bar.  Efficiencies and the rest as for :class:`CompressorStage`.

    Examples
    --------
    >>> TurbineSection("HP", pressure_ratio=4, isentropic_efficiency=0.85).pressure_ratio
    4.0
    """

    kind = "turbine"


@dataclass(frozen=True)
class PumpStage(_MachineStep):
    """A pump stage.  Give ``P_out`` [Pa] or ``pressure_ratio`` [-] (outlet over inlet) and
    an efficiency, as for :class:`CompressorStage`."""

    kind = "pump"


# ----------------------------------------------------------------------------- devices
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

    def __post_init__(self):
        _common(self)
        n = self.name
        water = [optional_si(t, "temperature", f"cooling water {end} temperature of step {n!r}",
                             low=0.0, low_open=True)
                 for t, end in ((self.cooling_water_inlet_temperature, "inlet"),
                                (self.cooling_water_outlet_temperature, "outlet"))]
        _set(self, outlet_temperature=positive(self.outlet_temperature, "temperature",
                                               f"cooler outlet temperature of step {n!r}"),
             pressure_drop=to_si(self.pressure_drop, "pressure", f"pressure drop of step {n!r}",
                                 low=0.0),
             cooling_water_inlet_temperature=water[0], cooling_water_outlet_temperature=water[1])

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

    def __post_init__(self):
        _common(self)
        P2 = optional_si(self.P_out, "pressure", f"outlet pressure of step {self.name!r}",
                         low=0.0, low_open=True)
        dP = optional_si(self.pressure_drop, "pressure", f"pressure drop of step {self.name!r}",
                         low=0.0, low_open=True)
        _exactly_one(self, P2, dP, "outlet pressure or its pressure drop")
        _set(self, P_out=P2, pressure_drop=dP)

    def _device(self, inlet, flow):
        P2 = self.P_out
        if self.pressure_drop is not None:
            if not self.pressure_drop < inlet.P:
                raise InputError(
                    f"pressure drop of step {self.name!r} is {self.pressure_drop / 1e5:.6g} bar; "
                    f"it must lie in (0, {inlet.P / 1e5:.6g}) bar, below the inlet pressure")
            P2 = inlet.P - self.pressure_drop
        return throttle(inlet, flow, P_out=P2)


@dataclass(frozen=True)
class PressureLoss(ThrottleValve):
    """A pressure drop without work or heat (knock-out drum, strainer, piping): isenthalpic.
    Give ``pressure_drop`` [Pa]."""

    kind = "pressure loss"


#: Keyword arguments of :func:`~workbench.machines.pipe.pipe_segment` a :class:`PipeRun`
#: passes on (its ``options``).
PIPE_OPTIONS = tuple(name for name, p in inspect.signature(pipe_segment).parameters.items()
                     if p.kind is inspect.Parameter.KEYWORD_ONLY)


@dataclass(frozen=True)
class PipeRun(_Step):
    """A liquid pipe segment of ``diameter`` [m]; ``options`` are the keyword arguments of
    :func:`workbench.machines.pipe.pipe_segment` (length, elevation_change, viscosity...)."""

    name: str
    diameter: object
    options: dict = field(default_factory=dict)
    mass_flow: object = None
    kind = "pipe"

    def __post_init__(self):
        _common(self)
        if not isinstance(self.options, dict) or not all(isinstance(k, str)
                                                         for k in self.options):
            raise InputError(f"options of pipe {self.name!r} must be a dict of keyword "
                             "arguments of pipe_segment")
        unknown = sorted(set(self.options) - set(PIPE_OPTIONS))
        if unknown:
            raise InputError(f"options of pipe {self.name!r}: unknown option(s) "
                             f"{', '.join(map(repr, unknown))}; choose from "
                             f"{', '.join(PIPE_OPTIONS)}")
        _set(self, diameter=positive(self.diameter, "length", f"diameter of step {self.name!r}"),
             options=dict(self.options))

    def _device(self, inlet, flow):
        return pipe_segment(inlet, flow, self.diameter, **self.options)


# ----------------------------------------------------------------------------- splits, merges
@dataclass(frozen=True)
class Extraction(_Step):
    """A branch leaving the train (bleed, extraction): give its ``branch_mass_flow``
    [kg/s] or its ``fraction`` [-] of the flow arriving, in [0, 1): flow must be left for
    the next step."""

    name: str
    branch_mass_flow: object = None
    fraction: object = None
    mass_flow: object = None
    kind = "extraction"

    def __post_init__(self):
        _common(self)
        n = self.name
        f = optional_si(self.fraction, "dimensionless", f"split fraction of step {n!r}", low=0.0,
                        high=1.0)
        if f == 1.0:
            raise InputError(f"split fraction of step {n!r} is 1: the branch would take the whole "
                             "flow, leaving none for the next step; it must lie in [0, 1)")
        b = optional_si(self.branch_mass_flow, "mass_flow", f"branch mass flow of step {n!r}",
                        low=0.0)
        _exactly_one(self, b, f, "branch mass flow or its fraction")
        _set(self, fraction=f, branch_mass_flow=b)

    def _apply(self, inlet, flow):
        if self.fraction is not None:
            result = splitter(inlet, flow, fractions=[self.fraction, None])
        else:
            if not self.branch_mass_flow < flow:
                raise SpecificationError(
                    f"the mass balance does not close at extraction {self.name!r}: the branch "
                    f"mass flow {self.branch_mass_flow:.6g} kg/s must lie in [0, {flow:.6g}) "
                    "kg/s, below the flow arriving")
            result = splitter(inlet, flow, branch_mass_flows=[self.branch_mass_flow, None])
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

    def __post_init__(self):
        _common(self)
        check_state(self.state, f"state of admission {self.name!r}")
        if self.branch_mass_flow is None:
            raise SpecificationError(f"admission {self.name!r} needs its branch mass flow")
        _set(self, branch_mass_flow=positive(self.branch_mass_flow, "mass_flow",
                                             f"branch mass flow of step {self.name!r}"))

    def _apply(self, inlet, flow):
        result = mixer([(inlet, flow), (self.state, self.branch_mass_flow)])
        return result, result.outlet, result.mass_flow, (
            Station(f"{self.name} branch", self.state, result.inlet_mass_flows[1],
                    "admission"),)


__all__ = ["MACHINE_KINDS", "Station", "StepResult", "CompressorStage", "TurbineSection",
           "PumpStage", "Cooler", "ThrottleValve", "PressureLoss", "PipeRun", "Extraction",
           "Admission", "check_state"]
