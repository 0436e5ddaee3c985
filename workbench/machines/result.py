"""The result of a machine energy balance: :class:`MachineResult`.

Its numbers are fields of the one table of result fields, :data:`workbench.fields.FIELDS`:
:meth:`MachineResult.to_dict` and :meth:`MachineResult.to_series` use the field names as keys
(SI values; units, labels and formats are in the table, e.g. ``fields.headers(keys)`` for CSV
headers).  Costly values (the polytropic path integration, Schultz's method) are computed on
first access.

References
----------
ASME PTC 10-1997, Performance Test Code on Compressors and Exhausters.
J. M. Schultz, "The Polytropic Analysis of Centrifugal Compressors", ASME Journal of
Engineering for Power 84 (1962) 69-82.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from functools import cached_property

from .. import fields
from ..polytropic import polytropic_efficiency as _path_efficiency
from ..polytropic import schultz
from ..properties import State
from .balance import RAISES_PRESSURE, STANDARD_GRAVITY, temperature_sensitivity

#: Fields of :meth:`MachineResult.to_dict`, in order (names of :data:`workbench.fields.FIELDS`).
#: The isentropic outlet's pressure and entropy are the outlet pressure and inlet entropy.
RESULT_FIELDS = (
    "inlet_pressure", "inlet_temperature", "inlet_enthalpy", "inlet_entropy", "inlet_density",
    "inlet_quality",
    "outlet_pressure", "outlet_temperature", "outlet_enthalpy", "outlet_entropy",
    "outlet_density", "outlet_quality",
    "isentropic_outlet_temperature", "isentropic_outlet_enthalpy", "isentropic_outlet_density",
    "isentropic_outlet_quality",
    "mass_flow", "velocity_in", "velocity_out", "elevation_change", "specific_work", "power",
    "shaft_power", "heat_loss", "specific_heat_loss", "mechanical_efficiency",
    "enthalpy_change", "kinetic_energy_change", "potential_energy_change", "pressure_ratio",
    "isentropic_efficiency", "isentropic_efficiency_static", "isentropic_efficiency_total",
    "isentropic_efficiency_total_to_static", "polytropic_efficiency",
    "polytropic_efficiency_schultz", "schultz_factor", "polytropic_exponent",
    "isentropic_head", "polytropic_head", "polytropic_head_schultz", "pump_head",
    "inlet_volume_flow", "outlet_volume_flow", "kinetic_share",
)


def _state_value(state: str, attribute: str, doc: str) -> property:
    """A read-only property giving one number of one of the result's states."""
    def get(self):
        return getattr(getattr(self, state), attribute)

    return property(get, doc=doc)


@dataclass(frozen=True, eq=False)
class MachineResult:
    """Result of a machine energy balance.  All numbers in SI units.

    Attributes
    ----------
    kind : str
        ``"compressor"``, ``"turbine"``, ``"pump"`` or ``"fan"``.
    basis : str
        ``"static"`` or ``"total"``: the basis of ``isentropic_efficiency`` and
        ``polytropic_efficiency``.
    inlet, outlet : State
        Static inlet and outlet states.
    isentropic_outlet : State
        Outlet pressure at the inlet entropy (static).
    inlet_stagnation, outlet_stagnation : State
        Stagnation (total) states ``h0 = h + V^2/2`` at the static entropy.
    mass_flow : float
        Mass flow [kg/s].
    velocity_in, velocity_out : float
        Flow velocities [m/s].
    elevation_change : float
        Outlet elevation above the inlet [m].
    heat_loss : float
        Heat lost to the surroundings [W] (positive out of the machine).
    mechanical_efficiency : float
        Shaft power over fluid power (turbine) or fluid over shaft power (driven machine) [-].
    specific_work : float
        Fluid work per unit mass, a positive magnitude [J/kg].
    power : float
        Fluid power, a positive magnitude [W].
    shaft_power : float
        Power at the coupling after mechanical losses [W].
    enthalpy_change : float
        h2 - h1 [J/kg].
    kinetic_energy_change : float
        (V2^2 - V1^2) / 2 [J/kg].
    potential_energy_change : float
        g (z2 - z1) [J/kg].
    specific_heat_loss : float
        Heat loss per unit mass [J/kg].
    isentropic_efficiency_static : float
        Static-to-static isentropic efficiency [-].
    isentropic_efficiency_total : float
        Total-to-total isentropic efficiency [-].
    isentropic_efficiency_total_to_static : float
        Total-to-static isentropic efficiency [-] (turbines; NaN for driven machines).
    isentropic_head : float
        |h2s - h1| on the chosen basis [J/kg].
    rated_from : str
        What fixed the outlet: ``"outlet"`` (a measured outlet state), ``"efficiency"`` or
        ``"power"``.
    """

    kind: str
    basis: str
    inlet: State
    outlet: State
    isentropic_outlet: State
    inlet_stagnation: State
    outlet_stagnation: State
    mass_flow: float
    velocity_in: float
    velocity_out: float
    elevation_change: float
    heat_loss: float
    mechanical_efficiency: float
    specific_work: float
    power: float
    shaft_power: float
    enthalpy_change: float
    kinetic_energy_change: float
    potential_energy_change: float
    specific_heat_loss: float
    isentropic_efficiency_static: float
    isentropic_efficiency_total: float
    isentropic_efficiency_total_to_static: float
    isentropic_head: float
    rated_from: str = "outlet"
    _given_polytropic: tuple = field(default=(), repr=False)

    # ---------------------------------------------------------------- derived
    @property
    def isentropic_efficiency(self) -> float:
        """Isentropic efficiency on the result's basis [-]."""
        if self.basis == "total":
            return self.isentropic_efficiency_total
        return self.isentropic_efficiency_static

    @property
    def pressure_ratio(self) -> float:
        """Higher over lower static pressure [-]: outlet over inlet for a compressor, pump or
        fan, inlet over outlet for a turbine (an expansion ratio above 1; common practice).

        Earlier versions gave outlet over inlet for every machine (below 1 for a turbine).
        """
        if RAISES_PRESSURE[self.kind]:
            return self.outlet.P / self.inlet.P
        return self.inlet.P / self.outlet.P

    @property
    def inlet_volume_flow(self) -> float:
        """Actual volume flow at the inlet [m^3/s]."""
        return self.mass_flow / self.inlet.rho

    @property
    def outlet_volume_flow(self) -> float:
        """Actual volume flow at the outlet [m^3/s]."""
        return self.mass_flow / self.outlet.rho

    @property
    def kinetic_share(self) -> float:
        """Share of the specific work that goes into (or comes from) kinetic energy [-]."""
        return abs(self.kinetic_energy_change) / self.specific_work if self.specific_work else math.nan

    # numbers of the states, named as in workbench.fields.FIELDS
    inlet_pressure = _state_value("inlet", "P", "Static inlet pressure [Pa].")
    inlet_temperature = _state_value("inlet", "T", "Static inlet temperature [K].")
    inlet_enthalpy = _state_value("inlet", "h", "Static inlet specific enthalpy [J/kg].")
    inlet_entropy = _state_value("inlet", "s", "Inlet specific entropy [J/(kg K)].")
    inlet_density = _state_value("inlet", "rho", "Inlet density [kg/m^3].")
    inlet_quality = _state_value("inlet", "quality", "Inlet vapour quality [-], NaN if single-phase.")
    outlet_pressure = _state_value("outlet", "P", "Static outlet pressure [Pa].")
    outlet_temperature = _state_value("outlet", "T", "Static outlet temperature [K].")
    outlet_enthalpy = _state_value("outlet", "h", "Static outlet specific enthalpy [J/kg].")
    outlet_entropy = _state_value("outlet", "s", "Outlet specific entropy [J/(kg K)].")
    outlet_density = _state_value("outlet", "rho", "Outlet density [kg/m^3].")
    outlet_quality = _state_value("outlet", "quality",
                                  "Outlet vapour quality [-], NaN if single-phase.")
    isentropic_outlet_temperature = _state_value("isentropic_outlet", "T",
                                                 "Isentropic outlet temperature [K].")
    isentropic_outlet_enthalpy = _state_value("isentropic_outlet", "h",
                                              "Isentropic outlet specific enthalpy [J/kg].")
    isentropic_outlet_density = _state_value("isentropic_outlet", "rho",
                                             "Isentropic outlet density [kg/m^3].")
    isentropic_outlet_quality = _state_value(
        "isentropic_outlet", "quality", "Isentropic outlet vapour quality [-], NaN if single-phase.")

    @property
    def pump_head(self) -> float:
        """Isentropic head over standard gravity [m]."""
        return self.isentropic_head / STANDARD_GRAVITY

    def _ends(self):
        if self.basis == "total":
            return self.inlet_stagnation, self.outlet_stagnation
        return self.inlet, self.outlet

    @cached_property
    def _schultz(self):
        a, b = self._ends()
        iso = a.fluid.state_Ps(b.P, a.s, T_guess=self.isentropic_outlet.T)
        return schultz(a, b, iso)

    @cached_property
    def _path(self):
        if self._given_polytropic:
            return self._given_polytropic
        a, b = self._ends()
        eta, head, _ = _path_efficiency(a, b, guess=self._schultz.polytropic_efficiency)
        return eta, head

    @property
    def polytropic_efficiency(self) -> float:
        """Polytropic efficiency by direct integration of the polytropic path [-]."""
        return self._path[0]

    @property
    def polytropic_head(self) -> float:
        """Polytropic head by direct path integration, a positive magnitude [J/kg]."""
        return self._path[1]

    @property
    def polytropic_efficiency_schultz(self) -> float:
        """Polytropic efficiency by Schultz's method [-]."""
        return self._schultz.polytropic_efficiency

    @property
    def polytropic_head_schultz(self) -> float:
        """Polytropic head by Schultz's method [J/kg]."""
        return self._schultz.polytropic_head

    @property
    def schultz_factor(self) -> float:
        """Schultz polytropic head correction factor f [-]."""
        return self._schultz.schultz_factor

    @property
    def polytropic_exponent(self) -> float:
        """Polytropic volume exponent n = ln(P2/P1)/ln(v1/v2) [-]."""
        return self._schultz.polytropic_exponent

    @property
    def isentropic_exponent(self) -> float:
        """Isentropic volume exponent n_s = ln(P2/P1)/ln(v1/v2s) [-]."""
        return self._schultz.isentropic_exponent

    @property
    def outlet_temperature_sensitivity(self) -> float:
        """Change of the isentropic efficiency per kelvin of outlet temperature [1/K].

        For a rating from a measured outlet temperature: d(eta)/dT2 = -eta cp2 / (h2 - h1)
        (compression; the magnitude is the same for an expansion).  NaN when the outlet is
        two-phase or the outlet was not measured.
        """
        if self.rated_from != "outlet" or self.outlet.two_phase:
            return math.nan
        return temperature_sensitivity(self.isentropic_efficiency, self.outlet.cp,
                                       self.outlet.h - self.inlet.h)

    @property
    def cautions(self) -> tuple[str, ...]:
        """Plain-language cautions about how far the numbers can be trusted.

        * A state in the two-phase region: Schultz's method and ASME PTC 10 assume a
          single-phase gas; the path-integrated polytropic values are the ones to use.
        * A rating from a measured outlet temperature where 1 K moves the efficiency by more
          than two points (small temperature rise: low-ratio compressors, fans, pumps; common
          practice is to rate such machines from measured power or with calibrated,
          well-immersed thermometers).
        """
        notes = []
        wet = [(name, st) for name, st in (("inlet", self.inlet), ("outlet", self.outlet),
                                           ("isentropic outlet", self.isentropic_outlet))
               if st.two_phase]
        if wet:
            where = ", ".join(f"{name} quality {st.quality:.3f}" for name, st in wet)
            notes.append(f"the process enters the two-phase region ({where}): Schultz's method "
                         "assumes a single-phase gas; use the path-integrated polytropic values")
        sensitivity = self.outlet_temperature_sensitivity
        if math.isfinite(sensitivity) and sensitivity > 0.02:
            rise = abs(self.outlet.T - self.inlet.T)
            notes.append(f"the outlet temperature changes by only {rise:.3g} K: an error of 1 K "
                         f"in it moves the efficiency by {100 * sensitivity:.2g} points; rate "
                         "from measured power or use calibrated, well-immersed thermometers")
        return tuple(notes)

    # ---------------------------------------------------------------- export
    def to_dict(self) -> dict:
        """Flat dict of the result: ``kind``, ``basis``, ``fluid``, ``rated_from``, then every
        number of :data:`RESULT_FIELDS` under its field name (SI units; units, labels and
        formats in :data:`workbench.fields.FIELDS`).

        The keys are field names without a unit suffix (``power``, ``inlet_pressure``,
        ``isentropic_head``); earlier versions used suffixed keys (``power_W``,
        ``inlet_pressure_Pa``, ``isentropic_head_J_per_kg``).  The isentropic outlet's
        pressure and entropy are no longer repeated (they are ``outlet_pressure`` and
        ``inlet_entropy``).

        Examples
        --------
        >>> import workbench as wb
        >>> air = wb.Fluid("Air")
        >>> r = wb.compressor(air.state(P=1e5, T=300.0), P_out=2e5, isentropic_efficiency=0.8)
        >>> d = r.to_dict()
        >>> d["power"] == r.power, wb.fields.FIELDS["power"].unit
        (True, 'W')
        """
        d = {"kind": self.kind, "basis": self.basis, "fluid": self.inlet.fluid.name,
             "rated_from": self.rated_from}
        d.update(fields.row(self, RESULT_FIELDS))
        return d

    def to_series(self):
        """The result as a pandas Series (one row of a results table), keys as :meth:`to_dict`."""
        import pandas as pd

        return pd.Series(self.to_dict())


__all__ = ["MachineResult", "RESULT_FIELDS"]
