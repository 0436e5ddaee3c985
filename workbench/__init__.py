"""Turbomachinery energy-balance workbench.

Steady-flow energy balances of compressors, turbines, pumps and fans with real-fluid
properties, and the widget panels and dashboards built on them.

Results are estimates from the inputs given and depend on the validity of the property model;
they do not replace the equipment supplier's data, the applicable codes or a licensed
engineer's judgement.
"""

from .errors import (
    CaseFileError,
    InputError,
    PropertyError,
    ReadingsError,
    SpecificationError,
    WorkbenchError,
)
from .fluids import Fluid, State, available_fluids, normalise_fractions
from .machines import MachineResult, compressor, energy_balance, fan, pump, turbine
from .units import Q_, UNIT_SYSTEMS, ureg

__version__ = "0.1.0"

SAFETY_CAUTION = (
    "Results are estimates from the inputs given and depend on the validity of the property "
    "model. They do not replace the equipment supplier's data, the applicable codes and "
    "standards, or the judgement of a licensed engineer."
)

__all__ = [
    "CaseFileError", "Fluid", "InputError", "MachineResult", "PropertyError", "Q_",
    "ReadingsError", "SAFETY_CAUTION", "SpecificationError", "State", "UNIT_SYSTEMS",
    "WorkbenchError", "available_fluids", "compressor", "energy_balance", "fan",
    "normalise_fractions", "pump", "turbine", "ureg",
]
