"""Tests of knotsift.invariants.double_cover (homology of the double branched cover)."""

from __future__ import annotations

import math

import pytest
from knotsift import Diagram
from knotsift.invariants.determinant import determinant
from knotsift.invariants.double_cover import (
    double_cover_homology,
    homology_sum,
    homology_text,
    parse_homology,
)
from knotsift.invariants.goeritz import goeritz_forms

from tests.knots import FIGURE_EIGHT, HOPF, PRIME_KNOTS_TO_7, TREFOIL
from tests.strategies import braid_closure, continued_fraction, rational_knot


def test_double_cover_homology_order_is_determinant_for_every_table_knot():
    """For every knot of the shipped table the group has order |Delta(-1)| (common practice)."""
    from knotsift.table import open_table

    table = open_table()
    checked = 0
    for form in table.all_forms():
        if form.components != 1 or not form.is_reference:
            continue
        h = double_cover_homology(Diagram.from_pd(form.pd()))
        assert math.prod(h) == form.determinant, form.label
        assert homology_text(h) == form.homology, form.label
        checked += 1
    assert checked > 250


@pytest.mark.parametrize("name", sorted(PRIME_KNOTS_TO_7))
def test_double_cover_homology_two_bridge_knots_cyclic(name):
    """The double cover of the 2-bridge knot p/q is the lens space L(p, q): H_1 = Z/p.

    Schubert 1956, "Knoten mit zwei Brücken", Math. Z. 65 (from memory); p is
    the numerator of the continued fraction of the Conway notation.
    """
    conway = PRIME_KNOTS_TO_7[name][0]
    p = continued_fraction(conway).numerator
    assert double_cover_homology(rational_knot(conway)) == (p,)


@pytest.mark.parametrize("words, expected", [
    (([1, 1, 1], [1, 1, 1]), (3, 3)),          # granny knot
    (([1, 1, 1], [-1, -1, -1]), (3, 3)),       # square knot
    (([1, 1, 1], [1, -2, 1, -2]), (15,)),      # Z/3 + Z/5 = Z/15
    (([1] * 5, [1] * 5), (5, 5)),
])
def test_double_cover_homology_connected_sums_not_cyclic(words, expected):
    """The cover of K1 # K2 is the connected sum of the covers: H_1 is the direct sum.

    A construction (common practice): Z/3 + Z/3 is not cyclic, Z/3 + Z/5 is.
    """
    a, b = (braid_closure(w) for w in words)
    assert double_cover_homology(a.connected_sum(b)) == expected
    assert homology_sum(double_cover_homology(a), double_cover_homology(b)) == expected


def test_double_cover_homology_matches_sympy_smith_form():
    """FLINT's Smith form of the Goeritz matrix agrees with sympy's on braid closures."""
    from sympy import ZZ, Matrix
    from sympy.matrices.normalforms import smith_normal_form

    for word in ([1, 1, 1, 2, -1, 2], [1, 2] * 4, [1, -2, 1, -2, 1, -2], [1, 1, 2, 2, 1, 1, 2, 2]):
        d = braid_closure(word)
        (form,) = goeritz_forms(d)
        snf = smith_normal_form(Matrix(form.matrix), domain=ZZ)
        diag = sorted(abs(int(snf[k, k])) for k in range(min(snf.shape)))
        expected = tuple(f for f in diag if f != 1)
        assert tuple(sorted(double_cover_homology(d))) == tuple(sorted(expected))


def test_double_cover_homology_links_and_unknot():
    """Hopf link: Z/2 (RP^3); split unknots: Z; the unknot: trivial (common practice)."""
    assert double_cover_homology(HOPF) == (2,)
    assert double_cover_homology(Diagram.unknot()) == ()
    assert double_cover_homology(Diagram([], free_loops=2)) == (0,)
    assert double_cover_homology(TREFOIL.disjoint_union(FIGURE_EIGHT)) == (15, 0)
    assert determinant(HOPF) == 2


def test_homology_text_round_trip():
    """The canonical text reads back; malformed text is refused."""
    for h in [(), (3,), (3, 3), (5, 15), (15, 0)]:
        assert parse_homology(homology_text(h)) == h
    with pytest.raises(ValueError, match="Z/1"):
        parse_homology("Z/1")
