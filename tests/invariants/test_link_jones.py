"""Jones polynomials of links against closed formulas and recalled values."""

from __future__ import annotations

from fractions import Fraction

import pytest

from knotsift.invariants.jones import jones_polynomial
from knotsift.invariants.linking import linking_matrix, reverse_components
from knotsift.laurent import Laurent
from knotsift.notations.braid import parse_braid
from knotsift.notations.conway_algebraic import parse_conway_notation


def _t(k) -> Laurent:
    return Laurent.monomial(1, Fraction(k))


def torus_2n_jones_times_1_minus_t2(n: int) -> Laurent:
    """(1 - t^2) V(T(2,n)) for the closure of sigma_1^n, all strands upwards.

    Jones 1987, Annals of Mathematics, "Hecke algebra representations of braid
    groups and link polynomials" (from memory): V = t^((n-1)/2) (1 - t^3 - t^(n+1)
    + t^(n+2)) / (1 - t^2) for odd n; for even n (two components, parallel) the
    same recursion gives -t^((n-1)/2) (1 - t^3 + t^(n+1) - t^(n+2)) / (1 - t^2).
    """
    one = Laurent.constant(1)
    if n % 2:
        body = one - _t(3) - _t(n + 1) + _t(n + 2)
        return _t(Fraction(n - 1, 2)) * body
    body = one - _t(3) + _t(n + 1) - _t(n + 2)
    return Laurent.constant(-1) * _t(Fraction(n - 1, 2)) * body


@pytest.mark.parametrize("n", range(1, 7))
def test_jones_of_torus_links_parallel(n):
    """T(2,2n) as a braid closure: Jones against the closed formula, linking number n."""
    d = parse_braid([1] * (2 * n))
    v = jones_polynomial(d)
    assert (Laurent.constant(1) - _t(2)) * v == torus_2n_jones_times_1_minus_t2(2 * n)
    assert linking_matrix(d)[0][1] == n


@pytest.mark.parametrize("n", range(1, 7))
def test_jones_of_torus_links_antiparallel(n):
    """One component reversed: V is multiplied by t^(-3 lk) (Lickorish and Millett 1986, "A
    polynomial invariant of oriented links", Topology; from memory), and lk becomes -n."""
    d = reverse_components(parse_braid([1] * (2 * n)), [1])
    v = jones_polynomial(d)
    assert (Laurent.constant(1) - _t(2)) * v == _t(-3 * n) * torus_2n_jones_times_1_minus_t2(2 * n)
    assert linking_matrix(d)[0][1] == -n


@pytest.mark.parametrize("n", [3, 5, 7])
def test_jones_torus_formula_on_knots(n):
    """The same closed formula for the torus knots T(2,n), n odd (Jones 1987, from memory)."""
    v = jones_polynomial(parse_braid([1] * n))
    assert (Laurent.constant(1) - _t(2)) * v == torus_2n_jones_times_1_minus_t2(n)


def test_jones_hopf_positive():
    """Positive Hopf link: V = -t^(1/2) - t^(5/2) (common practice)."""
    assert jones_polynomial(parse_braid("1 1")) == Laurent.parse("-t^(1/2) - t^(5/2)")


def test_jones_whitehead_link():
    """Whitehead link: V = t^(-3/2) (-1 + t - 2t^2 + t^3 - 2t^4 + t^5) up to mirror (from
    memory); V(1) = -2 and |V(-1)| = 8, its determinant."""
    want = Laurent.parse("-t^(-3/2) + t^(-1/2) - 2t^(1/2) + t^(3/2) - 2t^(5/2) + t^(7/2)")
    v = jones_polynomial(parse_conway_notation("212"))
    assert v in (want, want.mirror())


def test_jones_borromean_rings():
    """Borromean rings: V = -t^3 + 3t^2 - 2t + 4 - 2t^-1 + 3t^-2 - t^-3 (from memory)."""
    want = Laurent.parse("-t^3 + 3t^2 - 2t + 4 - 2t^-1 + 3t^-2 - t^-3")
    assert jones_polynomial(parse_braid("1 -2 1 -2 1 -2")) == want
    assert jones_polynomial(parse_conway_notation(".1")) == want
