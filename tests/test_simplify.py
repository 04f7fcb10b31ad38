"""Tests of diagram simplification (nugatory crossings and Reidemeister II bigons)."""

import random

from hypothesis import given, settings

from knotsift.diagram import Diagram
from knotsift.invariants.jones import jones_polynomial
from knotsift.reidemeister import add_bigon, add_kink, scramble
from knotsift.simplify import remove_bigon, remove_nugatory, simplify
from tests.strategies import braid_closure, braid_words

TREFOIL = Diagram([(1, 5, 2, 4), (3, 1, 4, 6), (5, 3, 6, 2)])


def test_kinks_are_removed():
    """A curl (Reidemeister I) is a nugatory crossing and disappears (common practice)."""
    d = add_kink(add_kink(TREFOIL, 2, 1, True), 5, -1, False)
    assert d.number_of_crossings() == 5
    s = simplify(d)
    assert s.number_of_crossings() == 3
    assert jones_polynomial(s) == jones_polynomial(TREFOIL)


def test_bigons_are_removed():
    """Pushing one strand over another (Reidemeister II) is undone."""
    face = next(k for k, f in enumerate(TREFOIL.faces()) if len(f) == 3)
    d = add_bigon(TREFOIL, face, 0, 1, over=True)
    assert d.number_of_crossings() == 5
    assert remove_bigon(d) is not None
    assert simplify(d).number_of_crossings() == 3


def test_reduced_alternating_is_left_alone():
    """A reduced alternating diagram has nothing to remove."""
    assert remove_nugatory(TREFOIL) is None
    assert remove_bigon(TREFOIL) is None
    assert simplify(TREFOIL).number_of_crossings() == 3


def test_unknot_diagrams_vanish():
    """Scrambled circles simplify to the crossing-free unknot."""
    rng = random.Random(11)
    for _ in range(10):
        d = scramble(Diagram([(1, 1, 2, 2)]), 12, rng)
        s = simplify(d)
        assert s.number_of_crossings() == 0
        assert s.number_of_components() == 1


@settings(max_examples=40, deadline=None)
@given(braid_words(max_strands=4, max_length=10))
def test_simplify_keeps_the_jones_polynomial(wb):
    """Simplification never changes the knot or link: V and the component count agree."""
    d = braid_closure(*wb)
    s = simplify(d)
    assert s.number_of_crossings() <= d.number_of_crossings()
    assert s.number_of_components() == d.number_of_components()
    assert jones_polynomial(s) == jones_polynomial(d)
