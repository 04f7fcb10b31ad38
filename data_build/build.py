"""Building the reference table: named constructions -> fingerprints -> checks -> SQLite.

``knotsift build`` runs :func:`build_table`.  Every check failure stops the
build with the rows involved, unless it is documented in
``reference/discrepancies.csv`` (a known, explained disagreement between two
recollections) or ``keep_going`` is set, in which case the failing entries are
left out and the table is marked incomplete.
"""

from __future__ import annotations

import datetime as _dt
import json
import os
import tempfile
from collections import defaultdict
from dataclasses import dataclass, field
from pathlib import Path

from knotsift.diagram import Diagram
from knotsift.errors import KnotsiftError, TableError
from knotsift.invariants.fingerprint import Fingerprint, fingerprint
from knotsift.progress import Progress
from knotsift.simplify import simplify
from knotsift.table import MIRROR_MARK, SCHEMA_VERSION, schema

from .chirality import chirality_basis, is_reference_chirality
from .composites import (
    composite_sums,
    mirror_of,
    sum_diagram,
    sum_fingerprint,
    summand_label,
)
from .sources import PrimeEntry, ReferenceSources, read_sources

__all__ = ["BuildError", "BuildReport", "build_table", "construct", "PRIME_COUNTS"]

#: Prime knots by crossing number 3..10 (Rolfsen 1976; Hoste, Thistlethwaite and Weeks 1998).
PRIME_COUNTS = {3: 1, 4: 1, 5: 2, 6: 3, 7: 7, 8: 21, 9: 49, 10: 165}


CORRECTED_NOTE = "; construction corrected, see reference/corrections.csv"


class BuildError(TableError):
    """A build-time check failed; the message lists the rows involved."""


@dataclass
class BuiltKnot:
    name: str
    kind: str
    crossing_number: int
    alternating: bool
    amphichiral: bool
    diagram: Diagram
    fp: Fingerprint
    summands: str = ""
    aliases: list[str] = field(default_factory=list)
    construction: str = ""
    source: str = ""
    provenance: str = ""
    sort_order: int = 0
    basis: str = ""
    mirror_label: str = ""


@dataclass
class BuildReport:
    path: Path
    counts: dict[int, int]
    composites: int
    problems: list[str]
    documented: list[str]
    left_out: list[str]
    coincidences: dict[str, list[list[str]]]
    blind_chiral: list[str]
    enumeration: dict = field(default_factory=dict)
    seconds: float = 0.0
    links: dict = field(default_factory=dict)

    def summary(self) -> str:
        lines = [f"wrote {self.path}",
                 "prime knots by crossing number: " + ", ".join(
                     f"{c}: {n}" for c, n in sorted(self.counts.items())),
                 f"composite knots: {self.composites}"]
        if self.documented:
            lines.append(f"documented discrepancies: {len(self.documented)}")
        if self.left_out:
            lines.append(f"left out (failed checks): {', '.join(self.left_out)}")
        for inv, groups in self.coincidences.items():
            if groups:
                lines.append(f"{inv}: {len(groups)} values shared by several knots")
        if self.blind_chiral:
            lines.append("chiral knots the invariants see as mirror-symmetric: "
                         + ", ".join(self.blind_chiral))
        if self.enumeration:
            e = self.enumeration
            lines.append(f"enumerator: knot classes by smallest crossing count "
                         f"{e['classes_by_crossings']}; {e['named_primes_found']} of "
                         f"{e['named_primes']} named primes found, {e['unnamed_classes']} "
                         "classes without a name")
        if self.links:
            lk = self.links
            lines.append("prime links by components:crossings: " + ", ".join(
                f"{k}: {n}" for k, n in lk["counts"].items()))
            lines.append(f"link table: {lk['entries']} links (primes, split unions, connected "
                         f"sums, T(2,n) extras) in {lk['forms']} oriented forms")
            e = lk.get("enumeration") or {}
            if e:
                lines.append(f"link enumerator: {e['named_primes_found']} of {e['named_primes']} "
                             f"named primes found, {e['composite_or_split_by_jones_unlisted']} "
                             "unlisted classes read as composite or split by their Jones "
                             f"polynomial, {e['unnamed_classes']} unexplained")
        lines.append(f"build time {self.seconds:.1f} s")
        return "\n".join(lines)


def construct(entry: PrimeEntry) -> tuple[Diagram, str]:
    """The construction diagram of a named prime knot and a text saying which notation."""
    if entry.conway:
        try:
            from knotsift.notations.conway_algebraic import parse_conway_notation
        except ImportError:  # pragma: no cover - only while the full notation is missing
            parse_conway_notation = None
        if parse_conway_notation is not None:
            return parse_conway_notation(entry.conway), f"conway: {entry.conway}"
        if entry.conway.isdigit():
            from knotsift.notations.conway import parse_rational

            return parse_rational(entry.conway), f"conway: {entry.conway}"
    if entry.dt_code:
        from knotsift.notations.dt import parse_dt

        return parse_dt(entry.dt_code), f"dt: {entry.dt_code}"
    raise BuildError(f"{entry.name}: no usable construction (Conway notation "
                     f"{entry.conway!r}, DT code {entry.dt_code!r})", value=entry.name)


def recollection_is_consistent(entry: PrimeEntry, src: ReferenceSources, invariant: str) -> bool:
    """Whether a recalled polynomial passes the trade's identities for a knot.

    A recalled Jones polynomial must have V(1) = 1, |V(-1)| equal to the
    recalled determinant and, for an alternating knot, span equal to the
    crossing number (Kauffman-Murasugi-Thistlethwaite); a recalled Alexander
    polynomial Delta(1) = 1 and |Delta(-1)| equal to the determinant.  A
    recollection failing them is wrong in itself and is not used to judge a
    construction.
    """
    poly = (src.jones if invariant == "jones" else src.alexander).get(entry.name)
    if poly is None:
        return False
    det = src.determinant.get(entry.name)
    ok = poly.evaluate(1) == 1 and (det is None or abs(poly.evaluate(-1)) == det)
    if invariant == "jones" and entry.alternating:
        ok = ok and poly.span() == entry.crossing_number
    return ok


def _check_prime(entry: PrimeEntry, d: Diagram, fp: Fingerprint, src: ReferenceSources
                 ) -> list[tuple[str, str]]:
    """(check, message) for each disagreement of a built prime with the name source."""
    out = []
    if fp.components != 1:
        out.append(("components", f"construction has {fp.components} components"))
        return out
    if recollection_is_consistent(entry, src, "alexander") and \
            fp.alexander != src.alexander[entry.name]:
        out.append(("alexander", f"computed Alexander {fp.alexander} but the recalled table "
                                 f"says {src.alexander[entry.name]}"))
    if entry.name in src.determinant and fp.determinant != src.determinant[entry.name]:
        out.append(("determinant", f"computed determinant {fp.determinant}, recalled "
                                   f"{src.determinant[entry.name]}"))
    if entry.alternating:
        span = fp.jones.span()
        if span != entry.crossing_number:
            out.append(("kmt", f"alternating, but span V = {span} differs from the crossing "
                               f"number {entry.crossing_number} "
                               "(Kauffman-Murasugi-Thistlethwaite)"))
    if recollection_is_consistent(entry, src, "jones"):
        v = src.jones[entry.name]
        if fp.jones not in (v, v.mirror()):
            out.append(("jones", f"computed V = {fp.jones}, recalled {v} (up to mirror)"))
    amph = entry.name in src.amphichiral
    if amph and not fp.is_mirror_blind():
        out.append(("amphichiral", "listed as amphichiral, but the invariants differ from the "
                                   "mirror image's"))
    return out


def _coincidence_groups(forms: list[tuple[str, dict[str, str]]]
                        ) -> dict[str, dict[str, list[str]]]:
    """For each invariant, the values shared by several forms, with their labels."""
    groups: dict[str, dict[str, list[str]]] = {}
    for inv in ("jones", "alexander", "determinant", "signature", "rho_1", "homology",
                "fingerprint"):
        by_value: dict[str, list[str]] = defaultdict(list)
        for label, texts in forms:
            by_value[texts[inv]].append(label)
        groups[inv] = {v: sorted(ls) for v, ls in by_value.items() if len(ls) > 1}
    return groups


def _check_enumeration(built: list[BuiltKnot], max_crossings: int, show_progress
                       ) -> tuple[list[str], dict]:
    """Compare the named primes with the classes found by the independent enumerator."""
    from .enumeration import enumerate_classes

    progress = Progress(None, "enumerated diagrams", enabled=show_progress)
    classes = enumerate_classes(max_crossings, dt_alternating=min(8, max_crossings),
                                dt_signed=min(6, max_crossings), progress=progress)
    progress.close()
    by_key: dict[str, list[BuiltKnot]] = defaultdict(list)
    for k in built:
        by_key[k.fp.unoriented_key()].append(k)
    problems = []
    found_at: dict[int, int] = defaultdict(int)
    unnamed = []
    for key, cls in sorted(classes.items(), key=lambda kv: (kv[1].min_crossings, kv[0])):
        found_at[cls.min_crossings] += 1
        if cls.min_crossings == 0:
            continue
        named = by_key.get(key)
        if not named:
            unnamed.append(cls)
            problems.append(f"enumerated class with {cls.min_crossings} crossings matches no "
                            f"named knot: {cls.examples[0]} (V = {cls.fingerprint.jones})")
            continue
        smallest = min(named, key=lambda k: k.crossing_number)
        if cls.min_crossings < smallest.crossing_number:
            problems.append(f"{smallest.name} is named with {smallest.crossing_number} "
                            f"crossings but the enumerator finds its class with "
                            f"{cls.min_crossings}: {cls.examples[0]}")
    covered = sum(1 for k in built if k.fp.unoriented_key() in classes)
    summary = {"classes_by_crossings": {str(c): n for c, n in sorted(found_at.items())},
               "named_primes_found": covered, "named_primes": len(built),
               "unnamed_classes": len(unnamed)}
    return problems, summary


def build_table(output: str | Path, max_crossings: int = 10, keep_going: bool = False,
                sources: ReferenceSources | None = None, show_progress: bool | None = None,
                enumerate_check: bool = True, links: bool = True) -> BuildReport:
    """Build the reference table of knots through ``max_crossings`` crossings.

    Parameters
    ----------
    output : path
        The SQLite file to write (replaced atomically).
    max_crossings : int
        Largest crossing number of the primes and composites included.
    keep_going : bool
        Leave out entries that fail a check instead of stopping; the table's
        metadata then records them and does not claim completeness.
    links : bool
        Also build the link table (links of 2 and 3 components through
        ``min(max_crossings, 8)`` crossings, see :mod:`knotsift.data_build.links`).

    Raises
    ------
    BuildError
        When a check fails that reference/discrepancies.csv does not explain.
    """
    import time

    start = time.monotonic()
    src = sources or read_sources()
    entries = [p for p in src.primes if p.crossing_number <= max_crossings]
    problems: list[str] = []
    documented: list[str] = []
    left_out: list[str] = []
    built: list[BuiltKnot] = []
    progress = Progress(len(entries), "primes", enabled=show_progress)
    for entry in entries:
        progress.update(detail=entry.name)
        try:
            diagram, how = construct(entry)
            diagram = simplify(diagram)
            fp = fingerprint(diagram, simplified=True)
        except KnotsiftError as exc:
            problems.append(f"{entry.name} (line {entry.line}): construction failed: {exc}")
            left_out.append(entry.name)
            continue
        issues = _check_prime(entry, diagram, fp, src)
        known = src.discrepancies.get(entry.name, {})
        bad = []
        for check, message in issues:
            if check in known:
                documented.append(f"{entry.name}: {message} [documented: {known[check]}]")
            else:
                bad.append(f"{entry.name} (line {entry.line}, {how}): {message}")
        if bad:
            problems.extend(bad)
            left_out.append(entry.name)
            continue
        amph = entry.name in src.amphichiral
        if not amph:
            ref = is_reference_chirality(fp)
            if ref is False:
                diagram, fp = diagram.mirror(), fp.mirror()
        built.append(BuiltKnot(
            name=entry.name, kind="prime", crossing_number=entry.crossing_number,
            alternating=entry.alternating, amphichiral=amph, diagram=diagram, fp=fp,
            aliases=entry.aliases, construction=how, source=entry.source,
            provenance=entry.provenance + (CORRECTED_NOTE if entry.correction else ""),
            sort_order=entry.crossing_number * 10000 + entry.index,
            basis="amphichiral" if amph else chirality_basis(fp)))
    progress.close()
    counts: dict[int, int] = defaultdict(int)
    for k in built:
        counts[k.crossing_number] += 1
    for c, n in PRIME_COUNTS.items():
        if c <= max_crossings and counts.get(c, 0) != n and not keep_going:
            problems.append(f"{counts.get(c, 0)} prime knots of {c} crossings built, the "
                            f"published count is {n}")
    enumeration = {}
    if enumerate_check:
        enum_problems, enumeration = _check_enumeration(built, max_crossings, show_progress)
        problems.extend(enum_problems)
    if problems and not keep_going:
        raise BuildError("the reference table failed its checks:\n  " + "\n  ".join(problems))

    # composites from the primes that passed
    amph_names = {k.name for k in built if k.amphichiral}
    prime_by_name = {k.name: k for k in built}
    composites: list[BuiltKnot] = []
    prime_info = [(k.name, k.crossing_number, k.amphichiral, k.sort_order) for k in built]
    for n, combo in enumerate(composite_sums(prime_info, max_crossings)):
        diagrams, prints = [], []
        for s in combo:
            k = prime_by_name[s.name]
            diagrams.append(k.diagram.mirror() if s.mirrored else k.diagram)
            prints.append(k.fp.mirror() if s.mirrored else k.fp)
        fp = sum_fingerprint(prints)
        mirror = mirror_of(combo, amph_names)
        amph = sorted(mirror, key=lambda s: (s.name, s.mirrored)) == sorted(
            combo, key=lambda s: (s.name, s.mirrored))
        diagram = sum_diagram(diagrams)
        if not amph and is_reference_chirality(fp) is False:
            combo, mirror = mirror, combo
            diagram, fp = diagram.mirror(), fp.mirror()
        name = summand_label(combo)
        composites.append(BuiltKnot(
            name=name, kind="composite", crossing_number=sum(s.crossing_number for s in combo),
            alternating=True, amphichiral=amph, diagram=diagram, fp=fp,
            summands=" # ".join(s.label for s in combo),
            aliases={"3_1#3_1": ["granny knot", "granny"],
                     "3_1#3_1*": ["square knot", "square", "reef knot"]}.get(name, []),
            construction="connected sum of the summands' construction diagrams",
            source="connected sums of the primes above", provenance="computed",
            sort_order=sum(s.crossing_number for s in combo) * 10000 + 5000 + n,
            basis="amphichiral" if amph else chirality_basis(fp),
            mirror_label=summand_label(mirror)))
    # distinct names must have distinct fingerprints, up to mirror image, unless documented
    by_key: dict[str, list[str]] = defaultdict(list)
    for k in built + composites:
        by_key[k.fp.unoriented_key()].append(k.name)
    for names in by_key.values():
        if len(names) > 1 and frozenset(names) not in src.coincidences:
            problems.append(f"knots {', '.join(names)} share every invariant and "
                            "reference/coincidences.csv does not document it (a duplicated "
                            "construction?)")
    if problems and not keep_going:
        raise BuildError("the reference table failed its checks:\n  " + "\n  ".join(problems))
    # complete through c: every prime of c or fewer crossings built and checked
    failed_at = [int(n.split("_")[0]) for n in left_out]
    complete = min([max_crossings] + [c - 1 for c in failed_at])
    if complete < 3:
        complete = None
    unknot = BuiltKnot(name="0_1", kind="unknot", crossing_number=0, alternating=True,
                       amphichiral=True, diagram=Diagram.unknot(),
                       fp=fingerprint(Diagram.unknot()), aliases=["unknot", "trivial knot"],
                       construction="the circle", source="common practice",
                       provenance="common practice", sort_order=0, basis="amphichiral")
    everything = [unknot] + built + composites
    # forms
    form_rows = []
    for k in everything:
        variants = [(k.name, True, k.diagram, k.fp)]
        if not k.amphichiral:
            mlabel = k.mirror_label or (k.name + MIRROR_MARK)
            variants.append((mlabel, False, k.diagram.mirror(), k.fp.mirror()))
        for label, is_ref, d, fp in variants:
            form_rows.append({
                "label": label, "name": k.name, "is_reference": int(is_ref),
                "components": fp.components, "jones": str(fp.jones),
                "alexander": str(fp.alexander), "determinant": fp.determinant,
                "signature": fp.signature, "rho_1": fp.texts()["rho_1"],
                "homology": fp.texts()["homology"], "fingerprint": fp.key(),
                "pd_code": json.dumps(d.pd_code()),
            })
    blind = [k.name for k in everything if not k.amphichiral and k.fp.is_mirror_blind()]
    groups = _coincidence_groups([(r["label"], {
        "jones": r["jones"], "alexander": r["alexander"], "determinant": str(r["determinant"]),
        "signature": str(r["signature"]), "rho_1": r["rho_1"], "homology": r["homology"],
        "fingerprint": r["fingerprint"]}) for r in form_rows])
    # a mirror-blind chiral knot's two forms always share values: not a coincidence of names
    name_of = {r["label"]: r["name"] for r in form_rows}
    coincidence_rows = []
    reported: dict[str, list[list[str]]] = {}
    for inv, by_value in groups.items():
        reported[inv] = []
        for value, labels in sorted(by_value.items()):
            coincidence_rows.append({"invariant": inv, "value": value, "count": len(labels),
                                     "labels": ",".join(labels)})
            if len({name_of[label] for label in labels}) > 1:
                reported[inv].append(labels)
    meta = {
        "schema_version": str(SCHEMA_VERSION),
        "package_version": _package_version(),
        "build_time": _dt.datetime.now(_dt.timezone.utc).isoformat(timespec="seconds"),
        "max_crossings": str(max_crossings),
        "complete_through": str(complete) if complete is not None else "",
        "left_out": ",".join(left_out),
        "prime_counts": json.dumps({str(c): n for c, n in sorted(counts.items())}),
        "composite_count": str(len(composites)),
        "enumeration": json.dumps(enumeration, sort_keys=True),
        "mirror_mark": MIRROR_MARK,
        "signature_convention": "right-handed trefoil has signature -2",
        "reference_chirality_rule": "negative signature; else Jones leaning to positive "
                                    "powers; else rho_1 with a negative top coefficient; else "
                                    "as constructed (see data_build/chirality.py)",
    }
    knot_rows = [{
        "name": k.name, "kind": k.kind, "crossing_number": k.crossing_number,
        "components": k.fp.components, "alternating": int(k.alternating),
        "amphichiral": int(k.amphichiral), "chirality_basis": k.basis, "summands": k.summands,
        "aliases": "; ".join(k.aliases), "construction": k.construction, "source": k.source,
        "provenance": k.provenance, "sort_order": k.sort_order} for k in everything]
    link_build = None
    if links:
        from .links import build_links

        link_max = min(max_crossings, 8)
        knot_info = {k.name: (k.diagram, k.amphichiral, k.crossing_number) for k in built}
        lprogress = Progress(None, "links", enabled=show_progress)
        link_build = build_links(knot_info, src.directory, link_max,
                                 enumerate_check=enumerate_check, progress=lprogress)
        lprogress.close()
        if link_build.problems and not keep_going:
            raise BuildError("the link table failed its checks:\n  "
                             + "\n  ".join(link_build.problems))
        meta.update({
            "link_max_crossings": str(link_max),
            "link_complete_through": "" if link_build.problems else str(link_max),
            "link_counts": json.dumps(link_build.counts, sort_keys=True),
            "link_enumeration": json.dumps(link_build.enumeration, sort_keys=True),
            "link_problems": json.dumps(link_build.problems),
            "link_reference_rule": "largest total linking number, then smallest signature "
                                   "(see data_build/links.py)",
        })
    path = Path(output)
    _write(path, meta, knot_rows, form_rows, coincidence_rows,
           link_build.link_rows if link_build else [], link_build.form_rows if link_build else [])
    report = BuildReport(path=path, counts=dict(counts), composites=len(composites),
                         enumeration=enumeration,
                         problems=problems, documented=documented, left_out=left_out,
                         coincidences=reported, blind_chiral=blind,
                         seconds=time.monotonic() - start,
                         links=({"counts": link_build.counts, "entries": len(link_build.links),
                                 "forms": len(link_build.form_rows),
                                 "enumeration": link_build.enumeration}
                                if link_build else {}))
    return report


def _package_version() -> str:
    try:
        from importlib.metadata import version

        return version("knotsift")
    except Exception:  # not installed (running from a checkout)
        from knotsift import __version__

        return __version__


def _write(path: Path, meta: dict, knots: list[dict], forms: list[dict],
           coincidences: list[dict], links: list[dict] = (), link_forms: list[dict] = ()
           ) -> None:
    """Write all rows into a new SQLite file, then move it into place atomically."""
    import sqlalchemy as sa

    path.parent.mkdir(parents=True, exist_ok=True)
    fd, tmp = tempfile.mkstemp(suffix=".sqlite", dir=path.parent)
    os.close(fd)
    try:
        engine = sa.create_engine(f"sqlite:///{tmp}")
        md = schema()
        md.create_all(engine)
        with engine.begin() as conn:
            conn.execute(md.tables["metadata"].insert(),
                         [{"key": k, "value": v} for k, v in sorted(meta.items())])
            conn.execute(md.tables["knots"].insert(), sorted(knots, key=lambda r: r["name"]))
            conn.execute(md.tables["forms"].insert(), sorted(forms, key=lambda r: r["label"]))
            if coincidences:
                conn.execute(md.tables["coincidences"].insert(), coincidences)
            if links:
                conn.execute(md.tables["links"].insert(), sorted(links, key=lambda r: r["name"]))
                conn.execute(md.tables["link_forms"].insert(),
                             sorted(link_forms, key=lambda r: r["label"]))
        engine.dispose()
        os.chmod(tmp, 0o644)
        os.replace(tmp, path)
    finally:
        if os.path.exists(tmp):
            os.unlink(tmp)
