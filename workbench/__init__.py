"""Turbomachinery energy-balance workbench.

Steady-flow energy balances of compressors, turbines, pumps and fans with real-fluid
properties, and the widget panels and dashboards built on them.

Results are estimates from the inputs given and depend on the validity of the property model;
they do not replace the equipment supplier's data, the applicable codes or a licensed
engineer's judgement.
"""

from . import fieldtest  # noqa: E402
from .curves import (  # noqa: E402
    CompressorCondition,
    PerformanceCurve,
    PipeSection,
    SystemCurve,
    compressibility_coefficient,
    compressor_similarity,
    fan_test,
    operating_point,
    pump_acceptance,
)
from .errors import (
    CaseFileError,
    InputError,
    PropertyError,
    ReadingsError,
    SpecificationError,
    WorkbenchError,
)
from .fieldtest import (  # noqa: E402
    DesignPoint,
    InstrumentUncertainty,
    affinity_correction,
    compare_with_design,
    evaluate,
    monte_carlo_uncertainty,
    propagate_uncertainty,
    read_readings,
    steady_state_flags,
)
from .machines import (
    MachineResult,
    compressor,
    cooler,
    diffuser,
    energy_balance,
    fan,
    heat_exchanger,
    mixer,
    nozzle,
    npsh_available,
    pipe_segment,
    pump,
    splitter,
    throttle,
    turbine,
)
from .properties import Fluid, State, StateArray, available_fluids, normalise_fractions
from .trains import (  # noqa: E402  (trains build on the machines above)
    Admission,
    CompressorStage,
    Cooler,
    Extraction,
    PipeRun,
    PressureLoss,
    PumpStage,
    ThrottleValve,
    Train,
    TrainResult,
    TurbineSection,
    extraction_turbine,
    intercooled_compressor,
)
from .units import Q_, UNIT_SYSTEMS, ureg

__version__ = "0.1.0"

SAFETY_CAUTION = (
    "Results are estimates from the inputs given and depend on the validity of the property "
    "model. They do not replace the equipment supplier's data, the applicable codes and "
    "standards, or the judgement of a licensed engineer."
)

__all__ = [
    "CaseFileError", "Fluid", "InputError", "MachineResult", "PropertyError", "Q_",
    "ReadingsError", "SAFETY_CAUTION", "SpecificationError", "State", "StateArray", "UNIT_SYSTEMS",
    "WorkbenchError", "available_fluids", "compressor", "energy_balance", "fan",
    "normalise_fractions", "pump", "turbine", "ureg",
    "cooler", "diffuser", "heat_exchanger", "mixer", "npsh_available", "nozzle", "pipe_segment",
    "splitter", "throttle",
    "Admission", "CompressorStage", "Cooler", "Extraction", "PipeRun", "PressureLoss", "PumpStage",
    "ThrottleValve", "Train", "TrainResult", "TurbineSection", "extraction_turbine",
    "intercooled_compressor",
    "fieldtest", "DesignPoint", "InstrumentUncertainty", "affinity_correction",
    "compare_with_design", "evaluate", "monte_carlo_uncertainty", "propagate_uncertainty",
    "read_readings", "steady_state_flags",
    "PerformanceCurve", "SystemCurve", "operating_point", "pump_acceptance",
    "compressor_similarity", "CompressorCondition", "PipeSection", "fan_test",
    "compressibility_coefficient",
]
