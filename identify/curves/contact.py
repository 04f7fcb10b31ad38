"""Self-contact: chains that pass through themselves (or each other) have no knot type.

Two segments that are not neighbours along a chain and come closer than a
tolerance (relative to the median bond length) mean that the curve touches
itself: a crossing change could sit there, so the knot type is ill-defined.
That is reported as an error, never guessed.
"""

from __future__ import annotations

import numpy as np

from ..errors import CurveError
from .segments import near_pairs, segment_distances

__all__ = ["CONTACT_TOL", "SegmentSet", "segment_set", "closest_contacts", "check_no_contact"]

#: Non-adjacent segments closer than this (in median bond lengths) touch.
CONTACT_TOL = 1e-4


class SegmentSet:
    """The segments of several polygonal chains in one flat array.

    Attributes
    ----------
    p, q : (m, 3) arrays
        Segment ends.
    chain : (m,) int array
        Index of the chain of each segment.
    first : (m,) int array
        Index (along its chain) of the segment's first vertex.
    sizes : list of int
        Number of vertices of each chain.
    closed : list of bool
    """

    def __init__(self, p, q, chain, first, sizes, closed):
        self.p, self.q, self.chain, self.first = p, q, chain, first
        self.sizes, self.closed = sizes, closed

    def adjacent(self, i: np.ndarray, j: np.ndarray) -> np.ndarray:
        """True where segments ``i`` and ``j`` share a vertex (neighbours along one chain)."""
        same = self.chain[i] == self.chain[j]
        n = np.asarray(self.sizes)[self.chain[i]]
        cl = np.asarray(self.closed)[self.chain[i]]
        d = np.abs(self.first[i] - self.first[j])
        return same & ((d == 1) | (cl & (d == n - 1)) | (d == 0))


def segment_set(chains: list[tuple[np.ndarray, bool]]) -> SegmentSet:
    """The segments of ``[(vertices, closed), ...]`` (rings get their closing segment)."""
    ps, qs, cs, fs = [], [], [], []
    for k, (x, closed) in enumerate(chains):
        if closed:
            ps.append(x)
            qs.append(np.roll(x, -1, axis=0))
            fs.append(np.arange(len(x)))
        else:
            ps.append(x[:-1])
            qs.append(x[1:])
            fs.append(np.arange(len(x) - 1))
        cs.append(np.full(len(fs[-1]), k))
    return SegmentSet(np.concatenate(ps), np.concatenate(qs), np.concatenate(cs),
                      np.concatenate(fs), [len(x) for x, _ in chains],
                      [bool(c) for _, c in chains])


def closest_contacts(segs: SegmentSet, tol: float
                     ) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """Pairs of non-adjacent segments closer than ``tol``: (i, j, distance), closest first."""
    lo = np.minimum(segs.p, segs.q) - tol / 2
    hi = np.maximum(segs.p, segs.q) + tol / 2
    i, j = near_pairs(lo, hi)
    keep = ~segs.adjacent(i, j)
    i, j = i[keep], j[keep]
    if i.size == 0:
        return i, j, np.zeros(0)
    d = segment_distances(segs.p[i], segs.q[i], segs.p[j], segs.q[j])
    close = d < tol
    order = np.argsort(d[close])
    return i[close][order], j[close][order], d[close][order]


def check_no_contact(chains: list[tuple[np.ndarray, bool]], ids: list[str],
                     kept: list[np.ndarray] | None = None, tol: float = CONTACT_TOL,
                     where: str = "") -> None:
    """Raise :class:`CurveError` when a chain passes through itself or another chain.

    Parameters
    ----------
    chains : list of (vertices, closed)
        In units of the median bond length.
    ids : list of str
        Chain ids for the message.
    kept : list of int arrays, optional
        Original bead index of each vertex (for the message).
    tol : float
        Contact distance in median bond lengths.
    where : str
        File and frame, for the message.

    Notes
    -----
    Segments are hashed into a grid, so the cost is about linear in the
    number of beads for chains of roughly uniform bond length.
    """
    segs = segment_set(chains)
    i, j, d = closest_contacts(segs, tol)
    if i.size == 0:
        return
    a, b = int(i[0]), int(j[0])

    def beads(s: int) -> str:
        c = int(segs.chain[s])
        k = int(segs.first[s])
        n = segs.sizes[c]
        k2 = (k + 1) % n
        if kept is not None:
            k, k2 = int(kept[c][k]), int(kept[c][k2])
        return f"chain {ids[c]} beads {k}-{k2}"

    ca, cb = int(segs.chain[a]), int(segs.chain[b])
    what = (f"chain {ids[ca]} passes through itself" if ca == cb
            else f"chains {ids[ca]} and {ids[cb]} touch")
    raise CurveError(
        f"{what}: the segments {beads(a)} and {beads(b)} are {d[0]:.2g} bond lengths apart "
        f"(contact below {tol:g}); the knot type is not defined there "
        f"({i.size} such contact(s) in all)", value=float(d[0]),
        where=(f"{where}, " if where else "") + beads(a))
