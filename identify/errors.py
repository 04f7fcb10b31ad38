"""The library's exceptions.

Every error raised on bad input derives from :class:`KnotsiftError` and from the
fitting built-in exception, so callers may catch either.  Each carries a
message that says what was expected, what was received and where, and keeps
the offending value in ``value`` (and the place in ``where``).
"""

from __future__ import annotations

__all__ = [
    "KnotsiftError",
    "DiagramError",
    "NotationError",
    "PolynomialError",
    "InvariantError",
    "TableError",
    "CurveError",
]


class KnotsiftError(Exception):
    """Base class of all knotsift errors.

    Parameters
    ----------
    message : str
        What went wrong, what was expected and what was received.
    value : object, optional
        The offending value.
    where : str, optional
        Where it happened ("crossing 7", "line 12", "frame 301, bead 4").
    """

    def __init__(self, message: str, *, value: object = None, where: str | None = None):
        self.message = message
        self.value = value
        self.where = where
        super().__init__(f"{where}: {message}" if where else message)

    def located(self, where: str) -> "KnotsiftError":
        """Return a copy of this error with ``where`` prefixed by an outer place (a file, a line)."""
        inner = f"{where}, {self.where}" if self.where else where
        err = type(self)(self.message, value=self.value, where=inner)
        return err


class DiagramError(KnotsiftError, ValueError):
    """A PD code or diagram operation is invalid (labels, orientation, planarity)."""


class NotationError(KnotsiftError, ValueError):
    """Text in one of the knot notations cannot be parsed."""


class PolynomialError(KnotsiftError, ValueError):
    """A Laurent polynomial cannot be built or parsed from the given text or terms."""


class InvariantError(KnotsiftError, ValueError):
    """An invariant is not defined for this input (for example Alexander of a link)."""


class TableError(KnotsiftError, RuntimeError):
    """The reference table is missing, corrupt or of another schema version."""


class CurveError(KnotsiftError, ValueError):
    """3D coordinates cannot be turned into a diagram (NaN, too few beads, self-contact)."""
