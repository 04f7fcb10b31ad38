"""Tests of the KMT reduction: it shrinks curves and never changes their type."""

from __future__ import annotations

import numpy as np
import pytest

from knotsift.curves.frame import Chain, prepare_chains
from knotsift.curves.kmt import kmt_reduce, triangles_hit
from knotsift.curves.projection import project
from knotsift.invariants.alexander import alexander_polynomial
from knotsift.invariants.fingerprint import fingerprint
from knotsift.invariants.jones import jones_polynomial
from tests.curves.curves import (
    connected_sum,
    figure_eight,
    hopf_link,
    moved,
    one_maximum_unknot,
    right_torus_knot,
    torus_knot,
)


def units(*xs, closed=True):
    prep = prepare_chains([Chain(str(k), x, closed) for k, x in enumerate(xs)])
    return [c.coords for c in prep.chains]


def random_walk_ring(n, rng):
    """A Gaussian random polygon (steps minus their mean, so it closes): a tangled test ring."""
    steps = rng.standard_normal((n, 3))
    steps -= steps.mean(axis=0)
    return np.cumsum(steps, axis=0)


@pytest.mark.parametrize("seed", range(12))
def test_reduction_keeps_jones_and_alexander(seed):
    """Jones and Alexander of the unreduced and the reduced polygon agree (small random rings).

    KMT reduction is an isotopy (Koniaris and Muthukumar 1991, Phys. Rev. Lett. 66,
    "Self-entanglement in ring polymers"; Taylor 2000, Nature 406).
    """
    rng = np.random.default_rng(seed)
    (x,) = units(random_walk_ring(40 + 4 * seed, rng))
    full = project([(x, True)], np.random.default_rng(seed)).diagram
    red = kmt_reduce([(x, True)])
    small = project(red.chains, np.random.default_rng(seed + 100)).diagram
    assert red.number_of_vertices() < len(x)
    assert jones_polynomial(small) == jones_polynomial(full)
    if full.number_of_components() == 1:
        assert alexander_polynomial(small) == alexander_polynomial(full)


@pytest.mark.parametrize("make", [lambda: right_torus_knot(2, 5, 150), lambda: figure_eight(150),
                                  lambda: connected_sum(right_torus_knot(2, 3, 100),
                                                        torus_knot(2, 3, 100))])
def test_reduction_keeps_fingerprint_of_knots(make):
    """Known knots keep their whole fingerprint through the reduction."""
    (x,) = units(moved(make(), np.random.default_rng(3)))
    before = fingerprint(project([(x, True)], np.random.default_rng(0)).diagram)
    red = kmt_reduce([(x, True)])
    after = fingerprint(project(red.chains, np.random.default_rng(1)).diagram)
    assert after == before
    assert red.number_of_vertices() <= 40


def test_unknotted_rings_reduce_to_triangles():
    """A planar circle and a tangled unknot (one maximum, Milnor 1950) reduce to 3 vertices."""
    s = np.linspace(0, 2 * np.pi, 300, endpoint=False)
    circle = np.stack([np.cos(s), np.sin(s), 0.05 * np.sin(5 * s)], axis=1)
    for x in units(circle) + units(one_maximum_unknot(300, loops=6)):
        assert kmt_reduce([(x, True)]).number_of_vertices() == 3


def test_links_keep_linking():
    """Rings are obstacles for each other: the Hopf link stays linked after joint reduction."""
    a, b = units(*hopf_link(100))
    red = kmt_reduce([(a, True), (b, True)])
    assert all(len(x) >= 3 for x, _ in red.chains)
    proj = project(red.chains, np.random.default_rng(0))
    assert abs(proj.linking_number(0, 1)) == 1


def test_open_chain_ends_stay_fixed():
    """Ends of an open chain are never deleted; an open chain reduces to a short path."""
    (x,) = units(moved(right_torus_knot(2, 3, 200), np.random.default_rng(1)), closed=False)
    red = kmt_reduce([(x, False)], record=True)
    y = red.chains[0][0]
    assert np.array_equal(y[0], x[0]) and np.array_equal(y[-1], x[-1])
    assert red.kept[0][0] == 0 and red.kept[0][-1] == len(x) - 1
    assert len(red.triangles) == len(x) - len(y)
    assert set(red.triangle_ids[:, 2]) == set(range(len(x))) - set(red.kept[0].tolist())


def test_blocking_segment_keeps_vertex():
    """A segment piercing the triangle at a vertex keeps that vertex (the core of KMT)."""
    ring = np.array([[0.0, 0, 0], [1, 0, 0], [1, 1, 0], [0, 1, 0]])
    spike = np.array([[0.9, 0.5, -1.0], [0.9, 0.5, 1.0], [5.0, 5.0, 1.0], [5.0, 5.0, -1.0]])
    red = kmt_reduce([(ring, True), (spike, True)])
    # the spike pierces the square near its edge x = 1: neither (1,0,0) nor (1,1,0) may go
    left = red.chains[0][0].tolist()
    assert [1.0, 0.0, 0.0] in left and [1.0, 1.0, 0.0] in left


def test_collinear_beads_are_removed():
    """Straight runs of beads (degenerate triangles) are reduced away."""
    line = np.linspace(0, 1, 20)[:, None] * np.array([[10.0, 0, 0]])
    square = np.concatenate((line, line[-1] + line * 0 + np.array([[0, 5.0, 0]]) * np.linspace(
        0, 1, 20)[:, None], (line[::-1] + np.array([0, 5.0, 0])), np.array([[0.0, 2.5, 0]])))
    _, idx = np.unique(square.round(9), axis=0, return_index=True)
    square = square[np.sort(idx)]
    red = kmt_reduce([(square, True)])
    assert red.number_of_vertices() == 3


def test_triangles_hit_detects_crossing_closure():
    """A closure segment through a deleted triangle is reported by its index; one beside is not."""
    chain = np.array([[0.0, 0, 0], [1, 2, 0], [2, 0, 0], [3, 2, 0], [4, 0, 0]])
    red = kmt_reduce([(chain, False)], record=True)
    assert len(red.triangles) >= 1
    k = 0
    cx, cy, _ = red.triangles[k].mean(axis=0)
    last, first = chain[-1], chain[0]
    p = np.array([last, [cx, cy, 5.0], [cx, cy, -5.0]])
    q = np.array([[cx, cy, 5.0], [cx, cy, -5.0], first])
    assert triangles_hit(red.triangles, red.triangle_ids, p, q, (0, 4)) == k
    p = np.array([last, [4.0, 9, 5], [0.0, 9, 5]])
    q = np.array([[4.0, 9, 5], [0.0, 9, 5], first])
    assert triangles_hit(red.triangles, red.triangle_ids, p, q, (0, 4)) == -1
