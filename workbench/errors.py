"""Exception classes of the workbench.

Every error the project raises on purpose derives from :class:`WorkbenchError`, which is
itself a :class:`ValueError`, so callers can catch one class.  Messages name the input, the
value given and the allowed range, so they can be shown to a user unchanged.
"""

from __future__ import annotations


class WorkbenchError(ValueError):
    """Base class of every error raised by the workbench."""


class InputError(WorkbenchError):
    """An input is missing, non-finite, of the wrong unit or outside its allowed range."""


class PropertyError(WorkbenchError):
    """A state lies outside the property model's range, or a flash did not converge."""


class SpecificationError(WorkbenchError):
    """A machine or device is over- or under-specified."""


class ReadingsError(WorkbenchError):
    """Measured readings are physically inconsistent (e.g. an efficiency above 1)."""


class CaseFileError(WorkbenchError):
    """A case file could not be read or failed validation."""
