"""Case files of the machine panel (the format and its checks live in
:mod:`workbench.machine_case`; the inputs and their checks in :mod:`workbench.study`).

This module only re-exports those names for the panels and for code written against
``workbench.ui.cases``; :func:`read_json_source` is kept for the readings panel's setup
files until they move to the project's safe JSON reader.
"""

from __future__ import annotations

import json
from pathlib import Path

from ..errors import CaseFileError
from ..machine_case import (
    FORMAT_NAME,
    FORMAT_VERSION,
    case_json,
    list_demo_cases,
    load_demo_case,
    make_case,
    open_case,
    read_case,
    validate_case,
)
from ..study import (
    DEFAULT_INPUTS,
    FLOW_GIVEN,
    MACHINES,
    OUTLET_MODES,
    STATE_GIVEN,
    SWEEP_INPUTS,
    VELOCITY_GIVEN,
)
from ..units import UNIT_SYSTEMS


def read_json_source(source, what: str):
    """The parsed JSON of a dict (returned as it is), a JSON text, bytes or a file path.

    Kept for setup files only (``workbench.ui.test_setup``); machine cases use
    :func:`workbench.machine_case.read_case`, which never opens text as a path.
    """
    if isinstance(source, dict):
        return source
    if isinstance(source, (bytes, bytearray, memoryview)):
        try:
            text = bytes(source).decode("utf-8")
        except UnicodeDecodeError:
            raise CaseFileError(f"the {what} file is not UTF-8 text") from None
    elif isinstance(source, Path) or (isinstance(source, str)
                                      and not source.lstrip().startswith("{")):
        try:
            text = Path(source).read_text(encoding="utf-8")
        except (OSError, UnicodeDecodeError, ValueError) as exc:
            raise CaseFileError(f"could not read the {what} file {str(source)[:80]!r}: "
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
    except (ValueError, RecursionError) as exc:
        if isinstance(exc, CaseFileError):
            raise
        raise CaseFileError(f"the {what} file holds a value that cannot be read "
                            f"({exc.__class__.__name__})") from None


def _refuse_constant(name, what="case"):
    raise CaseFileError(f"the {what} file holds {name}, which is not a number JSON allows")


__all__ = ["DEFAULT_INPUTS", "FLOW_GIVEN", "FORMAT_NAME", "FORMAT_VERSION", "MACHINES",
           "OUTLET_MODES", "STATE_GIVEN", "SWEEP_INPUTS", "UNIT_SYSTEMS", "VELOCITY_GIVEN",
           "case_json", "list_demo_cases", "load_demo_case", "make_case", "open_case",
           "read_case", "read_json_source", "validate_case"]
