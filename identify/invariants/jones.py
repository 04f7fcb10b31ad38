"""The Jones polynomial V(t) of an oriented knot or link diagram."""

from __future__ import annotations

from fractions import Fraction

from ..diagram import Diagram
from ..errors import InvariantError
from ..laurent import Laurent
from .bracket import kauffman_bracket

__all__ = ["jones_polynomial", "jones_from_bracket"]


def jones_from_bracket(bracket: Laurent, writhe: int) -> Laurent:
    """V(t) = (-A^3)^(-w) <D> at A = t^(-1/4) (common practice)."""
    sign = -1 if writhe % 2 else 1
    terms: dict[Fraction, int] = {}
    for k, c in bracket.terms():
        a = int(k) - 3 * writhe
        if a % 2:
            raise InvariantError(f"bracket exponent {a} is odd: not the bracket of a diagram")
        terms[Fraction(-a, 4)] = sign * c
    for e in terms:
        if e.denominator > 2:
            raise InvariantError(f"exponent {e} of t is not a half-integer")
    return Laurent(terms)


def jones_polynomial(diagram: Diagram) -> Laurent:
    """The Jones polynomial of an oriented diagram.

    Normalised by V(unknot) = 1 and the skein relation
    t^-1 V(L+) - t V(L-) + (t^-1/2 - t^1/2) V(L0) = 0.

    Parameters
    ----------
    diagram : Diagram

    Returns
    -------
    Laurent
        V(t); exponents are half-integers for links with an even number of
        components.

    Examples
    --------
    >>> right_trefoil = Diagram([(1, 5, 2, 4), (3, 1, 4, 6), (5, 3, 6, 2)])
    >>> str(jones_polynomial(right_trefoil))
    't + t^3 - t^4'

    Notes
    -----
    Computed from the Kauffman bracket by tangle contraction
    (:func:`knotsift.invariants.bracket.kauffman_bracket`).

    References
    ----------
    V. F. R. Jones, "A polynomial invariant for knots via von Neumann
    algebras", Bull. AMS 12 (1985).  L. H. Kauffman, "State models and the
    Jones polynomial", Topology 26 (1987).
    """
    return jones_from_bracket(kauffman_bracket(diagram), diagram.writhe())
