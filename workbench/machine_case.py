"""Machine case files: plain JSON holding a study's inputs in SI units, validated on load.

A case file is a JSON object::

    {"format": "turbo-workbench machine case", "format_version": 1,
     "title": "...", "description": "...",
     "inputs": {"machine": "compressor", "inlet_pressure_Pa": 2.0e6, ...}}

Every number in ``inputs`` is in SI units (the key names end with the unit; fractions and
efficiencies are plain fractions, not percent).  Keys missing from ``inputs`` take the
values of :data:`workbench.study.DEFAULT_INPUTS`.  The inputs pass the study's input
boundary (:func:`workbench.study.validate_inputs`); unknown keys, wrong types, numbers out
of range, non-object tops, deep nesting, huge numbers and control characters are refused
with a :class:`~workbench.errors.CaseFileError` that names the key.  Nothing is evaluated or
unpickled, and text given as a case is JSON, never a file name: a file is read only when
given as a :class:`pathlib.Path`.

References
----------
T. Bray (ed.), RFC 8259, The JavaScript Object Notation (JSON) Data Interchange Format, 2017.

Examples
--------
>>> case = read_case('{"format": "turbo-workbench machine case", "format_version": 1,'
...                  ' "inputs": {"machine": "fan"}}')
>>> case["inputs"]["machine"]
'fan'
"""

from __future__ import annotations

import json
import os
from importlib import resources
from pathlib import Path

from .errors import CaseFileError, WorkbenchError
from .study import validate_inputs

FORMAT_NAME = "turbo-workbench machine case"
FORMAT_VERSION = 1

#: Largest case file read [bytes]; a machine case is a few kilobytes.
MAX_CASE_BYTES = 1_000_000
#: Deepest nesting of a case (the composition object sits at depth 3).
MAX_DEPTH = 8

_TOP_KEYS = {"format", "format_version", "title", "description", "inputs"}


def _depth_ok(text: str) -> bool:
    """True when JSON text nests brackets at most :data:`MAX_DEPTH` deep (strings skipped)."""
    depth, in_string, escaped = 0, False, False
    for char in text:
        if in_string:
            if escaped:
                escaped = False
            elif char == "\\":
                escaped = True
            elif char == '"':
                in_string = False
        elif char == '"':
            in_string = True
        elif char in "[{":
            depth += 1
            if depth > MAX_DEPTH:
                return False
        elif char in "]}":
            depth -= 1
    return True


def _refuse_constant(name, what="case"):
    raise CaseFileError(f"the {what} file holds {name}, which is not a number JSON allows")


def parse_case_json(text: str, what: str = "case"):
    """Parse the JSON text of a case file safely (size, nesting, NaN/Infinity refused).

    Raises
    ------
    CaseFileError
        Text too long, nested too deep, not JSON, or with NaN/Infinity or a number too
        long to read.
    """
    if len(text) > MAX_CASE_BYTES:
        raise CaseFileError(f"the {what} file is {len(text)} characters long: at most "
                            f"{MAX_CASE_BYTES} allowed")
    if not _depth_ok(text):
        raise CaseFileError(f"the {what} file nests objects or lists more than {MAX_DEPTH} "
                            "deep")
    try:
        return json.loads(text, parse_constant=lambda name: _refuse_constant(name, what))
    except json.JSONDecodeError as exc:
        raise CaseFileError(f"the {what} file is not valid JSON (line {exc.lineno}, column "
                            f"{exc.colno}: {exc.msg})") from None
    except (ValueError, RecursionError) as exc:  # e.g. an integer of thousands of digits
        if isinstance(exc, CaseFileError):
            raise
        raise CaseFileError(f"the {what} file holds a value that cannot be read "
                            f"({exc.__class__.__name__})") from None


def read_case_text(source, what: str = "case") -> str:
    """The text of a case given as JSON text (str), bytes, or a :class:`pathlib.Path`.

    A ``str`` is always the JSON text itself, never opened as a file name.  ``what`` names
    the kind of file in messages (``"case"``, ``"setup"``).
    """
    if isinstance(source, str):
        return source
    if isinstance(source, (bytes, bytearray, memoryview)):
        data = bytes(source)
    elif isinstance(source, os.PathLike):
        path = Path(source)
        try:
            if path.stat().st_size > MAX_CASE_BYTES:
                raise CaseFileError(f"the {what} file {path.name!r} is larger than "
                                    f"{MAX_CASE_BYTES} bytes")
            data = path.read_bytes()
        except OSError as exc:
            raise CaseFileError(f"could not read the {what} file {path.name!r}: "
                                f"{exc.__class__.__name__}") from None
    else:
        raise CaseFileError(f"a {what} must be a dict, JSON text, bytes or a pathlib.Path, "
                            f"not {type(source).__name__}")
    if len(data) > MAX_CASE_BYTES:
        raise CaseFileError(f"the {what} file is larger than {MAX_CASE_BYTES} bytes")
    try:
        return data.decode("utf-8")
    except UnicodeDecodeError:
        raise CaseFileError(f"the {what} file is not UTF-8 text") from None


def _note(value, key):
    if not isinstance(value, str):
        raise CaseFileError(f"case key {key!r} must be text, not {type(value).__name__}")
    if len(value) > 2000:
        raise CaseFileError(f"case key {key!r} is {len(value)} characters long: at most 2000")
    if any(ord(c) < 32 and c not in "\t\n\r" for c in value):
        raise CaseFileError(f"case key {key!r} contains control characters")
    return value


def validate_case(data) -> dict:
    """Check a case (a dict as read from JSON) and return its full input dict (SI).

    Parameters
    ----------
    data : dict
        The parsed JSON object.

    Returns
    -------
    dict
        ``{"title": str, "description": str, "inputs": dict}`` with every key of
        :data:`workbench.study.DEFAULT_INPUTS` present.

    Raises
    ------
    CaseFileError
        Not an object, wrong format name or version, unknown keys, wrong types, numbers out
        of range (the message names the key).
    """
    if not isinstance(data, dict):
        raise CaseFileError(f"a case file must hold a JSON object, not {type(data).__name__}")
    unknown = sorted(str(k)[:40] for k in set(data) - _TOP_KEYS)
    if unknown:
        raise CaseFileError(f"unknown case file key(s): {', '.join(map(repr, unknown[:5]))}")
    if data.get("format") != FORMAT_NAME:
        shown = repr(data.get("format"))[:60]
        raise CaseFileError(f"case file format must be {FORMAT_NAME!r}, not {shown}")
    version = data.get("format_version")
    if isinstance(version, bool) or not isinstance(version, int) or version != FORMAT_VERSION:
        raise CaseFileError(f"case file format_version {repr(version)[:40]} is not supported "
                            f"(this workbench reads version {FORMAT_VERSION})")
    title = _note(data.get("title", ""), "title")
    description = _note(data.get("description", ""), "description")
    inputs = data.get("inputs", {})
    if not isinstance(inputs, dict):
        raise CaseFileError("case key 'inputs' must be an object")
    try:
        checked = validate_inputs(inputs)
    except WorkbenchError as exc:
        raise CaseFileError(f"case input {exc}") from None
    return {"title": title, "description": description, "inputs": checked}


def read_case(source) -> dict:
    """Read and validate a case: a dict, JSON text (str), bytes, or a :class:`pathlib.Path`.

    This is the one read path of machine case files.  A ``str`` is parsed as JSON and never
    opened as a file name.

    Returns
    -------
    dict
        The result of :func:`validate_case`.

    Raises
    ------
    CaseFileError
        Anything wrong with the source, the JSON or the inputs, by name.
    """
    if isinstance(source, dict):
        return validate_case(source)
    return validate_case(parse_case_json(read_case_text(source)))


def make_case(inputs: dict, title: str = "", description: str = "") -> dict:
    """A case dict (ready for ``json.dumps``) from a study's inputs in SI units."""
    return {"format": FORMAT_NAME, "format_version": FORMAT_VERSION, "title": title,
            "description": description,
            "inputs": {k: (dict(v) if isinstance(v, dict) else v) for k, v in inputs.items()}}


def case_json(case: dict) -> str:
    """JSON text of a case dict (indented, plain; NaN refused)."""
    return json.dumps(case, indent=2, allow_nan=False)


def list_demo_cases() -> list[str]:
    """Names of the demo cases shipped in ``workbench/cases`` (without ``.json``)."""
    folder = resources.files("workbench") / "cases"
    try:
        files = [p for p in folder.iterdir() if p.name.endswith(".json")]
    except (FileNotFoundError, NotADirectoryError):
        return []
    # the folder also holds other kinds of case (curves cases): list machine cases only
    return sorted(p.name[:-5] for p in files
                  if f'"format": "{FORMAT_NAME}"' in p.read_text(encoding="utf-8")[:200])


def load_demo_case(name: str) -> dict:
    """Read and validate a demo case by name (see :func:`list_demo_cases`)."""
    if not isinstance(name, str) or name not in list_demo_cases():
        raise CaseFileError(f"unknown demo case {repr(name)[:60]}: choose one of "
                            + ", ".join(list_demo_cases()))
    text = (resources.files("workbench") / "cases" / f"{name}.json").read_text(encoding="utf-8")
    return read_case(text)


def open_case(case) -> dict:
    """A demo case by name, or :func:`read_case` of anything else (None: the compressor demo)."""
    if case is None:
        case = "compressor-demo"
    if isinstance(case, str) and case in list_demo_cases():
        return load_demo_case(case)
    return read_case(case)


__all__ = ["FORMAT_NAME", "FORMAT_VERSION", "case_json", "list_demo_cases", "load_demo_case",
           "make_case", "open_case", "parse_case_json", "read_case", "read_case_text",
           "validate_case"]
