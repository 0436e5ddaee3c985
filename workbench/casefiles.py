"""Case and setup files: one safe JSON reader and one schema check, below the panels.

Case files (a machine panel's inputs) and setup files (a readings file's column map and
options) are plain JSON, read here and checked key by key; nothing is evaluated or unpickled.

Reading (:func:`read_json`, :func:`parse_json`, :func:`load_json_file`)
    Where the JSON comes from is always explicit: **bytes** are JSON content; a **str** is
    JSON content only when the caller says so (``read_json(text, "case", text=True)`` or
    :func:`parse_json`); a file is read only from an **os.PathLike** (``pathlib.Path``) given
    to :func:`read_json`, or from a path given to :func:`load_json_file`.  A str given to
    :func:`read_json` without ``text=True`` is refused, so text typed or uploaded as a case
    is never opened as a path.  The reader refuses, with a
    :class:`~workbench.errors.CaseFileError` naming the key where there is one: content
    above the size limit, text that is not UTF-8, null characters, nesting deeper than
    :data:`MAX_DEPTH` (no RecursionError), integers of more than :data:`MAX_INT_DIGITS`
    digits, numbers that overflow, ``NaN``/``Infinity`` literals, keys that appear twice in
    one object, and a top level that is not an object.

Checking (:func:`validate`)
    A schema maps each key to a spec: :class:`Number` (a quantity of a kind of
    :data:`workbench.units.SI_UNITS`, with a range), :class:`Whole`, :class:`Choice`,
    :class:`Text`, :class:`Flag`, :class:`Exact`, :class:`Object` (a nested schema),
    :class:`MappingOf` (free names -> one spec, e.g. a gas composition) and :class:`ListOf`.
    Every value passes through the project's input boundary (:func:`workbench.units.to_si`,
    ``count``, ``choice``, ``text``, ``flag``); unknown keys, missing keys and wrong values
    are refused with a CaseFileError naming the key (``"case key 'inputs.mass_flow_kg_per_s'
    ..."``).  A spec takes ``required=False`` and a ``default`` for keys that may be left
    out (defaults are copied, never shared), and ``nullable=True`` for a value that may be
    ``null`` (returned as None).

Examples
--------
>>> schema = {"machine": Choice(("compressor", "turbine")),
...           "inlet_pressure_Pa": Number("pressure", low=0.0, low_open=True),
...           "title": Text(required=False, default="", empty=True)}
>>> data = read_json(b'{"machine": "turbine", "inlet_pressure_Pa": 4e6}', "case")
>>> validate(data, schema, "case")
{'machine': 'turbine', 'inlet_pressure_Pa': 4000000.0, 'title': ''}

References
----------
T. Bray (ed.), RFC 8259, The JavaScript Object Notation (JSON) Data Interchange Format, 2017
(section 4: "the names within an object SHOULD be unique"; section 6: numbers, no NaN or
infinity).
"""

from __future__ import annotations

import copy
import json
import math
import os
from dataclasses import dataclass, field
from typing import Any

import numpy as np

from . import units
from .errors import CaseFileError, InputError, WorkbenchError

#: Largest JSON content read [bytes]; a case or setup file is a few kB.
MAX_BYTES = 1_000_000
#: Deepest nesting of objects and lists accepted (the formats need 3).
MAX_DEPTH = 20
#: Most digits of an integer accepted (a float holds about 16 significant digits).
MAX_INT_DIGITS = 30

_MISSING = object()


# ---------------------------------------------------------------------- reading
class _Refused:
    """A value the parser met and refused; reported with its key by :func:`_check_tree`."""

    def __init__(self, reason: str):
        self.reason = reason


class _Pairs(dict):
    """An object as parsed, remembering the names that appeared more than once."""

    duplicates: tuple = ()


def _pairs(pairs):
    obj = _Pairs(pairs)
    if len(obj) != len(pairs):
        seen, twice = set(), []
        for key, _ in pairs:
            if key in seen and key not in twice:
                twice.append(key)
            seen.add(key)
        obj.duplicates = tuple(twice)
    return obj


def _parse_int(digits: str):
    if len(digits.lstrip("-")) > MAX_INT_DIGITS:
        return _Refused(f"is an integer of {len(digits.lstrip('-'))} digits: at most "
                        f"{MAX_INT_DIGITS} are accepted")
    return int(digits)


def _parse_float(literal: str):
    value = float(literal)
    if not math.isfinite(value):
        return _Refused(f"is the number {literal[:30]}, which overflows a float")
    return value


def _parse_constant(name: str):
    return _Refused(f"is {name}, which is not a number JSON allows")


def _depth(text: str) -> int:
    """Deepest nesting of brackets outside strings: one vectorised pass, no recursion and
    no regular expression (so no backtracking on hostile text).

    A quote opens or closes a string unless an odd number of backslashes precedes it; UTF-8
    never puts an ASCII byte inside a multi-byte character, so bytes can be scanned.
    """
    data = np.frombuffer(text.encode("utf-8", "surrogatepass"), dtype=np.uint8)
    if data.size == 0:
        return 0
    index = np.arange(data.size)
    backslash = data == ord("\\")
    last_other = np.maximum.accumulate(np.where(backslash, -1, index))
    run_before = np.zeros(data.size, dtype=np.int64)
    run_before[1:] = index[:-1] - last_other[:-1]  # backslashes just before each byte
    quote = (data == ord('"')) & (run_before % 2 == 0)
    outside = np.cumsum(quote) % 2 == 0
    opening = ((data == ord("[")) | (data == ord("{"))) & outside
    closing = ((data == ord("]")) | (data == ord("}"))) & outside
    if not opening.any():
        return 0
    return int(np.cumsum(opening.astype(np.int64) - closing.astype(np.int64)).max())


def _where(path: str) -> str:
    return repr(path) if path else "at the top level"


def _check_tree(value, what: str, max_depth: int = MAX_DEPTH):
    """Walk a parsed (or given) tree without recursion; refuse what JSON files must not hold.

    Returns the tree with parser objects replaced by plain dicts.
    """
    root = {"": value}
    stack = [(root, "", "", 0)]
    while stack:
        parent, key, path, depth = stack.pop()
        item = parent[key]
        where = f"{what} key {_where(path)}"
        if depth >= max_depth and isinstance(item, (dict, list, tuple)):
            raise CaseFileError(f"the {what} is nested deeper than {max_depth} levels "
                                f"(at {path!r})"[:300])
        if isinstance(item, _Refused):
            raise CaseFileError(f"{where} {item.reason}")
        if isinstance(item, dict):
            twice = getattr(item, "duplicates", ())
            if twice:
                names = ", ".join(repr(_join(path, k)) for k in twice[:5])
                raise CaseFileError(f"{what} key(s) {names} appear more than once")
            plain = {}
            for name, sub in item.items():
                if not isinstance(name, str):
                    raise CaseFileError(f"{where} has a key {name!r} that is not text"[:300])
                if "\x00" in name:
                    raise CaseFileError(f"{what} key {_join(path, name)!r} holds a null "
                                        "character")
                plain[name] = sub
                stack.append((plain, name, _join(path, name), depth + 1))
            parent[key] = plain
        elif isinstance(item, (list, tuple)):
            items = list(item)
            parent[key] = items
            stack.extend((items, i, f"{path}[{i}]", depth + 1) for i in range(len(items)))
        elif isinstance(item, str):
            if "\x00" in item:
                raise CaseFileError(f"{where} holds a null character")
        elif isinstance(item, bool) or item is None:
            pass
        elif isinstance(item, int):
            if abs(item) >= 10 ** MAX_INT_DIGITS:
                raise CaseFileError(f"{where} is an integer of more than {MAX_INT_DIGITS} "
                                    "digits")
        elif isinstance(item, float):
            if not math.isfinite(item):
                raise CaseFileError(f"{where} is {item}, which is not a number JSON allows")
        else:
            raise CaseFileError(f"{where} holds a {type(item).__name__}, which JSON cannot "
                                "hold")
    return root[""]


def _join(path: str, name) -> str:
    return f"{path}.{name}" if path else str(name)


def parse_json(content, what: str, *, max_bytes: int = MAX_BYTES,
               max_depth: int = MAX_DEPTH) -> dict:
    """Parse JSON content (never a path) into a checked dict.

    Parameters
    ----------
    content : bytes, bytearray, memoryview or str
        The JSON text itself (UTF-8 when bytes; a byte-order mark is allowed).
    what : str
        What the content is ("case", "setup"), used in every message.
    max_bytes : int
        Size limit of the content [bytes, UTF-8].
    max_depth : int
        Deepest nesting of objects and lists accepted.

    Returns
    -------
    dict
        The top-level object, with plain dicts, lists, str, int, float, bool and None.

    Raises
    ------
    CaseFileError
        See the module documentation; the message names the key where there is one.

    Examples
    --------
    >>> parse_json('{"a": [1, 2.5, null]}', "case")
    {'a': [1, 2.5, None]}
    """
    if isinstance(content, (bytes, bytearray, memoryview)):
        raw = bytes(content)
        if len(raw) > max_bytes:
            raise CaseFileError(f"the {what} is larger than the limit of {max_bytes:,} bytes")
        try:
            text = raw.decode("utf-8-sig")
        except UnicodeDecodeError as exc:
            raise CaseFileError(f"the {what} file is not UTF-8 text (byte {exc.start})"
                                ) from None
    elif isinstance(content, str):
        text = content[1:] if content.startswith("\ufeff") else content
        if len(text) > max_bytes or len(text.encode("utf-8", "surrogatepass")) > max_bytes:
            raise CaseFileError(f"the {what} is larger than the limit of {max_bytes:,} bytes")
    else:
        raise CaseFileError(f"the content of a {what} must be bytes or text, not "
                            f"{type(content).__name__}")
    if "\x00" in text:
        line = text.count("\n", 0, text.index("\x00")) + 1
        raise CaseFileError(f"the {what} file holds a null character (line {line})")
    if _depth(text) > max_depth:
        raise CaseFileError(f"the {what} file is nested deeper than {max_depth} levels")
    try:
        data = json.loads(text, object_pairs_hook=_pairs, parse_int=_parse_int,
                          parse_float=_parse_float, parse_constant=_parse_constant)
    except json.JSONDecodeError as exc:
        raise CaseFileError(f"the {what} file is not valid JSON (line {exc.lineno}, column "
                            f"{exc.colno}: {exc.msg})") from None
    except (RecursionError, ValueError, OverflowError) as exc:  # guarded above; a last net
        raise CaseFileError(f"the {what} file cannot be read as JSON "
                            f"({type(exc).__name__})") from None
    if not isinstance(data, dict):
        raise CaseFileError(f"a {what} file must hold a JSON object ({{...}}) at the top "
                            f"level, not {_json_kind(data)}")
    return _check_tree(data, what, max_depth)


def _json_kind(value) -> str:
    if isinstance(value, list):
        return "a list"
    if isinstance(value, str):
        return "a text"
    if value is None:
        return "null"
    if isinstance(value, bool):
        return "true/false"
    return "a number" if not isinstance(value, _Refused) else "a refused number"


def load_json_file(path, what: str, *, max_bytes: int = MAX_BYTES,
                   max_depth: int = MAX_DEPTH) -> dict:
    """Read a JSON file from a path (str or os.PathLike) into a checked dict.

    Raises CaseFileError naming the file when it does not exist, is a folder, cannot be read
    or is above ``max_bytes``; the content then goes through :func:`parse_json`.

    Examples
    --------
    >>> load_json_file("no-such-case.json", "case")
    Traceback (most recent call last):
    ...
    workbench.errors.CaseFileError: the case file 'no-such-case.json' does not exist
    """
    if not isinstance(path, (str, os.PathLike)):
        raise CaseFileError(f"a {what} file path must be text or a path, not "
                            f"{type(path).__name__}")
    shown = str(os.fspath(path))
    shown = shown if len(shown) <= 80 else shown[:77] + "..."
    problem = None
    try:
        if os.path.isdir(path):
            problem = "is a folder, not a file"
        elif os.path.getsize(path) > max_bytes:
            problem = f"is larger than the limit of {max_bytes:,} bytes"
        else:
            with open(path, "rb") as handle:
                content = handle.read(max_bytes + 1)
    except FileNotFoundError:
        problem = "does not exist"
    except (OSError, ValueError, TypeError) as exc:
        problem = f"cannot be read ({type(exc).__name__})"
    if problem:
        raise CaseFileError(f"the {what} file {shown!r} {problem}")
    return parse_json(content, what, max_bytes=max_bytes, max_depth=max_depth)


def read_json(source, what: str, *, text: bool = False, max_bytes: int = MAX_BYTES,
              max_depth: int = MAX_DEPTH) -> dict:
    """Read a case or setup from an explicit kind of source into a checked dict.

    Parameters
    ----------
    source : bytes, os.PathLike, dict or str
        ``bytes`` (an upload): JSON content.  ``os.PathLike`` (``pathlib.Path``): a file
        to read.  ``dict``: an object already parsed, checked like parsed content.  ``str``:
        JSON content, only with ``text=True``; without it a str is refused (a path must be
        given as ``pathlib.Path``), so text is never opened as a path.
    what : str
        What is read ("case", "setup"), used in every message.
    text : bool
        True when a str ``source`` is JSON content.
    max_bytes, max_depth : int
        Size limit [bytes] and deepest nesting accepted.

    Returns
    -------
    dict
        The checked top-level object (plain JSON types).

    Raises
    ------
    CaseFileError
        For an ambiguous or unsupported source, or any refusal of :func:`parse_json`.

    Examples
    --------
    >>> read_json('{"title": "suction drum"}', "case", text=True)
    {'title': 'suction drum'}
    """
    what = units.text(what, "name of what is read", max_length=40)
    units.flag(text, "text")
    if isinstance(source, str):
        if not text:
            raise CaseFileError(f"a {what} given as a str is refused: pass the JSON text with "
                                f"text=True, or a file as pathlib.Path(...)")
        return parse_json(source, what, max_bytes=max_bytes, max_depth=max_depth)
    if isinstance(source, (bytes, bytearray, memoryview)):
        return parse_json(source, what, max_bytes=max_bytes, max_depth=max_depth)
    if isinstance(source, os.PathLike):
        return load_json_file(source, what, max_bytes=max_bytes, max_depth=max_depth)
    if isinstance(source, dict):
        return _check_tree(source, what, max_depth)
    raise CaseFileError(f"a {what} must be bytes, a pathlib.Path, a dict or JSON text "
                        f"(with text=True), not {type(source).__name__}")


# ---------------------------------------------------------------------- checking
def _key(what: str, path: str) -> str:
    return f"{what} key {path!r}"


@dataclass(frozen=True, kw_only=True)
class Spec:
    """What one key may hold.  Subclasses say how a value is checked and converted.

    Attributes
    ----------
    required : bool
        A key that must be present (unless it has a ``default``).
    default : object
        Value used when the key is left out; giving one makes the key optional.
    nullable : bool
        ``null`` is accepted and returned as None.
    """

    required: bool = True
    default: Any = _MISSING
    nullable: bool = False

    def convert(self, value, name: str):  # pragma: no cover - every leaf spec overrides
        """Checked value of ``value``; ``name`` ("case key 'a.b'") starts every message."""
        raise NotImplementedError

    def check(self, value, what: str, path: str):
        """Checked value of the key at ``path`` (containers override this to recurse)."""
        return self.convert(value, _key(what, path))


@dataclass(frozen=True)
class Number(Spec):
    """A quantity in SI units (its kind a key of :data:`workbench.units.SI_UNITS`) within
    ``low``..``high``, through :func:`workbench.units.to_si`."""

    kind: str = "dimensionless"
    low: float | None = None
    high: float | None = None
    low_open: bool = False
    high_open: bool = False

    def __post_init__(self):
        units.choice(self.kind, tuple(units.SI_UNITS), "kind of quantity")

    def convert(self, value, name):
        return units.to_si(value, self.kind, name, low=self.low, high=self.high,
                           low_open=self.low_open, high_open=self.high_open)


@dataclass(frozen=True)
class Whole(Spec):
    """A whole number within ``low``..``high`` (:func:`workbench.units.count`)."""

    low: int = 0
    high: int | None = None

    def convert(self, value, name):
        if isinstance(value, float):  # JSON writes whole numbers as integers
            raise InputError(f"{name} must be a whole number, not {value!r}")
        return units.count(value, name, low=self.low, high=self.high)


@dataclass(frozen=True)
class Choice(Spec):
    """One of fixed option strings (:func:`workbench.units.choice`)."""

    options: tuple = ()

    def convert(self, value, name):
        return units.choice(value, self.options, name)


@dataclass(frozen=True)
class Text(Spec):
    """A text without control characters, at most ``max_length`` long; stripped, and not
    empty unless ``empty``."""

    max_length: int = 200
    empty: bool = False

    def convert(self, value, name):
        value = units.text(value, name, max_length=self.max_length)
        if not self.empty and not value.strip():
            raise InputError(f"{name} must be a non-empty text")
        return value.strip()


@dataclass(frozen=True)
class Flag(Spec):
    """true or false (:func:`workbench.units.flag`)."""

    def convert(self, value, name):
        return units.flag(value, name)


@dataclass(frozen=True)
class Exact(Spec):
    """Exactly one value (a format name, a format version)."""

    value: Any = None

    def convert(self, value, name):
        if type(value) is not type(self.value) or value != self.value:
            raise InputError(f"{name} must be {self.value!r}, not {_short(value)}")
        return value


@dataclass(frozen=True)
class Object(Spec):
    """A nested object checked against its own schema (see :func:`validate`).  With
    ``required=False`` and no ``default``, a missing object is read as ``{}``: its keys
    take their own defaults (and a required one is reported missing)."""

    schema: dict = field(default_factory=dict)

    def check(self, value, what, path):
        return _validate(value, self.schema, what, path)


@dataclass(frozen=True)
class MappingOf(Spec):
    """An object of free names (checked by ``keys``) to values of one spec (``values``),
    e.g. a composition ``{"Methane": 0.9, "Ethane": 0.1}``; ``min_items`` to ``max_items``
    entries."""

    values: Spec = field(default_factory=lambda: Number())
    keys: Spec = field(default_factory=lambda: Text(max_length=80))
    min_items: int = 1
    max_items: int = 100

    def check(self, value, what, path):
        name = _key(what, path)
        if not isinstance(value, dict):
            raise InputError(f"{name} must be an object of name: value, not {_short(value)}")
        if not self.min_items <= len(value) <= self.max_items:
            raise InputError(f"{name} has {len(value)} entries: {self.min_items} to "
                             f"{self.max_items} allowed")
        out = {}
        for key, sub in value.items():
            checked = self.keys.convert(key, f"{name} name {_short(key)}")
            out[checked] = _one(self.values, sub, what, f"{path}.{key}")
        return out


@dataclass(frozen=True)
class ListOf(Spec):
    """A list of ``min_items`` to ``max_items`` values of one spec (``item``)."""

    item: Spec = field(default_factory=lambda: Number())
    min_items: int = 0
    max_items: int = 1000

    def check(self, value, what, path):
        name = _key(what, path)
        if not isinstance(value, list):
            raise InputError(f"{name} must be a list, not {_short(value)}")
        if not self.min_items <= len(value) <= self.max_items:
            raise InputError(f"{name} has {len(value)} entries: {self.min_items} to "
                             f"{self.max_items} allowed")
        return [_one(self.item, sub, what, f"{path}[{i}]") for i, sub in enumerate(value)]


def _short(value) -> str:
    text = repr(value)
    return text if len(text) <= 60 else text[:57] + "..."


def _one(spec, value, what: str, path: str):
    """Check one value; a spec may also be a plain callable ``(value, name) -> value``."""
    if value is None and getattr(spec, "nullable", False):
        return None
    if isinstance(spec, Spec):
        return spec.check(value, what, path)
    return spec(value, _key(what, path))


def _validate(data, schema: dict, what: str, path: str = "") -> dict:
    if not isinstance(data, dict):
        where = _key(what, path) if path else f"a {what}"
        raise InputError(f"{where} must be an object ({{...}}), not {_short(data)}")
    unknown = [_join(path, k) for k in data if k not in schema]
    if unknown:
        raise InputError(f"unknown {what} key(s) {', '.join(map(repr, unknown[:10]))} "
                         f"(allowed{' in ' + repr(path) if path else ''}: "
                         f"{', '.join(schema)})"[:600])
    out = {}
    for key, spec in schema.items():
        if key in data:
            out[key] = _one(spec, data[key], what, _join(path, key))
            continue
        default = getattr(spec, "default", _MISSING)
        if default is not _MISSING:
            out[key] = copy.deepcopy(default)  # a default dict or list is never shared
        elif getattr(spec, "required", True):
            raise InputError(f"{_key(what, _join(path, key))} is missing")
        elif isinstance(spec, Object):  # an optional object left out: its own defaults
            out[key] = _validate({}, spec.schema, what, _join(path, key))
    return out


def validate(data, schema: dict, what: str) -> dict:
    """Check a parsed case or setup against a schema and return its converted values.

    Parameters
    ----------
    data : dict
        The parsed object (from :func:`read_json`).
    schema : dict
        Key -> :class:`Spec`, or a callable ``(value, name) -> value`` raising a
        WorkbenchError whose message starts with ``name``; nested objects through
        :class:`Object`.
    what : str
        What is checked ("case", "setup"); messages read ``"<what> key 'a.b' ..."``.

    Returns
    -------
    dict
        Every schema key that was given or has a default, in schema order, converted (SI
        floats for :class:`Number`).

    Raises
    ------
    CaseFileError
        For a key that is unknown, missing, of a wrong type or out of range, naming it.

    Examples
    --------
    >>> validate({"points": 11}, {"points": Whole(low=2, high=200)}, "case")
    {'points': 11}
    """
    try:
        return _validate(data, schema, what)
    except CaseFileError:
        raise
    except WorkbenchError as exc:
        raise CaseFileError(str(exc)) from None


def read_and_validate(source, schema: dict, what: str, *, text: bool = False,
                      max_bytes: int = MAX_BYTES) -> dict:
    """:func:`read_json` then :func:`validate`: the one call a loader needs.

    Examples
    --------
    >>> read_and_validate(b'{"points": 5}', {"points": Whole(low=2)}, "case")
    {'points': 5}
    """
    return validate(read_json(source, what, text=text, max_bytes=max_bytes), schema, what)


__all__ = ["MAX_BYTES", "MAX_DEPTH", "MAX_INT_DIGITS", "parse_json", "load_json_file",
           "read_json", "validate", "read_and_validate", "Spec", "Number", "Whole", "Choice",
           "Text", "Flag", "Exact", "Object", "MappingOf", "ListOf"]
