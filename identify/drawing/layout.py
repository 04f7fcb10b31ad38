"""A planar layout of a diagram: crossing positions and smooth strands with gaps.

The PD code fixes the cyclic order of the four strands at every crossing, so
the diagram is already a plane graph up to the choice of the outer face.  To
place it, each connected part is refined into a simple triangulation:

* the crossing itself;
* one point per dart (the end of an edge at a crossing), so that loops and
  parallel edges become paths of three segments;
* one point per corner (the region between two neighbouring darts);
* one point per face, joined to every dart and corner point on its boundary.

Every triangle of this refinement is a crossing, a dart and a corner, or a face
point, and two boundary points.  The face with the most corners becomes the
outside: its point is dropped and its boundary is pinned to a circle, in the
counter-clockwise sense that keeps the picture from being mirrored.  Every
other point is placed at the average of its neighbours (a barycentric, or
Tutte, layout).  A triangulated disc with a strictly convex boundary and
positive averaging weights is drawn without any two edges crossing, so the
straight strands through crossing, dart and dart points form a planar drawing
of the diagram.

Strands are then smoothed through those points (cubic curves whose handles
are a fraction ``tension`` of each span), the under-strand is cut in a small
disc around each crossing, and the result is checked geometrically: no two
drawn pieces may meet, and each gap must be crossed by exactly its own
over-strand.  If smoothing broke that, the tension is lowered down to the
straight drawing, which the theorem guarantees.

References
----------
W. T. Tutte (1963), "How to draw a graph", Proc. London Math. Soc. 13, 743-767.
M. S. Floater (2003), "One-to-one piecewise linear mappings over
triangulations", Math. Comp. 72, 685-696.
"""

from __future__ import annotations

import math
import random
from dataclasses import dataclass, field

import numpy as np

from ..diagram import Diagram
from ..errors import DiagramError
from ..partition import Partition

__all__ = ["DiagramLayout", "Strand", "layout_diagram", "segment_crossings", "TENSIONS"]

#: Smoothing tried in turn; 0 is the straight drawing, planar by Tutte's theorem.
TENSIONS = (1.0, 0.6, 0.3, 0.0)
_SAMPLES = 8          # points per cubic span
_GAP = 0.4            # gap radius as a fraction of the room around the crossing
_PART_SPACING = 2.5   # distance between the centres of split parts (unit discs)
_TINY = 1 / 400       # a gap shorter than this fraction of the picture gets a note


@dataclass
class Strand:
    """One edge of the PD code as drawn: a polyline from its tail crossing to its head crossing.

    Attributes
    ----------
    label : int
        The PD edge label.
    component : int
        Index into ``Diagram.components()`` (free loops come after them).
    points : numpy.ndarray
        (m, 2) samples in the direction of travel, gaps not yet cut.
    """

    label: int
    component: int
    points: np.ndarray


@dataclass
class DiagramLayout:
    """A drawn diagram: positions, strands, and the pieces left after cutting the gaps.

    Attributes
    ----------
    diagram : Diagram
    crossings : numpy.ndarray
        (n, 2) position of each crossing.
    strands : dict
        ``{label: Strand}``.
    pieces : list of list of numpy.ndarray
        Per component, the drawn pieces in the direction of travel; a piece is
        an (m, 2) polyline.  A component that never passes under is one closed
        piece whose last point repeats its first.
    gaps : list of tuple
        Per crossing, the two ends of the gap cut in its under-strand.
    closed : list of bool
        Per component, True when it is drawn as one closed piece.
    tension : float
        The smoothing that passed the planarity check.
    """

    diagram: Diagram
    crossings: np.ndarray
    strands: dict
    pieces: list
    gaps: list
    closed: list
    tension: float
    notes: list = field(default_factory=list)

    def number_of_components(self) -> int:
        return len(self.pieces)

    def bounds(self) -> tuple[float, float, float, float]:
        """(xmin, ymin, xmax, ymax) of everything drawn."""
        pts = np.concatenate([p for comp in self.pieces for p in comp])
        return (float(pts[:, 0].min()), float(pts[:, 1].min()),
                float(pts[:, 0].max()), float(pts[:, 1].max()))

    def edge_midpoint(self, label: int) -> tuple[np.ndarray, np.ndarray]:
        """A point half way along an edge and the unit direction of travel there."""
        pts = self.strands[label].points
        seg = np.linalg.norm(np.diff(pts, axis=0), axis=1)
        cum = np.concatenate([[0.0], np.cumsum(seg)])
        half = cum[-1] / 2
        k = int(np.searchsorted(cum, half, side="right")) - 1
        k = min(max(k, 0), len(seg) - 1)
        t = 0.0 if seg[k] == 0 else (half - cum[k]) / seg[k]
        direction = pts[k + 1] - pts[k]
        norm = float(np.linalg.norm(direction)) or 1.0
        return pts[k] + t * (pts[k + 1] - pts[k]), direction / norm


# -- the triangulated refinement ------------------------------------------------
def _parts(diagram: Diagram) -> list[list[int]]:
    """Crossing indices of each connected part of the diagram's graph."""
    n = diagram.number_of_crossings()
    parts = Partition(range(n))
    for i in range(n):
        for p in range(4):
            parts.join(i, diagram.other_end(i, p)[0])
    groups: dict[int, list[int]] = {}
    for i in range(n):
        groups.setdefault(parts.find(i), []).append(i)
    return sorted(groups.values())


def _part_positions(diagram: Diagram, members: list[int], faces: list, rng: random.Random
                    ) -> dict:
    """Barycentric positions of the refinement's points for one connected part."""
    inside = set(members)
    my_faces = [f for f in faces if f[0][0] in inside]
    size = max(len(f) for f in my_faces)
    outer_choices = [k for k, f in enumerate(my_faces) if len(f) == size]
    outer = my_faces[outer_choices[rng.randrange(len(outer_choices))]]

    def boundary(face):
        pts = []
        for (i, p) in face:
            j, q = diagram.other_end(i, (p + 1) % 4)
            pts += [("k", i, p), ("d", i, (p + 1) % 4), ("d", j, q)]
        return pts

    adj: dict[tuple, set] = {}

    def join(a, b):
        adj.setdefault(a, set()).add(b)
        adj.setdefault(b, set()).add(a)

    for i in members:
        for p in range(4):
            join(("c", i), ("d", i, p))
            join(("c", i), ("k", i, p))
            join(("k", i, p), ("d", i, p))
            join(("k", i, p), ("d", i, (p + 1) % 4))
            j, q = diagram.other_end(i, p)
            join(("d", i, p), ("d", j, q))
    for n, face in enumerate(my_faces):
        if face is outer:
            continue
        for v in boundary(face):
            join(("f", n), v)
    ring = boundary(outer)
    pos: dict[tuple, np.ndarray] = {}
    m = len(ring)
    start = rng.random() * 2 * math.pi
    for t, v in enumerate(ring):
        a = start + 2 * math.pi * t / m   # counter-clockwise: the outer face lies to the right
        pos[v] = np.array([math.cos(a), math.sin(a)])
    free = sorted((v for v in adj if v not in pos), key=repr)
    index = {v: k for k, v in enumerate(free)}
    fixed = sorted(pos, key=repr)
    fixed_xy = np.array([pos[v] for v in fixed])
    fixed_index = {v: k for k, v in enumerate(fixed)}
    inner, outer = [], []          # free-free edges (each once), free-fixed edges
    for v in free:
        for u in adj[v]:
            if u in index:
                if index[u] > index[v]:
                    inner.append((index[v], index[u]))
            else:
                outer.append((index[v], fixed_index[u]))
    inner_a = np.array(inner, dtype=np.int64).reshape(-1, 2)
    outer_a = np.array(outer, dtype=np.int64).reshape(-1, 2)
    xy = _weighted_solve(len(free), inner_a, np.ones(len(inner_a)), outer_a,
                         np.ones(len(outer_a)), fixed_xy)
    for v, k in index.items():
        pos[v] = xy[k]
    return pos


def _weighted_solve(n: int, inner: np.ndarray, w_in: np.ndarray, outer: np.ndarray,
                    w_out: np.ndarray, fixed_xy: np.ndarray) -> np.ndarray:
    """Each free point at the weighted average of its neighbours (a sparse Laplacian solve)."""
    diag = np.zeros(n)
    np.add.at(diag, inner[:, 0], w_in)
    np.add.at(diag, inner[:, 1], w_in)
    np.add.at(diag, outer[:, 0], w_out)
    rhs = np.zeros((n, 2))
    np.add.at(rhs, outer[:, 0], w_out[:, None] * fixed_xy[outer[:, 1]])
    rows = np.concatenate([np.arange(n), inner[:, 0], inner[:, 1]])
    cols = np.concatenate([np.arange(n), inner[:, 1], inner[:, 0]])
    vals = np.concatenate([diag, -w_in, -w_in])
    try:
        from scipy.sparse import csr_matrix
        from scipy.sparse.linalg import splu
    except ImportError:  # pragma: no cover - scipy is usually there
        a = np.zeros((n, n))
        np.add.at(a, (rows, cols), vals)
        return np.linalg.solve(a, rhs)
    lu = splu(csr_matrix((vals, (rows, cols)), shape=(n, n)).tocsc())
    return np.column_stack([lu.solve(rhs[:, 0]), lu.solve(rhs[:, 1])])


# -- strands --------------------------------------------------------------------
def _cubic(p0, p1, p2, p3, samples: int) -> np.ndarray:
    t = np.linspace(0.0, 1.0, samples + 1)[:, None]
    s = 1 - t
    return s ** 3 * p0 + 3 * s * s * t * p1 + 3 * s * t * t * p2 + t ** 3 * p3


def _smooth_closed(points: list[np.ndarray], tension: float) -> list[np.ndarray]:
    """Per span i -> i+1 of a closed point list, the sampled cubic (both ends included)."""
    n = len(points)
    spans = []
    for i in range(n):
        a, b = points[i], points[(i + 1) % n]
        span = b - a
        length = float(np.linalg.norm(span))
        if tension == 0 or length == 0:
            spans.append(np.linspace(a, b, 2))
            continue

        def direction(k):
            d = points[(k + 1) % n] - points[(k - 1) % n]
            norm = float(np.linalg.norm(d))
            return d / norm if norm else np.zeros(2)

        h = tension * length / 3
        spans.append(_cubic(a, a + h * direction(i), b - h * direction((i + 1) % n), b,
                            _SAMPLES))
    return spans


def _edge_ends(diagram: Diagram) -> dict[int, tuple[tuple[int, int], tuple[int, int]]]:
    """{label: ((tail crossing, position), (head crossing, position))}."""
    ends = {}
    for i, x in enumerate(diagram.crossings):
        for p, label in enumerate(x):
            if diagram.is_incoming(i, p):
                ends.setdefault(label, [None, None])[1] = (i, p)
            else:
                ends.setdefault(label, [None, None])[0] = (i, p)
    return {k: (v[0], v[1]) for k, v in ends.items()}


def _strands(diagram: Diagram, pos: dict, tension: float) -> dict[int, Strand]:
    ends = _edge_ends(diagram)
    out = {}
    for k, comp in enumerate(diagram.components()):
        points, owners = [], []
        for label in comp:
            (i, p), (j, q) = ends[label]
            points += [pos[("c", i)], pos[("d", i, p)], pos[("d", j, q)]]
            owners.append(label)
        spans = _smooth_closed(points, tension)
        for e, label in enumerate(owners):
            pieces = spans[3 * e: 3 * e + 3]
            pts = np.concatenate([pieces[0]] + [s[1:] for s in pieces[1:]])
            out[label] = Strand(label, k, pts)
    return out


def _room(diagram: Diagram, pos: dict, i: int) -> float:
    """Distance from crossing i to the polygon of its dart and corner points."""
    c = pos[("c", i)]
    ring = []
    for p in range(4):
        ring += [pos[("d", i, p)], pos[("k", i, p)]]
    best = math.inf
    for a, b in zip(ring, ring[1:] + ring[:1]):
        ab = b - a
        t = 0.0 if not ab.any() else float(np.clip(np.dot(c - a, ab) / np.dot(ab, ab), 0, 1))
        best = min(best, float(np.linalg.norm(a + t * ab - c)))
    return best


def _cut_end(points: np.ndarray, centre: np.ndarray, radius: float, at_end: bool) -> np.ndarray:
    """The polyline with the part within ``radius`` of its end (or start) at ``centre`` removed."""
    pts = points if at_end else points[::-1]
    dist = np.linalg.norm(pts - centre, axis=1)
    k = len(pts) - 1
    while k > 0 and dist[k - 1] < radius:
        k -= 1
    if k == 0:
        raise DiagramError("an edge is shorter than the gap at its crossing")
    a, b = pts[k - 1], pts[k]
    # the point on segment a-b at distance `radius` from centre (a is outside, b inside)
    ab, ac = b - a, a - centre
    qa, qb, qc = float(ab @ ab), 2 * float(ab @ ac), float(ac @ ac) - radius * radius
    root = math.sqrt(max(qb * qb - 4 * qa * qc, 0.0))
    lo = min(max((-qb - root) / (2 * qa), 0.0), 1.0) if qa else 0.0
    cut = np.vstack([pts[:k], a + lo * (b - a)])
    return cut if at_end else cut[::-1]


def _pieces(diagram: Diagram, strands: dict, pos: dict, radii: list[float]):
    """Cut each under-strand at its crossing; return pieces per component and the gaps."""
    trimmed = {label: s.points for label, s in strands.items()}
    gaps = []
    for i, x in enumerate(diagram.crossings):
        c = pos[("c", i)]
        incoming, outgoing = x[0], x[2]
        trimmed[incoming] = _cut_end(trimmed[incoming], c, radii[i], at_end=True)
        trimmed[outgoing] = _cut_end(trimmed[outgoing], c, radii[i], at_end=False)
        gaps.append((trimmed[incoming][-1].copy(), trimmed[outgoing][0].copy()))
    for i, x in enumerate(diagram.crossings):
        # The over-strand gets two points straddling the crossing instead of one on it, so
        # that a gap whose under-strand runs straight through the crossing is crossed inside
        # a segment (a proper crossing) rather than at a vertex.
        over_in, over_out = (x[1], x[3]) if diagram.is_incoming(i, 1) else (x[3], x[1])
        c, before, after = pos[("c", i)], trimmed[over_in][-2], trimmed[over_out][1]
        tangent = after - before
        norm = float(np.linalg.norm(tangent)) or 1.0
        step = 0.15 * radii[i] * tangent / norm
        trimmed[over_in] = np.vstack([trimmed[over_in][:-1], c - step, c + step])
    under_at = {x[2]: i for i, x in enumerate(diagram.crossings)}  # edge leaving an under-pass
    pieces, closed = [], []
    for comp in diagram.components():
        starts = [k for k, label in enumerate(comp) if label in under_at]
        if not starts:
            pts = np.concatenate([trimmed[label][1:] for label in comp])
            pts = np.vstack([pts, pts[:1]])
            pieces.append([pts])
            closed.append(True)
            continue
        order = comp[starts[0]:] + comp[:starts[0]]
        mine, current = [], []
        for label in order:
            if label in under_at and current:
                mine.append(np.concatenate(current))
                current = []
            current.append(trimmed[label] if not current else trimmed[label][1:])
        mine.append(np.concatenate(current))
        pieces.append(mine)
        closed.append(False)
    return pieces, gaps, closed


# -- the geometric check ----------------------------------------------------------
def _orient(a, b, c):
    return (b[..., 0] - a[..., 0]) * (c[..., 1] - a[..., 1]) - \
        (b[..., 1] - a[..., 1]) * (c[..., 0] - a[..., 0])


def segment_crossings(segments: np.ndarray) -> list[tuple[int, int]]:
    """Pairs of segments that cross properly (shared end points do not count).

    Parameters
    ----------
    segments : numpy.ndarray
        (m, 2, 2) segment end points.

    Returns
    -------
    list of (int, int)
        Index pairs i < j, found through a uniform grid (expected near-linear time).
    """
    m = len(segments)
    if m < 2:
        return []
    lo = segments.min(axis=1)
    hi = segments.max(axis=1)
    lengths = np.linalg.norm(segments[:, 1] - segments[:, 0], axis=1)
    cell = max(float(np.median(lengths)) * 2, 1e-9)
    origin = lo.min(axis=0)
    c_lo = np.floor((lo - origin) / cell).astype(np.int64)
    c_hi = np.floor((hi - origin) / cell).astype(np.int64)
    span = c_hi - c_lo
    seg_ids, keys = [], []
    for dx in range(int(span[:, 0].max()) + 1):
        for dy in range(int(span[:, 1].max()) + 1):
            ok = (span[:, 0] >= dx) & (span[:, 1] >= dy)
            ids = np.nonzero(ok)[0]
            seg_ids.append(ids)
            keys.append((c_lo[ids, 0] + dx) * 4_000_003 + (c_lo[ids, 1] + dy))
    seg_ids = np.concatenate(seg_ids)
    keys = np.concatenate(keys)
    order = np.lexsort((seg_ids, keys))
    seg_ids, keys = seg_ids[order], keys[order]
    firsts, seconds = [], []
    k = 1
    while k < len(keys):
        same = keys[k:] == keys[:-k]
        if not same.any():
            break
        firsts.append(seg_ids[:-k][same])
        seconds.append(seg_ids[k:][same])
        k += 1
    if not firsts:
        return []
    pairs = np.unique(np.stack([np.concatenate(firsts), np.concatenate(seconds)], axis=1),
                      axis=0)
    pairs = pairs[pairs[:, 0] != pairs[:, 1]]
    if not len(pairs):
        return []
    idx = np.sort(pairs, axis=1)
    a, b = segments[idx[:, 0]], segments[idx[:, 1]]
    o1 = _orient(a[:, 0], a[:, 1], b[:, 0])
    o2 = _orient(a[:, 0], a[:, 1], b[:, 1])
    o3 = _orient(b[:, 0], b[:, 1], a[:, 0])
    o4 = _orient(b[:, 0], b[:, 1], a[:, 1])
    hit = (o1 * o2 < 0) & (o3 * o4 < 0)
    return [tuple(p) for p in idx[hit].tolist()]


def _problems(pieces: list, gaps: list) -> list[str]:
    """What is wrong with the drawing, if anything: stray crossings, or a gap not crossed once."""
    segs, owner = [], []
    for k, comp in enumerate(pieces):
        for piece in comp:
            segs.append(np.stack([piece[:-1], piece[1:]], axis=1))
            owner += [("piece", k)] * (len(piece) - 1)
    for i, (a, b) in enumerate(gaps):
        segs.append(np.array([[a, b]]))
        owner.append(("gap", i))
    if not segs:
        return []
    found = segment_crossings(np.concatenate(segs))
    problems = []
    crossed = [0] * len(gaps)
    for s, t in found:
        kinds = (owner[s][0], owner[t][0])
        if kinds == ("piece", "piece"):
            problems.append(f"two drawn strands of components {owner[s][1]} and {owner[t][1]} "
                            "cross where the code has no crossing")
        elif kinds == ("gap", "gap"):
            problems.append(f"the gaps at crossings {owner[s][1]} and {owner[t][1]} overlap")
        else:
            g = owner[s][1] if kinds[0] == "gap" else owner[t][1]
            crossed[g] += 1
    for i, n in enumerate(crossed):
        if n != 1:
            problems.append(f"the gap at crossing {i} is crossed {n} times instead of once")
    return problems


# -- the public function ----------------------------------------------------------
def layout_diagram(diagram: Diagram, seed: int = 0) -> DiagramLayout:
    """A planar drawing of ``diagram`` with smooth strands and a gap at every under-pass.

    Parameters
    ----------
    diagram : Diagram
    seed : int
        Chooses among equally large outer faces and the rotation of the
        picture; the same diagram and seed give the same drawing.

    Returns
    -------
    DiagramLayout

    Raises
    ------
    DiagramError
        If no drawing passes the geometric check (not expected: the straight
        drawing is planar by Tutte's theorem; it would take a rounding failure).

    Notes
    -----
    About ten points per crossing and one sparse linear solve per connected
    part; the geometric check is near-linear through a uniform grid.

    Examples
    --------
    >>> from knotsift import Diagram
    >>> drawn = layout_diagram(Diagram([(1, 5, 2, 4), (3, 1, 4, 6), (5, 3, 6, 2)]))
    >>> len(drawn.pieces), len(drawn.pieces[0])
    (1, 3)
    """
    if isinstance(seed, bool) or not isinstance(seed, int):
        raise DiagramError(f"the seed must be an integer, got {seed!r}", value=seed)
    rng = random.Random(seed)
    n = diagram.number_of_crossings()
    pos: dict = {}
    faces = diagram.faces() if n else []
    offset = 0.0
    for members in _parts(diagram) if n else []:
        part = _part_positions(diagram, members, faces, rng)
        for v, xy in part.items():
            pos[v] = xy + np.array([offset, 0.0])
        offset += _PART_SPACING
    radii = [_GAP * _room(diagram, pos, i) for i in range(n)]
    last = None
    for tension in TENSIONS:
        strands = _strands(diagram, pos, tension)
        pieces, gaps, closed = _pieces(diagram, strands, pos, radii)
        last = _problems(pieces, gaps)
        if not last:
            break
    else:
        raise DiagramError("no planar drawing passed the geometric check: " + "; ".join(last[:3]))
    notes = []
    if gaps:
        span = np.ptp(np.concatenate([p for comp in pieces for p in comp]), axis=0).max()
        tiny = sum(1 for a, b in gaps if np.linalg.norm(a - b) < _TINY * span)
        if tiny:
            notes.append(f"{tiny} of {n} crossings are drawn smaller than 1/{round(1 / _TINY)} "
                         "of the picture (a barycentric layout shrinks deep nests of loops); "
                         "zoom in on the SVG, or draw the simplified diagram")
    # free loops: circles beside the rest
    circle = np.array([[0.6 * math.cos(a), 0.6 * math.sin(a)]
                       for a in np.linspace(0, 2 * math.pi, 49)])
    circle[-1] = circle[0]
    for _ in range(diagram.free_loops):
        pieces.append([circle + np.array([offset, 0.0])])
        closed.append(True)
        offset += 1.6
    crossings = np.array([pos[("c", i)] for i in range(n)]) if n else np.zeros((0, 2))
    return DiagramLayout(diagram, crossings, strands, pieces, gaps, closed, tension, notes)
