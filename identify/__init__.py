"""knotsift: identify knots in diagrams and 3D curves by exact invariants."""

from .diagram import Diagram
from .errors import (
    CurveError,
    DiagramError,
    InvariantError,
    KnotsiftError,
    NotationError,
    PolynomialError,
    TableError,
)
from .identification import identify
from .laurent import Laurent
from .result import IdentifyResult

__all__ = [
    "identify",
    "IdentifyResult",
    "Diagram",
    "Laurent",
    "KnotsiftError",
    "DiagramError",
    "NotationError",
    "PolynomialError",
    "InvariantError",
    "TableError",
    "CurveError",
]

__version__ = "0.1.0"
