"""Tests of knotsift.invariants.determinant."""

from __future__ import annotations

import random

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from knotsift import Diagram, InvariantError
from knotsift.invariants.determinant import determinant
from knotsift.invariants.elimination import integer_determinant
from knotsift.invariants.goeritz import goeritz_forms
from knotsift.invariants.jones import jones_polynomial
from knotsift.reidemeister import scramble, shuffle_labels
from tests.knots import FIGURE_EIGHT, HOPF, PRIME_KNOTS_TO_7, TREFOIL
from tests.strategies import (
    braid_closure,
    continued_fraction,
    knot_diagrams,
    link_diagrams,
    plat_diagrams,
    rational_knot,
    torus_knot,
)

FAST = settings(max_examples=60, deadline=None)


def jones_at_minus_one_squared(diagram) -> int:
    """|V(-1)|^2 computed exactly, with t^(1/2) = i."""
    re = im = 0
    for e, c in jones_polynomial(diagram).terms():
        k = int(2 * e) % 4  # i^k
        if k == 0:
            re += c
        elif k == 1:
            im += c
        elif k == 2:
            re -= c
        else:
            im -= c
    return re * re + im * im


def test_determinant_small_knots_and_links():
    """Trefoil 3, figure-eight 5, Hopf link 2 (common practice)."""
    assert determinant(TREFOIL) == 3
    assert determinant(FIGURE_EIGHT) == 5
    assert determinant(HOPF) == 2


# Schubert 1956, "Knoten mit zwei Brücken", Math. Z. 65: the 2-bridge knot with
# fraction p/q has determinant p; Rolfsen 1976 Appendix C values (from memory)
# agree with |Delta(-1)| of the table.
@pytest.mark.parametrize("name", sorted(PRIME_KNOTS_TO_7))
def test_determinant_prime_knots_through_7_crossings(name):
    """The determinant of each prime knot through 7 crossings is |Delta(-1)| of the table."""
    conway, coeffs, _ = PRIME_KNOTS_TO_7[name]
    half = len(coeffs) // 2
    expected = abs(sum(c * (-1) ** (k - half) for k, c in enumerate(coeffs)))
    assert expected == continued_fraction(conway).numerator
    assert determinant(rational_knot(conway)) == expected


@pytest.mark.parametrize("n", range(1, 10))
def test_determinant_two_strand_torus_links(n):
    """The closure of sigma_1^n has determinant n (common practice)."""
    assert determinant(braid_closure([1] * n, 2)) == n


@pytest.mark.parametrize("p, q, det", [(3, 4, 3), (3, 5, 1), (2, 7, 7), (4, 5, 5)])
def test_determinant_torus_knots(p, q, det):
    """det T(p, q) is 1 for p, q odd and q for p even, q odd (common practice, from memory)."""
    assert determinant(torus_knot(p, q)) == det


def test_determinant_split_and_trivial():
    """Split links have determinant 0, the unknot 1, the empty diagram is refused."""
    assert determinant(Diagram.unknot()) == 1
    assert determinant(Diagram([], free_loops=2)) == 0
    assert determinant(Diagram(TREFOIL.crossings, free_loops=1)) == 0
    assert determinant(TREFOIL.disjoint_union(FIGURE_EIGHT)) == 0
    assert determinant(braid_closure([1, 1, 3, 3], 4)) == 0
    with pytest.raises(InvariantError):
        determinant(Diagram([]))


@FAST
@given(link_diagrams(max_length=12))
def test_determinant_is_jones_at_minus_one(diagram):
    """|V(-1)| is the determinant for knots and links (common practice)."""
    assert jones_at_minus_one_squared(diagram) == determinant(diagram) ** 2


@FAST
@given(plat_diagrams(max_length=12))
def test_determinant_is_jones_at_minus_one_on_plats(diagram):
    """|V(-1)| is the determinant on plat closures too (common practice)."""
    assert jones_at_minus_one_squared(diagram) == determinant(diagram) ** 2


@FAST
@given(link_diagrams(max_length=14))
def test_determinant_same_for_both_colourings(diagram):
    """Both checkerboard surfaces give Goeritz matrices with the same |det| (Goeritz 1933)."""
    values = []
    for shaded in (0, 1):
        dets = [abs(integer_determinant([{c: v for c, v in enumerate(r) if v} for r in f.matrix],
                                        len(f.matrix)))
                for f in goeritz_forms(diagram, shaded)]
        values.append(dets)
    assert values[0] == values[1]


@FAST
@given(knot_diagrams(max_length=14))
def test_determinant_of_knot_is_odd(diagram):
    """A knot has odd determinant (common practice: Delta(-1) = Delta(1) mod 2)."""
    assert determinant(diagram) % 2 == 1


@FAST
@given(knot_diagrams(max_length=10), link_diagrams(max_length=10))
def test_determinant_multiplicative_under_connected_sum(a, b):
    """det(K # L) = det(K) det(L) (common practice)."""
    if b.number_of_crossings() == 0 or len(b.components()) != b.number_of_components():
        b = FIGURE_EIGHT
    assert determinant(a.connected_sum(b)) == determinant(a) * determinant(b)


def test_determinant_relabelling_invariance():
    """Renaming edges and reordering crossings keep the determinant."""
    rng = random.Random(5)
    diagram = rational_knot(PRIME_KNOTS_TO_7["7_7"][0]).connected_sum(HOPF)
    for _ in range(5):
        assert determinant(shuffle_labels(diagram, rng)) == 21 * 2


@FAST
@given(link_diagrams(max_length=10), st.randoms(use_true_random=False))
def test_determinant_reidemeister_invariance(diagram, rng):
    """Random Reidemeister I and II moves keep the determinant (Reidemeister 1927)."""
    if diagram.number_of_crossings() == 0:
        return
    assert determinant(scramble(diagram, 6, rng)) == determinant(diagram)
