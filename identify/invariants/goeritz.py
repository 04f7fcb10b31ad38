"""Checkerboard colourings and Goeritz matrices of link diagrams.

Conventions (fixed here, checked in ``tests/invariants/test_signature.py``).
Corner ``k`` of a crossing lies between its entries ``k`` and ``k + 1``
counter-clockwise, so corners 0 and 2 are opposite, as are 1 and 3, and a
checkerboard colouring gives opposite corners the same colour.  One colour is
*shaded*: the shaded regions joined by a half-twisted band at every crossing
form a spanning surface F.

* Incidence number: ``eta(c) = +1`` when corners 1 and 3 of crossing ``c``
  are shaded and ``-1`` when corners 0 and 2 are.  Drawn with the shaded
  corners above and below the crossing, ``eta = +1`` exactly when the
  over-strand runs from lower left to upper right (the strands' directions
  do not matter).
* Type: a crossing is of *type II* when its oriented smoothing joins its two
  shaded corners (F is not orientable there compatibly with the strands),
  otherwise of type I.  The oriented smoothing of a positive crossing joins
  corners 1 and 3 and that of a negative one joins 0 and 2, so a crossing is
  of type II exactly when ``eta(c)`` equals its sign.
* Goeritz matrix: indexed by the unshaded regions, ``G[u][v] = -sum eta(c)``
  over the crossings where regions ``u != v`` meet at opposite corners and
  ``G[u][u] = -sum_{v != u} G[u][v]``.  The *reduced* matrix leaves out one
  unshaded region.  It represents the Gordon-Litherland form of F on H_1(F)
  (S + S^T for a Seifert matrix S when F is orientable).
* Correction: ``mu = sum eta(c)`` over the crossings of type II.

With these rules ``sign(G) - mu`` is the signature in the convention where
the right-handed trefoil has signature -2, for either choice of shaded colour
(Gordon and Litherland 1978).  A diagram with several connected pieces is
treated one piece at a time; free loops are split unknots and carry no
crossings.
"""

from __future__ import annotations

from dataclasses import dataclass

from ..diagram import Diagram
from ..partition import Partition

__all__ = ["GoeritzForm", "checkerboard_colouring", "diagram_pieces", "goeritz_forms"]

Corner = tuple[int, int]


@dataclass(frozen=True)
class GoeritzForm:
    """The reduced Goeritz matrix and the correction term of one connected piece.

    Attributes
    ----------
    matrix : tuple of tuple of int
        The reduced Goeritz matrix (symmetric; possibly 0 x 0).
    correction : int
        ``mu``, the sum of ``eta`` over the crossings of type II.
    crossings : tuple of int
        Indices of the crossings of this piece.
    """

    matrix: tuple[tuple[int, ...], ...]
    correction: int
    crossings: tuple[int, ...]


def diagram_pieces(diagram: Diagram) -> list[list[int]]:
    """Crossing indices of each connected piece of the diagram's 4-valent graph."""
    n = diagram.number_of_crossings()
    parts = Partition(range(n))
    find = parts.find
    for i in range(n):
        for p in range(4):
            parts.join(i, diagram.other_end(i, p)[0])
    pieces: dict[int, list[int]] = {}
    for i in range(n):
        pieces.setdefault(find(i), []).append(i)
    return sorted(pieces.values())


def checkerboard_colouring(diagram: Diagram) -> tuple[list[list[Corner]], list[int]]:
    """The faces of the diagram and a colour 0 or 1 for each.

    Faces that share an edge get different colours.  In every connected
    piece, the face at corner 0 of the piece's lowest-numbered crossing has
    colour 0.

    Returns
    -------
    faces : list of list of (crossing, corner)
        As :meth:`knotsift.diagram.Diagram.faces`.
    colours : list of int
        ``colours[f]`` is the colour of ``faces[f]``.
    """
    faces = diagram.faces()
    face_of: dict[Corner, int] = {}
    for f, face in enumerate(faces):
        for corner in face:
            face_of[corner] = f
    colours = [-1] * len(faces)
    for piece in diagram_pieces(diagram):
        start = face_of[(piece[0], 0)]
        colours[start] = 0
        stack = [start]
        while stack:
            f = stack.pop()
            for i, k in faces[f]:
                g = face_of[(i, (k + 1) % 4)]
                if colours[g] < 0:
                    colours[g] = 1 - colours[f]
                    stack.append(g)
                elif colours[g] == colours[f]:
                    raise RuntimeError(
                        f"internal error: faces {f} and {g} meet at crossing {i} "
                        "but cannot be coloured differently")
    return faces, colours


def goeritz_forms(diagram: Diagram, shaded: int = 0) -> list[GoeritzForm]:
    """The reduced Goeritz matrix and correction of each connected piece.

    Parameters
    ----------
    diagram : Diagram
    shaded : {0, 1}
        Which colour of :func:`checkerboard_colouring` spans the surface; the
        matrices are indexed by the regions of the other colour.

    Returns
    -------
    list of GoeritzForm
        One per connected piece (none for a diagram without crossings).

    Examples
    --------
    >>> trefoil = Diagram([(1, 5, 2, 4), (3, 1, 4, 6), (5, 3, 6, 2)])
    >>> sorted((f.matrix, f.correction) for s in (0, 1) for f in goeritz_forms(trefoil, s))
    [(((-2, 1), (1, -2)), 0), (((3,),), 3)]

    Notes
    -----
    Linear in the number of crossings, plus the size of the matrices.  The
    rules are stated in the module docstring.

    References
    ----------
    L. Goeritz, "Knoten und quadratische Formen", Math. Z. 36 (1933).
    C. McA. Gordon and R. A. Litherland, "On the signature of a link",
    Invent. Math. 47 (1978).
    """
    if shaded not in (0, 1):
        raise ValueError(f"shaded must be 0 or 1, got {shaded!r}")
    faces, colours = checkerboard_colouring(diagram)
    face_of: dict[Corner, int] = {}
    for f, face in enumerate(faces):
        for corner in face:
            face_of[corner] = f
    signs = diagram.signs()
    forms = []
    for piece in diagram_pieces(diagram):
        entries: dict[tuple[int, int], int] = {}
        unshaded: list[int] = []
        seen: set[int] = set()
        correction = 0
        for i in piece:
            odd_shaded = colours[face_of[(i, 1)]] == shaded
            eta = 1 if odd_shaded else -1
            u = face_of[(i, 0 if odd_shaded else 1)]
            v = face_of[(i, 2 if odd_shaded else 3)]
            for f in (u, v):
                if f not in seen:
                    seen.add(f)
                    unshaded.append(f)
            if u != v:
                for a, b in ((u, v), (v, u)):
                    entries[(a, b)] = entries.get((a, b), 0) - eta
                for a in (u, v):
                    entries[(a, a)] = entries.get((a, a), 0) + eta
            if eta == signs[i]:
                correction += eta
        # every unshaded face of the piece touches one of its crossings
        unshaded.sort()
        keep = unshaded[1:]
        index = {f: k for k, f in enumerate(keep)}
        matrix = [[0] * len(keep) for _ in keep]
        for (a, b), value in entries.items():
            if a in index and b in index:
                matrix[index[a]][index[b]] = value
        forms.append(GoeritzForm(tuple(tuple(r) for r in matrix), correction, tuple(piece)))
    return forms
