"""Small exact matrices in pure Python, for diagrams too small to be worth loading FLINT or numpy.

Importing FLINT or numpy costs about 0.05 to 0.3 s each, more than all the
invariants of a diagram of a few crossings.  The determinant and the double
cover's homology use these routines for matrices of at most :data:`SMALL`
rows, and rho_1 for diagrams of at most
``perturbed_alexander.SMALL_RHO`` crossings, instead of the FLINT and numpy
calls they stand in for.  The results are the same (exact integers, or
residues modulo a prime), which ``tests/invariants/test_small_matrices.py``
checks against FLINT on random matrices and on whole diagrams on both sides
of the switch.
"""

from __future__ import annotations

from typing import Sequence

__all__ = ["SMALL", "determinant", "smith_diagonal", "MatrixModP"]

#: Goeritz matrices with at most this many rows use the pure-Python routines,
#: which take well under a millisecond at this size (as FLINT does, measured
#: on the table's knots).
SMALL = 12


def determinant(matrix: Sequence[Sequence[int]]) -> int:
    """The exact determinant of a square integer matrix (fraction-free elimination).

    Examples
    --------
    >>> determinant([[2, -1], [-1, 2]])
    3

    Notes
    -----
    Bareiss's elimination: ``O(n^3)`` exact divisions of integers.

    References
    ----------
    E. H. Bareiss, "Sylvester's identity and multistep integer-preserving
    Gaussian elimination", Math. Comp. 22 (1968).
    """
    a = [list(row) for row in matrix]
    n = len(a)
    if any(len(row) != n for row in a):
        raise ValueError(f"expected a square matrix, got {n} rows of lengths "
                         f"{sorted({len(row) for row in a})}")
    if n == 0:
        return 1
    sign, prev = 1, 1
    for k in range(n - 1):
        if a[k][k] == 0:
            swap = next((i for i in range(k + 1, n) if a[i][k]), None)
            if swap is None:
                return 0
            a[k], a[swap] = a[swap], a[k]
            sign = -sign
        pivot, row_k = a[k][k], a[k]
        for i in range(k + 1, n):
            row_i = a[i]
            factor = row_i[k]
            for j in range(k + 1, n):
                row_i[j] = (row_i[j] * pivot - factor * row_k[j]) // prev
        prev = pivot
    return sign * a[n - 1][n - 1]


def smith_diagonal(matrix: Sequence[Sequence[int]]) -> list[int]:
    """The diagonal of the Smith normal form: non-negative, each dividing the next, 0s last.

    ``min(rows, columns)`` entries, as FLINT's ``fmpz_mat.snf`` gives them.

    Examples
    --------
    >>> smith_diagonal([[2, 0], [0, 3]])
    [1, 6]
    >>> smith_diagonal([[2, 4], [4, 8]])
    [2, 0]

    Notes
    -----
    Row and column operations with the smallest non-zero entry as pivot,
    which shrinks until it divides its row, its column and the rest of the
    matrix.  Meant for small matrices: the entries may grow.
    """
    a = [list(row) for row in matrix]
    rows = len(a)
    cols = len(a[0]) if a else 0
    size = min(rows, cols)
    diagonal: list[int] = []
    t = 0
    while t < size:
        best = None
        for i in range(t, rows):
            for j in range(t, cols):
                v = a[i][j]
                if v and (best is None or abs(v) < abs(a[best[0]][best[1]])):
                    best = (i, j)
        if best is None:
            break
        i, j = best
        a[t], a[i] = a[i], a[t]
        for row in a:
            row[t], row[j] = row[j], row[t]
        pivot = a[t][t]
        cleared = True
        for i in range(t + 1, rows):
            q = a[i][t] // pivot
            if q:
                a[i] = [x - q * y for x, y in zip(a[i], a[t], strict=True)]
            cleared = cleared and a[i][t] == 0
        for j in range(t + 1, cols):
            q = a[t][j] // pivot
            if q:
                for row in a[t:]:
                    row[j] -= q * row[t]
            cleared = cleared and a[t][j] == 0
        if not cleared:
            continue  # a smaller remainder is the next pivot
        rest = next((i for i in range(t + 1, rows)
                     if any(a[i][j] % pivot for j in range(t + 1, cols))), None)
        if rest is not None:
            a[t] = [x + y for x, y in zip(a[t], a[rest], strict=True)]
            continue
        diagonal.append(abs(pivot))
        t += 1
    return diagonal + [0] * (size - len(diagonal))


class MatrixModP:
    """A square matrix modulo a prime, with the few operations of FLINT's ``nmod_mat`` we use.

    ``m[i, j]`` reads and writes entries (reduced modulo ``p``); :meth:`det`
    and :meth:`inv` eliminate a copy.

    Examples
    --------
    >>> m = MatrixModP(2, 2, [2, 1, 1, 1], 7)
    >>> m.det(), m.inv()[0, 1]
    (1, 6)
    """

    def __init__(self, rows: int, cols: int, entries: Sequence[int], p: int):
        if rows != cols or len(entries) != rows * cols:
            raise ValueError(f"expected {rows} x {cols} square entries, got {len(entries)}")
        self.n, self.p = rows, p
        self.rows = [[v % p for v in entries[i * cols:(i + 1) * cols]] for i in range(rows)]
        self._solved: tuple[int, list[list[int]] | None] | None = None

    def __getitem__(self, index: tuple[int, int]) -> int:
        return self.rows[index[0]][index[1]]

    def __setitem__(self, index: tuple[int, int], value: int) -> None:
        self.rows[index[0]][index[1]] = value % self.p
        self._solved = None

    def _reduced(self) -> tuple[int, list[list[int]] | None]:
        """Gauss-Jordan elimination: the determinant and the inverse (None if singular).

        Kept until an entry changes, since callers ask for both.
        """
        if self._solved is None:
            self._solved = self._eliminate()
        return self._solved

    def _eliminate(self) -> tuple[int, list[list[int]] | None]:
        n, p = self.n, self.p
        a = [row[:] + [int(i == j) for j in range(n)] for i, row in enumerate(self.rows)]
        det = 1
        for k in range(n):
            r = next((i for i in range(k, n) if a[i][k]), None)
            if r is None:
                return 0, None
            if r != k:
                a[k], a[r] = a[r], a[k]
                det = -det
            pivot = a[k][k]
            det = det * pivot % p
            inv = pow(pivot, -1, p)
            row_k = a[k] = [v * inv % p for v in a[k]]
            for i in range(n):
                f = a[i][k]
                if i != k and f:
                    a[i] = [(v - f * w) % p for v, w in zip(a[i], row_k, strict=True)]
        return det % p, [row[n:] for row in a]

    def det(self) -> int:
        """The determinant modulo ``p``, in ``0 .. p - 1``."""
        return self._reduced()[0]

    def inv(self) -> MatrixModP:
        """The inverse modulo ``p``; ``ZeroDivisionError`` when singular."""
        _, inverse = self._reduced()
        if inverse is None:
            raise ZeroDivisionError("the matrix is singular modulo p")
        return MatrixModP(self.n, self.n, [v for row in inverse for v in row], self.p)
