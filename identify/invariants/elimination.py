"""Exact determinants of sparse matrices by elimination modulo many primes at once.

A square matrix whose entries are integers, or polynomials of degree at most
one in ``t``, is evaluated at many *lanes* (a prime ``q`` and, for
polynomials, a point ``x``); every entry becomes a numpy ``int64`` vector over
the lanes and one sparse, division-free Gaussian elimination computes the
determinant in all lanes together.  Integer determinants are then rebuilt by
the Chinese remainder theorem from a rigorous Hadamard bound, and polynomial
determinants by Newton interpolation in each prime followed by the same CRT
step.  Everything is exact: the lanes never leave ``[0, q)`` and a product of
two residues stays below ``2^62``.
"""

from __future__ import annotations

import math
from typing import Mapping, Sequence

__all__ = ["integer_determinant", "linear_polynomial_determinant", "primes_below_2_31",
           "kronecker_polynomial_determinant"]

_PRIME_CACHE: list[int] = []


def _is_prime(n: int) -> bool:
    """Deterministic Miller-Rabin for n < 3 215 031 751 (bases 2, 3, 5, 7)."""
    if n < 2:
        return False
    for p in (2, 3, 5, 7):
        if n % p == 0:
            return n == p
    d, s = n - 1, 0
    while d % 2 == 0:
        d //= 2
        s += 1
    for a in (2, 3, 5, 7):
        x = pow(a, d, n)
        if x in (1, n - 1):
            continue
        for _ in range(s - 1):
            x = x * x % n
            if x == n - 1:
                break
        else:
            return False
    return True


def primes_below_2_31(count: int) -> list[int]:
    """The ``count`` largest primes below 2^31, in decreasing order."""
    candidate = _PRIME_CACHE[-1] - 2 if _PRIME_CACHE else (1 << 31) - 1
    while len(_PRIME_CACHE) < count:
        if _is_prime(candidate):
            _PRIME_CACHE.append(candidate)
        candidate -= 2
    return _PRIME_CACHE[:count]


def _primes_for_bound(bound_squared: int) -> list[int]:
    """Primes whose product exceeds twice the bound whose square is given."""
    # product > 2 * sqrt(bound_squared)  <=>  product^2 > 4 * bound_squared
    target = 4 * bound_squared
    count = max(1, (target.bit_length() + 1) // 61 + 1)
    while True:
        primes = primes_below_2_31(count)
        product = math.prod(primes)
        if product * product > target:
            return primes
        count += 1


def _powmod(base, exponent, q):
    """Lane-wise base^exponent mod q (numpy int64 arrays, exponents >= 0)."""
    import numpy as np

    result = np.ones_like(base)
    base = base % q
    exponent = exponent.copy()
    while np.any(exponent):
        odd = (exponent & 1).astype(bool)
        result = np.where(odd, result * base % q, result)
        base = base * base % q
        exponent >>= 1
    return result


def _inverse(values, q):
    """Lane-wise inverse modulo the primes q (Fermat); values must be non-zero mod q."""
    return _powmod(values, q - 2, q)


def _permutation_sign(perm: Sequence[int]) -> int:
    seen = [False] * len(perm)
    sign = 1
    for start in range(len(perm)):
        if seen[start]:
            continue
        length = 0
        k = start
        while not seen[k]:
            seen[k] = True
            k = perm[k]
            length += 1
        if length % 2 == 0:
            sign = -sign
    return sign


def _eliminate(rows: list[dict[int, object]], q, lanes):
    """Determinant of the sparse square matrix in the given lanes (numpy index array).

    ``rows[r]`` maps a column to an int64 vector over *all* lanes.  Returns an
    int64 vector of determinants modulo q over ``lanes``.  Lanes where a pivot
    vanishes are set aside and recomputed with pivots of their own.
    """
    import numpy as np

    m = len(rows)
    qq = q[lanes]
    if m == 0:
        return np.ones(len(lanes), dtype=np.int64)
    work = [{c: v[lanes] for c, v in r.items()} for r in rows]
    col_rows: dict[int, set[int]] = {}
    for r, row in enumerate(work):
        for c in row:
            col_rows.setdefault(c, set()).add(r)
    alive = np.ones(len(lanes), dtype=bool)
    result = np.zeros(len(lanes), dtype=np.int64)
    numerator = np.ones(len(lanes), dtype=np.int64)
    scale = np.ones(len(lanes), dtype=np.int64)
    live_rows = set(range(m))
    perm = [0] * m
    deferred = np.zeros(len(lanes), dtype=bool)
    for _ in range(m):
        # Markowitz candidates: entries in the shortest rows and the shortest columns.
        shortest_row = min(len(work[r]) for r in live_rows)
        if shortest_row == 0:
            # a zero row: the determinant vanishes in every remaining lane
            return _finish(result, alive, deferred, rows, q, lanes, zero_rest=True)
        candidates = []
        for r in live_rows:
            if len(work[r]) == shortest_row:
                for c in work[r]:
                    candidates.append(((shortest_row - 1) * (len(col_rows[c]) - 1), r, c))
                if len(candidates) >= 8:
                    break
        shortest_col = min(len(s) for s in col_rows.values())
        if shortest_col == 0:
            return _finish(result, alive, deferred, rows, q, lanes, zero_rest=True)
        found = 0
        for c, s in col_rows.items():
            if len(s) == shortest_col:
                for r in s:
                    candidates.append(((len(work[r]) - 1) * (shortest_col - 1), r, c))
                found += 1
                if found >= 4:
                    break
        candidates.sort()
        pivot = None
        for _, r, c in candidates:
            if ((work[r][c] != 0) | ~alive).all():
                pivot = (r, c)
                break
        if pivot is None:
            # rare: every candidate vanishes in some lane; take the entry that
            # vanishes in the fewest lanes and set those lanes aside
            best = (0, None)
            for r in live_rows:
                for c, v in work[r].items():
                    count = int(((v != 0) & alive).sum())
                    if count > best[0]:
                        best = (count, (r, c))
            if best[1] is None:
                # every remaining entry vanishes in every remaining lane
                return _finish(result, alive, deferred, rows, q, lanes, zero_rest=True)
            pivot = best[1]
            vanish = (work[pivot[0]][pivot[1]] == 0) & alive
            deferred |= vanish
            alive &= ~vanish
        r, c = pivot
        prow = work[r]
        pv = prow.pop(c)
        numerator = numerator * pv % qq
        perm[r] = c
        live_rows.discard(r)
        others = col_rows.pop(c)
        others.discard(r)
        for col in prow:
            col_rows[col].discard(r)
        for j in others:
            rj = work[j]
            a = rj.pop(c)
            for col in list(rj):
                if col not in prow:
                    rj[col] = rj[col] * pv % qq
            for col, pval in prow.items():
                if col in rj:
                    v = (rj[col] * pv - a * pval) % qq
                    if v.any():
                        rj[col] = v
                    else:
                        del rj[col]
                        col_rows[col].discard(j)
                else:
                    rj[col] = (-a * pval) % qq
                    col_rows[col].add(j)
            scale = scale * pv % qq
        work[r] = {}
    det = numerator * _inverse(scale, qq) % qq
    if _permutation_sign(perm) < 0:
        det = (-det) % qq
    result[alive] = det[alive]
    return _finish(result, alive, deferred, rows, q, lanes, zero_rest=False)


def _finish(result, alive, deferred, rows, q, lanes, zero_rest: bool):
    if zero_rest:
        result[alive] = 0
    if deferred.any():
        idx = deferred.nonzero()[0]
        result[idx] = _eliminate(rows, q, lanes[idx])
    return result


def _crt_weights(primes: Sequence[int]) -> tuple[int, list[int]]:
    modulus = math.prod(primes)
    weights = []
    for p in primes:
        rest = modulus // p
        weights.append(rest * pow(rest % p, -1, p))
    return modulus, weights


def _crt_symmetric(residues: Sequence[int], modulus: int, weights: Sequence[int]) -> int:
    value = sum(r * w for r, w in zip(residues, weights, strict=True)) % modulus
    return value - modulus if 2 * value > modulus else value


def integer_determinant(rows: Sequence[Mapping[int, int]], size: int) -> int:
    """The exact determinant of a sparse square integer matrix.

    Parameters
    ----------
    rows : sequence of mappings
        ``rows[r][c]`` is the entry in row ``r`` and column ``c`` (columns
        ``0 .. size - 1``); missing entries are zero.
    size : int
        The number of rows and of columns.

    Returns
    -------
    int

    Examples
    --------
    >>> integer_determinant([{0: 2, 1: -1}, {0: -1, 1: 2}], 2)
    3

    Notes
    -----
    Elimination modulo enough 31-bit primes that their product exceeds twice
    Hadamard's bound, then the Chinese remainder theorem.
    """
    import numpy as np

    if len(rows) != size:
        raise ValueError(f"expected {size} rows, got {len(rows)}")
    if size == 0:
        return 1
    bound_sq = 1
    for row in rows:
        bound_sq *= sum(v * v for v in row.values())
    if bound_sq == 0:
        return 0
    primes = _primes_for_bound(bound_sq)
    q = np.array(primes, dtype=np.int64)
    vec_rows = [{c: np.array([v % p for p in primes], dtype=np.int64)
                 for c, v in row.items() if v} for row in rows]
    dets = _eliminate(vec_rows, q, np.arange(len(primes)))
    modulus, weights = _crt_weights(primes)
    return _crt_symmetric([int(d) for d in dets], modulus, weights)


def _linear_bound_squared(rows: Sequence[Mapping[int, tuple[int, int]]], size: int) -> int:
    """Square of Hadamard's bound on the unit circle for entries ``c0 + c1 t``.

    -1 for the empty matrix (determinant 1), 0 when a row is zero.
    """
    if len(rows) != size:
        raise ValueError(f"expected {size} rows, got {len(rows)}")
    if size == 0:
        return -1
    bound_sq = 1
    for row in rows:
        bound_sq *= sum((abs(a) + abs(b)) ** 2 for a, b in row.values())
    return bound_sq


def linear_polynomial_determinant(rows: Sequence[Mapping[int, tuple[int, int]]],
                                  size: int) -> list[int]:
    """The determinant of a sparse square matrix with entries ``c0 + c1 t``.

    Parameters
    ----------
    rows : sequence of mappings
        ``rows[r][c] = (c0, c1)``, the entry ``c0 + c1 t``.
    size : int

    Returns
    -------
    list of int
        Coefficients of the determinant, constant term first (length
        ``size + 1``, trailing zeros kept).

    Examples
    --------
    >>> linear_polynomial_determinant([{0: (1, -1), 1: (0, 1)}, {0: (0, 1), 1: (1, -1)}], 2)
    [1, -2, 0]

    Notes
    -----
    The determinant has degree at most ``size``.  On the unit circle an entry
    is at most ``|c0| + |c1|`` in absolute value, so Hadamard's inequality
    bounds ``|det|`` there, and hence every coefficient (they are Fourier
    coefficients), by the product of the row norms.  Enough 31-bit primes
    are taken for that bound; in each the determinant is evaluated at
    ``size + 1`` consecutive points by one vectorised elimination over all
    (prime, point) lanes, then interpolated (Newton's divided differences)
    and the coefficients are combined by the Chinese remainder theorem.
    """
    import numpy as np

    bound_sq = _linear_bound_squared(rows, size)
    if bound_sq <= 0:
        return [1] if size == 0 else [0] * (size + 1)
    primes = _primes_for_bound(bound_sq)
    npr = len(primes)
    npts = size + 1
    start = 1 << 20  # points start, start + 1, ...: away from 0, 1 and -1
    q = np.repeat(np.array(primes, dtype=np.int64), npts)
    x = (start + np.tile(np.arange(npts, dtype=np.int64), npr)) % q
    vec_rows = [{c: (a + b * x) % q for c, (a, b) in row.items() if a or b} for row in rows]
    values = _eliminate(vec_rows, q, np.arange(npr * npts)).reshape(npr, npts)
    qcol = np.array(primes, dtype=np.int64).reshape(npr, 1)
    # Newton divided differences at the points start + j: x_j - x_{j-k} = k.
    ks = np.tile(np.arange(1, npts, dtype=np.int64), (npr, 1))
    inv_k = _inverse(ks, np.broadcast_to(qcol, ks.shape).copy())
    c = values.copy()
    for k in range(1, npts):
        c[:, k:] = (c[:, k:] - c[:, k - 1:-1]) % qcol * inv_k[:, k - 1:k] % qcol
    # Newton form to monomials, Horner from the top.
    coef = np.zeros((npr, npts), dtype=np.int64)
    coef[:, 0] = c[:, npts - 1]
    for k in range(npts - 2, -1, -1):
        xk = (start + k) % qcol
        deg = npts - 2 - k  # current degree of coef
        new = np.zeros_like(coef)
        new[:, 1:deg + 2] = coef[:, :deg + 1]
        new[:, :deg + 1] = (new[:, :deg + 1] - xk * coef[:, :deg + 1]) % qcol
        new[:, 0] = (new[:, 0] + c[:, k]) % qcol[:, 0]
        coef = new
    modulus, weights = _crt_weights(primes)
    out = []
    for e in range(npts):
        out.append(_crt_symmetric([int(v) for v in coef[:, e]], modulus, weights))
    return out


def kronecker_polynomial_determinant(rows: Sequence[Mapping[int, tuple[int, int]]],
                                     size: int) -> list[int]:
    """The determinant of a square matrix with entries ``c0 + c1 t``, by Kronecker substitution.

    Same input and output as :func:`linear_polynomial_determinant`.

    Examples
    --------
    >>> kronecker_polynomial_determinant([{0: (1, -1), 1: (0, 1)}, {0: (0, 1), 1: (1, -1)}], 2)
    [1, -2, 0]

    Notes
    -----
    Every coefficient is at most Hadamard's bound ``H`` (see
    :func:`linear_polynomial_determinant`), so with ``2^(K - 1) > H`` the
    integer ``det M(2^K)`` (FLINT ``fmpz_mat.det``) holds the coefficients as
    balanced base-``2^K`` digits.  Faster than the lanes of
    :func:`linear_polynomial_determinant` on small matrices, slower on large
    ones (the integers grow as ``size * K`` bits).
    """
    from flint import fmpz_mat

    bound_sq = _linear_bound_squared(rows, size)
    if bound_sq <= 0:
        return [1] if size == 0 else [0] * (size + 1)
    bits = math.isqrt(bound_sq).bit_length() + 2
    base = 1 << bits
    value = int(fmpz_mat([[a + b * base for a, b in (row.get(c, (0, 0)) for c in range(size))]
                          for row in rows]).det())
    out = []
    half = base >> 1
    for _ in range(size + 1):
        digit = value & (base - 1)
        if digit >= half:
            digit -= base
        out.append(digit)
        value = (value - digit) >> bits
    if value:
        raise RuntimeError("internal error: the Kronecker substitution overflowed its bound")
    return out
