"""Compiled segment geometry: box overlaps, distances, triangle tests and the KMT loop.

The same computations as :mod:`.segments`, :mod:`.kmt`, :mod:`.contact` and
the crossing search of :mod:`.projection`, compiled with numba so that a
frame of a few hundred beads no longer pays numpy's per-call overhead a few
hundred times.  Every floating-point expression is written in the same order
as its numpy counterpart (numba does not reassociate or fuse without
``fastmath``), every tolerance is the same, and the candidate pairs are the
same sets, so the outputs are identical to the numpy path, not merely close;
``tests/curves/test_compiled_geometry.py`` checks that over many random
polygons.

This module imports numba at import time; import it only through
:func:`knotsift.curves.segments.compiled_geometry`, which returns None when
numba is missing or ``KNOTSIFT_NO_COMPILED`` is set.  Compiled code is cached
on disk (``cache=True``), so a new process loads it instead of compiling.
"""

from __future__ import annotations

import math

import numba
import numpy as np

__all__ = ["warm_up", "overlapping_pairs", "kmt_reduce_chains", "contact_pairs", "projected_crossing_pairs"]

_jit = numba.njit(cache=True, nogil=True)

#: Boxes spanning more grid cells than this are compared with every box directly.
_MAX_CELLS = 64
#: Up to this many box pairs, every pair is compared directly.
_BRUTE_PAIRS = 40_000
# Typed (not literal) constants for arguments: a literal 0 or False at a call
# site makes numba compile an extra specialisation of the callee.
_ZERO = np.int64(0)
_NO = np.bool_(False)
_YES = np.bool_(True)


# --- 3-vectors as tuples (no allocation in the inner loops) -------------------------------

@_jit
def _row(x, i):
    return (x[i, 0], x[i, 1], x[i, 2])


@_jit
def _sub(a, b):
    return (a[0] - b[0], a[1] - b[1], a[2] - b[2])


@_jit
def _axpy(p, t, d):
    """``p + t * d``, as numpy's ``p + t[:, None] * d``."""
    return (p[0] + t * d[0], p[1] + t * d[1], p[2] + t * d[2])


@_jit
def _dot(a, b):
    return a[0] * b[0] + a[1] * b[1] + a[2] * b[2]


@_jit
def _cross(u, v):
    return (u[1] * v[2] - u[2] * v[1], u[2] * v[0] - u[0] * v[2], u[0] * v[1] - u[1] * v[0])


@_jit
def _norm(a):
    return math.sqrt(_dot(a, a))


@_jit
def _div(a, s):
    return (a[0] / s, a[1] / s, a[2] / s)


@_jit
def _fmin(a, b):
    """numpy.minimum: NaN wins."""
    if a != a or b != b:
        return math.nan
    return a if a <= b else b


@_jit
def _fmax(a, b):
    if a != a or b != b:
        return math.nan
    return a if a >= b else b


@_jit
def _clip01(x):
    return _fmin(_fmax(x, 0.0), 1.0)


# --- distances and one-sided tests (as in .segments) --------------------------------------

@_jit
def _point_segment_distance(x, p, q):
    d = _sub(q, p)
    dd = _dot(d, d)
    t = _dot(_sub(x, p), d) / (dd if dd > 0 else 1.0)
    t = _clip01(t)
    return _norm(_sub(x, _axpy(p, t, d)))


@_jit
def _segment_distance(p1, q1, p2, q2):
    d1 = _sub(q1, p1)
    d2 = _sub(q2, p2)
    r = _sub(p1, p2)
    a = _dot(d1, d1)
    e = _dot(d2, d2)
    b = _dot(d1, d2)
    c = _dot(d1, r)
    f = _dot(d2, r)
    den = a * e - b * b
    good = den > 1e-12 * _fmax(a * e, 1e-300)
    safe = den if good else 1.0
    s = (b * f - c * e) / safe
    t = (a * f - b * c) / safe
    best = math.inf
    if good and s >= 0 and s <= 1 and t >= 0 and t <= 1:
        best = _norm(_sub(_axpy(p1, s, d1), _axpy(p2, t, d2)))
    best = _fmin(best, _point_segment_distance(p1, p2, q2))
    best = _fmin(best, _point_segment_distance(q1, p2, q2))
    best = _fmin(best, _point_segment_distance(p2, p1, q1))
    best = _fmin(best, _point_segment_distance(q2, p1, q1))
    return best


@_jit
def _triangle_segment_near(a, b, c, p, q, tol):
    ab, ac, bc = _sub(b, a), _sub(c, a), _sub(c, b)
    normal = _cross(ab, ac)
    area2 = _norm(normal)
    la = _norm(bc)
    lb = _norm(ac)
    lc = _norm(ab)
    longest = _fmax(_fmax(la, lb), lc)
    if area2 <= 1e-6 * longest * longest:
        # needle-thin: distance to the longest edge (first maximum of lc, la, lb)
        which = 0
        best = lc
        if la > best:
            which, best = 1, la
        if lb > best:
            which = 2
        if which == 0:
            u, v, w = a, b, c
        elif which == 1:
            u, v, w = b, c, a
        else:
            u, v, w = c, a, b
        h = _point_segment_distance(w, u, v)
        return _segment_distance(u, v, p, q) <= tol + h
    nh = _div(normal, area2)
    dp = _dot(_sub(p, a), nh)
    dq = _dot(_sub(q, a), nh)
    if (dp > tol and dq > tol) or (dp < -tol and dq < -tol):
        return False
    dd = dq - dp
    if abs(dd) <= 1e-300:
        t_a, t_b = 0.0, 1.0
    else:
        t_a = (tol - dp) / dd
        t_b = (-tol - dp) / dd
    t0 = _clip01(_fmin(t_a, t_b))
    t1 = _clip01(_fmax(t_a, t_b))
    seg = _sub(q, p)
    x0 = _axpy(p, t0, seg)
    x1 = _axpy(p, t1, seg)
    for k in range(3):
        if k == 0:
            s, e = a, b
        elif k == 1:
            s, e = b, c
        else:
            s, e = c, a
        m = _cross(_sub(e, s), nh)
        m = _div(m, _norm(m))
        if _dot(_sub(x0, s), m) > tol and _dot(_sub(x1, s), m) > tol:
            return False
    return True


@_jit
def _finite3(v):
    return math.isfinite(v[0]) and math.isfinite(v[1]) and math.isfinite(v[2])


@_jit
def _apex_segment_near(apex, y, z, f):
    angle = 1e-6
    u = _sub(f, apex)
    u = _div(u, _norm(u))
    e1 = _sub(y, apex)
    e1 = _div(e1, _norm(e1))
    e2 = _sub(z, apex)
    e2 = _div(e2, _norm(e2))
    if not (_finite3(u) and _finite3(e1) and _finite3(e2)):
        return True  # a zero-length side: in doubt
    if _dot(u, e1) > 0 and _norm(_cross(u, e1)) < angle:
        return True
    if _dot(u, e2) > 0 and _norm(_cross(u, e2)) < angle:
        return True
    nn = _cross(e1, e2)
    s = _norm(nn)
    g = _dot(e1, e2)
    if s < 1e-9:
        if g <= 0:
            return True
        width = math.asin(_clip01(s))
        return _dot(u, e1) > 0 and _norm(_cross(u, e1)) < angle + width
    nh = _div(nn, s)
    off = abs(_dot(u, nh))
    u1, u2 = _dot(u, e1), _dot(u, e2)
    den = 1.0 - g * g
    alpha = (u1 - g * u2) / den
    beta = (u2 - g * u1) / den
    slack = 1e-12
    return alpha >= -slack and beta >= -slack and off < angle


# --- overlapping boxes --------------------------------------------------------------------

@_jit
def _overlap(lo_a, hi_a, i, lo_b, hi_b, j):
    for k in range(lo_a.shape[1]):
        if not (lo_a[i, k] <= hi_b[j, k] and lo_b[j, k] <= hi_a[i, k]):
            return False
    return True


@_jit
def _push(buf, n, value):
    if n == buf.size:
        bigger = np.empty(2 * buf.size + 16, dtype=buf.dtype)
        for k in range(n):
            bigger[k] = buf[k]
        buf = bigger
    buf[n] = value
    return buf


@_jit
def _shell_sort(a, lo, hi):
    """Sort ``a[lo:hi]`` in place (short runs; cheaper to compile than numpy's sort)."""
    gap = 1
    while gap < (hi - lo) // 3:
        gap = 3 * gap + 1
    while gap >= 1:
        for k in range(lo + gap, hi):
            v = a[k]
            m = k
            while m - gap >= lo and a[m - gap] > v:
                a[m] = a[m - gap]
                m -= gap
            a[m] = v
        gap //= 3


@_jit
def overlapping_pairs(lo_a, hi_a, lo_b, hi_b, self_pairs):
    """Pairs of overlapping closed boxes, as :func:`.segments.near_pairs`.

    Returns ``(start, j)``: the boxes of set b overlapping box ``i`` of set a
    are ``j[start[i]:start[i + 1]]``, in increasing order (with
    ``self_pairs``, set b is set a and only ``j > i`` is listed).  Every
    overlapping pair is listed once: a grid only narrows the candidates, the
    overlap test itself is exact.
    """
    na, nb, d = lo_a.shape[0], lo_b.shape[0], lo_a.shape[1]
    start = np.zeros(na + 1, dtype=np.int64)
    out = np.empty(16, dtype=np.int64)
    n = _ZERO
    if na == 0 or nb == 0:
        return start, out[:0]
    finite = True
    for j in range(nb):
        for k in range(d):
            if not (math.isfinite(lo_b[j, k]) and math.isfinite(hi_b[j, k])):
                finite = False
    if na * nb <= _BRUTE_PAIRS or not finite:
        for i in range(na):
            for j in range(i + 1 if self_pairs else 0, nb):
                if _overlap(lo_a, hi_a, i, lo_b, hi_b, j):
                    out = _push(out, n, j)
                    n += 1
            start[i + 1] = n
        return start, out[:n]
    # a uniform grid over set b: cell about twice the median box extent, at most ~8 cells a box
    total_ext = 0.0
    for j in range(nb):
        e = 0.0
        for k in range(d):
            e = max(e, hi_b[j, k] - lo_b[j, k])
        total_ext += e
    cell = 2.0 * total_ext / nb  # the cell size only sets the speed, never the pairs
    origin = np.zeros(3)
    span = np.zeros(3)
    widest = 0.0
    for k in range(d):
        low, high = lo_b[0, k], hi_b[0, k]
        for j in range(1, nb):
            low = min(low, lo_b[j, k])
            high = max(high, hi_b[j, k])
        origin[k] = low
        span[k] = high - low
        widest = max(widest, span[k])
    if not (math.isfinite(cell) and cell > 0):
        cell = max(widest, 1.0)
    dims = np.zeros(3, dtype=np.int64)
    for k in range(3):
        dims[k] = 1
    while True:
        total_f = 1.0
        for k in range(d):
            total_f *= math.floor(span[k] / cell) + 1.0
        if total_f <= max(8 * nb, 64):
            break
        cell *= 1.5
    total = 1
    for k in range(d):
        dims[k] = int(math.floor(span[k] / cell)) + 1
        total *= dims[k]
    lo_cell = np.zeros((nb, 3), dtype=np.int64)
    hi_cell = np.zeros((nb, 3), dtype=np.int64)
    big = np.empty(16, dtype=np.int64)
    n_big = _ZERO
    count = np.zeros(total + 1, dtype=np.int64)
    registered = np.zeros(nb, dtype=np.bool_)
    for j in range(nb):
        cells = 1
        for k in range(d):
            lo_cell[j, k] = min(int(math.floor((lo_b[j, k] - origin[k]) / cell)), dims[k] - 1)
            hi_cell[j, k] = min(int(math.floor((hi_b[j, k] - origin[k]) / cell)), dims[k] - 1)
            cells *= hi_cell[j, k] - lo_cell[j, k] + 1
        if cells > _MAX_CELLS:
            big = _push(big, n_big, j)
            n_big += 1
            continue
        registered[j] = True
        for x in range(lo_cell[j, 0], hi_cell[j, 0] + 1):
            for y in range(lo_cell[j, 1], hi_cell[j, 1] + 1):
                for z in range(lo_cell[j, 2], hi_cell[j, 2] + 1):
                    count[(x * dims[1] + y) * dims[2] + z + 1] += 1
    for c in range(total):
        count[c + 1] += count[c]
    fill = np.empty(total, dtype=np.int64)
    for c in range(total):
        fill[c] = count[c]
    items = np.empty(count[total], dtype=np.int64)
    for j in range(nb):
        if not registered[j]:
            continue
        for x in range(lo_cell[j, 0], hi_cell[j, 0] + 1):
            for y in range(lo_cell[j, 1], hi_cell[j, 1] + 1):
                for z in range(lo_cell[j, 2], hi_cell[j, 2] + 1):
                    c = (x * dims[1] + y) * dims[2] + z
                    items[fill[c]] = j
                    fill[c] += 1
    stamp = np.empty(nb, dtype=np.int64)
    for j in range(nb):
        stamp[j] = -1
    qlo = np.zeros(3, dtype=np.int64)
    qhi = np.zeros(3, dtype=np.int64)
    for i in range(na):
        first = n
        empty = False
        for k in range(d):
            a = math.floor((lo_a[i, k] - origin[k]) / cell)
            b = math.floor((hi_a[i, k] - origin[k]) / cell)
            if not (b >= 0 and a <= dims[k] - 1):
                empty = True  # NaN or outside the grid: only big boxes can overlap
                break
            qlo[k] = int(max(a, 0.0))
            qhi[k] = int(min(b, dims[k] - 1.0))
        if not empty:
            for x in range(qlo[0], qhi[0] + 1):
                for y in range(qlo[1], qhi[1] + 1):
                    for z in range(qlo[2], qhi[2] + 1):
                        c = (x * dims[1] + y) * dims[2] + z
                        for e in range(count[c], count[c + 1]):
                            j = items[e]
                            if stamp[j] == i or (self_pairs and j <= i):
                                continue
                            stamp[j] = i
                            if _overlap(lo_a, hi_a, i, lo_b, hi_b, j):
                                out = _push(out, n, j)
                                n += 1
        for e in range(n_big):
            j = big[e]
            if self_pairs and j <= i:
                continue
            if _overlap(lo_a, hi_a, i, lo_b, hi_b, j):
                out = _push(out, n, j)
                n += 1
        _shell_sort(out, first, n)
        start[i + 1] = n
    return start, out[:n]


# --- KMT ----------------------------------------------------------------------------------

@_jit
def _candidates(n, closed, phase, out, m):
    """Append the positions tried in one phase (as ``kmt._candidates``) to ``out``."""
    if n <= 3:
        return m
    if closed:
        for k in range(phase, n, 2):
            if n % 2 == 1 and k == n - 1:
                continue
            out[m] = k
            m += 1
            if n == 4:
                break  # two deletions would leave two vertices
        return m
    for k in range(1, n - 1):
        if k % 2 == phase:
            out[m] = k
            m += 1
    return m


@_jit
def _kmt_phase(X, starts, cnt, cur, closed, phase, tol, record, tris, tri_ids, n_rec):
    nch = cnt.size
    vs = np.zeros(nch + 1, dtype=np.int64)
    for c in range(nch):
        vs[c + 1] = vs[c] + cnt[c]
    V = np.empty((vs[nch], 3))
    for c in range(nch):
        for k in range(cnt[c]):
            g = starts[c] + cur[starts[c] + k]
            V[vs[c] + k, 0] = X[g, 0]
            V[vs[c] + k, 1] = X[g, 1]
            V[vs[c] + k, 2] = X[g, 2]
    kk = np.empty(vs[nch], dtype=np.int64)
    cc = np.empty(vs[nch], dtype=np.int64)
    m = _ZERO
    for c in range(nch):
        m0 = m
        m = _candidates(cnt[c], closed[c], phase, kk, m)
        for t in range(m0, m):
            cc[t] = c
    if m == 0:
        return 0, n_rec
    # segments, chain by chain (as contact.segment_set)
    ns = 0
    for c in range(nch):
        ns += cnt[c] if closed[c] else max(cnt[c] - 1, 0)
    s_p = np.empty(ns, dtype=np.int64)  # row of V
    s_q = np.empty(ns, dtype=np.int64)
    s_chain = np.empty(ns, dtype=np.int64)
    s_first = np.empty(ns, dtype=np.int64)
    s = 0
    for c in range(nch):
        n = cnt[c]
        last = n if closed[c] else n - 1
        for k in range(last):
            s_p[s] = vs[c] + k
            s_q[s] = vs[c] + (k + 1) % n
            s_chain[s] = c
            s_first[s] = k
            s += 1
    slo = np.empty((ns, 3))
    shi = np.empty((ns, 3))
    for s in range(ns):
        for k in range(3):
            slo[s, k] = _fmin(V[s_p[s], k], V[s_q[s], k])
            shi[s, k] = _fmax(V[s_p[s], k], V[s_q[s], k])
    ia = np.empty(m, dtype=np.int64)
    ib = np.empty(m, dtype=np.int64)
    ic = np.empty(m, dtype=np.int64)
    tlo = np.empty((m, 3))
    thi = np.empty((m, 3))
    for t in range(m):
        c, k, n = cc[t], kk[t], cnt[cc[t]]
        prev = (k - 1) % n if closed[c] else k - 1
        nxt = (k + 1) % n if closed[c] else k + 1
        ia[t], ib[t], ic[t] = vs[c] + prev, vs[c] + k, vs[c] + nxt
        for j in range(3):
            lo = _fmin(_fmin(V[ia[t], j], V[ib[t], j]), V[ic[t], j])
            hi = _fmax(_fmax(V[ia[t], j], V[ib[t], j]), V[ic[t], j])
            tlo[t, j] = lo - tol
            thi[t, j] = hi + tol
    start, seg = overlapping_pairs(tlo, thi, slo, shi, _NO)
    blocked = np.zeros(m, dtype=np.bool_)
    for t in range(m):
        A, B, C = _row(V, ia[t]), _row(V, ib[t]), _row(V, ic[t])
        if _norm(_sub(C, A)) <= tol:
            blocked[t] = True  # would collapse onto a point
            continue
        c, k, n = cc[t], kk[t], cnt[cc[t]]
        for e in range(start[t], start[t + 1]):
            s = seg[e]
            rel = -100
            if s_chain[s] == c:
                for off in (-1, 0, -2, 1):
                    target = (k + off) % n if closed[c] else k + off
                    if s_first[s] == target:
                        rel = off
                        break
            if rel == -1 or rel == 0:
                continue  # the triangle's own segments
            P, Q = _row(V, s_p[s]), _row(V, s_q[s])
            if rel == -2:  # the segment ending at a
                near = _apex_segment_near(A, B, C, P)
            elif rel == 1:  # the segment starting at c
                near = _apex_segment_near(C, B, A, Q)
            else:
                near = _triangle_segment_near(A, B, C, P, Q, tol)
            if near:
                blocked[t] = True
                break
    nc = 0
    for t in range(m):
        if not blocked[t]:
            nc += 1
    clean = np.empty(nc, dtype=np.int64)
    nc = 0
    for t in range(m):
        if not blocked[t]:
            clean[nc] = t
            nc += 1
    if nc == 0:
        return 0, n_rec
    # simultaneous deletions: the new segment [a, c] of one must keep clear of the others
    elo = np.empty((nc, 3))
    ehi = np.empty((nc, 3))
    qlo = np.empty((nc, 3))
    qhi = np.empty((nc, 3))
    for x in range(nc):
        t = clean[x]
        for j in range(3):
            qlo[x, j] = tlo[t, j]
            qhi[x, j] = thi[t, j]
            elo[x, j] = _fmin(V[ia[t], j], V[ic[t], j])
            ehi[x, j] = _fmax(V[ia[t], j], V[ic[t], j])
    start, other = overlapping_pairs(qlo, qhi, elo, ehi, _NO)
    lo_end = np.empty(16, dtype=np.int64)
    hi_end = np.empty(16, dtype=np.int64)
    n_conf = _ZERO
    for x in range(nc):
        a = clean[x]
        A, B, C = _row(V, ia[a]), _row(V, ib[a]), _row(V, ic[a])
        n = cnt[cc[a]]
        cl = closed[cc[a]]
        for e in range(start[x], start[x + 1]):
            y = other[e]
            if y == x:
                continue
            b = clean[y]
            same = cc[a] == cc[b]
            d = kk[b] - kk[a]
            if cl:
                d = d % n
            plus2 = same and d == 2
            minus2 = same and ((n - d) % n if cl else -d) == 2
            if plus2 and minus2:
                near = True
            elif plus2:  # e_b shares c_a
                near = _apex_segment_near(C, B, A, _row(V, ic[b]))
            elif minus2:  # e_b shares a_a
                near = _apex_segment_near(A, B, C, _row(V, ia[b]))
            else:
                near = _triangle_segment_near(A, B, C, _row(V, ia[b]), _row(V, ic[b]), tol)
            if near:
                lo_end = _push(lo_end, n_conf, min(x, y))
                hi_end = _push(hi_end, n_conf, max(x, y))
                n_conf += 1
    keep = np.zeros(nc, dtype=np.bool_)
    for x in range(nc):
        keep[x] = True
    if n_conf:
        # greedy in index order: a kept candidate removes its later partners
        first_of = np.zeros(nc + 1, dtype=np.int64)
        for e in range(n_conf):
            first_of[lo_end[e] + 1] += 1
        for x in range(nc):
            first_of[x + 1] += first_of[x]
        partner = np.empty(n_conf, dtype=np.int64)
        for e in range(n_conf):
            partner[first_of[lo_end[e]]] = hi_end[e]
            first_of[lo_end[e]] += 1
        e = 0
        for x in range(nc):  # first_of[x] is now the end of x's partners
            if keep[x]:
                for f in range(e, first_of[x]):
                    keep[partner[f]] = False
            e = first_of[x]
    deleted = 0
    gone = np.zeros(vs[nch], dtype=np.bool_)
    for x in range(nc):
        if not keep[x]:
            continue
        t = clean[x]
        deleted += 1
        gone[ib[t]] = True
        if record:
            c = cc[t]
            for j in range(3):
                tris[n_rec, 0, j] = V[ia[t], j]
                tris[n_rec, 1, j] = V[ib[t], j]
                tris[n_rec, 2, j] = V[ic[t], j]
            tri_ids[n_rec, 0] = c
            tri_ids[n_rec, 1] = cur[starts[c] + ia[t] - vs[c]]
            tri_ids[n_rec, 2] = cur[starts[c] + ib[t] - vs[c]]
            tri_ids[n_rec, 3] = cur[starts[c] + ic[t] - vs[c]]
            n_rec += 1
    for c in range(nch):
        w = 0
        for k in range(cnt[c]):
            if not gone[vs[c] + k]:
                cur[starts[c] + w] = cur[starts[c] + k]
                w += 1
        cnt[c] = w
    return deleted, n_rec


@_jit
def kmt_reduce_chains(X, starts, sizes, closed, tol, record, max_passes):
    """The KMT reduction of :func:`.kmt.kmt_reduce` on chains stored one after another.

    Parameters
    ----------
    X : (N, 3) float array
        The vertices of all chains, chain after chain.
    starts, sizes : int arrays
        First row and number of vertices of each chain.
    closed : bool array
    tol : float
    record : bool
    max_passes : int
        Negative for no limit.

    Returns
    -------
    cur, cnt, passes, triangles, triangle_ids
        Chain ``c`` keeps its local vertices ``cur[starts[c]:starts[c] + cnt[c]]``.
    """
    cur = np.empty(X.shape[0], dtype=np.int64)
    for c in range(sizes.size):
        for k in range(sizes[c]):
            cur[starts[c] + k] = k
    cnt = np.empty(sizes.size, dtype=np.int64)
    for c in range(sizes.size):
        cnt[c] = sizes[c]
    n_tri = X.shape[0] if record else 0
    tris = np.empty((n_tri, 3, 3))
    tri_ids = np.empty((n_tri, 4), dtype=np.int64)
    n_rec = _ZERO
    idle = 0
    phase = _ZERO
    passes = 0
    rounds = 0
    while idle < 2:
        if max_passes >= 0 and rounds >= max_passes:
            break
        rounds += 1
        deleted, n_rec = _kmt_phase(X, starts, cnt, cur, closed, phase, tol, record, tris,
                                    tri_ids, n_rec)
        if deleted:
            passes += 1
            idle = 0
        else:
            idle += 1
        phase ^= 1
    return cur, cnt, passes, tris[:n_rec], tri_ids[:n_rec]


# --- contact ------------------------------------------------------------------------------

@_jit
def contact_pairs(p, q, chain, first, sizes, closed, tol):
    """Non-adjacent segment pairs ``i < j`` closer than ``tol``, in (i, j) order, and distances.

    As :func:`.contact.closest_contacts` before its final sort by distance.
    """
    m = p.shape[0]
    lo = np.empty((m, 3))
    hi = np.empty((m, 3))
    for s in range(m):
        for k in range(3):
            lo[s, k] = _fmin(p[s, k], q[s, k]) - tol / 2
            hi[s, k] = _fmax(p[s, k], q[s, k]) + tol / 2
    start, other = overlapping_pairs(lo, hi, lo, hi, _YES)
    out_i = np.empty(16, dtype=np.int64)
    out_j = np.empty(16, dtype=np.int64)
    out_d = np.empty(16)
    n = _ZERO
    for i in range(m):
        for e in range(start[i], start[i + 1]):
            j = other[e]
            if chain[i] == chain[j]:
                dd = abs(first[i] - first[j])
                if dd == 1 or dd == 0 or (closed[chain[i]] and dd == sizes[chain[i]] - 1):
                    continue
            d = _segment_distance(_row(p, i), _row(q, i), _row(p, j), _row(q, j))
            if d < tol:
                out_i = _push(out_i, n, i)
                out_j = _push(out_j, n, j)
                out_d = _push(out_d, n, d)
                n += 1
    return out_i[:n], out_j[:n], out_d[:n]


# --- projection ---------------------------------------------------------------------------

@_jit
def projected_crossing_pairs(lo, hi, chain, first, sizes, closed):
    """Pairs ``i < j`` of projected segment boxes that overlap, split by adjacency.

    Returns ``(i, j, adjacent)`` in (i, j) order, as the candidate pairs of
    :func:`.projection._crossings` before any determinant.
    """
    start, other = overlapping_pairs(lo, hi, lo, hi, _YES)
    n = other.size
    out_i = np.empty(n, dtype=np.int64)
    adj = np.zeros(n, dtype=np.bool_)
    for i in range(lo.shape[0]):
        for e in range(start[i], start[i + 1]):
            out_i[e] = i
            j = other[e]
            if chain[i] == chain[j]:
                dd = abs(first[i] - first[j])
                adj[e] = dd == 1 or dd == 0 or (closed[chain[i]] and dd == sizes[chain[i]] - 1)
    return out_i, other, adj


@_jit
def _det3(a, b, c, error_factor):
    """As :func:`.predicates.det3` for one row: the determinant and its rounding bound."""
    m0 = a[1] * b[2] - a[2] * b[1]
    m1 = a[2] * b[0] - a[0] * b[2]
    m2 = a[0] * b[1] - a[1] * b[0]
    det = m0 * c[0] + m1 * c[1] + m2 * c[2]
    aa = (abs(a[0]), abs(a[1]), abs(a[2]))
    ab = (abs(b[0]), abs(b[1]), abs(b[2]))
    ac = (abs(c[0]), abs(c[1]), abs(c[2]))
    perm = ((aa[1] * ab[2] + aa[2] * ab[1]) * ac[0]
            + (aa[2] * ab[0] + aa[0] * ab[2]) * ac[1]
            + (aa[0] * ab[1] + aa[1] * ab[0]) * ac[2])
    return det, error_factor * perm


@_jit
def projected_crossings_float(p, q, u, lo, hi, chain, first, sizes, closed, error_factor):
    """The floating-point stage of :func:`.projection._crossings`.

    Returns ``(end_on, ai, aj, i, j, o1, o2, o3, o4, sure, hit, H, h_doubt)``:
    whether a segment is seen end-on; the adjacent pairs whose collinearity
    the float filter cannot exclude; the non-adjacent candidate pairs with
    their four orientation determinants, whether all four signs are certain,
    whether they cross, the height determinant of the crossing pairs and
    whether its sign is in doubt.  Pairs in (i, j) order.
    """
    m = p.shape[0]
    uu = (u[0], u[1], u[2])
    for s in range(m):
        c = _cross(_sub(_row(q, s), _row(p, s)), uu)
        if c[0] == 0.0 and c[1] == 0.0 and c[2] == 0.0:
            e = np.zeros(0, dtype=np.int64)
            f = np.zeros(0)
            b = np.zeros(0, dtype=np.bool_)
            return True, e, e, e, e, f, f, f, f, b, b, f, b
    pi, pj, adj = projected_crossing_pairs(lo, hi, chain, first, sizes, closed)
    n_adj = 0
    for e in range(adj.size):
        if adj[e]:
            n_adj += 1
    ai = np.empty(n_adj, dtype=np.int64)
    aj = np.empty(n_adj, dtype=np.int64)
    n = adj.size - n_adj
    i = np.empty(n, dtype=np.int64)
    j = np.empty(n, dtype=np.int64)
    o1 = np.empty(n)
    o2 = np.empty(n)
    o3 = np.empty(n)
    o4 = np.empty(n)
    sure = np.zeros(n, dtype=np.bool_)
    hit = np.zeros(n, dtype=np.bool_)
    H = np.zeros(n)
    h_doubt = np.zeros(n, dtype=np.bool_)
    na = _ZERO
    k = _ZERO
    for e in range(adj.size):
        a, b = pi[e], pj[e]
        ra = _sub(_row(q, a), _row(p, a))
        rb = _sub(_row(q, b), _row(p, b))
        if adj[e]:
            d, bound = _det3(ra, rb, uu, error_factor)
            if abs(d) <= bound:
                ai[na] = a
                aj[na] = b
                na += 1
            continue
        i[k], j[k] = a, b
        pa, pb = _row(p, a), _row(p, b)
        d1, b1 = _det3(ra, _sub(pb, pa), uu, error_factor)
        d2, b2 = _det3(ra, _sub(_row(q, b), pa), uu, error_factor)
        d3, b3 = _det3(rb, _sub(pa, pb), uu, error_factor)
        d4, b4 = _det3(rb, _sub(_row(q, a), pb), uu, error_factor)
        o1[k], o2[k], o3[k], o4[k] = d1, d2, d3, d4
        sure[k] = abs(d1) > b1 and abs(d2) > b2 and abs(d3) > b3 and abs(d4) > b4
        if sure[k] and (d1 > 0) != (d2 > 0) and (d3 > 0) != (d4 > 0):
            hit[k] = True
            h, bh = _det3(_sub(pa, pb), ra, rb, error_factor)
            H[k] = h
            h_doubt[k] = abs(h) <= bh
        k += 1
    return False, ai[:na], aj[:na], i, j, o1, o2, o3, o4, sure, hit, H, h_doubt


def warm_up() -> None:
    """Call every kernel once on a tiny input, with the argument types of real calls.

    This loads the cached machine code (or compiles it, the first time), so
    that the first real frame does not wait.
    """
    s = np.linspace(0.0, 2.0 * np.pi, 12, endpoint=False)
    x = np.ascontiguousarray(np.stack((np.cos(s), np.sin(s), 0.3 * np.sin(3 * s)), axis=1) * 3)
    one = np.array([12], dtype=np.int64)
    ring = np.array([True])
    kmt_reduce_chains(x, np.array([0], dtype=np.int64), one, ring, 1e-6, True, -1)
    q = np.ascontiguousarray(np.roll(x, -1, axis=0))
    chain = np.zeros(12, dtype=np.int64)
    first = np.arange(12, dtype=np.int64)
    contact_pairs(x, q, chain, first, one, ring, 1e-4)
    lo = np.ascontiguousarray(np.minimum(x[:, :2], q[:, :2]))
    hi = np.ascontiguousarray(np.maximum(x[:, :2], q[:, :2]))
    projected_crossings_float(x, q, np.array([0.0, 0.0, 1.0]), lo, hi, chain, first, one, ring,
                              1e-15)
