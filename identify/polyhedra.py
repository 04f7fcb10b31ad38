"""Conway's basic polyhedra, with tangles substituted at their vertices.

A basic polyhedron is a 4-valent planar graph without bigons.  Each vertex
is a small disc with four edges leaving it; a tangle is put in the disc and
its four ends are joined along the edges.  The tangle ``1`` at every vertex
gives an alternating diagram (Conway 1970).

Every polyhedron here is built as the medial graph of a plane graph ``G``:
one vertex on each edge of ``G``, joined round each corner of ``G``.  Its
faces are coloured: *shaded* faces hold the vertices of ``G``, *white* faces
the faces of ``G``.  A tangle goes into a vertex in one of two ways (the
frame):

* plain: its north and south sides (between the ends NW-NE and SW-SE) face
  shaded regions, its west and east sides white ones;
* reflected: the tangle ``a`` is put in as ``a0`` (reflected in its NW-SE
  diagonal), so its north side faces a white region.

Both keep the tangle ``1`` of one type, so the all-``1`` filling stays
alternating, and they differ for ``2`` and ``20``.  Which of the two gaps of
a side is NW is fixed by the listed direction of the ``G``-edge; the other
choice is a half turn, a mutation, which leaves rational tangles unchanged.

Vertex numbering and frames (the project's reading of Conway 1970, chosen
by the check described under "Validation"):

``1*``
    One vertex with two loops: NW joined to NE and SW to SE, so ``1*a`` is
    the numerator closure of ``a``.
``6*``
    The octahedron (the shadow of the Borromean rings), medial graph of the
    tetrahedron with centre ``o`` and outer triangle ``p, q, r``.  Vertices
    1..6 sit on the ``G``-edges ``op, pq, qo, ro, rp, qr``.  Vertices 2, 3, 4,
    5 run in order along one component of the Borromean shadow (a square,
    with 2 opposite 4 and 3 opposite 5); 1 and 6 are the two remaining,
    opposite vertices; 1, 2, 3 bound a white triangle.  Vertices 3 and 5 are
    reflected, the others plain.
``8*``
    The square antiprism (the shadow of 8_18), medial graph of the square
    pyramid.  Odd vertices 1, 3, 5, 7 go round the shaded square (the
    spokes), even vertices round the white square (the rim), in zigzag
    order: ``k`` touches ``k + 1``; 1 touches 3 and is opposite 5 on its
    square.  Even vertices are reflected.
``9*``
    Medial graph of the triangular prism (the shadow of 9_40).  Vertices 1,
    3, 5 lie on the inner triangle, 2, 4, 6 on the three edges joining the
    triangles (2 touches 1 and 3), 7, 8, 9 on the outer triangle.  Vertices on
    the triangles are reflected, those on the joining edges plain.
``10*``
    The pentagonal antiprism (the shadow of 10_123), medial graph of the
    pentagonal pyramid, numbered and framed like ``8*``.
``10**``, ``10***``
    The other two 10-vertex 4-valent planar graphs without bigons: the
    medial graphs of the triangular prism with one square face cut by a
    diagonal, and of two tetrahedra-without-an-edge glued at their two
    free vertices (this one has a 4-edge cut).  All frames plain.  The names
    are from memory and unchecked: no prime knot through 10 crossings uses
    them (filled with ``1`` they give links of 2 and 4 components).

Validation
----------
Conway's drawings fix the numbering and frames, but we could check them only
against recalled values.  Every polyhedral row of
``reference/prime_knots.csv`` was built under all orderings of the vertices
and all frames, and its determinant compared with
``reference/alexander.csv``; the choice above agrees with the most rows:
39 of 48 on ``6*`` (all nine rows of 8 and 9 crossings, which also agree in
the Alexander polynomial), 10 of 14 on ``8*``, 3 of 3 on ``9*`` and 1 of 1 on
``10*``.  It is unique up to the symmetries of the polyhedron (and mirror
image).  Independently, 19 of the 20 amphichiral knots of
``reference/amphichiral.csv`` come out with a symmetric Jones polynomial,
among them 8_17 ``.2.2``, 10_88 ``.21.21``, 10_99 ``.2.2.20.20``, 10_115
``8*20.20`` and 10_118 ``8*2:.2``; the exception is 10_109 ``2.2.2.2``.  The
reading of ``.`` and ``:`` is in :mod:`knotsift.notations.conway_algebraic`.
"""

from __future__ import annotations

import math
from typing import Iterable, Mapping, Sequence

from .diagram import Diagram
from .errors import DiagramError
from .tangle import Tangle, _glue, _to_diagram, integer_tangle

__all__ = ["Polyhedron", "BASIC_POLYHEDRA", "basic_polyhedron", "medial_polyhedron"]


class Polyhedron:
    """A 4-valent planar graph with a tangle frame at every vertex.

    Parameters
    ----------
    name : str
        Conway's name, such as ``"6*"``.
    vertices : sequence of 4-sequences of int
        For each vertex the edge ids leaving it at the tangle corners NW, NE,
        SW, SE (counter-clockwise these are NW, SW, SE, NE).  Every edge id
        appears exactly twice.

    Raises
    ------
    DiagramError
        When a vertex does not list four edges or an edge id does not appear
        exactly twice.

    Examples
    --------
    >>> octahedron = basic_polyhedron("6*")
    >>> octahedron.number_of_vertices()
    6
    >>> octahedron.substitute().number_of_components()  # the Borromean rings
    3
    """

    __slots__ = ("name", "_vertices", "_reflected")

    def __init__(self, name: str, vertices: Sequence[Sequence[int]],
                 reflected: Iterable[int] = ()):
        vs = [tuple(v) for v in vertices]
        count: dict[int, int] = {}
        for i, v in enumerate(vs):
            if len(v) != 4:
                raise DiagramError(f"a polyhedron vertex needs 4 edges, got {list(v)!r}",
                                   value=v, where=f"vertex {i + 1}")
            for e in v:
                count[e] = count.get(e, 0) + 1
        bad = sorted(e for e, c in count.items() if c != 2)
        if bad:
            raise DiagramError(f"edge {bad[0]} of the polyhedron must have 2 ends, found "
                               f"{count[bad[0]]}", value=bad[0])
        self.name = name
        self._vertices: tuple[tuple[int, int, int, int], ...] = tuple(vs)  # type: ignore
        self._reflected = frozenset(reflected)
        for v in self._reflected:
            self._check_vertex(v)

    def number_of_vertices(self) -> int:
        return len(self._vertices)

    def vertex_edges(self, v: int) -> tuple[int, int, int, int]:
        """Edge ids at the corners NW, NE, SW, SE of vertex ``v`` (numbered from 1)."""
        self._check_vertex(v)
        return self._vertices[v - 1]

    def is_reflected(self, v: int) -> bool:
        """True when a tangle ``a`` at vertex ``v`` goes in as ``a0`` (see the module docstring)."""
        self._check_vertex(v)
        return v in self._reflected

    def neighbours(self, v: int) -> set[int]:
        """The vertices joined to vertex ``v`` by an edge (numbered from 1)."""
        self._check_vertex(v)
        mine = set(self._vertices[v - 1])
        return {w + 1 for w, es in enumerate(self._vertices)
                if w != v - 1 and mine & set(es)}

    def _check_vertex(self, v: int) -> None:
        n = len(self._vertices)
        if isinstance(v, bool) or not isinstance(v, int) or not 1 <= v <= n:
            raise ValueError(f"vertex must be 1..{n} for {self.name}, got {v!r}")

    def substitute(self, tangles: Sequence[Tangle | None] | Mapping[int, Tangle] = ()
                   ) -> Diagram:
        """The diagram with ``tangles`` at the vertices (the tangle ``1`` elsewhere).

        Parameters
        ----------
        tangles : sequence or mapping
            A sequence gives the tangles of vertices 1, 2, ... in order
            (``None`` for ``1``; it may be shorter than the number of
            vertices); a mapping is ``{vertex number: tangle}``.

        Returns
        -------
        Diagram
            With ``sum(crossings of the tangles)`` crossings.

        Raises
        ------
        ValueError
            When more tangles than vertices are given or a vertex number is
            out of range.

        Examples
        --------
        >>> from knotsift.tangle import integer_tangle
        >>> basic_polyhedron("6*").substitute([None, integer_tangle(2)]).number_of_crossings()
        7
        """
        n = len(self._vertices)
        chosen: list[Tangle | None] = [None] * n
        if isinstance(tangles, Mapping):
            for v, t in tangles.items():
                self._check_vertex(v)
                chosen[v - 1] = t
        else:
            tangles = list(tangles)
            if len(tangles) > n:
                raise ValueError(f"{self.name} has {n} vertices, got {len(tangles)} tangles")
            chosen[:len(tangles)] = tangles
        one = integer_tangle(1)
        quads: list = []
        loops = 0
        ends_of_edge: dict[int, list[int]] = {}
        offset = 0
        for v, t in enumerate(chosen):
            t = one if t is None else t
            if v + 1 in self._reflected:
                t = t.reflection()
            labels = t.labels()
            shift = offset - min(labels)
            quads += [tuple(e + shift for e in q) for q in t.crossings]
            loops += t.free_loops
            for e, end in zip(self._vertices[v], t.ends, strict=True):
                ends_of_edge.setdefault(e, []).append(end + shift)
            offset += max(labels) - min(labels) + 1
        pairs = [(a, b) for a, b in ends_of_edge.values()]
        quads, _, loops = _glue(quads, (), pairs, loops)
        return _to_diagram(quads, loops)

    def __repr__(self) -> str:
        return f"Polyhedron({self.name!r}, {len(self._vertices)} vertices)"


def medial_polyhedron(name: str, points: Sequence[tuple[float, float]],
                      edges: Sequence[tuple[int, int]], white_west_east: bool = True,
                      reflected: Iterable[int] = ()) -> Polyhedron:
    """The medial graph of a straight-line plane graph, one vertex per edge in the given order.

    Parameters
    ----------
    name : str
    points : sequence of (x, y)
        Positions of the vertices of ``G`` (a straight-line planar drawing).
    edges : sequence of (int, int)
        The edges ``(u, w)`` of ``G``; vertex ``k + 1`` of the polyhedron sits on
        ``edges[k]``, with ``u`` on the west side of its tangle when
        ``white_west_east`` is false, on the south side when true.
    white_west_east : bool, optional
        Turn each tangle so that its west and east sides face the faces of
        ``G`` (white regions); otherwise they face the vertices of ``G``.
    reflected : iterable of int, optional
        Vertex numbers (from 1) where a tangle ``a`` is put in as ``a0``.

    Notes
    -----
    Around the midpoint of an edge ``u -> w`` the four corners are, counter-
    clockwise from the one after the edge at ``u``: (u, next), (u, previous),
    (w, next), (w, previous); these become the tangle corners NW, SW, SE, NE.
    """
    around: dict[int, list[int]] = {}
    for k, (u, w) in enumerate(edges):
        around.setdefault(u, []).append(k)
        around.setdefault(w, []).append(k)

    def angle(x: int, k: int) -> float:
        u, w = edges[k]
        y = w if u == x else u
        return math.atan2(points[y][1] - points[x][1], points[y][0] - points[x][0])

    rotation = {x: sorted(ks, key=lambda k: angle(x, k)) for x, ks in around.items()}

    def corner(x: int, k: int, step: int) -> tuple[int, int]:
        """The corner at ``x`` between edge ``k`` and its neighbour ``step`` (+1 ccw, -1 cw)."""
        ks = rotation[x]
        j = ks[(ks.index(k) + step) % len(ks)]
        return (x, k) if step > 0 else (x, j)  # a corner is named by (vertex, first edge)

    ids: dict[tuple[int, int], int] = {}
    vertices = []
    for k, (u, w) in enumerate(edges):
        nw, sw = corner(u, k, +1), corner(u, k, -1)
        se, ne = corner(w, k, +1), corner(w, k, -1)
        if white_west_east:  # a quarter turn: the sides facing u and w become N and S
            nw, sw, se, ne = ne, nw, sw, se
        vertices.append(tuple(ids.setdefault(c, len(ids) + 1) for c in (nw, ne, sw, se)))
    return Polyhedron(name, vertices, reflected)


def _one_star() -> Polyhedron:
    return Polyhedron("1*", [(1, 1, 2, 2)])


def _regular(n: int) -> list[tuple[float, float]]:
    return [(math.cos(2 * math.pi * k / n + 0.1), math.sin(2 * math.pi * k / n + 0.1))
            for k in range(n)]


def _pyramid(n: int, name: str) -> Polyhedron:
    """Medial graph of the n-gonal pyramid (the n-gonal antiprism), zigzag order.

    Odd vertices lie on the spokes (round the shaded n-gon of the apex), even
    ones on the rim (round the white n-gon); tangles at even vertices go in
    reflected.
    """
    points = [(0.0, 0.0)] + _regular(n)
    edges = []
    for k in range(1, n + 1):
        edges.append((0, k))  # a spoke
        edges.append((k, k % n + 1))  # the rim edge after it
    return medial_polyhedron(name, points, edges, reflected=range(2, 2 * n + 1, 2))


def _six_star() -> Polyhedron:
    o, p, q, r = 0, 1, 2, 3
    points = [(0.0, 0.0)] + _regular(3)
    edges = [(o, p), (p, q), (q, o), (r, o), (r, p), (q, r)]
    return medial_polyhedron("6*", points, edges, reflected=(3, 5))


def _nine_star() -> Polyhedron:
    # inner triangle 0, 1, 2 and outer triangle 3, 4, 5, with spokes k -- k + 3;
    # odd vertices 1, 3, 5 on the inner triangle, 2, 4, 6 on spokes, 7, 8, 9 outside
    points = [(0.5 * x, 0.5 * y) for x, y in _regular(3)] + _regular(3)
    edges = [(0, 1), (1, 4), (1, 2), (2, 5), (2, 0), (0, 3), (3, 4), (4, 5), (5, 3)]
    return medial_polyhedron("9*", points, edges, reflected=(1, 3, 5, 7, 8, 9))


def _ten_double_star() -> Polyhedron:
    # the triangular prism with its square face 0-1-4-3 cut by the diagonal 0--4
    points = [(0.5 * x, 0.5 * y) for x, y in _regular(3)] + _regular(3)
    edges = [(0, 3), (0, 1), (1, 4), (1, 2), (2, 5), (2, 0), (3, 4), (4, 5), (5, 3), (0, 4)]
    return medial_polyhedron("10**", points, edges)


def _ten_triple_star() -> Polyhedron:
    # two copies of the tetrahedron without the edge a--b, glued at a and b
    points = [(0.0, 1.0), (0.0, -1.0), (-0.6, 0.0), (-1.6, 0.0), (0.6, 0.0), (1.6, 0.0)]
    a, b, c1, d1, c2, d2 = range(6)
    edges = [(a, c1), (c1, b), (b, d1), (d1, a), (c1, d1),
             (a, c2), (c2, b), (b, d2), (d2, a), (c2, d2)]
    return medial_polyhedron("10***", points, edges)


BASIC_POLYHEDRA: dict[str, Polyhedron] = {
    p.name: p for p in (_one_star(), _six_star(), _pyramid(4, "8*"), _nine_star(),
                        _pyramid(5, "10*"), _ten_double_star(), _ten_triple_star())
}


def basic_polyhedron(name: str) -> Polyhedron:
    """The basic polyhedron called ``name``: ``"1*"``, ``"6*"``, ``"8*"``, ``"9*"``, ``"10*"``, ...

    Raises
    ------
    KeyError
        For a name not in :data:`BASIC_POLYHEDRA`.
    """
    try:
        return BASIC_POLYHEDRA[name]
    except KeyError:
        raise KeyError(f"no basic polyhedron {name!r}; known: "
                       f"{', '.join(BASIC_POLYHEDRA)}") from None
