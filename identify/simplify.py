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

__all__ = ["simplify", "reduce_nugatory_and_bigons", "remove_nugatory", "remove_bigon"]


def _flipped(x: tuple[int, int, int, int], sign: int) -> tuple[int, int, int, int]:
    """A crossing seen after turning its part of the diagram over (same sign)."""
    a, b, c, d = x
    return (d, c, b, a) if sign > 0 else (b, a, d, c)


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
            new = [(_flipped(y, signs[j]) if j in side else y) for j, y in enumerate(xs)]
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


class _WorkingCode:
    """A mutable PD code: crossings by id, the two darts of each label, crossing signs."""

    __slots__ = ("xs", "sign", "where", "loops")

    def __init__(self, diagram: Diagram):
        self.xs: dict[int, list[int]] = {i: list(x) for i, x in enumerate(diagram.crossings)}
        self.sign = dict(enumerate(diagram.signs()))
        self.where: dict[int, list[tuple[int, int]]] = {}
        for i, x in self.xs.items():
            for p, e in enumerate(x):
                self.where.setdefault(e, []).append((i, p))
        self.loops = diagram.free_loops

    def other(self, i: int, p: int) -> tuple[int, int]:
        a, b = self.where[self.xs[i][p]]
        return b if a == (i, p) else a

    def remove(self, drop: set[int], pairs: list[tuple[int, int]]) -> set[int]:
        """Delete crossings ``drop`` and join the labels in ``pairs``; the crossings touched."""
        from .partition import Partition

        gone = set()
        for c in drop:
            for p, e in enumerate(self.xs[c]):
                self.where[e].remove((c, p))
                gone.add(e)
            del self.xs[c]
            del self.sign[c]
        merged = Partition()
        for u, v in pairs:
            merged.join(u, v)
        touched: set[int] = set()
        for members in merged.classes().values():
            darts = [d for m in members for d in self.where.pop(m, ())]
            if not darts:
                self.loops += 1
                continue
            if len(darts) != 2:  # pragma: no cover - a broken move, never expected
                raise AssertionError(f"joined labels {members} keep {len(darts)} ends")
            rep = min(members)
            for c, p in darts:
                self.xs[c][p] = rep
                touched.add(c)
            self.where[rep] = darts
        for e in gone:
            if not self.where.get(e, True):
                del self.where[e]
        return touched

    def kink_at(self, c: int) -> list[tuple[int, int]] | None:
        x = self.xs[c]
        for p in range(4):
            if x[p] == x[(p + 1) % 4]:
                return [(x[(p + 2) % 4], x[p]), (x[(p + 3) % 4], x[p])]
        return None

    def bigon_at(self, c: int) -> tuple[int, list[tuple[int, int]]] | None:
        x = self.xs[c]
        for p in range(4):
            d, q = self.other(c, (p + 1) % 4)
            if d == c or self.other(d, (q + 1) % 4) != (c, p):
                continue
            if (p + 1) % 2 != q % 2:
                continue  # a clasp, not one strand over the other twice
            y = self.xs[d]
            e1, e2 = x[(p + 1) % 4], y[(q + 1) % 4]
            return d, [(x[(p + 3) % 4], e1), (e1, y[(q + 2) % 4]),
                       (y[(q + 3) % 4], e2), (e2, x[(p + 2) % 4])]
        return None

    def has_local_move(self, crossings) -> bool:
        return any(c in self.xs and (self.kink_at(c) or self.bigon_at(c)) for c in crossings)

    def reduce_locally(self, todo: list[int]) -> None:
        """Remove kinks and bigons at the crossings in ``todo`` and wherever moves open new ones."""
        while todo:
            c = todo.pop()
            if c not in self.xs:
                continue
            pairs = self.kink_at(c)
            if pairs is not None:
                todo.extend(self.remove({c}, pairs))
                continue
            found = self.bigon_at(c)
            if found is not None:
                d, pairs = found
                todo.extend(self.remove({c, d}, pairs))

    def face_of_corner(self) -> dict[tuple[int, int], int]:
        out: dict[tuple[int, int], int] = {}
        f = 0
        for i in self.xs:
            for p in range(4):
                d = (i, p)
                if d in out:
                    continue
                while d not in out:
                    out[d] = f
                    d = self.other(d[0], (d[1] + 1) % 4)
                f += 1
        return out

    def remove_one_nugatory(self) -> set[int] | None:
        """Untwist one nugatory crossing (turning one side over); the crossings touched."""
        if not self.xs:
            return None
        face = self.face_of_corner()
        for i, x in self.xs.items():
            for k in (0, 1):
                if face[(i, k)] != face[(i, k + 2)]:
                    continue
                side: set[int] = set()
                stack = [self.other(i, (k + 1) % 4)[0], self.other(i, (k + 2) % 4)[0]]
                while stack:
                    j = stack.pop()
                    if j == i or j in side:
                        continue
                    side.add(j)
                    stack.extend(self.other(j, p)[0] for p in range(4))
                for j in side:
                    old = self.xs[j]
                    for p, e in enumerate(old):
                        self.where[e].remove((j, p))
                    new = list(_flipped(tuple(old), self.sign[j]))
                    self.xs[j] = new
                    for p, e in enumerate(new):
                        self.where[e].append((j, p))
                pairs = [(x[(k + 1) % 4], x[(k + 3) % 4]), (x[(k + 2) % 4], x[k])]
                return self.remove({i}, pairs)
        return None

    def diagram(self) -> Diagram:
        return Diagram([tuple(x) for x in self.xs.values()], self.loops)


def reduce_nugatory_and_bigons(diagram: Diagram) -> Diagram:
    """Remove nugatory crossings and Reidemeister II bigons until none is left.

    The moves run on a working copy; the result is validated once.  Edge
    labels are those of the input where they survive (not renumbered).
    """
    work = _WorkingCode(diagram)
    work.reduce_locally(list(work.xs))
    while True:
        touched = work.remove_one_nugatory()
        if touched is None:
            break
        work.reduce_locally(list(touched))
    return work.diagram()


def _r3_openings(diagram: Diagram) -> Diagram | None:
    """A Reidemeister III move after which a kink or bigon can be removed, or None."""
    from .reidemeister import apply_r3, r3_triangles

    faces = None
    for f in r3_triangles(diagram):
        faces = faces or diagram.faces()
        face = faces[f]
        moved = apply_r3(diagram, f)
        work = _WorkingCode(moved)
        if work.has_local_move({c for c, _ in face}):
            return moved
    return None


def _reduce(diagram: Diagram, effort: int) -> Diagram:
    """R1/R2 to exhaustion, then strand rerouting and R3 openings while they gain."""
    from .strands import reroute_strand

    current = reduce_nugatory_and_bigons(diagram)
    if effort < 1:
        return current
    while current.number_of_crossings() > 0:
        nxt = reroute_strand(current)
        if nxt is None:
            nxt = _r3_openings(current)
        if nxt is None:
            break
        nxt = reduce_nugatory_and_bigons(nxt)
        if nxt.number_of_crossings() > current.number_of_crossings():  # pragma: no cover
            break
        current = nxt
    return current


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
