"""The Alexander polynomial of a knot, from the Alexander (Fox) matrix of a diagram."""

from __future__ import annotations

from typing import Sequence

from ..diagram import Diagram
from ..errors import InvariantError
from ..laurent import Laurent
from ..partition import Partition
from .elimination import kronecker_polynomial_determinant, linear_polynomial_determinant

__all__ = ["alexander_matrix", "alexander_polynomial", "normalise_alexander"]

# Up to this many crossings the minor is expanded by one FLINT integer
# determinant (Kronecker substitution); above it, by elimination modulo primes
# at many points.  The crossover was measured in bench/bench_perturbed_alexander.py.
SMALL_DIAGRAM = 30

Entry = tuple[int, int]  # c0 + c1 t


def _arcs(diagram: Diagram) -> dict[int, int]:
    """Arc index of every edge label: edges joined through over-passages form one arc."""
    arcs = Partition(e for x in diagram.crossings for e in x)
    find = arcs.find
    for x in diagram.crossings:
        arcs.join(x[1], x[3])
    index: dict[int, int] = {}
    arc_of: dict[int, int] = {}
    for x in diagram.crossings:  # number arcs by the crossing where they end under
        for e in (x[0], x[1], x[2], x[3]):
            root = find(e)
            if root not in index:
                index[root] = len(index)
            arc_of[e] = index[root]
    return arc_of


def _fox_rows(diagram: Diagram) -> tuple[list[dict[int, Entry]], int]:
    """Sparse rows of the Alexander matrix, entries as (c0, c1) meaning c0 + c1 t.

    One row per crossing and one column per arc.  With over-arc k, incoming
    under-arc i and outgoing under-arc j, a positive crossing gives
    (1 - t) at k, t at i and -1 at j; a negative one (t - 1) at k, 1 at i and
    -t at j (the Fox derivatives of the Wirtinger relation, the negative one
    multiplied by t); entries add where arcs coincide.
    """
    arc_of = _arcs(diagram)
    rows: list[dict[int, Entry]] = []
    for x, sign in zip(diagram.crossings, diagram.signs(), strict=True):
        k, i, j = arc_of[x[1]], arc_of[x[0]], arc_of[x[2]]
        if sign > 0:
            terms = ((k, (1, -1)), (i, (0, 1)), (j, (-1, 0)))
        else:
            terms = ((k, (-1, 1)), (i, (1, 0)), (j, (0, -1)))
        row: dict[int, Entry] = {}
        for col, (a, b) in terms:
            a0, b0 = row.get(col, (0, 0))
            row[col] = (a0 + a, b0 + b)
        rows.append({c: v for c, v in row.items() if v != (0, 0)})
    return rows, len(set(arc_of.values()))


def _check_knot(diagram: Diagram, what: str) -> None:
    k = diagram.number_of_components()
    if k != 1:
        raise InvariantError(
            f"the {what} is computed for knots only, got a diagram with {k} components",
            value=diagram)


def alexander_matrix(diagram: Diagram) -> list[list[Laurent]]:
    """The Alexander matrix of a knot diagram: one row per crossing, one column per arc.

    Parameters
    ----------
    diagram : Diagram
        A knot diagram (one component).

    Returns
    -------
    list of list of Laurent
        Row ``r`` belongs to crossing ``r``; arcs (maximal strands running
        through over-passages) are numbered in order of first appearance in
        the PD code.  Deleting any one row and one column leaves a minor whose
        determinant is ``±t^m`` times the Alexander polynomial.

    Raises
    ------
    InvariantError
        For a link.

    Examples
    --------
    >>> trefoil = Diagram([(1, 5, 2, 4), (3, 1, 4, 6), (5, 3, 6, 2)])
    >>> [[str(e) for e in row] for row in alexander_matrix(trefoil)]
    [['t', '1 - t', '-1'], ['1 - t', '-1', 't'], ['-1', 't', '1 - t']]

    Notes
    -----
    Fox derivatives of the Wirtinger presentation (common practice).

    References
    ----------
    R. H. Fox, "Free differential calculus. II", Ann. of Math. 59 (1954).
    """
    _check_knot(diagram, "Alexander matrix")
    rows, n = _fox_rows(diagram)
    return [[Laurent.from_coefficients(0, list(row.get(c, (0, 0)))) for c in range(n)]
            for row in rows]


# -- fraction-free elimination over Z[t] (small diagrams) --------------------
def _padd(a: list[int], b: list[int]) -> list[int]:
    if len(a) < len(b):
        a, b = b, a
    out = list(a)
    for i, c in enumerate(b):
        out[i] += c
    return _ptrim(out)


def _pneg(a: list[int]) -> list[int]:
    return [-c for c in a]


def _pmul(a: list[int], b: list[int]) -> list[int]:
    if not a or not b:
        return []
    out = [0] * (len(a) + len(b) - 1)
    for i, x in enumerate(a):
        if x:
            for j, y in enumerate(b):
                out[i + j] += x * y
    return _ptrim(out)


def _ptrim(a: list[int]) -> list[int]:
    while a and a[-1] == 0:
        a.pop()
    return a


def _pdivexact(a: list[int], b: list[int]) -> list[int]:
    """a / b in Z[t] when b divides a exactly."""
    a = list(a)
    if not a:
        return []
    q = [0] * (len(a) - len(b) + 1)
    lead = b[-1]
    for k in range(len(q) - 1, -1, -1):
        top = a[k + len(b) - 1]
        if top % lead:
            raise ArithmeticError("inexact polynomial division in Bareiss elimination")
        c = top // lead
        q[k] = c
        if c:
            for j, y in enumerate(b):
                a[k + j] -= c * y
    if any(a):
        raise ArithmeticError("inexact polynomial division in Bareiss elimination")
    return _ptrim(q)


def _bareiss_determinant(matrix: list[list[list[int]]]) -> list[int]:
    """Determinant of a square matrix over Z[t] (coefficient lists), fraction-free."""
    m = [[list(e) for e in row] for row in matrix]
    n = len(m)
    sign = 1
    prev = [1]
    for k in range(n):
        pivot_row = next((i for i in range(k, n) if m[i][k]), None)
        if pivot_row is None:
            return []
        if pivot_row != k:
            m[k], m[pivot_row] = m[pivot_row], m[k]
            sign = -sign
        p = m[k][k]
        for i in range(k + 1, n):
            for j in range(k + 1, n):
                num = _padd(_pmul(p, m[i][j]), _pneg(_pmul(m[i][k], m[k][j])))
                m[i][j] = _pdivexact(num, prev)
            m[i][k] = []
        prev = p
    det = m[n - 1][n - 1] if n else [1]
    return det if sign > 0 else _pneg(det)


def _minor_determinant(rows: list[dict[int, Entry]], n: int, method: str) -> list[int]:
    """Coefficients of the determinant of the minor without the last row and column."""
    minor = [{c: v for c, v in row.items() if c != n - 1} for row in rows[:n - 1]]
    if method == "bareiss":
        dense = [[_ptrim(list(row.get(c, (0, 0)))) for c in range(n - 1)] for row in minor]
        return _bareiss_determinant(dense)
    if method == "kronecker":
        return kronecker_polynomial_determinant(minor, n - 1)
    return linear_polynomial_determinant(minor, n - 1)


def _conway_normalised(coeffs: Sequence[int]) -> Laurent:
    """±t^m D(t) made symmetric with value 1 at t = 1; raises on a violated identity."""
    nonzero = [k for k, c in enumerate(coeffs) if c]
    if not nonzero:
        raise RuntimeError("internal error: the Alexander minor vanished for a knot")
    low, high = nonzero[0], nonzero[-1]
    body = list(coeffs[low:high + 1])
    if (high - low) % 2:
        raise RuntimeError(f"internal error: Alexander polynomial of odd span {high - low}")
    value_at_1 = sum(body)
    if value_at_1 not in (1, -1):
        raise RuntimeError(f"internal error: Alexander polynomial has |Delta(1)| = "
                           f"{abs(value_at_1)}, expected 1")
    if value_at_1 < 0:
        body = [-c for c in body]
    if body != body[::-1]:
        raise RuntimeError("internal error: Alexander polynomial is not symmetric")
    return Laurent.from_coefficients(-((high - low) // 2), body)


def alexander_polynomial(diagram: Diagram, method: str | None = None) -> Laurent:
    """The Conway-normalised Alexander polynomial of a knot.

    Parameters
    ----------
    diagram : Diagram
        A knot diagram (one component).
    method : {None, "bareiss", "kronecker", "modular"}, optional
        How to expand the minor: fraction-free elimination over Z[t], one
        integer determinant at t = 2^K (FLINT), or elimination modulo primes
        at many points followed by interpolation.  The default takes
        "kronecker" up to 30 crossings and "modular" above.

    Returns
    -------
    Laurent
        Delta(t) with Delta(1/t) = Delta(t) and Delta(1) = 1.

    Raises
    ------
    InvariantError
        For a link (Alexander is provided for knots only).

    Examples
    --------
    >>> trefoil = Diagram([(1, 5, 2, 4), (3, 1, 4, 6), (5, 3, 6, 2)])
    >>> str(alexander_polynomial(trefoil))
    't^-1 - 1 + t'
    >>> figure_eight = Diagram([(4, 2, 5, 1), (8, 6, 1, 5), (6, 3, 7, 4), (2, 7, 3, 8)])
    >>> str(alexander_polynomial(figure_eight))
    '-t^-1 + 3 - t'

    Notes
    -----
    The determinant of the Alexander matrix without its last row and column
    is ``±t^m Delta(t)`` (common practice); it is found exactly without
    symbolic expansion (see
    :func:`knotsift.invariants.elimination.linear_polynomial_determinant`),
    in roughly ``O(P n (n + f))`` vector operations for ``n`` crossings,
    ``P ~ n / 24`` primes and ``f`` fill-in entries.  The result is checked
    against Delta(1) = 1 and Delta(t) = Delta(1/t).

    References
    ----------
    J. W. Alexander, "Topological invariants of knots and links", Trans.
    AMS 30 (1928).  J. H. Conway, "An enumeration of knots and links, and
    some of their algebraic properties" (1970), for the normalisation.
    """
    _check_knot(diagram, "Alexander polynomial")
    if method not in (None, "bareiss", "kronecker", "modular"):
        raise ValueError(f"method must be None, 'bareiss', 'kronecker' or 'modular', "
                         f"got {method!r}")
    n = diagram.number_of_crossings()
    if n <= 1:
        return Laurent.constant(1)
    rows, arcs = _fox_rows(diagram)
    if arcs != n:
        raise RuntimeError(f"internal error: a knot with {n} crossings has {arcs} arcs")
    if method is None:
        method = "kronecker" if n <= SMALL_DIAGRAM else "modular"
    return _conway_normalised(_minor_determinant(rows, n, method))


def normalise_alexander(p: Laurent) -> Laurent:
    """Shift and sign a polynomial to the symmetric form with Delta(1) = +1 when possible."""
    if p.is_zero():
        return p
    lo, hi = p.min_exponent, p.max_exponent
    centred = p.shift(-(lo + hi) / 2)
    if sum(c for _, c in centred.terms()) < 0:
        centred = -centred
    return centred
