"""Test results against the design (datasheet or guarantee) point; affinity laws.

Per row, the efficiency deviation is given in points (100 x the difference of the fractions)
and the power deviation in percent of the design power.  For pumps and fans the readings are
first corrected to the rated speed with the affinity laws (common practice for a machine at
constant geometry and similar flow, efficiency unchanged)::

    Q_r = Q (N_r / N),    H_r = H (N_r / N)^2,    P_r = P (N_r / N)^3

References
----------
ISO 9906:2012, Rotodynamic pumps - Hydraulic performance acceptance tests (translation of
test results to the specified speed).
ISO 5801:2017, Fans - Performance testing using standardized airways (speed conversion).
"""

from __future__ import annotations

import math
from dataclasses import asdict, dataclass

import numpy as np
import pandas as pd

from ..errors import InputError


@dataclass(frozen=True)
class DesignPoint:
    """A datasheet or guarantee point.  Fields left ``None`` are not compared.

    Attributes
    ----------
    isentropic_efficiency : float or None
        Efficiency [-] (a fraction); compared with the result column named in
        :func:`compare_with_design`.
    power : float or None
        Power [W].
    volume_flow : float or None
        Inlet volume flow [m^3/s].
    head : float or None
        Head in the units of the head column compared (e.g. isentropic head [J/kg] or pump
        head [m]).
    speed : float or None
        Rated speed [rev/min]; with it, readings are corrected by the affinity laws.
    """

    isentropic_efficiency: float | None = None
    power: float | None = None
    volume_flow: float | None = None
    head: float | None = None
    speed: float | None = None

    def to_dict(self) -> dict:
        """Fields as a flat dict (SI units, speed in rev/min)."""
        return asdict(self)


@dataclass(frozen=True)
class AffinityCorrection:
    """Readings corrected to the rated speed.

    Attributes
    ----------
    speed_ratio : numpy.ndarray
        N_r / N [-].
    volume_flow : numpy.ndarray
        Q (N_r/N) [m^3/s].
    head : numpy.ndarray
        H (N_r/N)^2, in the head's units.
    power : numpy.ndarray
        P (N_r/N)^3 [W].
    """

    speed_ratio: np.ndarray
    volume_flow: np.ndarray
    head: np.ndarray
    power: np.ndarray

    def to_dict(self) -> dict:
        """Fields as a dict of arrays."""
        return asdict(self)


def affinity_correction(speed, rated_speed, volume_flow=None, head=None,
                        power=None) -> AffinityCorrection:
    """Correct flow, head and power measured at ``speed`` to ``rated_speed``.

    Parameters
    ----------
    speed : float or array_like
        Measured speed [rev/min] (any unit, the same as ``rated_speed``), positive.
    rated_speed : float
        Rated speed, positive.
    volume_flow, head, power : float or array_like, optional
        Measured volume flow [m^3/s], head [J/kg or m], power [W]; NaN where not given.

    Returns
    -------
    AffinityCorrection

    References
    ----------
    ISO 9906:2012, section 6 (translation to the specified speed).
    """
    n = np.asarray(speed, dtype=float)
    if not (isinstance(rated_speed, (int, float)) and math.isfinite(rated_speed)
            and rated_speed > 0):
        raise InputError(f"rated speed {rated_speed!r} must be a positive number")
    with np.errstate(divide="ignore", invalid="ignore"):
        ratio = np.where(n > 0, rated_speed / n, np.nan)

    def scaled(values, power_of):
        if values is None:
            return np.full(np.shape(ratio), np.nan)
        return np.asarray(values, dtype=float) * ratio ** power_of

    return AffinityCorrection(ratio, scaled(volume_flow, 1), scaled(head, 2), scaled(power, 3))


def compare_with_design(results: pd.DataFrame, design: DesignPoint, *,
                        efficiency_column: str = "isentropic_efficiency",
                        power_column: str = "power", flow_column: str = "inlet_volume_flow",
                        head_column: str = "isentropic_head", speed_column: str = "speed",
                        correct_speed: bool | None = None) -> pd.DataFrame:
    """Deviation of each row from the design point.

    Parameters
    ----------
    results : pandas.DataFrame
        Output of :func:`workbench.fieldtest.evaluate` (or any frame with the named columns).
    design : DesignPoint
        The design or guarantee point.
    efficiency_column, power_column, flow_column, head_column : str
        Columns compared with the design's efficiency [-], power [W], volume flow [m^3/s] and
        head; a missing column is skipped.
    speed_column : str
        Measured speed [rev/min].
    correct_speed : bool, optional
        Correct flow, head and power to ``design.speed`` by the affinity laws (pumps and
        fans).  Default: when the design has a speed and the results have the speed column.

    Returns
    -------
    pandas.DataFrame
        Same index: ``efficiency_deviation_points`` (100 (eta - eta_design)),
        ``power_deviation_percent``, ``flow_deviation_percent``, ``head_deviation_percent``
        (each 100 (x / x_design - 1), after the speed correction when applied), and the
        corrected ``corrected_volume_flow``, ``corrected_head``, ``corrected_power`` when
        corrected.

    References
    ----------
    ISO 9906:2012 (deviation from the guarantee point after translation to rated speed).
    """
    if not isinstance(design, DesignPoint):
        raise InputError("design must be a DesignPoint")
    out = pd.DataFrame(index=results.index)

    def col(name):
        return results[name].to_numpy(dtype=float) if name in results.columns else None

    flow, head, power = col(flow_column), col(head_column), col(power_column)
    if correct_speed is None:
        correct_speed = design.speed is not None and speed_column in results.columns
    if correct_speed:
        if design.speed is None or speed_column not in results.columns:
            raise InputError("speed correction needs design.speed and a speed column")
        corr = affinity_correction(col(speed_column), design.speed, flow, head, power)
        flow = corr.volume_flow if flow is not None else None
        head = corr.head if head is not None else None
        power = corr.power if power is not None else None
        for name, values in (("corrected_volume_flow", flow), ("corrected_head", head),
                             ("corrected_power", power)):
            if values is not None:
                out[name] = values
    eta = col(efficiency_column)
    if design.isentropic_efficiency is not None and eta is not None:
        out["efficiency_deviation_points"] = 100.0 * (eta - design.isentropic_efficiency)
    for label, values, target in (("power", power, design.power),
                                  ("flow", flow, design.volume_flow),
                                  ("head", head, design.head)):
        if target is not None and values is not None:
            if target == 0:
                raise InputError(f"design {label} must not be zero")
            out[f"{label}_deviation_percent"] = 100.0 * (values / target - 1.0)
    return out


__all__ = ["DesignPoint", "AffinityCorrection", "affinity_correction", "compare_with_design"]
