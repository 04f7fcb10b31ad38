"""Milnor's triple linking number."""

from __future__ import annotations

import random

import pytest

from knotsift.errors import InvariantError
from knotsift.invariants.linking import linking_matrix, reverse_components
from knotsift.invariants.milnor import longitude_coefficients, triple_linking_number
from knotsift.notations.braid import parse_braid
from knotsift.notations.conway_algebraic import parse_conway_notation
from knotsift.reidemeister import scramble

BORROMEAN = parse_braid("1 -2 1 -2 1 -2")


def test_borromean_rings_triple_linking_number():
    """Milnor (1954): the Borromean rings have mu(123) = +-1, every pairwise linking number 0."""
    assert linking_matrix(BORROMEAN) == [[0] * 3] * 3
    assert abs(triple_linking_number(BORROMEAN)) == 1
    assert abs(triple_linking_number(parse_conway_notation(".1"))) == 1


def test_unlink_triple_linking_number_is_zero():
    """Three separate rings, and three rings drawn with crossings, have mu(123) = 0."""
    assert triple_linking_number(parse_braid("1 -1 2 -2")) == 0


def test_triple_linking_number_sign_rules():
    """Reversing one component negates mu(123) (the meridian or longitude is inverted)."""
    mu = triple_linking_number(BORROMEAN)
    for k in range(3):
        assert triple_linking_number(reverse_components(BORROMEAN, [k])) == -mu


def test_triple_linking_number_under_scrambling():
    """|mu(123)| survives Reidemeister moves and relabelling (its sign follows the labels)."""
    rng = random.Random(2)
    for _ in range(6):
        assert abs(triple_linking_number(scramble(BORROMEAN, 10, rng))) == 1


def test_longitude_degree_one_terms_are_linking_numbers():
    """The X_i coefficient of longitude k is the linking number of components i and k."""
    d = parse_braid("1 1 2 2 2 2")
    lk = linking_matrix(d)
    for k, series in enumerate(longitude_coefficients(d)):
        for i in range(3):
            if i != k:
                assert series.get((i,), 0) == lk[i][k]


@pytest.mark.parametrize("word,message", [("1 1", "needs 3 components, got 2"),
                                          ("1 1 2 2", "only when every pairwise linking")])
def test_triple_linking_number_refusals(word, message):
    with pytest.raises(InvariantError, match=message):
        triple_linking_number(parse_braid(word))
