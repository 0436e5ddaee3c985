"""Jupyter widget panels of the workbench (ipywidgets + plotly FigureWidget).

``from workbench.ui import MachinePanel``; ``MachinePanel(case="compressor-demo")`` or
``MachinePanel(case="turbine-demo")`` is an ``ipywidgets.VBox`` to display in a notebook or a
Voila dashboard.  ``ReadingsPanel.demo()`` is the readings (field-test) dashboard.  No
thermodynamics is done in this package.
"""

from .cases import list_demo_cases
from .machine_panel import MachinePanel
from .readings_panel import ReadingsPanel

__all__ = ["MachinePanel", "ReadingsPanel", "list_demo_cases"]
