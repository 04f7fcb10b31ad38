"""Diagram simplification by moves that never add crossings.

Two moves are applied until neither applies:

* nugatory crossings (the same face meets two opposite corners; Reidemeister I
  kinks are the simplest case) are untwisted away;
* Reidemeister II bigons (a strand passing over the same strand twice in a
  row) are pulled apart.

The knot or link type never changes.  The result is usually much smaller than
a diagram projected from 3D coordinates; it is not guaranteed to be minimal.
"""

from __future__ import annotations

from .diagram import Diagram, join_edges

__all__ = ["simplify", "remove_nugatory", "remove_bigon"]


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


def simplify(diagram: Diagram) -> Diagram:
    """A diagram of the same knot or link with no nugatory crossing and no R2 bigon.

    Parameters
    ----------
    diagram : Diagram

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
    Each pass costs O(n); the number of passes is at most n.
    """
    current = diagram
    while True:
        nxt = remove_nugatory(current)
        if nxt is None:
            nxt = remove_bigon(current)
        if nxt is None:
            break
        current = nxt
    if current.number_of_crossings() == 0:
        return Diagram([], current.free_loops)
    return current.standard_labels()
