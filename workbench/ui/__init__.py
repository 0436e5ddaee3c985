"""Jupyter widget panels of the workbench (ipywidgets + plotly FigureWidget).

``from workbench.ui import MachinePanel``; ``MachinePanel(case="compressor-demo")`` or
``MachinePanel(case="turbine-demo")`` is an ``ipywidgets.VBox`` to display in a notebook or a
Voila dashboard; :class:`TrainPanel` shows a machine train, :class:`ReadingsPanel` evaluates
a file of test readings.  No thermodynamics is done in
this package: each panel binds its widgets to a calculation function below it.

Panels are imported when first asked for (module ``__getattr__``), so ``import workbench.ui``
stays light and one panel does not load another's modules.
"""

from __future__ import annotations

import importlib

#: Exported name -> (module, attribute).
_EXPORTS = {
    "MachinePanel": ("machine_panel", "MachinePanel"),
    "TrainPanel": ("train_panel", "TrainPanel"),
    "ReadingsPanel": ("readings_panel", "ReadingsPanel"),
    "CurvesPanel": ("curves_panel", "CurvesPanel"),
    "Panel": ("common", "Panel"),
    "list_demo_cases": ("cases", "list_demo_cases"),
}

__all__ = sorted(_EXPORTS)


def __getattr__(name):
    if name not in _EXPORTS:
        raise AttributeError(f"module {__name__!r} has no attribute {name!r}")
    module_name, attr = _EXPORTS[name]
    value = getattr(importlib.import_module(f"{__name__}.{module_name}"), attr)
    globals()[name] = value
    return value


def __dir__():
    return sorted(set(globals()) | set(_EXPORTS))
