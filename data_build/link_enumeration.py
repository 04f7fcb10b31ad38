"""An enumerator of small link diagrams of several components, independent of the name list.

It reuses the knot enumerator's construction rules (rational, Montesinos and
basic-polyhedron fillings, :mod:`knotsift.data_build.enumeration`), keeps the
diagrams of two or more components whose diagram is in one piece, adds the
fillings of ``6*`` with tangles of either sign (non-alternating polyhedral
links), algebraic products ``(a,b)c``, ``(a,b)(c,d)`` and ``(a,b)c,d`` of small
rational tangles of either sign, Montesinos links with a horizontal integer
tangle (``2,2,2++``), and closures of braids on three strands, and groups
everything by the link fingerprint up to orientations of the components and
mirror image (:func:`unoriented_link_key`).
"""

from __future__ import annotations

from dataclasses import dataclass, field
from itertools import product

from knotsift.diagram import Diagram
from knotsift.errors import KnotsiftError
from knotsift.invariants.link_fingerprint import link_fingerprint, oriented_link_fingerprints
from knotsift.invariants.linking import reverse_components, split_parts
from knotsift.simplify import simplify

from .enumeration import (
    _compositions_into,
    _positive_rational_tangles,
    montesinos_codes,
    polyhedral_codes,
    rational_codes,
)

__all__ = ["EnumeratedLink", "enumerate_link_classes", "oriented_forms",
           "unoriented_link_key", "braid_codes", "signed_polyhedral_codes", "algebraic_codes",
           "horizontal_montesinos_codes"]


def oriented_forms(diagram: Diagram) -> list[tuple[tuple[int, ...], bool, Diagram]]:
    """Every orientation class (component 0 kept) and mirror image of a link diagram.

    Returns ``(reversed components, mirrored, diagram)``.  Reversing every
    component at once changes none of the invariants used here, so component 0
    keeps its direction.
    """
    m = diagram.number_of_components()
    out = []
    for bits in product((False, True), repeat=max(m - 1, 0)):
        rev = tuple(k + 1 for k, b in enumerate(bits) if b)
        d = reverse_components(diagram, rev)
        out.append((rev, False, d))
        out.append((rev, True, d.mirror()))
    return out


def unoriented_link_key(diagram: Diagram) -> tuple[str, dict]:
    """The smallest oriented key over orientations and mirror images, and every oriented key.

    Returns
    -------
    (str, dict)
        The class key and ``{(reversed, mirrored): LinkFingerprint}``.
    """
    prints = oriented_link_fingerprints(diagram, simplified=True)
    return min(fp.key() for fp in prints.values()), prints


def braid_codes(max_crossings: int, strands=(3,)):
    """(text, crossings, Diagram) for braid words on 3 strands, one per rotation class."""
    from knotsift.notations.braid import parse_braid

    for s in strands:
        letters = [g for i in range(1, s) for g in (i, -i)]
        for n in range(s, max_crossings + 1):
            for word in product(letters, repeat=n):
                if word != min(word[k:] + word[:k] for k in range(n)):
                    continue  # conjugate by rotation: one per class
                if any(word[k] == -word[(k + 1) % n] for k in range(n)):
                    continue  # a cancelling pair: fewer crossings
                used = {abs(g) for g in word}
                if len(used) != s - 1:
                    continue  # a generator missing: split
                if word[0] < 0:
                    continue  # the mirror image has a word starting with a positive letter
                yield " ".join(map(str, word)), n, parse_braid(list(word), strands=s)


def signed_polyhedral_codes(max_crossings: int):
    """(text, crossings, Diagram) for fillings of 6* by rational tangles of either sign."""
    from knotsift.polyhedra import basic_polyhedron

    tangles = _positive_rational_tangles(max_crossings)
    poly = basic_polyhedron("6*")
    for total in range(6, max_crossings + 1):
        for sizes in _compositions_into(total, 6):
            for choice in product(*(tangles[k] for k in sizes)):
                for signs in product((1, -1), repeat=6):
                    if signs[0] < 0 or all(s > 0 for s in signs):
                        continue
                    ts = [t if s > 0 else t.mirror()
                          for (_, t), s in zip(choice, signs, strict=True)]
                    text = "6* " + ".".join(("-" if s < 0 else "") + str(f)
                                            for (f, _), s in zip(choice, signs, strict=True))
                    yield text, total, poly.substitute(ts)


def horizontal_montesinos_codes(max_crossings: int):
    """(text, crossings, Diagram) for ``a,b,c`` and ``|e| >= 2`` trailing signs (``2,2,2++``).

    The knot enumerator adds its extra integer tangle reflected (a vertical
    twist); Conway's trailing signs add a horizontal one, which differs for
    ``|e| >= 2``.
    """
    from knotsift.tangle import integer_tangle, ramification, rational_tangle

    from .enumeration import _rational_parts

    parts = _rational_parts(max_crossings - 4)
    for combo in product(range(len(parts)), repeat=3):
        if list(combo) != sorted(combo):
            continue
        base = sum(parts[i][0] for i in combo)
        for signs in product((1, -1), repeat=3):
            if signs[0] < 0:
                continue
            for extra in range(-(max_crossings - base), max_crossings - base + 1):
                if abs(extra) < 2:
                    continue
                t = ramification([rational_tangle([s * a for a in parts[i][1]])
                                  for i, s in zip(combo, signs, strict=True)])
                t = t + integer_tangle(extra)
                text = ",".join(("-" if s < 0 else "") + "".join(map(str, parts[i][1]))
                                for i, s in zip(combo, signs, strict=True))
                text += ("+" if extra > 0 else "-") * abs(extra)
                yield text, base + abs(extra), t.numerator()


def algebraic_codes(max_crossings: int):
    """(text, crossings, Diagram) for products of a ramification with tangles (Conway notation)."""
    from knotsift.notations.conway_algebraic import parse_conway_notation

    pieces = []
    for n in range(2, 5):
        for entries in _entry_strings(n):
            pieces.append((n, entries))
    signed = [(n, t) for n, t in pieces] + [(n, "-" + t) for n, t in pieces]
    for (na, a), (nb, b) in product(signed, repeat=2):
        if na + nb + 2 > max_crossings or a.startswith("-"):
            continue
        for nc, c in signed:
            texts = []
            if na + nb + nc <= max_crossings:
                texts.append((f"({a},{b}){c}", na + nb + nc))
            for nd, d in signed:
                if na + nb + nc + nd <= max_crossings:
                    texts.append((f"({a},{b})({c},{d})", na + nb + nc + nd))
                    texts.append((f"({a},{b}){c},{d}", na + nb + nc + nd))
            for text, n in texts:
                try:
                    yield text, n, parse_conway_notation(text)
                except KnotsiftError:
                    continue


def _entry_strings(n: int) -> list[str]:
    """Rational tangles of ``n`` crossings as digit strings (reduced: no leading 1)."""
    from .enumeration import _compositions

    return ["".join(map(str, e)) for e in _compositions(n) if e[0] != 1 or len(e) == 1]


@dataclass
class EnumeratedLink:
    """Link diagrams sharing one fingerprint up to orientations and mirror image."""

    key: str
    components: int
    min_crossings: int
    prints: dict
    examples: list[str] = field(default_factory=list)


def enumerate_link_classes(max_crossings: int = 8, max_components: int = 3,
                           braids: bool = True, progress=None) -> dict[str, EnumeratedLink]:
    """Group every enumerated link diagram (2..max_components components, one piece).

    Returns
    -------
    dict
        class key -> EnumeratedLink with the smallest crossing count seen.
    """
    sources = [("rational", rational_codes(max_crossings)),
               ("montesinos", montesinos_codes(max_crossings)),
               ("polyhedral", polyhedral_codes(max_crossings)),
               ("polyhedral", signed_polyhedral_codes(max_crossings)),
               ("montesinos", horizontal_montesinos_codes(max_crossings)),
               ("algebraic", algebraic_codes(max_crossings))]
    if braids:
        sources.append(("braid", braid_codes(max_crossings)))
    classes: dict[str, EnumeratedLink] = {}
    known: dict[str, str] = {}  # oriented key -> class key, so a known class costs one key
    seen_codes: set = set()
    for kind, gen in sources:
        for text, n, diagram in gen:
            if progress:
                progress.update(detail=kind)
            m = diagram.number_of_components()
            if not 2 <= m <= max_components:
                continue
            d = simplify(diagram)
            if d.free_loops or len(split_parts(d)) > 1:
                continue
            code = (d.number_of_crossings(), tuple(sorted(d.crossings)))
            if code in seen_codes:
                continue
            seen_codes.add(code)
            try:
                key = known.get(link_fingerprint(d, simplified=True).key())
                prints = None
                if key is None:  # a new class: every orientation and mirror image
                    key, prints = unoriented_link_key(d)
                    known.update((fp.key(), key) for fp in prints.values())
            except KnotsiftError:
                continue
            c = min(n, d.number_of_crossings())
            cls = classes.get(key)
            if cls is None:
                classes[key] = EnumeratedLink(key, m, c, prints, [f"{kind}: {text}"])
            else:
                if c < cls.min_crossings:
                    cls.min_crossings = c
                    cls.examples.insert(0, f"{kind}: {text}")
                elif len(cls.examples) < 4:
                    cls.examples.append(f"{kind}: {text}")
    return classes
