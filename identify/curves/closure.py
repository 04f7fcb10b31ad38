"""Closing open chains, and the distribution of knot types over closures.

A knot type is defined only for closed curves, so an open chain (a protein
C-alpha trace, a linear polymer) is closed by a stated method (common
practice):

``direct``
    join the last bead to the first by a straight segment;
``far``
    send each end out to a far point along the ray from the centre of mass
    through it, and join the two far points along an arc of a large sphere
    that holds the whole chain;
``stochastic``
    for many directions ``w`` uniform on the sphere, send both ends to a
    point at a great distance along ``w`` (parallel rays joined far beyond
    the chain) and identify each closed curve; the dominant type is assigned
    when it holds a strict majority of the closures, otherwise the chain is
    "undetermined" (common practice).

Every random step takes a seed, so the same call gives the same spectrum.
"""

from __future__ import annotations

from collections import Counter
from dataclasses import dataclass, field

import numpy as np

from ..diagram import Diagram
from ..errors import CurveError
from ..invariants.fingerprint import Fingerprint
from .contact import CONTACT_TOL
from .kmt import KMT_TOL, kmt_reduce, triangles_hit
from .knot_type import polygon_type
from .projection import random_direction
from .segments import segment_distances

__all__ = [
    "CLOSURES",
    "DEFAULT_CLOSURES",
    "ClosureSpectrum",
    "sphere_directions",
    "direct_closure",
    "far_closure",
    "closure_towards",
    "closure_spectrum",
    "is_majority",
]

CLOSURES = ("direct", "far", "stochastic")
#: Default number of random closures.
DEFAULT_CLOSURES = 100
#: Far points lie this many chain radii from the centre of mass.
FAR_FACTOR = 10.0
#: A reused reduced chain with at most this many vertices (closure included)
#: is projected without reducing it again.
SMALL_POLYGON = 64


def sphere_directions(n: int, seed: int | np.random.Generator = 0) -> np.ndarray:
    """``n`` directions uniform on the unit sphere (normalised Gaussian vectors), seeded."""
    rng = seed if isinstance(seed, np.random.Generator) else np.random.default_rng(seed)
    return np.array([random_direction(rng) for _ in range(n)]).reshape(n, 3)


def _radius(x: np.ndarray) -> tuple[np.ndarray, float]:
    com = x.mean(axis=0)
    return com, float(np.linalg.norm(x - com, axis=1).max()) + 1.0


def direct_closure(x: np.ndarray) -> np.ndarray:
    """No extra points: the ring closes from the last bead to the first."""
    return np.zeros((0, 3))


def far_closure(x: np.ndarray) -> np.ndarray:
    """Points leading from the last bead out, round a large sphere, and back to the first.

    Each end goes out along the ray from the centre of mass through it to a
    sphere of ``FAR_FACTOR`` chain radii; the far points are joined by a
    great-circle arc in steps of at most 60 degrees, so every chord of the
    arc stays outside the ball that holds the chain.
    """
    com, rad = _radius(x)
    far = FAR_FACTOR * rad

    def outward(k: int, towards: int) -> np.ndarray:
        d = x[k] - com
        n = np.linalg.norm(d)
        if n < 1e-9 * rad:  # the end sits at the centre: leave along its bond
            d = x[k] - x[towards]
            n = np.linalg.norm(d)
        return d / n

    a, b = outward(-1, -2), outward(0, 1)
    angle = float(np.arccos(np.clip(a @ b, -1.0, 1.0)))
    axis = np.cross(a, b)
    if np.linalg.norm(axis) < 1e-9:
        helper = np.array([1.0, 0.0, 0.0]) if abs(a[0]) < 0.9 else np.array([0.0, 1.0, 0.0])
        axis = np.cross(a, helper)
    axis /= np.linalg.norm(axis)
    steps = max(1, int(np.ceil(angle / (np.pi / 3))))
    pts = []
    for k in range(steps + 1):
        th = angle * k / steps
        # rotate a about axis by th (Rodrigues)
        v = a * np.cos(th) + np.cross(axis, a) * np.sin(th) + axis * (axis @ a) * (1 - np.cos(th))
        pts.append(com + far * v)
    return np.array(pts)


def closure_towards(x: np.ndarray, w: np.ndarray) -> np.ndarray:
    """Two points: both ends sent a great distance along ``w`` (beyond the chain) and joined."""
    com, rad = _radius(x)
    # both far points lie at least `rad` beyond the ball holding the chain along w
    reach_last = (com - x[-1]) @ w + 2 * rad
    reach_first = (com - x[0]) @ w + 2 * rad
    return np.array([x[-1] + reach_last * w, x[0] + reach_first * w])


def _closure_segments(x: np.ndarray, pts: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """Segments of the closure from the last bead through ``pts`` to the first bead."""
    path = np.concatenate((x[-1:], pts, x[:1]))
    return path[:-1], path[1:]


def _touches_chain(x: np.ndarray, p: np.ndarray, q: np.ndarray, tol: float) -> bool:
    """True when a closure segment comes within ``tol`` of a chain segment it does not join."""
    n = len(x) - 1
    cp, cq = x[:-1], x[1:]
    m = p.shape[0]
    ii = np.repeat(np.arange(m), n)
    jj = np.tile(np.arange(n), m)
    # the first closure segment leaves the last bead, the final one reaches the first bead
    skip = ((ii == 0) & (jj == n - 1)) | ((ii == m - 1) & (jj == 0))
    ii, jj = ii[~skip], jj[~skip]
    d = segment_distances(p[ii], q[ii], cp[jj], cq[jj])
    return bool(np.any(d < tol))


@dataclass
class ClosureType:
    """One knot type met among the closures: its fingerprint, count and an example diagram."""

    fingerprint: Fingerprint
    count: int
    diagram: Diagram


@dataclass
class ClosureSpectrum:
    """The distribution of knot types over the closures of one open chain.

    Attributes
    ----------
    method : str
    n_closures : int
    seed : int
    types : list of ClosureType
        Most frequent first.
    dominant : ClosureType or None
        The type of a strict majority of the closures, else None ("undetermined").
    redrawn : int
        Closure directions replaced because the closure touched the chain.
    reused : int
        Closures that reused the once-reduced open chain (for the others a
        closure segment crossed a deleted triangle: they restart from the
        deletions made before that triangle).
    vertices_reduced : int
        Vertices of the open chain after its own KMT reduction.
    crossings : list of int
        Crossings projected for each closure (before simplification).
    """

    method: str
    n_closures: int
    seed: int
    types: list[ClosureType] = field(default_factory=list)
    dominant: ClosureType | None = None
    redrawn: int = 0
    reused: int = 0
    vertices_reduced: int = 0
    crossings: list[int] = field(default_factory=list)


def closure_spectrum(x: np.ndarray, method: str = "stochastic",
                     n_closures: int = DEFAULT_CLOSURES, seed: int = 0, where: str = "",
                     reduce: bool = True, target: str | None = None) -> ClosureSpectrum:
    """Close an open chain and fingerprint each closure.

    Parameters
    ----------
    x : (N, 3) array
        The open chain, prepared (median bond 1, see
        :func:`knotsift.curves.frame.prepare_chains`) and free of self-contact.
    method : {"direct", "far", "stochastic"}
    n_closures : int
        Number of random directions (stochastic only).
    seed : int
        Seeds the directions and the projections.
    where : str
        For error messages.
    reduce : bool
        KMT-reduce (off only for benchmarks of the plain path).
    target : str, optional
        A fingerprint key: stop as soon as it is decided whether this type
        holds a strict majority of the ``n_closures`` closures (the spectrum
        is then partial; ``dominant`` is set only if it does).

    Returns
    -------
    ClosureSpectrum

    Raises
    ------
    CurveError
        When a direct or far closure passes through the chain (its knot type
        is then not defined), or the method is unknown.

    Notes
    -----
    The open chain is KMT-reduced once with its ends fixed, recording every
    deleted triangle.  Each closure then reuses the reduced chain only after
    checking that none of its segments passes through (or within the
    tolerance of) any deleted triangle; otherwise that closure keeps only the
    deletions made before the first triangle it meets (each was an isotopy of
    the closed curve too) and its polygon is reduced again from there.  With
    100 closures the cost is one reduction of the chain plus 100 small
    reductions and projections.
    """
    if method not in CLOSURES:
        raise CurveError(f"closure must be one of {', '.join(CLOSURES)}, got {method!r}",
                         value=method, where=where or None)
    if method == "stochastic" and (not isinstance(n_closures, (int, np.integer))
                                   or n_closures < 1):
        raise CurveError(f"the number of closures must be a positive integer, got "
                         f"{n_closures!r}", value=n_closures, where=where or None)
    x = np.asarray(x, dtype=np.float64)
    spectrum = ClosureSpectrum(method, n_closures if method == "stochastic" else 1, seed)
    if reduce:
        red = kmt_reduce([(x, False)], record=True)
        xr = red.chains[0][0]
        tris, tri_ids = red.triangles, red.triangle_ids
    else:
        xr, tris, tri_ids = x, None, None
    spectrum.vertices_reduced = len(xr)
    ends = (0, len(x) - 1)
    rng_dirs = np.random.default_rng([seed, 1])
    rng_proj = np.random.default_rng([seed, 2])
    counts: Counter[str] = Counter()
    by_key: dict[str, ClosureType] = {}

    def close_with(pts: np.ndarray, label: str) -> bool:
        p, q = _closure_segments(x, pts)
        if _touches_chain(x, p, q, CONTACT_TOL):
            if method != "stochastic":
                raise CurveError(f"the {label} closure passes through the chain (a closure "
                                 "segment comes within contact distance of it); the closed "
                                 "curve's knot type is not defined", where=where or None)
            return False
        hit = triangles_hit(tris, tri_ids, p, q, ends, KMT_TOL) if reduce else 0
        use_reduced = reduce and hit < 0
        if use_reduced or not reduce:
            base = xr
        else:
            # the deletions before the first triangle hit are still isotopies
            keep = np.ones(len(x), dtype=bool)
            keep[tri_ids[:hit, 2]] = False
            base = x[keep]
        ring = np.concatenate((base, pts))
        # a short reduced chain plus its closure projects to a small diagram as it is
        again = reduce and not (use_reduced and len(ring) <= SMALL_POLYGON)
        typed = polygon_type([(ring, True)], rng_proj, reduce=again, simplified=reduce,
                             where=where)
        spectrum.reused += int(use_reduced)
        spectrum.crossings.append(typed.crossings)
        key = typed.fingerprint.key()
        counts[key] += 1
        if key not in by_key:
            by_key[key] = ClosureType(typed.fingerprint, 0, typed.simplified)
        return True

    if method == "direct":
        close_with(direct_closure(x), "direct")
    elif method == "far":
        close_with(far_closure(x), "far")
    else:
        made = 0
        while made < n_closures:
            w = random_direction(rng_dirs)
            if close_with(closure_towards(x, w), "stochastic"):
                made += 1
                if target is not None:
                    hits = counts.get(target, 0)
                    if 2 * hits > n_closures or 2 * (hits + n_closures - made) <= n_closures:
                        break
            else:
                spectrum.redrawn += 1
                if spectrum.redrawn > 10 * n_closures:
                    raise CurveError("random closures keep touching the chain",
                                     where=where or None)
    for key, c in counts.most_common():
        t = by_key[key]
        t.count = c
        spectrum.types.append(t)
    top = spectrum.types[0]
    if is_majority(top.count, spectrum.n_closures):
        spectrum.dominant = top
    return spectrum


def is_majority(count: int, total: int) -> bool:
    """True when ``count`` of ``total`` closures is a strict majority (more than half)."""
    return 2 * count > total

