"""The rings of one frame identified as one link: type, split parts, two-ring sublinks.

Input is the joint projection of all rings of a frame (the diagram whose
crossings also give the linking numbers) with the index of each ring's
component in it.
"""

from __future__ import annotations

from itertools import combinations

from ..diagram import Diagram

__all__ = ["frame_link", "MAX_WHOLE_RINGS", "MAX_WHOLE_CROSSINGS"]

#: Frames with more rings than this get their two-ring sublinks only.
MAX_WHOLE_RINGS = 6
#: Nor is the whole link identified above this many crossings after simplification.
MAX_WHOLE_CROSSINGS = 60


def _raw_indices(diagram: Diagram, ring_components: list[int | None]) -> list[int]:
    """Each ring's component index in ``diagram`` (rings without crossings are its free loops)."""
    n = len(diagram.components())
    out, extra = [], 0
    for c in ring_components:
        if c is None:
            out.append(n + extra)
            extra += 1
        else:
            out.append(c)
    return out


def _reduced(diagram: Diagram) -> Diagram:
    """Nugatory crossings and Reidemeister II bigons removed, keeping the original edge labels
    (a surviving label still names its ring; :func:`knotsift.simplify.simplify` renumbers)."""
    from ..simplify import remove_bigon, remove_nugatory

    current = diagram
    while True:
        nxt = remove_nugatory(current)
        if nxt is None:
            nxt = remove_bigon(current)
        if nxt is None:
            return current
        current = nxt


def _simplified_indices(diagram: Diagram, simple: Diagram, raw: list[int]) -> list[int]:
    """Each ring's component index in the reduced diagram (its labels are original ones)."""
    raw_of = diagram.component_of_label()
    ring_of_raw = {r: k for k, r in enumerate(raw)}
    out: list[int | None] = [None] * len(raw)
    for label, sc in simple.component_of_label().items():
        out[ring_of_raw[raw_of[label]]] = sc
    n = len(simple.components())
    extra = 0
    for k, v in enumerate(out):
        if v is None:
            out[k] = n + extra
            extra += 1
    return out  # type: ignore[return-value]


def frame_link(diagram: Diagram, ring_components: list[int | None], ids: list[str], table,
               source: str = "") -> dict:
    """The link formed by the rings of a frame.

    Parameters
    ----------
    diagram : Diagram
        Joint projection of the rings.
    ring_components : list of int or None
        For each ring, its component among ``diagram.components()`` (None: no crossings).
    ids : list of str
        Ring (chain) ids, in the same order.

    Returns
    -------
    dict
        ``status``, ``type`` (matched label(s) or "not in table (V = ...)"),
        ``candidates``, ``invariants``, ``rings``, ``split_parts`` (ring ids
        of each part that falls apart in the projection once nugatory
        crossings and Reidemeister II bigons are removed), ``sublinks`` (each pair of rings:
        the type of the two-ring link), ``triple_linking_number``, ``notes``.
    """
    from ..identification import _label
    from ..invariants.linking import split_parts, sublink
    from ..link_identification import identify_link_diagram
    from ..simplify import simplify

    raw = _raw_indices(diagram, ring_components)
    out: dict = {"rings": list(ids), "status": None, "type": None, "candidates": [],
                 "invariants": {}, "notes": []}
    reduced = _reduced(diagram)
    smap = _simplified_indices(diagram, reduced, raw)
    by_simple = {s: ids[k] for k, s in enumerate(smap)}
    out["split_parts"] = [[by_simple[s] for s in part] for part in split_parts(reduced)]
    simple = simplify(reduced)
    crossing_pairs = set()
    comp = diagram.component_of_label()
    for x in diagram.crossings:
        a, b = comp[x[0]], comp[x[1]]
        if a != b:
            crossing_pairs.add((min(a, b), max(a, b)))
    sublinks = []
    for a, b in combinations(range(len(ids)), 2):
        ra, rb = raw[a], raw[b]
        if (min(ra, rb), max(ra, rb)) in crossing_pairs:
            kind = _label(sublink(diagram, [ra, rb]), table)
        else:
            kind = "0^2_1 (apart in the projection)"
        sublinks.append({"rings": [ids[a], ids[b]], "type": kind})
    out["sublinks"] = sublinks
    if len(ids) > MAX_WHOLE_RINGS or simple.number_of_crossings() > MAX_WHOLE_CROSSINGS:
        out["status"] = "not computed"
        out["notes"].append(f"the whole link of {len(ids)} rings ({simple.number_of_crossings()} "
                            f"crossings) is not identified above {MAX_WHOLE_RINGS} rings or "
                            f"{MAX_WHOLE_CROSSINGS} crossings; the two-ring sublinks are")
        return out
    res = identify_link_diagram(diagram, simple, table, source=source,
                                notation="3D coordinates")
    out["status"] = res.status
    out["candidates"] = [c.to_dict() for c in res.candidates]
    out["type"] = (" or ".join(c.label for c in res.candidates) if res.candidates
                   else f"not in table (V = {res.invariants['jones']})")
    out["invariants"] = dict(res.invariants)
    info = res.link or {}
    if info.get("triple_linking_number") is not None:
        out["triple_linking_number"] = info["triple_linking_number"]
    if "orientation" in info:
        out["orientation"] = info["orientation"]
    if info.get("name_confidence"):
        out["name_confidence"] = info["name_confidence"]
    notes = [n for n in res.notes if not n.startswith("split: the diagram falls")]
    if len(out["split_parts"]) > 1:
        notes.insert(0, "split: the rings fall into separate parts " + ", ".join(
            "{" + ", ".join(p) + "}" for p in out["split_parts"]))
    out["notes"] = notes
    return out
