"""Rerouting over- and under-strands through the faces of a diagram.

An over-strand is a stretch of a component that passes over every crossing
it meets, from one under-passage to the next.  Lifted above the rest of the
diagram, it can be laid down along any path from its start to its end: the
knot type stays the same (common practice).  Laid along a shortest path in
the dual graph (faces joined across edges), it crosses as few edges as
possible; when that is fewer than it crossed before, the diagram shrinks.
Under-strands (only passing under) are rerouted the same way.

Removing the strand merges the faces on its two sides, so the search runs
on the faces of the diagram as it is, where stepping across one of the
strand's own edges is free and across any other edge costs one crossing
(a 0-1 breadth-first search).
"""

from __future__ import annotations

from collections import deque

from .diagram import Diagram
from .working_code import WorkingCode

__all__ = ["strands", "reroute_strand", "reroute_in"]


def strands(work: WorkingCode, over: bool = True) -> list[tuple[tuple[int, int], tuple[int, int],
                                                              list[int], list[int]]]:
    """The over-strands (or under-strands) of a working code.

    Each is ``(start dart, end dart, crossings passed, edge labels)``: the
    strand leaves the start dart's crossing on the other level, passes over
    (under) the listed crossings and arrives at the end dart on the other
    level again.  The edge labels run along it, one more than the crossings.
    """
    out = []
    passing = 1 if over else 0
    for a in list(work.xs):
        if over:
            start = (a, 2)
        else:
            start = (a, 1) if work.sign[a] > 0 else (a, 3)
        passed: list[int] = []
        edges = [work.xs[a][start[1]]]
        j, q = work.other(*start)
        while q % 2 == passing and j not in passed:
            passed.append(j)
            edges.append(work.xs[j][(q + 2) % 4])
            j, q = work.other(j, (q + 2) % 4)
        if q % 2 != passing:
            out.append((start, (j, q), passed, edges))
    return out


def _path(adjacent, start: set[int], goal: set[int], free: set[int], limit: int):
    """Cheapest face path from ``start`` to ``goal`` costing less than ``limit``.

    Returns the edges crossed at cost one, each as ``(label, from_face)``, or None.
    """
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
        df = dist[f]
        for label, g in adjacent.get(f, ()):
            cost = 0 if label in free else 1
            nd = df + cost
            if nd >= limit or nd >= dist.get(g, limit):
                continue
            dist[g] = nd
            back[g] = (label, f)
            if cost:
                queue.append(g)
            else:
                queue.appendleft(g)
    return None


def _lay_down(work: WorkingCode, start, end, passed, steps, sides, over: bool) -> set[int]:
    """Replace the strand by one crossing each edge of ``steps``; the crossings touched."""
    arc = [work.fresh() for _ in range(len(steps) + 1)]
    touched = set()
    for k, (label, from_face) in enumerate(steps):
        head = next(d for d in work.where[label] if not work.is_outgoing(*d))
        half = work.fresh()
        work.relabel_dart(head[0], head[1], half)
        from_right = from_face == sides[label][0]
        if over:  # the crossed edge is the under-strand, entries 0 -> 2
            x = [label, arc[k], half, arc[k + 1]] if from_right else \
                [label, arc[k + 1], half, arc[k]]
            sign = -1 if from_right else 1
        else:  # the strand is the under-strand; the crossed edge runs over it
            x = [arc[k], half, arc[k + 1], label] if from_right else \
                [arc[k], label, arc[k + 1], half]
            sign = 1 if from_right else -1
        touched.add(work.add(x, sign))
        touched.add(head[0])
    work.relabel_dart(start[0], start[1], arc[0])
    work.relabel_dart(end[0], end[1], arc[-1])
    touched |= {start[0], end[0]}
    pairs = [(work.xs[c][0], work.xs[c][2]) if over else (work.xs[c][1], work.xs[c][3])
             for c in passed]
    touched |= work.remove(set(passed), pairs)
    return {c for c in touched if c in work.xs}


def reroute_in(work: WorkingCode) -> set[int] | None:
    """Reroute one strand of the working code where that saves crossings.

    Returns the crossings touched (to look for new kinks and bigons), or
    None when no strand can be shortened.
    """
    if not work.xs:
        return None
    face = work.face_of_corner()
    sides = work.sides(face)
    adjacent: dict[int, list[tuple[int, int]]] = {}
    for label, (r, l) in sides.items():
        if r != l:
            adjacent.setdefault(r, []).append((label, l))
            adjacent.setdefault(l, []).append((label, r))
    for over in (True, False):
        found = [s for s in strands(work, over) if s[2]]
        found.sort(key=lambda s: (-len(s[2]), s[0]))
        for start, end, passed, edges in found:
            if start[0] in passed or end[0] in passed:
                continue  # the strand passes over (under) its own end crossing
            steps = _path(adjacent, set(sides[edges[0]]), set(sides[edges[-1]]), set(edges),
                          len(passed))
            if steps is not None:
                return _lay_down(work, start, end, passed, steps, sides, over)
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
    O(n) for the faces, then a search per strand tried that stops at the
    strand's own length, so short strands cost little.
    """
    work = WorkingCode(diagram)
    if reroute_in(work) is None:
        return None
    return work.diagram()
