"""Real-fluid properties over CoolProp's low-level ``AbstractState``.

Every property flash of the workbench happens in this package.  A :class:`Fluid` holds one
CoolProp ``AbstractState`` per thread (created once, reused for every flash) and produces
immutable :class:`State` objects in SI units; :meth:`Fluid.states_PT`, :meth:`Fluid.states_Ph`
and :meth:`Fluid.states_Ps` return a :class:`StateArray` for batches.

Modules
-------
state        State, StateArray and the phase words
composition  fluid names and compositions (the input boundary for ``Fluid(spec)``)
fluid        Fluid: identity, per-thread state objects, single-state flashes, range checks
saturation   saturation dome and states of pure fluids; dew point and dew line of mixtures
arrays       array flashes (StateArray) and their masks
solver       the one temperature solver (P-h and P-s of mixtures, IF97 consistency)
transport    viscosity and speed of sound
if97_vec     the IAPWS-IF97 region 1, 2 and 4 equations over whole arrays (batches)
tables       error-controlled property tables of a mixture over a batch's P-T range
envelope     a mixture's dew line from one phase-envelope call, checked for a whole frame
fast         the hook of the fast batch paths into the array flashes (prepare, forget)

Supported regions
-----------------
* Pure and pseudo-pure fluids (``"Water"``, ``"Air"``, ``"R134a"``, ``"CarbonDioxide"`` ...):
  the whole range of CoolProp's Helmholtz-energy equation of state, including the two-phase
  region (flashes from P-T, P-h, P-s, P-quality and T-quality).
* Water on IAPWS-IF97 (``Fluid("Water", backend="IF97")``): faster, 273.15 K to 1073.15 K and
  up to 100 MPa.
* Mixtures given by composition: the single-phase gas and dense (supercritical) region only.
  Flashes are phase-specified P-T flashes; P-h and P-s are solved by the temperature solver.
  A state at or below the mixture's dew point is refused.

References
----------
I. H. Bell, J. Wronski, S. Quoilin, V. Lemort, "Pure and Pseudo-pure Fluid Thermophysical
Property Evaluation and the Open-Source Thermophysical Property Library CoolProp",
Ind. Eng. Chem. Res. 53 (2014) 2498-2508.
IAPWS R7-97(2012), Revised Release on the IAPWS Industrial Formulation 1997 for the
Thermodynamic Properties of Water and Steam.
"""

from .composition import available_fluids, normalise_fractions
from .fluid import R_UNIVERSAL, Fluid
from .state import State, StateArray

__all__ = ["Fluid", "R_UNIVERSAL", "State", "StateArray", "available_fluids",
           "normalise_fractions"]
