"""Tests of the knotted core: where the knot sits along a chain."""

from __future__ import annotations

import numpy as np

from knotsift.curves.closure import closure_spectrum
from knotsift.curves.frame import Chain, prepare_chains
from knotsift.curves.localisation import knotted_core
from knotsift.invariants.fingerprint import fingerprint
from tests.curves.curves import connected_sum, moved, right_torus_knot, with_tails
from tests.strategies import braid_closure

TREFOIL = fingerprint(braid_closure([1, 1, 1])).key()


def prepared(x, closed):
    prep = prepare_chains([Chain("A", x, closed)])
    return prep.chains[0].coords, prep.kept[0]


def test_core_of_tailed_trefoil_lies_in_the_knot():
    """The core of a trefoil with long tails keeps the type and lies mostly in the former ring.

    The knotted core is the shortest subchain keeping the type under the same
    closure (common practice).  The tails carry no knot by construction, but a
    few tail beads may help the closures, so only most of the core must lie
    in the ring.
    """
    rng = np.random.default_rng(11)
    chain, (lo, hi) = with_tails(moved(right_torus_knot(2, 3, 120), rng, noise=0.01), 60, rng)
    x, kept = prepared(chain, False)
    core = knotted_core(x, False, TREFOIL, closure="stochastic", n_closures=15, seed=1,
                        kept=kept, n_input=len(chain))
    assert core is not None
    assert core.beads == core.end - core.start + 1 and not core.wraps
    inside = min(core.end, hi) - max(core.start, lo) + 1
    assert inside >= 0.8 * core.beads
    assert core.beads < (hi - lo + 1)  # shorter than the whole former ring
    sub = x[core.start:core.end + 1]
    again = closure_spectrum(sub, "stochastic", 15, seed=1)
    assert again.dominant is not None and again.dominant.fingerprint.key() == TREFOIL


def test_core_of_composite_ring_holds_both_summands():
    """A ring carrying 3_1 # 3_1 far apart: its core (arcs closed far) spans both trefoils."""
    x0 = connected_sum(right_torus_knot(2, 3, 90), right_torus_knot(2, 3, 90))
    granny = (fingerprint(braid_closure([1, 1, 1])) * fingerprint(braid_closure([1, 1, 1])))
    x, kept = prepared(moved(x0, np.random.default_rng(2), noise=0.01), True)
    core = knotted_core(x, True, granny.key(), closure="direct", seed=0, kept=kept,
                        n_input=len(x0))
    assert core is not None
    assert core.beads >= 100  # more than one trefoil's worth of beads
    assert core.evaluations > 0


def test_no_core_when_every_arc_loses_the_type():
    """When no cut leaves the type (asking for a type the chain does not have) there is no core."""
    x, kept = prepared(right_torus_knot(2, 3, 60), True)
    assert knotted_core(x, True, "c=1;V=nothing", closure="direct") is None
