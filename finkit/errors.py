"""Exceptions raised at finkit's boundary.

Every message is one line that names the field, the bad value and what is allowed, so that
the command line can print it as it is, without a traceback.
"""


class FinkitError(Exception):
    """Base class of every error finkit raises on purpose."""


class InputError(FinkitError, ValueError):
    """A value given by the user is not allowed (wrong unit, out of range, unknown key)."""


class PropertyRangeError(InputError):
    """A state outside the range of a property table (e.g. air hotter than the table)."""


class GeometryError(InputError):
    """A geometry that cannot exist (fins that do not fit, overlapping pins, zero gap)."""


class NotSupportedError(FinkitError):
    """A case that no published method in finkit covers (never a silent guess)."""


class SolverError(FinkitError, RuntimeError):
    """A numerical solution did not converge or has no root (e.g. no fan operating point)."""
