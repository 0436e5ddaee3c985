"""Steady-flow energy balances of machines and the devices around them."""

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
    "STANDARD_GRAVITY", "CoolerResult", "HeatExchangerResult", "MachineResult", "MixerResult",
    "PassageResult", "PipeResult", "SplitterResult", "SuctionHeadResult", "ThrottleResult",
    "compressor", "cooler", "darcy_friction_factor", "diffuser", "energy_balance", "fan",
    "heat_exchanger", "mixer", "npsh_available", "nozzle", "pipe_segment", "pump", "splitter",
    "throttle", "turbine", "velocity_from_area",
]
