"""The knotted core: the shortest subchain that still carries the chain's knot type.

A subchain is judged by closing it with the same closure as the whole chain
(for a ring, its arcs are closed with the closure chosen for the call) and
comparing fingerprints.  The search is a heuristic, stated plainly in
:func:`knotted_core`.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from ..errors import CurveError
from .closure import closure_spectrum

__all__ = ["KnottedCore", "knotted_core", "MIN_CORE"]

#: The shortest subchain tried, in beads.
MIN_CORE = 4
#: Cut points tried around a ring.
RING_CUTS = 4
#: Upper bound on the identifications one search may spend.
MAX_EVALUATIONS = 400
#: Random closures per subchain while the boundaries are searched: the first
#: directions of the full set (same seed), so a scouted window is usually confirmed.
SCOUT_CLOSURES = 9
#: While scouting, the bisection stops at 1/SCOUT_RESOLUTION of the chain and no
#: local steps are tried (the confirmation's margin is coarser than both).
SCOUT_RESOLUTION = 128
#: Steps (beads) of the local refinement after the bisection.
LOCAL_STEPS = (1, 4)
#: The scouted window is confirmed with a margin of 1/CONFIRM_MARGIN of its
#: length (at least 2 beads) at both ends: at its exact edges the type holds
#: for about half of the closures, and a confirmation there would mostly fail.
CONFIRM_MARGIN = 32


@dataclass
class KnottedCore:
    """Where the knot sits along the chain.

    Attributes
    ----------
    start, end : int
        First and last bead of the core (0-based, inclusive, input numbering).
        For a ring the core may wrap round: then ``start > end``.
    beads : int
        Number of beads in the core.
    fraction : float
        ``beads`` over the chain's bead count.
    closure : str
        How subchains were closed.
    evaluations : int
        Subchains identified during the search.
    wraps : bool
        The core of a ring runs through its last bead back to its first.
    """

    start: int
    end: int
    beads: int
    fraction: float
    closure: str
    evaluations: int
    wraps: bool = False

    def to_dict(self) -> dict:
        return {"start": self.start, "end": self.end, "beads": self.beads,
                "fraction": round(self.fraction, 4), "closure": self.closure,
                "evaluations": self.evaluations, "wraps": self.wraps}


class _Judge:
    """Does a subchain (closed by the given method) have the target type?  Cached."""

    def __init__(self, x, target, closure, n_closures, seed, where):
        self.x, self.target = x, target
        self.closure, self.n, self.seed, self.where = closure, n_closures, seed, where
        self.cache: dict[tuple[int, int, int], bool] = {}
        self.evaluations = 0

    def __call__(self, offset: int, i: int, j: int) -> bool:
        key = (offset, i, j)
        if key in self.cache:
            return self.cache[key]
        if j - i + 1 < MIN_CORE:
            return False
        if self.evaluations >= MAX_EVALUATIONS:
            return False
        self.evaluations += 1
        n = len(self.x)
        idx = (np.arange(i, j + 1) + offset) % n
        y = self.x[idx]
        try:
            sp = closure_spectrum(y, self.closure, self.n, self.seed, where=self.where,
                                  target=self.target)
            ok = sp.dominant is not None and sp.dominant.fingerprint.key() == self.target
        except CurveError:
            ok = False  # e.g. a direct closure through the chain: not this type
        self.cache[key] = ok
        return ok


def _bisect(keeps, lo: int, hi: int, resolution: int) -> tuple[int, int]:
    """Narrow (lo, hi) to ``resolution``: ``keeps(m)`` true moves lo up to m, false hi down."""
    while hi - lo > resolution:
        m = (lo + hi) // 2
        if keeps(m):
            lo = m
        else:
            hi = m
    return lo, hi


def _trim(judge: _Judge, offset: int, n: int, resolution: int = 1, refine: bool = True
          ) -> tuple[int, int]:
    """Shrink [0, n-1] (known to carry the type) from both ends: bisection, then local steps.

    The bisection stops once the boundary is known to ``resolution`` beads
    (keeping the side that carries the type); ``refine`` adds the local steps.
    """
    # largest start that still carries the type, then the smallest end
    i, _ = _bisect(lambda m: judge(offset, m, n - 1), 0, n - MIN_CORE + 1, resolution)
    _, j = _bisect(lambda m: not judge(offset, i, m), i + MIN_CORE - 2, n - 1, resolution)
    # local refinement: the type need not be monotone in the window
    improved = refine
    while improved:
        improved = False
        for d in LOCAL_STEPS:
            if judge(offset, i + d, j):
                i += d
                improved = True
                break
            if judge(offset, i, j - d):
                j -= d
                improved = True
                break
            if judge(offset, i + d, j - d):
                i, j = i + d, j - d
                improved = True
                break
    return i, j


def _confirm(judge: _Judge, offset: int, i: int, j: int, n: int, closed: bool
             ) -> tuple[int, int] | None:
    """The window [i, j] widened by a margin if it carries the type under the full closure.

    The margin is ``CONFIRM_MARGIN``-th of the window (at least 2 beads) at
    both ends, and doubles each time the full closure does not confirm the
    window, until it does.  An open chain as a whole carries its type by
    definition; for a ring cut at ``offset`` None means no arc of this cut
    does.
    """
    d = max(2, (j - i + 1) // CONFIRM_MARGIN)
    while True:
        a, b = max(0, i - d), min(n - 1, j + d)
        if (a, b) == (0, n - 1):
            return (a, b) if (not closed or judge(offset, a, b)) else None
        if judge(offset, a, b):
            return a, b
        d *= 2


def knotted_core(x: np.ndarray, closed: bool, target: str, closure: str = "stochastic",
                 n_closures: int = 100, seed: int = 0, kept: np.ndarray | None = None,
                 n_input: int | None = None, where: str = "") -> KnottedCore | None:
    """The shortest subchain found that keeps the knot type ``target``.

    Parameters
    ----------
    x : (N, 3) array
        The chain, prepared (median bond 1) and free of self-contact.
    closed : bool
        Ring or open chain.
    target : str
        Fingerprint key of the whole chain's type (never the unknot's).
    closure : {"direct", "far", "stochastic"}
        How each subchain (for a ring: each arc) is closed.
    n_closures, seed : int
        For stochastic closure.
    kept : int array, optional
        Original bead numbers of the rows of ``x`` (after repeated beads were
        dropped), for the reported indices.
    n_input : int, optional
        Number of beads in the input (default ``len(x)``).
    where : str

    Returns
    -------
    KnottedCore or None
        None when no arc of a ring keeps the type (the knot is spread over
        the whole ring).

    Notes
    -----
    How it is searched: for an open chain, the start is moved forward by
    bisection as far as the subchain still has the type, then the end is
    moved back the same way; then a local refinement tries small steps
    (``LOCAL_STEPS``: 1 and 4 beads) at either end and both, until none
    keeps the type.  With stochastic closure this search judges each
    subchain by its first ``SCOUT_CLOSURES`` closures only (a majority of
    those; the same directions begin the full set), bisects only to
    ``1/SCOUT_RESOLUTION`` of the chain without local steps, and the window
    found is then confirmed with all ``n_closures``, with a margin that is
    widened until the full closure confirms it (:func:`_confirm`).  So the reported
    core always carries the type under the full closure, while scouting
    makes each step several times cheaper.  For
    a ring, the ring is cut open at ``RING_CUTS`` equally spaced bonds and
    each resulting chain is searched as above, in turn, until one gives a
    core of at most half the ring (the other cuts would most likely lead to
    the same core again); the shortest core found is kept.  A core shorter
    than three quarters of the ring avoids at least one cut.

    Because a knot type need not change monotonically as beads are removed,
    bisection can stop at a boundary that is not the best one, so the core
    found always carries the type but is **not guaranteed to be the
    shortest**.  Cost: about ``2 log2 N`` plus a few dozen identifications
    (for a ring, usually one cut's worth), each with ``SCOUT_CLOSURES``
    projections for stochastic closure, plus one or a few confirmations with
    ``n_closures`` projections (each stopping once the majority is decided).
    """
    x = np.asarray(x, dtype=np.float64)
    n = len(x)
    judge = _Judge(x, target, closure, n_closures, seed, where)
    scout = judge
    if closure == "stochastic" and n_closures > SCOUT_CLOSURES:
        scout = _Judge(x, target, closure, SCOUT_CLOSURES, seed, where)
    best: tuple[int, int, int] | None = None  # (length, start, end) in x's numbering
    offsets = [0] if not closed else sorted({(k * n) // RING_CUTS for k in range(RING_CUTS)})
    for off in offsets:
        if closed and not scout(off, 0, n - 1):
            continue  # this cut (probably) runs through the knot
        if scout is judge:
            i, j = _trim(judge, off, n)
        else:  # the confirmation adds a margin: finer steps than it would be wasted
            i, j = _trim(scout, off, n, resolution=max(1, n // SCOUT_RESOLUTION), refine=False)
        found = _confirm(judge, off, i, j, n, closed)
        if found is None:
            continue  # under the full closure this cut runs through the knot after all
        i, j = found
        length = j - i + 1
        if best is None or length < best[0]:
            best = (length, (i + off) % n, (j + off) % n)
        if closed and 2 * length <= n:
            break  # a core of at most half the ring: the other cuts would find it again
    if best is None:
        return None
    length, a, b = best
    wraps = closed and a > b
    if kept is not None:
        a_in, b_in = int(kept[a]), int(kept[b])
        total = n_input or int(kept[-1]) + 1
        if wraps:
            beads = (total - a_in) + b_in + 1
        else:
            beads = b_in - a_in + 1
    else:
        a_in, b_in, total, beads = a, b, n_input or n, length
    spent = judge.evaluations + (scout.evaluations if scout is not judge else 0)
    return KnottedCore(a_in, b_in, beads, beads / total, closure, spent, wraps)
