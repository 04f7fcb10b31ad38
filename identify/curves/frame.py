"""Frames of 3D coordinates and the checks that make a chain fit for topology.

A :class:`Frame` is what every reader yields: where it came from, its index in
the file and its chains, each ``(chain id, N x 3 float array, closed)``.
:func:`prepare_chains` checks a frame's chains (NaN or infinite coordinates,
fewer than 4 beads, repeated beads, a chain folding back on itself) and puts
them in common units: centred, with the median bond length 1.  Units do not
matter to topology, so the result is the same whatever the file's units.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import NamedTuple

import numpy as np

from ..errors import CurveError

__all__ = [
    "Chain",
    "Frame",
    "FrameFailure",
    "PreparedChains",
    "prepare_chains",
    "as_chain",
    "MIN_BEADS",
    "DUPLICATE_TOL",
    "FOLD_TOL",
]

#: A chain needs at least this many beads (after repeated beads are dropped).
MIN_BEADS = 4
#: Beads closer than this to the previous bead (in median bond lengths) are repeats.
DUPLICATE_TOL = 1e-4
#: Consecutive bonds whose overlap comes within this distance (bond lengths) fold back.
FOLD_TOL = 1e-4
#: Coordinates farther than this many bond lengths from their centre lose the
#: precision the geometry needs (float64 keeps about 16 digits).
MAX_SPREAD = 1e9


class Chain(NamedTuple):
    """One chain of a frame: its id, its bead coordinates (N x 3) and whether it is a ring."""

    id: str
    coords: np.ndarray
    closed: bool


@dataclass
class Frame:
    """One frame of a coordinate file.

    Attributes
    ----------
    source : str
        The file (or a label) it came from.
    index : int
        Frame number in the source, from 0.
    chains : list of Chain
        ``(chain id, N x 3 float array, closed)`` for each chain.
    warnings : list of str
        Problems met while reading that did not stop it (chain breaks, repeated beads).
    comment : str
        The frame's title or comment line, if the format has one.
    box : (6,) float array, optional
        The periodic box ``[lx, ly, lz, alpha, beta, gamma]`` (lengths in the
        file's units, angles in degrees) when the chains were wrapped into
        one; each chain is then unwrapped before it is identified (see
        :mod:`knotsift.curves.periodic`).
    gaps : dict, optional
        For chains with missing segments (protein chain breaks): chain id ->
        list of ``(bead, distance)``, a gap between ``bead`` and ``bead + 1``
        (see :mod:`knotsift.curves.gaps`).
    """

    source: str
    index: int
    chains: list[Chain]
    warnings: list[str] = field(default_factory=list)
    comment: str = ""
    box: np.ndarray | None = None
    gaps: dict[str, list[tuple[int, float]]] = field(default_factory=dict)

    @property
    def where(self) -> str:
        return f"{self.source}, frame {self.index}" if self.source else f"frame {self.index}"

    def __repr__(self) -> str:
        parts = ", ".join(f"{c.id}: {len(c.coords)} beads{' ring' if c.closed else ''}"
                          for c in self.chains)
        return f"Frame({self.source!r}, {self.index}, [{parts}])"


@dataclass
class FrameFailure:
    """A frame that could not be read; readers yield it when asked to go on after errors."""

    source: str
    index: int
    error: CurveError

    @property
    def where(self) -> str:
        return f"{self.source}, frame {self.index}" if self.source else f"frame {self.index}"


def as_chain(coords, closed: bool, chain_id: str = "A") -> Chain:
    """A :class:`Chain` from anything array-like of shape (N, 3); the shape is checked."""
    try:
        arr = np.asarray(coords, dtype=np.float64)
    except (TypeError, ValueError) as exc:
        raise CurveError(f"coordinates must be numbers in an N x 3 array ({exc})",
                         where=f"chain {chain_id}") from None
    if arr.ndim != 2 or arr.shape[1] != 3:
        raise CurveError(f"coordinates must form an N x 3 array, got shape {arr.shape}",
                         value=arr.shape, where=f"chain {chain_id}")
    return Chain(str(chain_id), arr, bool(closed))


@dataclass
class PreparedChains:
    """Chains checked and put in common units (centred, median bond length 1).

    Attributes
    ----------
    chains : list of Chain
        The cleaned chains, in the new units.
    kept : list of int arrays
        For each chain, the original bead index of every bead kept.
    scale : float
        The median bond length in the input's units.
    centre : (3,) array
        The centre subtracted, in the input's units.
    warnings : list of str
    """

    chains: list[Chain]
    kept: list[np.ndarray]
    scale: float
    centre: np.ndarray
    warnings: list[str]


def _bonds(x: np.ndarray, closed: bool) -> np.ndarray:
    nxt = np.roll(x, -1, axis=0) if closed else x[1:]
    return nxt - (x if closed else x[:-1])


def prepare_chains(chains: list[Chain], where: str = "") -> PreparedChains:
    """Check the chains of one frame and put them in common units.

    Parameters
    ----------
    chains : list of Chain
    where : str
        Prefix of every message (file and frame).

    Returns
    -------
    PreparedChains

    Raises
    ------
    CurveError
        NaN or infinite coordinates, fewer than 4 beads (after dropping
        repeats), all bonds of zero length, coordinates too far from their
        centre for float64 to resolve a bond, or a chain that folds back on
        itself (two consecutive bonds overlapping).  The message names the
        chain and bead (0-based, as in the input).

    Notes
    -----
    A bead closer than ``DUPLICATE_TOL`` bond lengths to the bead before it
    (for a ring, also the last bead repeating the first) is dropped with a
    warning.  Straight runs of collinear beads are harmless and kept.
    """
    if not chains:
        raise CurveError("the frame has no chains", where=where or None)
    warnings: list[str] = []

    def loc(cid: str, extra: str = "") -> str:
        parts = [p for p in (where, f"chain {cid}", extra) if p]
        return ", ".join(parts)

    arrays = []
    for ch in chains:
        x = np.asarray(ch.coords, dtype=np.float64)
        if x.ndim != 2 or x.shape[1] != 3:
            raise CurveError(f"coordinates must form an N x 3 array, got shape {x.shape}",
                             value=x.shape, where=loc(ch.id))
        bad = ~np.isfinite(x).all(axis=1)
        if bad.any():
            k = int(np.flatnonzero(bad)[0])
            raise CurveError(f"coordinate {x[k].tolist()} is not finite (NaN or infinite); "
                             f"{int(bad.sum())} bead(s) affected", value=x[k].tolist(),
                             where=loc(ch.id, f"bead {k}"))
        if len(x) < MIN_BEADS:
            raise CurveError(f"a chain needs at least {MIN_BEADS} beads, got {len(x)}",
                             value=len(x), where=loc(ch.id))
        arrays.append(x)
    everything = np.concatenate(arrays)
    lengths = np.concatenate([np.linalg.norm(_bonds(x, ch.closed), axis=1)
                              for x, ch in zip(arrays, chains, strict=True)])
    positive = lengths[lengths > 0]
    if positive.size == 0:
        raise CurveError("every bond has zero length (all beads coincide)", where=where or None)
    scale = float(np.median(positive))
    lo, hi = everything.min(axis=0), everything.max(axis=0)
    centre = (lo + hi) / 2
    spread = float(np.abs(everything).max()) / scale
    if spread > MAX_SPREAD:
        raise CurveError(
            f"coordinates reach {spread:.1e} median bond lengths from the origin; float64 "
            "cannot resolve a bond there (use smaller numbers or shift the origin)",
            value=spread, where=where or None)
    out_chains, kept = [], []
    for x, ch in zip(arrays, chains, strict=True):
        y = (x - centre) / scale
        idx = np.arange(len(y))
        step = np.linalg.norm(np.diff(y, axis=0), axis=1)
        dup = np.concatenate(([False], step <= DUPLICATE_TOL))
        if dup.any():
            # a run of repeats keeps its first bead
            ks = np.flatnonzero(dup)
            shown = ", ".join(map(str, ks[:8])) + (" ..." if ks.size > 8 else "")
            warnings.append(f"{loc(ch.id)}: {ks.size} bead(s) repeat the bead before them "
                            f"and were dropped (beads {shown})")
            y, idx = y[~dup], idx[~dup]
        if ch.closed and len(y) > 1 and np.linalg.norm(y[-1] - y[0]) <= DUPLICATE_TOL:
            warnings.append(f"{loc(ch.id)}: the last bead (bead {idx[-1]}) repeats the first "
                            "and was dropped (the ring closes by itself)")
            y, idx = y[:-1], idx[:-1]
        if len(y) < MIN_BEADS:
            raise CurveError(f"only {len(y)} distinct beads remain after dropping repeated "
                             f"beads; a chain needs at least {MIN_BEADS}", value=len(y),
                             where=loc(ch.id))
        _check_fold(y, idx, ch.closed, lambda extra, cid=ch.id: loc(cid, extra))
        out_chains.append(Chain(ch.id, y, ch.closed))
        kept.append(idx)
    return PreparedChains(out_chains, kept, scale, centre, warnings)


def _check_fold(y: np.ndarray, idx: np.ndarray, closed: bool, loc) -> None:
    """Consecutive bonds that double back onto each other make the chain touch itself."""
    n = len(y)
    if closed:
        prev = np.roll(y, 1, axis=0) - y
        nxt = np.roll(y, -1, axis=0) - y
        at = np.arange(n)
    else:
        prev = y[:-2] - y[1:-1]
        nxt = y[2:] - y[1:-1]
        at = np.arange(1, n - 1)
    lp = np.linalg.norm(prev, axis=1)
    ln = np.linalg.norm(nxt, axis=1)
    cosang = np.einsum("ij,ij->i", prev, nxt) / (lp * ln)
    sinang = np.linalg.norm(np.cross(prev, nxt), axis=1) / (lp * ln)
    # the shorter bond's far end lies min(lp, ln) * sin(angle) from the other bond
    folded = (cosang > 0) & (np.minimum(lp, ln) * sinang < FOLD_TOL)
    if folded.any():
        k = int(at[np.flatnonzero(folded)[0]])
        raise CurveError(
            f"the chain folds back on itself at bead {idx[k]}: the bonds before and after it "
            f"overlap (angle {np.degrees(np.arccos(np.clip(cosang[at == k][0], -1, 1))):.2g} "
            "degrees), so it passes through itself and its knot type is not defined",
            value=int(idx[k]), where=loc(f"bead {idx[k]}"))
