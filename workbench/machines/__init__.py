"""Steady-flow energy balances of machines and the devices around them."""

from . import balance, flows
from .flows import STANDARD_CONDITIONS, mass_flow_from, standard_density
from .heat_exchanger import CoolerResult, HeatExchangerResult, cooler, heat_exchanger
from .mixer import MixerResult, SplitterResult, mixer, splitter
from .nozzle import PassageResult, diffuser, nozzle, velocity_from_area
from .pipe import (
    PipeResult,
    SuctionHeadResult,
    darcy_friction_factor,
    npsh_available,
    pipe_segment,
)
from .throttle import ThrottleResult, throttle
from .turbomachine import (
    STANDARD_GRAVITY,
    MachineResult,
    compressor,
    energy_balance,
    fan,
    pump,
    turbine,
)

__all__ = [
    "STANDARD_CONDITIONS", "STANDARD_GRAVITY", "balance", "flows", "mass_flow_from",
    "standard_density", "CoolerResult", "HeatExchangerResult", "MachineResult", "MixerResult",
    "PassageResult", "PipeResult", "SplitterResult", "SuctionHeadResult", "ThrottleResult",
    "compressor", "cooler", "darcy_friction_factor", "diffuser", "energy_balance", "fan",
    "heat_exchanger", "mixer", "npsh_available", "nozzle", "pipe_segment", "pump", "splitter",
    "throttle", "turbine", "velocity_from_area",
]
