"""Identifying a diagram: fingerprint, table lookup, chirality verdict and notes.

The path of the data: text -> :class:`~knotsift.diagram.Diagram` ->
simplified diagram -> :class:`~knotsift.invariants.fingerprint.Fingerprint` ->
table lookup -> :class:`~knotsift.result.IdentifyResult`.
"""

from __future__ import annotations

import copy
import weakref
from collections import Counter
from itertools import islice

from .diagram import Diagram
from .errors import DiagramError, KnotsiftError
from .invariants.fingerprint import RHO_1_UP_TO, Fingerprint, fingerprint
from .memo import memo_for, recall
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


def _candidates_of(forms, table: ReferenceTable, agrees: list[str]
                   ) -> tuple[str, list[Candidate]]:
    """The status and one candidate per knot among the matched table forms."""
    by_name: dict[str, list] = {}
    for f in forms:
        by_name.setdefault(f.name, []).append(f)
    candidates = []
    for name, matched in by_name.items():
        knot = table.knot(name)
        chir = _chirality(knot, matched)
        label = matched[0].label if chir in ("same", "mirror") else name
        candidates.append(Candidate(
            name=name, label=label, chirality=chir, agrees=list(agrees),
            crossing_number=knot["crossing_number"], kind=knot["kind"],
            aliases=[a.strip() for a in knot["aliases"].split(";") if a.strip()]))
    candidates.sort(key=lambda c: (c.crossing_number, c.name))
    if not candidates:
        return "not in table", []
    return ("identified" if len(candidates) == 1 else "ambiguous"), candidates


def match_fingerprint(fp: Fingerprint, table: ReferenceTable) -> tuple[str, list[Candidate]]:
    """Exact lookup on every invariant that was computed: the status and the candidates.

    With every invariant at hand this is the whole fingerprint key.  When the
    Jones polynomial was skipped for cost (see :mod:`knotsift.budget`) or rho_1
    was left out (a knot diagram above :data:`RHO_1_UP_TO` crossings), the
    table forms are those agreeing with each invariant that was computed, and
    the candidates' ``agrees`` lists exactly those; the notes say what is missing.
    """
    texts = fp.texts()
    computed = [k for k in INVARIANT_NAMES if texts.get(k, "") != ""]
    if fp.components != 1 or len(computed) == len(INVARIANT_NAMES):
        return _candidates_of(table.by_fingerprint(fp.key()), table, list(INVARIANT_NAMES))
    forms = [f for f in table.by_invariants({k: texts[k] for k in computed})
             if f.components == 1]
    return _candidates_of(forms, table, computed)


#: Separation answers remembered per table (least recently used dropped first).
SEPARATION_MEMO_SIZE = 4096

_separation_memo: "weakref.WeakKeyDictionary" = \
    weakref.WeakKeyDictionary()


def _separation(fp: Fingerprint, table: ReferenceTable, candidates: list[Candidate]
                ) -> tuple[dict, list[str]]:
    """How many table entries share each invariant with the input, and what tells them apart.

    A function of the invariants' texts and the candidates' names, remembered
    per table for the last :data:`SEPARATION_MEMO_SIZE` of them (each call gets
    its own copy).
    """
    texts = fp.texts()
    key = (tuple(texts.items()), tuple(c.name for c in candidates))
    out, notes = recall(memo_for(_separation_memo, table), key, SEPARATION_MEMO_SIZE,
                        lambda: _separation_of(texts, table, candidates, fp.key()))
    return ({inv: {"value": row["value"], "count": row["count"], "labels": list(row["labels"]),
                   "others_separated_by": {k: list(v) for k, v in
                                           row["others_separated_by"].items()}}
             for inv, row in out.items()}, list(notes))


def _separation_of(texts: dict[str, str], table: ReferenceTable,
                   candidates: list[Candidate], key: str) -> tuple[dict, list[str]]:
    out: dict[str, dict] = {}
    notes: list[str] = []
    matched_labels = set()
    for c in candidates:
        for f in table.forms_of(c.name):
            if f.fingerprint == key:
                matched_labels.add(f.label)
    matched_names = {c.name for c in candidates}
    for inv in INVARIANT_NAMES:
        value = texts[inv]
        if value == "":
            continue
        sharing = table.by_invariant(inv, value)
        others = list(islice((f for f in sharing if f.label not in matched_labels), 25))
        separated_by = {f.label: _differing(f, texts) for f in others}
        out[inv] = {"value": value, "count": len(sharing),
                    "labels": [f.label for f in sharing[:25]],
                    "others_separated_by": separated_by}
        if candidates and inv in ("jones", "alexander"):
            other_knots = [f for f in sharing
                           if f.label not in matched_labels and f.name not in matched_names]
            if not other_knots:
                continue
            shown = ", ".join(f.label for f in other_knots[:6]) + (
                " ..." if len(other_knots) > 6 else "")
            what = sorted({k for f in other_knots[:25] for k in _differing(f, texts)})
            by = " and ".join(INVARIANT_NAMES[k] for k in what) or "nothing computed here"
            notes.append(f"{INVARIANT_NAMES[inv]} alone cannot tell this knot from "
                         f"{shown}; {by} separate{'s' if len(what) == 1 else ''} them")
    return out, notes


def _differing(form, texts: dict[str, str]) -> list[str]:
    """The computed invariants (non-empty ``texts``) whose value ``form`` does not share."""
    row = {"jones": form.jones, "alexander": form.alexander,
           "determinant": str(form.determinant), "signature": str(form.signature),
           "rho_1": form.rho_1, "homology": form.homology}
    return [k for k in INVARIANT_NAMES if texts[k] != "" and row[k] != texts[k]]


def _chirality_note(fp: Fingerprint, cand: Candidate) -> str:
    if cand.chirality == "per factor":
        return ("each factor's chirality is relative to the table's reference diagram of that "
                "knot (negative signature, see README)")
    basis = []
    if fp.jones is not None and fp.jones != fp.jones.mirror():
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
        which = ("V(t) = V(1/t) and the signature is 0" if fp.jones is not None
                 else "the signature is 0 and the Jones polynomial was not computed")
        rho = ("rho_1 was not computed (diagram too large)" if fp.rho_1 is None
               else "rho_1 = 0, which leaves the question open")
        return (f"this knot is chiral, but {which} and {rho} here: the computed invariants "
                "cannot tell it from its mirror image")
    return "amphichiral: the knot equals its mirror image"


def _sum_chirality(factors) -> str:
    """undetermined, amphichiral (the sum equals its mirror image) or per factor."""
    if any(f.chirality == "undetermined" for f in factors):
        return "undetermined"
    flip = {"same": "mirror", "mirror": "same"}
    mirrored = sorted((f.name, flip.get(f.chirality, f.chirality)) for f in factors)
    if mirrored == sorted((f.name, f.chirality) for f in factors):
        return "amphichiral"
    return "per factor"


def _composite_candidates(search) -> list[Candidate]:
    out = []
    for fz in search.solutions:
        if len(fz.factors) < 2:  # a single prime would have matched the table
            continue
        chir = _sum_chirality(fz.factors)
        out.append(Candidate(
            name=fz.name, label=fz.label, chirality=chir, agrees=list(search.used),
            crossing_number=fz.crossing_sum, kind="composite",
            factors=[f.to_dict() for f in fz.factors]))
    return out


def _grouping_note(fp: Fingerprint, table: ReferenceTable, named: bool) -> str | None:
    """Delta as products of table knots' Alexander polynomials, every grouping listed."""
    from .factorisation import alexander_groupings

    groups, complete = alexander_groupings(table, fp.alexander, limit=12)
    groups = [g for g in groups if len(g) > 1 or named]
    if not groups:
        return None
    shown = "; ".join("·".join(f"Δ({k})" for k in g) for g in groups)
    more = " (the first 12)" if not complete else ""
    text = (f"the Alexander polynomial is a product of table knots' Alexander polynomials in "
            f"{len(groups)} way{'s' if len(groups) > 1 else ''}{more}: {shown}")
    identities = []
    for a in groups:
        for b in groups:
            ca, cb = Counter(a), Counter(b)
            left, right = ca - cb, cb - ca
            if sum(right.values()) == 1 and sum(left.values()) >= 2:
                eq = ("·".join(f"Δ({k})" for k in sorted(left.elements())) + " = " +
                      f"Δ({next(iter(right))})")
                if eq not in identities:
                    identities.append(eq)
    if identities:
        text += " (" + "; ".join(identities[:6]) + ("; ..." if len(identities) > 6 else "") + ")"
    return text


def _bounds(fp: Fingerprint, simple: Diagram, table: ReferenceTable,
            candidates: list[Candidate], in_table: bool) -> tuple[list, str | None]:
    """[lower, upper] for the crossing number, and the one note giving the best bound."""
    upper = simple.number_of_crossings()
    if in_table and candidates:
        cs = [c.crossing_number for c in candidates]
        return [min(cs), min(max(cs), upper)], None
    if fp.components != 1:
        return [None, upper], None
    reasons = []
    if fp.alexander is not None:
        span = int(fp.alexander.span())
        reasons.append((span, f"span of Δ = {span}, at most twice the genus, which Seifert's "
                              "algorithm bounds by the crossings (common practice)"))
    if fp.jones is not None:
        span = int(fp.jones.span())
        if simple.is_alternating() and simple.number_of_crossings() == span and span > 0:
            return [span, span], (
                f"crossing number exactly {span}: the simplified diagram is reduced and "
                "alternating (Kauffman-Murasugi-Thistlethwaite)")
        reasons.append((span, f"span of V = {span} (Kauffman-Murasugi-Thistlethwaite)"))
    complete = table.metadata.get("complete_through")
    if complete and not in_table:
        c = int(complete) + 1
        reasons.append((c, f"the table lists every knot, prime and composite, through "
                           f"{complete} crossings and none has these invariants"))
    best, why = max(reasons, key=lambda r: r[0]) if reasons else (0, "")
    if best == 0:
        return [None, upper], None
    if best == upper:
        note = (f"crossing number exactly {best}: at least {best} ({why}), and the simplified "
                "diagram has that many crossings")
    else:
        note = (f"crossing number at least {best} ({why}) and at most {upper} (the "
                "simplified diagram)")
    if candidates and all(c.kind == "composite" for c in candidates):
        sums = sorted({c.crossing_number for c in candidates})
        note += ("; if it is the connected sum named, at most " +
                 " or ".join(map(str, sums)) + " (the factors' crossing numbers added)")
    if best > upper:  # only a mislabelled input can get here
        note += "; the two bounds disagree: check the input"
    return [best, upper], note


def _primality(candidates: list[Candidate], fp: Fingerprint, partial_named: bool) -> str:
    if fp.components != 1:
        return "unknown"
    kinds = {c.kind for c in candidates}
    if candidates and len(kinds) == 1 and next(iter(kinds)) in ("unknot", "prime",
                                                                  "composite"):
        return next(iter(kinds))
    if not candidates and partial_named:
        return "composite"
    return "unknown"


def _partial_factors(search) -> tuple[list | None, dict | None, str | None]:
    """Named factors and the unnamed remainder, when nothing factors completely."""
    from .type_key import type_key

    if not search.partial:
        return None, None, None
    if len(search.partial) == 1:
        fz, rem = search.partial[0]
        texts = {"components": "1", "alexander": str(rem["alexander"]),
                 "determinant": str(rem["determinant"]),
                 "signature": "" if rem["signature"] is None else str(rem["signature"]),
                 "jones": "" if rem["jones"] is None else str(rem["jones"])}
        remainder = {"invariants": texts, "type_key": type_key(texts)}
        note = (f"the invariants are divisible by those of {fz.label}: consistent with "
                f"{fz.label}#K, where K (type key {remainder['type_key']}) is beyond the "
                "table; consistent evidence, not proof")
        return [f.to_dict() for f in fz.factors], remainder, note
    shown = ", ".join(fz.label for fz, _ in search.partial[:6])
    return None, None, (f"the invariants are divisible by those of several sets of table knots "
                        f"({shown}{' ...' if len(search.partial) > 6 else ''}); none accounts "
                        "for all of them")


FACTOR_NOTE = ("a connected sum found from the invariants is consistent evidence, not proof: "
               "a prime knot beyond the table may share these invariants (the diagram was not "
               "seen to split)")

TYPE_KEY_NOTE = ("the type key is formed from the Alexander polynomial, the determinant, "
                 "the signature and the hash of rho_1: the same knot always gets the same key, "
                 "but equal keys are evidence, not proof, of the same knot")


def _is_unit(p) -> bool:
    terms = p.terms()
    return len(terms) == 1 and abs(terms[0][1]) == 1


def _cost_dict(staged) -> dict:
    out = {"jones": staged.jones}
    if staged.cost is not None:
        out.update(contraction_width=staged.cost.width, estimated_bytes=staged.cost.memory,
                   estimated_seconds=round(staged.cost.seconds, 6))
    return out


def connected_sum_parts(simple: Diagram) -> list[Diagram]:
    """The prime parts of a diagram split along decomposing circles, or [] when none is seen.

    Uses ``knotsift.decomposition.connected_sum_factors`` when that module is
    installed; without it no split is seen and connected sums are found from
    the invariants alone.
    """
    try:
        from .decomposition import connected_sum_factors
    except ImportError:
        return []
    parts = connected_sum_factors(simple)
    return parts if len(parts) >= 2 else []


#: Parts of split diagrams remembered per table (least recently used dropped first).
PART_MEMO_SIZE = 4096
#: Staged invariants of simplified diagrams remembered per table (the same).
STAGED_MEMO_SIZE = 4096

_staged_memo: "weakref.WeakKeyDictionary" = \
    weakref.WeakKeyDictionary()


def _budget_key() -> tuple:
    """The settings of the current budget that decide which invariants are computed."""
    from .budget import current_budget

    b = current_budget()
    return (b.jones, b.jones_memory, b.jones_seconds, b.jones_always)


def _copy_staged(source, target):
    target.values = dict(source.values)
    target.jones, target.cost, target.note, target.no_sum = \
        source.jones, copy.copy(source.cost), source.note, source.no_sum
    return target


def _staged_invariants(simple: Diagram, table: ReferenceTable, staged):
    """``staged_invariants(simple, table, staged=staged)``, remembered per table.

    The invariants of a simplified diagram and what was skipped are a function
    of its PD code, the table and the budget's Jones settings; the last
    :data:`STAGED_MEMO_SIZE` are kept (small diagrams, trefoils above all,
    recur across the frames of a run).  Computations cut short by the wall-time
    budget raise and are not kept; ``staged`` then holds what was computed.
    """
    from .budget import Staged, staged_invariants

    computed = []

    def compute():
        staged_invariants(simple, table, staged=staged)
        computed.append(True)
        return _copy_staged(staged, Staged())

    found = recall(memo_for(_staged_memo, table), (simple.crossings, simple.free_loops)
                   + _budget_key(), STAGED_MEMO_SIZE, compute)
    return staged if computed else _copy_staged(found, staged)


_part_memo: "weakref.WeakKeyDictionary" = weakref.WeakKeyDictionary()


def _part_factors(part: Diagram, table: ReferenceTable) -> list[dict] | None:
    """The table factors of one part of a split diagram ([] for the unknot), or None.

    None when the part is not identified, or is a composite named by the table
    itself (left to the invariants).  Exactly what :func:`identify_diagram`
    says of the part, reached by the shortest path: when the part's whole
    fingerprint is in the table the rest of the result (separation, notes,
    bounds) is not built.  Answers are remembered per table (a bounded memo
    keyed by the PD code and the budget's Jones settings; parts recur across
    the frames of a run), except those cut short by the wall-time budget.
    """
    from .budget import TooComplex

    try:
        found = recall(memo_for(_part_memo, table), (part.crossings, part.free_loops)
                       + _budget_key(), PART_MEMO_SIZE, lambda: _part_answer(part, table))
    except TooComplex:
        return None
    return None if found is None else [dict(f) for f in found]


def _part_answer(part: Diagram, table: ReferenceTable) -> list[dict] | None:
    """What :func:`_part_factors` remembers (raises TooComplex past the wall time)."""
    from .budget import Staged, item_budget

    with item_budget():
        # parts come simplified (connected_sum_factors tidies each), and simplify is
        # idempotent (tests/test_identification.py checks it), so not again here
        simple = part
        status, candidates = "", []
        if simple.number_of_components() == 1:
            staged = _staged_invariants(simple, table, Staged())
            status, candidates = match_fingerprint(staged.fingerprint(), table)
        if not candidates:  # the long way: connected sums, links
            r = identify_diagram(part, table, simplified=simple,
                                 staged=staged if status else None)
            status, candidates = r.status, r.candidates
    if status != "identified":
        return None
    c = candidates[0]
    if c.factors:
        return [dict(f) for f in c.factors]
    if c.kind == "prime":
        return [{"name": c.name, "label": c.label, "chirality": c.chirality}]
    if c.kind == "unknot":
        return []
    return None


def _split_parts(simple: Diagram, table: ReferenceTable):
    """(candidate, note) when the diagram splits and every part is identified, else None."""
    parts = connected_sum_parts(simple)
    if not parts:
        return None
    factors = []
    for part in parts:
        found = _part_factors(part, table)
        if found is None:
            return None
        factors.extend(found)
    if len(factors) < 2:
        return None
    from .factorisation import Factor, Factorisation

    fz = Factorisation(tuple(sorted(
        (Factor(f["name"], f["label"], f["chirality"],
                table.knot(f["name"])["crossing_number"], False) for f in factors),
        key=lambda f: (f.crossing_number, f.name, f.chirality == "mirror"))))
    label = fz.label
    # each part was matched on its own; the whole's invariants are not compared here
    cand = Candidate(name=fz.name, label=label, chirality=_sum_chirality(fz.factors),
                     agrees=[], crossing_number=fz.crossing_sum, kind="composite",
                     factors=[f.to_dict() for f in fz.factors])
    note = (f"the diagram splits along decomposing circles into {len(parts)} parts, each "
            f"identified on its own: {label}")
    return cand, note


def _finish_result(result: IdentifyResult, staged, simple: Diagram,
                   table: ReferenceTable) -> IdentifyResult:
    """Everything after the invariants: lookup, connected sums, key, bounds, notes."""
    from .type_key import type_key

    fp = staged.fingerprint()
    result.invariants = fp.texts()
    result.type_key = type_key(result.invariants)
    result.cost = _cost_dict(staged)
    status, candidates = match_fingerprint(fp, table)
    in_table = bool(candidates)
    partial_named = False
    search = None
    split = None if in_table or fp.components != 1 else _split_parts(simple, table)
    if split is not None:
        status, candidates = "identified", [split[0]]
        result.factors, result.decomposition = split[0].factors, "diagram"
        result.notes.append(split[1])
    elif not in_table and fp.components == 1 and fp.jones is None and staged.no_sum:
        from .factorisation import FactorSearch

        search = FactorSearch(used=["alexander", "determinant", "signature"])  # known empty
    elif not in_table and fp.components == 1:
        from .factorisation import factorisations

        search = factorisations(table, fp.alexander, fp.determinant, fp.signature, fp.jones,
                                partial=fp.jones is not None)
        candidates = _composite_candidates(search)
        if not search.complete:
            result.notes.append("the search for connected sums of table knots stopped at its "
                                "step limit: the sums listed may not be all")
        if candidates:
            status = "identified" if len(candidates) == 1 else "ambiguous"
            result.decomposition = "invariants"
            if len(candidates) == 1:
                result.factors = candidates[0].factors
    result.status, result.candidates = status, candidates
    result.separation, sep_notes = _separation(fp, table, candidates if in_table else [])
    if staged.note:
        result.notes.append(staged.note)
    if fp.components == 1 and fp.rho_1 is None:
        result.notes.append(
            f"rho_1 was not computed: the simplified diagram has {simple.number_of_crossings()} "
            f"crossings, above the limit of {RHO_1_UP_TO}; only its hash at two points modulo "
            "primes was, and the match rests on the other invariants")
    if candidates:
        result.notes.append(_chirality_note(fp, candidates[0]))
        if status == "ambiguous":
            result.notes.append("several knots share every computed invariant; these "
                                "invariants cannot decide between them")
        if not in_table and split is None:
            result.notes.append(FACTOR_NOTE)
        result.notes.extend(sep_notes)
    elif fp.components != 1:
        result.notes.append(f"{fp.components}-component link: the table holds knots only")
    elif search is not None:
        factors, remainder, note = _partial_factors(search)
        if factors:
            result.factors, result.remainder = factors, remainder
            result.decomposition = "invariants"
            partial_named = True
        if note:
            result.notes.append(note)
    if not in_table and fp.components == 1 and not _is_unit(fp.alexander):
        note = _grouping_note(fp, table, named=bool(candidates))
        if note:
            if not candidates:
                note += ("; no choice of these knots and chiralities matches every computed "
                         "invariant, so the knot is not a connected sum of table knots alone "
                         "(these invariants are multiplicative)")
            result.notes.append(note)
    result.crossing_bounds, bound_note = _bounds(fp, simple, table, candidates, in_table)
    if bound_note:
        result.notes.append(bound_note)
    result.primality = _primality(candidates, fp, partial_named)
    trivial = _trivial_note(fp)
    if trivial:
        result.notes.append(trivial)
    if result.type_key and not in_table:
        result.notes.append(TYPE_KEY_NOTE)
    result.notes.append(EVIDENCE_NOTE)
    return result


def _too_complex(result: IdentifyResult, staged, exc: KnotsiftError) -> IdentifyResult:
    """The result of an item whose wall time ran out: what was computed, and why it stopped."""
    from .type_key import type_key

    v = staged.values
    if "signature" in v and "homology" in v:  # every cheap invariant was computed
        texts = staged.fingerprint().texts()
    else:
        texts = {k: "" if v.get(k) is None else str(v[k])
                 for k in ("components", "jones", "alexander", "determinant", "signature")}
    result.status = "too complex"
    result.error = exc.message
    result.invariants = texts
    result.type_key = type_key(texts)
    result.cost = _cost_dict(staged)
    result.primality = "unknown"
    done = [k for k in ("alexander", "determinant", "signature", "jones") if texts[k]]
    result.notes.append(f"{exc.message}; kept what was computed: "
                        + (", ".join(done) if done else "no invariant"))
    return result


def _trivial_note(fp: Fingerprint) -> str | None:
    if fp.components == 1 and fp.jones is not None and fp.jones == 1:
        return ("all computed invariants equal the unknot's; no non-trivial knot with V = 1 is "
                "known, but that is not proven (and Delta = 1 alone does not rule out a knot)")
    return None


def identify_diagram(diagram: Diagram, table: ReferenceTable | None = None,
                     neighbours: bool = False, source: str = "", notation: str = "",
                     *, budget=None, simplified: Diagram | None = None,
                     staged=None) -> IdentifyResult:
    """Identify one diagram against the reference table.

    Parameters
    ----------
    diagram : Diagram
    table : ReferenceTable, optional
    neighbours : bool
        Also list the table knots one crossing change away.
    source, notation : str
        For the report.
    budget : knotsift.budget.Budget, optional
        Cost limits (default: the enclosing item's, or the defaults).
    simplified : Diagram, optional
        ``diagram`` already simplified by the caller; it is not simplified
        again (one pass per chain).
    staged : knotsift.budget.Staged, optional
        The invariants of ``simplified``, already computed by the caller.

    Returns
    -------
    IdentifyResult
        Status ``too complex`` when the wall-time budget ran out, with what
        was computed before.
    """
    from .budget import Staged, TooComplex, item_budget
    from .simplify import simplify

    table = table or open_table()
    result = IdentifyResult(status="not in table", source=source, notation=notation,
                            crossings_input=diagram.number_of_crossings())
    result.diagram = diagram  # kept for result.draw() and notebooks, not in the JSON
    given = staged is not None and simplified is not None
    staged = staged if given else Staged()
    with item_budget(budget):
        try:
            simple = simplified if simplified is not None else simplify(diagram)
            result.crossings_simplified = simple.number_of_crossings()
            if simple.number_of_components() >= 2:
                from .link_identification import identify_link_diagram

                return identify_link_diagram(diagram, simple, table, source, notation)
            if not given:
                _staged_invariants(simple, table, staged)
            _finish_result(result, staged, simple, table)
            _unknot_basis(result)
        except TooComplex as exc:
            return _too_complex(result, staged, exc)
    if neighbours:
        result.neighbours = crossing_change_neighbours(simple, table)
    return result


def _short(candidates: list[Candidate], jones: str) -> str:
    """One line naming the candidates, or the Jones polynomial when nothing matched."""
    if not candidates:
        return f"not in table (V = {jones})"
    return " or ".join(c.shown for c in candidates)


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
        ``status`` is identified / ambiguous / not in table / too complex;
        a knot beyond the table whose invariants are those of a connected sum
        of table knots is identified (or ambiguous) with ``factors``; crossings marked
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
    from .limits import check_at_most, check_text
    from .notations.detect import detect_notation, parse_any_with_uncertain, reading_of

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
        _rational_is_prime(result, source)
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


def _rational_is_prime(result: IdentifyResult, source: str) -> None:
    """A rational input is prime (Schubert 1956): drop sums found from its invariants."""
    from .two_bridge import input_fraction

    if result.decomposition != "invariants" or not isinstance(source, str) \
            or input_fraction(source) is None:
        return
    shown = ", ".join(c.shown for c in result.candidates) or "the named factors"
    result.status, result.candidates = "not in table", []
    result.factors = result.decomposition = result.remainder = None
    result.primality = "prime"
    result.notes = [n for n in result.notes if n != FACTOR_NOTE
                    and not n.startswith("several knots share")
                    and not n.startswith("each factor's chirality")]
    result.notes.insert(0, f"the input is a rational (2-bridge) knot, and 2-bridge knots are "
                           f"prime (Schubert 1956): {shown}, consistent with its invariants, "
                           "is ruled out; the knot is beyond the table")


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
