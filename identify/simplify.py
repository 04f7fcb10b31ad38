"""Diagram simplification by moves that never add crossings in the end.

The moves, cheapest first:

* nugatory crossings (the same face meets two opposite corners; Reidemeister I
  kinks are the simplest case) are untwisted away;
* Reidemeister II bigons (a strand passing over the same strand twice in a
  row) are pulled apart;
* an over-strand (an arc of the diagram that only passes over) is lifted off
  and laid down again along a shortest path through the faces, when that
  path crosses fewer edges; the same for under-strands
  (:mod:`knotsift.strands`);
* a Reidemeister III move on a triangle is made when it opens a new
  Reidemeister I or II reduction;
* with ``effort`` above 1, a seeded randomised search applies random
  Reidemeister III moves to the best diagram so far, simplifies again and
  keeps the result when it has fewer crossings.

The knot or link type never changes.  The result is usually much smaller
than a diagram projected from 3D coordinates; it is not guaranteed to be
minimal.  The first two moves run on a mutable working copy of the PD code,
so that a move costs O(1) and the whole code is validated once at the end
(not once per move).
"""

from __future__ import annotations

import random

from .diagram import Diagram, join_edges
from .working_code import WorkingCode, flipped

__all__ = ["simplify", "reduce_nugatory_and_bigons", "remove_nugatory", "remove_bigon"]


def _face_of_corner(diagram: Diagram) -> dict[tuple[int, int], int]:
    out = {}
    for f, face in enumerate(diagram.faces()):
        for corner in face:
            out[corner] = f
    return out


def remove_nugatory(diagram: Diagram) -> Diagram | None:
    """Untwist one nugatory crossing, or return None when there is none."""
    xs = diagram.crossings
    if not xs:
        return None
    face = _face_of_corner(diagram)
    for i, x in enumerate(xs):
        for k in (0, 1):
            if face[(i, k)] != face[(i, k + 2)]:
                continue
            # The part attached at entries k+1 and k+2 is turned over.
            side: set[int] = set()
            stack = [diagram.other_end(i, (k + 1) % 4)[0], diagram.other_end(i, (k + 2) % 4)[0]]
            stack = [j for j in stack if j != i]
            while stack:
                j = stack.pop()
                if j in side:
                    continue
                side.add(j)
                for p in range(4):
                    nj = diagram.other_end(j, p)[0]
                    if nj != i and nj not in side:
                        stack.append(nj)
            signs = diagram.signs()
            new = [(flipped(y, signs[j]) if j in side else y) for j, y in enumerate(xs)]
            pairs = [(x[(k + 1) % 4], x[(k + 3) % 4]), (x[(k + 2) % 4], x[k])]
            return join_edges(new, {i}, pairs, diagram.free_loops)
    return None


def remove_bigon(diagram: Diagram) -> Diagram | None:
    """Undo one Reidemeister II bigon, or return None when there is none."""
    xs = diagram.crossings
    for face in diagram.faces():
        if len(face) != 2:
            continue
        (i, k), (j, m) = face
        if i == j:
            continue
        e1 = xs[i][(k + 1) % 4]  # leaves corner (i, k), arrives at corner (j, m)
        e2 = xs[j][(m + 1) % 4]
        p1_i = (k + 1) % 4
        p1_j = diagram.other_end(i, p1_i)[1]
        if p1_i % 2 != p1_j % 2:
            continue  # a clasp, not a bigon of one strand over the other
        p2_j = (m + 1) % 4
        p2_i = diagram.other_end(j, p2_j)[1]
        pairs = [
            (xs[i][(p1_i + 2) % 4], e1), (e1, xs[j][(p1_j + 2) % 4]),
            (xs[j][(p2_j + 2) % 4], e2), (e2, xs[i][(p2_i + 2) % 4]),
        ]
        return join_edges(list(xs), {i, j}, pairs, diagram.free_loops)
    return None


def reduce_nugatory_and_bigons(diagram: Diagram) -> Diagram:
    """Remove nugatory crossings and Reidemeister II bigons until none is left.

    The moves run on a working code; the result is validated once.  Edge
    labels are those of the input where they survive (not renumbered).
    """
    return _reduce(diagram, 0)


def _reduce(diagram: Diagram, effort: int) -> Diagram:
    """R1/R2 to exhaustion, then strand rerouting and R3 openings while they gain."""
    from .strands import reroute_in

    work = WorkingCode(diagram)
    work.reduce_locally(list(work.xs))
    while True:
        touched = work.remove_one_nugatory()
        if touched is None and effort >= 1:
            touched = reroute_in(work)
            if touched is None:
                touched = work.r3_opening()
        if touched is None:
            break
        work.reduce_locally(list(touched))
    return work.diagram()


def _random_r3(diagram: Diagram, moves: int, rng: random.Random) -> Diagram:
    from .reidemeister import apply_r3, r3_triangles

    for _ in range(moves):
        triangles = r3_triangles(diagram)
        if not triangles:
            break
        diagram = apply_r3(diagram, rng.choice(triangles))
    return diagram


def simplify(diagram: Diagram, effort: int = 1, seed: int = 0) -> Diagram:
    """A diagram of the same knot or link with (usually far) fewer crossings.

    Parameters
    ----------
    diagram : Diagram
    effort : int, optional
        0: nugatory crossings and Reidemeister II bigons only.  1 (default):
        also strand rerouting and Reidemeister III moves that open
        reductions.  k > 1: also k - 1 rounds of a randomised search
        (random Reidemeister III moves, then everything above), keeping the
        smallest diagram.
    seed : int, optional
        Seeds the randomised search, so the result is reproducible.

    Returns
    -------
    Diagram
        Edge labels are renumbered 1, 2, ... along the components.

    Examples
    --------
    >>> kinked = Diagram([(1, 1, 2, 2)])
    >>> simplify(kinked).number_of_crossings()
    0

    Notes
    -----
    A kink or bigon removal costs O(1); finding a nugatory crossing that is
    not a kink, an over-strand's shortest path or an R3 opening costs O(n)
    and happens at most once per crossing removed.
    """
    if isinstance(effort, bool) or not isinstance(effort, int) or effort < 0:
        raise ValueError(f"effort must be a non-negative integer, got {effort!r}")
    best = _reduce(diagram, effort)
    if effort > 1 and best.number_of_crossings() > 0:
        rng = random.Random(seed)
        for _ in range(effort - 1):
            if best.number_of_crossings() == 0:
                break
            trial = _reduce(_random_r3(best, rng.randint(1, 4), rng), 1)
            if trial.number_of_crossings() < best.number_of_crossings():
                best = trial
    if best.number_of_crossings() == 0:
        return Diagram([], best.free_loops)
    return best.standard_labels()
