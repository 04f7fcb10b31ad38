"""Tests of knotsift.invariants.alexander."""

from __future__ import annotations

import random

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from knotsift import Diagram, InvariantError, Laurent
from knotsift.invariants.alexander import alexander_matrix, alexander_polynomial
from knotsift.invariants.determinant import determinant
from knotsift.reidemeister import scramble, shuffle_labels
from tests.knots import FIGURE_EIGHT, HOPF, PRIME_KNOTS_TO_7, TREFOIL, reversed_diagram
from tests.strategies import (
    braid_closure,
    close_to_knot,
    knot_braid_words,
    knot_diagrams,
    rational_knot,
    torus_knot,
)

FAST = settings(max_examples=60, deadline=None)


def laurent(coeffs):
    """A symmetric Laurent polynomial from its coefficients t^-k .. t^k."""
    return Laurent.from_coefficients(-(len(coeffs) // 2), list(coeffs))


def test_alexander_polynomial_trefoil_and_figure_eight():
    """The trefoil gives t^-1 - 1 + t and the figure-eight -t^-1 + 3 - t (common practice)."""
    assert str(alexander_polynomial(TREFOIL)) == "t^-1 - 1 + t"
    assert str(alexander_polynomial(FIGURE_EIGHT)) == "-t^-1 + 3 - t"


# Rolfsen 1976, "Knots and Links", Appendix C (from memory), on the alternating
# 4-plats of Conway's notation (Conway 1970, from memory).
@pytest.mark.parametrize("name", sorted(PRIME_KNOTS_TO_7))
def test_alexander_polynomial_prime_knots_through_7_crossings(name):
    """Every prime knot through 7 crossings has its tabulated polynomial."""
    conway, coeffs, _ = PRIME_KNOTS_TO_7[name]
    diagram = rational_knot(conway)
    assert diagram.number_of_crossings() == int(name.split("_")[0])
    assert alexander_polynomial(diagram) == laurent(coeffs)
    assert alexander_polynomial(diagram.mirror()) == laurent(coeffs)


@pytest.mark.parametrize("p, q", [(2, 3), (2, 5), (2, 9), (3, 4), (3, 5), (3, 7), (4, 5), (5, 6)])
def test_alexander_polynomial_torus_knots(p, q):
    """T(p, q) has t^(-(p-1)(q-1)/2) (t^pq - 1)(t - 1) / ((t^p - 1)(t^q - 1)).

    Source: the torus knot formula, common practice (Seifert 1934, "Über das
    Geschlecht von Knoten", Math. Ann. 110).  sympy divides the polynomials.
    """
    import sympy

    t = sympy.Symbol("t")
    quotient, remainder = sympy.div(sympy.expand((t ** (p * q) - 1) * (t - 1)),
                                    sympy.expand((t ** p - 1) * (t ** q - 1)), t)
    assert remainder == 0
    coeffs = [int(c) for c in sympy.Poly(quotient, t).all_coeffs()[::-1]]
    expected = Laurent.from_coefficients(-((p - 1) * (q - 1) // 2), coeffs)
    assert alexander_polynomial(torus_knot(p, q)) == expected


def test_alexander_polynomial_unknot_diagrams():
    """The crossing-free circle and a one-crossing kink both give 1 (common practice)."""
    assert alexander_polynomial(Diagram.unknot()) == Laurent.constant(1)
    kink = Diagram([(1, 1, 2, 2)])
    assert kink.number_of_components() == 1
    assert alexander_polynomial(kink) == Laurent.constant(1)
    assert alexander_polynomial(braid_closure([1, -2, 3], 4)) == Laurent.constant(1)


def test_alexander_polynomial_rejects_links():
    """A link raises InvariantError naming the number of components."""
    with pytest.raises(InvariantError, match="2 components"):
        alexander_polynomial(HOPF)
    with pytest.raises(InvariantError):
        alexander_polynomial(Diagram(TREFOIL.crossings, free_loops=1))
    with pytest.raises(InvariantError):
        alexander_matrix(HOPF)


def test_alexander_polynomial_rejects_unknown_method():
    """Only the documented methods are accepted."""
    with pytest.raises(ValueError, match="method"):
        alexander_polynomial(TREFOIL, method="symbolic")


def test_alexander_matrix_trefoil():
    """The trefoil's matrix has the Fox rows (1 - t, t, -1) of positive crossings."""
    matrix = alexander_matrix(TREFOIL)
    assert len(matrix) == 3 and all(len(row) == 3 for row in matrix)
    for row in matrix:
        assert sorted(str(e) for e in row) == ["-1", "1 - t", "t"]


def _sympy_minor_determinant(diagram, row, col):
    import sympy

    t = sympy.Symbol("t")
    matrix = alexander_matrix(diagram)
    m = sympy.Matrix([[sum(c * t ** int(e) for e, c in entry.terms()) for entry in r]
                      for r in matrix])
    m.row_del(row)
    m.col_del(col)
    return t, sympy.expand(m.det(method="berkowitz"))


@FAST
@given(knot_braid_words(max_strands=4, max_length=7), st.randoms(use_true_random=False))
def test_alexander_polynomial_matches_sympy_determinant(word_strands, rng):
    """Any minor of the matrix, expanded by sympy, is ±t^m times our polynomial (sympy oracle)."""
    import sympy

    diagram = braid_closure(*word_strands)
    n = diagram.number_of_crossings()
    ours = alexander_polynomial(diagram)
    if n <= 1:
        assert ours == Laurent.constant(1)
        return
    t, det = _sympy_minor_determinant(diagram, rng.randrange(n), rng.randrange(n))
    ours_sym = sum(c * t ** int(e) for e, c in ours.terms())
    ratio = sympy.cancel(det / ours_sym)
    numerator, denominator = sympy.fraction(ratio)
    assert sympy.Poly(numerator, t).is_monomial and sympy.Poly(denominator, t).is_monomial
    assert abs(sympy.Poly(numerator, t).LC()) == 1 and abs(sympy.Poly(denominator, t).LC()) == 1


@settings(max_examples=25, deadline=None)
@given(knot_diagrams(min_strands=3, max_strands=6, max_length=30))
def test_alexander_polynomial_methods_agree(diagram):
    """Elimination modulo primes, Kronecker substitution and fraction-free elimination agree."""
    expected = alexander_polynomial(diagram, method="bareiss")
    assert alexander_polynomial(diagram, method="modular") == expected
    assert alexander_polynomial(diagram, method="kronecker") == expected


@FAST
@given(knot_diagrams(max_length=16))
def test_alexander_polynomial_symmetric_with_value_one(diagram):
    """Delta(1/t) = Delta(t) and Delta(1) = 1 (common practice)."""
    delta = alexander_polynomial(diagram)
    assert delta.is_symmetric()
    assert delta.evaluate(1) == 1


@FAST
@given(knot_diagrams(max_length=10), knot_diagrams(max_length=10))
def test_alexander_polynomial_multiplicative_under_connected_sum(a, b):
    """Delta(K1 # K2) = Delta(K1) Delta(K2) (common practice)."""
    product = alexander_polynomial(a) * alexander_polynomial(b)
    assert alexander_polynomial(a.connected_sum(b)) == product


@FAST
@given(knot_diagrams(max_length=14))
def test_alexander_polynomial_mirror_and_reverse(diagram):
    """The mirror image and the reverse have the same polynomial (common practice)."""
    delta = alexander_polynomial(diagram)
    assert alexander_polynomial(diagram.mirror()) == delta
    assert alexander_polynomial(reversed_diagram(diagram)) == delta


@FAST
@given(knot_braid_words(max_strands=4, max_length=12), st.sampled_from((1, -1)),
       st.integers(0, 20))
def test_alexander_polynomial_markov_invariance(word_strands, sign, shift):
    """Conjugating the braid and a Markov stabilisation keep the knot (Markov 1936)."""
    word, strands = word_strands
    delta = alexander_polynomial(braid_closure(word, strands))
    k = shift % max(len(word), 1)
    assert alexander_polynomial(braid_closure(word[k:] + word[:k], strands)) == delta
    assert alexander_polynomial(braid_closure(word + [sign * strands], strands + 1)) == delta


def test_alexander_polynomial_relabelling_invariance():
    """Renaming edges and reordering crossings leave the polynomial unchanged."""
    rng = random.Random(20240611)
    for name in ("5_2", "6_3", "7_6"):
        diagram = rational_knot(PRIME_KNOTS_TO_7[name][0])
        expected = alexander_polynomial(diagram)
        for _ in range(5):
            assert alexander_polynomial(shuffle_labels(diagram, rng)) == expected


@FAST
@given(knot_diagrams(max_length=16))
def test_alexander_polynomial_at_minus_one_is_determinant(diagram):
    """|Delta(-1)| is the determinant (common practice)."""
    assert abs(alexander_polynomial(diagram).evaluate(-1)) == determinant(diagram)


def test_alexander_polynomial_large_connected_sum():
    """A 200-crossing sum of random knots has the product of their polynomials."""
    rng = random.Random(7)
    total = Diagram.unknot()
    product = Laurent.constant(1)
    while total.number_of_crossings() < 200:
        strands = rng.randint(2, 4)
        word = [rng.choice((1, -1)) * rng.randint(1, strands - 1) for _ in range(rng.randint(3, 9))]
        piece = braid_closure(close_to_knot(word, strands, (1, -1)), strands)
        if piece.number_of_crossings() < 2:
            continue
        product = product * alexander_polynomial(piece, method="bareiss")
        total = total.connected_sum(piece)
    assert alexander_polynomial(total) == product


def test_alexander_polynomial_large_braid_closure():
    """A random 201-crossing braid closure gives a symmetric polynomial with Delta(1) = 1,
    unchanged by conjugating the braid."""
    rng = random.Random(11)
    word = close_to_knot([rng.choice((1, -1)) * rng.randint(1, 6) for _ in range(196)], 7, (1, -1))
    delta = alexander_polynomial(braid_closure(word, 7))
    assert delta.is_symmetric() and delta.evaluate(1) == 1
    assert alexander_polynomial(braid_closure(word[50:] + word[:50], 7)) == delta


@FAST
@given(knot_diagrams(max_length=10), st.randoms(use_true_random=False))
def test_alexander_polynomial_reidemeister_invariance(diagram, rng):
    """Random Reidemeister I and II moves keep the polynomial (Reidemeister 1927)."""
    assert alexander_polynomial(scramble(diagram, 6, rng)) == alexander_polynomial(diagram)
