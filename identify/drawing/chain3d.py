"""Chains in 3D: where the knot sits along a chain, and how it was seen.

:func:`chain_figure` draws a chain as a 3D line (matplotlib), the knotted core
in its own colour, the closure of an open chain dashed, once from an oblique
angle and once seen along the projection direction that gave the diagram.
Below it an optional strip runs along the chain: for sliding subchains of a
fixed length (:func:`sliding_spectrum`), the share of closures giving each
knot type.
"""

from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np

from ..errors import CurveError

__all__ = ["SlidingSpectrum", "sliding_spectrum", "chain_figure", "chain_file_figure",
           "projection_direction"]

_CHAIN = "#1f4e79"
_CORE = "#c0504d"
_CLOSURE = "#d9a400"
_TYPE_COLOURS = ("#d9d9d9", "#c0504d", "#2e7d4f", "#7a4fa3", "#b8860b", "#2b8a9a", "#8c564b",
                 "#1f4e79", "#4d4d4d")


@dataclass
class SlidingSpectrum:
    """Knot types of sliding subchains.

    Attributes
    ----------
    window : int
        Beads per subchain.
    starts : list of int
        First bead of each subchain.
    types : list of str
        The types met, the unknot first.
    fractions : numpy.ndarray
        (len(starts), len(types)): share of the closures of each subchain giving each type.
    closure : str
    """

    window: int
    starts: list
    types: list
    fractions: np.ndarray
    closure: str
    notes: list = field(default_factory=list)


def _label(fp, table) -> str:
    from ..identification import match_fingerprint

    if fp.components == 1 and fp.jones == 1:
        return "0_1"
    _, cands = match_fingerprint(fp, table)
    if not cands:
        return "not in table"
    return " or ".join(c.label if c.chirality in ("same", "mirror") else c.name for c in cands)


def sliding_spectrum(coords, window: int, step: int | None = None, closed: bool = True,
                     closure: str = "stochastic", n_closures: int = 20, seed: int = 0,
                     table=None) -> SlidingSpectrum:
    """Close every subchain of ``window`` beads (every ``step`` beads) and type its closures.

    Parameters
    ----------
    coords : (N, 3) array-like
    window : int
        Beads per subchain, at least 4 and at most N.
    step : int, optional
        Default: a twentieth of the chain, at least 1.
    closed : bool
        A ring's subchains wrap round its end.
    closure : {"direct", "far", "stochastic"}
    n_closures : int
        Random closures per subchain (stochastic).
    seed : int
    table : ReferenceTable, optional

    Returns
    -------
    SlidingSpectrum

    Raises
    ------
    CurveError
        For a window outside 4..N or bad coordinates.

    Notes
    -----
    One closure spectrum per subchain: about N / step of them.
    """
    from ..curves.closure import closure_spectrum
    from ..curves.frame import as_chain, prepare_chains
    from ..table import open_table

    prep = prepare_chains([as_chain(coords, closed)])
    x = prep.chains[0].coords
    n = len(x)
    if isinstance(window, bool) or not isinstance(window, (int, np.integer)) \
            or not 4 <= window <= n:
        raise CurveError(f"the sliding window must be 4..{n} beads, got {window!r}",
                         value=window)
    step = step or max(1, n // 20)
    table = table or open_table()
    last = n if closed else n - window + 1
    starts = list(range(0, last, step))
    counts: list[dict] = []
    for s in starts:
        idx = np.arange(s, s + window) % n
        spec = closure_spectrum(x[idx], closure, n_closures, seed)
        total = sum(t.count for t in spec.types)
        row: dict = {}
        for t in spec.types:
            label = _label(t.fingerprint, table)
            row[label] = row.get(label, 0) + t.count / total
        counts.append(row)
    types = sorted({k for row in counts for k in row}, key=lambda k: (k != "0_1", k))
    fractions = np.array([[row.get(t, 0.0) for t in types] for row in counts])
    return SlidingSpectrum(window, starts, types, fractions, closure)


def projection_direction(coords, closed: bool = True, seed: int = 0,
                         closure: str = "far") -> np.ndarray:
    """The view direction of the diagram ``knotsift draw`` makes of this chain (same seed).

    For a ring this is also the direction of ``knotsift curve`` (the same
    seeded draws); an open chain is first closed by ``closure`` (direct or far).
    """
    from ..curves.closure import direct_closure, far_closure
    from ..curves.frame import as_chain, prepare_chains
    from ..curves.knot_type import polygon_type

    prep = prepare_chains([as_chain(coords, closed)])
    x = prep.chains[0].coords
    if not closed:
        extra = (direct_closure if closure == "direct" else far_closure)(x)
        x = np.vstack([x, extra]) if len(extra) else x
    typed = polygon_type([(x, True)], np.random.default_rng([seed, 0]), with_fingerprint=False,
                         simplified=False)
    return np.asarray(typed.projection.direction, dtype=float)


def _core_mask(n: int, core: tuple[int, int] | None) -> np.ndarray:
    mask = np.zeros(n, dtype=bool)
    if core is None:
        return mask
    start, end = core
    if not (0 <= start < n and 0 <= end < n):
        raise CurveError(f"the core {start}-{end} lies outside beads 0..{n - 1}", value=core)
    if start <= end:
        mask[start:end + 1] = True
    else:                                   # wraps round the end of a ring
        mask[start:] = True
        mask[:end + 1] = True
    return mask


def _runs(mask: np.ndarray) -> list[tuple[int, int]]:
    """(first, last) of each run of True in mask."""
    out, start = [], None
    for k, v in enumerate(mask):
        if v and start is None:
            start = k
        if not v and start is not None:
            out.append((start, k - 1))
            start = None
    if start is not None:
        out.append((start, len(mask) - 1))
    return out


def _core_paths(x: np.ndarray, mask: np.ndarray, closed: bool) -> list[np.ndarray]:
    """The bead runs of the core as polylines; a ring's run through its end stays whole."""
    runs = _runs(mask)
    n = len(x)
    if closed and len(runs) > 1 and runs[0][0] == 0 and runs[-1][1] == n - 1:
        (a, _), (_, b) = runs[-1], runs[0]
        joined = np.concatenate([np.arange(a, n), np.arange(0, b + 1)])
        return [x[joined]] + [x[p:q + 1] for p, q in runs[1:-1]]
    return [x[p:q + 1] for p, q in runs]


def chain_figure(coords, closed: bool = True, *, core: tuple[int, int] | None = None,
                 closure_points=None, direction=None, strip: SlidingSpectrum | None = None,
                 title: str = ""):
    """A chain in 3D, its knotted core and closure, seen obliquely and along the projection.

    Parameters
    ----------
    coords : (N, 3) array-like
    closed : bool
    core : (start, end), optional
        First and last bead of the knotted core (``start > end`` wraps round a ring).
    closure_points : (k, 3) array-like, optional
        Points of the closure of an open chain, from its last bead back to its first.
    direction : (3,) array-like, optional
        The projection direction used (towards the viewer); the second view looks along it.
    strip : SlidingSpectrum, optional
        Drawn as a strip of stacked closure fractions along the chain.
    title : str

    Returns
    -------
    matplotlib.figure.Figure

    Raises
    ------
    CurveError
        For coordinates that are not (N, 3) finite numbers, or a core outside the chain.
    """
    from .render import _matplotlib_figure

    Figure = _matplotlib_figure()
    x = np.asarray(coords, dtype=float)
    if x.ndim != 2 or x.shape[1] != 3 or len(x) < 2 or not np.isfinite(x).all():
        raise CurveError(f"a chain is an (N, 3) array of finite numbers, got shape {x.shape}",
                         value=x.shape)
    n = len(x)
    mask = _core_mask(n, core)
    fig = Figure(figsize=(9, 6.2 if strip is not None else 4.6), layout="constrained")
    grid = fig.add_gridspec(2 if strip is not None else 1, 2,
                            height_ratios=[4, 1.3] if strip is not None else [1])
    views = [("oblique view", 25.0, -60.0)]
    if direction is not None:
        u = np.asarray(direction, dtype=float)
        u = u / np.linalg.norm(u)
        views.append(("seen along the projection direction",
                      float(np.degrees(np.arcsin(np.clip(u[2], -1, 1)))),
                      float(np.degrees(np.arctan2(u[1], u[0])))))
    path = np.vstack([x, x[:1]]) if closed else x
    for k, (name, elev, azim) in enumerate(views):
        ax = fig.add_subplot(grid[0, k], projection="3d", proj_type="ortho")
        ax.plot(*path.T, color=_CHAIN, linewidth=1.4, label="chain")
        for j, seg in enumerate(_core_paths(x, mask, closed)):
            ax.plot(*seg.T, color=_CORE, linewidth=2.6, label="knotted core" if j == 0 else None)
        if not closed and closure_points is not None and len(closure_points):
            # the closure runs far out: its two legs are drawn as stubs towards the far points
            c = np.asarray(closure_points, dtype=float)
            reach = 0.45 * float(np.ptp(x, axis=0).max())
            for k2, (end, far) in enumerate(((x[-1], c[0]), (x[0], c[-1]))):
                leg = far - end
                norm = float(np.linalg.norm(leg))
                if norm == 0:
                    continue
                stub = np.vstack([end, end + leg * min(1.0, reach / norm)])
                ax.plot(*stub.T, color=_CLOSURE, linewidth=1.4, linestyle="--",
                        label="closure (towards its far points)" if k2 == 0 else None)
        ax.scatter(*x[0], color=_CHAIN, s=14)
        ax.view_init(elev=elev, azim=azim)
        ax.set_title(name, fontsize=9)
        lo, hi = x.min(axis=0), x.max(axis=0)
        pad = 0.08 * (hi - lo).max()
        ax.set_xlim(lo[0] - pad, hi[0] + pad)
        ax.set_ylim(lo[1] - pad, hi[1] + pad)
        ax.set_zlim(lo[2] - pad, hi[2] + pad)
        ax.set_box_aspect(hi - lo + 2 * pad)
        ax.set_xticks([])
        ax.set_yticks([])
        ax.set_zticks([])
        if k == 0:
            ax.legend(loc="upper left", fontsize=8, frameon=False)
    if strip is not None:
        ax = fig.add_subplot(grid[1, :])
        centres = np.array(strip.starts) + strip.window / 2
        if closed:
            centres = centres % n          # a ring's subchains wrap round its end
        width = (strip.starts[1] - strip.starts[0]) if len(strip.starts) > 1 else strip.window
        bottom = np.zeros(len(centres))
        for j, t in enumerate(strip.types):
            ax.bar(centres, strip.fractions[:, j], width=width, bottom=bottom, label=t,
                   color=_TYPE_COLOURS[j % len(_TYPE_COLOURS)], edgecolor="none")
            bottom += strip.fractions[:, j]
        if mask.any():
            for a, b in _runs(mask):
                ax.axvspan(a, b + 1, color=_CORE, alpha=0.12, linewidth=0)
        ax.set_xlim(0, n if closed else n)
        ax.set_ylim(0, 1)
        ax.set_xlabel(f"bead at the centre of a {strip.window}-bead subchain")
        ax.set_ylabel("closures")
        ax.set_title(f"types of sliding subchains ({strip.closure} closure); "
                     "shaded: the knotted core", fontsize=9, loc="left")
        ax.legend(loc="upper left", bbox_to_anchor=(1.0, 1.0), fontsize=8, frameon=False)
    if title:
        fig.suptitle(title, fontsize=10)
    return fig


def chain_file_figure(path, frame: int = 0, chain: int = 0, closed: bool | None = None,
                      closure: str = "far", seed: int = 0, core: bool = False,
                      window: int | None = None, table=None):
    """:func:`chain_figure` for one chain of one frame of a coordinate file.

    With ``core`` the chain is identified and its knotted core searched (as
    ``knotsift curve --core``, closing by ``closure``); with ``window`` the
    sliding-subchain strip is added.

    Raises
    ------
    CurveError
        Missing frame or chain, bad coordinates, a window outside the chain.
    """
    from pathlib import Path

    from ..curves.closure import direct_closure, far_closure
    from ..curves.formats import read_frames
    from ..curves.frame import Frame
    from .sources import DRAW_CLOSURES

    if closure not in DRAW_CLOSURES:
        raise CurveError(f"a drawing closes open chains by one of {', '.join(DRAW_CLOSURES)}, "
                         f"got {closure!r}", value=closure)
    found = None
    for item in read_frames(path, closed=closed, frames=slice(frame, frame + 1)):
        found = item
    if not isinstance(found, Frame):
        raise CurveError(f"{path} has no frame {frame}", value=frame)
    if not 0 <= chain < len(found.chains):
        raise CurveError(f"{path}, frame {frame} has {len(found.chains)} chains (from 0); "
                         f"no chain {chain}", value=chain)
    c = found.chains[chain]
    x = np.asarray(c.coords, dtype=float)
    title = f"{Path(str(path)).name}, frame {frame}, chain {c.id}"
    core_range = None
    if core:
        from ..curves.pipeline import identify_curve

        result = identify_curve(x, closed=c.closed, closure=closure, seed=seed, localise=True,
                                table=table)
        title += f": {result.name or result.status}"
        if result.core:
            core_range = (result.core["start"], result.core["end"])
    strip = None
    if window:
        strip = sliding_spectrum(x, window, closed=c.closed, closure=closure, seed=seed,
                                 table=table)
    extra = None
    if not c.closed:
        extra = (direct_closure if closure == "direct" else far_closure)(x)
    direction = projection_direction(x, c.closed, seed, closure)
    return chain_figure(x, c.closed, core=core_range, closure_points=extra, direction=direction,
                        strip=strip, title=title)
