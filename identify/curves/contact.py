"""Self-contact: chains that pass through themselves (or each other) have no knot type.

Two segments that are not neighbours along a chain and meet (within the
floating-point resolution of the coordinates) mean that the curve passes
through itself: a crossing change could sit there, so the knot type is not
defined.  That is an error, never guessed.

Segments that come close without meeting are a *near approach*: the
coordinates still define the knot type, and the projection decides every
crossing by exact predicates (:mod:`.predicates`), so the answer is that of
the curve as given.  It is reported as a warning with the distance, since a
change of the coordinates that small (for example their rounding in a file)
could change the type.
"""

from __future__ import annotations

import numpy as np

from ..errors import CurveError
from .segments import compiled_geometry, near_pairs, numpy_kernel_time, segment_distances

__all__ = ["CONTACT_TOL", "RESOLUTION", "SegmentSet", "segment_set", "closest_contacts",
           "check_no_contact", "contact_resolution"]

#: Non-adjacent segments closer than this (in median bond lengths) are a near
#: approach, reported as a warning.
CONTACT_TOL = 1e-4
#: Segments closer than this, relative to the largest coordinate (at least 1
#: bond length), meet within floating-point resolution: the chain passes
#: through itself.  About 4500 unit roundoffs, above the rounding error of the
#: distance computation.
RESOLUTION = 1e-12


def contact_resolution(chains: list[tuple[np.ndarray, bool]]) -> float:
    """The distance (median bond lengths) under which two segments count as meeting."""
    scale = max((float(np.abs(x).max(initial=0.0)) for x, _ in chains), default=0.0)
    return RESOLUTION * max(1.0, scale)


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
    kernels = compiled_geometry()
    if kernels is not None:
        i, j, d = kernels.contact_pairs(
            segs.p, segs.q, segs.chain, segs.first, np.asarray(segs.sizes, dtype=np.int64),
            np.asarray(segs.closed, dtype=np.bool_), float(tol))
        order = np.argsort(d)
        return i[order], j[order], d[order]
    with numpy_kernel_time():
        return _closest_contacts_numpy(segs, tol)


def _closest_contacts_numpy(segs: SegmentSet, tol: float
                            ) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
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
                     where: str = "") -> list[str]:
    """Raise when a chain passes through itself or another; warn about near approaches.

    Parameters
    ----------
    chains : list of (vertices, closed)
        In units of the median bond length.
    ids : list of str
        Chain ids for the message.
    kept : list of int arrays, optional
        Original bead index of each vertex (for the message).
    tol : float
        Near-approach distance in median bond lengths (warned about).
    where : str
        File and frame, for the message.

    Returns
    -------
    list of str
        One warning naming the closest near approach and how many there are,
        or an empty list.

    Raises
    ------
    CurveError
        When two non-adjacent segments meet within :func:`contact_resolution`.

    Notes
    -----
    Segments are hashed into a grid, so the cost is about linear in the
    number of beads for chains of roughly uniform bond length.  Segments
    that meet exactly but are computed a little apart (nearly parallel ones)
    are still caught later: the exact projection finds them meeting in
    space and no direction is generic.
    """
    segs = segment_set(chains)
    i, j, d = closest_contacts(segs, tol)
    if i.size == 0:
        return []
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
    resolution = contact_resolution(chains)
    meeting = int(np.count_nonzero(d <= resolution))
    if meeting:
        what = (f"chain {ids[ca]} passes through itself" if ca == cb
                else f"chains {ids[ca]} and {ids[cb]} touch")
        raise CurveError(
            f"{what}: the segments {beads(a)} and {beads(b)} are {d[0]:.2g} bond lengths apart, "
            f"which is within the floating-point resolution of the coordinates "
            f"({resolution:.2g}); the knot type is not defined there "
            f"({meeting} such contact(s) in all)", value=float(d[0]),
            where=(f"{where}, " if where else "") + beads(a))
    what = (f"chain {ids[ca]} comes close to itself" if ca == cb
            else f"chains {ids[ca]} and {ids[cb]} come close")
    return [f"near approach: {what}: the segments {beads(a)} and {beads(b)} are {d[0]:.2g} "
            f"bond lengths apart ({i.size} approach(es) closer than {tol:g}); the crossings "
            "there are decided exactly, so the type is that of the coordinates as given, but "
            "moving a bead by that distance could change it"]
