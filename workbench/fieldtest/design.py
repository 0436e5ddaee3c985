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

from dataclasses import asdict, dataclass

import numpy as np
import pandas as pd
import pint

from ..errors import InputError
from ..units import flag, fraction, optional_si, positive, text, to_si_array
from .inputs import speed_rpm


def _head(value):
    """Head [J/kg or m]: a Quantity of specific energy or of length, or a plain number."""
    if isinstance(value, pint.Quantity) and value.check("[length]"):
        return positive(value, "length", "design head")
    return optional_si(value, "specific_energy", "design head", low=0.0, low_open=True)


@dataclass(frozen=True)
class DesignPoint:
    """A datasheet or guarantee point.  Fields left ``None`` are not compared.

    Every field is converted at construction through the input boundary: plain numbers
    (SI, speed in rev/min), Decimal, numpy scalars or pint Quantities (``power=Q_(1.1,
    "MW")``); text, booleans, NaN, infinity, zero, negative values and wrong units are
    refused with an InputError naming the field.

    Attributes
    ----------
    isentropic_efficiency : float or None
        Efficiency [-] in (0, 1]; compared with the result column named in
        :func:`compare_with_design`.
    power : float or None
        Power [W], positive.
    volume_flow : float or None
        Inlet volume flow [m^3/s], positive.
    head : float or None
        Head in the units of the head column compared (e.g. isentropic head [J/kg] or pump
        head [m]), positive; a Quantity of length is kept in m, of specific energy in J/kg.
    speed : float or None
        Rated speed [rev/min], positive; with it, readings are corrected by the affinity
        laws.  A Quantity in rpm, revolution/second or rad/s is converted.

    Examples
    --------
    >>> from workbench.units import Q_
    >>> DesignPoint(power=Q_(1.1, "MW"), speed=Q_(50, "revolution/second")).power
    1100000.0
    """

    isentropic_efficiency: float | None = None
    power: float | None = None
    volume_flow: float | None = None
    head: float | None = None
    speed: float | None = None

    def __post_init__(self):
        checked = {
            "isentropic_efficiency": None if self.isentropic_efficiency is None else fraction(
                self.isentropic_efficiency, "design isentropic efficiency"),
            "power": None if self.power is None else positive(self.power, "power",
                                                              "design power"),
            "volume_flow": None if self.volume_flow is None else positive(
                self.volume_flow, "volume_flow", "design volume flow"),
            "head": _head(self.head),
            "speed": None if self.speed is None else speed_rpm(self.speed, "design speed"),
        }
        for name, value in checked.items():
            object.__setattr__(self, name, value)

    def to_dict(self) -> dict:
        """Fields as a flat dict (SI units, speed in rev/min)."""
        return asdict(self)


@dataclass(frozen=True)
class AffinityCorrection:
    """Readings corrected to the rated speed.

    Attributes
    ----------
    speed_ratio : numpy.ndarray
        N_r / N [-]; NaN when not defined (a speed reading that is not positive).
    volume_flow : numpy.ndarray or None
        Q (N_r/N) [m^3/s]; None when no volume flow was given.
    head : numpy.ndarray or None
        H (N_r/N)^2, in the head's units; None when no head was given.
    power : numpy.ndarray or None
        P (N_r/N)^3 [W]; None when no power was given.
    """

    speed_ratio: np.ndarray
    volume_flow: np.ndarray | None
    head: np.ndarray | None
    power: np.ndarray | None

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
        Measured volume flow [m^3/s], head [J/kg or m], power [W] (arrays or Quantities,
        NaN marks a missing reading); their corrected values are None when not given.

    Returns
    -------
    AffinityCorrection

    References
    ----------
    ISO 9906:2012, section 6 (translation to the specified speed).

    Examples
    --------
    >>> affinity_correction([2900.0], 2950.0, power=[60e3]).power.round(1)
    array([63157.3])
    """
    rated = speed_rpm(rated_speed, "rated speed")
    n = _speeds(speed)
    with np.errstate(divide="ignore", invalid="ignore"):
        ratio = np.where(n > 0, rated / n, np.nan)

    def scaled(values, power_of, kind, name):
        if values is None:
            return None
        if kind == "head" and isinstance(values, pint.Quantity) and values.check("[length]"):
            kind = "length"
        array = to_si_array(values, "specific_energy" if kind == "head" else kind, name)
        if len(array) not in (1, len(ratio)):
            raise InputError(f"{name} has {len(array)} values but speed has {len(ratio)}: "
                             "give one per speed reading")
        return array * ratio ** power_of

    fields = (ratio, scaled(volume_flow, 1, "volume_flow", "volume flow"),
              scaled(head, 2, "head", "head"), scaled(power, 3, "power", "power"))
    if np.ndim(getattr(speed, "magnitude", speed)) == 0:  # a single reading: 0-d arrays
        fields = tuple(None if f is None else np.asarray(f).reshape(()) for f in fields)
    return AffinityCorrection(*fields)


def _speeds(speed) -> np.ndarray:
    """Measured speeds [rev/min] as an array (a Quantity array converted to rpm)."""
    if isinstance(speed, pint.Quantity):
        if "hertz" in str(speed.units):
            raise InputError("speed was given in Hz, which is ambiguous for a shaft speed: "
                             "give rpm or revolution/second")
        try:
            speed = speed.to("rpm").magnitude
        except pint.DimensionalityError:
            raise InputError(f"speed was given in {speed.units:~P}, which is not a unit of "
                             "rotational speed (rpm)") from None
    return to_si_array(speed, "dimensionless", "speed")


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
    if not isinstance(results, pd.DataFrame):
        raise InputError(f"results must be a pandas DataFrame, not {type(results).__name__}")
    if not isinstance(design, DesignPoint):
        raise InputError(f"design must be a DesignPoint, not {type(design).__name__}")
    for label, name in (("efficiency_column", efficiency_column),
                        ("power_column", power_column), ("flow_column", flow_column),
                        ("head_column", head_column), ("speed_column", speed_column)):
        text(name, label)
    if correct_speed is not None:
        correct_speed = flag(correct_speed, "correct_speed")
    out = pd.DataFrame(index=results.index)

    def col(name):
        if name not in results.columns:
            return None
        try:
            return pd.to_numeric(results[name], errors="coerce").to_numpy(dtype=float)
        except (TypeError, ValueError):
            raise InputError(f"column {name!r} of the results is not numeric") from None

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
            # design values are positive (DesignPoint refuses zero)
            out[f"{label}_deviation_percent"] = 100.0 * (values / target - 1.0)
    return out


__all__ = ["DesignPoint", "AffinityCorrection", "affinity_correction", "compare_with_design"]
