"""Identifying knots in 3D coordinates: checks, closure, reduction, projection, table lookup.

The path of the data: coordinates -> checked chain (units, repeats, NaN,
self-contact) -> closed polygon (open chains: by the chosen closure) -> KMT
reduction -> projection to a :class:`~knotsift.diagram.Diagram` ->
:func:`knotsift.identification.identify_diagram` (simplification,
fingerprint, table) -> :class:`CurveResult`.  Several chains in one frame
give a :class:`FrameResult` with each chain's type and the linking numbers
of the rings.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from pathlib import Path
from typing import Iterable, Iterator

import numpy as np

from ..display import FrameValues
from ..errors import CurveError, KnotsiftError
from ..result import IdentifyResult
from .closure import CLOSURES, DEFAULT_CLOSURES, closure_spectrum
from .contact import check_no_contact
from .frame import Chain, Frame, FrameFailure, as_chain, prepare_chains
from .kmt import kmt_reduce
from .knot_type import cached_invariants, polygon_type
from .projection import project

__all__ = [
    "CurveResult",
    "FrameResult",
    "identify_curve",
    "identify_frame",
    "identify_frames",
    "identify_file",
    "CURVE_STATUSES",
    "CURVE_NOTATION",
]

#: Statuses of a curve result: those of IdentifyResult, and "undetermined"
#: when no knot type holds a strict majority of the closures.
#: Statuses of a curve result: those of IdentifyResult, "undetermined" when no
#: knot type holds a strict majority of the closures, "depends on missing
#: segment" when a chain with gaps changes type with its bridges
#: (knotsift.curves.gaps), and "too complex" when its wall-time budget ran out.
CURVE_STATUSES = ("identified", "ambiguous", "not in table", "undetermined",
                  "depends on missing segment", "too complex", "error")
CURVE_NOTATION = "3D coordinates"

UNKNOT_NOTE = ("the unknot here means the curve reduced to a diagram whose invariants are "
               "all the unknot's")


@dataclass
class CurveResult(IdentifyResult):
    """The identification of one chain, with what the 3D pipeline did.

    Extra attributes (all in ``to_dict()["curve"]``)
    -------------------------------------------------
    frame : int or None
    chain : str
    closed : bool
    beads : int
        Beads read.
    closure : str or None
        For open chains: direct, far or stochastic.
    spectrum : list of dict or None
        For open chains: ``{type, fingerprint, count, fraction}`` per knot type
        met among the closures, most frequent first.
    core : dict or None
        The knotted core (see :class:`knotsift.curves.localisation.KnottedCore`).
    geometry : dict
        ``beads_used`` (after dropping repeats), ``vertices_reduced`` (after
        KMT), ``crossings_projected``, ``crossings_simplified``, ``redraws``
        (projection directions rejected), ``seed``, and for stochastic
        closure ``closures``, ``closures_redrawn``, ``closures_reused``.
    warnings : list of str
    gaps : dict or None
        For an open chain with gaps: ``gaps`` (``{beads, distance}`` each),
        ``bridged`` (the answer with straight bridges), ``pieces``
        (``{start, end, beads, answer}`` each) and ``agree`` (see
        :mod:`knotsift.curves.gaps`).
    """

    frame: int | None = None
    chain: str = ""
    closed: bool = True
    beads: int = 0
    closure: str | None = None
    spectrum: list[dict] | None = None
    core: dict | None = None
    geometry: dict = field(default_factory=dict)
    warnings: list[str] = field(default_factory=list)
    gaps: dict | None = None

    def to_dict(self) -> dict:
        d = super().to_dict()
        d["curve"] = {
            "frame": self.frame,
            "chain": self.chain,
            "closed": self.closed,
            "beads": self.beads,
            "closure": self.closure,
            "spectrum": self.spectrum,
            "core": self.core,
            "geometry": dict(self.geometry),
            "warnings": list(self.warnings),
            "gaps": self.gaps,
        }
        return d

    def to_text(self) -> str:
        kind = "ring" if self.closed else f"open chain, {self.closure} closure"
        head = f"chain {self.chain} ({self.beads} beads, {kind})"
        if self.status == "error":
            return f"{head}: error: {self.error}"
        if self.status == "undetermined":
            lines = [f"{head}: undetermined (no knot type holds a majority of the closures)"]
        elif self.status == "depends on missing segment" and self.gaps:
            pieces = ", ".join(p["answer"] for p in self.gaps["pieces"])
            lines = [f"{head}: depends on the missing segment: {self.gaps['bridged']} with "
                     f"straight bridges; pieces apart: {pieces}"]
            lines += [f"  note: {n}" for n in self.notes]
        else:
            body = IdentifyResult.to_text(self)
            first, *rest = body.split("\n")
            if self.source and first.startswith(f"{self.source}: "):
                first = first[len(self.source) + 2:]
            lines = [f"{head}: {first}"] + rest
        g = self.geometry
        if g:
            lines.insert(1, f"  geometry: {g.get('beads_used')} beads used, "
                            f"{g.get('vertices_reduced')} after KMT reduction")
        if self.spectrum:
            total = sum(s["count"] for s in self.spectrum)
            shown = ", ".join(f"{s['type']} {s['count']}/{total}" for s in self.spectrum[:6])
            more = f" (+{len(self.spectrum) - 6} more)" if len(self.spectrum) > 6 else ""
            lines.insert(2, f"  closures: {shown}{more}")
        if self.core:
            c = self.core
            wrap = ", wrapping round" if c["wraps"] else ""
            lines.append(f"  knotted core: beads {c['start']}-{c['end']} ({c['beads']} beads, "
                         f"{c['fraction']:.0%} of the chain{wrap}; {c['closure']} closure)")
        for w in self.warnings:
            lines.append(f"  warning: {w}")
        return "\n".join(lines)


@dataclass
class FrameResult(FrameValues):
    """Every chain of one frame, and the linking numbers of its rings.

    Attributes
    ----------
    source : str
    frame : int
    chains : list of CurveResult
    linking : list of dict
        ``{"a": id, "b": id, "linking_number": int}`` for each pair of rings.
    link : dict or None
        The rings as one link (see :func:`knotsift.curves.frame_link.frame_link`):
        its type, split parts and two-ring sublinks; None with fewer than two rings.
    warnings : list of str
        Reader warnings (chain breaks) and frame-level notes.
    error : str or None
        Set when the frame could not be read or checked at all.
    """

    source: str
    frame: int
    chains: list[CurveResult] = field(default_factory=list)
    linking: list[dict] = field(default_factory=list)
    warnings: list[str] = field(default_factory=list)
    error: str | None = None
    link: dict | None = None

    @property
    def failed(self) -> bool:
        return self.error is not None or any(c.status == "error" for c in self.chains)

    def to_dict(self) -> dict:
        return {"source": self.source, "frame": self.frame,
                "chains": [c.to_dict() for c in self.chains],
                "linking": list(self.linking), "link": self.link,
                "warnings": list(self.warnings), "error": self.error}

    def to_text(self) -> str:
        head = f"{self.source}, frame {self.frame}" if self.source else f"frame {self.frame}"
        if self.error is not None:
            return f"{head}: error: {self.error}"
        lines = [head]
        for c in self.chains:
            lines.extend("  " + s for s in c.to_text().split("\n"))
        for lk in self.linking:
            lines.append(f"  linking number of rings {lk['a']} and {lk['b']}: "
                         f"{lk['linking_number']}")
        if self.link:
            cands = self.link.get("candidates") or []
            alias = (f" ({', '.join(cands[0]['aliases'])})"
                     if len(cands) == 1 and cands[0]["aliases"] else "")
            lines.append(f"  the rings as one link: {self.link['type'] or self.link['status']}"
                         f"{alias}")
            parts = self.link.get("split_parts", [])
            if len(parts) > 1:
                lines.append("    separate parts: " + "; ".join(", ".join(p) for p in parts))
            for s in self.link.get("sublinks", []) if len(self.link["rings"]) > 2 else []:
                lines.append(f"    rings {s['rings'][0]} and {s['rings'][1]} alone: {s['type']}")
            for n in self.link.get("notes", []):
                lines.append(f"    note: {n}")
        for w in self.warnings:
            lines.append(f"  warning: {w}")
        return "\n".join(lines)


def _is_trivial(fp) -> bool:
    return fp.components == 1 and fp.jones is not None and fp.jones == 1


def _type_label(fp, table) -> str:
    from ..identification import match_fingerprint

    status, cands = match_fingerprint(fp, table)
    if _is_trivial(fp) and not cands:
        return "0_1"
    if not cands:
        from ..type_key import type_key

        key = type_key(fp.texts())
        return f"not in table ({key})" if key else f"not in table (V = {fp.jones})"
    return " or ".join(c.shown for c in cands)


def _fingerprint_of(result: IdentifyResult):
    """The fingerprint behind a result (for the knotted-core search), None if incomplete."""
    from ..invariants.fingerprint import Fingerprint
    from ..laurent import Laurent

    inv = result.invariants
    if not inv.get("determinant") or not inv.get("signature"):
        return None
    from ..invariants.double_cover import parse_homology

    hashed = None
    if inv.get("rho_1_hash") and not inv.get("rho_1"):
        hashed = tuple(None if v == "-" else int(v) for v in inv["rho_1_hash"].split(","))
    return Fingerprint(int(inv["components"]),
                       Laurent.parse(inv["jones"]) if inv.get("jones") else None,
                       Laurent.parse(inv["alexander"]) if inv.get("alexander") else None,
                       int(inv["determinant"]), int(inv["signature"]),
                       Laurent.parse(inv["rho_1"]) if inv.get("rho_1") else None,
                       parse_homology(inv["homology"]) if inv.get("homology") else (),
                       hashed)


def _check_args(closure: str, n_closures: int) -> None:
    if closure not in CLOSURES:
        raise CurveError(f"closure must be one of {', '.join(CLOSURES)}, got {closure!r}",
                         value=closure)
    if isinstance(n_closures, bool) or not isinstance(n_closures, (int, np.integer)) \
            or n_closures < 1:
        raise CurveError(f"the number of closures must be a positive integer, got "
                         f"{n_closures!r}", value=n_closures)


def _identify_prepared(x: np.ndarray, kept: np.ndarray, n_input: int, chain_id: str,
                       closed: bool, closure: str, n_closures: int, seed: int,
                       localise: bool, table, label: str, where: str,
                       warnings: list[str]) -> CurveResult:
    from ..identification import identify_diagram

    geometry: dict = {"beads_used": int(len(x)), "seed": seed}
    spectrum = None
    rng = np.random.default_rng([seed, 0])
    if closed:
        # one pass: simplified once here, invariants computed once in identify_diagram
        typed = polygon_type([(x, True)], rng, where=where, with_fingerprint=False)
        base = identify_diagram(typed.diagram, table, source=label, notation=CURVE_NOTATION,
                                simplified=typed.simplified)
        target = _fingerprint_of(base)
        geometry.update(vertices_reduced=typed.vertices_reduced,
                        crossings_projected=typed.crossings,
                        crossings_simplified=typed.simplified.number_of_crossings(),
                        redraws=typed.redraws)
    else:
        sp = closure_spectrum(x, closure, n_closures, seed, where=where)
        total = sum(t.count for t in sp.types)
        spectrum = [{"type": _type_label(t.fingerprint, table), "fingerprint":
                     t.fingerprint.key(), "count": t.count, "fraction": t.count / total}
                    for t in sp.types]
        geometry.update(vertices_reduced=sp.vertices_reduced,
                        crossings_projected=int(np.median(sp.crossings)) if sp.crossings
                        else 0)
        if closure == "stochastic":
            geometry.update(closures=sp.n_closures, closures_redrawn=sp.redrawn,
                            closures_reused=sp.reused)
        if sp.dominant is not None:
            base = identify_diagram(sp.dominant.diagram, table, source=label,
                                    notation=CURVE_NOTATION, simplified=sp.dominant.diagram,
                                    staged=cached_invariants(sp.dominant.diagram))
            target = sp.dominant.fingerprint
            geometry["crossings_simplified"] = sp.dominant.diagram.number_of_crossings()
            if closure == "stochastic":
                top = spectrum[0]
                base.notes.insert(0, f"dominant type over {total} random closures: "
                                     f"{top['count']} of {total} ({top['fraction']:.0%}), a "
                                     "strict majority")
        else:
            base = IdentifyResult(status="undetermined", source=label,
                                  notation=CURVE_NOTATION)
            target = None
            top = spectrum[0]
            base.notes.append(f"the most frequent type, {top['type']}, holds {top['count']} of "
                              f"{total} closures: not a strict majority")
    result = CurveResult(**vars(base))
    result.chain, result.closed, result.beads = chain_id, closed, n_input
    result.closure = None if closed else closure
    result.spectrum = spectrum
    result.geometry = geometry
    result.warnings = list(warnings)
    if localise:
        if target is None:
            result.notes.append("no knotted core: the knot type is undetermined")
        elif _is_trivial(target):
            result.notes.append("no knotted core: the chain is unknotted")
        elif target.jones is None:
            result.notes.append("no knotted core searched: the Jones polynomial of the chain "
                                "was not computed, and the search compares whole fingerprints")
        else:
            from .localisation import knotted_core

            core = knotted_core(x, closed, target.key(), closure, n_closures, seed, kept=kept,
                                n_input=n_input, where=where)
            if core is None:
                result.notes.append("no arc of the ring keeps the knot type: the knot is not "
                                    "localised")
            else:
                result.core = core.to_dict()
    return result


def _chain_where(source: str, frame: int | None, chain_id: str) -> str:
    parts = [source] if source else []
    if frame is not None:
        parts.append(f"frame {frame}")
    parts.append(f"chain {chain_id}")
    return ", ".join(parts)


def _identify_chain(chain: Chain, source: str, frame: int | None, closure: str,
                    n_closures: int, seed: int, localise: bool, table, box=None,
                    gaps: list | None = None, budget=None) -> CurveResult:
    from ..budget import TooComplex, item_budget

    label = _chain_where(source, frame, chain.id)
    if box is not None:  # wrapped into a periodic box: unwrap first (knotsift.curves.periodic)
        from .periodic import unwrap_chain

        chain = Chain(chain.id, unwrap_chain(chain.coords, box, chain.closed, where=label),
                      chain.closed)
    if gaps and not chain.closed:  # the bridged chain and its pieces (knotsift.curves.gaps)
        from .gaps import weigh_gaps

        result = _identify_chain(chain, source, frame, closure, n_closures, seed, localise,
                                 table, budget=budget)
        weigh_gaps(result, chain, gaps, lambda piece: _identify_piece(
            piece, source, frame, closure, n_closures, seed, table))
        return result
    where = ", ".join(p for p in (source, f"frame {frame}" if frame is not None else "") if p)
    with item_budget(budget):  # one chain is one item: its wall time starts here
        prep = prepare_chains([chain], where=where)
        x = prep.chains[0].coords
        near = check_no_contact([(x, chain.closed)], [chain.id], prep.kept, where=where)
        try:
            result = _identify_prepared(x, prep.kept[0], len(chain.coords), chain.id,
                                        chain.closed, closure, n_closures, seed, localise,
                                        table, label, where, list(prep.warnings) + near)
        except TooComplex as exc:  # past the deadline outside identify_diagram (closures)
            result = CurveResult(status="too complex", error=exc.message, source=label,
                                 notation=CURVE_NOTATION, chain=chain.id, closed=chain.closed,
                                 beads=len(chain.coords),
                                 closure=None if chain.closed else closure,
                                 warnings=list(prep.warnings) + near, primality="unknown")
            result.notes.append(f"{exc.message}; no invariant of the chain was kept")
    result.frame = frame
    return result


def _identify_piece(piece: Chain, source: str, frame: int | None, closure: str,
                    n_closures: int, seed: int, table) -> CurveResult:
    try:
        return _identify_chain(piece, source, frame, closure, n_closures, seed, False, table)
    except CurveError as exc:
        return CurveResult(status="error", error=str(exc), chain=piece.id, closed=False)


def identify_curve(coords, closed: bool = True, closure: str = "stochastic",
                   n_closures: int = DEFAULT_CLOSURES, seed: int = 0, localise: bool = False,
                   table=None, source: str = "", box=None, budget=None) -> CurveResult:
    """Identify the knot formed by one chain of 3D coordinates.

    Parameters
    ----------
    coords : (N, 3) array-like, Chain, or Frame with one chain
        Bead coordinates in any units (topology does not see units).
    closed : bool
        Ring (default) or open chain; ignored for a Chain or Frame, which carry it.
    closure : {"direct", "far", "stochastic"}
        How an open chain is closed (default stochastic: the majority type
        over ``n_closures`` random directions).  For a ring it is used only by
        the knotted-core search, to close arcs.
    n_closures : int
        Random closures (default 100).
    seed : int
        Seeds every random step (projection directions, closure directions).
    localise : bool
        Also find the knotted core (slower: dozens of identifications).
    table : ReferenceTable, optional
        Default: the shipped table.
    source : str
        A label for reports.
    budget : knotsift.budget.Budget, optional
        Cost limits of this chain (Jones estimate, wall time); default the
        enclosing :func:`knotsift.budget.item_budget` or the defaults.
    box : sequence of 3 or 6 numbers, optional
        A periodic box the chain is wrapped into (default: a Frame's own
        box); the chain is unwrapped first (see knotsift.curves.periodic).

    Returns
    -------
    CurveResult
        Status ``too complex`` when the chain's wall time ran out.

    Raises
    ------
    CurveError
        Bad coordinates (NaN, fewer than 4 beads, a chain folding back or
        passing through itself), a closure through the chain, or a Frame with
        several chains (use :func:`identify_frame`).
    TableError
        When the reference table is missing.

    Examples
    --------
    >>> import numpy as np
    >>> s = np.linspace(0, 2 * np.pi, 120, endpoint=False)
    >>> r = 2 + np.cos(3 * s)
    >>> left = np.stack([r * np.cos(2 * s), r * np.sin(2 * s), np.sin(3 * s)], axis=1)
    >>> identify_curve(left).name  # doctest: +SKIP
    '3_1*'

    Notes
    -----
    Rings are KMT-reduced and projected once; open chains are reduced once
    and every closure reuses the reduced chain when that is provably an
    isotopy (see :func:`knotsift.curves.closure.closure_spectrum`).
    """
    _check_args(closure, n_closures)
    from ..table import open_table

    table = table or open_table()
    frame_index = None
    if isinstance(coords, Frame):
        if len(coords.chains) != 1:
            raise CurveError(f"the frame has {len(coords.chains)} chains; identify_curve takes "
                             "one (use identify_frame for several)", where=coords.where)
        source = source or coords.source
        frame_index = coords.index
        chain = coords.chains[0]
        box = box if box is not None else coords.box
    elif isinstance(coords, Chain):
        chain = coords
    else:
        chain = as_chain(coords, closed)
    return _identify_chain(chain, source, frame_index, closure, n_closures, seed, localise,
                           table, box=box, budget=budget)


def _linking(frame: Frame, rings: list[Chain], seed: int, table=None
             ) -> tuple[list[dict], list[str], dict | None]:
    """Pairwise linking numbers of the rings of a frame, from one joint projection, and
    (with a table) the rings identified as one link."""
    prep = prepare_chains(rings, where=frame.where)
    chains = [(c.coords, True) for c in prep.chains]
    ids = [c.id for c in rings]
    near = check_no_contact(chains, ids, prep.kept, where=frame.where)
    reduced = kmt_reduce(chains).chains
    proj = project(reduced, np.random.default_rng([seed, 3]), where=frame.where)
    diagram = proj.diagram
    out = []
    for a in range(len(rings)):
        for b in range(a + 1, len(rings)):
            ca, cb = proj.components[a], proj.components[b]
            lk = 0 if ca is None or cb is None else diagram.linking_number(ca, cb)
            if lk != proj.linking_number(a, b):  # two counts of the same signs
                raise CurveError(f"linking number of {ids[a]} and {ids[b]} counted two ways "
                                 "disagrees", where=frame.where)
            out.append({"a": ids[a], "b": ids[b], "linking_number": int(lk)})
    link = None
    if table is not None:
        from .frame_link import frame_link

        try:
            link = frame_link(diagram, list(proj.components), ids, table, source=frame.where)
        except KnotsiftError as exc:
            link = {"rings": ids, "status": "error", "type": None,
                    "notes": [f"the rings were not identified as one link: {exc}"]}
    return out, near, link


def identify_frame(frame: Frame, closure: str = "stochastic",
                   n_closures: int = DEFAULT_CLOSURES, seed: int = 0, localise: bool = False,
                   table=None, linking: bool = True, budget=None) -> FrameResult:
    """Identify every chain of a frame and the linking numbers of its rings.

    Each chain is checked and identified on its own (another chain does not
    change its knot type); a bad chain gets a result with status "error" and
    the others go on.  The linking number of two rings is half the sum of
    the signs of their mutual crossings in one generic projection of all the
    rings (after a joint KMT reduction), an exact integer.

    Parameters
    ----------
    frame : Frame
    closure, n_closures, seed, localise, table
        As for :func:`identify_curve`.
    linking : bool
        Compute the linking numbers of pairs of rings.
    budget : knotsift.budget.Budget, optional
        Cost limits of each chain (see :func:`identify_curve`).

    Returns
    -------
    FrameResult
    """
    _check_args(closure, n_closures)
    from ..table import open_table

    table = table or open_table()
    out = FrameResult(frame.source, frame.index, warnings=list(frame.warnings))
    good = []
    for chain in frame.chains:
        try:
            r = _identify_chain(chain, frame.source, frame.index, closure, n_closures, seed,
                                localise, table, box=getattr(frame, "box", None),
                                gaps=getattr(frame, "gaps", {}).get(chain.id), budget=budget)
            good.append(chain)
        except CurveError as exc:
            r = CurveResult(status="error", error=str(exc),
                            source=_chain_where(frame.source, frame.index, chain.id),
                            notation=CURVE_NOTATION, frame=frame.index, chain=chain.id,
                            closed=chain.closed,
                            beads=len(chain.coords), closure=None if chain.closed else closure)
        out.chains.append(r)
    rings = [c for c in good if c.closed]
    box = getattr(frame, "box", None)
    if linking and len(rings) >= 2 and box is not None:
        from .periodic import unwrap_chain

        rings = [Chain(c.id, unwrap_chain(c.coords, box, True), True) for c in rings]
        out.warnings.append("linking numbers are those of the rings as unwrapped from their "
                            "first beads; in a periodic box a ring also meets the periodic "
                            "images of the others, which are not counted")
    if linking and len(rings) >= 2:
        try:
            out.linking, notes, out.link = _linking(frame, rings, seed, table)
            out.warnings.extend(notes)
        except CurveError as exc:
            out.warnings.append(f"linking numbers not computed: {exc}")
    return out


def identify_frames(frames: Iterable[Frame | FrameFailure], closure: str = "stochastic",
                    n_closures: int = DEFAULT_CLOSURES, seed: int = 0, localise: bool = False,
                    table=None, linking: bool = True, progress=None
                    ) -> Iterator[FrameResult]:
    """Identify a stream of frames; a bad frame becomes a FrameResult with ``error`` set.

    Parameters
    ----------
    frames : iterable of Frame or FrameFailure
        As yielded by :func:`knotsift.curves.formats.read_frames` with ``errors="yield"``.
    progress : knotsift.progress.Progress, optional
        Updated once per frame.
    """
    _check_args(closure, n_closures)
    from ..table import open_table

    table = table or open_table()
    it = iter(frames)
    while True:
        try:
            fr = next(it)
        except StopIteration:
            return
        except KnotsiftError as exc:  # a reader that could not go on
            yield FrameResult("", -1, error=str(exc))
            return
        if isinstance(fr, FrameFailure):
            yield FrameResult(fr.source, fr.index, error=str(fr.error))
        else:
            try:
                yield identify_frame(fr, closure, n_closures, seed, localise, table, linking)
            except CurveError as exc:
                yield FrameResult(fr.source, fr.index, error=str(exc))
        if progress is not None:
            progress.update()


def identify_file(path: str | Path, format: str | None = None, closed: bool | None = None,
                  frames=None, closure: str = "stochastic",
                  n_closures: int = DEFAULT_CLOSURES, seed: int = 0, localise: bool = False,
                  table=None, linking: bool = True, progress=None, **options
                  ) -> Iterator[FrameResult]:
    """Identify every frame of a coordinate file (streamed; bad frames reported, the rest go on).

    Parameters
    ----------
    path : path-like
    format, closed, frames, **options
        As for :func:`knotsift.curves.formats.read_frames`.
    closure, n_closures, seed, localise, table, linking, progress
        As for :func:`identify_frames`.

    Raises
    ------
    CurveError
        Before the first frame: a missing file, an unknown format or bad options.
    """
    from .formats import read_frames

    _check_args(closure, n_closures)
    stream = read_frames(path, format=format, closed=closed, frames=frames, errors="yield",
                         **options)
    return identify_frames(stream, closure, n_closures, seed, localise, table, linking,
                           progress)
