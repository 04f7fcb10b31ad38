"""The link fingerprint: invariants of an oriented link of several components, keyed
independently of the order in which the components are listed.

It sits beside the knot :class:`~knotsift.invariants.fingerprint.Fingerprint`
(which it does not change): the Jones polynomial of the oriented link, the
linking matrix, the multivariable Alexander polynomial (up to units), the
determinant and signature, Milnor's triple linking number where it is an
integer, and each component's own Jones polynomial.  The linking matrix and
the multivariable Alexander polynomial are written for the order of the
components that gives the smallest text, so any relabelling of the input
gives the same key.
"""

from __future__ import annotations

from dataclasses import dataclass
from itertools import permutations

from ..diagram import Diagram
from ..laurent import Laurent

__all__ = ["LinkFingerprint", "link_fingerprint", "oriented_link_fingerprints", "LINK_INVARIANTS"]

#: The invariants in a link fingerprint, with what each sees.
LINK_INVARIANTS = {
    "jones": "Jones polynomial of the oriented link; reversing one component K multiplies it "
             "by t^(-3 lk(K, rest)); a mirror image has V(1/t)",
    "linking": "pairwise linking numbers (sorted); a component reversed or a mirror image "
               "changes signs",
    "alexander": "multivariable Alexander polynomial up to units; 0 for split links",
    "determinant": "|V(-1)|; 0 for split links",
    "signature": "link signature (right-handed trefoil -2); depends on orientations",
    "triple": "|mu(123)| of a 3-component link with zero linking numbers",
    "component_jones": "the Jones polynomial of each component alone (sorted)",
}


@dataclass(frozen=True)
class LinkFingerprint:
    """Normalised invariants of one oriented link, free of the order of its components.

    Attributes
    ----------
    components : int
    jones : Laurent
    linking : str
        Upper triangle of the linking matrix, row by row, in the canonical order.
    alexander : str
        Multivariable Alexander polynomial (normal form, canonical order of
        variables), ``""`` when not computed (too many crossings).
    determinant, signature : int
    triple : int or None
        ``|mu(123)|`` for three components with zero linking numbers.
    component_jones : tuple of str
    """

    components: int
    jones: Laurent
    linking: str
    alexander: str
    determinant: int
    signature: int
    triple: int | None
    component_jones: tuple[str, ...]

    def texts(self) -> dict[str, str]:
        return {
            "components": str(self.components),
            "jones": str(self.jones),
            "linking": self.linking,
            "alexander": self.alexander,
            "determinant": str(self.determinant),
            "signature": str(self.signature),
            "triple": "" if self.triple is None else str(self.triple),
            "component_jones": " | ".join(self.component_jones),
        }

    def key(self) -> str:
        """Canonical text of the whole fingerprint (what the link table stores)."""
        t = self.texts()
        return (f"c={t['components']};V={t['jones']};lk={t['linking']};M={t['alexander']};"
                f"D={t['determinant']};s={t['signature']};mu={t['triple']};"
                f"K={t['component_jones']}")

    def total_linking(self) -> int:
        return sum(int(v) for v in self.linking.split()) if self.linking else 0


#: Up to this many components the key is written for the best order of the components; above
#: it (m! orders), the linking numbers are sorted and the Alexander polynomial left out.
MAX_ORDERED_COMPONENTS = 5


def _canonical(lk: list[list[int]], poly: dict | None) -> tuple[str, str]:
    from .multivariable_alexander import permuted, polynomial_text

    m = len(lk)
    if m > MAX_ORDERED_COMPONENTS:  # m! orders are too many: sorted linking numbers only
        entries = sorted(lk[a][b] for a in range(m) for b in range(a + 1, m))
        return "sorted " + " ".join(map(str, entries)), ""
    best = None
    for order in permutations(range(m)):
        entries = " ".join(str(lk[order[a]][order[b]]) for a in range(m) for b in range(a + 1, m))
        alex = "" if poly is None else polynomial_text(permuted(poly, order)) if poly else "0"
        cand = (entries, alex)
        if best is None or cand < best:
            best = cand
    return best


def _assemble(m, jones, lk, poly, det, sig, triple, parts) -> LinkFingerprint:
    linking, alex = _canonical(lk, poly)
    return LinkFingerprint(m, jones, linking, alex, det, sig, triple, tuple(sorted(parts)))


def _raw(d: Diagram, poly: dict | None):
    from ..simplify import simplify
    from .determinant import determinant
    from .jones import jones_polynomial
    from .linking import component_knots, linking_matrix
    from .milnor import triple_linking_number
    from .signature import knot_signature

    m = d.number_of_components()
    lk = linking_matrix(d)
    triple = None
    if m == 3 and not any(lk[a][b] for a in range(3) for b in range(a + 1, 3)):
        triple = abs(triple_linking_number(d))
    parts = [jones_polynomial(simplify(k)) for k in component_knots(d)]
    return (m, jones_polynomial(d), lk, poly, determinant(d), knot_signature(d), triple, parts)


def _alexander_or_none(d: Diagram, alexander: bool) -> dict | None:
    from .multivariable_alexander import MAX_CROSSINGS, multivariable_alexander

    if alexander and d.number_of_components() >= 2 and d.number_of_crossings() <= MAX_CROSSINGS:
        return multivariable_alexander(d)
    return None


def link_fingerprint(diagram: Diagram, simplified: bool = False,
                     alexander: bool = True) -> LinkFingerprint:
    """All link invariants of a diagram of two or more components.

    Parameters
    ----------
    diagram : Diagram
    simplified : bool
        Set when ``diagram`` is already simplified.
    alexander : bool
        Compute the multivariable Alexander polynomial (skipped, as ``""``,
        when False or above its crossing limit).

    Examples
    --------
    >>> from knotsift.notations.braid import parse_braid
    >>> fp = link_fingerprint(parse_braid("1 1"))  # the positive Hopf link
    >>> fp.key()
    'c=2;V=-t^(1/2) - t^(5/2);lk=1;M=1;D=2;s=-1;mu=;K=1 | 1'
    """
    from ..simplify import simplify

    d = diagram if simplified else simplify(diagram)
    m, jones, lk, poly, det, sig, triple, parts = _raw(d, _alexander_or_none(d, alexander))
    return _assemble(m, jones, lk, poly, det, sig, triple, [str(p) for p in parts])


def oriented_link_fingerprints(diagram: Diagram, simplified: bool = False
                               ) -> dict[tuple[tuple[int, ...], bool], LinkFingerprint]:
    """The fingerprint of every orientation class and mirror image of a link diagram.

    Keys are ``(reversed components, mirrored)``; component 0 keeps its
    direction (reversing every component changes none of these invariants).
    The multivariable Alexander polynomial is computed once: reversing
    component ``k`` replaces ``t_k`` by ``1/t_k`` (it inverts that meridian),
    and a mirror image has ``Delta(1/t)``, equal to ``Delta(t)`` up to units
    (Torres 1953).  A mirror image has ``V(1/t)``, linking numbers and
    signature negated.

    Returns
    -------
    dict
    """
    from itertools import product

    from ..simplify import simplify
    from .linking import reverse_components
    from .multivariable_alexander import normal_form

    d = diagram if simplified else simplify(diagram)
    m = d.number_of_components()
    base = _alexander_or_none(d, True)
    out = {}
    for bits in product((False, True), repeat=max(m - 1, 0)):
        rev = tuple(k + 1 for k, b in enumerate(bits) if b)
        poly = base
        if base:
            poly = normal_form({tuple(-x if k in rev else x for k, x in enumerate(e)): c
                                for e, c in base.items()})
        r = reverse_components(d, rev) if rev else d
        m_, jones, lk, _, det, sig, triple, parts = _raw(r, poly)
        out[(rev, False)] = _assemble(m_, jones, lk, poly, det, sig, triple,
                                      [str(p) for p in parts])
        neg = [[-x for x in row] for row in lk]
        out[(rev, True)] = _assemble(m_, jones.mirror(), neg, poly, det, -sig, triple,
                                     [str(p.mirror()) for p in parts])
    return out
