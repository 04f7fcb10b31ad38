"""Projecting polygonal chains to a knot or link diagram (a PD code).

The curve is viewed along a random direction ``u`` (towards the viewer); a
point is "over" when it is higher along ``u``.  Crossings are the proper
intersections of the projections of non-adjacent segments.  A crossing is
positive when ``(over direction x under direction) . u > 0`` (common
practice).  Every decision (do two segments cross, which is on top, in
which order a segment meets its crossings) is the sign of a determinant of
the input coordinates, decided exactly (:mod:`.predicates`), so segments
that come very close are still resolved correctly.  Only an exact
degeneracy (a vertex projecting exactly onto another segment, segments that
meet in space, a segment seen end-on) makes the direction be redrawn.
"""

from __future__ import annotations

from dataclasses import dataclass
from fractions import Fraction

import numpy as np

from ..diagram import Diagram
from ..errors import CurveError
from .contact import SegmentSet, segment_set
from .predicates import ERROR_FACTOR, det3, det3_exact, exact_vector
from .segments import compiled_geometry, cross, near_pairs, numpy_kernel_time

__all__ = ["PROJECTION_TOL", "MAX_REDRAWS", "Projection", "random_direction", "project",
           "curve_diagram", "crossings_along"]

#: Degeneracy margin in the projection plane and in height (median bond lengths).
PROJECTION_TOL = 1e-9
#: Directions tried before giving up on finding a generic projection.
MAX_REDRAWS = 50


@dataclass
class Projection:
    """The crossings of a generic projection and the diagram they form.

    Attributes
    ----------
    diagram : Diagram
        The knot or link diagram; chains without crossings are free loops.
    direction : (3,) array
        The view direction ``u`` (towards the viewer).
    crossings : (k, 2) int array
        ``(over segment, under segment)`` of each crossing (flat segment indices).
    signs : (k,) int array
    chain_of_segment : (m,) int array
    components : list of int or None
        For each chain, the index of its component among ``diagram.components()``,
        or None when the chain has no crossing (a free loop).
    redraws : int
        Directions rejected as degenerate before this one.
    """

    diagram: Diagram
    direction: np.ndarray
    crossings: np.ndarray
    signs: np.ndarray
    chain_of_segment: np.ndarray
    components: list[int | None]
    redraws: int

    def linking_number(self, a: int, b: int) -> int:
        """Half the sum of the signs of the crossings between chains ``a`` and ``b``."""
        if a == b:
            raise ValueError("the linking number needs two different chains")
        ca = self.chain_of_segment[self.crossings[:, 0]]
        cb = self.chain_of_segment[self.crossings[:, 1]]
        mutual = ((ca == a) & (cb == b)) | ((ca == b) & (cb == a))
        total = int(self.signs[mutual].sum())
        return total // 2


def random_direction(rng: np.random.Generator) -> np.ndarray:
    """A direction uniform on the unit sphere (a normalised Gaussian vector)."""
    while True:
        v = rng.standard_normal(3)
        n = np.linalg.norm(v)
        if n > 1e-6:
            return v / n


def _frame_for(u: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """Unit vectors e1, e2 with (e1, e2, u) right-handed."""
    helper = np.array([1.0, 0.0, 0.0]) if abs(u[0]) < 0.9 else np.array([0.0, 1.0, 0.0])
    e1 = _cross3(helper, u)
    e1 /= np.linalg.norm(e1)
    e2 = _cross3(u, e1)
    return e1, e2


def _cross3(a: np.ndarray, b: np.ndarray) -> np.ndarray:
    """The cross product of two 3-vectors (numpy.cross's formula, without its overhead)."""
    return np.array([a[1] * b[2] - a[2] * b[1], a[2] * b[0] - a[0] * b[2],
                     a[0] * b[1] - a[1] * b[0]])


def _crossings(segs: SegmentSet, u: np.ndarray, tol: float):
    """Crossings seen along ``u``: rows (seg a, t, seg b, s, a_over, sign); None if degenerate.

    Every decision is the sign of a determinant (:mod:`.predicates`): decided
    in floating point where the rounding bound allows, exactly otherwise.
    Only an exact degeneracy (a vertex projecting exactly onto another
    segment, two segments meeting in space, a segment seen end-on) rejects the
    direction.  ``tol`` only widens the bounding boxes that select candidate
    pairs.
    """
    e1, e2 = _frame_for(u)
    P = np.stack((segs.p @ e1, segs.p @ e2), axis=1)
    Q = np.stack((segs.q @ e1, segs.q @ e2), axis=1)
    scale = max(1.0, float(np.abs(segs.p).max(initial=0.0)))
    pad = max(tol, 1e-9) * scale
    lo = np.minimum(P, Q) - pad
    hi = np.maximum(P, Q) + pad
    kernels = compiled_geometry()
    if kernels is not None:
        stage = kernels.projected_crossings_float(
            segs.p, segs.q, np.ascontiguousarray(u, dtype=np.float64), lo, hi, segs.chain,
            segs.first, np.asarray(segs.sizes, dtype=np.int64),
            np.asarray(segs.closed, dtype=np.bool_), ERROR_FACTOR)
    else:
        with numpy_kernel_time():
            stage = _float_stage(segs, u, lo, hi)
    if stage is None or stage[0]:
        return None  # a segment seen end-on
    _, ai, aj, i, j, o1, o2, o3, o4, sure, hit, H, h_doubt = stage
    if ai.size:
        # neighbours share a vertex; they overlap in projection only when collinear there
        r = segs.q - segs.p
        ue = exact_vector(u)
        for a_, b_ in zip(ai.tolist(), aj.tolist(), strict=True):
            a, b = exact_vector(r[a_]), exact_vector(r[b_])
            if det3_exact(a, b, ue) == 0 and _seen_dot(a, b, ue) < 0:
                return None  # collinear in projection and folding back onto each other
    if i.size == 0:
        return np.zeros((0, 6))
    unsure_h = np.flatnonzero(h_doubt)
    H_sign = np.sign(H)
    D_sign = np.sign(o2)  # det(ri, rj, u) = o2 - o1, which has o2's sign at a crossing
    # pairs the float filter could not decide: exact arithmetic on the input floats
    for k in np.concatenate((np.flatnonzero(~sure), unsure_h)).tolist():
        ex = _exact_pair(segs, int(i[k]), int(j[k]), u)
        if ex is None:
            return None
        crossing, vals = ex
        hit[k] = crossing
        if crossing:
            o1[k], o2[k], o3[k], o4[k] = (float(v) for v in vals[:4])
            D_sign[k] = 1.0 if vals[1] - vals[0] > 0 else -1.0
            H_sign[k] = 1.0 if vals[4] > 0 else -1.0
    i, j = i[hit], j[hit]
    o1, o2, o3, o4 = o1[hit], o2[hit], o3[hit], o4[hit]
    t = o3 / (o3 - o4)
    s = o1 / (o1 - o2)
    D_sign, H_sign = D_sign[hit], H_sign[hit]
    i_over = H_sign * D_sign > 0  # height difference h = H / D along u
    sign = np.where(i_over, D_sign, -D_sign).astype(np.int64)
    found = np.stack((i, t, j, s, i_over, sign), axis=1)
    _settle_ties(segs, found, u)
    return found


def _float_stage(segs: SegmentSet, u: np.ndarray, lo: np.ndarray, hi: np.ndarray):
    """The floating-point stage of :func:`_crossings` (numpy; see
    :func:`knotsift.curves.compiled_geometry.projected_crossings_float`)."""
    i, j = _overlapping_pairs(lo, hi)
    r = segs.q - segs.p
    uu = np.broadcast_to(u, r.shape)
    if np.any(np.all(cross(r, uu) == 0.0, axis=1)):
        return (True,) + (None,) * 12  # a segment seen end-on
    adj = segs.adjacent(i, j)
    ai, aj = i[adj], j[adj]
    d, bound = det3(r[ai], r[aj], np.broadcast_to(u, (ai.size, 3)))
    doubt = np.abs(d) <= bound
    ai, aj = ai[doubt], aj[doubt]
    i, j = i[~adj], j[~adj]
    ri, rj = r[i], r[j]
    ub = np.broadcast_to(u, (i.size, 3))
    o1, b1 = det3(ri, segs.p[j] - segs.p[i], ub)
    o2, b2 = det3(ri, segs.q[j] - segs.p[i], ub)
    o3, b3 = det3(rj, segs.p[i] - segs.p[j], ub)
    o4, b4 = det3(rj, segs.q[i] - segs.p[j], ub)
    sure = (np.abs(o1) > b1) & (np.abs(o2) > b2) & (np.abs(o3) > b3) & (np.abs(o4) > b4)
    hit = sure & (np.sign(o1) != np.sign(o2)) & (np.sign(o3) != np.sign(o4))
    H = np.zeros(i.size)
    h_doubt = np.zeros(i.size, dtype=bool)
    if hit.any():
        h, bh = det3(segs.p[i[hit]] - segs.p[j[hit]], ri[hit], rj[hit])
        H[hit] = h
        h_doubt[hit] = np.abs(h) <= bh
    return False, ai, aj, i, j, o1, o2, o3, o4, sure, hit, H, h_doubt


def _overlapping_pairs(lo: np.ndarray, hi: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """Pairs ``i < j`` of overlapping boxes in (i, j) order (numpy)."""
    m = lo.shape[0]
    if m <= 600:
        i, j = np.triu_indices(m, 1)
        ok = np.all((lo[i] <= hi[j]) & (lo[j] <= hi[i]), axis=1)
        return i[ok], j[ok]
    return near_pairs(lo, hi)


def _exact_pair(segs: SegmentSet, i: int, j: int, u: np.ndarray):
    """Exact crossing test of segments ``i`` and ``j`` seen along ``u``.

    Returns None for an exact degeneracy, else ``(crosses, (o1, o2, o3, o4, H))``.
    """
    pi, qi = exact_vector(segs.p[i]), exact_vector(segs.q[i])
    pj, qj = exact_vector(segs.p[j]), exact_vector(segs.q[j])
    ue = exact_vector(u)

    def sub(a, b):
        return tuple(x - y for x, y in zip(a, b, strict=True))

    ri, rj = sub(qi, pi), sub(qj, pj)
    o1 = det3_exact(ri, sub(pj, pi), ue)
    o2 = det3_exact(ri, sub(qj, pi), ue)
    o3 = det3_exact(rj, sub(pi, pj), ue)
    o4 = det3_exact(rj, sub(qi, pj), ue)
    if o1 * o2 < 0 and o3 * o4 < 0:
        pass  # a proper crossing
    elif ((o1 == 0 and _seen_between(pj, pi, qi, ue)) or (o2 == 0 and _seen_between(qj, pi, qi, ue))
          or (o3 == 0 and _seen_between(pi, pj, qj, ue))
          or (o4 == 0 and _seen_between(qi, pj, qj, ue))):
        return None  # a vertex projects exactly onto the other segment (or they overlap)
    else:
        return False, ()
    H = det3_exact(sub(pi, pj), ri, rj)
    if H == 0:
        return None  # the segments meet in space
    return True, (o1, o2, o3, o4, H)


def _seen_dot(a, b, u) -> Fraction:
    """``|u|^2`` times the dot product of vectors ``a`` and ``b`` as seen along ``u`` (exact)."""
    def dot(x, y):
        return x[0] * y[0] + x[1] * y[1] + x[2] * y[2]

    return dot(u, u) * dot(a, b) - dot(a, u) * dot(b, u)


def _seen_between(x, p, q, u) -> bool:
    """Whether ``x``, seen on the line of ``[p, q]`` along ``u``, lies within the segment."""
    a = tuple(xi - pi for xi, pi in zip(x, p, strict=True))
    b = tuple(xi - qi for xi, qi in zip(x, q, strict=True))
    return _seen_dot(a, b, u) <= 0


def _settle_ties(segs: SegmentSet, found: np.ndarray, u: np.ndarray) -> None:
    """Order passages along a segment exactly where their float parameters nearly tie.

    On each segment whose passage parameters come within 1e-9 of each other,
    the parameters are recomputed exactly and replaced (in ``found``, in
    place) by their ranks, which is all the ordering along the chain needs.
    """
    if found.shape[0] < 2:
        return
    seg = np.concatenate((found[:, 0], found[:, 2])).astype(np.int64)
    par = np.concatenate((found[:, 1], found[:, 3]))
    order = np.lexsort((par, seg))
    close = (seg[order][1:] == seg[order][:-1]) & (np.diff(par[order]) <= 1e-9)
    if not close.any():
        return
    k = found.shape[0]
    for sg in sorted(set(seg[order][1:][close].tolist())):
        rows = np.flatnonzero(seg == sg)
        keys = []
        for row in rows.tolist():
            x = row % k
            a, b = int(found[x, 0]), int(found[x, 2])
            ex = _exact_pair(segs, a, b, u)
            o1, o2, o3, o4, _ = ex[1]
            keys.append(o3 / (o3 - o4) if row < k else o1 / (o1 - o2))
        ranked = sorted(range(len(rows)), key=keys.__getitem__)
        for rank, pos in enumerate(ranked):
            row = int(rows[pos])
            found[row % k, 1 if row < k else 3] = (rank + 1) / (len(rows) + 1)


def crossings_along(segs: SegmentSet, found: np.ndarray):
    """Passages ordered along each chain: for each crossing, its (over, under) passage ranks."""
    k = found.shape[0]
    seg = np.concatenate((found[:, 0], found[:, 2])).astype(np.int64)
    par = np.concatenate((found[:, 1], found[:, 3]))
    xing = np.concatenate((np.arange(k), np.arange(k)))
    # global order: by segment (segments are laid out chain by chain, in order), then t
    order = np.lexsort((par, seg))
    return seg[order], xing[order], order


def project(chains: list[tuple[np.ndarray, bool]], rng: np.random.Generator,
            tol: float = PROJECTION_TOL, max_redraws: int = MAX_REDRAWS,
            where: str = "", directions: int = 1) -> Projection:
    """Project closed chains along a generic random direction and build the PD code.

    With ``directions`` above 1, that many generic directions are drawn and
    the one whose projection has the fewest crossings is kept (the first of
    equals), so the choice depends only on the generator's seed.

    Parameters
    ----------
    chains : list of (vertices, closed)
        Every chain must be closed (rings); vertices in median bond lengths.
    rng : numpy Generator
        Source of the view directions (seed it for reproducible output).
    tol : float
        Degeneracy margin (see the module docstring).
    max_redraws : int
        Degenerate directions rejected (in all) before giving up.
    where : str
        For error messages.
    directions : int
        Generic directions compared (fewest crossings wins).

    Returns
    -------
    Projection

    Raises
    ------
    CurveError
        When no generic direction is found in ``max_redraws`` tries (the curve
        has segments that touch) or a chain is not closed.

    Examples
    --------
    >>> import numpy as np
    >>> s = np.linspace(0, 2 * np.pi, 60, endpoint=False)
    >>> r = 2 + np.cos(3 * s)
    >>> trefoil = np.stack([r * np.cos(2 * s), r * np.sin(2 * s), -np.sin(3 * s)], axis=1)
    >>> p = project([(trefoil, True)], np.random.default_rng(0))
    >>> from knotsift.invariants.jones import jones_polynomial
    >>> str(jones_polynomial(p.diagram))
    't + t^3 - t^4'

    Notes
    -----
    All pairs of projected segments are compared at once (numpy) for up to
    600 segments, through a grid of bounding boxes beyond.
    """
    for _, closed in chains:
        if not closed:
            raise CurveError("only closed chains can be projected to a diagram; close open "
                             "chains first (knotsift.curves.closure)", where=where or None)
    if isinstance(directions, bool) or not isinstance(directions, int) or directions < 1:
        raise ValueError(f"directions must be a positive integer, got {directions!r}")
    segs = segment_set(chains)
    best = None
    redraws = 0
    seen = 0
    while seen < directions and redraws < max_redraws:
        u = random_direction(rng)
        found = _crossings(segs, u, tol)
        if found is None:
            redraws += 1
            continue
        seen += 1
        if best is None or found.shape[0] < best[1].shape[0]:
            best = (u, found)
    if best is None:
        raise CurveError(f"no generic projection found in {max_redraws} random directions: "
                         "segments of the curve meet, or the curve is degenerate",
                         where=where or None)
    u, found = best
    diagram, comps = _pd_code(segs, found, len(chains))
    return Projection(diagram, u, np.stack(
        (np.where(found[:, 4] > 0, found[:, 0], found[:, 2]),
         np.where(found[:, 4] > 0, found[:, 2], found[:, 0])), axis=1).astype(np.int64)
        if found.size else np.zeros((0, 2), dtype=np.int64),
        found[:, 5].astype(np.int64), segs.chain, comps, redraws)


def _pd_code(segs: SegmentSet, found: np.ndarray, n_chains: int
             ) -> tuple[Diagram, list[int | None]]:
    k = found.shape[0]
    if k == 0:
        return Diagram([], free_loops=n_chains), [None] * n_chains
    seg, xing, order = crossings_along(segs, found)
    chain = segs.chain[seg]
    # passage p (in chain order) gets outgoing edge label p + 1; incoming is the previous one
    labels_out = np.arange(1, seg.size + 1)
    labels_in = np.empty(seg.size, dtype=np.int64)
    comps: list[int | None] = [None] * n_chains
    starts = np.flatnonzero(np.concatenate(([True], chain[1:] != chain[:-1])))
    ends = np.concatenate((starts[1:], [seg.size]))
    for a, b in zip(starts, ends, strict=True):
        labels_in[a + 1:b] = labels_out[a:b - 1]
        labels_in[a] = labels_out[b - 1]
    # which passage is which end of each crossing
    is_first = order < k  # passage came from column (found[:,0])
    pos_first = np.empty(k, dtype=np.int64)
    pos_second = np.empty(k, dtype=np.int64)
    pos_first[xing[is_first]] = np.flatnonzero(is_first)
    pos_second[xing[~is_first]] = np.flatnonzero(~is_first)
    first_over = found[:, 4] > 0
    over = np.where(first_over, pos_first, pos_second)
    under = np.where(first_over, pos_second, pos_first)
    sign = found[:, 5]
    ui, uo = labels_in[under], labels_out[under]
    oi, oo = labels_in[over], labels_out[over]
    pd = np.where((sign > 0)[:, None], np.stack((ui, oo, uo, oi), axis=1),
                  np.stack((ui, oi, uo, oo), axis=1))
    with_crossings = sorted(set(chain.tolist()))
    free = n_chains - len(with_crossings)
    diagram = Diagram([tuple(int(v) for v in row) for row in pd], free_loops=free)
    # map chains to the diagram's components through a label each chain owns
    comp_of_label = diagram.component_of_label()
    for a in starts:
        comps[int(chain[a])] = comp_of_label[int(labels_out[a])]
    return diagram, comps


def curve_diagram(chains: list[tuple[np.ndarray, bool]], seed: int | np.random.Generator = 0,
                  where: str = "") -> Diagram:
    """The diagram of closed chains seen along a random direction (seeded)."""
    rng = seed if isinstance(seed, np.random.Generator) else np.random.default_rng(seed)
    return project(chains, rng, where=where).diagram
