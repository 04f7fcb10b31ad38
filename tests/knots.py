"""Small published knot tables and diagram utilities shared by the invariant tests."""

from __future__ import annotations

from knotsift import Diagram

__all__ = ["TREFOIL", "FIGURE_EIGHT", "HOPF", "PRIME_KNOTS_TO_7", "reversed_diagram"]

TREFOIL = Diagram([(1, 5, 2, 4), (3, 1, 4, 6), (5, 3, 6, 2)])  # right-handed
FIGURE_EIGHT = Diagram([(4, 2, 5, 1), (8, 6, 1, 5), (6, 3, 7, 4), (2, 7, 3, 8)])
HOPF = Diagram([(1, 3, 2, 4), (3, 1, 4, 2)])  # both crossings positive

# name: (Conway notation, Alexander coefficients from t^-k to t^k, |signature|).
# Conway notation: Conway 1970, "An enumeration of knots and links, and some of
# their algebraic properties" (from memory).  Alexander polynomials: Rolfsen
# 1976, "Knots and Links", Appendix C (from memory).  Signatures: the published
# tables, e.g. Kawauchi 1996, "A Survey of Knot Theory", Appendix F (from memory).
PRIME_KNOTS_TO_7 = {
    "3_1": ((3,), (1, -1, 1), 2),
    "4_1": ((2, 2), (-1, 3, -1), 0),
    "5_1": ((5,), (1, -1, 1, -1, 1), 4),
    "5_2": ((3, 2), (2, -3, 2), 2),
    "6_1": ((4, 2), (-2, 5, -2), 0),
    "6_2": ((3, 1, 2), (-1, 3, -3, 3, -1), 2),
    "6_3": ((2, 1, 1, 2), (1, -3, 5, -3, 1), 0),
    "7_1": ((7,), (1, -1, 1, -1, 1, -1, 1), 6),
    "7_2": ((5, 2), (3, -5, 3), 2),
    "7_3": ((4, 3), (2, -3, 3, -3, 2), 4),
    "7_4": ((3, 1, 3), (4, -7, 4), 2),
    "7_5": ((3, 2, 2), (2, -4, 5, -4, 2), 4),
    "7_6": ((2, 2, 1, 2), (-1, 5, -7, 5, -1), 2),
    "7_7": ((2, 1, 1, 1, 2), (1, -5, 9, -5, 1), 0),
}


def reversed_diagram(diagram: Diagram) -> Diagram:
    """Every component with its direction reversed (crossing signs are kept)."""
    return Diagram([(c, d, a, b) for a, b, c, d in diagram.crossings], diagram.free_loops)
