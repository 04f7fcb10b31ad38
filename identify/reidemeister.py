"""Reidemeister moves that add crossings, and random scrambling of a diagram.

Used to test that invariants and identification do not depend on the diagram
chosen for a knot: a diagram scrambled by random moves and relabelled is the
same knot.
"""

from __future__ import annotations

import random

from .diagram import Diagram
from .errors import DiagramError

__all__ = ["add_kink", "add_bigon", "r3_triangles", "apply_r3", "r3_crossings", "is_r3_triangle",
           "scramble", "shuffle_labels"]


def _fresh(diagram: Diagram, k: int) -> list[int]:
    top = max((abs(e) for x in diagram.crossings for e in x), default=0)
    return list(range(top + 1, top + 1 + k))


def _heads_for(diagram: Diagram, keep: set[int]) -> dict[int, int]:
    """One unchanged edge per component with the crossing it runs into.

    A kink's own edge runs from a crossing into the same crossing, so naming
    that crossing would not fix a direction: such edges are passed over.
    """
    heads = {}
    kinks = {e for x in diagram.crossings for e in x if x.count(e) == 2}
    for comp in diagram.components():
        for label in comp:
            if label in keep or label in kinks:
                continue
            for i, x in enumerate(diagram.crossings):
                for p, e in enumerate(x):
                    if e == label and diagram.is_incoming(i, p):
                        heads[label] = i
                        break
                if label in heads:
                    break
            break
    return heads


def add_kink(diagram: Diagram, edge: int, sign: int = 1, left: bool = True) -> Diagram:
    """Reidemeister I: put a curl of the given sign on ``edge`` (on its left or right)."""
    if sign not in (1, -1):
        raise DiagramError(f"sign must be +1 or -1, got {sign!r}", value=sign)
    xs = [list(x) for x in diagram.crossings]
    if not xs:
        raise DiagramError("add_kink needs a diagram with at least one crossing")
    tail = head = None
    for i, x in enumerate(diagram.crossings):
        for p, e in enumerate(x):
            if e == edge:
                if diagram.is_incoming(i, p):
                    head = (i, p)
                else:
                    tail = (i, p)
    if tail is None or head is None:
        raise DiagramError(f"no edge labelled {edge} in the diagram", value=edge)
    a, y, z = _fresh(diagram, 3)
    # The strand runs a -> (first passage) -> y (the loop) -> (second passage) -> z.
    # Counter-clockwise, the curl on the left is (a, y, y, z), on the right (a, z, y, y);
    # each may start at the first passage (first passage under) or at the second.
    cycle = (a, y, y, z) if left else (a, z, y, y)
    second = 1 if left else 3
    xs[tail[0]][tail[1]] = a
    xs[head[0]][head[1]] = z
    for start in (0, second):
        new = cycle[start:] + cycle[:start]
        result = Diagram([tuple(x) for x in xs] + [new], diagram.free_loops)
        if result.signs()[-1] == sign:
            return result
    raise AssertionError("unreachable: one passage order gives each sign")


def add_bigon(diagram: Diagram, face: int, first: int, second: int, over: bool = True) -> Diagram:
    """Reidemeister II: push one edge of a face over (or under) another edge of it.

    Parameters
    ----------
    face : int
        Index into ``diagram.faces()``.
    first, second : int
        Positions of two corners of the face; the edges leaving them are used.
    over : bool
        Whether the first edge's finger passes over the second edge.
    """
    faces = diagram.faces()
    corners = faces[face]
    if first == second or not (0 <= first < len(corners) and 0 <= second < len(corners)):
        raise DiagramError("add_bigon needs two different corners of the face")
    xs = [list(x) for x in diagram.crossings]
    (pi, pk), (qi, qk) = corners[first], corners[second]
    pe = (pi, (pk + 1) % 4)   # dart where edge e leaves P1 along the face walk
    qe = (qi, (qk + 1) % 4)
    e = xs[pe[0]][pe[1]]
    f = xs[qe[0]][qe[1]]
    if e == f:
        raise DiagramError("add_bigon needs two different edges")
    pe2 = diagram.other_end(*pe)
    qe2 = diagram.other_end(*qe)
    ea, eb, ec, fa, fb, fc = _fresh(diagram, 6)
    c1, c2 = len(xs), len(xs) + 1
    if over:   # e passes over f: f is the under-strand (entries 0 and 2)
        q1 = (fb, ea, fc, eb)
        q2 = (fa, ec, fb, eb)
    else:
        q1 = (ea, fc, eb, fb)
        q2 = (ec, fb, eb, fa)
    xs[pe[0]][pe[1]] = ea
    xs[pe2[0]][pe2[1]] = ec
    xs[qe[0]][qe[1]] = fa
    xs[qe2[0]][qe2[1]] = fc
    # directions: the face walk runs e from P1 to P2 and f from Q1 to Q2
    heads = _heads_for(diagram, {e, f})
    e_forward = diagram.is_incoming(*pe2)
    f_forward = diagram.is_incoming(*qe2)
    heads[ea] = c1 if e_forward else pe[0]
    heads[fa] = c2 if f_forward else qe[0]
    # drop heads for components now fixed through ea / fa
    comp = diagram.component_of_label()
    for label in list(heads):
        if label not in (ea, fa) and comp.get(label) in (comp[e], comp[f]):
            del heads[label]
    return Diagram.from_planar_crossings([tuple(x) for x in xs] + [q1, q2], heads,
                                         diagram.free_loops)


def r3_triangles(diagram: Diagram) -> list[int]:
    """Indices of faces where a Reidemeister III move applies.

    A triangular face with three different crossings and three different edges,
    one of whose strands passes over (equivalently, one under) at both of its
    crossings on the triangle.
    """
    out = []
    xs = diagram.crossings
    for f, face in enumerate(diagram.faces()):
        if is_r3_triangle(xs, face):
            out.append(f)
    return out


def is_r3_triangle(crossings, corners) -> bool:
    """True when the face ``corners`` (in face-walk order) admits Reidemeister III.

    ``crossings`` may be a list or a mapping by crossing id.
    """
    if len(corners) != 3 or len({c for c, _ in corners}) != 3:
        return False
    xs = crossings
    (c1, k1), (c2, k2), (c3, k3) = corners
    edges = {xs[c1][(k1 + 1) % 4], xs[c2][(k2 + 1) % 4], xs[c3][(k3 + 1) % 4]}
    if len(edges) != 3:
        return False
    # strand S1 sits at entry k1+1 of c1 and entry k2 of c2, and so on round the face
    strands = [((k1 + 1) % 4, k2 % 4), ((k2 + 1) % 4, k3 % 4), ((k3 + 1) % 4, k1 % 4)]
    return any(a % 2 == 1 and b % 2 == 1 for a, b in strands)


def apply_r3(diagram: Diagram, face: int) -> Diagram:
    """Reidemeister III on a triangular face listed by :func:`r3_triangles`.

    Each of the three strands keeps its over/under relations, but meets its two
    crossings of the triangle in the opposite order; the outer edges are kept.
    """
    if face not in r3_triangles(diagram):
        raise DiagramError(f"face {face} is not a triangle where Reidemeister III applies",
                           value=face)
    xs = [list(x) for x in diagram.crossings]
    corners = diagram.faces()[face]
    new = r3_crossings(diagram.crossings, corners, _fresh(diagram, 3))
    for (c, _), x in zip(corners, new, strict=True):
        xs[c] = list(x)
    return Diagram([tuple(x) for x in xs], diagram.free_loops)


def r3_crossings(crossings, corners, fresh) -> list[tuple[int, int, int, int]]:
    """The three crossings of a triangle after Reidemeister III (no checks).

    Parameters
    ----------
    crossings : indexable of 4-sequences
        The PD code (a list or a mapping by crossing id).
    corners : three (crossing, corner) pairs
        The triangular face, as listed by ``Diagram.faces()``.
    fresh : three unused labels
        The new inner edges.
    """
    (c1, k1), (c2, k2), (c3, k3) = corners

    def at(c: int, k: int) -> int:
        return crossings[c][k % 4]

    # strands (running o -> crossing -> inner edge -> crossing -> o):
    # S1: o1b -> c1 -> e1 -> c2 -> o2a;  S2: o2b -> c2 -> e2 -> c3 -> o3a;
    # S3: o3b -> c3 -> e3 -> c1 -> o1a
    o1a, o1b = at(c1, k1 + 2), at(c1, k1 + 3)
    o2a, o2b = at(c2, k2 + 2), at(c2, k2 + 3)
    o3a, o3b = at(c3, k3 + 2), at(c3, k3 + 3)
    n1, n2, n3 = fresh  # the new inner edges of S1, S2, S3
    new1 = list(crossings[c1])  # becomes S1 x S3, now after S1 x S2 along S1
    new1[(k1 + 3) % 4], new1[(k1 + 1) % 4] = n1, o2a
    new1[k1 % 4], new1[(k1 + 2) % 4] = o3b, n3
    new2 = list(crossings[c2])  # S1 x S2
    new2[k2 % 4], new2[(k2 + 2) % 4] = o1b, n1
    new2[(k2 + 3) % 4], new2[(k2 + 1) % 4] = n2, o3a
    new3 = list(crossings[c3])  # S2 x S3
    new3[k3 % 4], new3[(k3 + 2) % 4] = o2b, n2
    new3[(k3 + 3) % 4], new3[(k3 + 1) % 4] = n3, o1a
    return [tuple(new1), tuple(new2), tuple(new3)]


def shuffle_labels(diagram: Diagram, rng: random.Random) -> Diagram:
    """Rename edges at random and reorder (and rotate nothing: PD entries keep their order)."""
    labels = sorted({e for x in diagram.crossings for e in x})
    new = rng.sample(range(1, 3 * len(labels) + 2), len(labels))
    mapping = dict(zip(labels, new))
    xs = [tuple(mapping[e] for e in x) for x in diagram.crossings]
    rng.shuffle(xs)
    return Diagram(xs, diagram.free_loops)


def scramble(diagram: Diagram, moves: int, rng: random.Random) -> Diagram:
    """Apply ``moves`` random Reidemeister moves (I and II adding crossings, III), then relabel."""
    current = diagram
    if not current.crossings:
        current = add_kink_to_circle()
    for _ in range(moves):
        roll = rng.random()
        if roll < 0.3:
            triangles = r3_triangles(current)
            if triangles:
                current = apply_r3(current, rng.choice(triangles))
                continue
        if roll < 0.55:
            labels = sorted({e for x in current.crossings for e in x})
            current = add_kink(current, rng.choice(labels), rng.choice((1, -1)),
                               rng.random() < 0.5)
        else:
            faces = current.faces()
            choices = [k for k, fc in enumerate(faces) if len(fc) >= 2]
            k = rng.choice(choices)
            a, b = rng.sample(range(len(faces[k])), 2)
            try:
                current = add_bigon(current, k, a, b, rng.random() < 0.5)
            except DiagramError:
                continue
    return shuffle_labels(current, rng)


def add_kink_to_circle() -> Diagram:
    """A one-crossing diagram of the unknot."""
    return Diagram([(1, 1, 2, 2)])
