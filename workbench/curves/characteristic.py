"""Characteristic curves of a pump, fan or compressor: datasheet points, a fit, speed scaling.

A curve holds the supplier's points of inlet volume flow Q against the machine's head at one
stated speed N: pump total head [m], fan pressure [Pa] or compressor polytropic head [J/kg],
with the efficiency, the power input and (pumps) the NPSH required at the same flows where the
datasheet gives them.

The fit is one of two, chosen by the user and stated in the result:

- ``"polynomial"``: a least-squares polynomial of a chosen degree in Q
  (``numpy.polynomial.Polynomial.fit``, which scales Q to [-1, 1] for conditioning).  It
  smooths scatter in the points; the residuals (fit minus datasheet) are kept.
- ``"pchip"``: a monotone piecewise-cubic Hermite interpolant
  (``scipy.interpolate.PchipInterpolator``, Fritsch and Carlson).  It passes through every
  point (residuals zero to rounding) and adds no wiggle that the points do not have.

The curve refuses to read a flow outside the range of its points unless ``extrapolate=True``
is passed.  The surge (compressor, fan) or minimum continuous flow (pump) limit and the
maximum flow limit default to the first and last points.

Speed scaling (affinity laws, common practice)::

    Q2 = Q1 (N2/N1),  H2 = H1 (N2/N1)^2,  P2 = P1 (N2/N1)^3,  eta2 = eta1,
    NPSHr2 = NPSHr1 (N2/N1)^2

For a compressor the same scaling is the conversion at equal flow coefficient (Q/N D^3) and
equal polytropic work coefficient (H/U^2): an approximation that holds while the machine Mach
number, the inlet-to-discharge volume ratio and the Reynolds number stay near their values at
the datasheet speed; it neglects the change of the volume ratio with speed (stages downstream
see a different flow coefficient) and of the Mach number.  Power scales as N^3 at the same
inlet density.  The surge and maximum flows move with Q (a surge line of constant flow
coefficient, same approximation).

Surge margin at a flow Q, at the curve's speed (common practice)::

    surge margin = (Q - Q_surge) / Q

References
----------
F. N. Fritsch and R. E. Carlson, "Monotone piecewise cubic interpolation", SIAM J. Numer.
Anal. 17 (1980) 238-246.
ISO 9906:2012, Rotodynamic pumps - Hydraulic performance acceptance tests (translation of test
results to the specified speed, affinity laws).
ASME PTC 10-1997, Performance Test Code on Compressors and Exhausters (similarity at equal
flow coefficient).
"""

from __future__ import annotations

import numpy as np
from numpy.polynomial import Polynomial
from scipy.interpolate import PchipInterpolator
from scipy.optimize import minimize_scalar

from ..errors import CaseFileError, InputError
from ..units import choice, count, flag, optional_si, positive, text, to_si, to_si_array

#: Machine kinds and the kind of quantity of their head.
HEAD_KINDS = {"pump": "length", "fan": "pressure", "compressor": "specific_energy"}
#: Words for the head of each machine kind, in messages and tables.
HEAD_WORDS = {"pump": "pump total head", "fan": "fan pressure",
              "compressor": "polytropic head"}
#: The fits offered.
FITS = ("polynomial", "pchip")
#: Relative slack on the flow range (rounding of a flow read back from a scaled curve).
_RANGE_SLACK = 1e-9
_QUANTITIES = ("head", "efficiency", "power", "npsh_required")
_KINDS = {"efficiency": "dimensionless", "power": "power", "npsh_required": "length"}


def _points(values, kind, name, size):
    array = to_si_array(values, kind, name, allow_nan=False).copy()
    if array.size != size:
        raise InputError(f"{name} has {array.size} points but the curve has {size} flows: give "
                         "one value per flow")
    return array


def _is_scalar(value) -> bool:
    magnitude = getattr(value, "magnitude", value)
    return np.ndim(magnitude) == 0


class PerformanceCurve:
    """Characteristic curve of a pump, fan or compressor at one speed, with a stated fit.

    Parameters
    ----------
    flow : sequence of float, or array Quantity
        Inlet volume flows of the datasheet points [m^3/s], strictly increasing, not negative.
    head : sequence of float, or array Quantity
        Head at each flow: pump total head [m], fan pressure [Pa] or compressor polytropic head
        [J/kg] (by ``machine``), positive.
    speed : float or Quantity
        Speed of the datasheet [rad/s] (a Quantity in rpm is converted), positive.
    machine : {"pump", "fan", "compressor"}
        Machine kind; fixes the unit of ``head``.
    efficiency : sequence of float, optional
        Efficiency at each flow [-], in [0, 1] (zero at a shut-off point).
    power : sequence of float, optional
        Power input at each flow [W], positive.
    npsh_required : sequence of float, optional
        NPSH required at each flow [m], positive (pumps).
    fit : {"polynomial", "pchip"}
        Least-squares polynomial of ``degree`` or monotone PCHIP interpolant (module notes).
    degree : int, optional
        Degree of the polynomial fit, 1 .. min(6, points - 1); default min(3, points - 1);
        ignored by ``"pchip"``.
    min_flow : float or Quantity, optional
        Surge (compressor, fan) or minimum continuous flow (pump) limit [m^3/s] at this speed;
        default the first point.
    max_flow : float or Quantity, optional
        Maximum flow limit [m^3/s]; default the last point.
    name : str
        A label for tables and charts.

    Raises
    ------
    InputError
        Fewer than three points, flows not increasing, lengths that differ, values out of
        range, a degree the points cannot carry, limits outside the flow range.

    References
    ----------
    Fritsch and Carlson (1980) for PCHIP; ISO 9906:2012 and ASME PTC 10-1997 for the speed
    scaling (see the module notes).

    Examples
    --------
    >>> import workbench as wb
    >>> curve = PerformanceCurve([0.0, 0.05, 0.1, 0.15], [50.0, 48.0, 42.0, 32.0],
    ...                          speed=wb.Q_(1480, "rpm"), fit="polynomial", degree=2)
    >>> round(float(curve.head(0.1)), 1)
    42.0
    """

    def __init__(self, flow, head, *, speed, machine="pump", efficiency=None, power=None,
                 npsh_required=None, fit="polynomial", degree=None, min_flow=None, max_flow=None,
                 name="curve"):
        self.machine = choice(machine, tuple(HEAD_KINDS), "machine kind")
        self.name = text(name, "curve name")
        self.fit = choice(fit, FITS, "curve fit")
        Q = to_si_array(flow, "volume_flow", "curve flow", allow_nan=False).copy()
        if Q.size < 3:
            raise InputError(f"curve flow has {Q.size} points: a curve needs at least 3")
        if Q.size > 200:
            raise InputError(f"curve flow has {Q.size} points: at most 200 are accepted")
        if Q[0] < 0:
            raise InputError(f"curve flow {Q[0]:g} m**3/s must not be negative")
        if not np.all(np.diff(Q) > 0):
            i = int(np.flatnonzero(np.diff(Q) <= 0)[0])
            raise InputError(f"curve flow must increase point by point: point {i + 1} "
                             f"({Q[i + 1]:g} m**3/s) does not exceed point {i} ({Q[i]:g})")
        self.speed = positive(speed, "rotational_speed", "curve speed")
        H = _points(head, HEAD_KINDS[self.machine], HEAD_WORDS[self.machine], Q.size)
        if not np.all(H > 0):
            raise InputError(f"{HEAD_WORDS[self.machine]} must be positive at every point, "
                             f"not {H.min():g}")
        data = {"head": H}
        for key, values in (("efficiency", efficiency), ("power", power),
                            ("npsh_required", npsh_required)):
            if values is None:
                continue
            array = _points(values, _KINDS[key], key.replace("_", " "), Q.size)
            if key == "efficiency":  # zero allowed: a datasheet's shut-off point
                ok = np.all((array >= 0) & (array <= 1.0))
            else:
                ok = np.all(array > 0)
            if not ok:
                allowed = "[0, 1]" if key == "efficiency" else "above 0"
                raise InputError(f"{key.replace('_', ' ')} must lie in {allowed} at every "
                                 f"point; got {array.min():g} .. {array.max():g}")
            data[key] = array
        if degree is None:
            degree = min(3, Q.size - 1)
        self.degree = count(degree, "fit degree", low=1, high=min(6, Q.size - 1))
        self.flow = Q
        self._data = data
        self._fits = {key: self._make_fit(values) for key, values in data.items()}
        self.min_flow = self._limit(min_flow, "minimum flow limit", Q[0])
        self.max_flow = self._limit(max_flow, "maximum flow limit", Q[-1])
        if not self.min_flow < self.max_flow:
            raise InputError(f"minimum flow limit {self.min_flow:g} m**3/s must be below the "
                             f"maximum flow limit {self.max_flow:g} m**3/s")
        self.residuals = {key: self._fits[key](Q) - values for key, values in data.items()}
        for array in (Q, *data.values(), *self.residuals.values()):
            array.flags.writeable = False  # a curve does not change once fitted

    def _make_fit(self, values):
        if self.fit == "pchip":
            return PchipInterpolator(self.flow, values, extrapolate=True)
        return Polynomial.fit(self.flow, values, self.degree)

    def _limit(self, value, name, default):
        limit = optional_si(value, "volume_flow", name)
        if limit is None:
            return float(default)
        lo, hi = self.flow[0], self.flow[-1]
        if not lo <= limit <= hi:
            raise InputError(f"{name} {limit:g} m**3/s is outside the curve's flow range "
                             f"[{lo:g}, {hi:g}] m**3/s")
        return limit

    # ----------------------------------------------------------------- reading the curve
    @property
    def head_kind(self) -> str:
        """Kind of quantity of the head (``"length"``, ``"pressure"``, ``"specific_energy"``)."""
        return HEAD_KINDS[self.machine]

    @property
    def quantities(self) -> tuple:
        """Names of the quantities this curve carries (``"head"`` first)."""
        return tuple(self._data)

    def points(self, quantity: str = "head") -> np.ndarray:
        """Datasheet values of a quantity at the curve's flows (SI units), a copy."""
        return self._data[self._check_quantity(quantity)].copy()

    def rms_residual(self, quantity: str = "head") -> float:
        """Root-mean-square residual of the fit of a quantity (its SI unit)."""
        r = self.residuals[self._check_quantity(quantity)]
        return float(np.sqrt(np.mean(r ** 2)))

    def max_residual(self, quantity: str = "head") -> float:
        """Largest absolute residual of the fit of a quantity (its SI unit)."""
        return float(np.max(np.abs(self.residuals[self._check_quantity(quantity)])))

    def _check_quantity(self, quantity):
        choice(quantity, _QUANTITIES, "curve quantity")
        if quantity not in self._data:
            raise InputError(f"the curve {self.name!r} has no {quantity.replace('_', ' ')} "
                             "points")
        return quantity

    def _flows(self, flow, extrapolate):
        extrapolate = flag(extrapolate, "extrapolate")
        if _is_scalar(flow):
            Q = np.array([to_si(flow, "volume_flow", "flow")])
        else:
            Q = to_si_array(flow, "volume_flow", "flow", allow_nan=False)
        lo, hi = self.flow[0], self.flow[-1]
        slack = _RANGE_SLACK * hi
        outside = (Q < lo - slack) | (Q > hi + slack)
        if not extrapolate and outside.any():
            q = Q[np.flatnonzero(outside)[0]]
            raise InputError(f"flow {q:g} m**3/s is outside the flow range of the curve "
                             f"{self.name!r} [{lo:g}, {hi:g}] m**3/s: the fit is not "
                             "extrapolated unless extrapolate=True is passed")
        if (Q < 0).any():
            raise InputError(f"flow {Q.min():g} m**3/s must not be negative")
        return Q

    def value(self, quantity: str, flow, *, extrapolate: bool = False):
        """A fitted quantity at one flow or an array of flows.

        Parameters
        ----------
        quantity : {"head", "efficiency", "power", "npsh_required"}
            Which curve.
        flow : float, sequence or Quantity
            Inlet volume flow [m^3/s].
        extrapolate : bool
            Read the fit outside the range of the points (refused otherwise).

        Returns
        -------
        float or numpy.ndarray
            The value in SI units (a float for a single flow).
        """
        quantity = self._check_quantity(quantity)
        scalar = _is_scalar(flow)
        Q = self._flows(flow, extrapolate)
        values = np.asarray(self._fits[quantity](Q), dtype=float)
        if not np.all(np.isfinite(values)):
            raise InputError(f"the {quantity} fit of {self.name!r} is not finite at the flows "
                             "given")
        return float(values[0]) if scalar else values

    def head(self, flow, *, extrapolate: bool = False):
        """Head at a flow (pump [m], fan [Pa], compressor [J/kg]); see :meth:`value`."""
        return self.value("head", flow, extrapolate=extrapolate)

    def efficiency(self, flow, *, extrapolate: bool = False):
        """Efficiency at a flow [-]; see :meth:`value`."""
        return self.value("efficiency", flow, extrapolate=extrapolate)

    def power(self, flow, *, extrapolate: bool = False):
        """Power input at a flow [W]; see :meth:`value`."""
        return self.value("power", flow, extrapolate=extrapolate)

    def npsh_required(self, flow, *, extrapolate: bool = False):
        """NPSH required at a flow [m]; see :meth:`value`."""
        return self.value("npsh_required", flow, extrapolate=extrapolate)

    def surge_margin(self, flow) -> float:
        """(Q - Q_surge) / Q at this speed [-]: negative below the surge or minimum flow.

        Parameters
        ----------
        flow : float or Quantity
            Inlet volume flow [m^3/s], positive.

        References
        ----------
        Common practice (a margin on the flow at constant speed).
        """
        Q = positive(flow, "volume_flow", "flow")
        return (Q - self.min_flow) / Q

    def best_efficiency_flow(self) -> float:
        """Flow of the highest fitted efficiency within the points [m^3/s]."""
        fit = self._fits[self._check_quantity("efficiency")]
        res = minimize_scalar(lambda q: -float(fit(q)), bounds=(self.flow[0], self.flow[-1]),
                              method="bounded", options={"xatol": 1e-9 * self.flow[-1]})
        candidates = [self.flow[0], self.flow[-1], float(res.x)]
        return float(max(candidates, key=lambda q: float(fit(q))))

    # ------------------------------------------------------------------ speed scaling
    def at_speed(self, speed) -> PerformanceCurve:
        """The curve at another speed by the affinity laws (see the module notes).

        Parameters
        ----------
        speed : float or Quantity
            New speed [rad/s], positive; between 0.1 and 10 times the curve's speed.

        Returns
        -------
        PerformanceCurve
            Same fit and degree, points and limits scaled: Q ~ N, head ~ N^2, power ~ N^3,
            NPSHr ~ N^2, efficiency kept.

        References
        ----------
        Affinity laws (common practice); ASME PTC 10-1997 for a compressor at equal flow
        coefficient (an approximation, see the module notes).

        Examples
        --------
        >>> curve = PerformanceCurve([0.0, 0.05, 0.1], [50.0, 48.0, 42.0], speed=150.0)
        >>> round(curve.at_speed(75.0).head(0.025), 3)  # 48 m at 0.05 m3/s, half speed
        12.0
        """
        N = positive(speed, "rotational_speed", "new speed")
        r = N / self.speed
        if not 0.1 <= r <= 10.0:
            raise InputError(f"new speed {N:g} rad/s is {r:g} times the curve speed "
                             f"{self.speed:g} rad/s: the affinity laws are applied between 0.1 "
                             "and 10 times")
        exponents = {"head": 2, "efficiency": 0, "power": 3, "npsh_required": 2}
        scaled = {key: values * r ** exponents[key] for key, values in self._data.items()}
        return PerformanceCurve(
            self.flow * r, scaled.pop("head"), speed=N, machine=self.machine, fit=self.fit,
            degree=self.degree, min_flow=min(self.min_flow * r, self.flow[-1] * r),
            max_flow=min(self.max_flow * r, self.flow[-1] * r), name=self.name, **scaled)

    # ------------------------------------------------------------------ case files
    def to_dict(self) -> dict:
        """Plain dict of the curve's definition (SI values), for JSON case files."""
        out = {"machine": self.machine, "name": self.name, "speed": self.speed,
               "fit": self.fit, "degree": self.degree, "flow": self.flow.tolist(),
               "min_flow": self.min_flow, "max_flow": self.max_flow}
        out.update({key: values.tolist() for key, values in self._data.items()})
        return out

    @classmethod
    def from_dict(cls, data) -> PerformanceCurve:
        """A curve from a dict as written by :meth:`to_dict` (SI values), validated.

        Raises
        ------
        CaseFileError
            Not a dict, unknown or missing keys.
        InputError
            Any value refused by the constructor.
        """
        if not isinstance(data, dict):
            raise CaseFileError(f"a curve must be a JSON object, not {type(data).__name__}")
        allowed = {"machine", "name", "speed", "fit", "degree", "flow", "min_flow",
                   "max_flow", "head", "efficiency", "power", "npsh_required"}
        unknown = sorted(str(k) for k in data if k not in allowed)
        if unknown:
            raise CaseFileError(f"unknown curve keys: {', '.join(unknown)[:200]}")
        missing = [k for k in ("flow", "head", "speed") if k not in data]
        if missing:
            raise CaseFileError(f"the curve lacks {', '.join(missing)}")
        kwargs = dict(data)
        return cls(kwargs.pop("flow"), kwargs.pop("head"), **kwargs)

    def __repr__(self) -> str:
        return (f"PerformanceCurve({self.name!r}, {self.machine}, {self.flow.size} points, "
                f"{self.speed:.6g} rad/s, fit={self.fit!r})")


__all__ = ["FITS", "HEAD_KINDS", "HEAD_WORDS", "PerformanceCurve"]
