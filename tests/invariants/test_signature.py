"""Tests of knotsift.invariants.signature (and the Goeritz forms behind it)."""

from __future__ import annotations

import random
from fractions import Fraction

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from knotsift import Diagram, InvariantError
from knotsift.invariants.alexander import alexander_polynomial
from knotsift.invariants.goeritz import goeritz_forms
from knotsift.invariants.signature import (
    _inertia_certified,
    _inertia_exact,
    inertia,
    knot_signature,
)
from knotsift.reidemeister import scramble, shuffle_labels
from tests.knots import FIGURE_EIGHT, HOPF, PRIME_KNOTS_TO_7, TREFOIL, reversed_diagram
from tests.strategies import (
    braid_closure,
    knot_braid_words,
    knot_diagrams,
    link_diagrams,
    plat_diagrams,
    rational_knot,
    torus_knot,
)

FAST = settings(max_examples=60, deadline=None)
MANY = settings(max_examples=300, deadline=None)


def signature_with(diagram, shaded):
    """sign(G) - mu summed over the pieces, with the given colour shaded."""
    total = 0
    for form in goeritz_forms(diagram, shaded):
        pos, neg, _ = inertia(form.matrix)
        total += pos - neg - form.correction
    return total


def test_knot_signature_convention():
    """Right-handed trefoil -2, figure-eight 0, positive Hopf link -1: the convention in
    which positive knots have negative signature (common practice, see CONVENTIONS.md)."""
    assert TREFOIL.signs() == (1, 1, 1)
    assert knot_signature(TREFOIL) == -2
    assert knot_signature(TREFOIL.mirror()) == 2
    assert knot_signature(FIGURE_EIGHT) == 0
    assert HOPF.signs() == (1, 1)
    assert knot_signature(HOPF) == -1


def test_knot_signature_positive_cinquefoil():
    """The positive 5_1 = closure of sigma_1^5 has signature -4 (common practice)."""
    diagram = braid_closure([1] * 5, 2)
    assert all(s > 0 for s in diagram.signs())
    assert knot_signature(diagram) == -4


@pytest.mark.parametrize("n", range(1, 11))
def test_knot_signature_two_strand_torus_links(n):
    """The closure of sigma_1^n (parallel strands) has signature -(n - 1): its Seifert
    surface of two discs and n bands has the negative definite form -(2, -1) tridiagonal
    (common practice)."""
    assert knot_signature(braid_closure([1] * n, 2)) == -(n - 1)


def torus_signature(p, q):
    """Brieskorn's count for the positive torus knot T(p, q): the sum over 0 < i < p,
    0 < j < q of -1 if 1/2 < i/p + j/q < 3/2 and +1 otherwise.

    Brieskorn 1966, "Beispiele zur Differentialtopologie von Singularitäten",
    Invent. Math. 2 (from memory); it gives -2 for T(2, 3) and -6 for T(3, 4).
    """
    total = 0
    for i in range(1, p):
        for j in range(1, q):
            x = Fraction(i, p) + Fraction(j, q)
            total += -1 if Fraction(1, 2) < x < Fraction(3, 2) else 1
    return total


@pytest.mark.parametrize("p, q", [(2, 3), (2, 7), (3, 4), (3, 5), (3, 7), (3, 8), (4, 5), (4, 7),
                                  (5, 6)])
def test_knot_signature_torus_knots(p, q):
    """Positive torus knots (non-alternating for p >= 3) match Brieskorn's count."""
    assert torus_signature(2, 3) == -2 and torus_signature(3, 4) == -6
    assert knot_signature(torus_knot(p, q)) == torus_signature(p, q)


def test_knot_signature_large_torus_knot():
    """T(3, 151), 302 crossings, matches Brieskorn's count; its Goeritz matrix has more
    than 120 rows, so the certified floating-point inertia is used."""
    diagram = torus_knot(3, 151)
    assert len(goeritz_forms(diagram)[0].matrix) > 120
    assert knot_signature(diagram) == torus_signature(3, 151)


# |signature| of the prime knots through 7 crossings: published tables (from memory),
# see tests/knots.py; our 4-plat diagrams may be either mirror image.
@pytest.mark.parametrize("name", sorted(PRIME_KNOTS_TO_7))
def test_knot_signature_prime_knots_through_7_crossings(name):
    """Each prime knot through 7 crossings has its tabulated |signature|, negated by the mirror."""
    conway, _, expected = PRIME_KNOTS_TO_7[name]
    diagram = rational_knot(conway)
    sigma = knot_signature(diagram)
    assert abs(sigma) == expected
    assert knot_signature(diagram.mirror()) == -sigma


def test_knot_signature_trivial_diagrams():
    """Unknots and unlinks have signature 0; the empty diagram is refused."""
    assert knot_signature(Diagram.unknot()) == 0
    assert knot_signature(Diagram([], free_loops=3)) == 0
    assert knot_signature(Diagram([(1, 1, 2, 2)])) == 0
    assert knot_signature(Diagram([(1, 2, 2, 1)])) == 0
    with pytest.raises(InvariantError):
        knot_signature(Diagram([]))


@MANY
@given(st.one_of(link_diagrams(max_length=16), plat_diagrams(max_length=16)))
def test_knot_signature_same_for_both_colourings(diagram):
    """Shading either colour class gives the same sign(G) - mu (Gordon and Litherland 1978,
    Invent. Math. 47, Corollary: the signature does not depend on the spanning surface)."""
    assert signature_with(diagram, 0) == signature_with(diagram, 1)


@FAST
@given(knot_diagrams(max_length=16))
def test_knot_signature_even_for_knots(diagram):
    """A knot has even signature (Murasugi 1965, Trans. AMS 117)."""
    assert knot_signature(diagram) % 2 == 0


@FAST
@given(knot_diagrams(max_length=16))
def test_knot_signature_bounded_by_alexander_span(diagram):
    """|sigma| <= span Delta: the Levine-Tristram signature function is 0 near 1 and jumps
    by at most 2 per root of Delta on the upper unit semicircle (Tristram 1969, "Some
    cobordism invariants for links", Proc. Cambridge Philos. Soc. 66; Levine 1969)."""
    assert abs(knot_signature(diagram)) <= alexander_polynomial(diagram).span()


@FAST
@given(knot_diagrams(max_length=16))
def test_knot_signature_mod_4_from_alexander(diagram):
    """sign Delta(-1) = (-1)^(sigma/2) for the Conway-normalised Delta: with
    Delta(t) = det(t^(1/2) S - t^(-1/2) S^T), Delta(-1) = (-1)^g det(S + S^T)
    (Murasugi 1965, Trans. AMS 117; Levine 1966)."""
    sigma = knot_signature(diagram)
    value = alexander_polynomial(diagram).evaluate(-1)
    assert (value > 0) == (sigma % 4 == 0)


@FAST
@given(link_diagrams(max_length=14))
def test_knot_signature_mirror_negates(diagram):
    """The mirror image has the opposite signature (common practice)."""
    assert knot_signature(diagram.mirror()) == -knot_signature(diagram)


@FAST
@given(link_diagrams(max_length=14))
def test_knot_signature_reverse_keeps(diagram):
    """Reversing every component keeps the signature (common practice: S -> S^T)."""
    if diagram.assumed_orientation():
        return  # a component without under-passage would not be reversed by the PD code
    assert knot_signature(reversed_diagram(diagram)) == knot_signature(diagram)


@FAST
@given(knot_diagrams(max_length=10), link_diagrams(max_length=10))
def test_knot_signature_additive(a, b):
    """Signature adds under connected sum and split union (common practice)."""
    if b.number_of_crossings() == 0 or len(b.components()) != b.number_of_components():
        b = HOPF
    expected = knot_signature(a) + knot_signature(b)
    assert knot_signature(a.connected_sum(b)) == expected
    assert knot_signature(a.disjoint_union(b)) == expected


@FAST
@given(knot_braid_words(max_strands=4, max_length=12), st.sampled_from((1, -1)),
       st.integers(0, 20))
def test_knot_signature_markov_invariance(word_strands, sign, shift):
    """Conjugation and stabilisation of the braid keep the signature (Markov 1936)."""
    word, strands = word_strands
    sigma = knot_signature(braid_closure(word, strands))
    k = shift % max(len(word), 1)
    assert knot_signature(braid_closure(word[k:] + word[:k], strands)) == sigma
    assert knot_signature(braid_closure(word + [sign * strands], strands + 1)) == sigma


def test_knot_signature_relabelling_invariance():
    """Renaming edges and reordering crossings keep the signature."""
    rng = random.Random(99)
    diagram = torus_knot(3, 4).connected_sum(rational_knot((3, 2)))
    expected = knot_signature(diagram)
    assert expected == -6 + knot_signature(rational_knot((3, 2)))
    for _ in range(5):
        assert knot_signature(shuffle_labels(diagram, rng)) == expected


def test_knot_signature_large_diagram():
    """A 200-crossing connected sum adds the signatures of its summands."""
    rng = random.Random(3)
    total = Diagram.unknot()
    expected = 0
    while total.number_of_crossings() < 200:
        terms = rng.choice([c for c, _, _ in PRIME_KNOTS_TO_7.values()])
        piece = rational_knot(terms)
        if rng.random() < 0.5:
            piece = piece.mirror()
        expected += knot_signature(piece)
        total = total.connected_sum(piece)
    assert knot_signature(total) == expected


# -- the inertia of symmetric integer matrices --------------------------------------
def descartes_inertia(matrix):
    """(positive, negative, zero) eigenvalue counts from sympy's characteristic polynomial:
    its roots are real, so Descartes' rule of signs counts them exactly (sympy oracle)."""
    import sympy

    x = sympy.Symbol("x")
    coeffs = [int(c) for c in sympy.Matrix(matrix).charpoly(x).all_coeffs()][::-1]
    zero = next(k for k, c in enumerate(coeffs) if c)
    rest = [c for c in coeffs[zero:] if c]
    positive = sum(1 for a, b in zip(rest[:-1], rest[1:], strict=True) if (a > 0) != (b > 0))
    return positive, len(matrix) - zero - positive, zero


@st.composite
def symmetric_matrices(draw, max_size=7):
    n = draw(st.integers(1, max_size))
    entries = st.integers(-3, 3)
    m = [[0] * n for _ in range(n)]
    for i in range(n):
        for j in range(i, n):
            m[i][j] = m[j][i] = draw(entries)
    low_rank = draw(st.booleans())
    if low_rank and n > 1:  # repeat a row and column to force a zero eigenvalue
        m[-1] = list(m[0])
        for i in range(n):
            m[i][-1] = m[i][0]
    return m


@FAST
@given(symmetric_matrices())
def test_inertia_matches_sympy(matrix):
    """Exact elimination agrees with the characteristic polynomial (sympy oracle)."""
    assert _inertia_exact(matrix) == descartes_inertia(matrix)
    assert inertia(matrix) == descartes_inertia(matrix)


@FAST
@given(symmetric_matrices(max_size=10))
def test_inertia_certificate_agrees_with_exact(matrix):
    """When the floating-point certificate succeeds it gives the exact inertia."""
    certified = _inertia_certified(matrix)
    if certified is not None:
        assert certified == _inertia_exact(matrix)


def test_inertia_certificate_on_goeritz_matrix():
    """On a large Goeritz matrix the certificate succeeds and matches exact elimination."""
    form = goeritz_forms(torus_knot(3, 40))[0]
    assert len(form.matrix) > 20
    certified = _inertia_certified(form.matrix)
    assert certified is not None
    assert certified == _inertia_exact(form.matrix)


def test_inertia_rejects_bad_matrices():
    """Non-square and non-symmetric input is refused with the place of the fault."""
    with pytest.raises(ValueError, match="square"):
        inertia([[1, 2]])
    with pytest.raises(ValueError, match="symmetric"):
        inertia([[1, 2], [3, 4]])


@FAST
@given(st.one_of(knot_diagrams(max_length=10), link_diagrams(max_length=10)),
       st.randoms(use_true_random=False))
def test_knot_signature_reidemeister_invariance(diagram, rng):
    """Random Reidemeister I and II moves keep the signature (Reidemeister 1927)."""
    if diagram.number_of_crossings() == 0:
        return
    assert knot_signature(scramble(diagram, 6, rng)) == knot_signature(diagram)
