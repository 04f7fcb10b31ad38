"""The signature of a knot or link, by the Gordon-Litherland formula."""

from __future__ import annotations

from typing import Sequence

from ..diagram import Diagram
from ..errors import InvariantError
from .goeritz import goeritz_forms

__all__ = ["knot_signature", "inertia"]

# Matrices up to this size go straight to exact elimination (it is faster there
# than a floating-point eigen-decomposition); larger ones try the certificate first.
SMALL_MATRIX = 120


def _inertia_exact(matrix: Sequence[Sequence[int]]) -> tuple[int, int, int]:
    """Inertia by fraction-free symmetric elimination (Sylvester's law of inertia).

    Diagonal pivots are taken in turn; when the trailing block has a zero
    diagonal but a non-zero entry ``a_ij``, row and column ``j`` are added to
    row and column ``i`` (a congruence), making ``a_ii = 2 a_ij`` non-zero.
    The k-th pivot is then the k-th leading principal minor ``D_k`` of a
    matrix congruent to the input, and ``D_k / D_(k-1)`` is the k-th entry of
    its LDL^T diagonal.
    """
    a = [list(map(int, row)) for row in matrix]
    n = len(a)
    pos = neg = 0
    prev = 1
    for k in range(n):
        piv = next((i for i in range(k, n) if a[i][i]), None)
        if piv is None:
            pair = next(((i, j) for i in range(k, n) for j in range(i + 1, n) if a[i][j]), None)
            if pair is None:
                return pos, neg, n - k
            i, j = pair
            for r in range(k, n):
                a[i][r] += a[j][r]
            for r in range(k, n):
                a[r][i] += a[r][j]
            piv = i
        if piv != k:
            a[k], a[piv] = a[piv], a[k]
            for row in a:
                row[k], row[piv] = row[piv], row[k]
        p = a[k][k]
        if (p > 0) == (prev > 0):
            pos += 1
        else:
            neg += 1
        rk = a[k]
        for i in range(k + 1, n):
            ri = a[i]
            aik = ri[k]
            for j in range(k + 1, n):
                ri[j] = (p * ri[j] - aik * rk[j]) // prev
            ri[k] = 0
        prev = p
    return pos, neg, 0


def _inertia_certified(matrix: Sequence[Sequence[int]]) -> tuple[int, int, int] | None:
    """Inertia from floating-point eigenvectors, certified exactly; None if not certified.

    The eigenvectors are scaled and rounded to an integer matrix W, and
    M = W^T G W is formed exactly in int64 (the scale is chosen so that no
    sum can overflow).  If M is strictly diagonally dominant it is
    non-singular, hence so is W, and by Gershgorin's theorem its inertia is
    that of its diagonal; by Sylvester's law it is the inertia of G.
    """
    import numpy as np

    g = np.array(matrix, dtype=np.int64)
    n = g.shape[0]
    row_sum = int(np.abs(g).sum(axis=1).max())
    if row_sum == 0:
        return None
    # |W_ij| <= 2^s, so |(G W)_ij| <= row_sum 2^s, |M_ij| <= n row_sum 4^s and the
    # row sums of |M| are at most n^2 row_sum 4^s < 2^62: nothing overflows int64.
    s = (62 - (n * n * row_sum).bit_length()) // 2
    if s < 12:
        return None
    s = min(s, 26)
    _, vectors = np.linalg.eigh(g.astype(np.float64))
    w = np.rint(vectors * float(1 << s)).astype(np.int64)
    if np.abs(w).max() > (1 << s):
        return None
    m = w.T @ (g @ w)
    diag = np.diag(m)
    off = np.abs(m).sum(axis=1) - np.abs(diag)
    if not np.all(np.abs(diag) > off):
        return None
    return int((diag > 0).sum()), int((diag < 0).sum()), 0


def inertia(matrix: Sequence[Sequence[int]]) -> tuple[int, int, int]:
    """Numbers of positive, negative and zero eigenvalues of a symmetric integer matrix.

    Parameters
    ----------
    matrix : sequence of sequences of int
        Symmetric.

    Returns
    -------
    (int, int, int)

    Examples
    --------
    >>> inertia([[0, 1], [1, 0]])
    (1, 1, 0)
    >>> inertia([[2, 1, 0], [1, 2, 0], [0, 0, 0]])
    (2, 0, 1)

    Notes
    -----
    Exact.  Matrices up to 120 rows use fraction-free symmetric elimination
    (``O(n^3)`` integer operations).  Larger ones first try floating-point
    eigenvectors whose congruence with the matrix is certified in exact
    integer arithmetic (``O(n^3)`` machine operations), and fall back to the
    exact elimination when the certificate fails (for example a singular
    matrix).
    """
    n = len(matrix)
    for r, row in enumerate(matrix):
        if len(row) != n:
            raise ValueError(f"matrix must be square: row {r} has {len(row)} entries, not {n}")
        for c in range(r):
            if row[c] != matrix[c][r]:
                raise ValueError(f"matrix must be symmetric: entries ({r}, {c}) and ({c}, {r}) "
                                 f"are {row[c]} and {matrix[c][r]}")
    if n == 0:
        return 0, 0, 0
    if n > SMALL_MATRIX:
        certified = _inertia_certified(matrix)
        if certified is not None:
            return certified
    return _inertia_exact(matrix)


def knot_signature(diagram: Diagram) -> int:
    """The signature of an oriented knot or link.

    In the convention where the right-handed trefoil has signature -2
    (positive knots have negative signature).

    Parameters
    ----------
    diagram : Diagram

    Returns
    -------
    int
        Even for knots; the mirror image has the opposite signature.

    Raises
    ------
    InvariantError
        For the empty diagram (no components).

    Examples
    --------
    >>> right_trefoil = Diagram([(1, 5, 2, 4), (3, 1, 4, 6), (5, 3, 6, 2)])
    >>> knot_signature(right_trefoil)
    -2
    >>> knot_signature(Diagram([(1, 3, 2, 4), (3, 1, 4, 2)]))  # positive Hopf link
    -1

    Notes
    -----
    Gordon-Litherland: sigma = sign(G) - mu for the Goeritz matrix G of a
    checkerboard surface and its correction term mu (the local rules are
    stated in :mod:`knotsift.invariants.goeritz`); each connected piece of
    the diagram is done separately and the results added (the signature is
    additive under split union), free loops contribute 0.  Linear time to
    build G, then :func:`inertia`.

    References
    ----------
    H. F. Trotter, "Homology of group systems with applications to knot
    theory", Ann. of Math. 76 (1962).  K. Murasugi, "On a certain numerical
    invariant of link types", Trans. AMS 117 (1965).  C. McA. Gordon and
    R. A. Litherland, "On the signature of a link", Invent. Math. 47 (1978).
    """
    if diagram.number_of_components() == 0:
        raise InvariantError("the signature needs at least one component, got an empty diagram",
                             value=diagram)
    total = 0
    for form in goeritz_forms(diagram, shaded=0):
        pos, neg, _ = inertia(form.matrix)
        total += pos - neg - form.correction
    return total
