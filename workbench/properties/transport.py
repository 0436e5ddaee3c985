"""Transport properties and the speed of sound (methods of :class:`Fluid`).

References
----------
IAPWS R12-08, Release on the IAPWS Formulation 2008 for the Viscosity of Ordinary Water
Substance (water); I. H. Bell et al., Ind. Eng. Chem. Res. 53 (2014) 2498-2508 (the other
fluids' transport models in CoolProp).
"""

from __future__ import annotations

import math

from ..errors import PropertyError


class Transport:
    """Viscosity and speed of sound of :class:`~workbench.properties.Fluid`."""

    def viscosity(self, state) -> float:
        """Dynamic viscosity [Pa s] at a single-phase state.

        Raises
        ------
        PropertyError
            For two-phase states and where the property library has no viscosity model for
            the fluid (many mixtures).

        Examples
        --------
        >>> import workbench as wb
        >>> water = wb.Fluid("Water")
        >>> round(water.viscosity(water.state(P=1e5, T=293.15)) * 1e3, 3)
        1.002
        """
        if state.two_phase:
            raise PropertyError(f"viscosity of {self.name} is not defined inside the two-phase "
                                f"region (quality {state.x:.4g})")
        self.flash_PT(state.P, state.T)
        try:
            value = self._as.viscosity()
        except Exception:  # noqa: BLE001 - the library raises for fluids without a model
            value = math.nan
        if not (math.isfinite(value) and value > 0):
            raise PropertyError(f"the property library has no viscosity model for {self.name}")
        return value

    def speed_of_sound(self, state) -> float:
        """Speed of sound [m/s] at a single-phase state (NaN inside the two-phase region).

        Examples
        --------
        >>> import workbench as wb
        >>> air = wb.Fluid("Air")
        >>> round(air.speed_of_sound(air.state(P=1e5, T=293.15)))
        343
        """
        if state.two_phase:
            return math.nan
        self.flash_PT(state.P, state.T)
        try:
            return self._as.speed_sound()
        except Exception:  # noqa: BLE001
            return math.nan
