"""Point tables of the curves dashboard: typed or uploaded text, parsed as numbers only.

A table is plain text, one point a line, cells separated by commas, semicolons, tabs or
spaces; a first line with letters is a header and is skipped, as are empty lines and lines
starting with ``#``.  Every cell must look like a decimal number (``1.5``, ``-2e3``): text
is never evaluated, and ``nan`` or ``inf`` are refused.  A column left empty on every line
is "not given" (an optional column such as power); a column filled on some lines only is
refused with the line named.  Values are in the display units of the unit switch and are
converted to SI here (:func:`workbench.ui.common.to_si`).

The readings dashboard's result file becomes test points in
:func:`workbench.curves.cases.points_from_readings`.
"""

from __future__ import annotations

import re

import numpy as np

from ..errors import InputError
from ..units import NUMBER_TEXT, RPM
from .common import format_typed, from_si, round_for_entry, to_si, unit_label

#: Largest table upload accepted [bytes].
TABLE_LIMIT_BYTES = 200_000
#: Most points a table may hold.
MAX_POINTS = 200


class Column:
    """One column of a point table.

    Parameters
    ----------
    key : str
        Key in the case file (``flow``, ``head`` ...).
    label : str
        Words of the header.
    kind : str
        Display kind (:func:`workbench.ui.common.from_si`), or ``"rpm"`` for a speed.
    optional : bool
        Whether the column may be left empty.
    """

    def __init__(self, key, label, kind, optional=False):
        self.key, self.label, self.kind, self.optional = key, label, kind, optional

    def unit(self, system) -> str:
        return "rpm" if self.kind == "rpm" else unit_label(system, self.kind)

    def to_si(self, system, values):
        if self.kind == "rpm":
            return values * RPM
        return np.asarray(to_si(system, values, self.kind), dtype=float)

    def from_si(self, system, values):
        if self.kind == "rpm":
            return np.asarray(values, dtype=float) / RPM
        return np.asarray(from_si(system, np.asarray(values, dtype=float), self.kind),
                          dtype=float)


HEAD_KINDS = {"pump": "elevation", "fan": "absolute_pressure",
              "compressor": "specific_enthalpy"}


def curve_columns(machine: str) -> tuple:
    """Columns of a datasheet curve of a machine kind."""
    head = {"pump": "pump total head", "fan": "fan pressure",
            "compressor": "polytropic head"}[machine]
    cols = [Column("flow", "flow", "volume_flow"), Column("head", head, HEAD_KINDS[machine]),
            Column("efficiency", "efficiency", "percent", True),
            Column("power", "power", "power", True)]
    if machine == "pump":
        cols.append(Column("npsh_required", "NPSH required", "elevation", True))
    return tuple(cols)


def measured_columns(machine: str) -> tuple:
    """Columns of the test points: pump flow, head and power; compressor readings."""
    if machine == "compressor":
        return (Column("inlet_pressure", "inlet pressure", "absolute_pressure"),
                Column("inlet_temperature", "inlet temperature", "temperature"),
                Column("discharge_pressure", "discharge pressure", "absolute_pressure"),
                Column("discharge_temperature", "discharge temperature", "temperature"),
                Column("volume_flow", "inlet flow", "volume_flow"),
                Column("speed", "speed", "rpm"))
    return (Column("test_flow", "flow", "volume_flow"),
            Column("test_head", "pump total head", "elevation"),
            Column("test_power", "power input", "power", True))


def header_line(columns, system) -> str:
    """Header text of a table, e.g. ``flow [m³/h], pump total head [m]``."""
    return ", ".join(f"{c.label} [{c.unit(system)}]" for c in columns)


def format_table(columns, si: dict, system) -> str:
    """Table text of SI columns (key -> sequence) in display units, header first."""
    lines = [header_line(columns, system)]
    given = [c for c in columns if si.get(c.key) is not None]
    if not given:
        return lines[0] + "\n"
    size = len(si[given[0].key])
    shown = {c.key: c.from_si(system, si[c.key]) for c in given}
    for i in range(size):
        cells = [format_typed(round_for_entry(float(shown[c.key][i]))) if c in given else ""
                 for c in columns]
        lines.append(", ".join(cells).rstrip(", "))
    return "\n".join(lines) + "\n"


def _cells(line):
    line = line.strip()
    if "," in line or ";" in line or "\t" in line:
        return [c.strip() for c in re.split(r"[,;\t]", line)]
    return line.split()


def parse_table(text: str, columns, system, what: str = "table") -> dict:
    """Parse table text into SI arrays: key -> numpy array, or None for an empty column.

    Raises
    ------
    InputError
        A cell that is not a plain number, too many cells, a required column empty, an
        optional column partly filled, more than :data:`MAX_POINTS` lines.
    """
    if not isinstance(text, str):
        raise InputError(f"{what} must be text")
    rows, first = [], True
    for number, line in enumerate(text.splitlines(), start=1):
        stripped = line.strip()
        if not stripped or stripped.startswith("#"):
            continue
        if first and re.search(r"[A-DF-Za-df-z]", stripped):
            first = False
            continue  # a header line (letters other than an exponent's e)
        first = False
        cells = _cells(stripped)
        if len(cells) > len(columns):
            raise InputError(f"{what}, line {number}: {len(cells)} cells, at most "
                             f"{len(columns)} ({header_line(columns, system)})")
        for cell in cells:
            if cell and not NUMBER_TEXT.fullmatch(cell):
                raise InputError(f"{what}, line {number}: {cell[:30]!r} is not a number")
        rows.append((number, cells + [""] * (len(columns) - len(cells))))
    if len(rows) > MAX_POINTS:
        raise InputError(f"{what} has {len(rows)} points: at most {MAX_POINTS} are accepted")
    out = {}
    for j, col in enumerate(columns):
        filled = [(n, c[j]) for n, c in rows if c[j]]
        if not filled:
            if not col.optional and rows:
                raise InputError(f"{what}: the {col.label} column is empty")
            out[col.key] = None
            continue
        if len(filled) != len(rows):
            missing = next(n for n, c in rows if not c[j])
            raise InputError(f"{what}, line {missing}: the {col.label} is missing (fill the "
                             "column on every line or leave it empty on all)")
        values = np.array([float(c) for _, c in filled])
        out[col.key] = col.to_si(system, values)
    out["_rows"] = len(rows)
    return out


__all__ = ["Column", "MAX_POINTS", "TABLE_LIMIT_BYTES", "curve_columns", "format_table",
           "header_line", "parse_table", "measured_columns"]
