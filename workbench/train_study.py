"""Train studies: an intercooled compressor or an extraction steam turbine from plain inputs.

What the train panel shows, as plain functions over SI values: :func:`train_study` checks a
scenario's inputs through the input boundary (:mod:`workbench.units`), builds the inlet
state and runs :func:`workbench.trains.intercooled_compressor` or
:func:`workbench.trains.extraction_turbine`; :func:`train_values` reads the result fields of
:data:`workbench.fields.FIELDS` the panel shows, :func:`train_stations` the station table and
:func:`train_series` the chart series.  Steam is computed with IAPWS-IF97 (the industrial
formulation, common practice for steam-turbine work); gases with CoolProp's reference
equations of state.

References
----------
ASME PTC 10-1997 (compressor sections with intercooling); ASME PTC 6-2004 (steam turbines);
IAPWS R7-97(2012), Revised Release on the IAPWS Industrial Formulation 1997.

Examples
--------
>>> r = train_study("intercooled compressor", {"stages": 2})
>>> len(r.stage_pressure_ratios)
2
"""

from __future__ import annotations

import math

from .errors import InputError, WorkbenchError
from .properties import Fluid
from .trains import extraction_turbine, intercooled_compressor
from .units import choice, count, fraction, not_negative, positive

SCENARIOS = ("intercooled compressor", "extraction turbine")

#: Gases offered for the compressor.
GASES = ("Air", "Nitrogen", "CarbonDioxide", "Methane")
STAGES = (1, 2, 3, 4, 5, 6)
RATIO_METHODS = ("equal", "optimal")

#: Compressor inputs: key -> (kind of quantity, SI default).  Demo scenario: an
#: instrument-air compressor in three stages (values invented for the demo).
COMPRESSOR_INPUTS = {
    "suction_pressure": ("pressure", 1.0e5),
    "suction_temperature": ("temperature", 298.15),
    "discharge_pressure": ("pressure", 9.0e5),
    "mass_flow": ("mass_flow", 1.5),
    "isentropic_efficiency": ("dimensionless", 0.80),
    "cooler_outlet_temperature": ("temperature", 308.15),
    "cooler_pressure_drop": ("pressure", 0.1e5),
    "knockout_pressure_drop": ("pressure", 0.05e5),
}

#: Turbine inputs.  Demo scenario: a paper-mill back-pressure turbine with a process steam
#: extraction (values invented for the demo).
TURBINE_INPUTS = {
    "inlet_pressure": ("pressure", 42.0e5),
    "inlet_temperature": ("temperature", 713.15),
    "valve_outlet_pressure": ("pressure", 38.0e5),
    "extraction_pressure": ("pressure", 12.0e5),
    "exhaust_pressure": ("pressure", 4.0e5),
    "steam_flow": ("mass_flow", 12.0),
    "extraction_flow": ("mass_flow", 4.0),
    "hp_efficiency": ("dimensionless", 0.78),
    "lp_efficiency": ("dimensionless", 0.75),
}

#: Options of the compressor: key -> (options, default).
COMPRESSOR_OPTIONS = {"gas": (GASES, "Air"), "stages": (STAGES, 3),
                      "stage_ratios": (RATIO_METHODS, "optimal")}

#: Result fields of a train study shown by the panel (:data:`workbench.fields.FIELDS`).
TRAIN_FIELDS = ("total_shaft_power", "heat_removed", "outlet_temperature", "outlet_quality",
                "stage_pressure_ratios")

_DROPS = {"cooler_pressure_drop", "knockout_pressure_drop"}
_FLUIDS: dict = {}


def default_inputs(scenario: str) -> dict:
    """The demo inputs (SI) of a scenario."""
    scenario = choice(scenario, SCENARIOS, "train scenario")
    if scenario == SCENARIOS[0]:
        out = {key: default for key, (_kind, default) in COMPRESSOR_INPUTS.items()}
        out.update({key: default for key, (_options, default) in COMPRESSOR_OPTIONS.items()})
        return out
    return {key: default for key, (_kind, default) in TURBINE_INPUTS.items()}


def check_inputs(scenario: str, inputs: dict) -> dict:
    """A scenario's inputs checked through the input boundary, defaults filled in.

    Raises
    ------
    InputError
        Unknown scenario or key, or a value refused (named).
    """
    scenario = choice(scenario, SCENARIOS, "train scenario")
    if not isinstance(inputs, dict):
        raise InputError(f"train inputs must be a dict, not {type(inputs).__name__}")
    numbers = COMPRESSOR_INPUTS if scenario == SCENARIOS[0] else TURBINE_INPUTS
    options = COMPRESSOR_OPTIONS if scenario == SCENARIOS[0] else {}
    unknown = sorted(str(k)[:40] for k in inputs if k not in numbers and k not in options)
    if unknown:
        raise InputError(f"unknown {scenario} input(s): {', '.join(map(repr, unknown[:5]))}")
    out = default_inputs(scenario)
    out.update(inputs)
    for key, (kind, _default) in numbers.items():
        name = key.replace("_", " ")
        if kind == "dimensionless":
            out[key] = fraction(out[key], name)
        elif key in _DROPS:
            out[key] = not_negative(out[key], kind, name)
        else:
            out[key] = positive(out[key], kind, name)
    if options:
        out["gas"] = choice(out["gas"], GASES, "gas")
        out["stages"] = count(out["stages"], "stages", low=1, high=max(STAGES))
        out["stage_ratios"] = choice(out["stage_ratios"], RATIO_METHODS, "stage ratios")
    return out


def _fluid(name: str) -> Fluid:
    if name not in _FLUIDS:
        _FLUIDS[name] = Fluid("Water", backend="IF97") if name == "Water" else Fluid(name)
    return _FLUIDS[name]


def train_study(scenario: str, inputs: dict):
    """Run a train scenario from its inputs (SI; missing keys take the demo values).

    Parameters
    ----------
    scenario : {"intercooled compressor", "extraction turbine"}
        The train.
    inputs : dict
        Keys of :data:`COMPRESSOR_INPUTS` and :data:`COMPRESSOR_OPTIONS`, or of
        :data:`TURBINE_INPUTS`; efficiencies are fractions.

    Returns
    -------
    IntercooledCompressorResult or ExtractionTurbineResult

    Raises
    ------
    WorkbenchError
        A refused input (named) or a train the core refuses.

    References
    ----------
    ASME PTC 10-1997; ASME PTC 6-2004.
    """
    scenario = choice(scenario, SCENARIOS, "train scenario")
    v = check_inputs(scenario, inputs)
    if scenario == SCENARIOS[0]:
        suction = _fluid(v["gas"]).state(P=v["suction_pressure"], T=v["suction_temperature"])
        return intercooled_compressor(
            suction, v["mass_flow"], P_out=v["discharge_pressure"], stages=v["stages"],
            isentropic_efficiency=v["isentropic_efficiency"],
            cooler_outlet_temperature=v["cooler_outlet_temperature"],
            cooler_pressure_drop=v["cooler_pressure_drop"],
            knockout_pressure_drop=v["knockout_pressure_drop"], stage_ratios=v["stage_ratios"])
    inlet = _fluid("Water").state(P=v["inlet_pressure"], T=v["inlet_temperature"])
    return extraction_turbine(
        inlet, v["steam_flow"], v["exhaust_pressure"],
        valve_outlet_pressure=v["valve_outlet_pressure"],
        extraction_pressure=v["extraction_pressure"], extraction_mass_flow=v["extraction_flow"],
        hp_isentropic_efficiency=v["hp_efficiency"], lp_isentropic_efficiency=v["lp_efficiency"])


def stage_ratios_high_over_low(result) -> tuple:
    """Pressure ratio of each stage or section, higher over lower pressure [-] (a compressor
    stage discharge over suction, a turbine section inlet over exhaust: common practice)."""
    return tuple(r.pressure_ratio for r in result.train.machines.values())


def train_values(result) -> dict:
    """Values [SI] of :data:`TRAIN_FIELDS` of a train result (NaN where none).

    ``stage_pressure_ratios`` is a tuple (one ratio per stage, high over low).
    """
    train = result.train
    out = train.outlet
    values = {
        "total_shaft_power": float(train.absorbed_power or train.delivered_power),
        "heat_removed": float(train.heat_removed),
        "outlet_temperature": float(out.T),
        "outlet_quality": out.quality,
        "stage_pressure_ratios": stage_ratios_high_over_low(result),
    }
    for key in ("total_shaft_power", "heat_removed", "outlet_temperature"):
        if not math.isfinite(values[key]):
            raise WorkbenchError(f"the train's {key.replace('_', ' ')} is not a finite number")
    return values


def train_stations(result) -> list[dict]:
    """Rows of the station table: number (main line only), name, role and the state [SI]."""
    rows, number = [], 0
    for st in result.train.stations:
        main = st.role == "main"
        s = st.state
        rows.append({"number": str(number) if main else "", "name": st.name, "role": st.role,
                     "pressure": s.P, "temperature": s.T, "enthalpy": s.h, "entropy": s.s,
                     "quality": s.quality, "mass_flow": st.mass_flow})
        number += main
    return rows


def train_series(result) -> dict:
    """Chart series [SI]: stage names and shaft powers; main-line and branch stations as
    ``(s, h)`` lists."""
    stations = result.train.stations
    main = [st.state for st in stations if st.role == "main"]
    side = [st.state for st in stations if st.role != "main"]
    return {"names": list(result.train.machines),
            "shaft_power": [r.shaft_power for r in result.train.machines.values()],
            "main": ([st.s for st in main], [st.h for st in main]),
            "branches": ([st.s for st in side], [st.h for st in side])}


__all__ = ["COMPRESSOR_INPUTS", "COMPRESSOR_OPTIONS", "SCENARIOS", "TRAIN_FIELDS",
           "TURBINE_INPUTS", "check_inputs", "default_inputs", "stage_ratios_high_over_low",
           "train_series", "train_stations", "train_study", "train_values"]
