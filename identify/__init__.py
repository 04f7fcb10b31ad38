"""knotsift: identify knots in diagrams and 3D curves by exact invariants."""

from .diagram import Diagram
from .display import to_dataframe
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
    "to_dataframe",
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
