"""Connected-sum factors seen in a diagram: splitting along decomposing circles.

A decomposing circle is a simple closed curve in the plane that meets the
diagram in exactly two points, both on edges, and has crossings on both
sides.  Such a circle runs through two faces and crosses two edges, so it
shows in the PD code as two different edges that border the same pair of
faces.  Cutting the diagram along it and closing each side with a short arc
gives two diagrams whose connected sum is the original (common practice).

Splitting recursively and simplifying each piece gives the factors that the
diagram displays.  A diagram of a composite knot need not display its
split, so a single factor is no proof of primality; conversely, every split
found is a true connected-sum decomposition.  A reduced alternating diagram
of a composite knot always displays it (Menasco 1984, Topology 23,
"Closed incompressible surfaces in alternating knot and link complements";
from memory).
"""

from __future__ import annotations

from .diagram import Diagram

__all__ = ["connected_sum_factors", "decomposing_edges", "split_along"]


def _edge_faces(diagram: Diagram) -> dict[int, tuple[int, int]]:
    """For each edge label, the two faces it borders (a sorted pair of face indices)."""
    face_of = {}
    for f, face in enumerate(diagram.faces()):
        for corner in face:
            face_of[corner] = f
    out = {}
    for i, x in enumerate(diagram.crossings):
        for p, label in enumerate(x):
            if label not in out:
                a, b = face_of[(i, p)], face_of[(i, (p - 1) % 4)]
                out[label] = (min(a, b), max(a, b))
    return out


def _side(diagram: Diagram, start: int, cut: set[int]) -> set[int]:
    """Crossings reachable from crossing ``start`` without passing along the edges ``cut``."""
    seen = {start}
    stack = [start]
    xs = diagram.crossings
    while stack:
        i = stack.pop()
        for p in range(4):
            if xs[i][p] in cut:
                continue
            j = diagram.other_end(i, p)[0]
            if j not in seen:
                seen.add(j)
                stack.append(j)
    return seen


def _head(diagram: Diagram, label: int) -> tuple[int, int]:
    """The dart where edge ``label`` arrives."""
    for i, x in enumerate(diagram.crossings):
        for p, e in enumerate(x):
            if e == label and diagram.is_incoming(i, p):
                return i, p
    raise KeyError(label)


def decomposing_edges(diagram: Diagram) -> tuple[int, int] | None:
    """Two edges on a common pair of faces with crossings on both sides, or None.

    Parameters
    ----------
    diagram : Diagram

    Returns
    -------
    (e, f) or None
        Edge labels; cutting them splits the diagram into two parts.

    Examples
    --------
    >>> t = Diagram([(1, 5, 2, 4), (3, 1, 4, 6), (5, 3, 6, 2)])
    >>> decomposing_edges(t) is None
    True
    >>> decomposing_edges(t.connected_sum(t)) is not None
    True
    """
    if diagram.number_of_crossings() < 2:
        return None
    by_faces: dict[tuple[int, int], list[int]] = {}
    for label, pair in _edge_faces(diagram).items():
        if pair[0] != pair[1]:
            by_faces.setdefault(pair, []).append(label)
    comp = diagram.component_of_label()
    n = diagram.number_of_crossings()
    for labels in by_faces.values():
        if len(labels) < 2:
            continue
        labels.sort()
        for a in range(len(labels)):
            for b in range(a + 1, len(labels)):
                e, f = labels[a], labels[b]
                if comp[e] != comp[f]:
                    continue
                side = _side(diagram, _head(diagram, e)[0], {e, f})
                if 0 < len(side) < n:
                    return e, f
    return None


def split_along(diagram: Diagram, e: int, f: int) -> tuple[Diagram, Diagram]:
    """The two diagrams obtained by cutting edges ``e`` and ``f`` and closing each side.

    The side entered along ``e`` is closed by joining the end of ``f`` to the
    start of ``e``'s continuation; the other side the other way round.  Free
    loops stay with the first part.
    """
    xs = diagram.crossings
    side = _side(diagram, _head(diagram, e)[0], {e, f})
    first = [tuple(e if label == f else label for label in x)
             for i, x in enumerate(xs) if i in side]
    second = [tuple(f if label == e else label for label in x)
              for i, x in enumerate(xs) if i not in side]
    # cutting a valid planar code along a decomposing circle keeps it valid and planar
    return Diagram._trusted(first, diagram.free_loops), Diagram._trusted(second, 0)


def connected_sum_factors(diagram: Diagram, simplify_pieces: bool = True) -> list[Diagram]:
    """The connected-sum factors displayed by a diagram, split recursively.

    Parameters
    ----------
    diagram : Diagram
    simplify_pieces : bool
        Simplify the diagram and every piece (default), so that splits hidden
        behind removable crossings show and trivial pieces vanish.

    Returns
    -------
    list of Diagram
        The non-trivial factors (each without a displayed split), in the
        order met; a single element when no split is seen (the simplified
        diagram itself, also when it is the unknot).

    Examples
    --------
    >>> t = Diagram([(1, 5, 2, 4), (3, 1, 4, 6), (5, 3, 6, 2)])
    >>> [f.number_of_crossings() for f in connected_sum_factors(t.connected_sum(t.mirror()))]
    [3, 3]

    Notes
    -----
    Each split costs O(n) for the faces plus the side search for each
    candidate pair; a diagram with k factors needs k - 1 splits.
    """
    from .simplify import simplify

    def tidy(d: Diagram) -> Diagram:
        return simplify(d) if simplify_pieces else d

    whole = tidy(diagram)
    factors: list[Diagram] = []
    stack = [whole]
    while stack:
        d = stack.pop()
        cut = decomposing_edges(d)
        if cut is None:
            if d.number_of_crossings() > 0:
                factors.append(d)
            continue
        a, b = split_along(d, *cut)
        stack.extend((tidy(b), tidy(a)))
    return factors or [whole]
