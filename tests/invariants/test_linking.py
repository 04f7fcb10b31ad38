"""Linking matrix, sublinks and component reversal."""

from __future__ import annotations

import random

import pytest

from knotsift.errors import InvariantError
from knotsift.invariants.jones import jones_polynomial
from knotsift.invariants.linking import (
    component_knots,
    linking_matrix,
    reverse_components,
    split_parts,
    sublink,
)
from knotsift.laurent import Laurent
from knotsift.notations.braid import parse_braid
from knotsift.reidemeister import scramble

from ..knots import HOPF

TWO_UNLINK = Laurent.parse("-t^(-1/2) - t^(1/2)")  # common practice: V of the 2-component unlink


@pytest.mark.parametrize("n", range(1, 7))
def test_linking_matrix_torus_links(n):
    """T(2,2n) as the closure of sigma_1^(2n) has linking number n; one component reversed, -n
    (common practice)."""
    d = parse_braid([1] * (2 * n))
    assert linking_matrix(d) == [[0, n], [n, 0]]
    assert linking_matrix(reverse_components(d, [1])) == [[0, -n], [-n, 0]]
    assert linking_matrix(d.mirror()) == [[0, -n], [-n, 0]]


def test_linking_matrix_borromean_and_chain():
    """Borromean rings: every pair unlinked; a 3-ring chain: two linked pairs (common practice)."""
    assert linking_matrix(parse_braid("1 -2 1 -2 1 -2")) == [[0] * 3] * 3
    chain = linking_matrix(parse_braid("1 1 2 2"))
    assert sorted(chain[a][b] for a in range(3) for b in range(a + 1, 3)) == [0, 1, 1]


def test_linking_matrix_invariant_under_scrambling():
    """The sorted pairwise linking numbers survive Reidemeister moves and relabelling."""
    rng = random.Random(11)
    d = parse_braid("1 1 2 2 2 2")
    want = sorted(v for row in linking_matrix(d) for v in row)
    for _ in range(6):
        s = scramble(d, 8, rng)
        assert sorted(v for row in linking_matrix(s) for v in row) == want


def test_sublink_of_borromean_rings_is_unlink():
    """Any two rings of the Borromean rings form the unlink (Jones of the 2-component unlink)."""
    b = parse_braid("1 -2 1 -2 1 -2")
    for pair in ([0, 1], [0, 2], [1, 2]):
        s = sublink(b, pair)
        assert s.number_of_components() == 2
        assert jones_polynomial(s) == TWO_UNLINK


def test_sublink_keeps_relative_orientation():
    """The Hopf sublink of a chain keeps the sign of its linking number."""
    d = parse_braid("1 1 -2 -2")
    lk = linking_matrix(d)
    for a, b in ([0, 1], [0, 2], [1, 2]):
        assert linking_matrix(sublink(d, [a, b]))[0][1] == lk[a][b]


def test_component_knots_and_split_parts():
    """Each component alone is a knot; a diagram side by side falls into parts."""
    d = parse_braid("1 1 1 2 2")  # a trefoil with a ring through it
    kinds = sorted(str(jones_polynomial(k)) for k in component_knots(d))
    assert kinds == ["1", "t + t^3 - t^4"]
    assert split_parts(HOPF.disjoint_union(HOPF)) == [[0, 1], [2, 3]]


def test_sublink_rejects_bad_indices():
    with pytest.raises(InvariantError, match="indices 0..1"):
        sublink(HOPF, [2])
