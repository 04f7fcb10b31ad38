"""Linking numbers, the linking matrix and sublinks of an oriented link diagram.

Components are numbered as :meth:`knotsift.diagram.Diagram.components` lists
them (ordered by their smallest edge label), followed by the free loops.
"""

from __future__ import annotations

from typing import Iterable

from ..diagram import Diagram, join_edges
from ..errors import InvariantError

__all__ = ["linking_matrix", "sublink", "component_knots", "split_parts", "reverse_components"]


def linking_matrix(diagram: Diagram) -> list[list[int]]:
    """The symmetric matrix of pairwise linking numbers (zero diagonal).

    Parameters
    ----------
    diagram : Diagram

    Returns
    -------
    list of list of int
        Entry ``[a][b]`` is half the sum of the signs of the crossings
        between components ``a`` and ``b`` (common practice).

    Examples
    --------
    >>> linking_matrix(Diagram([(1, 3, 2, 4), (3, 1, 4, 2)]))  # positive Hopf link
    [[0, 1], [1, 0]]
    """
    n = diagram.number_of_components()
    comp = diagram.component_of_label()
    half = [[0] * n for _ in range(n)]
    for x, s in zip(diagram.crossings, diagram.signs(), strict=True):
        a, b = comp[x[0]], comp[x[1]]
        if a != b:
            half[a][b] += s
            half[b][a] += s
    for a in range(n):
        for b in range(n):
            if half[a][b] % 2:
                raise RuntimeError("internal error: odd number of crossings between two "
                                   "closed components")
            half[a][b] //= 2
    return half


def _check_subset(diagram: Diagram, keep: Iterable[int]) -> list[int]:
    n = diagram.number_of_components()
    keep = sorted(set(keep))
    if not keep or any(isinstance(k, bool) or not isinstance(k, int) or not 0 <= k < n
                       for k in keep):
        raise InvariantError(f"components must be a non-empty set of indices 0..{n - 1}, "
                             f"got {keep!r}", value=keep)
    return keep


def sublink(diagram: Diagram, keep: Iterable[int]) -> Diagram:
    """The diagram of the components ``keep`` alone (the others erased).

    Crossings between a kept and an erased component disappear; the kept
    strand runs straight through.  The kept components keep their directions
    (fixed by their own under-passages; a component that passes under no kept
    component lies above the rest and is split from it).

    Examples
    --------
    >>> hopf = Diagram([(1, 3, 2, 4), (3, 1, 4, 2)])
    >>> sublink(hopf, [0]).number_of_crossings(), sublink(hopf, [0]).number_of_components()
    (0, 1)
    """
    keep_set = set(_check_subset(diagram, keep))
    comps = diagram.components()
    comp = diagram.component_of_label()
    drop: set[int] = set()
    pairs: list[tuple[int, int]] = []
    for i, x in enumerate(diagram.crossings):
        under, over = comp[x[0]] in keep_set, comp[x[1]] in keep_set
        if under and over:
            continue
        drop.add(i)
        if under:
            pairs.append((x[0], x[2]))
        if over:
            pairs.append((x[1], x[3]))
    loops = sum(1 for k in range(len(comps), diagram.number_of_components()) if k in keep_set)
    if len(drop) == diagram.number_of_crossings():
        return Diagram([], free_loops=len(keep_set))
    return join_edges(diagram.crossings, drop, pairs, loops)


def component_knots(diagram: Diagram) -> list[Diagram]:
    """Each component alone, as a knot diagram."""
    return [sublink(diagram, [k]) for k in range(diagram.number_of_components())]


def split_parts(diagram: Diagram) -> list[list[int]]:
    """Components grouped by the connected pieces of the diagram (its visible split parts).

    Two components are in one part when a chain of crossings joins them.  A
    diagram in one piece may still be a split link; several pieces always
    are split from each other.
    """
    n = diagram.number_of_components()
    comp = diagram.component_of_label()
    parent = list(range(n))

    def find(a: int) -> int:
        while parent[a] != a:
            parent[a] = parent[parent[a]]
            a = parent[a]
        return a

    for x in diagram.crossings:
        a, b = find(comp[x[0]]), find(comp[x[1]])
        if a != b:
            parent[max(a, b)] = min(a, b)
    groups: dict[int, list[int]] = {}
    for k in range(n):
        groups.setdefault(find(k), []).append(k)
    return sorted(groups.values())


def reverse_components(diagram: Diagram, reverse: Iterable[int]) -> Diagram:
    """The same diagram with the listed components running the other way.

    A crossing whose under-strand is reversed is rotated to start at its new
    incoming under-strand; reversing only the over-strand keeps the quad and
    changes the crossing's sign.
    """
    rev = set(_check_subset(diagram, reverse)) if reverse else set()
    if not rev:
        return diagram
    comp = diagram.component_of_label()
    xs = []
    for x in diagram.crossings:
        if comp[x[0]] in rev:
            xs.append((x[2], x[3], x[0], x[1]))
        else:
            xs.append(tuple(x))
    return Diagram(xs, diagram.free_loops)
