"""Building the link table: named constructions -> every orientation class and mirror
image -> checks against recalled counts and the name-free link enumerator.

Called by :func:`knotsift.data_build.build.build_table`; the rows go into the
``links`` and ``link_forms`` tables beside the knots.
"""

from __future__ import annotations

import csv
import json
from collections import defaultdict
from dataclasses import dataclass, field
from pathlib import Path

from knotsift.diagram import Diagram
from knotsift.errors import KnotsiftError, TableError
from knotsift.invariants.link_fingerprint import LinkFingerprint, oriented_link_fingerprints
from knotsift.laurent import Laurent
from knotsift.simplify import simplify
from knotsift.table import MIRROR_MARK, REVERSED_MARK

__all__ = ["LinkEntry", "BuiltLink", "LinkBuild", "read_link_sources", "build_links",
           "link_forms", "TORUS_EXTRA"]

#: Torus links T(2, n) listed beyond the complete range, for the catenanes of DNA work.
TORUS_EXTRA = (10, 12)


@dataclass
class LinkEntry:
    """One named prime link as reference/links.csv gives it."""

    name: str
    components: int
    crossing_number: int
    construction: str
    alternating: bool
    confidence: str
    aliases: list[str]
    source: str
    provenance: str
    line: int

    @property
    def index(self) -> int:
        return int(self.name.split("_")[1])


@dataclass
class BuiltLink:
    name: str
    kind: str
    components: int
    crossing_number: int
    alternating: bool
    diagram: Diagram
    forms: list = field(default_factory=list)  # (label, reversed, mirrored, Diagram, fp)
    aliases: list[str] = field(default_factory=list)
    construction: str = ""
    source: str = ""
    provenance: str = ""
    confidence: str = ""
    summands: str = ""
    sort_order: int = 0
    class_key: str = ""


@dataclass
class LinkBuild:
    links: list[BuiltLink]
    problems: list[str]
    counts: dict[str, int]
    enumeration: dict
    link_rows: list[dict] = field(default_factory=list)
    form_rows: list[dict] = field(default_factory=list)


def read_link_sources(directory: Path) -> tuple[list[LinkEntry], dict[tuple[int, int], int]]:
    """The recalled link names (links.csv) and published counts (link_counts.csv)."""
    entries = []
    path = directory / "links.csv"
    if not path.is_file():
        raise TableError(f"name source file missing: {path}", value=str(path))
    with path.open(newline="", encoding="utf-8") as fh:
        for k, row in enumerate(csv.DictReader(fh)):
            entries.append(LinkEntry(
                name=row["name"], components=int(row["components"]),
                crossing_number=int(row["crossing_number"]), construction=row["construction"],
                alternating=row["alternating"] == "yes", confidence=row["name_confidence"],
                aliases=[a.strip() for a in row["aliases"].split(";") if a.strip()],
                source=row["source"], provenance=row["provenance"], line=k + 2))
    counts = {}
    with (directory / "link_counts.csv").open(newline="", encoding="utf-8") as fh:
        for row in csv.DictReader(fh):
            counts[(int(row["components"]), int(row["crossing_number"]))] = int(row["prime_links"])
    return entries, counts


def _orientation_label(name: str, reversed_: tuple[int, ...], mirrored: bool) -> str:
    rev = (REVERSED_MARK + "".join(str(k + 1) for k in reversed_)) if reversed_ else ""
    return name + rev + (MIRROR_MARK if mirrored else "")


def link_forms(name: str, diagram: Diagram) -> tuple[Diagram, list]:
    """The reference diagram and every orientation class and mirror image of a link.

    The reference form is the one with the largest total linking number, then
    the smallest signature (positive crossings give negative signature, as for
    knots), then the smallest key; labels of the others say which components
    are reversed relative to it (``~2``) and whether it is the mirror image
    (``*``).
    """
    from .link_enumeration import oriented_forms

    d = simplify(diagram)
    prints = oriented_link_fingerprints(d, simplified=True)
    scored = []
    for rev, mir, form in oriented_forms(d):
        fp = prints[(rev, mir)]
        scored.append(((-fp.total_linking(), fp.signature, fp.key()), rev, mir, form))
    _, ref_rev, ref_mir, ref = min(scored, key=lambda s: s[0])
    forms = []
    for rev, mir, form in oriented_forms(ref):
        # the same form of d: reversals and mirror images compose (component 1 never reversed)
        of_d = (tuple(sorted(set(rev) ^ set(ref_rev))), mir != ref_mir)
        forms.append((_orientation_label(name, rev, mir), rev, mir, form, prints[of_d]))
    return ref, forms


def _jones_products(links: list[BuiltLink], knot_forms: list[tuple[str, Laurent]]
                    ) -> dict[str, str]:
    """Jones polynomials of connected sums and split unions of table entries, with a reading."""
    delta = Laurent.parse("-t^(-1/2) - t^(1/2)")
    pieces: list[tuple[str, int, Laurent]] = [(lbl, 1, v) for lbl, v in knot_forms]
    for lk in links:
        for label, _, _, _, fp in lk.forms:
            pieces.append((label, lk.components, fp.jones))
    out: dict[str, str] = {}
    for i, (a, ma, va) in enumerate(pieces):
        for b, mb, vb in pieces[i:]:
            if ma + mb - 1 <= 3 and ma + mb >= 3:
                out.setdefault(f"{ma + mb - 1}:{va * vb}", f"{a} # {b}")
            if ma + mb <= 3:
                out.setdefault(f"{ma + mb}:{delta * va * vb}", f"{a} + {b} (split)")
    return out


def build_links(knots: dict[str, tuple[Diagram, bool, int]], directory: Path,
                max_crossings: int = 8, enumerate_check: bool = True, progress=None
                ) -> LinkBuild:
    """Construct, check and tabulate the links.

    Parameters
    ----------
    knots : dict
        Knot table name -> (reference diagram, amphichiral, crossing number),
        for the composite and split entries.
    directory : Path
        The reference/ folder.
    """
    entries, counts = read_link_sources(directory)
    problems: list[str] = []
    built: list[BuiltLink] = []
    by_key: dict[str, list[str]] = defaultdict(list)
    from knotsift.notations.conway_algebraic import parse_conway_notation

    for e in entries:
        if e.crossing_number > max_crossings:
            continue
        if progress:
            progress.update(detail=e.name)
        try:
            d = parse_conway_notation(e.construction)
        except KnotsiftError as exc:
            problems.append(f"{e.name} (line {e.line}): construction failed: {exc}")
            continue
        ref, forms = link_forms(e.name, d)
        fp0 = forms[0][4]
        issue = _check_entry(e, d, ref, fp0)
        if issue:
            problems.append(f"{e.name} (line {e.line}, conway: {e.construction}): {issue}")
            continue
        key = min(fp.key() for *_, fp in forms)  # the class key: smallest oriented key
        by_key[key].append(e.name)
        built.append(BuiltLink(
            name=e.name, kind="prime", components=e.components,
            crossing_number=e.crossing_number, alternating=e.alternating, diagram=ref,
            forms=forms, aliases=e.aliases, construction=f"conway: {e.construction}",
            source=e.source, provenance=e.provenance, confidence=e.confidence,
            sort_order=e.components * 1000 + e.crossing_number * 100 + e.index,
            class_key=key))
    for names in by_key.values():
        if len(names) > 1:
            problems.append(f"links {', '.join(names)} share every invariant up to orientation "
                            "and mirror image (a duplicated construction?)")
    found: dict[tuple[int, int], int] = defaultdict(int)
    for lk in built:
        found[(lk.components, lk.crossing_number)] += 1
    for (m, c), n in sorted(counts.items()):
        if c <= max_crossings and found.get((m, c), 0) != n:
            problems.append(f"{found.get((m, c), 0)} prime links of {m} components and {c} "
                            f"crossings built, the published count is {n}")
    extras = _extra_entries(built, knots, max_crossings)
    enumeration: dict = {}
    if enumerate_check:
        enum_problems, enumeration = _check_enumeration(built, extras, knots, max_crossings,
                                                        progress)
        problems.extend(enum_problems)
    result = LinkBuild(built + extras, problems,
                       {f"{m}:{c}": n for (m, c), n in sorted(found.items())}, enumeration)
    _rows(result)
    return result


def _check_entry(e: LinkEntry, d: Diagram, ref: Diagram, fp: LinkFingerprint) -> str | None:
    m = d.number_of_components()
    if m != e.components:
        return f"construction has {m} components, the name says {e.components}"
    if d.is_alternating() != e.alternating:
        return (f"construction is {'' if d.is_alternating() else 'not '}alternating, the list "
                f"says {'yes' if e.alternating else 'no'}")
    if ref.number_of_crossings() > e.crossing_number:
        return (f"construction simplifies to {ref.number_of_crossings()} crossings, more than "
                f"{e.crossing_number}")
    if fp.determinant == 0 and e.alternating:
        return "alternating with determinant 0: split, or not the recalled link"
    if e.alternating and fp.jones.span() != e.crossing_number:
        return (f"alternating, but span V = {fp.jones.span()} differs from the crossing number "
                f"{e.crossing_number} (Kauffman-Murasugi-Thistlethwaite)")
    return None


def _extra_entries(primes: list[BuiltLink], knots: dict, max_crossings: int
                   ) -> list[BuiltLink]:
    """Split unions, connected sums with small pieces, and T(2, n) beyond the table.

    A mirrored summand is written in parentheses, ``4^2_1#(3_1*)``, so that the
    mirror mark at the end of a label always means the whole link's mirror image.
    """
    from knotsift.notations.braid import parse_braid

    out: list[BuiltLink] = []
    seen = {p.class_key for p in primes}
    order = 9000

    def add(name, kind, diagram, crossings, summands, construction, aliases=()):
        nonlocal order
        ref, forms = link_forms(name, diagram)
        key = min(fp.key() for *_, fp in forms)
        if key in seen:
            return
        seen.add(key)
        order += 1
        out.append(BuiltLink(
            name=name, kind=kind, components=diagram.number_of_components(),
            crossing_number=crossings, alternating=False, diagram=ref, forms=forms,
            aliases=list(aliases), construction=construction,
            source="built from the entries above" if kind != "torus link" else
            "closure of the braid sigma_1^n (common practice)",
            provenance="computed" if kind != "torus link" else "common practice",
            confidence="sure", summands=summands, sort_order=order, class_key=key))

    circle = Diagram.unknot()
    add("0^2_1", "split", circle.disjoint_union(circle), 0, "0_1 + 0_1", "two separate circles",
        ["2-component unlink", "unlink"])
    add("0^3_1", "split", circle.disjoint_union(circle).disjoint_union(circle), 0,
        "0_1 + 0_1 + 0_1", "three separate circles", ["3-component unlink"])
    for p in primes:
        if p.components == 2:
            add(f"{p.name}+0_1", "split", p.diagram.disjoint_union(circle), p.crossing_number,
                f"{p.name} + 0_1", f"{p.name} beside a separate circle",
                ["Hopf link and a free ring"] if p.name == "2^2_1" else [])
    for kname in ("3_1", "4_1"):
        if kname in knots:
            kd = knots[kname][0]
            add(f"{kname}+0_1", "split", kd.disjoint_union(circle), knots[kname][2],
                f"{kname} + 0_1", f"{kname} beside a separate circle")
    two = [p for p in primes if p.components == 2]
    for p in two:
        for kname, (kd, amph, kc) in knots.items():
            if p.crossing_number + kc > max_crossings or kc == 0:
                continue
            for kmir in ((False,) if amph else (False, True)):
                k = kd.mirror() if kmir else kd
                klabel = f"({kname}{MIRROR_MARK})" if kmir else kname
                for comp in range(2):
                    edge = p.diagram.components()[comp][0]
                    add(f"{p.name}#{klabel}" + (f"@{comp + 1}" if comp else ""), "composite",
                        p.diagram.connected_sum(k, edge=edge),
                        p.crossing_number + kc, f"{p.name} # {klabel}",
                        f"connected sum of {p.name} (component {comp + 1}) and {klabel}",
                        ["Hopf link with a trefoil on one ring"] if (p.name, kname) == (
                            "2^2_1", "3_1") else [])
        for q in two:
            if p.crossing_number + q.crossing_number > max_crossings or q.sort_order < p.sort_order:
                continue
            for comp in range(2):
                for qmir in (False, True):
                    qd = q.diagram.mirror() if qmir else q.diagram
                    qlabel = f"({q.name}{MIRROR_MARK})" if qmir else q.name
                    edge = p.diagram.components()[comp][0]
                    add(f"{p.name}#{qlabel}" + (f"@{comp + 1}" if comp else ""), "composite",
                        p.diagram.connected_sum(qd, edge=edge),
                        p.crossing_number + q.crossing_number, f"{p.name} # {qlabel}",
                        f"connected sum of {p.name} (component {comp + 1}) and {qlabel}",
                        ["3-ring chain"] if (p.name, q.name) == ("2^2_1", "2^2_1") else [])
    for n in TORUS_EXTRA:
        add(f"T(2,{n})", "torus link", parse_braid([1] * n), n, "", f"braid: sigma_1^{n}",
            [f"{n}-noded catenane"])
    return out


def _check_enumeration(primes: list[BuiltLink], extras: list[BuiltLink], knots: dict,
                       max_crossings: int, progress) -> tuple[list[str], dict]:
    """Compare the named links with the classes of the name-free enumerator."""
    from knotsift.invariants.fingerprint import fingerprint

    from .link_enumeration import enumerate_link_classes

    classes = enumerate_link_classes(max_crossings, progress=progress)
    named = {lk.class_key: lk for lk in primes + extras}
    knot_forms = []
    for kname, (kd, amph, kc) in knots.items():
        if kc <= max_crossings - 2:
            v = fingerprint(kd).jones
            knot_forms.append((kname, v))
            if not amph:
                knot_forms.append((kname + MIRROR_MARK, v.mirror()))
    products = _jones_products(primes, knot_forms)
    problems = []
    unlisted = []
    by_size: dict[str, int] = defaultdict(int)
    for key, cls in sorted(classes.items(), key=lambda kv: (kv[1].min_crossings, kv[0])):
        by_size[f"{cls.components}:{cls.min_crossings}"] += 1
        lk = named.get(key)
        if lk is not None:
            if lk.kind == "prime" and cls.min_crossings < lk.crossing_number:
                problems.append(f"{lk.name} is named with {lk.crossing_number} crossings but the "
                                f"enumerator finds it with {cls.min_crossings}: "
                                f"{cls.examples[0]}")
            continue
        reading = next((products[f"{cls.components}:{fp.jones}"] for fp in cls.prints.values()
                        if f"{cls.components}:{fp.jones}" in products), None)
        if reading is not None:
            unlisted.append(f"{cls.examples[0]}: Jones of {reading}")
            continue
        problems.append(f"enumerated class of {cls.components} components with "
                        f"{cls.min_crossings} crossings matches no named link and its Jones "
                        f"polynomial is no product of table entries: {cls.examples[0]}")
    found = sum(1 for lk in primes if lk.class_key in classes)
    summary = {"classes_by_components_and_crossings": dict(sorted(by_size.items())),
               "named_primes_found": found, "named_primes": len(primes),
               "composite_or_split_by_jones_unlisted": len(unlisted),
               "unnamed_classes": sum(1 for p in problems if p.startswith("enumerated class"))}
    return problems, summary


def _rows(build: LinkBuild) -> None:
    for lk in build.links:
        build.link_rows.append({
            "name": lk.name, "kind": lk.kind, "components": lk.components,
            "crossing_number": lk.crossing_number, "alternating": int(lk.alternating),
            "name_confidence": lk.confidence, "summands": lk.summands,
            "aliases": "; ".join(lk.aliases), "construction": lk.construction,
            "source": lk.source, "provenance": lk.provenance, "sort_order": lk.sort_order})
        for label, rev, mir, d, fp in lk.forms:
            t = fp.texts()
            build.form_rows.append({
                "label": label, "name": lk.name, "is_reference": int(not rev and not mir),
                "reversed": ",".join(str(k + 1) for k in rev), "mirrored": int(mir),
                "components": fp.components, "jones": t["jones"], "linking": t["linking"],
                "alexander": t["alexander"], "determinant": fp.determinant,
                "signature": fp.signature, "triple": t["triple"],
                "component_jones": t["component_jones"], "fingerprint": fp.key(),
                "pd_code": json.dumps(d.pd_code()), "free_loops": d.free_loops})
