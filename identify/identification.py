"""Identifying a diagram: fingerprint, table lookup, chirality verdict and notes.

The path of the data: text -> :class:`~knotsift.diagram.Diagram` ->
simplified diagram -> :class:`~knotsift.invariants.fingerprint.Fingerprint` ->
table lookup -> :class:`~knotsift.result.IdentifyResult`.
"""

from __future__ import annotations

from collections import Counter

from .diagram import Diagram
from .errors import DiagramError, KnotsiftError
from .invariants.fingerprint import RHO_1_UP_TO, Fingerprint, fingerprint
from .result import Candidate, IdentifyResult
from .table import ReferenceTable, open_table

__all__ = ["identify", "identify_diagram", "match_fingerprint", "MAX_UNCERTAIN", "EXPECTATIONS"]

#: Uncertain crossings expand into 2^k resolutions; beyond this many it is refused.
MAX_UNCERTAIN = 12

INVARIANT_NAMES = {
    "jones": "the Jones polynomial",
    "alexander": "the Alexander polynomial",
    "determinant": "the determinant",
    "signature": "the signature",
    "rho_1": "rho_1 (the perturbed Alexander invariant)",
    "homology": "the double-cover homology",
}

EVIDENCE_NOTE = ("a match of invariants is evidence, not proof: different knots can share "
                 "all of these invariants")


def _chirality(knot: dict, matched: list) -> str:
    if knot["amphichiral"]:
        return "amphichiral"
    if len({f.is_reference for f in matched}) == 2:
        return "undetermined"
    return "same" if matched[0].is_reference else "mirror"


def match_fingerprint(fp: Fingerprint, table: ReferenceTable) -> tuple[str, list[Candidate]]:
    """Exact lookup: the status and the candidates whose whole fingerprint equals ``fp``.

    When rho_1 was left out for cost (a knot diagram above
    :data:`knotsift.invariants.fingerprint.RHO_1_UP_TO` crossings) the other
    invariants are matched; :func:`identify_diagram` then says so.
    """
    if fp.components == 1 and fp.rho_1 is None:
        texts = fp.texts()
        forms = table.by_invariants({k: texts[k] for k in INVARIANT_NAMES if k != "rho_1"}
                                    | {"components": "1"})
    else:
        forms = table.by_fingerprint(fp.key())
    by_name: dict[str, list] = {}
    for f in forms:
        by_name.setdefault(f.name, []).append(f)
    candidates = []
    for name, matched in by_name.items():
        knot = table.knot(name)
        chir = _chirality(knot, matched)
        label = matched[0].label if chir in ("same", "mirror") else name
        candidates.append(Candidate(
            name=name, label=label, chirality=chir,
            agrees=[k for k in INVARIANT_NAMES if k != "rho_1" or fp.rho_1 is not None],
            crossing_number=knot["crossing_number"], kind=knot["kind"],
            aliases=[a.strip() for a in knot["aliases"].split(";") if a.strip()]))
    candidates.sort(key=lambda c: (c.crossing_number, c.name))
    if not candidates:
        return "not in table", []
    return ("identified" if len(candidates) == 1 else "ambiguous"), candidates


def _separation(fp: Fingerprint, table: ReferenceTable, candidates: list[Candidate]
                ) -> tuple[dict, list[str]]:
    """How many table entries share each invariant with the input, and what tells them apart."""
    texts = fp.texts()
    out: dict[str, dict] = {}
    notes: list[str] = []
    matched_labels = set()
    for c in candidates:
        for f in table.forms_of(c.name):
            if f.fingerprint == fp.key():
                matched_labels.add(f.label)
    for inv in INVARIANT_NAMES:
        value = texts[inv]
        if value == "":
            continue
        sharing = table.by_invariant(inv, value)
        labels = [f.label for f in sharing]
        others = [f for f in sharing if f.label not in matched_labels]
        matched_names = {c.name for c in candidates}
        other_knots = [f for f in others if f.name not in matched_names]
        separated_by = {}
        for f in others[:25]:
            row = {"jones": f.jones, "alexander": f.alexander,
                   "determinant": str(f.determinant), "signature": str(f.signature),
                   "rho_1": f.rho_1, "homology": f.homology}
            separated_by[f.label] = [k for k in INVARIANT_NAMES
                                     if texts[k] != "" and row[k] != texts[k]]
        out[inv] = {"value": value, "count": len(sharing), "labels": labels[:25],
                    "others_separated_by": separated_by}
        if candidates and other_knots and inv in ("jones", "alexander"):
            shown = ", ".join(f.label for f in other_knots[:6]) + (
                " ..." if len(other_knots) > 6 else "")
            what = sorted({k for f in other_knots[:25] for k in separated_by[f.label]})
            by = " and ".join(INVARIANT_NAMES[k] for k in what) or "nothing computed here"
            notes.append(f"{INVARIANT_NAMES[inv]} alone cannot tell this knot from "
                         f"{shown}; {by} separate{'s' if len(what) == 1 else ''} them")
    return out, notes


def _chirality_note(fp: Fingerprint, cand: Candidate) -> str:
    asym = fp.jones != fp.jones.mirror()
    basis = []
    if asym:
        basis.append("V(t) differs from V(1/t)")
    if fp.signature != 0:
        basis.append(f"the signature is {fp.signature}, not 0")
    if fp.rho_1 is not None and not fp.rho_1.is_zero():
        basis.append("rho_1 is not 0 (a mirror image has -rho_1)")
    if cand.chirality in ("same", "mirror"):
        listed = (", ".join(basis[:-1]) + " and " + basis[-1]) if len(basis) > 1 else \
            "".join(basis) or "the computed invariants"
        return ("chirality from " + listed + "; relative to the table's "
                "reference diagram (negative signature, see README)")
    if cand.chirality == "undetermined":
        rho = ("rho_1 was not computed (diagram too large)" if fp.rho_1 is None
               else "rho_1 = 0, which leaves the question open")
        return ("this knot is chiral, but V(t) = V(1/t), the signature is 0 and " + rho +
                " here: the computed invariants cannot tell it from its mirror image")
    return "amphichiral: the knot equals its mirror image"


def _beyond_table(fp: Fingerprint, d: Diagram, table: ReferenceTable) -> list[str]:
    notes = []
    if fp.components != 1:
        notes.append(f"{fp.components}-component link: the table holds knots only")
        return notes
    span = fp.jones.span()
    bound = f"the crossing number is at least span V = {span}"
    if d.is_alternating() and d.number_of_crossings() == span:
        bound = (f"the simplified diagram is reduced and alternating, so the crossing number is "
                 f"exactly {span} (Kauffman-Murasugi-Thistlethwaite)")
    notes.append(bound)
    complete = table.metadata.get("complete_through")
    if complete:
        notes.append(f"the table lists every knot (prime and composite) through {complete} "
                     f"crossings, so this knot needs more than {complete} crossings or is "
                     "mislabelled by an input error")
    if fp.alexander is not None and fp.alexander != 1:
        from .alexander_factors import composite_hint

        hint = composite_hint(fp.alexander, table)
        if hint:
            notes.append(hint)
    return notes


def _trivial_note(fp: Fingerprint) -> str | None:
    if fp.components == 1 and fp.jones == 1:
        return ("all computed invariants equal the unknot's; no non-trivial knot with V = 1 is "
                "known, but that is not proven (and Delta = 1 alone does not rule out a knot)")
    return None


def identify_diagram(diagram: Diagram, table: ReferenceTable | None = None,
                     neighbours: bool = False, source: str = "", notation: str = ""
                     ) -> IdentifyResult:
    """Identify one diagram against the reference table."""
    from .simplify import simplify

    table = table or open_table()
    simple = simplify(diagram)
    if simple.number_of_components() >= 2:
        from .link_identification import identify_link_diagram

        return identify_link_diagram(diagram, simple, table, source, notation)
    fp = fingerprint(simple, simplified=True)
    status, candidates = match_fingerprint(fp, table)
    separation, sep_notes = _separation(fp, table, candidates)
    skipped = fp.components == 1 and fp.rho_1 is None
    result = IdentifyResult(status=status, candidates=candidates, invariants=fp.texts(),
                            separation=separation, source=source, notation=notation,
                            crossings_input=diagram.number_of_crossings(),
                            crossings_simplified=simple.number_of_crossings())
    result.diagram = diagram  # kept for result.draw() and notebooks, not in the JSON
    if candidates:
        result.notes.append(_chirality_note(fp, candidates[0]))
        if status == "ambiguous":
            result.notes.append("several table knots share every computed invariant; "
                                "these invariants cannot decide between them")
        result.notes.extend(sep_notes)
    else:
        result.notes.extend(_beyond_table(fp, simple, table))
    if skipped:
        result.notes.append(
            f"rho_1 was not computed: the simplified diagram has {simple.number_of_crossings()} "
            f"crossings, above the limit of {RHO_1_UP_TO}; the match rests on the other "
            "invariants")
    trivial = _trivial_note(fp)
    if trivial:
        result.notes.append(trivial)
    result.notes.append(EVIDENCE_NOTE)
    _unknot_basis(result)
    if neighbours:
        result.neighbours = crossing_change_neighbours(simple, table)
    return result


def _short(candidates: list[Candidate], jones: str) -> str:
    """One line naming the candidates, or the Jones polynomial when nothing matched."""
    if not candidates:
        return f"not in table (V = {jones})"
    shown = [c.label if c.chirality in ("same", "mirror") else c.name for c in candidates]
    return " or ".join(shown)


def _label(d: Diagram, table: ReferenceTable) -> str:
    """One line naming a diagram's table matches, knot or link."""
    if d.number_of_components() >= 2:
        from .link_identification import link_label

        return link_label(d, table)
    fp = fingerprint(d)
    return _short(match_fingerprint(fp, table)[1], str(fp.jones))


def crossing_change_neighbours(diagram: Diagram, table: ReferenceTable) -> list[dict]:
    """Table entries one crossing change away: what a single misread crossing could have been."""
    found: dict[str, list[int]] = {}
    for i in range(diagram.number_of_crossings()):
        found.setdefault(_label(diagram.crossing_change(i), table), []).append(i)
    return [{"result": k, "crossings": v} for k, v in sorted(found.items(), key=lambda kv: kv[1])]


def _resolutions(diagram: Diagram, uncertain: list[int], table: ReferenceTable
                 ) -> tuple[list[dict], list[Candidate]]:
    """Identify every resolution of the uncertain crossings: the distribution and candidates."""
    total = 1 << len(uncertain)
    counts: Counter[str] = Counter()
    found_by: dict[str, list[Candidate]] = {}
    for mask in range(total):
        d = diagram
        for bit, i in enumerate(uncertain):
            if mask >> bit & 1:
                d = d.crossing_change(i)
        if d.number_of_components() >= 2:
            from .invariants.link_fingerprint import link_fingerprint
            from .link_identification import match_link

            lfp = link_fingerprint(d)
            found = match_link(lfp, table)[1]
            key = " or ".join(c.label for c in found) if found else \
                f"not in table (V = {lfp.jones})"
        else:
            fp = fingerprint(d)
            status, found = match_fingerprint(fp, table)
            key = _short(found, str(fp.jones))
        counts[key] += 1
        found_by.setdefault(key, found)
    ranked = counts.most_common()
    return ([{"result": k, "count": v, "total": total, "fraction": v / total}
             for k, v in ranked], [c for k, _ in ranked for c in found_by[k]])


#: What ``identify(..., expect=...)`` may require of the input.
EXPECTATIONS = ("knot", "link")


def _check_expected(diagram: Diagram, expect: str | None, notation: str) -> None:
    if expect is None:
        return
    if expect not in EXPECTATIONS:
        raise ValueError(f"expect must be one of {EXPECTATIONS} or None, got {expect!r}")
    m = diagram.number_of_components()
    what = f"the {notation} input" if notation else "the input"
    if expect == "knot" and m != 1:
        raise DiagramError(f"a knot (one component) is required here, but {what} describes a "
                           f"{m}-component link ({diagram.number_of_crossings()} crossings); "
                           "leave out the knot requirement to identify it as a link",
                           value=m)
    if expect == "link" and m < 2:
        raise DiagramError(f"a link of two or more components is required here, but {what} "
                           f"describes a knot (one component, {diagram.number_of_crossings()} "
                           "crossings); leave out the link requirement to identify it as a knot",
                           value=m)


def identify(source, notation: str | None = None, *, table: ReferenceTable | None = None,
             neighbours: bool = False, label: str = "", expect: str | None = None
             ) -> IdentifyResult:
    """Identify a knot given as a diagram or as text in one of the notations.

    Parameters
    ----------
    source : Diagram or str
        A diagram, or a code in any notation (auto-detected, see
        :func:`knotsift.notations.detect.detect_notation`).
    notation : str, optional
        Read the text in this notation instead of detecting it.
    table : ReferenceTable, optional
        Defaults to the shipped table.
    neighbours : bool
        Also list the table knots one crossing change away.
    label : str
        A name for the input in reports (file and line, frame).
    expect : {None, "knot", "link"}
        Require one component, or at least two; otherwise a DiagramError
        says what the input is.  Inputs of several components are
        identified against the link table either way.

    Returns
    -------
    IdentifyResult
        ``status`` is identified / ambiguous / not in table; crossings marked
        uncertain are expanded into every resolution (``resolutions``).

    Raises
    ------
    KnotsiftError
        For malformed input (NotationError, DiagramError) or a missing table.

    Examples
    --------
    >>> identify("DT: 4 6 8 2").name
    '4_1'
    """
    table = table or open_table()
    if isinstance(source, Diagram):
        _check_expected(source, expect, "")
        return identify_diagram(source, table, neighbours, label, "diagram")
    from .notations.detect import detect_notation, parse_any_with_uncertain, reading_of

    from .limits import check_at_most, check_text

    check_text(source, "the code")
    used = notation or detect_notation(source)
    flipped = _dt_drawings_result(source, used, table, neighbours, label)
    if flipped is not None:
        flipped.notation_how, unsure = reading_of(source, notation, used)
        if unsure:
            flipped.notes.insert(0, unsure)
        return flipped
    diagram, uncertain = parse_any_with_uncertain(source, used)
    _check_expected(diagram, expect, used)
    n = diagram.number_of_crossings()
    check_at_most("crossings", n, f"the number of crossings of the {used} code")
    if len(uncertain) > MAX_UNCERTAIN:
        raise DiagramError(f"at most {MAX_UNCERTAIN} crossings may be marked uncertain "
                           f"(2^{MAX_UNCERTAIN} resolutions), got {len(uncertain)}",
                           value=len(uncertain))
    if uncertain:
        check_at_most("uncertain_work", (1 << min(len(uncertain), 62)) * max(n, 1),
                      f"2^{len(uncertain)} resolutions x {n} crossings")
    result = identify_diagram(diagram, table, neighbours, label, used)
    result.notation_how, unsure = reading_of(source, notation, used)
    if unsure:
        result.notes.insert(0, unsure)
    if used == "conway":
        from .two_bridge import settle_two_bridge

        settle_two_bridge(result, source, table)
    if uncertain:
        as_drawn = _short(result.candidates, result.invariants["jones"])
        result.resolutions, resolved = _resolutions(diagram, uncertain, table)
        seen = [r["result"] for r in result.resolutions]
        if len(seen) > 1:
            result.status = "ambiguous"
            result.candidates = resolved
            result.notes.insert(0, f"{len(uncertain)} uncertain crossing(s) (PD positions "
                                   f"{', '.join(map(str, uncertain))}, from 0): the resolutions "
                                   f"give {len(seen)} different results; the knot as drawn is "
                                   f"{as_drawn}")
        else:
            result.notes.insert(0, f"all {1 << len(uncertain)} resolutions of the uncertain "
                                   "crossings give the same result")
    return result


def _dt_drawings_result(source: str, used: str, table: ReferenceTable, neighbours: bool,
                        label: str) -> IdentifyResult | None:
    """For a DT code whose shadow has pieces that may flip: every drawing identified, else None."""
    if used != "dt":
        return None
    from .flips import identify_drawings
    from .notations.dt import dt_drawings

    drawings, pieces = dt_drawings(source)
    if len(drawings) == 1:
        return None
    result = identify_drawings(drawings, pieces, table,
                               lambda d: identify_diagram(d, table, neighbours, label, used))
    result.resolved_over = "the drawings of the code"
    return result


def _unknot_basis(result: IdentifyResult) -> None:
    """Say whether an unknot verdict is a proof (trivial diagram) or evidence (invariants)."""
    if result.status != "identified" or result.candidates[0].name != "0_1":
        return
    c = result.candidates[0]
    if result.crossings_simplified == 0:
        c.basis = "trivial diagram"
        result.notes = [n for n in result.notes if not n.startswith("all computed invariants")
                        and n != EVIDENCE_NOTE]
        result.notes.insert(0, "proof: the diagram simplifies to the trivial diagram (no "
                               "crossings) by Reidemeister moves, so it is the unknot")
    else:
        c.basis = "invariants"
        result.notes.insert(0, f"evidence only: the diagram kept {result.crossings_simplified} "
                               "crossings after simplification, and its invariants equal the "
                               "unknot's; no proof that it is the unknot")


def safe_identify(source, notation=None, **kw) -> IdentifyResult:
    """Like :func:`identify`, but bad input becomes a result with status "error"."""
    try:
        return identify(source, notation, **kw)
    except KnotsiftError as exc:
        return IdentifyResult(status="error", error=str(exc), source=kw.get("label", ""))
