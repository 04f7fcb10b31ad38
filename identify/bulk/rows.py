"""One output row per item: the knot, its invariants and what it cost.

A row is a flat dict with the columns of :data:`COLUMNS`, so that every sink
(CSV, Parquet, SQL) stores the same table.  A bad item (an invalid code, a
corrupt frame, a chain passing through itself) becomes a row with status
``error`` and the message in ``error``; it never stops a run.
"""

from __future__ import annotations

import json
import time
from dataclasses import asdict, dataclass

from ..errors import KnotsiftError

__all__ = ["COLUMNS", "TIMING_COLUMNS", "ClassifyOptions", "classify_item", "classify_chunk",
           "row_from_result", "error_rows", "warm_up"]

#: (name, type, meaning) of every output column, in order; type is int, float or text.
COLUMNS: tuple[tuple[str, str, str], ...] = (
    ("key", "text", "source:frame:chain, unique"),
    ("source", "text", "the input file as given"),
    ("frame", "int", "line number (codes) or frame index from 0 (trajectories)"),
    ("chain", "int", "chain index within the frame (0 for codes)"),
    ("label", "text", "label given with the input (empty text is stored as null)"),
    ("fields", "text", "JSON of the other columns of a code table"),
    ("kind", "text", "code or frame"),
    ("notation", "text", "notation read (codes)"),
    ("n_beads", "int", "number of beads (curves)"),
    ("closure", "text", "how an open chain was closed: direct, far, stochastic"),
    ("status", "text", "identified, ambiguous, not in table, undetermined (no majority "
                       "over closures), too complex (wall-time budget ran out), error"),
    ("knot", "text", "identified label with the mirror mark, e.g. 3_1*"),
    ("knot_type", "text", "identified knot without chirality, e.g. 3_1"),
    ("chirality", "text", "same, mirror, amphichiral or undetermined"),
    ("candidates", "text", "every candidate label, joined by ' or '"),
    ("crossings_input", "int", "crossings of the diagram as given or projected"),
    ("crossings_simplified", "int", "crossings after simplification"),
    ("components", "int", "number of components"),
    ("jones", "text", "Jones polynomial, canonical text"),
    ("alexander", "text", "Alexander polynomial, canonical text"),
    ("determinant", "int", "determinant"),
    ("signature", "int", "signature (right-handed trefoil -2)"),
    ("rho_1", "text", "perturbed Alexander invariant rho_1, canonical text (knots)"),
    ("homology", "text", "homology of the double branched cover, e.g. Z/3+Z/3"),
    ("type_key", "text", "key of the knot type from the always-computed invariants (README)"),
    ("type_key_unoriented", "text", "the type key shared with the mirror image"),
    ("primality", "text", "prime, composite, unknot or unknown"),
    ("factors", "text", "JSON [{name, label, chirality}] of a connected sum's factors"),
    ("crossing_lower", "int", "lower bound of the crossing number"),
    ("crossing_upper", "int", "upper bound of the crossing number"),
    ("jones_status", "text", "computed, over budget, stopped, not needed, not requested"),
    ("resolutions", "text", "JSON distribution over uncertain crossings (codes)"),
    ("closure_spectrum", "text", "JSON [{type, count, fraction}] over closures (open chains)"),
    ("core_start", "int", "first bead of the knotted core (with --core)"),
    ("core_end", "int", "last bead of the knotted core (below core_start when it wraps round)"),
    ("linking", "text", "JSON {other ring: linking number} for the rings of the frame"),
    ("link", "text", "the rings of the frame (or a code of several components) as one link: "
                     "matched label(s) with orientation and mirror marks, e.g. 4^2_1~2*"),
    ("link_type", "text", "that link's name alone, e.g. 4^2_1 (identified links only)"),
    ("link_components", "int", "number of rings (components) in that link"),
    ("link_crossings", "int", "crossing number of the identified link: the node number"),
    ("seconds", "float", "time spent on this row (a frame's time is shared by its chains)"),
    ("error", "text", "the message when status is error"),
)

#: Columns that differ between two runs of the same input.
TIMING_COLUMNS = ("seconds",)

COLUMN_NAMES = tuple(c[0] for c in COLUMNS)
_TEXT_COLUMNS = tuple(c[0] for c in COLUMNS if c[1] == "text")


@dataclass(frozen=True)
class ClassifyOptions:
    """What changes a row: stored with the output and checked on resume.

    Parameters
    ----------
    notation : str, optional
        Read every code in this notation instead of detecting it.
    closed : bool, optional
        Trajectory chains are rings (True) or open chains (False); default per
        format (PDB open, the others rings).
    closure : str
        How open chains are closed: direct, far or stochastic (knotsift.curves).
    n_closures : int
        Random closures of a stochastic closure.
    seed : int
        Seeds every random step of the 3D pipeline (projections, closures).
    core : bool
        Also find the knotted core of knotted chains (slower).
    beads_per_chain : int, optional
        Split each XYZ frame into chains of this many beads.
    table : str, optional
        A reference table file instead of the shipped one.
    jones, jones_memory, jones_seconds, wall_seconds
        The cost budget of each item (:class:`knotsift.budget.Budget`).
    topology, select, chains_by, box
        MD trajectories: as for :func:`knotsift.curves.formats.read_frames`.
        Stored with the output only when set.
    """

    notation: str | None = None
    closed: bool | None = None
    closure: str = "stochastic"
    n_closures: int = 100
    seed: int = 0
    core: bool = False
    beads_per_chain: int | None = None
    table: str | None = None
    jones: str = "auto"
    jones_memory: int = 1 << 30
    jones_seconds: float = 20.0
    wall_seconds: float | None = 60.0
    topology: str | None = None
    select: str | None = None
    chains_by: str = "auto"
    box: tuple | None = None

    def reader_options(self) -> dict:
        """The MD reader options that are set, as keywords of read_frames."""
        out = {k: getattr(self, k) for k in ("topology", "select", "box")
               if getattr(self, k) is not None}
        if self.chains_by != "auto":
            out["chains_by"] = self.chains_by
        return out

    def to_dict(self) -> dict:
        d = {k: v for k, v in asdict(self).items()
             if k not in ("topology", "select", "chains_by", "box")}
        d.update(self.reader_options())
        if "box" in d:
            d["box"] = [float(v) for v in d["box"]]
        return d

    def budget(self):
        """The :class:`knotsift.budget.Budget` of each item."""
        from ..budget import Budget

        return Budget(jones_memory=self.jones_memory, jones_seconds=self.jones_seconds,
                      wall_seconds=self.wall_seconds, jones=self.jones)


def _empty_row(item, chain: int = 0) -> dict:
    row = dict.fromkeys(COLUMN_NAMES)
    row.update(key=item.keys[chain], source=item.source, frame=item.frame,
               chain=item.chain + chain, label=item.label or None,
               fields=item.fields or None, kind=item.kind)
    return row


def row_from_result(row: dict, result) -> dict:
    """Fill ``row`` from an :class:`~knotsift.result.IdentifyResult`."""
    row["status"] = result.status
    row["notation"] = row.get("notation") or result.notation or None
    if result.status == "error":
        row["error"] = result.error
        return row
    if result.status == "too complex":
        row["error"] = result.error
    cands = result.candidates
    if result.link is not None:  # a code of several components: a link, not a knot
        _link_columns(row, result.status, cands, result.link["components"])
    elif result.status == "identified" and cands:
        row["knot"] = result.name
        row["knot_type"] = cands[0].name
        row["chirality"] = cands[0].chirality
    row["candidates"] = " or ".join(c.shown for c in cands) or None
    row["crossings_input"] = result.crossings_input
    row["crossings_simplified"] = result.crossings_simplified
    inv = result.invariants
    row["components"] = int(inv["components"]) if inv.get("components") else None
    row["jones"] = inv.get("jones") or None
    row["alexander"] = inv.get("alexander") or None
    row["determinant"] = int(inv["determinant"]) if inv.get("determinant") else None
    row["signature"] = int(inv["signature"]) if inv.get("signature") else None
    row["rho_1"] = inv.get("rho_1") or None
    row["homology"] = inv.get("homology") or None
    if result.resolutions:
        row["resolutions"] = json.dumps(result.resolutions, sort_keys=True)
    _key_columns(row, result)
    return row


def _link_columns(row: dict, status: str, candidates, components: int) -> None:
    """Fill the link columns from a link identification (Candidate objects or dicts)."""
    def get(c, key):
        return c[key] if isinstance(c, dict) else getattr(c, key)

    row["link_components"] = components
    row["link"] = (" or ".join(get(c, "label") for c in candidates) if candidates
                   else status)
    if status == "identified" and candidates:
        row["link_type"] = get(candidates[0], "name")
        row["link_crossings"] = get(candidates[0], "crossing_number")


def _key_columns(row: dict, result) -> None:
    """The type key, primality, factors, crossing bounds and what became of Jones."""
    from ..type_key import unoriented_type_key

    row["type_key"] = result.type_key
    row["type_key_unoriented"] = unoriented_type_key(result.invariants) \
        if result.type_key else None
    row["primality"] = result.primality
    if result.factors:
        row["factors"] = json.dumps(result.factors)
    if result.crossing_bounds:
        row["crossing_lower"], row["crossing_upper"] = result.crossing_bounds
    row["jones_status"] = result.cost.get("jones")


def _fail(row: dict, exc: BaseException) -> dict:
    row["status"] = "error"
    if isinstance(exc, KnotsiftError):
        row["error"] = str(exc)
    else:  # a bug must not stop a run of many items, but is marked as one
        row["error"] = f"internal error: {type(exc).__name__}: {exc}"
    return row


def _classify_code(item, options: ClassifyOptions, table, row: dict) -> dict:
    from ..identification import identify

    where = f"{item.source}, line {item.frame}" + (f" ({item.label})" if item.label else "")
    result = identify(item.payload, options.notation, table=table, label=where)
    return row_from_result(row, result)


def _linking_by_chain(linking: list[dict]) -> dict[str, dict[str, int]]:
    out: dict[str, dict[str, int]] = {}
    for lk in linking:
        out.setdefault(lk["a"], {})[lk["b"]] = lk["linking_number"]
        out.setdefault(lk["b"], {})[lk["a"]] = lk["linking_number"]
    return out


def _classify_frame(item, options: ClassifyOptions, table) -> list[dict]:
    """The rows of one trajectory frame, one per chain, through knotsift.curves.identify_frame.

    This is the seam between bulk classification and the 3D pipeline: the
    only place that calls knotsift.curves' pipeline.
    """
    from ..curves import identify_frame

    start = time.perf_counter()
    found = identify_frame(item.payload, closure=options.closure, n_closures=options.n_closures,
                           seed=options.seed, localise=options.core, table=table,
                           linking=True)
    share = (time.perf_counter() - start) / max(1, len(found.chains))
    links = _linking_by_chain(found.linking)
    whole = found.link or {}
    rings = set(whole.get("rings", []))
    rows = []
    for c, result in enumerate(found.chains):
        row = _empty_row(item, c)
        row["label"] = result.chain or None
        row["n_beads"] = result.beads
        row_from_result(row, result)
        row["notation"] = None
        row["closure"] = result.closure
        if result.spectrum:
            row["closure_spectrum"] = json.dumps(
                [{k: s[k] for k in ("type", "count", "fraction")} for s in result.spectrum])
        if result.core:
            row["core_start"], row["core_end"] = result.core["start"], result.core["end"]
        if result.chain in links:
            row["linking"] = json.dumps(links[result.chain], sort_keys=True)
        if result.chain in rings:
            _link_columns(row, whole.get("status") or "error", whole.get("candidates", []),
                          len(rings))
        row["seconds"] = share   # the frame's time, shared among its chains
        rows.append(row)
    return rows


def _finish(row: dict) -> dict:
    for name in _TEXT_COLUMNS:  # one form of "nothing" in every sink (CSV has no other)
        if row[name] == "":
            row[name] = None
    return row


def classify_item(item, options: ClassifyOptions | None = None, table=None) -> list[dict]:
    """The output rows of one item (one per chain); errors become rows with status ``error``.

    Examples
    --------
    >>> from knotsift.bulk.sources import Item
    >>> (row,) = classify_item(Item("x:1:0", "x", 1, 0, "code", "DT: 4 6 8 2"))
    >>> row["knot"], row["chirality"], row["determinant"]
    ('4_1', 'amphichiral', 5)
    >>> classify_item(Item("x:2:0", "x", 2, 0, "code", "[[1,2]]"))[0]["status"]
    'error'
    """
    from ..table import open_table

    from ..budget import item_budget

    options = options or ClassifyOptions()
    with item_budget(options.budget()):
        return _classify_item(item, options, table)


def _classify_item(item, options: ClassifyOptions, table) -> list[dict]:
    from ..table import open_table

    if item.kind == "frame" and item.error is None:
        try:
            return [_finish(r) for r in _classify_frame(item, options,
                                                        table or open_table(options.table))]
        except Exception as exc:  # noqa: BLE001 - the whole frame failed
            rows = [_fail(_empty_row(item, c), exc) for c in range(item.n_rows)]
            for r in rows:
                r["seconds"] = 0.0
            return [_finish(r) for r in rows]
    row = _empty_row(item)
    start = time.perf_counter()
    try:
        if item.error:
            row["status"], row["error"] = "error", item.error
        else:
            _classify_code(item, options, table or open_table(options.table), row)
    except Exception as exc:  # noqa: BLE001 - recorded in the row, see _fail
        _fail(row, exc)
    row["seconds"] = time.perf_counter() - start
    return [_finish(row)]


def error_rows(item, message: str) -> list[dict]:
    """The rows of an item given up (one per chain), status ``error`` with ``message``."""
    rows = []
    for c in range(max(1, item.n_rows)):
        row = _empty_row(item, c)
        row["status"], row["error"], row["seconds"] = "error", message, 0.0
        rows.append(_finish(row))
    return rows


def _warm_up_item(kind: str):
    """A tiny item of ``kind``: the trefoil as a DT code, or as a ring of 24 beads."""
    from .sources import Item

    if kind != "frame":
        return Item("warm-up:0:0", "warm-up", 0, 0, "code", "DT: 4 6 2")
    import numpy as np

    from ..curves.frame import Chain, Frame

    t = np.linspace(0.0, 2.0 * np.pi, 24, endpoint=False)   # the usual trefoil parametrisation
    x = np.stack([np.sin(t) + 2 * np.sin(2 * t), np.cos(t) - 2 * np.cos(2 * t),
                  -np.sin(3 * t)], axis=1)
    return Item("warm-up:0:0", "warm-up", 0, 0, "frame", Frame("warm-up", 0, [Chain("A", x, True)]))


def warm_up(item, options: ClassifyOptions) -> None:
    """Import and run the classification path once on a tiny item of the kind of ``item``.

    Run by the parent of the worker processes before they are forked, so that
    each starts with the modules loaded and the first-use work (compiled
    kernels, caches) done; the result is thrown away.
    """
    kind = getattr(item, "kind", "code")
    if kind == "frame":   # many frames ahead: compiled 3D kernels now, inherited by the fork
        from ..curves.segments import preload_compiled

        preload_compiled()
    classify_item(_warm_up_item(kind), options)


def classify_chunk(items: list, options: ClassifyOptions) -> list[dict]:
    """Rows of a chunk of items (the unit of work sent to a process or a Dask worker)."""
    from ..table import open_table

    table = open_table(options.table)
    return [row for item in items for row in classify_item(item, options, table)]
