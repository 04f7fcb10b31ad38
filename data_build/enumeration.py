"""An enumerator of small knot diagrams, independent of the name list.

It generates diagrams by construction rules alone and groups them by
fingerprint (up to mirror image), so the named table can be checked against
what actually exists:

* rational knots: every continued fraction of positive entries with at most
  ``n`` crossings (numerator closures of rational tangles);
* Montesinos knots: ramifications ``a,b,c`` and ``a,b,c,d`` of rational
  tangles of either sign, with an extra integer tangle, at most ``n`` crossings;
* polyhedral knots: every alternating filling of the basic polyhedra 6*, 8*,
  9* and 10* by positive rational tangles, at most ``n`` crossings;
* DT codes: every alternating DT code up to ``dt_alternating`` crossings and
  every sign pattern up to ``dt_signed`` crossings (one code per relabelling
  class; unrealisable codes are skipped).

Every knot with at most 8 crossings is alternating through 8 or a Montesinos
knot (8_19, 8_20, 8_21), so through 8 crossings the enumeration is complete;
through 10 it covers the rational, Montesinos and alternating polyhedral
knots, but not the non-alternating polyhedral ones (such as 10_163).
"""

from __future__ import annotations

from dataclasses import dataclass, field
from itertools import permutations, product

from knotsift.errors import KnotsiftError
from knotsift.invariants.fingerprint import Fingerprint, fingerprint
from knotsift.simplify import simplify

__all__ = ["EnumeratedClass", "enumerate_classes", "rational_codes", "montesinos_codes",
           "dt_codes"]


def _compositions(total: int):
    """All sequences of positive integers with sum ``total``."""
    if total == 0:
        yield ()
        return
    for first in range(1, total + 1):
        for rest in _compositions(total - first):
            yield (first,) + rest


def rational_codes(max_crossings: int):
    """(text, Diagram) for rational knots and links with at most ``max_crossings`` crossings."""
    from knotsift.tangle import rational_tangle

    for n in range(3, max_crossings + 1):
        for entries in _compositions(n):
            if entries[0] == 1 or entries[-1] == 1:
                continue  # a leading or trailing 1 merges into its neighbour: not reduced
            yield "".join(map(str, entries)), n, rational_tangle(list(entries)).numerator()


def _rational_parts(max_crossings: int):
    """Rational tangles with 2.. crossings (as entry tuples), both signs."""
    out = []
    for n in range(2, max_crossings + 1):
        for entries in _compositions(n):
            if entries[0] == 1 and len(entries) > 1:
                continue
            out.append((n, entries))
    return out


def montesinos_codes(max_crossings: int):
    """(text, crossings, Diagram) for ramifications of 3 or 4 rational tangles plus an integer."""
    from knotsift.tangle import integer_tangle, ramification, rational_tangle

    parts = _rational_parts(max_crossings - 4)
    for k in (3, 4):
        for combo in product(range(len(parts)), repeat=k):
            if list(combo) != sorted(combo):
                continue  # order of the tangles up to cyclic/dihedral symmetry: sorted only
            base = sum(parts[i][0] for i in combo)
            if base > max_crossings:
                continue
            for signs in product((1, -1), repeat=k):
                if signs[0] < 0:
                    continue  # mirror images are grouped anyway
                for extra in range(-(max_crossings - base), max_crossings - base + 1):
                    tangles = [rational_tangle([s * a for a in parts[i][1]])
                               for i, s in zip(combo, signs)]
                    t = ramification(tangles)
                    if extra:
                        t = t + integer_tangle(extra).reflection()
                    text = ",".join(("-" if s < 0 else "") + "".join(map(str, parts[i][1]))
                                    for i, s in zip(combo, signs))
                    if extra:
                        text += f",{extra}"
                    yield text, base + abs(extra), t.numerator()


def _positive_rational_tangles(max_crossings: int) -> dict[int, list]:
    """Positive rational tangles by crossing count: one per fraction (and its reflection)."""
    from knotsift.tangle import continued_fraction, tangle_from_fraction

    seen: dict = {}
    for k in range(1, max_crossings + 1):
        for entries in _compositions(k):
            f = continued_fraction(list(entries))
            for g in (f, 1 / f):
                if g not in seen:
                    seen[g] = k
    by_size: dict[int, list] = {}
    for f, k in sorted(seen.items(), key=lambda kv: (kv[1], kv[0])):
        by_size.setdefault(k, []).append((f, tangle_from_fraction(f)))
    return by_size


def polyhedral_codes(max_crossings: int):
    """(text, crossings, Diagram) for alternating fillings of the basic polyhedra.

    Every vertex of 6*, 8*, 9* and 10* gets a positive rational tangle (the
    tangle 1 by default), which keeps the diagram alternating.
    """
    from knotsift.polyhedra import basic_polyhedron

    tangles = _positive_rational_tangles(max_crossings)
    for name in ("6*", "8*", "9*", "10*"):
        poly = basic_polyhedron(name)
        v = poly.number_of_vertices()
        if v > max_crossings:
            continue
        for total in range(v, max_crossings + 1):
            for sizes in _compositions_into(total, v):
                for choice in product(*(tangles[k] for k in sizes)):
                    text = name + " " + ".".join(str(f) for f, _ in choice)
                    yield text, total, poly.substitute([t for _, t in choice])


def _compositions_into(total: int, parts: int):
    """Sequences of ``parts`` positive integers with sum ``total``."""
    if parts == 1:
        if total >= 1:
            yield (total,)
        return
    for first in range(1, total - parts + 2):
        for rest in _compositions_into(total - first, parts - 1):
            yield (first,) + rest


def _canonical_pairing(evens: tuple[int, ...]) -> tuple[int, ...]:
    """The smallest DT code of the same unsigned diagram under relabelling (shift, reversal)."""
    n = len(evens)
    m = 2 * n
    partner = {}
    for k, e in enumerate(evens):
        o = 2 * k + 1
        partner[o], partner[e] = e, o
    best = None
    for shift in range(m):
        for rev in (False, True):
            def relabel(x: int) -> int:
                y = (x - 1 - shift) % m if not rev else (shift - (x - 1)) % m
                return y + 1
            new = {}
            for o in range(1, m, 2):
                a, b = relabel(o), relabel(partner[o])
                odd, even = (a, b) if a % 2 else (b, a)
                new[odd] = even
            code = tuple(new[o] for o in range(1, m, 2))
            if best is None or code < best:
                best = code
    return best


def dt_codes(max_alternating: int, max_signed: int):
    """(text, crossings, Diagram) for DT codes, one per relabelling class, realisable only."""
    from knotsift.notations.dt import parse_dt

    for n in range(3, max_alternating + 1):
        for perm in permutations(range(2, 2 * n + 1, 2)):
            if perm != _canonical_pairing(perm):
                continue
            sign_patterns = product((1, -1), repeat=n) if n <= max_signed else [(1,) * n]
            for signs in sign_patterns:
                if signs[0] < 0:
                    continue
                code = [s * e for s, e in zip(signs, perm)]
                try:
                    d = parse_dt(code)
                except KnotsiftError:
                    break  # not realisable: no sign pattern helps
                yield " ".join(map(str, code)), n, d


@dataclass
class EnumeratedClass:
    """Diagrams sharing one fingerprint up to mirror image."""

    key: str
    fingerprint: Fingerprint
    min_crossings: int
    examples: list[str] = field(default_factory=list)


def enumerate_classes(max_crossings: int = 10, dt_alternating: int = 8, dt_signed: int = 6,
                      montesinos: bool = True, polyhedral: bool = True, progress=None
                      ) -> dict[str, EnumeratedClass]:
    """Group every enumerated knot diagram by its fingerprint (knots only, links skipped).

    Returns
    -------
    dict
        unoriented fingerprint key -> EnumeratedClass, with the smallest
        crossing count at which the class appeared.
    """
    classes: dict[str, EnumeratedClass] = {}
    sources = [("rational", rational_codes(max_crossings))]
    if montesinos:
        sources.append(("montesinos", montesinos_codes(max_crossings)))
    if polyhedral:
        sources.append(("polyhedral", polyhedral_codes(max_crossings)))
    sources.append(("dt", dt_codes(dt_alternating, dt_signed)))
    for kind, gen in sources:
        for text, n, diagram in gen:
            if progress:
                progress.update(detail=kind)
            if diagram.number_of_components() != 1:
                continue
            d = simplify(diagram)
            fp = fingerprint(d, simplified=True)
            key = fp.unoriented_key()
            c = min(n, d.number_of_crossings())
            cls = classes.get(key)
            if cls is None:
                classes[key] = EnumeratedClass(key, fp, c, [f"{kind}: {text}"])
            else:
                if c < cls.min_crossings:
                    cls.min_crossings = c
                if len(cls.examples) < 3:
                    cls.examples.append(f"{kind}: {text}")
    return classes
