"""Steady-flow energy balances of machines and the devices around them."""

from .turbomachine import (
    STANDARD_GRAVITY,
    MachineResult,
    compressor,
    energy_balance,
    fan,
    pump,
    turbine,
)

__all__ = ["STANDARD_GRAVITY", "MachineResult", "compressor", "energy_balance", "fan", "pump",
           "turbine"]
