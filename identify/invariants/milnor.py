"""Milnor's triple linking number of a three-component link with zero pairwise linking.

The link group's Wirtinger generators are approximated in the Magnus
expansion ``m_k -> 1 + X_k`` truncated after degree 2 (Milnor's iteration:
start every arc of component ``k`` at its meridian ``m_k`` and recompute each
arc from the crossing relations until nothing changes).  The longitude of
component ``k`` is the product of the over-arcs it passes under; the
coefficient of ``X_i`` in it is the linking number of ``i`` and ``k``, and
the coefficient of ``X_i X_j`` is ``mu(ijk)``.
"""

from __future__ import annotations

from ..diagram import Diagram
from ..errors import InvariantError
from .alexander import _arcs
from .linking import linking_matrix

__all__ = ["triple_linking_number", "longitude_coefficients"]

Series = dict  # {word (tuple of variable indices, length <= 2): int}
DEGREE = 2


def _mul(a: Series, b: Series) -> Series:
    out: Series = {}
    for u, x in a.items():
        for v, y in b.items():
            if len(u) + len(v) <= DEGREE:
                w = u + v
                out[w] = out.get(w, 0) + x * y
    return {w: c for w, c in out.items() if c}


def _inverse(a: Series) -> Series:
    """Inverse of a unit ``1 + n`` (``n`` without constant term): ``1 - n + n^2``."""
    n = {w: c for w, c in a.items() if w}
    neg = {w: -c for w, c in n.items()}
    out = {(): 1}
    for w, c in neg.items():
        out[w] = out.get(w, 0) + c
    for w, c in _mul(n, n).items():
        out[w] = out.get(w, 0) + c
    return {w: c for w, c in out.items() if c}


def _power(a: Series, e: int) -> Series:
    return a if e > 0 else _inverse(a)


def longitude_coefficients(diagram: Diagram) -> list[Series]:
    """The truncated Magnus expansion of each component's longitude.

    Returns
    -------
    list of dict
        For component ``k``, ``{(): 1, (i,): lk, (i, j): c, ...}``.
    """
    arc_of = _arcs(diagram)
    comp = diagram.component_of_label()
    comps = diagram.components()
    heads = {}  # edge label -> crossing where it ends
    for i, x in enumerate(diagram.crossings):
        for p in range(4):
            if diagram.is_incoming(i, p):
                heads[x[p]] = (i, p)
    base = {k: arc_of[c[0]] for k, c in enumerate(comps)}
    meridian = {k: {(): 1, (k,): 1} for k in range(len(comps))}
    value = {a: meridian[comp[e]] for e, a in arc_of.items()}
    signs = diagram.signs()
    for _ in range(4 * len(diagram.crossings) + 4):
        new = dict(value)
        longitudes = []
        for k, labels in enumerate(comps):
            g = meridian[k]
            new[base[k]] = g
            w: Series = {(): 1}
            for e in labels:
                i, p = heads[e]
                if p != 0:
                    continue  # passes over: the arc goes on
                x = diagram.crossings[i]
                over = value[arc_of[x[1]]]
                c = _power(over, signs[i])
                g = _mul(_mul(c, g), _inverse(c))
                w = _mul(c, w)
                out_arc = arc_of[x[2]]
                if out_arc != base[k]:
                    new[out_arc] = g
            longitudes.append(w)
        if new == value:
            return longitudes
        value = new
    raise RuntimeError("internal error: Milnor's iteration did not settle")


def triple_linking_number(diagram: Diagram) -> int:
    """Milnor's invariant mu(123) of a three-component link whose linking numbers vanish.

    Parameters
    ----------
    diagram : Diagram
        Three components, every pairwise linking number 0.

    Returns
    -------
    int
        ``mu(123)``; reversing one component or exchanging two negates it, so
        only ``|mu(123)|`` is a property of the unoriented, unlabelled link.
        0 for the unlink, ±1 for the Borromean rings.

    Raises
    ------
    InvariantError
        When the diagram does not have three components or a pairwise
        linking number is not 0 (then mu(123) is defined only modulo their
        greatest common divisor, and not computed here).

    Examples
    --------
    >>> from knotsift.notations.braid import parse_braid
    >>> abs(triple_linking_number(parse_braid("1 -2 1 -2 1 -2")))
    1

    References
    ----------
    J. Milnor, "Link groups", Ann. of Math. 59 (1954); "Isotopy of links"
    (1957), for the iteration and the invariants mu-bar.
    """
    m = diagram.number_of_components()
    if m != 3:
        raise InvariantError(f"the triple linking number needs 3 components, got {m}",
                             value=m)
    lk = linking_matrix(diagram)
    if lk[0][1] or lk[0][2] or lk[1][2]:
        raise InvariantError("the triple linking number is an integer only when every "
                             f"pairwise linking number is 0, got {lk[0][1]}, {lk[0][2]}, "
                             f"{lk[1][2]}", value=lk)
    if diagram.free_loops:
        return 0
    return longitude_coefficients(diagram)[2].get((0, 1), 0)
