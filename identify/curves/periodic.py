"""Chains in a periodic box: unwrapping by minimum-image bonds, and rings that wind round the box.

Simulations with periodic boundaries often write each bead wrapped back into
the box, so a chain that crosses a face of the box jumps to the opposite
face.  Read as it is, such a chain has bonds as long as the box, and its
projection is a tangle of spurious crossings.  :func:`unwrap_chain` rebuilds
the chain bond by bond: each bond is replaced by its minimum image (the
shortest vector between the two beads over all periodic copies), and the
beads are placed one after another from the first.

Two things can still be wrong after that, and both are errors for the chain,
never a silent wrong knot:

* **A bond that stays too long.**  A bond longer than :data:`BOND_FACTOR`
  times the chain's median bond (after unwrapping) means a broken chain, a
  wrong box, or a bond longer than half the box (for which the minimum image
  is not the real bond).  The message names the two beads.
* **A ring that winds round the box.**  The minimum-image bonds of a ring
  add up to a lattice vector of the box: zero for an ordinary ring, and a
  non-zero combination ``n_a a + n_b b + n_c c`` of the box vectors when the
  ring closes only through its periodic copies (it wraps round the torus).
  Such a ring is not a closed curve in ordinary space: its knot type is not
  defined in the usual sense, and it is reported with its winding numbers.

The box is ``[lx, ly, lz, alpha, beta, gamma]`` (lengths in the units of the
coordinates, angles in degrees), as MDAnalysis gives it.  A rectangular box
is handled here with numpy; a triclinic one through MDAnalysis's
``minimize_vectors`` and ``triclinic_vectors`` (the ``md`` extra).
"""

from __future__ import annotations

import numpy as np

from ..errors import CurveError

__all__ = ["BOND_FACTOR", "check_box", "unwrap_chain", "box_vectors", "minimum_image"]

#: After unwrapping, a bond longer than this many median bonds of its chain is an error.
BOND_FACTOR = 3.0


def check_box(box, where: str = "") -> np.ndarray:
    """A periodic box as ``[lx, ly, lz, alpha, beta, gamma]``, checked.

    Parameters
    ----------
    box : sequence of 3 or 6 numbers
        Three edge lengths (a rectangular box) or lengths and angles in degrees.
    where : str
        Prefix of the error message (file and frame).

    Raises
    ------
    CurveError
        A box that is not 3 or 6 finite numbers, an edge length of zero or
        below, or angles outside (0, 180) degrees.
    """
    try:
        b = np.asarray(box, dtype=np.float64).ravel()
    except (TypeError, ValueError):
        raise CurveError(f"the box must be 3 or 6 numbers, got {box!r}", value=box,
                         where=where or None) from None
    if b.size == 3:
        b = np.concatenate([b, [90.0, 90.0, 90.0]])
    if b.size != 6 or not np.isfinite(b).all():
        raise CurveError(f"the box must be 3 or 6 finite numbers (lengths, then angles), got "
                         f"{b.tolist()}", value=b.tolist(), where=where or None)
    if (b[:3] <= 0).any():
        raise CurveError(f"the box edge lengths must be positive, got {b[:3].tolist()}",
                         value=b[:3].tolist(), where=where or None)
    if ((b[3:] <= 0) | (b[3:] >= 180)).any():
        raise CurveError(f"the box angles must lie between 0 and 180 degrees, got "
                         f"{b[3:].tolist()}", value=b[3:].tolist(), where=where or None)
    return b


def _rectangular(box: np.ndarray) -> bool:
    return bool(np.allclose(box[3:], 90.0))


def box_vectors(box: np.ndarray) -> np.ndarray:
    """The box vectors a, b, c as the rows of a 3 x 3 matrix."""
    if _rectangular(box):
        return np.diag(box[:3])
    from ..extras import require

    require("MDAnalysis", "md", "a triclinic periodic box")
    from MDAnalysis.lib.mdamath import triclinic_vectors

    return np.asarray(triclinic_vectors(box.astype(np.float32)), dtype=np.float64)


def minimum_image(d: np.ndarray, box: np.ndarray) -> np.ndarray:
    """The minimum images of the vectors ``d`` (rows) in ``box`` (as from :func:`check_box`)."""
    if _rectangular(box):
        lengths = box[:3]
        return d - lengths * np.round(d / lengths)
    from ..extras import require

    require("MDAnalysis", "md", "a triclinic periodic box")
    from MDAnalysis.lib.distances import minimize_vectors

    return np.asarray(minimize_vectors(d.astype(np.float32), box.astype(np.float32)),
                      dtype=np.float64)


def unwrap_chain(coords: np.ndarray, box, closed: bool, where: str = "",
                 factor: float = BOND_FACTOR) -> np.ndarray:
    """A chain unwrapped across a periodic box by making every bond its minimum image.

    Parameters
    ----------
    coords : (N, 3) array
        Bead coordinates, possibly wrapped into the box.
    box : array-like
        ``[lx, ly, lz, alpha, beta, gamma]`` or ``[lx, ly, lz]``.
    closed : bool
        A ring: its closing bond (last bead to first) is checked too, and the
        winding round the box is measured.
    where : str
        File, frame and chain, for messages.
    factor : float
        Bonds longer than ``factor`` median bonds after unwrapping are errors.

    Returns
    -------
    (N, 3) array
        The first bead stays where it was; every other bead is placed at the
        end of its minimum-image bond.

    Raises
    ------
    CurveError
        A bad box; a bond longer than ``factor`` median bonds after
        unwrapping (naming its beads); a ring winding round the box (naming
        its winding numbers along the box vectors).

    Examples
    --------
    >>> x = np.array([[9.5, 0, 0], [0.5, 0, 0], [0.5, 1, 0], [9.5, 1, 0]])
    >>> unwrap_chain(x, [10, 10, 10], closed=True)[:, 0].tolist()
    [9.5, 10.5, 10.5, 9.5]
    """
    b = check_box(box, where)
    x = np.asarray(coords, dtype=np.float64)
    if len(x) < 2:
        return x.copy()
    steps = minimum_image(np.diff(x, axis=0), b)
    out = np.empty_like(x)
    out[0] = x[0]
    out[1:] = x[0] + np.cumsum(steps, axis=0)
    bonds = steps
    if closed:
        last = minimum_image((x[0] - x[-1])[None, :], b)[0]
        bonds = np.vstack([steps, last])
    lengths = np.linalg.norm(bonds, axis=1)
    positive = lengths[lengths > 0]
    median = float(np.median(positive)) if positive.size else 0.0
    if median > 0:
        long = np.flatnonzero(lengths > factor * median)
        if long.size:
            k = int(long[0])
            k2 = (k + 1) % len(x)
            raise CurveError(
                f"after unwrapping across the periodic box {_box_text(b)}, the bond between "
                f"beads {k} and {k2} is {lengths[k]:.4g} long, more than {factor:g} times the "
                f"median bond ({median:.4g}); {long.size} such bond(s). The chain is broken, "
                "the box is wrong, or a bond is longer than half the box",
                value=float(lengths[k]), where=", ".join(p for p in (where, f"beads {k}-{k2}")
                                                          if p))
    if closed:
        total = bonds.sum(axis=0)
        winding = np.rint(np.linalg.solve(box_vectors(b).T, total)).astype(int)
        if winding.any():
            raise CurveError(
                f"the ring winds round the periodic box {_box_text(b)} (winding numbers "
                f"{tuple(int(w) for w in winding)} along the box vectors a, b, c): it closes "
                "only through its periodic images, so it is not a closed curve in ordinary "
                "space and its knot type is not defined in the usual sense",
                value=tuple(int(w) for w in winding), where=where or None)
    return out


def _box_text(b: np.ndarray) -> str:
    lengths = " x ".join(f"{v:g}" for v in b[:3])
    if _rectangular(b):
        return lengths
    return f"{lengths} (angles {', '.join(f'{v:g}' for v in b[3:])})"
