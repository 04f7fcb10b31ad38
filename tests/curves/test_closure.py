"""Tests of closing open chains: direct, far and stochastic closure and the majority rule."""

from __future__ import annotations

import numpy as np
import pytest

from knotsift.curves.closure import (
    closure_spectrum,
    closure_towards,
    far_closure,
    is_majority,
    sphere_directions,
)
from knotsift.curves.frame import Chain, prepare_chains
from knotsift.errors import CurveError
from knotsift.invariants.fingerprint import fingerprint
from tests.curves.curves import figure_eight, moved, right_torus_knot, with_tails
from tests.strategies import braid_closure

TREFOIL = fingerprint(braid_closure([1, 1, 1]))  # right-handed (common practice)


def open_units(x):
    return prepare_chains([Chain("A", x, False)]).chains[0].coords


def tailed(make, n, tail, seed):
    rng = np.random.default_rng(seed)
    chain, core = with_tails(moved(make(n), rng, noise=0.01, closed=True), tail, rng)
    return open_units(chain), core


def test_majority_is_strict():
    """The dominant type needs more than half of the closures (common practice)."""
    assert is_majority(51, 100) and not is_majority(50, 100) and is_majority(2, 3)


@pytest.mark.parametrize("make, expected", [
    (lambda n: right_torus_knot(2, 3, n), TREFOIL),
    (lambda n: figure_eight(n), fingerprint(braid_closure([1, -2, 1, -2]))),
    (lambda n: right_torus_knot(2, 5, n), fingerprint(braid_closure([1] * 5))),
])
def test_tailed_knots_stochastic_dominant(make, expected):
    """Knots with long straight tails: the dominant stochastic closure type is the knot.

    Random closures to infinity, majority type (common practice; e.g. Millett,
    Dobay and Stasiak 2005, Macromolecules 38, "Linear random knots and their
    scaling behavior"; from memory).  Figure-eight as the closure of
    (sigma_1 sigma_2^-1)^2 (common practice).
    """
    x, _ = tailed(make, 150, 150, 7)
    sp = closure_spectrum(x, "stochastic", 40, seed=3)
    assert sp.dominant is not None
    assert sp.dominant.fingerprint == expected
    assert sp.dominant.count >= 30
    assert sum(t.count for t in sp.types) == 40


def test_direct_and_far_closure_of_tailed_trefoil():
    """Direct and far closures of a trefoil with diverging tails close it without a new knot."""
    x, _ = tailed(lambda n: right_torus_knot(2, 3, n), 120, 100, 1)
    for method in ("direct", "far"):
        sp = closure_spectrum(x, method)
        assert sp.n_closures == 1 and sp.dominant.fingerprint == TREFOIL


def test_stochastic_closure_is_reproducible():
    """The same seed gives the same spectrum; the directions differ between seeds."""
    x, _ = tailed(lambda n: right_torus_knot(2, 3, n), 80, 30, 2)
    a = closure_spectrum(x, "stochastic", 30, seed=5)
    b = closure_spectrum(x, "stochastic", 30, seed=5)
    assert [(t.fingerprint, t.count) for t in a.types] == [(t.fingerprint, t.count)
                                                           for t in b.types]
    assert not np.allclose(sphere_directions(5, 1), sphere_directions(5, 2))


def test_reused_reduction_agrees_with_full_reduction():
    """Reusing the once-reduced open chain gives the same types as the plain path."""
    x, _ = tailed(lambda n: figure_eight(n), 80, 20, 4)
    fast = closure_spectrum(x, "stochastic", 12, seed=9)
    plain = closure_spectrum(x, "stochastic", 12, seed=9, reduce=False)
    assert sorted((t.fingerprint.key(), t.count) for t in fast.types) == \
        sorted((t.fingerprint.key(), t.count) for t in plain.types)
    assert fast.reused > 0


def test_sphere_directions_are_uniform():
    """Directions uniform on the sphere: mean near 0, each coordinate's second moment near 1/3."""
    d = sphere_directions(20000, 0)
    assert np.allclose(np.linalg.norm(d, axis=1), 1)
    assert np.all(np.abs(d.mean(axis=0)) < 0.02)
    assert np.all(np.abs((d ** 2).mean(axis=0) - 1 / 3) < 0.01)


def test_far_points_lie_outside_the_chain():
    """Closure points stay beyond the ball holding the chain (so the closure does not re-enter)."""
    x = open_units(moved(right_torus_knot(2, 3, 60), np.random.default_rng(0), closed=True))
    com = x.mean(axis=0)
    radius = np.linalg.norm(x - com, axis=1).max()
    assert np.all(np.linalg.norm(far_closure(x) - com, axis=1) > 2 * radius)
    w = np.array([0.0, 0.0, 1.0])
    assert np.all((closure_towards(x, w) - com) @ w > radius)


def test_direct_closure_through_chain_is_an_error():
    """A closing segment that passes through the chain makes the type undefined: an error."""
    # bead 1 lies on the straight segment from the last bead (2, 2, 0) back to the first
    x = np.array([[0.0, 0, 0], [1, 1, 0], [1.5, -1, 1], [3, 0, 1], [3, 3, -1], [2, 2, 0]])
    with pytest.raises(CurveError, match="direct closure passes through the chain"):
        closure_spectrum(open_units(x), "direct")


def test_unknown_closure_is_an_error():
    x = open_units(right_torus_knot(2, 3, 30))
    with pytest.raises(CurveError, match="closure must be one of"):
        closure_spectrum(x, "sideways")
    with pytest.raises(CurveError, match="positive integer"):
        closure_spectrum(x, "stochastic", 0)
