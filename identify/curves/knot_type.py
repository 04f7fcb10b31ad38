"""The knot type of closed polygons: reduce, project, simplify, fingerprint.

This is the one place where coordinates become exact invariants: the
reduced polygon is projected to a :class:`~knotsift.diagram.Diagram`, which
is simplified and fingerprinted by the core (:mod:`knotsift.invariants`).
Invariants are computed cheap first within the item's budget
(:mod:`knotsift.budget`) and cached by the simplified diagram, since many
closures of one chain give the same small diagram.  No diagram is refused
for its size: the Alexander polynomial, determinant and signature are
always computed, the Jones polynomial when the budget allows.
"""

from __future__ import annotations

from collections import OrderedDict
from dataclasses import dataclass

import numpy as np

from ..budget import Staged, current_budget, staged_invariants
from ..diagram import Diagram
from ..invariants.fingerprint import Fingerprint, fingerprint
from ..simplify import simplify
from .kmt import KMT_TOL, kmt_reduce
from .projection import PROJECTION_TOL, project

__all__ = ["PolygonType", "polygon_type", "cached_fingerprint", "cached_invariants",
           "PROJECTION_DIRECTIONS"]

#: Seeded view directions compared per projection; the one with the fewest
#: crossings is used (bench/bench_simplify.py measures the effect).
PROJECTION_DIRECTIONS = 3

_CACHE: OrderedDict[tuple, Staged] = OrderedDict()
_CACHE_SIZE = 4096


def cached_invariants(simple: Diagram) -> Staged:
    """The invariants of an already simplified diagram under the current budget, cached."""
    budget = current_budget()
    key = (simple, budget)
    st = _CACHE.get(key)
    if st is None:
        st = staged_invariants(simple, budget=budget)
        _CACHE[key] = st
        if len(_CACHE) > _CACHE_SIZE:
            _CACHE.popitem(last=False)
    else:
        _CACHE.move_to_end(key)
    return st


def cached_fingerprint(simple: Diagram) -> Fingerprint:
    """The fingerprint of an already simplified diagram, cached (Jones None when skipped)."""
    return cached_invariants(simple).fingerprint()


@dataclass
class PolygonType:
    """What one closed polygon (or set of rings) reduced to.

    Attributes
    ----------
    fingerprint : Fingerprint
    diagram : Diagram
        The projected diagram (before simplification).
    simplified : Diagram
    vertices_in, vertices_reduced : int
    crossings : int
        Crossings of the projection (before simplification).
    redraws : int
        Projection directions rejected as degenerate.
    projection : Projection
    """

    fingerprint: Fingerprint
    diagram: Diagram
    simplified: Diagram
    vertices_in: int
    vertices_reduced: int
    crossings: int
    redraws: int
    projection: object


def polygon_type(chains: list[tuple[np.ndarray, bool]], rng: np.random.Generator,
                 reduce: bool = True, simplified: bool = True, where: str = "",
                 with_fingerprint: bool = True,
                 directions: int = PROJECTION_DIRECTIONS) -> PolygonType:
    """Reduce (KMT), project and fingerprint closed chains in median-bond units.

    Parameters
    ----------
    chains : list of (vertices, closed)
        All closed.
    rng : numpy Generator
        View directions.
    reduce : bool
        Apply the KMT reduction first (off only for the plain path in benchmarks).
    simplified : bool
        Simplify the diagram before the invariants (off only for benchmarks).
    with_fingerprint : bool
        Compute the fingerprint (off when only crossings are needed).
    directions : int
        View directions drawn from ``rng``; the projection with the fewest
        crossings is kept.
    """
    n_in = sum(len(x) for x, _ in chains)
    if reduce:
        chains = kmt_reduce(chains, tol=KMT_TOL).chains
    proj = project(chains, rng, tol=PROJECTION_TOL, where=where, directions=directions)
    d = proj.diagram
    simple = simplify(d) if simplified else d
    if with_fingerprint:
        fp = cached_fingerprint(simple) if simplified else fingerprint(simple, simplified=True)
    else:
        fp = None
    return PolygonType(fp, d, simple, n_in, sum(len(x) for x, _ in chains),
                       d.number_of_crossings(), proj.redraws, proj)
