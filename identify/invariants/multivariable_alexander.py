"""The multivariable Alexander polynomial of a link, from its coloured Fox matrix.

Each component ``k`` gets its own variable ``t(k+1)``.  The result is
defined up to units ``±t1^a1 t2^a2 ...``; it is written here in one
documented normal form (see :func:`normal_form`).
"""

from __future__ import annotations

from itertools import permutations
from typing import Sequence

from ..diagram import Diagram
from ..errors import InvariantError
from .alexander import _arcs

__all__ = ["multivariable_alexander", "normal_form", "polynomial_text", "permuted",
           "one_variable_reduction", "MAX_CROSSINGS"]

#: Above this many crossings (after simplification) the polynomial is not computed.
MAX_CROSSINGS = 40

Poly = dict  # {exponent tuple: integer coefficient}


def normal_form(poly: Poly) -> Poly:
    """The representative of ``poly`` up to units that the table stores.

    Every variable's smallest exponent is shifted to 0, and the sign is chosen
    so that the coefficient of the largest monomial (exponent tuples compared
    lexicographically) is positive.  The zero polynomial stays zero.

    Examples
    --------
    >>> normal_form({(2, 1): -1, (1, 1): 1})
    {(1, 0): 1, (0, 0): -1}
    """
    poly = {e: c for e, c in poly.items() if c}
    if not poly:
        return {}
    n = len(next(iter(poly)))
    low = [min(e[i] for e in poly) for i in range(n)]
    shifted = {tuple(a - b for a, b in zip(e, low, strict=True)): c for e, c in poly.items()}
    top = max(shifted)
    sign = 1 if shifted[top] > 0 else -1
    return {e: sign * shifted[e] for e in sorted(shifted, reverse=True)}


def polynomial_text(poly: Poly) -> str:
    """Canonical text: terms by decreasing exponent tuple, variables t1, t2, ...

    Examples
    --------
    >>> polynomial_text({(1, 1): 1, (1, 0): -1, (0, 1): -1, (0, 0): 1})
    't1 t2 - t1 - t2 + 1'
    """
    if not poly:
        return "0"
    parts = []
    for e in sorted(poly, reverse=True):
        c = poly[e]
        mono = " ".join(f"t{i + 1}" + (f"^{k}" if k != 1 else "") for i, k in enumerate(e) if k)
        mag = abs(c)
        body = mono if mono and mag == 1 else (f"{mag} {mono}" if mono else str(mag))
        if not parts:
            parts.append(("-" if c < 0 else "") + body)
        else:
            parts.append(("- " if c < 0 else "+ ") + body)
    return " ".join(parts)


def permuted(poly: Poly, order: Sequence[int]) -> Poly:
    """The polynomial with variable ``order[i]`` renamed to variable ``i``, in normal form."""
    return normal_form({tuple(e[j] for j in order): c for e, c in poly.items()})


def _ring(n: int):
    from sympy import ZZ, symbols

    gens = symbols(f"t1:{n + 1}")
    return ZZ[gens], gens


def multivariable_alexander(diagram: Diagram) -> Poly:
    """The multivariable Alexander polynomial of a link of two or more components.

    Parameters
    ----------
    diagram : Diagram
        An oriented link diagram with at least two components.

    Returns
    -------
    dict
        ``{exponents: coefficient}`` in :func:`normal_form`; ``{}`` (zero) for
        a split diagram.

    Raises
    ------
    InvariantError
        For a knot (use the one-variable Alexander polynomial) or a diagram
        with more than :data:`MAX_CROSSINGS` crossings.

    Examples
    --------
    >>> hopf = Diagram([(1, 3, 2, 4), (3, 1, 4, 2)])
    >>> polynomial_text(multivariable_alexander(hopf))
    '1'

    Notes
    -----
    The Wirtinger relation of a crossing with over-arc ``c``, incoming
    under-arc ``a`` and outgoing under-arc ``b`` is ``b = c a c^-1`` (positive)
    or ``b = c^-1 a c`` (negative).  Its Fox derivatives, with each arc sent
    to its component's variable, give a row: ``1 - t_u`` at ``c``, ``t_o`` at
    ``a`` and ``-1`` at ``b`` for a positive crossing; ``t_u - 1``, ``1`` and
    ``-t_o`` for a negative one (multiplied by the unit ``t_o``), with ``u``
    the under and ``o`` the over component.  Deleting one row and the column
    of an arc of component ``j`` leaves a minor equal to
    ``±t^a (t_j - 1) Delta(t1, ..., tm)`` (Torres 1953; Fox 1954), which is
    expanded exactly by fraction-free elimination over ``Z[t1, ..., tm]``.

    References
    ----------
    R. H. Fox, "Free differential calculus. II", Ann. of Math. 59 (1954).
    G. Torres, "On the Alexander polynomial", Ann. of Math. 57 (1953).
    """
    m = diagram.number_of_components()
    if m < 2:
        raise InvariantError("the multivariable Alexander polynomial is computed for links of "
                             f"two or more components, got {m}", value=diagram)
    n = diagram.number_of_crossings()
    if n > MAX_CROSSINGS:
        raise InvariantError(f"the multivariable Alexander polynomial is computed for at most "
                             f"{MAX_CROSSINGS} crossings, got {n}", value=n)
    if diagram.free_loops or len(_pieces(diagram)) > 1:
        return {}
    arc_of = _arcs(diagram)
    comp = diagram.component_of_label()
    arcs = len(set(arc_of.values()))
    if arcs != n:
        return {}  # a component passing under nothing lies above the rest: split
    R, t = _ring(m)
    one = R.one
    rows = []
    for x, s in zip(diagram.crossings, diagram.signs(), strict=True):
        c, a, b = arc_of[x[1]], arc_of[x[0]], arc_of[x[2]]
        tu, to = t[comp[x[0]]], t[comp[x[1]]]
        row = [R.zero] * arcs
        if s > 0:
            entries = ((c, one - R(tu)), (a, R(to)), (b, -one))
        else:
            entries = ((c, R(tu) - one), (a, one), (b, -R(to)))
        for col, v in entries:
            row[col] = row[col] + v
        rows.append(row)
    drop = arc_of[diagram.components()[0][0]]
    minor = [[v for j, v in enumerate(row) if j != drop] for row in rows[:-1]]
    det = _determinant(minor, R)
    quotient = R(det).exquo(R(t[0]) - one)
    return normal_form({tuple(e): int(c) for e, c in quotient.terms()})


def _determinant(matrix, R):
    from sympy.polys.matrices import DomainMatrix

    k = len(matrix)
    if k == 0:
        return R.one
    return DomainMatrix(matrix, (k, k), R).det()


def _pieces(diagram: Diagram) -> list[set[int]]:
    from .linking import split_parts

    return [set(p) for p in split_parts(diagram)]


def one_variable_reduction(poly: Poly) -> dict[int, int]:
    """``(t - 1) Delta(t, ..., t)``: the one-variable Alexander polynomial of the link (Torres).

    Returned as ``{exponent: coefficient}`` with the lowest exponent 0 and a
    positive leading coefficient.
    """
    out: dict[int, int] = {}
    for e, c in poly.items():
        d = sum(e)
        out[d + 1] = out.get(d + 1, 0) + c
        out[d] = out.get(d, 0) - c
    out = {e: c for e, c in out.items() if c}
    if not out:
        return {}
    low = min(out)
    out = {e - low: c for e, c in out.items()}
    sign = 1 if out[max(out)] > 0 else -1
    return {e: sign * c for e, c in sorted(out.items())}


def canonical_texts(poly: Poly) -> dict[tuple[int, ...], str]:
    """The normal-form text under every renaming of the variables (for order-free keys)."""
    n = len(next(iter(poly))) if poly else 0
    return {order: polynomial_text(permuted(poly, order)) for order in permutations(range(n))}
