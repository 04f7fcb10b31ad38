"""Tests of connected-sum factors found through decomposing circles."""

from __future__ import annotations

import random
from collections import Counter

import pytest
from knotsift.decomposition import connected_sum_factors, decomposing_edges, split_along
from knotsift.invariants.fingerprint import fingerprint
from knotsift.invariants.jones import jones_polynomial
from knotsift.notations.conway import parse_rational
from knotsift.reidemeister import scramble

from tests.knots import PRIME_KNOTS_TO_7, TREFOIL


def table_knot(name: str):
    return parse_rational(PRIME_KNOTS_TO_7[name][0])


@pytest.mark.parametrize("seed", range(6))
def test_scrambled_sums_of_three_to_six_table_knots_split_into_their_factors(seed):
    """The factors found carry exactly the fingerprints of the summands, chirality included.

    A connected sum of diagrams displays a decomposing circle by
    construction (common practice); Reidemeister moves keep the type.
    """
    rng = random.Random(seed)
    k = 3 + seed % 4
    pieces = []
    for _ in range(k):
        d = table_knot(rng.choice(sorted(PRIME_KNOTS_TO_7)))
        pieces.append(d.mirror() if rng.random() < 0.5 else d)
    total = pieces[0]
    for d in pieces[1:]:
        total = total.connected_sum(d)
    scrambled = scramble(total, 6 * k, rng)
    factors = connected_sum_factors(scrambled)
    assert Counter(fingerprint(f).key() for f in factors) == Counter(
        fingerprint(d).key() for d in pieces)


def test_factor_jones_polynomials_multiply_to_the_whole():
    """V(K1 # K2) = V(K1) V(K2) (Jones 1985, Bull. AMS 12; from memory)."""
    d = TREFOIL.connected_sum(table_knot("5_2")).connected_sum(table_knot("4_1").mirror())
    product = 1
    for f in connected_sum_factors(scramble(d, 8, random.Random(3))):
        product = jones_polynomial(f) * product
    assert product == jones_polynomial(d)


@pytest.mark.parametrize("name", sorted(PRIME_KNOTS_TO_7))
def test_prime_alternating_diagrams_are_not_split(name):
    """A reduced alternating diagram of a prime knot has no decomposing circle (Menasco 1984)."""
    d = table_knot(name)
    assert d.is_alternating()
    assert decomposing_edges(d) is None
    assert len(connected_sum_factors(d)) == 1


def test_split_along_gives_the_two_summands():
    """Cutting the two edges of a sum's circle returns diagrams of the two summands."""
    a, b = TREFOIL, table_knot("5_2")
    cut = decomposing_edges(a.connected_sum(b))
    assert cut is not None
    parts = split_along(a.connected_sum(b), *cut)
    assert sorted(p.number_of_crossings() for p in parts) == [3, 5]
    assert {fingerprint(p).key() for p in parts} == {fingerprint(a).key(), fingerprint(b).key()}


def test_trivial_factors_are_dropped():
    """Summing with kinked unknots adds no factor; the unknot alone is one trivial factor."""
    from knotsift.diagram import Diagram

    kink = Diagram([(1, 1, 2, 2)])
    factors = connected_sum_factors(TREFOIL.connected_sum(kink).connected_sum(kink))
    assert [f.number_of_crossings() for f in factors] == [3]
    only = connected_sum_factors(kink)
    assert len(only) == 1 and only[0].number_of_crossings() == 0
