"""Rerouting over- and under-strands through the faces of a diagram.

An over-strand is a stretch of a component that passes over every crossing
it meets, from one under-passage to the next.  Lifted above the rest of the
diagram, it can be laid down along any path from its start to its end: the
knot type stays the same (common practice).  Laid along a shortest path in
the dual graph (faces joined across edges), it crosses as few edges as
possible; when that is fewer than it crossed before, the diagram shrinks.
Under-strands are rerouted the same way in the mirror image.

Removing the strand merges the faces on its two sides, so the search runs
on the faces of the diagram as it is, where stepping across one of the
strand's own edges is free and across any other edge costs one crossing
(a 0-1 breadth-first search).
"""

from __future__ import annotations

from collections import deque

from .diagram import Diagram, join_edges
from .errors import DiagramError

__all__ = ["over_strands", "reroute_strand"]


def over_strands(diagram: Diagram) -> list[tuple[int, int, list[int], list[int]]]:
    """The over-strands: ``(start, end, crossings passed over, edge labels)`` each.

    A strand leaves crossing ``start`` from under (entry 2), passes over the
    listed crossings and arrives under at ``end`` (entry 0).  The edge labels
    run along it, one more than the crossings.
    """
    xs = diagram.crossings
    out = []
    for a in range(len(xs)):
        over: list[int] = []
        edges = [xs[a][2]]
        j, q = diagram.other_end(a, 2)
        while q % 2 == 1:
            over.append(j)
            edges.append(xs[j][(q + 2) % 4])
            j, q = diagram.other_end(j, (q + 2) % 4)
        out.append((a, j, over, edges))
    return out


def _sides(diagram: Diagram) -> dict[int, tuple[int, int]]:
    """For each edge label, (face on its right, face on its left) along its direction."""
    face_of = {}
    for f, face in enumerate(diagram.faces()):
        for corner in face:
            face_of[corner] = f
    out = {}
    for i, x in enumerate(diagram.crossings):
        for p, label in enumerate(x):
            if not diagram.is_incoming(i, p):  # the edge leaves crossing i here
                out[label] = (face_of[(i, (p - 1) % 4)], face_of[(i, p)])
    return out


def _path(sides, start: set[int], goal: set[int], free: set[int], limit: int):
    """Cheapest face path from ``start`` to ``goal`` costing less than ``limit``.

    Returns the edges crossed at cost one, each as ``(label, from_face)``, or None.
    """
    adjacent: dict[int, list[tuple[int, int]]] = {}
    for label, (r, l) in sides.items():
        if r != l:
            adjacent.setdefault(r, []).append((label, l))
            adjacent.setdefault(l, []).append((label, r))
    dist = {f: 0 for f in start}
    back: dict[int, tuple[int, int] | None] = {f: None for f in start}
    queue = deque(sorted(start))
    while queue:
        f = queue.popleft()
        if f in goal:
            steps = []
            while back[f] is not None:
                label, g = back[f]
                if label not in free:
                    steps.append((label, g))
                f = g
            return steps[::-1]
        for label, g in adjacent.get(f, ()):
            cost = 0 if label in free else 1
            nd = dist[f] + cost
            if nd >= limit or nd >= dist.get(g, limit):
                continue
            dist[g] = nd
            back[g] = (label, f)
            if cost:
                queue.append(g)
            else:
                queue.appendleft(g)
    return None


def _reroute_over(diagram: Diagram) -> Diagram | None:
    xs = diagram.crossings
    strands = [s for s in over_strands(diagram) if s[2]]
    if not strands:
        return None
    sides = _sides(diagram)
    strands.sort(key=lambda s: (-len(s[2]), s[0]))
    top = max(abs(e) for x in xs for e in x)
    for a, b, over, edges in strands:
        if a in over or b in over:
            continue  # the strand passes over its own end crossing
        steps = _path(sides, set(sides[edges[0]]), set(sides[edges[-1]]), set(edges),
                      len(over))
        if steps is None:
            continue
        new = [list(x) for x in xs]
        heads = {}
        for i, x in enumerate(xs):
            for p, label in enumerate(x):
                if diagram.is_incoming(i, p):
                    heads[label] = (i, p)
        arc = list(range(top + 1, top + 2 + len(steps)))
        nxt = top + 2 + len(steps)
        added = []
        for k, (label, from_face) in enumerate(steps):
            h = heads[label]
            new[h[0]][h[1]] = nxt  # the head half of the crossed edge
            right = sides[label][0]
            if from_face == right:
                added.append([label, arc[k], nxt, arc[k + 1]])
            else:
                added.append([label, arc[k + 1], nxt, arc[k]])
            nxt += 1
        new[a][2] = arc[0]
        new[b][0] = arc[-1]
        pairs = [(new[c][0], new[c][2]) for c in over]
        try:
            return join_edges(new + added, set(over), pairs, diagram.free_loops)
        except DiagramError:  # pragma: no cover - would be a bug; the move is not made
            continue
    return None


def reroute_strand(diagram: Diagram) -> Diagram | None:
    """Reroute one over- or under-strand along a path crossing fewer edges, or return None.

    Parameters
    ----------
    diagram : Diagram

    Returns
    -------
    Diagram or None
        A diagram of the same knot or link with fewer crossings.

    Examples
    --------
    >>> from knotsift.reidemeister import add_bigon
    >>> t = Diagram([(1, 5, 2, 4), (3, 1, 4, 6), (5, 3, 6, 2)])
    >>> face = next(k for k, f in enumerate(t.faces()) if len(f) == 3)
    >>> reroute_strand(add_bigon(t, face, 0, 1, over=True)).number_of_crossings()
    3

    Notes
    -----
    O(n) per strand tried; the search stops at the strand's own length, so
    short strands cost little.
    """
    if not diagram.crossings:
        return None
    found = _reroute_over(diagram)
    if found is not None:
        return found
    found = _reroute_over(diagram.mirror())
    return None if found is None else found.mirror()
