"""Jupyter widget panels of the workbench (ipywidgets + plotly FigureWidget).

``from workbench.ui import MachinePanel``; ``MachinePanel(case="compressor-demo")`` or
``MachinePanel(case="turbine-demo")`` is an ``ipywidgets.VBox`` to display in a notebook or a
Voila dashboard; :class:`TrainPanel` shows a machine train, :class:`ReadingsPanel` (also
known as ``FieldDataPanel``) evaluates a file of test readings.  No thermodynamics is done in
this package: each panel binds its widgets to a calculation function below it.

Panels are imported when first asked for (module ``__getattr__``), so ``import workbench.ui``
stays light and one panel does not load another's modules.
"""

from __future__ import annotations

import importlib

#: Exported name -> candidate (module, attribute) pairs, the first found is used.
_EXPORTS = {
    "MachinePanel": (("machine_panel", "MachinePanel"),),
    "TrainPanel": (("train_panel", "TrainPanel"),),
    "ReadingsPanel": (("readings_panel", "ReadingsPanel"), ("readings_panel", "FieldDataPanel"),
                      ("test_data_panel", "FieldDataPanel")),
    "FieldDataPanel": (("readings_panel", "FieldDataPanel"), ("readings_panel", "ReadingsPanel"),
                       ("test_data_panel", "FieldDataPanel")),
    "CurvesPanel": (("curves_panel", "CurvesPanel"),),
    "Panel": (("common", "Panel"),),
    "list_demo_cases": (("cases", "list_demo_cases"),),
}

__all__ = sorted(_EXPORTS)


def __getattr__(name):
    for module_name, attr in _EXPORTS.get(name, ()):
        try:
            module = importlib.import_module(f"{__name__}.{module_name}")
        except ModuleNotFoundError as exc:
            if exc.name != f"{__name__}.{module_name}":
                raise
            continue
        if hasattr(module, attr):
            value = getattr(module, attr)
            globals()[name] = value
            return value
    raise AttributeError(f"module {__name__!r} has no attribute {name!r}")


def __dir__():
    return sorted(set(globals()) | set(_EXPORTS))
