"""Reading a drawn SVG back into a diagram, from the drawn geometry only.

Independent of the layout code: it sees only the SVG's sub-paths.  Within a
component the sub-paths run in the direction of travel; the straight hop from
the end of one sub-path to the start of the next is the hidden under-pass.
Every place where a hop crosses a drawn piece is a crossing (the hop under,
the piece over); two drawn pieces crossing, or two hops crossing, mean the
picture is wrong.  The crossings along each component give the edges, and the
directions of the two strands give the counter-clockwise order of a PD code
(common practice: PD entries start at the incoming under-strand and run
counter-clockwise).
"""

from __future__ import annotations

import re
import xml.etree.ElementTree as ET

import numpy as np

from knotsift import Diagram

SVG = "{http://www.w3.org/2000/svg}"


class ReadBackError(AssertionError):
    """The picture is not a valid knot diagram drawing."""


def panels_of(svg_text: str) -> list[list[tuple[list[np.ndarray], bool]]]:
    """Per panel, per component: (pieces in math coordinates, closed)."""
    root = ET.fromstring(svg_text)
    out = []
    for panel in root.iter(f"{SVG}g"):
        if panel.get("class") != "panel":
            continue
        comps = []
        for g in panel.iter(f"{SVG}g"):
            if g.get("class") != "component":
                continue
            paths = list(g.iter(f"{SVG}path"))
            assert len(paths) == 1, "one path per component group"
            d = paths[0].get("d")
            pieces = []
            closed = d.strip().endswith("Z")
            for sub in re.findall(r"M[^M]*", d):
                nums = [float(v) for v in re.findall(r"-?\d+(?:\.\d+)?", sub)]
                pts = np.array(nums).reshape(-1, 2)
                pts[:, 1] = -pts[:, 1]            # screen (y down) to math (y up)
                pieces.append(pts)
            comps.append((pieces, closed))
        out.append(comps)
    return out


def _proper_hits(a: np.ndarray, b: np.ndarray):
    """Index pairs (i, j) and parameters (s, t) where segment a[i] properly crosses b[j]."""
    p, r = a[:, None, 0, :], (a[:, 1] - a[:, 0])[:, None, :]
    q, s = b[None, :, 0, :], (b[:, 1] - b[:, 0])[None, :, :]
    den = r[..., 0] * s[..., 1] - r[..., 1] * s[..., 0]
    qp = q - p
    with np.errstate(divide="ignore", invalid="ignore"):
        t = (qp[..., 0] * s[..., 1] - qp[..., 1] * s[..., 0]) / den
        u = (qp[..., 0] * r[..., 1] - qp[..., 1] * r[..., 0]) / den
    ok = (den != 0) & (t > 0) & (t < 1) & (u > 0) & (u < 1)
    i, j = np.nonzero(ok)
    return i, j, t[i, j], u[i, j]


def diagram_from_drawing(components: list[tuple[list[np.ndarray], bool]]) -> Diagram:
    """The diagram that a drawn panel shows."""
    curves, kinds = [], []          # per component: segments (m, 2, 2) and hop flags (m,)
    free = 0
    for pieces, closed in components:
        if closed:
            free += 1               # checked below: it must not meet anything
            pts = pieces[0]
            curves.append(np.stack([pts, np.roll(pts, -1, axis=0)], axis=1))
            kinds.append(np.zeros(len(pts), dtype=bool))
            continue
        segs, hops = [], []
        for k, piece in enumerate(pieces):
            segs.append(np.stack([piece[:-1], piece[1:]], axis=1))
            hops.append(np.zeros(len(piece) - 1, dtype=bool))
            nxt = pieces[(k + 1) % len(pieces)]
            segs.append(np.array([[piece[-1], nxt[0]]]))
            hops.append(np.array([True]))
        curves.append(np.concatenate(segs))
        kinds.append(np.concatenate(hops))
    events = [[] for _ in curves]   # (position along the component, crossing id, is_under)
    directions = []                 # per crossing: (under direction, over direction)
    for a in range(len(curves)):
        for b in range(a, len(curves)):
            i, j, s, t = _proper_hits(curves[a], curves[b])
            for ii, jj, ss, tt in zip(i, j, s, t):
                if a == b and ii >= jj:
                    continue        # each unordered pair once
                ha, hb = kinds[a][ii], kinds[b][jj]
                if ha == hb:
                    what = "two under-passes" if ha else "two drawn strands"
                    raise ReadBackError(f"{what} cross (components {a} and {b})")
                x = len(directions)
                sa, sb = curves[a][ii], curves[b][jj]
                events[a].append((ii + ss, x, bool(ha)))
                events[b].append((jj + tt, x, bool(hb)))
                da, db = sa[1] - sa[0], sb[1] - sb[0]
                directions.append((da, db) if ha else (db, da))
    for k, (pieces, closed) in enumerate(components):
        if closed and events[k]:
            raise ReadBackError(f"component {k} is drawn without a gap but crosses something")
        hops = int(kinds[k].sum())
        unders = sum(1 for e in events[k] if e[2])
        if hops != unders:
            raise ReadBackError(f"component {k}: {hops} gaps but {unders} under-passes")
    ends: dict[tuple[int, bool], list[int]] = {}   # (crossing, under?) -> [in label, out label]
    label = 0
    for k, evs in enumerate(events):
        if not evs:
            continue
        evs.sort()
        first = label + 1
        for n, (_, x, under) in enumerate(evs):
            incoming = first + n                       # edge arriving at event n
            outgoing = first + (n + 1) % len(evs)      # edge leaving it
            ends[(x, under)] = [incoming, outgoing]
        label += len(evs)
    pd = []
    for x, (u, v) in enumerate(directions):
        ui, uo = ends[(x, True)]
        oi, oo = ends[(x, False)]
        cross = u[0] * v[1] - u[1] * v[0]
        pd.append((ui, oi, uo, oo) if cross > 0 else (ui, oo, uo, oi))
    return Diagram(pd, free_loops=free) if pd else Diagram([], free_loops=free)


def signed_gauss(diagram: Diagram) -> tuple:
    """A relabelling-free form of a knot diagram: its signed Gauss code, least rotation.

    Along the knot each passage is (crossing, over or under, sign); crossings are
    renamed by first appearance and the least rotation is kept.  Two knot
    diagrams on the sphere with the same form are the same diagram (common
    practice: the signed Gauss code determines a knot diagram on the sphere).
    """
    (comp,) = diagram.components()
    head = {}
    for i, x in enumerate(diagram.crossings):
        for p, label in enumerate(x):
            if diagram.is_incoming(i, p):
                head[label] = (i, p % 2)
    signs = diagram.signs()
    passes = [head[label] for label in comp]
    best = None
    for r in range(len(passes)):
        names: dict[int, int] = {}
        form = []
        for i, over in passes[r:] + passes[:r]:
            names.setdefault(i, len(names))
            form.append((names[i], over, signs[i]))
        form = tuple(form)
        if best is None or form < best:
            best = form
    return best
