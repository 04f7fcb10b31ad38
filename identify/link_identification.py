"""Identifying a link of several components: link fingerprint, link table, orientation class.

The path of the data: simplified diagram ->
:class:`~knotsift.invariants.link_fingerprint.LinkFingerprint` -> ``link_forms``
of the reference table -> :class:`~knotsift.result.IdentifyResult` with a
``link`` section (linking matrix, matched orientation class, split parts,
two-component sublinks, the types of the components).
"""

from __future__ import annotations

from itertools import combinations

from .diagram import Diagram
from .result import Candidate, IdentifyResult
from .table import ReferenceTable

__all__ = ["identify_link_diagram", "match_link", "link_label", "link_summary",
           "UNLINKED_CAVEAT"]

#: Two-component sublinks are listed for links of at most this many components.
MAX_SUBLINK_COMPONENTS = 8

LINK_EVIDENCE_NOTE = ("a match of invariants is evidence, not proof: different links can share "
                      "all of these invariants")
UNLINKED_CAVEAT = ("a linking number of 0 does not mean unlinked: the Whitehead link and the "
                   "Borromean rings have every linking number 0")


def match_link(fp, table: ReferenceTable) -> tuple[str, list[Candidate], dict[str, list]]:
    """Exact lookup of a link fingerprint: status, candidates, and the matched forms by name."""
    forms = table.link_forms_by_fingerprint(fp.key())
    by_name: dict[str, list] = {}
    for f in forms:
        by_name.setdefault(f.name, []).append(f)
    candidates = []
    for name, matched in by_name.items():
        row = table.link(name)
        mirrors = {f.mirrored for f in matched}
        chir = "undetermined" if len(mirrors) == 2 else ("mirror" if True in mirrors else "same")
        label = matched[0].label if len(matched) == 1 else name
        candidates.append(Candidate(
            name=name, label=label, chirality=chir,
            agrees=["jones", "linking", "alexander", "determinant", "signature", "triple",
                    "component_jones"],
            crossing_number=row["crossing_number"], kind=row["kind"],
            aliases=[a.strip() for a in row["aliases"].split(";") if a.strip()]))
    candidates.sort(key=lambda c: (c.crossing_number, c.name))
    if not candidates:
        return "not in table", [], {}
    return ("identified" if len(candidates) == 1 else "ambiguous"), candidates, by_name


def _short(candidates: list[Candidate], jones: str) -> str:
    if not candidates:
        return f"not in table (V = {jones})"
    return " or ".join(c.label for c in candidates)


def link_label(diagram: Diagram, table: ReferenceTable) -> str:
    """One line naming a link diagram's table matches (orientation and mirror marks included)."""
    from .invariants.link_fingerprint import link_fingerprint
    from .simplify import simplify

    fp = link_fingerprint(simplify(diagram), simplified=True)
    return _short(match_link(fp, table)[1], str(fp.jones))


def _knot_label(diagram: Diagram, table: ReferenceTable) -> str:
    from .identification import _short as knot_short
    from .identification import match_fingerprint
    from .invariants.fingerprint import fingerprint

    fp = fingerprint(diagram)
    if fp.jones == 1:
        found = match_fingerprint(fp, table)[1]
        return knot_short(found, "1") if found else "0_1"
    return knot_short(match_fingerprint(fp, table)[1], str(fp.jones))


def _orientation_text(form) -> str:
    parts = []
    if form.reversed:
        comps = form.reversed.split(",")
        parts.append(f"component{'s' if len(comps) > 1 else ''} {' and '.join(comps)} of the "
                     "table diagram reversed")
    else:
        parts.append("orientation of the table diagram")
    parts.append("mirror image" if form.mirrored else "as in the table")
    return f"{form.label}: " + ", ".join(parts) + f" (linking numbers {form.linking or 'none'})"


def link_summary(simple: Diagram, table: ReferenceTable, sublinks: bool = True) -> dict:
    """Linking matrix, split parts, component types and sublink types of a link diagram."""
    from .invariants.linking import linking_matrix, split_parts, sublink

    m = simple.number_of_components()
    out: dict = {"components": m, "linking_matrix": linking_matrix(simple),
                 "split_parts": split_parts(simple)}
    out["component_types"] = [_knot_label(sublink(simple, [k]), table) for k in range(m)]
    if sublinks and 3 <= m <= MAX_SUBLINK_COMPONENTS:
        out["sublinks"] = [{"components": [a, b],
                            "type": link_label(sublink(simple, [a, b]), table)}
                           for a, b in combinations(range(m), 2)]
    return out


def identify_link_diagram(diagram: Diagram, simple: Diagram, table: ReferenceTable,
                          source: str = "", notation: str = "") -> IdentifyResult:
    """Identify a diagram of two or more components against the link table.

    Parameters
    ----------
    diagram : Diagram
        The input as read.
    simple : Diagram
        Its simplification.
    """
    from .invariants.link_fingerprint import link_fingerprint
    from .invariants.milnor import triple_linking_number
    from .invariants.multivariable_alexander import (
        MAX_CROSSINGS,
        multivariable_alexander,
        polynomial_text,
    )

    fp = link_fingerprint(simple, simplified=True)
    status, candidates, matched = match_link(fp, table)
    m = fp.components
    info = link_summary(simple, table)
    lk = info["linking_matrix"]
    invariants = {"components": str(m), "jones": str(fp.jones),
                  "determinant": str(fp.determinant),
                  "signature": str(fp.signature), "linking": fp.linking}
    if simple.number_of_crossings() <= MAX_CROSSINGS:
        invariants["alexander"] = polynomial_text(multivariable_alexander(simple))
    if fp.triple is not None:
        info["triple_linking_number"] = triple_linking_number(simple)
    result = IdentifyResult(status=status, candidates=candidates, invariants=invariants,
                            source=source, notation=notation,
                            crossings_input=diagram.number_of_crossings(),
                            crossings_simplified=simple.number_of_crossings())
    notes = result.notes
    if candidates:
        forms = [f for c in candidates for f in matched[c.name]]
        info["matched_forms"] = [f.label for f in forms]
        info["orientation"] = [_orientation_text(f) for f in forms]
        if status == "ambiguous":
            notes.append("several table links share every computed invariant; these "
                         "invariants cannot decide between them")
        elif len(forms) > 1:
            notes.append("several orientation classes or mirror images of this link share "
                         "every computed invariant: " + ", ".join(f.label for f in forms))
        for c in candidates:
            row = table.link(c.name)
            info["name_confidence"] = row["name_confidence"]
            if row["name_confidence"] == "uncertain":
                notes.append(f"{c.name}: the link is the table's, but the index in its name "
                             "was recalled from memory with low confidence (see "
                             "reference/README.md, links)")
    else:
        complete = table.metadata.get("link_complete_through")
        if m > 3:
            notes.append(f"{m}-component link: the link table holds links of 2 and 3 "
                         "components (and the unlinks)")
        elif complete:
            notes.append(f"the link table lists every prime link of {m} components through "
                         f"{complete} crossings, with a few split unions and connected sums; "
                         f"this one needs more crossings, is a sum or split union not listed, "
                         "or was mistyped")
    pieces = info["split_parts"]
    zero = all(lk[a][b] == 0 for a in range(m) for b in range(a + 1, m))
    if len(pieces) > 1:
        notes.append("split: the diagram falls into separate pieces " + ", ".join(
            "{" + ", ".join(str(k + 1) for k in p) + "}" for p in pieces))
    elif fp.determinant != 0 and zero:
        notes.append(f"every linking number is 0, but the link is not split: its determinant "
                     f"is {fp.determinant} (a split link has determinant 0)")
    elif zero and fp.alexander not in ("", "0"):
        notes.append("every linking number is 0, but the link is not split: its multivariable "
                     "Alexander polynomial is not 0 (a split link's is)")
    elif zero:
        notes.append(UNLINKED_CAVEAT + "; these invariants do not settle whether this one is "
                     "split")
    if fp.triple:
        notes.append(f"Milnor's triple linking number is {info['triple_linking_number']} "
                     "(nonzero: the three components cannot be pulled apart, although each "
                     "pair has linking number 0)")
    notes.append(LINK_EVIDENCE_NOTE)
    result.link = info
    return result
