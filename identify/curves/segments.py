"""Segments of polygonal chains: near pairs by a uniform grid, distances, triangle tests.

These are the floating-point kernels under the reduction and the projection.
Every test here is one-sided on purpose: "near" may be reported for a pair
that is in fact a little farther apart than the tolerance, never the reverse,
so callers that keep a vertex "when in doubt" stay correct.
"""

from __future__ import annotations

import os
import threading
import time
from contextlib import contextmanager

import numpy as np

__all__ = [
    "compiled_geometry",
    "preload_compiled",
    "compiled_installed",
    "numpy_kernel_time",
    "near_pairs",
    "segment_distances",
    "point_segment_distances",
    "triangle_segment_near",
    "apex_segment_near",
]

#: Boxes spanning more grid cells than this are compared with every box directly.
_MAX_CELLS = 64
#: ``KNOTSIFT_NO_COMPILED=1`` turns the compiled kernels off (numpy only).
NO_COMPILED_VARIABLE = "KNOTSIFT_NO_COMPILED"
#: ``KNOTSIFT_COMPILED=1`` uses them from the first call (benchmarks, long runs).
COMPILED_VARIABLE = "KNOTSIFT_COMPILED"
#: CPU seconds of numpy kernel time after which a process starts loading the
#: compiled kernels by itself: about what loading them costs (import numba and
#: the cached machine code, about 0.3 + 0.7 s), so a one-frame command never
#: loads numba at all.
SWITCH_AFTER_SECONDS = 1.0
_numpy_seconds = [0.0]
_state: dict = {"pid": None, "done": False, "module": None, "thread": None}


def _flag(name: str) -> bool:
    return os.environ.get(name, "") not in ("", "0")


def _load() -> None:
    """Import (and, the first time on a machine, compile) the kernels; None on any failure."""
    try:
        from . import compiled_geometry as module

        module.warm_up()
    except Exception:  # numba missing or unable to compile here: the numpy path stays
        module = None
    _state["module"] = module
    _state["done"] = True


def compiled_geometry():
    """The compiled kernels (:mod:`.compiled_geometry`), or None for the numpy path.

    Both paths compute identical results.  None when ``KNOTSIFT_NO_COMPILED=1``
    is set or numba cannot be used.  Otherwise the kernels are loaded in a
    background thread once this process has spent
    :data:`SWITCH_AFTER_SECONDS` in the numpy kernels, and used as soon as
    they are ready: a one-frame command never pays the second that loading
    costs, and no item's wall-time budget waits for it (the first compilation
    on a machine takes about a minute; later processes load the cache).
    ``KNOTSIFT_COMPILED=1`` loads them at the first call instead and waits.
    numba is never imported at package import, so paths without 3D curves do
    not pay for it.
    """
    if _flag(NO_COMPILED_VARIABLE):
        return None
    if _state["pid"] != os.getpid():  # a new process, or a forked child
        if _state.get("done") and _state.get("thread") is None:
            _state["pid"] = os.getpid()   # loaded by the parent before the fork: keep it
        else:                             # a load in a thread does not survive a fork
            _state.update(pid=os.getpid(), done=False, module=None, thread=None)
    if _state["done"]:
        return _state["module"]
    if _flag(COMPILED_VARIABLE):
        thread = _state["thread"]
        if thread is not None:
            thread.join()
        else:
            _load()
        return _state["module"]
    if _numpy_seconds[0] >= SWITCH_AFTER_SECONDS and _state["thread"] is None:
        thread = threading.Thread(target=_load, name="knotsift-compiled-kernels", daemon=True)
        _state["thread"] = thread
        thread.start()
    return None


def preload_compiled() -> bool:
    """Load the compiled kernels now, in this thread; True when they are in use.

    For a parent about to fork workers that have many frames ahead (``classify``):
    the children inherit the loaded kernels, so none of them pays the load or
    runs its first second on numpy.  Does nothing with ``KNOTSIFT_NO_COMPILED=1``;
    without numba it returns False and the numpy path stays.
    """
    if _flag(NO_COMPILED_VARIABLE):
        return False
    compiled_geometry()   # settles the state of a new or forked process (may start a load)
    if _state["thread"] is not None:
        _state["thread"].join()
    elif not _state["done"]:
        _load()
    return _state["module"] is not None


def compiled_installed() -> bool:
    """numba importable, or the compiled kernels deliberately turned off.

    False means a long run is on the numpy kernels only for want of numba (a
    run's summary then names the ``fast`` extra).  Imports nothing.
    """
    import importlib.util

    return _flag(NO_COMPILED_VARIABLE) or importlib.util.find_spec("numba") is not None


@contextmanager
def numpy_kernel_time():
    """Count the CPU time of a numpy kernel towards the switch to the compiled ones."""
    t0 = time.process_time()
    try:
        yield
    finally:
        _numpy_seconds[0] += time.process_time() - t0


def cross(u: np.ndarray, v: np.ndarray) -> np.ndarray:
    """Row-wise cross product of (n, 3) arrays (faster than numpy.cross for small n)."""
    u0, u1, u2 = u[:, 0], u[:, 1], u[:, 2]
    v0, v1, v2 = v[:, 0], v[:, 1], v[:, 2]
    return np.stack((u1 * v2 - u2 * v1, u2 * v0 - u0 * v2, u0 * v1 - u1 * v0), axis=1)


def _dot(u: np.ndarray, v: np.ndarray) -> np.ndarray:
    """Row-wise dot product of (n, 3) arrays, summed left to right.

    Written out rather than ``einsum`` (which pairs the terms its own way), so
    that the compiled kernels, summing in the same order, agree to the last bit.
    """
    return u[:, 0] * v[:, 0] + u[:, 1] * v[:, 1] + u[:, 2] * v[:, 2]


def norm(u: np.ndarray) -> np.ndarray:
    """Row-wise Euclidean norm of an (n, 3) array."""
    return np.sqrt(_dot(u, u))


def _cells(lo: np.ndarray, hi: np.ndarray, cell: float):
    """Grid cells covered by each box: (box index, cell key) pairs, and the big boxes."""
    ilo = np.floor(lo / cell).astype(np.int64)
    ihi = np.floor(hi / cell).astype(np.int64)
    span = ihi - ilo + 1
    count = np.prod(span, axis=1)
    big = np.flatnonzero(count > _MAX_CELLS)
    small = np.flatnonzero(count <= _MAX_CELLS)
    cnt = count[small]
    owner = np.repeat(small, cnt)
    start = np.concatenate(([0], np.cumsum(cnt)[:-1]))
    k = np.arange(owner.size) - np.repeat(start, cnt)
    d = lo.shape[1]
    key = np.zeros(owner.size, dtype=np.int64)
    sp = span[owner]
    base = ilo[owner]
    rest = k
    for axis in range(d):
        off = rest % sp[:, axis]
        rest = rest // sp[:, axis]
        key = key * 2_097_152 + ((base[:, axis] + off) & 0x1FFFFF)
    return owner, key, big


def _expand(starts: np.ndarray, stops: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """Concatenated ranges [starts[i], stops[i]) and the index i each element comes from."""
    n = np.maximum(stops - starts, 0)
    src = np.repeat(np.arange(starts.size), n)
    first = np.concatenate(([0], np.cumsum(n)[:-1]))
    pos = np.arange(src.size) - np.repeat(first, n) + np.repeat(starts, n)
    return src, pos


def near_pairs(lo_a: np.ndarray, hi_a: np.ndarray, lo_b: np.ndarray | None = None,
               hi_b: np.ndarray | None = None, cell: float | None = None
               ) -> tuple[np.ndarray, np.ndarray]:
    """Index pairs of axis-aligned boxes that overlap (closed boxes, any dimension).

    Parameters
    ----------
    lo_a, hi_a : (n, d) arrays
        Lower and upper corners of the first set of boxes.
    lo_b, hi_b : (m, d) arrays, optional
        A second set.  Without it, pairs ``i < j`` within the first set are returned.
    cell : float, optional
        Grid cell size; default twice the median box extent.

    Returns
    -------
    (i, j) : two int arrays
        Every overlapping pair exactly once (``i`` indexes set a, ``j`` set b).

    Notes
    -----
    Boxes are hashed into a uniform grid; only boxes sharing a cell are
    compared.  For boxes of similar size spread in space the cost is about
    linear in the number of boxes.  Boxes much larger than the cell (such as
    the long segments of a closure) are compared with every box directly.
    """
    self_pairs = lo_b is None
    if self_pairs:
        lo_b, hi_b = lo_a, hi_a
    na, nb = lo_a.shape[0], lo_b.shape[0]
    empty = (np.zeros(0, dtype=np.int64), np.zeros(0, dtype=np.int64))
    if na == 0 or nb == 0:
        return empty
    if na * nb <= 40_000:
        ov = np.all((lo_a[:, None, :] <= hi_b[None, :, :]) & (lo_b[None, :, :] <= hi_a[:, None, :]),
                    axis=2)
        if self_pairs:
            ov = np.triu(ov, 1)
        i, j = np.nonzero(ov)
        return i.astype(np.int64), j.astype(np.int64)
    if cell is None:
        ext = np.concatenate(((hi_a - lo_a).max(axis=1), (hi_b - lo_b).max(axis=1)))
        cell = 2.0 * float(np.median(ext))
        if not np.isfinite(cell) or cell <= 0:
            cell = float(ext.max()) or 1.0
    oa, ka, big_a = _cells(lo_a, hi_a, cell)
    if self_pairs:
        ob, kb, big_b = oa, ka, big_a
    else:
        ob, kb, big_b = _cells(lo_b, hi_b, cell)
    order = np.argsort(kb, kind="stable")
    kb_sorted, ob_sorted = kb[order], ob[order]
    if self_pairs:
        # pairs within each run of equal keys
        stop = np.searchsorted(kb_sorted, kb_sorted, side="right")
        src, pos = _expand(np.arange(kb_sorted.size) + 1, stop)
        i, j = ob_sorted[src], ob_sorted[pos]
    else:
        left = np.searchsorted(kb_sorted, ka, side="left")
        right = np.searchsorted(kb_sorted, ka, side="right")
        src, pos = _expand(left, right)
        i, j = oa[src], ob_sorted[pos]
    parts_i, parts_j = [i], [j]
    # big boxes against everything
    for b in big_a:
        parts_i.append(np.full(nb, b, dtype=np.int64))
        parts_j.append(np.arange(nb, dtype=np.int64))
    if not self_pairs:
        for b in big_b:
            parts_i.append(np.arange(na, dtype=np.int64))
            parts_j.append(np.full(na, b, dtype=np.int64))
    i = np.concatenate(parts_i)
    j = np.concatenate(parts_j)
    if self_pairs:
        keep = i != j
        i, j = np.minimum(i[keep], j[keep]), np.maximum(i[keep], j[keep])
    if i.size == 0:
        return empty
    code = np.unique(i * nb + j)
    i, j = code // nb, code % nb
    ok = np.all((lo_a[i] <= hi_b[j]) & (lo_b[j] <= hi_a[i]), axis=1)
    return i[ok], j[ok]


def point_segment_distances(x: np.ndarray, p: np.ndarray, q: np.ndarray) -> np.ndarray:
    """Distance from each point ``x[k]`` to the segment ``[p[k], q[k]]``."""
    d = q - p
    dd = _dot(d, d)
    t = _dot(x - p, d) / np.where(dd > 0, dd, 1.0)
    t = np.clip(t, 0.0, 1.0)
    return norm(x - (p + t[:, None] * d))


def segment_distances(p1: np.ndarray, q1: np.ndarray, p2: np.ndarray, q2: np.ndarray
                      ) -> np.ndarray:
    """Shortest distance between segments ``[p1[k], q1[k]]`` and ``[p2[k], q2[k]]``.

    Notes
    -----
    The closest pair of points minimises a convex quadratic over the unit
    square; the minimum lies either inside (where both partial derivatives
    vanish) or on one of the four edges, where it is a point-segment distance.
    All five candidates are evaluated and the smallest kept, which is exact up
    to rounding and needs no case analysis for parallel segments.
    """
    d1 = q1 - p1
    d2 = q2 - p2
    r = p1 - p2
    a = _dot(d1, d1)
    e = _dot(d2, d2)
    b = _dot(d1, d2)
    c = _dot(d1, r)
    f = _dot(d2, r)
    den = a * e - b * b
    good = den > 1e-12 * np.maximum(a * e, 1e-300)
    safe = np.where(good, den, 1.0)
    s = (b * f - c * e) / safe
    t = (a * f - b * c) / safe
    inside = good & (s >= 0) & (s <= 1) & (t >= 0) & (t <= 1)
    best = np.full(p1.shape[0], np.inf)
    if inside.any():
        w = (p1 + s[:, None] * d1) - (p2 + t[:, None] * d2)
        best = np.where(inside, norm(w), best)
    best = np.minimum(best, point_segment_distances(p1, p2, q2))
    best = np.minimum(best, point_segment_distances(q1, p2, q2))
    best = np.minimum(best, point_segment_distances(p2, p1, q1))
    best = np.minimum(best, point_segment_distances(q2, p1, q1))
    return best


def triangle_segment_near(a: np.ndarray, b: np.ndarray, c: np.ndarray, p: np.ndarray,
                          q: np.ndarray, tol: float) -> np.ndarray:
    """True where segment ``[p, q]`` may come within ``tol`` of triangle ``(a, b, c)``.

    One-sided: False guarantees a distance of at least ``tol``; True means the
    segment meets the triangle or could not be shown to stay clear of it.

    Notes
    -----
    For a proper triangle the segment is clipped to the slab of half-width
    ``tol`` about the triangle's plane; it is clear when the slab misses it or
    the clipped piece lies beyond one edge by more than ``tol`` (a separating
    line in the plane).  A needle-thin triangle lies within its height ``h``
    of its longest edge, so it is clear of any segment farther than
    ``tol + h`` from that edge.
    """
    n = a.shape[0]
    near = np.zeros(n, dtype=bool)
    if n == 0:
        return near
    ab, ac, bc = b - a, c - a, c - b
    normal = cross(ab, ac)
    area2 = norm(normal)
    la = norm(bc)
    lb = norm(ac)
    lc = norm(ab)
    longest = np.maximum(np.maximum(la, lb), lc)
    thin = area2 <= 1e-6 * longest * longest
    # needle-thin (or zero-area) triangles: distance to the longest edge
    if thin.any():
        k = np.flatnonzero(thin)
        which = np.argmax(np.stack((lc[k], la[k], lb[k]), axis=1), axis=1)
        corners = np.stack((a[k], b[k], c[k]), axis=1)  # (m, 3, 3)
        rows = np.arange(k.size)
        u = corners[rows, which]            # longest edge (u, v) ...
        v = corners[rows, (which + 1) % 3]
        w = corners[rows, (which + 2) % 3]  # ... and the third vertex w
        h = point_segment_distances(w, u, v)
        near[k] = segment_distances(u, v, p[k], q[k]) <= tol + h
    k = np.flatnonzero(~thin)
    if k.size == 0:
        return near
    nh = normal[k] / area2[k][:, None]
    ak, bk, ck, pk, qk = a[k], b[k], c[k], p[k], q[k]
    dp = _dot(pk - ak, nh)
    dq = _dot(qk - ak, nh)
    outside = ((dp > tol) & (dq > tol)) | ((dp < -tol) & (dq < -tol))
    dd = dq - dp
    flat = np.abs(dd) <= 1e-300
    with np.errstate(divide="ignore", invalid="ignore"):
        t_a = np.where(flat, 0.0, (tol - dp) / np.where(flat, 1.0, dd))
        t_b = np.where(flat, 1.0, (-tol - dp) / np.where(flat, 1.0, dd))
    t0 = np.clip(np.minimum(t_a, t_b), 0.0, 1.0)
    t1 = np.clip(np.maximum(t_a, t_b), 0.0, 1.0)
    seg = qk - pk
    x0 = pk + t0[:, None] * seg
    x1 = pk + t1[:, None] * seg
    clear = outside.copy()
    for s, e in ((ak, bk), (bk, ck), (ck, ak)):
        edge = e - s
        m = cross(edge, nh)
        m /= norm(m)[:, None]
        clear |= (_dot(x0 - s, m) > tol) & (_dot(x1 - s, m) > tol)
    near[k] = ~clear
    return near


def apex_segment_near(apex: np.ndarray, y: np.ndarray, z: np.ndarray, f: np.ndarray,
                      angle: float = 1e-6) -> np.ndarray:
    """True where the segment ``[apex, f]`` may enter the triangle ``(apex, y, z)``.

    The segment shares the vertex ``apex`` with the triangle, so it touches
    it there; it meets the rest of the triangle exactly when its direction
    lies in the planar cone spanned by ``y - apex`` and ``z - apex``.  True is
    returned when the direction is within ``angle`` radians of that cone (one-sided).
    """
    n = apex.shape[0]
    if n == 0:
        return np.zeros(0, dtype=bool)
    with np.errstate(divide="ignore", invalid="ignore"):
        u = f - apex
        u = u / norm(u)[:, None]
        e1 = y - apex
        e1 = e1 / norm(e1)[:, None]
        e2 = z - apex
        e2 = e2 / norm(e2)[:, None]
    broken = ~(np.isfinite(u).all(axis=1) & np.isfinite(e1).all(axis=1)
               & np.isfinite(e2).all(axis=1))
    if broken.any():  # a zero-length side: in doubt
        u, e1, e2 = (np.where(broken[:, None], 1.0, v) for v in (u, e1, e2))

    def close(v, e):
        return (_dot(v, e) > 0) & (norm(cross(v, e)) < angle)

    near = close(u, e1) | close(u, e2)
    nn = cross(e1, e2)
    s = norm(nn)
    g = _dot(e1, e2)
    degenerate = s < 1e-9
    # cone nearly a ray (e1 ~ e2) or nearly a line through the apex (e1 ~ -e2)
    width = np.arcsin(np.clip(s, 0.0, 1.0))
    ray = degenerate & (g > 0)
    near |= ray & (_dot(u, e1) > 0) & (norm(cross(u, e1)) < angle + width)
    near |= degenerate & (g <= 0)
    ok = ~degenerate
    if ok.any():
        nh = nn[ok] / s[ok][:, None]
        uo, e1o, e2o, go = u[ok], e1[ok], e2[ok], g[ok]
        off = np.abs(_dot(uo, nh))
        u1, u2 = _dot(uo, e1o), _dot(uo, e2o)
        den = 1.0 - go * go
        alpha = (u1 - go * u2) / den
        beta = (u2 - go * u1) / den
        slack = 1e-12
        near[ok] |= (alpha >= -slack) & (beta >= -slack) & (off < angle)
    return near | broken
