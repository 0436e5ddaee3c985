"""Case files of the machine panel (the format and its checks live in
:mod:`workbench.machine_case`; the inputs and their checks in :mod:`workbench.study`).

This module only re-exports those names for the panels and for code written against
``workbench.ui.cases``.  Every case and setup file is read by the one safe JSON reader,
:func:`workbench.casefiles.read_json`.
"""

from __future__ import annotations

from ..machine_case import (
    FORMAT_NAME,
    FORMAT_VERSION,
    case_json,
    list_demo_cases,
    load_demo_case,
    make_case,
    open_case,
    read_case,
    validate_case,
)
from ..study import (
    DEFAULT_INPUTS,
    FLOW_GIVEN,
    MACHINES,
    OUTLET_MODES,
    STATE_GIVEN,
    SWEEP_INPUTS,
    VELOCITY_GIVEN,
)
from ..units import UNIT_SYSTEMS

__all__ = ["DEFAULT_INPUTS", "FLOW_GIVEN", "FORMAT_NAME", "FORMAT_VERSION", "MACHINES",
           "OUTLET_MODES", "STATE_GIVEN", "SWEEP_INPUTS", "UNIT_SYSTEMS", "VELOCITY_GIVEN",
           "case_json", "list_demo_cases", "load_demo_case", "make_case", "open_case",
           "read_case", "validate_case"]
