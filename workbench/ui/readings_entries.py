"""Entry widgets of the readings dashboard: the column map rows and the labelled layout.

A :class:`ColumnRow` is one reading of :data:`~workbench.fieldtest.readers.READING_KINDS`: the
file column it is read from, the unit of that column and its steady-state tolerance (a
difference in that unit).  Widgets only: the conversions are
:func:`workbench.fieldtest.setup_file.difference_to_si` and friends.

CSS hooks: ``wb-input-map-<reading>``, ``wb-input-unit-<reading>`` and
``wb-input-tolerance-<reading>`` (underscores of the reading name become hyphens).
"""

from __future__ import annotations

import html

import ipywidgets as widgets

from ..fieldtest.readers import READING_KINDS
from ..fieldtest.setup_file import UNIT_CHOICES, tolerance_unit
from .common import input_class

#: The column choice of a reading that is not mapped.
NONE = "(not measured)"
#: Labels of the readings.
LABELS = {
    "inlet_pressure": "Inlet pressure", "inlet_temperature": "Inlet temperature",
    "outlet_pressure": "Outlet pressure", "outlet_temperature": "Outlet temperature",
    "mass_flow": "Mass flow", "volume_flow": "Inlet volume flow",
    "standard_volume_flow": "Standard volume flow (15 °C, 101.325 kPa)",
    "power": "Shaft power", "speed": "Speed",
}


def dropdown(name, label, options, value, width="520px", label_width="170px"):
    """A dropdown with class ``wb-input-<name>``."""
    w = widgets.Dropdown(options=list(options), value=value, description=label,
                         style={"description_width": label_width},
                         layout=widgets.Layout(width=width))
    input_class(w, name)
    return w


class ColumnRow(widgets.HBox):
    """One reading's file column, unit and steady-state tolerance.

    Attributes
    ----------
    name, kind : str
        Reading name and its kind of quantity.
    column, unit : ipywidgets.Dropdown
        File column (:data:`NONE` when not mapped) and unit text of the column.
    tolerance : ipywidgets.FloatText
        Steady-state tolerance in the unit shown by :attr:`tolerance_unit`.
    tolerance_unit : ipywidgets.Label
        Unit of a difference of readings in the column's unit (``bar`` for ``bar(g)``).
    """

    def __init__(self, name: str):
        self.name = name
        self.kind = READING_KINDS[name][0]
        hook = name.replace("_", "-")
        self.column = dropdown(f"map-{hook}", LABELS[name], [NONE], NONE, "640px", "300px")
        choices = UNIT_CHOICES[self.kind]
        self.unit = widgets.Dropdown(options=choices, value=choices[0],
                                     layout=widgets.Layout(width="110px"))
        input_class(self.unit, f"unit-{hook}")
        self.tolerance = widgets.FloatText(value=0.0, continuous_update=False,
                                           layout=widgets.Layout(width="90px"))
        input_class(self.tolerance, f"tolerance-{hook}")
        self.tolerance_unit = widgets.Label(tolerance_unit(choices[0], self.kind),
                                            layout=widgets.Layout(width="70px"))
        self.tolerance_box = widgets.HBox([self.tolerance, self.tolerance_unit],
                                          layout=widgets.Layout(visibility="hidden"))
        super().__init__([self.column, self.unit, self.tolerance_box],
                         layout=widgets.Layout(align_items="center"))

    @property
    def mapped(self) -> bool:
        """Whether a file column is chosen."""
        return self.column.value != NONE

    def show_tolerance(self):
        """Show the tolerance entry (mapped readings only) in the unit of the column."""
        self.tolerance_box.layout.visibility = "visible" if self.mapped else "hidden"
        self.tolerance_unit.value = tolerance_unit(self.unit.value, self.kind)


def column_header() -> widgets.HBox:
    """The heading row above the column rows."""
    return widgets.HBox([
        widgets.HTML("<span class='wb-head'>reading and file column</span>",
                     layout=widgets.Layout(width="640px")),
        widgets.HTML("<span class='wb-head'>unit</span>", layout=widgets.Layout(width="110px")),
        widgets.HTML("<span class='wb-head'>steady tolerance ±</span>")])


def labelled(label: str, widget) -> widgets.HBox:
    """A widget behind a left-aligned label, lined up with the number entries."""
    return widgets.HBox([widgets.Label(label, layout=widgets.Layout(width="170px")), widget],
                        layout=widgets.Layout(align_items="center"))


def heading(text: str) -> widgets.HTML:
    """A section heading."""
    return widgets.HTML(f"<div class='wb-section'>{html.escape(text)}</div>")


def note(text: str, width: str = "760px", margin: str = "0") -> widgets.HTML:
    """A short explanatory note."""
    return widgets.HTML(f"<div class='wb-note'>{html.escape(text)}</div>",
                        layout=widgets.Layout(width=width, margin=margin))


__all__ = ["LABELS", "NONE", "ColumnRow", "column_header", "dropdown", "heading", "labelled",
           "note"]
