"""Tests of knotsift.invariants.small_matrices: the pure-Python stand-ins agree with FLINT.

FLINT (python-flint) is a general-purpose number theory library; its exact
determinant, Smith normal form and matrices modulo a prime are the outside
check.  The invariants switch between the two by size, so whole diagrams
are also computed on both sides of the switch.
"""

import random

import pytest
from flint import fmpz_mat, nmod_mat

from knotsift.data_build.build import construct
from knotsift.data_build.sources import read_sources
from knotsift.invariants import determinant as determinant_module
from knotsift.invariants import double_cover, perturbed_alexander, small_matrices
from knotsift.invariants.small_matrices import MatrixModP, determinant, smith_diagonal
from knotsift.reidemeister import scramble
from tests.strategies import torus_knot

P = 2_147_483_647  # 2^31 - 1, a prime (common practice)


def _random_matrix(rng, rows, cols, spread=5, zeros=0.3):
    return [[0 if rng.random() < zeros else rng.randint(-spread, spread) for _ in range(cols)]
            for _ in range(rows)]


def test_determinant_matches_flint():
    """Random integer matrices up to 9 x 9, singular ones included."""
    rng = random.Random(1)
    for _ in range(400):
        n = rng.randint(0, 9)
        m = _random_matrix(rng, n, n, zeros=rng.choice((0.0, 0.3, 0.7)))
        expected = int(fmpz_mat(m).det()) if n else 1
        assert determinant(m) == expected, m


def test_determinant_refuses_non_square():
    with pytest.raises(ValueError, match="square"):
        determinant([[1, 2]])


def test_smith_diagonal_matches_flint():
    """Random integer matrices, square and rectangular, of full and of lower rank."""
    rng = random.Random(2)
    for _ in range(400):
        rows, cols = rng.randint(1, 7), rng.randint(1, 7)
        if rng.random() < 0.5:
            cols = rows
        m = _random_matrix(rng, rows, cols, spread=rng.choice((2, 9)))
        if rng.random() < 0.3 and rows > 1:  # a repeated row: lower rank
            m[-1] = list(m[0])
        snf = fmpz_mat(m).snf()
        expected = [abs(int(snf[k, k])) for k in range(min(rows, cols))]
        assert smith_diagonal(m) == expected, m


def test_matrix_mod_p_matches_flint():
    """Determinant and inverse modulo a prime, after changing entries as rho_1 does."""
    rng = random.Random(3)
    for _ in range(200):
        n = rng.randint(1, 7)
        flat = [rng.randrange(P) if rng.random() < 0.6 else 0 for _ in range(n * n)]
        ours, theirs = MatrixModP(n, n, flat, P), nmod_mat(n, n, flat, P)
        for _ in range(rng.randint(0, 3)):
            i, j, v = rng.randrange(n), rng.randrange(n), rng.randrange(-P, P)
            ours[i, j] = v
            theirs[i, j] = v % P
        assert ours.det() == int(theirs.det())
        if ours.det():
            inverse, expected = ours.inv(), theirs.inv()
            assert all(inverse[i, j] == int(expected[i, j]) for i in range(n) for j in range(n))
        else:
            with pytest.raises(ZeroDivisionError):
                ours.inv()


def _diagrams():
    """Table knots through 8 crossings, some scrambled (to 20 or so crossings), torus knots."""
    rng = random.Random(4)
    primes = [e for e in read_sources().primes if e.crossing_number <= 8]
    out = [construct(e)[0] for e in primes]
    out += [scramble(construct(e)[0], 3, rng) for e in rng.sample(primes, 6)]
    out += [torus_knot(2, 5), torus_knot(3, 4)]
    return out


def test_invariants_same_on_both_sides_of_the_switch(monkeypatch):
    """rho_1 with Delta, the determinant and the double-cover homology are the same computed in
    pure Python (every size below the switch) and with FLINT and numpy (switch at 0)."""
    diagrams = _diagrams()

    def values():
        return [(perturbed_alexander.perturbed_alexander(d), determinant_module.determinant(d),
                 double_cover.double_cover_homology(d)) for d in diagrams]

    with monkeypatch.context() as m:
        m.setattr(small_matrices, "SMALL", 100)
        m.setattr(perturbed_alexander, "SMALL_RHO", 100)
        pure = values()
    with monkeypatch.context() as m:
        m.setattr(small_matrices, "SMALL", -1)
        m.setattr(perturbed_alexander, "SMALL_RHO", -1)
        compiled = values()
    assert pure == compiled
    assert len(diagrams) > 40
