"""Import of field-test readings from CSV and Excel files.

A reading file has one row per scan of the data logger or plant historian and one column per
instrument.  :func:`read_readings` renames the columns to the workbench's reading names
(:data:`READING_KINDS`), converts every column from its stated unit to SI (absolute pressure
in Pa, temperature in K, mass flow in kg/s, volume flow in m^3/s, power in W; shaft speed stays
in rev/min) and records, per row, which cells were missing or were not numbers.  No row is
dropped: a bad cell becomes NaN and the row's ``reading_problem`` says why.

:func:`read_table` reads the file itself (a path or the bytes of an upload) and refuses, with a
:class:`~workbench.errors.ReadingsError` naming the file, anything that is not a table of
readings: a folder, an empty file, a header without rows, binary data, a damaged or renamed
Excel workbook, a file above the size limit.  Unit texts pass through the input boundary
(:func:`workbench.units.parse_unit`) before pint sees them; a bad one is refused with an
:class:`~workbench.errors.InputError` naming the reading, its column and the unit.

Gauge pressures are converted with a stated ambient (barometric) pressure.  A standard volume
flow is kept as a volume flow at standard conditions; it becomes a mass flow in
:func:`workbench.fieldtest.batch.evaluate` with the standard conditions stated there
(15 degC and 101.325 kPa by default, common practice for natural gas).

References
----------
ASME PTC 19.2-2010, Pressure Measurement (gauge and absolute pressure).
ISO 13443:1996, Natural gas - Standard reference conditions (15 degC, 101.325 kPa).
ECMA-376, Office Open XML File Formats (an .xlsx workbook is a zip archive).
"""

from __future__ import annotations

import codecs
import io
import math
import os
import re
import zipfile

import numpy as np
import pandas as pd

from ..errors import InputError, ReadingsError
from ..units import MAX_MAGNITUDE, ureg
from ..units import count as _count
from ..units import parse_unit as _boundary_unit
from ..units import positive as _positive

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

#: Largest readings file read [bytes]: a logger export of weeks at one scan a second is a
#: few tens of MB.
MAX_FILE_BYTES = 200 * 1024 * 1024

_GAUGE = re.compile(r"^(?P<unit>.*?)\s*(\(g\)|\(gauge\)|\s+gauge|g)$", re.IGNORECASE)
_ABSOLUTE = re.compile(r"^(?P<unit>.*?)\s*(\(a\)|\(abs\)|\s+abs|a)$", re.IGNORECASE)
_PRESSURE_UNITS = {"pa", "kpa", "mpa", "bar", "mbar", "psi", "atm", "torr", "mmhg", "inhg",
                   "hpa"}
#: Shaft-speed unit texts and their factor to rev/min.  pint treats a revolution as 2 pi
#: (dimensionless) radians, so it would turn 1/min or Hz into rev/min wrongly: speed units
#: are read from this table instead (1 rev/s = 60 rev/min; 1 rad/s = 60/(2 pi) rev/min).
_SPEED_FACTORS = {"rpm": 1.0, "rev/min": 1.0, "r/min": 1.0, "1/min": 1.0, "min^-1": 1.0,
                  "min-1": 1.0, "rev/s": 60.0, "rps": 60.0, "r/s": 60.0, "hz": 60.0,
                  "1/s": 60.0, "rad/s": 60.0 / (2.0 * math.pi)}
#: Kind of quantity of the input boundary for each reading kind.
_BOUNDARY_KIND = {"pressure": "pressure", "temperature": "temperature",
                  "mass_flow": "mass_flow", "volume_flow": "volume_flow", "power": "power"}
_TARGET = {"pressure": "Pa", "temperature": "K", "mass_flow": "kg/s", "volume_flow": "m**3/s",
           "power": "W", "speed": "rpm"}
_ZIP_MAGIC = b"PK\x03\x04"
_OLE2_MAGIC = b"\xd0\xcf\x11\xe0\xa1\xb1\x1a\xe1"
_EXCEL_SUFFIXES = (".xlsx", ".xlsm")
_CONTROL = bytes(b for b in range(32) if b not in b"\t\n\r\x0b\x0c") + b"\x7f"


def _words(name: str) -> str:
    return str(name).replace("_", " ")


def _reading_kind(kind) -> str:
    if kind not in _TARGET:
        raise InputError(f"kind of reading {kind!r} is not one of {', '.join(_TARGET)}")
    return kind


def parse_unit(unit, kind: str, name: str | None = None) -> tuple[str, bool]:
    """Split a unit text into a pint unit and a gauge flag, checked at the input boundary.

    Parameters
    ----------
    unit : str
        Unit as written in a column map, e.g. ``"bar(g)"``, ``"psig"``, ``"kPa(a)"``,
        ``"degC"``, ``"m3/h"``, ``"Sm3/h"``, ``"t/h"``, ``"kW"``, ``"rpm"``.
    kind : str
        Kind of quantity (a key of the values of :data:`READING_KINDS`).
    name : str, optional
        What the unit belongs to (e.g. ``"inlet_pressure (column 'PT-101')"``), for messages.

    Returns
    -------
    tuple of (str, bool)
        The pint unit text and whether the reading is a gauge pressure.

    Raises
    ------
    InputError
        For a unit that is not text, that pint cannot parse (``"kg/(s"``) or that is not a
        unit of ``kind``; the message names the reading and the unit.

    Examples
    --------
    >>> parse_unit("bar(g)", "pressure")
    ('bar', True)
    """
    kind = _reading_kind(kind)
    label = _words(name) if name else f"a {_words(kind)} column"
    if not isinstance(unit, str) or not unit.strip():
        raise InputError(f"unit of {label} must be a unit text, not {unit!r}"[:200])
    text = unit.strip()
    if kind == "speed":
        if text.lower() not in _SPEED_FACTORS:
            raise InputError(f"unit of {label} {text[:40]!r} is not a unit of shaft speed: use "
                             + ", ".join(k for k in _SPEED_FACTORS if k != "hz") + " or Hz")
        return text, False
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
    # the boundary checks the characters, pint's parse and the dimension, by name
    try:
        _boundary_unit(text, _BOUNDARY_KIND[kind], label)
    except InputError as exc:
        written = unit.strip()
        raise InputError(str(exc) + (f" (written {written[:40]!r})" if written != text else "")
                         ) from None
    return text, gauge


def convert_values(values, unit: str, kind: str, name: str,
                   ambient_pressure: float = 101325.0, column: str | None = None
                   ) -> np.ndarray:
    """Convert an array of readings from ``unit`` to SI (speed: to rev/min).

    Parameters
    ----------
    values : array_like of float
        Readings (NaN allowed; values that overflow come back as inf).
    unit : str
        Unit text, see :func:`parse_unit`.
    kind : str
        Kind of quantity.
    name : str
        Reading name, used in messages.
    ambient_pressure : float
        Barometric pressure [Pa] added to gauge pressures.
    column : str, optional
        Column of the file the readings come from, named in messages.

    Returns
    -------
    numpy.ndarray
        Values in SI units (absolute pressure [Pa], temperature [K], ...).

    Examples
    --------
    >>> convert_values([25.0], "degC", "temperature", "inlet_temperature")
    array([298.15])
    """
    label = f"{name} (column {column!r})" if column is not None else str(name)
    pint_unit, gauge = parse_unit(unit, kind, label)
    try:
        array = np.asarray(values, dtype=float)
    except (TypeError, ValueError, OverflowError):
        raise InputError(f"{_words(label)} readings must be numbers") from None
    with np.errstate(over="ignore", invalid="ignore"):
        if kind == "speed":
            return array * _SPEED_FACTORS[pint_unit.lower()]
        try:
            converted = ureg.Quantity(array, pint_unit).to(_TARGET[kind]).magnitude
        except Exception:  # noqa: BLE001 - pint raises many kinds; the unit passed the boundary
            raise InputError(f"unit {unit!r} of {_words(label)} cannot be converted to "
                             f"{_TARGET[kind]}") from None
        converted = np.asarray(converted, dtype=float)
        if gauge:
            converted = converted + float(ambient_pressure)
    return converted


def column_numbers(column: pd.Series, name: str, source: str, decimal: str = ".",
                   thousands: str | None = None) -> tuple[np.ndarray, list]:
    """Numbers of a column of readings and, per row, what is wrong with its cell.

    Text cells are stripped and read with the given separators; missing, empty, non-numeric
    and infinite cells become NaN and their row gets a problem text naming the reading, the
    cell and the column.  Nothing is refused: a bad cell spoils its row only.

    Parameters
    ----------
    column : pandas.Series
        The raw cells (numbers or text) of one column.
    name : str
        Reading name for the messages (``"inlet_pressure"``).
    source : str
        Name of the column in the file, for the messages.
    decimal : str, default "."
        Decimal separator of text cells.
    thousands : str, optional
        Thousands separator of text cells (removed before reading).

    Returns
    -------
    values : numpy.ndarray
        The numbers (float), NaN where a cell is missing or bad.
    problems : list of str
        Per row, ``""`` when the cell is a finite number, else why it is not.

    References
    ----------
    RFC 4180, Common Format and MIME Type for Comma-Separated Values (CSV) Files.

    Examples
    --------
    >>> import pandas as pd
    >>> values, problems = column_numbers(pd.Series(["1,5", "", "x"]), "power", "P",
    ...                                   decimal=",")
    >>> float(values[0]), problems[1]
    (1.5, "power reading (column 'P') is missing")
    """
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
            problems[i] = f"{_words(name)} reading (column {source!r}) is missing"
        elif np.isinf(values[i]):
            problems[i] = (f"{_words(name)} reading {str(cell)[:30]!r} (column {source!r}) "
                           "is not a finite number")
        else:
            problems[i] = (f"{_words(name)} reading {str(cell)[:30]!r} "
                           f"(column {source!r}) is not a number")
        values[i] = math.nan
    return values, problems


def _check_maps(raw: pd.DataFrame, column_map, units) -> None:
    """Refuse, by name, column maps and unit maps that are not what the reader needs."""
    for what, given in (("column map", column_map), ("units", units)):
        if not isinstance(given, dict):
            raise InputError(f"{what} must be a dict of reading name -> text, not "
                             f"{type(given).__name__}")
        unknown = [k for k in given if k not in READING_KINDS]
        if unknown:
            raise InputError(f"unknown reading name(s) {', '.join(map(repr, unknown))} in the "
                             f"{what}: use {', '.join(READING_KINDS)}"[:400])
    for name, source in column_map.items():
        if not isinstance(source, str) or not source.strip():
            raise InputError(f"column map entry {name!r} must name a column of the file (text), "
                             f"not {source!r}"[:200])
    missing_cols = [c for c in column_map.values() if c not in raw.columns]
    if missing_cols:
        shown = ", ".join(map(str, raw.columns[:50])) + (", ..." if raw.shape[1] > 50 else "")
        raise InputError(f"column(s) {', '.join(map(repr, missing_cols))} of the column map are "
                         f"not in the file (its columns: {shown})")
    no_unit = [k for k in column_map if k not in units]
    if no_unit:
        raise InputError(f"no unit given for {', '.join(no_unit)}: every mapped column needs one")
    duplicated = sorted({str(c) for c in raw.columns[raw.columns.duplicated()]})
    if duplicated:
        raise InputError(f"the file has more than one column named "
                         f"{', '.join(map(repr, duplicated[:10]))}: rename them")


def readings_from_frame(raw: pd.DataFrame, column_map: dict, units: dict, *,
                        ambient_pressure: float = 101325.0, decimal: str = ".",
                        thousands: str | None = None) -> pd.DataFrame:
    """Rename, check and convert a frame of raw readings; see :func:`read_readings`.

    ``decimal`` and ``thousands`` are the decimal and thousands separators of text cells.
    The frame is built in one step, so a file of thousands of columns takes time in
    proportion to its size.
    """
    if not isinstance(raw, pd.DataFrame):
        raise InputError(f"readings must be a pandas DataFrame, not {type(raw).__name__}")
    ambient = _positive(ambient_pressure, "pressure", "ambient pressure")
    for label, sep in (("decimal separator", decimal), ("thousands separator", thousands)):
        if sep is not None and (not isinstance(sep, str) or len(sep) != 1):
            raise InputError(f"{label} must be one character, not {sep!r}"[:120])
    if thousands is not None and thousands == decimal:
        raise InputError(f"thousands separator {thousands!r} is the decimal separator too")
    _check_maps(raw, column_map, units)
    produced = set(column_map) | {PROBLEM_COLUMN}
    mapped = set(column_map.values())
    kept = raw.loc[:, [c not in mapped and c not in produced for c in raw.columns]]
    columns = {}
    problems = [[] for _ in range(len(raw))]
    for name, source in column_map.items():
        values, notes = column_numbers(raw[source], name, source, decimal, thousands)
        kind = READING_KINDS[name][0]
        si = convert_values(values, units[name], kind, name, ambient, column=source)
        huge = np.flatnonzero(~np.isfinite(si) & ~np.isnan(values)
                              | (np.abs(np.nan_to_num(si)) > MAX_MAGNITUDE))
        for i in huge:
            notes[i] = (f"{_words(name)} reading {values[i]:g} (column {source!r}) is too large:"
                        f" more than {MAX_MAGNITUDE:g} {_TARGET[kind]}")
            si[i] = math.nan
        columns[name] = pd.Series(si, index=raw.index)
        for i, note in enumerate(notes):
            if note:
                problems[i].append(note)
    columns[PROBLEM_COLUMN] = pd.Series(["; ".join(p) for p in problems], index=raw.index,
                                        dtype=object)
    return pd.concat([kept, pd.DataFrame(columns, index=raw.index)], axis=1)


# ---------------------------------------------------------------------- the file itself
def _label(source, file_name) -> str:
    if file_name:
        text = str(file_name)
    elif isinstance(source, (str, os.PathLike)):
        text = str(os.fspath(source))
    elif isinstance(source, (bytes, bytearray, memoryview)):
        text = "uploaded file"
    else:
        text = str(getattr(source, "name", "") or "readings file")
    return text if len(text) <= 80 else text[:77] + "..."


def _read_path(source, label: str, max_bytes: int) -> bytes:
    problem = None
    try:
        path = os.fspath(source)
        if os.path.isdir(path):
            problem = "is a folder, not a file"
        elif os.path.getsize(path) > max_bytes:
            problem = f"is larger than the limit of {max_bytes:,} bytes"
        else:
            with open(path, "rb") as handle:
                return handle.read(max_bytes + 1)
    except FileNotFoundError:
        problem = "does not exist"
    except IsADirectoryError:
        problem = "is a folder, not a file"
    except PermissionError:
        problem = "cannot be opened: permission denied"
    except (OSError, ValueError, TypeError) as exc:  # a bad name, NUL in the name...
        problem = f"cannot be opened ({type(exc).__name__})"
    raise ReadingsError(f"reading file {label!r} {problem}")


def _read_source(source, label: str, max_bytes: int):
    """Bytes (or text, from a text stream) of a path, bytes or a file-like object."""
    if isinstance(source, (bytes, bytearray, memoryview)):
        data = bytes(source)
    elif isinstance(source, (str, os.PathLike)):
        data = _read_path(source, label, max_bytes)
    elif callable(getattr(source, "read", None)):
        try:
            data = source.read(max_bytes + 1)
        except (OSError, ValueError, UnicodeDecodeError) as exc:
            raise ReadingsError(f"reading file {label!r} cannot be read "
                                f"({type(exc).__name__})") from None
        if not isinstance(data, (str, bytes)):
            raise ReadingsError(f"reading file {label!r} gave {type(data).__name__}, not text")
    else:
        raise InputError(f"a readings file must be a path, the file's bytes or an open file, "
                         f"not {type(source).__name__}")
    if len(data) > max_bytes:
        raise ReadingsError(f"reading file {label!r} is larger than the limit of "
                            f"{max_bytes:,} bytes")
    return data


def _decode(data: bytes, label: str) -> str:
    """CSV bytes as text: UTF-8 (with or without a byte-order mark), UTF-16 with its mark,
    else Windows-1252 / Latin-1 (common in logger exports); binary data is refused."""
    if data.startswith((codecs.BOM_UTF16_LE, codecs.BOM_UTF16_BE)):
        try:
            return data.decode("utf-16")
        except UnicodeDecodeError:
            raise ReadingsError(f"reading file {label!r} is not valid UTF-16 text") from None
    head = data[:65536]
    if b"\x00" in head or sum(head.count(c) for c in _CONTROL) > 0.05 * len(head):
        raise ReadingsError(f"reading file {label!r} holds binary data, not a CSV text table")
    for encoding in ("utf-8-sig", "cp1252", "latin-1"):
        try:
            return data.decode(encoding)
        except UnicodeDecodeError:
            continue
    raise ReadingsError(f"reading file {label!r} is not text")  # pragma: no cover (latin-1)


#: Most a workbook may expand to when unzipped, as a multiple of the size limit (a sheet of
#: numbers compresses about tenfold; a "zip bomb" expands a thousandfold).
MAX_EXPANSION = 50


def _check_archive(data: bytes, label: str, max_bytes: int) -> None:
    """Refuse a damaged archive or one that would expand beyond reason before parsing it."""
    try:
        with zipfile.ZipFile(io.BytesIO(data)) as archive:
            expanded = sum(item.file_size for item in archive.infolist())
    except (zipfile.BadZipFile, OSError, ValueError, EOFError):
        raise ReadingsError(f"reading file {label!r} is a damaged or truncated Excel workbook"
                            ) from None
    limit = MAX_EXPANSION * max_bytes
    if expanded > limit:
        raise ReadingsError(f"reading file {label!r} expands to {expanded:,} bytes when "
                            f"unzipped, more than the limit of {limit:,}")


def _parse_excel(data: bytes, label: str, sheet_name, read_options) -> pd.DataFrame:
    try:
        return pd.read_excel(io.BytesIO(data), sheet_name=sheet_name, dtype=object,
                             keep_default_na=False, na_values=[""], engine="openpyxl",
                             **read_options)
    except zipfile.BadZipFile:
        raise ReadingsError(f"reading file {label!r} is a damaged or truncated Excel workbook"
                            ) from None
    except (ValueError, IndexError) as exc:
        if "sheet" in str(exc).lower():
            raise ReadingsError(f"reading file {label!r} has no worksheet {sheet_name!r}"
                                ) from None
        raise ReadingsError(f"reading file {label!r} could not be read as an Excel workbook "
                            f"({type(exc).__name__})") from None
    except TypeError as exc:
        raise InputError(f"a read option for {label!r} is not one pandas.read_excel takes: "
                         f"{exc}"[:200]) from None
    except Exception as exc:  # noqa: BLE001 - openpyxl on a damaged archive raises anything
        raise ReadingsError(f"reading file {label!r} is not a readable Excel workbook "
                            f"({type(exc).__name__})") from None


def _parse_csv(text: str, label: str, read_options) -> pd.DataFrame:
    if not text.strip():
        raise ReadingsError(f"reading file {label!r} is empty")
    try:
        return pd.read_csv(io.StringIO(text), dtype=object, keep_default_na=False, **read_options)
    except pd.errors.EmptyDataError:
        raise ReadingsError(f"reading file {label!r} is empty: no header row") from None
    except pd.errors.ParserError as exc:
        detail = str(exc).strip().splitlines()[-1][:120] if str(exc).strip() else ""
        raise ReadingsError(f"reading file {label!r} could not be read as a table: {detail}"
                            ) from None
    except TypeError as exc:
        raise InputError(f"a read option for {label!r} is not one pandas.read_csv takes: "
                         f"{exc}"[:200]) from None
    except Exception as exc:  # noqa: BLE001 - the CSV sniffer and parser raise many kinds
        raise ReadingsError(f"reading file {label!r} could not be read as a table "
                            f"({type(exc).__name__}: {str(exc)[:80]})") from None


def read_table(source, *, file_name: str | None = None, sheet_name=0,
               max_bytes: int = MAX_FILE_BYTES, **read_options) -> pd.DataFrame:
    """The raw table of a readings file: text cells, headers stripped, at least one row.

    Parameters
    ----------
    source : str, os.PathLike, bytes or file-like
        A path, the bytes of an uploaded file, or an open file (binary or text).
    file_name : str, optional
        Name used in messages and to tell an Excel workbook by its suffix (``.xlsx``,
        ``.xlsm``); an upload's bytes are recognised by their content too.
    sheet_name : str or int
        Excel sheet.
    max_bytes : int
        Size limit [bytes] (default :data:`MAX_FILE_BYTES`).
    **read_options
        Passed to :func:`pandas.read_csv` or :func:`pandas.read_excel` (e.g. ``sep=";"``).

    Returns
    -------
    pandas.DataFrame
        One column per file column (unique, stripped header texts), one row per file row.

    Raises
    ------
    ReadingsError
        Naming the file: missing, a folder, above the size limit, empty, a header without
        rows, binary data, a damaged, truncated or renamed Excel workbook, the old binary
        ``.xls`` format, a sheet that does not exist, rows that do not split into the
        header's columns, headers that repeat.

    Examples
    --------
    >>> read_table(b"P1,T1\\n1.2,20\\n", file_name="log.csv").shape
    (1, 2)
    """
    label = _label(source, file_name)
    limit = _count(max_bytes, "largest readings file size", low=1)
    data = _read_source(source, label, limit)
    suffix = os.path.splitext(file_name or (label if isinstance(source, (str, os.PathLike))
                                            else ""))[1].lower()
    if isinstance(data, bytes) and data.startswith(_OLE2_MAGIC) or suffix == ".xls":
        raise ReadingsError(f"reading file {label!r} is in the old binary Excel format (.xls): "
                            "save it as .xlsx or CSV")
    if isinstance(data, bytes) and data.startswith(_ZIP_MAGIC):
        _check_archive(data, label, limit)
        raw = _parse_excel(data, label, sheet_name, read_options)
    elif suffix in _EXCEL_SUFFIXES:
        what = "empty" if not data else "not an Excel workbook (an .xlsx file is a zip archive)"
        raise ReadingsError(f"reading file {label!r} is {what}")
    else:
        text = data if isinstance(data, str) else _decode(data, label)
        raw = _parse_csv(text, label, read_options)
    if not isinstance(raw, pd.DataFrame):
        raise InputError(f"reading file {label!r}: give one sheet, not {sheet_name!r}")
    raw.columns = [str(c).strip() for c in raw.columns]
    if raw.shape[1] == 0:
        raise ReadingsError(f"reading file {label!r} is empty: no columns")
    duplicated = sorted(set(raw.columns[raw.columns.duplicated()]))
    if duplicated:
        raise ReadingsError(f"reading file {label!r} has more than one column named "
                            f"{', '.join(map(repr, duplicated[:10]))}")
    if len(raw) == 0:
        raise ReadingsError(f"reading file {label!r} has a header row but no readings")
    return raw


def read_readings(path, column_map: dict, units: dict, *, sheet_name=0,
                  ambient_pressure=101325.0, file_name: str | None = None,
                  max_bytes: int = MAX_FILE_BYTES, **read_options) -> pd.DataFrame:
    """Read a CSV or Excel file of readings into SI columns with the workbench's names.

    Parameters
    ----------
    path : str, os.PathLike, bytes or file-like
        A ``.csv`` (or ``.txt``) file, or an Excel ``.xlsx``/``.xlsm`` workbook (openpyxl);
        a path, the file's bytes (an upload) or an open file.  See :func:`read_table`.
    column_map : dict
        Reading name (a key of :data:`READING_KINDS`) -> column header in the file, e.g.
        ``{"inlet_pressure": "PT-101 suction", "inlet_temperature": "TT-101"}``.
    units : dict
        Reading name -> unit text: pressures ``"bar(g)"``, ``"barg"``, ``"bar(a)"``, ``"kPa"``,
        ``"psig"``, ...; temperatures ``"degC"``, ``"K"``, ``"degF"``; flows ``"kg/s"``,
        ``"t/h"``, ``"m3/h"``, ``"Sm3/h"``; power ``"kW"``, ``"MW"``; speed ``"rpm"``
        (``"rev/s"``, ``"Hz"``, ``"rad/s"`` too).  A pressure without a gauge mark is absolute.
    sheet_name : str or int
        Excel sheet.
    ambient_pressure : float or Quantity
        Barometric pressure [Pa] for gauge readings (default 101325 Pa).
    file_name : str, optional
        Name of the file for messages (and its suffix), useful when ``path`` is bytes.
    max_bytes : int
        Size limit of the file [bytes].
    **read_options
        Passed to :func:`pandas.read_csv` or :func:`pandas.read_excel` (e.g. ``sep=";"``,
        ``decimal=","``, ``skiprows``).

    Returns
    -------
    pandas.DataFrame
        One row per file row, in file order: the mapped readings in SI units under their
        reading names, the unmapped columns unchanged, and ``reading_problem`` (text, empty
        when every mapped cell of the row is a number).

    Raises
    ------
    ReadingsError
        For a file that is not a table of readings (see :func:`read_table`).
    InputError
        For a column map or unit map that does not fit the file, naming the reading, the
        column and the unit.

    References
    ----------
    ASME PTC 19.2-2010, Pressure Measurement.

    Examples
    --------
    >>> frame = read_readings(b"P1;T1\\n2,0;20\\n", {"inlet_pressure": "P1",
    ...                       "inlet_temperature": "T1"}, {"inlet_pressure": "bar(g)",
    ...                       "inlet_temperature": "degC"}, sep=";", decimal=",")
    >>> float(frame.loc[0, "inlet_pressure"])
    301325.0
    """
    ambient = _positive(ambient_pressure, "pressure", "ambient pressure")
    decimal = read_options.pop("decimal", ".")
    thousands = read_options.pop("thousands", None)
    raw = read_table(path, file_name=file_name, sheet_name=sheet_name, max_bytes=max_bytes,
                     **read_options)
    return readings_from_frame(raw, column_map, units, ambient_pressure=ambient,
                               decimal=decimal, thousands=thousands)


__all__ = ["READING_KINDS", "PROBLEM_COLUMN", "MAX_FILE_BYTES", "read_readings", "read_table",
           "readings_from_frame", "convert_values", "parse_unit", "column_numbers"]
