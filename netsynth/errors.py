"""The exception tree of netsynth.

::

    NetsynthError
     ├─ ValueParseError (also ValueError)   a value or expression could not be read
     ├─ StockError      (also ValueError)   the bin is unusable (file, line, field)
     ├─ ArgumentError   (also ValueError)   an argument is invalid (out of range, wrong type)
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


class ArgumentError(NetsynthError, ValueError):
    """An argument is invalid (out of range, wrong type); the message names the parameter.

    Distinct from :class:`InfeasibleError`: the request itself is malformed, not merely
    impossible to meet with the bin at hand.
    """


class InfeasibleError(NetsynthError):
    """No network meets the request; the message names the limit to relax."""


class VerificationError(NetsynthError):
    """The independent nodal solve disagrees with the claimed value, or a node floats."""
