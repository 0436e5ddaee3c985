"""Import of field-test readings from CSV and Excel files.

A reading file has one row per scan of the data logger or plant historian and one column per
instrument.  :func:`read_readings` renames the columns to the workbench's reading names
(:data:`READING_KINDS`), converts every column from its stated unit to SI (absolute pressure
in Pa, temperature in K, mass flow in kg/s, volume flow in m^3/s, power in W; shaft speed stays
in rev/min) and records, per row, which cells were missing or were not numbers.  No row is
dropped: a bad cell becomes NaN and the row's ``reading_problem`` says why.

Gauge pressures are converted with a stated ambient (barometric) pressure.  A standard volume
flow is kept as a volume flow at standard conditions; it becomes a mass flow in
:func:`workbench.fieldtest.batch.evaluate` with the standard conditions stated there
(15 degC and 101.325 kPa by default, common practice for natural gas).

References
----------
ASME PTC 19.2-2010, Pressure Measurement (gauge and absolute pressure).
ISO 13443:1996, Natural gas - Standard reference conditions (15 degC, 101.325 kPa).
"""

from __future__ import annotations

import math
import os
import re

import numpy as np
import pandas as pd
import pint

from ..errors import InputError
from ..units import ureg

#: Reading names the batch evaluation understands, with their kind of quantity and SI unit.
READING_KINDS = {
    "inlet_pressure": ("pressure", "Pa"),
    "outlet_pressure": ("pressure", "Pa"),
    "inlet_temperature": ("temperature", "K"),
    "outlet_temperature": ("temperature", "K"),
    "mass_flow": ("mass_flow", "kg/s"),
    "volume_flow": ("volume_flow", "m**3/s"),
    "standard_volume_flow": ("volume_flow", "m**3/s"),
    "power": ("power", "W"),
    "speed": ("speed", "rpm"),
}

#: Column of the returned frame that describes missing or non-numeric cells of a row.
PROBLEM_COLUMN = "reading_problem"

_GAUGE = re.compile(r"^(?P<unit>.*?)\s*(\(g\)|\(gauge\)|\s+gauge|g)$", re.IGNORECASE)
_ABSOLUTE = re.compile(r"^(?P<unit>.*?)\s*(\(a\)|\(abs\)|\s+abs|a)$", re.IGNORECASE)
_PRESSURE_UNITS = {"pa", "kpa", "mpa", "bar", "mbar", "psi", "atm", "torr", "mmhg", "inhg",
                   "hpa"}


def parse_unit(unit: str, kind: str) -> tuple[str, bool]:
    """Split a unit text into a pint unit and a gauge flag.

    Parameters
    ----------
    unit : str
        Unit as written in a column map, e.g. ``"bar(g)"``, ``"psig"``, ``"kPa(a)"``,
        ``"degC"``, ``"m3/h"``, ``"Sm3/h"``, ``"t/h"``, ``"kW"``.
    kind : str
        Kind of quantity (a key of the values of :data:`READING_KINDS`).

    Returns
    -------
    tuple of (str, bool)
        The pint unit text and whether the reading is a gauge pressure.
    """
    if not isinstance(unit, str) or not unit.strip():
        raise InputError(f"unit of a {kind.replace('_', ' ')} column must be a text, not {unit!r}")
    text = unit.strip()
    gauge = False
    if kind == "pressure":
        for pattern, is_gauge in ((_GAUGE, True), (_ABSOLUTE, False)):
            match = pattern.match(text)
            if match and match.group("unit").strip().lower() in _PRESSURE_UNITS:
                text, gauge = match.group("unit").strip(), is_gauge
                break
    if kind == "volume_flow" and text[:1] in ("S", "N") and text[1:2] == "m":
        text = text[1:]  # "Sm3/h": standard cubic metres; the conditions are stated elsewhere
    text = re.sub(r"([a-zA-Z])([23])(?![0-9])", r"\1**\2", text)  # m3/h -> m**3/h
    if text.lower() in ("degc", "°c", "c"):
        text = "degC"
    elif text.lower() in ("degf", "°f", "f"):
        text = "degF"
    return text, gauge


def convert_values(values, unit: str, kind: str, name: str,
                   ambient_pressure: float = 101325.0) -> np.ndarray:
    """Convert an array of readings from ``unit`` to SI (speed: to rev/min).

    Parameters
    ----------
    values : array_like of float
        Readings (NaN allowed).
    unit : str
        Unit text, see :func:`parse_unit`.
    kind : str
        Kind of quantity.
    name : str
        Reading name, used in messages.
    ambient_pressure : float
        Barometric pressure [Pa] added to gauge pressures.

    Returns
    -------
    numpy.ndarray
        Values in SI units (absolute pressure [Pa], temperature [K], ...).
    """
    pint_unit, gauge = parse_unit(unit, kind)
    target = {"pressure": "Pa", "temperature": "K", "mass_flow": "kg/s",
              "volume_flow": "m**3/s", "power": "W", "speed": "rpm"}[kind]
    array = np.asarray(values, dtype=float)
    try:
        converted = ureg.Quantity(array, pint_unit).to(target).magnitude
    except (pint.UndefinedUnitError, pint.DimensionalityError, AttributeError, ValueError):
        raise InputError(
            f"unit {unit!r} of the {name.replace('_', ' ')} column is not a unit of "
            f"{kind.replace('_', ' ')} (e.g. {target})") from None
    if gauge:
        converted = converted + float(ambient_pressure)
    return np.asarray(converted, dtype=float)


def _numbers(column: pd.Series, name: str, source: str, decimal: str = ".",
             thousands: str | None = None) -> tuple[np.ndarray, list]:
    """Numeric values of a column and a per-row problem text ('' when fine)."""
    text = column
    if not pd.api.types.is_numeric_dtype(column):
        text = column.map(lambda c: c.strip() if isinstance(c, str) else c)
        if thousands:
            text = text.map(lambda c: c.replace(thousands, "") if isinstance(c, str) else c)
        if decimal != ".":
            text = text.map(lambda c: c.replace(decimal, ".") if isinstance(c, str) else c)
    numeric = pd.to_numeric(text, errors="coerce")
    values = numeric.to_numpy(dtype=float, copy=True)
    problems = [""] * len(values)
    bad = np.flatnonzero(~np.isfinite(values))
    raw = column.to_numpy(dtype=object)
    for i in bad:
        cell = raw[i]
        if cell is None or (isinstance(cell, float) and math.isnan(cell)) or \
                (isinstance(cell, str) and not cell.strip()):
            problems[i] = f"{name.replace('_', ' ')} reading (column {source!r}) is missing"
        else:
            problems[i] = (f"{name.replace('_', ' ')} reading {str(cell)[:30]!r} "
                           f"(column {source!r}) is not a number")
        values[i] = math.nan
    return values, problems


def readings_from_frame(raw: pd.DataFrame, column_map: dict, units: dict, *,
                        ambient_pressure: float = 101325.0, decimal: str = ".",
                        thousands: str | None = None) -> pd.DataFrame:
    """Rename, check and convert a frame of raw readings; see :func:`read_readings`.

    ``decimal`` and ``thousands`` are the decimal and thousands separators of text cells.
    """
    unknown = [k for k in column_map if k not in READING_KINDS]
    if unknown:
        raise InputError(f"unknown reading name(s) {', '.join(map(repr, unknown))} in the column "
                         f"map: use {', '.join(READING_KINDS)}")
    missing_cols = [c for c in column_map.values() if c not in raw.columns]
    if missing_cols:
        raise InputError(f"column(s) {', '.join(map(repr, missing_cols))} of the column map are "
                         f"not in the file (its columns: {', '.join(map(str, raw.columns))})")
    no_unit = [k for k in column_map if k not in units]
    if no_unit:
        raise InputError(f"no unit given for {', '.join(no_unit)}: every mapped column needs one")
    out = pd.DataFrame(index=raw.index)
    mapped = set(column_map.values())
    for col in raw.columns:
        if col not in mapped:
            out[col] = raw[col]
    problems = [[] for _ in range(len(raw))]
    for name, source in column_map.items():
        values, notes = _numbers(raw[source], name, source, decimal, thousands)
        kind = READING_KINDS[name][0]
        out[name] = convert_values(values, units[name], kind, name, ambient_pressure)
        for i, note in enumerate(notes):
            if note:
                problems[i].append(note)
    out[PROBLEM_COLUMN] = ["; ".join(p) for p in problems]
    return out


def read_readings(path, column_map: dict, units: dict, *, sheet_name=0,
                  ambient_pressure=101325.0, **read_options) -> pd.DataFrame:
    """Read a CSV or Excel file of readings into SI columns with the workbench's names.

    Parameters
    ----------
    path : str, os.PathLike or file-like
        A ``.csv`` (or ``.txt``) file, or an Excel ``.xlsx``/``.xlsm`` workbook (openpyxl).
    column_map : dict
        Reading name (a key of :data:`READING_KINDS`) -> column header in the file, e.g.
        ``{"inlet_pressure": "PT-101 suction", "inlet_temperature": "TT-101"}``.
    units : dict
        Reading name -> unit text: pressures ``"bar(g)"``, ``"barg"``, ``"bar(a)"``, ``"kPa"``,
        ``"psig"``, ...; temperatures ``"degC"``, ``"K"``, ``"degF"``; flows ``"kg/s"``,
        ``"t/h"``, ``"m3/h"``, ``"Sm3/h"``; power ``"kW"``, ``"MW"``; speed ``"rpm"``.
        A pressure without a gauge mark is absolute.
    sheet_name : str or int
        Excel sheet.
    ambient_pressure : float or Quantity
        Barometric pressure [Pa] for gauge readings (default 101325 Pa).
    **read_options
        Passed to :func:`pandas.read_csv` or :func:`pandas.read_excel` (e.g. ``sep=";"``,
        ``decimal=","``, ``skiprows``).

    Returns
    -------
    pandas.DataFrame
        One row per file row, in file order: the mapped readings in SI units under their
        reading names, the unmapped columns unchanged, and ``reading_problem`` (text, empty
        when every mapped cell of the row is a number).

    References
    ----------
    ASME PTC 19.2-2010, Pressure Measurement.
    """
    from ..units import to_si

    ambient = to_si(ambient_pressure, "pressure", "ambient pressure")
    if ambient <= 0:
        raise InputError(f"ambient pressure {ambient:g} Pa must be positive")
    name = str(path) if isinstance(path, (str, os.PathLike)) else getattr(path, "name", "")
    suffix = os.path.splitext(str(name))[1].lower()
    decimal = read_options.pop("decimal", ".")
    thousands = read_options.pop("thousands", None)
    try:
        if suffix in (".xlsx", ".xlsm", ".xls"):
            raw = pd.read_excel(path, sheet_name=sheet_name, dtype=object, keep_default_na=False,
                                na_values=[""], **read_options)
        else:
            raw = pd.read_csv(path, dtype=str, keep_default_na=False, **read_options)
    except FileNotFoundError:
        raise InputError(f"reading file {name!r} does not exist") from None
    except (ValueError, pd.errors.ParserError) as exc:
        raise InputError(f"reading file {name!r} could not be read as a table: {exc}") from None
    raw.columns = [str(c).strip() for c in raw.columns]
    return readings_from_frame(raw, column_map, units, ambient_pressure=ambient,
                               decimal=decimal, thousands=thousands)


__all__ = ["READING_KINDS", "PROBLEM_COLUMN", "read_readings", "readings_from_frame",
           "convert_values", "parse_unit"]
