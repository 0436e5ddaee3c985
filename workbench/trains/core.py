"""Machine trains: machines and devices in series, with splits and merges on the way.

A :class:`Train` is an ordered list of steps (:mod:`workbench.trains.steps`) acting on one
main stream.  Every station (the inlet, each step's outlet, each branch) is kept, so the
result gives the station table, each machine's result and the totals.  Table columns come
from the one table of result fields, :data:`workbench.fields.FIELDS`.

Powers: a machine result's ``power`` is the fluid power and its ``shaft_power`` the power
at the coupling; the train's totals are shaft powers and say so in their names
(``absorbed_shaft_power``, ``delivered_shaft_power``, ``net_shaft_power``).

References
----------
Steady-flow mass and energy balances of each control volume (common practice).
ASME PTC 10-1997 (compressor sections with intercooling); ASME PTC 6-2004 (steam turbines
with extraction).
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from .. import fields
from ..errors import InputError, SpecificationError, WorkbenchError
from ..fields import FIELDS
from ..machines.mixer import MASS_BALANCE_TOLERANCE
from ..machines.turbomachine import MachineResult
from ..properties import State
from ..units import positive
from .steps import MACHINE_KINDS, STATION_FIELDS, Station, StepResult, check_state

#: Fields of the machine table, in order.
MACHINE_FIELDS = ("inlet_pressure", "outlet_pressure", "pressure_ratio", "inlet_temperature",
                  "outlet_temperature", "mass_flow", "isentropic_efficiency", "specific_work",
                  "power", "shaft_power", "outlet_quality")
#: Fields of :meth:`TrainResult.totals`, in order (shaft powers, heat and flows).
TOTAL_FIELDS = ("absorbed_shaft_power", "delivered_shaft_power", "net_shaft_power",
                "heat_removed", "cooling_water_mass_flow", "inlet_mass_flow",
                "outlet_mass_flow", "extracted_mass_flow", "admitted_mass_flow")


def station_row(station: Station) -> dict:
    """Flat dict of a station (:meth:`Station.to_dict`)."""
    return station.to_dict()


def machine_row(result: MachineResult) -> dict:
    """Flat dict of a machine's main numbers: ``kind``, then the :data:`MACHINE_FIELDS`
    under their field names (SI units), as in :meth:`MachineResult.to_dict`.

    The pressure ratio is higher over lower pressure for every machine (outlet over inlet
    for a compressor or pump, inlet over outlet for a turbine), as the field describes.
    """
    return {"kind": result.kind, **fields.row(result, MACHINE_FIELDS)}


def _summary(step: StepResult) -> dict:
    """A short flat dict of a step's result (machines: the main numbers, not every one)."""
    if isinstance(step.result, MachineResult):
        return machine_row(step.result)
    d = dict(step.result.to_dict())
    d["kind"] = step.kind
    d.pop("device", None)
    return d


def _frame(rows, columns, headers):
    import pandas as pd

    frame = pd.DataFrame(rows, columns=columns).set_index(columns[0])
    if headers:
        frame = frame.rename(columns={n: FIELDS[n].header() for n in columns if n in FIELDS})
    return frame


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

    def step(self, name: str) -> StepResult:
        """The result of the step called ``name`` (an InputError lists the names)."""
        for record in self.steps:
            if record.name == name:
                return record
        raise InputError(f"no step {name!r} in this train: its steps are "
                         + ", ".join(repr(s.name) for s in self.steps))

    @property
    def branches(self) -> tuple:
        """The stations of the branches leaving and joining, in order."""
        return tuple(s for s in self.stations if s.role != "main")

    @property
    def machines(self) -> dict:
        """Each machine's :class:`MachineResult`, by step name."""
        return {s.name: s.result for s in self.steps if s.kind in MACHINE_KINDS}

    @property
    def absorbed_shaft_power(self) -> float:
        """Shaft power taken by the compressors and pumps [W]."""
        return math.fsum(s.result.shaft_power for s in self.steps
                         if s.kind in ("compressor", "pump"))

    @property
    def delivered_shaft_power(self) -> float:
        """Shaft power given by the turbine sections [W]."""
        return math.fsum(s.result.shaft_power for s in self.steps if s.kind == "turbine")

    @property
    def net_shaft_power(self) -> float:
        """Delivered minus absorbed shaft power [W] (negative for a driven train)."""
        return self.delivered_shaft_power - self.absorbed_shaft_power

    #: Same as :attr:`absorbed_shaft_power` (the name of earlier versions).
    absorbed_power = absorbed_shaft_power
    #: Same as :attr:`delivered_shaft_power` (the name of earlier versions).
    delivered_power = delivered_shaft_power
    #: Same as :attr:`net_shaft_power` (the name of earlier versions).
    net_power = net_shaft_power

    @property
    def heat_removed(self) -> float:
        """Heat taken out by the coolers [W]."""
        return math.fsum(s.result.duty for s in self.steps if s.kind == "cooler")

    @property
    def cooling_water_mass_flow(self) -> float:
        """Cooling water needed by the coolers that were given water temperatures [kg/s]
        (NaN when none was)."""
        flows = [s.result.cooling_water_mass_flow for s in self.steps if s.kind == "cooler"]
        flows = [f for f in flows if not math.isnan(f)]
        return math.fsum(flows) if flows else math.nan

    @property
    def outlet(self) -> State:
        """Main-line outlet state."""
        return [s for s in self.stations if s.role == "main"][-1].state

    def totals(self) -> dict:
        """The train's totals: the :data:`TOTAL_FIELDS` under their field names, SI units.

        Earlier versions put the unit in the key (``net_shaft_power_W``,
        ``extracted_mass_flow_kg_per_s``); units, labels and formats are now in
        :data:`workbench.fields.FIELDS`, as for every result.
        """
        return fields.row(self, TOTAL_FIELDS)

    def to_dict(self) -> dict:
        """``{"stations": [...], "steps": [...], "totals": {...}}`` of flat dicts."""
        return {
            "stations": [station_row(s) for s in self.stations],
            "steps": [{"step": s.name, "kind": s.kind, **_summary(s)} for s in self.steps],
            "totals": self.totals(),
        }

    def stations_frame(self, headers: bool = False):
        """The station table as a pandas DataFrame (one row per station, SI units).

        Columns: ``role``, the :data:`STATION_FIELDS` under their field names (``pressure``,
        ``mass_flow``...) and ``phase``; with ``headers`` the field columns carry their
        labels with units instead (``"pressure [Pa]"``, from :data:`workbench.fields.FIELDS`).
        """
        columns = ["station", "role", *STATION_FIELDS, "phase"]
        return _frame([station_row(s) for s in self.stations], columns, headers)

    def machines_frame(self, headers: bool = False):
        """One row per machine (compressor, turbine, pump) as a pandas DataFrame, SI units.

        ``power`` is the fluid power and ``shaft_power`` the power at the coupling;
        ``pressure_ratio`` is higher over lower pressure.  ``headers`` as for
        :meth:`stations_frame`.
        """
        rows = [{"step": s.name, **machine_row(s.result)} for s in self.steps
                if s.kind in MACHINE_KINDS]
        columns = ["step", "kind", *MACHINE_FIELDS]
        return _frame(rows, columns, headers)

    def devices_frame(self):
        """One row per device step (coolers, valves, pipes, branches), SI units."""
        import pandas as pd

        rows = [{"step": s.name, **_summary(s)} for s in self.steps
                if s.kind not in MACHINE_KINDS]
        return pd.DataFrame(rows).set_index("step") if rows else pd.DataFrame()


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
    >>> from workbench.trains import CompressorStage, Cooler
    >>> train = Train([CompressorStage("stage 1", pressure_ratio=3, isentropic_efficiency=0.8),
    ...                Cooler("intercooler", outlet_temperature=308.15, pressure_drop=0.2e5),
    ...                CompressorStage("stage 2", P_out=8e5, isentropic_efficiency=0.8)])
    >>> train
    Train(['stage 1', 'intercooler', 'stage 2'])
    """

    def __init__(self, steps):
        if isinstance(steps, (str, bytes)) or not hasattr(steps, "__iter__"):
            raise InputError(f"train steps must be a list of steps, not {type(steps).__name__}")
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
        inlet = check_state(inlet, "train inlet")
        m0 = positive(mass_flow, "mass_flow", "train inlet mass flow")
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
    """Shorthand for ``Train(steps).run(inlet, mass_flow)``.

    Examples
    --------
    >>> from workbench import Fluid
    >>> from workbench.trains import ThrottleValve
    >>> steam = Fluid("Water").state(P=15e5, T=573.15)
    >>> r = run_train(steam, 2.0, [ThrottleValve("valve", pressure_drop=5e5)])
    >>> round(r.outlet.P)
    1000000
    """
    return Train(steps).run(inlet, mass_flow)


__all__ = ["MACHINE_FIELDS", "STATION_FIELDS", "TOTAL_FIELDS", "Train", "TrainResult",
           "machine_row", "run_train", "station_row"]
