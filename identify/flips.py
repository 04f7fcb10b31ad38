"""Codes that fix a diagram only up to flipping pieces: identify every drawing and compare.

A DT code whose shadow two edges cut into pieces of three or more crossings
leaves each piece free to be drawn either way round (which mirrors that
piece).  Instead of refusing such a code, every drawing is identified, as
for uncertain crossings, and the result says whether they agree.
"""

from __future__ import annotations

from collections import Counter

from .diagram import Diagram
from .result import IdentifyResult
from .table import ReferenceTable

__all__ = ["identify_drawings"]


def _shown(r: IdentifyResult) -> str:
    if not r.candidates:
        return f"not in table (V = {r.invariants.get('jones', '')})"
    return " or ".join(c.label if c.chirality in ("same", "mirror") else c.name
                       for c in r.candidates)


def identify_drawings(drawings: list[Diagram], pieces: list[int], table: ReferenceTable,
                      identify_one, what: str = "DT code") -> IdentifyResult:
    """Identify each drawing of a code and merge: agreement, agreement up to mirror, or not.

    Parameters
    ----------
    drawings : list of Diagram
        Every way the code may be drawn (first: the planar embedding found).
    pieces : list of int
        Crossings of each piece that may flip.
    identify_one : callable
        ``Diagram -> IdentifyResult`` (the caller's identification).

    Returns
    -------
    IdentifyResult
        The first drawing's result when all agree; with chirality
        "undetermined" when they agree only up to mirror image; otherwise
        "ambiguous" with the distribution in ``resolutions``.
    """
    results = [identify_one(d) for d in drawings]
    first = results[0]
    sizes = " and ".join(map(str, pieces))
    n = len(drawings)
    cut = (f"the {what}'s shadow has {len(pieces)} piece{'s' if len(pieces) > 1 else ''} "
           f"(of {sizes} crossings) cut off by two edges, each of which may be drawn either "
           f"way round (mirroring it); all {n} drawings were identified")
    keys = [_shown(r) for r in results]
    if len(set(keys)) == 1:
        first.notes.insert(0, f"{cut} and agree, so the code determines the knot")
        return first
    bare = {tuple(c.name for c in r.candidates) for r in results}  # table names: mirror-blind
    if len(bare) == 1 and all(r.status == "identified" for r in results):
        for c in first.candidates:
            c.chirality, c.label = "undetermined", c.name
        first.notes = [n for n in first.notes if not n.startswith("chirality from")]
        first.notes.insert(0, f"{cut}; they give {' and '.join(sorted(set(keys)))}, so the code "
                              "determines the knot only up to mirror image; give a PD code or "
                              "a signed Gauss code to fix its chirality")
        return first
    counts = Counter(keys)
    first.status = "ambiguous"
    first.resolutions = [{"result": k, "count": v, "total": n, "fraction": v / n}
                         for k, v in counts.most_common()]
    seen, merged = set(), []
    for r in results:
        for c in r.candidates:
            if c.label not in seen:
                seen.add(c.label)
                merged.append(c)
    first.candidates = merged
    first.notes.insert(0, f"{cut}; they give {len(counts)} different results, so the code "
                          "may not determine the knot; give a PD code or a signed Gauss code")
    return first
