"""Tests of knotsift.invariants.elimination against sympy determinants (sympy oracle)."""

from __future__ import annotations

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from knotsift.invariants.elimination import (
    integer_determinant,
    linear_polynomial_determinant,
    primes_below_2_31,
)

FAST = settings(max_examples=60, deadline=None)
PRIMES = primes_below_2_31(3)
START = 1 << 20  # the first evaluation point of linear_polynomial_determinant


def sparse(matrix, zero=0):
    return [{c: v for c, v in enumerate(row) if v != zero} for row in matrix]


def test_primes_below_2_31():
    """The primes are the largest below 2^31: 2^31 - 1 is a Mersenne prime (common practice)."""
    import sympy

    primes = primes_below_2_31(6)
    assert primes[0] == 2 ** 31 - 1
    assert primes == [sympy.prevprime(p) for p in [2 ** 31] + primes[:-1]]


@FAST
@given(st.integers(1, 7).flatmap(lambda n: st.lists(
    st.lists(st.sampled_from([0, 0, 1, -1, 2, -3, PRIMES[0], PRIMES[1], 2 * PRIMES[0], 10 ** 12]),
             min_size=n, max_size=n), min_size=n, max_size=n)))
def test_integer_determinant_matches_sympy(matrix):
    """Exact integer determinants, also with entries vanishing modulo some primes."""
    import sympy

    assert integer_determinant(sparse(matrix), len(matrix)) == sympy.Matrix(matrix).det()


ENTRIES = [(0, 0), (0, 0), (1, -1), (-1, 1), (0, 1), (1, 0), (-1, 0), (0, -1), (3, -2),
           (START, -1), (START + 1, -1), (-START - 2, 1)]


@FAST
@given(st.integers(1, 6).flatmap(lambda n: st.lists(
    st.lists(st.sampled_from(ENTRIES), min_size=n, max_size=n), min_size=n, max_size=n)))
def test_linear_polynomial_determinant_matches_sympy(matrix):
    """Determinants of matrices of entries c0 + c1 t, also when entries vanish at the
    evaluation points (so that pivots must be chosen lane by lane)."""
    import sympy

    t = sympy.Symbol("t")
    n = len(matrix)
    det = sympy.expand(sympy.Matrix([[a + b * t for a, b in row] for row in matrix]).det())
    expected = [int(det.coeff(t, k)) for k in range(n + 1)]
    assert linear_polynomial_determinant(sparse(matrix, (0, 0)), n) == expected


def test_determinants_of_empty_and_zero_matrices():
    """The 0 x 0 determinant is 1; a zero row gives 0."""
    assert integer_determinant([], 0) == 1
    assert linear_polynomial_determinant([], 0) == [1]
    assert integer_determinant([{}, {0: 1}], 2) == 0
    assert linear_polynomial_determinant([{0: (1, 1)}, {0: (2, 0)}], 2) == [0, 0, 0]


def test_determinants_reject_wrong_row_count():
    """The number of rows must be the stated size."""
    with pytest.raises(ValueError):
        integer_determinant([{0: 1}], 2)
    with pytest.raises(ValueError):
        linear_polynomial_determinant([{0: (1, 0)}], 2)
