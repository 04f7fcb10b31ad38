"""Tests of diagram simplification: R1/R2, strand rerouting, R3 openings, randomised search."""

import random

import pytest
from hypothesis import given, settings
from knotsift.diagram import Diagram
from knotsift.invariants.alexander import alexander_polynomial
from knotsift.invariants.jones import jones_polynomial
from knotsift.reidemeister import add_bigon, add_kink, scramble
from knotsift.simplify import remove_bigon, remove_nugatory, simplify
from knotsift.strands import reroute_strand

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


def _scrambled_table_knots(moves: int, seed: int):
    """Table knots through 7 crossings, each scrambled by ``moves`` random Reidemeister moves."""
    from knotsift.notations.conway import parse_rational

    from tests.knots import PRIME_KNOTS_TO_7

    rng = random.Random(seed)
    for name in sorted(PRIME_KNOTS_TO_7):
        d = parse_rational(PRIME_KNOTS_TO_7[name][0])
        d = d.mirror() if rng.random() < 0.5 else d
        yield name, d, scramble(d, moves, rng)


@pytest.mark.parametrize("effort", [0, 1, 3])
def test_every_effort_keeps_jones_and_alexander(effort):
    """Simplification at every effort keeps V and Delta of scrambled table knots.

    V and Delta are invariant under Reidemeister moves (Jones 1985, Bull. AMS
    12; Alexander 1928, Trans. AMS 30; from memory), so any change would be a
    broken move.
    """
    for _, d, s in _scrambled_table_knots(20, effort):
        r = simplify(s, effort=effort, seed=effort)
        assert r.number_of_crossings() <= s.number_of_crossings()
        assert jones_polynomial(r) == jones_polynomial(d)
        assert alexander_polynomial(r) == alexander_polynomial(d)


def test_rerouting_and_search_reach_the_crossing_number():
    """With effort 3 every scrambled knot through 7 crossings is back at its crossing number.

    The crossing number is the first part of the Alexander-Briggs name (Rolfsen
    1976, "Knots and Links", Appendix C; from memory); effort 0 stays above it.
    """
    reached, above0 = 0, 0
    for name, _, s in _scrambled_table_knots(25, 7):
        c = int(name.split("_")[0])
        above0 += simplify(s, effort=0).number_of_crossings() > c
        reached += simplify(s, effort=3, seed=1).number_of_crossings() == c
    assert reached == 14
    assert above0 >= 3


@pytest.mark.parametrize("over", [True, False])
def test_strand_rerouting_removes_a_long_detour(over):
    """A strand pushed over (or under) a trefoil three times comes back by rerouting alone."""
    d = TREFOIL
    for _ in range(3):  # push one strand across three faces in a row
        face = max(range(len(d.faces())), key=lambda k: len(d.faces()[k]))
        d = add_bigon(d, face, 0, 2, over=over)
    assert d.number_of_crossings() == 9
    r = reroute_strand(d)
    assert r is not None and r.number_of_crossings() < 9
    assert simplify(d).number_of_crossings() == 3
    assert jones_polynomial(r) == jones_polynomial(TREFOIL)


def test_search_is_reproducible_per_seed():
    """The randomised search gives the same diagram for the same seed."""
    _, _, s = next(_scrambled_table_knots(40, 3))
    assert simplify(s, effort=4, seed=9) == simplify(s, effort=4, seed=9)


def test_effort_must_be_a_non_negative_integer():
    with pytest.raises(ValueError, match="effort"):
        simplify(TREFOIL, effort=-1)


def test_random_polygon_diagrams_keep_their_jones_polynomial():
    """Projected seeded random polygons: every effort gives the same V as the projection."""
    import numpy as np
    from knotsift.curves.frame import Chain, prepare_chains
    from knotsift.curves.kmt import kmt_reduce
    from knotsift.curves.projection import project

    from tests.curves.curves import random_polygon

    rng = np.random.default_rng(44)
    checked = 0
    for k in range(6):
        x = prepare_chains([Chain("A", random_polygon(300, rng), True)]).chains[0].coords
        d = project(kmt_reduce([(x, True)]).chains, np.random.default_rng(k)).diagram
        if d.number_of_crossings() > 22:
            continue  # keep the reference Jones computation cheap
        v = jones_polynomial(d)
        for effort in (0, 1, 3):
            assert jones_polynomial(simplify(d, effort=effort, seed=k)) == v
        checked += 1
    assert checked >= 3
