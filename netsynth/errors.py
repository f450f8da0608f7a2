"""The exception tree of netsynth.

::

    NetsynthError
     ├─ ValueParseError (also ValueError)   a value or expression could not be read
     ├─ StockError      (also ValueError)   the bin is unusable (file, line, field)
     ├─ InfeasibleError                     nothing meets the limits; says which and what to relax
     └─ VerificationError                   the nodal check disagrees, or a node floats

The library raises these; ``netsynth.cli`` turns them into one ``Error: ...`` line
and a non-zero exit. Anything else escaping is a bug and keeps its traceback.
"""

from __future__ import annotations


class NetsynthError(Exception):
    """Base of every error netsynth raises on purpose."""


class ValueParseError(NetsynthError, ValueError):
    """A resistance, tolerance, power or network expression could not be read."""


class StockError(NetsynthError, ValueError):
    """A stock bin is unusable; the message names the file, line and field."""


class InfeasibleError(NetsynthError):
    """No network meets the request; the message names the limit to relax."""


class VerificationError(NetsynthError):
    """The independent nodal solve disagrees with the claimed value, or a node floats."""
