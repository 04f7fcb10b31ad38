"""Exact orientation predicates: the sign of a 3x3 determinant, decided without rounding.

Every topological decision of the projection (do two projected segments
cross, which one is on top, in which order a segment meets its crossings)
is the sign of a determinant of coordinate differences.  The determinant is
first evaluated in floating point together with a bound on its rounding
error; where the value is smaller than the bound, it is evaluated again in
exact rational arithmetic on the input floats (every float is a rational
number, and :class:`fractions.Fraction` converts it without loss).  So a
sign is never guessed, however close two segments come; only an exact zero
is a true degeneracy.
"""

from __future__ import annotations

from fractions import Fraction
from typing import Sequence

import numpy as np

__all__ = ["det3", "det3_exact", "exact_vector", "ERROR_FACTOR"]

#: Rounding-error factor of :func:`det3`, in units of the permanent.  The
#: usual analysis of the orientation predicate gives about 7 unit roundoffs
#: for a determinant of differences (Shewchuk 1997, Discrete Comput. Geom. 18,
#: "Adaptive precision floating-point arithmetic and fast robust geometric
#: predicates"; from memory); 32 leaves a wide margin.
ERROR_FACTOR = 32 * np.finfo(float).eps


def det3(a: np.ndarray, b: np.ndarray, c: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """Row-wise ``det(a, b, c)`` in floating point and a bound on its rounding error.

    Parameters
    ----------
    a, b, c : (n, 3) arrays
        Rows may be rounded differences of input points (one rounding each).

    Returns
    -------
    det, bound : (n,) arrays
        Wherever ``abs(det) > bound`` the sign of ``det`` is the sign of the
        exact determinant of the exact differences.

    Examples
    --------
    >>> a = np.array([[1.0, 0, 0]]); b = np.array([[0.0, 1, 0]]); c = np.array([[0.0, 0, 1]])
    >>> d, e = det3(a, b, c)
    >>> float(d[0]), bool(abs(d[0]) > e[0])
    (1.0, True)
    """
    m0 = a[:, 1] * b[:, 2] - a[:, 2] * b[:, 1]
    m1 = a[:, 2] * b[:, 0] - a[:, 0] * b[:, 2]
    m2 = a[:, 0] * b[:, 1] - a[:, 1] * b[:, 0]
    det = m0 * c[:, 0] + m1 * c[:, 1] + m2 * c[:, 2]
    aa, ab, ac = np.abs(a), np.abs(b), np.abs(c)
    perm = ((aa[:, 1] * ab[:, 2] + aa[:, 2] * ab[:, 1]) * ac[:, 0]
            + (aa[:, 2] * ab[:, 0] + aa[:, 0] * ab[:, 2]) * ac[:, 1]
            + (aa[:, 0] * ab[:, 1] + aa[:, 1] * ab[:, 0]) * ac[:, 2])
    return det, ERROR_FACTOR * perm


def exact_vector(x: Sequence[float]) -> tuple[Fraction, ...]:
    """The exact rational value of each float of ``x``."""
    return tuple(Fraction(float(v)) for v in x)


def det3_exact(a: Sequence[Fraction], b: Sequence[Fraction], c: Sequence[Fraction]) -> Fraction:
    """``det(a, b, c)`` of three exact 3-vectors, exactly.

    >>> from fractions import Fraction as F
    >>> det3_exact((F(1), F(0), F(0)), (F(0), F(1), F(0)), (F(1, 3), F(1, 7), F(2)))
    Fraction(2, 1)
    """
    return (c[0] * (a[1] * b[2] - a[2] * b[1]) + c[1] * (a[2] * b[0] - a[0] * b[2])
            + c[2] * (a[0] * b[1] - a[1] * b[0]))
