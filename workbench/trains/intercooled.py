"""A compressor in stages with intercoolers: :func:`intercooled_compressor`.

References
----------
For an ideal gas with perfect intercooling and equal stage efficiencies the total work is
least with equal stage ratios, P_intermediate = sqrt(P1 P2) for two stages (common practice);
ASME PTC 10-1997 for the stage energy balances.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from .. import fields
from ..errors import InputError, SpecificationError
from ..properties import State
from ..units import choice, count, flag, optional_si, to_si
from .core import Train, TrainResult
from .steps import CompressorStage, Cooler, PressureLoss, check_state

#: How the stage ratios may be chosen, besides a list of ratios.
STAGE_RATIO_OPTIONS = ("equal", "optimal")
#: Fields added to the train totals by :meth:`IntercooledCompressorResult.to_dict`.
INTERCOOLED_TOTAL_FIELDS = ("total_shaft_power", "stage_pressure_ratios", "stage_shaft_powers")


def _per_item(value, n: int, name: str) -> list:
    """A scalar repeated ``n`` times, or a sequence of exactly ``n`` values."""
    if isinstance(value, (list, tuple, np.ndarray)):
        if len(value) != n:
            raise InputError(f"{name} has {len(value)} values; {n} are needed (one each)")
        return list(value)
    return [value] * n


@dataclass(frozen=True, eq=False)
class IntercooledCompressorResult:
    """Result of :func:`intercooled_compressor`.  SI units.

    Attributes
    ----------
    train : TrainResult
        Every station, stage and cooler.
    stage_pressure_ratios : tuple of float
        Discharge over suction pressure of each stage [-] (each stage's
        ``MachineResult.pressure_ratio``).
    method : str
        ``"equal"``, ``"optimal"`` or ``"given"``: how the stage ratios were chosen.
    """

    train: TrainResult
    stage_pressure_ratios: tuple
    method: str

    @property
    def stage_shaft_powers(self) -> tuple:
        """Shaft power of each stage [W] (each stage's fluid power is
        ``train.machines[name].power``)."""
        return tuple(r.shaft_power for r in self.train.machines.values())

    #: Same as :attr:`stage_shaft_powers` (the name of earlier versions).
    stage_powers = stage_shaft_powers

    @property
    def total_shaft_power(self) -> float:
        """Shaft power of all stages [W]."""
        return self.train.absorbed_shaft_power

    #: Same as :attr:`total_shaft_power`: the shaft power of all stages [W].
    total_power = total_shaft_power

    @property
    def intermediate_pressures(self) -> tuple:
        """Discharge pressure of each stage but the last [Pa]."""
        return tuple(r.outlet.P for r in list(self.train.machines.values())[:-1])

    def to_dict(self) -> dict:
        """Train dict (:meth:`TrainResult.to_dict`) with ``method``, ``total_shaft_power``,
        ``stage_pressure_ratios`` and ``stage_shaft_powers`` (lists, one value per stage)
        added to the totals; keys are field names of :data:`workbench.fields.FIELDS`.

        Earlier versions used unit-suffixed keys and one key per stage
        (``total_shaft_power_W``, ``stage_1_shaft_power_W``, ``stage_1_pressure_ratio``).
        """
        d = self.train.to_dict()
        d["totals"]["method"] = self.method
        for name, value in fields.row(self, INTERCOOLED_TOTAL_FIELDS).items():
            d["totals"][name] = list(value) if isinstance(value, tuple) else value
        return d

    def stations_frame(self, headers: bool = False):
        """Station table (see :meth:`TrainResult.stations_frame`)."""
        return self.train.stations_frame(headers)

    def machines_frame(self, headers: bool = False):
        """Stage table (see :meth:`TrainResult.machines_frame`)."""
        return self.train.machines_frame(headers)


@dataclass(frozen=True)
class _Plan:
    """The checked inputs of an intercooled compressor, SI units."""

    inlet: State
    mass_flow: object
    P2: float
    n: int
    etas_s: list
    etas_p: list
    t_cool: list
    drops: list
    ko: list
    aftercooler: bool
    aftercooler_drop: object
    water: dict
    mechanical_efficiency: object

    def build(self, ratios) -> Train:
        """The train for the first ``n - 1`` stage ratios (the last stage closes on P2)."""
        steps = []
        for i in range(self.n):
            last = i == self.n - 1
            steps.append(CompressorStage(
                f"stage {i + 1}", P_out=self.P2 if last else None,
                pressure_ratio=None if last else ratios[i],
                isentropic_efficiency=self.etas_s[i], polytropic_efficiency=self.etas_p[i],
                mechanical_efficiency=self.mechanical_efficiency))
            if not last:
                steps.append(Cooler(f"intercooler {i + 1}", self.t_cool[i],
                                    pressure_drop=self.drops[i], **self.water))
                if self.ko[i] > 0:
                    steps.append(PressureLoss(f"knock-out drum {i + 1}",
                                              pressure_drop=self.ko[i]))
        if self.aftercooler:
            steps.append(Cooler("aftercooler", self.t_cool[-1],
                                pressure_drop=self.aftercooler_drop, **self.water))
        return Train(steps)

    def run(self, ratios) -> TrainResult:
        return self.build(ratios).run(self.inlet, self.mass_flow)

    def last_suction(self, ratios) -> float:
        """Suction pressure of the last stage [Pa] (not positive when the drops eat it)."""
        P = self.inlet.P
        for i in range(self.n - 1):
            P = P * ratios[i] - self.drops[i] - self.ko[i]
            if P <= 0:
                return P
        return P


def _plan(inlet, mass_flow, P_out, pressure_ratio, stages, isentropic_efficiency,
          polytropic_efficiency, cooler_outlet_temperature, cooler_pressure_drop,
          knockout_pressure_drop, aftercooler, aftercooler_pressure_drop, water,
          mechanical_efficiency) -> _Plan:
    inlet = check_state(inlet, "compressor suction state")
    n = count(stages, "number of stages", low=1, high=8)
    aftercooler = flag(aftercooler, "aftercooler")
    P2 = optional_si(P_out, "pressure", "discharge pressure", low=0.0, low_open=True)
    ratio = optional_si(pressure_ratio, "dimensionless", "overall pressure ratio", low=1.0,
                        low_open=True)
    if (P2 is None) == (ratio is None):
        raise SpecificationError("give the discharge pressure or the overall pressure ratio "
                                 "(exactly one)")
    P2 = inlet.P * ratio if P2 is None else P2
    if not P2 > inlet.P:
        raise InputError(f"discharge pressure {P2 / 1e5:.6g} bar must be above the suction "
                         f"pressure {inlet.P / 1e5:.6g} bar")
    n_coolers = max(n - 1 + (1 if aftercooler else 0), 1)
    gaps = max(n - 1, 1)
    drops = [to_si(d, "pressure", "cooler pressure drop", low=0.0)
             for d in _per_item(cooler_pressure_drop, gaps, "cooler pressure drop")]
    ko = [to_si(d, "pressure", "knock-out pressure drop", low=0.0)
          for d in _per_item(knockout_pressure_drop, gaps, "knock-out pressure drop")]
    return _Plan(inlet=inlet, mass_flow=mass_flow, P2=P2, n=n,
                 etas_s=_per_item(isentropic_efficiency, n, "isentropic efficiency"),
                 etas_p=_per_item(polytropic_efficiency, n, "polytropic efficiency"),
                 t_cool=_per_item(cooler_outlet_temperature, n_coolers,
                                  "cooler outlet temperature"),
                 drops=drops, ko=ko, aftercooler=aftercooler,
                 aftercooler_drop=aftercooler_pressure_drop, water=water,
                 mechanical_efficiency=mechanical_efficiency)


def _equal_ratios(plan: _Plan) -> list:
    """One stage ratio for all stages but the last, so that the last one is the same."""
    from scipy.optimize import brentq

    n, P2 = plan.n, plan.P2

    def gap(log_r):
        r = math.exp(log_r)
        P = plan.last_suction([r] * (n - 1))
        return (P * r - P2) / P2 if P > 0 else -1.0

    hi = math.log(P2 / plan.inlet.P)
    while gap(hi) < 0:
        hi *= 1.5
        if hi > 50:
            raise SpecificationError("the pressure drops between stages are too large for "
                                     "any stage ratio to reach the discharge pressure")
    return [math.exp(brentq(gap, 1e-9, hi, xtol=1e-13))] * (n - 1)


def _optimal_ratios(plan: _Plan, start: list) -> list:
    """The stage ratios of least total shaft power (Nelder-Mead from ``start``)."""
    from scipy.optimize import minimize

    base = plan.run(start).absorbed_shaft_power

    def total(x):
        rs = [math.exp(v) for v in x]
        if any(r <= 1 for r in rs) or not plan.last_suction(rs) < plan.P2:
            return 1e6
        try:
            return plan.run(rs).absorbed_shaft_power / base
        except (InputError, SpecificationError):
            return 1e6

    found = minimize(total, np.log(start), method="Nelder-Mead",
                     options={"xatol": 1e-9, "fatol": 1e-13, "maxiter": 4000})
    return [math.exp(v) for v in found.x]


def _given_ratios(stage_ratios, n: int) -> list:
    if not isinstance(stage_ratios, (list, tuple, np.ndarray)):
        raise InputError(f"stage ratios must be 'equal', 'optimal' or a list of {n - 1} "
                         f"ratios, not {type(stage_ratios).__name__}")
    given = _per_item(list(stage_ratios), n - 1, "stage ratios")
    ratios = [to_si(r, "dimensionless", f"stage ratio {i + 1} (pressure ratio of stage "
                    f"{i + 1})", low=1.0, low_open=True) for i, r in enumerate(given)]
    return ratios


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
        ``total_shaft_power`` (also ``total_power``) and ``stage_powers`` are shaft powers.

    References
    ----------
    For an ideal gas with perfect intercooling and equal stage efficiencies the total work is
    least with equal stage ratios, P_intermediate = sqrt(P1 P2) for two stages (common
    practice); ASME PTC 10-1997 for the stage energy balances.

    Examples
    --------
    >>> from workbench import Fluid
    >>> air = Fluid("Air").state(P=1e5, T=298.15)
    >>> r = intercooled_compressor(air, 3.0, P_out=9e5, stages=2, isentropic_efficiency=0.8,
    ...                            cooler_outlet_temperature=308.15)
    >>> [round(x, 3) for x in r.stage_pressure_ratios]
    [3.0, 3.0]
    """
    water = dict(cooling_water_inlet_temperature=cooling_water_inlet_temperature,
                 cooling_water_outlet_temperature=cooling_water_outlet_temperature)
    plan = _plan(inlet, mass_flow, P_out, pressure_ratio, stages, isentropic_efficiency,
                 polytropic_efficiency, cooler_outlet_temperature, cooler_pressure_drop,
                 knockout_pressure_drop, aftercooler, aftercooler_pressure_drop, water,
                 mechanical_efficiency)
    if plan.n == 1:
        method, ratios = "given", []
    elif isinstance(stage_ratios, str):
        method = choice(stage_ratios, STAGE_RATIO_OPTIONS, "stage ratios")
        ratios = _equal_ratios(plan)
        if method == "optimal":
            ratios = _optimal_ratios(plan, ratios)
    else:
        method, ratios = "given", _given_ratios(stage_ratios, plan.n)
    result = plan.run(ratios)
    stage_ratios_out = tuple(r.pressure_ratio for r in result.machines.values())
    return IntercooledCompressorResult(train=result, stage_pressure_ratios=stage_ratios_out,
                                       method=method)


__all__ = ["IntercooledCompressorResult", "STAGE_RATIO_OPTIONS", "intercooled_compressor"]
