"""KMT reduction: delete vertices whose triangle no other segment passes through.

The Koniaris-Muthukumar-Taylor reduction replaces the two segments at a
vertex ``v_i`` by the single segment ``v_{i-1} v_{i+1}`` whenever no other
segment of any chain of the frame meets (or comes within a small tolerance
of) the triangle ``(v_{i-1}, v_i, v_{i+1})``.  Sliding the curve across an
empty triangle is an isotopy, so the knot (or link) type never changes; the
number of vertices, and with it the number of crossings in a projection,
drops by orders of magnitude.  Ends of open chains stay fixed.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from .contact import segment_set
from .segments import (apex_segment_near, compiled_geometry, near_pairs, norm,
                       numpy_kernel_time, triangle_segment_near)

__all__ = ["KMT_TOL", "Reduction", "kmt_reduce", "triangles_hit"]

#: A segment within this distance (median bond lengths) of a triangle blocks it.
KMT_TOL = 1e-6


@dataclass
class Reduction:
    """The outcome of a KMT reduction.

    Attributes
    ----------
    chains : list of (vertices, closed)
        The reduced chains.
    kept : list of int arrays
        For each chain, the indices (into the input vertices) of the vertices kept.
    passes : int
        Number of passes that deleted something.
    triangles : (k, 3, 3) array or None
        With ``record=True``: every deleted triangle ``(v_{i-1}, v_i, v_{i+1})``
        at the moment of its deletion, in order.
    triangle_ids : (k, 4) int array or None
        ``(chain, i-1, i, i+1)`` of each recorded triangle, as input indices.
    """

    chains: list[tuple[np.ndarray, bool]]
    kept: list[np.ndarray]
    passes: int
    triangles: np.ndarray | None = None
    triangle_ids: np.ndarray | None = None

    def number_of_vertices(self) -> int:
        return sum(len(x) for x, _ in self.chains)


def _candidates(n: int, closed: bool, phase: int) -> np.ndarray:
    """Positions tried in one phase: every other vertex, never two neighbours."""
    if closed:
        if n <= 3:
            return np.zeros(0, dtype=np.int64)
        k = np.arange(phase, n, 2)
        if n % 2 == 1:
            k = k[k != n - 1]
        if n == 4:
            k = k[:1]  # two deletions would leave two vertices
        return k
    if n <= 3:
        return np.zeros(0, dtype=np.int64)
    k = np.arange(1, n - 1)
    return k[k % 2 == phase]


def _greedy(n: int, conflicts_i: np.ndarray, conflicts_j: np.ndarray) -> np.ndarray:
    """Keep a set of candidates with no conflicting pair (greedy in index order)."""
    keep = np.ones(n, dtype=bool)
    if conflicts_i.size == 0:
        return keep
    partners: dict[int, list[int]] = {}
    for a, b in zip(conflicts_i.tolist(), conflicts_j.tolist(), strict=True):
        partners.setdefault(a, []).append(b)
        partners.setdefault(b, []).append(a)
    for a in sorted(partners):
        if keep[a]:
            for b in partners[a]:
                if b > a:
                    keep[b] = False
    return keep


def kmt_reduce(chains: list[tuple[np.ndarray, bool]], tol: float = KMT_TOL,
               record: bool = False, max_passes: int | None = None) -> Reduction:
    """Reduce the chains of one frame by KMT triangle elimination.

    Parameters
    ----------
    chains : list of (vertices, closed)
        Vertices in units of the median bond length (see
        :func:`knotsift.curves.frame.prepare_chains`).  Every chain is an
        obstacle for the others, so links keep their type too.
    tol : float
        A segment within ``tol`` of a triangle blocks its deletion.
    record : bool
        Keep the deleted triangles (to check closures of open chains later).
    max_passes : int, optional
        Stop after this many passes (for the plain pipeline in benchmarks).

    Returns
    -------
    Reduction

    Examples
    --------
    >>> import numpy as np
    >>> s = np.linspace(0, 2 * np.pi, 200, endpoint=False)
    >>> circle = np.stack([np.cos(s), np.sin(s), 0.1 * np.sin(3 * s)], axis=1) * 30
    >>> kmt_reduce([(circle, True)]).number_of_vertices()
    3

    Notes
    -----
    Each pass tries every other vertex of every chain at once (numpy, with a
    grid of bounding boxes so only nearby segments are tested), then rejects
    simultaneous deletions whose new segments come near each other's
    triangles, so that the deletions are valid in any order; the next pass
    tries the other half.  It stops when two passes in a row delete nothing.
    A pass costs about O(n) for chains of even bond length; the number of
    passes is usually O(log n) plus the few needed near the end.

    The tests are one-sided: when a segment might come within ``tol`` of a
    triangle (including a neighbouring segment folding into it), the vertex
    is kept.  Deletions are therefore always isotopies.

    With numba available the same passes run compiled
    (:func:`knotsift.curves.compiled_geometry.kmt_reduce_chains`), keeping
    exactly the same vertices; see
    :func:`knotsift.curves.segments.compiled_geometry` for when.

    References
    ----------
    K. Koniaris and M. Muthukumar, Phys. Rev. Lett. 66 (1991) and J. Chem.
    Phys. 95 (1991), "Self-entanglement in ring polymers" (from memory).
    W. R. Taylor, "A deeply knotted protein structure and how it might fold",
    Nature 406 (2000).
    """
    kernels = compiled_geometry()
    if kernels is not None:
        return _reduce_compiled(kernels, chains, tol, record, max_passes)
    with numpy_kernel_time():
        return _reduce_numpy(chains, tol, record, max_passes)


def _reduce_compiled(kernels, chains, tol, record, max_passes) -> Reduction:
    xs = [np.asarray(x, dtype=np.float64).reshape(-1, 3) for x, _ in chains]
    sizes = np.array([len(x) for x in xs], dtype=np.int64)
    starts = np.concatenate(([0], np.cumsum(sizes)[:-1])).astype(np.int64)
    flat = np.concatenate(xs) if xs else np.zeros((0, 3))
    closed = np.array([bool(c) for _, c in chains], dtype=np.bool_)
    cur, cnt, passes, tris, ids = kernels.kmt_reduce_chains(
        np.ascontiguousarray(flat), starts, sizes, closed, float(tol), bool(record),
        -1 if max_passes is None else int(max_passes))
    idx = [cur[s:s + k].copy() for s, k in zip(starts.tolist(), cnt.tolist(), strict=True)]
    out = [(xs[c][idx[c]], bool(closed[c])) for c in range(len(xs))]
    if not record:
        tris = ids = None
    return Reduction(out, idx, int(passes), tris, ids)


def _reduce_numpy(chains, tol, record, max_passes) -> Reduction:
    xs = [np.asarray(x, dtype=np.float64) for x, _ in chains]
    closed = [bool(c) for _, c in chains]
    idx = [np.arange(len(x)) for x in xs]
    tri_parts: list[np.ndarray] = []
    id_parts: list[np.ndarray] = []
    idle = 0
    phase = 0
    passes = 0
    rounds = 0
    while idle < 2:
        if max_passes is not None and rounds >= max_passes:
            break
        rounds += 1
        deleted = _phase(xs, closed, idx, phase, tol, tri_parts if record else None,
                         id_parts if record else None)
        if deleted:
            passes += 1
            idle = 0
        else:
            idle += 1
        phase ^= 1
    out = [(xs[c][idx[c]], closed[c]) for c in range(len(xs))]
    tris = ids = None
    if record:
        tris = np.concatenate(tri_parts) if tri_parts else np.zeros((0, 3, 3))
        ids = np.concatenate(id_parts) if id_parts else np.zeros((0, 4), dtype=np.int64)
    return Reduction(out, idx, passes, tris, ids)


def _phase(xs, closed, idx, phase, tol, tri_parts, id_parts) -> int:
    verts = [xs[c][idx[c]] for c in range(len(xs))]
    sizes = [len(v) for v in verts]
    cand_chain, cand_pos = [], []
    for c, n in enumerate(sizes):
        k = _candidates(n, closed[c], phase)
        cand_chain.append(np.full(k.size, c))
        cand_pos.append(k)
    cc = np.concatenate(cand_chain)
    kk = np.concatenate(cand_pos)
    if cc.size == 0:
        return 0
    segs = segment_set(list(zip(verts, closed, strict=True)))
    n_of = np.asarray(sizes)[cc]
    cl_of = np.asarray(closed)[cc]
    flat = np.concatenate(verts)
    voff = np.concatenate(([0], np.cumsum(sizes)))[:-1][cc]
    prev = np.where(cl_of, (kk - 1) % n_of, kk - 1)
    nxt = np.where(cl_of, (kk + 1) % n_of, kk + 1)
    A, B, C = flat[voff + prev], flat[voff + kk], flat[voff + nxt]
    tlo = np.minimum(np.minimum(A, B), C) - tol
    thi = np.maximum(np.maximum(A, B), C) + tol
    slo = np.minimum(segs.p, segs.q)
    shi = np.maximum(segs.p, segs.q)
    ti, si = near_pairs(tlo, thi, slo, shi)
    blocked = np.zeros(cc.size, dtype=bool)
    blocked |= norm(C - A) <= tol  # would collapse onto a point
    if ti.size:
        same = segs.chain[si] == cc[ti]
        s_local = segs.first[si]
        n_t, cl_t, k_t = n_of[ti], cl_of[ti], kk[ti]

        def rel(offset):
            target = k_t + offset
            target = np.where(cl_t, target % n_t, target)
            return same & (s_local == target)

        own = rel(-1) | rel(0)
        at_a = rel(-2) & ~own
        at_c = rel(1) & ~own & ~at_a
        general = ~own & ~at_a & ~at_c
        near = np.zeros(ti.size, dtype=bool)
        g = np.flatnonzero(general)
        if g.size:
            t = ti[g]
            near[g] = triangle_segment_near(A[t], B[t], C[t], segs.p[si[g]], segs.q[si[g]], tol)
        g = np.flatnonzero(at_a | at_c)  # a neighbouring segment shares the apex a or c
        if g.size:
            t = ti[g]
            from_a = at_a[g][:, None]
            apex = np.where(from_a, A[t], C[t])
            other = np.where(from_a, C[t], A[t])
            far = np.where(from_a, segs.p[si[g]], segs.q[si[g]])
            near[g] = apex_segment_near(apex, B[t], other, far)
        blocked[ti[near]] = True
    clean = np.flatnonzero(~blocked)
    if clean.size == 0:
        return 0
    # simultaneous deletions: the new segment [a, c] of one must keep clear of the others
    Ac, Cc = A[clean], C[clean]
    ti, ej = near_pairs(tlo[clean], thi[clean], np.minimum(Ac, Cc), np.maximum(Ac, Cc))
    keep = ti != ej
    ti, ej = ti[keep], ej[keep]
    if ti.size:
        ci, cj = clean[ti], clean[ej]
        same = cc[ci] == cc[cj]
        n_t, cl_t = n_of[ci], cl_of[ci]
        d = kk[cj] - kk[ci]
        d = np.where(cl_t, d % n_t, d)
        plus2 = same & (d == 2)
        minus2 = same & (np.where(cl_t, (n_t - d) % n_t, -d) == 2)
        both = plus2 & minus2
        near = np.zeros(ti.size, dtype=bool)
        near |= both
        g = np.flatnonzero((plus2 | minus2) & ~both)  # e_j shares c_i (+2) or a_i (-2)
        if g.size:
            a, b = ci[g], cj[g]
            p2 = plus2[g][:, None]
            apex = np.where(p2, C[a], A[a])
            other = np.where(p2, A[a], C[a])
            far = np.where(p2, C[b], A[b])
            near[g] = apex_segment_near(apex, B[a], other, far)
        g = np.flatnonzero(~plus2 & ~minus2)
        if g.size:
            near[g] = triangle_segment_near(A[ci[g]], B[ci[g]], C[ci[g]], A[cj[g]], C[cj[g]],
                                            tol)
        ok = _greedy(clean.size, ti[near], ej[near])
        clean = clean[ok]
    if tri_parts is not None:
        tri_parts.append(np.stack((A[clean], B[clean], C[clean]), axis=1))
        ids = np.stack((cc[clean], _idx_lookup(idx, cc[clean], prev[clean]),
                        _idx_lookup(idx, cc[clean], kk[clean]),
                        _idx_lookup(idx, cc[clean], nxt[clean])), axis=1)
        id_parts.append(ids)
    for c in range(len(xs)):
        mine = kk[clean][cc[clean] == c]
        if mine.size:
            mask = np.ones(sizes[c], dtype=bool)
            mask[mine] = False
            idx[c] = idx[c][mask]
    return int(clean.size)


def _idx_lookup(idx: list[np.ndarray], chains: np.ndarray, pos: np.ndarray) -> np.ndarray:
    out = np.empty(pos.size, dtype=np.int64)
    for c in np.unique(chains):
        m = chains == c
        out[m] = idx[c][pos[m]]
    return out


def triangles_hit(triangles: np.ndarray, triangle_ids: np.ndarray, p: np.ndarray,
                  q: np.ndarray, ends: tuple[int, int], tol: float = KMT_TOL) -> int:
    """The first deleted triangle that a segment of a closure may pass through, or -1.

    Parameters
    ----------
    triangles, triangle_ids : from :func:`kmt_reduce` with ``record=True``
        (one open chain, chain index 0).
    p, q : (m, 3) arrays
        The closure's segments, in order from the chain's last bead back to its first.
    ends : (int, int)
        Input indices of the chain's first and last beads.

    Returns
    -------
    int
        Index (in deletion order) of the first triangle hit, -1 when none is.
        The deletions before it remain isotopies of the closed curve.

    Notes
    -----
    Reducing an open chain once and closing the reduced chain in many ways
    is valid only if every deleted triangle stays clear of every closure
    segment: then the deletions are isotopies of each closed curve too.  A
    closure segment that starts at an end bead shared by a triangle is tested
    with the shared-vertex rule.
    """
    if triangles.shape[0] == 0 or p.shape[0] == 0:
        return -1
    A, B, C = triangles[:, 0], triangles[:, 1], triangles[:, 2]
    lo = np.minimum(np.minimum(A, B), C) - tol
    hi = np.maximum(np.maximum(A, B), C) + tol
    ti, sj = near_pairs(lo, hi, np.minimum(p, q), np.maximum(p, q))
    if ti.size == 0:
        return -1
    first, last = ends
    m = p.shape[0]
    ids = triangle_ids[ti]
    at_a_p = (sj == 0) & (ids[:, 1] == last)         # p[0] is the last bead
    at_c_p = (sj == 0) & (ids[:, 3] == last)
    at_a_q = (sj == m - 1) & (ids[:, 1] == first)    # q[m-1] is the first bead
    at_c_q = (sj == m - 1) & (ids[:, 3] == first)
    shares_p, shares_q = at_a_p | at_c_p, at_a_q | at_c_q
    near = shares_p & shares_q  # touches the triangle at two corners: in doubt
    for sel, apex_is_a, far_end in ((at_a_p, True, q), (at_c_p, False, q),
                                    (at_a_q, True, p), (at_c_q, False, p)):
        g = np.flatnonzero(sel & ~near)
        if g.size:
            t, sg = ti[g], sj[g]
            if apex_is_a:
                near[g] = apex_segment_near(A[t], B[t], C[t], far_end[sg])
            else:
                near[g] = apex_segment_near(C[t], B[t], A[t], far_end[sg])
    g = np.flatnonzero(~shares_p & ~shares_q)
    if g.size:
        t = ti[g]
        near[g] = triangle_segment_near(A[t], B[t], C[t], p[sj[g]], q[sj[g]], tol)
    return int(ti[near].min()) if near.any() else -1
