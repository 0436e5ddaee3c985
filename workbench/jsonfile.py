"""The one reader of the workbench's JSON files (machine cases, field-test setups).

It sits below every layer that reads such a file (the panels' case files in
:mod:`workbench.ui.cases`, the field-test setup files in
:mod:`workbench.fieldtest.setup_file`), so a calculation module never imports the UI to read
one.  Only plain JSON is read: nothing is evaluated or unpickled, and text given as a case is
never opened as a path.

References
----------
T. Bray (ed.), RFC 8259, The JavaScript Object Notation (JSON) Data Interchange Format, 2017.
"""

from __future__ import annotations

import json
from pathlib import Path

from .errors import CaseFileError


def read_json_source(source, what: str):
    """The parsed JSON of a dict (returned as it is), a JSON text, bytes or a file path.

    ``what`` names the file in messages ("case", "setup").  Raises CaseFileError for text that
    is not UTF-8 or not JSON (NaN and Infinity included), an unreadable path or another type.

    Examples
    --------
    >>> read_json_source('{"a": 1}', "case")
    {'a': 1}
    """
    if isinstance(source, dict):
        return source
    if isinstance(source, (bytes, bytearray, memoryview)):
        try:
            text = bytes(source).decode("utf-8")
        except UnicodeDecodeError:
            raise CaseFileError(f"the {what} file is not UTF-8 text") from None
    elif isinstance(source, Path) or (isinstance(source, str) and not source.lstrip().startswith("{")):
        try:
            text = Path(source).read_text(encoding="utf-8")
        except (OSError, UnicodeDecodeError) as exc:
            raise CaseFileError(f"could not read the {what} file {str(source)!r}: "
                                f"{exc.__class__.__name__}") from None
    elif isinstance(source, str):
        text = source
    else:
        raise CaseFileError(f"a {what} must be a dict, a JSON text or a path, not "
                            f"{type(source).__name__}")
    try:
        return json.loads(text, parse_constant=lambda name: _refuse_constant(name, what))
    except json.JSONDecodeError as exc:
        raise CaseFileError(f"the {what} file is not valid JSON (line {exc.lineno}, column "
                            f"{exc.colno}: {exc.msg})") from None


def _refuse_constant(name, what="case"):
    raise CaseFileError(f"the {what} file holds {name}, which is not a number JSON allows")


__all__ = ["read_json_source"]
