"""The fingerprint: the bundle of normalised invariants that the table is keyed by.

A fingerprint is chirality-aware: the mirror image of a knot has the Jones
polynomial V(1/t) and the opposite signature, while the Alexander polynomial
and the determinant do not see mirrors.  Its canonical text (``key``) is what
the reference table stores for exact lookup.
"""

from __future__ import annotations

from dataclasses import dataclass

from ..diagram import Diagram
from ..laurent import Laurent

__all__ = ["Fingerprint", "fingerprint", "INVARIANTS"]

#: The invariants in a fingerprint, in the order of the key, with what each sees.
INVARIANTS = {
    "jones": "Jones polynomial V(t); a mirror image has V(1/t)",
    "alexander": "Conway-normalised Alexander polynomial; blind to mirror images",
    "determinant": "|Delta(-1)| = |V(-1)|; blind to mirror images",
    "signature": "knot signature; a mirror image has the opposite sign",
}


@dataclass(frozen=True)
class Fingerprint:
    """Normalised invariants of one knot or link in one chirality.

    Attributes
    ----------
    components : int
    jones : Laurent or None
        None when the Jones polynomial was not computed (skipped for cost,
        see :mod:`knotsift.budget`); such a fingerprint matches no table key.
    alexander : Laurent or None
        None for links (the single-variable Alexander polynomial is computed
        for knots only).
    determinant : int
    signature : int
        In the convention where the right-handed trefoil has signature -2.
    """

    components: int
    jones: Laurent | None
    alexander: Laurent | None
    determinant: int
    signature: int

    def mirror(self) -> "Fingerprint":
        """The fingerprint of the mirror image."""
        jones = None if self.jones is None else self.jones.mirror()
        return Fingerprint(self.components, jones, self.alexander,
                           self.determinant, -self.signature)

    def is_mirror_blind(self) -> bool:
        """True when these invariants cannot tell this knot from its mirror image."""
        return self == self.mirror()

    def texts(self) -> dict[str, str]:
        """Each invariant in canonical text form."""
        return {
            "components": str(self.components),
            "jones": "" if self.jones is None else str(self.jones),
            "alexander": "" if self.alexander is None else str(self.alexander),
            "determinant": str(self.determinant),
            "signature": str(self.signature),
        }

    def key(self) -> str:
        """Canonical text of the whole fingerprint (what the table stores)."""
        t = self.texts()
        return (f"c={t['components']};V={t['jones']};A={t['alexander']};"
                f"D={t['determinant']};s={t['signature']}")

    def unoriented_key(self) -> str:
        """The key shared by a knot and its mirror image (the smaller of the two keys)."""
        return min(self.key(), self.mirror().key())

    def __mul__(self, other: "Fingerprint") -> "Fingerprint":
        """The fingerprint of a connected sum (knots): products and a sum of signatures."""
        if self.components != 1 or other.components != 1:
            raise ValueError("connected sums of fingerprints are defined here for knots only")
        jones = None if self.jones is None or other.jones is None else self.jones * other.jones
        return Fingerprint(1, jones, self.alexander * other.alexander,
                           self.determinant * other.determinant,
                           self.signature + other.signature)


def fingerprint(diagram: Diagram, simplified: bool = False) -> Fingerprint:
    """All invariants of a diagram, bundled.

    Parameters
    ----------
    diagram : Diagram
    simplified : bool
        Set when ``diagram`` is already simplified; otherwise it is simplified
        first (Reidemeister I/II and nugatory moves), which changes nothing but
        the cost.

    Examples
    --------
    >>> trefoil = Diagram([(1, 5, 2, 4), (3, 1, 4, 6), (5, 3, 6, 2)])
    >>> fingerprint(trefoil).key()
    'c=1;V=t + t^3 - t^4;A=t^-1 - 1 + t;D=3;s=-2'
    """
    from ..simplify import simplify
    from .alexander import alexander_polynomial
    from .jones import jones_polynomial
    from .signature import knot_signature

    d = diagram if simplified else simplify(diagram)
    jones = jones_polynomial(d)
    components = d.number_of_components()
    alexander = alexander_polynomial(d) if components == 1 else None
    if alexander is not None:
        det = abs(alexander.evaluate(-1))
    else:
        from .determinant import determinant

        det = determinant(d)
    return Fingerprint(components, jones, alexander, det, knot_signature(d))
