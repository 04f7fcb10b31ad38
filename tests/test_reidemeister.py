"""Tests of the crossing-adding Reidemeister moves used for scrambling."""

import random

import pytest

from knotsift.diagram import Diagram
from knotsift.errors import DiagramError
from knotsift.invariants.jones import jones_polynomial
from knotsift.reidemeister import add_bigon, add_kink, scramble

FIGURE_EIGHT = Diagram([(4, 2, 5, 1), (8, 6, 1, 5), (6, 3, 7, 4), (2, 7, 3, 8)])


@pytest.mark.parametrize("sign", [1, -1])
@pytest.mark.parametrize("left", [True, False])
def test_add_kink_sign_and_invariance(sign, left):
    """A curl of either sign on either side adds one crossing of that sign and keeps V."""
    d = add_kink(FIGURE_EIGHT, 5, sign, left)
    assert d.number_of_crossings() == 5
    assert d.signs()[-1] == sign
    assert jones_polynomial(d) == jones_polynomial(FIGURE_EIGHT)


def test_add_bigon_everywhere():
    """Every Reidemeister II move on every pair of edges of every face keeps V."""
    v = jones_polynomial(FIGURE_EIGHT)
    for k, face in enumerate(FIGURE_EIGHT.faces()):
        for a in range(len(face)):
            for b in range(len(face)):
                if a != b:
                    for over in (True, False):
                        d = add_bigon(FIGURE_EIGHT, k, a, b, over)
                        assert d.number_of_crossings() == 6
                        assert jones_polynomial(d) == v


def test_scramble_grows_and_keeps_type():
    """Twenty random moves give a larger diagram of the same knot (seeded)."""
    rng = random.Random(5)
    d = scramble(FIGURE_EIGHT, 20, rng)
    assert d.number_of_crossings() > 20
    assert d.is_knot()
    assert jones_polynomial(d) == jones_polynomial(FIGURE_EIGHT)


def test_bad_moves_rejected():
    """Moves on missing edges or with bad parameters raise DiagramError."""
    with pytest.raises(DiagramError):
        add_kink(FIGURE_EIGHT, 99)
    with pytest.raises(DiagramError):
        add_kink(FIGURE_EIGHT, 1, sign=2)
    with pytest.raises(DiagramError):
        add_bigon(FIGURE_EIGHT, 0, 0, 0)


def test_r3_keeps_invariants_and_changes_the_diagram():
    """Reidemeister III on every applicable triangle of random braid closures keeps the whole
    fingerprint (common practice: invariants are invariant) while changing the PD code."""
    from knotsift.invariants.fingerprint import fingerprint
    from knotsift.reidemeister import apply_r3, r3_triangles
    from tests.strategies import braid_closure

    rng = random.Random(33)
    applied = 0
    for _ in range(60):
        word = [rng.choice([1, -1]) * rng.randint(1, 3) for _ in range(rng.randint(4, 9))]
        d = braid_closure(word, 4)
        for f in r3_triangles(d):
            e = apply_r3(d, f)
            assert e.crossings != d.crossings
            assert e.number_of_crossings() == d.number_of_crossings()
            assert fingerprint(e, simplified=True) == fingerprint(d, simplified=True)
            applied += 1
    assert applied > 20


def test_r3_refuses_an_alternating_triangle():
    """The trefoil's triangles alternate (each strand over once): no R3 move applies there."""
    from knotsift.reidemeister import apply_r3, r3_triangles

    t = Diagram([(1, 5, 2, 4), (3, 1, 4, 6), (5, 3, 6, 2)])
    assert r3_triangles(t) == []
    with pytest.raises(DiagramError):
        apply_r3(t, 0)


def test_scramble_keeps_link_orientation_through_a_kink():
    """A Reidemeister II move beside a kink keeps every component's direction.

    A kink's own edge starts and ends at one crossing, so it cannot say which
    way its component runs; a two-component link whose first move was next to
    a kink used to come back with one component reversed (its Jones polynomial
    multiplied by t^-9 here, a change of linking number by 3).
    """
    link = Diagram([[2, 5, 6, 3], [1, 7, 8, 5], [7, 9, 10, 8], [9, 11, 12, 10], [6, 13, 4, 4],
                    [12, 15, 3, 13], [11, 17, 18, 15], [17, 19, 20, 18], [19, 21, 22, 20],
                    [21, 1, 2, 22]])
    v = jones_polynomial(link)
    for seed in range(30):
        assert jones_polynomial(scramble(link, 6, random.Random(seed))) == v, seed
